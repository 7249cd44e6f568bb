"""Make the Tessel's rear-end parametric study: INVENTED DEMO DATA.

Maroska Coachworks, the Tessel and this study are made up to show `aeroreview calibrate`;
no real vehicle, CFD run or tunnel test stands behind the numbers. The "measured" Cd comes
from the response model below (our own invention, loosely shaped like the trade's rules of
thumb) plus Gaussian noise standing in for run-to-run scatter, on a seeded Latin-hypercube
design of 48 variants around the Tessel r1 and r2 designs. One variant "diverged" and has
no Cd, to show how missing values are dropped and reported.

Run it from the repository root, then refit the calibration (it refuses to overwrite):

    python studies/tessel/make_study.py
    rm studies/tessel/rear-doe.calibration.yaml
    SOURCE_DATE_EPOCH=1796083200 aeroreview calibrate studies/tessel/rear-doe.csv \\
        --map backlight_deg=rear.backlight_angle --map diffuser_deg=underbody.diffuser_angle \\
        --map side_taper_deg=rear.side_taper_angle --map rim_open_pct=wheels.rim_openness:% \\
        --vehicle tessel --output studies/tessel/rear-doe.calibration.yaml
"""

from pathlib import Path

import numpy as np

SEED = 20261118
VARIANTS = 48
NOISE_COUNTS = 1.5  # invented run-to-run scatter, 1 sigma
# Parameter: (low, high) of the design, in the column's unit (invented around the Tessel r1 and r2).
RANGES = {"backlight_deg": (20.0, 30.0), "diffuser_deg": (6.0, 16.0), "side_taper_deg": (0.0, 10.0),
          "rim_open_pct": (15.0, 60.0)}
DIVERGED = 31  # the variant whose run "diverged" (no Cd)


def response_counts(p: dict) -> np.ndarray:
    """The invented truth: drag counts of a variant (curvature near the backlight's critical region)."""
    return (245.0 + 2.4 * (p["backlight_deg"] - 20) + 0.12 * (p["backlight_deg"] - 25) ** 2
            + 1.2 * (p["diffuser_deg"] - 6) - 1.45 * p["side_taper_deg"] + 0.45 * (p["rim_open_pct"] - 15)
            + 0.05 * (p["diffuser_deg"] - 11) * (p["side_taper_deg"] - 5))


def latin_hypercube(rng: np.random.Generator, rows: int, ranges: dict) -> dict:
    """Evenly spaced levels, each used once per parameter and shuffled independently (a Latin
    hypercube on a grid), so the ends of every range are in the study."""
    out = {}
    for name, (low, high) in ranges.items():
        levels = np.linspace(low, high, rows)
        out[name] = rng.permutation(levels)
    return out


def main() -> None:
    rng = np.random.default_rng(SEED)
    design = latin_hypercube(rng, VARIANTS, RANGES)
    cd = (response_counts(design) + rng.normal(0.0, NOISE_COUNTS, VARIANTS)) / 1000
    lines = ["# Maroska Tessel rear-end CFD study (INVENTED DEMO DATA; made by make_study.py, see its docstring)",
             "# one row per variant; angles in deg, rim openness in %; Cd at 140 km/h",
             "run," + ",".join(RANGES) + ",Cd,note"]
    for i in range(VARIANTS):
        values = ",".join(f"{design[name][i]:.2f}" for name in RANGES)
        result, note = ("", "diverged") if i == DIVERGED else (f"{cd[i]:.4f}", "")
        lines.append(f"T{i + 1:03d},{values},{result},{note}")
    target = Path(__file__).with_name("rear-doe.csv")
    target.write_text("\n".join(lines) + "\n", encoding="utf-8")
    print(f"wrote {target} ({VARIANTS} variants)")


if __name__ == "__main__":
    main()
