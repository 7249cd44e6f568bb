"""``aeroreview init DIR``: a team's own knowledge base, ready for its first sheet.

It holds what the demo repository holds, less the demo: ``mkdocs.yml`` (the site and the
review settings), the hand-written pages (installed from ``site_src/``, with the demo's
invented-fleet text taken out), an empty ``vehicles/`` folder and a CI script that runs the
gate. Only a new or empty folder is used, so nothing a team wrote is ever overwritten.
"""

from __future__ import annotations

import re
from importlib import resources
from pathlib import Path

from aeroreview.problems import UsageError

# Text between these markers in a hand-written page is about the demo fleet only.
DEMO_ONLY = re.compile(r"<!-- aeroreview:demo -->\n.*?<!-- aeroreview:/demo -->\n", re.S)

CONFIG = """\
# The knowledge base's one configuration file: the MkDocs site and the review settings.
# `aeroreview check`, `aeroreview site build` and `mkdocs build` all read it.
site_name: Aerodynamic reviews
docs_dir: site_src          # hand-written pages; generated pages never land here
site_dir: site
strict: true
theme:
  name: material
  font: false               # system fonts: the site works offline
  features:
    - navigation.sections
    - navigation.top
    - search.highlight
extra_css:
  - stylesheets/aeroreview.css
markdown_extensions:
  - tables
  - admonition
  - attr_list
  - toc:
      permalink: true
extra:
  polyfills:
    - javascripts/iframe-worker.js  # the search worker from file:// (the offline plugin would fetch it from a CDN)
plugins:
  - search
  - offline                 # Material's: plain .html links and the search index as a script, so the site
                            # (search included) works opened from disk as well as served
  - aeroreview:
      sheets: vehicles          # one sheet per revision: vehicles/<id>/<revision>.yaml
      reference_speed: 130 km/h
      air: {altitude: 0 m}      # or temperature, pressure, humidity
      cycle: wltc-3b            # or constant-120 ...
      fail_on: failure          # advisory | warning | failure | never
      # rules:                  # per-rule overrides, e.g.
      #   rear.backlight-angle: {severity: warning, thresholds: {critical_low: 27 deg}}
nav:
  - Home: index.md
  - Fleet: fleet/index.md
  - Track record: fleet/track-record.md
  - Rules: rules/index.md
  - Calibrations: calibrations/index.md
  - Feature reference: features.md
  - Methods:
      - methods/index.md
      - Standard atmosphere: methods/atmosphere.md
      - Drag and lift: methods/forces.md
      - Road load and WLTC: methods/roadload.md
      - Wind-averaged drag (SAE J1252): methods/wind-averaged.md
      - The Ahmed body: methods/ahmed.md
      - Estimates, score and track record: methods/estimates.md
  - Glossary: glossary.md
  - Cautions: cautions.md
"""

CI_GATE = """\
#!/bin/sh
# The review gate for CI: run it from any CI job, after installing aeroreview.
# Exit 1: a sheet has a finding at or above `fail_on` (mkdocs.yml) that no waiver covers.
# Exit 2: an input error, such as a placeholder left from `aeroreview new`.
# review.sarif lets a code-review platform annotate the exact sheet line of each finding.
set -u
cd "$(dirname "$0")/.."
aeroreview check --format sarif --output review.sarif >/dev/null 2>&1
aeroreview check
"""

GITIGNORE = "/site/\n.cache/\nreview.sarif\n"


def _pages():
    """The installed hand-written pages, as (relative path, text) pairs."""
    root = resources.files("aeroreview.starter_pages")
    stack = [(root, "")]
    while stack:
        folder, prefix = stack.pop()
        for entry in folder.iterdir():
            name = f"{prefix}{entry.name}"
            if entry.is_dir():
                stack.append((entry, f"{name}/"))
            elif entry.name.endswith((".md", ".css", ".js")):
                yield name, DEMO_ONLY.sub("", entry.read_text(encoding="utf-8"))


def create(folder: Path) -> list[Path]:
    """Write a new knowledge base into ``folder`` (new or empty); the files written."""
    if folder.exists() and not folder.is_dir():
        raise UsageError(f"{folder} is a file; give a new or empty folder")
    if folder.is_dir() and any(folder.iterdir()):
        raise UsageError(f"{folder} is not empty; `aeroreview init` writes only into a new or empty folder, "
                         "so nothing there is overwritten")
    files = {"mkdocs.yml": CONFIG, "ci/gate.sh": CI_GATE, ".gitignore": GITIGNORE}
    files.update((f"site_src/{name}", text) for name, text in _pages())
    written = []
    try:
        (folder / "vehicles").mkdir(parents=True)
        for name, text in sorted(files.items()):
            path = folder / name
            path.parent.mkdir(parents=True, exist_ok=True)
            path.write_text(text, encoding="utf-8")
            written.append(path)
        (folder / "ci/gate.sh").chmod(0o755)
    except OSError as error:
        raise UsageError(f"cannot write {folder}: {error.strerror}") from None
    return written
