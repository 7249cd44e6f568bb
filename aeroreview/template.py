"""Write a new, commented feature sheet for a vehicle revision.

Required features carry example values for the chosen class written as placeholders
(``<e.g. 4.8 m>``): `aeroreview check` refuses the sheet until each one is replaced, so an
unfilled template never passes the gate. Every optional feature is present as a comment
with its unit, typical range, how to measure it and its sign convention, so the reviewer
uncomments and fills.
"""

from __future__ import annotations

import datetime as _dt
from pathlib import Path

from aeroreview import catalogue
from aeroreview.problems import UsageError
from aeroreview.sheet import SLUG, is_placeholder

# Example dimensions per class (length m, width m, height m, curb mass kg): round numbers
# typical of current production bodies, common practice; only placeholders to replace.
CLASS_EXAMPLES = {
    "sedan": (4.8, 1.85, 1.45, 1800),
    "fastback": (4.7, 1.85, 1.40, 1750),
    "hatchback": (4.2, 1.78, 1.46, 1400),
    "estate": (4.8, 1.85, 1.50, 1850),
    "suv": (4.7, 1.90, 1.70, 2200),
    "crossover": (4.5, 1.85, 1.60, 1800),
    "pickup": (5.4, 2.00, 1.85, 2400),
    "van": (5.0, 2.00, 1.95, 2300),
    "sports": (4.4, 1.90, 1.25, 1500),
}


def _examples(vehicle_class: str) -> dict[str, object]:
    length, width, height, mass = CLASS_EXAMPLES[vehicle_class]
    return {"dimensions.length": f"<e.g. {length} m>", "dimensions.width": f"<e.g. {width} m>",
            "dimensions.height": f"<e.g. {height} m>", "mass.curb": f"<e.g. {mass} kg>",
            "powertrain.kind": "<one of electric, combustion, hybrid>", "vehicle.class": vehicle_class}


def _comment(item: catalogue.Feature) -> str:
    typical = f"; typical {item.typical_text()}" if item.typical else ""
    sign = f" Sign: {item.sign}." if item.sign else ""
    return f"{item.unit_label()}{typical}. {item.how_to_measure}{sign}"


def render(vehicle_id: str, vehicle_class: str, revision: str = "r1", today: _dt.date | None = None) -> str:
    """The text of a new sheet."""
    examples = _examples(vehicle_class)
    today = today or _dt.date.today()
    lines = [
        f"# aeroreview feature sheet for {vehicle_id}, revision {revision}.",
        "# Values: a number in the unit shown, a string with a unit (\"27 deg\", \"180 mm\"),",
        "# or {value: ..., source: ..., note: ...} to record where a number came from.",
        "# Values in angle brackets (<e.g. 4.8 m>) are placeholders: `aeroreview check` refuses",
        "# the sheet until each one holds your vehicle's own value.",
        "# Conventions: x from the nose rearward, z up from the ground, y lateral; side-view angles",
        "# from the horizontal; lift positive upward (downforce is negative lift).",
        "# Uncomment and fill the optional features you know; `aeroreview check` this file.",
        f"id: {vehicle_id}",
        f"revision: {revision}",
        "name: <display name>",
        f"reviewed: {today.isoformat()}",
        "reviewer: <your name>",
        "features:",
    ]
    for zone, items in catalogue.by_zone().items():
        lines.append(f"  # -- {catalogue.ZONES[zone]} " + "-" * max(4, 60 - len(catalogue.ZONES[zone])))
        for item in items:
            if item.required:
                lines.append(f"  {item.key}: {examples[item.key]}  # {_comment(item)}")
            else:
                lines.append(f"  # {item.key}:   # {_comment(item)}")
    lines += [
        "results: []  # CFD, tunnel or road results: kind, label, speed, cd, cl_front, cl_rear (lift positive "
        "upward), cs, cym, cpm (side force, yawing and pitching moment as SAE J1594: on the frontal area, moments "
        "also on the wheelbase, about mid-wheelbase on the ground; cpm positive nose-up, our convention; cs and cym "
        "keep one sign convention per sweep, the rules fold them with the sign of yaw), yaw_sweep (yaw positive "
        "either side; one side is mirrored; each point: yaw, cd and any of cl_front, cl_rear, cs, cym, cpm)",
        "waivers: []  # accepted findings: rule, reason, by, expires",
        "notes: ''",
        "attachments: []  # images: file (relative to this sheet), zone, caption",
    ]
    return "\n".join(lines) + "\n"


def placeholder_count(text: str) -> int:
    """How many values of a sheet's text are still placeholders (comment lines left out)."""
    values = (line.split("#", 1)[0].partition(":")[2] for line in text.splitlines())
    return sum(is_placeholder(value) for value in values)


def write(path: Path, vehicle_id: str, vehicle_class: str, revision: str = "r1") -> int:
    """Write a new sheet to ``path`` (never over an existing file); the number of placeholders in it."""
    if not SLUG.match(vehicle_id):
        raise UsageError(f"'{vehicle_id}' is not a safe vehicle id; use lowercase letters, digits and inner hyphens")
    if not SLUG.match(revision):
        raise UsageError(f"'{revision}' is not a safe revision name; use lowercase letters, digits and inner hyphens")
    if vehicle_class not in CLASS_EXAMPLES:
        raise UsageError(f"unknown class '{vehicle_class}'; choose one of {', '.join(CLASS_EXAMPLES)}")
    text = render(vehicle_id, vehicle_class, revision)
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        with path.open("x", encoding="utf-8") as handle:  # "x" refuses an existing file atomically
            handle.write(text)
    except FileExistsError:
        raise UsageError(f"{path} already exists; not overwriting it (choose another --output)") from None
    except OSError as error:
        raise UsageError(f"cannot write {path}: {error.strerror}") from None
    return placeholder_count(text)
