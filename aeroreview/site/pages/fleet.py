"""The fleet page and the home page's fleet table: each vehicle with its latest revision."""

from __future__ import annotations

from aeroreview.review import ADDITIVITY_NOTE, Review
from aeroreview.site.pages.common import CAUTION, Output, esc, link, recoverable_text, revision_path, score_text


def fleet_table(by_vehicle: dict[str, list[Review]], depth: int) -> str:
    rows = ["| Vehicle | Class | Latest revision | Cd | CdA [m²] | Score (coverage) | Failures / warnings "
            "| Recoverable [counts] | Reviewed |", "|---|---|---|---|---|---|---|---|---|"]
    for vehicle_id, reviews in sorted(by_vehicle.items()):
        latest = reviews[-1]
        numbers = latest.key_numbers
        tally = latest.counts_by_status()
        kind = "estimated" if numbers.cd_estimated else "measured"
        rows.append(
            f"| {link(f'fleet/{vehicle_id}/index.md', esc(latest.sheet.name), depth)} "
            f"| {latest.sheet.get('vehicle.class')} "
            f"| {link(revision_path(latest), esc(latest.sheet.revision), depth)} "
            f"| {numbers.cd:.3f} ({kind}) | {numbers.cda:.3f} | {score_text(latest)} "
            f"| {tally['failure']} / {tally['warning']} "
            f"| {recoverable_text(latest)} "
            f"| {latest.sheet.reviewed.isoformat() if latest.sheet.reviewed else 'not given'} |")
    return "\n".join(rows) + (f"\n\nRecoverable counts are the combined mid (low-high) of the unresolved findings; "
                               f"{ADDITIVITY_NOTE}. See the {link('methods/estimates.md', 'estimates method', depth)} "
                               f"and the {link('fleet/track-record.md', 'track record', depth)}.\n")


def write(out: Output, by_vehicle: dict[str, list[Review]]) -> None:
    """The fleet page, and the table the plugin puts into the home page."""
    out.site.home_table = fleet_table(by_vehicle, 0)
    out.page("fleet/index.md", "# Fleet\n\nEvery vehicle of the knowledge base with its latest reviewed revision.\n\n"
             + fleet_table(by_vehicle, 1) + "\n" + CAUTION)
