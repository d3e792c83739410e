"""The panel that shows every field of the current proposal, pre-filled by the first pass."""

from __future__ import annotations

from rich.console import Group, RenderableType
from rich.table import Table
from rich.text import Text
from textual.widgets import Static

from extract.records.proposal import Proposal
from extract.store.rows import ProposalState

#: Confidence below which a proposal is flagged as doubtful.
LOW_CONFIDENCE = 0.5

#: Colour of each state's badge.
STATE_STYLES: dict[str, str] = {
    "pending": "bold #c9d1d9 on #3b4252",
    "accepted": "bold black on #6cc644",
    "edited": "bold black on #4fb3d9",
    "rejected": "bold white on #b33a3a",
    "added": "bold black on #b48ead",
    "skipped": "bold black on #d08770",
}

_MISSING = Text("—", style="dim")


def format_number(value: float | None) -> str:
    """A number as a person writes it: "24.1", "3", "0.0042"."""
    return "" if value is None else f"{value:g}"


def _value(proposal: Proposal) -> Text:
    text = Text(format_number(proposal.value), style="bold")
    if proposal.unit:
        text.append(f" {proposal.unit}")
    return text


def _unit(proposal: Proposal) -> Text:
    if not proposal.unit:
        return Text("none", style="dim")
    ucum = proposal.unit_ucum
    text = Text(proposal.unit)
    text.append(f" (UCUM {ucum})" if ucum else " (no UCUM code)", style="dim" if ucum else "yellow")
    return text


def _spread(proposal: Proposal) -> Text:
    dispersion = proposal.dispersion
    if dispersion is None:
        return _MISSING
    value = dispersion.value
    shown = (
        f"{format_number(value[0])} to {format_number(value[1])}"
        if isinstance(value, tuple)
        else format_number(value)
    )
    return Text(f"{dispersion.kind} {shown}")


def _plain(value: object) -> Text:
    return _MISSING if value in (None, "") else Text(str(value))


def confidence_text(proposal: Proposal) -> Text:
    """The extractor and its confidence; low confidence is flagged."""
    text = Text(f"{proposal.extractor}  confidence {proposal.confidence:.2f}")
    if proposal.confidence < LOW_CONFIDENCE:
        text.append("  LOW CONFIDENCE", style="bold black on #e8a33d")
    if proposal.flags:
        text.append("  " + ", ".join(proposal.flags), style="#e8a33d")
    return text


def render_fields(state: ProposalState, *, position: str = "") -> RenderableType:
    """The proposal's fields as a two-pair-per-line grid, with its state and extractor."""
    proposal = state.current
    grid = Table.grid(padding=(0, 1), expand=True)
    grid.add_column(style="#8fa1b3", no_wrap=True)
    grid.add_column(ratio=1, overflow="ellipsis", no_wrap=True)
    grid.add_column(style="#8fa1b3", no_wrap=True)
    grid.add_column(ratio=1, overflow="ellipsis", no_wrap=True)
    pairs: list[tuple[str, Text]] = [
        ("outcome", _plain(proposal.outcome)),
        ("group", _plain(proposal.group)),
        ("statistic", _plain(proposal.statistic)),
        ("value", _value(proposal)),
        ("unit", _unit(proposal)),
        ("spread", _spread(proposal)),
        ("n", _plain(proposal.n)),
        ("time", _plain(proposal.time_point)),
        ("method", _plain(proposal.method)),
        ("subject", _plain(proposal.subject)),
        ("treatment", _plain(proposal.intervention)),
        ("sd", _plain(format_number(proposal.sd) if proposal.sd is not None else None)),
    ]
    for left, right in zip(pairs[0::2], pairs[1::2], strict=True):
        grid.add_row(left[0], left[1], right[0], right[1])
    badge = Text(f" {state.state.upper()} ", style=STATE_STYLES.get(state.state, "bold"))
    top = Text.assemble(badge, " ", (position, "dim"))
    if state.claimed_by is not None:
        top.append(f"  held by {state.claimed_by}", style="bold #e8a33d")
    return Group(top, grid, confidence_text(proposal))


class FieldsPanel(Static):
    """Shows the current proposal's fields (read-only; the edit form changes them)."""

    def show_state(self, state: ProposalState | None, *, position: str = "") -> None:
        """Show a proposal, or a line saying nothing is left to review."""
        if state is None:
            self.update(
                Text(
                    "Nothing pending in this article. Browse with [ and ], "
                    "or press escape for the article list.",
                    style="italic",
                )
            )
            return
        self.update(render_fields(state, position=position))
