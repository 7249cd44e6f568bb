"""Building surfaces from a design intent: filleted profiles and lofted bodies.

Used to make the demo fleet's surface from an invented design, the benchmark's meshes and
the tests' analytic shapes, so that every measurement can be checked against the numbers
the shape was built from.
"""

from __future__ import annotations

import math

import numpy as np


def filleted_polyline(corners, radii, arc_points: int = 24) -> np.ndarray:
    """Points of a polyline through ``corners`` [m] whose interior corners are rounded with
    circular fillets of the given ``radii`` [m] (0 keeps a sharp corner).

    Example: a right angle with a 0.1 m fillet: every arc point is 0.1 m from the fillet centre.

    >>> pts = filleted_polyline([(0, 0), (0, 1), (1, 1)], [0.1])
    >>> import numpy as np
    >>> bool(np.allclose(np.hypot(pts[1:-1, 0] - 0.1, pts[1:-1, 1] - 0.9), 0.1))
    True

    Reference: the tangent-circle fillet construction of plane geometry (any drafting text).
    """
    corners = np.asarray(corners, float)
    out = [corners[0]]
    for i in range(1, len(corners) - 1):
        p, a, b = corners[i], corners[i - 1], corners[i + 1]
        r = radii[i - 1]
        u, v = (a - p) / np.linalg.norm(a - p), (b - p) / np.linalg.norm(b - p)
        half = math.acos(float(np.clip(u @ v, -1, 1))) / 2
        if r <= 0 or half <= 1e-9 or abs(half - math.pi / 2) < 1e-9:
            out.append(p)
            continue
        distance = r / math.tan(half)  # from the corner to each tangent point
        bisector = (u + v) / np.linalg.norm(u + v)
        centre = p + bisector * r / math.sin(half)
        start, end = p + u * distance, p + v * distance
        a0 = math.atan2(*(start - centre)[::-1])
        a1 = math.atan2(*(end - centre)[::-1])
        sweep = (a1 - a0 + math.pi) % (2 * math.pi) - math.pi
        angles = a0 + sweep * np.linspace(0, 1, arc_points)
        out.extend(centre + r * np.column_stack([np.cos(angles), np.sin(angles)]))
    out.append(corners[-1])
    return np.array(out)


def profile_function(points: np.ndarray):
    """z(x) of a polyline whose x never decreases (the upper or lower line of a side view)."""
    x, z = points[:, 0], points[:, 1]
    order = np.argsort(x, kind="stable")
    return lambda q: np.interp(q, x[order], z[order])


def loft(stations, z_bottom, z_top, half_width, corner_radius, ring: int = 64):
    """A closed body: at each x station a rounded rectangle from z_bottom to z_top and
    +-half_width, with the given corner radius (one for all stations or one per station,
    capped at half the smaller side); the two ends are closed with flat caps. Returns
    (vertices, faces).

    The tests check the loft of a box against its volume and frontal area.
    """
    stations = np.asarray(stations, float)
    n = len(stations)
    angle = np.linspace(0, 2 * np.pi, ring, endpoint=False)
    rings = []
    radii = np.broadcast_to(np.asarray(corner_radius, float), stations.shape)
    for x, zb, zt, w, corner in zip(stations, z_bottom, z_top, half_width, radii):
        h = max(zt - zb, 1e-6)
        r = min(corner, 0.5 * h, w) * 0.999
        y, z = _rounded_rectangle(np.cos(angle), np.sin(angle), w, 0.5 * h, r)
        rings.append(np.column_stack([np.full(ring, x), y, z + 0.5 * (zt + zb)]))
    vertices = np.vstack(rings + [[[stations[0], 0.0, 0.5 * (z_top[0] + z_bottom[0])]],
                                  [[stations[-1], 0.0, 0.5 * (z_top[-1] + z_bottom[-1])]]])
    faces = []
    i = np.arange(n - 1)[:, None] * ring
    j = np.arange(ring)[None, :]
    a, b = i + j, i + (j + 1) % ring
    c, d = a + ring, b + ring
    faces.append(np.stack([a, b, d], axis=-1).reshape(-1, 3))
    faces.append(np.stack([a, d, c], axis=-1).reshape(-1, 3))
    front, back = n * ring, n * ring + 1
    k = np.arange(ring)
    faces.append(np.column_stack([np.full(ring, front), (k + 1) % ring, k]))
    faces.append(np.column_stack([np.full(ring, back), (n - 1) * ring + k, (n - 1) * ring + (k + 1) % ring]))
    return vertices, np.vstack(faces)


def _rounded_rectangle(c, s, a, b, r):
    """Points of a rounded rectangle (half sides a, b, corner radius r) in directions (c, s)."""
    with np.errstate(divide="ignore"):
        t = np.minimum(np.where(np.abs(c) > 1e-12, a / np.abs(c), np.inf),
                       np.where(np.abs(s) > 1e-12, b / np.abs(s), np.inf))
    y, z = t * c, t * s
    corner = (np.abs(y) > a - r) & (np.abs(z) > b - r)
    cy, cz = np.copysign(a - r, c), np.copysign(b - r, s)
    bq = -2 * (c * cy + s * cz)
    cq = cy * cy + cz * cz - r * r
    t_corner = (-bq + np.sqrt(np.maximum(bq * bq - 4 * cq, 0))) / 2
    t = np.where(corner, t_corner, t)
    return t * c, t * s
