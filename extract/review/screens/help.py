"""The help screen: every key of every screen, generated from the screens' own bindings."""

from __future__ import annotations

from collections.abc import Iterable, Sequence

from rich.table import Table as RichTable
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding, BindingType
from textual.containers import VerticalScroll
from textual.keys import format_key
from textual.screen import ModalScreen
from textual.widgets import Static

#: Keys shown by name rather than by symbol.
_SPELLED_OUT = frozenset({"enter", "space", "escape", "tab", "up", "down", "left", "right"})

#: A titled group of bindings: (where they apply, the bindings).
KeyGroup = tuple[str, Sequence[BindingType]]


def key_label(key: str) -> str:
    """A key as a person reads it: "question_mark" -> "?", "ctrl+s" -> "ctrl+s"."""
    *modifiers, name = key.split("+")
    shown = name if name in _SPELLED_OUT else format_key(name)
    return "+".join([*modifiers, shown])


def binding_rows(bindings: Iterable[BindingType]) -> list[tuple[str, str]]:
    """(keys, description) per action; several keys for one action are listed together."""
    rows: dict[tuple[str, str], list[str]] = {}
    for binding in Binding.make_bindings(bindings):
        label = binding.key_display or key_label(binding.key)
        description = binding.tooltip or binding.description or binding.action
        keys = rows.setdefault((binding.action, description), [])
        if label not in keys:
            keys.append(label)
    return [(" ".join(keys), description) for (_, description), keys in rows.items()]


def help_text(groups: Sequence[KeyGroup]) -> RichTable:
    """The help screen's body: one block of keys per group."""
    grid = RichTable.grid(padding=(0, 2), expand=True)
    grid.add_column(style="bold #e8c547", no_wrap=True, width=14)
    grid.add_column(ratio=1)
    for title, bindings in groups:
        grid.add_row(Text(title, style="bold underline #7fc8f8"), "")
        for keys, description in binding_rows(bindings):
            grid.add_row(keys, description)
        grid.add_row("", "")
    return grid


class HelpScreen(ModalScreen[None]):
    """Lists every key, grouped by screen; any of escape, q or ? closes it."""

    BINDINGS = [
        Binding("escape", "dismiss", "Close help"),
        Binding("q", "dismiss", "Close help", show=False),
        Binding("question_mark", "dismiss", "Close help", show=False),
    ]

    def __init__(self, groups: Sequence[KeyGroup]) -> None:
        super().__init__()
        self.groups = groups

    def compose(self) -> ComposeResult:
        with VerticalScroll(id="help-body") as body:
            body.border_title = "Keys (escape closes)"
            yield Static(help_text(self.groups), id="help-text")
            yield Static(
                "Every value is a suggestion of the first pass: check it against the article. "
                "Extracted values are no basis for clinical decisions.",
                id="help-caution",
            )
