"""The source panel: the sentence with the value marked, or the table grid with the cell marked.

The curator can move inside the source (tab into it, then the arrow keys) to pick another
sentence or cell; a data point the first pass missed is pre-filled from the pick.
"""

from __future__ import annotations

from dataclasses import dataclass

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import DataTable, Static

from extract.ingest.document import Block, Document, Table
from extract.records.proposal import Proposal
from extract.review.source import (
    describe_cell,
    find_table,
    fit_widths,
    locate_text,
    mark_text,
    page_label,
    split_sentences,
    table_cell_texts,
)

#: Sentences shown on each side of the picked one.
CONTEXT_SENTENCES = 1
#: Block kinds that hold sentences worth picking.
_TEXT_KINDS = ("paragraph", "caption", "footnote", "other")


@dataclass(frozen=True)
class Pick:
    """What the curator has picked in the source: a sentence of a block, or a table cell."""

    block: Block | None = None
    span: tuple[int, int] | None = None
    table: Table | None = None
    row: int | None = None
    col: int | None = None


class TextSource(Static, can_focus=True):
    """A paragraph window around a sentence; up/down pick the sentence before or after."""

    BINDINGS = [
        Binding("up", "pick(-1)", "Sentence before", show=False),
        Binding("down", "pick(1)", "Sentence after", show=False),
    ]

    def __init__(self, **kwargs: object) -> None:
        super().__init__("", **kwargs)  # type: ignore[arg-type]
        self._sentences: list[tuple[Block, tuple[int, int]]] = []
        self._target: int | None = None
        self._value: tuple[int, int] | None = None
        self.picked: int | None = None

    def load(self, document: Document, proposal: Proposal) -> None:
        """Show the proposal's sentence with its value marked.

        Raises:
            SourceNotFound: the quote is not in the document.
        """
        where = locate_text(document, proposal)
        self._sentences = [
            (block, span)
            for block in document.blocks
            if block.kind in _TEXT_KINDS
            for span in split_sentences(block.text)
        ]
        self._target = None
        self._value = where.value
        for index, (block, span) in enumerate(self._sentences):
            target = where.sentence
            if block.index == where.block.index and target and span[0] < target[1]:
                if target[0] < span[1]:
                    self._target = index
                    break
        if self._target is None:
            self._sentences.append((where.block, where.sentence or (0, len(where.block.text))))
            self._target = len(self._sentences) - 1
        self._target_span = where.sentence
        self.picked = self._target
        self._draw()

    def action_pick(self, step: int) -> None:
        """Move the picked sentence by ``step``."""
        if self.picked is None or not self._sentences:
            return
        self.picked = max(0, min(len(self._sentences) - 1, self.picked + step))
        self._draw()

    def pick(self) -> Pick:
        """The picked sentence."""
        if self.picked is None:
            return Pick()
        block, span = self._sentences[self.picked]
        return Pick(block=block, span=span)

    def _draw(self) -> None:
        if self.picked is None:
            self.update("")
            return
        block, span = self._sentences[self.picked]
        spans = [s for b, s in self._sentences if b.index == block.index]
        at = spans.index(span) if span in spans else 0
        first = spans[max(0, at - CONTEXT_SENTENCES)][0]
        last = spans[min(len(spans) - 1, at + CONTEXT_SENTENCES)][1]
        target_block, target_span = self._sentences[self._target or 0]
        on_target = target_block.index == block.index
        sentence = self._target_span if on_target else None
        value = self._value if on_target else None
        shown = mark_text(block.text, sentence=sentence, value=value, picked=span)[first:last]
        prefix = Text("… " if first > 0 else "")
        suffix = Text(" …" if last < len(block.text) else "")
        body = Text.assemble(prefix, shown, suffix)
        if self.picked != self._target:
            where = f"{block.section}, p. {block.page}" if block.page else block.section
            head = Text(f"picked sentence ({where}): m adds a data point from it", style="italic")
            body = Text("\n").join([head, body])
        self.update(body)


class TableSource(DataTable[Text]):
    """A table drawn as a grid; header rows and the label column stay in view while scrolling."""

    shown: tuple[Table, int, int] | None = None

    def load(self, table: Table, *, row: int, col: int) -> None:
        """Draw the table with the cell at (row, col) marked and put the cursor on it.

        Columns are narrowed to fit the panel (long cells wrap onto more lines) so that a
        column is never shown cut off at its left edge, where "104.2" could read as "4.2".
        """
        self.clear(columns=True)
        self.shown = (table, row, col)
        self.fixed_rows = table.header_rows
        self.fixed_columns = 0
        self.table_shown = table
        grid = table_cell_texts(table, row=row, col=col)
        natural = [
            max((cells[c].cell_len for cells in grid), default=1) for c in range(table.n_cols)
        ]
        width = self.size.width or max(self.app.size.width - 6, 20)
        budget = width - 2 * self.cell_padding * table.n_cols - 1
        for c, column_width in enumerate(fit_widths(natural, budget)):
            self.add_column(str(c), key=str(c), width=column_width)
        for r, cells in enumerate(grid):
            self.add_row(*cells, key=str(r), height=None)
        self.move_cursor(row=row, column=col)

    def on_resize(self) -> None:
        if self.shown is not None:
            table, row, col = self.shown
            cursor = self.cursor_coordinate
            self.load(table, row=row, col=col)
            self.move_cursor(row=cursor.row, column=cursor.column)

    def pick(self) -> Pick:
        """The cell under the cursor."""
        coordinate = self.cursor_coordinate
        return Pick(table=self.table_shown, row=coordinate.row, col=coordinate.column)


class SourcePanel(Vertical):
    """Caption, source (text or table) and footnotes of the shown proposal."""

    def compose(self) -> ComposeResult:
        yield Static(id="source-caption")
        yield TextSource(id="source-text")
        yield TableSource(
            id="source-table", show_header=False, cursor_type="cell", zebra_stripes=False
        )
        yield Static(id="source-notes")

    def clear_source(self) -> None:
        """Show nothing (no proposal)."""
        self.border_title = "Source"
        self.query_one("#source-caption", Static).display = False
        self.query_one("#source-notes", Static).display = False
        self.query_one(TextSource).display = False
        self.query_one(TableSource).display = False

    def show_source(self, document: Document, proposal: Proposal) -> None:
        """Show where the proposal was read.

        Raises:
            SourceNotFound: the proposal's sentence or cell is not in the document.
        """
        source = proposal.source
        caption = self.query_one("#source-caption", Static)
        notes = self.query_one("#source-notes", Static)
        text_view = self.query_one(TextSource)
        table_view = self.query_one(TableSource)
        if source.kind == "table":
            table = find_table(document, source)
            row, col = source.row or 0, source.col or 0  # find_table checked both are set
            table_view.load(table, row=row, col=col)
            caption.update(Text(f"{table.label}. {table.caption}".strip(), style="italic"))
            notes.update(Text("\n".join(table.footnotes), style="dim"))
            caption.display = True
            notes.display = bool(table.footnotes)
            cell = describe_cell(table, row, col)
            self.border_title = f"{table.label} · {page_label(source)} · {cell}"
            text_view.display = False
            table_view.display = True
        else:
            text_view.load(document, proposal)
            caption.display = False
            notes.display = False
            self.border_title = f"Text · {page_label(source)}"
            table_view.display = False
            text_view.display = True

    def pick(self) -> Pick:
        """The sentence or cell the curator has picked (the proposal's own until moved)."""
        table_view = self.query_one(TableSource)
        if table_view.display and table_view.row_count:
            return table_view.pick()
        return self.query_one(TextSource).pick()
