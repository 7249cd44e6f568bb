"""Roof and rear: backlight, tapers and the edges where the flow leaves the body."""

from __future__ import annotations

import math

from aeroreview.calc.references import AHMED_SOURCE, ahmed_cd, ahmed_uncertainty
from aeroreview.display import DEG, M2, MM, PERCENT, Reading
from aeroreview.rules import (COMMON, COUNTS_PER_CD, HUCHO, HUCHO_SOVRAN, PER_PERCENT, Effect, Sensitivity, Source,
                              Threshold, major, minor, passed, rule)
from aeroreview.rules.body import BOX_CLASSES, body_scale

AHMED = Source(AHMED_SOURCE + ", SAE Transactions 93 (1984) 473-503 (title/authors/year/venue and abstract checked "
               "on a copy of the first page): critical slant angle about 30 deg, drag peak just below it; curve "
               "values: 25 deg quoted by a secondary source, the rest recalled, see aeroreview.calc.references",
               "published")
BAND = Source("practitioner's margin of about 4 deg around the published ~30 deg critical angle of the Ahmed body "
              "(Ahmed et al. 1984), with the drag rise beginning near 21 deg; the band itself is common practice, "
              "not a published figure", "common practice")
RADIUS_SOURCE = Source("Thacker, Aubrun, Leroy and Devinant, rounded roof-to-slant edge on the Ahmed body, recalled "
                       "as J. Wind Eng. Ind. Aerodyn. 107-108 (2012) (their Exp. Fluids paper is recalled as vol. 54, "
                       "2013); search found neither title nor abstract, so venue, volume and the 0.15 threshold are "
                       "recalled, not checked", "from memory")
TAPER_SOURCE = Source("Hucho 1998, boat-tailing (chapter not checked): drag falls with taper angle up to about 15 deg, "
                      "beyond which the flow separates from the taper; recalled, not checked", "from memory")
SQUARE_BACK_ANGLE = 40.0  # deg: the Ahmed curve is published from 0 to 40 deg and flat above 35 (Ahmed et al. 1984)


def slanted_rear(sheet) -> bool:
    """A slanted rear: a backlight angle is given and lies where the Ahmed behaviour matters (<= 40 deg)."""
    angle = sheet.get("rear.backlight_angle")
    return angle is not None and math.degrees(angle) <= SQUARE_BACK_ANGLE


@rule("rear.backlight-angle", "Backlight angle against the Ahmed critical region", "failure",
      needs=("rear.backlight_angle",), optional=("rear.roof_backlight_radius", "dimensions.frontal_area",
                                                  "dimensions.width", "dimensions.height"),
      thresholds=(
          Threshold("critical_low", "26 deg", "deg", "lower edge of the critical slant region", BAND),
          Threshold("critical_high", "34 deg", "deg", "upper edge of the critical slant region", BAND),
          Threshold("rising_low", "21 deg", "deg", "angle above which drag rises toward the peak", BAND),
          Threshold("generous_radius", "0.15", "", "roof-to-backlight radius / sqrt(A) that steadies the flow",
                    RADIUS_SOURCE),
      ),
      sources=(AHMED, BAND, RADIUS_SOURCE,
               Effect(0, 60, "a generous roof-to-backlight radius removes up to {high} % of the Ahmed-curve drag step, "
                      "in proportion to r / sqrt(A) up to the generous radius; recalled, not checked (rounded-edge "
                      "Ahmed studies)",
                      "from memory", name="radius"),
               Effect(20, 60, "{low}-{high} % of the Ahmed-curve drag step (with the curve's uncertainty); production "
                      "bodies respond less than the Ahmed body; recalled, not checked", "from memory")),
      applies_if=slanted_rear, figure="ahmed",
      sensitivity=Sensitivity("rear.backlight_angle", 3.2, "deg", (20, 28), "rising_low", Source(
          "the Ahmed curve rises about 8 counts per deg from 20 to 28 deg (SAE 840300, values from memory); x 0.4 "
          "for a production body, the middle of the rule's 20-60 %", "from memory")))
def backlight_angle(sheet, ctx):
    """
    What it checks: where the backlight (rear window) angle lies on the Ahmed-body drag
    curve, and whether a generous roof-to-backlight radius offsets a risky angle. It judges
    any slanted rear (a backlight angle up to 40 deg), whatever the body class.

    Why it matters: on a slanted rear, drag rises with slant angle as the C-pillar vortices
    strengthen, peaks just below about 30 deg, then drops abruptly when the flow separates
    from the whole slant. Near that critical angle the flow can switch between the two
    states with yaw, speed or a small shape change: high drag, high rear lift, and
    unstable, speed-dependent behaviour. A large roof-to-backlight radius keeps the flow
    attached and weakens the switch.

    How to fix: move the backlight angle out of the critical region from {critical_low} to
    {critical_high} (below about {rising_low} for an attached fastback flow, or above
    {critical_high} for a clean notchback or squareback separation), or enlarge the
    roof-to-backlight radius (r / sqrt(A) of {generous_radius} or more) and
    add a defined separation edge at the end of the backlight or a decklid kick-up.

    Known limits: the Ahmed body is a simple bluff body; a production car's C-pillar shape,
    side taper and decklid move the critical angle by several degrees. The effect estimate
    scales the Ahmed drag step, widened by the curve's uncertainty (+-0.03 on the steep
    28-30 deg segment), and is an order of magnitude, not a prediction. Backlights steeper
    than 40 deg are square-backs: the roof-taper and base rules judge them.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (failure): {features: {rear.backlight_angle: 29 deg, rear.roof_backlight_radius: 50 mm}}
        passes: {features: {rear.backlight_angle: 22 deg, rear.roof_backlight_radius: 380 mm}}
    """
    angle = sheet.get("rear.backlight_angle")
    degrees = math.degrees(angle)  # the Ahmed curve reads degrees
    low, high = math.degrees(ctx["critical_low"]), math.degrees(ctx["critical_high"])
    rising = math.degrees(ctx["rising_low"])
    radius = sheet.get("rear.roof_backlight_radius")
    scale = body_scale(sheet)
    ratio = radius / scale if radius is not None and scale else None
    generous = ratio is not None and ratio >= ctx["generous_radius"]
    radius_text = f"; roof radius r / sqrt(A) = {ratio:.2f}" if ratio is not None else "; roof radius not given"
    measured = f"{DEG(angle, 1)}{radius_text}"
    region = f"outside {DEG.span(ctx['critical_low'], ctx['critical_high'])}"
    beyond = min(max(high + 1, 35.0), SQUARE_BACK_ANGLE)  # past the region, on the published curve
    reference = min(ahmed_cd(min(rising, degrees)), ahmed_cd(beyond))
    step, spread = float(ahmed_cd(degrees) - reference), float(ahmed_uncertainty(degrees))
    share = 1.0 if generous else (ratio / ctx["generous_radius"] if ratio else 0.0)  # a ratio below the limit
    steadied = 1 - ctx.effect("radius").high * PER_PERCENT * share  # the radius lowers the estimate too
    per_percent = COUNTS_PER_CD * PER_PERCENT * steadied  # counts per % of the Ahmed step
    counts = ctx.effect().counts(per_percent * (step - spread), per_percent * (step + spread))
    details = {"ahmed_step": round(step, 4), "ahmed_uncertainty": spread, "radius_factor": round(steadied, 3)}
    if low <= degrees <= high:
        margin = f"{DEG(min(angle - ctx['critical_low'], ctx['critical_high'] - angle), 1)} inside the region"
        if generous:
            return minor("the backlight lies in the critical region, steadied by a generous roof radius",
                         measured=measured, limit=region, margin=margin,
                         counts=counts, cl_rear=-0.03, details=details)
        return major("the backlight lies in the critical region of the Ahmed curve: high drag and a flow that can "
                     "switch state", measured=measured, limit=region, margin=margin,
                     counts=counts, cl_rear=-0.05, details=details)
    if rising < degrees < low and not generous:
        return minor("the backlight is on the rising part of the Ahmed curve, close to the critical region",
                     measured=measured, limit=f"<= {DEG(ctx['rising_low'])} or a generous roof radius",
                     margin=f"{DEG(ctx['critical_low'] - angle, 1)} below the region", counts=counts, cl_rear=-0.02,
                     details=details)
    return passed("the backlight angle is clear of the critical region", measured=measured,
                  limit=region)


TAPER_REACH = 5.0  # deg past the useful limit where most of the taper gain is won (from memory, with TAPER_EFFECT)
TAPER_EFFECT = Effect(0.8, 2, "about {low}-{high} counts per degree of useful taper missing (up to "
                      f"{TAPER_REACH:g} deg past the useful limit); from memory", "from memory")
OVER_TAPER_EFFECT = Effect(3, 12, "{low}-{high} counts for a taper steeper than the flow can follow; from memory",
                           "from memory", name="over")


def _taper(sheet, ctx, key: str, where: str):
    angle = Reading(sheet.get(key), DEG, at_least=ctx["useful"], at_most=ctx["separation"], places=1)
    if angle.above:
        return major(f"the {where} taper is steeper than the flow can follow: separation returns", **angle.shown(),
                     counts=ctx.effect("over").counts())
    if angle.below:
        missing = math.degrees(ctx["useful"]) + TAPER_REACH - math.degrees(angle.value)
        return minor(f"the {where} has little or no taper: free drag reduction left on the table", **angle.shown(),
                     counts=ctx.effect().counts(missing))
    return passed(f"the {where} taper is in the useful range", **angle.shown(margin=False))


_TAPER_THRESHOLDS = (
    Threshold("useful", "4 deg", "deg", "taper below which little pressure is recovered", TAPER_SOURCE),
    Threshold("separation", "16 deg", "deg", "taper above which the flow separates from it", TAPER_SOURCE),
)


@rule("rear.side-taper", "Rear plan-view taper (boat-tailing)", "warning",
      needs=("rear.side_taper_angle",), thresholds=_TAPER_THRESHOLDS,
      sources=(TAPER_SOURCE, TAPER_EFFECT, OVER_TAPER_EFFECT),
      sensitivity=Sensitivity("rear.side_taper_angle", -1.5, "deg", (0, 15), "useful", TAPER_SOURCE))
def side_taper(sheet, ctx):
    """
    What it checks: the plan-view taper of the body sides over the last part of the body.

    Why it matters: tapering the rear in plan view shrinks the wake and raises the base
    pressure; drag falls with taper angle up to about 15 deg. Steeper than that, the flow
    cannot follow the surface, separates at the start of the taper, and the gain is lost.

    How to fix: taper the rear quarters and lamps by {useful} to about 15 deg over the last 300 mm
    or more, ending in a sharp separation edge; above {separation}, flatten the taper or shorten it and add
    an edge where it begins.

    Known limits: one angle describes the taper; its length and the curvature where it
    starts matter as much.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {rear.side_taper_angle: 20 deg}}
        passes: {features: {rear.side_taper_angle: 9 deg}}
    """
    return _taper(sheet, ctx, "rear.side_taper_angle", "side")


@rule("rear.roof-taper", "Roof drop toward the rear (side-view boat-tailing)", "warning",
      needs=("rear.roof_taper_angle",), optional=("rear.backlight_angle",), thresholds=_TAPER_THRESHOLDS,
      sources=(TAPER_SOURCE, TAPER_EFFECT, OVER_TAPER_EFFECT),
      applies_if=lambda sheet: not slanted_rear(sheet),
      sensitivity=Sensitivity("rear.roof_taper_angle", -1.5, "deg", (0, 15), "useful", TAPER_SOURCE))
def roof_taper(sheet, ctx):
    """
    What it checks: the side-view drop of the roof over its last part on square-backed
    bodies: no backlight angle given, or one steeper than 40 deg, whatever the class.

    Why it matters: as on the sides, a moderate roof drop shrinks the wake and raises base
    pressure; beyond about 15 deg the flow separates and the drop only adds rear lift.

    How to fix: drop the roof or the roof spoiler by 5-15 deg over its last 300 mm, ending
    in a sharp edge.

    Known limits: where the rear is slanted (a backlight of 40 deg or less), the roof end is
    the backlight and the backlight rule judges it; this rule then does not run, so the
    backlight's slope is never charged twice as a roof taper.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {vehicle.class: suv, rear.backlight_angle: 60 deg, rear.roof_taper_angle: 16.5 deg}}
        passes: {features: {vehicle.class: suv, rear.backlight_angle: 60 deg, rear.roof_taper_angle: 8 deg}}
    """
    return _taper(sheet, ctx, "rear.roof_taper_angle", "roof")


@rule("rear.separation-edge", "Defined separation edges at the rear", "warning",
      needs=("rear.separation_edge_radius",),
      thresholds=(Threshold("radius", "10 mm", "mm", "edge radius above which the separation line wanders", COMMON),),
      sources=(COMMON, HUCHO_SOVRAN, Effect(3, 12, "{low}-{high} counts; from memory", "from memory")))
def separation_edge(sheet, ctx):
    """
    What it checks: that the rear edges where the flow should leave the body (tail lamp
    corners, decklid end, roof spoiler end) are sharp.

    Why it matters: a rounded rear edge lets the flow wrap around it; the separation line
    then moves with speed and yaw, the wake grows and the base pressure falls.

    How to fix: make the rear edges sharp (radius {radius} or less) along the whole perimeter
    of the base; lamp and bumper parting lines can carry the edge.

    Known limits: one radius for the whole perimeter; a locally rounded corner matters less.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {rear.separation_edge_radius: 25 mm}}
        passes: {features: {rear.separation_edge_radius: 3 mm}}
    """
    radius = Reading(sheet.get("rear.separation_edge_radius"), MM, at_most=ctx["radius"])
    if radius.beyond:
        return major("the rear edges are rounded: the separation line is not fixed", **radius.shown(),
                     counts=ctx.effect().counts())
    return passed("the rear edges fix the separation line", **radius.shown(margin=False))


@rule("rear.spoiler", "Rear spoiler or kick-up height", "advisory",
      needs=("rear.spoiler_height",),
      thresholds=(Threshold("minimum", "10 mm", "mm", "height below which a kick-up does little", COMMON),
                  Threshold("maximum", "80 mm", "mm", "height above which the spoiler's own drag dominates", HUCHO)),
      sources=(HUCHO, Effect(2, 8, "{low}-{high} counts and 0.02-0.06 less rear lift; from memory", "from memory"),
               Effect(2, 6, "{low}-{high} counts for a spoiler above the maximum height (its own drag); from memory",
                      "from memory", name="tall")))
def spoiler(sheet, ctx):
    """
    What it checks: the height of the rear spoiler or decklid kick-up above the local surface.

    Why it matters: a small kick-up at the trailing edge raises the base pressure and cuts
    rear lift; a tall spoiler produces more downforce but pays for it in drag.

    How to fix: add a kick-up or spoiler lip of {minimum} to about 40 mm at the decklid or roof
    end; above {maximum}, lower it unless the rear lift target demands it.

    Known limits: the best height depends on the backlight and decklid; check rear lift
    and stability before and after any change.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {rear.spoiler_height: 0 mm}}
        passes: {features: {rear.spoiler_height: 22 mm}}
    """
    height = Reading(sheet.get("rear.spoiler_height"), MM, at_least=ctx["minimum"], at_most=ctx["maximum"])
    if height.below:
        return minor("no effective kick-up or spoiler at the rear edge", **height.shown(margin=False),
                     counts=ctx.effect().counts(), cl_rear=-0.04)
    if height.above:
        return minor("the spoiler is tall: check that its drag is paid for by the rear lift target",
                     **height.shown(margin=False), counts=ctx.effect("tall").counts())
    return passed("the rear kick-up height is in the useful range", **height.shown(margin=False))


@rule("rear.roof-rails", "Roof rails", "warning", region="appendages",
      needs=("rear.roof_rails",),
      sources=(Effect(5, 15, "raised rails {low}-{high} counts; from memory (published production-car comparisons)",
                      "from memory"),))
def roof_rails(sheet, ctx):
    """
    What it checks: whether the roof rails stand on feet in the flow.

    Why it matters: raised rails add frontal area high on the body, where the flow is
    fastest, and disturb the roof boundary layer that the rear end depends on.

    How to fix: use flush rails integrated into the roof, or offer raised rails as an
    accessory only.

    Known limits: the estimate is for rails without cross bars; bars and loads cost far more.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {rear.roof_rails: raised}}
        passes: {features: {rear.roof_rails: none}}
    """
    rails = sheet.get("rear.roof_rails")
    if rails == "raised":
        return major("raised roof rails stand in the fastest flow on the body", measured="raised", limit="flush or none",
                     counts=ctx.effect().counts())
    return passed("no raised roof rails", measured=rails)


@rule("rear.base-area", "Base (wake) area against the frontal area", "advisory",
      needs=("rear.base_area", "dimensions.frontal_area"), optional=("vehicle.class",),
      thresholds=(Threshold("car_share", "40 %", "%", "base area / frontal area above which a car's base is large",
                            COMMON),
                  Threshold("box_share", "85 %", "%", "the same for upright bodies (vans, SUVs, pickups, crossovers)",
                            COMMON)),
      sources=(Effect(0.15, 0.25, "base drag = -Cp_base x A_base / A with a base pressure coefficient of about -{low} "
                      "to -{high} on passenger cars; Hucho 1998 (chapter not checked), recalled, not checked",
                      "from memory"), HUCHO))
def base_area(sheet, ctx):
    """
    What it checks: the area of the near-vertical rear face (the base the wake starts from)
    as a share of the frontal area, with a larger allowance for upright bodies.

    Why it matters: the base sits in the low pressure of the wake; its drag is roughly the
    base pressure coefficient times the base area. Every square decimetre taken off the
    base by tapering the sides, the roof or the diffuser is drag saved.

    How to fix: shrink the base with side and roof tapers and a diffuser, ending each in a
    sharp edge; keep the base flat and free of pockets.

    Known limits: the base pressure itself depends on the tapers and the underbody flow;
    the estimate assumes a usual car base pressure.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {rear.base_area: 1.2 m^2}}
        passes: {features: {rear.base_area: 0.8 m^2}}
    """
    share = sheet.get("rear.base_area") / sheet.get("dimensions.frontal_area")
    limit_share = ctx["box_share"] if sheet.get("vehicle.class") in BOX_CLASSES else ctx["car_share"]
    reading = Reading(share, PERCENT, at_most=limit_share)
    measured = f"{PERCENT(share, reading.digits)} of A ({M2(sheet.get('rear.base_area'), 2)})"
    if reading.beyond:
        excess = share - limit_share
        return minor("the base is large: its wake pressure acts on a large area", **reading.shown(measured),
                     counts=ctx.effect().counts(COUNTS_PER_CD * excess))
    return passed("the base is compact", **reading.shown(measured, margin=False))
