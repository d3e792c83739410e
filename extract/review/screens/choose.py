"""Small modal screens: the reject reason and the confirmation of a whole-row/column accept."""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from rich.table import Table as RichTable
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import OptionList, Static
from textual.widgets.option_list import Option

from extract.review.widgets.fields import format_number
from extract.store.rows import ProposalState
from extract.store.schema import REJECT_REASONS

#: Label of the choice that rejects without a reason.
NO_REASON = "no reason given"


@dataclass(frozen=True)
class RejectChoice:
    """The curator's answer on the reject screen: reject (with an optional reason)."""

    reason: str | None


class RejectScreen(ModalScreen[RejectChoice | None]):
    """Pick a reason (or none) for a rejection; escape keeps the proposal as it was."""

    BINDINGS = [
        Binding("escape", "cancel", "Back, no rejection"),
        Binding("0", "choose(0)", "Reject, no reason"),
        *[
            Binding(str(i), f"choose({i})", f"Reject: {reason}")
            for i, reason in enumerate(REJECT_REASONS, start=1)
        ],
        Binding("enter", "choose_highlighted", "Reject with the highlighted reason", show=False),
    ]

    def compose(self) -> ComposeResult:
        with Vertical(id="reject-box") as box:
            box.border_title = "Reject this proposal?"
            yield OptionList(
                *[
                    Option(f"{i}  {reason}", id=str(i))
                    for i, reason in enumerate((NO_REASON, *REJECT_REASONS))
                ],
                id="reject-reasons",
            )
            yield Static("digit or enter rejects · escape goes back", classes="hint")

    def on_mount(self) -> None:
        self.query_one(OptionList).highlighted = 0

    def action_cancel(self) -> None:
        """Go back without rejecting."""
        self.dismiss(None)

    def action_choose(self, index: int) -> None:
        """Reject with reason ``index`` (0: no reason)."""
        reason = None if index == 0 else REJECT_REASONS[index - 1]
        self.dismiss(RejectChoice(reason=reason))

    def action_choose_highlighted(self) -> None:
        """Reject with the highlighted reason."""
        self.action_choose(self.query_one(OptionList).highlighted or 0)

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.action_choose(int(event.option.id or 0))


def peers_table(states: Sequence[ProposalState]) -> RichTable:
    """The proposals a whole-row/column accept would accept, one per line."""
    grid = RichTable(box=None, padding=(0, 1), header_style="bold #8fa1b3", expand=True)
    for name in ("outcome", "group", "value", "unit", "spread", "n", "conf."):
        grid.add_column(name, overflow="ellipsis", no_wrap=True)
    for state in states:
        p = state.current
        spread = ""
        if p.dispersion is not None:
            value = p.dispersion.value
            shown = (
                f"{format_number(value[0])}-{format_number(value[1])}"
                if isinstance(value, tuple)
                else format_number(value)
            )
            spread = f"{p.dispersion.kind} {shown}"
        conf = Text(f"{p.confidence:.2f}", style="bold #e8a33d" if p.confidence < 0.5 else "")
        grid.add_row(
            p.outcome,
            p.group or "",
            format_number(p.value),
            p.unit or "",
            spread,
            "" if p.n is None else str(p.n),
            conf,
        )
    return grid


class BulkAcceptScreen(ModalScreen[bool]):
    """Shows every proposal of a table row or column that would be accepted; y confirms."""

    BINDINGS = [
        Binding("y", "confirm", "Accept them all"),
        Binding("n,escape", "refuse", "Back, accept nothing"),
    ]

    def __init__(self, title: str, states: Sequence[ProposalState]) -> None:
        super().__init__()
        self.title_text = title
        self.states = list(states)

    def compose(self) -> ComposeResult:
        with Vertical(id="bulk-box") as box:
            box.border_title = self.title_text
            yield Static(peers_table(self.states), id="bulk-list")
            yield Static(
                f"y accepts these {len(self.states)} as shown · n or escape goes back",
                classes="hint",
            )

    def action_confirm(self) -> None:
        """Accept them all."""
        self.dismiss(True)

    def action_refuse(self) -> None:
        """Accept nothing."""
        self.dismiss(False)
