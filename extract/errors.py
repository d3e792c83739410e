"""Errors that winnow raises on bad input.

Each error keeps its fields (path, reason, ...), builds its one-line message in ``__str__`` and
pickles cleanly, so that a process pool can send it back to the parent. The command line turns a
:class:`WinnowError` into one line naming the file and the reason; any other exception is a bug.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any


class WinnowError(Exception):
    """Base class of every error winnow raises on bad input or bad settings."""

    def __init__(self, reason: str) -> None:
        super().__init__(reason)
        self.reason = reason

    def __str__(self) -> str:
        return self.reason

    def __reduce__(self) -> tuple[Any, ...]:
        return (self.__class__, (self.reason,))


class InputFileError(WinnowError, OSError):
    """An input file that cannot be read as an article (base of the format-specific errors)."""

    def __init__(self, path: str | Path, reason: str) -> None:
        WinnowError.__init__(self, reason)
        self.path = str(path)

    def __str__(self) -> str:
        return f"{self.path}: {self.reason}"

    def __reduce__(self) -> tuple[Any, ...]:
        return (self.__class__, (self.path, self.reason))


class PDFReadError(InputFileError):
    """A PDF that is corrupt, truncated, encrypted, image-only or not a PDF at all."""


class XMLReadError(InputFileError):
    """An XML file that is malformed or is not a JATS article."""


class UnsupportedFileError(InputFileError):
    """A file whose content is neither a PDF nor a JATS XML article."""


class ParseTimeoutError(InputFileError, TimeoutError):
    """A file that took longer than the per-file time limit to read."""


class UnitError(WinnowError, ValueError):
    """A unit string that the unit registry cannot interpret."""

    def __init__(self, unit: str, reason: str = "unknown unit") -> None:
        WinnowError.__init__(self, reason)
        self.unit = unit

    def __str__(self) -> str:
        return f"{self.unit!r}: {self.reason}"

    def __reduce__(self) -> tuple[Any, ...]:
        return (self.__class__, (self.unit, self.reason))


class ImportFileError(WinnowError, ValueError):
    """A malformed import file (e.g. decisions JSON Lines); ``line`` is 1-based or None."""

    def __init__(self, path: str | Path, reason: str, line: int | None = None) -> None:
        WinnowError.__init__(self, reason)
        self.path = str(path)
        self.line = line

    def __str__(self) -> str:
        where = f"{self.path}:{self.line}" if self.line is not None else self.path
        return f"{where}: {self.reason}"

    def __reduce__(self) -> tuple[Any, ...]:
        return (self.__class__, (self.path, self.reason, self.line))


class StoreError(WinnowError, RuntimeError):
    """A store that cannot be opened or written, or a conflicting write (e.g. a lock held)."""


class SettingsError(WinnowError, ValueError):
    """Settings that do not validate."""
