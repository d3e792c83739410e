"""Two curators on one store: claims keep them on different proposals; neither overwrites."""

from __future__ import annotations

from pathlib import Path

import pytest

from extract.review import ReviewApp
from extract.review.screens.review import ReviewScreen
from extract.store import Store, open_store
from tests.review.conftest import FakeClock
from tests.review.scenario import ARTICLE, make_proposals

pytestmark = pytest.mark.anyio

IDS = [p.id for p in make_proposals(ARTICLE)]


def shown(app: ReviewApp) -> str | None:
    screen = app.screen
    assert isinstance(screen, ReviewScreen)
    return screen.session.current.id if screen.session.current else None


async def test_two_curators_get_different_proposals_and_keep_their_decisions(
    store: Store, store_path: Path, clock: FakeClock
) -> None:
    second = open_store(store_path)  # a second connection pool, as a second process would have
    ana = ReviewApp(store, curator="ana", article_id=ARTICLE, clock=clock)
    ben = ReviewApp(second, curator="ben", article_id=ARTICLE, clock=clock)
    try:
        async with ana.run_test(size=(100, 30)) as pilot_a:
            assert shown(ana) == IDS[0]
            assert store.claimed_by(IDS[0]) == "ana"
            async with ben.run_test(size=(100, 30)) as pilot_b:
                assert shown(ben) == IDS[1]  # the first is claimed by ana
                assert second.claimed_by(IDS[1]) == "ben"
                await pilot_b.press("a")  # ben accepts IDS[1] and moves to IDS[2]
                assert shown(ben) == IDS[2]
                await pilot_a.press("r", "2")  # ana rejects IDS[0]; IDS[1] is decided, IDS[2]
                assert shown(ana) == IDS[3]  # is ben's: ana gets IDS[3]
                await pilot_a.press("a")
                await pilot_b.press("s")
                # ben browses back onto ana's proposal; deciding on it is refused, not stored
                ana_now = shown(ana)
                screen = ben.screen
                assert isinstance(screen, ReviewScreen)
                screen.session.go_to(ana_now or "")
                screen.redraw()
                await pilot_b.press("a")
                errors = [n for n in ben._notifications if n.severity == "error"]
                assert errors and "claimed" in errors[-1].message.lower()
            # ben quit: his claim is released
            assert store.claimed_by(IDS[2]) is None
    finally:
        second.close()
    log = [(d.proposal_id, d.curator, d.action) for d in store.decisions()]
    assert log == [
        (IDS[1], "ben", "accept"),
        (IDS[0], "ana", "reject"),
        (IDS[3], "ana", "accept"),
        (IDS[2], "ben", "skip"),
    ]
    assert store.proposal(IDS[0]).state == "rejected"
    assert store.proposal(IDS[1]).state == "accepted"
    assert store.proposal(IDS[1]).decision.curator == "ben"  # type: ignore[union-attr]
