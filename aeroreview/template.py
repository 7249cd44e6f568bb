"""Write a new, commented feature sheet for a vehicle revision.

The template is itself a valid sheet: required features carry example values for the
chosen class, each marked ``REPLACE``; every optional feature is present as a comment
with its unit, typical range and how to measure it, so the reviewer uncomments and fills.
"""

from __future__ import annotations

import datetime as _dt
from pathlib import Path

from aeroreview import catalogue
from aeroreview.problems import UsageError
from aeroreview.sheet import SLUG

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
    return {"vehicle.class": vehicle_class, "dimensions.length": f"{length} m", "dimensions.width": f"{width} m",
            "dimensions.height": f"{height} m", "mass.curb": f"{mass} kg", "powertrain.kind": "electric"}


def _comment(item: catalogue.Feature) -> str:
    typical = f"; typical {item.typical_text()}" if item.typical else ""
    return f"{item.unit_label()}{typical}. {item.how_to_measure}"


def render(vehicle_id: str, vehicle_class: str, revision: str = "r1", today: _dt.date | None = None) -> str:
    """The text of a new sheet."""
    examples = _examples(vehicle_class)
    today = today or _dt.date.today()
    lines = [
        f"# aeroreview feature sheet for {vehicle_id}, revision {revision}.",
        "# Values: a number in the unit shown, a string with a unit (\"27 deg\", \"180 mm\"),",
        "# or {value: ..., source: ..., note: ...} to record where a number came from.",
        "# Lines marked REPLACE hold example values: put in your vehicle's own.",
        "# Uncomment and fill the optional features you know; `aeroreview check` this file.",
        f"id: {vehicle_id}",
        f"revision: {revision}",
        f"name: {vehicle_id}  # REPLACE with the display name",
        f"reviewed: {today.isoformat()}",
        "reviewer: ''",
        "features:",
    ]
    for zone, items in catalogue.by_zone().items():
        lines.append(f"  # -- {catalogue.ZONES[zone]} " + "-" * max(4, 60 - len(catalogue.ZONES[zone])))
        for item in items:
            if item.required:
                lines.append(f"  {item.key}: {examples[item.key]}  # REPLACE example. {_comment(item)}")
            else:
                lines.append(f"  # {item.key}:   # {_comment(item)}")
    lines += [
        "results: []  # CFD, tunnel or road results: kind, label, speed, cd, cl_front, cl_rear, yaw_sweep",
        "waivers: []  # accepted findings: rule, reason, by, expires",
        "notes: ''",
        "attachments: []  # images: file (relative to this sheet), zone, caption",
    ]
    return "\n".join(lines) + "\n"


def write(path: Path, vehicle_id: str, vehicle_class: str, revision: str = "r1") -> None:
    """Write a new sheet to ``path``; never overwrite an existing file."""
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
