"""Tiny invented documents and proposals for the store and decision-log tests."""

from __future__ import annotations

from extract.ingest.document import Block, Document, Page, Section, Table, TableCell
from extract.records.proposal import Dispersion, Proposal, Source, make_id

EXTRACTOR = "quantities.rules@0.1"
KEY = "quantities.rules@0.1+tables@0.1"


def make_document(
    name: str = "velorin-kidney", *, doi: str | None = None, sha: str = "a"
) -> Document:
    """A two-page, two-column invented article with one table on page 2."""
    blocks = (
        Block(
            0, "title", "Velorin lowers serum quentase in Dexel rats", "title", 1, (50, 40, 550, 60)
        ),
        Block(
            1,
            "paragraph",
            "Left column on page 1: body mass was 24.1 ± 1.3 g.",
            "results",
            1,
            (50, 100, 290, 400),
            column=0,
        ),
        Block(
            2,
            "paragraph",
            "Right column on page 1: quentase was 4.2 ± 0.3 U/L.",
            "results",
            1,
            (310, 100, 550, 400),
            column=1,
        ),
        Block(
            3,
            "caption",
            "Table 1. Serum values at week 8.",
            "results",
            2,
            (50, 80, 550, 95),
            label="Table 1",
        ),
        Block(
            4,
            "paragraph",
            "Below the table: heart rate was 312 ± 9 bpm.",
            "results",
            2,
            (50, 300, 550, 340),
        ),
    )
    cells = tuple(
        TableCell(r, c, text, (50 + 100 * c, 100 + 20 * r, 150 + 100 * c, 120 + 20 * r), 2)
        for r, row in enumerate([["", "Vehicle (n = 9)"], ["Creatol (mg/dL)", "0.42 ± 0.05"]])
        for c, text in enumerate(row)
    )
    table = Table("Table 1", "Serum values at week 8.", ("Values are mean ± SD.",), 2, (2,),
                  (50, 100, 550, 140), 2, 2, 1, cells, ("", None), (None, "mg/dL"), "results",
                  "pdfplumber.lines")  # fmt: skip
    return Document(
        path=f"/tmp/articles/{name}.pdf",
        name=name,
        source="pdf",
        sha256=sha * 64,
        doi=doi,
        title="Velorin lowers serum quentase in Dexel rats",
        pages=(Page(1, 612, 792, 2), Page(2, 612, 792, 1)),
        blocks=blocks,
        sections=(Section("results", "Results", 1, 2, 1, 4),),
        tables=(table,),
    )


def make_proposal(
    article: str,
    outcome: str,
    value: float,
    *,
    page: int,
    bbox: tuple[float, float, float, float] | None = None,
    table: str | None = None,
    row: int | None = None,
    col: int | None = None,
    quote: str = "",
    extractor: str = EXTRACTOR,
) -> Proposal:
    """An invented proposal at a given place."""
    kind = "table" if table else "text"
    return Proposal(
        id=make_id(article, extractor, kind, page, table, row, col, bbox, value),
        article=article,
        file=f"{article}.pdf",
        outcome=outcome,
        group="vehicle",
        statistic="mean",
        value=value,
        unit="g",
        unit_ucum="g",
        value_normalized=value,
        unit_normalized="g",
        dispersion=Dispersion("SD", 1.3),
        sd=1.3,
        n=9,
        time_point="week 8",
        method=None,
        subject="Dexel rats",
        intervention=None,
        source=Source(kind, page, bbox, "results", table, row, col, quote),
        extractor=extractor,
        confidence=0.8,
    )


def sample_proposals(article: str = "velorin-kidney") -> list[Proposal]:
    """Four proposals, deliberately out of reading order."""
    return [
        make_proposal(article, "heart rate", 312, page=2, bbox=(60, 310, 200, 320)),
        make_proposal(article, "quentase", 4.2, page=1, bbox=(320, 150, 500, 160)),
        make_proposal(article, "creatol", 0.42, page=2, table="Table 1", row=1, col=1),
        make_proposal(article, "body mass", 24.1, page=1, bbox=(60, 300, 250, 310)),
    ]
