"""Projected (frontal) area of a triangulated surface: the area of the union of its faces
projected on a plane.

Method: scan the projection with ``rows`` horizontal lines. Each line crosses each
projected triangle in at most one interval; the union of a line's intervals is exact, and
the area is the sum over lines of the union length times the line spacing (midpoint rule).
It is exact across each line, handles overlapping parts (mirrors over doors, wheels behind
arches) without double counting, and is vectorised: the cost is linear in the number of
(triangle, line) crossings. With 2000 lines the error on smooth outlines is far below 0.1 %.
"""

from __future__ import annotations

import numpy as np

CHUNK = 200_000  # triangles per batch: bounds the memory of the crossing arrays


def projected_area(vertices: np.ndarray, faces: np.ndarray, axis: int = 0, rows: int = 2000,
                   one_sided: bool = False) -> float:
    """Area [m^2] of the union of the faces projected along ``axis`` (0 = x: the frontal area).

    ``one_sided``: the surface is closed and consistently wound, so the faces turned one way
    along ``axis`` already cover the whole silhouette (every line that meets the body enters
    it through one of them); only those are scanned, which halves the work.

    Example: a unit cube seen along x covers exactly 1 m^2.

    >>> import numpy as np
    >>> v = np.array([[x, y, z] for x in (0, 1) for y in (0, 1) for z in (0, 1)], float)
    >>> f = np.array([[0, 1, 3], [0, 3, 2], [4, 7, 5], [4, 6, 7], [0, 4, 5], [0, 5, 1],
    ...               [2, 3, 7], [2, 7, 6], [0, 2, 6], [0, 6, 4], [1, 5, 7], [1, 7, 3]])
    >>> round(projected_area(v, f), 6)
    1.0

    Reference: the scan-line fill of polygons (Foley, van Dam et al., Computer Graphics:
    Principles and Practice, 2nd ed.; section recalled from memory), applied to the union
    of triangles.
    """
    vertices = np.asarray(vertices, dtype=float)
    faces = np.asarray(faces)
    across, up = (np.ascontiguousarray(vertices[:, i]) for i in range(3) if i != axis)
    u = [across[faces[:, corner]] for corner in range(3)]  # one (n,) array per corner: u across, w up
    w = [up[faces[:, corner]] for corner in range(3)]
    if one_sided:  # the normal's component along the axis: the cross product's (u, w) determinant
        normal = (u[1] - u[0]) * (w[2] - w[0]) - (w[1] - w[0]) * (u[2] - u[0])
        if axis == 1:  # (u, w) = (x, z) is left-handed about +y
            normal = -normal
        facing = normal > 0
        u, w = [c[facing] for c in u], [c[facing] for c in w]
    if len(u[0]) == 0:
        return 0.0
    low = np.minimum(np.minimum(w[0], w[1]), w[2])
    high = np.maximum(np.maximum(w[0], w[1]), w[2])
    w_min, w_max = low.min(), high.max()
    if w_max <= w_min:
        return 0.0
    dw = (w_max - w_min) / rows
    lines = w_min + (np.arange(rows) + 0.5) * dw
    row_ids, starts, ends = [], [], []
    for begin in range(0, len(low), CHUNK):
        part = slice(begin, begin + CHUNK)
        r, s, e = _crossings([c[part] for c in u], [c[part] for c in w], low[part], high[part], w_min, dw, rows)
        row_ids.append(r)
        starts.append(s)
        ends.append(e)
    row = np.concatenate(row_ids)
    start = np.concatenate(starts)
    end = np.concatenate(ends)
    return float(_union_length(row, start, end, lines, rows) * dw)


def _crossings(u: list, w: list, low, high, w_min: float, dw: float, rows: int):
    """For each (triangle, scan line) pair: the line index and the interval [start, end] in u.

    ``u`` and ``w`` hold one array per corner; ``low`` and ``high`` each triangle's range in w."""
    first = np.ceil((low - w_min) / dw - 0.5).astype(np.int64)
    last = np.floor((high - w_min) / dw - 0.5).astype(np.int64)
    first = np.clip(first, 0, rows - 1)
    last = np.clip(last, -1, rows - 1)
    count = np.maximum(last - first + 1, 0)
    owner = np.repeat(np.arange(len(low)), count)
    offset = np.arange(count.sum()) - np.repeat(np.cumsum(count) - count, count)
    row = first[owner] + offset
    level = w_min + (row + 0.5) * dw
    u, w = [c[owner] for c in u], [c[owner] for c in w]
    lo = np.full(len(row), np.inf)
    hi = np.full(len(row), -np.inf)
    for a, b in ((0, 1), (1, 2), (2, 0)):
        wa, wb, ua, ub = w[a], w[b], u[a], u[b]
        crosses = (np.minimum(wa, wb) <= level) & (level <= np.maximum(wa, wb)) & (wa != wb)
        with np.errstate(divide="ignore", invalid="ignore"):
            cut = ua + (level - wa) * (ub - ua) / (wb - wa)
        lo = np.where(crosses, np.minimum(lo, cut), lo)
        hi = np.where(crosses, np.maximum(hi, cut), hi)
    valid = hi >= lo
    return row[valid], lo[valid], hi[valid]


def _union_length(row, start, end, lines, rows) -> float:
    """Total length of the union of intervals, line by line (sort, then sweep with a running max)."""
    if len(row) == 0:
        return 0.0
    # Sort by (line, start) with one float key: every line offset far from the others.
    span = float(max(np.abs(start).max(), np.abs(end).max())) * 4 + 1.0
    order = np.argsort(start + row * span, kind="stable")
    row, start, end = row[order], start[order], end[order]
    shifted = end + row * span
    running = np.maximum.accumulate(shifted) - row * span
    previous = np.concatenate(([-np.inf], running[:-1]))
    new_line = np.concatenate(([True], row[1:] != row[:-1]))
    opens = new_line | (start > previous)
    # Each merged block runs from the start that opened it to the running max just before the next opening.
    block_start = start[opens]
    block_end = np.maximum.reduceat(running, np.flatnonzero(opens))
    return float((block_end - block_start).sum())
