"""Windshield and A-pillars: the flow over the glass and around the pillars into the sides."""

from __future__ import annotations

import math

from aeroreview.display import DEG, MM, Reading
from aeroreview.rules import COMMON, HUCHO, Effect, Sensitivity, Source, Threshold, major, minor, passed, rule


@rule("windshield.angle", "Windshield inclination", "warning",
      needs=("windshield.angle",),
      thresholds=(Threshold("upright", "40 deg", "deg", "inclination from horizontal above which the screen is upright",
                            HUCHO),
                  Threshold("steep", "33 deg", "deg", "inclination from horizontal above which gains remain", HUCHO)),
      sources=(Source("Hucho 1998 (chapter not checked): drag falls as the windshield is laid back to about 30 deg "
                      "from horizontal (60 deg rake), with little gain beyond; recalled, not checked", "from memory"),
               Effect(0.7, 1.3, "{low}-{high} counts per degree above the steep limit (about 1 count per degree), "
                      "from memory", "from memory")),
      applies_to=("sedan", "fastback", "hatchback", "estate", "crossover", "suv", "sports"),
      sensitivity=Sensitivity("windshield.angle", 1.0, "deg", (30, 50), "steep", Source(
          "about 1 count per degree above 33 deg (Hucho 1998, chapter not checked, recalled)", "from memory")))
def windshield_angle(sheet, ctx):
    """
    What it checks: the windshield inclination from horizontal in the side view.

    Why it matters: a more upright windshield raises the stagnation pressure on the glass
    and the suction peak at the header; laying it back lowers drag until about 30 deg from
    horizontal, beyond which the gain is small and visibility, heat load and weight suffer.

    How to fix: lay the windshield back (move the cowl forward or the header rearward),
    or, where the package fixes the angle, increase the header radius to keep the roof flow
    attached.

    Known limits: the gain also depends on the header radius and the hood-to-glass angle;
    vans and pickups are excluded because their packages fix the screen.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {windshield.angle: 45 deg}}
        passes: {features: {windshield.angle: 27 deg}}
    """
    angle = sheet.get("windshield.angle")
    upright = Reading(angle, DEG, at_most=ctx["upright"], places=1)
    steep = Reading(angle, DEG, at_most=ctx["steep"], places=1)
    measured = f"{DEG(angle, max(upright.digits, steep.digits))} from horizontal"
    over = math.degrees(angle) - math.degrees(ctx["steep"])
    if upright.beyond:
        return major("the windshield is upright; laying it back is a large gain", **upright.shown(measured),
                     counts=ctx.effect().counts(over))
    if steep.beyond:
        return minor("the windshield is steeper than the usual optimum", **steep.shown(measured),
                     counts=ctx.effect().counts(over))
    return passed("the windshield is laid back", **steep.shown(measured, margin=False))


@rule("windshield.a-pillar-radius", "A-pillar edge radius", "warning",
      needs=("windshield.a_pillar_radius",),
      thresholds=(Threshold("sharp", "15 mm", "mm", "radius below which the pillar flow separates", COMMON),
                  Threshold("comfortable", "25 mm", "mm", "radius with margin at yaw", COMMON)),
      sources=(COMMON,
               Effect(2, 8, "{low}-{high} counts, and wind noise; from memory (Hucho 1998, A-pillar vortex, chapter "
                      "not checked)", "from memory"),
               Effect(1, 3, "{low}-{high} counts for a radius between the sharp and the comfortable limit; from memory",
                      "from memory", name="margin")))
def a_pillar_radius(sheet, ctx):
    """
    What it checks: the radius of the A-pillar edge between the windshield and the side glass.

    Why it matters: a sharp pillar sheds a strong conical vortex onto the side glass; it
    adds drag, raises wind noise and soils the side glass. At yaw the leeward pillar
    separates first.

    How to fix: increase the pillar radius ({comfortable} or more), or shape the glass and the
    pillar trim so that the transition is continuous.

    Known limits: one radius at mid height; drag is less sensitive than wind noise here.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {windshield.a_pillar_radius: 8 mm}}
        passes: {features: {windshield.a_pillar_radius: 38 mm}}
    """
    radius = sheet.get("windshield.a_pillar_radius")
    sharp = Reading(radius, MM, at_least=ctx["sharp"])
    comfortable = Reading(radius, MM, at_least=ctx["comfortable"])
    if sharp.beyond:
        return major("the A-pillar is sharp: strong pillar vortex, drag and wind noise", **sharp.shown(),
                     counts=ctx.effect().counts())
    if comfortable.beyond:
        return minor("the A-pillar radius leaves little margin at yaw", **comfortable.shown(margin=False),
                     counts=ctx.effect("margin").counts())
    return passed("the A-pillar is well rounded", **comfortable.shown(margin=False))


@rule("windshield.a-pillar-step", "Step from windshield to A-pillar trim", "warning",
      needs=("windshield.a_pillar_step",),
      thresholds=(Threshold("step", "6 mm", "mm", "step height above which the pillar acts as a fence", COMMON),),
      sources=(COMMON, Effect(1, 5, "{low}-{high} counts; from memory", "from memory")))
def a_pillar_step(sheet, ctx):
    """
    What it checks: the height of the step from the windshield surface to the A-pillar
    trim (the rain gutter).

    Why it matters: a deep gutter works as a fence that trips the flow into the pillar
    vortex; it adds drag and is a leading source of wind noise.

    How to fix: bring the glass flush with the pillar (flush glazing), or keep the gutter
    below {step} and round its edge.

    Known limits: water management may need a gutter; the rule does not weigh that.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {windshield.a_pillar_step: 10 mm}}
        passes: {features: {windshield.a_pillar_step: 2 mm}}
    """
    step = Reading(sheet.get("windshield.a_pillar_step"), MM, at_most=ctx["step"], places=1)
    if step.beyond:
        return major("the A-pillar step is deep enough to trip the flow", **step.shown(), counts=ctx.effect().counts())
    return passed("the glazing is flush enough", **step.shown(margin=False))


@rule("windshield.header-radius", "Windshield header radius", "advisory",
      needs=("windshield.header_radius",),
      thresholds=(Threshold("radius", "60 mm", "mm", "header radius below which the roof flow may separate", COMMON),),
      sources=(COMMON, Effect(1, 5, "{low}-{high} counts; from memory", "from memory")))
def header_radius(sheet, ctx):
    """
    What it checks: the radius of the windshield-to-roof transition (the header).

    Why it matters: the flow accelerates strongly over the header; a tight radius can
    separate it, thickening the boundary layer that reaches the rear of the roof.

    How to fix: soften the header radius ({radius} or more), or lay the windshield back.

    Known limits: a small radius may still hold attached flow on a well laid-back screen.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {windshield.header_radius: 30 mm}}
        passes: {features: {windshield.header_radius: 120 mm}}
    """
    radius = Reading(sheet.get("windshield.header_radius"), MM, at_least=ctx["radius"])
    if radius.beyond:
        return minor("the header radius is tight", **radius.shown(margin=False), counts=ctx.effect().counts())
    return passed("the header radius is generous", **radius.shown(margin=False))


@rule("windshield.wipers", "Wipers parked out of the flow", "advisory",
      needs=("windshield.wipers_concealed",),
      sources=(Effect(1, 3, "{low}-{high} counts; from memory", "from memory"),))
def wipers(sheet, ctx):
    """
    What it checks: whether the parked wipers sit below the hood trailing edge.

    Why it matters: exposed wiper arms and blades stand in the high-speed flow at the base
    of the windshield and add drag and noise.

    How to fix: park the wipers below the hood line, or extend the hood trailing edge over them.

    Known limits: the effect is small; it is listed because it is cheap to fix early.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {windshield.wipers_concealed: false}}
        passes: {features: {windshield.wipers_concealed: true}}
    """
    if sheet.get("windshield.wipers_concealed"):
        return passed("the wipers are concealed", measured="concealed")
    return minor("the parked wipers stand in the flow", measured="exposed", limit="concealed",
                 counts=ctx.effect().counts())
