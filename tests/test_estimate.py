"""The combination model, the cost-weighted score and the track record.

Reference points outside the project: the combination rule as the issue states it,
D x (1 - prod(1 - min(e_i, D) / D)), worked by hand and recomputed with ``math.prod``;
summary statistics recomputed with Python's ``statistics`` module; the 40 % ceiling on the
demo's problem revision (a practitioner's sanity limit quoted in the issue).
"""

from __future__ import annotations

import json
import math
import statistics

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from aeroreview.estimate import Claim, Frame, claim_of, combine, combined, plain_sum
from aeroreview.review import review_sheet
from aeroreview.rules import REGIONS, SEVERITIES, all_rules
from aeroreview.settings import RuleOverride, Settings, load_settings
from aeroreview.sheet import load_fleet, load_sheet
from aeroreview.track_record import pairs, summary
from conftest import VEHICLES

PROBLEM = load_sheet(VEHICLES / "tessel" / "r1.yaml")


def test_combine_worked_example():
    """Budget 30 counts, fixes of 10 and 20: 30 x (1 - (1 - 10/30)(1 - 20/30)) = 23.33 (by hand)."""
    assert combine([10, 20], 30) == pytest.approx(30 * (1 - (2 / 3) * (1 / 3)))
    assert combine([45], 30) == pytest.approx(30)  # a single fix never claims more than the budget
    assert combine([], 30) == 0 and combine([5], 0) == 0


claims = st.builds(Claim, st.text("abcdefgh", min_size=1, max_size=3), st.sampled_from(tuple(REGIONS)),
                   st.floats(0, 60), st.floats(0, 60)).map(
    lambda c: Claim(c.rule, c.region, min(c.low, c.high), max(c.low, c.high)))
frames = st.builds(lambda cd, floor, shares: Frame(cd, floor, {r: cd * 1000 * s for r, s in zip(REGIONS, shares)}),
                   st.floats(0.2, 0.5), st.floats(0.15, 0.35), st.lists(st.floats(0, 0.2), min_size=7, max_size=7))
ENDS = ("low", "mid", "high")


@settings(max_examples=120, deadline=None)
@given(st.lists(claims, max_size=12), claims, frames)
def test_adding_a_finding_never_lowers_the_combined_saving(found, extra, frame):
    for end in ENDS:
        assert combined(found + [extra], frame, end) >= combined(found, frame, end) - 1e-9


@settings(max_examples=120, deadline=None)
@given(st.lists(claims, max_size=12), frames)
def test_combined_saving_within_plain_sum_and_gap_to_floor(found, frame):
    for end in ENDS:
        saving = combined(found, frame, end)
        assert 0 <= saving <= plain_sum(found, end) + 1e-9
        assert saving <= max(0.0, (frame.cd - frame.floor_cd) * 1000) + 1e-9


@settings(max_examples=120, deadline=None)
@given(st.lists(st.floats(0.5, 40), min_size=2, max_size=8), st.floats(5, 80))
def test_fixes_in_one_region_combine_to_less_than_their_sum(effects, budget):
    saving = combine(effects, budget)
    assert saving < sum(effects)
    assert saving == pytest.approx(budget * (1 - math.prod(1 - min(e, budget) / budget for e in effects)))


def test_backlight_separation_edge_and_spoiler_share_the_rear_budget():
    review = review_sheet(PROBLEM, Settings())
    rear = [claim_of(f) for f in review.findings
            if f.rule.id in ("rear.backlight-angle", "rear.separation-edge", "rear.spoiler")]
    assert all(c and c.region == "rear" for c in rear)
    assert review.estimate.regions["rear"] < sum(c.mid for c in rear)
    assert review.estimate.regions["rear"] <= review.frame.budgets["rear"] + 1e-9


def test_problem_revision_estimate_holds_up():
    """Tessel r1 (CFD of record, Cd 0.301): high saving at most 40 % of Cd, mid Cd not below the floor, waterfall
    ends at mid."""
    review = review_sheet(PROBLEM, Settings())
    e = review.estimate
    assert e.cd == pytest.approx(0.301)
    assert e.high <= 0.40 * 301
    assert e.cd_after["mid"] >= e.floor_cd
    assert e.cd - sum(step for _, step in e.waterfall) / 1000 == pytest.approx(e.cd_after["mid"])
    assert all(step >= -1e-9 for _, step in e.waterfall)
    assert e.plain_sum_high > e.high and e.low <= e.mid <= e.high
    assert [rule for rule, _ in e.waterfall] == [f.rule.id for f in review.ranked_fixes if f.counts[1] > 0]


def test_every_costed_rule_declares_its_flow_region():
    fleet = load_fleet([VEHICLES])
    for sheet in fleet.sheets:
        for finding in review_sheet(sheet, Settings()).findings:
            if finding.counts and finding.counts[1] > 0:
                assert finding.rule.region in REGIONS, finding.rule.id
    rules = all_rules()
    assert rules["front.air-dam"].region == "underbody" and rules["rear.roof-rails"].region == "appendages"
    assert {rules[r].region for r in rules if r.startswith("data.")} == {None}


@pytest.mark.parametrize("rule_id", list(all_rules()))
def test_lowering_a_rules_severity_never_raises_the_score(rule_id):
    """The score weighs cost only: a lower severity changes statuses, never the score upward."""
    before = review_sheet(PROBLEM, Settings())
    for severity in SEVERITIES[:SEVERITIES.index(all_rules()[rule_id].severity)]:
        after = review_sheet(PROBLEM, Settings(overrides={rule_id: RuleOverride(severity=severity)}))
        assert after.score <= before.score + 1e-9
        for zone, zone_score in after.zones.items():
            if zone_score.score is not None:
                assert zone_score.score <= before.zones[zone].score + 1e-9


def test_severity_changes_statuses_but_not_the_score():
    lowered = Settings(overrides={"rear.backlight-angle": RuleOverride(severity="advisory")})
    before, after = review_sheet(PROBLEM, Settings()), review_sheet(PROBLEM, lowered)
    status = {f.rule.id: f.status for f in after.findings}
    assert status["rear.backlight-angle"] == "advisory"
    assert after.score == pytest.approx(before.score)


def test_score_weighs_cost_and_ignores_data_quality():
    review = review_sheet(PROBLEM, Settings())
    assert 0 <= review.score < 25 and review.zones["data"].score is None and review.confidence == 1
    clean = load_sheet(VEHICLES / "tessel" / "r2.yaml")
    advisories = [f.rule.id for f in review_sheet(clean, Settings()).findings if f.status not in ("pass", "not assessed")]
    nothing_left = review_sheet(clean, Settings(overrides={r: RuleOverride(disabled=True) for r in advisories}))
    assert nothing_left.score == 100 and nothing_left.estimate.mid == 0


def test_estimates_settings_override_the_table(tmp_path):
    config = tmp_path / "mkdocs.yml"
    config.write_text("site_name: t\nplugins:\n  - aeroreview:\n      estimates:\n        floors: {fastback: 0.25}\n"
                      "        regions: {rear: {share: 0.1}}\n", encoding="utf-8")
    review = review_sheet(PROBLEM, load_settings(config))
    default = review_sheet(PROBLEM, Settings())
    assert review.frame.floor_cd == pytest.approx(default.frame.floor_cd + 0.05)  # fastback floor 0.20 -> 0.25
    assert review.frame.budgets["rear"] == pytest.approx(301 * 0.1 * 0.35)  # r1's Cd of record [counts] x share x recoverable
    config.write_text("site_name: t\nplugins:\n  - aeroreview:\n      estimates:\n        floors: {fastbak: 0.25}\n",
                      encoding="utf-8")
    from conftest import run_cli
    run = run_cli("check", VEHICLES / "tessel" / "r2.yaml", "--config", config)
    assert run.code == 2 and f"{config}:5:" in run.err and "unknown vehicle class 'fastbak'" in run.err


PAIR_BASE = """\
id: duo
revision: {revision}
{parent}features:
  vehicle.class: hatchback
  dimensions.length: 4.3 m
  dimensions.width: 1.80 m
  dimensions.height: 1.48 m
  dimensions.frontal_area: 2.20 m^2
  mass.curb: 1500 kg
  powertrain.kind: electric
  rear.backlight_angle: {backlight}
  underbody.panel_coverage: {coverage}
results:
  - kind: tunnel
    label: full-scale tunnel
    speed: {speed}
    cd: {cd}
"""


def write_pair(folder, child_cd: float, child_speed: str = "140 km/h"):
    (folder / "r1.yaml").write_text(PAIR_BASE.format(revision="r1", parent="", backlight="29 deg", coverage="50 %",
                                                     speed="140 km/h", cd=0.330), encoding="utf-8")
    (folder / "r2.yaml").write_text(PAIR_BASE.format(revision="r2", parent="parent: r1\n", backlight="20 deg",
                                                     coverage="90 %", speed=child_speed, cd=child_cd), encoding="utf-8")
    return folder


def test_track_record_within_range_both_ways(tmp_path, cli):
    """A parent at Cd 0.330 whose child fixes backlight and underbody: a measured change inside the
    predicted range is within it, one 10 counts beyond the high end is not."""
    write_pair(tmp_path, 0.330)
    fleet = load_fleet([tmp_path])
    # The settings the CLI reads (./mkdocs.yml, its calibrations included).
    (pair,) = pairs([review_sheet(s, load_settings()) for s in fleet.sheets])
    low, mid, high = pair.predicted
    assert low <= mid <= high < 0  # the fixes predict a drop of Cd
    for child_cd, inside in ((0.330 + mid / 1000, True), (0.330 + (high + 10) / 1000, False),
                             (0.330 + (low - 10) / 1000, False)):
        write_pair(tmp_path, round(child_cd, 5))
        run = cli("check", tmp_path, "--format", "json")
        data = json.loads(run.out)
        (entry,) = data["pairs"]
        assert set(entry) == {"vehicle", "from", "to", "kind", "measured_delta_counts", "predicted_delta_counts",
                              "within_range"}
        assert (entry["vehicle"], entry["from"], entry["to"], entry["kind"]) == ("duo", "r1", "r2", "tunnel")
        assert entry["predicted_delta_counts"] == {"low": round(low, 1), "mid": round(mid, 1), "high": round(high, 1)}
        assert entry["measured_delta_counts"] == pytest.approx((child_cd - 0.330) * 1000, abs=0.06)
        assert entry["within_range"] is inside
        assert data["track_record"]["pairs"] == 1 and data["track_record"]["within_range_share"] == float(inside)


def test_pairs_need_the_same_kind_and_speeds_within_ten_percent(tmp_path):
    write_pair(tmp_path, 0.31, child_speed="160 km/h")  # 14 % faster
    fleet = load_fleet([tmp_path])
    assert pairs([review_sheet(s, Settings()) for s in fleet.sheets]) == []
    write_pair(tmp_path, 0.31, child_speed="150 km/h")  # 7 % faster
    fleet = load_fleet([tmp_path])
    assert len(pairs([review_sheet(s, Settings()) for s in fleet.sheets])) == 1


def test_demo_track_record_and_json_keys(cli, tmp_path):
    config = tmp_path / "mkdocs.yml"
    config.write_text("site_name: x\n", encoding="utf-8")
    data = json.loads(cli("check", VEHICLES, "--format", "json", "--config", config).out)
    assert {(p["vehicle"], p["from"], p["to"]) for p in data["pairs"]} == {
        ("tessel", "r1", "r2"), ("quillon", "r1", "r2"), ("dravik", "r1", "r2")}
    record = data["track_record"]
    assert set(record) == {"pairs", "mean_abs_error_counts", "bias_counts", "within_range_share"}
    errors = [p["predicted_delta_counts"]["mid"] - p["measured_delta_counts"] for p in data["pairs"]]
    assert record["mean_abs_error_counts"] == pytest.approx(statistics.mean(abs(e) for e in errors), abs=0.1)
    assert record["bias_counts"] == pytest.approx(statistics.mean(errors), abs=0.1)
    assert record["within_range_share"] == pytest.approx(statistics.mean(p["within_range"] for p in data["pairs"]),
                                                         abs=1e-3)
    for p in data["pairs"]:
        d = p["predicted_delta_counts"]
        assert d["low"] <= d["mid"] <= d["high"]
    for sheet in data["sheets"]:
        assert set(sheet["recoverable_counts"]) == {"low", "mid", "high", "plain_sum_low", "plain_sum_high", "floor_cd"}
        assert set(sheet["cd_after"]) == {"low", "mid", "high"}
        saving = sheet["recoverable_counts"]
        assert saving["low"] <= saving["mid"] <= saving["high"] <= saving["plain_sum_high"]
        assert sheet["cd_after"]["low"] <= sheet["cd_after"]["mid"] <= sheet["cd_after"]["high"]
        for value in (*saving.values(), *sheet["cd_after"].values()):
            assert value == round(value, 4)  # rounded: no 130.00000000000003


def test_summary_statistics_by_hand():
    """Two pairs with errors +4 and -2 counts: MAE 3, bias +1, one of two inside (by hand)."""
    from aeroreview.track_record import Pair
    found = [Pair("v", "r1", "r2", "cfd", 0.300, 0.290, (-8.0, -6.0, -2.0)),
             Pair("v", "r2", "r3", "cfd", 0.290, 0.280, (-15.0, -12.0, -9.0))]
    assert [p.within_range for p in found] == [False, True]
    assert summary(found) == {"pairs": 2, "mean_abs_error_counts": pytest.approx(3.0), "bias_counts": pytest.approx(1.0),
                              "within_range_share": 0.5}


def test_site_pages_show_the_combined_figures_and_the_track_record():
    """Pages format the engine's numbers: the combined estimate, the waterfall floor, predicted against measured."""
    from aeroreview.site.figures import FigureCache
    from aeroreview.site.pages import generate
    from conftest import ROOT

    settings = Settings(root=ROOT)
    reviews = [review_sheet(s, settings) for s in load_fleet([VEHICLES]).sheets]
    site = generate(reviews, settings, FigureCache(None))
    record = site.files["fleet/track-record.md"]
    assert "3 pair(s): mean absolute error" in record and "figures/track-record-" in record
    for vehicle in ("tessel", "quillon", "dravik"):
        assert f"[{vehicle}](../fleet/{vehicle}/index.md) | r1 | r2 |" in record
    tessel = next(p for p in pairs(reviews) if p.vehicle == "tessel")
    low, mid, high = tessel.predicted
    diff = site.files["fleet/tessel/r1-to-r2.md"]
    assert "## Predicted against measured" in diff and f"{low:+.1f} / {mid:+.1f} / {high:+.1f} counts" in diff
    assert f"{tessel.measured:+.1f} counts, {'inside' if tessel.within_range else 'outside'} the predicted range" in diff
    e = next(r for r in reviews if r.sheet.label == "tessel@r1").estimate
    page = site.files["fleet/tessel/r1.md"]
    assert f"| Recoverable drag, combined | {e.mid:.1f} counts (low {e.low:.1f}, high {e.high:.1f}) |" in page
    assert f"| Plain sum of the findings | {e.plain_sum_low:.1f}-{e.plain_sum_high:.1f} counts (plain sum" in page
    assert f"| {e.mid:.1f} ({e.low:.1f}-{e.high:.1f}) |" in site.files["fleet/tessel/index.md"]
    waterfall = next(v for k, v in site.files.items() if k.startswith("figures/waterfall-")
                     and f"{e.cd:.3f} to about {e.cd_after['mid']:.3f}".encode() in v)
    assert f"floor of the class: Cd {e.floor_cd:.3f}".encode() in waterfall
