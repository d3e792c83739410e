"""The curator review app: the article list, the review screen and their modal screens.

Run it with ``winnow review`` or ``ReviewApp(store, curator="ana").run()``. Decisions go to the
store the moment they are made; reopening an article resumes at its first pending proposal.
"""

from __future__ import annotations

import time
from collections.abc import Callable

from textual.app import App
from textual.binding import Binding
from textual.widgets import DataTable

from extract.errors import StoreError
from extract.review.screens.articles import ArticleListScreen
from extract.review.screens.choose import BulkAcceptScreen, RejectScreen
from extract.review.screens.edit import EditScreen
from extract.review.screens.help import HelpScreen, KeyGroup
from extract.review.screens.review import ReviewScreen
from extract.review.session import DEFAULT_CLAIM_TTL, ReviewSession
from extract.review.widgets.source_view import TextSource
from extract.store import Store

#: DataTable actions that move inside a table source (listed in the help screen).
_TABLE_MOVES = ("cursor_up", "cursor_down", "cursor_left", "cursor_right", "page_up", "page_down")


def key_groups() -> list[KeyGroup]:
    """Every screen's bindings, for the help screen and the documentation."""
    table_moves = [b for b in Binding.make_bindings(DataTable.BINDINGS) if b.action in _TABLE_MOVES]
    return [
        ("Article list", ArticleListScreen.BINDINGS),
        ("Review", ReviewScreen.BINDINGS),
        ("Source: a sentence", TextSource.BINDINGS),
        ("Source: a table", table_moves),
        ("Edit / add form", EditScreen.BINDINGS),
        ("Reject", RejectScreen.BINDINGS),
        ("Accept a row or column", BulkAcceptScreen.BINDINGS),
        ("Help", HelpScreen.BINDINGS),
        ("Anywhere", ReviewApp.BINDINGS),
    ]


class ReviewApp(App[None]):
    """Curator review of the proposals in a store.

    Args:
        store: the open store.
        curator: the curator's name, stored with each decision and claim.
        article_id: open this article straight away (the list stays one escape away).
        clock: seconds as a float, to time decisions (tests pass their own).
        claim_ttl: seconds a claim on the shown proposal lasts.
    """

    CSS_PATH = "review.tcss"
    TITLE = "winnow review"
    ENABLE_COMMAND_PALETTE = False
    BINDINGS = [
        Binding(
            "ctrl+q",
            "quit",
            "Quit",
            show=False,
            priority=True,
            tooltip="Quit from any screen (every decision is already stored)",
        ),
        Binding("f1", "show_help", "Help: all keys", show=False),
    ]

    def __init__(
        self,
        store: Store,
        *,
        curator: str,
        article_id: str | None = None,
        clock: Callable[[], float] = time.monotonic,
        claim_ttl: int = DEFAULT_CLAIM_TTL,
    ) -> None:
        super().__init__()
        self.store = store
        self.curator = curator
        self.start_article = article_id
        self.clock = clock
        self.claim_ttl = claim_ttl

    def on_mount(self) -> None:
        self.push_screen(ArticleListScreen())
        if self.start_article is not None:
            self.open_article(self.start_article)

    def open_article(self, article_id: str) -> None:
        """Open the review screen on an article."""
        try:
            self.store.article(article_id)
        except StoreError as error:
            self.notify(str(error), severity="error")
            return
        session = ReviewSession(
            self.store,
            article_id,
            curator=self.curator,
            clock=self.clock,
            claim_ttl=self.claim_ttl,
        )
        self.push_screen(ReviewScreen(session))

    def action_show_help(self) -> None:
        """Show every key."""
        if not isinstance(self.screen, HelpScreen):
            self.push_screen(HelpScreen(key_groups()))

    async def action_quit(self) -> None:
        """Release the claim on the shown proposal and quit."""
        for screen in self.screen_stack:
            if isinstance(screen, ReviewScreen):
                screen.session.close()
        self.exit()
