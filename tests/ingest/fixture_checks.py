"""Checks of one Document against the gold file of its fixture article (shared by the tests of
the committed fixture set and of the held-out set).

Each check returns a list of human-readable problems; an empty list means the Document agrees
with the gold file. Texts are compared whitespace-normalised.
"""

from __future__ import annotations

from typing import Any

from extract.ingest.document import Document, Table


def norm(text: str) -> str:
    """Text with runs of white space folded to one space."""
    return " ".join(text.split())


def section_problems(document: Document, gold: dict[str, Any]) -> list[str]:
    """Sections (name, heading, first and last page) against gold ``sections``."""
    ours = [(s.name, norm(s.heading), s.page_start, s.page_end) for s in document.sections]
    want = [
        (s["name"], norm(s["heading"]), s["page_start"], s["page_end"]) for s in gold["sections"]
    ]
    return [] if ours == want else [f"sections {ours} != {want}"]


def paragraph_problems(document: Document, gold: dict[str, Any]) -> list[str]:
    """Every gold paragraph inside one block, in gold order."""
    blocks = [norm(b.text) for b in document.blocks]
    problems = []
    position = -1
    for paragraph in gold["paragraphs"]:
        text = norm(paragraph["text"])
        hits = [i for i, b in enumerate(blocks) if text in b]
        if not hits:
            problems.append(f"paragraph missing: {text[:60]}")
        elif hits[-1] < position:
            problems.append(f"paragraph out of order: {text[:60]}")
        else:
            position = min(i for i in hits if i >= position)
    return problems


def label_problems(document: Document, gold: dict[str, Any]) -> list[str]:
    """The same table labels: none lost, none invented."""
    ours = sorted(t.label for t in document.tables)
    want = sorted(t["label"] for t in gold["tables"])
    return [] if ours == want else [f"tables {ours} != {want}"]


def _table(document: Document, label: str) -> Table | None:
    return next((t for t in document.tables if t.label == label), None)


def table_problems(document: Document, gold_table: dict[str, Any]) -> list[str]:
    """Grid, pages, caption and footnotes of one gold table."""
    table = _table(document, gold_table["label"])
    if table is None:
        return [f"{gold_table['label']} not found"]
    problems = []
    grid = [[norm(c) for c in row] for row in table.grid()]
    want = [[norm(c) for c in row] for row in gold_table["grid"]]
    if grid != want:
        bad = next(
            (i for i in range(max(len(grid), len(want))) if grid[i : i + 1] != want[i : i + 1]),
            0,
        )
        problems.append(
            f"grid {len(grid)}x{len(grid[0]) if grid else 0} vs {len(want)}x{len(want[0])}, "
            f"first different row {bad}: {grid[bad] if bad < len(grid) else None} "
            f"!= {want[bad] if bad < len(want) else None}"
        )
    if list(table.pages) != gold_table["pages"]:
        problems.append(f"pages {list(table.pages)} != {gold_table['pages']}")
    if norm(table.caption) != norm(gold_table["caption"]):
        problems.append(f"caption {table.caption!r} != {gold_table['caption']!r}")
    notes = [norm(n) for n in table.footnotes]
    if notes != [norm(n) for n in gold_table["footnotes"]]:
        problems.append(f"footnotes {notes} != {gold_table['footnotes']}")
    if table.header_rows != gold_table["header_rows"]:
        problems.append(f"header rows {table.header_rows} != {gold_table['header_rows']}")
    return problems


def unit_problems(document: Document, gold: dict[str, Any], label: str) -> list[str]:
    """Units read from headers or row labels against the unit of every gold table data point."""
    table = _table(document, label)
    if table is None:
        return [f"{label} not found"]
    problems = []
    for point in gold["data_points"]:
        if point.get("table") != label or point.get("unit") is None:
            continue
        row, col = point["row"], point["col"]
        if row >= table.n_rows or col >= table.n_cols:
            problems.append(
                f"{label} ({row}, {col}) outside the {table.n_rows}x{table.n_cols} grid"
            )
            continue
        labels = [
            table.row_label(row),
            *(table.cell(r, col).text for r in range(table.header_rows)),
        ]
        if not any(point["unit"] in text for text in labels):
            continue  # the unit is printed in the cells or nowhere: nothing to pull
        found = {
            table.column_units[col] if col < len(table.column_units) else None,
            table.row_units[row] if row < len(table.row_units) else None,
        } - {None}
        if found != {point["unit"]}:
            problems.append(f"{label} ({row}, {col}): units {sorted(found)} != {point['unit']!r}")
    return problems
