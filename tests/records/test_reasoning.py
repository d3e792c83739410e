"""Article-wide reasoning: dose rank, blanket vs group n, pooled and subset n, units and
abbreviations stated elsewhere in the article (small constructed documents, invented content)."""

from __future__ import annotations

from extract.records.assemble import first_pass
from extract.records.link import resolve_dose_rank
from tests.records._build import make_document, make_table


def test_dose_rank_picks_the_extreme_dose_in_the_common_unit() -> None:
    groups = ("ZX 3 mg/kg", "ZX 30 mg/kg", "ZX 10 mg/kg", "30 mg/kg", "ZX 100 μM")
    assert resolve_dose_rank("highest dose", groups) == "ZX 30 mg/kg"
    assert resolve_dose_rank("lowest dose", groups) == "ZX 3 mg/kg"
    assert resolve_dose_rank("highest dose", ()) is None


def test_highest_dose_names_the_group_and_its_n() -> None:
    document = make_document(
        [
            ("abstract", "With the highest dose, body mass was 28.0 ± 0.3 g (mean ± SEM)."),
            (
                "results",
                "Body mass was 24.0 ± 0.5 g in the vehicle group (n = 9) and 26.0 ± 0.4 g in "
                "mice given ZX 3 mg/kg (n = 10) and 28.0 ± 0.3 g in mice given ZX 30 mg/kg "
                "(n = 11).",
            ),
        ]
    )
    first = first_pass(document)[0]
    assert (first.group, first.n) == ("ZX 30 mg/kg", 11)
    assert "group_from_dose_rank" in first.flags


def test_group_n_beats_a_blanket_footnote() -> None:
    table = make_table(
        [["", "Control", "ZX 30 mg/kg/day"], ["Creatinine (µmol/L)", "86 ± 11", "110 ± 12"]],
        footnotes=("Values are mean ± SD; n = 6 per group.",),
    )
    document = make_document(
        [("results", "Minipigs given ZX 30 mg/kg/day (n = 8) had 16.1 ± 1.6 kg of body weight.")],
        tables=(table,),
    )
    by_value = {p.value: p for p in first_pass(document)}
    assert by_value[86.0].n == 6
    assert by_value[110.0].n == 8


def test_legend_per_group_n_applies_when_the_methods_state_none() -> None:
    document = make_document(
        [
            ("results", "Body mass was 24.0 ± 0.5 g in the vehicle group (P = 0.01)."),
            ("legends", "Figure 1. Body mass at week 4. Bars show mean ± SEM; n = 12 per group."),
        ]
    )
    (proposal,) = first_pass(document)
    assert proposal.n == 12 and "n_from_legend" in proposal.flags


def test_legend_n_range_gives_no_n() -> None:
    document = make_document(
        [
            ("results", "Body mass was 24.0 ± 0.5 g in the vehicle group (P = 0.01)."),
            ("legends", "Figure 1. Body mass at week 8 in each group; n = 8–10 per group."),
        ]
    )
    (proposal,) = first_pass(document)
    assert proposal.n is None


def test_pooled_value_takes_the_randomised_total_and_subset_no_n() -> None:
    document = make_document(
        [
            (
                "results",
                "Of 350 people screened, 301 were randomised: 97 to placebo, 102 to ZX 20 mg and "
                "102 to ZX 40 mg. Adherence was a median of 92% (range 80–95) across the three "
                "arms. Among responders given ZX 40 mg, the time to response was median 5 weeks "
                "(IQR 4–6).",
            )
        ]
    )
    adherence, time_to_response = first_pass(document)
    assert (adherence.group, adherence.n) == (None, 301)
    assert time_to_response.group == "ZX 40 mg" and time_to_response.n is None


def test_table_value_takes_the_unit_the_text_gives_its_outcome() -> None:
    table = make_table([["Arm", "Change in ABC score, mean (SD)"], ["Placebo", "-1.2 (3.1)"]])
    document = make_document(
        [("results", "At week 12 the ABC score changed by −4.1 points (SD 2.0) with placebo.")],
        tables=(table,),
    )
    cell = next(p for p in first_pass(document) if p.source.kind == "table")
    assert cell.unit == "points" and "unit_from_text" in cell.flags


def test_outcome_abbreviation_is_written_out() -> None:
    table = make_table([["", "Control"], ["ALT (U/L)", "42 ± 8"]])
    document = make_document(
        [("methods", "Serum alanine aminotransferase (ALT) was measured at day 28.")],
        tables=(table,),
    )
    (proposal,) = first_pass(document)
    assert proposal.outcome == "alanine aminotransferase"


def test_table_acronym_from_the_sentence_describing_the_table() -> None:
    table = make_table([["", "Control"], ["ALT (U/L)", "42 ± 8"]])
    document = make_document(
        [("results", "Table 1 summarises haemoglobin, alanine aminotransferase and bilirubin.")],
        tables=(table,),
    )
    (proposal,) = first_pass(document)
    assert proposal.outcome == "alanine aminotransferase"
