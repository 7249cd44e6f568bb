"""Sides and mirrors: what stands out of the body side into the flow."""

from __future__ import annotations

from aeroreview.display import CM2, MM, PERCENT, Reading
from aeroreview.rules import COMMON, COUNTS_PER_CD, Effect, Source, Threshold, major, minor, passed, rule

LARGE_MIRROR_CLASSES = ("van", "pickup")  # wide bodies and trailers need a larger field of view (common practice)


@rule("sides.mirror-area", "Mirror frontal area against the vehicle's", "warning",
      needs=("sides.mirror_area", "dimensions.frontal_area"), optional=("sides.mirror_kind", "vehicle.class"),
      thresholds=(Threshold("share", "1.6 %", "%", "mirror area / frontal area above which mirrors are large",
                            COMMON),
                  Threshold("share_large", "2.5 %", "%", "the same for vans and pickups, whose field of view "
                                                          "needs larger mirrors", COMMON)),
      sources=(Effect(0.4, 0.6, "mirror head Cd {low}-{high} on its own area, so mirrors cost 1000 x Cd_m x A_m / A "
                      "counts; from memory (Hucho 1998, chapter not checked)", "from memory"),
               Source("camera pods replacing mirrors: typical production figures 5-10 counts; from memory",
                      "from memory")))
def mirror_area(sheet, ctx):
    """
    What it checks: the frontal area of both mirror housings as a share of the vehicle's
    frontal area.

    Why it matters: a mirror is a small bluff body in the fast flow beside the A-pillar;
    with a drag coefficient of about 0.5 on its own area it costs counts in proportion to
    its area, and its wake runs along the side glass.

    How to fix: shrink the housing to the legal field of view, shape it with a sharp
    trailing edge and a tapered base, or replace the mirrors with cameras where the local
    regulations allow it.

    Vans and pickups are allowed larger mirrors ({share_large} of A): their width and trailers need
    the field of view, and the regulations set its minimum.

    Known limits: the interference with the A-pillar vortex can add or remove drag beyond
    the isolated estimate.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {sides.mirror_kind: conventional, sides.mirror_area: 0.05 m^2}}
        passes: {features: {sides.mirror_kind: camera, sides.mirror_area: 0.016 m^2}}
    """
    if sheet.get("sides.mirror_kind") == "none":
        return passed("no exterior mirrors", measured="none")
    area, frontal = sheet.get("sides.mirror_area"), sheet.get("dimensions.frontal_area")
    share = area / frontal
    allowed = ctx["share_large"] if sheet.get("vehicle.class") in LARGE_MIRROR_CLASSES else ctx["share"]
    cost = (1000 * ctx.effect().low * area / frontal, 1000 * ctx.effect().high * area / frontal)
    reading = Reading(share, PERCENT, at_most=allowed, places=2, limit_places=1)
    measured = f"{PERCENT(share, 2)} of A ({CM2(area)})"
    if reading.beyond:
        excess = (area - allowed * frontal) / frontal  # share of A above the limit
        return major(f"the mirrors are large; they cost about {cost[0]:.0f}-{cost[1]:.0f} counts in all",
                     **reading.shown(measured), counts=ctx.effect().counts(COUNTS_PER_CD * excess))
    return passed(f"mirror size is moderate (about {cost[0]:.0f}-{cost[1]:.0f} counts in all)",
                  **reading.shown(measured, margin=False))


@rule("sides.mirror-gap", "Gap between mirror housing and side glass", "warning",
      needs=("sides.mirror_gap",), optional=("sides.mirror_kind",),
      thresholds=(Threshold("gap", "45 mm", "mm", "gap below which the channel flow interferes", COMMON),),
      sources=(COMMON, Effect(1, 5, "{low}-{high} counts, and wind noise; from memory", "from memory")))
def mirror_gap(sheet, ctx):
    """
    What it checks: the clear gap between the mirror housing and the side glass.

    Why it matters: a narrow gap forms a channel where the mirror's and the pillar's flows
    interfere: local separation, drag and wind noise.

    How to fix: widen the gap to {gap} or more, or close it fully with a shaped stalk.

    Known limits: mirrors mounted on the door skin below the glass line are judged by the
    same number, which is a simplification.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {sides.mirror_gap: 30 mm}}
        passes: {features: {sides.mirror_gap: 60 mm}}
    """
    if sheet.get("sides.mirror_kind") == "none":
        return passed("no exterior mirrors", measured="none")
    gap = Reading(sheet.get("sides.mirror_gap"), MM, at_least=ctx["gap"])
    if gap.beyond:
        return major("the mirror sits close to the glass: channel flow, drag and noise", **gap.shown(),
                     counts=ctx.effect().counts())
    return passed("the mirror gap is clear", **gap.shown(margin=False))


@rule("sides.door-handles", "Door handles flush with the skin", "advisory",
      needs=("sides.door_handles",),
      sources=(Effect(1, 4, "protruding handles {low}-{high} counts; from memory", "from memory"),))
def door_handles(sheet, ctx):
    """
    What it checks: whether the door handles protrude from the skin.

    Why it matters: protruding handles are small bluff bodies along the side; each sheds a
    wake into the side boundary layer.

    How to fix: use flush or pop-out handles, or recess the handle into the skin.

    Known limits: the effect is small; flush handles bring their own cost and icing issues.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {sides.door_handles: protruding}}
        passes: {features: {sides.door_handles: flush}}
    """
    handles = sheet.get("sides.door_handles")
    if handles == "protruding":
        return minor("the door handles protrude into the flow", measured=handles, limit="flush or recessed",
                     counts=ctx.effect().counts())
    return passed("the door handles do not protrude", measured=handles)


@rule("sides.sill-step", "Sill set-back below the doors", "advisory",
      needs=("sides.sill_step",),
      thresholds=(Threshold("step", "15 mm", "mm", "set-back above which the side flow is drawn under", COMMON),),
      sources=(COMMON, Effect(1, 3, "{low}-{high} counts; from memory", "from memory")))
def sill_step(sheet, ctx):
    """
    What it checks: the inboard step of the sill below the door surface.

    Why it matters: a deep set-back lets the side flow curl under the body and feeds the
    underbody with disturbed air; a side skirt that continues the door line keeps the two
    flows apart.

    How to fix: bring the sill or side skirt out to within {step} of the door skin line.

    Known limits: styling often wants the shadow line; the drag effect is small.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {sides.sill_step: 30 mm}}
        passes: {features: {sides.sill_step: 8 mm}}
    """
    step = Reading(sheet.get("sides.sill_step"), MM, at_most=ctx["step"])
    if step.beyond:
        return minor("the sill is set back deeply below the doors", **step.shown(margin=False),
                     counts=ctx.effect().counts())
    return passed("the sill follows the door line", **step.shown(margin=False))


@rule("sides.panel-gap", "Shut-line gaps on the body side", "advisory",
      needs=("sides.panel_gap",),
      thresholds=(Threshold("gap", "5 mm", "mm", "nominal gap above which shut lines trip the side flow", COMMON),),
      sources=(COMMON, Effect(0.5, 2, "{low}-{high} counts, and wind noise; recalled, not checked", "from memory")))
def panel_gap(sheet, ctx):
    """
    What it checks: the nominal shut-line gap on the body side (doors, fenders, tailgate).

    Why it matters: each open gap across the flow is a small cavity; wide gaps trip the
    boundary layer, let air in and out of the door cavities and add wind noise and a little
    drag.

    How to fix: tighten the nominal gap ({gap} or less) or seal the gaps behind the skin with
    flush seals at the leading edges.

    Known limits: the drag effect is small; a sealed wide gap costs less than an open narrow one.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {sides.panel_gap: 7 mm}}
        passes: {features: {sides.panel_gap: 3.5 mm}}
    """
    gap = Reading(sheet.get("sides.panel_gap"), MM, at_most=ctx["gap"], places=1)
    if gap.beyond:
        return minor("the side shut lines are wide", **gap.shown(), counts=ctx.effect().counts())
    return passed("the shut lines are tight", **gap.shown(margin=False))
