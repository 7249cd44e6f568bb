"""Coefficient histories: where a CFD run settled, and what its coefficients are worth.

A solver's force monitor writes one row per iteration (or time step): the step, then the
coefficients. Averaging from the start mixes the start-up transient into the mean, so the
settled part is found first with MSER-5 (the marginal standard error rule on batch means
of 5: White 1997, "An effective truncation heuristic for bias reduction in simulation
output", Simulation 69(6), 323-334; batched as in White, Cobb & Spratt 2000, "A comparison
of five steady-state truncation heuristics for simulation", Proc. 2000 Winter Simulation
Conference, 755-760). Over the settled part each coefficient gets its mean, the standard
error of that mean with the autocorrelation taken into account (effective sample size from
Geyer's initial monotone sequence estimator: Geyer 1992, "Practical Markov chain Monte
Carlo", Statistical Science 7(4), 473-483), the drift (least-squares slope) and the
peak-to-peak oscillation. The verdict is the data-quality rule's own judgement
(:func:`aeroreview.rules.result_quality.convergence_reasons`) of the statistics the sheet keeps.
"""

from __future__ import annotations

import io
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from aeroreview.problems import InputError, Problem
from aeroreview.rules.result_quality import Convergence, convergence_limits, convergence_reasons

COUNT = 0.001  # one drag count (common practice, as aeroreview.calc.forces.COUNT)
MSER_BATCH = 5  # batch size of MSER-5 (White, Cobb & Spratt 2000)
MSER_TAIL = 5  # batches at the end never taken as the start: g(d) -> 0 there by construction (common practice)
MIN_BATCHES = 10  # below 10 batches of 5 there is no first half to search (common practice)
MAX_BYTES = 256 * 2**20  # a force monitor of a million rows is well under this (common practice)

# Column names as solvers write them, compared with case, spaces and punctuation removed.
STEP_NAMES = ("iter", "iteration", "iterations", "step", "timestep", "time", "t", "flowtime", "physicaltime")
TIME_NAMES = ("time", "t", "flowtime", "physicaltime")
COEFFICIENT_NAMES = {
    "cd": ("cd", "cdrag", "cx", "cdtotal"),
    "cl": ("cl", "clift", "cz", "cltotal"),
    "cl_front": ("clfront", "clf", "clfrontaxle"),
    "cl_rear": ("clrear", "clr", "clrearaxle"),
    "cs": ("cs", "cy", "cside"),
}


def _plain(name: str) -> str:
    return re.sub(r"[^a-z0-9]", "", name.lower())


@dataclass
class History:
    """A coefficient history as read: the step column and the coefficients found in it."""

    file: str
    step_name: str
    is_time: bool
    steps: np.ndarray
    values: dict[str, np.ndarray]  # our key (cd, cl, ...) -> series
    columns: dict[str, str] = field(default_factory=dict)  # our key -> the file's column name


@dataclass(frozen=True)
class Coefficient:
    """One coefficient over the settled part of a run."""

    mean: float
    std_error: float
    effective_size: float
    drift_per_1000: float  # coefficient units per 1000 iterations (per 1000 samples for time histories)
    drift_per_time: float | None  # coefficient units per unit of time, for time histories
    peak_to_peak: float


@dataclass
class Settled:
    """A history with its settled part found and its coefficients judged."""

    history: History
    start: int  # first settled row (the latest transient end over the coefficients)
    coefficients: dict[str, Coefficient]
    reasons: list[str] = field(default_factory=list)  # why it is not converged; empty means converged

    @property
    def settled_from(self) -> float:
        return float(self.history.steps[self.start])

    @property
    def settled_to(self) -> float:
        return float(self.history.steps[-1])

    @property
    def verdict(self) -> str:
        return "not converged" if self.reasons else "converged"

    @property
    def statistics(self) -> Convergence:
        """What the verdict reads, rounded as the sheet keeps it, so a sheet's data.convergence
        finding and this verdict are one judgement of the same numbers."""
        return Convergence(len(self.history.steps), len(self.history.steps) - self.start, self.settled_from,
                           tuple((key, _kept(c.std_error), _kept(c.drift_per_1000))
                                 for key, c in self.coefficients.items()))


def _kept(value: float) -> float:
    return float(f"{value:.4g}")  # 4 significant digits: a sheet's statistic, far finer than its thresholds


# -- reading ---------------------------------------------------------------------------
def refuse(file: str, message: str, hint: str = "", line: int = 1, column: int = 1) -> InputError:
    return InputError([Problem(file, line, column, message, hint)])


def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def _fields(line: str, comma: bool) -> list[tuple[int, str]]:
    """(1-based character column, text) of each field of a data or header line."""
    if not comma:
        return [(m.start() + 1, m.group()) for m in re.finditer(r"\S+", line)]
    out, start = [], 0
    for part in line.split(","):
        out.append((start + len(part) - len(part.lstrip()) + 1, part.strip().strip('"')))
        start += len(part) + 1
    return out


def _pick(header: list[str], wanted: str, file: str) -> int:
    """Index of a column named by the user: its name (exact or loosely) or its 1-based number."""
    if wanted.isdigit() and 1 <= int(wanted) <= len(header):
        return int(wanted) - 1
    for exact in (True, False):
        for i, name in enumerate(header):
            if (name == wanted) if exact else (_plain(name) == _plain(wanted)):
                return i
    raise refuse(file, f"no column '{wanted}' in the history", f"its columns are: {', '.join(header)}")


@dataclass
class Table:
    """A numeric table as read: column names, values (rows x columns), the file line of each row."""

    file: str
    header: list[str]
    values: np.ndarray
    lines: list[int]


def read_table(path: str | Path) -> Table:
    """Read a CSV or whitespace table with ``#`` comment lines.

    The header is the first line if it is not numeric, else the last comment line with as
    many names as the data has columns (as solvers' force monitors write it).
    """
    path = Path(path)
    name = str(path)
    if not path.is_file():
        raise refuse(name, "no such file", "check the path")
    if path.stat().st_size > MAX_BYTES:
        raise refuse(name, f"the file is {path.stat().st_size:,} bytes, over the limit of {MAX_BYTES:,}",
                      "keep the columns of coefficients only")
    try:
        text = path.read_text(encoding="utf-8-sig")
    except UnicodeDecodeError:
        raise refuse(name, "not a UTF-8 text table", "give a CSV or whitespace-separated table") from None
    comments: list[str] = []
    data: list[tuple[int, str]] = []
    for number, line in enumerate(text.splitlines(), start=1):
        stripped = line.strip()
        if stripped.startswith("#"):
            if not data:
                comments.append(stripped.lstrip("#").strip())
        elif stripped:
            data.append((number, line))
    if not data:
        raise refuse(name, "the file is empty" if not comments else "the file has a header but no rows",
                      "give the table after the run has written rows")
    comma = "," in data[0][1]
    first = [text for _, text in _fields(data[0][1], comma)]
    if not all(_is_number(cell) for cell in first):
        header, data = first, data[1:]
        if not data:
            raise refuse(name, "the file has a header but no rows", "give the table after the run has written rows")
    else:
        named = [c for c in comments if len(_fields(c, comma)) == len(first)]
        header = [t for _, t in _fields(named[-1], comma)] if named else [f"column {i + 1}" for i in range(len(first))]
    return Table(name, header, _numbers(data, len(header), comma, name, header), [number for number, _ in data])


def find_columns(table: Table, names: dict[str, tuple[str, ...]], given: dict[str, str], taken=()) -> dict[str, int]:
    """Column index for each key: named by the user (``given``), else found by its usual
    ``names`` among the columns not ``taken``."""
    unknown = sorted(set(given) - set(names))
    if unknown:
        raise refuse(table.file, f"--columns names unknown keys {', '.join(unknown)}", f"use {', '.join(names)}")
    chosen = {key: _pick(table.header, wanted, table.file) for key, wanted in given.items()}
    for key, usual in names.items():
        if key not in chosen:
            found = [i for i, column in enumerate(table.header)
                     if _plain(column) in usual and i not in chosen.values() and i not in taken]
            if found:
                chosen[key] = found[0]
    return chosen


def read_history(path: str | Path, columns: dict[str, str] | None = None) -> History:
    """Read a coefficient history; the first column is the step (iteration or time) unless
    ``columns`` names ``iter``, coefficients are found by name or named in ``columns``."""
    table = read_table(path)
    given = dict(columns or {})
    step = _pick(table.header, given.pop("iter"), table.file) if "iter" in given else 0
    chosen = {"iter": step, **find_columns(table, COEFFICIENT_NAMES, given, taken={step})}
    if len(chosen) == 1:
        raise refuse(table.file, f"no coefficient columns found (columns: {', '.join(table.header)})",
                      "name them with --columns, e.g. --columns cd=Cd,cl=Cl")
    steps = table.values[:, chosen["iter"]]
    if np.any(np.diff(steps) <= 0):
        row = int(np.argmax(np.diff(steps) <= 0)) + 1
        raise refuse(table.file, f"the step column '{table.header[chosen['iter']]}' does not increase at this row",
                      "remove repeated rows of a restarted run, or name the step column with --columns iter=...",
                      line=table.lines[row])
    step_name = table.header[chosen["iter"]]
    return History(table.file, step_name, _plain(step_name) in TIME_NAMES, steps,
                   {key: table.values[:, i] for key, i in chosen.items() if key != "iter"},
                   {key: table.header[i] for key, i in chosen.items()})


def _numbers(data: list[tuple[int, str]], width: int, comma: bool, name: str, header: list[str]) -> np.ndarray:
    """The data rows as floats; ragged rows, words and non-finite numbers refused, located."""
    import pandas as pd

    for number, line in data:
        count = len(_fields(line, comma))
        if count != width:
            raise refuse(name, f"this row has {count} values, the header {width}", "every row needs one value per column",
                          line=number)
    table = pd.read_csv(io.StringIO("\n".join(line.strip() for _, line in data)), sep="," if comma else r"\s+",
                        header=None, dtype=str, skipinitialspace=True, na_filter=False)
    numeric = table.apply(pd.to_numeric, errors="coerce").to_numpy(dtype=float)
    words = np.isnan(numeric) & ~table.apply(lambda c: c.str.strip().str.lower().isin(["nan", "+nan", "-nan"])).to_numpy()
    if words.any():
        row, column = map(int, np.argwhere(words)[0])
        where, cell = _fields(data[row][1], comma)[column]
        raise refuse(name, f"'{cell}' in column '{header[column]}' is not a number",
                      f"{int(words.sum())} cell(s) like it; fix or remove the row", line=data[row][0], column=where)
    bad = ~np.isfinite(numeric)
    if bad.any():
        row, column = map(int, np.argwhere(bad)[0])
        raise refuse(name, f"{int(bad.sum())} value(s) are not finite (NaN or infinite), the first in column "
                      f"'{header[column]}'", "a diverged or restarted run; give the rows of a finite run",
                      line=data[row][0], column=_fields(data[row][1], comma)[column][0])
    return numeric


# -- statistics ------------------------------------------------------------------------
def mser_truncation(series: np.ndarray, batch: int = MSER_BATCH) -> int:
    """MSER-m transient end (row index).

    Batch means Z_1..Z_k of ``batch`` rows; d* minimises g(d) = sum_{j>d} (Z_j - mean_d)^2 / (k - d)^2,
    the squared marginal standard error of the truncated mean (White 1997). A d* past k/2
    means the run is too short for the transient to have ended (White 1997); for batches of 5,
    d* <= k // 2 exactly when the end row is at most half the rows, which the rule checks.
    """
    k = len(series) // batch
    if np.ptp(series) == 0:
        return 0  # a constant series has no transient (and g(d) = 0 everywhere)
    means = np.asarray(series[:k * batch], dtype=float).reshape(k, batch).mean(axis=1)
    remaining = np.arange(k, 0, -1, dtype=float)  # k - d for d = 0..k-1
    total = np.cumsum(means[::-1])[::-1]
    squares = np.cumsum((means - means.mean())[::-1] ** 2)[::-1]  # centred: no cancellation
    shift = total / remaining - means.mean()
    spread = squares - remaining * shift**2
    g = spread / remaining**2
    return int(np.argmin(g[:k - MSER_TAIL])) * batch


def autocorrelation(x: np.ndarray) -> np.ndarray:
    """Sample autocorrelation rho_0..rho_{n-1} (biased estimator, FFT, as statsmodels' acf)."""
    x = np.asarray(x, dtype=float) - np.mean(x)
    n = len(x)
    size = 1 << (2 * n - 1).bit_length()
    spectrum = np.fft.rfft(x, size)
    covariance = np.fft.irfft(spectrum * np.conj(spectrum), size)[:n]
    return covariance / covariance[0] if covariance[0] > 0 else np.eye(1, n)[0]


def effective_sample_size(x: np.ndarray) -> float:
    """n / tau with tau = -1 + 2 sum_m Gamma_m, Gamma_m = rho_2m + rho_2m+1 (Geyer 1992).

    The pair sums are kept while positive and made non-increasing (the initial monotone
    sequence); tau is floored at 1, so oscillation never claims more than n independent samples.
    For an AR(1) series tau -> (1 + phi) / (1 - phi).
    """
    rho = autocorrelation(x)
    n = len(rho)
    pairs = rho[0:n - 1:2] + rho[1:n:2]
    stop = np.flatnonzero(pairs <= 0)
    pairs = np.minimum.accumulate(pairs[:stop[0] if len(stop) else len(pairs)])
    tau = max(1.0, -1.0 + 2.0 * float(pairs.sum()))
    return n / tau


def _coefficient(steps, series, start, is_time) -> Coefficient:
    part, where = series[start:], steps[start:]
    size = effective_sample_size(part)
    slope = float(np.polyfit(where - where[0], part, 1)[0]) if np.ptp(where) > 0 else 0.0
    spacing = float(np.mean(np.diff(where))) if len(where) > 1 else 1.0
    return Coefficient(
        mean=float(part.mean()), std_error=float(part.std(ddof=1) / np.sqrt(size)), effective_size=size,
        drift_per_1000=slope * 1000 * (spacing if is_time else 1.0),
        drift_per_time=slope if is_time else None, peak_to_peak=float(np.ptp(part)))


def team_limits(settings) -> dict[str, float] | None:
    """The data.convergence thresholds of ``settings`` (with the team's overrides), so a verdict
    shown anywhere is the one ``check`` gives; None (the defaults) when the rule is disabled."""
    return next((context.thresholds for rule, context, _ in settings.rule_plan if rule.id == "data.convergence"), None)


def settle(history: History, limits: dict[str, float] | None = None) -> Settled:
    """Find the settled part of ``history`` and judge its coefficients (thresholds: ``limits``,
    default the data.convergence rule's)."""
    rows = len(history.steps)
    needed = MIN_BATCHES * MSER_BATCH
    if rows < needed:
        raise refuse(history.file, f"the run has {rows} rows; MSER-5 needs at least {needed} "
                      f"({MIN_BATCHES} batches of {MSER_BATCH}) to find the end of the start-up transient",
                      "give the whole history, or run longer")
    start = max(mser_truncation(series) for series in history.values.values())
    coefficients = {key: _coefficient(history.steps, series, start, history.is_time)
                    for key, series in history.values.items()}
    result = Settled(history, start, coefficients)
    result.reasons = convergence_reasons(result.statistics, limits or convergence_limits())
    return result


def as_json(result: Settled) -> dict:
    """The ``results history --json`` shape (coefficients and their spread in counts)."""
    out = {"file": Path(result.history.file).name, "rows": int(len(result.history.steps)),
           "settled_from": _number(result.settled_from), "coefficients": {}, "verdict": result.verdict,
           "reasons": result.reasons}
    for key, c in result.coefficients.items():
        entry = {"mean": round(c.mean, 6), "std_error": round(c.std_error, 7),
                 "drift_counts_per_1000": round(c.drift_per_1000 / COUNT, 4),
                 "peak_to_peak_counts": round(c.peak_to_peak / COUNT, 3)}
        if c.drift_per_time is not None:
            entry["drift_counts_per_unit_time"] = round(c.drift_per_time / COUNT, 4)
        out["coefficients"][key] = entry
    return out


def _number(value: float) -> int | float:
    return int(value) if float(value).is_integer() else value


def as_text(result: Settled) -> str:
    """A short readable summary."""
    h = result.history
    per = "1000 samples" if h.is_time else "1000 iterations"
    lines = [f"{Path(h.file).name}: {len(h.steps)} rows; settled from {h.step_name} = {_number(result.settled_from)} "
             f"(MSER-5) to {_number(result.settled_to)}"]
    for key, c in result.coefficients.items():
        lines.append(f"  {key:<9} mean {c.mean:.5f} +- {c.std_error / COUNT:.2f} counts (1 SE, {c.effective_size:.0f} "
                     f"effective samples); drift {c.drift_per_1000 / COUNT:+.2f} counts per {per}; "
                     f"peak-to-peak {c.peak_to_peak / COUNT:.1f} counts")
    lines.append(f"  verdict: {result.verdict}" + (": " + "; ".join(result.reasons) if result.reasons else ""))
    return "\n".join(lines) + "\n"
