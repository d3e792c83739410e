"""Sample-size columns: an "n" column that gives the n of the value column beside it.

Trial reports often print "n | Mean (SD)" under each group header: the "n" cell is the number of
participants behind the mean in the same row, not a count of its own. An "n" column beside a
"%" or "Percent" column is different: there the n is the counted number and the percent its
share, so it stays a data point. :func:`n_columns` decides from the neighbouring column's
statistic which "n" columns are sample sizes and pairs each with its value column.
"""

from __future__ import annotations

import re

from extract.ingest.document import Table
from extract.records.patterns import clean_label, header_levels
from extract.records.table_labels import stat_row

#: A header level that names only a sample size.
_N_LEVEL = re.compile(r"^(?:n|no\.?|number|sample size)$", re.I)
#: A header level that names a summary of measured values (not a count or a percent).
_VALUE_LEVEL = re.compile(
    r"^(?:mean|means|average|median|geometric mean|mean\s*(?:±|\+/-)\s*(?:SD|SEM|SE)|"
    r"median\s*(?:\(|\[)?\s*(?:IQR|range|Q1\s*[,–-]\s*Q3)\s*(?:\)|\])?)$",
    re.I,
)


def is_value_level(text: str) -> bool:
    """True for a header level that names a summary of measured values ("Mean (SD)", "Median")."""
    label = clean_label(text)
    return bool(_VALUE_LEVEL.match(label)) or stat_row(label) is not None


def _n_split(levels: list[str]) -> list[str] | None:
    """The other levels of a column whose last named level is an n; None for other columns."""
    for index in range(len(levels) - 1, -1, -1):
        if _N_LEVEL.match(levels[index]):
            return [lv for i, lv in enumerate(levels) if i != index]
    return None


def _pairs_with(table: Table, others: list[str], col: int) -> bool:
    """True when ``col`` sits under the same other levels and names a value statistic."""
    if not 0 < col < table.n_cols:
        return False
    levels = header_levels(table, col)
    if _n_split(levels) is not None or not all(level in levels for level in others):
        return False
    rest = [level for level in levels if level not in others]
    return any(is_value_level(level) for level in rest)


def n_columns(table: Table) -> dict[int, int]:
    """The sample-size columns of ``table``, as {value column: its n column}.

    A column is a sample-size column when a header level names only an n ("n", "No.") and a
    column beside it, under the same other levels (the same group header), names a summary of
    measured values ("Mean (SD)", "Mean", "Median (IQR)"). An n beside a "%" column or beside
    nothing of the kind is a count and is left out. When both neighbours qualify, the side that
    every other n column of the table pairs with wins; the right side otherwise ("n | Mean").

    Args:
        table: the table, with its header rows.

    Returns:
        A dict from each value column to the n column beside it (empty when none).
    """
    options: dict[int, list[int]] = {}
    for col in range(1, table.n_cols):
        others = _n_split(header_levels(table, col))
        if others is None:
            continue
        sides = [side for side in (1, -1) if _pairs_with(table, others, col + side)]
        if sides:
            options[col] = sides
    only = {sides[0] for sides in options.values() if len(sides) == 1}
    preferred = only.pop() if len(only) == 1 else 1
    pairs: dict[int, int] = {}
    for col, sides in options.items():
        side = preferred if preferred in sides else sides[0]
        pairs.setdefault(col + side, col)
    return pairs
