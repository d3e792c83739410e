"""How a proposal's state and current record follow from the decision log.

The log is only ever appended to. An "undo" decision names (``reverts``) an earlier decision on
the same proposal; that decision then no longer counts. The *effective* decisions are those that
are not undos and not undone, in log order. A proposal's state is the state of its latest
effective decision ("pending" when there is none), and its current record is the original with
the ``after`` fields of every effective "edit" (and "add") applied in order, so an edit followed
by an accept keeps the edit.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import fields
from typing import Any

from extract.records.proposal import Proposal
from extract.store.rows import Decision
from extract.store.schema import STATE_OF_ACTION

#: Actions whose ``after`` fields change the current record.
CHANGING_ACTIONS: frozenset[str] = frozenset({"edit", "add"})
#: Field names a decision may change.
PROPOSAL_FIELDS: frozenset[str] = frozenset(f.name for f in fields(Proposal))


def effective_decisions(log: Sequence[Decision]) -> list[Decision]:
    """The decisions of one proposal that still count, in log order."""
    undone = {d.reverts for d in log if d.action == "undo" and d.reverts}
    return [d for d in log if d.action != "undo" and d.uid not in undone]


def state_of(log: Sequence[Decision]) -> tuple[str, Decision | None]:
    """The state and the latest effective decision of one proposal's log."""
    effective = effective_decisions(log)
    if not effective:
        return "pending", None
    last = effective[-1]
    return STATE_OF_ACTION[last.action], last


def apply_changes(proposal: Proposal, changes: dict[str, Any]) -> Proposal:
    """The proposal with ``changes`` (fields in the record's JSON form) applied.

    Raises:
        ValueError: an unknown field, or a value the proposal record does not accept.
    """
    unknown = sorted(set(changes) - PROPOSAL_FIELDS)
    if unknown:
        raise ValueError(f"unknown proposal field(s): {', '.join(unknown)}")
    data = proposal.to_dict()
    data.update(changes)
    try:
        return Proposal.from_dict(data)
    except (KeyError, TypeError) as error:
        raise ValueError(f"changes do not make a valid record ({error})") from error


def current_of(proposal: Proposal, log: Sequence[Decision]) -> Proposal:
    """The proposal with every effective edit applied, in log order."""
    current = proposal
    for decision in effective_decisions(log):
        if decision.action in CHANGING_ACTIONS and decision.after:
            current = apply_changes(current, decision.after)
    return current
