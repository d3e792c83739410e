"""The decision log as JSON Lines: export, import round trip, bad lines reported by number."""

from __future__ import annotations

import io
import json
from pathlib import Path

import pytest
from jsonschema import Draft202012Validator

from extract.errors import ImportFileError
from extract.store import Store, open_store
from extract.store.decision_log import check_decisions, export_decisions, import_decisions
from tests.store.samples import make_proposal

SCHEMA = Path(__file__).resolve().parents[2] / "extract" / "schemas" / "decision.schema.json"


def curate(store: Store) -> None:
    states = store.proposals("velorin-kidney")
    store.record_decision(states[0].id, curator="ana", action="edit", after={"value": 24.7})
    store.record_decision(states[0].id, curator="ana", action="accept", seconds=4.0)
    store.record_decision(states[1].id, curator="bo", action="reject", reason="wrong value")
    store.record_decision(states[2].id, curator="bo", action="skip")
    store.undo_last("bo")
    missed = make_proposal("velorin-kidney", "tail length", 8.5, page=1, bbox=(60, 350, 250, 360))
    store.add_manual_proposal("velorin-kidney", missed, curator="ana")


def export_text(store: Store, **options: object) -> str:
    out = io.StringIO()
    export_decisions(store, out, **options)  # type: ignore[arg-type]
    return out.getvalue()


def test_export_is_json_lines_valid_against_the_schema(filled: Store) -> None:
    curate(filled)
    text = export_text(filled)
    # JSON Lines (https://jsonlines.org): UTF-8, one JSON value per line, "\n" separators.
    lines = text.split("\n")
    assert lines[-1] == "" and all(lines[:-1])
    validator = Draft202012Validator(json.loads(SCHEMA.read_text("utf-8")))
    records = [json.loads(line) for line in lines[:-1]]
    for record in records:
        validator.validate(record)
    assert [r["action"] for r in records] == ["edit", "accept", "reject", "skip", "undo", "add"]
    # The proposal record comes once, on the first line about each proposal.
    with_record = [r["proposal"] for r in records if "proposal_record" in r]
    assert len(with_record) == len(set(with_record)) == 4


def test_round_trip_into_an_empty_store(filled: Store, tmp_path: Path) -> None:
    curate(filled)
    text = export_text(filled)
    with open_store(tmp_path / "other.sqlite") as other:
        report = import_decisions(other, "log.jsonl", text.splitlines())
        assert (report.decisions_added, report.decisions_present) == (6, 0)
        assert (report.proposals_added, report.articles_added) == (4, 1)
        mine = {s.id: (s.state, s.current) for s in filled.proposals()}
        theirs = {s.id: (s.state, s.current) for s in other.proposals()}
        # Proposals never decided on are not in the log; everything decided on matches.
        assert {k: mine[k] for k in theirs} == theirs
        assert [d.uid for d in other.decisions()] == [d.uid for d in filled.decisions()]
        again = import_decisions(other, "log.jsonl", text.splitlines())
        assert (again.decisions_added, again.decisions_present) == (0, 6)
        assert len(list(other.decisions())) == 6


def test_import_into_the_same_store_adds_nothing(filled: Store) -> None:
    curate(filled)
    report = import_decisions(filled, "log.jsonl", export_text(filled).splitlines())
    assert report.decisions_added == 0 and report.decisions_present == 6


def test_without_proposals_needs_them_in_the_store(filled: Store, tmp_path: Path) -> None:
    curate(filled)
    text = export_text(filled, with_proposals=False)
    with open_store(tmp_path / "bare.sqlite") as bare:
        good, problems = check_decisions(bare, "log.jsonl", text.splitlines())
        assert good == [] and [p.line for p in problems] == [1, 2, 3, 4, 5, 6]
        assert "neither in the store nor in the file" in problems[0].reason


def test_bad_lines_are_reported_by_number_and_nothing_is_stored(
    filled: Store, tmp_path: Path
) -> None:
    curate(filled)
    lines = export_text(filled).splitlines()
    good_line = json.loads(lines[1])
    bad = list(lines)
    bad.insert(2, "{not json")  # line 3
    bad.insert(4, json.dumps({**good_line, "uid": "u-4", "action": "approve"}))  # line 5
    bad.insert(5, json.dumps({**good_line, "uid": "u-6", "seconds": "four"}))  # line 6
    bad.insert(6, json.dumps({**good_line, "uid": "u-7", "action": "reject", "reason": None}))
    bad.insert(7, json.dumps({k: v for k, v in good_line.items() if k != "curator"}))  # line 8
    bad.insert(8, json.dumps({**good_line, "uid": "u-9", "created": "last tuesday"}))  # line 9
    bad.insert(9, json.dumps(good_line))  # line 10: uid of line 2 again
    bad.insert(10, json.dumps({**good_line, "uid": "u-11", "action": "undo", "reverts": "zz"}))
    bad.insert(11, "[1, 2]")  # line 12
    with open_store(tmp_path / "target.sqlite") as target:
        _, problems = check_decisions(target, "log.jsonl", bad)
        found = {p.line: p.reason for p in problems}
        assert sorted(found) == [3, 5, 6, 7, 8, 9, 10, 11, 12]
        assert "not JSON" in found[3]
        assert found[5].startswith("action:") and "approve" in found[5]
        assert found[6].startswith("seconds:")
        assert "reject needs a reason" in found[7]
        assert "'curator' is a required property" in found[8]
        assert "ISO 8601" in found[9]
        assert "repeats line 2" in found[10]
        assert "no such decision" in found[11]
        assert "not a JSON object" in found[12]
        assert all(str(p).startswith(f"log.jsonl:{p.line}: ") for p in problems)
        with pytest.raises(ImportFileError) as caught:
            import_decisions(target, "log.jsonl", bad)
        assert caught.value.line == 3 and "nothing imported" in str(caught.value)
        assert list(target.decisions()) == [] and target.proposals() == []
        assert target.articles() == []


def test_import_stores_times_in_utc(filled: Store, tmp_path: Path) -> None:
    filled.record_decision(filled.proposals()[0].id, curator="ana", action="accept")
    line = json.loads(export_text(filled).splitlines()[0])
    line["created"] = "2026-03-01T11:30:00+02:00"
    with open_store(tmp_path / "tz.sqlite") as other:
        import_decisions(other, "log.jsonl", [json.dumps(line)])
        (decision,) = other.decisions()
    # 11:30 at UTC+02:00 is 09:30 UTC (ISO 8601 offsets; Python datetime.astimezone).
    assert decision.created == "2026-03-01T09:30:00.000000+00:00"
