"""The spaCy pipeline: blank English, our tokenizer, sentence rules and rule components.

``load_pipeline()`` builds (once per process) ``spacy.blank("en")`` with the customised
tokenizer (``winnow.tokenizer.v1``) and these registered components:

=====================  ========================  ================================================
spaCy factory          extractor id              sets
=====================  ========================  ================================================
``sentences_rules``    ``sentences.rules@1``     ``token.is_sent_start``
``quantities_rules``   ``quantities.rules@3``    ``doc.spans["quantities"]``, ``span._.quantity``
``sample_size_rules``  ``sample_size.rules@2``   ``doc.spans["sample_sizes"]``, ``span._.sample_size``
``context_rules``      ``context.rules@6``       ``doc.spans["context"]``, ``span._.context``
=====================  ========================  ================================================

Span labels are the quantity's role, the sample size's scope and the context kind. The pipeline
saves with ``nlp.to_disk`` and loads with ``load_pipeline(path=...)``, so trained components
from models/ can be added later. :func:`analyze` runs it on a paragraph and returns plain frozen
values per sentence for the records layer.
"""

from __future__ import annotations

import json
import logging
import threading
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import spacy
from spacy.language import Language
from spacy.tokens import Doc, Span

from extract.nlp.context import ContextMention, find_context, find_outcome
from extract.nlp.count_outcome import count_outcomes
from extract.nlp.quantities import Quantity, find_quantities
from extract.nlp.sample_size import SampleSize, find_sample_sizes
from extract.nlp.tokenizer import SentenceSplitter
from extract.registry import register_extractor

__all__ = [
    "DISPERSION_KEY",
    "ContextComponent",
    "QuantitiesComponent",
    "SampleSizeComponent",
    "SentenceFindings",
    "analyze",
    "build_pipeline",
    "load_pipeline",
]

log = logging.getLogger(__name__)

#: ``doc.user_data`` key: the dispersion kind the caller's context declares ("SD", "SEM" ...).
DISPERSION_KEY = "winnow.dispersion"
_PIPES = ("sentences_rules", "quantities_rules", "sample_size_rules", "context_rules")

#: ``doc.user_data`` key: {(start_char, end_char, label): value} behind the span extensions
#: (spaCy keys span extension values by offsets alone, so two labels on one span would clash).
VALUES_KEY = "winnow.span_values"


def _span_value(attribute: str) -> Any:
    def getter(span: Span) -> Any:
        values = span.doc.user_data.get(VALUES_KEY, {})
        return values.get((attribute, span.start_char, span.end_char, span.label_))

    return getter


def _set_span_value(span: Span, attribute: str, value: Any) -> None:
    values = span.doc.user_data.setdefault(VALUES_KEY, {})
    values[(attribute, span.start_char, span.end_char, span.label_)] = value


for _attribute in ("quantity", "sample_size", "context"):
    if not Span.has_extension(_attribute):
        Span.set_extension(_attribute, getter=_span_value(_attribute))

register_extractor(
    "sentences.rules",
    SentenceSplitter.version,
    factory="sentences_rules",
    description="sentence starts; keeps vs., et al., Fig. 2, i.e. and decimals whole",
)(SentenceSplitter)


def _sentences(doc: Doc) -> list[Span]:
    return list(doc.sents) if doc.has_annotation("SENT_START") else [doc[:]]


class _RuleComponent:
    """Shared parts of our stateless rule components: versioned to_disk/from_disk."""

    name = ""
    version = 0

    def initialize(self, get_examples: Any = None, *, nlp: Language | None = None) -> None:
        """Nothing to learn: rules and lexicons only."""

    def to_disk(self, path: str | Path, *, exclude: Any = ()) -> None:
        """Write the component's id (rules live in the code and lexicons)."""
        folder = Path(path)
        folder.mkdir(parents=True, exist_ok=True)
        (folder / "component.json").write_text(
            json.dumps({"name": self.name, "version": self.version}), encoding="utf-8"
        )

    def from_disk(self, path: str | Path, *, exclude: Any = ()) -> _RuleComponent:
        """Check the saved id; warn when a saved pipeline was made by another version."""
        saved = json.loads((Path(path) / "component.json").read_text(encoding="utf-8"))
        if saved.get("version") != self.version:
            log.warning(
                "%s: saved pipeline has version %s, this code has %s",
                self.name,
                saved.get("version"),
                self.version,
            )
        return self


class QuantitiesComponent(_RuleComponent):
    """Finds every number per sentence; ``doc.spans["quantities"]`` labelled by role."""

    name = "quantities.rules"
    version = 3

    def __call__(self, doc: Doc) -> Doc:
        dispersion = doc.user_data.get(DISPERSION_KEY)
        spans = []
        for sent in _sentences(doc):
            for quantity in find_quantities(sent.text, dispersion=dispersion):
                span = _char_span(doc, sent.start_char, quantity.start, quantity.end, quantity.role)
                if span is not None:
                    _set_span_value(span, "quantity", _shift_quantity(quantity, sent.start_char))
                    spans.append(span)
        doc.spans["quantities"] = spans
        return doc


register_extractor(
    QuantitiesComponent.name,
    QuantitiesComponent.version,
    factory="quantities_rules",
    description="values, units, SD/SEM/CI/IQR/range, counts with percent, roles",
)(QuantitiesComponent)


class SampleSizeComponent(_RuleComponent):
    """Finds sample sizes per sentence; ``doc.spans["sample_sizes"]`` labelled by scope."""

    name = "sample_size.rules"
    version = 2

    def __call__(self, doc: Doc) -> Doc:
        spans = []
        for sent in _sentences(doc):
            for size in find_sample_sizes(sent.text):
                span = _char_span(doc, sent.start_char, size.start, size.end, size.scope)
                if span is not None:
                    shifted = replace(
                        size, start=size.start + sent.start_char, end=size.end + sent.start_char
                    )
                    _set_span_value(span, "sample_size", shifted)
                    spans.append(span)
        doc.spans["sample_sizes"] = spans
        return doc


register_extractor(
    SampleSizeComponent.name,
    SampleSizeComponent.version,
    factory="sample_size_rules",
    description="sample sizes: n = 8 per group, Vehicle (n = 9), n = 6-8, twelve mice per group",
)(SampleSizeComponent)


class ContextComponent(_RuleComponent):
    """Finds context mentions per sentence, plus the outcome of each measured value.

    ``doc.spans["context"]`` labelled by kind; outcomes need ``doc.spans["quantities"]``.
    """

    name = "context.rules"
    version = 6

    def __call__(self, doc: Doc) -> Doc:
        spans = []
        quantities = list(doc.spans["quantities"]) if "quantities" in doc.spans else []
        for sent in _sentences(doc):
            mentions = find_context(sent.text)
            for span in quantities:
                if span.start_char < sent.start_char or span.end_char > sent.end_char:
                    continue
                if span._.quantity is None or span._.quantity.role != "measure":
                    continue
                outcome = find_outcome(sent.text, span.start_char - sent.start_char)
                if outcome is not None and all(
                    (m.start, m.end) != (outcome.start, outcome.end) for m in mentions
                ):
                    mentions.append(outcome)
            counts = [
                (span.start_char - sent.start_char, span.end_char - sent.start_char)
                for span in quantities
                if sent.start_char <= span.start_char
                and span.end_char <= sent.end_char
                and _is_text_count(span._.quantity)
            ]
            for outcome in count_outcomes(sent.text, counts):
                if outcome is not None and all(
                    (m.start, m.end) != (outcome.start, outcome.end) for m in mentions
                ):
                    mentions.append(outcome)
            for mention in mentions:
                span = _char_span(doc, sent.start_char, mention.start, mention.end, mention.kind)
                if span is not None:
                    shifted_mention = replace(
                        mention,
                        start=mention.start + sent.start_char,
                        end=mention.end + sent.start_char,
                    )
                    _set_span_value(span, "context", shifted_mention)
                    spans.append(span)
        doc.spans["context"] = spans
        return doc


register_extractor(
    ContextComponent.name,
    ContextComponent.version,
    factory="context_rules",
    description="time point, method, subject, intervention, group; outcome of each measure",
)(ContextComponent)


def _is_text_count(quantity: Quantity | None) -> bool:
    """A measured count with no unit ("241 (18.9%)", "46/108"): it names what it counted after
    itself."""
    return (
        quantity is not None
        and quantity.role == "measure"
        and quantity.statistic == "count"
        and quantity.unit is None
    )


def _char_span(doc: Doc, offset: int, start: int, end: int, label: str) -> Span | None:
    span = doc.char_span(offset + start, offset + end, label=label, alignment_mode="expand")
    if span is None:
        log.debug("no token span for characters %d-%d", offset + start, offset + end)
    return span


def _shift_quantity(quantity: Quantity, offset: int) -> Quantity:
    return replace(quantity, start=quantity.start + offset, end=quantity.end + offset)


@Language.factory("quantities_rules", default_config={}, assigns=["doc.spans"])
def create_quantities(nlp: Language, name: str) -> QuantitiesComponent:
    """spaCy factory for :class:`QuantitiesComponent`."""
    return QuantitiesComponent()


@Language.factory("sample_size_rules", default_config={}, assigns=["doc.spans"])
def create_sample_size(nlp: Language, name: str) -> SampleSizeComponent:
    """spaCy factory for :class:`SampleSizeComponent`."""
    return SampleSizeComponent()


@Language.factory("context_rules", default_config={}, assigns=["doc.spans"])
def create_context(nlp: Language, name: str) -> ContextComponent:
    """spaCy factory for :class:`ContextComponent`."""
    return ContextComponent()


def build_pipeline() -> Language:
    """A fresh pipeline: blank English, our tokenizer, sentence rules and rule components."""
    nlp = spacy.blank("en", config={"nlp": {"tokenizer": {"@tokenizers": "winnow.tokenizer.v1"}}})
    for pipe in _PIPES:
        nlp.add_pipe(pipe)
    return nlp


_cache: dict[str, Language] = {}
_cache_lock = threading.Lock()


def load_pipeline(*, path: str | Path | None = None) -> Language:
    """The pipeline, built or loaded once per process (and per path).

    Args:
        path: a folder written by ``nlp.to_disk``; default: build the rule pipeline.

    Returns:
        The shared :class:`spacy.language.Language`; do not modify it (build your own with
        :func:`build_pipeline` for that).
    """
    key = str(path) if path is not None else ""
    with _cache_lock:
        if key not in _cache:
            _cache[key] = spacy.load(path) if path is not None else build_pipeline()
        return _cache[key]


@dataclass(frozen=True)
class SentenceFindings:
    """What the pipeline found in one sentence; offsets are into the text given to analyze.

    Attributes:
        text: the sentence.
        start: its character offset.
        end: offset just past it.
        quantities: every number, in order (check ``role``: only "measure" is a data point).
        outcomes: the outcome of each quantity (None where not found or not a measure),
            aligned with ``quantities``.
        sample_sizes: sample sizes stated in the sentence.
        context: time points, methods, subjects, interventions and groups.
    """

    text: str
    start: int
    end: int
    quantities: tuple[Quantity, ...]
    outcomes: tuple[ContextMention | None, ...]
    sample_sizes: tuple[SampleSize, ...]
    context: tuple[ContextMention, ...]


def analyze(
    text: str, *, dispersion: str | None = None, nlp: Language | None = None
) -> list[SentenceFindings]:
    """Run the pipeline on a paragraph and return plain values per sentence.

    Args:
        text: a paragraph, legend or sentence.
        dispersion: the kind the surrounding context declares ("SD", "SEM" ...), used for
            spreads whose own sentence does not say.
        nlp: a pipeline; default :func:`load_pipeline`.

    Returns:
        One :class:`SentenceFindings` per sentence.
    """
    nlp = nlp or load_pipeline()
    doc = nlp.make_doc(text)
    doc.user_data[DISPERSION_KEY] = dispersion
    for _name, proc in nlp.pipeline:
        doc = proc(doc)
    results = []
    for sent in _sentences(doc):

        def inside(span: Span, sent: Span = sent) -> bool:
            return sent.start_char <= span.start_char and span.end_char <= sent.end_char

        quantities = [s._.quantity for s in doc.spans.get("quantities", []) if inside(s)]
        mentions = [s._.context for s in doc.spans.get("context", []) if inside(s)]
        outcome_mentions = [m for m in mentions if m.kind == "outcome"]
        # A count's own outcome follows it ("241 (18.9%) cases occurred in ..."); other values
        # never take an outcome that names what a count counted.
        after_count = {
            id(m): q
            for q in quantities
            if _is_text_count(q)
            for m in outcome_mentions
            if q.end <= m.start <= q.end + 3
        }
        outcomes = []
        for quantity in quantities:
            outcome = None
            if quantity.role == "measure":
                own = [m for m in outcome_mentions if after_count.get(id(m)) is quantity]
                before = [
                    m
                    for m in outcome_mentions
                    if m.end <= quantity.start
                    and (id(m) not in after_count or _is_text_count(quantity))
                ]
                outcome = own[0] if own else before[-1] if before else None
            outcomes.append(outcome)
        results.append(
            SentenceFindings(
                text=sent.text,
                start=sent.start_char,
                end=sent.end_char,
                quantities=tuple(quantities),
                outcomes=tuple(outcomes),
                sample_sizes=tuple(
                    s._.sample_size for s in doc.spans.get("sample_sizes", []) if inside(s)
                ),
                context=tuple(m for m in mentions if m.kind != "outcome"),
            )
        )
    return results
