"""Page layout: words to lines, margins left out, columns split by geometry, lines to blocks.

A *line* here is a run of words on one baseline with no wide gap inside, so two columns give two
lines side by side. Columns are found per page: the gutter is the vertical strip near the middle
that the most lines keep clear of; lines that cross it are full width. Reading order walks the
page top-down in bands: a full-width line is read where it stands, and a run of column lines
between two full-width lines is read left column first, then right.
"""

from __future__ import annotations

import bisect
import re
from collections.abc import Sequence
from dataclasses import dataclass
from functools import cached_property

from extract.ingest.sections import caption_label
from extract.ingest.tables import RawTable
from extract.ingest.words import RawWord

#: A gap wider than this many font sizes splits a line into two (column gutter, table cell).
LINE_GAP_EM = 1.5
#: ... unless a neighbouring gap is as wide within this many font sizes (justified text).
JUSTIFIED_SLACK_EM = 0.05
#: Share of the page height at top and bottom where running headers and footers live.
MARGIN_SHARE = 0.09
#: Shortest line (share of the page width) that counts as a line of a text column.
MIN_COLUMN_SHARE = 0.2
#: Lines needed on each side of a gutter before a page counts as two-column.
MIN_COLUMN_LINES = 4

_NUMBER = re.compile(r"^\d{1,4}$")
_PAGE_NUMBER = re.compile(r"^(page\s*)?\d{1,4}(\s*(of|/)\s*\d{1,4})?$", re.IGNORECASE)


@dataclass(frozen=True)
class Line:
    """Words on one baseline with no wide gap, in page space."""

    words: tuple[RawWord, ...]
    page: int

    @cached_property
    def text(self) -> str:
        """The words joined by single spaces."""
        return " ".join(w.text for w in self.words)

    @cached_property
    def x0(self) -> float:
        """Left edge."""
        return self.words[0].x0

    @cached_property
    def x1(self) -> float:
        """Right edge."""
        return max(w.x1 for w in self.words)

    @cached_property
    def top(self) -> float:
        """Top edge."""
        return min(w.top for w in self.words)

    @cached_property
    def bottom(self) -> float:
        """Bottom edge."""
        return max(w.bottom for w in self.words)

    @cached_property
    def size(self) -> float:
        """The most common font size of its words."""
        sizes = [round(w.size, 1) for w in self.words]
        return max(set(sizes), key=sizes.count)

    @cached_property
    def bold(self) -> bool:
        """Whether most of its characters are bold."""
        bold = sum(len(w.text) for w in self.words if w.bold)
        return bold * 2 > sum(len(w.text) for w in self.words)


def starts_caption(line: Line) -> bool:
    """Whether the line opens a table or figure caption (label in bold or set off)."""
    return caption_label(line.text, bold=line.words[0].bold) is not None


def words_to_lines(words: Sequence[RawWord], page: int) -> list[Line]:
    """Lines from words (upright words only), split at gaps wider than :data:`LINE_GAP_EM`.

    Args:
        words: the page's words.
        page: the 1-based page number.

    Returns:
        Lines sorted top-down, left to right.
    """
    upright = sorted((w for w in words if w.upright), key=lambda w: (w.bottom, w.x0))
    rows: list[list[RawWord]] = []
    for word in upright:
        if rows:
            last = rows[-1]
            ref = last[-1]
            tolerance = max(2.0, 0.45 * min(ref.size or 10.0, word.size or 10.0))
            if abs(word.bottom - ref.bottom) <= tolerance or (
                word.top >= ref.top - 1 and word.bottom <= ref.bottom + 1
            ):
                last.append(word)
                continue
        rows.append([word])
    lines: list[Line] = []
    for row in rows:
        row.sort(key=lambda w: w.x0)
        gaps = [b.x0 - a.x1 for a, b in zip(row, row[1:], strict=False)]
        current = [row[0]]
        for i, word in enumerate(row[1:]):
            prev = current[-1]
            size = max(prev.size, word.size, 4.0)
            gap = gaps[i]
            # a justified line spreads its words with equal wide gaps: a wide gap equal to a
            # neighbouring one is word spacing, not a column or cell boundary
            near = gaps[max(i - 1, 0) : i] + gaps[i + 1 : i + 2]
            justified = any(abs(g - gap) <= JUSTIFIED_SLACK_EM * size for g in near)
            if gap > LINE_GAP_EM * size and not justified:
                lines.append(Line(tuple(current), page))
                current = [word]
            else:
                current.append(word)
        lines.append(Line(tuple(current), page))
    lines.sort(key=lambda ln: (round(ln.top), ln.x0))
    return lines


def split_at_gutter(lines: Sequence[Line], gutter: float) -> list[Line]:
    """Lines of a two-column page regrouped at ``gutter``: one line per column and baseline.

    Justified column text can leave word gaps as wide as the gutter, so a column line may have
    been split at them, or joined to the other column's line through the gutter. Words on one
    baseline are put back together on each side of the gutter; a row with a word across the
    gutter stays whole (a full-width line).
    """
    out: list[Line] = []
    rows: list[list[Line]] = []
    for line in sorted(lines, key=lambda ln: (ln.bottom, ln.x0)):
        if rows and abs(line.bottom - rows[-1][-1].bottom) <= 1.0:
            rows[-1].append(line)
        else:
            rows.append([line])
    for row in rows:
        words = sorted((w for ln in row for w in ln.words), key=lambda w: w.x0)
        page = row[0].page
        left = tuple(w for w in words if w.x1 <= gutter)
        right = tuple(w for w in words if w.x0 >= gutter)
        if len(left) + len(right) < len(words) or (
            left and right and right[0].x0 - left[-1].x1 < max(left[-1].size, 4.0)
        ):
            out.extend(row)  # a word across the gutter, or only a word space there
            continue
        out.extend(Line(part, page) for part in (left, right) if part)
    out.sort(key=lambda ln: (round(ln.top), ln.x0))
    return out


def drop_line_numbers(words: list[RawWord]) -> list[RawWord]:
    """Words without margin line numbers: five or more bare numbers aligned in a column left
    of (or right of) nearly all other text, or three or more there that count up by one."""
    numbers = [w for w in words if _NUMBER.match(w.text)]
    others = sorted(w.x0 for w in words if not _NUMBER.match(w.text))
    if len(numbers) < 3 or len(others) < 20:
        return words
    left = others[len(others) // 50]
    right = sorted(w.x1 for w in words if not _NUMBER.match(w.text))[-(len(others) // 50) - 1]
    margin = [w for w in numbers if w.x1 < left - 2 or w.x0 > right + 2]
    if len(margin) < 5 and not _counts_down(margin):
        return words
    drop = {id(w) for w in margin}
    return [w for w in words if id(w) not in drop]


def _counts_down(numbers: list[RawWord]) -> bool:
    """Whether three or more margin numbers count up by one, top-down, in one aligned column:
    line numbering on a page where a table leaves only a few numbered lines."""
    if len(numbers) < 3:
        return False
    ordered = sorted(numbers, key=lambda w: w.top)
    aligned = max(w.x1 for w in ordered) - min(w.x1 for w in ordered) <= 3
    values = [int(w.text) for w in ordered]
    return aligned and all(b - a == 1 for a, b in zip(values, values[1:], strict=False))


def margin_key(line: Line, height: float) -> str | None:
    """A key for a line in the top or bottom margin (digits folded), else ``None``."""
    if height * MARGIN_SHARE < line.top < height * (1 - MARGIN_SHARE):
        return None
    zone = "top" if line.top <= height * MARGIN_SHARE else "bottom"
    return zone + ":" + re.sub(r"\d+", "#", line.text.lower()).strip()


def is_page_number(line: Line) -> bool:
    """Whether the line is only a page number ("7", "Page 7 of 12")."""
    return bool(_PAGE_NUMBER.match(line.text.strip()))


def find_gutter(lines: Sequence[Line], width: float) -> float | None:
    """The x of a two-column gutter, or ``None`` for a one-column page."""
    spans = [(ln.x0, ln.x1) for ln in lines]
    # a text column's lines are most of its width; short runs (table cells) are no evidence
    narrow = [(a, b) for a, b in spans if MIN_COLUMN_SHARE * width <= b - a < 0.55 * width]
    if len(narrow) < 2 * MIN_COLUMN_LINES:
        return None
    best: tuple[int, float] | None = None
    narrow_ends = sorted(b for _, b in narrow)
    narrow_starts = sorted(a for a, _ in narrow)
    starts = sorted(a for a, _ in spans)
    ends = sorted(b for _, b in spans)
    x = 0.3 * width
    while x <= 0.7 * width:
        left = bisect.bisect_right(narrow_ends, x)
        right = len(narrow_starts) - bisect.bisect_left(narrow_starts, x)
        if left >= MIN_COLUMN_LINES and right >= MIN_COLUMN_LINES:
            # spans with a < x < b: those starting left of x less those ending at or before it
            crossing = bisect.bisect_left(starts, x) - bisect.bisect_right(ends, x)
            score = min(left, right) * 2 - crossing * 3
            if crossing <= 0.4 * (left + right) and (best is None or score > best[0]):
                best = (score, x)
        x += 2.0
    if best is None or best[0] <= 0:
        return None
    return best[1]


def reading_order(lines: Sequence[Line], gutter: float | None) -> list[tuple[Line, int]]:
    """Lines in reading order with their column (0 full width or single, 1 left, 2 right)."""
    ordered = sorted(lines, key=lambda ln: (ln.top, ln.x0))
    if gutter is None:
        return [(ln, 0) for ln in ordered]
    out: list[tuple[Line, int]] = []
    left: list[Line] = []
    right: list[Line] = []

    def flush() -> None:
        out.extend((ln, 1) for ln in left)
        out.extend((ln, 2) for ln in right)
        left.clear()
        right.clear()

    rights = [ln for ln in ordered if ln.x0 >= gutter]

    def alone(line: Line) -> bool:
        # a left line with no right-column text beside it spans the page (a short last line of
        # a full-width paragraph, a caption under both columns)
        reach = 2.5 * max(line.size, 4.0)
        return not any(r.bottom > line.top - reach and r.top < line.bottom + reach for r in rights)

    last_full: Line | None = None
    for line in ordered:
        tail = (
            last_full is not None
            and not left
            and not right
            and abs(line.x0 - last_full.x0) <= 2
            and 0 <= line.top - last_full.bottom < 0.6 * max(line.size, 4.0)
        )
        caption = starts_caption(line) and alone(line)
        if line.x0 < gutter < line.x1 or (line.x1 <= gutter and (tail or caption)):
            last_full = line
            flush()
            out.append((line, 0))
        elif line.x1 <= gutter:
            left.append(line)
        else:
            right.append(line)
    flush()
    return out


@dataclass(frozen=True)
class RawBlock:
    """A run of lines read as one paragraph, before sections are assigned."""

    lines: tuple[Line, ...]
    column: int

    @property
    def page(self) -> int:
        """The page the block starts on."""
        return self.lines[0].page

    @property
    def text(self) -> str:
        """Line texts joined; a hyphen that splits a lower-case word across lines is removed."""
        out = ""
        for line in self.lines:
            text = line.text
            if not out:
                out = text
            elif re.search(r"[a-z]-$", out) and re.match(r"[a-z]", text):
                out = out[:-1] + text
            else:
                out = out + " " + text
        return out

    @property
    def bbox(self) -> tuple[float, float, float, float]:
        """The box around all its lines."""
        return (
            min(ln.x0 for ln in self.lines),
            min(ln.top for ln in self.lines),
            max(ln.x1 for ln in self.lines),
            max(ln.bottom for ln in self.lines),
        )

    @property
    def size(self) -> float:
        """The font size of its first line."""
        return self.lines[0].size

    @property
    def bold(self) -> bool:
        """Whether its first line is bold."""
        return self.lines[0].bold


def lines_to_blocks(ordered: Sequence[tuple[Line, int]], *, body_size: float) -> list[RawBlock]:
    """Group ordered lines into paragraph blocks.

    A new block starts at a change of column, a vertical gap clearly wider than the line
    spacing, a change of font size or weight, an indented first line, or a caption start.
    """
    blocks: list[RawBlock] = []
    current: list[Line] = []
    column = 0
    for line, col in ordered:
        if current and not _continues(current, line, col == column, body_size):
            blocks.append(RawBlock(tuple(current), column))
            current = []
        if not current:
            column = col
        current.append(line)
    if current:
        blocks.append(RawBlock(tuple(current), column))
    return blocks


def _continues(current: list[Line], line: Line, same_column: bool, body_size: float) -> bool:
    prev = current[-1]
    if not same_column or line.page != prev.page:
        return False
    if starts_caption(line) or prev.bold != line.bold:
        return False
    if abs(line.size - prev.size) > 0.6:
        return False
    gap = line.top - prev.bottom
    size = max(prev.size, 4.0)
    if len(current) >= 2:
        usual = current[-1].top - current[-2].bottom
        if gap > usual + 0.35 * size:
            return False
    elif gap > 0.6 * size:
        return False
    if gap < -0.5 * size:
        return False
    # a first line indented against the block's left edge starts a paragraph
    left = min(ln.x0 for ln in current)
    if line.x0 - left > 1.2 * size and line.x1 - line.x0 > 0:
        return False
    return not (prev.x0 - line.x0 > 3 * size)


@dataclass
class PageData:
    """One page while a PDF is read: its words, text lines (tables' words left out), tables
    found so far, and the running-header text taken out of its margins."""

    number: int
    width: float
    height: float
    words: list[RawWord]
    lines: list[Line]
    tables: list[RawTable]
    has_text: bool
    columns: int = 1
    margin_text: tuple[str, ...] = ()
