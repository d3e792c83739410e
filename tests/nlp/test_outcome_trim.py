"""Outcomes of long results sentences (invented sentences): the measured noun phrase, without
clause debris.

The outcome of a reported value is the noun phrase it measures, the subject of "was/were" or the
noun before "(value)" (common practice in reading results sentences; a grammatical subject is
the noun phrase before the verb, as any English grammar puts it, from memory).
"""

from __future__ import annotations

import re

from extract.nlp.context import find_outcome
from extract.nlp.count_outcome import count_outcomes
from extract.nlp.outcome_trim import dangling, sentence_subject, trim_outcome, unbalanced


def _outcome_of(sentence: str, value: str) -> str | None:
    start = re.search(re.escape(value), sentence)
    assert start is not None
    found = find_outcome(sentence, start.start())
    return found.value if found else None


def test_trim_drops_preposition_unit_and_verb() -> None:
    phrase = "of trembor clearance (ml/kg/min) increased"
    offset, text = trim_outcome(phrase) or (0, "")
    assert text == "trembor clearance"
    assert phrase[offset : offset + len(text)] == text


def test_trim_rejects_debris_and_pronouns() -> None:
    assert trim_outcome("basal period)") is None
    assert trim_outcome("not different from that") is None
    assert trim_outcome("serum velnate") == (0, "serum velnate")


def test_unbalanced_brackets() -> None:
    assert unbalanced("basal period)")
    assert unbalanced("rate (ml")
    assert not unbalanced("clearance (ml/kg/min)")


def test_subject_of_a_sentence() -> None:
    text = "The rate of velnix infusion (umol/kg/min) to keep levels were 1.9"
    span = sentence_subject(text)
    assert span is not None and text[span[0] : span[1]] == "rate of velnix infusion"
    assert sentence_subject("Of all the eleven twelve thirteen words here, more") is None


def test_outcome_of_a_change_from_a_basal_value() -> None:
    sentence = (
        "During the Quorvan infusion, the rate of trembor clearance (ml/kg/min) increased in "
        "the Control from its basal value of 2.6 ± 0.2 to 13.5 ± 1.1 (P = 0.09)."
    )
    assert _outcome_of(sentence, "2.6") == "rate of trembor clearance"
    assert _outcome_of(sentence, "13.5") == "rate of trembor clearance"


def test_subject_of_were_past_a_parenthetical() -> None:
    sentence = (
        "The rate of velnix infusion (umol/kg/min) to keep the plasma velnix levels at those "
        "measured before the Quorvan infusion (i.e., basal period) were 1.9 ± 0.6 and 2.2 ± 0.4."
    )
    assert _outcome_of(sentence, "1.9") == "rate of velnix infusion"
    assert _outcome_of(sentence, "2.2") == "rate of velnix infusion"


def test_plain_sentences_keep_their_outcome() -> None:
    assert _outcome_of("Serum velnate was 0.42 ± 0.05 mg/dL.", "0.42") == "serum velnate"
    assert _outcome_of("The mice had a body mass of 24.1 g.", "24.1") == "body mass"


# Sentences below are invented (compounds "zerafin", "dolmatin"). The measured noun phrase of a
# change noun is its object ("increase in X": X), a phrase ends before its verb, and an
# abbreviation defined in the sentence is read with its long form: common practice of reading
# results sentences (the long-form pairing follows Schwartz & Hearst, PSB 2003).


def test_change_noun_gives_its_object() -> None:
    sentence = "The increase in plasma zerafin in the treated group was 4.2 ng/mL."
    found = find_outcome(sentence, sentence.index("4.2"))
    assert found is not None and found.value == "plasma zerafin"


def test_change_noun_of_object_stops_at_verb() -> None:
    sentence = "A decrease of serum dolmatin was seen in treated rats (2.1 mg/L)."
    found = find_outcome(sentence, sentence.index("2.1"))
    assert found is not None and found.value == "serum dolmatin"


def test_change_noun_without_object_is_kept() -> None:
    assert trim_outcome("change in body weight") == (0, "change in body weight")


def test_phrase_ends_before_verb_and_number() -> None:
    assert trim_outcome("event (TME) was 31") == (0, "event (TME)")


def test_defined_abbreviation_read_with_long_form() -> None:
    sentence = (
        "The number of rats showing a transient motor event (TME) was 31 (18.5%), "
        "22 (15.6%), and 12 (26.5%), respectively."
    )
    for value in ("31", "22", "12"):
        found = find_outcome(sentence, sentence.index(value))
        assert found is not None and found.value == "transient motor event (TME)"


def test_dangling_phrase_is_no_count_outcome() -> None:
    sentence = "We found that 40/96 cells exhibited an"
    assert dangling("cells exhibited an")
    assert not dangling("cells exhibited a decrease")
    assert count_outcomes(sentence, [(14, 19)]) == [None]
