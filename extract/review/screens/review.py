"""The review screen: one proposal at a time, its fields above and its source below.

Every decision key writes to the store at once (through :class:`ReviewSession`) and moves on to
the next pending proposal. A proposal that cannot be shown (its source is not in the document,
or drawing it fails) is reported with an error notification, logged, and passed over.
"""

from __future__ import annotations

import logging
from typing import TYPE_CHECKING, cast

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.screen import Screen
from textual.widgets import Footer, Static

from extract.errors import StoreError, WinnowError
from extract.ingest.document import Document
from extract.records.proposal import Proposal
from extract.review.prefill import from_cell, from_sentence
from extract.review.screens.choose import BulkAcceptScreen, RejectChoice, RejectScreen
from extract.review.screens.edit import EditScreen
from extract.review.session import ReviewSession
from extract.review.widgets.fields import FieldsPanel
from extract.review.widgets.source_view import SourcePanel
from extract.store.rows import ProposalState

if TYPE_CHECKING:
    from extract.review.app import ReviewApp

log = logging.getLogger(__name__)

CAUTION = "Suggested values: verify against the article; not for clinical decisions."

#: Words for the table axes a whole row or column is accepted along.
_AXIS_WORDS = {"row": "row", "col": "column"}


class ReviewScreen(Screen[None]):
    """Review the proposals of one article in document order."""

    BINDINGS = [
        Binding("a", "accept", "Accept", tooltip="Accept the proposal as shown"),
        Binding("e", "edit", "Edit", tooltip="Edit the fields, then save (the form checks them)"),
        Binding("r", "reject", "Reject", tooltip="Reject, with an optional reason"),
        Binding("s", "skip", "Skip", tooltip="Skip for now (undo brings it back)"),
        Binding("u", "undo", "Undo", tooltip="Undo your last decision in this article"),
        Binding(
            "m",
            "add_missed",
            "Add missed",
            tooltip="Add a data point the first pass missed, from the picked sentence or cell",
        ),
        Binding(
            "h",
            "accept_many('row')",
            "Row",
            show=False,
            tooltip="Accept the whole table row (shows them first; y confirms)",
        ),
        Binding(
            "v",
            "accept_many('col')",
            "Column",
            show=False,
            tooltip="Accept the whole table column (shows them first; y confirms)",
        ),
        Binding(
            "n",
            "next_pending",
            "Next pending",
            show=False,
            tooltip="Jump to the next pending proposal, passing decided ones",
        ),
        Binding(
            "left_square_bracket",
            "browse(-1)",
            "Previous",
            show=False,
            key_display="[",
            tooltip="Previous proposal in document order, decided or not",
        ),
        Binding(
            "right_square_bracket",
            "browse(1)",
            "Next",
            show=False,
            key_display="]",
            tooltip="Next proposal in document order, decided or not",
        ),
        Binding(
            "tab",
            "app.focus_next",
            "Source",
            show=False,
            tooltip="Focus the source (it has focus when a proposal opens): arrows pick",
        ),
        Binding("escape", "leave", "Articles", tooltip="Back to the article list"),
        Binding("question_mark", "app.show_help", "Help", key_display="?"),
        Binding("q", "app.quit", "Quit", show=False),
    ]

    def __init__(self, session: ReviewSession) -> None:
        super().__init__()
        self.session = session
        self.document: Document | None = None

    @property
    def review_app(self) -> ReviewApp:
        """The app, typed."""
        return cast("ReviewApp", self.app)

    def compose(self) -> ComposeResult:
        yield Static(id="review-top")
        yield Static(Text(CAUTION, style="italic"), id="review-caution")
        yield FieldsPanel(id="fields")
        yield SourcePanel(id="source")
        yield Footer()

    def on_mount(self) -> None:
        try:
            self.document = self.session.store.document(self.session.article_id)
        except StoreError as error:
            log.error("no document for %s: %s", self.session.article_id, error)
            self.notify(f"Source text unavailable: {error}", severity="error")
        self.session.start()
        self.redraw()

    def on_unmount(self) -> None:
        self.session.close()

    # -- drawing -------------------------------------------------------------------------------

    def _top_line(self) -> Text:
        session = self.session
        counts = session.counts()
        total = len(session.states)
        position = "-" if session.index is None else str(session.index + 1)
        decided = total - counts.get("pending", 0) - counts.get("skipped", 0)
        # Counts first: at 80 columns a long article id is what gets cut, not the progress.
        return Text.assemble(
            (f"{position}/{total}", "bold"),
            f" · {decided} decided · {counts.get('pending', 0)} pending · {session.curator} · ",
            (session.article_id, "bold"),
        )

    def redraw(self) -> None:
        """Show the current proposal; pass over (and report) any that cannot be shown."""
        for _ in range(len(self.session.states) + 1):
            state = self.session.current
            try:
                self._draw()
                return
            except Exception as error:  # a bad proposal must not end the review
                if state is None:
                    raise
                log.exception("cannot show proposal %s", state.id)
                self.notify(
                    f"Proposal {state.id} cannot be shown and was passed over: {error}",
                    severity="error",
                    timeout=8,
                )
                self.session.pass_over(state.id)
                self.session.advance()

    def _draw(self) -> None:
        session = self.session
        current = session.current
        self.query_one("#review-top", Static).update(self._top_line())
        position = "" if session.index is None else f"{session.index + 1} of {len(session.states)}"
        fields = self.query_one(FieldsPanel)
        fields.border_title = "Proposal"
        source = self.query_one(SourcePanel)
        if current is None:
            fields.show_state(None)
            source.clear_source()
            return
        fields.show_state(current, position=position)
        if self.document is None:
            source.clear_source()
            source.border_title = f"Source (not stored): {current.current.source.quote[:60]}"
            return
        source.show_source(self.document, current.current)
        self.refresh_bindings()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        """Row/column accept only on table proposals; deciding only with a proposal shown."""
        current = self.session.current
        if action == "accept_many":
            return current is not None and current.current.source.kind == "table"
        return True

    # -- deciding ------------------------------------------------------------------------------

    def _guard(self) -> bool:
        if self.session.current is None:
            self.notify("Nothing to decide on here: press escape for the article list.")
            return False
        return True

    def _after_decision(self, message: str | None = None) -> None:
        if message:
            self.notify(message, timeout=2)
        self.session.advance()
        self.redraw()

    def _store_failed(self, error: WinnowError) -> None:
        log.error("decision not stored: %s", error)
        self.notify(f"Not stored: {error}", severity="error", timeout=8)
        self.session.refresh()
        self.redraw()

    def action_accept(self) -> None:
        """Accept the shown proposal."""
        if not self._guard():
            return
        try:
            self.session.accept()
        except WinnowError as error:
            self._store_failed(error)
            return
        self._after_decision()

    def action_skip(self) -> None:
        """Skip the shown proposal."""
        if not self._guard():
            return
        try:
            self.session.skip()
        except WinnowError as error:
            self._store_failed(error)
            return
        self._after_decision()

    def action_edit(self) -> None:
        """Open the edit form on the shown proposal."""
        if not self._guard():
            return
        current = self.session.current
        if current is not None:
            self.app.push_screen(EditScreen(current.current), self._edited)

    def _edited(self, edited: Proposal | None) -> None:
        if edited is None:
            return
        try:
            decision = self.session.edit(edited)
        except WinnowError as error:
            self._store_failed(error)
            return
        if decision is None:
            self.notify("Nothing changed: press a to accept it as it is.")
            return
        changed = ", ".join(sorted((decision.after or {}).keys()))
        self._after_decision(f"Edited: {changed}")

    def action_reject(self) -> None:
        """Ask for a reason, then reject the shown proposal."""
        if self._guard():
            self.app.push_screen(RejectScreen(), self._rejected)

    def _rejected(self, choice: RejectChoice | None) -> None:
        if choice is None:
            return
        try:
            self.session.reject(choice.reason)
        except WinnowError as error:
            self._store_failed(error)
            return
        self._after_decision()

    def action_undo(self) -> None:
        """Undo this curator's last decision in this article and show that proposal again."""
        try:
            undo = self.session.undo()
        except WinnowError as error:
            self._store_failed(error)
            return
        if undo is None:
            self.notify("Nothing of yours to undo in this article.")
            return
        self.notify("Your last decision here is undone; the proposal is shown again.", timeout=2)
        self.redraw()

    def action_add_missed(self) -> None:
        """Open the form pre-filled from the picked sentence or cell, to add a missed point."""
        template = self.session.current.current if self.session.current else None
        if self.document is None:
            self.notify("The article's text is not stored: nothing to add from.", severity="error")
            return
        pick = self.query_one(SourcePanel).pick()
        name = self.document.name
        article = self.session.article_id
        if pick.table is not None and pick.row is not None and pick.col is not None:
            draft = from_cell(
                pick.table, pick.row, pick.col, article=article, file=name, template=template
            )
        elif pick.block is not None and pick.span is not None:
            draft = from_sentence(
                pick.block, pick.span, article=article, file=name, template=template
            )
        else:
            self.notify("Pick a sentence or a table cell first (tab, then the arrows).")
            return
        self.app.push_screen(EditScreen(draft, title="Add a missed data point"), self._added)

    def _added(self, proposal: Proposal | None) -> None:
        if proposal is None:
            return
        try:
            self.session.add(proposal)
        except WinnowError as error:
            self._store_failed(error)
            return
        self.notify(f"Added: {proposal.outcome} {proposal.value:g}", timeout=2)
        self.redraw()

    def action_accept_many(self, axis: str) -> None:
        """Show the pending proposals of the table row or column, and accept them on y."""
        if not self._guard():
            return
        peers = self.session.peers(axis)
        if not peers:
            self.notify(f"No pending proposals in this {_AXIS_WORDS[axis]}.")
            return
        source = peers[0].current.source
        if axis == "row":
            label = peers[0].current.outcome
        else:
            label = peers[0].current.group or f"column {source.col}"
        title = f"Accept {len(peers)} from {source.table}, {_AXIS_WORDS[axis]} {label!r}?"
        self.app.push_screen(
            BulkAcceptScreen(title, peers),
            lambda confirmed: self._accept_many(peers, confirmed),
        )

    def _accept_many(self, peers: list[ProposalState], confirmed: bool | None) -> None:
        if not confirmed:
            return
        try:
            decisions = self.session.accept_many(peers)
        except WinnowError as error:
            self._store_failed(error)
            return
        left = len(peers) - len(decisions)
        note = f" ({left} held by another curator)" if left else ""
        self._after_decision(f"Accepted {len(decisions)}{note}")

    # -- moving --------------------------------------------------------------------------------

    def action_browse(self, step: int) -> None:
        """Show the proposal before or after, whatever its state."""
        self.session.browse(step)
        self.redraw()

    def action_next_pending(self) -> None:
        """Jump to the next pending proposal."""
        self.session.advance()
        self.redraw()

    def action_leave(self) -> None:
        """Release the claim and go back to the article list."""
        self.session.close()
        self.app.pop_screen()
