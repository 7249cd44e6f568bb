"""Reports of a fleet review: readable text, JSON, and JUnit XML for CI systems.

All three are built from the same :func:`as_json` data, so they never disagree. Numbers the
engine computed enter that data through :func:`rounded`, where they enter: the rest of it (text,
ids, counts, values already rounded) is never walked twice.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

from aeroreview.display import whole_score
from aeroreview.problems import Problem, clean
from aeroreview.review import ADDITIVITY_NOTE, UNSCORED_ZONES, Finding, Review, failing
from aeroreview.rules import NOT_ASSESSED, ZONES, actionable
from aeroreview.track_record import pairs, summary


def escape(text) -> str:
    """Sheet text for the terminal: control characters shown escaped (a waiver reason must not
    drive the terminal), one line."""
    return clean(text, 2000)


def finding_json(finding: Finding, line: int) -> dict:
    """A finding as the JSON report gives it; ``line`` is the sheet line it points at (:func:`finding_line`).

    Most findings of a fleet pass or are not assessed and carry no estimate, consequences or
    calibration: those fields are filled only when present (this runs some 60 times a sheet).
    """
    verdict, rule = finding.verdict, finding.rule
    estimate = consequences = calibration = None
    if finding.counts or verdict.cl_front or verdict.cl_rear:
        low, high = finding.counts or (0.0, 0.0)
        estimate = rounded({"cd_counts_low": low, "cd_counts_high": high,
                            "cl_front_change": verdict.cl_front, "cl_rear_change": verdict.cl_rear})
    if finding.consequences:
        consequences = rounded(finding.consequences.as_dict())
    if finding.calibration:
        calibration = rounded(finding.calibration)
    return {
        "rule": rule.id, "zone": rule.zone, "title": rule.title, "status": finding.status,
        "severity": finding.severity, "message": verdict.message, "measured": verdict.measured,
        "limit": verdict.limit, "margin": verdict.margin, "estimate": estimate, "consequences": consequences,
        "missing": list(verdict.missing), "waiver": finding.waiver and finding.waiver.as_dict(),
        "calibration": calibration,
        # Sources beyond the rule's own (listed once under "rules"): the team's data when a calibration re-costed it.
        "added_sources": [s.as_dict() for s in finding.sources if s not in rule.sources] if calibration else [],
        "line": line,
    }


def rules_json(reviews: list[Review]) -> dict:
    """Every rule the findings name, once: its title, zone, fix and sources (a finding refers to it by id)."""
    rules = {}
    for review in reviews:
        for finding in review.findings:
            rule = finding.rule
            if rule.id not in rules:
                rules[rule.id] = {"title": rule.title, "zone": rule.zone, "fix": finding.fix,  # with the run's thresholds
                                  "sources": [s.as_dict() for s in rule.sources]}
    return rules


_KEPT = frozenset((str, int, bool, type(None)))  # leaves rounded() returns unchanged: skipped without a call


def rounded(value):
    """Floats cut to 10 significant digits, so a converted 130 km/h reads 130.0, not 130.00000000000003.

    Plain leaves and plain floats inside a mapping or list are handled in place, without a call."""
    if isinstance(value, float):
        return float(f"{value:.10g}")
    if isinstance(value, dict):
        return {key: item if type(item) in _KEPT else float(f"{item:.10g}") if type(item) is float else rounded(item)
                for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [item if type(item) in _KEPT else float(f"{item:.10g}") if type(item) is float else rounded(item)
                for item in value]
    return value


def finding_line(sheet, finding: Finding) -> int:
    """The sheet line a finding points at: its first needed feature the sheet gives, else the results."""
    for key in finding.rule.needs:
        if key in sheet.line_of:
            return sheet.line_of[key]
    return sheet.line_of.get("results", sheet.line_of.get("features", 1))


def review_json(review: Review, fail_on: str) -> dict:
    sheet = review.sheet
    gate = failing(review, fail_on)
    return {
        "file": sheet.path, "vehicle": sheet.vehicle_id, "revision": sheet.revision, "name": sheet.name,
        "parent": sheet.parent, "class": sheet.get("vehicle.class"),
        "reviewed": sheet.reviewed.isoformat() if sheet.reviewed else None,
        "score": review.score, "coverage": round(review.coverage, 3),
        "zones": {z.zone: {"score": z.score, "coverage": round(z.coverage, 3),
                           "assessed": z.assessed, "applicable": z.applicable} for z in review.zones.values()},
        "confidence": None if review.confidence is None else round(review.confidence, 3),
        **estimate_json(review),
        "ranked_fixes": [f.rule.id for f in review.ranked_fixes],
        "key_numbers": rounded(review.key_numbers.as_dict()), "assumptions": review.assumptions,
        "failing": [f.rule.id for f in gate],
        "findings": [finding_json(f, finding_line(sheet, f)) for f in review.findings],
        "notices": [n.as_dict() for n in review.notices],
    }


def estimate_json(review: Review) -> dict:
    """The combined estimate: savings in counts (positive), the Cd they lead to, the plain sum beside them."""
    e = review.estimate
    return {"recoverable_counts": {"low": round(e.low, 1), "mid": round(e.mid, 1), "high": round(e.high, 1),
                                   "plain_sum_low": round(e.plain_sum_low, 1), "plain_sum_high": round(e.plain_sum_high, 1),
                                   "floor_cd": round(e.floor_cd, 4)},
            "cd_after": {end: round(cd, 4) for end, cd in e.cd_after.items()},
            "floor_raised_for": list(e.raised_for), "estimate_note": ADDITIVITY_NOTE,
            "waterfall": [{"rule": rule, "counts": round(counts, 1)} for rule, counts in e.waterfall]}


def pairs_json(reviews: list[Review]) -> dict:
    """The track record: predicted against measured change of Cd for every same-kind parent-child pair."""
    found = pairs(reviews)
    return {"pairs": [{"vehicle": p.vehicle, "from": p.parent, "to": p.child, "kind": p.kind,
                       "measured_delta_counts": round(p.measured, 1),
                       "predicted_delta_counts": dict(zip(("low", "mid", "high"), (round(x, 1) for x in p.predicted))),
                       "within_range": p.within_range} for p in found],
            "track_record": {key: value if value is None or key == "pairs" else round(value, 3 if "share" in key else 1)
                             for key, value in summary(found).items()}}


def as_json(reviews: list[Review], problems: list[Problem], fail_on: str) -> dict:
    """The data every report is built from: plain values, engine numbers rounded (:func:`rounded`)."""
    return {"sheets": [review_json(r, fail_on) for r in reviews], "rules": rules_json(reviews), **pairs_json(reviews),
            "errors": [p.as_dict() for p in problems if p.level == "error"],
            "warnings": [p.as_dict() for p in problems if p.level != "error"]}


def _fmt_counts(counts) -> str:
    return f"{counts[0]:g}-{counts[1]:g} counts" if counts else ""


ANSI = {"bold": "1", "green": "32", "cyan": "36", "yellow": "33", "bold red": "1;31", "dim": "2"}
STYLE = {"pass": "green", "advisory": "cyan", "warning": "yellow", "failure": "bold red", NOT_ASSESSED: "dim"}


def as_text(data: dict, color: bool) -> str:
    """A terminal report: per revision, findings grouped by zone; passes summarised.

    Built as one string; ``color`` adds ANSI styles (for a terminal only)."""
    def paint(text: str, style: str) -> str:
        return f"\x1b[{ANSI[style]}m{text}\x1b[0m" if color else text

    lines = []
    for sheet in data["sheets"]:
        by_zone: dict[str, list[dict]] = {}
        for finding in sheet["findings"]:
            by_zone.setdefault(finding["zone"], []).append(finding)
        score = whole_score(sheet["score"], "-")
        lines.append(f"{paint(escape(sheet['vehicle']) + '@' + escape(sheet['revision']), 'bold')} {escape(sheet['file'])}  "
                     f"score {score}/100 (coverage {sheet['coverage'] * 100:.0f} %, confidence {_share(sheet['confidence'])})")
        lines.append(f"  {_estimate_line(sheet)}")
        for zone, title in ZONES.items():
            items = by_zone.get(zone)
            if not items:
                continue
            zone_score = sheet["zones"][zone]
            shown = "not scored" if zone in UNSCORED_ZONES else \
                "-/100" if zone_score["score"] is None else f"{whole_score(zone_score['score'])}/100"
            passes = sum(f["status"] == "pass" for f in items)
            unassessed = [f["rule"] for f in items if f["status"] == NOT_ASSESSED]
            lines.append(f"  {paint(title, 'bold')} {shown} (coverage {zone_score['coverage'] * 100:.0f} %), {passes} pass")
            for f in items:
                if not actionable(f["status"]):
                    continue
                waived = " " + paint(f"(waived: {escape(f['waiver']['reason'])})", "dim") if f["waiver"] and \
                    f["waiver"]["status"] == "active" else ""
                estimate = f"; {_fmt_counts((f['estimate']['cd_counts_low'], f['estimate']['cd_counts_high']))}" \
                    if f["estimate"] and f["estimate"]["cd_counts_high"] else ""
                calibration = f["calibration"]
                if calibration:
                    note = calibration.get("note")
                    estimate += (f" (team data: {escape(calibration['label'])}{'; ' + escape(note) if note else ''})"
                                 if calibration["applied"] else f" (calibration not applied: {escape(note)})")
                measured = f" ({escape(f['measured'])}, limit {escape(f['limit'])})" if f["measured"] and f["limit"] else ""
                lines.append(f"    {paint(format(f['status'], '<9'), STYLE[f['status']])} {f['rule']}: {escape(f['message'])}"
                             f"{measured}{estimate}{waived}")
            if unassessed:
                lines.append("    " + paint(f"not assessed: {', '.join(unassessed)}", "dim"))
        for notice in sheet["notices"]:
            lines.append(f"  {paint('notice', 'yellow')} {escape(notice['message'])}; {escape(notice['hint'])}")
        base = sheet.get("baseline", {"worse": [], "suppressed": []})
        for item in base["worse"]:
            lines.append(f"  {paint('worse than the baseline:', 'bold')} {item['rule']}: {item['why']}")
        if base["suppressed"]:
            lines.append("  " + paint("not counted, no worse than the baseline: "
                                      + ", ".join(f"{s['rule']} ({s['status']})" for s in base["suppressed"]), "dim"))
        if sheet["failing"]:
            lines.append(f"  {paint('fails the gate:', 'bold red')} {', '.join(sheet['failing'])}")
        lines.append("")
    for pair in data["pairs"]:
        predicted = pair["predicted_delta_counts"]
        lines.append(f"track record {pair['vehicle']} {pair['from']} -> {pair['to']} ({pair['kind']}): predicted "
                     f"{predicted['low']:+g} / {predicted['mid']:+g} / {predicted['high']:+g} counts, measured "
                     f"{pair['measured_delta_counts']:+g} ({'inside' if pair['within_range'] else 'outside'} the range)")
    record = data["track_record"]
    if record["pairs"]:
        lines.append(f"track record over {record['pairs']} pair(s): mean absolute error "
                     f"{record['mean_abs_error_counts']:g} counts, bias {record['bias_counts']:+g} counts, "
                     f"{record['within_range_share'] * 100:.0f} % inside the predicted range")
    total_failing = sum(len(s["failing"]) for s in data["sheets"])
    note = f"; recoverable figures: {ADDITIVITY_NOTE}" if data["sheets"] else ""
    lines.append(f"{len(data['sheets'])} revision(s) reviewed, {total_failing} finding(s) fail the gate, "
                 f"{len(data['errors'])} input error(s){note}")
    return "\n".join(lines) + "\n"


def _share(value) -> str:
    return "-" if value is None else f"{value * 100:.0f} %"


def _estimate_line(sheet: dict) -> str:
    saving, after = sheet["recoverable_counts"], sheet["cd_after"]
    raised = f", raised for {', '.join(sheet['floor_raised_for'])}" if sheet["floor_raised_for"] else ""
    return (f"recoverable {saving['low']:g} / {saving['mid']:g} / {saving['high']:g} counts combined (low / mid / high), "
            f"Cd to {after['mid']:.3f} ({after['low']:.3f}-{after['high']:.3f}); floor Cd {saving['floor_cd']:.3f}"
            f"{raised}; plain sum {saving['plain_sum_low']:g}-{saving['plain_sum_high']:g} counts (not a prediction)")


def as_junit(data: dict, fail_on: str) -> str:
    """JUnit XML: one test suite per revision, one test case per rule."""
    suites = ET.Element("testsuites", name="aeroreview")
    for sheet in data["sheets"]:
        suite = ET.SubElement(suites, "testsuite", name=f"{sheet['vehicle']}@{sheet['revision']}",
                              tests=str(len(sheet["findings"])), failures=str(len(sheet["failing"])),
                              skipped=str(sum(f["status"] == NOT_ASSESSED for f in sheet["findings"])), file=clean(sheet["file"]))
        for f in sheet["findings"]:
            case = ET.SubElement(suite, "testcase", name=f["rule"], classname=f"{sheet['vehicle']}.{sheet['revision']}.{f['zone']}")
            text = f"{f['status']}: {f['message']}" + (f" (measured {f['measured']}, limit {f['limit']})"
                                                       if f["measured"] and f["limit"] else "")
            if f["rule"] in sheet["failing"]:
                failure = ET.SubElement(case, "failure", message=text, type=f["status"])
                failure.text = f"fix: {data['rules'][f['rule']]['fix']}"
            elif f["status"] == NOT_ASSESSED:
                ET.SubElement(case, "skipped", message=text)
            else:
                ET.SubElement(case, "system-out").text = text
    if data["errors"]:
        suite = ET.SubElement(suites, "testsuite", name="input", tests=str(len(data["errors"])),
                              failures="0", errors=str(len(data["errors"])))
        for problem in data["errors"]:
            case = ET.SubElement(suite, "testcase", name=f"{problem['file']}:{problem['line']}", classname="input")
            ET.SubElement(case, "error", message=str(Problem(**problem)))
    ET.indent(suites)
    return ET.tostring(suites, encoding="unicode", xml_declaration=True) + "\n"
