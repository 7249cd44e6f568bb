"""The result of record and the statistics a sheet keeps: `results history` and the sheet's
data.convergence finding give one verdict; `results yaw --sheet` merges like history and
surface (the file is diffed); a sheet marks at most one result of record, and the track
record compares results of record. Thresholds and their sources: rules/result_quality.py."""

from __future__ import annotations

import difflib
import shutil

import numpy as np
import pytest

from aeroreview.review import review_sheet
from aeroreview.settings import Settings, load_settings
from aeroreview.sheet import load_fleet, load_sheet
from aeroreview.track_record import pairs
from conftest import VEHICLES
from test_results_history import ar1, write_history


@pytest.fixture
def tessel(tmp_path):
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    return folder


def finding(sheet_path, rule_id, settings=None):
    review = review_sheet(load_sheet(sheet_path), settings or Settings())
    return next(f for f in review.findings if f.rule.id == rule_id)


def noisy_history(path, sigma: float):
    """6000 iterations of stationary AR(1) noise (phi 0.9) about Cd 0.232: the standard error of the mean is
    about sigma / (1 - phi) / sqrt(n) (Box, Jenkins & Reinsel), 0.14 sigma over 5000 settled rows."""
    steps = np.arange(1, 6001)
    return write_history(path, steps, {"Cd": 0.232 + ar1(6000, 0.9, sigma, np.random.default_rng(3))})


@pytest.mark.parametrize("sigma, verdict, status", [(0.001, "converged", "pass"), (0.006, "not converged", "warning")])
def test_history_verdict_and_sheet_finding_agree(tessel, cli, sigma, verdict, status):
    """The standard-error threshold (0.5 counts on Cd, rules/result_quality.py): about 0.14 counts passes
    both as printed and as the sheet's finding, about 0.85 counts fails both."""
    path = noisy_history(tessel / "cfd" / "run.dat", sigma)
    run = cli("results", "history", path, "--sheet", tessel / "r2.yaml")
    assert run.code == 0 and f"verdict: {verdict}" in run.out
    assert finding(tessel / "r2.yaml", "data.convergence").status == status


def test_a_team_threshold_moves_both(tessel, cli, tmp_path):
    """A team that accepts 1.5 counts of standard error gets `converged` from both the command and the check."""
    config = tmp_path / "mkdocs.yml"
    config.write_text("site_name: x\nplugins:\n  - aeroreview:\n      rules:\n        data.convergence:\n"
                      "          thresholds: {std_error: 0.0015}\n", encoding="utf-8")
    path = noisy_history(tessel / "cfd" / "run.dat", 0.006)
    run = cli("results", "history", path, "--sheet", tessel / "r2.yaml", "--config", config)
    assert run.code == 0 and "verdict: converged" in run.out
    assert finding(tessel / "r2.yaml", "data.convergence", load_settings(config)).status == "pass"
    assert finding(tessel / "r2.yaml", "data.convergence").status == "warning"  # the default threshold


def test_yaw_merge_changes_no_other_line(tessel, cli):
    """A tunnel yaw table merged into r2: one entry added at the end of results, every other line kept."""
    sheet = tessel / "r2.yaml"
    table = tessel / "cfd" / "yaw.csv"
    table.write_text("# invented tunnel sweep\nyaw,cd,cl_front,cl_rear\n-10,0.262,0.07,0.13\n0,0.236,0.02,0.05\n"
                     "5,0.241,0.04,0.07\n10,0.263,0.07,0.13\n", encoding="utf-8")
    before = sheet.read_text(encoding="utf-8")
    run = cli("results", "yaw", table, "--speed", "140", "--sheet", sheet)
    assert run.code == 0 and "added results[3]" in run.err
    after = sheet.read_text(encoding="utf-8")
    changes = [line for line in difflib.ndiff(before.splitlines(), after.splitlines()) if line[:2] in ("- ", "+ ")]
    assert changes and all(line.startswith("+ ") for line in changes)
    head = before.split("\nnotes:", 1)[0]
    assert after.startswith(head) and after.endswith(before[len(head):])  # inserted in place, nothing else moved
    result = load_sheet(sheet).results[-1]
    assert (result.kind, result.cd, result.speed) == ("tunnel", 0.236, pytest.approx(140 / 3.6))
    assert [round(np.degrees(p.yaw)) for p in result.yaw_sweep] == [-10, 0, 5, 10]
    assert [f[2] for f in result.files] == ["yaw"] and len(result.files[0][1]) == 64
    assert cli("results", "yaw", table, "--speed", "140", "--sheet", sheet).code == 0
    assert sheet.read_text(encoding="utf-8") == after  # the same file updates its own entry


def test_yaw_bad_input_writes_nothing(tessel, cli):
    sheet = tessel / "r2.yaml"
    (tessel / "cfd" / "yaw.csv").write_text("yaw,cd\n0,0.3\n0,0.31\n", encoding="utf-8")
    before = sheet.read_bytes()
    run = cli("results", "yaw", tessel / "cfd" / "yaw.csv", "--sheet", sheet)
    assert run.code == 2 and "appears twice" in run.err and sheet.read_bytes() == before


def test_two_results_of_record_are_refused_where_the_second_stands(tessel, cli):
    sheet = tessel / "r1.yaml"
    text = sheet.read_text(encoding="utf-8")
    marked = text.replace("    label: surface tessel-r1-surface.vtu\n", "    label: surface tessel-r1-surface.vtu\n"
                          "    of_record: true\n")
    sheet.write_text(marked, encoding="utf-8")
    line = marked.splitlines().index("    of_record: true", marked.splitlines().index("    of_record: true") + 1) + 1
    run = cli("check", sheet)
    assert run.code == 2 and f"r1.yaml:{line}:" in run.err and "already the result of record" in run.err


def test_statistics_without_their_rows_are_refused(tessel, cli):
    sheet = tessel / "r2.yaml"
    sheet.write_text(sheet.read_text(encoding="utf-8").replace("    history_rows: 6000\n", ""), encoding="utf-8")
    run = cli("check", sheet)
    assert run.code == 2 and "need history_rows too" in run.err


def test_the_demo_track_record_compares_the_results_of_record():
    """Tessel r1 marks its history CFD (0.301) of record, r2 its own (0.232): the pair measures -69 counts,
    not the first-listed CFD's -57."""
    fleet = load_fleet([VEHICLES / "tessel"])
    (pair,) = pairs([review_sheet(s, Settings()) for s in fleet.sheets])
    assert (pair.kind, pair.parent_cd, pair.child_cd) == ("cfd", 0.301, 0.232)
    assert pair.measured == pytest.approx(-69.0)


def _two_sweeps(marked: str):
    """Tessel r2 with a tunnel sweep whose drag rises 30 % over 10 deg and a CFD sweep that rises 8 %
    (the stability.yaw-drag-rise examples), ``marked`` being the result of record."""
    from test_rule_examples import sheet_with

    steep = "[{yaw: 0 deg, cd: 0.2320}, {yaw: 10 deg, cd: 0.3016}, {yaw: -10 deg, cd: 0.3016}]"
    mild = "[{yaw: 0 deg, cd: 0.2320}, {yaw: 10 deg, cd: 0.2506}, {yaw: -10 deg, cd: 0.2506}]"
    result = "{{kind: {kind}, label: {kind} sweep, speed: 140 km/h, cd: 0.232, cl_front: 0.02, cl_rear: 0.04, " \
             "of_record: {mark}, yaw_sweep: {sweep}}}"
    return sheet_with("{results: [" + result.format(kind="tunnel", mark=str(marked == "tunnel").lower(), sweep=steep)
                      + ", " + result.format(kind="cfd", mark=str(marked == "cfd").lower(), sweep=mild) + "]}")


@pytest.mark.parametrize("marked, status", [("cfd", "pass"), ("tunnel", "warning")])
def test_the_yaw_rules_and_the_figure_read_the_sweep_of_record(marked, status):
    """Before, the yaw rules averaged every result's sweep (a 19 % rise that neither result has) and the
    figure drew the first; the thresholds (15 % and 25 %) are the rule's, rules/crosswind.py."""
    from aeroreview.digest import yaw_sweep

    review = review_sheet(_two_sweeps(marked), Settings())
    rise = next(f for f in review.findings if f.rule.id == "stability.yaw-drag-rise")
    assert rise.status == status, rise.verdict.measured
    assert yaw_sweep(review, 100 / 3.6).label == f"{marked} sweep"


def test_a_yaw_table_with_moments_feeds_the_yawing_moment_rule(tessel, cli):
    """Side force and yawing moment columns reach the sheet (they were dropped before, so the
    stability.yaw-moment rule could never read a merged sweep). A rise of cym of 0.05 from 0 to 10 deg
    is inside the usual 0.04-0.06 (the rule's source, rules/crosswind.py): it passes."""
    sheet = tessel / "r1.yaml"  # no sweep of its own
    table = tessel / "cfd" / "yaw.csv"
    table.write_text("# invented tunnel sweep\nyaw,cd,cs,cym\n-10,0.262,-0.40,-0.050\n0,0.236,0.0,0.0\n"
                     "5,0.241,0.20,0.025\n10,0.263,0.40,0.050\n", encoding="utf-8")
    assert cli("results", "yaw", table, "--speed", "140", "--sheet", sheet).code == 0
    points = load_sheet(sheet).results[-1].yaw_sweep
    assert [(p.cs, p.cym) for p in points] == [(-0.40, -0.050), (0.0, 0.0), (0.20, 0.025), (0.40, 0.050)]
    moment = finding(sheet, "stability.yaw-moment")
    assert moment.status == "pass" and "0.050" in moment.verdict.measured, moment.verdict.measured
