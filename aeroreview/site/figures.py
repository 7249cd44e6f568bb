"""Figures for the review site: matplotlib SVG, deterministic, colour-blind safe.

Every figure is a pure function of a small JSON-able ``data`` mapping, drawn by
:class:`FigureCache`, which stores the SVG under a hash of (figure kind, data, figure code
version): a rebuild redraws only the figures whose inputs changed, and the same input
always gives the same bytes (fixed SVG hash salt, no date, text kept as text).

Palette: Okabe and Ito, "Color universal design" (2002), safe for the common forms of
colour blindness; status is always written in words too, never by colour alone.
"""

from __future__ import annotations

import hashlib
import io
import json
import os
import tempfile
from pathlib import Path

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

FIGURE_VERSION = "2"  # bump when a drawing function changes, so cached SVGs are redrawn

OKABE_ITO = {"orange": "#E69F00", "sky": "#56B4E9", "green": "#009E73", "yellow": "#F0E442",
             "blue": "#0072B2", "vermillion": "#D55E00", "purple": "#CC79A7", "black": "#000000",
             "grey": "#999999"}
STATUS_COLOURS = {"pass": OKABE_ITO["green"], "advisory": OKABE_ITO["sky"], "warning": OKABE_ITO["orange"],
                  "failure": OKABE_ITO["vermillion"], "not assessed": OKABE_ITO["grey"]}

# "text.parse_math": False draws every text literally: sheet text such as "Price $\\foo$" is
# neither typeset as math nor able to stop a build with a mathtext parse error.
STYLE = {
    "text.parse_math": False, "svg.hashsalt": "aeroreview", "svg.fonttype": "none", "font.size": 9, "axes.grid": True,
    "grid.alpha": 0.3, "axes.spines.top": False, "axes.spines.right": False, "figure.dpi": 100,
}


def _svg(figure) -> bytes:
    buffer = io.BytesIO()
    figure.savefig(buffer, format="svg", metadata={"Date": None}, bbox_inches="tight")
    plt.close(figure)
    return buffer.getvalue()


def _figure(width=6.4, height=3.4):
    return plt.subplots(figsize=(width, height))


def drag_power(data) -> bytes:
    fig, ax = _figure()
    ax.plot(data["speed_km_h"], data["drag_N"], color=OKABE_ITO["blue"], label="drag force")
    ax.set_xlabel("speed [km/h]")
    ax.set_ylabel("drag force [N]", color=OKABE_ITO["blue"])
    right = ax.twinx()
    right.plot(data["speed_km_h"], data["power_kW"], color=OKABE_ITO["vermillion"], linestyle="--", label="drag power")
    right.set_ylabel("drag power [kW]", color=OKABE_ITO["vermillion"])
    right.grid(False)
    ax.axvline(data["reference_km_h"], color=OKABE_ITO["grey"], linewidth=0.8)
    lines = ax.get_lines()[:1] + right.get_lines()
    ax.legend(lines, [line.get_label() for line in lines], loc="upper left")
    ax.set_title(f"Drag and power in still air (Cd {data['cd']:.3f}, A {data['area']:.2f} m²)")
    return _svg(fig)


def lift(data) -> bytes:
    fig, ax = _figure()
    ax.plot(data["speed_km_h"], data["front_kg"], color=OKABE_ITO["blue"], label="front axle")
    ax.plot(data["speed_km_h"], data["rear_kg"], color=OKABE_ITO["orange"], linestyle="--", label="rear axle")
    ax.axhline(0, color=OKABE_ITO["black"], linewidth=0.6)
    ax.set_xlabel("speed [km/h]")
    ax.set_ylabel("lift per axle [kg] (positive unloads)")
    right = ax.twinx()
    right.set_ylim(*(limit / data["rear_static_kg"] * 100 for limit in ax.get_ylim()))
    right.set_ylabel("share of static rear axle load [%]")
    right.grid(False)
    for speed, label in ((data["reference_km_h"], "reference"), (data["top_km_h"], "top speed")):
        ax.axvline(speed, color=OKABE_ITO["grey"], linewidth=0.8)
        ax.annotate(label, (speed, ax.get_ylim()[1]), fontsize=7, ha="right", va="top", rotation=90)
    ax.legend(loc="upper left")
    ax.set_title(f"Lift per axle (cl front {data['cl_front']:+.3f}, cl rear {data['cl_rear']:+.3f})")
    return _svg(fig)


def energy(data) -> bytes:
    fig, ax = _figure(6.4, 2.6)
    names = ["rolling", "aerodynamic", "braking"]
    values = [data["rolling"], data["aero"], data["braking"]]
    colours = [OKABE_ITO["sky"], OKABE_ITO["vermillion"], OKABE_ITO["grey"]]
    bars = ax.barh(names, values, color=colours)
    if data["recovered"]:
        ax.barh(["braking"], [data["recovered"]], color=OKABE_ITO["green"], hatch="//", label="recovered by regeneration")
        ax.legend(loc="lower right")
    for bar, value in zip(bars, values):
        ax.annotate(f"{value:.2f} kWh", (bar.get_width(), bar.get_y() + bar.get_height() / 2), xytext=(3, 0),
                    textcoords="offset points", va="center", fontsize=8)
    ax.set_xlabel(f"energy dissipated at the wheels over one {data['cycle']} cycle [kWh]")
    ax.set_title(f"Energy breakdown on {data['cycle']}: aerodynamic share {data['aero_share'] * 100:.0f} %")
    ax.set_xlim(0, max(values) * 1.3 if max(values) else 1)
    return _svg(fig)


def ahmed(data) -> bytes:
    fig, ax = _figure()
    ax.plot(*zip(*data["attached"]), color=OKABE_ITO["blue"], marker="o", markersize=3, label="attached slant flow")
    ax.plot(*zip(*data["separated"]), color=OKABE_ITO["orange"], marker="s", markersize=3,
            label="separated slant flow")
    ax.axvspan(data["critical_low"], data["critical_high"], color=OKABE_ITO["vermillion"], alpha=0.12,
               label="critical region")
    if data.get("angle") is not None:
        ax.axvline(data["angle"], color=OKABE_ITO["black"], linestyle=":", linewidth=1.2)
        ax.annotate(f"this revision: {data['angle']:.1f} deg", (data["angle"], ax.get_ylim()[1]), fontsize=8,
                    ha="right", va="top", rotation=90)
    ax.set_xlabel("rear slant (backlight) angle from horizontal [deg]")
    ax.set_ylabel("Ahmed body drag coefficient [-]")
    ax.legend(loc="upper left")
    ax.set_title("Ahmed, Ramm and Faltin (1984): drag against slant angle (values from memory)")
    return _svg(fig)


def waterfall(data) -> bytes:
    """Each ranked fix's marginal saving given those before it, down to the combined mid; the floor drawn."""
    steps = data["steps"] + ([["other fixes", data["rest"]]] if data["rest"] else [])
    fig, ax = _figure(6.4, max(2.4, 0.28 * (len(steps) + 2)))
    labels = ["current"] + [s[0] for s in steps] + ["combined mid"]
    level = data["cd"]
    ax.barh(0, level, color=OKABE_ITO["blue"])
    for i, (_, counts) in enumerate(steps, start=1):
        saving = counts / 1000
        ax.barh(i, -saving, left=level, color=OKABE_ITO["green"])
        level -= saving
    ax.barh(len(steps) + 1, level, color=OKABE_ITO["sky"])
    ax.axvline(data["floor_cd"], color=OKABE_ITO["vermillion"], linestyle="--", linewidth=1.2)
    ax.set_yticks(range(len(labels)), labels, fontsize=7)
    ax.invert_yaxis()
    ax.set_xlim(min(level, data["floor_cd"]) - 0.01, data["cd"] * 1.02)
    ax.annotate(f"floor of the class: Cd {data['floor_cd']:.3f}", (data["floor_cd"], 1), xycoords=("data", "axes fraction"),
                xytext=(0, 4), textcoords="offset points", ha="center", fontsize=7, color=OKABE_ITO["vermillion"])
    ax.set_xlabel("drag coefficient [-] (marginal mid saving of each fix given the fixes above it)")
    ax.set_title(f"Cd {data['cd']:.3f} to about {level:.3f} with every fix combined", pad=16)
    return _svg(fig)


def track_record(data) -> bytes:
    """Predicted against measured change of Cd per pair, the predicted range as a bar, and the 1:1 line."""
    fig, ax = _figure(4.8, 4.4)
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


def zones(data) -> bytes:
    fig, ax = _figure(6.4, 3.0)
    names = [z["title"] for z in data["zones"]]
    scores = [z["score"] if z["score"] is not None else 0 for z in data["zones"]]
    colours = [OKABE_ITO["grey"] if z["score"] is None else OKABE_ITO["blue"] for z in data["zones"]]
    bars = ax.barh(names, scores, color=colours)
    for bar, zone in zip(bars, data["zones"]):
        text = "not assessed" if zone["score"] is None else f"{zone['score']:.0f}"
        ax.annotate(f"{text} (coverage {zone['coverage'] * 100:.0f} %)", (bar.get_width(), bar.get_y() + 0.4),
                    xytext=(3, 0), textcoords="offset points", va="center", fontsize=7)
    ax.set_xlim(0, 140)
    ax.set_xticks([0, 20, 40, 60, 80, 100])
    ax.invert_yaxis()
    ax.set_xlabel("zone score [0-100]")
    ax.set_title(f"Zone scores; overall {data['score']:.0f} with coverage {data['coverage'] * 100:.0f} %"
                 if data["score"] is not None else "Zone scores")
    return _svg(fig)


def yaw(data) -> bytes:
    fig, ax = _figure()
    ax.plot(data["yaw_deg"], data["cd"], color=OKABE_ITO["blue"], marker="o", markersize=3, label="Cd(yaw)")
    ax.axhline(data["cd_wind_averaged"], color=OKABE_ITO["vermillion"], linestyle="--",
               label=f"wind-averaged Cd {data['cd_wind_averaged']:.4f} (SAE J1252)")
    ax.axvspan(-data["max_yaw_deg"], data["max_yaw_deg"], color=OKABE_ITO["sky"], alpha=0.15,
               label=f"yaw range of a {data['wind_m_s']:.2f} m/s wind at {data['speed_km_h']:.0f} km/h")
    ax.set_xlabel("yaw angle [deg]")
    ax.set_ylabel("drag coefficient [-]")
    ax.legend(loc="upper center", fontsize=7)
    ax.set_title(f"Yaw sweep: {data['label']}")
    return _svg(fig)


def trends(data) -> bytes:
    fig, axes = plt.subplots(1, 3, figsize=(7.6, 2.6))
    for ax, key, label, colour in zip(axes, ("cd", "score", "recoverable"),
                                      ("Cd [-]", "score [0-100]", "recoverable counts (combined mid)"),
                                      (OKABE_ITO["blue"], OKABE_ITO["green"], OKABE_ITO["vermillion"])):
        values = [v if v is not None else float("nan") for v in data[key]]
        ax.plot(data["revisions"], values, color=colour, marker="o")
        ax.set_xlabel("revision")
        ax.set_ylabel(label)
    fig.suptitle(f"{data['name']}: revision trends", fontsize=9)
    fig.tight_layout()
    return _svg(fig)


def silhouette(data) -> bytes:
    """Centreline section; each zone's part of the outline in its review status colour."""
    fig, ax = _figure(7.6, 2.9)
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
    fig, ax = _figure(6.4, 3.4)
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
    fig, ax = _figure(6.4, 0.6 + 0.55 * len(rows))
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
    fig, ax = _figure(4.6, 4.2)
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
    fig, axes = plt.subplots(1, len(panels), figsize=(2.4 * len(panels) + 0.6, 2.6), sharey=True, squeeze=False)
    for ax, panel in zip(axes[0], panels):
        ax.scatter(panel["x"], panel["residual"], s=10, color=OKABE_ITO["blue"])
        ax.axhline(0, color=OKABE_ITO["black"], linewidth=0.8)
        ax.set_xlabel(panel["label"])
    axes[0][0].set_ylabel("residual [drag counts]")
    return _svg(fig)


def history(data) -> bytes:
    """A coefficient history: the settled window shaded, each settled mean with its band."""
    keys = list(data["values"])[:2]
    fig, axes = plt.subplots(len(keys), 1, figsize=(6.4, 1.9 + 1.5 * len(keys)), sharex=True, squeeze=False)
    for ax, key, colour in zip(axes[:, 0], keys, (OKABE_ITO["blue"], OKABE_ITO["orange"])):
        ax.plot(data["steps"], data["values"][key], color=colour, linewidth=0.8, label=key)
        start, end, mean, band = data["settled_from"], data["settled_to"], data["mean"][key], data["band"][key]
        ax.axvspan(start, end, color=OKABE_ITO["grey"], alpha=0.12, label="settled part (MSER-5)")
        ax.fill_between([start, end], mean - band, mean + band, color=OKABE_ITO["vermillion"], alpha=0.35,
                        label=f"mean {mean:.4f} +- {band / 0.001:.2f} counts (2 SE)")
        ax.plot([start, end], [mean, mean], color=OKABE_ITO["vermillion"], linewidth=1.0)
        values = [v for s, v in zip(data["steps"], data["values"][key]) if s >= start]
        spread = max(values) - min(values) if values else 0.0
        ax.set_ylim(min(values) - 2 * spread - 0.001, max(values) + 2 * spread + 0.001)  # the settled part in view
        ax.set_ylabel(key)
        ax.legend(loc="upper right", fontsize=7)
    axes[-1, 0].set_xlabel(data["step_name"])
    axes[0, 0].set_title(f"{data['label']}: {data['verdict']}")
    fig.tight_layout()
    return _svg(fig)


def _zone_bands(ax, zones) -> None:
    for index, zone in enumerate(zones):
        ax.axvspan(zone["start"], zone["end"], color=OKABE_ITO["sky"] if index % 2 else OKABE_ITO["yellow"],
                   alpha=0.12)
        ax.text(0.5 * (zone["start"] + zone["end"]), 1.01, zone["title"], transform=ax.get_xaxis_transform(),
                ha="center", va="bottom", fontsize=7)


def buildup(data) -> bytes:
    """Cumulative drag and lift from the nose rearward, with the zones along x."""
    fig, ax = _figure(6.4, 3.4)
    _zone_bands(ax, data["zones"])
    ax.plot(data["x"], data["cd"], color=OKABE_ITO["blue"], label=f"drag, Cd {data['cd'][-1]:.3f} at the tail")
    ax.plot(data["x"], data["cl"], color=OKABE_ITO["orange"], linestyle="--",
            label=f"lift, Cl {data['cl'][-1]:+.3f} at the tail")
    ax.axhline(0, color=OKABE_ITO["black"], linewidth=0.6)
    ax.set_xlabel("x from the nose [m]")
    ax.set_ylabel("cumulative coefficient [-]")
    ax.legend(loc="lower left", fontsize=7)
    ax.set_title(f"Build-up along the body: {data['label']}", pad=14)
    return _svg(fig)


def buildup_diff(data) -> bytes:
    """Two revisions' drag build-ups, and their difference in counts, with each zone's change written."""
    fig, (top, bottom) = plt.subplots(2, 1, figsize=(6.4, 4.8), sharex=True)
    for ax in (top, bottom):
        _zone_bands(ax, data["after"]["zones"])
    top.plot(data["before"]["x"], data["before"]["cd"], color=OKABE_ITO["grey"], linestyle="--",
             label=data["before"]["label"])
    top.plot(data["after"]["x"], data["after"]["cd"], color=OKABE_ITO["blue"], label=data["after"]["label"])
    top.set_ylabel("cumulative Cd [-]")
    top.legend(loc="lower left", fontsize=7)
    bottom.plot(data["x"], data["difference_counts"], color=OKABE_ITO["vermillion"])
    bottom.axhline(0, color=OKABE_ITO["black"], linewidth=0.6)
    for zone, change in zip(data["after"]["zones"], data["by_zone"]):
        bottom.text(0.5 * (zone["start"] + zone["end"]), 0.05, f"{change['change_counts']:+.1f}",
                    transform=bottom.get_xaxis_transform(), ha="center", fontsize=8)
    bottom.set_ylabel("difference [counts]")
    bottom.set_xlabel("x from the nose [m]")
    top.set_title(f"Drag build-up change: {data['total_counts']:+.1f} counts in all", pad=14)
    fig.tight_layout()
    return _svg(fig)


DRAWERS = {"drag-power": drag_power, "lift": lift, "energy": energy, "ahmed": ahmed, "waterfall": waterfall,
           "track-record": track_record,
           "zones": zones, "yaw": yaw, "trends": trends, "silhouette": silhouette, "sections": sections,
           "history": history, "buildup": buildup, "buildup-diff": buildup_diff,
           "calibration-slopes": calibration_slopes, "calibration-predicted": calibration_predicted,
           "calibration-residuals": calibration_residuals}


class FigureCache:
    """Draws figures on demand and keeps their SVG on disk, keyed by a hash of the inputs."""

    def __init__(self, folder: Path | None):
        self.folder = folder
        self.drawn = 0
        self.reused = 0

    @staticmethod
    def key(kind: str, data) -> str:
        text = json.dumps([FIGURE_VERSION, kind, data], sort_keys=True, separators=(",", ":"))
        return hashlib.sha256(text.encode()).hexdigest()[:20]

    def svg(self, kind: str, data) -> tuple[str, bytes]:
        """The figure's file name and SVG bytes."""
        key = self.key(kind, data)
        name = f"{kind}-{key}.svg"
        cached = self.folder / name if self.folder else None
        if cached and cached.is_file():
            self.reused += 1
            return name, cached.read_bytes()
        with plt.rc_context(STYLE):
            content = DRAWERS[kind](data)
        self.drawn += 1
        if cached:
            cached.parent.mkdir(parents=True, exist_ok=True)
            handle, temporary = tempfile.mkstemp(prefix=f".{name}.", suffix=".tmp", dir=cached.parent)
            with os.fdopen(handle, "wb") as stream:  # a unique name: concurrent builds share the cache
                stream.write(content)
            os.replace(temporary, cached)
        return name, content
