"""Rules-only tables in a frame of outer rules, rules drawn in pieces, and charts that are no
tables. Built from word positions and rule segments (tests/ingest/layoutmaker.py); a table
framed by outer rules with a rule under its header, and rules drawn as one piece per column,
are common practice in word-processor manuscripts.
"""

from __future__ import annotations

from layoutmaker import row

from extract.ingest.glyphs import Segment
from extract.ingest.layout import words_to_lines
from extract.ingest.table_find import find_rules_only, join_collinear
from extract.ingest.table_place import plausible_tables
from extract.ingest.tables import RawTable, find_ruled

X = [70.0, 220.0, 300.0, 380.0]


def _framed() -> tuple[list, list[Segment]]:
    words = row(
        [("Preference", X[0]), ("Increase", X[1]), ("Decrease", X[2]), ("Total", X[3])], 110
    )
    for i, y in enumerate((126.0, 141.0, 156.0)):
        words += row([(f"Group {i + 1}", X[0]), ("88", X[1]), ("27", X[2]), ("115", X[3])], y)
    segments = [Segment(66, 98, 534, 98), Segment(66, 176, 534, 176)]  # top and bottom
    segments += [Segment(66, 98, 66, 176), Segment(534, 98, 534, 176)]  # the frame's sides
    # the rule under the header drawn in three pieces that meet
    segments += [
        Segment(66, 114, 200, 114),
        Segment(200, 114, 330, 114),
        Segment(330, 114, 534, 114),
    ]
    return words, segments


def test_frame_of_outer_rules_is_no_grid_but_a_rules_table() -> None:
    words, segments = _framed()
    assert find_ruled(words, segments, 1) == []
    (table,) = find_rules_only(words, segments, 1)
    assert table.header_rows == 1
    assert table.rows[0] == ("Preference", "Increase", "Decrease", "Total")
    assert table.rows[1] == ("Group 1", "88", "27", "115")
    assert len(table.rows) == 4


def test_pieces_of_one_rule_are_joined() -> None:
    pieces = [Segment(66, 114, 200, 114), Segment(201.5, 114.4, 534, 114.4)]
    assert join_collinear(pieces) == [Segment(66, 114, 534, 114)]
    apart = [Segment(66, 114, 200, 114), Segment(260, 114, 534, 114)]
    assert len(join_collinear(apart)) == 2


def test_grid_of_bars_under_a_figure_caption_is_not_a_table() -> None:
    caption = words_to_lines(row([("FIGURE 2. Imported cases by country", 60)], 80, bold=True), 1)
    bars = RawTable(
        page=1,
        bbox=(60, 95, 500, 400),
        rows=tuple(("Ethiopia (5) Haiti (15)",) * 6 for _ in range(20)),
        boxes=tuple((None,) * 6 for _ in range(20)),
        header_rows=1,
        style="ruled",
    )
    assert plausible_tables([bars], caption, 800) == []
    # the same grid with its own distinct cells under a "Table 2." caption is kept
    table_caption = words_to_lines(row([("Table 2. Imported cases", 60)], 80, bold=True), 1)
    grid = RawTable(
        page=1,
        bbox=(60, 95, 500, 400),
        rows=tuple(tuple(f"{r}.{c}" for c in range(6)) for r in range(20)),
        boxes=tuple((None,) * 6 for _ in range(20)),
        header_rows=1,
        style="ruled",
    )
    assert plausible_tables([grid], table_caption, 800) == [grid]
    assert plausible_tables([grid], caption, 800) == []
