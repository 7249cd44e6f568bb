"""Cooling and internal flow: every kilogram of air through the front costs drag."""

from __future__ import annotations

from aeroreview.display import M2, PERCENT, Reading
from aeroreview.rules import COMMON, Effect, Source, Threshold, major, minor, passed, rule

COOLING_SOURCE = Source("Katz, Automotive Aerodynamics, Wiley (ISBN 978-1-119-18572-7), section on cooling drag, p. 538: "
                        "passenger-car cooling drag dCd of about 0.01-0.07, most 0.03-0.05 (figure read on an online "
                        "copy of the page; title and ISBN confirmed on a bookseller's page; author and year 2016 "
                        "recalled, so not marked published)", "from memory")
# Share of the time a closed-able inlet stays closed at motorway speed, so its surplus costs drag (from memory).
OPEN_SHARE = {"active": 0.3, "passive": 0.7, "none": 1.0}
OPEN_SHARE_SOURCE = Source(f"active shutters keep a surplus inlet closed about {100 * (1 - OPEN_SHARE['active']):.0f} % "
                           f"of motorway driving, passive flaps about {100 * (1 - OPEN_SHARE['passive']):.0f} %; "
                           "recalled, not checked", "from memory")
INLET_EFFECT = Effect(2, 4, "about {low}-{high} counts per 0.01 m^2 of surplus inlet while open; recalled, not checked",
                      "from memory")
INLET_EFFECT_AREA = 0.01  # m^2: the area INLET_EFFECT is quoted per


@rule("cooling.inlet-area", "Cooling inlet area against the thermal requirement", "failure",
      needs=("cooling.inlet_area", "cooling.required_inlet_area"),
      thresholds=(Threshold("oversize", "125 %", "%", "inlet / required above which the surplus costs drag", COMMON),
                  Threshold("undersize", "100 %", "%", "inlet / required below which cooling is at risk", COMMON)),
      optional=("cooling.shutters", "cooling.ducts_sealed"),
      sources=(COOLING_SOURCE, INLET_EFFECT, OPEN_SHARE_SOURCE))
def inlet_area(sheet, ctx):
    """
    What it checks: the open area of the cooling inlets against the area the thermal team
    needs at the worst-case condition.

    Why it matters: air taken in for cooling loses momentum in the heat exchangers and
    leaves through the engine bay: cooling drag grows with the inlet area. An oversized
    inlet pays that price for no thermal benefit; an undersized one is a cooling risk at
    high load and high ambient temperature.

    How to fix: trim the inlet to the requirement plus a margin (up to 25 %), and use
    shutters to close the surplus when cooling is not needed. Never trim below the
    requirement without the thermal team's sign-off.

    An oversized inlet behind active shutters and sealed ducts is a smaller matter: the
    shutters close the surplus most of the time, so it is reported one level lower and its
    cost is scaled by the share of time the inlet is open.

    Known limits: the requirement comes from the sheet; the rule cannot check it.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (failure): {features: {cooling.inlet_area: 0.03 m^2}}
        passes: {features: {cooling.inlet_area: 0.05 m^2}}
    """
    inlet, required = sheet.get("cooling.inlet_area"), sheet.get("cooling.required_inlet_area")
    if required <= 0:
        return passed("no cooling requirement given (no inlets needed)", measured=M2(inlet, 3))
    ratio = inlet / required
    small, large = Reading(ratio, PERCENT, at_least=ctx["undersize"]), Reading(ratio, PERCENT, at_most=ctx["oversize"])
    measured = f"{M2(inlet, 3)} = {PERCENT(ratio, max(small.digits, large.digits))} of the required {M2(required, 3)}"
    if small.beyond:
        return major("the cooling inlet is smaller than the thermal requirement: cooling is at risk",
                     **small.shown(measured))
    if large.beyond:
        surplus = inlet - required * ctx["oversize"]
        shutters = sheet.get("cooling.shutters") or "none"
        controlled = shutters == "active" and sheet.get("cooling.ducts_sealed") is True
        open_share = OPEN_SHARE[shutters]
        extra = dict(large.shown(measured),
                     counts=ctx.effect().counts(surplus / INLET_EFFECT_AREA * open_share),
                     details={"open_share": open_share})
        if controlled:
            return minor("the cooling inlet is larger than needed, but active shutters and sealed ducts close the "
                         "surplus most of the time", **extra)
        return major("the cooling inlet is larger than the thermal requirement needs", **extra)
    return passed("the cooling inlet matches the requirement", measured=measured,
                  limit=PERCENT.span(ctx["undersize"], ctx["oversize"]))


ELECTRIC_INLET_SCALE = 0.6  # an electric car's cooling drag against a combustion car's (from memory)


def _shutter_effects(scale: float, car: str, prefix: str) -> tuple[Effect, Effect]:
    """What closing the inlets saves on ``car``: no shutters (5-20 counts on a combustion car), passive
    flaps (2-8), recalled, not checked; ``scale`` x those for other cars. Named ``prefix`` + none, passive."""
    return (Effect(5 * scale, 20 * scale, "active shutters save {low}-{high} counts at motorway speed when closed on "
                   + car + "; recalled, not checked", "from memory", name=prefix + "none"),
            Effect(2 * scale, 8 * scale, "{low}-{high} counts left by passive flaps on " + car + "; recalled, not "
                   "checked", "from memory", name=prefix + "passive"))


@rule("cooling.shutters", "Grille shutters", "warning",
      needs=("cooling.shutters",),
      optional=("powertrain.kind",),
      sources=(*_shutter_effects(1.0, "a combustion car", ""),
               *_shutter_effects(ELECTRIC_INLET_SCALE, "an electric car, whose inlets are smaller", "electric_"),
               Source("de Souza, Raeesi, Belzile, Caffrey and Schmitt, 'Investigation of drag reduction technologies "
                      "for light-duty vehicles...', SAE Int. J. Adv. Curr. Pract. Mobil. 1(3) (2019) 1233-1250, "
                      "doi 10.4271/2019-01-0644 (title/authors/year/venue and abstract checked on a PMC copy): active "
                      "grille shutters among the technologies measured full scale; the counts are not from it",
                      "published")))
def shutters(sheet, ctx):
    """
    What it checks: whether the cooling inlets can be closed when cooling is not needed.

    Why it matters: the inlet is sized for the worst case (a hill climb at high ambient
    temperature); most of the time a fraction of it would do. Shutters close the rest and
    recover most of the cooling drag.

    How to fix: fit active shutters behind the grille, controlled by coolant and charge
    temperatures; passive (pressure-opened) flaps are a cheaper, partial step.

    Known limits: the gain on a drive cycle depends on how often the shutters are closed;
    an electric vehicle needs far less cooling air than a combustion car, so its inlets,
    and what shutters recover, are smaller.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {cooling.shutters: none}}
        passes: {features: {cooling.shutters: active}}
    """
    kind = sheet.get("cooling.shutters")
    drive = "electric_" if sheet.get("powertrain.kind") == "electric" else ""
    if kind == "none":
        return major("the cooling inlets cannot be closed", measured="none", limit="active shutters",
                     counts=ctx.effect(drive + "none").counts())
    if kind == "passive":
        return minor("passive flaps recover only part of the cooling drag", measured="passive",
                     limit="active shutters", counts=ctx.effect(drive + "passive").counts())
    return passed("active shutters close the inlets when cooling is not needed", measured="active")


@rule("cooling.sealing", "Inlets sealed to the heat exchangers", "warning",
      needs=("cooling.ducts_sealed",),
      sources=(COMMON, Effect(3, 10, "{low}-{high} counts of bypass drag; from memory", "from memory")))
def sealing(sheet, ctx):
    """
    What it checks: whether every leak path between the grille and the heat exchangers is
    closed, so that all inlet air passes through the cores.

    Why it matters: air that bypasses the radiator still loses momentum in the engine bay
    but does no cooling; sealing lets the same cooling work with a smaller inlet.

    How to fix: close the gaps around the heat exchangers with foam seals or ducts.

    Known limits: service access sometimes forces small gaps.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {cooling.ducts_sealed: false}}
        passes: {features: {cooling.ducts_sealed: true}}
    """
    if sheet.get("cooling.ducts_sealed"):
        return passed("the cooling ducts are sealed", measured="sealed")
    return major("cooling air bypasses the heat exchangers", measured="not sealed", limit="sealed",
                 counts=ctx.effect().counts())


# Cooling inlet area / frontal area that a powertrain usually needs (low, high); from memory, not checked: an
# electric drive rejects a fraction of a combustion engine's heat at motorway speed.
INLET_SHARE_SOURCE = Source("usual cooling inlet area as a share of the frontal area: combustion 3-5 %, hybrid 2.5-4 %, "
                            "electric 1-2.5 %; recalled, not checked", "from memory")


@rule("cooling.inlet-share", "Cooling inlet area for the powertrain", "warning",
      needs=("cooling.inlet_area", "dimensions.frontal_area", "powertrain.kind"),
      thresholds=(Threshold("combustion", "5 %", "%", "inlet / frontal area a combustion car rarely needs",
                            INLET_SHARE_SOURCE),
                  Threshold("hybrid", "4 %", "%", "the same for a hybrid", INLET_SHARE_SOURCE),
                  Threshold("electric", "2.5 %", "%", "the same for an electric vehicle", INLET_SHARE_SOURCE)),
      sources=(INLET_SHARE_SOURCE, COOLING_SOURCE, INLET_EFFECT))
def inlet_share(sheet, ctx):
    """
    What it checks: the cooling inlet area as a share of the frontal area, against what
    the powertrain usually needs: a combustion engine rejects far more heat to the air than
    an electric drive.

    Why it matters: cooling drag grows with the air taken in; an electric vehicle with a
    combustion car's grille pays cooling drag for heat it does not have. The rule catches
    this even when the thermal requirement is not in the sheet.

    How to fix: size the inlets from the thermal team's worst case for this powertrain
    (battery fast-charge and hill climb for an electric vehicle), and close the rest.

    Known limits: performance cars, towing and hot-market variants need more; the sheet's
    own requirement, where given, is judged by the inlet-area rule.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {cooling.inlet_area: 0.08 m^2}}
        passes: {features: {cooling.inlet_area: 0.05 m^2}}
    """
    kind = sheet.get("powertrain.kind")
    share, limit_share = sheet.get("cooling.inlet_area") / sheet.get("dimensions.frontal_area"), ctx[kind]
    reading = Reading(share, PERCENT, at_most=limit_share, places=1, limit_places=1)
    measured = f"{PERCENT(share, reading.digits)} of A ({kind})"
    if reading.beyond:
        surplus = (share - limit_share) * sheet.get("dimensions.frontal_area")
        return major(f"the cooling inlets are large for {'an' if kind[0] in 'aeiou' else 'a'} {kind} powertrain",
                     **reading.shown(measured), counts=ctx.effect().counts(surplus / INLET_EFFECT_AREA))
    return passed(f"the cooling inlet area suits the {kind} powertrain", **reading.shown(measured, margin=False))


@rule("cooling.brake-ducts", "Brake cooling behind closed rims", "advisory",
      needs=("cooling.brake_ducts", "wheels.rim_openness"),
      thresholds=(Threshold("closed", "25 %", "%", "rim openness below which the brakes need ducted air", COMMON),),
      sources=(COMMON, Source("effect: none on drag; a brake-temperature risk (safety), so no counts; common practice", "common practice")))
def brake_ducts(sheet, ctx):
    """
    What it checks: that closed, low-drag rims are paired with dedicated brake cooling ducts.

    Why it matters: closing the rims removes the air that cooled the brakes; without ducts
    the brakes can overheat on a long descent or repeated stops, a safety matter. The
    ducts let the aerodynamic gain of closed rims be kept.

    How to fix: add brake ducts from the bumper or underbody to the front brakes, sized
    with the brake team, or open the rims again. Confirm brake temperatures by test.

    Known limits: small, light vehicles with large discs may not need ducts; the brake
    team's test decides.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {cooling.brake_ducts: false}}
        passes: {features: {cooling.brake_ducts: true}}
    """
    openness, ducts = sheet.get("wheels.rim_openness"), sheet.get("cooling.brake_ducts")
    measured = f"rims {PERCENT(openness)} open, brake ducts {'fitted' if ducts else 'none'}"
    if openness < ctx["closed"] and not ducts:
        return minor("closed rims without brake ducts: check brake cooling by test", measured=measured,
                     limit=f"ducts when rims are under {PERCENT(ctx['closed'])} open")
    return passed("brake cooling is provided for", measured=measured)


@rule("cooling.outlet", "Where the cooling air leaves", "advisory",
      needs=("cooling.outlet",), optional=("wheels.wheelhouse_vented",),
      sources=(COMMON, Effect(1, 4, "{low}-{high} counts when outlet air pressurises a closed wheelhouse; "
                              "recalled, not checked", "from memory")))
def outlet(sheet, ctx):
    """
    What it checks: where the cooling air leaves the engine bay, and whether the place can
    take it.

    Why it matters: outlet air returns to the outer flow; where it meets a low pressure and
    leaves along the flow it costs little. Into a closed wheelhouse it raises the pressure
    there and pushes air out through the arch and under the car; out of the hood it trims
    front lift but must leave along the surface.

    How to fix: vent the wheelhouse to the side behind the wheel when cooling air goes
    there; shape hood outlets to leave tangentially.

    Known limits: judges the outlet location only, not its area or shape.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (advisory): {features: {wheels.wheelhouse_vented: false}}
        passes: {features: {wheels.wheelhouse_vented: true}}
    """
    where = sheet.get("cooling.outlet")
    if where == "wheelhouse" and sheet.get("wheels.wheelhouse_vented") is not True:
        return minor("cooling air goes into a wheelhouse that is not vented to the side", measured=where,
                     limit="a vented wheelhouse", counts=ctx.effect().counts())
    return passed(f"the cooling air leaves through the {where}", measured=where)
