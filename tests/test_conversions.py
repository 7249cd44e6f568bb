"""The table of common unit conversions agrees with pint, and a run that needs no other never imports it.

The reference is pint's own unit registry with its default definitions (pint's ``default_en.txt``),
the library every other conversion goes through.
"""

from __future__ import annotations

import subprocess
import sys

import pytest

from aeroreview import units
from aeroreview.conversions import KNOWN
from conftest import VEHICLES


@pytest.mark.parametrize(("written", "canonical"), sorted(KNOWN))
def test_each_entry_is_the_conversion_pint_gives(written, canonical):
    assert KNOWN[(written, canonical)] == units._conversion(written, canonical)  # the same floats, bit for bit


def test_pairs_outside_the_table_still_go_through_pint():
    assert ("yd", "mm") not in KNOWN
    assert units.to_si("2 yd", "mm") == pytest.approx(1.8288, rel=1e-12)  # 1 yd = 0.9144 m exactly (NIST SP 811)
    with pytest.raises(units.UnitProblem):
        units.to_si("27 %", "deg")  # a fraction is not an angle, although pint calls both dimensionless


def test_checking_the_demo_fleet_does_not_import_pint(tmp_path):
    code = ("import sys\nfrom aeroreview.cli import main\n"
            f"main(['check', {str(VEHICLES)!r}, '--output', {str(tmp_path / 'report.txt')!r}])\n"
            "print('pint' in sys.modules)")
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert run.stdout.strip() == "False", run.stderr
