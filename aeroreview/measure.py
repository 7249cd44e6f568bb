"""``aeroreview measure``: the features of a sheet, measured from the vehicle's surface.

Reads a triangulated surface (STL, OBJ, PLY through trimesh) or a 2-D profile (CSV with
columns x,z for the centreline or x,y for a plan outline), puts it in the tool's frame
(x from the nose rearward, z up from the ground plane, metres), and measures with
:mod:`aeroreview.calc.geometry`. Results can be merged into a sheet: ruamel.yaml keeps every
comment and every value the user typed; a typed value is only replaced with
``--overwrite``, and then the original file is kept as a backup.
"""

from __future__ import annotations

import csv
import io
import math
import warnings
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from aeroreview import catalogue, plausible, sheetfill
from aeroreview.calc.geometry.profile import Measurement, measure_centreline, plan_taper
from aeroreview.calc.geometry.projection import projected_area
from aeroreview.calc.geometry.mesh import edge_check, face_areas, merge_vertices
from aeroreview.calc.geometry.orientation import infer_nose, infer_up
from aeroreview.calc.geometry.sections import Outline, densify, outline, slice_levels, slice_mesh
from aeroreview.problems import InputError, Problem, UsageError
from aeroreview.sheetedit import edit_sheet
from aeroreview.units import from_si

MESH_SUFFIXES = (".stl", ".obj", ".ply")
SIZE_LIMITS = (0.2, 30.0)  # m: from a 1:5 model to a coach; anything else is not a road vehicle (common practice)
SECTION_STEP = 0.2  # m between horizontal sections (the default)
MAX_SURFACE_BYTES = 500_000_000  # 10 million binary STL triangles, far above a review surface (common practice)
MAX_PROFILE_BYTES = 20_000_000  # a CSV profile of a few thousand points is a few hundred kB (common practice)
PROJECTION_ROWS = 1000  # scan lines: errors far below the 0.5 % required on analytic shapes (tests)


class MeasureError(UsageError):
    """A surface that cannot be measured (not a mesh, empty, absurd size)."""


@dataclass
class Surface:
    """A surface in the tool's frame: metres, x from the nose rearward, z up from the ground."""

    vertices: np.ndarray | None  # (n, 3), or None for a 2-D profile
    faces: np.ndarray | None
    profile: np.ndarray | None = None  # (n, 2) for a CSV profile
    profile_kind: str = ""  # "centreline" (x, z) or "plan" (x, y)
    units: str = "m"
    units_note: str = ""
    notes: list[str] = field(default_factory=list)
    source: str = ""
    closed: bool = False  # watertight and consistently wound: one side's faces alone make the silhouette
    ground_given: bool = True  # False: the ground plane was put at the lowest point


def _scale_for(extent: float, units: str | None) -> tuple[float, str, str]:
    if units:
        scale = {"mm": 0.001, "m": 1.0}[units]
        return scale, units, f"units {units} (given)"
    if extent > 100:
        return 0.001, "mm", f"units inferred as mm (largest extent {extent:g} is too large for metres)"
    return 1.0, "m", f"units inferred as m (largest extent {extent:g})"


def _check_size(extent_m: float, name: str) -> None:
    low, high = SIZE_LIMITS
    if not low <= extent_m <= high:
        raise MeasureError(f"{name}: a largest extent of {extent_m:.4g} m makes no sense for a road vehicle or its "
                           f"model ({low:g} to {high:g} m); check --units")


def _frame(points: np.ndarray, nose: str, up: str) -> np.ndarray:
    points = np.array(points, dtype=float)
    if up == "+y":
        points = points[:, [0, 2, 1]]
    if nose == "+x":
        points[:, 0] = -points[:, 0]
    return points


def _orient(points: np.ndarray, nose: str | None, up: str | None) -> tuple[np.ndarray, list[str]]:
    """Turn file points into the tool's frame; ``None`` for ``nose`` or ``up`` infers it, and says so."""
    said = []
    if up is None:
        up, why = infer_up(points)
        said.append(f"{why}; give --up to override")
    points = _frame(points, "-x", up)
    inferred, why, decided = infer_nose(points)
    if nose is None:
        nose = inferred
        said.append(f"{why}; give --nose to {'override' if decided else 'say which'}")
    elif decided and nose != inferred:
        said.append(f"warning: --nose {nose} puts the higher end first, but the surface looks nose at {inferred} "
                    f"({why.split('(', 1)[1].rstrip(')')}); the angles and radii below are likely read tail-first")
    return (_frame(points, nose, "+z") if nose == "+x" else points), said


def load_surface(path: str | Path, units: str | None = None, nose: str | None = "-x", up: str | None = "+z",
                 ground: float | None = None) -> Surface:
    """Load and orient a surface (``None`` for ``nose`` or ``up``: inferred, and said); refuse what is
    not a usable vehicle surface."""
    path = Path(path)
    name = str(path)
    if not path.is_file():
        raise MeasureError(f"{name}: no such file")
    size = path.stat().st_size
    if size == 0:
        raise MeasureError(f"{name}: the file is empty")
    suffix = path.suffix.lower()
    limit = MAX_PROFILE_BYTES if suffix == ".csv" else MAX_SURFACE_BYTES
    if size > limit:
        raise MeasureError(f"{name}: the file is {size:,} bytes, over the limit of {limit:,}; decimate the surface")
    if suffix == ".csv":
        return _load_profile(path, units, nose, ground)
    if suffix not in MESH_SUFFIXES:
        raise MeasureError(f"{name}: unknown surface format '{suffix}'; give an STL, OBJ or PLY mesh or a CSV profile")
    _check_declared_size(path, suffix, size)
    import trimesh

    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            mesh = trimesh.load(str(path), process=False)  # a Trimesh, or a Scene when the file holds several
            if isinstance(mesh, trimesh.Scene):
                mesh = mesh.to_mesh()  # one mesh; skipped for a single body, whose copy it would be
    except Exception as error:  # noqa: BLE001 - trimesh raises many types on bad files
        raise MeasureError(f"{name}: not a readable mesh ({type(error).__name__}: {error})") from None
    if not isinstance(mesh, trimesh.Trimesh) or len(mesh.faces) == 0:
        raise MeasureError(f"{name}: the file holds no triangles")
    faces, count = np.asarray(mesh.faces), len(mesh.vertices)
    outside = faces[(faces < 0) | (faces >= count)]
    if outside.size:
        raise MeasureError(f"{name}: a face refers to vertex {int(outside[0])}, but the file has {count} (0 to {count - 1})")
    notes = []
    vertices = np.asarray(mesh.vertices, dtype=float)
    if not np.isfinite(vertices).all():
        raise MeasureError(f"{name}: the mesh has vertices that are not finite numbers")
    merged, faces = merge_vertices(vertices, faces)
    degenerate = int((face_areas(merged, faces) <= 1e-18).sum())
    if degenerate:
        notes.append(f"warning: {degenerate} degenerate faces (measured anyway)")
    if len(merged) < count and suffix != ".stl":  # STL always repeats vertices; that is its format
        notes.append(f"warning: {count - len(merged)} duplicated vertices (merged, measured anyway)")
    watertight, consistent = edge_check(faces)
    if not watertight:
        notes.append("warning: the surface is not watertight (measured anyway; sections may show gaps)")
    extent = max(float(np.ptp(vertices[:, axis])) for axis in range(3))
    scale, unit, note = _scale_for(extent, units)
    _check_size(extent * scale, name)
    points, said = _orient(merged * scale, nose, up)
    notes += said
    base = points[:, 2].min() if ground is None else ground * scale
    points[:, 2] -= base
    points[:, 0] -= points[:, 0].min()
    ground_note = "ground plane at the lowest point" if ground is None else f"ground plane at z = {ground:g} {unit}"
    return Surface(points, faces, units=unit, units_note=f"{note}; {ground_note}", notes=notes,
                   source=path.name, closed=consistent, ground_given=ground is not None)


_PLY_SIZES = {"char": 1, "uchar": 1, "int8": 1, "uint8": 1, "short": 2, "ushort": 2, "int16": 2, "uint16": 2,
              "int": 4, "uint": 4, "int32": 4, "uint32": 4, "float": 4, "float32": 4, "double": 8, "float64": 8}


def _check_declared_size(path: Path, suffix: str, size: int) -> None:
    """Refuse a mesh whose header declares more data than the file holds, before reading it:
    a sparse file claiming 1e8 triangles would otherwise be allocated in full."""
    with path.open("rb") as stream:
        head = stream.read(65536)
    needed = 0
    if suffix == ".stl" and len(head) >= 84 and not head.lstrip().startswith(b"solid"):
        needed = 84 + 50 * int.from_bytes(head[80:84], "little")  # binary STL: header, count, 50 bytes a triangle
    elif suffix == ".ply" and head.startswith(b"ply") and b"end_header" in head:
        needed = _ply_minimum(head[: head.index(b"end_header")].decode("ascii", "replace").splitlines())
    if needed > size:
        raise MeasureError(f"{path}: the header declares at least {needed:,} bytes of data but the file has {size:,}; "
                           "the file is truncated or not what it claims")


def _ply_minimum(header: list[str]) -> int:
    """The fewest bytes the elements a PLY header declares can take (a face has 3 indices or more;
    in ASCII every value takes a digit and a separator)."""
    binary = any(line.startswith("format binary") for line in header)
    elements: list[list[int]] = []  # [count, bytes a row]
    for words in (line.split() for line in header):
        if words[:1] == ["element"] and len(words) == 3 and words[2].isdigit():
            elements.append([int(words[2]), 0])
        elif words[:1] == ["property"] and elements and len(words) == 5 and words[1] == "list":
            count, index = (_PLY_SIZES.get(w, 1) if binary else 2 for w in words[2:4])
            elements[-1][1] += count + 3 * index
        elif words[:1] == ["property"] and elements and len(words) == 3:
            elements[-1][1] += _PLY_SIZES.get(words[1], 1) if binary else 2
    return sum(count * row for count, row in elements)


def _load_profile(path: Path, units: str | None, nose: str | None, ground: float | None) -> Surface:
    name = str(path)
    try:
        text = path.read_text(encoding="utf-8-sig")
    except UnicodeDecodeError:
        raise MeasureError(f"{name}: not a UTF-8 text CSV file") from None
    reader = csv.reader(io.StringIO(text))
    try:
        rows = [r for r in reader if r and not r[0].lstrip().startswith("#")]
    except csv.Error as error:
        raise MeasureError(f"{name}:{reader.line_num}: not a readable CSV row ({error})") from None
    if not rows:
        raise MeasureError(f"{name}: the CSV file has no rows")
    header = [h.strip().lower() for h in rows[0]]
    if header[:2] not in (["x", "z"], ["x", "y"]):
        raise MeasureError(f"{name}:1: the header must be 'x,z' (centreline) or 'x,y' (plan outline), got "
                           f"'{','.join(rows[0])}'")
    values = []
    for number, row in enumerate(rows[1:], start=2):
        try:
            values.append((float(row[0]), float(row[1])))
        except (ValueError, IndexError):
            raise MeasureError(f"{name}:{number}: cannot read '{','.join(row)}' as two numbers") from None
    points = np.array(values)
    if len(points) < 4:
        raise MeasureError(f"{name}: a profile needs at least 4 points, got {len(points)}")
    if not np.isfinite(points).all():
        raise MeasureError(f"{name}: the profile has values that are not finite numbers")
    if np.ptp(points[:, 0]) == 0:
        raise MeasureError(f"{name}: every point has the same x; a profile runs from the nose to the tail along x")
    extent = float(np.ptp(points, axis=0).max())
    scale, unit, note = _scale_for(extent, units)
    _check_size(extent * scale, name)
    points = points * scale
    kind = "centreline" if header[1] == "z" else "plan"
    said = []
    if nose is None and kind == "centreline":
        nose, why, decided = infer_nose(np.column_stack([points[:, 0], np.zeros(len(points)), points[:, 1]]))
        said.append(f"{why}; give --nose to {'override' if decided else 'say which'}")
    elif nose is None:
        nose = "-x"
        said.append("nose taken as -x: a plan outline does not show which end is the front; give --nose to say which")
    if nose == "+x":
        points[:, 0] = -points[:, 0]
    points[:, 0] -= points[:, 0].min()
    if kind == "centreline":
        points[:, 1] -= points[:, 1].min() if ground is None else ground * scale
    closed = np.vstack([points, points[:1]])
    return Surface(None, None, profile=closed, profile_kind=kind, units=unit, units_note=note, notes=said,
                   source=path.name, ground_given=ground is not None)


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
