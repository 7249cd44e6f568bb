"""The generated pages of the review site, as Markdown, from the reviews.

:func:`generate` returns every generated file (path inside the site's docs, and its text or
bytes): the fleet, each vehicle, each revision, each pair of consecutive revisions, each
rule, each calibration, the feature reference, and the figures they show; and the attachments the plugin
copies. One module per page kind writes its pages and only formats: what a page shows is
computed by the engine (the review, and :mod:`aeroreview.digest`) and handed over typed.
Sheet text reaches a page only through :func:`~aeroreview.site.pages.common.esc`.
"""

from __future__ import annotations

import datetime

from aeroreview import digest, track_record
from aeroreview.memo import Memo
from aeroreview.review import Review
from aeroreview.settings import Settings
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import calibrations, diff, features, fleet, record, revision, rules, vehicle
from aeroreview.site.pages.common import Output, Site, esc, heading

__all__ = ["Site", "esc", "generate", "heading"]

_FAR_PAST = datetime.date(1900, 1, 1)  # sorts revisions without a review date first


def by_vehicle(reviews: list[Review]) -> dict[str, list[Review]]:
    """Reviews grouped by vehicle, each vehicle's revisions in review order."""
    grouped: dict[str, list[Review]] = {}
    for review in sorted(reviews, key=lambda r: (r.sheet.vehicle_id, r.sheet.reviewed or _FAR_PAST,
                                                 r.sheet.revision)):
        grouped.setdefault(review.sheet.vehicle_id, []).append(review)
    return grouped


def generate(reviews: list[Review], settings: Settings, cache: FigureCache) -> Site:
    """Every generated file of the site."""
    out = Output(settings, cache, Memo(cache.folder.parent / "aeroreview-data" if cache.folder else None))
    grouped = by_vehicle(reviews)
    geometry_cache = cache.folder.parent / "aeroreview-geometry" if cache.folder else None
    fleet.write(out, grouped)
    found = track_record.pairs(reviews)
    record.write(out, found)
    pair_of = {(p.vehicle, p.parent, p.child): p for p in found}
    for vehicle_id, revisions in grouped.items():
        vehicle.write(out, vehicle_id, revisions)
        drawn = {}
        for review in revisions:
            drawn[review.sheet.revision] = digest.revision_figures(review, settings, geometry_cache, out.memo)
            revision.write(out, review, drawn[review.sheet.revision])
        known = {r.sheet.revision: r for r in revisions}
        for review in revisions:
            if review.sheet.parent in known:
                before = known[review.sheet.parent]
                buildups = (drawn[before.sheet.revision].buildup, drawn[review.sheet.revision].buildup)
                diff.write(out, before, review, digest.changes(before, review, buildups),
                           track_record.predicted_change(before, review, before.frame),
                           pair_of.get((vehicle_id, before.sheet.revision, review.sheet.revision)))
    rules.write(out, grouped)
    calibrations.write(out, reviews)
    features.write(out)
    out.draw_figures()
    return out.site
