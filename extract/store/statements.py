"""Connection-level statements behind the Store: inserts, lookups, state assembly, errors.

Everything here runs inside a transaction the caller opened; nothing commits on its own.
"""

from __future__ import annotations

import json
import logging
import time
import uuid
from collections import defaultdict
from collections.abc import Sequence
from datetime import UTC, datetime
from typing import Any, Self

from sqlalchemy import Connection, Engine, Row, func, select
from sqlalchemy.exc import DBAPIError, IntegrityError

from extract.errors import StoreError
from extract.ingest.document import Document
from extract.records.proposal import Proposal
from extract.store import schema as t
from extract.store.documents import document_from_dict, document_to_json, reading_position
from extract.store.engine import describe, read_transaction, write_transaction
from extract.store.rows import (
    ArticleRecord,
    Decision,
    ProposalState,
    dumps,
    loads,
)
from extract.store.state import current_of, effective_decisions, state_of

log = logging.getLogger(__name__)


def utc_now() -> str:
    """The current time as UTC ISO 8601 with microseconds."""
    return datetime.now(UTC).isoformat(timespec="microseconds")


def new_uid() -> str:
    """A new decision uid (random, 32 hex digits)."""
    return uuid.uuid4().hex


def article_id_of(document: Document) -> str:
    """The article id of a document: its DOI when stated, else its file stem."""
    return document.doi or document.name


def check_reason(action: str, reason: str | None) -> None:
    """Check that a reject names one of the reject reasons ("other" may add ": text").

    Raises:
        StoreError: a reject without a known reason.
    """
    if action != "reject":
        return
    if reason is None or not (
        reason in t.REJECT_REASONS or reason.startswith("other:") or reason.startswith("other ")
    ):
        raise StoreError(f"a reject needs a reason: one of {', '.join(t.REJECT_REASONS)}")


class StoreBase:
    """The store's connection handling and the statements its methods share."""

    def __init__(self, engine: Engine, *, url: str) -> None:
        self.engine = engine
        self.url = url
        self.name = describe(url)

    def __repr__(self) -> str:
        return f"Store({self.name!r})"

    def close(self) -> None:
        """Release the store's connections."""
        self.engine.dispose()

    def __enter__(self) -> Self:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    # ------------------------------------------------------------------ internals

    def _write(self) -> Any:
        return _guarded(self, write_transaction(self.engine))

    def _read(self) -> Any:
        return _guarded(self, read_transaction(self.engine))

    def _insert_article(self, connection: Connection, document: Document) -> None:
        article_id = article_id_of(document)
        now = utc_now()
        if not self._article_exists(connection, article_id):
            connection.execute(
                t.articles.insert().values(
                    id=article_id, doi=document.doi, title=document.title, created=now
                )
            )
        else:
            # An article first known from imported decisions gets its metadata now.
            connection.execute(
                t.articles.update()
                .where(t.articles.c.id == article_id, t.articles.c.title.is_(None))
                .values(doi=document.doi, title=document.title)
            )
        known = connection.execute(
            select(t.article_files.c.article_id).where(t.article_files.c.sha256 == document.sha256)
        ).first()
        if known is not None:
            return
        path = document.path
        connection.execute(
            t.article_files.insert().values(
                sha256=document.sha256,
                article_id=article_id,
                name=document.name,
                file=path.replace("\\", "/").rsplit("/", 1)[-1] if path else document.name,
                path=path,
                source=document.source,
                page_count=len(document.pages),
                document_json=document_to_json(document),
                created=now,
            )
        )

    def _insert_run(self, connection: Connection, sha256: str, extractor_key: str) -> None:
        exists = connection.execute(
            select(t.runs.c.sha256).where(
                t.runs.c.sha256 == sha256, t.runs.c.extractor_key == extractor_key
            )
        ).first()
        if exists is None:
            connection.execute(
                t.runs.insert().values(
                    sha256=sha256, extractor_key=extractor_key, created=utc_now()
                )
            )

    def _article_exists(self, connection: Connection, article_id: str) -> bool:
        return (
            connection.execute(select(t.articles.c.id).where(t.articles.c.id == article_id)).first()
            is not None
        )

    def _article_record(
        self,
        connection: Connection,
        *,
        article_id: str | None = None,
        file_sha256: str | None = None,
    ) -> ArticleRecord:
        query = select(
            t.articles, t.article_files.c.sha256, t.article_files.c.name,
            t.article_files.c.file, t.article_files.c.path, t.article_files.c.source,
            t.article_files.c.page_count,
        ).outerjoin(t.article_files, t.article_files.c.article_id == t.articles.c.id)  # fmt: skip
        if file_sha256 is not None:
            query = query.where(t.article_files.c.sha256 == file_sha256)
        else:
            query = query.where(t.articles.c.id == article_id)
        row = connection.execute(query.order_by(t.article_files.c.created.desc()).limit(1)).first()
        if row is None:
            raise StoreError(f"{self.name}: no article {article_id or file_sha256!r}")
        return ArticleRecord(
            id=row.id,
            doi=row.doi,
            title=row.title,
            name=row.name or "",
            file=row.file or "",
            path=row.path or "",
            source=row.source or "",
            sha256=row.sha256 or "",
            page_count=row.page_count or 0,
            created=row.created,
        )

    def _document_or_none(self, connection: Connection, article_id: str) -> Document | None:
        row = connection.execute(
            select(t.article_files.c.document_json)
            .where(t.article_files.c.article_id == article_id)
            .order_by(t.article_files.c.created.desc())
            .limit(1)
        ).first()
        return document_from_dict(json.loads(row.document_json)) if row else None

    def _insert_proposals(
        self,
        connection: Connection,
        article_id: str,
        proposals: Sequence[Proposal],
        *,
        model_version: str | None = None,
        document: Document | None = None,
    ) -> int:
        if not self._article_exists(connection, article_id):
            raise StoreError(f"{self.name}: no article {article_id!r}; add the article first")
        if not proposals:
            return 0
        if document is None:
            document = self._document_or_none(connection, article_id)
        ids = [p.id for p in proposals]
        existing: set[str] = set()
        for start in range(0, len(ids), 500):
            existing.update(
                connection.execute(
                    select(t.proposals.c.id).where(t.proposals.c.id.in_(ids[start : start + 500]))
                ).scalars()
            )
        base = connection.execute(
            select(func.count())
            .select_from(t.proposals)
            .where(t.proposals.c.article_id == article_id)
        ).scalar_one()
        rows: list[dict[str, Any]] = []
        now = utc_now()
        for proposal in proposals:
            if proposal.id in existing:
                continue
            existing.add(proposal.id)
            page, position = reading_position(proposal, document)
            rows.append(
                {
                    "id": proposal.id,
                    "article_id": article_id,
                    "file": proposal.file,
                    "extractor": proposal.extractor,
                    "model_version": model_version,
                    "page": page,
                    "position": position,
                    "row_order": base + len(rows),
                    "data_json": proposal.to_json(),
                    "created": now,
                }
            )
        if rows:
            connection.execute(t.proposals.insert(), rows)
        return len(rows)

    def _proposal_row(self, connection: Connection, proposal_id: str) -> Row[Any]:
        """The proposal's row, locked for this write transaction where the database can.

        SQLite's BEGIN IMMEDIATE already serialises writers; on PostgreSQL the row lock makes a
        claim and a decision on the same proposal wait for each other.
        """
        query = select(t.proposals).where(t.proposals.c.id == proposal_id)
        if connection.dialect.name == "postgresql":
            query = query.with_for_update()
        row = connection.execute(query).first()
        if row is None:
            raise StoreError(f"{self.name}: no proposal {proposal_id!r}")
        return row

    def _log(self, connection: Connection, proposal_id: str) -> list[Decision]:
        rows = connection.execute(
            select(t.decisions)
            .where(t.decisions.c.proposal_id == proposal_id)
            .order_by(t.decisions.c.seq)
        )
        return [decision_from_row(row) for row in rows]

    def _undos(self, connection: Connection) -> list[Decision]:
        rows = connection.execute(select(t.decisions).where(t.decisions.c.action == "undo"))
        return [decision_from_row(row) for row in rows]

    def _undo_target(self, log_: list[Decision], reverts: str | None, proposal_id: str) -> str:
        effective = effective_decisions(log_)
        if reverts is None:
            if not effective:
                raise StoreError(f"proposal {proposal_id}: nothing to undo")
            return effective[-1].uid
        if reverts not in {d.uid for d in effective}:
            raise StoreError(
                f"proposal {proposal_id}: decision {reverts} is not an effective decision on it"
            )
        return reverts

    def _claims(self, connection: Connection, proposal_id: str | None = None) -> dict[str, str]:
        query = select(t.claims.c.proposal_id, t.claims.c.curator).where(
            t.claims.c.expires >= time.time()
        )
        if proposal_id is not None:
            query = query.where(t.claims.c.proposal_id == proposal_id)
        return {row.proposal_id: row.curator for row in connection.execute(query)}

    def _check_claim(self, connection: Connection, proposal_id: str, curator: str) -> None:
        holder = self._claims(connection, proposal_id).get(proposal_id)
        if holder is not None and holder != curator:
            raise StoreError(
                f"{self.name}: proposal {proposal_id} is claimed by {holder}; not recorded"
            )

    def _insert_decision(self, connection: Connection, **values: Any) -> Decision:
        uid = values.pop("uid", None) or new_uid()
        created = values.pop("created", None) or utc_now()
        before, after = values.pop("before"), values.pop("after")
        result = connection.execute(
            t.decisions.insert().values(
                uid=uid,
                created=created,
                before_json=dumps(before),
                after_json=dumps(after),
                **values,
            )
        )
        seq = result.inserted_primary_key[0] if result.inserted_primary_key else 0
        return Decision(
            seq=int(seq), uid=uid, created=created, before=before, after=after, **values
        )

    def _states(self, connection: Connection, article_id: str | None) -> list[tuple[str, str]]:
        """``(article id, state)`` of every proposal, from the log alone (no records parsed)."""
        proposals = select(t.proposals.c.id, t.proposals.c.article_id)
        log_query = select(
            t.decisions.c.proposal_id,
            t.decisions.c.uid,
            t.decisions.c.action,
            t.decisions.c.reverts,
        ).order_by(t.decisions.c.seq)
        if article_id is not None:
            proposals = proposals.where(t.proposals.c.article_id == article_id)
            log_query = log_query.join(
                t.proposals, t.proposals.c.id == t.decisions.c.proposal_id
            ).where(t.proposals.c.article_id == article_id)
        undone: set[str] = set()
        actions: dict[str, list[tuple[str, str]]] = defaultdict(list)
        for entry in connection.execute(log_query):
            if entry.action == "undo":
                undone.add(entry.reverts)
            else:
                actions[entry.proposal_id].append((entry.uid, entry.action))
        states = []
        for row in connection.execute(proposals):
            effective = [a for uid, a in actions.get(row.id, ()) if uid not in undone]
            states.append(
                (row.article_id, t.STATE_OF_ACTION[effective[-1]] if effective else "pending")
            )
        return states

    def _proposal_states(
        self,
        connection: Connection,
        article_id: str | None,
        *,
        proposal_id: str | None = None,
    ) -> list[ProposalState]:
        query = select(t.proposals).order_by(
            t.proposals.c.article_id,
            t.proposals.c.page,
            t.proposals.c.position,
            t.proposals.c.row_order,
        )
        log_query = select(t.decisions).order_by(t.decisions.c.seq)
        if proposal_id is not None:
            query = query.where(t.proposals.c.id == proposal_id)
            log_query = log_query.where(t.decisions.c.proposal_id == proposal_id)
        elif article_id is not None:
            query = query.where(t.proposals.c.article_id == article_id)
            log_query = log_query.join(
                t.proposals, t.proposals.c.id == t.decisions.c.proposal_id
            ).where(t.proposals.c.article_id == article_id)
        logs: dict[str, list[Decision]] = defaultdict(list)
        for row in connection.execute(log_query):
            logs[row.proposal_id].append(decision_from_row(row))
        claims = self._claims(connection, proposal_id)
        states = []
        for row in connection.execute(query):
            original = Proposal.from_dict(json.loads(row.data_json))
            log_ = logs.get(row.id, [])
            state, last = state_of(log_)
            states.append(
                ProposalState(
                    proposal=original,
                    current=current_of(original, log_),
                    state=state,
                    decision=last,
                    article_id=row.article_id,
                    model_version=row.model_version,
                    claimed_by=claims.get(row.id),
                )
            )
        return states


def check_curator(curator: str) -> None:
    """Refuse an empty curator name (StoreError)."""
    if not isinstance(curator, str) or not curator.strip():
        raise StoreError("a curator name is required")


def decision_from_row(row: Row[Any]) -> Decision:
    """The Decision of a ``decisions`` row."""
    return Decision(
        seq=row.seq,
        uid=row.uid,
        proposal_id=row.proposal_id,
        curator=row.curator,
        action=row.action,
        before=loads(row.before_json),
        after=loads(row.after_json),
        reason=row.reason,
        seconds=row.seconds,
        extractor=row.extractor,
        model_version=row.model_version,
        reverts=row.reverts,
        created=row.created,
    )


class _guarded:
    """Wrap a transaction so database failures become one-line StoreErrors naming the store."""

    def __init__(self, store: StoreBase, inner: Any) -> None:
        self.store = store
        self.inner = inner

    def __enter__(self) -> Connection:
        try:
            connection: Connection = self.inner.__enter__()
        except DBAPIError as error:
            raise _store_error(self.store.name, error) from error
        return connection

    def __exit__(self, exc_type: Any, exc: Any, tb: Any) -> bool:
        try:
            suppressed = bool(self.inner.__exit__(exc_type, exc, tb))
        except DBAPIError as error:
            raise _store_error(self.store.name, error) from error
        if isinstance(exc, DBAPIError) and not isinstance(exc, IntegrityError):
            raise _store_error(self.store.name, exc) from exc
        return suppressed


def _store_error(name: str, error: DBAPIError) -> StoreError:
    reason = str(error.orig).splitlines()[0] if error.orig is not None else str(error)
    return StoreError(f"{name}: {reason}")
