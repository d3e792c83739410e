"""PDF reading: words, reading order, sections, tables, bad input.

External references: pdfplumber 0.11 (its default ``extract_words`` word sequence and its
"lines" table strategy on ruled grids) and the PDF file structure of ISO 32000-1 (7.5.2: a PDF
starts with ``%PDF-``; 7.6: encryption). Expected texts come from tests/ingest/pdfmaker.py.
"""

from __future__ import annotations

from pathlib import Path

import pdfmaker
import pdfplumber
import pypdfium2 as pdfium
import pytest

from extract.errors import PDFReadError, UnsupportedFileError
from extract.ingest import read_document
from extract.ingest.document import Document
from extract.ingest.glyphs import read_chars
from extract.ingest.tables import unit_of
from extract.ingest.words import chars_to_words


@pytest.fixture(scope="module")
def article(made_pdfs: dict[str, Path]) -> Document:
    return read_document(made_pdfs["article"])


@pytest.fixture(scope="module")
def long_table(made_pdfs: dict[str, Path]) -> Document:
    return read_document(made_pdfs["long"])


def _norm(text: str) -> str:
    return " ".join(text.split())


def test_words_equal_pdfplumber(made_pdfs: dict[str, Path]) -> None:
    # reference: pdfplumber's extract_words() with its defaults (x/y tolerance 3)
    for name in ("article", "long"):
        path = made_pdfs[name]
        pdf = pdfium.PdfDocument(path)
        with pdfplumber.open(path) as plumber:
            for i, page in enumerate(plumber.pages):
                expected = [w["text"] for w in page.extract_words()]
                ours_page = pdf[i]
                ours = [
                    w.text for w in chars_to_words(read_chars(ours_page, ours_page.get_height()))
                ]
                assert ours == expected, (name, i + 1)
        pdf.close()


def test_word_boxes_match_pdfplumber(made_pdfs: dict[str, Path]) -> None:
    # reference: pdfplumber word boxes (pdfminer geometry): x within 0.1 pt
    path = made_pdfs["article"]
    pdf = pdfium.PdfDocument(path)
    page = pdf[0]
    ours = chars_to_words(read_chars(page, page.get_height()))
    with pdfplumber.open(path) as plumber:
        theirs = plumber.pages[0].extract_words()
    for a, b in zip(ours, theirs, strict=True):
        assert a.x0 == pytest.approx(b["x0"], abs=0.1)
        assert a.x1 == pytest.approx(b["x1"], abs=0.1)
        # the font descent of the base-14 fonts differs a little between pdfium and pdfminer
        assert a.bottom == pytest.approx(b["bottom"], abs=0.5)
    pdf.close()


def test_title_doi_columns(article: Document) -> None:
    assert article.title == pdfmaker.TITLE
    assert article.doi == pdfmaker.DOI
    assert [p.columns for p in article.pages][0] == 2
    assert article.pages[0].width == pytest.approx(595.2756, abs=0.01)  # A4 in points


def test_paragraphs_in_reading_order(article: Document) -> None:
    texts = [_norm(b.text) for b in article.blocks if b.kind == "paragraph"]
    position = -1
    for section, paragraph in pdmaker_paragraphs():
        index = texts.index(_norm(paragraph))
        assert index > position, paragraph
        position = index
        block = [b for b in article.blocks if _norm(b.text) == _norm(paragraph)][0]
        assert block.section == section


def pdmaker_paragraphs() -> list[tuple[str, str]]:
    return list(pdfmaker.PARAGRAPHS)


def test_sections_and_pages(article: Document) -> None:
    names = [s.name for s in article.sections]
    assert names[0] == "title"
    for name in ("abstract", "introduction", "methods", "results", "discussion"):
        assert name in names
    discussion = [s for s in article.sections if s.name == "discussion"][0]
    assert (discussion.page_start, discussion.page_end) == (1, 2)


def test_running_header_and_page_numbers_left_out(article: Document) -> None:
    texts = [b.text for b in article.blocks]
    assert not any(pdfmaker.RUNNING in t for t in texts)
    assert not any(t.strip() in {"1", "2"} for t in texts)


@pytest.mark.parametrize(
    ("label", "grid", "header_rows"),
    [
        ("Table 1", pdfmaker.RULED_GRID, 1),
        ("Table 2", pdfmaker.RULES_GRID, 2),
        ("Table 3", pdfmaker.UNRULED_GRID, 1),
    ],
)
def test_table_grids(
    article: Document, label: str, grid: list[list[str]], header_rows: int
) -> None:
    table = {t.label: t for t in article.tables}[label]
    assert table.grid() == grid
    assert table.header_rows == header_rows


def test_no_table_invented(article: Document) -> None:
    assert sorted(t.label for t in article.tables) == ["Table 1", "Table 2", "Table 3"]


def test_caption_and_footnote_linked(article: Document) -> None:
    table = {t.label: t for t in article.tables}["Table 1"]
    assert table.caption == pdfmaker.RULED_CAPTION
    assert table.footnotes == (pdfmaker.RULED_FOOTNOTE,)
    captions = [b for b in article.blocks if b.kind == "caption" and b.label == "Table 1"]
    notes = [b for b in article.blocks if b.kind == "footnote" and b.label == "Table 1"]
    assert captions and notes


def test_units_from_row_labels(article: Document) -> None:
    table = {t.label: t for t in article.tables}["Table 1"]
    assert table.row_units == (None, "g", "mmol/L", "bpm")


@pytest.mark.parametrize(
    ("label", "unit"),
    [
        ("Body mass (g)", "g"),
        ("Glucose, mmol/L", "mmol/L"),
        ("Creatinine [mg/dL]", "mg/dL"),
        ("Vehicle (n = 9)", None),
        ("Age (years)", "years"),
        ("Heart rate", None),
        ("Mean (SD)", None),
    ],
)
def test_unit_of(label: str, unit: str | None) -> None:
    # units as written in header conventions (common practice: unit in brackets or after a comma)
    assert unit_of(label) == unit


def test_ruled_grid_equals_pdfplumber_lines(made_pdfs: dict[str, Path], article: Document) -> None:
    # reference: pdfplumber's "lines" strategy, exact on ruled grids
    with pdfplumber.open(made_pdfs["article"]) as plumber:
        found = plumber.pages[0].find_tables(
            {"vertical_strategy": "lines", "horizontal_strategy": "lines"}
        )
        expected = [[c or "" for c in row] for row in found[0].extract()]
    table = {t.label: t for t in article.tables}["Table 1"]
    assert table.grid() == expected


def test_continued_table_merged(long_table: Document) -> None:
    assert len(long_table.tables) == 1
    table = long_table.tables[0]
    assert table.pages == (1, 2)
    assert table.grid() == [pdfmaker.LONG_HEADER, *pdfmaker.LONG_ROWS]
    assert table.column_units[2] == "mmol/L"
    assert {c.page for c in table.cells} == {1, 2}


@pytest.mark.parametrize(
    ("name", "reason"),
    [
        ("encrypted", "encrypted"),
        ("scan", "no text layer (image-only scan; OCR is not supported)"),
        ("truncated", "corrupt or truncated PDF"),
    ],
)
def test_bad_pdfs(made_pdfs: dict[str, Path], name: str, reason: str) -> None:
    with pytest.raises(PDFReadError) as info:
        read_document(made_pdfs[name])
    assert reason in str(info.value)
    assert str(made_pdfs[name]) in str(info.value)


def test_not_a_pdf_and_empty(tmp_path: Path) -> None:
    text = tmp_path / "notes.pdf"
    text.write_text("just some words\n")
    with pytest.raises(UnsupportedFileError, match="not a PDF or JATS XML file"):
        read_document(text)
    empty = tmp_path / "empty.pdf"
    empty.write_bytes(b"")
    with pytest.raises(UnsupportedFileError, match="empty file"):
        read_document(empty)


def test_errors_pickle(made_pdfs: dict[str, Path]) -> None:
    import pickle

    with pytest.raises(PDFReadError) as info:
        read_document(made_pdfs["encrypted"])
    again = pickle.loads(pickle.dumps(info.value))
    assert str(again) == str(info.value)


@pytest.mark.corpus
def test_corpus_pdfs_parse(corpus_dir: Path) -> None:
    # Licences (../shared/corpus/real/SOURCES.md): elife-rp95901, elife-13833, rsp-56-9,
    # bjmbr-2021e11439 CC BY 4.0; csc-31030043 CC BY; mmwr-ss5907 public domain (US government).
    for path in sorted(corpus_dir.glob("*.pdf")):
        document = read_document(path)
        assert document.blocks, path.name
        assert len(document.pages) == len(pdfium.PdfDocument(path))
        assert any(s.name in ("introduction", "methods", "results") for s in document.sections)
