"""A revision's page: verdict, key numbers, figures, findings by zone, ranked fixes, attachments."""

from __future__ import annotations

from pathlib import Path, PurePosixPath
from urllib.parse import quote

from aeroreview import catalogue
from aeroreview.digest import RevisionFigures
from aeroreview.display import PERCENT, whole_score
from aeroreview.paths import contained_file
from aeroreview.review import ADDITIVITY_NOTE, Finding, Review, failing
from aeroreview.rules import ZONES
from aeroreview.settings import status_rank
from aeroreview.sheet import IMAGE_SUFFIXES
from aeroreview.site.pages import revision_figures
from aeroreview.site.pages.common import (CAUTION, Output, badge, esc, heading, kind_suffix, link, paragraphs,
                                          recoverable_text, revision_path, score_text)
from aeroreview.units import format_quantity


def write(out: Output, review: Review, figures: RevisionFigures) -> None:
    sheet = review.sheet
    fail_on = out.settings.fail_on
    lines = [heading(f"{sheet.name}, revision {sheet.revision}"), "",
             f"[{esc(sheet.name)}](index.md) · class {sheet.get('vehicle.class')} · reviewed "
             f"{sheet.reviewed or 'date not given'}{' by ' + esc(sheet.reviewer) if sheet.reviewer else ''} · "
             f"sheet <code>{esc(out.sheet_name(sheet))}</code>", ""]  # entities in a Markdown code span show as typed
    if sheet.parent:
        lines += [f"Derived from revision {esc(sheet.parent)}: "
                  f"[what changed]({sheet.parent}-to-{sheet.revision}.md).", ""]
    gate = failing(review, fail_on)
    verdict = (f"**Fails the gate** (fail level {fail_on}): " + ", ".join(f.rule.id for f in gate)) if gate \
        else f"Passes the gate (fail level {fail_on})."
    lines += [f"**Score {score_text(review)}** · recoverable {recoverable_text(review)} drag counts combined, "
              f"Cd to about {review.estimate.cd_after['mid']:.3f} · {verdict}", "", CAUTION]
    lines += key_numbers(review)
    lines += revision_figures.section(out, review, figures)
    lines += surface_agreement(review)
    lines += findings(review)
    lines += ranked_fixes(review)
    lines += attachments(out, review)
    if sheet.notes:
        lines += ["## Notes", "", paragraphs(sheet.notes), ""]
    if review.notices:
        lines += ["## Notices", ""] + [f"- {esc(n.message)}; {esc(n.hint)}" for n in review.notices] + [""]
    out.page(revision_path(review), "\n".join(lines))


def key_numbers(review: Review) -> list[str]:
    n = review.key_numbers
    ref = n.reference_speed_km_h
    rows = [("Drag coefficient Cd", f"{n.cd:.3f} ({'estimated' if n.cd_estimated else 'measured'}: "
                                    f"{esc(n.cd_source)})"),
            ("Frontal area A", f"{n.area:.2f} m²"), ("Drag area CdA", f"{n.cda:.3f} m²"),
            (f"Drag at {ref:.0f} km/h", f"{n.drag_N:.0f} N"),
            (f"Drag power at {ref:.0f} km/h", f"{n.drag_power_kW:.1f} kW")]
    for lift, label in ((n.lift_reference, "the reference speed"), (n.lift_top_speed, "top speed")):
        if lift:
            rows.append((f"Lift per axle at {label} ({lift.speed_km_h:.0f} km/h)",
                         f"front {lift.front_kg:+.0f} kg ({PERCENT(lift.front_share, 1, signed=True)} of its static "
                         f"load), rear {lift.rear_kg:+.0f} kg ({PERCENT(lift.rear_share, 1, signed=True)})"))
    if not n.lift_reference:
        rows.append(("Lift per axle", "not available: no result with cl_front and cl_rear"))
    rows += [(f"Energy on {n.cycle}", f"{n.energy_kWh_per_100km:.2f} kWh per 100 km "
                                         f"({'fuel' if n.litres_per_100km else 'battery'}); "
                                         f"aerodynamic share {PERCENT(n.aero_share)}")]
    if n.litres_per_100km:
        rows.append(("Fuel on the cycle", f"{n.litres_per_100km:.2f} L per 100 km"))
    if n.range_km:
        rows.append(("Range on the cycle", f"{n.range_km:.0f} km"))
    for cycle, effect in n.per_10_counts.items():
        parts = [f"{effect['kwh_per_100km']:+.3f} kWh/100 km"]
        if effect.get("litres_per_100km") is not None:
            parts.append(f"{effect['litres_per_100km']:+.3f} L/100 km")
        if effect.get("range_km") is not None:
            parts.append(f"{effect['range_km']:+.1f} km of range")
        rows.append((f"+10 counts on {cycle}", ", ".join(parts)))
    rows += estimate_rows(review)
    table = ["## Key numbers", "", "| Quantity | Value |", "|---|---|"] + [f"| {a} | {b} |" for a, b in rows]
    if review.assumptions:
        table += ["", "Assumed where the sheet is silent: " + "; ".join(esc(a) for a in review.assumptions) + "."]
    return table + [""]


def surface_agreement(review: Review) -> list[str]:
    """Each sheet value beside what its own surface measures, flagged where they disagree
    (the comparison is the data-quality rule's, :mod:`aeroreview.rules.surface_agreement`)."""
    finding = next((f for f in review.findings if f.rule.id == "data.surface-agreement"), None)
    details = finding.verdict.details if finding else None
    if not details:
        return []
    lines = ["## Sheet against its surface", "",
             f"Each value the sheet gives beside what its surface <code>{esc(details['file'])}</code> measures "
             f"({esc(finding.verdict.limit)}).", "",
             "| Feature | Sheet | Surface | Tolerance | Agrees |", "|---|---|---|---|---|"]
    for row in details["compared"]:
        unit = catalogue.feature(row["key"]).unit
        flag = "yes" if row["agrees"] else f"{badge(finding.status)} no"
        lines.append(f"| `{row['key']}` | {format_quantity(row['sheet'], unit)} | {format_quantity(row['surface'], unit)} "
                     f"| ±{format_quantity(row['tolerance'], unit)} | {flag} |")
    lines += [f"- `{key}` not compared: {esc(why)}" for key, why in details["doubts"].items()]
    return lines + [""]


def estimate_rows(review: Review) -> list[tuple[str, str]]:
    """The combined estimate (the headline), the floor it saturates toward, and the plain sum (labelled)."""
    e, after = review.estimate, review.estimate.cd_after
    raised = f", raised for {', '.join(e.raised_for)}" if e.raised_for else ""
    confidence = "no data-quality check assessed" if review.confidence is None else \
        f"{PERCENT(review.confidence)} of the data-quality checks pass"
    return [("Recoverable drag, combined", f"{e.mid:.1f} counts (low {e.low:.1f}, high {e.high:.1f})"),
            ("Cd after the fixes, combined", f"{after['mid']:.3f} ({after['low']:.3f}-{after['high']:.3f})"),
            ("Floor of the class", f"Cd {e.floor_cd:.3f}{raised}"),
            ("Plain sum of the findings", f"{e.plain_sum_low:.1f}-{e.plain_sum_high:.1f} counts (plain sum, "
                                          "not a prediction: fixes interact)"),
            ("Confidence", confidence)]


def findings(review: Review) -> list[str]:
    out = ["## Findings by zone", ""]
    for zone, title in ZONES.items():
        items = [f for f in review.findings if f.rule.zone == zone]
        if not items:
            continue
        zone_score = review.zones[zone]
        shown = whole_score(zone_score.score)
        out += [f"### {title}", "", f"Zone score {shown} (coverage {PERCENT(zone_score.coverage)}).", "",
                "| Status | Rule | Finding | Measured (limit) | Estimate | Consequence of the fix |",
                "|---|---|---|---|---|---|"]
        items.sort(key=lambda f: (-status_rank(f.status), f.rule.id))
        for f in items:
            out.append(f"| {badge(f.status)}{' (waived)' if f.waived else ''} "
                       f"| {link(f'rules/{f.rule.id}.md', f.rule.id, 2)} | {esc(f.verdict.message)} "
                       f"| {measured(f)} | {estimate(f)} | {consequence(f)} |")
        details = [f for f in items if f.actionable]
        if details:
            out += ["", "Fixes, sources and waivers:", ""]
            out += [f"- **{f.rule.id}**: {esc(f.fix)} *Sources:* {sources(f)}.{waiver(f)}" for f in details]
        out.append("")
    return out


def sources(f: Finding) -> str:
    """The sources, and why a team calibration of the rule's feature was not applied to this finding."""
    unused = f" (calibration not applied: {esc(f.calibration['note'])})" \
        if f.calibration and not f.calibration["applied"] else ""
    return "; ".join(f"{esc(s.citation)}{kind_suffix(s)}" for s in f.sources) + unused


def waiver(f: Finding) -> str:
    if not f.waiver:
        return ""
    return (f" **Waiver ({f.waiver.status})**: {esc(f.waiver.reason)}"
            f"{', by ' + esc(f.waiver.by) if f.waiver.by else ''}"
            f"{', expires ' + f.waiver.expires if f.waiver.expires else ''}.")


def ranked_fixes(review: Review) -> list[str]:
    fixes = review.ranked_fixes
    if not fixes:
        return ["## Ranked fixes", "", "No costed finding: nothing to recover.", ""]
    marginal = dict(review.estimate.waterfall)
    out = ["## Ranked fixes", "", f"By the middle of each estimate, with each fix's marginal saving given the fixes "
           f"ranked before it; {ADDITIVITY_NOTE}.", ""]
    for i, f in enumerate(fixes, 1):
        out.append(f"{i}. **{f.rule.id}** ({f.status}): {estimate(f)}, marginal {marginal.get(f.rule.id, 0):.1f} "
                   f"counts; {consequence(f)}")
    return out + [""]


def attachments(out: Output, review: Review) -> list[str]:
    """The attachments by zone. The plugin copies the files (``Site.copies``, streamed, unchanged)
    from the real paths :func:`~aeroreview.paths.contained_file` checks once more; the caption
    goes through :func:`esc` and the path is percent-encoded, so no file name can add markup."""
    sheet = review.sheet
    if not sheet.attachments:
        return []
    lines = ["## Attachments", ""]
    folder = Path(sheet.path).parent
    for zone, zone_title in catalogue.ALL_ZONES.items():
        for attachment in (a for a in sheet.attachments if a.zone == zone):
            relative = f"files/{sheet.revision}/{PurePosixPath(attachment.file).as_posix()}"
            real = contained_file(folder, attachment.file, IMAGE_SUFFIXES, "attachment")
            out.site.copies[f"fleet/{sheet.vehicle_id}/{relative}"] = real
            caption = esc(attachment.caption or attachment.file)
            lines += [f"**{zone_title}**: {caption}", "", f"![{caption}]({quote(relative)})", ""]
    return lines


def measured(f: Finding) -> str:
    shown, limit = esc(f.verdict.measured or ""), esc(f.verdict.limit or "")
    return f"{shown} ({limit})" if shown and limit else shown or limit


def estimate(f: Finding) -> str:
    parts = []
    if f.counts and f.counts[1]:
        parts.append(f"{f.counts[0]:g}-{f.counts[1]:g} counts")
    if f.actionable:
        for axle, change in (("front", f.verdict.cl_front), ("rear", f.verdict.cl_rear)):
            if change:
                parts.append(f"cl {axle} {change:+.2f}")
    return ", ".join(parts)


def consequence(f: Finding) -> str:
    c = f.consequences
    if not c:
        return ""
    parts = [f"{c.power_W_at_reference_speed[0]:.0f}-{c.power_W_at_reference_speed[1]:.0f} W",
             f"{c.energy_kWh_per_100km[0]:.2f}-{c.energy_kWh_per_100km[1]:.2f} kWh/100 km"]
    if c.litres_per_100km:
        parts.append(f"{c.litres_per_100km[0]:.2f}-{c.litres_per_100km[1]:.2f} L/100 km")
    if c.range_km:
        parts.append(f"{c.range_km[0]:.1f}-{c.range_km[1]:.1f} km range")
    return ", ".join(parts)
