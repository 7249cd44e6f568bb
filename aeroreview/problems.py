"""Located problems in user input, and the exception that carries them.

Every mistake a user can make in a file is reported as ``file:line:column: what is wrong;
hint``. Loaders collect all the problems they find and raise them together, so that a
reviewer fixes a sheet in one pass instead of one error per run.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Problem:
    """One located mistake (or, with ``level="warning"``, one doubt) in a user's file."""

    file: str
    line: int
    column: int
    message: str
    hint: str = ""
    level: str = "error"

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
