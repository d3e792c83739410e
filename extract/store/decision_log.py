"""The decision log as JSON Lines: export, check and import (docs/decisions-format.md).

One decision per line, each a JSON object following ``extract/schemas/decision.schema.json``.
An export includes, on the first line about each proposal, the proposal as first proposed
(``proposal_record``), so another store can take the decisions in without the article files.

Import checks every line first and stores nothing of a file with any bad line; then it adds the
whole file in one transaction. Decisions carry a stable ``uid``: a uid already stored is passed
over, so importing the same file twice adds nothing the second time.
"""

from __future__ import annotations

import json
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from datetime import UTC, datetime
from functools import cache
from importlib import resources
from pathlib import Path
from typing import Any, TextIO

from jsonschema import Draft202012Validator
from sqlalchemy import Connection, select

from extract.errors import ImportFileError, StoreError
from extract.records.proposal import Proposal
from extract.store import schema as t
from extract.store.queries import Store, check_reason
from extract.store.rows import Decision
from extract.store.state import PROPOSAL_FIELDS

#: Ids looked up per query (keeps clear of SQLite's bound-parameter limit).
_CHUNK = 500


@dataclass(frozen=True)
class ImportReport:
    """What an import added and what it passed over."""

    decisions_added: int
    decisions_present: int
    proposals_added: int
    articles_added: int


@dataclass(frozen=True)
class _Line:
    number: int
    data: dict[str, Any]


@cache
def _validator() -> Draft202012Validator:
    text = resources.files("extract").joinpath("schemas/decision.schema.json").read_text("utf-8")
    return Draft202012Validator(json.loads(text))


def decision_to_line(decision: Decision, *, article_id: str | None = None) -> dict[str, Any]:
    """The JSON object of one decision log line (without the included proposal)."""
    data = decision.to_dict()
    line = {"uid": data.pop("uid"), "seq": data.pop("seq"), "proposal": data.pop("proposal")}
    line["article"] = article_id
    line.update(data)
    return line


def export_decisions(
    store: Store,
    out: TextIO,
    *,
    since: int | str | datetime | None = None,
    curator: str | None = None,
    article_id: str | None = None,
    with_proposals: bool = True,
) -> int:
    """Write the decision log to ``out`` as JSON Lines, in log order.

    Args:
        store: the store to read.
        out: a text stream.
        since, curator, article_id: as in :meth:`Store.decisions`.
        with_proposals: include each proposal's record on the first line about it.

    Returns:
        The number of lines written.
    """
    states = {state.id: state for state in store.proposals(article_id)}
    seen: set[str] = set()
    count = 0
    for decision in store.decisions(since=since, curator=curator, article_id=article_id):
        state = states.get(decision.proposal_id)
        line = decision_to_line(decision, article_id=state.article_id if state else None)
        if with_proposals and state is not None and decision.proposal_id not in seen:
            line["proposal_record"] = state.proposal.to_dict()
            line["proposal_model_version"] = state.model_version
            seen.add(decision.proposal_id)
        out.write(json.dumps(line, ensure_ascii=False) + "\n")
        count += 1
    return count


def _parse_lines(path: str, lines: Iterable[str]) -> tuple[list[_Line], list[ImportFileError]]:
    parsed: list[_Line] = []
    problems: list[ImportFileError] = []
    validator = _validator()
    for number, text in enumerate(lines, start=1):
        if not text.strip():
            continue
        try:
            data = json.loads(text)
        except json.JSONDecodeError as error:
            problems.append(ImportFileError(path, f"not JSON ({error.msg})", number))
            continue
        if not isinstance(data, dict):
            problems.append(ImportFileError(path, "not a JSON object", number))
            continue
        errors = sorted(validator.iter_errors(data), key=lambda e: list(e.path))
        if errors:
            first = errors[0]
            where = ".".join(str(p) for p in first.path)
            reason = f"{where}: {first.message}" if where else first.message
            problems.append(ImportFileError(path, reason, number))
            continue
        reason = _check_line(data)
        if reason is not None:
            problems.append(ImportFileError(path, reason, number))
            continue
        parsed.append(_Line(number, data))
    return parsed, problems


def _check_line(data: dict[str, Any]) -> str | None:
    """The first problem of one schema-valid line that needs no store to see, or None."""
    try:
        moment = datetime.fromisoformat(data["created"])
    except ValueError:
        return f"created: {data['created']!r} is not an ISO 8601 date-time"
    if moment.tzinfo is None:
        return f"created: {data['created']!r} has no UTC offset"
    action = data["action"]
    try:
        check_reason(action, data.get("reason"))
    except StoreError as error:
        return str(error)
    after = data.get("after")
    if action == "edit" and not after:
        return "an edit needs the changed fields (after)"
    if action == "edit" and after:
        unknown = sorted(set(after) - PROPOSAL_FIELDS)
        if unknown:
            return f"after: unknown proposal field(s): {', '.join(unknown)}"
    if action == "undo" and not data.get("reverts"):
        return "an undo needs the uid of the decision it reverts (reverts)"
    record = data.get("proposal_record")
    if record is not None:
        if record.get("id") != data["proposal"]:
            return "proposal_record.id differs from proposal"
        try:
            Proposal.from_dict(record)
        except (KeyError, TypeError, ValueError) as error:
            return f"proposal_record: not a valid proposal record ({error})"
    return None


def _existing(connection: Connection, column: Any, values: Iterable[str]) -> set[str]:
    wanted = sorted(set(values))
    found: set[str] = set()
    for start in range(0, len(wanted), _CHUNK):
        chunk = wanted[start : start + _CHUNK]
        found.update(connection.execute(select(column).where(column.in_(chunk))).scalars())
    return found


def check_decisions(
    store: Store, path: str | Path, lines: Iterable[str]
) -> tuple[list[_Line], list[ImportFileError]]:
    """Check every line of a decision log against the format and the store.

    Returns:
        The good lines and one :class:`ImportFileError` per bad line (``FILE:LINE: reason``).
    """
    name = str(path)
    parsed, problems = _parse_lines(name, lines)
    with store._read() as connection:
        known_proposals = _existing(
            connection, t.proposals.c.id, (x.data["proposal"] for x in parsed)
        )
        uids = [x.data["uid"] for x in parsed] + [
            x.data["reverts"] for x in parsed if x.data.get("reverts")
        ]
        known_uids = _existing(connection, t.decisions.c.uid, uids)
    included = {x.data["proposal"] for x in parsed if x.data.get("proposal_record") is not None}
    seen_uids: dict[str, int] = {}
    good: list[_Line] = []
    for line in parsed:
        data = line.data
        reason = None
        if data["proposal"] not in known_proposals and data["proposal"] not in included:
            reason = f"proposal {data['proposal']} is neither in the store nor in the file"
        elif data["uid"] in seen_uids:
            reason = f"uid {data['uid']} repeats line {seen_uids[data['uid']]}"
        elif data.get("reverts") and not (
            data["reverts"] in seen_uids or data["reverts"] in known_uids
        ):
            reason = f"reverts {data['reverts']}: no such decision in the store or above"
        seen_uids.setdefault(data["uid"], line.number)
        if reason is None:
            good.append(line)
        else:
            problems.append(ImportFileError(name, reason, line.number))
    problems.sort(key=lambda p: p.line or 0)
    return good, problems


def import_decisions(store: Store, path: str | Path, lines: Iterable[str]) -> ImportReport:
    """Import a decision log: all of it in one transaction, or nothing when any line is bad.

    Args:
        store: the store to add to.
        path: the file's name, for messages.
        lines: the file's lines.

    Raises:
        ImportFileError: the first bad line (``FILE:LINE: reason``); nothing is stored.
    """
    good, problems = check_decisions(store, path, lines)
    if problems:
        first = problems[0]
        more = f" (and {len(problems) - 1} more bad lines)" if len(problems) > 1 else ""
        raise ImportFileError(first.path, f"{first.reason}{more}; nothing imported", first.line)
    return _store_lines(store, good)


def _store_lines(store: Store, lines: list[_Line]) -> ImportReport:
    added = present = proposals_added = articles_added = 0
    with store._write() as connection:
        known_uids = _existing(connection, t.decisions.c.uid, (x.data["uid"] for x in lines))
        known_proposals = _existing(
            connection, t.proposals.c.id, (x.data["proposal"] for x in lines)
        )
        for line in lines:
            data = line.data
            record = data.get("proposal_record")
            if record is not None and data["proposal"] not in known_proposals:
                proposal = Proposal.from_dict(record)
                if not store._article_exists(connection, proposal.article):
                    connection.execute(
                        t.articles.insert().values(
                            id=proposal.article, doi=None, title=None, created=data["created"]
                        )
                    )
                    articles_added += 1
                proposals_added += store._insert_proposals(
                    connection,
                    proposal.article,
                    [proposal],
                    model_version=data.get("proposal_model_version"),
                )
                known_proposals.add(proposal.id)
            if data["uid"] in known_uids:
                present += 1
                continue
            row = store._proposal_row(connection, data["proposal"])
            store._insert_decision(
                connection,
                uid=data["uid"],
                created=_utc(data["created"]),
                proposal_id=data["proposal"],
                curator=data["curator"],
                action=data["action"],
                before=data.get("before"),
                after=data.get("after"),
                reason=data.get("reason"),
                seconds=data.get("seconds"),
                extractor=data.get("extractor") or row.extractor,
                model_version=data.get("model_version", row.model_version),
                reverts=data.get("reverts"),
            )
            known_uids.add(data["uid"])
            added += 1
    return ImportReport(added, present, proposals_added, articles_added)


def _utc(created: str) -> str:
    """An ISO 8601 time with an offset as UTC text, so that stored times sort as text."""
    return datetime.fromisoformat(created).astimezone(UTC).isoformat(timespec="microseconds")


def read_lines(path: str | Path) -> Iterator[str]:
    """The lines of a decision log file (UTF-8).

    Raises:
        ImportFileError: the file cannot be read or is not UTF-8 text.
    """
    try:
        with open(path, encoding="utf-8") as handle:
            yield from handle
    except UnicodeDecodeError as error:
        raise ImportFileError(path, f"not UTF-8 text ({error.reason})") from error
    except OSError as error:
        raise ImportFileError(path, error.strerror or "cannot be read") from error
