"""One curator's review of one article: which proposal is shown, claims, timing, decisions.

The session holds no widgets; the review screen calls it. Every decision goes straight to the
store (each its own committed transaction), so a crash loses nothing already decided. The session
claims the proposal it shows and releases the claim when it moves on or closes, so two curators
on one store never review the same proposal at once. The seconds from showing a proposal to the
decision on it are measured with an injectable clock and stored with the decision.
"""

from __future__ import annotations

import logging
import time
from collections.abc import Callable, Sequence
from typing import Any

from extract.records.proposal import Proposal
from extract.review.form import changed_fields
from extract.store import Store
from extract.store.rows import Decision, ProposalState

log = logging.getLogger(__name__)

#: Seconds a claim on the shown proposal lasts before another curator may take it over.
DEFAULT_CLAIM_TTL = 600
#: The reason stored for a rejection the curator gave no reason for.
NO_REASON = "other: no reason given"
#: Axes along which a table's proposals can be accepted together.
AXES: tuple[str, ...] = ("row", "col")


class ReviewSession:
    """A curator reviewing the proposals of one article, in document order.

    Args:
        store: the open store.
        article_id: the article under review.
        curator: the curator's name, stored with every decision and claim.
        clock: seconds as a float (``time.monotonic`` by default; tests pass their own).
        claim_ttl: seconds a claim lasts.
    """

    def __init__(
        self,
        store: Store,
        article_id: str,
        *,
        curator: str,
        clock: Callable[[], float] = time.monotonic,
        claim_ttl: int = DEFAULT_CLAIM_TTL,
    ) -> None:
        self.store = store
        self.article_id = article_id
        self.curator = curator
        self.clock = clock
        self.claim_ttl = claim_ttl
        self.states: list[ProposalState] = []
        self.index: int | None = None
        self.holds_claim = False
        self.passed_over: set[str] = set()
        self._shown_at = clock()

    # -- where we are -------------------------------------------------------------------------

    @property
    def current(self) -> ProposalState | None:
        """The proposal shown now, or None when there is nothing left to show."""
        if self.index is None or not 0 <= self.index < len(self.states):
            return None
        return self.states[self.index]

    def refresh(self) -> None:
        """Reload the article's proposals (states change as decisions are recorded)."""
        current_id = self.current.id if self.current else None
        self.states = list(self.store.proposals(self.article_id))
        ids = [s.id for s in self.states]
        self.index = ids.index(current_id) if current_id in ids else None

    def elapsed(self) -> float:
        """Seconds since the current proposal was shown."""
        return max(0.0, self.clock() - self._shown_at)

    def counts(self) -> dict[str, int]:
        """Proposals of this article by state."""
        counts: dict[str, int] = {}
        for state in self.states:
            counts[state.state] = counts.get(state.state, 0) + 1
        return counts

    # -- moving -------------------------------------------------------------------------------

    def _show(self, index: int | None) -> bool:
        """Show the proposal at ``index``: release the old claim, claim the new one."""
        old = self.current
        if (
            old is not None
            and self.holds_claim
            and (index is None or self.states[index].id != old.id)
        ):
            self.store.release(old.id, self.curator)
        self.index = index
        self.holds_claim = False
        self._shown_at = self.clock()
        if self.current is not None:
            self.holds_claim = self.store.claim(
                self.current.id, self.curator, ttl_seconds=self.claim_ttl
            )
        return self.holds_claim

    def start(self) -> ProposalState | None:
        """Load the proposals and show the first pending one (resuming where work stopped)."""
        self.states = list(self.store.proposals(self.article_id))
        self.index = None
        return self.advance(from_start=True)

    def advance(self, *, from_start: bool = False) -> ProposalState | None:
        """Show the next pending proposal after the current one (wrapping), or None if none.

        Proposals claimed by another curator and proposals passed over as bad are left out.
        """
        self.refresh()
        start = 0 if from_start or self.index is None else self.index + 1
        order = list(range(start, len(self.states))) + list(range(0, start))
        for index in order:
            state = self.states[index]
            if state.state != "pending" or state.id in self.passed_over:
                continue
            if state.claimed_by not in (None, self.curator):
                continue
            if self._show(index):
                return state
        self._show(None)
        return None

    def browse(self, step: int) -> ProposalState | None:
        """Show the proposal ``step`` places away in document order, whatever its state."""
        self.refresh()
        if not self.states:
            return None
        index = 0 if self.index is None else (self.index + step) % len(self.states)
        self._show(index)
        return self.current

    def go_to(self, proposal_id: str) -> ProposalState | None:
        """Show the proposal with this id."""
        self.refresh()
        for index, state in enumerate(self.states):
            if state.id == proposal_id:
                self._show(index)
                return state
        return None

    def pass_over(self, proposal_id: str) -> None:
        """Leave out a proposal that cannot be shown (a bad proposal) for the rest of the session."""
        self.passed_over.add(proposal_id)

    def close(self) -> None:
        """Release the claim on the shown proposal."""
        if self.current is not None and self.holds_claim:
            self.store.release(self.current.id, self.curator)
        self.holds_claim = False

    # -- deciding -----------------------------------------------------------------------------

    def _decide(self, state: ProposalState, action: str, **kwargs: Any) -> Decision:
        decision = self.store.record_decision(
            state.id, curator=self.curator, action=action, **kwargs
        )
        log.info("%s %s %s", self.curator, action, state.id)
        return decision

    def _require_current(self) -> ProposalState:
        state = self.current
        if state is None:
            raise LookupError("no proposal is shown")
        return state

    def accept(self) -> Decision:
        """Accept the shown proposal as it is."""
        return self._decide(self._require_current(), "accept", seconds=self.elapsed())

    def edit(self, edited: Proposal) -> Decision | None:
        """Store an edit of the shown proposal (only the fields that changed; None if none did)."""
        state = self._require_current()
        changes = changed_fields(state.current, edited)
        if not changes:
            return None
        before = {name: old for name, (old, _) in changes.items()}
        after = {name: new for name, (_, new) in changes.items()}
        return self._decide(state, "edit", before=before, after=after, seconds=self.elapsed())

    def reject(self, reason: str | None = None) -> Decision:
        """Reject the shown proposal, with an optional reason from the fixed list.

        The log wants a reason on every rejection; none given is stored as
        :data:`NO_REASON` (an "other" reason that says so).
        """
        return self._decide(
            self._require_current(), "reject", reason=reason or NO_REASON, seconds=self.elapsed()
        )

    def skip(self) -> Decision:
        """Skip the shown proposal (it leaves the pending list; undo brings it back)."""
        return self._decide(self._require_current(), "skip", seconds=self.elapsed())

    def undo(self) -> Decision | None:
        """Undo this curator's last decision on this article and show its proposal again."""
        undo = self.store.undo_last(self.curator, article_id=self.article_id)
        if undo is not None:
            self.go_to(undo.proposal_id)
        return undo

    def add(self, proposal: Proposal) -> ProposalState | None:
        """Store a data point the first pass missed (with an "add" decision), and show it."""
        added = self.store.add_manual_proposal(
            self.article_id, proposal, curator=self.curator, seconds=self.elapsed()
        )
        log.info("%s added %s", self.curator, added.id)
        return self.go_to(added.id)

    def peers(self, axis: str) -> list[ProposalState]:
        """Pending proposals from the same table row (``"row"``) or column (``"col"``).

        They come in document order; proposals claimed by another curator are left out.
        """
        if axis not in AXES:
            raise ValueError(f"axis must be one of {AXES}, got {axis!r}")
        state = self._require_current()
        source = state.current.source
        if source.kind != "table":
            return []
        self.refresh()
        picked = []
        for other in self.states:
            where = other.current.source
            if (
                where.kind == "table"
                and where.table == source.table
                and getattr(where, axis) == getattr(source, axis)
                and other.state == "pending"
                and other.claimed_by in (None, self.curator)
                and other.id not in self.passed_over
            ):
                picked.append(other)
        return picked

    def accept_many(self, states: Sequence[ProposalState]) -> list[Decision]:
        """Accept several proposals at once (a table row or column the curator looked at).

        The seconds spent are shared equally among them. Each proposal is claimed before its
        decision, so one held by another curator meanwhile is left out.
        """
        if not states:
            return []
        share = self.elapsed() / len(states)
        decisions = []
        current = self.current
        for state in states:
            mine = current is not None and state.id == current.id and self.holds_claim
            if not mine and not self.store.claim(
                state.id, self.curator, ttl_seconds=self.claim_ttl
            ):
                continue
            decisions.append(self._decide(state, "accept", seconds=share))
            if not mine:
                self.store.release(state.id, self.curator)
        return decisions
