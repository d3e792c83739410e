"""Finding and marking a proposal's source; pre-filling a missed data point from a pick."""

from __future__ import annotations

import pytest

from extract.review.prefill import first_value, from_cell, from_sentence, spread_kind
from extract.review.source import (
    SourceNotFound,
    describe_cell,
    find_table,
    find_value,
    fit_widths,
    locate_text,
    mark_text,
    split_sentences,
    table_cell_texts,
)
from tests.review.scenario import ARTICLE, RESULTS, make_document, make_proposals

DOCUMENT = make_document()
PROPOSALS = make_proposals(ARTICLE)


def test_split_sentences_keeps_decimals_and_parentheses_whole() -> None:
    spans = split_sentences(RESULTS)
    sentences = [RESULTS[a:b] for a, b in spans]
    assert len(sentences) == 3
    assert sentences[0].endswith("(n = 12).") and "24.1 ± 1.3 g" in sentences[0]
    assert sentences[2].startswith("Heart rate")


@pytest.mark.parametrize(
    ("text", "value", "found"),
    [
        ("was 24.1 ± 1.3 g", 24.1, "24.1"),
        ("rose to 7.40 mmol/L", 7.4, "7.40"),
        ("in 124.1 g and 24.1 g", 24.1, "24.1"),  # not inside 124.1
        ("fell by 0.5 and .5", 0.5, "0.5"),
        ("was 12 mg", 12.0, "12"),
    ],
)
def test_find_value_finds_the_number_as_printed(text: str, value: float, found: str) -> None:
    span = find_value(text, value)
    assert span is not None and text[span[0] : span[1]] == found
    assert text[span[0] - 1] in " ."  # starts at a number boundary


def test_locate_text_marks_the_sentence_and_the_value() -> None:
    where = locate_text(DOCUMENT, PROPOSALS[1])  # 22.8 in the second results sentence
    text = where.block.text
    assert where.block.index == 4
    assert where.value is not None and text[where.value[0] : where.value[1]] == "22.8"
    assert where.sentence is not None
    assert text[where.sentence[0] : where.sentence[1]].startswith("Body mass in the zelvatrin")
    rich = mark_text(text, sentence=where.sentence, value=where.value)
    styled = {text[s.start : s.end] for s in rich.spans}
    assert "22.8" in styled


def test_a_quote_missing_from_the_document_is_a_bad_proposal() -> None:
    bad = PROPOSALS[0].with_changes(
        source=PROPOSALS[0].source.__class__("text", 1, None, "results", None, None, None, "Nope.")
    )
    with pytest.raises(SourceNotFound):
        locate_text(DOCUMENT, bad)


def test_find_table_checks_the_label_and_the_cell() -> None:
    source = PROPOSALS[2].source
    assert find_table(DOCUMENT, source).label == "Table 1"
    with pytest.raises(SourceNotFound):
        find_table(DOCUMENT, source.__class__(**{**source.__dict__, "table": "Table 9"}))
    with pytest.raises(SourceNotFound):
        find_table(DOCUMENT, source.__class__(**{**source.__dict__, "row": 4}))


def test_table_grid_marks_the_cell_and_its_headers() -> None:
    table = DOCUMENT.tables[0]
    grid = table_cell_texts(table, row=2, col=2)
    assert [c.plain for c in grid[2]] == ["Urea (mmol/L)", "7.9 ± 0.6", "7.4 ± 0.5"]
    assert grid[2][2].spans and grid[2][2].spans[0].style != grid[0][1].spans[0].style
    assert grid[2][1].spans == []  # a plain data cell is not styled
    assert describe_cell(table, 2, 2) == "Urea (mmol/L) × Zelvatrin (n = 12)"


@pytest.mark.parametrize(
    ("text", "value", "spread", "unit"),
    [
        ("heart rate 512 ± 20 bpm", 512.0, 20.0, "bpm"),
        ("rats (n = 8) weighed 310 g", 310.0, None, "g"),  # n = 8 is not the value
        ("was 4.2 +/- 0.3 U/L.", 4.2, 0.3, "U/L"),
        ("was 18 in the vehicle group", 18.0, None, None),  # "in" is a word, not inches
    ],
)
def test_first_value_reads_value_spread_and_unit(
    text: str, value: float, spread: float | None, unit: str | None
) -> None:
    found, dispersion, found_unit = first_value(text)
    assert found == value
    assert (dispersion.value if dispersion else None) == spread
    assert found_unit == unit


def test_spread_kind_follows_the_caption_or_footnote() -> None:
    assert spread_kind("Values are mean ± SEM.") == "SEM"
    assert spread_kind("Data are mean ± standard deviation") == "SD"
    assert spread_kind("Plasma values") == "SD"  # none named: SD, to be checked by the curator


def test_prefill_from_cell_uses_headers_units_and_n() -> None:
    draft = from_cell(DOCUMENT.tables[0], 3, 2, article=ARTICLE, file="z.pdf")
    assert (draft.outcome, draft.group, draft.value, draft.unit, draft.n) == (
        "Calcium",
        "Zelvatrin",
        9.9,
        "mg/dL",
        12,
    )
    assert draft.dispersion is not None and draft.dispersion.kind == "SEM"
    assert (draft.source.table, draft.source.row, draft.source.col) == ("Table 1", 3, 2)


def test_prefill_from_sentence_carries_context_from_the_shown_proposal() -> None:
    block = DOCUMENT.blocks[4]
    span = split_sentences(block.text)[2]
    draft = from_sentence(block, span, article=ARTICLE, file="z.pdf", template=PROPOSALS[0])
    assert (draft.value, draft.unit) == (512.0, "bpm")
    assert (draft.subject, draft.time_point) == ("Tolvar mice", "week 8")
    assert draft.source.quote.startswith("Heart rate") and draft.source.page == 1


def test_fit_widths_narrows_the_widest_columns_first() -> None:
    assert fit_widths([10, 20, 30], 100) == [10, 20, 30]  # fits: unchanged
    widths = fit_widths([10, 20, 30], 45)
    assert sum(widths) <= 45 and widths[0] == 10  # the narrow column keeps its width
    assert widths[1] == widths[2] == 17
