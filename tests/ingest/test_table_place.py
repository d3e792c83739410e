"""Unruled tables under their captions: caption lines, header rows and group rows.

Built from word positions (tests/ingest/layoutmaker.py) as a double-spaced manuscript sets a
table: a bold caption whose lines are 2 line heights apart, a bold header, group names and
text values ("Reference") in plain type under it (common practice in journal tables).
"""

from __future__ import annotations

from layoutmaker import row, words

from extract.ingest.layout import RawBlock, words_to_lines
from extract.ingest.table_place import join_caption_lines
from extract.ingest.table_text import guessed_header_end, rows_of, table_from_text

X = [60.0, 230.0, 320.0]


def _table_words() -> list:
    lines = row([("Outcome", X[0]), ("HR (95% CI)", X[1]), ("P value", X[2])], 100, bold=True)
    lines += words("Myocardial infarction", X[0], 124)
    lines += row([("Age ≥60 years", X[0] + 8), ("Reference", X[1]), ("–", X[2])], 148)
    lines += row(
        [("Age 50-59 years", X[0] + 8), ("1.05 (0.78 to 1.40)", X[1]), ("0.750", X[2])], 172
    )
    lines += words("Heart failure", X[0], 196)
    lines += row([("Age ≥60 years", X[0] + 8), ("Reference", X[1]), ("–", X[2])], 220)
    lines += row(
        [("Age 50-59 years", X[0] + 8), ("1.24 (1.12 to 1.27)", X[1]), ("0.001", X[2])], 244
    )
    return lines


def test_plain_rows_under_a_bold_header_are_body_rows() -> None:
    lines = rows_of(_table_words())
    # the first row of numbers is the fourth line; only the bold line above it is the header
    assert guessed_header_end(lines, 3) == 1
    table = table_from_text(
        _table_words(), (55, 90, 360, 246), 1, style="unruled", header_bottom=None
    )
    assert table is not None and table.header_rows == 1
    assert table.rows[1] == ("Myocardial infarction", "", "")
    assert table.rows[2] == ("Age ≥60 years", "Reference", "–")


def test_plain_group_name_above_the_first_number_row_is_a_body_row() -> None:
    # no bold anywhere: a lone label at the labels' left edge right above the numbers
    lines = row([("Outcome", X[0]), ("HR (95% CI)", X[1]), ("P value", X[2])], 100)
    lines += words("Heart failure", X[0], 124)
    lines += row([("Model 1", X[0]), ("1.24 (1.12 to 1.27)", X[1]), ("0.001", X[2])], 148)
    lines += row([("Model 2", X[0]), ("1.20 (1.09 to 1.33)", X[1]), ("0.001", X[2])], 172)
    assert guessed_header_end(rows_of(lines), 2) == 1


def test_header_of_two_bold_lines_keeps_both() -> None:
    lines = words("HR (95% CI)", X[1], 90, bold=True, align="centre")
    lines += row(
        [("Outcome", X[0]), ("Cases vs. controls", X[1]), ("P value", X[2])], 104, bold=True
    )
    lines += row([("Model 1", X[0]), ("1.24 (1.12 to 1.27)", X[1]), ("0.001", X[2])], 120)
    lines += row([("Model 2", X[0]), ("1.20 (1.09 to 1.33)", X[1]), ("0.001", X[2])], 134)
    assert guessed_header_end(rows_of(lines), 2) == 2


def _blocks(*parts: tuple[str, float, bool]) -> list[RawBlock]:
    return [
        RawBlock(tuple(words_to_lines(words(text, X[0], y, bold=bold), 1)), 0)
        for text, y, bold in parts
    ]


def test_last_caption_line_set_apart_is_joined_to_the_caption() -> None:
    blocks = _blocks(
        ("Table 2. Associations of the marker with incident heart", 80, True),
        ("failure (n=2 277)", 96, True),
        ("Outcome", 120, True),
    )
    # the header line under it keeps the table's own (wider) pitch
    joined = join_caption_lines(blocks)
    assert [b.text for b in joined] == [
        "Table 2. Associations of the marker with incident heart failure (n=2 277)",
        "Outcome",
    ]


def test_caption_ending_with_a_full_stop_takes_no_more_lines() -> None:
    blocks = _blocks(("Table 2. Associations with heart failure.", 80, True), ("Outcome", 96, True))
    assert len(join_caption_lines(blocks)) == 2
