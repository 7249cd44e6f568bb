"""Surface fields: integrated forces against closed forms, the axle transfer, bad input.

References named in each test: potential flow round a sphere (Cp = 1 - (9/4) sin^2 theta,
d'Alembert's paradox; e.g. Anderson, Fundamentals of Aerodynamics, 6th ed., s. 3.15 and
6.4), the pressure-drag balance of a box (Cd = Cp_front - Cp_base on the frontal area), the
friction drag of a plate (D = tau A), and the lever rule of statics for the axle loads
(SAE J1594's transfer of the pitching moment to the axles).
"""

from __future__ import annotations

import json

import meshio
import numpy as np
import pytest
import trimesh

from aeroreview.results import surface

SPHERE_R = 1.0


def sphere_file(tmp_path, subdivisions=5, flip=False, name="sphere.vtu"):
    """An icosphere of radius 1 m, nose at x = 0 (the flow comes from -x), Cp of potential flow at its points."""
    mesh = trimesh.creation.icosphere(subdivisions=subdivisions, radius=SPHERE_R)
    points = mesh.vertices + [SPHERE_R, 0, 0.5]
    cos_theta = (SPHERE_R - points[:, 0]) / SPHERE_R  # theta from the front stagnation point
    faces = mesh.faces[:, ::-1] if flip else mesh.faces
    path = tmp_path / name
    meshio.Mesh(points, [("triangle", faces)], point_data={"Cp": 1 - 2.25 * (1 - cos_theta**2)}).write(path)
    return path


def box_file(tmp_path, base_cp, quads=False, length=3.0, width=1.5, height=1.2, shear=None):
    """A box (nose at x = 0) with Cp = 1 on its front face, ``base_cp`` on its rear, -0.3 on the others."""
    box = trimesh.creation.box(extents=(length, width, height))
    box.apply_translation((length / 2, 0, height / 2 + 0.2))
    normals = box.face_normals
    cp = np.where(normals[:, 0] < -0.9, 1.0, np.where(normals[:, 0] > 0.9, base_cp, -0.3))
    cells = [("triangle", box.faces)]
    data = {"Cp": [cp]}
    if shear is not None:
        data["wallShearStress"] = [np.tile(shear, (len(box.faces), 1))]
    if quads:  # pair the two triangles of each side into one quad
        pairs = {}
        for face, normal, value in zip(box.faces, np.round(normals, 6), cp):
            pairs.setdefault(tuple(normal), []).append((face, value))
        quads_out, values = [], []
        for (a, b) in pairs.values():
            shared = [v for v in a[0] if v in b[0]]
            lone_a, lone_b = [v for v in a[0] if v not in shared][0], [v for v in b[0] if v not in shared][0]
            i = list(a[0]).index(lone_a)
            quads_out.append([lone_a, a[0][(i + 1) % 3], lone_b, a[0][(i + 2) % 3]])
            values.append(a[1])
        cells, data = [("quad", np.array(quads_out))], {"Cp": [np.array(values)]}
    path = tmp_path / "box.vtu"
    meshio.Mesh(box.vertices, cells, cell_data=data).write(path)
    return path


def integrate(path, area, **options):
    field = surface.load_field(path, units="m", ground=0.0)
    air = surface.freestream(field, options.pop("kind", None), options.pop("speed", None),
                             options.pop("density", None), options.pop("p_inf", None))
    return surface.integrate(field, air, area, **options)


def test_sphere_has_no_pressure_drag_and_its_buildup_follows_the_closed_form(tmp_path):
    """Potential flow round a sphere: Cp = 1 - (9/4) sin^2 theta gives zero net drag (d'Alembert).
    The drag of the cap from the nose to x, on the area pi R^2: the band at theta contributes
    Cp cos(theta) 2 pi R^2 sin(theta) d(theta), which integrates to Cd(x) = u - (9/8) u^2 with
    u = sin^2 theta = 1 - (1 - x/R)^2 (derived here; zero again at the tail)."""
    forces = integrate(sphere_file(tmp_path), np.pi * SPHERE_R**2)
    assert abs(forces.cd) < 1e-6 and abs(forces.cl) < 1e-6
    u = 1 - (1 - forces.x / SPHERE_R) ** 2
    closed = u - 9 / 8 * u**2
    assert np.max(np.abs(forces.cd_cumulative - closed)) < 0.005  # faces 2 % of R, stations 1 % of the length
    assert forces.cd_cumulative[100] == pytest.approx(-1 / 8, abs=0.005)  # the front half: 1 - 9/8


def test_inward_normals_are_turned_and_inconsistent_ones_refused(tmp_path):
    straight = integrate(sphere_file(tmp_path), np.pi)
    flipped = integrate(sphere_file(tmp_path, flip=True, name="flipped.vtu"), np.pi)
    np.testing.assert_allclose(flipped.cd_cumulative, straight.cd_cumulative, atol=1e-12)
    assert any("turned outward" in note for note in flipped.notes)
    mesh = meshio.read(sphere_file(tmp_path))
    faces = mesh.cells[0].data.copy()
    faces[:50] = faces[:50, ::-1]
    meshio.Mesh(mesh.points, [("triangle", faces)], point_data=mesh.point_data).write(tmp_path / "mixed.vtu")
    with pytest.raises(surface.SurfaceError, match="edges are shared by faces wound the same way"):
        integrate(tmp_path / "mixed.vtu", np.pi)


@pytest.mark.parametrize("quads", [False, True])
@pytest.mark.parametrize("base_cp", [-0.2, -0.35])
def test_box_drag_is_one_minus_base_pressure(tmp_path, base_cp, quads):
    """A box with Cp = 1 on its front and a uniform Cp_b on its base: Cd = 1 - Cp_b on the frontal area,
    exactly (the side faces carry no x force)."""
    forces = integrate(box_file(tmp_path, base_cp, quads), 1.5 * 1.2)
    assert forces.cd == pytest.approx(1 - base_cp, abs=1e-12)
    assert forces.cl == pytest.approx(0.0, abs=1e-12)  # roof and floor suction cancel
    assert forces.cd_cumulative[-1] == pytest.approx(forces.cd, abs=1e-12)


def test_plate_friction_drag_is_shear_times_area(tmp_path):
    """A plate (a thin box) with a uniform wall shear of 2 Pa along +x on every face: D = tau A_wetted,
    here with Cp = 0 front and back so only friction acts on the top, bottom and sides."""
    tau, speed, density = 2.0, 40.0, 1.2
    path = box_file(tmp_path, 0.0, length=2.0, width=1.0, height=0.01, shear=(tau, 0, 0))
    mesh = meshio.read(path)
    mesh.cell_data["Cp"] = [np.zeros(len(mesh.cells[0].data))]
    mesh.write(path)
    forces = integrate(path, 1.0, speed=speed, density=density)
    wetted = 2 * (2.0 * 1.0) + 2 * (2.0 * 0.01) + 2 * (1.0 * 0.01)
    drag = forces.cd * 0.5 * density * speed**2 * 1.0
    assert drag == pytest.approx(tau * wetted, rel=1e-12)


def test_axle_lift_by_the_lever_rule(tmp_path):
    """Statics: a lift L at x between the axles loads them as L (x - x_f)/wb (rear) and the rest (front);
    drag D at height h above the ground moves D h / wb from the front axle to the rear."""
    path = box_file(tmp_path, 0.0)  # floor and roof at -0.3 cancel; front Cp = 1 gives drag at the centre height
    front_axle, wheelbase = 0.5, 2.0
    forces = integrate(path, 1.8, front_axle=front_axle, wheelbase=wheelbase)
    centre_height = 0.2 + 1.2 / 2
    assert forces.cd == pytest.approx(1.0)
    assert forces.cl_rear == pytest.approx(-forces.cd * centre_height / wheelbase, abs=1e-12)
    assert forces.cl_front + forces.cl_rear == pytest.approx(forces.cl, abs=1e-12)
    mesh = meshio.read(path)  # now suction only on the roof (z faces up): a lift at the box's mid-length
    normals = trimesh.Trimesh(mesh.points, mesh.cells[0].data).face_normals
    mesh.cell_data["Cp"] = [np.where(normals[:, 2] > 0.9, -0.5, 0.0)]
    mesh.write(path)
    forces = integrate(path, 1.8, front_axle=front_axle, wheelbase=wheelbase)
    assert forces.cl == pytest.approx(0.5 * 3.0 * 1.5 / 1.8)
    assert forces.cl_rear == pytest.approx(forces.cl * (1.5 - front_axle) / wheelbase)


@pytest.mark.parametrize("kind", ["gauge", "absolute", "kinematic"])
def test_pressures_in_pascal_give_the_coefficient_result(tmp_path, kind):
    """p = p_inf + Cp q (Pa), or (p - p_inf) / rho (kinematic): the same Cd as the coefficient field."""
    speed, density, p_inf = 30.0, 1.2, 101325.0
    q = 0.5 * density * speed**2
    reference = integrate(sphere_file(tmp_path, subdivisions=3), np.pi)
    mesh = meshio.read(sphere_file(tmp_path, subdivisions=3))
    cp = mesh.point_data.pop("Cp")
    mesh.point_data["p"] = {"gauge": cp * q, "absolute": p_inf + cp * q, "kinematic": cp * q / density}[kind]
    mesh.write(tmp_path / "p.vtu")
    forces = integrate(tmp_path / "p.vtu", np.pi, kind=kind, speed=speed, density=density,
                       p_inf=p_inf if kind == "absolute" else None)
    np.testing.assert_allclose(forces.cd_cumulative, reference.cd_cumulative, atol=1e-9)


def test_cli_json_shape(tmp_path, cli):
    run = cli("results", "surface", box_file(tmp_path, -0.2), "--area", "1.8", "--front-axle", "0.5",
              "--wheelbase", "2", "--json")
    data = json.loads(run.out)
    assert run.code == 0 and set(data) == {"file", "faces", "cd", "cl", "cl_front", "cl_rear", "buildup"}
    assert data["cd"] == pytest.approx(1.2) and data["faces"] == 12
    assert set(data["buildup"][0]) == {"x", "cd", "cl"} and data["buildup"][-1]["x"] == pytest.approx(3.0)


# -- bad input: a clear message, exit 2 -----------------------------------------------
def test_bad_surfaces_are_refused(tmp_path, cli):
    good = sphere_file(tmp_path, subdivisions=2)
    mesh = meshio.read(good)

    def variant(name, **change):
        m = meshio.Mesh(change.get("points", mesh.points), change.get("cells", mesh.cells),
                        point_data=change.get("point_data", mesh.point_data),
                        cell_data=change.get("cell_data", {}))
        m.write(tmp_path / name)
        return tmp_path / name

    cases = {
        variant("no-field.vtu", point_data={"T": np.ones(len(mesh.points)), "U": np.ones((len(mesh.points), 3))}):
            "no a pressure or pressure-coefficient field (p, pressure, Cp, cp); the file has these fields: T (point), "
            "U (point)",
        variant("nan.vtu", point_data={"Cp": np.where(np.arange(len(mesh.points)) < 3, np.nan, 0.1)}):
            "has 3 values that are not finite",
        variant("pressure.vtu", point_data={"p": np.ones(len(mesh.points))}): "is a pressure, not a coefficient",
        variant("volume.vtu", cells=[("tetra", np.array([[0, 1, 2, 3]]))], point_data={}): "a volume mesh",
    }
    (tmp_path / "empty.vtu").write_bytes(b"")
    (tmp_path / "junk.vtu").write_text("this is not a mesh")
    cases[tmp_path / "empty.vtu"] = "the file is empty"
    cases[tmp_path / "junk.vtu"] = "not a surface mesh meshio can read"
    for path, message in cases.items():
        run = cli("results", "surface", path, "--area", "3.14")
        assert run.code == 2 and message in run.err and "Traceback" not in run.err, (path.name, run.err)


@pytest.mark.parametrize("section", ["POINT_DATA", "CELL_DATA"])
def test_field_of_the_wrong_size_is_refused(tmp_path, cli, section):
    """A legacy VTK file whose field has 3 values for 4 points (or 4 faces)."""
    text = ("# vtk DataFile Version 4.2\nwrong size\nASCII\nDATASET UNSTRUCTURED_GRID\nPOINTS 4 double\n"
            "0 0 0\n1 0 0\n0 1 0\n0 0 1\nCELLS 4 16\n3 0 2 1\n3 0 1 3\n3 0 3 2\n3 1 2 3\nCELL_TYPES 4\n5\n5\n5\n5\n"
            f"{section} 3\nSCALARS Cp double 1\nLOOKUP_TABLE default\n0.1\n0.2\n0.3\n")
    (tmp_path / "wrong.vtk").write_text(text)
    run = cli("results", "surface", tmp_path / "wrong.vtk", "--area", "1", "--units", "m", "--json")
    assert run.code == 2 and "a field does not match the mesh" in run.err and "has length 3" in run.err or \
        "= 3" in run.err, run.err
    assert "Traceback" not in run.err and run.out == ""


def test_unreadable_format_says_why_and_prints_nothing(tmp_path, cli):
    """meshio prints and exits on some files (legacy VTK POLYDATA); the command says why, on stderr only."""
    (tmp_path / "poly.vtk").write_text("# vtk DataFile Version 4.2\nx\nASCII\nDATASET POLYDATA\nPOINTS 0 double\n")
    run = cli("results", "surface", tmp_path / "poly.vtk", "--json")
    assert run.code == 2 and "POLYDATA" in run.err and run.out == ""
