"""The store's tables (SQLAlchemy Core) and the fixed vocabularies of the decision log.

Tables:

- ``articles``: one row per article id (DOI when stated, else the file stem).
- ``article_files``: one row per input file (by sha256) with the serialized Document.
- ``runs``: which file was processed with which extractor key (resumable batches).
- ``proposals``: the first pass's proposals as JSON, with their document-order sort key.
- ``decisions``: the curator's decision log, append-only (triggers abort UPDATE and DELETE).
- ``claims``: one row per proposal under review, with its curator and expiry.
- ``model_versions``: trained models and their metrics.

Timestamps are UTC ISO 8601 strings (``2026-03-01T09:30:00.123456+00:00``), which sort as text.
Claim expiry is seconds since the epoch (a float), compared against the writer's clock.
"""

from __future__ import annotations

from sqlalchemy import (
    Column,
    Float,
    ForeignKey,
    Index,
    Integer,
    MetaData,
    String,
    Table,
    Text,
    UniqueConstraint,
)

#: Actions a decision can record.
ACTIONS: tuple[str, ...] = ("accept", "edit", "reject", "skip", "add", "undo")
#: Reasons a curator gives for a rejection ("other" may be followed by ": free text").
REJECT_REASONS: tuple[str, ...] = ("not a data point", "wrong value", "duplicate", "other")
#: States a proposal can be in, computed from the log.
STATES: tuple[str, ...] = ("pending", "accepted", "edited", "rejected", "added", "skipped")
#: The state each action leads to.
STATE_OF_ACTION: dict[str, str] = {
    "accept": "accepted",
    "edit": "edited",
    "reject": "rejected",
    "skip": "skipped",
    "add": "added",
}
#: The extractor key of proposals a curator adds by hand.
MANUAL_EXTRACTOR = "curator@1"

metadata = MetaData()

articles = Table(
    "articles",
    metadata,
    Column("id", String(512), primary_key=True),
    Column("doi", String(512), nullable=True),
    Column("title", Text, nullable=True),
    Column("created", String(40), nullable=False),
)

article_files = Table(
    "article_files",
    metadata,
    Column("sha256", String(64), primary_key=True),
    Column("article_id", String(512), ForeignKey("articles.id"), nullable=False, index=True),
    Column("name", String(512), nullable=False),
    Column("file", String(512), nullable=False),
    Column("path", Text, nullable=False),
    Column("source", String(32), nullable=False),
    Column("page_count", Integer, nullable=False),
    Column("document_json", Text, nullable=False),
    Column("created", String(40), nullable=False),
)

runs = Table(
    "runs",
    metadata,
    Column("sha256", String(64), ForeignKey("article_files.sha256"), primary_key=True),
    Column("extractor_key", String(512), primary_key=True),
    Column("created", String(40), nullable=False),
)

proposals = Table(
    "proposals",
    metadata,
    Column("id", String(128), primary_key=True),
    Column("article_id", String(512), ForeignKey("articles.id"), nullable=False),
    Column("file", String(512), nullable=False),
    Column("extractor", String(256), nullable=False),
    Column("model_version", String(256), nullable=True),
    Column("page", Integer, nullable=False),
    Column("position", Float, nullable=False),
    Column("row_order", Integer, nullable=False),
    Column("data_json", Text, nullable=False),
    Column("created", String(40), nullable=False),
    Index("ix_proposals_order", "article_id", "page", "position", "row_order"),
)

decisions = Table(
    "decisions",
    metadata,
    Column("seq", Integer, primary_key=True, autoincrement=True),
    Column("uid", String(64), nullable=False, unique=True),
    Column("proposal_id", String(128), ForeignKey("proposals.id"), nullable=False, index=True),
    Column("curator", String(256), nullable=False),
    Column("action", String(16), nullable=False),
    Column("before_json", Text, nullable=True),
    Column("after_json", Text, nullable=True),
    Column("reason", Text, nullable=True),
    Column("seconds", Float, nullable=True),
    Column("extractor", String(256), nullable=False),
    Column("model_version", String(256), nullable=True),
    Column("reverts", String(64), nullable=True),
    Column("created", String(40), nullable=False),
    sqlite_autoincrement=True,
)

claims = Table(
    "claims",
    metadata,
    Column("proposal_id", String(128), ForeignKey("proposals.id"), primary_key=True),
    Column("curator", String(256), nullable=False),
    Column("expires", Float, nullable=False),
    Column("created", String(40), nullable=False),
)

model_versions = Table(
    "model_versions",
    metadata,
    Column("id", Integer, primary_key=True, autoincrement=True),
    Column("name", String(256), nullable=False),
    Column("version", String(128), nullable=False),
    Column("path", Text, nullable=True),
    Column("metrics_json", Text, nullable=True),
    Column("created", String(40), nullable=False),
    UniqueConstraint("name", "version", name="uq_model_versions_name_version"),
)

#: Message of the error raised by the append-only triggers.
APPEND_ONLY_MESSAGE = "decisions are append-only"

#: SQLite triggers that make the decision log append-only.
SQLITE_APPEND_ONLY: tuple[str, ...] = (
    "CREATE TRIGGER IF NOT EXISTS decisions_no_update BEFORE UPDATE ON decisions "
    f"BEGIN SELECT RAISE(ABORT, '{APPEND_ONLY_MESSAGE}'); END",
    "CREATE TRIGGER IF NOT EXISTS decisions_no_delete BEFORE DELETE ON decisions "
    f"BEGIN SELECT RAISE(ABORT, '{APPEND_ONLY_MESSAGE}'); END",
)

#: PostgreSQL: the same guarantee with one trigger function (TRUNCATE included).
POSTGRESQL_APPEND_ONLY: tuple[str, ...] = (
    "CREATE OR REPLACE FUNCTION winnow_decisions_append_only() RETURNS trigger AS $$ "
    f"BEGIN RAISE EXCEPTION '{APPEND_ONLY_MESSAGE}'; END; $$ LANGUAGE plpgsql",
    "DROP TRIGGER IF EXISTS decisions_no_change ON decisions",
    "CREATE TRIGGER decisions_no_change BEFORE UPDATE OR DELETE ON decisions "
    "FOR EACH ROW EXECUTE FUNCTION winnow_decisions_append_only()",
    "DROP TRIGGER IF EXISTS decisions_no_truncate ON decisions",
    "CREATE TRIGGER decisions_no_truncate BEFORE TRUNCATE ON decisions "
    "FOR EACH STATEMENT EXECUTE FUNCTION winnow_decisions_append_only()",
)
