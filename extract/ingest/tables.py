"""Tables from page geometry: the raw table record, ruled grids, and units in labels.

* **ruled**: horizontal and vertical rules that meet make a grid; a cell with no rule between it
  and its neighbour spans both, and its text is repeated in every grid column it covers.

Tables with horizontal rules only and unruled tables are found by
:mod:`extract.ingest.table_find` and read by :mod:`extract.ingest.table_text`. Units are taken
from column headers and row labels ("Body mass (g)", "Glucose, mmol/L").
"""

from __future__ import annotations

import re
from collections.abc import Sequence
from dataclasses import dataclass

from extract.ingest.document import TableCell
from extract.ingest.glyphs import Segment
from extract.ingest.words import RawWord

#: Points within which two rules or coordinates count as the same.
SNAP = 3.0

_UNIT_CHARS = re.compile(r"^[%A-Za-zµμ°Ω/·\^\-−0-9.×\s²³⁻¹]+$")
_TRAILING_PAREN = re.compile(r"\(([^()]{1,20})\)\s*$")
_TRAILING_BRACKET = re.compile(r"\[([^\[\]]{1,20})\]\s*$")
_TRAILING_COMMA = re.compile(r",\s*([^,]{1,15})$")
#: A statistic named after the unit ("Age (years), mean (SD)", "SBP (mmHg), mean [95% CI]").
_STATISTIC_TAIL = re.compile(
    r",\s*(mean|median|n|no\.|count|geometric mean)\b[^,]*$", re.IGNORECASE
)
_NOT_UNITS = {"n", "no", "yes", "mean", "sd", "sem", "se", "median", "iqr", "range", "ci", "all"}


@dataclass(frozen=True)
class RawTable:
    """A table found on one page, before captions are linked and pages merged."""

    page: int
    bbox: tuple[float, float, float, float]
    rows: tuple[tuple[str, ...], ...]
    boxes: tuple[tuple[tuple[float, float, float, float] | None, ...], ...]
    header_rows: int
    style: str
    continued: bool = False


def unit_of(label: str) -> str | None:
    """The unit written at the end of a header or row label, or ``None``.

    >>> unit_of("Body mass (g)"), unit_of("Glucose, mmol/L"), unit_of("Vehicle (n = 9)")
    ('g', 'mmol/L', None)
    >>> unit_of("Age (years), mean (SD)"), unit_of("Change in score, mean [95% CI]")
    ('years', None)
    """
    text = _STATISTIC_TAIL.sub("", " ".join(label.split()))
    for pattern in (_TRAILING_PAREN, _TRAILING_BRACKET, _TRAILING_COMMA):
        match = pattern.search(text)
        if match and _looks_like_unit(match.group(1)):
            return match.group(1).strip()
    return None


def _looks_like_unit(text: str) -> bool:
    text = text.strip()
    if not text or "=" in text or len(text) > 15 or not _UNIT_CHARS.match(text):
        return False
    if text.lower() in _NOT_UNITS or text.replace(".", "").isdigit():
        return False
    if len(text.split()) > 2:
        return False
    return any(ch.isalpha() or ch in "%°" for ch in text)


def _cluster(values: Sequence[float], tol: float = SNAP) -> list[float]:
    out: list[list[float]] = []
    for value in sorted(values):
        if out and value - out[-1][-1] <= tol:
            out[-1].append(value)
        else:
            out.append([value])
    return [sum(group) / len(group) for group in out]


def words_in(words: Sequence[RawWord], box: tuple[float, float, float, float]) -> list[RawWord]:
    """The words whose centre lies inside ``box``."""
    x0, top, x1, bottom = box
    return [
        w
        for w in words
        if x0 <= (w.x0 + w.x1) / 2 <= x1 and top <= (w.top + w.bottom) / 2 <= bottom
    ]


def _text_of(words: Sequence[RawWord]) -> str:
    if not words:
        return ""
    ordered = sorted(words, key=lambda w: (round(w.bottom), w.x0))
    lines: list[list[RawWord]] = []
    for word in ordered:
        if lines and abs(word.bottom - lines[-1][-1].bottom) <= 2.5:
            lines[-1].append(word)
        else:
            lines.append([word])
    return " ".join(" ".join(w.text for w in sorted(ln, key=lambda w: w.x0)) for ln in lines)


# ---------------------------------------------------------------- ruled grids


def find_ruled(words: Sequence[RawWord], segments: Sequence[Segment], page: int) -> list[RawTable]:
    """Grid tables drawn with horizontal and vertical rules."""
    horizontal = [s for s in segments if s.horizontal and s.x1 - s.x0 > SNAP]
    vertical = [s for s in segments if not s.horizontal and s.bottom - s.top > SNAP]
    tables: list[RawTable] = []
    for group_h, group_v in _connected(horizontal, vertical):
        xs = _cluster([s.x0 for s in group_v])
        ys = _cluster([s.top for s in group_h])
        if len(xs) < 3 or len(ys) < 2:
            continue  # a frame of outer rules only: its rules are read as a rules-only table
        tables.append(_grid_table(words, group_h, group_v, xs, ys, page))
    return tables


def _connected(
    horizontal: list[Segment], vertical: list[Segment]
) -> list[tuple[list[Segment], list[Segment]]]:
    """Groups of horizontal and vertical segments that touch one another."""
    items = [("h", s) for s in horizontal] + [("v", s) for s in vertical]
    parent = list(range(len(items)))

    def find(i: int) -> int:
        while parent[i] != i:
            parent[i] = parent[parent[i]]
            i = parent[i]
        return i

    for i, (ki, a) in enumerate(items):
        if ki != "h":
            continue
        for j, (kj, b) in enumerate(items):
            if kj != "v":
                continue
            if a.x0 - SNAP <= b.x0 <= a.x1 + SNAP and b.top - SNAP <= a.top <= b.bottom + SNAP:
                parent[find(i)] = find(j)
    groups: dict[int, tuple[list[Segment], list[Segment]]] = {}
    for i, (kind, seg) in enumerate(items):
        h, v = groups.setdefault(find(i), ([], []))
        (h if kind == "h" else v).append(seg)
    return [g for g in groups.values() if g[0] and g[1]]


def _has_vertical(vertical: list[Segment], x: float, top: float, bottom: float) -> bool:
    mid = (top + bottom) / 2
    return any(abs(s.x0 - x) <= SNAP and s.top - SNAP <= mid <= s.bottom + SNAP for s in vertical)


def _has_horizontal(horizontal: list[Segment], y: float, x0: float, x1: float) -> bool:
    mid = (x0 + x1) / 2
    return any(abs(s.top - y) <= SNAP and s.x0 - SNAP <= mid <= s.x1 + SNAP for s in horizontal)


def _grid_table(
    words: Sequence[RawWord],
    horizontal: list[Segment],
    vertical: list[Segment],
    xs: list[float],
    ys: list[float],
    page: int,
) -> RawTable:
    n_rows, n_cols = len(ys) - 1, len(xs) - 1
    # owner[r][c] = (r0, c0) of the merged cell covering (r, c)
    owner: list[list[tuple[int, int]]] = [[(r, c) for c in range(n_cols)] for r in range(n_rows)]
    for r in range(n_rows):
        for c in range(n_cols):
            if c > 0 and not _has_vertical(vertical, xs[c], ys[r], ys[r + 1]):
                owner[r][c] = owner[r][c - 1]
            elif r > 0 and not _has_horizontal(horizontal, ys[r], xs[c], xs[c + 1]):
                owner[r][c] = owner[r - 1][c]
    spans: dict[tuple[int, int], list[tuple[int, int]]] = {}
    for r in range(n_rows):
        for c in range(n_cols):
            spans.setdefault(owner[r][c], []).append((r, c))
    texts: dict[tuple[int, int], str] = {}
    boxes: dict[tuple[int, int], tuple[float, float, float, float]] = {}
    for key, members in spans.items():
        r0 = min(m[0] for m in members)
        r1 = max(m[0] for m in members)
        c0 = min(m[1] for m in members)
        c1 = max(m[1] for m in members)
        box = (xs[c0], ys[r0], xs[c1 + 1], ys[r1 + 1])
        boxes[key] = box
        texts[key] = _text_of(words_in(words, box))
    rows = tuple(tuple(texts[owner[r][c]] for c in range(n_cols)) for r in range(n_rows))
    cell_boxes = tuple(tuple(boxes[owner[r][c]] for c in range(n_cols)) for r in range(n_rows))
    header = _header_rows_from_spans(owner, n_rows, n_cols, rows)
    return RawTable(page, (xs[0], ys[0], xs[-1], ys[-1]), rows, cell_boxes, header, "ruled")


def _header_rows_from_spans(
    owner: list[list[tuple[int, int]]], n_rows: int, n_cols: int, rows: tuple[tuple[str, ...], ...]
) -> int:
    """Header rows: the first row, plus following rows while a row above spans columns."""
    header = 1
    for r in range(n_rows - 1):
        spans_cols = any(owner[r][c] == owner[r][c - 1] for c in range(1, n_cols))
        spans_rows = any(owner[r + 1][c] == owner[r][c] for c in range(n_cols))
        if (spans_cols or spans_rows) and r + 1 < n_rows - 1 and r + 1 == header:
            if not _is_data_row(rows[r + 1]):
                header = r + 2
    return header


#: A value cell opens with its number ("310.2 ± 18.0", "42 (37.5%)", "−0.8", "<0.001"); a group
#: label may hold a number inside it ("OVZ 1 mg/kg") and is still a label.
_NUMERIC = re.compile(r"^\s*[<>≤≥~]?\s*[-−+]?\.?\d")


def _is_data_row(row: Sequence[str]) -> bool:
    cells = [c for c in row[1:] if c.strip()]
    return bool(cells) and sum(1 for c in cells if _NUMERIC.match(c)) * 2 >= len(cells)


def raw_to_cells(table: RawTable) -> tuple[TableCell, ...]:
    """The full grid of a raw table as Document cells."""
    return tuple(
        TableCell(r, c, text, table.boxes[r][c] if table.boxes else None, table.page)
        for r, row in enumerate(table.rows)
        for c, text in enumerate(row)
    )
