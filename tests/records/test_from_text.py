"""Sentences to drafts: which numbers are data points, and what links to them."""

from __future__ import annotations

import pytest

from extract.records.assemble import first_pass
from extract.records.from_text import is_debris
from tests.records._build import make_document

RESULTS = (
    "At week 8, serum creatinine was 0.42 ± 0.06 mg/dL in the vehicle group (n = 9) and "
    "0.31 ± 0.05 mg/dL in the talvorin group (n = 8; P < 0.01; Fig. 2). "
    "Grip strength of quorvalin-treated mice was 98.2 (SD 9.1) gf."
)


@pytest.fixture(scope="module")
def proposals():
    document = make_document(
        [
            ("methods", "Male Tallow-Creek mice aged 8 weeks received talvorin at 10 mg/kg daily."),
            ("methods", "Data are mean ± SEM; n = 7 per group. Analyses used software from 2019."),
            ("results", RESULTS),
        ]
    )
    return first_pass(document)


def test_only_measures_become_proposals(proposals) -> None:
    # Doses (10 mg/kg), ages (8 weeks), sample sizes (n = 9), p-values, years, figure numbers
    # are context, not data points (proposal record contract, DESIGN.md).
    assert [p.value for p in proposals] == [0.42, 0.31, 98.2]


def test_outcome_group_and_n_from_the_sentence(proposals) -> None:
    first, second, third = proposals
    assert (first.outcome, first.group, first.n) == ("serum creatinine", "vehicle", 9)
    assert (second.outcome, second.group, second.n) == ("serum creatinine", "talvorin", 8)
    assert (third.outcome, third.group) == ("grip strength", "quorvalin")


def test_kind_beside_value_beats_methods_statement(proposals) -> None:
    assert proposals[2].dispersion is not None and proposals[2].dispersion.kind == "SD"
    assert proposals[0].dispersion is not None and proposals[0].dispersion.kind == "SEM"
    assert "dispersion_from_methods" in proposals[0].flags


def test_methods_n_is_the_fallback_and_flagged(proposals) -> None:
    third = proposals[2]
    assert third.n == 7 and "n_from_methods" in third.flags
    assert "n_from_methods" not in proposals[0].flags


def test_time_point_and_text_source(proposals) -> None:
    first = proposals[0]
    assert first.time_point == "week 8"
    assert first.source.kind == "text" and first.source.section == "results"
    assert first.source.quote.startswith("At week 8, serum creatinine")
    assert first.source.page == 1 and first.source.bbox is not None


def test_sd_derived_from_methods_sem(proposals) -> None:
    # SD = SEM × √n (Cochrane Handbook 6.5.2.2): 0.06 × √9 = 0.18.
    assert proposals[0].sd == pytest.approx(0.18)


def test_legend_statement_applies_to_its_values() -> None:
    document = make_document(
        [
            (
                "legends",
                "Figure 1. Liver mass was 1.24 ± 0.11 g in vehicle mice. Values are mean ± SD; "
                "n = 5 per group.",
            )
        ]
    )
    (proposal,) = first_pass(document)
    assert proposal.dispersion is not None and proposal.dispersion.kind == "SD"
    assert proposal.n == 5 and "n_from_methods" not in proposal.flags


def test_unknown_kind_is_assumed_and_flagged() -> None:
    document = make_document([("results", "Liver mass was 1.24 (0.11) g in vehicle mice.")])
    (proposal,) = first_pass(document)
    assert proposal.dispersion is not None and proposal.dispersion.kind == "SD"
    assert "dispersion_kind_assumed" in proposal.flags
    assert proposal.confidence < 0.9


def test_sections_without_data_are_skipped() -> None:
    document = make_document(
        [("introduction", "Earlier work reported 12.5 ± 2.0 mg/dL in untreated animals.")]
    )
    assert first_pass(document) == []


def test_count_takes_its_denominator_as_n_and_the_treatment_as_group() -> None:
    # "k (p%) of N" reports a count out of N participants (common practice in trial reports).
    document = make_document(
        [("results", "A response was seen in 31 (31.0%) of 100 participants given QRV 40 mg.")]
    )
    (proposal,) = first_pass(document)
    assert (proposal.value, proposal.statistic, proposal.n) == (31.0, "count", 100)
    assert proposal.group == "QRV 40 mg"


def test_group_named_by_its_treatment_after_the_value() -> None:
    document = make_document(
        [
            (
                "results",
                "Body mass was 314.6 ± 7.0 g in the vehicle group and 393.6 ± 7.0 g in rats "
                "given TLV 20 mg/kg (mean ± SEM).",
            )
        ]
    )
    first, second = first_pass(document)
    assert (first.group, second.group) == ("vehicle", "TLV 20 mg/kg")


def test_group_n_stated_before_the_value_in_its_clause() -> None:
    document = make_document(
        [
            (
                "results",
                "At day 28, control minipigs (n = 6) had a body weight of 12.4 ± 1.2 kg, whereas "
                "minipigs given FTZ 40 mg/kg/day (n = 8) weighed 16.1 ± 1.3 kg.",
            )
        ]
    )
    first, second = first_pass(document)
    assert (first.n, second.n) == (6, 8)
    assert (first.group, second.group) == ("control", "FTZ 40 mg/kg/day")


def test_time_point_carries_to_later_sentences_of_the_paragraph() -> None:
    document = make_document(
        [
            (
                "results",
                "At week 6, body mass was 314.6 ± 7.0 g in the vehicle group. "
                "White cell counts were 7.3 ± 0.3 ×10³/µL in the vehicle group.",
            )
        ]
    )
    assert [p.time_point for p in first_pass(document)] == ["week 6", "week 6"]


def test_bare_value_needs_a_named_outcome() -> None:
    document = make_document(
        [("results", "Liver mass was 1.24 g. Cells were exposed to 50 µM talvorin.")]
    )
    assert [(p.outcome, p.value) for p in first_pass(document)] == [("liver mass", 1.24)]


@pytest.mark.parametrize(
    ("text", "debris"),
    [
        ("18.8 (1.8) nmol/mg 19.5 (2.6) nmol/mg", True),
        ("1211 (196) RFU", True),
        ("Hour 30 42.0 ± 3.7", True),
        ("Liver mass was 1.24 g.", False),
        ("Values are mean ± SEM.", False),
    ],
)
def test_table_cells_in_the_text_flow_are_debris(text: str, debris: bool) -> None:
    assert is_debris(text) is debris
