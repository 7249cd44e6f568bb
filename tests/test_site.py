"""The review site: every page kind, figures, escaping, reproducibility, atomic builds, caching."""

from __future__ import annotations

import re
import subprocess
from html import unescape
import sys
from pathlib import Path

import pytest

from aeroreview.review import review_sheet
from aeroreview.settings import Settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import esc, generate
from conftest import ROOT, VEHICLES, run_cli
from site_helpers import build, copy_knowledge_base


@pytest.fixture(scope="module")
def demo_site(tmp_path_factory):
    kb = copy_knowledge_base(tmp_path_factory.mktemp("kb"))
    return build(kb, kb / "out")


PAGES = ["index.html", "fleet/index.html", "fleet/tessel/index.html", "fleet/tessel/r1.html",
         "fleet/tessel/r2.html", "fleet/tessel/r1-to-r2.html", "fleet/quillon/r1-to-r2.html",
         "fleet/dravik/r2.html", "rules/index.html", "rules/rear.backlight-angle.html",
         "features.html", "methods/index.html", "methods/atmosphere.html", "methods/forces.html",
         "methods/roadload.html", "methods/wind-averaged.html", "methods/ahmed.html",
         "glossary.html", "cautions.html"]


@pytest.mark.parametrize("page", PAGES)
def test_every_page_kind_exists(demo_site, page):
    assert (demo_site / page).is_file()


def images(html: str) -> list[tuple[str, str]]:
    return re.findall(r'<img alt="([^"]*)"[^>]*src="([^"]+)"', html)


def test_revision_page_content(demo_site):
    html = (demo_site / "fleet/tessel/r1.html").read_text(encoding="utf-8")
    for text in ("Key numbers", "Drag at 130 km/h", "Lift per axle at top speed", "Energy on wltc-3b",
                 "+10 counts on wltc-3b", "Findings by zone", "Ranked fixes", "Attachments", "Notes",
                 "rear.backlight-angle", "Fails the gate", "Cautions"):
        assert text in html, text
    figures = images(html)
    kinds = {Path(src).name.split("-")[0] for _, src in figures if "figures/" in src}
    assert {"zones", "drag", "lift", "energy", "ahmed", "waterfall"} <= kinds
    for alt, src in figures:
        assert alt.strip(), src
        assert (demo_site / "fleet/tessel" / src).resolve().is_file(), src


def test_yaw_sweep_figure_on_the_revision_with_a_sweep(demo_site):
    html = (demo_site / "fleet/tessel/r2.html").read_text(encoding="utf-8")
    assert any("figures/yaw-" in src for _, src in images(html))
    assert "wind-averaged Cd" in unescape(html)


def test_home_fleet_table(demo_site):
    html = (demo_site / "index.html").read_text(encoding="utf-8")
    assert html.count("Maroska") >= 3 and "0.232 (measured)" in html and "coverage" in html
    assert "aeroreview:fleet-table" not in html


def test_vehicle_page_has_trends_and_diff_links(demo_site):
    html = (demo_site / "fleet/tessel/index.html").read_text(encoding="utf-8")
    assert any("figures/trends-" in src for _, src in images(html)) and "what changed" in html
    diff = (demo_site / "fleet/tessel/r1-to-r2.html").read_text(encoding="utf-8")
    assert "rear.backlight_angle" in diff and "Resolved" in diff and "29 deg" in diff


def test_rule_page_has_doc_thresholds_sources_figure_and_flagged_revisions(demo_site):
    html = (demo_site / "rules/rear.backlight-angle.html").read_text(encoding="utf-8")
    for text in ("What it checks", "Why it matters", "How to fix", "Known limits", "critical_low", "published",
                 "from memory", "Earlier revisions that failed or warned", "Maroska Tessel r1"):
        assert text in html, text
    assert any("figures/ahmed-" in src for _, src in images(html))


def test_svg_figures_are_labelled_and_colour_blind_safe(demo_site):
    svgs = list((demo_site / "figures").glob("*.svg"))
    assert len(svgs) > 20
    drag = next(p for p in svgs if p.name.startswith("drag-power")).read_text(encoding="utf-8")
    assert "speed [km/h]" in drag and "drag force [N]" in drag and "drag power [kW]" in drag
    assert "#0072b2" in drag.lower() and "#d55e00" in drag.lower()  # Okabe-Ito blue and vermillion


def test_two_builds_are_byte_identical(tmp_path):
    kb = copy_knowledge_base(tmp_path / "kb")
    first, second = build(kb, tmp_path / "a"), build(kb, tmp_path / "b")
    files = sorted(p.relative_to(first) for p in first.rglob("*") if p.is_file())
    assert files == sorted(p.relative_to(second) for p in second.rglob("*") if p.is_file())
    for name in files:
        assert (first / name).read_bytes() == (second / name).read_bytes(), name


def test_sheet_text_is_escaped(tmp_path):
    kb = copy_knowledge_base(tmp_path / "kb")
    sheet = kb / "vehicles/tessel/r2.yaml"
    text = sheet.read_text(encoding="utf-8").replace("name: Maroska Tessel", "name: 'Tessel <b>bold</b> | *x*'")
    text = text.replace("notes: |\n", "notes: |\n  <script>alert(1)</script> [link](javascript:alert(2))\n")
    sheet.write_text(text, encoding="utf-8")
    html = (build(kb, tmp_path / "out") / "fleet/tessel/r2.html").read_text(encoding="utf-8")
    assert "<script>alert" not in html and "&lt;script&gt;alert&#40;1&#41;&lt;/script&gt;" in html
    assert "<script>alert(1)</script>" in unescape(html)  # shown as text, exactly as typed
    assert "<b>bold</b>" not in html and "&lt;b&gt;bold&lt;/b&gt;" in html
    assert "<title>Tessel bbold/b" in html  # markup characters dropped from the title
    assert 'href="javascript:' not in html


def test_esc_neutralises_markdown_and_html():
    assert esc("<a href='x'>|*_[]") == "&lt;a href=&#x27;x&#x27;&gt;&#124;&#42;&#95;&#91;&#93;"


def test_failed_build_leaves_the_previous_site(tmp_path):
    kb = copy_knowledge_base(tmp_path / "kb")
    out = build(kb, tmp_path / "out")
    before = {p.relative_to(out): p.read_bytes() for p in out.rglob("*") if p.is_file()}
    sheet = kb / "vehicles/tessel/r2.yaml"
    sheet.write_text(sheet.read_text(encoding="utf-8").replace("22 deg", "22 mm"), encoding="utf-8")
    run = run_cli("site", "build", "--config", kb / "mkdocs.yml", "--output", out)
    assert run.code == 2 and "r2.yaml:" in run.err and "not a unit of angle" in run.err
    after = {p.relative_to(out): p.read_bytes() for p in out.rglob("*") if p.is_file()}
    assert after == before
    assert not list(tmp_path.glob(".aeroreview-build-*"))


def test_figure_cache_redraws_only_the_changed_sheet(tmp_path):
    settings = Settings(root=ROOT)
    reviews = [review_sheet(s, settings) for s in load_fleet([VEHICLES]).sheets]
    cold = FigureCache(tmp_path / "cache")
    generate(reviews, settings, cold)
    warm = FigureCache(tmp_path / "cache")
    changed = load_fleet([VEHICLES]).sheets
    target = next(s for s in changed if s.label == "quillon@r2")
    target.features["wheels.rim_openness"] = type(target.features["wheels.rim_openness"])(0.5)
    generate([review_sheet(s, settings) for s in changed], settings, warm)
    assert cold.drawn > 20
    # The changed revision's figures and its vehicle's trend figure at most; everything else reused.
    assert 0 < warm.drawn <= 8 and warm.reused >= cold.drawn - 8


def test_mkdocs_build_strict_from_the_repository_root(tmp_path):
    out = tmp_path / "site"
    done = subprocess.run([sys.executable, "-m", "mkdocs", "build", "--strict", "--site-dir", str(out)], cwd=ROOT,
                          capture_output=True, text=True, timeout=300, env={"NO_MKDOCS_2_WARNING": "1",
                                                                            "PATH": "/usr/bin:/bin"})
    assert done.returncode == 0, done.stderr
    assert "WARNING" not in done.stderr
    assert (out / "fleet/tessel/r1.html").is_file()
    assert not (ROOT / "site_src" / "fleet").exists()  # nothing generated lands in site_src


def test_calibration_page_shows_the_team_data_and_the_rules_link_to_it(demo_site):
    page = unescape((demo_site / "calibrations/studies-tessel-rear-doe-calibration.html").read_text())
    assert "INVENTED DEMO DATA" in page and "47 (1 dropped for missing values)" in page
    for kind in ("calibration-slopes", "calibration-predicted", "calibration-residuals"):
        assert re.search(rf'src="[./]*figures/{kind}-[0-9a-f]+\.svg"', page), kind
    assert "differs in size" in page and "agrees" in page
    rule = (demo_site / "rules/underbody.diffuser-angle.html").read_text()
    assert "calibrations/studies-tessel-rear-doe-calibration.html" in rule and "Team data" in rule
    assert "cross-validated R^2 0.97, RMSE 1.8 counts" in unescape(rule) and "for vehicle tessel" in unescape(rule)
    assert "vehicle tessel (other vehicles keep the library estimates)" in page
    reached = page[page.rindex("Findings it re-costs"):page.rindex("How much of the study")]  # the text, not the TOC
    assert "tessel@r1" in reached and "rules/underbody.diffuser-angle" in reached and "quillon" not in reached
    quillon = unescape((demo_site / "fleet/quillon/r1.html").read_text())
    assert "calibration not applied: studies/tessel/rear-doe.calibration.yaml is calibrated for vehicle tessel" \
        in quillon
    revision = unescape((demo_site / "fleet/tessel/r1.html").read_text())
    assert "calibrated on studies/tessel/rear-doe.calibration.yaml (47 rows, cross-validated R^2 0.97, RMSE 1.8 counts)" in revision
    assert "(team data)" in revision
