"""Where a site build writes, and how the finished site replaces the old one.

A build must never delete what it did not make, and a reader (or a web server) must find a
complete site at the output path at every instant, even when the build is killed:

- :func:`check_output` refuses an output folder that is, lies inside or contains the
  sheets folder or the docs folder, or that is or contains the configuration's folder
  (``site/`` beside mkdocs.yml is fine), and refuses to replace a non-empty folder that
  does not hold the :data:`MARKER` file every aeroreview build leaves.
- :class:`Output` builds into a sibling folder and swaps it in with one atomic exchange
  (``renameat2(RENAME_EXCHANGE)`` on Linux). Where the system cannot exchange, it renames
  the old site aside and the new one in, and the next build puts the old one back if a kill
  fell between the two renames. Builds into one folder take turns on a lock file, so two
  concurrent builds both succeed; each build first removes what killed builds left.
- The old site, once swapped out, is removed by a detached process (:func:`remove_later`), off
  the build's critical path: it already sits under a build's leftover name, which the next
  build removes too if that process did not get to finish.
"""

from __future__ import annotations

import ctypes
import errno
import fcntl
import os
import secrets
import shutil
import subprocess
import sys
from pathlib import Path

MARKER = ".aeroreview-site"  # in every built site: the folder may be replaced by the next build
_MARKER_TEXT = "This folder was built by aeroreview; the next `aeroreview site build` replaces it.\n"


class OutputProblem(ValueError):
    """An output folder a build must not write to."""


def mark(folder: Path) -> None:
    """Leave the marker that lets the next build replace ``folder``."""
    (folder / MARKER).write_text(_MARKER_TEXT, encoding="utf-8")


def _reached(stage: str) -> None:
    """A point in the swap ("built", "exchanged", "aside", "placed"); tests kill the build here."""


def remove_later(folder: Path) -> None:
    """Remove ``folder`` in a detached process, so the command returns once the new site is in place
    (removing a large old site takes a noticeable part of a warm build); inline where no process starts."""
    try:
        subprocess.Popen([sys.executable, "-c", "import shutil, sys; shutil.rmtree(sys.argv[1], ignore_errors=True)",
                          str(folder)], stdin=subprocess.DEVNULL, stdout=subprocess.DEVNULL,
                         stderr=subprocess.DEVNULL, start_new_session=True)
    except OSError:
        shutil.rmtree(folder, ignore_errors=True)


def _overlaps(a: Path, b: Path) -> bool:
    return a == b or a.is_relative_to(b) or b.is_relative_to(a)


def check_output(target: Path, sheets: Path, docs: Path, config_folder: Path) -> Path:
    """The real path of ``target`` if a build may (re)place a site there; :class:`OutputProblem` if not."""
    real = target.resolve()
    for folder, what in ((sheets, "the sheets folder"), (docs, "the docs folder (site_src)")):
        if _overlaps(real, folder.resolve()):
            raise OutputProblem(f"the output folder {target} overlaps {what} {folder}; a build replaces its output "
                                "folder, so refusing; give another --output (default: site/ beside mkdocs.yml)")
    if config_folder.resolve().is_relative_to(real):
        raise OutputProblem(f"the output folder {target} is or contains the folder of mkdocs.yml; a build replaces "
                            "its output folder, so refusing; give a folder such as site/")
    if real.exists() and not real.is_dir():
        raise OutputProblem(f"the output {target} is a file, not a folder; refusing to replace it")
    if real.is_dir() and not (real / MARKER).is_file() and any(real.iterdir()):
        raise OutputProblem(f"the output folder {target} is not empty and was not built by aeroreview (no {MARKER} "
                            "file); refusing to replace it; empty it or give another --output")
    return real


_LIBC = ctypes.CDLL(None, use_errno=True)
_RENAMEAT2 = getattr(_LIBC, "renameat2", None)
_AT_FDCWD, _RENAME_EXCHANGE = -100, 2


def _exchange(a: Path, b: Path) -> bool:
    """Swap two paths in one atomic step; False where the system or file system cannot."""
    if _RENAMEAT2 is None:
        return False
    if _RENAMEAT2(_AT_FDCWD, os.fsencode(a), _AT_FDCWD, os.fsencode(b), _RENAME_EXCHANGE) == 0:
        return True
    code = ctypes.get_errno()
    if code in (errno.EINVAL, errno.ENOSYS, errno.EOPNOTSUPP):
        return False
    raise OSError(code, os.strerror(code), str(b))


class Output:
    """One build's claim on an output folder: lock, recover, build beside it, swap in."""

    exchange = staticmethod(_exchange)  # replaced in tests to exercise the two-rename path

    def __init__(self, target: Path):
        self.target = target
        self.prefix = f".{target.name}.aeroreview-"
        self.lock = None
        self.built: Path | None = None

    def begin(self) -> Path:
        """Take the lock, repair what a killed build left, and make the folder to build into."""
        parent = self.target.parent
        parent.mkdir(parents=True, exist_ok=True)
        self.lock = open(parent / f"{self.prefix}lock", "a")  # noqa: SIM115 - held until finish or abandon
        fcntl.flock(self.lock, fcntl.LOCK_EX)  # a concurrent build into the same folder waits its turn
        self._recover()
        self.built = parent / f"{self.prefix}build-{os.getpid()}-{secrets.token_hex(4)}"
        self.built.mkdir()  # mode from the user's umask, unlike mkdtemp's 0700
        return self.built

    def _recover(self) -> None:
        parent = self.target.parent
        aside = sorted(parent.glob(f"{self.prefix}old-*"), key=lambda p: p.stat().st_mtime)
        if not self.target.exists() and aside:
            aside.pop().rename(self.target)  # killed between the two renames: put the old site back
        leftovers = [*aside, *parent.glob(f"{self.prefix}build-*"), *parent.glob(".aeroreview-build-*"),
                     parent / f".{self.target.name}.old"]  # the last two: names used by earlier versions
        for path in leftovers:
            shutil.rmtree(path, ignore_errors=True)

    def finish(self) -> None:
        """Put the built site at the target, atomically, and clean up."""
        mark(self.built)
        _reached("built")
        if not self.target.exists():
            self.built.rename(self.target)
            _reached("placed")
        elif self.exchange(self.built, self.target):
            _reached("exchanged")  # the old site now sits at self.built
            remove_later(self.built)
        else:
            old = self.target.with_name(f"{self.prefix}old-{secrets.token_hex(4)}")
            self.target.rename(old)
            _reached("aside")
            self.built.rename(self.target)
            _reached("placed")
            old.rename(self.built)  # under a leftover name: only a kill between the renames leaves an "old-"
            remove_later(self.built)
        self._release()

    def abandon(self) -> None:
        """Drop a failed build; the old site stays untouched."""
        if self.built is not None:
            shutil.rmtree(self.built, ignore_errors=True)
        self._release()

    def _release(self) -> None:
        if self.lock is not None:
            self.lock.close()  # closing releases the lock
            self.lock = None
