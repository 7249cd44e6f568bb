"""Page writers format what the engine computed: one lift number per revision, attachments copied by the plugin."""

from __future__ import annotations

import re
import shutil

import pytest

from aeroreview.review import review_sheet
from aeroreview.settings import Settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from conftest import ROOT, VEHICLES


def test_lift_figure_and_key_numbers_show_the_same_front_lift_with_a_reference_area(tmp_path):
    """Bug 2: the lift figure used the frontal area while the table used the result's reference area.

    Reference: lift L = 0.5 rho v^2 A_ref cl (Hucho, Aerodynamics of Road Vehicles, 1998, chapter not checked),
    as a mass L / g0 with g0 = 9.80665 m/s^2 (ISO 80000-3); A_ref = 1.5 x the frontal area here.
    """
    text = (VEHICLES / "tessel/r2.yaml").read_text(encoding="utf-8").split("\ngeometry:")[0]
    text = text.replace("    of_record: true\n", "    of_record: true\n    reference_area: 3.36 m^2\n", 1)  # the lift used
    shutil.copytree(VEHICLES / "tessel/cfd", tmp_path / "tessel/cfd")  # the result files the sheet names
    (tmp_path / "tessel/r2.yaml").write_text(text, encoding="utf-8")
    settings = Settings(root=ROOT)
    review = review_sheet(load_fleet([tmp_path]).sheets[0], settings)
    page = generate([review], settings, FigureCache(None)).files["fleet/tessel/r2.md"]
    table = re.search(r"Lift per axle at top speed \(210 km/h\) \| front \+(\d+) kg", page)
    figure = re.search(r"Lift per axle against speed: at 210 km/h front &#43;(\d+) kg", page)  # alt text, escaped
    expected = 0.5 * settings.air().density * (210 / 3.6) ** 2 * 3.36 * 0.02 / 9.80665
    assert table and figure
    assert int(table.group(1)) == int(figure.group(1)) == round(expected)


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    settings = Settings(root=ROOT)
    reviews = [review_sheet(s, settings) for s in load_fleet([VEHICLES]).sheets]
    return generate(reviews, settings, FigureCache(tmp_path_factory.mktemp("cache") / "figures"))


def test_attachments_are_copied_by_the_plugin_not_read_by_the_pages(demo):
    site = demo
    assert [t for t in site.copies if t.startswith("fleet/tessel/files/r1/")], "the Tessel r1 sheet has attachments"
    for target, source in site.copies.items():
        assert target.startswith("fleet/") and "/files/" in target and source.is_file()
        assert target not in site.files


def test_a_source_kind_is_shown_once_after_its_citation(demo):
    """A citation that already names its kind ("...; from memory") is not followed by "(from memory)" again."""
    pages = {path: text for path, text in demo.files.items() if path.endswith(".md")}
    assert any("(from memory)" in text for text in pages.values())
    for kind in ("from memory", "common practice", "published"):
        for mark in ("", "*"):
            repeated = f"{kind}{mark}) ({mark}{kind}"
            assert not [path for path, text in pages.items() if repeated in text], repeated


def test_revision_and_diff_pages_draw_the_solver_files(demo):
    """The Tessel's results name a force history and a build-up (vehicles/tessel/cfd/, invented): the
    revision page draws both, the r1 -> r2 page overlays the build-ups and tabulates the change by zone.

    Reference: the zones tile the body, so their changes add up to the change of the total
    (a telescoping sum); the total is r2's Cd 0.232 minus r1's 0.301 as the surface files
    integrate (make_results.py), -69 counts, one count being 0.001 (SAE J1594 usage).
    """
    page = demo.files["fleet/tessel/r2.md"]
    assert re.search(r"!\[Force history of r2, [^]]*settled from[^]]*\]\(\.\./\.\./figures/[^)]+\.svg\)", page)
    assert re.search(r"!\[Cumulative drag and lift from the nose rearward for r2[^]]*zones along x: front", page)
    diff = demo.files["fleet/tessel/r1-to-r2.md"]
    assert re.search(r"!\[Cumulative drag along x of r1 and r2[^]]*\]\(\.\./\.\./figures/[^)]+\.svg\)", diff)
    rows = re.findall(r"^\| (front|windshield|roof and rear) \| (-?[\d.]+) \| (-?[\d.]+) \| ([+-][\d.]+) \|$", diff,
                      re.MULTILINE)
    assert [r[0] for r in rows] == ["front", "windshield", "roof and rear"]
    total = float(re.search(r"^\| All \| \| \| ([+-][\d.]+) \|$", diff, re.MULTILINE).group(1))
    assert total == pytest.approx(-69.0, abs=0.1)
    assert sum(float(r[3]) for r in rows) == pytest.approx(total, abs=0.2)  # each row rounded to 0.1
    for name in re.findall(r"\(\.\./\.\./figures/([^)]+\.svg)\)", diff):
        assert f"figures/{name}" in demo.files


def test_the_page_and_its_zone_chart_show_one_score(demo):
    """The Quillon r1 scores 24.53 (invented demo): the page header read 'Score 25' from the raw score
    while the zone chart, fed the score rounded to a tenth (24.5), said 'overall 24' (format's .0f
    rounds half to even). Kept to a tenth once and shown halves up, both read 25."""
    page = demo.files["fleet/quillon/r1.md"]
    header = re.search(r"\*\*Score (\d+) \(", page)
    chart = demo.files["figures/" + re.search(r"figures/(zones-[0-9a-f]+\.svg)", page).group(1)]
    overall = re.search(r"overall (\d+) with coverage", chart.decode() if isinstance(chart, bytes) else chart)
    assert header and overall and header.group(1) == overall.group(1) == "25"
