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
from aeroreview.units import to_si
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



def test_report_data_are_plain_values_with_the_engine_numbers_rounded():
    """Every value is a JSON type (no tuples, dataclasses or numpy scalars) and every float shows at
    most 10 significant digits: 130 km/h read as 36.111111111111114 m/s and shown again in km/h is
    130.00000000000003 in IEEE 754 double arithmetic, and must read 130.0."""
    speed = to_si("130 km/h", "km/h")
    assert speed * 3.6 != 130.0  # the engine's own figure is not round
    reviews = [review_sheet(s, Settings(reference_speed=speed)) for s in load_fleet([VEHICLES]).sheets]
    data = report.as_json(reviews, [], "failure")
    plain = (str, int, float, bool, type(None))
    seen = []

    def walk(value, path):
        if isinstance(value, dict):
            for key, item in value.items():
                walk(item, f"{path}.{key}")
        elif type(value) is list:
            for item in value:
                walk(item, f"{path}[]")
        else:
            assert type(value) in plain, f"{path} holds a {type(value).__name__}"
            if type(value) is float:
                seen.append(path)
                assert value == float(f"{value:.10g}"), f"{path} = {value!r} is not rounded"

    walk(data, "")
    assert any(".key_numbers." in path for path in seen) and any(".consequences." in path for path in seen)
    assert {sheet["key_numbers"]["reference_speed_km_h"] for sheet in data["sheets"]} == {130.0}
