"""PDF reading on the fixture articles against their gold files (fixtures/articles/*.gold.json).

The word sequence is compared with pdfplumber 0.11's default ``extract_words`` (the reference
library); titles, DOIs and paragraphs in reading order with the gold files.
"""

from __future__ import annotations

import json
from pathlib import Path

import pdfplumber
import pypdfium2 as pdfium
import pytest

from extract.ingest import read_document
from extract.ingest.document import Document
from extract.ingest.glyphs import read_chars
from extract.ingest.words import chars_to_words

ARTICLES = Path(__file__).resolve().parents[2] / "fixtures" / "articles"
PDFS = sorted(p for p in ARTICLES.glob("*.pdf") if p.with_suffix("").with_suffix(".gold.json"))
pytestmark = pytest.mark.skipif(not PDFS, reason="no fixture articles")


def _gold(pdf: Path) -> dict:
    return json.loads(pdf.with_name(pdf.stem + ".gold.json").read_text())


@pytest.fixture(scope="module")
def documents() -> dict[str, Document]:
    return {p.stem: read_document(p) for p in PDFS}


def _norm(text: str) -> str:
    return " ".join(text.split())


@pytest.mark.parametrize("pdf", PDFS, ids=lambda p: p.stem)
def test_words_equal_pdfplumber(pdf: Path) -> None:
    # reference: pdfplumber extract_words() defaults (x_tolerance=3, y_tolerance=3)
    document = pdfium.PdfDocument(pdf)
    with pdfplumber.open(pdf) as plumber:
        for i, page in enumerate(plumber.pages):
            ours_page = document[i]
            ours = [w.text for w in chars_to_words(read_chars(ours_page, ours_page.get_height()))]
            assert ours == [w["text"] for w in page.extract_words()], (pdf.name, i + 1)
    document.close()


@pytest.mark.parametrize("pdf", PDFS, ids=lambda p: p.stem)
def test_title_and_doi(pdf: Path, documents: dict[str, Document]) -> None:
    gold = _gold(pdf)
    document = documents[pdf.stem]
    assert document.title == gold["title"]
    assert document.doi == gold["doi"]


@pytest.mark.parametrize(
    "pdf", [p for p in PDFS if _gold(p)["layout"]["columns"] == 1], ids=lambda p: p.stem
)
def test_paragraphs_in_reading_order_one_column(pdf: Path, documents: dict[str, Document]) -> None:
    blocks = [_norm(b.text) for b in documents[pdf.stem].blocks]
    position = -1
    for paragraph in _gold(pdf)["paragraphs"]:
        hits = [i for i, b in enumerate(blocks) if _norm(paragraph["text"]) in b]
        assert hits, paragraph["text"][:60]
        assert hits[0] >= position
        position = hits[0]
