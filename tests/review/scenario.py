"""An invented article (the compound zelvatrin in Tolvar mice) and its proposals, for review tests.

Everything here is made up for the tests: the compound, the mouse line, the assay and the values.
The proposals are built by hand, so the review tests do not depend on the first pass's output.
"""

from __future__ import annotations

from pathlib import Path

from extract.ingest.document import Block, Document, Page, Section, Table, TableCell
from extract.records.proposal import Dispersion, Proposal, Source, make_id
from extract.store import Store, open_store

ARTICLE = "zelvatrin-oxalin"
OTHER = "harlow-fever-cohort"
EXTRACTOR = "quantities.rules@0.3"
KEY = "review-tests@1"

RESULTS = (
    "After 8 weeks, body mass was 24.1 ± 1.3 g in the vehicle group (n = 12). "
    "Body mass in the zelvatrin group was 22.8 ± 1.1 g (n = 12). "
    "Heart rate did not differ between groups (512 ± 20 bpm)."
)
METHODS = (
    "Twelve Tolvar mice per group received zelvatrin (5 mg/kg) or vehicle daily for 8 weeks. "
    "Plasma oxalin was measured with the Kessen fluorescence assay."
)
GRID = [
    ["", "Vehicle (n = 12)", "Zelvatrin (n = 12)"],
    ["Oxalin (µmol/L)", "41.2 ± 3.1", "28.7 ± 2.4"],
    ["Urea (mmol/L)", "7.9 ± 0.6", "7.4 ± 0.5"],
    ["Calcium (mg/dL)", "9.8 ± 0.2", "9.9 ± 0.3"],
]
UNITS = {1: ("µmol/L", "umol/L"), 2: ("mmol/L", "mmol/L"), 3: ("mg/dL", "mg/dL")}


def make_document(name: str = ARTICLE) -> Document:
    """A two-page article: methods and results text on page 1, Table 1 on page 2."""
    blocks = (
        Block(0, "title", "Zelvatrin lowers plasma oxalin in Tolvar mice", "title", 1,
              (50, 40, 550, 60)),
        Block(1, "heading", "Methods", "methods", 1, (50, 80, 200, 92), heading="Methods"),
        Block(2, "paragraph", METHODS, "methods", 1, (50, 100, 550, 160), heading="Methods"),
        Block(3, "heading", "Results", "results", 1, (50, 180, 200, 192), heading="Results"),
        Block(4, "paragraph", RESULTS, "results", 1, (50, 200, 550, 280), heading="Results"),
        Block(5, "caption", "Table 1. Plasma values at week 8.", "results", 2, (50, 60, 550, 75),
              heading="Results", label="Table 1"),
        Block(6, "footnote", "Values are mean ± SEM.", "results", 2, (50, 200, 550, 212),
              heading="Results", label="Table 1"),
    )  # fmt: skip
    cells = tuple(
        TableCell(r, c, text, (50 + 150 * c, 90 + 20 * r, 200 + 150 * c, 110 + 20 * r), 2)
        for r, row in enumerate(GRID)
        for c, text in enumerate(row)
    )
    table = Table(
        label="Table 1",
        caption="Plasma values at week 8.",
        footnotes=("Values are mean ± SEM.",),
        page=2,
        pages=(2,),
        bbox=(50, 90, 500, 170),
        n_rows=4,
        n_cols=3,
        header_rows=1,
        cells=cells,
        column_units=(None, None, None),
        row_units=(None, "µmol/L", "mmol/L", "mg/dL"),
        section="results",
        reader="pdfplumber.lines",
    )
    return Document(
        path=f"/data/articles/{name}.pdf",
        name=name,
        source="pdf",
        sha256=(name.encode().hex() * 64)[:64],
        doi=None,
        title="Zelvatrin lowers plasma oxalin in Tolvar mice",
        pages=(Page(1, 612, 792), Page(2, 612, 792)),
        blocks=blocks,
        sections=(
            Section("methods", "Methods", 1, 1, 1, 2),
            Section("results", "Results", 1, 2, 3, 6),
        ),
        tables=(table,),
    )


def text_proposal(
    article: str, value: float, sd: float, group: str, quote: str, *, confidence: float
) -> Proposal:
    """A body-mass proposal read from a results sentence."""
    source = Source("text", 1, None, "results", None, None, None, quote)
    return Proposal(
        id=make_id(article, EXTRACTOR, "text", 1, quote, value),
        article=article,
        file=f"{article}.pdf",
        outcome="body mass",
        group=group,
        statistic="mean",
        value=value,
        unit="g",
        unit_ucum="g",
        value_normalized=value,
        unit_normalized="g",
        dispersion=Dispersion("SD", sd),
        sd=sd,
        n=12,
        time_point="week 8",
        method=None,
        subject="Tolvar mice",
        intervention="zelvatrin 5 mg/kg" if group == "zelvatrin" else None,
        source=source,
        extractor=EXTRACTOR,
        confidence=confidence,
    )


def cell_proposal(article: str, row: int, col: int, *, confidence: float = 0.9) -> Proposal:
    """A proposal read from one cell of Table 1."""
    value_text, sem_text = GRID[row][col].split(" ± ")
    outcome = GRID[row][0].split(" (")[0].lower()
    group = "vehicle" if col == 1 else "zelvatrin"
    unit, ucum = UNITS[row]
    source = Source("table", 2, None, "results", "Table 1", row, col, GRID[row][col])
    return Proposal(
        id=make_id(article, EXTRACTOR, "table", 2, "Table 1", row, col, value_text),
        article=article,
        file=f"{article}.pdf",
        outcome=outcome,
        group=group,
        statistic="mean",
        value=float(value_text),
        unit=unit,
        unit_ucum=ucum,
        value_normalized=None,
        unit_normalized=None,
        dispersion=Dispersion("SEM", float(sem_text)),
        sd=None,
        n=12,
        time_point="week 8",
        method="Kessen fluorescence assay" if row == 1 else None,
        subject="Tolvar mice",
        intervention="zelvatrin 5 mg/kg" if col == 2 else None,
        source=source,
        extractor=EXTRACTOR,
        confidence=confidence,
    )


def make_proposals(article: str = ARTICLE) -> list[Proposal]:
    """Seven proposals: two from the results text, five from Table 1 (calcium in the zelvatrin
    column is left out on purpose: the curator adds it as a missed data point)."""
    first, second, _ = (s + "." for s in RESULTS.rstrip(".").split(". "))
    return [
        text_proposal(article, 24.1, 1.3, "vehicle", first, confidence=0.92),
        text_proposal(article, 22.8, 1.1, "zelvatrin", second, confidence=0.88),
        cell_proposal(article, 1, 1),
        cell_proposal(article, 1, 2),
        cell_proposal(article, 2, 1),
        cell_proposal(article, 2, 2),
        cell_proposal(article, 3, 1, confidence=0.35),
    ]


def build_store(target: str | Path) -> Store:
    """A store holding the zelvatrin article (7 proposals) and a second article (2 proposals)."""
    store = open_store(target)
    store.add_extraction(make_document(ARTICLE), make_proposals(ARTICLE), extractor_key=KEY)
    other = make_document(OTHER)
    store.add_extraction(other, make_proposals(OTHER)[:2], extractor_key=KEY)
    return store


def decisions_of(store: Store, *, curator: str | None = None) -> list[tuple[str, str]]:
    """(proposal id, action) of every stored decision, in log order."""
    return [(d.proposal_id, d.action) for d in store.decisions(curator=curator)]
