"""Charts of predictions against measurements, written as SVG directly (:mod:`aeroreview.site.svgchart`):
the track record and the calibration figures.

Why not matplotlib: these are markers, intervals and a 1:1 line on linear axes; matplotlib's
import and layout cost about a second of a cold site build for four figures. Equal aspect is
a square panel with the same limits on both axes. Labels that come from sheets or study tables
are shortened to the room they have, and notes beside a point go to its left when the right
side has no room, so every text stays on the canvas (the browser test measures them).
Palette and status words as in :mod:`aeroreview.site.charts`.
"""

from __future__ import annotations

from aeroreview.site.charts import OKABE_ITO
from aeroreview.site.svgchart import Chart, fit, text_width


def _padded(values: list[float], margin: float = 0.05) -> tuple[float, float]:
    """Limits around ``values`` with a margin of 5 % of their range each side (as matplotlib's)."""
    low, high = min(values), max(values)
    pad = (high - low) * margin or 0.5
    return low - pad, high + pad


def _note(ax, x: float, y: float, text: str, size: float, canvas: float, above: bool = True) -> None:
    """``text`` right of a point (and just above it), or left of it when it would run off the canvas."""
    px = ax.x.scale(ax.box[0], ax.box[2])(x)
    right = px + 6 + text_width(text, size) <= canvas - 3
    text = text if right else fit(text, px - 9, size)
    ax.text(x, y, text, size=size, anchor="start" if right else "end", baseline="alphabetic" if above else "middle",
            dx=5 if right else -5, dy=4 if above else 0)


def track_record(data) -> bytes:
    """Predicted against measured change of Cd per pair, the predicted range as a bar, and the 1:1 line."""
    chart = Chart(345.6, 326)  # about 4.8 x 4.5 in
    ax = chart.panel(64, 34, 29.6, 40)  # a 252 pt square
    pairs = data["pairs"]
    values = [v for p in pairs for v in (p["measured"], p["low"], p["high"])] + [0.0]
    low, high = min(values) - 5, max(values) + 5
    ax.plot([low, high], [low, high], OKABE_ITO["grey"], width=1, label="1:1 (prediction = measurement)")
    for p in pairs:
        inside = p["low"] <= p["measured"] <= p["high"]
        ax.errorbar(p["measured"], p["mid"], OKABE_ITO["green"] if inside else OKABE_ITO["vermillion"],
                    yerr=(p["low"], p["high"]))
    ax.x.low = ax.y.low = low
    ax.x.high = ax.y.high = high
    for p in pairs:
        inside = p["low"] <= p["measured"] <= p["high"]
        _note(ax, p["measured"], p["mid"], f"{p['label']} ({'inside' if inside else 'outside'})", 7, chart.width)
    ax.xlabel, ax.ylabel = "measured change of Cd [counts]", "predicted change of Cd [counts] (mid, low-high)"
    ax.legend("upper left")
    chart.title("Track record: predicted against measured", over=ax)
    return chart.svg()


def calibration_slopes(data) -> bytes:
    """Fitted sensitivities with their 95 % intervals beside the library's values (one row each)."""
    rows = data["slopes"]
    labels_width = min(180.0, max((text_width(row["label"]) for row in rows), default=0) + 14)
    height = 93.6 + 39.6 * len(rows)  # 1.3 in + 0.55 in a row
    chart = Chart(460.8, height)
    ax = chart.panel(labels_width, 30, 36, 36)
    for i, row in enumerate(rows):
        ax.errorbar(row["fit"], i, OKABE_ITO["blue"], xerr=tuple(row["ci95"]),
                    label="team data: fit and 95 % interval" if i == 0 else None)
    first = next((i for i, row in enumerate(rows) if row["library"] is not None), None)  # labels the legend once
    for i, row in enumerate(rows):
        if row["library"] is not None:
            ax.scatter([row["library"]], [i], OKABE_ITO["orange"], marker="D",
                       label="rule library" if i == first else None)
    ax.vline(0, OKABE_ITO["grey"])
    ax.y.low, ax.y.high, ax.y.inverted = -0.5, len(rows) - 0.5, True
    ax.y.ticks, ax.y.labels = list(range(len(rows))), [fit(row["label"], labels_width - 10) for row in rows]
    for i, row in enumerate(rows):
        if row["library"] is None:
            _note(ax, row["ci95"][1], i, "library silent", 8, chart.width, above=False)
    ax.xlabel = "drag counts per unit of the parameter"
    ax.legend("above", size=8)
    return chart.svg()


def calibration_predicted(data) -> bytes:
    """Cross-validated prediction against measurement, with the 1:1 line."""
    chart = Chart(331.2, 304)  # about 4.6 x 4.2 in
    ax = chart.panel(64, 12, 15.2, 40)  # a 252 pt square
    measured = data["measured"]
    markers = {"linear": ("o", OKABE_ITO["blue"]), "quadratic": ("^", OKABE_ITO["vermillion"])}
    for name, predicted in data["predicted"].items():
        marker, colour = markers[name]
        ax.scatter(measured, predicted, colour, marker=marker, alpha=0.8, label=f"{name} surface")
    ends = [min(measured + [v for p in data["predicted"].values() for v in p]),
            max(measured + [v for p in data["predicted"].values() for v in p])]
    ax.plot(ends, ends, OKABE_ITO["black"], width=1, label="1:1")
    ax.x.low, ax.x.high = ax.y.low, ax.y.high = _padded(ends)
    ax.xlabel, ax.ylabel = "measured [drag counts]", "cross-validated prediction [drag counts]"
    ax.legend("upper left", size=8)
    return chart.svg()


def calibration_residuals(data) -> bytes:
    """Residuals of the linear fit against each parameter: curvature or a trend shows as a pattern."""
    panels = data["residuals"]
    width = 172.8 * len(panels) + 43.2  # 2.4 in a panel + 0.6 in
    chart = Chart(width, 187.2)
    inner = (width - 64 - 10.8 - 20 * (len(panels) - 1)) / len(panels)
    everything = [v for panel in panels for v in panel["residual"]] or [0.0]
    for i, panel in enumerate(panels):
        left = 64 + i * (inner + 20)
        ax = chart.panel(left, 12, width - left - inner, 40)
        ax.scatter(panel["x"], panel["residual"], OKABE_ITO["blue"])
        ax.hline(0, OKABE_ITO["black"])
        ax.y.low, ax.y.high = _padded(everything)
        if i:  # the y axis is shared: its numbers only on the first panel
            ax.y.ticks = ax.y.tick_values()
            ax.y.labels = [""] * len(ax.y.ticks)
        else:
            ax.ylabel = "residual [drag counts]"
        ax.xlabel = fit(panel["label"], inner + 16)
    return chart.svg()


DRAWERS = {"track-record": track_record, "calibration-slopes": calibration_slopes,
           "calibration-predicted": calibration_predicted, "calibration-residuals": calibration_residuals}
