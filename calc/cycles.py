"""Drive cycles: speed traces at 1 Hz with their phases.

The WLTC class 3b trace (UN GTR No. 15, Annex 1) ships as ``data/wltc_class3b.csv``,
taken from the ``wltp`` package (JRC), which carries the GTR tables; the file header names
its source. Class 3b applies to vehicles with a power-to-mass ratio above 34 W/kg and a
maximum speed of 120 km/h or more: nearly every car this tool reviews.

Distance is the trapezoidal integral of speed; for a cycle that starts and ends at rest it
equals the GTR's convention (the sum of the 1 Hz speed samples times 1 s).
"""

from __future__ import annotations

import csv
from dataclasses import dataclass
from functools import cached_property, lru_cache
from importlib import resources

import numpy as np


@dataclass(frozen=True)
class Phase:
    name: str
    start: int  # s, first sample
    end: int  # s, last sample (shared with the next phase's first)


@dataclass(frozen=True)
class Cycle:
    """A speed trace [m/s] sampled every ``dt`` seconds, with named phases."""

    name: str
    speed: np.ndarray
    phases: tuple[Phase, ...]
    source: str
    dt: float = 1.0

    @property
    def duration(self) -> float:
        """Duration [s]."""
        return (len(self.speed) - 1) * self.dt

    @property
    def distance(self) -> float:
        """Distance [m]: the trapezoidal integral of speed over time."""
        return float(np.trapezoid(self.speed, dx=self.dt))

    @cached_property
    def intervals(self) -> dict[str, np.ndarray]:
        """Per interval between samples: mean speed [m/s], acceleration [m/s^2], distance [m],
        and the weights the road load sums (computed once per cycle)."""
        v1, v2 = self.speed[:-1], self.speed[1:]
        mean = 0.5 * (v1 + v2)
        step = mean * self.dt
        return {"mean": mean, "accel": (v2 - v1) / self.dt, "step": step,
                "moving_step": np.where(mean > 0, step, 0.0), "v2_step": mean**2 * step,
                "accel_step": (v2 - v1) / self.dt * step}

    def phase_summary(self) -> list[dict]:
        """Name, duration [s], distance [m] and maximum speed [m/s] of each phase."""
        out = []
        for phase in self.phases:
            part = self.speed[phase.start: phase.end + 1]
            out.append({"name": phase.name, "duration_s": (phase.end - phase.start) * self.dt,
                        "distance_m": float(np.trapezoid(part, dx=self.dt)), "max_speed_m_s": float(part.max())})
        return out


WLTC_SOURCE = "UN GTR No. 15 (WLTP), Annex 1, WLTC class 3b; trace from the wltp package (JRC)"


@lru_cache(maxsize=1)
def wltc_class3b() -> Cycle:
    """The WLTC class 3b cycle.

    Published figures (GTR No. 15, Annex 1): 1800 s, 23 266 m, maximum 131.3 km/h;
    phases Low 589 s / 3095 m, Medium 433 s / 4756 m, High 455 s / 7162 m,
    Extra High 323 s / 8254 m.

    >>> cycle = wltc_class3b()
    >>> cycle.duration, round(cycle.distance), round(float(cycle.speed.max()) * 3.6, 1)
    (1800.0, 23266, 131.3)

    Reference: UN GTR No. 15, Worldwide harmonized Light vehicles Test Procedure, Annex 1.
    """
    with resources.files("aeroreview.calc").joinpath("data/wltc_class3b.csv").open("r", encoding="utf-8") as handle:
        rows = list(csv.reader(line for line in handle if not line.startswith("#")))  # the standard library:
    if rows[:1] != [["time_s", "speed_km_h"]] or len(rows) != 1802:  # a table reader costs seconds of import
        raise ValueError("the packaged WLTC trace is damaged: expected time_s, speed_km_h and 1801 rows")
    speed_kmh = np.array([float(speed) for _, speed in rows[1:]])
    phases = (Phase("Low", 0, 589), Phase("Medium", 589, 1022), Phase("High", 1022, 1477),
              Phase("Extra High", 1477, 1800))
    return Cycle("wltc-3b", speed_kmh / 3.6, phases, WLTC_SOURCE)


@lru_cache(maxsize=64)
def constant_speed(speed: float, distance: float = 100_000.0) -> Cycle:
    """A steady cycle at ``speed`` [m/s] covering ``distance`` [m] (no start, no stop).

    >>> cycle = constant_speed(100 / 3.6, 10_000.0)
    >>> round(cycle.distance), round(cycle.duration)
    (10000, 360)
    """
    if speed <= 0 or distance <= 0:
        raise ValueError("speed and distance must be positive")
    duration = distance / speed
    trace = np.full(2, float(speed))
    return Cycle(f"constant-{speed * 3.6:g}", trace, (Phase("Steady", 0, 1),), "constant speed", dt=duration)


CYCLES = {"wltc-3b": wltc_class3b}


def cycle_by_name(name: str) -> Cycle:
    """A cycle by name: ``wltc-3b`` or ``constant-SPEED`` (SPEED in km/h, e.g. ``constant-120``).

    Example: ``constant-120`` covers 100 km at 120 km/h in 3000 s.

    >>> cycle_by_name("constant-120").duration
    3000.0
    """
    if name in CYCLES:
        return CYCLES[name]()
    if name.startswith("constant-"):
        try:
            return constant_speed(float(name.removeprefix("constant-")) / 3.6)
        except ValueError:
            pass
    raise ValueError(f"unknown cycle '{name}'; known: wltc-3b, constant-<km/h> (e.g. constant-120)")
