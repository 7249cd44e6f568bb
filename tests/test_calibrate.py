"""Calibration: the rules' sensitivities, fitting a parametric study, and using the result.

External references: NIST StRD (Longley data, certified values), the Ahmed-body curve
(SAE 840300), Hucho 1998 (tyre width), and synthetic studies with known truth.
"""

from __future__ import annotations

import json

import pytest

from aeroreview.calc.references import ahmed_cd
from aeroreview.catalogue import BY_KEY
from aeroreview.rules import all_rules
from aeroreview.units import to_si

SENSITIVE = {rule.id: rule for rule in all_rules().values() if rule.sensitivity}


def test_rules_declare_sensitivities_in_their_features_units_and_ranges():
    assert {"underbody.diffuser-angle", "rear.backlight-angle", "wheels.rim-openness"} <= set(SENSITIVE)
    for rule in SENSITIVE.values():
        sens = rule.sensitivity
        feature = BY_KEY[sens.feature]
        to_si(f"1 {sens.unit}", feature.unit)  # raises UnitProblem on a unit of another dimension
        low, high = (to_si(v, sens.unit) for v in sens.valid)
        bounds = [to_si(v, feature.unit) for v in feature.bounds]
        assert bounds[0] <= low < high <= bounds[1], rule.id
        assert low <= rule.defaults()[sens.fix_to] <= high, f"{rule.id}: the fix target lies outside the valid range"
        assert sens.source.kind in ("published", "standard", "common practice", "from memory")


def test_backlight_sensitivity_follows_the_ahmed_curve_slope():
    # Ahmed, Ramm and Faltin 1984 (SAE 840300): attached-branch slope from 20 to 28 deg, scaled by
    # the rule's production-body factor 0.2-0.6.
    slope = float(ahmed_cd(28.0) - ahmed_cd(20.0)) / 8 * 1000
    value = SENSITIVE["rear.backlight-angle"].sensitivity.counts_per_unit
    assert 0.2 * slope <= value <= 0.6 * slope


def test_rules_json_lists_the_sensitivities(cli):
    run = cli("rules", "--format", "json")
    listed = {r["id"]: r["sensitivity"] for r in json.loads(run.out)}
    assert listed["underbody.diffuser-angle"]["unit"] == "deg"
    assert listed["underbody.diffuser-angle"]["counts_per_unit"] == pytest.approx(2.0)
    assert listed["underbody.diffuser-angle"]["source"]["kind"] == "from memory"
    assert listed["sides.door-handles"] is None
    assert "Sensitivity: +3.2 counts per deg" in cli("explain", "rear.backlight-angle").out
