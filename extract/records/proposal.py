"""The proposal record: one pre-filled record per reported data point.

Field names and meanings are fixed by the proposal record contract (docs/proposal-record.md and
the JSON Schema in extract/schemas/proposal.schema.json). Extra fields are allowed; these are not
renamed. A proposal is a suggestion for a curator to verify, never a verified value.
"""

from __future__ import annotations

import hashlib
import json
from dataclasses import dataclass, field, fields, replace
from typing import Any

from extract.ingest.document import Block, Table

#: Allowed values of ``statistic``.
STATISTICS: tuple[str, ...] = ("mean", "median", "percent", "count", "single", "other")

#: Allowed values of ``dispersion.kind``.
DISPERSION_KINDS: tuple[str, ...] = ("SD", "SEM", "CI95", "IQR", "range")

#: Allowed values of ``source.kind``.
SOURCE_KINDS: tuple[str, ...] = ("text", "table")


@dataclass(frozen=True)
class Dispersion:
    """Spread around the central value: a single number (SD, SEM) or a [low, high] pair."""

    kind: str
    value: float | tuple[float, float]

    def __post_init__(self) -> None:
        if self.kind not in DISPERSION_KINDS:
            raise ValueError(f"dispersion kind {self.kind!r} is not one of {DISPERSION_KINDS}")

    def to_dict(self) -> dict[str, Any]:
        value = list(self.value) if isinstance(self.value, tuple) else self.value
        return {"kind": self.kind, "value": value}

    @classmethod
    def from_dict(cls, data: dict[str, Any] | None) -> Dispersion | None:
        if data is None:
            return None
        value = data["value"]
        if isinstance(value, list):
            value = (float(value[0]), float(value[1]))
        else:
            value = float(value)
        return cls(kind=data["kind"], value=value)


@dataclass(frozen=True)
class Source:
    """Where in the article the data point was read (provenance).

    ``page`` is 1-based, ``bbox`` is ``[x0, top, x1, bottom]`` in PDF points; both are ``None``
    for XML sources, which give ``ref`` (element path) instead. ``quote`` is the exact source text:
    the sentence for text, the cell text for tables.
    """

    kind: str
    page: int | None
    bbox: tuple[float, float, float, float] | None
    section: str | None
    table: str | None
    row: int | None
    col: int | None
    quote: str
    ref: str | None = None

    def to_dict(self) -> dict[str, Any]:
        data: dict[str, Any] = {
            "kind": self.kind,
            "page": self.page,
            "bbox": [round(v, 2) for v in self.bbox] if self.bbox is not None else None,
            "section": self.section,
            "table": self.table,
            "row": self.row,
            "col": self.col,
            "quote": self.quote,
        }
        if self.ref is not None:
            data["ref"] = self.ref
        return data

    @classmethod
    def of_text(
        cls, block: Block, quote: str, *, bbox: tuple[float, float, float, float] | None = None
    ) -> Source:
        """A text source: the quoted sentence of a block, located by the block's page or ref."""
        return cls(
            kind="text",
            page=block.page,
            bbox=bbox,
            section=block.section,
            table=None,
            row=None,
            col=None,
            quote=quote,
            ref=block.ref,
        )

    @classmethod
    def of_cell(cls, table: Table, row: int, col: int, *, quote: str | None = None) -> Source:
        """A table source: one cell, quoted whitespace-normalised unless ``quote`` is given."""
        cell = table.cell(row, col)
        return cls(
            kind="table",
            page=cell.page if cell.page is not None else table.page,
            bbox=cell.bbox,
            section=table.section,
            table=table.label,
            row=row,
            col=col,
            quote=" ".join(cell.text.split()) if quote is None else quote,
            ref=table.ref,
        )

    @classmethod
    def from_dict(cls, data: dict[str, Any]) -> Source:
        bbox = data.get("bbox")
        return cls(
            kind=data["kind"],
            page=data.get("page"),
            bbox=tuple(float(v) for v in bbox) if bbox is not None else None,  # type: ignore[arg-type]
            section=data.get("section"),
            table=data.get("table"),
            row=data.get("row"),
            col=data.get("col"),
            quote=data.get("quote", ""),
            ref=data.get("ref"),
        )


@dataclass(frozen=True)
class Proposal:
    """One proposed data point; the fields follow the proposal record contract."""

    id: str
    article: str
    file: str
    outcome: str
    group: str | None
    statistic: str
    value: float
    unit: str | None
    unit_ucum: str | None
    value_normalized: float | None
    unit_normalized: str | None
    dispersion: Dispersion | None
    sd: float | None
    n: int | None
    time_point: str | None
    method: str | None
    subject: str | None
    intervention: str | None
    source: Source
    extractor: str
    confidence: float
    #: Extra, allowed by the contract: reasons for doubt, e.g. "unknown_unit", "n_from_methods".
    flags: tuple[str, ...] = field(default=())

    def __post_init__(self) -> None:
        if self.statistic not in STATISTICS:
            raise ValueError(f"statistic {self.statistic!r} is not one of {STATISTICS}")
        if not 0.0 <= self.confidence <= 1.0:
            raise ValueError(f"confidence {self.confidence} is outside 0..1")

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of the contract (plus the extra ``flags``)."""
        data: dict[str, Any] = {}
        for f in fields(self):
            value = getattr(self, f.name)
            if isinstance(value, Dispersion | Source):
                value = value.to_dict()
            elif isinstance(value, tuple):
                value = list(value)
            data[f.name] = value
        return data

    def to_json(self) -> str:
        return json.dumps(self.to_dict(), ensure_ascii=False, sort_keys=False)

    @classmethod
    def from_dict(cls, data: dict[str, Any]) -> Proposal:
        known = {f.name for f in fields(cls)}
        kwargs = {k: v for k, v in data.items() if k in known}
        kwargs["dispersion"] = Dispersion.from_dict(data.get("dispersion"))
        kwargs["source"] = Source.from_dict(data["source"])
        kwargs["flags"] = tuple(data.get("flags", ()))
        return cls(**kwargs)

    def with_changes(self, **changes: Any) -> Proposal:
        """A copy with some fields changed."""
        return replace(self, **changes)


def make_id(*parts: object) -> str:
    """A stable id from the parts that locate a data point (same input, same id).

    Callers pass the article, the extractor id, and the location (source kind, page or ref,
    table/row/col or character offset) and the value as written.
    """
    text = "\x1f".join("" if p is None else str(p) for p in parts)
    return hashlib.sha1(text.encode("utf-8")).hexdigest()[:16]
