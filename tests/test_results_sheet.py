"""Results merged into a sheet: one entry added or updated with its provenance, no other line
changed (the file is diffed), and nothing written on bad input."""

from __future__ import annotations

import difflib
import shutil

import pytest

from aeroreview.sheet import load_sheet
from conftest import VEHICLES


@pytest.fixture
def tessel(tmp_path):
    folder = tmp_path / "tessel"
    shutil.copytree(VEHICLES / "tessel", folder)
    return folder


def changed_lines(before: str, after: str) -> list[str]:
    return [line for line in difflib.ndiff(before.splitlines(), after.splitlines()) if line[:2] in ("- ", "+ ")]


def test_history_and_surface_merge_changing_no_other_line(tessel, cli):
    sheet = tessel / "r2.yaml"
    before = sheet.read_text()
    assert cli("results", "history", tessel / "cfd" / "tessel-r2-forces.dat", "--sheet", sheet).code == 0
    assert cli("results", "surface", tessel / "cfd" / "tessel-r2-surface.vtu", "--sheet", sheet).code == 0
    after = sheet.read_text()
    changes = changed_lines(before, after)
    assert all(line.startswith("+ ") for line in changes)  # only added lines: nothing the user wrote changed
    assert after.startswith(before.rstrip("\n").rsplit("\ngeometry:", 1)[0].split("\nnotes:", 1)[0])
    results = load_sheet(sheet).results
    history, field = results[-2], results[-1]
    assert history.cd == pytest.approx(0.232, abs=5e-4) and history.settled_from > 0 \
        and dict((k, e) for k, e, _ in history.convergence)["cd"] < 5e-4
    assert [f[2] for f in history.files] == ["history"] and len(history.files[0][1]) == 64
    assert field.cd == pytest.approx(0.232, abs=1e-4) and field.cl_rear == pytest.approx(0.04, abs=1e-3)
    assert [f[2] for f in field.files] == ["surface", "buildup"]
    assert (tessel / "cfd" / "tessel-r2-surface-buildup.csv").read_text().startswith("# drag and lift build-up")


def test_same_file_updates_its_entry(tessel, cli):
    sheet = tessel / "r2.yaml"
    path = tessel / "cfd" / "tessel-r2-forces.dat"
    cli("results", "history", path, "--sheet", sheet)
    once = sheet.read_text()
    assert cli("results", "history", path, "--sheet", sheet).code == 0
    assert sheet.read_text() == once  # the same file updates the same entry, with the same values


@pytest.mark.parametrize("make, message", [
    (lambda t: (t / "cfd" / "bad.dat").write_text("# Iter Cd\n1 0.3\n2 x\n"), "is not a number"),
    (lambda t: (t / "cfd" / "short.dat").write_text("# Iter Cd\n1 0.3\n2 0.3\n"), "MSER-5 needs"),
])
def test_bad_input_writes_nothing(tessel, cli, make, message):
    make(tessel)
    sheet = tessel / "r2.yaml"
    before = sheet.read_bytes()
    name = "bad.dat" if "number" in message else "short.dat"
    run = cli("results", "history", tessel / "cfd" / name, "--sheet", sheet)
    assert run.code == 2 and message in run.err and sheet.read_bytes() == before


def test_file_outside_the_sheet_folder_is_refused(tessel, tmp_path, cli):
    outside = tmp_path / "forces.dat"
    shutil.copy(tessel / "cfd" / "tessel-r2-forces.dat", outside)
    sheet = tessel / "r2.yaml"
    before = sheet.read_bytes()
    run = cli("results", "history", outside, "--sheet", sheet)
    assert run.code == 2 and "inside its own folder" in run.err and sheet.read_bytes() == before
    (tessel / "cfd" / "link.dat").symlink_to(outside)
    run = cli("results", "history", tessel / "cfd" / "link.dat", "--sheet", sheet)
    assert run.code == 2 and "leaves the sheet's folder" in run.err and sheet.read_bytes() == before
