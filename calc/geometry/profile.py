"""The trade's angles and radii, found on the outlines of a vehicle's sections.

The upper outline of the centreline section is resampled by arc length and its tangent
angle and curvature computed. Where the curvature is below ``4 / length`` (a radius larger
than a quarter of the body), the outline is treated as straight; straight runs longer than
3 % of the length become candidate panels (hood, windshield, roof, backlight, decklid),
and the curved runs between them are edge radii, each fitted with a circle. Which run is
which follows the usual layout of a road vehicle (windshield rising before the roof peak,
backlight falling after it, decklid after the backlight). Every measurement names the
points it used, its fit and its residual; when the layout is not found, the measurement
says so instead of guessing.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from aeroreview.calc.geometry.fits import fit_circle, fit_line
from aeroreview.calc.geometry.sections import Outline

STRAIGHT_RUN = 0.03  # of the length: shorter runs are not panels (our convention)
SAMPLES = 1500  # arc-length samples of an outline


@dataclass(frozen=True)
class Measurement:
    key: str  # catalogue key (or a descriptive name)
    value: float | None  # SI; None when it could not be measured
    method: str  # how it was found (points, fit, residual), or why it could not be
    span: tuple[float, float] | None = None  # x range of the surface it was measured on [m]

    @property
    def measured(self) -> bool:
        return self.value is not None


@dataclass(frozen=True)
class Run:
    start: int  # indices into the resampled outline
    end: int
    straight: bool
    x0: float
    x1: float


class Curve:
    """An outline resampled by arc length, with tangent angle and curvature."""

    def __init__(self, points: np.ndarray, length: float):
        x, z = points[:, 0], points[:, 1]
        step = np.hypot(np.diff(x), np.diff(z))
        s = np.concatenate(([0.0], np.cumsum(step)))
        self.s = np.linspace(0, s[-1], SAMPLES)
        self.x = np.interp(self.s, s, x)
        self.z = np.interp(self.s, s, z)
        ds = self.s[1] - self.s[0]
        window = 5
        kernel = np.ones(window) / window
        xs = np.convolve(np.pad(self.x, window // 2, mode="edge"), kernel, mode="valid")
        zs = np.convolve(np.pad(self.z, window // 2, mode="edge"), kernel, mode="valid")
        self.angle = np.arctan2(np.gradient(zs, ds), np.gradient(xs, ds))
        curvature = np.gradient(np.unwrap(self.angle), ds)
        self.curvature = np.convolve(np.pad(curvature, window // 2, mode="edge"), kernel, mode="valid")
        self.points = points
        self.length = length

    def runs(self) -> list[Run]:
        straight = np.abs(self.curvature) < 4.0 / self.length
        runs, start = [], 0
        for i in range(1, len(straight) + 1):
            if i == len(straight) or straight[i] != straight[start]:
                runs.append(Run(start, i - 1, bool(straight[start]), float(self.x[start]), float(self.x[i - 1])))
                start = i
        # Short straight pieces inside a curve are part of the curve.
        minimum = STRAIGHT_RUN * self.length
        merged: list[Run] = []
        for run in runs:
            kind = run.straight and (self.s[run.end] - self.s[run.start]) >= minimum
            if merged and merged[-1].straight == kind:
                last = merged.pop()
                run = Run(last.start, run.end, kind, last.x0, run.x1)
            merged.append(Run(run.start, run.end, kind, run.x0, run.x1))
        return merged

    def original(self, x0: float, x1: float, margin: float = 0.0) -> np.ndarray:
        """The outline's own points (not resampled) between x0 and x1, trimmed by ``margin`` each end."""
        x = self.points[:, 0]
        keep = (x >= x0 + margin) & (x <= x1 - margin)
        return self.points[keep]


def _line(curve: Curve, run: Run, key: str, what: str, sign: float = 1.0) -> Measurement:
    trim = 0.1 * (run.x1 - run.x0)  # keep off the curved ends
    pts = curve.original(run.x0, run.x1, trim)
    if len(pts) < 3:
        return Measurement(key, None, f"{what}: too few surface points on the panel")
    fit = fit_line(pts[:, 0], pts[:, 1])
    return Measurement(key, sign * fit.angle,
                       f"{what}: line fit to {fit.points} outline points, x {run.x0:.3f}-{run.x1:.3f} m, "
                       f"rms residual {fit.residual * 1000:.2f} mm", (run.x0, run.x1))


def _panel_fit(curve: Curve, run: Run):
    trim = 0.1 * (run.x1 - run.x0)
    pts = curve.original(run.x0, run.x1, trim)
    return fit_line(pts[:, 0], pts[:, 1]) if len(pts) >= 3 else None


def _off_lines(pts: np.ndarray, lines, tolerance: float) -> np.ndarray:
    """The points farther than ``tolerance`` from every one of the (panel) lines."""
    keep = np.ones(len(pts), bool)
    for line in lines:
        if line is None:
            continue
        direction = np.array([math.cos(line.angle), math.sin(line.angle)])
        normal = np.array([-direction[1], direction[0]])
        anchor = np.array([0.0, line.intercept])
        keep &= np.abs((pts - anchor) @ normal) > tolerance
    return pts[keep]


def _radius(curve: Curve, x0: float, x1: float, key: str, what: str, neighbours=()) -> Measurement:
    """Circle fit to the transition between two panels: the points that lie on neither
    panel's line (so the smoothing used to find the transition does not widen it)."""
    lines = [_panel_fit(curve, run) for run in neighbours]
    widen = 0.02 * curve.length
    low = min([x0] + [r.x0 for r in neighbours if r.x1 <= x0 + 1e-9]) if neighbours else x0
    high = max([x1] + [r.x1 for r in neighbours if r.x0 >= x1 - 1e-9]) if neighbours else x1
    pts = curve.original(max(low, x0 - widen), min(high, x1 + widen))
    if lines:
        pts = _off_lines(pts, lines, max(2e-4, 5e-5 * curve.length))
        if len(pts):
            x0, x1 = float(pts[:, 0].min()), float(pts[:, 0].max())
    if len(pts) < 5 or x1 - x0 < 1e-3:
        return Measurement(key, None, f"{what}: the transition is sharper than the outline resolution "
                                      f"({curve.length / SAMPLES * 1000:.1f} mm); no radius fitted")
    fit = fit_circle(pts[:, 0], pts[:, 1])
    turn = abs(math.degrees(np.interp(x1, curve.x, curve.angle) - np.interp(x0, curve.x, curve.angle)))
    if fit.residual > 0.1 * fit.radius or turn < 5:
        return Measurement(key, None, f"{what}: no circular region found (fit residual {fit.residual * 1000:.1f} mm, "
                                      f"turn {turn:.0f} deg)")
    return Measurement(key, fit.radius, f"{what}: circle fit to {fit.points} outline points over x "
                                        f"{x0:.3f}-{x1:.3f} m (turning {turn:.0f} deg), rms residual "
                                        f"{fit.residual * 1000:.2f} mm", (x0, x1))


def _mean_z(curve: Curve, run: Run) -> float:
    return float(curve.z[run.start:run.end + 1].mean())


def measure_centreline(section: Outline, ground: float) -> list[Measurement]:
    """Angles and radii of the centreline section (x from the nose rearward, z up) [SI].

    Returns measurements for windshield.angle, rear.backlight_angle, rear.decklid_angle,
    rear.roof_backlight_radius, front.upper_edge_radius, underbody.nose_rake,
    underbody.diffuser_angle and dimensions.ground_clearance (each possibly not measured).

    Example: see the tests, which build prisms with known slant angles and rounded boxes
    with known radii (the slant within 0.5 deg, radii within 2 %).
    """
    length = section.x_max - section.x_min
    upper = Curve(section.upper, length)
    top = float(section.upper[:, 1].max())
    height = top - ground
    peak_x = float(section.upper[np.argmax(section.upper[:, 1]), 0])
    runs = upper.runs()
    panels = [r for r in runs if r.straight]
    out = []

    def angle_of(run):
        return math.degrees(float(np.median(upper.angle[run.start:run.end + 1])))

    high = [r for r in panels if _mean_z(upper, r) > ground + 0.5 * height]
    screens = [r for r in high if r.x1 <= peak_x + 0.02 * length and 10 <= angle_of(r) <= 70]
    windshield = max(screens, key=lambda r: r.x1 - r.x0, default=None)
    out.append(_line(upper, windshield, "windshield.angle", "windshield") if windshield else
               Measurement("windshield.angle", None, "no rising panel between 10 and 70 deg before the roof peak"))

    backs = [r for r in high if r.x0 >= peak_x - 0.02 * length and -80 <= angle_of(r) <= -8]
    backlight = min(backs, key=lambda r: r.x0, default=None)
    out.append(_line(upper, backlight, "rear.backlight_angle", "backlight", -1.0) if backlight else
               Measurement("rear.backlight_angle", None, "no falling panel between 8 and 80 deg after the roof peak"))

    if backlight:
        lids = [r for r in panels if r.x0 >= backlight.x1 and abs(angle_of(r)) < 20
                and _mean_z(upper, r) > ground + 0.35 * height]
        decklid = lids[0] if lids else None
        out.append(_line(upper, decklid, "rear.decklid_angle", "decklid", -1.0) if decklid else
                   Measurement("rear.decklid_angle", None, "no near-level panel after the backlight (fastback or squareback)"))
        roofs = [r for r in panels if r.x1 <= backlight.x0 + 1e-9 and abs(angle_of(r)) < 8]
        if roofs:
            out.append(_radius(upper, roofs[-1].x1, backlight.x0, "rear.roof_backlight_radius", "roof to backlight",
                               (roofs[-1], backlight)))
        else:
            out.append(Measurement("rear.roof_backlight_radius", None, "no level roof panel ahead of the backlight"))
    else:
        out += [Measurement("rear.decklid_angle", None, "no backlight found"),
                Measurement("rear.roof_backlight_radius", None, "no backlight found")]

    first_panel = panels[0] if panels else None
    if first_panel and first_panel.x0 > section.x_min:
        out.append(_radius(upper, section.x_min, first_panel.x0, "front.upper_edge_radius", "front upper edge",
                           (first_panel,)))
    else:
        out.append(Measurement("front.upper_edge_radius", None, "no curved region ahead of the first panel"))

    out += _underbody(section, length, ground)
    return out


def _clip(run: Run, x0: float, x1: float) -> Run:
    return Run(run.start, run.end, run.straight, max(run.x0, x0), min(run.x1, x1))


def _underbody(section: Outline, length: float, ground: float) -> list[Measurement]:
    lower = Curve(section.lower, length)
    panels = [r for r in lower.runs() if r.straight]
    x0 = section.x_min
    out = []
    middle = section.lower[(section.lower[:, 0] > x0 + 0.3 * length) & (section.lower[:, 0] < x0 + 0.7 * length)]
    if len(middle):
        out.append(Measurement("dimensions.ground_clearance", float(middle[:, 1].min() - ground),
                               f"lowest of {len(middle)} centreline underbody points between 30 and 70 % of the "
                               f"length, above the ground plane z = {ground:.4f} m"))
    front = [_clip(r, x0, x0 + 0.35 * length) for r in panels if r.x0 < x0 + 0.35 * length]
    if front:
        run = front[0]  # the front-most panel: the underbody ahead of the front axle
        out.append(_line(lower, run, "underbody.nose_rake", "front underbody", -1.0))
    else:
        out.append(Measurement("underbody.nose_rake", None, "no straight underbody panel in the front 35 %"))
    rear = [_clip(r, x0 + 0.6 * length, section.x_max) for r in panels if r.x1 > x0 + 0.6 * length
            and 1.0 <= math.degrees(float(np.median(lower.angle[r.start:r.end + 1]))) <= 35]
    if rear:
        run = max(rear, key=lambda r: r.x1 - r.x0)
        out.append(_line(lower, run, "underbody.diffuser_angle", "diffuser"))
    else:
        out.append(Measurement("underbody.diffuser_angle", 0.0, "no rising panel in the rear 40 % of the "
                                                                 "centreline underbody: no diffuser upsweep"))
    return out


def plan_taper(section: Outline, window: float) -> Measurement:
    """Rear plan-view taper [rad] of a horizontal section: the mean angle by which both side
    lines close toward the tail over the last ``window`` metres (the last 10 % of it,
    where the tail rounds off, is left out)."""
    x1 = section.x_max
    angles, residuals, count = [], [], 0
    for line, sign in ((section.upper, -1.0), (section.lower, 1.0)):
        keep = (line[:, 0] >= x1 - window) & (line[:, 0] <= x1 - 0.1 * window)
        if keep.sum() < 3:
            return Measurement("rear.side_taper_angle", None, "too few section points near the tail")
        fit = fit_line(line[keep, 0], line[keep, 1])
        angles.append(sign * fit.angle)
        residuals.append(fit.residual)
        count += fit.points
    return Measurement("rear.side_taper_angle", float(np.mean(angles)),
                       f"line fits to {count} points of both side lines over x {x1 - window:.3f}-{x1 - 0.1 * window:.3f} m, "
                       f"rms residual {max(residuals) * 1000:.2f} mm")
