"""Characters and ruling lines of one PDF page, read through pypdfium2's raw API.

This is the fast path of PDF reading: pdfium's text page gives every character with its box in a
few milliseconds, where pdfminer-based readers need hundreds. Boxes follow pdfminer's convention
(and so pdfplumber's), so that words grouped from them match pdfplumber's words:

* ``x0``/``x1``: the glyph's origin and origin plus advance width (pdfium's "loose" box);
* ``bottom``: the baseline moved down by the font's descent; ``top``: ``bottom`` minus the font
  size in page space.

Coordinates are PDF points from the top-left corner of the page, as in the Document model.
Characters that pdfium inserts itself (generated spaces and line breaks) are left out.
"""

from __future__ import annotations

import ctypes
import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass
from itertools import repeat
from typing import Any, NamedTuple, overload

import numpy as np
import pypdfium2 as pdfium
import pypdfium2.raw as raw

#: Path objects on a page beyond which segments are no longer walked (vector figures).
MAX_PATH_OBJECTS = 4000
#: A rectangle thinner than this (points) is a rule rather than a box.
RULE_THICKNESS = 3.0
_BOLD_WEIGHT = 600
#: A space pdfium generated counts only where the gap exceeds this share of the font size.
GAP_RATIO = 0.1
#: pdfium marks a hyphen at a line end as 0x02.
_REMAP = {0x02: "-"}


class Char(NamedTuple):
    """One printed character in page space (top-left origin)."""

    text: str
    x0: float
    top: float
    x1: float
    bottom: float
    size: float
    bold: bool
    upright: bool


class Segment(NamedTuple):
    """A straight horizontal or vertical line segment (a table rule or a box edge)."""

    x0: float
    top: float
    x1: float
    bottom: float

    @property
    def horizontal(self) -> bool:
        """Whether the segment runs left to right."""
        return (self.x1 - self.x0) >= (self.bottom - self.top)


@dataclass(frozen=True, eq=False)
class PageChars(Sequence[Char]):
    """The printed characters of a page, stored column by column (one array per field).

    Behaves as a read-only sequence of :class:`Char`; word grouping reads the columns directly,
    so that no object is made per character on the fast path.
    """

    texts: list[str]
    x0: np.ndarray
    top: np.ndarray
    x1: np.ndarray
    bottom: np.ndarray
    size: np.ndarray
    bold: np.ndarray
    upright: np.ndarray

    @classmethod
    def of(cls, chars: Sequence[Char]) -> PageChars:
        """Columns of any sequence of characters."""
        if isinstance(chars, PageChars):
            return chars
        if not chars:
            return _EMPTY
        texts, x0, top, x1, bottom, size, bold, upright = zip(*chars, strict=True)
        floats = [np.array(v, dtype=np.float64) for v in (x0, top, x1, bottom, size)]
        flags = [np.array(v, dtype=bool) for v in (bold, upright)]
        return cls(list(texts), *floats, *flags)

    def __len__(self) -> int:
        return len(self.texts)

    @overload
    def __getitem__(self, index: int) -> Char: ...

    @overload
    def __getitem__(self, index: slice) -> PageChars: ...

    def __getitem__(self, index: int | slice) -> Char | PageChars:
        if isinstance(index, slice):
            return PageChars(
                self.texts[index],
                *(column[index] for column in self._columns()),
            )
        values = (column[index].item() for column in self._columns())
        return Char(self.texts[index], *values)

    def __iter__(self) -> Iterator[Char]:
        rows = zip(self.texts, *(column.tolist() for column in self._columns()), strict=True)
        return map(tuple.__new__, repeat(Char), rows)

    def _columns(self) -> tuple[np.ndarray, ...]:
        return (self.x0, self.top, self.x1, self.bottom, self.size, self.bold, self.upright)


_NO_FLOATS = np.zeros(0, dtype=np.float64)
_NO_FLAGS = np.zeros(0, dtype=bool)
_EMPTY = PageChars(
    [], _NO_FLOATS, _NO_FLOATS, _NO_FLOATS, _NO_FLOATS, _NO_FLOATS, _NO_FLAGS, _NO_FLAGS
)


def read_chars(page: pdfium.PdfPage, height: float) -> PageChars:
    """All printed characters of ``page`` in content order.

    Args:
        page: an open pypdfium2 page.
        height: the page height in points (to flip the y axis).

    Returns:
        The characters, pdfium's generated spaces and line breaks left out.
    """
    textpage = page.get_textpage()
    try:
        return _chars_of(textpage.raw, height)
    finally:
        textpage.close()


def _chars_of(tp: Any, height: float) -> PageChars:
    """Characters of the text page ``tp``; the per-character pdfium calls are driven from C."""
    count = raw.FPDFText_CountChars(tp)
    if count <= 0:
        return _EMPTY
    handle = ctypes.cast(tp, ctypes.c_void_p)
    kept, texts, gaps = _printed(tp, handle, count)
    n = len(kept)
    if not n:
        return _EMPTY
    # one loose box per character, each written into its own slot of one float array
    boxes = (ctypes.c_float * (4 * n))()
    base = ctypes.addressof(boxes)
    done = list(map(_LOOSE_BOX, repeat(handle, n), kept, range(base, base + 16 * n, 16)))
    if not all(done):
        _fill_failed(boxes, done)
    # FS_RECTF holds (left, top, right, bottom) with the origin at the bottom left
    rects = np.ctypeslib.as_array(boxes).reshape(n, 4).astype(np.float64)
    upright, size, bold = _styles(tp, handle, kept)
    bottom = height - rects[:, 3]
    top = np.where(upright & (size > 0), bottom - size, height - rects[:, 1])
    x0, x1 = rects[:, 0], rects[:, 2]
    if gaps:
        # pdfium replaces some printed spaces by its own; a generated space still separates
        # words when the gap is real (it is never drawn: no box of its own)
        at = np.array(gaps)
        real = x0[at] - x1[at - 1] > GAP_RATIO * size[at - 1]
        at = at[real & np.array([texts[k] != " " for k in gaps], dtype=bool)]
        if len(at):
            before = at - 1
            for k in reversed(at.tolist()):
                texts.insert(k, " ")
            x0 = np.insert(x0, at, x1[before])
            top, x1, bottom, size, bold, upright = (
                np.insert(column, at, column[before])
                for column in (top, x1, bottom, size, bold, upright)
            )
    return PageChars(texts, x0, top, x1, bottom, size, bold, upright)


def _styles(
    tp: object, handle: ctypes.c_void_p, kept: list[int]
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(upright, size, bold) per character, asked once per run of one text object."""
    n = len(kept)
    objects = np.array(list(map(_TEXT_OBJECT, repeat(handle, n), kept)), dtype=np.uint64)
    starts = np.flatnonzero(np.concatenate(([True], objects[1:] != objects[:-1])))
    matrix = raw.FS_MATRIX()
    styles: dict[int, tuple[bool, float, bool, float]] = {}
    runs = []
    for obj, index in zip(objects[starts].tolist(), np.array(kept)[starts].tolist(), strict=True):
        style = styles.get(obj)
        if style is None:
            style = styles[obj] = _style_of(tp, index, matrix)
        runs.append(style)
    lengths = np.diff(np.append(starts, n))
    uprights, sizes, bolds, _ = zip(*runs, strict=True)
    return (
        np.repeat(np.array(uprights, dtype=bool), lengths),
        np.repeat(np.array(sizes, dtype=np.float64), lengths),
        np.repeat(np.array(bolds, dtype=bool), lengths),
    )


def _printed(
    tp: object, handle: ctypes.c_void_p, count: int
) -> tuple[list[int], list[str], list[int]]:
    """Indices and texts of the printed characters, and where a generated space came before.

    Returns:
        The character indices kept, their texts, and the positions (in the kept list) that
        follow a generated space which itself follows a printed character other than a space.
    """
    # all code units in one call (UTF-16LE, one unit per character index)
    buffer = ctypes.create_string_buffer((count + 1) * 2)
    raw.FPDFText_GetText(tp, 0, count, ctypes.cast(buffer, ctypes.POINTER(ctypes.c_ushort)))
    codes = np.frombuffer(buffer.raw, dtype="<u2", count=count).astype(np.int64)
    special = (
        ((codes < 0x20) & (codes != 0x0A) & (codes != 0x0D))
        | ((codes >= 0xD800) & (codes <= 0xDFFF))
        | (codes >= 0xFFFE)
    )
    special_at = np.flatnonzero(special).tolist()
    for i in special_at:
        # GetText drops pdfium's own markers (0x02: a hyphen at a line end); ask per char
        code = raw.FPDFText_GetUnicode(tp, i)
        codes[i] = 0 if 0xD800 <= code <= 0xDFFF else code
    # no printed character: line breaks, noncharacters, nothing
    skip = (codes == 0) | (codes == 0x0A) | (codes == 0x0D) | (codes >= 0xFFFE)
    spaces = np.flatnonzero(codes == 0x20).tolist()
    generated = [
        i
        for i, flag in zip(spaces, map(_IS_GENERATED, repeat(handle), spaces), strict=False)
        if flag == 1
    ]
    skip[generated] = True
    kept_at = np.flatnonzero(~skip)
    kept_codes = codes[kept_at].tolist()
    if special_at:
        texts = [_REMAP.get(code) or chr(code) for code in kept_codes]
    else:
        texts = list(map(chr, kept_codes))
    gaps: list[int] = []
    if generated:
        after = sorted(set(np.searchsorted(kept_at, generated).tolist()))
        gaps = [k for k in after if 0 < k < len(texts) and texts[k - 1] != " "]
    return kept_at.tolist(), texts, gaps


def _fill_failed(boxes: ctypes.Array[ctypes.c_float], done: list[int]) -> None:
    """Give each character whose box pdfium could not tell the box before it (zeros first)."""
    for k, ok in enumerate(done):
        if not ok:
            for j in range(4 * k, 4 * k + 4):
                boxes[j] = boxes[j - 4] if k else 0.0


def _style_of(tp: object, i: int, matrix: object) -> tuple[bool, float, bool, float]:
    """(upright, size in page space, bold, raw font size) of character ``i``'s text object."""
    raw.FPDFText_GetMatrix(tp, i, matrix)
    a, b, c, d = matrix.a, matrix.b, matrix.c, matrix.d  # type: ignore[attr-defined]
    upright = a * d > 0 and b * c <= 0
    font_size = raw.FPDFText_GetFontSize(tp, i)
    size = font_size * (math.hypot(c, d) if upright else math.hypot(a, b))
    bold = raw.FPDFText_GetFontWeight(tp, i) >= _BOLD_WEIGHT
    return upright, size, bold, font_size


def _c_function(function: Any, restype: Any, *argtypes: Any) -> Any:
    """pdfium's ``function`` with a lean ctypes prototype (no argument checks if none given)."""
    address = ctypes.cast(function, ctypes.c_void_p).value or 0
    prototype = ctypes.CFUNCTYPE(restype, *argtypes)(address)
    if not argtypes:
        prototype.argtypes = None  # type: ignore[assignment]  # ctypes: pass arguments as given
    return prototype


#: The text object of a character, as its address (an int, 0 for none); called with a
#: ``c_void_p`` text page and an int index, which ctypes passes as they are.
_TEXT_OBJECT = _c_function(raw.FPDFText_GetTextObject, ctypes.c_size_t)
#: Whether pdfium generated a character itself (1), called as :data:`_TEXT_OBJECT`.
_IS_GENERATED = _c_function(raw.FPDFText_IsGenerated, ctypes.c_int)
#: A character's loose box, written to the FS_RECTF at the address given as third argument.
_LOOSE_BOX = _c_function(
    raw.FPDFText_GetLooseCharBox, ctypes.c_int, ctypes.c_void_p, ctypes.c_int, ctypes.c_void_p
)


def _is_bold(obj: object) -> bool:
    if not obj:
        return False
    font = raw.FPDFTextObj_GetFont(obj)
    if not font:
        return False
    weight = raw.FPDFFont_GetWeight(font)
    if weight >= _BOLD_WEIGHT:
        return True
    size = raw.FPDFFont_GetBaseFontName(font, None, 0)
    if size <= 0:
        return False
    buffer = ctypes.create_string_buffer(size)
    raw.FPDFFont_GetBaseFontName(font, buffer, size)
    name = buffer.value.decode("latin-1", "replace").lower()
    return "bold" in name or "black" in name or "heavy" in name


def read_segments(page: pdfium.PdfPage, height: float) -> list[Segment]:
    """Horizontal and vertical line segments drawn on ``page`` (rules, box edges).

    A thin filled rectangle counts as one rule; a larger rectangle gives its four edges; stroked
    straight lines give themselves. Curves and slanted lines are ignored. Form XObjects are
    entered. Pages with more than :data:`MAX_PATH_OBJECTS` paths (vector figures) use the bounds
    of thin paths only.
    """
    segments: list[Segment] = []
    count = raw.FPDFPage_CountObjects(page.raw)
    objects = [raw.FPDFPage_GetObject(page.raw, i) for i in range(count)]
    _walk(objects, height, segments, budget=[MAX_PATH_OBJECTS], parent=None)
    return segments


def _walk(
    objects: list[object],
    height: float,
    out: list[Segment],
    *,
    budget: list[int],
    parent: tuple[float, ...] | None,
) -> None:
    left, bottom, right, top = (ctypes.c_float() for _ in range(4))
    for obj in objects:
        kind = raw.FPDFPageObj_GetType(obj)
        if kind == raw.FPDF_PAGEOBJ_FORM:
            matrix = raw.FS_MATRIX()
            raw.FPDFPageObj_GetMatrix(obj, matrix)
            own = (matrix.a, matrix.b, matrix.c, matrix.d, matrix.e, matrix.f)
            combined = own if parent is None else _multiply(own, parent)
            n = raw.FPDFFormObj_CountObjects(obj)
            children = [raw.FPDFFormObj_GetObject(obj, i) for i in range(n)]
            _walk(children, height, out, budget=budget, parent=combined)
            continue
        if kind != raw.FPDF_PAGEOBJ_PATH:
            continue
        budget[0] -= 1
        if budget[0] < 0:
            if parent is None and raw.FPDFPageObj_GetBounds(obj, left, bottom, right, top):
                box = (left.value, height - top.value, right.value, height - bottom.value)
                if min(box[2] - box[0], box[3] - box[1]) <= RULE_THICKNESS:
                    out.append(_thin_to_segment(box))
            continue
        _path_segments(obj, height, out, parent)


def _multiply(m: tuple[float, ...], n: tuple[float, ...]) -> tuple[float, ...]:
    """The affine matrix ``m`` followed by ``n`` (PDF row-vector convention)."""
    a, b, c, d, e, f = m
    a2, b2, c2, d2, e2, f2 = n
    return (
        a * a2 + b * c2,
        a * b2 + b * d2,
        c * a2 + d * c2,
        c * b2 + d * d2,
        e * a2 + f * c2 + e2,
        e * b2 + f * d2 + f2,
    )


def _thin_to_segment(box: tuple[float, float, float, float]) -> Segment:
    x0, top, x1, bottom = box
    if (x1 - x0) >= (bottom - top):
        mid = (top + bottom) / 2
        return Segment(x0, mid, x1, mid)
    mid = (x0 + x1) / 2
    return Segment(mid, top, mid, bottom)


def _path_segments(
    obj: object, height: float, out: list[Segment], parent: tuple[float, ...] | None
) -> None:
    matrix = raw.FS_MATRIX()
    raw.FPDFPageObj_GetMatrix(obj, matrix)
    m: tuple[float, ...] = (matrix.a, matrix.b, matrix.c, matrix.d, matrix.e, matrix.f)
    if parent is not None:
        m = _multiply(m, parent)
    a, b, c, d, e, f = m
    n = raw.FPDFPath_CountSegments(obj)
    x, y = ctypes.c_float(), ctypes.c_float()
    points: list[tuple[float, float]] = []
    polylines: list[list[tuple[float, float]]] = []
    has_curve = False
    for i in range(n):
        seg = raw.FPDFPath_GetPathSegment(obj, i)
        raw.FPDFPathSegment_GetPoint(seg, x, y)
        px = a * x.value + c * y.value + e
        py = height - (b * x.value + d * y.value + f)
        kind = raw.FPDFPathSegment_GetType(seg)
        if kind == raw.FPDF_SEGMENT_MOVETO:
            if len(points) > 1:
                polylines.append(points)
            points = [(px, py)]
        else:
            if kind == raw.FPDF_SEGMENT_BEZIERTO:
                has_curve = True
            points.append((px, py))
            if raw.FPDFPathSegment_GetClose(seg) and points:
                points.append(points[0])
    if len(points) > 1:
        polylines.append(points)
    if has_curve:
        return
    for line in polylines:
        xs = [p[0] for p in line]
        ys = [p[1] for p in line]
        box = (min(xs), min(ys), max(xs), max(ys))
        if (
            min(box[2] - box[0], box[3] - box[1]) <= RULE_THICKNESS
            and max(box[2] - box[0], box[3] - box[1]) > RULE_THICKNESS
        ):
            out.append(_thin_to_segment(box))
            continue
        for (x0, y0), (x1, y1) in zip(line, line[1:], strict=False):
            if abs(y0 - y1) < 0.5 and abs(x0 - x1) > 0.5:
                out.append(Segment(min(x0, x1), y0, max(x0, x1), y0))
            elif abs(x0 - x1) < 0.5 and abs(y0 - y1) > 0.5:
                out.append(Segment(x0, min(y0, y1), x0, max(y0, y1)))
