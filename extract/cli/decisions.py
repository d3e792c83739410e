"""`winnow decisions export|import`: the curator decision log as JSON Lines."""

from __future__ import annotations

import os
import sys
from datetime import datetime
from pathlib import Path

import click

from extract.errors import StoreError
from extract.store import Store, open_store
from extract.store.decision_log import (
    check_decisions,
    export_decisions,
    import_decisions,
    read_lines,
)
from extract.store.engine import DB_ENV_VAR, DEFAULT_DB_NAME

DB_HELP = (
    f"Store: a SQLite file or SQLAlchemy URL (default: ${DB_ENV_VAR}, else {DEFAULT_DB_NAME})."
)
VERIFY_NOTE = (
    "Decisions record what curators verified; values in included proposal records that no "
    "curator accepted are unverified suggestions and no basis for clinical decisions."
)


def _existing_store(db: str | None) -> Store:
    """Open a store that must already exist (a missing SQLite file is an error, not created)."""
    target = db or os.environ.get(DB_ENV_VAR) or DEFAULT_DB_NAME
    if "://" not in target and target != ":memory:" and not Path(target).exists():
        raise StoreError(f"{target}: no such store")
    return open_store(target)


def _parse_since(since: str | None) -> int | str | None:
    """A sequence number or an ISO 8601 time from --since."""
    if since is None or since.isdigit():
        return int(since) if since is not None else None
    try:
        datetime.fromisoformat(since)
    except ValueError as error:
        raise click.BadParameter(
            f"{since!r} is neither a sequence number nor an ISO 8601 time", param_hint="--since"
        ) from error
    return since


@click.group("decisions", help="Export or import the curator decision log (JSON Lines).")
def command() -> None:
    """Export or import the curator decision log (JSON Lines)."""


@command.command("export", epilog=VERIFY_NOTE)
@click.argument("out", metavar="FILE.jsonl|-")
@click.option("--db", default=None, metavar="PATH_OR_URL", help=DB_HELP)
@click.option(
    "--since",
    default=None,
    help="Only decisions after this sequence number or at/after this ISO 8601 time.",
)
@click.option("--curator", default=None, help="Only this curator's decisions.")
@click.option("--article", "article_id", default=None, help="Only decisions on this article.")
@click.option(
    "--no-proposals",
    is_flag=True,
    help="Leave out the proposal records (the importing store must already hold them).",
)
def export_command(
    out: str,
    db: str | None,
    since: str | None,
    curator: str | None,
    article_id: str | None,
    no_proposals: bool,
) -> None:
    """Write the decision log to FILE.jsonl (or '-' for standard output), one decision a line."""
    since_value = _parse_since(since)
    with _existing_store(db) as store:
        options = {
            "since": since_value,
            "curator": curator,
            "article_id": article_id,
            "with_proposals": not no_proposals,
        }
        if out == "-":
            export_decisions(store, sys.stdout, **options)  # type: ignore[arg-type]
            return
        target = Path(out)
        partial = target.with_name(target.name + ".partial")
        try:
            with open(partial, "w", encoding="utf-8") as handle:
                count = export_decisions(store, handle, **options)  # type: ignore[arg-type]
            partial.replace(target)
        except OSError as error:
            raise StoreError(f"{out}: cannot write ({error.strerror})") from error
    click.echo(f"{out}: {count} decisions exported", err=True)


@command.command("import")
@click.argument("path", metavar="FILE.jsonl|-")
@click.option("--db", default=None, metavar="PATH_OR_URL", help=DB_HELP)
@click.option("--check", is_flag=True, help="Only check the file; store nothing.")
def import_command(path: str, db: str | None, check: bool) -> None:
    """Add the decisions of FILE.jsonl to the store (all, or none if any line is bad).

    Every line is checked first; bad lines are reported as FILE:LINE: reason. Decisions already
    stored (same uid) are passed over, so importing a file twice adds nothing the second time.
    """
    name = "<stdin>" if path == "-" else path
    lines = list(sys.stdin) if path == "-" else list(read_lines(path))
    with open_store(db) as store:
        good, problems = check_decisions(store, name, lines)
        for problem in problems:
            click.echo(str(problem), err=True)
        if problems:
            raise click.ClickException(f"{name}: {len(problems)} bad line(s); nothing imported")
        if check:
            click.echo(f"{name}: {len(good)} decisions, all lines good")
            return
        report = import_decisions(store, name, lines)
    click.echo(
        f"{name}: {report.decisions_added} decisions added, {report.decisions_present} already "
        f"stored; {report.proposals_added} proposals and {report.articles_added} articles added"
    )
