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

import numpy as np

from extract.ingest.glyphs import Char, PageChars

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
_LIGATURE_TABLE = str.maketrans(LIGATURES)


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
    return RawWord(
        _text_of(texts),
        min(x0s),
        min(tops),
        max(x1s),
        max(bottoms),
        first.size,
        first.bold,
        first.upright,
    )


def _text_of(texts: Sequence[str]) -> str:
    """The characters' texts joined, ligature glyphs expanded."""
    text = "".join(texts)
    if not text.isascii():
        text = "".join(LIGATURES.get(t, t) for t in texts)
    return text


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
        chars: the page's characters in content order (a :class:`PageChars` is read column by
            column, without a per-character object).
        x_tolerance: the widest gap (points) inside a word.
        y_tolerance: how far (points) ``top`` may move within a line.

    Returns:
        The words, line by line from the top as pdfplumber orders them.
    """
    columns = PageChars.of(chars)
    if not len(columns):
        return []
    # runs of characters with the same uprightness, each grouped on its own
    upright = columns.upright
    bounds = [0, *(np.flatnonzero(upright[1:] != upright[:-1]) + 1).tolist(), len(columns)]
    words: list[RawWord] = []
    for a, b in itertools.pairwise(bounds):
        run = columns[a:b]
        if upright[a]:
            words.extend(_upright_words(run, x_tolerance=x_tolerance, y_tolerance=y_tolerance))
            continue
        for line in _rotated_lines_of(list(run), x_tolerance):
            words.extend(
                _split_line(line, upright=False, x_tolerance=x_tolerance, y_tolerance=y_tolerance)
            )
    return words


def _upright_words(chars: PageChars, *, x_tolerance: float, y_tolerance: float) -> list[RawWord]:
    """Words of a run of upright characters, computed on arrays (the rules of _split_line)."""
    top = chars.top
    # lines: clusters of ``top`` values, each joining when within tolerance of the one before
    ordered = np.sort(top)
    distinct = ordered[np.concatenate(([True], ordered[1:] != ordered[:-1]))]
    cluster = np.concatenate(([0], np.cumsum(distinct[1:] > distinct[:-1] + y_tolerance)))
    line = cluster[np.searchsorted(distinct, top)]
    # by line, then by x0, then in content order (both sorts are stable)
    by_x = np.argsort(chars.x0, kind="stable")
    order = by_x[np.argsort(line[by_x], kind="stable")]
    x0 = chars.x0[order]
    x1 = chars.x1[order]
    top = top[order]
    line = line[order]
    texts = chars.texts
    text_of = [texts[i] for i in order.tolist()]
    space = np.fromiter(map(str.isspace, text_of), dtype=bool, count=len(text_of))
    # a word starts at a line's first character, after a space, at a gap wider than the
    # tolerance, where a character starts left of the one before, or where ``top`` jumps
    starts = np.ones(len(text_of), dtype=bool)
    starts[1:] = (
        (line[1:] != line[:-1])
        | space[:-1]
        | (x0[1:] < x0[:-1])
        | (x0[1:] > x1[:-1] + x_tolerance)
        | (np.abs(top[1:] - top[:-1]) > y_tolerance)
    )
    printed = np.flatnonzero(~space)
    if not len(printed):
        return []
    first = np.flatnonzero(starts[printed])
    heads = order[printed[first]]
    pieces = [text_of[i] for i in printed.tolist()]
    bounds = [*first.tolist(), len(printed)]
    joined = "".join(pieces)
    if len(joined) == len(pieces):
        # one character per text: each word is a slice of the joined text
        word_texts = [joined[a:b] for a, b in itertools.pairwise(bounds)]
        if not joined.isascii():
            word_texts = [t if t.isascii() else t.translate(_LIGATURE_TABLE) for t in word_texts]
    else:
        word_texts = [_text_of(pieces[a:b]) for a, b in itertools.pairwise(bounds)]
    rows = zip(
        word_texts,
        np.minimum.reduceat(x0[printed], first).tolist(),
        np.minimum.reduceat(top[printed], first).tolist(),
        np.maximum.reduceat(x1[printed], first).tolist(),
        np.maximum.reduceat(chars.bottom[order[printed]], first).tolist(),
        chars.size[heads].tolist(),
        chars.bold[heads].tolist(),
        itertools.repeat(True),
        strict=False,
    )
    return list(map(tuple.__new__, itertools.repeat(RawWord), rows))
