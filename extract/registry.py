"""The extractor registry: every extractor by its ``name@version`` id.

Built on catalogue (spaCy's own registry library). Built-in extractors register themselves
when their module is imported; :func:`load_builtins` imports every built-in module explicitly,
and plugins come through the ``winnow_extractors`` entry-point group. An unknown name fails with
the list of available names. ``tests/registry_contents.json`` is the golden list of ids.
"""

from __future__ import annotations

import importlib
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import catalogue

from extract.errors import SettingsError

__all__ = [
    "BUILTIN_MODULES",
    "ExtractorInfo",
    "extractors",
    "get",
    "load_builtins",
    "names",
    "register_extractor",
]

#: Modules whose import registers the built-in extractors.
BUILTIN_MODULES: tuple[str, ...] = (
    "extract.nlp.tokenizer",
    "extract.nlp.pipeline",
    "extract.records.from_text",
    "extract.records.from_tables",
)

#: The catalogue registry of extractors (entry-point group ``winnow_extractors``).
extractors = catalogue.create("winnow", "extractors", entry_points=True)


@dataclass(frozen=True)
class ExtractorInfo:
    """What the registry knows about one extractor.

    Attributes:
        name: dotted name, e.g. "quantities.rules".
        version: integer version, bumped whenever its output can change.
        factory: the spaCy factory name that builds it (``None`` for non-spaCy extractors).
        description: one line on what it finds.
    """

    name: str
    version: int
    factory: str | None
    description: str

    @property
    def id(self) -> str:
        """The ``name@version`` id that proposals record."""
        return f"{self.name}@{self.version}"


def register_extractor(
    name: str, version: int, *, factory: str | None, description: str
) -> Callable[[Any], Any]:
    """Class decorator: register an extractor under ``name@version``.

    Args:
        name: dotted lowercase name, e.g. "sample_size.rules".
        version: its version.
        factory: the spaCy factory that builds it, if any.
        description: one line on what it finds.

    Returns:
        The decorator (returns the class unchanged).
    """
    info = ExtractorInfo(name=name, version=version, factory=factory, description=description)

    def decorator(obj: Any) -> Any:
        extractors.register(info.id, func=info)
        return obj

    return decorator


def load_builtins() -> None:
    """Import every built-in extractor module so that each registers itself."""
    for module in BUILTIN_MODULES:
        importlib.import_module(module)


def names() -> list[str]:
    """Sorted ``name@version`` ids of every registered extractor (built-ins loaded first)."""
    load_builtins()
    return sorted(extractors.get_all())


def get(name: str) -> ExtractorInfo:
    """The extractor with id ``name@version``, or the highest version of ``name``.

    Args:
        name: "quantities.rules@1" or "quantities.rules".

    Returns:
        Its :class:`ExtractorInfo`.

    Raises:
        SettingsError: no such extractor; the message lists the available ids.
    """
    available = names()
    if "@" in name:
        if name in available:
            info: ExtractorInfo = extractors.get(name)
            return info
    else:
        versions = [extractors.get(entry) for entry in available if entry.split("@", 1)[0] == name]
        if versions:
            best: ExtractorInfo = max(versions, key=lambda entry: entry.version)
            return best
    raise SettingsError(f"unknown extractor {name!r}; available: {', '.join(available)}")
