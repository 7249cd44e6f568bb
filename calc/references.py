"""Published reference curves the rules and the site use.

The Ahmed body (Ahmed, Ramm and Faltin, "Some salient features of the time-averaged ground
vehicle wake", SAE 840300, 1984): a 1044 mm long bluff body with rounded front and a
slanted rear, whose drag coefficient against slant angle is the trade's standard picture
of why backlight angles near 30 deg are dangerous. Drag falls from 0 to about 10-12 deg,
rises as the longitudinal C-pillar vortices strengthen, peaks just below the critical
angle of about 30 deg (flow still attached on the slant, strongest vortices), then drops
abruptly when the flow separates over the whole slant and the body behaves like a square-back.

The values below are read from the paper's drag figure **from memory** and are good to
about +-0.01; the three widely quoted points (0.285 at 25 deg, 0.378 just below 30 deg,
0.260 at 35 deg) are marked as such. Check them against the paper before quoting them.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

AHMED_SOURCE = "Ahmed, Ramm and Faltin (1984), SAE 840300, drag against slant angle"
AHMED_CRITICAL_ANGLE = 30.0  # deg, the published critical slant angle
AHMED_LENGTH = 1.044  # m, published body length
AHMED_FRONTAL_AREA = 0.112  # m^2, published frontal area (389 x 288 mm with 100 mm front radii)


@dataclass(frozen=True)
class CurvePoint:
    angle: float  # deg
    cd: float
    note: str


# Below the critical angle: flow attached on the slant (or with a separation bubble).
AHMED_ATTACHED = (
    CurvePoint(0.0, 0.250, "widely quoted value; from memory"),
    CurvePoint(5.0, 0.231, "read from the figure; from memory"),
    CurvePoint(10.0, 0.230, "read from the figure; from memory"),
    CurvePoint(12.5, 0.232, "read from the figure; from memory"),
    CurvePoint(15.0, 0.241, "read from the figure; from memory"),
    CurvePoint(20.0, 0.257, "read from the figure; from memory"),
    CurvePoint(25.0, 0.285, "widely quoted value; from memory"),
    CurvePoint(28.0, 0.320, "read from the figure; from memory"),
    CurvePoint(30.0, 0.378, "widely quoted peak just below the critical angle; from memory"),
)
# Above it: flow fully separated from the slant.
AHMED_SEPARATED = (
    CurvePoint(30.0, 0.264, "read from the figure; from memory"),
    CurvePoint(35.0, 0.260, "widely quoted value; from memory"),
    CurvePoint(40.0, 0.258, "read from the figure; from memory"),
)


def ahmed_cd(angle_deg):
    """Ahmed-body Cd at slant angle(s) [deg] from 0 to 40, interpolated linearly on the
    attached branch up to the critical 30 deg and on the separated branch above it.

    Example: 25 deg gives 0.285, 27.5 deg lies between 0.285 and 0.320.

    >>> round(float(ahmed_cd(25.0)), 3), round(float(ahmed_cd(35.0)), 3)
    (0.285, 0.26)

    Reference: Ahmed, Ramm and Faltin (1984), SAE 840300 (values from memory, see the module).
    """
    angle = np.asarray(angle_deg, dtype=float)
    if np.any(angle < 0) or np.any(angle > 40):
        raise ValueError("the Ahmed curve covers slant angles from 0 to 40 deg")
    attached = np.interp(angle, [p.angle for p in AHMED_ATTACHED], [p.cd for p in AHMED_ATTACHED])
    separated = np.interp(angle, [p.angle for p in AHMED_SEPARATED], [p.cd for p in AHMED_SEPARATED])
    return np.where(angle <= AHMED_CRITICAL_ANGLE, attached, separated)


def ahmed_minimum() -> CurvePoint:
    """The lowest-drag point [deg, Cd] of the attached branch.

    Example (Ahmed et al. 1984, from memory): about 0.230 at 10 deg.

    >>> point = ahmed_minimum()
    >>> point.angle, point.cd
    (10.0, 0.23)
    """
    return min(AHMED_ATTACHED, key=lambda p: p.cd)
