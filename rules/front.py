"""Front: the nose, where the flow first meets the body and the stagnation pressure builds."""

from __future__ import annotations

from aeroreview.rules import COMMON, HUCHO, Source, Threshold, body_scale, counts_range, major, minor, passed, rule

EDGE_SOURCE = Source("Hucho 1998, ch. 4, front-edge rounding on box-like bodies: drag falls steeply with the "
                     "edge radius until the flow stays attached, near r / sqrt(A) = 0.04-0.05; recalled",
                     "from memory")


def _edge_rule(sheet, ctx, key: str, what: str, van_like_counts, car_counts):
    scale = body_scale(sheet)
    radius = sheet.get(key)
    ratio = radius / scale
    boxy = sheet.get("vehicle.class") in ("van", "suv", "pickup")
    low, high = van_like_counts if boxy else car_counts
    measured = f"r / sqrt(A) = {ratio:.3f} ({radius * 1000:.0f} mm)"
    if ratio < ctx["attached_ratio"]:
        shortfall = 1 - ratio / ctx["attached_ratio"]
        return major(f"{what} radius is small for the body size: the flow separates at the edge",
                     measured=measured, limit=f">= {ctx['attached_ratio']:.3f}", margin=f"{ratio - ctx['attached_ratio']:+.3f}",
                     counts=counts_range(low * shortfall, high * shortfall))
    if ratio < ctx["comfortable_ratio"]:
        return minor(f"{what} radius is near the limit where the flow stays attached",
                     measured=measured, limit=f">= {ctx['comfortable_ratio']:.3f}",
                     margin=f"{ratio - ctx['comfortable_ratio']:+.3f}", counts=counts_range(0.1 * low, 0.2 * high))
    return passed(f"{what} radius keeps the flow attached", measured=measured, limit=f">= {ctx['attached_ratio']:.3f}")


_EDGE_THRESHOLDS = (
    Threshold("attached_ratio", "0.04", "", "r / sqrt(A) below which the flow separates at the edge", EDGE_SOURCE),
    Threshold("comfortable_ratio", "0.055", "", "r / sqrt(A) with margin for yaw and tolerances", COMMON),
)


@rule("front.upper-edge-radius", "Front upper edge radius relative to body size", "warning",
      needs=("front.upper_edge_radius", "dimensions.width", "dimensions.height"), thresholds=_EDGE_THRESHOLDS,
      sources=(EDGE_SOURCE, Source("effect: 10-40 counts on van-like bodies, 2-10 on cars; from memory (Hucho 1998)",
                                   "from memory")))
def upper_edge_radius(sheet, ctx):
    """
    What it checks: the radius of the front upper edge (bumper to hood) in the side view,
    relative to the body size sqrt(A).

    Why it matters: the flow turning over a sharp front edge separates and reattaches
    further back; the bubble raises drag, and on upright fronts (vans, SUVs) it is one of the
    largest single drag sources. Drag falls steeply with the radius until the flow stays
    attached, and hardly changes after that.

    How to fix: round the bumper-to-hood transition until r / sqrt(A) reaches about 0.05;
    on a van a 150 mm radius is typical. Where styling needs a crisp line, use a chamfer of
    similar extent.

    Known limits: a single radius describes the edge; real edges vary along their length.
    The threshold comes from box-like bodies at zero yaw; low sedan noses with a shallow
    hood are less sensitive.
    """
    return _edge_rule(sheet, ctx, "front.upper_edge_radius", "Front upper edge", (10, 40), (2, 10))


@rule("front.corner-radius", "Front corner radius in plan view relative to body size", "warning",
      needs=("front.corner_radius", "dimensions.width", "dimensions.height"), thresholds=_EDGE_THRESHOLDS,
      sources=(EDGE_SOURCE, Source("effect: 5-25 counts on van-like bodies, 2-8 on cars; from memory (Hucho 1998)",
                                   "from memory")))
def corner_radius(sheet, ctx):
    """
    What it checks: the radius of the front corners (bumper to body side) in the plan view,
    relative to the body size sqrt(A).

    Why it matters: air turning around a sharp front corner separates along the side; the
    separated layer thickens the wake of the front wheel and the side, and grows with yaw.

    How to fix: round the bumper corners to at least r / sqrt(A) = 0.05, or shape a
    corner chamfer with a rounded leading edge; an air curtain can help where the corner
    must stay tight.

    Known limits: evaluated at zero yaw from one plan-view radius at bumper height.
    """
    return _edge_rule(sheet, ctx, "front.corner_radius", "Front corner", (5, 25), (2, 8))


@rule("front.air-dam", "Front air dam reaches below the underbody", "advisory", region="underbody",
      needs=("front.air_dam_clearance", "dimensions.ground_clearance"),
      thresholds=(Threshold("dam_depth", "15 mm", "mm", "how far the dam edge should reach below the underbody", COMMON),),
      sources=(HUCHO, Source("effect: 3-12 counts and less front lift; from memory (Hucho 1998, front spoilers)",
                             "from memory")))
def air_dam(sheet, ctx):
    """
    What it checks: whether the lower edge of the front air dam reaches below the
    underbody plane, so that it shields the rough underbody from the oncoming flow.

    Why it matters: an air dam that sits above the underbody does nothing; one that reaches
    a little below it lowers the underbody velocity over the rough parts, reducing drag and
    front lift.

    How to fix: lower the dam lip until it stands 15-40 mm below the underbody plane,
    keeping the approach angle and the pedestrian lower-leg requirements.

    Known limits: an air dam that is too deep adds its own frontal area; this rule only
    checks that the dam is effective at all.
    """
    depth = sheet.get("dimensions.ground_clearance") - sheet.get("front.air_dam_clearance")
    measured = f"dam edge {depth * 1000:+.0f} mm below the underbody"
    if depth < ctx["dam_depth"]:
        return minor("the air dam does not reach below the underbody plane", measured=measured,
                     limit=f">= {ctx['dam_depth'] * 1000:.0f} mm", margin=f"{(depth - ctx['dam_depth']) * 1000:+.0f} mm",
                     counts=counts_range(3, 12), cl_front=-0.02)
    return passed("the air dam shields the underbody", measured=measured, limit=f">= {ctx['dam_depth'] * 1000:.0f} mm")


@rule("front.air-curtains", "Air curtains ahead of the front wheels", "advisory", region="wheels",
      needs=("front.air_curtains",),
      sources=(Source("effect: 2-8 counts; from memory (published production-car figures for wheel air curtains)",
                      "from memory"),), applies_to=("sedan", "fastback", "hatchback", "estate", "suv", "sports"))
def air_curtains(sheet, ctx):
    """
    What it checks: whether ducts from the front bumper blow a sheet of air across the
    face of the front wheels.

    Why it matters: the front wheels meet the oncoming flow with their whole face; an air
    curtain turns that flow along the wheel and narrows the wheel wake.

    How to fix: add vertical ducts from the bumper intake to narrow outlets just ahead of
    the wheelhouse, exiting tangentially to the wheel face.

    Known limits: the gain depends on the wheel design and the outlet position; closed rims
    leave less to gain.
    """
    if sheet.get("front.air_curtains"):
        return passed("air curtains are fitted", measured="fitted")
    return minor("no air curtains ahead of the front wheels", measured="none", limit="fitted",
                 counts=counts_range(2, 8))
