"""The Store: articles, proposals, the append-only decision log, claims and model versions.

Every write is one transaction, committed before the method returns: a process killed after a
method returns loses nothing that method wrote. Decisions are only ever inserted; the state of a
proposal is computed from the log (see :mod:`extract.store.state`).
"""

from __future__ import annotations

import json
import logging
import time
from collections import defaultdict
from collections.abc import Iterator, Sequence
from datetime import UTC, datetime
from typing import Any

from sqlalchemy import or_, select
from sqlalchemy.dialects import postgresql, sqlite
from sqlalchemy.exc import IntegrityError

from extract.errors import StoreError
from extract.ingest.document import Document
from extract.records.proposal import Proposal, make_id
from extract.store import schema as t
from extract.store.documents import document_from_dict
from extract.store.rows import (
    ArticleRecord,
    ArticleSummary,
    Decision,
    ModelVersion,
    ProposalState,
    dumps,
    loads,
)
from extract.store.state import apply_changes, current_of
from extract.store.statements import (
    StoreBase,
    article_id_of,
    check_curator,
    check_reason,
    decision_from_row,
    new_uid,
    utc_now,
)

log = logging.getLogger(__name__)

#: Seconds a claim lasts unless the caller says otherwise.
DEFAULT_CLAIM_TTL = 600


class Store(StoreBase):
    """A winnow store on any SQLAlchemy engine (made by :func:`extract.store.open_store`)."""

    # ------------------------------------------------------------------ articles

    def add_article(self, document: Document, *, extractor_key: str) -> ArticleRecord:
        """Store a document (idempotent by its sha256) and note it as processed by ``extractor_key``.

        Args:
            document: the article as read by ingest.
            extractor_key: the versions of the extractors the batch runs (see :meth:`is_processed`).

        Returns:
            The stored article record (the one already stored when the file was seen before).
        """
        with self._write() as connection:
            self._insert_article(connection, document)
            self._insert_run(connection, document.sha256, extractor_key)
            return self._article_record(connection, file_sha256=document.sha256)

    def add_extraction(
        self,
        document: Document,
        proposals: Sequence[Proposal],
        *,
        extractor_key: str,
        model_version: str | None = None,
    ) -> int:
        """Store a document, its proposals and the processed mark in one transaction.

        A batch killed half-way leaves a file either wholly stored and marked, or not at all.
        Returns the number of proposals added.
        """
        with self._write() as connection:
            self._insert_article(connection, document)
            added = self._insert_proposals(
                connection, article_id_of(document), proposals, model_version=model_version
            )
            self._insert_run(connection, document.sha256, extractor_key)
            return added

    def is_processed(self, sha256: str, extractor_key: str) -> bool:
        """Whether the file with this sha256 was processed with these extractor versions."""
        with self._read() as connection:
            row = connection.execute(
                select(t.runs.c.sha256).where(
                    t.runs.c.sha256 == sha256, t.runs.c.extractor_key == extractor_key
                )
            ).first()
            return row is not None

    def article(self, article_id: str) -> ArticleRecord:
        """The article with this id (and its most recently added file).

        Raises:
            StoreError: no such article.
        """
        with self._read() as connection:
            return self._article_record(connection, article_id=article_id)

    def document(self, article_id: str, *, file: str | None = None) -> Document:
        """The article's Document rebuilt from the stored JSON (words left out).

        Args:
            article_id: the article id.
            file: which input file (base name) when an article was read from several
                (e.g. PDF and XML); default the most recently added.

        Raises:
            StoreError: no such article, or no stored document for it.
        """
        with self._read() as connection:
            query = select(t.article_files.c.document_json).where(
                t.article_files.c.article_id == article_id
            )
            if file is not None:
                query = query.where(t.article_files.c.file == file)
            row = connection.execute(
                query.order_by(t.article_files.c.created.desc()).limit(1)
            ).first()
        if row is None:
            raise StoreError(f"{self.name}: no stored document for article {article_id!r}")
        return document_from_dict(json.loads(row.document_json))

    def articles(self) -> list[ArticleSummary]:
        """Every article, ordered by id, with its proposals counted by state."""
        with self._read() as connection:
            article_rows = connection.execute(select(t.articles).order_by(t.articles.c.id)).all()
            files = {
                row.article_id: row.file
                for row in connection.execute(
                    select(t.article_files.c.article_id, t.article_files.c.file).order_by(
                        t.article_files.c.created
                    )
                )
            }
            states = self._states(connection, None)
        counts: dict[str, dict[str, int]] = defaultdict(lambda: dict.fromkeys(t.STATES, 0))
        for article_id, state in states:
            counts[article_id][state] += 1
        summaries = []
        for row in article_rows:
            c = counts[row.id]
            summaries.append(
                ArticleSummary(
                    id=row.id,
                    doi=row.doi,
                    title=row.title,
                    file=files.get(row.id, ""),
                    total=sum(c.values()),
                    **c,
                )
            )
        return summaries

    # ----------------------------------------------------------------- proposals

    def add_proposals(
        self,
        article_id: str,
        proposals: Sequence[Proposal],
        *,
        model_version: str | None = None,
    ) -> int:
        """Store proposals of a stored article; a proposal id already stored is left alone.

        Returns:
            The number of rows added (0 when the same proposals are added again).

        Raises:
            StoreError: the article is not stored.
        """
        with self._write() as connection:
            return self._insert_proposals(
                connection, article_id, proposals, model_version=model_version
            )

    def proposals(self, article_id: str | None = None) -> list[ProposalState]:
        """Proposals with their state, in document order (page, then position in reading order).

        Args:
            article_id: one article's proposals; None for all, ordered by article id first.
        """
        with self._read() as connection:
            return self._proposal_states(connection, article_id)

    def proposal(self, proposal_id: str) -> ProposalState:
        """One proposal with its state.

        Raises:
            StoreError: no such proposal.
        """
        with self._read() as connection:
            states = self._proposal_states(connection, None, proposal_id=proposal_id)
        if not states:
            raise StoreError(f"{self.name}: no proposal {proposal_id!r}")
        return states[0]

    def add_manual_proposal(
        self, article_id: str, proposal: Proposal, *, curator: str, seconds: float | None = None
    ) -> ProposalState:
        """Store a data point the first pass missed, with an "add" decision, in one transaction.

        The record gets a new id and the extractor :data:`~extract.store.schema.MANUAL_EXTRACTOR`.
        """
        check_curator(curator)
        with self._write() as connection:
            document = self._document_or_none(connection, article_id)
            if document is None and not self._article_exists(connection, article_id):
                raise StoreError(f"{self.name}: no article {article_id!r}")
            manual = proposal.with_changes(
                id=make_id(article_id, t.MANUAL_EXTRACTOR, curator, new_uid()),
                article=article_id,
                extractor=t.MANUAL_EXTRACTOR,
            )
            self._insert_proposals(connection, article_id, [manual], document=document)
            self._insert_decision(
                connection,
                proposal_id=manual.id,
                curator=curator,
                action="add",
                before=None,
                after=manual.to_dict(),
                reason=None,
                seconds=seconds,
                extractor=t.MANUAL_EXTRACTOR,
                model_version=None,
                reverts=None,
            )
            return self._proposal_states(connection, None, proposal_id=manual.id)[0]

    # ----------------------------------------------------------------- decisions

    def record_decision(
        self,
        proposal_id: str,
        *,
        curator: str,
        action: str,
        before: dict[str, Any] | None = None,
        after: dict[str, Any] | None = None,
        reason: str | None = None,
        seconds: float | None = None,
        reverts: str | None = None,
    ) -> Decision:
        """Append a decision to the log; committed when this returns.

        Args:
            proposal_id: the proposal decided on.
            curator: who decided.
            action: one of :data:`~extract.store.schema.ACTIONS`.
            before: the changed fields' values before (filled from the current record when None).
            after: the changed fields (required for "edit"), in the record's JSON form.
            reason: for "reject", one of :data:`~extract.store.schema.REJECT_REASONS`.
            seconds: time the curator spent on it.
            reverts: for "undo", the uid of the decision it reverts (default: the latest
                effective decision on this proposal).

        Raises:
            StoreError: unknown proposal or action, a bad edit or reason, nothing to undo, or a
                proposal claimed by another curator.
        """
        check_curator(curator)
        if action not in t.ACTIONS:
            raise StoreError(f"unknown action {action!r}: one of {', '.join(t.ACTIONS)}")
        check_reason(action, reason)
        if seconds is not None and seconds < 0:
            raise StoreError(f"seconds must not be negative (got {seconds})")
        if action == "edit" and not after:
            raise StoreError("an edit needs the changed fields (after)")
        with self._write() as connection:
            row = self._proposal_row(connection, proposal_id)
            self._check_claim(connection, proposal_id, curator)
            log_ = self._log(connection, proposal_id)
            original = Proposal.from_dict(json.loads(row.data_json))
            if action == "undo":
                reverts = self._undo_target(log_, reverts, proposal_id)
            elif after:
                current = current_of(original, log_)
                try:
                    apply_changes(current, after)
                except ValueError as error:
                    raise StoreError(f"proposal {proposal_id}: {error}") from error
                if before is None:
                    data = current.to_dict()
                    before = {key: data.get(key) for key in after}
            return self._insert_decision(
                connection,
                proposal_id=proposal_id,
                curator=curator,
                action=action,
                before=before,
                after=after,
                reason=reason,
                seconds=seconds,
                extractor=row.extractor,
                model_version=row.model_version,
                reverts=reverts if action == "undo" else None,
            )

    def undo_last(self, curator: str, *, article_id: str | None = None) -> Decision | None:
        """Revert the curator's latest effective decision (in one article, or anywhere).

        Returns:
            The "undo" decision, or None when the curator has nothing left to undo.
        """
        check_curator(curator)
        with self._write() as connection:
            query = (
                select(t.decisions)
                .join(t.proposals, t.proposals.c.id == t.decisions.c.proposal_id)
                .where(t.decisions.c.curator == curator)
                .order_by(t.decisions.c.seq)
            )
            if article_id is not None:
                query = query.where(t.proposals.c.article_id == article_id)
            mine = [decision_from_row(r) for r in connection.execute(query)]
            undone = {d.reverts for d in self._undos(connection)}
            candidates = [d for d in mine if d.action != "undo" and d.uid not in undone]
            if not candidates:
                return None
            target = candidates[-1]
            self._check_claim(connection, target.proposal_id, curator)
            return self._insert_decision(
                connection,
                proposal_id=target.proposal_id,
                curator=curator,
                action="undo",
                before=target.after,
                after=target.before,
                reason=None,
                seconds=None,
                extractor=target.extractor,
                model_version=target.model_version,
                reverts=target.uid,
            )

    def decisions(
        self,
        *,
        since: int | str | datetime | None = None,
        curator: str | None = None,
        article_id: str | None = None,
    ) -> Iterator[Decision]:
        """The decision log in order.

        Args:
            since: a sequence number (decisions after it) or a time (decisions at or after it;
                an ISO 8601 string or an aware datetime).
            curator: only this curator's decisions.
            article_id: only decisions on this article's proposals.
        """
        query = select(t.decisions).order_by(t.decisions.c.seq)
        if isinstance(since, int):
            query = query.where(t.decisions.c.seq > since)
        elif isinstance(since, datetime):
            moment = since if since.tzinfo else since.replace(tzinfo=UTC)
            query = query.where(t.decisions.c.created >= moment.astimezone(UTC).isoformat())
        elif isinstance(since, str):
            moment = datetime.fromisoformat(since)
            moment = moment if moment.tzinfo else moment.replace(tzinfo=UTC)
            query = query.where(t.decisions.c.created >= moment.astimezone(UTC).isoformat())
        if curator is not None:
            query = query.where(t.decisions.c.curator == curator)
        if article_id is not None:
            query = query.join(t.proposals, t.proposals.c.id == t.decisions.c.proposal_id).where(
                t.proposals.c.article_id == article_id
            )
        with self._read() as connection:
            rows = connection.execute(query).all()
        for row in rows:
            yield decision_from_row(row)

    # -------------------------------------------------------------------- claims

    def claim(
        self, proposal_id: str, curator: str, *, ttl_seconds: float = DEFAULT_CLAIM_TTL
    ) -> bool:
        """Claim a proposal for review; True when the curator now holds it.

        Atomic: one claim row per proposal; a curator renews their own claim, and takes over an
        expired one; an unexpired claim of another curator is left alone (returns False).
        """
        check_curator(curator)
        now = time.time()
        with self._write() as connection:
            self._proposal_row(connection, proposal_id)
            values = {
                "proposal_id": proposal_id,
                "curator": curator,
                "expires": now + ttl_seconds,
                "created": utc_now(),
            }
            insert: Any
            if connection.dialect.name == "postgresql":
                insert = postgresql.insert(t.claims)
            else:
                insert = sqlite.insert(t.claims)
            statement = insert.values(**values).on_conflict_do_update(
                index_elements=[t.claims.c.proposal_id],
                set_={
                    "curator": insert.excluded.curator,
                    "expires": insert.excluded.expires,
                    "created": insert.excluded.created,
                },
                where=or_(t.claims.c.curator == curator, t.claims.c.expires < now),
            )
            connection.execute(statement)
            holder = connection.execute(
                select(t.claims.c.curator).where(t.claims.c.proposal_id == proposal_id)
            ).scalar_one()
            return bool(holder == curator)

    def release(self, proposal_id: str, curator: str) -> bool:
        """Give up the curator's claim on a proposal; True when there was one to release."""
        with self._write() as connection:
            result = connection.execute(
                t.claims.delete().where(
                    t.claims.c.proposal_id == proposal_id, t.claims.c.curator == curator
                )
            )
            return bool(result.rowcount)

    def claimed_by(self, proposal_id: str) -> str | None:
        """The curator holding an unexpired claim on the proposal, if any."""
        with self._read() as connection:
            return self._claims(connection, proposal_id).get(proposal_id)

    def next_pending(
        self, article_id: str | None, curator: str, *, claim: bool = False
    ) -> ProposalState | None:
        """The first pending proposal in document order not claimed by another curator.

        Args:
            article_id: the article to review (None: any article).
            curator: who asks.
            claim: also claim it (atomically; proposals taken in between are passed over).
        """
        skipped: set[str] = set()
        while True:
            with self._read() as connection:
                states = self._proposal_states(connection, article_id)
            for state in states:
                if state.state != "pending" or state.id in skipped:
                    continue
                if state.claimed_by not in (None, curator):
                    continue
                if not claim or self.claim(state.id, curator):
                    return state
                skipped.add(state.id)
                break
            else:
                return None

    # ------------------------------------------------------------ model versions

    def record_model_version(
        self,
        name: str,
        version: str,
        *,
        path: str | None = None,
        metrics: dict[str, Any] | None = None,
    ) -> ModelVersion:
        """Record a trained model; a (name, version) already recorded raises StoreError."""
        created = utc_now()
        try:
            with self._write() as connection:
                connection.execute(
                    t.model_versions.insert().values(
                        name=name,
                        version=version,
                        path=path,
                        metrics_json=dumps(metrics or {}),
                        created=created,
                    )
                )
        except IntegrityError as error:
            raise StoreError(f"{self.name}: model {name}@{version} is already recorded") from error
        return ModelVersion(
            name=name, version=version, path=path, created=created, metrics=metrics or {}
        )

    def model_versions(self, name: str | None = None) -> list[ModelVersion]:
        """Recorded models, oldest first (only those called ``name`` when given)."""
        query = select(t.model_versions).order_by(t.model_versions.c.id)
        if name is not None:
            query = query.where(t.model_versions.c.name == name)
        with self._read() as connection:
            return [
                ModelVersion(
                    name=row.name,
                    version=row.version,
                    path=row.path,
                    created=row.created,
                    metrics=loads(row.metrics_json) or {},
                )
                for row in connection.execute(query)
            ]


__all__ = ["DEFAULT_CLAIM_TTL", "Store", "article_id_of", "check_reason", "new_uid", "utc_now"]
