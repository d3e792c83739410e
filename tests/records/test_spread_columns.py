"""Spread columns on small invented tables: "Mean | SE" under a group header, "Group 1 |
Group 1 SD" side by side, a CI column beside an estimate, and "SE" rows under "Mean" rows.

Printing the SD, SE or 95% CI in a column (or row) of its own beside the mean is common practice
in trial reports (the Cochrane Handbook 6.5.2 reads such tables: the spread belongs to the mean
of the same group, never a data point of its own).
"""

from __future__ import annotations

from extract.records.assemble import first_pass
from extract.records.spread_columns import spread_columns, spread_level
from tests.records._build import make_document, make_table


def _by_cell(proposals):  # type: ignore[no-untyped-def]
    return {(p.source.row, p.source.col): p for p in proposals}


def test_spread_level_reads_kind_and_group() -> None:
    assert spread_level("SE") == ("", "SEM")
    assert spread_level("Group 1 SD") == ("Group 1", "SD")
    assert spread_level("95% CI") == ("", "CI95")
    assert spread_level("s.e.m.") == ("", "SEM")
    assert spread_level("Mean") is None
    assert spread_level("Vorplex SDF") is None  # a name ending in letters that only look alike


def test_se_column_under_a_group_header_is_the_spread_of_its_mean() -> None:
    grid = [
        ["Model", "Quillan arm", "Quillan arm", "Usual care", "Usual care"],
        ["", "Mean", "SE", "Mean", "SE"],
        ["Trembor score", "9.8", "0.41", "12.3", "0.58"],
    ]
    table = make_table(grid, header_rows=2)
    proposals = first_pass(make_document([], tables=(table,), name="fixture-se-cols"))
    cells = _by_cell(proposals)
    assert set(cells) == {(2, 1), (2, 3)}  # the SE columns are no data points
    quillan, usual = cells[(2, 1)], cells[(2, 3)]
    assert (quillan.value, quillan.dispersion.kind, quillan.dispersion.value) == (9.8, "SEM", 0.41)
    assert (usual.value, usual.dispersion.kind, usual.dispersion.value) == (12.3, "SEM", 0.58)
    assert quillan.statistic == "mean"
    assert "SE" not in (quillan.group or "")


def test_group_sd_column_beside_its_group() -> None:
    grid = [
        ["Outcome", "Arm 1", "Arm 1 SD", "Arm 2", "Arm 2 SD"],
        ["Plorn index", "41.2", "6.3", "38.0", "5.9"],
    ]
    proposals = first_pass(make_document([], tables=(make_table(grid),), name="fixture-sd-cols"))
    assert [(p.group, p.value, p.dispersion.kind, p.dispersion.value) for p in proposals] == [
        ("Arm 1", 41.2, "SD", 6.3),
        ("Arm 2", 38.0, "SD", 5.9),
    ]


def test_ci_column_after_an_se_column_is_not_a_data_point() -> None:
    grid = [
        ["Model", "Difference", "Difference", "Difference"],
        ["", "Mean", "SE", "95% CI"],
        ["Trembor score", "-2.46", "0.636", "-3.72 to -1.21"],
    ]
    table = make_table(grid, header_rows=2)
    pairs = spread_columns(table)
    assert [(p.col, p.value_col, p.kind) for p in pairs] == [(2, 1, "SEM"), (3, 1, "CI95")]
    proposals = first_pass(make_document([], tables=(table,), name="fixture-ci-col"))
    assert len(proposals) == 1
    assert proposals[0].value == -2.46
    assert proposals[0].dispersion.kind == "SEM"  # the first spread beside the value


def test_spread_column_of_another_group_is_not_paired() -> None:
    grid = [
        ["Outcome", "Arm 1", "Arm 2 SD"],
        ["Plorn index", "41.2", "5.9"],
    ]
    assert spread_columns(make_table(grid)) == []


def test_se_row_under_a_mean_row_is_its_spread() -> None:
    grid = [
        ["", "Vehicle", "Zorbitan 5 mg/kg"],
        ["Glimmer count", "", ""],
        ["Mean", "14.2", "9.7"],
        ["SE", "1.1", "0.8"],
    ]
    proposals = first_pass(make_document([], tables=(make_table(grid),), name="fixture-se-row"))
    assert [(p.value, p.dispersion.kind, p.dispersion.value) for p in proposals] == [
        (14.2, "SEM", 1.1),
        (9.7, "SEM", 0.8),
    ]
