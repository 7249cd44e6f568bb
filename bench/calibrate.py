"""Benchmark: calibrate a large parametric study, beside one plain least-squares fit.

A synthetic study (5,000 rows x 25 parameters, each mapped to a quantity feature of the
catalogue, Gaussian noise; invented, seeded) is written as CSV and run through the same path
as `aeroreview calibrate STUDY --model both --folds 5`: reading and validating the table,
the statsmodels OLS fit with intervals, and 5-fold cross-validation of the linear and the
quadratic surface (25 squares and 300 pairwise interactions). The floor is one
`numpy.linalg.lstsq` of the same linear table. Target: under 10 s on this machine.

    python bench/calibrate.py
"""

from __future__ import annotations

import tempfile
import time
from pathlib import Path

import numpy as np

from aeroreview import catalogue
from aeroreview.calibrate import fit_study
from aeroreview.study import read_study

ROWS, PARAMETERS, FOLDS = 5000, 25, 5


def synthetic_study(folder: Path) -> tuple[Path, list[str]]:
    """A seeded study: uniform parameters inside each feature's typical range, Cd linear plus noise."""
    rng = np.random.default_rng(2026)
    features = [f for f in catalogue.FEATURES if f.kind == "quantity" and f.typical][:PARAMETERS]
    assert len(features) == PARAMETERS, "the catalogue has fewer quantity features than the benchmark maps"
    columns, maps = {}, []
    for i, feature in enumerate(features):
        low, high = feature.typical
        columns[f"p{i:02d}"] = rng.uniform(low, high, ROWS)
        maps.append(f"p{i:02d}={feature.key}")
    slopes = rng.normal(0, 0.002, PARAMETERS) / np.array([np.ptp(v) or 1.0 for v in columns.values()])
    cd = 0.30 + sum(s * (v - v.mean()) for s, v in zip(slopes, columns.values())) + rng.normal(0, 0.001, ROWS)
    path = folder / "study.csv"
    header = ",".join([*columns, "Cd"])
    table = np.column_stack([*columns.values(), cd])
    np.savetxt(path, table, delimiter=",", header=header, comments="", fmt="%.6g")
    return path, maps


def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        path, maps = synthetic_study(Path(tmp))
        best = {"read": 1e9, "fit": 1e9, "lstsq": 1e9}
        for _ in range(3):  # best of three, each figure measured in the same run
            start = time.perf_counter()
            study = read_study(path, maps)
            read = time.perf_counter() - start
            start = time.perf_counter()
            fit = fit_study(study, "both", FOLDS)
            fitted = time.perf_counter() - start
            design = np.column_stack([np.ones(study.rows), study.x])
            start = time.perf_counter()
            np.linalg.lstsq(design, study.y, rcond=None)
            lstsq = time.perf_counter() - start
            best = {"read": min(best["read"], read), "fit": min(best["fit"], fitted),
                    "lstsq": min(best["lstsq"], lstsq)}
    total = best["read"] + best["fit"]
    print(f"{'rows':>6} {'params':>6} {'read s':>7} {'fit s':>7} {'total s':>8} {'lstsq s':>8} {'ratio':>8}")
    print(f"{study.rows:>6} {PARAMETERS:>6} {best['read']:>7.2f} {best['fit']:>7.2f} {total:>8.2f} "
          f"{best['lstsq']:>8.4f} {total / best['lstsq']:>8.0f}")
    print(f"cv R^2: linear {fit.surfaces['linear'].cv_r2:.3f}, quadratic {fit.surfaces['quadratic'].cv_r2:.3f}; "
          f"target: total under 10 s ({'met' if total < 10 else 'NOT met'})")


if __name__ == "__main__":
    main()
