"""Results of slow, pure computations kept on disk as JSON, keyed by a hash of what they read.

Why: a site rebuild after one sheet changed must not redo what did not change: reading and
settling a force history (tens of milliseconds each; a table read loads pandas), refitting a
calibration's study (statsmodels alone takes one to three seconds to import). Measured
surfaces have their own cache (:mod:`aeroreview.sheetsurface`), shared with the review. The key holds
the inputs' bytes and the source of the modules that compute the result, so a code change
recomputes rather than showing a stale result. Writes are atomic (a unique temporary file
renamed into place), so concurrent builds may share the folder; :meth:`Memo.evict` removes
what the build did not use, as the figure cache does.
"""

from __future__ import annotations

import hashlib
import importlib.util
import json
import os
import tempfile
from collections.abc import Callable
from pathlib import Path


def key(*parts: bytes | str, code: tuple[str, ...] = ()) -> str:
    """A hash of ``parts`` and of the source files of the modules named in ``code`` (found, not
    imported; a package stands for every module in its folder)."""
    digest = hashlib.sha256()
    for part in (*parts, *(path.read_bytes() for name in code for path in _sources(name))):
        data = part.encode() if isinstance(part, str) else part
        digest.update(len(data).to_bytes(8, "little") + data)  # length-prefixed: no two splits collide
    return digest.hexdigest()[:24]


def _sources(module: str) -> list[Path]:
    spec = importlib.util.find_spec(module)
    if spec.submodule_search_locations:
        return sorted(Path(spec.submodule_search_locations[0]).glob("*.py"))
    return [Path(spec.origin)]


class Memo:
    """A folder of remembered results (None: remember nothing, compute every time)."""

    def __init__(self, folder: Path | None):
        self.folder = folder
        self.used: set[str] = set()

    def get(self, name: str, compute: Callable[[], object]):
        """The result stored as ``name`` (a :func:`key`), else ``compute()``, stored. A computation
        that raises stores nothing, so an error is reported again on the next build."""
        self.used.add(f"{name}.json")
        path = self.folder / f"{name}.json" if self.folder else None
        try:
            if path and path.is_file():
                return json.loads(path.read_text(encoding="utf-8"))
        except (OSError, ValueError):
            pass  # unreadable: computed again
        result = compute()
        if path:
            _store(path, result)
        return result

    def evict(self) -> int:
        """Remove stored results this memo's build did not use; the number removed."""
        if not self.folder or not self.folder.is_dir():
            return 0
        stale = [path for path in self.folder.glob("*.json") if path.name not in self.used]
        for path in stale:
            path.unlink(missing_ok=True)
        return len(stale)


def _store(path: Path, result) -> None:
    """Write atomically; a folder that cannot be written (a read-only checkout in CI) remembers nothing."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        handle, temporary = tempfile.mkstemp(prefix=f".{path.stem}.", suffix=".tmp", dir=path.parent)
    except OSError:
        return
    try:
        with os.fdopen(handle, "w", encoding="utf-8") as stream:
            json.dump(result, stream)
        os.replace(temporary, path)
    except OSError:
        Path(temporary).unlink(missing_ok=True)
