"""The result data-quality rules: passing, failing and boundary cases (thresholds and sources
named in each rule's metadata in rules/data.py)."""

from __future__ import annotations

import pytest

from aeroreview.sheet import Result
from test_rules import CLEAN, status, with_features


def pair(cfd_cd: float, tunnel_cd: float, tunnel_scale: float = 1.0) -> list[Result]:
    return [Result("cfd", "steady RANS", 38.9, cfd_cd), Result("tunnel", "full scale", 38.9, tunnel_cd,
                                                                 scale=tunnel_scale)]


@pytest.mark.parametrize("cfd, tunnel, expected", [
    (0.232, 0.236, "pass"),          # 4 counts
    (0.232, 0.2419, "pass"),         # just inside the 10-count boundary
    (0.232, 0.2421, "warning"),      # just over 10 counts
    (0.232, 0.260, "warning"),
])
def test_cfd_tunnel_correlation(cfd, tunnel, expected):
    assert status("data.cfd-tunnel-correlation", with_features(results=pair(cfd, tunnel))) == expected


def test_correlation_compares_only_cfd_with_full_scale_tunnel():
    """Nothing to compare is no disagreement; a model-scale tunnel result is at another Reynolds number."""
    assert status("data.cfd-tunnel-correlation", with_features(results=pair(0.23, 0.30)[:1])) == "pass"
    assert status("data.cfd-tunnel-correlation", with_features(results=pair(0.23, 0.30, 0.25))) == "pass"


def result(cd: float, kind: str = "cfd", **more) -> Result:
    return Result(kind, more.pop("label", f"{kind} {cd}"), 38.9, cd, **more)


@pytest.mark.parametrize("cds, marked, expected", [
    ((0.232, 0.234), None, "pass"),       # 2 counts apart: at the boundary, repeats of one number
    ((0.232, 0.2341), None, "warning"),   # just over 2 counts, none marked
    ((0.232, 0.240), 1, "pass"),          # disagree, but one is marked of record
])
def test_result_of_record_rule(cds, marked, expected):
    results = [result(cd, of_record=i == marked) for i, cd in enumerate(cds)]
    assert status("data.result-of-record", with_features(results=results)) == expected


def test_an_estimate_never_calls_for_a_mark_beside_a_measurement():
    """The default order never picks an estimate when a measured result exists, so their gap is no choice."""
    results = [result(0.37, "estimate"), result(0.361, "tunnel")]
    assert status("data.result-of-record", with_features(results=results)) == "pass"


def test_the_marked_result_is_used_by_the_review_and_the_default_order_otherwise():
    """Default order (documented in rules/result_quality.py): full-scale tunnel or road, CFD, model-scale
    tunnel, estimate; the first listed within a kind. A mark overrides it."""
    from aeroreview.review import review_sheet
    from aeroreview.settings import Settings

    unmarked = [result(0.25, "estimate"), result(0.24, "tunnel", scale=0.25), result(0.233), result(0.236, "tunnel")]
    assert review_sheet(with_features(results=unmarked), Settings()).key_numbers.cd == 0.236
    marked = unmarked[:2] + [result(0.233, of_record=True)] + unmarked[3:]
    assert review_sheet(with_features(results=marked), Settings()).key_numbers.cd == 0.233


@pytest.mark.parametrize("wheels, ground, expected", [
    ("rotating", "moving", "pass"), ("fixed", "moving", "warning"), ("rotating", "fixed", "warning"),
    ("none", "moving", "warning"), ("", "moving", "advisory"), ("rotating", "", "advisory"),
])
def test_ground_simulation_of_the_result_of_record(wheels, ground, expected):
    """Wickern et al. 1997 (SAE 970133), Waeschle 2007 (SAE 2007-01-0107): fixed wheels or a fixed floor
    misrepresent wheel and underbody flow, so the result the fixes are costed on is judged."""
    results = [result(0.236, "tunnel", wheels=wheels, ground=ground)]
    assert status("data.ground-simulation", with_features(results=results)) == expected


def test_ground_simulation_judges_only_the_result_of_record_and_only_where_such_fixes_are_costed():
    fixed_floor = result(0.240, "tunnel", wheels="fixed", ground="fixed")
    belt = result(0.236, "cfd", wheels="rotating", ground="moving", of_record=True)
    assert status("data.ground-simulation", with_features(results=[fixed_floor, belt])) == "pass"
    assert status("data.ground-simulation", with_features(results=[result(0.25, "road")])) == "pass"
    no_wheels_or_underbody = with_features(results=[fixed_floor], **{
        key.replace(".", "__", 1): None for key in CLEAN.features if key.split(".")[0] in ("wheels", "underbody")})
    assert status("data.ground-simulation", no_wheels_or_underbody) == "pass"


def history_result(std_error: float, drift: float = 0.0, rows: int = 6000, settled: int = 5000) -> Result:
    return result(0.232, settled_from=float(rows - settled + 1), history_rows=rows, settled_rows=settled,
                  convergence=(("cd", std_error, drift), ("cl_rear", 0.0002, 0.0)))


@pytest.mark.parametrize("history, expected", [
    (history_result(0.0005), "pass"),                      # 0.5 counts: at the boundary (DRAG_RESOLUTION)
    (history_result(0.000501), "warning"),
    (history_result(0.0001, drift=0.001), "pass"),         # 1 count per 1000 iterations: at the boundary
    (history_result(0.0001, drift=-0.00101), "warning"),
    (history_result(0.0001, settled=200), "warning"),      # 200 rows settled, but in the second half (White 1997)
    (history_result(0.0001, rows=400, settled=200), "pass"),
    (history_result(0.0001, rows=398, settled=199), "warning"),
])
def test_convergence_rule_boundaries(history, expected):
    assert status("data.convergence", with_features(results=[history])) == expected


def test_convergence_rule_not_assessed_without_a_history():
    assert status("data.convergence", with_features(results=[result(0.232)])) == "not assessed"


def test_two_cfd_results_as_far_from_the_tunnel_do_not_crash_the_correlation_check():
    """Equal gaps used to make max() compare two results ("'>' not supported"); 0.232 and 0.232 against
    0.250 is 18 counts, over the 10-count threshold (rules/data.py)."""
    from aeroreview.review import review_sheet
    from aeroreview.settings import Settings
    from test_rule_examples import sheet_with

    sheet = sheet_with("{results: [{kind: cfd, label: rans a, cd: 0.232}, {kind: cfd, label: rans b, cd: 0.232}, "
                       "{kind: tunnel, label: full scale, cd: 0.250}]}")
    found = next(f for f in review_sheet(sheet, Settings()).findings if f.rule.id == "data.cfd-tunnel-correlation")
    assert found.status == "warning" and found.verdict.measured.startswith("|Cd CFD - Cd tunnel| = 18.0 counts")
