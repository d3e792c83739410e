"""The outcome of a count in text is what it counted: the noun phrase and predicate after it.

Reporting "n (%) of the group did X" with the counted event after the count is common practice
in results sections (CONSORT 2010 explanation, item 17a: outcomes reported as numbers with
percentages of participants); a list that drops the repeated verb ("..., 12 (8%) in Zone B")
is ordinary English gapping.
"""

from __future__ import annotations

from extract.nlp.count_outcome import count_outcomes
from extract.nlp.pipeline import analyze


def _count_outcomes(text: str) -> list[tuple[float, str | None]]:
    found = []
    for sentence in analyze(text):
        for quantity, outcome in zip(sentence.quantities, sentence.outcomes, strict=True):
            if quantity.is_measure and quantity.statistic == "count":
                found.append((quantity.value, outcome.value if outcome else None))
    return found


def test_outcome_is_the_phrase_after_the_count_with_thousands_comma() -> None:
    text = (
        "Among the 2,318 Brindle fever cases with a known region, 1,204 (51.9%) cases were "
        "acquired in Northmarch, 611 (26.4%) in Eastvale, and 503 (21.7%) in Zelmar."
    )
    assert _count_outcomes(text) == [
        (1204, "cases were acquired in Northmarch"),
        (611, "cases were acquired in Eastvale"),
        (503, "cases were acquired in Zelmar"),
    ]


def test_count_followed_by_a_subject_noun_is_a_count_not_a_sample_size() -> None:
    text = "Of the enrolled volunteers, 41 (12.5%) patients reported a Quorvan rash."
    assert _count_outcomes(text) == [(41, "patients reported a Quorvan rash")]


def test_count_with_slash_total_takes_the_predicate() -> None:
    text = "In the recordings, 88/140 cells fired during the cue (p < 0.01)."
    assert _count_outcomes(text) == [(88, "cells fired during the cue")]


def test_count_followed_by_its_denominator_names_nothing_after_it() -> None:
    text = "Rash occurred in 16 (5.3%) of 302 volunteers."
    start = text.index("16")
    assert count_outcomes(text, [(start, text.index("of 302") - 1)]) == [None]


def test_gapped_count_without_an_earlier_verb_names_nothing() -> None:
    text = "Volunteers were 12 (8%) in Zone B."
    start = text.index("12")
    assert count_outcomes(text, [(start, start + len("12 (8%)"))]) == [None]
