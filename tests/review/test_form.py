"""The edit form's checks: numbers, units with UCUM codes, n, spread kinds, derived SD."""

from __future__ import annotations

import math

import pytest

from extract.review.form import (
    changed_fields,
    check_unit,
    fields_to_proposal,
    parse_number,
    parse_pair,
    parse_positive_int,
    proposal_to_fields,
)
from tests.review.scenario import ARTICLE, make_proposals

BASE = make_proposals(ARTICLE)[0]  # body mass 24.1 ± 1.3 g (SD), n = 12


def form(**changes: str) -> dict[str, str]:
    values = proposal_to_fields(BASE)
    values.update(changes)
    return values


@pytest.mark.parametrize(
    ("text", "number"),
    [("24.1", 24.1), (" −3.5 ", -3.5), ("1.2e3", 1200.0), (".5", 0.5), ("+7", 7.0)],
)
def test_parse_number_reads_plain_and_signed_numbers(text: str, number: float) -> None:
    assert parse_number(text) == number


@pytest.mark.parametrize("text", ["", "24,1", "1.2.3", "nan", "inf", "12 g", "x"])
def test_parse_number_refuses_what_is_not_a_finite_number(text: str) -> None:
    with pytest.raises(ValueError):
        parse_number(text)


@pytest.mark.parametrize(
    ("text", "pair"),
    [("1.2-3.4", (1.2, 3.4)), ("1.2 to 3.4", (1.2, 3.4)), ("-2, 5", (-2.0, 5.0)), ("3–7", (3, 7))],
)
def test_parse_pair_reads_low_high(text: str, pair: tuple[float, float]) -> None:
    assert parse_pair(text) == pair


@pytest.mark.parametrize("text", ["5", "5-2", "a-b", "1-2-3"])
def test_parse_pair_refuses_one_number_reversed_or_garbled_pairs(text: str) -> None:
    with pytest.raises(ValueError):
        parse_pair(text)


@pytest.mark.parametrize("text", ["0", "-3", "2.5", "ten", ""])
def test_n_must_be_a_positive_whole_number(text: str) -> None:
    with pytest.raises(ValueError):
        parse_positive_int(text)


@pytest.mark.parametrize(
    ("unit", "ucum"),
    [
        # UCUM (unitsofmeasure.org), table of prefixes and units: micro is "u", mercury "[Hg]",
        # international unit "[IU]", percent "%".
        ("µmol/L", "umol/L"),
        ("mg/dL", "mg/dL"),
        ("mmHg", "mm[Hg]"),
        ("%", "%"),
        ("g", "g"),
    ],
)
def test_check_unit_gives_the_ucum_code(unit: str, ucum: str) -> None:
    check = check_unit(unit)
    assert check.known and check.ucum == ucum


def test_check_unit_converts_to_the_canonical_unit() -> None:
    # pint: 100 mg/dL = 1 g/L (1 dL = 0.1 L).
    check = check_unit("mg/dL", value=100)
    assert check.value_normalized == pytest.approx(1.0)
    assert check.unit_normalized == "g/L"


def test_an_unknown_unit_is_refused_and_an_empty_unit_allowed() -> None:
    assert not check_unit("blorbs").known
    assert check_unit("  ").known and check_unit("").ucum is None
    result = fields_to_proposal(form(unit="blorbs"), base=BASE)
    assert not result.ok and "unit" in result.errors


def test_an_unchanged_form_gives_back_the_same_record() -> None:
    result = fields_to_proposal(form(), base=BASE)
    assert result.ok and result.proposal is not None
    assert changed_fields(BASE, result.proposal) == {}


def test_sem_with_n_gives_the_sd() -> None:
    # Cochrane Handbook 6.5.2.2: SD = SEM × √n; 1.2 × √25 = 6.
    result = fields_to_proposal(
        form(dispersion_kind="SEM", dispersion_value="1.2", n="25"), base=BASE
    )
    assert result.proposal is not None
    assert result.proposal.sd == pytest.approx(6.0)


def test_a_large_sample_ci95_gives_the_sd() -> None:
    # Cochrane Handbook 6.5.2.2: SD = √n × (upper − lower) / 3.92 for large samples (n >= 60).
    result = fields_to_proposal(
        form(dispersion_kind="CI95", dispersion_value="10-14", n="100"), base=BASE
    )
    assert result.proposal is not None
    assert result.proposal.dispersion is not None
    assert result.proposal.dispersion.value == (10.0, 14.0)
    assert result.proposal.sd == pytest.approx(math.sqrt(100) * 4 / 3.92)


def test_every_bad_field_is_named() -> None:
    result = fields_to_proposal(
        form(
            outcome=" ",
            statistic="average",
            value="",
            n="0",
            dispersion_kind="SD",
            dispersion_value="",
        ),
        base=BASE,
    )
    assert result.proposal is None
    assert set(result.errors) == {"outcome", "statistic", "value", "n", "dispersion_value"}


@pytest.mark.parametrize(
    ("kind", "value", "field"),
    [
        ("", "1.3", "dispersion_kind"),  # a value with no kind
        ("SE", "1.3", "dispersion_kind"),  # not on the fixed list
        ("IQR", "4", "dispersion_value"),  # an IQR is a pair
        ("SD", "-1", "dispersion_value"),  # a spread cannot be negative
    ],
)
def test_spread_kind_and_value_must_fit(kind: str, value: str, field: str) -> None:
    result = fields_to_proposal(form(dispersion_kind=kind, dispersion_value=value), base=BASE)
    assert field in result.errors


def test_empty_optional_fields_store_none_and_keep_provenance() -> None:
    result = fields_to_proposal(form(group="", time_point="", dispersion_kind="",
                                     dispersion_value="", n=""), base=BASE)  # fmt: skip
    p = result.proposal
    assert p is not None
    assert (p.group, p.time_point, p.dispersion, p.n, p.sd) == (None, None, None, None, None)
    assert (p.id, p.source, p.extractor, p.confidence) == (
        BASE.id,
        BASE.source,
        BASE.extractor,
        BASE.confidence,
    )
