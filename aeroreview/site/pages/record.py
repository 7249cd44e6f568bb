"""The fleet's track record: every parent-child pair's predicted change of Cd against the measured one."""

from __future__ import annotations

from aeroreview.display import PERCENT
from aeroreview.site.pages.common import Output, esc, link
from aeroreview.track_record import Pair, summary

INTRO = ("For every parent-child pair of revisions that both carry a measured drag coefficient of the same kind "
         "(CFD with CFD, tunnel with tunnel, the same model scale, speeds within 10 %), the combination model "
         "predicts the change of Cd from the findings, and the prediction is set beside the measured change. "
         "Changes are child minus parent in counts (0.001 of Cd), negative when drag falls. How the prediction "
         "is made: {method}.")


def summary_text(found: list[Pair]) -> str:
    s = summary(found)
    if not s["pairs"]:
        return "No pair of revisions has same-kind measured results yet: no track record."
    return (f"{s['pairs']} pair(s): mean absolute error {s['mean_abs_error_counts']:.1f} counts, bias "
            f"{s['bias_counts']:+.1f} counts (predicted mid minus measured), "
            f"{PERCENT(s['within_range_share'])} of the measured changes inside the predicted range.")


def write(out: Output, found: list[Pair]) -> None:
    lines = ["# Track record", "", INTRO.format(method=link("methods/estimates.md", "the estimates method", 1)), "",
             f"**{summary_text(found)}**", ""]
    if found:
        lines += ["| Vehicle | From | To | Kind | Predicted low / mid / high [counts] | Measured [counts] "
                  "| Error [counts] | Inside the range |", "|---|---|---|---|---|---|---|---|"]
        for p in found:
            low, mid, high = p.predicted
            lines.append(f"| {link(f'fleet/{p.vehicle}/index.md', esc(p.vehicle), 1)} | {esc(p.parent)} "
                         f"| {esc(p.child)} | {p.kind} | {low:+.1f} / {mid:+.1f} / {high:+.1f} | {p.measured:+.1f} "
                         f"| {p.error:+.1f} | {'yes' if p.within_range else 'no'} |")
        data = {"pairs": [{"label": f"{p.vehicle} {p.parent}-{p.child}", "measured": round(p.measured, 2),
                           "low": round(p.predicted[0], 2), "mid": round(p.predicted[1], 2),
                           "high": round(p.predicted[2], 2)} for p in found]}
        alt = "Predicted against measured change of Cd with the 1:1 line: " + "; ".join(
            f"{esc(p.vehicle)} {esc(p.parent)} to {esc(p.child)} predicted {p.predicted[1]:+.1f}, measured "
            f"{p.measured:+.1f}" for p in found)
        lines += ["", out.figure("track-record", data, alt, 1), ""]
    out.page("fleet/track-record.md", "\n".join(lines) + "\n")
