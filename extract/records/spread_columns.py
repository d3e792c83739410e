"""Spread columns: a column of SDs, SEs or CIs that belongs to the value column beside it.

Tables often print the spread in a column of its own: "Mean | SE" under a group header, or
"Group 1 | Group 1 SD" side by side. Such a column holds no data points; each of its cells is
the dispersion of the value in the same row of its value column (the nearest column to its left
whose header names the same group). :func:`spread_columns` finds these pairs;
:func:`attach_spread_columns` moves the spreads onto the drafts of their values.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from extract.ingest.document import Table
from extract.records.draft import Draft
from extract.records.patterns import clean_label, header_levels, read_cell

#: A header level that ends in a spread word: "SE", "SD", "95% CI", "Group 1 SE".
_SPREAD_LEVEL = re.compile(
    r"^(?P<head>.*?)\s*(?<![\w.])(?P<kind>S\.?D\.?|S\.?E\.?M\.?|S\.?E\.?|standard deviation|"
    r"standard error(?: of the mean)?|IQR|inter-?\s?quartile range|(?:95\s*%\s*)?CI|"
    r"(?:95\s*%\s*)?confidence interval)$",
    re.I,
)


@dataclass(frozen=True)
class SpreadColumn:
    """A column of spreads: its own index, the column of its values and the spread's kind."""

    col: int
    value_col: int
    kind: str


def spread_level(text: str) -> tuple[str, str] | None:
    """The group part and the kind of a header level that names a spread.

    "SE" -> ("", "SEM"); "Group 1 SD" -> ("Group 1", "SD"); "95% CI" -> ("", "CI95");
    None for any other label.
    """
    match = _SPREAD_LEVEL.match(clean_label(text))
    if match is None:
        return None
    word = match["kind"].replace(".", "").replace(" ", "").lower()
    if word in ("sd", "standarddeviation"):
        kind = "SD"
    elif word.startswith("se") or word.startswith("standarderror"):
        kind = "SEM"
    elif word in ("iqr",) or "quartile" in word:
        kind = "IQR"
    else:
        kind = "CI95"
    return match["head"].strip(" ,;:-"), kind


def spread_columns(
    table: Table, *, skip: set[int] | frozenset[int] = frozenset()
) -> list[SpreadColumn]:
    """The columns of ``table`` that hold the spread of a value column, with their pairs.

    A column is a spread column when a header level names only a spread ("SE", "SD", "95% CI")
    or a group and a spread ("Group 1 SE"). Its value column is the nearest column to its left
    that is no spread column and whose header levels include every other level of the spread
    column (the same group header above, or the same group name); with no other level, the
    nearest such column on its left.

    Args:
        table: the table.
        skip: columns that hold no values (p-values, n).

    Returns:
        One :class:`SpreadColumn` per paired column, left to right.
    """
    found: dict[int, tuple[list[str], str]] = {}
    for col in range(1, table.n_cols):
        levels = header_levels(table, col)
        for index in range(len(levels) - 1, -1, -1):
            read = spread_level(levels[index])
            if read is None:
                continue
            others = [lv for i, lv in enumerate(levels) if i != index]
            if read[0]:
                others.append(read[0])
            found[col] = (others, read[1])
            break
    pairs: list[SpreadColumn] = []
    for col, (others, kind) in sorted(found.items()):
        for left in range(col - 1, 0, -1):
            if left in found or left in skip:
                continue
            levels = header_levels(table, left)
            if all(level in levels for level in others):
                pairs.append(SpreadColumn(col, left, kind))
            break
    return pairs


def attach_spread_columns(
    table: Table,
    pairs: list[SpreadColumn],
    drafts: list[Draft],
    at: dict[tuple[int, int], int],
    row: int,
) -> None:
    """Give each value of ``row`` the spread from its spread column (when it has none yet).

    A pair in a column named SD or SE is no spread; nor is a single number in a CI column.
    """
    for pair in pairs:
        index = at.get((row, pair.value_col))
        if index is None or drafts[index].dispersion_value is not None:
            continue
        parsed = read_cell(table.cell(row, pair.col).text)
        if parsed is None:
            continue
        spread = parsed.spread.value if parsed.spread is not None else parsed.value
        if isinstance(spread, tuple) != (pair.kind in ("CI95", "IQR")):
            continue
        drafts[index] = drafts[index].with_found(
            "dispersion", "header", dispersion_value=spread, dispersion_kind=pair.kind
        )
