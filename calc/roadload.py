"""Road load and energy: what a drag change costs on a drive cycle and at steady speed.

Tractive force at the wheels (level road unless a grade is given):

    F = m g0 Crr cos(theta) + Cd A rho v^2 / 2 + m g0 sin(theta) + f_r m a

with f_r the rotating-mass factor. Over a speed trace each interval between samples is
taken at its mean speed v = (v1 + v2) / 2 and acceleration a = (v2 - v1) / dt, so the
inertia term is exactly the change of kinetic energy. On a cycle that starts and ends at
rest, the traction energy then equals what rolling resistance, aerodynamic drag and the
brakes dissipate; that split is the energy breakdown. Braking energy returns to the
battery at the regenerative efficiency.

References: Gillespie, Fundamentals of Vehicle Dynamics (SAE 1992), the section on road
loads (chapter not checked); Guzzella and Sciarretta, Vehicle Propulsion Systems, 3rd ed.
(Springer 2013), the chapter "Vehicle Energy and Fuel Consumption - Basic Concepts" (title
confirmed on a publisher's reference page, where it is chapter 2; the 3rd edition's numbering
not checked).
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from aeroreview.calc.air import G0
from aeroreview.calc.cycles import Cycle, constant_speed
from aeroreview.calc.forces import cd_from_counts

# Lower heating values per litre (JEC Well-to-Wheels report v4a, 2014, fuel properties
# table: petrol 43.2 MJ/kg at 745 kg/m^3, diesel 43.1 MJ/kg at 832 kg/m^3; from memory).
FUEL_HEATING_VALUE = {"petrol": 32.2e6, "diesel": 35.9e6}  # J/L
ROTATING_MASS_FACTOR = 1.03  # typical passenger car in top gear or EV, from memory (Gillespie 1992, on
# acceleration performance; chapter not checked)
KWH = 3.6e6  # J


@dataclass(frozen=True)
class Vehicle:
    """What the road load needs: mass [kg], Cd, A [m^2], Crr, efficiencies, energy store."""

    mass: float
    cd: float
    area: float
    crr: float
    drivetrain_efficiency: float = 0.9
    regen_efficiency: float = 0.0
    rotating_mass_factor: float = ROTATING_MASS_FACTOR
    battery: float | None = None  # usable battery energy [J], electric vehicles
    engine_efficiency: float | None = None  # fuel to crank, combustion and hybrid vehicles
    fuel_heating_value: float | None = None  # J/L
    fuel_tank: float | None = None  # L

    def __post_init__(self):
        for name in ("mass", "cd", "area", "crr", "drivetrain_efficiency", "rotating_mass_factor"):
            if not getattr(self, name) > 0:
                raise ValueError(f"{name} must be positive")
        if not 0 <= self.regen_efficiency <= 1 or self.drivetrain_efficiency > 1:
            raise ValueError("efficiencies must lie between 0 and 1")

    @property
    def burns_fuel(self) -> bool:
        return self.engine_efficiency is not None and self.fuel_heating_value is not None


def tractive_force(speed, acceleration, vehicle: Vehicle, density: float, grade: float = 0.0):
    """Tractive force at the wheels [N] for speed [m/s], acceleration [m/s^2], grade [rad].

    Rolling resistance acts only while the vehicle moves.

    Example: 1800 kg, Cd 0.30, A 2.2 m^2, Crr 0.009, 100 km/h steady on the level at ISA sea
    level: rolling 1800 x 9.80665 x 0.009 = 158.9 N, aero 311.9 N, total 470.8 N.

    >>> car = Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009)
    >>> round(float(tractive_force(100 / 3.6, 0.0, car, 1.225)), 1)
    470.8

    Reference: Gillespie (1992), the road-load equation with the inertia term of acceleration
    performance (chapter and equation numbers not checked).
    """
    v = np.asarray(speed, dtype=float)
    moving = (v > 0).astype(float)
    rolling = vehicle.mass * G0 * vehicle.crr * np.cos(grade) * moving
    aero = 0.5 * density * vehicle.cd * vehicle.area * v**2
    climbing = vehicle.mass * G0 * np.sin(grade)
    inertia = vehicle.rotating_mass_factor * vehicle.mass * np.asarray(acceleration, dtype=float)
    return rolling + aero + climbing + inertia


@dataclass(frozen=True)
class Energy:
    """Energy over a cycle [J] and what it means per distance and for range."""

    distance: float  # m
    traction: float  # J at the wheels while driving
    rolling: float  # J dissipated by rolling resistance
    aero: float  # J dissipated by aerodynamic drag
    braking: float  # J taken out by the brakes (friction and regenerative)
    recovered: float  # J returned to the battery by regeneration
    source: float  # J drawn from the battery (or fuel energy for combustion)
    burns_fuel: bool
    fuel_heating_value: float | None = None

    @property
    def aero_share(self) -> float:
        """Share of the dissipated energy that goes into aerodynamic drag."""
        total = self.rolling + self.aero + self.braking
        return self.aero / total if total else 0.0

    @property
    def kwh_per_100km(self) -> float:
        """Battery (or fuel) energy per 100 km [kWh]."""
        return self.source / self.distance * 1e5 / KWH

    @property
    def litres_per_100km(self) -> float | None:
        """Fuel volume per 100 km [L] for vehicles that burn fuel."""
        if not self.burns_fuel:
            return None
        return self.source / self.fuel_heating_value / self.distance * 1e5


def cycle_energy(cycle: Cycle, vehicle: Vehicle, density: float) -> Energy:
    """Energy needed to drive ``cycle`` [J], split into rolling, aerodynamic and braking parts.

    Source energy: battery = traction / eta_drive - eta_regen x braking; fuel = that divided
    by the engine efficiency (no regeneration unless the vehicle has it).

    Example, checked by hand: 1800 kg, Cd 0.30, A 2.2 m^2, Crr 0.009, eta 0.9, steady
    100 km/h over 100 km at ISA sea level: (158.9 + 311.9) N x 100 km / 0.9 = 52.3 MJ,
    14.53 kWh per 100 km, of which 66 % aerodynamic (311.9 / 470.8).

    >>> car = Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009, drivetrain_efficiency=0.9)
    >>> energy = cycle_energy(constant_speed(100 / 3.6), car, 1.225)
    >>> round(energy.kwh_per_100km, 2), round(energy.aero_share, 3)
    (14.53, 0.663)
    """
    parts = cycle.intervals
    rolling = vehicle.mass * G0 * vehicle.crr * parts["moving_step"]
    aero = 0.5 * density * vehicle.cd * vehicle.area * parts["v2_step"]
    wheel = rolling + aero + vehicle.rotating_mass_factor * vehicle.mass * parts["accel_step"]
    total = float(wheel.sum())
    traction = float(np.maximum(wheel, 0.0).sum())
    braking = traction - total
    recovered = vehicle.regen_efficiency * braking
    battery_side = traction / vehicle.drivetrain_efficiency - recovered
    source = battery_side / vehicle.engine_efficiency if vehicle.burns_fuel else battery_side
    return Energy(float(parts["step"].sum()), traction, float(rolling.sum()), float(aero.sum()), braking, recovered,
                  source, vehicle.burns_fuel, vehicle.fuel_heating_value)


def range_km(energy: Energy, vehicle: Vehicle) -> float | None:
    """Range [km] on the battery (or the tank) at the energy use of ``energy``.

    Example: 75 kWh usable at 15 kWh per 100 km gives 500 km.
    """
    if vehicle.burns_fuel:
        if not vehicle.fuel_tank:
            return None
        return vehicle.fuel_tank / energy.litres_per_100km * 100.0
    if not vehicle.battery:
        return None
    return vehicle.battery / KWH / energy.kwh_per_100km * 100.0


def drag_sensitivity(cycle: Cycle, vehicle: Vehicle, density: float, n_counts: float = 10.0,
                     base: Energy | None = None) -> dict:
    """Change of energy per 100 km [kWh], fuel per 100 km [L] and range [km] when Cd rises by ``n_counts``.

    ``base`` is the energy of ``vehicle`` on ``cycle`` when the caller already has it.

    Example: the car of :func:`cycle_energy` at steady 100 km/h: 10 counts add
    0.010 x 2.2 x 472.6 N x 100 km / 0.9 = 0.321 kWh per 100 km.

    >>> car = Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009, drivetrain_efficiency=0.9)
    >>> round(drag_sensitivity(constant_speed(100 / 3.6), car, 1.225)["kwh_per_100km"], 3)
    0.321
    """
    base = base or cycle_energy(cycle, vehicle, density)
    worse_vehicle = replace(vehicle, cd=vehicle.cd + float(cd_from_counts(n_counts)))
    worse = cycle_energy(cycle, worse_vehicle, density)
    out = {"kwh_per_100km": worse.kwh_per_100km - base.kwh_per_100km}
    if base.burns_fuel:
        out["litres_per_100km"] = worse.litres_per_100km - base.litres_per_100km
    before, after = range_km(base, vehicle), range_km(worse, worse_vehicle)
    out["range_km"] = None if before is None else after - before
    return out


STEADY_SPEEDS_KMH = (100, 120, 130)  # the motorway speeds reviewers quote (common practice)


def sensitivities(cycle: Cycle, vehicle: Vehicle, density: float, n_counts: float = 10.0,
                  base: Energy | None = None) -> dict[str, dict]:
    """:func:`drag_sensitivity` on ``cycle`` and at steady 100, 120 and 130 km/h [kWh, L, km per n counts].

    Example: at steady 130 km/h the car of :func:`cycle_energy` pays 0.542 kWh per 100 km
    for 10 counts (0.010 x 2.2 x 0.5 x 1.225 x 36.11^2 N x 100 km / 0.9).

    >>> car = Vehicle(mass=1800, cd=0.30, area=2.2, crr=0.009, drivetrain_efficiency=0.9)
    >>> round(sensitivities(constant_speed(100 / 3.6), car, 1.225)["constant-130"]["kwh_per_100km"], 3)
    0.542
    """
    out = {cycle.name: drag_sensitivity(cycle, vehicle, density, n_counts, base)}
    for kmh in STEADY_SPEEDS_KMH:
        out[f"constant-{kmh}"] = drag_sensitivity(constant_speed(kmh / 3.6), vehicle, density, n_counts)
    return out
