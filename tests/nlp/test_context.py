"""Context: time points, methods, subjects, interventions, groups and outcomes."""

from __future__ import annotations

import pytest

from extract.nlp.context import find_context, find_outcome, load_lexicon, summarize_context


def _values(text: str, kind: str) -> list[str]:
    return [m.value for m in find_context(text) if m.kind == kind]


@pytest.mark.parametrize(
    ("text", "time_point"),
    [
        ("Body mass was measured at week 8.", "week 8"),
        ("Samples were taken on day 14.", "day 14"),
        ("Glucose was measured after 24 h.", "24 h"),
        ("Pressure at baseline was normal.", "baseline"),
        ("Kidneys were removed 4 weeks after surgery.", "4 weeks after surgery"),
    ],
)
def test_time_point(text: str, time_point: str) -> None:
    assert _values(text, "time_point")[0] == time_point


@pytest.mark.parametrize(
    ("text", "method"),
    [
        ("IL-6 was measured by ELISA.", "ELISA"),
        ("Creatinine was measured with a colorimetric assay.", "colorimetric assay"),
        ("Expression was quantified by RT-qPCR.", "RT-qPCR"),
        ("Pressure was recorded by tail-cuff plethysmography.", "tail-cuff plethysmography"),
        (
            "Cells were counted on an automated hematology analyzer.",
            "automated hematology analyzer",
        ),
    ],
)
def test_method(text: str, method: str) -> None:
    assert _values(text, "method")[0] == method


@pytest.mark.parametrize(
    ("text", "subject"),
    [
        ("Male 8-week-old WNX3 mice were used.", "Male 8-week-old WNX3 mice"),
        ("Female rats were housed in pairs.", "Female rats"),
        ("We enrolled adult patients (18–75 years).", "adult patients (18–75 years)"),
    ],
)
def test_subject(text: str, subject: str) -> None:
    assert _values(text, "subject")[0] == subject


@pytest.mark.parametrize(
    ("text", "intervention"),
    [
        ("Mice were treated with Zelavir (10 mg/kg) for 14 days.", "Zelavir (10 mg/kg)"),
        ("Rats received 5 mg/kg Korumab daily.", "5 mg/kg Korumab"),
        ("Controls were given vehicle alone.", "vehicle"),
    ],
)
def test_intervention(text: str, intervention: str) -> None:
    assert _values(text, "intervention")[0] == intervention


def test_groups() -> None:
    text = "Creatinine was lower in the ZX 10 mg/kg group than in vehicle-treated mice."
    assert _values(text, "group") == ["ZX 10 mg/kg", "vehicle"]


@pytest.mark.parametrize(
    ("text", "value", "outcome"),
    [
        (
            "Serum creatinine was 0.42 ± 0.05 mg/dL in the vehicle group.",
            "0.42",
            "serum creatinine",
        ),
        ("At week 8, vehicle mice had a body mass of 24.1 ± 1.3 g.", "24.1", "body mass"),
        ("Heart rate: 412 bpm.", "412", "heart rate"),
        ("The mean body mass in the vehicle group was 24.1 ± 1.3 g.", "24.1", "body mass"),
        ("Systolic blood pressure decreased to 118 ± 4 mmHg.", "118", "systolic blood pressure"),
        ("Plasma glucose, measured by ELISA, was 5.6 mmol/L.", "5.6", "plasma glucose"),
    ],
)
def test_find_outcome(text: str, value: str, outcome: str) -> None:
    mention = find_outcome(text, text.index(value))
    assert mention is not None
    assert mention.value == outcome
    assert text[mention.start : mention.end].lower() == outcome


def test_summarize_context() -> None:
    text = "At week 8, male mice treated with Zelavir (10 mg/kg) were assessed by ELISA."
    summary = summarize_context(find_context(text), outcome="IL-6")
    assert summary.time_point == "week 8"
    assert summary.method == "ELISA"
    assert summary.subject == "male mice"
    assert summary.intervention == "Zelavir (10 mg/kg)"
    assert summary.outcome == "IL-6"


@pytest.mark.parametrize("name", ["methods", "subjects", "outcomes"])
def test_lexicons_have_headers_and_entries(name: str) -> None:
    from extract.nlp.context import LEXICON_DIR

    lines = (LEXICON_DIR / f"{name}.txt").read_text(encoding="utf-8").splitlines()
    assert lines[0].startswith("#")
    entries = load_lexicon(name)
    assert len(entries) > 10
    assert all(not entry.startswith("#") for entry in entries)
    assert list(entries) == sorted(entries, key=len, reverse=True)


@pytest.mark.parametrize(
    ("text", "groups"),
    [
        # A group named by its treatment and dose, or by placebo/vehicle (common practice).
        ("Mass was 393.6 ± 7.0 g in rats given BDC 20 mg/kg.", ["BDC 20 mg/kg"]),
        ("Time was 30.2 h in cultures given OVZ 10 μM (P = 0.01).", ["OVZ 10 μM"]),
        (
            "The score fell by 4.1 points with SVT 40 mg and by 0.9 with placebo.",
            ["SVT 40 mg", "placebo"],
        ),
        # A control word before a subject noun names the control group.
        ("At day 28, control minipigs (n = 6) had a body weight of 12.4 kg.", ["control"]),
        # A group known by the rank of its dose.
        ("With the highest dose, body weight was 9.4 ± 0.5 kg.", ["highest dose"]),
        ("Analyses used ELISA 2 h later.", []),
    ],
)
def test_groups_by_treatment(text: str, groups: list[str]) -> None:
    assert _values(text, "group") == groups


def test_intervention_keeps_its_dose() -> None:
    assert _values("Cultures given OVZ 10 μM grew faster.", "intervention") == ["OVZ 10 μM"]


@pytest.mark.parametrize(
    ("text", "subjects"),
    [
        # Sex and strain words before the species noun belong to the subject; a run-in heading
        # "Animals." is no subject (common practice in methods sections).
        ("Animals. Male Ashfield Hooded rats were housed in pairs.", ["Male Ashfield Hooded rats"]),
        ("Male Tallow-Creek (TC) mice were used.", ["Male Tallow-Creek (TC) mice"]),
        ("Control mice were given vehicle.", ["mice"]),
        # A heading read with its paragraph is no strain name (common practice: a subject is a
        # species/strain/sex/age/condition phrase, never a section heading).
        ("Methods Study participants were screened.", ["participants"]),
        ("Population Patients aged 40 years were eligible.", ["Patients aged 40 years"]),
    ],
)
def test_subject_keeps_strain_and_sex(text: str, subjects: list[str]) -> None:
    assert _values(text, "subject") == subjects


def test_outcome_is_not_a_treatment_phrase() -> None:
    text = (
        "Control minipigs (n = 6) had a body weight of 12.4 ± 1.2 kg, whereas minipigs given "
        "FTZ 40 mg/kg/day (n = 8) had 16.1 ± 1.6 kg."
    )
    mention = find_outcome(text, text.index("16.1"))
    assert mention is not None and mention.value == "body weight"
