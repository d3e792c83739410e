"""The records-level extractors are in the registry under the ids their proposals record."""

from __future__ import annotations

from extract import registry
from extract.records import from_tables, from_text


def test_record_extractors_are_registered_under_their_ids() -> None:
    ids = registry.names()
    assert from_text.EXTRACTOR in ids
    assert from_tables.EXTRACTOR in ids
    assert registry.get("tables.cells").id == from_tables.EXTRACTOR
