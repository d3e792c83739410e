"""Value ranges, labels set over several lines between row rules, header rules in pieces.

Built from word positions and rule segments (tests/ingest/layoutmaker.py: 7.8 pt type,
0.55 em per character, 0.3 em word space, common practice for a sans-serif face); the content is
invented. Each layout is the general form of one seen in a published article (Cadernos Saúde
Coletiva 31030043, Tables 1 and 4: decimal commas, "5,0 - 8,5" intervals, rules under every
row, row labels centred over two or three lines, group labels over touching rule pieces).
"""

from __future__ import annotations

import re
from pathlib import Path

import pytest
from layoutmaker import row, words

from extract.ingest import read_document
from extract.ingest.glyphs import Segment
from extract.ingest.table_find import find_rules_only
from extract.ingest.table_rows import join_ranges, rule_under
from extract.ingest.table_text import cells_of

LEFT, RIGHT = 60.0, 540.0


def _rule(y: float, x0: float = LEFT, x1: float = RIGHT) -> Segment:
    return Segment(x0, y, x1, y)


def _banded() -> tuple[list, list[Segment]]:
    # two group labels whose rules are drawn one piece per column and meet end to end
    out = words("Arm Q", 260, 72, bold=True, align="centre")
    out += words("Arm R", 440, 72, bold=True, align="centre")
    out += row([("Feature", 70), ("%", 230), ("CI", 290), ("%", 410), ("CI", 470)], 92, bold=True)
    out += row(
        [("Total", 70), ("5,1", 230), ("4,0", 276), ("-", 290), ("6,5", 304)]
        + [("7,0", 410), ("6,0", 456), ("-", 470), ("8,0", 484)],
        112,
    )
    # a row label centred over two lines, its values on the line between them
    out += words("Lower", 70, 130) + words("grade", 70, 142)
    out += row(
        [("", 70), ("3,3", 230), ("1,9", 276), ("-", 290), ("5,6", 304)]
        + [("9,9", 410), ("8,8", 456), ("-", 470), ("11,2", 484)],
        136,
    )
    out = [w for w in out if w.text]
    segments = [_rule(y) for y in (60, 100, 120, 150)]
    segments += [_rule(76, a, a + 60) for a in (200, 260, 320, 380, 440)]
    return out, segments


def test_spaced_range_is_one_cell_and_label_lines_join_their_row() -> None:
    found, segments = _banded()
    (table,) = find_rules_only(found, segments, 1)
    assert table.header_rows == 2
    assert table.rows[0] == ("", "Arm Q", "Arm Q", "Arm R", "Arm R")
    assert table.rows[1] == ("Feature", "%", "CI", "%", "CI")
    assert table.rows[2] == ("Total", "5,1", "4,0 - 6,5", "7,0", "6,0 - 8,0")
    assert table.rows[3] == ("Lower grade", "3,3", "1,9 - 5,6", "9,9", "8,8 - 11,2")
    assert len(table.rows) == 4


def test_dash_in_a_column_of_values_is_a_missing_value() -> None:
    # "-" for a missing value sits where other rows hold numbers: three cells stay three
    first = cells_of(row([("A", 70), ("1,0", 230), ("-", 290), ("2,0", 350)], 100))
    second = cells_of(row([("B", 70), ("1,5", 230), ("3,1", 290), ("2,5", 350)], 112))
    joined = join_ranges([first, second])
    assert [" ".join(w.text for w in c) for c in joined[0]] == ["A", "1,0", "-", "2,0"]


def test_rule_pieces_are_cut_to_the_run_centred_on_the_label() -> None:
    pieces = [_rule(76, a, a + 60) for a in (200, 260, 320, 380, 440)]
    assert rule_under(248, 272, pieces) == (200, 320)
    assert rule_under(428, 452, pieces) == (380, 500)


def test_labelled_row_with_a_long_label_does_not_end_the_table() -> None:
    # a question-like row label of nine words beside its values reads as a row, not as a
    # line of running text between two rules (which would end the table there)
    out = row([("Item", 70), ("%", 420), ("CI", 490)], 72, bold=True)
    for i, y in enumerate((92, 112, 132)):
        label = "Was the patient told about the risks of the drug" if i == 1 else f"Item {i}"
        out += row([(label, 70), ("12,5", 420), ("9,0", 476), ("-", 490), ("15,1", 506)], y)
    segments = [_rule(y) for y in (60, 80, 100, 120, 140)]
    (table,) = find_rules_only(out, segments, 1)
    assert len(table.rows) == 4
    assert table.rows[2] == (
        "Was the patient told about the risks of the drug",
        "12,5",
        "9,0 - 15,1",
    )


# --- the real corpus (structure only) ----------------------------------------------------------
# csc-31030043: Cadernos Saúde Coletiva, CC BY (SOURCES.md in the corpus folder).

_RANGE = re.compile(r"^\d+,\d - \d+,\d$")


@pytest.fixture(scope="module")
def csc_tables(corpus_dir: Path) -> dict:
    return {t.label: t for t in read_document(corpus_dir / "csc-31030043.pdf").tables}


@pytest.mark.corpus
def test_corpus_two_level_header_and_ranges(csc_tables: dict) -> None:
    table = csc_tables["Table 1"]
    assert table.n_cols == 5 and table.header_rows == 2
    grid = table.grid()
    assert grid[0][1] == grid[0][2] != grid[0][3] == grid[0][4] != ""
    body = grid[2:]
    valued = [r for r in body if r[1]]
    assert len(valued) >= 15 and all(_RANGE.match(r[2]) and _RANGE.match(r[4]) for r in valued)
    # a label set over several lines is one row: no row of values without its label
    assert all(r[0] for r in valued)


@pytest.mark.corpus
def test_corpus_last_rows_stay_in_their_table(csc_tables: dict) -> None:
    assert sorted(csc_tables) == ["Table 1", "Table 2", "Table 3", "Table 4"]
    table = csc_tables["Table 4"]
    body = table.grid()[table.header_rows :]
    assert len(body) == 4 and all(all(cell for cell in r) for r in body)
    assert all(_RANGE.match(r[-1]) for r in body)
