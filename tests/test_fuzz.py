"""Fuzzing the input boundary with hypothesis: sheets, unit strings and file names.

Whatever a sheet holds, loading it either succeeds or raises InputError whose every problem
is located (file, line >= 1, column >= 1) and printable on one line without control
characters; a unit string either reads as a finite SI float or raises UnitProblem, within
the deadline; a file name is either refused with PathProblem or resolves inside the folder.
Example counts are modest (about 3,500 in all) to keep CI within its time.
"""

from __future__ import annotations

import math
import re
import string

import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from aeroreview import catalogue, yamldoc
from aeroreview.paths import SAFE_PART, PathProblem, contained_file
from aeroreview.problems import InputError
from aeroreview.sheet import IMAGE_SUFFIXES, from_document
from aeroreview.units import UnitProblem, to_si
from conftest import MINIMAL, run_cli

FILE = "fuzz.yaml"
CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069]")
FAST = settings(deadline=1000, suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])


def assert_located(error: InputError) -> None:
    assert error.problems
    for problem in error.problems:
        assert problem.file == FILE and problem.line >= 1 and problem.column >= 1, problem
        text = str(problem)
        assert "\n" not in text and "\r" not in text and not CONTROL.search(text), repr(text)
        assert len(text) < 2000


def load(text: str, folder) -> None:
    """Load a sheet text; anything but success or a located InputError fails the test."""
    try:
        from_document(yamldoc.parse(text, FILE), folder)
    except InputError as error:
        assert_located(error)


KEYS = st.sampled_from(["id", "revision", "parent", "name", "features", "results", "waivers", "notes",
                        "attachments", "geometry", "reviewed", "bogus"] + [f.key for f in catalogue.FEATURES[:25]])
SCALARS = st.one_of(st.none(), st.booleans(), st.integers(), st.integers(min_value=10**300, max_value=10**400),
                    st.floats(allow_nan=True, allow_infinity=True), st.text(max_size=40),
                    st.sampled_from(["27 deg", "1 m**9**9", "1e308 m/mm", "4.8 m", "<e.g. 4 m>", "2026-13-45",
                                     "img/x.png){ onload=alert(2) }(.png", "\x1b]0;x\x07", "../../etc/passwd.png"]))
VALUES = st.recursive(SCALARS, lambda inner: st.one_of(st.lists(inner, max_size=4),
                                                       st.dictionaries(KEYS, inner, max_size=5)), max_leaves=20)


@settings(FAST, max_examples=600)
@given(st.dictionaries(KEYS, VALUES, max_size=8))
def test_generated_sheets_load_or_give_located_errors(tmp_path, data):
    base = yaml.safe_load(MINIMAL)
    load(yaml.safe_dump({**base, **data}, allow_unicode=True), tmp_path)


@settings(FAST, max_examples=600)
@given(st.integers(min_value=0, max_value=len(MINIMAL)), st.text(max_size=30),
       st.integers(min_value=0, max_value=20))
def test_mutated_sheet_text(tmp_path, position, insert, cut):
    load(MINIMAL[:position] + insert + MINIMAL[position + cut:], tmp_path)


NUMBER = st.one_of(st.integers(-10**6, 10**6).map(str), st.floats(allow_nan=False).map(repr),
                   st.sampled_from(["1e308", "9" * 400, ".5", "-0", "1e-400"]))
UNIT_WORDS = st.sampled_from(["m", "mm", "km", "deg", "rad", "turn", "%", "kg", "s", "h", "W", "kWh", "degC", "K",
                              "m^2", "m**9", "**", "^", "*", "/", " ", "9", "(", ")", "e", "inf", "nan", "µ", "²"])
UNIT_TEXT = st.one_of(st.lists(UNIT_WORDS, max_size=12).map("".join), st.text(max_size=60))


@settings(FAST, max_examples=1500)
@given(NUMBER, UNIT_TEXT, st.sampled_from(["m", "mm", "deg", "", "km/h", "m^2", "kg", "degC"]))
def test_unit_strings_read_or_refuse_quickly(number, unit, canonical):
    try:
        value = to_si(f"{number} {unit}", canonical)
    except UnitProblem as problem:
        assert problem.hint and len(str(problem)) < 400
    else:
        assert math.isfinite(value)


NAME_CHARS = st.sampled_from(list(string.ascii_letters + string.digits + "._-/\\:() {}[]<>\"'`&;=~ \n\x1b") +
                             ["..", "img/", ".png", "%2e", "\u202e"])


@settings(FAST, max_examples=800)
@given(st.lists(NAME_CHARS, max_size=20).map("".join))
def test_file_names_are_refused_or_stay_inside(tmp_path, name):
    (tmp_path / "img").mkdir(exist_ok=True)
    try:
        real = contained_file(tmp_path, name, IMAGE_SUFFIXES, "attachment")
    except PathProblem as problem:
        assert problem.hint
    else:
        assert real.is_relative_to(tmp_path.resolve()) and all(SAFE_PART.match(p) for p in name.split("/"))


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.dictionaries(KEYS, VALUES, max_size=6))
def test_cli_never_gives_an_internal_error(tmp_path, data):
    path = tmp_path / FILE
    path.write_text(yaml.safe_dump({**yaml.safe_load(MINIMAL), **data}, allow_unicode=True), encoding="utf-8")
    run = run_cli("check", path)
    assert run.code in (0, 1, 2) and "internal error" not in run.err and "Traceback" not in run.err
    for line in filter(None, run.err.splitlines()):
        assert line.startswith(f"{path}:") and re.match(rf"{re.escape(str(path))}:\d+:\d+: ", line), line
