"""Sample sizes: "n = 8 per group", "twelve mice per group", "Vehicle (n = 9)", "n = 6–8".

Every phrasing gives a :class:`SampleSize` with the number (or the low and high ends of a
range), the group it names when it names one, and its scope:

* ``"per_group"``: the same n in each group ("n = 8 per group", "8 animals per group",
  "(60 per arm)");
* ``"group"``: the n of one named group ("Vehicle (n = 9)", "n = 9 in the vehicle group");
* ``"total"``: the whole study or analysis ("in 120 patients", "a total of 40 mice");
* ``"unspecified"``: an "n = 10" that says neither.

A range ("n = 6–8") keeps ``low`` and ``high`` (``n`` is None; ``is_range`` is True) and keeps
its scope.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from extract.nlp.context import load_lexicon
from extract.nlp.tokenizer import normalize_text

__all__ = ["NUMBER_WORDS", "SCOPES", "SampleSize", "find_sample_sizes", "parse_number"]

#: Scopes of a sample size.
SCOPES: tuple[str, ...] = ("per_group", "group", "total", "unspecified")

#: Number words read as sample sizes ("twelve mice per group").
NUMBER_WORDS: dict[str, int] = {
    word: value
    for value, word in enumerate(
        "zero one two three four five six seven eight nine ten eleven twelve thirteen fourteen"
        " fifteen sixteen seventeen eighteen nineteen twenty".split()
    )
}
NUMBER_WORDS.update(
    {"thirty": 30, "forty": 40, "fifty": 50, "sixty": 60, "seventy": 70, "eighty": 80, "ninety": 90}
)


@dataclass(frozen=True)
class SampleSize:
    """A sample size stated in text or a header.

    Attributes:
        n: the number, or None for a range.
        low: the low end (equals ``n`` for a single number).
        high: the high end (equals ``n`` for a single number).
        scope: "per_group", "group", "total" or "unspecified" (see the module docstring).
        group: the group it names ("Vehicle"), or None.
        subject: the noun counted ("mice", "patients"), or None.
        start: character offset of the phrase in the text given.
        end: offset just past it.
        text: ``text[start:end]``.
    """

    n: int | None
    low: int
    high: int
    scope: str
    group: str | None = None
    subject: str | None = None
    start: int = 0
    end: int = 0
    text: str = ""

    @property
    def is_range(self) -> bool:
        """Whether the sample size is a range ("n = 6–8")."""
        return self.low != self.high


_WORD_NUMBER = r"(?:\d+|" + "|".join(sorted(NUMBER_WORDS, key=len, reverse=True)) + r")"
_SUBJECTS = (
    r"mice|mouse|rats?|animals?|patients?|participants?|subjects?|volunteers?|individuals?|"
    r"women|men|children|adults?|dogs?|pigs?|rabbits?|hamsters?|primates?|monkeys?|fish|"
    r"zebrafish|cases?|donors?|samples?|litters?|pups?|biological replicates|replicates|"
    r"embryos?|larvae|wells|explants|cultures|people|persons|minipigs?|piglets?|sheep|"
    r"guinea pigs|ferrets?|cats?|gerbils?|marmosets?|macaques?|zebrafish|flies|worms"
)
_ADJECTIVES = r"(?:(?:male|female|adult|healthy|young|aged|old|juvenile|[\w]+-week-old|[\w]+-old|C\w+|\w+-deficient|wild-type|transgenic)\s+){0,3}"
_PER_GROUP = r"(?:per|/|in each|each|for each|in every)\s*(?:experimental\s+|treatment\s+)?(?:group|arm|condition|genotype|cohort|treatment|dose)s?\b"

_N_EQUALS = re.compile(
    rf"\b[nN]\s*(?:=|:|of)\s*(\d+)(?:\s*(?:–|—|-|to)\s*(\d+))?"
    rf"(?:\s+({_SUBJECTS}))?(\s*{_PER_GROUP})?",
)
_COUNT_SUBJECTS = re.compile(
    rf"(?<![\w.,])({_WORD_NUMBER})(?:\s*(?:–|—|-|to)\s*(\d+))?\s+{_ADJECTIVES}({_SUBJECTS})\b(\s*{_PER_GROUP})?",
    re.I,
)
_COUNT_PER_GROUP = re.compile(rf"(?<![\w.,])({_WORD_NUMBER})\s*{_PER_GROUP}", re.I)
_GROUP_AFTER = re.compile(
    r"^\s*(?:\w+\s+)?(?:in|for|of)\s+(?:the\s+)?([\w\s/.+-]{1,40}?)\s+(?:group|arm|cohort)\b", re.I
)
_GROUP_STOP = frozenset(
    "into and or vs vs. versus with were was the a an of to in for from between among receiving"
    " treated given each per both all groups group arm arms".split()
)
#: A number right after a time word is a time ("at week 8 in each group"), not a count.
_TIME_BEFORE = re.compile(r"\b(?:day|week|month|year|hour|visit|wk|cycle|passage)\s*$", re.I)
_COPULAS = frozenset("were was is are be been being remained seemed".split())
_ALLOCATION = re.compile(r"\b(?:randomi[sz]ed|assigned|allocated)\b", re.I)
_TO_GROUP = re.compile(
    r"(?<![\w.,:])(\d+)\s+(?:were\s+)?to\s+(?:the\s+)?([^,;.()]+?)(?=\s*(?:,|;|\.\s|\.$|\band\b|\(|$))"
)
_TOTAL_BEFORE = re.compile(
    r"\b(?:total of|in all|overall|altogether|enrolled|included|recruited)\s*$", re.I
)


def parse_number(text: str) -> int | None:
    """An integer written in digits or as a word up to ninety ("twelve" -> 12), or None."""
    text = text.strip().lower()
    if text.isdigit():
        return int(text)
    return NUMBER_WORDS.get(text)


def _group_before(text: str, paren: int) -> str | None:
    """The group named just before "(" at ``paren``: "Vehicle (n = 9)" -> "Vehicle"."""
    head = text[:paren].rstrip()
    if not head:
        return None
    cut = max(head.rfind(ch) for ch in ",;:(.[")
    if cut >= 0 and head[cut] == "." and cut > 0 and head[cut - 1].isdigit():
        cut = max(head.rfind(ch) for ch in ",;:([")
    words = head[cut + 1 :].split()
    chosen: list[str] = []
    for word in reversed(words):
        if word.lower() in _COPULAS:
            return None
        if word.lower() in _GROUP_STOP and chosen:
            break
        if word.lower() in _GROUP_STOP:
            continue
        chosen.insert(0, word)
        if len(chosen) >= 6:
            break
    group = " ".join(chosen).strip(" ,;:")
    return group or None


def _names_outcome(name: str) -> bool:
    """Whether a name before "(n = ...)" is an outcome of the outcomes lexicon, not a group."""
    outcomes = {entry.lower() for entry in load_lexicon("outcomes")}
    return name.lower().strip() in outcomes


def _group_after(text: str, end: int) -> str | None:
    match = _GROUP_AFTER.match(text[end : end + 60])
    if match:
        return match.group(1).strip()
    return None


def find_sample_sizes(text: str) -> list[SampleSize]:
    """Find every sample size stated in a sentence, legend or header.

    Args:
        text: a sentence, paragraph, legend or table header ("Vehicle (n = 9)").

    Returns:
        Sample sizes in text order with character offsets into ``text``.
    """
    norm = normalize_text(text)
    found: list[SampleSize] = []
    taken: list[tuple[int, int]] = []

    def overlaps(start: int, end: int) -> bool:
        return any(a < end and start < b for a, b in taken)

    for match in _N_EQUALS.finditer(norm):
        low = int(match.group(1))
        high = int(match.group(2)) if match.group(2) else low
        start, end = match.start(), match.end()
        group = None
        if match.group(4):
            scope = "per_group"
        else:
            paren = norm.rfind("(", max(0, start - 3), start + 1)
            group = (
                _group_before(norm, paren)
                if paren != -1 and not norm[paren + 1 : start].strip()
                else None
            )
            if group is not None and _names_outcome(group):
                group = None  # "Body mass (n = 10)": the n measured, not a group's name
            if group is None:
                group = _group_after(norm, end)
            scope = "group" if group else "unspecified"
            if _TOTAL_BEFORE.search(norm[max(0, start - 30) : start]):
                scope = "total"
        found.append(_make(text, start, end, low, high, scope, group, match.group(3)))
        taken.append((start, end))

    for match in _COUNT_SUBJECTS.finditer(norm):
        if overlaps(match.start(), match.end()):
            continue
        count = parse_number(match.group(1))
        if count is None or count == 0:
            continue
        low = count
        high = int(match.group(2)) if match.group(2) else low
        if _looks_like_measure(norm, match.start()) or _TIME_BEFORE.search(norm, 0, match.start()):
            continue
        scope = "per_group" if match.group(4) else "total"
        found.append(
            _make(text, match.start(), match.end(), low, high, scope, None, match.group(3))
        )
        taken.append((match.start(), match.end()))

    for match in _COUNT_PER_GROUP.finditer(norm):
        if overlaps(match.start(), match.end()) or _TIME_BEFORE.search(norm, 0, match.start()):
            continue
        per_group = parse_number(match.group(1))
        if per_group is None or per_group == 0:
            continue
        found.append(
            _make(text, match.start(), match.end(), per_group, per_group, "per_group", None, None)
        )
        taken.append((match.start(), match.end()))

    if _ALLOCATION.search(norm):
        for match in _TO_GROUP.finditer(norm):
            if overlaps(match.start(), match.end()):
                continue
            n = int(match.group(1))
            group = " ".join(match.group(2).split())
            found.append(_make(text, match.start(), match.end(), n, n, "group", group, None))
            taken.append((match.start(), match.end()))
        for match in re.finditer(
            r"(?<![\w.,:])(\d+)\s+were\s+(?:randomi[sz]ed|enrolled|included)", norm
        ):
            if not overlaps(match.start(), match.end()):
                n = int(match.group(1))
                found.append(_make(text, match.start(), match.end(), n, n, "total", None, None))
                taken.append((match.start(), match.end()))

    found.sort(key=lambda s: s.start)
    return found


def _looks_like_measure(norm: str, start: int) -> bool:
    """A number right after "±" or a decimal point is part of a measurement, not a count."""
    before = norm[max(0, start - 3) : start]
    return "±" in before or before.endswith(".")


def _make(
    text: str,
    start: int,
    end: int,
    low: int,
    high: int,
    scope: str,
    group: str | None,
    subject: str | None,
) -> SampleSize:
    while end > start and text[end - 1] in " \t":
        end -= 1
    return SampleSize(
        n=low if low == high else None,
        low=low,
        high=high,
        scope=scope,
        group=group,
        subject=subject.lower() if subject else None,
        start=start,
        end=end,
        text=text[start:end],
    )
