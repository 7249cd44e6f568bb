"""Published reference curves the rules and the site use.

The Ahmed body (Ahmed, Ramm and Faltin, "Some salient features of the time-averaged ground
vehicle wake", SAE 840300, SAE Transactions 93 (1984) 473-503; title, authors, year, venue and
abstract checked on a copy of the paper's first page): a 1044 mm long bluff body with rounded
front and a slanted rear, whose drag coefficient against slant angle is the trade's standard
picture of why backlight angles near 30 deg are dangerous. Drag falls from 0 deg to a minimum
near 12.5 deg, rises as the longitudinal C-pillar vortices strengthen, peaks just below the
critical angle of about 30 deg (flow still attached on the slant, strongest vortices), then drops
abruptly when the flow separates over the whole slant and the body behaves like a square-back.
A review of Ahmed-body wake studies (Appl. Mech. Rev. 73 (2021) 060801, abstract checked) names
the same regimes: high drag for 12.5 < slant < 30 deg, low drag above 30 deg.

Where the values come from (re-checked with the search tool, Dec 2026): no copy of the
paper's drag figure was found, so no point is read from it here. Each point says what it is:

- ``quoted``: a secondary source found by search quotes the value as Ahmed's: 0.285 at 25 deg
  (a public CFD validation table that compares against SAE 840300 on the frontal area).
  Later tunnels measure more on the same body at 25 deg (0.305 is quoted from plots of later
  platoon studies, SAE 2007-01-1547), so the +-0.010 is the spread of the quotations, not of
  the tunnels;
- ``recalled``: recalled as read from the published figure, not confirmed by any source the
  search found: 0.250 at 0 deg, the minimum 0.230 at 12.5 deg, 0.255 at 20 deg, the peak 0.378
  just below 30 deg and the separated branch (0.264 just above 30, 0.260 at 35, 0.258 at
  40 deg); good to about +-0.015, and +-0.03 at the peak;
- ``interpolated``: our smooth interpolation between those (5, 10, 15 and 28 deg), not a
  published value.

What the search did confirm is the shape: a book figure credited to Hucho, Aerodynamics of
Road Vehicles, shows drag rising toward a critical angle near 30 deg, dropping beyond it and
then staying roughly constant; the review above names the low-drag regime as above 30 deg.

The 28-30 deg segment is the steepest part of the curve, has no point between 25 and 30 deg
that any source confirms, and drives the backlight rule's estimate; its uncertainty is +-0.03.
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
    kind: str  # "quoted", "recalled" or "interpolated" (see the module docstring)
    uncertainty: float  # +- in Cd

    @property
    def note(self) -> str:
        words = {"quoted": "quoted as Ahmed's value by a secondary source (see aeroreview.calc.references)",
                 "recalled": "recalled as read from the published figure, not confirmed; from memory",
                 "interpolated": "interpolated between recalled points, not a published value"}
        return f"{words[self.kind]} (+-{self.uncertainty:.3f})"


# Below the critical angle: flow attached on the slant (or with a separation bubble).
AHMED_ATTACHED = (
    CurvePoint(0.0, 0.250, "recalled", 0.015),
    CurvePoint(5.0, 0.240, "interpolated", 0.015),
    CurvePoint(10.0, 0.232, "interpolated", 0.015),
    CurvePoint(12.5, 0.230, "recalled", 0.015),
    CurvePoint(15.0, 0.236, "interpolated", 0.015),
    CurvePoint(20.0, 0.255, "recalled", 0.015),
    CurvePoint(25.0, 0.285, "quoted", 0.010),
    CurvePoint(28.0, 0.330, "interpolated", 0.030),
    CurvePoint(30.0, 0.378, "recalled", 0.030),
)
# Above it: flow fully separated from the slant.
AHMED_SEPARATED = (
    CurvePoint(30.0, 0.264, "recalled", 0.015),
    CurvePoint(35.0, 0.260, "recalled", 0.015),
    CurvePoint(40.0, 0.258, "recalled", 0.015),
)


def _branch(angle, points, field: str):
    return np.interp(angle, [p.angle for p in points], [getattr(p, field) for p in points])


def _checked(angle_deg):
    angle = np.asarray(angle_deg, dtype=float)
    if np.any(angle < 0) or np.any(angle > 40):
        raise ValueError("the Ahmed curve covers slant angles from 0 to 40 deg")
    return angle


def ahmed_cd(angle_deg):
    """Ahmed-body Cd at slant angle(s) [deg] from 0 to 40, interpolated linearly on the
    attached branch up to the critical 30 deg and on the separated branch above it.

    Example: 25 deg gives 0.285, 27.5 deg lies between 0.285 and 0.330.

    >>> round(float(ahmed_cd(25.0)), 3), round(float(ahmed_cd(35.0)), 3)
    (0.285, 0.26)

    Reference: Ahmed, Ramm and Faltin (1984), SAE 840300 (the 25 deg value quoted by a secondary source, the
    others recalled; see the module).
    """
    angle = _checked(angle_deg)
    return np.where(angle <= AHMED_CRITICAL_ANGLE, _branch(angle, AHMED_ATTACHED, "cd"),
                    _branch(angle, AHMED_SEPARATED, "cd"))


def ahmed_uncertainty(angle_deg):
    """The +- uncertainty [Cd] of :func:`ahmed_cd` at slant angle(s) [deg], interpolated like the curve.

    Example: the quoted 25 deg point is good to +-0.01; the steep 28-30 deg segment to +-0.03.

    >>> round(float(ahmed_uncertainty(25.0)), 3), round(float(ahmed_uncertainty(29.0)), 3)
    (0.01, 0.03)
    """
    angle = _checked(angle_deg)
    return np.where(angle <= AHMED_CRITICAL_ANGLE, _branch(angle, AHMED_ATTACHED, "uncertainty"),
                    _branch(angle, AHMED_SEPARATED, "uncertainty"))


def ahmed_minimum() -> CurvePoint:
    """The lowest-drag point [deg, Cd] of the attached branch.

    Example (Ahmed et al. 1984, recalled, not confirmed by a secondary source): about 0.230 at 12.5 deg.

    >>> point = ahmed_minimum()
    >>> point.angle, point.cd
    (12.5, 0.23)
    """
    return min(AHMED_ATTACHED, key=lambda p: p.cd)
