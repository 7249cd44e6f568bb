"""Shared test helpers: the repository root, the demo fleet, and running the CLI in-process."""

from __future__ import annotations

import io
from contextlib import redirect_stderr, redirect_stdout
from pathlib import Path

import pytest

from aeroreview.cli import main

ROOT = Path(__file__).resolve().parents[1]
VEHICLES = ROOT / "vehicles"
DEMO_SHEETS = sorted(VEHICLES.rglob("*.yaml"))


class Run:
    def __init__(self, code: int, out: str, err: str):
        self.code, self.out, self.err = code, out, err


def run_cli(*args: str) -> Run:
    """Run ``aeroreview ARGS`` in-process and capture its exit code and output."""
    out, err = io.StringIO(), io.StringIO()
    with redirect_stdout(out), redirect_stderr(err):
        code = main([str(a) for a in args])
    return Run(code, out.getvalue(), err.getvalue())


@pytest.fixture
def cli():
    return run_cli


MINIMAL = """\
id: test-car
revision: r1
features:
  vehicle.class: sedan
  dimensions.length: 4.8 m
  dimensions.width: 1.85 m
  dimensions.height: 1.45 m
  mass.curb: 1800 kg
  powertrain.kind: electric
"""


@pytest.fixture
def write_sheet(tmp_path):
    """Write sheet text to a file in a temporary folder and return its path."""

    def write(text: str | bytes, name: str = "sheet.yaml") -> Path:
        path = tmp_path / name
        path.parent.mkdir(parents=True, exist_ok=True)
        if isinstance(text, bytes):
            path.write_bytes(text)
        else:
            path.write_text(text, encoding="utf-8")
        return path

    return write
