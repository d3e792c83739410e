"""Abbreviation definitions (Schwartz & Hearst, PSB 2003) and outcomes written out."""

from __future__ import annotations

import pytest

from extract.nlp.abbreviations import expand_outcome, find_abbreviations, long_form_for


@pytest.mark.parametrize(
    ("short", "before", "long_form"),
    [
        # Worked pairs in the style of Schwartz & Hearst 2003, Table 1 (letters matched right to
        # left, the first at a word start; the shortest long form wins).
        ("ALT", "serum alanine aminotransferase", "alanine aminotransferase"),
        ("IL", "the mice were housed", None),  # no word opens with "i": no long form
        ("TNF", "plasma tumour necrosis factor", "tumour necrosis factor"),
        ("Hb", "the table shows haemoglobin", "haemoglobin"),
    ],
)
def test_long_form_for(short: str, before: str, long_form: str | None) -> None:
    assert long_form_for(short, before) == long_form


def test_definitions_in_both_orders_and_footnote_lists() -> None:
    text = (
        "Serum alanine aminotransferase (ALT) rose. We used ELISA (enzyme-linked immunosorbent "
        "assay). AST, aspartate aminotransferase; GGT, gamma-glutamyl transferase. "
        "Mice (n = 8) were compared (P < 0.05)."
    )
    found = find_abbreviations(text)
    assert found["ALT"] == "alanine aminotransferase"
    assert found["ELISA"] == "enzyme-linked immunosorbent assay"
    assert found["AST"] == "aspartate aminotransferase"
    assert found["GGT"] == "gamma-glutamyl transferase"
    # "(n = 8)" and "(P < 0.05)" define nothing
    assert set(found) == {"ALT", "ELISA", "AST", "GGT"}


def test_only_a_bare_short_form_is_written_out() -> None:
    found = {"ALT": "alanine aminotransferase", "OBS": "Oldmarsh Breathlessness Score"}
    assert expand_outcome("ALT", found) == "alanine aminotransferase"
    assert expand_outcome("OBS score", found) == "OBS score"
    assert expand_outcome("body mass", found) == "body mass"
