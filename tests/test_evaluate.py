"""Scoring against gold: matching, precision/recall/F1 arithmetic, per-field accuracy.

The definitions checked here are the usual ones (common practice; e.g. Manning, Raghavan and
Schütze, "Introduction to Information Retrieval", 2008, section 8.3, from memory; scikit-learn's
``precision_recall_fscore_support`` uses the same with ``zero_division=0``):
P = TP / (TP + FP), R = TP / (TP + FN), F1 = 2PR / (P + R). Expected figures are worked by hand
in the comments.
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any

import pytest

from extract.errors import ImportFileError
from extract.evaluate import (
    GoldArticle,
    GoldPoint,
    PRFScore,
    Scores,
    evaluate,
    load_gold,
    load_proposals_jsonl,
    match,
    normalize_unit,
    score_article,
    texts_agree,
)
from extract.records.proposal import Dispersion, Proposal, Source


def gold_point(
    id: str,
    value: float,
    *,
    where: str = "text",
    page: int | None = 2,
    table: str | None = None,
    row: int | None = None,
    col: int | None = None,
    unit: str | None = "g",
    dispersion: Dispersion | None = None,
    n: int | None = None,
    group: str | None = None,
    outcome: str = "body mass",
    statistic: str = "mean",
    time_point: str | None = None,
) -> GoldPoint:
    return GoldPoint(
        id=id,
        where=where,
        page=page,
        section="results",
        table=table,
        row=row,
        col=col,
        outcome=outcome,
        group=group,
        statistic=statistic,
        value=value,
        unit=unit,
        dispersion=dispersion,
        n=n,
        time_point=time_point,
    )


def proposal(
    value: float,
    *,
    kind: str = "text",
    page: int | None = 2,
    table: str | None = None,
    row: int | None = None,
    col: int | None = None,
    unit: str | None = "g",
    dispersion: Dispersion | None = None,
    n: int | None = None,
    group: str | None = None,
    outcome: str = "body mass",
    statistic: str = "mean",
    time_point: str | None = None,
    article: str = "10.5555/winnow.test1",
) -> Proposal:
    return Proposal(
        id=f"p{value}-{page}-{row}-{col}-{group}",
        article=article,
        file="test1.pdf",
        outcome=outcome,
        group=group,
        statistic=statistic,
        value=value,
        unit=unit,
        unit_ucum=None,
        value_normalized=None,
        unit_normalized=None,
        dispersion=dispersion,
        sd=None,
        n=n,
        time_point=time_point,
        method=None,
        subject=None,
        intervention=None,
        source=Source(kind, page, None, "results", table, row, col, "quote"),
        extractor="test.rules@1",
        confidence=0.9,
    )


def article(*points: GoldPoint, scenario: str = "renal", columns: int = 1) -> GoldArticle:
    return GoldArticle(
        name="test1",
        doi="10.5555/winnow.test1",
        scenario=scenario,
        columns=columns,
        table_styles={"table 1": "ruled"},
        points=tuple(points),
    )


# ---------------------------------------------------------------- arithmetic


def test_prf_definitions_worked_by_hand() -> None:
    # TP=3, FP=1, FN=2: P = 3/4 = 0.75, R = 3/5 = 0.6, F1 = 2*0.75*0.6/1.35 = 0.6667
    score = PRFScore(tp=3, fp=1, fn=2)
    assert score.precision == pytest.approx(0.75)
    assert score.recall == pytest.approx(0.6)
    assert score.fscore == pytest.approx(2 / 3)


def test_prf_zero_denominators_give_zero() -> None:
    # scikit-learn's zero_division=0 convention: nothing proposed and nothing found -> 0.0
    assert PRFScore(tp=0, fp=0, fn=4).precision == 0.0
    assert PRFScore(tp=0, fp=2, fn=0).recall == 0.0
    assert PRFScore().fscore == 0.0


def test_prf_merge_adds_counts_not_ratios() -> None:
    # micro-averaging (common practice): counts add, ratios are recomputed.
    # (2,1,0) + (1,0,2) = (3,1,2) -> F1 = 2/3 (not the mean of 0.8 and 0.5)
    merged = PRFScore(2, 1, 0) + PRFScore(1, 0, 2)
    assert (merged.tp, merged.fp, merged.fn) == (3, 1, 2)
    assert merged.fscore == pytest.approx(2 / 3)
    running = PRFScore()
    running += PRFScore(2, 1, 0)
    running += PRFScore(1, 0, 2)
    assert running == merged


# ---------------------------------------------------------------- matching


def test_match_counts_duplicates_and_wrong_pages_as_false_positives() -> None:
    gold = article(gold_point("a", 24.1), gold_point("b", 3.2))
    proposals = [
        proposal(24.1),  # matches a
        proposal(24.1, group="again"),  # duplicate of a: FP (one-to-one)
        proposal(3.2, page=3),  # right value, wrong page: FP, and b stays FN
        proposal(5.0),  # no such value: FP
    ]
    scores = score_article(gold, proposals)
    assert (scores.value.tp, scores.value.fp, scores.value.fn) == (1, 3, 1)
    # P = 1/4, R = 1/2, F1 = 2*(1/4)*(1/2)/(3/4) = 1/3
    assert scores.value.precision == pytest.approx(0.25)
    assert scores.value.recall == pytest.approx(0.5)
    assert scores.value.fscore == pytest.approx(1 / 3)


def test_match_prefers_the_pair_that_agrees_on_more_fields() -> None:
    # Two gold cells share the value 5.0 in Table 1; the one proposal sits in the second cell.
    first = gold_point("a", 5.0, where="table", table="Table 1", row=1, col=1, group="vehicle")
    second = gold_point("b", 5.0, where="table", table="Table 1", row=2, col=1, group="low dose")
    pairs = match([first, second], [proposal(5.0, kind="table", table="Table 1", row=2, col=1)])
    assert [g.id for g, _ in pairs] == ["b"]


def test_match_is_maximal_when_a_greedy_choice_would_block_a_pair() -> None:
    # x (no page, as read from XML) fits a and b; y (page 1) fits only a. Greedy pairs x-a first
    # (x agrees on the group); augmenting moves a to y and frees x for b: two pairs, not one.
    a = gold_point("a", 5.0, page=1, group="vehicle")
    b = gold_point("b", 5.0, page=2)
    x = proposal(5.0, page=None, group="vehicle")
    y = proposal(5.0, page=1)
    pairs = match([a, b], [x, y])
    assert len(pairs) == 2
    assert {(g.id, p.source.page) for g, p in pairs} == {("a", 1), ("b", None)}


def test_table_points_match_by_label_not_page() -> None:
    gold = gold_point("a", 7.5, where="table", page=3, table="Table 2", row=1, col=2)
    # A table split over pages 3-4: the proposal reports page 4 but the same table.
    assert match([gold], [proposal(7.5, kind="table", page=4, table="TABLE 2.", row=1, col=2)])
    assert not match([gold], [proposal(7.5, kind="table", page=3, table="Table 1")])
    assert not match([gold], [proposal(7.5, kind="text", page=3)])


# ---------------------------------------------------------------- complete records and fields


def test_complete_record_needs_unit_dispersion_and_n() -> None:
    sd = Dispersion("SD", 1.3)
    gold = article(
        gold_point("a", 24.1, unit="µmol/L", dispersion=sd, n=9),
        gold_point("b", 30.2, unit="µmol/L", dispersion=sd, n=9),
        gold_point("c", 12.0, unit="µmol/L", dispersion=sd, n=9),
    )
    proposals = [
        proposal(24.1, unit="umol/l", dispersion=Dispersion("SD", 1.3), n=9),  # complete
        proposal(30.2, unit="μmol/L", dispersion=Dispersion("SEM", 1.3), n=9),  # wrong kind
        proposal(12.0, unit="μmol/L", dispersion=Dispersion("SD", 1.3), n=None),  # n missing
    ]
    scores = score_article(gold, proposals)
    assert scores.value.fscore == pytest.approx(1.0)
    # 1 complete out of 3 proposals and 3 gold points: P = R = F1 = 1/3
    assert scores.complete.tp == 1
    assert scores.complete.precision == pytest.approx(1 / 3)
    assert scores.complete.recall == pytest.approx(1 / 3)
    assert scores.fields["unit"].accuracy == pytest.approx(1.0)
    assert scores.fields["dispersion"].accuracy == pytest.approx(2 / 3)
    assert scores.fields["n"].accuracy == pytest.approx(2 / 3)


def test_field_accuracy_counts_only_matched_pairs() -> None:
    gold = article(
        gold_point("a", 1.0, group="Vehicle", time_point="week 8"),
        gold_point("b", 2.0, group="10 mg/kg", time_point="week 8"),
        gold_point("c", 3.0, group="Vehicle"),
    )
    proposals = [
        proposal(1.0, group="vehicle (n = 9)", time_point="Week 8."),  # both right
        proposal(2.0, group="vehicle", time_point=None),  # both wrong
    ]
    scores = score_article(gold, proposals)
    assert scores.fields["group"].to_dict() == {"correct": 1, "total": 2, "accuracy": 0.5}
    assert scores.fields["time_point"].correct == 1
    assert scores.fields["statistic"].correct == 2


@pytest.mark.parametrize(
    ("written", "normal"),
    [
        # µ (U+00B5 MICRO SIGN) folds to μ (U+03BC) under Unicode NFKC (Unicode Standard Annex #15)
        ("µmol/L", "μmol/L"),
        # "u" for micro is the ASCII spelling of UCUM's case-sensitive "umol/L" (UCUM spec, 2.1)
        ("umol/L", "μmol/L"),
        ("mg/dl", "mg/dL"),  # litre as "l" or "L": both allowed by SI brochure 9th ed., table 8
        ("mm Hg", "mmHg"),  # common practice: spacing varies in print
        ("mcg/mL", "μg/mL"),  # "mcg" is the prescription spelling of microgram (common practice)
        ("×10³/μL", "10^3/μL"),
        ("10^3/uL", "10^3/μL"),
        ("mM", "mM"),  # millimolar stays apart from millimetre
        ("mm", "mm"),
    ],
)
def test_normalize_unit_folds_spellings(written: str, normal: str) -> None:
    assert normalize_unit(written) == normal


def test_fuzzy_text_rule() -> None:
    assert texts_agree("Vehicle", "vehicle group (n = 12)")
    assert texts_agree("serum creatinine", "Serum creatinine levels")
    assert not texts_agree("serum creatinine", "serum urea")
    assert not texts_agree("10 mg/kg", "30 mg/kg")
    assert texts_agree(None, "")
    assert not texts_agree("week 8", None)


# ---------------------------------------------------------------- across articles


def test_breakdown_puts_false_positives_under_their_features() -> None:
    gold = article(
        gold_point("a", 1.0),
        gold_point("b", 2.0, where="table", table="Table 1", row=1, col=1),
        scenario="renal",
        columns=2,
    )
    scores = score_article(gold, [proposal(1.0), proposal(9.0, kind="table", table="Table 1")])
    text_v, _ = scores.breakdown["where=text"]
    table_v, _ = scores.breakdown["where=table"]
    assert (text_v.tp, text_v.fp, text_v.fn) == (1, 0, 0)
    assert (table_v.tp, table_v.fp, table_v.fn) == (0, 1, 1)
    assert scores.breakdown["table_style=ruled"][0].fn == 1
    assert scores.breakdown["columns=2"][0] == scores.value
    assert scores.breakdown["scenario=renal"][0] == scores.value


def test_evaluate_sums_articles_and_matches_by_doi_or_stem() -> None:
    one = article(gold_point("a", 1.0), gold_point("b", 2.0))
    other = GoldArticle("test2", None, "hepatic", 1, {}, (gold_point("c", 3.0),))
    proposals: list[Any] = [
        proposal(1.0),  # by DOI
        proposal(3.0, article="test2").to_dict(),  # by stem, given as a contract dict
        proposal(4.0, article="unknown-article"),
    ]
    proposals[2] = proposals[2].with_changes(file="unknown.pdf")
    scores = evaluate([one, other], proposals)
    expected = score_article(one, [proposals[0]]) + score_article(
        other, [Proposal.from_dict(proposals[1])]
    )
    assert scores.value == expected.value == PRFScore(tp=2, fp=0, fn=1)
    assert scores.ignored == 1
    assert isinstance(scores + Scores(), Scores)


def test_load_gold_and_proposals_files(tmp_path: Path) -> None:
    gold_file = tmp_path / "art.gold.json"
    gold_file.write_text(
        json.dumps(
            {
                "article": "art",
                "doi": "10.5555/winnow.art",
                "scenario": "renal",
                "layout": {"columns": 2, "table_styles": ["unruled"]},
                "tables": [{"label": "Table 1", "style": "unruled"}],
                "data_points": [
                    {
                        "id": "dp-001",
                        "page": 2,
                        "where": "table",
                        "table": "Table 1",
                        "row": 1,
                        "col": 1,
                        "outcome": "body mass",
                        "group": "Vehicle",
                        "statistic": "mean",
                        "value": 24.1,
                        "unit": "g",
                        "dispersion": {"kind": "CI95", "value": [22.0, 26.2]},
                        "n": 9,
                        "time_point": None,
                    }
                ],
            }
        ),
        encoding="utf-8",
    )
    gold = load_gold(gold_file)
    assert gold.columns == 2 and gold.table_styles == {"table 1": "unruled"}
    assert gold.points[0].dispersion == Dispersion("CI95", (22.0, 26.2))

    bad = tmp_path / "bad.gold.json"
    bad.write_text("{not json", encoding="utf-8")
    with pytest.raises(ImportFileError, match="bad.gold.json"):
        load_gold(bad)

    lines = tmp_path / "p.jsonl"
    lines.write_text(proposal(1.0).to_json() + "\n\n" + '{"id": 1}\n', encoding="utf-8")
    with pytest.raises(ImportFileError, match=r"p\.jsonl:3"):
        load_proposals_jsonl(lines)
    lines.write_text(proposal(1.0).to_json() + "\n", encoding="utf-8")
    assert load_proposals_jsonl(lines)[0].value == 1.0
