"""What the site search indexes of a page: its headings and its words, not its markup.

Material's search plugin parses every page's HTML in pure Python (``html.parser``) to cut it
into sections at the headings. A revision page is some 30 KB of tables, links, status badges
and figure tags, and parsing that markup was most of the search's cost in a build. People
search for words: names, rule ids, feature keys, findings, notes. So the search is handed the
page with its headings kept as they are (their ids link a result to its section) and every
other tag removed, the words in order; the cautions box repeated on every generated page is
left out (it has its own page). The page itself is rendered with its full content.
"""

from __future__ import annotations

import re

_HEADING = re.compile(r"(<h[1-6][\s>].*?</h[1-6]>)", re.S)
_PERMALINK = re.compile(r'<a class="headerlink"[^>]*>.*?</a>', re.S)
_UNREAD = re.compile(r"<(script|style)[\s>].*?</\1>", re.S)
_CAUTIONS = re.compile(r'<div class="admonition warning">\s*<p class="admonition-title">Cautions</p>.*?</div>', re.S)
_INLINE = re.compile(r"</?(a|abbr|b|code|em|i|kbd|mark|small|span|strong|sub|sup)(\s[^>]*)?>")  # inside a word
_TAG = re.compile(r"<[^>]*>")


def searchable(html: str) -> str:
    """The page's headings and, between them, its words as one paragraph each."""
    parts = _HEADING.split(_CAUTIONS.sub("", _UNREAD.sub("", html)))
    out = []
    for index, part in enumerate(parts):
        if index % 2:
            out.append(_PERMALINK.sub("", part))
        else:
            words = " ".join(_TAG.sub(" ", _INLINE.sub("", part)).split())
            out.append(f"<p>{words}</p>" if words else "")
    return "".join(out)
