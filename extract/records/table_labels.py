"""What a table's labels say about the statistic of a cell, beyond its group and outcome.

Real tables name the statistic in places other than the cell: a row "Mean (SD)" or "Median
(min, max)" under a section row "Age"; a header level "n" or "Percent" under a group; a caption
"Number of cases, by ...". These helpers read such labels; :mod:`extract.records.from_tables`
decides the precedence (docs/records.md).
"""

from __future__ import annotations

import re

from extract.ingest.document import Table
from extract.records.patterns import clean_label, read_cell

#: A row label or header level that names only a statistic (and maybe its spread).
_STAT_ROW = re.compile(
    r"^(?P<stat>mean|average|arithmetic mean|geometric mean|median)\s*"
    r"(?:[(\[,]?\s*(?:±|\+/-)?\s*(?P<kind>SD|SEM|SE|s\.d\.|s\.e\.m\.|IQR|Q1\s*[,–-]\s*Q3|"
    r"range|min(?:imum)?\s*[,–-]\s*max(?:imum)?|(?:95\s*%\s*)?CI)\s*[)\]]?)?$",
    re.I,
)
#: A row label that names only a spread: its values belong to the statistic above.
_SPREAD_ROW = re.compile(
    r"^(?:SD|SEM|SE|standard deviation|standard error(?: of the mean)?|IQR|"
    r"inter-?\s?quartile range|range|min(?:imum)?\s*[,–-]\s*max(?:imum)?|(?:95\s*%\s*)?CI|"
    r"(?:95\s*%\s*)?confidence interval)$",
    re.I,
)
#: A header level that says its cells are counts.
_COUNT_LEVEL = re.compile(
    r"^(?:n|no\.?|number|numbers|count|counts|cases|patients|participants|subjects|"
    r"persons|people|deaths|events|frequency|freq\.?|(?:n|no\.?)\s*\(%\)|"
    r"(?:number|no\.?)\s+of\s+\w+(?:\s+\w+)?)$",
    re.I,
)
#: A header level that names a statistic, not a group ("Percent", "Mean", "Change from baseline").
_STAT_LEVEL = re.compile(r"^(?:%|percent(?:age)?|proportion|mean|median|average)$", re.I)
#: A label that names a ratio between groups: its values are no means ("HR (95% CI)").
_RATIO = re.compile(
    r"\b(?:a?HRs?|a?ORs?|RRs?|IRRs?|(?:hazard|odds|risk|rate|incidence rate)\s+ratios?|"
    r"relative\s+risks?)\b"
)
#: A row label that names a model of an analysis, not an outcome ("Model 2", "Adjusted").
_MODEL_ROW = re.compile(
    r"^(?:model\s*\w{1,3}|crude|unadjusted|(?:fully\s+|age[- ]|multivariable[- ])?adjusted|"
    r"multivariable|multivariate|univariable|univariate)$",
    re.I,
)
#: A header level (or the end of one) that names a comparison or a model, not a group.
_COMPARISON = re.compile(
    r"(?:^|\s)(?P<level>(?:(?:mean|LS[- ]mean|adjusted)\s+)?changes?\s+from\s+baseline|"
    r"(?:(?:mean|between[- ]groups?|adjusted)\s+)?differences?|"
    r"mixed[- ]effects?(?:\s+models?)?|mixed\s+models?|ANCOVA)$",
    re.I,
)
#: A caption that says the table counts something: "Number of ...", "No. of ...", "Counts of".
_COUNT_CAPTION = re.compile(r"^(?:(?:the\s+)?(?:number|no\.|numbers|counts?)\s+of\b)", re.I)
_CAPTION_LABEL = re.compile(r"^\s*(?:table|tab\.)\s*[A-Z]?\d+[A-Za-z]?\s*[.:|—–-]?\s*", re.I)
_CAPTION_CUT = re.compile(
    r"\s*(?:[,;:(\[]|\s[—–-]\s|\.\s|\.$|\s(?:by|among|in|at|for|from|according|per|with|"
    r"during|across|and\s+(?:their|its))\s)",
    re.I,
)
_KIND_WORDS: dict[str, str] = {
    "sd": "SD",
    "s.d.": "SD",
    "sem": "SEM",
    "se": "SEM",
    "s.e.m.": "SEM",
    "iqr": "IQR",
    "range": "range",
    "ci": "CI95",
}


def stat_row(label: str) -> tuple[str, str | None] | None:
    """The statistic and spread kind a row label names alone: "Mean (SD)" -> ("mean", "SD"),
    "Median (min, max)" -> ("median", "range"), "Median [IQR]" -> ("median", "IQR"); else None."""
    match = _STAT_ROW.match(clean_label(label))
    if match is None:
        return None
    stat = "median" if match["stat"].lower() == "median" else "mean"
    return stat, _kind_of(match["kind"])


def is_spread_row(label: str) -> bool:
    """True for a row label that names only a spread ("Inter-quartile range", "SD", "95% CI")."""
    return bool(_SPREAD_ROW.match(clean_label(label)))


def _kind_of(text: str | None) -> str | None:
    if not text:
        return None
    key = " ".join(text.lower().split())
    if re.match(r"min|q1", key):
        return "range" if key.startswith("min") else "IQR"
    if "ci" in key:
        return "CI95"
    return _KIND_WORDS.get(key)


def is_count_level(text: str) -> bool:
    """True for a header level that says its cells are counts ("n", "No.", "Number of cases")."""
    return bool(_COUNT_LEVEL.match(clean_label(text)))


def is_stat_level(text: str) -> bool:
    """True for a header level that names a statistic, not a group ("Percent", "Mean")."""
    return bool(_STAT_LEVEL.match(clean_label(text)) or is_count_level(text))


def is_ratio_label(text: str) -> bool:
    """True when a label names a ratio between groups ("HR (95% CI)", "Odds ratio")."""
    return bool(_RATIO.search(text)) or bool(re.search(r"\b(?:hazard|odds|risk) ratio", text, re.I))


def is_model_row(label: str) -> bool:
    """True for a row label that names an analysis model ("Model 1", "Adjusted")."""
    return bool(_MODEL_ROW.match(clean_label(label)))


def comparison_level(text: str) -> tuple[str, str] | None:
    """A header level split into (the rest, the comparison or model it ends with):
    "Change from baseline" -> ("", "Change from baseline"); "Usual care Change from Baseline"
    -> ("Usual care", "Change from Baseline"); "Mixed model" -> ("", "Mixed model"); else None (a bare "Mixed" may name a group)."""
    label = clean_label(text)
    match = _COMPARISON.search(label)
    if match is None:
        return None
    return label[: match.start()].strip(" ,;:-"), match["level"]


def is_count_caption(caption: str) -> bool:
    """True when the caption says the table counts something ("Number of cases, by ...")."""
    return bool(_COUNT_CAPTION.match(_CAPTION_LABEL.sub("", clean_label(caption))))


def caption_outcome(caption: str) -> str | None:
    """What a table measures, from its caption's first phrase: "Table 3. Number of imported
    cases, by region" -> "Number of imported cases"; None when the phrase is long or empty."""
    text = _CAPTION_LABEL.sub("", clean_label(caption))
    head = _CAPTION_CUT.split(text, maxsplit=1)[0].strip(" .")
    if not head or len(head.split()) > 10 or not re.search(r"[A-Za-z]{3}", head):
        return None
    return head


def is_section_row(table: Table, row: int) -> bool:
    """True for a body row with a label and no value in any other cell ("Age", "Sex")."""
    if not table.row_label(row):
        return False
    return not any(table.cell(row, c).text.strip() for c in range(1, table.n_cols))


def section_above(table: Table, row: int) -> str | None:
    """The label of the nearest section row above ``row`` in the body, if any."""
    for r in range(row - 1, table.header_rows - 1, -1):
        if is_section_row(table, r):
            return clean_label(table.row_label(r))
    return None


def numeric_level(text: str) -> int | None:
    """A header level that is only a whole number ("15", "1,234"): a column total or n."""
    match = re.fullmatch(r"\(?\s*(\d{1,3}(?:,\d{3})+|\d{1,6})\s*\)?", clean_label(text))
    return int(match.group(1).replace(",", "")) if match else None


def is_bare_integer(text: str) -> bool:
    """True for a cell that holds only a whole number ("86", "1,534"), nothing else."""
    return bool(re.fullmatch(r"\d{1,3}(?:,\d{3})+|\d+", clean_label(text)))


def numeric_header_row(table: Table) -> bool:
    """True when the last header row holds a label and whole numbers only: a totals row that
    ingest read as a header ("Region | 464 | 15 | 11 ..."), i.e. a body row."""
    if table.header_rows < 2:
        return False
    row = table.header_rows - 1
    values = [table.cell(row, c).text for c in range(1, table.n_cols)]
    filled = [v for v in values if v.strip()]
    return (
        bool(table.row_label(row))
        and len(filled) >= 2
        and all(numeric_level(v) is not None and read_cell(v) is not None for v in filled)
    )
