"""Read JATS XML articles into the :class:`~extract.ingest.document.Document` model.

The parser never resolves entities, loads a DTD or touches the network: a DOCTYPE naming a DTD
on the web is read and ignored. Blocks carry ``ref``, the element's path from the ``article``
root (``body/sec[2]/p[3]``; ``root.xpath(ref)`` finds it again) and no page or box.

Reading order is document order: the title, each abstract, the body, the back matter (sections,
acknowledgements, appendices, references) and a trailing ``floats-group``. Figures and tables
stay where the XML places them; their captions become ``caption`` blocks reading as printed
("Figure 1. Caption text", with ``label`` "Figure 1"), and table footnotes ``footnote`` blocks with
the table's label. See docs/jats.md.
"""

from __future__ import annotations

import hashlib
import logging
import re
from dataclasses import dataclass, field
from pathlib import Path

from lxml import etree

from extract.errors import XMLReadError
from extract.ingest.document import Block, Document, Section, Table
from extract.ingest.jats_sections import section_name
from extract.ingest.jats_tables import caption_text, footnote_texts, label_text, table_from_wrap
from extract.ingest.jats_text import BLOCK_TAGS, element_text, localname, spaced_text

logger = logging.getLogger(__name__)

SOURCE = "jats"

#: How many leading bytes :func:`is_jats_bytes` looks at.
SNIFF_BYTES = 8192

#: Abstract types that are not the article's abstract (author summaries, teasers ...).
OTHER_ABSTRACT_TYPES = frozenset(
    {
        "summary",
        "executive-summary",
        "editors-summary",
        "editor-summary",
        "teaser",
        "toc",
        "graphical",
        "web-summary",
        "precis",
    }
)

#: Children of a container that are read by their owner or hold no text to read.
SKIPPED = frozenset(
    {"", "title", "label", "caption", "object-id", "sec-meta", "disp-formula", "graphic", "media"}
)

_PROLOG = re.compile(
    rb"^(?:\s+|<\?.*?\?>|<!--.*?-->|<!DOCTYPE\s+(?P<doctype>[^\[>]*(?:\[.*?\])?\s*)>)*",
    re.DOTALL,
)
_ROOT = re.compile(rb"<(?P<tag>[A-Za-z_][\w.\-]*)(?P<attrs>[^>]*)>", re.DOTALL)
_JATS_DOCTYPE = re.compile(
    rb"JATS|NLM|Journal Publishing|Journal Archiving|Article Authoring|BITS", re.IGNORECASE
)
_JATS_ATTRS = re.compile(rb"\b(?:dtd-version|article-type|xmlns:xlink|xmlns:mml)\s*=")
_DEFAULT_NS = re.compile(rb"\bxmlns\s*=\s*[\"']([^\"']*)[\"']")


def is_jats_bytes(head: bytes) -> bool:
    """Whether the first bytes of a file look like a JATS XML article.

    The dispatcher calls this on the first few kilobytes (:data:`SNIFF_BYTES`). A JATS file
    has, after the XML declaration, comments and DOCTYPE, a root element ``<article`` with no
    foreign default namespace, and either a DOCTYPE naming a JATS/NLM DTD or one of the
    attributes JATS articles carry (``dtd-version``, ``article-type``, ``xmlns:xlink``,
    ``xmlns:mml``). UTF-8 (with or without BOM) and UTF-16 heads are understood.

    Args:
        head: the file's first bytes.

    Returns:
        True for a JATS article head; False otherwise (also when the head is cut before the
        root element).
    """
    if head.startswith((b"\xff\xfe", b"\xfe\xff")):
        head = head.decode("utf-16", errors="ignore").encode("utf-8")
    head = head.removeprefix(b"\xef\xbb\xbf")
    prolog = _PROLOG.match(head)
    rest = head[prolog.end() :] if prolog else head
    root = _ROOT.match(rest)
    if root is None or root.group("tag") != b"article":
        return False
    attrs = root.group("attrs")
    namespace = _DEFAULT_NS.search(attrs)
    if namespace and b"jats" not in namespace.group(1).lower():
        return False
    doctype = prolog.group("doctype") if prolog else None
    return bool(doctype and _JATS_DOCTYPE.search(doctype)) or bool(_JATS_ATTRS.search(attrs))


@dataclass
class _Builder:
    """Collects blocks, sections and tables while walking the article in document order."""

    path: Path
    root: etree._Element
    blocks: list[Block] = field(default_factory=list)
    sections: list[Section] = field(default_factory=list)
    tables: list[Table] = field(default_factory=list)
    image_tables: list[str] = field(default_factory=list)
    n_table_wraps: int = 0

    def ref(self, element: etree._Element) -> str:
        path = str(self.root.getroottree().getpath(element))
        return path.removeprefix("/article/").removeprefix("/article")

    def add(
        self,
        kind: str,
        text: str,
        section: str,
        element: etree._Element,
        *,
        heading: str | None = None,
        label: str | None = None,
    ) -> None:
        if kind == "caption" and label:
            # As printed: "Figure 1. Caption text" (the label is also kept in Block.label).
            text = f"{label}. {text}" if text else label
        if not text:
            return
        self.blocks.append(
            Block(
                index=len(self.blocks),
                kind=kind,
                text=text,
                section=section,
                heading=heading,
                label=label or None,
                ref=self.ref(element),
            )
        )

    def close_section(self, name: str, heading: str, first: int) -> None:
        if len(self.blocks) > first:
            self.sections.append(Section(name, heading, None, None, first, len(self.blocks) - 1))

    # --- walking -----------------------------------------------------------------------------

    def container(self, element: etree._Element, section: str, heading: str | None) -> None:
        """Blocks of an element that holds other blocks (sec, abstract, list, boxed-text ...)."""
        own = _heading_text(element)
        if own:
            self.add("heading", own, section, _title_of(element), heading=own)
            heading = own
        for child in element:
            self.item(child, section, heading)

    def item(self, element: etree._Element, section: str, heading: str | None) -> None:
        """Blocks of one child of a container, by its kind."""
        tag = localname(element)
        if tag in SKIPPED:
            return
        if tag == "p":
            self.add("paragraph", element_text(element), section, element, heading=heading)
            for nested in _nested_blocks(element):
                self.item(nested, section, heading)
        elif tag in ("fig", "fig-group"):
            self.add(
                "caption",
                caption_text(element),
                section,
                element,
                heading=heading,
                label=label_text(element),
            )
            for figure in (c for c in element if localname(c) == "fig"):
                self.item(figure, section, heading)
        elif tag == "table-wrap":
            self.table_wrap(element, section, heading, group_label="")
        elif tag == "table-wrap-group":
            group_label = label_text(element)
            self.add(
                "caption",
                caption_text(element),
                section,
                element,
                heading=heading,
                label=group_label,
            )
            wraps = [c for c in element if localname(c) == "table-wrap"]
            for i, child in enumerate(wraps):
                letter = chr(ord("A") + i) if i < 26 else f".{i + 1}"
                fallback = (
                    f"{group_label}{letter}" if group_label and len(wraps) > 1 else group_label
                )
                self.table_wrap(child, section, heading, group_label=fallback)
        elif tag == "supplementary-material":
            self.add(
                "caption",
                caption_text(element),
                section,
                element,
                heading=heading,
                label=label_text(element),
            )
        elif tag == "ref":
            self.add(
                "other",
                spaced_text(element),
                section,
                element,
                heading=heading,
                label=label_text(element),
            )
        else:
            self.container(element, section, heading)

    def table_wrap(
        self, wrap: etree._Element, section: str, heading: str | None, *, group_label: str
    ) -> None:
        """A table (grid, caption block, footnote blocks), or a note when it is an image."""
        self.n_table_wraps += 1
        label = label_text(wrap) or group_label or f"Table {self.n_table_wraps}"
        caption = caption_text(wrap)
        parent = wrap.getparent()
        if not caption and parent is not None and localname(parent) == "table-wrap-group":
            caption = caption_text(parent)
        self.add("caption", caption, section, wrap, heading=heading, label=label)
        table = table_from_wrap(
            wrap, label=label, caption=caption, section=section, ref=self.ref(wrap)
        )
        if table is None:
            self.image_tables.append(label)
        else:
            self.tables.append(table)
        for note in footnote_texts(wrap):
            self.blocks.append(
                Block(
                    index=len(self.blocks),
                    kind="footnote",
                    text=note,
                    section=section,
                    heading=heading,
                    label=label,
                    ref=self.ref(wrap) + "/table-wrap-foot",
                )
            )

    def top_level(self, element: etree._Element, name: str, heading: str) -> None:
        """A top-level part that becomes one :class:`Section`."""
        first = len(self.blocks)
        self.container(element, name, heading or None)
        self.close_section(name, heading, first)


def _title_of(element: etree._Element) -> etree._Element:
    title = next((c for c in element if localname(c) == "title"), None)
    return title if title is not None else element


def _title_only(element: etree._Element) -> str:
    title = next((c for c in element if localname(c) == "title"), None)
    return element_text(title) if title is not None else ""


def _heading_text(element: etree._Element) -> str:
    """The element's own heading: its label and title, separated by a space."""
    title = next((c for c in element if localname(c) == "title"), None)
    if title is None:
        return ""
    label = label_text(element) if localname(element) in ("sec", "app", "ack") else ""
    return " ".join(p for p in (label, element_text(title)) if p)


def _nested_blocks(paragraph: etree._Element) -> list[etree._Element]:
    """Block-level elements inside a paragraph, outermost only, in document order."""
    found: list[etree._Element] = []
    for element in paragraph.iterdescendants():
        if localname(element) not in BLOCK_TAGS:
            continue
        if any(a in found for a in element.iterancestors()):
            continue
        found.append(element)
    return found


def _parse(path: Path, data: bytes) -> etree._Element:
    parser = etree.XMLParser(
        resolve_entities=False,
        no_network=True,
        load_dtd=False,
        dtd_validation=False,
        huge_tree=False,
        remove_comments=True,
        remove_pis=True,
    )
    try:
        root = etree.fromstring(data, parser)
    except etree.XMLSyntaxError as error:
        message = str(error.msg or error).strip()
        if "line" not in message:
            message = f"{message}, line {error.lineno}"
        raise XMLReadError(path, f"malformed XML: {message}") from error
    tag = root.tag if isinstance(root.tag, str) else str(root.tag)
    if tag != "article":
        raise XMLReadError(path, f"not a JATS article (root element <{tag}>)")
    if root.find("front") is None:
        raise XMLReadError(path, "not a JATS article (root element <article> without <front>)")
    return root


def read_jats(path: Path) -> Document:
    """Read a JATS XML article.

    Args:
        path: the XML file.

    Returns:
        A :class:`Document` with ``source="jats"``: DOI, title, blocks in document order
        (title, abstract, headings, paragraphs, captions, table footnotes, references) with
        canonical section names, sections, and tables as full grids. Pages, words and boxes
        are empty.

    Raises:
        XMLReadError: the file cannot be read, is malformed XML, or is not a JATS article.
    """
    path = Path(path)
    try:
        data = path.read_bytes()
    except OSError as error:
        raise XMLReadError(path, f"cannot read file ({error.strerror or error})") from error
    root = _parse(path, data)
    builder = _Builder(path=path, root=root)
    front = root.find("front")
    meta = front.find("article-meta") if front is not None else None
    title_element = meta.find("title-group/article-title") if meta is not None else None
    title = element_text(title_element) if title_element is not None else None
    doi = _doi(meta)
    if title_element is not None and title:
        first = len(builder.blocks)
        builder.add("title", title, "title", title_element)
        builder.close_section("title", title, first)
    for abstract in meta.findall("abstract") if meta is not None else []:
        kind = abstract.get("abstract-type")
        name = "other" if kind in OTHER_ABSTRACT_TYPES else "abstract"
        heading = _heading_text(abstract) or ("Abstract" if name == "abstract" else kind or "")
        builder.top_level(abstract, name, heading)
    body = root.find("body")
    if body is None:
        logger.warning("%s: JATS article without <body>: only the front matter is read", path)
    else:
        _read_body(builder, body)
    back = root.find("back")
    if back is not None:
        _read_back(builder, back)
    floats = root.find("floats-group")
    if floats is not None:
        builder.top_level(floats, "legends", "")
    if builder.image_tables:
        logger.warning(
            "%s: %d table(s) given only as images, read without a grid: %s",
            path,
            len(builder.image_tables),
            ", ".join(builder.image_tables),
        )
    return Document(
        path=str(path),
        name=path.stem,
        source=SOURCE,
        sha256=hashlib.sha256(data).hexdigest(),
        doi=doi,
        title=title or None,
        pages=(),
        blocks=tuple(builder.blocks),
        sections=tuple(builder.sections),
        tables=tuple(builder.tables),
    )


def _doi(meta: etree._Element | None) -> str | None:
    if meta is None:
        return None
    for article_id in meta.findall("article-id"):
        if article_id.get("pub-id-type") == "doi":
            value = element_text(article_id)
            return value or None
    return None


def _read_body(builder: _Builder, body: etree._Element) -> None:
    """Top-level sections of the body; loose content before the first one is the introduction."""
    has_sections = any(localname(c) == "sec" for c in body)
    current, heading = ("introduction" if has_sections else "other"), ""
    loose_first: int | None = None
    for child in body:
        if localname(child) == "sec":
            if loose_first is not None:
                builder.close_section(current, heading, loose_first)
                loose_first = None
            heading = _heading_text(child)
            current = section_name(_title_only(child), child.get("sec-type"))
            builder.top_level(child, current, heading)
        else:
            if loose_first is None:
                loose_first = len(builder.blocks)
            builder.item(child, current, heading or None)
    if loose_first is not None:
        builder.close_section(current, heading, loose_first)


def _read_back(builder: _Builder, back: etree._Element) -> None:
    """Back matter: references, acknowledgements, appendices and other sections."""
    for child in back:
        tag = localname(child)
        heading = _heading_text(child)
        if tag == "ref-list":
            builder.top_level(child, "references", heading or "References")
        elif tag == "sec":
            name = section_name(_title_only(child), child.get("sec-type"))
            builder.top_level(child, name, heading)
        elif tag == "ack":
            builder.top_level(child, "other", heading or "Acknowledgements")
        elif tag:
            builder.top_level(child, "other", heading)
