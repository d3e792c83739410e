"""The proposal JSON Schema: first-pass output validates, malformed records do not.

The schema is checked against the JSON Schema 2020-12 meta-schema with the jsonschema library
(reference implementation of https://json-schema.org/draft/2020-12).
"""

from __future__ import annotations

import copy
import json
from functools import cache
from pathlib import Path
from typing import Any

import jsonschema
import pytest

from extract.records.proposal import Dispersion, Proposal, Source

REPO = Path(__file__).resolve().parent.parent
SCHEMA_PATH = REPO / "extract" / "schemas" / "proposal.schema.json"
ARTICLES = REPO / "fixtures" / "articles"


@cache
def validator() -> jsonschema.Draft202012Validator:
    schema = json.loads(SCHEMA_PATH.read_text(encoding="utf-8"))
    jsonschema.Draft202012Validator.check_schema(schema)
    return jsonschema.Draft202012Validator(schema)


def good_record() -> dict[str, Any]:
    return Proposal(
        id="0123456789abcdef",
        article="10.5555/winnow.demo1",
        file="demo1.pdf",
        outcome="serum velorin",
        group="vehicle",
        statistic="mean",
        value=24.1,
        unit="µmol/L",
        unit_ucum="umol/L",
        value_normalized=24.1,
        unit_normalized="µmol/L",
        dispersion=Dispersion("SD", 1.3),
        sd=1.3,
        n=9,
        time_point="week 8",
        method="colorimetric assay",
        subject="male rats",
        intervention="tarvexol 10 mg/kg",
        source=Source(
            "table", 2, (50.0, 100.0, 300.0, 112.5), "results", "Table 1", 1, 1, "24.1 ± 1.3"
        ),
        extractor="quantities.rules@0.1.0",
        confidence=0.9,
    ).to_dict()


def test_schema_is_valid_2020_12() -> None:
    assert validator().schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"


def test_schema_names_every_contract_field() -> None:
    # The contract's fields are those of the Proposal dataclass (minus the extra "flags").
    required = set(validator().schema["required"])
    assert required == set(good_record()) - {"flags"}


def test_good_record_and_xml_record_validate() -> None:
    validator().validate(good_record())
    xml = good_record()
    xml["source"].update(page=None, bbox=None, ref="sec[3]/table-wrap[1]")
    xml["dispersion"] = {"kind": "CI95", "value": [21.0, 27.2]}
    xml["extra_field"] = {"allowed": True}
    validator().validate(xml)


def _broken(change: str) -> dict[str, Any]:
    record = copy.deepcopy(good_record())
    if change == "missing value":
        del record["value"]
    elif change == "value as text":
        record["value"] = "24.1"
    elif change == "unknown statistic":
        record["statistic"] = "average"
    elif change == "unknown dispersion kind":
        record["dispersion"] = {"kind": "SE", "value": 1.3}
    elif change == "CI as one number":
        record["dispersion"] = {"kind": "CI95", "value": 2.0}
    elif change == "SD as a pair":
        record["dispersion"] = {"kind": "SD", "value": [1.0, 2.0]}
    elif change == "n zero":
        record["n"] = 0
    elif change == "n fractional":
        record["n"] = 9.5
    elif change == "confidence above 1":
        record["confidence"] = 1.2
    elif change == "page 0":
        record["source"]["page"] = 0
    elif change == "bbox of three":
        record["source"]["bbox"] = [1, 2, 3]
    elif change == "table source without label":
        record["source"]["table"] = None
    elif change == "source kind figure":
        record["source"]["kind"] = "figure"
    elif change == "extractor without version":
        record["extractor"] = "quantities.rules"
    elif change == "file with folder":
        record["file"] = "articles/demo1.pdf"
    else:  # pragma: no cover - a typo in the parameter list
        raise AssertionError(change)
    return record


@pytest.mark.parametrize(
    "change",
    [
        "missing value",
        "value as text",
        "unknown statistic",
        "unknown dispersion kind",
        "CI as one number",
        "SD as a pair",
        "n zero",
        "n fractional",
        "confidence above 1",
        "page 0",
        "bbox of three",
        "table source without label",
        "source kind figure",
        "extractor without version",
        "file with folder",
    ],
)
def test_invalid_records_are_rejected(change: str) -> None:
    assert not validator().is_valid(_broken(change))


@pytest.fixture(scope="module")
def fixture_records() -> dict[str, list[dict[str, Any]]]:
    assemble = pytest.importorskip("extract.records.assemble")
    ingest = pytest.importorskip("extract.ingest")
    files = sorted(ARTICLES.glob("*.pdf")) + sorted(ARTICLES.glob("*.xml"))
    if not files:
        pytest.skip("no fixture articles in fixtures/articles")
    return {
        f.name: [p.to_dict() for p in assemble.first_pass(ingest.read_document(f))] for f in files
    }


def test_first_pass_output_validates_on_every_fixture(
    fixture_records: dict[str, list[dict[str, Any]]],
) -> None:
    problems = []
    for name, records in fixture_records.items():
        assert records, f"{name}: the first pass proposed nothing"
        for record in records:
            for error in validator().iter_errors(json.loads(json.dumps(record))):
                problems.append(f"{name} {record['id']}: {error.json_path}: {error.message}")
    assert not problems, "\n".join(problems[:20])
