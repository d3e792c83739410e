"""Time-axis columns, "n (pct)" cells without a % sign and comparison levels over groups, on
small invented tables (invented compounds and scores).

A column "Month | 3 | 6 | 12" beside the values gives their follow-up time (common practice in
longitudinal trial tables); "n (%)" in a header says each cell is a count with its percentage
of the group (common practice for categorical data, CONSORT 2010 item 15); a level "Change from
baseline" or "Mixed model" under a group names what the value estimates, not who was measured
(CONSORT 2010 item 17a: each group's estimate with its precision).
"""

from __future__ import annotations

from extract.records.assemble import first_pass
from extract.records.pct_cells import says_n_pct
from extract.records.table_labels import comparison_level
from extract.records.time_axis import time_unit
from tests.records._build import make_document, make_table


def _by_cell(proposals):  # type: ignore[no-untyped-def]
    return {(p.source.row, p.source.col): p for p in proposals}


def _run(table, name: str):  # type: ignore[no-untyped-def]
    return _by_cell(first_pass(make_document([], tables=(table,), name=name)))


def test_time_unit_labels() -> None:
    assert time_unit("Month") == "Month"
    assert time_unit("Weeks") == "Week"
    assert time_unit("Time (days)") == "Day"
    assert time_unit("Velmora arm") is None
    assert time_unit("Day 7") is None  # a time point, not an axis


def test_month_column_is_the_time_point_of_its_row() -> None:
    grid = [
        ["Outcome", "Month", "Velmora arm", "Usual care"],
        ["Drenwick score", "3", "12.4 ± 2.1", "13.0 ± 2.4"],
        ["Drenwick score", "6", "10.1 ± 2.0", "12.8 ± 2.2"],
        ["Drenwick score", "12", "9.2 ± 1.8", "12.5 ± 2.5"],
    ]
    cells = _run(make_table(grid, caption="Table 2. Drenwick score (mean ± SD)"), "fx-axis")
    # the month cells are no data points
    assert not any(col == 1 for _, col in cells)
    assert len(cells) == 6
    assert cells[(2, 2)].time_point == "Month 6"
    assert cells[(3, 3)].time_point == "Month 12"
    assert cells[(3, 3)].value == 12.5


def test_week_row_is_the_time_point_of_its_column() -> None:
    grid = [
        ["", "Visit 1", "Visit 2"],
        ["Week", "4", "8"],
        ["Tarsin level (ng/mL)", "3.4 ± 0.6", "2.9 ± 0.5"],
    ]
    cells = _run(make_table(grid), "fx-axis-row")
    assert set(cells) == {(2, 1), (2, 2)}
    assert cells[(2, 2)].time_point == "Week 8"


def test_month_row_with_label_cells_is_still_a_time_axis() -> None:
    # a time-axis row may hold a text cell beside its whole numbers (common practice in
    # follow-up tables: a "Baseline" or "End" visit named in words)
    grid = [
        ["", "Start", "Visit 1", "Visit 2", "Visit 3"],
        ["Month", "Baseline", "3", "6", "12"],
        ["Tarsin level (ng/mL)", "4.0 ± 0.7", "3.4 ± 0.6", "2.9 ± 0.5", "2.5 ± 0.4"],
    ]
    cells = _run(make_table(grid), "fx-axis-mixed")
    assert set(cells) == {(2, 1), (2, 2), (2, 3), (2, 4)}
    assert cells[(2, 3)].time_point == "Month 6"


def test_row_with_one_number_and_labels_is_no_time_axis() -> None:
    grid = [
        ["", "Velmora arm", "Usual care"],
        ["Day", "7", "not done"],
        ["Tarsin level (ng/mL)", "3.4 ± 0.6", "2.9 ± 0.5"],
    ]
    cells = _run(make_table(grid), "fx-axis-one")
    assert (1, 1) in cells  # a lone number beside a text cell is not read as an axis


def test_n_pct_labels() -> None:
    assert says_n_pct("n (%)")
    assert says_n_pct("No. (%)")
    assert says_n_pct("Values are number (percent)")
    assert not says_n_pct("Mean (SD)")


_COUNT_GRID = [
    ["Characteristic", "Velmora arm (n = 200)", "Usual care (n = 180)"],
    ["Prior Quellan fever", "46 (23.0)", "36 (20.0)"],
    ["Daily smoker", "31 (15.5)", "29 (16.1)"],
]


def test_n_pct_header_reads_bracketed_numbers_as_percentages() -> None:
    caption = "Table 1. Baseline characteristics, n (%)"
    cells = _run(make_table(_COUNT_GRID, caption=caption), "fx-npct")
    smoker = cells[(2, 1)]
    assert (smoker.value, smoker.statistic) == (31.0, "count")
    assert smoker.dispersion is None  # the bracket is no spread
    assert smoker.n == 200


def test_without_a_label_a_percentage_shaped_bracket_lowers_confidence() -> None:
    # 100 × 46 / 200 = 23.0 and 100 × 29 / 180 = 16.1 (rounded): the brackets are percentages
    plain = _run(make_table(_COUNT_GRID, caption="Table 1. Baseline characteristics"), "fx-p")
    assert "spread_like_percent" in plain[(1, 1)].flags
    assert "spread_like_percent" in plain[(2, 2)].flags
    # a true mean (SD) whose SD is no share of the group keeps its confidence
    grid = [
        ["Outcome", "Velmora arm (n = 40)", "Usual care (n = 38)"],
        ["Drenwick score", "14 (3.2)", "16 (4.1)"],
    ]
    means = _run(make_table(grid), "fx-mean")
    assert "spread_like_percent" not in means[(1, 1)].flags
    assert means[(1, 1)].confidence > plain[(1, 1)].confidence


def test_comparison_level_split() -> None:
    assert comparison_level("Change from Baseline") == ("", "Change from Baseline")
    assert comparison_level("Usual Care Change from Baseline") == (
        "Usual Care",
        "Change from Baseline",
    )
    assert comparison_level("Mixed model") == ("", "Mixed model")
    assert comparison_level("Mixed") is None  # may be a group ("mixed infection")
    assert comparison_level("Velmora arm") is None


def test_change_from_baseline_level_qualifies_the_outcome_not_the_group() -> None:
    grid = [
        ["Outcome", "Velmora arm", "Usual care"],
        ["", "Change from baseline", "Change from baseline"],
        ["Drenwick score", "-4.1 ± 2.0", "-1.2 ± 2.3"],
    ]
    cells = _run(make_table(grid, header_rows=2), "fx-change")
    assert cells[(2, 1)].group == "Velmora arm"
    assert cells[(2, 2)].group == "Usual care"
    assert cells[(2, 1)].outcome == "Drenwick score, change from baseline"
    assert cells[(2, 1)].value == -4.1


def test_comparison_level_leaves_groups_of_a_table_with_time_rows() -> None:
    grid = [
        ["", "Velmora arm Change from baseline", "Usual care Change from baseline"],
        ["3 mo", "-2.1 ± 1.0", "-0.4 ± 1.1"],
        ["6 mo", "-3.0 ± 1.2", "-0.9 ± 1.0"],
    ]
    caption = "Table 4. Drenwick score by month"
    cells = _run(make_table(grid, caption=caption), "fx-change-rows")
    assert cells[(2, 1)].group == "Velmora arm"
    assert cells[(2, 2)].group == "Usual care"
    assert cells[(2, 2)].time_point == "6 mo"
    assert cells[(2, 2)].outcome.endswith("change from baseline")
