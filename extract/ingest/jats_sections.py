"""Canonical section names for JATS section titles and ``sec-type`` values.

A top-level section's title decides first; its ``sec-type`` attribute decides when the title
says nothing known; anything else is "other". Nested sections inherit the top-level name (a
"Statistical analysis" subsection of "Results" stays in results). When a title names two parts
("Results and Discussion", "Materials and Methods"), the part named first wins.
"""

from __future__ import annotations

import re

from extract.ingest.headings import heading_to_section

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


def section_from_title(title: str) -> str | None:
    """The canonical name a section title names, or ``None`` when it names none.

    The words of the shared heading table (:mod:`extract.ingest.headings`) count anywhere in
    the title; the one named first wins.

    Args:
        title: the heading as written, with or without numbering ("2. Materials and Methods").

    Returns:
        A name from :data:`~extract.ingest.document.SECTION_NAMES`, or ``None``.
    """
    return heading_to_section(title, anywhere=True)


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
