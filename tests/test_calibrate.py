"""Calibration: the rules' sensitivities, fitting a parametric study, and using the result.

External references: NIST StRD (Longley data, certified values), the Ahmed-body curve
(SAE 840300), Hucho 1998 (tyre width), and synthetic studies with known truth.
"""

from __future__ import annotations

import json
import re

import numpy as np
import yaml

import pytest

from aeroreview.calc.references import ahmed_cd
from aeroreview.catalogue import BY_KEY
from aeroreview.rules import all_rules
from aeroreview.units import to_si

SENSITIVE = {rule.id: rule for rule in all_rules().values() if rule.sensitivity}


def test_rules_declare_sensitivities_in_their_features_units_and_ranges():
    assert {"underbody.diffuser-angle", "rear.backlight-angle", "wheels.rim-openness"} <= set(SENSITIVE)
    for rule in SENSITIVE.values():
        sens = rule.sensitivity
        feature = BY_KEY[sens.feature]
        to_si(f"1 {sens.unit}", feature.unit)  # raises UnitProblem on a unit of another dimension
        low, high = (to_si(v, sens.unit) for v in sens.valid)
        bounds = [to_si(v, feature.unit) for v in feature.bounds]
        assert bounds[0] <= low < high <= bounds[1], rule.id
        assert low <= rule.defaults()[sens.fix_to] <= high, f"{rule.id}: the fix target lies outside the valid range"
        assert sens.source.kind in ("published", "standard", "common practice", "from memory")


def test_backlight_sensitivity_follows_the_ahmed_curve_slope():
    # Ahmed, Ramm and Faltin 1984 (SAE 840300): attached-branch slope from 20 to 28 deg, scaled by
    # the rule's production-body factor 0.2-0.6.
    slope = float(ahmed_cd(28.0) - ahmed_cd(20.0)) / 8 * 1000
    value = SENSITIVE["rear.backlight-angle"].sensitivity.counts_per_unit
    assert 0.2 * slope <= value <= 0.6 * slope


def test_rules_json_lists_the_sensitivities(cli):
    run = cli("rules", "--format", "json")
    listed = {r["id"]: r["sensitivity"] for r in json.loads(run.out)}
    assert listed["underbody.diffuser-angle"]["unit"] == "deg"
    assert listed["underbody.diffuser-angle"]["counts_per_unit"] == pytest.approx(2.0)
    assert listed["underbody.diffuser-angle"]["source"]["kind"] == "from memory"
    assert listed["sides.door-handles"] is None
    assert "Sensitivity: +3.2 counts per deg" in cli("explain", "rear.backlight-angle").out


# -- fitting: synthetic studies with known truth, and NIST StRD ------------------------------------

from aeroreview.calibrate import agreement, fit_study, ols, rows_needed  # noqa: E402
from aeroreview.study import Mapping, Study  # noqa: E402

TRUE_SLOPES = (2.0, -1.5, 0.4)  # counts per deg, per deg, per %
FEATURES = (("diffuser", "underbody.diffuser_angle", "deg"), ("taper", "rear.side_taper_angle", "deg"),
            ("rim", "wheels.rim_openness", "%"))


def synthetic(seed: int, rows: int = 30, noise: float = 1.0, curvature: float = 0.0) -> Study:
    """A study with known slopes and Gaussian noise of ``noise`` counts."""
    rng = np.random.default_rng(seed)
    x = np.column_stack([rng.uniform(6, 16, rows), rng.uniform(0, 12, rows), rng.uniform(15, 50, rows)])
    y = 280 + x @ np.array(TRUE_SLOPES) + curvature * (x[:, 0] - 11) ** 2 + rng.normal(0, noise, rows)
    return Study("synthetic.csv", "0" * 64, [Mapping(*f) for f in FEATURES], "Cd", x, y, list(range(2, rows + 2)),
                 [], [], True, 1, {f[0]: 1 for f in FEATURES})


def test_95_percent_intervals_cover_the_true_slope_in_90_to_99_percent_of_200_studies():
    covered = np.zeros(len(TRUE_SLOPES))
    for seed in range(200):
        fit = fit_study(synthetic(seed), "linear", 5)
        covered += [s.ci95[0] <= true <= s.ci95[1] for s, true in zip(fit.slopes, TRUE_SLOPES)]
    share = covered / 200
    assert np.all((share >= 0.90) & (share <= 0.99)), share


def test_quadratic_model_recovers_a_known_curvature_and_predicts_better():
    fit = fit_study(synthetic(7, rows=80, noise=0.5, curvature=0.8), "both", 5)
    linear, quadratic = fit.surfaces["linear"], fit.surfaces["quadratic"]
    assert quadratic.cv_r2 > linear.cv_r2 + 0.05
    assert quadratic.cv_rmse_counts < linear.cv_rmse_counts
    # d/dx of 0.8 (x - 11)^2 at the study's centre (about 11 deg) is about 0; the slope there is the true 2.0.
    centre = (fit.study.x[:, 0].min() + fit.study.x[:, 0].max()) / 2
    assert fit.slopes[0].quadratic_slope_at_centre == pytest.approx(2.0 + 1.6 * (centre - 11), abs=0.15)


def test_without_curvature_the_quadratic_model_adds_nothing():
    fit = fit_study(synthetic(3, rows=80), "both", 5)
    assert fit.surfaces["quadratic"].cv_r2 <= fit.surfaces["linear"].cv_r2 + 0.01


# NIST StRD, Longley (1967) data, "higher difficulty" linear regression: certified values from
# https://www.itl.nist.gov/div898/strd/lls/data/Longley.shtml (intercept first, then x1..x6).
LONGLEY_B = (-3482258.63459582, 15.0618722713733, -0.358191792925910e-01, -2.02022980381683,
             -1.03322686717359, -0.511041056535807e-01, 1829.15146461355)
LONGLEY_SE = (890420.383607373, 84.9149257747669, 0.334910077722432e-01, 0.488399681651699,
              0.214274163161675, 0.226073200069370, 455.478499142212)
LONGLEY_RESIDUAL_SD = 304.854073561965
LONGLEY_R2 = 0.995479004577296


def test_fitting_path_reproduces_nist_strd_longley_certified_values():
    from statsmodels.datasets import longley

    data = longley.load_pandas()
    result = ols(data.exog.to_numpy(dtype=float), data.endog.to_numpy(dtype=float))
    # NIST certifies 15 digits; a double-precision solver on this ill-conditioned problem keeps
    # about 11 (measured: coefficients 1.3e-11, standard errors 4e-13 relative).
    assert result.params == pytest.approx(LONGLEY_B, rel=1e-10)
    assert result.bse == pytest.approx(LONGLEY_SE, rel=1e-10)
    assert np.sqrt(result.scale) == pytest.approx(LONGLEY_RESIDUAL_SD, rel=1e-10)
    assert result.rsquared == pytest.approx(LONGLEY_R2, rel=1e-12)


def test_agreement_verdicts():
    assert agreement(2.0, 1.9, (1.5, 2.3)) == "agrees"
    assert agreement(2.0, 1.0, (0.5, 1.5)) == "differs in size"
    assert agreement(2.0, -1.0, (-1.5, -0.5)) == "opposite sign"
    assert agreement(2.0, -0.2, (-1.0, 0.6)) == "differs in size"  # the data cannot tell the sign
    assert agreement(None, 1.0, (0.5, 1.5)) == "library silent"


def test_rows_needed_leaves_every_training_fold_a_residual():
    assert rows_needed(3, "linear", 5) == 7  # 4 coefficients and a residual: 5-fold splits of 7 train on 5
    assert rows_needed(3, "quadratic", 5) == 14  # 10 coefficients and a residual: trains on 11 of 14


# -- the command line: bad input, each located, exit 2 -----------------------------------------------

GOOD_MAPS = ("--map", "diffuser=underbody.diffuser_angle:deg", "--map", "taper=rear.side_taper_angle",
             "--map", "rim=wheels.rim_openness:%")


def write_study(folder, rows: int = 24, seed: int = 1, edit=None) -> str:
    """A CSV study (comment lines, a run id column) with known slopes; ``edit(lines)`` spoils it."""
    study = synthetic(seed, rows)
    lines = ["# invented test study", "run,diffuser,taper,rim,Cd"]
    lines += [f"{i + 1},{d:.3f},{t:.3f},{r:.2f},{cd / 1000:.6f}" for i, (d, t, r, cd) in
              enumerate(zip(*study.x.T, study.y))]
    if edit:
        edit(lines)
    path = folder / "study.csv"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return str(path)


def test_calibrate_reports_and_writes_a_calibration(cli, tmp_path):
    study = write_study(tmp_path)
    run = cli("calibrate", study, *GOOD_MAPS, "--json", "--vehicle", "tessel", "--output", tmp_path / "cal.yaml")
    assert run.code == 0, run.err
    data = json.loads(run.out)
    assert set(data) >= {"response", "rows", "dropped_rows", "ignored_columns", "models", "sensitivities"}
    assert data["rows"] == 24 and data["ignored_columns"] == ["run"] and data["response"] == "Cd"
    assert set(data["models"]) == {"linear", "quadratic"}
    first = data["sensitivities"][0]
    assert set(first) >= {"column", "feature", "unit", "counts_per_unit", "ci95", "p_value",
                          "library_counts_per_unit", "library_rule", "agreement"}
    assert first["ci95"][0] <= 2.0 <= first["ci95"][1]  # the true slope of the synthetic study
    assert first["agreement"] == "agrees" and first["library_rule"] == "underbody.diffuser-angle"
    text = (tmp_path / "cal.yaml").read_text()
    assert "sha256: " in text and "study.csv" in text and "cv_r2" in text and "date:" in text
    assert "vehicles: [tessel]" in text  # the vehicle the study is of: whose findings it re-costs
    # The file keeps the figures to the digits the report shows, so a page shows the same R^2 and RMSE.
    shown = cli("calibrate", study, *GOOD_MAPS).out
    for name, model in yaml.safe_load(text)["cross_validation"].items():
        if isinstance(model, dict):
            assert f"{name} R^2 {model['cv_r2']:.3f}, RMSE {model['cv_rmse_counts']:.2f} counts" in shown


def test_output_never_overwrites(cli, tmp_path):
    study = write_study(tmp_path)
    target = tmp_path / "cal.yaml"
    target.write_text("mine\n")
    run = cli("calibrate", study, *GOOD_MAPS, "--vehicle", "tessel", "--output", target)
    assert run.code == 2 and "already exists; refusing to overwrite" in run.err
    assert target.read_text() == "mine\n"


def _replace_cell(row: int, column: int, text: str):
    def edit(lines):
        cells = lines[row].split(",")
        cells[column] = text
        lines[row] = ",".join(cells)
    return edit


@pytest.mark.parametrize("maps, edit, expected", [
    (("--map", "difuser=underbody.diffuser_angle"), None,
     r"study.csv:2:1: --map difuser=underbody.diffuser_angle: no column 'difuser' in the study; did you mean 'diffuser'"),
    (("--map", "diffuser=underbody.difuser_angle"), None,
     r"study.csv:2:5: --map diffuser=underbody.difuser_angle: unknown feature 'underbody.difuser_angle'; "
     r"did you mean 'underbody.diffuser_angle'"),
    (("--map", "diffuser=underbody.diffuser_angle:mm"), None,
     r"study.csv:2:5: .*'mm' is not a unit of angle"),
    (GOOD_MAPS, _replace_cell(5, 2, "n/a?"), r"study.csv:6:\d+: cell 'n/a\?' in column 'taper' is not a finite number"),
    (GOOD_MAPS, _replace_cell(7, 4, "31.5"), r"study.csv:8:\d+: Cd = 31.5 is outside the physical bounds 0.05 to 2"),
])
def test_bad_input_is_located(cli, tmp_path, maps, edit, expected):
    run = cli("calibrate", write_study(tmp_path, edit=edit), *maps)
    assert run.code == 2
    assert re.search(expected, run.err), run.err
    assert "Traceback" not in run.err


def test_constant_column_is_refused(cli, tmp_path):
    def constant(lines):
        for i in range(2, len(lines)):
            cells = lines[i].split(",")
            cells[2] = "5"
            lines[i] = ",".join(cells)
    run = cli("calibrate", write_study(tmp_path, edit=constant), *GOOD_MAPS)
    assert run.code == 2 and re.search(r"study.csv:2:\d+: column 'taper' is constant \(5 deg in every row\)", run.err)


def test_too_few_rows_says_how_many_are_needed(cli, tmp_path):
    run = cli("calibrate", write_study(tmp_path, rows=10), *GOOD_MAPS)
    assert run.code == 2
    assert "study.csv:2:1: 10 usable rows are too few for the quadratic model" in run.err
    assert "it needs at least 14 rows" in run.err
    assert cli("calibrate", write_study(tmp_path, rows=10), *GOOD_MAPS, "--model", "linear").code == 0


def test_collinear_columns_are_refused_and_near_collinear_warned(cli, tmp_path):
    def twin(lines, wobble=0.0):
        for i in range(2, len(lines)):
            cells = lines[i].split(",")
            cells[2] = f"{float(cells[1]) * 0.5 + 1 + wobble * ((i % 3) - 1):.4f}"  # taper = diffuser / 2 + 1
            lines[i] = ",".join(cells)
    run = cli("calibrate", write_study(tmp_path, edit=twin), *GOOD_MAPS)
    assert run.code == 2
    assert re.search(r"study.csv:2:\d+: column 'taper' is a linear combination of 'diffuser': perfectly collinear",
                     run.err)
    run = cli("calibrate", write_study(tmp_path, edit=lambda lines: twin(lines, 0.05)), *GOOD_MAPS)
    assert run.code == 0
    assert re.search(r"study.csv:2:1: warning: the mapped parameters are nearly collinear \(condition number \d+",
                     run.err)


def test_rows_with_missing_values_are_dropped_counted_and_reported(cli, tmp_path):
    def holes(lines):
        _replace_cell(4, 3, "")(lines)
        _replace_cell(9, 4, "")(lines)
    run = cli("calibrate", write_study(tmp_path, edit=holes), *GOOD_MAPS, "--json")
    assert run.code == 0
    assert json.loads(run.out)["rows"] == 22 and json.loads(run.out)["dropped_rows"] == 2
    assert "study.csv:5:1: warning: dropped 2 row(s) with missing values (lines 5, 10)" in run.err


def test_whitespace_table_with_comments_reads_like_the_csv(cli, tmp_path):
    study = write_study(tmp_path)
    csv_run = cli("calibrate", study, *GOOD_MAPS, "--json")
    lines = (tmp_path / "study.csv").read_text().splitlines()
    spaced = tmp_path / "study.dat"
    spaced.write_text("\n".join(["# tunnel sweep, invented", ""] + [line.replace(",", "   ") + "  # ok"
                                                                    for line in lines[1:]]) + "\n")
    dat_run = cli("calibrate", spaced, *GOOD_MAPS, "--json")
    assert dat_run.code == 0, dat_run.err
    assert json.loads(dat_run.out)["sensitivities"] == json.loads(csv_run.out)["sensitivities"]


def test_missing_response_and_bad_options(cli, tmp_path):
    study = write_study(tmp_path)
    run = cli("calibrate", study, *GOOD_MAPS, "--response", "CD_total")
    assert run.code == 2 and "study.csv:2:1: no response column 'CD_total' in the study" in run.err
    assert cli("calibrate", study, *GOOD_MAPS, "--folds", "1").code == 2
    assert cli("calibrate", study, "--map", "diffuser").code == 2
    assert cli("calibrate", tmp_path / "absent.csv", *GOOD_MAPS).code == 2


# -- using a calibration: the demo settings ---------------------------------------------------------

from conftest import ROOT  # noqa: E402

DEMO_CONFIG = ROOT / "mkdocs.yml"
DEMO_CALIBRATION = "studies/tessel/rear-doe.calibration.yaml"


def _check(cli, config, sheet="vehicles/tessel/r1.yaml"):
    run = cli("check", ROOT / sheet, "--config", config, "--format", "json")
    return run, {f["rule"]: f for f in json.loads(run.out)["sheets"][0]["findings"]}


def _config_without_calibrations(tmp_path):
    text = DEMO_CONFIG.read_text().replace(f"calibrations: [{DEMO_CALIBRATION}]", "calibrations: []")
    assert text != DEMO_CONFIG.read_text()
    config = tmp_path / "mkdocs.yml"
    config.write_text(text)
    return config


def test_demo_calibration_recosts_the_calibrated_findings_as_team_data(cli, tmp_path):
    calibrated_run, calibrated = _check(cli, DEMO_CONFIG)
    plain_run, plain = _check(cli, _config_without_calibrations(tmp_path))
    assert calibrated_run.code == plain_run.code == 1  # the problem revision still fails the gate
    changed = [rule for rule, f in calibrated.items() if f["calibration"] and f["calibration"]["applied"]]
    assert {"rear.backlight-angle", "underbody.diffuser-angle"} <= set(changed)
    for rule in changed:
        finding = calibrated[rule]
        assert finding["status"] == plain[rule]["status"]
        assert "team data" in [s["kind"] for s in finding["added_sources"]]
        assert plain[rule]["added_sources"] == []
        assert finding["calibration"]["library_counts"] == [plain[rule]["estimate"]["cd_counts_low"],
                                                            plain[rule]["estimate"]["cd_counts_high"]]
    # The diffuser fix takes 15 deg to the 10 deg edge; the study's slope and interval cost it.
    diffuser = calibrated["underbody.diffuser-angle"]
    low, high = diffuser["calibration"]["ci95"]
    assert diffuser["estimate"]["cd_counts_low"] == pytest.approx(5 * low, abs=0.06)
    assert diffuser["estimate"]["cd_counts_high"] == pytest.approx(5 * high, abs=0.06)
    assert (diffuser["estimate"]["cd_counts_low"], diffuser["estimate"]["cd_counts_high"]) != (5.0, 20.0)
    # Findings of rules without a calibrated feature are identical.
    for rule, finding in plain.items():
        if rule not in changed:
            assert calibrated[rule] == finding
    text = cli("check", ROOT / "vehicles/tessel/r1.yaml", "--config", DEMO_CONFIG).out
    assert f"(team data: calibrated on {DEMO_CALIBRATION} (47 rows, cross-validated R^2 0.97, RMSE 1.8 counts))" in text


def test_clean_demo_revision_stays_clean_with_the_calibration(cli):
    run, _ = _check(cli, DEMO_CONFIG, "vehicles/tessel/r2.yaml")
    assert run.code == 0


def test_a_calibrated_feature_no_rule_uses_is_library_silent_and_reported(cli, tmp_path):
    def add_tyre_width(lines):
        lines[1] += ",tyre"
        for i in range(2, len(lines)):
            lines[i] += f",{215 + (i * 7) % 40}"
    study = write_study(tmp_path, edit=add_tyre_width)
    run = cli("calibrate", study, *GOOD_MAPS, "--map", "tyre=wheels.tyre_width", "--json", "--vehicle", "tessel",
              "--output", tmp_path / "cal.yaml")
    assert run.code == 0, run.err
    assert json.loads(run.out)["sensitivities"][-1]["agreement"] == "library silent"
    (tmp_path / "mkdocs.yml").write_text("site_name: t\nplugins:\n  - aeroreview:\n      calibrations: [cal.yaml]\n")
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config", tmp_path / "mkdocs.yml")
    assert run.code == 0
    assert "cal.yaml:1:1: warning: no rule states a sensitivity for wheels.tyre_width (column 'tyre')" in run.err


@pytest.mark.parametrize("entry, expected", [
    ("../outside.yaml", "calibration path '../outside.yaml' leaves the knowledge base"),
    ("studies/absent.yaml", "calibration 'studies/absent.yaml' does not exist"),
])
def test_settings_refuse_calibrations_outside_the_knowledge_base_or_missing(cli, tmp_path, entry, expected):
    (tmp_path / "outside.yaml").write_text("calibration: 1\n")
    root = tmp_path / "kb"
    root.mkdir()
    (root / "mkdocs.yml").write_text(f"site_name: t\nplugins:\n  - aeroreview:\n      calibrations: [{entry}]\n")
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config", root / "mkdocs.yml")
    assert run.code == 2 and re.search(rf"mkdocs.yml:4:\d+: .*{re.escape(expected)}", run.err), run.err


def test_a_damaged_calibration_is_a_located_error(cli, tmp_path):
    text = (ROOT / DEMO_CALIBRATION).read_text().replace("counts_per_unit: ", "counts_per_unit: x", 1)
    (tmp_path / "cal.yaml").write_text(text)
    (tmp_path / "mkdocs.yml").write_text("site_name: t\nplugins:\n  - aeroreview:\n      calibrations: [cal.yaml]\n")
    run = cli("check", ROOT / "vehicles/tessel/r2.yaml", "--config", tmp_path / "mkdocs.yml")
    line = next(i for i, l in enumerate(text.splitlines(), 1) if "counts_per_unit: x" in l)
    assert run.code == 2 and f"cal.yaml:{line}:" in run.err and "counts_per_unit" in run.err, run.err
