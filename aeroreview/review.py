"""The review: every enabled rule on a sheet, scored, costed and ranked.

A :class:`Review` holds the findings (one per applicable rule), the zone and overall
scores with their coverage (the share of applicable rules that could be assessed: a
sparse sheet never looks perfect) and confidence (the share of data-quality checks that
pass), the combined estimate of what the fixes recover (:mod:`aeroreview.estimate`), the
fixes ranked by benefit, and the revision's key numbers. Every finding with an effect carries its
consequences in the sheet's own terms: watts at the reference speed, kWh per 100 km on
the configured cycle, and km of range (electric) or litres per 100 km (fuel).

Scores weigh cost only (see :func:`aeroreview.estimate.score`): the share of the drag and
lift within reach that unresolved findings still claim. Severity and the gate live in the
statuses and the exit code; data-quality rules feed coverage and confidence, not the score.
Waived findings keep their cost in the score (a waiver accepts a finding, it does not fix
it) but do not fail the gate.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field

from aeroreview import sheetsurface
from aeroreview.calc.cycles import cycle_by_name
from aeroreview.calc.forces import drag_force
from aeroreview.calc.roadload import Vehicle, cycle_energy, range_km, sensitivities
from aeroreview.calibration import recost, team_source
from aeroreview.estimate import Estimate, Frame, claim_of, estimate, frame_for, score
from aeroreview.problems import Problem
from aeroreview.rules import NOT_ASSESSED, STATUSES, ZONES, Context, Rule, Source, Verdict, actionable
from aeroreview.rules.body import FRONTAL_AREA_FACTOR
from aeroreview.rules.data import CLASS_CD
from aeroreview.rules.result_quality import measured_cd
from aeroreview.rules.stability import axle_figures
from aeroreview.settings import Settings, status_rank
from aeroreview.sheet import Sheet
from aeroreview.values import AppliedWaiver, Consequences, KeyNumbers
from aeroreview.vehicle import vehicle_from_sheet

UNSCORED_ZONES = ("data",)  # data quality feeds coverage and confidence, not the score
ADDITIVITY_NOTE = ("effects do not simply add: fixes on one flow share its drag budget and the total saturates "
                   "toward the class's floor; the plain sum is shown only for reference")


@dataclass
class Finding:
    rule: Rule
    status: str  # pass, advisory, warning, failure, not assessed
    severity: str
    verdict: Verdict
    waiver: AppliedWaiver | None = None
    consequences: Consequences | None = None
    fix: str = ""  # how to fix, with the thresholds the rule ran with
    calibration: dict | None = None  # set when a team calibration re-costed the fix (aeroreview.calibration)

    @property
    def sources(self) -> tuple[Source, ...]:
        """The rule's sources, and the team's data when a calibration re-costed the fix."""
        team = team_source(self)
        return self.rule.sources + ((team,) if team else ())

    @property
    def waived(self) -> bool:
        return bool(self.waiver and self.waiver.active)

    @property
    def actionable(self) -> bool:
        """Whether the finding asks for action (it neither passes nor lacks the data to judge)."""
        return actionable(self.status)

    @property
    def counts(self) -> tuple[float, float] | None:
        return self.verdict.counts if self.actionable else None

    @property
    def benefit(self) -> float:
        """Midpoint of the recoverable counts, for ranking fixes."""
        return sum(self.counts) / 2 if self.counts else 0.0


@dataclass
class ZoneScore:
    zone: str
    score: float | None  # None when nothing in the zone could be assessed
    assessed: int
    applicable: int

    @property
    def coverage(self) -> float:
        return self.assessed / self.applicable if self.applicable else 0.0


@dataclass
class Review:
    sheet: Sheet
    findings: list[Finding]
    zones: dict[str, ZoneScore]
    score: float | None
    coverage: float
    estimate: Estimate
    frame: Frame
    key_numbers: KeyNumbers
    confidence: float | None = None  # share of assessed data-quality checks that pass
    assumptions: list[str] = field(default_factory=list)
    notices: list[Problem] = field(default_factory=list)

    @property
    def recoverable(self) -> tuple[float, float]:
        """The combined low-high saving [counts] (not the plain sum)."""
        return (round(self.estimate.low, 1), round(self.estimate.high, 1))

    @property
    def ranked_fixes(self) -> list[Finding]:
        return _ranked(self.findings)

    def counts_by_status(self) -> dict[str, int]:
        out = {status: 0 for status in (*STATUSES, NOT_ASSESSED)}
        for finding in self.findings:
            out[finding.status] += 1
        return out


def _status(level: str, severity: str) -> str:
    if not actionable(level):
        return level
    if level == "major":
        return severity
    return STATUSES[max(1, STATUSES.index(severity) - 1)]


def run_rule(rule: Rule, sheet: Sheet, context: Context, severity: str, calibrated: dict | None = None,
             fix: str | None = None) -> Finding:
    """One rule on one sheet; missing features give "not assessed", never an exception.

    ``calibrated`` (:func:`aeroreview.calibration.index`) re-costs the fix with the team's slope;
    ``fix`` is the fix text with the context's thresholds (:attr:`Settings.fixes`), written here when not given.
    """
    missing = tuple(key for key in rule.needs if key not in sheet.features)
    if missing:
        verdict = Verdict(NOT_ASSESSED, f"not assessed: missing {', '.join(missing)}", missing=missing)
    else:
        verdict = rule.check(sheet, context)
    finding = Finding(rule, _status(verdict.level, severity), severity, verdict,
                      fix=rule.fix_for(context.thresholds) if fix is None else fix)
    if calibrated:
        recost(finding, sheet, context, calibrated)
    return finding


def _vehicle(sheet: Sheet) -> tuple[Vehicle, dict, list[str]]:
    """The road-load vehicle of a sheet; the Cd and area estimated from the class when absent."""
    assumptions = []
    found = measured_cd(sheet)
    vehicle_class = sheet.get("vehicle.class")
    if found is None:
        low, high = CLASS_CD[vehicle_class]
        cd, source, estimated = round((low + high) / 2, 3), f"class midpoint for a {vehicle_class}", True
        assumptions.append(f"Cd = {cd:.3f}, the middle of the usual {vehicle_class} range (no result in the sheet)")
    else:
        cd, source = found
        estimated = source.startswith("estimate")
    area = sheet.get("dimensions.frontal_area")
    if area is None:
        area = FRONTAL_AREA_FACTOR * sheet.get("dimensions.width") * sheet.get("dimensions.height")
        assumptions.append(f"frontal area = {FRONTAL_AREA_FACTOR} x width x height = {area:.2f} m^2 (from memory)")
    vehicle, more = vehicle_from_sheet(sheet, cd, area)
    return vehicle, {"cd": cd, "cd_source": source, "cd_estimated": estimated, "area": area}, assumptions + more


def _key_numbers(sheet: Sheet, settings: Settings, context: Context, vehicle: Vehicle, cd_info: dict) -> KeyNumbers:
    cycle = cycle_by_name(settings.cycle)
    energy = cycle_energy(cycle, vehicle, context.density)
    drag = float(drag_force(vehicle.cd, vehicle.area, settings.reference_speed, context.density))
    return KeyNumbers(
        **cd_info, cda=vehicle.cd * vehicle.area, reference_speed_km_h=settings.reference_speed * 3.6,
        drag_N=drag, drag_power_kW=drag * settings.reference_speed / 1000, cycle=cycle.name,
        energy_kWh_per_100km=energy.kwh_per_100km, aero_share=energy.aero_share,
        energy_breakdown_kWh={"rolling": energy.rolling / 3.6e6, "aero": energy.aero / 3.6e6,
                              "braking": energy.braking / 3.6e6, "recovered": energy.recovered / 3.6e6},
        litres_per_100km=energy.litres_per_100km, range_km=range_km(energy, vehicle),
        per_10_counts=sensitivities(cycle, vehicle, context.density, 10.0, energy),
        lift_reference=axle_figures(sheet, context, settings.reference_speed),
        lift_top_speed=axle_figures(sheet, context, sheet.get("powertrain.top_speed"))
        if sheet.has("powertrain.top_speed") else None)


def _apply_waivers(sheet: Sheet, findings: dict[str, Finding], today: _dt.date) -> list[Problem]:
    notices = []
    for waiver in sheet.waivers:
        finding = findings.get(waiver.rule)
        if finding is None:
            continue  # a disabled or inapplicable rule: nothing to waive
        expired = waiver.expires is not None and waiver.expires < today
        finding.waiver = AppliedWaiver("expired" if expired else "active", waiver.reason, waiver.by,
                                       waiver.expires.isoformat() if waiver.expires else None)
        if expired:
            notices.append(Problem(sheet.path, waiver.line, 1, f"the waiver for {waiver.rule} expired on "
                                   f"{waiver.expires.isoformat()} and no longer applies",
                                   "renew it with a new date and reason, or fix the finding", "warning"))
        elif not finding.actionable:
            notices.append(Problem(sheet.path, waiver.line, 1, f"the waiver for {waiver.rule} is not needed: "
                                   f"the rule reports '{finding.status}'", "remove the waiver", "warning"))
    return notices


def review_sheet(sheet: Sheet, settings: Settings, today: _dt.date | None = None) -> Review:
    """Review one validated sheet."""
    today = today or _dt.date.today()
    air = settings.air()
    if sheet.geometry:  # measured once per surface and options (cached), handed to its data-quality rule
        sheet.surface = sheetsurface.measured(sheet, sheetsurface.cache_folder(settings.root)).values
    fixes = settings.fixes
    findings = {rule.id: run_rule(rule, sheet, context, severity, settings.calibrated, fixes[rule.id])
                for rule, context, severity in settings.rule_plan if rule.applies(sheet)}
    notices = _apply_waivers(sheet, findings, today)

    context = Context({}, settings.reference_speed, air.density, air.kinematic_viscosity)
    vehicle, cd_info, assumptions = _vehicle(sheet)
    numbers = _key_numbers(sheet, settings, context, vehicle, cd_info)
    # Per count: a tenth of the 10-count sensitivity (the energy is nearly linear in Cd).
    per_count = {k: (v / 10 if v is not None else None) for k, v in numbers.per_10_counts[numbers.cycle].items()}
    power_per_count = float(drag_force(0.001, vehicle.area, settings.reference_speed, air.density)) \
        * settings.reference_speed
    for finding in findings.values():
        if finding.counts:
            finding.consequences = Consequences.of(finding.counts, per_count, power_per_count)

    lift = numbers.lift_reference
    ranked = _ranked(findings.values())
    frame = frame_for(sheet, numbers.cd, settings.estimates, lift and (lift.cl_front, lift.cl_rear),
                      {f.rule.id for f in ranked})
    claims = [c for c in map(claim_of, ranked + [f for f in findings.values() if not f.counts]) if c]
    by_zone: dict[str, list[Finding]] = {zone: [] for zone in ZONES}
    for finding in findings.values():
        by_zone[finding.rule.zone].append(finding)
    zones = {zone: _zone_score(zone, mine, claims, frame) for zone, mine in by_zone.items()}
    scored = [f for f in findings.values() if f.rule.zone not in UNSCORED_ZONES]
    overall = score(claims, frame, {f.rule.region for f in scored if f.rule.region}) \
        if any(f.status != NOT_ASSESSED for f in scored) else None
    checks = [f for f in findings.values() if f.rule.zone in UNSCORED_ZONES and f.status != NOT_ASSESSED]
    return Review(sheet, list(findings.values()), zones, overall,
                  sum(f.status != NOT_ASSESSED for f in findings.values()) / len(findings) if findings else 0.0,
                  estimate([c for c in claims if c.high > 0], frame), frame, numbers,
                  sum(f.status == "pass" for f in checks) / len(checks) if checks else None, assumptions, notices)


def _ranked(findings) -> list[Finding]:
    """Costed findings by benefit, largest first (ties by rule id)."""
    return sorted((f for f in findings if f.counts), key=lambda f: (-f.benefit, f.rule.id))


def _zone_score(zone: str, mine: list[Finding], claims, frame: Frame) -> ZoneScore:
    """A zone's score on the same basis as the revision's: its own claims (of ``mine``, its findings)
    against its regions' reach."""
    assessed = sum(f.status != NOT_ASSESSED for f in mine)
    ids = {f.rule.id for f in mine}
    value = None
    if assessed and zone not in UNSCORED_ZONES:
        value = score([c for c in claims if c.rule in ids], frame, {f.rule.region for f in mine if f.rule.region})
    return ZoneScore(zone, value, assessed, len(mine))


def failing(review: Review, fail_on: str) -> list[Finding]:
    """Findings at or above the fail level that no active waiver covers."""
    if fail_on == "never":
        return []
    return [f for f in review.findings if status_rank(f.status) >= status_rank(fail_on) and not f.waived]
