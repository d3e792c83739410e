"""Batch orchestration: finding inputs, planning (repeats, PDF+XML twins, resume), running."""

from __future__ import annotations

import hashlib
import json
from pathlib import Path

import pytest
from reportlab.pdfgen import canvas

from extract.errors import InputFileError
from extract.run import (
    BatchReport,
    FileReport,
    collect_inputs,
    extractor_key_of,
    file_sha256,
    peek_doi,
    plan_batch,
    sniff_kind,
)

JATS = """<?xml version="1.0" encoding="UTF-8"?>
<article xmlns:xlink="http://www.w3.org/1999/xlink" article-type="research-article">
  <front><article-meta>
    <article-id pub-id-type="publisher-id">x1</article-id>
    <article-id pub-id-type="doi">{doi}</article-id>
    <title-group><article-title>Tarvexol and serum velorin</article-title></title-group>
  </article-meta></front>
  <body><sec><title>Results</title><p>Velorin was 24.1 ± 1.3 µmol/L.</p></sec></body>
</article>
"""


def make_pdf(path: Path, *lines: str) -> Path:
    page = canvas.Canvas(str(path))
    for i, line in enumerate(lines):
        page.drawString(72, 760 - 14 * i, line)
    page.save()
    return path


def make_xml(path: Path, doi: str) -> Path:
    path.write_text(JATS.format(doi=doi), encoding="utf-8")
    return path


@pytest.fixture
def folder(tmp_path: Path) -> Path:
    make_pdf(tmp_path / "a.pdf", "Tarvexol and serum velorin", "doi: 10.5555/winnow.a1")
    make_xml(tmp_path / "a.xml", "10.5555/winnow.a1")
    make_pdf(tmp_path / "b.pdf", "An article without a DOI")
    (tmp_path / "a.gold.json").write_text("{}", encoding="utf-8")
    (tmp_path / "notes.txt").write_text("not an article", encoding="utf-8")
    (tmp_path / ".hidden").mkdir()
    make_pdf(tmp_path / ".hidden" / "c.pdf", "hidden")
    (tmp_path / "sub").mkdir()
    make_xml(tmp_path / "sub" / "d.xml", "10.5555/winnow.d1")
    return tmp_path


def test_sniff_kind_by_content_not_name(tmp_path: Path) -> None:
    # "%PDF-" opens every PDF file (ISO 32000-1:2008, 7.5.2); "<?xml" an XML declaration (XML 1.0, 2.8)
    renamed = make_pdf(tmp_path / "article.txt", "text")
    assert sniff_kind(renamed) == "pdf"
    xml = make_xml(tmp_path / "article.dat", "10.5555/x")
    assert sniff_kind(xml) == "xml"
    (tmp_path / "empty.pdf").write_bytes(b"")
    assert sniff_kind(tmp_path / "empty.pdf") == "unknown"
    assert sniff_kind(tmp_path / "missing.pdf") == "unknown"


def test_collect_inputs_takes_article_files_from_folders(folder: Path) -> None:
    found = [p.relative_to(folder).as_posix() for p in collect_inputs([folder])]
    assert found == [".hidden/c.pdf", "a.pdf", "a.xml", "b.pdf", "sub/d.xml"]
    # A file named directly is kept whatever it holds: it fails later with its reason.
    assert collect_inputs([folder / "notes.txt"]) == [folder / "notes.txt"]
    with pytest.raises(InputFileError, match="missing.pdf: no such file"):
        collect_inputs([folder / "missing.pdf"])


def test_peek_doi_from_xml_and_pdf(folder: Path) -> None:
    assert peek_doi(folder / "a.xml", "xml") == "10.5555/winnow.a1"
    assert peek_doi(folder / "a.pdf", "pdf") == "10.5555/winnow.a1"
    assert peek_doi(folder / "b.pdf", "pdf") is None
    assert peek_doi(folder / "notes.txt", "pdf") is None  # never raises


def test_file_sha256_matches_hashlib(folder: Path) -> None:
    # FIPS 180-4 SHA-256 through Python's hashlib as the reference
    data = (folder / "a.pdf").read_bytes()
    assert file_sha256(folder / "a.pdf") == hashlib.sha256(data).hexdigest()


def test_plan_prefers_xml_twin_drops_repeats_and_skips_done(folder: Path) -> None:
    copy = folder / "b-copy.txt"  # not found by the folder search, named directly
    copy.write_bytes((folder / "b.pdf").read_bytes())
    paths = collect_inputs([folder / "a.pdf", folder / "a.xml", folder / "b.pdf", folder / "sub"])
    paths.append(copy)
    done = {file_sha256(folder / "sub" / "d.xml")}
    plan = plan_batch(paths, is_processed=lambda sha: sha in done)
    assert [i.path.name for i in plan.todo] == ["a.xml", "b.pdf"]
    assert [i.path.name for i in plan.skipped] == ["d.xml"]
    assert plan.reports[folder / "a.pdf"].status == "replaced"
    assert "a.xml" in (plan.reports[folder / "a.pdf"].note or "")
    assert plan.reports[copy].status == "repeated"


def test_plan_keeps_a_pdf_whose_xml_twin_is_not_given(folder: Path) -> None:
    plan = plan_batch([folder / "a.pdf", folder / "b.pdf"])
    assert [i.path.name for i in plan.todo] == ["a.pdf", "b.pdf"]


def test_batch_report_counts() -> None:
    report = BatchReport(
        (
            FileReport("a.xml", "extracted", article="x", proposals=5),
            FileReport("a.pdf", "replaced"),
            FileReport("b.pdf", "skipped", proposals=3),
            FileReport("c.pdf", "failed", note="encrypted"),
        ),
        "k@1",
    )
    assert report.articles == 2 and report.proposals == 8
    assert [f.path for f in report.failures] == ["c.pdf"]
    assert report.count("replaced") == 1


def test_extractor_key_is_stable_and_sorted() -> None:
    assert extractor_key_of(["b.rules@2", "a.rules@1", "b.rules@2"]) == "a.rules@1;b.rules@2"
    assert extractor_key_of({"a.rules": "1", "b.model": "0.2"}) == "a.rules@1;b.model@0.2"
    assert json.dumps(extractor_key_of([]))  # empty key is still a string


def test_run_for_evaluation_reports_each_file_once_also_failures(folder: Path) -> None:
    from extract.run import run_for_evaluation

    broken = folder / "broken.pdf"
    broken.write_bytes(b"%PDF-1.7\n1 0 obj << /Type /Catalog >>\n")
    paths = sorted(p for p in folder.iterdir() if p.suffix in (".pdf", ".xml"))
    seen: list[str] = []
    inputs = run_for_evaluation(paths, with_first_pass=False, workers=1, on_file=seen.append)
    assert sorted(seen) == sorted(str(p) for p in paths)
    assert [Path(f.path).name for f in inputs.failures] == ["broken.pdf"]


def test_plan_reads_pdf_dois_only_where_they_matter(
    folder: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    # A PDF's DOI is wanted for an XML twin or a skipped file's report, never otherwise.
    import extract.run as run

    peeked: list[str] = []
    real_peek = run.peek_doi

    def counting_peek(path: Path, kind: str) -> str | None:
        peeked.append(path.name)
        return real_peek(path, kind)

    monkeypatch.setattr(run, "peek_doi", counting_peek)
    plan_batch([folder / "a.pdf", folder / "b.pdf"])
    assert peeked == []
    done = {file_sha256(folder / "b.pdf")}
    plan = plan_batch([folder / "a.pdf", folder / "b.pdf"], is_processed=lambda sha: sha in done)
    assert peeked == ["b.pdf"] and [i.path.name for i in plan.skipped] == ["b.pdf"]
    peeked.clear()
    plan = plan_batch([folder / "a.pdf", folder / "a.xml"])
    assert sorted(peeked) == ["a.pdf", "a.xml"]
    assert plan.reports[folder / "a.pdf"].status == "replaced"
