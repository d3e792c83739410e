"""Speed of the first pass against parsing alone, on the fixture corpus (run by `make bench`).

Both are timed in the same process, one after the other, after one warm-up file each (the
one-off costs of building the spaCy pipeline and the unit registry are not per-article costs).
Target: the first pass, parse included, takes at most 3 times as long as `winnow parse` alone.
"""

from __future__ import annotations

import time
from pathlib import Path

import pytest

ARTICLES = Path(__file__).resolve().parents[2] / "fixtures" / "articles"
#: The first pass (parse included) may take at most this many times the parse alone.
TARGET_RATIO = 3.0


def _files() -> list[Path]:
    return sorted(ARTICLES.glob("*.pdf")) + sorted(ARTICLES.glob("*.xml"))


def test_first_pass_within_three_times_parse() -> None:
    ingest = pytest.importorskip("extract.ingest")
    assemble = pytest.importorskip("extract.records.assemble")
    patterns = pytest.importorskip("extract.records.patterns")
    units = pytest.importorskip("extract.units")
    files = _files()
    if not files:
        pytest.skip("no fixture articles in fixtures/articles")

    def parse_all() -> float:
        start = time.perf_counter()
        for path in files:
            ingest.read_document(path)
        return time.perf_counter() - start

    def first_pass_all() -> tuple[float, int]:
        # Start each pass cold: the label and unit caches must not carry one pass into the next,
        # or the same files read twice would look faster than a batch of new articles.
        patterns.clear_caches()
        units.clear_caches()
        start = time.perf_counter()
        count = 0
        for path in files:
            count += len(assemble.first_pass(ingest.read_document(path)))
        return time.perf_counter() - start, count

    assemble.first_pass(ingest.read_document(files[0]))  # warm-up: pipeline, registry, caches
    parse_s = min(parse_all() for _ in range(2))
    first_s, proposals = min(first_pass_all() for _ in range(2))
    ratio = first_s / parse_s
    print(
        f"\nfirst pass speed on {len(files)} fixture files: parse {parse_s:.2f} s "
        f"({parse_s / len(files) * 1000:.0f} ms/file), first pass incl. parse {first_s:.2f} s "
        f"({first_s / len(files) * 1000:.0f} ms/file, {proposals} proposals); "
        f"ratio {ratio:.2f}x (target <= {TARGET_RATIO:.0f}x)"
    )
    assert proposals > 0
    assert ratio <= TARGET_RATIO
