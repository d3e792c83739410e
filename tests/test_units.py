"""Unit reading, UCUM codes and normalisation, checked against NIST SP 811, UCUM and pint."""

from __future__ import annotations

import pickle

import pytest

from extract.errors import UnitError
from extract.units import clean_unit_text, convert, get_registry, normalize, parse_unit, to_ucum


def test_registry_is_built_once() -> None:
    assert get_registry() is get_registry()


# (value, from, to, expected): NIST Special Publication 811 (2008), Appendix B.8/B.9 factors.
NIST_FACTORS = [
    (1.0, "mmHg", "Pa", 133.3224),  # NIST SP 811 B.8: millimeter of mercury (conventional) -> Pa
    (1.0, "mm Hg", "Pa", 133.3224),  # same factor, spelling with a space
    (1.0, "lb", "kg", 0.45359237),  # NIST SP 811 B.8: pound (avoirdupois), exact
    (1.0, "in", "cm", 2.54),  # NIST SP 811 B.8: inch = 2.54 cm, exact
    (1.0, "cal", "J", 4.184),  # NIST SP 811 B.8: calorie (thermochemical), exact
    (1.0, "gf", "N", 9.80665e-3),  # NIST SP 811 B.8: gram-force = 9.80665 E-03 N, exact
    (1.0, "cmH2O", "Pa", 98.0665),  # NIST SP 811 B.8: centimeter of water (conventional)
    (1.0, "kcal", "kJ", 4.184),  # NIST SP 811 B.8: kilocalorie (thermochemical)
]


@pytest.mark.parametrize(("value", "source", "target", "expected"), NIST_FACTORS)
def test_convert_matches_nist_sp811(
    value: float, source: str, target: str, expected: float
) -> None:
    assert convert(value, source, target) == pytest.approx(expected, rel=1e-6)


# UCUM 2.1 codes (Unified Code for Units of Measure, unitsofmeasure.org, tables of base units,
# derived units and clinical units; [IU] and mm[Hg] are in the "clinical units" table).
UCUM_CODES = [
    ("mm Hg", "mm[Hg]"),
    ("mmHg", "mm[Hg]"),
    ("°C", "Cel"),
    ("IU/mL", "[IU]/mL"),
    ("IU", "[IU]"),
    ("µmol/L", "umol/L"),  # µ = U+00B5 micro sign
    ("μmol/L", "umol/L"),  # μ = U+03BC Greek mu
    ("umol/L", "umol/L"),
    ("×10³/µL", "10*3/uL"),
    ("x10^3/uL", "10*3/uL"),
    ("10^9/L", "10*9/L"),
    ("10*3/uL", "10*3/uL"),
    ("mg/dL", "mg/dL"),
    ("mg/dl", "mg/dL"),
    ("g/L", "g/L"),
    ("U/L", "U/L"),
    ("%", "%"),
    ("mEq/L", "meq/L"),
    ("mM", "mmol/L"),  # UCUM has no molar symbol: mmol/L
    ("lb", "[lb_av]"),
    ("in", "[in_i]"),
    ("kg/m2", "kg/m2"),
    ("bpm", "{beats}/min"),
    ("beats per minute", "{beats}/min"),
    ("cells/µL", "{cells}/uL"),
]


@pytest.mark.parametrize(("written", "ucum"), UCUM_CODES)
def test_ucum_code(written: str, ucum: str) -> None:
    assert to_ucum(written) == ucum


# (value, unit, canonical value, canonical UCUM code); factors from NIST SP 811 and pint.
CANONICAL = [
    (0.42, "mg/dL", 0.0042, "g/L"),  # 1 dL = 0.1 L (SI prefix deci, NIST SP 811 Table 5)
    (5.0, "µmol/L", 0.005, "mmol/L"),  # SI prefixes micro/milli (NIST SP 811 Table 5)
    (150.0, "μM", 0.15, "mmol/L"),  # 1 M = 1 mol/L (IUPAC Green Book, from memory)
    (7.3, "×10³/µL", 7.3, "10*9/L"),  # 10^3 per µL = 10^9 per L (SI prefixes)
    (6.1, "× 10⁶/µL", 6100.0, "10*9/L"),
    (98.6, "°F", 37.0, "Cel"),  # NIST SP 811 B.9: t/°C = (t/°F - 32)/1.8
    (2.0, "kPa", 15.00123, "mm[Hg]"),  # 2000 Pa / 133.3224 Pa per mmHg (NIST SP 811 B.8)
    (12.0, "IU/mL", 12000.0, "[IU]/L"),
    (1.0, "lb", 453.59237, "g"),  # NIST SP 811 B.8, exact
    (350.0, "bpm", 350.0, "/min"),
    (85.0, "% of baseline", 85.0, "%{baseline}"),
    (98.2, "gf", 0.9630130, "N"),  # 9.80665e-3 N per gf (NIST SP 811 B.8)
]


@pytest.mark.parametrize(("value", "unit", "expected", "canonical"), CANONICAL)
def test_normalize_to_canonical(value: float, unit: str, expected: float, canonical: str) -> None:
    result = normalize(value, unit)
    assert result.known
    assert result.canonical_unit == canonical
    assert result.value == pytest.approx(expected, rel=1e-5)
    assert result.unit == unit


def test_normalize_agrees_with_pint_for_mass_concentration() -> None:
    # pint is the reference library: its own registry converts 0.42 mg/dL to g/L.
    import pint

    reference = pint.UnitRegistry().Quantity(0.42, "mg/dL").to("g/L").magnitude
    assert normalize(0.42, "mg/dL").value == pytest.approx(reference)


def test_glucose_mass_to_molar_with_molar_mass() -> None:
    # Glucose 100 mg/dL = 5.55 mmol/L with M = 180.156 g/mol (common practice clinical factor).
    assert convert(100, "mg/dL", "mmol/L", molar_mass=180.156) == pytest.approx(5.5507, rel=1e-4)


@pytest.mark.parametrize("unit", ["foo/bar", "furlongs per zorp", "Zq"])
def test_unknown_unit_is_kept_and_flagged(unit: str) -> None:
    result = normalize(3.2, unit)
    assert result.known is False
    assert result.ucum is None
    assert result.canonical_unit is None
    assert result.unit == unit
    assert result.value == 3.2
    assert "unknown_unit" in result.flags


def test_no_unit() -> None:
    result = normalize(8, None)
    assert result.known and result.unit is None and result.ucum is None


def test_dose_rate_has_no_canonical_frequency() -> None:
    # mg/kg/day has dimension 1/time in pint, but it is a dose rate, not a frequency.
    result = normalize(3, "mg/kg/day")
    assert result.canonical_unit is None
    assert result.ucum == "mg/kg/d"
    assert "no_canonical_unit" in result.flags


def test_strict_helpers_raise_unit_error() -> None:
    with pytest.raises(UnitError) as info:
        parse_unit("zorps")
    assert "zorps" in str(info.value)
    with pytest.raises(UnitError):
        convert(1, "g", "mmHg")
    error = pickle.loads(pickle.dumps(info.value))
    assert error.unit == "zorps"


@pytest.mark.parametrize(
    ("written", "cleaned"),
    [
        ("mm Hg", "mmHg"),
        ("×10³/µL", "10**3 * 1/uL"),
        ("μg/mL", "ug/mL"),
        ("kg/m2", "kg/m^2"),
        ("% of baseline", "percent_of_baseline"),
    ],
)
def test_clean_unit_text(written: str, cleaned: str) -> None:
    assert clean_unit_text(written) == cleaned
    assert clean_unit_text(cleaned) == cleaned  # idempotent: the registry runs it again


@pytest.mark.parametrize("fahrenheit", [98.6, 32.0, -40.0, 212.0])
def test_normalize_temperature_offset_survives_caching(fahrenheit: float) -> None:
    # NIST SP 811 (2008), B.9: t/°C = (t/°F − 32)/1.8. Offset units need the affine map,
    # not a bare factor; repeated calls hit the per-unit cache and must agree.
    first = normalize(fahrenheit, "°F")
    again = normalize(fahrenheit, "°F")
    assert first.canonical_unit == "Cel"
    assert first.value == pytest.approx((fahrenheit - 32) / 1.8)
    assert again == first


@pytest.mark.parametrize(
    ("value", "unit", "target"),
    [(0.42, "mg/dL", "g/L"), (7.3, "×10³/µL", "10**9/L"), (120.0, "mm Hg", "mmHg")],
)
def test_normalize_agrees_with_pint_conversion(value: float, unit: str, target: str) -> None:
    # Reference library: pint's own conversion of the same quantity.
    ureg = get_registry()
    canonical = ureg.parse_expression(target)
    expected = (value * parse_unit(unit)).to(canonical.units)
    assert normalize(value, unit).value == pytest.approx(
        float(expected.magnitude) / float(canonical.magnitude)
    )


@pytest.mark.parametrize(
    ("unit", "ucum", "fraction"),
    [("ppm", "[ppm]", 1e-6), ("ppb", "[ppb]", 1e-9), ("‰", "[ppth]", 1e-3)],
)
def test_parts_per_units_have_ucum_codes(unit: str, ucum: str, fraction: float) -> None:
    # UCUM 2.1, dimensionless units "parts per thousand/million/billion": [ppth] = 10^-3,
    # [ppm] = 10^-6, [ppb] = 10^-9
    assert to_ucum(unit) == ucum
    assert float(parse_unit(unit).to("dimensionless").magnitude) == pytest.approx(fraction)
