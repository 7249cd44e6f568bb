"""The review as SARIF 2.1.0 (the OASIS Static Analysis Results Interchange Format).

Code-review platforms read SARIF to annotate the exact line of a file: here the sheet line
of the first feature a finding judges (or the sheet's ``results:`` for rules that judge the
results). Built from the same :func:`aeroreview.report.as_json` data as the other reports.
Findings that pass or could not be assessed are left out; waived findings are kept with a
suppression that quotes the waiver's reason; input errors and warnings are results of their
own (``input.error``, ``input.warning``) at their file, line and column.
"""

from __future__ import annotations

import json
from pathlib import PurePath
from urllib.parse import quote

from aeroreview import __version__
from aeroreview.rules import actionable, all_rules

SCHEMA = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
# SARIF levels (SARIF 2.1.0 section 3.27.10) for our statuses and severities.
LEVEL = {"failure": "error", "warning": "warning", "advisory": "note"}
INPUT_RULES = {
    "input.error": ("Input error", "A sheet or setting that cannot be read as written: fix it to review the revision.",
                    "error"),
    "input.warning": ("Input doubt", "A value outside its typical range, or another doubt about the input.", "warning"),
}


def _uri(file: str) -> dict:
    """An artifactLocation: relative paths against the checkout root (%SRCROOT%), absolute ones as file URIs."""
    path = PurePath(file)
    if path.is_absolute():
        return {"uri": path.as_uri()}
    return {"uri": quote(path.as_posix()), "uriBaseId": "%SRCROOT%"}


def _location(file: str, line: int, column: int | None = None) -> dict:
    region = {"startLine": max(1, int(line))}
    if column:
        region["startColumn"] = max(1, int(column))
    return {"physicalLocation": {"artifactLocation": _uri(file), "region": region}}


def _descriptors() -> list[dict]:
    rules = [{"id": rule.id, "name": rule.id.replace(".", "-"), "shortDescription": {"text": rule.title},
              "fullDescription": {"text": rule.doc.get("Why it matters", rule.title)},
              "help": {"text": rule.fix or rule.title},
              "defaultConfiguration": {"level": LEVEL[rule.severity]},
              "properties": {"zone": rule.zone, "sources": [s.as_dict() for s in rule.sources]}}
             for rule in all_rules().values()]
    rules += [{"id": rule_id, "name": rule_id.replace(".", "-"), "shortDescription": {"text": title},
               "fullDescription": {"text": text}, "defaultConfiguration": {"level": level}}
              for rule_id, (title, text, level) in INPUT_RULES.items()]
    return rules


def _message(finding: dict, fix: str) -> str:
    text = f"{finding['title']}: {finding['message']}"
    if finding["measured"] and finding["limit"]:
        text += f" (measured {finding['measured']}, limit {finding['limit']})"
    if fix:
        text += f". Fix: {fix}"
    return text


def as_sarif(data: dict) -> str:
    """One SARIF log with one run of aeroreview over every sheet in ``data``."""
    descriptors = _descriptors()
    index = {d["id"]: i for i, d in enumerate(descriptors)}
    results = []
    fixes = {rule_id: rule["fix"] for rule_id, rule in data["rules"].items()}
    for sheet in data["sheets"]:
        gate = set(sheet["failing"])
        for finding in sheet["findings"]:
            if not actionable(finding["status"]):
                continue
            result = {"ruleId": finding["rule"], "ruleIndex": index[finding["rule"]],
                      "level": LEVEL[finding["status"]], "message": {"text": _message(finding, fixes[finding["rule"]])},
                      "locations": [_location(sheet["file"], finding["line"])],
                      "properties": {"vehicle": sheet["vehicle"], "revision": sheet["revision"],
                                     "status": finding["status"], "failsGate": finding["rule"] in gate}}
            waiver = finding["waiver"]
            if waiver and waiver.get("status") == "active":
                result["suppressions"] = [{"kind": "inSource", "status": "accepted",
                                           "justification": waiver["reason"]}]
            results.append(result)
    for rule_id, problems in (("input.error", data["errors"]), ("input.warning", data["warnings"])):
        for problem in problems:
            text = problem["message"] + (f"; {problem['hint']}" if problem["hint"] else "")
            results.append({"ruleId": rule_id, "ruleIndex": index[rule_id], "level": INPUT_RULES[rule_id][2],
                            "message": {"text": text},
                            "locations": [_location(problem["file"], problem["line"], problem["column"])]})
    log = {"$schema": SCHEMA, "version": "2.1.0",
           "runs": [{"tool": {"driver": {"name": "aeroreview", "version": __version__, "rules": descriptors}},
                     "columnKind": "unicodeCodePoints", "results": results}]}
    return json.dumps(log, indent=2) + "\n"
