"""Sample-size columns on small invented tables: "n | Mean (SD)" under each group header gives
the mean its n; "n | %" in a table of counts keeps the n as a count.

Printing each group's n in a column beside its mean (SD) is common practice in trial reports
(CONSORT 2010 item 17a asks for the number analysed with each group's estimate and its
precision; the n there is the denominator of the estimate, not a result of its own). In an
"n (%)" layout the n is the counted number and the percent its share of the group (common
practice for categorical baseline data, CONSORT 2010 item 15).
"""

from __future__ import annotations

from extract.records.assemble import first_pass
from extract.records.n_columns import is_value_level, n_columns
from tests.records._build import make_document, make_table


def _by_cell(proposals):  # type: ignore[no-untyped-def]
    return {(p.source.row, p.source.col): p for p in proposals}


_MEAN_GRID = [
    ["Outcome", "Velmora arm", "Velmora arm", "Usual care", "Usual care"],
    ["", "n", "Mean (SD)", "n", "Mean (SD)"],
    ["Drenwick score", "", "", "", ""],
    ["Baseline", "41", "15.3 (5.3)", "38", "16.6 (5.2)"],
    ["Week 12", "36", "9.4 (6.3)", "35", "12.7 (6.4)"],
]


def test_value_levels() -> None:
    assert is_value_level("Mean (SD)")
    assert is_value_level("Median (IQR)")
    assert is_value_level("Mean")
    assert not is_value_level("%")
    assert not is_value_level("Percent")
    assert not is_value_level("Velmora arm")


def test_n_column_beside_a_mean_pairs_with_it() -> None:
    table = make_table(_MEAN_GRID, header_rows=2)
    assert n_columns(table) == {2: 1, 4: 3}


def test_n_column_beside_a_mean_gives_the_mean_its_n() -> None:
    table = make_table(_MEAN_GRID, header_rows=2)
    proposals = first_pass(make_document([], tables=(table,), name="fixture-n-cols"))
    cells = _by_cell(proposals)
    # the n columns hold no data points of their own
    assert set(cells) == {(3, 2), (3, 4), (4, 2), (4, 4)}
    base, late = cells[(3, 2)], cells[(4, 4)]
    assert (base.value, base.n, base.statistic) == (15.3, 41, "mean")
    assert (base.dispersion.kind, base.dispersion.value) == ("SD", 5.3)
    assert (late.value, late.n) == (12.7, 35)
    # "Mean (SD)" names the statistic, not part of the group
    assert base.group == "Velmora arm"
    assert late.group == "Usual care"


def test_n_column_after_a_median_pairs_on_the_left() -> None:
    grid = [
        ["Outcome", "Velmora arm", "Velmora arm", "Usual care", "Usual care"],
        ["", "Median (IQR)", "n", "Median (IQR)", "n"],
        ["Drenwick score", "12 (9–15)", "40", "14 (10–18)", "37"],
    ]
    table = make_table(grid, header_rows=2)
    assert n_columns(table) == {1: 2, 3: 4}
    cells = _by_cell(first_pass(make_document([], tables=(table,), name="fixture-n-median")))
    assert set(cells) == {(2, 1), (2, 3)}
    assert (cells[(2, 1)].value, cells[(2, 1)].n, cells[(2, 1)].statistic) == (12.0, 40, "median")
    assert cells[(2, 3)].n == 37


def test_n_column_beside_a_percent_stays_a_count() -> None:
    grid = [
        ["Characteristic", "Velmora arm", "Velmora arm", "Usual care", "Usual care"],
        ["", "n", "%", "n", "%"],
        ["Ferrell rash", "12", "29.3", "7", "18.4"],
    ]
    table = make_table(grid, header_rows=2, caption="Table 1. Number of participants by arm")
    assert n_columns(table) == {}
    cells = _by_cell(first_pass(make_document([], tables=(table,), name="fixture-n-pct")))
    count = cells[(2, 1)]
    assert (count.value, count.statistic) == (12.0, "count")
    assert cells[(2, 2)].statistic == "percent"
    assert cells[(2, 3)].value == 7.0 and cells[(2, 3)].statistic == "count"
