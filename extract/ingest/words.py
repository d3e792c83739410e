"""Group characters into words the way pdfplumber's ``extract_words`` does by default.

pdfplumber (0.11, ``WordExtractor`` with ``x_tolerance=3``, ``y_tolerance=3``) takes runs of
characters with the same uprightness, clusters them into lines by ``top`` (a value joins a cluster
when it is within the tolerance of the previous sorted value), sorts each line by ``x0`` and
starts a new word at a space, at a gap wider than ``x_tolerance`` after the previous character's
``x1``, when a character starts left of the previous one's ``x0``, or when ``top`` moves by more
than ``y_tolerance``. Ligature glyphs are expanded. Doing the same here keeps our word sequence
equal to pdfplumber's, which the test suite checks on the fixture articles.
"""

from __future__ import annotations

import itertools
from collections.abc import Iterable, Sequence
from typing import NamedTuple

from extract.ingest.glyphs import Char

DEFAULT_X_TOLERANCE = 3.0
DEFAULT_Y_TOLERANCE = 3.0

#: Ligature glyphs and their letters (as pdfplumber's ``expand_ligatures``).
LIGATURES: dict[str, str] = {
    "\ufb00": "ff",
    "\ufb03": "ffi",
    "\ufb04": "ffl",
    "\ufb01": "fi",
    "\ufb02": "fl",
    "\ufb06": "st",
    "\ufb05": "st",
}


class RawWord(NamedTuple):
    """A word in page space with the size and weight of its first character."""

    text: str
    x0: float
    top: float
    x1: float
    bottom: float
    size: float
    bold: bool
    upright: bool


def _cluster_values(values: Iterable[float], tolerance: float) -> dict[float, int]:
    ordered = sorted(set(values))
    mapping: dict[float, int] = {}
    group = 0
    last: float | None = None
    for value in ordered:
        if last is not None and value > last + tolerance:
            group += 1
        mapping[value] = group
        last = value
    return mapping


def _lines_of(chars: Sequence[Char], y_tolerance: float) -> list[list[Char]]:
    if len(chars) < 2:
        return [list(chars)] if chars else []
    mapping = _cluster_values((c.top for c in chars), y_tolerance)
    ordered = sorted(chars, key=lambda c: mapping[c.top])
    lines = [list(g) for _, g in itertools.groupby(ordered, key=lambda c: mapping[c.top])]
    return [sorted(line, key=lambda c: c.x0) for line in lines]


def _rotated_lines_of(chars: Sequence[Char], x_tolerance: float) -> list[list[Char]]:
    mapping = _cluster_values((c.x0 for c in chars), x_tolerance)
    ordered = sorted(chars, key=lambda c: mapping[c.x0])
    lines = [list(g) for _, g in itertools.groupby(ordered, key=lambda c: mapping[c.x0])]
    return [sorted(line, key=lambda c: (c.top, c.bottom)) for line in lines]


def _merge(chars: list[Char]) -> RawWord:
    first = chars[0]
    if len(chars) == 1:
        return RawWord(
            LIGATURES.get(first.text, first.text), first.x0, first.top, first.x1, first.bottom,
            first.size, first.bold, first.upright,
        )  # fmt: skip
    texts, x0s, tops, x1s, bottoms = list(zip(*chars, strict=False))[:5]
    text = "".join(texts)
    if not text.isascii():
        text = "".join(LIGATURES.get(t, t) for t in texts)
    return RawWord(
        text, min(x0s), min(tops), max(x1s), max(bottoms), first.size, first.bold, first.upright
    )


def _split_line(
    line: list[Char], *, upright: bool, x_tolerance: float, y_tolerance: float
) -> list[RawWord]:
    words: list[RawWord] = []
    current: list[Char] = []
    prev: Char | None = None
    for char in line:
        if char.text.isspace():
            if current:
                words.append(_merge(current))
            current = []
            prev = None
            continue
        if prev is not None:
            if upright:
                new = (
                    char.x0 < prev.x0
                    or char.x0 > prev.x1 + x_tolerance
                    or abs(char.top - prev.top) > y_tolerance
                )
            else:
                new = (
                    char.top < prev.top
                    or char.top > prev.bottom + y_tolerance
                    or abs(char.x0 - prev.x0) > x_tolerance
                )
            if new:
                words.append(_merge(current))
                current = []
        current.append(char)
        prev = char
    if current:
        words.append(_merge(current))
    return words


def chars_to_words(
    chars: Sequence[Char],
    *,
    x_tolerance: float = DEFAULT_X_TOLERANCE,
    y_tolerance: float = DEFAULT_Y_TOLERANCE,
) -> list[RawWord]:
    """Words from characters in content order, grouped as pdfplumber's ``extract_words``.

    Args:
        chars: the page's characters in content order.
        x_tolerance: the widest gap (points) inside a word.
        y_tolerance: how far (points) ``top`` may move within a line.

    Returns:
        The words, line by line from the top as pdfplumber orders them.
    """
    words: list[RawWord] = []
    for upright, group in itertools.groupby(chars, key=lambda c: c.upright):
        run = list(group)
        lines = _lines_of(run, y_tolerance) if upright else _rotated_lines_of(run, x_tolerance)
        for line in lines:
            words.extend(
                _split_line(line, upright=upright, x_tolerance=x_tolerance, y_tolerance=y_tolerance)
            )
    return words
