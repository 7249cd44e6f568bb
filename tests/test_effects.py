"""An effect range is declared once: the rule page's source text and the finding's counts share it.

Before, a rule said "effect: 2-8 counts" in its sources and wrote ``counts_range(2, 8)`` again
in its code; the two drifted (a taper quoted at 1-2 counts per degree was costed at 0.8-2.0, a
yaw rise quoted as "half the rise" was costed at a quarter to a half). Now a rule declares an
:class:`aeroreview.rules.Effect` and both the text and the numbers come from it. These tests
read the rule modules' source (the ``ast`` module of the standard library) and run the rules'
own documented examples.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

from aeroreview.rules import Context, Effect, all_rules, rule
from test_rule_examples import EXAMPLES, sheet_with

RULES = Path(__file__).resolve().parents[1] / "rules"
ZONE_MODULES = sorted(path for path in RULES.glob("*.py") if path.name != "__init__.py")
HOW = ("declare the range once in the rule's sources as Effect(low, high, '{low}-{high} counts; ...', kind) and cost "
       "it with ctx.effect().counts()")


def _calls(path: Path):
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Call):
            yield node


def _name(call: ast.Call) -> str:
    function = call.func
    return function.attr if isinstance(function, ast.Attribute) else getattr(function, "id", "")


@pytest.mark.parametrize("path", ZONE_MODULES, ids=lambda path: path.name)
def test_no_rule_writes_an_effect_range_as_text_beside_its_code(path):
    for call in _calls(path):
        if _name(call) == "Source" and call.args and isinstance(call.args[0], ast.Constant):
            text = str(call.args[0].value)
            assert not (text.startswith("effect:") and re.search(r"\d", text)), \
                f"{path.name}:{call.lineno}: an effect range written as a Source: {HOW}"


@pytest.mark.parametrize("path", ZONE_MODULES, ids=lambda path: path.name)
def test_no_rule_writes_its_counts_by_hand(path):
    for call in _calls(path):
        assert _name(call) != "counts_range", f"{path.name}:{call.lineno}: counts_range in a rule: {HOW}"
        for keyword in call.keywords:
            assert not (keyword.arg == "counts" and isinstance(keyword.value, ast.Tuple)), \
                f"{path.name}:{call.lineno}: a literal counts tuple: {HOW}"
        if _name(call) == "counts":
            literal = [node for arg in call.args for node in ast.walk(arg)
                       if isinstance(node, ast.Constant) and type(node.value) in (int, float)]
            assert not literal, f"{path.name}:{call.lineno}: a bare number scales an effect; name what it is"


def test_an_effect_shows_its_range_in_its_text():
    effect = Effect(0.5, 2, "{low}-{high} counts, and wind noise; recalled, not checked", "from memory")
    assert effect.source.citation == "effect: 0.5-2 counts, and wind noise; recalled, not checked"
    assert effect.source.kind == "from memory"
    assert effect.counts() == (0.5, 2.0)
    assert effect.counts(3) == (1.5, 6.0)
    assert effect.counts(2, 4) == (1.0, 8.0)


@pytest.mark.parametrize("text, low, high", [("2-8 counts; from memory", 2, 8),  # the range is not in the text
                                             ("about {low} counts", 1, 9),  # half the range hidden
                                             ("{low}-{high} counts", 8, 2),  # reversed
                                             ("{low}-{high} counts", -1, 2)])  # a fix never adds drag
def test_a_malformed_effect_is_refused(text, low, high):
    with pytest.raises(ValueError):
        Effect(low, high, text, "from memory")


def test_a_rule_reads_its_effects_by_name_from_its_context():
    rules = all_rules()
    spoiler = rules["rear.spoiler"]
    assert sorted(spoiler.effects) == ["effect", "tall"]
    context = Context({}, 36.1, 1.2, 1.5e-5, spoiler.effects)
    assert context.effect("tall") is spoiler.effects["tall"]
    with pytest.raises(KeyError, match="no effect named 'short'"):
        context.effect("short")


def test_two_effects_of_one_rule_need_two_names():
    with pytest.raises(ValueError, match="two effects share a name"):
        rule("sides.test-only-duplicate", "t", "advisory",
             sources=(Effect(1, 2, "{low}-{high} counts", "from memory"),
                      Effect(2, 3, "{low}-{high} counts", "from memory")))(lambda sheet, ctx: None)


FAILING = [(rule_id, fragment) for rule_id, status, fragment in EXAMPLES if status != "pass"]


@pytest.mark.parametrize("rule_id, fragment", FAILING, ids=[rule_id for rule_id, _ in FAILING])
def test_every_costed_finding_cites_its_effect(rule_id, fragment):
    """A rule's failing example that carries drag counts names where its range comes from."""
    from aeroreview.review import review_sheet
    from aeroreview.settings import Settings

    finding = next(f for f in review_sheet(sheet_with(fragment), Settings()).findings if f.rule.id == rule_id)
    if finding.verdict.counts:
        cited = [source.citation for source in all_rules()[rule_id].sources]
        assert any(citation.startswith("effect:") for citation in cited), f"{rule_id} costs a fix it cites no effect for"


@pytest.mark.parametrize("pitch, counts", [("-1.5 deg", (2.0, 6.0)), ("-2.5 deg", (4.0, 12.0))])
def test_the_pitch_effect_is_per_degree_as_its_text_and_sensitivity_say(pitch, counts):
    """'2-6 counts per degree nose-up past the limit' (rules/underbody.py, -0.5 deg): 1 and 2 degrees
    past give 2-6 and 4-12 counts; before, every nose-up pitch cost 2-6 whatever its size."""
    from aeroreview.review import review_sheet
    from aeroreview.settings import Settings

    sheet = sheet_with("{features: {underbody.pitch: %s}}" % pitch)
    finding = next(f for f in review_sheet(sheet, Settings()).findings if f.rule.id == "underbody.pitch")
    assert finding.verdict.counts == counts
