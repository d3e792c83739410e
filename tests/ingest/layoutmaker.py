"""Words laid out as a typesetter sets table text, for tests built from word positions.

7.8 pt type; word widths use 0.55 em per character and a 0.3 em word space (common practice
for a sans-serif face), as in tests/ingest/test_table_text.py.
"""

from __future__ import annotations

from extract.ingest.words import RawWord

SIZE = 7.8
EM = 0.55 * SIZE
SPACE = 0.3 * SIZE


def words(
    text: str,
    x: float,
    baseline: float,
    *,
    bold: bool = False,
    align: str = "left",
    space: float = SPACE,
) -> list[RawWord]:
    """The words of ``text`` set from ``x`` (centred on it, or ending at it) on ``baseline``."""
    out = []
    parts = text.split()
    width = sum(len(p) * EM for p in parts) + space * (len(parts) - 1)
    cursor = {"centre": x - width / 2, "right": x - width}.get(align, x)
    for part in parts:
        w = len(part) * EM
        out.append(RawWord(part, cursor, baseline - SIZE, cursor + w, baseline, SIZE, bold, True))
        cursor += w + space
    return out


def row(cells: list[tuple[str, float]], baseline: float, *, bold: bool = False) -> list[RawWord]:
    """One table row: the first cell left-aligned at its x, the others centred on theirs."""
    out: list[RawWord] = []
    for i, (text, x) in enumerate(cells):
        out += words(text, x, baseline, bold=bold, align="left" if i == 0 else "centre")
    return out
