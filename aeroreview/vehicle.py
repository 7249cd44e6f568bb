"""From a sheet to the physics: the vehicle data calc needs, with every assumption named.

A sheet rarely carries everything the road-load model needs. Missing values fall back to
the defaults below, and each fallback is reported, so a consequence is never computed on
a silent guess.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from aeroreview.calc.roadload import FUEL_HEATING_VALUE, ROTATING_MASS_FACTOR, Vehicle
from aeroreview.rules.data import measured_cd

if TYPE_CHECKING:  # the sheet checks waivers against the rules: import it for types only
    from aeroreview.sheet import Sheet

TEST_PAYLOAD = 100.0  # kg on top of curb mass: driver and luggage, near WLTP test mass (common practice)

# Fallbacks when a sheet leaves a value out (each is reported as an assumption).
DEFAULTS = {
    "powertrain.rolling_resistance": (0.009, "from memory: a current low-rolling-resistance passenger-car tyre"),
    "powertrain.drivetrain_efficiency": (0.88, "from memory: battery-to-wheel mean of current EV drives"),
    "powertrain.regen_efficiency": (0.6, "from memory: cycle-average share of braking energy recovered"),
    "powertrain.engine_efficiency": (0.30, "from memory: cycle-average brake efficiency of a car engine"),
    "mass.rotating_mass_factor": (ROTATING_MASS_FACTOR, "from memory (Gillespie 1992, on acceleration performance; "
                                                        "chapter not checked)"),
}


def vehicle_from_sheet(sheet: Sheet, cd: float | None = None, area: float | None = None) -> tuple[Vehicle, list[str]]:
    """A road-load :class:`Vehicle` from the sheet; ``cd`` and ``area`` override the sheet.

    Returns the vehicle and the list of assumptions made. Raises ``ValueError`` when a
    value without a sound default (Cd, frontal area) is missing.
    """
    assumptions: list[str] = []
    if cd is None:
        found = measured_cd(sheet)
        if found is None:
            raise ValueError(f"{sheet.path}: no Cd in the sheet's results; give one (e.g. --cd 0.30)")
        cd = found[0]
    area = area or sheet.get("dimensions.frontal_area")
    if area is None:
        raise ValueError(f"{sheet.path}: dimensions.frontal_area is missing; add it to the sheet")

    def value(key: str) -> float:
        got = sheet.get(key)
        if got is None:
            got, why = DEFAULTS[key]
            assumptions.append(f"{key} = {got:g} ({why})")
        return got

    kind = sheet.get("powertrain.kind")
    burns = kind in ("combustion", "hybrid")
    fuel = sheet.get("powertrain.fuel") or ("petrol" if burns else None)
    if burns and sheet.get("powertrain.fuel") is None:
        assumptions.append("powertrain.fuel = petrol (not given)")
    battery = sheet.get("powertrain.battery_usable")
    vehicle = Vehicle(
        mass=sheet.get("mass.curb") + TEST_PAYLOAD, cd=cd, area=area,
        crr=value("powertrain.rolling_resistance"),
        drivetrain_efficiency=value("powertrain.drivetrain_efficiency"),
        regen_efficiency=0.0 if kind == "combustion" and sheet.get("powertrain.regen_efficiency") is None
        else value("powertrain.regen_efficiency"),
        rotating_mass_factor=value("mass.rotating_mass_factor"),
        battery=battery if kind == "electric" else None,
        engine_efficiency=value("powertrain.engine_efficiency") if burns else None,
        fuel_heating_value=FUEL_HEATING_VALUE[fuel] if burns else None,
        fuel_tank=sheet.get("powertrain.fuel_tank") * 1000.0 if burns and sheet.has("powertrain.fuel_tank") else None,
    )
    assumptions.append(f"test mass = curb mass + {TEST_PAYLOAD:g} kg (common practice)")
    return vehicle, assumptions

