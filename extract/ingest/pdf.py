"""PDF to :class:`~extract.ingest.document.Document`: words, reading order, sections, tables.

Reading happens in three passes over geometry read through pypdfium2 (see
:mod:`extract.ingest.glyphs`):

1. per page: characters -> words (as pdfplumber groups them), rules -> ruled and rules-only
   tables, the other words -> lines (margin line numbers dropped);
2. across pages: running headers, footers and page numbers dropped (a margin line that repeats
   on two or more pages, or a bare number);
3. per page: columns found, lines put in reading order and grouped into blocks; captions linked
   to their tables (an unruled table is looked for below a "Table N" caption that has none);
   footnotes below a table linked to it; tables continued on the next page merged; headings
   mapped to sections.
"""

from __future__ import annotations

import hashlib
import logging
import re
from collections import Counter
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import pypdfium2 as pdfium

from extract.errors import PDFReadError, SettingsError
from extract.ingest.blocks import blocks_and_sections
from extract.ingest.document import Block, Document, Page, Word
from extract.ingest.glyphs import read_chars, read_segments
from extract.ingest.layout import (
    PageData,
    RawBlock,
    drop_line_numbers,
    find_gutter,
    is_page_number,
    lines_to_blocks,
    margin_key,
    reading_order,
    split_at_gutter,
    words_to_lines,
)
from extract.ingest.sections import caption_text, find_doi
from extract.ingest.table_find import find_rules_only
from extract.ingest.table_link import caption_for, footnotes_for, merge_tables
from extract.ingest.table_place import (
    block_caption,
    centre_in,
    drop_orphan_continuations,
    plausible_tables,
    unruled_tables,
)
from extract.ingest.tables import RawTable, find_ruled
from extract.ingest.words import chars_to_words

logger = logging.getLogger(__name__)


@dataclass(frozen=True)
class PDFSettings:
    """Options of PDF reading.

    Attributes:
        x_tolerance: widest gap (points) inside a word, as pdfplumber's ``x_tolerance``.
        y_tolerance: how far (points) a character's top may move within a line.
        tables: whether to look for tables.
        keep_words: whether the Document keeps every word with its box.
    """

    x_tolerance: float = 3.0
    y_tolerance: float = 3.0
    tables: bool = True
    keep_words: bool = True

    def __post_init__(self) -> None:
        if self.x_tolerance < 0 or self.y_tolerance < 0:
            raise SettingsError("PDF tolerances must not be negative")

    @classmethod
    def resolve(cls, value: PDFSettings | dict[str, Any] | None) -> PDFSettings:
        """Settings from ``None`` (defaults), a dict of fields, or settings."""
        if value is None:
            return cls()
        if isinstance(value, cls):
            return value
        if isinstance(value, dict):
            unknown = set(value) - set(cls.__dataclass_fields__)
            if unknown:
                raise SettingsError(f"unknown PDF settings: {', '.join(sorted(unknown))}")
            return cls(**value)
        raise SettingsError(f"PDF settings must be a dict or PDFSettings, not {type(value)}")


def open_pdf(path: Path) -> pdfium.PdfDocument:
    """Open a PDF with pypdfium2, turning its failures into :class:`PDFReadError`."""
    try:
        data = path.read_bytes()
    except OSError as error:
        raise PDFReadError(path, f"cannot read file ({error.strerror or error})") from error
    if not data:
        raise PDFReadError(path, "empty file")
    if not data.lstrip()[:5].startswith(b"%PDF-"):
        raise PDFReadError(path, "not a PDF (no %PDF- header)")
    try:
        document = pdfium.PdfDocument(data)
    except pdfium.PdfiumError as error:
        message = str(error).lower()
        if "password" in message:
            raise PDFReadError(path, "encrypted (password-protected) PDF") from error
        raise PDFReadError(path, "corrupt or truncated PDF") from error
    if len(document) == 0:
        raise PDFReadError(path, "PDF has no pages")
    return document


def read_pdf(path: str | Path, *, settings: PDFSettings | dict[str, Any] | None = None) -> Document:
    """Read a PDF article into a Document.

    Args:
        path: the PDF file.
        settings: :class:`PDFSettings` or a dict of its fields.

    Returns:
        The Document with pages, words, blocks in reading order, sections and tables.

    Raises:
        PDFReadError: the file is empty, not a PDF, corrupt, encrypted or has no text layer.
    """
    path = Path(path)
    options = PDFSettings.resolve(settings)
    pdf = open_pdf(path)
    try:
        pages = [_read_page(pdf, i, options) for i in range(len(pdf))]
    except pdfium.PdfiumError as error:
        raise PDFReadError(path, f"corrupt page content ({error})") from error
    finally:
        pdf.close()
    if not any(p.has_text for p in pages):
        raise PDFReadError(path, "no text layer (image-only scan; OCR is not supported)")
    _drop_running_lines(pages)
    return _assemble(path, pages, options)


def _read_page(pdf: pdfium.PdfDocument, index: int, options: PDFSettings) -> PageData:
    page = pdf[index]
    try:
        width, height = page.get_size()
        chars = read_chars(page, height)
        words = chars_to_words(
            chars, x_tolerance=options.x_tolerance, y_tolerance=options.y_tolerance
        )
        tables: list[RawTable] = []
        if options.tables and words:
            segments = read_segments(page, height)
            tables = find_ruled(words, segments, index + 1)
            tables += find_rules_only(words, segments, index + 1, taken=[t.bbox for t in tables])
    finally:
        page.close()
    if tables:
        tables = plausible_tables(
            tables, words_to_lines(drop_line_numbers(words), index + 1), height
        )
    free = [w for w in words if not any(centre_in(w, t.bbox) for t in tables)]
    lines = words_to_lines(drop_line_numbers(free), index + 1)
    return PageData(index + 1, width, height, words, lines, tables, bool(chars))


def _drop_running_lines(pages: list[PageData]) -> None:
    counts: Counter[str] = Counter()
    for page in pages:
        keys = {margin_key(ln, page.height) for ln in page.lines}
        counts.update(k for k in keys if k)
    for page in pages:
        kept = []
        for line in page.lines:
            key = margin_key(line, page.height)
            if key and (counts[key] >= 2 or is_page_number(line)):
                page.margin_text += (line.text,)
                continue
            kept.append(line)
        page.lines = kept


def _body_size(pages: list[PageData]) -> float:
    sizes: Counter[float] = Counter()
    for page in pages:
        for line in page.lines:
            sizes[round(line.size, 1)] += len(line.text)
    return sizes.most_common(1)[0][0] if sizes else 10.0


def _assemble(path: Path, pages: list[PageData], options: PDFSettings) -> Document:
    body_size = _body_size(pages)
    raw_blocks: list[RawBlock] = []
    previous: PageData | None = None
    seen: set[str] = set()
    for page in pages:
        if options.tables:
            drop_orphan_continuations(page, previous)
        gutter = find_gutter(page.lines, page.width)
        page.columns = 2 if gutter is not None else 1
        if gutter is not None:
            page.lines = split_at_gutter(page.lines, gutter)
        ordered = reading_order(page.lines, gutter)
        page_blocks = lines_to_blocks(ordered, body_size=body_size)
        if options.tables:
            page_blocks = unruled_tables(page, page_blocks, previous, seen)
        raw_blocks.extend(page_blocks)
        previous = page

    kinds: dict[int, tuple[str, str | None]] = {}
    tables_out: list[tuple[RawTable, str, str, list[str], bool]] = []
    linked: set[int] = set()
    for page in pages:
        blocks = [(i, b) for i, b in enumerate(raw_blocks) if b.page == page.number]
        for i, block in blocks:
            found = block_caption(block)
            if found:
                kinds[i] = ("caption", found[0])
        for table in sorted(page.tables, key=lambda t: (t.bbox[1], t.bbox[0])):
            cap = caption_for(table, blocks, kinds, linked)
            label, caption, continued = "", "", False
            if cap is not None:
                linked.add(cap[0])
                label = kinds[cap[0]][1] or ""
                caption = caption_text(cap[1].text)
                continued = bool((block_caption(cap[1]) or ("", False))[1])
            notes = footnotes_for(table, blocks, kinds, label, body_size)
            tables_out.append((table, label, caption, notes, continued))

    document_blocks, sections, title = blocks_and_sections(raw_blocks, kinds, body_size)
    tables = merge_tables(tables_out, document_blocks)
    doi = _document_doi(document_blocks, pages[0].margin_text)
    words: tuple[Word, ...] = ()
    if options.keep_words:
        words = tuple(
            Word(w.text, p.number, (w.x0, w.top, w.x1, w.bottom), w.size, w.bold)
            for p in pages
            for w in p.words
        )
    data = path.read_bytes()
    return Document(
        path=str(path),
        name=path.stem,
        source="pdf",
        sha256=hashlib.sha256(data).hexdigest(),
        doi=doi,
        title=title,
        pages=tuple(Page(p.number, p.width, p.height, p.columns, p.has_text) for p in pages),
        blocks=tuple(document_blocks),
        sections=tuple(sections),
        tables=tuple(tables),
        words=words,
    )


def _document_doi(blocks: list[Block], margin: tuple[str, ...]) -> str | None:
    """The article's own DOI: one marked "doi" on page 1 (running header included) before the
    references, else the first DOI on page 1."""
    front = [b for b in blocks if b.page == 1 and b.section != "references"]
    text = " ".join([*margin, *(b.text for b in front)])
    text = re.sub(r"(?<=[-/.])\s+", "", text)
    marked = re.search(r"(doi\.org/|doi:?\s*)(10\.\d{4,9}/\S+)", text, re.IGNORECASE)
    if marked:
        return find_doi(marked.group(2))
    return find_doi(text)
