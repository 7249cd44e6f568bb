"""JSON Schema (draft 2020-12) of a feature sheet, generated from the declarations.

Editors with YAML language support validate sheets against it as they are typed. Features
come from the catalogue, every other key from :mod:`aeroreview.sections`, the same tables
the checker reads, so the schema never rejects what ``aeroreview check`` accepts, and it
rejects every bound, choice, pattern and length it can express. Units and bounds on
strings with a unit need pint, and file names need the disk, so ``aeroreview check``
remains the authority.
"""

from __future__ import annotations

from aeroreview import catalogue, sections
from aeroreview.catalogue import Feature
from aeroreview.sections import Field, Section

DRAFT = "https://json-schema.org/draft/2020-12/schema"
QUANTITY_TEXT = r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*\S*.*$"
NULL = {"type": "null"}  # the checker reads an empty value as an absent one


def _number_or_text(unit: str, bounds=None, integer=False) -> dict:
    number: dict = {"type": "integer" if integer else "number"}
    if bounds:
        number.update(minimum=bounds[0], maximum=bounds[1])
    return {"oneOf": [number, {"type": "string", "pattern": QUANTITY_TEXT}],
            "description": f"a number in {unit or 'plain units'}, or a string with a unit"}


def _text(item: Field) -> dict:
    """Text, or (unless it is a choice) a number, which the checker reads as its text."""
    text: dict = {"type": "string", "maxLength": item.limit}
    if item.choices:
        return {**text, "enum": list(item.choices)}
    if item.pattern:
        text["pattern"] = item.pattern
    if item.required:
        text["minLength"] = 1
    return {"anyOf": [text, {"type": "number"}]}


def field_schema(item: Field) -> dict:
    if item.kind == "number":
        plain = _number_or_text(item.unit, item.bounds)
    elif item.kind == "date":
        plain = {"type": "string", "format": "date"}
    elif item.kind == "list":
        plain = {"type": "array", "items": {"anyOf": [section_schema(item.items), NULL]}}
    elif item.kind == "raw":
        plain = item.raw_schema or {}
    elif item.kind == "flag":
        plain = {"type": "boolean"}
    else:
        plain = _text(item)
    return plain if item.required or not plain else {"anyOf": [plain, NULL]}


def section_schema(section: Section) -> dict:
    out = {"type": "object", "additionalProperties": False,
           "properties": {item.name: field_schema(item) for item in section.fields if item.kind != "raw"
                          or item.raw_schema}}
    required = [item.name for item in section.fields if item.required]
    return {**out, "required": required} if required else out


def _feature_value(item: Feature) -> dict:
    if item.kind == "flag":
        return {"type": "boolean"}
    if item.kind == "choice":
        return {"type": "string", "enum": list(item.choices)}
    return _number_or_text(item.unit, item.bounds, item.integer)


def _feature(item: Feature) -> dict:
    plain = _feature_value(item)
    described = section_schema(sections.FEATURE_VALUE)
    described = {**described, "required": ["value"], "properties": {**described["properties"], "value": plain}}
    text = f"{item.description} Unit: {item.unit_label()}."
    if item.typical:
        text += f" Typical: {item.typical_text()} ({item.typical_source})."
    return {"description": text + f" Measure: {item.how_to_measure}", "anyOf": [plain, described]}


def sheet_schema() -> dict:
    """The JSON Schema of a sheet, as a dict."""
    top = section_schema(sections.TOP_LEVEL)
    required = [f.key for f in catalogue.FEATURES if f.required]
    top["properties"].update(
        features={"type": "object", "additionalProperties": False, "required": required,
                  "properties": {f.key: _feature(f) for f in catalogue.FEATURES}},
        geometry={"anyOf": [_text(sections.GEOMETRY.fields[0])["anyOf"][0], section_schema(sections.GEOMETRY), NULL]})
    return {
        "$schema": DRAFT,
        "$id": "https://aeroreview.invalid/schema/sheet.json",
        "title": "aeroreview feature sheet",
        "description": "One vehicle revision: identity, features with units, results, waivers, notes, attachments.",
        **top, "required": [*top["required"], "features"],
    }
