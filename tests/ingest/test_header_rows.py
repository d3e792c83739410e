"""Header rows of ruled grids: group labels that hold a dose are labels, not values."""

from __future__ import annotations

import pytest

from extract.ingest.tables import _header_rows_from_spans, _is_data_row


@pytest.mark.parametrize(
    ("row", "is_data"),
    [
        (("Day", "Vehicle", "KX 1 mg/kg", "KX 5 mg/kg", "KX 25 mg/kg"), False),
        (("Day 0", "310.2 ± 18.0", "310.7 ± 19.5", "307.9 ± 16.7"), True),
        (("Marker", "<0.001", "0.42", "n.d."), True),
        (("Outcome", "Week 4", "Week 8", "Week 12"), False),
        (("Change", "−0.8 ± 0.2", "−1.1 ± 0.3", ""), True),
    ],
)
def test_value_cells_open_with_their_number(row: tuple[str, ...], is_data: bool) -> None:
    # common practice: a table cell that reports a value starts with it; a group label may
    # carry a dose or a week number inside it and is still a label
    assert _is_data_row(row) is is_data


def test_spanning_header_over_dose_groups_gives_two_header_rows() -> None:
    rows = (
        ("Day", "Body mass (g)", "Body mass (g)", "Body mass (g)"),
        ("Day", "Vehicle", "KX 1 mg/kg", "KX 5 mg/kg"),
        ("Day 0", "310.2 ± 18.0", "310.7 ± 19.5", "307.9 ± 16.7"),
        ("Day 2", "309.8 ± 17.3", "312.2 ± 17.5", "309.3 ± 16.5"),
    )
    # "Day" spans the two header rows; "Body mass (g)" spans the three group columns
    owner = [
        [(0, 0), (0, 1), (0, 1), (0, 1)],
        [(0, 0), (1, 1), (1, 2), (1, 3)],
        [(2, 0), (2, 1), (2, 2), (2, 3)],
        [(3, 0), (3, 1), (3, 2), (3, 3)],
    ]
    assert _header_rows_from_spans(owner, 4, 4, rows) == 2
