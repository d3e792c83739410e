"""Turning a store target (path, URL or nothing) into a configured SQLAlchemy engine.

SQLite connections get ``journal_mode=WAL``, ``synchronous=NORMAL``, ``foreign_keys=ON`` and
``busy_timeout=5000``. Transactions that write start with ``BEGIN IMMEDIATE`` so that two writers
queue on the busy timeout instead of failing half-way; readers use a plain ``BEGIN`` and are not
blocked by a writer (WAL).
"""

from __future__ import annotations

import os
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path
from typing import Any

from sqlalchemy import Connection, Engine, create_engine, event
from sqlalchemy.engine import make_url
from sqlalchemy.exc import ArgumentError
from sqlalchemy.pool import StaticPool

from extract.errors import StoreError

#: The store used when no target is given and ``WINNOW_DB`` is unset.
DEFAULT_DB_NAME = "winnow.sqlite"
#: Environment variable naming the default store (a path or a SQLAlchemy URL).
DB_ENV_VAR = "WINNOW_DB"
#: Milliseconds a SQLite connection waits for a lock before giving up.
BUSY_TIMEOUT_MS = 5000
#: Execution option that marks a connection as a writer.
_WRITE_OPTION = "winnow_write"

SQLITE_PRAGMAS: tuple[str, ...] = (
    "PRAGMA journal_mode=WAL",
    "PRAGMA synchronous=NORMAL",
    "PRAGMA foreign_keys=ON",
    f"PRAGMA busy_timeout={BUSY_TIMEOUT_MS}",
)


def resolve_target(target: str | Path | None) -> str:
    """The SQLAlchemy URL for a store target.

    Args:
        target: a SQLite file path, a SQLAlchemy URL, ``":memory:"``, or None (then the
            ``WINNOW_DB`` environment variable, else ``winnow.sqlite`` in the current folder).

    Returns:
        A URL string. A file path's folder is created if missing.
    """
    if target is None:
        target = os.environ.get(DB_ENV_VAR) or DEFAULT_DB_NAME
    text = str(target)
    if text == ":memory:":
        return "sqlite://"
    if "://" in text:
        return text
    path = Path(text).expanduser()
    if path.is_dir():
        raise StoreError(f"{path}: is a folder, not a database file")
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
    except OSError as error:
        raise StoreError(f"{path}: cannot create its folder ({error.strerror})") from error
    return f"sqlite:///{path.resolve()}"


def describe(url: str) -> str:
    """A short name for a store in messages: the file path for SQLite, the URL without password."""
    parsed = make_url(url)
    if parsed.get_backend_name() == "sqlite":
        return parsed.database or ":memory:"
    return parsed.render_as_string(hide_password=True)


def create_store_engine(url: str) -> Engine:
    """A SQLAlchemy engine for ``url`` with winnow's connection settings.

    Raises:
        StoreError: the URL cannot be parsed or names a driver that is not installed.
    """
    try:
        parsed = make_url(url)
    except ArgumentError as error:
        raise StoreError(f"{url}: not a database URL") from error
    kwargs: dict[str, Any] = {}
    is_sqlite = parsed.get_backend_name() == "sqlite"
    if is_sqlite and parsed.database in (None, "", ":memory:"):
        # One shared connection, or every connection would see its own empty database.
        kwargs["poolclass"] = StaticPool
        kwargs["connect_args"] = {"check_same_thread": False}
    try:
        engine = create_engine(parsed, **kwargs)
    except (ImportError, ArgumentError) as error:
        raise StoreError(f"{describe(url)}: cannot use this database ({error})") from error
    if is_sqlite:
        _configure_sqlite(engine)
    return engine


def _configure_sqlite(engine: Engine) -> None:
    @event.listens_for(engine, "connect")
    def _on_connect(dbapi_connection: Any, _record: Any) -> None:
        # Let us issue BEGIN ourselves (pysqlite's implicit transactions defer the write lock).
        dbapi_connection.isolation_level = None
        cursor = dbapi_connection.cursor()
        try:
            for pragma in SQLITE_PRAGMAS:
                cursor.execute(pragma)
        finally:
            cursor.close()

    @event.listens_for(engine, "begin")
    def _on_begin(connection: Connection) -> None:
        writer = connection.get_execution_options().get(_WRITE_OPTION, False)
        connection.exec_driver_sql("BEGIN IMMEDIATE" if writer else "BEGIN")


def is_sqlite(engine: Engine) -> bool:
    """Whether the engine talks to SQLite."""
    return engine.dialect.name == "sqlite"


@contextmanager
def write_transaction(engine: Engine) -> Iterator[Connection]:
    """A connection in a transaction that takes the write lock first; committed on exit."""
    with engine.connect() as connection:
        connection.execution_options(**{_WRITE_OPTION: True})
        with connection.begin():
            yield connection


@contextmanager
def read_transaction(engine: Engine) -> Iterator[Connection]:
    """A connection in a read transaction (one consistent snapshot)."""
    with engine.connect() as connection, connection.begin():
        yield connection
