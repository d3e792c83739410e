"""Pipeline speed sanity: prints sentences per second (a benchmark, not a timed test).

Run: .venv/bin/python -m pytest -q -s tests/benchmarks/test_nlp_speed.py
"""

from __future__ import annotations

import time

from extract.nlp.pipeline import analyze, load_pipeline

SENTENCES = [
    "Serum creatinine was 0.42 ± 0.05 mg/dL in the vehicle group at week 8 (n = 8 per group).",
    "Mice were treated with Zelavir (10 mg/kg) for 14 days and measured by ELISA.",
    "Systolic pressure was 132 mmHg (95% CI 128 to 136) with placebo (P < 0.001; Fig. 2).",
    "The score was 4 (IQR 3–5), and 42 (37.5%) participants responded.",
    "Samples were centrifuged at 3000 rpm for 10 min at 4 °C and stored at −80 °C.",
]


def test_nlp_speed() -> None:
    load_pipeline()
    analyze("Warm-up: 24.1 ± 1.3 g.")
    text = " ".join(SENTENCES * 40)
    started = time.perf_counter()
    findings = analyze(text)
    elapsed = time.perf_counter() - started
    assert len(findings) == len(SENTENCES) * 40
    print(f"\nnlp pipeline: {len(findings) / elapsed:.0f} sentences/s ({len(findings)} sentences)")
