"""Store fixtures: the same tests on an in-memory and on a file SQLite store.

Set ``WINNOW_TEST_PG_URL`` (e.g. ``postgresql+psycopg://postgres@127.0.0.1:54329/winnow_test``,
psycopg 3 installed) to run them on PostgreSQL too; that database is emptied before each test.
"""

from __future__ import annotations

import os
from collections.abc import Iterator
from pathlib import Path

import pytest

from extract.store import Store, open_store
from tests.store.samples import KEY, make_document, sample_proposals

PG_URL = os.environ.get("WINNOW_TEST_PG_URL")
BACKENDS = ["memory", "file"] + (["postgresql"] if PG_URL else [])


def _empty_postgresql(url: str) -> None:
    from sqlalchemy import create_engine, text

    engine = create_engine(url)
    with engine.begin() as connection:
        connection.execute(text("DROP SCHEMA public CASCADE"))
        connection.execute(text("CREATE SCHEMA public"))
    engine.dispose()


@pytest.fixture(params=BACKENDS)
def store(request: pytest.FixtureRequest, tmp_path: Path) -> Iterator[Store]:
    """An empty store on each backend in BACKENDS."""
    if request.param == "postgresql":
        assert PG_URL is not None
        _empty_postgresql(PG_URL)
        target: str | Path = PG_URL
    elif request.param == "memory":
        target = ":memory:"
    else:
        target = tmp_path / "db" / "winnow.sqlite"
    opened = open_store(target)
    yield opened
    opened.close()


@pytest.fixture
def filled(store: Store) -> Store:
    """A store holding the sample article and its four proposals."""
    store.add_article(make_document(), extractor_key=KEY)
    store.add_proposals("velorin-kidney", sample_proposals())
    return store
