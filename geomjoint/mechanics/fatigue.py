"""Bolt fatigue: endurance strength, stresses of the preloaded bolt, fatigue factor on the load line.

Budynas & Nisbett, *Shigley's Mechanical Engineering Design*, 10th ed.: Marin factors
(ch. 6), bolt fatigue with preload (Sec. 8-11, eqs. 8-35 to 8-40; numbers from memory).
Stresses MPa, forces N, areas mm^2.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from geomjoint.catalog import fatigue as data
from geomjoint.errors import InputError
from geomjoint.mechanics.joint import ROOM_TEMPERATURE

#: S_e' = 0.5 S_ut for S_ut <= 1400 MPa, else 700 MPa (Shigley 10th ed., eq. 6-8)
ENDURANCE_RATIO = 0.5
ENDURANCE_CAP = 700.0

#: Marin load factor for axial loading (Shigley 10th ed., eq. 6-26)
LOAD_FACTOR_AXIAL = 0.85

#: Marin size factor for axial loading (Shigley 10th ed., Sec. 6-9: no size effect in axial load)
SIZE_FACTOR_AXIAL = 1.0

#: service temperature below which a note warns that cold embrittlement is not assessed, degC
COLD_NOTE_BELOW = 0.0


def rotating_beam_endurance(S_ut: float) -> float:
    """Endurance limit of the rotating-beam specimen S_e' = 0.5 S_ut, capped at 700 MPa (eq. 6-8).

    >>> rotating_beam_endurance(1040.0), rotating_beam_endurance(1600.0)
    (520.0, 700.0)
    """
    return min(ENDURANCE_RATIO * S_ut, ENDURANCE_CAP)


def surface_factor(S_ut: float, finish: str = "machined") -> float:
    """Marin surface factor k_a = a S_ut^b, S_ut in MPa (Shigley 10th ed., eq. 6-19, Table 6-2).

    >>> round(surface_factor(520.0, "machined"), 3)     # Shigley Ex. 6-3 (from memory): 0.860
    0.86
    """
    a, b = data.surface_constants(finish, "MPa")
    return a * S_ut ** b


def marin_endurance(S_ut: float, k_a: float, k_d: float = 1.0, k_e: float = 1.0, K_f: float = 1.0,
                    k_b: float = SIZE_FACTOR_AXIAL, k_c: float = LOAD_FACTOR_AXIAL) -> float:
    """Endurance strength of the bolt by the Marin equation with the thread factor, MPa.

        S_e = k_a k_b k_c k_d k_e S_e' / K_f      (Shigley 10th ed., eq. 6-18; K_f on strength)

    Parameters
    ----------
    S_ut : float
        Tensile strength, MPa.
    k_a, k_b, k_c, k_d, k_e : float
        Surface, size, load, temperature and reliability factors.
    K_f : float
        Fatigue stress-concentration factor of the thread (Table 8-16).

    Examples
    --------
    >>> round(marin_endurance(1040.0, surface_factor(1040.0), 1.0, 0.814, 3.8), 1)
    67.8
    """
    return k_a * k_b * k_c * k_d * k_e * rotating_beam_endurance(S_ut) / K_f


@dataclass(frozen=True)
class Endurance:
    """The endurance strength used for a bolt, with how it was found."""

    Se: float                               # MPa
    method: str                             # "given" | "table" | "marin"
    factors: dict = field(default_factory=dict)   # k_a, k_b, k_c, k_d, k_e, K_f, Se_prime
    notes: tuple[str, ...] = ()


def bolt_endurance(grade: str, d: float, S_ut: float, threads: str = "rolled", *,
                   endurance: str = "auto", surface: str = "machined", temperature: float = ROOM_TEMPERATURE,
                   reliability: float = 0.99, Se: float | None = None) -> Endurance:
    """Endurance strength of a bolt: the tabulated value where it applies, else the Marin way.

    - ``Se`` given: used as is.
    - ``endurance = "auto"``: rolled threads of a class in Shigley Table 8-17 take the
      tabulated fully corrected value (nearest row, with a note, when the size is outside
      the class's range); cut threads and classes the table does not list go the Marin way.
    - ``"table"``: the tabulated value (InputError when the class is not listed).
    - ``"marin"``: S_e = k_a k_b k_c k_d k_e S_e' / K_f with K_f by class and thread form
      (Table 8-16), k_a from ``surface``, k_d from ``temperature``, k_e from ``reliability``.

    Examples
    --------
    >>> bolt_endurance("10.9", 12.0, 1040.0).Se
    162.0
    >>> round(bolt_endurance("10.9", 12.0, 1040.0, "cut").Se, 1)
    67.8
    """
    if Se is not None:
        if Se <= 0:
            raise InputError(f"Se must be positive, got {Se} MPa", where="Se")
        return Endurance(float(Se), "given", notes=("endurance strength given in the job",))
    if endurance not in ("auto", "table", "marin"):
        raise InputError(f"endurance must be auto, table or marin, got {endurance!r}", where="endurance")
    if threads not in ("rolled", "cut"):
        raise InputError(f"threads must be rolled or cut, got {threads!r}", where="threads")
    notes: list[str] = []
    if endurance in ("auto", "table"):
        row = data.table_endurance(grade, d)
        if row is None and endurance == "table":
            raise InputError(
                f"grade {grade!r} is not in the bolt endurance table (listed: {', '.join(data.table_endurance_grades())})",
                where="endurance",
            )
        if row is not None and (threads == "rolled" or endurance == "table"):
            if not row.in_range:
                notes.append(
                    f"Se: size {d:g} mm outside the Table 8-17 range of {row.grade} "
                    f"({row.d_min:g}-{row.d_max:g} mm); nearest row used"
                )
            if threads == "cut":
                notes.append("Se: Table 8-17 is for rolled threads; used for cut threads as requested")
            return Endurance(row.Se, "table", {"source": row.source}, tuple(notes))
        if row is None:
            notes.append(f"Se: grade {grade} not in Table 8-17; Marin factors used")
    K_f, kf_row = data.thread_kf(grade, threads, S_ut)
    k_a = surface_factor(S_ut, surface)
    k_d = data.temperature_factor(temperature)
    if temperature < COLD_NOTE_BELOW:
        notes.append("k_d = 1.0 below 70 degF; low-temperature embrittlement not assessed")
    k_e = data.reliability_factor(reliability)
    Se_prime = rotating_beam_endurance(S_ut)
    value = marin_endurance(S_ut, k_a, k_d, k_e, K_f)
    factors = {"Se_prime": Se_prime, "k_a": k_a, "k_b": SIZE_FACTOR_AXIAL, "k_c": LOAD_FACTOR_AXIAL,
               "k_d": k_d, "k_e": k_e, "K_f": K_f, "K_f_row": kf_row}
    return Endurance(value, "marin", factors, tuple(notes))


def bolt_stresses(preload: float, C: float, load_min: float, load_max: float,
                  stress_area: float) -> tuple[float, float, float]:
    """Preload, alternating and mean stress of the bolt, (sigma_i, sigma_a, sigma_m) in MPa.

        sigma_i = F_i / A_t
        sigma_a = C (P_max - P_min) / (2 A_t)
        sigma_m = sigma_i + C (P_max + P_min) / (2 A_t)

    (Shigley 10th ed., eqs. 8-35/8-36 with P_min.)  With no preload (F_i <= 0) the bolt
    carries the whole external load: C is replaced by 1 and sigma_i = 0.

    >>> [round(s, 2) for s in bolt_stresses(50000.0, 0.25, 0.0, 10000.0, 84.3)]
    [593.12, 14.83, 607.95]
    """
    if load_max < load_min:
        raise InputError(f"load max {load_max} N is below min {load_min} N", where="load")
    if stress_area <= 0:
        raise InputError(f"stress area must be positive, got {stress_area}")
    share = C if preload > 0 else 1.0
    sigma_i = max(preload, 0.0) / stress_area
    sigma_a = share * (load_max - load_min) / (2.0 * stress_area)
    sigma_m = sigma_i + share * (load_max + load_min) / (2.0 * stress_area)
    return sigma_i, sigma_a, sigma_m


def _criterion_strength(criterion: str, S_ut: float, S_p: float | None, S_y: float | None) -> float:
    if criterion in ("goodman", "gerber"):
        return S_ut
    if criterion == "asme-elliptic":
        if S_p is None:
            raise InputError("asme-elliptic needs the proof strength S_p", where="criterion")
        return S_p
    if criterion == "soderberg":
        if S_y is None:
            raise InputError("soderberg needs the yield strength S_y", where="criterion")
        return S_y
    raise InputError(f"unknown fatigue criterion {criterion!r} (goodman, gerber, asme-elliptic, soderberg)",
                     where="criterion")


def load_line_strength(criterion: str, Se: float, sigma_i: float, slope: float, S_ut: float,
                       S_p: float | None = None, S_y: float | None = None) -> float:
    """Alternating strength S_a where the load line meets the criterion curve, MPa.

    The load line: when the external load grows by a factor (P_min/P_max fixed), the
    operating point moves on S_m = sigma_i + r S_a with r = (P_max + P_min)/(P_max - P_min)
    = (sigma_m - sigma_i)/sigma_a; r = 1 for P_min = 0 (Shigley 10th ed., Sec. 8-11).
    Without preload (sigma_i = 0) the line runs through the origin with slope sigma_m/sigma_a.
    Intersections in closed form, S the criterion's mean-stress strength (S_ut for
    Goodman and Gerber, S_p for ASME-elliptic, S_y for Soderberg):

    - Goodman / Soderberg, S_a/S_e + S_m/S = 1:  S_a = S_e (S - sigma_i) / (S + r S_e)
      (r = 1: Shigley eq. 8-38).
    - Gerber, S_a/S_e + (S_m/S_ut)^2 = 1: root of r^2 S_a^2 + (2 r sigma_i + S_ut^2/S_e) S_a
      + sigma_i^2 - S_ut^2 = 0 (r = 1: eq. 8-39).
    - ASME-elliptic, (S_a/S_e)^2 + (S_m/S_p)^2 = 1: root of (S_p^2 + r^2 S_e^2) S_a^2
      + 2 r sigma_i S_e^2 S_a + S_e^2 (sigma_i^2 - S_p^2) = 0 (r = 1: eq. 8-40).

    A preload stress at or beyond the curve (sigma_i >= S) gives S_a = 0.

    >>> round(load_line_strength("goodman", 162.0, 593.1, 1.0, 1040.0), 2)
    60.23
    """
    S = _criterion_strength(criterion, S_ut, S_p, S_y)
    if Se <= 0:
        raise InputError(f"Se must be positive, got {Se}")
    if sigma_i >= S:
        return 0.0
    if criterion in ("goodman", "soderberg"):
        return Se * (S - sigma_i) / (S + slope * Se)
    if criterion == "gerber":
        a, b, c = slope * slope, 2.0 * slope * sigma_i + S * S / Se, sigma_i * sigma_i - S * S
    else:  # asme-elliptic
        a, b, c = S * S + slope * slope * Se * Se, 2.0 * slope * sigma_i * Se * Se, Se * Se * (sigma_i * sigma_i - S * S)
    # positive root of a x^2 + b x + c = 0 with c < 0, in the form that survives a = 0
    return -2.0 * c / (b + math.sqrt(b * b - 4.0 * a * c))


def fatigue_factor(criterion: str, Se: float, sigma_i: float, sigma_a: float, sigma_m: float,
                   S_ut: float, S_p: float | None = None, S_y: float | None = None) -> float | None:
    """Fatigue factor n_f = S_a / sigma_a along the load line (see :func:`load_line_strength`).

    ``None`` when sigma_a = 0 (no fluctuation: unbounded).  For P_min = 0 and Goodman this is
    Shigley 10th ed., eq. 8-38 divided by sigma_a:
    n_f = S_e (S_ut - sigma_i) / (sigma_a (S_ut + S_e)).

    >>> round(fatigue_factor("goodman", 162.0, 593.1, 14.83, 607.93, 1040.0), 3)
    4.061
    """
    if sigma_a <= 0:
        return None
    slope = (sigma_m - sigma_i) / sigma_a
    return load_line_strength(criterion, Se, sigma_i, slope, S_ut, S_p, S_y) / sigma_a
