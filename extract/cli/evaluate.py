"""`winnow evaluate`: score the first pass against gold files, side by side with a naive baseline."""

from __future__ import annotations

import json
from pathlib import Path

import click
from rich.console import Console
from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn
from rich.table import Table

from extract.evaluate import (
    FIELDS,
    PLOT_PREFIXES,
    Scores,
    evaluate,
    find_gold_files,
    load_gold,
    load_proposals_jsonl,
    plot_scores,
)
from extract.run import articles_beside, default_workers, run_for_evaluation

NOTE = (
    "Scores describe the first pass on these gold articles only; every proposal still needs a "
    "curator's verification and is no basis for clinical decisions."
)


@click.command("evaluate")
@click.option(
    "--gold",
    "gold_dir",
    required=True,
    type=click.Path(exists=True, file_okay=False, path_type=Path),
    help="Folder of <name>.gold.json files, with the articles beside them.",
)
@click.option(
    "--jsonl",
    "jsonl",
    type=click.Path(exists=True, dir_okay=False, path_type=Path),
    default=None,
    help="Score these proposals (from `winnow extract --jsonl`) instead of running the first pass.",
)
@click.option("--json", "as_json", is_flag=True, help="Print the scores as JSON.")
@click.option(
    "--plot",
    type=click.Path(dir_okay=False, path_type=Path),
    default=None,
    metavar="FILE.png",
    help="Write a bar chart of F1 per scenario and layout feature, winnow vs baseline.",
)
@click.option(
    "--source",
    type=click.Choice(["pdf", "xml"]),
    default="pdf",
    show_default=True,
    help="Which file to read when an article has both a PDF and a JATS XML.",
)
@click.option(
    "--workers",
    type=click.IntRange(min=1),
    default=None,
    help="Processes reading files at once (default: min(4, CPU count)).",
)
def command(
    gold_dir: Path,
    jsonl: Path | None,
    as_json: bool,
    plot: Path | None,
    source: str,
    workers: int | None,
) -> None:
    """Score proposals against gold files: value-level and complete-record precision, recall and
    F1, per-field accuracy, and a breakdown per scenario and layout, beside a naive baseline.

    Without --jsonl, the first pass runs on the articles beside the gold files. The matching
    rules are in docs/accuracy.md.
    """
    gold_files = find_gold_files(gold_dir)
    if not gold_files:
        raise click.ClickException(f"{gold_dir}: no *.gold.json files")
    articles = [load_gold(path) for path in gold_files]
    given = load_proposals_jsonl(jsonl) if jsonl is not None else None
    paths = articles_beside(gold_files, source=source)
    with Progress(
        TextColumn("[bold]evaluate"),
        BarColumn(),
        MofNCompleteColumn(),
        TimeElapsedColumn(),
        console=Console(stderr=True),
        transient=True,
    ) as progress:
        task = progress.add_task("", total=len(paths))
        inputs = run_for_evaluation(
            paths,
            with_first_pass=jsonl is None,
            workers=workers or default_workers(),
            on_file=lambda _path: progress.advance(task),
        )
    proposals = given if given is not None else list(inputs.first_pass)
    systems = {
        "winnow": evaluate(articles, proposals),
        "baseline": evaluate(articles, inputs.baseline),
    }
    failures = [f"{f.path}: {f.note}" for f in inputs.failures]
    if as_json:
        payload = {
            "articles": len(articles),
            "source": "jsonl" if jsonl is not None else source,
            "failures": failures,
            **{name: scores.to_dict() for name, scores in systems.items()},
        }
        click.echo(json.dumps(payload, indent=2))
    else:
        console = Console(highlight=False, soft_wrap=True)
        _print_tables(console, systems, len(articles))
        for line in failures:
            console.print(f"failed: {line}", style="red")
        console.print(NOTE)
    if plot is not None:
        plot_scores(
            systems,
            plot,
            title=f"Value-level F1 on {len(articles)} gold articles ({gold_dir.name})",
        )
        if not as_json:
            click.echo(f"plot written to {plot}")
    if failures:
        raise SystemExit(1)


def _print_tables(console: Console, systems: dict[str, Scores], n_articles: int) -> None:
    names = list(systems)
    main = Table(title=f"Scores on {n_articles} gold articles", title_justify="left")
    main.add_column("score")
    for name in names:
        main.add_column(name, justify="right")
    for level in ("value", "complete"):
        for measure in ("precision", "recall", "f1"):
            row = [f"{level} {measure}"]
            for name in names:
                prf = getattr(systems[name], level).to_dict()
                row.append(f"{prf[measure]:.3f}")
            main.add_row(*row)
    counts = [f"{systems[n].value.tp}/{systems[n].value.fp}/{systems[n].value.fn}" for n in names]
    main.add_row("value TP/FP/FN", *counts)
    for field_name in FIELDS:
        row = [f"{field_name} accuracy (matched)"]
        for name in names:
            tally = systems[name].fields[field_name]
            row.append(f"{tally.accuracy:.3f} ({tally.correct}/{tally.total})")
        main.add_row(*row)
    console.print(main)

    breakdown = Table(title="F1 by scenario and layout (value / complete)", title_justify="left")
    breakdown.add_column("feature")
    for name in names:
        breakdown.add_column(name, justify="right")
    keys = sorted({k for s in systems.values() for k in s.breakdown if k.startswith(PLOT_PREFIXES)})
    for key in keys:
        row = [key]
        for name in names:
            value, complete = systems[name].breakdown.get(key, (None, None))
            row.append(f"{value.fscore:.3f} / {complete.fscore:.3f}" if value and complete else "-")
        breakdown.add_row(*row)
    console.print(breakdown)
