"""Surface files for ``aeroreview measure`` and ``aeroreview results surface``: read and put in the tool's frame.

Reads a triangulated surface (STL, OBJ, PLY through trimesh) or a 2-D profile (CSV with
columns x,z for the centreline or x,y for a plan outline), checks that its declared size
fits the file and that its extent makes sense for a road vehicle, infers or applies the
units, nose and up directions (saying what it inferred), and returns a :class:`Surface` in
metres with x from the nose rearward and z up from the ground plane.
"""

from __future__ import annotations

import csv
import io
import warnings
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from aeroreview.calc.geometry.mesh import edge_check, face_areas, merge_vertices
from aeroreview.calc.geometry.orientation import infer_nose, infer_up
from aeroreview.problems import UsageError

MESH_SUFFIXES = (".stl", ".obj", ".ply")
SIZE_LIMITS = (0.2, 30.0)  # m: from a 1:5 model to a coach; anything else is not a road vehicle (common practice)
MAX_SURFACE_BYTES = 500_000_000  # 10 million binary STL triangles, far above a review surface (common practice)
MAX_PROFILE_BYTES = 20_000_000  # a CSV profile of a few thousand points is a few hundred kB (common practice)


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


def scale_for(extent: float, units: str | None) -> tuple[float, str, str]:
    if units:
        scale = {"mm": 0.001, "m": 1.0}[units]
        return scale, units, f"units {units} (given)"
    if extent > 100:
        return 0.001, "mm", f"units inferred as mm (largest extent {extent:g} is too large for metres)"
    return 1.0, "m", f"units inferred as m (largest extent {extent:g})"


def check_size(extent_m: float, name: str) -> None:
    low, high = SIZE_LIMITS
    if not low <= extent_m <= high:
        raise MeasureError(f"{name}: a largest extent of {extent_m:.4g} m makes no sense for a road vehicle or its "
                           f"model ({low:g} to {high:g} m); check --units")


def to_frame(points: np.ndarray, nose: str, up: str) -> np.ndarray:
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
    points = to_frame(points, "-x", up)
    inferred, why, decided = infer_nose(points)
    if nose is None:
        nose = inferred
        said.append(f"{why}; give --nose to {'override' if decided else 'say which'}")
    elif decided and nose != inferred:
        said.append(f"warning: --nose {nose} puts the higher end first, but the surface looks nose at {inferred} "
                    f"({why.split('(', 1)[1].rstrip(')')}); the angles and radii below are likely read tail-first")
    return (to_frame(points, nose, "+z") if nose == "+x" else points), said


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
    scale, unit, note = scale_for(extent, units)
    check_size(extent * scale, name)
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
    scale, unit, note = scale_for(extent, units)
    check_size(extent * scale, name)
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
