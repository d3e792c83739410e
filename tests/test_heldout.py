"""Accuracy targets on the held-out fixture set (generated here, never tuned against).

The held-out articles come from ``fixtures.generate.generate(HELDOUT_SEED, ...)`` into a
temporary folder. The first pass and the naive baseline (quantulum3 over the page text) are
scored with extract.evaluate (rules in docs/accuracy.md). Targets: value-level F1 >= 0.95 and
complete-record F1 >= 0.85, both far above the baseline.
"""

from __future__ import annotations

import pytest

from extract.evaluate import Scores, evaluate, find_gold_files, load_gold
from extract.run import articles_beside, run_for_evaluation
from fixtures.generate import HELDOUT_SEED, generate

VALUE_F1_TARGET = 0.95
COMPLETE_F1_TARGET = 0.85
#: "Far above": the first pass's value F1 at least this much above the baseline's.
MARGIN_OVER_BASELINE = 0.5


@pytest.fixture(scope="module")
def heldout(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Scores]:
    out = tmp_path_factory.mktemp("heldout")
    generate(HELDOUT_SEED, out)
    gold_files = find_gold_files(out)
    articles = [load_gold(p) for p in gold_files]
    inputs = run_for_evaluation(articles_beside(gold_files, source="pdf"), workers=2)
    assert not inputs.failures, [f.note for f in inputs.failures]
    scores = {
        "winnow": evaluate(articles, inputs.first_pass),
        "baseline": evaluate(articles, inputs.baseline),
    }
    for name, s in scores.items():
        print(
            f"\nheld-out {name}: value P {s.value.precision:.3f} R {s.value.recall:.3f} "
            f"F1 {s.value.fscore:.3f}; complete F1 {s.complete.fscore:.3f}"
        )
    return scores


def test_heldout_value_f1_target(heldout: dict[str, Scores]) -> None:
    assert heldout["winnow"].value.fscore >= VALUE_F1_TARGET


def test_heldout_complete_record_f1_target(heldout: dict[str, Scores]) -> None:
    assert heldout["winnow"].complete.fscore >= COMPLETE_F1_TARGET


def test_heldout_far_above_the_baseline(heldout: dict[str, Scores]) -> None:
    mine, naive = heldout["winnow"], heldout["baseline"]
    assert mine.value.fscore >= naive.value.fscore + MARGIN_OVER_BASELINE
    assert mine.complete.fscore > naive.complete.fscore


def test_heldout_scores_cover_every_article(heldout: dict[str, Scores]) -> None:
    # Every held-out article contributes gold points: none is silently left out of the score.
    articles = [k for k in heldout["winnow"].breakdown if k.startswith("article=")]
    assert articles and all(k.startswith("article=ho") for k in articles)
    assert heldout["winnow"].ignored == 0
