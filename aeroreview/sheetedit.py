"""Edit a user's sheet in place, changing only what the edit must change.

Every command that writes into a sheet (``measure --sheet``, ``results ... --sheet``, any
later one) calls :func:`edit_sheet`, which keeps what the user made: comments (ruamel.yaml
round-trips them; when it cannot, as for a comment inside a ``{...}`` flow mapping, the
edit is refused with the comment's line), the indentation, line endings (LF or CRLF), a
UTF-8 byte-order mark, the file's mode, and a symbolic link (the link's target is written,
the link stays). The file is replaced atomically through a uniquely named temporary file
beside it, and the edited text must still be a valid sheet, or nothing is written.
"""

from __future__ import annotations

import codecs
import io
import os
import re
import shutil
import stat
import tempfile
from collections import Counter
from dataclasses import dataclass
from pathlib import Path
from typing import Callable

from aeroreview import yamldoc
from aeroreview.problems import InputError, Problem, echo
from aeroreview.sheet import from_document


@dataclass
class Edit:
    report: object  # what the change function returned
    backup: Path | None = None  # the original, kept when the change asked for it


def _refuse(path: str, line: int, message: str, hint: str) -> InputError:
    return InputError([Problem(path, line, 1, message, hint)])


def _comments(text: str) -> list[tuple[int, str]]:
    """(line, text) of every ``# comment``, skipping ``#`` inside quoted scalars. It errs toward
    finding too many (a ``#`` inside a block scalar), which only makes the check stricter."""
    found = []
    for number, line in enumerate(text.split("\n"), start=1):
        quote = None
        for i, char in enumerate(line):
            if quote:
                quote = None if char == quote else quote
            elif char in "'\"" and (i == 0 or line[i - 1] in " \t[{,:"):
                quote = char
            elif char == "#" and (i == 0 or line[i - 1] in " \t"):
                found.append((number, line[i:].rstrip()))
                break
    return found


def _filled(comment: str, features) -> bool:
    """Is ``comment`` a template's commented feature line (``# key:   # unit...``) that now holds a value?"""
    match = re.match(r"#[ \t]*([a-z][a-z0-9_]*\.[a-z0-9_]+):", comment)
    return bool(match and isinstance(features, dict) and match[1] in features)


def _layout(text: str) -> tuple[int, int]:
    """The mapping indent and the sequence dash offset the user wrote, for ruamel to repeat."""
    nested = re.search(r"^[^\s#-][^\n]*:[ \t]*(?:#[^\n]*)?\n( +)[^\s#-]", text, re.M)
    dash = re.search(r"^[^\s#][^\n]*:[ \t]*(?:#[^\n]*)?\n( *)- ", text, re.M)
    return (len(nested.group(1)) if nested else 2), (len(dash.group(1)) if dash else 0)


def _backup_path(path: Path) -> Path:
    backup, number = path.with_name(path.name + ".bak"), 1
    while backup.exists():
        backup, number = path.with_name(f"{path.name}.bak{number}"), number + 1
    return backup


def edit_sheet(path: str | Path, change: Callable[[dict], tuple[object, bool]]) -> Edit:
    """Apply ``change`` to the sheet at ``path`` and write it back faithfully.

    ``change`` receives the round-trip mapping (ruamel.yaml ``CommentedMap``), edits it in
    place and returns ``(report, keep_backup)``. Raises :class:`InputError` (nothing written)
    when the sheet cannot be read, the edit would lose a comment, or the result is not a
    valid sheet.
    """
    from ruamel.yaml import YAML

    given = Path(path)
    name = str(given)
    real = given.resolve()  # a linked sheet: write its target, keep the link
    text = yamldoc.read_text(real, name)
    with real.open("rb") as stream:
        bom = stream.read(3) == codecs.BOM_UTF8
    crlf = "\r\n" in text
    if crlf and text.count("\n") != text.count("\r\n") or "\r" in text.replace("\r\n", ""):
        raise _refuse(name, 1, "the sheet mixes line endings (LF, CRLF or CR); refusing to edit it",
                      "save it with one kind of line ending, then run the command again")
    text = text.replace("\r\n", "\n")
    yamldoc.parse(text, name)  # located errors in the tool's own words (duplicate keys, tags ...)
    yaml = YAML()
    yaml.preserve_quotes = True
    yaml.width = 4096  # never re-wrap a long line the user wrote
    mapping, offset = _layout(text)
    yaml.indent(mapping=mapping, sequence=offset + 2, offset=offset)
    try:
        data = yaml.load(text)
    except Exception as error:  # noqa: BLE001 - ruamel raises many parser types; yamldoc accepted the file
        raise _refuse(name, 1, f"cannot edit the sheet: {type(error).__name__}", "simplify the YAML") from None
    report, keep_backup = change(data)
    buffer = io.StringIO()
    yaml.dump(data, buffer)
    new_text = buffer.getvalue()
    kept = Counter(comment for _, comment in _comments(new_text))
    features = data.get("features") if isinstance(data, dict) else None
    for line, comment in _comments(text):
        if kept[comment] <= 0 and not _filled(comment, features):
            raise _refuse(name, line, f"editing would lose the comment '{echo(comment)}'; nothing written",
                          "the YAML library cannot keep comments inside {...} flow mappings: move it onto a line "
                          "of its own and run the command again")
        kept[comment] -= 1
    # raises InputError, nothing written; a template's unfilled placeholders may stay for the user to fill
    from_document(yamldoc.parse(new_text, name), real.parent, allow_placeholders=True)
    backup = None
    if keep_backup:
        backup = _backup_path(given)
        shutil.copy2(real, backup)
    output = ("\ufeff" if bom else "") + (new_text.replace("\n", "\r\n") if crlf else new_text)
    mode = stat.S_IMODE(real.stat().st_mode)
    handle, temporary = tempfile.mkstemp(prefix=f".{real.name}.", suffix=".tmp", dir=real.parent)
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(output.encode("utf-8"))
        os.chmod(temporary, mode)
        os.replace(temporary, real)
    except BaseException:
        Path(temporary).unlink(missing_ok=True)
        raise
    return Edit(report, backup)
