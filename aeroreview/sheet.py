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
from aeroreview.names import close_match
from aeroreview.paths import contained_file
from aeroreview.problems import InputError, Problem
from aeroreview.rules.surface_agreement import SurfaceValues
from aeroreview.sections import MAX_TEXT, RESULT_KINDS, Attachment, Geometry, Result, Waiver, YawPoint
from aeroreview.sheetcheck import IMAGE_SUFFIXES, Checker, Value, combinations, is_placeholder

__all__ = ["MAX_TEXT", "RESULT_KINDS", "Attachment", "Geometry", "Result", "Sheet", "Value", "Waiver", "YawPoint",
           "attachment_problems", "check_document", "from_document", "is_placeholder", "load_fleet", "load_sheet",
           "sheet_files"]

SLUG = re.compile(sections.SLUG)
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
    surface: SurfaceValues | None = None  # its geometry measured, set by the review (aeroreview.sheetsurface)

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
    check = Checker(doc, folder, allow_placeholders)
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
    check.problems.extend(combinations(sheet, doc))
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
    files: frozenset[Path] = frozenset()  # the real path of every sheet file read (links followed)

    @property
    def warnings(self) -> list[Problem]:
        return [w for s in self.sheets for w in s.warnings]


def sheet_files(paths) -> tuple[dict[Path, Path], list[Problem]]:
    """YAML files named by ``paths`` (files, or folders searched recursively), sorted, by real path."""
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
    return unique, problems


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
    for file in files.values():
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
        seen.update(_sibling_revisions((Path(s.path).parent for s in orphans), set(files)))
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
    return Fleet(sheets, problems, frozenset(files))
