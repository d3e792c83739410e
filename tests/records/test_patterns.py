"""Table cells read through the nlp reader; labels, group headers and per-group statements."""

from __future__ import annotations

import pytest

from extract.records.patterns import find_group_n, group_and_n, read_cell, split_label


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
def test_read_cell_forms(text, value, spread, bounds, kind, unit) -> None:
    # Printed forms of a mean with its spread (common practice in biomedical tables).
    cell = read_cell(text)
    assert cell is not None and cell.spread is not None
    assert (cell.value, cell.spread.value, cell.spread.kind, cell.unit) == (
        value,
        spread if spread is not None else bounds,
        kind,
        unit,
    )


def test_read_cell_count_with_percent() -> None:
    cell = read_cell("42 (37.5%)")
    assert cell is not None and (cell.value, cell.percent) == (42.0, 37.5)


@pytest.mark.parametrize(
    "text", ["<0.001", "P = 0.03", "—", "n.d.", "NA", "Vehicle", "", "45.5 ± 3.2 (n = 8) vs 41"]
)
def test_read_cell_no_data(text: str) -> None:
    # P-value cells, empty marks and cells with more than one value are no data points
    # (proposal record contract, DESIGN.md).
    assert read_cell(text) is None


def test_read_cell_keeps_a_unit_the_registry_lacks() -> None:
    # Relative fluorescence units are a plate-reader convention (common practice), not in pint.
    cell = read_cell("1213 ± 214 RFU")
    assert cell is not None
    assert (cell.value, cell.unit, cell.spread.value if cell.spread else None) == (
        1213.0,
        "RFU",
        214.0,
    )


@pytest.mark.parametrize(
    ("label", "expected"),
    [
        ("Body mass (g)", ("Body mass", "g")),
        ("Creatinine, mg/dL", ("Creatinine", "mg/dL")),
        ("Glucose [mmol/L]", ("Glucose", "mmol/L")),
        ("Vehicle (n = 9)", ("Vehicle (n = 9)", None)),
        ("Mean (SEM)", ("Mean (SEM)", None)),
        ("Severe (20–27)", ("Severe (20–27)", None)),
        ("Burma (Myanmar)", ("Burma (Myanmar)", None)),
        ("Caspase activity (RFU)", ("Caspase activity", "RFU")),
    ],
)
def test_split_label(label: str, expected: tuple[str, str | None]) -> None:
    assert split_label(label) == expected


def test_group_and_n_from_header() -> None:
    assert group_and_n("TLV 10 mg/kg (n = 8)") == ("TLV 10 mg/kg", 8)
    assert group_and_n("Sham") == ("Sham", None)


# A group's n written split by sex (females/males) is the sum of its parts (common practice in
# participant tables: "Group (2F/6M)" reports 8 participants). Labels are invented.
@pytest.mark.parametrize(
    ("label", "expected"),
    [
        ("Low ZQX (2F/6M)", ("Low ZQX", 8)),
        ("High ZQX (5 F/4 M)", ("High ZQX", 9)),
        ("Older adults (M/F 6/2)", ("Older adults", 8)),
        ("Younger adults (n = 8; 2 F)", ("Younger adults", 8)),
        ("Arm B (3 females, 4 males)", ("Arm B", 7)),
        ("Arm C, 2 women/5 men", ("Arm C", 7)),
        # two counts of one sex are no split; a lone count is no n
        ("Arm D (2F/6F)", ("Arm D (2F/6F)", None)),
        ("Dose 2 M", ("Dose 2 M", None)),
    ],
)
def test_group_and_n_sums_a_sex_split(label: str, expected: tuple[str, int | None]) -> None:
    assert group_and_n(label) == expected


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
