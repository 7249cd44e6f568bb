"""Numbers for people, one helper per unit, so no rule converts an SI float by hand.

The core holds SI floats (m, rad, m^2, m/s, plain fractions; see aeroreview.units); a finding
shows millimetres, degrees, per cent. Each helper below takes the SI value, the decimals and
whether to sign it (margins are signed), and writes the number with its unit:
``MM(0.0123)`` gives ``12 mm``, ``DEG(0.5, 1)`` ``28.6 deg``, ``PERCENT(-0.021, 1, signed=True)``
``-2.1 %``. :class:`Reading` builds the usual measured / limit / margin triple of a finding.
"""

from __future__ import annotations

import math
from dataclasses import dataclass


@dataclass(frozen=True)
class Unit:
    """How one unit is shown: its symbol and how many of it make one SI unit."""

    symbol: str
    per_si: float

    def number(self, value: float, places: int | None = 0, signed: bool = False) -> str:
        """``value`` [SI] in this unit, without the symbol; ``places`` None: as few digits as it needs."""
        return f"{value * self.per_si:{'+' if signed else ''}{'g' if places is None else f'.{places}f'}}"

    def __call__(self, value: float, places: int | None = 0, signed: bool = False) -> str:
        return f"{self.number(value, places, signed)} {self.symbol}".rstrip()

    def span(self, low: float, high: float, places: int = 0) -> str:
        """A range such as ``15-70 mm``."""
        return f"{self.number(low, places)}-{self.number(high, places)} {self.symbol}".rstrip()


MM = Unit("mm", 1000.0)
CM2 = Unit("cm^2", 1e4)
M2 = Unit("m^2", 1.0)
DEG = Unit("deg", 180.0 / math.pi)  # the factor math.degrees uses
PERCENT = Unit("%", 100.0)
KM_H = Unit("km/h", 3.6)
KG = Unit("kg", 1.0)
RATIO = Unit("", 1.0)  # a dimensionless ratio (r / sqrt(A), an area ratio), shown bare
COUNTS = Unit("counts", 1000.0)  # 1 drag count = 0.001 of a coefficient (common practice)


@dataclass(frozen=True)
class Reading:
    """A measured value against its limits: ``at_most``, ``at_least`` or both (a range it should
    lie in), shown as a finding shows them. ``places``: decimals of the value and the margin."""

    value: float
    unit: Unit
    at_least: float | None = None
    at_most: float | None = None
    places: int = 0
    limit_places: int = 0

    @property
    def below(self) -> bool:
        return self.at_least is not None and self.value < self.at_least

    @property
    def above(self) -> bool:
        return self.at_most is not None and self.value > self.at_most

    @property
    def beyond(self) -> bool:
        """Whether the value lies outside its limits."""
        return self.below or self.above

    @property
    def digits(self) -> int:
        """Decimals that tell the value from a limit it crosses: ``places``, or up to three more where
        the value would read as its limit (2.52 % against 2.5 % reads 2.52 %, not 2.5 %)."""
        limit = self.at_most if self.above else self.at_least if self.below else None
        places = self.places
        while limit is not None and places < self.places + 3 and \
                self.unit(self.value, places) == self.unit(limit, max(places, self.limit_places)):
            places += 1
        return places

    @property
    def bound(self) -> str:
        """The limit as a finding shows it: ``<= 60 mm``, ``>= 15 mm`` or ``6-20 deg``."""
        if self.at_least is not None and self.at_most is not None:
            return self.unit.span(self.at_least, self.at_most, self.limit_places)
        if self.at_most is not None:
            return f"<= {self.unit(self.at_most, self.limit_places)}"
        return f">= {self.unit(self.at_least, self.limit_places)}"

    @property
    def margin(self) -> str | None:
        """Signed distance from the limit crossed (``at_most`` when a reversed range crosses both),
        else from the only limit; None inside a range."""
        one = self.at_least if self.at_most is None else self.at_most if self.at_least is None else None
        limit = self.at_most if self.above else self.at_least if self.below else one
        return None if limit is None else self.unit(self.value - limit, self.digits, signed=True)

    def shown(self, measured: str | None = None, margin: bool = True) -> dict[str, str | None]:
        """A finding's ``measured``, ``limit`` and ``margin`` (``measured`` replaces the bare value)."""
        return {"measured": measured or self.unit(self.value, self.digits), "limit": self.bound,
                "margin": self.margin if margin else None}


def whole_score(score: float | None, missing: str = "not assessed") -> str:
    """A 0-100 score (kept to a tenth by the engine) as it is read: a whole number, halves up.

    Every page, chart and report shows a score through here, so one revision never reads 25 in
    one place and 24 in another (format's ``.0f`` rounds a tenth of 24.5 to 24, half to even).
    """
    return missing if score is None else str(math.floor(score + 0.5))
