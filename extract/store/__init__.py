"""The store: articles, proposals, the append-only decision log, claims and model versions.

Open one with :func:`open_store`; a SQLite file is the default, any SQLAlchemy URL works
(``sqlite:///path``, ``postgresql+psycopg://user@host/db``). Values read back are proposals for a
curator to verify, never verified data on their own. See docs/store.md.
"""

from __future__ import annotations

from pathlib import Path

from sqlalchemy.exc import DBAPIError

from extract.errors import StoreError
from extract.store.engine import DB_ENV_VAR, DEFAULT_DB_NAME, create_store_engine, describe
from extract.store.engine import resolve_target as _resolve_target
from extract.store.migrations import migrate
from extract.store.queries import DEFAULT_CLAIM_TTL, Store
from extract.store.rows import ArticleRecord, ArticleSummary, Decision, ModelVersion, ProposalState
from extract.store.schema import ACTIONS, MANUAL_EXTRACTOR, REJECT_REASONS, STATES


def open_store(target: str | Path | None = None) -> Store:
    """Open (creating and migrating as needed) a store.

    Args:
        target: a SQLite file path (created with its folder), ``":memory:"``, or any SQLAlchemy
            URL. None: the ``WINNOW_DB`` environment variable, else ``winnow.sqlite`` in the
            current folder.

    Returns:
        The open store, its schema up to date.

    Raises:
        StoreError: the target is not a database (one line naming it and the reason), or its
            driver is missing, or it cannot be reached.
    """
    url = _resolve_target(target)
    engine = create_store_engine(url)
    try:
        migrate(engine)
    except DBAPIError as error:
        engine.dispose()
        reason = str(error.orig).splitlines()[0] if error.orig is not None else str(error)
        if "file is not a database" in reason:
            reason = "not a SQLite database (file is not a database)"
        raise StoreError(f"{describe(url)}: {reason}") from error
    return Store(engine, url=url)


__all__ = [
    "ACTIONS",
    "DB_ENV_VAR",
    "DEFAULT_CLAIM_TTL",
    "DEFAULT_DB_NAME",
    "MANUAL_EXTRACTOR",
    "REJECT_REASONS",
    "STATES",
    "ArticleRecord",
    "ArticleSummary",
    "Decision",
    "ModelVersion",
    "ProposalState",
    "Store",
    "StoreError",
    "open_store",
]
