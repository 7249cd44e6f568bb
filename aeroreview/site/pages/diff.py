"""The page of what changed between a revision and its parent."""

from __future__ import annotations

from dataclasses import asdict

from aeroreview.digest import Changes
from aeroreview.results.evidence import BuildupChange
from aeroreview.review import Review
from aeroreview.track_record import Pair
from aeroreview.site.pages.common import Output, badge, esc, heading, link, recoverable_text, score_text


def write(out: Output, before: Review, after: Review, changes: Changes, predicted: tuple[float, float, float],
          pair: Pair | None) -> None:
    a, b = before.sheet, after.sheet
    lines = [heading(f"{b.name}: {a.revision} to {b.revision}"), "",
             f"From [{esc(a.revision)}]({a.revision}.md) to [{esc(b.revision)}]({b.revision}.md).", "",
             "## Features that changed", ""]
    rows = [f"| `{c.key}` | {esc(c.before)} | {esc(c.after)} |" for c in changes.features]
    lines += (["| Feature | Before | After |", "|---|---|---|"] + rows) if rows else ["No feature changed."]
    if changes.geometry:
        lines += ["", f"Surface file changed: {esc(changes.geometry[0])} → {esc(changes.geometry[1])}."]
    lines += ["", "## Results", "", "| | Before | After | Change |", "|---|---|---|---|"]
    lines += [f"| {label} | {was} | {now} | {delta} |" for label, was, now, delta in _numbers(before, after)]
    if changes.buildup:
        lines += buildup(out, changes.buildup, a.revision, b.revision)
    lines += [""]
    lines += prediction(before, predicted, pair)
    lines += ["## Findings", ""]
    for name, items in changes.findings.items():
        lines += [f"### {name.capitalize()} ({len(items)})", ""]
        lines += [f"- {link(f'rules/{c.finding.rule.id}.md', c.finding.rule.id, 2)}: {c.was} → "
                  f"{badge(c.finding.status)} {esc(c.finding.verdict.message)}" for c in items] or ["None."]
        lines.append("")
    lines += [f"### Changed within their status ({len(changes.within_status)})", ""]
    lines += [f"- {link(f'rules/{c.finding.rule.id}.md', c.finding.rule.id, 2)}: {badge(c.finding.status)} "
              f"{esc(c.was_measured)} → {esc(c.finding.verdict.measured)} ({c.direction})"
              for c in changes.within_status] or ["None."]
    lines += ["", "## Waivers", ""]
    lines += [f"- {c.change}: {link(f'rules/{c.rule}.md', c.rule, 2)} ({esc(c.reason)})" for c in changes.waivers] \
        or ["No waiver added or removed."]
    out.page(f"fleet/{b.vehicle_id}/{a.revision}-to-{b.revision}.md", "\n".join(lines) + "\n")


def buildup(out: Output, change: BuildupChange, before: str, after: str) -> list[str]:
    """Both revisions' drag build-ups overlaid, their difference, and the change zone by zone."""
    zones = ", ".join(f"{z.title} {z.change_counts:+.1f}" for z in change.by_zone)
    alt = (f"Cumulative drag along x of {before} and {after} and their difference: {change.total_counts:+.1f} "
           f"counts in all; by zone, in counts: {zones}")
    lines = ["", "## Drag build-up along the body", "", out.figure("buildup-diff", asdict(change), alt, 2), "",
             f"| Zone | {esc(before)} [counts] | {esc(after)} [counts] | Change [counts] |", "|---|---|---|---|"]
    lines += [f"| {esc(z.title)} | {z.before_counts:.1f} | {z.after_counts:.1f} | {z.change_counts:+.1f} |"
              for z in change.by_zone]
    return lines + [f"| All | | | {change.total_counts:+.1f} |"]


def _numbers(before: Review, after: Review) -> list[tuple[str, str, str, str]]:
    """Rows of the results table: label, before, after, change (blank when not comparable)."""
    old, new = before.key_numbers, after.key_numbers
    rows = [("Cd", old.cd, new.cd, ".3f"), ("CdA [m²]", old.cda, new.cda, ".3f"),
            (f"Energy on {new.cycle} [kWh/100 km]", old.energy_kWh_per_100km, new.energy_kWh_per_100km, ".2f"),
            ("Range on the cycle [km]", old.range_km, new.range_km, ",.0f")]
    for axle in ("front", "rear"):
        lifts = [n.lift_reference.kg(axle) if n.lift_reference else None for n in (old, new)]
        rows.append((f"Lift on the {axle} axle at {new.reference_speed_km_h:.0f} km/h [kg]", *lifts, "+.0f"))
    out = []
    for label, was, now, spec in rows:
        shown = [format(v, spec) if v is not None else "not given" for v in (was, now)]
        delta = format(now - was, "+" + spec.lstrip("+")) if was is not None and now is not None else ""
        out.append((label, *shown, delta))
    out += [("Score", score_text(before), score_text(after), ""),
            ("Recoverable [counts]", recoverable_text(before), recoverable_text(after), "")]
    return out


def prediction(before: Review, predicted: tuple[float, float, float], pair: Pair | None) -> list[str]:
    """Predicted low-mid-high change of Cd from the findings, against the measured change when there is one."""
    low, mid, high = pair.predicted if pair else predicted
    lines = ["## Predicted against measured", "",
             f"From the findings that changed, the combination model predicts a change of Cd of {low:+.1f} / "
             f"{mid:+.1f} / {high:+.1f} counts (low / mid / high), against the parent's "
             f"Cd {pair.parent_cd if pair else before.estimate.cd:.3f}.", ""]
    if pair:
        verdict = "inside" if pair.within_range else "outside"
        lines += [f"Measured ({pair.kind}, Cd {pair.parent_cd:.3f} to {pair.child_cd:.3f}): {pair.measured:+.1f} "
                  f"counts, {verdict} the predicted range (error {pair.error:+.1f} counts). See the "
                  f"{link('fleet/track-record.md', 'track record', 2)}.", ""]
    else:
        lines += ["No measured change: the two revisions have no results of the same kind, scale and speed.", ""]
    return lines
