"""Hostile values get a located error quickly, never a hang, a crash or a raw terminal escape.

Every input here is one of the cases issue 14's attack found (unit strings that hung pint,
integers that overflowed, YAML tags that crashed PyYAML's constructors, control characters
reaching the terminal).
"""

from __future__ import annotations

import time

import pytest

from aeroreview.problems import Problem
from conftest import MINIMAL
from test_sheet_errors import located


def with_length(value: str) -> str:
    return MINIMAL.replace("dimensions.length: 4.8 m", f"dimensions.length: {value}")


@pytest.mark.parametrize("value", ['"1 m**9**9**9"', '"1 turn**9**10"', '"1 m^2^2"', '"1 m**99"',
                                   '"1 ' + "m*" * 40 + 'm"', '"1 ' + "m" * 900_000 + '"'])
def test_unit_strings_answer_within_a_second_with_a_located_error(cli, write_sheet, value):
    path = write_sheet(with_length(value))
    started = time.perf_counter()
    run = cli("check", path)
    assert time.perf_counter() - started < 1.0
    assert located(run, path, "dimensions.length") == (5, 22)
    assert max(len(line) for line in run.err.splitlines()) < 600  # the 900 KB string is not repeated


def test_ordinary_units_still_read(cli, write_sheet):
    path = write_sheet(with_length('"4800 mm"') + "  dimensions.frontal_area: 2.2 m²\n  mass.front_axle_share: 52 %\n")
    assert cli("check", path).code in (0, 1)


@pytest.mark.parametrize("value, needle", [("9" * 400, "too large"), ('"1e308 km"', "too large")])
def test_huge_numbers_are_located(cli, write_sheet, value, needle):
    path = write_sheet(with_length(value))
    assert located(cli("check", path), path, needle) == (5, 22)


def test_huge_number_in_a_whole_number_feature(cli, write_sheet):
    path = write_sheet(MINIMAL + '  underbody.diffuser_exposed_parts: "1e308 m/mm"\n')
    assert located(cli("check", path), path, "too large") == (10, 37)


def test_huge_integer_as_geometry_ground(cli, write_sheet):
    path = write_sheet(MINIMAL + "geometry:\n  file: body.stl\n  ground: " + "9" * 400 + "\n")
    (path.parent / "body.stl").write_text("solid x\nendsolid x\n")
    assert located(cli("check", path), path, "geometry ground must be a number") == (12, 11)


@pytest.mark.parametrize("text, needle", [("!!timestamp nope", "cannot read 'nope' as a YAML timestamp"),
                                          ("!!bool maybe", "cannot read 'maybe' as a YAML bool"),
                                          ("!!binary aGk=", "does not use the YAML tag '!!binary'"),
                                          ("!!python/name:os.system x", "does not use the YAML tag"),
                                          ("!local x", "does not use the YAML tag '!local'")])
def test_explicit_tags_are_refused_with_a_location(cli, write_sheet, text, needle):
    path = write_sheet(MINIMAL.replace("id: test-car", f"id: test-car\nname: {text}"))
    assert located(cli("check", path), path, needle) == (2, 7)


def test_a_set_is_refused(cli, write_sheet):
    path = write_sheet(MINIMAL + "notes: !!set {a, b}\n")
    assert located(cli("check", path), path, "'!!set'") == (10, 8)


def test_control_characters_never_reach_the_terminal(cli, write_sheet):
    path = write_sheet(MINIMAL.replace("id: test-car", 'id: "\\e]0;pwned\\a\\e[2J"'))
    run = cli("check", path)
    assert located(run, path, "must be a safe slug") == (1, 5)
    assert "\x1b" not in run.err and "\x07" not in run.err
    assert "\\x1b]0;pwned\\x07\\x1b[2J" in run.err


def test_bidirectional_overrides_are_shown_escaped():
    assert "\\u202e" in str(Problem("f", 1, 1, "got 'abc\u202edef'"))


def test_multi_line_library_messages_are_one_line():
    problem = Problem("f.yaml", 3, 4, "while scanning\n  a simple key\nin line 3", "hint\r\nmore")
    assert str(problem) == "f.yaml:3:4: while scanning a simple key in line 3; hint more"


def test_every_yaml_error_is_one_located_line(cli, write_sheet):
    for text in ("a: b: c\n", "key: [1, 2\n", "- a\nb: c\n", "a: &x 1\nb: *y\n", "? [a, b]\n: c\n", "\t- x\n",
                 "[" * 5000 + "\n"):
        path = write_sheet(text, "bad.yaml")
        run = cli("check", path)
        assert run.code == 2 and "internal error" not in run.err and "Traceback" not in run.err, text
        assert all(line.startswith(f"{path}:") for line in run.err.splitlines() if line), (text, run.err)


def test_one_bad_sheet_does_not_hide_the_others(tmp_path):
    """`check vehicles/ bad.yaml`: every other sheet's review, and the bad file's located errors."""
    import json
    import shutil

    from conftest import VEHICLES, run_cli

    fleet = shutil.copytree(VEHICLES, tmp_path / "vehicles")
    bad, unreadable = tmp_path / "bad.yaml", tmp_path / "unreadable.yaml"
    bad.write_text(MINIMAL.replace("4.8 m", '"1 m**9**9**9"') + "  mass.front_axle_share: " + "9" * 400 + "\n")
    unreadable.write_text(MINIMAL.replace("id: test-car", "id: test-car\nname: !!timestamp nope"))
    run = run_cli("check", fleet, bad, unreadable, fleet / "tessel/r1.yaml")  # the same sheet twice is read once
    assert run.code == 2
    for label in ("tessel@r1", "tessel@r2", "quillon@r1", "quillon@r2", "dravik@r1", "dravik@r2"):
        assert label in run.out, label
    assert located(run, bad, "dimensions.length") == (5, 22)
    assert located(run, bad, "too large") == (10, 26)
    assert located(run, unreadable, "as a YAML timestamp") == (2, 7)
    assert "defined twice" not in run.err
    data = json.loads(run_cli("check", fleet, bad, "--format", "json").out)
    assert len(data["sheets"]) == 6 and {e["file"] for e in data["errors"]} == {str(bad)}


def test_control_characters_in_report_text_are_escaped(cli, write_sheet):
    """A waiver reason is printed in the text report: it must not drive the terminal either."""
    path = write_sheet(MINIMAL + '  rear.backlight_angle: 30 deg\n'
                       'waivers:\n  - {rule: rear.backlight-angle, reason: "ok \\e]0;pwned\\a\\e[2J"}\n')
    run = cli("check", path)
    assert "waived: ok \\x1b]0;pwned\\x07\\x1b[2J" in run.out  # shown, escaped
    assert "\x1b" not in run.out + run.err and "\x07" not in run.out + run.err
