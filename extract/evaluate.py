"""Score proposals against gold files: matching, precision/recall/F1 and per-field accuracy.

The rules (docs/accuracy.md explains them for readers):

* A proposal **matches** a gold data point when both belong to the same article (the proposal's
  ``article`` is the gold DOI or file stem), come from the same source kind (text or table), sit
  in the same table (tables, by label) or on the same page (text; a proposal without a page, read
  from XML, is not held to one), and carry an equal central value (relative tolerance 1e-6).
* Matching is **one-to-one**: each gold point pairs with at most one proposal and each proposal
  with at most one gold point. Among candidates, pairs that agree on more fields pair first; then
  augmenting paths make the number of pairs as large as possible. A duplicate proposal of an
  already matched point is a false positive.
* A matched pair is a **complete record** when unit, dispersion (kind and value) and n are right
  as well (the value already is). Units compare after normalising spellings (µ/μ/u, "mcg",
  litre "l"/"L", spaces, superscripts).
* Text fields (outcome, group, time point) compare **fuzzily**: after Unicode (NFKC) folding,
  case folding, dropping "(n = 9)" mentions and punctuation, and a plural "s", they are right
  when the words of one are all among the words of the other.

Scores are counts, so they add across articles like spaCy's ``PRFScore``.
"""

from __future__ import annotations

import json
import logging
import math
import re
import unicodedata
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from extract.errors import ImportFileError
from extract.records.proposal import Dispersion, Proposal

log = logging.getLogger(__name__)

#: Relative tolerance when comparing printed numbers.
VALUE_REL_TOL = 1e-6
#: Absolute tolerance (for zero values).
VALUE_ABS_TOL = 1e-9
#: Fields whose accuracy is reported on matched pairs.
FIELDS: tuple[str, ...] = ("unit", "statistic", "dispersion", "n", "group", "outcome", "time_point")
#: Suffix of gold files.
GOLD_SUFFIX = ".gold.json"


# --------------------------------------------------------------------------------------------
# Gold files


@dataclass(frozen=True)
class GoldPoint:
    """One reported data point from a gold file."""

    id: str
    where: str
    page: int | None
    section: str | None
    table: str | None
    row: int | None
    col: int | None
    outcome: str
    group: str | None
    statistic: str
    value: float
    unit: str | None
    dispersion: Dispersion | None
    n: int | None
    time_point: str | None
    quote: str = ""


@dataclass(frozen=True)
class GoldArticle:
    """A gold file: the article's identity, scenario, layout and every data point."""

    name: str
    doi: str | None
    scenario: str
    columns: int
    table_styles: Mapping[str, str]
    points: tuple[GoldPoint, ...]
    path: str = ""

    def keys(self) -> set[str]:
        """The values a proposal's ``article`` may take for this article (DOI and stem)."""
        keys = {self.name.casefold()}
        if self.doi:
            keys.add(self.doi.casefold())
        return keys


def load_gold(path: str | Path) -> GoldArticle:
    """Read one gold file.

    Args:
        path: a ``<name>.gold.json`` file in the format of docs/architecture.md.

    Returns:
        The gold article.

    Raises:
        ImportFileError: the file is not valid JSON or lacks a required field.
    """
    path = Path(path)
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
        styles = {
            _norm_label(t["label"]): str(t.get("style") or "unknown")
            for t in data.get("tables", [])
        }
        points = tuple(_gold_point(p) for p in data["data_points"])
        name = str(data.get("article") or path.name.removesuffix(GOLD_SUFFIX))
        return GoldArticle(
            name=name,
            doi=data.get("doi"),
            scenario=str(data.get("scenario") or "unknown"),
            columns=int((data.get("layout") or {}).get("columns", 1)),
            table_styles=styles,
            points=points,
            path=str(path),
        )
    except (OSError, ValueError, KeyError, TypeError) as error:
        raise ImportFileError(path, f"not a readable gold file ({error!r})") from error


def _gold_point(data: Mapping[str, Any]) -> GoldPoint:
    return GoldPoint(
        id=str(data["id"]),
        where=str(data["where"]),
        page=data.get("page"),
        section=data.get("section"),
        table=data.get("table"),
        row=data.get("row"),
        col=data.get("col"),
        outcome=str(data.get("outcome") or ""),
        group=data.get("group"),
        statistic=str(data.get("statistic") or "single"),
        value=float(data["value"]),
        unit=data.get("unit"),
        dispersion=Dispersion.from_dict(data.get("dispersion")),
        n=data.get("n"),
        time_point=data.get("time_point"),
        quote=str(data.get("quote") or ""),
    )


def find_gold_files(directory: str | Path) -> list[Path]:
    """Every ``*.gold.json`` file in ``directory`` (not recursive), sorted by name."""
    return sorted(Path(directory).glob(f"*{GOLD_SUFFIX}"))


def load_proposals_jsonl(path: str | Path) -> list[Proposal]:
    """Read proposals from a JSON Lines file (one contract object per line).

    Raises:
        ImportFileError: a line that is not JSON or not a proposal record (1-based line number).
    """
    path = Path(path)
    proposals: list[Proposal] = []
    try:
        lines = path.read_text(encoding="utf-8").splitlines()
    except OSError as error:
        raise ImportFileError(path, f"cannot read ({error.strerror or error})") from error
    for number, line in enumerate(lines, start=1):
        if not line.strip():
            continue
        try:
            proposals.append(Proposal.from_dict(json.loads(line)))
        except (ValueError, KeyError, TypeError) as error:
            raise ImportFileError(path, f"not a proposal record ({error})", line=number) from error
    return proposals


# --------------------------------------------------------------------------------------------
# Scores that add up


@dataclass
class PRFScore:
    """Counts of true positives, false positives and false negatives; adds across articles.

    Precision = TP / (TP + FP), recall = TP / (TP + FN), F1 their harmonic mean; each is 0.0
    when its denominator is 0.
    """

    tp: int = 0
    fp: int = 0
    fn: int = 0

    def __add__(self, other: PRFScore) -> PRFScore:
        return PRFScore(self.tp + other.tp, self.fp + other.fp, self.fn + other.fn)

    def __iadd__(self, other: PRFScore) -> PRFScore:
        self.tp += other.tp
        self.fp += other.fp
        self.fn += other.fn
        return self

    @property
    def precision(self) -> float:
        return self.tp / (self.tp + self.fp) if self.tp + self.fp else 0.0

    @property
    def recall(self) -> float:
        return self.tp / (self.tp + self.fn) if self.tp + self.fn else 0.0

    @property
    def fscore(self) -> float:
        p, r = self.precision, self.recall
        return 2 * p * r / (p + r) if p + r else 0.0

    def to_dict(self) -> dict[str, float | int]:
        return {
            "tp": self.tp,
            "fp": self.fp,
            "fn": self.fn,
            "precision": self.precision,
            "recall": self.recall,
            "f1": self.fscore,
        }


@dataclass
class Tally:
    """Right answers out of all answers (per-field accuracy); adds across articles."""

    correct: int = 0
    total: int = 0

    def __add__(self, other: Tally) -> Tally:
        return Tally(self.correct + other.correct, self.total + other.total)

    @property
    def accuracy(self) -> float:
        return self.correct / self.total if self.total else 0.0

    def to_dict(self) -> dict[str, float | int]:
        return {"correct": self.correct, "total": self.total, "accuracy": self.accuracy}


@dataclass
class Scores:
    """Value-level and complete-record scores, per-field accuracy and breakdowns.

    ``breakdown`` maps a feature (``"scenario=..."``, ``"columns=2"``, ``"where=table"``,
    ``"table_style=ruled"``, ``"article=..."``) to its value-level and complete-record scores.
    """

    value: PRFScore = field(default_factory=PRFScore)
    complete: PRFScore = field(default_factory=PRFScore)
    fields: dict[str, Tally] = field(default_factory=lambda: {name: Tally() for name in FIELDS})
    breakdown: dict[str, tuple[PRFScore, PRFScore]] = field(default_factory=dict)
    ignored: int = 0

    def __add__(self, other: Scores) -> Scores:
        merged = Scores(
            value=self.value + other.value,
            complete=self.complete + other.complete,
            fields={
                name: self.fields.get(name, Tally()) + other.fields.get(name, Tally())
                for name in FIELDS
            },
            ignored=self.ignored + other.ignored,
        )
        for key in sorted(set(self.breakdown) | set(other.breakdown)):
            mine = self.breakdown.get(key, (PRFScore(), PRFScore()))
            theirs = other.breakdown.get(key, (PRFScore(), PRFScore()))
            merged.breakdown[key] = (mine[0] + theirs[0], mine[1] + theirs[1])
        return merged

    def to_dict(self) -> dict[str, Any]:
        """A JSON-ready dict of every score."""
        return {
            "value": self.value.to_dict(),
            "complete": self.complete.to_dict(),
            "fields": {name: tally.to_dict() for name, tally in self.fields.items()},
            "breakdown": {
                key: {"value": v.to_dict(), "complete": c.to_dict()}
                for key, (v, c) in sorted(self.breakdown.items())
            },
            "ignored": self.ignored,
        }


# --------------------------------------------------------------------------------------------
# Comparisons


_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻", "0123456789-")


def normalize_unit(unit: str | None) -> str | None:
    """A unit spelling with its cosmetic variants folded (µ/μ/u, mcg, l/L, spaces, ^, ×).

    Case is kept otherwise: "mM" (millimolar) and "mm" (millimetre) stay different.
    """
    if unit is None:
        return None
    text = re.sub(r"[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]+", lambda m: "^" + m.group().translate(_SUPERSCRIPTS), unit)
    text = unicodedata.normalize("NFKC", text)
    text = text.replace("\u00b5", "\u03bc").replace("×", "x").replace("·", ".")
    text = re.sub(r"\s+", "", text).replace("**", "^")
    text = re.sub(r"mcg", "μg", text)
    text = re.sub(r"(?:^|(?<=[/.(]))u(?=mol|g|L|l|M|m|s\b)", "μ", text)
    text = re.sub(r"(?<=[/μmdn])l\b|^l$", "L", text)
    text = re.sub(r"^x(?=10)", "", text)
    return text or None


def units_equal(gold: str | None, proposal: Proposal) -> bool:
    """Whether the proposal's unit is the gold unit, after spelling normalisation or by UCUM code."""
    if normalize_unit(gold) == normalize_unit(proposal.unit):
        return True
    return gold is not None and proposal.unit_ucum is not None and gold == proposal.unit_ucum


def values_equal(a: float, b: float) -> bool:
    """Equal printed numbers (relative tolerance 1e-6)."""
    return math.isclose(a, b, rel_tol=VALUE_REL_TOL, abs_tol=VALUE_ABS_TOL)


def dispersions_equal(a: Dispersion | None, b: Dispersion | None) -> bool:
    """Same kind and same value (or same [low, high] pair); two missing dispersions agree."""
    if a is None or b is None:
        return a is None and b is None
    if a.kind != b.kind:
        return False
    if isinstance(a.value, tuple) and isinstance(b.value, tuple):
        return all(values_equal(x, y) for x, y in zip(a.value, b.value, strict=True))
    if isinstance(a.value, tuple) or isinstance(b.value, tuple):
        return False
    return values_equal(a.value, b.value)


_N_MENTION = re.compile(r"\(?\bn\s*[=:]\s*\d+\)?", re.IGNORECASE)
_STOPWORDS = frozenset({"the", "a", "an", "of", "in", "at", "group"})


def text_tokens(text: str | None) -> tuple[str, ...]:
    """The words a fuzzy comparison looks at (folded, without "(n = 9)" and stop words)."""
    if not text:
        return ()
    folded = unicodedata.normalize("NFKC", text).casefold()
    folded = _N_MENTION.sub(" ", folded)
    folded = re.sub(r"(?<!\d)[.,](?!\d)|[^\w.,/%+\-μ]", " ", folded)
    tokens = []
    for token in folded.split():
        token = token.strip(".,-")
        if len(token) > 3 and token.endswith("s") and not token.endswith("ss"):
            token = token[:-1]
        if token and token not in _STOPWORDS:
            tokens.append(token)
    return tuple(tokens)


def texts_agree(gold: str | None, proposed: str | None) -> bool:
    """Fuzzy agreement: equal after folding, or the words of one all appear in the other."""
    a, b = set(text_tokens(gold)), set(text_tokens(proposed))
    if not a or not b:
        return not a and not b
    return a <= b or b <= a


def field_correct(name: str, gold: GoldPoint, proposal: Proposal) -> bool:
    """Whether one field of a matched pair is right (see the module docstring for the rules)."""
    if name == "unit":
        return units_equal(gold.unit, proposal)
    if name == "statistic":
        return gold.statistic == proposal.statistic
    if name == "dispersion":
        return dispersions_equal(gold.dispersion, proposal.dispersion)
    if name == "n":
        return gold.n == proposal.n
    if name in ("group", "outcome", "time_point"):
        return texts_agree(getattr(gold, name), getattr(proposal, name))
    raise ValueError(f"unknown field {name!r}; known: {', '.join(FIELDS)}")


def is_complete(gold: GoldPoint, proposal: Proposal) -> bool:
    """A matched pair whose unit, dispersion and n are right too."""
    return (
        values_equal(gold.value, proposal.value)
        and units_equal(gold.unit, proposal)
        and dispersions_equal(gold.dispersion, proposal.dispersion)
        and gold.n == proposal.n
    )


# --------------------------------------------------------------------------------------------
# Matching


def _norm_label(label: str | None) -> str:
    return re.sub(r"[\s.:]+", " ", unicodedata.normalize("NFKC", label or "")).strip().casefold()


def is_candidate(gold: GoldPoint, proposal: Proposal) -> bool:
    """Same source kind, same table (by label) or page, and an equal value."""
    source = proposal.source
    if source.kind != gold.where or not values_equal(gold.value, proposal.value):
        return False
    if gold.where == "table":
        return _norm_label(source.table) == _norm_label(gold.table)
    return source.page is None or gold.page is None or source.page == gold.page


def _affinity(gold: GoldPoint, proposal: Proposal) -> int:
    score = sum(field_correct(name, gold, proposal) for name in FIELDS)
    if gold.where == "table":
        score += 2 * int(proposal.source.row == gold.row and proposal.source.col == gold.col)
    return score


def match(
    gold: Sequence[GoldPoint], proposals: Sequence[Proposal]
) -> list[tuple[GoldPoint, Proposal]]:
    """Pair gold points and proposals one-to-one (see the module docstring).

    Args:
        gold: the gold points of one article.
        proposals: the proposals for the same article.

    Returns:
        The matched pairs, in gold order.
    """
    edges: dict[int, list[int]] = {g: [] for g in range(len(gold))}
    ranked: list[tuple[int, int, int]] = []
    for g, point in enumerate(gold):
        for p, proposal in enumerate(proposals):
            if is_candidate(point, proposal):
                edges[g].append(p)
                ranked.append((-_affinity(point, proposal), g, p))
    gold_to: dict[int, int] = {}
    prop_to: dict[int, int] = {}
    for _, g, p in sorted(ranked):
        if g not in gold_to and p not in prop_to:
            gold_to[g], prop_to[p] = p, g

    def augment(g: int, seen: set[int]) -> bool:
        for p in edges[g]:
            if p in seen:
                continue
            seen.add(p)
            if p not in prop_to or augment(prop_to[p], seen):
                gold_to[g], prop_to[p] = p, g
                return True
        return False

    for g in range(len(gold)):
        if g not in gold_to and edges[g]:
            augment(g, set())
    return [(gold[g], proposals[gold_to[g]]) for g in sorted(gold_to)]


# --------------------------------------------------------------------------------------------
# Scoring


def _features(
    article: GoldArticle, where: str, table: str | None, *, style_unknown: str
) -> list[str]:
    """The breakdown keys a gold point or a proposal is counted under."""
    features = [
        f"article={article.name}",
        f"scenario={article.scenario}",
        f"columns={article.columns}",
        f"where={where}",
    ]
    if where == "table":
        style = article.table_styles.get(_norm_label(table), style_unknown)
        features.append(f"table_style={style}")
    return features


def _gold_features(article: GoldArticle, point: GoldPoint) -> list[str]:
    return _features(article, point.where, point.table, style_unknown="unknown")


def _proposal_features(article: GoldArticle, proposal: Proposal) -> list[str]:
    source = proposal.source
    return _features(article, source.kind, source.table, style_unknown="label-not-in-gold")


def score_article(article: GoldArticle, proposals: Sequence[Proposal]) -> Scores:
    """Score one article's proposals against its gold points.

    Args:
        article: the gold article.
        proposals: every proposal made for that article.

    Returns:
        Scores whose counts can be added to other articles' scores.
    """
    scores = Scores()
    pairs = match(article.points, proposals)
    matched_gold = {id(g) for g, _ in pairs}
    matched_props = {id(p) for _, p in pairs}

    def bump(features: list[str], value: PRFScore, complete: PRFScore) -> None:
        for key in features:
            v, c = scores.breakdown.setdefault(key, (PRFScore(), PRFScore()))
            v += value
            c += complete

    for gold_point, proposal in pairs:
        complete = is_complete(gold_point, proposal)
        scores.value.tp += 1
        c = PRFScore(tp=1) if complete else PRFScore(fp=1, fn=1)
        scores.complete += c
        bump(_gold_features(article, gold_point), PRFScore(tp=1), c)
        for name in FIELDS:
            scores.fields[name].total += 1
            scores.fields[name].correct += int(field_correct(name, gold_point, proposal))
    for gold_point in article.points:
        if id(gold_point) not in matched_gold:
            scores.value.fn += 1
            scores.complete.fn += 1
            bump(_gold_features(article, gold_point), PRFScore(fn=1), PRFScore(fn=1))
    for proposal in proposals:
        if id(proposal) not in matched_props:
            scores.value.fp += 1
            scores.complete.fp += 1
            bump(_proposal_features(article, proposal), PRFScore(fp=1), PRFScore(fp=1))
    return scores


def evaluate(
    articles: Iterable[GoldArticle], proposals: Iterable[Proposal | Mapping[str, Any]]
) -> Scores:
    """Score proposals for many articles against their gold files.

    Proposals whose ``article`` names no gold article are counted in ``Scores.ignored``.

    Args:
        articles: the gold articles.
        proposals: proposals (objects or contract dicts) for any of those articles.

    Returns:
        The summed scores.
    """
    articles = list(articles)
    by_key: dict[str, GoldArticle] = {}
    for article in articles:
        for key in article.keys():
            by_key[key] = article
    grouped: dict[str, list[Proposal]] = {article.name: [] for article in articles}
    ignored = 0
    for item in proposals:
        proposal = item if isinstance(item, Proposal) else Proposal.from_dict(dict(item))
        gold_article = by_key.get(proposal.article.casefold()) or by_key.get(
            Path(proposal.file).stem.casefold()
        )
        if gold_article is None:
            ignored += 1
            continue
        grouped[gold_article.name].append(proposal)
    if ignored:
        log.warning("%d proposals name no article with a gold file; left out", ignored)
    total = Scores(ignored=ignored)
    for article in articles:
        total = total + score_article(article, grouped[article.name])
    return total


# --------------------------------------------------------------------------------------------
# Plot


#: Breakdown prefixes shown in the plot, in this order.
PLOT_PREFIXES: tuple[str, ...] = ("scenario=", "columns=", "where=", "table_style=")


def plot_scores(
    scores: Mapping[str, Scores], path: str | Path, *, title: str = "Value-level F1"
) -> Path:
    """A bar chart (PNG) of value-level F1 per scenario and layout feature, one bar per system.

    Args:
        scores: system name (e.g. "winnow", "baseline") -> its scores.
        path: the PNG file to write.
        title: the chart's title.

    Returns:
        The path written.
    """
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    keys = sorted(
        {k for s in scores.values() for k in s.breakdown if k.startswith(PLOT_PREFIXES)},
        key=lambda k: (next(i for i, p in enumerate(PLOT_PREFIXES) if k.startswith(p)), k),
    )
    width = 0.8 / max(1, len(scores))
    figure, axes = plt.subplots(figsize=(max(6.0, 0.55 * len(keys) + 4), 4.2), dpi=100)
    for index, (name, system) in enumerate(scores.items()):
        heights = [system.breakdown.get(k, (PRFScore(), PRFScore()))[0].fscore for k in keys]
        positions = [i + (index - (len(scores) - 1) / 2) * width for i in range(len(keys))]
        axes.bar(
            positions, heights, width=width, label=f"{name} (overall {system.value.fscore:.2f})"
        )
    axes.set_xticks(range(len(keys)))
    axes.set_xticklabels([k.replace("_", " ") for k in keys], rotation=35, ha="right", fontsize=8)
    axes.set_ylim(0, 1.05)
    axes.set_ylabel("F1")
    axes.set_title(title)
    axes.legend(fontsize=8, loc="upper left", bbox_to_anchor=(1.0, 1.0))
    axes.grid(axis="y", alpha=0.3)
    figure.tight_layout()
    path = Path(path)
    figure.savefig(path)
    plt.close(figure)
    return path
