"""Clean-up checks of a triangulated surface, each one sort or one pass over arrays.

:func:`merge_vertices` joins vertices with exactly equal coordinates (STL repeats every
vertex for every face), :func:`edge_check` says whether the surface is closed and
consistently wound by counting its edges, and :func:`face_areas` gives the area of each
face from a cross product, so degenerate faces can be found. All are exact: no tolerance
decides what is "the same" vertex; a file whose shared vertices differ in their digits is
reported as open rather than silently welded.
"""

from __future__ import annotations

import numpy as np

CHUNK = 65_536  # faces a batch in face_areas


def merge_vertices(vertices: np.ndarray, faces: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Vertices with exactly equal coordinates joined, and the faces renumbered.

    Unreferenced vertices are dropped; the kept vertices are in the order of their first
    occurrence. Found by one lexicographic sort of the coordinates' bits (``-0.0`` equals ``0.0``).

    Example: two triangles given as six vertices share an edge, so four remain.

    >>> import numpy as np
    >>> v = np.array([[0, 0, 0], [1, 0, 0], [0, 1, 0], [1, 0, 0], [1, 1, 0], [0, 1, 0]], float)
    >>> merged, faces = merge_vertices(v, np.arange(6).reshape(2, 3))
    >>> len(merged), faces.tolist()
    (4, [[0, 1, 2], [1, 3, 2]])

    Reference: duplicate removal by sorting (Knuth, The Art of Computer Programming,
    vol. 3, s. 5; recalled from memory).
    """
    faces = np.asarray(faces)
    used = np.zeros(len(vertices), dtype=bool)
    used[faces] = True
    used = np.flatnonzero(used)
    rows = np.asarray(vertices, dtype=float)
    rows = rows if len(used) == len(rows) else rows[used]
    keys = _exact_keys(rows)
    order = np.lexsort(keys)  # stable: each run of equal rows starts with its first occurrence
    starts = np.zeros(len(rows), dtype=bool)
    starts[:1] = True
    for key in keys:
        ordered = key[order]
        starts[1:] |= ordered[1:] != ordered[:-1]
    first = order[starts]  # the first occurrence of each distinct vertex, in sorted order
    rank = np.empty(len(first), dtype=np.int64)
    rank[np.argsort(first)] = np.arange(len(first))
    group = np.cumsum(starts)
    group -= 1
    inverse = np.empty(len(rows), dtype=np.int64)
    inverse[order] = rank[group]
    renumber = np.zeros(len(vertices), dtype=np.int64)
    renumber[used] = inverse
    return rows[np.sort(first)] + 0.0, renumber[faces]  # + 0.0 turns -0.0 into 0.0


def _exact_keys(rows: np.ndarray) -> tuple[np.ndarray, ...]:
    """Integer sort keys, equal exactly where the rows are: the coordinates' bits, packed two
    to a key when they are single-precision numbers (STL and most PLY files), which halves
    the sort."""
    single = rows.astype(np.float32)
    single += 0.0  # -0.0 and 0.0 are the same coordinate: give them the same bits
    if (single == rows).all():
        return (np.ascontiguousarray(single[:, 2]).view(np.uint32),
                np.ascontiguousarray(single[:, :2]).view(np.uint64).ravel())  # x and y bits in one key
    bits = (rows + 0.0).view(np.uint64)
    return bits[:, 2], bits[:, 1], bits[:, 0]


def edge_check(faces: np.ndarray) -> tuple[bool, bool]:
    """(watertight, consistently wound): every edge shared by exactly two faces, and each
    shared edge run once in each direction (so the normals all point out, or all in).

    One sort of the edges, each coded as its sorted vertex pair and its direction.

    Example: a tetrahedron is closed; reversing one face breaks the winding; dropping one
    opens it.

    >>> import numpy as np
    >>> tetra = np.array([[0, 2, 1], [0, 1, 3], [1, 2, 3], [0, 3, 2]])
    >>> edge_check(tetra), edge_check(np.vstack([tetra[:3], tetra[3, ::-1]])), edge_check(tetra[:3])
    ((True, True), (True, False), (False, False))

    Reference: a closed 2-manifold has every edge on exactly two faces, oriented
    consistently when their shared edge runs in opposite directions (Botsch et al.,
    Polygon Mesh Processing, 2010, s. 1.3; recalled from memory).
    """
    faces = np.asarray(faces, dtype=np.int64)
    if len(faces) == 0:
        return False, False
    start = faces.ravel()
    end = faces[:, [1, 2, 0]].ravel()
    codes = np.minimum(start, end)  # in place from here: the arrays are as long as three per face
    codes *= int(faces.max()) + 1
    codes += np.maximum(start, end)
    codes *= 2
    codes += start > end  # the last bit: which way the edge runs
    codes.sort()
    if len(codes) % 2:
        return False, False
    pairs = codes.reshape(-1, 2)
    edges = pairs >> 1
    watertight = bool((edges[:, 0] == edges[:, 1]).all() and (edges[1:, 0] != edges[:-1, 1]).all())
    return watertight, watertight and bool((pairs[:, 1] - pairs[:, 0] == 1).all())


def face_areas(vertices: np.ndarray, faces: np.ndarray) -> np.ndarray:
    """Area [m^2] of each face: half the length of the cross product of two edges.

    >>> import numpy as np
    >>> face_areas(np.array([[0, 0, 0], [2, 0, 0], [0, 3, 0]], float), [[0, 1, 2]]).tolist()
    [3.0]
    """
    vertices = np.asarray(vertices, dtype=float)
    faces = np.asarray(faces)
    areas = np.empty(len(faces))
    for begin in range(0, len(faces), CHUNK):  # in chunks: small temporaries are reused, not re-allocated
        x, y, z = (vertices[:, axis][faces[begin:begin + CHUNK]] for axis in range(3))
        ax, ay, az = x[:, 1] - x[:, 0], y[:, 1] - y[:, 0], z[:, 1] - z[:, 0]
        bx, by, bz = x[:, 2] - x[:, 1], y[:, 2] - y[:, 1], z[:, 2] - z[:, 1]
        areas[begin:begin + CHUNK] = (ay * bz - az * by) ** 2 + (az * bx - ax * bz) ** 2 + (ax * by - ay * bx) ** 2
    return 0.5 * np.sqrt(areas, out=areas)
