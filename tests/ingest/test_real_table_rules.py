"""Rules for tables as real journals set them, each built from word positions.

Layouts use tests/ingest/layoutmaker.py (7.8 pt type, 0.55 em per character, 0.3 em word
space: common practice for a sans-serif face); the content is invented. Each case is the
general form of a layout seen in a published article (named beside it) and checks the reading
a person gets from the page.
"""

from __future__ import annotations

from layoutmaker import words

from extract.ingest.layout import drop_line_numbers


def test_three_counted_margin_numbers_are_line_numbers() -> None:
    # a double-spaced manuscript page where a table leaves only its three-line caption
    # numbered (as on eLife RP95901 p. 29): 301, 302, 303 count up in one column
    page = []
    for i, text in enumerate(
        [
            "Table 4. Plasma levels of zolmarin in the three dosing arms of the",
            "trial, by sex and by visit, in the whole analysed population",
            "(n=1 204)",
        ]
    ):
        page += words(str(301 + i), 40, 90 + 31 * i, align="right")
        page += words(text, 90, 90 + 31 * i, bold=True)
    kept = [w.text for w in drop_line_numbers(page)]
    assert kept[0] == "Table"
    assert not {"301", "302", "303"} & set(kept)


def test_unordered_margin_numbers_are_kept() -> None:
    # three numbers in the margin that do not count up by one are no line numbering
    page = []
    for i, (num, text) in enumerate([("12", "Alpha beta gamma delta"), ("7", "Epsilon zeta eta")]):
        page += words(num, 40, 90 + 31 * i, align="right")
        page += words(text * 3, 90, 90 + 31 * i)
    page += words("40", 40, 160, align="right") + words("Theta iota kappa " * 3, 90, 160)
    assert {"12", "7", "40"} <= {w.text for w in drop_line_numbers(page)}
