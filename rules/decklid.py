"""Decklid: the deck behind a slanted backlight, where the backlight flow may reattach.

On a notchback the decklid's length and fall decide whether the flow that left the roof
reattaches before the tail; a short or falling deck lengthens the wake and lifts the rear.
"""

from __future__ import annotations

from aeroreview.display import DEG, Reading
from aeroreview.rules import Effect, Source, Threshold, minor, passed, rule
from aeroreview.rules.body import dimension_share
from aeroreview.rules.rear import slanted_rear

DECKLID_SOURCE = Source("notchback decklids: a longer, higher decklid lets the backlight flow reattach and shortens the "
                        "wake; Hucho 1998, notchback rear ends (chapter not checked); thresholds recalled, not checked",
                        "from memory")


@rule("rear.decklid-length", "Decklid length behind a slanted backlight", "advisory",
      needs=("rear.decklid_length", "dimensions.length"),
      thresholds=(Threshold("share", "5 %", "%", "decklid length / vehicle length below which the tail is too short "
                                                  "for the backlight flow to reattach", DECKLID_SOURCE),),
      sources=(DECKLID_SOURCE, Effect(2, 6, "{low}-{high} counts and some rear lift; recalled, not checked",
                                      "from memory")),
      applies_if=slanted_rear)
def decklid_length(sheet, ctx):
    """
    What it checks: the length of the decklid (trunk lid or tail deck) behind a slanted
    backlight, as a share of the vehicle length.

    Why it matters: on a notchback or a fastback with a short deck, the flow leaving the
    backlight needs a surface to reattach to before the rear edge; a deck that is too short
    lets the wake start at the base of the backlight, with more drag and rear lift.

    How to fix: lengthen the decklid (move the backlight base forward or the rear edge
    rearward), or raise the deck so that the backlight is shorter and flatter.

    Known limits: the height of the decklid above the backlight base matters as much as its
    length; the sheet records only the length and the decklid angle.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {rear.decklid_length: 150 mm}}
        passes: {features: {rear.decklid_length: 300 mm}}
    """
    share, measured = dimension_share(sheet, "rear.decklid_length", "dimensions.length", at_least=ctx["share"],
                                      places=1)
    if share.beyond:
        return minor("the decklid is short: the backlight flow has no deck to reattach to", **share.shown(measured),
                     counts=ctx.effect().counts(), cl_rear=-0.02)
    return passed("the decklid gives the backlight flow room to reattach", **share.shown(measured, margin=False))


@rule("rear.decklid-angle", "Decklid falling toward the rear edge", "advisory",
      needs=("rear.decklid_angle",),
      thresholds=(Threshold("falling", "8 deg", "deg", "decklid fall above which the tail loses its kick-up effect",
                            DECKLID_SOURCE),),
      sources=(DECKLID_SOURCE, Effect(1, 4, "{low}-{high} counts and 0.01-0.04 more rear lift; recalled, not checked",
                                      "from memory")))
def decklid_angle(sheet, ctx):
    """
    What it checks: how steeply the decklid falls toward the rear edge in the side view.

    Why it matters: a decklid that falls rearward turns the flow downward over the tail,
    like an upside-down kick-up: the base pressure falls and rear lift rises. A level deck,
    or one that rises slightly to a sharp edge, does the opposite.

    How to fix: level the decklid, or end it in a kick-up or a spoiler lip with a sharp edge.

    Known limits: one chord angle; a deck that falls and then kicks up at the edge is judged
    by its chord only, and the spoiler rule judges the kick-up.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {rear.decklid_angle: 12 deg}}
        passes: {features: {rear.decklid_angle: 2 deg}}
    """
    angle = Reading(sheet.get("rear.decklid_angle"), DEG, at_most=ctx["falling"], places=1)
    measured = DEG(angle.value, angle.digits, signed=True)
    if angle.beyond:
        return minor("the decklid falls steeply toward the rear edge: rear lift rises", **angle.shown(measured),
                     counts=ctx.effect().counts(), cl_rear=-0.02)
    return passed("the decklid is level enough to hold the tail flow", **angle.shown(measured, margin=False))
