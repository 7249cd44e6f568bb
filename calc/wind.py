"""Wind-averaged drag coefficient (SAE J1252) from a yaw sweep.

A vehicle at speed V meets a wind of speed w from direction phi relative to its heading
(phi = 0: head wind). The air it feels has components V + w cos(phi) along the vehicle and
w sin(phi) across it, so the yaw angle is psi = atan2(w sin phi, V + w cos phi) and the
relative speed V_r^2 = V^2 + 2 V w cos(phi) + w^2. Averaging the drag force over all wind
directions with equal weight and dividing by the still-air dynamic pressure:

    Cd_wa = (1 / 2 pi) integral_0^2pi Cd(psi(phi)) (V_r(phi) / V)^2 dphi

For a yaw-independent Cd this gives Cd (1 + w^2 / V^2) exactly (tests derive it).

References: SAE J1252, Wind Tunnel Test Procedure for Trucks and Buses (title, and the
wind-averaged drag derivation of its 2012 revision, confirmed on a summary of the standard; the
1981 first issue and the mean wind of 7 mph, 3.13 m/s, recalled, not checked); Hucho,
Aerodynamics of Road Vehicles, 4th ed. (SAE 1998), the section on crosswind and yaw (chapter
not checked).
"""

from __future__ import annotations

import numpy as np

J1252_WIND_SPEED = 7 * 0.44704  # m/s, 7 mph, the J1252 mean wind speed (from memory)
_DIRECTIONS = 3600  # wind directions in the average; the integrand is smooth, 0.1 deg spacing


def symmetric_sweep(yaw, cd) -> tuple[np.ndarray, np.ndarray]:
    """Sorted yaw angles [rad] and Cd, mirrored to negative yaw where only one side was measured.

    Where both sides are given they are kept as measured (asymmetry is real information).

    >>> yaw, cd = symmetric_sweep(np.radians([0, 5]), [0.30, 0.31])
    >>> [round(float(np.degrees(a))) for a in yaw], [float(c) for c in cd]
    ([-5, 0, 5], [0.31, 0.3, 0.31])
    """
    yaw = np.asarray(yaw, dtype=float)
    cd = np.asarray(cd, dtype=float)
    if len(yaw) == 0 or len(yaw) != len(cd):
        raise ValueError("a yaw sweep needs as many Cd values as yaw angles, at least one")
    if np.all(yaw >= 0) or np.all(yaw <= 0):
        yaw, cd = np.concatenate([yaw, -yaw]), np.concatenate([cd, cd])
    order = np.argsort(yaw, kind="stable")
    yaw, cd = yaw[order], cd[order]
    keep = np.concatenate([[True], np.diff(yaw) > 0])
    return yaw[keep], cd[keep]


def wind_averaged_cd(yaw, cd, vehicle_speed: float, wind_speed: float = J1252_WIND_SPEED) -> float:
    """SAE J1252 wind-averaged drag coefficient.

    Parameters: ``yaw`` [rad] and ``cd`` of the sweep (one side is mirrored), vehicle speed
    [m/s], wind speed [m/s]. Cd between measured yaw angles is interpolated linearly; the
    yaw a wind produces must lie within the sweep (``ValueError`` otherwise).

    Worked example: a constant Cd of 0.300 at 100 km/h in the 7 mph J1252 wind gives
    0.300 x (1 + (3.129 / 27.778)^2) = 0.3038.

    >>> round(wind_averaged_cd(np.radians([0, 10]), [0.30, 0.30], 100 / 3.6), 4)
    0.3038

    Reference: SAE J1252; see the module docstring for the derivation and what was checked.
    """
    if vehicle_speed <= 0 or wind_speed < 0:
        raise ValueError("vehicle speed must be positive and wind speed not negative")
    sweep_yaw, sweep_cd = symmetric_sweep(yaw, cd)
    phi = (np.arange(_DIRECTIONS) + 0.5) * (2 * np.pi / _DIRECTIONS)
    along = vehicle_speed + wind_speed * np.cos(phi)
    across = wind_speed * np.sin(phi)
    psi = np.arctan2(across, along)
    if len(sweep_yaw) > 1 and (psi.min() < sweep_yaw[0] - 1e-9 or psi.max() > sweep_yaw[-1] + 1e-9):
        raise ValueError(f"the wind produces yaw up to {np.degrees(np.abs(psi).max()):.1f} deg, beyond the sweep "
                         f"({np.degrees(sweep_yaw[0]):.1f} to {np.degrees(sweep_yaw[-1]):.1f} deg)")
    ratio = (along**2 + across**2) / vehicle_speed**2
    return float(np.mean(np.interp(psi, sweep_yaw, sweep_cd) * ratio))


def max_yaw(vehicle_speed: float, wind_speed: float = J1252_WIND_SPEED) -> float:
    """Largest yaw angle [rad] a wind of ``wind_speed`` can produce: asin(w / V) for w < V.

    >>> round(float(np.degrees(max_yaw(100 / 3.6))), 2)
    6.47
    """
    if wind_speed >= vehicle_speed:
        return float(np.pi)
    return float(np.arcsin(wind_speed / vehicle_speed))
