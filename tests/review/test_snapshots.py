"""SVG snapshots of the main screens at 80x24 and 100x30 (update with --snapshot-update after a look)."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

import pytest
from textual.pilot import Pilot
from textual.widgets import Input

from extract.review import ReviewApp
from tests.review.conftest import FakeClock
from tests.review.scenario import ARTICLE, build_store

SnapCompare = Callable[..., bool]


async def _steady(pilot: Pilot[None]) -> None:
    """Cursor blink off, so the picture does not depend on the moment it is taken."""
    await pilot.pause()
    for field in pilot.app.screen.query(Input):
        field.cursor_blink = False
    await pilot.pause()


def _app(tmp_path: Path, *, article: str | None = ARTICLE) -> ReviewApp:
    store = build_store(tmp_path / "snap.sqlite")
    return ReviewApp(store, curator="ana", article_id=article, clock=FakeClock())


@pytest.mark.parametrize("size", [(80, 24), (100, 30)])
def test_article_list(snap_compare: SnapCompare, tmp_path: Path, size: tuple[int, int]) -> None:
    app = _app(tmp_path, article=None)
    assert snap_compare(app, press=["down"], terminal_size=size, run_before=_steady)


@pytest.mark.parametrize("size", [(80, 24), (100, 30)])
def test_review_text_source(
    snap_compare: SnapCompare, tmp_path: Path, size: tuple[int, int]
) -> None:
    assert snap_compare(_app(tmp_path), terminal_size=size, run_before=_steady)


def test_review_table_source(snap_compare: SnapCompare, tmp_path: Path) -> None:
    app = _app(tmp_path)
    assert snap_compare(app, press=["a", "a"], terminal_size=(80, 24), run_before=_steady)


def test_edit_form(snap_compare: SnapCompare, tmp_path: Path) -> None:
    app = _app(tmp_path)
    assert snap_compare(app, press=["e"], terminal_size=(100, 30), run_before=_steady)


def test_help_screen(snap_compare: SnapCompare, tmp_path: Path) -> None:
    app = _app(tmp_path)
    assert snap_compare(app, press=["question_mark"], terminal_size=(80, 24), run_before=_steady)
