"""Underbody and diffuser: a smooth floor and a rear upsweep the flow can follow."""

from __future__ import annotations

import math

from aeroreview.rules import COMMON, Sensitivity, Source, Threshold, counts_range, major, minor, passed, rule

DIFFUSER_SOURCE = Source("Cooper, Bertenyi, Dutil, Syms and Sovran, SAE 980030 (1998): bluff-body diffusers in "
                         "ground effect gain up to about 10 deg, then separate; recalled", "from memory")


@rule("underbody.panel-coverage", "Underbody panel coverage", "warning",
      needs=("underbody.panel_coverage",),
      thresholds=(Threshold("target", "80 %", "%", "coverage a current car reaches", COMMON),
                  Threshold("poor", "50 %", "%", "coverage below which the underbody is largely open", COMMON)),
      sources=(COMMON, Source("effect: a fully panelled floor saves 20-50 counts against an open one; from memory "
                              "(Hucho 1998, ch. 4, underbody)", "from memory")),
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

    Known limits: coverage alone does not say how smooth the panels are or how they end.
    """
    coverage = sheet.get("underbody.panel_coverage")
    gap = ctx["target"] - coverage
    measured = f"{coverage * 100:.0f} %"
    if coverage < ctx["poor"]:
        return major("the underbody is largely open", measured=measured, limit=f">= {ctx['target'] * 100:.0f} %",
                     margin=f"{-gap * 100:+.0f} %", counts=counts_range(20 * gap, 50 * gap),
                     cl_front=-0.01, cl_rear=-0.01)
    if coverage < ctx["target"]:
        return minor("the underbody panels leave parts open", measured=measured, limit=f">= {ctx['target'] * 100:.0f} %",
                     margin=f"{-gap * 100:+.0f} %", counts=counts_range(20 * gap, 50 * gap))
    return passed("the underbody is well covered", measured=measured, limit=f">= {ctx['target'] * 100:.0f} %")


@rule("underbody.diffuser-angle", "Diffuser angle the flow can follow", "failure",
      needs=("underbody.diffuser_angle",),
      thresholds=(Threshold("separation", "12 deg", "deg", "angle above which the diffuser flow separates",
                            DIFFUSER_SOURCE),
                  Threshold("edge", "10 deg", "deg", "angle above which separation is near", DIFFUSER_SOURCE)),
      sources=(DIFFUSER_SOURCE, Source("effect: a separated diffuser loses 5-20 counts and its downforce; from "
                                       "memory", "from memory")),
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

    How to fix: keep the diffuser angle at 5-10 deg, lengthen it rather than steepen it,
    and add side fences or strakes where a steeper angle is unavoidable.

    Known limits: wheel wakes and exposed parts in the diffuser move the separation angle;
    results at one ride height.
    """
    degrees = math.degrees(sheet.get("underbody.diffuser_angle"))
    separation, edge = math.degrees(ctx["separation"]), math.degrees(ctx["edge"])
    measured = f"{degrees:.1f} deg"
    if degrees > separation:
        return major("the diffuser is steeper than the flow can follow: it separates", measured=measured,
                     limit=f"<= {separation:.0f} deg", margin=f"{degrees - separation:+.1f} deg",
                     counts=counts_range(5, 20), cl_rear=-0.04)
    if degrees > edge:
        return minor("the diffuser angle is close to separation", measured=measured, limit=f"<= {edge:.0f} deg",
                     margin=f"{degrees - edge:+.1f} deg", counts=counts_range(1, 5))
    return passed("the diffuser angle is in the attached range", measured=measured, limit=f"<= {edge:.0f} deg")


@rule("underbody.diffuser-exposed", "Parts standing in the diffuser flow", "warning",
      needs=("underbody.diffuser_exposed_parts",),
      sources=(Source("effect: 2-5 counts per exposed part (exhaust, tow eye, links); from memory", "from memory"),))
def diffuser_exposed(sheet, ctx):
    """
    What it checks: the number of parts (exhaust, tow eye, suspension links, spare-wheel
    well) that protrude into the diffuser flow.

    Why it matters: the diffuser works only if its flow stays attached; a part in it
    sheds a wake right where the pressure rises, which triggers separation.

    How to fix: move or cover the parts (tuck the exhaust, cover the tow eye, panel the links).

    Known limits: parts differ in size; the estimate counts them equally.
    """
    parts = int(round(sheet.get("underbody.diffuser_exposed_parts")))
    if parts > 0:
        return major(f"{parts} part(s) stand in the diffuser flow", measured=str(parts), limit="0",
                     counts=counts_range(2 * parts, 5 * parts), cl_rear=-0.01 * parts)
    return passed("the diffuser is clean", measured="0", limit="0")


@rule("underbody.pitch", "Underbody pitch (nose-up raises front lift)", "advisory",
      needs=("underbody.pitch",),
      thresholds=(Threshold("nose_up", "-0.5 deg", "deg", "pitch below which the underbody opens to the flow", COMMON),),
      sources=(COMMON, Source("effect: 2-6 counts and about 0.02 more front lift per degree nose-up; from memory",
                              "from memory")),
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
    """
    angle = sheet.get("underbody.pitch")
    degrees = math.degrees(angle)
    if angle < ctx["nose_up"]:
        return minor("the underbody is pitched nose-up", measured=f"{degrees:+.1f} deg",
                     limit=f">= {math.degrees(ctx['nose_up']):+.1f} deg", counts=counts_range(2, 6),
                     cl_front=-0.02 * abs(degrees))
    return passed("the underbody pitch is level or nose-down", measured=f"{degrees:+.1f} deg",
                  limit=f">= {math.degrees(ctx['nose_up']):+.1f} deg")
