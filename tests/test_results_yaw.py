"""Yaw tables: the sweep as read, and SAE J1252's wind-averaged Cd against its closed form."""

from __future__ import annotations

import json

import pytest

from aeroreview.calc.wind import J1252_WIND_SPEED


def test_yaw_table_to_sweep_and_wind_average(tmp_path, cli):
    """A yaw-independent Cd averages to Cd (1 + w^2 / V^2) over all wind directions (SAE J1252, with the
    derivation in aeroreview.calc.wind); here 0.30 at 100 km/h in the J1252 wind of 7 mph."""
    table = tmp_path / "yaw.csv"
    table.write_text("# invented tunnel sweep\nYaw (deg),Cd,Cl_front,Cl_rear\n10,0.30,0.05,0.09\n-10,0.30,0.05,0.08\n"
                     "0,0.30,0.03,0.06\n5,0.30,0.04,0.07\n")
    run = cli("results", "yaw", table, "--speed", "100", "--json")
    data = json.loads(run.out)
    assert run.code == 0 and [p["yaw"] for p in data["yaw_sweep"]] == [-10, 0, 5, 10]
    assert data["yaw_sweep"][0] == {"yaw": -10, "cd": 0.30, "cl_front": 0.05, "cl_rear": 0.08}
    speed = 100 / 3.6
    assert data["cd_wind_averaged"] == pytest.approx(0.30 * (1 + J1252_WIND_SPEED**2 / speed**2), abs=2e-5)


def test_no_speed_no_average(tmp_path, cli):
    (tmp_path / "yaw.dat").write_text("# beta cd\n0 0.25\n5 0.26\n")
    data = json.loads(cli("results", "yaw", tmp_path / "yaw.dat", "--json").out)
    assert data == {"yaw_sweep": [{"yaw": 0, "cd": 0.25}, {"yaw": 5, "cd": 0.26}]}


@pytest.mark.parametrize("text, message", [
    ("yaw,cl\n0,0.1\n", "no cd column"),
    ("yaw,cd\n0,0.3\n0,0.31\n", "a yaw angle appears twice"),
    ("yaw,cd\n0,0.3\n120,0.31\n", ":3:1: yaw 120 deg is outside"),
    ("yaw,cd\n0,300\n", "is outside 0.05 to 2"),
    ("yaw,cd\n0,0.3\n1,x\n", ":3:3: 'x' in column 'cd' is not a number"),
])
def test_bad_yaw_tables(tmp_path, cli, text, message):
    (tmp_path / "yaw.csv").write_text(text)
    run = cli("results", "yaw", tmp_path / "yaw.csv", "--speed", "100")
    assert run.code == 2 and message in run.err, run.err


def test_sweep_too_narrow_for_the_wind(tmp_path, cli):
    """At 20 km/h the J1252 wind yaws the car by up to 34 deg, beyond a +-5 deg sweep: said, exit 2."""
    (tmp_path / "yaw.csv").write_text("yaw,cd\n0,0.3\n5,0.31\n")
    run = cli("results", "yaw", tmp_path / "yaw.csv", "--speed", "20")
    assert run.code == 2 and "cannot wind-average this sweep" in run.err
