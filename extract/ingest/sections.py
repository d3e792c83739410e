"""Headings, captions and footnotes: what a text block is and which section it belongs to.

Section headings are mapped to the canonical names of :data:`~extract.ingest.document.SECTION_NAMES`
by their first words with the table shared with the JATS reader
(:mod:`extract.ingest.headings`; "Materials and methods" -> methods). A heading that maps to no canonical name but
is a known back-matter heading ("Acknowledgements", "Funding") opens an ``other`` section; any
other short bold line is a subheading and keeps the current section.
"""

from __future__ import annotations

import re

from extract.ingest.headings import clean_heading, heading_to_section

CAPTION = re.compile(
    r"^(?P<kind>Tableau|Tabela|Tabla|Table|Figura|Figure|Fig\.?)\s+(?P<num>S?\d+[A-Za-z]?)(?P<cont>\s*\((continued|cont\.?)\))?"
    r"\s*[.:|\-–—]?\s*",
    re.IGNORECASE,
)
_FOOTNOTE_START = re.compile(
    r"^([*†‡§¶#]|[a-h]\s|[a-h][A-Z]|Data are|Values are|Abbreviations|Note[s:]|\*?P\s*[<>=]|n\s*=)"
)
DOI = re.compile(r"\b(10\.\d{4,9}/[^\s\"<>]+)", re.IGNORECASE)


def heading_section(text: str) -> str | None:
    """The canonical section a heading opens, or ``None`` when it is not a section heading.

    The heading's first words decide (:func:`~extract.ingest.headings.heading_to_section`);
    a line of more than six words is no section heading.

    >>> heading_section("2. Materials and Methods"), heading_section("Animals")
    ('methods', None)
    """
    if len(clean_heading(text).split()) > 6:
        return None
    return heading_to_section(text)


def caption_label(text: str, *, bold: bool = True) -> tuple[str, bool] | None:
    """``("Table 1", continued)`` for a caption's first words, else ``None``.

    A caption's label is set apart: printed in bold, or followed by punctuation ("Table 1.",
    "Figure 2:"), "(continued)" or nothing. With ``bold=False`` a label run into a sentence
    ("Table 1 summarises ...") is body text, not a caption.

    >>> caption_label("Table 2 (continued)")
    ('Table 2', True)
    >>> caption_label("Tabela 1. Características")  # Portuguese, Spanish, French labels too
    ('Table 1', False)
    >>> caption_label("Table 1 summarises the data", bold=False) is None
    True
    """
    match = CAPTION.match(text)
    if not match:
        return None
    if not bold and not match.group("cont"):
        rest = text[match.end("num") :].lstrip()
        if rest and rest[0] not in ".:|-–—":
            return None
    kind = match.group("kind").lower()
    name = "Table" if kind.startswith("tab") else "Figure"
    return f"{name} {match.group('num')}", bool(match.group("cont"))


def caption_text(text: str) -> str:
    """The caption without its label ("Table 1. Body mass" -> "Body mass")."""
    match = CAPTION.match(text)
    return text[match.end() :].strip() if match else text.strip()


def looks_like_footnote(text: str) -> bool:
    """Whether a line below a table reads as one of its footnotes."""
    return bool(_FOOTNOTE_START.match(text.strip()))


def find_doi(text: str) -> str | None:
    """The first DOI in ``text`` (trailing punctuation removed), or ``None``."""
    match = DOI.search(text)
    if not match:
        return None
    return match.group(1).rstrip(".,;)]")
