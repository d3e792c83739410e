"""Sample sizes in every phrasing articles use (common practice in reporting animal and
clinical studies: "n = 8 per group", "Vehicle (n = 9)" headers, "(60 per arm)")."""

from __future__ import annotations

import pytest

from extract.nlp.sample_size import find_sample_sizes, parse_number

# (text, n, low, high, scope, group)
CASES = [
    ("Mice were studied (n = 8 per group).", 8, 8, 8, "per_group", None),
    ("Mice were allocated to 4 groups (n=8/group).", 8, 8, 8, "per_group", None),
    ("We studied twelve mice per group.", 12, 12, 12, "per_group", None),
    ("We used 8 animals per group.", 8, 8, 8, "per_group", None),
    ("Bars show mean ± SEM; n = 6 per group.", 6, 6, 6, "per_group", None),
    ("Vehicle (n = 9)", 9, 9, 9, "group", "Vehicle"),
    ("ZX 10 mg/kg (n = 8)", 8, 8, 8, "group", "ZX 10 mg/kg"),
    ("n = 9 in the vehicle group", 9, 9, 9, "group", "vehicle"),
    ("Groups were small (n = 6–8).", None, 6, 8, "unspecified", None),
    ("Mice were allocated to 4 groups (n = 6–8 per group).", None, 6, 8, "per_group", None),
    ("A total of n = 40 rats was used.", 40, 40, 40, "total", None),
    ("Data come from 24 female mice.", 24, 24, 24, "total", None),
]


@pytest.mark.parametrize(("text", "n", "low", "high", "scope", "group"), CASES)
def test_sample_size(
    text: str, n: int | None, low: int, high: int, scope: str, group: str | None
) -> None:
    found = find_sample_sizes(text)
    assert len(found) == 1, found
    size = found[0]
    assert (size.n, size.low, size.high, size.scope, size.group) == (n, low, high, scope, group)
    assert size.is_range == (low != high)
    assert text[size.start : size.end] == size.text


def test_total_and_per_arm() -> None:
    found = find_sample_sizes("The trial enrolled 120 patients (60 per arm).")
    assert [(s.n, s.scope, s.subject) for s in found] == [
        (120, "total", "patients"),
        (60, "per_group", None),
    ]


def test_allocation_sentence_names_each_group() -> None:
    text = "Of 412 people screened, 360 were randomised: 120 to placebo, 118 to ZX 10 mg and 122 to ZX 20 mg."
    found = [(s.n, s.scope, s.group) for s in find_sample_sizes(text)]
    assert (360, "total", None) in found
    assert (120, "group", "placebo") in found
    assert (118, "group", "ZX 10 mg") in found
    assert (122, "group", "ZX 20 mg") in found


def test_two_groups_in_one_sentence() -> None:
    text = "Mice were assigned to vehicle (n = 9) or ZX 10 mg/kg (n = 8)."
    found = [(s.n, s.group) for s in find_sample_sizes(text)]
    assert found == [(9, "vehicle"), (8, "ZX 10 mg/kg")]


@pytest.mark.parametrize(
    "text",
    [
        "Mice were housed four per cage.",
        "Body mass was 24.1 ± 1.3 g.",
        "Cells were seeded in 96-well plates.",
    ],
)
def test_not_sample_sizes(text: str) -> None:
    assert find_sample_sizes(text) == []


@pytest.mark.parametrize(
    ("word", "value"), [("twelve", 12), ("Eight", 8), ("40", 40), ("lots", None)]
)
def test_parse_number(word: str, value: int | None) -> None:
    assert parse_number(word) == value


def test_an_outcome_before_n_is_not_a_group() -> None:
    (size,) = find_sample_sizes("Body mass (n = 10) was lower in treated rats.")
    assert size.n == 10 and size.group is None


@pytest.mark.parametrize(
    ("text", "n"),
    [
        # A number after a time word is a time, not a count (common practice).
        ("Body mass at week 8 in each group. Bars show mean ± SEM.", None),
        ("Bars show mean ± SEM; eight minipigs per group.", 8),
    ],
)
def test_per_group_counts_and_times(text: str, n: int | None) -> None:
    sizes = [s.n for s in find_sample_sizes(text) if s.scope == "per_group"]
    assert sizes == ([n] if n is not None else [])
