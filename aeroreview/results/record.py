"""A result read from solver or tunnel output, recorded in a sheet with its provenance.

Each command makes one entry of the sheet's ``results``: the coefficients, and ``files``,
the file it was read from with its sha256 (and, for a surface, the build-up CSV written
beside the sheet), so a reviewer can tell which run a number came from and whether the file
changed since. A history adds its settled window and the statistics the convergence rule
judges (:class:`aeroreview.rules.result_quality.Convergence`). The entry that already names
the same file is updated in place; any other entry, and every other line of the sheet, is
left as it was (:func:`aeroreview.sheetedit.edit_sheet`).
"""

from __future__ import annotations

import hashlib
from pathlib import Path

from aeroreview.results.history import Settled
from aeroreview.results.surface import Forces
from aeroreview.results.yaw import YawSweep
from aeroreview.sections import YAW_POINT


def sha256(path: str | Path) -> str:
    digest = hashlib.sha256()
    with open(path, "rb") as stream:
        for block in iter(lambda: stream.read(1 << 20), b""):
            digest.update(block)
    return digest.hexdigest()


def _coefficient(value: float | None) -> float | None:
    return None if value is None else round(float(value), 4) + 0.0


def history_entry(result: Settled, name: str, digest: str) -> dict:
    """The sheet entry of a settled history (``name`` as the sheet names the file), with the
    statistics its verdict read, so the sheet's data.convergence finding repeats that verdict."""
    c = result.coefficients
    stats = result.statistics
    entry = {"kind": "cfd", "label": f"history {Path(name).name}"}
    entry.update({key: _coefficient(c[key].mean) for key in ("cd", "cl_front", "cl_rear", "cs") if key in c})
    entry.update({key: int(value) if float(value).is_integer() else value
                  for key, value in (("settled_from", result.settled_from), ("settled_to", result.settled_to))})
    entry.update(history_rows=stats.history_rows, settled_rows=stats.settled_rows,
                 convergence=[{"coefficient": key, "std_error": error, "drift": drift}
                              for key, error, drift in stats.coefficients])
    entry["files"] = [{"file": name, "sha256": digest, "role": "history"}]
    return entry


def surface_entry(forces: Forces, name: str, digest: str, buildup: str, buildup_digest: str, area: float,
                  sheet_area: float | None) -> dict:
    entry = {"kind": "cfd", "label": f"surface {Path(name).name}", "cd": _coefficient(forces.cd)}
    entry.update({key: _coefficient(getattr(forces, key)) for key in ("cl_front", "cl_rear")
                  if getattr(forces, key) is not None})
    entry["cs"] = _coefficient(forces.cs)
    if sheet_area is None or abs(area - sheet_area) > 1e-9:
        entry["reference_area"] = f"{area:.4g} m^2"
    entry["files"] = [{"file": name, "sha256": digest, "role": "surface"},
                      {"file": buildup, "sha256": buildup_digest, "role": "buildup"}]
    return entry


def yaw_entry(sweep: YawSweep, name: str, digest: str, kind: str) -> dict:
    zero = min(range(len(sweep.yaw)), key=lambda i: abs(sweep.yaw[i]))
    entry = {"kind": kind, "label": f"yaw sweep {Path(name).name}", "cd": _coefficient(sweep.values["cd"][zero])}
    if sweep.speed is not None:
        entry["speed"] = f"{sweep.speed * 3.6:.4g} km/h"
    kept = [key for key in sweep.values if key in YAW_POINT.names]  # what a sheet's yaw point holds
    entry["yaw_sweep"] = [{"yaw": f"{float(a):g} deg", **{key: _coefficient(sweep.values[key][i]) for key in kept}}
                          for i, a in enumerate(sweep.yaw)]
    entry["files"] = [{"file": name, "sha256": digest, "role": "yaw"}]
    return entry


def merge_result(sheet_path: str | Path, entry: dict) -> dict:
    """Add ``entry`` to the sheet's results, or update the entry that names the same file.

    Returns {"action": "added" | "updated", "index": i}. A user's
    keys of an updated entry that the new entry does not carry (a label, a date, a note in
    ``source``, the result-of-record flag) are kept.
    """
    from ruamel.yaml.comments import CommentedMap, CommentedSeq

    from aeroreview.sheetedit import edit_sheet

    report: dict = {"action": "added", "index": None}
    primary = entry["files"][0]["file"]

    def names(item) -> list[str]:
        files = item.get("files") if isinstance(item, dict) else None
        return [f.get("file") for f in files if isinstance(f, dict)] if isinstance(files, list) else []

    def block(value):
        if isinstance(value, dict):
            mapping = CommentedMap(value)
            mapping.fa.set_flow_style()
            return mapping
        if isinstance(value, list):
            return CommentedSeq([block(v) for v in value])
        return value

    def add(data) -> bool:
        results = data.get("results")
        if results is None:
            data["results"] = results = CommentedSeq()
        existing = next((i for i, item in enumerate(results) if primary in names(item)), None)
        if existing is None:
            results.append(CommentedMap((key, block(value)) for key, value in entry.items()))
            report["index"] = len(results) - 1
            return report, False
        target = results[existing]
        for key, value in entry.items():
            if key == "label" and target.get("label"):
                continue  # the user's label stays
            target[key] = block(value)
        report.update(action="updated", index=existing)
        return report, False

    edit_sheet(sheet_path, add)
    return report
