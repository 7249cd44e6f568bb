"""Data quality: is the sheet itself believable? Bad inputs make every other verdict wrong."""

from __future__ import annotations

import math

from aeroreview.calc.forces import reynolds_number
from aeroreview.display import COUNTS, KM_H
from aeroreview.rules import COMMON, Source, Threshold, major, not_assessed, passed, rule
from aeroreview.rules.result_quality import measured_cd


# Drag coefficient ranges of current production bodies by class (low, high); see CD_SOURCE.
CLASS_CD = {
    "sedan": (0.20, 0.34), "fastback": (0.20, 0.32), "hatchback": (0.24, 0.36), "estate": (0.23, 0.36),
    "crossover": (0.22, 0.36), "suv": (0.24, 0.42), "pickup": (0.35, 0.55), "van": (0.28, 0.45),
    "sports": (0.25, 0.42),
}
CD_SOURCE = Source("class ranges of production-car Cd, common practice; lower ends checked against press figures: "
                   "electric sedans at 0.20-0.21 (Automotive News, R. Truett, 22 Dec 2021 / 3 Jan 2022, vol. 96 no. "
                   "7019), a production electric SUV at 0.25 (manufacturer figure quoted in a 2018 press report); "
                   "the 0.22 crossover lower end recalled, not checked", "common practice")
REYNOLDS_SOURCE = Source("Hucho 1998, wind tunnels (chapter not checked): scale-model results depend on Re below "
                         "about 5e6 on length for rounded bodies; recalled, not checked", "from memory")


@rule("data.frontal-area", "Frontal area against width x height", "warning",
      needs=("dimensions.frontal_area", "dimensions.width", "dimensions.height"),
      thresholds=(Threshold("low", "0.78", "", "A / (W H) below which the area is suspiciously small", COMMON),
                  Threshold("high", "0.94", "", "A / (W H) above which the area is suspiciously large", COMMON)),
      sources=(Source("passenger cars fill 0.81-0.87 of their width x height rectangle, vans up to about 0.92; "
                      "from memory (Hucho 1998, chapter not checked)", "from memory"),))
def frontal_area(sheet, ctx):
    """
    What it checks: the frontal area as a share of the width x height rectangle.

    Why it matters: every drag force, power and energy figure scales with the frontal area;
    a wrong area (mirrors left out, a wrong unit, the rectangle itself) corrupts them all.

    How to fix: measure the frontal area from the surface (projection along x, mirrors and
    wheels included), and check width and height are without mirrors and at curb ride height.

    Known limits: unusual bodies (open sports cars, pickups with racks) may legitimately fall outside.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {dimensions.frontal_area: 1.9 m^2}}
        passes: {features: {dimensions.frontal_area: 2.24 m^2}}
    """
    ratio = sheet.get("dimensions.frontal_area") / (sheet.get("dimensions.width") * sheet.get("dimensions.height"))
    measured = f"A / (W H) = {ratio:.3f}"
    limits = f"{ctx['low']:.2f}-{ctx['high']:.2f}"
    if not ctx["low"] <= ratio <= ctx["high"]:
        return major("the frontal area does not fit the width and height", measured=measured, limit=limits)
    return passed("the frontal area is consistent with width and height", measured=measured, limit=limits)


@rule("data.cd-plausible", "Drag coefficient plausible for the body class", "warning",
      needs=("vehicle.class",), sources=(CD_SOURCE,))
def cd_plausible(sheet, ctx):
    """
    What it checks: that the revision's drag coefficient (its result of record) lies in the usual
    range for its body class.

    Why it matters: a Cd far outside its class usually means a wrong reference area, a
    model without wheels or mirrors, a mislabelled result, or a coefficient on another
    axis convention; each would mislead every consequence computed from it.

    How to fix: check the result's reference area, configuration (wheels, mirrors, cooling
    flow) and scale; record them in the result's label.

    Known limits: record-breaking or unusual bodies legitimately fall outside.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: x, speed: 140 km/h, cd: 0.45}]}
        passes: {results: [{kind: cfd, label: x, speed: 140 km/h, cd: 0.30}]}
    """
    found = measured_cd(sheet)
    if found is None:
        return not_assessed("needs a result with a drag coefficient", missing=("results[].cd",))
    cd, where = found
    low, high = CLASS_CD[sheet.get("vehicle.class")]
    measured = f"Cd {cd:.3f} ({where})"
    if not low <= cd <= high:
        return major(f"Cd is outside the usual {sheet.get('vehicle.class')} range", measured=measured,
                     limit=f"{low:.2f}-{high:.2f}")
    return passed("Cd is plausible for the class", measured=measured, limit=f"{low:.2f}-{high:.2f}")


@rule("data.model-reynolds", "Reynolds number of scale-model results", "warning",
      needs=("dimensions.length",),
      thresholds=(Threshold("minimum", "5e6", "", "Re on model length below which results depend on Re",
                            REYNOLDS_SOURCE),),
      sources=(REYNOLDS_SOURCE,))
def model_reynolds(sheet, ctx):
    """
    What it checks: the Reynolds number, on model length, of every scale-model result.

    Why it matters: the separation from rounded edges (front corners, A-pillars, backlight
    transitions) depends on Reynolds number; a small model at low speed can show separations
    the full-size car does not have, or hide ones it has.

    How to fix: test at the highest tunnel speed, use a larger model, or confirm the key
    results at full scale or in CFD at full-scale Reynolds number.

    Known limits: sharp-edged bodies are less sensitive; the threshold is for rounded shapes.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: tunnel, label: quarter, speed: 160 km/h, cd: 0.25, scale: 0.25}]}
        passes: {results: [{kind: tunnel, label: quarter, speed: 250 km/h, cd: 0.25, scale: 0.25}]}
    """
    scaled = [r for r in sheet.results if r.scale < 1.0]
    if not scaled:
        return passed("all results are at full scale", measured="full scale")
    if any(r.speed is None for r in scaled):
        return not_assessed("a scale-model result has no speed", missing=("results[].speed",))
    worst = min(scaled, key=lambda r: r.speed * r.scale)
    re = float(reynolds_number(worst.speed, sheet.get("dimensions.length") * worst.scale, 1.0,
                               ctx.kinematic_viscosity))
    measured = f"Re = {re:.2g} ({worst.label}, scale {worst.scale:g} at {KM_H(worst.speed)})"
    if re < ctx["minimum"]:
        return major("a scale-model result is at a Reynolds number where rounded-edge flows are not yet "
                     "representative", measured=measured, limit=f">= {ctx['minimum']:.0e}")
    return passed("scale-model results are at a sufficient Reynolds number", measured=measured,
                  limit=f">= {ctx['minimum']:.0e}")


@rule("data.yaw-asymmetry", "Yaw sweep symmetry", "warning", needs=(),
      thresholds=(Threshold("difference", "0.005", "", "Cd difference between +yaw and -yaw that is suspicious",
                            COMMON),),
      sources=(COMMON,))
def yaw_asymmetry(sheet, ctx):
    """
    What it checks: in a yaw sweep measured on both sides, the Cd difference between matching
    positive and negative yaw angles.

    Why it matters: a nominally symmetric car should give the same drag at +yaw and -yaw;
    a larger difference points at a model misalignment, tunnel flow angularity, an
    asymmetric configuration (exhaust, open grille on one side) or a sign error.

    How to fix: check the model alignment and the tunnel's flow angularity correction;
    record asymmetric features in the result's label.

    Known limits: real asymmetric underbodies give small genuine differences.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04,
            yaw_sweep: [{yaw: 0 deg, cd: 0.25}, {yaw: 10 deg, cd: 0.26}, {yaw: -10 deg, cd: 0.267}]}]}
        passes: {results: [{kind: cfd, label: test, speed: 140 km/h, cd: 0.25, cl_front: 0.02, cl_rear: 0.04, yaw_sweep:
            [{yaw: 0 deg, cd: 0.25}, {yaw: 10 deg, cd: 0.26}, {yaw: -10 deg, cd: 0.262}]}]}
    """
    pairs = []
    for result in sheet.results:
        by_angle = {round(math.degrees(p.yaw), 3): p.cd for p in result.yaw_sweep}
        pairs += [(angle, abs(cd - by_angle[-angle])) for angle, cd in by_angle.items() if angle > 0 and -angle in by_angle]
    if not pairs:
        return not_assessed("needs a yaw sweep measured at matching positive and negative angles",
                            missing=("results[].yaw_sweep",))
    angle, worst = max(pairs, key=lambda pair: pair[1])
    measured = f"|dCd| = {worst:.4f} at +-{angle:g} deg"
    if worst > ctx["difference"]:
        return major("the yaw sweep is asymmetric", measured=measured, limit=f"<= {ctx['difference']:.3f}")
    return passed("the yaw sweep is symmetric", measured=measured, limit=f"<= {ctx['difference']:.3f}")


def contradictions(sheet) -> list[str]:
    """Features that cannot all be true together (each a readable sentence)."""
    found = []
    kind = sheet.get("powertrain.kind")
    if kind == "electric" and sheet.has("powertrain.fuel"):
        found.append("an electric vehicle with a fuel given")
    if kind == "combustion" and sheet.has("powertrain.battery_usable"):
        found.append("a combustion vehicle with a traction battery given")
    if sheet.get("sides.mirror_kind") in ("camera", "none") and (sheet.get("sides.mirror_area") or 0) > 0.03:
        found.append("camera pods or no mirrors, yet a mirror area above 0.03 m^2")
    if sheet.get("cooling.shutters") == "active" and sheet.get("cooling.inlet_area") == 0:
        found.append("active grille shutters on a front without cooling inlets")
    if (sheet.get("underbody.diffuser_angle") or 0) > 0 and sheet.get("underbody.diffuser_length") == 0:
        found.append("a diffuser angle with a diffuser length of zero")
    if sheet.get("wheels.wheelhouse_vented") is False and sheet.get("cooling.outlet") == "wheelhouse":
        found.append("cooling air vented into the wheelhouse, with the wheelhouse closed to the side")
    return found


@rule("data.contradictions", "Features that contradict each other", "warning", needs=(), sources=(COMMON,),
      optional=("powertrain.kind", "powertrain.fuel", "powertrain.battery_usable", "sides.mirror_kind",
                "sides.mirror_area", "cooling.shutters", "cooling.inlet_area", "underbody.diffuser_angle",
                "underbody.diffuser_length", "wheels.wheelhouse_vented", "cooling.outlet"))
def contradicting_features(sheet, ctx):
    """
    What it checks: pairs of features that cannot both be true (an electric vehicle with a
    fuel, camera pods with a large mirror area, a diffuser angle without a diffuser...).

    Why it matters: a contradiction means at least one value is wrong, and the rules that
    read it give wrong verdicts.

    How to fix: correct the wrong value; the message names the features involved.

    Known limits: only the contradictions listed in the rule's code are detected.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {powertrain.fuel: petrol}}
        passes: {}
    """
    found = contradictions(sheet)
    if found:
        return major("; ".join(found), measured=f"{len(found)} contradiction(s)", limit="none")
    return passed("no contradictions found", measured="none")


@rule("data.measured-cd", "A measured or computed drag result exists", "advisory", needs=(),
      sources=(COMMON,))
def measured_drag(sheet, ctx):
    """
    What it checks: that the revision has at least one CFD, wind-tunnel or road result, not
    only an estimate.

    Why it matters: without a measured or computed Cd, the review's absolute numbers (drag,
    power, energy, range) rest on an estimate; the relative estimates of the findings still hold.

    How to fix: add the latest CFD or tunnel result to the sheet's results, with its speed,
    scale and configuration.

    Known limits: the rule does not judge the quality of the result.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {results: [{kind: estimate, label: x, cd: 0.25}]}
        passes: {results: [{kind: cfd, label: x, speed: 140 km/h, cd: 0.25}]}
    """
    kinds = sorted({r.kind for r in sheet.results})
    if any(k != "estimate" for k in kinds):
        return passed("a measured or computed result exists", measured=", ".join(kinds))
    return major("no CFD, tunnel or road result: the absolute figures rest on an estimate",
                 measured=", ".join(kinds) or "no results", limit="cfd, tunnel or road")


CORRELATION_SOURCE = Source("full-vehicle CFD and full-scale tunnel drag of one configuration usually agree within "
                            "about 5 to 10 counts; larger gaps point at a configuration or set-up mismatch (wheels, "
                            "ground, cooling flow, blockage correction); recalled", "from memory")


@rule("data.cfd-tunnel-correlation", "CFD and tunnel results of one revision agree", "warning", needs=(),
      thresholds=(Threshold("difference", "0.010", "", "Cd difference between a CFD and a full-scale tunnel result "
                            "of one revision that calls for a correlation study (10 counts)", CORRELATION_SOURCE),),
      sources=(CORRELATION_SOURCE,))
def cfd_tunnel_correlation(sheet, ctx):
    """
    What it checks: the largest drag difference between a CFD result and a full-scale tunnel
    result of the same revision.

    Why it matters: when simulation and tunnel disagree, at least one of them does not
    represent the car, and a fix costed on the wrong one can be worth nothing on the road.

    How to fix: run a correlation study: match the configurations (wheel rotation, ground
    simulation, cooling flow, ride height, mirrors), the reference area and the blockage
    correction, then record both results again.

    Known limits: model-scale tunnel results are left out (their Reynolds number differs);
    the threshold is a recalled typical agreement, not a standard.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: rans, cd: 0.232}, {kind: tunnel, label: full scale, cd: 0.250}]}
        passes: {results: [{kind: cfd, label: rans, cd: 0.232}, {kind: tunnel, label: full scale, cd: 0.236}]}
    """
    cfd = [r for r in sheet.results if r.kind == "cfd"]
    tunnel = [r for r in sheet.results if r.kind == "tunnel" and r.scale == 1.0]
    if not cfd or not tunnel:
        return passed("no CFD and full-scale tunnel pair to compare", measured="no pair")
    gap, a, b = max(((abs(c.cd - t.cd), c, t) for c in cfd for t in tunnel), key=lambda pair: pair[0])
    measured = f"|Cd CFD - Cd tunnel| = {COUNTS(gap, 1)} ({a.label} vs {b.label})"
    limit = f"<= {COUNTS(ctx['difference'], None)}"
    if gap > ctx["difference"]:
        return major("CFD and tunnel disagree: correlate them before costing fixes on either",
                     measured=measured, limit=limit)
    return passed("CFD and tunnel agree", measured=measured, limit=limit)
