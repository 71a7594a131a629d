"""Bolt side of the joint: thread length, grip, shank and thread lengths in the grip, stiffness.

The textbook model of Budynas & Nisbett, *Shigley's Mechanical Engineering Design*,
10th ed., ch. 8 (Table 8-7 and eq. 8-17): the bolt is two springs in series, the
unthreaded shank (area A_d over l_d) and the threaded part inside the grip (tensile
stress area A_t over l_t).  All lengths mm, forces N, stiffness N/mm.
"""
from __future__ import annotations

import math

from geomjoint.errors import InputError

#: one inch, mm (exact by definition)
INCH = 25.4

#: metric thread-length rule L_T = 2d + c (ISO 4014 b(ref); Shigley 10th ed., Table 8-7 notes,
#: from memory): (upper limit of the bolt length L in mm, c in mm); the last row has no limit
METRIC_THREAD_LENGTH_RULE = ((125.0, 6.0), (200.0, 12.0), (math.inf, 25.0))

#: inch thread-length rule L_T = 2d + c (ASME B18.2.1; Shigley 10th ed., Table 8-7 notes, from
#: memory): L <= 6 in -> c = 1/4 in, else c = 1/2 in
INCH_THREAD_LENGTH_RULE = ((6.0 * INCH, 0.25 * INCH), (math.inf, 0.5 * INCH))


#: thread that must stand past the nut: at least one full pitch, so the chamfered end is not
#: in the nut (common practice)
MIN_PROTRUSION_PITCHES = 1.0
#: protrusion allowed for when a bolt length is chosen: two pitches (common practice)
SIZING_PROTRUSION_PITCHES = 2.0


#: socket head cap screws: metric b = 2d + 12 mm (ISO 4762:2004 b ref, from memory: M8 28, M12 36,
#: M16 44 mm); inch L_T = 2D + 1/2 in (ASME B18.3, from memory)
METRIC_SOCKET_THREAD_EXTRA = 12.0
INCH_SOCKET_THREAD_EXTRA = 0.5 * INCH


def thread_length_rule(d: float, length: float, system: str, head: str = "hex") -> float:
    """Standard thread length L_T of a bolt of nominal diameter ``d`` and length ``length``.

    Metric (ISO 4014 b(ref)):  L_T = 2d + 6 mm (L <= 125), 2d + 12 mm (125 < L <= 200),
    2d + 25 mm (L > 200).  Inch (ASME B18.2.1): L_T = 2d + 1/4 in (L <= 6 in), else 2d + 1/2 in.
    Source: Shigley 10th ed., Table 8-7 footnotes (from memory).  The result can exceed L
    for short bolts: such a bolt is threaded to the head.

    Parameters
    ----------
    d : float
        Nominal diameter, mm.
    length : float
        Bolt length under the head, mm.
    system : str
        "metric" or "inch".
    head : str
        "hex" (the rules above) or "socket": socket head cap screws have the longer thread
        of ISO 4762 (b = 2d + 12 mm) and ASME B18.3 (2D + 1/2 in).

    Examples
    --------
    >>> thread_length_rule(12.0, 50.0, "metric")
    30.0
    >>> round(thread_length_rule(12.7, 50.8, "inch") / INCH, 4)   # 1/2 in x 2 in
    1.25
    >>> thread_length_rule(8.0, 35.0, "metric", "socket")
    28.0
    """
    if d <= 0 or length <= 0:
        raise InputError(f"diameter and length must be positive, got d={d}, L={length}")
    if head == "socket" and system in ("metric", "inch"):
        return 2.0 * d + (METRIC_SOCKET_THREAD_EXTRA if system == "metric" else INCH_SOCKET_THREAD_EXTRA)
    if system == "metric":
        rule = METRIC_THREAD_LENGTH_RULE
    elif system == "inch":
        rule = INCH_THREAD_LENGTH_RULE
    else:
        raise InputError(f"unknown thread system {system!r} (metric or inch)")
    for limit, extra in rule:
        if length <= limit:
            return 2.0 * d + extra
    raise AssertionError("unreachable: the last rule row has no limit")


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
