"""The Document model: what ingest hands to every later stage.

Coordinates are PDF points with the origin at the top-left of the page: ``(x0, top, x1, bottom)``,
as pdfplumber reports them. Pages are 1-based. Sources without pages (JATS XML) leave ``page`` and
``bbox`` as ``None`` and give ``ref`` (an element path such as ``sec[2]/p[3]``) instead.

All classes are frozen dataclasses holding tuples, so a Document can cross a process pool and be
hashed or compared in tests.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Any

BBox = tuple[float, float, float, float]

#: Canonical section names; every Block and Section carries one of these.
SECTION_NAMES: tuple[str, ...] = (
    "title",
    "abstract",
    "introduction",
    "methods",
    "results",
    "discussion",
    "references",
    "legends",
    "other",
)

#: Kinds of text block.
BLOCK_KINDS: tuple[str, ...] = ("title", "heading", "paragraph", "caption", "footnote", "other")


@dataclass(frozen=True)
class Word:
    """One word as printed on a page."""

    text: str
    page: int
    bbox: BBox
    size: float = 0.0
    bold: bool = False


@dataclass(frozen=True)
class Page:
    """One page: its size, how many text columns it has, and whether it has a text layer."""

    number: int
    width: float
    height: float
    columns: int = 1
    has_text: bool = True


@dataclass(frozen=True)
class Block:
    """A paragraph-like run of text, in reading order.

    ``index`` is the block's position in the document's reading order. ``label`` names what a
    caption or footnote belongs to ("Table 1", "Figure 2"). ``heading`` is the section heading as
    written; ``section`` its canonical name from :data:`SECTION_NAMES`.
    """

    index: int
    kind: str
    text: str
    section: str
    page: int | None = None
    bbox: BBox | None = None
    column: int = 0
    heading: str | None = None
    label: str | None = None
    ref: str | None = None


@dataclass(frozen=True)
class Section:
    """A section of the article with the range of pages and blocks it covers."""

    name: str
    heading: str
    page_start: int | None
    page_end: int | None
    first_block: int
    last_block: int


@dataclass(frozen=True)
class TableCell:
    """One cell of a table's full grid (row and column spans already expanded)."""

    row: int
    col: int
    text: str
    bbox: BBox | None = None
    page: int | None = None


@dataclass(frozen=True)
class Table:
    """A table as a full rectangular grid with its caption, footnotes and header rows.

    ``cells`` holds ``n_rows * n_cols`` cells in row-major order. The first ``header_rows`` rows
    are column headers; column 0 holds the row labels. ``column_units`` and ``row_units`` are the
    units found in column headers and row labels (as written, e.g. "mg/dL"), or ``None``.
    ``pages`` lists every page a table spans (a table continued on the next page is one table).
    ``reader`` names what read it (e.g. ``"pdfplumber.lines"``, ``"camelot.network"``, ``"jats"``).
    """

    label: str
    caption: str
    footnotes: tuple[str, ...]
    page: int | None
    pages: tuple[int, ...]
    bbox: BBox | None
    n_rows: int
    n_cols: int
    header_rows: int
    cells: tuple[TableCell, ...]
    column_units: tuple[str | None, ...] = ()
    row_units: tuple[str | None, ...] = ()
    section: str | None = None
    reader: str = ""
    ref: str | None = None

    def cell(self, row: int, col: int) -> TableCell:
        """The cell at ``(row, col)``."""
        return self.cells[row * self.n_cols + col]

    def grid(self) -> list[list[str]]:
        """The cell texts as a list of rows."""
        return [
            [self.cells[r * self.n_cols + c].text for c in range(self.n_cols)]
            for r in range(self.n_rows)
        ]

    def column_header(self, col: int) -> str:
        """The column's header texts, top to bottom, joined by " / " (empty ones left out)."""
        parts: list[str] = []
        for r in range(self.header_rows):
            text = self.cell(r, col).text.strip()
            if text and text not in parts:
                parts.append(text)
        return " / ".join(parts)

    def row_label(self, row: int) -> str:
        """The row's label: the text of its first cell."""
        return self.cell(row, 0).text.strip()


@dataclass(frozen=True)
class Document:
    """A whole article: pages, text blocks in reading order, sections and tables.

    ``name`` is the input file's stem; ``source`` is ``"pdf"`` or ``"jats"``; ``sha256`` is the
    hex digest of the file's bytes (used to skip files already processed).
    """

    path: str
    name: str
    source: str
    sha256: str
    doi: str | None
    title: str | None
    pages: tuple[Page, ...]
    blocks: tuple[Block, ...]
    sections: tuple[Section, ...]
    tables: tuple[Table, ...]
    words: tuple[Word, ...] = field(default=(), repr=False)

    def blocks_in(self, section: str) -> tuple[Block, ...]:
        """Blocks of one canonical section, in reading order."""
        return tuple(b for b in self.blocks if b.section == section)

    def text(self) -> str:
        """All block texts in reading order, one block per paragraph."""
        return "\n\n".join(b.text for b in self.blocks)

    def to_dict(self, *, words: bool = False) -> dict[str, Any]:
        """A JSON-ready dict; words are left out unless asked for (they are many)."""
        data = asdict(self)
        if not words:
            data.pop("words")
        return data
