"""Units at the boundary: parse what users type, hand SI floats to the core.

One pint registry for the whole program, built the first time a conversion outside
:data:`aeroreview.conversions.KNOWN` is needed (importing pint and building it costs about
0.3 s). Users write ``"27 deg"``, ``"180 mm"``, ``"130 km/h"``, ``"52 %"`` or a bare number in
the unit the context names; the core only ever sees SI floats (m, kg, s, rad, W, J, and plain
fractions).

pint treats angles and percentages as dimensionless, so ``"27 %"`` would pass for an
angle; :func:`to_si` therefore also compares the *root unit* (radian or none), which keeps
angles and fractions apart.
"""

from __future__ import annotations

import math
import re
from functools import lru_cache
from typing import TYPE_CHECKING

from aeroreview.conversions import KNOWN
from aeroreview.problems import echo

if TYPE_CHECKING:
    import pint


@lru_cache(maxsize=1)
def registry():
    """pint's unit registry, imported and built on first use."""
    import pint

    return pint.UnitRegistry()


def __getattr__(name: str):
    if name == "UNITS":  # the registry itself, for callers that want pint's quantities
        return registry()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


_NUMBER = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")
# pint's parser evaluates what it is given: "m**9**9**9" never finishes. Before pint sees a
# unit it must match this grammar: at most MAX_TERMS unit names joined by * / or spaces,
# each with at most one small integer exponent (no towers). Bounds from common practice:
# no unit a reviewer types needs more than "kg*m^2/s^3".
MAX_VALUE_TEXT = 100  # characters in a value with its unit, e.g. "2.25 m^2"
MAX_TERMS = 6
_NAME = r"(?:[^\W\d]|[%°µΩ])(?:[^\W\d]|[%°µΩ²³_])*"
_TERM = rf"{_NAME}(?:\s*(?:\^|\*\*)\s*[-+]?[1-4])?"
_UNIT = re.compile(rf"^{_TERM}(?:\s*[*/·]\s*{_TERM}|\s+{_TERM}){{0,{MAX_TERMS - 1}}}$")


class UnitProblem(ValueError):
    """A value that cannot be read in the unit required; ``hint`` says what to write."""

    def __init__(self, message: str, hint: str):
        super().__init__(message)
        self.hint = hint


@lru_cache(maxsize=512)
def _unit(text: str) -> pint.Unit:
    return registry().Unit(text)


@lru_cache(maxsize=512)
def _root(unit: pint.Unit) -> tuple[float, str]:
    factor, root = registry().get_root_units(unit)
    return factor, str(root)


@lru_cache(maxsize=512)
def _conversion(unit_text: str, canonical: str) -> tuple[float, float]:
    """Scale and offset taking a value in ``unit_text`` to the SI form of ``canonical``."""
    unit, wanted = _unit(unit_text), _unit(canonical)
    if _root(unit)[1] != _root(wanted)[1] or unit.dimensionality != wanted.dimensionality:
        raise UnitProblem(
            f"'{echo(unit_text)}' is not a unit of {describe_dimension(canonical)}",
            f"write it in {canonical} or a compatible unit",
        )
    zero = registry().Quantity(0.0, unit).to_base_units().magnitude
    one = registry().Quantity(1.0, unit).to_base_units().magnitude
    return one - zero, zero


_DIMENSION_NAMES = {
    "[length]": "length", "[mass]": "mass", "[time]": "time", "[temperature]": "temperature",
    "[length] ** 2": "area", "[length] ** 3": "volume", "[length] / [time]": "speed",
    "[mass] / [length] / [time] ** 2": "pressure", "[mass] * [length] ** 2 / [time] ** 2": "energy",
    "[mass] * [length] ** 2 / [time] ** 3": "power", "[mass] * [length] / [time] ** 2": "force",
}


def describe_dimension(canonical: str) -> str:
    """A readable name of the physical quantity a unit measures ("length", "angle" ...)."""
    unit = _unit(canonical)
    if _root(unit)[1] == "radian":
        return "angle"
    if unit.dimensionless:
        return "a plain fraction (e.g. 0.52 or 52 %)"
    text = str(unit.dimensionality)
    return _DIMENSION_NAMES.get(text, text.replace("[", "").replace("]", ""))


def si_unit(canonical: str) -> str:
    """The SI unit (as text) in which the core holds a quantity given in ``canonical``."""
    root = _root(_unit(canonical))[1]
    return root if root != "dimensionless" else ""


def to_si(value: object, canonical: str) -> float:
    """Read ``value`` (a number in ``canonical``, or a string with a unit) as an SI float.

    >>> round(to_si("180 mm", "mm"), 6)
    0.18
    >>> round(to_si(27, "deg"), 6)
    0.471239
    >>> to_si("52 %", "")
    0.52
    """
    if isinstance(value, bool):
        raise UnitProblem("expected a number, got true/false", f"write a number in {canonical or 'plain units'}")
    if isinstance(value, (int, float)):
        try:
            magnitude, unit_text = float(value), canonical
        except OverflowError:
            raise UnitProblem(f"the number {echo(value)} is too large", "write a number of sensible size") from None
    elif isinstance(value, str):
        if len(value) > MAX_VALUE_TEXT:
            raise UnitProblem(f"the value is {len(value):,} characters long, over the limit of {MAX_VALUE_TEXT}",
                              f"write a number and a unit, e.g. '12.5 {canonical}'")
        match = _NUMBER.match(value)
        if not match:
            raise UnitProblem(
                f"cannot read '{echo(value)}' as a number with a unit",
                f"write e.g. '12.5 {canonical}'" if canonical else "write a plain number, e.g. 0.52",
            )
        magnitude = float(match.group(1))
        unit_text = match.group(2) or canonical
        if match.group(2) and not _UNIT.match(unit_text):
            raise UnitProblem(f"'{echo(unit_text)}' is not a unit expression this tool reads",
                              f"write a unit such as {canonical or '%'}; exponents are single digits 1 to 4, "
                              "written once (m^2, not m^2^2)")
    else:
        raise UnitProblem(
            f"expected a number or a string with a unit, got {type(value).__name__}",
            f"write e.g. '12.5 {canonical}'" if canonical else "write a plain number",
        )
    if not math.isfinite(magnitude):
        raise UnitProblem("the number is not finite", "write a finite number")
    try:
        scale, offset = _scale_offset(unit_text, canonical)
    except UnitProblem:
        raise
    except Exception:  # noqa: BLE001 - pint's parser raises many types on odd text; all mean "not a unit"
        raise UnitProblem(f"unknown unit '{echo(unit_text)}'", f"use a unit such as {canonical or '%'}") from None
    si = magnitude * scale + offset
    if not math.isfinite(si):
        raise UnitProblem(f"'{echo(value)}' is too large to be a physical value", "check the number and its unit")
    return si


def from_si(value: float, canonical: str) -> float:
    """Convert an SI float back to ``canonical`` (for display)."""
    scale, offset = _scale_offset(canonical, canonical)
    return (value - offset) / scale


def _scale_offset(unit_text: str, canonical: str) -> tuple[float, float]:
    """Scale and offset to SI: from the table of common conversions, else from pint."""
    key = (unit_text or "dimensionless", canonical or "dimensionless")
    return KNOWN.get(key) or _conversion(*key)


def format_number(value: float, digits: int = 3) -> str:
    """A number for people: ``digits`` significant figures (whole numbers kept whole), thousands
    separated, no exponent between 1e-4 and 1e9: 2035 gives ``2,035``, 0.5234 ``0.523``, 27.0 ``27``."""
    if value == 0 or not math.isfinite(value):
        return f"{value:g}"
    magnitude = math.floor(math.log10(abs(value)))
    if not -4 <= magnitude < 9:
        return f"{value:.{digits}g}"
    text = f"{value:,.{max(0, digits - 1 - magnitude)}f}"
    return text.rstrip("0").rstrip(".") if "." in text else text


def format_quantity(value: float, canonical: str, digits: int = 3) -> str:
    """Format an SI float in its canonical unit for people, e.g. ``27 deg``, ``2,035 kg`` or ``0.52``."""
    text = format_number(from_si(value, canonical), digits)
    return f"{text} {canonical}" if canonical else text
