"""`winnow parse` through click's CliRunner: output, JSON, and one line per bad file."""

from __future__ import annotations

import json
import shutil
import sys
from pathlib import Path

import pytest
from click.testing import CliRunner

sys.path.insert(0, str(Path(__file__).resolve().parent.parent / "ingest"))

import pdfmaker  # noqa: E402

from extract.cli import main  # noqa: E402


@pytest.fixture(scope="module")
def folder(tmp_path_factory: pytest.TempPathFactory) -> Path:
    root = tmp_path_factory.mktemp("mixed")
    article = pdfmaker.make_article(root / "good.pdf")
    pdfmaker.make_encrypted(root / "locked.pdf")
    pdfmaker.make_truncated(root / "cut.pdf", article)
    pdfmaker.make_image_only(root / "scan.pdf")
    (root / "notes.pdf").write_text("plain words, not a PDF\n")
    (root / "empty.pdf").write_bytes(b"")
    return root


def test_parse_prints_structure(folder: Path) -> None:
    result = CliRunner().invoke(main, ["parse", str(folder / "good.pdf")])
    assert result.exit_code == 0, result.output
    assert pdfmaker.TITLE in result.output
    assert pdfmaker.DOI in result.output
    assert "Table 1: " + pdfmaker.RULED_CAPTION in result.output
    assert "24.1 ± 1.3" in result.output
    assert "no basis for clinical decisions" in result.output


def test_parse_json(folder: Path) -> None:
    result = CliRunner().invoke(main, ["parse", "--json", str(folder / "good.pdf")])
    assert result.exit_code == 0
    start = result.output.index("{")
    data = json.loads(result.output[start:])
    assert data["doi"] == pdfmaker.DOI
    assert [t["label"] for t in data["tables"]] == ["Table 1", "Table 2", "Table 3"]


@pytest.mark.parametrize(
    ("name", "reason"),
    [
        ("locked.pdf", "encrypted"),
        ("cut.pdf", "corrupt or truncated PDF"),
        ("scan.pdf", "no text layer (image-only scan; OCR is not supported)"),
        ("notes.pdf", "not a PDF or JATS XML file"),
        ("empty.pdf", "empty file"),
    ],
)
def test_bad_file_one_line(folder: Path, name: str, reason: str) -> None:
    result = CliRunner().invoke(main, ["parse", str(folder / name)])
    assert result.exit_code == 1
    lines = [ln for ln in result.output.splitlines() if ln.strip()]
    assert len(lines) == 1
    assert name in lines[0] and reason in lines[0]
    assert "Traceback" not in result.output


def test_directory_with_a_mix(folder: Path, tmp_path: Path) -> None:
    target = tmp_path / "copy"
    shutil.copytree(folder, target)
    result = CliRunner().invoke(main, ["parse", "--workers", "2", str(target)])
    assert result.exit_code == 1
    assert pdfmaker.TITLE in result.output
    assert "5 of 6 files failed" in result.output
    for name in ("locked.pdf", "cut.pdf", "scan.pdf", "notes.pdf", "empty.pdf"):
        assert f"Error: {target / name}" in result.output
