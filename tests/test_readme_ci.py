"""The README promises one line that sets up and runs the tests; CI must run that very line."""

from __future__ import annotations

import re

from conftest import ROOT


def readme_test_line() -> str:
    """The single command in the code block that follows the README's "Run the tests" paragraph."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    after = text[text.index("Run the tests"):]
    block = re.search(r"```sh\n(.*?)\n```", after, re.S).group(1)
    lines = [line for line in block.splitlines() if line.strip()]
    assert len(lines) == 1, f"the README's test command must be one line, found {lines}"
    return lines[0]


def test_ci_runs_the_readme_test_line_character_for_character():
    line = readme_test_line()
    commands = [c for c in (ROOT / ".ci/run").read_text(encoding="utf-8").splitlines()
                if c.strip() and not c.lstrip().startswith("#")]
    assert line in commands, f".ci/run does not run the README's test line:\n{line}"
    # Nothing after it: CI's verdict is that line's exit status.
    assert commands[-1] == line


def test_the_test_line_installs_the_browser_and_runs_pytest():
    line = readme_test_line()
    assert "apt-get install" in line and "chromium" in line
    assert "-x /usr/bin/chromium" in line, "installs the browser only when it is missing"
    assert line.endswith("-m pytest")
