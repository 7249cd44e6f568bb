"""Files a sheet names: the one gate between a sheet's text and the file system.

A knowledge base is untrusted: a sheet may name ``../../etc/passwd``, a link
``img/env.png -> /proc/self/environ``, a linked folder that points elsewhere, or a file
whose name carries markup (``x.png){ onload=alert(2) }(.png``). :func:`contained_file`
refuses all of them: the name must be plain (letters, digits, ``.``, ``_`` and ``-`` in
each part), and the *real* path (every link followed) must stay inside the real path of
the sheet's folder. Every feature that reads a file a sheet names (attachments, geometry,
results files, calibrations, anything later) calls it, at load time and again just before
reading, and reads the path it returns.
"""

from __future__ import annotations

import re
from pathlib import Path, PurePosixPath

MAX_NAME = 300  # characters in a relative path a sheet gives; a few folders and a file name (common practice)
SAFE_PART = re.compile(r"^[A-Za-z0-9_][A-Za-z0-9._-]{0,127}$")  # no spaces, quotes, brackets, braces or markup


class PathProblem(ValueError):
    """A file a sheet names that cannot be used; ``hint`` says what to do. The caller locates it."""

    def __init__(self, message: str, hint: str):
        super().__init__(message)
        self.hint = hint


def contained_file(folder: Path | str, relative: str, suffixes: tuple[str, ...], what: str = "file",
                   kind: str = "a file of a known kind") -> Path:
    """The real path of the file ``relative`` names inside ``folder``, or :class:`PathProblem`.

    ``relative`` must be a plain relative POSIX path whose parts are safe names, ending in
    one of ``suffixes``; its real path (links resolved) must be a regular file inside the
    real path of ``folder``.
    """
    if not isinstance(relative, str) or not relative:
        raise PathProblem(f"{what} path is empty", "give a path relative to the sheet's folder")
    if len(relative) > MAX_NAME:
        raise PathProblem(f"{what} path is {len(relative):,} characters, over the limit of {MAX_NAME}",
                          "use a shorter path")
    pure = PurePosixPath(relative)
    if "\\" in relative or ":" in relative or pure.is_absolute() or ".." in pure.parts:
        raise PathProblem(f"{what} path '{relative}' leaves the knowledge base",
                          "give a path relative to the sheet's folder, without '..'")
    bad = [part for part in pure.parts if not SAFE_PART.match(part)]
    if bad:
        raise PathProblem(f"{what} path '{relative}' has an unsafe name '{bad[0]}'",
                          "rename it with letters, digits, '.', '_' and '-' only (no spaces or brackets)")
    if pure.suffix.lower() not in suffixes:
        raise PathProblem(f"{what} '{relative}' is not {kind}", f"give one of {', '.join(suffixes)}")
    root = Path(folder).resolve()
    real = (root / pure).resolve()
    if not real.is_relative_to(root):
        raise PathProblem(f"{what} '{relative}' is a link that leaves the sheet's folder",
                          "copy the file into the sheet's folder instead of linking to it")
    if not real.is_file():
        problem = "is not a regular file" if real.exists() else "does not exist"
        raise PathProblem(f"{what} '{relative}' {problem}", f"looked for {root / pure}")
    return real
