"""``check --baseline``: gate only on what got worse since a previous JSON report.

A finding counts against the gate when it is new, when its status rose, or, at the same
status, when its estimate or its distance beyond the limit grew by more than the margins
below. Everything else the gate would have caught is listed as suppressed by the baseline,
so nothing is hidden. Works on the JSON of both reports (:func:`aeroreview.report.as_json`).
"""

from __future__ import annotations

import json
import re
from dataclasses import dataclass
from pathlib import Path

from aeroreview.problems import InputError, Problem
from aeroreview.settings import status_rank

# A drag estimate that rose by more than 1 count is worse: production drag is quoted to the
# count, about the repeatability of a full-scale wind-tunnel test (common practice).
WORSE_COUNTS = 1.0
# A margin beyond the limit that grew by more than a tenth of itself is worse: smaller changes
# are within the scatter of reading a feature off a drawing or a surface (from memory).
WORSE_SHARE = 0.10
_MARGIN = re.compile(r"^\s*(?:[<>]=?\s*)?([+-]?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")


@dataclass(frozen=True)
class Before:
    """What the baseline said about one rule for one revision (or, by vehicle, its worst revision)."""

    status: str
    margin: tuple[float, str] | None
    counts: float | None  # high end of the drag estimate


def leading_number(text) -> tuple[float, str] | None:
    """The number a shown value starts with and the text after it: ``"+3.0 deg"`` gives (3.0, "deg")."""
    match = _MARGIN.match(text) if isinstance(text, str) else None
    return (float(match[1]), match[2]) if match else None


def _margin(text) -> tuple[float, str] | None:
    number = leading_number(text)
    return (abs(number[0]), number[1]) if number else None


def _counts(finding: dict) -> float | None:
    estimate = finding.get("estimate")
    return float(estimate["cd_counts_high"]) if estimate and estimate.get("cd_counts_high") is not None else None


def _before(finding: dict) -> Before:
    return Before(finding["status"], _margin(finding.get("margin")), _counts(finding))


def load(path: str) -> dict[tuple, Before]:
    """A previous JSON report, by (vehicle, revision, rule) and, for new revisions, by (vehicle, rule)."""
    try:
        data = json.loads(Path(path).read_text(encoding="utf-8"))
        found: dict[tuple, Before] = {}
        for sheet in data["sheets"]:
            for finding in sheet["findings"]:
                before = _before(finding)
                found[(sheet["vehicle"], sheet["revision"], finding["rule"])] = before
                key = (sheet["vehicle"], finding["rule"])
                if key not in found or status_rank(before.status) > status_rank(found[key].status):
                    found[key] = before
        return found
    except OSError as error:
        raise InputError([Problem(path, 1, 1, f"cannot read the baseline: {error.strerror}", "check the path")]) from None
    except (ValueError, KeyError, TypeError, AttributeError) as error:
        raise InputError([Problem(path, 1, 1, f"not an aeroreview JSON report ({type(error).__name__}: {error})",
                                  "make it with `aeroreview check --format json --output FILE`")]) from None


def worse(finding: dict, before: Before | None) -> str | None:
    """Why ``finding`` is worse than ``before`` (None when it is not)."""
    if before is None:
        return "new"
    if status_rank(finding["status"]) > status_rank(before.status):
        return f"status {before.status} -> {finding['status']}"
    if status_rank(finding["status"]) < status_rank(before.status) or finding["status"] == "pass":
        return None
    counts = _counts(finding)
    if counts is not None and before.counts is not None and counts - before.counts > WORSE_COUNTS:
        return f"estimate up to {before.counts:g} -> {counts:g} counts (margin {WORSE_COUNTS:g} count)"
    margin = _margin(finding.get("margin"))
    if margin and before.margin and margin[1] == before.margin[1] and \
            margin[0] - before.margin[0] > WORSE_SHARE * before.margin[0]:
        unit = f" {margin[1]}" if margin[1] else ""
        return (f"beyond the limit by {before.margin[0]:g} -> {margin[0]:g}{unit} "
                f"(margin {WORSE_SHARE:.0%} of the excess)")
    return None


def apply(data: dict, baseline: dict[tuple, Before]) -> None:
    """Keep in each sheet's ``failing`` only findings worse than the baseline; list the others as suppressed."""
    for sheet in data["sheets"]:
        by_rule = {f["rule"]: f for f in sheet["findings"]}
        kept, suppressed = [], []
        for rule in sheet["failing"]:
            before = baseline.get((sheet["vehicle"], sheet["revision"], rule), baseline.get((sheet["vehicle"], rule)))
            why = worse(by_rule[rule], before)
            if why:
                kept.append({"rule": rule, "why": why})
            else:
                suppressed.append({"rule": rule, "status": by_rule[rule]["status"]})
        sheet["failing"] = [k["rule"] for k in kept]
        sheet["baseline"] = {"worse": kept, "suppressed": suppressed}
