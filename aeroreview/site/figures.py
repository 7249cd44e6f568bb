"""Figures for the review site: SVG, deterministic, colour-blind safe, cached, drawn in parallel.

Every figure is a pure function of a small JSON-able ``data`` mapping. The charts are written
as SVG directly (:mod:`aeroreview.site.charts`, :mod:`aeroreview.site.fitcharts`); only the
measured surface's geometry is drawn by matplotlib (:mod:`aeroreview.site.plots`, imported only
when one is drawn). :class:`FigureCache` stores the SVG under a hash of (figure kind, data, figure
code version, matplotlib version, styles): a rebuild redraws only the figures whose inputs
changed, the figures a build needs are drawn together in a process pool, cached figures no page
uses any more are removed, and the same input always gives the same bytes (fixed SVG hash salt,
no date, text kept as text), in parallel or not.
"""

from __future__ import annotations

import hashlib
import json
import os
import tempfile
from importlib.metadata import version
from pathlib import Path

from aeroreview import collector
from aeroreview.site import charts, fitcharts, svgchart

FIGURE_VERSION = "5"  # bump when a drawing function changes, so cached SVGs are redrawn
MATPLOTLIB = version("matplotlib")  # read from the package metadata: importing matplotlib costs 0.3-0.6 s

# matplotlib's settings for its figures. "text.parse_math": False draws every text literally: sheet
# text such as "Price $\\foo$" is neither typeset as math nor able to stop a build with a parse error.
STYLE = {
    "text.parse_math": False, "svg.hashsalt": "aeroreview", "svg.fonttype": "none", "font.size": 9, "axes.grid": True,
    "grid.alpha": 0.3, "axes.spines.top": False, "axes.spines.right": False, "figure.dpi": 100,
}


def _draw(kind: str, data) -> bytes:
    if kind in charts.DRAWERS:
        return charts.DRAWERS[kind](data)
    if kind in fitcharts.DRAWERS:
        return fitcharts.DRAWERS[kind](data)
    from aeroreview.site import plots

    with collector.full_collections():  # matplotlib's cycles outlive the young generations
        return plots.draw(kind, data)


def _draw_job(job: tuple[str, object]) -> bytes:
    return _draw(*job)


def _workers() -> int:
    return len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count() or 1


class FigureCache:
    """Draws figures and keeps their SVG on disk, keyed by a hash of the inputs, the figure
    code version, the matplotlib version and the styles (any of them changes the bytes)."""

    def __init__(self, folder: Path | None):
        self.folder = folder
        self.drawn = 0
        self.reused = 0

    @staticmethod
    def key(kind: str, data) -> str:
        text = json.dumps([FIGURE_VERSION, MATPLOTLIB, STYLE, svgchart.STYLE, kind, data], sort_keys=True,
                          separators=(",", ":"))
        return hashlib.sha256(text.encode()).hexdigest()[:20]

    def name(self, kind: str, data) -> str:
        return f"{kind}-{self.key(kind, data)}.svg"

    def svg(self, kind: str, data) -> tuple[str, bytes]:
        """The figure's file name and SVG bytes."""
        name = self.name(kind, data)
        return name, self.draw_all({name: (kind, data)}, workers=1)[name]

    def draw_all(self, wanted: dict[str, tuple[str, object]], workers: int | None = None) -> dict[str, bytes]:
        """SVG bytes of every wanted figure (name -> (kind, data)): cached ones read, the others
        drawn in a process pool (the same bytes as drawn one by one; serial on one core)."""
        found, missing = {}, []
        for name in sorted(wanted):
            try:
                found[name] = (self.folder / name).read_bytes() if self.folder else None
            except FileNotFoundError:
                found[name] = None
            if found[name] is None:
                missing.append(name)
        self.reused += len(wanted) - len(missing)
        self.drawn += len(missing)
        workers = min(workers or _workers(), len(missing))
        jobs = [wanted[name] for name in missing]
        if workers > 1:
            import multiprocessing
            from concurrent.futures import ProcessPoolExecutor

            with ProcessPoolExecutor(workers, mp_context=multiprocessing.get_context("fork")) as pool:
                drawn = list(pool.map(_draw_job, jobs, chunksize=max(1, len(jobs) // (4 * workers))))
        else:
            drawn = [_draw(*job) for job in jobs]
        for name, content in zip(missing, drawn):
            found[name] = content
            self._store(name, content)
        return found

    def _store(self, name: str, content: bytes) -> None:
        if not self.folder:
            return
        self.folder.mkdir(parents=True, exist_ok=True)
        handle, temporary = tempfile.mkstemp(prefix=f".{name}.", suffix=".tmp", dir=self.folder)
        with os.fdopen(handle, "wb") as stream:  # a unique name: concurrent builds share the cache
            stream.write(content)
        os.replace(temporary, self.folder / name)

    def evict(self, used) -> int:
        """Remove cached figures that no page uses any more; the number removed."""
        if not self.folder or not self.folder.is_dir():
            return 0
        stale = [path for path in self.folder.glob("*.svg") if path.name not in set(used)]
        for path in stale:
            path.unlink(missing_ok=True)
        return len(stale)
