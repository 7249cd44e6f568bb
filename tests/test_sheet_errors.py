"""Every kind of bad input gets exit code 2 and a located message (file:line:col: what; hint)."""

from __future__ import annotations

import re

import pytest

from conftest import MINIMAL

LOCATED = re.compile(r"^(?P<file>[^\n]+?):(?P<line>\d+):(?P<col>\d+): (?P<msg>.+)$", re.M)


def located(run, file, needle):
    """The (line, col) of the first error message containing ``needle`` for ``file``."""
    assert run.code == 2, (run.code, run.out, run.err)
    assert "Traceback" not in run.err
    for match in LOCATED.finditer(run.err):
        if match["file"] == str(file) and needle in match["msg"]:
            return int(match["line"]), int(match["col"])
    raise AssertionError(f"no located error with {needle!r} in:\n{run.err}")


def replace(old: str, new: str) -> str:
    assert old in MINIMAL
    return MINIMAL.replace(old, new)


def test_minimal_sheet_is_valid(cli, write_sheet):
    run = cli("check", write_sheet(MINIMAL))
    assert run.code == 0, run.err
    assert "1 revision(s) reviewed" in run.out


def test_yaml_syntax_error(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: [27 deg\n")
    assert located(cli("check", path), path, "YAML syntax error") == (11, 1)


def test_top_level_not_a_mapping(cli, write_sheet):
    path = write_sheet("- just\n- a list\n")
    assert located(cli("check", path), path, "top level of a sheet must be a mapping") == (1, 1)


def test_unknown_feature_with_suggestion(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlite_angle: 27 deg\n")
    run = cli("check", path)
    assert located(run, path, "unknown feature 'rear.backlite_angle'") == (10, 3)
    assert "did you mean 'rear.backlight_angle'?" in run.err


def test_unknown_top_level_key_with_suggestion(cli, write_sheet):
    path = write_sheet(MINIMAL + "note: hello\n")
    run = cli("check", path)
    assert located(run, path, "unknown key 'note'") == (10, 1)
    assert "did you mean 'notes'?" in run.err


def test_wrong_type(cli, write_sheet):
    path = write_sheet(MINIMAL + "  wheels.rear_strakes: 3\n")
    assert located(cli("check", path), path, "must be true or false") == (10, 24)


def test_wrong_type_for_quantity(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: [27]\n")
    assert located(cli("check", path), path, "expected a number or a string with a unit")


def test_unparseable_unit(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: 27 degreez\n")
    run = cli("check", path)
    assert located(run, path, "unknown unit 'degreez'") == (10, 25)


def test_unit_of_wrong_dimension(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: 27 mm\n")
    run = cli("check", path)
    assert located(run, path, "'mm' is not a unit of angle")
    assert "write it in deg" in run.err


def test_percent_is_not_an_angle(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: 27 %\n")
    assert located(cli("check", path), path, "not a unit of angle")


def test_outside_physical_bounds(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: 120 deg\n")
    assert located(cli("check", path), path, "physically impossible")


def test_negative_length(cli, write_sheet):
    path = write_sheet(replace("dimensions.length: 4.8 m", "dimensions.length: -4.8 m"))
    assert located(cli("check", path), path, "'dimensions.length' = -4.8 m is physically impossible") == (5, 22)


def test_frontal_area_larger_than_width_times_height(cli, write_sheet):
    path = write_sheet(MINIMAL + "  dimensions.frontal_area: 2.9 m^2\n")
    run = cli("check", path)
    assert located(run, path, "larger than width x height") == (10, 28)


def test_wheelbase_longer_than_length(cli, write_sheet):
    path = write_sheet(MINIMAL + "  dimensions.wheelbase: 5.2 m\n")
    assert located(cli("check", path), path, "wheelbase 5.2 m is not shorter than the length 4.8 m")


def test_all_errors_are_collected(cli, write_sheet):
    path = write_sheet(MINIMAL + "  rear.backlight_angle: 27 mm\n  wheels.rim_openness: 2\n  bogus.key: 1\n")
    run = cli("check", path)
    assert run.code == 2
    assert len([m for m in LOCATED.finditer(run.err) if m["file"] == str(path)]) == 3


def test_duplicate_vehicle_revision_in_fleet(cli, write_sheet):
    first = write_sheet(MINIMAL, "a.yaml")
    second = write_sheet(MINIMAL, "b.yaml")
    run = cli("check", first.parent)
    assert located(run, second, "test-car@r1 is defined twice") == (2, 1)
    assert str(first) in run.err


def test_parent_revision_that_does_not_exist(cli, write_sheet):
    path = write_sheet(MINIMAL.replace("revision: r1\n", "revision: r2\nparent: r0\n"))
    assert located(cli("check", path), path, "parent revision 'r0' of test-car does not exist") == (3, 1)


def test_parent_beside_a_single_checked_file_is_found(cli, write_sheet):
    write_sheet(MINIMAL, "r1.yaml")
    child = write_sheet(MINIMAL.replace("revision: r1\n", "revision: r2\nparent: r1\n"), "r2.yaml")
    orphan = write_sheet(MINIMAL.replace("revision: r1\n", "revision: r3\nparent: r9\n"), "r3.yaml")
    assert "does not exist" not in cli("check", child).err
    run = cli("check", child, orphan)
    hint = [line for line in run.err.splitlines() if "'r9'" in line]
    assert located(run, orphan, "parent revision 'r9' of test-car does not exist") == (3, 1)
    assert "known revisions: r1, r2, r3" in hint[0], run.err


@pytest.mark.parametrize("bad_id", ["../x", "my car", "a/b", "Test", "-x", "x-", "a" * 70])
def test_vehicle_id_must_be_a_safe_slug(cli, write_sheet, bad_id):
    path = write_sheet(MINIMAL.replace("id: test-car", f"id: '{bad_id}'"))
    assert located(cli("check", path), path, "'id' must be a safe slug") in ((1, 5), (1, 1))


def test_revision_must_be_a_safe_slug(cli, write_sheet):
    path = write_sheet(MINIMAL.replace("revision: r1", "revision: ../../etc"))
    assert located(cli("check", path), path, "'revision' must be a safe slug")


def test_non_utf8_file(cli, write_sheet):
    path = write_sheet(MINIMAL.encode() + b"notes: caf\xe9\n")
    assert located(cli("check", path), path, "not valid UTF-8 (byte 0xe9)") == (10, 11)


def test_empty_file(cli, write_sheet):
    path = write_sheet("")
    assert located(cli("check", path), path, "file is empty") == (1, 1)


def test_file_over_size_limit(cli, write_sheet):
    path = write_sheet(MINIMAL + "notes: |\n" + ("  " + "x" * 98 + "\n") * 11_000)
    assert located(cli("check", path), path, "over the limit of 1,000,000")


def test_yaml_alias_bomb_is_refused(cli, write_sheet):
    """The 'billion laughs' shape: nine levels of nine aliases would expand to 9**9 values."""
    lines = ['a0: &a0 ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]']
    for level in range(1, 10):
        lines.append(f"a{level}: &a{level} [" + ", ".join([f"*a{level - 1}"] * 9) + "]")
    path = write_sheet("\n".join(lines) + "\n")
    assert located(cli("check", path), path, "expands to more than 50,000 values")


def test_recursive_alias_is_refused(cli, write_sheet):
    path = write_sheet("id: &x\n  - *x\n")
    assert located(cli("check", path), path, "")


def test_duplicate_key(cli, write_sheet):
    path = write_sheet(MINIMAL + "  dimensions.length: 4.9 m\n")
    assert located(cli("check", path), path, "appears twice") == (10, 3)


def test_missing_file(cli, tmp_path):
    run = cli("check", tmp_path / "nope.yaml")
    assert run.code == 2 and "no such file or folder" in run.err


def test_attachment_cannot_leave_the_knowledge_base(cli, write_sheet):
    path = write_sheet(MINIMAL + "attachments:\n  - {file: ../../etc/passwd.png, zone: rear, caption: x}\n")
    assert located(cli("check", path), path, "leaves the knowledge base") == (11, 12)


def test_attachment_must_exist_and_be_an_image(cli, write_sheet):
    path = write_sheet(MINIMAL + "attachments:\n  - {file: a.png, zone: rear}\n  - {file: b.txt, zone: rear}\n")
    run = cli("check", path)
    assert located(run, path, "'a.png' does not exist") == (11, 12)
    assert located(run, path, "'b.txt' is not an image") == (12, 12)


def test_waiver_needs_a_reason(cli, write_sheet):
    path = write_sheet(MINIMAL + "waivers:\n  - {rule: rear.backlight-angle}\n")
    assert located(cli("check", path), path, "'reason' is missing")


def test_typical_range_gives_a_warning_not_an_error(cli, write_sheet):
    path = write_sheet(MINIMAL + "  front.hood_angle: 25 deg\n")
    run = cli("check", path)
    assert run.code == 0
    assert f"{path}:10:21: warning: 'front.hood_angle' = 25 deg is outside the typical range" in run.err


def test_debug_shows_a_traceback_only_when_asked(cli, write_sheet):
    path = write_sheet(MINIMAL)
    run = cli("new", "x", "--class", "sedan", "-o", path)
    assert run.code == 2 and "Traceback" not in run.err
    with pytest.raises(Exception, match="already exists"):
        cli("--debug", "new", "x", "--class", "sedan", "-o", path)
