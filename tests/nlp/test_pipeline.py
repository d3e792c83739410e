"""The spaCy pipeline: components, spans, extensions, save and load, analyze()."""

from __future__ import annotations

from pathlib import Path

import pytest
import spacy

from extract.nlp.pipeline import analyze, build_pipeline, load_pipeline

TEXT = (
    "Mice (n = 8 per group) were treated with Zelavir (10 mg/kg) for 14 days. "
    "Serum creatinine was 0.42 ± 0.05 mg/dL in the vehicle group vs. 0.61 ± 0.07 mg/dL in "
    "Zelavir-treated mice at week 8 (p < 0.01; Fig. 2). Values are mean ± SEM."
)


@pytest.fixture(scope="module")
def doc() -> spacy.tokens.Doc:
    return load_pipeline()(TEXT)


def test_load_pipeline_is_cached() -> None:
    assert load_pipeline() is load_pipeline()
    assert load_pipeline().pipe_names == [
        "sentences_rules",
        "quantities_rules",
        "sample_size_rules",
        "context_rules",
    ]


def test_spans_and_extensions(doc: spacy.tokens.Doc) -> None:
    measures = [s for s in doc.spans["quantities"] if s.label_ == "measure"]
    assert [s.text for s in measures] == ["0.42 ± 0.05 mg/dL", "0.61 ± 0.07 mg/dL"]
    assert measures[0]._.quantity.value == 0.42
    assert TEXT[measures[0]._.quantity.start : measures[0]._.quantity.end] == measures[0].text
    labels = {s.text: s.label_ for s in doc.spans["quantities"]}
    assert labels["10 mg/kg"] == "dose"
    assert labels["0.01"] == "p_value"
    sizes = list(doc.spans["sample_sizes"])
    assert [(s.text, s.label_, s._.sample_size.n) for s in sizes] == [
        ("n = 8 per group", "per_group", 8)
    ]
    kinds = {(s.label_, s._.context.value) for s in doc.spans["context"]}
    assert ("time_point", "week 8") in kinds
    assert ("outcome", "serum creatinine") in kinds
    assert ("group", "vehicle") in kinds
    assert ("intervention", "vehicle") in kinds  # same characters, two labels, both kept


def test_analyze_by_sentence() -> None:
    findings = analyze(TEXT, dispersion="SEM")
    assert len(findings) == 3
    second = findings[1]
    measures = [q for q in second.quantities if q.role == "measure"]
    assert [q.spread.kind for q in measures if q.spread] == ["SEM", "SEM"]
    outcomes = [
        o.value
        for q, o in zip(second.quantities, second.outcomes, strict=True)
        if q.role == "measure" and o
    ]
    assert outcomes == ["serum creatinine", "serum creatinine"]
    assert TEXT[second.start : second.end] == second.text
    quantity = measures[1]
    assert TEXT[quantity.start : quantity.end] == quantity.text


def test_save_and_load(tmp_path: Path) -> None:
    nlp = build_pipeline()
    nlp.to_disk(tmp_path / "pipeline")
    loaded = load_pipeline(path=tmp_path / "pipeline")
    assert loaded.pipe_names == nlp.pipe_names
    # the saved pipeline rebuilds our tokenizer, not the default one
    assert [t.text for t in loaded("(n = 8).")] == ["(", "n", "=", "8", ")", "."]
    doc = loaded("Body mass was 24.1 ± 1.3 g.")
    assert [s.text for s in doc.spans["quantities"]] == ["24.1 ± 1.3 g"]
