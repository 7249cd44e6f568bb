"""``aeroreview calc ...``: the desk calculator a reviewer reaches for between meetings.

Options take a number in the unit their help shows, or a string with a unit
(``--speed "62 mph"``, ``--temperature 25degC``). ``--json`` prints machine-readable keys
with the unit in each name.
"""

from __future__ import annotations

import argparse
import json
import math
from dataclasses import replace

import numpy as np

from aeroreview.calc import air, cycles, forces, roadload, wind
from aeroreview.problems import UsageError
from aeroreview.sheet import load_sheet
from aeroreview.units import UnitProblem, from_si, to_si
from aeroreview.vehicle import DEFAULTS, vehicle_from_sheet


def quantity(unit: str, low: float | None = None, high: float | None = None, positive: bool = False):
    """An argparse ``type`` reading a value in ``unit`` (SI out), checked against limits given in ``unit``."""

    def read(text: str) -> float:
        try:
            value = to_si(text, unit)
        except UnitProblem as problem:
            raise argparse.ArgumentTypeError(f"{problem}; {problem.hint}") from None
        in_unit = from_si(value, unit)
        if positive and value <= 0:
            raise argparse.ArgumentTypeError(f"'{text}' must be positive")
        if (low is not None and in_unit < low) or (high is not None and in_unit > high):
            raise argparse.ArgumentTypeError(f"'{text}' is outside {low:g} to {high:g} {unit}".rstrip())
        return value

    read.__name__ = unit or "number"
    return read


def yaw_list(text: str) -> tuple[np.ndarray, np.ndarray]:
    """Parse ``"0:0.30,5:0.31,10:0.335"`` (yaw in deg : Cd) into arrays (rad, Cd)."""
    yaw, cd = [], []
    for item in text.split(","):
        try:
            angle, value = item.split(":")
            yaw.append(math.radians(float(angle)))
            cd.append(float(value))
        except ValueError:
            raise argparse.ArgumentTypeError(
                f"cannot read '{item.strip()}' in the yaw list; write YAW_DEG:CD pairs such as 0:0.30,5:0.31") from None
        if not (-90 <= float(angle) <= 90 and 0.05 <= cd[-1] <= 2.0) or not all(map(math.isfinite, (yaw[-1], cd[-1]))):
            raise argparse.ArgumentTypeError(f"'{item.strip()}': yaw must lie in -90..90 deg and Cd in 0.05..2")
    return np.array(yaw), np.array(cd)


def _air_options(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--altitude", type=quantity("m", -2000, 80000), default=0.0, help="geometric altitude [m] (default 0)")
    parser.add_argument("--temperature", type=quantity("degC", -90, 70), help="actual temperature [degC] (default ISA)")
    parser.add_argument("--pressure", type=quantity("kPa", 1, 120), help="actual pressure [kPa] (default ISA)")
    parser.add_argument("--humidity", type=quantity("%", 0, 100), default=0.0, help="relative humidity [%%] (default 0)")
    parser.add_argument("--json", action="store_true", help="print JSON")


def _air(args) -> air.Air:
    try:
        return air.air_state(args.altitude, args.temperature, args.pressure, args.humidity)
    except ValueError as error:
        raise UsageError(str(error)) from None


def _emit(args, values: dict, lines: list[str]) -> int:
    print(json.dumps(values, indent=2) if args.json else "\n".join(lines))
    return 0


def cmd_air(args) -> int:
    state = _air(args)
    values = {"temperature_K": state.temperature, "pressure_Pa": state.pressure, "density_kg_m3": state.density,
              "dynamic_viscosity_Pa_s": state.dynamic_viscosity, "speed_of_sound_m_s": state.speed_of_sound}
    return _emit(args, values, [
        f"temperature        {state.temperature:10.2f} K ({state.temperature - 273.15:.2f} degC)",
        f"pressure           {state.pressure:10.0f} Pa",
        f"density            {state.density:10.4f} kg/m^3",
        f"dynamic viscosity  {state.dynamic_viscosity:10.4e} Pa s",
        f"speed of sound     {state.speed_of_sound:10.2f} m/s",
    ])


def cmd_drag(args) -> int:
    state = _air(args)
    q = float(forces.dynamic_pressure(state.density, args.speed))
    drag = float(forces.drag_force(args.cd, args.area, args.speed, state.density))
    values = {"dynamic_pressure_Pa": q, "drag_N": drag, "drag_power_kW": drag * args.speed / 1000,
              "cda_m2": args.cd * args.area, "density_kg_m3": state.density}
    lines = [f"dynamic pressure {q:9.1f} Pa", f"CdA              {args.cd * args.area:9.3f} m^2",
             f"drag             {drag:9.1f} N", f"drag power       {drag * args.speed / 1000:9.2f} kW"]
    if (args.cl_front is None) != (args.cl_rear is None):
        raise UsageError("give both --cl-front and --cl-rear, or neither")
    if (args.mass is None) != (args.front_share is None):
        raise UsageError("give both --mass and --front-share (lift as a share of each axle's load), or neither")
    if args.cl_front is not None:
        front, rear = (float(x) for x in forces.axle_lift(args.cl_front, args.cl_rear, args.area, args.speed, state.density))
        values.update(lift_front_N=front, lift_rear_N=rear, lift_front_kg=float(forces.kilograms_force(front)),
                      lift_rear_kg=float(forces.kilograms_force(rear)))
        shares = ("", "")
        if args.mass is not None:
            share_front, share_rear = (float(x) for x in forces.axle_load_share(front, rear, args.mass, args.front_share))
            values.update(lift_front_share_of_axle_load=share_front, lift_rear_share_of_axle_load=share_rear)
            shares = tuple(f", {x * 100:+.2f} % of the static axle load" for x in (share_front, share_rear))
        lines += [f"lift front       {front:9.1f} N  ({values['lift_front_kg']:.1f} kg{shares[0]})",
                  f"lift rear        {rear:9.1f} N  ({values['lift_rear_kg']:.1f} kg{shares[1]})"]
        if args.mass is not None:
            lines.append("lift positive upward unloads the axle; confirm high-speed stability by test")
    elif args.mass is not None:
        raise UsageError("--mass gives lift as a share of axle load: give --cl-front and --cl-rear too")
    return _emit(args, values, lines)


def _vehicle_from_args(args) -> tuple[roadload.Vehicle | None, list[str]]:
    if args.sheet:
        sheet = load_sheet(args.sheet)
        try:
            vehicle, assumptions = vehicle_from_sheet(sheet, args.cd)
        except ValueError as error:
            raise UsageError(str(error)) from None
        overrides = {k: v for k, v in (("mass", args.mass), ("area", args.area), ("crr", args.crr),
                                       ("drivetrain_efficiency", args.efficiency), ("regen_efficiency", args.regen))
                     if v is not None}
        if args.battery is not None:
            overrides["battery"] = args.battery
        return replace(vehicle, **overrides), assumptions
    given = [args.mass, args.cd, args.area]
    if all(v is None for v in given):
        return None, []
    if any(v is None for v in given):
        raise UsageError("the energy breakdown needs --mass, --cd and --area (or --sheet FILE)")
    assumptions = []

    def given_or_default(value, key):
        if value is not None:
            return value
        default, why = DEFAULTS[key]
        assumptions.append(f"{key} = {default:g} ({why})")
        return default

    try:
        vehicle = roadload.Vehicle(
            mass=args.mass, cd=args.cd, area=args.area,
            crr=given_or_default(args.crr, "powertrain.rolling_resistance"),
            drivetrain_efficiency=given_or_default(args.efficiency, "powertrain.drivetrain_efficiency"),
            regen_efficiency=args.regen or 0.0, battery=args.battery)
    except ValueError as error:
        raise UsageError(str(error)) from None
    return vehicle, assumptions


def cmd_cycle(args) -> int:
    try:
        cycle = cycles.cycle_by_name(args.cycle)
    except ValueError as error:
        raise UsageError(str(error)) from None
    phases = [{"name": p["name"], "duration_s": p["duration_s"], "distance_km": p["distance_m"] / 1000,
               "max_speed_km_h": p["max_speed_m_s"] * 3.6} for p in cycle.phase_summary()]
    values = {"cycle": cycle.name, "source": cycle.source, "duration_s": cycle.duration,
              "distance_km": cycle.distance / 1000, "max_speed_km_h": float(cycle.speed.max()) * 3.6,
              "mean_speed_km_h": cycle.distance / cycle.duration * 3.6, "phases": phases}
    lines = [f"{cycle.name}: {cycle.duration:.0f} s, {cycle.distance / 1000:.3f} km, "
             f"max {values['max_speed_km_h']:.1f} km/h, mean {values['mean_speed_km_h']:.1f} km/h  ({cycle.source})"]
    lines += [f"  {p['name']:<11} {p['duration_s']:5.0f} s {p['distance_km']:7.3f} km  max {p['max_speed_km_h']:6.1f} km/h"
              for p in phases]
    vehicle, assumptions = _vehicle_from_args(args)
    if vehicle is not None:
        state = _air(args)
        energy = roadload.cycle_energy(cycle, vehicle, state.density)
        per = {"rolling_kWh": energy.rolling / roadload.KWH, "aero_kWh": energy.aero / roadload.KWH,
               "braking_kWh": energy.braking / roadload.KWH, "recovered_kWh": energy.recovered / roadload.KWH,
               "traction_kWh": energy.traction / roadload.KWH}
        values.update(energy_kWh_per_100km=energy.kwh_per_100km, aero_share=energy.aero_share,
                      energy_breakdown=per, assumptions=assumptions)
        lines += ["", f"energy        {energy.kwh_per_100km:7.2f} kWh/100 km "
                      f"({'fuel' if energy.burns_fuel else 'battery'})",
                  f"aero share    {energy.aero_share * 100:7.1f} % of the energy dissipated",
                  f"at the wheels rolling {per['rolling_kWh']:.3f} kWh, aero {per['aero_kWh']:.3f} kWh, "
                  f"brakes {per['braking_kWh']:.3f} kWh (recovered {per['recovered_kWh']:.3f} kWh)"]
        if energy.burns_fuel:
            values["fuel_L_per_100km"] = energy.litres_per_100km
            lines.append(f"fuel          {energy.litres_per_100km:7.2f} L/100 km")
        sensitivity = roadload.drag_sensitivity(cycle, vehicle, state.density)
        values["energy_change_kWh_per_100km_per_10_counts"] = sensitivity["kwh_per_100km"]
        lines.append(f"+10 counts    {sensitivity['kwh_per_100km']:+7.3f} kWh/100 km")
        range_now = roadload.range_km(energy, vehicle)
        if range_now is not None:
            values.update(range_km=range_now, range_change_km_per_10_counts=sensitivity["range_km"])
            lines += [f"range         {range_now:7.0f} km", f"+10 counts    {sensitivity['range_km']:+7.1f} km of range"]
        lines += [f"assumed: {a}" for a in assumptions]
    return _emit(args, values, lines)


def cmd_wind_averaged(args) -> int:
    yaw, cd = args.yaw
    try:
        value = wind.wind_averaged_cd(yaw, cd, args.speed, args.wind)
    except ValueError as error:
        raise UsageError(str(error)) from None
    values = {"cd_wind_averaged": value, "cd_zero_yaw": float(np.interp(0.0, *wind.symmetric_sweep(yaw, cd))),
              "max_yaw_deg": math.degrees(wind.max_yaw(args.speed, args.wind)), "wind_speed_m_s": args.wind}
    return _emit(args, values, [f"wind-averaged Cd {value:.4f} (zero-yaw {values['cd_zero_yaw']:.4f}; wind "
                                f"{args.wind:.2f} m/s gives up to {values['max_yaw_deg']:.1f} deg of yaw)"])


def add_parser(sub) -> None:
    """Register ``calc`` and its subcommands on the main parser's subparsers."""
    calc = sub.add_parser("calc", help="desk calculations: air, drag and lift, cycle energy, wind-averaged drag")
    calc_sub = calc.add_subparsers(dest="calc_command", required=True, metavar="CALCULATION",
                                   parser_class=type(calc))

    p = calc_sub.add_parser("air", help="ISA air properties, optionally with actual conditions")
    _air_options(p)
    p.set_defaults(run=cmd_air)

    p = calc_sub.add_parser("drag", help="drag force and power, lift per axle")
    p.add_argument("--cd", type=quantity("", 0.05, 2.0), required=True, help="drag coefficient")
    p.add_argument("--area", type=quantity("m^2", positive=True), required=True, help="frontal area [m^2]")
    p.add_argument("--speed", type=quantity("km/h", positive=True), required=True, help="speed [km/h]")
    p.add_argument("--cl-front", type=quantity("", -3, 3), help="front axle lift coefficient")
    p.add_argument("--cl-rear", type=quantity("", -3, 3), help="rear axle lift coefficient")
    p.add_argument("--mass", type=quantity("kg", positive=True),
                   help="vehicle mass [kg]: lift is then also shown as a share of each static axle load")
    p.add_argument("--front-share", type=quantity("", 0.05, 0.95),
                   help="share of the mass on the front axle, 0.55 or '55 %%' (with --mass)")
    _air_options(p)
    p.set_defaults(run=cmd_drag)

    p = calc_sub.add_parser("cycle", help="drive-cycle figures and, with a vehicle, its energy breakdown")
    p.add_argument("--cycle", default="wltc-3b", help="wltc-3b (default) or constant-KMH, e.g. constant-120")
    p.add_argument("--sheet", help="take the vehicle data from this feature sheet")
    p.add_argument("--mass", type=quantity("kg", positive=True), help="test mass [kg]")
    p.add_argument("--cd", type=quantity("", 0.05, 2.0), help="drag coefficient")
    p.add_argument("--area", type=quantity("m^2", positive=True), help="frontal area [m^2]")
    p.add_argument("--crr", type=quantity("", 0.001, 0.05), help="rolling resistance coefficient (default 0.009)")
    p.add_argument("--efficiency", type=quantity("", 0.05, 1.0), help="drivetrain efficiency (default 0.88)")
    p.add_argument("--regen", type=quantity("", 0.0, 1.0), help="share of braking energy recovered (default 0)")
    p.add_argument("--battery", type=quantity("kWh", positive=True), help="usable battery energy [kWh], for range")
    _air_options(p)
    p.set_defaults(run=cmd_cycle)

    p = calc_sub.add_parser("wind-averaged", help="SAE J1252 wind-averaged drag coefficient from a yaw sweep")
    p.add_argument("--speed", type=quantity("km/h", positive=True), required=True, help="vehicle speed [km/h]")
    p.add_argument("--yaw", type=yaw_list, required=True, help="YAW_DEG:CD pairs, e.g. 0:0.30,5:0.31,10:0.335")
    p.add_argument("--wind", type=quantity("m/s", 0, 50), default=wind.J1252_WIND_SPEED,
                   help="mean wind speed [m/s] (default 3.13, the 7 mph of SAE J1252)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=cmd_wind_averaged)
