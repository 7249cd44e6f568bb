"""The review on the demo fleet: scores with coverage, consequences, waivers, settings,
report formats (JUnit parsed with the junitparser package), baseline mode, exit codes."""

from __future__ import annotations

import json
import shutil
import textwrap

import junitparser
import pytest

from aeroreview.calc.air import air_state
from aeroreview.calc.forces import drag_force
from aeroreview.review import review_sheet
from aeroreview.settings import Settings, load_settings
from aeroreview.sheet import load_fleet
from conftest import MINIMAL, VEHICLES


@pytest.fixture(scope="module")
def report(request):
    from conftest import run_cli

    run = run_cli("check", VEHICLES, "--format", "json", "--config", VEHICLES / "no-such.yml")
    return run


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    from conftest import run_cli

    config = tmp_path_factory.mktemp("cfg") / "mkdocs.yml"
    config.write_text("site_name: x\n", encoding="utf-8")
    run = run_cli("check", VEHICLES, "--format", "json", "--config", config)
    return run, json.loads(run.out)


def sheet_of(data, vehicle, revision):
    return next(s for s in data["sheets"] if (s["vehicle"], s["revision"]) == (vehicle, revision))


def test_missing_config_is_a_usage_error(report):
    assert report.code == 2 and "configuration file not found" in report.err


def test_demo_fleet_json_shape(demo):
    run, data = demo
    assert run.code == 1  # the problem revision fails the gate
    assert len(data["sheets"]) == 6 and data["errors"] == []
    for sheet in data["sheets"]:
        assert {"file", "vehicle", "revision", "score", "coverage", "recoverable_counts", "findings"} <= set(sheet)
        assert 0 <= sheet["score"] <= 100 and 0 < sheet["coverage"] <= 1
        assert sheet["recoverable_counts"]["low"] <= sheet["recoverable_counts"]["high"]
        for finding in sheet["findings"]:
            assert {"rule", "zone", "status", "severity", "message", "measured", "limit", "estimate",
                    "consequences", "waiver"} <= set(finding)
            if finding["estimate"] and finding["estimate"]["cd_counts_high"] > 0:
                assert finding["consequences"]["power_W_at_reference_speed"][1] > 0
                assert finding["consequences"]["energy_kWh_per_100km"][1] > 0


def test_problem_revision_fails_and_clean_revision_passes(demo, cli):
    _, data = demo
    problem, clean = sheet_of(data, "tessel", "r1"), sheet_of(data, "tessel", "r2")
    assert problem["failing"] and not clean["failing"]
    # clean: no finding at warning or above (advisories may appear as rules are added), full coverage
    assert not [f for f in clean["findings"] if f["status"] in ("warning", "failure")]
    # the score weighs cost: the clean revision's advisories still claim a share of what is within reach
    assert clean["score"] >= 60 and clean["coverage"] == 1
    assert problem["score"] < 25
    assert cli("check", VEHICLES / "tessel" / "r1.yaml").code == 1
    assert cli("check", VEHICLES / "tessel" / "r2.yaml").code == 0


def test_sparse_sheet_shows_low_coverage(demo):
    _, data = demo
    sparse = sheet_of(data, "dravik", "r1")
    assert sparse["coverage"] < 0.5
    assert sparse["zones"]["stability"]["score"] is None and sparse["zones"]["stability"]["coverage"] == 0


def test_consequences_match_calc_by_hand(demo):
    """Consequence watts = counts x 0.001 x A x q x v at the reference speed (130 km/h, ISA sea level)."""
    _, data = demo
    sheet = sheet_of(data, "tessel", "r1")
    finding = next(f for f in sheet["findings"] if f["rule"] == "underbody.diffuser-angle")
    v = 130 / 3.6
    per_count = float(drag_force(0.001, 2.31, v, air_state(0).density)) * v
    assert finding["consequences"]["power_W_at_reference_speed"] == pytest.approx([5 * per_count, 20 * per_count])
    assert finding["consequences"]["range_km"][1] > finding["consequences"]["range_km"][0] > 0
    diesel = sheet_of(data, "dravik", "r1")
    costed = next(f for f in diesel["findings"] if f["consequences"])
    assert "litres_per_100km" in costed["consequences"] and "range_km" in costed["consequences"]


def test_key_numbers(demo):
    _, data = demo
    numbers = sheet_of(data, "tessel", "r1")["key_numbers"]
    assert numbers["cda"] == pytest.approx(0.301 * 2.31)  # r1's CFD of record
    assert numbers["drag_N"] == pytest.approx(float(drag_force(0.301, 2.31, 130 / 3.6, 1.225)), rel=1e-4)
    assert numbers["lift_top_speed"]["rear_kg"] > numbers["lift_reference"]["rear_kg"] > 0
    assert 0 < numbers["aero_share"] < 1
    assert numbers["per_10_counts"]["wltc-3b"]["range_km"] < 0


def waiver_sheet(write_sheet, waiver: str):
    text = MINIMAL.replace("  powertrain.kind: electric\n", "  powertrain.kind: electric\n  cooling.shutters: none\n")
    return write_sheet(text + "waivers:\n" + textwrap.indent(waiver, "  "))


def test_waiver_valid_is_shown_and_does_not_fail(cli, write_sheet):
    path = waiver_sheet(write_sheet, "- {rule: cooling.shutters, reason: cost, by: PM, expires: 2099-01-01}\n")
    run = cli("check", path, "--format", "json", "--fail-on", "warning")
    finding = next(f for f in json.loads(run.out)["sheets"][0]["findings"] if f["rule"] == "cooling.shutters")
    assert finding["status"] == "warning" and finding["waiver"]["status"] == "active"
    assert run.code == 0


def test_waiver_expired_stops_applying_and_is_reported(cli, write_sheet):
    path = waiver_sheet(write_sheet, "- {rule: cooling.shutters, reason: cost, expires: 2020-01-01}\n")
    run = cli("check", path, "--format", "json", "--fail-on", "warning")
    data = json.loads(run.out)
    finding = next(f for f in data["sheets"][0]["findings"] if f["rule"] == "cooling.shutters")
    assert finding["waiver"]["status"] == "expired" and run.code == 1
    assert any("expired on 2020-01-01" in w["message"] for w in data["warnings"])


def test_waiver_for_unknown_rule_is_an_error(cli, write_sheet):
    path = waiver_sheet(write_sheet, "- {rule: cooling.shuters, reason: typo}\n")
    run = cli("check", path)
    assert run.code == 2 and f"{path}:12:1" in run.err and "did you mean 'cooling.shutters'?" in run.err


def config_file(tmp_path, body: str):
    path = tmp_path / "mkdocs.yml"
    path.write_text("site_name: test\nplugins:\n  - search\n  - aeroreview:\n" + textwrap.indent(body, "      "),
                    encoding="utf-8")
    return path


def test_settings_overrides_change_verdicts(cli, tmp_path):
    sheet = VEHICLES / "tessel" / "r1.yaml"
    relaxed = config_file(tmp_path, "rules:\n  rear.backlight-angle:\n    thresholds: {critical_low: 30 deg}\n"
                                    "  underbody.diffuser-angle: {severity: advisory}\n"
                                    "  cooling.inlet-area: {disabled: true}\n")
    data = json.loads(cli("check", sheet, "--format", "json", "--config", relaxed).out)
    statuses = {f["rule"]: f["status"] for f in data["sheets"][0]["findings"]}
    assert statuses["rear.backlight-angle"] == "warning"  # 29 deg is now below the critical region
    assert statuses["underbody.diffuser-angle"] == "advisory"
    assert "cooling.inlet-area" not in statuses


def test_settings_reference_speed_and_air(tmp_path):
    config = config_file(tmp_path, "reference_speed: 100 km/h\nair: {altitude: 1500 m, temperature: 30 degC}\n"
                                   "fail_on: warning\n")
    settings = load_settings(config)
    assert settings.reference_speed == pytest.approx(100 / 3.6)
    assert settings.air().temperature == pytest.approx(303.15) and settings.fail_on == "warning"
    review = review_sheet(load_fleet([VEHICLES / "tessel" / "r2.yaml"]).sheets[0], settings)
    assert review.key_numbers.reference_speed_km_h == pytest.approx(100)


@pytest.mark.parametrize("body, message", [
    ("rules:\n  rear.backlite-angle: {disabled: true}\n", "did you mean 'rear.backlight-angle'?"),
    ("rules:\n  rear.backlight-angle:\n    thresholds: {critical_lo: 27 deg}\n", "has no threshold 'critical_lo'"),
    ("rules:\n  rear.backlight-angle:\n    thresholds: {critical_low: 27 mm}\n", "not a unit of angle"),
    ("rules:\n  rear.backlight-angle: {severity: fatal}\n", "severity must be one of"),
    ("fail_on: sometimes\n", "fail_on must be one of"),
    ("refrence_speed: 100 km/h\n", "did you mean 'reference_speed'?"),
])
def test_settings_errors_are_located(cli, tmp_path, body, message):
    config = config_file(tmp_path, body)
    run = cli("check", VEHICLES / "tessel" / "r2.yaml", "--config", config)
    assert run.code == 2 and message in run.err and f"{config}:" in run.err


def test_junit_output_parses_with_junitparser(cli, tmp_path):
    out = tmp_path / "report.xml"
    run = cli("check", VEHICLES, "--format", "junit", "--output", out, "--config", config_file(tmp_path, "{}\n"))
    assert run.code == 1
    xml = junitparser.JUnitXml.fromfile(str(out))
    suites = {suite.name: suite for suite in xml}
    assert "tessel@r1" in suites and "tessel@r2" in suites
    failed = {case.name for case in suites["tessel@r1"] if any(isinstance(r, junitparser.Failure) for r in case.result)}
    assert {"rear.backlight-angle", "underbody.diffuser-angle"} <= failed
    assert not any(isinstance(r, junitparser.Failure) for case in suites["tessel@r2"] for r in case.result)
    assert sum(1 for _ in suites["tessel@r1"]) >= 30


def test_baseline_unchanged_fleet_passes_new_failure_fails(cli, tmp_path, write_sheet):
    config = config_file(tmp_path, "{}\n")
    baseline = tmp_path / "baseline.json"
    assert cli("check", VEHICLES, "--format", "json", "-o", baseline, "--config", config).code == 1
    assert cli("check", VEHICLES, "--baseline", baseline, "--config", config).code == 0
    fleet = tmp_path / "fleet"
    shutil.copytree(VEHICLES, fleet)
    changed = fleet / "tessel" / "r2.yaml"
    changed.write_text(changed.read_text(encoding="utf-8").replace("underbody.diffuser_angle: 8 deg",
                                                                   "underbody.diffuser_angle: 14 deg"), encoding="utf-8")
    run = cli("check", fleet, "--baseline", baseline, "--format", "json", "--config", config)
    assert run.code == 1
    failing = {(s["vehicle"], s["revision"]): s["failing"] for s in json.loads(run.out)["sheets"]}
    assert failing[("tessel", "r2")] == ["underbody.diffuser-angle"] and failing[("tessel", "r1")] == []


def test_bad_baseline_is_an_input_error(cli, tmp_path):
    bad = tmp_path / "b.json"
    bad.write_text("{}", encoding="utf-8")
    run = cli("check", VEHICLES, "--baseline", bad)
    assert run.code == 2 and "not an aeroreview JSON report" in run.err


def test_fail_on_levels(cli):
    clean = VEHICLES / "quillon" / "r2.yaml"  # warnings, no failures
    assert cli("check", clean, "--fail-on", "failure").code == 0
    assert cli("check", clean, "--fail-on", "warning").code == 1
    assert cli("check", VEHICLES / "tessel" / "r1.yaml", "--fail-on", "never").code == 0


def test_output_never_overwrites_an_input_sheet(cli, tmp_path, write_sheet):
    path = write_sheet(MINIMAL)
    before = path.read_text(encoding="utf-8")
    run = cli("check", path, "--output", path)
    assert run.code == 2 and path.read_text(encoding="utf-8") == before
    link = tmp_path / "report.txt"  # not a sheet itself, but a link to one: its real path is the sheet's
    link.symlink_to(path)
    run = cli("check", tmp_path, "--output", link)
    assert run.code == 2 and "one of the input sheets" in run.err and path.read_text(encoding="utf-8") == before


def test_rules_listing_and_explain(cli):
    rules = json.loads(cli("rules", "--format", "json").out)
    assert len(rules) >= 30
    assert {r["zone"] for r in rules} == {"front", "windshield", "rear", "sides", "underbody", "wheels", "cooling",
                                          "stability", "data"}
    for rule in rules:
        assert rule["sources"] and all(s["kind"] in ("published", "standard", "common practice", "from memory")
                                       for s in rule["sources"])
        assert rule["rationale"] and rule["fix"]
        assert set(rule["documentation"]) == {"What it checks", "Why it matters", "How to fix", "Known limits"}
        for threshold in rule["thresholds"]:
            assert threshold["source"]["kind"]
    explained = cli("explain", "rear.backlight-angle")
    assert explained.code == 0 and "critical_low = 26 deg" in explained.out and "Ahmed" in explained.out
    unknown = cli("explain", "rear.backlite-angle")
    assert unknown.code == 2 and "did you mean 'rear.backlight-angle'?" in unknown.err


def test_text_report_groups_by_zone(cli):
    run = cli("check", VEHICLES / "tessel" / "r1.yaml")
    assert "Roof and rear" in run.out and "failure" in run.out and "\x1b[" not in run.out
    assert "effects do not simply add" in run.out


def test_settings_default_without_config(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    assert load_settings() == Settings(root=tmp_path)
