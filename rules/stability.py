"""Lift and stability: lift per axle at speed, as a share of what holds the car on the road.

These rules compute lift from the sheet's results (axle lift coefficients) at the review's
reference speed and at the vehicle's top speed. Their verdicts are review aids: lift and
stability must be confirmed by test before a vehicle is driven at speed.
"""

from __future__ import annotations

import math

import numpy as np

from aeroreview.calc.forces import axle_lift, axle_load_share, kilograms_force
from aeroreview.rules import COMMON, Source, Threshold, major, minor, not_assessed, passed, rule

LIFT_SOURCE = Source("axle unloading limits for road cars at top speed; from memory (Hucho 1998, ch. 5, "
                     "driving stability), to be set per program", "from memory")


def lift_result(sheet):
    """The result with both axle lift coefficients, preferring full scale; None if there is none."""
    with_lift = [r for r in sheet.results if r.cl_front is not None and r.cl_rear is not None]
    return min(with_lift, key=lambda r: (r.scale < 1, r.kind == "estimate"), default=None)


def axle_figures(sheet, ctx, speed: float) -> dict | None:
    """Lift per axle [N, kg] and as a share of the static axle load at ``speed`` [m/s]."""
    result = lift_result(sheet)
    area = result.reference_area or sheet.get("dimensions.frontal_area") if result else None
    if result is None or area is None:
        return None
    front, rear = (float(x) for x in axle_lift(result.cl_front, result.cl_rear, area, speed, ctx.density))
    share_front, share_rear = (float(x) for x in axle_load_share(front, rear, sheet.get("mass.curb"),
                                                                 sheet.get("mass.front_axle_share")))
    return {"speed_km_h": speed * 3.6, "front_N": front, "rear_N": rear, "front_kg": float(kilograms_force(front)),
            "rear_kg": float(kilograms_force(rear)), "front_share": share_front, "rear_share": share_rear,
            "cl_front": result.cl_front, "cl_rear": result.cl_rear, "result": result.label}


def _unloading(sheet, ctx, axle: str):
    top = axle_figures(sheet, ctx, sheet.get("powertrain.top_speed"))
    if top is None:
        return not_assessed("needs a result with cl_front and cl_rear, and the frontal area",
                            missing=("results[].cl_front", "results[].cl_rear"))
    reference = axle_figures(sheet, ctx, ctx.reference_speed)
    share, kg = top[f"{axle}_share"], top[f"{axle}_kg"]
    measured = (f"{share * 100:+.1f} % of the static {axle} axle load ({kg:+.0f} kg) at {top['speed_km_h']:.0f} km/h; "
                f"{reference[f'{axle}_kg']:+.0f} kg at {reference['speed_km_h']:.0f} km/h")
    details = {"top_speed": top, "reference_speed": reference}
    if share > ctx["major_share"]:
        return major(f"the {axle} axle loses more than {ctx['major_share'] * 100:.0f} % of its load at top speed",
                     measured=measured, limit=f"<= {ctx['major_share'] * 100:.0f} %",
                     margin=f"{(share - ctx['major_share']) * 100:+.1f} %", details=details)
    if share > ctx["minor_share"]:
        return minor(f"the {axle} axle unloads noticeably at top speed", measured=measured,
                     limit=f"<= {ctx['minor_share'] * 100:.0f} %", margin=f"{(share - ctx['minor_share']) * 100:+.1f} %",
                     details=details)
    return passed(f"{axle} axle lift at top speed is small", measured=measured,
                  limit=f"<= {ctx['minor_share'] * 100:.0f} %", details=details)


YAW_SOURCE = Source("crosswind sensitivity of rear lift; from memory (Hucho 1998, ch. 5)", "from memory")
_NEEDS = ("mass.curb", "mass.front_axle_share", "powertrain.top_speed", "dimensions.frontal_area")


@rule("stability.rear-lift", "Rear axle unloading at top speed", "failure", needs=_NEEDS,
      thresholds=(Threshold("minor_share", "3 %", "%", "rear unloading that needs attention", LIFT_SOURCE),
                  Threshold("major_share", "6 %", "%", "rear unloading that is not acceptable", LIFT_SOURCE)),
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

    Known limits: static coefficients at zero yaw; rear lift usually rises with yaw, and
    pitch under load changes it. Lift coefficients come from the sheet's results.
    """
    return _unloading(sheet, ctx, "rear")


@rule("stability.front-lift", "Front axle unloading at top speed", "warning", needs=_NEEDS,
      thresholds=(Threshold("minor_share", "6 %", "%", "front unloading that needs attention", LIFT_SOURCE),
                  Threshold("major_share", "10 %", "%", "front unloading that is not acceptable", LIFT_SOURCE)),
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

    Known limits: as for rear lift: zero yaw, static ride height, coefficients from the sheet.
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


@rule("stability.yaw-rear-lift", "Growth of rear lift with yaw", "warning", needs=(),
      thresholds=(Threshold("growth", "0.10", "", "rise of cl_rear from 0 to 10 deg of yaw that needs attention",
                            YAW_SOURCE),),
      sources=(YAW_SOURCE,))
def yaw_rear_lift(sheet, ctx):
    """
    What it checks: how much the rear lift coefficient rises from 0 to 10 deg of yaw in the
    sheet's yaw sweep.

    Why it matters: gusts and overtaking trucks put a car at yaw; if rear lift grows
    quickly with yaw, the rear goes light exactly when a side force pushes it.

    How to fix: sharpen the rear separation edges, add a kick-up across the full width,
    and avoid a backlight near the critical angle, where yaw switches the flow state.

    Known limits: needs a sweep with rear lift at 0 and 10 deg (interpolated between
    measured angles); quasi-steady.
    """
    points = [p for r in sheet.results for p in r.yaw_sweep if p.cl_rear is not None]
    yaws = sorted({round(math.degrees(abs(p.yaw)), 6) for p in points})
    if not points or yaws[-1] < 10 or yaws[0] > 0:
        return not_assessed("needs a yaw sweep with rear lift from 0 to at least 10 deg",
                            missing=("results[].yaw_sweep[].cl_rear",))
    positive = sorted((abs(math.degrees(p.yaw)), p.cl_rear) for p in points)
    angles, values = zip(*positive)
    growth = float(np.interp(10, angles, values) - np.interp(0, angles, values))
    measured = f"cl_rear rises by {growth:+.3f} from 0 to 10 deg"
    if growth > ctx["growth"]:
        return major("rear lift grows quickly with yaw", measured=measured, limit=f"<= {ctx['growth']:+.2f}",
                     margin=f"{growth - ctx['growth']:+.3f}")
    return passed("rear lift grows moderately with yaw", measured=measured, limit=f"<= {ctx['growth']:+.2f}")
