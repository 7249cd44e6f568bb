"""Yaw tables: a tunnel's (or a CFD sweep's) coefficients against yaw, as a result's yaw sweep.

The table is read like a history (CSV or whitespace columns, ``#`` comment lines): a yaw
column in degrees and the coefficients found by name. Given a vehicle speed, the SAE J1252
wind-averaged drag coefficient follows (:func:`aeroreview.calc.wind.wind_averaged_cd`).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from aeroreview.calc.wind import J1252_WIND_SPEED, wind_averaged_cd
from aeroreview.results.history import COEFFICIENT_NAMES, refuse, find_columns, read_table

YAW_NAMES = ("yaw", "yawangle", "yawdeg", "beta", "psi")
# Moment coefficients a yaw table may carry beside the forces, found only by SAE J1594's names (cym, cpm;
# from memory): a solver's cmz or cmy is usually taken about another point and on another length, so it
# is read only when named with --columns cym=... by someone who knows it is on the sheet's reference.
MOMENT_NAMES = {"cym": ("cym",), "cpm": ("cpm",)}
YAW_LIMIT = 90.0  # deg: beyond it the car drives backwards into the wind (as the sheet's yaw bounds)
CD_BOUNDS = (0.05, 2.0)  # as a sheet result's cd (aeroreview.sheet)


@dataclass
class YawSweep:
    file: str
    yaw: np.ndarray  # deg, sorted
    values: dict[str, np.ndarray]  # cd, cl, cl_front, cl_rear, cs, cym, cpm as found
    cd_wind_averaged: float | None = None
    speed: float | None = None  # m/s
    wind: float = J1252_WIND_SPEED  # m/s


def read_yaw(path: str | Path, columns: dict[str, str] | None = None, speed: float | None = None,
             wind: float = J1252_WIND_SPEED) -> YawSweep:
    """Read a yaw table; with ``speed`` [m/s], add the J1252 wind-averaged Cd in a ``wind`` [m/s]."""
    table = read_table(path)
    chosen = find_columns(table, {"yaw": YAW_NAMES, **COEFFICIENT_NAMES, **MOMENT_NAMES}, dict(columns or {}))
    for needed in ("yaw", "cd"):
        if needed not in chosen:
            raise refuse(table.file, f"no {needed} column (columns: {', '.join(table.header)})",
                          f"name it with --columns {needed}=...")
    yaw = table.values[:, chosen["yaw"]]
    for row, angle in enumerate(yaw):
        if abs(angle) > YAW_LIMIT:
            raise refuse(table.file, f"yaw {angle:g} deg is outside -90 to 90 deg", "give yaw in degrees",
                          line=table.lines[row])
    order = np.argsort(yaw, kind="stable")
    if np.any(np.diff(yaw[order]) == 0):
        raise refuse(table.file, "a yaw angle appears twice", "keep one row per angle (average repeats first)")
    values = {key: table.values[order, i] for key, i in chosen.items() if key != "yaw"}
    cd = values["cd"]
    if cd.min() < CD_BOUNDS[0] or cd.max() > CD_BOUNDS[1]:
        raise refuse(table.file, f"a Cd of {cd.min() if cd.min() < CD_BOUNDS[0] else cd.max():g} is outside "
                      f"{CD_BOUNDS[0]:g} to {CD_BOUNDS[1]:g}", "check the column is a coefficient, not a force")
    sweep = YawSweep(table.file, yaw[order], values, speed=speed, wind=wind)
    if speed is not None:
        try:
            sweep.cd_wind_averaged = wind_averaged_cd(np.radians(sweep.yaw), cd, speed, wind)
        except ValueError as error:
            raise refuse(table.file, f"cannot wind-average this sweep: {error}",
                          "measure to larger yaw, or give a higher speed or a lower wind") from None
    return sweep


def points(sweep: YawSweep) -> list[dict]:
    """One dict per angle: yaw [deg] and the coefficients found."""
    return [{"yaw": round(float(angle), 4), **{key: round(float(v[i]), 5) for key, v in sweep.values.items()}}
            for i, angle in enumerate(sweep.yaw)]


def as_json(sweep: YawSweep) -> dict:
    """The ``results yaw --json`` shape."""
    out = {"yaw_sweep": points(sweep)}
    if sweep.cd_wind_averaged is not None:
        out["cd_wind_averaged"] = round(sweep.cd_wind_averaged, 5)
    return out


def as_text(sweep: YawSweep) -> str:
    keys = list(sweep.values)
    lines = [f"{Path(sweep.file).name}: {len(sweep.yaw)} yaw angles", "  " + "  ".join(f"{k:>9}" for k in ["yaw", *keys])]
    for point in points(sweep):
        lines.append("  " + "  ".join(f"{point[k]:>9g}" for k in ["yaw", *keys]))
    if sweep.cd_wind_averaged is not None:
        lines.append(f"  wind-averaged Cd (SAE J1252) {sweep.cd_wind_averaged:.4f} at {sweep.speed * 3.6:.0f} km/h "
                     f"in a {sweep.wind:.2f} m/s wind")
    return "\n".join(lines) + "\n"
