"""Forces, road load and energy against worked examples computed by hand in each test."""

from __future__ import annotations

import json

import numpy as np
import pytest

from aeroreview.calc import forces, roadload
from aeroreview.calc.cycles import constant_speed, wltc_class3b

RHO = 1.225  # ISO 2533 sea-level density


def test_drag_worked_example():
    """Cd 0.30, A 2.2 m^2, 100 km/h, ISA sea level.

    v = 100 / 3.6 = 27.778 m/s; q = 0.5 x 1.225 x 27.778^2 = 472.61 Pa;
    D = 0.30 x 2.2 x 472.61 = 311.92 N; P = 311.92 x 27.778 = 8664 W.
    """
    v = 100 / 3.6
    assert float(forces.dynamic_pressure(RHO, v)) == pytest.approx(472.61, abs=0.01)
    assert float(forces.drag_force(0.30, 2.2, v, RHO)) == pytest.approx(311.92, abs=0.01)
    assert float(forces.drag_power(0.30, 2.2, v, RHO)) == pytest.approx(8664.5, abs=0.5)


def test_lift_per_axle_worked_example():
    """cl_front 0.05, cl_rear 0.08 on 2.2 m^2 at 100 km/h: q A = 1039.74 N per unit Cl.

    Front 0.05 x 1039.74 = 51.99 N = 5.301 kgf; rear 0.08 x 1039.74 = 83.18 N = 8.482 kgf
    (dividing by g0 = 9.80665 m/s^2). On 1800 kg with 55 % front: static loads 9708.6 N and
    7943.4 N, so 0.5355 % and 1.0471 %.
    """
    front, rear = forces.axle_lift(0.05, 0.08, 2.2, 100 / 3.6, RHO)
    assert float(front) == pytest.approx(51.99, abs=0.01)
    assert float(rear) == pytest.approx(83.18, abs=0.01)
    assert float(forces.kilograms_force(front)) == pytest.approx(5.301, abs=0.001)
    assert float(forces.kilograms_force(rear)) == pytest.approx(8.482, abs=0.001)
    share_front, share_rear = forces.axle_load_share(front, rear, 1800.0, 0.55)
    assert float(share_front) == pytest.approx(0.005355, abs=2e-6)
    assert float(share_rear) == pytest.approx(0.010471, abs=2e-6)


def test_reynolds_counts_cda():
    """Re = 1.225 x 27.778 x 4.5 / 1.7894e-5 = 8.557e6; 0.012 of Cd = 12 counts; CdA = 0.66 m^2."""
    assert float(forces.reynolds_number(100 / 3.6, 4.5, RHO, 1.7894e-5)) == pytest.approx(8.557e6, rel=1e-3)
    assert float(forces.counts(0.012)) == pytest.approx(12.0)
    assert float(forces.cd_from_counts(12)) == pytest.approx(0.012)
    assert float(forces.drag_area(0.30, 2.2)) == pytest.approx(0.66)


def test_tractive_force_terms():
    """1800 kg, Crr 0.009, Cd 0.30, A 2.2 at 100 km/h accelerating 0.5 m/s^2 up a 2 % grade.

    theta = atan(0.02) = 0.019997 rad; rolling 1800 x 9.80665 x 0.009 x cos(theta) = 158.83 N;
    aero 311.92 N; grade 1800 x 9.80665 x sin(theta) = 353.00 N; inertia 1.03 x 1800 x 0.5 = 927 N.
    Total 1750.75 N.
    """
    car = roadload.Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009)
    force = roadload.tractive_force(100 / 3.6, 0.5, car, RHO, grade=np.arctan(0.02))
    assert float(force) == pytest.approx(158.83 + 311.92 + 353.00 + 927.0, abs=0.1)


def test_steady_speed_energy_worked_example():
    """Steady 100 km/h for 100 km, eta 0.9: (158.89 + 311.92) N x 1e5 m / 0.9 = 52.31 MJ = 14.53 kWh."""
    car = roadload.Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009, drivetrain_efficiency=0.9, battery=75 * 3.6e6)
    energy = roadload.cycle_energy(constant_speed(100 / 3.6), car, RHO)
    assert energy.distance == pytest.approx(1e5)
    assert energy.kwh_per_100km == pytest.approx((158.89 + 311.92) * 1e5 / 0.9 / 3.6e6, rel=1e-4)
    assert energy.aero_share == pytest.approx(311.92 / (158.89 + 311.92), rel=1e-4)
    assert energy.braking == pytest.approx(0.0)
    assert roadload.range_km(energy, car) == pytest.approx(75 / 14.5302 * 100, rel=1e-3)


def test_fuel_worked_example():
    """Same car burning diesel at 33 % engine efficiency: 52.31 MJ / 0.33 = 158.5 MJ per 100 km;
    at 35.9 MJ/L (JEC WTW v4a diesel LHV per litre) that is 4.415 L/100 km."""
    car = roadload.Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009, drivetrain_efficiency=0.9,
                           engine_efficiency=0.33, fuel_heating_value=roadload.FUEL_HEATING_VALUE["diesel"],
                           fuel_tank=60.0)
    energy = roadload.cycle_energy(constant_speed(100 / 3.6), car, RHO)
    assert energy.litres_per_100km == pytest.approx(52.31e6 / 0.33 / 35.9e6, rel=1e-3)
    assert roadload.range_km(energy, car) == pytest.approx(60 / energy.litres_per_100km * 100)


def test_cycle_energy_balance_and_regeneration():
    """On a cycle that starts and ends at rest, traction = rolling + aero + braking (energy
    conservation), and regeneration returns eta_regen x braking to the battery."""
    car = roadload.Vehicle(mass=1900, cd=0.28, area=2.3, crr=0.008, drivetrain_efficiency=0.9,
                           regen_efficiency=0.7, battery=80 * 3.6e6)
    energy = roadload.cycle_energy(wltc_class3b(), car, RHO)
    assert energy.traction == pytest.approx(energy.rolling + energy.aero + energy.braking, rel=1e-9)
    assert energy.recovered == pytest.approx(0.7 * energy.braking)
    assert energy.source == pytest.approx(energy.traction / 0.9 - 0.7 * energy.braking)
    assert energy.distance == pytest.approx(23266.28, abs=0.01)
    # Rolling energy by hand: m g Crr x distance moving (the WLTC stands still at zero speed).
    assert energy.rolling == pytest.approx(1900 * 9.80665 * 0.008 * 23266.28, rel=1e-6)


def test_drag_sensitivity_worked_example():
    """+10 counts at steady 130 km/h: dD = 0.010 x 2.2 x 0.5 x 1.225 x 36.111^2 = 17.57 N,
    over 100 km / 0.9 = 1.9525 MJ = 0.5424 kWh per 100 km."""
    car = roadload.Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009, drivetrain_efficiency=0.9, battery=75 * 3.6e6)
    result = roadload.sensitivities(wltc_class3b(), car, RHO)
    assert set(result) == {"wltc-3b", "constant-100", "constant-120", "constant-130"}
    assert result["constant-130"]["kwh_per_100km"] == pytest.approx(0.5424, abs=5e-4)
    assert result["constant-130"]["range_km"] < 0
    assert 0 < result["wltc-3b"]["kwh_per_100km"] < result["constant-100"]["kwh_per_100km"]


def test_calc_drag_command(cli):
    run = cli("calc", "drag", "--cd", "0.30", "--area", "2.2", "--speed", "100", "--cl-front", "0.05",
              "--cl-rear", "0.08", "--json")
    values = json.loads(run.out)
    assert values["dynamic_pressure_Pa"] == pytest.approx(472.61, abs=0.01)
    assert values["drag_N"] == pytest.approx(312, abs=0.1)
    assert values["drag_power_kW"] == pytest.approx(8.66, abs=0.005)
    assert values["lift_front_kg"] == pytest.approx(5.301, abs=0.001)
    assert values["lift_rear_N"] == pytest.approx(83.18, abs=0.01)


def test_calc_drag_with_units_in_options(cli):
    """62.137 mph is 100 km/h (1 mile = 1609.344 m, international yard and pound agreement 1959)."""
    run = cli("calc", "drag", "--cd", "0.30", "--area", "22000 cm^2", "--speed", "62.1371 mph", "--json")
    assert json.loads(run.out)["drag_N"] == pytest.approx(311.92, abs=0.01)


@pytest.mark.parametrize("args, message", [
    (["--cd", "0.3", "--area", "-2", "--speed", "100"], "must be positive"),
    (["--cd", "0.3", "--area", "2 blorp", "--speed", "100"], "unknown unit 'blorp'"),
    (["--cd", "0.3", "--area", "2", "--speed", "100 mm"], "'mm' is not a unit of speed"),
    (["--cd", "0.3", "--area", "2", "--speed", "100", "--cl-front", "0.1"], "give both"),
])
def test_calc_drag_bad_options(cli, args, message):
    run = cli("calc", "drag", *args)
    assert run.code == 2 and message in run.err and "Traceback" not in run.err


def test_calc_cycle_with_sheet_and_options(cli, tmp_path):
    from conftest import VEHICLES

    run = cli("calc", "cycle", "--sheet", VEHICLES / "tessel" / "r2.yaml", "--json")
    assert run.code == 0, run.err
    values = json.loads(run.out)
    assert 8 < values["energy_kWh_per_100km"] < 25
    assert 0.1 < values["aero_share"] < 0.6
    assert values["range_change_km_per_10_counts"] < 0
    run = cli("calc", "cycle", "--mass", "1800", "--cd", "0.3", "--json")
    assert run.code == 2 and "--area" in run.err
