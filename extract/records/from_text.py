"""Sentences to drafts: each outcome measurement in results, abstract and legend text.

The nlp pipeline (:func:`extract.nlp.pipeline.analyze`) splits each block into sentences and
reads every number with its role, unit and spread, the outcome of each measure, the sample sizes
and the context (time points, groups, subjects, methods, interventions). This module decides
which measures are data points and links each to its group, n and context:

* a measure is a data point when it prints a spread, is a count with its percentage, or is a
  bare value with a unit that the clause names ("liver mass was 1.24 g");
* the group is the one named between the value and the next data point ("... in the vehicle
  group", "... with BDC 20 mg/kg"), else the one named before it in its clause;
* n is the group's "(n = 9)" in the same stretch, the denominator of a count ("31 (31%) of 100
  participants"), or the sentence's per-group statement;
* the time point is the sentence's own, else the one an earlier sentence of the paragraph set.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from extract.ingest.document import Block, Document
from extract.nlp.context import ContextMention, load_lexicon
from extract.nlp.pipeline import SentenceFindings, analyze
from extract.nlp.quantities import Quantity, find_dispersion_statement
from extract.nlp.sample_size import SampleSize
from extract.records.draft import Draft
from extract.records.patterns import find_group_n
from extract.records.proposal import Source
from extract.registry import register_extractor
from extract.units import is_known_unit

#: The extractor that reads sentences (the records-level reader over the nlp components).
EXTRACTOR = "text.sentences@7"

#: Sections whose sentences report data points.
TEXT_SECTIONS: tuple[str, ...] = ("abstract", "results", "legends")

#: Words between an outcome and a bare value that make "<outcome> was <value>".
_LINK_GAP = re.compile(
    r"^\s*(?:(?:in|of|for|among)\s+[^,;]{1,40}?\s+)?(?:was|were|is|are|averaged|reached|measured|"
    r"of|amounted to|totalled|totaled|stood at|(?:rose|fell|increased|decreased|declined|dropped)"
    r"\s+to)\s+(?:(?:approximately|about|a mean of|a median of|mean|median)\s+)?$",
    re.I,
)
_DOSE = re.compile(r"\d\s*(?:mg|µg|μg|ug|g|mL|nmol|µmol|μmol|mmol|IU|U|mM|µM|μM|nM)\b")
#: A value that pools every group: "across the three arms", "in all participants", "overall".
_POOLED = re.compile(
    r"\bacross\s+(?:the\s+|all\s+|both\s+)?(?:\w+\s+)?(?:arms|groups|cohorts)\b"
    r"|\b(?:in|of)\s+all\s+(?:\w+\s+)?(?:participants|patients|subjects|animals|arms|groups)\b",
    re.I,
)
#: A sentence about a subset named by what happened to it ("Among responders given X, ..."):
#: the group's n does not count it.
_SUBSET = re.compile(r"^\s*Among\s+(?:the\s+)?(?P<who>[a-z][a-z-]*)\b(?![\s\d]*\d)", re.I)
_SUBJECT_NOUNS = frozenset(w.lower() for w in load_lexicon("subjects"))
#: Words that end one clause's claim on a sample size: "..., whereas", "; ", " and ".
_CLAUSE_BREAK = re.compile(r";|\bwhereas\b|\bwhile\b|\band\b|\bbut\b", re.I)


@dataclass(frozen=True)
class _Span:
    """Where one data point's own stretch of the sentence starts and ends."""

    start: int
    end: int


def is_debris(text: str) -> bool:
    """True for text made only of numbers and units (table cells left in the text flow).

    A sentence has at least one lowercase word that is no unit ("was", "are"); "18.8 (1.8)
    nmol/mg 19.5 (2.6) nmol/mg", "1211 (196) RFU" and a row "Hour 30 42.0 ± 3.7" have none.
    """
    return not any(
        re.fullmatch(r"[a-z]{3,}[.,;:]?", word) and not is_known_unit(word.rstrip(".,;:"))
        for word in text.split()
    )


def is_data_point(quantity: Quantity, outcome: ContextMention | None, text: str) -> bool:
    """Whether a measure found by nlp is a data point (see the module docstring)."""
    if quantity.role != "measure":
        return False
    if quantity.spread is not None and not quantity.flags.count("range_only"):
        return True
    if quantity.percent is not None or quantity.total is not None:
        return True
    if quantity.unit is None or outcome is None:
        return False
    return bool(_LINK_GAP.match(text[outcome.end : quantity.start]))


def _group_in(text: str, mentions: list[ContextMention], span: _Span, *, after: int) -> str | None:
    """The group named after the value, before the clause ends ("... in the vehicle group")."""
    cut = _CLAUSE_BREAK.search(text, after, span.end)
    end = cut.start() if cut else span.end
    for mention in mentions:
        if mention.kind == "group" and after <= mention.start < end:
            return mention.value
    return None


def _group_before(text: str, mentions: list[ContextMention], start: int, value: int) -> str | None:
    """A group named in the clause before the value ("In the vehicle group, X was ...")."""
    found = [(m.start, m.value) for m in mentions if m.kind == "group" and start <= m.start < value]
    return max(found)[1] if found else None


def _intervention(
    mentions: list[ContextMention], group: str | None, span: _Span, start: int
) -> str | None:
    """The data point's treatment: its group when the group names a dose, else the nlp
    intervention mention in the data point's own stretch of the sentence."""
    if group and _DOSE.search(group):
        return group
    for mention in mentions:
        if mention.kind == "intervention" and start <= mention.start < span.end:
            return mention.value
    return None


def _n_for(
    sizes: tuple[SampleSize, ...], quantity: Quantity, span: _Span, start: int, text: str
) -> int | None:
    """The n of one data point: the denominator of a count, else its group's "(n = 9)"."""
    for size in sizes:
        if (
            quantity.statistic == "count"
            and size.n
            and size.start >= quantity.end
            and re.fullmatch(r"\s*of\s*", text[quantity.end : size.start])
        ):
            return size.n
    stretch = [s for s in sizes if s.scope == "group" and s.n and start <= s.start < span.end]
    stretch = [s for s in stretch if s.start >= quantity.end or s.start >= start]
    after = [
        s
        for s in stretch
        if s.start >= quantity.end and not _CLAUSE_BREAK.search(text[quantity.end : s.start])
    ]
    if after:
        return after[0].n
    before = [s for s in stretch if s.start < quantity.start]
    return before[-1].n if before else None


def _source(block: Block, text: str) -> Source:
    return Source.of_text(block, text.strip(), bbox=block.bbox)


def sentence_drafts(
    block: Block, findings: SentenceFindings, *, order: float, time_point: str | None
) -> list[Draft]:
    """Drafts for each data point of one analysed sentence of ``block``.

    Args:
        block: the block the sentence belongs to (page, box, section).
        findings: what the nlp pipeline found in the sentence (offsets into the block text).
        order: the block's place in reading order.
        time_point: the time point an earlier sentence of the block set, if any.
    """
    text = block.text
    points = [
        (q, o)
        for q, o in zip(findings.quantities, findings.outcomes, strict=True)
        if is_data_point(q, o, text)
    ]
    if not points:
        return []
    mentions = list(findings.context)
    context = {m.kind: m.value for m in reversed(mentions) if m.kind != "group"}
    per_group = find_group_n(findings.text)
    sentence = findings.text
    subset = _SUBSET.match(sentence)
    is_subset = (
        subset is not None
        and subset["who"].lower() not in _SUBJECT_NOUNS
        and subset["who"].lower() not in ("the", "these", "those", "them", "all", "both")
    )
    drafts: list[Draft] = []
    previous_end = findings.start
    source = _source(block, findings.text)
    for index, (quantity, outcome) in enumerate(points):
        next_start = points[index + 1][0].start if index + 1 < len(points) else findings.end
        span = _Span(quantity.start, next_start)
        group = _group_in(text, mentions, span, after=quantity.end)
        how_group = "sentence"
        if group is None:
            group = _group_before(text, mentions, previous_end, quantity.start)
        n = _n_for(findings.sample_sizes, quantity, span, previous_end, text)
        pooled = group is None and _POOLED.search(text, quantity.end, span.end) is not None
        time = _time_before(mentions, quantity.start) or time_point
        previous_end = quantity.end
        statistic: str | None = None
        if quantity.statistic == "count":
            statistic = "count"
        elif quantity.statistic == "percent" and quantity.spread is None:
            statistic = "percent"
        elif quantity.statistic == "median":
            statistic = "median"
        spread = quantity.spread
        draft = Draft(
            order=(order, quantity.start),
            outcome=outcome.value if outcome else "",
            group=group,
            statistic=statistic,
            value=quantity.value,
            raw=quantity.text,
            unit=quantity.unit,
            dispersion_kind=spread.kind if spread else None,
            dispersion_value=spread.value if spread and statistic != "count" else None,
            n=None,
            source=source,
            extractor=EXTRACTOR,
            location=(block.index, quantity.start),
            method=context.get("method"),
            subject=context.get("subject"),
            intervention=_intervention(mentions, group, span, previous_end),
        ).with_found("value", "value")
        if outcome:
            draft = draft.with_found("outcome", "sentence")
        if group:
            draft = draft.with_found("group", how_group)
        if quantity.unit:
            draft = draft.with_found("unit", "value")
        if spread is not None and spread.kind is not None:
            how = "value" if spread.kind_from == "text" else "legend"
            draft = draft.with_found("dispersion", how)
        if pooled:
            draft = draft.with_flag("pooled")
        if is_subset and n is None:
            draft = draft.with_flag("n_subset")
        elif n is not None:
            draft = draft.with_found("n", "sentence", n=n)
        elif per_group is not None:
            draft = draft.with_found("n", "sentence", n=per_group)
        if time:
            how = "sentence" if _time_before(mentions, quantity.start) else "paragraph"
            draft = draft.with_found("time_point", how, time_point=time)
        drafts.append(draft)
    return drafts


def _time_before(mentions: list[ContextMention], position: int) -> str | None:
    """The sentence's time point: the last one named before the value, else the first after."""
    times = [m for m in mentions if m.kind == "time_point"]
    before = [m for m in times if m.end <= position]
    if before:
        return before[-1].value
    return times[0].value if times else None


def block_drafts(block: Block) -> list[Draft]:
    """Drafts for every data point of one text block (paragraph or figure legend).

    A legend's or paragraph's statement ("Values are mean ± SEM; n = 6 per group") applies to
    the values of the whole block; a time point set by one sentence carries to the next.
    """
    block_kind = find_dispersion_statement(block.text)
    block_n = find_group_n(block.text)
    how = "legend" if block.kind == "caption" else "paragraph"
    drafts: list[Draft] = []
    time_point: str | None = None
    for findings in analyze(block.text, dispersion=block_kind):
        if not re.search(r"\d", findings.text) or is_debris(findings.text):
            continue
        for draft in sentence_drafts(
            block, findings, order=float(block.index), time_point=time_point
        ):
            if draft.dispersion_value is not None and draft.how("dispersion") is None:
                if draft.dispersion_kind is not None:
                    draft = draft.with_found("dispersion", how)
            if draft.n is None and block_n is not None and "n_subset" not in draft.flags:
                draft = draft.with_found("n", how, n=block_n)
            drafts.append(draft)
        times = [m.value for m in findings.context if m.kind == "time_point"]
        if times:
            time_point = times[-1]
    return drafts


@register_extractor(
    "text.sentences", 7, factory=None, description="measures in sentences, linked to their context"
)
def text_drafts(document: Document, *, sections: tuple[str, ...] = TEXT_SECTIONS) -> list[Draft]:
    """Drafts for every data point in the text of ``sections`` (figure legends included).

    Table captions and footnotes are left to the table reader.
    """
    drafts: list[Draft] = []
    for block in document.blocks:
        if block.kind in ("heading", "title", "footnote"):
            continue
        if block.kind == "caption" and (block.label or "").lower().startswith("table"):
            continue
        if block.section not in sections and block.kind != "caption":
            continue
        if not re.search(r"\d", block.text):
            continue
        drafts.extend(block_drafts(block))
    return drafts
