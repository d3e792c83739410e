"""Small constructed Documents and Tables (invented content) for the records tests."""

from __future__ import annotations

from extract.ingest.document import Block, Document, Table, TableCell


def make_table(
    grid: list[list[str]],
    *,
    label: str = "Table 1",
    caption: str = "",
    footnotes: tuple[str, ...] = (),
    header_rows: int = 1,
    column_units: tuple[str | None, ...] = (),
    row_units: tuple[str | None, ...] = (),
) -> Table:
    """A table on page 2 whose cells have boxes."""
    n_rows, n_cols = len(grid), len(grid[0])
    cells = tuple(
        TableCell(
            r, c, grid[r][c], bbox=(c * 60.0, r * 12.0, c * 60.0 + 50.0, r * 12.0 + 10.0), page=2
        )
        for r in range(n_rows)
        for c in range(n_cols)
    )
    return Table(
        label=label,
        caption=caption,
        footnotes=footnotes,
        page=2,
        pages=(2,),
        bbox=None,
        n_rows=n_rows,
        n_cols=n_cols,
        header_rows=header_rows,
        cells=cells,
        column_units=column_units,
        row_units=row_units,
        section="results",
    )


def make_document(
    paragraphs: list[tuple[str, str]] | None = None,
    *,
    tables: tuple[Table, ...] = (),
    doi: str | None = None,
    name: str = "fixture-a",
) -> Document:
    """A Document from (section, text) paragraphs, each on page 1, plus tables."""
    blocks = tuple(
        Block(
            index=i,
            kind="caption" if section == "legends" else "paragraph",
            text=text,
            section=section,
            page=1,
            bbox=(50.0, 100.0 + 40 * i, 550.0, 130.0 + 40 * i),
            label="Figure 1" if section == "legends" else None,
        )
        for i, (section, text) in enumerate(paragraphs or [])
    )
    return Document(
        path=f"/data/{name}.pdf",
        name=name,
        source="pdf",
        sha256="0" * 64,
        doi=doi,
        title=None,
        pages=(),
        blocks=blocks,
        sections=(),
        tables=tables,
    )
