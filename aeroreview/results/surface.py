"""Surface fields: the force on every face of the body, and its build-up along x.

A CFD surface export (any format meshio reads: VTK, VTU, PLY, ...) carries the pressure, and
often the wall shear, per point or per face. Each face's force is the pressure on its
vector area plus the shear on its area, F = (-Cp S + c_f |S|) q; summed, they give Cd, Cl and
the side force on the reference area; their moments about the front axle give the lift on
each axle (the moment transfer of SAE J1594, Vehicle Aerodynamics Terminology: drag acting
above the ground loads the rear axle); summed from the nose rearward, they give the
cumulative drag and lift along x, which shows where along the body a revision gained or lost.

The face normals must point out of the body into the air. A mesh whose faces are wound
consistently is turned outward (the enclosed volume must come out positive); one wound
inconsistently is refused, since no single flip can make its forces right.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from aeroreview.calc.forces import dynamic_pressure
from aeroreview.problems import UsageError

PRESSURE_KINDS = ("cp", "gauge", "absolute", "kinematic")
CP_NAMES = ("cp", "pressurecoefficient", "cpmean", "cpavg")
PRESSURE_NAMES = ("p", "pressure", "pmean", "pavg", "staticpressure")
SHEAR_NAMES = ("wallshearstress", "wallshear", "wallshearstressmean", "wss", "tauw")
FRICTION_NAMES = ("cf", "skinfriction", "skinfrictioncoefficient")  # a vector of c_f = tau / q
STATED = {"p_inf": ("pinf", "pref", "freestreampressure"), "density": ("rhoinf", "rhoref", "density", "rho"),
          "speed": ("uinf", "uref", "speed", "freestreamvelocity")}
FACE_CELLS = ("triangle", "quad", "polygon")  # meshio's surface cell types (polygons come in equal-size blocks)
VOLUME_CELLS = ("tetra", "hexahedron", "wedge", "pyramid", "tetra10", "hexahedron20")
BUILDUP_STATIONS = 200  # stations from nose to tail: 2.5 cm on a 5 m car, finer than any zone (common practice)


class SurfaceError(UsageError):
    """A surface field that cannot be integrated (unreadable, missing field, bad normals)."""


def _plain(name: str) -> str:
    return re.sub(r"[^a-z0-9]", "", str(name).lower())


@dataclass
class Field:
    """A surface in the tool's frame (metres, x from the nose rearward, z up from the ground),
    its faces, and the per-face values read from it."""

    file: str
    points: np.ndarray  # (n, 3)
    blocks: list[np.ndarray]  # faces, one (m, k) array per face size
    pressure: np.ndarray  # per face, in the file's kind and units
    pressure_name: str
    shear: np.ndarray | None  # (faces, 3) in the file's kind and units, frame-rotated
    shear_name: str | None
    stated: dict[str, float]  # free-stream values stated in the file
    notes: list[str] = field(default_factory=list)

    @property
    def faces(self) -> int:
        return sum(len(b) for b in self.blocks)


def _find(data: dict, wanted: str | None, usual: tuple[str, ...]) -> str | None:
    if wanted is not None:
        return wanted if wanted in data else None
    return next((name for name in data if _plain(name) in usual), None)


def _per_face(values, blocks, where: str) -> np.ndarray:
    """A point or cell field as one value (row) per face (meshio has checked the sizes)."""
    if where == "point":
        values = np.asarray(values, dtype=float)
        return np.concatenate([values[b].mean(axis=1) for b in blocks])
    return np.concatenate([np.asarray(v, dtype=float) for v in values])


def _finite(file: str, name: str, kind: str, values) -> None:
    """Refuse a field with NaN or infinite values, counting them (as stored, per point or per cell)."""
    raw = np.asarray(values, dtype=float) if kind == "point" else np.concatenate([np.ravel(v) for v in values])
    bad = int(np.size(raw) - np.isfinite(raw).sum())
    if bad:
        raise SurfaceError(f"{file}: field '{name}' has {bad} values that are not finite (NaN or infinite); "
                           "export the converged solution")


def _read_mesh(path: Path):
    """meshio.read, with its printing silenced and its exit on unreadable files turned into an error."""
    import contextlib
    import io

    import meshio

    said = io.StringIO()
    try:
        with contextlib.redirect_stdout(said), contextlib.redirect_stderr(said):
            return meshio.read(str(path))
    except ValueError as error:  # meshio's check that every field has one value per point or cell
        raise SurfaceError(f"{path}: a field does not match the mesh ({error})") from None
    except (Exception, SystemExit) as error:  # noqa: BLE001 - meshio raises many types, and exits on some files
        reason = " ".join(said.getvalue().split()) or f"{type(error).__name__}: {error}"
        raise SurfaceError(f"{path}: not a surface mesh meshio can read ({reason})") from None


def load_field(path: str | Path, pressure: str | None = None, shear: str | None = None, units: str | None = None,
               nose: str = "-x", up: str = "+z", ground: float | None = None) -> Field:
    """Read a surface mesh with its pressure (and optional wall-shear) field, in the tool's frame."""
    from aeroreview.measure import _check_size, _frame, _scale_for

    path = Path(path)
    name = str(path)
    if not path.is_file():
        raise SurfaceError(f"{name}: no such file")
    if path.stat().st_size == 0:
        raise SurfaceError(f"{name}: the file is empty")
    mesh = _read_mesh(path)
    kept = [i for i, block in enumerate(mesh.cells) if block.type.startswith(FACE_CELLS)]
    if not kept:
        volume = any(block.type in VOLUME_CELLS for block in mesh.cells)
        raise SurfaceError(f"{name}: " + ("a volume mesh; give the body's surface (its wall patch)" if volume
                                          else "the file holds no faces"))
    blocks = [np.asarray(mesh.cells[i].data, dtype=np.int64) for i in kept]
    fields = {**{n: ("point", v) for n, v in mesh.point_data.items()},
              **{n: ("cell", [v[i] for i in kept]) for n, v in mesh.cell_data.items()}}
    available = ", ".join(f"{n} ({kind})" for n, (kind, _) in fields.items()) or "none"
    found = _find(fields, pressure, CP_NAMES + PRESSURE_NAMES)
    if found is None:
        wanted = f"'{pressure}'" if pressure else "a pressure or pressure-coefficient field (p, pressure, Cp, cp)"
        raise SurfaceError(f"{name}: no {wanted}; the file has these fields: {available}; name one with --field")
    shear_found = _find(fields, shear, SHEAR_NAMES + FRICTION_NAMES)
    if shear is not None and shear_found is None:
        raise SurfaceError(f"{name}: no field '{shear}'; the file has these fields: {available}")
    points = np.asarray(mesh.points, dtype=float)
    if points.ndim != 2 or points.shape[1] != 3 or not np.isfinite(points).all():
        raise SurfaceError(f"{name}: the points are not finite 3-D coordinates")
    for label in filter(None, (found, shear_found)):
        _finite(name, label, *fields[label])
    values = _per_face(fields[found][1], blocks, fields[found][0])
    if values.ndim != 1:
        raise SurfaceError(f"{name}: field '{found}' has {values.shape[1]} components; a pressure has one")
    extent = float(np.ptp(points, axis=0).max())
    scale, unit, note = _scale_for(extent, units)
    _check_size(extent * scale, name)
    points = _frame(points * scale, nose, up)
    points[:, 2] -= points[:, 2].min() if ground is None else ground * scale
    points[:, 0] -= points[:, 0].min()
    stress = None
    if shear_found is not None:
        stress = _per_face(fields[shear_found][1], blocks, fields[shear_found][0])
        if stress.ndim != 2 or stress.shape[1] != 3:
            raise SurfaceError(f"{name}: field '{shear_found}' is not a 3-component vector; wall shear is one")
        stress = _frame(stress, nose, up)
    stated = {}
    for key, names in STATED.items():
        for stated_name, value in mesh.field_data.items():
            if _plain(stated_name) in names and np.size(value) == 1:
                stated[key] = float(np.ravel(value)[0])
    ground_note = "ground plane at the lowest point" if ground is None else f"ground plane at z = {ground:g} {unit}"
    return Field(name, points, blocks, values, found, stress, shear_found, stated, [f"{note}; {ground_note}"])


# -- face geometry and orientation ---------------------------------------------------
def face_geometry(points: np.ndarray, blocks: list[np.ndarray]) -> tuple[np.ndarray, np.ndarray]:
    """Vector area S (sum of the fan triangles' half cross products) and centroid of every face."""
    areas, centres = [], []
    for faces in blocks:
        first = points[faces[:, 0]]
        vector = np.zeros((len(faces), 3))
        for i in range(1, faces.shape[1] - 1):
            vector += np.cross(points[faces[:, i]] - first, points[faces[:, i + 1]] - first)
        areas.append(0.5 * vector)
        centres.append(points[faces].mean(axis=1))
    return np.concatenate(areas), np.concatenate(centres)


def inconsistent_edges(blocks: list[np.ndarray], points: int) -> int:
    """Edges that two faces traverse in the same direction (0 for a consistently wound mesh)."""
    keys = []
    for faces in blocks:
        for i in range(faces.shape[1]):
            a, b = faces[:, i], faces[:, (i + 1) % faces.shape[1]]
            keep = a != b
            keys.append(a[keep] * points + b[keep])
    keys = np.sort(np.concatenate(keys))
    return int(np.count_nonzero(keys[1:] == keys[:-1]))


def outward(field_: Field) -> tuple[np.ndarray, np.ndarray]:
    """Face vector areas pointing out of the body, and the face centroids; refuses bad winding."""
    wrong = inconsistent_edges(field_.blocks, len(field_.points))
    if wrong:
        raise SurfaceError(f"{field_.file}: {wrong} edges are shared by faces wound the same way, so the normals are "
                           "inconsistent (some point into the body, some out); re-export the surface with "
                           "consistently oriented faces")
    vector, centre = face_geometry(field_.points, field_.blocks)
    volume = float(np.einsum("ij,ij->", vector, centre - centre.mean(axis=0))) / 3
    if volume < 0:
        field_.notes.append("the face normals pointed into the body: turned outward")
        vector = -vector
    return vector, centre


# -- integration ---------------------------------------------------------------------
@dataclass(frozen=True)
class Freestream:
    """What turns the file's pressure and shear into coefficients."""

    kind: str = "cp"  # cp, gauge [Pa], absolute [Pa] or kinematic [m^2/s^2]
    speed: float | None = None  # m/s
    density: float | None = None  # kg/m^3
    p_inf: float = 0.0  # Pa (absolute), m^2/s^2 (kinematic), 0 for gauge and cp


@dataclass
class Forces:
    """Coefficients on the reference area, and their build-up along x from the nose."""

    file: str
    faces: int
    area: float
    cd: float
    cl: float
    cs: float
    cl_front: float | None
    cl_rear: float | None
    x: np.ndarray  # stations [m from the nose]
    cd_cumulative: np.ndarray
    cl_cumulative: np.ndarray
    notes: list[str] = field(default_factory=list)


def freestream(field_: Field, kind: str | None = None, speed: float | None = None, density: float | None = None,
               p_inf: float | None = None) -> Freestream:
    """The free stream for ``field_``: options first, then values stated in the file.

    A coefficient field (Cp, cp) needs nothing; a pressure must say its kind, since a gauge,
    an absolute and a kinematic pressure give different forces from the same numbers.
    """
    if kind is None:
        if _plain(field_.pressure_name) not in CP_NAMES:
            raise SurfaceError(f"{field_.file}: field '{field_.pressure_name}' is a pressure, not a coefficient; say "
                               "which kind with --pressure gauge|absolute|kinematic")
        kind = "cp"
    speed = speed if speed is not None else field_.stated.get("speed")
    density = density if density is not None else field_.stated.get("density")
    p_inf = p_inf if p_inf is not None else field_.stated.get("p_inf")
    if kind == "absolute" and p_inf is None:
        raise SurfaceError(f"{field_.file}: an absolute pressure needs the free-stream pressure (--p-inf, in Pa)")
    return Freestream(kind, speed, density, 0.0 if p_inf is None or kind in ("cp", "gauge") else p_inf)


def _pressure_scale(field_: Field, air: Freestream) -> tuple[float, float]:
    """(reference, divisor) with Cp = (value - reference) / divisor for the field's kind."""
    if air.kind == "cp":
        return 0.0, 1.0
    if air.speed is None:
        raise SurfaceError(f"{field_.file}: field '{field_.pressure_name}' is a {air.kind} pressure; give the free-stream "
                           "speed (--speed) to turn it into a pressure coefficient")
    if air.kind == "kinematic":
        return air.p_inf, 0.5 * air.speed**2
    if air.density is None:
        raise SurfaceError(f"{field_.file}: a {air.kind} pressure needs the air density (--density)")
    return air.p_inf, float(dynamic_pressure(air.density, air.speed))


def integrate(field_: Field, air: Freestream, area: float, front_axle: float | None = None,
              wheelbase: float | None = None, stations: int = BUILDUP_STATIONS) -> Forces:
    """Integrate the face forces into coefficients on ``area`` [m^2].

    Axle lift (given ``front_axle``, x of the front axle from the nose [m], and ``wheelbase``
    [m]): moments about the front contact patch at the ground, Cl_rear wb = sum((x - x_f) dCz - z dCx),
    Cl_front = Cl - Cl_rear (SAE J1594's transfer of the pitching moment to the axles).
    """
    vector, centre = outward(field_)
    reference, divisor = _pressure_scale(field_, air)
    force = -((field_.pressure - reference) / divisor)[:, None] * vector
    if field_.shear is not None:
        shear_divisor = 1.0
        if _plain(field_.shear_name) not in FRICTION_NAMES:
            if air.speed is None or (air.kind != "kinematic" and air.density is None):
                raise SurfaceError(f"{field_.file}: wall shear '{field_.shear_name}' is a stress; give --speed and "
                                   "--density to turn it into a friction coefficient")
            shear_divisor = 0.5 * air.speed**2 if air.kind == "kinematic" else float(dynamic_pressure(air.density,
                                                                                                     air.speed))
        force += field_.shear / shear_divisor * np.linalg.norm(vector, axis=1)[:, None]
    force /= area
    cd, cs, cl = (float(v) for v in force.sum(axis=0))
    cl_front = cl_rear = None
    if front_axle is not None and wheelbase:
        cl_rear = float(((centre[:, 0] - front_axle) * force[:, 2] - centre[:, 2] * force[:, 0]).sum() / wheelbase)
        cl_front = cl - cl_rear
    length = float(field_.points[:, 0].max())
    station = np.minimum((centre[:, 0] / length * stations).astype(np.int64), stations - 1)
    x = np.linspace(0.0, length, stations + 1)
    cumulative = [np.concatenate([[0.0], np.cumsum(np.bincount(station, weights=force[:, axis], minlength=stations))])
                  for axis in (0, 2)]
    return Forces(field_.file, field_.faces, area, cd, cl, cs, cl_front, cl_rear, x, *cumulative, notes=field_.notes)


def frontal_area(field_: Field) -> float:
    """Projected frontal area [m^2] of the surface (its faces fanned into triangles)."""
    from aeroreview.calc.geometry.projection import projected_area

    triangles = np.concatenate([np.stack([b[:, 0], b[:, i], b[:, i + 1]], axis=1)
                                for b in field_.blocks for i in range(1, b.shape[1] - 1)])
    return float(projected_area(field_.points, triangles, axis=0, rows=1000))


# -- output --------------------------------------------------------------------------
def as_json(forces: Forces, keep: int = BUILDUP_STATIONS) -> dict:
    """The ``results surface --json`` shape (x in m from the nose, coefficients on the reference area)."""
    def rounded(value):
        return None if value is None else round(value, 5) + 0.0  # + 0.0: never "-0.0"

    step = max(1, (len(forces.x) - 1) // keep)
    return {"file": Path(forces.file).name, "faces": forces.faces, "cd": rounded(forces.cd), "cl": rounded(forces.cl),
            "cl_front": rounded(forces.cl_front), "cl_rear": rounded(forces.cl_rear),
            "buildup": [{"x": round(float(x), 4), "cd": round(float(d), 5), "cl": round(float(lift), 5)}
                        for x, d, lift in zip(forces.x[::step], forces.cd_cumulative[::step],
                                              forces.cl_cumulative[::step])]}


def as_text(forces: Forces) -> str:
    def axle(value):
        return "-" if value is None else f"{round(value, 4) + 0.0:+.4f}"

    lines = [f"{Path(forces.file).name}: {forces.faces} faces; " + "; ".join(forces.notes),
             f"  reference area {forces.area:.4g} m^2",
             f"  Cd {round(forces.cd, 4) + 0.0:.4f}   Cl {axle(forces.cl)} (front {axle(forces.cl_front)}, rear "
             f"{axle(forces.cl_rear)})   Cs {axle(forces.cs)}"]
    for share in (0.25, 0.5, 0.75, 1.0):
        i = int(round(share * (len(forces.x) - 1)))
        lines.append(f"  build-up to x = {forces.x[i]:.2f} m: Cd {axle(forces.cd_cumulative[i])}, "
                     f"Cl {axle(forces.cl_cumulative[i])}")
    return "\n".join(lines) + "\n"


def buildup_csv(forces: Forces, source: str) -> str:
    """The build-up as a small CSV (written beside a sheet and named from its results)."""
    rows = [f"# drag and lift build-up along x, written by aeroreview results surface from {source}",
            "x_m,cd,cl"]
    rows += [f"{x:.4f},{d:.6f},{lift:.6f}" for x, d, lift in zip(forces.x, forces.cd_cumulative, forces.cl_cumulative)]
    return "\n".join(rows) + "\n"
