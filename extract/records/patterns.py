"""Table-structure helpers the records layer needs around the nlp readers.

Numbers, spreads, dispersion statements and sample sizes are read by :mod:`extract.nlp`
(``quantities.parse_cell``, ``quantities.find_dispersion_statement``,
``sample_size.find_sample_sizes``). What stays here is the shape of table labels: footnote marks
on cells, empty marks, a column's header levels, "Body mass (g)" (a label and its unit), "Vehicle (n = 9)" (a group and its
n), and the per-group n of a statement, read through the nlp sample-size reader.

The label and cell readers are pure functions of their text and are cached: a table repeats its
labels for every cell, and a batch repeats them across articles.
"""

from __future__ import annotations

import re
from functools import lru_cache

from extract.ingest.document import Table
from extract.nlp.quantities import Quantity, parse_cell
from extract.nlp.sample_size import find_sample_sizes
from extract.units import is_known_unit

_MARKS = "*†‡§#¶"
#: Footnote markers set after a word of a header label: marks, superscript digits and letters.
_LABEL_MARKS = re.compile(
    r"(?<=[\w).%])[*†‡§#¶]+"  # "Total†", "(n = 4)*"
    r"|(?<=[A-Za-z]{3})[\u00b9\u00b2\u00b3\u2070\u2074-\u2079]+(?![\w/])"  # "Total²", not "m²"
    r"|(?<=\w)[\u1d43-\u1d5b\u02b0-\u02b8]+"  # superscript letters "Placeboᵃ"
    r"|(?<=\))[a-z](?=\s|$)"  # a marker letter read inline after a bracket "(mg/kg)a"
    r"|(?:^|\s+)[*†‡§#¶]+(?=\s|$)"  # a mark standing alone
)
#: Words that say a value is not stated: never a unit ("Africa, unspecified").
_NOT_UNITS = frozenset(
    "unspecified unknown other others none total missing not specified n/a na nos all overall "
    "combined mixed".split()
)
_EMPTY_CELL = re.compile(r"^(?:|[-\u2013\u2014\u2212.]+|n\.?\s?[ad]\.?|na|nd|ns|n/a|–)$", re.I)
_STAT_SUFFIX = re.compile(
    r"\s*,\s*(?:(?:mean|median|n|no\.)\s*(?:±\s*)?[(\[]?\s*(?:SD|SEM|SE|IQR|range|%|95\s*%\s*CI)?\s*[)\]]?)\s*$",
    re.I,
)
_UNIT_IN_LABEL = re.compile(
    r"^(?P<name>.*?)\s*(?:\((?P<p>[^()]*)\)|\[(?P<b>[^\[\]]*)\]|,\s*(?P<c>[^,]+))\s*$"
)
_GROUP_N = re.compile(
    r"\s*[(\[,;]?\s*\b[nN]\s*=\s*(\d{1,3}(?:[ ,\u2009\u202f]\d{3})+|\d+)\s*[)\]]?\s*$"
)
#: One sex's count in a group label: "2F", "6 M", "5 females", "4 men".
_SEX = r"(?:[FMW]|(?i:females?|males?|women|men))"
#: A count split by sex closing a group label, alone or after its n: "(2F/6M)", "5 F/4 M",
#: "(M/F 6/2)", "(n = 8; 2 F)". The counts of a split add up to the group's n.
_GROUP_SEX_SPLIT = re.compile(
    r"\s*[(\[,;]?\s*(?:"
    rf"(?P<a>\d+)\s*(?P<sa>{_SEX})\s*[/,:;]\s*(?P<b>\d+)\s*(?P<sb>{_SEX})"
    r"|(?P<ka>[FM])\s*/\s*(?P<kb>[FM])\s*[:=]?\s*(?P<c>\d+)\s*/\s*(?P<d>\d+)"
    rf"|\b[nN]\s*=\s*(?P<n>\d+)\s*[;,]\s*\d+\s*{_SEX}(?:\s*[/,]\s*\d+\s*{_SEX})?"
    r")\s*[)\]]?\s*$"
)
_CENSORED = re.compile(r"^(?:[<>≤≥]|[pP]\s*[=<>])")


@lru_cache(maxsize=16384)
def clean_cell(text: str) -> str:
    """Cell text without footnote marks and surrounding space."""
    text = " ".join(text.split())
    text = text.rstrip(_MARKS + " ")
    text = re.sub(r"(?<=\d)[a-d]$|(?<=\))[a-d]$", "", text)  # superscript letters read inline
    return text.strip(_MARKS + " ")


@lru_cache(maxsize=16384)
def clean_label(text: str) -> str:
    """A header or row label without footnote markers: "Status not recorded†" -> "Status not
    recorded", "Total²" -> "Total", "* Excluded" -> "Excluded"."""
    return " ".join(_LABEL_MARKS.sub("", " ".join(text.split())).split())


def header_levels(table: Table, col: int) -> list[str]:
    """The distinct header texts of column ``col``, top down, without footnote marks.

    A spanning header repeats its text in every column it covers; each text is kept once and
    empty levels are dropped.
    """
    levels: list[str] = []
    for r in range(table.header_rows):
        text = clean_label(table.cell(r, col).text)
        if text and text not in levels:
            levels.append(text)
    return levels


@lru_cache(maxsize=16384)
def is_plausible_unit(text: str, *, strict: bool = False) -> bool:
    """Whether a label's bracketed or comma-set tail can be a unit as written.

    A unit the registry reads ("mg/dL", "years") is one; so is a short symbol-like form it does
    not know ("RFU", "OD450", "×10³/µL"), or a lower-case word in brackets ("(zorbs)") unless
    ``strict`` (a tail after a comma, "Sex, male"). A capitalised word ("Myanmar", "South"), a
    list ("min, max") or a word that says nothing is stated ("unspecified") is not.
    """
    text = text.strip()
    if not text or text.lower() in _NOT_UNITS or "," in text or _dispersion_only(text):
        return False
    if is_known_unit(text):
        return True
    if len(text) > 16 or not re.search(r"[A-Za-zµμ%°]", text):
        return False
    # Unknown to the registry: plausible only as an abbreviation or a symbol form, never as a
    # word of four or more letters in ordinary case.
    words = re.findall(r"[A-Za-z]+", text)
    if any(len(w) >= 4 and w[0].isupper() and not w.isupper() for w in words):
        return False
    return not strict or not any(len(w) >= 4 and not w.isupper() for w in words)


def is_empty_cell(text: str) -> bool:
    """True for cells that hold no value ("", "—", "n.d.", "NA")."""
    return bool(_EMPTY_CELL.match(clean_cell(text)))


@lru_cache(maxsize=16384)
def read_cell(text: str) -> Quantity | None:
    """The data value of one table cell, read by :func:`extract.nlp.quantities.parse_cell`.

    The whole cell (footnote marks aside) must be one quantity: "24.1 ± 1.3", "42 (37.5%)",
    "131 [127–135]". P-value and censored forms ("<0.001", "p = 0.03"), empty marks ("—",
    "n.d.") and cells with more text after the value give ``None``: they are not data points.
    """
    text = clean_cell(text)
    if not text or is_empty_cell(text) or _CENSORED.match(text):
        return None
    quantity = parse_cell(text)
    if quantity is None:
        return None
    if quantity.end != len(text):
        return None
    return quantity


@lru_cache(maxsize=16384)
def split_label(label: str) -> tuple[str, str | None]:
    """A header or row label split into its name and the unit written after it.

    "Body mass (g)" -> ("Body mass", "g"); "Creatinine, mg/dL" -> ("Creatinine", "mg/dL");
    "Vehicle (n = 9)" -> ("Vehicle (n = 9)", None): a sample size is not a unit, nor is a
    score band "Severe (20–27)" or an alternative name "Burma (Myanmar)".
    """
    label = _STAT_SUFFIX.sub("", clean_label(label))
    match = _UNIT_IN_LABEL.match(label)
    if match is None:
        return label, None
    unit = (
        match["p"]
        if match["p"] is not None
        else match["b"]
        if match["b"] is not None
        else match["c"]
    )
    unit = unit.strip()
    if (
        not unit
        or re.search(r"\b[nN]\s*=", unit)
        or len(unit) > 16
        or (match["c"] is not None and " " in unit)
        or _dispersion_only(unit)
        or not re.search(r"[A-Za-zµμ%°]", unit)
        or not is_plausible_unit(unit, strict=match["c"] is not None)
    ):
        return label, None
    return match["name"].strip(), unit


def _dispersion_only(text: str) -> bool:
    return bool(
        re.fullmatch(
            r"(?:mean|median)?\s*(?:±|\+/-)?\s*(?:SD|SEM|SE|IQR|range|(?:9[059]\s*%\s*)?CI)",
            text,
            re.I,
        )
    )


def group_and_n(label: str) -> tuple[str, int | None]:
    """A group header split into its name and the n written in it: "Vehicle (n = 9)" -> ("Vehicle", 9).

    Footnote markers are dropped ("Mixed† (n = 4)" -> ("Mixed", 4)).
    """
    label = clean_label(label)
    match = _GROUP_N.search(label)
    if match is None:
        return _group_and_sex_split(label)
    return label[: match.start()].strip(" ,;("), int(re.sub(r"\D", "", match.group(1)))


def _sex_of(word: str) -> str:
    return "F" if word[0] in "FfWw" else "M"


def _group_and_sex_split(label: str) -> tuple[str, int | None]:
    """A group label whose n is written split by sex: "Basal (2F/6M)" -> ("Basal", 8),
    "Old (M/F 6/2)" -> ("Old", 8), "Young (n = 8; 2 F)" -> ("Young", 8). Two counts of the
    same sex ("2F/6F") are no split and give no n."""
    match = _GROUP_SEX_SPLIT.search(label)
    if match is None:
        return label, None
    name = label[: match.start()].strip(" ,;([")
    if not name:
        return label, None
    if match["n"] is not None:
        return name, int(match["n"])
    if match["a"] is not None:
        if _sex_of(match["sa"]) == _sex_of(match["sb"]):
            return label, None
        return name, int(match["a"]) + int(match["b"])
    if match["ka"] == match["kb"]:
        return label, None
    return name, int(match["c"]) + int(match["d"])


def find_group_n(text: str) -> int | None:
    """The per-group n a statement gives ("n = 6 per group", "eight mice per group"), or None."""
    for size in find_sample_sizes(text):
        if size.scope == "per_group" and size.n is not None:
            return size.n
    return None


def find_n(text: str) -> int | None:
    """The first single n a text states ("n = 9"; not a range such as "n = 8-10")."""
    for size in find_sample_sizes(text):
        if size.n is not None and size.scope != "total" and re.match(r"[nN]\b", size.text):
            return size.n
    return None


def clear_caches() -> None:
    """Forget the cached label and cell readings (for benchmarks that must start cold)."""
    for reader in (clean_cell, clean_label, is_plausible_unit, read_cell, split_label):
        reader.cache_clear()
