"""Feature sheets: load a vehicle revision from YAML, validate it, and hand out SI values.

A sheet is one YAML file per vehicle revision::

    id: brisa            # vehicle id: a slug, it becomes a URL and a file name
    revision: r2
    parent: r1           # the revision this one was derived from (optional)
    name: Brisa GT
    reviewed: 2026-10-14
    reviewer: A. Reviewer
    features:            # catalogue keys; number in the canonical unit, "27 deg", or a mapping
      vehicle.class: fastback
      rear.backlight_angle: 24 deg
      dimensions.frontal_area: {value: 2.21 m^2, source: measured from the surface, note: mirrors in}
    results: [...]       # CFD / tunnel / road results, optionally with a yaw sweep
    waivers: [...]       # accepted findings: rule, reason, by, expires
    notes: free text
    attachments: [...]   # images: file, zone, caption

Loading collects every problem (not just the first) as a located :class:`Problem`;
errors raise :class:`InputError`, doubts (a value outside its typical range) are kept as
warnings on the sheet. Nothing here ever writes to the user's file.
"""

from __future__ import annotations

import datetime as _dt
import re
from dataclasses import dataclass, field
from pathlib import Path

from aeroreview import catalogue, sections, yamldoc
from aeroreview.catalogue import Feature
from aeroreview.names import close_match, suggest
from aeroreview.paths import PathProblem, contained_file
from aeroreview.problems import InputError, Problem, echo
from aeroreview.rules import RULES_HINT, all_rules
from aeroreview.sections import (MAX_GROUND, MAX_TEXT, RESULT_KINDS, Attachment, Field, Geometry, Result, Section,
                                 Waiver, YawPoint)
from aeroreview.units import UnitProblem, format_quantity, from_si, to_si

__all__ = ["MAX_TEXT", "RESULT_KINDS", "Attachment", "Geometry", "Result", "Sheet", "Value", "Waiver", "YawPoint",
           "attachment_problems", "from_document", "load_fleet", "load_sheet", "sheet_files"]

SLUG = re.compile(sections.SLUG)
IMAGE_SUFFIXES = (".png", ".jpg", ".jpeg", ".webp", ".gif")  # raster only: an SVG can carry script
# The first bytes of each raster format (its specification's signature), so a script-bearing
# SVG or HTML file renamed .png is refused too.
IMAGE_SIGNATURES = (b"\x89PNG\r\n\x1a\n", b"\xff\xd8\xff", b"GIF87a", b"GIF89a", b"RIFF")
SURFACE_SUFFIXES = (".stl", ".obj", ".ply", ".csv")
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


@dataclass
class Sheet:
    """One validated vehicle revision."""

    path: str
    vehicle_id: str
    revision: str
    name: str
    parent: str | None = None
    reviewed: _dt.date | None = None
    reviewer: str = ""
    features: dict[str, Value] = field(default_factory=dict)
    results: list[Result] = field(default_factory=list)
    waivers: list[Waiver] = field(default_factory=list)
    notes: str = ""
    attachments: list[Attachment] = field(default_factory=list)
    geometry: Geometry | None = None
    warnings: list[Problem] = field(default_factory=list)
    line_of: dict[str, int] = field(default_factory=dict)  # feature or top-level key -> line

    def get(self, key: str, default=None):
        """The value of feature ``key`` (SI float, word or bool), or ``default`` if absent."""
        if key not in catalogue.BY_KEY:  # a typo in a rule must fail loudly, not read as "missing"
            raise KeyError(f"unknown feature {key!r}")
        item = self.features.get(key)
        return default if item is None else item.value

    def has(self, *keys: str) -> bool:
        return all(self.get(key) is not None for key in keys)

    @property
    def label(self) -> str:
        return f"{self.vehicle_id}@{self.revision}"


class _Checker:
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
        for path, raw in self.items(data, ("results",), "results"):
            values = self.fields(sections.RESULT, raw, path)
            sweep = [YawPoint(**point) for point in values["yaw_sweep"]
                     if point["yaw"] is not None and point["cd"] is not None]
            if values["cd"] is not None and values["kind"] in RESULT_KINDS:
                out.append(Result(**{**values, "label": values["label"] or f"{values['kind']} {path[-1] + 1}",
                                     "scale": values["scale"] or 1.0,
                                     "yaw_sweep": tuple(sorted(sweep, key=lambda p: p.yaw))}))
        return out

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


def _combinations(sheet: Sheet, doc: yamldoc.Document) -> list[Problem]:
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


def from_document(doc: yamldoc.Document, folder: Path, allow_placeholders: bool = False) -> Sheet:
    """Validate a parsed document; raise :class:`InputError` with every problem found.

    ``allow_placeholders`` passes a template's unfilled values (a merge into a fresh
    template keeps the sheet as valid as it was, no more).
    """
    sheet, problems = check_document(doc, folder, allow_placeholders)
    if problems:
        raise InputError(problems)
    return sheet


def check_document(doc: yamldoc.Document, folder: Path, allow_placeholders: bool = False) -> tuple[Sheet, list[Problem]]:
    """Validate a parsed document: the sheet built from what is valid, and every problem, in line order.

    The sheet is returned even when there are problems, so the fleet checks (duplicates,
    parents) still see it and a reviewer gets every stage's problems in one run.
    """
    if not isinstance(doc.data, dict):
        kind = "a list" if isinstance(doc.data, list) else f"a single {type(doc.data).__name__} value"
        raise InputError([doc.problem((), f"the top level of a sheet must be a mapping, got {kind}",
                                      "start with `id: ...`, `revision: ...` and `features:` lines")])
    check = _Checker(doc, folder, allow_placeholders)
    data = doc.data
    top = {f.name: f for f in sections.TOP_LEVEL.fields}
    check.unknown_keys(data, sections.TOP_LEVEL.names, ())
    vehicle_id, revision = check.field(top["id"], data, ()), check.field(top["revision"], data, ())
    parent = check.field(top["parent"], data, ()) or None
    if parent and parent == revision:
        check.error(("parent",), "a revision cannot be its own parent", "name the revision this one came from")
    notes = data.get("notes")
    if isinstance(notes, list) and all(isinstance(n, str) for n in notes):
        data = {**data, "notes": "\n\n".join(notes)}
    if "features" not in data:
        check.error((), "'features' is missing", "add a `features:` mapping (see `aeroreview new`)")
    features, lines = check.features(data.get("features"))
    sheet = Sheet(
        path=doc.file, vehicle_id=vehicle_id, revision=revision,
        name=check.field(top["name"], data, ()) or vehicle_id, parent=parent,
        reviewed=check.field(top["reviewed"], data, ()), reviewer=check.field(top["reviewer"], data, ()),
        features=features, results=check.results(data.get("results")), waivers=check.waivers(data.get("waivers")),
        notes=check.text(data, "notes"), attachments=check.attachments(data.get("attachments")),
        geometry=check.geometry(data.get("geometry")),
        line_of={**lines, **{k: doc.where((k,), key=True)[0] for k in ("id", "revision", "parent", "features", "results") if k in data}},
    )
    if "reviewer" in data and not sheet.reviewer.strip() and not is_placeholder(data["reviewer"]):
        check.error(("reviewer",), "'reviewer' is empty", "write who reviewed this revision, or remove the line")
    check.problems.extend(_combinations(sheet, doc))
    sheet.warnings = check.warnings
    return sheet, sorted(check.problems, key=lambda p: (p.line, p.column))


def load_sheet(path: Path | str, display: str | None = None) -> Sheet:
    """Load and validate one sheet file."""
    path = Path(path)
    doc = yamldoc.load(path, display or str(path))
    return from_document(doc, path.parent)


def attachment_problems(sheets, limit: int) -> list[Problem]:
    """Attachments larger than ``limit`` bytes (the site copies each one into every build)."""
    problems = []
    for sheet in sheets:
        for attachment in sheet.attachments:
            real = contained_file(Path(sheet.path).parent, attachment.file, IMAGE_SUFFIXES, "attachment")
            size = real.stat().st_size
            if size > limit:
                problems.append(Problem(sheet.path, attachment.line, 1, f"attachment '{attachment.file}' is "
                                        f"{size:,} bytes, over the limit of {limit:,}",
                                        "make it smaller, or raise max_attachment_mb in the settings"))
    return problems


@dataclass
class Fleet:
    """Every sheet found under some paths, and every problem met on the way."""

    sheets: list[Sheet]
    problems: list[Problem]

    @property
    def warnings(self) -> list[Problem]:
        return [w for s in self.sheets for w in s.warnings]


def sheet_files(paths) -> tuple[list[Path], list[Problem]]:
    """YAML files named by ``paths`` (files, or folders searched recursively), sorted."""
    files, problems = [], []
    for given in paths:
        path = Path(given)
        if path.is_dir():
            files.extend(sorted(p for p in path.rglob("*") if p.suffix in (".yaml", ".yml") and p.is_file()))
        elif path.is_file():
            files.append(path)
        else:
            problems.append(Problem(str(given), 1, 1, "no such file or folder", "check the path"))
    unique = {}  # a sheet named twice (a folder and a file in it) is read once
    for file in files:
        unique.setdefault(file.resolve(), file)
    return list(unique.values()), problems


def _sibling_revisions(folders, loaded: set[Path]) -> dict[tuple[str, str], None]:
    """(id, revision) of the sheets in ``folders`` that were not loaded (a single file was checked).

    ``loaded`` holds the resolved paths of the loaded files; each folder is listed once.
    """
    found = {}
    for folder in sorted(set(folders)):
        for path in sorted(folder.glob("*.y*ml")):
            if path.resolve() in loaded:
                continue
            try:
                data = yamldoc.load(path).data
            except InputError:
                continue
            if isinstance(data, dict) and isinstance(data.get("id"), str) and isinstance(data.get("revision"), str):
                found[(data["id"], data["revision"])] = None
    return found


def _parent_hint(sheet: Sheet, known: list[str]) -> str:
    """The revisions a missing parent could have meant (a revision is not its own parent)."""
    if known == [sheet.revision]:
        return f"no other revision of {sheet.vehicle_id} was found; add the parent's sheet or remove `parent:`"
    close = close_match(sheet.parent, [r for r in known if r != sheet.revision])
    return f"known revisions: {', '.join(known)}" + (f"; did you mean '{close}'?" if close else "")


def load_fleet(paths) -> Fleet:
    """Load every sheet under ``paths`` and check the fleet as a whole.

    Fleet-level problems: two sheets with the same (vehicle id, revision), and a parent
    revision that no sheet of that vehicle provides (among the loaded sheets, or beside
    the sheet in its folder when a single file is checked). Linear in the sheets: the
    loaded files are resolved once and each orphan's folder is listed once.
    """
    files, problems = sheet_files(paths)
    sheets: list[Sheet] = []
    checked: list[Sheet] = []  # every sheet that parsed, usable or not, for the fleet checks
    for file in files:
        try:
            sheet, errors = check_document(yamldoc.load(file, str(file)), file.parent)
        except InputError as error:
            problems.extend(error.problems)
            continue
        problems.extend(errors)
        checked.append(sheet)
        if not errors:
            sheets.append(sheet)
    seen: dict[tuple[str, str], Sheet | None] = {}
    checked = [s for s in checked if s.vehicle_id and s.revision]
    for sheet in checked:
        key = (sheet.vehicle_id, sheet.revision)
        if key in seen:
            problems.append(Problem(sheet.path, sheet.line_of.get("revision", 1), 1, f"{sheet.label} is defined twice",
                                    f"it is also defined in {seen[key].path}; give each revision its own name"))
        else:
            seen[key] = sheet
    orphans = [s for s in checked if s.parent and (s.vehicle_id, s.parent) not in seen]
    if orphans:
        loaded = {p.resolve() for p in files}
        seen.update(_sibling_revisions((Path(s.path).parent for s in orphans), loaded))
    revisions: dict[str, list[str]] = {}
    for vehicle, revision in seen:
        revisions.setdefault(vehicle, []).append(revision)
    hints: dict[tuple[str, str], str] = {}  # one hint per (vehicle, missing parent)
    for sheet in orphans:
        key = (sheet.vehicle_id, sheet.parent)
        if key in seen:
            continue
        if key not in hints:
            hints[key] = _parent_hint(sheet, sorted(revisions.get(sheet.vehicle_id, ())))
        problems.append(Problem(sheet.path, sheet.line_of.get("parent", 1), 1,
                                f"parent revision '{sheet.parent}' of {sheet.vehicle_id} does not exist", hints[key]))
    return Fleet(sheets, problems)
