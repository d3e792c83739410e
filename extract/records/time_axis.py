"""Time-axis columns and rows: "Month | 3 | 6 | 12" labels when values were taken, it is no data.

A column headed by a time unit alone ("Month", "Week", "Day", "Time (months)") whose cells are
small whole numbers is the time axis of the values in the same rows; a body row labelled so is
the time axis of the values in the same columns. Label cells with no digit may stand beside the
whole numbers (a "Month" row that also holds a text cell). Such cells become the ``time_point`` of their
neighbours ("Month 6"), never data points of their own.
"""

from __future__ import annotations

import re

from extract.ingest.document import Table
from extract.records.patterns import clean_label

#: A label that names only a unit of time (optionally "Time (months)", "Follow-up, weeks").
_TIME_UNIT = re.compile(
    r"^(?:(?:time|follow[- ]?up|visit|time point)\s*(?:[(,]\s*)?)?"
    r"(?P<unit>years?|months?|weeks?|days?|hours?|wk|mo|h|d)\s*\)?$",
    re.I,
)
_UNIT_NAME = {"wk": "Week", "mo": "Month", "h": "Hour", "d": "Day"}
#: The largest whole number a time-axis cell holds (weeks of a long trial stay below it).
_MAX_TIME = 240


def time_unit(label: str) -> str | None:
    """The time unit a label names alone, capitalised and singular ("Months" -> "Month")."""
    match = _TIME_UNIT.match(clean_label(label))
    if match is None:
        return None
    word = match["unit"].lower()
    if word in _UNIT_NAME:
        return _UNIT_NAME[word]
    return word.rstrip("s").capitalize() if word.endswith("s") else word.capitalize()


def _small_whole(texts: list[str]) -> bool:
    """True when the filled cells are small whole numbers, or such numbers (two or more) beside
    label cells that hold no digit at all ("Month | 3 | 6 | Follow-up | 12")."""
    filled = [clean_label(t) for t in texts if t.strip()]
    numbers = [t for t in filled if re.fullmatch(r"\d{1,3}", t) and int(t) <= _MAX_TIME]
    labels = [t for t in filled if not re.search(r"\d", t)]
    if len(numbers) + len(labels) != len(filled) or not numbers:
        return False
    return not labels or len(numbers) >= 2


def time_axis_columns(table: Table, labels: list[str]) -> dict[int, str]:
    """{column: time unit} for columns whose header (``labels[col]``) names a time unit and
    whose body cells are small whole numbers."""
    axis: dict[int, str] = {}
    for col in range(1, table.n_cols):
        unit = time_unit(labels[col]) if col < len(labels) else None
        if unit is None:
            continue
        cells = [table.cell(r, col).text for r in range(table.header_rows, table.n_rows)]
        if _small_whole(cells):
            axis[col] = unit
    return axis


def time_axis_rows(table: Table) -> dict[int, str]:
    """{row: time unit} for body rows labelled by a time unit whose cells are small whole
    numbers."""
    axis: dict[int, str] = {}
    for row in range(table.header_rows, table.n_rows):
        unit = time_unit(table.row_label(row))
        if unit is None:
            continue
        if _small_whole([table.cell(row, c).text for c in range(1, table.n_cols)]):
            axis[row] = unit
    return axis
