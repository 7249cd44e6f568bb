"""Make the Tessel demo surfaces (revisions r1 and r2) from their (invented) design intent.

INVENTED DEMO DATA: the Tessel is a made-up vehicle. Each revision's side view is a
filleted polyline built from the design angles and radii of its sheet, the plan view a
filleted outline with the design's rear taper, and the body a loft of rounded rectangles
between them. `aeroreview measure` gives the design numbers back, which the tests check.

Run: python vehicles/tessel/surface/make_surface.py
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np

from aeroreview.calc.geometry.construct import filleted_polyline, loft, profile_function

LENGTH, WIDTH = 4.87, 1.92
# Design intent per revision (the same numbers as the sheets): angles in deg, lengths and radii in m.
# "section_radius" is the corner radius of the cabin's cross-sections (a tumblehome and rounded
# sills), chosen so that the projected area comes out at the sheet's frontal area (mirrors and
# camera pods are not modelled); nose and tail keep EDGE_RADIUS, so the belt line stays straight.
DESIGNS = {
    "r1": {"windshield": 27, "backlight": 29, "decklid": 4, "roof_radius": 0.04, "front_radius": 0.035,
           "diffuser": 15, "diffuser_length": 0.62, "taper": 2, "nose_rake": 2, "ground_clearance": 0.135,
           "section_radius": 0.56},
    "r2": {"windshield": 27, "backlight": 22, "decklid": 2, "roof_radius": 0.38, "front_radius": 0.085,
           "diffuser": 8, "diffuser_length": 0.70, "taper": 9, "nose_rake": 4, "ground_clearance": 0.13,
           "section_radius": 0.65},
}
NOSE_RAKE_RUN = 0.7  # m: the front underbody rises from here to the nose
EDGE_RADIUS = 0.12  # m: corner radius of the cross-sections at the nose and the tail
CABIN = (1.5, 3.6)  # m: x range of the full section radius, blended to EDGE_RADIUS by 0.2 m ahead and 0.6 m behind


def side_view(d: dict):
    """Upper and lower lines (x, z) [m] of the centreline, from the design angles."""
    t, r = math.tan, math.radians
    hood_end = 1.55
    screen_end = hood_end + (1.40 - 0.95) / t(r(d["windshield"]))  # the windshield rises 0.45 m
    roof_end = 3.15
    deck_start = roof_end + (1.40 - 1.02) / t(r(d["backlight"]))  # the backlight falls 0.38 m
    deck_end_z = 1.05 - (LENGTH - deck_start) * t(r(d["decklid"]))
    upper = filleted_polyline(
        [(0.0, 0.42), (0.0, 0.72), (0.5, 0.72 + 0.5 * t(r(10))), (hood_end, 0.95), (screen_end, 1.40),
         (roof_end, 1.43), (deck_start, 1.05), (LENGTH, deck_end_z), (LENGTH, 0.45)],
        [d["front_radius"], 0.6, 0.3, 0.12, d["roof_radius"], 0.2, 0.02], arc_points=32)
    rise = d["diffuser_length"] * t(r(d["diffuser"]))
    floor = d["ground_clearance"]
    nose = floor + NOSE_RAKE_RUN * t(r(d["nose_rake"]))
    lower = filleted_polyline(
        [(0.0, 0.42), (0.0, nose), (NOSE_RAKE_RUN, floor), (LENGTH - d["diffuser_length"], floor),
         (LENGTH, floor + rise), (LENGTH, 0.45)], [0.05, 0.4, 0.3, 0.02], arc_points=16)
    return upper[1:-1], lower[1:-1]


def plan_view(d: dict):
    """Half width y(x) [m] and its outline: rounded front corners, parallel sides, the rear taper."""
    half, taper = WIDTH / 2, 0.55
    line = filleted_polyline([(0.0, 0.0), (0.0, half - 0.05), (0.4, half), (LENGTH - taper, half),
                              (LENGTH, half - taper * math.tan(math.radians(d["taper"]))), (LENGTH, 0.0)],
                             [0.19, 1.0, 0.8, 0.03], arc_points=24)
    return profile_function(line[1:-1]), line[1:-1]


def build(d: dict, stations: int = 60, ring: int = 36):
    """Vertices and faces of the body of design ``d``."""
    upper, lower = side_view(d)
    (width, plan), top, bottom = plan_view(d), profile_function(upper), profile_function(lower)
    # Stations: evenly spaced, plus every point of the design lines, so arcs keep their shape.
    candidates = np.unique(np.concatenate([np.linspace(0, LENGTH, stations), upper[:, 0], lower[:, 0], plan[:, 0]]))
    x = [candidates[0]]
    for value in candidates[1:]:
        if value - x[-1] > 2e-3 or value == candidates[-1]:
            x.append(value)
    x = np.clip(np.array(x), 1e-4, LENGTH - 1e-4)
    return loft(x, bottom(x), top(x), np.maximum(width(x), 0.05), corner_radius=section_radii(d, x), ring=ring)


def section_radii(d: dict, x: np.ndarray) -> np.ndarray:
    """Corner radius [m] of the cross-section at each station: the cabin's, blended to the edges'."""
    (start, end), full = CABIN, d["section_radius"]
    return np.interp(x, [0.0, start - 0.2, start, end, end + 0.6, LENGTH],
                     [EDGE_RADIUS, EDGE_RADIUS, full, full, EDGE_RADIUS, EDGE_RADIUS])


def write_mesh(path: Path, vertices, faces) -> None:
    """Write a mesh file (format from the suffix: binary PLY is the smallest)."""
    import trimesh

    trimesh.Trimesh(vertices, faces, process=False).export(str(path))


if __name__ == "__main__":
    for revision, design in DESIGNS.items():
        target = Path(__file__).with_name(f"tessel-{revision}.ply")
        write_mesh(target, *build(design))
        print(f"wrote {target}")
