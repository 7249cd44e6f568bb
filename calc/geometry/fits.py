"""Least-squares fits with residuals: every measured angle and radius says how well it fits."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class LineFit:
    angle: float  # rad, of the direction (1, slope) from the +x axis
    slope: float
    intercept: float
    residual: float  # rms distance of the points from the line [m]
    points: int


@dataclass(frozen=True)
class CircleFit:
    centre: tuple[float, float]
    radius: float
    residual: float  # rms distance of the points from the circle [m]
    points: int


def fit_line(x, y) -> LineFit:
    """Total-least-squares line through points (x, y) [m].

    Example: points on z = tan(25 deg) x give 25 deg with zero residual.

    >>> import numpy as np
    >>> x = np.linspace(0, 1, 20)
    >>> fit = fit_line(x, np.tan(np.radians(25)) * x)
    >>> round(float(np.degrees(fit.angle)), 6), fit.residual < 1e-12
    (25.0, True)

    Reference: orthogonal regression by the principal axis of the centred points
    (Golub and Van Loan, Matrix Computations, s. 6.3, total least squares).
    """
    points = np.column_stack([np.asarray(x, float), np.asarray(y, float)])
    if len(points) < 2:
        raise ValueError("a line fit needs at least two points")
    centre = points.mean(axis=0)
    _, _, vt = np.linalg.svd(points - centre, full_matrices=False)
    direction = vt[0] if vt[0][0] >= 0 else -vt[0]
    normal = np.array([-direction[1], direction[0]])
    residual = float(np.sqrt(np.mean(((points - centre) @ normal) ** 2)))
    slope = direction[1] / direction[0] if direction[0] else np.inf
    return LineFit(float(np.arctan2(direction[1], direction[0])), float(slope),
                   float(centre[1] - slope * centre[0]) if np.isfinite(slope) else float("nan"), residual, len(points))


def fit_circle(x, y) -> CircleFit:
    """Circle through points (x, y) [m]: algebraic (Kasa) fit refined by Gauss-Newton on the
    geometric distance.

    Example: a quarter circle of radius 0.1 m is recovered exactly.

    >>> import numpy as np
    >>> t = np.linspace(0, np.pi / 2, 15)
    >>> fit = fit_circle(0.3 + 0.1 * np.cos(t), 0.2 + 0.1 * np.sin(t))
    >>> round(fit.radius, 9), [round(c, 9) for c in fit.centre]
    (0.1, [0.3, 0.2])

    References: Kasa, IEEE Trans. Instrum. Meas. 25 (1976) 8-14; Chernov, Circular and
    Linear Regression (CRC 2010), on the geometric fit (chapter not checked).
    """
    x, y = np.asarray(x, float), np.asarray(y, float)
    if len(x) < 3:
        raise ValueError("a circle fit needs at least three points")
    shift = np.array([x.mean(), y.mean()])
    u, v = x - shift[0], y - shift[1]
    matrix = np.column_stack([u, v, np.ones_like(u)])
    solution, *_ = np.linalg.lstsq(matrix, u**2 + v**2, rcond=None)
    a, b = solution[0] / 2, solution[1] / 2
    r = np.sqrt(max(solution[2] + a * a + b * b, 0.0))
    for _ in range(20):  # Gauss-Newton on sum (|p - c| - r)^2
        dx, dy = u - a, v - b
        distance = np.hypot(dx, dy)
        distance[distance == 0] = 1e-12
        jacobian = np.column_stack([-dx / distance, -dy / distance, -np.ones_like(u)])
        step, *_ = np.linalg.lstsq(jacobian, -(distance - r), rcond=None)
        a, b, r = a + step[0], b + step[1], r + step[2]
        if np.abs(step).max() < 1e-12:
            break
    residual = float(np.sqrt(np.mean((np.hypot(u - a, v - b) - r) ** 2)))
    return CircleFit((float(a + shift[0]), float(b + shift[1])), float(abs(r)), residual, len(x))
