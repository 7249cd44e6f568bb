"""aeroreview.rules: the team's aerodynamic knowledge as executable checks.

One function per rule, in the module of its zone, registered with :func:`rule`. The
decorator carries the metadata (id ``zone.slug``, title, default severity, the features
the rule needs, its thresholds with units and sources, its effect ranges as :class:`Effect`);
the function's docstring is the rule's documentation, with the same four sections on every
rule: ``What it checks:``, ``Why it matters:``, ``How to fix:``, ``Known limits:``.

A rule is pure: it receives the sheet and a :class:`Context` (its thresholds as SI floats,
the review conditions) and returns a :class:`Verdict`. It never raises on missing data: the
framework reports "not assessed" when a needed feature is absent, and a rule that needs
something else (a result with lift coefficients, say) returns :func:`not_assessed`.

Verdict levels are ``pass``, ``minor`` and ``major``; the review turns them into a status
from the rule's severity (set per rule, overridable in the settings): ``major`` takes the
severity itself, ``minor`` the level below it. One mechanism serves every rule, and a team
that raises a rule to ``failure`` raises both of its bands.

Each rule also names the flow region its fix acts on (:data:`REGIONS`): by default the
region of its zone (:data:`ZONE_REGIONS`), or ``region=...`` in the decorator when the rule
acts on another zone's flow (an air dam works on the underbody flow). The estimates combine
the fixes of one region with each other, so two rules that charge for the same flow do not
add up. Lift-only and data-quality rules have no region: they carry no drag counts.
"""

from __future__ import annotations

import functools
import inspect
import re
from dataclasses import dataclass, field
from typing import Callable, Mapping

from aeroreview.catalogue import REVIEW_ZONES
from aeroreview.units import from_si, to_si

STATUSES = ("pass", "advisory", "warning", "failure")  # in rising order of concern
NOT_ASSESSED = "not assessed"
SEVERITIES = ("advisory", "warning", "failure")
SOURCE_KINDS = ("published", "standard", "common practice", "from memory", "team data")
ZONES = REVIEW_ZONES
DOC_SECTIONS = ("What it checks", "Why it matters", "How to fix", "Known limits")

# The flows a fix can act on: the regions of a typical drag breakdown (our grouping).
REGIONS = {
    "forebody": "Front and forebody", "upper": "Upper body and pillars", "rear": "Rear and base",
    "underbody": "Underbody and diffuser", "wheels": "Wheels and wheelhouses", "cooling": "Cooling flow",
    "appendages": "Mirrors and appendages",
}
ZONE_REGIONS = {"front": "forebody", "windshield": "upper", "rear": "rear", "sides": "appendages",
                "underbody": "underbody", "wheels": "wheels", "cooling": "cooling", "stability": None, "data": None}


@dataclass(frozen=True)
class Source:
    """Where a number or a rule comes from, and how far to trust it."""

    citation: str
    kind: str

    def __post_init__(self):
        if self.kind not in SOURCE_KINDS:
            raise ValueError(f"source kind must be one of {SOURCE_KINDS}")

    def as_dict(self) -> dict:
        return {"citation": self.citation, "kind": self.kind}


@dataclass(frozen=True)
class Effect:
    """The range of what a fix recovers, declared once: its source text and the finding's counts share it.

    Mostly drag counts; some rules quote a share or a coefficient that they turn into counts.
    ``text`` says what the range covers and where it comes from, with ``{low}`` and ``{high}``
    where the numbers go ("{low}-{high} counts; from memory"). A range per unit of something
    ("per degree of useful taper") is scaled with :meth:`counts`. Put the effect in the rule's
    ``sources`` and cost the finding with ``ctx.effect().counts(...)``, never with the numbers
    again; a rule with several ranges names the others (``name="tall"``, ``ctx.effect("tall")``).
    """

    low: float
    high: float
    text: str
    kind: str
    name: str = "effect"

    def __post_init__(self):
        if "{high}" not in self.text or ("{low}" not in self.text and self.low != 0):
            raise ValueError(f"effect text {self.text!r} must show its range with {{low}} and {{high}} "
                             "({high} alone only for a range from 0: 'up to {high}')")
        if not 0 <= self.low <= self.high:
            raise ValueError(f"effect range {self.low}-{self.high} must be 0 <= low <= high")

    @property
    def source(self) -> Source:
        return Source("effect: " + self.text.format(low=f"{self.low:g}", high=f"{self.high:g}"), self.kind)

    def counts(self, amount: float = 1.0, high_amount: float | None = None) -> tuple[float, float]:
        """The range times ``amount``, the units of what it is quoted per (1 for a fixed range).

        ``high_amount`` scales the high end where that quantity is itself uncertain.
        """
        return counts_range(self.low * amount, self.high * (amount if high_amount is None else high_amount))


COMMON = Source("common practice in production-car aerodynamics", "common practice")
HUCHO = Source("Hucho (ed.), Aerodynamics of Road Vehicles, 4th ed., SAE International 1998 (edition, year and "
               "publisher confirmed in a published reference list, J. Fluids Eng. 141 (2019) 020801); chapter not "
               "checked, figure recalled, not checked", "from memory")
HUCHO_SOVRAN = Source("Hucho and Sovran, 'Aerodynamics of road vehicles', Annu. Rev. Fluid Mech. 25 (1993) 485-537 "
                      "(title/authors/year/venue and first page checked on a copy): drag is mainly pressure drag, and "
                      "avoiding or controlling separation is the main objective", "published")


@dataclass(frozen=True)
class Threshold:
    """A named, unit-bearing limit that a team may override in its settings, within ``allowed``."""

    name: str
    default: str  # with its unit, e.g. "26 deg"; "" unit means a plain number
    unit: str
    description: str
    source: Source
    allowed: tuple[float, float] | None = None  # in ``unit``; None: the unit's range (UNIT_RANGES)

    def parse(self, value) -> float:
        return to_si(value, self.unit)

    @property
    def allowed_range(self) -> tuple[float, float]:
        """Where an override may lie [unit]: declared, else the unit's range, else 0 to 10 x the default."""
        if self.allowed:
            return self.allowed
        if self.unit in UNIT_RANGES:
            return UNIT_RANGES[self.unit]
        default = float(self.default.split()[0])
        return (min(0.0, 10 * default), max(0.0, 10 * default)) if default else (-1.0, 1.0)


# Ranges a threshold override may take, by unit (our convention): angles of a body surface,
# shares, body dimensions, and road speeds (as results speeds, see aeroreview.sections).
UNIT_RANGES = {"deg": (0.0, 90.0), "%": (0.0, 100.0), "mm": (0.0, 2000.0), "km/h": (1.0, 600.0)}


@dataclass(frozen=True)
class Sensitivity:
    """The rule's effect per unit of the feature it judges: drag counts per ``unit`` of ``feature``.

    It holds inside ``valid`` (in ``unit``); the rule's fix takes the feature to its
    threshold ``fix_to``, so a team calibration of the slope (``aeroreview calibrate``)
    can re-cost the fix. Positive: more of the feature, more drag.
    """

    feature: str
    counts_per_unit: float
    unit: str
    valid: tuple[float, float]
    fix_to: str
    source: Source

    def as_dict(self) -> dict:
        return {"feature": self.feature, "counts_per_unit": self.counts_per_unit, "unit": self.unit,
                "valid": list(self.valid), "fix_to": self.fix_to, "source": self.source.as_dict()}


@dataclass(frozen=True)
class Verdict:
    """What a rule found. ``counts`` is the drag a fix would recover (low, high)."""

    level: str  # "pass", "minor", "major", or "not assessed"
    message: str
    measured: str | None = None
    limit: str | None = None
    margin: str | None = None
    counts: tuple[float, float] | None = None
    cl_front: float | None = None  # change of axle lift coefficient a fix would bring
    cl_rear: float | None = None
    missing: tuple[str, ...] = ()
    details: dict | None = None


def actionable(status: str) -> bool:
    """Whether a status (or a verdict level) asks for action: neither a pass nor "not assessed"."""
    return status != "pass" and status != NOT_ASSESSED


def passed(message: str, **extra) -> Verdict:
    return Verdict("pass", message, **extra)


def minor(message: str, **extra) -> Verdict:
    return Verdict("minor", message, **extra)


def major(message: str, **extra) -> Verdict:
    return Verdict("major", message, **extra)


def not_assessed(message: str, missing=()) -> Verdict:
    return Verdict(NOT_ASSESSED, message, missing=tuple(missing))


@dataclass(frozen=True)
class Context:
    """What a rule may use beside the sheet: its thresholds (SI) and the review conditions."""

    thresholds: dict[str, float]
    reference_speed: float  # m/s
    density: float  # kg/m^3
    kinematic_viscosity: float  # m^2/s
    effects: Mapping[str, Effect] = field(default_factory=dict, compare=False)  # the rule's declared ranges, by name

    def __getitem__(self, name: str) -> float:
        return self.thresholds[name]

    def effect(self, name: str = "effect") -> Effect:
        """The rule's effect range ``name``, as declared in its sources."""
        if name not in self.effects:
            raise KeyError(f"the rule declares no effect named {name!r} (it has {sorted(self.effects)})")
        return self.effects[name]


@dataclass(frozen=True)
class Rule:
    id: str
    zone: str
    title: str
    severity: str
    needs: tuple[str, ...]  # features without which the rule cannot judge ("not assessed")
    thresholds: tuple[Threshold, ...]
    sources: tuple[Source, ...]
    check: Callable
    applies_to: tuple[str, ...] = ()  # vehicle classes; empty means every class
    figure: str | None = None  # name of a reference figure the site can draw
    region: str | None = None  # the flow region its fix acts on (REGIONS); None: no drag counts
    sensitivity: Sensitivity | None = None
    optional: tuple[str, ...] = ()  # features the rule reads when given (a better limit or estimate)
    applies_if: Callable | None = None  # geometry test (sheet -> bool) beside the class list
    effects: Mapping[str, Effect] = field(default_factory=dict, compare=False)  # its sources' Effect items, by name

    @property
    def doc(self) -> dict[str, str]:
        """The docstring's sections, by heading, with the default thresholds in place of ``{name}``."""
        return {heading: self.with_thresholds(body) for heading, body in parse_doc(self.check.__doc__ or "").items()}

    @property
    def fix(self) -> str:
        return self.doc.get("How to fix", "")

    @property
    def examples(self) -> list[tuple[str, str]]:
        """The docstring's examples: (status, YAML fragment changing the demo's clean revision)."""
        return parse_examples(self.check.__doc__ or "")

    def fix_for(self, thresholds: dict[str, float]) -> str:
        """How to fix, with the team's thresholds (SI, as in a rule's context) in place of ``{name}``."""
        return self.with_thresholds(parse_doc(self.check.__doc__ or "").get("How to fix", ""), thresholds)

    def with_thresholds(self, text: str, thresholds: dict[str, float] | None = None) -> str:
        """``text`` with each ``{name}`` of one of this rule's thresholds shown in its unit."""
        values = {**self._defaults, **(thresholds or {})}
        known = {t.name: t for t in self.thresholds}

        def shown(match) -> str:
            item = known.get(match[1])
            return f"{from_si(values[item.name], item.unit):g} {item.unit}".rstrip() if item else match[0]
        return _THRESHOLD_NAME.sub(shown, text)

    def threshold(self, name: str) -> Threshold:
        for item in self.thresholds:
            if item.name == name:
                return item
        raise KeyError(name)

    def defaults(self) -> dict[str, float]:
        return dict(self._defaults)

    @functools.cached_property
    def _defaults(self) -> dict[str, float]:
        """The default thresholds in SI, read once (every finding's fix text shows them)."""
        return {t.name: t.parse(t.default) for t in self.thresholds}

    @property
    def reads(self) -> tuple[str, ...]:
        """Every feature the rule reads, needed or optional."""
        return self.needs + tuple(key for key in self.optional if key not in self.needs)

    def applies(self, sheet) -> bool:
        """Whether the rule judges this sheet: its class is listed (or none are) and its geometry fits."""
        if self.applies_to and sheet.get("vehicle.class") not in self.applies_to:
            return False
        return self.applies_if is None or bool(self.applies_if(sheet))


_SECTION = re.compile(r"^(%s):\s*" % "|".join(DOC_SECTIONS), re.M)
# After the sections, "Examples (...):" lists YAML fragments with the status each must give.
_EXAMPLES = re.compile(r"^Examples\b[^\n]*:\s*$", re.M)
_EXAMPLE = re.compile(r"^\s*(fails \((advisory|warning|failure)\)|passes):\s*", re.M)


_THRESHOLD_NAME = re.compile(r"\{([a-z_]+)\}")


def parse_examples(text: str) -> list[tuple[str, str]]:
    """(status it must give, YAML fragment) of each line of a rule docstring's Examples block."""
    parts = _EXAMPLES.split(inspect.cleandoc(text), 1)
    if len(parts) < 2:
        return []
    found = _EXAMPLE.split(parts[1])
    return [("pass" if label == "passes" else status, " ".join(fragment.split()))
            for label, status, fragment in zip(found[1::3], found[2::3], found[3::3])]


@functools.lru_cache(maxsize=None)
def parse_doc(text: str) -> dict[str, str]:
    """Split a rule docstring into its sections (``What it checks: ...`` and so on).

    Cached, as every finding's fix text is cut from it: callers only read the result.
    """
    text = _EXAMPLES.split(inspect.cleandoc(text), 1)[0]
    parts = _SECTION.split(text)
    sections = {}
    for heading, body in zip(parts[1::2], parts[2::2]):
        sections[heading] = " ".join(body.split())
    return sections


REGISTRY: dict[str, Rule] = {}


def rule(id: str, title: str, severity: str, needs=(), thresholds=(), sources=(), applies_to=(), figure=None,
         region: str | None = "", sensitivity: Sensitivity | None = None, optional=(), applies_if=None):
    """Register the decorated function as a rule (see the module docstring).

    ``region`` defaults to the zone's flow region; give it where the fix acts on another flow.
    """
    zone = id.split(".", 1)[0]
    flow = ZONE_REGIONS.get(zone) if region == "" else region

    def register(function):
        if zone not in ZONES or not re.fullmatch(r"[a-z]+\.[a-z0-9-]+", id):
            raise ValueError(f"bad rule id {id!r}")
        if severity not in SEVERITIES:
            raise ValueError(f"{id}: severity must be one of {SEVERITIES}")
        if flow is not None and flow not in REGIONS:
            raise ValueError(f"{id}: region must be one of {tuple(REGIONS)}")
        if id in REGISTRY:
            raise ValueError(f"rule {id} registered twice")
        if sensitivity and (sensitivity.feature not in needs or sensitivity.fix_to not in {t.name for t in thresholds}):
            raise ValueError(f"{id}: a sensitivity needs one of the rule's features and thresholds")
        cited = tuple(item.source if isinstance(item, Effect) else item for item in sources)
        effects = {item.name: item for item in sources if isinstance(item, Effect)}
        if len(effects) < sum(isinstance(item, Effect) for item in sources):
            raise ValueError(f"{id}: two effects share a name; name each with name=...")
        REGISTRY[id] = Rule(id, zone, title, severity, tuple(needs), tuple(thresholds), cited, function,
                            tuple(applies_to), figure, flow, sensitivity, tuple(optional), applies_if, effects)
        return function

    return register


RULES_HINT = "see `aeroreview rules` for the rule ids"  # where a mistyped rule id is looked up


def all_rules() -> dict[str, Rule]:
    """Every registered rule, by id, in zone order."""
    return _ordered(len(REGISTRY))


@functools.lru_cache(maxsize=1)
def _ordered(size: int) -> dict[str, Rule]:
    order = list(ZONES)
    return dict(sorted(REGISTRY.items(), key=lambda item: (order.index(item[1].zone), item[0])))


COUNTS_PER_CD = 1000.0  # 1 drag count = 0.001 of a coefficient (common practice)
PER_PERCENT = 0.01  # an effect quoted in % of a quantity is that quantity x 0.01 per % (arithmetic)


def counts_range(low: float, high: float) -> tuple[float, float]:
    """A drag-count range, rounded to tenths and never negative."""
    return (round(max(0.0, low), 1), round(max(0.0, high), 1))


# The zone modules register their rules on import.
from aeroreview.rules import (cooling, crosswind, data, decklid, front, rear, result_quality, sides,  # noqa: E402,F401
                              stability, surface_agreement, underbody, wheels, windshield)
