"""Underbody and diffuser: a smooth floor and a rear upsweep the flow can follow."""

from __future__ import annotations

import math

from aeroreview.display import DEG, MM, PERCENT, RATIO, Reading
from aeroreview.rules import COMMON, Effect, Sensitivity, Source, Threshold, major, minor, passed, rule

DIFFUSER_SOURCE = Source("Ruhrmann and Zhang, 'Influence of diffuser angle on a bluff body in ground effect', J. "
                         "Fluids Eng., ASME (2003), doi 10.1115/1.1537252 (title/authors/DOI and abstract checked): "
                         "5 and 10 deg diffusers stay well-behaved, 15-20 deg show separation and hysteresis; the 10 and "
                         "12 deg limits are placed between those tested angles; the year (2003) is recalled, so the "
                         "source is not marked published", "from memory")
COOPER = Source("Cooper, Bertenyi, Dutil, Syms and Sovran, 'The aerodynamic performance of automotive underbody "
                "diffusers', SAE 980030 (1998, SP-1318) (title/authors/year/venue confirmed on a copy of the cover "
                "page): diffuser performance depends on its area ratio and length, not its angle alone; the ratio "
                "limits used here are recalled, not checked", "published")


@rule("underbody.panel-coverage", "Underbody panel coverage", "warning",
      needs=("underbody.panel_coverage",),
      optional=("powertrain.kind",),
      thresholds=(Threshold("target", "80 %", "%", "coverage a current car reaches", COMMON),
                  Threshold("battery_target", "90 %", "%", "coverage an electric vehicle's flat battery floor makes "
                                                           "easy to reach", COMMON),
                  Threshold("poor", "50 %", "%", "coverage below which the underbody is largely open", COMMON)),
      sources=(COMMON, Effect(20, 50, "a fully panelled floor saves {low}-{high} counts against an open one, in "
                              "proportion to the coverage gained; from memory (Hucho 1998, underbody, chapter not "
                              "checked)", "from memory")),
      sensitivity=Sensitivity("underbody.panel_coverage", -0.35, "%", (25, 100), "target", Source(
          "the middle of the rule's 20-50 counts for a fully panelled floor, per % of coverage",
          "from memory")))
def panel_coverage(sheet, ctx):
    """
    What it checks: the share of the underbody between the bumpers covered by smooth panels.

    Why it matters: an open underbody exposes suspension, exhaust and floor stampings to a
    fast flow; each element sheds a wake, and together they slow the underbody flow and
    raise both drag and lift.

    How to fix: close the floor with panels from the front air dam to the rear axle, keeping
    openings only where cooling or service needs them; seal the gaps between panels.

    An electric vehicle's battery pack forms a flat floor between the axles, so its target
    is higher ({battery_target}).

    Known limits: coverage alone does not say how smooth the panels are or how they end;
    the battery floor is assumed for every electric vehicle.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {underbody.panel_coverage: 40 %}}
        passes: {features: {underbody.panel_coverage: 0.9}}
    """
    coverage = sheet.get("underbody.panel_coverage")
    target = ctx["battery_target"] if sheet.get("powertrain.kind") == "electric" else ctx["target"]
    gap = target - coverage
    reading = Reading(coverage, PERCENT, at_least=target)
    if coverage < ctx["poor"]:
        return major("the underbody is largely open", **reading.shown(), counts=ctx.effect().counts(gap),
                     cl_front=-0.01, cl_rear=-0.01)
    if reading.beyond:
        return minor("the underbody panels leave parts open", **reading.shown(),
                     counts=ctx.effect().counts(gap))
    return passed("the underbody is well covered", **reading.shown(margin=False))


@rule("underbody.diffuser-angle", "Diffuser angle the flow can follow", "failure",
      needs=("underbody.diffuser_angle",),
      thresholds=(Threshold("separation", "12 deg", "deg", "angle above which the diffuser flow separates",
                            DIFFUSER_SOURCE),
                  Threshold("edge", "10 deg", "deg", "angle above which separation is near", DIFFUSER_SOURCE)),
      sources=(DIFFUSER_SOURCE, COOPER,
               Effect(5, 20, "a separated diffuser loses {low}-{high} counts and its downforce; recalled, not checked",
                      "from memory"),
               Effect(1, 5, "{low}-{high} counts for a diffuser close to separation; recalled, not checked",
                      "from memory", name="edge")),
      sensitivity=Sensitivity("underbody.diffuser_angle", 2.0, "deg", (8, 16), "edge", Source(
          "about 2 counts per deg steeper where the diffuser flow starts to separate (the rule's 5-20 counts over "
          "the separation)", "from memory")))
def diffuser_angle(sheet, ctx):
    """
    What it checks: the upsweep angle of the rear underbody (the diffuser).

    Why it matters: a diffuser recovers pressure from the fast underbody flow into the wake,
    raising the base pressure and producing downforce. Up to about 10 deg the flow follows
    it; steeper, it separates, and the diffuser turns into a base with more drag and
    more lift than a moderate one.

    How to fix: keep the diffuser angle between about 5 deg and {edge}, lengthen it rather than steepen it,
    and add side fences or strakes where a steeper angle is unavoidable.

    Known limits: wheel wakes and exposed parts in the diffuser move the separation angle;
    results at one ride height.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (failure): {features: {underbody.diffuser_angle: 16 deg}}
        passes: {features: {underbody.diffuser_angle: 8 deg}}
    """
    angle = sheet.get("underbody.diffuser_angle")
    separation = Reading(angle, DEG, at_most=ctx["separation"], places=1)
    edge = Reading(angle, DEG, at_most=ctx["edge"], places=1)
    if separation.beyond:
        return major("the diffuser is steeper than the flow can follow: it separates", **separation.shown(),
                     counts=ctx.effect().counts(), cl_rear=-0.04)
    if edge.beyond:
        return minor("the diffuser angle is close to separation", **edge.shown(), counts=ctx.effect("edge").counts())
    return passed("the diffuser angle is in the attached range", **edge.shown(margin=False))


@rule("underbody.diffuser-exposed", "Parts standing in the diffuser flow", "warning",
      needs=("underbody.diffuser_exposed_parts",),
      sources=(Effect(2, 5, "{low}-{high} counts per exposed part (exhaust, tow eye, links); from memory",
                      "from memory"), COOPER))
def diffuser_exposed(sheet, ctx):
    """
    What it checks: the number of parts (exhaust, tow eye, suspension links, spare-wheel
    well) that protrude into the diffuser flow.

    Why it matters: the diffuser works only if its flow stays attached; a part in it
    sheds a wake right where the pressure rises, which triggers separation.

    How to fix: move or cover the parts (tuck the exhaust, cover the tow eye, panel the links).

    Known limits: the feature is a count of parts, not a fraction; parts differ in size and
    the estimate counts them equally.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {underbody.diffuser_exposed_parts: 2}}
        passes: {features: {underbody.diffuser_exposed_parts: 0}}
    """
    parts = int(round(sheet.get("underbody.diffuser_exposed_parts")))
    if parts > 0:
        return major(f"{parts} part(s) stand in the diffuser flow", measured=str(parts), limit="0",
                     counts=ctx.effect().counts(parts), cl_rear=-0.01 * parts)
    return passed("the diffuser is clean", measured="0", limit="0")


@rule("underbody.pitch", "Underbody pitch (nose-up raises front lift)", "advisory",
      needs=("underbody.pitch",),
      thresholds=(Threshold("nose_up", "-0.5 deg", "deg", "pitch below which the underbody opens to the flow", COMMON),),
      sources=(COMMON, Effect(2, 6, "{low}-{high} counts per degree nose-up past the limit, and about 0.02 more "
                              "front lift per degree nose-up; from memory", "from memory")),
      sensitivity=Sensitivity("underbody.pitch", -4.0, "deg", (-2, 1), "nose_up", Source(
          "the middle of 2-6 counts per deg nose-up (pitch is positive nose-down)", "from memory")))
def pitch(sheet, ctx):
    """
    What it checks: the static pitch of the underbody at curb ride height.

    Why it matters: a nose-up underbody scoops air under the car: more underbody flow,
    more drag and more front lift. A slight nose-down rake does the opposite.

    How to fix: set the ride heights so the underbody is level or slightly nose-down
    (0 to +0.5 deg) at the design load.

    Known limits: pitch changes with load and speed; the rule looks at the curb state only.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {underbody.pitch: -1.5 deg}}
        passes: {features: {underbody.pitch: 0.3 deg}}
    """
    angle = sheet.get("underbody.pitch")
    shown = {"measured": DEG(angle, 1, signed=True), "limit": f">= {DEG(ctx['nose_up'], 1, signed=True)}"}
    if angle < ctx["nose_up"]:
        return minor("the underbody is pitched nose-up", **shown,
                     counts=ctx.effect().counts(math.degrees(ctx["nose_up"] - angle)),
                     cl_front=-0.02 * abs(math.degrees(angle)))
    return passed("the underbody pitch is level or nose-down", **shown)


@rule("underbody.diffuser-area-ratio", "Diffuser area ratio (length with ground clearance)", "warning",
      needs=("underbody.diffuser_angle", "underbody.diffuser_length", "dimensions.ground_clearance"),
      thresholds=(Threshold("useful", "1.2", "", "exit / inlet height below which the diffuser recovers little",
                            COOPER),
                  Threshold("separation", "2.2", "", "exit / inlet height above which the diffuser flow separates",
                            COOPER)),
      sources=(COOPER,
               Effect(3, 10, "{low}-{high} counts and part of the rear downforce for an over-expanded diffuser; "
                      "recalled, not checked", "from memory"),
               Effect(1, 4, "{low}-{high} counts for a diffuser that expands the flow too little; recalled, not "
                      "checked", "from memory", name="low_ratio")))
def diffuser_area_ratio(sheet, ctx):
    """
    What it checks: the diffuser's area ratio, its exit height over its inlet height:
    (h + L tan(angle)) / h with the ground clearance h and the diffuser length L.

    Why it matters: how much pressure a diffuser recovers, and whether its flow stays
    attached, depends on how much it expands the underbody flow over its length, not on its
    angle alone: a long shallow diffuser under a low car can expand the flow as much as a
    short steep one. Too little expansion recovers little; too much separates.

    How to fix: above the limit, shorten the ramp or flatten it; below it, lengthen the
    ramp at the same angle or lower the ride height. Add side fences to keep the flow
    two-dimensional.

    Known limits: the ground clearance between the axles stands for the diffuser's inlet
    height; wheel wakes and exposed parts reduce the usable ratio.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {underbody.diffuser_length: 1500 mm}}
        passes: {features: {underbody.diffuser_length: 700 mm}}
    """
    height = sheet.get("dimensions.ground_clearance")
    rise = sheet.get("underbody.diffuser_length") * math.tan(sheet.get("underbody.diffuser_angle"))
    ratio = (height + rise) / height if height > 0 else float("inf")
    reading = Reading(ratio, RATIO, at_least=ctx["useful"], at_most=ctx["separation"], places=2, limit_places=1)
    measured = f"area ratio {RATIO(ratio, reading.digits)} ({MM(rise)} rise on {MM(height)} clearance)"
    if reading.above:
        return major("the diffuser expands the underbody flow more than it can follow", **reading.shown(measured),
                     counts=ctx.effect().counts(), cl_rear=-0.03)
    if reading.below:
        return minor("the diffuser expands the flow too little to recover much pressure", **reading.shown(measured),
                     counts=ctx.effect("low_ratio").counts(), cl_rear=-0.01)
    return passed("the diffuser area ratio is in the useful range", **reading.shown(measured, margin=False))


@rule("underbody.diffuser-end-step", "Step from the diffuser end to the base", "advisory",
      needs=("underbody.diffuser_end_step",),
      thresholds=(Threshold("step", "30 mm", "mm", "step height above which the diffuser ends in a base pocket",
                            COMMON),),
      sources=(COMMON, Effect(1, 5, "{low}-{high} counts; recalled, not checked", "from memory")))
def diffuser_end_step(sheet, ctx):
    """
    What it checks: the vertical step from the diffuser's trailing edge up to the lower edge
    of the rear base (bumper).

    Why it matters: a diffuser should hand its flow to the wake at the base's lower edge;
    a tall step behind it forms a pocket of low pressure on the bumper's underside and adds
    base area exactly where the diffuser was meant to raise the pressure.

    How to fix: run the diffuser out to the bumper's lower edge, or close the step with a
    panel that continues the ramp.

    Known limits: one height on the centreline; the step may vary across the width.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {underbody.diffuser_end_step: 60 mm}}
        passes: {features: {underbody.diffuser_end_step: 10 mm}}
    """
    step = Reading(sheet.get("underbody.diffuser_end_step"), MM, at_most=ctx["step"])
    if step.beyond:
        return minor("the diffuser ends below a tall step: a low-pressure pocket on the bumper", **step.shown(),
                     counts=ctx.effect().counts())
    return passed("the diffuser runs out into the base edge", **step.shown(margin=False))


@rule("underbody.nose-rake", "Front underbody rake ahead of the front axle", "advisory",
      needs=("underbody.nose_rake",),
      thresholds=(Threshold("minimum", "1 deg", "deg", "rake below which the nose scoops air under the car", COMMON),
                  Threshold("maximum", "12 deg", "deg", "rake above which the flow separates under the nose", COMMON)),
      sources=(COMMON,
               Effect(1, 4, "{low}-{high} counts and 0.01-0.03 of front lift; recalled, not checked", "from memory"),
               Effect(1, 3, "{low}-{high} counts for a rake steep enough to separate; recalled, not checked",
                      "from memory", name="steep")))
def nose_rake(sheet, ctx):
    """
    What it checks: the upward inclination of the front underbody between the air dam and
    the front axle.

    Why it matters: a front underbody that rises toward the nose accelerates the flow
    entering under the car gently and lowers front lift; a flat or falling one lets the
    nose scoop air under the car, while a steep one separates behind the air dam.

    How to fix: shape the front underbody panel with a rake of 2-10 deg from the axle to the
    air dam.

    Known limits: static, at curb ride height; the air dam depth changes how much the rake matters.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {underbody.nose_rake: -2 deg}}
        passes: {features: {underbody.nose_rake: 4 deg}}
    """
    rake = Reading(sheet.get("underbody.nose_rake"), DEG, at_least=ctx["minimum"], at_most=ctx["maximum"], places=1)
    measured = DEG(rake.value, rake.digits, signed=True)
    if rake.below:
        return minor("the front underbody does not rise toward the nose: more front lift", **rake.shown(measured),
                     counts=ctx.effect().counts(), cl_front=-0.02)
    if rake.above:
        return minor("the front underbody rises steeply: the flow separates behind the air dam",
                     **rake.shown(measured), counts=ctx.effect("steep").counts())
    return passed("the front underbody rake is in the useful range", **rake.shown(measured, margin=False))
