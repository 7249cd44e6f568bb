"""Every rule documents itself with examples that the suite runs.

A rule's docstring ends with an ``Examples (...)`` block: YAML fragments that change the
demo's clean revision (vehicles/tessel/r2.yaml; ``features`` are merged, other keys
replaced), each with the status the rule must then report, at least one that fails and one
that passes. The expected statuses follow the rule's own thresholds and their sources.
"""

from __future__ import annotations

import pytest
import yaml

from aeroreview import yamldoc
from aeroreview.review import review_sheet
from aeroreview.rules import all_rules
from aeroreview.settings import Settings
from aeroreview.sheet import from_document
from conftest import VEHICLES

BASE = VEHICLES / "tessel" / "r2.yaml"
HOW = ("add to the end of its docstring (after 'Known limits:') a block\n"
       "    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):\n"
       "        fails (warning): {features: {zone.feature: 20 deg}}\n"
       "        passes: {features: {zone.feature: 15 deg}}\n"
       "with at least one failing and one passing YAML fragment (see DEVELOPERS.md, 'A rule')")


@pytest.mark.parametrize("rule_id", sorted(all_rules()))
def test_every_rule_has_a_failing_and_a_passing_example(rule_id):
    statuses = {status for status, _ in all_rules()[rule_id].examples}
    assert "pass" in statuses and statuses - {"pass"}, f"{rule_id} has no failing and passing example: {HOW}"


EXAMPLES = [(rule_id, status, fragment) for rule_id, rule in sorted(all_rules().items())
            for status, fragment in rule.examples]


def sheet_with(fragment: str):
    data = yaml.safe_load(BASE.read_text(encoding="utf-8"))
    change = yaml.safe_load(fragment)
    data["features"].update(change.pop("features", {}))
    data.update(change)
    return from_document(yamldoc.parse(yaml.safe_dump(data, sort_keys=False), str(BASE)), BASE.parent)


@pytest.mark.parametrize("rule_id, expected, fragment", EXAMPLES, ids=[f"{r}-{s}" for r, s, _ in EXAMPLES])
def test_rule_example(rule_id, expected, fragment):
    review = review_sheet(sheet_with(fragment), Settings())
    found = {f.rule.id: f.status for f in review.findings}
    assert found.get(rule_id) == expected, f"{rule_id} on {fragment}: {found.get(rule_id)}, expected {expected}"
