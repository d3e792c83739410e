"""Test PDFs for the ingest tests, drawn once per session."""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).parent))

import pdfmaker  # noqa: E402


@pytest.fixture(scope="session")
def made_pdfs(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Path]:
    root = tmp_path_factory.mktemp("pdfs")
    article = pdfmaker.make_article(root / "article.pdf")
    return {
        "article": article,
        "long": pdfmaker.make_long_table(root / "long.pdf"),
        "encrypted": pdfmaker.make_encrypted(root / "locked.pdf"),
        "scan": pdfmaker.make_image_only(root / "scan.pdf"),
        "truncated": pdfmaker.make_truncated(root / "cut.pdf", article),
    }
