"""The `winnow` command line: thin commands over library functions.

Each subcommand lives in its own module under extract/cli/ and is imported only when it is run,
so `winnow --help` stays fast. A :class:`~extract.errors.WinnowError` becomes one line naming the
file and the reason, with exit status 1; `--debug` shows the traceback instead.
"""

from __future__ import annotations

import importlib
import logging
from typing import Any

import click

from extract import __version__
from extract.errors import WinnowError

#: Subcommand name -> (module under extract.cli, one-line help). Add a line per new command.
COMMANDS: dict[str, tuple[str, str]] = {
    "parse": ("parse", "Read articles and print their structure: sections, blocks, tables."),
    "extract": ("extract", "Propose data-point records from articles into the store / JSON Lines."),
    "decisions": ("decisions", "Export or import the curator decision log as JSON Lines."),
    "evaluate": ("evaluate", "Score the first pass against gold files, beside a naive baseline."),
    "review": ("review", "Review proposals in the terminal: accept, edit, reject, add missed."),
}


class LazyGroup(click.Group):
    """A click group that imports a subcommand's module only when it is used."""

    def list_commands(self, ctx: click.Context) -> list[str]:
        return sorted(set(COMMANDS) | set(super().list_commands(ctx)))

    def get_command(self, ctx: click.Context, cmd_name: str) -> click.Command | None:
        if cmd_name in COMMANDS:
            module = importlib.import_module(f"extract.cli.{COMMANDS[cmd_name][0]}")
            command: click.Command = module.command
            return command
        return super().get_command(ctx, cmd_name)

    def format_commands(self, ctx: click.Context, formatter: click.HelpFormatter) -> None:
        rows = [(name, COMMANDS[name][1]) for name in sorted(COMMANDS)]
        if rows:
            with formatter.section("Commands"):
                formatter.write_dl(rows)

    def invoke(self, ctx: click.Context) -> Any:
        try:
            return super().invoke(ctx)
        except WinnowError as error:
            if ctx.obj and ctx.obj.get("debug"):
                raise
            raise click.ClickException(str(error)) from error


@click.group(cls=LazyGroup)
@click.version_option(__version__, prog_name="winnow")
@click.option("--debug", is_flag=True, help="Show tracebacks instead of one-line errors.")
@click.option("-v", "--verbose", count=True, help="More log output (-v info, -vv debug).")
@click.pass_context
def main(ctx: click.Context, debug: bool, verbose: int) -> None:
    """winnow: propose data-point records from biomedical articles for a curator to verify.

    Extracted values are suggestions: verify each against the article before use. They are no
    basis for clinical decisions on their own.
    """
    ctx.ensure_object(dict)
    ctx.obj["debug"] = debug
    level = logging.WARNING - 10 * min(verbose, 2)
    logging.basicConfig(level=level, format="%(levelname)s %(name)s: %(message)s")
