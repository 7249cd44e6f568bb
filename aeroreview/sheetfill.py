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
from aeroreview.rules.surface_agreement import compare
from aeroreview.sheet import is_placeholder
from aeroreview.units import UnitProblem, to_si


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


def disagreement(key: str, raw, measured: float) -> str | None:
    """"sheet X, surface Y" when the sheet's value ``raw`` differs from the measurement beyond the
    tolerance of the data-quality rule (:mod:`aeroreview.rules.surface_agreement`, the one declaration)."""
    value = raw.get("value") if isinstance(raw, dict) else raw
    try:
        sheet = to_si(value, catalogue.feature(key).unit)
    except (UnitProblem, TypeError):
        return None
    found = compare(key, sheet, measured)
    return None if found.agrees else found.numbers()
