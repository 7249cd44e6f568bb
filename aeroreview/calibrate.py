"""Fit the rules' sensitivities on a team's parametric study, and compare them with the library's.

Sensitivities come from an ordinary least-squares fit of the response (drag counts) on the
mapped parameters (statsmodels OLS): each slope in counts per unit, its 95 % interval and
p-value. How much of the study's variation a response surface explains is judged out of
sample: k-fold cross-validated R^2 and RMSE (scikit-learn) for a linear surface and a
quadratic one (squares and pairwise interactions). The quadratic surface's slopes at the
study's centre are shown beside the linear ones; the linear slopes are the calibration.

Each fitted slope meets the library's (:class:`aeroreview.rules.Sensitivity`) with one of
:data:`VERDICTS`: ``agrees`` (the library value lies inside the 95 % interval),
``opposite sign`` (the interval excludes zero on the other side of the library's sign),
``differs in size`` (any other miss), ``library silent`` (no rule states a slope).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from aeroreview.problems import InputError, Problem
from aeroreview.rules import Rule, all_rules
from aeroreview.study import Study
from aeroreview.units import to_si

CONFIDENCE = 0.95
# Condition number of the standardised parameters above which the slopes trade off against each
# other (Belsley, Kuh and Welsch, Regression Diagnostics, 1980: indices over 30 signal strong
# dependence; from memory).
NEAR_COLLINEAR = 30.0
CV_SEED = 0  # fixed fold assignment, so one study always gives the same figures
MODELS = ("linear", "quadratic")
VERDICTS = ("agrees", "differs in size", "opposite sign", "library silent")


@dataclass(frozen=True)
class Slope:
    """One fitted sensitivity beside the library's."""

    column: str
    feature: str
    unit: str
    counts_per_unit: float
    ci95: tuple[float, float]
    p_value: float
    study_range: tuple[float, float]
    library_counts_per_unit: float | None
    library_rule: str | None
    agreement: str
    quadratic_slope_at_centre: float | None = None


@dataclass
class Surface:
    """A response surface judged out of sample."""

    cv_r2: float
    cv_rmse_counts: float
    predicted: np.ndarray  # out-of-fold prediction of each row [counts]


@dataclass
class Fit:
    study: Study
    folds: int
    surfaces: dict[str, Surface]
    slopes: list[Slope]
    residuals: np.ndarray  # of the linear least-squares fit, per row [counts]
    condition_number: float
    warnings: list[Problem] = field(default_factory=list)


def parameters(p: int, model: str) -> int:
    """Coefficients of a surface in ``p`` parameters, intercept included."""
    return 1 + p if model == "linear" else 1 + p + p * (p + 1) // 2


def rows_needed(p: int, model: str, folds: int) -> int:
    """Fewest rows that leave every training fold more rows than coefficients, and a residual."""
    need = parameters(p, model) + 1
    n = max(need, folds)
    while n - math.ceil(n / folds) < need:
        n += 1
    return n


def ols(x: np.ndarray, y: np.ndarray):
    """statsmodels OLS of ``y`` on ``x`` with an intercept (the intercept is coefficient 0)."""
    import statsmodels.api as sm  # loads only when a study is fitted

    return sm.OLS(y, sm.add_constant(x, has_constant="add")).fit()


def cross_validate(x: np.ndarray, y: np.ndarray, model: str, folds: int) -> Surface:
    """Out-of-fold predictions of a linear or quadratic surface, pooled into R^2 and RMSE."""
    from sklearn.linear_model import LinearRegression
    from sklearn.model_selection import KFold, cross_val_predict
    from sklearn.pipeline import make_pipeline
    from sklearn.preprocessing import PolynomialFeatures, StandardScaler

    steps = [StandardScaler()] + ([PolynomialFeatures(2, include_bias=False)] if model == "quadratic" else [])
    estimator = make_pipeline(*steps, LinearRegression())
    predicted = cross_val_predict(estimator, x, y, cv=KFold(folds, shuffle=True, random_state=CV_SEED))
    error = y - predicted
    spread = float(np.sum((y - y.mean()) ** 2))
    return Surface(1.0 - float(error @ error) / spread, float(np.sqrt(np.mean(error ** 2))), predicted)


def _centre_slopes(x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Slopes of the least-squares quadratic surface at the centre of the study's ranges."""
    from sklearn.linear_model import LinearRegression
    from sklearn.preprocessing import PolynomialFeatures

    centred = x - (x.min(axis=0) + x.max(axis=0)) / 2
    terms = PolynomialFeatures(2, include_bias=False).fit_transform(centred)
    return LinearRegression().fit(terms, y).coef_[: x.shape[1]]


def agreement(library: float | None, estimate: float, ci: tuple[float, float]) -> str:
    """The verdict on a library slope against a fitted slope and its interval."""
    low, high = ci
    if library is None:
        return "library silent"
    if low <= library <= high:
        return "agrees"
    if library != 0 and (low > 0 or high < 0) and math.copysign(1, estimate) != math.copysign(1, library):
        return "opposite sign"
    return "differs in size"


def unit_ratio(unit: str, reference: str, canonical: str) -> float:
    """How many ``reference`` units one ``unit`` is (both units of ``canonical``'s dimension)."""
    def size(u):
        return to_si(f"1 {u}", canonical) - to_si(f"0 {u}", canonical)
    return size(unit) / size(reference)


def library_slopes() -> dict[str, Rule]:
    """The first rule stating a sensitivity for each feature."""
    out: dict[str, Rule] = {}
    for rule in all_rules().values():
        if rule.sensitivity and rule.sensitivity.feature not in out:
            out[rule.sensitivity.feature] = rule
    return out


def _design_checks(study: Study, models, folds: int) -> tuple[float, list[Problem]]:
    """Refuse too few rows and perfectly collinear columns; warn when nearly collinear."""
    p = study.x.shape[1]
    need = max(rows_needed(p, m, folds) for m in ("linear", *models))
    widest = max(("linear", *models), key=lambda m: parameters(p, m))
    if study.rows < need:
        raise InputError([Problem(study.file, study.header_line, 1,
                                  f"{study.rows} usable rows are too few for the {widest} model in {p} parameter(s) "
                                  f"with {folds}-fold cross-validation: it needs at least {need} rows",
                                  "add variants, map fewer columns, use --model linear or fewer --folds")])
    scaled = (study.x - study.x.mean(axis=0)) / study.x.std(axis=0)
    design = np.column_stack([np.ones(study.rows), scaled])
    for j in range(p):
        if np.linalg.matrix_rank(design[:, : j + 2]) < j + 2:
            weights = np.linalg.lstsq(scaled[:, :j], scaled[:, j], rcond=None)[0]
            partners = [study.mappings[i].column for i in range(j) if abs(weights[i]) > 1e-8]
            column = study.mappings[j].column
            raise InputError([Problem(study.file, study.header_line, study.column_at[column],
                                      f"column '{column}' is a linear combination of {', '.join(map(repr, partners))}: "
                                      "perfectly collinear, so their sensitivities cannot be told apart",
                                      "vary the parameters independently in the study, or map only one of them")])
    condition = float(np.linalg.cond(scaled)) if p > 1 else 1.0
    warnings = []
    if condition > NEAR_COLLINEAR:
        warnings.append(Problem(study.file, study.header_line, 1,
                                f"the mapped parameters are nearly collinear (condition number {condition:.0f}, "
                                f"over {NEAR_COLLINEAR:.0f}): the slopes trade off and their intervals are wide",
                                "vary the parameters more independently (a factorial or Latin-hypercube design)",
                                "warning"))
    return condition, warnings


def fit_study(study: Study, model: str = "both", folds: int = 5) -> Fit:
    """Fit the study: linear sensitivities with intervals, cross-validated surfaces, agreement."""
    models = MODELS if model == "both" else (model,)
    condition, warnings = _design_checks(study, models, folds)
    result = ols(study.x, study.y)
    intervals = result.conf_int(alpha=1 - CONFIDENCE)
    surfaces = {m: cross_validate(study.x, study.y, m, folds) for m in models}
    centre = _centre_slopes(study.x, study.y) if "quadratic" in models else None
    library = library_slopes() if study.drag else {}
    slopes = []
    for j, mapping in enumerate(study.mappings):
        rule = library.get(mapping.feature)
        stated = None
        if rule:
            sens = rule.sensitivity
            stated = sens.counts_per_unit * unit_ratio(mapping.unit, sens.unit, sens.unit)
        estimate, ci = float(result.params[j + 1]), (float(intervals[j + 1][0]), float(intervals[j + 1][1]))
        slopes.append(Slope(mapping.column, mapping.feature, mapping.unit, estimate, ci, float(result.pvalues[j + 1]),
                            (float(study.x[:, j].min()), float(study.x[:, j].max())), stated,
                            rule.id if rule else None, agreement(stated, estimate, ci),
                            None if centre is None else float(centre[j])))
    return Fit(study, folds, surfaces, slopes, np.asarray(result.resid, dtype=float), condition,
               study.warnings + warnings)


def as_json(fit: Fit) -> dict:
    """The ``--json`` report."""
    study = fit.study
    return {
        "response": study.response, "rows": study.rows, "dropped_rows": len(study.dropped_lines),
        "ignored_columns": study.ignored, "folds": fit.folds, "condition_number": round(fit.condition_number, 2),
        "models": {name: {"cv_r2": _sig(s.cv_r2), "cv_rmse_counts": _sig(s.cv_rmse_counts)}
                   for name, s in fit.surfaces.items()},
        "sensitivities": [{"column": s.column, "feature": s.feature, "unit": s.unit,
                           "counts_per_unit": _sig(s.counts_per_unit), "ci95": [_sig(s.ci95[0]), _sig(s.ci95[1])],
                           "p_value": _sig(s.p_value), "study_range": [_sig(v) for v in s.study_range],
                           "quadratic_slope_at_centre": _sig(s.quadratic_slope_at_centre),
                           "library_counts_per_unit": _sig(s.library_counts_per_unit), "library_rule": s.library_rule,
                           "agreement": s.agreement} for s in fit.slopes],
        "warnings": [w.as_dict() for w in fit.warnings],
    }


def _sig(value: float | None, digits: int = 6) -> float | None:
    return None if value is None else float(f"{value:.{digits}g}")


def as_text(fit: Fit) -> str:
    """A readable report: the data used, how well each surface predicts, the slopes and verdicts."""
    study = fit.study
    lines = [f"{study.file}: {study.rows} rows used"
             + (f", {len(study.dropped_lines)} dropped (missing values)" if study.dropped_lines else "")
             + f"; response {study.response} in drag counts"
             + (f"; ignored columns: {', '.join(study.ignored)}" if study.ignored else "")]
    lines.append(f"{fit.folds}-fold cross-validated: " + "; ".join(
        f"{name} R^2 {s.cv_r2:.3f}, RMSE {s.cv_rmse_counts:.2f} counts" for name, s in fit.surfaces.items()))
    header = ("column", "feature", "counts/unit", "95 % interval", "p", "quad. centre", "library", "agreement")
    rows = [header]
    for s in fit.slopes:
        rows.append((s.column, s.feature, f"{s.counts_per_unit:+.3g}/{s.unit}", f"[{s.ci95[0]:+.3g}, {s.ci95[1]:+.3g}]",
                     f"{s.p_value:.2g}", "-" if s.quadratic_slope_at_centre is None else f"{s.quadratic_slope_at_centre:+.3g}",
                     "-" if s.library_counts_per_unit is None else f"{s.library_counts_per_unit:+.3g} ({s.library_rule})",
                     s.agreement))
    widths = [max(len(r[i]) for r in rows) for i in range(len(header))]
    lines += ["  ".join(cell.ljust(width) for cell, width in zip(row, widths)).rstrip() for row in rows]
    return "\n".join(lines) + "\n"
