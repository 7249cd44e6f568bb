"""The rule index and one page per rule, generated from the rule's code and docstring."""

from __future__ import annotations

from aeroreview.digest import ahmed_curve
from aeroreview.review import Review
from aeroreview.rules import ZONES, Rule, all_rules
from aeroreview.site.pages.common import Output, badge, esc, kind_suffix, link, revision_path
from aeroreview.site.pages.revision_figures import ahmed_data


def write(out: Output, by_vehicle: dict[str, list[Review]]) -> None:
    index = ["# Rules", "", f"{len(all_rules())} rules in {len(ZONES)} zones. Each page is generated from the "
             "rule's code: its documentation, thresholds and sources.", ""]
    for zone, title in ZONES.items():
        index += [f"## {title}", "", "| Rule | Title | Severity |", "|---|---|---|"]
        index += [f"| [{r.id}]({r.id}.md) | {r.title} | {r.severity} |" for r in all_rules().values()
                  if r.zone == zone]
        index.append("")
    out.page("rules/index.md", "\n".join(index))
    for rule in all_rules().values():
        out.page(f"rules/{rule.id}.md", rule_page(out, rule, by_vehicle))


def sensitivity_section(out: Output, rule: Rule) -> list[str]:
    """The rule's stated slope, and the team's calibration of it with a link to its page."""
    sens = rule.sensitivity
    if sens is None:
        return []
    lines = ["## Sensitivity", "", f"{sens.counts_per_unit:+g} drag counts per {sens.unit} of `{sens.feature}` "
             f"between {sens.valid[0]:g} and {sens.valid[1]:g} {sens.unit} ({sens.source.citation}; "
             f"*{sens.source.kind}*). The fix takes the feature to the `{sens.fix_to}` threshold.", ""]
    for cal, slope in out.settings.calibrated.get(sens.feature, []):
        lines += [f"**Team data** for {esc(cal.scope)}: {link(f'calibrations/{cal.slug}.md', esc(cal.label), 1)}: "
                  f"{slope.counts_per_unit:+.3g} counts per {esc(slope.unit)} (95 % {slope.ci95[0]:+.3g} to "
                  f"{slope.ci95[1]:+.3g}) over {slope.study_range[0]:g}-{slope.study_range[1]:g} {esc(slope.unit)}, "
                  f"**{slope.agreement}**. The estimates of those vehicles use it for the part of the fix inside that "
                  "range, and the library estimate pro rata for the part beyond it; other vehicles keep the "
                  "library estimate.", ""]
    return lines


def rule_page(out: Output, rule: Rule, by_vehicle: dict[str, list[Review]]) -> str:
    lines = [f"# {rule.id}", "", f"**{rule.title}** · zone {ZONES[rule.zone]} · default severity "
             f"{rule.severity} · needs {', '.join(f'`{k}`' for k in rule.needs) or 'results only'}"
             + (f" · applies to {', '.join(rule.applies_to)}" if rule.applies_to else ""), ""]
    for title, body in rule.doc.items():
        lines += [f"## {title}", "", body[0].upper() + body[1:], ""]
    if rule.examples:
        lines += ["## Examples", "", "Changes to the demo's clean revision (`vehicles/tessel/r2.yaml`) and what the rule "
                  "then reports:", ""]
        lines += [f"- {'passes' if status == 'pass' else 'fails (' + status + ')'}: `{fragment}`"
                  for status, fragment in rule.examples] + [""]
    if rule.thresholds:
        lines += ["## Thresholds", "", "Override them in the `aeroreview` section of `mkdocs.yml`.", "",
                  "| Name | Default | Meaning | Source | Kind |", "|---|---|---|---|---|"]
        lines += [f"| `{t.name}` | {t.default} | {t.description} | {t.source.citation} | {t.source.kind} |"
                  for t in rule.thresholds]
        lines.append("")
    lines += ["## Sources", ""] + [f"- {s.citation}{kind_suffix(s, '*')}" for s in rule.sources] + [""]
    lines += sensitivity_section(out, rule)
    if rule.figure == "ahmed":
        lines += ["## Reference", "", out.figure("ahmed", ahmed_data(ahmed_curve(out.settings, None)),
                                                 "The Ahmed-body drag coefficient against slant angle, with the "
                                                 "critical region near 30 deg", 1), ""]
    latest = [revisions[-1] for revisions in by_vehicle.values()]
    earlier = [r for revisions in by_vehicle.values() for r in revisions[:-1]]
    lines += ["## Latest revisions that fail or warn", "", "Each vehicle's latest revision.", ""]
    lines += _flagged(rule, latest) or ["None."]
    lines += ["", "## Earlier revisions that failed or warned", "", "Superseded revisions, for the record.", ""]
    lines += _flagged(rule, earlier) or ["None."]
    return "\n".join(lines) + "\n"


def _flagged(rule: Rule, reviews: list[Review]) -> list[str]:
    return [f"- {link(revision_path(r), f'{esc(r.sheet.name)} {esc(r.sheet.revision)}', 1)}: "
            f"{badge(f.status)} {esc(f.verdict.message)}"
            for r in reviews for f in r.findings if f.rule.id == rule.id and f.status in ("warning", "failure")]
