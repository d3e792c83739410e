"""PDF and JATS XML of the same article give the same data points (pages aside).

For every fixture article that ships both files, the first pass runs on each and the data points
are compared as multisets of (source kind, table, value, unit, dispersion, n): the page, box and
XML element path differ by nature and are left out.
"""

from __future__ import annotations

from collections import Counter
from pathlib import Path

import pytest

from extract.evaluate import normalize_unit
from extract.records.proposal import Proposal

ARTICLES = Path(__file__).resolve().parent.parent / "fixtures" / "articles"
PAIRS = sorted(p.stem for p in ARTICLES.glob("*.xml") if p.with_suffix(".pdf").is_file())

Key = tuple[str, str | None, float, str | None, str | None, object, int | None]


def data_point_key(proposal: Proposal) -> Key:
    dispersion = proposal.dispersion
    spread: object = None
    if dispersion is not None:
        value = dispersion.value
        spread = tuple(round(v, 6) for v in value) if isinstance(value, tuple) else round(value, 6)
    return (
        proposal.source.kind,
        (proposal.source.table or "").casefold() or None,
        round(proposal.value, 6),
        normalize_unit(proposal.unit),
        dispersion.kind if dispersion else None,
        spread,
        proposal.n,
    )


@pytest.fixture(scope="module")
def read_both() -> dict[str, tuple[Counter[Key], Counter[Key]]]:
    assemble = pytest.importorskip("extract.records.assemble")
    ingest = pytest.importorskip("extract.ingest")
    if not PAIRS:
        pytest.skip("no fixture article has both a PDF and an XML")
    out = {}
    for stem in PAIRS:
        keys = []
        for suffix in (".pdf", ".xml"):
            document = ingest.read_document(ARTICLES / f"{stem}{suffix}")
            keys.append(Counter(data_point_key(p) for p in assemble.first_pass(document)))
        out[stem] = (keys[0], keys[1])
    return out


def test_some_fixture_articles_have_both_formats() -> None:
    if not ARTICLES.is_dir():
        pytest.skip("fixtures/articles not generated yet")
    assert PAIRS, "the fixture set should include articles with both PDF and JATS XML"


@pytest.mark.parametrize("stem", PAIRS)
def test_pdf_and_xml_agree_on_data_points(
    stem: str, read_both: dict[str, tuple[Counter[Key], Counter[Key]]]
) -> None:
    from_pdf, from_xml = read_both[stem]
    assert from_pdf, f"{stem}.pdf gave no data points"
    only_pdf = sorted(map(str, (from_pdf - from_xml).elements()))
    only_xml = sorted(map(str, (from_xml - from_pdf).elements()))
    assert not only_pdf and not only_xml, (
        f"{stem}: only from PDF {only_pdf[:5]} ({len(only_pdf)}); "
        f"only from XML {only_xml[:5]} ({len(only_xml)})"
    )
