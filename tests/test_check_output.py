"""The check command's cost and layout: no heavy library imported where nothing needs it,
compact JSON with the rules listed once, text coloured only on request."""

from __future__ import annotations

import json
import re
import subprocess
import sys

import pytest

from aeroreview import report
from aeroreview.review import review_sheet
from aeroreview.settings import Settings
from aeroreview.sheet import load_fleet
from conftest import ROOT, VEHICLES

HEAVY = ("pandas", "matplotlib", "trimesh", "mkdocs")
PROBE = """
import sys
from aeroreview.cli import main
try:
    main(sys.argv[1:])
except SystemExit:  # --version exits through argparse
    pass
print("IMPORTED:" + ",".join(sorted({name.split(".")[0] for name in sys.modules} & set(%r))), file=sys.stderr)
""" % (HEAVY,)


def heavy_imports(*args: str) -> list[str]:
    """The heavy top-level packages a fresh interpreter holds after ``aeroreview ARGS``."""
    done = subprocess.run([sys.executable, "-c", PROBE, *args], capture_output=True, text=True, cwd=ROOT, timeout=120)
    line = next(line for line in done.stderr.splitlines() if line.startswith("IMPORTED:"))
    return [name for name in line.removeprefix("IMPORTED:").split(",") if name]


@pytest.mark.parametrize("args", [("--version",), ("check", "vehicles/quillon"),
                                  ("check", "vehicles/quillon", "--format", "json")])
def test_commands_that_draw_and_measure_nothing_import_no_heavy_library(args):
    assert all(sheet.geometry is None for sheet in load_fleet([VEHICLES / "quillon"]).sheets)  # no surface named
    assert heavy_imports(*args) == []


def test_the_import_probe_sees_a_heavy_library_when_one_is_used():
    assert "trimesh" in heavy_imports("measure", "vehicles/tessel/surface/tessel-r2.ply")


@pytest.fixture(scope="module")
def demo_data():
    reviews = [review_sheet(s, Settings()) for s in load_fleet([VEHICLES]).sheets]
    return report.as_json(reviews, [], "failure")


def test_json_is_compact_by_default_and_indented_with_pretty(cli):
    compact = cli("check", VEHICLES, "--format", "json")
    pretty = cli("check", VEHICLES, "--format", "json", "--pretty")
    assert compact.out.count("\n") == 1 and pretty.out.count("\n") > 1000
    assert json.loads(compact.out) == json.loads(pretty.out)


def test_findings_refer_to_rules_listed_once(demo_data):
    rules = demo_data["rules"]
    for sheet in demo_data["sheets"]:
        for finding in sheet["findings"]:
            assert "fix" not in finding and "sources" not in finding
            assert rules[finding["rule"]]["sources"] and rules[finding["rule"]]["fix"]
            assert rules[finding["rule"]]["zone"] == finding["zone"]
    named = {f["rule"] for sheet in demo_data["sheets"] for f in sheet["findings"]}
    assert set(rules) == named


def test_colour_only_adds_styles(demo_data):
    """Stripping the ECMA-48 SGR sequences (ESC [ params m) from the coloured text gives the plain text."""
    plain, coloured = report.as_text(demo_data, color=False), report.as_text(demo_data, color=True)
    assert "\x1b[" not in plain and "\x1b[1;31m" in coloured
    assert re.sub(r"\x1b\[[0-9;]*m", "", coloured) == plain
