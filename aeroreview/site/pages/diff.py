"""The page of what changed between a revision and its parent."""

from __future__ import annotations

from aeroreview.digest import Changes
from aeroreview.review import Review
from aeroreview.track_record import Pair
from aeroreview.site.pages.common import Output, badge, esc, heading, link, recoverable_text, score_text


def write(out: Output, before: Review, after: Review, changes: Changes, predicted: tuple[float, float, float],
          pair: Pair | None) -> None:
    a, b = before.sheet, after.sheet
    old, new = before.key_numbers, after.key_numbers
    lines = [heading(f"{b.name}: {a.revision} to {b.revision}"), "",
             f"From [{esc(a.revision)}]({a.revision}.md) to [{esc(b.revision)}]({b.revision}.md).", "",
             "## Features that changed", ""]
    rows = [f"| `{c.key}` | {esc(c.before)} | {esc(c.after)} |" for c in changes.features]
    lines += (["| Feature | Before | After |", "|---|---|---|"] + rows) if rows else ["No feature changed."]
    lines += ["", "## Results", "", "| | Before | After |", "|---|---|---|",
              f"| Cd | {old['cd']:.3f} | {new['cd']:.3f} |",
              f"| CdA [m²] | {old['cda']:.3f} | {new['cda']:.3f} |",
              f"| Score | {score_text(before)} | {score_text(after)} |",
              f"| Recoverable [counts] | {recoverable_text(before)} | {recoverable_text(after)} |",
              f"| Energy on {new['cycle']} [kWh/100 km] | "
              f"{old['energy_kWh_per_100km']:.2f} | {new['energy_kWh_per_100km']:.2f} |",
              ""]
    lines += prediction(before, predicted, pair)
    lines += ["## Findings", ""]
    for name, items in changes.findings.items():
        lines += [f"### {name.capitalize()} ({len(items)})", ""]
        lines += [f"- {link(f'rules/{c.finding.rule.id}.md', c.finding.rule.id, 2)}: {c.was} → "
                  f"{badge(c.finding.status)} {esc(c.finding.verdict.message)}" for c in items] or ["None."]
        lines.append("")
    out.page(f"fleet/{b.vehicle_id}/{a.revision}-to-{b.revision}.md", "\n".join(lines))


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
