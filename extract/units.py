"""Units: the one pint registry, UCUM codes, canonical units and normalisation.

winnow reads units as authors write them ("mg/dl", "mm Hg", "×10³/µL", "IU/mL") and gives each
value three things for the proposal record: the UCUM code of the unit as written
(``unit_ucum``), and the value in the canonical unit of its dimension (``value_normalized``,
``unit_normalized``, a UCUM code). docs/units.md lists the canonical units.

There is exactly one :class:`pint.UnitRegistry` per process, built lazily on first use (about
0.3-1 s) from pint's defaults plus ``units_definitions.txt`` beside this module. Odd spellings
are rewritten by :func:`clean_unit_text`, which the registry also runs as its preprocessor.

:func:`normalize` never raises on an unknown unit: it keeps the written form, sets ``known`` to
False and flags it. Only the strict helpers (:func:`parse_unit`, :func:`convert`) raise
:class:`~extract.errors.UnitError`.
"""

from __future__ import annotations

import logging
import math
import re
import threading
import unicodedata
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any

import pint

from extract.errors import UnitError

__all__ = [
    "CANONICAL_UNITS",
    "DEFINITIONS_FILE",
    "Normalized",
    "clean_unit_text",
    "convert",
    "get_registry",
    "is_known_unit",
    "normalize",
    "parse_unit",
    "to_ucum",
]

log = logging.getLogger(__name__)

#: The definitions file for units pint lacks (its header documents the grammar).
DEFINITIONS_FILE = Path(__file__).with_name("units_definitions.txt")

#: Canonical unit per dimension: (pint expression, power of ten, UCUM code). The value in the
#: canonical unit is ``quantity.to(pint expression) / 10**power``. Dimensionless units (%, mg/kg,
#: counts) keep their own unit; docs/units.md explains the choices.
CANONICAL_UNITS: tuple[tuple[str, int, str], ...] = (
    ("g", 0, "g"),
    ("cm", 0, "cm"),
    ("mL", 0, "mL"),
    ("s", 0, "s"),
    ("degC", 0, "Cel"),
    ("mmHg", 0, "mm[Hg]"),
    ("N", 0, "N"),
    ("J", 0, "J"),
    ("W", 0, "W"),
    ("g/L", 0, "g/L"),
    ("mmol/L", 0, "mmol/L"),
    ("mmol", 0, "mmol"),
    ("U/L", 0, "U/L"),
    ("U", 0, "U"),
    ("IU/L", 0, "[IU]/L"),
    ("IU", 0, "[IU]"),
    ("mEq/L", 0, "meq/L"),
    ("mEq", 0, "meq"),
    ("1/L", 9, "10*9/L"),
    ("1/min", 0, "/min"),
    ("mL/min", 0, "mL/min"),
    ("kg/m^2", 0, "kg/m2"),
    ("cm/s", 0, "cm/s"),
    ("percent_of_baseline", 0, "%{baseline}"),
)

#: pint base name (after the prefix) -> UCUM atom (UCUM 2.1 tables; "{...}" are annotations).
_UCUM_ATOMS: dict[str, str] = {
    "gram": "g",
    "liter": "L",
    "meter": "m",
    "second": "s",
    "minute": "min",
    "hour": "h",
    "day": "d",
    "week": "wk",
    "wk": "wk",
    "month": "mo",
    "year": "a",
    "mole": "mol",
    "enzyme_unit": "U",
    "international_unit": "[IU]",
    "equivalent": "eq",
    "percent": "%",
    "ppm": "[ppm]",
    "ppb": "[ppb]",
    "ppth": "[ppth]",
    "meter_Hg": "m[Hg]",
    "millimeter_Hg": "mm[Hg]",
    "meter_H2O": "m[H2O]",
    "centimeter_H2O": "cm[H2O]",
    "degree_Celsius": "Cel",
    "degree_Fahrenheit": "[degF]",
    "kelvin": "K",
    "pascal": "Pa",
    "bar": "bar",
    "newton": "N",
    "force_gram": "gf",
    "joule": "J",
    "calorie": "cal",
    "watt": "W",
    "hertz": "Hz",
    "beat": "{beats}",
    "cell": "{cells}",
    "count": "1",
    "percent_of_baseline": "%{baseline}",
    "inch": "[in_i]",
    "foot": "[ft_i]",
    "pound": "[lb_av]",
    "dalton": "g/mol",
    "bpm": "{beats}/min",
}

#: pint prefix name -> UCUM prefix symbol (UCUM 2.1, table 1 "prefix symbols").
_UCUM_PREFIXES: dict[str, str] = {
    "": "",
    "atto": "a",
    "femto": "f",
    "pico": "p",
    "nano": "n",
    "micro": "u",
    "milli": "m",
    "centi": "c",
    "deci": "d",
    "deca": "da",
    "hecto": "h",
    "kilo": "k",
    "mega": "M",
    "giga": "G",
}

_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")
_SUPERSCRIPT_RUN = re.compile(r"[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+")
# Spellings with spaces or symbols pint cannot read, rewritten to a defined name (order matters).
_REWRITES: tuple[tuple[re.Pattern[str], str], ...] = (
    (re.compile(r"%\s*(?:of\s+)?baseline", re.I), "percent_of_baseline"),
    (re.compile(r"\bbeats?\s*(?:per|/)\s*min(?:ute)?\b", re.I), "bpm"),
    (re.compile(r"\bmm\s+Hg\b", re.I), "mmHg"),
    (re.compile(r"\bmmhg\b", re.I), "mmHg"),
    (re.compile(r"\bcm\s*H2O\b", re.I), "cmH2O"),
    (re.compile(r"[°º˚]\s*C\b"), "degC"),
    (re.compile(r"[°º˚]\s*F\b"), "degF"),
    (re.compile(r"\bdeg\s+([CF])\b"), r"deg\1"),
    (re.compile(r"\bI\.U\.", re.I), "IU"),
    (re.compile(r"\bmeq\b"), "mEq"),
    (re.compile(r"‰"), "ppth"),
    (re.compile(r"\s+per\s+", re.I), "/"),
)
# A power-of-ten multiplier: "×10³", "x10^3", "× 10^9", "10*3" (UCUM), "10^9", "10E3".
_POWER_OF_TEN = re.compile(r"^(?:[x×*]\s*)?10\s*(?:\^|\*\*|\*|E)\s*(-?\d+)\s*", re.I)
# "m2", "cm3" written without a caret (not UCUM annotations like {cells}).
_BARE_EXPONENT = re.compile(r"(?<=[A-Za-z])(-?[1-9])(?![\w.])")

_lock = threading.Lock()
_registry: pint.UnitRegistry | None = None


@dataclass(frozen=True)
class Normalized:
    """A value with its unit read, coded and converted.

    Attributes:
        value: the value in ``canonical_unit``; the value as given when there is no canonical
            unit (unknown unit, no unit, or a dimension without one).
        unit: the unit as written (``None`` for a bare number).
        ucum: UCUM code of the unit as written, or ``None`` when unknown or not expressible.
        canonical_unit: UCUM code of the canonical unit of the unit's dimension, or ``None``.
        known: False when the registry could not read the unit (the value is then unchanged).
        flags: reasons for doubt, e.g. ``"unknown_unit"``, ``"no_canonical_unit"``.
        dimension: pint's dimensionality as text (e.g. ``"[mass] / [length] ** 3"``) or ``None``.
    """

    value: float
    unit: str | None
    ucum: str | None
    canonical_unit: str | None
    known: bool
    flags: tuple[str, ...] = ()
    dimension: str | None = None


def clean_unit_text(text: str) -> str:
    """Rewrite a unit as written into a spelling the registry reads.

    Handles superscripts ("10³", "m²"), micro signs (U+00B5 and U+03BC both become ``u``),
    unicode minus, multiplication signs, "mm Hg", "beats per minute", "% of baseline", degree
    signs, bare exponents ("kg/m2") and power-of-ten multipliers ("×10³/µL" -> ``10**3/uL``).
    Idempotent; never raises.

    Args:
        text: the unit as written.

    Returns:
        The rewritten unit text (may still be unknown to the registry).
    """
    out = _SUPERSCRIPT_RUN.sub(lambda m: "^" + m.group(0).translate(_SUPERSCRIPTS), text)
    out = out.replace("\u00b5", "u").replace("\u03bc", "u")
    out = out.replace("\u2212", "-").replace("\u2013", "-")
    out = out.replace("\u00b7", "*").replace("\u22c5", "*").replace("\u2219", "*")
    out = unicodedata.normalize("NFKC", out)
    out = " ".join(out.split())
    for pattern, replacement in _REWRITES:
        out = pattern.sub(replacement, out)
    match = _POWER_OF_TEN.match(out)
    if match:
        rest = out[match.end() :].lstrip("* ").strip()
        if rest.startswith("/"):
            rest = "1" + rest
        out = f"10**{match.group(1)}" + (f" * {rest}" if rest else "")
    out = _BARE_EXPONENT.sub(r"^\1", out)
    return out.strip()


def _preprocess(text: str) -> str:
    return clean_unit_text(text)


def get_registry() -> pint.UnitRegistry:
    """The process's one unit registry, built on first use.

    Returns:
        A :class:`pint.UnitRegistry` with winnow's definitions and preprocessor loaded.
    """
    global _registry
    if _registry is None:
        with _lock:
            if _registry is None:
                ureg: pint.UnitRegistry = pint.UnitRegistry(
                    preprocessors=[_preprocess], autoconvert_offset_to_baseunit=True
                )
                ureg.load_definitions(str(DEFINITIONS_FILE))
                _registry = ureg
    return _registry


@dataclass(frozen=True)
class _UnitInfo:
    """What the registry makes of a unit text (cached per text)."""

    quantity: Any  # pint.Quantity of magnitude 10**k (the unit with its multiplier)
    ucum: str | None
    canonical: tuple[str, int, str] | None
    dimension: str


def _atom_to_ucum(ureg: pint.UnitRegistry, name: str) -> str | None:
    if name in _UCUM_ATOMS:
        return _UCUM_ATOMS[name]
    for prefix, base, _suffix in ureg.parse_unit_name(name):
        if base == "molar":
            return f"{_UCUM_PREFIXES.get(prefix, '?')}mol/L"
        if base in _UCUM_ATOMS and prefix in _UCUM_PREFIXES:
            atom = _UCUM_ATOMS[base]
            if prefix and atom.startswith(("[", "{")) and atom != "[IU]":
                return None
            return _UCUM_PREFIXES[prefix] + atom
    return None


def _units_to_ucum(ureg: pint.UnitRegistry, quantity: Any) -> str | None:
    magnitude = float(quantity.magnitude)
    power = round(math.log10(magnitude)) if magnitude > 0 else 0
    if magnitude <= 0 or not math.isclose(magnitude, 10.0**power, rel_tol=1e-9):
        return None
    numerator: list[str] = [f"10*{power}"] if power else []
    denominator: list[str] = []
    for name, exponent in quantity.units._units.items():
        atom = _atom_to_ucum(ureg, name)
        if atom is None:
            return None
        if "/" in atom and exponent == 1:  # molar: mmol/L
            top, bottom = atom.split("/")
            numerator.append(top)
            denominator.append(bottom)
            continue
        if "/" in atom:
            return None
        power_text = str(abs(exponent)) if abs(exponent) != 1 else ""
        (numerator if exponent > 0 else denominator).append(atom + power_text)
    numerator = [term for term in numerator if term != "1"] or ([] if denominator else ["1"])
    text = ".".join(numerator)
    for term in denominator:
        text += "/" + term
    return text


def _find_canonical(ureg: pint.UnitRegistry, quantity: Any) -> tuple[str, int, str] | None:
    dimensionality = quantity.dimensionality
    for expression, power, ucum in CANONICAL_UNITS:
        if ureg.parse_expression(expression).dimensionality == dimensionality:
            return (expression, power, ucum)
    return None


def _has_cancelled_dimensions(ureg: pint.UnitRegistry, quantity: Any) -> bool:
    """Whether some dimension appears in both numerator and denominator (mg/kg/day)."""
    signs: dict[str, set[int]] = {}
    for name, exponent in quantity.units._units.items():
        for dimension, power in ureg.get_dimensionality(name).items():
            signs.setdefault(dimension, set()).add(1 if power * exponent > 0 else -1)
    return any(len(found) > 1 for found in signs.values())


@lru_cache(maxsize=4096)
def _unit_info(unit_text: str) -> _UnitInfo | None:
    ureg = get_registry()
    cleaned = clean_unit_text(unit_text)
    if not cleaned or not re.search(r"[A-Za-z%]", cleaned):
        return None
    try:
        quantity = ureg.parse_expression(cleaned)
    except (pint.errors.PintError, AttributeError, TypeError, ValueError, SyntaxError, KeyError):
        return None
    if not isinstance(quantity, ureg.Quantity) or float(quantity.magnitude) <= 0:
        return None
    ucum = _units_to_ucum(ureg, quantity)
    if quantity.dimensionless:
        canonical = (str(quantity.units), 0, ucum) if ucum else None
        if canonical is not None and float(quantity.magnitude) != 1.0:
            canonical = None
    elif _has_cancelled_dimensions(ureg, quantity):
        canonical = None  # mg/kg/day is a dose rate, not a frequency
    else:
        canonical = _find_canonical(ureg, quantity)
    return _UnitInfo(quantity, ucum, canonical, str(quantity.dimensionality))


def is_known_unit(unit_text: str) -> bool:
    """Whether the registry reads ``unit_text`` as a unit (never raises)."""
    return _unit_info(unit_text) is not None


def to_ucum(unit_text: str) -> str | None:
    """The UCUM code of a unit as written ("mm Hg" -> ``mm[Hg]``), or None when unknown."""
    info = _unit_info(unit_text)
    return info.ucum if info is not None else None


def parse_unit(unit_text: str) -> Any:
    """Read a unit strictly.

    Args:
        unit_text: the unit as written, e.g. "mg/dL" or "×10³/µL".

    Returns:
        A :class:`pint.Quantity` whose magnitude is the unit's multiplier (1, or 10**k).

    Raises:
        UnitError: when the registry cannot read the unit.
    """
    info = _unit_info(unit_text)
    if info is None:
        raise UnitError(unit_text)
    return info.quantity


def convert(
    value: float, from_unit: str, to_unit: str, *, molar_mass: float | None = None
) -> float:
    """Convert a value between two units, strictly.

    Args:
        value: the number in ``from_unit``.
        from_unit: unit as written.
        to_unit: target unit as written.
        molar_mass: g/mol, to convert between mass and substance concentration (pint's
            chemistry context), e.g. 180.156 for glucose.

    Returns:
        The value in ``to_unit``.

    Raises:
        UnitError: an unknown unit, or units of different dimensions.
    """
    source = parse_unit(from_unit)
    target = parse_unit(to_unit)
    try:
        quantity = value * source
        if molar_mass is not None:
            ureg = get_registry()
            with ureg.context("chemistry", mw=molar_mass * ureg("g/mol")):
                converted = quantity.to(target.units)
        else:
            converted = quantity.to(target.units)
    except pint.errors.DimensionalityError as error:
        raise UnitError(from_unit, f"cannot convert to {to_unit!r}") from error
    return float(converted.magnitude) / float(target.magnitude)


def normalize(value: float, unit_text: str | None) -> Normalized:
    """Read a value's unit, code it in UCUM and convert it to the canonical unit.

    Never raises: an unknown unit keeps its written form with ``known=False``, ``ucum=None`` and
    the flag ``"unknown_unit"``.

    Args:
        value: the number as written.
        unit_text: the unit as written, or None for a bare number.

    Returns:
        A :class:`Normalized`.
    """
    if unit_text is None or not unit_text.strip():
        return Normalized(value=value, unit=None, ucum=None, canonical_unit=None, known=True)
    info = _unit_info(unit_text.strip())
    if info is None:
        return Normalized(
            value=value,
            unit=unit_text,
            ucum=None,
            canonical_unit=None,
            known=False,
            flags=("unknown_unit",),
        )
    if info.canonical is None:
        return Normalized(
            value=value,
            unit=unit_text,
            ucum=info.ucum,
            canonical_unit=None,
            known=True,
            flags=("no_canonical_unit",),
            dimension=info.dimension,
        )
    _, _, canonical_ucum = info.canonical
    scale, offset = _to_canonical(unit_text.strip())
    return Normalized(
        value=_tidy(scale * value + offset),
        unit=unit_text,
        ucum=info.ucum,
        canonical_unit=canonical_ucum,
        known=True,
        dimension=info.dimension,
    )


@lru_cache(maxsize=4096)
def _to_canonical(unit_text: str) -> tuple[float, float]:
    """The map ``value -> scale * value + offset`` from a unit to its canonical unit.

    Every conversion between units is affine (a factor, plus an offset for temperatures), so
    two points computed by pint give the whole map; a batch pays pint's cost once per unit
    spelling instead of once per value.
    """
    info = _unit_info(unit_text)
    assert info is not None and info.canonical is not None  # callers check both
    expression, power, _ = info.canonical
    target = get_registry().parse_expression(expression).units

    def at(value: float) -> float:
        return float((value * info.quantity).to(target).magnitude) / 10.0**power

    offset = at(0.0)
    return at(1.0) - offset, offset


def _tidy(number: float) -> float:
    """Round away binary noise (12 significant digits) so 0.1 mg/dL -> 0.001 g/L exactly."""
    if number == 0 or not math.isfinite(number):
        return number
    digits = 12 - int(math.floor(math.log10(abs(number)))) - 1
    return round(number, digits)


def clear_caches() -> None:
    """Forget cached unit readings and conversions (the registry itself stays built)."""
    _unit_info.cache_clear()
    _to_canonical.cache_clear()
