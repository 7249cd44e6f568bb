"""What the site shows of a result's own files: its history, its build-up, and what changed.

The page writers only format; the series, the settled window, the mean's band, the zones
along x and the change between two revisions' build-ups, attributed to zones in counts,
are computed here from the files a sheet's result names (each already checked to lie
inside the sheet's folder).
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np

from aeroreview.results import history
from aeroreview.results.history import COUNT, refuse

FIGURE_POINTS = 600  # points of a history drawn: finer than a page figure resolves (common practice)
BAND_ERRORS = 2.0  # the mean's band: +-2 standard errors, about 95 % (normal approximation)


@dataclass(frozen=True)
class HistoryFigure:
    """A history thinned for drawing, with its settled window and each mean's band."""

    label: str
    step_name: str
    steps: list[float]
    values: dict[str, list[float]]  # cd, cl, ... as found
    settled_from: float
    settled_to: float
    mean: dict[str, float]
    band: dict[str, float]  # half-width, BAND_ERRORS standard errors
    verdict: str
    reasons: list[str]


@dataclass(frozen=True)
class Zone:
    key: str
    title: str
    start: float  # m from the nose
    end: float


@dataclass(frozen=True)
class Buildup:
    """Cumulative drag and lift coefficients from the nose rearward, and the zones along x."""

    label: str
    x: list[float]
    cd: list[float]
    cl: list[float]
    zones: list[Zone]


@dataclass(frozen=True)
class ZoneChange:
    title: str
    before_counts: float  # the zone's share of Cd in the earlier revision
    after_counts: float
    change_counts: float


@dataclass(frozen=True)
class BuildupChange:
    """Both revisions' build-ups on one x grid, their difference and its attribution to zones."""

    before: Buildup
    after: Buildup
    x: list[float]
    difference_counts: list[float]  # cumulative Cd(after) - Cd(before), counts
    by_zone: list[ZoneChange]
    total_counts: float


def history_figure(path: Path, label: str) -> HistoryFigure:
    result = history.settle(history.read_history(path))
    h = result.history
    step = max(1, len(h.steps) // FIGURE_POINTS)
    return HistoryFigure(
        label, h.step_name, [float(s) for s in h.steps[::step]],
        {key: [round(float(v), 6) for v in series[::step]] for key, series in h.values.items()},
        result.settled_from, result.settled_to, {key: c.mean for key, c in result.coefficients.items()},
        {key: BAND_ERRORS * c.std_error for key, c in result.coefficients.items()}, result.verdict, result.reasons)


def read_buildup(path: Path) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """x [m], cumulative Cd and Cl from a build-up CSV written by ``results surface --sheet``."""
    table = history.read_table(path)
    if [name.lower() for name in table.header] != ["x_m", "cd", "cl"]:
        raise refuse(table.file, f"a build-up file has the columns x_m,cd,cl, not {','.join(table.header)}",
                     "write it again with aeroreview results surface --sheet")
    x, cd, cl = table.values.T
    if np.any(np.diff(x) <= 0):
        raise refuse(table.file, "x does not increase from the nose rearward", "write it again with results surface")
    return x, cd, cl


def zones_along_x(length: float, silhouette: dict | None = None, front_overhang: float | None = None,
                  wheelbase: float | None = None) -> list[Zone]:
    """Zones along the body: from the measured centreline (nose, windshield, roof and rear) when the
    sheet names its surface, else from the axles (front overhang, wheelbase, rear overhang)."""
    titles = {"front": "front", "windshield": "windshield", "rear": "roof and rear"}
    if silhouette:
        spans = [(p["zone"], min(x for x, _ in p["points"]), max(x for x, _ in p["points"]))
                 for p in silhouette["parts"] if p["zone"] in titles]
        if len(spans) == 3:
            cuts = [0.0, spans[1][1], spans[2][1], length]
            return [Zone(key, titles[key], cuts[i], cuts[i + 1]) for i, key in enumerate(titles)]
    if front_overhang and wheelbase and front_overhang + wheelbase < length:
        cuts = [0.0, front_overhang, front_overhang + wheelbase, length]
        return [Zone(key, title, cuts[i], cuts[i + 1]) for i, (key, title) in
                enumerate((("front", "front overhang"), ("middle", "between the axles"), ("rear", "rear overhang")))]
    return [Zone("body", "whole body", 0.0, length)]


def buildup(path: Path, label: str, zones_for, read=read_buildup) -> Buildup:
    """A build-up read from its file (by ``read``, e.g. one that remembers); ``zones_for(length)`` gives
    the zones along x."""
    x, cd, cl = read(path)
    return Buildup(label, [round(float(v), 4) for v in x], [round(float(v), 6) for v in cd],
                   [round(float(v), 6) for v in cl], zones_for(float(x[-1])))


def _at(curve: Buildup, x: float) -> float:
    return float(np.interp(x, curve.x, curve.cd))


def buildup_change(before: Buildup, after: Buildup, points: int = 200) -> BuildupChange:
    """The later revision's cumulative Cd minus the earlier's, along x, and zone by zone (each revision's
    zone share taken over its own zones, matched by title), in counts."""
    length = max(before.x[-1], after.x[-1])
    grid = np.linspace(0.0, length, points + 1)
    difference = [(_at(after, x) - _at(before, x)) / COUNT for x in grid]
    shares = [{z.title: (_at(c, z.end) - _at(c, z.start)) / COUNT for z in c.zones} for c in (before, after)]
    titles = [z.title for z in after.zones] + [z.title for z in before.zones if z.title not in shares[1]]
    by_zone = [ZoneChange(t, shares[0].get(t, 0.0), shares[1].get(t, 0.0), shares[1].get(t, 0.0) - shares[0].get(t, 0.0))
               for t in titles]
    return BuildupChange(before, after, [round(float(x), 4) for x in grid], [round(d, 3) for d in difference], by_zone,
                         (after.cd[-1] - before.cd[-1]) / COUNT)
