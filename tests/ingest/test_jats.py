"""Reading JATS XML articles into the Document model.

Element meanings follow the JATS standard, ANSI/NISO Z39.96-2021 (JATS 1.3) and its Tag Library
(jats.nlm.nih.gov): ``sec``/``title``/``label``, ``sec-type``, ``table-wrap``, ``alternatives``,
``table-wrap-group``, ``table-wrap-foot``, ``xref ref-type``, ``abstract-type``. Table spans follow
the XHTML 1.1 table module that JATS tables use, processed as in the HTML table model (WHATWG
HTML Living Standard, "4.9.12 Processing model": a cell takes the first free slot of its row and
``rowspan`` is clipped to its row group). Characters are named by their Unicode code points.

The snippets under jats_cases/ are hand-written with invented compounds, disorders and numbers.
"""

from __future__ import annotations

import logging
import pickle
import re
import socket
import threading
from pathlib import Path

import pytest
from lxml import etree

from extract.errors import InputFileError, XMLReadError
from extract.ingest.document import SECTION_NAMES, Document
from extract.ingest.jats import is_jats_bytes, read_jats
from extract.ingest.jats_sections import section_from_title, section_name
from extract.ingest.jats_tables import is_unit, unit_from_label

CASES = Path(__file__).parent / "jats_cases"
ARTICLES = Path(__file__).resolve().parents[2] / "fixtures" / "articles"
FIXTURE_XML = sorted(ARTICLES.glob("*.xml")) if ARTICLES.is_dir() else []
PARSER = etree.XMLParser(resolve_entities=False, no_network=True, load_dtd=False)


@pytest.fixture(scope="module")
def sections_doc() -> Document:
    return read_jats(CASES / "sections.xml")


@pytest.fixture(scope="module")
def inline_doc() -> Document:
    return read_jats(CASES / "inline.xml")


@pytest.fixture(scope="module")
def tables_doc() -> Document:
    return read_jats(CASES / "tables.xml")


def _block(document: Document, ref: str) -> str:
    found = [b.text for b in document.blocks if b.ref == ref]
    assert len(found) == 1, f"{ref}: {found}"
    return found[0]


def _table(document: Document, label: str):  # noqa: ANN202
    found = [t for t in document.tables if t.label == label]
    assert len(found) == 1, [t.label for t in document.tables]
    return found[0]


# --- metadata, sections, blocks ---------------------------------------------------------------


def test_read_jats_metadata(sections_doc: Document) -> None:
    assert sections_doc.source == "jats"
    assert sections_doc.name == "sections"
    # The DOI is the article-id with pub-id-type="doi", not the publisher id next to it.
    assert sections_doc.doi == "10.5555/winnow.case.sections"
    # Italic markup dropped, text kept.
    assert sections_doc.title == "Quellorin lowers plasma tarvic acid in Vantrel syndrome"
    assert sections_doc.pages == () and sections_doc.words == ()


def test_read_jats_sha256_is_of_the_file_bytes(sections_doc: Document) -> None:
    import hashlib

    expected = hashlib.sha256((CASES / "sections.xml").read_bytes()).hexdigest()
    assert sections_doc.sha256 == expected


def test_sections_mapped_to_canonical_names(sections_doc: Document) -> None:
    got = [(s.name, s.heading) for s in sections_doc.sections]
    assert got == [
        ("title", "Quellorin lowers plasma tarvic acid in Vantrel syndrome"),
        ("abstract", "Abstract"),
        ("other", "Author summary"),  # abstract-type="summary" is not the abstract
        ("introduction", ""),  # body paragraphs before the first sec
        ("methods", "1 Patients and methods"),  # label and title with a space between
        ("methods", "Statistical analysis"),
        ("results", "Effects of quellorin"),  # title unknown: sec-type="results" decides
        ("results", "Results and Discussion"),  # the part named first wins
        ("discussion", "Closing remarks"),  # sec-type="conclusions"
        ("other", "Supplementary Material"),
        ("other", "Acknowledgements"),
        ("other", "Funding"),
        ("references", "References"),
    ]
    for section in sections_doc.sections:
        assert section.page_start is None and section.page_end is None
        names = {
            b.section for b in sections_doc.blocks[section.first_block : section.last_block + 1]
        }
        assert names == {section.name}


def test_nested_sections_inherit_the_top_level_name(sections_doc: Document) -> None:
    diet = [b for b in sections_doc.blocks if b.text == "Chow was given freely."]
    assert len(diet) == 1
    assert diet[0].section == "methods"
    assert diet[0].heading == "Diet"  # the innermost heading as written
    assert diet[0].ref == "body/sec[1]/sec/sec/p"
    # A label is separated from its title, never glued ("1.1Animals").
    assert "1.1 Animals" in [b.text for b in sections_doc.blocks if b.kind == "heading"]
    # Abstract sections titled "Methods"/"Results" stay in the abstract.
    abstract = sections_doc.blocks_in("abstract")
    assert [b.text for b in abstract if b.kind == "paragraph"] == [
        "Twelve mice per group received quellorin.",
        "Tarvic acid fell by half.",
    ]


def test_blocks_in_document_order_with_element_paths(sections_doc: Document) -> None:
    blocks = sections_doc.blocks
    assert [b.index for b in blocks] == list(range(len(blocks)))
    assert blocks[0].kind == "title"
    root = etree.parse(str(CASES / "sections.xml"), PARSER).getroot()
    for block in blocks:
        assert block.page is None and block.bbox is None
        assert block.section in SECTION_NAMES
        # Every ref is an XPath from the article root that finds exactly one element.
        assert len(root.xpath(block.ref)) == 1, block.ref
    paragraphs = [b.text for b in blocks if b.kind == "paragraph"]
    order = [
        "An opening paragraph with no section around it.",
        "Mice were housed in pairs.",
        "Chow was given freely.",
        "Doses followed the pilot study.",
        "Groups were compared by t test.",
        "Plasma tarvic acid fell.",
        "Liver mass did not change.",
    ]
    positions = [paragraphs.index(text) for text in order]
    assert positions == sorted(positions)


def test_figure_caption_block(sections_doc: Document) -> None:
    captions = [b for b in sections_doc.blocks if b.kind == "caption"]
    assert [(b.label, b.text, b.section) for b in captions] == [
        ("Figure 1", "Figure 1. Tarvic acid by group. Bars show means.", "results"),
        # A fig-group's caption, then each figure's; captions never become headings/paragraphs.
        ("Figure 2", "Figure 2. Organs after quellorin. Two panels.", "results"),
        ("Figure 2A", "Figure 2A. Liver.", "results"),
        ("Figure 2B", "Figure 2B. Kidney.", "results"),
    ]
    assert not any("Two panels" in b.text for b in sections_doc.blocks if b.kind != "caption")
    index = captions[0].index
    # The caption sits between the paragraphs around the fig element.
    assert sections_doc.blocks[index - 1].text == "Plasma tarvic acid fell."
    assert sections_doc.blocks[index + 1].text == "Liver mass did not change."


def test_reference_entries_have_spaces_between_parts(sections_doc: Document) -> None:
    refs = sections_doc.blocks_in("references")
    assert [b.text for b in refs if b.kind == "other"] == [
        "1 Orlo A Tarvic acid 2001",
        "2 Pell B, 1999. Vantrel cases.",  # no space before closing punctuation
    ]


@pytest.mark.parametrize(
    ("title", "sec_type", "expected"),
    [
        # Headings as journals print them (common practice; IMRaD order per the ICMJE
        # Recommendations, "Preparing a Manuscript for Submission").
        ("Introduction", None, "introduction"),
        ("Background", None, "introduction"),
        ("Materials and methods", None, "methods"),
        ("Patients and methods", None, "methods"),
        ("Subjects and Methods", None, "methods"),
        ("Statistical analysis", None, "methods"),
        ("Statistical Analyses", None, "methods"),
        ("2. Experimental procedures", None, "methods"),
        ("III. Results", None, "results"),
        ("Results and discussion", None, "results"),
        ("Discussion", "conclusions", "discussion"),
        ("Conclusions", None, "discussion"),
        ("References", None, "references"),
        ("Figure legends", None, "legends"),
        ("Acknowledgments", None, "other"),
        ("Data Availability", "data-availability", "other"),
        # Title says nothing known: the sec-type values of the JATS Tag Library decide.
        ("Participants' outcomes", "results", "results"),
        ("Study conduct", "materials|methods", "methods"),
        ("Opening", "intro", "introduction"),
        ("Miscellany", None, "other"),
    ],
)
def test_section_name(title: str, sec_type: str | None, expected: str) -> None:
    assert section_name(title, sec_type) == expected


def test_section_from_title_unknown_is_none() -> None:
    assert section_from_title("Effects of quellorin") is None


# --- inline markup ----------------------------------------------------------------------------


def test_entities_and_spaces(inline_doc: Document) -> None:
    # U+00B1 PLUS-MINUS SIGN from a character reference; U+2009 THIN SPACE and U+00A0 NO-BREAK
    # SPACE become plain spaces; italic/bold/sc markup dropped with its text kept.
    assert _block(inline_doc, "body/sec/p[1]") == (
        "Body mass was 24.1±1.3 g and 25 ± 2 g in Pemberly mice given dravolin."
    )


def test_undeclared_named_entity_read_from_the_html5_table(inline_doc: Document) -> None:
    # &plusmn; is U+00B1 in the HTML5 named character references (WHATWG HTML, "13.5 Named
    # character references"); the DTD that would declare it is never loaded.
    assert _block(inline_doc, "body/sec/p[2]") == "Named: 3.2 ± 0.4 mg."


def test_middle_dot_is_a_decimal_only_between_digits(inline_doc: Document) -> None:
    # U+00B7 MIDDLE DOT as decimal point (The Lancet's house style, from memory); en dash kept.
    assert _block(inline_doc, "body/sec/p[3]") == "Ratio 0.42 (95% CI 0.31–0.55); items A · B stay."


def test_unicode_minus_kept(inline_doc: Document) -> None:
    assert _block(inline_doc, "body/sec/p[4]") == "Change \u22123.5 mmol/L."


def test_sup_and_sub(inline_doc: Document) -> None:
    assert _block(inline_doc, "body/sec/p[5]") == (
        "Counts were 7.3 × 10^3/µL and 2 × 10^\u22123 M; BMI 22 kg/m^2; CD19+ cells and Ca2+ ions."
    )
    assert _block(inline_doc, "body/sec/p[6]") == "HbA1c was 5.1% and Cmax 3.4 ng/mL."


def test_numeric_citations_removed_author_year_kept(inline_doc: Document) -> None:
    assert _block(inline_doc, "body/sec/p[7]") == (
        "Tarvic acid rises with age. Two reports agree, and more. One used rats. "
        "Others (Orlo et al., 2001) disagree; see Figure 1."
    )


def test_whitespace_and_invisible_characters(inline_doc: Document) -> None:
    # U+2003 EM SPACE -> space; U+200B ZERO WIDTH SPACE and U+00AD SOFT HYPHEN removed;
    # a line break and indentation inside the element collapse to one space.
    assert _block(inline_doc, "body/sec/p[8]") == (
        "Wide gap,zero width and softhyphen; line break kept as one space."
    )


# --- tables -----------------------------------------------------------------------------------


def test_table_spans_expanded(tables_doc: Document) -> None:
    table = _table(tables_doc, "Table 1")  # "Table 1." printed with a full stop
    assert (table.n_rows, table.n_cols, table.header_rows) == (7, 5, 2)
    assert table.grid() == [
        # Header spans repeated into each covered cell (rowspan=2 "Measure", colspan=2 weeks).
        ["Measure", "Week 4", "Week 4", "Week 8", "Week 8"],
        ["Measure", "Vehicle (n = 9)", "Dravolin (n = 8)", "Vehicle (n = 9)", "Dravolin (n = 8)"],
        # Body colspan: text in the leftmost covered cell only.
        ["Males", "", "", "", ""],
        # The table-fn xref "a" is a footnote marker and is dropped.
        ["Body mass (g)", "24.1 ± 1.3", "22.0 ± 1.1", "26.3 ± 1.5", "23.2 ± 1.2"],
        ["Glucose, mmol/L", "7.1 ± 0.4", "6.2 ± 0.5", "7.3 ± 0.6", "6.0 ± 0.4"],
        # Body rowspan repeated down; the row's own cells fill the next free columns.
        ["BMI, kg/m^2", "7.1 ± 0.4", "3.1 ± 0.2", "3.3 ± 0.2", "3.0 ± 0.1"],
        # A short row is padded on the right.
        ["Heart rate", "612", "598", "", ""],
    ]
    assert len(table.cells) == table.n_rows * table.n_cols
    assert table.cell(5, 2).row == 5 and table.cell(5, 2).col == 2
    assert table.column_header(1) == "Week 4 / Vehicle (n = 9)"
    assert table.caption == "Body measures after dravolin. Means ± SD."
    assert table.footnotes == ("a P < 0.05 against vehicle.", "SD, standard deviation.")
    assert table.row_units == (None, None, None, "g", "mmol/L", "kg/m^2", None)
    assert table.column_units == (None,) * 5
    assert (table.reader, table.section, table.ref) == ("jats", "results", "body/sec/table-wrap[1]")
    assert table.page is None and table.pages == () and table.bbox is None


def test_table_footnote_blocks(tables_doc: Document) -> None:
    notes = [b for b in tables_doc.blocks if b.kind == "footnote"]
    assert [(b.label, b.text) for b in notes] == [
        ("Table 1", "a P < 0.05 against vehicle."),
        ("Table 1", "SD, standard deviation."),
    ]


def test_table_in_alternatives_and_units_in_own_header_row(tables_doc: Document) -> None:
    table = _table(tables_doc, "Table 2")
    assert table.grid() == [
        ["", "Vehicle", "Dravolin"],
        ["", "(mg)", "(mg)"],
        ["Liver", "1210", "1185"],
    ]
    assert table.header_rows == 2
    assert table.column_units == (None, "mg", "mg")


def test_table_wrap_group(tables_doc: Document) -> None:
    females, males = _table(tables_doc, "Table 3A"), _table(tables_doc, "Table 3B")
    # No thead: the leading row of th cells is the header.
    assert females.header_rows == 1 and males.header_rows == 1
    assert females.grid() == [["Count", "Vehicle"], ["Platelets (10^9/L)", "812"]]
    assert males.grid() == [["Count", "Vehicle"], ["Platelets (10^9/L)", "790"]]
    assert females.caption == "Females."
    assert females.row_units == (None, "10^9/L")


def test_image_only_table_noted_not_read(
    tables_doc: Document, caplog: pytest.LogCaptureFixture
) -> None:
    assert "Table 4" not in [t.label for t in tables_doc.tables]
    # Its caption is still a block, so the text is not lost.
    assert ("Table 4", "Table 4. Scanned table.") in [
        (b.label, b.text) for b in tables_doc.blocks if b.kind == "caption"
    ]
    with caplog.at_level(logging.WARNING, logger="extract.ingest.jats"):
        read_jats(CASES / "tables.xml")
    warnings = [r.getMessage() for r in caplog.records if r.levelno == logging.WARNING]
    assert len(warnings) == 1  # once per document
    assert "1 table(s) given only as images" in warnings[0] and "Table 4" in warnings[0]


def test_table_inside_paragraph_is_its_own_block(tables_doc: Document) -> None:
    assert _block(tables_doc, "body/sec/p[2]") == "Tables end here."
    table = _table(tables_doc, "Table 5")
    assert table.grid() == [["Spleen", "88"]]
    assert table.ref == "body/sec/p[2]/table-wrap"


def test_table_count_equals_table_wraps_holding_a_table(tables_doc: Document) -> None:
    root = etree.parse(str(CASES / "tables.xml"), PARSER).getroot()
    assert len(tables_doc.tables) == len(root.xpath("//table-wrap[.//table]")) == 5


@pytest.mark.parametrize(
    ("label", "unit"),
    [
        # Unit placement in table labels: common practice (parentheses, after a comma, alone).
        ("Body mass (g)", "g"),
        ("Glucose, mmol/L", "mmol/L"),
        ("Glucose [mg/dL]", "mg/dL"),
        ("Creatinine (µmol/L)", "µmol/L"),
        ("BMI, kg/m^2", "kg/m^2"),
        ("Platelets (× 10^9/L)", "× 10^9/L"),
        ("Systolic pressure (mm Hg)", "mm Hg"),
        ("Body fat, %", "%"),
        ("Follow-up (in months)", "months"),
        ("Insulin, uIU/ml", "uIU/ml"),
        ("(mg)", "mg"),
        ("Vehicle (n = 9)", None),
        ("Gender (m/f)", None),
        ("Basal group (2F/6M)", None),
        ("Mean (SD)", None),
        ("Median (min, max)", None),
        ("Donor (LDR vs CDR)", None),
        ("Hazard ratio (HR)", None),
        # Trial baseline tables name the statistic after the unit (CONSORT 2010 item 15,
        # "baseline demographic and clinical characteristics"; layout is common practice).
        ("Age (years), mean (SD)", "years"),
        ("Body mass index (kg/m²), mean (SD)", "kg/m²"),
        ("Systolic pressure (mmHg), mean [95% CI]", "mmHg"),
        ("Symptom duration (months), median (IQR)", "months"),
        ("Female sex, n (%)", None),
        ("Change in score, mean [95% CI]", None),
        ("Grip strength (gf)", "gf"),
        ("mg/dL", "mg/dL"),
        ("Heart rate", None),
        ("", None),
    ],
)
def test_unit_from_label(label: str, unit: str | None) -> None:
    assert unit_from_label(label) == unit


def test_is_unit_rejects_words() -> None:
    assert is_unit("mg/dL") and is_unit("10^3/µL") and is_unit("beats/min")
    assert not is_unit("Vehicle") and not is_unit("n") and not is_unit("SD")


# --- errors and safety ------------------------------------------------------------------------


def test_malformed_xml() -> None:
    with pytest.raises(XMLReadError) as info:
        read_jats(CASES / "malformed.xml")
    message = str(info.value)
    assert message.startswith(f"{CASES / 'malformed.xml'}: malformed XML: ")
    assert "line 4" in message and "\n" not in message


def test_not_a_jats_article() -> None:
    with pytest.raises(XMLReadError, match=r"not a JATS article \(root element <html>\)$"):
        read_jats(CASES / "not_article.xml")
    with pytest.raises(XMLReadError, match=r"not a JATS article \(root element <article>"):
        read_jats(CASES / "no_front.xml")


def test_missing_or_empty_file(tmp_path: Path) -> None:
    with pytest.raises(XMLReadError, match="cannot read file"):
        read_jats(tmp_path / "absent.xml")
    empty = tmp_path / "empty.xml"
    empty.write_bytes(b"")
    with pytest.raises(XMLReadError, match="malformed XML: Document is empty"):
        read_jats(empty)


def test_error_is_an_input_error_and_pickles() -> None:
    with pytest.raises(InputFileError) as info:
        read_jats(CASES / "malformed.xml")
    copy = pickle.loads(pickle.dumps(info.value))
    assert isinstance(copy, XMLReadError) and str(copy) == str(info.value)


def test_dtd_and_external_entities_never_loaded(tmp_path: Path) -> None:
    # A DTD on disk that would define &secret;, an external entity pointing at a local file,
    # and a DOCTYPE naming a DTD on a local HTTP port that records any connection.
    (tmp_path / "leak.dtd").write_text('<!ENTITY secret "LEAKED-FROM-DTD">', encoding="utf-8")
    (tmp_path / "secret.txt").write_text("LEAKED-FROM-FILE", encoding="utf-8")
    server = socket.socket()
    server.bind(("127.0.0.1", 0))
    server.listen(1)
    server.settimeout(0.5)
    port = server.getsockname()[1]
    connections: list[object] = []

    def accept() -> None:
        try:
            connections.append(server.accept())
        except OSError:
            pass

    listener = threading.Thread(target=accept)
    listener.start()
    for doctype, body in (
        (f'<!DOCTYPE article SYSTEM "{tmp_path / "leak.dtd"}">', "<p>A &secret; B C</p>"),
        (
            f'<!DOCTYPE article PUBLIC "-//NLM//DTD JATS" "http://127.0.0.1:{port}/jats.dtd">',
            "<p>A &secret; B C</p>",
        ),
        (
            f'<!DOCTYPE article [<!ENTITY xxe SYSTEM "file://{tmp_path / "secret.txt"}">]>',
            "<p>A B &xxe; C</p>",
        ),
    ):
        path = tmp_path / "article.xml"
        path.write_text(
            f"{doctype}<article><front><article-meta><title-group><article-title>Safe"
            f"</article-title></title-group></article-meta></front><body>{body}</body></article>",
            encoding="utf-8",
        )
        document = read_jats(path)
        # Neither the DTD's entity nor the file's content comes through.
        assert _block(document, "body/p") == "A B C"
    listener.join()
    server.close()
    assert connections == []


# --- sniffing ---------------------------------------------------------------------------------


@pytest.mark.parametrize("name", ["sections.xml", "inline.xml", "tables.xml"])
def test_is_jats_bytes_on_snippets(name: str) -> None:
    assert is_jats_bytes((CASES / name).read_bytes()[:8192])


@pytest.mark.parametrize(
    ("head", "expected"),
    [
        (b'<?xml version="1.0"?>\n<article dtd-version="1.3">', True),
        (b'\xef\xbb\xbf<article xmlns:xlink="http://www.w3.org/1999/xlink">', True),
        (
            '<?xml version="1.0" encoding="UTF-16"?><article article-type="x">'.encode("utf-16"),
            True,
        ),
        (
            b'<!DOCTYPE article PUBLIC "-//NLM//DTD JATS (Z39.96) Journal Archiving" "a.dtd">'
            b"<!-- note --><article>",
            True,
        ),
        # DocBook 5 also has an <article> root, in its own default namespace (docbook.org).
        (b'<article xmlns="http://docbook.org/ns/docbook" xmlns:xlink="x" version="5.0">', False),
        (b"<article>", False),  # no JATS doctype or attributes
        (b"<html><body>", False),
        (b"%PDF-1.7\n%\xe2\xe3\xcf\xd3\n", False),
        (b"<?xml version='1.0'?><articles><article dtd-version='1.3'>", False),
        (b"", False),
    ],
)
def test_is_jats_bytes(head: bytes, expected: bool) -> None:
    assert is_jats_bytes(head) is expected


# --- the real JATS articles -------------------------------------------------------------------
# Licences (see SOURCES.md in the corpus folder): elife-rp95901.xml, medRxiv preprint of eLife
# reviewed preprint 95901, CC BY 4.0; pone-0120049.xml and pone-0153170.xml, PLOS ONE, CC BY 4.0;
# pmed-1001518.xml, PLOS Medicine, CC BY (Creative Commons Attribution License).

REAL = ["elife-rp95901", "pone-0120049", "pone-0153170", "pmed-1001518"]


@pytest.fixture(scope="module")
def real_docs(corpus_dir: Path) -> dict[str, Document]:
    return {name: read_jats(corpus_dir / f"{name}.xml") for name in REAL}


@pytest.mark.corpus
@pytest.mark.parametrize("name", REAL)
def test_real_article_structure(
    name: str, real_docs: dict[str, Document], corpus_dir: Path
) -> None:
    document = real_docs[name]
    root = etree.parse(str(corpus_dir / f"{name}.xml"), PARSER).getroot()
    doi = root.xpath("front/article-meta/article-id[@pub-id-type='doi']/text()")[0].strip()
    assert document.doi == doi
    assert is_jats_bytes((corpus_dir / f"{name}.xml").read_bytes()[:8192])
    names = {s.name for s in document.sections}
    assert {"title", "abstract", "introduction", "methods", "results", "discussion"} <= names
    assert document.blocks_in("methods") and document.blocks_in("results")
    assert len(document.tables) == len(root.xpath("//table-wrap[.//table]"))
    for table in document.tables:
        assert table.header_rows >= 1 and table.n_rows > table.header_rows and table.n_cols >= 2
        assert len(table.cells) == table.n_rows * table.n_cols
        assert all(len(row) == table.n_cols for row in table.grid())
        assert len(table.row_units) == table.n_rows and len(table.column_units) == table.n_cols
        assert re.fullmatch(r"Table \d+", table.label)


@pytest.mark.corpus
def test_real_article_truncated_is_malformed(corpus_dir: Path, tmp_path: Path) -> None:
    data = (corpus_dir / "pone-0120049.xml").read_bytes()
    cut = tmp_path / "cut.xml"
    cut.write_bytes(data[: len(data) // 2])
    with pytest.raises(XMLReadError, match=r"^.*cut\.xml: malformed XML: .*line \d+"):
        read_jats(cut)


@pytest.mark.corpus
def test_real_image_only_tables(real_docs: dict[str, Document]) -> None:
    # The preprint gives its four tables only as images (graphic, no table element).
    document = real_docs["elife-rp95901"]
    assert document.tables == ()
    labels = [b.label for b in document.blocks if b.kind == "caption" and b.label]
    assert {"Table 1", "Table 2", "Table 3", "Table 4"} <= set(labels)


@pytest.mark.corpus
def test_real_table_values(real_docs: dict[str, Document]) -> None:
    # Values as printed in the articles' own XML (PLOS ONE 10.1371/journal.pone.0120049 Table 1;
    # PLOS Medicine 10.1371/journal.pmed.1001518 Table 1; PLOS ONE 10.1371/journal.pone.0153170
    # Table 1).
    table = real_docs["pone-0120049"].tables[0]
    rows = {table.row_label(r): r for r in range(table.header_rows, table.n_rows)}
    assert table.cell(rows["Weight, kg"], 1).text == "68.8 ± 2.6"
    assert table.row_units[rows["Weight, kg"]] == "kg"
    assert table.row_units[rows["BMI, kg/m^2"]] == "kg/m^2"  # kg/m<sup>2</sup>
    assert table.row_units[rows["Plasma glucose, mg/dl"]] == "mg/dl"
    pmed = real_docs["pmed-1001518"].tables[0]
    # "43·4 (13·24)" printed with middle-dot decimals.
    assert pmed.grid()[3][1:3] == ["43.4 (13.24)", "43.5 (13.26)"]
    pone = real_docs["pone-0153170"].tables[0]
    assert pone.header_rows == 2
    assert pone.grid()[0] == ["", "", "HS", "TAC", "CsA"]  # colspan="2" corner repeated
    creatinine = [r for r in pone.grid() if r[0] == "Creatinin (mg/dL)"]
    assert creatinine == [["Creatinin (mg/dL)", "", "-", "1.8 ±0.7", "2.1 ±1.1"]]


@pytest.mark.corpus
def test_real_numbered_headings_and_no_citation_markers(real_docs: dict[str, Document]) -> None:
    document = real_docs["pone-0153170"]
    headings = [(s.name, s.heading) for s in document.sections]
    assert ("methods", "2 Patients, Materials and Methods") in headings
    assert ("results", "3 Results") in headings
    # PLOS numeric citations ("[1]", "[2,3]") are removed with their brackets.
    for block in document.blocks:
        if block.kind == "paragraph":
            assert not re.search(r"\[\s*\d+(?:\s*[,\u2013-]\s*\d+)*\s*\]", block.text), block.text


# --- fixture articles with a JATS version ----------------------------------------------------


def _norm(text: str) -> str:
    return " ".join(text.split())


@pytest.mark.skipif(not FIXTURE_XML, reason="no fixture XML articles generated yet")
@pytest.mark.parametrize("path", FIXTURE_XML, ids=[p.stem for p in FIXTURE_XML])
def test_fixture_xml_agrees_with_gold(path: Path) -> None:
    import json

    gold = json.loads(path.with_suffix(".gold.json").read_text(encoding="utf-8"))
    document = read_jats(path)
    assert document.doi == gold["doi"]
    assert document.title == _norm(gold["title"])
    assert len(document.tables) == len(gold["tables"])
    for table, expected in zip(document.tables, gold["tables"], strict=True):
        assert table.label == expected["label"]
        assert table.header_rows == expected["header_rows"]
        assert [[_norm(c) for c in row] for row in table.grid()] == [
            [_norm(c) for c in row] for row in expected["grid"]
        ]
    # Units: a table data point's unit, where its row label or column header prints it, is the
    # unit the table gives that cell; labels that print no unit give none.
    tables = {t.label: t for t in document.tables}
    for point in gold["data_points"]:
        if point["where"] != "table":
            continue
        table = tables[point["table"]]
        row, col = point["row"], point["col"]
        labels = table.row_label(row) + " " + table.column_header(col)
        printed = point["unit"] if point["unit"] and point["unit"] in labels else None
        assert (table.column_units[col] or table.row_units[row]) == printed, point["id"]
    # Gold paragraphs include the figure legends, which JATS gives as fig captions.
    paragraphs = [b for b in document.blocks if b.kind in ("paragraph", "caption")]
    texts = [_norm(b.text) for b in paragraphs]
    start = 0
    for item in gold["paragraphs"]:
        wanted = _norm(item["text"])
        assert wanted in texts[start:], f"not found in order: {wanted[:80]}"
        found = texts.index(wanted, start)
        assert paragraphs[found].section == item["section"], wanted[:80]
        start = found + 1
