"""What every page writer shares: the one escaping path, links, figures, and the output.

Every piece of text that comes from a sheet goes through :func:`esc` (titles through
:func:`heading`), so that HTML and Markdown in a note or a name show as typed, never as
markup. Page writers only format: numbers come from the review and from
:mod:`aeroreview.digest`.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field
from pathlib import Path

from aeroreview.display import PERCENT, whole_score
from aeroreview.memo import Memo
from aeroreview.review import Review
from aeroreview.settings import Settings
from aeroreview.site.figures import FigureCache

CAUTION = ("!!! warning \"Cautions\"\n"
           "    Aerodynamic changes alter high-speed stability, cooling, braking and pedestrian-impact behaviour.\n"
           "    These findings are review aids built from rules of thumb and published results, not sign-off:\n"
           "    confirm every change by validated CFD, wind-tunnel and road testing, follow your local vehicle\n"
           "    regulations (aftermarket body parts included), and have changes approved by licensed engineers.\n")
# HTML's special characters and Markdown's, each replaced by a character entity in one pass.
_INERT = str.maketrans({**{c: f"&#{ord(c)};" for c in "\\`*_{}[]()#+-!|~"},
                        "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#x27;"})


def esc(text) -> str:
    """Sheet text made inert: HTML and Markdown specials as entities, folded onto one line."""
    return " ".join(str(text).translate(_INERT).split())


def heading(text: str) -> str:
    """Front matter and an H1 for a page whose title holds sheet text.

    MkDocs and the theme put a page's title into <title> and the navigation unescaped, so
    the title itself must carry no markup characters at all: they are dropped from it (the
    H1 on the page shows the full text, escaped).
    """
    plain = "".join(c for c in str(text) if c not in "<>&\"'`\\") or "untitled"
    return f"---\ntitle: {json.dumps(' '.join(plain.split()))}\n---\n\n# {esc(text)}"


def paragraphs(text: str) -> str:
    """Multi-line sheet text (notes) as escaped paragraphs."""
    return "\n\n".join(esc(part) for part in str(text).split("\n\n") if part.strip())


def badge(status: str) -> str:
    css = status.replace(" ", "-")
    return f'<span class="ar-status ar-{css}">{status}</span>'


def kind_suffix(source, mark: str = "") -> str:
    """" (from memory)" after a citation, unless the citation already names its kind."""
    return "" if source.kind in source.citation.lower() else f" ({mark}{source.kind}{mark})"


def link(target: str, text: str, depth: int) -> str:
    """A Markdown link to a page given from the docs root, from a page ``depth`` folders down."""
    return f"[{text}]({'../' * depth}{target})"


def revision_path(review: Review) -> str:
    return f"fleet/{review.sheet.vehicle_id}/{review.sheet.revision}.md"


def score_text(review: Review) -> str:
    score = whole_score(review.score)
    return f"{score} ({PERCENT(review.coverage)})"


def recoverable_text(review: Review) -> str:
    """The combined saving [counts]: mid, and the low-high range."""
    e = review.estimate
    return f"{e.mid:.1f} ({e.low:.1f}-{e.high:.1f})"


@dataclass
class Site:
    """What :func:`aeroreview.site.pages.generate` returns.

    ``files``: generated pages and figures by path inside the docs; ``copies``: files the
    plugin copies unchanged into the site (target path inside the docs, source file).
    """

    files: dict[str, str | bytes] = field(default_factory=dict)
    copies: dict[str, Path] = field(default_factory=dict)
    home_table: str = ""


@dataclass
class Output:
    """Where page writers put what they write, with the settings, the figure cache and the memo
    of slow results (settled histories, build-up curves, refitted studies)."""

    settings: Settings
    cache: FigureCache
    memo: Memo = field(default_factory=lambda: Memo(None))
    site: Site = field(default_factory=Site)
    figures: dict[str, tuple[str, object]] = field(default_factory=dict)  # name -> (kind, data)

    def page(self, path: str, text: str) -> None:
        self.site.files[path] = text

    def figure(self, kind: str, data, alt: str, depth: int) -> str:
        """A figure's Markdown image from a page ``depth`` folders down; drawn later, all at once
        (:meth:`draw_figures`)."""
        name = self.cache.name(kind, data)
        self.figures[name] = (kind, data)
        return f'![{esc(alt)}]({"../" * depth}figures/{name})'

    def draw_figures(self) -> None:
        """Draw (or reuse) every figure the pages named, in parallel, and drop the unused figures and
        remembered results from their caches."""
        for name, content in self.cache.draw_all(self.figures).items():
            self.site.files[f"figures/{name}"] = content
        self.cache.evict(self.figures)
        self.memo.evict()

    def sheet_name(self, sheet) -> str:
        """The sheet's path relative to the knowledge base (never the reviewer's absolute path)."""
        path = Path(sheet.path).resolve()
        try:
            return path.relative_to(self.settings.root.resolve()).as_posix()
        except ValueError:
            return path.name
