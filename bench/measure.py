"""Benchmark: `aeroreview measure` on surfaces of 10k, 100k and 1M triangles.

Generates the demo's lofted body (an invented design) at three resolutions, writes each as
binary STL, and in a fresh process per size times (a) merely loading the file with trimesh,
the floor, and (b) the full measurement (load, frontal area, centreline and horizontal
sections, fits), with the peak resident memory of that process. Targets: 1M triangles in
under 10 s and 2 GB; cost no worse than linear in the triangle count.

Run: python bench/measure.py [TRIANGLES ...]
"""

from __future__ import annotations

import json
import math
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "vehicles" / "tessel" / "surface"))

CHILD = r"""
import json, resource, sys, time
import trimesh
from aeroreview.measure import load_surface, measure
path = sys.argv[1]
start = time.perf_counter(); mesh = trimesh.load(path, force="mesh", process=False); load = time.perf_counter() - start
del mesh
start = time.perf_counter(); result = measure(load_surface(path, ground=0.0)); full = time.perf_counter() - start
peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
print(json.dumps({"load_s": load, "measure_s": full, "peak_MB": peak, "faces": None,
                  "frontal_area": result.frontal_area}))
"""


def make(path: Path, triangles: int) -> int:
    import make_surface
    import trimesh

    ring = max(16, int(math.sqrt(triangles / 2 / 3)))  # about three stations per ring point
    stations = max(10, triangles // (2 * ring))
    vertices, faces = make_surface.build(make_surface.DESIGNS["r2"], stations=stations, ring=ring)
    trimesh.Trimesh(vertices, faces, process=False).export(str(path))
    return len(faces)


def main(sizes: list[int]) -> None:
    print(f"{'triangles':>10} {'load s':>8} {'measure s':>10} {'ratio':>6} {'peak MB':>8} {'us/triangle':>12}")
    with tempfile.TemporaryDirectory() as tmp:
        for size in sizes:
            path = Path(tmp) / f"body-{size}.stl"
            faces = make(path, size)
            done = subprocess.run([sys.executable, "-c", CHILD, str(path)], capture_output=True, text=True, check=True)
            figures = json.loads(done.stdout)
            print(f"{faces:>10} {figures['load_s']:>8.2f} {figures['measure_s']:>10.2f} "
                  f"{figures['measure_s'] / figures['load_s']:>6.1f} {figures['peak_MB']:>8.0f} "
                  f"{figures['measure_s'] / faces * 1e6:>12.2f}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [10_000, 100_000, 1_000_000])
