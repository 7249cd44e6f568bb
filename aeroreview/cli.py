"""The ``aeroreview`` command line.

Exit codes: 0 clean, 1 findings at or above the fail level, 2 usage or input error.
User mistakes print ``file:line:column: what is wrong; hint`` and never a traceback;
``--debug`` shows one.
"""

from __future__ import annotations

import argparse
import json
import re
import sys
import textwrap
from pathlib import Path

from aeroreview import (__version__, baseline, calc_cli, calibrate_cli, collector, report, results_cli, review,
                        schema, template)
from aeroreview.catalogue import VEHICLE_CLASSES
from aeroreview.names import suggest
from aeroreview.problems import InputError, UsageError, clean
from aeroreview.rules import REGIONS, RULES_HINT, ZONES, all_rules
from aeroreview.settings import FAIL_LEVELS, load_settings
from aeroreview.sheet import attachment_problems, load_fleet

EXIT_CLEAN, EXIT_FINDINGS, EXIT_INPUT = 0, 1, 2


class _Parser(argparse.ArgumentParser):
    """argparse that raises instead of exiting, so every usage error takes one path.

    A value that starts with a minus and a digit (``--yaw -10:0.35,0:0.30``), and the axis
    ``-x`` (``--nose -x``), are values, not options: no option of ours looks like them, and
    argparse's own test knows only plain negative numbers.
    """

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self._negative_number_matcher = re.compile(r"^-(?:\.?\d|x$)")  # and the axis value -x (--nose -x)

    def error(self, message):
        raise UsageError(f"{self.prog}: {message}")


def _write_output(text: str, output: str | None, protected: frozenset[Path]) -> None:
    """Print ``text`` or write it to ``output`` atomically; never over an input sheet (``protected``: real paths)."""
    if not output:
        sys.stdout.write(text)
        return
    target = Path(output)
    if target.resolve() in protected:
        raise UsageError(f"--output {output} is one of the input sheets; refusing to overwrite it")
    temporary = target.with_name(f".{target.name}.tmp")
    try:
        temporary.write_text(text, encoding="utf-8")
        temporary.replace(target)
    except OSError as error:
        raise UsageError(f"cannot write {output}: {error.strerror}") from None
    print(f"wrote {output}", file=sys.stderr)


def _cmd_check(args) -> int:
    with collector.young_collections_only():  # the fleet and its reviews live until the end
        return _check(args)


def _check(args) -> int:
    settings = load_settings(args.config)
    fail_on = args.fail_on or settings.fail_on
    fleet = load_fleet(args.paths or [settings.sheets_path])
    problems = fleet.problems + attachment_problems(fleet.sheets, settings.max_attachment_bytes)
    bad_files = {p.file for p in problems}
    reviews = [review.review_sheet(s, settings) for s in fleet.sheets if s.path not in bad_files]
    before = baseline.load(args.baseline) if args.baseline else None
    notices = settings.notices + fleet.warnings + [n for r in reviews for n in r.notices]
    if args.format == "text":
        for warning in notices:
            print(warning, file=sys.stderr)
    with collector.paused():
        text, fails = _report(args, reviews, problems + notices, fail_on, before)
    _write_output(text, args.output, fleet.files)
    for problem in problems:
        print(problem, file=sys.stderr)
    if problems:
        return EXIT_INPUT
    return EXIT_FINDINGS if fails else EXIT_CLEAN


def _report(args, reviews, problems, fail_on: str, before) -> tuple[str, bool]:
    """The report in ``args.format``, and whether any finding fails the gate.

    Its data are dropped on return, before the collector resumes (see :func:`aeroreview.collector.paused`).
    """
    data = report.as_json(reviews, problems, fail_on)
    if before is not None:
        baseline.apply(data, before)
    if args.format == "json":
        text = json.dumps(data, indent=2 if args.pretty else None, separators=None if args.pretty else (",", ":"),
                          default=str) + "\n"
    elif args.format == "junit":
        text = report.as_junit(data, fail_on)
    elif args.format == "sarif":
        from aeroreview.sarif import as_sarif

        text = as_sarif(data)
    else:
        text = report.as_text(data, color=args.output is None and sys.stdout.isatty())
    return text, any(s["failing"] for s in data["sheets"])


def _cmd_rules(args) -> int:
    rules = all_rules()
    if args.format == "json":
        print(json.dumps([_rule_json(r) for r in rules.values()], indent=2))
        return EXIT_CLEAN
    for rule in rules.values():
        print(f"{rule.id:<30} {rule.severity:<9} {rule.title}")
    print(f"{len(rules)} rules in {len({r.zone for r in rules.values()})} zones; `aeroreview explain RULE_ID` for one")
    return EXIT_CLEAN


def _rule_json(rule) -> dict:
    return {"id": rule.id, "zone": rule.zone, "region": rule.region, "title": rule.title, "severity": rule.severity,
            "needs": list(rule.needs), "optional": list(rule.optional), "reads": list(rule.reads),
            "applies_to": list(rule.applies_to) or "all classes",
            "thresholds": [{"name": t.name, "default": t.default, "unit": t.unit, "description": t.description,
                            "source": t.source.as_dict()} for t in rule.thresholds],
            "sources": [s.as_dict() for s in rule.sources],
            "sensitivity": rule.sensitivity.as_dict() if rule.sensitivity else None,
            "rationale": rule.doc.get("Why it matters", ""), "fix": rule.fix, "documentation": rule.doc}


def _cmd_site(args) -> int:
    from aeroreview.site import build  # MkDocs loads only when the site is wanted

    if args.action == "serve":
        build.serve_site(args.config, args.address)
        return EXIT_CLEAN
    folder = build.build_site(args.config, args.output)
    print(f"built the review site in {folder}\nopen {folder / 'index.html'} in a browser, or serve it: "
          f"aeroreview site serve (http://{args.address}/)")
    return EXIT_CLEAN


def _measure_figures(measure, result, folder: Path, source: str) -> list[Path]:
    """Draw the centreline section and the horizontal sections as SVG into ``folder``."""
    from aeroreview.site.figures import FigureCache

    folder.mkdir(parents=True, exist_ok=True)
    cache = FigureCache(None)
    written = []
    if result.centreline is not None:
        _, svg = cache.svg("silhouette", measure.silhouette_data(result, title=f"{source}: centreline section"))
        written.append(folder / "centreline.svg")
        written[-1].write_bytes(svg)
    if result.sections:
        _, svg = cache.svg("sections", measure.sections_data(result))
        written.append(folder / "sections.svg")
        written[-1].write_bytes(svg)
    return written


def _cmd_measure(args) -> int:
    from aeroreview import measure  # trimesh loads only when a surface is measured

    ground = None if args.ground is None else float(args.ground)
    surface = measure.load_surface(args.surface, args.units, args.nose, args.up, ground)
    result = measure.measure(surface)
    source = Path(args.surface).name
    if args.json:
        print(json.dumps(measure.as_json(result), indent=2))
    else:
        print(measure.as_text(result, source), end="")
    for note in surface.notes + [n for n in result.notes if n.startswith("warning:") and n not in surface.notes]:
        print(f"{args.surface}: {note}", file=sys.stderr)
    if args.figures:
        for path in _measure_figures(measure, result, Path(args.figures), source):
            print(f"wrote {path}", file=sys.stderr)
    if args.sheet:
        report = measure.merge_into_sheet(args.sheet, result, source, args.overwrite)
        for key, differs in report["differs"].items():
            print(f"{args.sheet}: kept your {key} ({differs}); --overwrite takes the measurement", file=sys.stderr)
        print(f"{args.sheet}: added {len(report['added'])}, filled {len(report['filled'])} template lines, "
              f"kept {len(report['kept'])} of your values"
              + (f" ({', '.join(report['kept'])}; --overwrite replaces them)" if report["kept"] else "")
              + (f", replaced {len(report['replaced'])} (original kept as {report['backup']})" if report["replaced"] else ""),
              file=sys.stderr)
    return EXIT_CLEAN


def _cmd_explain(args) -> int:
    rules = all_rules()
    rule = rules.get(args.rule_id)
    if rule is None:
        raise UsageError(f"unknown rule '{args.rule_id}'; {suggest(args.rule_id, rules, RULES_HINT)}")
    print(f"{rule.id}: {rule.title}\nzone: {ZONES[rule.zone]}; default severity: {rule.severity}; "
          f"needs: {', '.join(rule.needs) or 'results only'}"
          + (f"; applies to: {', '.join(rule.applies_to)}" if rule.applies_to else "")
          + (f"; acts on: {REGIONS[rule.region]}" if rule.region else ""))
    for heading, body in rule.doc.items():
        print(f"\n{heading}:\n" + textwrap.fill(body, 92, initial_indent="  ", subsequent_indent="  "))
    if rule.thresholds:
        print("\nThresholds (override in the aeroreview section of mkdocs.yml):")
        for t in rule.thresholds:
            print(f"  {t.name} = {t.default}: {t.description} [{t.source.kind}: {t.source.citation}]")
    if rule.sensitivity:
        sens = rule.sensitivity
        print(f"\nSensitivity: {sens.counts_per_unit:+g} counts per {sens.unit} of {sens.feature} "
              f"({sens.valid[0]:g} to {sens.valid[1]:g} {sens.unit}) [{sens.source.kind}: {sens.source.citation}]")
        for cal, slope in load_settings(args.config).calibrated.get(sens.feature, []):
            print(f"  [team data] {cal.label}: {slope.counts_per_unit:+.3g} counts per {slope.unit} (95 % "
                  f"{slope.ci95[0]:+.3g} to {slope.ci95[1]:+.3g}, {slope.agreement}); for {cal.scope}, inside "
                  f"{slope.study_range[0]:g}-{slope.study_range[1]:g} {slope.unit} (beyond, the library estimate "
                  "pro rata)")
    print("\nSources:")
    for source in rule.sources:
        print(f"  [{source.kind}] {source.citation}")
    return EXIT_CLEAN


def _cmd_schema(args) -> int:
    print(json.dumps(schema.sheet_schema(), indent=2))
    return EXIT_CLEAN


def _cmd_new(args) -> int:
    path = Path(args.output or f"vehicles/{args.vehicle_id}/{args.revision}.yaml")
    placeholders = template.write(path, args.vehicle_id, args.vehicle_class, args.revision)
    print(f"wrote {path} with {placeholders} placeholders (<e.g. ...>) to replace with your vehicle's values;\n"
          f"`aeroreview check {path}` refuses the sheet, as an input error, until every one is filled")
    return EXIT_CLEAN


def _cmd_init(args) -> int:
    from aeroreview import starter

    folder = Path(args.folder)
    starter.create(folder)
    print(f"wrote a knowledge base in {folder}: mkdocs.yml (settings), site_src/ (pages), vehicles/ (empty), "
          f"ci/gate.sh (the CI gate)\nnext: cd {folder} && aeroreview new VEHICLE_ID --class CLASS, "
          "fill the sheet, then aeroreview check")
    return EXIT_CLEAN


def build_parser() -> argparse.ArgumentParser:
    parser = _Parser(prog="aeroreview", description="Review road-vehicle aerodynamics from feature sheets.")
    parser.add_argument("--version", action="version", version=f"aeroreview {__version__}")
    parser.add_argument("--debug", action="store_true", help="show a traceback on errors")
    sub = parser.add_subparsers(dest="command", required=True, parser_class=_Parser, metavar="COMMAND")

    check = sub.add_parser("check", help="validate and review sheets (files or folders, searched recursively)")
    check.add_argument("paths", nargs="*", metavar="PATH", help="sheets or folders (default: the configured sheets)")
    check.add_argument("--format", choices=("text", "json", "junit", "sarif"), default="text",
                       help="report format: text, json, junit (XML) or sarif (SARIF 2.1.0, for code review)")
    check.add_argument("-o", "--output", help="write the report to this file instead of stdout")
    check.add_argument("--pretty", action="store_true", help="with --format json: indent the JSON for reading")
    check.add_argument("--fail-on", choices=FAIL_LEVELS, help="lowest status that fails (default from the settings)")
    check.add_argument("--baseline", metavar="REPORT.json", help="fail only on findings new or worse than this JSON report "
                       "(worse: a higher status, or a grown estimate or excess beyond the limit)")
    check.add_argument("--config", help="settings file (default ./mkdocs.yml)")
    check.set_defaults(run=_cmd_check)

    rules_cmd = sub.add_parser("rules", help="list the rule library")
    rules_cmd.add_argument("--format", choices=("text", "json"), default="text")
    rules_cmd.set_defaults(run=_cmd_rules)

    explain = sub.add_parser("explain", help="print a rule's documentation, thresholds and sources")
    explain.add_argument("rule_id", metavar="RULE_ID")
    explain.add_argument("--config", help="settings file, for its calibrations (default ./mkdocs.yml)")
    explain.set_defaults(run=_cmd_explain)

    schema_cmd = sub.add_parser("schema", help="print the JSON Schema (draft 2020-12) of a sheet")
    schema_cmd.set_defaults(run=_cmd_schema)

    new = sub.add_parser("new", help="write a commented template sheet for a new vehicle")
    new.add_argument("vehicle_id", metavar="VEHICLE_ID")
    new.add_argument("--class", dest="vehicle_class", required=True, choices=VEHICLE_CLASSES)
    new.add_argument("--revision", default="r1")
    new.add_argument("-o", "--output", help="file to write (default vehicles/VEHICLE_ID/REVISION.yaml)")
    new.set_defaults(run=_cmd_new)

    init = sub.add_parser("init", help="start a knowledge base of your own in a new or empty folder")
    init.add_argument("folder", metavar="DIR")
    init.set_defaults(run=_cmd_init)

    measure_cmd = sub.add_parser("measure", help="measure sheet features from a surface (STL, OBJ, PLY) or a CSV profile")
    measure_cmd.add_argument("surface", metavar="SURFACE")
    measure_cmd.add_argument("--units", choices=("mm", "m"), help="units of the file (default: inferred, and said)")
    measure_cmd.add_argument("--nose", choices=("-x", "+x"), help="which end is the front (default: inferred, and said)")
    measure_cmd.add_argument("--up", choices=("+z", "+y"), help="which axis points up (default: inferred, and said)")
    measure_cmd.add_argument("--ground", type=float, help="ground plane height in file units (default: lowest point)")
    measure_cmd.add_argument("--json", action="store_true", help="print JSON")
    measure_cmd.add_argument("--sheet", help="merge the measured features into this sheet (comments and your values kept)")
    measure_cmd.add_argument("--overwrite", action="store_true", help="with --sheet: replace your values (a backup is kept)")
    measure_cmd.add_argument("--figures", metavar="DIR", help="write centreline.svg and sections.svg here")
    measure_cmd.set_defaults(run=_cmd_measure)

    site = sub.add_parser("site", help="build or serve the review site (MkDocs)")
    site.add_argument("action", choices=("build", "serve"))
    site.add_argument("-o", "--output", help="folder for the built site (default: site_dir of mkdocs.yml)")
    site.add_argument("--config", help="MkDocs configuration (default ./mkdocs.yml)")
    site.add_argument("--address", default="127.0.0.1:8000", help="address to serve on (default 127.0.0.1:8000)")
    site.set_defaults(run=_cmd_site)

    calc_cli.add_parser(sub)
    calibrate_cli.add_parser(sub)
    results_cli.add_parser(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    debug = "--debug" in argv
    try:
        args = build_parser().parse_args(argv)
        return args.run(args)
    except UsageError as error:
        print(f"error: {clean(error)}", file=sys.stderr)
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
        print(f"internal error: {type(error).__name__}: {clean(error)}\n"
              "this is a bug in aeroreview; run again with --debug and report the traceback", file=sys.stderr)
        return EXIT_INPUT
