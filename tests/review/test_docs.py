"""docs/review.md lists every key the app binds, and the command is registered with help text."""

from __future__ import annotations

import re
from pathlib import Path

from click.testing import CliRunner

from extract.cli import COMMANDS, main
from extract.review import key_groups
from extract.review.screens.help import binding_rows

DOC = Path(__file__).resolve().parents[2] / "docs" / "review.md"


def test_every_bound_key_is_documented() -> None:
    text = DOC.read_text(encoding="utf-8")
    prose = re.sub(r"```.*?```", "", text, flags=re.S)
    documented = set(re.findall(r"`([^`\n]+)`", prose))
    missing = []
    for title, bindings in key_groups():
        assert f"### {title}" in text
        for keys, _ in binding_rows(bindings):
            missing += [f"{title}: {key}" for key in keys.split() if key not in documented]
    assert missing == []


def test_review_command_has_help_and_the_caution() -> None:
    assert "review" in COMMANDS
    result = CliRunner().invoke(main, ["review", "--help"])
    assert result.exit_code == 0
    for option in ("--db", "--curator", "--article"):
        assert option in result.output
    assert "clinical decisions" in " ".join(result.output.split())


def test_a_file_that_is_not_a_store_is_one_line_error(tmp_path: Path) -> None:
    bad = tmp_path / "notes.sqlite"
    bad.write_text("not a database", encoding="utf-8")
    result = CliRunner().invoke(main, ["review", "--db", str(bad)])
    assert result.exit_code == 1
    lines = [line for line in result.output.splitlines() if line.strip()]
    assert len(lines) == 1 and str(bad) in lines[0] and "Traceback" not in result.output
