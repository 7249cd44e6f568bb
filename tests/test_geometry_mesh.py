"""Mesh clean-up and slicing (aeroreview.calc.geometry.mesh, .sections, .projection) against
trimesh, the reference library: its vertex merge, watertight and winding checks, face areas
and plane sections."""

from __future__ import annotations

import numpy as np
import pytest
import trimesh

from aeroreview.calc.geometry.mesh import edge_check, face_areas, merge_vertices
from aeroreview.calc.geometry.projection import projected_area
from aeroreview.calc.geometry.sections import slice_levels, slice_mesh


def soup(mesh: trimesh.Trimesh) -> tuple[np.ndarray, np.ndarray]:
    """The mesh as STL stores it: three vertices of its own for every face."""
    return mesh.vertices[mesh.faces].reshape(-1, 3), np.arange(3 * len(mesh.faces)).reshape(-1, 3)


def test_merge_joins_what_trimesh_joins_and_keeps_every_face():
    sphere = trimesh.creation.icosphere(subdivisions=3)
    vertices, faces = soup(sphere)
    merged, renumbered = merge_vertices(vertices, faces)
    reference = trimesh.Trimesh(vertices, faces, process=False)
    reference.merge_vertices()
    assert len(merged) == len(reference.vertices) == len(sphere.vertices)
    assert np.array_equal(merged[renumbered], vertices[faces])  # every face keeps its exact corners


def test_merge_drops_unreferenced_vertices_and_joins_signed_zeros():
    vertices = np.array([[0.0, 0, 0], [1, 0, 0], [0, 1, 0], [-0.0, 0, 0], [5, 5, 5]])
    merged, faces = merge_vertices(vertices, [[0, 1, 2], [3, 2, 1]])
    assert len(merged) == 3 and faces.tolist() == [[0, 1, 2], [0, 2, 1]]


def test_merge_of_double_precision_coordinates_is_exact():
    """Coordinates that are not single-precision numbers are compared on all their bits."""
    vertices = np.array([[0.1, 0, 0], [0.1 + 1e-16, 0, 0], [0.1, 0, 0], [0, 1, 0]])
    merged, faces = merge_vertices(vertices, [[0, 1, 3], [2, 1, 3]])
    assert len(merged) == 3 and faces[0, 0] == faces[1, 0]


def closed_box() -> trimesh.Trimesh:
    return trimesh.creation.box((4.5, 1.85, 1.45))


@pytest.mark.parametrize("case", ["closed", "open", "flipped", "fin", "sphere"])
def test_edge_check_agrees_with_trimesh(case):
    box = closed_box()
    faces = {"closed": box.faces, "open": box.faces[:-1], "sphere": trimesh.creation.icosphere(2).faces,
             "flipped": np.vstack([box.faces[:1, ::-1], box.faces[1:]]),
             "fin": np.vstack([box.faces, box.faces[:1]])}[case]  # fin: three faces on an edge
    vertices = trimesh.creation.icosphere(2).vertices if case == "sphere" else box.vertices
    reference = trimesh.Trimesh(vertices, faces, process=False)
    assert edge_check(faces) == (reference.is_watertight, reference.is_watertight and reference.is_winding_consistent)


def test_face_areas_match_trimesh():
    sphere = trimesh.creation.icosphere(subdivisions=3, radius=0.9)
    assert face_areas(sphere.vertices, sphere.faces) == pytest.approx(sphere.area_faces, rel=1e-12)


def test_slices_match_one_plane_at_a_time_and_trimesh_section_length():
    sphere = trimesh.creation.icosphere(subdivisions=4, radius=0.9)
    levels = [-0.5, 0.0, 0.3, 0.85]
    for level, cut in zip(levels, slice_levels(sphere.vertices, sphere.faces, 2, levels)):
        assert np.array_equal(cut, slice_mesh(sphere.vertices, sphere.faces, 2, level))
        reference = trimesh.intersections.mesh_plane(sphere, [0, 0, 1], [0, 0, level])
        length = np.linalg.norm(cut[:, 1] - cut[:, 0], axis=1).sum()
        assert length == pytest.approx(np.linalg.norm(reference[:, 1] - reference[:, 0], axis=1).sum(), rel=1e-9)


@pytest.mark.parametrize("axis", [0, 1, 2])
def test_one_sided_projection_equals_two_sided_on_a_closed_box(axis):
    """Width x height along x, length x height along y, length x width along z."""
    box = closed_box()
    expected = np.prod(np.delete([4.5, 1.85, 1.45], axis))
    both = projected_area(box.vertices, box.faces, axis=axis)
    one = projected_area(box.vertices, box.faces, axis=axis, one_sided=True)
    assert one == pytest.approx(both) == pytest.approx(expected, rel=1e-3)


@pytest.mark.parametrize("axis", [0, 1, 2])
def test_one_sided_projection_keeps_faces_whose_normal_points_along_the_axis(axis):
    """The normal's sign is numpy's cross product of the first two edges."""
    rng = np.random.default_rng(3)
    for _ in range(20):
        triangle = rng.uniform(-1, 1, (3, 3))
        normal = np.cross(triangle[1] - triangle[0], triangle[2] - triangle[0])[axis]
        area = projected_area(triangle, [[0, 1, 2]], axis=axis, rows=4000)
        assert projected_area(triangle, [[0, 1, 2]], axis=axis, rows=4000, one_sided=True) == (area if normal > 0 else 0)
