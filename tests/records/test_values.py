"""Value phrases in cells and sentences; labels, group headers and statements."""

from __future__ import annotations

import pytest

from extract.records.patterns import (
    find_dispersion_statement,
    find_group_n,
    group_and_n,
    split_label,
    to_number,
)
from extract.records.values import find_value_phrases, parse_cell


@pytest.mark.parametrize(
    ("text", "value", "spread", "bounds", "kind", "unit"),
    [
        ("24.1 ± 1.3", 24.1, 1.3, None, None, None),
        ("24.1 +/- 1.3 g", 24.1, 1.3, None, None, "g"),
        ("24.1 (SD 1.3) g", 24.1, 1.3, None, "SD", "g"),
        ("0.42 (0.05)", 0.42, 0.05, None, None, None),
        ("132 [128–136]", 132.0, None, (128.0, 136.0), None, None),
        ("\u22121.2 (95% CI \u22122.0 to \u22120.4)", -1.2, None, (-2.0, -0.4), "CI95", None),
        ("4 (IQR 3–5)", 4.0, None, (3.0, 5.0), "IQR", None),
        ("14 (range 9–22)", 14.0, None, (9.0, 22.0), "range", None),
        ("1.82 ± 0.31 mm²", 1.82, 0.31, None, None, "mm²"),
        ("24.1 ± 1.3*", 24.1, 1.3, None, None, None),
    ],
)
def test_parse_cell_forms(text, value, spread, bounds, kind, unit) -> None:
    cell = parse_cell(text)
    assert cell is not None
    assert (cell.value, cell.dispersion, cell.bounds, cell.kind, cell.unit) == (
        value,
        spread,
        bounds,
        kind,
        unit,
    )


def test_parse_cell_count_with_percent() -> None:
    cell = parse_cell("42 (37.5%)")
    assert cell is not None and (cell.value, cell.percent) == (42.0, 37.5)


@pytest.mark.parametrize("text", ["<0.001", "P = 0.03", "—", "n.d.", "NA", "Vehicle", ""])
def test_parse_cell_no_data(text: str) -> None:
    assert parse_cell(text) is None


def test_to_number_unicode_minus_and_power_of_ten() -> None:
    assert to_number("\u22122.5") == -2.5
    assert to_number("7.3 × 10^3") == pytest.approx(7300.0)


@pytest.mark.parametrize(
    ("label", "expected"),
    [
        ("Body mass (g)", ("Body mass", "g")),
        ("Creatinine, mg/dL", ("Creatinine", "mg/dL")),
        ("Glucose [mmol/L]", ("Glucose", "mmol/L")),
        ("Vehicle (n = 9)", ("Vehicle (n = 9)", None)),
        ("Mean (SEM)", ("Mean (SEM)", None)),
    ],
)
def test_split_label(label: str, expected: tuple[str, str | None]) -> None:
    assert split_label(label) == expected


def test_group_and_n_from_header() -> None:
    assert group_and_n("TLV 10 mg/kg (n = 8)") == ("TLV 10 mg/kg", 8)
    assert group_and_n("Sham") == ("Sham", None)


@pytest.mark.parametrize(
    ("text", "n"),
    [
        ("Mice were allocated n = 6 per group.", 6),
        ("Eight rats per group were used.", 8),
        ("(n = 10/group)", 10),
        ("n = 8-10 per group", None),
        ("Values are mean ± SEM.", None),
    ],
)
def test_find_group_n(text: str, n: int | None) -> None:
    assert find_group_n(text) == n


@pytest.mark.parametrize(
    ("text", "kind"),
    [
        ("Values are mean ± SEM.", "SEM"),
        ("Data are expressed as mean (SD).", "SD"),
        ("Results are presented as median (IQR).", "IQR"),
        ("Grip strength was measured with a gauge.", None),
    ],
)
def test_find_dispersion_statement(text: str, kind: str | None) -> None:
    assert find_dispersion_statement(text) == kind


def test_sentence_phrases_keep_offsets() -> None:
    text = "Glucose was 8.4 ± 1.1 mmol/L and 7.9 ± 0.9 mmol/L."
    phrases = find_value_phrases(text)
    assert [text[p.start : p.end] for p in phrases] == ["8.4 ± 1.1 mmol/L", "7.9 ± 0.9 mmol/L"]
