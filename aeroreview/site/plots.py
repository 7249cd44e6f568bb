"""The review's figures that matplotlib draws: the measured surface's equal-aspect geometry
(the silhouette with its zone notes, the horizontal sections).

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


DRAWERS = {"silhouette": silhouette, "sections": sections}


def draw(kind: str, data) -> bytes:
    with plt.rc_context(STYLE):
        return DRAWERS[kind](data)
