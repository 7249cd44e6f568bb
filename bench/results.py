"""Benchmark: `aeroreview results surface` on pressure fields of 20k, 200k and 2M faces.

Builds the demo's lofted body (an invented design) at each resolution with an invented
point field of Cp, writes it as binary, compressed VTU, and in a fresh process per size times
(a) merely reading the file with meshio, the floor, and (b) the whole integration (read,
orientation check, face forces, axle lift, build-up along x), with the peak resident memory
of that process. Targets: 2M faces in under 15 s and 3 GB; cost no worse than linear.

Run: python bench/results.py [FACES ...]
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
import meshio
from aeroreview.results import surface
path = sys.argv[1]
start = time.perf_counter(); mesh = meshio.read(path); read = time.perf_counter() - start
del mesh
start = time.perf_counter()
field = surface.load_field(path, units="m", ground=0.0)
forces = surface.integrate(field, surface.freestream(field), 2.24, 0.95, 2.95)
full = time.perf_counter() - start
peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
print(json.dumps({"read_s": read, "integrate_s": full, "peak_MB": peak, "faces": forces.faces, "cd": forces.cd}))
"""


def make(path: Path, faces: int) -> int:
    import make_surface
    import meshio
    import numpy as np

    ring = max(16, int(math.sqrt(faces / 2 / 3)))  # about three stations per ring point
    stations = max(10, faces // (2 * ring))
    vertices, triangles = make_surface.build(make_surface.DESIGNS["r2"], stations=stations, ring=ring)
    x = (vertices[:, 0] - vertices[:, 0].min()) / np.ptp(vertices[:, 0])
    cp = 1.0 - 3.0 * np.sin(np.pi * x) ** 2 * (vertices[:, 2] / vertices[:, 2].max())  # invented, smooth
    meshio.Mesh(vertices, [("triangle", triangles)], point_data={"Cp": cp}).write(path, binary=True,
                                                                                compression="zlib")
    return len(triangles)


def main(sizes: list[int]) -> None:
    print(f"{'faces':>10} {'read s':>8} {'integrate s':>12} {'ratio':>6} {'peak MB':>8} {'us/face':>8}")
    with tempfile.TemporaryDirectory() as tmp:
        for size in sizes:
            path = Path(tmp) / f"field-{size}.vtu"
            faces = make(path, size)
            done = subprocess.run([sys.executable, "-c", CHILD, str(path)], capture_output=True, text=True, check=True)
            figures = json.loads(done.stdout)
            print(f"{faces:>10} {figures['read_s']:>8.2f} {figures['integrate_s']:>12.2f} "
                  f"{figures['integrate_s'] / figures['read_s']:>6.1f} {figures['peak_MB']:>8.0f} "
                  f"{figures['integrate_s'] / faces * 1e6:>8.2f}")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [20_000, 200_000, 2_000_000])
