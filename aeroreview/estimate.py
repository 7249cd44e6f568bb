"""Estimates: what a revision's findings are worth together, and how far to trust them.

Findings are not added. Each rule names the flow region its fix acts on
(``aeroreview.rules.REGIONS``); each region has a drag budget, a share of the revision's Cd
from a typical drag breakdown of its class times the largest fraction of that share that
fixes recover. Within a region every fix removes its share of what is left of the budget::

    saving = D x (1 - prod(1 - min(e_i, D) / D))

and across regions the same rule runs once more against the gap between the revision's Cd
and the floor of its class (the lowest Cd the class reaches in production, raised for what
the sheet fixes: wide tyres, glass mirrors, ride height), so the total saturates toward the
floor and never crosses it. The same model gives the combined low / mid / high saving, the
waterfall (each ranked fix's marginal saving), the cost-weighted score and, in
:mod:`aeroreview.track_record`, the predicted change between two revisions.

The score is 100 x (1 - d) x (1 - l): d is the share of the drag the model could recover
from this revision that the unresolved findings still claim, l the same for axle lift.
It depends on what the findings cost, never on their severity.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from aeroreview.rules import REGIONS, Source
from aeroreview.rules.data import CLASS_CD

MEMORY = "from memory"
BREAKDOWN_SOURCE = Source(
    "shares of a passenger car's drag by region: wheels and wheelhouses up to about 25 % (CMES 2023, "
    "doi:10.32604/cmes.2023.043322, abstract checked), cooling dCd 0.01-0.07, mostly 0.03-0.05 (Katz, Automotive "
    "Aerodynamics, Wiley 2016, p. 538; checked, chapter not checked), the rest recalled from Hucho 1998 (chapter "
    "not checked)", MEMORY)
RECOVERABLE_SOURCE = Source("largest share of a region's drag that production fixes recover; our judgment from "
                            "Hucho 1998 (chapters not checked), recalled, not checked", MEMORY)
FLOOR_SOURCE = Source("lowest production Cd of each class: the low end of the class ranges in aeroreview.rules.data "
                      "(common practice); production sedans at about 0.20 per manufacturers' figures in the press, "
                      "checked with a web search", "common practice")
RAISE_SOURCE = Source("what a fixed tyre width, glass mirrors or ride height cost against the class's best; "
                      "recalled from published production-car comparisons, not checked", MEMORY)
LIFT_STAKE = 0.20  # smallest lift coefficient at stake per axle: the span of road cars' axle lift, about
# -0.05 to +0.15, plus margin (from memory, Hucho 1998, chapter not checked)


@dataclass(frozen=True)
class Budget:
    """A region's share of the revision's Cd and the largest fraction of it that fixes recover."""

    share: float
    recoverable: float


# Typical drag breakdowns (shares sum to 1); sources above. "car": sedans, fastbacks, hatchbacks,
# estates, sports cars; "tall": SUVs, vans, pickups (more base and appendage drag, less wheel share).
BREAKDOWNS = {
    "car": {"forebody": Budget(0.08, 0.30), "upper": Budget(0.09, 0.30), "rear": Budget(0.28, 0.35),
            "underbody": Budget(0.15, 0.50), "wheels": Budget(0.25, 0.40), "cooling": Budget(0.10, 0.60),
            "appendages": Budget(0.05, 0.50)},
    "tall": {"forebody": Budget(0.12, 0.30), "upper": Budget(0.08, 0.30), "rear": Budget(0.30, 0.30),
             "underbody": Budget(0.15, 0.50), "wheels": Budget(0.20, 0.40), "cooling": Budget(0.08, 0.60),
             "appendages": Budget(0.07, 0.50)},
}
TALL_CLASSES = ("suv", "van", "pickup")
FLOORS = {vehicle_class: low for vehicle_class, (low, _) in CLASS_CD.items()}


@dataclass(frozen=True)
class Raise:
    """A floor raise for a feature the review cannot change: ``per`` counts per unit above ``above``.

    It does not apply when the rule ``unless`` has an unresolved finding: that rule offers
    the change as a fix, and its saving is claimed in its region instead.
    """

    feature: str
    above: float  # SI
    per: float  # counts per SI unit above
    why: str
    unless: str = ""


# Tyre width above 225 mm: 1.5 counts per 10 mm; ground clearance above 140 mm (cars) or 190 mm
# (tall classes): 1 count per 10 mm; glass mirrors: 5 counts over camera pods. All RAISE_SOURCE.
RAISES = (Raise("wheels.tyre_width", 0.225, 150.0, "tyres wider than 225 mm", unless="wheels.tyre-width"),
          Raise("dimensions.ground_clearance", 0.140, 100.0, "ground clearance above 140 mm"))
TALL_CLEARANCE = Raise("dimensions.ground_clearance", 0.190, 100.0, "ground clearance above 190 mm")
MIRROR_RAISE = 5.0  # counts for conventional glass mirrors (RAISE_SOURCE)


@dataclass(frozen=True)
class Model:
    """The model's one table: floors by class and budgets by region (settings may override)."""

    floors: dict[str, float] = field(default_factory=lambda: dict(FLOORS))
    overrides: dict[str, Budget] = field(default_factory=dict)  # by region, for every class

    def budgets(self, vehicle_class: str | None) -> dict[str, Budget]:
        breakdown = BREAKDOWNS["tall" if vehicle_class in TALL_CLASSES else "car"]
        return {**breakdown, **self.overrides}


DEFAULT_MODEL = Model()


def combine(effects, budget: float) -> float:
    """Saving of fixes ``effects`` [counts] that share one ``budget``: D x (1 - prod(1 - min(e, D) / D))."""
    if budget <= 0:
        return 0.0
    left = 1.0
    for effect in effects:
        left = _left(left, effect, budget)
    return budget * (1.0 - left)


def _left(left: float, effect: float, budget: float) -> float:
    """The share of a positive ``budget`` still left after one more fix of ``effect`` counts."""
    return left * (1.0 - min(max(effect, 0.0), budget) / budget)


@dataclass(frozen=True)
class Claim:
    """What one unresolved finding claims: drag counts (low, high) in a region, and lift changes."""

    rule: str
    region: str | None
    low: float = 0.0
    high: float = 0.0
    cl_front: float = 0.0  # lift a fix removes (positive), per axle
    cl_rear: float = 0.0

    @property
    def mid(self) -> float:
        return (self.low + self.high) / 2

    def at(self, end: str) -> float:
        return {"low": self.low, "mid": self.mid, "high": self.high}[end]


@dataclass(frozen=True)
class Frame:
    """What claims are measured against on one revision: its Cd, floor, budgets and lift at stake."""

    cd: float
    floor_cd: float
    budgets: dict[str, float]  # counts by region
    lift_stake: tuple[float, float] = (LIFT_STAKE, LIFT_STAKE)  # front, rear
    raised_for: tuple[str, ...] = ()

    @property
    def gap(self) -> float:
        """Counts between the Cd and the floor: the most any set of fixes can recover."""
        return max(0.0, (self.cd - self.floor_cd) * 1000)


def frame_for(sheet, cd: float, model: Model = DEFAULT_MODEL, lift: tuple | None = None, proposed=()) -> Frame:
    """The frame of a revision with drag coefficient ``cd`` (and measured axle lift, if any).

    ``proposed``: ids of the rules whose unresolved findings offer fixes (see :class:`Raise`).
    """
    vehicle_class = sheet.get("vehicle.class")
    floor = model.floors.get(vehicle_class, min(model.floors.values()))
    raises = RAISES if vehicle_class not in TALL_CLASSES else (RAISES[0], TALL_CLEARANCE)
    raised_for, counts = [], 0.0
    for item in raises:
        value = sheet.get(item.feature)
        if value is not None and value > item.above and item.unless not in proposed:
            counts += (value - item.above) * item.per
            raised_for.append(item.why)
    if sheet.get("sides.mirror_kind") == "conventional":
        counts += MIRROR_RAISE
        raised_for.append("conventional mirrors")
    budgets = {region: cd * 1000 * b.share * b.recoverable for region, b in model.budgets(vehicle_class).items()}
    stake = tuple(max(LIFT_STAKE, value or 0.0) for value in (lift or (None, None)))
    return Frame(cd, floor + counts / 1000, budgets, stake, tuple(raised_for))


def rescaled(frame: Frame, cd: float) -> Frame:
    """The same revision's frame at another drag coefficient (budgets scale with Cd; the floor stays)."""
    factor = cd / frame.cd if frame.cd else 0.0
    return replace(frame, cd=cd, budgets={region: d * factor for region, d in frame.budgets.items()})


def claim_of(finding) -> Claim | None:
    """The claim of a review finding: None when it passes, is not assessed, or costs nothing."""
    if not finding.actionable:
        return None
    verdict = finding.verdict
    low, high = verdict.counts or (0.0, 0.0)
    lift = (max(0.0, -(verdict.cl_front or 0.0)), max(0.0, -(verdict.cl_rear or 0.0)))
    if high <= 0 and not any(lift):
        return None
    if high > 0 and finding.rule.region is None:
        raise ValueError(f"rule {finding.rule.id} gives drag counts but declares no flow region")
    return Claim(finding.rule.id, finding.rule.region, low, high, *lift)


def by_region(claims, frame: Frame, end: str = "mid") -> dict[str, float]:
    """Each region's combined saving [counts] at one end of the ranges."""
    grouped: dict[str, list[float]] = {}
    for claim in claims:
        if claim.region is not None:
            grouped.setdefault(claim.region, []).append(claim.at(end))
    return {region: combine(effects, frame.budgets.get(region, 0.0)) for region, effects in grouped.items()}


def combined(claims, frame: Frame, end: str = "mid") -> float:
    """The combined saving [counts]: regions combined, then saturated toward the floor."""
    return combine(by_region(claims, frame, end).values(), frame.gap)


def plain_sum(claims, end: str) -> float:
    return sum(claim.at(end) for claim in claims)


def within_reach(frame: Frame, regions) -> float:
    """The most the model gives when every budget of ``regions`` is fully claimed [counts]."""
    return combine((frame.budgets.get(region, 0.0) for region in regions), frame.gap)


def lift_share(claims, frame: Frame) -> float:
    """Share of the lift at stake the claims still hold, both axles (0 to 1)."""
    kept = 1.0
    for axle, stake in zip(("cl_front", "cl_rear"), frame.lift_stake):
        kept *= 1.0 - combine((getattr(c, axle) for c in claims), stake) / stake
    return 1.0 - kept


def score(claims, frame: Frame, regions) -> float:
    """100 x (1 - drag share) x (1 - lift share): cost only, never severity.

    The drag share is the combined mid saving over what is ``within_reach`` of ``regions``.
    Rounded once, to the tenth a score is read to, so that every page, chart and report that
    rounds it further shows the same number (24.5 must not read 25 in one place and 24 in another).
    """
    reach = within_reach(frame, regions)
    drag = combined(claims, frame) / reach if reach > 0 else 0.0
    return round(100.0 * (1.0 - min(1.0, drag)) * (1.0 - lift_share(claims, frame)), 1)


@dataclass(frozen=True)
class Estimate:
    """A revision's combined saving, the Cd it leads to, the plain sum beside it, and the waterfall."""

    cd: float
    floor_cd: float
    low: float
    mid: float
    high: float
    plain_sum_low: float
    plain_sum_high: float
    waterfall: tuple[tuple[str, float], ...]  # (rule id, marginal mid saving) in rank order
    regions: dict[str, float]  # combined mid saving by region
    raised_for: tuple[str, ...] = ()

    @property
    def cd_after(self) -> dict[str, float]:
        """The Cd after the fixes, in rising order: low after the high saving, high after the low."""
        return {"low": self.cd - self.high / 1000, "mid": self.cd - self.mid / 1000, "high": self.cd - self.low / 1000}


def waterfall(ranked, frame: Frame) -> tuple[tuple[str, float], ...]:
    """Each claim's marginal mid saving given the claims ranked before it.

    Each region keeps the share of its budget left so far, so a step multiplies in one factor
    instead of recombining every claim before it: the same products, in the same order, as
    :func:`combined` on the first claims (linear in the claims, not quadratic).
    """
    steps, before, left = [], 0.0, {}
    for claim in ranked:
        region = claim.region
        if region is not None:
            budget = frame.budgets.get(region, 0.0)
            share = left.get(region, 1.0)
            left[region] = _left(share, claim.mid, budget) if budget > 0 else share
        after = combine((frame.budgets.get(r, 0.0) * (1.0 - share) for r, share in left.items()), frame.gap)
        steps.append((claim.rule, after - before))
        before = after
    return tuple(steps)


def estimate(ranked, frame: Frame) -> Estimate:
    """The combined estimate of ``ranked`` claims (in the order fixes are ranked)."""
    ranked = list(ranked)
    return Estimate(frame.cd, frame.floor_cd, combined(ranked, frame, "low"), combined(ranked, frame, "mid"),
                    combined(ranked, frame, "high"), plain_sum(ranked, "low"), plain_sum(ranked, "high"),
                    waterfall(ranked, frame), by_region(ranked, frame), frame.raised_for)


def model_from_mapping(data, error) -> Model:
    """The ``estimates`` setting: ``floors: {class: Cd}`` and ``regions: {region: {share, recoverable}}``.

    ``error(where, message, hint, key=False)`` records a located problem.
    """
    if not isinstance(data, dict):
        error((), "'estimates' must be a mapping", "floors: {fastback: 0.21}, regions: {wheels: {share: 0.3}}")
        return DEFAULT_MODEL
    model = DEFAULT_MODEL
    for key in data:
        if key not in ("floors", "regions"):
            error((key,), f"unknown estimates setting '{key}'", "floors or regions", key=True)
    floors = data.get("floors") or {}
    for name, value in (floors.items() if isinstance(floors, dict) else ()):
        if name not in FLOORS:
            error(("floors", name), f"unknown vehicle class '{name}'", f"classes: {', '.join(FLOORS)}", key=True)
        elif not _number(value, 0.05, 1.0):
            error(("floors", name), "a floor is a drag coefficient between 0.05 and 1", "e.g. 0.21")
        else:
            model = replace(model, floors={**model.floors, name: float(value)})
    regions = data.get("regions") or {}
    for name, raw in (regions.items() if isinstance(regions, dict) else ()):
        if name not in REGIONS:
            error(("regions", name), f"unknown flow region '{name}'", f"regions: {', '.join(REGIONS)}", key=True)
            continue
        base = BREAKDOWNS["car"][name]
        raw = raw if isinstance(raw, dict) else {}
        values = {k: raw.get(k, getattr(base, k)) for k in ("share", "recoverable")}
        bad = [k for k in raw if k not in values or not _number(raw[k], 0.0, 1.0)]
        for k in bad:
            error(("regions", name, k), f"'{k}' must be share or recoverable, a number from 0 to 1", "e.g. share: 0.3")
        if not bad:
            model = replace(model, overrides={**model.overrides, name: Budget(float(values["share"]),
                                                                              float(values["recoverable"]))})
    return model


def _number(value, low: float, high: float) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool) and low <= value <= high
