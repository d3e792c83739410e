"""Finding a proposal's source in its Document and marking it, apart from any widget.

Text sources are shown as the paragraph with the quoted sentence highlighted and the value marked
inside it; table sources as the table's grid with the cell marked and its row label and column
headers emphasised. Everything here is a pure function of a Document and a proposal's Source.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from rich.text import Text

from extract.ingest.document import Block, Document, Table
from extract.records.proposal import Proposal, Source

#: Style of the sentence a text proposal was read from.
SENTENCE_STYLE = "on #23324a"
#: Style of the value inside that sentence, and of a table's source cell.
VALUE_STYLE = "bold black on #e8c547"
#: Style of the sentence the curator has moved to (for adding a missed data point).
PICKED_STYLE = "underline"
#: Style of a table's row label and column headers on the source cell's row and column.
HEADER_STYLE = "bold #7fc8f8"

_SENTENCE_END = re.compile(r"(?<=[.!?])\s+(?=[A-Z(\[])")
_SPACES = re.compile(r"\s+")


@dataclass(frozen=True)
class TextLocation:
    """Where a text proposal sits: its block, the sentence's span and the value's span."""

    block: Block
    sentence: tuple[int, int] | None
    value: tuple[int, int] | None


class SourceNotFound(LookupError):
    """A proposal's source cannot be found in its Document (a bad proposal)."""


def split_sentences(text: str) -> list[tuple[int, int]]:
    """Character spans of the sentences of a paragraph (a plain rule: end mark, space, capital)."""
    spans: list[tuple[int, int]] = []
    start = 0
    for match in _SENTENCE_END.finditer(text):
        spans.append((start, match.start()))
        start = match.end()
    if start < len(text):
        spans.append((start, len(text)))
    return [(a, b) for a, b in spans if text[a:b].strip()]


def _squash(text: str) -> str:
    return _SPACES.sub(" ", text).strip()


def _find_loose(haystack: str, needle: str) -> tuple[int, int] | None:
    """Span of ``needle`` in ``haystack`` where runs of white space may differ."""
    needle = _squash(needle)
    if not needle:
        return None
    pattern = r"\s+".join(re.escape(part) for part in needle.split(" "))
    match = re.search(pattern, haystack)
    return (match.start(), match.end()) if match else None


def number_spellings(value: float) -> list[str]:
    """Ways a number may be printed: "24.1", "24.10", "24" for 24.0, "0.5" and ".5"."""
    spellings = [f"{value:g}", repr(value)]
    if value == int(value):
        spellings.append(str(int(value)))
    for digits in (1, 2, 3, 4):
        spellings.append(f"{value:.{digits}f}")
    spellings += [s.replace("0.", ".", 1) for s in spellings if s.startswith("0.")]
    seen: list[str] = []
    for spelling in spellings:
        if spelling not in seen:
            seen.append(spelling)
    return seen


def find_value(text: str, value: float) -> tuple[int, int] | None:
    """Span of the first number in ``text`` equal to ``value`` as printed, or None."""
    for spelling in number_spellings(abs(value)):
        pattern = rf"(?<![\d.]){re.escape(spelling)}(?![\d])"
        match = re.search(pattern, text)
        if match:
            return match.start(), match.end()
    return None


def _block_candidates(document: Document, source: Source) -> list[Block]:
    blocks = list(document.blocks)
    if source.ref is not None:
        same_ref = [b for b in blocks if b.ref == source.ref]
        if same_ref:
            return same_ref + blocks
    if source.page is not None:
        same_page = [b for b in blocks if b.page == source.page]
        return same_page + [b for b in blocks if b.page != source.page]
    return blocks


def locate_text(document: Document, proposal: Proposal) -> TextLocation:
    """The block, sentence and value span of a text proposal.

    Raises:
        SourceNotFound: no block holds the quoted text.
    """
    source = proposal.source
    for block in _block_candidates(document, source):
        span = _find_loose(block.text, source.quote)
        if span is None:
            continue
        sentence = next((s for s in split_sentences(block.text) if s[0] <= span[0] < s[1]), span)
        sentence = (min(sentence[0], span[0]), max(sentence[1], span[1]))
        found = find_value(block.text[span[0] : span[1]], proposal.value)
        value = (span[0] + found[0], span[0] + found[1]) if found else None
        return TextLocation(block=block, sentence=sentence, value=value)
    raise SourceNotFound(f"the quoted text is not in {document.name}: {source.quote[:60]!r}")


def mark_text(
    text: str,
    *,
    sentence: tuple[int, int] | None,
    value: tuple[int, int] | None,
    picked: tuple[int, int] | None = None,
) -> Text:
    """A paragraph as Rich text with the sentence, the value and the picked sentence styled."""
    rich = Text(text)
    if sentence is not None:
        rich.stylize(SENTENCE_STYLE, *sentence)
    if picked is not None and picked != sentence:
        rich.stylize(PICKED_STYLE, *picked)
    if value is not None:
        rich.stylize(VALUE_STYLE, *value)
    return rich


def find_table(document: Document, source: Source) -> Table:
    """The table a table proposal was read from, checked to hold its row and column.

    Raises:
        SourceNotFound: no such table, or the row/column lies outside its grid.
    """
    wanted = _squash(source.table or "").lower()
    for table in document.tables:
        if _squash(table.label).lower() == wanted:
            break
    else:
        raise SourceNotFound(f"{document.name} has no table {source.table!r}")
    row, col = source.row, source.col
    if row is None or col is None or not (0 <= row < table.n_rows and 0 <= col < table.n_cols):
        raise SourceNotFound(
            f"cell ({row}, {col}) lies outside {table.label} ({table.n_rows}x{table.n_cols})"
        )
    return table


def table_cell_texts(table: Table, *, row: int | None, col: int | None) -> list[list[Text]]:
    """The table's grid as Rich texts: the cell at (row, col) marked, its headers emphasised."""
    grid: list[list[Text]] = []
    for r, cells in enumerate(table.grid()):
        line: list[Text] = []
        for c, cell_text in enumerate(cells):
            cell = Text(_squash(cell_text))
            is_header = r < table.header_rows or c == 0
            if r == row and c == col:
                cell.stylize(VALUE_STYLE)
            elif is_header and (r == row or c == col):
                cell.stylize(HEADER_STYLE)
            elif is_header:
                cell.stylize("bold")
            line.append(cell)
        grid.append(line)
    return grid


def fit_widths(natural: list[int], budget: int, *, minimum: int = 5) -> list[int]:
    """Column widths that fit ``budget`` characters: the widest columns give way first.

    Columns narrower than the cap keep their natural width; wider ones are capped (their cells
    wrap), so no column is ever cut off part-way by a horizontal scroll.
    """
    if sum(natural) <= budget or not natural:
        return list(natural)
    low, high = minimum, max(natural)
    while low < high:  # the largest cap whose total fits
        cap = (low + high + 1) // 2
        if sum(min(width, cap) for width in natural) <= budget:
            low = cap
        else:
            high = cap - 1
    return [max(min(width, low), min(width, minimum)) for width in natural]


def describe_cell(table: Table, row: int, col: int) -> str:
    """The cell's place in words: "row label × column header" as the table prints them."""
    label = table.row_label(row) or f"row {row}"
    header = table.column_header(col) or f"column {col}"
    return f"{label} × {header}"


def page_label(source: Source) -> str:
    """ "p. 3" or "p. 3, results", or the element path for sources without pages."""
    where = f"p. {source.page}" if source.page is not None else (source.ref or "no page")
    return f"{where}, {source.section}" if source.section else where
