"""`winnow decisions export|import` through click's CliRunner."""

from __future__ import annotations

import json
from pathlib import Path

from click.testing import CliRunner

from extract.cli import main
from extract.store import open_store
from tests.store.samples import KEY, make_document, sample_proposals


def make_store(path: Path) -> list[str]:
    with open_store(path) as store:
        store.add_article(make_document(), extractor_key=KEY)
        store.add_proposals("velorin-kidney", sample_proposals())
        ids = [s.id for s in store.proposals()]
        store.record_decision(ids[0], curator="ana", action="accept", seconds=2.5)
        store.record_decision(ids[1], curator="ana", action="reject", reason="duplicate")
        store.record_decision(ids[2], curator="bo", action="edit", after={"n": 8})
    return ids


def test_export_import_round_trip(tmp_path: Path) -> None:
    make_store(tmp_path / "a.sqlite")
    runner = CliRunner()
    out = tmp_path / "log.jsonl"
    result = runner.invoke(
        main, ["decisions", "export", str(out), "--db", str(tmp_path / "a.sqlite")]
    )
    assert result.exit_code == 0, result.output
    assert len(out.read_text("utf-8").splitlines()) == 3
    target = str(tmp_path / "b.sqlite")
    first = runner.invoke(main, ["decisions", "import", str(out), "--db", target])
    assert first.exit_code == 0, first.output
    assert "3 decisions added, 0 already stored" in first.output
    second = runner.invoke(main, ["decisions", "import", str(out), "--db", target])
    assert "0 decisions added, 3 already stored" in second.output
    with open_store(target) as store:
        states = {s.proposal.outcome: s.state for s in store.proposals()}
    assert states == {"body mass": "accepted", "quentase": "rejected", "creatol": "edited"}


def test_export_to_stdout_with_filters(tmp_path: Path) -> None:
    make_store(tmp_path / "a.sqlite")
    result = CliRunner().invoke(
        main, ["decisions", "export", "-", "--db", str(tmp_path / "a.sqlite"), "--curator", "bo"]
    )
    assert result.exit_code == 0
    records = [json.loads(line) for line in result.stdout.splitlines()]
    assert [(r["curator"], r["action"]) for r in records] == [("bo", "edit")]
    since = CliRunner().invoke(
        main, ["decisions", "export", "-", "--db", str(tmp_path / "a.sqlite"), "--since", "2"]
    )
    assert [json.loads(line)["seq"] for line in since.stdout.splitlines()] == [3]


def test_import_reports_each_bad_line_and_stores_nothing(tmp_path: Path) -> None:
    make_store(tmp_path / "a.sqlite")
    runner = CliRunner()
    out = tmp_path / "log.jsonl"
    runner.invoke(main, ["decisions", "export", str(out), "--db", str(tmp_path / "a.sqlite")])
    lines = out.read_text("utf-8").splitlines()
    lines[1] = lines[1].replace('"reject"', '"discard"')
    lines.append("garbage")
    out.write_text("\n".join(lines) + "\n", "utf-8")
    target = tmp_path / "b.sqlite"
    result = runner.invoke(main, ["decisions", "import", str(out), "--db", str(target)])
    assert result.exit_code == 1
    assert f"{out}:2: action: 'discard' is not one of" in result.stderr
    assert f"{out}:4: not JSON" in result.stderr
    assert "2 bad line(s); nothing imported" in result.stderr
    assert "Traceback" not in result.output
    with open_store(target) as store:
        assert list(store.decisions()) == []


def test_missing_store_and_unreadable_file_give_one_line(tmp_path: Path) -> None:
    runner = CliRunner()
    missing = runner.invoke(main, ["decisions", "export", "-", "--db", str(tmp_path / "no.sqlite")])
    assert missing.exit_code == 1 and "no.sqlite: no such store" in missing.stderr
    absent = runner.invoke(
        main,
        ["decisions", "import", str(tmp_path / "none.jsonl"), "--db", str(tmp_path / "b.sqlite")],
    )
    assert absent.exit_code == 1
    assert absent.stderr.strip().splitlines() == [
        f"Error: {tmp_path / 'none.jsonl'}: No such file or directory"
    ]
    corrupt = tmp_path / "c.sqlite"
    corrupt.write_bytes(b"\x00garbage" * 100)
    bad_db = runner.invoke(main, ["decisions", "export", "-", "--db", str(corrupt)])
    assert bad_db.exit_code == 1 and len(bad_db.stderr.strip().splitlines()) == 1
    assert str(corrupt) in bad_db.stderr


def test_decisions_help_lists_both_commands() -> None:
    result = CliRunner().invoke(main, ["decisions", "--help"])
    assert result.exit_code == 0
    assert "export" in result.output and "import" in result.output


def test_bad_since_is_a_usage_error(tmp_path: Path) -> None:
    make_store(tmp_path / "a.sqlite")
    result = CliRunner().invoke(
        main, ["decisions", "export", "-", "--db", str(tmp_path / "a.sqlite"), "--since", "soon"]
    )
    assert result.exit_code == 2 and "neither a sequence number" in result.stderr


def test_import_from_stdin_and_check_only(tmp_path: Path) -> None:
    make_store(tmp_path / "a.sqlite")
    runner = CliRunner()
    text = runner.invoke(
        main, ["decisions", "export", "-", "--db", str(tmp_path / "a.sqlite")]
    ).stdout
    target = str(tmp_path / "b.sqlite")
    checked = runner.invoke(
        main, ["decisions", "import", "-", "--db", target, "--check"], input=text
    )
    assert checked.exit_code == 0 and "3 decisions, all lines good" in checked.output
    with open_store(target) as store:
        assert list(store.decisions()) == []
    done = runner.invoke(main, ["decisions", "import", "-", "--db", target], input=text)
    assert done.exit_code == 0 and "3 decisions added" in done.output
