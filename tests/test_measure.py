"""Measuring from surfaces, against shapes whose numbers are known by construction and
against the published Ahmed body (Ahmed, Ramm and Faltin 1984, SAE 840300), with the
frontal area cross-checked by shapely's polygon union and trimesh's own projection."""

from __future__ import annotations

import json
import math
import sys

import numpy as np
import pytest
import shapely
import shapely.geometry as sg
import trimesh

from aeroreview.calc.geometry.construct import filleted_polyline
from aeroreview.calc.geometry.projection import projected_area
from aeroreview.measure import load_surface, measure
from conftest import MINIMAL, VEHICLES

sys.path.insert(0, str(VEHICLES / "tessel" / "surface"))
import make_surface  # noqa: E402  the demo's invented design, used as a known shape


def extruded_side_profile(polygon: sg.Polygon, width: float) -> trimesh.Trimesh:
    """A body whose side view (x, z) is ``polygon``, extruded across y."""
    mesh = trimesh.creation.extrude_polygon(polygon, width)
    x, y, z = mesh.vertices.T
    mesh.vertices = np.column_stack([x, width / 2 - z, y])  # a rotation about x (a mirror would turn it inside out)
    return mesh


def measured(mesh: trimesh.Trimesh, tmp_path, name="shape.stl", ground=0.0, **options):
    path = tmp_path / name
    mesh.export(str(path))
    result = measure(load_surface(path, ground=ground, **options))
    return result, {m.key: m for m in result.measurements}


def test_sphere_projected_area_is_pi_r_squared(tmp_path):
    """A sphere of radius 0.9 m (icosphere, 20 480 faces): pi r^2 = 2.5447 m^2, within 0.5 %."""
    sphere = trimesh.creation.icosphere(subdivisions=5, radius=0.9)
    result, _ = measured(sphere, tmp_path, ground=None)
    assert result.frontal_area == pytest.approx(math.pi * 0.9**2, rel=0.005)


def test_box_projected_area_is_width_times_height(tmp_path):
    box = trimesh.creation.box((4.5, 1.85, 1.45))
    result, found = measured(box, tmp_path, ground=None)
    assert result.frontal_area == pytest.approx(1.85 * 1.45, rel=0.005)
    assert (result.length, result.width, result.height) == pytest.approx((4.5, 1.85, 1.45))


@pytest.mark.parametrize("radius", [0.05, 0.15, 0.30])
def test_rounded_box_edge_radius_within_2_percent(tmp_path, radius):
    shape = sg.box(0, 0.15, 4.2, 1.55).buffer(-radius).buffer(radius, quad_segs=32)
    _, found = measured(extruded_side_profile(shape, 1.8), tmp_path)
    assert found["front.upper_edge_radius"].value == pytest.approx(radius, rel=0.02)
    assert "circle fit" in found["front.upper_edge_radius"].method


@pytest.mark.parametrize("slant", [12.0, 25.0, 35.0])
def test_prism_slant_angle_within_half_a_degree(tmp_path, slant):
    """A prism: flat roof 1.5 m high, then a rear slant of known angle falling 0.5 m."""
    run = 0.5 / math.tan(math.radians(slant))
    shape = sg.Polygon([(0, 0.2), (0, 1.5), (3.0, 1.5), (3.0 + run, 1.0), (3.0 + run + 0.6, 1.0), (3.0 + run + 0.6, 0.2)])
    _, found = measured(extruded_side_profile(shape, 1.8), tmp_path)
    assert math.degrees(found["rear.backlight_angle"].value) == pytest.approx(slant, abs=0.5)
    assert math.degrees(found["rear.decklid_angle"].value) == pytest.approx(0.0, abs=0.5)
    assert found["rear.roof_backlight_radius"].value is None  # a sharp edge: reported, not guessed


def ahmed_body(slant: float = 25.0) -> trimesh.Trimesh:
    """The Ahmed body from its published dimensions (Ahmed, Ramm and Faltin 1984): 1044 mm long,
    389 mm wide, 288 mm high, front edges rounded with R = 100 mm, a rear slant of 222 mm length,
    50 mm above the ground; without its four support stilts. Built as the intersection of the
    side view extruded across y and the plan view extruded along z (manifold3d booleans)."""
    length, width, height, radius, clearance, slant_length = 1.044, 0.389, 0.288, 0.100, 0.050, 0.222
    drop = slant_length * math.sin(math.radians(slant))
    run = slant_length * math.cos(math.radians(slant))
    top, bottom = clearance + height, clearance
    side = _front_rounded([(length - run, top), (length, top - drop), (length, bottom)], bottom, top, radius)
    plan = _front_rounded([(length, width / 2), (length, -width / 2)], -width / 2, width / 2, radius)
    body_side = extruded_side_profile(side, width + 0.1)
    body_plan = trimesh.creation.extrude_polygon(plan, 1.0)
    body_plan.vertices[:, 2] -= 0.3
    return trimesh.boolean.intersection([body_side, body_plan], engine="manifold")


def _front_rounded(rear, low: float, high: float, radius: float) -> sg.Polygon:
    """A polygon from the middle of its front face (x = 0) over the top, through the ``rear``
    points, back under the bottom; the two front corners rounded with ``radius``."""
    middle = (0.0, 0.5 * (low + high))
    corners = [middle, (0.0, high), *rear[:-1], rear[-1], (0.0, low), middle]
    radii = [radius] + [0.0] * (len(rear)) + [radius]
    return sg.Polygon(filleted_polyline(corners, radii, arc_points=48)[:-1])


@pytest.fixture(scope="module")
def ahmed(tmp_path_factory):
    folder = tmp_path_factory.mktemp("ahmed")
    result, found = measured(ahmed_body(), folder, "ahmed.stl")
    return result, found


def test_ahmed_dimensions_and_frontal_area(ahmed):
    result, found = ahmed
    assert result.length == pytest.approx(1.044, abs=1e-4)
    assert result.width == pytest.approx(0.389, abs=1e-4)
    assert result.height - found["dimensions.ground_clearance"].value == pytest.approx(0.288, abs=1e-4)
    assert found["dimensions.ground_clearance"].value == pytest.approx(0.050, abs=1e-4)
    assert result.frontal_area == pytest.approx(0.112, rel=0.005)  # published A = 0.112 m^2


def test_ahmed_slant_and_front_radius(ahmed):
    _, found = ahmed
    assert math.degrees(found["rear.backlight_angle"].value) == pytest.approx(25.0, abs=0.5)
    assert found["front.upper_edge_radius"].value == pytest.approx(0.100, rel=0.02)


def test_frontal_area_against_shapely_union():
    """The demo body, coarse: our scan-line union against shapely's exact polygon union of the
    same projected faces."""
    vertices, faces = make_surface.build(make_surface.DESIGNS["r2"], stations=30, ring=24)
    ours = projected_area(vertices, faces, axis=0)
    triangles = [sg.Polygon(t) for t in vertices[faces][:, :, 1:]]
    union = shapely.union_all([t for t in triangles if t.area > 0])
    assert ours == pytest.approx(union.area, rel=0.002)


def test_frontal_area_against_trimesh_projection():
    """The mesh library's own silhouette (trimesh.path.polygons.projected) of a sphere.

    (On the lofted demo body trimesh's projection comes out 7 % smaller than both our union and
    shapely's; we did not find why, so the cross-check with trimesh uses the sphere.)"""
    sphere = trimesh.creation.icosphere(subdivisions=5, radius=0.9)
    ours = projected_area(sphere.vertices, sphere.faces, axis=0)
    assert ours == pytest.approx(trimesh.path.polygons.projected(sphere, normal=[1, 0, 0]).area, rel=0.005)


@pytest.mark.parametrize("revision", ["r1", "r2"])
def test_demo_surface_gives_back_its_design(tmp_path, revision):
    design = make_surface.DESIGNS[revision]
    result = measure(load_surface(VEHICLES / "tessel" / "surface" / f"tessel-{revision}.ply", ground=0.0))
    found = result.measured()
    for key, expected in (("windshield.angle", design["windshield"]), ("rear.backlight_angle", design["backlight"]),
                          ("rear.decklid_angle", design["decklid"]), ("underbody.diffuser_angle", design["diffuser"]),
                          ("rear.side_taper_angle", design["taper"])):
        assert math.degrees(found[key].value) == pytest.approx(expected, abs=0.5), key
    assert found["rear.roof_backlight_radius"].value == pytest.approx(design["roof_radius"], rel=0.05)
    assert found["front.upper_edge_radius"].value == pytest.approx(design["front_radius"], rel=0.05)
    assert math.degrees(found["underbody.nose_rake"].value) == pytest.approx(design["nose_rake"], abs=0.5)
    assert found["dimensions.ground_clearance"].value == pytest.approx(design["ground_clearance"], abs=0.002)


def test_units_are_inferred_and_said(tmp_path, cli):
    box = trimesh.creation.box((4500, 1850, 1450))
    path = tmp_path / "mm.stl"
    box.export(str(path))
    run = cli("measure", path, "--json")
    data = json.loads(run.out)
    assert data["length_m"] == pytest.approx(4.5) and data["frontal_area_m2"] == pytest.approx(1.85 * 1.45, rel=0.005)
    assert any("inferred as mm" in note for note in data["notes"])


@pytest.mark.parametrize("content, message", [
    (b"", "the file is empty"),
    (b"solid nothing\nendsolid nothing\n", "holds no triangles"),
    (b"\x00\x01\x02 not a mesh at all" * 10, "not what it claims"),  # a binary STL header claiming 9e10 bytes
    (b"solid x\n facet normal 0 0 1\n  outer loop\n   vertex 0 0 nan\n", ""),
])
def test_bad_surfaces_are_refused(tmp_path, cli, content, message):
    path = tmp_path / "bad.stl"
    path.write_bytes(content)
    run = cli("measure", path)
    assert run.code == 2 and message in run.err and "Traceback" not in run.err


def test_absurd_size_is_refused(tmp_path, cli):
    path = tmp_path / "tiny.stl"
    trimesh.creation.box((0.01, 0.01, 0.01)).export(str(path))
    run = cli("measure", path, "--units", "m")
    assert run.code == 2 and "makes no sense for a road vehicle" in run.err


def test_open_mesh_measures_with_a_warning(tmp_path, cli):
    box = trimesh.creation.box((4.5, 1.85, 1.45))
    box.update_faces(np.arange(len(box.faces)) != 0)
    path = tmp_path / "open.ply"
    box.export(str(path))
    run = cli("measure", path)
    assert run.code == 0 and "not watertight" in run.err


def test_csv_centreline_profile(tmp_path, cli):
    shape = sg.Polygon([(0, 0.2), (0, 1.5), (3.0, 1.5), (3.0 + 0.5 / math.tan(math.radians(28)), 1.0), (4.6, 1.0),
                        (4.6, 0.2)])
    rows = "x,z\n" + "".join(f"{x * 1000:.3f},{z * 1000:.3f}\n" for x, z in shape.exterior.coords[:-1])
    path = tmp_path / "profile.csv"
    path.write_text(rows, encoding="utf-8")
    # A blunt box with a rear slant is no road car: its tall front defeats the nose inference, so say it.
    data = json.loads(cli("measure", path, "--json", "--nose", "-x").out)
    assert data["features"]["rear.backlight_angle"]["value"] == pytest.approx(28, abs=0.5)
    bad = tmp_path / "bad.csv"
    bad.write_text("a,b\n1,2\n", encoding="utf-8")
    run = cli("measure", bad)
    assert run.code == 2 and "header must be 'x,z'" in run.err


def test_figures_are_written(tmp_path, cli):
    run = cli("measure", VEHICLES / "tessel" / "surface" / "tessel-r2.ply", "--ground", "0", "--figures", tmp_path)
    assert run.code == 0
    for name in ("centreline.svg", "sections.svg"):
        text = (tmp_path / name).read_text(encoding="utf-8")
        assert "<svg" in text and "x from the nose [m]" in text
    assert "backlight 22 deg" in (tmp_path / "centreline.svg").read_text(encoding="utf-8")


SHEET = MINIMAL.replace("features:\n", "# Reviewer's header comment, must survive.\nfeatures:\n") + \
    "  rear.backlight_angle: 24 deg   # typed by the reviewer\nnotes: keep me\n"


def test_merge_keeps_comments_and_user_values(tmp_path, cli, write_sheet):
    sheet = write_sheet(SHEET)
    before = sheet.read_text(encoding="utf-8")
    run = cli("measure", VEHICLES / "tessel" / "surface" / "tessel-r2.ply", "--ground", "0", "--sheet", sheet)
    assert run.code == 0, run.err
    after = sheet.read_text(encoding="utf-8")
    for line in before.splitlines():
        assert line in after, line  # every line the user wrote is still there, unchanged
    assert "windshield.angle: {value: 27 deg, source: measured from tessel-r2.ply" in after
    assert "kept 4 of your values (dimensions.length, dimensions.width, dimensions.height, rear.backlight_angle" in run.err
    assert cli("check", sheet).code in (0, 1)  # still a valid sheet
    assert not list(tmp_path.glob("*.bak*"))


def test_overwrite_replaces_and_keeps_a_backup(tmp_path, cli, write_sheet):
    sheet = write_sheet(SHEET)
    before = sheet.read_text(encoding="utf-8")
    run = cli("measure", VEHICLES / "tessel" / "surface" / "tessel-r2.ply", "--ground", "0", "--sheet", sheet,
              "--overwrite")
    assert run.code == 0, run.err
    assert "rear.backlight_angle: {value: 22 deg" in sheet.read_text(encoding="utf-8")
    backup = tmp_path / "sheet.yaml.bak"
    assert backup.read_text(encoding="utf-8") == before
    assert "# Reviewer's header comment, must survive." in sheet.read_text(encoding="utf-8")


def test_merge_that_would_break_the_sheet_writes_nothing(tmp_path, cli, write_sheet):
    """The surface is 4.87 m long; a sheet claiming a 5.2 m wheelbase... the merged length
    would make it impossible, so nothing is written."""
    sheet = write_sheet(SHEET.replace("  dimensions.length: 4.8 m\n", "").replace(
        "  mass.curb", "  dimensions.wheelbase: 4.9 m\n  mass.curb"))
    before = sheet.read_text(encoding="utf-8")
    run = cli("measure", VEHICLES / "tessel" / "surface" / "tessel-r2.ply", "--ground", "0", "--sheet", sheet)
    assert run.code == 2 and "wheelbase" in run.err
    assert sheet.read_text(encoding="utf-8") == before
