"""``aeroreview site build|serve``: thin wrappers around MkDocs with the project's mkdocs.yml."""

from __future__ import annotations

import logging
import os
import sys
from pathlib import Path

from mkdocs.commands.build import build as mkdocs_build
from mkdocs.commands.serve import serve as mkdocs_serve
from mkdocs.config import load_config
from mkdocs.exceptions import MkDocsException

from aeroreview.problems import UsageError


def _show_mkdocs_log(level: int = logging.WARNING) -> None:
    """MkDocs reports errors (and serve its address) through logging; show them on stderr, once."""
    logger = logging.getLogger("mkdocs")
    if not any(isinstance(h, _StderrHandler) for h in logger.handlers):
        logger.addHandler(_StderrHandler(level))
        logger.setLevel(min(logger.level or logging.WARNING, level))


class _StderrHandler(logging.Handler):
    """Writes to whatever sys.stderr is at the time of the message."""

    def emit(self, record):
        print(f"{record.levelname}: {record.getMessage()}", file=sys.stderr)


def _config_file(config: str | None) -> str:
    path = Path(config or "mkdocs.yml")
    if not path.is_file():
        raise UsageError(f"{path}: no MkDocs configuration here; run from the knowledge base folder or give --config")
    return str(path)


class _Progress:
    """A progress bar for a long build on a terminal (rich); silent when stderr is not one (CI, pipes)."""

    def __init__(self):
        self.bar = None
        if sys.stderr.isatty():
            from rich.console import Console
            from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn

            self.bar = Progress(TextColumn("{task.description}"), BarColumn(), MofNCompleteColumn(),
                                console=Console(file=sys.stderr), transient=True)
        self.task = None

    def __call__(self, stage: str, total: int | None = None) -> None:
        if self.bar is None:
            return
        if stage == "sheets":
            self.bar.start()
            self.task = self.bar.add_task(f"reviewing {total} sheets, drawing figures", total=None)
        elif stage == "pages":
            self.bar.update(self.task, description="rendering pages", total=total, completed=0)
        else:
            self.bar.advance(self.task)

    def stop(self) -> None:
        if self.bar is not None:
            self.bar.stop()


def build_site(config: str | None = None, output: str | None = None) -> Path:
    """Build the site (atomically: a failed build leaves the previous one in place); return its folder."""
    os.environ.setdefault("NO_MKDOCS_2_WARNING", "1")  # the theme's banner is not about this site
    _show_mkdocs_log()
    progress = _Progress()
    try:
        cfg = load_config(config_file=_config_file(config), site_dir=output, strict=True)
        if "aeroreview" in cfg.plugins:
            cfg.plugins["aeroreview"].progress = progress
        cfg.plugins.on_startup(command="build", dirty=False)
        try:
            mkdocs_build(cfg)
        finally:
            progress.stop()
            cfg.plugins.on_shutdown()
    except MkDocsException as error:
        raise UsageError(f"site build failed: {error}") from None
    return Path(cfg.site_dir)


def serve_site(config: str | None = None, address: str = "127.0.0.1:8000") -> None:
    """Serve the site with live reload; sheets are watched too."""
    os.environ.setdefault("NO_MKDOCS_2_WARNING", "1")
    _show_mkdocs_log(logging.INFO)
    try:
        mkdocs_serve(config_file=_config_file(config), dev_addr=address, open_in_browser=False)
    except MkDocsException as error:
        raise UsageError(f"site serve failed: {error}") from None
