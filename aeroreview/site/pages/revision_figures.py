"""The figures section of a revision's page: the digest's series drawn, with alt text.

Figure data are rounded here (what a figure shows, and what its cache key depends on);
every value comes from :class:`aeroreview.digest.RevisionFigures` or the review.
"""

from __future__ import annotations

from dataclasses import asdict

from aeroreview.digest import AhmedCurve, RevisionFigures, YawSweep
from aeroreview.display import whole_score
from aeroreview.results.evidence import Buildup, HistoryFigure
from aeroreview.results.history import COUNT
from aeroreview.review import Review
from aeroreview.rules import ZONES
from aeroreview.site.pages.common import Output, esc

WATERFALL_STEPS = 8  # the largest fixes drawn one by one; the rest as one step (our convention)


def ahmed_data(curve: AhmedCurve) -> dict:
    return {**asdict(curve), "critical_low": round(curve.critical_low, 2),
            "critical_high": round(curve.critical_high, 2),
            "angle": None if curve.angle is None else round(curve.angle, 2)}


def section(out: Output, review: Review, figures: RevisionFigures) -> list[str]:
    n = review.key_numbers
    lines = ["## Figures", ""]
    zone_data = {"zones": [{"title": ZONES[z.zone], "score": z.score,
                            "coverage": round(z.coverage, 3)} for z in review.zones.values()],
                 "score": review.score,
                 "coverage": round(review.coverage, 3)}
    lines += [out.figure("zones", zone_data, "Zone scores: " + ", ".join(
        f"{z['title']} {whole_score(z['score'])}" for z in zone_data["zones"]),
        2), ""]
    drag = figures.drag
    lines += [out.figure("drag-power", {"speed_km_h": drag.speed_km_h, "drag_N": [round(d, 2) for d in drag.drag_N],
                                        "power_kW": [round(p, 3) for p in drag.power_kW],
                                        "reference_km_h": n.reference_speed_km_h, "cd": n.cd, "area": n.area},
                         f"Drag force and power against speed; at {n.reference_speed_km_h:.0f} km/h "
                         f"{n.drag_N:.0f} N and {n.drag_power_kW:.1f} kW", 2), ""]
    lift = figures.lift
    if lift:
        data = {"speed_km_h": lift.speed_km_h, "front_kg": [round(f, 2) for f in lift.front_kg],
                "rear_kg": [round(r, 2) for r in lift.rear_kg], "rear_static_kg": round(lift.rear_static_kg, 1),
                "reference_km_h": n.reference_speed_km_h, "top_km_h": lift.top_km_h,
                "cl_front": lift.cl_front, "cl_rear": lift.cl_rear}
        lines += [out.figure("lift", data, f"Lift per axle against speed: at {lift.top_km_h:.0f} km/h front "
                             f"{data['front_kg'][-1]:+.0f} kg, rear {data['rear_kg'][-1]:+.0f} kg", 2), ""]
    breakdown = {k: round(v, 4) for k, v in n.energy_breakdown_kWh.items()}
    lines += [out.figure("energy", {**breakdown, "cycle": n.cycle, "aero_share": round(n.aero_share, 4)},
                         f"Energy breakdown on {n.cycle}: rolling {breakdown['rolling']:.2f} kWh, aerodynamic "
                         f"{breakdown['aero']:.2f} kWh, braking {breakdown['braking']:.2f} kWh", 2), ""]
    if figures.ahmed:
        lines += [out.figure("ahmed", ahmed_data(figures.ahmed), f"The backlight angle {figures.ahmed.angle:.1f} deg "
                             "on the Ahmed-body drag curve, with the critical region near 30 deg", 2), ""]
    e = review.estimate
    if e.waterfall:
        steps = [[rule, round(counts, 2)] for rule, counts in e.waterfall[:WATERFALL_STEPS]]
        rest = round(sum(counts for _, counts in e.waterfall[WATERFALL_STEPS:]), 2)
        data = {"cd": round(e.cd, 4), "floor_cd": round(e.floor_cd, 4), "steps": steps, "rest": rest}
        lines += [out.figure("waterfall", data, f"Savings waterfall from Cd {e.cd:.3f} to {e.cd_after['mid']:.3f} "
                             f"(combined mid) through the marginal savings of {len(e.waterfall)} ranked fixes; "
                             f"floor of the class Cd {e.floor_cd:.3f}", 2), ""]
    if figures.yaw:
        lines += yaw(out, figures.yaw)
    if figures.geometry:
        lines += geometry(out, review, figures)
    return lines + solver_files(out, figures)


def solver_files(out: Output, figures: RevisionFigures) -> list[str]:
    """The force history and the build-up along x that the sheet's results were read from."""
    if not (figures.history or figures.buildup or figures.result_problems):
        return []
    lines = ["### From the solver's files", ""]
    if figures.history:
        lines += [out.figure("history", asdict(figures.history), history_alt(figures.history), 2), ""]
    if figures.buildup:
        lines += [out.figure("buildup", asdict(figures.buildup), buildup_alt(figures.buildup), 2), ""]
    lines += [f"- Not drawn: {esc(problem)}" for problem in figures.result_problems]
    return lines + ([""] if figures.result_problems else [])


def history_alt(h: HistoryFigure) -> str:
    means = ", ".join(f"{key} {h.mean[key]:.4f} +- {h.band[key] / COUNT:.2f} counts" for key in list(h.values)[:2])
    return (f"Force history of {h.label}: settled from {h.step_name} {h.settled_from:g} to {h.settled_to:g}, "
            f"mean with its 2-standard-error band {means}; {h.verdict}")


def buildup_alt(b: Buildup) -> str:
    zones = ", ".join(f"{z.title} {z.start:.2f} to {z.end:.2f} m" for z in b.zones)
    return (f"Cumulative drag and lift from the nose rearward for {b.label}: Cd {b.cd[-1]:.3f} and "
            f"Cl {b.cl[-1]:+.3f} at the tail; zones along x: {zones}")


def yaw(out: Output, sweep: YawSweep) -> list[str]:
    if sweep.cd_wind_averaged is None:
        return [f"Yaw sweep: no wind-averaged value ({esc(sweep.problem)}).", ""]
    data = {"yaw_deg": [round(a, 3) for a in sweep.yaw_deg], "cd": sweep.cd,
            "cd_wind_averaged": round(sweep.cd_wind_averaged, 5), "max_yaw_deg": round(sweep.max_yaw_deg, 3),
            "wind_m_s": round(sweep.wind_m_s, 3), "speed_km_h": round(sweep.speed_km_h, 1), "label": sweep.label}
    return [out.figure("yaw", data, f"Yaw sweep of {sweep.label}: wind-averaged Cd {sweep.cd_wind_averaged:.4f} at "
                       f"{sweep.speed_km_h:.0f} km/h", 2), ""]


def geometry(out: Output, review: Review, figures: RevisionFigures) -> list[str]:
    """The measured silhouette, each zone in its review status, and the horizontal sections."""
    data = figures.geometry
    silhouette = {**data["silhouette"],
                  "parts": [{**part, "status": figures.zone_status.get(part["zone"], "not assessed")}
                            for part in data["silhouette"]["parts"]],
                  "title": f"Measured centreline of {review.sheet.geometry.file}, zones by review status"}
    alt = "Side silhouette measured from the surface, coloured by zone status: " + ", ".join(
        f"{p['zone']} {p['status']}" for p in silhouette["parts"]) + "; " + ", ".join(
        n["text"] for n in silhouette["notes"])
    lines = ["### Measured surface", "", out.figure("silhouette", silhouette, alt, 2), ""]
    if data["sections"]["sections"]:
        lines += [out.figure("sections", data["sections"], "Horizontal sections at " + ", ".join(
            s["label"] for s in data["sections"]["sections"]), 2), ""]
    return lines
