"""Shared test options and fixtures."""

from __future__ import annotations

from pathlib import Path

import pytest

REPO = Path(__file__).resolve().parent.parent
FIXTURES = REPO / "fixtures"
ARTICLES = FIXTURES / "articles"
#: Real openly licensed articles (licences in SOURCES.md there); absent outside this workplace.
CORPUS = REPO.parent / "shared" / "corpus" / "real"


def pytest_addoption(parser: pytest.Parser) -> None:
    parser.addoption("--slow", action="store_true", help="run slow tests (training, big batches)")
    parser.addoption(
        "--update-golden", action="store_true", help="rewrite tests/golden/ from the current output"
    )


def pytest_collection_modifyitems(config: pytest.Config, items: list[pytest.Item]) -> None:
    if config.getoption("--slow"):
        return
    skip = pytest.mark.skip(reason="slow: run with --slow")
    for item in items:
        if "slow" in item.keywords:
            item.add_marker(skip)


@pytest.fixture(scope="session")
def update_golden(request: pytest.FixtureRequest) -> bool:
    return bool(request.config.getoption("--update-golden"))


@pytest.fixture(scope="session")
def corpus_dir() -> Path:
    if not CORPUS.is_dir():
        pytest.skip("the real-article corpus (../shared/corpus/real) is absent")
    return CORPUS
