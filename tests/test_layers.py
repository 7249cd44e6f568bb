"""The layers hold: every module imports only from its own layer or below.

calc < vocabulary < rules < engine < outputs (DESIGN.md, "Data flow"). The imports are read
from the source with ``ast`` (no import runs), including the ones inside functions and
``TYPE_CHECKING`` blocks and ``importlib.import_module("...")`` calls with a literal name,
so a lazy import cannot hide a dependency. A module not listed below counts as engine: a
new engine module needs no entry here, a new vocabulary or output module does.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

from conftest import ROOT

LAYERS = ("calc", "vocabulary", "rules", "engine", "outputs")
# Module (or package) name -> layer; the longest matching prefix decides.
ASSIGNED = {
    "aeroreview.calc": "calc",
    "aeroreview": "vocabulary",  # the package itself (only the version), not its sub-modules
    "aeroreview.catalogue": "vocabulary", "aeroreview.units": "vocabulary", "aeroreview.problems": "vocabulary",
    "aeroreview.names": "vocabulary", "aeroreview.yamldoc": "vocabulary", "aeroreview.paths": "vocabulary",
    "aeroreview.sections": "vocabulary", "aeroreview.display": "vocabulary", "aeroreview.conversions": "vocabulary",
    "aeroreview.rules": "rules",
    "aeroreview.cli": "outputs", "aeroreview.calc_cli": "outputs", "aeroreview.__main__": "outputs",
    "aeroreview.results_cli": "outputs",
    "aeroreview.site": "outputs",
}
ROOTS = {"aeroreview": ROOT / "aeroreview", "aeroreview.calc": ROOT / "calc", "aeroreview.rules": ROOT / "rules"}


def modules() -> dict[str, Path]:
    found = {}
    for name, folder in ROOTS.items():
        for path in folder.rglob("*.py"):
            parts = path.relative_to(folder).with_suffix("").parts
            if "__pycache__" in parts or (name == "aeroreview" and parts[0] in ("calc", "rules")):
                continue
            found[".".join((name, *parts)).removesuffix(".__init__")] = path
    return found


MODULES = modules()


def layer_of(module: str) -> str:
    prefixes = [p for p in ASSIGNED if module == p or (p != "aeroreview" and module.startswith(p + "."))]
    return ASSIGNED[max(prefixes, key=len)] if prefixes else "engine"


def imported(module: str, path: Path) -> set[str]:
    """The aeroreview modules ``path`` imports, anywhere in it (a name imported from a package
    counts as that sub-module when one exists, else as the package)."""
    package = module if path.name == "__init__.py" else module.rpartition(".")[0]
    out = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            out |= {alias.name for alias in node.names}
        elif isinstance(node, ast.ImportFrom):
            base = node.module or ""
            if node.level:
                parent = package.split(".")[: len(package.split(".")) - node.level + 1]
                base = ".".join(parent + ([node.module] if node.module else []))
            out |= {f"{base}.{a.name}" if f"{base}.{a.name}" in MODULES else base for a in node.names}
        elif (isinstance(node, ast.Call) and getattr(node.func, "attr", getattr(node.func, "id", "")) == "import_module"
              and node.args and isinstance(node.args[0], ast.Constant) and isinstance(node.args[0].value, str)):
            out.add(node.args[0].value)
    return {name for name in out if name == "aeroreview" or name.startswith("aeroreview.")}


def test_the_modules_are_found():
    assert {"aeroreview.sheet", "aeroreview.calc.geometry.profile", "aeroreview.rules.rear",
            "aeroreview.site.pages.revision"} <= set(MODULES)


@pytest.mark.parametrize("module", sorted(MODULES))
def test_imports_stay_in_the_layer_or_below(module):
    mine = LAYERS.index(layer_of(module))
    above = sorted(name for name in imported(module, MODULES[module]) if LAYERS.index(layer_of(name)) > mine)
    assert not above, (f"{module} ({layer_of(module)}) imports {', '.join(f'{n} ({layer_of(n)})' for n in above)}: "
                       "move the shared piece down a layer, or assign the module in tests/test_layers.py")


def test_a_lazy_import_is_seen(tmp_path):
    """The reader finds an import inside a function, as measure.py once hid one of site.figures."""
    sample = tmp_path / "sample.py"
    sample.write_text("def f():\n    from aeroreview.site.figures import FigureCache\n    return FigureCache\n",
                      encoding="utf-8")
    assert imported("aeroreview.sample", sample) == {"aeroreview.site.figures"}
