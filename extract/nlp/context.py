"""Context around a value: time point, method, subject, intervention, outcome, groups.

Rules plus the lexicons in ``extract/nlp/lexicons/`` (plain text, one entry a line, each file's
header says what it holds); nothing is downloaded. Each mention is a :class:`ContextMention`
with its kind, the exact text, a tidy ``value`` ("at week 8" -> "week 8") and offsets.

:func:`find_outcome` names the measured thing a value belongs to: "Serum creatinine was
0.42 ± 0.05 mg/dL" -> "serum creatinine".
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from extract.nlp.abbreviations import long_form_for
from extract.nlp.outcome_trim import sentence_subject, trim_outcome
from extract.nlp.tokenizer import normalize_text

__all__ = [
    "CONTEXT_KINDS",
    "LEXICON_DIR",
    "ContextMention",
    "SentenceContext",
    "find_context",
    "find_outcome",
    "load_lexicon",
    "summarize_context",
]

#: Kinds of context mention.
CONTEXT_KINDS: tuple[str, ...] = (
    "time_point",
    "method",
    "subject",
    "intervention",
    "outcome",
    "group",
)
#: Folder of the lexicon files.
LEXICON_DIR = Path(__file__).with_name("lexicons")


@dataclass(frozen=True)
class ContextMention:
    """One context mention.

    Attributes:
        kind: one of :data:`CONTEXT_KINDS`.
        text: the exact text ``text[start:end]``.
        value: the tidy form ("week 8", "ELISA", "male 8-week-old mice", "vehicle").
        start: character offset in the text given.
        end: offset just past it.
    """

    kind: str
    text: str
    value: str
    start: int
    end: int


@dataclass(frozen=True)
class SentenceContext:
    """The context of one sentence, one value per field (the first mention of each kind)."""

    time_point: str | None = None
    method: str | None = None
    subject: str | None = None
    intervention: str | None = None
    outcome: str | None = None
    groups: tuple[str, ...] = ()


@lru_cache(maxsize=16)
def load_lexicon(name: str) -> tuple[str, ...]:
    """Entries of ``lexicons/<name>.txt`` (comments and blank lines dropped), longest first."""
    path = LEXICON_DIR / f"{name}.txt"
    entries = []
    for line in path.read_text(encoding="utf-8").splitlines():
        entry = line.strip()
        if entry and not entry.startswith("#"):
            entries.append(entry)
    return tuple(sorted(set(entries), key=len, reverse=True))


@lru_cache(maxsize=16)
def _lexicon_regex(name: str) -> re.Pattern[str]:
    alternatives = "|".join(re.escape(entry) for entry in load_lexicon(name))
    return re.compile(rf"(?<![\w-])(?:{alternatives})(?![\w-])", re.I)


_TIME_UNIT = r"(?:h|hrs?|hours?|min|minutes?|days?|d|weeks?|wks?|months?|years?)"
_TIME_PATTERNS: tuple[tuple[re.Pattern[str], str], ...] = (
    (re.compile(r"\b(week|day|month|year|hour|visit|wk)\s*(\d+)\b", re.I), "unit_number"),
    (
        re.compile(
            rf"\b(\d+(?:\.\d+)?)\s*(?:-\s*)?({_TIME_UNIT})\s+(?:after|post|following|of)\s+"
            r"([\w-]+(?:\s+[\w-]+)?)",
            re.I,
        ),
        "after_event",
    ),
    (
        re.compile(rf"\b(?:after|at|within|over|for)\s+(\d+(?:\.\d+)?)\s*({_TIME_UNIT})\b", re.I),
        "after",
    ),
    (
        re.compile(
            r"\b(baseline|pre-?treatment|post-?treatment|end of (?:the )?(?:study|treatment))\b",
            re.I,
        ),
        "word",
    ),
)
_TIME_UNIT_NAMES = {
    "h": "h",
    "hr": "h",
    "hrs": "h",
    "hour": "h",
    "hours": "h",
    "min": "min",
    "minute": "min",
    "minutes": "min",
    "d": "days",
    "day": "days",
    "days": "days",
    "wk": "weeks",
    "wks": "weeks",
    "week": "weeks",
    "weeks": "weeks",
    "month": "months",
    "months": "months",
    "year": "years",
    "years": "years",
}
_METHOD_PHRASE = re.compile(
    r"\b(?:by|using|with|via|on)\s+(?:an?\s+|the\s+)?((?:[\w-]+\s+){0,3}?"
    r"(?:assay|kit|method|analy[sz]er|cytometry|spectrometry|chromatography|microscopy|"
    r"blot(?:ting)?|PCR|ELISA|plethysmography|telemetry|meter))\b",
    re.I,
)
_SUBJECT_MODIFIERS = re.compile(
    r"(?<![\w-])((?:(?:(?i:male|female|adult|juvenile|aged|young|old|healthy|obese|lean|pregnant|"
    r"wild-type|transgenic|knockout)|\d+-(?:day|week|month|year)-old|[A-Z][A-Za-z0-9]*[0-9][A-Za-z0-9/-]*|"
    r"[A-Z]{2,}[\w/-]*|[A-Z][a-z]+(?:-[A-Z][a-z]+)*|\([A-Z][\w/-]*\))\s+){1,5})$"
)
#: Capitalised words before a subject noun that are no strain name ("Control mice", "All rats").
_NOT_STRAIN = frozenset(
    "the a an all both each every these those this that some most many several other remaining"
    " surviving treated untreated control controls vehicle sham placebo saline naive in of for"
    " with from to at on by and or after before during when where while no one two three four"
    " five six seven eight nine ten eleven twelve animals subjects groups group"
    # heading words that run into a subject when a heading is read with its paragraph
    # ("Methods Study participants", "Population Patients")
    " methods method materials study studies population participants design setting results"
    " characteristics procedures protocol recruitment eligibility".split()
)
_SUBJECT_AGE_AFTER = re.compile(
    r"^\s*,?\s*(?:aged\s+\d+(?:\s*(?:–|-|to)\s*\d+)?\s*(?:days?|weeks?|months?|years?)(?:\s+old)?|"
    r"\(\s*\d+(?:\s*(?:–|-|to)\s*\d+)?\s*(?:days?|weeks?|months?|years?)(?:\s+old)?\s*\))",
    re.I,
)
_DOSE = r"\d+(?:\.\d+)?\s*(?:mg|µg|μg|ug|ng|g|mL|µL|IU|U|nmol|µmol|μmol|mmol|mM|µM|μM|nM)(?:\s*/\s*kg)?(?:\s*/\s*(?:day|d))?"
_INTERVENTION_PATTERNS: tuple[re.Pattern[str], ...] = (
    re.compile(
        r"\b(?:treated with|received|receiving|administered|given|dosed with|injected with|"
        r"infused with|fed)\s+(?:an?\s+|the\s+)?((?:"
        + _DOSE
        + r")\s+(?:of\s+)?[A-Z][\w-]*(?:\s+[A-Z0-9][\w-]*)?)",
    ),
    re.compile(
        r"\b(?:treated with|received|receiving|administered|given|dosed with|injected with|"
        r"infused with)\s+(?:an?\s+|the\s+)?([A-Z][\w-]*(?:\s+(?!" + _DOSE + r")[A-Z0-9][\w-]*)?"
        r"(?:\s*\(\s*" + _DOSE + r"[^)]*\)|\s*(?:at\s+)?" + _DOSE + r")?)",
    ),
    re.compile(r"\b(vehicle|placebo|saline)\b", re.I),
)
_GROUP_PATTERNS: tuple[re.Pattern[str], ...] = (
    re.compile(
        r"\b(?:in|of|for|to|from|the)\s+(?:the\s+)?([\w/.+-]+(?:\s+[\w/.+-]+){0,4}?)\s+"
        r"(?:group|arm|cohort)s?\b",
        re.I,
    ),
    re.compile(r"\b([A-Z][\w]*(?:\s+[A-Z0-9][\w]*)?|[a-z]\w+)-treated\b"),
    re.compile(
        r"\b(?:vs\.?|versus|compared (?:with|to))\s+(?:the\s+)?"
        r"([A-Za-z][\w-]*(?:\s+[A-Z0-9][\w/-]*){0,3})"
        r"(?=\s*(?:group|arm|mice|rats|animals|patients|controls?)?\s*(?:[,;.)]|$))",
        re.I,
    ),
)
#: A group named by its treatment: "with BDC 20 mg/kg", "in rats given FTZ 40 mg/kg/day",
#: "receiving placebo".
_GIVEN_GROUP = re.compile(
    r"\b(?:with|given|receiving|treated with|exposed to|on)\s+(?:the\s+)?"
    r"([A-Z][\w-]*(?:\s+(?!" + _DOSE + r")[A-Z][\w-]*)?\s+" + _DOSE + r"(?![\w/])"
    r"|(?i:placebo|vehicle|saline))\b"
)
#: A control group written before its subject noun: "control minipigs", "vehicle-treated rats".
_CONTROL_WORDS = r"(?:control|vehicle|placebo|sham|saline|untreated)"
#: A group known only by the rank of its dose: "with the highest dose", "the lowest-dose group".
_DOSE_RANK = re.compile(
    r"\b(?:with|at|in|for|on|given|receiving|of)\s+the\s+(highest|lowest|largest|smallest|top)"
    r"[\s-]+(?:dose|concentration)s?\b",
    re.I,
)
_GROUP_NOT = frozenset(
    {
        "each",
        "every",
        "per",
        "treatment",
        "experimental",
        "both",
        "all",
        "two",
        "three",
        "same",
        "other",
    }
)

# Outcome: "<outcome> was/were/of/reached ... <value>"
_LINK = (
    r"(?:was|were|is|are|averaged|reached|measured|remained|amounted to|totalled|totaled|"
    r"(?:changed|increased|decreased|rose|fell)\s+by|"
    r"(?:increased|decreased|rose|fell|dropped|declined|changed|improved|recovered)(?:\s+(?:from\s+[^,;]{1,30}\s+)?to)?|"
    r"of|at|:|=|\()"
)
_OUTCOME_BEFORE = re.compile(
    rf"([A-Za-z][\w/()-]*(?:\s+[\w/()-]+){{0,5}}?)\s*(?:\s(?:in|of)\s+[^,;]{{1,40}}?)?\s+{_LINK}\s*"
    r"(?:(?:approximately|about|only|nearly|a mean of|a median of|mean|median)\s+)?[^\w]*$",
    re.I,
)
_OUTCOME_LEADING = re.compile(
    r"^(?:the|a|an|in|and|while|whereas|but|however|overall|both|mean|median|average|"
    r"baseline|final|total|its|their)\s+",
    re.I,
)
_VERB_IN_PHRASE = re.compile(
    r"\b(?:had|has|have|showed|shows|show|displayed|exhibited|with|demonstrated|developed|"
    r"reached|achieved)\s+",
    re.I,
)
_TIME_LEAD = re.compile(
    r"(?:at|on|by|after|from|in)\s+(?:week|day|month|hour|year|visit)\s+\d+\s*,?\s*", re.I
)
_METHOD_TAIL = re.compile(r"\s+(?:by|using|via|on)\s+.*$", re.I)
_NOT_OUTCOME_START = re.compile(
    r"(?:given|treated|receiving|received|with|exposed|fed|dosed|injected)\b", re.I
)
#: A treatment verb inside the phrase before a value: it names a group, not what was measured
#: ("minipigs given FTZ 40 mg/kg/day (n = 8) had 16.1 kg").
_TREATMENT_IN_PHRASE = re.compile(
    r"\b(?:given|treated|receiving|received|exposed|dosed|injected)\b", re.I
)
#: A number that is no measured value: a sample size "n = 8", a dose "40 mg/kg".
_NOT_MEASURE_BEFORE = re.compile(r"\b[nN]\s*=\s*$")
_NOT_MEASURE_AFTER = re.compile(r"^\s*(?:mg|µg|μg|ug|ng|mL|µL|μL|IU|mM|µM|μM|nM)\b")
_PLURAL_HEADS = frozenset(
    "counts levels concentrations values scores weights volumes rates times pressures".split()
)
#: A "was/were" link right before the value: its subject may open the sentence.
_SUBJECT_LINK = re.compile(r"\b(?:was|were)\s*[^\w]*$", re.I)
_CHANGE_BY = re.compile(r"\s+(?:changed|increased|decreased|rose|fell)\s+by\b", re.I)
_BARE_CHANGE = re.compile(
    r"(?:increase|decrease|reduction|rise|fall|decline|drop|elevation)s?", re.I
)
_DEFINED_AT_END = re.compile(r"\s*\((?P<short>[A-Za-z][\w-]{0,8}\w)\)$")
_CLAUSE_CUT = re.compile(
    r"[;:]|,\s|\band\b|\bwhile\b|\bwhereas\b|\bbut\b|\bvs\.?|\bversus\b|\bthan\b", re.I
)
_NOT_OUTCOMES = frozenset(
    "it this that these those they values data results mice rats animals patients group groups"
    " value level levels there which".split()
)


def _time_value(match: re.Match[str], how: str) -> str:
    if how == "unit_number":
        unit = match.group(1).lower()
        unit = "week" if unit == "wk" else unit
        return f"{unit} {match.group(2)}"
    if how == "after_event":
        unit = _TIME_UNIT_NAMES.get(match.group(2).lower(), match.group(2))
        return f"{match.group(1)} {unit} after {match.group(3).lower()}"
    if how == "after":
        unit = _TIME_UNIT_NAMES.get(match.group(2).lower(), match.group(2))
        if unit in ("days", "weeks", "months", "years") and match.group(1) == "1":
            unit = unit[:-1]
        return f"{match.group(1)} {unit}"
    return (
        match.group(1)
        .lower()
        .replace("pretreatment", "pre-treatment")
        .replace("posttreatment", "post-treatment")
    )


def _find_times(text: str, norm: str) -> list[ContextMention]:
    found: list[ContextMention] = []
    for pattern, how in _TIME_PATTERNS:
        for match in pattern.finditer(norm):
            if any(m.start < match.end() and match.start() < m.end for m in found):
                continue
            found.append(
                ContextMention(
                    "time_point",
                    text[match.start() : match.end()],
                    _time_value(match, how),
                    match.start(),
                    match.end(),
                )
            )
    return found


def _find_methods(text: str, norm: str) -> list[ContextMention]:
    found = [
        ContextMention("method", text[m.start() : m.end()], m.group(0), m.start(), m.end())
        for m in _lexicon_regex("methods").finditer(norm)
    ]
    for match in _METHOD_PHRASE.finditer(norm):
        start, end = match.start(1), match.end(1)
        if any(m.start < end and start < m.end for m in found):
            continue
        found.append(ContextMention("method", text[start:end], match.group(1), start, end))
    return found


def _find_subjects(text: str, norm: str) -> list[ContextMention]:
    found: list[ContextMention] = []
    for match in _lexicon_regex("subjects").finditer(norm):
        start, end = match.start(), match.end()
        if _is_run_in_heading(norm, start, end):
            continue
        modifiers = _SUBJECT_MODIFIERS.search(norm[max(0, start - 80) : start])
        if modifiers:
            start -= len(_strain_words(modifiers.group(1)))
        age = _SUBJECT_AGE_AFTER.match(norm[end : end + 40])
        if age:
            end += age.end()
        if any(m.start < end and start < m.end for m in found):
            continue
        found.append(
            ContextMention(
                "subject", text[start:end], " ".join(text[start:end].split()), start, end
            )
        )
    return found


def _is_run_in_heading(norm: str, start: int, end: int) -> bool:
    """A subject word standing alone as a run-in heading ("Animals. Male rats were ...")."""
    before = norm[:start].rstrip()
    return (not before or before[-1] in ".:;") and norm[end : end + 1] in (".", ":")


def _strain_words(modifiers: str) -> str:
    """The modifiers before a subject noun that belong to the subject: a word that is no strain
    name ("Control", "All", "twelve") cuts the run, and only what follows it is kept."""
    cut = 0
    for token in re.finditer(r"\S+", modifiers):
        if token.group(0).lower() in _NOT_STRAIN:
            cut = token.end()
    return modifiers[cut:].lstrip()


def _find_interventions(text: str, norm: str) -> list[ContextMention]:
    found: list[ContextMention] = []
    for pattern in _INTERVENTION_PATTERNS:
        for match in pattern.finditer(norm):
            start, end = match.start(1), match.end(1)
            if any(m.start < end and start < m.end for m in found):
                continue
            value = " ".join(text[start:end].split())
            found.append(ContextMention("intervention", text[start:end], value, start, end))
    return found


@lru_cache(maxsize=1)
def _control_regex() -> re.Pattern[str]:
    subjects = "|".join(re.escape(entry) for entry in load_lexicon("subjects"))
    return re.compile(rf"\b({_CONTROL_WORDS})(?:-treated)?\s+(?:{subjects})\b", re.I)


def _find_groups(text: str, norm: str) -> list[ContextMention]:
    found: list[ContextMention] = []
    for match in _DOSE_RANK.finditer(norm):
        value = f"{match.group(1).lower()} dose"
        found.append(
            ContextMention(
                "group", text[match.start() : match.end()], value, match.start(), match.end()
            )
        )
    for match in _GIVEN_GROUP.finditer(norm):
        start, end = match.start(1), match.end(1)
        value = " ".join(text[start:end].split())
        found.append(ContextMention("group", text[start:end], value, start, end))
    for match in _control_regex().finditer(norm):
        start, end = match.start(1), match.end(1)
        if not any(m.start < end and start < m.end for m in found):
            found.append(ContextMention("group", text[start:end], text[start:end], start, end))
    for pattern in _GROUP_PATTERNS:
        for match in pattern.finditer(norm):
            start, end = match.start(1), match.end(1)
            value = " ".join(text[start:end].split())
            if value.lower() in _GROUP_NOT or value.split()[0].lower() in _GROUP_NOT:
                continue
            if any(m.start < end and start < m.end for m in found):
                continue
            found.append(ContextMention("group", text[start:end], value, start, end))
    return found


def _expand_defined(norm: str, offset: int, phrase: str) -> tuple[int, str]:
    """Widen a phrase that ends in an abbreviation defined there to its whole long form:
    "event (NSAE)" of "a non-serious adverse event (NSAE)" -> "non-serious adverse event (NSAE)"."""
    match = _DEFINED_AT_END.search(phrase)
    if match is None:
        return offset, phrase
    before = norm[: offset + match.start()].rstrip()
    long_form = long_form_for(match["short"], before)
    if long_form is None or not before.endswith(long_form):
        return offset, phrase
    start = len(before) - len(long_form)
    if start >= offset:
        return offset, phrase
    return start, norm[start : offset + len(phrase)]


def find_outcome(text: str, start: int) -> ContextMention | None:
    """The outcome (measured thing) a value at ``start`` belongs to.

    Reads the clause before the value: "Serum creatinine was 0.42 ± 0.05 mg/dL" ->
    "serum creatinine"; "body mass of 24.1 g" -> "body mass"; "Heart rate: 412 bpm" ->
    "heart rate". Falls back to the last outcome named in the lexicon before the value.

    Args:
        text: the sentence.
        start: character offset of the value in ``text``.

    Returns:
        A mention of kind "outcome" (``value`` lowercased except for acronyms) or None.
    """
    norm = normalize_text(text)
    head = norm[:start]
    cuts = list(_CLAUSE_CUT.finditer(head))
    clause_start = 0
    for cut in reversed(cuts):
        if _OUTCOME_BEFORE.search(head[cut.end() :]):
            clause_start = cut.end()
            break
    clause = head[clause_start:]
    match = _OUTCOME_BEFORE.search(clause)
    if match:
        phrase = match.group(1)
        offset = clause_start + match.start(1)
        trimmed = phrase
        while True:
            lead = _OUTCOME_LEADING.match(trimmed)
            if not lead:
                break
            offset += lead.end()
            trimmed = trimmed[lead.end() :]
        trimmed = re.sub(r"\s*\([^)]*$", "", trimmed).strip()
        verbs = list(_VERB_IN_PHRASE.finditer(trimmed))
        if verbs:
            verb = verbs[-1]
            offset += verb.end()
            trimmed = trimmed[verb.end() :]
            lead = _OUTCOME_LEADING.match(trimmed)
            while lead:
                offset += lead.end()
                trimmed = trimmed[lead.end() :]
                lead = _OUTCOME_LEADING.match(trimmed)
        time_lead = _TIME_LEAD.match(trimmed)
        if time_lead:
            offset += time_lead.end()
            trimmed = trimmed[time_lead.end() :]
        lead = _OUTCOME_LEADING.match(trimmed)
        while lead:
            offset += lead.end()
            trimmed = trimmed[lead.end() :]
            lead = _OUTCOME_LEADING.match(trimmed)
        trimmed = _METHOD_TAIL.sub("", trimmed)
        widened = (trimmed + clause[match.end(1) :]).rstrip(" :=(")
        if _BARE_CHANGE.fullmatch(trimmed) and re.match(
            rf"{trimmed}\s+(?:in|of)\s+[A-Za-z]", widened
        ):
            # "the increase in X in group Y was 4": the measured thing follows the change noun
            trimmed = widened
        kept = trim_outcome(trimmed)
        subject = sentence_subject(norm) if _SUBJECT_LINK.search(head) else None
        if kept is None and subject is not None:
            # "The rate of X (unit) to maintain ... (i.e., basal period) were 1.9": the subject
            offset, trimmed = subject[0], norm[subject[0] : subject[1]]
        elif kept is None:
            trimmed = ""
        else:
            offset, trimmed = offset + kept[0], kept[1]
            offset, trimmed = _expand_defined(norm, offset, trimmed)
        words = trimmed.split()
        after_number = re.search(r"\d\s*$", norm[:offset]) is not None
        if (
            words
            and trimmed.lower() not in _NOT_OUTCOMES
            and not words[0][0].isdigit()
            and not after_number
            and not _NOT_OUTCOME_START.match(trimmed)
            and not _TREATMENT_IN_PHRASE.search(trimmed)
        ):
            lexicon_hit = _lexicon_regex("outcomes").search(norm, offset, offset + len(trimmed))
            if lexicon_hit is None and len(words) > 4:
                words = words[-4:]
                trimmed = " ".join(words)
                offset = norm.index(trimmed, offset)
            end = offset + len(trimmed)
            value = _tidy_outcome(text[offset:end])
            if _CHANGE_BY.match(norm, end):
                value = f"change in {value}"
            return ContextMention("outcome", text[offset:end], value, offset, end)
    # A parallel value ("... was 26.7 h in controls and 30.2 h in treated cultures") shares
    # the outcome of the value before it.
    for earlier in reversed(list(re.finditer(r"(?<![\w.])-?\d+(?:\.\d+)?", head))):
        if _NOT_MEASURE_BEFORE.search(head, 0, earlier.start()) or _NOT_MEASURE_AFTER.match(
            head[earlier.end() :]
        ):
            continue
        if earlier.start() < clause_start or _clause_has_link(head, earlier.start()):
            shared = find_outcome(text, earlier.start())
            if shared is not None:
                return shared
            break
    hits = [m for m in _lexicon_regex("outcomes").finditer(norm) if m.end() <= start]
    if hits:
        hit = hits[-1]
        return ContextMention(
            "outcome",
            text[hit.start() : hit.end()],
            _tidy_outcome(hit.group(0)),
            hit.start(),
            hit.end(),
        )
    return None


def _clause_has_link(head: str, start: int) -> bool:
    return _OUTCOME_BEFORE.search(head[:start]) is not None


def _tidy_outcome(phrase: str) -> str:
    words = phrase.split()
    tidy = " ".join(w if (w.isupper() or any(c.isdigit() for c in w)) else w.lower() for w in words)
    if words and words[-1].lower() in _PLURAL_HEADS:
        return tidy[:-1]
    singular = tidy[:-1] if tidy.endswith("s") and not tidy.endswith("ss") else None
    outcomes = {entry.lower() for entry in load_lexicon("outcomes")}
    if singular and singular in outcomes and tidy not in outcomes:
        return singular
    return tidy


def find_context(text: str) -> list[ContextMention]:
    """Every context mention in a sentence or legend: time points, methods, subjects,
    interventions, groups (outcomes come from :func:`find_outcome`, per value).

    Args:
        text: a sentence, paragraph, legend or header.

    Returns:
        Mentions sorted by offset.
    """
    norm = normalize_text(text)
    found = (
        _find_times(text, norm)
        + _find_methods(text, norm)
        + _find_subjects(text, norm)
        + _find_interventions(text, norm)
        + _find_groups(text, norm)
    )
    found.sort(key=lambda m: (m.start, m.kind))
    return found


def summarize_context(
    mentions: list[ContextMention], *, outcome: str | None = None
) -> SentenceContext:
    """One value per kind from a list of mentions (the first of each kind; all groups)."""
    first: dict[str, str] = {}
    groups: list[str] = []
    for mention in mentions:
        if mention.kind == "group":
            if mention.value not in groups:
                groups.append(mention.value)
        else:
            first.setdefault(mention.kind, mention.value)
    return SentenceContext(
        time_point=first.get("time_point"),
        method=first.get("method"),
        subject=first.get("subject"),
        intervention=first.get("intervention"),
        outcome=outcome if outcome is not None else first.get("outcome"),
        groups=tuple(groups),
    )
