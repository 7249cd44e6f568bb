"""The review's figures that matplotlib draws: those with equal-aspect geometry, error bars or
scatter (the measured silhouette and sections, the track record, the calibration figures).

Each is a pure function of a small JSON-able ``data`` mapping and returns SVG bytes. Margins are
fixed per kind (``subplots_adjust``; no tight box, which costs a second layout pass), wide enough
for the labels and legends the kind holds; the browser test measures every text against the canvas.
Imported only when one of these is drawn, so a build that draws none never loads matplotlib.
"""

from __future__ import annotations

import io

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

from aeroreview.site.charts import OKABE_ITO, STATUS_COLOURS  # noqa: E402
from aeroreview.site.figures import STYLE  # noqa: E402
from aeroreview.site.svgchart import text_width  # noqa: E402

def _svg(figure) -> bytes:
    buffer = io.BytesIO()
    figure.savefig(buffer, format="svg", metadata={"Date": None})
    plt.close(figure)
    return buffer.getvalue()


def _figure(width, height, left, bottom, right, top):
    """A figure of width x height in with fixed margins, given in inches from each edge."""
    fig, ax = plt.subplots(figsize=(width, height))
    fig.subplots_adjust(left=left / width, bottom=bottom / height, right=1 - right / width, top=1 - top / height)
    return fig, ax


def track_record(data) -> bytes:
    """Predicted against measured change of Cd per pair, the predicted range as a bar, and the 1:1 line."""
    fig, ax = _figure(4.8, 4.4, left=0.75, bottom=0.55, right=0.2, top=0.35)
    pairs = data["pairs"]
    values = [v for p in pairs for v in (p["measured"], p["low"], p["high"])] or [0.0]
    low, high = min(values + [0.0]) - 5, max(values + [0.0]) + 5
    ax.plot([low, high], [low, high], color=OKABE_ITO["grey"], linewidth=1, label="1:1 (prediction = measurement)")
    for p in pairs:
        inside = p["low"] <= p["measured"] <= p["high"]
        colour = OKABE_ITO["green"] if inside else OKABE_ITO["vermillion"]
        ax.errorbar(p["measured"], p["mid"], yerr=[[p["mid"] - p["low"]], [p["high"] - p["mid"]]], fmt="o",
                    color=colour, capsize=3)
        ax.annotate(f"{p['label']} ({'inside' if inside else 'outside'})", (p["measured"], p["mid"]), xytext=(4, 4),
                    textcoords="offset points", fontsize=7)
    ax.set_xlim(low, high)
    ax.set_ylim(low, high)
    ax.set_aspect("equal")
    ax.set_xlabel("measured change of Cd [counts]")
    ax.set_ylabel("predicted change of Cd [counts] (mid, low-high)")
    ax.legend(loc="upper left", fontsize=7)
    ax.set_title("Track record: predicted against measured")
    return _svg(fig)


def silhouette(data) -> bytes:
    """Centreline section; each zone's part of the outline in its review status colour."""
    fig, ax = _figure(7.6, 2.9, left=0.65, bottom=0.95, right=0.15, top=0.35)
    for part in data["parts"]:
        xs, zs = zip(*part["points"])
        colour = STATUS_COLOURS.get(part["status"], OKABE_ITO["black"])
        ax.plot(xs, zs, color=colour, linewidth=2.4 if part["status"] else 1.2,
                label=f"{part['zone']}: {part['status']}" if part["status"] else None)
    for index, note in enumerate(data["notes"]):
        offset = 16 if index % 2 == 0 else -22  # alternate above and below the line, so labels do not collide
        ax.annotate(note["text"], (note["x"], note["z"]), xytext=(0, offset), textcoords="offset points", fontsize=7,
                    ha="center", arrowprops={"arrowstyle": "-", "color": OKABE_ITO["grey"], "linewidth": 0.6})
    ax.margins(y=0.25)
    ax.axhline(0, color=OKABE_ITO["grey"], linewidth=0.8)
    ax.set_aspect("equal")
    ax.set_xlabel("x from the nose [m]")
    ax.set_ylabel("z above ground [m]")
    if any(p["status"] for p in data["parts"]):
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.28), ncol=4, fontsize=7, frameon=False)
    ax.set_title(data["title"])
    return _svg(fig)


def sections(data) -> bytes:
    """Plan-view sections; the legend on the right, its margin sized from the longest label."""
    legend = max((text_width(s["label"], 7) for s in data["sections"]), default=0) / 72 + 0.6  # pt to in, handle
    fig, ax = _figure(6.4 + legend, 3.4, left=0.65, bottom=0.5, right=legend + 0.1, top=0.35)
    colours = [OKABE_ITO[c] for c in ("blue", "orange", "green", "vermillion", "purple", "sky", "black", "grey")]
    for colour, section in zip(colours * 4, data["sections"]):
        for key in ("upper", "lower"):
            xs, ys = zip(*section[key])
            ax.plot(xs, ys, color=colour, linewidth=1.0,
                    label=section["label"] if key == "upper" else None)
    ax.set_aspect("equal")
    ax.set_xlabel("x from the nose [m]")
    ax.set_ylabel("y [m]")
    ax.legend(loc="center left", bbox_to_anchor=(1.01, 0.5), fontsize=7, frameon=False)
    ax.set_title("Horizontal sections (plan view) with the rear taper at each height")
    return _svg(fig)


def calibration_slopes(data) -> bytes:
    """Fitted sensitivities with their 95 % intervals beside the library's values (one row each)."""
    rows = data["slopes"]
    fig, ax = _figure(6.4, 1.3 + 0.55 * len(rows), left=1.9, bottom=0.5, right=0.5, top=0.4)
    for i, row in enumerate(rows):
        low, high = row["ci95"]
        ax.errorbar(row["fit"], i, xerr=[[row["fit"] - low], [high - row["fit"]]], fmt="o", color=OKABE_ITO["blue"],
                    capsize=4, label="team data: fit and 95 % interval" if i == 0 else None)
        if row["library"] is not None:
            ax.plot(row["library"], i, marker="D", linestyle="none", color=OKABE_ITO["orange"],
                    label="rule library" if i == 0 else None)
        else:
            ax.annotate("library silent", (high, i), xytext=(6, 0), textcoords="offset points", va="center", fontsize=8)
    ax.axvline(0, color=OKABE_ITO["grey"], linewidth=0.8)
    ax.set_yticks(range(len(rows)), [row["label"] for row in rows])
    ax.invert_yaxis()
    ax.set_xlabel("drag counts per unit of the parameter")
    ax.legend(loc="lower center", bbox_to_anchor=(0.5, 1.0), ncol=2, fontsize=8, frameon=False)
    return _svg(fig)


def calibration_predicted(data) -> bytes:
    """Cross-validated prediction against measurement, with the 1:1 line."""
    fig, ax = _figure(4.6, 4.2, left=0.75, bottom=0.55, right=0.15, top=0.15)
    measured = data["measured"]
    markers = {"linear": ("o", OKABE_ITO["blue"]), "quadratic": ("^", OKABE_ITO["vermillion"])}
    for name, predicted in data["predicted"].items():
        marker, colour = markers[name]
        ax.scatter(measured, predicted, marker=marker, s=14, color=colour, alpha=0.8, label=f"{name} surface")
    ends = [min(measured + [v for p in data["predicted"].values() for v in p]),
            max(measured + [v for p in data["predicted"].values() for v in p])]
    ax.plot(ends, ends, color=OKABE_ITO["black"], linewidth=1, label="1:1")
    ax.set_xlabel("measured [drag counts]")
    ax.set_ylabel("cross-validated prediction [drag counts]")
    ax.set_aspect("equal", adjustable="datalim")
    ax.legend(loc="upper left", fontsize=8)
    return _svg(fig)


def calibration_residuals(data) -> bytes:
    """Residuals of the linear fit against each parameter: curvature or a trend shows as a pattern."""
    panels = data["residuals"]
    width = 2.4 * len(panels) + 0.6
    fig, axes = plt.subplots(1, len(panels), figsize=(width, 2.6), sharey=True, squeeze=False)
    fig.subplots_adjust(left=0.75 / width, bottom=0.55 / 2.6, right=1 - 0.15 / width, top=1 - 0.15 / 2.6, wspace=0.12)
    for ax, panel in zip(axes[0], panels):
        ax.scatter(panel["x"], panel["residual"], s=10, color=OKABE_ITO["blue"])
        ax.axhline(0, color=OKABE_ITO["black"], linewidth=0.8)
        ax.set_xlabel(panel["label"])
    axes[0][0].set_ylabel("residual [drag counts]")
    return _svg(fig)


DRAWERS = {"track-record": track_record, "silhouette": silhouette, "sections": sections,
           "calibration-slopes": calibration_slopes, "calibration-predicted": calibration_predicted,
           "calibration-residuals": calibration_residuals}


def draw(kind: str, data) -> bytes:
    with plt.rc_context(STYLE):
        return DRAWERS[kind](data)
