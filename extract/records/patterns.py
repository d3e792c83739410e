"""Small text patterns the records layer reads itself: table cells, header labels, statements.

These are the narrow forms that tables and methods sentences use ("24.1 ± 1.3", "12 (40%)",
"Vehicle (n = 9)", "Body mass (g)", "n = 6 per group", "Values are mean ± SEM"). Free text goes
through the nlp pipeline; these helpers cover the structured places around it.
"""

from __future__ import annotations

import re

#: Number words that articles write for small sample sizes.
NUMBER_WORDS: dict[str, int] = {
    w: i
    for i, w in enumerate(
        "zero one two three four five six seven eight nine ten eleven twelve thirteen fourteen"
        " fifteen sixteen seventeen eighteen nineteen twenty".split()
    )
}

_MINUS = "\u2212\u2013\u2012"  # minus sign, en dash, figure dash used as minus
_MARKS = "*†‡§#¶"

_EMPTY_CELL = re.compile(r"^(?:|[-\u2013\u2014\u2212.]+|n\.?\s?[ad]\.?|na|nd|ns|n/a|–)$", re.I)

_N_EQ = re.compile(
    r"\b[nN]\s*(?:=|:)\s*(\d+)(?!\s*[-\u2013]\s*\d)(?:\s*(?:animals?|mice|rats|subjects|"
    r"patients|participants|samples|per|/|each)?\s*(?:per|/|in each|each)?\s*(group|arm))?"
)
_N_WORD = re.compile(
    rf"(?<![-\u2013\d.])(?<![-\u2013]\s)\b(\d+|{'|'.join(NUMBER_WORDS)})\s+(?:\w+\s+){{0,2}}(?:per|in each|/)\s*(?:group|arm)\b",
    re.I,
)
_GROUP_N = re.compile(r"\s*[(\[,;]?\s*\b[nN]\s*=\s*(\d+)\s*[)\]]?\s*$")

_DISP_WORDS: tuple[tuple[str, str], ...] = (
    (
        r"standard errors? of (?:the )?means?|\bs\.?e\.?m\.?\b|\bSEM\b|\bSE\b|standard errors?",
        "SEM",
    ),
    (r"standard deviations?|\bs\.?d\.?\b|\bSD\b", "SD"),
    (r"95\s*%\s*(?:confidence intervals?|CI)|\bCI\b|confidence intervals?", "CI95"),
    (r"interquartile ranges?|\bIQR\b|quartiles", "IQR"),
    (r"\branges?\b|min(?:imum)?\s*[-–]\s*max(?:imum)?", "range"),
)
_DISP_RES = tuple((re.compile(p, re.I), kind) for p, kind in _DISP_WORDS)
_STAT_STATEMENT = re.compile(
    r"\b(?:data|values|results|measurements|numbers|variables)\b[^.;]{0,60}?\b(?:are|were|is|as|show)\b"
    r"|\bmeans?\s*(?:±|\+/-|\(|\[)|\bmedians?\s*(?:\(|\[)|\bexpressed as\b|\bpresented as\b"
    r"|\breported as\b|\bshown as\b|\bgiven as\b",
    re.I,
)
_STAT_SUFFIX = re.compile(
    r"\s*,\s*(?:(?:mean|median|n|no\.)\s*(?:±\s*)?[(\[]?\s*(?:SD|SEM|SE|IQR|range|%|95\s*%\s*CI)?\s*[)\]]?)\s*$",
    re.I,
)
_UNIT_IN_LABEL = re.compile(
    r"^(?P<name>.*?)\s*(?:\((?P<p>[^()]*)\)|\[(?P<b>[^\[\]]*)\]|,\s*(?P<c>[^,]+))\s*$"
)


def to_number(text: str) -> float:
    """A float from a number as printed ("−2.1", "1,5", "7.3 × 10^3")."""
    text = text.strip()
    for ch in _MINUS:
        text = text.replace(ch, "-")
    match = re.match(r"^(-?\d+(?:[.,]\d+)?)(?:\s*[×x]\s*10\^?(-?\d+))?$", text)
    if match is None:
        raise ValueError(f"not a number: {text!r}")
    mantissa = float(match.group(1).replace(",", "."))
    if match.group(2) is not None:
        mantissa *= 10 ** int(match.group(2))
    return mantissa


def clean_cell(text: str) -> str:
    """Cell text without footnote marks and surrounding space."""
    text = " ".join(text.split())
    text = text.rstrip(_MARKS + " ")
    text = re.sub(r"(?<=\d)[a-d]$|(?<=\))[a-d]$", "", text)  # superscript letters read inline
    return text.strip(_MARKS + " ")


def is_empty_cell(text: str) -> bool:
    """True for cells that hold no value ("", "—", "n.d.", "NA")."""
    return bool(_EMPTY_CELL.match(clean_cell(text)))


def split_label(label: str) -> tuple[str, str | None]:
    """A header or row label split into its name and the unit written after it.

    "Body mass (g)" -> ("Body mass", "g"); "Creatinine, mg/dL" -> ("Creatinine", "mg/dL");
    "Vehicle (n = 9)" -> ("Vehicle (n = 9)", None): a sample size is not a unit.
    """
    label = _STAT_SUFFIX.sub("", " ".join(label.split()))
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
    ):
        return label, None
    return match["name"].strip(), unit


def _dispersion_only(text: str) -> bool:
    return bool(
        re.fullmatch(r"(?:mean|median)?\s*(?:±|\+/-)?\s*(?:SD|SEM|SE|IQR|range|95% CI)", text, re.I)
    )


def group_and_n(label: str) -> tuple[str, int | None]:
    """A group header split into its name and the n written in it: "Vehicle (n = 9)" -> ("Vehicle", 9)."""
    label = " ".join(label.split())
    match = _GROUP_N.search(label)
    if match is None:
        return label, None
    return label[: match.start()].strip(" ,;("), int(match.group(1))


def find_group_n(text: str) -> int | None:
    """The per-group n that a statement gives ("n = 6 per group", "eight mice per group")."""
    match = _N_EQ.search(text)
    if match and (match.group(2) or re.search(r"\b(?:per|each|/)\s*(?:group|arm)", text, re.I)):
        return int(match.group(1))
    match = _N_WORD.search(text)
    if match:
        word = match.group(1).lower()
        return int(word) if word.isdigit() else NUMBER_WORDS[word]
    return None


def find_n(text: str) -> int | None:
    """The first single "n = 9" in a text (not a range such as "n = 8-10")."""
    match = _N_EQ.search(text)
    return int(match.group(1)) if match else None


def dispersion_kind_in(text: str) -> str | None:
    """The dispersion kind named in a short text (a header, "mean (SEM)"), or ``None``."""
    hits = [(m.start(), kind) for regex, kind in _DISP_RES for m in [regex.search(text)] if m]
    return min(hits)[1] if hits else None


def find_dispersion_statement(text: str) -> str | None:
    """The dispersion kind a statement declares ("Values are mean ± SEM", "expressed as median (IQR)")."""
    for sentence in re.split(r"(?<=[.;])\s+", text):
        if _STAT_STATEMENT.search(sentence):
            kind = dispersion_kind_in(sentence)
            if kind is not None:
                return kind
    return None
