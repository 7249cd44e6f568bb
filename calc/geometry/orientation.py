"""Which way a vehicle surface points, inferred as units are: up from its mirror symmetry, the
nose from its ends. Pure geometry on an (n, 3) point array; the caller prints the inference.

- Up: a road vehicle is mirror-symmetric across its lateral axis and not across its vertical
  one, so of the two candidate axes (y, z) the lateral one is where the points' mean sits
  closest to the middle of their range; up is the other.
- Nose: a bonnet is lower than a roof's tail or a boot lid (common practice for road cars:
  sedans, hatchbacks, fastbacks, SUVs and vans all hold it; a mid-engined sports car may not),
  so the nose is the end of x whose top over its last tenth of the length is lower.
"""

from __future__ import annotations

import numpy as np

END_SHARE = 0.10  # share of the length at each end compared for the nose (our convention)
CLEAR_MARGIN = 0.05  # top heights closer than 5 % of the height leave the nose undecided (our convention)


def _asymmetry(values: np.ndarray) -> float:
    span = float(np.ptp(values))
    return abs(float(values.mean()) - 0.5 * (float(values.min()) + float(values.max()))) / span if span else 1.0


def infer_up(points: np.ndarray) -> tuple[str, str]:
    """("+z" or "+y", why) for points in file axes."""
    lateral_y, lateral_z = _asymmetry(points[:, 1]), _asymmetry(points[:, 2])
    up = "+z" if lateral_y <= lateral_z else "+y"
    lateral = "y" if up == "+z" else "z"
    return up, (f"up inferred as {up}: the surface is mirror-symmetric across {lateral} "
                f"(offset of the mean from mid-range: y {lateral_y:.3f}, z {lateral_z:.3f} of the extent)")


def _end_top(points: np.ndarray, at_min: bool) -> float:
    x = points[:, 0]
    cut = x.min() + END_SHARE * np.ptp(x) if at_min else x.max() - END_SHARE * np.ptp(x)
    end = points[x <= cut] if at_min else points[x >= cut]
    return float(end[:, 2].max())


def infer_nose(points: np.ndarray) -> tuple[str, str, bool]:
    """("-x" or "+x", why, decided) for points already turned z-up; undecided ends give "-x"."""
    height = float(np.ptp(points[:, 2]))
    low_end, high_end = _end_top(points, True), _end_top(points, False)
    decided = abs(low_end - high_end) > CLEAR_MARGIN * height
    nose = "-x" if low_end <= high_end or not decided else "+x"
    why = (f"top {low_end - points[:, 2].min():.3g} at the -x end, {high_end - points[:, 2].min():.3g} at the +x end "
           f"over the last {END_SHARE:.0%} of the length")
    if not decided:
        return nose, f"nose taken as -x: the ends are too alike to tell ({why})", False
    return nose, f"nose inferred at {nose}, the end with the lower top, as a bonnet is lower than a tail ({why})", True
