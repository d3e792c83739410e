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
from typing import NamedTuple

import pypdfium2 as pdfium
import pypdfium2.raw as raw

#: Path objects on a page beyond which segments are no longer walked (vector figures).
MAX_PATH_OBJECTS = 4000
#: A rectangle thinner than this (points) is a rule rather than a box.
RULE_THICKNESS = 3.0
_BOLD_WEIGHT = 600
#: A space pdfium generated counts only where the gap exceeds this share of the font size.
GAP_RATIO = 0.1
#: Codes pdfium reports that are no printed character (line breaks, noncharacters).
_SKIP_CODES = frozenset({0, 0x0A, 0x0D, 0xFFFE, 0xFFFF})
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


def read_chars(page: pdfium.PdfPage, height: float) -> list[Char]:
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


def _chars_of(tp: object, height: float) -> list[Char]:
    count = raw.FPDFText_CountChars(tp)
    if count <= 0:
        return []
    # all code units in one call (UTF-16LE, one unit per character index)
    buffer = ctypes.create_string_buffer((count + 1) * 2)
    raw.FPDFText_GetText(tp, 0, count, ctypes.cast(buffer, ctypes.POINTER(ctypes.c_ushort)))
    units = memoryview(buffer.raw).cast("H")
    rect = raw.FS_RECTF()
    matrix = raw.FS_MATRIX()
    is_generated = raw.FPDFText_IsGenerated
    loose_box = raw.FPDFText_GetLooseCharBox
    text_object = _TEXT_OBJECT_ADDRESS
    # size, weight and matrix belong to a character's text object: ask once per object
    styles: dict[int | None, tuple[bool, float, bool, float]] = {}
    chars: list[Char] = []
    append = chars.append
    pending_gap = False
    for i in range(count):
        code = units[i]
        if (code < 0x20 and code not in (0x0A, 0x0D)) or code >= 0xFFFE:
            # GetText drops pdfium's own markers (0x02: a hyphen at a line end); ask per char
            code = raw.FPDFText_GetUnicode(tp, i)
        if code in _SKIP_CODES:
            continue
        if code == 0x20 and is_generated(tp, i) == 1:
            # pdfium replaces some printed spaces by its own; a generated space still
            # separates words when the gap is real (it is never drawn: no box of its own).
            pending_gap = bool(chars) and chars[-1].text != " "
            continue
        if 0xD800 <= code <= 0xDFFF:
            code = raw.FPDFText_GetUnicode(tp, i)
            if code in _SKIP_CODES or 0xD800 <= code <= 0xDFFF:
                continue
        text = _REMAP.get(code) or chr(code)
        loose_box(tp, i, rect)
        if pending_gap:
            pending_gap = False
            prev = chars[-1]
            if text != " " and rect.left - prev.x1 > GAP_RATIO * prev.size:
                append(prev._replace(text=" ", x0=prev.x1))
        key = text_object(tp, i)
        style = styles.get(key)
        if style is None:
            style = styles[key] = _style_of(tp, i, matrix)
        upright, size, bold, _ = style
        if upright:
            bottom = height - rect.bottom
            top = bottom - size if size > 0 else height - rect.top
            append(Char(text, rect.left, top, rect.right, bottom, size, bold, True))
        else:
            append(
                Char(
                    text,
                    rect.left,
                    height - rect.top,
                    rect.right,
                    height - rect.bottom,
                    size,
                    bold,
                    False,
                )
            )
    return chars


def _style_of(tp: object, i: int, matrix: object) -> tuple[bool, float, bool, float]:
    """(upright, size in page space, bold, raw font size) of character ``i``'s text object."""
    raw.FPDFText_GetMatrix(tp, i, matrix)
    a, b, c, d = matrix.a, matrix.b, matrix.c, matrix.d  # type: ignore[attr-defined]
    upright = a * d > 0 and b * c <= 0
    font_size = raw.FPDFText_GetFontSize(tp, i)
    size = font_size * (math.hypot(c, d) if upright else math.hypot(a, b))
    bold = raw.FPDFText_GetFontWeight(tp, i) >= _BOLD_WEIGHT
    return upright, size, bold, font_size


#: FPDFText_GetTextObject returning the object's address as an int (a hashable cache key).
_TEXT_OBJECT_ADDRESS = ctypes.cast(
    raw.FPDFText_GetTextObject,
    ctypes.CFUNCTYPE(ctypes.c_void_p, ctypes.c_void_p, ctypes.c_int),
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
