"""Property tests (hypothesis): no input, however broken, produces a traceback.

Every document either loads as a sheet or raises InputError whose problems all carry a
file, a line >= 1 and a column >= 1.
"""

from __future__ import annotations

from pathlib import Path

import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from aeroreview import catalogue, yamldoc
from aeroreview.problems import InputError
from aeroreview.sheet import from_document
from conftest import DEMO_SHEETS

KEYS = st.sampled_from(["id", "revision", "parent", "features", "results", "waivers", "notes",
                        "attachments", "name", *[f.key for f in catalogue.FEATURES]])
SCALARS = st.one_of(st.none(), st.booleans(), st.integers(-10**6, 10**6), st.floats(allow_nan=True),
                    st.text(max_size=20), st.sampled_from(["27 deg", "180 mm", "2.2 m^2", "1e400 m", "5 furlong"]))
VALUES = st.recursive(SCALARS, lambda inner: st.one_of(st.lists(inner, max_size=4),
                                                       st.dictionaries(st.one_of(KEYS, st.text(max_size=8)), inner, max_size=5)),
                      max_leaves=25)


def outcome(text: str, folder: Path) -> None:
    try:
        from_document(yamldoc.parse(text, "prop.yaml"), folder)
    except InputError as error:
        assert error.problems
        for problem in error.problems:
            assert problem.file == "prop.yaml" and problem.line >= 1 and problem.column >= 1
            assert problem.message


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(VALUES)
def test_random_yaml_documents_never_crash(tmp_path_factory, value):
    outcome(yaml.safe_dump(value, allow_unicode=True), tmp_path_factory.mktemp("p"))


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=200))
def test_random_text_never_crashes(tmp_path_factory, text):
    outcome(text, tmp_path_factory.mktemp("t"))


@settings(max_examples=300, deadline=None)
@given(st.sampled_from(DEMO_SHEETS), st.integers(0, 10**6), st.sampled_from(["delete", "insert", "swap", "dup"]),
       st.text(min_size=1, max_size=6))
def test_mutated_demo_sheets_never_crash(path, position, action, junk):
    text = path.read_text(encoding="utf-8")
    lines = text.splitlines(keepends=True)
    at = position % len(text)
    row = position % len(lines)
    if action == "delete":
        text = text[:at] + text[at + len(junk):]
    elif action == "insert":
        text = text[:at] + junk + text[at:]
    elif action == "swap":
        lines[row], lines[-1 - row] = lines[-1 - row], lines[row]
        text = "".join(lines)
    else:
        text = "".join(lines[: row + 1] + lines[row:])
    outcome(text, path.parent)
