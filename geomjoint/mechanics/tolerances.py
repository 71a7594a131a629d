"""Tolerance stack-ups: worst case, root-sum-square, the share out of limits, and the
position tolerance a fastened hole pattern can afford (ASME Y14.5 fastener formulas).

A stack is a sum y = sum_i s_i x_i of dimensions x_i, each with a nominal and a lower and
upper deviation, and a sign s_i (+1 adds to the stack, -1 takes away).  The worst case adds
every deviation the same way; the statistical (root-sum-square) estimate adds the half
tolerances in quadrature around the mean (an asymmetric tolerance shifts its dimension's
mean to the middle of its band).  For the share out of limits each dimension is taken as
normally distributed with its tolerance band = +/- 3 sigma (:data:`SIGMAS_PER_TOLERANCE`),
which is the usual assumption of a process capable at C_p = 1 (common practice); the
sum is then normal with sigma = RSS / 3.  All lengths mm.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Iterable

#: each tolerance band is taken as +/- this many standard deviations of its dimension
#: (a process capability C_p = 1; common practice for statistical tolerancing)
SIGMAS_PER_TOLERANCE = 3.0


@dataclass(frozen=True)
class Dimension:
    """One dimension of a stack: nominal, lower and upper deviation (mm) and its sign in the sum."""

    name: str
    nominal: float
    lower: float = 0.0          # deviation, <= upper (e.g. -0.1)
    upper: float = 0.0          # deviation (e.g. +0.2)
    sign: float = 1.0           # +1: adds to the stack, -1: takes away from it
    source: str = ""

    @property
    def half(self) -> float:
        """Half the tolerance band, mm."""
        return 0.5 * (self.upper - self.lower)

    @property
    def middle(self) -> float:
        """The middle of the band (the mean a centred process makes), mm."""
        return self.nominal + 0.5 * (self.lower + self.upper)


def nominal_sum(dims: Iterable[Dimension]) -> float:
    """The stack at nominal sizes, y_0 = sum s_i x_i, mm.

    >>> nominal_sum([Dimension("a", 10.0), Dimension("b", 4.0, sign=-1.0)])
    6.0
    """
    return float(sum(d.sign * d.nominal for d in dims))


def worst_case_limits(dims: Iterable[Dimension]) -> tuple[float, float]:
    """Worst-case limits of a stack: y_min = sum s_i x_i + sum min(s_i l_i, s_i u_i), y_max likewise, mm.

    (Arithmetic tolerance stack, e.g. ASME Y14.5 / any tolerancing text.)

    Parameters
    ----------
    dims : Dimension
        The dimensions (nominal, lower and upper deviation, sign).

    >>> worst_case_limits([Dimension("a", 10.0, -0.1, 0.2), Dimension("b", 4.0, -0.05, 0.05, sign=-1.0)])
    (5.85, 6.25)
    """
    dims = list(dims)
    lo = sum(d.sign * d.nominal + min(d.sign * d.lower, d.sign * d.upper) for d in dims)
    hi = sum(d.sign * d.nominal + max(d.sign * d.lower, d.sign * d.upper) for d in dims)
    return round(lo, 12), round(hi, 12)


def rss_half_band(dims: Iterable[Dimension]) -> float:
    """Root-sum-square of the half tolerances, t_RSS = sqrt(sum h_i^2), mm.

    >>> rss_half_band([Dimension("a", 10.0, -0.3, 0.3), Dimension("b", 5.0, -0.4, 0.4)])
    0.5
    """
    return math.sqrt(sum(d.half ** 2 for d in dims))


def statistical_mean(dims: Iterable[Dimension]) -> float:
    """Mean of the stack when every dimension is centred in its band, mu = sum s_i m_i, mm.

    >>> statistical_mean([Dimension("a", 10.0, -0.1, 0.3)])
    10.1
    """
    return float(sum(d.sign * d.middle for d in dims))


def rss_limits(dims: Iterable[Dimension]) -> tuple[float, float]:
    """Statistical (root-sum-square) limits of a stack, mu -/+ t_RSS, mm.

    With every tolerance = +/- 3 sigma these are the +/- 3 sigma limits of the sum.

    >>> rss_limits([Dimension("a", 10.0, -0.3, 0.3), Dimension("b", 5.0, -0.4, 0.4, sign=-1.0)])
    (4.5, 5.5)
    """
    dims = list(dims)
    mu, half = statistical_mean(dims), rss_half_band(dims)
    return round(mu - half, 12), round(mu + half, 12)


def stack_sigma(dims: Iterable[Dimension], sigmas: float = SIGMAS_PER_TOLERANCE) -> float:
    """Standard deviation of the stack, sigma = t_RSS / k with each tolerance = +/- k sigma, mm.

    >>> stack_sigma([Dimension("a", 10.0, -0.3, 0.3), Dimension("b", 5.0, -0.4, 0.4)])
    0.16666666666666666
    """
    return rss_half_band(dims) / sigmas


def share_below(limit: float, mean: float, sigma: float) -> float:
    """Share of a normal population N(mean, sigma) below ``limit``: Phi((limit - mean) / sigma).

    A zero sigma gives 0 or 1.

    >>> round(share_below(-3.0, 0.0, 1.0), 6)       # 3 sigma below the mean: 0.135 %
    0.00135
    """
    if sigma <= 0:
        return 1.0 if mean < limit else 0.0
    return 0.5 * math.erfc(-(limit - mean) / (sigma * math.sqrt(2.0)))


def share_above(limit: float, mean: float, sigma: float) -> float:
    """Share of a normal population N(mean, sigma) above ``limit``: 1 - Phi((limit - mean) / sigma).

    >>> round(share_above(2.0, 0.0, 1.0), 5)
    0.02275
    """
    if sigma <= 0:
        return 1.0 if mean > limit else 0.0
    return 0.5 * math.erfc((limit - mean) / (sigma * math.sqrt(2.0)))


# ----------------------------------------------------------------------------- hole patterns

def floating_fastener_tolerance(H: float, F: float) -> float:
    """Position tolerance (diameter) of each part's holes with a floating fastener, T = H - F, mm.

    Both parts have clearance holes and the bolt floats in both (a bolt and nut).
    (ASME Y14.5-2009 Appendix B, floating fastener case, from memory.)

    Parameters
    ----------
    H : float
        Clearance hole at its maximum material condition (smallest), mm.
    F : float
        Fastener at its maximum material condition (largest major diameter), mm.

    >>> round(floating_fastener_tolerance(14.25, 14.0), 6)
    0.25
    """
    return H - F


def fixed_fastener_tolerance(H: float, F: float) -> float:
    """Position tolerance (diameter) of each part with a fixed fastener, equal split, T = (H - F) / 2, mm.

    One part holds the fastener (a tapped hole, a press-fit stud); the clearance holes of the
    other share H - F with it: T_1 + T_2 = H - F, so T = (H - F)/2 each.  This holds when the
    tapped part's tolerance zone is projected above it by the clamped thickness.
    (ASME Y14.5-2009 Appendix B, fixed fastener case, from memory.)

    >>> round(fixed_fastener_tolerance(14.4, 14.0), 6)
    0.2
    """
    return 0.5 * (H - F)


def fixed_fastener_clearance_needed(F: float, T_clearance: float, T_fixed: float,
                                    projection: float | None = None, depth: float | None = None) -> float:
    """Clearance hole a fixed fastener needs, H = F + T_1 + T_2 (1 + 2 P / D), mm.

    Without a projected tolerance zone the fixed fastener may lean inside its hole's zone, and
    the lean grows over the clamped thickness P above a hole of engaged depth D; with the
    projected zone (``projection`` None) the term in brackets is 1.
    (ASME Y14.5-2009 Appendix B, fixed fastener with perpendicularity, from memory.)

    Parameters
    ----------
    F : float
        Fastener at MMC, mm.
    T_clearance, T_fixed : float
        Position tolerances of the clearance hole and the fixed (tapped) hole, mm (diameters).
    projection : float or None
        P, the thickness of the part with the clearance hole (the fastener's projection), mm.
    depth : float or None
        D, the engaged depth of the fixed fastener in its part, mm.

    >>> round(fixed_fastener_clearance_needed(14.0, 0.2, 0.2), 6)                 # projected: 14.4
    14.4
    >>> round(fixed_fastener_clearance_needed(14.0, 0.2, 0.2, projection=20.0, depth=20.0), 6)   # 14 + 0.2 + 0.2*3
    14.8
    """
    lean = 1.0 if projection is None or not depth else 1.0 + 2.0 * projection / depth
    return F + T_clearance + T_fixed * lean


def fixed_fastener_tolerance_unprojected(H: float, F: float, projection: float, depth: float) -> float:
    """Equal position tolerance of both parts, fixed fastener, zone not projected: T = (H - F) / (2 + 2 P / D), mm.

    :func:`fixed_fastener_clearance_needed` solved for T_1 = T_2 = T.

    >>> round(fixed_fastener_tolerance_unprojected(14.4, 14.0, 20.0, 20.0), 6)   # 0.4 / 4
    0.1
    """
    return (H - F) / (2.0 + 2.0 * projection / depth)
