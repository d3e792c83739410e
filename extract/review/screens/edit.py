"""The edit form: every field of a proposal, checked before it is saved.

Used to edit a proposal and to add a data point the first pass missed (pre-filled from the
sentence or cell the curator picked). Saving checks every field (see
:func:`extract.review.form.fields_to_proposal`); a bad field keeps the form open and says why.
"""

from __future__ import annotations

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Grid, Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, Label, Select, Static

from extract.records.proposal import DISPERSION_KINDS, STATISTICS, Proposal
from extract.review.form import (
    FORM_FIELDS,
    check_unit,
    fields_to_proposal,
    proposal_to_fields,
)
from extract.review.source import find_value, page_label

#: Longest quote shown above the form (the full source stays on the review screen).
_QUOTE_CHARS = 220


def source_line(proposal: Proposal) -> Text:
    """The proposal's source in one or two lines, value marked, so no edit is made blind."""
    source = proposal.source
    where = page_label(source)
    if source.kind == "table" and source.table:
        where = f"{source.table}, row {source.row}, col {source.col} · {where}"
    quote = " ".join(source.quote.split())
    span = find_value(quote, proposal.value)
    if len(quote) > _QUOTE_CHARS:
        # Keep the window around the value.
        middle = span[0] if span else 0
        start = max(0, min(middle - _QUOTE_CHARS // 2, len(quote) - _QUOTE_CHARS))
        quote = ("…" if start else "") + quote[start : start + _QUOTE_CHARS] + "…"
        span = find_value(quote, proposal.value)
    text = Text(f"{where}: ", style="#8fa1b3")
    body = Text(quote)
    if span is not None:
        body.stylize("bold reverse", span[0], span[1])
    text.append_text(body)
    return text


#: Fields chosen from a fixed list rather than typed.
_CHOICES: dict[str, tuple[str, ...]] = {
    "statistic": STATISTICS,
    "dispersion_kind": ("", *DISPERSION_KINDS),
}


class EditScreen(ModalScreen[Proposal | None]):
    """A form over a proposal's fields; returns the checked proposal, or None when cancelled."""

    BINDINGS = [
        Binding("ctrl+s", "save", "Save (enter in a text field saves too)"),
        Binding("escape", "cancel", "Cancel, keep the proposal as it was"),
        Binding("tab", "app.focus_next", "Next field", show=False),
        Binding("shift+tab", "app.focus_previous", "Previous field", show=False),
    ]

    def __init__(self, proposal: Proposal, *, title: str = "Edit proposal") -> None:
        super().__init__()
        self.proposal = proposal
        self.title_text = title
        self.tried = False

    def compose(self) -> ComposeResult:
        values = proposal_to_fields(self.proposal)
        with Vertical(id="edit-box") as box:
            box.border_title = self.title_text
            yield Static(source_line(self.proposal), id="edit-source")
            with Grid(id="edit-grid"):
                for name, label in FORM_FIELDS:
                    yield Label(label, classes="form-label")
                    if name in _CHOICES:
                        options = [(choice or "none", choice) for choice in _CHOICES[name]]
                        yield Select(
                            options,
                            value=values[name],
                            allow_blank=False,
                            compact=True,
                            id=f"f-{name}",
                        )
                    else:
                        yield Input(values[name], compact=True, id=f"f-{name}")
            yield Static(id="unit-hint")
            yield Static(id="form-errors")
            yield Static(
                "enter or ctrl+s saves · escape cancels · tab: next field · pairs as low-high",
                classes="hint",
            )

    def on_mount(self) -> None:
        self._show_unit_hint()
        self.query_one("#f-outcome", Input).focus()

    def values(self) -> dict[str, str]:
        """The form's current texts by field name."""
        values: dict[str, str] = {}
        for name, _ in FORM_FIELDS:
            widget = self.query_one(f"#f-{name}")
            if isinstance(widget, Select):
                value = widget.value
                values[name] = value if isinstance(value, str) else ""
            elif isinstance(widget, Input):
                values[name] = widget.value
        return values

    def _show_unit_hint(self) -> None:
        unit = self.query_one("#f-unit", Input).value
        check = check_unit(unit)
        if not check.text:
            hint = Text("unit: none (a count, ratio or score)", style="dim")
        elif check.known:
            hint = Text(f"unit {check.text!r}: UCUM {check.ucum or '(no code)'}", style="#6cc644")
        else:
            hint = Text(f"unit {check.text!r}: not in the unit registry", style="bold #e8a33d")
        self.query_one("#unit-hint", Static).update(hint)

    def _show_errors(self, errors: dict[str, str]) -> None:
        labels = dict(FORM_FIELDS)
        for name, _ in FORM_FIELDS:
            self.query_one(f"#f-{name}").set_class(name in errors, "field-error")
        lines = [f"{labels[name]}: {message}" for name, message in errors.items()]
        self.query_one("#form-errors", Static).update(
            Text("\n".join(lines), style="bold #ff6b6b") if lines else ""
        )

    @on(Input.Changed)
    @on(Select.Changed)
    def _changed(self) -> None:
        self._show_unit_hint()
        if self.tried:
            self._show_errors(fields_to_proposal(self.values(), base=self.proposal).errors)

    @on(Input.Submitted)
    def _submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.action_save()

    def action_save(self) -> None:
        """Check every field; save and close when all are valid, else show what is wrong."""
        self.tried = True
        result = fields_to_proposal(self.values(), base=self.proposal)
        self._show_errors(result.errors)
        if result.proposal is not None:
            self.dismiss(result.proposal)

    def action_cancel(self) -> None:
        """Close without saving."""
        self.dismiss(None)
