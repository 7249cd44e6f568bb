"""The feature reference page, generated from the catalogue."""

from __future__ import annotations

from aeroreview import catalogue
from aeroreview.site.pages.common import Output


def write(out: Output) -> None:
    lines = ["# Feature reference", "", "Every feature a sheet may carry, generated from the catalogue. Values are "
             "a number in the unit shown, a string with a unit (`\"27 deg\"`), or `{value, source, note}`.", ""]
    for zone, items in catalogue.by_zone().items():
        lines += [f"## {catalogue.ZONES[zone]}", "", "| Key | Unit | Typical | How to measure |", "|---|---|---|---|"]
        for item in items:
            typical = f"{item.typical_text()} ({item.typical_source})" if item.typical else ""
            lines.append(f"| `{item.key}`{' (required)' if item.required else ''} | {item.unit_label()} "
                         f"| {typical} | {item.description} {item.how_to_measure} |")
        lines.append("")
    out.page("features.md", "\n".join(lines))
