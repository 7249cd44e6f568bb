"""Front: the nose, where the flow first meets the body and the stagnation pressure builds."""

from __future__ import annotations

from aeroreview.display import DEG, MM, RATIO, Reading
from aeroreview.rules import COMMON, HUCHO, Effect, Source, Threshold, major, minor, passed, rule
from aeroreview.rules.body import BOX_CLASSES, body_scale, dimension_share, front_face_height

EDGE_SOURCE = Source("Hucho 1998, front-edge rounding on box-like bodies (chapter not checked): drag falls steeply "
                     "with the edge radius until the flow stays attached, near r / sqrt(A) = 0.04-0.05; recalled, "
                     "not checked", "from memory")
FACE_SOURCE = Source("low car noses: the radius is compared with the height of the front face it turns the flow "
                     "over (hood edge height minus air-dam clearance), by the same 0.04-0.05 ratio as for boxes; "
                     "an engineering transfer of the box-body result, recalled, not checked", "from memory")
_EDGE_READS = ("dimensions.frontal_area", "dimensions.width", "dimensions.height", "vehicle.class")


def _edge_effects(van_like: tuple[float, float], car: tuple[float, float]) -> tuple[Effect, ...]:
    """The edge rules' ranges: a separated edge (times the radius shortfall) and a radius near the limit, by body.

    Named ``van_like``, ``van_like_near``, ``car`` and ``car_near``.
    """
    effects = []
    for body, (low, high) in (("van_like", van_like), ("car", car)):
        bodies = "van-like bodies" if body == "van_like" else "cars"
        effects += [Effect(low, high, "{low}-{high} counts on " + bodies + " with a separated edge, times the radius "
                           "shortfall; from memory (Hucho 1998, chapter not checked)", "from memory", name=body),
                    Effect(0.1 * low, 0.2 * high, "{low}-{high} counts on " + bodies + " with the radius between the "
                           "attached and the comfortable ratio (a tenth to a fifth of the separated range); from "
                           "memory", "from memory", name=body + "_near")]
    return tuple(effects)


def _edge_rule(sheet, ctx, key: str, what: str, face=None):
    """Judge an edge radius against a length: the front face height when given (low noses), else sqrt(A)."""
    scale, against = (face, "front face height h") if face else (body_scale(sheet), "sqrt(A)")
    radius = sheet.get(key)
    ratio = radius / scale
    boxy = sheet.get("vehicle.class") in BOX_CLASSES
    body = "van_like" if boxy else "car"
    attached, comfortable = (Reading(ratio, RATIO, at_least=ctx[name], places=3, limit_places=3)
                             for name in ("attached_ratio", "comfortable_ratio"))
    if attached.beyond:
        shortfall = 1 - ratio / ctx["attached_ratio"]
        return major(f"{what} radius is small for the body size: the flow separates at the edge",
                     **attached.shown(_edge_measured(against, attached, radius, scale)),
                     counts=ctx.effect(body).counts(shortfall))
    if comfortable.beyond:
        return minor(f"{what} radius is near the limit where the flow stays attached",
                     **comfortable.shown(_edge_measured(against, comfortable, radius, scale)),
                     counts=ctx.effect(body + "_near").counts())
    return passed(f"{what} radius keeps the flow attached",
                  **attached.shown(_edge_measured(against, attached, radius, scale), margin=False))


def _edge_measured(against: str, reading: Reading, radius: float, scale: float) -> str:
    return f"r / {against} = {RATIO(reading.value, reading.digits)} ({MM(radius)} on {MM(scale)})"


_EDGE_THRESHOLDS = (
    Threshold("attached_ratio", "0.04", "", "r / sqrt(A) below which the flow separates at the edge", EDGE_SOURCE),
    Threshold("comfortable_ratio", "0.055", "", "r / sqrt(A) with margin for yaw and tolerances", COMMON),
)


@rule("front.upper-edge-radius", "Front upper edge radius relative to body size", "warning",
      needs=("front.upper_edge_radius", "dimensions.width", "dimensions.height"), thresholds=_EDGE_THRESHOLDS,
      optional=_EDGE_READS + ("front.hood_edge_height", "front.air_dam_clearance"),
      sources=(EDGE_SOURCE, FACE_SOURCE, *_edge_effects(van_like=(10, 40), car=(2, 10))))
def upper_edge_radius(sheet, ctx):
    """
    What it checks: the radius of the front upper edge (bumper to hood) in the side view,
    relative to the length the flow turns over: on a low car nose the front face height
    (hood edge height minus air-dam clearance), on upright bodies (vans, SUVs, pickups,
    crossovers) or when the hood edge height is not given, sqrt(A).

    Why it matters: the flow turning over a sharp front edge separates and reattaches
    further back; the bubble raises drag, and on upright fronts (vans, SUVs) it is one of the
    largest single drag sources. Drag falls steeply with the radius until the flow stays
    attached, and hardly changes after that.

    How to fix: round the bumper-to-hood transition until r / sqrt(A) reaches {comfortable_ratio};
    on a van a 150 mm radius is typical. Where styling needs a crisp line, use a chamfer of
    similar extent.

    Known limits: a single radius describes the edge; real edges vary along their length.
    The threshold comes from box-like bodies at zero yaw; applying it to a car's front face
    height is an engineering transfer, not a published result.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {front.upper_edge_radius: 20 mm}}
        passes: {features: {front.upper_edge_radius: 85 mm}}
    """
    return _edge_rule(sheet, ctx, "front.upper_edge_radius", "Front upper edge",
                      face=front_face_height(sheet))


@rule("front.corner-radius", "Front corner radius in plan view relative to body size", "warning",
      needs=("front.corner_radius", "dimensions.width", "dimensions.height"), thresholds=_EDGE_THRESHOLDS,
      optional=_EDGE_READS,
      sources=(EDGE_SOURCE, *_edge_effects(van_like=(5, 25), car=(2, 8))))
def corner_radius(sheet, ctx):
    """
    What it checks: the radius of the front corners (bumper to body side) in the plan view,
    relative to the body size sqrt(A).

    Why it matters: air turning around a sharp front corner separates along the side; the
    separated layer thickens the wake of the front wheel and the side, and grows with yaw.

    How to fix: round the bumper corners to at least r / sqrt(A) = {comfortable_ratio}, or shape a
    corner chamfer with a rounded leading edge; an air curtain can help where the corner
    must stay tight.

    Known limits: evaluated at zero yaw from one plan-view radius at bumper height, always
    against sqrt(A) (the plan-view corner turns the flow around the whole front).

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {front.corner_radius: 40 mm}}
        passes: {features: {front.corner_radius: 190 mm}}
    """
    return _edge_rule(sheet, ctx, "front.corner_radius", "Front corner")


@rule("front.air-dam", "Front air dam reaches below the underbody", "advisory", region="underbody",
      needs=("front.air_dam_clearance", "dimensions.ground_clearance"),
      thresholds=(Threshold("dam_depth", "15 mm", "mm", "how far the dam edge should reach below the underbody", COMMON),),
      sources=(HUCHO, Effect(3, 12, "{low}-{high} counts and less front lift; from memory (Hucho 1998, front spoilers, "
                             "chapter not checked)", "from memory")))
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

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {front.air_dam_clearance: 150 mm}}
        passes: {features: {front.air_dam_clearance: 105 mm}}
    """
    depth = Reading(sheet.get("dimensions.ground_clearance") - sheet.get("front.air_dam_clearance"), MM,
                    at_least=ctx["dam_depth"])
    measured = f"dam edge {MM(depth.value, signed=True)} below the underbody"
    if depth.beyond:
        return minor("the air dam does not reach below the underbody plane", **depth.shown(measured),
                     counts=ctx.effect().counts(), cl_front=-0.02)
    return passed("the air dam shields the underbody", **depth.shown(measured, margin=False))


@rule("front.air-curtains", "Air curtains ahead of the front wheels", "advisory", region="wheels",
      needs=("front.air_curtains",),
      sources=(Effect(2, 8, "{low}-{high} counts; from memory (published production-car figures for wheel air "
                      "curtains)", "from memory"),),
      applies_to=("sedan", "fastback", "hatchback", "estate", "crossover", "suv", "sports"))
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

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {front.air_curtains: false}}
        passes: {features: {front.air_curtains: true}}
    """
    if sheet.get("front.air_curtains"):
        return passed("air curtains are fitted", measured="fitted")
    return minor("no air curtains ahead of the front wheels", measured="none", limit="fitted",
                 counts=ctx.effect().counts())


NOSE_SOURCE = Source("Hucho 1998, front-end shape (chapter not checked): a low stagnation point and a hood "
                     "inclined by about 8-15 deg lower drag and front lift on passenger cars; thresholds recalled, "
                     "not checked", "from memory")


@rule("front.hood-angle", "Hood inclination", "advisory",
      needs=("front.hood_angle",),
      thresholds=(Threshold("flat", "6 deg", "deg", "hood inclination below which the nose stays blunt",
                            NOSE_SOURCE),
                  Threshold("steep", "20 deg", "deg", "inclination above which the flow may separate at the hood "
                                                      "leading edge", NOSE_SOURCE)),
      sources=(NOSE_SOURCE,
               Effect(1, 5, "{low}-{high} counts for a nearly flat hood; recalled, not checked", "from memory"),
               Effect(1, 3, "{low}-{high} counts for a hood steep enough to separate; recalled, not checked",
                      "from memory", name="steep")),
      applies_to=("sedan", "fastback", "hatchback", "estate", "crossover", "suv", "sports"))
def hood_angle(sheet, ctx):
    """
    What it checks: the inclination of the hood in the side view.

    Why it matters: a hood rising toward the windshield lowers the nose and the stagnation
    point and lets the flow accelerate smoothly over the front; a flat, high hood keeps the
    nose blunt. Too steep, and the flow separates behind the hood's leading edge.

    How to fix: incline the hood by 8-15 deg, lowering its leading edge within the
    pedestrian-protection and package limits.

    Known limits: the hood's curvature and its junction with the windshield matter too;
    vans and pickups are excluded because their packages fix the hood.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {front.hood_angle: 3 deg}}
        passes: {features: {front.hood_angle: 10 deg}}
    """
    angle = Reading(sheet.get("front.hood_angle"), DEG, at_least=ctx["flat"], at_most=ctx["steep"], places=1)
    if angle.below:
        return minor("the hood is nearly flat: the nose stays high and blunt", **angle.shown(),
                     counts=ctx.effect().counts(), cl_front=-0.01)
    if angle.above:
        return minor("the hood is steep enough to separate behind its leading edge", **angle.shown(),
                     counts=ctx.effect("steep").counts())
    return passed("the hood inclination is in the usual range", **angle.shown(margin=False))


@rule("front.stagnation-height", "Height of the stagnation point", "advisory",
      needs=("front.stagnation_height", "dimensions.height"),
      thresholds=(Threshold("share", "36 %", "%", "stagnation height / body height above which the nose is high",
                            NOSE_SOURCE),),
      sources=(NOSE_SOURCE, Effect(1, 4, "{low}-{high} counts and 0.01-0.03 of front lift; recalled, not checked",
                                   "from memory")),
      applies_to=("sedan", "fastback", "hatchback", "estate", "sports"))
def stagnation_height(sheet, ctx):
    """
    What it checks: the height of the nose's forwardmost point (where the flow stagnates)
    as a share of the body height.

    Why it matters: the stagnation point divides the oncoming air between the top of the
    body and the underbody; a high nose sends more of it under the car, where it meets the
    rough underbody and raises drag and front lift.

    How to fix: lower the nose's leading point (a lower, more rounded bumper), keeping the
    pedestrian lower-leg and approach-angle requirements.

    Known limits: for low cars only; the underbody shielding by the air dam changes how much
    the split matters.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {front.stagnation_height: 600 mm}}
        passes: {features: {front.stagnation_height: 450 mm}}
    """
    share, measured = dimension_share(sheet, "front.stagnation_height", "dimensions.height", at_most=ctx["share"])
    if share.beyond:
        return minor("the nose is high: more air is sent under the car", **share.shown(measured),
                     counts=ctx.effect().counts(), cl_front=-0.02)
    return passed("the stagnation point is low", **share.shown(measured, margin=False))


@rule("front.splitter", "Front splitter overhang", "advisory",
      needs=("front.splitter_length",),
      thresholds=(Threshold("maximum", "60 mm", "mm", "overhang above which a road car's splitter adds drag and is "
                                                      "exposed to kerbs", COMMON),),
      sources=(COMMON, Effect(1, 4, "{low}-{high} counts for the overhang beyond the maximum, with less front "
                              "lift; recalled, not checked", "from memory")))
def splitter(sheet, ctx):
    """
    What it checks: how far a horizontal splitter reaches forward of the bumper face.

    Why it matters: a short splitter sharpens the separation under the bumper and trims
    front lift; a long one collects stagnation pressure on its top face (downforce, but also
    drag) and is the first part to meet kerbs and ramps.

    How to fix: keep the overhang within {maximum} on a road car, or support a longer one and
    weigh its drag against the front-lift target.

    Known limits: the right length depends on the front-lift balance; the rule only flags
    long overhangs.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {front.splitter_length: 100 mm}}
        passes: {features: {front.splitter_length: 20 mm}}
    """
    length = Reading(sheet.get("front.splitter_length"), MM, at_most=ctx["maximum"])
    if length.beyond:
        return minor("the splitter overhang is long for a road car: drag and kerb strikes", **length.shown(),
                     counts=ctx.effect().counts())
    return passed("the splitter overhang is moderate", **length.shown(margin=False))
