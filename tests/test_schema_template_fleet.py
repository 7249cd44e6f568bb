"""The JSON Schema (checked with the jsonschema package), the template and the demo fleet."""

from __future__ import annotations

import json
import re

import jsonschema
import pytest
import yaml

from aeroreview import catalogue, template
from conftest import DEMO_SHEETS, MINIMAL, VEHICLES


def _as_json(value):
    """YAML reads unquoted dates as dates; JSON Schema sees them as strings, as editors do."""
    return json.loads(json.dumps(value, default=str))


@pytest.fixture(scope="module")
def schema(request):
    from conftest import run_cli

    run = run_cli("schema")
    assert run.code == 0
    return json.loads(run.out)


def test_schema_is_valid_draft_2020_12(schema):
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    jsonschema.Draft202012Validator.check_schema(schema)


@pytest.mark.parametrize("path", DEMO_SHEETS, ids=lambda p: p.relative_to(VEHICLES).as_posix())
def test_demo_sheets_validate_against_schema(schema, path):
    document = _as_json(yaml.safe_load(path.read_text(encoding="utf-8")))
    jsonschema.Draft202012Validator(schema).validate(document)


def test_schema_rejects_an_unknown_feature_and_a_bad_choice(schema):
    validator = jsonschema.Draft202012Validator(schema)
    base = {"id": "x", "revision": "r1", "features": {f.key: f.example for f in catalogue.FEATURES if f.required}}
    assert validator.is_valid(base)
    assert not validator.is_valid({**base, "features": {**base["features"], "rear.bogus": 1}})
    assert not validator.is_valid({**base, "features": {**base["features"], "vehicle.class": "boat"}})
    assert not validator.is_valid({**base, "id": "../x"})


def test_catalogue_is_large_and_complete():
    assert len(catalogue.FEATURES) >= 60
    for item in catalogue.FEATURES:
        assert item.zone in catalogue.ZONES, item.key
        assert item.description and item.how_to_measure, item.key
        if item.kind == "quantity":
            low, high = item.bounds
            assert low < high, item.key
            if item.typical:
                assert low <= item.typical[0] < item.typical[1] <= high, item.key
                assert item.typical_source, item.key
    zones = {item.zone for item in catalogue.FEATURES}
    assert zones == set(catalogue.ZONES)


def test_demo_fleet_is_valid(cli):
    """Every demo sheet validates (exit 0 once findings may not fail; the problem revision
    fails the gate at the default level, see test_review)."""
    run = cli("check", VEHICLES, "--fail-on", "never")
    assert run.code == 0, run.err
    assert f"{len(DEMO_SHEETS)} revision(s) reviewed" in run.out and "0 input error(s)" in run.out


def test_demo_fleet_shape():
    """At least 3 vehicles of different classes, 2 revisions each, and a yaw sweep somewhere."""
    sheets = [yaml.safe_load(p.read_text(encoding="utf-8")) for p in DEMO_SHEETS]
    by_vehicle: dict[str, list] = {}
    for sheet in sheets:
        by_vehicle.setdefault(sheet["id"], []).append(sheet)
    assert len(by_vehicle) >= 3
    assert all(len(revisions) >= 2 for revisions in by_vehicle.values())
    assert len({revisions[0]["features"]["vehicle.class"] for revisions in by_vehicle.values()}) >= 3
    assert any(result.get("yaw_sweep") for sheet in sheets for result in sheet.get("results", []))


def fill_placeholders(text: str) -> str:
    """What a reviewer does to a fresh template: put a real value where each placeholder is."""
    text = text.replace("<display name>", "Demo Car").replace("<your name>", "A. Reviewer")
    text = text.replace("<one of electric, combustion, hybrid>", "electric")
    return re.sub(r"<e\.g\. ([^<>]+)>", r"\1", text)


def test_template_placeholders_are_refused_until_filled_and_never_overwritten(cli, tmp_path):
    """An unfilled template must not pass the gate: each placeholder is a located input error (exit 2)."""
    target = tmp_path / "x.yaml"
    made = cli("new", "demo-car", "--class", "sedan", "-o", target)
    assert made.code == 0 and "7 placeholders" in made.out and "refuses" in made.out
    text = target.read_text(encoding="utf-8")
    for item in catalogue.FEATURES:
        assert item.key in text, item.key
    assert "vehicle.class: sedan  #" in text and "vehicle.class: <" not in text  # --class chose it
    for fail_on in ("failure", "never"):
        run = cli("check", target, "--fail-on", fail_on)
        assert run.code == 2, run.err
        left = [line for line in run.err.splitlines() if "template placeholder" in line]
        lines = [i for i, line in enumerate(text.splitlines(), 1) if re.search(r": <[^>]*>", line)]
        assert [int(line.split(":")[1]) for line in left] == lines and len(lines) == 7
    filled = tmp_path / "filled.yaml"
    filled.write_text(fill_placeholders(text), encoding="utf-8")
    assert cli("check", filled).code == 0
    again = cli("new", "demo-car", "--class", "sedan", "-o", target)
    assert again.code == 2 and "already exists" in again.err
    assert target.read_text(encoding="utf-8") == text


def test_empty_reviewer_is_refused(cli, write_sheet):
    path = write_sheet(MINIMAL.replace("features:", "reviewer: ''\nfeatures:"))
    run = cli("check", path)
    assert run.code == 2 and f"{path}:3:" in run.err and "'reviewer' is empty" in run.err


@pytest.mark.parametrize("vehicle_class", catalogue.VEHICLE_CLASSES)
def test_template_for_every_class_checks_clean_once_filled(cli, tmp_path, vehicle_class):
    target = tmp_path / f"{vehicle_class}.yaml"
    assert cli("new", "car", "--class", vehicle_class, "--revision", "r3", "-o", target).code == 0
    target.write_text(fill_placeholders(target.read_text(encoding="utf-8")), encoding="utf-8")
    run = cli("check", target)
    assert run.code == 0 and "warning" not in run.err, run.err


def test_template_states_every_sign_convention(tmp_path):
    """Every quantity that can be negative says which way is positive, in the template beside it."""
    text = template.render("car", "sedan")
    signed = [f for f in catalogue.FEATURES if f.kind == "quantity" and f.bounds[0] < 0]
    assert signed
    for item in signed:
        line = next(line for line in text.splitlines() if f" {item.key}:" in line)
        assert item.sign and f"Sign: {item.sign}" in line, item.key
    assert "positive nose-down" in next(line for line in text.splitlines() if "underbody.pitch" in line)


def test_new_refuses_an_unsafe_id(cli, tmp_path):
    run = cli("new", "../evil", "--class", "sedan", "-o", tmp_path / "e.yaml")
    assert run.code == 2 and "not a safe vehicle id" in run.err
    assert not (tmp_path / "e.yaml").exists()


def test_version_and_usage_errors(cli):
    assert cli("check", "--format", "xml").code == 2
    assert cli("frobnicate").code == 2
    with pytest.raises(SystemExit) as done:
        cli("--version")
    assert done.value.code == 0
