"""``aeroreview results history|surface|yaw FILE``: read CFD and tunnel output.

Each command prints a readable summary (or ``--json``); with ``--sheet`` it adds or updates
one entry of the sheet's ``results``, with the file's name, sha256 and (for a history) the
settled window as provenance. Bad input is a located error and exit 2, and nothing is written.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

from aeroreview.calc.wind import J1252_WIND_SPEED
from aeroreview.calc_cli import quantity
from aeroreview.problems import UsageError


def column_map(text: str) -> dict[str, str]:
    """Parse ``iter=Time,cd=Cd(total)`` into {key: column name or 1-based number}."""
    out = {}
    for item in filter(None, (part.strip() for part in text.split(","))):
        key, _, name = item.partition("=")
        if not key.strip() or not name.strip():
            raise UsageError(f"--columns: cannot read '{item}'; write KEY=COLUMN pairs such as iter=Time,cd=Cd")
        out[key.strip()] = name.strip()
    return out


TABLE_SUFFIXES = (".dat", ".csv", ".txt", ".tsv", ".out")  # what solvers and tunnels name their tables
MESH_SUFFIXES = (".vtu", ".vtk", ".ply", ".msh", ".xdmf")  # surface formats meshio reads that carry fields


def named_by_sheet(file: str, sheet: str, suffixes: tuple[str, ...]) -> str:
    """``file`` as the sheet will name it: relative to the sheet's folder, and inside it
    (:func:`aeroreview.paths.contained_file` decides: links resolved, safe names)."""
    import os

    from aeroreview.paths import PathProblem, contained_file

    folder = Path(sheet).absolute().parent
    relative = Path(os.path.relpath(Path(file).absolute(), folder)).as_posix()
    try:
        contained_file(folder, relative, suffixes, "result file", "a table or surface meshio reads")
    except PathProblem as problem:
        raise UsageError(f"{file}: {problem} (a sheet may only name files inside its own folder); {problem.hint}") \
            from None
    return relative


def _print(data: dict, text: str, as_json: bool) -> None:
    sys.stdout.write(json.dumps(data, indent=2) + "\n" if as_json else text)


def cmd_history(args) -> int:
    from aeroreview.results import history

    name = named_by_sheet(args.file, args.sheet, TABLE_SUFFIXES) if args.sheet else None
    from aeroreview.settings import load_settings

    result = history.settle(history.read_history(args.file, column_map(args.columns or "")),
                            history.team_limits(load_settings(args.config)))
    _print(history.as_json(result), history.as_text(result), args.json)
    if args.sheet:
        from aeroreview.results import record

        done = record.merge_result(args.sheet, record.history_entry(result, name, record.sha256(args.file)))
        print(f"{args.sheet}: {done['action']} results[{done['index']}] from {name}", file=sys.stderr)
    return 0


def cmd_surface(args) -> int:
    from aeroreview.results import surface

    sheet = _sheet(args)
    found = surface.load_field(args.file, args.field, args.shear, args.units, args.nose, args.up, args.ground)
    air = surface.freestream(found, args.pressure, args.speed, args.density, args.p_inf)
    area = args.area or (sheet.get("dimensions.frontal_area") if sheet else None)
    if area is None:
        area = surface.frontal_area(found)
        found.notes.append(f"reference area {area:.4g} m^2 projected from the surface (no --area, no sheet)")
    front_axle = args.front_axle if args.front_axle is not None else sheet and sheet.get("dimensions.front_overhang")
    wheelbase = args.wheelbase or (sheet and sheet.get("dimensions.wheelbase"))
    forces = surface.integrate(found, air, area, front_axle or None, wheelbase or None)
    if front_axle is None or not wheelbase:
        forces.notes.append("no axle lift: give --front-axle and --wheelbase (or a sheet with "
                            "dimensions.front_overhang and dimensions.wheelbase)")
    _print(surface.as_json(forces), surface.as_text(forces), args.json)
    if sheet:
        _record_surface(args, forces, area, sheet.get("dimensions.frontal_area"))
    return 0


def _record_surface(args, forces, area: float, sheet_area: float | None) -> None:
    """Write the build-up CSV beside the surface file and record the result in the sheet;
    a CSV aeroreview did not write is never replaced, and a refused edit leaves no CSV behind."""
    from aeroreview.results import record, surface

    name = named_by_sheet(args.file, args.sheet, MESH_SUFFIXES)
    target = Path(args.file).with_name(Path(args.file).stem + "-buildup.csv")
    text = surface.buildup_csv(forces, Path(args.file).name)
    existed = target.exists()
    if target.is_symlink() or (existed and not target.read_text(encoding="utf-8", errors="replace").startswith(
            text.split("\n")[0].split(" from ")[0])):
        raise UsageError(f"{target}: exists and was not written by aeroreview; refusing to replace it")
    previous = target.read_bytes() if existed else None
    target.write_text(text, encoding="utf-8")
    buildup = named_by_sheet(str(target), args.sheet, (".csv",))
    try:
        done = record.merge_result(args.sheet, record.surface_entry(
            forces, name, record.sha256(args.file), buildup, record.sha256(target), area, sheet_area))
    except BaseException:
        if previous is None:
            target.unlink()
        else:
            target.write_bytes(previous)
        raise
    print(f"{args.sheet}: {done['action']} results[{done['index']}] from {name}; build-up in {buildup}",
          file=sys.stderr)


def cmd_yaw(args) -> int:
    from aeroreview.results import yaw

    name = named_by_sheet(args.file, args.sheet, TABLE_SUFFIXES) if args.sheet else None
    sweep = yaw.read_yaw(args.file, column_map(args.columns or ""), args.speed, args.wind)
    _print(yaw.as_json(sweep), yaw.as_text(sweep), args.json)
    if args.sheet:
        from aeroreview.results import record

        done = record.merge_result(args.sheet, record.yaw_entry(sweep, name, record.sha256(args.file), args.kind))
        print(f"{args.sheet}: {done['action']} results[{done['index']}] from {name}", file=sys.stderr)
    return 0


def _sheet(args):
    if not args.sheet:
        return None
    from aeroreview.sheet import load_sheet

    named_by_sheet(args.file, args.sheet, MESH_SUFFIXES)
    return load_sheet(args.sheet)


def add_parser(sub) -> None:
    """Register ``results`` and its subcommands on the main parser's subparsers."""
    results = sub.add_parser("results", help="read CFD and tunnel output: histories, surface fields, yaw tables")
    results_sub = results.add_subparsers(dest="results_command", required=True, metavar="KIND",
                                         parser_class=type(results))

    def common(p, what):
        p.add_argument("file", metavar="FILE", help=what)
        p.add_argument("--sheet", help="add or update the result in this sheet (the file must lie in its folder)")
        p.add_argument("--json", action="store_true", help="print JSON")

    p = results_sub.add_parser("history", help="a coefficient history: settled part, means, standard errors, verdict")
    common(p, "CSV or whitespace table of coefficients per iteration or time step")
    p.add_argument("--columns", help="columns by name or number, e.g. iter=Time,cd=Cd,cl=Cl (default: found by name)")
    p.add_argument("--config", help="settings file, for the team's data.convergence thresholds (default ./mkdocs.yml)")
    p.set_defaults(run=cmd_history)

    p = results_sub.add_parser("surface", help="a surface field: Cd, Cl, axle lift and their build-up along x")
    common(p, "surface mesh with a pressure field (VTK, VTU, PLY... anything meshio reads)")
    p.add_argument("--field", help="pressure field name (default: found as Cp, cp, p, pressure...)")
    p.add_argument("--shear", help="wall-shear field name (default: found as wallShearStress, wall_shear...)")
    p.add_argument("--pressure", choices=("cp", "gauge", "absolute", "kinematic"),
                   help="what the field is (required unless it is a pressure coefficient)")
    p.add_argument("--speed", type=quantity("km/h", 1, 600), help="free-stream speed [km/h] for a pressure in Pa")
    p.add_argument("--density", type=quantity("kg/m^3", 0.1, 3.0), help="air density [kg/m^3] for a pressure in Pa")
    p.add_argument("--p-inf", dest="p_inf", type=quantity("Pa"), help="free-stream pressure [Pa] of an absolute field")
    p.add_argument("--area", type=quantity("m^2", 0.01, 12), help="reference area [m^2] (default: the sheet's frontal "
                   "area, else projected from the surface)")
    p.add_argument("--front-axle", dest="front_axle", type=quantity("m", 0, 5),
                   help="front axle x from the nose [m] (default: the sheet's dimensions.front_overhang)")
    p.add_argument("--wheelbase", type=quantity("m", 0.5, 8), help="[m] (default: the sheet's dimensions.wheelbase)")
    p.add_argument("--units", choices=("mm", "m"), help="units of the file (default: inferred, and said)")
    p.add_argument("--nose", choices=("-x", "+x"), default="-x", help="which end is the front (default -x)")
    p.add_argument("--up", choices=("+z", "+y"), default="+z", help="which axis points up (default +z)")
    p.add_argument("--ground", type=float, help="ground plane height in file units (default: lowest point)")
    p.set_defaults(run=cmd_surface)

    p = results_sub.add_parser("yaw", help="a yaw table: the yaw sweep and its SAE J1252 wind-averaged Cd")
    common(p, "CSV or whitespace table with a yaw column [deg] and coefficients")
    p.add_argument("--columns", help="columns by name or number, e.g. yaw=beta,cd=Cd (default: found by name)")
    p.add_argument("--speed", type=quantity("km/h", 1, 600), help="vehicle speed [km/h] for the wind-averaged Cd")
    p.add_argument("--wind", type=quantity("m/s", 0, 30), default=J1252_WIND_SPEED,
                   help=f"mean wind speed [m/s] (default {J1252_WIND_SPEED:.2f}, the J1252 7 mph)")
    p.add_argument("--kind", choices=("tunnel", "cfd", "road"), default="tunnel",
                   help="what the sweep is, for the sheet's result (default tunnel)")
    p.set_defaults(run=cmd_yaw)
