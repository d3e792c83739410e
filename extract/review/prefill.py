"""Pre-filling a data point the first pass missed, from the sentence or table cell a curator picked.

The guess is deliberately plain: the first number (with "± spread" when printed), a unit written
right after it or in the table's header, the sample size printed in a header ("(n = 9)"), and the
row label and column header as outcome and group. Context the curator already checked (time
point, method, subject, treatment) is carried over from the proposal on screen. The curator
completes and corrects everything in the form before it is stored.
"""

from __future__ import annotations

import re

from extract.ingest.document import Block, Table
from extract.records.proposal import Dispersion, Proposal, Source

_NUMBER = r"[-−]?\d+(?:\.\d+)?"
_VALUE_RE = re.compile(
    rf"(?<![\w.])(?P<value>{_NUMBER})"
    rf"(?:\s*(?:±|\+/-|\+-)\s*(?P<spread>{_NUMBER}))?"
    r"(?:\s*(?P<unit>(?:[µμa-zA-Z%°][\w/µμ%·^.-]*)))?"
)
_N_RE = re.compile(r"\b[nN]\s*=\s*(\d+)")
_UNIT_IN_LABEL_RE = re.compile(r"\(([^()]+)\)\s*$")
#: Words that may follow a number but are not its unit.
_NOT_UNITS: frozenset[str] = frozenset(
    {"in", "at", "and", "of", "per", "to", "vs", "or", "for", "with", "a", "the", "on", "by"}
)
_KIND_WORDS: tuple[tuple[str, str], ...] = (
    ("SEM", "SEM"),
    ("S.E.M", "SEM"),
    ("standard error", "SEM"),
    ("SD", "SD"),
    ("standard deviation", "SD"),
)


def _number(text: str) -> float:
    return float(text.replace("−", "-"))


def spread_kind(*texts: str) -> str:
    """The spread kind a caption or footnote names ("mean ± SEM" -> "SEM"); SD if none is named."""
    joined = " ".join(texts)
    for word, kind in _KIND_WORDS:
        if re.search(rf"(?<![A-Za-z]){re.escape(word)}(?![A-Za-z])", joined):
            return kind
    return "SD"


def first_value(
    text: str, *, kind: str = "SD"
) -> tuple[float | None, Dispersion | None, str | None]:
    """The first number in ``text``, its "± spread" and the word after it (a unit candidate)."""
    for match in _VALUE_RE.finditer(text):
        if re.search(r"[nN]\s*=\s*$", text[: match.start()]):
            continue
        value = _number(match.group("value"))
        spread = match.group("spread")
        dispersion = Dispersion(kind=kind, value=abs(_number(spread))) if spread else None
        unit = (match.group("unit") or "").rstrip(".,;")
        return value, dispersion, unit if unit and unit.lower() not in _NOT_UNITS else None
    return None, None, None


def _strip_unit(label: str) -> tuple[str, str | None]:
    match = _UNIT_IN_LABEL_RE.search(label)
    if match is None:
        return label.strip(), None
    return label[: match.start()].strip(), match.group(1).strip()


def _context(template: Proposal | None) -> dict[str, object]:
    if template is None:
        return {"time_point": None, "method": None, "subject": None, "intervention": None}
    return {
        "time_point": template.time_point,
        "method": template.method,
        "subject": template.subject,
        "intervention": template.intervention,
    }


def _base(article: str, file: str, source: Source) -> dict[str, object]:
    return {
        "id": "",
        "article": article,
        "file": file,
        "statistic": "mean",
        "unit_ucum": None,
        "value_normalized": None,
        "unit_normalized": None,
        "sd": None,
        "source": source,
        "extractor": "",
        "confidence": 1.0,
    }


def from_cell(
    table: Table,
    row: int,
    col: int,
    *,
    article: str,
    file: str,
    template: Proposal | None = None,
) -> Proposal:
    """A draft data point from one table cell (value, spread, unit, n, outcome, group)."""
    cell = table.cell(row, col)
    kind = spread_kind(table.caption, *table.footnotes)
    value, dispersion, _ = first_value(cell.text, kind=kind)
    outcome, label_unit = _strip_unit(table.row_label(row))
    header = table.column_header(col)
    group, header_unit = _strip_unit(_N_RE.sub("", header).replace("()", "").strip())
    unit = None
    if col < len(table.column_units) and table.column_units[col]:
        unit = table.column_units[col]
    elif row < len(table.row_units) and table.row_units[row]:
        unit = table.row_units[row]
    else:
        unit = label_unit or header_unit
    n_match = _N_RE.search(header) or _N_RE.search(table.row_label(row))
    source = Source.of_cell(table, row, col, quote=cell.text)
    return Proposal(
        **_base(article, file, source),  # type: ignore[arg-type]
        outcome=outcome,
        group=group or None,
        value=value if value is not None else 0.0,
        unit=unit,
        dispersion=dispersion,
        n=int(n_match.group(1)) if n_match else None,
        **_context(template),  # type: ignore[arg-type]
    )


def from_sentence(
    block: Block,
    span: tuple[int, int],
    *,
    article: str,
    file: str,
    template: Proposal | None = None,
) -> Proposal:
    """A draft data point from one sentence of a paragraph.

    Outcome and group come from the proposal on screen (``template``), since a missed value
    often shares its sentence's context; the curator corrects them in the form.
    """
    sentence = block.text[span[0] : span[1]]
    value, dispersion, unit = first_value(sentence, kind=spread_kind(sentence))
    n_match = _N_RE.search(sentence)
    source = Source.of_text(block, sentence)
    return Proposal(
        **_base(article, file, source),  # type: ignore[arg-type]
        outcome=template.outcome if template else "",
        group=template.group if template else None,
        value=value if value is not None else 0.0,
        unit=unit,
        dispersion=dispersion,
        n=int(n_match.group(1)) if n_match else (template.n if template else None),
        **_context(template),  # type: ignore[arg-type]
    )
