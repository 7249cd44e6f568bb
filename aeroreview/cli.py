"""The ``aeroreview`` command line.

Exit codes: 0 clean, 1 findings at or above the fail level, 2 usage or input error.
User mistakes print ``file:line:column: what is wrong; hint`` and never a traceback;
``--debug`` shows one.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from aeroreview import __version__, calc_cli, schema, template
from aeroreview.catalogue import VEHICLE_CLASSES
from aeroreview.problems import InputError, UsageError
from aeroreview.sheet import load_fleet

EXIT_CLEAN, EXIT_FINDINGS, EXIT_INPUT = 0, 1, 2


class _Parser(argparse.ArgumentParser):
    """argparse that raises instead of exiting, so every usage error takes one path."""

    def error(self, message):
        raise UsageError(f"{self.prog}: {message}")


def _cmd_check(args) -> int:
    fleet = load_fleet(args.paths)
    for warning in fleet.warnings:
        print(warning, file=sys.stderr)
    for problem in fleet.problems:
        print(problem, file=sys.stderr)
    count = len(fleet.sheets)
    if fleet.problems:
        print(f"{len(fleet.problems)} error(s); {count} sheet(s) valid", file=sys.stderr)
        return EXIT_INPUT
    print(f"{count} sheet(s) valid, {len(fleet.warnings)} warning(s)")
    return EXIT_CLEAN


def _cmd_schema(args) -> int:
    print(json.dumps(schema.sheet_schema(), indent=2))
    return EXIT_CLEAN


def _cmd_new(args) -> int:
    path = Path(args.output or f"vehicles/{args.vehicle_id}/{args.revision}.yaml")
    template.write(path, args.vehicle_id, args.vehicle_class, args.revision)
    print(f"wrote {path}; fill it in, then run: aeroreview check {path}")
    return EXIT_CLEAN


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="aeroreview", description="Review road-vehicle aerodynamics from feature sheets.")
    parser.add_argument("--version", action="version", version=f"aeroreview {__version__}")
    parser.add_argument("--debug", action="store_true", help="show a traceback on errors")
    sub = parser.add_subparsers(dest="command", required=True, parser_class=_Parser, metavar="COMMAND")

    check = sub.add_parser("check", help="validate sheets (files or folders, searched recursively)")
    check.add_argument("paths", nargs="+", metavar="PATH")
    check.set_defaults(run=_cmd_check)

    schema_cmd = sub.add_parser("schema", help="print the JSON Schema (draft 2020-12) of a sheet")
    schema_cmd.set_defaults(run=_cmd_schema)

    new = sub.add_parser("new", help="write a commented template sheet for a new vehicle")
    new.add_argument("vehicle_id", metavar="VEHICLE_ID")
    new.add_argument("--class", dest="vehicle_class", required=True, choices=VEHICLE_CLASSES)
    new.add_argument("--revision", default="r1")
    new.add_argument("-o", "--output", help="file to write (default vehicles/VEHICLE_ID/REVISION.yaml)")
    new.set_defaults(run=_cmd_new)

    calc_cli.add_parser(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    debug = "--debug" in argv
    try:
        args = build_parser().parse_args(argv)
        return args.run(args)
    except UsageError as error:
        print(f"error: {error}", file=sys.stderr)
        if debug:
            raise
        return EXIT_INPUT
    except InputError as error:
        for problem in error.problems:
            print(problem, file=sys.stderr)
        if debug:
            raise
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("interrupted", file=sys.stderr)
        return 130
    except Exception as error:  # noqa: BLE001 - last line of defence: no traceback for users
        if debug:
            raise
        print(f"internal error: {type(error).__name__}: {error}\n"
              "this is a bug in aeroreview; run again with --debug and report the traceback", file=sys.stderr)
        return EXIT_INPUT
