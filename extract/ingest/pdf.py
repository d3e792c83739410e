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
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import pypdfium2 as pdfium

from extract.errors import PDFReadError, SettingsError
from extract.ingest.document import Block, Document, Page, Section, Table, TableCell, Word
from extract.ingest.glyphs import read_chars, read_segments
from extract.ingest.layout import (
    Line,
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
from extract.ingest.sections import (
    caption_label,
    caption_text,
    find_doi,
    heading_section,
    looks_like_footnote,
)
from extract.ingest.table_find import find_rules_only, find_unruled
from extract.ingest.tables import RawTable, find_ruled, unit_of
from extract.ingest.words import RawWord, chars_to_words

logger = logging.getLogger(__name__)

BBox = tuple[float, float, float, float]


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


@dataclass
class _PageData:
    number: int
    width: float
    height: float
    words: list[RawWord]
    lines: list[Line]
    tables: list[RawTable]
    has_text: bool
    columns: int = 1
    margin_text: tuple[str, ...] = ()


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


def _read_page(pdf: pdfium.PdfDocument, index: int, options: PDFSettings) -> _PageData:
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
        tables = _plausible(tables, words_to_lines(words, index + 1), height)
    free = [w for w in words if not any(_centre_in(w, t.bbox) for t in tables)]
    lines = words_to_lines(drop_line_numbers(free), index + 1)
    return _PageData(index + 1, width, height, words, lines, tables, bool(chars))


def _plausible(tables: list[RawTable], lines: list[Line], height: float) -> list[RawTable]:
    """Tables with a "Table N" caption next to them, or continuing a table from the page before.

    Boxes, frames and shaded panels drawn around ordinary text are not tables.
    """
    captions = [
        ln
        for ln in lines
        if (c := caption_label(ln.text, bold=ln.words[0].bold)) and c[0].startswith("Table")
    ]
    kept = []
    for table in tables:
        filled = sum(1 for row in table.rows for text in row if text.strip())
        if len(table.rows) < 2 or len(table.rows[0]) < 2 or filled < 4:
            continue
        x0, top, x1, bottom = table.bbox
        near = any(
            ln.x1 > x0 - 5
            and ln.x0 < x1 + 5
            and (-5 <= top - ln.bottom <= 120 or -5 <= ln.top - bottom <= 60)
            for ln in captions
        )
        if near or (top < 0.3 * height and len(table.rows[0]) >= 3):
            kept.append(table)
    return kept


def _centre_in(word: RawWord, box: BBox, pad: float = 1.0) -> bool:
    cx, cy = (word.x0 + word.x1) / 2, (word.top + word.bottom) / 2
    return box[0] - pad <= cx <= box[2] + pad and box[1] - pad <= cy <= box[3] + pad


def _drop_running_lines(pages: list[_PageData]) -> None:
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


def _body_size(pages: list[_PageData]) -> float:
    sizes: Counter[float] = Counter()
    for page in pages:
        for line in page.lines:
            sizes[round(line.size, 1)] += len(line.text)
    return sizes.most_common(1)[0][0] if sizes else 10.0


@dataclass
class _Caption:
    block: RawBlock
    label: str
    continued: bool


def _assemble(path: Path, pages: list[_PageData], options: PDFSettings) -> Document:
    body_size = _body_size(pages)
    raw_blocks: list[RawBlock] = []
    previous: _PageData | None = None
    seen: set[str] = set()
    for page in pages:
        gutter = find_gutter(page.lines, page.width)
        page.columns = 2 if gutter is not None else 1
        if gutter is not None:
            page.lines = split_at_gutter(page.lines, gutter)
        ordered = reading_order(page.lines, gutter)
        page_blocks = lines_to_blocks(ordered, body_size=body_size)
        if options.tables:
            page_blocks = _unruled_tables(page, page_blocks, previous, seen)
        raw_blocks.extend(page_blocks)
        previous = page

    kinds: dict[int, tuple[str, str | None]] = {}
    tables_out: list[tuple[RawTable, str, str, list[str], bool]] = []
    linked: set[int] = set()
    for page in pages:
        blocks = [(i, b) for i, b in enumerate(raw_blocks) if b.page == page.number]
        for i, block in blocks:
            found = _block_caption(block)
            if found:
                kinds[i] = ("caption", found[0])
        for table in sorted(page.tables, key=lambda t: (t.bbox[1], t.bbox[0])):
            cap = _caption_for(table, blocks, kinds, linked)
            label, caption, continued = "", "", False
            if cap is not None:
                linked.add(cap[0])
                label = kinds[cap[0]][1] or ""
                caption = caption_text(cap[1].text)
                continued = bool((_block_caption(cap[1]) or ("", False))[1])
            notes = _footnotes_for(table, blocks, kinds, label, body_size)
            tables_out.append((table, label, caption, notes, continued))

    document_blocks, sections, title = _blocks_and_sections(raw_blocks, kinds, body_size)
    tables = _merge_tables(tables_out, document_blocks)
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


def _unruled_tables(
    page: _PageData, blocks: list[RawBlock], previous: _PageData | None, seen: set[str]
) -> list[RawBlock]:
    """Look below each "Table N" caption with no table under it for an unruled table, and at
    the top of the page for a table continued from the page before.

    ``seen`` holds the labels of the tables found so far (updated here): a second caption with
    a label already used ("Table 1 - source data 1") opens no table unless it says "continued".
    """
    out = list(blocks)
    found: list[RawTable] = []
    words = drop_line_numbers(page.words)
    continued = _continuation(page, words, blocks, previous)
    if continued is not None:
        found.append(continued)
        page.tables.append(continued)
    for block in blocks:
        caption = _block_caption(block)
        if not caption or not caption[0].startswith("Table"):
            continue
        x0, top, x1, bottom = block.bbox
        if caption[0] in seen and not caption[1]:
            continue
        if any(t.bbox[1] >= bottom - 2 and t.bbox[1] - bottom < 60 for t in page.tables) or any(
            # a caption right under a table with no caption of its own is that table's caption
            t.bbox[3] <= top + 2 and top - t.bbox[3] < 30 and not _captioned_above(t, blocks)
            for t in page.tables
        ):
            seen.add(caption[0])
            continue
        limit = _next_below(page, blocks, block, bottom)
        if block.column:
            x0, x1 = min(x0, x1 - 1), x1
        else:
            x0, x1 = 0.0, page.width
        table = find_unruled(words, page.number, caption_bottom=bottom, x0=x0, x1=x1, limit=limit)
        if table is None:
            continue
        seen.add(caption[0])
        found.append(table)
        page.tables.append(table)
    for table in found:
        out = [b for b in out if not all(_line_in(ln, table.bbox) for ln in b.lines)]
    return out


def _next_below(page: _PageData, blocks: list[RawBlock], block: RawBlock | None, y: float) -> float:
    """The top of the first table or caption below ``y`` (else the page bottom)."""
    later = [t.bbox[1] for t in page.tables if t.bbox[1] > y] + [
        b.bbox[1] for b in blocks if b is not block and b.bbox[1] > y and _block_caption(b)
    ]
    return min(later, default=page.height)


def _captioned_above(table: RawTable, blocks: list[RawBlock]) -> bool:
    """Whether a "Table N" caption sits right above the table."""
    return any(
        (c := _block_caption(b)) is not None
        and c[0].startswith("Table")
        and b.bbox[3] <= table.bbox[1] + 3
        and table.bbox[1] - b.bbox[3] < 60
        and b.bbox[0] < table.bbox[2]
        and b.bbox[2] > table.bbox[0]
        for b in blocks
    )


def _continuation(
    page: _PageData, words: list[RawWord], blocks: list[RawBlock], previous: _PageData | None
) -> RawTable | None:
    """An unruled table at the top of the page continuing the table that ended the page before.

    The table before must run to the bottom of its page (no text below it); the rows at the top
    of this page must have as many columns, within its left and right edges.
    """
    if previous is None or not previous.tables or not page.lines:
        return None
    last = max(previous.tables, key=lambda t: t.bbox[3])
    if any(ln.top > last.bbox[3] + 1 for ln in previous.lines):
        return None
    first = min(ln.top for ln in page.lines)
    if any(b.bbox[1] <= first + 1 and _block_caption(b) for b in blocks):
        return None  # a caption of its own ("Table 2 (continued)") is read as any caption
    if any(t.bbox[1] <= first + 5 for t in page.tables):
        return None  # a table with rules already found at the top
    table = find_unruled(
        words,
        page.number,
        caption_bottom=first - 1,
        x0=last.bbox[0] - 10,
        x1=last.bbox[2] + 10,
        limit=_next_below(page, blocks, None, first),
    )
    if table is None or len(table.rows[0]) != len(last.rows[0]):
        return None
    return replace(table, continued=True)


def _block_caption(block: RawBlock) -> tuple[str, bool] | None:
    """The caption label a block opens with, if its label is set off as a caption's is."""
    return caption_label(block.text, bold=block.lines[0].words[0].bold)


def _line_in(line: Line, box: BBox) -> bool:
    return all(_centre_in(w, box, pad=2.0) for w in line.words)


def _caption_for(
    table: RawTable,
    blocks: list[tuple[int, RawBlock]],
    kinds: dict[int, tuple[str, str | None]],
    linked: set[int],
) -> tuple[int, RawBlock] | None:
    best: tuple[float, int, RawBlock] | None = None
    for i, block in blocks:
        if i in linked or kinds.get(i, ("", None))[0] != "caption":
            continue
        if not (kinds[i][1] or "").startswith("Table"):
            continue
        x0, top, x1, bottom = block.bbox
        if x1 < table.bbox[0] - 5 or x0 > table.bbox[2] + 5:
            continue
        if bottom <= table.bbox[1] + 3:
            distance = table.bbox[1] - bottom
        elif top >= table.bbox[3] - 3:
            distance = (top - table.bbox[3]) * 1.5
        else:
            continue
        if distance < 120 and (best is None or distance < best[0]):
            best = (distance, i, block)
    return None if best is None else (best[1], best[2])


def _footnotes_for(
    table: RawTable,
    blocks: list[tuple[int, RawBlock]],
    kinds: dict[int, tuple[str, str | None]],
    label: str,
    body_size: float,
) -> list[str]:
    notes: list[str] = []
    edge = table.bbox[3]
    for i, block in sorted(blocks, key=lambda ib: ib[1].bbox[1]):
        x0, top, x1, bottom = block.bbox
        if top < edge - 2 or i in kinds:
            continue
        if x1 < table.bbox[0] - 5 or x0 > table.bbox[2] + 5:
            continue
        if top - edge > 1.6 * max(block.size, 4.0):
            break
        if block.size < body_size - 0.4 or looks_like_footnote(block.text):
            for line in block.lines:
                text = line.text
                if notes and not looks_like_footnote(text) and line.size < body_size - 0.4:
                    notes[-1] = notes[-1] + " " + text
                else:
                    notes.append(text)
            kinds[i] = ("footnote", label or None)
            edge = bottom
        else:
            break
    return notes


def _blocks_and_sections(
    raw_blocks: list[RawBlock],
    kinds: dict[int, tuple[str, str | None]],
    body_size: float,
) -> tuple[list[Block], list[Section], str | None]:
    title_index = _title_index(raw_blocks, kinds, body_size)
    title = raw_blocks[title_index].text if title_index is not None else None
    blocks: list[Block] = []
    section = "other" if title_index is not None else "other"
    heading: str | None = None
    spans: list[list[Any]] = []
    for i, raw in enumerate(raw_blocks):
        kind, label = kinds.get(i, ("paragraph", None))
        text = raw.text
        if i == title_index:
            kind, section, heading = "title", "title", None
            spans.append(["title", text, len(blocks)])
        elif kind == "paragraph" and _is_heading(raw, body_size):
            name = heading_section(text)
            kind = "heading"
            if name is not None:
                section, heading = name, text
                spans.append([name, text, len(blocks)])
        elif (
            kind == "paragraph"
            and section in ("title", "other")
            and re.match(r"^(abstract|summary)\b", text, re.IGNORECASE)
        ):
            section, heading = "abstract", text.split()[0]
            spans.append(["abstract", heading, len(blocks)])
        blocks.append(
            Block(
                index=len(blocks),
                kind=kind,
                text=text,
                section=section,
                page=raw.page,
                bbox=raw.bbox,
                column=raw.column,
                heading=heading,
                label=label,
            )
        )
    sections: list[Section] = []
    for n, (name, head, first) in enumerate(spans):
        last = (spans[n + 1][2] - 1) if n + 1 < len(spans) else len(blocks) - 1
        if last < first:
            continue
        members = blocks[first : last + 1]
        # a section runs over the pages of its own text; floats (tables, their captions and
        # notes) and subheadings such as a "Tables" page heading do not extend it
        running = [b for b in members[1:] if _is_section_text(b)] or members
        sections.append(
            Section(
                name=name,
                heading=head,
                page_start=members[0].page,
                page_end=max(b.page or 0 for b in [members[0], *running]),
                first_block=first,
                last_block=last,
            )
        )
    return blocks, sections, title


def _is_section_text(block: Block) -> bool:
    """Whether a block is running text of its section (paragraphs and figure legends)."""
    if block.kind == "caption":
        return (block.label or "").startswith("Figure")
    return block.kind in ("paragraph", "title")


def _title_index(
    raw_blocks: list[RawBlock], kinds: dict[int, tuple[str, str | None]], body_size: float
) -> int | None:
    first = [(i, b) for i, b in enumerate(raw_blocks) if b.page == 1 and i not in kinds]
    if not first:
        return None
    biggest = max(b.size for _, b in first)
    if biggest < body_size + 1.5:
        return None
    for i, block in first:
        if block.size == biggest and len(block.text) > 10:
            return i
    return None


def _is_heading(block: RawBlock, body_size: float) -> bool:
    text = block.text.strip()
    if len(block.lines) > 2 or len(text) > 90 or not text:
        return False
    if text.endswith((".", ",", ";")) and heading_section(text) is None:
        return False
    if heading_section(text) is not None and (
        block.bold or block.size > body_size + 0.4 or text.isupper() or len(block.lines) == 1
    ):
        return len(text.split()) <= 6
    return block.bold or block.size > body_size + 0.9


def _merge_tables(
    found: list[tuple[RawTable, str, str, list[str], bool]], blocks: list[Block]
) -> list[Table]:
    merged: list[Table] = []
    for raw, label, caption, notes, continued in found:
        prev = merged[-1] if merged else None
        if (
            prev is not None
            and raw.page == (prev.pages[-1] + 1)
            and (
                (continued and label == prev.label)
                or (not label and (raw.continued or _same_header(prev, raw)))
            )
        ):
            merged[-1] = _append(prev, raw, notes)
            continue
        if not label:
            label = f"Table {len(merged) + 1}" if not continued else label
        section = _section_at(blocks, raw.page, raw.bbox[1])
        merged.append(_to_table(raw, label, caption, notes, section))
    return merged


def _same_header(table: Table, raw: RawTable) -> bool:
    header = [tuple(row) for row in table.grid()[: table.header_rows]]
    return bool(header) and list(raw.rows[: raw.header_rows or 1]) == header[: raw.header_rows or 1]


def _append(table: Table, raw: RawTable, notes: list[str]) -> Table:
    skip = raw.header_rows if _same_header(table, raw) or raw.header_rows else 0
    rows = raw.rows[skip:]
    boxes = raw.boxes[skip:]
    if len(raw.rows[0]) != table.n_cols:
        logger.warning(
            "%s continues with %d columns, not %d", table.label, len(raw.rows[0]), table.n_cols
        )
        rows = tuple(tuple(list(r[: table.n_cols]) + [""] * (table.n_cols - len(r))) for r in rows)
    start = table.n_rows
    cells = list(table.cells)
    for r, row in enumerate(rows):
        for c, text in enumerate(row[: table.n_cols]):
            box = boxes[r][c] if r < len(boxes) and c < len(boxes[r]) else None
            cells.append(TableCell(start + r, c, text, box, raw.page))
    row_units = table.row_units + tuple(unit_of(r[0]) for r in rows)
    return replace(
        table,
        n_rows=table.n_rows + len(rows),
        cells=tuple(cells),
        pages=table.pages + (raw.page,),
        footnotes=table.footnotes + tuple(notes),
        row_units=row_units,
    )


def _to_table(
    raw: RawTable, label: str, caption: str, notes: list[str], section: str | None
) -> Table:
    n_cols = len(raw.rows[0])
    cells = tuple(
        TableCell(r, c, text, raw.boxes[r][c], raw.page)
        for r, row in enumerate(raw.rows)
        for c, text in enumerate(row)
    )
    column_units = []
    for c in range(n_cols):
        unit = None
        for r in range(raw.header_rows - 1, -1, -1):
            unit = unit_of(raw.rows[r][c])
            if unit:
                break
        column_units.append(unit)
    row_units = tuple(
        unit_of(row[0]) if r >= raw.header_rows else None for r, row in enumerate(raw.rows)
    )
    return Table(
        label=label,
        caption=caption,
        footnotes=tuple(notes),
        page=raw.page,
        pages=(raw.page,),
        bbox=raw.bbox,
        n_rows=len(raw.rows),
        n_cols=n_cols,
        header_rows=raw.header_rows,
        cells=cells,
        column_units=tuple(column_units),
        row_units=row_units,
        section=section,
        reader=f"winnow.{raw.style}",
    )


def _section_at(blocks: list[Block], page: int, top: float) -> str | None:
    section = None
    for block in blocks:
        if block.page is None or block.bbox is None:
            continue
        if (block.page, block.bbox[1]) <= (page, top):
            section = block.section
    return section
