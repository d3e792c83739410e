"""Clause debris around an outcome phrase read before a value.

Long results sentences leave pieces of other clauses in the phrase before a value: a verb of
change ("... clearance (ml/kg/min) increased"), a leading preposition ("of glucose
clearance"), the tail of a parenthetical ("basal period)"), a pronoun ("not different from
that"). :func:`trim_outcome` removes such debris and says where the measured noun phrase is;
:func:`sentence_subject` reads the subject at the start of a sentence ("The rate of X (unit)
... were 1.9").
"""

from __future__ import annotations

import re

_LEAD_PREP = re.compile(r"^(?:of|in|for|on|from)\s+(?:the\s+|its\s+|their\s+)?", re.I)
_TAIL_VERB = re.compile(
    r"\s+(?:increased|decreased|rose|fell|dropped|declined|changed|improved|recovered|"
    r"was|were|is|are|remained)$",
    re.I,
)
_TAIL_UNIT = re.compile(r"\s*\([^()]{0,20}/[^()]{0,20}\)$|\s*\((?:%|[a-zµμ]{1,4}/?[a-zLµμ]*)\)$")
_PRONOUN = re.compile(r"(?:^|\s)(?:that|those|this|it|its \w+ value)$|^not\s", re.I)
#: Where the subject noun phrase at the start of a sentence ends.
_SUBJECT_END = re.compile(
    r"\s*\(|,|\s(?:to|that|which|who|during|measured|obtained|in order|was|were|is|are)\s", re.I
)
_ARTICLE = re.compile(r"^(?:the|a|an)\s+", re.I)
#: A change noun opening a phrase: its measured thing is the object of "in/of" after it
#: ("the increase in plasma zerafin in the treated group" measures plasma zerafin).
_CHANGE_HEAD = re.compile(
    r"^(?:(?:the|an?)\s+)?(?:increase|decrease|reduction|rise|fall|decline|drop|elevation)s?"
    r"\s+(?:in|of)\s+(?:the\s+)?(?=[A-Za-z])",
    re.I,
)
#: Where the object of a change noun ends: a second "in/among/for" names a group or place.
_OBJECT_END = re.compile(
    r"\s+(?:in|among|for|with|after|during|at|was|were|is|are|by)\s|\s+(?:was|were|is|are)$", re.I
)
#: A verb and a number inside a phrase ("event (NSAE) was 56"): the phrase ends before the verb.
_VERB_NUMBER = re.compile(r"\s+(?:was|were|is|are|remained|reached|totalled|totaled)\s+\d.*$", re.I)
#: A phrase cut short by a line or clause break ("exhibited no", "neurons exhibited an").
_DANGLING = re.compile(r"\s(?:a|an|the|no|not|of|in|to|by|with|and|or|both)$", re.I)


def unbalanced(phrase: str) -> bool:
    """True when the phrase closes a bracket it never opened, or opens one it never closes."""
    depth = 0
    for char in phrase:
        if char in "([":
            depth += 1
        elif char in ")]":
            depth -= 1
            if depth < 0:
                return True
    return depth != 0


def trim_outcome(phrase: str) -> tuple[int, str] | None:
    """The measured noun phrase inside ``phrase``, as (offset into ``phrase``, text).

    "of glucose clearance (ml/kg/min) increased" -> (3, "glucose clearance");
    "the increase in plasma zerafin in treated rats" -> (16, "plasma zerafin");
    "event (NSAE) was 56" -> (0, "event (NSAE)");
    "basal period)" -> None (a piece of a parenthetical); "not different from that" -> None.
    """
    offset, text = 0, _VERB_NUMBER.sub("", phrase.strip())
    if unbalanced(text) or _PRONOUN.search(text):
        return None
    change = _CHANGE_HEAD.match(text)
    if change:
        offset, text = change.end(), text[change.end() :]
        end = _OBJECT_END.search(text)
        text = text[: end.start()] if end else text
    while True:
        before = text
        lead = _LEAD_PREP.match(text)
        if lead:
            offset += lead.end()
            text = text[lead.end() :]
        text = _TAIL_VERB.sub("", text)
        text = _TAIL_UNIT.sub("", text).strip()
        if text == before:
            break
    return (offset, text) if text else None


def dangling(phrase: str) -> bool:
    """True when a phrase ends in a word that needs another after it ("exhibited no",
    "neurons exhibited an"): the sentence was cut there and the measured thing is lost."""
    return _DANGLING.search(phrase.strip()) is not None


def sentence_subject(text: str) -> tuple[int, int] | None:
    """The span of the subject noun phrase that opens ``text`` ("The rate of X (unit) ... were"):
    from the first word, without its article, up to a bracket, comma or relative clause; None
    when it is longer than six words or empty."""
    article = _ARTICLE.match(text)
    start = article.end() if article else 0
    stop = _SUBJECT_END.search(text, start)
    end = stop.start() if stop else len(text)
    words = text[start:end].split()
    if not words or len(words) > 6 or not words[0][0].isalpha():
        return None
    return start, start + len(text[start:end].rstrip())
