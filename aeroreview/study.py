"""Parametric study tables: one row per design variant, the varied parameters and the coefficients.

A study is a CSV file or a whitespace-separated table; lines starting with ``#`` (and
anything after a ``#``) are comments. Each ``--map COLUMN=FEATURE[:UNIT]`` ties a column to
a catalogue feature, in the unit its numbers are written in (default the feature's own);
absolute values and offsets from a baseline both work, since only the slopes are fitted.
The response defaults to the column named like ``Cd``; a coefficient (Cd, Cl...) becomes
drag counts (x 1000), a column named with "counts" is taken as counts already.

Everything the table gets wrong is a :class:`~aeroreview.problems.Problem` located at the
file's own line and column, collected in one pass; rows with missing cells are dropped,
counted and reported, never silently used or lost.
"""

from __future__ import annotations

import hashlib
import io
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np
import pandas as pd

from aeroreview import catalogue
from aeroreview.problems import InputError, Problem, UsageError
from aeroreview.names import suggest
from aeroreview.units import UnitProblem, describe_dimension, to_si

MAX_STUDY_BYTES = 64 * 1024 * 1024  # a parametric study is thousands of rows, not gigabytes (our convention)
COUNTS_PER_COEFFICIENT = 1000.0  # 1 drag count = 0.001 of a coefficient
# A response outside these bounds is not a coefficient of a road vehicle; the same bounds as a
# sheet's results (aeroreview.sheet, common practice).
RESPONSE_BOUNDS = {"cd": (0.05, 2.0), "cl": (-3.0, 3.0)}
MAX_LISTED = 5  # located problems listed per column before "and N more"
_RESPONSE_LIKE = re.compile(r"^c[\s_]*d(?![a-z])", re.I)


@dataclass(frozen=True)
class Mapping:
    column: str
    feature: str
    unit: str  # the unit the column's numbers are in (sensitivities are per this unit)


@dataclass
class Study:
    """A validated study: the mapped parameters and the response, in counts, row by row."""

    file: str  # as the user named it
    sha256: str
    mappings: list[Mapping]
    response: str
    x: np.ndarray  # rows x mapped columns, in each mapping's unit
    y: np.ndarray  # response in drag counts
    lines: list[int]  # the file line of each row used
    dropped_lines: list[int]
    ignored: list[str]
    drag: bool  # the response is a drag coefficient or drag counts (a lift response is not)
    header_line: int
    column_at: dict[str, int]  # the header's character column of each column name
    warnings: list[Problem] = field(default_factory=list)

    @property
    def rows(self) -> int:
        return len(self.y)


def parse_map(text: str) -> tuple[str, str, str | None]:
    """``COLUMN=FEATURE[:UNIT]`` into its parts (the unit None when not given)."""
    column, equals, target = text.rpartition("=")
    feature, _, unit = target.partition(":")
    if not equals or not column.strip() or not feature.strip():
        raise UsageError(f"--map {text!r}: write COLUMN=FEATURE or COLUMN=FEATURE:UNIT, "
                         "e.g. --map diffuser_deg=underbody.diffuser_angle:deg")
    return column.strip(), feature.strip(), unit.strip() or None


def _hint(word: str, options, what: str) -> str:
    hint = suggest(word, options)
    return hint if hint.startswith("did you mean") else f"the {what}: {', '.join(map(str, options))}"


def _field_starts(line: str, sep: str) -> list[int]:
    """0-based character offset of each field of ``line`` (quotes respected in CSV)."""
    if sep != ",":
        return [m.start() for m in re.finditer(r"\S+", line)]
    starts, quoted = [0], False
    for i, char in enumerate(line):
        if char == '"':
            quoted = not quoted
        elif char == "," and not quoted:
            starts.append(i + 1)
    return starts


class _Table:
    """The table's text with its file positions, so every problem points at a line and column."""

    def __init__(self, file: str, text: str):
        self.file = file
        self.lines, self.numbers = [], []
        for number, line in enumerate(text.splitlines(), 1):
            content = line.split("#", 1)[0].rstrip()
            if content.strip():
                self.lines.append(content)
                self.numbers.append(number)
        if not self.lines:
            raise InputError([Problem(file, 1, 1, "the study has no header and no rows",
                                      "write a header line of column names, then one line per variant")])
        self.sep = "," if "," in self.lines[0] else r"\s+"
        try:
            frame = pd.read_csv(io.StringIO("\n".join(self.lines)), sep=self.sep, dtype=str, skipinitialspace=True,
                                engine="python" if self.sep != "," else "c")
        except pd.errors.ParserError as error:
            found = re.search(r"line (\d+)", str(error))
            line = self.numbers[min(int(found.group(1)), len(self.numbers)) - 1] if found else self.numbers[0]
            raise InputError([Problem(file, line, 1, f"cannot read the table: {error}",
                                      "every row needs as many cells as the header has names")]) from None
        frame.columns = [str(c).strip() for c in frame.columns]
        self.frame = frame

    def at(self, row: int | None, column: str, message: str, hint: str = "", level="error") -> Problem:
        """A problem at a data row (0-based; None is the header) and a column."""
        index = 0 if row is None else row + 1
        starts = _field_starts(self.lines[index], self.sep)
        position = list(self.frame.columns).index(column) if column in self.frame.columns else 0
        column_number = (starts[position] if position < len(starts) else 0) + 1
        return Problem(self.file, self.numbers[index], column_number, message, hint, level)


def _numeric(table: _Table, column: str, problems: list[Problem]) -> np.ndarray:
    """The column as floats (NaN where empty); non-numeric and infinite cells are problems."""
    raw = table.frame[column]
    values = pd.to_numeric(raw, errors="coerce").to_numpy(dtype=float)
    bad = [i for i in range(len(raw)) if (pd.notna(raw.iloc[i]) and np.isnan(values[i])) or np.isinf(values[i])]
    for i in bad[:MAX_LISTED]:
        problems.append(table.at(i, column, f"cell '{str(raw.iloc[i])[:40]}' in column '{column}' is not a finite number",
                                 "write a plain number (the unit belongs in --map)"))
    if len(bad) > MAX_LISTED:
        problems.append(table.at(bad[MAX_LISTED], column, f"and {len(bad) - MAX_LISTED} more non-numeric cells "
                                                          f"in column '{column}'"))
    return values


def _response_column(table: _Table, response: str | None, problems: list[Problem]) -> str | None:
    columns = list(table.frame.columns)
    if response is not None:
        if response not in columns:
            problems.append(table.at(None, columns[0], f"no response column '{response}' in the study",
                                     _hint(response, columns, "columns")))
            return None
        return response
    found = [c for c in columns if _RESPONSE_LIKE.match(c)]
    if not found:
        problems.append(table.at(None, columns[0], "no response column: none is named like Cd",
                                 f"name it with --response (the columns: {', '.join(columns)})"))
        return None
    return found[0]


def _response_scale(name: str) -> tuple[float, tuple[float, float] | None, bool]:
    """Counts per response unit, the physical bounds of the response (None: not bounded), and
    whether it is a drag response."""
    lift = re.match(r"^c[\s_]*l", name, re.I) is not None or "lift" in name.lower()
    if "count" in name.lower():
        return 1.0, None, not lift
    kind = "cd" if _RESPONSE_LIKE.match(name) else "cl" if lift else None
    return COUNTS_PER_COEFFICIENT, RESPONSE_BOUNDS.get(kind), not lift


def _mappings(table: _Table, maps: list[str], response: str | None, problems: list[Problem]) -> list[Mapping]:
    columns = list(table.frame.columns)
    out, seen_columns, seen_features = [], set(), set()
    for text in maps:
        column, key, unit = parse_map(text)
        if column not in columns:
            problems.append(table.at(None, columns[0], f"--map {text}: no column '{column}' in the study",
                                     _hint(column, columns, "columns")))
            continue

        def where(message, hint=""):
            problems.append(table.at(None, column, f"--map {text}: {message}", hint))

        feature = catalogue.BY_KEY.get(key)
        if column == response:
            where(f"'{column}' is the response", "map the design parameters, not the response")
        elif column in seen_columns or key in seen_features:
            where("the column or the feature is mapped twice", "map each column to one feature, once")
        elif feature is None:
            where(f"unknown feature '{key}'", _hint(key, catalogue.BY_KEY, "features"))
        elif feature.kind != "quantity":
            where(f"'{key}' is a {feature.kind}, not a number with a unit", "map columns to measured features")
        else:
            unit = unit or feature.unit
            try:
                to_si(f"1 {unit}", feature.unit)
            except UnitProblem:
                example = feature.unit or "%"
                where(f"'{unit}' is not a unit of {describe_dimension(feature.unit)} ({key} is in {feature.unit_label()})",
                      f"write e.g. {column}={key}:{example}")
                continue
            out.append(Mapping(column, key, unit))
            seen_columns.add(column)
            seen_features.add(key)
    return out


def read_study(path: Path | str, maps: list[str], response: str | None = None, display: str | None = None) -> Study:
    """Read and check a study table; raise :class:`InputError` with every located problem."""
    path = Path(path)
    file = display or str(path)
    if not path.is_file():
        raise UsageError(f"{file}: study file not found")
    if path.stat().st_size > MAX_STUDY_BYTES:
        raise UsageError(f"{file}: the study is over {MAX_STUDY_BYTES // 2**20} MB; split it or drop unused columns")
    data = path.read_bytes()
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as error:
        raise InputError([Problem(file, data[:error.start].count(b"\n") + 1, 1, "the study is not UTF-8 text",
                                  "save it as UTF-8 CSV")]) from None
    table = _Table(file, text)
    if not maps:
        raise UsageError("give at least one --map COLUMN=FEATURE[:UNIT] (the study's columns: "
                         f"{', '.join(table.frame.columns)})")
    problems: list[Problem] = []
    response = _response_column(table, response, problems)
    mappings = _mappings(table, maps, response, problems)
    if problems:
        raise InputError(problems)
    x = np.column_stack([_numeric(table, m.column, problems) for m in mappings])
    scale, bounds, drag = _response_scale(response)
    y = _numeric(table, response, problems)
    if bounds:
        outside = [i for i in range(len(y)) if np.isfinite(y[i]) and not bounds[0] <= y[i] <= bounds[1]]
        for i in outside[:MAX_LISTED]:
            problems.append(table.at(i, response, f"{response} = {y[i]:g} is outside the physical bounds "
                                                  f"{bounds[0]:g} to {bounds[1]:g}",
                                     "check the cell; a coefficient, not counts or a percentage, is expected"))
    if problems:
        raise InputError(problems)
    complete = np.isfinite(x).all(axis=1) & np.isfinite(y)
    dropped = [table.numbers[i + 1] for i in np.flatnonzero(~complete)]
    warnings = []
    if dropped:
        shown = ", ".join(map(str, dropped[:10])) + (" ..." if len(dropped) > 10 else "")
        warnings.append(Problem(file, dropped[0], 1, f"dropped {len(dropped)} row(s) with missing values "
                                                     f"({'line' if len(dropped) == 1 else 'lines'} {shown})", "fill the cells to use those rows",
                                "warning"))
    x, y = x[complete], y[complete] * scale
    for j, mapping in enumerate(mappings):
        if len(x) and np.ptp(x[:, j]) == 0:
            problems.append(table.at(None, mapping.column, f"column '{mapping.column}' is constant "
                                                           f"({x[0, j]:g} {mapping.unit} in every row)",
                                     "a constant carries no sensitivity: vary it in the study or drop its --map"))
    if problems:
        raise InputError(problems)
    used = {m.column for m in mappings} | {response}
    lines = [table.numbers[i + 1] for i in np.flatnonzero(complete)]
    column_at = {c: table.at(None, c, "").column for c in table.frame.columns}
    return Study(file, hashlib.sha256(data).hexdigest(), mappings, response, x, y, lines, dropped,
                 [c for c in table.frame.columns if c not in used], drag, table.numbers[0], column_at, warnings)
