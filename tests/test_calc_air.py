"""ISA and moist air against outside references.

Sources: ISO 2533:1975 sea-level values; the `ambiance` package (ICAO 1993 standard
atmosphere); `fluids.ATMOSPHERE_1976` (US Standard Atmosphere 1976, identical to the ISA
below 32 km); CoolProp's humid-air functions (HAPropsSI, Hyland-Wexler with real-gas terms).
"""

from __future__ import annotations

import json

import fluids
import pytest
from ambiance import Atmosphere
from CoolProp.HumidAirProp import HAPropsSI

from aeroreview.calc import air

ALTITUDES = [-500.0, 0.0, 1000.0, 2500.0, 5000.0, 8000.0, 11000.0, 15000.0, 20000.0]


def test_iso_2533_sea_level():
    state = air.air_state(0.0)
    assert state.temperature == pytest.approx(288.15, abs=1e-9)
    assert state.pressure == pytest.approx(101325.0, rel=1e-9)
    assert state.density == pytest.approx(1.225, abs=5e-5)
    assert state.speed_of_sound == pytest.approx(340.29, abs=0.005)
    assert state.dynamic_viscosity == pytest.approx(1.7894e-5, rel=5e-5)


@pytest.mark.parametrize("altitude", ALTITUDES)
def test_isa_against_ambiance_icao_1993(altitude):
    reference = Atmosphere(altitude)
    state = air.air_state(altitude)
    assert state.temperature == pytest.approx(reference.temperature[0], rel=1e-6)
    assert state.pressure == pytest.approx(reference.pressure[0], rel=1e-5)
    assert state.density == pytest.approx(reference.density[0], rel=1e-5)
    assert state.dynamic_viscosity == pytest.approx(reference.dynamic_viscosity[0], rel=1e-6)
    assert state.speed_of_sound == pytest.approx(reference.speed_of_sound[0], rel=1e-6)


@pytest.mark.parametrize("altitude", ALTITUDES)
def test_isa_against_fluids_atmosphere_1976(altitude):
    reference = fluids.ATMOSPHERE_1976(altitude)
    state = air.air_state(altitude)
    assert state.temperature == pytest.approx(reference.T, rel=1e-6)
    assert state.pressure == pytest.approx(reference.P, rel=1e-5)
    assert state.density == pytest.approx(reference.rho, rel=1e-5)
    assert state.dynamic_viscosity == pytest.approx(reference.mu, rel=1e-5)


def test_isa_arrays_match_scalars():
    temperatures, pressures = air.isa_temperature_pressure(ALTITUDES)
    for altitude, t, p in zip(ALTITUDES, temperatures, pressures):
        t1, p1 = air.isa_temperature_pressure(altitude)
        assert (t, p) == pytest.approx((float(t1), float(p1)))


def test_isa_refuses_altitudes_outside_its_range():
    with pytest.raises(ValueError):
        air.air_state(-3000.0)
    with pytest.raises(ValueError):
        air.air_state(100_000.0)


@pytest.mark.parametrize("celsius", [0.0, 10.0, 20.0, 30.0, 40.0])
@pytest.mark.parametrize("humidity", [0.0, 0.3, 0.6, 0.95])
def test_moist_air_density_against_coolprop(celsius, humidity):
    t, p = celsius + 273.15, 101325.0
    reference = 1.0 / HAPropsSI("Vha", "T", t, "P", p, "R", humidity)  # Vha: m^3 per kg of humid air
    assert air.air_state(0.0, t, p, humidity).density == pytest.approx(reference, rel=0.002)


def test_moist_air_is_lighter_than_dry_air():
    dry = air.air_state(0.0, 303.15, 101325.0, 0.0).density
    humid = air.air_state(0.0, 303.15, 101325.0, 0.9).density
    assert humid < dry


def test_calc_air_command_against_ambiance(cli):
    run = cli("calc", "air", "--altitude", "1000", "--json")
    assert run.code == 0, run.err
    values = json.loads(run.out)
    reference = Atmosphere(1000.0)
    assert values["temperature_K"] == pytest.approx(reference.temperature[0], rel=1e-6)
    assert values["pressure_Pa"] == pytest.approx(reference.pressure[0], rel=1e-5)
    assert values["density_kg_m3"] == pytest.approx(reference.density[0], rel=1e-5)
    assert values["dynamic_viscosity_Pa_s"] == pytest.approx(reference.dynamic_viscosity[0], rel=1e-6)
    assert values["speed_of_sound_m_s"] == pytest.approx(reference.speed_of_sound[0], rel=1e-6)


def test_calc_air_command_with_actual_conditions_against_coolprop(cli):
    run = cli("calc", "air", "--altitude", "1000", "--temperature", "25degC", "--pressure", "95kPa",
              "--humidity", "60%", "--json")
    values = json.loads(run.out)
    assert values["temperature_K"] == pytest.approx(298.15)
    assert values["pressure_Pa"] == pytest.approx(95000.0)
    reference = 1.0 / HAPropsSI("Vha", "T", 298.15, "P", 95000.0, "R", 0.6)
    assert values["density_kg_m3"] == pytest.approx(reference, rel=0.002)
