"""What the review site shows beside the findings, computed once per review.

The site's page writers only format: every number a page or figure shows that is not
already in a :class:`~aeroreview.review.Review` is computed here, in the engine, and handed
over as a small dataclass (series against speed, the yaw sweep's wind average, the
backlight on the Ahmed curve, the measured surface, the changes between two revisions).
Lift per axle always comes from :func:`aeroreview.rules.stability.axle_figures`, so the
lift figure, the key-number table and the stability rules show one number.
"""

from __future__ import annotations

import math
from dataclasses import asdict, dataclass, field
from pathlib import Path

import numpy as np

from aeroreview import catalogue, sheetsurface
from aeroreview.baseline import leading_number
from aeroreview.calc.forces import drag_force
from aeroreview.calc.references import AHMED_ATTACHED, AHMED_SEPARATED, AHMED_SOURCE
from aeroreview.calc.wind import J1252_WIND_SPEED, max_yaw, wind_averaged_cd
from aeroreview.memo import Memo
from aeroreview.memo import key as memo_key
from aeroreview.problems import InputError
from aeroreview.results import evidence
from aeroreview.results.evidence import Buildup, BuildupChange, HistoryFigure
from aeroreview.results.history import team_limits
from aeroreview.review import Finding, Review
from aeroreview.rules import NOT_ASSESSED, Context, all_rules
from aeroreview.rules.crosswind import swept_result
from aeroreview.rules.stability import axle_figures
from aeroreview.settings import Settings, status_rank

SPEED_STEP_KM_H = 10  # spacing of the speed series [km/h] (our convention)
LOWEST_SPEED_KM_H = 20  # start of the speed series [km/h] (our convention)
DEFAULT_TOP_KM_H = 200  # top of the series when the sheet gives no top speed [km/h] (our convention)


@dataclass(frozen=True)
class DragSeries:
    """Drag force and power in still air against speed."""

    speed_km_h: list[float]
    drag_N: list[float]
    power_kW: list[float]


@dataclass(frozen=True)
class LiftSeries:
    """Lift per axle [kg] against speed, from the same result and area as the stability rules."""

    speed_km_h: list[float]
    front_kg: list[float]
    rear_kg: list[float]
    rear_static_kg: float
    top_km_h: float
    cl_front: float
    cl_rear: float


@dataclass(frozen=True)
class YawSweep:
    """A result's yaw sweep and its wind-averaged drag coefficient (SAE J1252 wind)."""

    label: str
    yaw_deg: list[float]
    cd: list[float]
    cd_wind_averaged: float | None  # None when the sweep cannot be averaged; then ``problem`` says why
    max_yaw_deg: float
    wind_m_s: float
    speed_km_h: float
    problem: str = ""


@dataclass(frozen=True)
class AhmedCurve:
    """The Ahmed-body drag curve, the backlight rule's critical region [deg] and the sheet's angle."""

    attached: list[list[float]]
    separated: list[list[float]]
    critical_low: float
    critical_high: float
    angle: float | None
    source: str


@dataclass(frozen=True)
class RevisionFigures:
    """Everything the revision page draws beside the review's own numbers."""

    drag: DragSeries
    lift: LiftSeries | None
    ahmed: AhmedCurve | None
    yaw: YawSweep | None
    geometry: dict | None  # silhouette and section data of the measured surface
    zone_status: dict[str, str] = field(default_factory=dict)  # worst assessed status per zone
    history: HistoryFigure | None = None  # the first force history a result names
    buildup: Buildup | None = None  # the first build-up along x a result names, with its zones
    result_problems: list[str] = field(default_factory=list)  # result files that could not be drawn


@dataclass(frozen=True)
class FeatureChange:
    key: str
    before: str  # display text, "not given" when absent
    after: str


@dataclass(frozen=True)
class FindingChange:
    finding: Finding  # the finding in the later revision
    was: str  # its status in the earlier one


@dataclass(frozen=True)
class WithinStatus:
    """A finding whose status stayed but whose measured value moved (exposed diffuser parts 4 to 1)."""

    finding: Finding  # the finding in the later revision
    was_measured: str
    direction: str  # "better", "worse" or "changed" (when the rule's numbers do not say which)


@dataclass(frozen=True)
class WaiverChange:
    rule: str
    change: str  # "added" or "removed"
    reason: str


@dataclass(frozen=True)
class Changes:
    """What changed from one revision to the next: features, findings, waivers and the surface file."""

    features: list[FeatureChange]
    findings: dict[str, list[FindingChange]]  # appeared, resolved, worse, better (in that order)
    within_status: list[WithinStatus] = field(default_factory=list)
    waivers: list[WaiverChange] = field(default_factory=list)
    geometry: tuple[str, str] | None = None  # surface file before and after ("none" when absent)
    buildup: BuildupChange | None = None  # both revisions' drag build-ups and the change by zone


def critical_region(settings: Settings) -> tuple[float, float]:
    """The backlight rule's critical region [deg], after the team's overrides."""
    rule = all_rules()["rear.backlight-angle"]
    thresholds = {**rule.defaults(), **next((c.thresholds for r, c, _ in settings.rule_plan if r is rule), {})}
    return math.degrees(thresholds["critical_low"]), math.degrees(thresholds["critical_high"])


def ahmed_curve(settings: Settings, angle: float | None) -> AhmedCurve:
    """The reference curve with the configured critical region; ``angle`` [rad] or None."""
    low, high = critical_region(settings)
    return AhmedCurve([[p.angle, p.cd] for p in AHMED_ATTACHED], [[p.angle, p.cd] for p in AHMED_SEPARATED],
                      low, high, None if angle is None else math.degrees(angle), AHMED_SOURCE)


def _speeds(review: Review) -> tuple[list[float], float]:
    top = (review.sheet.get("powertrain.top_speed") or DEFAULT_TOP_KM_H / 3.6) * 3.6
    end = max(top, review.key_numbers.reference_speed_km_h) + 1
    return [float(v) for v in np.arange(LOWEST_SPEED_KM_H, end, SPEED_STEP_KM_H)], top


def drag_series(review: Review, speeds: list[float], density: float) -> DragSeries:
    n = review.key_numbers
    drag = [float(drag_force(n.cd, n.area, v / 3.6, density)) for v in speeds]
    return DragSeries(speeds, drag, [d * v / 3.6 / 1000 for d, v in zip(drag, speeds)])


def lift_series(review: Review, speeds: list[float], top: float, context: Context) -> LiftSeries | None:
    sheet = review.sheet
    if not review.key_numbers.lift_reference or not sheet.has("mass.curb", "mass.front_axle_share"):
        return None
    points = [axle_figures(sheet, context, v / 3.6) for v in speeds]
    rear_static = sheet.get("mass.curb") * (1 - sheet.get("mass.front_axle_share"))
    return LiftSeries(speeds, [p.front_kg for p in points], [p.rear_kg for p in points], rear_static, top,
                      points[0].cl_front, points[0].cl_rear)


def yaw_sweep(review: Review, speed: float) -> YawSweep | None:
    """The sweep the crosswind rules read (:func:`aeroreview.rules.crosswind.swept_result`), averaged at
    ``speed`` [m/s]."""
    result = swept_result(review.sheet)
    if result is None:
        return None
    yaw = [p.yaw for p in result.yaw_sweep]
    cd = [p.cd for p in result.yaw_sweep]
    common = dict(label=result.label, yaw_deg=[math.degrees(a) for a in yaw], cd=cd,
                  max_yaw_deg=math.degrees(max_yaw(speed)), wind_m_s=J1252_WIND_SPEED, speed_km_h=speed * 3.6)
    try:
        return YawSweep(cd_wind_averaged=wind_averaged_cd(yaw, cd, speed), **common)
    except ValueError as problem:
        return YawSweep(cd_wind_averaged=None, problem=str(problem), **common)


def zone_status(review: Review) -> dict[str, str]:
    """The worst assessed status of each zone (zones with nothing flagged are absent or "pass")."""
    worst: dict[str, str] = {}
    for f in review.findings:
        if f.status != NOT_ASSESSED and status_rank(f.status) >= status_rank(worst.get(f.rule.zone, "pass")):
            worst[f.rule.zone] = f.status
    return worst


SETTLING = ("aeroreview.results.evidence", "aeroreview.results.history",  # the code whose results are remembered
            "aeroreview.rules.result_quality")  # (the verdict of a history is the convergence rule's)


def measured_geometry(sheet, cache_folder: Path | None) -> dict | None:
    """Silhouette and section figure data of a sheet's surface (measured once, :mod:`aeroreview.sheetsurface`);
    None when the surface cannot be measured (its data-quality finding says why)."""
    found = sheetsurface.measured(sheet, cache_folder)
    return found.figures if found else None


def revision_figures(review: Review, settings: Settings, geometry_cache: Path | None,
                     memo: Memo | None = None) -> RevisionFigures:
    """The series and reference data of one revision's figures."""
    air = settings.air()
    context = Context({}, settings.reference_speed, air.density, air.kinematic_viscosity)
    speeds, top = _speeds(review)
    sheet = review.sheet
    ahmed = ahmed_curve(settings, sheet.get("rear.backlight_angle")) if sheet.has("rear.backlight_angle") else None
    geometry = measured_geometry(sheet, geometry_cache)
    problems: list[str] = []
    return RevisionFigures(drag_series(review, speeds, air.density), lift_series(review, speeds, top, context), ahmed,
                           yaw_sweep(review, settings.reference_speed), geometry, zone_status(review),
                           _drawn(problems, result_history, sheet, team_limits(settings), memo),
                           _drawn(problems, result_buildup, sheet, geometry, memo), problems)


def result_file(sheet, role: str) -> tuple[Path, str] | None:
    """The first file of ``role`` (history, buildup) a sheet's results name, and that result's label."""
    for result in sheet.results:
        for name, _sha256, kind in result.files:
            if kind == role:
                return Path(sheet.path).parent / name, result.label or name
    return None


def result_history(sheet, limits: dict[str, float] | None = None, memo: Memo | None = None) -> HistoryFigure | None:
    """The force history thinned for its figure, its verdict judged by ``limits`` (the team's), remembered
    by the file's bytes and the limits (reading and settling a solver's history takes tens of milliseconds)."""
    found = result_file(sheet, "history")
    if not found:
        return None
    path, label = found[0], f"{sheet.revision}, {found[1]}"
    data = (memo or Memo(None)).get(memo_key(path.read_bytes(), label, repr(sorted((limits or {}).items())),
                                             code=SETTLING),
                                    lambda: asdict(evidence.history_figure(path, label, limits)))
    return HistoryFigure(**data)


def result_buildup(sheet, geometry: dict | None, memo: Memo | None = None) -> Buildup | None:
    """The build-up with its zones: from the measured centreline when there is one, else the axles.
    The file's curves are remembered by its bytes (reading a table loads pandas, half a second)."""
    found = result_file(sheet, "buildup")
    if not found:
        return None
    silhouette = geometry["silhouette"] if geometry else None
    front, wheelbase = sheet.get("dimensions.front_overhang"), sheet.get("dimensions.wheelbase")

    def read(path: Path) -> list[list[float]]:
        return (memo or Memo(None)).get(memo_key(path.read_bytes(), code=SETTLING),
                                        lambda: [curve.tolist() for curve in evidence.read_buildup(path)])

    return evidence.buildup(found[0], sheet.revision,
                            lambda length: evidence.zones_along_x(length, silhouette, front, wheelbase), read)


def _drawn(problems: list[str], read, *args):
    """A result file read for a figure; a file that cannot be read is reported on the page, not fatal."""
    try:
        return read(*args)
    except (InputError, OSError) as problem:
        problems.append(str(problem))
        return None


def changes(before: Review, after: Review, buildups: tuple[Buildup | None, Buildup | None] = (None, None)) -> Changes:
    """Features whose shown value changed, findings that appeared, resolved, got worse or better, and
    (given both revisions' build-ups) where along the body the drag changed."""
    features = []
    for item in catalogue.FEATURES:
        old, new = before.sheet.features.get(item.key), after.sheet.features.get(item.key)
        old_text = old.display(item) if old else "not given"
        new_text = new.display(item) if new else "not given"
        if old_text != new_text:
            features.append(FeatureChange(item.key, old_text, new_text))
    old = {f.rule.id: f for f in before.findings}
    groups: dict[str, list[FindingChange]] = {"appeared": [], "resolved": [], "worse": [], "better": []}
    for f in after.findings:
        prior = old.get(f.rule.id)
        was = prior.status if prior else NOT_ASSESSED
        now_rank, was_rank = status_rank(f.status), status_rank(was)
        if now_rank > 0 and was_rank <= 0:
            groups["appeared"].append(FindingChange(f, was))
        elif was_rank > 0 and now_rank <= 0 and f.status != NOT_ASSESSED:
            groups["resolved"].append(FindingChange(f, was))
        elif now_rank > 0 and was_rank > 0 and now_rank != was_rank:
            groups["worse" if now_rank > was_rank else "better"].append(FindingChange(f, was))
    within = [WithinStatus(f, old[f.rule.id].verdict.measured, _direction(old[f.rule.id], f)) for f in after.findings
              if f.rule.id in old and f.status == old[f.rule.id].status and f.actionable
              and f.verdict.measured != old[f.rule.id].verdict.measured]
    waived = [{(w.rule, w.reason) for w in r.sheet.waivers} for r in (before, after)]
    waivers = [WaiverChange(rule, "added", reason) for rule, reason in sorted(waived[1] - waived[0])]
    waivers += [WaiverChange(rule, "removed", reason) for rule, reason in sorted(waived[0] - waived[1])]
    files = [r.sheet.geometry.file if r.sheet.geometry else "none" for r in (before, after)]
    change = evidence.buildup_change(*buildups) if all(buildups) else None
    return Changes(features, groups, within, waivers, tuple(files) if files[0] != files[1] else None, change)


def _direction(prior: Finding, now: Finding) -> str:
    """Whether a finding that kept its status moved toward its limit: by its estimate, else its excess
    beyond the limit, else its distance from the limit."""
    if prior.counts and now.counts and prior.counts[1] != now.counts[1]:
        return "better" if now.counts[1] < prior.counts[1] else "worse"
    pairs = [(leading_number(prior.verdict.margin), leading_number(now.verdict.margin))]
    limit = leading_number(now.verdict.limit)
    if limit and limit == leading_number(prior.verdict.limit):
        pairs.append(tuple(((m[0] - limit[0], m[1]) if m else None)
                           for m in (leading_number(prior.verdict.measured), leading_number(now.verdict.measured))))
    for was, is_now in pairs:
        if was and is_now and was[1] == is_now[1] and abs(was[0]) != abs(is_now[0]):
            return "better" if abs(is_now[0]) < abs(was[0]) else "worse"
    return "changed"
