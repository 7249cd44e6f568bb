"""Benchmark: review-site build time, cold and after one sheet changes.

Builds sites of 10, 50 and 200 synthetic vehicles (3 revisions each, varied from the demo
fleet) in a temporary knowledge base: first cold (empty figure cache), then again after
one sheet changed (the figure cache keeps every figure whose inputs did not change).
Prints seconds, pages per second and the warm/cold ratio. Targets: cold cost linear in the
fleet; the rebuild after one change at most 15 % of the cold build for 200 vehicles.

Run: python bench/site.py [VEHICLES ...]
"""

from __future__ import annotations

import random
import shutil
import sys
import tempfile
import time
from pathlib import Path

from aeroreview.site.build import build_site
from synthetic import templates, vary, identity

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
    return sum(1 for _ in site.rglob("index.html"))


def run(vehicles: int) -> tuple[float, float, int]:
    with tempfile.TemporaryDirectory() as tmp:
        kb = Path(tmp)
        shutil.copy(ROOT / "mkdocs.yml", kb / "mkdocs.yml")
        shutil.copytree(ROOT / "site_src", kb / "site_src")
        make_fleet(kb, vehicles)
        start = time.perf_counter()
        site = build_site(str(kb / "mkdocs.yml"), str(kb / "out"))
        cold = time.perf_counter() - start
        changed = kb / "vehicles" / "car-000" / "r3.yaml"
        changed.write_text(changed.read_text(encoding="utf-8").replace("vehicle.class:", "rear.spoiler_height: 30 mm\n"
                                                                                         "  vehicle.class:"), encoding="utf-8")
        start = time.perf_counter()
        build_site(str(kb / "mkdocs.yml"), str(kb / "out"))
        warm = time.perf_counter() - start
        return cold, warm, pages(site)


def main(sizes: list[int]) -> None:
    print(f"{'vehicles':>8} {'pages':>6} {'cold s':>8} {'pages/s':>8} {'warm s':>8} {'warm/cold':>9}")
    for n in sizes:
        cold, warm, count = run(n)
        print(f"{n:>8} {count:>6} {cold:>8.1f} {count / cold:>8.1f} {warm:>8.1f} {warm / cold:>9.2f}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [10, 50, 200])
