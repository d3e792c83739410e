"""Small test PDFs drawn with reportlab's canvas, with the structure each one is known to have.

The scenario is invented: a compound "veltrazine" given to "Orlov-line" mice in a made-up lab.
Every expected value below is what the drawing code puts on the page, so tests can compare the
reader's output with it.
"""

from __future__ import annotations

from pathlib import Path

from reportlab.lib.pagesizes import A4
from reportlab.pdfgen import canvas

W, H = A4
BODY = "Helvetica"
BOLD = "Helvetica-Bold"

TITLE = "Veltrazine lowers plasma quorin in Orlov-line mice"
DOI = "10.5555/winnow.test.0001"
RUNNING = "Journal of Invented Pharmacology"

PARAGRAPHS = [
    (
        "abstract",
        "Abstract. We gave veltrazine to Orlov-line mice for eight weeks and measured plasma quorin and body mass in two groups.",
    ),
    (
        "introduction",
        "Quorin is a plasma marker of an invented disorder. Earlier work in our lab suggested that veltrazine might lower it in young mice.",
    ),
    (
        "introduction",
        "Here we test that idea in a controlled study with a vehicle group and a treated group of equal size.",
    ),
    (
        "methods",
        "Twenty mice were housed in pairs. Ten received vehicle and ten received veltrazine at 10 mg/kg by mouth once a day.",
    ),
    (
        "methods",
        "Plasma quorin was measured with an invented colour assay at week eight. Body mass was recorded weekly on a bench scale.",
    ),
    (
        "results",
        "Veltrazine lowered plasma quorin compared with vehicle. Body mass did not differ between the groups at any week.",
    ),
    (
        "results",
        "No animal was lost during the study and no adverse signs were recorded by the staff of the animal house.",
    ),
    (
        "discussion",
        "The fall in quorin agrees with the earlier pilot. A longer study with both sexes should follow before any wider claim.",
    ),
]

HEADINGS = {
    "introduction": "Introduction",
    "methods": "Methods",
    "results": "Results",
    "discussion": "Discussion",
}

RULED_GRID = [
    ["", "Vehicle (n = 10)", "Veltrazine (n = 10)"],
    ["Body mass (g)", "24.1 ± 1.3", "23.8 ± 1.1"],
    ["Quorin, mmol/L", "5.2 ± 0.4", "3.9 ± 0.5"],
    ["Heart rate (bpm)", "612 ± 25", "598 ± 31"],
]
RULED_CAPTION = "Outcomes at week eight."
RULED_FOOTNOTE = "Data are mean ± SD."

RULES_GRID = [
    ["", "Week 4", "Week 4", "Week 8", "Week 8"],
    ["", "Vehicle", "Treated", "Vehicle", "Treated"],
    ["Food intake (g/day)", "3.1", "3.0", "3.3", "3.2"],
    ["Water intake (mL/day)", "4.2", "4.4", "4.5", "4.1"],
]

UNRULED_GRID = [
    ["Outcome", "Vehicle", "Treated"],
    ["Liver mass (mg)", "1210", "1185"],
    ["Spleen mass (mg)", "88", "91"],
]

LONG_HEADER = ["Mouse", "Group", "Quorin (mmol/L)"]
LONG_ROWS = [
    [f"M{i:02d}", "Vehicle" if i % 2 else "Treated", f"{4 + (i % 7) * 0.1:.1f}"]
    for i in range(1, 31)
]


def _wrap(text: str, width: float, font: str, size: float, c: canvas.Canvas) -> list[str]:
    lines: list[str] = []
    current = ""
    for word in text.split():
        trial = f"{current} {word}".strip()
        if c.stringWidth(trial, font, size) > width and current:
            lines.append(current)
            current = word
        else:
            current = trial
    if current:
        lines.append(current)
    return lines


def _furniture(c: canvas.Canvas, page: int) -> None:
    c.setFont(BODY, 8)
    c.drawString(50, H - 30, RUNNING)
    c.drawRightString(W - 50, 25, str(page))


def _paragraph(
    c: canvas.Canvas, text: str, x: float, y: float, width: float, size: float = 10
) -> float:
    c.setFont(BODY, size)
    for line in _wrap(text, width, BODY, size, c):
        c.drawString(x, y, line)
        y -= size * 1.3
    return y - size * 0.9


def _heading(c: canvas.Canvas, text: str, x: float, y: float) -> float:
    c.setFont(BOLD, 11)
    c.drawString(x, y, text)
    return y - 17


def _grid(
    c: canvas.Canvas,
    grid: list[list[str]],
    x: float,
    y: float,
    widths: list[float],
    *,
    ruled: bool,
    row_h: float = 16,
) -> float:
    """Draw a grid; ``ruled`` draws every cell border. Returns the y under the table."""
    c.setFont(BODY, 9)
    total = sum(widths)
    top = y
    for row in grid:
        cx = x
        for text, w in zip(row, widths, strict=True):
            c.drawString(cx + 3, y - 11, text)
            cx += w
        y -= row_h
    if ruled:
        c.setLineWidth(0.6)
        for r in range(len(grid) + 1):
            c.line(x, top - r * row_h, x + total, top - r * row_h)
        cx = x
        for w in [0, *widths]:
            cx += w
            c.line(cx, top, cx, y)
    return y


def make_article(path: Path) -> Path:
    """A two-page article: full-width title and abstract, two-column body, three tables."""
    c = canvas.Canvas(str(path), pagesize=A4)
    c.setTitle(TITLE)
    _furniture(c, 1)
    c.setFont(BOLD, 16)
    c.drawString(50, H - 70, TITLE)
    c.setFont(BODY, 9)
    c.drawString(50, H - 88, f"https://doi.org/{DOI}")
    y = _paragraph(c, PARAGRAPHS[0][1], 50, H - 115, W - 100)
    col_w = (W - 100 - 24) / 2
    xs = [50, 50 + col_w + 24]
    col, y0 = 0, y - 8
    y = y0
    for section, text in PARAGRAPHS[1:]:
        if section in HEADINGS and not any(s == section for s, _ in _seen):
            if section == "results":
                col, y = 1, y0
            y = _heading(c, HEADINGS[section], xs[col], y)
        _seen.append((section, text))
        if y < 330:
            col, y = 1, y0
        y = _paragraph(c, text, xs[col], y, col_w)
    _seen.clear()
    # Table 1: ruled grid, full width, caption above, footnote below
    c.setFont(BODY, 9)
    c.drawString(50, 300, f"Table 1. {RULED_CAPTION}")
    bottom = _grid(c, RULED_GRID, 50, 290, [160, 150, 150], ruled=True)
    c.setFont(BODY, 8)
    c.drawString(50, bottom - 12, RULED_FOOTNOTE)
    c.showPage()
    # page 2: rules-only table with a spanning header, then an unruled table
    _furniture(c, 2)
    c.setFont(BODY, 9)
    c.drawString(50, H - 70, "Table 2. Intake by week.")
    top = H - 80
    c.setLineWidth(0.8)
    c.line(50, top, 50 + 480, top)
    c.setFont(BODY, 9)
    widths = [160, 80, 80, 80, 80]
    c.drawCentredString(50 + 160 + 80, top - 11, "Week 4")
    c.drawCentredString(50 + 160 + 240, top - 11, "Week 8")
    c.setLineWidth(0.4)
    c.line(50 + 160 + 4, top - 14, 50 + 320 - 4, top - 14)
    c.line(50 + 320 + 4, top - 14, 50 + 480 - 4, top - 14)
    cx = 50
    for text, w in zip(RULES_GRID[1], widths, strict=True):
        c.drawString(cx + 3, top - 27, text)
        cx += w
    c.setLineWidth(0.8)
    c.line(50, top - 32, 50 + 480, top - 32)
    y = top - 32
    for row in RULES_GRID[2:]:
        cx = 50
        for text, w in zip(row, widths, strict=True):
            c.drawString(cx + 3, y - 12, text)
            cx += w
        y -= 16
    c.line(50, y - 4, 50 + 480, y - 4)
    y = _paragraph(
        c,
        "The intake figures above were read from the cage logs each morning by the same person.",
        50,
        y - 30,
        W - 100,
    )
    c.setFont(BODY, 9)
    c.drawString(50, y - 10, "Table 3. Organ mass at the end of the study.")
    _grid(c, UNRULED_GRID, 50, y - 18, [160, 110, 110], ruled=False)
    c.showPage()
    c.save()
    return path


_seen: list[tuple[str, str]] = []


def make_long_table(path: Path) -> Path:
    """A ruled table that breaks across two pages with its header repeated on the second."""
    c = canvas.Canvas(str(path), pagesize=A4)
    _furniture(c, 1)
    _paragraph(
        c, "Results. Each mouse's quorin value is listed in Table 1 below.", 50, H - 70, W - 100
    )
    c.setFont(BODY, 9)
    c.drawString(50, H - 110, "Table 1. Quorin per mouse.")
    first, rest = LONG_ROWS[:20], LONG_ROWS[20:]
    _grid(c, [LONG_HEADER, *first], 50, H - 120, [120, 120, 140], ruled=True)
    c.showPage()
    _furniture(c, 2)
    c.setFont(BODY, 9)
    c.drawString(50, H - 70, "Table 1 (continued)")
    _grid(c, [LONG_HEADER, *rest], 50, H - 80, [120, 120, 140], ruled=True)
    c.showPage()
    c.save()
    return path


def make_encrypted(path: Path) -> Path:
    """A PDF encrypted with a user password (reportlab's StandardEncryption)."""
    from reportlab.lib.pdfencrypt import StandardEncryption

    enc = StandardEncryption("secret", ownerPassword="owner", canPrint=0)
    c = canvas.Canvas(str(path), pagesize=A4, encrypt=enc)
    c.drawString(50, H - 70, "Hidden text")
    c.showPage()
    c.save()
    return path


def make_image_only(path: Path) -> Path:
    """A page that holds only a drawn picture (no text layer), like a scan."""
    from PIL import Image

    image = path.with_suffix(".png")
    Image.new("L", (200, 100), color=128).save(image)
    c = canvas.Canvas(str(path), pagesize=A4)
    c.drawImage(str(image), 50, H - 300, width=400, height=200)
    c.showPage()
    c.save()
    image.unlink()
    return path


def make_truncated(path: Path, source: Path) -> Path:
    """The first 40% of a valid PDF: header present, cross-reference table gone."""
    data = source.read_bytes()
    path.write_bytes(data[: int(len(data) * 0.4)])
    return path
