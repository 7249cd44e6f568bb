"""Helpers for site tests: a throw-away copy of the knowledge base, and building it."""

from __future__ import annotations

import shutil
from pathlib import Path

from conftest import ROOT


def copy_knowledge_base(target: Path) -> Path:
    """Copy mkdocs.yml, site_src/, vehicles/ and studies/ into ``target`` (never build inside the repository)."""
    target.mkdir(parents=True, exist_ok=True)
    shutil.copy(ROOT / "mkdocs.yml", target / "mkdocs.yml")
    shutil.copytree(ROOT / "site_src", target / "site_src")
    shutil.copytree(ROOT / "vehicles", target / "vehicles")
    shutil.copytree(ROOT / "studies", target / "studies")
    return target


def build(kb: Path, output: Path) -> Path:
    from aeroreview.site.build import build_site

    return build_site(str(kb / "mkdocs.yml"), str(output))
