"""Documents as stored JSON, and where a proposal sits in its document's reading order.

The store keeps each Document's blocks, sections and tables (not its words) as JSON, so the review
can show sentences and draw table grids without the article file. :func:`document_from_dict`
rebuilds the frozen dataclasses from that JSON.
"""

from __future__ import annotations

import json
from typing import Any

from extract.ingest.document import Block, Document, Page, Section, Table, TableCell, Word
from extract.records.proposal import Proposal


def _bbox(value: Any) -> tuple[float, float, float, float] | None:
    if value is None:
        return None
    x0, top, x1, bottom = (float(v) for v in value)
    return (x0, top, x1, bottom)


def document_to_json(document: Document) -> str:
    """The document (without words) as compact JSON text."""
    return json.dumps(document.to_dict(words=False), ensure_ascii=False, separators=(",", ":"))


def document_from_dict(data: dict[str, Any]) -> Document:
    """The Document that :meth:`Document.to_dict` turned into ``data``."""
    pages = tuple(Page(**p) for p in data.get("pages", ()))
    blocks = tuple(Block(**{**b, "bbox": _bbox(b.get("bbox"))}) for b in data.get("blocks", ()))
    sections = tuple(Section(**s) for s in data.get("sections", ()))
    tables = tuple(_table_from_dict(t) for t in data.get("tables", ()))
    words = tuple(
        Word(**{**w, "bbox": _bbox(w["bbox"])})  # type: ignore[arg-type]
        for w in data.get("words", ())
    )
    return Document(
        path=data["path"],
        name=data["name"],
        source=data["source"],
        sha256=data["sha256"],
        doi=data.get("doi"),
        title=data.get("title"),
        pages=pages,
        blocks=blocks,
        sections=sections,
        tables=tables,
        words=words,
    )


def _table_from_dict(data: dict[str, Any]) -> Table:
    cells = tuple(TableCell(**{**c, "bbox": _bbox(c.get("bbox"))}) for c in data["cells"])
    return Table(
        **{
            **data,
            "footnotes": tuple(data.get("footnotes", ())),
            "pages": tuple(data.get("pages", ())),
            "bbox": _bbox(data.get("bbox")),
            "cells": cells,
            "column_units": tuple(data.get("column_units", ())),
            "row_units": tuple(data.get("row_units", ())),
        }
    )


def _contains(outer: tuple[float, float, float, float], x: float, y: float) -> bool:
    return outer[0] - 1 <= x <= outer[2] + 1 and outer[1] - 1 <= y <= outer[3] + 1


def reading_position(proposal: Proposal, document: Document | None) -> tuple[int, float]:
    """The ``(page, position)`` sort key of a proposal in its document's reading order.

    The position is the index of the block the source lies in (a text source by its box or its
    quote, a table source by the caption block labelled with the table), plus a fraction for the
    table cell or the vertical offset; without a document, the vertical offset on the page.
    Sources without a page (XML) sort as page 0.
    """
    source = proposal.source
    page = source.page or 0
    blocks = document.blocks if document is not None else ()
    if source.kind == "table" and source.table:
        for block in blocks:
            if block.label == source.table and block.kind == "caption":
                row = (source.row or 0) + 1
                col = (source.col or 0) + 1
                return page, block.index + min(row * 0.001 + col * 0.000001, 0.999)
    if source.bbox is not None:
        x = (source.bbox[0] + source.bbox[2]) / 2
        y = (source.bbox[1] + source.bbox[3]) / 2
        for block in blocks:
            if block.page == source.page and block.bbox and _contains(block.bbox, x, y):
                offset = (y - block.bbox[1]) / max(block.bbox[3] - block.bbox[1], 1.0)
                return page, block.index + min(max(offset, 0.0), 0.999)
        if not blocks:
            return page, source.bbox[1]
    if source.quote:
        for block in blocks:
            if source.quote in block.text and (source.page is None or block.page == source.page):
                return page, block.index + block.text.index(source.quote) / (len(block.text) + 1)
    if source.ref:
        for block in blocks:
            if block.ref == source.ref:
                return page, float(block.index)
    return page, float(len(blocks))
