"""Value phrases: a number with its spread, interval, percentage and unit, as printed.

One grammar serves table cells (the whole cell is one phrase) and sentences (phrases found
anywhere): "24.1 ± 1.3 g", "24.1 +/- 1.3", "24.1 (SD 1.3) g", "24.1 (1.3)", "132 [128–136]",
"132 (95% CI 128 to 136)", "4 (IQR 3–5)", "14 (range 9–22)", "42 (37.5%)", "0.42 mg/dL".
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from extract.records.patterns import clean_cell, dispersion_kind_in, is_empty_cell, to_number

_MINUS = "\u2212"
_NUM = rf"(?<![\w.])[-{_MINUS}\u2013]?\d+(?:\.\d+)?(?:\s*[×x]\s*10\^?[-{_MINUS}]?\d+)?(?![\d])"
_NUM_IN = rf"[-{_MINUS}\u2013]?\d+(?:\.\d+)?"
_DASH = r"(?:\s*[\u2013\u2014-]\s*|\s+to\s+|\s*,\s*)"
_KIND = r"(?:SD|SEM|SE|s\.d\.|s\.e\.m\.|95\s*%\s*CI|CI|IQR|interquartile range|range)"
_UNIT_ATOM = r"(?:[×x]\s*10\^?\d+\s*/\s*[µμu]?L|mm\s?Hg|°C|%|[A-Za-zµμΩ][A-Za-zµμΩ]*[²³23]?)"
_UNIT = rf"{_UNIT_ATOM}(?:\s*/\s*{_UNIT_ATOM}|·{_UNIT_ATOM})*"

PHRASE = re.compile(
    rf"(?P<v>{_NUM})"
    rf"(?:\s*(?P<u1>{_UNIT})(?=\s*(?:±|\+/-|[(\[])))?"
    rf"(?:\s*(?:±|\+/-)\s*(?P<pm>{_NUM_IN})"
    rf"|\s*[(\[]\s*(?:(?P<kind>{_KIND})[\s:,=]*)?"
    rf"(?:(?P<lo>{_NUM_IN}){_DASH}(?P<hi>{_NUM_IN})|(?P<d>{_NUM_IN})\s*(?P<pct>%)?)\s*[)\]])?"
    rf"(?:\s*(?P<u2>{_UNIT}))?"
)

#: Words that can follow a number but are no unit.
NOT_UNITS: frozenset[str] = frozenset(
    """a an and or in at of on to vs versus for from with without by per than the this that
    was were is are be been had has have group groups mice rats animals subjects patients
    participants rodents cells wells samples times fold each all both after before during
    compared respectively while whereas but not no n p ci sd sem se iqr range week weeks day days
    month months year years hour hours old aged male female males females""".split()
)


@dataclass(frozen=True)
class ValuePhrase:
    """One value phrase found in a text, with its character span."""

    start: int
    end: int
    text: str
    value: float
    raw_value: str
    unit: str | None
    kind: str | None
    dispersion: float | None
    bounds: tuple[float, float] | None
    percent: float | None


#: Unit words written without a slash or sign that a value may carry.
UNIT_WORDS: frozenset[str] = frozenset(
    """g kg mg µg μg ug ng pg fg s ms µs min h hr hrs d L l dL mL µL μL uL nL mm cm m µm μm nm km
    mmHg gf N mN U IU mU kU RFU RLU AU bpm Hz kHz kDa Da mol mmol µmol μmol nmol pmol M mM µM μM
    nM pM mV µV μV V W J kJ kcal cal Pa kPa mbar °C K % fold mm² mm2 cm² cm2 m² µm² μm² mm³ cm³
    mEq mOsm""".split()
)


def looks_like_unit(text: str) -> bool:
    """True for a written unit ("mg/dL", "gf", "mm²", "RFU"), false for ordinary words."""
    text = text.strip()
    if not text or text.lower() in NOT_UNITS or text.lower().split("/")[0] in NOT_UNITS:
        return False
    if text in UNIT_WORDS or "/" in text or "·" in text or text.startswith(("×", "x10", "mm Hg")):
        return True
    return bool(re.fullmatch(r"[A-Z]{2,4}", text))


def _unit(text: str | None) -> str | None:
    if not text:
        return None
    text = text.strip()
    return text if looks_like_unit(text) else None


def find_value_phrases(text: str) -> list[ValuePhrase]:
    """Every value phrase in ``text``, left to right (roles are judged by the caller)."""
    phrases: list[ValuePhrase] = []
    for match in PHRASE.finditer(text):
        u1 = _unit(match["u1"])
        u2 = _unit(match["u2"])
        end = match.end()
        if match["u2"] and u2 is None:
            end = match.start("u2")
            while end > 0 and text[end - 1].isspace():
                end -= 1
        kind_word = match["kind"]
        kind = dispersion_kind_in(kind_word) if kind_word else None
        percent = None
        dispersion = None
        bounds = None
        if match["lo"] is not None:
            bounds = (to_number(match["lo"]), to_number(match["hi"]))
        elif match["d"] is not None and match["pct"]:
            percent = to_number(match["d"])
        elif match["d"] is not None:
            dispersion = to_number(match["d"])
        elif match["pm"] is not None:
            dispersion = to_number(match["pm"])
        raw_value = match["v"]
        phrases.append(
            ValuePhrase(
                start=match.start(),
                end=end,
                text=text[match.start() : end],
                value=to_number(raw_value.replace("\u2013", "-")),
                raw_value=raw_value,
                unit=u1 or u2,
                kind=kind,
                dispersion=dispersion,
                bounds=bounds,
                percent=percent,
            )
        )
    return phrases


def has_spread(phrase: ValuePhrase) -> bool:
    """True when the phrase prints a spread or interval with its value."""
    return phrase.dispersion is not None or phrase.bounds is not None


@dataclass(frozen=True)
class CellValue:
    """A number read from a table cell.

    ``dispersion`` is a single spread (SD/SEM-like), ``bounds`` a (low, high) pair, ``percent``
    the percentage after a count ("12 (40%)"); ``kind`` the dispersion kind the cell names
    ("(SD 1.3)"); ``unit`` the unit written in the cell, if any.
    """

    value: float
    dispersion: float | None = None
    bounds: tuple[float, float] | None = None
    percent: float | None = None
    is_percent: bool = False
    unit: str | None = None
    kind: str | None = None


def parse_cell(text: str) -> CellValue | None:
    """The number(s) in one table cell, or ``None`` when the cell holds no data value.

    The whole cell must be one value phrase. P-value forms ("<0.001", "p = 0.03") and empty
    marks ("—", "n.d.") give ``None``: they are not data points.
    """
    text = clean_cell(text)
    if not text or is_empty_cell(text) or re.match(r"^(?:[<>≤≥]|[pP]\s*[=<>])", text):
        return None
    phrases = find_value_phrases(text)
    if len(phrases) != 1 or phrases[0].start != 0 or phrases[0].end != len(text):
        return None
    phrase = phrases[0]
    return CellValue(
        value=phrase.value,
        dispersion=phrase.dispersion,
        bounds=phrase.bounds,
        percent=phrase.percent,
        is_percent=phrase.unit == "%",
        unit=phrase.unit,
        kind=phrase.kind,
    )
