"""Review settings: one configuration, the ``aeroreview`` plugin section of ``mkdocs.yml``.

The site plugin and the command line read the same section, so a review in CI and on the
site always agree::

    plugins:
      - aeroreview:
          sheets: vehicles
          reference_speed: 130 km/h
          air: {altitude: 0 m}            # or temperature, pressure, humidity
          cycle: wltc-3b
          fail_on: failure
          rules:
            rear.backlight-angle: {severity: warning, thresholds: {critical_low: 27 deg}}
            wheels.rear-strakes: {disabled: true}
          calibrations:                   # aeroreview calibrate ... --vehicle tessel --output FILE
            - studies/tessel/rear-doe.calibration.yaml          # for the vehicles the file declares
            - {file: studies/doe.yaml, vehicles: [quillon], classes: [suv]}   # and for these too

Unknown keys, rule ids and threshold names are errors, located in the file.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import cached_property, lru_cache
from pathlib import Path

from aeroreview import calibration, yamldoc
from aeroreview.calc.air import Air, air_state
from aeroreview.calc.cycles import cycle_by_name
from aeroreview.estimate import DEFAULT_MODEL, Model, model_from_mapping
from aeroreview.names import suggest
from aeroreview.paths import PathProblem, contained_file
from aeroreview.problems import InputError, Problem, UsageError
from aeroreview.rules import RULES_HINT, SEVERITIES, STATUSES, Context, Rule, all_rules
from aeroreview.units import UnitProblem, from_si, to_si

REFERENCE_SPEED = 130 / 3.6  # m/s: the motorway speed reviewers quote drag and power at (common practice)
FAIL_LEVELS = ("advisory", "warning", "failure", "never")
CONFIG_NAME = "mkdocs.yml"
# An attachment is a photo, sketch or drawing export: a few MB (common practice); the site copies
# each into every build, so a team raises the limit knowingly, up to MAX_ATTACHMENT_MB.
ATTACHMENT_BYTES = 20_000_000
MAX_ATTACHMENT_MB = 2000


@dataclass(frozen=True)
class RuleOverride:
    severity: str | None = None
    disabled: bool = False
    thresholds: dict[str, float] = field(default_factory=dict)


@dataclass
class Settings:
    root: Path = field(default_factory=Path.cwd)
    sheets: str = "vehicles"
    reference_speed: float = REFERENCE_SPEED
    altitude: float = 0.0
    temperature: float | None = None
    pressure: float | None = None
    humidity: float = 0.0
    cycle: str = "wltc-3b"
    fail_on: str = "failure"
    overrides: dict[str, RuleOverride] = field(default_factory=dict)
    estimates: Model = DEFAULT_MODEL  # floors and region budgets of the combination model
    max_attachment_bytes: int = ATTACHMENT_BYTES
    calibrations: list[calibration.Calibration] = field(default_factory=list)
    notices: list[Problem] = field(default_factory=list)  # doubts about the settings (unused calibrations)
    source: str = "built-in defaults"

    def air(self) -> Air:
        return _air(self.altitude, self.temperature, self.pressure, self.humidity)

    @cached_property
    def rule_plan(self) -> list[tuple[Rule, Context, str]]:
        """Each enabled rule with its context (thresholds after overrides) and severity.

        Computed once: settings are not changed after loading.
        """
        air = self.air()
        plan = []
        for rule in all_rules().values():
            override = self.overrides.get(rule.id, RuleOverride())
            if override.disabled:
                continue
            context = Context({**rule.defaults(), **override.thresholds}, self.reference_speed, air.density,
                              air.kinematic_viscosity, rule.effects)
            plan.append((rule, context, override.severity or rule.severity))
        return plan

    @cached_property
    def fixes(self) -> dict[str, str]:
        """Each enabled rule's fix text with its thresholds in place: the same on every sheet, so written once."""
        return {rule.id: rule.fix_for(context.thresholds) for rule, context, _ in self.rule_plan}

    @cached_property
    def calibrated(self) -> dict:
        """Each calibrated feature's team drag slopes, with their scopes (:func:`aeroreview.calibration.index`)."""
        return calibration.index(self.calibrations)

    @property
    def sheets_path(self) -> Path:
        return self.root / self.sheets


@lru_cache(maxsize=16)
def _air(altitude, temperature, pressure, humidity) -> Air:
    return air_state(altitude, temperature, pressure, humidity)


def _plugin_section(doc: yamldoc.Document) -> tuple[dict, tuple]:
    """The ``aeroreview`` entry of ``plugins`` and its path in the document ({} if absent)."""
    plugins = doc.data.get("plugins") if isinstance(doc.data, dict) else None
    items = plugins.items() if isinstance(plugins, dict) else enumerate(plugins or [])
    for index, item in items:
        if item == "aeroreview" or index == "aeroreview":
            return ({} if isinstance(item, str) else item or {}), ("plugins", index)
        if isinstance(item, dict) and "aeroreview" in item:
            return item["aeroreview"] or {}, ("plugins", index, "aeroreview")
    return {}, ()


def from_mapping(section: dict, doc: yamldoc.Document, path: tuple, root: Path) -> Settings:
    """Settings from the plugin section; every problem located in ``doc``."""
    problems = []

    def error(where, message, hint="", key=False):
        problems.append(doc.problem(path + tuple(where), message, hint, key=key))

    if not isinstance(section, dict):
        raise InputError([doc.problem(path, "the aeroreview settings must be a mapping", "write key: value lines")])
    allowed = ("sheets", "reference_speed", "air", "cycle", "fail_on", "rules", "estimates", "max_attachment_mb",
               "calibrations")
    for key in section:
        if key not in allowed:
            error((key,), f"unknown setting '{key}'", suggest(str(key), allowed), key=True)
    settings = Settings(root=root, source=doc.file)

    def quantity(where, value, unit, low, high):
        try:
            si = to_si(value, unit)
        except UnitProblem as problem:
            error(where, str(problem), problem.hint)
            return None
        if not low <= si <= high:
            error(where, f"{value} is outside the sensible range", "check the number and its unit")
            return None
        return si

    if "sheets" in section:
        settings.sheets = str(section["sheets"])
    if "reference_speed" in section:
        settings.reference_speed = quantity(("reference_speed",), section["reference_speed"], "km/h", 1, 150) \
            or settings.reference_speed
    air = section.get("air") or {}
    if not isinstance(air, dict):
        error(("air",), "'air' must be a mapping", "e.g. {altitude: 0 m, temperature: 20 degC}")
        air = {}
    air_keys = {"altitude": ("m", -2000, 20000), "temperature": ("degC", 180, 350),
                "pressure": ("kPa", 1000, 120000), "humidity": ("%", 0, 1)}
    for key, value in air.items():
        if key not in air_keys:
            error(("air", key), f"unknown air setting '{key}'", suggest(str(key), air_keys), key=True)
            continue
        unit, low, high = air_keys[key]
        si = quantity(("air", key), value, unit, low, high)
        if si is not None:
            setattr(settings, key, si)
    if "cycle" in section:
        try:
            cycle_by_name(str(section["cycle"]))
            settings.cycle = str(section["cycle"])
        except ValueError as problem:
            error(("cycle",), str(problem))
    if "fail_on" in section:
        if section["fail_on"] in FAIL_LEVELS:
            settings.fail_on = section["fail_on"]
        else:
            error(("fail_on",), f"fail_on must be one of {', '.join(FAIL_LEVELS)}", suggest(str(section["fail_on"]),
                                                                                           FAIL_LEVELS))
    settings.overrides = _overrides(section.get("rules") or {}, error)
    if "max_attachment_mb" in section:
        size = section["max_attachment_mb"]
        if isinstance(size, bool) or not isinstance(size, (int, float)) or not 0 < size <= MAX_ATTACHMENT_MB:
            error(("max_attachment_mb",), f"max_attachment_mb must be a number of megabytes above 0, at most "
                  f"{MAX_ATTACHMENT_MB}", "e.g. max_attachment_mb: 20")
        else:
            settings.max_attachment_bytes = int(size * 1_000_000)
    if "estimates" in section:
        settings.estimates = model_from_mapping(section["estimates"], lambda where, *rest, **kw:
                                                error(("estimates", *where), *rest, **kw))
    settings.calibrations = _calibrations(section.get("calibrations") or [], root, error, problems)
    settings.notices = calibration.notices(settings.calibrations)
    if problems:
        raise InputError(problems)
    return settings


CALIBRATION_SUFFIXES = (".yaml", ".yml")


def _calibrations(entries, root: Path, error, problems) -> list[calibration.Calibration]:
    """Each entry is a file, or ``{file, vehicles, classes}`` widening the scope the file declares."""
    if not isinstance(entries, list):
        error(("calibrations",), "'calibrations' must be a list of files", "e.g. calibrations: [studies/doe.yaml]")
        return []
    out = []
    for i, entry in enumerate(entries):
        where = ("calibrations", i)
        vehicles, classes, name = (), (), entry
        if isinstance(entry, dict):
            vehicles, classes = calibration.read_scope(entry, where, error, extra=("file",))
            name = entry.get("file")
            where += ("file",) if "file" in entry else ()
        if not isinstance(name, str):
            error(where, "a calibration entry is a file name or {file: FILE, vehicles: [...], classes: [...]}",
                  "e.g. - {file: studies/doe.yaml, vehicles: [quillon]}")
            continue
        try:
            target = contained_file(root, name, CALIBRATION_SUFFIXES, "calibration", "a calibration file (YAML)")
        except PathProblem as problem:
            error(where, str(problem), problem.hint)
            continue
        try:
            cal = calibration.load_calibration(target, name)
        except InputError as failure:
            problems.extend(failure.problems)
            continue
        cal = replace(cal, vehicles=tuple(dict.fromkeys(cal.vehicles + vehicles)),
                      classes=tuple(dict.fromkeys(cal.classes + classes)))
        if not cal.vehicles and not cal.classes:
            error(("calibrations", i), f"{name} declares no vehicle or class its slopes hold for, so it would change "
                  "nothing", "refit it with `aeroreview calibrate ... --vehicle ID`, or write "
                  f"{{file: {name}, vehicles: [ID]}} here")
            continue
        out.append(cal)
    return out


def _overrides(data, error) -> dict[str, RuleOverride]:
    rules = all_rules()
    out = {}
    if not isinstance(data, dict):
        error(("rules",), "'rules' must be a mapping of rule ids", "e.g. rear.backlight-angle: {severity: warning}")
        return out
    for rule_id, raw in data.items():
        where = ("rules", rule_id)
        if rule_id not in rules:
            error(where, f"unknown rule '{rule_id}'", suggest(str(rule_id), rules, RULES_HINT), key=True)
            continue
        if not isinstance(raw, dict):
            error(where, f"settings of {rule_id} must be a mapping", "severity, disabled or thresholds")
            continue
        for key in raw:
            if key not in ("severity", "disabled", "thresholds"):
                error(where + (key,), f"unknown rule setting '{key}'",
                      suggest(str(key), ("severity", "disabled", "thresholds")), key=True)
        severity = raw.get("severity")
        if severity is not None and severity not in SEVERITIES:
            error(where + ("severity",), f"severity must be one of {', '.join(SEVERITIES)}", suggest(str(severity),
                                                                                                    SEVERITIES))
            severity = None
        disabled = raw.get("disabled", False)
        if not isinstance(disabled, bool):
            error(where + ("disabled",), "disabled must be true or false")
            disabled = False
        thresholds = {}
        given = raw.get("thresholds") or {}
        if not isinstance(given, dict):
            error(where + ("thresholds",), "thresholds must be a mapping of name: value")
            given = {}
        known = {t.name: t for t in rules[rule_id].thresholds}
        for name, value in given.items():
            if name not in known:
                error(where + ("thresholds", name), f"{rule_id} has no threshold '{name}'",
                      f"its thresholds: {', '.join(known) or 'none'}", key=True)
                continue
            try:
                thresholds[name] = known[name].parse(value)
            except UnitProblem as problem:
                error(where + ("thresholds", name), f"{rule_id} threshold '{name}': {problem}", problem.hint)
                continue
            low, high = known[name].allowed_range
            if not low <= from_si(thresholds[name], known[name].unit) <= high:
                del thresholds[name]
                error(where + ("thresholds", name), f"{rule_id} threshold '{name}' = {value} is outside its allowed "
                      f"range {low:g} to {high:g} {known[name].unit}".rstrip(), "choose a value inside that range")
        out[rule_id] = RuleOverride(severity, disabled, thresholds)
    return out


def load_settings(config: str | Path | None = None) -> Settings:
    """Settings from ``config`` (an mkdocs.yml), or from ./mkdocs.yml, or the defaults."""
    if config is None:
        candidate = Path.cwd() / CONFIG_NAME
        if not candidate.is_file():
            return Settings()
        config = candidate
    path = Path(config)
    if not path.is_file():
        raise UsageError(f"{path}: configuration file not found")
    doc = yamldoc.load(path, str(config), lenient_tags=True)
    section, where = _plugin_section(doc)
    return from_mapping(section, doc, where, path.resolve().parent)


def status_rank(status: str) -> int:
    """Rank of a status for comparisons (not assessed ranks below pass)."""
    return STATUSES.index(status) if status in STATUSES else -1
