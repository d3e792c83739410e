"""Row-level fixes for tables set in white space: value ranges, banded rows, header rules.

* **value ranges**: a range written with a spaced hyphen or dash ("5,0 - 8,5") reads as three
  cells; it is one cell when the dash's x-range holds nothing but dashes on every body row (a
  dash that marks a missing value sits in a column whose other rows hold values).
* **banded rows**: where rules are drawn between body rows, a row label set over several
  centred lines beside one line of values is one row: the one-cell lines of a band join the
  band's single line of cells.
* **header rules drawn in pieces**: a rule under a header cell drawn as one piece per column
  (pieces that touch) is cut to the run of pieces centred on the cell, so two group labels
  whose rules meet do not both span the whole width.
"""

from __future__ import annotations

import re
from collections.abc import Sequence

from extract.ingest.glyphs import Segment
from extract.ingest.words import RawWord

BBox = tuple[float, float, float, float]

_DASH = re.compile(r"^[-–—−]$")
_NUMBER = re.compile(r"^[<>≤≥]?\s*[-−+–]?\s*\.?\d[\d.,]*\*?$")


def _text(cell: Sequence[RawWord]) -> str:
    return " ".join(w.text for w in cell)


def join_ranges(body: Sequence[Sequence[Sequence[RawWord]]]) -> list[list[list[RawWord]]]:
    """Body rows of cells with spaced value ranges ("5,0 - 8,5") joined into one cell.

    A lone dash cell between two number cells is a range's dash when no body row holds
    anything but a dash (or nothing) across the dash's x-range: the column structure of
    the other rows says it is no column of its own.
    """
    rows = [[list(c) for c in cells] for cells in body]
    spans = [  # one-cell lines (labels, group names) say nothing about columns
        (c[0].x0, c[-1].x1, bool(_DASH.match(_text(c))))
        for cells in rows
        if len(cells) > 1
        for c in cells
    ]
    out: list[list[list[RawWord]]] = []
    for cells in rows:
        joined: list[list[RawWord]] = []
        i = 0
        while i < len(cells):
            cell = cells[i]
            if (
                joined
                and i + 1 < len(cells)
                and _DASH.match(_text(cell))
                and _NUMBER.match(_text(joined[-1]))
                and _NUMBER.match(_text(cells[i + 1]))
                and not any(
                    not dash and x0 < cell[-1].x1 and cell[0].x0 < x1 for x0, x1, dash in spans
                )
            ):
                joined[-1] = joined[-1] + cell + cells[i + 1]
                i += 2
                continue
            joined.append(cell)
            i += 1
        out.append(joined)
    return out


def band_of(top: float, row_rules: Sequence[float]) -> int:
    """How many of ``row_rules`` (y values) lie above ``top``."""
    return sum(1 for y in row_rules if y < top)


def merge_bands(
    body: Sequence[Sequence[Sequence[RawWord]]], bands: Sequence[int]
) -> list[list[list[RawWord]]]:
    """Body lines of one band between two row rules joined into one row when the band holds
    one line of several cells and otherwise only one-cell lines (a label set over several
    centred lines beside its values).

    Each one-cell line joins the cell of the band's row it lies over (x-ranges overlap), its
    words kept top-down, or becomes a cell of its own where it overlaps none. A band whose
    one-cell lines overlap two cells is left as it is.

    Args:
        body: the body lines, top-down, each as its cells.
        bands: per body line, its band (see :func:`band_of`).
    """
    out: list[list[list[RawWord]]] = []
    start = 0
    while start < len(body):
        end = start
        while end + 1 < len(body) and bands[end + 1] == bands[start]:
            end += 1
        members = [list(map(list, body[i])) for i in range(start, end + 1)]
        start = end + 1
        multi = [k for k, cells in enumerate(members) if len(cells) > 1]
        joined = _join_band(members, multi[0]) if len(members) > 1 and len(multi) == 1 else None
        if joined is None:
            out.extend(members)
        else:
            out.append(joined)
    return out


def _join_band(members: list[list[list[RawWord]]], row: int) -> list[list[RawWord]] | None:
    cells = [list(c) for c in members[row]]
    for k, line in enumerate(members):
        if k == row:
            continue
        piece = line[0]
        x0, x1 = piece[0].x0, piece[-1].x1
        hits = [i for i, c in enumerate(cells) if c[0].x0 < x1 and x0 < c[-1].x1]
        if len(hits) > 1:
            return None
        if hits:
            cells[hits[0]] = piece + cells[hits[0]] if k < row else cells[hits[0]] + piece
        else:
            cells.append(piece)
    return sorted(cells, key=lambda c: min(w.x0 for w in c))


def rule_under(x0: float, x1: float, pieces: Sequence[Segment]) -> tuple[float, float] | None:
    """The x-range of the rule under a header cell from ``x0`` to ``x1``, from the touching
    pieces of one y: the run of pieces that covers the cell and is best centred on it."""
    pieces = sorted(pieces, key=lambda s: s.x0)
    centre = (x0 + x1) / 2
    best: tuple[float, float] | None = None
    found: tuple[float, float] | None = None
    for i, first in enumerate(pieces):
        if first.x0 > x0 + 2:
            break
        for j in range(i, len(pieces)):
            if j > i and pieces[j].x0 > pieces[j - 1].x1 + 1:
                break
            a, b = first.x0, pieces[j].x1
            if b < x1 - 2:
                continue
            score = (abs((a + b) / 2 - centre), b - a)
            if best is None or score < best:
                best, found = score, (a, b)
    return found
