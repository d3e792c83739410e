"""Quantities in sentences and table cells: values, units, spreads, statistics and roles.

The phrasings are the ones biomedical articles print (common practice in reporting: ICMJE-style
"mean ± SD", "median (IQR)", "n (%)"); expected values are the printed digits.
"""

from __future__ import annotations

import pytest

from extract.nlp.quantities import (
    Quantity,
    find_dispersion_statement,
    find_quantities,
    parse_cell,
)


def _only_measure(text: str, **kwargs: object) -> Quantity:
    measures = find_quantities(text, measures_only=True, **kwargs)  # type: ignore[arg-type]
    assert len(measures) == 1, measures
    return measures[0]


# (sentence, value, unit, statistic, spread kind, spread value, reader)
SENTENCE_CASES = [
    ("Body mass was 24.1 ± 1.3 g (SD).", 24.1, "g", "mean", "SD", 1.3, "rules"),
    ("Body mass was 24.1 +/- 1.3 g (mean ± SEM).", 24.1, "g", "mean", "SEM", 1.3, "rules"),
    ("Body mass was 24.1 g (SD 1.3).", 24.1, "g", "mean", "SD", 1.3, "rules"),
    ("Body mass was 24.1 (SEM 1.3) g.", 24.1, "g", "mean", "SEM", 1.3, "rules"),
    (
        "Pressure was 132 [128–136] mm Hg (mean, 95% CI).",
        132,
        "mm Hg",
        "mean",
        "CI95",
        (128, 136),
        "rules",
    ),
    (
        "Pressure was 132 mmHg (95% CI 128 to 136).",
        132,
        "mmHg",
        "mean",
        "CI95",
        (128, 136),
        "rules",
    ),
    ("The score was 4 (IQR 3–5).", 4, None, "median", "IQR", (3, 5), "rules"),
    ("Median stay was 14 days (range 9–22).", 14, "days", "median", "range", (9, 22), "rules"),
    ("The change was −0.8 ± 0.2 mmol/L (SD).", -0.8, "mmol/L", "mean", "SD", 0.2, "rules"),
    ("Glucose was 5·6 ± 0·4 mmol/L (SD).", 5.6, "mmol/L", "mean", "SD", 0.4, "rules"),
    (
        "Glucose was 5.6\u2009±\u20090.4\u00a0mmol/L (SD).",
        5.6,
        "mmol/L",
        "mean",
        "SD",
        0.4,
        "rules",
    ),
    ("Counts were 7.3 × 10³/µL.", 7.3, "× 10³/µL", "single", None, None, "rules"),
    ("Counts were 7.3 x10^3/uL.", 7.3, "x10^3/uL", "single", None, None, "rules"),
    ("Uptake reached 150μM.", 150, "μM", "single", None, None, "rules"),
    ("Uptake reached 150 µM.", 150, "µM", "single", None, None, "rules"),
    ("Heart rate was 412 ± 18 bpm (SD).", 412, "bpm", "mean", "SD", 18, "rules"),
    ("Activity was 35 U/L and stable.", 35, "U/L", "single", None, None, "rules"),
    ("Grip strength was 98.2 ± 4.5 gf (SD).", 98.2, "gf", "mean", "SD", 4.5, "rules"),
    ("Responders: 42 (37.5%).", 42, None, "count", None, None, "rules"),
    ("Coverage was 37.5%.", 37.5, "%", "percent", None, None, "rules"),
    (
        "Mean arterial pressure rose to 128–136 mmHg.",
        128,
        "mmHg",
        "other",
        "range",
        (128, 136),
        "rules",
    ),
    ("Body mass was twenty-four grams.", 24, "grams", "single", None, None, "quantulum3"),
]


@pytest.mark.parametrize(
    ("text", "value", "unit", "statistic", "kind", "spread", "reader"), SENTENCE_CASES
)
def test_sentence_quantity(
    text: str,
    value: float,
    unit: str | None,
    statistic: str,
    kind: str | None,
    spread: object,
    reader: str,
) -> None:
    quantity = _only_measure(text)
    assert quantity.value == pytest.approx(value)
    assert quantity.unit == unit
    assert quantity.statistic == statistic
    assert quantity.reader == reader
    if kind is None:
        assert quantity.spread is None
    else:
        assert quantity.spread is not None
        assert quantity.spread.kind == kind
        assert quantity.spread.value == pytest.approx(spread)
    assert text[quantity.start : quantity.end] == quantity.text


def test_count_with_percent_keeps_both() -> None:
    quantity = _only_measure("Of these, 42 (37.5%) responded.")
    assert (quantity.value, quantity.percent, quantity.statistic) == (42, 37.5, "count")


def test_count_with_total() -> None:
    quantity = _only_measure("Events occurred in 42/112 (37.5%).")
    assert (quantity.value, quantity.total, quantity.percent) == (42, 112, 37.5)


# Sentences whose only numbers are not data points: (sentence, role of each number in order).
NOISE_CASES = [
    ("Mice received 10 mg/kg Zelavir i.p. daily.", ["dose"]),
    ("Rats were given 3 mg by oral gavage.", ["dose"]),
    ("Male 8-week-old mice were used.", ["age"]),
    ("Participants aged 45 years were enrolled.", ["age"]),
    ("The difference was significant (p < 0.05).", ["p_value"]),
    ("The difference was significant (P = 0.003).", ["p_value"]),
    ("Samples were collected in 2019.", ["year"]),
    ("As shown in Fig. 2 and Table 3, see also ref. 12.", ["reference", "reference", "reference"]),
    ("This agrees with earlier work [12].", ["reference"]),
    ("Samples were centrifuged at 3000 rpm for 10 min at 4 °C.", ["setting", "setting", "setting"]),
    ("Absorbance was read at 450 nm.", ["setting"]),
    ("Samples were taken at week 8 and after 24 h.", ["time", "time"]),
    ("Mice (n = 8) were studied.", ["sample_size"]),
    ("Participants were randomly assigned 1:1 to placebo.", ["ratio", "ratio"]),
]


@pytest.mark.parametrize(("text", "roles"), NOISE_CASES)
def test_noise_roles(text: str, roles: list[str]) -> None:
    found = find_quantities(text)
    assert [q.role for q in found] == roles
    assert find_quantities(text, measures_only=True) == []


def test_measure_next_to_noise() -> None:
    text = "Serum creatinine was 0.42 ± 0.05 mg/dL in mice given 10 mg/kg (p < 0.01; Fig. 1)."
    roles = [(q.text, q.role) for q in find_quantities(text)]
    assert roles == [
        ("0.42 ± 0.05 mg/dL", "measure"),
        ("10 mg/kg", "dose"),
        ("0.01", "p_value"),
        ("1", "reference"),
    ]


@pytest.mark.parametrize(
    ("statement", "kind"),
    [
        ("Values are mean ± SEM.", "SEM"),
        ("Data are presented as mean (SD).", "SD"),
        ("Data are expressed as mean ± standard deviation.", "SD"),
        ("Results are given as mean ± standard error of the mean.", "SEM"),
        ("Bars show mean ± S.E.M.; n = 6 per group.", "SEM"),
        ("Values are median (IQR).", "IQR"),
        ("Values are median (interquartile range).", "IQR"),
        ("Change in score, mean [95% CI]", "CI95"),
        ("Body mass (g), mean +/- SD", "SD"),
        ("Mice were housed four per cage.", None),
    ],
)
def test_find_dispersion_statement(statement: str, kind: str | None) -> None:
    assert find_dispersion_statement(statement) == kind


def test_dispersion_kind_from_context_when_text_is_silent() -> None:
    text = "Body mass was 24.1 ± 1.3 g."
    silent = _only_measure(text)
    assert silent.spread is not None and silent.spread.kind is None
    assert "dispersion_kind_unknown" in silent.flags
    told = _only_measure(text, dispersion="SEM")
    assert told.spread is not None
    assert (told.spread.kind, told.spread.kind_from) == ("SEM", "context")


def test_own_text_wins_over_context() -> None:
    quantity = _only_measure("Body mass was 24.1 g (SD 1.3).", dispersion="SEM")
    assert quantity.spread is not None and quantity.spread.kind == "SD"


# (cell, header, value, unit, statistic, kind, spread, percent)
CELL_CASES = [
    ("24.1 ± 1.3", "Body mass (g), mean ± SD", 24.1, "g", "mean", "SD", 1.3, None),
    ("0.42 (0.05)", "Creatinine (mg/dL), mean (SEM)", 0.42, "mg/dL", "mean", "SEM", 0.05, None),
    (
        "128 [120–136]",
        "Systolic pressure (mmHg), mean [95% CI]",
        128,
        "mmHg",
        "mean",
        "CI95",
        (120, 136),
        None,
    ),
    ("42 (37.5%)", "Responders, n (%)", 42, None, "count", None, None, 37.5),
    ("3 (2–5)", "Lesion score, median (IQR)", 3, None, "median", "IQR", (2, 5), None),
    ("−0.8 ± 0.2", "Change, mean ± SD", -0.8, None, "mean", "SD", 0.2, None),
    (
        "−0.8 [−1.2 to −0.4]",
        "Change, mean [95% CI]",
        -0.8,
        None,
        "mean",
        "CI95",
        (-1.2, -0.4),
        None,
    ),
    ("7.3", "WBC (×10³/µL)", 7.3, "×10³/µL", "single", None, None, None),
    ("24.1 ± 1.3 g", None, 24.1, "g", "mean", None, 1.3, None),
]


@pytest.mark.parametrize(
    ("cell", "header", "value", "unit", "statistic", "kind", "spread", "percent"), CELL_CASES
)
def test_parse_cell(
    cell: str,
    header: str | None,
    value: float,
    unit: str | None,
    statistic: str,
    kind: str | None,
    spread: object,
    percent: float | None,
) -> None:
    quantity = parse_cell(cell, header=header)
    assert quantity is not None
    assert quantity.value == pytest.approx(value)
    assert quantity.unit == unit
    assert quantity.statistic == statistic
    assert quantity.percent == percent
    if spread is None:
        assert quantity.spread is None
    else:
        assert quantity.spread is not None
        assert quantity.spread.kind == kind
        assert quantity.spread.value == pytest.approx(spread)


@pytest.mark.parametrize("cell", ["n.d.", "—", "–", "", "NA", "Vehicle", "n/a"])
def test_parse_cell_empty(cell: str) -> None:
    assert parse_cell(cell) is None


def test_parse_cell_header_unit_is_flagged() -> None:
    quantity = parse_cell("7.3", header="Body mass (g)")
    assert quantity is not None
    assert "unit_from_header" in quantity.flags
    assert quantity.normalized.canonical_unit == "g"


def test_parse_cell_dispersion_from_footnote() -> None:
    quantity = parse_cell("24.1 (1.3)", dispersion="SEM")
    assert quantity is not None and quantity.spread is not None
    assert (quantity.spread.kind, quantity.spread.kind_from) == ("SEM", "context")


def test_quantity_normalized_uses_units() -> None:
    quantity = _only_measure("Creatinine was 0.42 ± 0.05 mg/dL (SD).")
    normalized = quantity.normalized
    assert normalized.ucum == "mg/dL"
    # 1 mg/dL = 0.01 g/L (SI prefixes, NIST SP 811 Table 5)
    assert normalized.value == pytest.approx(0.0042)


def test_no_number_no_work() -> None:
    assert find_quantities("Mice were housed in standard cages.") == []


@pytest.mark.parametrize(
    ("cell", "unit", "unknown"),
    [
        # A unit the registry lacks is kept as written (UCUM has no "RFU"), flagged.
        ("1213 ± 214 RFU", "RFU", True),
        ("24.1 ± 1.3 g", "g", False),
        ("1213 ± 214", None, False),
    ],
)
def test_cell_keeps_an_unknown_unit(cell: str, unit: str | None, unknown: bool) -> None:
    quantity = parse_cell(cell)
    assert quantity is not None and quantity.unit == unit
    assert ("unknown_unit" in quantity.flags) is unknown


def test_cell_statistic_label_is_no_unit() -> None:
    quantity = parse_cell("5 SD")
    assert quantity is not None and quantity.unit is None


def test_year_followed_by_a_reference_number_is_a_year() -> None:
    # "in 2007 (9)": the bracket holds a reference number (numbered citation style, ICMJE
    # sample references), not a spread; a value with a unit keeps its spread.
    found = find_quantities("Cases fell from 1,540 with onset in 2007 (9) to 1,320.")
    assert [q.role for q in found if q.value == 2007] == ["year"]
    kept = find_quantities("Tail length was 2007 (9) µm in the vehicle group.")
    assert kept[0].role == "measure" and kept[0].spread is not None


def test_labelled_sd_with_n_in_the_same_bracket() -> None:
    # "mean (SD = x; n = y)" is common practice in reporting (APA style, 7th ed., 6.44).
    (value, *_) = find_quantities("Zelmar content was 274.1 ppm (SD = 219.7; n = 10).")
    assert (value.value, value.unit) == (274.1, "ppm")
    assert value.spread is not None and (value.spread.kind, value.spread.value) == ("SD", 219.7)


# Ratios written with a slash are no counts of a total (common practice: "a/b" reports a count
# of a total only when the part is at most the whole; mixture and sex ratios are ratios).
@pytest.mark.parametrize(
    "text",
    [
        "Flasks held blends of Quorvan and Peltide (mixture ratios of 95/5, 80/20, 20/80 and 5/95).",
        "Hard trials used blends of 60/40, 50/50 and 40/60 in random order.",
        "Grafts were mostly early (EGR/LGR, 6/1) in the Brindle cohort.",
        "Pellets [Quorvan/Peltide = 70/30] were offered daily.",
    ],
)
def test_slash_pairs_that_are_ratios_are_not_counts(text: str) -> None:
    slashed = [q for q in find_quantities(text) if q.total is not None]
    assert slashed
    assert {q.role for q in slashed} == {"ratio"}


def test_count_of_a_total_stays_a_measure() -> None:
    text = "Of the recorded cells, 46/108 fired early and 3/108 fired late."
    slashed = [q for q in find_quantities(text) if q.total is not None]
    assert [(q.value, q.total, q.role) for q in slashed] == [
        (46, 108, "measure"),
        (3, 108, "measure"),
    ]


def test_number_word_windows_cover_each_quantity_and_merge() -> None:
    from extract.nlp.quantities import _number_word_windows

    text = "Each cage held twelve mice; forty-five rats and ten hamsters were weighed at week 8."
    windows = _number_word_windows(text)
    # every number word lies in a window that starts at it or earlier, and windows never overlap
    for word in ("twelve", "forty", "five", "ten"):
        at = text.index(word)
        assert any(start <= at < end for start, end in windows)
    assert all(a[1] < b[0] for a, b in zip(windows, windows[1:], strict=False))
    assert windows[0][0] == text.index("twelve")
    assert _number_word_windows("Body mass was 24.1 ± 1.3 g.") == []


@pytest.mark.parametrize(
    ("text", "value"),
    [("Twelve mice per group were used.", 12.0), ("They drank forty millilitres daily.", 40.0)],
)
def test_number_words_read_in_their_window(text: str, value: float) -> None:
    values = [q.value for q in find_quantities(text)]
    assert value in values
