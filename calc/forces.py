"""Aerodynamic forces and the numbers reviewers quote: counts, CdA, watts, lift per axle.

Coefficients are on the frontal area A. Lift is positive upward (downforce is negative
lift); ``cl_front`` and ``cl_rear`` are the axle lift coefficients, defined so that the lift
on an axle is cl_axle q A (their sum is the total lift coefficient). SI throughout; every
function accepts numpy arrays.
"""

from __future__ import annotations

import numpy as np

from aeroreview.calc.air import G0

COUNT = 0.001  # one drag count is 0.001 of Cd (common practice)


def dynamic_pressure(density, speed):
    """Dynamic pressure q [Pa] = rho v^2 / 2, with density [kg/m^3] and speed [m/s].

    Example: ISA sea level (1.225 kg/m^3) at 100 km/h: 472.6 Pa.

    >>> round(float(dynamic_pressure(1.225, 100 / 3.6)), 1)
    472.6

    Reference: any fluid mechanics text, e.g. Anderson, Fundamentals of Aerodynamics, 6th ed., s. 3.2.
    """
    return 0.5 * np.asarray(density, dtype=float) * np.asarray(speed, dtype=float) ** 2


def drag_force(cd, area, speed, density):
    """Drag D [N] = Cd A q.

    Example: Cd 0.30, A 2.2 m^2, 100 km/h, ISA sea level: 311.9 N.

    >>> round(float(drag_force(0.30, 2.2, 100 / 3.6, 1.225)), 1)
    311.9

    Reference: Hucho, Aerodynamics of Road Vehicles, 4th ed. (SAE 1998), on aerodynamic drag (chapter not checked).
    """
    return np.asarray(cd, dtype=float) * np.asarray(area, dtype=float) * dynamic_pressure(density, speed)


def lift_force(cl, area, speed, density):
    """Lift L [N] = Cl A q, positive upward.

    Example: Cl 0.10, A 2.2 m^2, 100 km/h, ISA sea level: 104.0 N.

    >>> round(float(lift_force(0.10, 2.2, 100 / 3.6, 1.225)), 1)
    104.0
    """
    return np.asarray(cl, dtype=float) * np.asarray(area, dtype=float) * dynamic_pressure(density, speed)


def drag_power(cd, area, speed, density):
    """Power [W] to overcome drag in still air: P = D v = Cd A rho v^3 / 2.

    Example: Cd 0.30, A 2.2 m^2, 100 km/h, ISA sea level: 8.66 kW.

    >>> round(float(drag_power(0.30, 2.2, 100 / 3.6, 1.225)) / 1000, 2)
    8.66
    """
    return drag_force(cd, area, speed, density) * np.asarray(speed, dtype=float)


def axle_lift(cl_front, cl_rear, area, speed, density):
    """Lift on the front and rear axle [N]: L_axle = cl_axle A q.

    Example: cl_front 0.05, cl_rear 0.08, A 2.2 m^2, 100 km/h, ISA sea level: 52.0 N and 83.2 N.

    >>> front, rear = axle_lift(0.05, 0.08, 2.2, 100 / 3.6, 1.225)
    >>> round(float(front), 1), round(float(rear), 1)
    (52.0, 83.2)
    """
    return lift_force(cl_front, area, speed, density), lift_force(cl_rear, area, speed, density)


def kilograms_force(force):
    """A force [N] as the mass [kg] whose weight it equals: m = F / g0 (g0 = 9.80665 m/s^2, ISO 80000-3).

    >>> round(float(kilograms_force(9.80665)), 6)
    1.0
    """
    return np.asarray(force, dtype=float) / G0


def axle_load_share(lift_front, lift_rear, mass, front_share):
    """Lift on each axle as a share of its static load: (L_f / (m g0 s_f), L_r / (m g0 (1 - s_f))).

    Positive values unload the axle. Example: 52 N front and 83.2 N rear on a 1800 kg car
    with 55 % on the front axle: 0.54 % and 1.05 % of the static axle loads.

    >>> f, r = axle_load_share(52.0, 83.2, 1800.0, 0.55)
    >>> round(float(f) * 100, 2), round(float(r) * 100, 2)
    (0.54, 1.05)
    """
    weight = np.asarray(mass, dtype=float) * G0
    share = np.asarray(front_share, dtype=float)
    return np.asarray(lift_front) / (weight * share), np.asarray(lift_rear) / (weight * (1.0 - share))


def reynolds_number(speed, length, density, dynamic_viscosity):
    """Reynolds number on vehicle length: Re = rho v L / mu.

    Example: 4.5 m car at 100 km/h, ISA sea level (mu 1.7894e-5 Pa s): 8.56e6.

    >>> f"{float(reynolds_number(100 / 3.6, 4.5, 1.225, 1.7894e-5)):.3g}"
    '8.56e+06'
    """
    return (np.asarray(density, dtype=float) * np.asarray(speed, dtype=float) * np.asarray(length, dtype=float)
            / np.asarray(dynamic_viscosity, dtype=float))


def counts(delta_cd):
    """A drag-coefficient difference in counts (1 count = 0.001).

    >>> round(float(counts(0.012)), 6)
    12.0
    """
    return np.asarray(delta_cd, dtype=float) / COUNT


def cd_from_counts(n_counts):
    """A number of drag counts as a drag-coefficient difference.

    >>> round(float(cd_from_counts(10)), 6)
    0.01
    """
    return np.asarray(n_counts, dtype=float) * COUNT


def drag_area(cd, area):
    """Drag area CdA [m^2], the product that sets the drag force at a given speed.

    >>> round(float(drag_area(0.30, 2.2)), 3)
    0.66
    """
    return np.asarray(cd, dtype=float) * np.asarray(area, dtype=float)
