"""Data quality: does the sheet say what its own surface measures?

A sheet that names its surface (``geometry``) can be held against it. The engine measures the
surface (:mod:`aeroreview.sheetsurface`, cached) and hands the values here as
:class:`SurfaceValues`; this module holds no mesh code. The tolerances are declared once, as
the rule's thresholds, and the merge of ``aeroreview measure --sheet`` uses the same ones.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from aeroreview import catalogue
from aeroreview.display import DEG, PERCENT
from aeroreview.rules import COMMON, Source, Threshold, major, not_assessed, passed, rule
from aeroreview.units import format_quantity

RADIUS_SOURCE = Source("circle fits over the short arc of an edge radius scatter by about a quarter of the radius; "
                       "recalled, not checked", "from memory")
# Angles: a surface angle is read to about a degree. Lengths and areas: 3 % covers a drawing
# against a surface with trim, seals and mirrors in or out. Radii: see RADIUS_SOURCE.
TOLERANCES = (
    Threshold("angle", "1 deg", "deg", "largest difference of an angle from its measurement", COMMON,
              allowed=(0.1, 10.0)),
    Threshold("size", "3 %", "%", "largest difference of a length or an area from its measurement", COMMON,
              allowed=(0.5, 30.0)),
    Threshold("radius", "25 %", "%", "largest difference of an edge radius from its measurement", RADIUS_SOURCE,
              allowed=(1.0, 100.0)),
)
DEFAULT_TOLERANCES = {t.name: t.parse(t.default) for t in TOLERANCES}


@dataclass(frozen=True)
class SurfaceValues:
    """What the engine measured on a sheet's own surface: catalogue key -> SI value."""

    file: str
    values: dict[str, float] = field(default_factory=dict)
    doubts: dict[str, str] = field(default_factory=dict)  # key -> why the measurement itself is implausible
    problem: str | None = None  # why the surface could not be measured at all


@dataclass(frozen=True)
class Comparison:
    """One sheet value beside its measurement."""

    key: str
    sheet: float  # SI
    surface: float  # SI
    tolerance: float  # SI, the largest difference that still agrees

    @property
    def agrees(self) -> bool:
        return abs(self.sheet - self.surface) <= self.tolerance

    def numbers(self) -> str:
        """``sheet 10 mm, surface 30 mm``, in the feature's unit (any feature: three significant figures)."""
        unit = catalogue.feature(self.key).unit
        return f"sheet {format_quantity(self.sheet, unit)}, surface {format_quantity(self.surface, unit)}"

    def text(self) -> str:
        return f"{self.key}: {self.numbers()}"


def tolerance(key: str, measured: float, tolerances: dict[str, float] = DEFAULT_TOLERANCES) -> float:
    """The difference [SI] a sheet value may have from its measurement ``measured`` [SI]."""
    if catalogue.feature(key).unit == "deg":
        return tolerances["angle"]
    return abs(measured) * tolerances["radius" if key.endswith("_radius") else "size"]


def compare(key: str, sheet: float, measured: float,
            tolerances: dict[str, float] = DEFAULT_TOLERANCES) -> Comparison:
    return Comparison(key, sheet, measured, tolerance(key, measured, tolerances))


def _limit(ctx) -> str:
    return f"angles ±{DEG(ctx['angle'], None)}, lengths and areas ±{PERCENT(ctx['size'], None)}, " \
           f"radii ±{PERCENT(ctx['radius'], None)}"


@rule("data.surface-agreement", "Sheet values against the sheet's own surface", "warning",
      thresholds=TOLERANCES, sources=(COMMON, RADIUS_SOURCE), applies_if=lambda sheet: sheet.geometry is not None)
def surface_agreement(sheet, ctx):
    """
    What it checks: every feature the sheet gives that can be measured on the surface its
    `geometry` names (dimensions, frontal area, the centreline angles and radii, ground
    clearance, nose rake, diffuser angle, the side taper at belt height), against that
    measurement, within a tolerance by kind: angles, lengths and areas, radii.

    Why it matters: the rules judge the sheet's numbers, the site draws the surface. When the
    two disagree (a value typed from an older drawing, a surface from another revision, a
    unit slip) the review judges a car nobody built, and the page shows both without a word.

    How to fix: find which is out of date. Re-measure with `aeroreview measure SURFACE
    --sheet SHEET --overwrite` when the surface is right, or point `geometry` at the right
    surface; the tolerances are angles {angle}, lengths and areas {size}, radii {radius}.

    Known limits: only what `aeroreview measure` finds on the surface is compared (no
    wheels, mirrors or underbody details); a measurement that is itself implausible (a
    ground clearance with the ground plane at the lowest point, a fit larger than the body)
    is named and not compared.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {features: {rear.roof_backlight_radius: 100 mm}}
        passes: {features: {rear.roof_backlight_radius: 390 mm}}
    """
    surface = getattr(sheet, "surface", None)
    if surface is None:
        return not_assessed("the sheet's surface was not measured", missing=("geometry",))
    if surface.problem:
        return not_assessed(f"the surface {surface.file} could not be measured: {surface.problem}")
    tolerances = {name: ctx[name] for name in DEFAULT_TOLERANCES}
    compared = [compare(key, sheet.get(key), value, tolerances) for key, value in surface.values.items()
                if key not in surface.doubts and isinstance(sheet.get(key), float)]
    if not compared:
        return not_assessed(f"no feature of the sheet is measured on {surface.file}")
    differing = [c for c in compared if not c.agrees]
    details = {"file": surface.file, "doubts": dict(surface.doubts), "compared": [
        {"key": c.key, "sheet": c.sheet, "surface": c.surface, "tolerance": c.tolerance, "agrees": c.agrees}
        for c in compared]}
    skipped = f"; not compared, the measurement is doubtful: {', '.join(surface.doubts)}" if surface.doubts else ""
    if differing:
        return major(f"{len(differing)} of {len(compared)} values disagree with {surface.file}{skipped}",
                     measured="; ".join(c.text() for c in differing), limit=_limit(ctx), details=details)
    return passed(f"all {len(compared)} values agree with {surface.file}{skipped}",
                  measured=f"{len(compared)} values compared", limit=_limit(ctx), details=details)
