"""Files a sheet names stay inside the sheet's folder (links resolved) and have plain names.

The attack cases come from issue 14 (links to /proc/self/environ and /etc/passwd, a linked
folder, a linked geometry file, a file name carrying attr_list markup).
"""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from aeroreview.paths import PathProblem, contained_file
from conftest import MINIMAL, run_cli
from site_helpers import build, copy_knowledge_base
from test_sheet_errors import located

SECRET = "TOP-SECRET-TOKEN-0451"


@pytest.fixture
def outside(tmp_path) -> Path:
    """A file outside the knowledge base, with a secret in it."""
    folder = tmp_path / "elsewhere"
    folder.mkdir()
    (folder / "secret.png").write_text(SECRET)
    (folder / "secret.ply").write_text(SECRET)
    return folder


def sheet_with(kb: Path, section: str) -> Path:
    path = kb / "car" / "r1.yaml"
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(MINIMAL + section, encoding="utf-8")
    return path


def test_link_to_a_file_outside_is_refused(tmp_path, outside):
    sheet = sheet_with(tmp_path / "kb", "attachments:\n  - {file: img/env.png, zone: rear}\n")
    (sheet.parent / "img").mkdir()
    (sheet.parent / "img/env.png").symlink_to(outside / "secret.png")
    assert located(run_cli("check", sheet), sheet, "'img/env.png' is a link that leaves the sheet's folder") == (11, 12)


@pytest.mark.parametrize("target", ["/proc/self/environ", "/etc/passwd"])
def test_link_to_system_files_is_refused(tmp_path, target):
    sheet = sheet_with(tmp_path / "kb", "attachments:\n  - {file: env.png, zone: rear}\n")
    (sheet.parent / "env.png").symlink_to(target)
    assert located(run_cli("check", sheet), sheet, "is a link that leaves the sheet's folder") == (11, 12)


def test_linked_folder_is_refused(tmp_path, outside):
    sheet = sheet_with(tmp_path / "kb", "attachments:\n  - {file: img/secret.png, zone: rear}\n")
    (sheet.parent / "img").symlink_to(outside, target_is_directory=True)
    assert located(run_cli("check", sheet), sheet, "leaves the sheet's folder") == (11, 12)


def test_linked_geometry_is_refused(tmp_path, outside):
    sheet = sheet_with(tmp_path / "kb", "geometry:\n  file: body.ply\n")
    (sheet.parent / "body.ply").symlink_to(outside / "secret.ply")
    assert located(run_cli("check", sheet), sheet, "surface 'body.ply' is a link that leaves") == (11, 9)


def test_link_inside_the_folder_is_fine(tmp_path):
    folder = tmp_path / "kb"
    (folder / "img").mkdir(parents=True)
    (folder / "img/real.png").write_bytes(b"\x89PNG")
    (folder / "alias.png").symlink_to(folder / "img/real.png")
    assert contained_file(folder, "alias.png", (".png",)) == (folder / "img/real.png").resolve()


@pytest.mark.parametrize("name", ["img/x.png){ onload=alert(2) }(.png", "a b.png", "x\".png", "<x>.png",
                                  ".hidden.png", "img/x\n.png", "x`.png", "x&y.png"])
def test_unsafe_file_names_are_refused(tmp_path, name):
    with pytest.raises(PathProblem, match="unsafe name"):
        contained_file(tmp_path, name, (".png",), "attachment")


def test_unsafe_file_name_in_a_sheet_is_located(tmp_path):
    sheet = sheet_with(tmp_path / "kb", "attachments:\n  - {file: 'img/x.png){ onload=alert(2) }(.png', zone: rear}\n")
    assert located(run_cli("check", sheet), sheet, "has an unsafe name") == (11, 12)


def test_site_build_publishes_nothing_from_outside(tmp_path, outside):
    kb = copy_knowledge_base(tmp_path / "kb")
    sheet = kb / "vehicles/tessel/r1.yaml"
    image = kb / "vehicles/tessel/img/r1-roof-end.png"
    image.unlink()
    image.symlink_to(outside / "secret.png")
    run = run_cli("site", "build", "--config", kb / "mkdocs.yml", "--output", tmp_path / "out")
    assert run.code == 2
    line = sheet.read_text(encoding="utf-8").splitlines().index("  - file: img/r1-roof-end.png") + 1
    assert f"{sheet}:{line}:" in run.err and "leaves the sheet's folder" in run.err
    published = [p for p in tmp_path.rglob("*") if p.is_file() and not p.is_symlink() and outside not in p.parents]
    assert not any(SECRET in p.read_text(errors="replace") for p in published)
    assert not (tmp_path / "out").exists()


def test_environment_never_reaches_a_built_site(tmp_path, monkeypatch):
    """A link to the build's environment, as in CI where secrets sit there."""
    monkeypatch.setenv("AEROREVIEW_TEST_SECRET", SECRET)
    kb = copy_knowledge_base(tmp_path / "kb")
    image = kb / "vehicles/tessel/img/r1-roof-end.png"
    image.unlink()
    image.symlink_to(f"/proc/{os.getpid()}/environ")
    run = run_cli("site", "build", "--config", kb / "mkdocs.yml", "--output", tmp_path / "out")
    assert run.code == 2 and "leaves the sheet's folder" in run.err
    assert not (tmp_path / "out").exists()
