"""The sections of a feature sheet, each declared once as a table of fields.

As the catalogue declares every feature, this module declares every other key a sheet may
hold: the top level, results and their yaw sweep points, waivers, attachments and the
geometry. A :class:`Field` gives the kind, unit, bounds, whether it is required, its text
limit and its choices; the sheet checker (:mod:`aeroreview.sheet`) and the JSON Schema
(:mod:`aeroreview.schema`) are both built from these tables, so they cannot disagree.
Adding a key to a section is one line here (and one attribute in its dataclass).
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass

from aeroreview import catalogue

SLUG = r"^[a-z0-9](?:[a-z0-9-]{0,62}[a-z0-9])?$"
RULE_ID = r"^[a-z]+\.[a-z0-9-]+$"
MAX_TEXT = 20_000  # characters in one free-text field; a note, not a report
FILE_NAME = r"^(?!/)(?!.*\.\.)[^\\:]+$"  # relative, no "..", no drive or backslash (safe_file checks more)
MAX_GROUND = 1e6  # |ground| in file units: 1 km in mm, beyond any surface file (common practice)
RESULT_KINDS = ("cfd", "tunnel", "road", "estimate")
COEFFICIENT = (-3.0, 3.0)  # road-vehicle force and moment coefficients lie well inside (from memory: Hucho
#                             1998, chapter not checked)
DRAG_COEFFICIENT = (0.05, 2.0)  # below any road body; above a flat plate normal to the flow, about 1.2
#                                 (from memory: Hoerner, Fluid-Dynamic Drag, 1965, chapter not checked)


@dataclass(frozen=True)
class Field:
    """One key of a section.

    kind: ``text`` (a string; numbers are read as their text), ``file`` (text naming a file
    beside the sheet: the checker's ``safe_file`` decides, the schema's ``pattern`` only
    approximates it), ``number`` (a plain number in ``unit``, or a string with a unit),
    ``date`` (YYYY-MM-DD, quoted or not), ``list`` (of ``items`` mappings) or ``raw`` (read
    by hand in the checker; the schema gets ``raw_schema``).
    """

    name: str
    kind: str
    unit: str = ""
    bounds: tuple[float, float] | None = None  # in ``unit``; outside is an error
    required: bool = False
    limit: int = MAX_TEXT  # characters, for text
    choices: tuple[str, ...] = ()
    pattern: str | None = None  # a regular expression the text must match (re.search)
    pattern_what: str = ""  # what a matching text is, for the message: "a safe slug"
    pattern_hint: str = ""  # what to write instead
    items: Section | None = None  # for lists
    raw_schema: dict | None = None  # for raw fields


@dataclass(frozen=True)
class Section:
    name: str  # as shown in messages: "results[0]"
    fields: tuple[Field, ...]

    @property
    def names(self) -> tuple[str, ...]:
        return tuple(f.name for f in self.fields)


def _text(name, limit=MAX_TEXT, **more) -> Field:
    return Field(name, "text", limit=limit, **more)


def _slug(name, required=False) -> Field:
    return _text(name, 200, required=required, pattern=SLUG, pattern_what="a safe slug",
                 pattern_hint="use lowercase letters, digits and inner hyphens only (it becomes a URL and a file name)")


# Side force and moments as SAE J1594 (2010) defines them (summary of the standard checked):
# on the frontal area and, for moments, the wheelbase, about the point on the ground at
# mid-wheelbase and mid-track. cym is the yawing moment, cpm the pitching moment.
MOMENTS = (Field("cs", "number", "", COEFFICIENT), Field("cym", "number", "", COEFFICIENT),
           Field("cpm", "number", "", COEFFICIENT))

YAW_POINT = Section("yaw_sweep", (
    Field("yaw", "number", "deg", (-90, 90), required=True),
    Field("cd", "number", "", DRAG_COEFFICIENT, required=True),
    Field("cl_front", "number", "", COEFFICIENT),
    Field("cl_rear", "number", "", COEFFICIENT),
    *MOMENTS,
))

RESULT_FILE = Section("files", (  # a file a result was read from (aeroreview results ... --sheet)
    Field("file", "file", limit=300, required=True, pattern=FILE_NAME),
    _text("sha256", 64, pattern=r"^[0-9a-f]{64}$", pattern_what="a sha256 in hex",
          pattern_hint="64 lowercase hex digits, as `sha256sum` prints"),
    _text("role", 20, choices=("history", "surface", "buildup", "yaw")),
))

RESULT = Section("results", (
    _text("kind", 20, required=True, choices=RESULT_KINDS),
    _text("label", 200),
    Field("speed", "number", "km/h", (1, 600)),  # beyond any road vehicle's test speed (common practice)
    Field("cd", "number", "", DRAG_COEFFICIENT, required=True),
    Field("cl_front", "number", "", COEFFICIENT),
    Field("cl_rear", "number", "", COEFFICIENT),
    Field("scale", "number", "", (0.01, 1.0)),  # 1:100 models and smaller do not occur (common practice)
    Field("reference_area", "number", "m^2", (0.01, 12)),  # a bus front is about 8 m^2 (from memory)
    Field("yaw_sweep", "list", items=YAW_POINT),
    Field("date", "date"),
    _text("source", 500),
    *MOMENTS,
    Field("settled_from", "number"),  # a history's settled window, in its own first column (results history)
    Field("settled_to", "number"),
    Field("std_error", "number", "", (0.0, 1.0)),  # of the settled Cd mean, autocorrelation counted
    Field("drift", "number", "", (-1.0, 1.0)),  # of Cd per 1000 iterations
    Field("files", "list", items=RESULT_FILE),  # provenance: the files the result was read from
))

WAIVER = Section("waivers", (
    _text("rule", 80, required=True, pattern=RULE_ID, pattern_what="a rule id",
          pattern_hint="rule ids read zone.name, see `aeroreview rules`"),
    _text("reason", 2000, required=True, pattern=r"\S", pattern_what="a reason, not blank",
          pattern_hint="say why the finding is accepted"),
    _text("by", 200),
    Field("expires", "date"),
))

ATTACHMENT = Section("attachments", (
    Field("file", "file", limit=300, required=True, pattern=FILE_NAME),
    _text("zone", 40, required=True, choices=tuple(catalogue.ALL_ZONES)),
    _text("caption", 1000),
))

GEOMETRY = Section("geometry", (
    Field("file", "file", limit=300, required=True, pattern=FILE_NAME),
    _text("units", 10, choices=("mm", "m")),
    _text("nose", 10, choices=("-x", "+x")),
    _text("up", 10, choices=("+z", "+y")),
    Field("ground", "raw", raw_schema={"type": "number", "minimum": -MAX_GROUND, "maximum": MAX_GROUND}),  # file units
))

FEATURE_VALUE = Section("features", (  # the mapping form of a feature value; "value" is the catalogue's
    Field("value", "raw"),
    _text("source", 500),
    _text("note", 2000),
))

TOP_LEVEL = Section("sheet", (
    _slug("id", required=True),
    _slug("revision", required=True),
    _slug("parent"),
    _text("name", 120),
    Field("reviewed", "date"),
    _text("reviewer", 200),
    Field("features", "raw"),  # declared by the catalogue
    Field("results", "list", items=RESULT),
    Field("waivers", "list", items=WAIVER),
    Field("notes", "raw", raw_schema={"anyOf": [{"type": "string", "maxLength": MAX_TEXT}, {"type": "number"},
                                                {"type": "array", "items": {"type": "string"}}]}),
    Field("attachments", "list", items=ATTACHMENT),
    Field("geometry", "raw"),  # a file name, or the GEOMETRY mapping
))


@dataclass(frozen=True)
class YawPoint:
    yaw: float  # rad
    cd: float
    cl_front: float | None = None
    cl_rear: float | None = None
    cs: float | None = None  # side force, yawing and pitching moment (SAE J1594, see MOMENTS)
    cym: float | None = None
    cpm: float | None = None


@dataclass(frozen=True)
class Result:
    """A CFD, wind-tunnel or road result for the revision (coefficients on the frontal area)."""

    kind: str
    label: str
    speed: float | None  # m/s
    cd: float
    cl_front: float | None = None
    cl_rear: float | None = None
    scale: float = 1.0  # model scale, 1.0 is full size
    reference_area: float | None = None  # m^2; None means the sheet's frontal area
    yaw_sweep: tuple[YawPoint, ...] = ()
    date: _dt.date | None = None  # when the result was produced
    source: str = ""  # where it comes from (report, run id)
    cs: float | None = None  # side force, yawing and pitching moment (SAE J1594, see MOMENTS)
    cym: float | None = None
    cpm: float | None = None
    settled_from: float | None = None
    settled_to: float | None = None
    std_error: float | None = None
    drift: float | None = None
    files: tuple[tuple[str, str, str], ...] = ()  # (file, sha256, role)


@dataclass(frozen=True)
class Waiver:
    rule: str
    reason: str
    by: str = ""
    expires: _dt.date | None = None
    line: int = 1


@dataclass(frozen=True)
class Attachment:
    file: str  # relative to the sheet's folder, checked to stay inside it
    zone: str
    caption: str
    line: int = 1  # where the sheet names the file


@dataclass(frozen=True)
class Geometry:
    """The revision's surface or profile, and how to read it (see ``aeroreview measure``)."""

    file: str  # relative to the sheet's folder, checked to stay inside it
    units: str | None = None
    nose: str = "-x"
    up: str = "+z"
    ground: float | None = None  # in file units
