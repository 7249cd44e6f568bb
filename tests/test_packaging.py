"""What a non-editable install ships: every package folder is listed in pyproject.toml.

setuptools' automatic discovery does not follow the ``package-dir`` mapping that installs
``calc/`` and ``rules/`` as ``aeroreview.calc`` and ``aeroreview.rules`` (the setuptools
maintainers say so in pypa/setuptools#4248), so the packages are listed by hand; this test
derives the list from the folders, so a new sub-package cannot be forgotten again
(``aeroreview.calc.geometry`` was: a built wheel could not measure).
"""

from __future__ import annotations

import tomllib

from conftest import ROOT


def _configured() -> tuple[set[str], dict[str, str]]:
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))["tool"]["setuptools"]
    return set(config["packages"]), config["package-dir"]


def package_folders() -> set[str]:
    """Dotted names of every folder with an ``__init__.py`` under the mapped package roots."""
    _, roots = _configured()
    found = set()
    for name, folder in roots.items():
        base = ROOT / folder
        for init in base.rglob("__init__.py"):
            relative = init.parent.relative_to(base).parts
            if "__pycache__" not in relative:
                found.add(".".join((name, *relative)))
    return found


def test_every_package_folder_is_in_pyproject():
    listed, _ = _configured()
    missing = package_folders() - listed
    assert not missing, f"add {sorted(missing)} to [tool.setuptools] packages in pyproject.toml"


def test_the_geometry_package_is_found_and_listed():
    assert "aeroreview.calc.geometry" in package_folders()
    assert "aeroreview.calc.geometry" in _configured()[0]
