"""`winnow parse FILE_OR_DIR...`: read articles and print what a person can check."""

from __future__ import annotations

import json
import sys
from functools import partial
from pathlib import Path
from typing import Any

import click
from rich.console import Console
from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn
from rich.table import Table as RichTable

from extract.batch import DEFAULT_TIMEOUT, FileResult, find_files, run_batch
from extract.ingest import read_document
from extract.ingest.document import Document

NOTICE = (
    "Text and tables as read from the file: check them against the article; extracted values "
    "need a curator's verification and are no basis for clinical decisions."
)


def parse_file(path: Path, *, keep_words: bool = False) -> Document:
    """Read one file (module-level so that worker processes can run it)."""
    return read_document(path, settings={"keep_words": keep_words})  # XML ignores settings


def _summary(document: Document, console: Console) -> None:
    console.rule(f"[bold]{document.name}[/] ({document.source}, {len(document.pages)} pages)")
    console.print(f"Title: {document.title or '-'}")
    console.print(f"DOI:   {document.doi or '-'}")
    if document.pages:
        columns = sorted({p.columns for p in document.pages})
        console.print(f"Columns per page: {', '.join(map(str, columns))}")
    sections = RichTable(title="Sections", show_lines=False)
    for name in ("section", "heading", "pages", "blocks"):
        sections.add_column(name)
    for section in document.sections:
        pages = (
            f"{section.page_start}-{section.page_end}" if section.page_start is not None else "-"
        )
        count = section.last_block - section.first_block + 1
        sections.add_row(section.name, section.heading, pages, str(count))
    console.print(sections)
    kinds: dict[str, int] = {}
    for block in document.blocks:
        kinds[block.kind] = kinds.get(block.kind, 0) + 1
    console.print("Blocks: " + ", ".join(f"{k} {v}" for k, v in sorted(kinds.items())))
    for table in document.tables:
        pages = ", ".join(map(str, table.pages))
        grid = RichTable(
            title=f"{table.label}: {table.caption}",
            caption=" | ".join(table.footnotes) or None,
            show_lines=True,
        )
        for col in range(table.n_cols):
            grid.add_column(f"{col}", overflow="fold")
        for r, row in enumerate(table.grid()):
            style = "bold" if r < table.header_rows else None
            grid.add_row(*row, style=style)
        console.print(grid)
        units = [u or "" for u in table.column_units]
        console.print(
            f"  pages {pages}; {table.n_rows} rows x {table.n_cols} columns, "
            f"{table.header_rows} header row(s); column units {units}; read by {table.reader}"
        )


@click.command(name="parse")
@click.argument("paths", nargs=-1, required=True, type=click.Path(path_type=Path))
@click.option("--json", "as_json", is_flag=True, help="Print Document.to_dict() as JSON.")
@click.option("--words", is_flag=True, help="With --json: include every word with its box.")
@click.option("--workers", type=int, default=None, help="Worker processes (default: CPUs).")
@click.option(
    "--timeout",
    type=float,
    default=DEFAULT_TIMEOUT,
    show_default=True,
    help="Seconds allowed per file.",
)
def command(
    paths: tuple[Path, ...], as_json: bool, words: bool, workers: int | None, timeout: float
) -> None:
    """Read PDF or JATS XML articles and print title, DOI, sections, blocks and tables.

    Directories are walked for .pdf and .xml files. A file that cannot be read gets one line
    naming it and the reason; the others still go through and the exit status is 1.
    """
    files = find_files(paths)
    missing = [p for p in files if not p.exists()]
    for path in missing:
        click.echo(f"Error: {path}: no such file", err=True)
    files = [p for p in files if p.exists()]
    if not files and not missing:
        raise click.ClickException("no .pdf or .xml files found")
    stdout = Console(soft_wrap=False, width=max(100, Console().width))
    func = partial(parse_file, keep_words=words)
    results: list[FileResult[Document]] = []
    if len(files) == 1:
        results = list(run_batch(func, files, workers=0).results)  # in this process, no pool
    elif files:
        with Progress(
            TextColumn("{task.description}"),
            BarColumn(),
            MofNCompleteColumn(),
            TimeElapsedColumn(),
            console=Console(stderr=True),
            transient=True,
            disable=not sys.stderr.isatty(),
        ) as bar:
            task = bar.add_task("parsing", total=len(files))
            batch = run_batch(
                func,
                files,
                workers=workers,
                timeout=timeout,
                progress=lambda _: bar.advance(task),
            )
            results = list(batch.results)
    documents: list[dict[str, Any]] = []
    for result in results:
        if result.error is not None:
            click.echo(f"Error: {result.error}", err=True)
            continue
        assert result.value is not None  # a successful result carries its Document
        if as_json:
            documents.append(result.value.to_dict(words=words))
        else:
            _summary(result.value, stdout)
    if as_json:
        payload: Any = documents[0] if len(documents) == 1 and len(files) == 1 else documents
        click.echo(json.dumps(payload, ensure_ascii=False, indent=1))
    elif documents or any(r.ok for r in results):
        click.echo(NOTICE, err=True)
    failures = [r for r in results if not r.ok] + [FileResult(str(p)) for p in missing]
    if failures:
        if len(results) + len(missing) > 1:
            click.echo(
                f"{len(failures)} of {len(results) + len(missing)} files failed: "
                + ", ".join(Path(f.path).name for f in failures),
                err=True,
            )
        sys.exit(1)
