"""Real-table shapes on small invented tables: the statistic of bare and count cells, statistic
rows under section rows, footnote markers and totals in headers, and units that are no units.

The conventions checked here ("n (%)", "Mean (SD)", "Median (min, max)" rows under a variable,
"No." headers for counts, footnote marks †‡§¶) are common practice in biomedical tables (e.g.
the CONSORT 2010 baseline table example, BMJ 2010;340:c869, Table 1 layout).
"""

from __future__ import annotations

import pytest

from extract.records.assemble import first_pass
from extract.records.patterns import clean_label, group_and_n, is_plausible_unit, split_label
from extract.records.table_labels import caption_outcome, is_spread_row, stat_row
from tests.records._build import make_document, make_table


def _by_cell(proposals):  # type: ignore[no-untyped-def]
    return {(p.source.row, p.source.col): p for p in proposals}


def test_bare_counts_under_a_count_caption_are_counts_not_means() -> None:
    grid = [
        ["Province", "Zelmar strain", "Quorv strain", "Total"],
        ["Northmarch", "12", "0", "12"],
        ["Eastvale", "3", "86", "89"],
    ]
    table = make_table(grid, caption="Table 2. Number of reported Brindle fever cases, by strain")
    # The methods declare means: that must not make a bare count a mean.
    document = make_document(
        [("methods", "Values are mean ± SD.")], tables=(table,), name="fixture-counts"
    )
    cells = _by_cell(first_pass(document))
    assert {p.statistic for p in cells.values()} == {"count"}
    eastvale = cells[(2, 2)]
    assert eastvale.value == 86
    assert eastvale.outcome == "Number of reported Brindle fever cases"
    assert eastvale.group == "Quorv strain, Eastvale"
    assert eastvale.unit is None


def test_bare_value_without_any_cue_is_single() -> None:
    grid = [["", "Site A", "Site B"], ["Velocity index", "3.7", "4.1"]]
    document = make_document(
        [("methods", "Data are presented as mean ± SEM.")], tables=(make_table(grid),)
    )
    proposals = first_pass(document)
    assert [p.statistic for p in proposals] == ["single", "single"]
    assert all(p.dispersion is None for p in proposals)


@pytest.mark.parametrize(("level", "statistic"), [("Percent", "percent"), ("Median", "median")])
def test_header_level_names_the_statistic(level: str, statistic: str) -> None:
    grid = [
        ["Drug use", "Arm A", "Arm A"],
        ["", level, "Mean"],
        ["Week 0", "41", "2.5"],
        ["Week 12", "37", "2.1"],
    ]
    proposals = first_pass(make_document(tables=(make_table(grid, header_rows=2),)))
    cells = _by_cell(proposals)
    assert cells[(2, 1)].statistic == statistic
    assert cells[(2, 2)].statistic == "mean"
    # The statistic level is not part of the group's name; the row is the time point.
    assert cells[(2, 1)].group == "Arm A" and cells[(3, 1)].time_point == "Week 12"


@pytest.mark.parametrize("level", ["n", "No.", "Number"])
def test_n_level_beside_a_mean_is_its_sample_size(level: str) -> None:
    # An n column beside a mean under one group header is the mean's n (CONSORT 2010 item 17a:
    # the number analysed goes with each group's estimate), not a count of its own.
    grid = [
        ["Drug use", "Arm A", "Arm A"],
        ["", level, "Mean"],
        ["Week 0", "41", "2.5"],
        ["Week 12", "37", "2.1"],
    ]
    proposals = first_pass(make_document(tables=(make_table(grid, header_rows=2),)))
    cells = _by_cell(proposals)
    assert set(cells) == {(2, 2), (3, 2)}
    assert (cells[(2, 2)].statistic, cells[(2, 2)].n, cells[(3, 2)].n) == ("mean", 41, 37)
    assert cells[(2, 2)].group == "Arm A" and cells[(3, 2)].time_point == "Week 12"


def test_statistic_rows_take_the_section_as_outcome() -> None:
    grid = [
        ["Characteristic", "Arm A", "Arm B"],
        ["Age (years)", "", ""],
        ["Mean (SD)", "43.4 (13.2)", "43.5 (13.3)"],
        ["Median (min, max)", "43 (18–86)", "42 (18–89)"],
        ["Inter-quartile range", "34–52", "32–54"],
        ["Sex", "", ""],
        ["Female", "214 (70.9%)", "107 (70.9%)"],
    ]
    proposals = first_pass(make_document(tables=(make_table(grid),)))
    cells = _by_cell(proposals)
    mean, median = cells[(2, 1)], cells[(3, 2)]
    assert (mean.outcome, mean.statistic, mean.dispersion.kind) == ("Age", "mean", "SD")  # type: ignore[union-attr]
    assert mean.unit == "years"
    assert (median.outcome, median.statistic) == ("Age", "median")
    assert median.dispersion is not None and median.dispersion.kind == "range"
    assert median.dispersion.value == (18.0, 89.0) and median.unit == "years"
    # A spread-only row is no data point of its own.
    assert not any(p.source.row == 4 for p in proposals)
    female = cells[(6, 1)]
    assert (female.statistic, female.outcome, female.value) == ("count", "Sex: Female", 214.0)


def test_iqr_row_attaches_to_the_median_above() -> None:
    grid = [
        ["", "Arm A"],
        ["Pain score", ""],
        ["Median", "4"],
        ["IQR", "3–6"],
    ]
    proposals = first_pass(make_document(tables=(make_table(grid),)))
    assert len(proposals) == 1
    only = proposals[0]
    assert (only.outcome, only.statistic, only.value) == ("Pain score", "median", 4.0)
    assert only.dispersion is not None and only.dispersion.kind == "IQR"
    assert only.dispersion.value == (3.0, 6.0)


def test_totals_row_read_as_header_is_body_and_markers_leave_groups() -> None:
    grid = [
        ["Region", "Zelmar strain†", "Quorv strain‡", "Mixed§"],
        ["All regions", "464", "15", "4"],
        ["Northmarch", "7", "0", "1"],
    ]
    table = make_table(grid, header_rows=2, caption="Table 3. Number of isolates, by region")
    cells = _by_cell(first_pass(make_document(tables=(table,))))
    assert cells[(1, 2)].value == 15 and cells[(1, 2)].group == "Quorv strain, All regions"
    assert cells[(2, 3)].group == "Mixed, Northmarch"


def test_whole_number_header_level_is_n_not_group() -> None:
    grid = [
        ["", "Placebo", "Tarvex 5 mg"],
        ["", "(n = 1 204)", "15"],
        ["Heart rate (bpm)", "72.1 ± 8.0", "70.4 ± 7.7"],
    ]
    proposals = first_pass(make_document(tables=(make_table(grid, header_rows=2),)))
    assert [(p.group, p.n) for p in proposals] == [("Placebo", 1204), ("Tarvex 5 mg", 15)]


def test_ratio_columns_and_model_rows() -> None:
    grid = [
        ["", "HR (95% CI)", "HR (95% CI)"],
        ["Outcome", "Exposed vs. unexposed", "P value"],
        ["Stroke", "", ""],
        ["Model 1", "0.84 (0.74 to 0.95)", "0.005"],
    ]
    table = make_table(grid, header_rows=2, column_units=(None, "95% CI", "95% CI"))
    proposals = first_pass(make_document(tables=(table,)))
    assert len(proposals) == 1  # the P value column is left out
    ratio = proposals[0]
    assert (ratio.statistic, ratio.unit, ratio.outcome) == ("other", None, "Stroke")
    assert ratio.group == "Exposed vs. unexposed, Model 1"


@pytest.mark.parametrize(
    ("label", "clean"),
    [
        ("Status not recorded†", "Status not recorded"),
        ("Total²", "Total"),
        ("<5‡", "<5"),
        ("Placeboᵃ", "Placebo"),
        ("Dose (mg/kg)a", "Dose (mg/kg)"),
        ("Count (×10³/µL)", "Count (×10³/µL)"),  # an exponent is no marker
        ("BMI (kg/m²)", "BMI (kg/m²)"),
    ],
)
def test_clean_label(label: str, clean: str) -> None:
    assert clean_label(label) == clean


@pytest.mark.parametrize(
    ("label", "unit"),
    [
        ("Eastvale, unspecified", None),
        ("Korvia (North)", None),
        ("Median (min, max)", None),
        ("HR (95% CI)", None),
        ("Region, other", None),
        ("Fennelin (zorbs)", "zorbs"),
        ("Glow (RFU)", "RFU"),
        ("Age, years", "years"),
        ("Creatinine, mg/dL", "mg/dL"),
    ],
)
def test_no_bogus_units_from_labels(label: str, unit: str | None) -> None:
    assert split_label(label)[1] == unit


def test_plausible_unit_words() -> None:
    assert not is_plausible_unit("unknown") and not is_plausible_unit("Other")
    assert is_plausible_unit("mmol/L") and is_plausible_unit("OD450")


def test_group_n_with_thousands_separators() -> None:
    assert group_and_n("Exposed (n=16 241)") == ("Exposed", 16241)
    assert group_and_n("Mixed‡ (n = 4)") == ("Mixed", 4)


def test_label_readers() -> None:
    assert stat_row("Mean (SD)") == ("mean", "SD")
    assert stat_row("Median [IQR]") == ("median", "IQR")
    assert stat_row("Body mass") is None
    assert is_spread_row("Inter-quartile range") and not is_spread_row("Range of motion")
    assert caption_outcome("Table 1. Number of cases* among travellers, 2001") == "Number of cases"


def test_row_naming_a_statistic_gives_it_to_bare_values() -> None:
    grid = [["", "Low (X2)", "High (X4)"], ["Responders", "3", "5"], ["Percentage", "6.7", "11.1"]]
    cells = _by_cell(first_pass(make_document(tables=(make_table(grid),))))
    assert cells[(2, 1)].statistic == "percent"
