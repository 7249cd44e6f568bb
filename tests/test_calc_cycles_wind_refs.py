"""WLTC class 3b against UN GTR No. 15; SAE J1252 wind averaging against its closed form and
a hand-worked example; the Ahmed curve against its published shape."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from aeroreview.calc import references, wind
from aeroreview.calc.cycles import cycle_by_name, wltc_class3b

# UN GTR No. 15, Annex 1, class 3b: phase durations [s] and distances [m].
GTR15_PHASES = [("Low", 589, 3095), ("Medium", 433, 4756), ("High", 455, 7162), ("Extra High", 323, 8254)]


def test_wltc_3b_totals_from_gtr_15():
    cycle = wltc_class3b()
    assert len(cycle.speed) == 1801 and cycle.dt == 1.0
    assert cycle.duration == 1800
    assert cycle.distance == pytest.approx(23266, abs=0.5)
    assert float(cycle.speed.max()) * 3.6 == pytest.approx(131.3, abs=1e-9)
    # The wltp package's checksum of the class 3b trace (sum of speeds in km/h).
    assert float(cycle.speed.sum()) * 3.6 == pytest.approx(83758.6, abs=0.05)


def test_wltc_3b_phases_from_gtr_15():
    phases = wltc_class3b().phase_summary()
    assert [p["name"] for p in phases] == [name for name, _, _ in GTR15_PHASES]
    for phase, (_, duration, distance) in zip(phases, GTR15_PHASES):
        assert phase["duration_s"] == duration
        assert phase["distance_m"] == pytest.approx(distance, abs=0.5)


def test_unknown_cycle_is_refused():
    with pytest.raises(ValueError, match="unknown cycle"):
        cycle_by_name("nedc")
    assert cycle_by_name("constant-120").distance == pytest.approx(1e5)


def test_calc_cycle_command(cli):
    values = json.loads(cli("calc", "cycle", "--cycle", "wltc-3b", "--json").out)
    assert values["duration_s"] == 1800
    assert values["distance_km"] == pytest.approx(23.266, abs=5e-4)
    assert values["max_speed_km_h"] == pytest.approx(131.3)
    assert values["mean_speed_km_h"] == pytest.approx(23.266 / 0.5, abs=0.01)  # 46.5 km/h (GTR 15)
    assert [p["duration_s"] for p in values["phases"]] == [589, 433, 455, 323]


@pytest.mark.parametrize("speed_kmh, wind_speed", [(60, 3.13), (100, 3.13), (130, 5.0), (100, 0.0)])
def test_j1252_constant_cd_closed_form(speed_kmh, wind_speed):
    """For yaw-independent Cd the average is Cd (1 + w^2 / V^2).

    Derivation: V_r^2 = (V + w cos phi)^2 + (w sin phi)^2 = V^2 + 2 V w cos phi + w^2. The
    mean of cos phi over a full turn is 0, so the mean of V_r^2 / V^2 is 1 + w^2 / V^2, and
    with constant Cd the wind-averaged coefficient is Cd times that.
    """
    v = speed_kmh / 3.6
    value = wind.wind_averaged_cd(np.radians([0.0, 30.0]), [0.31, 0.31], v, wind_speed)
    assert value == pytest.approx(0.31 * (1 + wind_speed**2 / v**2), rel=1e-9)


def test_j1252_hand_worked_example():
    """Cd = 0.30 + 0.0004 psi_deg^2 (quadratic in yaw), V = 100 km/h, w = 3.12928 m/s.

    To second order in w/V: psi ~ (w/V) sin phi, so psi^2 averages (w/V)^2 / 2, and
    V_r^2/V^2 averages 1 + (w/V)^2. Hence Cd_wa ~ 0.30 (1 + (w/V)^2) + 0.0004 (180/pi)^2 (w/V)^2 / 2.
    With w/V = 0.112654: 0.30 x 1.012691 + 0.0004 x 3282.81 x 0.0063455 = 0.303807 + 0.008332 = 0.31214.
    Higher-order terms are below 1e-4 here.
    """
    angles = np.arange(0.0, 20.01, 0.25)
    value = wind.wind_averaged_cd(np.radians(angles), 0.30 + 0.0004 * angles**2, 100 / 3.6)
    assert value == pytest.approx(0.31214, abs=2e-4)


def test_j1252_sweep_must_cover_the_yaw_range():
    with pytest.raises(ValueError, match="beyond the sweep"):
        wind.wind_averaged_cd(np.radians([0.0, 2.0]), [0.30, 0.31], 50 / 3.6)


def test_calc_wind_averaged_command(cli):
    run = cli("calc", "wind-averaged", "--speed", "100", "--yaw", "0:0.30,5:0.31,10:0.335,15:0.37", "--wind", "3.1",
              "--json")
    value = json.loads(run.out)["cd_wind_averaged"]
    direct = wind.wind_averaged_cd(np.radians([0, 5, 10, 15]), [0.30, 0.31, 0.335, 0.37], 100 / 3.6, 3.1)
    assert value == pytest.approx(direct)
    # Above the constant-Cd bound (Cd rises with yaw), below Cd at the largest yaw (6.4 deg) x 1.0125.
    assert 0.30 * (1 + (3.1 / 27.778) ** 2) < value < 0.3142 * (1 + (3.1 / 27.778) ** 2)
    bad = cli("calc", "wind-averaged", "--speed", "100", "--yaw", "0:0.30,five:0.31")
    assert bad.code == 2 and "YAW_DEG:CD" in bad.err


def test_ahmed_curve_shape():
    """Ahmed, Ramm and Faltin (1984): minimum near 10-12.5 deg, 0.285 at 25 deg (as a public CFD
    validation table quotes it against SAE 840300), peak just below the 30 deg critical angle,
    abrupt drop above it (the regimes a review, Appl. Mech. Rev. 73 (2021) 060801, names)."""
    assert float(references.ahmed_cd(25.0)) == pytest.approx(0.285)
    assert float(references.ahmed_cd(30.0)) == pytest.approx(0.378)
    assert float(references.ahmed_cd(30.01)) < 0.27
    assert float(references.ahmed_cd(35.0)) == pytest.approx(0.260)
    assert references.ahmed_minimum().angle == 12.5 and references.ahmed_minimum().cd == pytest.approx(0.23)
    points = references.AHMED_ATTACHED + references.AHMED_SEPARATED
    # Each point says where it comes from: only 25 deg was found quoted (a secondary source
    # comparing against SAE 840300); the rest are recalled or interpolated, and say so.
    assert [p.angle for p in points if p.kind == "quoted"] == [25.0]
    assert all("from memory" in p.note for p in points if p.kind == "recalled")
    assert all("not a published value" in p.note for p in points if p.kind == "interpolated")
    assert {p.kind for p in points} == {"quoted", "recalled", "interpolated"}
    steep = [p for p in points if 27.5 <= p.angle <= 30.0 and p in references.AHMED_ATTACHED]
    assert steep and all(p.uncertainty >= 0.03 for p in steep)
    with pytest.raises(ValueError):
        references.ahmed_cd(50.0)
    assert math.isclose(references.AHMED_FRONTAL_AREA, 0.389 * 0.288, rel_tol=0.01)
