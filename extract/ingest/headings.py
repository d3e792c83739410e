"""One heading -> canonical section mapping, shared by the PDF and the JATS readers.

A heading names a section of :data:`~extract.ingest.document.SECTION_NAMES` by its words
("Materials and Methods" -> methods, "Acknowledgements" -> other). Numbering ("2.", "2.1",
"III.", "B.") is ignored. Two ways of matching:

* at the start (PDF): any short bold line could be a heading, so only the heading's first words
  count ("Results of the pilot" opens results; "Effect of dose on results" does not);
* anywhere (JATS): a ``sec`` title is known to be a heading, so its words count wherever they
  are; when it names two parts ("Results and Discussion") the part named first wins.
"""

from __future__ import annotations

import re

#: Canonical section -> the words of a heading that name it, as regular expressions. A ``^`` or
#: ``$`` in an alternative ties it to the start or end of the whole heading in both matchings.
HEADING_WORDS: tuple[tuple[str, str], ...] = (
    ("abstract", r"abstract|summary|resumo|resumen"),
    ("introduction", r"introduction|background|rationale|^intro$|introdução"),
    (
        "methods",
        r"materials?\s+and\s+methods|methods?|methodology|materials?|experimental"
        r"|procedures|statistical\s+analys[ie]s|^statistics$|study\s+design|study\s+population"
        r"|^(?:patients|subjects)|métodos?",
    ),
    ("results", r"results?|findings|resultados"),
    (
        "discussion",
        r"discussion|conclusions?|concluding\s+remarks|limitations|discussão",
    ),
    (
        "references",
        r"^(?:references?|bibliography|literature\s+cited|works\s+cited|referências)$",
    ),
    ("legends", r"(?:figure|table)s?\s+(?:legends?|captions?)|^legends?$"),
    (
        "other",
        r"acknowledge?ments?|funding|competing\s+interests?|conflicts?\s+of\s+interest"
        r"|author\s+contributions?|data\s+availability|availability\s+of\s+data"
        r"|supplementary|supporting\s+information|ethics|declarations?|abbreviations",
    ),
)

_PATTERNS: tuple[tuple[str, re.Pattern[str]], ...] = tuple(
    (name, re.compile(rf"(?<!\w)(?:{words})(?!\w)")) for name, words in HEADING_WORDS
)
_NUMBERING = re.compile(r"^\s*(?:\d+(?:\.\d+)*\.?|[IVX]+\.?|[ivx]+\.|[A-Z]\.)\s+")


def clean_heading(text: str) -> str:
    """A heading lower-cased, numbering and end punctuation removed, spaces collapsed.

    >>> clean_heading("2.1. Materials and  Methods:")
    'materials and methods'
    """
    text = _NUMBERING.sub("", text.strip())
    text = re.sub(r"[\s:.]+$", "", text)
    return re.sub(r"\s+", " ", text).lower()


def heading_to_section(text: str, *, anywhere: bool = False) -> str | None:
    """The canonical section a heading names, or ``None`` when it names none.

    Args:
        text: the heading as written, with or without numbering.
        anywhere: match the section words anywhere in the heading (earliest wins) rather
            than only at its start.

    Returns:
        A canonical section name, or ``None``.

    >>> heading_to_section("2. Materials and Methods"), heading_to_section("Animals")
    ('methods', None)
    >>> heading_to_section("Effect of dose on results"), heading_to_section(
    ...     "Effect of dose on results", anywhere=True)
    (None, 'results')
    """
    clean = clean_heading(text)
    best: tuple[int, str] | None = None
    for name, pattern in _PATTERNS:
        match = pattern.search(clean) if anywhere else pattern.match(clean)
        if match and (best is None or match.start() < best[0]):
            best = (match.start(), name)
    return best[1] if best else None
