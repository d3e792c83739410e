"""A naive baseline for the evaluation: every quantity quantulum3 finds in the running text.

The baseline reads each page's text blocks with quantulum3 and makes one record per quantity it
finds: the number, the unit as written after it, a "±" spread taken as an SD. It reads no tables,
links no sample size, group or outcome, and keeps doses, ages and counts alongside the outcomes.
It is what a plain quantity parser gives without winnow's work, so the evaluation can show how far
the first pass is above it. Its records, like all proposals, need a curator's verification.
"""

from __future__ import annotations

import logging
import re
import warnings
from pathlib import Path
from typing import Any

from extract.ingest.document import Document
from extract.records.proposal import Dispersion, Proposal, Source, make_id

log = logging.getLogger(__name__)

#: Extractor id of the baseline's records.
BASELINE_NAME = "baseline.quantulum3"
BASELINE_VERSION = "0.1.0"
BASELINE_EXTRACTOR = f"{BASELINE_NAME}@{BASELINE_VERSION}"

#: Block kinds the baseline reads (running text of the page, no table cells).
TEXT_KINDS: frozenset[str] = frozenset({"paragraph", "caption", "footnote", "other"})

_LEADING_NUMBER = re.compile(
    r"^\s*[-−+]?\d[\d,]*(?:\.\d+)?(?:\s*(?:±|\+/-|\+-)\s*\d[\d,]*(?:\.\d+)?)?\s*"
)

_parser: Any = None


def _quantulum() -> Any:
    """The quantulum3 parser, with its unit classifier switched off (see STACK-NOTES)."""
    global _parser
    if _parser is None:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            import quantulum3.classifier as classifier

            classifier.USE_CLF = False
            from quantulum3 import parser

        _parser = parser
    return _parser


def _unit_as_written(surface: str, unit_name: str) -> str | None:
    if unit_name == "dimensionless":
        return None
    rest = _LEADING_NUMBER.sub("", surface).strip()
    return rest or None


def quantities_in(text: str) -> list[tuple[float, float | None, str | None, str, int]]:
    """The quantities quantulum3 finds in ``text``.

    Returns:
        ``(value, uncertainty, unit as written, surface, start offset)`` per quantity.
    """
    parser = _quantulum()
    found = []
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        quantities = parser.parse(text)
    for quantity in quantities:
        value = float(quantity.value)
        uncertainty = float(quantity.uncertainty) if quantity.uncertainty is not None else None
        unit = _unit_as_written(quantity.surface, quantity.unit.name)
        found.append((value, uncertainty, unit, str(quantity.surface), int(quantity.span[0])))
    return found


def baseline_proposals(document: Document) -> list[Proposal]:
    """One record per quantity quantulum3 finds in the document's text blocks.

    Args:
        document: an article read by :func:`extract.ingest.read_document`.

    Returns:
        The baseline's proposals, in reading order.
    """
    article = document.doi or document.name
    file = Path(document.path).name
    proposals: list[Proposal] = []
    for block in document.blocks:
        if block.kind not in TEXT_KINDS:
            continue
        for value, uncertainty, unit, surface, start in quantities_in(block.text):
            dispersion = Dispersion("SD", abs(uncertainty)) if uncertainty is not None else None
            proposals.append(
                Proposal(
                    id=make_id(article, BASELINE_EXTRACTOR, block.index, start, surface),
                    article=article,
                    file=file,
                    outcome="",
                    group=None,
                    statistic="percent" if unit == "%" else "single",
                    value=value,
                    unit=unit,
                    unit_ucum=None,
                    value_normalized=None,
                    unit_normalized=None,
                    dispersion=dispersion,
                    sd=abs(uncertainty) if uncertainty is not None else None,
                    n=None,
                    time_point=None,
                    method=None,
                    subject=None,
                    intervention=None,
                    source=Source.of_text(block, surface, bbox=block.bbox),
                    extractor=BASELINE_EXTRACTOR,
                    confidence=0.5,
                )
            )
    return proposals
