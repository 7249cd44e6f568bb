"""A vehicle's page: its revisions in order, with their trends."""

from __future__ import annotations

from aeroreview.display import whole_score
from aeroreview.review import Review
from aeroreview.site.pages.common import Output, esc, heading, link, recoverable_text, score_text


def write(out: Output, vehicle_id: str, reviews: list[Review]) -> None:
    latest = reviews[-1]
    revisions = {r.sheet.revision for r in reviews}
    lines = [heading(latest.sheet.name), "",
             f"Vehicle id `{vehicle_id}`, class {latest.sheet.get('vehicle.class')}, "
             f"{len(reviews)} revision(s).", "",
             "| Revision | Parent | Reviewed | Cd | Score (coverage) | Failures / warnings | Recoverable [counts] "
             "| Changes |", "|---|---|---|---|---|---|---|---|"]
    for review in reviews:
        sheet = review.sheet
        tally = review.counts_by_status()
        changes = link(f"{sheet.parent}-to-{sheet.revision}.md", "what changed", 0) if sheet.parent in revisions else ""
        lines.append(f"| {link(f'{sheet.revision}.md', esc(sheet.revision), 0)} | {esc(sheet.parent or '')} "
                     f"| {sheet.reviewed or ''} | {review.key_numbers.cd:.3f} | {score_text(review)} "
                     f"| {tally['failure']} / {tally['warning']} "
                     f"| {recoverable_text(review)} | {changes} |")
    data = {"name": latest.sheet.name, "revisions": [r.sheet.revision for r in reviews],
            "cd": [round(r.key_numbers.cd, 4) for r in reviews],
            "score": [r.score for r in reviews],
            "recoverable": [round(r.estimate.mid, 1) for r in reviews]}
    alt = (f"Revision trends of {latest.sheet.name}: Cd " + ", ".join(f"{c:.3f}" for c in data["cd"])
           + "; score " + ", ".join(whole_score(s, "none") for s in data["score"]))
    lines += ["", "## Trends", "", out.figure("trends", data, alt, 2), ""]
    out.page(f"fleet/{vehicle_id}/index.md", "\n".join(lines))
