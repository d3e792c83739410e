"""Abbreviations an article defines: "alanine aminotransferase (ALT)" -> {"ALT": "alanine
aminotransferase"}.

The pairing follows Schwartz & Hearst, "A simple algorithm for identifying abbreviation
definitions in biomedical text" (Pacific Symposium on Biocomputing 2003): a short form in
parentheses after its long form (or the other way round), the long form taken from the words
just before, at most ``min(len(short) + 5, 2 * len(short))`` words, and accepted when every
letter or digit of the short form occurs in the long form in order, read right to left, the first
one at the start of a word. Table footnotes list abbreviations as "ALT, alanine
aminotransferase; AST, aspartate aminotransferase" or "ALT = alanine aminotransferase" (common
practice); those are read too.
"""

from __future__ import annotations

import re

from extract.nlp.tokenizer import normalize_text

__all__ = ["expand_outcome", "find_abbreviations", "long_form_for"]

#: A short form: 2-10 characters, starting with a letter, with at least one capital letter.
_SHORT = r"[A-Za-z][\w-]{0,8}[\w]"
_PAREN = re.compile(r"\(\s*(" + _SHORT + r")\s*[)]")
_FOOTNOTE_PAIR = re.compile(r"(?:^|[;.]\s*)(" + _SHORT + r")\s*(?:,|=|:)\s*([a-z][^;,.=:()]{2,80})")


def _is_short_form(text: str) -> bool:
    return (
        2 <= len(text) <= 10
        and any(ch.isupper() for ch in text)
        and not text.isdigit()
        and " " not in text
    )


def long_form_for(short: str, words_before: str) -> str | None:
    """The long form of ``short`` at the end of ``words_before``, or None (Schwartz & Hearst).

    Letters and digits of the short form are matched right to left against the words before;
    the first one must open a word. The shortest long form that matches is returned.

    >>> long_form_for("ALT", "serum alanine aminotransferase")
    'alanine aminotransferase'
    """
    if not _is_short_form(short):
        return None
    chars = [c.lower() for c in short if c.isalnum()]
    if not chars:
        return None
    words = words_before.split()
    limit = min(len(short) + 5, 2 * len(short))
    words = words[-limit:]
    candidate = " ".join(words)
    s_index = len(chars) - 1
    l_index = len(candidate) - 1
    while s_index >= 0:
        c = chars[s_index]
        while l_index >= 0 and (
            candidate[l_index].lower() != c
            or (s_index == 0 and l_index > 0 and candidate[l_index - 1].isalnum())
        ):
            l_index -= 1
        if l_index < 0:
            return None
        l_index -= 1
        s_index -= 1
    start = candidate.rfind(" ", 0, l_index + 1) + 1
    long_form = candidate[start:].strip(" ,;:")
    if not long_form or long_form.lower() == short.lower() or len(long_form) <= len(short):
        return None
    return long_form


def find_abbreviations(text: str) -> dict[str, str]:
    """Every abbreviation ``text`` defines, short form -> long form (first definition wins).

    "alanine aminotransferase (ALT)", "ALT (alanine aminotransferase)", and footnote lists
    "ALT, alanine aminotransferase; AST, aspartate aminotransferase".
    """
    norm = normalize_text(text)
    found: dict[str, str] = {}
    for match in _PAREN.finditer(norm):
        inside = match.group(1)
        head = norm[: match.start()]
        head = head[max(head.rfind(ch) for ch in ".;:([") + 1 :]
        if _is_short_form(inside):
            long_form = long_form_for(inside, head)
            if long_form is not None:
                found.setdefault(inside, long_form)
                continue
        # The reverse order: "ALT (alanine aminotransferase)"
    for match in re.finditer(r"\b(" + _SHORT + r")\s*\(([a-z][^()]{2,80})\)", norm):
        short, long_form = match.group(1), match.group(2).strip()
        if _is_short_form(short) and long_form_for(short, long_form) == long_form:
            found.setdefault(short, long_form)
    for match in _FOOTNOTE_PAIR.finditer(norm):
        short, long_form = match.group(1), match.group(2).strip()
        if _is_short_form(short) and long_form_for(short, long_form) == long_form:
            found.setdefault(short, long_form)
    return found


def expand_outcome(outcome: str, abbreviations: dict[str, str]) -> str:
    """An outcome that is only a defined short form, written out ("ALT" -> "alanine
    aminotransferase"); anything else is returned unchanged ("OBS score" stays)."""
    key = outcome.strip()
    long_form = abbreviations.get(key)
    if long_form is None and key.endswith("s"):
        long_form = abbreviations.get(key[:-1])
    if long_form is None:
        return outcome
    return " ".join(w if w.isupper() else w.lower() for w in long_form.split())
