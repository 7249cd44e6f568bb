"""Commands that edit a sheet keep what the user made (issue 14, item 11).

The attack found: a comment inside a flow mapping lost, a CRLF sheet back with mixed line
endings, a BOM dropped, a symlinked sheet replaced by a regular file while the real sheet
stayed unchanged, the mode changed from 0600 to 0644. :func:`edit_sheet` is the one path
every sheet-editing command takes; these tests drive it directly and through ``measure``.
"""

from __future__ import annotations

import codecs
import difflib
import os
import shutil

import pytest

from aeroreview.problems import InputError
from aeroreview.sheetedit import edit_sheet
from conftest import DEMO_SHEETS, MINIMAL, VEHICLES, run_cli
from test_sheet_errors import located

SHEET = MINIMAL.replace("features:\n", "# header comment\nfeatures:   # features follow\n") + \
    "  rear.backlight_angle: 24 deg   # typed by hand\nattachments: []\nnotes: |\n  a # in a block\n"


def add_hood_angle(data):
    data["features"]["front.hood_angle"] = "11 deg"
    return {"added": 1}, False


def test_only_the_added_line_changes(tmp_path):
    """Round trip of every demo sheet: the edit inserts one line and touches no other."""
    for sheet in DEMO_SHEETS:
        text = "".join(line for line in sheet.read_text(encoding="utf-8").splitlines(keepends=True)
                       if not line.startswith("  front.hood_angle:"))
        copy = tmp_path / sheet.parent.name / sheet.name
        shutil.copytree(sheet.parent, copy.parent, dirs_exist_ok=True)
        copy.write_text(text, encoding="utf-8")
        edit_sheet(copy, add_hood_angle)
        after = copy.read_text(encoding="utf-8")
        changes = [line for line in difflib.ndiff(text.splitlines(), after.splitlines()) if line[:1] in "+-"]
        assert changes == ["+   front.hood_angle: 11 deg"], (sheet, changes)


def test_crlf_and_bom_are_kept(tmp_path):
    path = tmp_path / "sheet.yaml"
    path.write_bytes(codecs.BOM_UTF8 + SHEET.replace("\n", "\r\n").encode())
    edit_sheet(path, add_hood_angle)
    raw = path.read_bytes()
    assert raw.startswith(codecs.BOM_UTF8)
    assert raw.count(b"\n") == raw.count(b"\r\n") and b"front.hood_angle: 11 deg\r\n" in raw


def test_mixed_line_endings_are_refused(tmp_path):
    path = tmp_path / "sheet.yaml"
    path.write_bytes(SHEET.replace("\n", "\r\n", 3).encode())
    before = path.read_bytes()
    with pytest.raises(InputError, match="mixes line endings"):
        edit_sheet(path, add_hood_angle)
    assert path.read_bytes() == before


def test_mode_is_kept(tmp_path):
    path = tmp_path / "sheet.yaml"
    path.write_text(SHEET, encoding="utf-8")
    os.chmod(path, 0o600)
    edit_sheet(path, add_hood_angle)
    assert path.stat().st_mode & 0o777 == 0o600


def test_a_linked_sheet_stays_a_link_and_its_target_is_edited(tmp_path):
    real = tmp_path / "store/r1.yaml"
    real.parent.mkdir()
    real.write_text(SHEET, encoding="utf-8")
    link = tmp_path / "r1.yaml"
    link.symlink_to(real)
    edit_sheet(link, add_hood_angle)
    assert link.is_symlink() and link.resolve() == real.resolve()
    assert "front.hood_angle: 11 deg" in real.read_text(encoding="utf-8")
    assert not list(tmp_path.rglob("*.tmp"))


def test_every_comment_is_kept():
    import tempfile
    from pathlib import Path

    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "sheet.yaml"
        path.write_text(SHEET, encoding="utf-8")
        edit_sheet(path, add_hood_angle)
        after = path.read_text(encoding="utf-8")
    for comment in ("# header comment", "# features follow", "# typed by hand", "a # in a block"):
        assert comment in after, comment


def test_a_comment_the_library_would_drop_refuses_the_edit(tmp_path):
    path = tmp_path / "sheet.yaml"
    text = MINIMAL.replace("  vehicle.class: sedan\n", "") + \
        "  dimensions.frontal_area: {value: 2.2 m^2,   # read off the drawing\n    source: drawing}\n" + \
        "  vehicle.class: sedan\n"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError) as refused:
        edit_sheet(path, add_hood_angle)
    problem = refused.value.problems[0]
    assert problem.line == 9 and "would lose the comment '# read off the drawing'" in problem.message
    assert path.read_text(encoding="utf-8") == text


def test_duplicate_key_is_located_at_the_second_key_in_our_words(tmp_path):
    path = tmp_path / "sheet.yaml"
    path.write_text(MINIMAL + "  dimensions.width: 1.9 m\n", encoding="utf-8")
    run = run_cli("measure", VEHICLES / "tessel/surface/tessel-r2.ply", "--ground", "0", "--sheet", path)
    assert located(run, path, "key 'dimensions.width' appears twice") == (10, 3)
    assert "ruamel" not in run.err and "http" not in run.err


def test_measure_into_a_linked_crlf_sheet(tmp_path):
    real = tmp_path / "store/sheet.yaml"
    real.parent.mkdir()
    real.write_bytes(SHEET.replace("\n", "\r\n").encode())
    os.chmod(real, 0o600)
    link = tmp_path / "sheet.yaml"
    link.symlink_to(real)
    run = run_cli("measure", VEHICLES / "tessel/surface/tessel-r2.ply", "--ground", "0", "--sheet", link)
    assert run.code == 0, run.err
    raw = real.read_bytes()
    assert link.is_symlink() and b"windshield.angle: {value: 27 deg" in raw
    assert raw.count(b"\n") == raw.count(b"\r\n") and real.stat().st_mode & 0o777 == 0o600
