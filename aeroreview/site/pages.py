"""The generated pages of the review site, as Markdown, from the reviews.

:func:`generate` returns every generated file (path inside the site's docs, and its text or
bytes): the fleet, each vehicle, each revision, each pair of consecutive revisions, each
rule, the feature reference, and the figures they show. Pure functions of the reviews and
the settings; MkDocs only renders what comes out.

Every piece of text that comes from a sheet goes through :func:`esc`, so that HTML and
Markdown in a note or a name show as typed, never as markup.
"""

from __future__ import annotations

import datetime
import hashlib
import json
import math
from dataclasses import dataclass, field
from pathlib import Path, PurePosixPath

import numpy as np

from aeroreview import catalogue
from aeroreview.calc.air import G0
from aeroreview.calc.forces import axle_lift, drag_force
from aeroreview.calc.references import AHMED_ATTACHED, AHMED_SEPARATED, AHMED_SOURCE
from aeroreview.calc.wind import J1252_WIND_SPEED, max_yaw, wind_averaged_cd
from aeroreview.review import ADDITIVITY_NOTE, Finding, Review, failing
from aeroreview.rules import NOT_ASSESSED, ZONES, all_rules
from aeroreview.settings import Settings, status_rank
from aeroreview.site.figures import FigureCache

CAUTION = ("!!! warning \"Cautions\"\n"
           "    Aerodynamic changes alter high-speed stability, cooling, braking and pedestrian-impact behaviour.\n"
           "    These findings are review aids built from rules of thumb and published results, not sign-off:\n"
           "    confirm every change by validated CFD, wind-tunnel and road testing, follow your local vehicle\n"
           "    regulations (aftermarket body parts included), and have changes approved by licensed engineers.\n")
WATERFALL_STEPS = 8  # the largest fixes only: beyond these, interactions swamp the sum
# HTML's special characters and Markdown's, each replaced by a character entity in one pass.
_INERT = {**{c: f"&#{ord(c)};" for c in "\\`*_{}[]()#+-!|~"},
          "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#x27;"}


def esc(text) -> str:
    """Sheet text made inert: HTML and Markdown specials as entities, folded onto one line."""
    return " ".join("".join(_INERT.get(c, c) for c in str(text)).split())


def heading(text: str) -> str:
    """Front matter and an H1 for a page whose title holds sheet text.

    MkDocs and the theme put a page's title into <title> and the navigation unescaped, so
    the title itself must carry no markup characters at all: they are dropped from it (the
    H1 on the page shows the full text, escaped).
    """
    plain = "".join(c for c in str(text) if c not in "<>&\"'`\\") or "untitled"
    return f"---\ntitle: {json.dumps(' '.join(plain.split()))}\n---\n\n# {esc(text)}"


def paragraphs(text: str) -> str:
    """Multi-line sheet text (notes) as escaped paragraphs."""
    return "\n\n".join(esc(part) for part in str(text).split("\n\n") if part.strip())


def badge(status: str) -> str:
    css = status.replace(" ", "-")
    return f'<span class="ar-status ar-{css}">{status}</span>'


@dataclass
class Site:
    """What :func:`generate` returns: files by path, and the figure cache's counters."""

    files: dict[str, str | bytes] = field(default_factory=dict)
    home_table: str = ""


class _Writer:
    def __init__(self, reviews: list[Review], settings: Settings, cache: FigureCache):
        self.settings = settings
        self.cache = cache
        self.site = Site()
        self.by_vehicle: dict[str, list[Review]] = {}
        for review in sorted(reviews, key=lambda r: (r.sheet.vehicle_id, r.sheet.reviewed or _FAR_PAST,
                                                     r.sheet.revision)):
            self.by_vehicle.setdefault(review.sheet.vehicle_id, []).append(review)

    # -- helpers -------------------------------------------------------------------
    def figure(self, kind: str, data, alt: str, depth: int) -> str:
        name, content = self.cache.svg(kind, data)
        self.site.files[f"figures/{name}"] = content
        return f'![{esc(alt)}]({"../" * depth}figures/{name})'

    def ahmed_data(self, angle: float | None) -> dict:
        low, high = _critical_region(self.settings)
        return {"attached": [[p.angle, p.cd] for p in AHMED_ATTACHED],
                "separated": [[p.angle, p.cd] for p in AHMED_SEPARATED], "critical_low": low, "critical_high": high,
                "angle": None if angle is None else round(angle, 2), "source": AHMED_SOURCE}

    @staticmethod
    def revision_path(review: Review) -> str:
        return f"fleet/{review.sheet.vehicle_id}/{review.sheet.revision}.md"

    def sheet_name(self, sheet) -> str:
        """The sheet's path relative to the knowledge base (never the reviewer's absolute path)."""
        path = Path(sheet.path).resolve()
        try:
            return path.relative_to(self.settings.root.resolve()).as_posix()
        except ValueError:
            return path.name

    def link(self, target: str, text: str, depth: int) -> str:
        return f"[{text}]({'../' * depth}{target})"

    # -- fleet and home ------------------------------------------------------------
    def fleet_table(self, depth: int) -> str:
        rows = ["| Vehicle | Class | Latest revision | Cd | CdA [m²] | Score (coverage) | Failures / warnings "
                "| Recoverable [counts] | Reviewed |", "|---|---|---|---|---|---|---|---|---|"]
        for vehicle_id, reviews in sorted(self.by_vehicle.items()):
            latest = reviews[-1]
            numbers = latest.key_numbers
            tally = latest.counts_by_status()
            kind = "estimated" if numbers["cd_estimated"] else "measured"
            rows.append(
                f"| {self.link(f'fleet/{vehicle_id}/index.md', esc(latest.sheet.name), depth)} "
                f"| {latest.sheet.get('vehicle.class')} "
                f"| {self.link(self.revision_path(latest), esc(latest.sheet.revision), depth)} "
                f"| {numbers['cd']:.3f} ({kind}) | {numbers['cda']:.3f} | {_score(latest)} "
                f"| {tally['failure']} / {tally['warning']} "
                f"| {latest.recoverable[0]:g}-{latest.recoverable[1]:g} "
                f"| {latest.sheet.reviewed.isoformat() if latest.sheet.reviewed else 'not given'} |")
        return "\n".join(rows) + f"\n\nRecoverable counts are low-high sums; {ADDITIVITY_NOTE}.\n"

    def fleet_pages(self) -> None:
        self.site.home_table = self.fleet_table(0)
        self.site.files["fleet/index.md"] = (
            "# Fleet\n\nEvery vehicle of the knowledge base with its latest reviewed revision.\n\n"
            + self.fleet_table(1) + "\n" + CAUTION)
        for vehicle_id, reviews in self.by_vehicle.items():
            self.vehicle_page(vehicle_id, reviews)
            for review in reviews:
                self.revision_page(review)
            known = {r.sheet.revision: r for r in reviews}
            for review in reviews:
                if review.sheet.parent in known:
                    self.diff_page(known[review.sheet.parent], review)

    def vehicle_page(self, vehicle_id: str, reviews: list[Review]) -> None:
        latest = reviews[-1]
        lines = [heading(latest.sheet.name), "",
                 f"Vehicle id `{vehicle_id}`, class {latest.sheet.get('vehicle.class')}, "
                 f"{len(reviews)} revision(s).", "",
                 "| Revision | Parent | Reviewed | Cd | Score (coverage) | Failures / warnings | Recoverable [counts] "
                 "| Changes |", "|---|---|---|---|---|---|---|---|"]
        for review in reviews:
            sheet = review.sheet
            tally = review.counts_by_status()
            changes = self.link(f"{sheet.parent}-to-{sheet.revision}.md", "what changed", 0) \
                if sheet.parent in {r.sheet.revision for r in reviews} else ""
            lines.append(f"| {self.link(f'{sheet.revision}.md', esc(sheet.revision), 0)} | {esc(sheet.parent or '')} "
                         f"| {sheet.reviewed or ''} | {review.key_numbers['cd']:.3f} | {_score(review)} "
                         f"| {tally['failure']} / {tally['warning']} "
                         f"| {review.recoverable[0]:g}-{review.recoverable[1]:g} | {changes} |")
        data = {"name": latest.sheet.name, "revisions": [r.sheet.revision for r in reviews],
                "cd": [round(r.key_numbers["cd"], 4) for r in reviews],
                "score": [None if r.score is None else round(r.score, 1) for r in reviews],
                "recoverable": [round(sum(r.recoverable) / 2, 1) for r in reviews]}
        alt = (f"Revision trends of {latest.sheet.name}: Cd " + ", ".join(f"{c:.3f}" for c in data["cd"])
               + "; score " + ", ".join(f"{s:.0f}" if s is not None else "none" for s in data["score"]))
        lines += ["", "## Trends", "", self.figure("trends", data, alt, 2), ""]
        self.site.files[f"fleet/{vehicle_id}/index.md"] = "\n".join(lines)

    # -- revision ------------------------------------------------------------------
    def revision_page(self, review: Review) -> None:
        sheet = review.sheet
        lines = [heading(f"{sheet.name}, revision {sheet.revision}"), "",
                 f"[{esc(sheet.name)}](index.md) · class {sheet.get('vehicle.class')} · reviewed "
                 f"{sheet.reviewed or 'date not given'}{' by ' + esc(sheet.reviewer) if sheet.reviewer else ''} · "
                 f"sheet `{esc(self.sheet_name(sheet))}`", ""]
        if sheet.parent:
            lines += [f"Derived from revision {esc(sheet.parent)}: "
                      f"[what changed]({sheet.parent}-to-{sheet.revision}.md).", ""]
        gate = failing(review, self.settings.fail_on)
        verdict = (f"**Fails the gate** (fail level {self.settings.fail_on}): "
                   + ", ".join(f.rule.id for f in gate)) if gate else f"Passes the gate (fail level {self.settings.fail_on})."
        lines += [f"**Score {_score(review)}** · recoverable {review.recoverable[0]:g}-{review.recoverable[1]:g} "
                  f"drag counts ({ADDITIVITY_NOTE}) · {verdict}", "", CAUTION]
        lines += self.key_numbers(review)
        lines += self.revision_figures(review)
        lines += self.findings(review)
        lines += self.ranked_fixes(review)
        lines += self.attachments(review)
        if sheet.notes:
            lines += ["## Notes", "", paragraphs(sheet.notes), ""]
        if review.notices:
            lines += ["## Notices", ""] + [f"- {esc(n.message)}; {esc(n.hint)}" for n in review.notices] + [""]
        self.site.files[self.revision_path(review)] = "\n".join(lines)

    def key_numbers(self, review: Review) -> list[str]:
        n = review.key_numbers
        ref = n["reference_speed_km_h"]
        rows = [("Drag coefficient Cd", f"{n['cd']:.3f} ({'estimated' if n['cd_estimated'] else 'measured'}: "
                                        f"{esc(n['cd_source'])})"),
                ("Frontal area A", f"{n['area']:.2f} m²"), ("Drag area CdA", f"{n['cda']:.3f} m²"),
                (f"Drag at {ref:.0f} km/h", f"{n['drag_N']:.0f} N"),
                (f"Drag power at {ref:.0f} km/h", f"{n['drag_power_kW']:.1f} kW")]
        for key, label in (("lift_reference", f"{ref:.0f} km/h"), ("lift_top_speed", "top speed")):
            lift = n.get(key)
            if lift:
                rows.append((f"Lift per axle at {label} ({lift['speed_km_h']:.0f} km/h)",
                             f"front {lift['front_kg']:+.0f} kg ({lift['front_share'] * 100:+.1f} % of its static load), "
                             f"rear {lift['rear_kg']:+.0f} kg ({lift['rear_share'] * 100:+.1f} %)"))
        if not n.get("lift_reference"):
            rows.append(("Lift per axle", "not available: no result with cl_front and cl_rear"))
        rows += [(f"Energy on {n['cycle']}", f"{n['energy_kWh_per_100km']:.2f} kWh per 100 km "
                                             f"({'fuel' if n['litres_per_100km'] else 'battery'}); "
                                             f"aerodynamic share {n['aero_share'] * 100:.0f} %")]
        if n["litres_per_100km"]:
            rows.append(("Fuel on the cycle", f"{n['litres_per_100km']:.2f} L per 100 km"))
        if n["range_km"]:
            rows.append(("Range on the cycle", f"{n['range_km']:.0f} km"))
        for cycle, effect in n["per_10_counts"].items():
            parts = [f"{effect['kwh_per_100km']:+.3f} kWh/100 km"]
            if effect.get("litres_per_100km") is not None:
                parts.append(f"{effect['litres_per_100km']:+.3f} L/100 km")
            if effect.get("range_km") is not None:
                parts.append(f"{effect['range_km']:+.1f} km of range")
            rows.append((f"+10 counts on {cycle}", ", ".join(parts)))
        table = ["## Key numbers", "", "| | |", "|---|---|"] + [f"| {a} | {b} |" for a, b in rows]
        if review.assumptions:
            table += ["", "Assumed where the sheet is silent: " + "; ".join(esc(a) for a in review.assumptions) + "."]
        return table + [""]

    def revision_figures(self, review: Review) -> list[str]:
        sheet, n = review.sheet, review.key_numbers
        density = self.settings.air().density
        top = (sheet.get("powertrain.top_speed") or 200 / 3.6) * 3.6
        speeds = [float(v) for v in np.arange(20, max(top, n["reference_speed_km_h"]) + 1, 10)]
        drag = [float(drag_force(n["cd"], n["area"], v / 3.6, density)) for v in speeds]
        out = ["## Figures", ""]
        zone_data = {"zones": [{"title": ZONES[z.zone], "score": None if z.score is None else round(z.score, 1),
                                "coverage": round(z.coverage, 3)} for z in review.zones.values()],
                     "score": None if review.score is None else round(review.score, 1),
                     "coverage": round(review.coverage, 3)}
        out += [self.figure("zones", zone_data, "Zone scores: " + ", ".join(
            f"{z['title']} {'not assessed' if z['score'] is None else round(z['score'])}" for z in zone_data["zones"]),
            2), ""]
        out += [self.figure("drag-power", {"speed_km_h": speeds, "drag_N": [round(d, 2) for d in drag],
                                           "power_kW": [round(d * v / 3.6 / 1000, 3) for d, v in zip(drag, speeds)],
                                           "reference_km_h": n["reference_speed_km_h"], "cd": n["cd"],
                                           "area": n["area"]},
                            f"Drag force and power against speed; at {n['reference_speed_km_h']:.0f} km/h "
                            f"{n['drag_N']:.0f} N and {n['drag_power_kW']:.1f} kW", 2), ""]
        lift = n.get("lift_reference")
        if lift and sheet.has("mass.curb", "mass.front_axle_share"):
            front, rear = axle_lift(lift["cl_front"], lift["cl_rear"], n["area"], np.array(speeds) / 3.6, density)
            rear_static = sheet.get("mass.curb") * (1 - sheet.get("mass.front_axle_share"))
            data = {"speed_km_h": speeds, "front_kg": [round(float(f) / G0, 2) for f in front],
                    "rear_kg": [round(float(r) / G0, 2) for r in rear], "rear_static_kg": round(rear_static, 1),
                    "reference_km_h": n["reference_speed_km_h"], "top_km_h": top,
                    "cl_front": lift["cl_front"], "cl_rear": lift["cl_rear"]}
            out += [self.figure("lift", data, f"Lift per axle against speed: at {top:.0f} km/h front "
                                f"{data['front_kg'][-1]:+.0f} kg, rear {data['rear_kg'][-1]:+.0f} kg", 2), ""]
        breakdown = {k: round(v, 4) for k, v in n["energy_breakdown_kWh"].items()}
        out += [self.figure("energy", {**breakdown, "cycle": n["cycle"], "aero_share": round(n["aero_share"], 4)},
                            f"Energy breakdown on {n['cycle']}: rolling {breakdown['rolling']:.2f} kWh, aerodynamic "
                            f"{breakdown['aero']:.2f} kWh, braking {breakdown['braking']:.2f} kWh", 2), ""]
        if sheet.has("rear.backlight_angle"):
            angle = math.degrees(sheet.get("rear.backlight_angle"))
            out += [self.figure("ahmed", self.ahmed_data(angle), f"The backlight angle {angle:.1f} deg on the Ahmed-body "
                                "drag curve, with the critical region near 30 deg", 2), ""]
        fixes = review.ranked_fixes[:WATERFALL_STEPS]
        if fixes:
            steps = [[f.rule.id, round(f.benefit, 2)] for f in fixes]
            out += [self.figure("waterfall", {"cd": n["cd"], "steps": steps},
                                f"Savings waterfall from Cd {n['cd']:.3f} through the {len(steps)} largest ranked fixes",
                                2), ""]
        sweep_result = next((r for r in sheet.results if len(r.yaw_sweep) >= 2), None)
        if sweep_result:
            out += self.yaw_figure(sweep_result)
        if sheet.geometry:
            out += self.geometry_figures(review)
        return out

    def geometry_figures(self, review: Review) -> list[str]:
        """The measured silhouette, each zone in its review status, and the horizontal sections."""
        sheet = review.sheet
        data = measured_geometry(sheet, self.cache.folder.parent / "aeroreview-geometry" if self.cache.folder else None)
        worst = {}
        for f in review.findings:
            if f.status != NOT_ASSESSED and status_rank(f.status) >= status_rank(worst.get(f.rule.zone, "pass")):
                worst[f.rule.zone] = f.status
        silhouette = {**data["silhouette"], "parts": [{**part, "status": worst.get(part["zone"], "not assessed")}
                                                      for part in data["silhouette"]["parts"]],
                      "title": f"Measured centreline of {sheet.geometry.file}, zones by review status"}
        alt = "Side silhouette measured from the surface, coloured by zone status: " + ", ".join(
            f"{p['zone']} {p['status']}" for p in silhouette["parts"]) + "; " + ", ".join(
            n["text"] for n in silhouette["notes"])
        out = ["### Measured surface", "", self.figure("silhouette", silhouette, alt, 2), ""]
        if data["sections"]["sections"]:
            out += [self.figure("sections", data["sections"], "Horizontal sections at " + ", ".join(
                s["label"] for s in data["sections"]["sections"]), 2), ""]
        return out

    def yaw_figure(self, result) -> list[str]:
        speed = self.settings.reference_speed
        yaw = [p.yaw for p in result.yaw_sweep]
        cd = [p.cd for p in result.yaw_sweep]
        try:
            averaged = wind_averaged_cd(yaw, cd, speed)
        except ValueError as problem:
            return [f"Yaw sweep: no wind-averaged value ({esc(problem)}).", ""]
        data = {"yaw_deg": [round(math.degrees(a), 3) for a in yaw], "cd": cd, "cd_wind_averaged": round(averaged, 5),
                "max_yaw_deg": round(math.degrees(max_yaw(speed)), 3), "wind_m_s": round(J1252_WIND_SPEED, 3),
                "speed_km_h": round(speed * 3.6, 1), "label": result.label}
        return [self.figure("yaw", data, f"Yaw sweep of {result.label}: wind-averaged Cd {averaged:.4f} at "
                            f"{speed * 3.6:.0f} km/h", 2), ""]

    def findings(self, review: Review) -> list[str]:
        out = ["## Findings by zone", ""]
        depth = 2
        for zone, title in ZONES.items():
            items = [f for f in review.findings if f.rule.zone == zone]
            if not items:
                continue
            zone_score = review.zones[zone]
            shown = "not assessed" if zone_score.score is None else f"{zone_score.score:.0f}"
            out += [f"### {title}", "", f"Zone score {shown} (coverage {zone_score.coverage * 100:.0f} %).", "",
                    "| Status | Rule | Finding | Measured (limit) | Estimate | Consequence of the fix |",
                    "|---|---|---|---|---|---|"]
            items.sort(key=lambda f: (-status_rank(f.status), f.rule.id))
            for f in items:
                out.append(f"| {badge(f.status)}{' (waived)' if f.waived else ''} "
                           f"| {self.link(f'rules/{f.rule.id}.md', f.rule.id, depth)} | {esc(f.verdict.message)} "
                           f"| {_measured(f)} | {_estimate(f)} | {_consequence(f)} |")
            details = [f for f in items if f.status not in ("pass", NOT_ASSESSED)]
            if details:
                out += ["", "Fixes, sources and waivers:", ""]
                for f in details:
                    sources = "; ".join(f"{esc(s.citation)} ({s.kind})" for s in f.rule.sources)
                    waiver = ""
                    if f.waiver:
                        waiver = (f" **Waiver ({f.waiver['status']})**: {esc(f.waiver['reason'])}"
                                  f"{', by ' + esc(f.waiver['by']) if f.waiver['by'] else ''}"
                                  f"{', expires ' + f.waiver['expires'] if f.waiver['expires'] else ''}.")
                    out.append(f"- **{f.rule.id}**: {esc(f.rule.fix)} *Sources:* {sources}.{waiver}")
            out.append("")
        return out

    def ranked_fixes(self, review: Review) -> list[str]:
        fixes = review.ranked_fixes
        if not fixes:
            return ["## Ranked fixes", "", "No costed finding: nothing to recover.", ""]
        out = ["## Ranked fixes", "", f"By the middle of each estimate; {ADDITIVITY_NOTE}.", ""]
        for i, f in enumerate(fixes, 1):
            out.append(f"{i}. **{f.rule.id}** ({f.status}): {_estimate(f)}; {_consequence(f)}")
        return out + [""]

    def attachments(self, review: Review) -> list[str]:
        sheet = review.sheet
        if not sheet.attachments:
            return []
        out = ["## Attachments", ""]
        folder = Path(sheet.path).parent
        for zone, zone_title in catalogue.ALL_ZONES.items():
            for attachment in (a for a in sheet.attachments if a.zone == zone):
                target = f"fleet/{sheet.vehicle_id}/files/{sheet.revision}/{PurePosixPath(attachment.file).as_posix()}"
                self.site.files[target] = (folder / attachment.file).read_bytes()
                caption = esc(attachment.caption or attachment.file)
                out += [f"**{zone_title}**: {caption}", "",
                        f"![{caption}](files/{sheet.revision}/{PurePosixPath(attachment.file).as_posix()})", ""]
        return out

    # -- changes between revisions -------------------------------------------------
    def diff_page(self, before: Review, after: Review) -> None:
        a, b = before.sheet, after.sheet
        lines = [heading(f"{b.name}: {a.revision} to {b.revision}"), "",
                 f"From [{esc(a.revision)}]({a.revision}.md) to [{esc(b.revision)}]({b.revision}.md).", "",
                 "## Features that changed", ""]
        changed = []
        for item in catalogue.FEATURES:
            old, new = a.features.get(item.key), b.features.get(item.key)
            old_text = old.display(item) if old else "not given"
            new_text = new.display(item) if new else "not given"
            if old_text != new_text:
                changed.append(f"| `{item.key}` | {esc(old_text)} | {esc(new_text)} |")
        lines += (["| Feature | Before | After |", "|---|---|---|"] + changed) if changed else ["No feature changed."]
        lines += ["", "## Results", "", "| | Before | After |", "|---|---|---|",
                  f"| Cd | {before.key_numbers['cd']:.3f} | {after.key_numbers['cd']:.3f} |",
                  f"| CdA [m²] | {before.key_numbers['cda']:.3f} | {after.key_numbers['cda']:.3f} |",
                  f"| Score | {_score(before)} | {_score(after)} |",
                  f"| Recoverable [counts] | {before.recoverable[0]:g}-{before.recoverable[1]:g} "
                  f"| {after.recoverable[0]:g}-{after.recoverable[1]:g} |",
                  f"| Energy on {after.key_numbers['cycle']} [kWh/100 km] | "
                  f"{before.key_numbers['energy_kWh_per_100km']:.2f} | {after.key_numbers['energy_kWh_per_100km']:.2f} |",
                  "", "## Findings", ""]
        old = {f.rule.id: f for f in before.findings}
        groups = {"appeared": [], "resolved": [], "worse": [], "better": []}
        for f in after.findings:
            prior = old.get(f.rule.id)
            was = prior.status if prior else NOT_ASSESSED
            now_bad, was_bad = status_rank(f.status) > 0, status_rank(was) > 0
            if now_bad and not was_bad:
                groups["appeared"].append((f, was))
            elif was_bad and not now_bad and f.status != NOT_ASSESSED:
                groups["resolved"].append((f, was))
            elif now_bad and was_bad and status_rank(f.status) > status_rank(was):
                groups["worse"].append((f, was))
            elif now_bad and was_bad and status_rank(f.status) < status_rank(was):
                groups["better"].append((f, was))
        for name, items in groups.items():
            lines += [f"### {name.capitalize()} ({len(items)})", ""]
            lines += [f"- {self.link(f'rules/{f.rule.id}.md', f.rule.id, 2)}: {was} → {badge(f.status)}"
                      f" {esc(f.verdict.message)}" for f, was in items] or ["None."]
            lines.append("")
        self.site.files[f"fleet/{b.vehicle_id}/{a.revision}-to-{b.revision}.md"] = "\n".join(lines)

    # -- rules and features --------------------------------------------------------
    def rule_pages(self, reviews: list[Review]) -> None:
        index = ["# Rules", "", f"{len(all_rules())} rules in {len(ZONES)} zones. Each page is generated from the "
                 "rule's code: its documentation, thresholds and sources.", ""]
        for zone, title in ZONES.items():
            index += [f"## {title}", "", "| Rule | Title | Severity |", "|---|---|---|"]
            index += [f"| [{r.id}]({r.id}.md) | {r.title} | {r.severity} |" for r in all_rules().values()
                      if r.zone == zone]
            index.append("")
        self.site.files["rules/index.md"] = "\n".join(index)
        for rule in all_rules().values():
            lines = [f"# {rule.id}", "", f"**{rule.title}** · zone {ZONES[rule.zone]} · default severity "
                     f"{rule.severity} · needs {', '.join(f'`{k}`' for k in rule.needs) or 'results only'}"
                     + (f" · applies to {', '.join(rule.applies_to)}" if rule.applies_to else ""), ""]
            for heading, body in rule.doc.items():
                lines += [f"## {heading}", "", body[0].upper() + body[1:], ""]
            if rule.thresholds:
                lines += ["## Thresholds", "", "Override them in the `aeroreview` section of `mkdocs.yml`.", "",
                          "| Name | Default | Meaning | Source | Kind |", "|---|---|---|---|---|"]
                lines += [f"| `{t.name}` | {t.default} | {t.description} | {t.source.citation} | {t.source.kind} |"
                          for t in rule.thresholds]
                lines.append("")
            lines += ["## Sources", ""] + [f"- {s.citation} (*{s.kind}*)" for s in rule.sources] + [""]
            if rule.figure == "ahmed":
                lines += ["## Reference", "", self.figure("ahmed", self.ahmed_data(None), "The Ahmed-body drag "
                          "coefficient against slant angle, with the critical region near 30 deg", 1), ""]
            flagged = [(r, f) for r in reviews for f in r.findings
                       if f.rule.id == rule.id and f.status in ("warning", "failure")]
            lines += ["## Revisions that currently fail or warn", ""]
            lines += [f"- {self.link(self.revision_path(r), f'{esc(r.sheet.name)} {esc(r.sheet.revision)}', 1)}: "
                      f"{badge(f.status)} {esc(f.verdict.message)}" for r, f in flagged] or ["None."]
            self.site.files[f"rules/{rule.id}.md"] = "\n".join(lines) + "\n"

    def feature_page(self) -> None:
        lines = ["# Feature reference", "", "Every feature a sheet may carry, generated from the catalogue. Values are "
                 "a number in the unit shown, a string with a unit (`\"27 deg\"`), or `{value, source, note}`.", ""]
        for zone, items in catalogue.by_zone().items():
            lines += [f"## {catalogue.ZONES[zone]}", "", "| Key | Unit | Typical | How to measure |", "|---|---|---|---|"]
            for item in items:
                typical = f"{item.typical_text()} ({item.typical_source})" if item.typical else ""
                lines.append(f"| `{item.key}`{' (required)' if item.required else ''} | {item.unit_label()} "
                             f"| {typical} | {item.description} {item.how_to_measure} |")
            lines.append("")
        self.site.files["features.md"] = "\n".join(lines)


_FAR_PAST = datetime.date(1900, 1, 1)  # sorts revisions without a review date first


def _critical_region(settings: Settings) -> tuple[float, float]:
    """The backlight rule's critical region [deg], after the team's overrides."""
    rule = all_rules()["rear.backlight-angle"]
    thresholds = {**rule.defaults(), **next((c.thresholds for r, c, _ in settings.rule_plan if r is rule), {})}
    return round(math.degrees(thresholds["critical_low"]), 2), round(math.degrees(thresholds["critical_high"]), 2)


def _score(review: Review) -> str:
    score = "not assessed" if review.score is None else f"{review.score:.0f}"
    return f"{score} ({review.coverage * 100:.0f} %)"


def _measured(f: Finding) -> str:
    measured, limit = esc(f.verdict.measured or ""), esc(f.verdict.limit or "")
    return f"{measured} ({limit})" if measured and limit else measured or limit


def _estimate(f: Finding) -> str:
    parts = []
    if f.counts and f.counts[1]:
        parts.append(f"{f.counts[0]:g}-{f.counts[1]:g} counts")
    if f.status not in ("pass", NOT_ASSESSED):
        for axle, change in (("front", f.verdict.cl_front), ("rear", f.verdict.cl_rear)):
            if change:
                parts.append(f"cl {axle} {change:+.2f}")
    return ", ".join(parts)


def _consequence(f: Finding) -> str:
    c = f.consequences
    if not c:
        return ""
    parts = [f"{c['power_W_at_reference_speed'][0]:.0f}-{c['power_W_at_reference_speed'][1]:.0f} W",
             f"{c['energy_kWh_per_100km'][0]:.2f}-{c['energy_kWh_per_100km'][1]:.2f} kWh/100 km"]
    if "litres_per_100km" in c:
        parts.append(f"{c['litres_per_100km'][0]:.2f}-{c['litres_per_100km'][1]:.2f} L/100 km")
    if "range_km" in c:
        parts.append(f"{c['range_km'][0]:.1f}-{c['range_km'][1]:.1f} km range")
    return ", ".join(parts)


def measured_geometry(sheet, cache_folder: Path | None) -> dict:
    """Silhouette and section figure data of a sheet's surface, cached by the file's hash."""
    from aeroreview import measure

    geometry = sheet.geometry
    path = Path(sheet.path).parent / geometry.file
    digest = hashlib.sha256(path.read_bytes() + repr(geometry).encode()).hexdigest()[:24]
    cached = cache_folder / f"{digest}.json" if cache_folder else None
    if cached and cached.is_file():
        return json.loads(cached.read_text(encoding="utf-8"))
    result = measure.measure(measure.load_surface(path, geometry.units, geometry.nose, geometry.up, geometry.ground))
    data = {"silhouette": measure.silhouette_data(result), "sections": measure.sections_data(result)}
    if cached:
        cached.parent.mkdir(parents=True, exist_ok=True)
        cached.write_text(json.dumps(data), encoding="utf-8")
    return data


def generate(reviews: list[Review], settings: Settings, cache: FigureCache) -> Site:
    """Every generated file of the site."""
    writer = _Writer(reviews, settings, cache)
    writer.fleet_pages()
    writer.rule_pages(reviews)
    writer.feature_page()
    return writer.site
