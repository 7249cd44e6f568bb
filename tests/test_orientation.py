"""Orientation inferred as units are (and said), and warnings for measurements that make no sense:
the Tessel demo surface turned and flipped must measure as it does the right way up."""

from __future__ import annotations

import numpy as np
import pytest
import trimesh

from aeroreview.calc.geometry.profile import Measurement
from aeroreview.plausible import warnings_for
from conftest import VEHICLES

SURFACE = VEHICLES / "tessel" / "surface" / "tessel-r2.ply"


def _windshield(run) -> float:
    line = next(line for line in run.out.splitlines() if line.strip().startswith("windshield.angle"))
    return float(line.split()[1])


@pytest.fixture(scope="module")
def turned(tmp_path_factory):
    """The surface written y-up and, separately, nose at +x (the same body in other file axes)."""
    mesh = trimesh.load(SURFACE, process=False)
    folder = tmp_path_factory.mktemp("turned")
    y_up = mesh.copy()
    y_up.vertices = np.asarray(mesh.vertices)[:, [0, 2, 1]]
    y_up.export(folder / "y-up.ply")
    flipped = mesh.copy()
    flipped.vertices = np.asarray(mesh.vertices) * [-1.0, 1.0, 1.0]
    flipped.export(folder / "nose-plus-x.ply")
    return folder


def test_orientation_is_inferred_and_said(cli, turned):
    right = cli("measure", SURFACE, "--ground", "0")
    assert "up inferred as +z" in right.err and "nose inferred at -x" in right.err
    for name, said in (("y-up.ply", "up inferred as +y"), ("nose-plus-x.ply", "nose inferred at +x")):
        run = cli("measure", turned / name, "--ground", "0")
        assert run.code == 0 and said in run.err, run.err
        assert _windshield(run) == pytest.approx(_windshield(right), abs=0.2)
    given = cli("measure", SURFACE, "--nose", "-x", "--up", "+z", "--ground", "0")
    assert "inferred as +z" not in given.err and "nose inferred" not in given.err


def test_the_wrong_nose_is_warned_about(cli):
    """Read tail-first, the surface's ends contradict the --nose given; without --ground the tail's
    plan taper lands at belt height far outside the typical 0-15 deg."""
    run = cli("measure", SURFACE, "--nose", "+x", "--ground", "0")
    assert any("--nose +x puts the higher end first" in line for line in run.err.splitlines()), run.err
    run = cli("measure", SURFACE, "--nose", "+x")
    assert any("rear.side_taper_angle" in line and "typical range" in line and "--nose" in line
               for line in run.err.splitlines() if "warning:" in line), run.err
    assert not [line for line in cli("measure", SURFACE, "--ground", "0").err.splitlines()
                if "warning:" in line and "--nose" in line]


def test_radius_larger_than_the_body_and_a_poor_line_fit_are_implausible():
    radius = Measurement("front.upper_edge_radius", 32.0, "circle fit")
    line = Measurement("rear.backlight_angle", np.radians(25), "line fit, rms residual 9.00 mm", (3.0, 3.5))
    said = warnings_for([radius, line], 4.8, True)
    assert any("larger than the body" in s for s in said) and any("rms residual of 9.00 mm" in s for s in said)
    assert warnings_for([Measurement("front.upper_edge_radius", 0.08, "circle fit")], 4.8, True) == []


def test_a_ground_at_the_lowest_point_that_gives_no_clearance_suggests_ground():
    clearance = Measurement("dimensions.ground_clearance", 0.004, "lowest underbody point")
    said = warnings_for([clearance], 4.8, ground_given=False)
    assert len(said) == 1 and "--ground" in said[0] and "lowest point" in said[0]
    assert "lowest point" not in warnings_for([clearance], 4.8, ground_given=True)[0]
    assert warnings_for([Measurement("dimensions.ground_clearance", 0.15, "x")], 4.8, ground_given=False) == []


def test_sections_that_cut_the_backlight_are_labelled_and_the_centreline_is_closed(cli):
    import json

    from aeroreview.measure import load_surface, measure, silhouette_data

    run = cli("measure", SURFACE, "--ground", "0", "--json")
    data = json.loads(run.out)
    sections = data["sections"]["horizontal"]
    glass = data["features"]["rear.backlight_angle"]
    assert glass["value"] == pytest.approx(22, abs=0.5)
    cut = [s["height_m"] for s in sections if s["cuts_backlight"]]
    kept = [s["height_m"] for s in sections if not s["cuts_backlight"]]
    assert cut and kept and min(cut) > max(kept)  # the top sections, above the foot of the glass
    text = cli("measure", SURFACE, "--ground", "0").out
    assert f"z = {min(cut):.3f} m: cuts the backlight, so not a rear taper" in text
    result = measure(load_surface(SURFACE, ground=0.0))
    outline = silhouette_data(result)["parts"]
    nose, base = (pytest.approx([float(v) for v in result.centreline.lower[i]], abs=1e-4) for i in (0, -1))
    assert outline[0]["points"][0] == nose and outline[-2]["points"][-1] == base  # nose face and base drawn
