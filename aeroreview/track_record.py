"""Predicted against measured: the knowledge base's track record.

For every parent-child pair of revisions that both carry a measured drag coefficient of the
same kind (CFD with CFD, tunnel with tunnel, road with road; the same model scale; speeds
within 10 %), the combination model predicts the change of Cd from the findings, and the
prediction is set beside the measured change. The prediction is the drop in what the
unresolved findings claim, parent's claims minus child's, both measured against the
parent's frame (its Cd, floor and budgets), so resolved, improved, appeared and worse
findings all count through one formula, and unchanged ones cancel except for how they
share a budget with the ones that changed. Rules assessed in only one of the two
revisions say nothing about the change and are left out.

Each pair compares results of record (:func:`aeroreview.rules.result_quality.result_of_record`):
the child's result of record among its measured results, and the parent's among its results
that match it (kind, scale, speed), so a marked result is used wherever it can be.
"""

from __future__ import annotations

from dataclasses import dataclass

from aeroreview.estimate import Frame, claim_of, combined, rescaled
from aeroreview.rules import NOT_ASSESSED
from aeroreview.rules.result_quality import result_of_record

SPEED_TOLERANCE = 0.10  # same-speed pairs: within 10 % (the review's convention, common practice)
MEASURED_KINDS = ("cfd", "tunnel", "road")  # estimates are not measurements


@dataclass(frozen=True)
class Pair:
    vehicle: str
    parent: str
    child: str
    kind: str
    parent_cd: float
    child_cd: float
    predicted: tuple[float, float, float]  # low <= mid <= high, change of Cd in counts (negative: drag falls)

    @property
    def measured(self) -> float:
        """The measured change of Cd [counts], child minus parent."""
        return (self.child_cd - self.parent_cd) * 1000

    @property
    def error(self) -> float:
        """Predicted mid minus measured [counts]."""
        return self.predicted[1] - self.measured

    @property
    def within_range(self) -> bool:
        return self.predicted[0] <= self.measured <= self.predicted[2]


def matching_results(parent, child):
    """The parent's and the child's results of record that can be compared, or None."""
    mine = result_of_record([r for r in child.results if r.kind in MEASURED_KINDS])
    if mine is None or mine.speed is None:
        return None
    theirs = result_of_record([r for r in parent.results if r.kind == mine.kind and r.scale == mine.scale
                               and r.speed is not None and abs(mine.speed - r.speed) <= SPEED_TOLERANCE * r.speed])
    return None if theirs is None else (theirs, mine)


def predicted_change(parent_review, child_review, frame: Frame) -> tuple[float, float, float]:
    """The change of Cd [counts] the findings predict, low <= mid <= high."""
    both = {f.rule.id for f in parent_review.findings if f.status != NOT_ASSESSED} & \
        {f.rule.id for f in child_review.findings if f.status != NOT_ASSESSED}

    def claims(review):
        return [c for c in (claim_of(f) for f in review.findings if f.rule.id in both) if c]

    before, after = claims(parent_review), claims(child_review)
    low, mid, high = (combined(after, frame, end) - combined(before, frame, end) for end in ("low", "mid", "high"))
    return (min(low, mid, high), mid, max(low, mid, high))


def pairs(reviews) -> list[Pair]:
    """Every parent-child pair among ``reviews`` with same-kind measured results, in review order."""
    by_revision = {(r.sheet.vehicle_id, r.sheet.revision): r for r in reviews}
    out = []
    for child in reviews:
        parent = by_revision.get((child.sheet.vehicle_id, child.sheet.parent))
        found = parent and matching_results(parent.sheet, child.sheet)
        if found:
            before, after = found
            predicted = predicted_change(parent, child, rescaled(parent.frame, before.cd))
            out.append(Pair(child.sheet.vehicle_id, parent.sheet.revision, child.sheet.revision, after.kind,
                            before.cd, after.cd, predicted))
    return out


def summary(found: list[Pair]) -> dict:
    """Mean absolute error and bias [counts], and the share of measured changes inside the predicted range."""
    if not found:
        return {"pairs": 0, "mean_abs_error_counts": None, "bias_counts": None, "within_range_share": None}
    n = len(found)
    return {"pairs": n, "mean_abs_error_counts": sum(abs(p.error) for p in found) / n,
            "bias_counts": sum(p.error for p in found) / n,
            "within_range_share": sum(p.within_range for p in found) / n}
