"""Tables continued on the next page: merged, the repeated header dropped.

Built from word positions (tests/ingest/layoutmaker.py): a two-row header (group names over
arm names) set between a top rule and a header rule, as a rules-only table prints it; a
continued table repeats its header at the top of the next page (common practice in journal
typesetting).
"""

from __future__ import annotations

from layoutmaker import SIZE, row

from extract.ingest.table_link import merge_tables, repeats_header
from extract.ingest.table_text import table_from_text
from extract.ingest.tables import RawTable

XS = [60.0, 200.0, 250.0, 300.0, 350.0]
GROUPS = [("Outcome", XS[0]), ("Week 4", 225.0), ("Week 8", 325.0)]
ARMS = [("Vehicle", XS[1]), ("Dose", XS[2]), ("Vehicle", XS[3]), ("Dose", XS[4])]


def _page(page: int, top: float, first: int, count: int, header_pitch: float) -> RawTable:
    lines = row(GROUPS, top, bold=True) + row(ARMS, top + header_pitch, bold=True)
    y = top + header_pitch + 16
    for i in range(first, first + count):
        cells = [(f"Marker {i}", XS[0])] + [(f"{i}.{c}", x) for c, x in enumerate(XS[1:], 1)]
        lines += row(cells, y)
        y += 13
    table = table_from_text(
        lines,
        (55.0, top - SIZE - 3, 380.0, y),
        page,
        style="rules",
        header_bottom=top + header_pitch + 3,
    )
    assert table is not None
    return table


def test_repeated_header_read_as_one_wrapped_row_is_dropped() -> None:
    # page 1: header rows 14 pt apart (two rows); page 2: the same header 9 pt apart, under the
    # 1.4 em a wrapped cell allows, so it reads as one row of wrapped cells there
    first = _page(1, 100.0, 1, 5, 14.0)
    second = _page(2, 60.0, 6, 4, 9.0)
    assert first.header_rows == 2 and second.header_rows == 1
    assert second.rows[0][1] == "Week 4 Vehicle"
    (table,) = merge_tables(
        [(first, "Table 1", "Markers", [], False), (second, "", "", [], False)], []
    )
    grid = table.grid()
    assert table.pages == (1, 2)
    assert table.header_rows == 2
    assert [r[0] for r in grid[2:]] == [f"Marker {i}" for i in range(1, 10)]


def test_header_row_left_in_the_body_of_a_continuation_is_dropped() -> None:
    # the continuation's header rule taken under its first header row only: the second
    # header row ("Vehicle Dose ...") reads as a body row there
    first = _page(1, 100.0, 1, 3, 14.0)
    lines = row(GROUPS, 60.0, bold=True) + row(ARMS, 74.0, bold=True)
    lines += row([("Marker 4", XS[0])] + [(f"4.{c}", x) for c, x in enumerate(XS[1:], 1)], 90.0)
    lines += row([("Marker 5", XS[0])] + [(f"5.{c}", x) for c, x in enumerate(XS[1:], 1)], 103.0)
    second = table_from_text(
        lines, (55.0, 50.0, 380.0, 106.0), 2, style="rules", header_bottom=63.0
    )
    assert second is not None and second.header_rows == 1
    (table,) = merge_tables(
        [(first, "Table 1", "Markers", [], False), (second, "Table 1", "", [], True)], []
    )
    assert [r[0] for r in table.grid()[2:]] == [
        "Marker 1",
        "Marker 2",
        "Marker 3",
        "Marker 4",
        "Marker 5",
    ]


def test_body_rows_are_not_taken_for_a_header() -> None:
    header = [("Outcome", "Week 4", "Week 4"), ("Outcome", "Vehicle", "Dose")]
    assert not repeats_header(("Vehicle", "", ""), header)  # a group-name row
    assert not repeats_header(("Marker 1", "Vehicle", "Dose"), header)
    assert not repeats_header(("", "", ""), header)
    assert repeats_header(("Outcome", "Vehicle", "Dose"), header)
