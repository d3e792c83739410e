"""The article list: every article in the store with its review progress."""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING, cast

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.screen import Screen
from textual.widgets import DataTable, Footer, ProgressBar, Static

from extract.store.rows import ArticleSummary

if TYPE_CHECKING:
    from extract.review.app import ReviewApp

#: Columns of the article table: (heading, ArticleSummary attribute).
COUNT_COLUMNS: tuple[tuple[str, str], ...] = (
    ("todo", "pending"),
    ("acc", "accepted"),
    ("edit", "edited"),
    ("rej", "rejected"),
    ("add", "added"),
    ("skip", "skipped"),
)

CAUTION = "Suggested values: verify against the article; not for clinical decisions."


def overall_progress(summaries: Sequence[ArticleSummary]) -> tuple[int, int]:
    """(decided, total) over all articles; skipped proposals count as not yet decided."""
    total = sum(s.total for s in summaries)
    decided = sum(s.done for s in summaries)
    return decided, total


class ArticleListScreen(Screen[None]):
    """Lists the store's articles with counts by state; enter opens one for review."""

    BINDINGS = [
        Binding("enter", "open_article", "Review article"),
        Binding("g", "reload", "Reload counts"),
        Binding("question_mark", "app.show_help", "Help: all keys", key_display="?"),
        Binding("q", "app.quit", "Quit"),
    ]

    def __init__(self) -> None:
        super().__init__()
        self.summaries: dict[str, ArticleSummary] = {}

    @property
    def review_app(self) -> ReviewApp:
        """The app, typed."""
        return cast("ReviewApp", self.app)

    def compose(self) -> ComposeResult:
        yield Static(id="list-title")
        yield Static(CAUTION, id="list-caution")
        yield ProgressBar(id="overall", show_eta=False)
        yield DataTable(id="articles", cursor_type="row", zebra_stripes=True)
        yield Static(id="article-info")
        yield Footer()

    def on_mount(self) -> None:
        table = self.query_one("#articles", DataTable)
        table.add_column("article", key="article")
        for heading, key in COUNT_COLUMNS:
            table.add_column(heading, key=key)
        table.add_column("done", key="done")
        self.action_reload()

    def on_screen_resume(self) -> None:
        self.action_reload()

    def action_reload(self) -> None:
        """Read the counts again from the store."""
        summaries = self.review_app.store.articles()
        table = self.query_one("#articles", DataTable)
        selected = table.cursor_row
        table.clear()
        for summary in summaries:
            percent = 100 * summary.done // summary.total if summary.total else 100
            table.add_row(
                Text(summary.id, style="bold"),
                *[Text(str(getattr(summary, key)), justify="right") for _, key in COUNT_COLUMNS],
                Text(f"{percent}%", justify="right"),
                key=summary.id,
            )
        self.summaries = {s.id: s for s in summaries}
        if summaries:
            table.move_cursor(row=min(selected, len(summaries) - 1))
        decided, total = overall_progress(summaries)
        bar = self.query_one("#overall", ProgressBar)
        bar.update(total=max(total, 1), progress=decided)
        self.query_one("#list-title", Static).update(
            Text.assemble(
                ("winnow review", "bold"),
                f"  curator {self.review_app.curator}  ·  {len(summaries)} articles  ·  "
                f"{decided} of {total} proposals decided",
            )
        )

    def action_open_article(self) -> None:
        """Open the highlighted article."""
        table = self.query_one("#articles", DataTable)
        if not table.row_count:
            self.notify("The store holds no articles yet: run the first pass on some.")
            return
        row_key, _ = table.coordinate_to_cell_key(table.cursor_coordinate)
        if row_key.value is not None:
            self.review_app.open_article(row_key.value)

    def on_data_table_row_highlighted(self, event: DataTable.RowHighlighted) -> None:
        summary = self.summaries.get(event.row_key.value or "")
        info = self.query_one("#article-info", Static)
        if summary is None:
            info.update("")
            return
        info.update(
            Text.assemble(
                (summary.title or "(no title)", "italic"),
                f"\n{summary.file or 'no file'} · DOI {summary.doi or 'none'} · "
                f"{summary.total} proposals",
            )
        )

    def on_data_table_row_selected(self, event: DataTable.RowSelected) -> None:
        event.stop()
        if event.row_key.value is not None:
            self.review_app.open_article(event.row_key.value)
