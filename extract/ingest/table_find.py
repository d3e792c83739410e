"""Where tables set in white space are: between horizontal rules, or below a caption.

* **rules**: two or more full-width horizontal rules with words between them and no vertical
  rules. When the last rule is the one under the header (the table's bottom rule is on the next
  page), the body runs on below it for as long as lines read as table rows.
* **unruled**: no rules; looked for below a "Table N" caption (or, for a table continued from
  the page before, from the top of the page), so body text is never read as a table.

A run of table rows ends at a gap wider than :data:`ROW_GAP_EM` line heights, at a line of prose
(one wide run of text), or at a line that starts left of the table's first column or is set in a
smaller type (a footnote). One-cell lines at the end of the run are footnotes, not rows.
"""

from __future__ import annotations

from collections.abc import Sequence

from extract.ingest.glyphs import Segment
from extract.ingest.sections import caption_label
from extract.ingest.table_text import (
    MAX_GUESSED_HEADER,
    cells_of,
    is_data_line,
    is_prose,
    rows_of,
    table_from_text,
)
from extract.ingest.tables import SNAP, RawTable, words_in
from extract.ingest.words import RawWord

#: A vertical gap wider than this many font sizes ends a table.
ROW_GAP_EM = 2.2
#: Lines of running text skipped right under a caption before a table starts.
MAX_CAPTION_LINES = 2
#: Horizontal rules at least this long (points) can be a table's top, header or bottom rule.
MIN_RULE = 40.0

BBox = tuple[float, float, float, float]


def find_rules_only(
    words: Sequence[RawWord],
    segments: Sequence[Segment],
    page: int,
    *,
    taken: Sequence[BBox] = (),
    limit: float | None = None,
) -> list[RawTable]:
    """Tables set between full-width horizontal rules with no vertical rules.

    Args:
        words: the page's words.
        segments: the page's rules.
        page: the 1-based page number.
        taken: boxes of tables already found (their rules are skipped).
        limit: the y where the page's body ends (the bottom margin), for a table whose body
            runs on below its header rule.
    """
    rules = sorted(
        (s for s in join_collinear(segments) if s.x1 - s.x0 > MIN_RULE),
        key=lambda s: s.top,
    )
    rules = [s for s in rules if not any(_inside(s, box) for box in taken)]
    tables: list[RawTable] = []
    used: set[int] = set()
    for i, first in enumerate(rules):
        if i in used:
            continue
        same = [
            j
            for j, s in enumerate(rules)
            if j >= i and abs(s.x0 - first.x0) <= 6 and abs(s.x1 - first.x1) <= 6
        ]
        if len(same) < 2:
            continue
        # one table: from the first rule to the last matching rule before a wide empty gap
        members = [same[0]]
        for j in same[1:]:
            band = rows_of(
                words_in(words, (first.x0, rules[members[-1]].top, first.x1, rules[j].top))
            )
            if not _table_band(band, first.x1 - first.x0):
                break
            members.append(j)
        if len(members) < 2:
            continue
        used.update(members)
        top, bottom = rules[members[0]].top, rules[members[-1]].top
        inner = [rules[j].top for j in members[1:-1]]
        header_bottom = inner[0] if inner else None
        last_band = rows_of(words_in(words, (first.x0, rules[members[-2]].top, first.x1, bottom)))
        if len(last_band) <= MAX_GUESSED_HEADER and not any(is_data_line(r) for r in last_band):
            # the last rule closes the header: the body runs on below it
            header_bottom = bottom
            below = [
                w
                for w in words
                if w.upright
                and w.top >= bottom - 1
                and w.x0 >= first.x0 - 2
                and w.x1 <= first.x1 + 2
                and (limit is None or w.bottom <= limit)
            ]
            run_bottom = row_run_bottom(rows_of(below), start=bottom, width=first.x1 - first.x0)
            bottom = max(bottom, run_bottom or bottom)
        box = (first.x0, top, first.x1, bottom)
        partial = [
            s
            for s in segments
            if s.horizontal and top < s.top < (header_bottom or bottom) - 1 and s.x1 - s.x0 > 10
        ]
        row_rules = [y for y in inner if header_bottom is not None and y > header_bottom + 1]
        table = table_from_text(
            words,
            box,
            page,
            style="rules",
            header_bottom=header_bottom,
            span_rules=partial,
            row_rules=row_rules,
        )
        if table is not None:
            tables.append(table)
    return tables


def join_collinear(segments: Sequence[Segment]) -> list[Segment]:
    """Horizontal segments on one y that touch or overlap joined into one rule (a rule drawn
    in pieces, one per column)."""
    out: list[Segment] = []
    for seg in sorted((s for s in segments if s.horizontal), key=lambda s: (round(s.top), s.x0)):
        last = out[-1] if out else None
        if last is not None and abs(seg.top - last.top) <= 1 and seg.x0 <= last.x1 + SNAP:
            out[-1] = Segment(last.x0, last.top, max(last.x1, seg.x1), last.bottom)
        else:
            out.append(seg)
    return out


def _table_band(band: Sequence[Sequence[RawWord]], width: float) -> bool:
    """Whether the lines between two rules can be part of a table: some words, no caption
    ("Table 2. ..."), and not running text (a page frame, a boxed panel)."""
    if not band:
        return False
    if any(caption_label(" ".join(w.text for w in line), bold=line[0].bold) for line in band):
        return False
    return sum(is_prose(line, width) and not is_data_line(line) for line in band) * 3 <= len(band)


def _inside(seg: Segment, box: BBox) -> bool:
    return (
        box[0] - SNAP <= seg.x0
        and seg.x1 <= box[2] + SNAP
        and box[1] - SNAP <= seg.top <= box[3] + SNAP
    )


def _run_of_rows(
    lines: Sequence[Sequence[RawWord]], *, start: float, width: float | None = None
) -> list[Sequence[RawWord]]:
    """The lines that read as one table's rows, from the first line below ``start``."""
    taken: list[Sequence[RawWord]] = []
    last_bottom = start
    left: float | None = None
    sizes: list[float] = []
    skipped = 0
    for line in lines:
        size = max(w.size for w in line)
        if line[0].top - last_bottom > ROW_GAP_EM * size:
            break
        if width is not None and is_prose(line, width):
            if taken or skipped >= MAX_CAPTION_LINES:
                break
            skipped += 1  # the rest of a long caption set apart from its first line
            last_bottom = max(w.bottom for w in line)
            continue
        cells = cells_of(line)
        if len(cells) < 2:
            if left is not None and (
                line[0].x0 < left - 2 or size < sorted(sizes)[len(sizes) // 2] - 0.25
            ):
                break  # a footnote: left of the first column, or in smaller type
        else:
            left = line[0].x0 if left is None else min(left, line[0].x0)
            sizes.append(size)
        taken.append(line)
        last_bottom = max(w.bottom for w in line)
    while taken and len(cells_of(taken[-1])) < 2:
        taken.pop()
    if sum(1 for line in taken if len(cells_of(line)) >= 2) < 2:
        return []
    return taken


def row_run_bottom(
    lines: Sequence[Sequence[RawWord]], *, start: float, width: float | None = None
) -> float | None:
    """The bottom of the run of table rows below ``start``, or ``None`` when there is none."""
    run = _run_of_rows(lines, start=start, width=width)
    return max(w.bottom for line in run for w in line) if run else None


def find_unruled(
    words: Sequence[RawWord],
    page: int,
    *,
    caption_bottom: float,
    x0: float,
    x1: float,
    limit: float,
) -> RawTable | None:
    """An unruled table right below a caption (or a page top) that ends at ``caption_bottom``.

    Args:
        words: the page's words.
        page: the 1-based page number.
        caption_bottom: the y where the table may start.
        x0: left edge of the area to search.
        x1: right edge of the area to search.
        limit: the y where the search stops (the next caption or table, or the bottom margin).

    Returns:
        The table, or ``None`` when fewer than two lines below read as table rows.
    """
    region = [
        w
        for w in words
        if w.upright
        and w.top >= caption_bottom - 1
        and w.bottom <= limit
        and w.x0 >= x0 - 2
        and w.x1 <= x1 + 2
    ]
    taken = _run_of_rows(rows_of(region), start=caption_bottom, width=x1 - x0)
    if not taken:
        return None
    flat = [w for line in taken for w in line]
    box = (
        min(w.x0 for w in flat),
        min(w.top for w in flat),
        max(w.x1 for w in flat),
        max(w.bottom for w in flat),
    )
    return table_from_text(flat, box, page, style="unruled", header_bottom=None)
