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
