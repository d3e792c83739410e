"""`winnow evaluate` through click's CliRunner: its numbers are the library's."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

import pytest
from click.testing import CliRunner

from extract.baseline import baseline_proposals
from extract.cli import main
from extract.evaluate import evaluate, find_gold_files, load_gold
from extract.ingest import read_document
from extract.records.assemble import first_pass
from fixtures.generate import DEFAULT_SEED, generate

#: First eight bytes of every PNG file (PNG specification, ISO/IEC 15948, 5.2).
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


@pytest.fixture(scope="module")
def gold_dir(tmp_path_factory: pytest.TempPathFactory) -> Path:
    root = tmp_path_factory.mktemp("gold")
    generate(DEFAULT_SEED, root, count=3)
    return root


@pytest.fixture(scope="module")
def library_scores(gold_dir: Path) -> dict[str, Any]:
    """The scores computed directly with the library, for comparison."""
    articles = [load_gold(p) for p in find_gold_files(gold_dir)]
    documents = [read_document(gold_dir / f"{a.name}.pdf") for a in articles]
    mine = [p for d in documents for p in first_pass(d)]
    naive = [p for d in documents for p in baseline_proposals(d)]
    return {
        "winnow": evaluate(articles, mine).to_dict(),
        "baseline": evaluate(articles, naive).to_dict(),
        "proposals": mine,
    }


@pytest.fixture(scope="module")
def cli_json(gold_dir: Path, tmp_path_factory: pytest.TempPathFactory) -> tuple[dict, Path]:
    plot = tmp_path_factory.mktemp("plot") / "f1.png"
    result = CliRunner().invoke(
        main, ["evaluate", "--gold", str(gold_dir), "--json", "--plot", str(plot)]
    )
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout), plot


def test_json_numbers_equal_the_library(cli_json: tuple, library_scores: dict) -> None:
    data, _ = cli_json
    assert data["articles"] == 3
    assert data["winnow"] == library_scores["winnow"]
    assert data["baseline"] == library_scores["baseline"]
    assert data["winnow"]["value"]["tp"] > 0


def test_plot_is_a_png(cli_json: tuple) -> None:
    _, plot = cli_json
    assert plot.read_bytes()[:8] == PNG_SIGNATURE


def test_table_shows_the_library_figures(gold_dir: Path, library_scores: dict) -> None:
    result = CliRunner().invoke(main, ["evaluate", "--gold", str(gold_dir)])
    assert result.exit_code == 0, result.output
    value = library_scores["winnow"]["value"]
    row = next(line for line in result.output.splitlines() if "value f1" in line)
    cells = [c.strip() for c in row.split("│") if c.strip()]
    assert cells[1] == f"{value['f1']:.3f}"
    assert cells[2] == f"{library_scores['baseline']['value']['f1']:.3f}"
    counts = next(line for line in result.output.splitlines() if "value TP/FP/FN" in line)
    assert f"{value['tp']}/{value['fp']}/{value['fn']}" in counts
    assert "curator's verification" in result.output


def test_scores_a_jsonl_file_instead_of_running(
    gold_dir: Path, library_scores: dict, tmp_path: Path
) -> None:
    # Keep only the proposals of the first article: the others' gold points become misses.
    proposals = library_scores["proposals"]
    first_file = proposals[0].file
    kept = [p for p in proposals if p.file == first_file]
    lines = tmp_path / "p.jsonl"
    lines.write_text("".join(p.to_json() + "\n" for p in kept), encoding="utf-8")
    result = CliRunner().invoke(
        main, ["evaluate", "--gold", str(gold_dir), "--jsonl", str(lines), "--json"]
    )
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    articles = [load_gold(p) for p in find_gold_files(gold_dir)]
    assert data["winnow"] == evaluate(articles, kept).to_dict()
    assert data["winnow"]["value"]["fn"] > library_scores["winnow"]["value"]["fn"]


def test_bad_inputs_are_one_line(tmp_path: Path, gold_dir: Path) -> None:
    empty = tmp_path / "empty"
    empty.mkdir()
    result = CliRunner().invoke(main, ["evaluate", "--gold", str(empty)])
    assert result.exit_code == 1
    assert result.output.strip() == f"Error: {empty}: no *.gold.json files"
    bad = tmp_path / "bad.jsonl"
    bad.write_text('{"id": "x"}\n', encoding="utf-8")
    result = CliRunner().invoke(main, ["evaluate", "--gold", str(gold_dir), "--jsonl", str(bad)])
    assert result.exit_code == 1
    assert result.output.startswith(f"Error: {bad}:1: not a proposal record")
    assert len(result.output.strip().splitlines()) == 1


def test_help_lists_options_and_a_docs_entry() -> None:
    result = CliRunner().invoke(main, ["evaluate", "--help"])
    assert result.exit_code == 0
    for option in ("--gold", "--jsonl", "--json", "--plot", "--source"):
        assert option in result.output
    docs = Path(__file__).resolve().parents[2] / "docs" / "accuracy.md"
    assert "winnow evaluate --gold" in docs.read_text(encoding="utf-8")
