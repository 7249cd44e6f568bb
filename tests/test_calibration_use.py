"""Using a calibration: whose findings it re-costs, the study's range edges, and what it states.

References: the demo calibration's own fitted numbers (studies/tessel/rear-doe.calibration.yaml,
from the invented study) give the hand-computed estimates: team slope x the part of the fix
inside the study's range, plus the rule's library range pro rata for the part beyond it.
Continuity is checked as the two one-sided limits at each edge of the study's range.
"""

from __future__ import annotations

import json
import math
import re
import shlex
import shutil
from dataclasses import replace

import pytest
import yaml

from aeroreview.review import run_rule
from aeroreview.rules import all_rules
from aeroreview.settings import load_settings
from aeroreview.sheet import load_sheet
from aeroreview.sheetcheck import Value
from conftest import ROOT

CALIBRATION = "studies/tessel/rear-doe.calibration.yaml"
FITTED = yaml.safe_load((ROOT / CALIBRATION).read_text())
SLOPES = {s["feature"]: s for s in FITTED["sensitivities"]}
RIM = SLOPES["wheels.rim_openness"]
DIFFUSER = SLOPES["underbody.diffuser_angle"]


def _knowledge_base(tmp_path, entry: str, calibration_text: str | None = None):
    """A settings file naming one calibration entry (line 5), beside a copy of the demo study."""
    shutil.copytree(ROOT / "studies", tmp_path / "studies")
    if calibration_text is not None:
        (tmp_path / CALIBRATION).write_text(calibration_text)
    config = tmp_path / "mkdocs.yml"
    config.write_text(f"site_name: t\nplugins:\n  - aeroreview:\n      calibrations:\n        - {entry}\n")
    return config


def _findings(cli, config, sheet):
    run = cli("check", ROOT / sheet, "--config", config, "--format", "json")
    assert run.code in (0, 1), run.err
    return {f["rule"]: f for f in json.loads(run.out)["sheets"][0]["findings"]}


def _estimate(finding):
    return finding["estimate"]["cd_counts_low"], finding["estimate"]["cd_counts_high"]


def _costed(ci, move):
    return tuple(round(v, 1) for v in sorted(bound * move for bound in ci))


# -- scope: a study of one vehicle re-costs that vehicle ------------------------------------------

def test_the_demo_calibration_leaves_other_vehicles_at_the_library_value_and_says_why(cli, tmp_path):
    plain = tmp_path / "plain.yml"
    plain.write_text("site_name: t\nplugins:\n  - aeroreview: {}\n")
    for sheet, name in (("vehicles/quillon/r1.yaml", "quillon (suv)"), ("vehicles/dravik/r1.yaml", "dravik (van)")):
        calibrated, library = _findings(cli, ROOT / "mkdocs.yml", sheet), _findings(cli, plain, sheet)
        rim = calibrated["wheels.rim-openness"]
        assert _estimate(rim) == _estimate(library["wheels.rim-openness"])
        assert rim["calibration"]["applied"] is False and rim["added_sources"] == []
        assert f"is calibrated for vehicle tessel, not {name}: the library estimate stands" in \
            rim["calibration"]["note"]
        assert {r: _estimate(f) for r, f in calibrated.items() if f["estimate"]} == \
            {r: _estimate(f) for r, f in library.items() if f["estimate"]}
    text = cli("check", ROOT / "vehicles/quillon/r1.yaml", "--config", ROOT / "mkdocs.yml").out
    assert "(calibration not applied: studies/tessel/rear-doe.calibration.yaml is calibrated for vehicle tessel" \
        in text


@pytest.mark.parametrize("entry, sheet, applied", [
    (f"{{file: {CALIBRATION}, vehicles: [quillon]}}", "vehicles/quillon/r1.yaml", True),
    (f"{{file: {CALIBRATION}, classes: [van]}}", "vehicles/dravik/r1.yaml", True),
    (f"{{file: {CALIBRATION}, classes: [van]}}", "vehicles/quillon/r1.yaml", False),
    (f"{{file: {CALIBRATION}, vehicles: [quillon]}}", "vehicles/tessel/r1.yaml", True),  # the file's own vehicle
])
def test_a_settings_entry_widens_the_scope_to_declared_vehicles_and_classes(cli, tmp_path, entry, sheet, applied):
    rim = _findings(cli, _knowledge_base(tmp_path, entry), sheet)["wheels.rim-openness"]
    assert rim["calibration"]["applied"] is applied
    if applied:
        # The fix closes the rims to the rule's 20 % (wheels.rim-openness `closed`), all inside the study's 15-60 %.
        measured = {"quillon": 40, "dravik": 35, "tessel": 55}[sheet.split("/")[1]]
        assert _estimate(rim) == pytest.approx(_costed(RIM["ci95"], measured - 20), abs=0.051)
        assert "team data" in [s["kind"] for s in rim["added_sources"]]


@pytest.mark.parametrize("entry, expected", [
    (f"{{file: {CALIBRATION}, vehicles: [Quillon!]}}", r"mkdocs.yml:5:\d+: 'Quillon!' is not a vehicle id"),
    (f"{{file: {CALIBRATION}, classes: [vann]}}",
     r"mkdocs.yml:5:\d+: unknown vehicle class 'vann'; did you mean 'van'"),
    (f"{{file: {CALIBRATION}, vehicle: [quillon]}}",
     r"mkdocs.yml:5:\d+: unknown key 'vehicle'; did you mean 'vehicles'"),
    (f"{{file: {CALIBRATION}, vehicles: quillon}}", r"mkdocs.yml:5:\d+: 'vehicles' must be a list"),
    ("{vehicles: [quillon]}", r"mkdocs.yml:5:\d+: a calibration entry is a file name or \{file: FILE"),
])
def test_bad_scope_in_the_settings_is_located(cli, tmp_path, entry, expected):
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config", _knowledge_base(tmp_path, entry))
    assert run.code == 2 and re.search(expected, run.err), run.err
    assert "Traceback" not in run.err


def test_bad_scope_in_the_file_is_located_and_an_empty_scope_refused(cli, tmp_path):
    text = (ROOT / CALIBRATION).read_text()
    spoiled = text.replace("classes: []", "classes: [sedna]")
    assert spoiled != text
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config", _knowledge_base(tmp_path, CALIBRATION, spoiled))
    line = next(i for i, l in enumerate(spoiled.splitlines(), 1) if "sedna" in l)
    assert run.code == 2 and re.search(rf"{CALIBRATION}:{line}:\d+: unknown vehicle class 'sedna'; did you mean "
                                       "'sedan'", run.err), run.err
    empty = text.replace("vehicles: [tessel]", "vehicles: []")
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config",
              _knowledge_base(tmp_path / "empty", CALIBRATION, empty))
    assert run.code == 2 and re.search(r"mkdocs.yml:5:\d+: .* declares no vehicle or class its slopes hold for, "
                                       r"so it would change nothing; refit it with `aeroreview calibrate \.\.\. "
                                       r"--vehicle ID`", run.err), run.err


MAPS = ("--map", "backlight_deg=rear.backlight_angle", "--map", "diffuser_deg=underbody.diffuser_angle")


@pytest.mark.parametrize("options, expected", [
    (("--output", "{out}"), "--output needs the vehicle the study is of: add --vehicle ID"),
    (("--vehicle", "tessel"), "--vehicle and --vehicle-class are written into the calibration file: add --output"),
    (("--vehicle-class", "fastbak", "--output", "{out}"), "--vehicle-class fastbak: unknown vehicle class 'fastbak'; "
                                                          "did you mean 'fastback'?"),
    (("--vehicle", "Tessel", "--output", "{out}"), "--vehicle Tessel: 'Tessel' is not a vehicle id"),
])
def test_calibrate_declares_whom_the_file_speaks_for(cli, tmp_path, options, expected):
    out = tmp_path / "cal.yaml"
    run = cli("calibrate", ROOT / "studies/tessel/rear-doe.csv", *MAPS, *(o.format(out=out) for o in options))
    assert run.code == 2 and expected in run.err, run.err
    assert not out.exists()


# -- the range edge: continuous, and said ---------------------------------------------------------

RULE = all_rules()["underbody.diffuser-angle"]
SETTINGS = load_settings(ROOT / "mkdocs.yml")
TESSEL = load_sheet(ROOT / "vehicles/tessel/r1.yaml")
LOW, HIGH = DIFFUSER["study_range"]


def _diffuser(degrees: float, edge: float = 10.0):
    """The diffuser finding of the Tessel r1 at ``degrees``, fixed to the rule's ``edge`` [deg]."""
    sheet = replace(TESSEL, features={**TESSEL.features, "underbody.diffuser_angle": Value(math.radians(degrees))})
    context = next(ctx for rule, ctx, _ in SETTINGS.rule_plan if rule.id == RULE.id)
    context = replace(context, thresholds={**context.thresholds, "edge": math.radians(edge)})
    return run_rule(RULE, sheet, context, RULE.severity, SETTINGS.calibrated)


def test_the_estimate_is_continuous_at_the_upper_edge_of_the_study():
    below, above = _diffuser(HIGH - 1e-6), _diffuser(HIGH + 1e-6)
    at_edge = _costed(DIFFUSER["ci95"], HIGH - 10)  # the whole fix inside the study: team slope x move
    assert below.counts == pytest.approx(at_edge, abs=0.051)
    assert above.counts == pytest.approx(below.counts, abs=0.11)
    assert "note" not in below.calibration and "measured 15.79 deg lies outside the study's 6-15.79 deg" in \
        above.calibration["note"]
    # Further out the library's range (5-20 counts for a separated diffuser) carries the share beyond the edge.
    far = _diffuser(25.0)
    share = (25 - HIGH) / (25 - 10)
    expected = [t + lib * share for t, lib in zip(sorted(b * (HIGH - 10) for b in DIFFUSER["ci95"]), (5, 20))]
    assert far.counts == pytest.approx(tuple(expected), abs=0.051)
    assert far.calibration["applied"] and "team data" in [s.kind for s in far.sources]
    assert "measured 25 deg lies outside" in far.calibration["note"] and "61% of the fix" in far.calibration["note"]


def test_the_estimate_is_continuous_at_the_lower_edge_of_the_study():
    # A team that fixes to 4 deg (below the study's 6 deg): a diffuser just under 6 deg is wholly outside.
    below, above = _diffuser(LOW - 1e-6, edge=4.0), _diffuser(LOW + 1e-6, edge=4.0)
    assert below.counts == (1.0, 5.0) and below.calibration["applied"] is False  # the rule's own 1-5 counts
    assert "lies outside the study's 6-15.79 deg: the library estimate stands" in below.calibration["note"]
    assert above.counts == pytest.approx(below.counts, abs=0.11) and above.calibration["applied"]
    assert "target 4 deg lies outside the study's" in above.calibration["note"]
    middle = _diffuser(8.0, edge=4.0)  # half the move inside the study, half below it
    expected = [t + lib * 0.5 for t, lib in zip(sorted(b * 2 for b in DIFFUSER["ci95"]), (1, 5))]
    assert middle.counts == pytest.approx(tuple(expected), abs=0.051)


# -- the check against measurement: RMSE beside R^2 -----------------------------------------------

def test_finding_and_explain_state_the_cross_validated_rmse(cli):
    linear = FITTED["cross_validation"]["linear"]
    label = (f"calibrated on {CALIBRATION} ({FITTED['study']['rows']} rows, cross-validated R^2 "
             f"{linear['cv_r2']:.2f}, RMSE {linear['cv_rmse_counts']:.1f} counts)")
    finding = _findings(cli, ROOT / "mkdocs.yml", "vehicles/tessel/r1.yaml")["underbody.diffuser-angle"]
    assert finding["calibration"]["label"] == label
    assert any(label in s["citation"] for s in finding["added_sources"])
    assert label in cli("explain", "underbody.diffuser-angle", "--config", ROOT / "mkdocs.yml").out


def test_the_readme_calibrate_example_is_what_the_command_prints(cli, monkeypatch):
    """The README's console block: the command as written, then its warnings and its table as printed."""
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    block = re.search(r"```console\n(\$ aeroreview calibrate .*?)```", readme, re.S).group(1)
    lines = block.splitlines(keepends=True)
    ends = next(i for i, line in enumerate(lines) if not line.rstrip().endswith("\\"))  # the command's last line
    args = shlex.split("".join(lines[:ends + 1]).replace("\\\n", " "))
    shown = "".join(lines[ends + 1:])
    monkeypatch.chdir(ROOT)  # the example runs from the repository root
    run = cli(*args[2:])
    assert run.code == 0 and shown == run.err + run.out  # warnings (stderr) come before the table


def test_reach_lists_the_recosted_revisions_and_declared_vehicles_without_a_sheet():
    from aeroreview.calibration import reach
    from aeroreview.review import review_sheet
    from aeroreview.sheet import load_fleet

    reviews = [review_sheet(sheet, SETTINGS) for sheet in load_fleet([ROOT / "vehicles"]).sheets]
    (cal,) = SETTINGS.calibrations
    recosted, unknown = reach(cal, reviews)
    # The Tessel r1 (the problem revision) has the calibrated features outside the rules' limits; the
    # Quillon and the Dravik are not in the calibration's scope.
    assert {review.sheet.label for review, _ in recosted} == {"tessel@r1"} and unknown == []
    assert {"rear.backlight-angle", "underbody.diffuser-angle"} <= set(recosted[0][1])
    _, unknown = reach(replace(cal, vehicles=("tessel", "tesel")), reviews)
    assert unknown == ["tesel"]


def test_a_calibration_without_its_cross_validated_rmse_is_refused_located(cli, tmp_path):
    text = (ROOT / CALIBRATION).read_text()
    spoiled = re.sub(r"linear: \{cv_r2: ([0-9.]+), cv_rmse_counts: [0-9.]+\}", r"linear: {cv_r2: \1}", text)
    assert spoiled != text
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config", _knowledge_base(tmp_path, CALIBRATION, spoiled))
    line = next(i for i, l in enumerate(spoiled.splitlines(), 1) if l.strip().startswith("linear:"))
    assert run.code == 2 and re.search(rf"{CALIBRATION}:{line}:\d+: calibration 'cross_validation.linear.cv_rmse_counts' "
                                       "is missing", run.err), run.err
