"""The MkDocs plugin: thin event handlers around :mod:`aeroreview.site.pages`.

Registered as the ``aeroreview`` entry point of ``mkdocs.plugins``. Its settings are the
review settings (:mod:`aeroreview.settings`), read from the same section of mkdocs.yml.

- ``on_config``: load the settings and the sheets, review them, generate every page and
  figure in memory; on a plain ``mkdocs build``, redirect the output to a temporary folder.
- ``on_files``: add the generated files and the attachments to copy (nothing is written into
  ``site_src/``).
- ``on_page_markdown``: put the fleet table into the home page.
- ``on_page_context``: hand the search plugin only the page's headings and words
  (:mod:`aeroreview.site.searchtext`), and give the page its full content back to render.
- ``on_serve``: watch the sheets, so ``mkdocs serve`` rebuilds when a sheet changes.
- ``on_post_build`` / ``on_build_error``: swap the finished site into place, or drop the
  half-built one, so a failed build leaves the previous site untouched
  (:mod:`aeroreview.site.output` refuses unsafe output folders and does the swap).
"""

from __future__ import annotations

import datetime
import os
from pathlib import Path

from mkdocs.config import base
from mkdocs.config import config_options as c
from mkdocs.exceptions import PluginError
from mkdocs.plugins import BasePlugin, CombinedEvent, event_priority
from mkdocs.structure.files import File, InclusionLevel

from aeroreview.collector import young_collections_only
from aeroreview.problems import InputError
from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import attachment_problems, load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.output import Output, OutputProblem, check_output, mark
from aeroreview.site.pages import generate
from aeroreview.site.searchtext import searchable

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
    max_attachment_mb = c.Optional(c.Type((int, float)))
    estimates = c.Optional(c.Type(dict))  # floors and region budgets of the combination model
    calibrations = c.Type(list, default=[])  # files, or {file, vehicles, classes}


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
        self.output: Output | None = None
        self.settings = None
        self.cache: FigureCache | None = None
        self.rendered = ""  # a page's full content while the search reads its words
        self.progress = lambda stage, total=None: None  # ``aeroreview site build`` shows it on a terminal

    def on_startup(self, *, command, dirty):
        self.command = command

    def on_config(self, config):
        try:
            self.settings = load_settings(config.config_file_path)
            target = self._checked_output(config)
            fleet = load_fleet([self.settings.sheets_path])
            problems = fleet.problems + attachment_problems(fleet.sheets, self.settings.max_attachment_bytes)
            if problems:
                raise InputError(problems)
        except InputError as error:
            raise PluginError("the review sheets have errors:\n" + "\n".join(str(p) for p in error.problems)) from None
        self.progress("sheets", len(fleet.sheets))
        cache = FigureCache(Path(config.config_file_path).parent / CACHE_FOLDER)
        with young_collections_only():  # the reviews and pages live on: no full collection walks them again
            reviews = [review_sheet(sheet, self.settings) for sheet in fleet.sheets]
            self.site = generate(reviews, self.settings, cache)
        self.cache = cache
        os.environ.setdefault("SOURCE_DATE_EPOCH", str(fleet_epoch(reviews)))  # mkdocs reads it for sitemap dates
        if self.command == "build":
            self.final_dir, self.output = config.site_dir, Output(target)
            config.site_dir = str(self.output.begin())
        return config

    def _checked_output(self, config) -> Path | None:
        """The real output folder, refused before any work when a build would replace what it must not;
        None for ``serve``, which builds into its own temporary folder."""
        if self.command not in ("build", "gh-deploy"):  # both replace site_dir
            return None
        try:
            return check_output(Path(config.site_dir), self.settings.sheets_path, Path(config.docs_dir),
                                Path(config.config_file_path).parent)
        except OutputProblem as problem:
            raise PluginError(str(problem)) from None

    def on_files(self, files, *, config):
        for path, content in sorted(self.site.files.items()):  # linked from the generated pages, not the nav
            files.append(File.generated(config, path, content=content, inclusion=InclusionLevel.NOT_IN_NAV))
        self.progress("pages", sum(1 for f in files if f.is_documentation_page()))
        for path, source in sorted(self.site.copies.items()):  # attachments, copied unchanged
            files.append(File.generated(config, path, abs_src_path=str(source)))
        return files

    def on_page_markdown(self, markdown, *, page, config, files):
        self.progress("page")
        if page.file.src_uri == "index.md":
            return markdown.replace(FLEET_MARKER, self.site.home_table)
        return markdown

    @event_priority(100)  # before the search plugin (priority 0) indexes the page
    def _search_sees_words(self, context, *, page, config, nav):
        self.rendered, page.content = page.content, searchable(page.content)
        return context

    @event_priority(-100)  # after it: the page renders with everything
    def _page_renders_in_full(self, context, *, page, config, nav):
        page.content = self.rendered
        return context

    on_page_context = CombinedEvent(_search_sees_words, _page_renders_in_full)

    def on_serve(self, server, *, config, builder):
        server.watch(str(self.settings.sheets_path))
        return server

    def on_post_build(self, *, config):
        if self.output:
            self.output.finish()
            config.site_dir, self.final_dir, self.output = self.final_dir, None, None
        elif self.command == "gh-deploy":  # built in place: mark it, so the next build may replace it
            mark(Path(config.site_dir))

    def on_build_error(self, *, error):
        self.on_shutdown()

    def on_shutdown(self):
        if self.output:  # the build stopped before the swap: drop the half site, keep the old one
            self.output.abandon()
            self.final_dir, self.output = None, None
