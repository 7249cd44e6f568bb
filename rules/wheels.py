"""Wheels and wheelhouses: rotating, open, and responsible for a quarter of a car's drag."""

from __future__ import annotations

from aeroreview.display import MM, PERCENT, Reading
from aeroreview.rules import COMMON, Effect, Sensitivity, Source, Threshold, major, minor, passed, rule

WHEEL_SOURCE = Source("rim design changes a car's drag by 10-20 counts: recalled, not checked. Looked for: SAE 970133 "
                      "(Wickern, Zwicker and Pfadenhauer 1997) is confirmed on a copy of its cover to be on rotating "
                      "wheels and tunnel technique, not rim openness, so it is no longer cited here; SAE 2009-01-0778 "
                      "was not found; SAE 2010-01-0756 (abstract checked on the SAE page, authors not checked) "
                      "confirms on-road drag benefits of wheel and wheel-cover designs", "from memory")
WASCHLE = Source("Waschle, 'The influence of rotating wheels on vehicle aerodynamics - numerical and experimental "
                 "investigations', SAE 2007-01-0107 (title/author/year/venue and abstract checked on the SAE page): "
                 "several rim geometries compared, rotating and stationary", "published")
REFERENCE_RIM = 18 * 0.0254  # m: the rim size the counts per openness were recalled for (from memory)
RIM_EFFECT_STEP = 0.10  # the open share the rim effect is quoted per (10 %)
TYRE_EFFECT_STEP = 10.0  # mm of section width the tyre effect is quoted per


@rule("wheels.rim-openness", "Rim openness", "warning",
      needs=("wheels.rim_openness",),
      thresholds=(Threshold("open", "35 %", "%", "open share above which the rims pump air", WHEEL_SOURCE),
                  Threshold("closed", "20 %", "%", "open share a low-drag rim reaches", WHEEL_SOURCE)),
      optional=("wheels.rim_diameter",),
      sources=(WHEEL_SOURCE, WASCHLE, Effect(3, 6, "about {low}-{high} counts per 10 % of openness closed on 18 inch "
                                             "rims, scaled with the rim disc area; recalled, not checked",
                                             "from memory")),
      sensitivity=Sensitivity("wheels.rim_openness", 0.45, "%", (10, 60), "closed", Source(
          "the middle of about 3-6 counts per 10 % of openness", "from memory")))
def rim_openness(sheet, ctx):
    """
    What it checks: the open share of the rim face (open area between the spokes over the
    rim disc area).

    Why it matters: open spokes act as a fan: the rotating wheel pumps air out of the
    wheelhouse into the side flow, and the spokes themselves meet the flow at the top of
    the wheel at twice the vehicle speed. Closing the rim is one of the largest single
    gains on a modern car.

    How to fix: close the rim face to {closed} or less with flat spokes or an aero insert,
    keeping enough opening for brake cooling (check with the brake team).

    Known limits: the spoke shape and the rim's outer lip matter beside the open share;
    brake cooling sets a floor. The estimate scales with the rim disc area when the rim
    diameter is given.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {wheels.rim_openness: 50 %}}
        passes: {features: {wheels.rim_openness: 0.18}}
    """
    openness = sheet.get("wheels.rim_openness")
    size = (sheet.get("wheels.rim_diameter") or REFERENCE_RIM) / REFERENCE_RIM
    closable = (openness - ctx["closed"]) * size ** 2
    pumping, closed = Reading(openness, PERCENT, at_most=ctx["open"]), Reading(openness, PERCENT, at_most=ctx["closed"])
    measured = f"{PERCENT(openness, max(pumping.digits, closed.digits))} open"
    if pumping.beyond:
        return major("the rims are open: they pump wheelhouse air into the side flow", **pumping.shown(measured),
                     counts=ctx.effect().counts(closable / RIM_EFFECT_STEP))
    if closed.beyond:
        return minor("the rims could be closed further", **closed.shown(measured, margin=False),
                     counts=ctx.effect().counts(closable / RIM_EFFECT_STEP))
    return passed("the rims are closed", **closed.shown(measured, margin=False))


@rule("wheels.front-deflector", "Deflectors ahead of the front tyres", "advisory",
      needs=("wheels.front_deflector_height",),
      thresholds=(Threshold("minimum", "15 mm", "mm", "height below which the deflector does little", COMMON),
                  Threshold("maximum", "70 mm", "mm", "height above which its own drag dominates", COMMON)),
      sources=(COMMON, Effect(2, 8, "{low}-{high} counts; from memory (Hucho 1998, wheel spoilers)", "from memory"),
               Effect(1, 4, "{low}-{high} counts for a deflector above the maximum height (its own drag); from memory",
                      "from memory", name="tall")))
def front_deflector(sheet, ctx):
    """
    What it checks: the height of the deflector (tyre spat) ahead of each front tyre.

    Why it matters: the lower part of the front tyre meets the underbody flow head-on; a
    small deflector turns the flow around it and narrows the tyre wake. Too tall, the
    deflector becomes a bluff body of its own.

    How to fix: fit deflectors of 20-60 mm ahead of the front tyres, shaped to the tyre
    width.

    Known limits: the best height depends on the air dam and the tyre; tune in CFD or the tunnel.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.front_deflector_height: 0 mm}}
        passes: {features: {wheels.front_deflector_height: 35 mm}}
    """
    height = Reading(sheet.get("wheels.front_deflector_height"), MM, at_least=ctx["minimum"], at_most=ctx["maximum"])
    if height.below:
        return minor("no effective deflectors ahead of the front tyres", **height.shown(margin=False),
                     counts=ctx.effect().counts())
    if height.above:
        return minor("the front deflectors are tall enough to add drag of their own", **height.shown(margin=False),
                     counts=ctx.effect("tall").counts())
    return passed("the front tyre deflectors are in the useful range", **height.shown(margin=False))


@rule("wheels.rear-strakes", "Strakes ahead of the rear wheels", "advisory",
      needs=("wheels.rear_strakes",),
      sources=(COMMON, Effect(2, 6, "{low}-{high} counts; from memory", "from memory")))
def rear_strakes(sheet, ctx):
    """
    What it checks: whether strakes or spats stand ahead of the rear tyres.

    Why it matters: the rear tyres sit in the underbody flow that leaves the floor panels;
    a strake turns it around the tyre and keeps the tyre wake out of the diffuser.

    How to fix: add small strakes on the floor panel ahead of each rear tyre.

    Known limits: with a fully panelled floor and a diffuser, strakes mainly protect the
    diffuser; their gain shows best in CFD.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.rear_strakes: false}}
        passes: {features: {wheels.rear_strakes: true}}
    """
    if sheet.get("wheels.rear_strakes"):
        return passed("rear strakes are fitted", measured="fitted")
    return minor("no strakes ahead of the rear tyres", measured="none", limit="fitted", counts=ctx.effect().counts())


@rule("wheels.wheelhouse-gap", "Gap between tyre and wheel arch", "advisory",
      needs=("wheels.wheelhouse_gap",),
      thresholds=(Threshold("gap", "50 mm", "mm", "gap above which the wheelhouse volume pumps air", COMMON),),
      sources=(COMMON, Effect(2, 8, "{low}-{high} counts; from memory", "from memory")))
def wheelhouse_gap(sheet, ctx):
    """
    What it checks: the radial gap between the tyre and the arch lip at the top.

    Why it matters: a large wheelhouse lets the rotating wheel circulate more air, which
    leaves through the arch into the side flow and under the car.

    How to fix: reduce the gap (within the suspension travel and snow-chain clearance) or
    fit arch liners that close the volume above the tyre.

    Known limits: ride height and suspension travel set a floor the rule does not know.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.wheelhouse_gap: 70 mm}}
        passes: {features: {wheels.wheelhouse_gap: 32 mm}}
    """
    gap = Reading(sheet.get("wheels.wheelhouse_gap"), MM, at_most=ctx["gap"])
    if gap.beyond:
        return minor("the wheelhouse gap is large", **gap.shown(margin=False), counts=ctx.effect().counts())
    return passed("the wheelhouse is tight", **gap.shown(margin=False))


@rule("wheels.wheelhouse-vent", "Front wheelhouse vented to the side", "advisory",
      needs=("wheels.wheelhouse_vented",),
      sources=(Effect(2, 5, "{low}-{high} counts; from memory (production air breathers)", "from memory"),))
def wheelhouse_vent(sheet, ctx):
    """
    What it checks: whether the front wheelhouse is vented to the body side behind the arch
    (an air breather).

    Why it matters: the front wheelhouse is pressurised by the air curtain, the cooling
    outlet and the wheel; venting it behind the wheel releases that air along the side
    instead of through the arch opening and the underbody.

    How to fix: add an outlet in the fender behind the front wheel, ducted from the wheelhouse.

    Known limits: the gain depends on what feeds the wheelhouse; without air curtains or a
    wheelhouse cooling outlet it is small.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.wheelhouse_vented: false, cooling.outlet: underbody}}
        passes: {features: {wheels.wheelhouse_vented: true, cooling.outlet: wheelhouse}}
    """
    if sheet.get("wheels.wheelhouse_vented"):
        return passed("the front wheelhouse is vented", measured="vented")
    return minor("the front wheelhouse has no outlet behind the wheel", measured="closed", limit="vented",
                 counts=ctx.effect().counts())


@rule("wheels.rear-arch-exit", "Rear wheel arch trailing edge", "warning",
      needs=("wheels.rear_arch_exit_radius",),
      thresholds=(Threshold("radius", "10 mm", "mm", "trailing-edge radius above which wheelhouse air is drawn "
                                                   "along the side", COMMON),),
      sources=(COMMON, Effect(2, 6, "{low}-{high} counts; from memory", "from memory")))
def rear_arch_exit(sheet, ctx):
    """
    What it checks: the radius of the trailing edge of the rear wheel arch, where the
    wheelhouse air leaves to the side.

    Why it matters: a sharp trailing edge lets the wheelhouse air separate cleanly; a
    rounded one draws it along the rear quarter into the wake's edge, widening the wake and
    disturbing the side taper.

    How to fix: sharpen the trailing edge of the rear arch ({radius} radius or less), or add a
    small lip.

    Known limits: one radius; the arch liner shape behind it matters too.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {wheels.rear_arch_exit_radius: 20 mm}}
        passes: {features: {wheels.rear_arch_exit_radius: 3 mm}}
    """
    radius = Reading(sheet.get("wheels.rear_arch_exit_radius"), MM, at_most=ctx["radius"])
    if radius.beyond:
        return major("the rear arch trailing edge is rounded", **radius.shown(), counts=ctx.effect().counts())
    return passed("the rear arch trailing edge is sharp", **radius.shown(margin=False))


TYRE_EFFECT = Effect(1, 2, "wider tyres raise drag by roughly {low}-{high} counts per 10 mm of section width on a "
                     "passenger car; recalled, not checked", "from memory")


@rule("wheels.tyre-width", "Tyre width and the wheel wake", "advisory",
      needs=("wheels.tyre_width", "dimensions.width"), optional=("front.air_curtains", "wheels.front_deflector_height"),
      thresholds=(Threshold("share", "12.5 %", "%", "tyre width / vehicle width above which the wheel wakes widen",
                            TYRE_EFFECT.source),
                  Threshold("deflector", "15 mm", "mm", "front deflector height that counts as wake treatment",
                            COMMON)),
      sources=(TYRE_EFFECT, COMMON))
def tyre_width(sheet, ctx):
    """
    What it checks: the tyre section width as a share of the vehicle width, and whether a
    wide tyre's wake is treated (air curtains or deflectors ahead of the front tyres).

    Why it matters: the tyres stand in the flow below the body; a wider tyre presents more
    frontal area and sheds a wider wake along the side and into the underbody.

    How to fix: choose the narrowest tyre the handling and braking targets allow, and treat
    the wake with air curtains or deflectors shaped to the tyre width.

    Known limits: the tyre's shoulder and sidewall shape matter as much (see the
    tyre-shoulder rule); the wake treatment halves the estimate, a rough figure.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.tyre_width: 275 mm}}
        passes: {features: {wheels.tyre_width: 235 mm}}
    """
    width = sheet.get("wheels.tyre_width")
    share = width / sheet.get("dimensions.width")
    treated = bool(sheet.get("front.air_curtains")) or \
        (sheet.get("wheels.front_deflector_height") or 0.0) >= ctx["deflector"]
    reading = Reading(share, PERCENT, at_most=ctx["share"], places=1, limit_places=1)
    wake = "treated" if treated else "untreated"
    measured = f"{MM(width)} = {PERCENT(share, reading.digits)} of the width; wake {wake}"
    if reading.beyond:
        excess_mm = (share - ctx["share"]) * sheet.get("dimensions.width") * 1000
        scale = 0.5 if treated else 1.0
        return minor("the tyres are wide for the car: wider wheel wakes", **reading.shown(measured),
                     counts=ctx.effect().counts(excess_mm / TYRE_EFFECT_STEP * scale))
    return passed("the tyre width suits the car", **reading.shown(measured, margin=False))


@rule("wheels.tyre-shoulder", "Tyre shoulder shape", "advisory",
      needs=("wheels.tyre_shoulder",),
      sources=(Source("rounded tyre shoulders and smooth sidewalls lower wheel drag by a few counts against square "
                      "shoulders; recalled, not checked", "from memory"),
               Effect(1, 4, "{low}-{high} counts; recalled, not checked", "from memory")))
def tyre_shoulder(sheet, ctx):
    """
    What it checks: whether the tyres fitted have rounded or square shoulders (the
    transition from tread to sidewall).

    Why it matters: the flow leaves the front tyre at its shoulders; a square shoulder fixes
    a wide separation and a wide wake, a rounded one lets the flow turn around the tyre a
    little further.

    How to fix: choose a tyre with a rounded shoulder and a smooth, lettering-free upper
    sidewall, with the tyre supplier.

    Known limits: tyre choice is ruled by grip, wear, noise and rolling resistance first;
    the drag effect is small and varies between tyres.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.tyre_shoulder: square}}
        passes: {features: {wheels.tyre_shoulder: rounded}}
    """
    shoulder = sheet.get("wheels.tyre_shoulder")
    if shoulder == "square":
        return minor("square tyre shoulders widen the tyre wake", measured=shoulder, limit="rounded",
                     counts=ctx.effect().counts())
    return passed("the tyre shoulders are rounded", measured=shoulder, limit="rounded")
