"""JSON Schema (draft 2020-12) of a feature sheet, generated from the catalogue.

Editors with YAML language support validate sheets against it as they are typed. The
schema checks shape, names and choices; units and physical bounds on strings with a unit
need pint, so ``aeroreview check`` remains the authority.
"""

from __future__ import annotations

from aeroreview import catalogue, sheet
from aeroreview.catalogue import Feature

DRAFT = "https://json-schema.org/draft/2020-12/schema"
QUANTITY_TEXT = r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*\S*.*$"


def _number_or_text(unit: str, bounds=None) -> dict:
    number: dict = {"type": "number"}
    if bounds:
        number.update(minimum=bounds[0], maximum=bounds[1])
    return {"oneOf": [number, {"type": "string", "pattern": QUANTITY_TEXT}],
            "description": f"a number in {unit or 'plain units'}, or a string with a unit"}


def _feature_value(item: Feature) -> dict:
    if item.kind == "flag":
        return {"type": "boolean"}
    if item.kind == "choice":
        return {"type": "string", "enum": list(item.choices)}
    return _number_or_text(item.unit, item.bounds)


def _feature(item: Feature) -> dict:
    plain = _feature_value(item)
    described = {"type": "object", "additionalProperties": False, "required": ["value"],
                 "properties": {"value": plain, "source": {"type": "string"}, "note": {"type": "string"}}}
    text = f"{item.description} Unit: {item.unit_label()}."
    if item.typical:
        text += f" Typical: {item.typical_text()} ({item.typical_source})."
    return {"description": text + f" Measure: {item.how_to_measure}", "anyOf": [plain, described]}


def _date() -> dict:
    return {"type": "string", "format": "date"}


def sheet_schema() -> dict:
    """The JSON Schema of a sheet, as a dict."""
    slug = {"type": "string", "pattern": sheet.SLUG.pattern}
    coefficient = {"type": "number", "minimum": -3, "maximum": 3}
    yaw_point = {"type": "object", "additionalProperties": False, "required": ["yaw", "cd"],
                 "properties": {"yaw": _number_or_text("deg", (-90, 90)), "cd": {"type": "number"},
                                "cl_front": coefficient, "cl_rear": coefficient}}
    result = {
        "type": "object", "additionalProperties": False, "required": ["kind", "cd"],
        "properties": {
            "kind": {"enum": list(sheet.RESULT_KINDS)}, "label": {"type": "string"},
            "speed": _number_or_text("km/h"), "cd": {"type": "number", "minimum": 0.05, "maximum": 2.0},
            "cl_front": coefficient, "cl_rear": coefficient, "scale": {"type": "number", "exclusiveMinimum": 0, "maximum": 1},
            "reference_area": _number_or_text("m^2"), "yaw_sweep": {"type": "array", "items": yaw_point},
            "date": _date(), "source": {"type": "string"},
        },
    }
    waiver = {"type": "object", "additionalProperties": False, "required": ["rule", "reason"],
              "properties": {"rule": {"type": "string", "pattern": sheet.RULE_ID.pattern},
                             "reason": {"type": "string", "minLength": 1}, "by": {"type": "string"},
                             "expires": _date()}}
    attachment = {"type": "object", "additionalProperties": False, "required": ["file", "zone"],
                  "properties": {"file": {"type": "string", "pattern": r"^(?!/)(?!.*\.\.)[^\\:]+$"},
                                 "zone": {"enum": list(catalogue.ALL_ZONES)}, "caption": {"type": "string"}}}
    required = [f.key for f in catalogue.FEATURES if f.required]
    return {
        "$schema": DRAFT,
        "$id": "https://aeroreview.invalid/schema/sheet.json",
        "title": "aeroreview feature sheet",
        "description": "One vehicle revision: identity, features with units, results, waivers, notes, attachments.",
        "type": "object",
        "additionalProperties": False,
        "required": ["id", "revision", "features"],
        "properties": {
            "id": slug, "revision": slug, "parent": slug,
            "name": {"type": "string", "maxLength": 120}, "reviewed": _date(), "reviewer": {"type": "string"},
            "features": {"type": "object", "additionalProperties": False, "required": required,
                         "properties": {f.key: _feature(f) for f in catalogue.FEATURES}},
            "results": {"type": "array", "items": result},
            "waivers": {"type": "array", "items": waiver},
            "notes": {"anyOf": [{"type": "string"}, {"type": "array", "items": {"type": "string"}}]},
            "attachments": {"type": "array", "items": attachment},
            "geometry": {"anyOf": [{"type": "string"}, {
                "type": "object", "additionalProperties": False, "required": ["file"],
                "properties": {"file": {"type": "string"}, "units": {"enum": ["mm", "m"]}, "nose": {"enum": ["-x", "+x"]},
                               "up": {"enum": ["+z", "+y"]}, "ground": {"type": "number"}}}]},
        },
    }
