"""Table cells to drafts: one draft per data cell, with outcome and group from the headers.

A table reports its groups either across the columns (header row "Vehicle (n = 9) | 10 mg/kg ...",
outcomes in the row labels) or down the rows (row labels "Vehicle", outcomes in the column
headers). :func:`orientation` decides from the header texts. Header cells, row labels, p-value
columns and "n" columns/rows are not data points; an "n" row or column gives each group its n.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from dataclasses import dataclass, replace

from extract.ingest.document import Document, Table
from extract.nlp.context import find_context
from extract.nlp.quantities import Quantity, find_dispersion_statement
from extract.records.draft import Draft
from extract.records.n_columns import n_columns
from extract.records.patterns import (
    clean_label,
    find_group_n,
    find_n,
    group_and_n,
    header_levels,
    is_plausible_unit,
    read_cell,
    split_label,
)
from extract.records.pct_cells import count_pct_draft
from extract.records.proposal import Source
from extract.records.spread_columns import (
    attach_spread_columns,
    spread_columns,
    spread_level,
)
from extract.records.table_labels import (
    caption_outcome,
    comparison_level,
    is_bare_integer,
    is_count_caption,
    is_count_level,
    is_model_row,
    is_ratio_label,
    is_section_row,
    is_spread_row,
    is_stat_level,
    numeric_header_row,
    numeric_level,
    section_above,
    stat_row,
)
from extract.records.time_axis import time_axis_columns, time_axis_rows
from extract.registry import register_extractor

#: The extractor that reads table cells.
EXTRACTOR = "tables.cells@8"

_GROUP_WORDS = re.compile(
    r"\b(?:vehicle|control|controls|sham|placebo|saline|naive|naïve|untreated|treated|treatment|"
    r"group|arm|cohort|wild[- ]?type|WT|KO|knockout|transgenic|low|mid|middle|high|dose|"
    r"mg/kg|µg/kg|μg/kg|ug/kg|mg/kg/day|g/kg|mL/kg|mg|µg|μg|nmol/kg|µmol/kg|μmol/kg|"
    r"baseline|all|total|male|female|patients|combined|combination)\b",
    re.I,
)
_TIME_WORDS = re.compile(
    r"^\s*(?:(?:at\s+)?(?:week|wk|day|month|hour|h|min|year)s?\s*\d+|\d+\s*(?:weeks?|wk|days?|d|"
    r"months?|mos?|hours?|h|min)|baseline|pre[- ]?(?:treatment|dose)?|post[- ]?(?:treatment|dose)?|"
    r"endpoint|end of study|final|(?:18|19|20)\d\d)\s*$",
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


@dataclass(frozen=True)
class _Header:
    """A column's header levels read apart: the group or outcome label, a time point, the
    statistic a level names ("n" -> count, "Percent"), a whole-number level (a total or n) and
    the full header as written."""

    label: str
    time_point: str | None = None
    statistic: str | None = None
    n: int | None = None
    full: str = ""
    qualifier: str | None = None


def _level_statistic(text: str) -> str | None:
    if is_count_level(text):
        return "count"
    key = clean_label(text).lower()
    if key in ("%", "percent", "percentage", "proportion"):
        return "percent"
    return "median" if key == "median" else "mean"


def _header_levels(table: Table, col: int) -> _Header:
    """A column's header split into its main label and what the other levels say."""
    parts: list[str] = []
    time_point: str | None = None
    statistic: str | None = None
    total: int | None = None
    qualifier: str | None = None
    levels = header_levels(table, col)
    for text in levels:
        if _TIME_WORDS.match(text) and time_point is None:
            time_point = text
        elif col > 0 and qualifier is None and (split := comparison_level(text)) is not None:
            # "Change from baseline" or "Mixed model" under a group qualifies the outcome
            rest, qualifier = split
            if rest:
                parts.append(rest)
        elif col > 0 and total is None and (number := numeric_level(text)) is not None:
            total = number
        elif col > 0 and table.header_rows > 1 and is_stat_level(text) and statistic is None:
            statistic = _level_statistic(text)
        elif col > 0 and table.header_rows > 1 and statistic is None and (named := stat_row(text)):
            statistic = named[0]  # "Mean (SD)" under a group
        elif col > 0 and table.header_rows > 1 and is_ratio_label(text) and statistic is None:
            statistic = "other"  # "HR (95% CI)" over the comparison it reports
        else:
            parts.append(text)
    label = " ".join(parts)
    return _Header(label, time_point, statistic, total, " ".join(levels), qualifier)


def _is_n_label(label: str) -> bool:
    # "n (%)" heads counts with their percentages: data, not sample sizes.
    return bool(_N_LABEL.match(label)) and "%" not in label


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


@dataclass(frozen=True)
class _TableFacts:
    """What a table states once for all its cells (caption, footnotes, orientation)."""

    by_columns: bool
    time_rows: bool
    table_kind: str | None
    table_n: int | None
    time_point: str | None
    median_table: bool
    count_table: bool
    caption_outcome: str | None
    method: str | None = None


def _facts(table: Table) -> _TableFacts:
    body_labels = [table.row_label(r) for r in range(table.header_rows, table.n_rows)]
    time_rows = sum(1 for label in body_labels if _TIME_WORDS.match(label)) > len(body_labels) / 2
    texts = _table_texts(table)
    caption_time = _TIME_IN_TEXT.search(texts)
    return _TableFacts(
        by_columns=time_rows or orientation(table) == "groups-in-columns",
        time_rows=time_rows,
        table_kind=find_dispersion_statement(texts),
        table_n=find_group_n(texts),
        time_point=(
            caption_time.group(caption_time.lastindex or 1).lower() if caption_time else None
        ),
        median_table=bool(_MEDIAN.search(texts)) and not _MEAN.search(texts),
        count_table=is_count_caption(table.caption),
        caption_outcome=caption_outcome(table.caption),
        # the caption or footnotes of this table tie a method to all of its values
        method=next((m.value for m in find_context(texts) if m.kind == "method"), None),
    )


@register_extractor(
    "tables.cells", 8, factory=None, description="data cells of tables, with headers, n and spread"
)
def table_drafts(document: Document, table: Table, *, order: float = 0.0) -> list[Draft]:
    """One draft per data cell of ``table``, in row-major order.

    Args:
        document: the article (for its methods-free context: nothing is read outside the table).
        table: the table to read.
        order: the table's place in the document's reading order.

    Returns:
        Drafts whose outcome, group, unit, n, statistic and dispersion kind come from the table
        alone (cells, headers, caption and footnotes); linking fills the rest.
    """
    if table.n_rows <= table.header_rows or table.n_cols < 2:
        return []
    if numeric_header_row(table):
        table = replace(table, header_rows=table.header_rows - 1)
    table = _with_header_rows(table)
    if table.n_rows <= table.header_rows:
        return []
    facts = _facts(table)
    col_info = [_header_levels(table, c) for c in range(table.n_cols)]
    n_cols_idx = [
        c
        for c in range(1, table.n_cols)
        if _is_n_label(col_info[c].label)
        or (not facts.by_columns and _is_n_label(table.cell(table.header_rows - 1, c).text))
    ]
    skip_cols = {
        c
        for c in range(1, table.n_cols)
        if _P_HEADER.match(col_info[c].label)
        or any(
            _P_HEADER.match(clean_label(table.cell(r, c).text)) for r in range(table.header_rows)
        )
    }
    skip_cols.update(n_cols_idx)
    n_pairs = n_columns(table)
    skip_cols.update(n_pairs.values())
    spread_pairs = spread_columns(table, skip=skip_cols)
    skip_cols.update(pair.col for pair in spread_pairs)
    data_rows = list(range(table.header_rows, table.n_rows))
    n_rows_idx = [r for r in data_rows if _is_n_label(table.row_label(r))]
    time_cols = time_axis_columns(table, [col_info[c].label for c in range(table.n_cols)])
    skip_cols.update(time_cols)
    axis_rows = time_axis_rows(table)

    drafts: list[Draft] = []
    at: dict[tuple[int, int], int] = {}
    for r in data_rows:
        body_label = clean_label(table.row_label(r))
        if r in n_rows_idx or _P_HEADER.match(body_label) or is_section_row(table, r):
            continue
        if r in axis_rows:
            continue
        row_time = next((time_cols[c] + " " + _int_text(table, r, c) for c in time_cols), None)
        if facts.by_columns and is_spread_row(body_label) and r > table.header_rows:
            _attach_spread_row(table, r, body_label, drafts, at, skip_cols)
            continue
        row_stat = stat_row(body_label) if facts.by_columns else None
        section = section_above(table, r)
        for c in range(1, table.n_cols):
            if c in skip_cols:
                continue
            parsed = read_cell(table.cell(r, c).text)
            if parsed is None:
                continue
            header = col_info[c]
            row_label, col_label, time_point = body_label, header.label, header.time_point
            time_point = time_point or row_time or _col_time(table, axis_rows, c)
            if facts.time_rows:
                # Time points down the rows: the outcome and group come from the header levels.
                row_label, col_label = _split_levels(table, c, section, facts.caption_outcome)
                time_point = body_label
            elif row_stat is not None:
                # "Mean (SD)" under a section row "Age": the section is the outcome.
                row_label = section or facts.caption_outcome or body_label
            elif facts.by_columns and section and parsed.percent is not None:
                # "Female 214 (70.9%)" under a section row "Sex": a category of that variable.
                row_label = f"{section}: {body_label}"
            elif facts.by_columns and section and is_model_row(body_label):
                # "Model 2" under a section row "Heart failure": the section is the outcome.
                col_label = f"{col_label}, {body_label}" if col_label else body_label
                row_label = section
            elif facts.count_table and facts.caption_outcome:
                if is_bare_integer(table.cell(r, c).text):
                    # "Number of cases, by region and species": both labels are strata.
                    strata = f"{col_label}, {body_label}" if col_label else body_label
                    row_label, col_label = (
                        (facts.caption_outcome, strata)
                        if facts.by_columns
                        else (strata, facts.caption_outcome)
                    )
            draft = _cell_draft(
                table,
                parsed,
                r,
                c,
                row_label=row_label,
                col_label=col_label,
                by_columns=facts.by_columns,
                order=order,
                outcome_how=(
                    "caption"
                    if row_label == facts.caption_outcome and row_label != body_label
                    else "section"
                    if row_label == section and row_label != body_label
                    else None
                ),
            )
            if draft is None:
                continue
            if header.qualifier and facts.by_columns:
                draft = draft._copy_with(outcome=f"{draft.outcome}, {header.qualifier.lower()}")
            draft = count_pct_draft(
                draft,
                table,
                r,
                c,
                texts=(header.full, table.row_label(r), _corner(table), _table_texts(table)),
                total=header.n if header.n is not None else group_and_n(header.full)[1],
            )
            draft = _fill_from_table(
                draft,
                table,
                parsed_unit=parsed.unit,
                parsed_kind=parsed.spread.kind if parsed.spread else None,
                row=r,
                col=c,
                facts=facts,
                header=header,
                row_stat=row_stat,
                outcome_label=row_label if facts.by_columns else col_label,
                n_from_row=(
                    _int_cell(table.cell(r, n_pairs[c]).text)
                    if c in n_pairs
                    else _n_from(table, n_rows_idx, c, by_rows=True)
                ),
                n_from_col=(
                    _int_cell(table.cell(r, n_pairs[c]).text)
                    if c in n_pairs
                    else _n_from(table, n_cols_idx, r, by_rows=False)
                ),
                time_point=time_point or facts.time_point,
            )
            if facts.method is not None:
                draft = draft.with_found("method", "caption", method=facts.method)
            at[(r, c)] = len(drafts)
            drafts.append(draft)
        attach_spread_columns(table, spread_pairs, drafts, at, r)
    return drafts


def _int_text(table: Table, row: int, col: int) -> str:
    return clean_label(table.cell(row, col).text)


def _col_time(table: Table, time_rows: dict[int, str], col: int) -> str | None:
    for r, unit in time_rows.items():
        text = clean_label(table.cell(r, col).text)
        if text:
            return f"{unit} {text}"
    return None


def _corner(table: Table) -> str:
    return " ".join(table.cell(r, 0).text for r in range(table.header_rows))


def _attach_spread_row(
    table: Table,
    row: int,
    label: str,
    drafts: list[Draft],
    at: dict[tuple[int, int], int],
    skip_cols: set[int],
) -> None:
    """A row "Inter-quartile range" under "Median": its pairs are the spread of the value
    above in the same column (when that value has none of its own), never data points."""
    kind = "IQR" if re.search(r"quartile|IQR", label, re.I) else None
    named = spread_level(label)  # "SD", "SE", "SEM", "95% CI"
    kind = (
        kind
        or find_dispersion_statement(label)
        or (named[1] if named is not None else None)
        or ("range" if "range" in label.lower() else None)
    )
    for c in range(1, table.n_cols):
        index = at.get((row - 1, c))
        if c in skip_cols or index is None:
            continue
        parsed = read_cell(table.cell(row, c).text)
        above = drafts[index]
        if parsed is None or above.dispersion_value is not None:
            continue
        spread = parsed.spread.value if parsed.spread is not None else parsed.value
        if kind is None:
            continue
        if isinstance(spread, tuple) and kind in ("SD", "SEM"):
            kind = "CI95"
        drafts[index] = above.with_found(
            "dispersion", "row", dispersion_value=spread, dispersion_kind=kind
        )


def _split_levels(
    table: Table, col: int, section: str | None, from_caption: str | None
) -> tuple[str, str]:
    """For a table with time points down the rows: the outcome (the header level with a unit,
    else the section row above, else the corner cell unless it only names the time axis, else
    the caption's first phrase) and the group (the other header levels)."""
    outcome, groups = "", []
    for r in range(table.header_rows):
        text = clean_label(table.cell(r, col).text)
        if not text or text in groups or text == outcome or is_stat_level(text):
            continue
        if stat_row(text) is not None:
            continue  # "Mean (SD)" under a group names the statistic, not the group
        if numeric_level(text) is not None:
            continue
        if (split := comparison_level(text)) is not None:
            text = split[0]  # "Usual care Change from baseline": the comparison is no group
            if not text or text in groups:
                continue
        if not outcome and split_label(text)[1]:
            outcome = text
        else:
            groups.append(text)
    if not outcome and section:
        outcome = section
    if not outcome:
        corner = " ".join(clean_label(table.cell(r, 0).text) for r in range(table.header_rows))
        corner = " ".join(corner.split())
        time_axis = re.fullmatch(
            r"(?:year|years|time|time point|visit|period|date|week|day|month|hour)s?", corner, re.I
        )
        outcome = corner if corner and not time_axis else (from_caption or corner)
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
    outcome_how: str | None = None,
) -> Draft | None:
    outcome_label, group_label = (row_label, col_label) if by_columns else (col_label, row_label)
    outcome, _ = split_label(outcome_label)
    if not outcome or _STAT_LABEL.match(outcome):
        return None
    group, _ = group_and_n(group_label)
    disp_value = parsed.spread.value if parsed.spread is not None else None
    source = Source.of_cell(table, row, col)
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
        "outcome", outcome_how or ("row" if by_columns else "column")
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
    facts: _TableFacts,
    header: _Header,
    row_stat: tuple[str, str | None] | None,
    outcome_label: str,
    n_from_row: int | None,
    n_from_col: int | None,
    time_point: str | None,
) -> Draft:
    by_columns = facts.by_columns
    group_label = table.column_header(col) if by_columns else table.row_label(row)
    # Unit: the cell, then the units ingest read from the outcome's label, then the label itself;
    # a header unit must read as a unit ("unspecified" or a place name in brackets is none).
    if parsed_unit:
        draft = draft.with_found("unit", "cell")
    elif draft.statistic != "count":
        units = table.row_units if by_columns else table.column_units
        index = row if by_columns else col
        unit = units[index] if index < len(units) and row_stat is None else None
        unit = unit or split_label(outcome_label)[1]
        if unit is None and col < len(table.column_units):
            unit = table.column_units[col]  # an outcome level above the groups
        if unit and is_plausible_unit(unit):
            draft = draft.with_found("unit", "header", unit=unit)
    # n: an "n" row/column, the group's header, then the caption or footnotes.
    n_line = n_from_row if by_columns else n_from_col
    header_n = group_and_n(group_label)[1]
    if header_n is None and by_columns and header.statistic is None:
        header_n = header.n  # a whole number under the group's name: its total or n
    if n_line is not None:
        draft = draft.with_found("n", "n_row", n=n_line)
    elif header_n is not None:
        draft = draft.with_found("n", "header", n=header_n)
    elif facts.table_n is not None:
        draft = draft.with_found("n", "caption", n=facts.table_n)
    elif (single := find_n(" ".join(table.footnotes))) is not None:
        draft = draft.with_found("n", "footnote", n=single)
    # Dispersion kind: the cell, the row's statistic label ("Median (min, max)"), the headers
    # ("mean (SEM)"), then the caption or footnotes.
    if draft.dispersion_value is not None:
        kind = parsed_kind
        how = "cell"
        if kind is None and row_stat is not None and row_stat[1] is not None:
            kind, how = row_stat[1], "row"
        if kind is None:
            kind = find_dispersion_statement(" ".join(_stat_headers(table, row, col)))
            how = "header"
        if kind is None and facts.table_kind is not None:
            kind, how = facts.table_kind, "caption"
        if kind is not None:
            draft = draft.with_found("dispersion", how, dispersion_kind=_fit_kind(kind, draft))
    draft = _table_statistic(draft, table, row, col, facts=facts, header=header, row_stat=row_stat)
    if time_point:
        draft = draft.with_found("time_point", "header", time_point=time_point)
    return draft


def _table_statistic(
    draft: Draft,
    table: Table,
    row: int,
    col: int,
    *,
    facts: _TableFacts,
    header: _Header,
    row_stat: tuple[str, str | None] | None,
) -> Draft:
    """The statistic of a cell, nearest statement first: the cell ("42 (37.5%)", "37.5%") > the
    row's label ("Mean (SD)", "Median") > a header level ("n", "No.", "Percent", "Median") >
    the caption ("Number of ...", "median (IQR)"). Linking then derives it from the dispersion
    kind; a bare value with none of these is "single", never a mean."""
    if draft.statistic is not None:
        return draft
    bare = draft.dispersion_value is None and is_bare_integer(table.cell(row, col).text)
    corner = " ".join(table.cell(r, 0).text for r in range(table.header_rows))
    if any(is_ratio_label(text) for text in (header.full, table.row_label(row), corner)):
        return draft.with_found("statistic", "header", statistic="other")
    if row_stat is not None:
        return draft.with_found("statistic", "row", statistic=row_stat[0])
    statistic = header.statistic
    label = table.row_label(row) if facts.by_columns else table.column_header(col)
    if statistic is None and is_stat_level(label) and draft.dispersion_value is None:
        statistic = _level_statistic(label)  # a row "Percentage" or "No." of bare values
    if statistic == "count" and not bare:
        statistic = None  # "n" over a mean ± SD is a sample-size label, not a count
    if statistic is not None:
        return draft.with_found("statistic", "header", statistic=statistic)
    if facts.count_table and bare:
        return draft.with_found("statistic", "caption", statistic="count")
    if facts.median_table:
        return draft.with_found("statistic", "caption", statistic="median")
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
