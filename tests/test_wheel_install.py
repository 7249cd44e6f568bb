"""The install users do: a built wheel, installed non-editable into a clean venv, measures.

An editable install maps ``calc/`` and ``rules/`` through a finder, so a package left out of
pyproject.toml still imports in development and fails only for users (it happened with
``aeroreview.calc.geometry``). This test builds the wheel from the working tree, installs it
into a new venv and, there, imports every module the wheel ships and runs
``aeroreview measure`` on a demo surface.

Kept fast for CI: the wheel is built without build isolation (the test venv's setuptools,
listed in the ``test`` extra) and installed with ``--no-deps --no-index``; the third-party
dependencies are not reinstalled but reused from the running interpreter's site-packages,
added to the new venv by one path line in a ``.pth`` file. Such a line only puts that folder
on ``sys.path``; the ``.pth`` files inside it, the editable finder among them, are not run,
and the new venv's own site-packages comes first, so ``aeroreview`` itself can only come
from the wheel (the test checks where it was imported from).
"""

from __future__ import annotations

import json
import os
import shutil
import site
import subprocess
import sys
import sysconfig
import tomllib
import venv
import zipfile
from pathlib import Path

import pytest

from conftest import ROOT, VEHICLES


def build_inputs() -> list[str]:
    """What setuptools reads: pyproject.toml, the readme and every folder package-dir maps."""
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    return ["pyproject.toml", config["project"]["readme"],
            *dict.fromkeys(config["tool"]["setuptools"]["package-dir"].values())]



SURFACE = VEHICLES / "tessel" / "surface" / "tessel-r2.ply"


def run(*args, **kwargs) -> subprocess.CompletedProcess:
    done = subprocess.run([str(a) for a in args], capture_output=True, text=True, timeout=600, **kwargs)
    assert done.returncode == 0, f"{' '.join(map(str, args))} failed:\n{done.stdout}\n{done.stderr}"
    return done


@pytest.fixture(scope="module")
def installed(tmp_path_factory):
    """(python of the clean venv, its site-packages, the wheel's module names)."""
    work = tmp_path_factory.mktemp("wheel")
    source = work / "source"  # a copy: a build in the repository would leave, and later reuse, build/
    source.mkdir()
    for name in build_inputs():
        if (ROOT / name).is_dir():
            shutil.copytree(ROOT / name, source / name, ignore=shutil.ignore_patterns("__pycache__"))
        else:
            shutil.copy(ROOT / name, source / name)
    run(sys.executable, "-m", "pip", "wheel", "--no-deps", "--no-build-isolation", "--no-index", "-q",
        "-w", work / "dist", source, cwd=work)
    wheel = next((work / "dist").glob("aeroreview-*.whl"))
    target = work / "venv"
    venv.EnvBuilder(with_pip=False).create(target)
    python = target / "bin" / "python"
    purelib = Path(run(python, "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])").stdout.strip())
    reused = [p for p in (*site.getsitepackages(), sysconfig.get_paths()["purelib"]) if Path(p).is_dir()]
    (purelib / "zz-reused-dependencies.pth").write_text("\n".join(dict.fromkeys(reused)) + "\n", encoding="utf-8")
    run(sys.executable, "-m", "pip", "--python", python, "install", "--no-deps", "--no-index", "-q", wheel)
    with zipfile.ZipFile(wheel) as archive:
        names = [n[:-3].replace("/", ".").removesuffix(".__init__") for n in archive.namelist() if n.endswith(".py")]
    return python, purelib, sorted(names)


def test_the_wheel_ships_calc_rules_geometry_and_the_pages(installed):
    _, _, names = installed
    assert {"aeroreview.calc.geometry.profile", "aeroreview.rules.rear", "aeroreview.site.pages.revision",
            "aeroreview.calc.air"} <= set(names)


def test_every_module_imports_from_the_wheel(installed):
    python, purelib, names = installed
    names = [n for n in names if n != "aeroreview.__main__"]  # importing it runs the command line
    script = ("import importlib, json\n"
              f"names = {names!r}\n"
              "files = {n: importlib.import_module(n).__file__ for n in names}\n"
              "print(json.dumps(files))\n")
    files = json.loads(run(python, "-c", script, cwd=purelib.parent, env={**os.environ, "PYTHONPATH": ""}).stdout)
    outside = {n: f for n, f in files.items() if not Path(f).resolve().is_relative_to(purelib.resolve())}
    assert not outside, f"imported from outside the installed wheel: {outside}"


def test_measure_runs_from_the_wheel(installed, tmp_path):
    python, _, _ = installed
    aeroreview = python.parent / "aeroreview"
    done = run(aeroreview, "measure", SURFACE, "--json", cwd=tmp_path, env={**os.environ, "PYTHONPATH": ""})
    from aeroreview import measure  # the same surface measured in the development tree

    expected = measure.as_json(measure.measure(measure.load_surface(SURFACE, nose=None, up=None)))  # CLI: inferred
    assert json.loads(done.stdout) == json.loads(json.dumps(expected))
