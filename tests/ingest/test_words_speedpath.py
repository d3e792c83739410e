"""Word grouping on arrays against pdfplumber's own ``WordExtractor`` on awkward characters.

External reference: pdfplumber 0.11 ``pdfplumber.utils.text.WordExtractor`` with its defaults
(``x_tolerance=3``, ``y_tolerance=3``, ligatures expanded). The same characters go to both; words
(text and box) must come out identical, in the same order. The characters are drawn at random
(seeded) around the edges of the rules: gaps near the tolerance, lines whose tops drift within
and beyond it, ties and back-steps in ``x0``, spaces of several kinds, ligature glyphs and runs of
rotated text.
"""

from __future__ import annotations

import random

import pytest
from pdfplumber.utils.text import WordExtractor

from extract.ingest.glyphs import Char, PageChars
from extract.ingest.words import chars_to_words

LETTERS = "abcdefghijklmnopqrstuvwxyz0123456789±µ×–"
SPACES = (" ", "\u00a0", "\t")
LIGATURE_GLYPHS = ("\ufb01", "\ufb02", "\ufb00", "\ufb03")


def _random_chars(seed: int, count: int = 400) -> list[Char]:
    rng = random.Random(seed)
    chars: list[Char] = []
    x, line_top = 50.0, 70.0
    upright = True
    for _ in range(count):
        roll = rng.random()
        if roll < 0.05:
            # a new line: sometimes within the y tolerance of the last one
            line_top += rng.choice((2.0, 2.9, 3.0, 3.1, 12.0, 14.5))
            x = 50.0 + rng.choice((0.0, 0.0, 200.0))
        elif roll < 0.07:
            upright = not upright
        top = line_top + rng.choice((0.0, 0.0, 0.0, 0.4, -0.4, 2.5, 3.5))
        width = rng.choice((4.0, 5.5, 6.1))
        pick = rng.random()
        if pick < 0.12:
            text = rng.choice(SPACES)
        elif pick < 0.16:
            text = rng.choice(LIGATURE_GLYPHS)
        else:
            text = rng.choice(LETTERS)
        size = rng.choice((9.0, 10.0, 12.0))
        chars.append(Char(text, x, top, x + width, top + size, size, rng.random() < 0.2, upright))
        # the next start: touching, a gap near x_tolerance, a tie, or a step back
        x += width + rng.choice((0.0, 0.0, 0.0, 0.5, 2.9, 3.0, 3.1, 8.0, -width, -width - 1.0))
    return chars


def _as_dict(char: Char) -> dict[str, object]:
    return {
        "text": char.text,
        "x0": char.x0,
        "x1": char.x1,
        "top": char.top,
        "doctop": char.top,
        "bottom": char.bottom,
        "height": char.bottom - char.top,
        "width": char.x1 - char.x0,
        "upright": char.upright,
        "size": char.size,
    }


def _plumber_words(chars: list[Char]) -> list[tuple[str, float, float, float, float]]:
    words = WordExtractor(x_tolerance=3, y_tolerance=3).extract_words([_as_dict(c) for c in chars])
    return [(w["text"], w["x0"], w["top"], w["x1"], w["bottom"]) for w in words]


@pytest.mark.parametrize("seed", range(12))
def test_words_equal_pdfplumber_word_extractor(seed: int) -> None:
    # reference: pdfplumber 0.11 WordExtractor defaults, on the very same characters
    chars = _random_chars(seed)
    ours = [(w.text, w.x0, w.top, w.x1, w.bottom) for w in chars_to_words(chars)]
    assert ours == _plumber_words(chars)


def test_columns_give_the_same_words_as_a_list() -> None:
    # reference: pdfplumber 0.11 WordExtractor; a PageChars and a list of the same characters
    chars = _random_chars(99)
    columns = PageChars.of(chars)
    expected = _plumber_words(chars)
    assert [(w.text, w.x0, w.top, w.x1, w.bottom) for w in chars_to_words(columns)] == expected


def test_ligatures_expanded_and_first_char_style_kept() -> None:
    # reference: pdfplumber's expand_ligatures default ("\ufb01" -> "fi"); common practice that
    # a word takes its first character's size and weight
    chars = [
        Char("\ufb01", 10.0, 100.0, 16.0, 110.0, 10.0, True, True),
        Char("n", 16.0, 100.0, 21.0, 110.0, 10.0, False, True),
        Char("d", 21.0, 100.0, 26.0, 110.0, 11.0, False, True),
    ]
    words = chars_to_words(chars)
    assert [w.text for w in words] == [w[0] for w in _plumber_words(chars)] == ["find"]
    assert (words[0].size, words[0].bold) == (10.0, True)


def test_page_chars_is_a_sequence_of_chars() -> None:
    chars = _random_chars(7, count=50)
    columns = PageChars.of(chars)
    assert len(columns) == len(chars)
    assert list(columns) == chars
    assert columns[3] == chars[3]
    assert columns[-1] == chars[-1]
    assert list(columns[10:20]) == chars[10:20]
    assert all(
        type(value) is type(expected) for value, expected in zip(columns[5], chars[5], strict=True)
    )
    assert not PageChars.of([])
