"""``aeroreview calibrate``: fit a parametric study and compare its slopes with the rule library's."""

from __future__ import annotations

import datetime as _dt
import json
import os
import sys
from pathlib import Path

from aeroreview.calibrate import MODELS, as_json, as_text, fit_study
from aeroreview.calibration import calibration_yaml, scope_problems
from aeroreview.problems import UsageError
from aeroreview.study import read_study


def _folds(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 2:
        raise UsageError(f"--folds {text}: give a whole number of 2 or more (5 is usual)")
    return value


def _today() -> str:
    """Today (UTC), or the SOURCE_DATE_EPOCH day for reproducible files (common practice)."""
    epoch = os.environ.get("SOURCE_DATE_EPOCH")
    moment = _dt.datetime.fromtimestamp(int(epoch), _dt.timezone.utc) if epoch and epoch.isdigit() else \
        _dt.datetime.now(_dt.timezone.utc)
    return moment.date().isoformat()


def _study_name(study: Path, output: Path) -> str:
    """The study as the calibration names it: relative to the calibration's folder when inside it."""
    try:
        return study.resolve().relative_to(output.resolve().parent).as_posix()
    except ValueError:
        return study.name


def _refuse_existing(target: Path) -> None:
    if target.exists() or target.is_symlink():
        raise UsageError(f"--output {target} already exists; refusing to overwrite it (choose a new name)")


def _write_new(target: Path, text: str) -> None:
    """Write ``text`` to a new file; an existing file is never replaced."""
    _refuse_existing(target)
    temporary = target.with_name(f".{target.name}.{os.getpid()}.tmp")
    try:
        temporary.write_text(text, encoding="utf-8")
        os.link(temporary, target)  # fails, rather than replaces, if the name appeared meanwhile
    except FileExistsError:
        raise UsageError(f"--output {target} already exists; refusing to overwrite it (choose a new name)") from None
    except OSError as error:
        raise UsageError(f"cannot write {target}: {error.strerror}") from None
    finally:
        temporary.unlink(missing_ok=True)


def _scope(args) -> tuple[list[str], list[str]]:
    """The vehicles and classes the calibration file will declare: a study speaks for the vehicle it is of."""
    vehicles, classes = args.vehicle or [], args.vehicle_class or []
    if not args.output:
        if vehicles or classes:
            raise UsageError("--vehicle and --vehicle-class are written into the calibration file: add --output FILE")
        return vehicles, classes
    if not vehicles and not classes:
        raise UsageError("--output needs the vehicle the study is of: add --vehicle ID (the sheets' `id:`), and "
                         "--vehicle-class CLASS only if the slopes hold for a whole class")
    found = scope_problems(vehicles, classes)
    if found:
        key, i, message, hint = found[0]
        option, given = ("--vehicle", vehicles) if key == "vehicles" else ("--vehicle-class", classes)
        raise UsageError(f"{option} {given[i]}: {message}; {hint}")
    return vehicles, classes


def run(args) -> int:
    folds = _folds(args.folds)
    vehicles, classes = _scope(args)
    if args.output:
        _refuse_existing(Path(args.output))  # before the work, not after it
    study = read_study(args.study, args.map or [], args.response)
    fit = fit_study(study, args.model, folds)
    for warning in fit.warnings:
        print(warning, file=sys.stderr)
    if args.json:
        print(json.dumps(as_json(fit), indent=2))
    else:
        print(as_text(fit), end="")
    if args.output:
        target = Path(args.output)
        _write_new(target, calibration_yaml(fit, _study_name(Path(args.study), target), _today(), vehicles, classes))
        print(f"wrote {target}; name it under `calibrations:` in the aeroreview settings to use it", file=sys.stderr)
    return 0


def add_parser(sub) -> None:
    parser = sub.add_parser("calibrate", help="fit the rules' sensitivities on a parametric study table (CSV)")
    parser.add_argument("study", metavar="STUDY", help="CSV or whitespace table, one row per variant, '#' comments")
    parser.add_argument("--map", action="append", metavar="COLUMN=FEATURE[:UNIT]",
                        help="a varied parameter: its column, catalogue feature and the unit of its numbers "
                             "(repeat for each; default unit: the feature's)")
    parser.add_argument("--response", metavar="COLUMN", help="the measured column (default: the one named like Cd)")
    parser.add_argument("--model", choices=(*MODELS, "both"), default="both",
                        help="response surface(s) to cross-validate (default both)")
    parser.add_argument("--folds", default="5", metavar="K", help="cross-validation folds (default 5)")
    parser.add_argument("--json", action="store_true", help="print JSON")
    parser.add_argument("-o", "--output", metavar="FILE", help="write the calibration (YAML) to this new file")
    parser.add_argument("--vehicle", action="append", metavar="ID",
                        help="with --output: the vehicle the study is of, whose findings it re-costs (repeat for "
                             "others its slopes hold for)")
    parser.add_argument("--vehicle-class", action="append", metavar="CLASS",
                        help="with --output: a vehicle class the slopes hold for (repeat for more)")
    parser.set_defaults(run=run)
