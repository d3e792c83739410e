"""The decision log: append-only, state computed from it, undo."""

from __future__ import annotations

from datetime import datetime

import pytest
from sqlalchemy import text
from sqlalchemy.exc import DBAPIError

from extract.errors import StoreError
from extract.store import Store


def first_id(store: Store) -> str:
    return store.proposals("velorin-kidney")[0].id


def test_decision_rows_carry_provenance(filled: Store) -> None:
    pid = first_id(filled)
    decision = filled.record_decision(
        pid, curator="ana", action="edit", after={"value": 24.7}, seconds=3.5
    )
    assert decision.before == {"value": 24.1}  # filled in from the current record
    assert decision.extractor == "quantities.rules@0.1"
    assert decision.seconds == 3.5 and decision.seq >= 1 and len(decision.uid) == 32
    # ISO 8601 in UTC (Python's datetime.fromisoformat reads it back with a zero offset).
    assert datetime.fromisoformat(decision.created).utcoffset().total_seconds() == 0  # type: ignore[union-attr]
    assert list(filled.decisions()) == [decision]


def test_append_only_update_and_delete_fail(filled: Store) -> None:
    filled.record_decision(first_id(filled), curator="ana", action="accept")
    # SQLite "CREATE TRIGGER ... RAISE(ABORT, msg)" aborts the statement
    # (https://sqlite.org/lang_createtrigger.html, "The RAISE() function").
    with filled.engine.connect() as connection:
        with pytest.raises(DBAPIError, match="append-only"):
            connection.execute(text("UPDATE decisions SET action = 'reject'"))
        connection.rollback()
        with pytest.raises(DBAPIError, match="append-only"):
            connection.execute(text("DELETE FROM decisions"))
        connection.rollback()
    assert [d.action for d in filled.decisions()] == ["accept"]


def test_state_follows_latest_decision(filled: Store) -> None:
    pid = first_id(filled)
    filled.record_decision(pid, curator="ana", action="skip")
    assert filled.proposal(pid).state == "skipped"
    filled.record_decision(pid, curator="ana", action="edit", after={"value": 24.7, "n": 8})
    filled.record_decision(pid, curator="ana", action="accept")
    state = filled.proposal(pid)
    # An edit followed by an accept keeps the edit in the current record.
    assert state.state == "accepted"
    assert (state.current.value, state.current.n) == (24.7, 8)
    assert (state.proposal.value, state.proposal.n) == (24.1, 9)


def test_undo_reverts_latest_and_walks_back(filled: Store) -> None:
    states = filled.proposals("velorin-kidney")
    filled.record_decision(states[0].id, curator="ana", action="edit", after={"value": 30.0})
    filled.record_decision(states[0].id, curator="ana", action="reject", reason="wrong value")
    filled.record_decision(states[1].id, curator="bo", action="accept")
    undo = filled.undo_last("ana")
    assert undo is not None and undo.action == "undo"
    after_one = filled.proposal(states[0].id)
    assert after_one.state == "edited" and after_one.current.value == 30.0
    filled.undo_last("ana")
    after_two = filled.proposal(states[0].id)
    assert after_two.state == "pending" and after_two.current.value == 24.1
    assert filled.undo_last("ana") is None
    # Bo's decision is untouched by Ana's undos, and the log still holds all five rows.
    assert filled.proposal(states[1].id).state == "accepted"
    assert [d.action for d in filled.decisions()] == ["edit", "reject", "accept", "undo", "undo"]


def test_undo_by_uid_and_errors(filled: Store) -> None:
    pid = first_id(filled)
    with pytest.raises(StoreError, match="nothing to undo"):
        filled.record_decision(pid, curator="ana", action="undo")
    accept = filled.record_decision(pid, curator="ana", action="accept")
    undo = filled.record_decision(pid, curator="ana", action="undo", reverts=accept.uid)
    assert undo.reverts == accept.uid and filled.proposal(pid).state == "pending"
    with pytest.raises(StoreError, match="not an effective decision"):
        filled.record_decision(pid, curator="ana", action="undo", reverts=accept.uid)


def test_undo_last_limited_to_article(filled: Store) -> None:
    pid = first_id(filled)
    filled.record_decision(pid, curator="ana", action="accept")
    assert filled.undo_last("ana", article_id="other-article") is None
    assert filled.undo_last("ana", article_id="velorin-kidney") is not None


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"action": "approve"}, "unknown action"),
        ({"action": "reject"}, "needs a reason"),
        ({"action": "reject", "reason": "looks odd"}, "needs a reason"),
        ({"action": "edit"}, "needs the changed fields"),
        ({"action": "edit", "after": {"colour": "red"}}, "unknown proposal field"),
        ({"action": "edit", "after": {"statistic": "mode"}}, "statistic"),
        ({"action": "accept", "seconds": -1.0}, "negative"),
        ({"action": "accept", "curator": " "}, "curator"),
    ],
)
def test_bad_decisions_are_refused_and_not_logged(
    filled: Store, kwargs: dict[str, object], message: str
) -> None:
    arguments: dict[str, object] = {"curator": "ana", **kwargs}
    with pytest.raises((StoreError, ValueError), match=message):
        filled.record_decision(first_id(filled), **arguments)  # type: ignore[arg-type]
    assert list(filled.decisions()) == []


def test_other_reason_may_carry_text(filled: Store) -> None:
    pid = first_id(filled)
    decision = filled.record_decision(
        pid, curator="ana", action="reject", reason="other: figure axis label"
    )
    assert decision.reason == "other: figure axis label"


def test_decisions_filter_by_since_and_curator(filled: Store) -> None:
    states = filled.proposals("velorin-kidney")
    first = filled.record_decision(states[0].id, curator="ana", action="accept")
    second = filled.record_decision(states[1].id, curator="bo", action="accept")
    assert [d.uid for d in filled.decisions(since=first.seq)] == [second.uid]
    assert [d.uid for d in filled.decisions(since=second.created)] == [second.uid]
    assert [d.uid for d in filled.decisions(curator="ana")] == [first.uid]
    assert [d.uid for d in filled.decisions(since=datetime.fromisoformat(first.created))] == [
        first.uid,
        second.uid,
    ]


def test_unknown_proposal_is_refused(filled: Store) -> None:
    with pytest.raises(StoreError, match="no proposal"):
        filled.record_decision("nope", curator="ana", action="accept")
