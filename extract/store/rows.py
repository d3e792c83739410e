"""Frozen values the store hands out: articles, proposal states, decisions, model versions."""

from __future__ import annotations

import json
from dataclasses import dataclass, field
from typing import Any

from extract.records.proposal import Proposal


@dataclass(frozen=True)
class ArticleRecord:
    """An article as stored: its id and metadata, and the input file it was read from.

    ``id`` is the DOI when the article states one, else the file stem (as in proposals).
    ``name`` is the file stem, ``file`` the base name, ``path`` the path it was read from.
    An article known only from imported decisions has no file: its file fields are empty.
    """

    id: str
    doi: str | None
    title: str | None
    name: str
    file: str
    path: str
    source: str
    sha256: str
    page_count: int
    created: str


@dataclass(frozen=True)
class ArticleSummary:
    """An article with the number of its proposals in each state, for progress displays."""

    id: str
    doi: str | None
    title: str | None
    file: str
    total: int
    pending: int
    accepted: int
    edited: int
    rejected: int
    added: int
    skipped: int

    @property
    def done(self) -> int:
        """Proposals with a decision other than skip."""
        return self.accepted + self.edited + self.rejected + self.added

    def counts(self) -> dict[str, int]:
        """The counts by state, as a dict keyed by state name."""
        return {
            "pending": self.pending,
            "accepted": self.accepted,
            "edited": self.edited,
            "rejected": self.rejected,
            "added": self.added,
            "skipped": self.skipped,
        }


@dataclass(frozen=True)
class Decision:
    """One row of the decision log.

    ``before`` and ``after`` hold the changed fields in the proposal record's JSON form (for
    "add", ``after`` is the whole added record). ``reverts`` is the uid of the decision an "undo"
    reverts. ``seq`` orders the log within one store; ``uid`` identifies the decision across
    stores (export/import). ``created`` is UTC ISO 8601.
    """

    seq: int
    uid: str
    proposal_id: str
    curator: str
    action: str
    before: dict[str, Any] | None
    after: dict[str, Any] | None
    reason: str | None
    seconds: float | None
    extractor: str
    model_version: str | None
    reverts: str | None
    created: str

    def to_dict(self) -> dict[str, Any]:
        """The decision as a JSON-ready dict (the decision log line format, without extras)."""
        return {
            "uid": self.uid,
            "seq": self.seq,
            "proposal": self.proposal_id,
            "curator": self.curator,
            "action": self.action,
            "before": self.before,
            "after": self.after,
            "reason": self.reason,
            "seconds": self.seconds,
            "extractor": self.extractor,
            "model_version": self.model_version,
            "reverts": self.reverts,
            "created": self.created,
        }


@dataclass(frozen=True)
class ProposalState:
    """A proposal with what the curators made of it.

    ``proposal`` is the record as the first pass proposed it; ``current`` has every effective
    edit applied; ``state`` is one of :data:`~extract.store.schema.STATES`; ``decision`` is the
    latest decision not undone (None while pending); ``claimed_by`` is the curator holding an
    unexpired claim on it, if any.
    """

    proposal: Proposal
    current: Proposal
    state: str
    decision: Decision | None
    article_id: str
    model_version: str | None = None
    claimed_by: str | None = None

    @property
    def id(self) -> str:
        """The proposal id."""
        return self.proposal.id


@dataclass(frozen=True)
class ModelVersion:
    """A trained model recorded in the store, with its evaluation metrics."""

    name: str
    version: str
    path: str | None
    created: str
    metrics: dict[str, Any] = field(default_factory=dict)


def dumps(value: Any) -> str | None:
    """JSON text for a stored value (None stays None); keys keep their order."""
    if value is None:
        return None
    return json.dumps(value, ensure_ascii=False, separators=(",", ":"))


def loads(text: str | None) -> Any:
    """The value of stored JSON text (None stays None)."""
    if text is None:
        return None
    return json.loads(text)
