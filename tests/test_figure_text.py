"""Figures draw sheet text literally: matplotlib's math syntax in a name or label is just text.

Before, ``name: "Price $\\foo$ tag"`` passed ``check`` but stopped ``site build`` with a
mathtext ParseFatalException, and ``$x^2$`` was typeset as math (issue 14, item 6).
"""

from __future__ import annotations

from html import unescape

from conftest import run_cli
from site_helpers import copy_knowledge_base


def test_math_syntax_in_sheet_text_is_drawn_literally(tmp_path):
    kb = copy_knowledge_base(tmp_path / "kb")
    for revision in ("r1", "r2"):
        sheet = kb / f"vehicles/tessel/{revision}.yaml"
        text = sheet.read_text(encoding="utf-8").replace("name: Maroska Tessel", r"name: 'Price $\foo$ tag $x^2$'")
        sheet.write_text(text.replace("label: steady RANS", r"label: $\frac{a}{b}$ steady RANS"), encoding="utf-8")
    assert run_cli("check", kb / "vehicles").code in (0, 1)
    run = run_cli("site", "build", "--config", kb / "mkdocs.yml", "--output", tmp_path / "out")
    assert run.code == 0, run.err
    figures = [unescape(p.read_text(encoding="utf-8")) for p in (tmp_path / "out").rglob("*.svg")]
    assert any(r"Price $\foo$ tag $x^2$: revision trends" in svg for svg in figures)  # title, as typed
    assert any(r"Yaw sweep: $\frac{a}{b}$ steady RANS" in svg for svg in figures)


def test_study_column_text_in_the_calibration_chart_is_escaped_and_literal():
    """A study table's column name reaches the calibration chart; the SVG must stay well-formed XML
    (W3C SVG 1.1 is an XML language, so ElementTree must parse it) and show the name as typed."""
    from xml.etree import ElementTree

    from aeroreview.site import fitcharts

    label = "gap <5 mm & $x^2$ [per mm]"
    svg = fitcharts.calibration_slopes({"slopes": [{"label": label, "fit": 1.2, "ci95": [0.4, 2.0], "library": None}]})
    texts = [t.text for t in ElementTree.fromstring(svg).iter("{http://www.w3.org/2000/svg}text")]
    assert label in texts and "library silent" in texts


def test_the_library_marker_has_a_legend_entry_when_the_first_row_has_none():
    """The diamonds of the library's values are named in the legend even when the first parameter
    has no library value (the legend used to label only row 0)."""
    from xml.etree import ElementTree

    from aeroreview.site import fitcharts

    rows = [{"label": "a", "fit": 1.0, "ci95": [0.5, 1.5], "library": None},
            {"label": "b", "fit": 2.0, "ci95": [1.5, 2.5], "library": 1.8}]
    texts = [t.text for t in ElementTree.fromstring(fitcharts.calibration_slopes({"slopes": rows}))
             .iter("{http://www.w3.org/2000/svg}text")]
    assert "rule library" in texts and "team data: fit and 95 % interval" in texts
