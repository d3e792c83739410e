"""`winnow review`: the curator review app in the terminal."""

from __future__ import annotations

import getpass
import logging
import os
from pathlib import Path

import click

from extract.errors import StoreError
from extract.store import open_store

#: Environment variable naming the curator when --curator is not given.
CURATOR_ENV_VAR = "WINNOW_CURATOR"


def _default_curator() -> str:
    return os.environ.get(CURATOR_ENV_VAR) or getpass.getuser() or "curator"


def _quiet_terminal_logging(log_file: Path | None) -> list[logging.Handler]:
    """Take log handlers off the terminal while the app draws on it (a file gets them instead)."""
    root = logging.getLogger()
    removed: list[logging.Handler] = [
        h
        for h in root.handlers
        if isinstance(h, logging.StreamHandler) and not isinstance(h, logging.FileHandler)
    ]
    for handler in removed:
        root.removeHandler(handler)
    if log_file is not None:
        handler = logging.FileHandler(log_file, encoding="utf-8")
        handler.setFormatter(logging.Formatter("%(asctime)s %(levelname)s %(name)s: %(message)s"))
        root.addHandler(handler)
        root.setLevel(min(root.level, logging.INFO))
    return removed


@click.command("review")
@click.option(
    "--db",
    "db",
    default=None,
    metavar="PATH_OR_URL",
    help="Store to review: a SQLite file or SQLAlchemy URL (default: $WINNOW_DB, else "
    "winnow.sqlite).",
)
@click.option(
    "--curator",
    default=None,
    metavar="NAME",
    help=f"Your name, stored with each decision (default: ${CURATOR_ENV_VAR}, else your login).",
)
@click.option("--article", "article", default=None, metavar="ID", help="Open this article first.")
@click.option(
    "--log",
    "log_file",
    default=None,
    type=click.Path(dir_okay=False, path_type=Path),
    help="Write the app's log (errors on bad proposals, each decision) to this file.",
)
def command(
    db: str | None, curator: str | None, article: str | None, log_file: Path | None
) -> None:
    """Review proposals: accept, edit, reject, skip or add data points, one key each.

    Every decision is stored the moment it is made; reopening resumes at the first pending
    proposal. Press ? in the app for every key. Proposed values are suggestions: verify each
    against the article; they are no basis for clinical decisions.
    """
    from extract.review.app import ReviewApp

    name = (curator or _default_curator()).strip()
    if not name:
        raise click.BadParameter("the curator name is empty", param_hint="--curator")
    store = open_store(db)
    try:
        if article is not None:
            store.article(article)
        elif not store.articles():
            raise StoreError(f"{store.name}: no articles yet; run `winnow extract` first")
        removed = _quiet_terminal_logging(log_file)
        try:
            ReviewApp(store, curator=name, article_id=article).run()
        finally:
            for handler in removed:
                logging.getLogger().addHandler(handler)
    finally:
        store.close()
