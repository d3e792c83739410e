"""The extractor registry against its golden list (tests/registry_contents.json)."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from extract import registry
from extract.errors import SettingsError

GOLDEN = Path(__file__).with_name("registry_contents.json")


def test_registry_matches_golden_list() -> None:
    # Changing this list is deliberate: bump versions when output changes, update the file.
    expected = json.loads(GOLDEN.read_text(encoding="utf-8"))
    assert registry.names() == expected["extractors"]


def test_get_by_id_and_by_name() -> None:
    info = registry.get("quantities.rules@3")
    assert info.id == "quantities.rules@3"
    assert info.factory == "quantities_rules"
    assert registry.get("quantities.rules") == info


def test_every_factory_exists_in_spacy() -> None:
    import spacy

    from extract.nlp.pipeline import build_pipeline

    nlp = build_pipeline()
    for name in registry.names():
        factory = registry.get(name).factory
        if factory is not None:
            assert spacy.language.Language.has_factory(factory)
            assert factory in nlp.pipe_names


def test_unknown_name_lists_available() -> None:
    with pytest.raises(SettingsError) as info:
        registry.get("quantities.magic@9")
    message = str(info.value)
    assert "quantities.magic@9" in message
    assert "quantities.rules@3" in message
