"""The customised tokenizer, text normalisation and the sentence rules."""

from __future__ import annotations

import pytest
import spacy

from extract.nlp.tokenizer import SentenceSplitter, make_tokenizer, normalize_text


@pytest.fixture(scope="module")
def nlp() -> spacy.language.Language:
    nlp = spacy.blank("en")
    nlp.tokenizer = make_tokenizer(nlp)
    return nlp


# Cases the default English tokenizer gets wrong (measured with spaCy 3.8: "8)" emoticon,
# "g." abbreviation, unsplit "150μM", "24.1±1.3", "n=10", "7.3×10").
TOKEN_CASES = [
    ("(n = 8).", ["(", "n", "=", "8", ")", "."]),
    ("was 1.3 g.", ["was", "1.3", "g", "."]),
    ("150μM", ["150", "μM"]),
    ("150µM", ["150", "µM"]),
    ("24.1±1.3", ["24.1", "±", "1.3"]),
    ("n=10", ["n", "=", "10"]),
    ("7.3×10", ["7.3", "×", "10"]),
    ("p<0.05", ["p", "<", "0.05"]),
    ("p≤0.05", ["p", "≤", "0.05"]),
    ("128–136", ["128", "–", "136"]),
    ("x.", ["x", "."]),
    ("IL-6 and CD4", ["IL-6", "and", "CD4"]),
    ("vs. Fig. 2", ["vs.", "Fig.", "2"]),
]


@pytest.mark.parametrize(("text", "tokens"), TOKEN_CASES)
def test_tokenizer(nlp: spacy.language.Language, text: str, tokens: list[str]) -> None:
    assert [token.text for token in nlp(text)] == tokens


SENTENCE_CASES = [
    ("Values were 24.1 vs. 20.3 g. Mice gained weight.", 2),
    ("As Smith et al. reported, mass fell. It recovered.", 2),
    ("See Fig. 2 for details. Next sentence.", 2),
    ("Groups differed, i.e. the dose mattered. Done.", 2),
    ("Body mass was 24.1 ± 1.3 g (n = 8). Heart rate was 412 bpm.", 2),
    ("One. Two! Three? Four.", 4),
]


@pytest.mark.parametrize(("text", "count"), SENTENCE_CASES)
def test_sentence_rules(nlp: spacy.language.Language, text: str, count: int) -> None:
    doc = SentenceSplitter()(nlp.make_doc(text))
    assert len(list(doc.sents)) == count


@pytest.mark.parametrize(
    ("text", "expected"),
    [
        ("\u22120.8", "-0.8"),  # unicode minus
        ("24\u00b71", "24.1"),  # middle-dot decimal
        ("5.6\u2009g", "5.6 g"),  # thin space
        ("5.6\u00a0g", "5.6 g"),  # no-break space
        ("a\u00b7b", "a\u00b7b"),  # a middle dot between letters stays
    ],
)
def test_normalize_text_keeps_length(text: str, expected: str) -> None:
    out = normalize_text(text)
    assert out == expected
    assert len(out) == len(text)
