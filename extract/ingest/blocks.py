"""Text blocks to Document blocks and sections: the title, headings and section spans.

Short bold or larger blocks are headings; a heading that names a canonical section opens it
(see :func:`~extract.ingest.sections.heading_section`), any other keeps the current section.
A section's page range covers its own text, not floats (tables, their captions and notes).
"""

from __future__ import annotations

import re
from typing import Any

from extract.ingest.document import Block, Section
from extract.ingest.layout import RawBlock
from extract.ingest.sections import heading_section


def blocks_and_sections(
    raw_blocks: list[RawBlock],
    kinds: dict[int, tuple[str, str | None]],
    body_size: float,
) -> tuple[list[Block], list[Section], str | None]:
    title_index = _title_index(raw_blocks, kinds, body_size)
    title = raw_blocks[title_index].text if title_index is not None else None
    blocks: list[Block] = []
    section = "other" if title_index is not None else "other"
    heading: str | None = None
    spans: list[list[Any]] = []
    for i, raw in enumerate(raw_blocks):
        kind, label = kinds.get(i, ("paragraph", None))
        text = raw.text
        if i == title_index:
            kind, section, heading = "title", "title", None
            spans.append(["title", text, len(blocks)])
        elif kind == "paragraph" and _is_heading(raw, body_size):
            name = heading_section(text)
            kind = "heading"
            if name is not None:
                section, heading = name, text
                spans.append([name, text, len(blocks)])
        elif (
            kind == "paragraph"
            and section in ("title", "other")
            and re.match(r"^(abstract|summary)\b", text, re.IGNORECASE)
        ):
            section, heading = "abstract", text.split()[0]
            spans.append(["abstract", heading, len(blocks)])
        blocks.append(
            Block(
                index=len(blocks),
                kind=kind,
                text=text,
                section=section,
                page=raw.page,
                bbox=raw.bbox,
                column=raw.column,
                heading=heading,
                label=label,
            )
        )
    sections: list[Section] = []
    for n, (name, head, first) in enumerate(spans):
        last = (spans[n + 1][2] - 1) if n + 1 < len(spans) else len(blocks) - 1
        if last < first:
            continue
        members = blocks[first : last + 1]
        # a section runs over the pages of its own text; floats (tables, their captions and
        # notes) and subheadings such as a "Tables" page heading do not extend it
        running = [b for b in members[1:] if _is_section_text(b)] or members
        sections.append(
            Section(
                name=name,
                heading=head,
                page_start=members[0].page,
                page_end=max(b.page or 0 for b in [members[0], *running]),
                first_block=first,
                last_block=last,
            )
        )
    return blocks, sections, title


def _is_section_text(block: Block) -> bool:
    """Whether a block is running text of its section (paragraphs and figure legends)."""
    if block.kind == "caption":
        return (block.label or "").startswith("Figure")
    return block.kind in ("paragraph", "title")


def _title_index(
    raw_blocks: list[RawBlock], kinds: dict[int, tuple[str, str | None]], body_size: float
) -> int | None:
    first = [(i, b) for i, b in enumerate(raw_blocks) if b.page == 1 and i not in kinds]
    if not first:
        return None
    biggest = max(b.size for _, b in first)
    if biggest < body_size + 1.5:
        return None
    for i, block in first:
        if block.size == biggest and len(block.text) > 10:
            return i
    return None


def _is_heading(block: RawBlock, body_size: float) -> bool:
    text = block.text.strip()
    if len(block.lines) > 2 or len(text) > 90 or not text:
        return False
    if text.endswith((".", ",", ";")) and heading_section(text) is None:
        return False
    if heading_section(text) is not None and (
        block.bold or block.size > body_size + 0.4 or text.isupper() or len(block.lines) == 1
    ):
        return len(text.split()) <= 6
    return block.bold or block.size > body_size + 0.9
