"""Benchmark: validation + review throughput against the cost of merely parsing the YAML.

The machine is shared, so every figure is printed as wall time and as this process's CPU time
(``time.process_time``), each the best of three runs; the ratios are printed for both, and the
CPU ratio is the one a loaded machine disturbs least.

1. Full path against the floor: N synthetic sheets (N = 100, 1000, 5000) made by varying the
   demo fleet's numbers; (a) reading and parsing each file with PyYAML's C loader, the floor any
   tool must pay, and (b) aeroreview's full path: located loading, validation against the
   catalogue, and the review of every rule with its consequences and estimates. Target:
   (b) / (a) at most 2.2 and flat in N. The stages of (b) are printed beside it at the largest N.
2. Orphan parents: a fleet folder of 2000 sheets loaded with ``load_fleet``, once valid and once
   with every sheet naming a parent revision that does not exist; target: the broken fleet
   loads within 2x the valid fleet's time (fleet loading stays linear).
3. The check command end to end (in-process: settings, fleet loading, review, report, writing
   the file) at 1000 sheets, in text and in JSON, against the load-plus-review it wraps
   (``load_fleet`` and ``review_sheet``, with the collector set as the command sets it; the time
   with CPython's default collector is printed beside it); targets: each at most 1.3x. The interpreter's start-up
   and imports (``aeroreview --version`` in a fresh process) are printed beside it.

Run: python bench/check.py [N ...]
"""

from __future__ import annotations

import contextlib
import io
import os
import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import yaml
from synthetic import DEMO, identity, templates, vary

from aeroreview import yamldoc
from aeroreview.cli import main as check_command
from aeroreview.collector import young_collections_only
from aeroreview.review import review_sheet
from aeroreview.settings import Settings, load_settings
from aeroreview.sheet import from_document, load_fleet, load_sheet


def make_sheets(folder: Path, count: int, seed: int = 1, parent: str | None = None) -> list[Path]:
    """Write ``count`` sheets: demo sheets with every number scaled by up to +-1 %."""
    rng = random.Random(seed)
    sources = templates()
    paths = []
    for i in range(count):
        text = identity(vary(sources[i % len(sources)], rng, 0.01), f"car-{i}", "r1", parent)
        path = folder / f"sheet-{i:05d}.yaml"
        path.write_text(text, encoding="utf-8")
        paths.append(path)
    return paths


def timed(work, repeats: int = 3) -> tuple[float, float]:
    """(wall, CPU) seconds of ``work``, each the best of ``repeats`` runs (the least disturbed)."""
    walls, cpus = [], []
    for _ in range(repeats):
        wall, cpu = time.perf_counter(), time.process_time()
        work()
        walls.append(time.perf_counter() - wall)
        cpus.append(time.process_time() - cpu)
    return min(walls), min(cpus)


def fastest(*runs: tuple[float, float]) -> tuple[float, float]:
    return min(r[0] for r in runs), min(r[1] for r in runs)


def ratio(a: tuple[float, float], b: tuple[float, float]) -> str:
    return f"{a[0] / b[0]:.2f}x wall, {a[1] / b[1]:.2f}x CPU"


def seconds(t: tuple[float, float]) -> str:
    return f"{t[0]:.2f} s wall / {t[1]:.2f} s CPU"


def parse_floor(paths: list[Path]) -> None:
    for path in paths:
        yaml.load(path.read_text(encoding="utf-8"), Loader=yaml.CSafeLoader)


def full_path(paths: list[Path], settings: Settings) -> None:
    for path in paths:
        review_sheet(load_sheet(path), settings)


def stages(paths: list[Path], settings: Settings, parse: tuple[float, float]) -> None:
    """The full path's three stages, each against the C parse: where the time goes."""
    docs = [yamldoc.load(path) for path in paths]
    sheets = [from_document(doc, path.parent) for doc, path in zip(docs, paths)]
    plan = [(rule, context) for rule, context, _ in settings.rule_plan]
    parts = {"located loading": lambda: [yamldoc.load(path) for path in paths],
             "validation": lambda: [from_document(doc, path.parent) for doc, path in zip(docs, paths)],
             "review": lambda: [review_sheet(sheet, settings) for sheet in sheets],
             "  of which the rule checks alone": lambda: [
                 rule.check(sheet, context) for sheet in sheets for rule, context in plan
                 if rule.applies(sheet) and all(key in sheet.features for key in rule.needs)]}
    for name, work in parts.items():
        took = timed(work)
        print(f"  {name:<34} {seconds(took)}  ({ratio(took, parse)} the C parse)")


def full_path_case(sizes: list[int]) -> None:
    settings = Settings()
    review_sheet(load_sheet(sorted(DEMO.rglob("*.yaml"))[0]), settings)  # warm caches (pint, cycle data)
    print("1. full path (located loading, validation, review) against the C-loader parse; target at most 2.2x")
    print(f"{'N':>6} {'parse s':>8} {'(CPU)':>7} {'full s':>8} {'(CPU)':>7} {'sheets/s':>9} {'ratio':>6} {'(CPU)':>6}")
    for n in sizes:
        with tempfile.TemporaryDirectory() as tmp:
            paths = make_sheets(Path(tmp), n)
            parse = timed(lambda: parse_floor(paths))
            full = timed(lambda: full_path(paths, settings))
            print(f"{n:>6} {parse[0]:>8.3f} {parse[1]:>7.3f} {full[0]:>8.3f} {full[1]:>7.3f} {n / full[0]:>9.0f} "
                  f"{full[0] / parse[0]:>6.2f} {full[1] / parse[1]:>6.2f}")
            if n == max(sizes):
                print(f"  stages at N = {n}:")
                stages(paths, settings, parse)


def fleet_case(count: int = 2000) -> None:
    """Valid fleet against a fleet whose every sheet names a missing parent ('r0')."""
    print(f"2. orphan parents: a folder of {count} sheets with load_fleet; target at most 2x the valid fleet")
    times = {}
    for label, parent in (("valid", None), ("missing parents", "r0")):
        with tempfile.TemporaryDirectory() as tmp:
            make_sheets(Path(tmp), count, parent=parent)
            found = []
            times[label] = timed(lambda: found.append(load_fleet([tmp])))
            print(f"  {label:<16} {seconds(times[label])}, {len(found[-1].problems)} problems")
    print(f"  missing parents / valid: {ratio(times['missing parents'], times['valid'])} (target at most 2x)")


def command_case(count: int = 1000) -> None:
    """The check command (text, JSON) against the load-plus-review it wraps, interleaved."""
    print(f"3. the check command end to end on {count} sheets against the load-plus-review it wraps; "
          "targets at most 1.3x")
    settings = load_settings()
    with tempfile.TemporaryDirectory() as tmp:
        make_sheets(Path(tmp), count)
        out = Path(tmp) / "report"

        def review_only():  # with the collector set as the command sets it (aeroreview.collector)
            with young_collections_only():
                [review_sheet(sheet, settings) for sheet in load_fleet([tmp]).sheets]

        def review_default_collector():
            [review_sheet(sheet, settings) for sheet in load_fleet([tmp]).sheets]

        def command(*extra):
            with contextlib.redirect_stderr(io.StringIO()):
                check_command(["check", tmp, "--output", str(out), *extra])

        review = timed(review_only)
        text = timed(command)
        json = timed(lambda: command("--format", "json"))
        review = fastest(review, timed(review_only))
        default = timed(review_default_collector)
    start = time.perf_counter()
    subprocess.run([sys.executable, "-m", "aeroreview", "--version"], check=True, capture_output=True)
    startup = time.perf_counter() - start
    print(f"  load+review       {seconds(review)}  (with every full collection: {seconds(default)})")
    print(f"  text report       {seconds(text)}  ({ratio(text, review)} load+review; target at most 1.3x)")
    print(f"  JSON report       {seconds(json)}  ({ratio(json, review)} load+review; target at most 1.3x)")
    print(f"  start-up and imports (aeroreview --version, fresh process): {startup:.2f} s wall")


def main(sizes: list[int]) -> None:
    full_path_case(sizes)
    fleet_case()
    command_case()


if __name__ == "__main__":
    os.chdir(Path(__file__).resolve().parents[1])  # the repository's mkdocs.yml holds the settings
    main([int(a) for a in sys.argv[1:]] or [100, 1000, 5000])
