"""Coefficient histories: statistics against closed forms, the settling rule, bad input.

References named in each test: the AR(1) process (Box, Jenkins & Reinsel, Time Series
Analysis, 4th ed., on AR(1) (chapter not checked): rho_k = phi^k) with its integrated autocorrelation time
(1 + phi) / (1 - phi) and its exact variance of the mean; statsmodels' acf as an independent
autocorrelation; White 1997 (MSER) for the truncation of a level shift.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from statsmodels.tsa.stattools import acf

from aeroreview.results import history
from aeroreview.rules.result_quality import Convergence, convergence_limits, convergence_reasons


def ar1(n: int, phi: float, sigma: float, rng, replicas: int | None = None) -> np.ndarray:
    """A stationary AR(1) series x_t = phi x_{t-1} + e_t (started from its stationary law)."""
    shape = (n,) if replicas is None else (replicas, n)
    noise = rng.normal(0.0, sigma, shape)
    x = np.empty(shape)
    x[..., 0] = noise[..., 0] / np.sqrt(1 - phi**2)
    for t in range(1, n):
        x[..., t] = phi * x[..., t - 1] + noise[..., t]
    return x


def write_history(path, steps, columns: dict[str, np.ndarray], header="# Iter " , comma=False):
    names = list(columns)
    with open(path, "w") as out:
        out.write("# force coefficients of an invented test run\n")
        out.write((",".join(["iter", *names]) if comma else header + " ".join(names)) + "\n")
        for i, step in enumerate(steps):
            cells = [f"{step:g}", *(f"{columns[n][i]:.7f}" for n in names)]
            out.write((",".join(cells) if comma else " ".join(cells)) + "\n")
    return path


@pytest.mark.parametrize("phi", [0.5, 0.9])
def test_effective_sample_size_of_ar1_matches_closed_form(phi):
    """AR(1): tau = (1 + phi) / (1 - phi), so n_eff = n (1 - phi) / (1 + phi) (Box, Jenkins & Reinsel)."""
    n = 200_000
    x = ar1(n, phi, 1.0, np.random.default_rng(7))
    expected = n * (1 - phi) / (1 + phi)
    assert history.effective_sample_size(x) == pytest.approx(expected, rel=0.06)


def test_autocorrelation_matches_statsmodels():
    """Cross-check with statsmodels.tsa.stattools.acf (the same biased estimator)."""
    x = ar1(5000, 0.7, 1.0, np.random.default_rng(3))
    np.testing.assert_allclose(history.autocorrelation(x)[:60], acf(x, nlags=59, fft=True), atol=1e-10)


def test_standard_error_matches_exact_variance_of_the_mean_of_ar1():
    """Var(mean) of AR(1) with marginal variance s2: (s2 / n) [1 + 2 sum_{k<n} (1 - k/n) phi^k], closed form
    (s2 / n) [(1 + phi) / (1 - phi) - 2 phi (1 - phi^n) / (n (1 - phi)^2)] (Box, Jenkins & Reinsel, chapter not checked)."""
    n, phi, sigma, replicas = 2000, 0.8, 1.0, 600
    s2 = sigma**2 / (1 - phi**2)
    exact = s2 / n * ((1 + phi) / (1 - phi) - 2 * phi * (1 - phi**n) / (n * (1 - phi) ** 2))
    x = ar1(n, phi, sigma, np.random.default_rng(11), replicas)
    assert np.var(x.mean(axis=1)) == pytest.approx(exact, rel=0.15)  # the simulation itself agrees
    estimated = [np.var(row, ddof=1) / history.effective_sample_size(row) for row in x]
    assert np.mean(estimated) == pytest.approx(exact, rel=0.15)


def test_mser_finds_a_level_shift():
    """White 1997: MSER truncates where a start-up bias ends; here a 40-count shift over the first 500 rows."""
    rng = np.random.default_rng(5)
    series = 0.3 + rng.normal(0, 0.002, 3000)
    series[:500] += 0.04
    end = history.mser_truncation(series)
    assert 500 <= end <= 600  # all of the bias removed, at most a few noisy batches more
    batches = series.reshape(-1, 5).mean(axis=1)  # the rule's definition, evaluated directly
    g = [np.sum((batches[d:] - batches[d:].mean()) ** 2) / (len(batches) - d) ** 2 for d in range(len(batches) - 5)]
    assert end == 5 * int(np.argmin(g))


def test_settled_mean_within_its_standard_error_over_many_runs(tmp_path):
    """A known transient (50 counts decaying with an e-folding of 60 iterations) on AR(1) noise around
    Cd 0.300: the settled mean falls within 1 standard error about as often as a normal estimate
    should (68 %), and within 2 in nearly every run, so both the truncation and the error bar are
    honest. (A transient that decays much more slowly than the noise leaves MSER a residual bias
    of a fraction of a standard error; the rule's known limits say so.)"""
    within1 = within2 = 0
    runs = 40
    for seed in range(runs):
        rng = np.random.default_rng(100 + seed)
        steps = np.arange(1, 4001)
        cd = 0.300 + 0.05 * np.exp(-steps / 60) + ar1(len(steps), 0.8, 0.0015, rng)
        result = history.settle(history.read_history(write_history(tmp_path / "h.dat", steps, {"Cd": cd})))
        c = result.coefficients["cd"]
        within1 += abs(c.mean - 0.300) <= c.std_error
        within2 += abs(c.mean - 0.300) <= 2 * c.std_error
    assert within1 / runs >= 0.5 and within2 / runs >= 0.9


def test_drift_and_peak_to_peak_in_counts(tmp_path):
    """A linear drift of 2 counts per 1000 iterations and a sine of 6 counts peak to peak, no noise."""
    steps = np.arange(1, 5001)
    cd = 0.25 + 0.002 * steps / 1000 + 0.003 * np.sin(steps / 7.0)
    result = history.settle(history.read_history(write_history(tmp_path / "h.csv", steps, {"cd": cd}, comma=True)))
    data = history.as_json(result)
    assert data["coefficients"]["cd"]["drift_counts_per_1000"] == pytest.approx(2.0, rel=0.02)
    assert data["coefficients"]["cd"]["peak_to_peak_counts"] == pytest.approx(6.0 + 2.0 * (5000 - result.start) / 1000,
                                                                             abs=0.3)
    assert data["verdict"] == "not converged" and any("drift" in r for r in data["reasons"])


def test_time_history_drift_per_unit_time(tmp_path):
    steps = np.arange(1, 3001) * 0.001  # s
    cl = 0.1 + 0.004 * steps  # 4 counts per second
    result = history.settle(history.read_history(write_history(tmp_path / "h.dat", steps, {"Cl": cl}, header="# Time ")))
    entry = history.as_json(result)["coefficients"]["cl"]
    assert result.history.is_time and entry["drift_counts_per_unit_time"] == pytest.approx(4.0, rel=1e-3)
    assert entry["drift_counts_per_1000"] == pytest.approx(4.0 * 0.001 * 1000, rel=1e-3)  # per 1000 samples


def test_unsettled_run_is_not_converged(tmp_path):
    """A transient that lasts the whole run: MSER-5 puts its end past half the run (White 1997)."""
    steps = np.arange(1, 1001)
    cd = 0.3 + 0.05 * np.exp(-steps / 2000) + np.random.default_rng(1).normal(0, 1e-4, 1000)
    result = history.settle(history.read_history(write_history(tmp_path / "h.dat", steps, {"Cd": cd})))
    assert result.verdict == "not converged" and any("has not ended" in r for r in result.reasons)


@pytest.mark.parametrize("error, expected", [(0.0005, []), (0.000501, ["standard error"])])
def test_convergence_threshold_boundary(error, expected):
    """The data-quality thresholds: 0.5 counts of standard error on Cd passes, just above fails."""
    reasons = convergence_reasons(Convergence(1000, 500, 501, (("cd", error, 0.0),)), convergence_limits())
    assert [r for r in expected if not any(r in got for got in reasons)] == [] and len(reasons) == len(expected)


@pytest.mark.parametrize("rows, start, settles", [(1000, 500, True), (1000, 505, False), (1003, 500, True),
                                                  (1009, 505, False), (1014, 505, True)])
def test_transient_end_in_the_first_half_is_whites_criterion(rows, start, settles):
    """White 1997: with k batches of 5, a truncation at batch d* > k // 2 means the run is too short.
    The rule checks the end row against half the rows; both agree on every run length."""
    k, d = rows // 5, start // 5
    assert (d <= k // 2) == settles
    reasons = convergence_reasons(Convergence(rows, rows - start, float(start), ()), convergence_limits())
    assert (not any("has not ended" in r for r in reasons)) == settles


def test_columns_found_by_name_or_given(tmp_path, cli):
    steps = np.arange(1, 301)
    path = write_history(tmp_path / "h.dat", steps, {"Cx_total": np.full(300, 0.3), "Lift": np.full(300, 0.1)})
    out = cli("results", "history", path, "--columns", "cd=Cx_total,cl=3", "--json")
    data = json.loads(out.out)
    assert out.code == 0 and set(data["coefficients"]) == {"cd", "cl"} and data["rows"] == 300
    assert data["coefficients"]["cd"]["mean"] == pytest.approx(0.3) and data["settled_from"] == 1


# -- bad input: a located message, exit 2 ---------------------------------------------
BAD = {
    "empty": ("", "is empty"),
    "header only": ("# Iter Cd Cl\n", "a header but no rows"),
    "csv header only": ("iter,cd\n", "a header but no rows"),
    "word": ("# Iter Cd\n1 0.3\n2 0.31\n3 abc\n", ":4:3: 'abc' in column 'Cd' is not a number"),
    "ragged": ("iter,cd\n1,0.3\n2\n", ":3:1: this row has 1 values, the header 2"),
    "not finite": ("# Iter Cd\n1 0.3\n2 nan\n3 inf\n", "2 value(s) are not finite"),
    "short": ("# Iter Cd\n" + "".join(f"{i} 0.3\n" for i in range(1, 40)), "MSER-5 needs at least 50"),
    "no coefficient": ("# Iter Mass\n1 3\n2 4\n", "no coefficient columns found (columns: Iter, Mass)"),
    "step repeats": ("# Iter Cd\n1 0.3\n2 0.3\n2 0.3\n", ":4:1: the step column 'Iter' does not increase"),
}


@pytest.mark.parametrize("case", sorted(BAD))
def test_bad_history_is_refused_with_a_clear_message(case, tmp_path, cli):
    text, message = BAD[case]
    path = tmp_path / "forces.dat"
    path.write_text(text)
    run = cli("results", "history", path)
    assert run.code == 2 and message in run.err and "Traceback" not in run.err, run.err


@pytest.mark.parametrize("option, message", [("bogus=Cd", "unknown keys bogus"), ("cd=Nope", "no column 'Nope'"),
                                             ("cd", "write KEY=COLUMN pairs")])
def test_bad_columns_option(option, message, tmp_path, cli):
    path = write_history(tmp_path / "h.dat", np.arange(1, 101), {"Cd": np.full(100, 0.3)})
    run = cli("results", "history", path, "--columns", option)
    assert run.code == 2 and message in run.err


def test_the_sheet_accepts_exactly_the_coefficients_a_history_can_find():
    """sections.py sits below results/ and cannot import it, so the two lists are kept equal here."""
    from aeroreview.results.history import COEFFICIENT_NAMES
    from aeroreview.sections import HISTORY_COEFFICIENTS
    assert tuple(COEFFICIENT_NAMES) == HISTORY_COEFFICIENTS
