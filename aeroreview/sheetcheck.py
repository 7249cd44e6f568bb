"""The sheet checker: walks one parsed sheet, collecting every problem, reading each value.

Typed readers (text, number, date, lists of mappings) follow the declarations of
:mod:`aeroreview.sections` and the catalogue; :func:`aeroreview.sheet.check_document`
drives it section by section and builds the :class:`~aeroreview.sheet.Sheet`.
"""

from __future__ import annotations

import datetime as _dt
import re
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from aeroreview import catalogue, sections, yamldoc
from aeroreview.catalogue import Feature
from aeroreview.names import suggest
from aeroreview.paths import PathProblem, contained_file
from aeroreview.problems import Problem, echo
from aeroreview.rules import RULES_HINT, all_rules
from aeroreview.sections import (MAX_GROUND, MAX_TEXT, RESULT_KINDS, Attachment, Field, Geometry, Result, Section,
                                 Waiver, YawPoint)
from aeroreview.units import UnitProblem, format_quantity, from_si, to_si

if TYPE_CHECKING:
    from aeroreview.sheet import Sheet

IMAGE_SUFFIXES = (".png", ".jpg", ".jpeg", ".webp", ".gif")  # raster only: an SVG can carry script
# The first bytes of each raster format (its specification's signature), so a script-bearing
# SVG or HTML file renamed .png is refused too.
IMAGE_SIGNATURES = (b"\x89PNG\r\n\x1a\n", b"\xff\xd8\xff", b"GIF87a", b"GIF89a", b"RIFF")
SURFACE_SUFFIXES = (".stl", ".obj", ".ply", ".csv")
RESULT_SUFFIXES = (".dat", ".csv", ".txt", ".tsv", ".out", ".vtu", ".vtk", ".ply", ".msh", ".xdmf")  # results files
ISO_DATE = re.compile(r"^\d{4}-\d{2}-\d{2}$")  # a quoted date, as JSON and editors write it
# A value still to be filled in: the template writes ``<e.g. 4.8 m>``, so no unfilled
# template passes for a real sheet. Angle brackets never start a unit or a name.
PLACEHOLDER = re.compile(r"^<[^<>\n]{0,200}>$")


def is_placeholder(value) -> bool:
    """Is ``value`` a template placeholder (``<...>``) rather than a reviewer's value?"""
    return isinstance(value, str) and PLACEHOLDER.match(value.strip()) is not None


@dataclass(frozen=True)
class Value:
    """One feature value: SI float (quantities), word (choices) or bool (flags), with provenance."""

    value: float | str | bool
    source: str = ""
    note: str = ""

    def display(self, item: Feature) -> str:
        if item.kind == "quantity":
            return format_quantity(float(self.value), item.unit)
        return str(self.value).lower() if isinstance(self.value, bool) else str(self.value)


class Checker:
    """Walks one parsed document, collecting problems and building a :class:`Sheet`."""

    def __init__(self, doc: yamldoc.Document, folder: Path, allow_placeholders: bool = False):
        self.doc = doc
        self.folder = folder
        self.allow_placeholders = allow_placeholders
        self.problems: list[Problem] = []
        self.warnings: list[Problem] = []

    def error(self, path, message, hint="", key=False):
        self.problems.append(self.doc.problem(path, message, hint, key=key))

    def placeholder_left(self, path, key, value) -> bool:
        """Report a template placeholder still in place (True when ``value`` is one)."""
        if not is_placeholder(value):
            return False
        if not self.allow_placeholders:
            self.error(path, f"'{key}' still holds the template placeholder {echo(value)}",
                       "write the real value in its place (the placeholder only shows the form)")
        return True

    def warn(self, path, message, hint=""):
        self.warnings.append(self.doc.problem(path, message, hint, level="warning"))

    # -- small typed readers -------------------------------------------------------
    def text(self, data: dict, key: str, path=(), required=False, limit=MAX_TEXT) -> str:
        value = data.get(key)
        if value is None:
            if required:
                self.error(path, f"'{key}' is missing", f"add `{key}: ...`")
            return ""
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            value = str(value)
        if self.placeholder_left(path + (key,), key, value):
            return ""
        if not isinstance(value, str):
            self.error(path + (key,), f"'{key}' must be text, got {type(value).__name__}", "write it as a quoted string")
            return ""
        if len(value) > limit:
            self.error(path + (key,), f"'{key}' is {len(value):,} characters, over the limit of {limit:,}",
                       "shorten it or attach a document")
            return ""
        return value

    def date(self, data: dict, key: str, path=()) -> _dt.date | None:
        value = data.get(key)
        if value is None:
            return None
        if isinstance(value, _dt.datetime):
            return value.date()
        if isinstance(value, _dt.date):
            return value
        if isinstance(value, str) and ISO_DATE.match(value):
            try:
                return _dt.date.fromisoformat(value)
            except ValueError:
                pass
        self.error(path + (key,), f"'{key}' must be a date, got '{echo(value)}'", "write it as YYYY-MM-DD")
        return None

    def flag(self, data: dict, key: str, path=()) -> bool | None:
        value = data.get(key)
        if value is None or isinstance(value, bool):
            return value
        self.error(path + (key,), f"'{key}' must be true or false, got '{echo(value)}'", "write true or false")
        return None

    def mapping(self, data, path, name) -> dict:
        if data is None:
            return {}
        if not isinstance(data, dict):
            self.error(path, f"'{name}' must be a mapping, got {type(data).__name__}", "write `key: value` lines under it")
            return {}
        return data

    def sequence(self, data, path, name) -> list:
        if data is None:
            return []
        if not isinstance(data, list):
            self.error(path, f"'{name}' must be a list, got {type(data).__name__}", "start each item with '- '")
            return []
        return data

    def items(self, data, path, name):
        """(path, mapping) of each non-empty mapping in the list ``data``."""
        for i, raw in enumerate(self.sequence(data, path, name)):
            raw = self.mapping(raw, path + (i,), f"{name}[{i}]")
            if raw:
                yield path + (i,), raw

    def fields(self, section: Section, raw: dict, path) -> dict:
        """Every declared field of one mapping of ``section``, read and checked; unknown keys reported."""
        self.unknown_keys(raw, section.names, path)
        return {item.name: self.field(item, raw, path) for item in section.fields}

    def field(self, item: Field, data: dict, path):
        """One field by its declaration; None (or "" for text) when absent or wrong, the problem recorded."""
        if item.kind == "number":
            return self.number(data, item.name, item.unit, path, item.required, item.bounds)
        if item.kind == "date":
            return self.date(data, item.name, path)
        if item.kind == "list":
            where = path + (item.name,)
            return [self.fields(item.items, raw, at) for at, raw in self.items(data.get(item.name), where, item.name)]
        if item.kind == "raw":
            return data.get(item.name)
        if item.kind == "flag":
            return self.flag(data, item.name, path)
        raw = data.get(item.name)
        value = self.text(data, item.name, path, item.required, item.limit)
        if raw is None or (value == "" and raw != ""):
            return value  # absent, or already reported
        where = path + (item.name,)
        if item.required and not value:
            self.error(where, f"'{item.name}' is empty", f"write the {item.name}, or remove the entry")
        elif item.kind == "file":
            return value  # its path rules are safe_file's
        elif item.choices and value not in item.choices:
            self.error(where, f"'{item.name}' must be one of {', '.join(item.choices)}, got '{echo(value)}'",
                       suggest(value, item.choices))
            return ""
        if item.pattern and not re.search(item.pattern, value):
            self.error(where, f"'{item.name}' must be {item.pattern_what}, got '{echo(value)}'", item.pattern_hint)
            return ""
        return value

    def unknown_keys(self, data: dict, allowed, path):
        for key in data:
            if key not in allowed:
                self.error(path + (key,), f"unknown key '{key}'", suggest(str(key), allowed), key=True)

    def number(self, data: dict, key: str, unit: str, path, required=False, bounds=None) -> float | None:
        value = data.get(key)
        if value is None:
            if required:
                self.error(path, f"'{key}' is missing", f"add `{key}: ...` in {unit or 'plain units'}")
            return None
        try:
            si = to_si(value, unit)
        except UnitProblem as problem:
            self.error(path + (key,), f"'{key}': {problem}", problem.hint)
            return None
        if bounds and not bounds[0] <= from_si(si, unit) <= bounds[1]:
            self.error(path + (key,), f"'{key}' = {value} is outside {bounds[0]:g} to {bounds[1]:g} {unit}".rstrip(),
                       "check the number and its unit")
            return None
        return si

    # -- sections ------------------------------------------------------------------
    def features(self, data) -> tuple[dict[str, Value], dict[str, int]]:
        data = self.mapping(data, ("features",), "features")
        values: dict[str, Value] = {}
        lines: dict[str, int] = {}
        for key, raw in data.items():
            path = ("features", key)
            item = catalogue.BY_KEY.get(key)
            if item is None:
                self.error(path, f"unknown feature '{key}'", suggest(str(key), catalogue.BY_KEY), key=True)
                continue
            lines[key] = self.doc.where(path, key=True)[0]
            source = note = ""
            if isinstance(raw, dict):
                meta = self.fields(sections.FEATURE_VALUE, raw, path)
                source, note = meta["source"], meta["note"]
                if "value" not in raw:
                    self.error(path, f"'{key}' has no 'value'", "write `{value: ..., source: ...}`")
                    continue
                raw, path = raw["value"], path + ("value",)
            value = self.feature_value(item, raw, path)
            if value is not None:
                values[key] = Value(value, source, note)
        for item in catalogue.FEATURES:
            if item.required and item.key not in values and item.key not in data:
                self.error(("features",), f"required feature '{item.key}' is missing",
                           f"add `{item.key}: ...` ({item.unit_label()})")
        return values, lines

    def feature_value(self, item: Feature, raw, path):
        if raw is None:
            self.error(path, f"'{item.key}' has no value", f"write a value ({item.unit_label()}) or remove the line")
            return None
        if self.placeholder_left(path, item.key, raw):
            return None
        if item.kind == "flag":
            if not isinstance(raw, bool):
                self.error(path, f"'{item.key}' must be true or false, got '{echo(raw)}'", "write true or false")
                return None
            return raw
        if item.kind == "choice":
            if not isinstance(raw, str) or raw.lower() not in item.choices:
                self.error(path, f"'{item.key}' must be one of {', '.join(item.choices)}, got '{echo(raw)}'",
                           suggest(str(raw).lower(), item.choices))
                return None
            return raw.lower()
        try:
            si = to_si(raw, item.unit)
        except UnitProblem as problem:
            self.error(path, f"'{item.key}': {problem}", problem.hint)
            return None
        shown = from_si(si, item.unit)
        if item.integer and shown != int(shown):
            self.error(path, f"'{item.key}' must be a whole number, got {echo(raw)}", "write a count such as 2")
            return None
        low, high = item.bounds
        if not low <= shown <= high:
            self.error(path, f"'{item.key}' = {echo(raw)} is physically impossible (outside {low:g} to {high:g} {item.unit})".replace(" )", ")"),
                       "check the number and its unit")
            return None
        if item.typical and not item.typical[0] <= shown <= item.typical[1]:
            self.warn(path, f"'{item.key}' = {echo(raw)} is outside the typical range {item.typical_text()}",
                      f"check it; typical range: {item.typical_source}")
        return si

    def results(self, data) -> list[Result]:
        out = []
        marked = None
        for path, raw in self.items(data, ("results",), "results"):
            values = self.fields(sections.RESULT, raw, path)
            sweep = [YawPoint(**point) for point in values["yaw_sweep"]
                     if point["yaw"] is not None and point["cd"] is not None]
            files = tuple((f["file"], f["sha256"], f["role"]) for j, f in enumerate(values["files"])
                          if f["file"] and self.safe_file(f["file"], path + ("files", j, "file"), RESULT_SUFFIXES,
                                                          "result file"))
            if values["of_record"]:
                if marked is not None:
                    self.error(path + ("of_record",), f"results[{marked}] is already the result of record",
                               "mark one result of_record: true, and remove the mark from the others")
                marked = path[-1]
            if values["cd"] is not None and values["kind"] in RESULT_KINDS:
                out.append(Result(**{**values, "label": values["label"] or f"{values['kind']} {path[-1] + 1}",
                                     "scale": values["scale"] or 1.0, "files": files, "of_record": bool(values["of_record"]),
                                     "yaw_sweep": tuple(sorted(sweep, key=lambda p: p.yaw)),
                                     **self.convergence(values, path)}))
        return out

    def convergence(self, values: dict, path) -> dict:
        """A history's statistics, whole or not at all: rows counted in whole numbers, and the
        rows and settled window beside the coefficients (as ``results history --sheet`` writes them)."""
        rows = {}
        for key in ("history_rows", "settled_rows"):
            if values[key] is not None and values[key] != int(values[key]):
                self.error(path + (key,), f"'{key}' must be a whole number of rows, got {values[key]:g}",
                           "write it again with aeroreview results history --sheet")
            rows[key] = None if values[key] is None else int(values[key])
        stats = tuple((c["coefficient"], c["std_error"], c["drift"]) for c in values["convergence"]
                      if c["coefficient"] and None not in (c["std_error"], c["drift"]))
        missing = [key for key in ("history_rows", "settled_rows", "settled_from") if values[key] is None]
        if stats and missing:
            self.error(path + ("convergence",), f"a history's convergence statistics need {', '.join(missing)} too",
                       "write them again with aeroreview results history --sheet")
        if stats and not missing and rows["settled_rows"] > rows["history_rows"]:
            self.error(path + ("settled_rows",), "more settled rows than the history has",
                       "write them again with aeroreview results history --sheet")
        return {**rows, "convergence": stats}

    def waivers(self, data) -> list[Waiver]:
        out = []
        for path, raw in self.items(data, ("waivers",), "waivers"):
            values = self.fields(sections.WAIVER, raw, path)
            rule = values["rule"]
            if rule and rule not in all_rules():
                self.error(path + ("rule",), f"waiver for unknown rule '{rule}'", suggest(rule, all_rules(), RULES_HINT))
            elif rule and values["reason"]:
                out.append(Waiver(**values, line=self.doc.where(path)[0]))
        return out

    def attachments(self, data) -> list[Attachment]:
        out = []
        for path, raw in self.items(data, ("attachments",), "attachments"):
            values = self.fields(sections.ATTACHMENT, raw, path)
            if values["file"] and self.safe_file(values["file"], path + ("file",)):
                out.append(Attachment(**values, line=self.doc.where(path + ("file",))[0]))
        return out

    def geometry(self, data) -> Geometry | None:
        if data is None:
            return None
        if isinstance(data, str):
            data = {"file": data}
        data = self.mapping(data, ("geometry",), "geometry")
        if not data:
            return None
        path = ("geometry",)
        values = self.fields(sections.GEOMETRY, data, path)
        file = values["file"]
        ground = data.get("ground")
        if ground is not None and (isinstance(ground, bool) or not isinstance(ground, (int, float))
                                   or not abs(ground) <= MAX_GROUND):
            self.error(path + ("ground",), f"geometry ground must be a number in the file's units, within "
                       f"±{MAX_GROUND:g}", "e.g. ground: 0")
            ground = None
        if file and self.safe_file(file, path + ("file",), SURFACE_SUFFIXES, "surface"):
            return Geometry(file, values["units"] or None, values["nose"] or "-x", values["up"] or "+z",
                            None if ground is None else float(ground))
        return None

    def safe_file(self, file: str, path, suffixes=IMAGE_SUFFIXES, what="attachment") -> bool:
        """A file a sheet names must be plainly named, lie inside the sheet's folder (links
        resolved) and exist; :func:`aeroreview.paths.contained_file` decides."""
        kind = "an image" if what == "attachment" else "a surface file"
        try:
            real = contained_file(self.folder, file, suffixes, what, kind)
        except PathProblem as problem:
            self.error(path, str(problem), problem.hint)
            return False
        if what == "attachment":
            with real.open("rb") as stream:
                head = stream.read(12)
            if not head.startswith(IMAGE_SIGNATURES) or head.startswith(b"RIFF") and head[8:12] != b"WEBP":
                self.error(path, f"attachment '{file}' is not a PNG, JPEG, GIF or WebP image inside",
                           "export it as a raster image; SVG and other documents are not published")
                return False
        return True


def combinations(sheet: Sheet, doc: yamldoc.Document) -> list[Problem]:
    """Physically impossible combinations of otherwise valid features."""
    rules = (
        (("dimensions.frontal_area", "dimensions.width", "dimensions.height"),
         lambda a, w, h: a > w * h, "frontal area {0} is larger than width x height ({1} x {2})",
         "the frontal area must fit inside the bounding rectangle; check the units"),
        (("dimensions.wheelbase", "dimensions.length"), lambda wb, length: wb >= length,
         "wheelbase {0} is not shorter than the length {1}", "check both values"),
        (("dimensions.track_front", "dimensions.width"), lambda t, w: t > w,
         "front track {0} is wider than the body {1}", "the track is measured between contact-patch centres"),
        (("dimensions.track_rear", "dimensions.width"), lambda t, w: t > w,
         "rear track {0} is wider than the body {1}", "the track is measured between contact-patch centres"),
        (("dimensions.ground_clearance", "dimensions.height"), lambda g, h: g >= h,
         "ground clearance {0} is not below the height {1}", "check both values and their units"),
        (("underbody.diffuser_length", "dimensions.length"), lambda d, length: d >= length,
         "diffuser length {0} is not shorter than the vehicle {1}", "check the units"),
        (("sides.mirror_area", "dimensions.frontal_area"), lambda m, a: m >= a,
         "mirror area {0} is not smaller than the frontal area {1}", "the mirror area is part of the frontal area"),
    )
    problems = []
    for keys, impossible, message, hint in rules:
        if sheet.has(*keys) and impossible(*(sheet.get(k) for k in keys)):
            shown = [sheet.features[k].display(catalogue.feature(k)) for k in keys]
            problems.append(doc.problem(("features", keys[0]), message.format(*shown), hint))
    return problems
