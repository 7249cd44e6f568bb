"""The JSON Schema and the checker agree, because both are built from the same declarations.

The same mutated sheets go through ``aeroreview check``'s validator and through the
published JSON Schema (checked with the ``jsonschema`` package, the reference
implementation of draft 2020-12, with its format checker so dates are checked too):
the schema never rejects a sheet the checker accepts, and it rejects every mutation it
can express (a plain number outside its bounds, text over its limit, a word outside its
choices, text that breaks its pattern, a missing required key, an unknown key).
The mutations are generated from the declarations, so a field added later is covered.
"""

from __future__ import annotations

import copy
import datetime
import json

import jsonschema
import pytest
import yaml

from aeroreview import catalogue, sections, yamldoc
from aeroreview.problems import InputError
from aeroreview.schema import sheet_schema
from aeroreview.sheet import from_document
from conftest import VEHICLES

FOLDER = VEHICLES / "tessel"
VALIDATOR = jsonschema.Draft202012Validator(sheet_schema(), format_checker=jsonschema.FormatChecker())


def _base() -> dict:
    """The Tessel r2 sheet (results with a yaw sweep, a surface) plus a waiver and an attachment."""
    data = yaml.safe_load((FOLDER / "r2.yaml").read_text(encoding="utf-8"))
    data["waivers"] = [{"rule": "rear.backlight-angle", "reason": "accepted for the show car", "by": "A. Reviewer",
                        "expires": datetime.date(2030, 1, 1)}]
    data["attachments"] = [{"file": "img/r1-roof-end.png", "zone": "rear", "caption": "roof end"}]
    return data


BASE = _base()
# Where each section's first mapping sits in the base sheet.
HOLDERS = {"sheet": (), "results": ("results", 0), "yaw_sweep": ("results", 0, "yaw_sweep", 0),
           "waivers": ("waivers", 0), "attachments": ("attachments", 0), "geometry": ("geometry",),
           "convergence": ("results", 1, "convergence", 0)}
SECTIONS = (sections.TOP_LEVEL, sections.RESULT, sections.YAW_POINT, sections.WAIVER, sections.ATTACHMENT,
            sections.GEOMETRY, sections.CONVERGENCE)


def checker_accepts(data: dict) -> bool:
    text = yaml.safe_dump(data, sort_keys=False, allow_unicode=True)
    try:
        from_document(yamldoc.parse(text, "mutated.yaml"), FOLDER)
    except InputError:
        return False
    return True


def schema_accepts(data: dict) -> bool:
    """As an editor sees the YAML: dates as strings."""
    return VALIDATOR.is_valid(json.loads(json.dumps(data, default=str)))


def _inside(number: float, bounds) -> float:
    return min(max(number, bounds[0]), bounds[1])


def field_mutations(item: sections.Field):
    """(label, new value or DELETE, whether the schema can express the problem) for one field."""
    if item.kind == "number":
        if item.bounds:
            low, high = item.bounds
            span = high - low
            yield "at the low bound", low, False
            yield "at the high bound", high, False
            yield "below the low bound", low - 0.01 * span, True
            yield "above the high bound", high + 0.01 * span, True
        yield "as text with its unit", f"{_inside(1.0, item.bounds or (1, 1)):g} {item.unit}".strip(), False
        yield "as a list", [1], True
    elif item.kind == "flag":
        yield "as true", True, False
        yield "as false", False, False
        yield "as a word", "yes please", True
        yield "as a number", 1, True
    elif item.kind == "date":
        yield "as a quoted ISO date", "2026-10-30", False
        yield "as a date", datetime.date(2026, 10, 30), False
        yield "as another date format", "30.10.2026", True
        yield "as an impossible ISO date", "2026-02-30", True
    elif item.kind in ("text", "file"):
        for choice in item.choices:
            yield f"as the choice {choice}", choice, False
        if item.choices:
            yield "as a word outside the choices", "bogus", True
        if item.pattern == sections.SLUG:
            yield "as a slug", "r-9", False
            yield "with capitals and a space", "Bad Slug", True
        if item.pattern == sections.RULE_ID:
            yield "without a zone", "backlight", True
        if not item.choices and not item.pattern:
            yield "at its length limit", "x" * item.limit, False
        yield "over its length limit", "x" * (item.limit + 1), True
        yield "as a mapping", {"a": 1}, True
    if item.required:
        yield "missing", DELETE, True
    else:
        yield "empty (null)", None, False


DELETE = object()


def mutations():
    for section in SECTIONS:
        holder = HOLDERS[section.name]
        for item in section.fields:
            if item.kind in ("raw", "list"):
                continue
            for label, value, expressible in field_mutations(item):
                yield f"{section.name}.{item.name} {label}", holder, item.name, value, expressible
        yield f"{section.name} with an unknown key", holder, "bogus_key", 1, True
    yield "geometry.ground at its bound", ("geometry",), "ground", -sections.MAX_GROUND, False
    yield "geometry.ground beyond its bound", ("geometry",), "ground", 2 * sections.MAX_GROUND, True
    for feature in catalogue.FEATURES:
        holder = ("features",)
        if feature.kind == "quantity":
            low, high = feature.bounds
            yield f"{feature.key} at the low bound", holder, feature.key, low, False
            yield f"{feature.key} above the high bound", holder, feature.key, high + 0.01 * (high - low), True
        elif feature.kind == "choice":
            yield f"{feature.key} outside the choices", holder, feature.key, "bogus", True
        else:
            yield f"{feature.key} as a word", holder, feature.key, "yes please", True


def mutate(holder, key, value) -> dict:
    data = copy.deepcopy(BASE)
    target = data
    for step in holder:
        target = target[step]
    if value is DELETE:
        target.pop(key, None)
    else:
        target[key] = value
    return data


MUTATIONS = list(mutations())


def test_the_base_sheet_passes_both():
    assert checker_accepts(BASE) and schema_accepts(BASE)


@pytest.mark.parametrize("label, holder, key, value, expressible", MUTATIONS, ids=[m[0] for m in MUTATIONS])
def test_schema_and_checker_agree(label, holder, key, value, expressible):
    data = mutate(holder, key, value)
    checker, schema = checker_accepts(data), schema_accepts(data)
    if checker:
        assert schema, f"{label}: the checker accepts it, the schema rejects it"
    if expressible:
        assert not checker, f"{label}: the checker accepts it"
        assert not schema, f"{label}: the schema can express this problem but accepts it"


@pytest.mark.parametrize("holder, key, value", [
    (("results", 0), "speed", 700), (("results", 0), "scale", 0.005),
    (("results", 0, "yaw_sweep", 0), "cd", 5.0), (("results", 0), "reference_area", 40)])
def test_schema_rejects_the_result_bounds_it_used_to_restate(holder, key, value):
    """Bug 4: the hand-written schema accepted these, which ``check`` rejects."""
    data = mutate(holder, key, value)
    assert not checker_accepts(data)
    assert not schema_accepts(data)


def test_a_result_keeps_its_date_and_source():
    data = mutate(("results", 0), "source", "run 42 of the invented study")
    text = yaml.safe_dump(data, sort_keys=False)
    result = from_document(yamldoc.parse(text, "s.yaml"), FOLDER).results[0]
    assert result.date == datetime.date(2026, 11, 10) and result.source == "run 42 of the invented study"


def test_quoted_iso_dates_are_dates():
    data = mutate((), "reviewed", "2026-10-30")
    sheet = from_document(yamldoc.parse(yaml.safe_dump(data, sort_keys=False), "s.yaml"), FOLDER)
    assert sheet.reviewed == datetime.date(2026, 10, 30)
