"""Make the Tessel's demo CFD output: a force history and a surface pressure field per revision.

INVENTED DEMO DATA: the Tessel is a made-up vehicle and these are not solver results. The
pressure field is an invented distribution on the demo surfaces (../surface/): a
stagnation-like pressure (0.5 n_x^2) on forward-facing faces, a mild suction on the flanks,
and three free amplitudes (the base suction, and the suction over the upper body towards the
front and towards the rear) solved so that the field integrates, with `aeroreview results
surface`'s own integration, to the revision's CFD result below (Cd and the lift on each
axle). The history is a start-up transient that decays onto the same coefficients, with
seeded AR(1) noise.

Run: python vehicles/tessel/cfd/make_results.py
"""

from __future__ import annotations

from pathlib import Path

import meshio
import numpy as np
import trimesh

from aeroreview.results import surface

HERE = Path(__file__).parent
FRONT_AXLE, WHEELBASE = 0.95, 2.95  # m, as the sheets' dimensions.front_overhang and dimensions.wheelbase
# The CFD result each revision's field and history reproduce (invented; r2's is its sheet's result).
TARGETS = {
    "r1": {"cd": 0.301, "cl_front": 0.10, "cl_rear": 0.16, "area": 2.31, "seed": 1},
    "r2": {"cd": 0.232, "cl_front": 0.02, "cl_rear": 0.04, "area": 2.24, "seed": 2},
}
ITERATIONS = 6000


def basis(points: np.ndarray, normals: np.ndarray, rng) -> tuple[np.ndarray, list[np.ndarray]]:
    """The fixed part of the invented Cp and the three shapes whose amplitudes are solved for."""
    xi = (points[:, 0] - points[:, 0].min()) / np.ptp(points[:, 0])
    nx, nz = normals[:, 0], normals[:, 2]
    fixed = 0.5 * np.clip(-nx, 0, None) ** 2 - 0.15 * (1 - np.abs(nx)) + 0.01 * rng.standard_normal(len(points))
    base = -np.clip(nx, 0, None) * (xi > 0.75)
    top_front = -np.clip(nz, 0, None) * (1 - xi)
    top_rear = -np.clip(nz, 0, None) * xi
    return fixed, [base, top_front, top_rear]


def coefficients(points, faces, cp, area) -> np.ndarray:
    field = surface.Field("demo", points, [faces], cp[faces].mean(axis=1), "Cp", None, None, {})
    forces = surface.integrate(field, surface.Freestream(), area, FRONT_AXLE, WHEELBASE)
    return np.array([forces.cd, forces.cl_front, forces.cl_rear])


def surface_field(revision: str, target: dict) -> Path:
    mesh = trimesh.load(HERE.parent / "surface" / f"tessel-{revision}.ply", process=False)
    points, faces = np.asarray(mesh.vertices, dtype=float), np.asarray(mesh.faces)
    points = points - [points[:, 0].min(), 0, points[:, 2].min()]  # the tool's frame: nose at x = 0, ground z = 0
    fixed, shapes = basis(points, np.asarray(mesh.vertex_normals), np.random.default_rng(target["seed"]))
    start = coefficients(points, faces, fixed, target["area"])
    matrix = np.column_stack([coefficients(points, faces, s, target["area"]) for s in shapes])
    wanted = np.array([target["cd"], target["cl_front"], target["cl_rear"]])
    amplitudes = np.linalg.solve(matrix, wanted - start)
    cp = fixed + sum(a * s for a, s in zip(amplitudes, shapes))
    path = HERE / f"tessel-{revision}-surface.vtu"
    meshio.Mesh(points, [("triangle", faces)], point_data={"Cp": cp}).write(path, binary=True, compression="zlib")
    print(f"wrote {path} (amplitudes {np.round(amplitudes, 3).tolist()})")
    return path


def history(revision: str, target: dict) -> Path:
    rng = np.random.default_rng(100 + target["seed"])
    steps = np.arange(1, ITERATIONS + 1)
    transient = np.exp(-steps / 250.0) * np.cos(steps / 90.0)

    def series(mean, amplitude, sigma):
        noise = np.zeros(ITERATIONS)
        kicks = rng.normal(0, sigma, ITERATIONS)
        for i in range(1, ITERATIONS):
            noise[i] = 0.9 * noise[i - 1] + kicks[i]
        return mean + amplitude * transient + noise

    cl_front = series(target["cl_front"], 0.08, 0.0004)
    cl_rear = series(target["cl_rear"], -0.06, 0.0004)
    columns = {"Cd": series(target["cd"], 0.12, 0.0005), "Cl": cl_front + cl_rear, "Cl_front": cl_front,
               "Cl_rear": cl_rear, "Cs": series(0.0, 0.01, 0.0003)}
    path = HERE / f"tessel-{revision}-forces.dat"
    with open(path, "w") as out:
        out.write(f"# Tessel {revision} force coefficients (INVENTED DEMO DATA, see make_results.py)\n")
        out.write("# reference area {:.2f} m^2, 140 km/h\n# Iter ".format(target["area"]) + " ".join(columns) + "\n")
        for i, step in enumerate(steps):
            out.write(f"{step} " + " ".join(f"{c[i]:.6f}" for c in columns.values()) + "\n")
    print(f"wrote {path}")
    return path


if __name__ == "__main__":
    for revision, target in TARGETS.items():
        surface_field(revision, target)
        history(revision, target)
