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


def build_site(config: str | None = None, output: str | None = None) -> Path:
    """Build the site (atomically: a failed build leaves the previous one in place); return its folder."""
    os.environ.setdefault("NO_MKDOCS_2_WARNING", "1")  # the theme's banner is not about this site
    _show_mkdocs_log()
    try:
        cfg = load_config(config_file=_config_file(config), site_dir=output, strict=True)
        cfg.plugins.on_startup(command="build", dirty=False)
        try:
            mkdocs_build(cfg)
        finally:
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
