"""Raw tables to Document tables: captions, footnotes and tables continued on the next page.

A table takes the nearest "Table N" caption above it (or, farther weighted, below it) and the
lines right below it that are in smaller type or open with a footnote marker. A table on the
next page captioned "Table N (continued)", or without a caption but with the same header, or
found there as a continuation, is merged into the table before, its repeated header dropped.
"""

from __future__ import annotations

import logging
from collections.abc import Sequence
from dataclasses import replace

from extract.ingest.document import Block, Table, TableCell
from extract.ingest.layout import RawBlock
from extract.ingest.sections import looks_like_footnote
from extract.ingest.tables import RawTable, raw_to_cells, unit_of

logger = logging.getLogger(__name__)


def caption_for(
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


def footnotes_for(
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


def merge_tables(
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
    """Whether the table on the next page opens with this table's header."""
    header = [tuple(row) for row in table.grid()[: table.header_rows]]
    if not header or not raw.rows:
        return False
    if list(raw.rows[: raw.header_rows or 1]) == header[: raw.header_rows or 1]:
        return True
    return repeats_header(raw.rows[0], header)


def repeats_header(row: Sequence[str], header: Sequence[Sequence[str]]) -> bool:
    """Whether a row repeats a table's header, as a continued table prints it again.

    Each cell must be empty or read as the header of its column: the text of one header row
    there, or the header rows' texts there joined (a two-row header read as one wrapped row).
    At least one cell must hold header text.

    >>> header = [("Outcome", "Week 4", "Week 4"), ("Outcome", "Vehicle", "Dose")]
    >>> repeats_header(("", "Vehicle", "Dose"), header)
    True
    >>> repeats_header(("Outcome", "Week 4 Vehicle", "Week 4 Dose"), header)
    True
    >>> repeats_header(("Marker 1", "1.1", "1.2"), header)
    False
    """
    if not header or len(row) != len(header[0]):
        return False
    filled = 0
    for c, text in enumerate(row):
        text = " ".join(text.split())
        if not text:
            continue
        column: list[str] = []
        for head in header:
            cell = " ".join(head[c].split()) if c < len(head) else ""
            if cell and cell not in column:
                column.append(cell)
        if text not in column and text != " ".join(column):
            return False
        filled += 1
    return filled > 0


def _append(table: Table, raw: RawTable, notes: list[str]) -> Table:
    skip = raw.header_rows if _same_header(table, raw) or raw.header_rows else 0
    header = [tuple(row) for row in table.grid()[: table.header_rows]]
    # a repeated header read with other row breaks than the first page's leaves some of its
    # rows in the body: drop those that repeat the header
    while skip < len(raw.rows) and skip < raw.header_rows + table.header_rows:
        if not repeats_header(raw.rows[skip], header):
            break
        skip += 1
    rows = raw.rows[skip:]
    boxes = raw.boxes[skip:]
    if not rows:
        return replace(
            table, pages=table.pages + (raw.page,), footnotes=table.footnotes + tuple(notes)
        )
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
    cells = raw_to_cells(raw)
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
