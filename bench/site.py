"""Benchmark: review-site build time, cold and after one sheet changes.

Builds sites of 10, 50 and 200 synthetic vehicles (3 revisions each, varied from the demo
fleet) in a temporary knowledge base: first cold (empty figure cache), then again after
one sheet changed (the figure cache keeps every figure whose inputs did not change).
Then builds the same pages with plain MkDocs, the floor: the generated pages and figures
written as static files, the same theme and configuration without the aeroreview plugin.
Prints seconds, pages per second, and the cold and warm builds as ratios to that floor.
Targets: cold at most 3x the floor at 10 and 50 vehicles, warm at most 1.15x, 200 vehicles
cold under 90 s.

Run: python bench/site.py [VEHICLES ...]
"""

from __future__ import annotations

import random
import shutil
import sys
import tempfile
import time
from pathlib import Path

import yaml
from mkdocs.commands.build import build as mkdocs_build
from mkdocs.config import load_config
from synthetic import identity, templates, vary

from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import load_fleet
from aeroreview.site.build import build_site
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from aeroreview.site.plugin import CACHE_FOLDER, FLEET_MARKER

ROOT = Path(__file__).resolve().parents[1]


def make_fleet(folder: Path, vehicles: int, seed: int = 7) -> None:
    """Write ``vehicles`` x 3 revisions, each a demo sheet with its numbers varied by +-3 %."""
    rng = random.Random(seed)
    sources = templates()
    for v in range(vehicles):
        for r in range(1, 4):
            text = identity(vary(sources[v % len(sources)], rng, 0.03), f"car-{v:03d}", f"r{r}",
                            f"r{r - 1}" if r > 1 else None)
            path = folder / "vehicles" / f"car-{v:03d}" / f"r{r}.yaml"
            path.parent.mkdir(parents=True, exist_ok=True)
            path.write_text(text, encoding="utf-8")


def pages(site: Path) -> int:
    return sum(1 for _ in site.rglob("*.html"))


def plain_floor(kb: Path) -> float:
    """Seconds for plain MkDocs to build the same pages: generated files written as static files."""
    settings = load_settings(kb / "mkdocs.yml")
    reviews = [review_sheet(sheet, settings) for sheet in load_fleet([settings.sheets_path]).sheets]
    site = generate(reviews, settings, FigureCache(kb / CACHE_FOLDER))  # every figure is cached by now
    docs = kb / "plain_docs"
    shutil.copytree(kb / "site_src", docs)
    for path, content in site.files.items():
        target = docs / path
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(content) if isinstance(content, bytes) else target.write_text(content, encoding="utf-8")
    index = docs / "index.md"
    index.write_text(index.read_text(encoding="utf-8").replace(FLEET_MARKER, site.home_table), encoding="utf-8")
    config = yaml.safe_load((kb / "mkdocs.yml").read_text(encoding="utf-8"))
    config.update(docs_dir="plain_docs", strict=False,
                  plugins=[p for p in config["plugins"] if not (isinstance(p, dict) and "aeroreview" in p)])
    (kb / "plain.yml").write_text(yaml.safe_dump(config), encoding="utf-8")
    start = time.perf_counter()
    mkdocs_build(load_config(str(kb / "plain.yml"), site_dir=str(kb / "plain_out")))
    return time.perf_counter() - start


def run(vehicles: int) -> tuple[float, float, float, int]:
    with tempfile.TemporaryDirectory() as tmp:
        kb = Path(tmp)
        shutil.copy(ROOT / "mkdocs.yml", kb / "mkdocs.yml")
        shutil.copytree(ROOT / "site_src", kb / "site_src")
        make_fleet(kb, vehicles)
        start = time.perf_counter()
        site = build_site(str(kb / "mkdocs.yml"), str(kb / "out"))
        cold = time.perf_counter() - start
        count = pages(site)
        changed = kb / "vehicles" / "car-000" / "r3.yaml"
        changed.write_text(changed.read_text(encoding="utf-8").replace("vehicle.class:", "rear.spoiler_height: 30 mm\n"
                                                                                         "  vehicle.class:"), encoding="utf-8")
        start = time.perf_counter()
        build_site(str(kb / "mkdocs.yml"), str(kb / "out"))
        warm = time.perf_counter() - start
        return cold, warm, plain_floor(kb), count


def main(sizes: list[int]) -> None:
    print(f"{'vehicles':>8} {'pages':>6} {'cold s':>8} {'pages/s':>8} {'warm s':>8} {'plain s':>8} "
          f"{'cold/plain':>10} {'warm/plain':>10}")
    for n in sizes:
        cold, warm, plain, count = run(n)
        print(f"{n:>8} {count:>6} {cold:>8.1f} {count / cold:>8.1f} {warm:>8.1f} {plain:>8.1f} "
              f"{cold / plain:>10.2f} {warm / plain:>10.2f}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [10, 50, 200])
