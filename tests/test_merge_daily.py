"""A merge changes only what it must: placeholders and commented template lines are filled where
they stand, a merge that changes nothing leaves the file byte-identical, one changed value changes one
line (the files are compared with difflib), and kept values that disagree with the surface are listed."""

from __future__ import annotations

import difflib
import shutil

import pytest

from conftest import VEHICLES


@pytest.fixture
def tessel(tmp_path):
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    return folder


def _changed_lines(before: str, after: str) -> list[tuple[str, int]]:
    """(tag, line number in ``before``) of every line difflib finds changed, removed or inserted."""
    out = []
    for tag, i1, i2, j1, j2 in difflib.SequenceMatcher(None, before.splitlines(), after.splitlines()).get_opcodes():
        if tag != "equal":
            out += [(tag, n + 1) for n in range(i1, max(i2, i1 + 1))]
    return out


def test_merge_into_a_fresh_template_fills_placeholders_and_commented_lines_in_place(cli, tessel):
    sheet = tessel / "new.yaml"
    assert cli("new", "tessel", "--class", "fastback", "--revision", "r9", "-o", sheet).code == 0
    before = sheet.read_text(encoding="utf-8")
    run = cli("measure", tessel / "surface/tessel-r2.ply", "--sheet", sheet)
    assert run.code == 0, run.err
    after = sheet.read_text(encoding="utf-8")
    assert len(after.splitlines()) == len(before.splitlines())  # nothing appended at the end
    old_lines = before.splitlines()
    for tag, number in _changed_lines(before, after):
        assert tag == "replace", (tag, old_lines[number - 1])
        line = old_lines[number - 1]
        assert ": <e.g." in line or line.lstrip().startswith("# "), line  # a placeholder or a commented line
    new_lines = after.splitlines()
    length = next(i for i, line in enumerate(old_lines) if line.startswith("  dimensions.length:"))
    assert new_lines[length].startswith("  dimensions.length: {value: 4.87 m, source: measured from tessel-r2.ply")
    screen = next(i for i, line in enumerate(old_lines) if line.startswith("  # windshield.angle:"))
    assert new_lines[screen].startswith("  windshield.angle: {value: 27 deg") and "# deg; typical" in new_lines[screen]
    assert "<e.g. 4.7 m>" not in after and "# windshield.angle:" not in after
    assert "filled 13 template lines" in run.err


def test_a_merge_that_changes_nothing_leaves_the_file_byte_identical(cli, tessel):
    sheet = tessel / "r2.yaml"
    before = sheet.read_bytes()
    run = cli("measure", tessel / "surface/tessel-r2.ply", "--sheet", sheet)
    assert run.code == 0 and "added 0, filled 0" in run.err, run.err
    assert sheet.read_bytes() == before


def test_a_merge_that_changes_one_value_changes_only_that_line(cli, tessel):
    sheet = tessel / "r2.yaml"
    text = sheet.read_text(encoding="utf-8")
    line = next(line for line in text.splitlines() if line.startswith("  windshield.angle:"))
    before = text.replace(line, "  windshield.angle: <e.g. 27 deg>  # from the template")
    sheet.write_text(before, encoding="utf-8")
    assert cli("measure", tessel / "surface/tessel-r2.ply", "--sheet", sheet).code == 0
    after = sheet.read_text(encoding="utf-8")
    number = before.splitlines().index("  windshield.angle: <e.g. 27 deg>  # from the template") + 1
    assert _changed_lines(before, after) == [("replace", number)]
    assert after.splitlines()[number - 1].startswith("  windshield.angle: {value: 27 deg")
    assert after.splitlines()[number - 1].endswith("# from the template")


def test_merge_lists_kept_values_that_disagree_with_the_surface(cli, tessel):
    sheet = tessel / "r2.yaml"
    text = sheet.read_text(encoding="utf-8")
    line = next(line for line in text.splitlines() if line.startswith("  rear.roof_backlight_radius:"))
    sheet.write_text(text.replace(line, "  rear.roof_backlight_radius: 10 mm"), encoding="utf-8")
    run = cli("measure", tessel / "surface/tessel-r2.ply", "--sheet", sheet)
    assert run.code == 0
    said = [line for line in run.err.splitlines() if "kept your rear.roof_backlight_radius" in line]
    assert said and "sheet 10 mm, surface 380 mm" in said[0], run.err
    assert not [line for line in run.err.splitlines() if "kept your windshield.angle" in line]  # agrees
