"""Fixtures for the review tests: a fresh store file per test and a clock the test moves."""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import pytest

from extract.store import Store
from tests.review.scenario import build_store


class FakeClock:
    """A clock that stands still until the test moves it (to check stored seconds exactly)."""

    def __init__(self) -> None:
        self.now = 1000.0

    def __call__(self) -> float:
        return self.now

    def advance(self, seconds: float) -> None:
        self.now += seconds


@pytest.fixture
def store_path(tmp_path: Path) -> Path:
    return tmp_path / "review.sqlite"


@pytest.fixture
def store(store_path: Path) -> Iterator[Store]:
    built = build_store(store_path)
    yield built
    built.close()


@pytest.fixture
def clock() -> FakeClock:
    return FakeClock()


@pytest.fixture
def anyio_backend() -> str:
    return "asyncio"
