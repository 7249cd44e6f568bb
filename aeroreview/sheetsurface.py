"""A sheet's own surface, measured once: for its data-quality rule and for its site figures.

A sheet's ``geometry`` names its surface and how to read it (units, nose, up, ground). The
review holds the sheet against that surface (:mod:`aeroreview.rules.surface_agreement`) and
the site draws it, so both need the same measurement. Measuring a body takes seconds, so the
result is kept in memory and in a JSON file under ``.cache/aeroreview-geometry`` beside the
configuration, keyed by the file's sha256, the reading options and the measuring code itself:
``check`` and the site re-measure a surface only when one of those changed, and a cache hit
imports no mesh library.
"""

from __future__ import annotations

import hashlib
import importlib.util
import json
import os
import tempfile
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from aeroreview.paths import PathProblem, contained_file
from aeroreview.problems import UsageError
from aeroreview.rules.surface_agreement import SurfaceValues
from aeroreview.sheetcheck import SURFACE_SUFFIXES

CACHE_FOLDER = Path(".cache") / "aeroreview-geometry"  # beside the configuration, as the figure cache
# The code whose output the cache holds: a change to any of it re-measures every surface.
MEASURING_CODE = ("aeroreview.measure", "aeroreview.surfacefile", "aeroreview.plausible", "aeroreview.calc.geometry")


@dataclass(frozen=True)
class Measured:
    """A sheet's surface measured: the values for the rule, and the figure data for the site."""

    values: SurfaceValues
    figures: dict | None  # {"silhouette": ..., "sections": ...}; None when it could not be measured


def cache_folder(root: Path) -> Path:
    return Path(root) / CACHE_FOLDER


def measured(sheet, folder: Path | None) -> Measured | None:
    """The measurement of the surface ``sheet.geometry`` names (None without one), cached in ``folder``."""
    geometry = sheet.geometry
    if geometry is None:
        return None
    try:
        path = contained_file(Path(sheet.path).parent, geometry.file, SURFACE_SUFFIXES, "surface")
        content = path.read_bytes()
    except (PathProblem, OSError) as problem:
        return Measured(SurfaceValues(geometry.file, problem=str(problem)), None)
    options = [geometry.units, geometry.nose, geometry.up, geometry.ground]
    key = hashlib.sha256(hashlib.sha256(content).digest() + json.dumps(options).encode() + _code_digest()).hexdigest()
    return _measured(key, geometry.file, str(path), tuple(options), str(folder) if folder else None)


@lru_cache(maxsize=64)
def _measured(key: str, name: str, path: str, options: tuple, folder: str | None) -> Measured:
    cached = Path(folder) / f"{key[:32]}.json" if folder else None
    try:
        data = json.loads(cached.read_text(encoding="utf-8")) if cached and cached.is_file() else None
    except (OSError, ValueError):
        data = None  # unreadable or half-written by another process: measure again
    if data is None:
        try:
            data = _measure(path, options)
        except UsageError as problem:  # MeasureError: not a mesh, empty, absurd size...
            return Measured(SurfaceValues(name, problem=str(problem).removeprefix(f"{path}: ")), None)
        if cached:
            _write(cached, data)
    values = SurfaceValues(name, {k: float(v) for k, v in data["values"].items()}, dict(data["doubts"]))
    return Measured(values, data["figures"])


def _measure(path: str, options: tuple) -> dict:
    """Measure the surface (the only place that imports the mesh code): JSON-able values, doubts, figures."""
    from aeroreview import catalogue, measure, plausible

    surface = measure.load_surface(path, *options)
    result = measure.measure(surface)
    found = {k: m for k, m in result.measured().items() if k in catalogue.BY_KEY}
    doubts = {}
    for key, m in found.items():
        said = plausible.warnings_for([m], result.length, surface.ground_given)
        if said:
            doubts[key] = said[0].removeprefix("warning: ")
    return {"values": {k: m.value for k, m in found.items()}, "doubts": doubts,
            "figures": {"silhouette": measure.silhouette_data(result), "sections": measure.sections_data(result)}}


def _write(target: Path, data: dict) -> None:
    """Write a cache entry atomically; a cache that cannot be written (read-only checkout) is skipped."""
    try:
        target.parent.mkdir(parents=True, exist_ok=True)
        handle, temporary = tempfile.mkstemp(dir=target.parent, suffix=".tmp")
    except OSError:
        return
    try:
        with os.fdopen(handle, "w", encoding="utf-8") as stream:
            json.dump(data, stream)
        os.replace(temporary, target)
    except OSError:
        Path(temporary).unlink(missing_ok=True)


@lru_cache(maxsize=1)
def _code_digest() -> bytes:
    """A digest of the measuring code's sources, found without importing it (no numpy, no trimesh)."""
    digest = hashlib.sha256()
    for name in MEASURING_CODE:
        spec = importlib.util.find_spec(name)
        files = sorted(Path(spec.submodule_search_locations[0]).glob("*.py")) if spec.submodule_search_locations \
            else [Path(spec.origin)]
        for file in files:
            digest.update(file.name.encode() + file.read_bytes())
    return digest.digest()
