"""``aeroreview measure``: the features of a sheet, measured from the vehicle's surface.

Takes a :class:`~aeroreview.surfacefile.Surface` (read by :mod:`aeroreview.surfacefile`)
and measures it with :mod:`aeroreview.calc.geometry`. Results can be merged into a sheet:
ruamel.yaml keeps every comment and every value the user typed; a typed value is only
replaced with ``--overwrite``, and then the original file is kept as a backup.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from aeroreview import catalogue, plausible, sheetfill
from aeroreview.calc.geometry.profile import Measurement, measure_centreline, plan_taper
from aeroreview.calc.geometry.projection import projected_area
from aeroreview.calc.geometry.sections import Outline, densify, outline, slice_levels, slice_mesh
from aeroreview.problems import InputError, Problem
from aeroreview.sheetedit import edit_sheet
from aeroreview.units import from_si
from aeroreview.surfacefile import MeasureError, Surface, load_surface  # noqa: F401  (the measure API)

SECTION_STEP = 0.2  # m between horizontal sections (our convention)
PROJECTION_ROWS = 1000  # scan lines: errors far below the 0.5 % required on analytic shapes (tests)


@dataclass
class Result:
    """Everything measured on a surface."""

    length: float | None = None
    width: float | None = None
    height: float | None = None
    frontal_area: float | None = None
    measurements: list[Measurement] = field(default_factory=list)
    centreline: Outline | None = None
    sections: list[dict] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)

    def measured(self) -> dict[str, Measurement]:
        return {m.key: m for m in self.measurements if m.measured}


def _polyline_points(segments2d: np.ndarray, length: float) -> np.ndarray:
    return densify(segments2d, length / 3000)


def measure(surface: Surface, heights: list[float] | None = None) -> Result:
    """Measure a loaded surface."""
    if surface.profile is not None:
        return _measure_profile(surface)
    v, f = surface.vertices, surface.faces
    result = Result(notes=[surface.units_note, *surface.notes])
    length, width, top = (float(np.ptp(v[:, 0])), float(np.ptp(v[:, 1])), float(v[:, 2].max()))
    result.length, result.width, result.height = length, width, top
    result.frontal_area = projected_area(v, f, axis=0, rows=PROJECTION_ROWS, one_sided=surface.closed)
    dims = [("dimensions.length", length, "x extent of the surface"),
            ("dimensions.width", width, "y extent of the surface (mirrors included if modelled)"),
            ("dimensions.height", top, "highest point above the ground plane"),
            ("dimensions.frontal_area", result.frontal_area,
             f"area of the union of the faces projected along x ({PROJECTION_ROWS} scan lines)")]
    result.measurements += [Measurement(k, value, method) for k, value, method in dims]
    middle = 0.5 * (v[:, 1].min() + v[:, 1].max())
    cut = slice_mesh(v, f, 1, middle)
    if len(cut) < 10:
        result.notes.append("the symmetry plane cuts too few faces for a centreline section")
    else:
        result.centreline = outline(_polyline_points(cut[:, :, [0, 2]], length), bins=2500)
        result.measurements += measure_centreline(result.centreline, 0.0)
    heights = heights or [h for h in np.arange(SECTION_STEP, 0.95 * top, SECTION_STEP)]  # below the roof skin
    belt = 0.55 * top
    window = min(0.3, 0.1 * length)
    glass_foot = _backlight_foot(result)
    levels = sorted(set([round(float(h), 4) for h in heights] + [round(belt, 4)]))
    for h, cut in zip(levels, slice_levels(v, f, 2, levels)):
        if len(cut) < 10:
            continue
        plan = outline(_polyline_points(cut[:, :, [0, 1]], length), bins=600)
        taper = plan_taper(plan, window)
        entry = {"height_m": h, "width_m": float(plan.upper[:, 1].max() - plan.lower[:, 1].min()),
                 "taper_deg": None if taper.value is None else math.degrees(taper.value), "method": taper.method,
                 "outline": plan, "cuts_backlight": glass_foot is not None and h >= glass_foot}
        result.sections.append(entry)
        if h == round(belt, 4):
            result.measurements.append(Measurement("rear.side_taper_angle", taper.value,
                                                   f"section at belt height {h:.3f} m (0.55 x height): {taper.method}"))
    result.notes += plausible.warnings_for(result.measurements, result.length, surface.ground_given)
    return result


def _backlight_foot(result: Result) -> float | None:
    """Height [m] of the lower end of the backlight on the centreline: a horizontal section above it
    ends on the glass or the roof, so its plan angle there is no rear taper."""
    glass = result.measured().get("rear.backlight_angle")
    if result.centreline is None or glass is None or not glass.span:
        return None
    upper = result.centreline.upper
    return float(np.interp(glass.span[1], upper[:, 0], upper[:, 1]))


def _section_label(section: dict) -> str:
    where = "plan outline" if section["height_m"] is None else f"z = {section['height_m']:.3f} m"
    if section.get("cuts_backlight"):
        return f"{where}: cuts the backlight, so not a rear taper"
    return where + ("" if section["taper_deg"] is None else f", rear taper {section['taper_deg']:.1f} deg")


def _measure_profile(surface: Surface) -> Result:
    points = surface.profile
    segments = np.stack([points[:-1], points[1:]], axis=1)
    length = float(np.ptp(points[:, 0]))
    shape = outline(densify(segments, length / 3000))
    result = Result(notes=[surface.units_note, f"2-D {surface.profile_kind} profile: no frontal area or sections"])
    result.length = length
    if surface.profile_kind == "centreline":
        result.height = float(points[:, 1].max())
        result.centreline = shape
        result.measurements += [Measurement("dimensions.length", length, "x extent of the profile"),
                                Measurement("dimensions.height", result.height, "highest point of the profile")]
        result.measurements += measure_centreline(shape, 0.0)
    else:
        result.width = float(np.ptp(points[:, 1]))
        result.measurements += [Measurement("dimensions.length", length, "x extent of the plan outline"),
                                Measurement("dimensions.width", result.width, "y extent of the plan outline")]
        taper = plan_taper(shape, min(0.3, 0.1 * length))
        result.measurements.append(taper)
        result.sections.append({"height_m": None, "width_m": result.width,
                                "taper_deg": None if taper.value is None else math.degrees(taper.value),
                                "method": taper.method, "outline": shape})
    result.notes += plausible.warnings_for(result.measurements, result.length, surface.ground_given)
    return result


# -- output ---------------------------------------------------------------------------
def _shown(m: Measurement) -> tuple[float, str]:
    unit = catalogue.feature(m.key).unit if m.key in catalogue.BY_KEY else ""
    return from_si(m.value, unit) + 0.0, unit  # + 0.0: never show "-0"


def as_json(result: Result) -> dict:
    def line(points, keep=400):
        step = max(1, len(points) // keep)
        return [[round(float(x), 5), round(float(y), 5)] for x, y in points[::step]]

    features = {}
    for key, m in result.measured().items():
        value, unit = _shown(m)
        features[key] = {"value": value, "unit": unit, "method": m.method}
    return {
        "length_m": result.length, "width_m": result.width, "height_m": result.height,
        "frontal_area_m2": result.frontal_area, "features": features,
        "not_measured": {m.key: m.method for m in result.measurements if not m.measured},
        "sections": {
            "centreline": None if result.centreline is None else {"upper": line(result.centreline.upper),
                                                                  "lower": line(result.centreline.lower)},
            "horizontal": [{"height_m": s["height_m"], "width_m": s["width_m"], "taper_deg": s["taper_deg"],
                            "cuts_backlight": bool(s.get("cuts_backlight")),
                            "method": s["method"], "upper": line(s["outline"].upper, 200),
                            "lower": line(s["outline"].lower, 200)} for s in result.sections],
        },
        "notes": result.notes,
    }


def as_text(result: Result, source: str) -> str:
    lines = [f"{source}: " + "; ".join(result.notes)]
    width = max(len(m.key) for m in result.measurements) if result.measurements else 10
    for m in result.measurements:
        if m.measured:
            value, unit = _shown(m)
            lines.append(f"  {m.key:<{width}}  {f'{value:.4g} {unit}'.strip():>14}  {m.method}")
        else:
            lines.append(f"  {m.key:<{width}}  {'not measured':>14}  {m.method}")
    for s in result.sections:
        lines.append(f"  section {_section_label(s)}; width {s['width_m']:.3f} m")
    return "\n".join(lines) + "\n"


# -- merging into a sheet -------------------------------------------------------------
def merge_into_sheet(sheet_path: str | Path, result: Result, source: str, overwrite: bool = False) -> dict:
    """Write the measured features into a sheet, keeping comments and the user's values
    (through :func:`aeroreview.sheetedit.edit_sheet`, which keeps everything else too).

    Template placeholders are replaced and commented template lines filled where they stand
    (:mod:`aeroreview.sheetfill`). Returns {"added": [...], "filled": [...], "kept": [...],
    "differs": {key: "sheet X, surface Y"} for kept values beyond tolerance, "replaced": [...],
    "backup": path or None}. Nothing is written when the merged sheet would not validate.
    """
    from ruamel.yaml.comments import CommentedMap

    report = {"added": [], "filled": [], "kept": [], "differs": {}, "replaced": [], "backup": None}

    def merge(data) -> tuple[dict, bool]:
        if not isinstance(data, dict) or not isinstance(data.get("features"), dict):
            raise InputError([Problem(str(sheet_path), 1, 1, "the sheet has no 'features' mapping", "add `features:`")])
        features = data["features"]
        for key, m in result.measured().items():
            if key not in catalogue.BY_KEY:
                continue
            value, unit = _shown(m)
            entry = CommentedMap(value=f"{value:.4g} {unit}".strip(), source=f"measured from {source}", note=m.method)
            entry.fa.set_flow_style()
            if not sheetfill.is_unfilled(features, key) and not overwrite:
                report["kept"].append(key)
                differs = sheetfill.disagreement(key, features[key], m.value)
                if differs:
                    report["differs"][key] = differs
                continue
            replacing = not sheetfill.is_unfilled(features, key)
            where = sheetfill.place(features, key, entry)
            report["replaced" if replacing else "added" if where == "appended" else "filled"].append(key)
        return report, bool(report["replaced"])

    edit = edit_sheet(sheet_path, merge)
    report["backup"] = None if edit.backup is None else str(edit.backup)
    return report


# -- figures --------------------------------------------------------------------------
def _thin(points, keep=300) -> list[list[float]]:
    """Every step-th point, and always the last, so a closed outline stays closed."""
    step = max(1, len(points) // keep)
    kept = list(points[::step]) + ([points[-1]] if (len(points) - 1) % step else [])
    return [[round(float(x), 4), round(float(y), 4)] for x, y in kept]


def silhouette_data(result: Result, statuses: dict[str, str] | None = None, title: str = "") -> dict:
    """Figure data for the centreline section: the outline split into zones (coloured by
    ``statuses``, zone -> review status, when given) and the measured angles and radii."""
    line = result.centreline
    measured = result.measured()
    screen = measured.get("windshield.angle")
    front_end = screen.span[0] if screen and screen.span else line.x_min + 0.25 * (line.x_max - line.x_min)
    screen_end = screen.span[1] if screen and screen.span else front_end
    statuses = statuses or {}
    parts = []
    nose_face, base = line.lower[:1], line.lower[-1:]  # close the outline: the nose face and the base
    for zone, points in (("front", np.vstack([nose_face, line.upper[line.upper[:, 0] <= front_end]])),
                         ("windshield", line.upper[(line.upper[:, 0] >= front_end) & (line.upper[:, 0] <= screen_end)]),
                         ("rear", np.vstack([line.upper[line.upper[:, 0] >= screen_end], base])),
                         ("underbody", line.lower)):
        if len(points) > 1:
            parts.append({"zone": zone, "status": statuses.get(zone, ""), "points": _thin(points)})
    notes = []
    for key, label in (("windshield.angle", "windshield"), ("rear.backlight_angle", "backlight"),
                       ("rear.decklid_angle", "decklid"), ("underbody.diffuser_angle", "diffuser"),
                       ("rear.roof_backlight_radius", "roof radius"), ("front.upper_edge_radius", "front radius")):
        m = measured.get(key)
        if m and m.span:
            value, unit = _shown(m)
            x = 0.5 * (m.span[0] + m.span[1])
            source = line.lower if key.startswith("underbody") else line.upper
            z = float(np.interp(x, source[:, 0], source[:, 1]))
            notes.append({"text": f"{label} {value:.3g} {unit}", "x": round(x, 4), "z": round(z, 4)})
    return {"parts": parts, "notes": notes, "title": title or "Centreline section with measured angles and radii"}


def sections_data(result: Result) -> dict:
    return {"sections": [{"label": _section_label(s), "upper": _thin(s["outline"].upper, 200), "lower": _thin(s["outline"].lower, 200)}
                         for s in result.sections]}
