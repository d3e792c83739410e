"""Linking: fill each draft's gaps from the article around it, then make it a Proposal.

Precedence, nearest first (docs/records.md lists the whole order):

* n: the data point's own cell or sentence > the table's n row/column or the group's header >
  the caption, legend or footnotes > a group n stated elsewhere ("vehicle (n = 9)") > the methods'
  per-group statement ("n = 8 per group"; flag ``n_from_methods``).
* dispersion kind: the cell or sentence > the table headers > the caption, legend or footnotes >
  the methods' statement ("Data are mean ± SEM"; flag ``dispersion_from_methods``) > an assumption
  by the value's shape (flag ``dispersion_kind_assumed``).

Linking then derives the SD (:mod:`extract.records.stats`), normalises the unit through
:func:`extract.units.normalize`, scores the confidence from where each field was found, and gives
the stable id from :func:`~extract.records.proposal.make_id`.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field, replace

from extract.ingest.document import Document
from extract.nlp.abbreviations import expand_outcome, find_abbreviations, long_form_for
from extract.nlp.context import ContextMention, find_context, load_lexicon
from extract.nlp.quantities import find_dispersion_statement
from extract.nlp.sample_size import find_sample_sizes
from extract.records.draft import FOUND_WEIGHTS, Draft
from extract.records.patterns import find_group_n, group_and_n, read_cell, split_label
from extract.records.proposal import Dispersion, Proposal, make_id
from extract.records.stats import derive_sd
from extract.units import normalize

#: Weight of each field in the confidence (value and outcome count most).
CONFIDENCE_WEIGHTS: dict[str, float] = {
    "value": 3.0,
    "outcome": 2.0,
    "statistic": 1.0,
    "group": 1.0,
    "unit": 1.0,
    "dispersion": 1.0,
    "n": 1.0,
}

_GROUP_N_STATEMENT = re.compile(
    r"(?:^|[,;:(]\s*|\band\s+|\bthe\s+)([A-Za-z][\w\-/ .]{0,40}?)\s*(?:groups?\s*)?"
    r"[(\[,]\s*n\s*=\s*(\d+)\s*[)\],;]",
    re.I,
)
_DOSE = re.compile(r"\d\s*(?:mg|µg|μg|ug|g|mL|nmol|µmol|μmol|mmol|IU|U)\s*/\s*(?:kg|day|d)\b", re.I)


_TIME_VALUED = re.compile(r"(?:h|hours?|min|minutes?|days?|weeks?|months?|years?)", re.I)
#: Subject words that name no species or population ("Animals." as a paragraph heading).
_GENERIC_SUBJECTS = frozenset("animals subjects participants individuals samples".split())
_KEY_LEAD = frozenset("the and in of with given receiving all".split())
_KEY_TAIL = frozenset("group groups arm arms cohort".split())
#: Subject nouns that follow a group name ("control minipigs"), from the nlp subject lexicon.
_SUBJECT_WORDS = frozenset(w.lower() for w in load_lexicon("subjects")) | frozenset(
    "cells cultures wells animals".split()
)


@dataclass(frozen=True)
class ArticleContext:
    """What the article states once for all its data points (methods, statistics section).

    Attributes:
        article: the DOI when the article states one, else the file stem.
        file: the input file's base name.
        n_per_group: the methods' per-group sample size, if stated once.
        group_n: per-group n stated in the text ("vehicle (n = 9)"), keyed by lower-cased group.
        dispersion_kind: the kind the methods declare ("Values are mean ± SEM"), if any.
        statistic: "mean" or "median" when the methods declare how values are summarised.
        subject: species, strain, sex as stated, if found.
        n_per_group_from: "methods", or "legend" when only legends or footnotes state it.
        total_n: the number randomised, allocated or enrolled, when stated.
        dose_groups: group names that state a dose ("BDC 20 mg/kg"), as the article writes them.
        abbreviations: short form -> long form, as the article defines them.
        method: unused by linking (kept for callers): a method is tied to an outcome through
            ``method_statements``.
        time_point: the one sampling time the methods state for the whole study, if only one.
        method_statements: (methods sentence, method it names), to tie a method to the outcomes
            its sentence names.
        time_statements: (methods sentence, the one time point it names), likewise.
    """

    article: str
    file: str
    n_per_group: int | None = None
    group_n: dict[str, int] = field(default_factory=dict)
    dispersion_kind: str | None = None
    statistic: str | None = None
    subject: str | None = None
    method: str | None = None
    time_point: str | None = None
    n_per_group_from: str = "methods"
    total_n: int | None = None
    dose_groups: tuple[str, ...] = ()
    abbreviations: dict[str, str] = field(default_factory=dict)
    method_statements: tuple[tuple[str, str], ...] = ()
    time_statements: tuple[tuple[str, str], ...] = ()


def article_id(document: Document) -> str:
    """The article key of the proposal contract: the DOI when stated, else the file stem."""
    return document.doi or document.name


def read_context(document: Document, *, subject: str | None = None) -> ArticleContext:
    """Read the article-wide statements: per-group n, dispersion kind, group sizes.

    The methods section is read first; when it says nothing, the whole text is (a statement in
    the abstract or a legend still declares how the article reports its data).
    """
    methods = " ".join(b.text for b in document.blocks if b.section == "methods")
    everything = " ".join(b.text for b in document.blocks if b.section != "references")
    kind = find_dispersion_statement(methods) or find_dispersion_statement(everything)
    # Context is read from the methods' own sentences: headings ("Study participants") and the
    # captions and footnotes of tables placed in the section say nothing of the study's context.
    sentences = [
        sentence
        for block in document.blocks
        if block.section == "methods" and block.kind == "paragraph"
        for sentence in _sentences(block.text)
    ]
    by_sentence = [(sentence, find_context(sentence)) for sentence in sentences]
    # The study's subjects are those the methods say were studied ("thirty patients were
    # included"); a subject word in other sentences ("RNA from blood cells") is no description.
    studied = [m for sentence, found in by_sentence if _STUDIED.search(sentence) for m in found]
    # A subject given as an example ("family members such as a spouse or children") describes
    # a category, not the study's subjects.
    mentions = [
        m
        for sentence, found in by_sentence
        for m in found
        if not (m.kind == "subject" and _EXAMPLE.search(sentence[: m.start]))
    ]
    studied = [m for m in studied if m in mentions]
    n_per_group = find_group_n(methods)
    n_from = "methods"
    if n_per_group is None and not any(
        size.scope == "per_group" for size in find_sample_sizes(methods)
    ):
        n_per_group = _one_per_group_n(document)
        n_from = "legend"
    group_n = _stated_group_sizes(document, methods)
    statistic = None
    if re.search(r"\bmedians?\b[^.]{0,40}(?:IQR|interquartile|range)", methods, re.I):
        statistic = "median"
    elif re.search(r"\bmeans?\s*(?:±|\+/-|\(|of)", methods, re.I):
        statistic = "mean"
    return ArticleContext(
        article=article_id(document),
        file=document.path.replace("\\", "/").rsplit("/", 1)[-1],
        n_per_group=n_per_group,
        group_n=group_n,
        dispersion_kind=kind,
        statistic=statistic,
        subject=subject or _methods_subject(studied) or _methods_subject(mentions),
        method=next((m.value for m in mentions if m.kind == "method"), None),
        time_point=_study_time_point(by_sentence),
        n_per_group_from=n_from,
        total_n=_total_n(everything),
        dose_groups=_dose_groups(document, group_n) if _DOSE_RANK.search(everything) else (),
        abbreviations=_abbreviations(document),
        method_statements=tuple(
            (sentence, m.value)
            for sentence, found in by_sentence
            for m in found
            if m.kind == "method"
        ),
        time_statements=tuple(
            (sentence, times[0])
            for sentence, found in by_sentence
            if len(times := sorted(set(_sampling_times(found)))) == 1
        ),
    )


#: A methods sentence that says who or what was studied.
_STUDIED = re.compile(
    r"\b(?:included|enrolled|recruited|randomi[sz]ed|allocated|assigned|studied|housed|used|"
    r"purchased|screened|participated|grown|cultured|seeded|bred|kept)\b",
    re.I,
)


#: Words that introduce examples of a category.
_EXAMPLE = re.compile(r"\b(?:such as|e\.g\.|for example|for instance|including|like)\s", re.I)


def _sentences(text: str) -> list[str]:
    """A paragraph cut into sentences (a run-in heading "Animals." is a sentence of its own)."""
    return [s for s in re.split(r"(?<=[.;])\s+(?=[A-Z(\[])", text) if s.strip()]


def _one_per_group_n(document: Document) -> int | None:
    """The per-group n that the legends, captions and footnotes state, when they all agree
    ("Bars show mean ± SEM; n = 12 per group"): an article that states it once, in a legend,
    studied groups of that size."""
    texts = [b.text for b in document.blocks if b.kind == "caption" or b.section == "legends"]
    texts += [note for table in document.tables for note in table.footnotes]
    sizes = [size for text in texts for size in find_sample_sizes(text)]
    found = {size.n for size in sizes if size.scope == "per_group"}
    return found.pop() if len(found) == 1 else None  # a range ("n = 8-10") gives None


#: A total that counts the whole study: "301 were randomised", "120 patients were enrolled".
_TOTAL_WORDS = re.compile(r"randomi[sz]ed|allocated|assigned|enrolled|included|recruited", re.I)


def _total_n(text: str) -> int | None:
    """The study's total n: the first total stated with randomised/allocated/enrolled."""
    for sentence in re.split(r"(?<=[.;])\s+", text):
        if not _TOTAL_WORDS.search(sentence):
            continue
        for size in find_sample_sizes(sentence):
            if size.scope == "total" and size.n and _TOTAL_WORDS.search(size.text):
                return size.n
    return None


_DOSE_NAME = re.compile(
    r"^(?:[A-Z][\w-]*\s+)?(?P<dose>\d+(?:\.\d+)?)\s*(?P<unit>(?:mg|µg|μg|ug|ng|g|mL|IU|U|nmol|"
    r"µmol|μmol|mmol|mM|µM|μM|nM)(?:\s*/\s*kg)?(?:\s*/\s*(?:day|d))?)$"
)


#: Only an article that names a group by the rank of its dose needs its dose groups.
_DOSE_RANK = re.compile(
    r"\b(?:highest|lowest|largest|smallest|top)[\s-]+(?:dose|concentration)", re.I
)
_DOSE_IN_TEXT = re.compile(r"\d\s*(?:mg|µg|μg|ug|ng|g|mL|IU|U|nmol|µmol|μmol|mmol|mM|µM|μM|nM)\b")


def _dose_groups(document: Document, group_n: dict[str, int]) -> tuple[str, ...]:
    """Group names that state a dose, from the text's group mentions, the stated group sizes
    and the table headers, in the article's own spelling."""
    names: list[str] = []
    for block in document.blocks:
        if (
            block.section in ("abstract", "results", "methods") or block.kind == "caption"
        ) and _DOSE_IN_TEXT.search(block.text):
            names.extend(m.value for m in find_context(block.text) if m.kind == "group")
    for table in document.tables:
        for cell in table.cells:
            names.append(group_and_n(split_label(cell.text)[0])[0])
    names.extend(group_n)
    return tuple(dict.fromkeys(n for n in names if _DOSE_NAME.match(n.strip())))


def resolve_dose_rank(rank: str, dose_groups: tuple[str, ...]) -> str | None:
    """The group that "the highest dose" (or lowest ...) means: among the article's dose groups
    in the unit most of them use, the one with the largest (smallest) dose."""
    parsed = []
    for name in dose_groups:
        match = _DOSE_NAME.match(name.strip())
        if match:
            unit = re.sub(r"\s+", "", match["unit"])
            parsed.append((unit, float(match["dose"]), name))
    if not parsed:
        return None
    units = [unit for unit, _, _ in parsed]
    common = max(set(units), key=units.count)
    same = [(dose, name) for unit, dose, name in parsed if unit == common]
    highest = rank.split()[0] in ("highest", "largest", "top")
    target = max(d for d, _ in same) if highest else min(d for d, _ in same)
    # Of the spellings of that dose, the fullest ("MSF 45 mg/kg/day" over "45 mg/kg/day").
    return max((name for d, name in same if d == target), key=len)


def _abbreviations(document: Document) -> dict[str, str]:
    """Short forms the article defines, plus table labels that are short forms written out in a
    sentence describing the table ("Table 1 summarises ..., alanine aminotransferase and ...")."""
    text = " ".join(b.text for b in document.blocks if b.section != "references")
    notes = " ".join(note for table in document.tables for note in table.footnotes)
    found = find_abbreviations(text + " " + notes)
    for table in document.tables:
        label = (table.label or "").strip()
        if not label:
            continue
        described = [
            sentence
            for block in document.blocks
            if label in block.text
            for sentence in re.split(r"(?<=[.;])\s+", block.text)
            if label in sentence
        ]
        phrases = [p.strip() for s in described for p in re.split(r",|;|\band\b|\bor\b", s)]
        for cell in table.cells:
            name = split_label(cell.text)[0].strip()
            if name in found or not re.fullmatch(r"[A-Z][A-Z0-9]{1,7}", name):
                continue
            for phrase in phrases:
                long_form = long_form_for(name, phrase)
                if long_form is not None and len(long_form.split()) <= len(name):
                    found[name] = long_form
                    break
    return found


def is_generic_subject(subject: str | None) -> bool:
    """A subject word that names no species, strain, sex, age or condition ("subjects",
    "Participants"): it tells a curator nothing and is left empty."""
    return subject is not None and subject.lower().rstrip(".") in _GENERIC_SUBJECTS


def _methods_subject(mentions: list[ContextMention]) -> str | None:
    """The study's subjects as the methods first describe them: the most specific of the first
    mentions ("male 8-week-old mice" rather than a run-in "Animals"), the first of them when
    several are specific; none when they all are generic words ("subjects")."""
    subjects = [m for m in mentions if m.kind == "subject"][:3]
    if not subjects:
        return None
    best = next((m.value for m in subjects if not is_generic_subject(m.value)), subjects[0].value)
    return None if is_generic_subject(best) else best


def _sampling_times(mentions: list[ContextMention]) -> list[str]:
    """When a methods sentence says the outcomes were taken ("samples taken at week 6", "at
    48 h"); durations ("for 12 weeks", "10 min") are not time points of the data."""
    return [
        mention.value
        for mention in mentions
        if mention.kind == "time_point"
        and (
            mention.text.lower().startswith("at ")
            or re.fullmatch(r"(?:week|day|month|hour|visit) \d+", mention.value)
        )
    ]


def _study_time_point(by_sentence: list[tuple[str, list[ContextMention]]]) -> str | None:
    """The study's one sampling time: the methods state exactly one ("samples taken at week
    6"); two or more ("at 30 min ... at 120 min") tie a time to an outcome only through the
    sentence that names it (``time_statements``)."""
    times = {t for _, found in by_sentence for t in _sampling_times(found)}
    return times.pop() if len(times) == 1 else None


def _names_outcome(sentence: str, outcome: str) -> bool:
    """Whether a methods sentence names the outcome ("Plasma glucose ... was measured using
    ..." names "plasma glucose"; it does not name "weight")."""
    words = re.findall(r"[\w-]+", outcome.lower())
    if not words or len("".join(words)) < 3:
        return False
    phrase = r"\W+".join(re.escape(w) for w in words)
    return re.search(rf"(?<![\w-]){phrase}(?:e?s)?(?![\w-])", sentence.lower()) is not None


def _tied(statements: tuple[tuple[str, str], ...], outcome: str | None) -> str | None:
    """The one value the methods sentences naming ``outcome`` give, or None (none or several)."""
    if not outcome:
        return None
    values = {value for sentence, value in statements if _names_outcome(sentence, outcome)}
    return values.pop() if len(values) == 1 else None


def _stated_group_sizes(document: Document, methods: str) -> dict[str, int]:
    """Each group's n as the article states it once: "vehicle (n = 9)" in the methods, a table
    header "Control (n = 4)", a results sentence "control minipigs (n = 6)". The first statement
    of a group wins (methods, then tables, then the rest of the text in reading order)."""
    group_n: dict[str, int] = {}

    def add(name: str | None, n: int | None) -> None:
        key = _group_key(name or "")
        if key and n and key not in group_n:
            group_n[key] = n

    for match in _GROUP_N_STATEMENT.finditer(methods):
        add(match.group(1), int(match.group(2)))
    for block in document.blocks:
        if block.section == "references" or not re.search(
            r"\bn\s*=|randomi[sz]ed|allocated|assigned", block.text
        ):
            continue
        for size in find_sample_sizes(block.text):
            if size.scope == "group":
                add(size.group, size.n)
    for table in document.tables:
        for cell in table.cells:
            name, n = group_and_n(cell.text)
            if n is not None and re.search(r"[A-Za-z]", name) and read_cell(cell.text) is None:
                add(name, n)
    return group_n


def _group_key(text: str) -> str:
    words = re.sub(r"[^\w/ .-]", " ", text.lower()).split()
    while words and words[0] in _KEY_LEAD:
        words = words[1:]
    while words and (words[-1] in _KEY_TAIL or words[-1] in _SUBJECT_WORDS):
        words = words[:-1]
    return " ".join(words)


#: Where a blanket statement puts an n ("n = 6 per group" in a caption, footnote, legend or
#: paragraph): a size stated for the group itself ("FTZ 40 mg/kg/day (n = 8)") is more specific.
_BLANKET_N = frozenset({"caption", "footnote", "legend", "paragraph"})


def _stated_n(group: str | None, context: ArticleContext) -> int | None:
    """The n the article states for ``group`` itself, matched on its name without "group" or
    subject nouns, one name ending the other ("10 mg" ~ "MSF 10 mg")."""
    if not group:
        return None
    key = _group_key(group)
    if not key:
        return None
    for name, n in context.group_n.items():
        if (
            key == name
            or key in name.split(" / ")
            or name.endswith(" " + key)
            or key.endswith(" " + name)
        ):
            return n
    return None


def link_n(draft: Draft, context: ArticleContext) -> Draft:
    """Give a draft with no n the group's stated n, else the methods' per-group n (flagged).

    An n from a blanket statement ("n = 6 per group" in a footnote) gives way to the n the
    article states for the draft's group itself ("minipigs given X (n = 8)").
    """
    if "n_subset" in draft.flags:
        return draft
    if draft.n is not None:
        if draft.how("n") in _BLANKET_N:
            stated = _stated_n(draft.group, context)
            if stated is not None and stated != draft.n:
                return draft.with_found("n", "document", n=stated)
        return draft
    if "pooled" in draft.flags:
        if context.total_n is not None:
            return draft.with_found("n", "document", n=context.total_n)
        return draft
    stated = _stated_n(draft.group, context)
    if stated is not None:
        return draft.with_found("n", "document", n=stated)
    if context.n_per_group is not None:
        if context.n_per_group_from == "legend":
            return draft.with_found("n", "legend", n=context.n_per_group).with_flag("n_from_legend")
        return draft.with_found("n", "methods", n=context.n_per_group).with_flag("n_from_methods")
    return draft


def link_group(draft: Draft, context: ArticleContext) -> Draft:
    """A group known by the rank of its dose ("with the highest dose") named from the
    article's dose groups (flag ``group_from_dose_rank``)."""
    if draft.group is None or not re.fullmatch(
        r"(?:highest|lowest|largest|smallest|top) dose", draft.group
    ):
        return draft
    name = resolve_dose_rank(draft.group, context.dose_groups)
    if name is None:
        return draft
    how = draft.how("group") or "sentence"
    return draft.with_found("group", how, group=name).with_flag("group_from_dose_rank")


def _outcome_key(outcome: str) -> str:
    key = " ".join(outcome.lower().split())
    return re.sub(r"^(?:change|changes|difference) (?:in|of) ", "", key)


def units_by_outcome(drafts: list[Draft]) -> dict[str, str]:
    """The unit the article writes for each outcome ("the OBS score changed by -4.1 points"),
    keyed by the outcome without "change in"; an outcome written with two units is left out."""
    seen: dict[str, set[str]] = {}
    for draft in drafts:
        if draft.outcome and draft.unit and draft.statistic not in ("count", "percent"):
            seen.setdefault(_outcome_key(draft.outcome), set()).add(draft.unit)
    return {key: next(iter(units)) for key, units in seen.items() if len(units) == 1}


def link_unit(draft: Draft, units: dict[str, str]) -> Draft:
    """Give a value with no unit the unit the article writes elsewhere for the same outcome
    (a table column "OBS score, mean (SD)" takes the text's "points"; flag
    ``unit_from_text``)."""
    if draft.unit is not None or not draft.outcome or draft.statistic in ("count", "percent"):
        return draft
    unit = units.get(_outcome_key(draft.outcome))
    if unit is None:
        return draft
    return draft.with_found("unit", "document", unit=unit).with_flag("unit_from_text")


def link_dispersion(draft: Draft, context: ArticleContext) -> Draft:
    """Give a spread of unknown kind the methods' kind, else one assumed from its shape (flagged)."""
    if draft.dispersion_value is None or draft.dispersion_kind is not None:
        return draft
    is_pair = isinstance(draft.dispersion_value, tuple)
    kind = context.dispersion_kind
    if kind is not None and is_pair == (kind in ("CI95", "IQR", "range")):
        return draft.with_found("dispersion", "methods", dispersion_kind=kind).with_flag(
            "dispersion_from_methods"
        )
    if is_pair:
        assumed = "IQR" if draft.statistic == "median" else "CI95"
    else:
        assumed = "SD"
    return draft.with_found("dispersion", "assumed", dispersion_kind=assumed).with_flag(
        "dispersion_kind_assumed"
    )


def link_statistic(draft: Draft, context: ArticleContext) -> Draft:
    """Decide the statistic from the dispersion kind, else call the value "single".

    A statistic derived from the kind is found where the kind was (a kind from the caption
    gives a statistic from the caption). The methods' "mean"/"median" names the statistic of
    values with a spread only (a range: median unless the methods say mean); a bare value is
    no mean because the methods report means elsewhere.
    """
    if draft.statistic is not None:
        return draft
    how = draft.how("dispersion") or "cell"
    if draft.dispersion_kind in ("IQR",):
        return draft.with_found("statistic", how, statistic="median")
    if draft.dispersion_kind in ("SD", "SEM", "CI95"):
        return draft.with_found("statistic", how, statistic="mean")
    if draft.dispersion_kind == "range":
        if context.statistic is not None:
            return draft.with_found("statistic", "methods", statistic=context.statistic)
        return draft.with_found("statistic", "assumed", statistic="median")
    return draft.with_found("statistic", "assumed", statistic="single")


#: Flags that say a field was assumed or could not be read, each lowering the confidence.
CONFIDENCE_PENALTIES: dict[str, float] = {
    "dispersion_kind_assumed": 0.85,
    "unknown_unit": 0.9,
    "no_outcome": 0.7,
    "range_only": 0.9,
    "method_from_methods": 0.97,
    "time_point_from_methods": 0.95,
    "spread_like_percent": 0.7,
}
#: An outcome or group that is only a statistic word, a test symbol or a single letter ("total",
#: "number", "p", "vs", "s d", "A"): a label read from the wrong place.
_PLACEHOLDER = re.compile(
    r"(?:total|number|no|n|mean|median|average|maximum|minimum|max|min|sd|se|sem|ci|p|vs|"
    r"s ?d|range|value|values|overall|all|mixed|[a-z])",
    re.I,
)
#: Factor for a record whose outcome or group is such a placeholder.
PLACEHOLDER_PENALTY = 0.75
#: Statistics that need no unit (a count or a percentage is complete without one).
_UNITLESS = frozenset({"count", "percent"})


def _is_placeholder(label: str | None) -> bool:
    return (
        bool(label)
        and _PLACEHOLDER.fullmatch(re.sub(r"[^\w ]", "", label or "").strip()) is not None
    )


def confidence(draft: Draft) -> float:
    """A score in 0..1 that says how much of the record was found rather than assumed.

    The weighted mean of how each field was found (``FOUND_WEIGHTS``: the value's own text
    1.0 ... assumed 0.45; ``CONFIDENCE_WEIGHTS``), times a factor for each flag in
    ``CONFIDENCE_PENALTIES``, times 0.85 for a bare value (no spread, no unit, a statistic no
    label names), times ``PLACEHOLDER_PENALTY`` when the outcome or group is only a statistic
    word or a letter ("total", "p", "A"). A field the data point has no need of (no spread printed, no group; no unit
    for a count or percentage) does not count; a missing n, outcome or unit does.
    """
    total = 0.0
    weight = 0.0
    for name, w in CONFIDENCE_WEIGHTS.items():
        how = draft.how(name)
        if how is None and name == "statistic" and draft.statistic is not None:
            how = "value"  # set by the extractor from the value's own text ("42 (37.5%)")
        if how is None:
            if name in ("dispersion", "group"):
                continue
            if name == "unit" and draft.statistic in _UNITLESS:
                continue
            how = "missing"
        total += w * FOUND_WEIGHTS.get(how, 0.6)
        weight += w
    score = total / weight if weight else 0.0
    for flag in draft.flags:
        score *= CONFIDENCE_PENALTIES.get(flag, 1.0)
    if any(_is_placeholder(label) for label in (draft.outcome, draft.group)):
        score *= PLACEHOLDER_PENALTY
    if (
        draft.dispersion_value is None
        and draft.unit is None
        and draft.how("statistic")
        in (
            "assumed",
            "methods",
        )
    ):
        score *= 0.85
    return round(min(max(score, 0.0), 1.0), 3)


def link_methods_context(draft: Draft, context: ArticleContext) -> Draft:
    """Give a draft the method and time point the methods tie to it (flagged ``*_from_methods``).

    A method comes only from a methods sentence that names the draft's outcome ("Plasma glucose
    was measured using an automated analyser"), never to every value of the article. A time
    point comes from such a sentence, else from the one sampling time the methods state for the
    whole study; a time-to-event value ("median 6 weeks") takes none.
    """
    if draft.method is None:
        method = _tied(context.method_statements, draft.outcome)
        if method is not None:
            draft = draft.with_found("method", "methods", method=method).with_flag(
                "method_from_methods"
            )
    if draft.time_point is None and not _TIME_VALUED.fullmatch(draft.unit or ""):
        time = _tied(context.time_statements, draft.outcome) or context.time_point
        if time is not None:
            draft = draft.with_found("time_point", "methods", time_point=time).with_flag(
                "time_point_from_methods"
            )
    return draft


def finish(draft: Draft, context: ArticleContext) -> Proposal:
    """Link one draft and make it a Proposal (SD derived, unit normalised, confidence, id)."""
    draft = link_group(draft, context)
    draft = link_n(draft, context)
    draft = link_dispersion(draft, context)
    if draft.outcome:
        draft = replace(draft, outcome=expand_outcome(draft.outcome, context.abbreviations))
    draft = link_statistic(draft, context)
    norm = normalize(draft.value, draft.unit)
    for flag in norm.flags:
        if flag == "unknown_unit":
            draft = draft.with_flag(flag)
    dispersion = (
        Dispersion(kind=draft.dispersion_kind, value=draft.dispersion_value)
        if draft.dispersion_kind is not None and draft.dispersion_value is not None
        else None
    )
    sd = derive_sd(dispersion, draft.n)
    draft = link_methods_context(draft, context)
    subject = draft.subject if not is_generic_subject(draft.subject) else None
    subject = subject or context.subject
    intervention = draft.intervention
    if intervention is None and draft.group and _DOSE.search(draft.group):
        intervention = draft.group
    return Proposal(
        id=make_draft_id(context.article, draft),
        article=context.article,
        file=context.file,
        outcome=draft.outcome,
        group=draft.group,
        statistic=draft.statistic or "single",
        value=draft.value,
        unit=draft.unit,
        unit_ucum=norm.ucum,
        value_normalized=norm.value if norm.canonical_unit else None,
        unit_normalized=norm.canonical_unit,
        dispersion=dispersion,
        sd=round(sd, 6) if sd is not None else None,
        n=draft.n,
        time_point=draft.time_point,
        method=draft.method,
        subject=None if is_generic_subject(subject) else subject,
        intervention=intervention,
        source=draft.source,
        extractor=draft.extractor,
        confidence=confidence(draft),
        flags=draft.flags,
    )


def make_draft_id(article: str, draft: Draft) -> str:
    """The stable id: article, extractor, source kind, page or ref, location and value as written."""
    where = draft.source.page if draft.source.page is not None else draft.source.ref
    return make_id(article, draft.extractor, draft.source.kind, where, *draft.location, draft.raw)
