"""Count cells written "n (pct)" without a "%" sign: "1885 (11.6)".

Such a cell reads like "mean (SD)". Where a header level, the row label, the corner or the
caption says "n (%)", "No. (%)" or "number (percent)", it is a count with its percentage. Where
nothing says so the reading stays, but a draft whose bracket equals 100 × value / the column's
total within rounding is flagged ``spread_like_percent`` (lower confidence): a curator should
look at it.
"""

from __future__ import annotations

import re

from extract.ingest.document import Table
from extract.records.draft import Draft

#: A label that says its cells are counts with percentages.
_N_PCT = re.compile(
    r"\b(?:n|no\.?|number)\s*[(\[]\s*(?:%|percent|pct\.?)\s*[)\]]|"
    r"\b(?:number|no\.?)\s+(?:and|&)\s+(?:percent(?:age)?|%)",
    re.I,
)

#: A label that names a summary of measured values: its cells are no counts.
_SUMMARY = re.compile(r"\b(?:mean|median|SD|SEM|IQR|average)\b", re.I)


def says_n_pct(text: str) -> bool:
    """True when ``text`` says that cells are "n (%)" ("No. (%)", "number (percent)")."""
    return bool(_N_PCT.search(text))


def _whole(value: float) -> bool:
    return float(value).is_integer()


def count_pct_draft(
    draft: Draft, table: Table, row: int, col: int, *, texts: tuple[str, ...], total: int | None
) -> Draft:
    """The draft read as a count when its cell is "whole (number)" and a label says "n (%)";
    flagged when its bracket is the percentage of ``total``; else unchanged."""
    spread = draft.dispersion_value
    if draft.statistic is not None or spread is None or isinstance(spread, tuple):
        return draft
    if not _whole(draft.value) or not 0 <= spread <= 100 or "%" in draft.raw:
        return draft
    if _SUMMARY.search(table.row_label(row)):
        return draft  # "Age, mean (SD)" in a table of counts is a mean
    for text in texts:
        # a label that names both ("n (%) or mean (SD)") decides nothing
        if text and says_n_pct(text) and not _SUMMARY.search(_N_PCT.sub("", text)):
            return draft.with_found("statistic", "header", statistic="count", dispersion_value=None)
    if total and total > 0:
        share = 100.0 * draft.value / total
        written = re.search(r"[(\[]\s*\d+(?:\.(\d+))?", draft.raw)
        decimals = len(written.group(1) or "") if written else 1
        if abs(share - spread) <= 0.5 * 10 ** (-decimals) + 1e-9:
            return draft.with_flag("spread_like_percent")
    return draft
