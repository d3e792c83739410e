"""Where tables sit in the page flow: which ruled candidates are tables, and unruled tables.

A grid or a set of rules is a table only with a "Table N" caption beside it (or at the top of a
page, as a continuation): frames and shaded panels drawn around text are not. Unruled tables
are looked for below each "Table N" caption with no table under it, and at the top of a page
when the page before ended with a table (a continuation).
"""

from __future__ import annotations

from dataclasses import replace

from extract.ingest.layout import Line, PageData, RawBlock, drop_line_numbers, words_to_lines
from extract.ingest.sections import caption_label
from extract.ingest.table_find import find_unruled
from extract.ingest.table_text import cells_of
from extract.ingest.tables import RawTable
from extract.ingest.words import RawWord

BBox = tuple[float, float, float, float]


def plausible_tables(tables: list[RawTable], lines: list[Line], height: float) -> list[RawTable]:
    """Tables with a "Table N" caption next to them, or continuing a table from the page before.

    Boxes, frames and shaded panels drawn around ordinary text are not tables, nor is a chart
    drawn with rectangles (bars): its "grid" holds fewer distinct texts than half its rows, or
    a "Figure N" caption is nearer to it than any "Table N" caption.
    """
    captions = [
        (c[0].startswith("Table"), ln)
        for ln in lines
        if (c := caption_label(ln.text, bold=ln.words[0].bold))
    ]
    kept = []
    for table in tables:
        texts = [text for row in table.rows for text in row if text.strip()]
        if len(table.rows) < 2 or len(table.rows[0]) < 2 or len(texts) < 4:
            continue
        if len(set(texts)) * 2 < len(table.rows):
            continue  # one text repeated over a grid of bars: a chart
        x0, top, x1, bottom = table.bbox
        distances = [
            (min(abs(top - ln.bottom), abs(ln.top - bottom)), is_table)
            for is_table, ln in captions
            if ln.x1 > x0 - 5
            and ln.x0 < x1 + 5
            and (-5 <= top - ln.bottom <= 120 or -5 <= ln.top - bottom <= 60)
        ]
        if distances and not min(distances)[1]:
            continue  # a figure's caption is the nearest: a chart or a drawing
        if any(is_table for _, is_table in distances):
            kept.append(table)
        elif top < 0.3 * height and len(table.rows[0]) >= 3:
            # no caption, at the top of the page: only a continuation (checked against the
            # page before by drop_orphan_continuations)
            kept.append(replace(table, continued=True))
    return kept


def ends_in_table(page: PageData | None) -> bool:
    """Whether the page's last content is a table (no text line below its lowest table)."""
    if page is None or not page.tables:
        return False
    last = max(page.tables, key=lambda t: t.bbox[3])
    return not any(ln.top > last.bbox[3] + 1 for ln in page.lines)


def drop_orphan_continuations(page: PageData, previous: PageData | None) -> None:
    """Drop caption-less page-top tables when the page before does not end in a table.

    Such a grid (a figure's panel grid, a key drawn in boxes) continues nothing; its words go
    back into the page's lines.
    """
    if ends_in_table(previous):
        return
    orphans = [t for t in page.tables if t.continued]
    if not orphans:
        return
    page.tables = [t for t in page.tables if not t.continued]
    back = [
        w
        for w in drop_line_numbers(page.words)
        if any(centre_in(w, t.bbox) for t in orphans)
        and not any(centre_in(w, t.bbox) for t in page.tables)
    ]
    lines = page.lines + words_to_lines(back, page.number)
    page.lines = sorted(lines, key=lambda ln: (round(ln.top), ln.x0))


def centre_in(word: RawWord, box: BBox, pad: float = 1.0) -> bool:
    cx, cy = (word.x0 + word.x1) / 2, (word.top + word.bottom) / 2
    return box[0] - pad <= cx <= box[2] + pad and box[1] - pad <= cy <= box[3] + pad


def unruled_tables(
    page: PageData, blocks: list[RawBlock], previous: PageData | None, seen: set[str]
) -> list[RawBlock]:
    """Look below each "Table N" caption with no table under it for an unruled table, and at
    the top of the page for a table continued from the page before.

    ``seen`` holds the labels of the tables found so far (updated here): a second caption with
    a label already used ("Table 1 - source data 1") opens no table unless it says "continued".
    """
    blocks = join_caption_lines(blocks)
    out = list(blocks)
    found: list[RawTable] = []
    words = drop_line_numbers(page.words)
    continued = _continuation(page, words, blocks, previous)
    if continued is not None:
        found.append(continued)
        page.tables.append(continued)
    for block in blocks:
        caption = block_caption(block)
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


def join_caption_lines(blocks: list[RawBlock]) -> list[RawBlock]:
    """Table captions with the lines that finish them joined back on.

    Double-spaced manuscripts set a caption's lines so far apart that its last line reads as a
    block of its own, then as a table row. A line is the caption's when the caption's text runs
    on (no full stop at its end), the line is set right under it in the same type (size and
    weight), starts at the caption's left edge, holds one run of words (no cell gaps) and, under a
    caption of several lines, keeps its line pitch.
    """
    out: list[RawBlock] = []
    for block in blocks:
        prev = out[-1] if out else None
        if prev is not None and _finishes_caption(prev, block):
            out[-1] = RawBlock(prev.lines + block.lines, prev.column)
            continue
        out.append(block)
    return out


def _finishes_caption(caption: RawBlock, block: RawBlock) -> bool:
    label = block_caption(caption)
    if label is None or not label[0].startswith("Table") or block_caption(block) is not None:
        return False
    last, line = caption.lines[-1], block.lines[0]
    return (
        len(block.lines) == 1
        and line.page == last.page
        and not caption.text.rstrip().endswith(".")
        and line.bold == last.bold
        and abs(line.size - last.size) <= 0.2
        and abs(line.x0 - caption.bbox[0]) <= 2
        and 0 <= line.top - last.bottom <= 2.2 * last.size
        and len(cells_of(line.words)) == 1
        # a caption of several lines goes on at its own line pitch
        and (
            len(caption.lines) < 2
            or abs(line.bottom - last.bottom - (last.bottom - caption.lines[-2].bottom)) <= 1.5
        )
    )


def _next_below(page: PageData, blocks: list[RawBlock], block: RawBlock | None, y: float) -> float:
    """The top of the first table or caption below ``y`` (else the page bottom)."""
    later = [t.bbox[1] for t in page.tables if t.bbox[1] > y] + [
        b.bbox[1] for b in blocks if b is not block and b.bbox[1] > y and block_caption(b)
    ]
    return min(later, default=page.height)


def _captioned_above(table: RawTable, blocks: list[RawBlock]) -> bool:
    """Whether a "Table N" caption sits right above the table."""
    return any(
        (c := block_caption(b)) is not None
        and c[0].startswith("Table")
        and b.bbox[3] <= table.bbox[1] + 3
        and table.bbox[1] - b.bbox[3] < 60
        and b.bbox[0] < table.bbox[2]
        and b.bbox[2] > table.bbox[0]
        for b in blocks
    )


def _continuation(
    page: PageData, words: list[RawWord], blocks: list[RawBlock], previous: PageData | None
) -> RawTable | None:
    """An unruled table at the top of the page continuing the table that ended the page before.

    The table before must run to the bottom of its page (no text below it); the rows at the top
    of this page must have as many columns, within its left and right edges.
    """
    if previous is None or not ends_in_table(previous) or not page.lines:
        return None
    last = max(previous.tables, key=lambda t: t.bbox[3])
    first = min(ln.top for ln in page.lines)
    if any(b.bbox[1] <= first + 1 and block_caption(b) for b in blocks):
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


def block_caption(block: RawBlock) -> tuple[str, bool] | None:
    """The caption label a block opens with, if its label is set off as a caption's is."""
    return caption_label(block.text, bold=block.lines[0].words[0].bold)


def _line_in(line: Line, box: BBox) -> bool:
    return all(centre_in(w, box, pad=2.0) for w in line.words)
