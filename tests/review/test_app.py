"""Pilot tests of the review app: every action and what it leaves in the store."""

from __future__ import annotations

import pytest
from textual.widgets import DataTable, Input, ProgressBar, Static

from extract.review import ReviewApp, key_groups
from extract.review.screens.articles import ArticleListScreen
from extract.review.screens.choose import BulkAcceptScreen, RejectScreen
from extract.review.screens.edit import EditScreen
from extract.review.screens.help import HelpScreen, binding_rows
from extract.review.screens.review import ReviewScreen
from extract.review.session import NO_REASON
from extract.review.widgets.source_view import TableSource, TextSource
from extract.store import MANUAL_EXTRACTOR, Store
from tests.review.conftest import FakeClock
from tests.review.scenario import ARTICLE, OTHER, decisions_of, make_proposals, text_proposal

pytestmark = pytest.mark.anyio

SIZE = (100, 30)
IDS = [p.id for p in make_proposals(ARTICLE)]


def review_app(store: Store, clock: FakeClock, curator: str = "ana") -> ReviewApp:
    return ReviewApp(store, curator=curator, article_id=ARTICLE, clock=clock)


def state_of(store: Store, proposal_id: str) -> str:
    return store.proposal(proposal_id).state


def shown_id(app: ReviewApp) -> str | None:
    screen = app.screen
    assert isinstance(screen, ReviewScreen)
    current = screen.session.current
    return current.id if current else None


async def set_field(app: ReviewApp, name: str, text: str) -> None:
    field = app.screen.query_one(f"#f-{name}", Input)
    field.value = text


async def test_accept_stores_the_decision_and_its_seconds(store: Store, clock: FakeClock) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        assert shown_id(app) == IDS[0]
        clock.advance(7.5)
        await pilot.press("a")
        assert shown_id(app) == IDS[1]
    decisions = list(store.decisions())
    assert [(d.proposal_id, d.action, d.curator) for d in decisions] == [(IDS[0], "accept", "ana")]
    assert decisions[0].seconds == pytest.approx(7.5)
    assert state_of(store, IDS[0]) == "accepted"


async def test_edit_with_valid_input_stores_the_changed_fields(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        clock.advance(20)
        await pilot.press("e")
        assert isinstance(app.screen, EditScreen)
        await set_field(app, "value", "25.3")
        await set_field(app, "unit", "mg")
        await set_field(app, "n", "11")
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, ReviewScreen)
        assert shown_id(app) == IDS[1]
    [decision] = store.decisions()
    assert decision.action == "edit"
    assert decision.seconds == pytest.approx(20)
    assert decision.after is not None
    assert decision.after["value"] == 25.3
    assert decision.after["n"] == 11
    # UCUM codes "mg" (milligram); pint: 25.3 mg = 0.0253 g, the canonical mass unit.
    assert decision.after["unit_ucum"] == "mg"
    assert decision.after["value_normalized"] == pytest.approx(0.0253)
    # SD from SD is the SD itself (Cochrane Handbook 6.5.2.2): unchanged, so not in the edit.
    assert "sd" not in decision.after
    current = store.proposal(IDS[0])
    assert current.state == "edited"
    assert (current.current.value, current.current.unit, current.current.n) == (25.3, "mg", 11)
    assert current.proposal.value == 24.1  # the original proposal is kept


async def test_edit_with_invalid_input_keeps_the_form_open_and_stores_nothing(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("e")
        await set_field(app, "value", "24,1x")
        await set_field(app, "unit", "blorbs")
        await set_field(app, "n", "0")
        await set_field(app, "dispersion_value", "-2")
        await pilot.press("enter")
        await pilot.pause()
        screen = app.screen
        assert isinstance(screen, EditScreen)
        errors = str(screen.query_one("#form-errors", Static).content)
        assert "is not a number" in errors
        assert "not a unit the registry knows" in errors
        assert "not a positive whole number" in errors
        assert "cannot be negative" in errors
        assert screen.query_one("#f-unit").has_class("field-error")
        await pilot.press("escape")
        assert isinstance(app.screen, ReviewScreen)
        assert shown_id(app) == IDS[0]
    assert decisions_of(store) == []
    assert state_of(store, IDS[0]) == "pending"


async def test_edit_shows_the_ucum_code_of_a_typed_unit(store: Store, clock: FakeClock) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("e")
        await set_field(app, "unit", "mmHg")
        await pilot.pause()
        # UCUM table of units: millimetre of mercury is "mm[Hg]".
        assert "mm[Hg]" in str(app.screen.query_one("#unit-hint", Static).content)


async def test_reject_with_a_reason_and_without_one(store: Store, clock: FakeClock) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("r")
        assert isinstance(app.screen, RejectScreen)
        await pilot.press("3")
        assert shown_id(app) == IDS[1]
        await pilot.press("r", "escape")  # back out: nothing happens
        assert shown_id(app) == IDS[1]
        await pilot.press("r", "enter")  # the highlighted choice: no reason
        await pilot.pause()
    decisions = list(store.decisions())
    assert [(d.proposal_id, d.action, d.reason) for d in decisions] == [
        (IDS[0], "reject", "duplicate"),
        (IDS[1], "reject", NO_REASON),
    ]
    assert state_of(store, IDS[0]) == "rejected"


async def test_skip_moves_on_and_leaves_the_proposal_skipped(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("s")
        assert shown_id(app) == IDS[1]
    assert decisions_of(store) == [(IDS[0], "skip")]
    assert state_of(store, IDS[0]) == "skipped"


async def test_undo_reverts_the_last_decision_and_shows_it_again(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("a", "s")
        assert shown_id(app) == IDS[2]
        await pilot.press("u")
        assert shown_id(app) == IDS[1]
        await pilot.press("u")
        assert shown_id(app) == IDS[0]
        await pilot.press("u")  # nothing left to undo: no new decision
    assert decisions_of(store) == [
        (IDS[0], "accept"),
        (IDS[1], "skip"),
        (IDS[1], "undo"),
        (IDS[0], "undo"),
    ]
    assert state_of(store, IDS[0]) == state_of(store, IDS[1]) == "pending"


async def test_add_a_missed_data_point_from_a_table_cell(store: Store, clock: FakeClock) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("right_square_bracket", "right_square_bracket")  # to Table 1
        table = app.screen.query_one(TableSource)
        assert table.display and table.cursor_coordinate == (1, 1)
        table.focus()
        await pilot.press("down", "down", "right")  # Calcium × Zelvatrin: not proposed
        await pilot.press("m")
        form = app.screen
        assert isinstance(form, EditScreen)
        values = form.values()
        assert values["outcome"] == "Calcium"
        assert values["group"] == "Zelvatrin"
        assert (values["value"], values["unit"]) == ("9.9", "mg/dL")
        # the caption's footnote says "mean ± SEM", so the spread is an SEM
        assert (values["dispersion_kind"], values["dispersion_value"]) == ("SEM", "0.3")
        assert values["n"] == "12"
        await set_field(app, "outcome", "calcium")
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, ReviewScreen)
    added = [s for s in store.proposals(ARTICLE) if s.proposal.extractor == MANUAL_EXTRACTOR]
    assert len(added) == 1
    point = added[0].current
    assert (point.outcome, point.value, point.unit, point.unit_ucum) == (
        "calcium",
        9.9,
        "mg/dL",
        "mg/dL",
    )
    assert (point.source.kind, point.source.table, point.source.row, point.source.col) == (
        "table",
        "Table 1",
        3,
        2,
    )
    assert added[0].state == "added"
    assert decisions_of(store) == [(added[0].id, "add")]


async def test_add_a_missed_data_point_from_a_picked_sentence(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("right_square_bracket")  # second sentence of the results
        app.screen.query_one(TextSource).focus()
        await pilot.press("down", "m")  # the third sentence: heart rate, not proposed
        values = app.screen.values()  # type: ignore[attr-defined]
        assert (values["value"], values["unit"], values["dispersion_value"]) == ("512", "bpm", "20")
        await set_field(app, "outcome", "heart rate")
        await pilot.press("ctrl+s")
        await pilot.pause()
    [added] = [s for s in store.proposals(ARTICLE) if s.proposal.extractor == MANUAL_EXTRACTOR]
    assert added.current.outcome == "heart rate"
    assert added.current.source.quote.startswith("Heart rate did not differ")
    assert added.current.unit_ucum == "{beats}/min"  # UCUM annotation braces, common practice


async def test_accept_a_whole_table_row_after_confirming(store: Store, clock: FakeClock) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("h")  # not a table proposal: the key does nothing
        assert not isinstance(app.screen, BulkAcceptScreen)
        await pilot.press("right_square_bracket", "right_square_bracket")  # oxalin, vehicle
        clock.advance(12)
        await pilot.press("h")
        bulk = app.screen
        assert isinstance(bulk, BulkAcceptScreen)
        assert [s.id for s in bulk.states] == [IDS[2], IDS[3]]
        await pilot.press("n")  # look, then refuse: nothing stored
        assert decisions_of(store) == []
        await pilot.press("h", "y")
        await pilot.pause()
    decisions = list(store.decisions())
    assert [(d.proposal_id, d.action) for d in decisions] == [
        (IDS[2], "accept"),
        (IDS[3], "accept"),
    ]
    assert sum(d.seconds or 0 for d in decisions) == pytest.approx(12)


async def test_accept_a_whole_table_column_leaves_decided_cells_alone(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("right_square_bracket", "right_square_bracket", "r", "1")
        assert shown_id(app) == IDS[3]  # oxalin vehicle rejected, now oxalin zelvatrin
        await pilot.press("left_square_bracket", "right_square_bracket")
        await pilot.press("left_square_bracket")  # back on the rejected vehicle cell
        assert shown_id(app) == IDS[2]
        await pilot.press("v")
        bulk = app.screen
        assert isinstance(bulk, BulkAcceptScreen)
        # column 1 (vehicle): urea and calcium are pending, oxalin is already rejected
        assert [s.id for s in bulk.states] == [IDS[4], IDS[6]]
        await pilot.press("y")
        await pilot.pause()
    assert decisions_of(store) == [(IDS[2], "reject"), (IDS[4], "accept"), (IDS[6], "accept")]


async def test_help_screen_lists_every_key(store: Store, clock: FakeClock) -> None:
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("question_mark")
        help_screen = app.screen
        assert isinstance(help_screen, HelpScreen)
        text = _render_plain(help_screen)
        for _, bindings in key_groups():
            for keys, description in binding_rows(bindings):
                assert description in text
                assert keys in text
        await pilot.press("escape")
        assert isinstance(app.screen, ReviewScreen)


def _render_plain(screen: HelpScreen) -> str:
    from rich.console import Console

    console = Console(width=200, record=True, color_system=None)
    console.print(screen.query_one("#help-text", Static).content)
    return console.export_text()


async def test_article_list_shows_progress_by_state(store: Store, clock: FakeClock) -> None:
    app = ReviewApp(store, curator="ana", clock=clock)
    async with app.run_test(size=SIZE) as pilot:
        table = app.screen.query_one("#articles", DataTable)
        assert [str(table.get_row_at(i)[0]) for i in range(table.row_count)] == [OTHER, ARTICLE]
        await pilot.press("down", "enter")
        assert isinstance(app.screen, ReviewScreen)
        await pilot.press("a", "e")
        await set_field(app, "value", "23")
        await pilot.press("enter")
        await pilot.press("r", "1", "s", "escape")
        await pilot.pause()
        assert isinstance(app.screen, ArticleListScreen)
        row = [str(cell) for cell in table.get_row(ARTICLE)]
        # article, todo, accepted, edited, rejected, added, skipped, done
        assert row == [ARTICLE, "3", "1", "1", "1", "0", "1", "42%"]
        bar = app.screen.query_one("#overall", ProgressBar)
        assert (bar.progress, bar.total) == (3, 9)
    counts = {s.id: s.counts() for s in store.articles()}
    assert counts[ARTICLE]["pending"] == 3 and counts[OTHER]["pending"] == 2


async def test_reopening_resumes_at_the_first_pending_proposal(
    store: Store, clock: FakeClock
) -> None:
    async with review_app(store, clock).run_test(size=SIZE) as pilot:
        await pilot.press("a", "a", "s")
    app = review_app(store, clock)
    async with app.run_test(size=SIZE):
        assert shown_id(app) == IDS[3]


async def test_a_bad_proposal_is_reported_and_passed_over(store: Store, clock: FakeClock) -> None:
    # a proposal quoting a sentence the article does not hold
    quote = "Liver mass was 1.9 ± 0.1 g."
    bad = text_proposal(ARTICLE, 1.9, 0.1, "vehicle", quote, confidence=0.5)
    bad = bad.with_changes(id="bad-text-0001")
    store.add_proposals(ARTICLE, [bad])
    ids = [s.id for s in store.proposals(ARTICLE)]
    assert ids.index(IDS[1]) < ids.index("bad-text-0001") < ids.index(IDS[2])
    app = review_app(store, clock)
    async with app.run_test(size=SIZE) as pilot:
        await pilot.press("a", "a")
        await pilot.pause()
        errors = [n for n in app._notifications if n.severity == "error"]
        assert len(errors) == 1 and "bad-text-0001" in errors[0].message
        assert shown_id(app) == IDS[2]  # passed over the bad one
        await pilot.press("a")
    assert state_of(store, "bad-text-0001") == "pending"
    assert decisions_of(store) == [(IDS[0], "accept"), (IDS[1], "accept"), (IDS[2], "accept")]


async def test_edit_form_shows_the_source_quote_with_the_page(
    store: Store, clock: FakeClock
) -> None:
    app = review_app(store, clock)
    proposal = make_proposals(ARTICLE)[0]
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("e")
        assert isinstance(app.screen, EditScreen)
        shown = str(app.screen.query_one("#edit-source", Static).content)
    # The curator edits while seeing where the value came from.
    assert " ".join(proposal.source.quote.split())[:40] in shown
    if proposal.source.page is not None:
        assert f"p. {proposal.source.page}" in shown
