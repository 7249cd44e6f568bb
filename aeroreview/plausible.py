"""Warnings for measurements that make no sense for a road vehicle, usually a surface read the
wrong way round (``--nose``, ``--up``) or a ground plane guessed from the lowest point.

Measured values are held against the catalogue's typical ranges (the same ranges, and their
sources, that sheet validation uses), radii against the size of the body, line fits against
their own residuals, and a ground clearance found with the ground at the lowest point against
the catalogue's typical clearance.
"""

from __future__ import annotations

import re

from aeroreview import catalogue
from aeroreview.units import format_quantity, from_si

# A panel line whose rms residual exceeds 1 % of the length it was fitted over is not a
# straight panel: the fit found a corner or the wrong end (our convention).
RESIDUAL_SHARE = 0.01
_RESIDUAL = re.compile(r"rms residual ([0-9.]+) mm")


def warnings_for(measurements, length: float | None, ground_given: bool) -> list[str]:
    """One ``warning: ...`` line per implausible measurement."""
    out = []
    hint = "check --nose and --up"
    for m in measurements:
        item = catalogue.BY_KEY.get(m.key)
        if not m.measured or item is None or item.kind != "quantity":
            continue
        shown = format_quantity(m.value, item.unit)
        if m.key == "dimensions.ground_clearance" and not ground_given and item.typical and \
                from_si(m.value, item.unit) < item.typical[0]:
            out.append(f"warning: ground clearance {shown} with the ground plane at the surface's lowest point "
                       f"(typical {item.typical_text()}: {item.typical_source}); the wheels are probably not in the "
                       "surface: give --ground with the ground plane height in file units")
            continue
        if m.key.endswith("_radius") and length and m.value > length:
            out.append(f"warning: {m.key} = {shown} is larger than the body ({format_quantity(length, 'm')} long): "
                       f"the fit is implausible; {hint}")
        elif item.typical and not item.typical[0] <= from_si(m.value, item.unit) <= item.typical[1]:
            check = "check --ground" if m.key == "dimensions.ground_clearance" else hint
            out.append(f"warning: {m.key} = {shown} is outside the typical range {item.typical_text()} "
                       f"({item.typical_source}); {check}")
        residual = _RESIDUAL.search(m.method)
        if residual and m.span and float(residual[1]) / 1000 > RESIDUAL_SHARE * (m.span[1] - m.span[0]):
            out.append(f"warning: {m.key}: the fit's rms residual of {residual[1]} mm is over "
                       f"{RESIDUAL_SHARE:.0%} of the {(m.span[1] - m.span[0]) * 1000:.0f} mm it spans: not one "
                       f"straight panel; {hint}")
    return out
