"""The result data-quality rules: passing, failing and boundary cases (thresholds and sources
named in each rule's metadata in rules/data.py)."""

from __future__ import annotations

import pytest

from aeroreview.sheet import Result
from test_rules import status, with_features


def pair(cfd_cd: float, tunnel_cd: float, tunnel_scale: float = 1.0) -> list[Result]:
    return [Result("cfd", "steady RANS", 38.9, cfd_cd), Result("tunnel", "full scale", 38.9, tunnel_cd,
                                                                 scale=tunnel_scale)]


@pytest.mark.parametrize("cfd, tunnel, expected", [
    (0.232, 0.236, "pass"),          # 4 counts
    (0.232, 0.2419, "pass"),         # just inside the 10-count boundary
    (0.232, 0.2421, "warning"),      # just over 10 counts
    (0.232, 0.260, "warning"),
])
def test_cfd_tunnel_correlation(cfd, tunnel, expected):
    assert status("data.cfd-tunnel-correlation", with_features(results=pair(cfd, tunnel))) == expected


def test_correlation_compares_only_cfd_with_full_scale_tunnel():
    """Nothing to compare is no disagreement; a model-scale tunnel result is at another Reynolds number."""
    assert status("data.cfd-tunnel-correlation", with_features(results=pair(0.23, 0.30)[:1])) == "pass"
    assert status("data.cfd-tunnel-correlation", with_features(results=pair(0.23, 0.30, 0.25))) == "pass"
