"""The batch runner: results and failures per file, time limits, progress."""

from __future__ import annotations

import time
from pathlib import Path

import pytest

from extract.batch import find_files, run_batch
from extract.errors import ParseTimeoutError, PDFReadError


def _work(path: Path) -> int:
    text = path.read_text()
    if text == "hang":
        time.sleep(60)
    if text == "bad":
        raise PDFReadError(path, "corrupt or truncated PDF")
    return len(text)


def _files(tmp_path: Path, contents: list[str]) -> list[Path]:
    out = []
    for i, text in enumerate(contents):
        path = tmp_path / f"f{i}.pdf"
        path.write_text(text)
        out.append(path)
    return out


def test_results_and_failures_in_order(tmp_path: Path) -> None:
    files = _files(tmp_path, ["abc", "bad", "hello"])
    seen: list[str] = []
    batch = run_batch(_work, files, workers=2, timeout=30, progress=lambda r: seen.append(r.path))
    assert [r.value for r in batch.results] == [3, None, 5]
    assert isinstance(batch.results[1].error, PDFReadError)
    assert "f1.pdf: corrupt or truncated PDF" in str(batch.results[1].error)
    assert sorted(seen) == sorted(str(f) for f in files)
    assert len(batch.failures) == 1 and len(batch.succeeded) == 2


def test_hanging_file_is_killed(tmp_path: Path) -> None:
    files = _files(tmp_path, ["hang", "ok"])
    started = time.monotonic()
    batch = run_batch(_work, files, workers=2, timeout=1.0)
    assert time.monotonic() - started < 10
    assert isinstance(batch.results[0].error, ParseTimeoutError)
    assert "timed out after 1 s" in str(batch.results[0].error)
    assert batch.results[1].value == 2


def test_inline_mode(tmp_path: Path) -> None:
    files = _files(tmp_path, ["abc", "bad"])
    batch = run_batch(_work, files, workers=0)
    assert batch.results[0].value == 3 and not batch.results[1].ok


def test_bugs_are_not_swallowed(tmp_path: Path) -> None:
    with pytest.raises(RuntimeError, match="FileNotFoundError"):
        run_batch(_work, [tmp_path / "missing.pdf"], workers=1, timeout=10)


def test_find_files_walks_directories(tmp_path: Path) -> None:
    (tmp_path / "a.pdf").write_text("x")
    (tmp_path / "sub").mkdir()
    (tmp_path / "sub" / "b.XML").write_text("x")
    (tmp_path / "c.txt").write_text("x")
    found = [p.name for p in find_files([tmp_path])]
    assert found == ["a.pdf", "b.XML"]
