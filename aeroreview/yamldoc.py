"""Read a YAML file safely and remember where every value was written.

Sheets are written by hand, so every error must point at a line and column. PyYAML's
composer gives nodes with positions; we build plain Python values from them ourselves
and keep a map from each value's path (``("features", "rear.backlight_angle")``) to its
position.

Building the values ourselves is also the defence against hostile files: a YAML alias
bomb ("billion laughs") composes into a handful of nodes but expands into billions of
values; we count every value we build and stop at :data:`MAX_VALUES`. Files larger than
:data:`MAX_BYTES`, files that are not UTF-8 and documents nested deeper than
:data:`MAX_DEPTH` are refused before any work is done on them.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import yaml

from aeroreview.problems import InputError, Problem, echo

MAX_BYTES = 1_000_000  # a feature sheet is a few kB; common practice for config-file limits
MAX_VALUES = 50_000  # far above any real sheet (a few hundred values), far below a bomb
MAX_DEPTH = 40

Path_ = tuple  # a path into the document: keys and list indexes
# libyaml's composer when present (several times faster); the pure-Python one otherwise.
_COMPOSER = getattr(yaml, "CSafeLoader", yaml.SafeLoader)
_STR = "tag:yaml.org,2002:str"
_MERGE = "tag:yaml.org,2002:merge"
# The tags a sheet can reach by writing plain YAML; an explicit tag outside them
# (!!binary, !!set, !!python/..., !local) is refused, so no unusual constructor ever runs.
_PLAIN_TAGS = {f"tag:yaml.org,2002:{name}" for name in
               ("str", "int", "float", "bool", "null", "timestamp", "seq", "map", "merge")}


@dataclass
class Document:
    """A parsed YAML document: plain values plus the position of each one."""

    file: str
    data: object
    marks: dict[Path_, tuple[int, int]] = field(default_factory=dict)
    key_marks: dict[Path_, tuple[int, int]] = field(default_factory=dict)

    def where(self, path: Path_, key: bool = False) -> tuple[int, int]:
        """Line and column (1-based) of the value at ``path`` (or of its key), falling back
        to the nearest written parent."""
        path = tuple(path)
        if key and path in self.key_marks:
            return self.key_marks[path]
        while path and path not in self.marks:
            path = path[:-1]
        return self.marks.get(path, (1, 1))

    def problem(self, path: Path_, message: str, hint: str = "", level: str = "error",
                key: bool = False) -> Problem:
        line, column = self.where(path, key)
        return Problem(self.file, line, column, message, hint, level)


def _refuse(file: str, message: str, hint: str, line: int = 1, column: int = 1) -> InputError:
    return InputError([Problem(file, line, column, message, hint)])


def read_text(path: Path, display: str | None = None) -> str:
    """Read a user's file as UTF-8 text, refusing oversize and undecodable files."""
    name = display or str(path)
    try:
        size = path.stat().st_size
        if size > MAX_BYTES:
            raise _refuse(name, f"file is {size:,} bytes, over the limit of {MAX_BYTES:,}",
                          "a feature sheet is a few kilobytes; split the file or remove embedded data")
        raw = path.read_bytes()
    except OSError as error:
        raise _refuse(name, f"cannot read file: {error.strerror}", "check the path and permissions") from None
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as error:
        line = raw[: error.start].count(b"\n") + 1
        column = error.start - (raw.rfind(b"\n", 0, error.start) + 1) + 1
        raise _refuse(name, f"file is not valid UTF-8 (byte 0x{raw[error.start]:02x})",
                      "save the file as UTF-8", line, column) from None


def parse(text: str, file: str, lenient_tags: bool = False) -> Document:
    """Parse YAML ``text`` into a :class:`Document`; raise :class:`InputError` on any problem.

    ``lenient_tags`` reads unknown tags (``!!python/name:...`` in an mkdocs.yml) as their
    text instead of refusing them; nothing is ever executed either way.
    """
    if not text.strip():
        raise _refuse(file, "file is empty", "start from `aeroreview new VEHICLE_ID --class CLASS`")
    loader = None
    try:
        loader = _COMPOSER(text)
        node = loader.get_single_node()
    except yaml.reader.ReaderError as error:
        line = text.count("\n", 0, error.position) + 1
        column = error.position - (text.rfind("\n", 0, error.position) + 1) + 1
        code = error.character if isinstance(error.character, int) else ord(error.character)
        raise _refuse(file, f"file holds a control character (U+{code:04X}) that YAML does not allow",
                      "remove it; sheets are plain text", line, column) from None
    except yaml.MarkedYAMLError as error:
        mark = error.problem_mark or error.context_mark
        line, column = (mark.line + 1, mark.column + 1) if mark else (1, 1)
        raise _refuse(file, f"YAML syntax error: {error.problem or error}",
                      "check indentation, colons and quotes near this position", line, column) from None
    except (yaml.YAMLError, RecursionError, ValueError, TypeError, AttributeError, KeyError, IndexError) as error:
        # PyYAML's composer can fail in more ways than its own error types; all mean "not readable YAML"
        mark = getattr(error, "problem_mark", None)
        line, column = (mark.line + 1, mark.column + 1) if mark else (1, 1)
        raise _refuse(file, f"YAML error: {type(error).__name__}: {error}", "check the file is one YAML document",
                      line, column) from None
    finally:
        if loader is not None:
            loader.dispose()
    if node is None:
        raise _refuse(file, "file holds no YAML document", "start from `aeroreview new VEHICLE_ID --class CLASS`")
    builder = _Builder(file, yaml.SafeLoader(""), lenient_tags)
    data = builder.build(node, (), 0, ())
    return Document(file, data, builder.marks, builder.key_marks)


def load(path: Path, display: str | None = None, lenient_tags: bool = False) -> Document:
    """Read and parse one YAML file."""
    name = display or str(path)
    return parse(read_text(path, name), name, lenient_tags)


class _Builder:
    """Turns composed nodes into plain values, counting them to defeat alias bombs."""

    def __init__(self, file: str, constructor: yaml.SafeLoader, lenient_tags: bool = False):
        self.file = file
        self.constructor = constructor
        self.lenient_tags = lenient_tags
        self.marks: dict[Path_, tuple[int, int]] = {}
        self.key_marks: dict[Path_, tuple[int, int]] = {}
        self.count = 0

    def _fail(self, node: yaml.Node, message: str, hint: str) -> InputError:
        return _refuse(self.file, message, hint, node.start_mark.line + 1, node.start_mark.column + 1)

    def build(self, node: yaml.Node, path: Path_ | None, depth: int, active: tuple) -> object:
        """Build the value of ``node``; ``path`` None means a mapping key (not recorded)."""
        self.count += 1
        if self.count > MAX_VALUES:
            raise self._fail(node, f"document expands to more than {MAX_VALUES:,} values",
                             "remove YAML aliases that repeat large blocks (this looks like an alias bomb)")
        if depth > MAX_DEPTH:
            raise self._fail(node, f"document is nested more than {MAX_DEPTH} levels deep",
                             "a feature sheet needs only a few levels")
        if id(node) in active:
            raise self._fail(node, "YAML alias refers to itself", "remove the recursive alias")
        if path is not None:
            self.marks[path] = (node.start_mark.line + 1, node.start_mark.column + 1)
        if node.tag not in _PLAIN_TAGS:
            if self.lenient_tags and isinstance(node, yaml.ScalarNode):
                return node.value
            if not self.lenient_tags:
                tag = node.tag.replace("tag:yaml.org,2002:", "!!")
                raise self._fail(node, f"the sheet format does not use the YAML tag '{echo(tag)}'",
                                 "remove the tag and write a plain value, list or mapping")
        if isinstance(node, yaml.ScalarNode):
            if node.tag == _STR:
                return node.value  # the common case, without the constructor's dispatch
            try:
                return self.constructor.construct_object(node)
            except Exception:  # noqa: BLE001 - PyYAML's constructors raise AttributeError, KeyError ... on bad text
                if self.lenient_tags:
                    return node.value
                kind = node.tag.rsplit(":", 1)[-1]
                raise self._fail(node, f"cannot read '{echo(node.value)}' as a YAML {kind}",
                                 "quote the value if it is text, or remove the explicit tag") from None
        active = active + (id(node),)
        if isinstance(node, yaml.SequenceNode):
            return [self.build(item, path + (i,), depth + 1, active) for i, item in enumerate(node.value)]
        if isinstance(node, yaml.MappingNode):
            return self._mapping(node, path, depth, active)
        raise self._fail(node, "unsupported YAML node", "use plain mappings, lists and scalars")

    def _mapping(self, node: yaml.MappingNode, path: Path_, depth: int, active: tuple) -> dict:
        result: dict = {}
        merged: dict = {}  # "<<: *base" merge keys: explicit keys win over merged ones
        for key_node, value_node in node.value:
            if key_node.tag == _MERGE:
                value = self.build(value_node, path + ("<<",), depth + 1, active)
                sources = value if isinstance(value, list) else [value]
                if not all(isinstance(source, dict) for source in sources):
                    raise self._fail(value_node, "a merge key (<<) needs a mapping or a list of mappings",
                                     "write <<: *anchor where the anchor names a mapping")
                for source in reversed(sources):
                    merged.update(source)
                continue
            if not isinstance(key_node, yaml.ScalarNode):
                raise self._fail(key_node, "mapping keys must be plain text", "write the key as a word")
            key = key_node.value if key_node.tag == _STR else self.build(key_node, None, depth + 1, active)
            if not isinstance(key, (str, int, float)) or isinstance(key, bool):
                key = str(key)
            if key in result:
                raise self._fail(key_node, f"key '{key}' appears twice in this mapping",
                                 "keep one of them; the later one would silently win")
            self.key_marks[path + (key,)] = (key_node.start_mark.line + 1, key_node.start_mark.column + 1)
            result[key] = self.build(value_node, path + (key,), depth + 1, active)
        for key, value in merged.items():
            result.setdefault(key, value)
        return result
