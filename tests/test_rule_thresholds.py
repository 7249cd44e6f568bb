"""Rules under the team's own thresholds: overrides never crash a check."""

from __future__ import annotations

from conftest import VEHICLES, run_cli


def config_file(tmp_path, rules_section: str):
    config = tmp_path / "mkdocs.yml"
    config.write_text("site_name: t\nplugins:\n  - aeroreview:\n      sheets: " + str(VEHICLES) + "\n"
                      "      rules:\n" + rules_section, encoding="utf-8")
    return config


def test_a_critical_region_up_to_the_end_of_the_ahmed_curve_is_checked(tmp_path):
    """Bug 1: critical_high 40 deg made the rule read the Ahmed curve at 41 deg and crash.

    The curve is published from 0 to 40 deg (Ahmed, Ramm and Faltin 1984, SAE 840300), so a
    region reaching 40 deg is a legitimate team setting; the check must finish and report.
    """
    config = config_file(tmp_path, "        rear.backlight-angle: {thresholds: {critical_high: 40 deg}}\n")
    run = run_cli("check", VEHICLES / "tessel" / "r1.yaml", "--config", config, "--format", "json")
    assert "internal error" not in run.err
    assert run.code in (0, 1), run.err
    assert "rear.backlight-angle" in run.out


def _fleet():
    from aeroreview.sheet import load_fleet

    return load_fleet([VEHICLES]).sheets


def _ends():
    from aeroreview.rules import all_rules

    for rule in all_rules().values():
        for threshold in rule.thresholds:
            for end in threshold.allowed_range:
                yield rule, threshold, end


ENDS = list(_ends())


def test_every_threshold_at_either_end_of_its_range_runs_without_raising():
    """Each threshold of each rule, alone at the low and the high end of its allowed range,
    on every demo revision: the rule reports a verdict (whatever it is), it never raises."""
    from aeroreview.review import run_rule
    from aeroreview.rules import Context
    from aeroreview.settings import Settings
    from aeroreview.units import to_si

    air = Settings().air()
    sheets = _fleet()
    crashed = []
    for rule, threshold, end in ENDS:
        value = to_si(f"{end!r} {threshold.unit}".strip(), threshold.unit)
        context = Context({**rule.defaults(), threshold.name: value}, 130 / 3.6, air.density, air.kinematic_viscosity,
                          rule.effects)
        for sheet in sheets:
            if not rule.applies(sheet):
                continue
            try:
                run_rule(rule, sheet, context, rule.severity)
            except Exception as error:  # noqa: BLE001 - any exception is the defect this test looks for
                crashed.append(f"{rule.id} {threshold.name}={end:g} {threshold.unit} on {sheet.label}: {error!r}")
    assert len(ENDS) > 100
    assert not crashed, "\n".join(crashed)


def test_an_override_outside_the_allowed_range_is_a_located_input_error(tmp_path):
    config = config_file(tmp_path, "        rear.backlight-angle: {thresholds: {critical_high: 120 deg}}\n")
    run = run_cli("check", VEHICLES / "tessel" / "r1.yaml", "--config", config)
    assert run.code == 2 and f"{config}:" in run.err and "outside its allowed range 0 to 90 deg" in run.err


def test_the_fix_text_takes_the_configured_thresholds(tmp_path):
    """The backlight's fix names the team's critical region (27 to 33 deg here), not the defaults."""
    import json

    config = config_file(tmp_path, "        rear.backlight-angle: {thresholds: {critical_low: 27 deg, "
                                   "critical_high: 33 deg}}\n")
    run = run_cli("check", VEHICLES / "tessel" / "r1.yaml", "--config", config, "--format", "json")
    fix = json.loads(run.out)["rules"]["rear.backlight-angle"]["fix"]  # findings name their rule; its fix is listed once
    assert "from 27 deg to 33 deg" in fix and "26 deg" not in fix, fix


def _restated_defaults():
    """(rule, threshold, text) where a rule's prose writes a threshold's default value instead of ``{name}``."""
    import re

    from aeroreview.rules import all_rules, parse_doc

    for rule in all_rules().values():
        fix_and_checks = {heading: text for heading, text in parse_doc(rule.check.__doc__ or "").items()
                          if heading in ("What it checks", "How to fix")}
        for threshold in rule.thresholds:
            number, _, unit = threshold.default.partition(" ")
            pattern = r"(?<![\d.])" + re.escape(number) + (r"\s*" + re.escape(unit) if unit else r"(?![\d.])")
            for heading, text in fix_and_checks.items():
                if re.search(pattern, text):
                    yield rule.id, threshold.name, heading


def test_no_fix_or_check_text_restates_a_default_threshold():
    """A team that moves a threshold must read its own value in the fix (write ``{name}``, DEVELOPERS.md)."""
    restated = [f"{rule_id}: '{heading}' writes the default of {name}; write {{{name}}}"
                for rule_id, name, heading in _restated_defaults()]
    assert not restated, "\n".join(restated)


def test_a_moved_threshold_moves_every_number_of_the_fix(tmp_path):
    """Rims closed to 15 % instead of 20 %: the finding's fix asks for 15 %."""
    import json

    config = config_file(tmp_path, "        wheels.rim-openness: {thresholds: {closed: 15 %}}\n")
    run = run_cli("check", VEHICLES / "tessel" / "r1.yaml", "--config", config, "--format", "json")
    fix = json.loads(run.out)["rules"]["wheels.rim-openness"]["fix"]
    assert "close the rim face to 15 % or less" in fix and "20 %" not in fix, fix
