"""Benchmark: validation + review throughput against the cost of merely parsing the YAML.

Generates N synthetic sheets (N = 100, 1000, 5000) by varying the demo fleet's numbers,
then times (a) reading and parsing each file with PyYAML's C loader, the floor any tool
must pay, and (b) aeroreview's full path: located loading, validation against the
catalogue, and the review of every rule with its consequences. Prints sheets per second
and the ratio (b) / (a), each the best of three runs. Target: the ratio stays below 3
and flat in N.

Run: python bench/check.py [N ...]
"""

from __future__ import annotations

import random
import re
import sys
import tempfile
import time
from pathlib import Path

import yaml

from aeroreview.review import review_sheet
from aeroreview.settings import Settings
from aeroreview.sheet import load_sheet

DEMO = Path(__file__).resolve().parents[1] / "vehicles"
NUMBER = re.compile(r"(?<=: )(\d+\.?\d*)(?= (mm|deg|m|kg|m\^2|kWh|km/h|%|in|L)\b)")


def make_sheets(folder: Path, count: int, seed: int = 1) -> list[Path]:
    """Write ``count`` sheets: demo sheets with every number scaled by up to +-3 %."""
    rng = random.Random(seed)
    templates = [p.read_text(encoding="utf-8") for p in sorted(DEMO.rglob("*.yaml"))]
    paths = []
    for i in range(count):
        text = templates[i % len(templates)]
        text = NUMBER.sub(lambda m: f"{float(m.group(1)) * rng.uniform(0.99, 1.01):.4g}", text)
        text = re.sub(r"^id: (\S+)", rf"id: \1-{i}", text, flags=re.M)
        text = re.sub(r"^parent: .*\n", "", text, flags=re.M)
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


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [100, 1000, 5000])
