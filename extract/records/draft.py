"""The draft record that extractors fill in before linking turns it into a Proposal.

A draft holds what one extractor read at one place, plus ``found``: for each field, where its
value came from ("cell", "header", "caption", "sentence", "methods", ...). Linking fills the gaps,
derives the SD, normalises the unit, scores confidence from ``found`` and gives the stable id.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import Any

from extract.records.proposal import Source

#: How a field was found -> how far it is trusted (0..1). Nearer sources are trusted more.
FOUND_WEIGHTS: dict[str, float] = {
    "cell": 1.0,
    "value": 1.0,
    "sentence": 0.95,
    "header": 0.95,
    "row": 0.95,
    "section": 0.85,
    "column": 0.95,
    "n_row": 0.95,
    "paragraph": 0.85,
    "caption": 0.9,
    "footnote": 0.9,
    "legend": 0.85,
    "methods": 0.75,
    "document": 0.7,
    "assumed": 0.45,
    "missing": 0.5,
}


@dataclass(frozen=True)
class Draft:
    """One data point as an extractor read it, before linking.

    ``order`` sorts drafts in document order; ``location`` (with ``raw``, the value as written)
    makes the stable id; ``dispersion_value`` is a number or a (low, high) pair whose kind may still
    be unknown (``dispersion_kind`` None) until linking reads the methods.
    """

    order: tuple[float, ...]
    outcome: str
    group: str | None
    statistic: str | None
    value: float
    raw: str
    unit: str | None
    dispersion_kind: str | None
    dispersion_value: float | tuple[float, float] | None
    n: int | None
    source: Source
    extractor: str
    location: tuple[Any, ...]
    time_point: str | None = None
    method: str | None = None
    subject: str | None = None
    intervention: str | None = None
    found: tuple[tuple[str, str], ...] = ()
    flags: tuple[str, ...] = field(default=())

    def how(self, name: str) -> str | None:
        """Where the field ``name`` was found, or ``None``."""
        for key, how in self.found:
            if key == name:
                return how
        return None

    def with_found(self, name: str, how: str, **changes: Any) -> Draft:
        """A copy with ``changes`` applied and field ``name`` recorded as found ``how``."""
        found = tuple((k, h) for k, h in self.found if k != name) + ((name, how),)
        return self._copy_with(found=found, **changes)

    def with_flag(self, flag: str) -> Draft:
        """A copy with one more flag."""
        if flag in self.flags:
            return self
        return self._copy_with(flags=self.flags + (flag,))

    def _copy_with(self, **changes: Any) -> Draft:
        # dataclasses.replace re-runs __init__ over every field; linking copies drafts thousands
        # of times per article, so copy the instance and set only what changes.
        unknown = set(changes) - _FIELD_NAMES
        if unknown:
            raise TypeError(f"Draft has no field(s) {sorted(unknown)}")
        new = object.__new__(Draft)
        state = new.__dict__
        state.update(self.__dict__)
        state.update(changes)
        return new


#: Names of the Draft fields, checked by :meth:`Draft._copy_with`.
_FIELD_NAMES: frozenset[str] = frozenset(f.name for f in fields(Draft))
