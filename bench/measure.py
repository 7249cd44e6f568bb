"""Benchmark: `aeroreview measure` on surfaces of 150k, 1M and 2M triangles.

Generates the demo's lofted body (an invented design) at three resolutions, writes each as
binary STL, and in a fresh process per size times (a) loading the file with
``trimesh.load(force="mesh")``, the floor, (b) the bare parse (``trimesh.load`` of the single
body, without the copy of its scene into one mesh that ``force`` adds; ``measure`` loads this
way) and (c) the full measurement (load, vertex merge, watertight and degenerate-face checks,
frontal area, centreline and horizontal sections, fits), with the peak resident memory of the
process. Each is the best of three runs, interleaved so that all see the same load on a shared
machine. Printed: (c) / (a) in wall time and in CPU time (the process's own, less disturbed by
other processes), and (c) / (b). Targets: (c) at most 2.5x (a) at 1M triangles, the cost per
triangle flat up to 2M, 1M triangles under 2 GB.

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
import gc, json, resource, sys, time
import trimesh
from aeroreview.measure import load_surface, measure
path, repeats = sys.argv[1], int(sys.argv[2])
def timed(work):
    wall, cpu = time.perf_counter(), time.process_time()
    work()
    wall, cpu = time.perf_counter() - wall, time.process_time() - cpu
    gc.collect()  # trimesh objects hold reference cycles: free each run's arrays before the next
    return wall, cpu
runs = {"load": [], "parse": [], "measure": []}
for _ in range(repeats):  # interleaved, so that all see the same load on a shared machine
    runs["load"].append(timed(lambda: trimesh.load(path, force="mesh", process=False)))
    runs["parse"].append(timed(lambda: trimesh.load(path, process=False)))
    runs["measure"].append(timed(lambda: measure(load_surface(path, ground=0.0))))
peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
print(json.dumps({**{f"{k}_{i}": min(r[i] for r in v) for k, v in runs.items() for i in (0, 1)}, "peak_MB": peak}))
"""


def make(path: Path, triangles: int) -> int:
    import make_surface
    import trimesh

    ring = max(16, int(math.sqrt(triangles / 2 / 3)))  # about three stations per ring point
    stations = max(10, triangles // (2 * ring))
    vertices, faces = make_surface.build(make_surface.DESIGNS["r2"], stations=stations, ring=ring)
    trimesh.Trimesh(vertices, faces, process=False).export(str(path))
    return len(faces)


def main(sizes: list[int], repeats: int = 3) -> None:
    print(f"{'triangles':>10} {'load s':>7} {'parse s':>7} {'measure s':>9} {'ratio':>6} {'cpu ratio':>9} "
          f"{'/parse':>6} {'peak MB':>7} {'us/triangle':>11}")
    with tempfile.TemporaryDirectory() as tmp:
        for size in sizes:
            path = Path(tmp) / f"body-{size}.stl"
            faces = make(path, size)
            done = subprocess.run([sys.executable, "-c", CHILD, str(path), str(repeats)], capture_output=True,
                                  text=True, check=True)
            f = json.loads(done.stdout)
            print(f"{faces:>10} {f['load_0']:>7.2f} {f['parse_0']:>7.2f} {f['measure_0']:>9.2f} "
                  f"{f['measure_0'] / f['load_0']:>6.2f} {f['measure_1'] / f['load_1']:>9.2f} "
                  f"{f['measure_0'] / f['parse_0']:>6.1f} {f['peak_MB']:>7.0f} {f['measure_0'] / faces * 1e6:>11.2f}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [150_000, 1_000_000, 2_000_000])
