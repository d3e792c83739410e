"""Canonical section names for JATS section titles and ``sec-type`` values.

A top-level section's title decides first; its ``sec-type`` attribute decides when the title
says nothing known; anything else is "other". Nested sections inherit the top-level name (a
"Statistical analysis" subsection of "Results" stays in results). When a title names two parts
("Results and Discussion", "Materials and Methods"), the part named first wins.
"""

from __future__ import annotations

import re

#: Title patterns per canonical name (matched on the lower-cased title, numbering removed).
TITLE_PATTERNS: tuple[tuple[str, re.Pattern[str]], ...] = (
    ("introduction", re.compile(r"\bintroduction\b|\bbackground\b|^intro$|\brationale\b")),
    (
        "methods",
        re.compile(
            r"\bmethods?\b|\bmethodology\b|\bmaterials?\b|\bexperimental\b|\bprocedures\b"
            r"|\bstatistical analys[ie]s\b|^statistics$|\bstudy design\b|\bstudy population\b"
            r"|^(patients|subjects)\b"
        ),
    ),
    ("results", re.compile(r"\bresults?\b|\bfindings\b")),
    (
        "discussion",
        re.compile(r"\bdiscussion\b|\bconclusions?\b|\bconcluding remarks\b|\blimitations\b"),
    ),
    ("references", re.compile(r"^(references?|bibliography|literature cited|works cited)$")),
    ("legends", re.compile(r"\b(figure|table)s? (legends?|captions?)\b|^legends?$")),
    (
        "other",
        re.compile(
            r"acknowledge?ments?|\bfunding\b|competing interests|conflicts? of interest"
            r"|author contributions|data availability|availability of data|supporting information"
            r"|supplementary|abbreviations|\bethics\b"
        ),
    ),
)

#: ``sec-type`` values (each part of "a|b") per canonical name.
SEC_TYPES: dict[str, str] = {
    "intro": "introduction",
    "introduction": "introduction",
    "background": "introduction",
    "methods": "methods",
    "materials": "methods",
    "subjects": "methods",
    "cases": "methods",
    "results": "results",
    "discussion": "discussion",
    "conclusions": "discussion",
    "conclusion": "discussion",
}

_NUMBERING = re.compile(r"^\s*(?:[\dIVXivx]+(?:\.\d+)*\.?|[A-Z]\.)\s+")


def _clean_title(title: str) -> str:
    title = _NUMBERING.sub("", title.strip())
    return re.sub(r"[\s:.]+$", "", title).lower()


def section_from_title(title: str) -> str | None:
    """The canonical name a section title names, or ``None`` when it names none.

    Args:
        title: the heading as written, with or without numbering ("2. Materials and Methods").

    Returns:
        A name from :data:`~extract.ingest.document.SECTION_NAMES`, or ``None``.
    """
    cleaned = _clean_title(title)
    best: tuple[int, str] | None = None
    for name, pattern in TITLE_PATTERNS:
        match = pattern.search(cleaned)
        if match and (best is None or match.start() < best[0]):
            best = (match.start(), name)
    return best[1] if best else None


def section_from_type(sec_type: str | None) -> str | None:
    """The canonical name a ``sec-type`` attribute names ("materials|methods" -> methods)."""
    if not sec_type:
        return None
    for part in re.split(r"[|\s]+", sec_type.strip().lower()):
        if part in SEC_TYPES:
            return SEC_TYPES[part]
    return None


def section_name(title: str, sec_type: str | None = None) -> str:
    """The canonical name of a top-level section: by title, then ``sec-type``, else "other"."""
    return section_from_title(title) or section_from_type(sec_type) or "other"
