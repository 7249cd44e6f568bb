"""One page per calibration (the team's sensitivities against the library's), and their index."""

from __future__ import annotations

from aeroreview.calibration import STUDY_SUFFIXES, Calibration, page_data, reach
from aeroreview.memo import key
from aeroreview.paths import PathProblem, contained_file
from aeroreview.review import Review
from aeroreview.rules import all_rules
from aeroreview.site.pages.common import CAUTION, Output, esc, link, revision_path


def page_path(cal: Calibration) -> str:
    return f"calibrations/{cal.slug}.md"


def write(out: Output, reviews: list[Review]) -> None:
    calibrations = out.settings.calibrations
    index = ["# Calibrations", "", "Sensitivities the team fitted on its own parametric studies "
             "(`aeroreview calibrate`). A calibrated rule re-costs its fix with the team's slope inside the "
             "study's range, for the vehicles it declares; their findings then name the source kind *team data*.", ""]
    if not calibrations:
        index.append("No calibrations are named in the settings (`calibrations:` in the aeroreview section of "
                     "`mkdocs.yml`).")
    for cal in calibrations:
        index.append(f"- [{esc(cal.file)}]({cal.slug}.md): {cal.rows} rows, cross-validated R^2 {cal.cv_r2:.2f} and "
                     f"RMSE {cal.cv_rmse:.1f} counts, {len(cal.slopes)} parameter(s), for {esc(cal.scope)}, fitted "
                     f"{esc(cal.date)}")
        out.page(page_path(cal), calibration_page(out, cal, reviews))
    out.page("calibrations/index.md", "\n".join(index) + "\n")


def reach_section(cal: Calibration, reviews: list[Review]) -> list[str]:
    """The revisions whose findings the calibration re-costs, and declared vehicles without a sheet."""
    recosted, unknown = reach(cal, reviews)
    lines = ["## Findings it re-costs", ""]
    lines += [f"- {link(revision_path(review), esc(review.sheet.label), 1)}: "
              + ", ".join(link(f"rules/{rule}.md", rule, 1) for rule in rules) for review, rules in recosted]
    if not recosted:
        lines.append("None in this knowledge base.")
    if unknown:
        lines += ["", f"!!! warning \"Vehicles without a sheet\"\n    No sheet has the id "
                  f"{', '.join(f'`{esc(v)}`' for v in unknown)} that this calibration names: check the id."]
    return lines + [""]


FITTING = ("aeroreview.calibration", "aeroreview.calibrate", "aeroreview.study")  # the code page_data runs


def remembered_page_data(out: Output, cal: Calibration) -> dict:
    """The page's data, remembered by the calibration and its study's bytes: refitting the study on
    every build cost one to three seconds (statsmodels' import alone)."""
    root = out.settings.root
    try:
        study = contained_file((root / cal.file).parent, cal.study_file, STUDY_SUFFIXES, "study", "a study table")
        name = key(repr(cal), study.read_bytes(), code=FITTING)
    except (PathProblem, OSError):
        return page_data(cal, root)  # the page says why the study cannot be refitted
    return out.memo.get(name, lambda: page_data(cal, root))


def calibration_page(out: Output, cal: Calibration, reviews: list[Review]) -> str:
    data = remembered_page_data(out, cal)
    used = {rule.sensitivity.feature: rule.id for rule in all_rules().values() if rule.sensitivity}
    lines = [f"# Calibration {esc(cal.file)}", ""]
    if data["comments"]:
        lines += ["\n>\n".join(f"> {esc(comment)}" for comment in data["comments"]), ""]
    lines += ["| Provenance | |", "|---|---|", f"| study | {esc(cal.study_file)} |",
              f"| sha256 | {esc(cal.study_sha256)} |", f"| rows used | {cal.rows} ({cal.dropped_rows} dropped for "
              "missing values) |", f"| response | {esc(cal.response)} (in drag counts) |",
              "| model | linear least squares (statsmodels OLS), 95 % intervals |",
              f"| fitted | {esc(cal.date)} |", f"| applies to | {esc(cal.scope)} (other vehicles keep the library "
              "estimates) |", ""]
    lines += reach_section(cal, reviews)
    lines += [f"## How much of the study the surfaces explain ({cal.folds}-fold cross-validated)", "",
              "| Surface | R^2 | RMSE [counts] |", "|---|---|---|"]
    lines += [f"| {name} | {m['cv_r2']:.3f} | {m['cv_rmse_counts']:.2f} |" for name, m in cal.models.items()]
    lines += ["", "## The team's sensitivities against the library's", "",
              "| Column | Team [counts/unit] | 95 % interval | p | Library | Rule | Agreement |",
              "|---|---|---|---|---|---|---|"]
    for s in cal.slopes:
        library = "-" if s.library_counts_per_unit is None else f"{s.library_counts_per_unit:+.3g}"
        rule = used.get(s.feature)
        rule_link = link(f"rules/{rule}.md", rule, 1) if rule else f"none for `{s.feature}`"
        lines.append(f"| {esc(s.column)} | {s.counts_per_unit:+.3g} per {esc(s.unit)} | "
                     f"{s.ci95[0]:+.3g} to {s.ci95[1]:+.3g} | {s.p_value:.2g} | {library} | {rule_link} | "
                     f"**{s.agreement}** |")
    lines += ["", "*agrees*: the library's value lies inside the 95 % interval; *opposite sign*: the interval "
              "excludes zero on the other side; *differs in size*: any other miss; *library silent*: no rule "
              "states a sensitivity for the feature.", ""]
    lines += [out.figure("calibration-slopes", {"slopes": data["slopes"]},
                         "Each parameter's fitted sensitivity with its 95 % interval beside the rule library's value",
                         1), ""]
    if data["note"]:
        lines += [f"!!! note \"Study\"\n    {esc(data['note'])}", ""]
    if "measured" in data:
        lines += ["## Predicted against measured", "", "Each variant predicted by a surface fitted without it "
                  "(cross-validation); points on the 1:1 line are predicted exactly.", "",
                  out.figure("calibration-predicted", {"measured": data["measured"], "predicted": data["predicted"]},
                             "Cross-validated prediction against measured drag counts, with the 1:1 line", 1), "",
                  "## Residuals against each parameter", "", "Residuals of the linear fit; a bow or a trend "
                  "against a parameter means the slope is not constant over the study.", "",
                  out.figure("calibration-residuals", {"residuals": data["residuals"]},
                             "Residuals of the linear fit against each mapped parameter", 1), ""]
    lines += [CAUTION]
    return "\n".join(lines) + "\n"
