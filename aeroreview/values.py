"""Typed values the review hands to the reports and the pages.

A revision's key numbers, a finding's consequences and the waiver that applies to it are
computed once, in the review, and read by the JSON, text, SARIF and page writers; as small
frozen dataclasses they say which fields exist, and ``as_dict`` gives the JSON form (the
field names are the JSON keys).
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, fields

from aeroreview.rules.stability import AxleFigures


@dataclass(frozen=True)
class KeyNumbers:
    """What the revision's drag means at the review's conditions (SI unless the name says otherwise)."""

    cd: float
    cd_source: str  # the result it comes from, or the class midpoint
    cd_estimated: bool
    area: float  # m^2
    cda: float  # m^2
    reference_speed_km_h: float
    drag_N: float
    drag_power_kW: float
    cycle: str
    energy_kWh_per_100km: float
    aero_share: float  # of the energy dissipated on the cycle
    energy_breakdown_kWh: dict[str, float]
    litres_per_100km: float | None  # fuel-burning vehicles
    range_km: float | None  # electric vehicles
    per_10_counts: dict[str, dict]  # by cycle: what 10 drag counts change
    lift_reference: AxleFigures | None  # at the reference speed
    lift_top_speed: AxleFigures | None

    def as_dict(self) -> dict:
        """The JSON form, with its own copies of the mappings; read field by field, as asdict() deep-copies
        every float (a tenth of a JSON report's cost)."""
        data = {f.name: getattr(self, f.name) for f in fields(self)}
        data["energy_breakdown_kWh"] = dict(self.energy_breakdown_kWh)
        data["per_10_counts"] = {cycle: dict(figures) for cycle, figures in self.per_10_counts.items()}
        data["lift_reference"] = self.lift_reference and asdict(self.lift_reference)
        data["lift_top_speed"] = self.lift_top_speed and asdict(self.lift_top_speed)
        return data


@dataclass(frozen=True)
class Consequences:
    """What a finding's drag-count range (low, high) costs in the sheet's own terms."""

    power_W_at_reference_speed: tuple[float, float]
    energy_kWh_per_100km: tuple[float, float]
    range_km: tuple[float, float] | None = None  # electric: km of range (negative: lost)
    litres_per_100km: tuple[float, float] | None = None  # fuel-burning

    @classmethod
    def of(cls, counts: tuple[float, float], per_count: dict, power_per_count: float) -> Consequences:
        """From the counts, the cycle's effect of one count and the power of one count [W]."""
        def spread(per: float | None, sign: float = 1.0):
            return None if per is None else (sign * per * counts[0], sign * per * counts[1])
        return cls(spread(power_per_count), spread(per_count["kwh_per_100km"]),
                   spread(per_count.get("range_km"), -1.0), spread(per_count.get("litres_per_100km")))

    def as_dict(self) -> dict:
        # Read field by field: asdict() deep-copies every float of the tuples, a third of a JSON report's cost.
        return {f.name: list(getattr(self, f.name)) for f in fields(self) if getattr(self, f.name) is not None}


@dataclass(frozen=True)
class AppliedWaiver:
    """A sheet's waiver as it applies to a finding on the review's day."""

    status: str  # "active" or "expired"
    reason: str
    by: str  # "" when not given
    expires: str | None  # ISO date

    @property
    def active(self) -> bool:
        return self.status == "active"

    def as_dict(self) -> dict:
        return asdict(self)
