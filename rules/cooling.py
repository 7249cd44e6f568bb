"""Cooling and internal flow: every kilogram of air through the front costs drag."""

from __future__ import annotations

from aeroreview.rules import COMMON, Source, Threshold, counts_range, major, minor, passed, rule

COOLING_SOURCE = Source("cooling drag is typically 10-50 counts, rising with the inlet area; from memory "
                        "(Hucho 1998, ch. 11, engine cooling)", "from memory")


@rule("cooling.inlet-area", "Cooling inlet area against the thermal requirement", "failure",
      needs=("cooling.inlet_area", "cooling.required_inlet_area"),
      thresholds=(Threshold("oversize", "125 %", "%", "inlet / required above which the surplus costs drag", COMMON),
                  Threshold("undersize", "100 %", "%", "inlet / required below which cooling is at risk", COMMON)),
      sources=(COOLING_SOURCE, Source("effect: about 2-4 counts per 0.01 m^2 of surplus inlet; from memory",
                                      "from memory")))
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

    Known limits: the requirement comes from the sheet; the rule cannot check it.
    """
    inlet, required = sheet.get("cooling.inlet_area"), sheet.get("cooling.required_inlet_area")
    if required <= 0:
        return passed("no cooling requirement given (no inlets needed)", measured=f"{inlet:.3f} m^2")
    ratio = inlet / required
    measured = f"{inlet:.3f} m^2 = {ratio * 100:.0f} % of the required {required:.3f} m^2"
    if ratio < ctx["undersize"]:
        return major("the cooling inlet is smaller than the thermal requirement: cooling is at risk",
                     measured=measured, limit=f">= {ctx['undersize'] * 100:.0f} %",
                     margin=f"{(ratio - ctx['undersize']) * 100:+.0f} %")
    if ratio > ctx["oversize"]:
        surplus = inlet - required * ctx["oversize"]
        return major("the cooling inlet is larger than the thermal requirement needs", measured=measured,
                     limit=f"<= {ctx['oversize'] * 100:.0f} %", margin=f"{(ratio - ctx['oversize']) * 100:+.0f} %",
                     counts=counts_range(200 * surplus, 400 * surplus))
    return passed("the cooling inlet matches the requirement", measured=measured,
                  limit=f"{ctx['undersize'] * 100:.0f}-{ctx['oversize'] * 100:.0f} %")


@rule("cooling.shutters", "Grille shutters", "warning",
      needs=("cooling.shutters",),
      sources=(Source("effect: active shutters save 5-20 counts at motorway speed when closed; from memory "
                      "(published production figures)", "from memory"),))
def shutters(sheet, ctx):
    """
    What it checks: whether the cooling inlets can be closed when cooling is not needed.

    Why it matters: the inlet is sized for the worst case (a hill climb at high ambient
    temperature); most of the time a fraction of it would do. Shutters close the rest and
    recover most of the cooling drag.

    How to fix: fit active shutters behind the grille, controlled by coolant and charge
    temperatures; passive (pressure-opened) flaps are a cheaper, partial step.

    Known limits: the gain on a drive cycle depends on how often the shutters are closed;
    electric vehicles need less cooling air and gain more.
    """
    kind = sheet.get("cooling.shutters")
    if kind == "none":
        return major("the cooling inlets cannot be closed", measured="none", limit="active shutters",
                     counts=counts_range(5, 20))
    if kind == "passive":
        return minor("passive flaps recover only part of the cooling drag", measured="passive",
                     limit="active shutters", counts=counts_range(2, 8))
    return passed("active shutters close the inlets when cooling is not needed", measured="active")


@rule("cooling.sealing", "Inlets sealed to the heat exchangers", "warning",
      needs=("cooling.ducts_sealed",),
      sources=(COMMON, Source("effect: 3-10 counts of bypass drag; from memory", "from memory")))
def sealing(sheet, ctx):
    """
    What it checks: whether every leak path between the grille and the heat exchangers is
    closed, so that all inlet air passes through the cores.

    Why it matters: air that bypasses the radiator still loses momentum in the engine bay
    but does no cooling; sealing lets the same cooling work with a smaller inlet.

    How to fix: close the gaps around the heat exchangers with foam seals or ducts.

    Known limits: service access sometimes forces small gaps.
    """
    if sheet.get("cooling.ducts_sealed"):
        return passed("the cooling ducts are sealed", measured="sealed")
    return major("cooling air bypasses the heat exchangers", measured="not sealed", limit="sealed",
                 counts=counts_range(3, 10))
