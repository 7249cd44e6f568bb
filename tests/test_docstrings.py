"""Every public calc function documents its units and a worked example, and the examples run."""

from __future__ import annotations

import doctest
import importlib
import inspect

import pytest

MODULES = ["aeroreview.calc.air", "aeroreview.calc.forces", "aeroreview.calc.roadload", "aeroreview.calc.cycles",
           "aeroreview.calc.wind", "aeroreview.calc.references", "aeroreview.units"]
GEOMETRY = ["aeroreview.calc.geometry.projection", "aeroreview.calc.geometry.sections",
            "aeroreview.calc.geometry.fits", "aeroreview.calc.geometry.construct"]


@pytest.mark.parametrize("name", MODULES + GEOMETRY)
def test_doctest_examples_pass(name):
    result = doctest.testmod(importlib.import_module(name))
    assert result.failed == 0


@pytest.mark.parametrize("name", MODULES[:-1])
def test_public_functions_have_worked_examples(name):
    module = importlib.import_module(name)
    for fname, function in inspect.getmembers(module, inspect.isfunction):
        if fname.startswith("_") or function.__module__ != module.__name__:
            continue
        doc = inspect.getdoc(function) or ""
        assert "[" in doc or "Example" in doc or ">>>" in doc, f"{name}.{fname} lacks units or an example"
        assert "Example" in doc or ">>>" in doc, f"{name}.{fname} lacks a worked example"
