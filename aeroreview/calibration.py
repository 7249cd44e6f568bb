"""Calibration files: a study's fitted sensitivities with their provenance, and their use in reviews.

``aeroreview calibrate STUDY --output FILE`` writes one (YAML); the settings name them
(``calibrations: [FILE, ...]``). A rule whose :class:`~aeroreview.rules.Sensitivity` has a
calibrated feature re-costs its fix with the team's slope: the fix moves the feature from
its measured value to the rule's ``fix_to`` threshold, and the slope's 95 % interval times
that move is the new drag-count range, with the source kind "team data".

Scope: a study is of one vehicle, so a calibration re-costs only the findings of the vehicles
it declares (``applies_to: {vehicles: [...], classes: [...]}`` in the file, written by
``calibrate --vehicle ID [--vehicle-class CLASS]``, widened by a settings entry
``{file: FILE, vehicles: [...], classes: [...]}``). Other vehicles keep the library estimate
and their findings say why.

Range: the team's data speak only inside the study's range. The fix's move (measured value
to target) is split at the range's edges: the part inside is costed with the team's slope
and interval, the part outside with the library estimate pro rata (the rule's own range per
unit of the whole move). A move wholly inside costs team slope x move; one wholly outside
keeps the library estimate exactly; in between the estimate changes continuously with the
measured value and the target, with no jump at either edge.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, replace
from pathlib import Path

import yaml

from aeroreview import catalogue, sections, yamldoc
from aeroreview.calibrate import Slope, as_json, fit_study
from aeroreview.names import suggest
from aeroreview.paths import PathProblem, contained_file
from aeroreview.problems import InputError, Problem, UsageError
from aeroreview.rules import Source, all_rules, counts_range
from aeroreview.study import read_study
from aeroreview.units import UnitProblem, to_si

FORMAT = 1  # the calibration file's format version
STUDY_SUFFIXES = (".csv", ".txt", ".dat", ".tsv")
MAX_COMMENT_LINES = 5  # of the study's opening comments shown on its page
HEADER = ("# aeroreview calibration: team sensitivities fitted from a parametric study by `aeroreview calibrate`.\n"
          "# Regenerate it from the study rather than editing the numbers.\n")


@dataclass(frozen=True)
class Calibration:
    file: str  # as the settings name it
    study_file: str  # relative to the calibration's folder, or the bare name
    study_sha256: str
    rows: int
    dropped_rows: int
    response: str
    drag: bool
    folds: int
    models: dict  # {"linear": {"cv_r2", "cv_rmse_counts"}, ...}
    date: str
    slopes: tuple[Slope, ...]
    vehicles: tuple[str, ...] = ()  # whose findings it re-costs: the studied vehicle and any the team adds
    classes: tuple[str, ...] = ()  # vehicle classes it also holds for, as the team declares

    @property
    def cv_r2(self) -> float:
        return self.models["linear"]["cv_r2"]

    @property
    def cv_rmse(self) -> float:
        """Cross-validated RMSE of the linear surface [counts]: how far its estimates stray from measurement."""
        return self.models["linear"]["cv_rmse_counts"]

    @property
    def scope(self) -> str:
        """Whom the calibration speaks for, in words."""
        parts = [f"vehicle{'s' * (len(self.vehicles) > 1)} {', '.join(self.vehicles)}"] if self.vehicles else []
        parts += [f"class{'es' * (len(self.classes) > 1)} {', '.join(self.classes)}"] if self.classes else []
        return " and ".join(parts) or "no vehicle"

    def covers(self, sheet) -> bool:
        return sheet.vehicle_id in self.vehicles or sheet.get("vehicle.class") in self.classes

    @property
    def slug(self) -> str:
        """The calibration's page name on the site."""
        stem = re.sub(r"\.(yaml|yml)$", "", self.file.lower())
        return re.sub(r"[^a-z0-9]+", "-", stem).strip("-") or "calibration"

    @property
    def label(self) -> str:
        """How a finding, a rule page and ``explain`` name the calibration."""
        return (f"calibrated on {self.file} ({self.rows} rows, cross-validated R^2 {self.cv_r2:.2f}, "
                f"RMSE {self.cv_rmse:.1f} counts)")


SCOPE_KEYS = ("vehicles", "classes")
SCOPE_HINT = "e.g. vehicles: [tessel], classes: [fastback]"


def scope_problems(vehicles, classes) -> list[tuple[str, int | None, str, str]]:
    """What is wrong with a declared scope, as (key, index, message, hint); empty when it is sound."""
    out = []
    for key, items, known in (("vehicles", vehicles, None), ("classes", classes, catalogue.VEHICLE_CLASSES)):
        if not isinstance(items, list):
            out.append((key, None, f"'{key}' must be a list", SCOPE_HINT))
            continue
        for i, item in enumerate(items):
            if known is None and not (isinstance(item, str) and re.match(sections.SLUG, item)):
                out.append((key, i, f"'{item}' is not a vehicle id", "a sheet's `id:` (lower-case letters, digits, -)"))
            elif known is not None and item not in known:
                out.append((key, i, f"unknown vehicle class '{item}'", suggest(str(item), known)))
    return out


def read_scope(data: dict, where: tuple, problem, extra: tuple = ()) -> tuple[tuple[str, ...], tuple[str, ...]]:
    """The ``vehicles`` and ``classes`` of a scope mapping; ``problem(path, message, hint, key=False)`` locates."""
    for key in data:
        if key not in SCOPE_KEYS + extra:
            problem(where + (key,), f"unknown key '{key}'", suggest(str(key), SCOPE_KEYS + extra), key=True)
    vehicles, classes = data.get("vehicles", []), data.get("classes", [])
    found = scope_problems(vehicles, classes)
    for key, i, message, hint in found:
        problem(where + ((key,) if i is None else (key, i)), message, hint)
    if found:
        return (), ()
    return tuple(vehicles), tuple(classes)


def calibration_yaml(fit, study_file: str, date: str, vehicles=(), classes=()) -> str:
    """The calibration file of a :class:`~aeroreview.calibrate.Fit` (its JSON report is the body)."""
    report = as_json(fit)
    body = {
        "calibration": FORMAT,
        "study": {"file": study_file, "sha256": fit.study.sha256, "rows": report["rows"],
                  "dropped_rows": report["dropped_rows"], "response": report["response"],
                  "response_kind": "drag" if fit.study.drag else "lift"},
        "applies_to": {"vehicles": list(vehicles), "classes": list(classes)},
        "model": "linear least squares (statsmodels OLS), 95 % intervals",
        "cross_validation": {"folds": fit.folds, **report["models"]},
        "date": date,
        "sensitivities": [{k: v for k, v in s.items() if k != "quadratic_slope_at_centre"}
                          for s in report["sensitivities"]],
    }
    return HEADER + yaml.safe_dump(body, sort_keys=False, default_flow_style=None, width=100)


def load_calibration(path: Path, display: str) -> Calibration:
    """Read and check a calibration file; every problem located in it."""
    doc = yamldoc.load(path, display)
    problems: list[Problem] = []

    def need(data, key, kind, where=()):
        value = data.get(key) if isinstance(data, dict) else None
        ok = isinstance(value, kind) and not isinstance(value, bool) and \
            (not isinstance(value, float) or math.isfinite(value))
        if not ok:
            problems.append(doc.problem(where + (key,) if isinstance(data, dict) and key in data else where,
                                        f"calibration '{'.'.join(map(str, where + (key,)))}' is missing or not "
                                        f"a {getattr(kind, '__name__', 'number')}",
                                        "regenerate the file with `aeroreview calibrate ... --output`"))
        return value if ok else None

    data = doc.data if isinstance(doc.data, dict) else {}
    scope, vehicles, classes = data.get("applies_to", {}), (), ()
    if isinstance(scope, dict):
        vehicles, classes = read_scope(scope, ("applies_to",), lambda *a, **k: problems.append(doc.problem(*a, **k)))
    else:
        problems.append(doc.problem(("applies_to",), "'applies_to' must be a mapping", SCOPE_HINT))
    if need(data, "calibration", int) not in (None, FORMAT):
        problems.append(doc.problem(("calibration",), f"unknown calibration format {data['calibration']}",
                                    f"this aeroreview reads format {FORMAT}"))
    study = need(data, "study", dict) or {}
    cross = need(data, "cross_validation", dict) or {}
    linear = need(cross, "linear", dict, ("cross_validation",)) or {}
    for key in ("cv_r2", "cv_rmse_counts"):  # a finding states both: the check against measurement
        need(linear, key, (int, float), ("cross_validation", "linear"))
    slopes = []
    for i, raw in enumerate(need(data, "sensitivities", list) or []):
        where = ("sensitivities", i)
        numbers = [need(raw, key, (int, float), where) for key in ("counts_per_unit", "p_value")]
        ranges = [need(raw, key, list, where) for key in ("ci95", "study_range")]
        texts = [need(raw, key, str, where) for key in ("column", "feature", "unit", "agreement")]
        if None in numbers + ranges + texts:
            continue
        if any(len(r) != 2 or not all(isinstance(v, (int, float)) and math.isfinite(v) for v in r) or r[0] > r[1]
               for r in ranges):
            problems.append(doc.problem(where, "ci95 and study_range must be [low, high] numbers", "regenerate the file"))
            continue
        feature = catalogue.BY_KEY.get(texts[1])
        try:
            if feature is None:
                raise UnitProblem(f"unknown feature '{texts[1]}'", "regenerate the file")
            to_si(f"1 {texts[2]}", feature.unit)
        except UnitProblem as problem:
            problems.append(doc.problem(where + ("feature",), str(problem), problem.hint))
            continue
        slopes.append(Slope(texts[0], texts[1], texts[2], float(numbers[0]), tuple(ranges[0]),
                                      float(numbers[1]), tuple(ranges[1]), raw.get("library_counts_per_unit"),
                                      raw.get("library_rule"), texts[3]))
    fields = [need(study, key, kind, ("study",)) for key, kind in
              (("file", str), ("sha256", str), ("rows", int), ("dropped_rows", int), ("response", str))]
    if problems:
        raise InputError(problems)
    return Calibration(display, *fields[:5], study.get("response_kind", "drag") == "drag",
                       int(cross.get("folds", 0)), {k: v for k, v in cross.items() if isinstance(v, dict)},
                       str(data.get("date", "")), tuple(slopes), vehicles, classes)


def index(calibrations: list[Calibration]) -> dict[str, list[tuple[Calibration, Slope]]]:
    """The drag slopes of each feature, in the settings' order (where two cover a vehicle, the later is used)."""
    out: dict[str, list] = {}
    for cal in calibrations:
        for slope in cal.slopes if cal.drag else ():
            out.setdefault(slope.feature, []).append((cal, slope))
    return out


def _overlap(a: Calibration, b: Calibration) -> bool:
    return bool(set(a.vehicles) & set(b.vehicles) or set(a.classes) & set(b.classes))


def notices(calibrations: list[Calibration]) -> list[Problem]:
    """What a calibration cannot change: lift responses, features no rule costs, features calibrated twice."""
    used = {r.sensitivity.feature: r.id for r in all_rules().values() if r.sensitivity}
    out, seen = [], {}  # feature -> the calibrations of it so far
    for cal in calibrations:
        if not cal.drag:
            out.append(Problem(cal.file, 1, 1, f"the response {cal.response} is not drag: no rule estimate uses it",
                               "calibrate a drag response (Cd or counts)", "warning"))
            continue
        for slope in cal.slopes:
            if slope.feature not in used:
                out.append(Problem(cal.file, 1, 1, f"no rule states a sensitivity for {slope.feature} "
                                                   f"(column '{slope.column}'): its calibration changes no estimate",
                                   "see `aeroreview rules --format json` for the rules' sensitivities", "warning"))
            for other in seen.get(slope.feature, []):
                if _overlap(cal, other):
                    out.append(Problem(cal.file, 1, 1, f"{slope.feature} is also calibrated in {other.file} for "
                                                       f"{other.scope}; where both apply this file's slope is used",
                                       "name each feature's study once per vehicle", "warning"))
            seen.setdefault(slope.feature, []).append(cal)
    return out


def recost(finding, sheet, context, calibrated: dict[str, list[tuple[Calibration, Slope]]]) -> None:
    """Re-cost a finding's fix with the team's slope, when its rule's feature is calibrated for its vehicle."""
    sens = finding.rule.sensitivity
    if sens is None or sens.feature not in calibrated or not finding.counts:
        return
    library = finding.verdict.counts
    covering = [entry for entry in calibrated[sens.feature] if entry[0].covers(sheet)]
    if not covering:
        cal = calibrated[sens.feature][-1][0]
        finding.calibration = {"file": cal.file, "label": cal.label, "feature": sens.feature, "applied": False,
                               "library_counts": list(library),
                               "note": f"{cal.file} is calibrated for {cal.scope}, not {sheet.vehicle_id} "
                                       f"({sheet.get('vehicle.class') or 'class not given'}): the library estimate "
                                       "stands"}
        return
    cal, slope = covering[-1]
    canonical = catalogue.BY_KEY[sens.feature].unit
    size = to_si(f"1 {slope.unit}", canonical) - to_si(f"0 {slope.unit}", canonical)
    measured, target = sheet.get(sens.feature) / size, context[sens.fix_to] / size
    low, high = slope.study_range
    move = measured - target
    inside = min(max(measured, low), high) - min(max(target, low), high)  # the move's part inside the study
    outside = abs(move - inside) / abs(move) if move else 1.0  # its share beyond the study's edges
    team = sorted(bound * inside for bound in slope.ci95)
    ends = [t + lib * outside for t, lib in zip(team, library)]
    finding.calibration = {"file": cal.file, "label": cal.label, "feature": slope.feature, "unit": slope.unit,
                           "counts_per_unit": slope.counts_per_unit, "ci95": list(slope.ci95),
                           "cv_rmse_counts": cal.cv_rmse, "study_range": [low, high],
                           "library_counts": list(library), "applied": outside < 1, "outside_share": round(outside, 4)}
    beyond = [f"{name} {value:g} {slope.unit}" for name, value in (("measured", measured), ("target", target))
              if not low <= value <= high]
    if outside >= 1:
        finding.calibration["note"] = (f"the fix from {measured:g} to {target:g} {slope.unit} lies outside the "
                                       f"study's {low:g}-{high:g} {slope.unit}: the library estimate stands")
        return
    if beyond:
        verb = "lie" if len(beyond) > 1 else "lies"
        finding.calibration["note"] = (f"{' and '.join(beyond)} {verb} outside the study's {low:g}-{high:g} "
                                       f"{slope.unit}: {outside:.0%} of the fix is costed pro rata with the library "
                                       "estimate")
    finding.verdict = replace(finding.verdict, counts=counts_range(*ends))


def team_source(finding) -> Source | None:
    """The "team data" source of a re-costed finding."""
    calibration = getattr(finding, "calibration", None)
    if not calibration or not calibration["applied"]:
        return None
    note = f"; {calibration['note']}" if calibration.get("note") else ""
    return Source(f"{calibration['label']}: {calibration['counts_per_unit']:+.3g} counts per {calibration['unit']} "
                  f"(95 % {calibration['ci95'][0]:+.3g} to {calibration['ci95'][1]:+.3g}){note}", "team data")


def reach(cal: Calibration, reviews) -> tuple[list[tuple[object, list[str]]], list[str]]:
    """Whom a calibration reached in a fleet: each review with the rules it re-costed there, and the
    vehicle ids it declares that no sheet has (a typo there would silently re-cost nothing)."""
    recosted = [(review, [f.rule.id for f in review.findings if f.calibration and f.calibration["applied"]
                          and f.calibration["file"] == cal.file]) for review in reviews]
    known = {review.sheet.vehicle_id for review in reviews}
    return [(review, ids) for review, ids in recosted if ids], [v for v in cal.vehicles if v not in known]


def _rounded(values) -> list[float]:
    return [float(f"{v:.5g}") for v in values]


def page_data(cal: Calibration, root: Path) -> dict:
    """What a calibration's page shows, computed once: the slopes beside the library's, and,
    from the study refitted (read through the contained-path gate), the cross-validated
    predictions and the linear fit's residuals against each parameter."""
    data = {"slopes": [{"label": f"{s.column} [per {s.unit}]", "fit": s.counts_per_unit, "ci95": list(s.ci95),
                        "library": s.library_counts_per_unit} for s in cal.slopes], "note": "", "comments": []}
    try:
        folder = (root / cal.file).parent
        path = contained_file(folder, cal.study_file, STUDY_SUFFIXES, "study", "a study table")
        study = read_study(path, [f"{s.column}={s.feature}:{s.unit}" for s in cal.slopes], cal.response,
                           display=cal.study_file)
        fit = fit_study(study, "both" if "quadratic" in cal.models else "linear", cal.folds or 5)
    except (PathProblem, InputError, UsageError) as problem:
        data["note"] = f"the study cannot be refitted for the figures: {problem}"
        return data
    if study.sha256 != cal.study_sha256:
        data["note"] = ("the study file has changed since this calibration was fitted (its sha256 differs): the "
                        "figures show the current file; refit the calibration")
    lines = path.read_text(encoding="utf-8-sig").splitlines()
    data["comments"] = [line.lstrip("# ")[:300] for line in lines[:MAX_COMMENT_LINES] if line.startswith("#")]
    data["measured"] = _rounded(study.y)
    data["predicted"] = {name: _rounded(surface.predicted) for name, surface in fit.surfaces.items()}
    data["residuals"] = [{"label": f"{m.column} [{m.unit}]", "x": _rounded(study.x[:, j]),
                          "residual": _rounded(fit.residuals)} for j, m in enumerate(study.mappings)]
    return data
