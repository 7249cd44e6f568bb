"""The site search is handed each page's headings and words without its markup
(:mod:`aeroreview.site.searchtext`); checked with Material's own search parser, the reference:
the same sections with the same ids and titles, the same words in each, the cautions box left out."""

from __future__ import annotations

import re

import markdown
from material.plugins.search.plugin import Parser

from aeroreview.review import review_sheet
from aeroreview.settings import load_settings
from aeroreview.sheet import load_fleet
from aeroreview.site.figures import FigureCache
from aeroreview.site.pages import generate
from aeroreview.site.searchtext import searchable
from conftest import ROOT


def sections(html: str) -> list[tuple[str | None, str, str]]:
    """(id, title, text) of each section Material's parser finds; the text's characters in order,
    without the tags it keeps for display and without spacing."""
    parser = Parser()
    parser.feed(html)
    parser.close()
    return [(s.id, "".join(s.title).strip(), re.sub(r"<[^>]*>|\s", "", "".join(s.text))) for s in parser.data]


def test_search_gets_the_same_sections_and_words_without_the_markup():
    settings = load_settings(ROOT / "mkdocs.yml")
    reviews = [review_sheet(s, settings) for s in load_fleet([settings.sheets_path]).sheets]
    pages = generate(reviews, settings, FigureCache(None)).files
    render = markdown.Markdown(extensions=["tables", "admonition", "attr_list", "toc", "meta"],
                               extension_configs={"toc": {"permalink": True}})
    checked, sizes = 0, {}
    for path in ("fleet/tessel/r2.md", "fleet/tessel/r1-to-r2.md", "rules/rear.backlight-angle.md", "features.md"):
        html = render.reset().convert(pages[path])
        # the reference: the page with its cautions box excluded by Material's own attribute
        full = sections(html.replace('<div class="admonition warning">', '<div class="admonition warning" '
                                     'data-search-exclude>'))
        given = sections(searchable(html))
        assert [(i, t) for i, t, _ in given] == [(i, t) for i, t, _ in full], path
        for (_, title, words), (_, _, kept) in zip(full, given):
            if not words:
                continue
            assert kept == words, (path, title)
            checked += 1
        assert "review aids built from rules of thumb" not in searchable(html), path  # the cautions box
        sizes[path] = len(searchable(html)) / len(html)
    assert checked >= 8
    assert sizes["fleet/tessel/r2.md"] < 0.5  # a revision page: mostly markup
    assert "review aids built from rules of thumb" in render.reset().convert(pages["fleet/tessel/r2.md"])
