"""Run a function over many files in a process pool, with a time limit per file.

Each file gets its own worker process, at most ``workers`` at a time, so a pathological file
that hangs is killed when its time is up and reported as timed out while the others go on.
A :class:`~extract.errors.WinnowError` raised for one file is recorded as that file's failure
(the errors pickle); any other exception is a bug and is re-raised in the parent.
"""

from __future__ import annotations

import logging
import multiprocessing as mp
import os
import time
import traceback
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass
from multiprocessing.connection import Connection
from pathlib import Path
from typing import Any, Generic, TypeVar

from extract.errors import ParseTimeoutError, SettingsError, WinnowError

logger = logging.getLogger(__name__)

T = TypeVar("T")

#: Default per-file time limit in seconds.
DEFAULT_TIMEOUT = 120.0
#: Suffixes picked up when a directory is walked.
ARTICLE_SUFFIXES = (".pdf", ".xml")


@dataclass(frozen=True)
class FileResult(Generic[T]):
    """The outcome for one file: a value, or the error that stopped it."""

    path: str
    value: T | None = None
    error: WinnowError | None = None
    seconds: float = 0.0

    @property
    def ok(self) -> bool:
        """Whether the function returned a value."""
        return self.error is None


@dataclass(frozen=True)
class BatchResult(Generic[T]):
    """Results per file, in input order."""

    results: tuple[FileResult[T], ...]

    @property
    def failures(self) -> tuple[FileResult[T], ...]:
        """The files that failed."""
        return tuple(r for r in self.results if not r.ok)

    @property
    def succeeded(self) -> tuple[FileResult[T], ...]:
        """The files that went through."""
        return tuple(r for r in self.results if r.ok)


class _Bug(Exception):
    """An unexpected exception in a worker, carried back with its traceback text."""


def find_files(
    paths: Iterable[str | Path], *, suffixes: Sequence[str] = ARTICLE_SUFFIXES
) -> list[Path]:
    """Files given directly, plus files with ``suffixes`` found by walking directories.

    Files named directly are kept whatever their suffix (their content decides later).
    """
    out: list[Path] = []
    for item in paths:
        path = Path(item)
        if path.is_dir():
            out.extend(
                sorted(p for p in path.rglob("*") if p.is_file() and p.suffix.lower() in suffixes)
            )
        else:
            out.append(path)
    return out


def _child(func: Callable[[Path], Any], path: Path, conn: Connection) -> None:
    try:
        conn.send(("ok", func(path)))
    except WinnowError as error:
        conn.send(("error", error))
    except BaseException as error:  # a bug: send its traceback to the parent
        conn.send(("bug", f"{type(error).__name__}: {error}\n{traceback.format_exc()}"))
    finally:
        conn.close()


def run_batch(
    func: Callable[[Path], T],
    paths: Sequence[str | Path],
    *,
    workers: int | None = None,
    timeout: float | None = DEFAULT_TIMEOUT,
    progress: Callable[[FileResult[T]], None] | None = None,
) -> BatchResult[T]:
    """Apply ``func`` to every file, each in its own process, at most ``workers`` at once.

    Args:
        func: a picklable (module-level) function of one path.
        paths: the files.
        workers: processes at once (default: CPU count, at most the number of files);
            ``0`` runs in this process without a time limit (for debugging).
        timeout: seconds allowed per file; a worker past it is killed and the file gets a
            :class:`~extract.errors.ParseTimeoutError`. ``None`` waits without limit.
        progress: called with each file's result as it finishes.

    Returns:
        The results in input order.

    Raises:
        SettingsError: ``workers`` or ``timeout`` is negative.
        RuntimeError: ``func`` raised something that is not a WinnowError (a bug).
    """
    if workers is not None and workers < 0:
        raise SettingsError("workers must be 0 or more")
    if timeout is not None and timeout <= 0:
        raise SettingsError("timeout must be positive")
    files = [Path(p) for p in paths]
    if workers == 0:
        return BatchResult(tuple(_run_inline(func, files, progress)))
    limit = max(1, min(workers or os.cpu_count() or 1, len(files) or 1))
    context: Any = mp.get_context("fork" if hasattr(os, "fork") else "spawn")
    results: dict[int, FileResult[T]] = {}
    pending = list(enumerate(files))
    running: dict[int, tuple[Any, Connection, float]] = {}
    try:
        while pending or running:
            while pending and len(running) < limit:
                index, path = pending.pop(0)
                parent_end, child_end = context.Pipe(duplex=False)
                process = context.Process(target=_child, args=(func, path, child_end), daemon=True)
                process.start()
                child_end.close()
                running[index] = (process, parent_end, time.monotonic())
            finished = _collect(running, files, timeout)
            for index, result in finished:
                results[index] = result
                if progress is not None:
                    progress(result)
            if not finished:
                time.sleep(0.005)
    finally:
        for process, conn, _ in running.values():
            process.kill()
            conn.close()
    return BatchResult(tuple(results[i] for i in range(len(files))))


def _collect(
    running: dict[int, tuple[Any, Connection, float]], files: list[Path], timeout: float | None
) -> list[tuple[int, FileResult[Any]]]:
    done: list[tuple[int, FileResult[Any]]] = []
    for index, (process, conn, started) in list(running.items()):
        elapsed = time.monotonic() - started
        path = files[index]
        if conn.poll():
            try:
                status, payload = conn.recv()
            except EOFError:
                status, payload = "bug", "worker exited without a result"
            process.join()
            conn.close()
            del running[index]
            if status == "ok":
                done.append((index, FileResult(str(path), value=payload, seconds=elapsed)))
            elif status == "error":
                done.append((index, FileResult(str(path), error=payload, seconds=elapsed)))
            else:
                raise RuntimeError(f"{path}: {payload}")
        elif not process.is_alive():
            conn.close()
            del running[index]
            reason = f"worker died (exit code {process.exitcode})"
            done.append(
                (
                    index,
                    FileResult(str(path), error=WinnowError(f"{path}: {reason}"), seconds=elapsed),
                )
            )
        elif timeout is not None and elapsed > timeout:
            process.kill()
            process.join()
            conn.close()
            del running[index]
            logger.warning("%s: timed out after %.0f s", path, timeout)
            error = ParseTimeoutError(path, f"timed out after {timeout:g} s")
            done.append((index, FileResult(str(path), error=error, seconds=elapsed)))
    return done


def _run_inline(
    func: Callable[[Path], T], files: list[Path], progress: Callable[[FileResult[T]], None] | None
) -> list[FileResult[T]]:
    out: list[FileResult[T]] = []
    for path in files:
        started = time.monotonic()
        try:
            result: FileResult[T] = FileResult(str(path), value=func(path))
        except WinnowError as error:
            result = FileResult(str(path), error=error)
        result = FileResult(result.path, result.value, result.error, time.monotonic() - started)
        out.append(result)
        if progress is not None:
            progress(result)
    return out
