"""The MkDocs plugin accepts every setting aeroreview.settings reads, so one mkdocs.yml serves both.

Reference: MkDocs itself (`mkdocs build --strict` fails on an undeclared plugin option).
"""

from __future__ import annotations

import shutil
import subprocess
import sys

from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import load_sheet
from conftest import ROOT

CONFIG = """site_name: t
docs_dir: docs
plugins:
  - aeroreview:
      sheets: vehicles
      estimates:
        floors: {fastback: 0.25}
        regions: {wheels: {share: 0.30, recoverable: 0.45}}
"""


def test_a_mkdocs_yml_with_the_estimates_setting_builds_strictly_and_uses_it(tmp_path):
    shutil.copytree(ROOT / "vehicles/tessel", tmp_path / "vehicles/tessel")
    (tmp_path / "docs").mkdir()
    (tmp_path / "docs/index.md").write_text("# Fleet\n")
    (tmp_path / "mkdocs.yml").write_text(CONFIG)
    done = subprocess.run([sys.executable, "-m", "mkdocs", "build", "--strict", "-q", "-d", str(tmp_path / "site")],
                          cwd=tmp_path, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    assert "Unrecognised configuration name" not in done.stderr
    settings = load_settings(tmp_path / "mkdocs.yml")
    floor = review_sheet(load_sheet(tmp_path / "vehicles/tessel/r1.yaml"), settings).estimate.floor_cd
    assert floor >= 0.25  # the setting's floor, raised for what the revision cannot change
    page = (tmp_path / "site/fleet/tessel/r1/index.html").read_text(encoding="utf-8")
    assert f"floor of the class Cd {floor:.3f}" in page
