"""Store fixtures: the same tests on an in-memory and on a file SQLite store."""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import pytest

from extract.store import Store, open_store
from tests.store.samples import KEY, make_document, sample_proposals


@pytest.fixture(params=["memory", "file"])
def store(request: pytest.FixtureRequest, tmp_path: Path) -> Iterator[Store]:
    """The same tests on an in-memory and on a file SQLite store."""
    target = ":memory:" if request.param == "memory" else tmp_path / "db" / "winnow.sqlite"
    opened = open_store(target)
    yield opened
    opened.close()


@pytest.fixture
def filled(store: Store) -> Store:
    """A store holding the sample article and its four proposals."""
    store.add_article(make_document(), extractor_key=KEY)
    store.add_proposals("velorin-kidney", sample_proposals())
    return store
