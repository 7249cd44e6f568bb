"""Benchmark: validation + review throughput against the cost of merely parsing the YAML.

Generates N synthetic sheets (N = 100, 1000, 5000) by varying the demo fleet's numbers,
then times (a) reading and parsing each file with PyYAML's C loader, the floor any tool
must pay, and (b) aeroreview's full path: located loading, validation against the
catalogue, and the review of every rule with its consequences. Prints sheets per second
and the ratio (b) / (a), each the best of three runs. Target: the ratio stays below 3
and flat in N.

A second case loads a whole fleet folder (2000 sheets) with ``load_fleet``, once with valid
sheets and once with every sheet naming a parent revision that does not exist; target: the
broken fleet loads within 2x the valid fleet's time (fleet loading stays linear).

A third case times the check command end to end (in-process: settings, fleet loading, review,
report, writing the file) at 1000 sheets, in text and in JSON, against the load-plus-review
it wraps (``load_fleet`` and ``review_sheet``); targets: each at most 1.3x. The interpreter's
start-up and imports (``aeroreview --version`` in a fresh process) are printed beside it.

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

from aeroreview.cli import main as check_command
from aeroreview.review import review_sheet
from aeroreview.settings import Settings, load_settings
from aeroreview.sheet import load_fleet, load_sheet


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


def floor(paths: list[Path]) -> float:
    start = time.perf_counter()
    for path in paths:
        yaml.load(path.read_text(encoding="utf-8"), Loader=yaml.CSafeLoader)
    return time.perf_counter() - start


def full(paths: list[Path], settings: Settings) -> float:
    start = time.perf_counter()
    for path in paths:
        review_sheet(load_sheet(path), settings)
    return time.perf_counter() - start


def fleet_case(count: int = 2000) -> None:
    """Valid fleet against a fleet whose every sheet names a missing parent ('r0')."""
    times = {}
    for label, parent in (("valid", None), ("missing parents", "r0")):
        with tempfile.TemporaryDirectory() as tmp:
            make_sheets(Path(tmp), count, parent=parent)
            times[label] = float("inf")
            for _ in range(3):  # best of three, as above
                start = time.perf_counter()
                fleet = load_fleet([tmp])
                times[label] = min(times[label], time.perf_counter() - start)
            print(f"fleet of {count} sheets, {label}: {times[label]:.2f} s, {len(fleet.problems)} problems")
    print(f"missing parents / valid: {times['missing parents'] / times['valid']:.2f} (target at most 2)")


def best_of_three(work) -> float:
    times = []
    for _ in range(3):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return min(times)


def command_case(count: int = 1000) -> None:
    """The check command (text, JSON) against the load-plus-review it wraps, interleaved."""
    settings = load_settings()
    with tempfile.TemporaryDirectory() as tmp:
        make_sheets(Path(tmp), count)
        out = Path(tmp) / "report"

        def review_only():
            [review_sheet(sheet, settings) for sheet in load_fleet([tmp]).sheets]

        def command(*extra):
            with contextlib.redirect_stderr(io.StringIO()):
                check_command(["check", tmp, "--output", str(out), *extra])

        review_s = best_of_three(review_only)
        text_s = best_of_three(command)
        json_s = best_of_three(lambda: command("--format", "json"))
        review_s = min(review_s, best_of_three(review_only))
    start = time.perf_counter()
    subprocess.run([sys.executable, "-m", "aeroreview", "--version"], check=True, capture_output=True)
    startup = time.perf_counter() - start
    print(f"check command on {count} sheets: load+review {review_s:.2f} s, text {text_s:.2f} s "
          f"({text_s / review_s:.2f}x), JSON {json_s:.2f} s ({json_s / review_s:.2f}x) (targets at most 1.3x); "
          f"start-up and imports {startup:.2f} s")


def main(sizes: list[int]) -> None:
    settings = Settings()
    review_sheet(load_sheet(sorted(DEMO.rglob("*.yaml"))[0]), settings)  # warm caches (pint, cycle data)
    print(f"{'N':>6} {'parse s':>9} {'parse/s':>9} {'review s':>9} {'review/s':>9} {'ratio':>6}")
    for n in sizes:
        with tempfile.TemporaryDirectory() as tmp:
            paths = make_sheets(Path(tmp), n)
            repeats = 3  # best of three: the machine is shared, the minimum is the least disturbed run
            parse_s = min(floor(paths) for _ in range(repeats))
            review_s = min(full(paths, settings) for _ in range(repeats))
        print(f"{n:>6} {parse_s:>9.3f} {n / parse_s:>9.0f} {review_s:>9.3f} {n / review_s:>9.0f} "
              f"{review_s / parse_s:>6.2f}")
    fleet_case()
    command_case()


if __name__ == "__main__":
    os.chdir(Path(__file__).resolve().parents[1])  # the repository's mkdocs.yml holds the settings
    main([int(a) for a in sys.argv[1:]] or [100, 1000, 5000])
