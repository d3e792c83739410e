"""Rules for tables as real journals set them, each built from word positions.

Layouts use tests/ingest/layoutmaker.py (7.8 pt type, 0.55 em per character, 0.3 em word
space: common practice for a sans-serif face); the content is invented. Each case is the
general form of a layout seen in a published article (named beside it) and checks the reading
a person gets from the page.
"""

from __future__ import annotations

from layoutmaker import row, words

from extract.ingest.layout import PageData, drop_line_numbers, words_to_lines
from extract.ingest.table_place import centre_in, drop_orphan_continuations
from extract.ingest.table_text import table_from_text
from extract.ingest.tables import RawTable


def test_three_counted_margin_numbers_are_line_numbers() -> None:
    # a double-spaced manuscript page where a table leaves only its three-line caption
    # numbered (as on eLife RP95901 p. 29): 301, 302, 303 count up in one column
    page = []
    for i, text in enumerate(
        [
            "Table 4. Plasma levels of zolmarin in the three dosing arms of the",
            "trial, by sex and by visit, in the whole analysed population",
            "(n=1 204)",
        ]
    ):
        page += words(str(301 + i), 40, 90 + 31 * i, align="right")
        page += words(text, 90, 90 + 31 * i, bold=True)
    kept = [w.text for w in drop_line_numbers(page)]
    assert kept[0] == "Table"
    assert not {"301", "302", "303"} & set(kept)


def test_unordered_margin_numbers_are_kept() -> None:
    # three numbers in the margin that do not count up by one are no line numbering
    page = []
    for i, (num, text) in enumerate([("12", "Alpha beta gamma delta"), ("7", "Epsilon zeta eta")]):
        page += words(num, 40, 90 + 31 * i, align="right")
        page += words(text * 3, 90, 90 + 31 * i)
    page += words("40", 40, 160, align="right") + words("Theta iota kappa " * 3, 90, 160)
    assert {"12", "7", "40"} <= {w.text for w in drop_line_numbers(page)}


def _ratio_table() -> list:
    # an upper label centred over one column only; "P value" beside it on the lower row
    # (the layout of eLife RP95901 Table 2, read as a person reads it: common practice)
    out = words("HR (95% CI)", 300, 100, bold=True, align="centre")
    out += words("Outcome", 60, 115, bold=True)
    out += words("Drug A vs. placebo group", 300, 115, bold=True, align="centre")
    out += words("P value", 420, 115, bold=True, align="centre")
    out += row([("Model 1", 60), ("0.84 (0.74 to 0.95)", 300), ("0.005", 420)], 135)
    out += row([("Model 2", 60), ("0.83 (0.73 to 0.94)", 300), ("0.002", 420)], 150)
    return out


def test_centred_upper_label_does_not_span_a_new_lower_label() -> None:
    table = table_from_text(_ratio_table(), (50, 85, 460, 155), 1, style="rules", header_bottom=120)
    assert table is not None
    assert table.rows[:2] == (
        ("", "HR (95% CI)", ""),
        ("Outcome", "Drug A vs. placebo group", "P value"),
    )


def test_upper_label_centred_over_two_columns_spans_both() -> None:
    # "Dose" centred over "10 mg" and "30 mg": a group label over both (common practice)
    out = words("Dose", 350, 100, bold=True, align="centre")
    out += words("Group", 60, 115, bold=True)
    out += words("10 mg", 300, 115, bold=True, align="centre")
    out += words("30 mg", 400, 115, bold=True, align="centre")
    out += row([("Week 1", 60), ("4.4", 300), ("4.9", 400)], 135)
    out += row([("Week 2", 60), ("4.6", 300), ("5.2", 400)], 150)
    table = table_from_text(out, (50, 85, 460, 155), 1, style="rules", header_bottom=120)
    assert table is not None
    assert table.rows[0] == ("", "Dose", "Dose")


def test_label_between_double_spaced_header_rows_spans_both() -> None:
    # a double-spaced manuscript: header rows 31 pt apart, "Characteristic" set halfway
    # between them (eLife RP95901 Table 1)
    out = words("Characteristic", 60, 115.5, bold=True)
    out += words("Arm A", 250, 100, bold=True, align="centre")
    out += words("(n=1 204)", 250, 131, bold=True, align="centre")
    out += words("Arm B", 380, 100, bold=True, align="centre")
    out += words("(n=1 198)", 380, 131, bold=True, align="centre")
    out += row([("Age, years", 60), ("58.9±7.3", 250), ("56.7±8.0", 380)], 165)
    out += row([("Weight, kg", 60), ("71.2±9.0", 250), ("70.8±9.4", 380)], 196)
    table = table_from_text(out, (50, 85, 460, 200), 1, style="rules", header_bottom=140)
    assert table is not None
    assert table.header_rows == 2
    assert [r[0] for r in table.rows] == [
        "Characteristic",
        "Characteristic",
        "Age, years",
        "Weight, kg",
    ]
    assert table.rows[1][1:] == ("(n=1 204)", "(n=1 198)")


def test_bold_totals_row_under_bold_header_is_body() -> None:
    # an unruled table whose header and first (totals) row are both bold, as MMWR SS-59(7)
    # Table 3 sets them: a row of numbers under the header is body (common practice)
    out = row(
        [("Region", 60), ("Strain X", 200), ("Strain Y", 280), ("Total", 360)], 100, bold=True
    )
    out += row([("All regions", 60), ("464", 200), ("15", 280), ("479", 360)], 112, bold=True)
    out += row([("North Vale", 70), ("1", 200), ("0", 280), ("1", 360)], 124)
    out += row([("South Vale", 70), ("7", 200), ("2", 280), ("9", 360)], 136)
    table = table_from_text(out, (50, 90, 400, 140), 1, style="unruled", header_bottom=None)
    assert table is not None
    assert table.header_rows == 1
    assert table.rows[1] == ("All regions", "464", "15", "479")


def test_row_of_years_under_header_stays_header() -> None:
    # a second header level of years is no body row (common practice)
    out = row([("Region", 60), ("Cases", 240), ("Cases", 320)], 100, bold=True)
    out += words("2008", 240, 112, bold=True, align="centre")
    out += words("2009", 320, 112, bold=True, align="centre")
    out += row([("North Vale", 60), ("12", 240), ("14", 320)], 124)
    out += row([("South Vale", 60), ("7", 240), ("9", 320)], 136)
    table = table_from_text(out, (50, 90, 400, 140), 1, style="unruled", header_bottom=None)
    assert table is not None
    assert table.header_rows == 2


def _page(number: int, lines_words: list, tables: list[RawTable]) -> PageData:
    free = [w for w in lines_words if not any(centre_in(w, t.bbox) for t in tables)]
    return PageData(number, 612, 792, lines_words, words_to_lines(free, number), list(tables), True)


def _grid(page: int, top: float) -> tuple[list, RawTable]:
    out = row([("A1", 60), ("B1", 200), ("C1", 300)], top + 10)
    out += row([("A2", 60), ("B2", 200), ("C2", 300)], top + 22)
    rows = (("A1", "B1", "C1"), ("A2", "B2", "C2"))
    boxes = tuple(tuple(None for _ in r) for r in rows)
    return out, RawTable(page, (55, top, 320, top + 25), rows, boxes, 1, "ruled", continued=True)


def test_caption_less_page_top_grid_needs_a_table_ending_the_page_before() -> None:
    # a figure page with a small grid at its top (eLife 13833 p. 34, 37); the page before ends
    # in running text, so the grid continues nothing and its words go back to the text
    before = _page(1, words("The last paragraph of the page before ends here.", 60, 700), [])
    out, grid = _grid(2, 80)
    page = _page(2, out + words("Figure 5. Panel legends of the odour task.", 60, 300), [grid])
    drop_orphan_continuations(page, before)
    assert page.tables == []
    assert {"A1", "C2"} <= {w.text for ln in page.lines for w in ln.words}


def test_caption_less_page_top_grid_after_a_page_ending_in_a_table_is_kept() -> None:
    prev_words, prev_table = _grid(1, 650)
    before = _page(1, prev_words, [prev_table])
    out, grid = _grid(2, 80)
    page = _page(2, out, [grid])
    drop_orphan_continuations(page, before)
    assert page.tables == [grid]
