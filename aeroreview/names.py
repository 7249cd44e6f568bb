"""Did-you-mean hints for mistyped names: feature keys, rule ids, settings, choices, revisions.

Vocabulary layer: every layer above (rules, sheet, settings, CLI) suggests names the same way.
"""

from __future__ import annotations

import difflib


def suggest(word: str, options, elsewhere: str = "see `aeroreview schema` for the valid keys") -> str:
    """A did-you-mean hint for a mistyped word; else the options when they are few, else where to look."""
    options = [str(o) for o in options]
    close = close_match(word, options)
    if close:
        return f"did you mean '{close}'?"
    return f"choose one of {', '.join(options)}" if 0 < len(options) <= 8 else elsewhere


def close_match(word: str, options) -> str | None:
    """The option closest to a mistyped word, if one is close enough to be what was meant."""
    close = difflib.get_close_matches(word, [str(o) for o in options], n=1, cutoff=0.6)
    return close[0] if close else None
