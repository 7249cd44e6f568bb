"""Figures drawn in a process pool give the same site, byte for byte, as drawn one by one;
the cache key follows matplotlib and the style; figures no page uses leave the cache."""

from __future__ import annotations

import pytest

from aeroreview.review import review_sheet
from aeroreview.settings import Settings
from aeroreview.sheet import load_fleet
from aeroreview.site import figures, svgchart
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from conftest import ROOT, VEHICLES


class Workers(FigureCache):
    def __init__(self, folder, workers):
        super().__init__(folder)
        self.workers = workers

    def draw_all(self, wanted, workers=None):
        return super().draw_all(wanted, workers=self.workers)


@pytest.fixture(scope="module")
def reviews():
    settings = Settings(root=ROOT)
    return settings, [review_sheet(s, settings) for s in load_fleet([VEHICLES]).sheets]


def test_parallel_and_serial_builds_are_byte_identical(reviews):
    settings, done = reviews
    serial = generate(done, settings, Workers(None, 1)).files
    parallel = generate(done, settings, Workers(None, 2)).files
    assert sum(name.startswith("figures/") for name in serial) > 20
    assert serial == parallel


def test_cache_key_follows_matplotlib_version_and_styles(monkeypatch):
    data = {"zones": ["front"], "scores": [90]}
    before = FigureCache.key("zones", data)
    monkeypatch.setattr(figures, "MATPLOTLIB", "0.0-other")
    assert FigureCache.key("zones", data) != before
    monkeypatch.undo()
    monkeypatch.setitem(figures.STYLE, "font.size", 11)
    assert FigureCache.key("zones", data) != before
    monkeypatch.undo()
    monkeypatch.setitem(svgchart.STYLE, "size", 11)  # the charts written as SVG directly have their own style
    assert FigureCache.key("zones", data) != before


def test_figures_no_page_uses_are_evicted(reviews, tmp_path):
    settings, done = reviews
    cache = FigureCache(tmp_path)
    generate(done, settings, cache)
    stale = tmp_path / "zones-0000.svg"
    stale.write_bytes(b"<svg/>")
    kept = sorted(p.name for p in tmp_path.glob("*.svg") if p != stale)
    generate(done, settings, FigureCache(tmp_path))
    assert not stale.exists() and sorted(p.name for p in tmp_path.glob("*.svg")) == kept
