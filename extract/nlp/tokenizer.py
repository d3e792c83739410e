"""Text normalisation, the customised tokenizer and the rule-based sentence splitter.

spaCy's default English tokenizer misreads biomedical numbers: "n = 8)." keeps "8)" (an
emoticon exception), "1.3 g." keeps "g." (a one-letter abbreviation), and "150μM", "24.1±1.3",
"n=10" and "7.3×10" stay single tokens. :func:`make_tokenizer` fixes this by adding infixes for
± × = < > ≤ ≥ and the digit-letter boundary, and by dropping the special cases that hold digits,
brackets or single letters with a period. It is registered as ``winnow.tokenizer.v1`` so that a
saved pipeline and a training config rebuild the same tokenizer.

:func:`normalize_text` gives the rule readers a same-length copy of the text (ASCII minus,
plain spaces, middle-dot decimals as ".") so offsets found in it are offsets into the original.
"""

from __future__ import annotations

import re
from collections.abc import Callable

import spacy
from spacy.language import Language
from spacy.tokenizer import Tokenizer
from spacy.tokens import Doc
from spacy.util import compile_infix_regex, compile_prefix_regex, compile_suffix_regex

__all__ = [
    "ABBREVIATIONS",
    "SentenceSplitter",
    "make_tokenizer",
    "normalize_text",
    "split_sentences",
]

#: Abbreviations after which a period does not end a sentence (kept as one token).
ABBREVIATIONS: tuple[str, ...] = (
    "vs.",
    "Vs.",
    "al.",
    "Fig.",
    "Figs.",
    "fig.",
    "figs.",
    "Eq.",
    "Eqs.",
    "Ref.",
    "Refs.",
    "ref.",
    "refs.",
    "No.",
    "no.",
    "Nos.",
    "approx.",
    "ca.",
    "cf.",
    "i.e.",
    "e.g.",
    "resp.",
    "Suppl.",
    "suppl.",
    "Tab.",
    "Dr.",
    "Prof.",
    "Inc.",
    "Ltd.",
    "Co.",
    "St.",
    "viz.",
    "etc.",
    "p.o.",
    "i.p.",
    "i.v.",
    "s.c.",
    "i.m.",
    "b.i.d.",
    "t.i.d.",
    "q.d.",
    "n.d.",
    "n.s.",
    "min.",
    "max.",
    "sp.",
    "spp.",
    "var.",
    "wt.",
    "vol.",
    "Vol.",
    "conc.",
    "temp.",
)

# Same-length replacements: offsets in the normalised text are offsets in the original.
_SAME_LENGTH = str.maketrans(
    {
        "\u2212": "-",  # minus sign
        "\u2010": "-",  # hyphen
        "\u2011": "-",  # non-breaking hyphen
        "\u00a0": " ",  # no-break space
        "\u2007": " ",  # figure space
        "\u2009": " ",  # thin space
        "\u200a": " ",  # hair space
        "\u202f": " ",  # narrow no-break space
        "\u2002": " ",
        "\u2003": " ",
        "\t": " ",
        "\n": " ",
        "\r": " ",
    }
)
_MIDDLE_DOT_DECIMAL = re.compile(r"(?<=\d)[\u00b7\u2219\u22c5](?=\d)")

_INFIXES = (
    r"[±×=<>≤≥∓]",
    r"(?<=[0-9])(?<![A-Za-z][0-9])(?=[A-Za-zµμ%°])",  # 150μM, 3h, 5% ; not H2O, CD4
    r"(?<=[A-Za-zµμ%])(?=±)",
    r"(?<=[0-9])/(?=[A-Za-zµμ])",
    r"(?<=[0-9])[–—](?=[0-9])",  # 128–136
)
_SPECIAL_CASE_DROP = re.compile(r"[\d()\[\]:;=<>^_\\|]|^[A-Za-z]\.$|^\W+$")


def normalize_text(text: str) -> str:
    """A copy of ``text`` of the same length for the rule readers.

    Unicode minus and hyphens become "-", thin, narrow and no-break spaces and line breaks
    become " ", a middle dot between digits ("24·1") becomes ".". Offsets found in the copy
    are offsets in ``text``.
    """
    out = text.translate(_SAME_LENGTH)
    return _MIDDLE_DOT_DECIMAL.sub(".", out)


@spacy.registry.tokenizers("winnow.tokenizer.v1")
def create_tokenizer() -> Callable[[Language], Tokenizer]:
    """spaCy registry entry for the customised tokenizer (used in configs)."""

    def factory(nlp: Language) -> Tokenizer:
        return make_tokenizer(nlp)

    return factory


def make_tokenizer(nlp: Language) -> Tokenizer:
    """The customised tokenizer for ``nlp`` (an English pipeline).

    Args:
        nlp: the pipeline whose vocabulary and default punctuation rules are the base.

    Returns:
        A :class:`spacy.tokenizer.Tokenizer`.
    """
    defaults = nlp.Defaults
    prefixes = list(defaults.prefixes or []) + [r"[±×≤≥]"]
    suffixes = list(defaults.suffixes or []) + [r"(?<=[0-9])[%°]", r"[±×]"]
    infixes = list(defaults.infixes or []) + list(_INFIXES)
    rules = {
        key: value
        for key, value in (defaults.tokenizer_exceptions or {}).items()
        if not _SPECIAL_CASE_DROP.search(key)
    }
    for abbreviation in ABBREVIATIONS:
        rules[abbreviation] = [{"ORTH": abbreviation}]
    return Tokenizer(
        nlp.vocab,
        rules=rules,
        prefix_search=compile_prefix_regex(prefixes).search,
        suffix_search=compile_suffix_regex(suffixes).search,
        infix_finditer=compile_infix_regex(infixes).finditer,
        token_match=None,
        url_match=defaults.url_match,
    )


_TERMINALS = frozenset({".", "!", "?"})
_CLOSERS = frozenset({")", "]", '"', "'", "”", "’"})


def _sentence_starts(words: list[str]) -> list[bool]:
    """Sentence starts for a token list: split after . ! ? unless the next word is lowercase."""
    starts = [False] * len(words)
    if words:
        starts[0] = True
    i = 0
    while i < len(words):
        if words[i] in _TERMINALS:
            j = i + 1
            while j < len(words) and (words[j] in _CLOSERS or words[j] in _TERMINALS):
                j += 1
            while j < len(words) and not words[j].strip():
                j += 1
            if j < len(words):
                following = words[j]
                if not following[:1].islower():
                    starts[j] = True
            i = j
            continue
        i += 1
    return starts


class SentenceSplitter:
    """Rule-based sentence splitter: does not split "vs.", "et al.", "Fig. 2", "i.e.", decimals.

    Registered as the ``sentences_rules`` spaCy factory; its extractor id is ``sentences.rules@1``.
    """

    name = "sentences.rules"
    version = 1

    def __call__(self, doc: Doc) -> Doc:
        starts = _sentence_starts([token.text for token in doc])
        for token, start in zip(doc, starts, strict=True):
            token.is_sent_start = start
        return doc


@Language.factory("sentences_rules", default_config={}, assigns=["token.is_sent_start"])
def create_sentence_splitter(nlp: Language, name: str) -> SentenceSplitter:
    """spaCy factory for :class:`SentenceSplitter`."""
    return SentenceSplitter()


def split_sentences(text: str, *, nlp: Language | None = None) -> list[tuple[int, int]]:
    """Character spans (start, end) of the sentences in ``text``.

    Args:
        text: a paragraph.
        nlp: a pipeline with a tokenizer and ``sentences.rules``; default: a bare tokenizer.

    Returns:
        (start, end) offsets of each sentence, trailing spaces excluded.
    """
    if nlp is None:
        from extract.nlp.pipeline import load_pipeline

        nlp = load_pipeline()
    doc = nlp.make_doc(text)
    doc = SentenceSplitter()(doc)
    return [(sent.start_char, sent.end_char) for sent in doc.sents]
