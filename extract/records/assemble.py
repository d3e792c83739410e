"""The first pass: a Document in, one Proposal per reported data point out, in document order.

Text sentences (:mod:`extract.records.from_text`) and table cells
(:mod:`extract.records.from_tables`) give drafts; :mod:`extract.records.link` fills their gaps from
the article (methods statements, group sizes), derives SDs, normalises units, scores confidence and
gives stable ids. Every proposal is a suggestion for a curator to verify against the article; none
is a basis for a clinical decision.
"""

from __future__ import annotations

import logging
from typing import Any

from extract.ingest.document import Document
from extract.records.draft import Draft
from extract.records.from_tables import table_drafts, table_order
from extract.records.from_text import text_drafts
from extract.records.link import finish, link_unit, read_context, units_by_outcome
from extract.records.proposal import Proposal

__all__ = ["first_pass", "drafts_of"]

log = logging.getLogger(__name__)


def drafts_of(document: Document) -> list[Draft]:
    """All drafts of a document (text and tables), in document order, before linking."""
    drafts = text_drafts(document)
    for index, table in enumerate(document.tables):
        drafts.extend(table_drafts(document, table, order=table_order(document, table, index)))
    drafts.sort(key=lambda d: d.order)
    return drafts


def first_pass(document: Document, *, nlp: Any = None) -> list[Proposal]:
    """Every reported data point of the article as a Proposal, in document order.

    Args:
        document: the article as ingest read it.
        nlp: a spaCy pipeline to reuse. The rule-based first pass reads sentences and cells with
            its own patterns and needs none; the argument keeps the signature shared with
            pipelines that carry trained components.

    Returns:
        Proposals with every contract field filled where the article gives it; ``flags`` say
        what was inferred (e.g. "n_from_methods", "dispersion_kind_assumed", "unknown_unit").
    """
    del nlp  # reserved for trained components; the rules need no pipeline
    context = read_context(document)
    proposals: list[Proposal] = []
    seen: set[str] = set()
    drafts = drafts_of(document)
    units = units_by_outcome(drafts)
    for draft in drafts:
        draft = link_unit(draft, units)
        if not draft.outcome:
            draft = draft.with_flag("no_outcome")
        proposal = finish(draft, context)
        if proposal.id in seen:
            continue
        seen.add(proposal.id)
        proposals.append(proposal)
    log.info("%s: %d proposals", document.name, len(proposals))
    return proposals
