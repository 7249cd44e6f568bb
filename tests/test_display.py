"""One display helper per unit: the factors agree with pint, and no rule converts by hand.

The reference for every factor is pint's unit registry (the library the sheets are read with),
so a helper cannot drift from the unit it names.
"""

from __future__ import annotations

import re

import pytest

from aeroreview import display
from aeroreview.units import UNITS
from conftest import ROOT

SI = {"mm": "m", "cm^2": "m^2", "m^2": "m^2", "deg": "rad", "%": "dimensionless", "km/h": "m/s", "kg": "kg"}
HELPERS = [unit for unit in vars(display).values() if isinstance(unit, display.Unit)]


@pytest.mark.parametrize("unit", [u for u in HELPERS if u.symbol in SI], ids=lambda u: u.symbol)
def test_each_helper_converts_by_the_factor_pint_gives(unit):
    assert unit.per_si == pytest.approx(UNITS.Quantity(1.0, SI[unit.symbol]).to(unit.symbol).magnitude, rel=1e-12)


def test_a_drag_count_is_a_thousandth_of_a_coefficient():
    """1 drag count = 0.001 of Cd (common practice; the convention in DESIGN.md)."""
    assert display.COUNTS(0.0125, 1) == "12.5 counts"


def test_a_reading_shows_value_limit_and_the_margin_from_the_limit_crossed():
    gap = display.Reading(0.0072, display.MM, at_most=0.005, places=1)
    assert gap.beyond and gap.shown() == {"measured": "7.2 mm", "limit": "<= 5 mm", "margin": "+2.2 mm"}
    rake = display.Reading(-0.0349066, display.DEG, at_least=0.0174533, at_most=0.20944, places=1)  # -2, 1, 12 deg
    assert rake.below and not rake.above and rake.bound == "1-12 deg" and rake.margin == "-3.0 deg"
    inside = display.Reading(0.5, display.PERCENT, at_least=0.2, at_most=0.9)
    assert not inside.beyond and inside.margin is None and inside.shown("half")["measured"] == "half"


# A conversion written into an f-string by hand: {x * 1000:.0f}, {x * 100:+.1f}, {x / 0.001:g}, {x * 3.6:.0f}.
HAND = re.compile(r"\*\s*(?:1000|100|3\.6|1e4)\s*:|/\s*0\.001\s*:|\{math\.degrees\([^)]*\):")


def test_no_rule_converts_a_unit_by_hand_for_display():
    found = [f"{path.name}:{number}: {line.strip()}" for path in sorted((ROOT / "rules").glob("*.py"))
             for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1) if HAND.search(line)]
    assert not found, "use the helpers in aeroreview/display.py (MM, DEG, PERCENT, ...):\n" + "\n".join(found)


# A finding asks for action unless it passes or is not assessed: one definition (aeroreview.rules.actionable).
STATUS_PAIR = re.compile(r"""in \(\s*["']pass["'],\s*NOT_ASSESSED\s*\)""")


def test_the_actionable_test_is_written_once():
    found = [f"{path.relative_to(ROOT)}:{number}" for folder in ("aeroreview", "rules")
             for path in sorted((ROOT / folder).rglob("*.py"))
             for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1)
             if STATUS_PAIR.search(line)]
    assert not found, "use Finding.actionable or aeroreview.rules.actionable(status): " + ", ".join(found)


@pytest.mark.parametrize("value, limit, measured, margin", [
    (0.0252, 0.025, "2.52 %", "+0.02 %"),  # read at one decimal it would be "2.5 %" against "<= 2.5 %"
    (0.02500004, 0.025, "2.5000 %", "+0.0000 %"),  # at most three more decimals
    (0.0410, 0.025, "4.1 %", "+1.6 %"),  # plainly past: as many decimals as asked
    (0.0240, 0.025, "2.4 %", "-0.1 %"),  # inside: as asked
])
def test_a_value_past_its_limit_never_reads_as_the_limit(value, limit, measured, margin):
    """A warning on '2.5 % against <= 2.5 %' reads as a false alarm; the reading shows the digits that
    tell them apart (arithmetic: 2.52 - 2.5 = 0.02)."""
    shown = display.Reading(value, display.PERCENT, at_most=limit, places=1, limit_places=1).shown()
    assert (shown["measured"], shown["limit"], shown["margin"]) == (measured, "<= 2.5 %", margin)


@pytest.mark.parametrize("score, shown", [(24.5, "25"), (24.4, "24"), (0.0, "0"), (99.5, "100"), (None, "none")])
def test_a_score_reads_as_a_whole_number_halves_up(score, shown):
    """Halves up, as a score is read (and unlike format's half-to-even, which reads 24.5 as 24)."""
    assert display.whole_score(score, "none") == shown


@pytest.mark.parametrize("rule_id, fragment", [
    ("wheels.rim-openness", "{features: {wheels.rim_openness: 35.2 %}}"),  # limit 35 %
    ("rear.decklid-angle", "{features: {rear.decklid_angle: 8.04 deg}}"),  # limit 8 deg
    ("windshield.angle", "{features: {windshield.angle: 33.04 deg}}"),  # limit 33 deg
    ("underbody.nose-rake", "{features: {underbody.nose_rake: 12.04 deg}}"),  # limit 12 deg
    ("wheels.wheelhouse-gap", "{features: {wheels.wheelhouse_gap: 50.2 mm}}"),  # limit 50 mm
])
def test_a_rule_that_words_its_own_measured_text_shows_the_crossing_too(rule_id, fragment):
    """Just past the limit (each rule's default, rules/), the finding's measured value differs from
    its limit as printed: '35.2 % open' against '<= 35 %', never '35 % open'."""
    from aeroreview.review import review_sheet
    from aeroreview.settings import Settings
    from test_rule_examples import sheet_with

    finding = next(f for f in review_sheet(sheet_with(fragment), Settings()).findings if f.rule.id == rule_id)
    number = r"[-+]?\d+(?:\.\d+)?"
    measured, limits = re.search(number, finding.verdict.measured).group(), re.findall(number, finding.verdict.limit)
    assert finding.status != "pass" and float(measured) not in [float(x) for x in limits], \
        (finding.verdict.measured, finding.verdict.limit)
