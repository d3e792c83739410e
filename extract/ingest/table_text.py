"""Grids of tables set in white space: rows from baselines, columns from x-ranges, header rows.

Used for tables with horizontal rules only and for unruled tables (the finders are in
:mod:`extract.ingest.table_find`). Everything here works per word and per line:

* **rows**: words sharing a baseline;
* **cells**: runs of words on a row split at gaps wider than :data:`CELL_GAP_EM` font sizes;
* **columns**: the x-ranges of the body cells merged across rows, so a column is where body
  cells overlap one another, whatever their alignment (left, centred, right);
* **header rows**: header cells stacked in one column at the font's leading are one wrapped cell;
  stacked further apart they are two header rows. A cell set between two header rows spans both;
  an upper header cell spans the columns under a short rule below it, or else the empty upper
  cells to its right whose lower header starts under it or is centred with it. A spanning cell's text is repeated in every
  grid cell it covers.
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass, field

from extract.ingest.glyphs import Segment
from extract.ingest.table_rows import band_of, join_ranges, merge_bands, rule_under
from extract.ingest.tables import RawTable, words_in
from extract.ingest.words import RawWord

#: A gap wider than this many font sizes separates two cells on a row (a word space is ~0.3).
CELL_GAP_EM = 0.45
#: ... and wider than this many times the row's usual word space.
SPACE_FACTOR = 1.6
#: Header lines of one column whose baselines are at most this many font sizes apart are one
#: wrapped cell (a font's leading is ~1.2); further apart they are separate header rows.
STACK_EM = 1.4
#: A run of more than six words wider than this share of the table area is prose, not a cell.
PROSE_SHARE = 0.3
#: Most header lines taken above the first body row when no rule marks the header.
MAX_GUESSED_HEADER = 5
#: Points by which a header cell is widened before it is tested against the header rows.
ROW_SLACK = 1.5

BBox = tuple[float, float, float, float]

_NUMERIC_CELL = re.compile(r"^[<>≤≥~≈]?\s*[-−+–]?\s*\.?\d")


def rows_of(words: Sequence[RawWord]) -> list[list[RawWord]]:
    """Words grouped by baseline, top-down, each row sorted left to right."""
    rows: list[list[RawWord]] = []
    for word in sorted(words, key=lambda w: (w.bottom, w.x0)):
        if rows and abs(word.bottom - rows[-1][-1].bottom) <= max(2.0, 0.4 * word.size):
            rows[-1].append(word)
        else:
            rows.append([word])
    return [sorted(row, key=lambda w: w.x0) for row in rows]


def cells_of(row: Sequence[RawWord]) -> list[list[RawWord]]:
    """A row's words split into cells at gaps wider than a word space.

    A gap splits when it is wider than :data:`CELL_GAP_EM` font sizes and clearly wider
    (:data:`SPACE_FACTOR`) than the row's usual word space, so the stretched but equal spaces
    of a justified line of prose keep it whole.
    """
    gaps = [b.x0 - a.x1 for a, b in zip(row, row[1:], strict=False)]
    size = max(max((w.size for w in row), default=4.0), 4.0)
    spaces = sorted(g for g in gaps if 0 <= g < size)
    space = spaces[len(spaces) // 2] if spaces else 0.0
    threshold = max(CELL_GAP_EM * size, SPACE_FACTOR * space)
    cells: list[list[RawWord]] = [[row[0]]]
    for word, gap in zip(row[1:], gaps, strict=False):
        if gap > threshold:
            cells.append([word])
        else:
            cells[-1].append(word)
    return cells


def cell_text(cell: Sequence[RawWord]) -> str:
    """The words of a cell joined by spaces."""
    return " ".join(w.text for w in cell)


def box_of(words: Sequence[RawWord]) -> BBox:
    """The box around some words."""
    return (
        min(w.x0 for w in words),
        min(w.top for w in words),
        max(w.x1 for w in words),
        max(w.bottom for w in words),
    )


def is_data_line(row: Sequence[RawWord]) -> bool:
    """Whether a line reads as a body row: not bold, and most cells after the first are numbers."""
    bold = sum(len(w.text) for w in row if w.bold)
    if bold * 2 > sum(len(w.text) for w in row):
        return False
    cells = [cell_text(c) for c in cells_of(row)]
    values = cells[1:] if len(cells) > 1 else cells
    return sum(1 for c in values if _NUMERIC_CELL.match(c)) * 2 >= len(values) > 0


def is_prose(line: Sequence[RawWord], width: float) -> bool:
    """Whether a line holds a run of text, not cells: more than six words with no cell gap
    spanning over :data:`PROSE_SHARE` of ``width``."""
    return any(
        len(cell) > 6 and cell[-1].x1 - cell[0].x0 > PROSE_SHARE * width for cell in cells_of(line)
    )


def column_bounds(rows: Sequence[Sequence[Sequence[RawWord]]]) -> list[tuple[float, float]]:
    """Columns as x-ranges, left to right, from rows of cells.

    The rows with the most cells (a count seen on at least two rows, where there are two) fill
    every column: their i-th cells make column i, so a long label that reaches into the range
    of a value on another row does not join two columns. Without such rows, the x-ranges of all
    cells are merged where they overlap.
    """
    counts = [len(cells) for cells in rows]
    repeated = [k for k in set(counts) if counts.count(k) >= 2] if len(rows) > 2 else counts
    k = max(repeated, default=0)
    if k >= 2:
        anchors = [cells for cells in rows if len(cells) == k]
        bounds = [
            (min(w.x0 for c in anchors for w in c[i]), max(w.x1 for c in anchors for w in c[i]))
            for i in range(k)
        ]
        if all(a[0] < b[0] and a[1] < b[1] for a, b in zip(bounds, bounds[1:], strict=False)):
            return bounds
    spans = sorted((min(w.x0 for w in c), max(w.x1 for w in c)) for cells in rows for c in cells)
    merged: list[list[float]] = []
    for x0, x1 in spans:
        if merged and x0 <= merged[-1][1] + 1:
            merged[-1][1] = max(merged[-1][1], x1)
        else:
            merged.append([x0, x1])
    return [(a, b) for a, b in merged]


def _columns_for(x0: float, x1: float, bounds: Sequence[tuple[float, float]]) -> list[int]:
    overlaps = [min(x1, b1) - max(x0, b0) for b0, b1 in bounds]
    best = max(range(len(bounds)), key=lambda i: overlaps[i])
    if overlaps[best] <= 1:
        centre = (x0 + x1) / 2
        return [min(range(len(bounds)), key=lambda i: abs(sum(bounds[i]) / 2 - centre))]
    # a cell reaching a little into the next column (a long label) does not span it
    return [
        i
        for i, (b0, b1) in enumerate(bounds)
        if i == best or overlaps[i] >= min(0.25 * (b1 - b0), 0.5 * (x1 - x0))
    ]


@dataclass
class _HeaderCell:
    """A header cell: one or more stacked lines of one column (or of a spanning cell)."""

    words: list[RawWord]
    cols: list[int]
    ruled: bool = False
    rows: list[int] = field(default_factory=list)

    @property
    def box(self) -> BBox:
        return box_of(self.words)

    @property
    def text(self) -> str:
        return " ".join(cell_text(line) for line in rows_of(self.words))


def _header_cells(
    lines: Sequence[Sequence[RawWord]],
    bounds: Sequence[tuple[float, float]],
    span_rules: Sequence[Segment],
) -> list[_HeaderCell]:
    out: list[_HeaderCell] = []
    for line in lines:
        for cell in cells_of(line):
            x0, _, x1, bottom = box_of(cell)
            size = max(w.size for w in cell)
            cols = _columns_for(x0, x1, bounds)
            ruled = False
            centre = (x0 + x1) / 2
            for rule in span_rules:
                if 0 <= rule.top - bottom <= 8 and rule.x0 - 2 <= centre <= rule.x1 + 2:
                    same_y = [s for s in span_rules if abs(s.top - rule.top) <= 1]
                    r0, r1 = rule_under(x0, x1, same_y) or (rule.x0, rule.x1)
                    under = [i for i, (b0, b1) in enumerate(bounds) if b0 < r1 and b1 > r0]
                    cols, ruled = under or cols, bool(under)
            above = next(
                (
                    h
                    for h in reversed(out)
                    if set(h.cols) == set(cols)
                    and not h.ruled
                    and 0 < bottom - h.box[3] <= STACK_EM * size
                    and h.box[0] < x1
                    and x0 < h.box[2]
                ),
                None,
            )
            if above is not None and not ruled:
                above.words.extend(cell)
            else:
                out.append(_HeaderCell(list(cell), cols, ruled))
    return out


def header_grid(
    lines: Sequence[Sequence[RawWord]],
    bounds: Sequence[tuple[float, float]],
    *,
    span_rules: Sequence[Segment] = (),
) -> tuple[list[tuple[str, ...]], list[tuple[BBox | None, ...]]]:
    """The header rows of a table as grid rows (spanning text repeated) and cell boxes.

    Args:
        lines: the header's words, one list per baseline, top-down.
        bounds: the table's column x-ranges.
        span_rules: short horizontal rules inside the header (a rule under a cell spans it).

    Returns:
        The header rows' texts and boxes, one tuple per row, one entry per column.
    """
    cells = _header_cells(lines, bounds, span_rules)
    if not cells:
        return [], []
    n_cols = len(bounds)
    # the header rows are the stack of the column holding the most separate cells
    stacks = [
        sorted((h for h in cells if c in h.cols), key=lambda h: h.box[1]) for c in range(n_cols)
    ]
    tallest = max(stacks, key=len)
    extents = [(h.box[1], h.box[3]) for h in tallest]
    for cell in cells:
        top, bottom = cell.box[1] - ROW_SLACK, cell.box[3] + ROW_SLACK
        cell.rows = [r for r, (t, b) in enumerate(extents) if top < b and bottom > t]
        if not cell.rows:
            mid = (cell.box[1] + cell.box[3]) / 2
            between = [
                r
                for r in range(len(extents) - 1)
                if extents[r][1] < mid < extents[r + 1][0]
                and not any(o is not cell and set(o.cols) & set(cell.cols) for o in cells)
            ]
            # alone in its column and set in the gap between two rows: it spans both
            cell.rows = (
                [between[0], between[0] + 1]
                if between
                else [min(range(len(extents)), key=lambda r: abs(sum(extents[r]) / 2 - mid))]
            )
    n_rows = len(extents)
    texts: list[list[str]] = [[""] * n_cols for _ in range(n_rows)]
    boxes: list[list[BBox | None]] = [[None] * n_cols for _ in range(n_rows)]
    for cell in cells:
        for r in cell.rows:
            for c in cell.cols:
                texts[r][c] = f"{texts[r][c]} {cell.text}".strip()
                boxes[r][c] = cell.box
    for cell in cells:
        _span_right(cell, texts, boxes, bounds)
    return [tuple(row) for row in texts], [tuple(row) for row in boxes]


def _span_right(
    cell: _HeaderCell,
    texts: list[list[str]],
    boxes: list[list[BBox | None]],
    bounds: Sequence[tuple[float, float]],
) -> None:
    """Spread an upper header cell with no rule under it over the empty cells to its right.

    A column joins the span when its cells in the cell's rows are empty and a lower header row
    labels it. An upper cell that starts at (or left of) the lower label under its own column
    is a group label set left: it spans all such columns. Otherwise it is centred over what it spans: a
    column joins when its lower label starts under the upper cell or the span's centre moves
    closer to the upper cell's centre with it; a lower label that starts right of the upper
    cell, off its centre, starts a new heading ("P value" beside "HR (95% CI)").
    """
    n_rows, n_cols = len(texts), len(bounds)
    last = max(cell.rows)
    if cell.ruled or last >= n_rows - 1 or min(cell.cols) == 0:
        return
    x0, _, x1, _ = cell.box
    centre = (x0 + x1) / 2
    first = min(cell.cols)
    own = [boxes[r][first] for r in range(last + 1, n_rows) if boxes[r][first] is not None]
    flush = bool(own) and x0 <= own[0][0] + 2  # type: ignore[index]
    c = max(cell.cols) + 1
    while c < n_cols and all(not texts[r][c] for r in cell.rows):
        lower = [boxes[r][c] for r in range(last + 1, n_rows) if texts[r][c]]
        if not lower or lower[0] is None:
            return
        before = abs((bounds[first][0] + bounds[c - 1][1]) / 2 - centre)
        after = abs((bounds[first][0] + bounds[c][1]) / 2 - centre)
        if not flush and lower[0][0] >= x1 and after >= before:
            return
        for r in cell.rows:
            texts[r][c], boxes[r][c] = cell.text, cell.box
        c += 1


def table_from_text(
    words: Sequence[RawWord],
    box: BBox,
    page: int,
    *,
    style: str,
    header_bottom: float | None,
    span_rules: Sequence[Segment] = (),
    row_rules: Sequence[float] = (),
) -> RawTable | None:
    """A table grid from the words inside ``box``.

    Args:
        words: the page's words.
        box: the table's region.
        page: the 1-based page number.
        style: ``"rules"`` or ``"unruled"`` (the reader name's suffix).
        header_bottom: the y of the rule under the header, or ``None`` to take the lines
            above the first body row (see :func:`is_data_line`) as the header.
        span_rules: short rules inside the header.
        row_rules: y values of full-width rules between body rows (a label set over several
            lines in one band joins the band's row of values).

    Returns:
        The table, or ``None`` when the region has fewer than two rows or two columns.
    """
    rows = rows_of(words_in(words, box))
    width = box[2] - box[0]
    if len(rows) < 2 or sum(is_prose(r, width) and not is_data_line(r) for r in rows) * 3 > len(
        rows
    ):
        return None  # running text between two rules (a page frame, a boxed panel)
    if header_bottom is not None:
        n_head = sum(1 for row in rows if max(w.bottom for w in row) <= header_bottom + 1)
    else:
        n_head = next((i for i, row in enumerate(rows) if is_data_line(row)), 1)
        if n_head > MAX_GUESSED_HEADER:
            n_head = 1  # no body row where one is expected: take the first line as the header
        n_head = guessed_header_end(rows, n_head)
    head, body = rows[:n_head], rows[n_head:]
    body_cells: list[list[list[RawWord]]] = [list(map(list, cells_of(row))) for row in body]
    if row_rules:
        bands = [band_of(min(w.top for w in row), row_rules) for row in body]
        body_cells = merge_bands(body_cells, bands)
    body_cells = join_ranges(body_cells)
    bounds = column_bounds(body_cells or [cells_of(row) for row in head])
    if len(bounds) < 2:
        return None
    grid, boxes = header_grid(head, bounds, span_rules=span_rules)
    n_header = len(grid)
    numeric = _numeric_columns(body_cells, bounds)
    for cells in body_cells:
        texts = [""] * len(bounds)
        cboxes: list[BBox | None] = [None] * len(bounds)
        for cell in (part for whole in cells for part in split_at_columns(whole, bounds, numeric)):
            cbox = box_of(cell)
            for col in _columns_for(cbox[0], cbox[2], bounds)[:1]:
                texts[col] = f"{texts[col]} {cell_text(cell)}".strip()
                cboxes[col] = cbox
        grid.append(tuple(texts))
        boxes.append(tuple(cboxes))
    grid, boxes = _merge_wrapped_labels(grid, boxes, n_header)
    return RawTable(page, box, tuple(grid), tuple(boxes), n_header, style)


def _is_bold(row: Sequence[RawWord]) -> bool:
    return sum(len(w.text) for w in row if w.bold) * 2 > sum(len(w.text) for w in row)


def guessed_header_end(rows: Sequence[Sequence[RawWord]], n_head: int) -> int:
    """How many of the lines above the first body row are header rows, where no rule says.

    The lines above the first row of numbers are the header, except a labelled row of numbers
    (a totals row set in bold like the header) and body rows that hold no number: where the header is set in bold, the plain lines under it are body rows (a text
    value such as "Reference", a group name); otherwise a lone label set at the left edge of
    the body's labels right above the first row of numbers is a group name.

    Args:
        rows: the table's lines, top-down.
        n_head: the index of the first line read as a body row (see :func:`is_data_line`).

    Returns:
        The number of header rows (at least one).
    """
    if n_head <= 1:
        return n_head
    # a labelled row of numbers under the header is a body row, bold or not (a totals row);
    # its label starts at (or left of) the body's labels
    edge = min((row[0].x0 for row in rows[n_head:]), default=rows[0][0].x0) + 2
    n_head = next(
        (i for i in range(1, n_head) if rows[i][0].x0 <= edge and _labelled_numbers(rows[i])),
        n_head,
    )
    bold = [_is_bold(row) for row in rows[:n_head]]
    if bold[0] and not all(bold):
        last = max(i for i, b in enumerate(bold) if b)
        return last + 1
    if any(bold) or n_head >= len(rows):
        return n_head
    left = min(row[0].x0 for row in rows[n_head:])
    while (
        n_head > 1 and len(cells_of(rows[n_head - 1])) == 1 and rows[n_head - 1][0].x0 <= left + 2
    ):
        n_head -= 1
    return n_head


_YEAR = re.compile(r"^(19|20)\d\d$")


def _labelled_numbers(row: Sequence[RawWord]) -> bool:
    """Whether a line is a label followed by two or more values that are all numbers and not
    all years (a row of years under a header is a header level: common practice)."""
    cells = [cell_text(c) for c in cells_of(row)]
    values = cells[1:]
    return (
        len(values) >= 2
        and not _NUMERIC_CELL.match(cells[0])
        and all(_NUMERIC_CELL.match(v) for v in values)
        and not all(_YEAR.match(v) for v in values)
    )


def _numeric_columns(
    body_cells: Sequence[Sequence[Sequence[RawWord]]], bounds: Sequence[tuple[float, float]]
) -> list[bool]:
    """Per column, whether most body cells that lie inside its x-range are numbers."""
    counts = [[0, 0] for _ in bounds]
    for cells in body_cells:
        for cell in cells:
            x0, _, x1, _ = box_of(cell)
            for i, (b0, b1) in enumerate(bounds):
                if x0 >= b0 - 1 and x1 <= b1 + 1:
                    counts[i][0] += bool(_NUMERIC_CELL.match(cell_text(cell)))
                    counts[i][1] += 1
    return [total > 0 and 2 * hits > total for hits, total in counts]


def split_at_columns(
    cell: Sequence[RawWord], bounds: Sequence[tuple[float, float]], numeric: Sequence[bool]
) -> list[Sequence[RawWord]]:
    """A cell split where it runs across a column boundary the other rows set.

    A row label set as close to its value as a word space reads as one cell with it. When the
    cell's last words lie inside a later column's x-range, read as a number as that column's
    other cells do, and the words before them end left of that column, they are that column's
    value.

    Args:
        cell: the words of one cell, left to right.
        bounds: the table's column x-ranges (from the rows with the most cells).
        numeric: per column, whether its cells are numbers.

    Returns:
        The cell's parts, left to right (the cell itself when it keeps to one column).
    """
    if len(cell) < 2:
        return [cell]
    for split in range(1, len(cell)):
        left, right = cell[:split], cell[split:]
        rx0, rx1 = right[0].x0, max(w.x1 for w in right)
        for i, (b0, b1) in enumerate(bounds):
            if i == 0 or not numeric[i] or not (b0 - 1 <= rx0 and rx1 <= b1 + 1):
                continue
            if max(w.x1 for w in left) < b0 and _NUMERIC_CELL.match(cell_text(right)):
                return [*split_at_columns(left, bounds, numeric), right]
    return [cell]


def _merge_wrapped_labels(
    grid: list[tuple[str, ...]],
    boxes: list[tuple[BBox | None, ...]],
    n_header: int,
) -> tuple[list[tuple[str, ...]], list[tuple[BBox | None, ...]]]:
    """Join a body row that holds only a label to the next row when that row has no label."""
    out: list[tuple[str, ...]] = list(grid[:n_header])
    out_boxes = list(boxes[:n_header])
    i = n_header
    while i < len(grid):
        row = grid[i]
        if (
            i + 1 < len(grid)
            and row[0]
            and not any(row[1:])
            and not grid[i + 1][0]
            and any(grid[i + 1][1:])
        ):
            out.append((row[0],) + grid[i + 1][1:])
            out_boxes.append((boxes[i][0],) + boxes[i + 1][1:])
            i += 2
            continue
        out.append(row)
        out_boxes.append(boxes[i])
        i += 1
    return out, out_boxes
