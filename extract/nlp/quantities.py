"""Quantities: values with units, dispersion (SD, SEM, 95% CI, IQR, range), counts and roles.

Two readers share the work (docs/nlp.md has the table):

* our rules (``reader="rules"``) read every number written in digits: "24.1 ± 1.3 g",
  "0.42 (0.05) mg/dL", "128 [120–136]", "(95% CI 128 to 136)", "median 4 (IQR 3–5)",
  "42 (37.5%)", "7.3 × 10³/µL", "150μM", "−0.8 ± 0.2", middle-dot decimals, thin spaces;
* quantulum3 (``reader="quantulum3"``) reads numbers written as words ("twelve", "forty
  milligrams"), and is only loaded (about 5 s, once per process) when a sentence holds one.

Every number gets a ``role``: only ``"measure"`` values are data points; doses, ages, p-values,
years, figure/table/reference numbers, equipment settings, time points and sample sizes are
context or noise for the records layer. Values found here are suggestions for a curator to
verify, never a basis for a clinical decision.
"""

from __future__ import annotations

import logging
import re
from dataclasses import dataclass
from typing import Any

from extract.nlp.tokenizer import normalize_text
from extract.units import Normalized, is_known_unit, normalize

__all__ = [
    "DISPERSION_KINDS",
    "ROLES",
    "STATISTICS",
    "Quantity",
    "Spread",
    "find_dispersion_statement",
    "find_quantities",
    "parse_cell",
]

log = logging.getLogger(__name__)

#: Kinds of spread (the proposal contract's ``dispersion.kind``).
DISPERSION_KINDS: tuple[str, ...] = ("SD", "SEM", "CI95", "IQR", "range")
#: Roles of a number: only "measure" is a data point.
ROLES: tuple[str, ...] = (
    "measure",
    "dose",
    "age",
    "p_value",
    "year",
    "reference",
    "setting",
    "time",
    "sample_size",
    "ratio",
    "label",
    "other",
)
#: Statistics (the proposal contract's ``statistic``).
STATISTICS: tuple[str, ...] = ("mean", "median", "percent", "count", "single", "other")


@dataclass(frozen=True)
class Spread:
    """The spread written beside a central value.

    Attributes:
        kind: "SD", "SEM", "CI95", "IQR" or "range"; ``None`` when the text gives a spread
            without saying which and no context was given (flagged "dispersion_kind_unknown").
        value: one number (SD, SEM) or a (low, high) pair (CI95, IQR, range).
        kind_from: where the kind was read: "text" (beside the value or in the same sentence),
            "context" (legend, footnote, header or methods given by the caller) or "none".
    """

    kind: str | None
    value: float | tuple[float, float]
    kind_from: str = "text"


@dataclass(frozen=True)
class Quantity:
    """One number found in text or a table cell, with its unit, spread and role.

    Attributes:
        value: the central value (for a bare range "128–136", the low end; see ``spread``).
        unit: the unit as written, or None.
        statistic: "mean", "median", "percent", "count", "single" or "other".
        spread: the dispersion, or None.
        role: see :data:`ROLES`; only "measure" is a data point.
        start: character offset of the first character in the text given.
        end: character offset just past the last character.
        text: the exact text ``text[start:end]``.
        percent: the percentage written beside a count ("42 (37.5%)" -> 37.5).
        total: the denominator of a count written "42/112".
        reader: "rules" or "quantulum3".
        flags: reasons for doubt, e.g. "dispersion_kind_unknown", "unit_from_header".
    """

    value: float
    unit: str | None
    statistic: str
    spread: Spread | None = None
    role: str = "measure"
    start: int = 0
    end: int = 0
    text: str = ""
    percent: float | None = None
    total: int | None = None
    reader: str = "rules"
    flags: tuple[str, ...] = ()

    @property
    def normalized(self) -> Normalized:
        """The value in the canonical unit of its dimension (see extract.units.normalize)."""
        return normalize(self.value, self.unit)

    @property
    def is_measure(self) -> bool:
        """Whether this number is a data point (role "measure")."""
        return self.role == "measure"


# ---------------------------------------------------------------------------------------------
# Patterns (on text normalised by extract.nlp.tokenizer.normalize_text: same length, ASCII minus and spaces)

_NUM = r"-?(?:\d{1,3}(?:,\d{3})+|\d+)(?:\.\d+)?"
_NUM_RE = re.compile(rf"(?<![\w.\-/]){_NUM}(?![\d])|(?<=[(\[±=<>~])-?\d+(?:\.\d+)?")
_NUMBER_AT = re.compile(rf"\s*({_NUM})")
_RANGE_SEP = r"\s*(?:–|—|-|to|,)\s*"
_PM = re.compile(r"\s*(?:±|\+/-|\+-|∓|plus or minus)\s*")
_SD_WORDS = r"S\.?D\.?|standard deviation"
_SEM_WORDS = r"S\.?E\.?M\.?|S\.?E\.?|standard error(?: of the mean)?"
_KIND_LABEL = re.compile(rf"\s*\(\s*(?:mean\s*(?:±|\+/-)\s*)?({_SD_WORDS}|{_SEM_WORDS})\s*\)", re.I)
_BRACKET = {"(": ")", "[": "]"}
_N_TAIL = r"\s*(?:[;,]\s*n\s*=\s*\d+\s*)?"
_IN_BRACKET: tuple[tuple[re.Pattern[str], str], ...] = (
    # "(SD 1.3)", "(SD = 1.3; n = 10)": a sample size after the spread stays for the n reader.
    (re.compile(rf"^\s*(?:{_SD_WORDS})\s*[:=,]?\s*({_NUM}){_N_TAIL}$", re.I), "SD"),
    (re.compile(rf"^\s*(?:{_SEM_WORDS})\s*[:=,]?\s*({_NUM}){_N_TAIL}$", re.I), "SEM"),
    (
        re.compile(
            rf"^\s*(?:95\s*%\s*)?(?:CI|confidence interval)\s*[:=,]?\s*({_NUM}){_RANGE_SEP}({_NUM})\s*$",
            re.I,
        ),
        "CI95",
    ),
    (
        re.compile(
            rf"^\s*(?:IQR|interquartile range)\s*[:=,]?\s*({_NUM}){_RANGE_SEP}({_NUM})\s*$", re.I
        ),
        "IQR",
    ),
    (re.compile(rf"^\s*range\s*[:=,]?\s*({_NUM}){_RANGE_SEP}({_NUM})\s*$", re.I), "range"),
    (re.compile(rf"^\s*(?:±|\+/-)\s*({_NUM})\s*$"), "pm"),
    (re.compile(rf"^\s*({_NUM})\s*%\s*$"), "percent"),
    (re.compile(rf"^\s*({_NUM})\s*(?:–|—|-|to)\s*({_NUM})\s*$"), "interval"),
    (re.compile(rf"^\s*({_NUM})\s*$"), "single"),
)
_POWER_UNIT = r"(?:[×x*]\s*10\s*(?:\^|\*\*|\*)?\s*-?[0-9]+|[×x*]\s*10\s*[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+)"
_UNIT_WORD = r"[A-Za-zµμ°%][A-Za-z0-9µμ°%/^²³⁻·*]*"
_UNIT_AT = re.compile(
    rf"(\s*)((?:{_POWER_UNIT}\s*/?\s*)?(?:%\s*of\s+baseline|beats\s+per\s+minute|mm\s+Hg|cm\s+H2O|"
    rf"[°º]\s?[CF]\b|{_UNIT_WORD})(?:\s*/\s*{_UNIT_WORD})?|{_POWER_UNIT})"
)
#: Words that pint reads as units but that are English words after a number.
_NOT_UNITS = frozenset(
    "in at a an as is it or and of to the by on are per was were were be ha t C B P b p cd"
    " from with for had has have".split()
)
_SINGLE_LETTER_UNITS = frozenset("g h d s m L l M U N J W".split())
_STATEMENT_PATTERNS: tuple[tuple[re.Pattern[str], str], ...] = (
    (
        re.compile(
            rf"\bmeans?\s*(?:±|\+/-|\+-|plus or minus|and)\s*(?:the\s+)?(?:{_SEM_WORDS})\b", re.I
        ),
        "SEM",
    ),
    (
        re.compile(
            rf"\bmeans?\s*(?:±|\+/-|\+-|plus or minus|and)\s*(?:the\s+)?(?:{_SD_WORDS})\b", re.I
        ),
        "SD",
    ),
    (re.compile(rf"\bmeans?\s*\(\s*(?:{_SEM_WORDS})\s*\)", re.I), "SEM"),
    (re.compile(rf"\bmeans?\s*\(\s*(?:{_SD_WORDS})\s*\)", re.I), "SD"),
    (
        re.compile(
            r"\bmedians?\s*(?:\(|\[|and|with)\s*(?:the\s+)?(?:IQR|interquartile range)", re.I
        ),
        "IQR",
    ),
    (re.compile(r"\bmedians?\s*(?:\(|\[|and|with)\s*(?:the\s+)?range\b", re.I), "range"),
    (
        re.compile(
            r"\b(?:means?\s*(?:\(|\[|and|with)\s*(?:the\s+)?)?95\s*%\s*(?:CI|confidence intervals?)\b",
            re.I,
        ),
        "CI95",
    ),
    (re.compile(rf"(?:±|\+/-)\s*(?:{_SEM_WORDS})\b", re.I), "SEM"),
    (re.compile(rf"(?:±|\+/-)\s*(?:{_SD_WORDS})\b", re.I), "SD"),
    (re.compile(r"\bIQR\b|\binterquartile range\b", re.I), "IQR"),
)
_MEDIAN_BEFORE = re.compile(r"\bmedians?\b[^.;]{0,40}$", re.I)
_MEAN_BEFORE = re.compile(r"\bmeans?\b[^.;]{0,40}$", re.I)

# Roles (look-behind windows end at the number; look-ahead windows start after the quantity)
_P_BEFORE = re.compile(r"(?:\b[Pp](?:\s*-?\s*values?)?|\bp\s*\(\w+\))\s*(?:[<>=≤≥]|&lt;|of)\s*$")
_REF_BEFORE = re.compile(
    r"\b(?:Fig(?:ure)?s?|Tables?|Tab|Supplementary(?:\s+(?:Fig(?:ure)?|Table))?|Eqs?|Equations?|"
    r"Refs?|References?|Sections?|Suppl|Panels?|Appendix|Chapter)\.?\s*[A-Z]?$",
    re.I,
)
_N_BEFORE = re.compile(r"(?:\b[nN]\s*(?:[=:]|of)\s*$)|(?:\bsample size of\s*$)")
_SUBJECT_NOUNS = (
    r"(?:mice|mouse|rats?|animals?|patients?|participants?|subjects?|volunteers?|individuals?|"
    r"women|men|children|adults?|dogs?|pigs?|rabbits?|hamsters?|primates?|monkeys?|fish|"
    r"zebrafish|cases?|controls?|donors?|samples?|litters?|pups?)"
)
_SAMPLE_AFTER = re.compile(
    rf"^\s*(?:(?:male|female|adult|healthy|\w+-week-old|\w+-old)\s+)*{_SUBJECT_NOUNS}\b|^\s*(?:per|/)\s*(?:group|arm)\b",
    re.I,
)
_AGE_BEFORE = re.compile(r"\b(?:aged?|age of|ages of|age,)\s*(?:between\s*)?$", re.I)
_AGE_AFTER = re.compile(r"^\s*(?:-\s*)?(?:old|of age)\b", re.I)
_AGE_HYPHEN = re.compile(r"-(day|week|month|year)s?-old\b", re.I)
_DOSE_BEFORE = re.compile(
    r"\b(?:doses?|dosed|given|giving|receiv\w*|administ\w*|inject\w*|infus\w*|treated|treatment|"
    r"gavage\w*|supplement\w*|containing|challenged|exposed|fed|vehicle)\b[^.;]{0,30}$",
    re.I,
)
_ABBREVIATION_BEFORE = re.compile(r"\b[A-Z][A-Za-z0-9-]*[A-Z][A-Za-z0-9-]*\s+$")
_DOSE_AFTER = re.compile(
    r"^\s*(?:,\s*)?(?:i\.p\.|p\.o\.|s\.c\.|i\.v\.|i\.m\.|orally|intraperitoneal\w*|subcutaneous\w*|"
    r"intravenous\w*|daily|twice daily|once daily|per day|/day|per os|by gavage|in drinking water)",
    re.I,
)
_SETTING_BEFORE = re.compile(
    r"\b(?:centrifug\w*|incubat\w*|spun|stor\w*|heat\w*|wash\w*|shak\w*|stain\w*|fix\w*|digest\w*|"
    r"sonicat\w*|boil\w*|frozen|freez\w*|kept|housed|maintained|thaw\w*|dried|read|measured at|"
    r"absorbance|wavelength|excitation|emission|magnification|sections?|sectioned|cut|rpm|"
    r"cycle|temperature of|diluted|dilution|filtered|rinsed|blocked|perfused|seeded|plated|grown|"
    r"cultured|passage|scale bar|housed)\b[^.;]{0,40}$",
    re.I,
)
_SETTING_AFTER = re.compile(
    r"^\s*(?:[×x]\s*g\b|rpm\b|-?µm-thick|µm thick|thick\b|sections?\b|light/dark|light-dark|dilution)",
    re.I,
)
_SETTING_UNITS = frozenset({"rpm", "nm", "kHz", "MHz", "Hz", "V", "mV", "W", "kV", "x g", "×g"})
_TIME_BEFORE = re.compile(
    r"\b(?:at|for|after|over|within|during|on|from|until|by|up to|every|each|before|"
    r"weeks?|days?|hours?|months?|years?|post|lasting|period of)\s*$",
    re.I,
)
_TIME_WORD_BEFORE = re.compile(r"\b(?:week|day|month|year|hour|visit|cycle|wk|d)\s*$", re.I)
_TIME_UNITS = frozenset(
    "s sec second seconds min mins minute minutes h hr hrs hour hours d day days wk wks week"
    " weeks mo month months y yr yrs year years".split()
)
_YEAR = re.compile(r"^(?:19[5-9]\d|20\d\d)$")
_YEAR_BEFORE = re.compile(
    r"\b(?:in|since|during|from|until|till|by|before|after|between|and|to|of|year|onset)\s*$", re.I
)
_CITATION = re.compile(r"^\[\s*\d+(?:\s*[,–-]\s*\d+)*\s*\]$")


# ---------------------------------------------------------------------------------------------
# Small pure helpers


def _to_float(text: str) -> float:
    return float(text.replace(",", ""))


def find_dispersion_statement(text: str) -> str | None:
    """The dispersion kind a statement declares ("Values are mean ± SEM" -> "SEM").

    Reads legends, footnotes, column headers and methods statements: "Data are presented as
    mean (SD)" -> "SD", "median (IQR)" -> "IQR", "mean (95% CI)" -> "CI95". When several are
    named, the first one in the text wins.

    Args:
        text: a sentence, legend, footnote or header.

    Returns:
        "SD", "SEM", "CI95", "IQR", "range" or None.
    """
    norm = normalize_text(text)
    best: tuple[int, str] | None = None
    for pattern, kind in _STATEMENT_PATTERNS:
        match = pattern.search(norm)
        if match and (best is None or match.start() < best[0]):
            best = (match.start(), kind)
    return best[1] if best else None


def _read_unit(norm: str, pos: int) -> tuple[str, int] | None:
    """The unit starting at ``pos`` (after optional spaces), as (unit text, end) or None."""
    match = _UNIT_AT.match(norm, pos)
    if not match:
        return None
    if len(match.group(1)) > 2:
        return None
    candidate = match.group(2)
    start = match.start(2)
    # Try the longest candidate first, then cut trailing punctuation and "/..." parts.
    tries = [candidate]
    stripped = candidate.rstrip(".,;:*/")
    if stripped != candidate:
        tries.append(stripped)
    if "/" in stripped:
        tries.append(stripped.split("/")[0])
    for text in tries:
        if not text or text in _NOT_UNITS:
            continue
        if len(text) == 1 and text not in _SINGLE_LETTER_UNITS and text != "%":
            continue
        if is_known_unit(text):
            return text, start + len(text)
    return None


def _read_number(norm: str, pos: int) -> tuple[float, int] | None:
    match = _NUMBER_AT.match(norm, pos)
    if not match:
        return None
    return _to_float(match.group(1)), match.end()


def _close_bracket(norm: str, pos: int) -> int | None:
    """Index of the bracket closing the one at ``pos`` (no nesting across 80 characters)."""
    closing = _BRACKET[norm[pos]]
    end = norm.find(closing, pos + 1, pos + 80)
    return end if end != -1 else None


@dataclass
class _Draft:
    """A quantity being read (mutable while parsing, frozen into Quantity)."""

    value: float
    start: int
    end: int
    unit: str | None = None
    unit_end: int | None = None
    spread_kind: str | None = None
    spread_value: float | tuple[float, float] | None = None
    has_spread: bool = False
    percent: float | None = None
    total: int | None = None
    statistic: str | None = None
    is_range: bool = False


def _read_spread_in_bracket(norm: str, pos: int, draft: _Draft) -> bool:
    """Read "(1.3)", "(SD 1.3)", "[120–136]", "(95% CI 128 to 136)", "(37.5%)" at ``pos``."""
    if pos >= len(norm) or norm[pos] not in _BRACKET:
        return False
    close = _close_bracket(norm, pos)
    if close is None:
        return False
    inner = norm[pos + 1 : close]
    for pattern, kind in _IN_BRACKET:
        match = pattern.match(inner)
        if not match:
            continue
        numbers = [_to_float(g) for g in match.groups()]
        if kind == "percent":
            if draft.percent is not None or draft.has_spread:
                return False
            draft.percent = numbers[0]
        elif len(numbers) == 2:
            if draft.has_spread:
                return False
            draft.spread_value = (numbers[0], numbers[1])
            draft.spread_kind = None if kind == "interval" else kind
            draft.has_spread = True
        else:
            if draft.has_spread:
                return False
            draft.spread_value = numbers[0]
            draft.spread_kind = None if kind in ("pm", "single") else kind
            draft.has_spread = True
        draft.end = close + 1
        return True
    return False


def _read_draft(norm: str, start: int) -> _Draft | None:
    """Read one quantity starting at the number at ``start``."""
    first = _read_number(norm, start)
    if first is None:
        return None
    value, pos = first
    draft = _Draft(value=value, start=start, end=pos)
    hyphen_age = _AGE_HYPHEN.match(norm, pos)
    if hyphen_age:
        draft.unit = hyphen_age.group(1)
        draft.end = pos + 1 + len(hyphen_age.group(1))
        return draft
    # A count with its denominator: "42/112".
    fraction = re.match(r"/(\d+)(?![\d.])", norm[pos:])
    if fraction and value.is_integer():
        draft.total = int(fraction.group(1))
        pos += fraction.end()
        draft.end = pos
    unit = None if draft.total is not None else _read_unit(norm, pos)
    if unit is not None:
        draft.unit, pos = unit
        draft.end = pos
    # A range: "128–136 mmHg", "6-8 weeks", "128 to 136".
    range_match = re.match(rf"\s*(?:–|—|-|to)\s*({_NUM})(?![\d])", norm[pos:])
    if range_match and not draft.total and not norm[pos:].startswith("-old"):
        high = _to_float(range_match.group(1))
        if high >= value or norm[pos : pos + range_match.end()].strip()[0] in "–—t":
            draft.is_range = True
            draft.spread_kind = "range"
            draft.spread_value = (value, high)
            draft.has_spread = True
            pos += range_match.end()
            draft.end = pos
            unit = _read_unit(norm, pos)
            if unit is not None and draft.unit is None:
                draft.unit, pos = unit
                draft.end = pos
            return draft
    # "± 1.3", "+/- 1.3".
    pm = _PM.match(norm, pos)
    if pm:
        second = _read_number(norm, pm.end())
        if second is not None:
            draft.spread_value = abs(second[0])
            draft.has_spread = True
            pos = second[1]
            draft.end = pos
            unit = _read_unit(norm, pos)
            if unit is not None:
                if draft.unit is None:
                    draft.unit = unit[0]
                pos = unit[1]
                draft.end = pos
            label = _KIND_LABEL.match(norm, pos)
            if label:
                draft.spread_kind = _label_kind(label.group(1))
                pos = label.end()
                draft.end = pos
    # "(1.3)", "(SD 1.3)", "[120–136]", "(95% CI 128 to 136)", "(37.5%)".
    bracket = re.match(r"\s*([(\[])", norm[pos:])
    if bracket and _read_spread_in_bracket(norm, pos + bracket.start(1), draft):
        pos = draft.end
        if draft.unit is None:
            unit = _read_unit(norm, pos)
            if unit is not None:
                draft.unit, pos = unit
                draft.end = pos
    return draft


def _label_kind(label: str) -> str:
    compact = label.replace(".", "").replace(" ", "").lower()
    if compact in ("sd", "standarddeviation"):
        return "SD"
    return "SEM"


def _leading_number(norm: str, start: int) -> str:
    """The number written at ``start`` ("2007" of "2007 (9)"), or "" when none."""
    match = _NUMBER_AT.match(norm, start)
    return match.group(1) if match else ""


def _classify_role(norm: str, draft: _Draft, *, in_citation: bool) -> str:
    before = norm[max(0, draft.start - 60) : draft.start]
    after = norm[draft.end : draft.end + 40]
    unit = (draft.unit or "").strip()
    if in_citation:
        return "reference"
    if re.match(r"\s*(?:CI|confidence)", after) and unit == "%":
        return "label"
    if re.match(r"\d*:\d", norm[draft.end : draft.end + 3]) or re.search(r"\d:$", before):
        return "ratio"
    if draft.total is not None and _is_slash_ratio(norm, draft, before):
        return "ratio"
    if _P_BEFORE.search(before):
        return "p_value"
    if _REF_BEFORE.search(before):
        return "reference"
    if _N_BEFORE.search(before):
        return "sample_size"
    if (
        draft.unit is None
        and draft.percent is None  # "241 (18.9%) cases occurred ...": a count, not an n
        and _SAMPLE_AFTER.match(after)
        and draft.value.is_integer()
    ):
        return "sample_size"
    is_time = unit.lower() in _TIME_UNITS
    if is_time and (
        _AGE_BEFORE.search(before)
        or _AGE_AFTER.match(after)
        or norm[draft.end :].startswith("-old")
    ):
        return "age"
    if _AGE_BEFORE.search(before) and draft.unit is None:
        return "age"
    if "/kg" in unit.replace(" ", "") or _DOSE_AFTER.match(after):
        return "dose"
    if unit and not is_time and _DOSE_BEFORE.search(before) and not draft.has_spread:
        return "dose"
    if unit and not is_time and not draft.has_spread and _ABBREVIATION_BEFORE.search(before):
        return "dose"  # a group label: "with OVZ 10 μM", "MSF 30 mg"
    if unit in _SETTING_UNITS or _SETTING_AFTER.match(after):
        return "setting"
    if _SETTING_BEFORE.search(before) and not draft.has_spread:
        return "setting"
    if is_time and not draft.has_spread:
        return "time"
    if draft.unit is None and not draft.has_spread and _TIME_WORD_BEFORE.search(before):
        return "time"
    if (
        draft.unit is None
        and draft.percent is None
        and _YEAR.match(_leading_number(norm, draft.start))
        and (not draft.has_spread or (draft.spread_kind is None and _YEAR_BEFORE.search(before)))
    ):
        # "in 2007 (9)": a year and its reference number, not a value and its spread.
        return "year"
    return "measure"


_RATIO_WORD_BEFORE = re.compile(
    r"\b(?:ratios?|mixtures?|proportions? of|split|[A-Za-z][\w()+-]*/[A-Za-z(][\w()+-]*\s*=)"
    r"[^.;]{0,50}$",
    re.I,
)
_SLASH_PAIR = re.compile(r"(?<![\w./])(\d+)/(\d+)(?![\d.])")


def _is_slash_ratio(norm: str, draft: _Draft, before: str) -> bool:
    """Whether "a/b" is a ratio ("95/5", "mixture ratios of 60/40") rather than a count of a
    total ("46/108 neurons"): the part exceeds the whole, the clause says ratio or mixture or
    writes "A/B = a/b", or the pair is one of a list of pairs that all add up to the same sum."""
    assert draft.total is not None
    if draft.value > draft.total or _RATIO_WORD_BEFORE.search(before):
        return True
    pairs = [
        (int(m.group(1)), int(m.group(2)))
        for m in _SLASH_PAIR.finditer(norm[max(0, draft.start - 60) : draft.end + 60])
    ]
    sums = {a + b for a, b in pairs}
    totals = {b for _, b in pairs}
    return len(pairs) >= 2 and len(sums) == 1 and len(totals) > 1


def _statistic(norm: str, draft: _Draft, *, header_statistic: str | None) -> str:
    if draft.percent is not None or draft.total is not None:
        return "count"
    if (
        draft.unit is not None
        and draft.unit.strip().startswith("%")
        and "baseline" not in draft.unit
    ):
        return "percent"
    if draft.is_range:
        return "other"
    before = norm[max(0, draft.start - 50) : draft.start]
    if draft.spread_kind == "IQR" or _MEDIAN_BEFORE.search(before) or header_statistic == "median":
        return "median"
    if draft.has_spread or _MEAN_BEFORE.search(before) or header_statistic == "mean":
        return "mean"
    return "single"


def _freeze(
    text: str,
    norm: str,
    draft: _Draft,
    *,
    role: str,
    sentence_kind: str | None,
    context_kind: str | None,
    header_statistic: str | None = None,
) -> Quantity:
    flags: list[str] = []
    spread: Spread | None = None
    statistic = _statistic(norm, draft, header_statistic=header_statistic)
    if draft.has_spread and draft.spread_value is not None:
        kind, kind_from = draft.spread_kind, "text"
        if kind is None:
            kind, kind_from = _kind_from_context(
                draft, sentence_kind=sentence_kind, context_kind=context_kind, statistic=statistic
            )
        if kind is None:
            flags.append("dispersion_kind_unknown")
            kind_from = "none"
        spread = Spread(kind=kind, value=draft.spread_value, kind_from=kind_from)
        if kind == "IQR" and statistic == "mean":
            statistic = "median"
    if draft.is_range:
        flags.append("range_only")
    if draft.unit is not None and not normalize(draft.value, draft.unit).known:
        flags.append("unknown_unit")
    return Quantity(
        value=draft.value,
        unit=text[
            norm.index(draft.unit, draft.start) : norm.index(draft.unit, draft.start)
            + len(draft.unit)
        ]
        if draft.unit is not None and draft.unit in norm[draft.start : draft.end]
        else draft.unit,
        statistic=statistic,
        spread=spread,
        role=role,
        start=draft.start,
        end=draft.end,
        text=text[draft.start : draft.end],
        percent=draft.percent,
        total=draft.total,
        reader="rules",
        flags=tuple(flags),
    )


def _kind_from_context(
    draft: _Draft, *, sentence_kind: str | None, context_kind: str | None, statistic: str
) -> tuple[str | None, str]:
    is_pair = isinstance(draft.spread_value, tuple)
    for kind, source in ((sentence_kind, "text"), (context_kind, "context")):
        if kind is None:
            continue
        if is_pair and kind in ("CI95", "IQR", "range"):
            return kind, source
        if not is_pair and kind in ("SD", "SEM"):
            return kind, source
    if is_pair and statistic == "median":
        return None, "none"
    return None, "none"


def _citation_spans(norm: str) -> list[tuple[int, int]]:
    spans = []
    for match in re.finditer(r"\[[\d\s,–-]+\]", norm):
        if _CITATION.match(match.group(0)):
            spans.append((match.start(), match.end()))
    return spans


def find_quantities(
    text: str, *, dispersion: str | None = None, measures_only: bool = False
) -> list[Quantity]:
    """Find every number in a sentence or paragraph, with unit, spread, statistic and role.

    Args:
        text: a sentence or paragraph, as printed.
        dispersion: the kind ("SD", "SEM", "CI95", "IQR") that the surrounding context declares
            (legend, footnote, methods statement: see :func:`find_dispersion_statement`); used
            when the value's own sentence does not say.
        measures_only: keep only quantities whose role is "measure".

    Returns:
        Quantities in text order, with character offsets into ``text``.
    """
    if not any(ch.isdigit() for ch in text) and not _text_has_number_words(text):
        return []
    norm = normalize_text(text)
    sentence_kind = find_dispersion_statement(text)
    citations = _citation_spans(norm)
    found: list[Quantity] = []
    position = 0
    for match in _NUM_RE.finditer(norm):
        if match.start() < position:
            continue
        if _inside_word(norm, match.start()):
            continue
        draft = _read_draft(norm, match.start())
        if draft is None:
            continue
        position = draft.end
        in_citation = any(a <= draft.start < b for a, b in citations)
        role = _classify_role(norm, draft, in_citation=in_citation)
        found.append(
            _freeze(
                text,
                norm,
                draft,
                role=role,
                sentence_kind=sentence_kind,
                context_kind=dispersion,
            )
        )
    found.extend(_quantulum_quantities(text, taken=[(q.start, q.end) for q in found]))
    found.sort(key=lambda q: q.start)
    if measures_only:
        found = [q for q in found if q.role == "measure"]
    return found


def _inside_word(norm: str, index: int) -> bool:
    """Whether a digit at ``index`` belongs to a name such as "IL-6", "CD4", "H2O" or "S2"."""
    if index == 0:
        return False
    prev = norm[index - 1]
    if prev.isalpha():
        return True
    if prev == "-" and index >= 2 and norm[index - 2].isalpha():
        return True
    return False


# ---------------------------------------------------------------------------------------------
# quantulum3: numbers written as words

_NUMBER_WORDS = (
    "one two three four five six seven eight nine ten eleven twelve thirteen fourteen fifteen"
    " sixteen seventeen eighteen nineteen twenty thirty forty fifty sixty seventy eighty ninety"
    " hundred"
).split()
_NUMBER_WORD_RE = re.compile(r"\b(?:" + "|".join(_NUMBER_WORDS) + r")\b", re.I)
_quantulum_parser: Any = None


def _text_has_number_words(text: str) -> bool:
    return _NUMBER_WORD_RE.search(text) is not None


def _quantulum() -> Any:
    """quantulum3's parser, imported on first use (its start-up costs about 5 s)."""
    global _quantulum_parser
    if _quantulum_parser is None:
        import warnings

        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            import quantulum3.classifier

            # Its pickled classifier breaks under newer scikit-learn; our rules read units.
            quantulum3.classifier.USE_CLF = False
            from quantulum3 import parser

        _quantulum_parser = parser
    return _quantulum_parser


#: How far after a number word quantulum3 reads (its unit follows the number: "twelve mice").
_WINDOW_AFTER = 48


def _number_word_windows(text: str) -> list[tuple[int, int]]:
    """Stretches of ``text`` that start at a number word and run a few words past it, merged.

    quantulum3's cost grows with the text it reads; a quantity written in words starts at its
    first number word and ends within a few words, so only these stretches are read.
    """
    windows: list[tuple[int, int]] = []
    for match in _NUMBER_WORD_RE.finditer(text):
        end = min(len(text), match.end() + _WINDOW_AFTER)
        space = text.find(" ", end)
        end = len(text) if space == -1 else space
        if windows and match.start() <= windows[-1][1]:
            windows[-1] = (windows[-1][0], max(windows[-1][1], end))
        else:
            windows.append((match.start(), end))
    return windows


def _parse_number_word_windows(parser: Any, text: str) -> list[tuple[int, int, Any]]:
    """quantulum3's quantities in the number-word stretches, with spans in ``text``."""
    found = []
    for offset, stop in _number_word_windows(text):
        for parsed in parser.parse(text[offset:stop]):
            start, end = parsed.span
            found.append((offset + start, offset + end, parsed))
    return found


def _quantulum_quantities(text: str, *, taken: list[tuple[int, int]]) -> list[Quantity]:
    """Numbers written as words ("twelve mice", "forty milligrams"), read by quantulum3."""
    if not _text_has_number_words(text):
        return []
    parser = _quantulum()
    norm = normalize_text(text)
    found = []
    for start, end, parsed in _parse_number_word_windows(parser, text):
        if any(a < end and start < b for a, b in taken):
            continue
        surface = text[start:end]
        if not _NUMBER_WORD_RE.search(surface):
            continue
        unit_name = parsed.unit.name
        unit = None
        if unit_name not in ("dimensionless", ""):
            words = surface.split()
            while words and (
                _NUMBER_WORD_RE.fullmatch(words[0].split("-")[-1]) or words[0].lower() == "and"
            ):
                words = words[1:]
            unit = " ".join(words) or None
            if unit is not None and not is_known_unit(unit):
                unit = None
        draft = _Draft(value=float(parsed.value), start=start, end=end, unit=unit)
        role = _classify_role(norm, draft, in_citation=False)
        if role == "measure" and unit is None:
            role = "other"  # "the three arms": a number word without a unit is no data point
        statistic = "percent" if unit_name == "percentage" else "single"
        found.append(
            Quantity(
                value=float(parsed.value),
                unit=unit,
                statistic=statistic,
                role=role,
                start=start,
                end=end,
                text=surface,
                reader="quantulum3",
            )
        )
    return found


# ---------------------------------------------------------------------------------------------
# Table cells

_EMPTY_CELLS = frozenset(
    {"", "-", "–", "—", "n.d.", "nd", "n/a", "na", "ns", "n.s.", "…", "...", "−"}
)


def _unit_from_header(header: str) -> str | None:
    """The unit a column or row header states: "Body mass (g)", "Glucose, mmol/L"."""
    for match in re.finditer(r"\(([^()]*)\)|\[([^\[\]]*)\]|,\s*([^,()]+)$", header):
        candidate = next(g for g in match.groups() if g is not None).strip()
        if candidate and is_known_unit(candidate) and candidate.lower() not in _NOT_UNITS:
            return candidate
    return None


def parse_cell(
    text: str, *, header: str | None = None, dispersion: str | None = None
) -> Quantity | None:
    """Read one table cell ("24.1 ± 1.3", "0.42 (0.05)", "128 [120–136]", "42 (37.5%)").

    Pure: no pipeline, no state. The header (column or row header, or both joined) gives the
    dispersion kind ("Mean (SEM)", "median (IQR)"), the statistic and, when the cell has none,
    the unit ("Body mass (g)"), flagged "unit_from_header".

    Args:
        text: the cell text as printed.
        header: the header text that applies to the cell, if any.
        dispersion: the kind the table's legend or footnote declares, if any.

    Returns:
        The quantity, or None for an empty or non-numeric cell ("n.d.", "—").
    """
    stripped = text.strip()
    if stripped.lower() in _EMPTY_CELLS or not any(ch.isdigit() for ch in stripped):
        return None
    norm = normalize_text(stripped)
    match = _NUM_RE.search(norm)
    if match is None or norm[: match.start()].strip() not in ("", "<", ">", "≤", "≥", "~"):
        return None
    draft = _read_draft(norm, match.start())
    if draft is None:
        return None
    header_kind = find_dispersion_statement(header) if header else None
    header_statistic = None
    if header:
        lowered = header.lower()
        if re.search(r"\bmedian\b", lowered):
            header_statistic = "median"
        elif re.search(r"\bmean\b", lowered):
            header_statistic = "mean"
    quantity = _freeze(
        stripped,
        norm,
        draft,
        role="measure",
        sentence_kind=header_kind,
        context_kind=dispersion,
        header_statistic=header_statistic,
    )
    if (
        quantity.spread is not None
        and quantity.spread.kind_from == "text"
        and header_kind
        and draft.spread_kind is None
    ):
        quantity = _replace(
            quantity, spread=Spread(quantity.spread.kind, quantity.spread.value, "context")
        )
    if quantity.unit is None and header and quantity.statistic != "count":
        unit = _unit_from_header(header)
        if unit is not None:
            quantity = _replace(quantity, unit=unit, flags=quantity.flags + ("unit_from_header",))
            if unit.strip().startswith("%") and quantity.statistic == "single":
                quantity = _replace(quantity, statistic="percent")
    if norm[: match.start()].strip():
        quantity = _replace(quantity, flags=quantity.flags + ("censored",))
    rest = stripped[quantity.end :].strip()
    if quantity.unit is None and _UNKNOWN_UNIT.fullmatch(rest) and not _NOT_A_UNIT.fullmatch(rest):
        # A unit the unit registry does not know ("1213 ± 214 RFU"): kept as written.
        quantity = _replace(
            quantity,
            unit=rest,
            end=len(stripped),
            text=stripped,
            flags=quantity.flags + ("unknown_unit",),
        )
    return quantity


#: A word after a cell's value that can be a unit the registry lacks ("RFU", "AU", "cells/well").
_UNKNOWN_UNIT = re.compile(r"[A-Za-zµμ°][A-Za-z0-9µμ/²³·^-]{0,11}")
#: Words after a value that are no unit: statistic labels, marks of significance, "vs".
_NOT_A_UNIT = re.compile(
    r"(?i:SD|SEM|SE|CI|IQR|range|mean|median|n|ns|n\.?s|vs|versus|and|or|to|p|NA|ND)"
)


def _replace(quantity: Quantity, **changes: Any) -> Quantity:
    from dataclasses import replace

    return replace(quantity, **changes)
