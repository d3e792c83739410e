"""The batch first pass: article files -> Documents -> proposals -> store and/or JSON Lines.

:func:`extract_file` reads one file and runs the first pass on it (it is what each worker of the
process pool runs). :func:`run_batch` plans a batch (expands folders, drops exact repeats, prefers
the JATS XML of an article also given as a PDF, skips files already processed with the same
extractor versions) and then runs the pool through :mod:`extract.batch`, storing each article with
its proposals in one transaction as its result arrives. A failed file is reported by name and
reason; the others go through. Every proposal is a suggestion for a curator to verify.
"""

from __future__ import annotations

import hashlib
import logging
import os
import re
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import IO, Any

from extract.errors import InputFileError, WinnowError
from extract.ingest.document import Document
from extract.ingest.sniff import sniff
from extract.records.proposal import Proposal

log = logging.getLogger(__name__)

#: Most workers used by default (and never more than the CPU count).
DEFAULT_MAX_WORKERS = 4
#: A DOI as printed (Crossref's recommended pattern, widened to common characters).
DOI_PATTERN = re.compile(r"\b10\.\d{4,9}/[-._;()/:A-Za-z0-9]+[A-Za-z0-9]")

#: Statuses of a file in a batch report.
STATUSES: tuple[str, ...] = ("extracted", "skipped", "replaced", "repeated", "failed")


def default_workers() -> int:
    """``min(4, cpu count)``."""
    return max(1, min(DEFAULT_MAX_WORKERS, os.cpu_count() or 1))


# --------------------------------------------------------------------------------------------
# One file (runs in a worker process)


def extract_file(path: str | Path, *, nlp: Any = None) -> tuple[Document, list[Proposal]]:
    """Read one article (PDF or JATS XML, by content) and run the first pass on it.

    Args:
        path: the article file.
        nlp: a spaCy pipeline to reuse; None builds (and caches) the default one.

    Returns:
        The document (without its words, which nothing downstream needs) and its proposals.

    Raises:
        InputFileError: the file cannot be read as an article (a subclass names the reason).
    """
    from extract.ingest import read_document
    from extract.records.assemble import first_pass

    document = read_document(path)
    proposals = first_pass(document, nlp=nlp)
    return replace(document, words=()), list(proposals)


# --------------------------------------------------------------------------------------------
# Planning a batch


@dataclass(frozen=True)
class InputFile:
    """A file to process, with what could be learnt cheaply before reading it."""

    path: Path
    sha256: str
    kind: str  # "pdf", "xml" or "unknown"
    doi: str | None


@dataclass(frozen=True)
class FileReport:
    """What happened to one input file.

    ``status`` is one of :data:`STATUSES`: ``extracted`` (read now), ``skipped`` (already
    processed with the same extractor versions), ``replaced`` (a PDF whose article was read from
    its JATS XML instead), ``repeated`` (the same content given twice), ``failed``.
    """

    path: str
    status: str
    article: str | None = None
    proposals: int = 0
    added: int = 0
    note: str | None = None
    #: Of ``proposals``: read from table cells (the rest from sentences).
    from_tables: int = 0
    #: Of ``proposals``: below :data:`DOUBT_CONFIDENCE` confidence, for a closer look.
    doubtful: int = 0


#: Proposals under this confidence are counted as doubtful in the batch summary.
DOUBT_CONFIDENCE = 0.7


def _from_tables(proposals: Sequence[Proposal]) -> int:
    """How many proposals came from table cells (for the summary)."""
    return sum(1 for p in proposals if p.source.kind == "table")


def _doubtful(proposals: Sequence[Proposal]) -> int:
    """How many proposals are under :data:`DOUBT_CONFIDENCE` (for the summary)."""
    return sum(1 for p in proposals if p.confidence < DOUBT_CONFIDENCE)


@dataclass(frozen=True)
class BatchReport:
    """The outcome of a batch: one report per input file, in input order."""

    files: tuple[FileReport, ...]
    extractor_key: str

    def count(self, status: str) -> int:
        """How many files ended with this status."""
        return sum(1 for f in self.files if f.status == status)

    @property
    def failures(self) -> tuple[FileReport, ...]:
        return tuple(f for f in self.files if f.status == "failed")

    @property
    def proposals(self) -> int:
        """Proposals made or read back for the extracted and skipped files."""
        return sum(f.proposals for f in self.files)

    @property
    def articles(self) -> int:
        """Articles extracted now or found already processed."""
        return sum(1 for f in self.files if f.status in ("extracted", "skipped"))


def collect_inputs(targets: Iterable[str | Path]) -> list[Path]:
    """The files named, and the ``*.pdf`` / ``*.xml`` files inside folders named (recursively).

    Files named directly are kept whatever they hold (a bad one fails with its reason later);
    the reader is chosen by content, not by name. Folders are walked as ``winnow parse`` does.

    Raises:
        InputFileError: a target that does not exist.
    """
    from extract.batch import find_files

    for target in targets:
        if not Path(target).exists():
            raise InputFileError(target, "no such file or folder")
    return find_files(targets)


def sniff_kind(path: Path) -> str:
    """``"pdf"`` or ``"xml"`` from the file's first bytes, else ``"unknown"`` (never raises).

    The same judgement the reader makes (:func:`extract.ingest.sniff`); a file it refuses or
    cannot read is ``"unknown"`` here and fails with its reason when the worker reads it.
    """
    try:
        return sniff(path)
    except WinnowError:
        return "unknown"


def file_sha256(path: Path) -> str:
    """Hex SHA-256 of the file's bytes (the same digest ingest records)."""
    digest = hashlib.sha256()
    with path.open("rb") as handle:
        for chunk in iter(lambda: handle.read(1 << 20), b""):
            digest.update(chunk)
    return digest.hexdigest()


def peek_doi(path: Path, kind: str) -> str | None:
    """The article's DOI found cheaply (XML front matter; a PDF's first page), else None.

    Only used to notice a PDF and an XML of the same article in one batch; never raises.
    """
    try:
        if kind == "xml":
            return _xml_doi(path)
        if kind == "pdf":
            return _pdf_doi(path)
    except Exception as error:  # a peek must never stop the batch: the worker reports failures
        log.debug("%s: no DOI found before reading (%s)", path, error)
    return None


def _xml_doi(path: Path) -> str | None:
    from lxml import etree

    for _, element in etree.iterparse(
        str(path), events=("end",), tag="{*}article-id", resolve_entities=False, no_network=True
    ):
        if element.get("pub-id-type") == "doi" and element.text:
            return element.text.strip()
    return None


def _pdf_doi(path: Path) -> str | None:
    import pypdfium2 as pdfium

    pdf = pdfium.PdfDocument(str(path))
    try:
        for index in range(min(2, len(pdf))):
            text = pdf[index].get_textpage().get_text_range()
            found = DOI_PATTERN.search(text.replace("\r", ""))
            if found:
                return found.group().rstrip(".")
    finally:
        pdf.close()
    return None


@dataclass
class _Plan:
    todo: list[InputFile] = field(default_factory=list)
    reports: dict[Path, FileReport] = field(default_factory=dict)
    skipped: list[InputFile] = field(default_factory=list)


def plan_batch(
    paths: Sequence[Path], *, is_processed: Callable[[str], bool] | None = None
) -> _Plan:
    """Decide what each file needs: repeats and PDFs with an XML twin drop out, done ones skip.

    A PDF's DOI is only looked for where it can matter: when the batch holds an XML file with a
    DOI (a possible twin) or when the file is skipped (its report names the article).
    """
    plan = _Plan()
    inputs: list[InputFile] = []
    seen: dict[str, Path] = {}
    for path in paths:
        try:
            sha = file_sha256(path)
        except OSError as error:
            reason = error.strerror or str(error)
            plan.reports[path] = FileReport(str(path), "failed", note=f"cannot read ({reason})")
            continue
        if sha in seen:
            plan.reports[path] = FileReport(
                str(path), "repeated", note=f"same content as {seen[sha]}"
            )
            continue
        seen[sha] = path
        kind = sniff_kind(path)
        inputs.append(InputFile(path, sha, kind, peek_doi(path, kind) if kind == "xml" else None))
    xml_by_doi = {item.doi.casefold(): item for item in inputs if item.kind == "xml" and item.doi}
    for item in inputs:
        if item.kind == "pdf" and xml_by_doi:
            item = replace(item, doi=peek_doi(item.path, item.kind))
        twin = xml_by_doi.get(item.doi.casefold()) if item.kind == "pdf" and item.doi else None
        if twin is not None:
            plan.reports[item.path] = FileReport(
                str(item.path),
                "replaced",
                article=item.doi,
                note=f"same DOI as {twin.path.name}: extracted once, from the XML",
            )
        elif is_processed is not None and is_processed(item.sha256):
            if item.kind == "pdf" and not xml_by_doi:
                item = replace(item, doi=peek_doi(item.path, item.kind))
            plan.skipped.append(item)
        else:
            plan.todo.append(item)
    return plan


# --------------------------------------------------------------------------------------------
# Running a batch


ProgressCallback = Callable[[str, FileReport], None]


def run_batch(
    targets: Iterable[str | Path],
    *,
    store: Any = None,
    jsonl: IO[str] | None = None,
    workers: int | None = None,
    timeout: float | None = None,
    extractor_key: str | None = None,
    on_plan: Callable[[int], None] | None = None,
    on_file: ProgressCallback | None = None,
) -> BatchReport:
    """Run the first pass over files and folders, into a store and/or a JSON Lines stream.

    Args:
        targets: files and folders (folders are searched for PDF and XML files).
        store: an open :class:`~extract.store.Store` (``open_store(...)``), or None.
        jsonl: a text stream that gets one proposal contract object per line, or None.
        workers: processes in the pool (default ``min(4, cpu count)``).
        timeout: seconds allowed per file (None: no limit).
        extractor_key: the extractor versions the run stands for (default: from the registry).
        on_plan: called once with the number of files the pool will read.
        on_file: called with ``(path, report)`` as each file ends.

    Returns:
        One report per input file; re-running on the same files adds nothing to the store.

    Raises:
        InputFileError: a target that does not exist (before anything is read).
    """
    paths = collect_inputs(targets)
    key = extractor_key or current_extractor_key()
    is_processed = (lambda sha: bool(store.is_processed(sha, key))) if store is not None else None
    plan = plan_batch(paths, is_processed=is_processed)
    reports = dict(plan.reports)

    for item in plan.skipped:
        stored = _stored_proposals(store, item)
        if jsonl is not None:
            _write_jsonl(jsonl, stored)
        reports[item.path] = FileReport(
            str(item.path),
            "skipped",
            article=stored[0].article if stored else item.doi,
            proposals=len(stored),
            note="already processed with these extractor versions",
            from_tables=_from_tables(stored),
            doubtful=_doubtful(stored),
        )
        if on_file:
            on_file(str(item.path), reports[item.path])
    if on_plan:
        on_plan(len(plan.todo))

    def finished(path: str, result: Any, error: BaseException | None) -> None:
        if error is not None:
            report = FileReport(path, "failed", note=_reason(error, path))
        else:
            document, proposals = result
            added = 0
            if store is not None:
                added = store.add_extraction(document, proposals, extractor_key=key)
            if jsonl is not None:
                _write_jsonl(jsonl, proposals)
            report = FileReport(
                path,
                "extracted",
                article=document.doi or document.name,
                proposals=len(proposals),
                added=added,
                from_tables=_from_tables(proposals),
                doubtful=_doubtful(proposals),
            )
        reports[Path(path)] = report
        if on_file:
            on_file(path, report)

    _pool(
        [item.path for item in plan.todo], extract_file, finished, workers=workers, timeout=timeout
    )
    return BatchReport(tuple(reports[p] for p in paths if p in reports), key)


def _reason(error: BaseException, path: str) -> str:
    if isinstance(error, InputFileError):
        return error.reason
    if isinstance(error, WinnowError):
        return str(error)
    return f"{type(error).__name__}: {error}"


def _write_jsonl(stream: IO[str], proposals: Iterable[Proposal]) -> None:
    for proposal in proposals:
        stream.write(proposal.to_json() + "\n")
    stream.flush()


def _stored_proposals(store: Any, item: InputFile) -> list[Proposal]:
    """The proposals stored from this file (matched by the file's base name)."""
    states = store.proposals(item.doi) if item.doi else []
    if not states:
        states = store.proposals()
    return [s.proposal for s in states if s.proposal.file == item.path.name]


def current_extractor_key() -> str:
    """The key of the extractor versions the first pass runs now (``name@version`` joined).

    Files processed with the same key are skipped on a re-run; a new version re-reads them.
    """
    from extract.registry import names

    return extractor_key_of(names())


def extractor_key_of(extractors: Any) -> str:
    """A stable key from extractor ids: ``"a@1;b@2"`` (sorted, unique)."""
    if isinstance(extractors, dict):
        items: Iterable[Any] = (
            f"{name}@{getattr(value, 'version', value)}" for name, value in extractors.items()
        )
    else:
        items = (str(getattr(e, "id", e)) for e in extractors)
    return ";".join(sorted(set(items)))


def _pool(
    paths: Sequence[Path],
    function: Callable[[Path], Any],
    on_result: Callable[[str, Any, BaseException | None], None],
    *,
    workers: int | None,
    timeout: float | None,
) -> None:
    """Run ``function`` over ``paths`` in extract.batch's process pool.

    ``on_result(path, value, error)`` is called in this process as each file ends, so results
    are stored while the others still run.
    """
    from extract.batch import DEFAULT_TIMEOUT, run_batch

    if not paths:
        return
    _warm_up()
    run_batch(
        function,
        list(paths),
        workers=workers if workers is not None else default_workers(),
        timeout=timeout if timeout is not None else DEFAULT_TIMEOUT,
        progress=lambda result: on_result(result.path, result.value, result.error),
    )


def _warm_up() -> None:
    """Build the one-off things (unit registry, pipeline modules) once, before workers fork."""
    from extract.ingest import read_document  # noqa: F401
    from extract.records.assemble import first_pass  # noqa: F401
    from extract.units import get_registry

    get_registry()


# --------------------------------------------------------------------------------------------
# Inputs for the evaluation


def evaluate_file(
    path: str | Path, *, with_first_pass: bool = True
) -> tuple[list[Proposal] | None, list[Proposal]]:
    """Read one article once and make the first pass's and the naive baseline's proposals.

    Args:
        path: the article file.
        with_first_pass: False when the first pass's proposals come from elsewhere (a JSON Lines
            file); then only the baseline runs.

    Returns:
        ``(first pass proposals or None, baseline proposals)``.
    """
    from extract.baseline import baseline_proposals
    from extract.ingest import read_document

    document = read_document(path)
    first: list[Proposal] | None = None
    if with_first_pass:
        from extract.records.assemble import first_pass

        first = list(first_pass(document))
    return first, baseline_proposals(document)


def articles_beside(gold_files: Iterable[Path], *, source: str = "pdf") -> list[Path]:
    """The article file next to each gold file: ``<name>.pdf`` or ``<name>.xml``.

    Args:
        gold_files: ``<name>.gold.json`` files.
        source: ``"pdf"`` or ``"xml"``: which to take when both exist (else whichever exists).

    Raises:
        InputFileError: a gold file with no article beside it.
    """
    order = (".pdf", ".xml") if source == "pdf" else (".xml", ".pdf")
    found: list[Path] = []
    for gold in gold_files:
        stem = gold.name.removesuffix(".gold.json")
        candidates = [gold.with_name(stem + suffix) for suffix in order]
        article = next((c for c in candidates if c.is_file()), None)
        if article is None:
            raise InputFileError(gold, f"no article beside it ({stem}.pdf or {stem}.xml)")
        found.append(article)
    return found


@dataclass(frozen=True)
class EvaluationInputs:
    """Proposals of the first pass and of the baseline for a set of articles, and failures."""

    first_pass: tuple[Proposal, ...]
    baseline: tuple[Proposal, ...]
    failures: tuple[FileReport, ...]


def run_for_evaluation(
    paths: Sequence[Path],
    *,
    with_first_pass: bool = True,
    workers: int | None = None,
    timeout: float | None = None,
    on_file: Callable[[str], None] | None = None,
) -> EvaluationInputs:
    """Run :func:`evaluate_file` over articles in the process pool.

    ``on_file`` is called with each file's path as it finishes (for a progress display).

    Returns:
        Proposals in input order (first pass empty when ``with_first_pass`` is False).
    """
    from functools import partial

    from extract.baseline import quantities_in

    quantities_in("1.5 g")  # quantulum3's one-off load, done once before the workers fork
    function = partial(evaluate_file, with_first_pass=with_first_pass)
    results: dict[str, tuple[list[Proposal] | None, list[Proposal]]] = {}
    failures: list[FileReport] = []

    def finished(path: str, result: Any, error: BaseException | None) -> None:
        if error is not None:
            failures.append(FileReport(path, "failed", note=_reason(error, path)))
        else:
            results[path] = result
        if on_file is not None:
            on_file(path)

    _pool(list(paths), function, finished, workers=workers, timeout=timeout)
    first: list[Proposal] = []
    baseline: list[Proposal] = []
    for p in paths:
        if str(p) in results:
            mine, naive = results[str(p)]
            first.extend(mine or [])
            baseline.extend(naive)
    return EvaluationInputs(tuple(first), tuple(baseline), tuple(failures))
