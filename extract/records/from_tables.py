"""Table cells to drafts: one draft per data cell, with outcome and group from the headers.

A table reports its groups either across the columns (header row "Vehicle (n = 9) | 10 mg/kg ...",
outcomes in the row labels) or down the rows (row labels "Vehicle", outcomes in the column
headers). :func:`orientation` decides from the header texts. Header cells, row labels, p-value
columns and "n" columns/rows are not data points; an "n" row or column gives each group its n.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from dataclasses import replace

from extract.ingest.document import Document, Table
from extract.nlp.quantities import Quantity, find_dispersion_statement
from extract.records.draft import Draft
from extract.records.patterns import find_group_n, find_n, group_and_n, read_cell, split_label
from extract.records.proposal import Source
from extract.registry import register_extractor

#: The extractor that reads table cells.
EXTRACTOR = "tables.cells@2"

_GROUP_WORDS = re.compile(
    r"\b(?:vehicle|control|controls|sham|placebo|saline|naive|naïve|untreated|treated|treatment|"
    r"group|arm|cohort|wild[- ]?type|WT|KO|knockout|transgenic|low|mid|middle|high|dose|"
    r"mg/kg|µg/kg|μg/kg|ug/kg|mg/kg/day|g/kg|mL/kg|mg|µg|μg|nmol/kg|µmol/kg|μmol/kg|"
    r"baseline|all|total|male|female|patients|combined|combination)\b",
    re.I,
)
_TIME_WORDS = re.compile(
    r"^\s*(?:(?:at\s+)?(?:week|wk|day|month|hour|h|min|year)s?\s*\d+|\d+\s*(?:weeks?|wk|days?|d|"
    r"months?|hours?|h|min)|baseline|pre[- ]?(?:treatment|dose)?|post[- ]?(?:treatment|dose)?|"
    r"endpoint|end of study|final)\s*$",
    re.I,
)
_P_HEADER = re.compile(
    r"^\s*(?:p|p[- ]?values?|p\s*\(.*\)|significance|sig\.?)\s*[a-z*†‡§]?\s*$", re.I
)
_N_LABEL = re.compile(
    r"^\s*(?:n|no\.?|number|number of (?:animals|subjects|patients|mice|rats|samples)|"
    r"sample size|animals|subjects)\s*(?:\(.*\))?\s*$",
    re.I,
)
_STAT_LABEL = re.compile(
    r"^\s*(?:parameter|parameters|variable|variables|outcome|outcomes|measure|"
    r"measures|characteristic|characteristics|item|endpoint|group|groups)?\s*$",
    re.I,
)
_MEDIAN = re.compile(r"\bmedian\b", re.I)
_MEAN = re.compile(r"\bmeans?\b", re.I)
_TIME_IN_TEXT = re.compile(
    r"\b(?:at|after|on)\s+((?:week|day|month|hour)\s+\d+|\d+\s+(?:weeks?|days?|months?|hours?|h|min))\b"
    r"|\b(baseline)\b",
    re.I,
)


def group_likeness(label: str) -> int:
    """How strongly a header text reads as a group name (0 = not at all)."""
    score = 0
    if re.search(r"\b[nN]\s*=\s*\d+", label):
        score += 3
    if _GROUP_WORDS.search(label):
        score += 2
    if re.search(r"\d", label) and re.search(r"/kg|\bmg\b|\bµg\b|\bμg\b|dose", label, re.I):
        score += 1
    return score


def orientation(table: Table) -> str:
    """``"groups-in-columns"`` or ``"groups-in-rows"``, decided from the header texts.

    The side whose labels read more like groups (sample sizes, "vehicle", doses) holds the
    groups; the other holds the outcomes. Units in the row labels point to outcomes in rows.
    """
    col_labels = [table.column_header(c) for c in range(1, table.n_cols)]
    row_labels = [table.row_label(r) for r in range(table.header_rows, table.n_rows)]
    col_score = sum(group_likeness(label) for label in col_labels) / max(len(col_labels), 1)
    row_score = sum(group_likeness(label) for label in row_labels) / max(len(row_labels), 1)
    col_score += sum(1 for label in row_labels if split_label(label)[1]) / max(len(row_labels), 1)
    row_score += sum(1 for label in col_labels if split_label(label)[1]) / max(len(col_labels), 1)
    return "groups-in-columns" if col_score >= row_score else "groups-in-rows"


def _header_levels(table: Table, col: int) -> tuple[str, str | None]:
    """A column's header split into its main label and a time point from a time-like level."""
    parts: list[str] = []
    time_point: str | None = None
    for r in range(table.header_rows):
        text = " ".join(table.cell(r, col).text.split())
        if not text or text in parts:
            continue
        if _TIME_WORDS.match(text) and time_point is None:
            time_point = text
        else:
            parts.append(text)
    return " ".join(parts), time_point


def _is_n_label(label: str) -> bool:
    return bool(_N_LABEL.match(label))


def _int_cell(text: str) -> int | None:
    match = re.fullmatch(r"\s*\(?\s*(?:n\s*=\s*)?(\d{1,5})\s*\)?\s*", text)
    return int(match.group(1)) if match else None


def _table_texts(table: Table) -> str:
    return " ".join((table.caption, *table.footnotes))


def table_order(document: Document, table: Table, index: int) -> float:
    """The table's place in reading order: its caption block's index, else after its page's text."""
    for block in document.blocks:
        if block.label == table.label and block.kind == "caption":
            return float(block.index)
    if table.page is not None:
        on_page = [b.index for b in document.blocks if b.page is not None and b.page <= table.page]
        if on_page:
            return max(on_page) + 0.5
    return float(len(document.blocks) + index)


@register_extractor(
    "tables.cells", 2, factory=None, description="data cells of tables, with headers, n and spread"
)
def table_drafts(document: Document, table: Table, *, order: float = 0.0) -> list[Draft]:
    """One draft per data cell of ``table``, in row-major order.

    Args:
        document: the article (for its methods-free context: nothing is read outside the table).
        table: the table to read.
        order: the table's place in the document's reading order.

    Returns:
        Drafts whose outcome, group, unit, n and dispersion kind come from the table alone
        (cells, headers, caption and footnotes); linking fills the rest.
    """
    if table.n_rows <= table.header_rows or table.n_cols < 2:
        return []
    table = _with_header_rows(table)
    if table.n_rows <= table.header_rows:
        return []
    body_labels = [table.row_label(r) for r in range(table.header_rows, table.n_rows)]
    time_rows = sum(1 for label in body_labels if _TIME_WORDS.match(label)) > len(body_labels) / 2
    by_columns = time_rows or orientation(table) == "groups-in-columns"
    texts = _table_texts(table)
    table_kind = find_dispersion_statement(texts)
    table_n = find_group_n(texts)
    if table_n is None and not by_columns:
        table_n = None
    caption_time = _TIME_IN_TEXT.search(texts)
    median_table = bool(_MEDIAN.search(texts)) and not _MEAN.search(texts)

    col_info = [_header_levels(table, c) for c in range(table.n_cols)]
    skip_cols = {
        c
        for c in range(1, table.n_cols)
        if _P_HEADER.match(col_info[c][0]) or _is_n_label(col_info[c][0])
    }
    n_cols_idx = [c for c in range(1, table.n_cols) if _is_n_label(col_info[c][0])]
    data_rows = [r for r in range(table.header_rows, table.n_rows)]
    n_rows_idx = [r for r in data_rows if _is_n_label(table.row_label(r))]

    drafts: list[Draft] = []
    for r in data_rows:
        body_label = " ".join(table.row_label(r).split())
        if r in n_rows_idx or _P_HEADER.match(body_label):
            continue
        for c in range(1, table.n_cols):
            if c in skip_cols:
                continue
            parsed = read_cell(table.cell(r, c).text)
            if parsed is None:
                continue
            row_label = body_label
            col_label, time_point = col_info[c]
            if time_rows:
                # Time points down the rows: the outcome and group come from the header levels.
                row_label, col_label = _split_levels(table, c)
                time_point = body_label
            draft = _cell_draft(
                table,
                parsed,
                r,
                c,
                row_label=row_label,
                col_label=col_label,
                by_columns=by_columns,
                order=order,
            )
            if draft is None:
                continue
            drafts.append(
                _fill_from_table(
                    draft,
                    table,
                    parsed_unit=parsed.unit,
                    parsed_kind=parsed.spread.kind if parsed.spread else None,
                    row=r,
                    col=c,
                    by_columns=by_columns,
                    table_kind=table_kind,
                    table_n=table_n,
                    n_from_row=_n_from(table, n_rows_idx, c, by_rows=True),
                    n_from_col=_n_from(table, n_cols_idx, r, by_rows=False),
                    time_point=time_point
                    or (
                        caption_time.group(caption_time.lastindex or 1).lower()
                        if caption_time
                        else None
                    ),
                    median_table=median_table,
                )
            )
    return drafts


def _split_levels(table: Table, col: int) -> tuple[str, str]:
    """For a table with time points down the rows: the outcome level (with a unit) and the group."""
    outcome, groups = "", []
    for r in range(table.header_rows):
        text = " ".join(table.cell(r, col).text.split())
        if not text or text in groups or text == outcome:
            continue
        if not outcome and split_label(text)[1]:
            outcome = text
        else:
            groups.append(text)
    if not outcome:
        outcome = " ".join(
            " ".join(table.cell(r, 0).text.split()) for r in range(table.header_rows)
        )
    return outcome, " ".join(groups)


def _with_header_rows(table: Table) -> Table:
    """The table with header rows that ingest read as body rows counted as headers.

    A row right under the headers is a header too when it holds no value cell, or when its label
    repeats the header's label (a spanning corner cell copied down).
    """
    rows = table.header_rows
    while rows < table.n_rows - 1:
        label = table.row_label(rows)
        values = [read_cell(table.cell(rows, c).text) for c in range(1, table.n_cols)]
        repeated = rows > 0 and label and label == table.row_label(rows - 1)
        if any(v is not None for v in values) and not repeated:
            break
        if not any(table.cell(rows, c).text.strip() for c in range(1, table.n_cols)):
            break  # a section row ("Haematology") inside the body, not a header
        rows += 1
    return table if rows == table.header_rows else replace(table, header_rows=rows)


def _n_from(table: Table, indices: list[int], other: int, *, by_rows: bool) -> int | None:
    for index in indices:
        text = table.cell(index, other).text if by_rows else table.cell(other, index).text
        value = _int_cell(text)
        if value is not None:
            return value
    return None


def _cell_draft(
    table: Table,
    parsed: Quantity,
    row: int,
    col: int,
    *,
    row_label: str,
    col_label: str,
    by_columns: bool,
    order: float,
) -> Draft | None:
    cell = table.cell(row, col)
    outcome_label, group_label = (row_label, col_label) if by_columns else (col_label, row_label)
    outcome, _ = split_label(outcome_label)
    if not outcome or _STAT_LABEL.match(outcome):
        return None
    group, _ = group_and_n(group_label)
    disp_value = parsed.spread.value if parsed.spread is not None else None
    source = Source(
        kind="table",
        page=cell.page if cell.page is not None else table.page,
        bbox=cell.bbox,
        section=table.section,
        table=table.label,
        row=row,
        col=col,
        quote=" ".join(cell.text.split()),
        ref=table.ref,
    )
    statistic: str | None = None
    if parsed.percent is not None:
        statistic = "count"
    elif parsed.statistic == "percent":
        statistic = "percent"
    draft = Draft(
        order=(order, row, col),
        outcome=outcome,
        group=group or None,
        statistic=statistic,
        value=parsed.value,
        raw=source.quote,
        unit=parsed.unit,
        dispersion_kind=None,
        dispersion_value=disp_value,
        n=None,
        source=source,
        extractor=EXTRACTOR,
        location=(table.label, row, col),
    )
    draft = draft.with_found("value", "cell").with_found(
        "outcome", "row" if by_columns else "column"
    )
    if group:
        draft = draft.with_found("group", "column" if by_columns else "row")
    return draft


def _fill_from_table(
    draft: Draft,
    table: Table,
    *,
    parsed_unit: str | None,
    parsed_kind: str | None,
    row: int,
    col: int,
    by_columns: bool,
    table_kind: str | None,
    table_n: int | None,
    n_from_row: int | None,
    n_from_col: int | None,
    time_point: str | None,
    median_table: bool,
) -> Draft:
    row_label = table.row_label(row)
    col_label = table.column_header(col)
    outcome_label = row_label if by_columns else col_label
    group_label = col_label if by_columns else row_label
    # Unit: the cell, then the units ingest read from the outcome's label, then the label itself.
    if parsed_unit:
        draft = draft.with_found("unit", "cell")
    else:
        units = table.row_units if by_columns else table.column_units
        index = row if by_columns else col
        unit = units[index] if index < len(units) else None
        unit = unit or split_label(outcome_label)[1]
        if unit is None and col < len(table.column_units):
            unit = table.column_units[col]  # an outcome level above the groups
        if unit:
            draft = draft.with_found("unit", "header", unit=unit)
    # n: an "n" row/column, the group's header, then the caption or footnotes.
    n_line = n_from_row if by_columns else n_from_col
    header_n = group_and_n(group_label)[1]
    if n_line is not None:
        draft = draft.with_found("n", "n_row", n=n_line)
    elif header_n is not None:
        draft = draft.with_found("n", "header", n=header_n)
    elif table_n is not None:
        draft = draft.with_found("n", "caption", n=table_n)
    elif (single := find_n(" ".join(table.footnotes))) is not None:
        draft = draft.with_found("n", "footnote", n=single)
    # Dispersion kind: the cell, the headers ("mean (SEM)"), then the caption or footnotes.
    if draft.dispersion_value is not None:
        kind = parsed_kind
        how = "cell"
        if kind is None:
            kind = find_dispersion_statement(" ".join(_stat_headers(table, row, col)))
            how = "header"
        if kind is None and table_kind is not None:
            kind, how = table_kind, "caption"
        if kind is not None:
            draft = draft.with_found("dispersion", how, dispersion_kind=_fit_kind(kind, draft))
    if draft.statistic is None and median_table:
        draft = draft.with_found("statistic", "caption", statistic="median")
    if time_point:
        draft = draft.with_found("time_point", "header", time_point=time_point)
    return draft


def _stat_headers(table: Table, row: int, col: int) -> Iterator[str]:
    """Header texts that may name the statistic: the column's headers, the row label, the corner."""
    for r in range(table.header_rows):
        yield table.cell(r, col).text
    for r in range(table.header_rows):
        yield table.cell(r, 0).text
    yield table.row_label(row)


def _fit_kind(kind: str, draft: Draft) -> str:
    """A kind that matches the value's shape: a pair is a CI, IQR or range; a single number SD/SEM."""
    is_pair = isinstance(draft.dispersion_value, tuple)
    if is_pair and kind in ("SD", "SEM"):
        return "CI95"
    if not is_pair and kind in ("CI95", "IQR", "range"):
        return "SD"
    return kind
