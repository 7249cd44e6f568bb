"""Where a merged feature value goes in a sheet, and which kept values disagree with a measurement.

A template's placeholders are not the user's values: a merge replaces them where they stand.
A feature the template wrote as a commented line (``# rear.backlight_angle:   # deg; ...``)
is filled on that line, keeping its comment; only a feature the sheet does not mention at all
is added at the end of ``features``. Works on the round-trip mapping of
:func:`aeroreview.sheetedit.edit_sheet`, so everything else in the file stays as it was.
"""

from __future__ import annotations

import re

from aeroreview import catalogue
from aeroreview.sheet import is_placeholder
from aeroreview.units import UnitProblem, format_quantity, to_si

# How far a sheet value may sit from its surface's measurement before the two disagree.
# Angles: a surface angle is read to about a degree (common practice). Lengths and areas:
# 3 % covers a drawing against a surface with trim, seals and mirrors in or out (common
# practice). Radii: circle fits over a short arc scatter by about a quarter (from memory).
ANGLE_TOLERANCE_DEG = 1.0
SIZE_TOLERANCE = 0.03
RADIUS_TOLERANCE = 0.25


def _commented_line(key: str) -> re.Pattern:
    return re.compile(rf"^[ \t]*#[ \t]*{re.escape(key)}:[ \t]*(#.*)?$")


def place(features, key: str, entry) -> str:
    """Put ``entry`` under ``key`` in ``features``: "placeholder", "commented line" or "appended"."""
    from ruamel.yaml.error import CommentMark
    from ruamel.yaml.tokens import CommentToken

    if key in features:
        features[key] = entry  # same position, same end-of-line comment
        return "placeholder"
    pattern = _commented_line(key)
    for previous, slots in list(features.ca.items.items()):
        token = slots[2] if len(slots) > 2 else None
        if token is None:
            continue
        lines = token.value.split("\n")
        found = next((i for i, line in enumerate(lines) if i > 0 and pattern.match(line)), None)
        if found is None:
            continue
        comment = pattern.match(lines[found]).group(1) or ""
        token.value = "\n".join(lines[:found]) + "\n"
        features.insert(list(features).index(previous) + 1, key, entry)
        after = CommentToken(comment + "\n" + "\n".join(lines[found + 1:]), CommentMark(2), None)
        features.ca.items[key] = [None, None, after, None]
        return "commented line"
    features[key] = entry
    return "appended"


def is_unfilled(features, key: str) -> bool:
    """Is the sheet's value for ``key`` absent or a template placeholder?"""
    return key not in features or is_placeholder(features[key])


def tolerance(key: str, measured: float) -> float:
    """The disagreement a feature's sheet value may have with its measurement, in SI units."""
    item = catalogue.feature(key)
    if item.unit == "deg":
        return to_si(ANGLE_TOLERANCE_DEG, "deg")
    return abs(measured) * (RADIUS_TOLERANCE if key.endswith("_radius") else SIZE_TOLERANCE)


def disagreement(key: str, raw, measured: float) -> str | None:
    """"sheet X, surface Y" when the sheet's value ``raw`` differs from the measurement beyond its tolerance."""
    item = catalogue.feature(key)
    value = raw.get("value") if isinstance(raw, dict) else raw
    try:
        sheet = to_si(value, item.unit)
    except (UnitProblem, TypeError):
        return None
    if abs(sheet - measured) <= tolerance(key, measured):
        return None
    return f"sheet {format_quantity(sheet, item.unit)}, surface {format_quantity(measured, item.unit)}"
