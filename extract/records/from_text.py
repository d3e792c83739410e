"""Sentences to drafts: each outcome measurement in results, abstract and legend text.

Only sentences with digits are read. In each, every value phrase (:mod:`extract.records.values`)
gets a role from the words around it; only measures become drafts. Doses, ages, p-values, years,
figure/table/reference numbers, time points and sample sizes are context or left out. The outcome
is read from the clause before the value (carried over to later values of the same sentence), the
group from the words after it ("in the vehicle group", "in TLV-treated mice"), n from a "(n = 9)"
beside the group or a per-group statement in the same sentence.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from dataclasses import dataclass

from extract.ingest.document import Block, Document
from extract.records.draft import Draft
from extract.records.patterns import find_dispersion_statement, find_group_n
from extract.records.proposal import Source
from extract.records.values import ValuePhrase, find_value_phrases, has_spread

#: The extractor that reads sentences.
EXTRACTOR = "quantities.rules@1"

#: Sections whose sentences report data points.
TEXT_SECTIONS: tuple[str, ...] = ("abstract", "results", "legends")

_ABBREV = re.compile(
    r"(?:\b(?:Fig|Figs|vs|e\.g|i\.e|al|approx|ca|No|Eq|Ref|Suppl|resp|cf)\.|\b[A-Z]\.)$"
)
_SENTENCE_END = re.compile(r"(?<=[.!?])\s+(?=[A-Z(\[])")
_DOSE_UNIT = re.compile(r"/\s*(?:kg|day|d)\b|^(?:mg|µg|μg|ug|ng|mL|IU)$", re.I)
_TIME_UNIT = re.compile(
    r"^(?:weeks?|wk|days?|d|h|hours?|hrs?|min|minutes?|months?|years?|yr)$", re.I
)
_BEFORE_P = re.compile(r"\b[pP]\s*(?:value)?\s*[=<>≤≥]\s*$")
_BEFORE_N = re.compile(r"\b[nN]\s*[=:]\s*$")
_BEFORE_REF = re.compile(
    r"(?:\bFigs?\.?|\bFigure|\bTable|\bTab\.|\bref\.?|\bpanel|\bSupplementary|\[|\bweek|\bday|\bmonth|\bhour|\bversion|\bv)\s*$",
    re.I,
)
_BEFORE_AGE = re.compile(r"\b(?:aged|age|ages)\s*(?:of\s*)?$", re.I)
_AFTER_AGE = re.compile(r"^[\s-]*(?:weeks?|days?|months?|years?)[\s-]*(?:old|of age)", re.I)
_AFTER_DOSE = re.compile(r"^\s*(?:dose|doses)\b", re.I)
_TIME_POINT = re.compile(
    r"\b(?:at|after|on|by|over|during)\s+((?:week|day|month|hour)\s+\d+|\d+\s+(?:weeks?|days?|months?|hours?|h|min))\b",
    re.I,
)
_CLAUSE_BREAK = re.compile(
    r";|,\s*(?:and|whereas|while|but)\s+|\bwhereas\b|\bwhile\b|\bcompared with\b|:\s"
)
_LINK_VERB = re.compile(
    r"\b(?:was|were|is|are|of|averaged|reached|measured|fell to|rose to|decreased to|increased to|"
    r"declined to|dropped to|of|at|amounted to|totalled|totaled|stood at)\s*$",
    re.I,
)
_GROUP_AFTER = re.compile(
    r"^[^;.]*?\b(?:in|for|among|with|of)\s+(?:the\s+|all\s+)?"
    r"(?P<g>[^,;()]+?)(?:\s+(?:group|groups|arm|cohort|animals|mice|rats|subjects|patients|cells|wells|cultures))\b",
    re.I,
)
_OUTCOME_LEAD = re.compile(
    r"^(?:(?:the|a|an|and|but|mean|median|average|overall|in|by|at|after|on)\b\s*|[A-Z][\w-]*-treated\s+)+",
    re.I,
)


@dataclass(frozen=True)
class Sentence:
    """One sentence of a block with its offset in the block's text."""

    block: Block
    start: int
    text: str


def split_sentences(text: str) -> Iterator[tuple[int, str]]:
    """Sentences of a paragraph with their start offsets (abbreviations like "Fig." do not end one)."""
    start = 0
    for match in _SENTENCE_END.finditer(text):
        head = text[start : match.start()]
        if _ABBREV.search(head):
            continue
        if head.strip():
            yield start, head
        start = match.end()
    if text[start:].strip():
        yield start, text[start:]


def role_of(sentence: str, phrase: ValuePhrase) -> str:
    """The phrase's role in the sentence: "measure" or a kind of context or noise."""
    before = sentence[: phrase.start]
    after = sentence[phrase.end :]
    if _BEFORE_N.search(before):
        return "sample_size"
    if _BEFORE_P.search(before):
        return "p_value"
    if _BEFORE_AGE.search(before) or _AFTER_AGE.match(after):
        return "age"
    if has_spread(phrase) or phrase.percent is not None:
        return "measure"
    if _BEFORE_REF.search(before):
        return "reference"
    if phrase.unit and (_DOSE_UNIT.search(phrase.unit) or _AFTER_DOSE.match(after)):
        return "dose"
    if phrase.unit and _TIME_UNIT.match(phrase.unit):
        return "time"
    if phrase.unit is None and 1900 <= phrase.value <= 2100 and float(phrase.value).is_integer():
        return "year"
    if phrase.unit is None:
        return "other"
    return "measure"


def _clause_start(sentence: str, pos: int) -> int:
    start = 0
    for match in _CLAUSE_BREAK.finditer(sentence, 0, pos):
        start = match.end()
    return start


def outcome_before(sentence: str, phrase: ValuePhrase, previous_end: int) -> str | None:
    """The outcome named in the clause before the value, or ``None`` (then the last one holds)."""
    start = max(_clause_start(sentence, phrase.start), previous_end)
    head = sentence[start : phrase.start]
    verb = _LINK_VERB.search(head)
    if verb is None:
        return None
    name = head[: verb.start()]
    name = re.sub(r"\([^)]*\)", " ", name)
    name = re.sub(
        r"^.*\b(?:had|has|have|showed|shows|displayed|reached)\s+(?:a|an|the)?\s*", "", name
    )
    if "," in name and name.rsplit(",", 1)[1].strip():
        name = name.rsplit(",", 1)[1]
    name = re.sub(
        r"\s+(?:in|of|for|among)\s+(?:the\s+|all\s+)?[^,;]*?(?:group|groups|arm|mice|rats|animals|cells|patients|subjects)\s*$",
        "",
        name.strip(),
        flags=re.I,
    )
    name = re.sub(r"^.*\b(?:group|mice|rats|animals|cells|patients)\b,\s*", "", name, flags=re.I)
    name = _OUTCOME_LEAD.sub("", name.strip(" ,")).strip(" ,")
    if not name or len(name.split()) > 6 or re.search(r"\d", name):
        return None
    return name[:1].lower() + name[1:] if not name[1:2].isupper() else name


_GROUP_BEFORE = re.compile(
    r"\b(?:in|for|among|of)\s+(?:the\s+|all\s+)?(?P<g>[^,;()]+?)(?:-treated)?\s+"
    r"(?:group|groups|arm|cohort|animals|mice|rats|subjects|patients|cells|wells|cultures)\b",
    re.I,
)


def group_before(sentence: str, phrase: ValuePhrase, previous_end: int) -> str | None:
    """A group named in the clause before the value ("In the vehicle group, X was ...")."""
    start = max(_clause_start(sentence, phrase.start), previous_end)
    matches = list(_GROUP_BEFORE.finditer(sentence, start, phrase.start))
    if not matches:
        return None
    group = matches[-1]["g"].strip()
    return group if len(group.split()) <= 5 else None


def group_after(
    sentence: str, phrase: ValuePhrase, next_start: int
) -> tuple[str | None, int | None]:
    """The group named after the value ("in the vehicle group (n = 9)") and its n, if any."""
    tail = sentence[phrase.end : next_start]
    n = None
    n_match = re.search(r"\(\s*n\s*=\s*(\d+)\s*\)|\bn\s*=\s*(\d+)\b(?!\s*(?:per|/|each))", tail)
    if n_match:
        n = int(n_match.group(1) or n_match.group(2))
    match = _GROUP_AFTER.match(tail)
    group = None
    if match:
        group = match["g"].strip()
        group = re.sub(r"^(?:the|all)\s+", "", group, flags=re.I)
        group = re.sub(r"-treated$|\s+treated$", "", group)
        if len(group.split()) > 5:
            group = None
    return group, n


def sentence_drafts(sentence: Sentence, *, order: float) -> list[Draft]:
    """Drafts for each measure in one sentence."""
    text = sentence.text
    phrases = find_value_phrases(text)
    if not phrases:
        return []
    statement_kind = find_dispersion_statement(text)
    group_n = find_group_n(text)
    time_match = _TIME_POINT.search(text)
    drafts: list[Draft] = []
    outcome: str | None = None
    previous_end = 0
    block = sentence.block
    roles = [role_of(text, phrase) for phrase in phrases]
    measure_starts = [p.start for p, r in zip(phrases, roles, strict=True) if r == "measure"]
    for phrase, role in zip(phrases, roles, strict=True):
        found_outcome = outcome_before(text, phrase, previous_end)
        if found_outcome:
            outcome = found_outcome
        if role != "measure":
            continue
        if not (has_spread(phrase) or phrase.percent is not None) and not found_outcome:
            # A bare quantity counts only as "<outcome> was <value>"; elsewhere it is context
            # (a concentration given, a scale bar, a setting).
            continue
        next_start = min((s for s in measure_starts if s > phrase.start), default=len(text))
        group, n = group_after(text, phrase, next_start)
        if group is None:
            group = group_before(text, phrase, previous_end)
        previous_end = phrase.end
        statistic = None
        disp_value: float | tuple[float, float] | None = phrase.dispersion or phrase.bounds
        if phrase.percent is not None:
            statistic, disp_value = "count", None
        elif phrase.unit == "%" and not has_spread(phrase):
            statistic = "percent"
        start = sentence.start + phrase.start
        source = Source(
            kind="text",
            page=block.page,
            bbox=block.bbox,
            section=block.section,
            table=None,
            row=None,
            col=None,
            quote=text.strip(),
            ref=block.ref,
        )
        draft = Draft(
            order=(order, start),
            outcome=outcome or "",
            group=group,
            statistic=statistic,
            value=phrase.value,
            raw=phrase.text,
            unit=phrase.unit,
            dispersion_kind=phrase.kind,
            dispersion_value=disp_value,
            n=None,
            source=source,
            extractor=EXTRACTOR,
            location=(block.index, start),
        ).with_found("value", "value")
        if outcome:
            draft = draft.with_found("outcome", "sentence" if found_outcome else "paragraph")
        if group:
            draft = draft.with_found("group", "sentence")
        if phrase.unit:
            draft = draft.with_found("unit", "value")
        if phrase.kind:
            draft = draft.with_found("dispersion", "value")
        elif disp_value is not None and statement_kind:
            draft = draft.with_found("dispersion", "sentence", dispersion_kind=statement_kind)
        if n is not None:
            draft = draft.with_found("n", "sentence", n=n)
        elif group_n is not None:
            draft = draft.with_found("n", "sentence", n=group_n)
        if time_match:
            draft = draft.with_found("time_point", "sentence", time_point=time_match.group(1))
        drafts.append(draft)
    return drafts


def _is_debris(text: str) -> bool:
    """True for text that is only numbers (table cells that ingest left in the text flow)."""
    return len(re.findall(r"[A-Za-z]{3,}", text)) == 0


def text_drafts(document: Document, *, sections: tuple[str, ...] = TEXT_SECTIONS) -> list[Draft]:
    """Drafts for every measure in the text of ``sections`` (captions of figures included).

    A legend's dispersion statement ("Values are mean ± SEM; n = 6 per group") applies to the
    values of the whole legend; table captions are left to the table reader.
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
        block_kind = find_dispersion_statement(block.text)
        block_n = find_group_n(block.text)
        for start, text in split_sentences(block.text):
            if not re.search(r"\d", text) or _is_debris(text):
                continue
            for draft in sentence_drafts(Sentence(block, start, text), order=float(block.index)):
                if (
                    draft.dispersion_value is not None
                    and draft.dispersion_kind is None
                    and block_kind
                ):
                    how = "legend" if block.kind == "caption" else "paragraph"
                    draft = draft.with_found("dispersion", how, dispersion_kind=block_kind)
                if draft.n is None and block_n is not None:
                    how = "legend" if block.kind == "caption" else "paragraph"
                    draft = draft.with_found("n", how, n=block_n)
                drafts.append(draft)
    return drafts
