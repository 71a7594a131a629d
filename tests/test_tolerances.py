"""Stack-up arithmetic and the ASME Y14.5 fastener formulas against hand computations,
a worked example and a Monte Carlo run."""
from __future__ import annotations

import math

import numpy as np
import pytest

from geomjoint.mechanics import tolerances as T
from geomjoint.mechanics.tolerances import Dimension


def _stack():
    """A through-bolt protrusion stack: bolt length minus two plates, a washer and the nut."""
    return [Dimension("bolt", 50.0, -0.5, 0.5),                  # M12x50 grade A (ISO 4759-1 js15)
            Dimension("plate 1", 12.0, -0.2, 0.2, sign=-1.0),    # ISO 2768-1 m
            Dimension("plate 2", 20.0, -0.1, 0.3, sign=-1.0),    # an asymmetric job tolerance
            Dimension("washer", 2.5, -0.2, 0.2, sign=-1.0),      # ISO 7089 M12
            Dimension("nut", 10.585, -0.215, 0.215, sign=-1.0)]  # ISO 4032 M12 10.37..10.8


def test_worst_case_by_hand():
    # hand computation: nominal 50 - 12 - 20 - 2.5 - 10.585 = 4.915;
    # lowest = 4.915 - (0.5 + 0.2 + 0.3 + 0.2 + 0.215) = 3.5; highest = 4.915 + (0.5 + 0.2 + 0.1 + 0.2 + 0.215) = 6.13
    dims = _stack()
    assert T.nominal_sum(dims) == pytest.approx(4.915)
    assert T.worst_case_limits(dims) == pytest.approx((3.5, 6.13))


def test_rss_by_hand():
    # hand computation: halves 0.5, 0.2, 0.2, 0.2, 0.215;
    # sqrt(0.25 + 0.04 + 0.04 + 0.04 + 0.046225) = sqrt(0.416225) = 0.645155...;
    # mean: plate 2 centred at 20.1, so mu = 4.915 - 0.1 = 4.815
    dims = _stack()
    assert T.rss_half_band(dims) == pytest.approx(math.sqrt(0.416225))
    assert T.statistical_mean(dims) == pytest.approx(4.815)
    lo, hi = T.rss_limits(dims)
    assert lo == pytest.approx(4.815 - 0.6451550)
    assert hi == pytest.approx(4.815 + 0.6451550)
    # the statistical band lies inside the worst case
    wlo, whi = T.worst_case_limits(dims)
    assert wlo < lo < hi < whi


def test_share_out_of_limits_by_hand():
    # 1 pitch (1.75 mm) needed past the nut: z = (1.75 - 4.815) / (0.645155 / 3) = -14.25: none out;
    # a limit at mu - t_RSS is 3 sigma below: 0.135 % (standard normal table, Phi(-3) = 0.00135)
    dims = _stack()
    mu, sigma = T.statistical_mean(dims), T.stack_sigma(dims)
    assert T.share_below(1.75, mu, sigma) < 1e-12
    assert T.share_below(mu - T.rss_half_band(dims), mu, sigma) == pytest.approx(0.0013499, rel=1e-3)
    assert T.share_above(mu, mu, sigma) == pytest.approx(0.5)


def test_monte_carlo_agrees_with_rss():
    """Seeded normal samples of every dimension (band = +/- 3 sigma about its middle): the sum's
    mean and standard deviation agree with the RSS estimate within their sampling error."""
    dims = _stack()
    rng = np.random.default_rng(20261202)
    n = 200_000
    total = np.zeros(n)
    for d in dims:
        total += d.sign * rng.normal(d.middle, d.half / T.SIGMAS_PER_TOLERANCE, n)
    sigma = T.stack_sigma(dims)
    # standard error of the mean sigma/sqrt(n), of the standard deviation sigma/sqrt(2n); 4 of them
    assert abs(total.mean() - T.statistical_mean(dims)) < 4 * sigma / math.sqrt(n)
    assert abs(total.std(ddof=1) - sigma) < 4 * sigma / math.sqrt(2 * n)
    # the share beyond mu + 2 sigma: binomial error sqrt(p (1 - p) / n)
    limit = T.statistical_mean(dims) + 2 * sigma
    p = T.share_above(limit, T.statistical_mean(dims), sigma)
    assert abs((total > limit).mean() - p) < 4 * math.sqrt(p * (1 - p) / n)
    # every sample lies inside the worst-case limits (the normal tails beyond 3 sigma per
    # dimension are allowed for: they add to less than 5 sigma of the sum)
    wlo, whi = T.worst_case_limits(dims)
    assert total.min() > wlo - 0.5 and total.max() < whi + 0.5


def test_asme_y14_5_floating_fastener_example():
    # ASME Y14.5-2009 Appendix B, floating fastener: M14 bolts in 14.25 holes at MMC: T = 0.25 (from memory)
    assert T.floating_fastener_tolerance(14.25, 14.0) == pytest.approx(0.25)
    # inch form of the same formula (from memory): .375 fastener, .406 holes: T = .031
    assert T.floating_fastener_tolerance(0.406, 0.375) == pytest.approx(0.031)


def test_asme_y14_5_fixed_fastener_example():
    # ASME Y14.5-2009 Appendix B, fixed fastener: M14 studs, 14.4 clearance holes: T = (H - F)/2 = 0.2 each (from memory)
    assert T.fixed_fastener_tolerance(14.4, 14.0) == pytest.approx(0.2)
    # the general form H = F + T1 + T2 with unequal shares: 0.1 + 0.3 needs the same 14.4
    assert T.fixed_fastener_clearance_needed(14.0, 0.1, 0.3) == pytest.approx(14.4)


def test_asme_y14_5_fixed_fastener_without_projected_zone():
    # ASME Y14.5-2009 Appendix B: H = F + T1 + T2 (1 + 2P/D) when the zone is not projected (from memory);
    # P = 20 mm clamped, D = 10 mm engaged: 1 + 2*20/10 = 5, so 0.4 of clearance allows T = 0.4 / 6
    assert T.fixed_fastener_clearance_needed(14.0, 0.2, 0.2, projection=20.0, depth=10.0) == pytest.approx(15.2)
    t = T.fixed_fastener_tolerance_unprojected(14.4, 14.0, 20.0, 10.0)
    assert t == pytest.approx(0.4 / 6)
    # identity: the tolerance found needs exactly the clearance hole it came from
    assert T.fixed_fastener_clearance_needed(14.0, t, t, 20.0, 10.0) == pytest.approx(14.4)
    # the projected zone always affords more
    assert T.fixed_fastener_tolerance(14.4, 14.0) > t
