"""The body's own scales: the lengths and classes that edge radii and shares are judged against."""

from __future__ import annotations

import math

from aeroreview.display import MM, PERCENT, Reading

FRONTAL_AREA_FACTOR = 0.84  # A / (width x height) of a passenger car, about 0.81-0.87 (from memory, Hucho 1998,
# chapter not checked)
BOX_CLASSES = ("van", "suv", "pickup", "crossover")  # upright fronts and square backs (common practice)


def body_scale(sheet) -> float | None:
    """sqrt(frontal area) [m], the length that edge radii are compared with.

    Falls back on 0.84 x width x height when the frontal area is not given.
    """
    area = sheet.get("dimensions.frontal_area")
    if area is None and sheet.has("dimensions.width", "dimensions.height"):
        area = FRONTAL_AREA_FACTOR * sheet.get("dimensions.width") * sheet.get("dimensions.height")
    return math.sqrt(area) if area else None


def front_face_height(sheet) -> float | None:
    """Height [m] of the front face a low car nose turns the flow over: hood edge height minus air-dam clearance.

    None for upright (box) classes, which are judged against sqrt(A), or when the hood edge height is not given.
    """
    if sheet.get("vehicle.class") in BOX_CLASSES or sheet.get("front.hood_edge_height") is None:
        return None
    return sheet.get("front.hood_edge_height") - (sheet.get("front.air_dam_clearance") or 0.0)


def dimension_share(sheet, key: str, dimension: str, **limits) -> tuple[Reading, str]:
    """A length ``key`` as a share of a body ``dimension`` (a :class:`Reading` with ``limits``), and the
    finding's measured text: "5.2 % of the length (259 mm)"."""
    value = sheet.get(key)
    share = Reading(value / sheet.get(dimension), PERCENT, **limits)
    return share, f"{PERCENT(share.value, share.digits)} of the {dimension.split('.', 1)[1]} ({MM(value)})"
