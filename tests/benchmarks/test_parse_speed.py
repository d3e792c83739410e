"""Pages per second: ``read_document`` vs pdfplumber ``extract_words`` + ``find_tables``.

Run with ``make bench`` (``pytest -q -s tests/benchmarks``). Both readers see the same pages in
the same run; the table prints pages/s and the ratio. The target is a ratio of at least 5.
"""

from __future__ import annotations

import time
from pathlib import Path

import pdfplumber
import pytest

from extract.ingest import read_document
from extract.ingest.pdf import read_pdf  # imported up front, as pdfplumber is

assert read_pdf

REPO = Path(__file__).resolve().parents[2]
FIXTURES = sorted((REPO / "fixtures" / "articles").glob("*.pdf"))
CORPUS = sorted((REPO.parent / "shared" / "corpus" / "real").glob("*.pdf"))


def _ours(paths: list[Path]) -> tuple[int, float]:
    started = time.perf_counter()
    pages = sum(len(read_document(p).pages) for p in paths)
    return pages, time.perf_counter() - started


def _plumber(paths: list[Path]) -> tuple[int, float]:
    started = time.perf_counter()
    pages = 0
    for path in paths:
        with pdfplumber.open(path) as pdf:
            for page in pdf.pages:
                page.extract_words()
                page.find_tables()
                pages += 1
    return pages, time.perf_counter() - started


def test_parse_speed() -> None:
    sets = [("fixtures", FIXTURES), ("corpus", CORPUS)]
    sets = [(name, paths) for name, paths in sets if paths]
    if not sets:
        pytest.skip("no PDFs to measure")
    rows = []
    for name, paths in sets:
        pages, ours = _ours(paths)
        pages_b, theirs = _plumber(paths)
        assert pages == pages_b
        rows.append((name, pages, pages / ours, pages / theirs, theirs / ours))
    print()
    print(f"{'set':10} {'pages':>6} {'winnow p/s':>11} {'pdfplumber p/s':>15} {'ratio':>6}")
    for name, pages, ours_rate, their_rate, ratio in rows:
        print(f"{name:10} {pages:6d} {ours_rate:11.1f} {their_rate:15.1f} {ratio:6.1f}")
    assert all(row[4] >= 5 for row in rows)
