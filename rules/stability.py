"""Lift and stability: lift per axle at speed, as a share of what holds the car on the road.

These rules compute lift from the sheet's results (axle lift coefficients) at the review's
reference speed and at the vehicle's top speed. Their verdicts are review aids: lift and
stability must be confirmed by test before a vehicle is driven at speed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from aeroreview.calc.forces import axle_lift, axle_load_share, kilograms_force
from aeroreview.calc.wind import J1252_WIND_SPEED, max_yaw, wind_averaged_cd
from aeroreview.display import KG, KM_H, PERCENT, Reading
from aeroreview.rules import COMMON, Effect, Source, Threshold, major, minor, not_assessed, passed, rule
from aeroreview.rules.result_quality import result_of_record

LIFT_SOURCE = Source("axle unloading limits for road cars at top speed; from memory (Hucho 1998, driving stability, "
                     "chapter not checked), to be set per program", "from memory")
STRICT_CLASSES = ("sports",)  # classes judged by the tighter lift limits (common practice)
STRICT_FACTOR = 2 / 3  # the tighter limits: two thirds of the usual shares (from memory)


def lift_result(sheet):
    """The result of record among those with both axle lift coefficients; None if there is none."""
    return result_of_record([r for r in sheet.results if r.cl_front is not None and r.cl_rear is not None])


@dataclass(frozen=True)
class AxleFigures:
    """Lift on each axle at one speed: force [N], in kg, and as a share of the static axle load."""

    speed_km_h: float
    front_N: float
    rear_N: float
    front_kg: float
    rear_kg: float
    front_share: float
    rear_share: float
    cl_front: float
    cl_rear: float
    result: str  # the label of the result the coefficients come from

    def kg(self, axle: str) -> float:
        return self.front_kg if axle == "front" else self.rear_kg

    def share(self, axle: str) -> float:
        return self.front_share if axle == "front" else self.rear_share


def axle_figures(sheet, ctx, speed: float) -> AxleFigures | None:
    """Lift per axle [N, kg] and as a share of the static axle load at ``speed`` [m/s]."""
    result = lift_result(sheet)
    area = result.reference_area or sheet.get("dimensions.frontal_area") if result else None
    if result is None or area is None:
        return None
    front, rear = (float(x) for x in axle_lift(result.cl_front, result.cl_rear, area, speed, ctx.density))
    share_front, share_rear = (float(x) for x in axle_load_share(front, rear, sheet.get("mass.curb"),
                                                                 sheet.get("mass.front_axle_share")))
    return AxleFigures(speed * 3.6, front, rear, float(kilograms_force(front)), float(kilograms_force(rear)),
                       share_front, share_rear, result.cl_front, result.cl_rear, result.label)


def _unloading(sheet, ctx, axle: str):
    top = axle_figures(sheet, ctx, sheet.get("powertrain.top_speed"))
    if top is None:
        return not_assessed("needs a result with cl_front and cl_rear, and the frontal area",
                            missing=("results[].cl_front", "results[].cl_rear"))
    reference_speed = ctx.reference_speed
    reference = axle_figures(sheet, ctx, reference_speed)
    share, kg = top.share(axle), top.kg(axle)
    strict = sheet.get("vehicle.class") in STRICT_CLASSES or sheet.get("powertrain.top_speed") > ctx["fast"]
    factor = STRICT_FACTOR if strict else 1.0
    ctx = {"major_share": ctx["major_share"] * factor, "minor_share": ctx["minor_share"] * factor}
    measured = (f"{PERCENT(share, 1, signed=True)} of the static {axle} axle load ({KG(kg, signed=True)}) at "
                f"{KM_H(sheet.get('powertrain.top_speed'))}; {KG(reference.kg(axle), signed=True)} at "
                f"{KM_H(reference_speed)}")
    details = {"top_speed": top, "reference_speed": reference, "strict_limits": strict}
    unacceptable = Reading(share, PERCENT, at_most=ctx["major_share"], places=1)
    noticeable = Reading(share, PERCENT, at_most=ctx["minor_share"], places=1)
    if unacceptable.beyond:
        return major(f"the {axle} axle loses more than {PERCENT(ctx['major_share'])} of its load at top speed",
                     **unacceptable.shown(measured), details=details)
    if noticeable.beyond:
        return minor(f"the {axle} axle unloads noticeably at top speed", **noticeable.shown(measured), details=details)
    return passed(f"{axle} axle lift at top speed is small", **noticeable.shown(measured, margin=False),
                  details=details)


YAW_SOURCE = Source("crosswind sensitivity of axle lift; from memory (Hucho 1998, crosswind, chapter not checked)",
                    "from memory")
_NEEDS = ("mass.curb", "mass.front_axle_share", "powertrain.top_speed", "dimensions.frontal_area")
_FAST = Threshold("fast", "250 km/h", "km/h", "top speed above which the tighter limits (two thirds) apply; sports "
                  "cars always get them", LIFT_SOURCE)


@rule("stability.rear-lift", "Rear axle unloading at top speed", "failure", needs=_NEEDS,
      optional=("vehicle.class",),
      thresholds=(Threshold("minor_share", "3 %", "%", "rear unloading that needs attention", LIFT_SOURCE),
                  Threshold("major_share", "6 %", "%", "rear unloading that is not acceptable", LIFT_SOURCE), _FAST),
      sources=(LIFT_SOURCE,))
def rear_lift(sheet, ctx):
    """
    What it checks: the aerodynamic lift on the rear axle at the vehicle's top speed, as a
    share of the static rear axle load (and in kg at the reference and top speed).

    Why it matters: rear lift takes load off the tyres that keep the car straight; at
    motorway and top speeds it reduces rear grip in lane changes, crosswind and braking,
    making the car feel nervous or, at worst, unstable. It grows with the square of speed.

    How to fix: lower rear lift with a decklid kick-up or spoiler, a working diffuser, a
    backlight clear of the critical region, and a closed underbody; check the balance with
    the front. Confirm every change at speed on a proving ground.

    The limits know the vehicle: a car faster than 250 km/h, or a sports car, is held to two
    thirds of the usual shares, since the margin it needs grows with speed.

    Known limits: static coefficients at zero yaw; rear lift usually rises with yaw, and
    pitch under load changes it. Lift coefficients come from the sheet's results.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (failure): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.15}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04}]}
    """
    return _unloading(sheet, ctx, "rear")


@rule("stability.front-lift", "Front axle unloading at top speed", "warning", needs=_NEEDS,
      optional=("vehicle.class",),
      thresholds=(Threshold("minor_share", "6 %", "%", "front unloading that needs attention", LIFT_SOURCE),
                  Threshold("major_share", "10 %", "%", "front unloading that is not acceptable", LIFT_SOURCE), _FAST),
      sources=(LIFT_SOURCE,))
def front_lift(sheet, ctx):
    """
    What it checks: the aerodynamic lift on the front axle at top speed, as a share of the
    static front axle load.

    Why it matters: front lift lightens the steering and reduces front grip at speed; the
    driver feels a vague, light steering, and braking stability suffers.

    How to fix: lower front lift with an effective air dam, a closed front underbody, a
    slight nose-down rake and cooling outlets that vent downward or into the wheelhouses.
    Confirm at speed on a proving ground.

    Known limits: as for rear lift: zero yaw, static ride height, coefficients from the sheet;
    the same tighter limits apply above 250 km/h and to sports cars.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.25, cl_rear: 0.0}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.12, cl_rear: 0.0}]}
    """
    return _unloading(sheet, ctx, "front")


@rule("stability.lift-balance", "Front-to-rear lift balance", "warning", needs=(),
      thresholds=(Threshold("minor_excess", "0.02", "", "rear minus front lift coefficient that needs attention",
                            COMMON),
                  Threshold("major_excess", "0.05", "", "rear minus front lift coefficient that is not acceptable",
                            COMMON)),
      sources=(COMMON, LIFT_SOURCE))
def lift_balance(sheet, ctx):
    """
    What it checks: the difference between the rear and the front axle lift coefficients.

    Why it matters: when the rear lifts more than the front, the rear loses grip faster
    than the front as speed rises: the balance moves toward oversteer, the opposite of what
    a stable road car needs at speed.

    How to fix: move lift from the rear to the front or below zero at the rear: decklid
    kick-up, spoiler, diffuser; avoid fixes that add only front downforce.

    Known limits: the acceptable balance depends on the chassis; the rule flags rear-biased
    lift only.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.08}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04}]}
    """
    result = lift_result(sheet)
    if result is None:
        return not_assessed("needs a result with cl_front and cl_rear", missing=("results[].cl_front",
                                                                                  "results[].cl_rear"))
    excess = result.cl_rear - result.cl_front
    measured = f"cl_rear - cl_front = {excess:+.3f} ({result.label})"
    if excess > ctx["major_excess"]:
        return major("the rear lifts much more than the front", measured=measured,
                     limit=f"<= {ctx['major_excess']:+.2f}", margin=f"{excess - ctx['major_excess']:+.3f}",
                     cl_rear=-(excess - ctx["major_excess"]))
    if excess > ctx["minor_excess"]:
        return minor("the rear lifts more than the front", measured=measured, limit=f"<= {ctx['minor_excess']:+.2f}",
                     margin=f"{excess - ctx['minor_excess']:+.3f}", cl_rear=-(excess - ctx["minor_excess"]))
    return passed("the lift balance is front-biased or even", measured=measured, limit=f"<= {ctx['minor_excess']:+.2f}")


def sweep_at(sheet, field: str, angle: float, odd: bool = False) -> tuple[float, float] | None:
    """``field`` of the yaw sweeps (|yaw| folded) interpolated at 0 and ``angle`` [deg]; None if not covered.

    ``odd``: the field changes sign with yaw (side force, yawing moment), so it is folded with
    the sign of yaw; otherwise (drag, lift) +yaw and -yaw are averaged as they are.
    """
    by_angle: dict[float, list[float]] = {}
    for point in (p for r in sheet.results for p in r.yaw_sweep if getattr(p, field) is not None):
        sign = -1.0 if odd and point.yaw < 0 else 1.0
        by_angle.setdefault(round(abs(math.degrees(point.yaw)), 6), []).append(sign * getattr(point, field))
    if not by_angle or min(by_angle) > 0 or max(by_angle) < angle:
        return None
    angles = sorted(by_angle)
    values = [float(np.mean(by_angle[a])) for a in angles]  # +yaw and -yaw averaged
    return float(np.interp(0, angles, values)), float(np.interp(angle, angles, values))


@rule("stability.yaw-rear-lift", "Growth of rear lift with yaw", "warning", needs=(),
      thresholds=(Threshold("growth", "0.10", "", "rise of cl_rear from 0 to 10 deg of yaw that is too fast",
                            YAW_SOURCE),
                  Threshold("moderate", "0.05", "", "rise of cl_rear from 0 to 10 deg above which a high relative "
                                                    "rise counts", YAW_SOURCE),
                  Threshold("relative", "50 %", "%", "relative rise that, with a high rear lift at yaw, is too fast",
                            YAW_SOURCE),
                  Threshold("high", "0.15", "", "cl_rear at 10 deg of yaw above which the rear is light", YAW_SOURCE)),
      sources=(YAW_SOURCE,))
def yaw_rear_lift(sheet, ctx):
    """
    What it checks: how much the rear lift coefficient rises from 0 to 10 deg of yaw in the
    sheet's yaw sweep, in absolute terms and relative to its value at zero yaw.

    Why it matters: gusts and overtaking trucks put a car at yaw; if rear lift grows
    quickly with yaw, the rear goes light exactly when a side force pushes it. A rise of
    +0.09 from an already high 0.14 (+64 %) leaves a light rear at yaw, though the absolute
    rise alone looks moderate.

    How to fix: sharpen the rear separation edges, add a kick-up across the full width,
    and avoid a backlight near the critical angle, where yaw switches the flow state.
    Confirm crosswind behaviour on a proving ground.

    Known limits: needs a sweep with rear lift at 0 and 10 deg (interpolated between
    measured angles); quasi-steady.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04,
            yaw_sweep: [{yaw: 0 deg, cd: 0.25, cl_rear: 0.04}, {yaw: 10 deg, cd: 0.25, cl_rear: 0.16}, {yaw: -10 deg, cd:
            0.25, cl_rear: 0.16}]}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04, yaw_sweep:
            [{yaw: 0 deg, cd: 0.25, cl_rear: 0.04}, {yaw: 10 deg, cd: 0.25, cl_rear: 0.076}, {yaw: -10 deg, cd: 0.25,
            cl_rear: 0.076}]}]}
    """
    found = sweep_at(sheet, "cl_rear", 10)
    if found is None:
        return not_assessed("needs a yaw sweep with rear lift from 0 to at least 10 deg",
                            missing=("results[].yaw_sweep[].cl_rear",))
    at_zero, at_ten = found
    growth = at_ten - at_zero
    relative = growth / abs(at_zero) if abs(at_zero) > 1e-9 else math.inf
    measured = (f"cl_rear {at_zero:+.3f} -> {at_ten:+.3f} from 0 to 10 deg "
                f"({growth:+.3f}, {PERCENT(relative, signed=True)})")
    light = growth > ctx["moderate"] and relative > ctx["relative"] and at_ten > ctx["high"]
    if growth > ctx["growth"] or light:
        return major("rear lift grows quickly with yaw" + (" to a light rear" if light else ""), measured=measured,
                     limit=f"rise <= {ctx['growth']:+.2f}, and <= {PERCENT(ctx['relative'])} where cl_rear at "
                           f"10 deg exceeds {ctx['high']:.2f}", margin=f"{growth - ctx['growth']:+.3f}",
                     cl_rear=-(growth - ctx["moderate"]))
    return passed("rear lift grows moderately with yaw", measured=measured, limit=f"rise <= {ctx['growth']:+.2f}")


@rule("stability.yaw-front-lift", "Growth of front lift with yaw", "warning", needs=(),
      thresholds=(Threshold("growth", "0.08", "", "rise of cl_front from 0 to 10 deg of yaw that is too fast",
                            YAW_SOURCE),
                  Threshold("moderate", "0.05", "", "rise of cl_front from 0 to 10 deg that needs attention",
                            YAW_SOURCE)),
      sources=(YAW_SOURCE,))
def yaw_front_lift(sheet, ctx):
    """
    What it checks: how much the front lift coefficient rises from 0 to 10 deg of yaw.

    Why it matters: front lift at yaw lightens the steering in a crosswind gust, when the
    driver needs it most; a nose that lifts with yaw makes the car wander.

    How to fix: an effective air dam and a closed front underbody, rounded front corners
    (the windward corner separates at yaw) and air curtains; confirm on a proving ground.

    Known limits: needs a sweep with front lift at 0 and 10 deg; quasi-steady.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04,
            yaw_sweep: [{yaw: 0 deg, cd: 0.25, cl_front: 0.02}, {yaw: 5 deg, cd: 0.25, cl_front: 0.06}, {yaw: 10 deg, cd:
            0.25, cl_front: 0.12}]}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04, yaw_sweep:
            [{yaw: 0 deg, cd: 0.25, cl_front: 0.02}, {yaw: 5 deg, cd: 0.25, cl_front: 0.03}, {yaw: 10 deg, cd: 0.25,
            cl_front: 0.05}]}]}
    """
    found = sweep_at(sheet, "cl_front", 10)
    if found is None:
        return not_assessed("needs a yaw sweep with front lift from 0 to at least 10 deg",
                            missing=("results[].yaw_sweep[].cl_front",))
    growth = found[1] - found[0]
    measured = f"cl_front rises by {growth:+.3f} from 0 to 10 deg"
    if growth > ctx["growth"]:
        return major("front lift grows quickly with yaw", measured=measured, limit=f"<= {ctx['growth']:+.2f}",
                     margin=f"{growth - ctx['growth']:+.3f}", cl_front=-(growth - ctx["moderate"]))
    if growth > ctx["moderate"]:
        return minor("front lift grows noticeably with yaw", measured=measured, limit=f"<= {ctx['moderate']:+.2f}",
                     margin=f"{growth - ctx['moderate']:+.3f}", cl_front=-(growth - ctx["moderate"]))
    return passed("front lift grows moderately with yaw", measured=measured, limit=f"<= {ctx['moderate']:+.2f}")


YAW_DRAG_SOURCE = Source("passenger-car drag typically rises by 5-15 % from 0 to 10 deg of yaw; recalled, not checked",
                         "from memory")
J1252 = Source("SAE J1252, Wind Tunnel Test Procedure for Trucks and Buses (title confirmed; a summary of its 2012 "
               "revision names its wind-averaged drag derivation); the 1981 first issue and the 7 mph mean wind are "
               "recalled, not checked; computed by aeroreview.calc.wind", "standard")
YAW_RISE_EFFECT = Effect(25, 50, "{low}-{high} % of the drag rise above the moderate limit, as counts at zero yaw; "
                         "recalled, not checked", "from memory")


@rule("stability.yaw-drag-rise", "Rise of drag with yaw", "warning", needs=(), region="upper",
      thresholds=(Threshold("moderate", "15 %", "%", "rise of Cd from 0 to 10 deg that needs attention",
                            YAW_DRAG_SOURCE),
                  Threshold("steep", "25 %", "%", "rise of Cd from 0 to 10 deg that is too steep", YAW_DRAG_SOURCE)),
      sources=(YAW_DRAG_SOURCE, YAW_RISE_EFFECT))
def yaw_drag_rise(sheet, ctx):
    """
    What it checks: how much the drag coefficient rises from 0 to 10 deg of yaw in the
    sheet's yaw sweep.

    Why it matters: on the road a car is nearly always at a few degrees of yaw; a body
    whose drag climbs steeply with yaw loses on the road what it gained in the zero-yaw
    tunnel figure, and a steep rise points at a separation (leeward A-pillar, rear corners)
    that switches on at yaw.

    How to fix: round the windward front corners and the A-pillars, sharpen the rear
    corners, and check the rear end at yaw in CFD or the tunnel.

    Known limits: needs a sweep with Cd at 0 and 10 deg; the estimate is rough.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04,
            yaw_sweep: [{yaw: 0 deg, cd: 0.2320}, {yaw: 10 deg, cd: 0.3016}, {yaw: -10 deg, cd: 0.3016}]}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04, yaw_sweep:
            [{yaw: 0 deg, cd: 0.2320}, {yaw: 10 deg, cd: 0.2506}, {yaw: -10 deg, cd: 0.2506}]}]}
    """
    found = sweep_at(sheet, "cd", 10)
    if found is None:
        return not_assessed("needs a yaw sweep with Cd from 0 to at least 10 deg", missing=("results[].yaw_sweep",))
    rise = found[1] / found[0] - 1
    measured = f"Cd {found[0]:.3f} -> {found[1]:.3f} from 0 to 10 deg ({PERCENT(rise, 1, signed=True)})"
    excess = max(0.0, found[1] - found[0] * (1 + ctx["moderate"])) * 1000
    counts = YAW_RISE_EFFECT.counts(excess / 100)
    steep, moderate = (Reading(rise, PERCENT, at_most=ctx[name], places=1) for name in ("steep", "moderate"))
    if steep.beyond:
        return major("drag rises steeply with yaw", **steep.shown(measured), counts=counts)
    if moderate.beyond:
        return minor("drag rises noticeably with yaw", **moderate.shown(measured), counts=counts)
    return passed("drag rises moderately with yaw", **moderate.shown(measured, margin=False))


@rule("stability.wind-averaged-drag", "Wind-averaged drag against zero-yaw drag", "advisory", needs=(),
      thresholds=(Threshold("speed", "100 km/h", "km/h", "vehicle speed of the wind average", COMMON),
                  Threshold("ratio", "1.06", "", "wind-averaged / zero-yaw Cd above which yaw costs the car on the "
                                                 "road", YAW_DRAG_SOURCE)),
      sources=(J1252, YAW_DRAG_SOURCE))
def wind_averaged_drag(sheet, ctx):
    """
    What it checks: the SAE J1252 wind-averaged drag coefficient (a 7 mph wind from every
    direction with equal weight) against the zero-yaw Cd, at 100 km/h.

    Why it matters: the wind-averaged figure is what the car meets on average on the road;
    where it is much higher than the zero-yaw figure, the car's drag is yaw-sensitive and
    its tunnel figure flatters it.

    How to fix: as for a steep rise of drag with yaw: round the windward edges, sharpen the
    rear corners; compare variants on their wind-averaged figure.

    Known limits: needs a sweep that reaches the largest yaw the wind gives (6.5 deg at
    100 km/h); quasi-steady, and the 7 mph wind is the standard's, not a local climate.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04,
            yaw_sweep: [{yaw: 0 deg, cd: 0.2320}, {yaw: 4 deg, cd: 0.2598}, {yaw: 8 deg, cd: 0.2877}, {yaw: -4 deg, cd:
            0.2598}, {yaw: -8 deg, cd: 0.2877}]}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04, yaw_sweep:
            [{yaw: 0 deg, cd: 0.2320}, {yaw: 4 deg, cd: 0.2394}, {yaw: 8 deg, cd: 0.2468}, {yaw: -4 deg, cd: 0.2394}, {yaw:
            -8 deg, cd: 0.2468}]}]}
    """
    sweeps = [r for r in sheet.results if len(r.yaw_sweep) >= 2]
    if not sweeps:
        return not_assessed("needs a yaw sweep", missing=("results[].yaw_sweep",))
    sweep = max(sweeps, key=lambda r: len(r.yaw_sweep)).yaw_sweep
    yaw, cd = np.array([p.yaw for p in sweep]), np.array([p.cd for p in sweep])
    if np.abs(yaw).max() < max_yaw(ctx["speed"], J1252_WIND_SPEED) or np.abs(yaw).min() > 0:
        return not_assessed("the yaw sweep does not reach the yaw the J1252 wind gives", missing=("results[].yaw_sweep",))
    averaged = wind_averaged_cd(np.abs(yaw), cd, ctx["speed"])
    at_zero = float(np.interp(0, np.abs(yaw)[np.argsort(np.abs(yaw))], cd[np.argsort(np.abs(yaw))]))
    ratio = averaged / at_zero
    measured = f"Cd wind-averaged {averaged:.3f} / zero-yaw {at_zero:.3f} = {ratio:.3f} at {KM_H(ctx['speed'])}"
    if ratio > ctx["ratio"]:
        return minor("the wind-averaged drag is well above the zero-yaw figure", measured=measured,
                     limit=f"<= {ctx['ratio']:.2f}", margin=f"{ratio - ctx['ratio']:+.3f}")
    return passed("the wind-averaged drag is close to the zero-yaw figure", measured=measured,
                  limit=f"<= {ctx['ratio']:.2f}")


YAW_MOMENT_SOURCE = Source("yawing moment of passenger cars (SAE J1594 coefficient, on the frontal area and the "
                           "wheelbase): a rise of about 0.04-0.06 from 0 to 10 deg of yaw is usual, more points at a "
                           "crosswind-sensitive body; recalled, not checked. Checked on an online course summary of "
                           "crosswind aerodynamics: it grows almost linearly with yaw up to about 20 deg; rounded hood "
                           "edges and A-pillars lower it, a rounder nose in plan view and rounded rear side edges raise "
                           "it", "from memory")
CROSSWIND = Source("Hucho and Emmelmann, 'Theoretical prediction of the aerodynamic derivatives of a vehicle in cross "
                   "wind gusts', in Automotive Aerodynamics, SAE PT-78-16 (1978) 129-137 (title, authors, year, venue "
                   "and summary checked on a library record): the side force and yawing moment derivatives govern a "
                   "car's crosswind sensitivity", "published")


@rule("stability.yaw-moment", "Growth of the yawing moment with yaw", "warning", needs=(),
      thresholds=(Threshold("moderate", "0.06", "", "rise of cym from 0 to 10 deg of yaw that needs attention",
                            YAW_MOMENT_SOURCE),
                  Threshold("steep", "0.08", "", "rise of cym from 0 to 10 deg of yaw that is too steep",
                            YAW_MOMENT_SOURCE)),
      sources=(YAW_MOMENT_SOURCE, CROSSWIND, Source("effect: none on drag or axle lift; a crosswind handling risk, so "
                                                    "no counts; common practice", "common practice")))
def yaw_moment(sheet, ctx):
    """
    What it checks: how much the yawing moment coefficient (cym, SAE J1594: on the frontal
    area and the wheelbase, about mid-wheelbase on the ground) grows from 0 to 10 deg of yaw
    in the sheet's yaw sweep, its sign folded with the sign of yaw.

    Why it matters: a gust or an overtaking truck puts the car at yaw; the yawing moment then
    turns it, and the steeper the moment grows with yaw, the harder the driver must correct.
    A body that is sensitive here feels nervous in crosswind and on exposed bridges, whatever
    its drag.

    How to fix: take side force off the nose or put it on the tail: rounded hood side edges
    and A-pillars carry less side force at the front, sharp rear side edges more at the rear
    (a rounder nose in plan view and rounded rear side edges do the opposite, so a fix for drag
    at yaw can cost here); keep the rise below {moderate} per 10 deg. Confirm crosswind
    behaviour on a proving ground, in a crosswind facility or on gusty days.

    Known limits: needs a sweep with cym from 0 to at least 10 deg (interpolated between
    measured angles); quasi-steady, while gusts are transient; how much moment a car tolerates
    depends on its tyres, steering and mass, so the limits are a review aid, not a criterion.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04,
            yaw_sweep: [{yaw: 0 deg, cd: 0.25, cym: 0.0}, {yaw: 5 deg, cd: 0.25, cym: 0.045}, {yaw: 10 deg, cd: 0.25,
            cym: 0.09}]}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04, yaw_sweep:
            [{yaw: 0 deg, cd: 0.25, cym: 0.0}, {yaw: 10 deg, cd: 0.25, cym: 0.045}, {yaw: -10 deg, cd: 0.25,
            cym: -0.045}]}]}
    """
    found = sweep_at(sheet, "cym", 10, odd=True)
    if found is None:
        return not_assessed("needs a yaw sweep with the yawing moment from 0 to at least 10 deg",
                            missing=("results[].yaw_sweep[].cym",))
    growth = abs(found[1] - found[0])
    measured = f"cym rises by {growth:.3f} from 0 to 10 deg"
    if growth > ctx["steep"]:
        return major("the yawing moment grows steeply with yaw", measured=measured, limit=f"<= {ctx['steep']:.2f}",
                     margin=f"{growth - ctx['steep']:+.3f}")
    if growth > ctx["moderate"]:
        return minor("the yawing moment grows noticeably with yaw", measured=measured,
                     limit=f"<= {ctx['moderate']:.2f}", margin=f"{growth - ctx['moderate']:+.3f}")
    return passed("the yawing moment grows moderately with yaw", measured=measured, limit=f"<= {ctx['moderate']:.2f}")
