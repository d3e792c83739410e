"""Ingest: article files (PDF, JATS XML) to the :class:`~extract.ingest.document.Document` model."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from extract.ingest.document import Document
from extract.ingest.sniff import sniff

__all__ = ["Document", "read_document", "sniff"]


def read_document(path: str | Path, *, settings: Any = None) -> Document:
    """Read an article file, recognised by its content, into a Document.

    Args:
        path: a PDF or JATS XML file.
        settings: PDF reading settings (:class:`~extract.ingest.pdf.PDFSettings` or a dict);
            ignored for XML.

    Returns:
        The Document.

    Raises:
        UnsupportedFileError: the file is neither a PDF nor XML (or is empty).
        PDFReadError: the PDF is corrupt, truncated, encrypted or has no text layer.
        XMLReadError: the XML is malformed or not a JATS article.
    """
    path = Path(path)
    kind = sniff(path)
    if kind == "pdf":
        from extract.ingest.pdf import read_pdf

        return read_pdf(path, settings=settings)
    from extract.ingest.jats import read_jats

    # the JATS reader reads a JATS article and names the reason for any other XML
    return read_jats(path)
