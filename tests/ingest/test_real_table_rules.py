"""Rules for tables as real journals set them, each built from word positions.

Layouts use tests/ingest/layoutmaker.py (7.8 pt type, 0.55 em per character, 0.3 em word
space: common practice for a sans-serif face); the content is invented. Each case is the
general form of a layout seen in a published article (named beside it) and checks the reading
a person gets from the page.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from layoutmaker import row, words

from extract.ingest import read_document
from extract.ingest.document import Document, Table
from extract.ingest.jats import read_jats
from extract.ingest.layout import PageData, drop_line_numbers, words_to_lines
from extract.ingest.sections import caption_label
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


JATS_TWO_LEVEL = """<?xml version="1.0" encoding="UTF-8"?>
<article article-type="research-article" dtd-version="1.3">
  <front><article-meta>
    <article-id pub-id-type="doi">10.5555/winnow.case.twolevel</article-id>
    <title-group><article-title>Two-level header</article-title></title-group>
  </article-meta></front>
  <body><sec sec-type="results"><title>Results</title>
    <table-wrap id="t1"><label>Table 1</label><caption><title>Patients taking zolmarin.</title>
    </caption><table>
      <thead>
        <tr><td colspan="1" rowspan="1">Medication</td><td colspan="3">Arm A</td>
            <td colspan="3">Arm B</td></tr>
        <tr><td/><td>n</td><td>Percent</td><td>Change</td>
            <td>n</td><td>Percent</td><td>Change</td></tr>
      </thead>
      <tbody>
        <tr><td>Baseline</td><td>189</td><td>62.6%</td><td>-</td>
            <td>220</td><td>72.9%</td><td>-</td></tr>
      </tbody>
    </table></table-wrap>
  </sec></body>
</article>
"""


def test_jats_two_level_header_keeps_lower_labels_under_their_groups(tmp_path: Path) -> None:
    # colspan groups over a lower row that opens with an empty cell (the thead shape of PLOS
    # Medicine 10.1371/journal.pmed.1001518 Table 5; JATS 1.3 / XHTML table model: a cell
    # with colspan="3" covers three grid columns, an empty <td/> still takes one)
    path = tmp_path / "two-level.xml"
    path.write_text(JATS_TWO_LEVEL, encoding="utf-8")
    (table,) = read_jats(path).tables
    assert table.header_rows == 2
    assert table.grid()[0] == ["Medication"] + ["Arm A"] * 3 + ["Arm B"] * 3
    assert table.grid()[1] == ["", "n", "Percent", "Change", "n", "Percent", "Change"]
    assert table.column_header(4) == "Arm B / n"
    assert table.grid()[2][4] == "220"


# --- the real corpus (structure only) ----------------------------------------------------------
# Licences (SOURCES.md in the corpus folder): mmwr-ss5907 public domain (US government);
# elife-rp95901 and elife-13833 CC BY 4.0; pmed-1001518 PLOS Medicine, CC BY.


@pytest.fixture(scope="module")
def real_pdfs(corpus_dir: Path) -> dict[str, Document]:
    return {
        name: read_document(corpus_dir / f"{name}.pdf")
        for name in ("mmwr-ss5907", "elife-rp95901", "elife-13833")
    }


def _labelled(document: Document, label: str) -> Table:
    (table,) = [t for t in document.tables if t.label == label]
    return table


@pytest.mark.corpus
def test_corpus_totals_row_is_body(real_pdfs: dict[str, Document]) -> None:
    table = _labelled(real_pdfs["mmwr-ss5907"], "Table 3")
    assert table.header_rows == 1
    assert table.row_label(1) == "Africa"


@pytest.mark.corpus
def test_corpus_numbered_caption_and_spans(real_pdfs: dict[str, Document]) -> None:
    document = real_pdfs["elife-rp95901"]
    first = _labelled(document, "Table 1")
    assert first.caption.startswith("Baseline characteristics")
    assert first.pages == (29, 30)
    assert first.row_label(0) == first.row_label(1) == "Characteristic"
    second = _labelled(document, "Table 2")
    assert second.header_rows == 2
    assert second.cell(0, 2).text == ""  # "HR (95% CI)" is not over "P value"
    assert second.cell(1, 2).text == "P value"


@pytest.mark.corpus
def test_corpus_figure_pages_hold_no_tables(real_pdfs: dict[str, Document]) -> None:
    tables = real_pdfs["elife-13833"].tables
    assert [t.label for t in tables] == ["Table 1"]
    assert not {34, 37} & {p for t in tables for p in t.pages}


@pytest.mark.corpus
def test_corpus_jats_header_as_the_xml_writes_it(corpus_dir: Path) -> None:
    # the XML's own second header row under "Counselling + Usual Care" reads "Percent",
    # "Percent", "Change from Baseline": kept as written, each under its own column
    table = _labelled(read_jats(corpus_dir / "pmed-1001518.xml"), "Table 5")
    assert table.n_cols == 13 and table.header_rows == 2
    assert table.grid()[1][1:4] == ["n", "Percent", "Change from Baseline"]
    assert table.grid()[0][4:7] == ["Counselling + Usual Care"] * 3


@pytest.mark.parametrize(
    ("text", "label"),
    [
        ("Tabela 2. Exames por região", "Table 2"),  # Portuguese
        ("Tabla 3: Pacientes", "Table 3"),  # Spanish
        ("Tableau 1 - Patients", "Table 1"),  # French
        ("Figura 4. Curvas", "Figure 4"),
    ],
)
def test_caption_labels_in_romance_languages(text: str, label: str) -> None:
    # the words journals in Portuguese, Spanish and French print for "Table"/"Figure"
    # (Cadernos Saúde Coletiva sets "Tabela 1."; the others from memory)
    assert caption_label(text) == (label, False)


@pytest.mark.corpus
def test_corpus_portuguese_tables_have_captions(corpus_dir: Path) -> None:
    # csc-31030043 (Cadernos Saúde Coletiva, CC BY): "Tabela 1." to "Tabela 4." captions
    tables = read_document(corpus_dir / "csc-31030043.pdf").tables
    assert [t.label for t in tables][:4] == ["Table 1", "Table 2", "Table 3", "Table 4"]
    # each caption holds its own words, with the "Tabela N." label taken off
    captions = [t.caption for t in tables[:4]]
    assert all(len(c.split()) >= 3 and not c.lower().startswith("tabela") for c in captions)
    assert len(set(captions)) == 4
