"""A sheet against its own surface: the data-quality rule, the cached measurement behind it, and
the revision page. The reference is the construction: each surface is built by the demo's
generator (vehicles/tessel/surface/make_surface.py) from known design numbers, fillet radii and
angles, so what the surface measures is known before it is measured."""

from __future__ import annotations

import re
import shutil
import subprocess
import sys

import pytest

from aeroreview import sheetsurface
from aeroreview.review import failing, review_sheet
from aeroreview.rules.surface_agreement import DEFAULT_TOLERANCES, compare
from aeroreview.settings import Settings
from aeroreview.sheet import load_fleet, load_sheet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from conftest import ROOT, VEHICLES

sys.path.insert(0, str(VEHICLES / "tessel" / "surface"))
import make_surface  # noqa: E402  the demo's invented design, used as a known shape

RULE = "data.surface-agreement"


def finding(review):
    return next(f for f in review.findings if f.rule.id == RULE)


@pytest.fixture(scope="module")
def demo():
    settings = Settings(root=ROOT)
    return {s.revision: review_sheet(s, settings) for s in load_fleet([VEHICLES / "tessel"]).sheets}


@pytest.mark.parametrize("revision", ["r1", "r2"])
def test_demo_sheets_agree_with_their_own_surfaces(demo, revision):
    """Measured as the sheets declare their geometry (ground plane at z = 0), every value the
    surface gives agrees with the sheet: dimensions, frontal area, angles, radii, clearance."""
    found = finding(demo[revision])
    compared = {row["key"]: row for row in found.verdict.details["compared"]}
    assert found.status == "pass", found.verdict.message
    assert {"dimensions.frontal_area", "dimensions.ground_clearance", "underbody.nose_rake",
            "rear.roof_backlight_radius", "windshield.angle", "rear.side_taper_angle"} <= set(compared)
    assert all(row["agrees"] for row in compared.values())


def test_clean_revision_stays_clean_and_the_problem_revision_fails_for_its_real_faults(demo):
    """README: r2 has no finding at warning or above; r1 fails on its backlight, diffuser, inlet, rear lift."""
    assert not [f.rule.id for f in demo["r2"].findings if f.status in ("warning", "failure")]
    assert {f.rule.id for f in failing(demo["r1"], "failure")} == {
        "rear.backlight-angle", "underbody.diffuser-angle", "cooling.inlet-area", "stability.rear-lift"}


@pytest.fixture(scope="module")
def thirty_mm(tmp_path_factory):
    """A Tessel r1 sheet saying roof radius 10 mm, whose own surface is built with a 30 mm roof
    radius (a 40 deg backlight, so the arc turns far enough to be fitted)."""
    folder = tmp_path_factory.mktemp("kb") / "vehicles" / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    design = dict(make_surface.DESIGNS["r1"], roof_radius=0.030, backlight=40)
    make_surface.write_mesh(folder / "surface" / "thirty.ply", *make_surface.build(design))
    text = (folder / "r1.yaml").read_text(encoding="utf-8")
    text = re.sub(r"(?m)^  rear.roof_backlight_radius: .*$", "  rear.roof_backlight_radius: 10 mm", text)
    text = re.sub(r"(?m)^  rear.backlight_angle: .*$", "  rear.backlight_angle: 40 deg", text)
    text = text.replace("file: surface/tessel-r1.ply", "file: surface/thirty.ply")
    (folder / "r1.yaml").unlink()
    (folder / "r2.yaml").unlink()
    (folder / "r9.yaml").write_text(text.replace("revision: r1", "revision: r9"), encoding="utf-8")
    return folder / "r9.yaml"


def test_roof_radius_10_mm_against_a_30_mm_surface_is_flagged_with_both_numbers(cli, thirty_mm):
    run = cli("check", thirty_mm, "--fail-on", "never")
    line = next(line for line in run.out.splitlines() if RULE in line)
    assert line.split()[0] == "warning", line
    said = re.search(r"rear\.roof_backlight_radius: sheet 10 mm, surface ([0-9.]+) mm", line)
    assert said, line
    assert float(said[1]) == pytest.approx(30, rel=0.05)  # the construction's fillet
    assert "1 of" in line  # the only value that disagrees: every other one is the design's


def test_revision_page_shows_both_numbers_and_the_flag(thirty_mm, tmp_path):
    settings = Settings(root=tmp_path)
    review = review_sheet(load_sheet(thirty_mm), settings)
    page = generate([review], settings, FigureCache(tmp_path / "figures")).files["fleet/tessel/r9.md"]
    section = page.split("## Sheet against its surface", 1)[1].split("\n## ", 1)[0]
    row = next(line for line in section.splitlines() if "`rear.roof_backlight_radius`" in line)
    cells = [cell.strip() for cell in row.strip("|").split("|")]
    assert cells[1] == "10 mm" and float(cells[2].split()[0]) == pytest.approx(30, rel=0.05)
    assert cells[3].startswith("±7.") and "ar-warning" in cells[4] and cells[4].endswith("no")  # 25 % of 30 mm
    agreeing = next(line for line in section.splitlines() if "`windshield.angle`" in line)
    assert agreeing.rstrip().endswith("| yes |")


def test_tolerances_are_the_rules_thresholds_and_the_merge_uses_them(cli, tmp_path):
    """One declaration: 1 deg, 3 %, 25 % (the rule's defaults), and a merge without --overwrite
    lists the kept value that differs beyond them, with both numbers."""
    assert DEFAULT_TOLERANCES == pytest.approx({"angle": 0.0174533, "size": 0.03, "radius": 0.25})
    assert compare("rear.roof_backlight_radius", 0.0099, 0.0080).agrees  # 1.9 mm on 8 mm: inside 25 %
    assert not compare("rear.roof_backlight_radius", 0.0099, 0.0080, {**DEFAULT_TOLERANCES, "radius": 0.2}).agrees
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    sheet = folder / "r2.yaml"
    sheet.write_text(sheet.read_text(encoding="utf-8").replace("windshield.angle: 27 deg", "windshield.angle: 28.5 deg"),
                     encoding="utf-8")
    run = cli("measure", folder / "surface/tessel-r2.ply", "--ground", "0", "--sheet", sheet)
    assert "kept your windshield.angle (sheet 28.5 deg, surface 27 deg)" in run.err, run.err
    review = review_sheet(load_sheet(sheet), Settings(root=tmp_path))
    assert finding(review).status == "warning" and "windshield.angle: sheet 28.5 deg, surface 27 deg" in \
        finding(review).verdict.measured


def test_a_doubtful_measurement_is_named_not_compared(tmp_path):
    """Without `ground`, the ground plane is the surface's lowest point: the underbody, so a
    clearance of 0 mm; the rule names that doubt instead of flagging the sheet's 130 mm."""
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    sheet = folder / "r2.yaml"
    sheet.write_text(sheet.read_text(encoding="utf-8").replace("  ground: 0\n", ""), encoding="utf-8")
    found = finding(review_sheet(load_sheet(sheet), Settings(root=tmp_path)))
    assert "dimensions.ground_clearance" in found.verdict.details["doubts"]
    assert "dimensions.ground_clearance" not in {row["key"] for row in found.verdict.details["compared"]}
    assert "ground" in found.verdict.details["doubts"]["dimensions.ground_clearance"]


def test_a_surface_that_cannot_be_measured_is_not_assessed_with_the_reason(tmp_path):
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    (folder / "surface" / "tessel-r2.ply").write_bytes(b"")
    found = finding(review_sheet(load_sheet(folder / "r2.yaml"), Settings(root=tmp_path)))
    assert found.status == "not assessed" and "the file is empty" in found.verdict.message


def test_the_measurement_is_cached_by_content_and_options(tmp_path):
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    cache = tmp_path / "cache"
    sheet = load_sheet(folder / "r2.yaml")
    first = sheetsurface.measured(sheet, cache)
    assert len(list(cache.glob("*.json"))) == 1
    assert sheetsurface.measured(sheet, cache).values == first.values
    moved = folder / "r2.yaml"
    moved.write_text(moved.read_text(encoding="utf-8").replace("  ground: 0\n", "  ground: -0.01\n"), encoding="utf-8")
    lowered = sheetsurface.measured(load_sheet(moved), cache)
    assert len(list(cache.glob("*.json"))) == 2  # another option, another entry
    assert lowered.values.values["dimensions.ground_clearance"] == pytest.approx(
        first.values.values["dimensions.ground_clearance"] + 0.01)


PROBE = ("import sys\nfrom aeroreview.cli import main\nmain(sys.argv[1:])\n"
         "print('TRIMESH' if 'trimesh' in sys.modules else 'NONE', file=sys.stderr)")


def test_a_second_check_reads_the_cache_and_imports_no_mesh_library(tmp_path):
    folder = tmp_path / "vehicles" / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    (tmp_path / "mkdocs.yml").write_text("site_name: t\nplugins:\n  - aeroreview\n", encoding="utf-8")

    def imported() -> str:
        done = subprocess.run([sys.executable, "-c", PROBE, "check", "vehicles", "--fail-on", "never"], check=False,
                              capture_output=True, text=True, cwd=tmp_path, timeout=300)
        assert done.returncode == 0, done.stderr
        return done.stderr.split()[-1]

    assert imported() == "TRIMESH"  # measured once
    assert list((tmp_path / sheetsurface.CACHE_FOLDER).glob("*.json"))
    assert imported() == "NONE"  # unchanged surfaces: read from the cache


def test_a_cache_that_cannot_be_written_measures_anyway(tmp_path):
    """A read-only checkout in CI: the folder cannot be made (here a file stands in its place)."""
    blocked = tmp_path / "cache"
    blocked.write_text("not a folder", encoding="utf-8")
    sheetsurface._MEMORY.clear()
    found = sheetsurface.measured(load_sheet(VEHICLES / "tessel" / "r2.yaml"), blocked)
    assert found.values.problem is None and "windshield.angle" in found.values.values


def test_the_cache_key_covers_every_module_of_the_geometry_package():
    from aeroreview.memo import _sources

    names = {path.name for path in _sources("aeroreview.calc.geometry")}
    assert {"profile.py", "projection.py", "sections.py", "mesh.py"} <= names
