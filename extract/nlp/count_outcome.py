"""The outcome of a count in text: what was counted, read after the count.

A count names what it counts after itself, not before: "Among the 1,274 cases, 241 (18.9%)
cases occurred in patients aged <18 years, 995 (78.1%) in patients aged 18-64 years" counts
"cases occurred in patients aged <18 years" and, with the verb carried over from the count
before it, "cases occurred in patients aged 18-64 years". The outcome is the noun phrase after
the count and the predicate that follows, up to the end of the clause. A count followed by its
denominator ("16 (5.3%) of 302") names nothing after itself: its outcome is read before it
(:func:`extract.nlp.context.find_outcome`).
"""

from __future__ import annotations

import re

from extract.nlp.context import ContextMention
from extract.nlp.outcome_trim import dangling
from extract.nlp.tokenizer import normalize_text

__all__ = ["count_outcomes"]

#: Where the clause of a count ends.
_CLAUSE_END = re.compile(
    r"[,;:()\[\]]|\.(?:\s|$)|\s(?:and|or|but|whereas|while|vs\.?|versus|compared|respectively)\b"
    r"|\s(?:than|as)\s",
    re.I,
)
#: Words that start a gapped predicate ("995 (78.1%) in patients aged 18-64 years").
_PREPOSITION = re.compile(r"^(?:in|among|at|from|for|with|on|to|by|after|during|within)\b", re.I)
#: Auxiliaries dropped at the start of a predicate ("were acquired in Africa").
_AUXILIARY = re.compile(r"^(?:(?:were|was|are|is|been|being)\s+)+", re.I)
#: A verb in a predicate: an auxiliary, a past form, or a common reporting verb.
_VERB = re.compile(
    r"\b(?:were|was|are|is|had|has|have|did|do|does|\w+ed|took|got|showed|shown|grew|fell|rose|"
    r"became|died|left|met|lost|gave|made|underwent|remain\w*|report\w*|occur\w*|exhibit\w*|"
    r"display\w*|develop\w*|receiv\w*|requir\w*|achiev\w*|respond\w*|surviv\w*)\b",
    re.I,
)
_NOT_START = re.compile(r"^(?:of|per|out of|/|%|[-–—])", re.I)
_MAX_WORDS = 12


def _clause_after(norm: str, end: int) -> tuple[int, str]:
    """The start and text of the rest of the clause after ``end``."""
    start = end + (len(norm[end:]) - len(norm[end:].lstrip()))
    stop = _CLAUSE_END.search(norm, start)
    return start, norm[start : stop.start() if stop else len(norm)].rstrip()


def _verb_part(predicate: str) -> str:
    """The words of a predicate before its first preposition: "cases occurred" of "cases
    occurred in patients aged <18 years"; "" when it has no verb there."""
    words = predicate.split()
    for index, word in enumerate(words):
        if index and _PREPOSITION.match(word):
            head = " ".join(words[:index])
            return head if _VERB.search(head) else ""
    return ""


def count_outcomes(text: str, spans: list[tuple[int, int]]) -> list[ContextMention | None]:
    """The outcome of each count of a sentence, read after it.

    Args:
        text: the sentence.
        spans: (start, end) of each count in ``text``, in text order ("241 (18.9%)", "46/108").

    Returns:
        One mention of kind "outcome" per span (``value`` tidy, auxiliaries dropped), or None
        where the count names nothing after itself (a denominator follows, or the clause ends).
    """
    norm = normalize_text(text)
    found: list[ContextMention | None] = []
    carried = ""  # the verb part of the last count's predicate, for a gapped one
    for _, end in spans:
        start, phrase = _clause_after(norm, end)
        if not phrase or _NOT_START.match(phrase) or phrase[0].isdigit():
            found.append(None)
            continue
        value = phrase
        if _PREPOSITION.match(phrase):
            if not carried:
                found.append(None)
                continue
            value = f"{carried} {phrase}"
        elif _VERB.search(phrase) is None and len(phrase.split()) > 4:
            found.append(None)  # a long phrase with no verb is no predicate of the count
            continue
        else:
            carried = _verb_part(_AUXILIARY.sub("", phrase)) or carried
        value = _AUXILIARY.sub("", value)
        words = value.split()
        if not words or not re.search(r"[A-Za-z]{2}", value) or dangling(value):
            found.append(None)
            continue
        value = " ".join(words[:_MAX_WORDS])
        found.append(
            ContextMention(
                "outcome", text[start : start + len(phrase)], value, start, start + len(phrase)
            )
        )
    return found
