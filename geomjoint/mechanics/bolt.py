"""Bolt side of the joint: thread length, grip, shank and thread lengths in the grip, stiffness.

The textbook model of Budynas & Nisbett, *Shigley's Mechanical Engineering Design*,
10th ed., ch. 8 (Table 8-7 and eq. 8-17): the bolt is two springs in series, the
unthreaded shank (area A_d over l_d) and the threaded part inside the grip (tensile
stress area A_t over l_t).  All lengths mm, forces N, stiffness N/mm.
"""
from __future__ import annotations

import math

from geomjoint.catalog.hardware import thread_length_rule
from geomjoint.catalog.materials import engagement_factor
from geomjoint.errors import InputError
from geomjoint.units import MM_PER_INCH as INCH

__all__ = ["INCH", "MIN_PROTRUSION_PITCHES", "SIZING_PROTRUSION_PITCHES", "thread_length_rule",
           "minimum_engagement", "required_length", "bolt_thread_length", "effective_grip", "unthreaded_length", "grip_lengths", "shank_area",
           "bolt_stiffness"]

#: thread that must stand past the nut: at least one full pitch, so the chamfered end is not
#: in the nut (common practice)
MIN_PROTRUSION_PITCHES = 1.0
#: protrusion allowed for when a bolt length is chosen: two pitches (common practice)
SIZING_PROTRUSION_PITCHES = 2.0


def minimum_engagement(d: float, tapped_material: str | None) -> float:
    """Minimum thread engagement L_e,min = f d in a tapped part, mm.

    f by the material of the tapped part (catalog ``thread_engagement.csv``: steel 1.0,
    cast iron 1.25, copper alloys 1.5, aluminium 2.0; common practice): a softer tapped
    part needs a longer engagement for its threads to hold the bolt's breaking load.

    Parameters
    ----------
    d : float
        Nominal diameter, mm.
    tapped_material : str or None
        Catalog name or alias of the tapped part's material (None: steel).

    >>> minimum_engagement(10.0, "steel"), minimum_engagement(10.0, "aluminium")
    (10.0, 20.0)
    """
    return engagement_factor(tapped_material)[0] * d


def required_length(clamped: float, *, d: float, pitch: float, tapped: bool, gaps: float = 0.0,
                    nut_height: float | None = None, tapped_depth: float | None = None,
                    tapped_material: str | None = None,
                    protrusion_pitches: float = SIZING_PROTRUSION_PITCHES) -> float:
    """Bolt length under the head that a joint needs, mm: the one rule for sizing and checking.

    Through bolt:  L = l + gaps + m + n P  (grip, open gaps, nut height m, n pitches standing
    past the nut; n = 2 when a length is chosen, 1 as the least that passes).
    Tapped hole:   L = h + gaps + min(L_e,min, t)  (clamped thickness h above the tapped part,
    `minimum_engagement` by its material, but no deeper than the tapped depth t: more cannot
    engage, and the stripping check judges the engagement there is).

    Parameters
    ----------
    clamped : float
        Through: the grip l; tapped: h, the thickness clamped above the tapped part, mm.
    d, pitch : float
        Nominal diameter and pitch, mm.
    tapped : bool
        True for a screw into a tapped part.
    gaps : float
        Open gaps inside the stack, mm.
    nut_height : float or None
        Through bolts: the nut height m, mm.
    tapped_depth : float or None
        Tapped joints: the threaded depth t of the tapped part, mm (None: no limit).
    tapped_material : str or None
        Tapped joints: the tapped part's material.
    protrusion_pitches : float
        Through bolts: pitches past the nut (`SIZING_PROTRUSION_PITCHES` or `MIN_PROTRUSION_PITCHES`).

    >>> required_length(30.0, d=12.0, pitch=1.75, tapped=False, nut_height=10.8)   # M12 through, ISO 4032 nut
    44.3
    >>> required_length(20.0, d=10.0, pitch=1.5, tapped=True, tapped_depth=30.0, tapped_material="aluminium")
    40.0
    >>> required_length(20.0, d=10.0, pitch=1.5, tapped=True, tapped_depth=12.0, tapped_material="aluminium")
    32.0
    """
    if tapped:
        engagement = minimum_engagement(d, tapped_material)
        if tapped_depth is not None:
            engagement = min(engagement, tapped_depth)
        return clamped + gaps + engagement
    return clamped + gaps + (nut_height or 0.0) + protrusion_pitches * pitch


def bolt_thread_length(fastener) -> float | None:
    """Thread length L_T of a FastenerSpec: the given one, else the standard rule for its head
    kind; None when the length is unknown."""
    if fastener.length is None:
        return None
    if fastener.thread_length is not None:
        return float(fastener.thread_length)
    return thread_length_rule(fastener.d, fastener.length, fastener.system, fastener.head)


def effective_grip(clamped: float, tapped_depth: float | None, d: float) -> float:
    """Effective grip l' of a joint, mm (Shigley 10th ed., Table 8-7).

    Through bolt (``tapped_depth`` None): l' = l, the clamped thickness.
    Cap screw into a tapped part of thread depth t2: l' = h + t2/2 when t2 < d, else
    l' = h + d/2, with h the thickness clamped above the tapped part.

    Parameters
    ----------
    clamped : float
        Through joint: the grip l; tapped joint: h, mm.
    tapped_depth : float or None
        t2, the thickness (thread depth) of the tapped part, mm.
    d : float
        Nominal diameter, mm.

    Examples
    --------
    >>> effective_grip(20.0, None, 12.0)
    20.0
    >>> effective_grip(20.0, 30.0, 12.0)    # t2 >= d: h + d/2
    26.0
    >>> effective_grip(20.0, 8.0, 12.0)     # t2 < d: h + t2/2
    24.0
    """
    if tapped_depth is None:
        return float(clamped)
    return float(clamped + (tapped_depth if tapped_depth < d else d) / 2.0)


def unthreaded_length(length: float, thread_length: float, fully_threaded: bool = False) -> float:
    """Length of the unthreaded shank l_d = L - L_T (>= 0), mm (Shigley 10th ed., Table 8-7).

    Examples
    --------
    >>> unthreaded_length(50.0, 30.0)
    20.0
    >>> unthreaded_length(50.0, 30.0, fully_threaded=True)
    0.0
    """
    if fully_threaded:
        return 0.0
    return max(float(length) - float(thread_length), 0.0)


def grip_lengths(grip: float, shank: float) -> tuple[float, float]:
    """Unthreaded and threaded lengths inside the grip, (l_d, l_t) in mm (Shigley Table 8-7).

    l_t = l - l_d.  A shank longer than the grip (it cannot clamp; see the length check)
    is cut at the grip so that the stiffness stays finite: (l, 0).

    Examples
    --------
    >>> grip_lengths(32.0, 20.0)
    (20.0, 12.0)
    """
    l_d = min(max(float(shank), 0.0), float(grip))
    return l_d, float(grip) - l_d


def shank_area(d: float) -> float:
    """Major-diameter area A_d = pi d^2 / 4, mm^2.

    >>> round(shank_area(12.0), 3)
    113.097
    """
    return math.pi * d * d / 4.0


def bolt_stiffness(A_d: float, A_t: float, E: float, l_d: float, l_t: float) -> float:
    """Bolt stiffness k_b = A_d A_t E / (A_d l_t + A_t l_d), N/mm (Shigley 10th ed., eq. 8-17).

    Parameters
    ----------
    A_d : float
        Area of the unthreaded shank, mm^2.
    A_t : float
        Tensile stress area of the thread, mm^2.
    E : float
        Young's modulus of the bolt, MPa.
    l_d, l_t : float
        Unthreaded and threaded lengths in the grip, mm (not both zero).

    Examples
    --------
    >>> round(bolt_stiffness(113.097, 84.3, 207000.0, 20.0, 12.0))
    648520
    """
    denominator = A_d * l_t + A_t * l_d
    if denominator <= 0:
        raise InputError(f"bolt lengths in the grip must be positive, got l_d={l_d}, l_t={l_t}")
    return A_d * A_t * E / denominator
