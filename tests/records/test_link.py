"""Linking: ids, article keys, units, confidence and document order."""

from __future__ import annotations

from extract.records.assemble import first_pass
from tests.records._build import make_document, make_table

GRID = [
    ["", "Vehicle (n = 9)"],
    ["Body mass (g)", "24.1 ± 1.3"],
    ["Fennelin (zorbs)", "84.0 ± 12.0"],
]


def test_ids_are_stable_and_distinct() -> None:
    document = make_document(tables=(make_table(GRID),))
    first = [p.id for p in first_pass(document)]
    again = [p.id for p in first_pass(document)]
    assert first == again and len(set(first)) == len(first)


def test_id_changes_with_value_and_location() -> None:
    a = first_pass(make_document(tables=(make_table(GRID),)))[0]
    grid = [row[:] for row in GRID]
    grid[1][1] = "24.2 ± 1.3"
    b = first_pass(make_document(tables=(make_table(grid),)))[0]
    assert a.id != b.id


def test_article_is_doi_when_stated_else_stem() -> None:
    with_doi = first_pass(make_document(tables=(make_table(GRID),), doi="10.5555/winnow.x1"))
    without = first_pass(make_document(tables=(make_table(GRID),)))
    assert with_doi[0].article == "10.5555/winnow.x1"
    assert without[0].article == "fixture-a" and without[0].file == "fixture-a.pdf"


def test_unknown_unit_kept_as_written_and_flagged() -> None:
    proposals = first_pass(make_document(tables=(make_table(GRID),)))
    known, unknown = proposals
    assert known.unit_ucum == "g" and "unknown_unit" not in known.flags
    assert unknown.unit == "zorbs" and unknown.unit_ucum is None
    assert "unknown_unit" in unknown.flags and unknown.confidence < known.confidence


def test_sem_with_header_n_derives_sd() -> None:
    grid = [["", "Vehicle (n = 16)"], ["Body mass (g)", "24.1 ± 1.5"]]
    table = make_table(grid, caption="Mean ± SEM.")
    (proposal,) = first_pass(make_document(tables=(table,)))
    # Cochrane Handbook 6.5.2.2: SD = SEM × √n = 1.5 × 4 = 6.0.
    assert proposal.sd == 6.0


def test_text_and_tables_in_document_order() -> None:
    document = make_document(
        [
            ("results", "Liver mass was 1.24 ± 0.11 g in vehicle mice."),
            ("results", "Grip strength was 98.2 ± 4.5 gf in vehicle mice."),
        ],
        tables=(make_table(GRID),),
    )
    proposals = first_pass(document)
    # The table has no caption block: it follows the text of its page (the text is on page 1).
    assert [p.value for p in proposals] == [1.24, 98.2, 24.1, 84.0]


def test_confidence_in_range_and_higher_for_nearer_n() -> None:
    grid = [["", "Vehicle (n = 9)", "Talvorin"], ["Body mass (g)", "24.1 ± 1.3", "22.0 ± 1.1"]]
    document = make_document(
        [("methods", "Data are mean ± SD; n = 9 per group.")], tables=(make_table(grid),)
    )
    header_n, methods_n = first_pass(document)
    assert 0.0 <= methods_n.confidence < header_n.confidence <= 1.0


def test_group_n_from_another_tables_header() -> None:
    # A baseline table's "Placebo (n = 105)" gives the arm's n to later tables (CONSORT 2010,
    # item 16: numbers analysed per group, reported once per arm).
    baseline = make_table(
        [["Characteristic", "Placebo (n = 105)", "QRV 10 mg (n = 97)"], ["Age", "51.7", "51.3"]]
    )
    outcomes = make_table(
        [["Arm", "Systolic pressure (mmHg)"], ["Placebo", "131 ± 9"], ["QRV 10 mg", "133 ± 8"]],
        label="Table 2",
    )
    document = make_document([("results", "See tables.")], tables=(baseline, outcomes))
    found = {(p.source.table, p.group): p.n for p in first_pass(document)}
    assert found[("Table 2", "Placebo")] == 105
    assert found[("Table 2", "QRV 10 mg")] == 97


def test_methods_give_time_point_subject_and_method() -> None:
    document = make_document(
        [
            ("methods", "Animals. Male Tallow-Creek mice were housed in pairs."),
            ("methods", "Samples taken at week 6 were read on a Corvane 400 analyser."),
            ("methods", "Liver mass was measured by a Quellon balance method."),
            ("results", "Liver mass was 1.24 ± 0.11 g in the vehicle group."),
        ]
    )
    (proposal,) = first_pass(document)
    assert proposal.time_point == "week 6" and "time_point_from_methods" in proposal.flags
    assert proposal.subject == "Male Tallow-Creek mice"
    # The method of the sentence that names the outcome, not the first method of the methods.
    assert proposal.method == "Quellon balance method"
    assert "method_from_methods" in proposal.flags


def test_time_to_event_value_gets_no_methods_time_point() -> None:
    document = make_document(
        [
            ("methods", "Samples taken at week 12 were analysed."),
            ("results", "The time to response was median 6 weeks (IQR 5–8)."),
        ]
    )
    (proposal,) = first_pass(document)
    assert proposal.time_point is None
