"""Located problems in user input, and the exception that carries them.

Every mistake a user can make in a file is reported as ``file:line:column: what is wrong;
hint``. Loaders collect all the problems they find and raise them together, so that a
reviewer fixes a sheet in one pass instead of one error per run.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

MAX_MESSAGE = 400  # characters of a message or hint; long enough for any real one (common practice for log lines)
MAX_ECHO = 60  # characters of the user's text repeated inside a message
# Control characters (C0, DEL, C1) and bidirectional overrides: a sheet must not be able to
# drive the terminal (retitle it, clear it) or reorder what a reader sees.
_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f\u202a-\u202e\u2066-\u2069]")
_LINE_BREAKS = re.compile(r"\s*[\r\n]+\s*")


def clean(text: str, limit: int = MAX_MESSAGE) -> str:
    """``text`` as one safe line: line breaks folded into spaces, control characters shown as
    escapes (``\\x1b``), and at most ``limit`` characters."""
    text = _LINE_BREAKS.sub(" ", str(text)).replace("\t", " ")
    text = _CONTROL.sub(lambda m: m.group().encode("unicode_escape").decode("ascii"), text)
    if len(text) > limit:
        return f"{text[:limit]}... ({len(text) - limit:,} more characters)"
    return text


def echo(value: object, limit: int = MAX_ECHO) -> str:
    """The user's text as a message repeats it: one line, escaped, cut after ``limit`` characters."""
    return clean(value, limit)


@dataclass(frozen=True)
class Problem:
    """One located mistake (or, with ``level="warning"``, one doubt) in a user's file."""

    file: str
    line: int
    column: int
    message: str
    hint: str = ""
    level: str = "error"

    def __post_init__(self):
        # Every message reaches a terminal or a report: one line, no control characters, bounded.
        for name, limit in (("file", 4 * MAX_MESSAGE), ("message", MAX_MESSAGE), ("hint", MAX_MESSAGE)):
            object.__setattr__(self, name, clean(getattr(self, name), limit))

    def __str__(self) -> str:
        where = f"{self.file}:{self.line}:{self.column}"
        tag = "" if self.level == "error" else f"{self.level}: "
        text = f"{where}: {tag}{self.message}"
        return f"{text}; {self.hint}" if self.hint else text

    def as_dict(self) -> dict:
        return {
            "file": self.file,
            "line": self.line,
            "column": self.column,
            "level": self.level,
            "message": self.message,
            "hint": self.hint,
        }


class InputError(Exception):
    """Raised when user input cannot be used; carries every problem found."""

    def __init__(self, problems: list[Problem]):
        super().__init__("\n".join(str(p) for p in problems))
        self.problems = list(problems)


class UsageError(Exception):
    """A command-line mistake (bad option value, missing file); exit code 2."""
