"""What a first-time reviewer meets in daily use: calc arguments, templates, hints, init."""

from __future__ import annotations

import json

import numpy as np
import pytest
from conftest import MINIMAL

MINIMAL_WITH_WAIVER = MINIMAL + "waivers:\n  - {{rule: {rule}, reason: accepted for the demo}}\n"


def test_wind_averaged_takes_negative_yaw_as_written(cli):
    """A two-sided sweep written from -20 deg gives the SAE J1252 hand-worked value.

    Cd = 0.30 + 0.0004 psi_deg^2 at V = 100 km/h and the J1252 wind of 3.129 m/s averages to
    0.31214 to second order in w/V (derivation in test_calc_cycles_wind_refs.py).
    """
    angles = np.arange(-20.0, 20.01, 0.5)
    sweep = ",".join(f"{a:g}:{0.30 + 0.0004 * a * a:.6f}" for a in angles)
    run = cli("calc", "wind-averaged", "--speed", "100", "--yaw", sweep, "--json")
    assert run.code == 0, run.err
    assert json.loads(run.out)["cd_wind_averaged"] == pytest.approx(0.31214, abs=2e-4)
    plain = cli("calc", "wind-averaged", "--speed", "100", "--yaw", "-10:0.35,0:0.30,10:0.35")
    assert plain.code == 0 and "wind-averaged Cd" in plain.out, plain.err


def test_missing_parent_hint_names_revisions_not_the_schema(cli, write_sheet):
    write_sheet(MINIMAL, "car/r1.yaml")
    path = write_sheet(MINIMAL.replace("revision: r1\n", "revision: r3\nparent: r2\n"), "car/r3.yaml")
    run = cli("check", path)
    line = next(line for line in run.err.splitlines() if "parent revision 'r2'" in line)
    assert "aeroreview schema" not in line and "known revisions: r1, r3" in line, line
    alone = write_sheet(MINIMAL.replace("revision: r1\n", "revision: r2\nparent: r0\n"), "solo/r2.yaml")
    line = next(line for line in cli("check", alone).err.splitlines() if "parent revision" in line)
    assert "aeroreview schema" not in line and "no other revision of test-car" in line, line


def test_mistyped_waiver_rule_points_to_the_rule_list(cli, write_sheet):
    path = write_sheet(MINIMAL_WITH_WAIVER.format(rule="zz.nothing-like-it"))
    run = cli("check", path)
    assert run.code == 2 and "see `aeroreview rules`" in run.err and "aeroreview schema" not in run.err


def test_no_recoverable_totals_note_without_a_reviewed_revision(cli, write_sheet):
    path = write_sheet("id: x\nrevision: r1\nfeatures: {}\n")
    run = cli("check", path)
    assert run.code == 2 and "0 revision(s) reviewed" in run.out
    assert "recoverable" not in run.out


def test_every_stage_reports_in_one_run(cli, write_sheet):
    """Feature errors, an unknown waiver, a placeholder and a missing parent, all in the first run."""
    text = (MINIMAL.replace("revision: r1\n", "revision: r2\nparent: r0\nname: <display name>\n")
            + "  rear.backlight_angle: 27 mm\n  wheels.rim_openness: 2\n"
            + "waivers:\n  - {rule: rear.backlite-angle, reason: styling freeze}\n")
    path = write_sheet(text)
    run = cli("check", path)
    assert run.code == 2
    messages = [line for line in run.err.splitlines() if line.startswith(f"{path}:")]
    for expected in ("parent revision 'r0'", "template placeholder", "rear.backlight_angle",
                     "wheels.rim_openness", "waiver for unknown rule 'rear.backlite-angle'"):
        assert any(expected in m for m in messages), (expected, run.err)
    assert "did you mean 'rear.backlight-angle'?" in run.err


def test_a_broken_sheet_still_counts_for_the_fleet_checks(cli, write_sheet):
    """A duplicate revision is reported even when one copy also has a feature error."""
    first = write_sheet(MINIMAL, "a.yaml")
    write_sheet(MINIMAL + "  wheels.rim_openness: 2\n", "b.yaml")
    run = cli("check", first.parent)
    assert "test-car@r1 is defined twice" in run.err and "wheels.rim_openness" in run.err
