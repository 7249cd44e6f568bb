"""A sheet's own surface, measured once: for its data-quality rule and for its site figures.

A sheet's ``geometry`` names its surface and how to read it (units, nose, up, ground). The
review holds the sheet against that surface (:mod:`aeroreview.rules.surface_agreement`) and
the site draws it, so both need the same measurement. Measuring a body takes seconds, so the
result is kept in memory and in a JSON file under ``.cache/aeroreview-geometry`` beside the
configuration (:class:`aeroreview.memo.Memo`), keyed by the file's bytes, the reading options
and the measuring code itself:
``check`` and the site re-measure a surface only when one of those changed, and a cache hit
imports no mesh library.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from pathlib import Path

from aeroreview.memo import Memo
from aeroreview.memo import key as memo_key
from aeroreview.paths import PathProblem, contained_file
from aeroreview.problems import UsageError
from aeroreview.rules.surface_agreement import SurfaceValues
from aeroreview.sheetcheck import SURFACE_SUFFIXES

CACHE_FOLDER = Path(".cache") / "aeroreview-geometry"  # beside the configuration, as the figure cache
MEMORY_ENTRIES = 64  # measurements this process keeps (one per surface and options; each well under 1 MB)
_MEMORY: dict[str, dict] = {}
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
    name = memo_key(content, json.dumps(options), code=MEASURING_CODE)
    remembered = _MEMORY.get(name)  # measured in this process, perhaps for a copy in another folder
    try:
        data = Memo(folder).get(name, lambda: remembered if remembered is not None else _measure(str(path), options))
    except UsageError as problem:  # MeasureError: not a mesh, empty, absurd size...
        return Measured(SurfaceValues(geometry.file, problem=str(problem).removeprefix(f"{path}: ")), None)
    if remembered is None:
        if len(_MEMORY) >= MEMORY_ENTRIES:
            _MEMORY.clear()
        _MEMORY[name] = data
    values = SurfaceValues(geometry.file, {k: float(v) for k, v in data["values"].items()}, dict(data["doubts"]))
    return Measured(values, data["figures"])


def _measure(path: str, options: list) -> dict:
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
