"""Confidence says how much of a record was found rather than assumed.

The committed fixture fx04-rodent states its dispersion kind (SEM) in a table footnote and in
the methods. Degraded copies of the same Document (statements removed, header units removed)
must score lower, and proposals that became wrong (an SD assumed where the article reports SEM,
checked against the fixture's gold file) must rank below the correct originals.
"""

from __future__ import annotations

import re
from dataclasses import replace
from pathlib import Path

import pytest

from extract.evaluate import is_complete, load_gold, match
from extract.ingest import read_document
from extract.ingest.document import Document
from extract.records.assemble import first_pass
from extract.records.draft import Draft
from extract.records.link import confidence
from extract.records.proposal import Proposal, Source

ARTICLES = Path(__file__).resolve().parents[2] / "fixtures" / "articles"
PDF = ARTICLES / "fx04-rodent.pdf"
GOLD = ARTICLES / "fx04-rodent.gold.json"

_KIND_WORDS = re.compile(r"\b(?:SEM|SD|standard (?:error|deviation)[\w ]*|s\.e\.m\.)\b", re.I)

pytestmark = pytest.mark.skipif(not PDF.exists(), reason="fixture article missing")


@pytest.fixture(scope="module")
def document() -> Document:
    return read_document(PDF)


def _without_kind_statements(document: Document, *, methods: bool) -> Document:
    """The Document with the tables' captions and footnotes (and optionally every text block)
    no longer naming the dispersion kind."""
    tables = tuple(
        replace(
            t,
            caption=_KIND_WORDS.sub("spread", t.caption),
            footnotes=tuple(_KIND_WORDS.sub("spread", f) for f in t.footnotes),
        )
        for t in document.tables
    )
    blocks = document.blocks
    if methods:
        blocks = tuple(replace(b, text=_KIND_WORDS.sub("spread", b.text)) for b in blocks)
    return replace(document, tables=tables, blocks=blocks)


def _tables_only(proposals: list[Proposal]) -> dict[tuple[object, ...], Proposal]:
    return {
        (p.source.table, p.source.row, p.source.col): p
        for p in proposals
        if p.source.kind == "table"
    }


def test_caption_without_kind_scores_lower(document: Document) -> None:
    original = _tables_only(first_pass(document))
    degraded = _tables_only(first_pass(_without_kind_statements(document, methods=False)))
    shared = [key for key in original if key in degraded and original[key].dispersion]
    assert len(shared) > 100
    # The kind now comes from the methods, farther from the value: never more confident.
    assert all(degraded[k].confidence <= original[k].confidence for k in shared)
    assert sum(degraded[k].confidence for k in shared) < sum(original[k].confidence for k in shared)


def test_wrong_assumed_kind_ranks_below_correct_records(document: Document) -> None:
    gold = load_gold(GOLD)
    original = first_pass(document)
    degraded = first_pass(_without_kind_statements(document, methods=True))
    correct = [p for g, p in match(gold.points, original) if is_complete(g, p)]
    wrong = [p for g, p in match(gold.points, degraded) if not is_complete(g, p)]
    assert len(correct) > 100 and len(wrong) > 100  # SEM now read as an assumed SD
    # Ranking check (the area under the ROC curve as the share of correct/wrong pairs in the
    # right order, Hanley & McNeil, Radiology 1982;143:29-36): every pair in order here.
    pairs = [(c.confidence > w.confidence) for c in correct for w in wrong]
    assert sum(pairs) / len(pairs) == 1.0


def test_header_units_removed_scores_lower(document: Document) -> None:
    original = _tables_only(first_pass(document))
    stripped = replace(
        document,
        tables=tuple(
            replace(
                t,
                column_units=(None,) * len(t.column_units),
                row_units=(None,) * len(t.row_units),
                cells=tuple(
                    replace(c, text=re.sub(r"\s*\((?![nN]\s*=)[^()]*\)$", "", c.text))
                    if c.col == 0 or c.row < t.header_rows
                    else c
                    for c in t.cells
                ),
            )
            for t in document.tables
        ),
    )
    degraded = _tables_only(first_pass(stripped))
    lost = [k for k, p in original.items() if k in degraded and p.unit and not degraded[k].unit]
    assert lost, "removing ingest's header units must leave some values without a unit"
    assert all(degraded[k].confidence < original[k].confidence for k in lost)


def _draft(**changes: object) -> Draft:
    base = Draft(
        order=(0.0,),
        outcome="grip strength",
        group="vehicle",
        statistic=None,
        value=98.2,
        raw="98.2 ± 4.5 gf",
        unit="gf",
        dispersion_kind="SD",
        dispersion_value=4.5,
        n=9,
        source=Source(
            kind="text",
            page=1,
            bbox=None,
            section="results",
            table=None,
            row=None,
            col=None,
            quote="98.2 ± 4.5 gf (SD), n = 9",
        ),
        extractor="text.sentences@4",
        location=(0, 0),
    )
    for name in ("value", "outcome", "group", "unit", "dispersion", "n"):
        base = base.with_found(
            name, "value" if name in ("value", "unit", "dispersion", "n") else "sentence"
        )
    base = base.with_found("statistic", "value", statistic="mean")
    return replace(base, **changes)  # type: ignore[arg-type]


def test_stated_value_sd_unit_n_is_high_and_assumptions_lower_it() -> None:
    stated = confidence(_draft())
    assert stated >= 0.95
    assumed_stat = confidence(_draft().with_found("statistic", "assumed", statistic="single"))
    assumed_kind = confidence(
        _draft().with_found("dispersion", "assumed").with_flag("dispersion_kind_assumed")
    )
    no_unit = confidence(
        replace(_draft(), unit=None, found=tuple((k, h) for k, h in _draft().found if k != "unit"))
    )
    no_n = confidence(
        replace(_draft(), n=None, found=tuple((k, h) for k, h in _draft().found if k != "n"))
    )
    far_outcome = confidence(_draft().with_found("outcome", "caption"))
    for lower in (assumed_stat, assumed_kind, no_unit, no_n, far_outcome):
        assert lower < stated
    bare = replace(
        _draft(dispersion_value=None, dispersion_kind=None, unit=None),
        found=(("value", "cell"), ("outcome", "row"), ("statistic", "assumed")),
    )
    assert confidence(bare) < 0.7


def test_statistic_word_as_outcome_or_group_scores_lower() -> None:
    # A label that is only a statistic word or a test symbol names no measured thing or group
    # (common practice: an outcome is a measured quantity, a group a set of subjects).
    stated = confidence(_draft())
    for outcome in ("total", "P", "vs", "s d", "Number"):
        assert confidence(replace(_draft(), outcome=outcome)) < stated
    assert confidence(replace(_draft(), group="Mean")) < stated
    assert confidence(replace(_draft(), outcome="total protein")) == stated


def test_fixture_records_keep_their_confidence(document: Document) -> None:
    # The fixture's correct records (gold fx04-rodent) carry real outcome and group labels:
    # none is scored as a placeholder, so the degraded-input ranking above is unchanged.
    gold = load_gold(GOLD)
    correct = [p for g, p in match(gold.points, first_pass(document)) if is_complete(g, p)]
    assert correct and all(p.confidence >= 0.75 for p in correct)
