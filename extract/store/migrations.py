"""Named, recorded, transactional schema migrations.

Each migration has a unique name and a function that changes the schema through a connection.
:func:`migrate` runs, in order, every migration whose name is not yet in the ``winnow_migrations``
table, each in its own write transaction together with the row that records it: a migration is
either applied and recorded, or neither. Two processes opening a new store at once queue on the
write lock; the second finds the migrations recorded and does nothing.

Add new migrations at the end of :data:`MIGRATIONS`; never rename or edit an applied one.
"""

from __future__ import annotations

import logging
from collections.abc import Callable
from dataclasses import dataclass
from datetime import UTC, datetime

from sqlalchemy import Column, Connection, Engine, MetaData, String, Table, select

from extract.store import schema
from extract.store.engine import write_transaction

log = logging.getLogger(__name__)

_migration_metadata = MetaData()
migrations_table = Table(
    "winnow_migrations",
    _migration_metadata,
    Column("name", String(128), primary_key=True),
    Column("applied", String(40), nullable=False),
)


@dataclass(frozen=True)
class Migration:
    """One schema change: a unique name and the function that applies it."""

    name: str
    apply: Callable[[Connection], None]


def _initial(connection: Connection) -> None:
    schema.metadata.create_all(connection)
    statements = (
        schema.POSTGRESQL_APPEND_ONLY
        if connection.dialect.name == "postgresql"
        else schema.SQLITE_APPEND_ONLY
        if connection.dialect.name == "sqlite"
        else ()
    )
    for statement in statements:
        connection.exec_driver_sql(statement)


#: Every migration, in the order they are applied.
MIGRATIONS: tuple[Migration, ...] = (Migration("0001_initial", _initial),)


def applied_migrations(engine: Engine) -> list[str]:
    """Names of the migrations recorded in the store, in the order applied."""
    with engine.connect() as connection:
        if not engine.dialect.has_table(connection, migrations_table.name):
            return []
        rows = connection.execute(
            select(migrations_table.c.name).order_by(migrations_table.c.applied)
        )
        return [row.name for row in rows]


def migrate(engine: Engine, *, migrations: tuple[Migration, ...] = MIGRATIONS) -> list[str]:
    """Apply the migrations the store lacks; returns the names applied now."""
    done: list[str] = []
    with write_transaction(engine) as connection:
        _migration_metadata.create_all(connection)
    for migration in migrations:
        with write_transaction(engine) as connection:
            exists = connection.execute(
                select(migrations_table.c.name).where(migrations_table.c.name == migration.name)
            ).first()
            if exists is not None:
                continue
            log.info("applying migration %s", migration.name)
            migration.apply(connection)
            connection.execute(
                migrations_table.insert().values(
                    name=migration.name, applied=datetime.now(UTC).isoformat()
                )
            )
            done.append(migration.name)
    return done
