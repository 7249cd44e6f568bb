"""Plane sections of a triangulated surface, and their outlines.

:func:`slice_mesh` cuts every triangle that straddles a plane and returns the cut as line
segments; :func:`outline` turns the segments (or any 2-D points) into an upper and a lower
envelope, sampled along the first coordinate: what a side or plan view of the section
shows. Envelopes tolerate open, non-manifold and duplicated geometry, which real CAD
exports have.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


def slice_mesh(vertices: np.ndarray, faces: np.ndarray, axis: int, value: float) -> np.ndarray:
    """Segments (n, 2, 3) where the plane ``coordinate[axis] = value`` cuts the faces.

    Example: a unit cube cut at y = 0.5 gives a square of perimeter 4.

    >>> import numpy as np
    >>> v = np.array([[x, y, z] for x in (0, 1) for y in (0, 1) for z in (0, 1)], float)
    >>> f = np.array([[0, 1, 3], [0, 3, 2], [4, 7, 5], [4, 6, 7], [0, 4, 5], [0, 5, 1],
    ...               [2, 3, 7], [2, 7, 6], [0, 2, 6], [0, 6, 4], [1, 5, 7], [1, 7, 3]])
    >>> segments = slice_mesh(v, f, 1, 0.5)
    >>> round(float(np.linalg.norm(segments[:, 1] - segments[:, 0], axis=1).sum()), 6)
    4.0
    """
    return slice_levels(vertices, faces, axis, [value])[0]


def slice_levels(vertices: np.ndarray, faces: np.ndarray, axis: int, values) -> list[np.ndarray]:
    """:func:`slice_mesh` at each of ``values``: the faces' range along ``axis`` is found once,
    and each plane gathers only the faces that straddle it (below or on it, and above)."""
    vertices = np.asarray(vertices, float)
    faces = np.asarray(faces)
    along = np.ascontiguousarray(vertices[:, axis])
    corners = [along[faces[:, corner]] for corner in range(3)]
    low = np.minimum(np.minimum(corners[0], corners[1]), corners[2])
    high = np.maximum(np.maximum(corners[0], corners[1]), corners[2])
    return [_cut(vertices[faces[(low <= value) & (high > value)]], axis, value) for value in values]


def _cut(tri: np.ndarray, axis: int, value: float) -> np.ndarray:
    """The segment across each triangle (m, 3, 3) that straddles the plane."""
    side = tri[:, :, axis] - value
    above = side > 0
    ends = []
    for a, b in ((0, 1), (1, 2), (2, 0)):
        crosses = above[:, a] != above[:, b]
        with np.errstate(divide="ignore", invalid="ignore"):
            t = side[:, a] / (side[:, a] - side[:, b])
            point = tri[:, a] + t[:, None] * (tri[:, b] - tri[:, a])
        ends.append((crosses, point))
    # Each straddling triangle has exactly two crossing edges: take the first two found.
    mask = np.stack([c for c, _ in ends], axis=1)
    points = np.stack([p for _, p in ends], axis=1)
    order = np.argsort(~mask, axis=1, kind="stable")[:, :2]
    return np.take_along_axis(points, order[:, :, None], axis=1)


def densify(segments: np.ndarray, spacing: float) -> np.ndarray:
    """Points along 2-D segments (n, 2, 2), at most ``spacing`` apart, endpoints included."""
    if len(segments) == 0:
        return np.empty((0, 2))
    length = np.linalg.norm(segments[:, 1] - segments[:, 0], axis=1)
    pieces = np.maximum(1, np.ceil(length / spacing).astype(int))
    owner = np.repeat(np.arange(len(segments)), pieces + 1)
    within = np.arange(owner.size) - np.repeat(np.cumsum(pieces + 1) - (pieces + 1), pieces + 1)
    t = within / np.repeat(pieces, pieces + 1)
    start, end = segments[owner, 0], segments[owner, 1]
    return start + t[:, None] * (end - start)


@dataclass(frozen=True)
class Outline:
    """Upper and lower envelopes of a section: points (x, y) ordered by x, one per bin."""

    upper: np.ndarray  # (m, 2)
    lower: np.ndarray  # (m, 2)

    @property
    def x_min(self) -> float:
        return float(self.upper[0, 0])

    @property
    def x_max(self) -> float:
        return float(self.upper[-1, 0])


def outline(points: np.ndarray, bins: int = 1000) -> Outline:
    """Upper and lower envelope of 2-D points: in each of ``bins`` slices along the first
    coordinate, the point with the largest and with the smallest second coordinate (the
    actual points, not bin centres, so that fits see true surface points)."""
    points = np.asarray(points, float)
    if len(points) < 3:
        raise ValueError("too few points for an outline")
    x = points[:, 0]
    edges = np.linspace(x.min(), x.max(), bins + 1)
    index = np.clip(np.searchsorted(edges, x, side="right") - 1, 0, bins - 1)
    order_up = np.lexsort((-points[:, 1], index))
    order_down = np.lexsort((points[:, 1], index))
    first = np.concatenate(([True], index[order_up][1:] != index[order_up][:-1]))
    upper = points[order_up][first]
    first = np.concatenate(([True], index[order_down][1:] != index[order_down][:-1]))
    lower = points[order_down][first]
    return Outline(upper[np.argsort(upper[:, 0], kind="stable")], lower[np.argsort(lower[:, 0], kind="stable")])
