"""What the site shows of result files: history figure data, zones along x, build-up change."""

from __future__ import annotations

import numpy as np
import pytest

from aeroreview.problems import InputError
from aeroreview.results import evidence
from conftest import VEHICLES


def write_buildup(path, x, cd, cl=None):
    cl = np.zeros_like(x) if cl is None else cl
    path.write_text("# test build-up\nx_m,cd,cl\n" + "".join(f"{a},{b},{c}\n" for a, b, c in zip(x, cd, cl)))
    return path


def test_zone_changes_add_up_to_the_total(tmp_path):
    """The zones tile the body, so their changes sum to the change of the whole (the telescoping sum)."""
    x = np.linspace(0, 4.8, 97)
    before = write_buildup(tmp_path / "a.csv", x, 0.30 * np.sin(x / 4.8 * np.pi / 2))
    after = write_buildup(tmp_path / "b.csv", x, 0.26 * np.sin(x / 4.8 * np.pi / 2) ** 2)

    def zones(length):
        return evidence.zones_along_x(length, front_overhang=0.9, wheelbase=2.9)

    change = evidence.buildup_change(evidence.buildup(before, "r1", zones), evidence.buildup(after, "r2", zones))
    assert [z.title for z in change.by_zone] == ["front overhang", "between the axles", "rear overhang"]
    assert sum(z.change_counts for z in change.by_zone) == pytest.approx(change.total_counts, abs=1e-9)
    assert change.total_counts == pytest.approx(-40.0, abs=1e-9)
    assert change.difference_counts[-1] == pytest.approx(-40.0, abs=1e-6)


def test_zones_from_the_measured_centreline():
    from aeroreview.digest import measured_geometry
    from aeroreview.sheet import load_sheet

    silhouette = measured_geometry(load_sheet(VEHICLES / "tessel" / "r2.yaml"), None)["silhouette"]
    zones = evidence.zones_along_x(4.87, silhouette)
    assert [z.title for z in zones] == ["front", "windshield", "roof and rear"]
    assert zones[0].start == 0 and zones[-1].end == 4.87 and all(a.end == b.start for a, b in zip(zones, zones[1:]))
    windshield_run = (1.40 - 0.95) / np.tan(np.radians(27))  # the design's windshield (make_surface.py)
    assert zones[1].end - zones[1].start == pytest.approx(windshield_run, abs=0.25)  # fillets blur its ends


def test_history_figure_band_is_two_standard_errors():
    figure = evidence.history_figure(VEHICLES / "tessel" / "cfd" / "tessel-r2-forces.dat", "r2")
    from aeroreview.results import history

    settled = history.settle(history.read_history(VEHICLES / "tessel" / "cfd" / "tessel-r2-forces.dat"))
    assert figure.band["cd"] == pytest.approx(2 * settled.coefficients["cd"].std_error)
    assert len(figure.steps) <= 2 * evidence.FIGURE_POINTS and figure.settled_from == settled.settled_from


@pytest.mark.parametrize("text, message", [("a,b,c\n0,0,0\n", "has the columns x_m,cd,cl"),
                                           ("x_m,cd,cl\n1,0,0\n0,0,0\n", "x does not increase")])
def test_bad_buildup_files(tmp_path, text, message):
    (tmp_path / "b.csv").write_text(text)
    with pytest.raises(InputError, match=message):
        evidence.read_buildup(tmp_path / "b.csv")
