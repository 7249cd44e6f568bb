"""Benchmark: review-site build time, cold and after one sheet changes.

Builds sites of 10, 50 and 200 synthetic vehicles (3 revisions each, varied from the demo
fleet) in a temporary knowledge base: first cold (empty figure cache), then again after
one sheet changed (the figure cache keeps every figure whose inputs did not change): twice,
another sheet changed each time, and the faster of the two counts, as for the floor.
Then builds the same pages with plain MkDocs, the floor: the generated pages and figures
written as static files, the same theme and configuration without the aeroreview plugin.
Prints seconds, pages per second, and the cold and warm builds as ratios to that floor.
Targets: cold at most 3x the floor at 10 and 50 vehicles, warm at most 1.15x, 200 vehicles
cold under 90 s.

Run: python bench/site.py [VEHICLES ...]
"""

from __future__ import annotations

import os
import random
import resource
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import yaml
from synthetic import DEMO, identity, templates, vary

from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from aeroreview.site.plugin import CACHE_FOLDER, FLEET_MARKER

ROOT = Path(__file__).resolve().parents[1]


def make_fleet(folder: Path, vehicles: int, seed: int = 7) -> None:
    """Write ``vehicles`` x 3 revisions, each a demo sheet with its numbers varied by +-3 %,
    beside the solver files its results name (linked from the demo, as a vehicle's own)."""
    rng = random.Random(seed)
    sources, homes = templates(), [path.parent for path in sorted(DEMO.rglob("*.yaml"))]
    for v in range(vehicles):
        vehicle = folder / "vehicles" / f"car-{v:03d}"
        if (homes[v % len(homes)] / "cfd").is_dir():
            shutil.copytree(homes[v % len(homes)] / "cfd", vehicle / "cfd", copy_function=os.link)
        for r in range(1, 4):
            text = identity(vary(sources[v % len(sources)], rng, 0.03), f"car-{v:03d}", f"r{r}",
                            f"r{r - 1}" if r > 1 else None)
            vehicle.mkdir(parents=True, exist_ok=True)
            (vehicle / f"r{r}.yaml").write_text(text, encoding="utf-8")


def pages(site: Path) -> int:
    return sum(1 for _ in site.rglob("*.html"))


def timed(command: list[str], cwd: Path) -> tuple[float, float]:
    """Wall and CPU seconds (its own and its children's) of one command in a fresh process, as a user runs it."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    subprocess.run(command, cwd=cwd, check=True, stdout=subprocess.DEVNULL,
                   env={**os.environ, "NO_MKDOCS_2_WARNING": "1"})
    wall = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    return wall, (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)


def plain_docs(kb: Path) -> None:
    """The same pages for plain MkDocs: the generated files written as static files into a docs folder,
    and a configuration without the aeroreview plugin (the same theme, search and offline plugins)."""
    settings = load_settings(kb / "mkdocs.yml")
    reviews = [review_sheet(sheet, settings) for sheet in load_fleet([settings.sheets_path]).sheets]
    site = generate(reviews, settings, FigureCache(kb / CACHE_FOLDER))  # every figure is cached by now
    docs = kb / "plain_docs"
    shutil.rmtree(docs, ignore_errors=True)
    shutil.copytree(kb / "site_src", docs)
    for path, content in site.files.items():
        target = docs / path
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(content) if isinstance(content, bytes) else target.write_text(content, encoding="utf-8")
    for path, source in site.copies.items():
        (docs / path).parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(source, docs / path)
    index = docs / "index.md"
    index.write_text(index.read_text(encoding="utf-8").replace(FLEET_MARKER, site.home_table), encoding="utf-8")
    config = yaml.safe_load((kb / "mkdocs.yml").read_text(encoding="utf-8"))
    config.update(docs_dir="plain_docs", strict=False,
                  plugins=[p for p in config["plugins"] if not (isinstance(p, dict) and "aeroreview" in p)])
    (kb / "plain.yml").write_text(yaml.safe_dump(config), encoding="utf-8")


AEROREVIEW = [sys.executable, "-c", "from aeroreview.cli import main; raise SystemExit(main())"]
PLAIN = [sys.executable, "-m", "mkdocs", "build", "-q", "-f", "plain.yml", "-d", "plain_out"]


def run(vehicles: int) -> dict[str, tuple[float, float] | int]:
    """Cold, warm (one sheet changed) and plain builds of one synthetic fleet: (wall, CPU) seconds each."""
    with tempfile.TemporaryDirectory() as tmp:
        kb = Path(tmp)
        shutil.copy(ROOT / "mkdocs.yml", kb / "mkdocs.yml")
        shutil.copytree(ROOT / "site_src", kb / "site_src")
        shutil.copytree(ROOT / "studies", kb / "studies")  # the calibration mkdocs.yml names
        make_fleet(kb, vehicles)
        build = AEROREVIEW + ["site", "build", "-o", "out"]
        times = {"cold": timed(build, kb), "pages": pages(kb / "out")}
        warm = []
        for vehicle in ("car-000", "car-001"):  # two rebuilds, each after one sheet changed: the faster, as for the floor
            changed = kb / "vehicles" / vehicle / "r3.yaml"
            changed.write_text(changed.read_text(encoding="utf-8").replace(
                "vehicle.class:", "rear.spoiler_height: 30 mm\n  vehicle.class:"), encoding="utf-8")
            warm.append(timed(build, kb))
        times["warm"] = min(warm)
        plain_docs(kb)
        times["plain"] = min(timed(PLAIN, kb), timed(PLAIN, kb))  # the floor: the faster of two runs
        return times


def main(sizes: list[int]) -> None:
    print(f"load average before: {' '.join(f'{x:.2f}' for x in os.getloadavg())} on {os.cpu_count()} cores")
    print(f"{'vehicles':>8} {'pages':>6} {'cold s':>7} {'cpu':>6} {'warm s':>7} {'cpu':>6} {'plain s':>7} {'cpu':>6} "
          f"{'cold/plain':>10} {'cpu':>5} {'warm/plain':>10} {'cpu':>5} {'load':>5}")
    for n in sizes:
        t = run(n)
        (cold, cold_cpu), (warm, warm_cpu), (plain, plain_cpu) = t["cold"], t["warm"], t["plain"]
        print(f"{n:>8} {t['pages']:>6} {cold:>7.1f} {cold_cpu:>6.1f} {warm:>7.2f} {warm_cpu:>6.2f} {plain:>7.2f} "
              f"{plain_cpu:>6.2f} {cold / plain:>10.2f} {cold_cpu / plain_cpu:>5.2f} {warm / plain:>10.2f} "
              f"{warm_cpu / plain_cpu:>5.2f} {os.getloadavg()[0]:>5.2f}", flush=True)


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [10, 50, 200])
