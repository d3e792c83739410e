"""`winnow extract` through click's CliRunner: store, JSON Lines, resume, bad files, twins."""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import jsonschema
import pytest
from click.testing import CliRunner

from extract.cli import main
from extract.store import open_store
from fixtures.generate import DEFAULT_SEED, generate

SCHEMA = Path(__file__).resolve().parents[2] / "extract" / "schemas" / "proposal.schema.json"


@pytest.fixture(scope="module")
def articles(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """Four generated fixture articles (two of them also as JATS XML), without gold files."""
    root = tmp_path_factory.mktemp("articles")
    generate(DEFAULT_SEED, root, count=4)
    for gold in root.glob("*.gold.json"):
        gold.unlink()
    return root


@pytest.fixture(scope="module")
def first_run(
    articles: Path, tmp_path_factory: pytest.TempPathFactory
) -> tuple[Path, Path, Path, object]:
    """One batch: the articles plus two bad files, into a SQLite store and a JSON Lines file."""
    work = tmp_path_factory.mktemp("run")
    batch = work / "batch"
    shutil.copytree(articles, batch)
    (batch / "broken.pdf").write_bytes(b"%PDF-1.7\n1 0 obj << /Type /Catalog >>\n")
    (batch / "zz-notes.pdf").write_text("plain words, not an article\n", encoding="utf-8")
    db, out = work / "store.sqlite", work / "out.jsonl"
    result = CliRunner().invoke(
        main, ["extract", str(batch), "--db", str(db), "--jsonl", str(out), "--workers", "2"]
    )
    return batch, db, out, result


def _stored_ids(db: Path) -> list[str]:
    with open_store(db) as store:
        return [state.id for state in store.proposals()]


def test_bad_files_are_named_and_the_rest_stored(first_run: tuple) -> None:
    batch, db, out, result = first_run
    assert result.exit_code == 1, result.output
    lines = result.output.splitlines()
    broken = [line for line in lines if "broken.pdf" in line]
    notes = [line for line in lines if "zz-notes.pdf" in line]
    assert len(broken) == 1 and broken[0].startswith("failed: ")
    assert len(notes) == 1 and "not a PDF or JATS XML" in notes[0]
    assert "Traceback" not in result.output
    with open_store(db) as store:
        assert len(store.articles()) == 4  # fx01..fx04, two read from XML
    assert "curator must verify" in result.output


def test_jsonl_holds_the_stored_proposals_and_follows_the_schema(first_run: tuple) -> None:
    _, db, out, _ = first_run
    records = [json.loads(line) for line in out.read_text(encoding="utf-8").splitlines()]
    assert records
    validator = jsonschema.Draft202012Validator(json.loads(SCHEMA.read_text(encoding="utf-8")))
    for record in records:
        validator.validate(record)
    assert sorted(r["id"] for r in records) == sorted(_stored_ids(db))
    assert len({r["id"] for r in records}) == len(records)


def test_pdf_and_xml_twins_are_extracted_once_from_the_xml(first_run: tuple) -> None:
    batch, _, out, result = first_run
    twins = sorted(p.stem for p in batch.glob("*.xml"))
    assert twins, "the generated set should contain PDF+XML twins"
    for stem in twins:
        assert f"{stem}.pdf: same DOI as {stem}.xml: extracted once, from the XML" in result.output
    files = {json.loads(line)["file"] for line in out.read_text(encoding="utf-8").splitlines()}
    assert {f"{stem}.xml" for stem in twins} <= files
    assert not {f"{stem}.pdf" for stem in twins} & files


def test_rerun_adds_nothing_and_still_writes_jsonl(first_run: tuple, tmp_path: Path) -> None:
    batch, db, out, _ = first_run
    before = _stored_ids(db)
    again = tmp_path / "again.jsonl"
    good = sorted(str(p) for p in batch.iterdir() if p.suffix in (".pdf", ".xml"))
    good = [p for p in good if not p.endswith(("broken.pdf", "zz-notes.pdf"))]
    result = CliRunner().invoke(main, ["extract", *good, "--db", str(db), "--jsonl", str(again)])
    assert result.exit_code == 0, result.output
    assert _stored_ids(db) == before
    assert "articles extracted now" in result.output
    summary = {
        line.split("│")[1].strip(): line.split("│")[2].strip()
        for line in result.output.splitlines()
        if line.count("│") == 3
    }
    assert summary["articles extracted now"] == "0"
    assert summary["skipped (already processed, same extractor versions)"] == "4"
    assert sorted(again.read_text(encoding="utf-8").splitlines()) == sorted(
        out.read_text(encoding="utf-8").splitlines()
    )


def test_jsonl_to_stdout_keeps_the_summary_off_it(articles: Path) -> None:
    one = sorted(articles.glob("*.pdf"))[1]
    result = CliRunner().invoke(main, ["extract", str(one), "--jsonl", "-", "--workers", "1"])
    assert result.exit_code == 0, result.stderr
    records = [json.loads(line) for line in result.stdout.splitlines()]
    assert records and {r["file"] for r in records} == {one.name}
    assert "proposals per article" in result.stderr


def test_missing_input_is_one_line(tmp_path: Path) -> None:
    result = CliRunner().invoke(
        main, ["extract", str(tmp_path / "absent.pdf"), "--db", str(tmp_path / "s.sqlite")]
    )
    assert result.exit_code == 1
    assert result.output.strip().splitlines() == [
        f"Error: {tmp_path / 'absent.pdf'}: no such file or folder"
    ]


def test_help_lists_options_the_caution_and_a_docs_entry() -> None:
    result = CliRunner().invoke(main, ["extract", "--help"])
    assert result.exit_code == 0
    for option in ("--db", "--jsonl", "--workers", "--timeout"):
        assert option in result.output
    assert "clinical decisions" in " ".join(result.output.split())
    docs = Path(__file__).resolve().parents[2] / "docs" / "proposal-record.md"
    assert "winnow extract" in docs.read_text(encoding="utf-8")


def test_summary_lists_each_article_with_its_counts(first_run: tuple) -> None:
    batch, db, out, result = first_run
    records = [json.loads(line) for line in out.read_text(encoding="utf-8").splitlines()]
    rows = {
        line.split("│")[1].strip(): [cell.strip() for cell in line.split("│")[2:6]]
        for line in result.output.splitlines()
        if line.startswith("│ fx")
    }
    files = {record["file"] for record in records}
    assert set(rows) == files
    for name, (total, text, tables, _low) in rows.items():
        mine = [r for r in records if r["file"] == name]
        assert int(total) == len(mine)
        assert int(tables) == sum(1 for r in mine if r["source"]["kind"] == "table")
        assert int(text) == sum(1 for r in mine if r["source"]["kind"] == "text")
