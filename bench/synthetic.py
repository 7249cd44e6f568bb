"""Synthetic sheets for the benchmarks: the demo sheets with every number varied a little."""

from __future__ import annotations

import random
import re
from pathlib import Path

DEMO = Path(__file__).resolve().parents[1] / "vehicles"
NUMBER = re.compile(r"(?<=: )(\d+\.?\d*)(?= (mm|deg|m|kg|m\^2|kWh|km/h|%|in|L)\b)")
FILES = re.compile(r"^(attachments|geometry):.*?(?=^\S|\Z)", re.M | re.S)  # sections naming files beside a sheet
RESULT_FILES = re.compile(r"^( +)files:\n(?:\1 +- .*\n)+", re.M)  # the files a result was read from


def templates() -> list[str]:
    """The demo sheets without what names files beside them (images, surfaces, result files)."""
    return [RESULT_FILES.sub("", FILES.sub("", p.read_text(encoding="utf-8"))) for p in sorted(DEMO.rglob("*.yaml"))]


def vary(text: str, rng: random.Random, spread: float) -> str:
    """Every number with a unit scaled by a random factor within +-spread."""
    return NUMBER.sub(lambda m: f"{float(m.group(1)) * rng.uniform(1 - spread, 1 + spread):.4g}", text)


def identity(text: str, vehicle: str, revision: str, parent: str | None) -> str:
    text = re.sub(r"^id: .*", f"id: {vehicle}", text, flags=re.M)
    text = re.sub(r"^revision: .*", f"revision: {revision}", text, flags=re.M)
    text = re.sub(r"^parent: .*\n", "", text, flags=re.M)
    return text.replace(f"revision: {revision}\n", f"revision: {revision}\nparent: {parent}\n") if parent else text
