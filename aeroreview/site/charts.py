"""The review's simple charts, written as SVG directly (:mod:`aeroreview.site.svgchart`).

Each is a pure function of a small JSON-able ``data`` mapping and returns SVG bytes. Sizes
and margins are fixed per kind (in pt, matplotlib's 6.4 x 3.4 in figure is 460.8 x 244.8 pt),
wide enough for the longest label the kind can hold; sheet text in a title is shortened to
fit. Reference figures draw their shared part once (:func:`ahmed`).

Palette: Okabe and Ito, "Color universal design" (2002), safe for the common forms of
colour blindness; status is always written in words too, never by colour alone.
"""

from __future__ import annotations

import functools
import json

from aeroreview.display import whole_score
from aeroreview.site.svgchart import Chart, fit, text_width

OKABE_ITO = {"orange": "#E69F00", "sky": "#56B4E9", "green": "#009E73", "yellow": "#F0E442",
             "blue": "#0072B2", "vermillion": "#D55E00", "purple": "#CC79A7", "black": "#000000",
             "grey": "#999999"}
STATUS_COLOURS = {"pass": OKABE_ITO["green"], "advisory": OKABE_ITO["sky"], "warning": OKABE_ITO["orange"],
                  "failure": OKABE_ITO["vermillion"], "not assessed": OKABE_ITO["grey"]}
WIDE, TALL = 460.8, 244.8  # pt: 6.4 x 3.4 in


def zones(data) -> bytes:
    chart = Chart(WIDE, 216)
    ax = chart.panel(152, 26, 12, 38)  # left: the longest zone title (25 characters)
    rows = list(range(len(data["zones"])))
    scores = [z["score"] if z["score"] is not None else 0 for z in data["zones"]]
    ax.barh(rows, scores, [OKABE_ITO["grey"] if z["score"] is None else OKABE_ITO["blue"] for z in data["zones"]])
    for row, score, zone in zip(rows, scores, data["zones"]):
        text = whole_score(zone["score"])
        ax.text(score, row, f"{text} (coverage {zone['coverage'] * 100:.0f} %)", size=7, dx=3)
    ax.x.low, ax.x.high, ax.x.ticks = 0, 140, [0, 20, 40, 60, 80, 100]
    ax.y.low, ax.y.high, ax.y.inverted = -0.5, len(rows) - 0.5, True
    ax.y.ticks, ax.y.labels = rows, [z["title"] for z in data["zones"]]
    ax.xlabel = "zone score [0-100]"
    chart.title(f"Zone scores; overall {whole_score(data['score'])} with coverage {data['coverage'] * 100:.0f} %"
                if data["score"] is not None else "Zone scores", over=ax)
    return chart.svg()


def drag_power(data) -> bytes:
    chart = Chart(WIDE, TALL)
    ax = chart.panel(58, 26, 58, 40)
    ax.plot(data["speed_km_h"], data["drag_N"], OKABE_ITO["blue"], label="drag force")
    ax.vline(data["reference_km_h"], OKABE_ITO["grey"])
    right = chart.twin(ax)
    right.plot(data["speed_km_h"], data["power_kW"], OKABE_ITO["vermillion"], dash=True, label="drag power")
    ax.legend_entries += right.legend_entries
    ax.legend("upper left")
    ax.xlabel, ax.ylabel, ax.ylabel_colour = "speed [km/h]", "drag force [N]", OKABE_ITO["blue"]
    right.ylabel, right.ylabel_colour = "drag power [kW]", OKABE_ITO["vermillion"]
    chart.title(f"Drag and power in still air (Cd {data['cd']:.3f}, A {data['area']:.2f} m²)", over=ax)
    return chart.svg()


def lift(data) -> bytes:
    chart = Chart(WIDE, TALL)
    ax = chart.panel(58, 26, 58, 40)
    ax.plot(data["speed_km_h"], data["front_kg"], OKABE_ITO["blue"], label="front axle")
    ax.plot(data["speed_km_h"], data["rear_kg"], OKABE_ITO["orange"], dash=True, label="rear axle")
    ax.hline(0, OKABE_ITO["black"], width=0.6)
    for speed, label in ((data["reference_km_h"], "reference"), (data["top_km_h"], "top speed")):
        ax.vline(speed, OKABE_ITO["grey"])
        ax.text(speed, 1, label, size=7, anchor="end", baseline="hanging", rotate=True, dx=-1, dy=-2, axes_y=True)
    ax.legend("upper left")
    ax.xlabel, ax.ylabel = "speed [km/h]", "lift per axle [kg] (positive unloads)"
    low, high = ax.y.limits()
    right = chart.twin(ax)
    right.y.low, right.y.high = (limit / data["rear_static_kg"] * 100 for limit in (low, high))
    ax.y.low, ax.y.high = low, high
    right.ylabel = "share of static rear axle load [%]"
    chart.title(f"Lift per axle (cl front {data['cl_front']:+.3f}, cl rear {data['cl_rear']:+.3f})", over=ax)
    return chart.svg()


def energy(data) -> bytes:
    chart = Chart(WIDE, 187.2)  # 2.6 in
    ax = chart.panel(74, 26, 12, 40)
    values = [data["rolling"], data["aero"], data["braking"]]
    ax.barh([0, 1, 2], values, [OKABE_ITO["sky"], OKABE_ITO["vermillion"], OKABE_ITO["grey"]])
    if data["recovered"]:
        ax.barh([2], [data["recovered"]], [OKABE_ITO["green"]], hatch=True, label="recovered by regeneration")
        ax.legend("lower right")
    for row, value in enumerate(values):
        ax.text(value, row, f"{value:.2f} kWh", size=8, dx=3)
    ax.x.low, ax.x.high = 0, max(values) * 1.3 if max(values) else 1
    ax.y.low, ax.y.high = -0.5, 2.5
    ax.y.ticks, ax.y.labels = [0, 1, 2], ["rolling", "aerodynamic", "braking"]
    ax.xlabel = f"energy dissipated at the wheels over one {data['cycle']} cycle [kWh]"
    chart.title(f"Energy breakdown on {data['cycle']}: aerodynamic share {data['aero_share'] * 100:.0f} %", over=ax)
    return chart.svg()


def ahmed(data) -> bytes:
    """The reference curve drawn once per curve and angle range (the same on nearly every revision);
    this revision's marker added to it."""
    reference = {key: value for key, value in data.items() if key != "angle"}
    angles = [a for a, _ in data["attached"] + data["separated"]] + [data["critical_low"], data["critical_high"]]
    if data.get("angle") is not None:
        angles.append(data["angle"])  # an angle off the curve widens the axis, as in matplotlib
    head, scale, (_, top, _, bottom) = _ahmed_reference(json.dumps(reference, sort_keys=True), min(angles),
                                                        max(angles))
    if data.get("angle") is None:
        return head + b"</svg>\n"
    x = scale(data["angle"])
    label = f"this revision: {data['angle']:.1f} deg"
    return head + (f'<path d="M{x:.2f} {top:.2f}V{bottom:.2f}" stroke="#000000" stroke-width="1.2" '
                   f'stroke-dasharray="1.5,2.5"/><text x="{x - 1:.2f}" y="{top + 2:.2f}" font-size="8" '
                   f'text-anchor="end" dominant-baseline="hanging" transform="rotate(-90 {x - 1:.2f} {top + 2:.2f})">'
                   f'{label}</text></svg>\n').encode()


@functools.lru_cache(maxsize=8)
def _ahmed_reference(reference_json: str, low: float, high: float):
    """The curve's SVG without its closing tag, its x scale (angle -> pt) and its panel; drawn once."""
    data = json.loads(reference_json)
    chart = Chart(WIDE, TALL)
    ax = chart.panel(58, 26, 12, 40)
    ax.plot(*zip(*data["attached"]), OKABE_ITO["blue"], marker="o", label="attached slant flow")
    ax.plot(*zip(*data["separated"]), OKABE_ITO["orange"], marker="s", label="separated slant flow")
    ax.vspan(data["critical_low"], data["critical_high"], OKABE_ITO["vermillion"], 0.12, label="critical region")
    ax.x.seen += [low, high]
    ax.legend("upper left")
    ax.xlabel, ax.ylabel = "rear slant (backlight) angle from horizontal [deg]", "Ahmed body drag coefficient [-]"
    chart.title("Ahmed, Ramm and Faltin (1984): drag against slant angle (values from memory)", over=ax)
    svg = chart.svg()
    return svg[: -len(b"</svg>\n")], ax.x.scale(ax.box[0], ax.box[2]), ax.box


def waterfall(data) -> bytes:
    """Each ranked fix's marginal saving given those before it, down to the combined mid; the floor drawn."""
    steps = data["steps"] + ([["other fixes", data["rest"]]] if data["rest"] else [])
    chart = Chart(WIDE, max(172.8, 20.16 * (len(steps) + 2)) + 24)
    ax = chart.panel(132, 40, 12, 40)  # left: the longest rule id (29 characters) at 7 pt
    labels = ["current"] + [s[0] for s in steps] + ["combined mid"]
    level = data["cd"]
    ax.barh([0], [level], [OKABE_ITO["blue"]])
    for i, (_, counts) in enumerate(steps, start=1):
        ax.barh([i], [-counts / 1000], [OKABE_ITO["green"]], lefts=[level])
        level -= counts / 1000
    ax.barh([len(steps) + 1], [level], [OKABE_ITO["sky"]])
    ax.vline(data["floor_cd"], OKABE_ITO["vermillion"], width=1.2, dash=True)
    ax.y.ticks, ax.y.labels = list(range(len(labels))), labels
    ax.y.low, ax.y.high, ax.y.inverted = -0.5, len(labels) - 0.5, True
    ax.x.low, ax.x.high = min(level, data["floor_cd"]) - 0.01, data["cd"] * 1.02
    ax.text(data["floor_cd"], 1, f"floor of the class: Cd {data['floor_cd']:.3f}", size=7, anchor="middle",
            baseline="alphabetic", dy=4, colour=OKABE_ITO["vermillion"], axes_y=True)
    ax.xlabel = "drag coefficient [-] (marginal mid saving of each fix given the fixes above it)"
    _small_y_labels(ax, 7)
    chart.title(f"Cd {data['cd']:.3f} to about {level:.3f} with every fix combined", over=ax, pad=16)
    return chart.svg()


def _small_y_labels(ax, size: float) -> None:
    """Category labels at ``size`` pt: drawn as text beside the axis, the tick labels left empty."""
    for value, label in zip(ax.y.ticks, ax.y.labels):
        ax.text(ax.x.limits()[0], value, fit(label, ax.box[0] - 10, size), size=size, anchor="end", dx=-5.5)
    ax.y.labels = [""] * len(ax.y.ticks)


def yaw(data) -> bytes:
    chart = Chart(WIDE, TALL)
    ax = chart.panel(58, 26, 12, 40)
    ax.plot(data["yaw_deg"], data["cd"], OKABE_ITO["blue"], marker="o", label="Cd(yaw)")
    ax.hline(data["cd_wind_averaged"], OKABE_ITO["vermillion"], width=1.5, dash=True,
             label=f"wind-averaged Cd {data['cd_wind_averaged']:.4f} (SAE J1252)")
    ax.vspan(-data["max_yaw_deg"], data["max_yaw_deg"], OKABE_ITO["sky"], 0.15,
             label=f"yaw range of a {data['wind_m_s']:.2f} m/s wind at {data['speed_km_h']:.0f} km/h")
    ax.legend("upper center")
    ax.xlabel, ax.ylabel = "yaw angle [deg]", "drag coefficient [-]"
    chart.title(f"Yaw sweep: {data['label']}", over=ax)
    return chart.svg()


def trends(data) -> bytes:
    chart = Chart(547.2, 187.2)  # 7.6 x 2.6 in
    width = (547.2 - 3 * 62) / 3
    for i, (key, label, colour) in enumerate(zip(("cd", "score", "recoverable"),
                                                 ("Cd [-]", "score [0-100]", "recoverable [counts, mid]"),
                                                 (OKABE_ITO["blue"], OKABE_ITO["green"], OKABE_ITO["vermillion"]))):
        left = 52 + i * (width + 62)
        ax = chart.panel(left, 24, 547.2 - left - width, 40)
        positions = list(range(len(data["revisions"])))
        ax.plot(positions, data[key], colour, marker="o")
        ax.x.ticks, ax.x.labels = positions, [fit(r, width / max(1, len(positions)), 9) for r in data["revisions"]]
        ax.xlabel, ax.ylabel = "revision", label
    chart.title(f"{data['name']}: revision trends", size=9)
    return chart.svg()


def history(data) -> bytes:
    """A coefficient history: the settled window shaded, each settled mean with its band."""
    keys = list(data["values"])[:2]
    chart = Chart(WIDE, 136.8 + 108 * len(keys))  # 1.9 + 1.5 in per panel
    height = (chart.height - 30 - 40 - 16 * (len(keys) - 1)) / len(keys)
    first = None
    for i, (key, colour) in enumerate(zip(keys, (OKABE_ITO["blue"], OKABE_ITO["orange"]))):
        top = 30 + i * (height + 16)
        ax = chart.panel(66, top, 12, chart.height - top - height, sharex=first)
        first = first or ax
        start, end, mean, band = data["settled_from"], data["settled_to"], data["mean"][key], data["band"][key]
        ax.plot(data["steps"], data["values"][key], colour, width=0.8, label=key)
        ax.vspan(start, end, OKABE_ITO["grey"], 0.12, label="settled part (MSER-5)")
        ax.band([start, end], [mean - band] * 2, [mean + band] * 2, OKABE_ITO["vermillion"], 0.35,
                label=f"mean {mean:.4f} +- {band / 0.001:.2f} counts (2 SE)")
        ax.plot([start, end], [mean, mean], OKABE_ITO["vermillion"], width=1.0)
        values = [v for s, v in zip(data["steps"], data["values"][key]) if s >= start]
        spread = max(values) - min(values) if values else 0.0
        ax.y.low, ax.y.high = min(values) - 2 * spread - 0.001, max(values) + 2 * spread + 0.001
        ax.ylabel = key
        ax.legend("upper right")
        ax.xlabel = data["step_name"] if i == len(keys) - 1 else None
    chart.title(f"{data['label']}: {data['verdict']}", over=first)
    return chart.svg()


def _zone_bands(ax, zones) -> None:
    for index, zone in enumerate(zones):
        ax.vspan(zone["start"], zone["end"], OKABE_ITO["sky"] if index % 2 else OKABE_ITO["yellow"], 0.12)
        ax.text(0.5 * (zone["start"] + zone["end"]), 1, fit(zone["title"], 60, 7), size=7, anchor="middle",
                baseline="alphabetic", dy=2, axes_y=True)


def buildup(data) -> bytes:
    """Cumulative drag and lift from the nose rearward, with the zones along x."""
    chart = Chart(WIDE, TALL)
    ax = chart.panel(58, 40, 12, 40)
    _zone_bands(ax, data["zones"])
    ax.plot(data["x"], data["cd"], OKABE_ITO["blue"], label=f"drag, Cd {data['cd'][-1]:.3f} at the tail")
    ax.plot(data["x"], data["cl"], OKABE_ITO["orange"], dash=True, label=f"lift, Cl {data['cl'][-1]:+.3f} at the tail")
    ax.hline(0, OKABE_ITO["black"], width=0.6)
    ax.xlabel, ax.ylabel = "x from the nose [m]", "cumulative coefficient [-]"
    ax.legend("lower left")
    chart.title(f"Build-up along the body: {data['label']}", over=ax, pad=14)
    return chart.svg()


def buildup_diff(data) -> bytes:
    """Two revisions' drag build-ups, and their difference in counts, with each zone's change written."""
    chart = Chart(WIDE, 345.6)  # 4.8 in
    top = chart.panel(58, 40, 12, 345.6 - 40 - 125)
    bottom = chart.panel(58, 40 + 125 + 22, 12, 40, sharex=top)
    for ax in (top, bottom):
        _zone_bands(ax, data["after"]["zones"])
    top.plot(data["before"]["x"], data["before"]["cd"], OKABE_ITO["grey"], dash=True, label=data["before"]["label"])
    top.plot(data["after"]["x"], data["after"]["cd"], OKABE_ITO["blue"], label=data["after"]["label"])
    top.ylabel, top.xlabel = "cumulative Cd [-]", None
    top.legend("lower left")
    bottom.plot(data["x"], data["difference_counts"], OKABE_ITO["vermillion"])
    bottom.hline(0, OKABE_ITO["black"], width=0.6)
    for zone, change in zip(data["after"]["zones"], data["by_zone"]):
        bottom.text(0.5 * (zone["start"] + zone["end"]), 0.05, f"{change['change_counts']:+.1f}", size=8,
                    anchor="middle", baseline="alphabetic", axes_y=True)
    bottom.ylabel, bottom.xlabel = "difference [counts]", "x from the nose [m]"
    chart.title(f"Drag build-up change: {data['total_counts']:+.1f} counts in all", over=top, pad=14)
    return chart.svg()


DRAWERS = {"zones": zones, "drag-power": drag_power, "lift": lift, "energy": energy, "ahmed": ahmed,
           "waterfall": waterfall, "yaw": yaw, "trends": trends, "history": history, "buildup": buildup,
           "buildup-diff": buildup_diff}
__all__ = ["DRAWERS", "OKABE_ITO", "STATUS_COLOURS", "text_width"]
