"""Preload and tightening torque.  Forces N, lengths mm, torques N*mm, angles deg.

Sources: Budynas & Nisbett, *Shigley's Mechanical Engineering Design*, 10th ed.,
Sec. 8-8 (torque-tension relation; equation numbers from memory) and VDI 2230-1 (2015)
for the definition of the tightening factor alpha_A = F_M,max / F_M,min.
"""
from __future__ import annotations

import math

from geomjoint.errors import InputError

#: half-angle of the ISO metric and Unified thread profile, deg (ISO 68-1, ASME B1.1)
THREAD_HALF_ANGLE = 30.0


def proof_load(stress_area: float, proof: float) -> float:
    """Proof load F_p = A_t S_p, N (Shigley 10th ed., eq. 8-31 text; ISO 898-1 Table 5 uses A_s S_p).

    >>> round(proof_load(84.3, 830.0))   # M12 class 10.9: ISO 898-1 Table 5 gives 70 000 N
    69969
    """
    return stress_area * proof


def preload_from_proof(fraction: float, stress_area: float, proof: float) -> float:
    """Preload as a fraction of the proof load, F_i = fraction A_t S_p, N.

    Shigley 10th ed., eq. 8-31 recommends 0.75 for reused and 0.90 for permanent joints.

    >>> round(preload_from_proof(0.75, 84.3, 830.0))
    52477
    """
    if not 0.0 <= fraction <= 1.0:
        raise InputError(f"preload fraction must be between 0 and 100 % of proof load, got {fraction:.3g}")
    return fraction * proof_load(stress_area, proof)


def torque_nut_factor(preload: float, d: float, K: float = 0.2) -> float:
    """Tightening torque by the nut factor, T = K F_i d, N*mm (Shigley 10th ed., eq. 8-27).

    K = 0.2 is the common figure for plain steel threads, mu ~ 0.15 (Shigley Sec. 8-8).

    >>> torque_nut_factor(50000.0, 12.0, 0.2)
    120000.0
    """
    return K * preload * d


def thread_torque(preload: float, d2: float, pitch: float, mu_thread: float,
                  half_angle: float = THREAD_HALF_ANGLE, starts: int = 1) -> float:
    """Torque spent in the thread while tightening (raising the load), N*mm.

        T_G = F (d2 / 2) (tan(lambda) + mu sec(a)) / (1 - mu tan(lambda) sec(a)),
        tan(lambda) = starts * P / (pi d2)

    the thread term of Shigley 10th ed., eq. 8-26 (power-screw formula for a V thread,
    from memory); a = thread half-angle.  mu = 0 leaves the lifting work alone:
    T 2 pi = F P.

    Parameters
    ----------
    preload : float
        F, N.
    d2 : float
        Pitch (mean) diameter, mm.
    pitch : float
        P, mm.
    mu_thread : float
        Thread friction coefficient mu_G.
    half_angle : float
        Thread half-angle, deg.
    starts : int
        Number of thread starts.

    Examples
    --------
    >>> round(thread_torque(50000.0, 10.863, 1.75, 0.0) * 2 * math.pi / 50000.0, 6)
    1.75
    """
    tan_l = starts * pitch / (math.pi * d2)
    sec_a = 1.0 / math.cos(math.radians(half_angle))
    denominator = 1.0 - mu_thread * tan_l * sec_a
    if denominator <= 0:
        raise InputError(f"thread friction {mu_thread} is too high for the lead angle (self-locking limit)")
    return preload * d2 / 2.0 * (tan_l + mu_thread * sec_a) / denominator


def head_torque(preload: float, d_w: float, d_h: float, mu_head: float) -> float:
    """Friction torque under the head or nut, T_K = F mu_K D_Km / 2, N*mm.

    D_Km = (d_w + d_h) / 2, the mean bearing diameter (collar term of Shigley 10th ed.,
    eq. 8-26; VDI 2230-1 eq. R13 uses the same D_Km).

    >>> head_torque(50000.0, 18.0, 13.0, 0.15)
    58125.0
    """
    return preload * mu_head * (d_w + d_h) / 4.0


def torque_friction(preload: float, d2: float, pitch: float, d_w: float, d_h: float,
                    mu_thread: float, mu_head: float, half_angle: float = THREAD_HALF_ANGLE) -> float:
    """Tightening torque from thread and head friction, T = T_G + T_K, N*mm (Shigley eq. 8-26).

    See :func:`thread_torque` and :func:`head_torque`.

    >>> round(torque_friction(50000.0, 10.863, 1.75, 18.0, 13.0, 0.15, 0.15))
    119636
    """
    return thread_torque(preload, d2, pitch, mu_thread, half_angle) + head_torque(preload, d_w, d_h, mu_head)


def equivalent_nut_factor(d: float, d2: float, pitch: float, d_w: float, d_h: float,
                          mu_thread: float, mu_head: float) -> float:
    """Nut factor K = T / (F d) that the friction pair implies (Shigley 10th ed., eq. 8-28 form).

    >>> round(equivalent_nut_factor(12.0, 10.863, 1.75, 18.0, 13.0, 0.15, 0.15), 3)
    0.199
    """
    return torque_friction(1.0, d2, pitch, d_w, d_h, mu_thread, mu_head) / d


def preload_for_torque_nut_factor(torque: float, d: float, K: float = 0.2) -> float:
    """Preload reached with a torque, F_i = T / (K d), N (inverse of :func:`torque_nut_factor`).

    >>> round(preload_for_torque_nut_factor(120000.0, 12.0, 0.2), 6)
    50000.0
    """
    if K <= 0 or d <= 0:
        raise InputError(f"nut factor and diameter must be positive, got K={K}, d={d}")
    return torque / (K * d)


def preload_for_torque_friction(torque: float, d2: float, pitch: float, d_w: float, d_h: float,
                                mu_thread: float, mu_head: float) -> float:
    """Preload reached with a torque by thread and head friction, N (inverse of :func:`torque_friction`).

    The torque is linear in the preload, so F_i = T / T(F = 1 N).

    >>> round(preload_for_torque_friction(119636.0, 10.863, 1.75, 18.0, 13.0, 0.15, 0.15))
    50000
    """
    return torque / torque_friction(1.0, d2, pitch, d_w, d_h, mu_thread, mu_head)


def preload_scatter(preload: float, scatter: float) -> tuple[float, float]:
    """Smallest and largest preload for a tightening factor alpha_A = F_max / F_min, N.

    Convention (ours, following the VDI 2230-1 definition of alpha_A with the nominal
    preload taken as the mean of the scatter band): the given or computed preload F_i is
    the mean, (F_min + F_max) / 2 = F_i, so

        F_min = 2 F_i / (1 + alpha_A),    F_max = 2 alpha_A F_i / (1 + alpha_A).

    The textbook checks use F_i itself; F_min and F_max are reported.

    >>> preload_scatter(50000.0, 1.5)
    (40000.0, 60000.0)
    """
    if scatter < 1.0:
        raise InputError(f"tightening scatter factor must be >= 1, got {scatter}")
    return 2.0 * preload / (1.0 + scatter), 2.0 * scatter * preload / (1.0 + scatter)
