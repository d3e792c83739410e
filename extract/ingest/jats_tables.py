"""JATS tables (``table-wrap``) to :class:`~extract.ingest.document.Table` grids.

A ``table-wrap`` gives its label, caption, one ``table`` (directly or inside ``alternatives``, next
to an image of the same table) and footnotes in ``table-wrap-foot``. Rows come from ``thead``
(header rows), ``tbody`` and ``tfoot``, or straight from ``table`` when there are no row groups.

Spans are expanded to a full rectangular grid (the HTML table model: a cell takes the first free
column of its row; ``rowspan`` never reaches past its row group):

- header cells: the text is repeated into every cell the span covers, so each column carries its
  whole header ("Week 8" spanning two columns heads both);
- body cells: a ``rowspan`` repeats the text down into each covered row (a row label spanning
  three rows labels each of them); a ``colspan`` puts the text in the leftmost covered cell and
  leaves the others empty (a group heading row such as "Sex" does not turn into fake values in
  the data columns).

Rows shorter than the widest row are padded with empty cells on the right.
"""

from __future__ import annotations

import logging
import re
from dataclasses import dataclass

from lxml import etree

from extract.ingest.document import Table, TableCell
from extract.ingest.jats_text import element_text, localname
from extract.ingest.tables import unit_of

logger = logging.getLogger(__name__)

READER = "jats"

#: Largest span honoured; bigger values are treated as typing errors and read as 1.
MAX_SPAN = 1000

# --- units in header and row labels ---------------------------------------------------------

_PREFIXES = ("", "p", "n", "µ", "μ", "u", "m", "c", "d", "k", "M", "G")
_BASE_UNITS = frozenset(
    {
        "g",
        "L",
        "l",
        "mol",
        "M",
        "m",
        "s",
        "sec",
        "min",
        "h",
        "hr",
        "hrs",
        "d",
        "day",
        "days",
        "wk",
        "wks",
        "week",
        "weeks",
        "mo",
        "mos",
        "month",
        "months",
        "y",
        "yr",
        "yrs",
        "year",
        "years",
        "Pa",
        "mmHg",
        "bpm",
        "beats",
        "breaths",
        "IU",
        "U",
        "Eq",
        "eq",
        "cells",
        "cell",
        "copies",
        "%",
        "‰",
        "°C",
        "°F",
        "°",
        "kcal",
        "gf",
        "kgf",
        "cal",
        "Hz",
        "Ω",
        "Da",
        "AU",
        "a.u.",
        "ppm",
        "ppb",
        "mEq",
        "kat",
        "rpm",
        "fold",
        "dB",
        "lb",
        "lbs",
        "cm",
        "mmol",
        "µmol",
        "nmol",
        "pmol",
        "dL",
        "mL",
        "µL",
        "μL",
        "nL",
        "ng",
        "pg",
        "kg",
        "mg",
        "µg",
        "μg",
        "mcg",
        "kU",
        "mU",
        "mIU",
        "µIU",
        "μIU",
        "uIU",
        "cmH2O",
        "cmH₂O",
        "units",
        "unit",
        "IQR",
        "beats/min",
    }
)
_FACTOR = re.compile(r"^(?:[×x*]?\s*10\^[\u2212\-]?\d+|10\^[\u2212\-]?\d+)$")
_EXPONENT = re.compile(r"(?:\^[\u2212\-]?\d+|[\u207b\u00b9\u00b2\u00b3\u2070-\u2079]+)$")
_UNIT_SEPARATORS = re.compile(r"\s*[/·⋅]\s*|\s+")
_NOT_UNITS = frozenset(
    {"n", "N", "no", "No", "no.", "No.", "SD", "SEM", "SE", "CI", "OR", "HR", "RR", "vs", "range"}
)
_LEADING_WORD = re.compile(r"^(?:in|as)\s+")
#: A statistic named after the unit: "Age (years), mean (SD)", "Duration (months), median (IQR)".
_TRAILING_STATISTIC = re.compile(
    r",\s*(?:mean|median|mean\s+difference|geometric\s+mean|n|no\.?|number)\b[^,]*$", re.IGNORECASE
)


def _is_unit_atom(atom: str) -> bool:
    if not atom:
        return False
    if _FACTOR.match(atom):
        return True
    atom = _EXPONENT.sub("", atom)
    if atom in _BASE_UNITS:
        return True
    return any(atom.startswith(p) and atom[len(p) :] in _BASE_UNITS for p in _PREFIXES if p)


def is_unit(text: str) -> bool:
    """Whether a short string reads as a unit ("mg/dL", "kg/m^2", "× 10^9/L", "%", "mm Hg").

    A unit is one or more known unit symbols (with an optional SI prefix and an integer
    exponent) or powers of ten, joined by "/", "·" or spaces. Words such as "n", "SD" or "vs"
    and anything with "=", "," or ";" are not units.
    """
    text = text.strip()
    if not text or len(text) > 24 or any(c in text for c in "=,;<>±"):
        return False
    if text in _NOT_UNITS:
        return False
    text = text.replace("mm Hg", "mmHg").replace("cm H2O", "cmH2O")
    text = re.sub(r"([×x*])\s+(?=10\^)", r"\1", text)
    atoms = [a for a in _UNIT_SEPARATORS.split(text) if a]
    return bool(atoms) and all(_is_unit_atom(a) for a in atoms)


def unit_from_label(label: str) -> str | None:
    """The unit stated in a column header or row label, as written, or ``None``.

    Where the unit sits is the PDF reader's rule, shared through
    :func:`extract.ingest.tables.unit_of` (common practice: "Body mass (g)", "Glucose [mmol/L]",
    "Glucose, mmol/L"); a header cell holding nothing but a unit ("mg/dL", "(mg/dL)") counts
    too, and "in months" reads as "months". The candidate must then read as a unit
    (:func:`is_unit`), so "Basal (2F/6M)", "Sex (m/f)" or "Hazard ratio (HR)" state none. A
    statistic named after the unit is skipped: "Age (years), mean (SD)" -> "years"; "Female
    sex, n (%)" states none (the count has no unit; the percent is printed beside it).

    Args:
        label: the header or row-label text.

    Returns:
        The unit string as written (e.g. "mg/dL"), or ``None`` when the label states none.
    """
    label = " ".join(label.split())
    whole = label.removeprefix("(").removesuffix(")").removeprefix("[").removesuffix("]")
    if _TRAILING_STATISTIC.search(label):
        # "n (%)" or "mean (SD)" describes how values are printed, not their unit.
        candidates = [unit_of(_TRAILING_STATISTIC.sub("", label))]
    else:
        candidates = [unit_of(label), whole]
    for candidate in candidates:
        if candidate:
            candidate = _LEADING_WORD.sub("", candidate.strip())
            if is_unit(candidate):
                return candidate
    return None


# --- grid expansion --------------------------------------------------------------------------


@dataclass(frozen=True)
class _RawCell:
    text: str
    rowspan: int
    colspan: int


def _span(value: str | None) -> int:
    if value is None:
        return 1
    value = value.strip()
    if not value.isdigit():
        return 1
    number = int(value)
    return number if 1 <= number <= MAX_SPAN else 1


def _row_groups(table: etree._Element) -> list[tuple[str, list[etree._Element]]]:
    """The table's rows by group: ("thead" | "tbody" | "tfoot", rows), in reading order."""
    heads: list[tuple[str, list[etree._Element]]] = []
    bodies: list[tuple[str, list[etree._Element]]] = []
    feet: list[tuple[str, list[etree._Element]]] = []
    loose: list[etree._Element] = []
    for child in table:
        tag = localname(child)
        rows = [r for r in child if localname(r) == "tr"]
        if tag == "thead":
            heads.append(("thead", rows))
        elif tag == "tbody":
            bodies.append(("tbody", rows))
        elif tag == "tfoot":
            feet.append(("tfoot", rows))
        elif tag == "tr":
            loose.append(child)
    if loose:
        bodies.insert(0, ("tbody", loose))
    return heads + bodies + feet


def _expand(groups: list[list[list[_RawCell]]], header_rows: int) -> tuple[list[list[str]], int]:
    """Place raw cells on a grid by the HTML table model; returns (grid, n_cols)."""
    placed: dict[tuple[int, int], str] = {}
    row_offset = 0
    for rows in groups:
        for r, cells in enumerate(rows):
            row = row_offset + r
            col = 0
            for cell in cells:
                while (row, col) in placed:
                    col += 1
                rowspan = min(cell.rowspan, len(rows) - r)
                in_header = row < header_rows
                for dr in range(rowspan):
                    for dc in range(cell.colspan):
                        repeat = in_header or dc == 0
                        placed.setdefault((row + dr, col + dc), cell.text if repeat else "")
                col += cell.colspan
        row_offset += len(rows)
    n_rows = row_offset
    n_cols = max((c + 1 for (_, c) in placed), default=0)
    grid = [[placed.get((r, c), "") for c in range(n_cols)] for r in range(n_rows)]
    return grid, n_cols


def _raw_rows(rows: list[etree._Element]) -> list[list[_RawCell]]:
    return [
        [
            _RawCell(
                element_text(cell, skip=()), _span(cell.get("rowspan")), _span(cell.get("colspan"))
            )
            for cell in row
            if localname(cell) in ("td", "th")
        ]
        for row in rows
    ]


def _count_header_rows(groups: list[tuple[str, list[etree._Element]]]) -> int:
    head = sum(len(rows) for kind, rows in groups if kind == "thead")
    if head:
        return head
    # No thead: leading rows made of th cells only; failing that, the first row (common practice).
    count = 0
    for _, rows in groups:
        for row in rows:
            cells = [localname(c) for c in row if localname(c) in ("td", "th")]
            if cells and all(c == "th" for c in cells):
                count += 1
            else:
                return count or 1
    return count or 1


def table_to_grid(table: etree._Element) -> tuple[list[list[str]], int]:
    """A JATS/XHTML ``table`` element as a rectangular grid of cell texts.

    Args:
        table: the ``table`` element.

    Returns:
        ``(grid, header_rows)``: the rows of cell texts with spans expanded (see the module
        docstring) and the number of header rows.
    """
    groups = _row_groups(table)
    header_rows = _count_header_rows(groups)
    grid, _ = _expand([_raw_rows(rows) for _, rows in groups], header_rows)
    return grid, min(header_rows, len(grid))


# --- table-wrap ------------------------------------------------------------------------------


def find_table(wrap: etree._Element) -> etree._Element | None:
    """The ``table`` of a ``table-wrap``: a direct child, or one inside ``alternatives``."""
    for child in wrap:
        tag = localname(child)
        if tag == "table":
            return child
        if tag == "alternatives":
            for alt in child:
                if localname(alt) == "table":
                    return alt
    return None


def caption_text(wrap: etree._Element) -> str:
    """The caption of a ``table-wrap`` or ``fig``: its title and paragraphs, without the label."""
    caption = next((c for c in wrap if localname(c) == "caption"), None)
    if caption is None:
        return ""
    parts = [element_text(c) for c in caption if isinstance(c.tag, str)]
    return " ".join(p for p in parts if p)


def label_text(element: etree._Element) -> str:
    """The ``label`` child's text ("Table 1", "Figure 2"; a trailing "." or ":" dropped), or ""."""
    label = next((c for c in element if localname(c) == "label"), None)
    return element_text(label).rstrip(".:").strip() if label is not None else ""


def footnote_texts(wrap: etree._Element) -> list[str]:
    """Footnotes of a ``table-wrap``: each ``fn`` (label and text) or loose ``p`` in its foot."""
    notes: list[str] = []
    for foot in (c for c in wrap if localname(c) == "table-wrap-foot"):
        for item in foot.iter():
            tag = localname(item)
            if tag == "fn":
                notes.append(_footnote(item))
            elif tag == "p" and not any(localname(a) == "fn" for a in item.iterancestors()):
                notes.append(element_text(item))
    return [n for n in notes if n]


def _footnote(fn: etree._Element) -> str:
    label = label_text(fn)
    body = " ".join(element_text(c) for c in fn if localname(c) not in ("label", ""))
    return f"{label} {body}".strip() if label else body.strip()


def table_from_wrap(
    wrap: etree._Element,
    *,
    label: str,
    caption: str,
    section: str | None,
    ref: str,
) -> Table | None:
    """A :class:`Table` from a ``table-wrap``, or ``None`` when it holds no ``table`` (an image).

    Args:
        wrap: the ``table-wrap`` element.
        label: the label to give the table ("Table 1").
        caption: the caption text.
        section: canonical name of the section holding the table.
        ref: element path of the ``table-wrap``.

    Returns:
        The table as a full grid with header rows, footnotes and units; ``None`` if the wrap
        has no ``table`` element.
    """
    table = find_table(wrap)
    if table is None:
        return None
    grid, header_rows = table_to_grid(table)
    n_rows = len(grid)
    n_cols = len(grid[0]) if grid else 0
    cells = tuple(
        TableCell(row=r, col=c, text=grid[r][c]) for r in range(n_rows) for c in range(n_cols)
    )
    column_units = tuple(_column_unit(grid, header_rows, c) for c in range(n_cols))
    row_units = tuple(
        unit_from_label(grid[r][0]) if r >= header_rows and n_cols else None for r in range(n_rows)
    )
    return Table(
        label=label,
        caption=caption,
        footnotes=tuple(footnote_texts(wrap)),
        page=None,
        pages=(),
        bbox=None,
        n_rows=n_rows,
        n_cols=n_cols,
        header_rows=header_rows,
        cells=cells,
        column_units=column_units,
        row_units=row_units,
        section=section,
        reader=READER,
        ref=ref,
    )


def _column_unit(grid: list[list[str]], header_rows: int, col: int) -> str | None:
    for row in range(header_rows):
        unit = unit_from_label(grid[row][col])
        if unit:
            return unit
    return None
