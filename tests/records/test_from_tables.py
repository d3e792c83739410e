"""Table cells to proposals: orientation, n and dispersion-kind precedence, non-data cells."""

from __future__ import annotations

import pytest

from extract.records.assemble import first_pass
from extract.records.from_tables import orientation
from tests.records._build import make_document, make_table

GROUPS_IN_COLUMNS = [
    ["", "Vehicle (n = 9)", "TLV 10 mg/kg (n = 8)", "P value"],
    ["Body mass (g)", "24.1 ± 1.3", "22.0 ± 1.1", "0.03"],
    ["Creatinine, mg/dL", "0.42 ± 0.06", "0.31 ± 0.05", "<0.001"],
]
GROUPS_IN_ROWS = [
    ["Group", "n", "Body mass (g)", "Liver mass (g)"],
    ["Vehicle", "10", "24.1 (1.3)", "1.24 (0.11)"],
    ["Quorvalin 30 mg/kg", "9", "22.0 (1.1)", "1.10 (0.09)"],
]


def test_orientation_from_headers() -> None:
    assert orientation(make_table(GROUPS_IN_COLUMNS)) == "groups-in-columns"
    assert orientation(make_table(GROUPS_IN_ROWS)) == "groups-in-rows"


def test_groups_in_columns_cells() -> None:
    table = make_table(GROUPS_IN_COLUMNS, caption="Table 1. Outcomes. Values are mean ± SEM.")
    proposals = first_pass(make_document(tables=(table,)))
    # Header cells, row labels and the p-value column are not data points.
    assert [(p.source.row, p.source.col) for p in proposals] == [(1, 1), (1, 2), (2, 1), (2, 2)]
    first = proposals[0]
    assert (first.outcome, first.group, first.unit, first.n) == ("Body mass", "Vehicle", "g", 9)
    assert first.dispersion is not None and first.dispersion.kind == "SEM"
    assert first.source.table == "Table 1" and first.source.quote == "24.1 ± 1.3"
    assert first.source.bbox == (60.0, 12.0, 110.0, 22.0)
    assert proposals[2].unit == "mg/dL"


def test_groups_in_rows_with_n_column() -> None:
    table = make_table(GROUPS_IN_ROWS, caption="Table 2. Masses; mean (SD).")
    proposals = first_pass(make_document(tables=(table,)))
    # The "n" column is not a data point; it gives each row's group its n.
    assert [p.value for p in proposals] == [24.1, 1.24, 22.0, 1.10]
    assert [p.n for p in proposals] == [10, 10, 9, 9]
    assert proposals[2].group == "Quorvalin 30 mg/kg" and proposals[2].outcome == "Body mass"
    assert all(p.dispersion is not None and p.dispersion.kind == "SD" for p in proposals)


def test_n_row_beats_header_and_footnote() -> None:
    grid = [
        ["", "Vehicle (n = 9)", "Talvorin"],
        ["n", "8", "7"],
        ["Grip strength (gf)", "98.2 ± 4.5", "91.0 ± 5.0"],
    ]
    table = make_table(grid, footnotes=("n = 6 per group.",))
    proposals = first_pass(make_document(tables=(table,)))
    assert [p.n for p in proposals] == [8, 7]


def test_n_from_header_then_footnote_then_methods() -> None:
    grid = [["", "Vehicle (n = 9)", "Talvorin"], ["Grip strength (gf)", "98.2 ± 4.5", "91.0 ± 5.0"]]
    with_footnote = make_table(grid, footnotes=("Mean ± SD; n = 6 per group.",))
    proposals = first_pass(make_document(tables=(with_footnote,)))
    assert [p.n for p in proposals] == [9, 6]
    bare = make_table(grid)
    methods = [("methods", "Data are mean ± SEM. Twelve mice per group were studied.")]
    proposals = first_pass(make_document(methods, tables=(bare,)))
    assert [p.n for p in proposals] == [9, 12]
    assert proposals[1].flags.count("n_from_methods") == 1
    assert "n_from_methods" not in proposals[0].flags


@pytest.mark.parametrize(
    ("header", "caption", "methods", "kind"),
    [
        ("Vehicle, mean (SEM)", "Values are mean ± SD.", "Data are mean ± SD.", "SEM"),
        ("Vehicle", "Values are mean ± SD.", "Data are mean ± SEM.", "SD"),
        ("Vehicle", "Body mass.", "Data are mean ± SEM.", "SEM"),
    ],
)
def test_dispersion_kind_precedence(header: str, caption: str, methods: str, kind: str) -> None:
    # Nearest source wins: header > caption/footnote > methods statement.
    table = make_table([["", header], ["Body mass (g)", "24.1 (1.3)"]], caption=caption)
    (proposal,) = first_pass(make_document([("methods", methods)], tables=(table,)))
    assert proposal.dispersion is not None and proposal.dispersion.kind == kind


def test_median_with_interval_is_iqr_from_caption() -> None:
    table = make_table(
        [["", "Vehicle", "Talvorin"], ["Fatigue score", "4 (3–5)", "2 (1–3)"]],
        caption="Table 3. Scores, median (IQR).",
    )
    proposals = first_pass(make_document(tables=(table,)))
    assert [(p.statistic, p.dispersion.kind if p.dispersion else None) for p in proposals] == [
        ("median", "IQR"),
        ("median", "IQR"),
    ]
    assert all(p.sd is None for p in proposals)


def test_column_units_from_ingest_are_used() -> None:
    table = make_table(GROUPS_IN_ROWS, column_units=(None, None, "kg", "g"))
    proposals = first_pass(make_document(tables=(table,)))
    assert [p.unit for p in proposals[:2]] == ["kg", "g"]


def test_time_point_header_level() -> None:
    grid = [
        ["", "Vehicle", "Vehicle"],
        ["", "Week 4", "Week 8"],
        ["Liver mass (g)", "1.20 ± 0.10", "1.31 ± 0.12"],
    ]
    proposals = first_pass(make_document(tables=(make_table(grid, header_rows=2),)))
    assert [(p.group, p.time_point) for p in proposals] == [
        ("Vehicle", "Week 4"),
        ("Vehicle", "Week 8"),
    ]
