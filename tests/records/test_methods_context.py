"""Context from the methods: a method, time point or subject is attached only where the
article ties it to the data point (invented articles)."""

from __future__ import annotations

from dataclasses import replace

from extract.ingest.document import Document
from extract.records.assemble import first_pass
from tests.records._build import make_document, make_table

GRID = [
    ["", "Vehicle (n = 9)"],
    ["Body weight (kg)", "68.8 ± 2.1"],
    ["Plasma zorbicin (mg/dL)", "84.0 ± 3.0"],
]


def _with_heading(document: Document, before: int, text: str) -> Document:
    """The document with a heading block set before block ``before`` in its section."""
    blocks = list(document.blocks)
    heading = replace(blocks[before], kind="heading", text=text)
    blocks.insert(before, heading)
    blocks = [replace(block, index=i) for i, block in enumerate(blocks)]
    return replace(document, blocks=tuple(blocks))


def _by_outcome(document: Document) -> dict[str, object]:
    return {p.outcome.lower(): p for p in first_pass(document)}


def test_method_only_for_the_outcome_its_methods_sentence_names() -> None:
    document = make_document(
        [
            ("methods", "Adult Quorvish volunteers were studied after an overnight fast."),
            (
                "methods",
                "Plasma zorbicin was measured using an automated zorbicin analyzer. "
                "Hormones were measured using a commercially available kit.",
            ),
        ],
        tables=(make_table(GRID),),
    )
    found = _by_outcome(document)
    weight, zorbicin = found["body weight"], found["plasma zorbicin"]
    assert weight.method is None  # no methods sentence names body weight
    assert zorbicin.method == "automated zorbicin analyzer"
    assert "method_from_methods" in zorbicin.flags
    # an inferred method costs confidence (all else equal between the two values)
    assert zorbicin.confidence < weight.confidence


def test_heading_never_leaks_into_the_subject() -> None:
    document = make_document(
        [("methods", "Healthy Quorvish adults were enrolled after an overnight fast.")],
        tables=(make_table(GRID),),
    )
    document = _with_heading(document, 0, "Study participants")
    document = _with_heading(document, 0, "Methods")
    subjects = {p.subject for p in first_pass(document)}
    assert subjects == {"Healthy Quorvish adults"}


def test_generic_subject_words_are_left_empty() -> None:
    document = make_document(
        [("methods", "Subjects were screened by phone. All subjects gave written consent.")],
        tables=(make_table(GRID),),
    )
    assert {p.subject for p in first_pass(document)} == {None}


def test_two_sampling_times_give_a_time_only_to_the_outcome_tied_to_one() -> None:
    document = make_document(
        [
            ("methods", "Plasma zorbicin was sampled at 120 min."),
            ("methods", "Hormone samples were taken at 30 min."),
        ],
        tables=(make_table(GRID),),
    )
    found = _by_outcome(document)
    assert found["plasma zorbicin"].time_point == "120 min"
    assert "time_point_from_methods" in found["plasma zorbicin"].flags
    assert found["body weight"].time_point is None


def test_one_sampling_time_is_study_wide() -> None:
    document = make_document(
        [("methods", "Samples were taken at week 6 and stored until analysis.")],
        tables=(make_table(GRID),),
    )
    times = {p.outcome.lower(): p.time_point for p in first_pass(document)}
    assert times == {"body weight": "week 6", "plasma zorbicin": "week 6"}


def test_sex_split_group_label_gives_n_and_a_clean_group() -> None:
    grid = [
        ["", "Low ZQX (2F/6M)", "High ZQX (5 F/4 M)"],
        ["Body weight (kg)", "68.8 ± 2.1", "64.5 ± 2.0"],
    ]
    found = {p.group: p.n for p in first_pass(make_document(tables=(make_table(grid),)))}
    assert found == {"Low ZQX": 8, "High ZQX": 9}


def test_subject_is_who_the_methods_say_was_studied() -> None:
    document = make_document(
        [
            (
                "methods",
                "Zorbicin expression in blood cells was taken from a public atlas. "
                "The study included twenty patients with Quorvish syndrome.",
            )
        ],
        tables=(make_table(GRID),),
    )
    assert {p.subject for p in first_pass(document)} == {"patients"}


def test_a_table_footnote_ties_its_method_to_the_table_values() -> None:
    table = make_table(GRID, footnotes=("Values measured by ELISA; mean ± SD.",))
    document = make_document(
        [("methods", "Hormones were measured using a commercially available kit.")],
        tables=(table,),
    )
    assert {p.method for p in first_pass(document)} == {"ELISA"}


def test_a_subject_given_as_an_example_is_no_study_subject() -> None:
    document = make_document(
        [
            (
                "methods",
                "Included in the visitor category are relatives such as a spouse or children.",
            )
        ],
        tables=(make_table(GRID),),
    )
    assert {p.subject for p in first_pass(document)} == {None}
