"""Site pages a reviewer reads every day: the diff page, the rule page's revision lists, the key
numbers, and numbers formatted for people."""

from __future__ import annotations

import io
import json
import logging
import shutil
import sys
from html import unescape

import pytest

from aeroreview.review import review_sheet
from aeroreview.settings import Settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from aeroreview.units import format_number, format_quantity, to_si
from conftest import ROOT, VEHICLES


@pytest.fixture(scope="module")
def pages(tmp_path_factory):
    """The generated pages of the demo fleet, with Tessel r2 given a waiver and 1 exposed diffuser part."""
    folder = tmp_path_factory.mktemp("fleet")
    shutil.copytree(VEHICLES, folder / "vehicles")
    sheet = folder / "vehicles/tessel/r2.yaml"
    text = sheet.read_text(encoding="utf-8").replace("underbody.diffuser_exposed_parts: 0",
                                                      "underbody.diffuser_exposed_parts: 1")
    sheet.write_text(text + "waivers:\n  - {rule: underbody.diffuser-exposed, reason: tooling freeze}\n", encoding="utf-8")
    settings = Settings(root=ROOT)
    reviews = [review_sheet(s, settings) for s in load_fleet([folder / "vehicles"]).sheets]
    return generate(reviews, settings, FigureCache(tmp_path_factory.mktemp("cache"))).files


def test_diff_page_shows_waivers_surface_range_lift_and_moves_within_a_status(pages):
    page = pages["fleet/tessel/r1-to-r2.md"]
    assert "added: [underbody.diffuser-exposed]" in page and "tooling freeze" in page
    assert "Surface file changed: surface/tessel-r1.ply → surface/tessel-r2.ply" in unescape(page)
    for row in ("| Range on the cycle [km] |", "| Lift on the front axle at 130 km/h [kg] |",
                "| Lift on the rear axle at 130 km/h [kg] |"):
        line = next(line for line in page.splitlines() if line.startswith(row))
        was, now, change = (cell.strip() for cell in line.split("|")[2:5])
        assert float(change.replace(",", "")) == pytest.approx(float(now.replace(",", "")) - float(was.replace(",", "")),
                                                                abs=1), line
    within = page.split("### Changed within their status", 1)[1].split("##", 1)[0]
    assert "underbody.diffuser-exposed" in within and "3 → " in within and "1 (better)" in within


def test_rule_page_lists_latest_revisions_apart_from_earlier_ones(pages):
    page = pages["rules/rear.backlight-angle.md"]
    latest, earlier = page.split("## Latest revisions that fail or warn", 1)[1].split(
        "## Earlier revisions that failed or warned", 1)
    assert "Tessel r1" not in latest  # superseded by r2, which passes
    assert "Maroska Tessel r1" in earlier


def test_key_numbers_table_has_no_empty_first_row(pages):
    page = pages["fleet/tessel/r2.md"]
    table = page.split("## Key numbers", 1)[1].strip().splitlines()
    assert table[0] == "| Quantity | Value |" and table[1] == "|---|---|"
    assert all(cell.strip() for cell in table[0].strip("|").split("|"))


def test_numbers_for_people():
    """Significant digits, thousands separated, no exponent for everyday magnitudes (ISO 80000-1 digit
    grouping, written with the comma as in the site's English)."""
    assert format_number(2035.0) == "2,035" and format_quantity(2035.0, "kg") == "2,035 kg"
    assert format_number(0.5234) == "0.523" and format_number(27.0) == "27" and format_number(4.8) == "4.8"
    assert format_number(-12.345) == "-12.3" and format_number(1.5e-6) == "1.5e-06"
    assert format_quantity(to_si("130 km/h", "km/h"), "km/h") == "130 km/h"


def test_json_numbers_have_no_float_noise(cli):
    run = cli("check", VEHICLES / "tessel" / "r2.yaml", "--format", "json")
    assert "0000000000" not in run.out and "9999999999" not in run.out
    numbers = json.loads(run.out)["sheets"][0]["key_numbers"]
    assert numbers["reference_speed_km_h"] == 130.0


class _Terminal(io.StringIO):
    def isatty(self):
        return True


def test_site_build_shows_progress_on_a_terminal_and_no_nav_chatter(tmp_path, monkeypatch):
    """A build on a terminal shows a progress bar; MkDocs says nothing about generated pages missing
    from the nav (they are linked from the fleet, vehicle and rule pages); off a terminal, no bar."""
    from aeroreview.site import build
    from site_helpers import copy_knowledge_base

    monkeypatch.setattr(sys, "stderr", io.StringIO())
    assert build._Progress().bar is None
    records = []
    handler = logging.Handler(logging.INFO)
    handler.emit = records.append
    logging.getLogger("mkdocs").addHandler(handler)
    previous = logging.getLogger("mkdocs").level
    logging.getLogger("mkdocs").setLevel(logging.INFO)
    terminal = _Terminal()
    monkeypatch.setattr(sys, "stderr", terminal)
    try:
        kb = copy_knowledge_base(tmp_path / "kb")
        build.build_site(str(kb / "mkdocs.yml"), str(tmp_path / "out"))
    finally:
        logging.getLogger("mkdocs").removeHandler(handler)
        logging.getLogger("mkdocs").setLevel(previous)
    messages = [r.getMessage() for r in records]
    assert not [m for m in messages if "not included in the \"nav\"" in m], messages
    assert "rendering pages" in terminal.getvalue() or "reviewing" in terminal.getvalue(), terminal.getvalue()[:500]
