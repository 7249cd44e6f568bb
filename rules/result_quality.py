"""Data quality of the results: which one the review uses, how it was taken, whether its run settled.

A review's absolute figures (drag, power, energy, the frame its fixes are costed in) rest on
one result per revision, the result of record. This module picks it, and judges what a
reviewer must know before trusting it: whether the results of a revision disagree while
none is marked, whether the result the fixes are costed on had its wheels turning and its
ground moving, and whether a CFD history had settled before it was averaged.
"""

from __future__ import annotations

from dataclasses import dataclass

from aeroreview.display import COUNTS
from aeroreview.rules import COMMON, Source, Threshold, major, minor, not_assessed, passed, rule

# The default order when no result is marked of record: full-scale tunnel or road first (the
# car itself, or its full-size model, in the air), CFD next, model-scale tunnel (Reynolds
# number below the car's) and estimates last (our convention, common practice).
KIND_ORDER = {"road": 0, "tunnel": 1, "cfd": 2, "estimate": 4}


def _rank(result) -> int:
    return KIND_ORDER[result.kind] + (2 if result.kind == "tunnel" and result.scale < 1 else 0)


def result_of_record(results):
    """The result a review uses: the one marked ``of_record``, else the first by :data:`KIND_ORDER`
    (the first listed within a kind); None when there are no results."""
    marked = [r for r in results if r.of_record]
    ranked = marked or sorted(results, key=_rank)
    return ranked[0] if ranked else None


def measured_cd(sheet) -> tuple[float, str] | None:
    """The revision's drag coefficient of record and where it came from."""
    best = result_of_record(sheet.results)
    return None if best is None else (best.cd, f"{best.kind}: {best.label}")


REPEATABILITY = Source("repeat runs of one configuration in a full-scale tunnel agree within about 1 drag count; "
                       "two results of one revision more than twice that apart are different numbers, not repeats; "
                       "recalled", "from memory")


@rule("data.result-of-record", "One result of record when a revision's results disagree", "warning", needs=(),
      thresholds=(Threshold("difference", "0.002", "", "Cd spread of a revision's results beyond which one must be "
                            "marked of record (2 counts)", REPEATABILITY),),
      sources=(REPEATABILITY,))
def one_result_of_record(sheet, ctx):
    """
    What it checks: when a revision carries several results whose drag coefficients differ by
    more than {difference}, that one of them is marked `of_record: true` (estimates are left
    out beside a measured or computed result: the default order never picks them then).

    Why it matters: the review's absolute figures (drag, power, energy, range) and the frame
    its fixes are costed in use one result. Without a mark the default order picks it
    (full-scale tunnel or road, then CFD, then model-scale tunnel, then estimates; the first
    listed within a kind), which may not be the one the team trusts.

    How to fix: mark the result the team stands behind with `of_record: true`, and say why in a
    comment beside it (the run read from its own files, the latest configuration...).

    Known limits: only the drag coefficients are compared; results of other configurations
    (another ride height, yaw) belong in another revision.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: a, cd: 0.232}, {kind: cfd, label: b, cd: 0.240}]}
        passes: {results: [{kind: cfd, label: a, cd: 0.232}, {kind: cfd, label: b, cd: 0.240, of_record: true}]}
    """
    chosen = result_of_record(sheet.results)
    if chosen is None:
        return passed("no results to choose from", measured="no results")
    candidates = [r for r in sheet.results if r.kind != "estimate"] or sheet.results  # an estimate yields to any
    spread = round(max(r.cd for r in candidates) - min(r.cd for r in candidates), 6)  # 0.234 - 0.232 is 2 counts
    measured = f"{len(candidates)} result(s), Cd spread {COUNTS(spread, 1)}"
    limit = f"<= {COUNTS(ctx['difference'], None)}, or one marked of record"
    if chosen.of_record:
        return passed(f"'{chosen.label}' is marked of record", measured=measured, limit=limit)
    if spread > ctx["difference"]:
        return major(f"the results disagree and none is marked of record: the review uses '{chosen.label}' "
                     "by the default order", measured=measured, limit=limit)
    return passed(f"the results agree; the review uses '{chosen.label}'", measured=measured, limit=limit)


GROUND_SOURCES = (
    Source("Wickern, Zwicker and Pfadenhauer, 'Rotating wheels - their impact on wind tunnel test techniques and "
           "on vehicle drag results', SAE Technical Paper 970133, 1997 (title, authors and number checked on a "
           "copy): wheel rotation changes the measured drag and how wind tunnels must test", "published"),
    Source("Waeschle, 'The influence of rotating wheels on vehicle aerodynamics - numerical and experimental "
           "investigations', SAE Technical Paper 2007-01-0107, 2007 (abstract checked): wheel rotation changes the "
           "drag and lift of the body itself and is essential for shape optimisation of production cars",
           "published"),
)
UNDERBODY_ZONES = ("wheels", "underbody")  # the fixes whose flow a fixed floor or fixed wheels misrepresent


@rule("data.ground-simulation", "Wheels and ground of the result that costs wheel and underbody fixes", "warning",
      needs=(), sources=GROUND_SOURCES)
def ground_simulation(sheet, ctx):
    """
    What it checks: that the result of record of a sheet with wheel or underbody features says
    whether its wheels rotated and its ground moved (`wheels: rotating`, `ground: moving`), and
    that neither was fixed.

    Why it matters: the wheel and underbody fixes are costed on the result of record. Over a
    fixed floor the underbody flow runs into a boundary layer the road does not have, and
    standing wheels shed other wakes than turning ones: a diffuser, a wheel deflector or an
    air curtain measured that way can be worth more or less, even of the other sign, on the road.

    How to fix: cost wheel and underbody fixes on a moving-ground, rotating-wheel result (a
    belt tunnel, or CFD with a moving ground and rotating wheels) and mark it of record; state
    `wheels` and `ground` on every result.

    Known limits: the rule reads what the sheet states; boundary-layer suction ahead of a
    fixed floor improves it but is still a fixed floor. Road results have both by nature;
    estimates have no set-up to judge.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: tunnel, label: fixed floor, cd: 0.236, wheels: fixed, ground: fixed}]}
        passes: {results: [{kind: tunnel, label: belt, cd: 0.236, wheels: rotating, ground: moving}]}
    """
    if not any(key.split(".")[0] in UNDERBODY_ZONES for key in sheet.features):
        return passed("no wheel or underbody features: no such fixes to cost", measured="no wheel or underbody features")
    chosen = result_of_record(sheet.results)
    if chosen is None or chosen.kind == "estimate":
        return not_assessed("needs a measured or computed result of record", missing=("results[].cd",))
    if chosen.kind == "road":
        return passed("a road result: the wheels turn and the ground moves", measured=f"road: {chosen.label}")
    stated = f"{chosen.label}: wheels {chosen.wheels or 'not stated'}, ground {chosen.ground or 'not stated'}"
    fixed = [what for what, bad in (("the wheels stood still", chosen.wheels in ("fixed", "none")),
                                    ("the ground was fixed", chosen.ground == "fixed")) if bad]
    if fixed:
        return major(f"wheel and underbody fixes are costed on a result where {' and '.join(fixed)}",
                     measured=stated, limit="wheels rotating, ground moving")
    if not chosen.wheels or not chosen.ground:
        return minor("the result of record does not say whether its wheels rotated and its ground moved",
                     measured=stated, limit="wheels rotating, ground moving")
    return passed("the result of record had rotating wheels and a moving ground", measured=stated,
                  limit="wheels rotating, ground moving")


# -- convergence of a CFD coefficient history (aeroreview results history) -------------
DRAG_RESOLUTION = Source("a review resolves differences of about 1 drag count (0.001), the accuracy the AIAA "
                         "Drag Prediction Workshops aimed at; a 95 % band of +-2 standard errors within +-1 count "
                         "needs a standard error of 0.5 counts; recalled", "from memory")
MSER_SOURCE = Source("White, 'An effective truncation heuristic for bias reduction in simulation output', "
                     "Simulation 69(6), 1997, 323-334 (named as the MSER source in the checked abstract of White, "
                     "Cobb and Spratt, Proc. 2000 Winter Simulation Conference; title, pages and the rule that a "
                     "truncation point past half the run means a run too short to settle recalled)", "from memory")
CONVERGENCE_THRESHOLDS = (
    Threshold("std_error", "0.0005", "", "standard error of a settled drag mean (0.5 counts)", DRAG_RESOLUTION),
    Threshold("lift_std_error", "0.001", "", "standard error of a settled lift or side-force mean (1 count)", COMMON),
    Threshold("drift", "0.001", "", "drift of a settled mean coefficient per 1000 iterations (1 count)", COMMON),
    Threshold("settled_rows", "200", "", "rows of the settled part needed to trust its statistics", COMMON),
)


@dataclass(frozen=True)
class Convergence:
    """What a history's verdict reads: as ``results history`` computes it, and as its sheet entry keeps it."""

    history_rows: int
    settled_rows: int
    settled_from: float  # where the settled part begins, in the history's own first column
    coefficients: tuple[tuple[str, float, float], ...]  # (cd, cl..., standard error, drift per 1000 iterations)


def convergence_limits() -> dict[str, float]:
    """The convergence thresholds at their defaults, by name."""
    return {t.name: t.parse(t.default) for t in CONVERGENCE_THRESHOLDS}


def convergence_reasons(stats: Convergence, limits: dict[str, float]) -> list[str]:
    """Why a history is not converged (empty when it is): the one judgement behind both the
    verdict ``results history`` prints and the ``data.convergence`` finding."""
    reasons = []
    if stats.settled_rows < limits["settled_rows"]:
        reasons.append(f"the settled part has {stats.settled_rows} rows, fewer than {limits['settled_rows']:.0f}")
    if stats.history_rows - stats.settled_rows > stats.history_rows / 2:
        reasons.append(f"the start-up transient has not ended (MSER-5 puts its end at {stats.settled_from:g}, in "
                       "the second half of the run)")
    for key, std_error, drift in stats.coefficients:
        limit = limits["std_error"] if key == "cd" else limits["lift_std_error"]
        if std_error > limit:
            reasons.append(f"{key}: standard error {COUNTS(std_error, 2)}, over {COUNTS.number(limit, None)}")
        if abs(drift) > limits["drift"]:
            reasons.append(f"{key}: drift {COUNTS(drift, 2, signed=True)} per 1000 iterations, over "
                           f"{COUNTS.number(limits['drift'], None)}")
    return reasons


@rule("data.convergence", "CFD histories had settled before they were averaged", "warning", needs=(),
      thresholds=CONVERGENCE_THRESHOLDS, sources=(MSER_SOURCE, DRAG_RESOLUTION))
def converged(sheet, ctx):
    """
    What it checks: every result read from a coefficient history (`aeroreview results history
    --sheet` keeps its statistics in the result): the settled part at least {settled_rows} rows
    and in the first half of the run, the standard error of the settled Cd mean at most
    {std_error} (of lift and side force {lift_std_error}), the drift of every coefficient at
    most {drift} per 1000 iterations.

    Why it matters: a mean taken before the run settled, over too short a part, or while it
    still drifts, is a number the next run will not repeat; a fix costed on it may be noise.

    How to fix: run longer (or restart from the settled solution), then read the history again
    with `aeroreview results history FILE --sheet SHEET`; `results history` prints the same
    verdict with the same reasons.

    Known limits: judges the statistics the sheet keeps, so a typed result without them is not
    judged; MSER-5 may leave a bias of a fraction of a standard error when a transient decays
    much more slowly than the noise.

    Examples (changes to the demo's clean revision, vehicles/tessel/r2.yaml):
        fails (warning): {results: [{kind: cfd, label: short run, cd: 0.232, settled_from: 900, history_rows: 1000,
            settled_rows: 101, convergence: [{coefficient: cd, std_error: 0.0003, drift: 0.0002}]}]}
        passes: {results: [{kind: cfd, label: long run, cd: 0.232, settled_from: 1000, history_rows: 6000,
            settled_rows: 5001, convergence: [{coefficient: cd, std_error: 0.0001, drift: 0.0002}]}]}
    """
    judged = [(r, convergence_reasons(Convergence(r.history_rows, r.settled_rows, r.settled_from, r.convergence),
                                      ctx.thresholds)) for r in sheet.results if r.convergence]
    if not judged:
        return not_assessed("needs a result read from a history (aeroreview results history --sheet)",
                            missing=("results[].convergence",))
    limit = f"Cd standard error <= {COUNTS(ctx['std_error'], None)}, drift <= {COUNTS(ctx['drift'], None)} " \
            f"per 1000 iterations, >= {ctx['settled_rows']:.0f} settled rows"
    failing = [(r, reasons) for r, reasons in judged if reasons]
    if failing:
        result, reasons = failing[0]
        return major(f"'{result.label}' is not converged: " + "; ".join(reasons),
                     measured=f"{len(failing)} of {len(judged)} histories not converged", limit=limit)
    return passed("every history had settled", measured=f"{len(judged)} histories converged", limit=limit)
