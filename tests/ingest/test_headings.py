"""The one heading -> section table, as the PDF (start of heading) and JATS (anywhere) use it.

Headings are those journals print (common practice; IMRaD order per the ICMJE
Recommendations, "Preparing a Manuscript for Submission").
"""

from __future__ import annotations

import pytest

from extract.ingest.headings import clean_heading, heading_to_section
from extract.ingest.jats_sections import section_from_title
from extract.ingest.sections import heading_section


@pytest.mark.parametrize(
    ("heading", "expected"),
    [
        ("Abstract", "abstract"),
        ("1. Introduction", "introduction"),
        ("2.1 Materials and Methods", "methods"),
        ("Statistical analysis", "methods"),
        ("III. Results", "results"),
        ("Results and discussion", "results"),
        ("Conclusions", "discussion"),
        ("References", "references"),
        ("Figure legends", "legends"),
        ("Acknowledgements", "other"),
        ("Animals", None),
    ],
)
def test_pdf_and_jats_readers_share_the_mapping(heading: str, expected: str | None) -> None:
    assert heading_section(heading) == expected
    assert section_from_title(heading) == expected


def test_pdf_headings_match_at_the_start_only() -> None:
    # a PDF subheading that mentions results further on is no results heading
    assert heading_section("Effect of dose on results") is None
    assert section_from_title("Effect of dose on results") == "results"


def test_earliest_named_part_wins_anywhere() -> None:
    assert heading_to_section("Discussion of results", anywhere=True) == "discussion"


def test_whole_heading_words_only() -> None:
    # "Intro" alone is an introduction; "methodsological" is not "methods"
    assert heading_to_section("Intro") == "introduction"
    assert heading_to_section("Introspection scores") is None
    assert heading_to_section("Methodsological notes") is None


def test_pdf_heading_of_more_than_six_words_is_not_a_section() -> None:
    assert heading_section("Results of the eight week study in all groups") is None


def test_numbering_and_end_punctuation_are_removed() -> None:
    assert clean_heading("IV.  Discussion:") == "discussion"
    assert clean_heading("B. Study population") == "study population"
