"""The MkDocs plugin: thin event handlers around :mod:`aeroreview.site.pages`.

Registered as the ``aeroreview`` entry point of ``mkdocs.plugins``. Its settings are the
review settings (:mod:`aeroreview.settings`), read from the same section of mkdocs.yml.

- ``on_config``: load the settings and the sheets, review them, generate every page and
  figure in memory; on a plain ``mkdocs build``, redirect the output to a temporary folder.
- ``on_files``: add the generated files and the attachments to copy (nothing is written into
  ``site_src/``).
- ``on_page_markdown``: put the fleet table into the home page.
- ``on_serve``: watch the sheets, so ``mkdocs serve`` rebuilds when a sheet changes.
- ``on_post_build`` / ``on_build_error``: swap the finished site into place, or drop the
  half-built one, so a failed build leaves the previous site untouched.
"""

from __future__ import annotations

import datetime
import os
import shutil
import tempfile
from pathlib import Path

from mkdocs.config import base
from mkdocs.config import config_options as c
from mkdocs.exceptions import PluginError
from mkdocs.plugins import BasePlugin
from mkdocs.structure.files import File

from aeroreview.problems import InputError
from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate

FLEET_MARKER = "<!-- aeroreview:fleet-table -->"
CACHE_FOLDER = ".cache/aeroreview-figures"  # beside mkdocs.yml; never inside site_src


class AeroreviewConfig(base.Config):
    """Declared so MkDocs accepts the keys; :func:`aeroreview.settings.load_settings` validates them."""

    sheets = c.Type(str, default="vehicles")
    reference_speed = c.Optional(c.Type((str, int, float)))
    air = c.Optional(c.Type(dict))
    cycle = c.Type(str, default="wltc-3b")
    fail_on = c.Type(str, default="failure")
    rules = c.Type(dict, default={})


def fleet_epoch(reviews) -> int:
    """A build timestamp derived from the inputs (the latest review date), for reproducible output."""
    dates = [r.sheet.reviewed for r in reviews if r.sheet.reviewed]
    latest = max(dates, default=datetime.date(2026, 1, 1))
    return int(datetime.datetime(latest.year, latest.month, latest.day, tzinfo=datetime.timezone.utc).timestamp())


class AeroreviewPlugin(BasePlugin[AeroreviewConfig]):
    def __init__(self):
        self.command: str | None = None  # "build", "serve" or "gh-deploy", from on_startup
        self.site = None
        self.final_dir: str | None = None  # where the site goes once the build succeeded
        self.temp_dir: str | None = None
        self.settings = None
        self.cache: FigureCache | None = None

    def on_startup(self, *, command, dirty):
        self.command = command

    def on_config(self, config):
        try:
            self.settings = load_settings(config.config_file_path)
            fleet = load_fleet([self.settings.sheets_path])
            problems = fleet.problems
            if problems:
                raise InputError(problems)
        except InputError as error:
            raise PluginError("the review sheets have errors:\n" + "\n".join(str(p) for p in error.problems)) from None
        reviews = [review_sheet(sheet, self.settings) for sheet in fleet.sheets]
        cache = FigureCache(Path(config.config_file_path).parent / CACHE_FOLDER)
        self.site = generate(reviews, self.settings, cache)
        self.cache = cache
        os.environ.setdefault("SOURCE_DATE_EPOCH", str(fleet_epoch(reviews)))  # mkdocs reads it for sitemap dates
        if self.command == "build":
            self.final_dir = config.site_dir
            parent = Path(config.site_dir).resolve().parent
            parent.mkdir(parents=True, exist_ok=True)
            self.temp_dir = config.site_dir = tempfile.mkdtemp(prefix=".aeroreview-build-", dir=parent)
        return config

    def on_files(self, files, *, config):
        for path, content in sorted(self.site.files.items()):
            files.append(File.generated(config, path, content=content))
        for path, source in sorted(self.site.copies.items()):  # attachments, copied unchanged
            files.append(File.generated(config, path, abs_src_path=str(source)))
        return files

    def on_page_markdown(self, markdown, *, page, config, files):
        if page.file.src_uri == "index.md":
            return markdown.replace(FLEET_MARKER, self.site.home_table)
        return markdown

    def on_serve(self, server, *, config, builder):
        server.watch(str(self.settings.sheets_path))
        return server

    def on_post_build(self, *, config):
        if self.final_dir:
            swap_into_place(Path(self.temp_dir), Path(self.final_dir))
            config.site_dir, self.final_dir = self.final_dir, None

    def on_build_error(self, *, error):
        if self.final_dir:
            shutil.rmtree(self.temp_dir, ignore_errors=True)
            self.final_dir = None


def swap_into_place(built: Path, target: Path) -> None:
    """Replace ``target`` by ``built`` with two renames, so readers never see a half site."""
    old = target.with_name(f".{target.name}.old")
    shutil.rmtree(old, ignore_errors=True)
    if target.exists():
        target.rename(old)
    built.rename(target)
    shutil.rmtree(old, ignore_errors=True)
