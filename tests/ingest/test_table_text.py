"""Table grids from word geometry: cells, columns, header rows, runs of rows.

Each case lays words out as a typesetter would (left-aligned labels, centred values, header cells
centred vertically in their row, 7.8 pt type with a 9.4 pt leading and 2.2 pt cell padding, as in
the fixture generator's tables) and checks the grid a person reads off that layout. Word widths
use 0.55 em per character and a 0.3 em word space (common practice for a sans-serif face).
"""

from __future__ import annotations

from extract.ingest.table_find import find_unruled
from extract.ingest.table_text import cells_of, column_bounds, rows_of, table_from_text
from extract.ingest.words import RawWord

SIZE = 7.8
EM = 0.55 * SIZE
SPACE = 0.3 * SIZE


def words(
    text: str, x: float, baseline: float, *, bold: bool = False, align: str = "left"
) -> list[RawWord]:
    """The words of ``text`` set from ``x`` (or centred on it) on ``baseline``."""
    out = []
    parts = text.split()
    width = sum(len(p) * EM for p in parts) + SPACE * (len(parts) - 1)
    cursor = x - width / 2 if align == "centre" else x
    for part in parts:
        w = len(part) * EM
        out.append(RawWord(part, cursor, baseline - SIZE, cursor + w, baseline, SIZE, bold, True))
        cursor += w + SPACE
    return out


def test_label_close_to_value_is_its_own_column() -> None:
    # a long row label ending 5 pt before the value: wider than a word space, so two cells
    row = words("Symptom duration (months)", 60, 100) + words(
        "20 (15–28)", 60 + 25 * EM + 2 * SPACE + 5, 100
    )
    assert [" ".join(w.text for w in c) for c in cells_of(row)] == [
        "Symptom duration (months)",
        "20 (15–28)",
    ]


def test_justified_prose_stays_one_cell() -> None:
    # equal stretched spaces (0.6 em) between all words of a justified line
    row, x = [], 60.0
    for part in "the mice were housed in pairs for eight weeks".split():
        row.append(RawWord(part, x, 92, x + len(part) * EM, 100, SIZE, False, True))
        x += len(part) * EM + 0.6 * SIZE
    assert len(cells_of(row)) == 1


def test_long_label_reaching_into_a_value_range_keeps_columns() -> None:
    # row 2's label ends inside the x-range of row 1's centred value
    rows = [
        [words("Change, mean", 60, 100), words("−1.1 [−2.3 to 0.0]", 215, 100, align="centre")],
        [
            words("Systolic pressure (mmHg), mean", 60, 114),
            words("136 [132–140]", 215, 114, align="centre"),
        ],
        [words("Responders, n (%)", 60, 128), words("15 (15.6%)", 215, 128, align="centre")],
    ]
    cells = [[c for c in row] for row in rows]
    bounds = column_bounds(cells)
    assert len(bounds) == 2
    assert bounds[0][1] > bounds[1][0]  # the ranges overlap, the columns stay apart


def _two_row_header_table() -> list[RawWord]:
    # "Dose" spans two value columns on an upper header row; "Group" is centred over both rows
    upper, lower = 100.0, 100.0 + 9.4 + 4.4
    mid = (upper + lower) / 2
    out = words("Group", 60, mid, bold=True)
    out += words("Vehicle", 200, mid, bold=True, align="centre")
    out += words("Dose", 280, upper, bold=True)
    out += words("10 mg", 300, lower, bold=True, align="centre")
    out += words("30 mg", 400, lower, bold=True, align="centre")
    for i, (label, values) in enumerate(
        [("Week 1", ("4.1", "4.4", "4.9")), ("Week 2", ("4.0", "4.6", "5.2"))]
    ):
        y = lower + 14 * (i + 1)
        out += words(label, 60, y)
        for x, value in zip((200, 300, 400), values, strict=True):
            out += words(value, x, y, align="centre")
    return out


def test_header_cell_centred_over_two_rows_spans_both() -> None:
    table = table_from_text(
        _two_row_header_table(), (50, 80, 460, 170), 1, style="unruled", header_bottom=None
    )
    assert table is not None
    assert table.header_rows == 2
    assert table.rows[:2] == (
        ("Group", "Vehicle", "Dose", "Dose"),
        ("Group", "Vehicle", "10 mg", "30 mg"),
    )
    assert table.rows[2:] == (("Week 1", "4.1", "4.4", "4.9"), ("Week 2", "4.0", "4.6", "5.2"))


def test_wrapped_header_cell_is_one_row() -> None:
    # "Plasma glucose (mmol/L)" wraps at the leading (9.4 pt); "Group" is centred beside it
    top = 100.0
    out = words("Plasma glucose", 300, top, bold=True, align="centre")
    out += words("(mmol/L)", 300, top + 9.4, bold=True, align="centre")
    out += words("Group", 60, top + 4.7, bold=True)
    for i, (label, value) in enumerate([("Vehicle", "8.6 ± 0.4"), ("Treated", "9.0 ± 0.4")]):
        y = top + 9.4 + 14 * (i + 1)
        out += words(label, 60, y) + words(value, 300, y, align="centre")
    table = table_from_text(out, (50, 80, 460, 150), 1, style="unruled", header_bottom=None)
    assert table is not None
    assert table.header_rows == 1
    assert table.rows[0] == ("Group", "Plasma glucose (mmol/L)")


def test_unruled_table_stops_at_footnote() -> None:
    out = _two_row_header_table()
    # a footnote set 6 pt left of the first column, in smaller type
    out += [w._replace(size=7.5) for w in words("Values are mean ± SD.", 54, 170)]
    table = find_unruled(out, 1, caption_bottom=85, x0=40, x1=500, limit=800)
    assert table is not None
    assert [row[0] for row in table.rows] == ["Group", "Group", "Week 1", "Week 2"]


def test_rows_of_keeps_centred_header_apart_from_wrapped_lines() -> None:
    # a cell centred between two header lines sits 4.7 pt from each baseline: its own line
    out = words("A", 60, 100) + words("B", 60, 104.7) + words("C", 60, 109.4)
    assert [[w.text for w in row] for row in rows_of(out)] == [["A"], ["B"], ["C"]]


def test_label_set_a_word_space_from_its_value_is_split_by_the_columns() -> None:
    # the last row's long label ends one word space before its value, centred in the value
    # column as on the other rows: on its own line it reads as one cell with the value
    y_last = 130.0
    glued = words("Plasma quorin after eight weeks (ng/mL)", 60, y_last)
    width = 7 * EM + 2 * SPACE  # "7.4 ± 1.9", as wide as every value below
    centre = glued[-1].x1 + SPACE + width / 2
    lines = words("Characteristic", 60, 90, bold=True)
    lines += words("Vehicle", centre, 90, bold=True, align="centre")
    lines += words("Dose", centre + 70, 90, bold=True, align="centre")
    body = [("Age (weeks)", "8.1 ± 0.4", "8.0 ± 0.5"), ("Body mass (g)", "4.1 ± 0.3", "3.8 ± 0.2")]
    y = 104.0
    for label, a, b in body:
        lines += words(label, 60, y) + words(a, centre, y, align="centre")
        lines += words(b, centre + 70, y, align="centre")
        y += 13
    value = words("7.4 ± 1.9", centre, y_last, align="centre")
    assert abs(value[0].x0 - glued[-1].x1 - SPACE) < 0.01
    lines += glued + value + words("9.7 ± 1.4", centre + 70, y_last, align="centre")
    assert [len(cells_of(r)) for r in rows_of(lines)][-1] == 2  # label and value glued
    table = table_from_text(lines, (55, 80, 400, 132), 1, style="unruled", header_bottom=None)
    assert table is not None
    assert table.rows[-1] == ("Plasma quorin after eight weeks (ng/mL)", "7.4 ± 1.9", "9.7 ± 1.4")
    assert table.rows[1] == ("Age (weeks)", "8.1 ± 0.4", "8.0 ± 0.5")


def test_label_word_inside_a_number_column_stays_with_the_label() -> None:
    # a label's last word lies inside a column of numbers, a word space after the rest of the
    # label: a word, not a number, so it is no value of that column
    label = words("Triglyceride level total", 60, 130)
    centre = (label[-1].x0 + label[-1].x1) / 2
    lines = words("Outcome", 60, 90, bold=True) + words(
        "Mean", centre, 90, bold=True, align="centre"
    )
    lines += words("Glucose", 60, 104) + words("123.45", centre, 104, align="centre")
    lines += words("Insulin", 60, 117) + words("101.25", centre, 117, align="centre")
    lines += label
    table = table_from_text(lines, (55, 80, 340, 132), 1, style="unruled", header_bottom=None)
    assert table is not None
    assert table.rows[-1] == ("Triglyceride level total", "")
