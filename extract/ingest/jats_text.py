"""Plain text from JATS inline markup.

JATS paragraphs, titles and table cells mix text with inline elements. The extractors read plain
text, so this module flattens an element into one normalised string:

- style elements (``italic``, ``bold``, ``sc``, ``underline``, ``monospace`` ...) are dropped and
  their text kept;
- ``sub`` becomes plain characters ("HbA<sub>1c</sub>" -> "HbA1c");
- ``sup`` holding an integer exponent becomes ``^`` plus the exponent ("10<sup>3</sup>" ->
  "10^3", "kg/m<sup>2</sup>" -> "kg/m^2"); any other ``sup`` becomes plain characters
  ("CD19<sup>+</sup>" -> "CD19+", "Ca<sup>2+</sup>" -> "Ca2+"), except a lone lowercase letter
  (or letters separated by commas), which is a footnote marker and is dropped;
- numeric citation markers (``xref ref-type="bibr"`` whose text is numbers, commas and dashes)
  are removed together with brackets left empty ("shown [12]." -> "shown."); author-year
  citations keep their text; footnote markers (``xref ref-type="fn"`` / ``"table-fn"``) are
  removed; cross-references to figures and tables keep their text;
- character references (``&#x00B1;``) arrive resolved from the parser; named entities that no DTD
  declares (``&plusmn;``) are looked up in the HTML5 entity table (entities are never expanded by
  the parser itself);
- a middle dot between digits is a decimal point ("0·42" -> "0.42"); the unicode minus U+2212 is
  kept; every kind of space (no-break, thin, hair, em ...) becomes one plain space; zero-width
  characters and soft hyphens are removed.
"""

from __future__ import annotations

import html.entities
import re
from collections.abc import Iterable

from lxml import etree

#: Elements that are blocks of their own: left out of the text of the paragraph holding them.
BLOCK_TAGS: frozenset[str] = frozenset(
    {
        "fig",
        "fig-group",
        "table-wrap",
        "table-wrap-group",
        "list",
        "def-list",
        "disp-quote",
        "boxed-text",
        "supplementary-material",
        "statement",
        "code",
        "preformat",
        "media",
        "chem-struct-wrap",
        "speech",
        "verse-group",
    }
)

#: Elements whose content is never text to read (markup for machines or duplicate renderings).
SKIP_TAGS: frozenset[str] = frozenset(
    {"tex-math", "annotation", "object-id", "alt-text", "inline-graphic", "graphic", "long-desc"}
)

#: Elements that separate words: a space goes in their place.
SPACE_TAGS: frozenset[str] = frozenset({"break", "hr"})

_CITATION = "\x00"
_INTEGER_EXPONENT = re.compile(r"^[\u2212\-+]?\d+$")
_FOOTNOTE_LETTERS = re.compile(r"^[a-z](,[a-z])*$")
_NUMERIC_CITATION = re.compile(r"^[\d\s,;\u2013\u2014\-]+$")
_EMPTY_BRACKETS = re.compile(
    "\\s*[\\[(]([\\s,;\u2013\u2014\\-]|"
    + _CITATION
    + ")*"
    + _CITATION
    + "([\\s,;\u2013\u2014\\-]|"
    + _CITATION
    + ")*[\\])]"
)
_CITATION_BEFORE_PUNCT = re.compile("\\s*" + _CITATION + "+\\s*(?=[,.;:)\\]])")
_MIDDLE_DOT_DECIMAL = re.compile(r"(?<=\d)\u00b7(?=\d)")
_ZERO_WIDTH = dict.fromkeys(map(ord, "\u200b\u200c\u200d\u2060\ufeff\u00ad"), None)
_SPACES = re.compile(r"\s+")


def localname(element: etree._Element) -> str:
    """The element's tag without its namespace ("" for comments and processing instructions)."""
    tag = element.tag
    if not isinstance(tag, str):
        return ""
    return tag.rsplit("}", 1)[-1]


def _entity_text(element: etree._Element) -> str:
    name = str(element.text or "").strip("&;")
    return html.entities.html5.get(name + ";", "")


def _sup_text(inner: str, before: str) -> str:
    stripped = inner.strip()
    if not stripped or _FOOTNOTE_LETTERS.match(stripped):
        return ""
    if _INTEGER_EXPONENT.match(stripped) and (before[-1:].isalnum() or before[-1:] == ")"):
        return "^" + stripped
    return stripped


def _xref_text(element: etree._Element, inner: str) -> str:
    ref_type = element.get("ref-type", "")
    if ref_type in ("fn", "table-fn"):
        return ""
    if ref_type == "bibr" and (not inner.strip() or _NUMERIC_CITATION.match(inner)):
        return _CITATION
    return inner


def _walk(element: etree._Element, skip: frozenset[str], out: list[str]) -> None:
    if element.text:
        out.append(element.text)
    for child in element:
        if isinstance(child, etree._Entity):
            out.append(_entity_text(child))
        elif isinstance(child, etree._Element) and isinstance(child.tag, str):
            tag = localname(child)
            if tag in skip or tag in SKIP_TAGS:
                pass
            elif tag in SPACE_TAGS:
                out.append(" ")
            elif tag == "sup":
                out.append(_sup_text(_inner(child, skip), "".join(out).rstrip(_CITATION)))
            elif tag == "xref":
                out.append(_xref_text(child, _inner(child, skip)))
            elif tag == "alternatives":
                _walk_alternatives(child, skip, out)
            else:
                _walk(child, skip, out)
        if child.tail:
            out.append(child.tail)


def _walk_alternatives(element: etree._Element, skip: frozenset[str], out: list[str]) -> None:
    # One rendering only: the first child that is not a machine form (tex-math, graphic).
    for child in element:
        if isinstance(child.tag, str) and localname(child) not in SKIP_TAGS:
            _walk(child, skip, out)
            return


def _inner(element: etree._Element, skip: frozenset[str]) -> str:
    out: list[str] = []
    _walk(element, skip, out)
    return "".join(out)


def normalize_text(text: str) -> str:
    """Normalise spaces, middle-dot decimals and invisible characters of a flattened text.

    Args:
        text: text as flattened from markup (may hold citation placeholders).

    Returns:
        One line of text: every run of white space (no-break, thin, em ... spaces included) is
        one plain space, "0·42" reads "0.42", zero-width characters are gone, and removed
        citation markers leave neither empty brackets nor a space before punctuation.
    """
    text = text.translate(_ZERO_WIDTH)
    text = _EMPTY_BRACKETS.sub("", text)
    text = _CITATION_BEFORE_PUNCT.sub("", text)
    text = text.replace(_CITATION, " ")
    text = _MIDDLE_DOT_DECIMAL.sub(".", text)
    return _SPACES.sub(" ", text).strip()


def element_text(element: etree._Element, *, skip: Iterable[str] = BLOCK_TAGS) -> str:
    """The element's text as one normalised line, with inline markup flattened.

    Args:
        element: any JATS element (a ``p``, ``title``, ``td`` ...).
        skip: names of child elements whose content is left out (by default the block-level
            elements that become blocks of their own, such as a ``fig`` inside a ``p``).

    Returns:
        The plain text (see the module docstring for the rules).
    """
    return normalize_text(_inner(element, frozenset(skip)))


def spaced_text(element: etree._Element) -> str:
    """The element's text with a space between every text node (for reference entries).

    Citation elements often hold their parts (authors, year, title) with no space between them.
    """
    parts: list[str] = []

    def collect(node: etree._Element) -> None:
        parts.append(node.text or "")
        for child in node:
            if isinstance(child, etree._Entity):
                parts.append(_entity_text(child))
            elif isinstance(child.tag, str) and localname(child) not in SKIP_TAGS:
                collect(child)
            parts.append(child.tail or "")

    collect(element)
    text = ""
    for part in (p for p in parts if p):
        # A space between two text nodes unless one already has it or punctuation closes up.
        if text and not text[-1].isspace() and not part[0].isspace():
            if part[0] not in ",.;:)]" and text[-1] not in "([":
                text += " "
        text += part
    return normalize_text(text)
