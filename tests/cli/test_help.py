"""Every command has help text and a line in the README's usage table (STYLE.md, section 6)."""

from __future__ import annotations

import pytest
from click.testing import CliRunner

from extract.cli import COMMANDS, main
from tests.conftest import REPO

README = (REPO / "README.md").read_text(encoding="utf-8")


@pytest.mark.parametrize("name", sorted(COMMANDS))
def test_command_has_help(name: str) -> None:
    result = CliRunner().invoke(main, [name, "--help"])
    assert result.exit_code == 0, result.output
    assert "Usage: " in result.output
    # The help says more than the usage line: a summary sentence.
    assert len(result.output.splitlines()) > 3


@pytest.mark.parametrize("name", sorted(COMMANDS))
def test_command_is_documented_in_readme(name: str) -> None:
    assert f"`winnow {name}" in README


def test_group_help_lists_every_command() -> None:
    result = CliRunner().invoke(main, ["--help"])
    assert result.exit_code == 0
    for name in COMMANDS:
        assert name in result.output


def test_unknown_command_fails() -> None:
    result = CliRunner().invoke(main, ["no-such-command"])
    assert result.exit_code != 0
