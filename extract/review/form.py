"""The edit form's values and their validation, apart from any widget.

A curator edits a proposal as text fields. :func:`proposal_to_fields` turns a proposal into those
texts; :func:`fields_to_proposal` checks them and builds the edited proposal, or returns one
message per bad field. Numbers must parse, units must be known to the unit registry (their UCUM
code is filled in), ``n`` is a positive integer and the dispersion kind comes from a fixed list.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import dataclass, field

from extract.records.proposal import DISPERSION_KINDS, STATISTICS, Dispersion, Proposal
from extract.records.stats import derive_sd
from extract.units import normalize

#: The editable fields, in form order: (field name, label).
FORM_FIELDS: tuple[tuple[str, str], ...] = (
    ("outcome", "Outcome"),
    ("group", "Group"),
    ("statistic", "Statistic"),
    ("value", "Value"),
    ("unit", "Unit"),
    ("dispersion_kind", "Spread kind"),
    ("dispersion_value", "Spread value"),
    ("n", "n"),
    ("time_point", "Time point"),
    ("method", "Method"),
    ("subject", "Subject"),
    ("intervention", "Intervention"),
)

#: Dispersion kinds whose value is a [low, high] pair rather than one number.
PAIR_KINDS: tuple[str, ...] = ("CI95", "IQR", "range")

#: Optional free-text fields: an empty entry stores ``None``.
_TEXT_FIELDS: tuple[str, ...] = ("group", "time_point", "method", "subject", "intervention")

_NUMBER = r"[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?"
_PAIR_RE = re.compile(rf"^\s*({_NUMBER})\s*(?:,|;|\.\.|to|–|—|-)\s*({_NUMBER})\s*$")
_MINUS_SIGNS = str.maketrans({"\u2212": "-", "\u2013": "-"})


@dataclass(frozen=True)
class UnitCheck:
    """What the unit registry says about a unit as written."""

    text: str
    known: bool
    ucum: str | None
    value_normalized: float | None = None
    unit_normalized: str | None = None


@dataclass(frozen=True)
class FormResult:
    """The outcome of checking a form: the edited proposal, or one message per bad field."""

    proposal: Proposal | None
    errors: dict[str, str] = field(default_factory=dict)

    @property
    def ok(self) -> bool:
        """True when every field is valid."""
        return not self.errors


def parse_number(text: str) -> float:
    """A finite number written as text ("24.1", "−3", "1.2e3").

    Raises:
        ValueError: the text is not a finite number.
    """
    cleaned = text.strip().translate(_MINUS_SIGNS).replace(" ", "")
    if not re.fullmatch(_NUMBER, cleaned):
        raise ValueError(f"{text.strip()!r} is not a number")
    number = float(cleaned)
    if not math.isfinite(number):
        raise ValueError(f"{text.strip()!r} is not a finite number")
    return number


def parse_pair(text: str) -> tuple[float, float]:
    """A ``low, high`` pair ("1.2-3.4", "1.2 to 3.4", "1.2, 3.4"); low must not exceed high.

    Raises:
        ValueError: not two numbers, or low above high.
    """
    match = _PAIR_RE.match(text.translate(_MINUS_SIGNS))
    if match is None:
        raise ValueError(f"{text.strip()!r} is not two numbers (low-high)")
    low, high = parse_number(match.group(1)), parse_number(match.group(2))
    if low > high:
        raise ValueError(f"low {low:g} is above high {high:g}")
    return low, high


def parse_positive_int(text: str) -> int:
    """A positive whole number (a sample size).

    Raises:
        ValueError: not a whole number above zero.
    """
    cleaned = text.strip()
    if not cleaned.isdigit() or int(cleaned) <= 0:
        raise ValueError(f"{cleaned!r} is not a positive whole number")
    return int(cleaned)


def check_unit(unit_text: str, *, value: float = 1.0) -> UnitCheck:
    """Look a unit up in the unit registry; an empty unit is known and has no code."""
    text = unit_text.strip()
    if not text:
        return UnitCheck(text="", known=True, ucum=None)
    result = normalize(value, text)
    return UnitCheck(
        text=text,
        known=bool(result.known),
        ucum=result.ucum,
        value_normalized=result.value if result.canonical_unit else None,
        unit_normalized=result.canonical_unit,
    )


def _format_number(value: float) -> str:
    return f"{value:g}" if abs(value) < 1e15 else repr(value)


def proposal_to_fields(proposal: Proposal) -> dict[str, str]:
    """The form's texts for a proposal (empty text for a missing value)."""
    dispersion = proposal.dispersion
    if dispersion is None:
        kind, spread = "", ""
    elif isinstance(dispersion.value, tuple):
        kind = dispersion.kind
        spread = f"{_format_number(dispersion.value[0])}-{_format_number(dispersion.value[1])}"
    else:
        kind, spread = dispersion.kind, _format_number(dispersion.value)
    return {
        "outcome": proposal.outcome,
        "group": proposal.group or "",
        "statistic": proposal.statistic,
        "value": _format_number(proposal.value),
        "unit": proposal.unit or "",
        "dispersion_kind": kind,
        "dispersion_value": spread,
        "n": "" if proposal.n is None else str(proposal.n),
        "time_point": proposal.time_point or "",
        "method": proposal.method or "",
        "subject": proposal.subject or "",
        "intervention": proposal.intervention or "",
    }


def _parse_dispersion(kind: str, text: str, errors: dict[str, str]) -> Dispersion | None:
    kind, text = kind.strip(), text.strip()
    if not kind and not text:
        return None
    if not kind:
        errors["dispersion_kind"] = f"choose one of {', '.join(DISPERSION_KINDS)}"
        return None
    if kind not in DISPERSION_KINDS:
        errors["dispersion_kind"] = f"{kind!r} is not one of {', '.join(DISPERSION_KINDS)}"
        return None
    if not text:
        errors["dispersion_value"] = f"{kind} needs a value"
        return None
    try:
        if kind in PAIR_KINDS:
            return Dispersion(kind=kind, value=parse_pair(text))
        spread = parse_number(text)
    except ValueError as error:
        errors["dispersion_value"] = str(error)
        return None
    if spread < 0:
        errors["dispersion_value"] = f"{kind} cannot be negative"
        return None
    return Dispersion(kind=kind, value=spread)


def fields_to_proposal(fields: Mapping[str, str], *, base: Proposal) -> FormResult:
    """Check the form's texts and build the edited proposal.

    Args:
        fields: text per field name of :data:`FORM_FIELDS` (missing names count as empty).
        base: the proposal being edited; id, source, extractor and confidence are kept.

    Returns:
        A :class:`FormResult` holding the new proposal, or a message per bad field.
    """
    errors: dict[str, str] = {}
    text = {name: (fields.get(name) or "").strip() for name, _ in FORM_FIELDS}

    if not text["outcome"]:
        errors["outcome"] = "say what was measured"
    if text["statistic"] not in STATISTICS:
        errors["statistic"] = f"choose one of {', '.join(STATISTICS)}"

    value: float | None = None
    if not text["value"]:
        errors["value"] = "a value is needed"
    else:
        try:
            value = parse_number(text["value"])
        except ValueError as error:
            errors["value"] = str(error)

    unit = check_unit(text["unit"], value=value if value is not None else 1.0)
    if not unit.known:
        errors["unit"] = f"{unit.text!r} is not a unit the registry knows"

    dispersion = _parse_dispersion(text["dispersion_kind"], text["dispersion_value"], errors)

    n: int | None = None
    if text["n"]:
        try:
            n = parse_positive_int(text["n"])
        except ValueError as error:
            errors["n"] = str(error)

    if errors or value is None:
        return FormResult(proposal=None, errors=errors)

    optional = {name: (text[name] or None) for name in _TEXT_FIELDS}
    proposal = base.with_changes(
        outcome=text["outcome"],
        statistic=text["statistic"],
        value=value,
        unit=unit.text or None,
        unit_ucum=unit.ucum,
        value_normalized=unit.value_normalized if unit.text else None,
        unit_normalized=unit.unit_normalized if unit.text else None,
        dispersion=dispersion,
        sd=derive_sd(dispersion, n),
        n=n,
        **optional,
    )
    return FormResult(proposal=proposal)


def changed_fields(before: Proposal, after: Proposal) -> dict[str, tuple[object, object]]:
    """The contract fields that differ between two proposals: name -> (before, after)."""
    old, new = before.to_dict(), after.to_dict()
    return {name: (old[name], new[name]) for name in new if old.get(name) != new[name]}
