"""Lift and stability: lift per axle at speed, as a share of what holds the car on the road.

These rules compute lift from the sheet's results (axle lift coefficients) at the review's
reference speed and at the vehicle's top speed. Their verdicts are review aids: lift and
stability must be confirmed by test before a vehicle is driven at speed.
"""

from __future__ import annotations

from dataclasses import dataclass

from aeroreview.calc.forces import axle_lift, axle_load_share, kilograms_force
from aeroreview.display import KG, KM_H, PERCENT, Reading
from aeroreview.rules import COMMON, Source, Threshold, major, minor, not_assessed, passed, rule
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
    unacceptable = Reading(share, PERCENT, at_most=ctx["major_share"], places=1)
    noticeable = Reading(share, PERCENT, at_most=ctx["minor_share"], places=1)
    shown_share = PERCENT(share, max(unacceptable.digits, noticeable.digits), signed=True)
    measured = (f"{shown_share} of the static {axle} axle load ({KG(kg, signed=True)}) at "
                f"{KM_H(sheet.get('powertrain.top_speed'))}; {KG(reference.kg(axle), signed=True)} at "
                f"{KM_H(reference_speed)}")
    details = {"top_speed": top, "reference_speed": reference, "strict_limits": strict}
    if unacceptable.beyond:
        return major(f"the {axle} axle loses more than {PERCENT(ctx['major_share'])} of its load at top speed",
                     **unacceptable.shown(measured), details=details)
    if noticeable.beyond:
        return minor(f"the {axle} axle unloads noticeably at top speed", **noticeable.shown(measured), details=details)
    return passed(f"{axle} axle lift at top speed is small", **noticeable.shown(measured, margin=False),
                  details=details)


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

    The limits know the vehicle: a car faster than {fast}, or a sports car, is held to two
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
    the same tighter limits apply above {fast} and to sports cars.

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
