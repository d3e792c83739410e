"""`winnow extract`: the batch first pass into the store and/or a JSON Lines file."""

from __future__ import annotations

import os
import sys
from pathlib import Path
from typing import IO

import click
from rich.console import Console
from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn
from rich.table import Table

from extract.run import DOUBT_CONFIDENCE, BatchReport, FileReport, default_workers, run_batch

VERIFY_NOTE = (
    "Proposals are suggestions: a curator must verify each against the article before use; "
    "they are no basis for clinical decisions."
)


@click.command("extract")
@click.argument("targets", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option(
    "--db",
    "db",
    default=None,
    metavar="PATH_OR_URL",
    help="Store to fill: a SQLite file or SQLAlchemy URL (default: $WINNOW_DB, else "
    "winnow.sqlite). Used unless only --jsonl is given.",
)
@click.option(
    "--jsonl",
    "jsonl",
    default=None,
    metavar="OUT|-",
    help="Also write one proposal per line (the proposal record contract) to OUT, or '-' for "
    "standard output.",
)
@click.option(
    "--workers",
    type=click.IntRange(min=1),
    default=None,
    help="Processes reading files at once (default: min(4, CPU count)).",
)
@click.option(
    "--timeout",
    type=click.FloatRange(min=0, min_open=True),
    default=None,
    metavar="S",
    help="Seconds allowed per file; a file that takes longer fails alone.",
)
def command(
    targets: tuple[Path, ...],
    db: str | None,
    jsonl: str | None,
    workers: int | None,
    timeout: float | None,
) -> None:
    """Propose data-point records from article files (PDF or JATS XML) and folders of them.

    Each article is read once: files already processed with the same extractor versions are
    skipped (by content hash), and when the PDF and the JATS XML of one article (same DOI) are both
    given, it is read from the XML. Bad files are reported one line each and the rest go through;
    the exit status is 1 if any file failed.

    Proposals are suggestions for a curator to verify; they are no basis for clinical decisions.
    """
    to_stdout = jsonl == "-"
    console = Console(stderr=to_stdout, highlight=False, soft_wrap=True)
    progress_console = Console(stderr=True)
    store = None
    if db is not None or jsonl is None:
        from extract.store import open_store

        store = open_store(db)
    out_path = Path(jsonl) if jsonl and not to_stdout else None
    tmp_path = out_path.with_name(out_path.name + ".part") if out_path else None
    stream: IO[str] | None = None
    try:
        if to_stdout:
            stream = sys.stdout
        elif tmp_path is not None:
            stream = tmp_path.open("w", encoding="utf-8")
        report = _run(targets, store, stream, workers, timeout, progress_console)
    finally:
        if store is not None:
            store.close()
        if stream is not None and stream is not sys.stdout:
            stream.close()
            if tmp_path is not None and tmp_path.exists():
                os.replace(tmp_path, out_path)  # type: ignore[arg-type]
    _summarise(console, report, store_name=getattr(store, "name", None), jsonl=jsonl)
    if report.failures:
        raise SystemExit(1)


def _run(
    targets: tuple[Path, ...],
    store: object,
    stream: IO[str] | None,
    workers: int | None,
    timeout: float | None,
    console: Console,
) -> BatchReport:
    with Progress(
        TextColumn("[bold]extract"),
        BarColumn(),
        MofNCompleteColumn(),
        TimeElapsedColumn(),
        TextColumn("{task.description}"),
        console=console,
        transient=True,
        disable=not console.is_terminal,
    ) as progress:
        task = progress.add_task("", total=None)

        def on_plan(total: int) -> None:
            progress.update(task, total=total)

        def on_file(path: str, report: FileReport) -> None:
            if report.status in ("extracted", "failed"):
                progress.update(task, advance=1, description=Path(path).name)

        return run_batch(
            targets,
            store=store,
            jsonl=stream,
            workers=workers or default_workers(),
            timeout=timeout,
            on_plan=on_plan,
            on_file=on_file,
        )


#: Up to this many articles, the summary lists each one.
ARTICLE_ROWS = 40


def _per_article(report: BatchReport) -> Table:
    """One row per article read now or before: where its proposals came from, how many to doubt."""
    table = Table(
        title="proposed per article",
        title_justify="left",
        caption=f"low confidence: under {DOUBT_CONFIDENCE}; look at these first",
        caption_justify="left",
    )
    table.add_column("file")
    table.add_column("proposals", justify="right")
    table.add_column("text", justify="right")
    table.add_column("tables", justify="right")
    table.add_column("low confidence", justify="right")
    for item in report.files:
        if item.status not in ("extracted", "skipped"):
            continue
        name = Path(item.path).name + (" (done before)" if item.status == "skipped" else "")
        table.add_row(
            name,
            str(item.proposals),
            str(item.proposals - item.from_tables),
            str(item.from_tables),
            str(item.doubtful),
        )
    return table


def _summarise(
    console: Console, report: BatchReport, *, store_name: str | None, jsonl: str | None
) -> None:
    extracted = report.count("extracted")
    articles = report.articles
    table = Table(title="winnow extract", show_header=False, title_justify="left")
    table.add_column("what")
    table.add_column("count", justify="right")
    table.add_row("articles extracted now", str(extracted))
    table.add_row(
        "skipped (already processed, same extractor versions)", str(report.count("skipped"))
    )
    table.add_row("PDFs read from their JATS XML instead", str(report.count("replaced")))
    table.add_row("repeated files (same content)", str(report.count("repeated")))
    table.add_row("failed", str(report.count("failed")))
    table.add_row("proposals", str(report.proposals))
    per_article = report.proposals / articles if articles else 0.0
    table.add_row("proposals per article", f"{per_article:.1f}")
    added = sum(f.added for f in report.files)
    if store_name is not None:
        table.add_row(f"proposals added to {store_name}", str(added))
    console.print(table)
    if 0 < articles <= ARTICLE_ROWS:
        console.print(_per_article(report))
    for item in report.files:
        if item.status == "replaced":
            console.print(f"{item.path}: {item.note}")
    for item in report.failures:
        console.print(f"failed: {item.path}: {item.note}", style="red")
    if jsonl and jsonl != "-":
        console.print(f"JSON Lines written to {jsonl}")
    console.print(VERIFY_NOTE)
