"""A site build never deletes what it did not make, and always leaves a complete site.

Cases from issue 14 (items 9 and 10): ``--output vehicles`` deleted every sheet; a kill
between the swap's renames left no site; killed builds left ``.aeroreview-build-*``
folders; the output was 0700; two concurrent builds failed on a fixed temporary name.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
import time
from pathlib import Path

import pytest

from aeroreview.site.output import MARKER
from conftest import MINIMAL, ROOT, run_cli

KILL_POINTS = ("built", "exchanged", "aside", "placed")


def tiny_kb(folder: Path) -> Path:
    """A knowledge base with one small sheet: the real mkdocs.yml and site_src, fast to build."""
    folder.mkdir(parents=True, exist_ok=True)
    shutil.copy(ROOT / "mkdocs.yml", folder / "mkdocs.yml")
    shutil.copytree(ROOT / "site_src", folder / "site_src")
    shutil.copytree(ROOT / "studies", folder / "studies")  # the calibrations mkdocs.yml names
    (folder / "vehicles/test-car").mkdir(parents=True)
    (folder / "vehicles/test-car/r1.yaml").write_text(MINIMAL, encoding="utf-8")
    return folder


def site_build(kb: Path, output: Path | str | None = None):
    args = ["site", "build", "--config", kb / "mkdocs.yml"] + (["--output", output] if output else [])
    return run_cli(*args)


def snapshot(folder: Path) -> dict:
    return {p.relative_to(folder): p.read_bytes() for p in folder.rglob("*") if p.is_file()}


def complete(site: Path) -> bool:
    return (site / "index.html").is_file() and (site / "fleet/test-car/r1.html").is_file() and \
        (site / MARKER).is_file()


@pytest.fixture
def kb(tmp_path):
    return tiny_kb(tmp_path / "kb")


@pytest.mark.parametrize("output", ["vehicles", "vehicles/test-car", "site_src", "site_src/x", ".", ".."])
def test_output_overlapping_the_sources_is_refused_and_deletes_nothing(kb, output):
    before = snapshot(kb)
    run = site_build(kb, kb / output)
    assert run.code == 2 and ("refusing" in run.err or "should not be within" in run.err), run.err  # ours or MkDocs'

    assert snapshot(kb) == before


def test_default_site_folder_is_allowed(kb):
    run = site_build(kb)
    assert run.code == 0, run.err
    assert complete(kb / "site")


def test_foreign_non_empty_folder_is_not_replaced(kb, tmp_path):
    (tmp_path / "mine").mkdir()
    (tmp_path / "mine/thesis.tex").write_text("years of work")
    run = site_build(kb, tmp_path / "mine")
    assert run.code == 2 and f"no {MARKER} file" in run.err
    assert (tmp_path / "mine/thesis.tex").read_text() == "years of work"
    (tmp_path / "empty").mkdir()
    assert site_build(kb, tmp_path / "empty").code == 0  # an empty folder is fine
    assert site_build(kb, tmp_path / "empty").code == 0  # and so is our own site


def test_output_has_the_users_umask(kb, tmp_path):
    old = os.umask(0o022)
    try:
        assert site_build(kb, tmp_path / "out").code == 0
    finally:
        os.umask(old)
    assert (tmp_path / "out").stat().st_mode & 0o777 == 0o755
    assert (tmp_path / "out/index.html").stat().st_mode & 0o777 == 0o644


KILLED_BUILD = """
import os, signal, sys
from aeroreview.site import output
from aeroreview.site.build import build_site

stage, exchange = sys.argv[1], sys.argv[2] == "exchange"
if not exchange:
    output.Output.exchange = staticmethod(lambda a, b: False)
def reached(name):
    if name == stage:
        os.kill(os.getpid(), signal.SIGKILL)
output._reached = reached
build_site(sys.argv[3], sys.argv[4])
"""


def settled_names(folder: Path) -> list[str]:
    """The build's names left beside the output once the detached removal of the old site is done
    (it runs after the command returned; give it up to 20 s on a loaded machine)."""
    for _ in range(200):
        names = sorted(p.name for p in folder.glob(".out.aeroreview-*"))
        if names == [".out.aeroreview-lock"]:
            break
        time.sleep(0.1)
    return names


def killed_build(kb: Path, out: Path, stage: str, exchange: bool) -> int:
    done = subprocess.run([sys.executable, "-c", KILLED_BUILD, stage, "exchange" if exchange else "renames",
                           str(kb / "mkdocs.yml"), str(out)], capture_output=True, text=True, timeout=300)
    return done.returncode


@pytest.mark.parametrize("exchange", [True, False], ids=["exchange", "two-renames"])
def test_a_build_killed_at_each_stage_of_the_swap_leaves_a_complete_site(kb, tmp_path, exchange):
    out = tmp_path / "out"
    assert site_build(kb, out).code == 0
    stages = ("built", "exchanged") if exchange else ("built", "aside", "placed")
    for stage in stages:
        assert killed_build(kb, out, stage, exchange) == -9, stage  # really killed there
        if exchange or stage != "aside":
            assert complete(out), stage  # at every instant, old or new
        leftovers = list(tmp_path.glob(".out.aeroreview-*"))
        assert any(p.name.startswith(".out.aeroreview-build-") or "-old-" in p.name for p in leftovers)
        run = site_build(kb, out)  # the next build repairs and cleans up
        assert run.code == 0, run.err
        assert complete(out), stage
        assert settled_names(tmp_path) == [".out.aeroreview-lock"], stage


@pytest.mark.parametrize("exchange", [True, False], ids=["exchange", "two-renames"])
def test_the_old_site_is_removed_after_the_swap(kb, tmp_path, exchange):
    """The swapped-out site goes to a detached removal under a leftover name; nothing stays behind."""
    out = tmp_path / "out"
    assert site_build(kb, out).code == 0
    (out / "from-the-old-build.txt").write_text("old")
    assert killed_build(kb, out, "never", exchange) == 0  # a whole build, through exchange or two renames
    assert complete(out) and not (out / "from-the-old-build.txt").exists()
    assert settled_names(tmp_path) == [".out.aeroreview-lock"]
    assert not any("from-the-old-build.txt" in p.name for p in tmp_path.rglob("*"))


def test_kill_between_the_renames_is_repaired_before_anything_else(kb, tmp_path):
    """With two renames the path is empty for an instant; the next build's start puts the old site back."""
    from aeroreview.site.output import Output

    out = tmp_path / "out"
    assert site_build(kb, out).code == 0
    assert killed_build(kb, out, "aside", exchange=False) == -9
    assert not out.exists()
    claim = Output(out)
    claim.begin()  # repair happens here, before a single page is written
    assert complete(out)
    claim.abandon()


def test_leftovers_of_earlier_versions_are_cleaned(kb, tmp_path):
    for name in (".aeroreview-build-abc123", ".out.old"):
        (tmp_path / name).mkdir()
        (tmp_path / name / "index.html").write_text("stale")
    assert site_build(kb, tmp_path / "out").code == 0
    assert not (tmp_path / ".aeroreview-build-abc123").exists() and not (tmp_path / ".out.old").exists()


def test_two_concurrent_builds_into_one_folder_both_succeed(kb, tmp_path):
    out = tmp_path / "out"
    command = [sys.executable, "-m", "aeroreview", "site", "build", "--config", str(kb / "mkdocs.yml"),
               "--output", str(out)]
    builds = [subprocess.Popen(command, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True) for _ in range(2)]
    results = [b.communicate(timeout=300) + (b.returncode,) for b in builds]
    assert [code for _, _, code in results] == [0, 0], results
    assert complete(out)
    assert settled_names(tmp_path) == [".out.aeroreview-lock"]


def test_plain_mkdocs_build_refuses_the_sheets_folder(kb):
    before = snapshot(kb)
    done = subprocess.run([sys.executable, "-m", "mkdocs", "build", "--site-dir", str(kb / "vehicles")], cwd=kb,
                          capture_output=True, text=True, timeout=300, env={**os.environ, "NO_MKDOCS_2_WARNING": "1"})
    assert done.returncode != 0 and "refusing" in done.stderr
    assert snapshot(kb) == before
