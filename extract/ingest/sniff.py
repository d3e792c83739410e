"""Recognise an article file by its content: PDF, JATS XML, or neither."""

from __future__ import annotations

from pathlib import Path

from extract.errors import InputFileError, UnsupportedFileError

#: How many leading bytes are read to recognise a file.
SNIFF_BYTES = 4096


def sniff(path: str | Path) -> str:
    """``"pdf"`` or ``"xml"`` for a file, judged by its first bytes, never by its name.

    A PDF starts with ``%PDF-`` (ISO 32000-1, 7.5.2; a few bytes of junk before it are
    tolerated as readers do). An XML file starts (after an optional byte-order mark and white
    space) with ``<?xml`` or an element.

    Raises:
        InputFileError: the file cannot be read or is empty.
        UnsupportedFileError: the content is neither PDF nor XML.
    """
    path = Path(path)
    if path.is_dir():
        raise UnsupportedFileError(path, "is a directory, not a PDF or JATS XML file")
    try:
        with path.open("rb") as handle:
            head = handle.read(SNIFF_BYTES)
    except OSError as error:
        raise InputFileError(path, f"cannot read file ({error.strerror or error})") from error
    if not head:
        raise UnsupportedFileError(path, "empty file")
    if b"%PDF-" in head[:1024]:
        return "pdf"
    text = head.lstrip(b"\xef\xbb\xbf").lstrip()
    if text.startswith(b"\xfe\xff") or text.startswith(b"\xff\xfe"):
        return "xml"
    if text.startswith(b"<?xml") or text.startswith(b"<!DOCTYPE") or text.startswith(b"<article"):
        return "xml"
    if text.startswith(b"<") and not text[:200].lower().startswith((b"<html", b"<!doctype html")):
        return "xml"
    raise UnsupportedFileError(path, "not a PDF or JATS XML file")
