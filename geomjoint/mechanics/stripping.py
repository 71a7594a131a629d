"""Thread stripping: shear areas of engaged threads, the engagement that lets the bolt break first.

A bolt loaded to its ultimate A_s R_m must break in its stress area before the threads of
the nut or the tapped part shear off, because a broken bolt is seen at once while a
stripped thread can pass unnoticed.  The shear areas at the engagement length L_e are
the published ones (FED-STD-H28/2B, Table II.B.1 formulas as reprinted in Machinery's
Handbook, "Strength of screw threads", from memory), evaluated at the least favourable
limits of the thread tolerance: 6g/6H for ISO metric threads (ISO 965-1 tolerance
formulas), 2A/2B for Unified inch threads (ASME B1.1 formulas).

Units: mm, mm^2, N, MPa.  The inch formulas are evaluated in inches and converted.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

from geomjoint.errors import InputError
from geomjoint.mechanics.joint import Check, JointSpec
from geomjoint.units import MM_PER_INCH as INCH

#: tan 30 deg, the flank slope of the 60 deg ISO / Unified thread profile (ISO 68-1; ASME B1.1)
TAN_30 = 1.0 / math.sqrt(3.0)

#: shear strength of thread material taken as 0.6 R_m (common practice; Machinery's Handbook)
SHEAR_TO_TENSILE = 0.6

#: basic-profile constants (ISO 68-1 / ASME B1.1): d2 = d - 0.649519 P, D1 = d - 1.082532 P
PITCH_DIAMETER_COEFF = 0.649519
MINOR_DIAMETER_COEFF = 1.082532

#: ISO 965-1:2013 nominal-diameter ranges for the pitch-diameter tolerance, mm (from memory);
#: the tolerance formula uses the geometric mean of the range's limits
ISO965_RANGES = (0.99, 1.4, 2.8, 5.6, 11.2, 22.4, 45.0, 90.0, 180.0, 355.0)


@dataclass(frozen=True)
class ThreadLimits:
    """Limits of size of a mating thread pair, mm."""

    d_max: float      # major diameter of the external thread
    d_min: float
    d2_max: float     # pitch diameter of the external thread
    d2_min: float
    D1_min: float     # minor diameter of the internal thread
    D1_max: float
    D2_min: float     # pitch diameter of the internal thread
    D2_max: float
    tolerance: str    # "6g/6H" | "2A/2B"


# --------------------------------------------------------------------------------------
# ISO 965-1 (6g / 6H)
# --------------------------------------------------------------------------------------

def iso965_range_mean(d: float) -> float:
    """Geometric mean of the ISO 965-1 diameter range holding d, mm.

    >>> round(iso965_range_mean(10.0), 3)
    7.92
    """
    for lo, hi in zip(ISO965_RANGES[:-1], ISO965_RANGES[1:]):
        if lo < d <= hi:
            return math.sqrt(lo * hi)
    raise InputError(f"nominal diameter {d} mm outside ISO 965-1 ranges ({ISO965_RANGES[0]}-{ISO965_RANGES[-1]})")


def iso965_deviation_g(P: float) -> float:
    """Fundamental deviation of tolerance position g, es = -(15 + 11 P) um, returned in mm.

    (ISO 965-1:2013 Section 7, from memory.)

    >>> round(iso965_deviation_g(1.5), 4)
    -0.0315
    """
    return -(15.0 + 11.0 * P) * 1e-3


def iso965_Td6(P: float) -> float:
    """Major-diameter tolerance of the external thread, grade 6, Td(6) = 180 P^(2/3) - 3.15/sqrt(P) um -> mm.

    (ISO 965-1:2013, from memory; the standard's tables round to the R40 series.)

    >>> round(iso965_Td6(1.5), 4)
    0.2333
    """
    return (180.0 * P ** (2.0 / 3.0) - 3.15 / math.sqrt(P)) * 1e-3


def iso965_Td2_6(d: float, P: float) -> float:
    """Pitch-diameter tolerance of the external thread, grade 6, Td2(6) = 90 P^0.4 d^0.1 um -> mm.

    d is the geometric mean of the diameter range (ISO 965-1:2013, from memory).

    >>> round(iso965_Td2_6(10.0, 1.5), 4)
    0.1302
    """
    return 90.0 * P**0.4 * iso965_range_mean(d) ** 0.1 * 1e-3


def iso965_TD2_6(d: float, P: float) -> float:
    """Pitch-diameter tolerance of the internal thread, grade 6, TD2(6) = 1.32 Td2(6), mm.

    (ISO 965-1:2013, from memory.)

    >>> round(iso965_TD2_6(10.0, 1.5), 4)
    0.1718
    """
    return 1.32 * iso965_Td2_6(d, P)


def iso965_TD1_6(P: float) -> float:
    """Minor-diameter tolerance of the internal thread, grade 6, mm.

    TD1(6) = 433 P - 190 P^1.22 um for P <= 0.8, 230 P^0.7 um for P >= 1
    (ISO 965-1:2013, from memory).

    >>> round(iso965_TD1_6(1.5), 4)
    0.3055
    """
    if P < 1.0:
        return (433.0 * P - 190.0 * P**1.22) * 1e-3
    return 230.0 * P**0.7 * 1e-3


def iso965_limits(d: float, P: float) -> ThreadLimits:
    """Limits of size of an ISO metric 6g bolt thread in a 6H nut thread (ISO 965-1), mm.

    Computed from the tolerance formulas without the standard's R40 rounding (differences of
    a few micrometres from its tables).

    >>> lim = iso965_limits(10.0, 1.5)
    >>> round(lim.d2_min, 3), round(lim.D1_max, 3)
    (8.864, 8.682)
    """
    if d <= 0 or P <= 0:
        raise InputError(f"thread diameter and pitch must be positive, got d={d}, P={P}")
    es = iso965_deviation_g(P)
    d2 = d - PITCH_DIAMETER_COEFF * P
    D1 = d - MINOR_DIAMETER_COEFF * P
    return ThreadLimits(
        d_max=d + es, d_min=d + es - iso965_Td6(P),
        d2_max=d2 + es, d2_min=d2 + es - iso965_Td2_6(d, P),
        D1_min=D1, D1_max=D1 + iso965_TD1_6(P),
        D2_min=d2, D2_max=d2 + iso965_TD2_6(d, P),
        tolerance="6g/6H",
    )


# --------------------------------------------------------------------------------------
# ASME B1.1 (2A / 2B)
# --------------------------------------------------------------------------------------

def unified_Td2_2A(D_in: float, P_in: float) -> float:
    """Pitch-diameter tolerance of a class 2A external thread, inches.

    Td2 = 0.0015 D^(1/3) + 0.0015 sqrt(LE) + 0.015 P^(2/3), LE = 9 P
    (ASME B1.1-2003 Section 5.8, from memory).

    >>> round(unified_Td2_2A(0.5, 1 / 13), 5)    # 1/2-13 UNC
    0.00515
    """
    return 0.0015 * D_in ** (1.0 / 3.0) + 0.0015 * math.sqrt(9.0 * P_in) + 0.015 * P_in ** (2.0 / 3.0)


def unified_limits(d: float, P: float) -> ThreadLimits:
    """Limits of size of a Unified 2A bolt thread in a 2B nut thread (ASME B1.1), mm.

    Class 2A allowance es = 0.300 Td2(2A); major-diameter tolerance 0.060 P^(2/3);
    TD2(2B) = 1.30 Td2(2A); minor-diameter tolerance of 2B taken as 0.25 P - 0.40 P^2
    (ASME B1.1-2003 Section 5.8 formulas, from memory; the last is the rule for the
    coarser sizes and runs up to ~0.002 in small for #10 and below, which overstates the
    external-thread shear area by a few per cent there).

    >>> lim = unified_limits(12.7, 25.4 / 13)
    >>> round(lim.d2_max / 25.4, 4), round(lim.D1_max / 25.4, 4)
    (0.4485, 0.4336)
    """
    if d <= 0 or P <= 0:
        raise InputError(f"thread diameter and pitch must be positive, got d={d}, P={P}")
    D, p = d / INCH, P / INCH
    Td2 = unified_Td2_2A(D, p)
    es = 0.300 * Td2
    E = D - PITCH_DIAMETER_COEFF * p
    K = D - MINOR_DIAMETER_COEFF * p
    d_max = D - es
    return ThreadLimits(
        d_max=d_max * INCH, d_min=(d_max - 0.060 * p ** (2.0 / 3.0)) * INCH,
        d2_max=(E - es) * INCH, d2_min=(E - es - Td2) * INCH,
        D1_min=K * INCH, D1_max=(K + 0.25 * p - 0.40 * p**2) * INCH,
        D2_min=E * INCH, D2_max=(E + 1.30 * Td2) * INCH,
        tolerance="2A/2B",
    )


def thread_limits(d: float, P: float, system: str) -> ThreadLimits:
    """6g/6H limits for "metric", 2A/2B for "inch"."""
    if system == "metric":
        return iso965_limits(d, P)
    if system == "inch":
        return unified_limits(d, P)
    raise InputError(f"unknown thread system {system!r} (metric or inch)")


# --------------------------------------------------------------------------------------
# shear areas and loads
# --------------------------------------------------------------------------------------

def external_shear_area(L_e: float, P: float, D1_max: float, d2_min: float) -> float:
    """Shear area of the external (bolt) thread over the engagement L_e, mm^2.

        A_S,ext = pi L_e D1,max [1/2 + tan30 (d2,min - D1,max) / P]

    the cylinder at the nut's largest minor diameter times the share of it occupied by the
    bolt's teeth (FED-STD-H28/2B Table II.B.1, from memory, written with P = 1/n; Machinery's
    Handbook, "Strength of screw threads").

    Examples
    --------
    >>> round(external_shear_area(8.0, 1.5, 8.676, 8.862), 1)   # M10, 8 mm engaged
    124.6
    """
    if L_e < 0:
        raise InputError(f"engagement length must be >= 0, got {L_e}")
    return math.pi * L_e * D1_max * (0.5 + TAN_30 * (d2_min - D1_max) / P)


def internal_shear_area(L_e: float, P: float, d_min: float, D2_max: float) -> float:
    """Shear area of the internal (nut / tapped) thread over the engagement L_e, mm^2.

        A_S,int = pi L_e d_min [1/2 + tan30 (d_min - D2,max) / P]

    (FED-STD-H28/2B Table II.B.1, from memory; Machinery's Handbook.)

    Examples
    --------
    >>> round(internal_shear_area(8.0, 1.5, 9.732, 9.206), 1)
    171.8
    """
    if L_e < 0:
        raise InputError(f"engagement length must be >= 0, got {L_e}")
    return math.pi * L_e * d_min * (0.5 + TAN_30 * (d_min - D2_max) / P)


def shear_strength(R_m: float) -> float:
    """Shear strength of thread material, 0.6 R_m, MPa (common practice).

    >>> shear_strength(800.0)
    480.0
    """
    if not R_m > 0:
        raise InputError(f"tensile strength must be positive, got {R_m}")
    return SHEAR_TO_TENSILE * R_m


def bolt_breaking_load(stress_area: float, R_m: float) -> float:
    """Ultimate tensile load of the bolt, F_B = A_s R_m, N (ISO 898-1).

    >>> bolt_breaking_load(58.0, 800.0)
    46400.0
    """
    return stress_area * R_m


@dataclass(frozen=True)
class StrippingResult:
    """Stripping strength of one engagement, N and mm."""

    engagement: float           # L_e, mm
    breaking_load: float        # A_s R_m of the bolt, N
    external_strip: float       # load that strips the bolt thread, N
    internal_strip: float       # load that strips the nut / tapped thread, N
    minimum_engagement: float   # L_e at which both threads hold the breaking load, mm
    governing: str              # "external" | "internal"
    limits: ThreadLimits

    @property
    def margin(self) -> float:
        """Weaker thread's stripping load / bolt breaking load (>= 1: the bolt breaks first)."""
        return min(self.external_strip, self.internal_strip) / self.breaking_load


def thread_stripping(d: float, P: float, system: str, stress_area: float, R_m_bolt: float,
                     R_m_internal: float, engagement: float) -> StrippingResult:
    """Stripping loads of both threads at the engagement, and the minimum engagement.

    F_ext = 0.6 R_m,bolt A_S,ext(L_e),  F_int = 0.6 R_m,int A_S,int(L_e),  F_B = A_s R_m,bolt;
    the areas are linear in L_e, so L_e,min = max(F_B / (0.6 R_m,bolt a_ext), F_B / (0.6 R_m,int a_int))
    with a the area per mm of engagement.

    Parameters
    ----------
    d, P : float
        Nominal diameter and pitch, mm.
    system : str
        "metric" (6g/6H) or "inch" (2A/2B).
    stress_area : float
        A_s of the bolt, mm^2.
    R_m_bolt, R_m_internal : float
        Tensile strength of the bolt and of the nut or tapped-part material, MPa.
    engagement : float
        Engaged length L_e, mm.

    Examples
    --------
    >>> r = thread_stripping(10.0, 1.5, "metric", 58.0, 800.0, 250.0, 20.0)  # M10 8.8 in aluminium
    >>> r.governing, round(r.minimum_engagement, 1)
    ('internal', 14.3)
    """
    lim = thread_limits(d, P, system)
    a_ext = external_shear_area(1.0, P, lim.D1_max, lim.d2_min)
    a_int = internal_shear_area(1.0, P, lim.d_min, lim.D2_max)
    tau_b = shear_strength(R_m_bolt)
    tau_n = shear_strength(R_m_internal)
    F_B = bolt_breaking_load(stress_area, R_m_bolt)
    L_ext = F_B / (tau_b * a_ext)
    L_int = F_B / (tau_n * a_int)
    return StrippingResult(
        engagement=engagement, breaking_load=F_B,
        external_strip=tau_b * a_ext * engagement, internal_strip=tau_n * a_int * engagement,
        minimum_engagement=max(L_ext, L_int), governing="external" if L_ext >= L_int else "internal",
        limits=lim,
    )


def engagement_of(spec: JointSpec) -> tuple[float | None, str]:
    """Engaged length and where it came from."""
    if spec.engagement is not None:
        return float(spec.engagement), "given"
    if spec.tapped:
        depth = spec.layers[-1].thickness
        if spec.fastener.length is not None:
            return min(depth, spec.fastener.length - spec.clamped_thickness), "bolt length into the tapped hole"
        return depth, "depth of the tapped hole"
    if spec.nut_height is not None:
        return float(spec.nut_height), "nut height"
    return None, ""


def stripping_check(spec: JointSpec) -> Check:
    """The `stripping` check: the bolt must break before the bolt or nut/tapped thread strips.

    value = weaker thread's stripping load / bolt breaking load, required 1.0 (or
    ``spec.required["stripping"]``).  The internal thread is the tapped layer's material
    (its ``tensile_strength``) in a tapped joint; in a through joint a nut of the matching
    property class, whose thread material is taken as strong as the bolt's (the design
    intent of ISO 898-2).  The note gives the minimum engagement.
    """
    f = spec.fastener
    required = spec.required.get("stripping", 1.0)
    L_e, origin = engagement_of(spec)
    if L_e is None:
        return Check("stripping", None, required, True, "not checked: no engagement length (nut height) known")
    if L_e <= 0:
        return Check("stripping", 0.0, required, False, f"no thread engaged ({origin})")
    if spec.tapped:
        layer = spec.layers[-1]
        R_int = layer.tensile_strength
        if R_int is None:
            return Check("stripping", None, required, True,
                         f"not checked: no tensile strength for tapped material {layer.material!r}")
        where = {"insert": f"the insert {layer.part or ''} ({layer.material})".replace("  ", " "),
                 "thread-forming": f"a thread formed by the screw in {layer.material} (the screw's own thread "
                                   f"form taken as ISO/UN; the part's shear strength 0.6 R_m)"}.get(
            spec.thread_method, f"tapped {layer.material}")
    else:
        R_int = f.tensile
        where = "nut of the matching class"
    r = thread_stripping(f.d, f.pitch, f.system, f.stress_area, f.tensile, R_int, L_e)
    ok = r.margin >= required
    note = (f"L_e = {L_e:.1f} mm ({origin}) in {where}; minimum {r.minimum_engagement:.1f} mm "
            f"({r.minimum_engagement / f.d:.2f} d, {r.governing} thread governs; {r.limits.tolerance})")
    return Check("stripping", r.margin, required, ok, note)


# --------------------------------------------------------------------------------------
# inserts
# --------------------------------------------------------------------------------------

def insert_pullout_force(outer_diameter: float, length: float, host_shear: float) -> float:
    """Load that pulls an insert out of its host by shearing the host over the insert's outer
    cylinder, N.

        F_po = pi D_o L tau_host

    The shear-out estimate of common practice for threaded and heat-set inserts (the host's
    material shears over the insert's outside; knurls, undercuts and a thread outside the
    insert are not counted).  The insert maker's published pull-out loads govern where known.

    Parameters
    ----------
    outer_diameter : float
        D_o, outer diameter of the insert (its host's bore), mm.
    length : float
        L, length of the insert in its host, mm.
    host_shear : float
        tau_host, shear strength of the host material, MPa (e.g. `shear_strength` of its R_m).

    Examples
    --------
    An M3 heat-set insert, D_o = 4.0 mm, L = 5.7 mm, in PLA with R_m = 50 MPa
    (tau = 0.6 R_m = 30 MPa): F = pi * 4.0 * 5.7 * 30 = 2149 N.

    >>> round(insert_pullout_force(4.0, 5.7, shear_strength(50.0)))
    2149
    """
    if outer_diameter <= 0 or length <= 0 or host_shear <= 0:
        raise InputError(f"insert outer diameter, length and host shear strength must be positive, "
                         f"got {outer_diameter}, {length}, {host_shear}")
    return math.pi * outer_diameter * length * host_shear


#: the note of every pull-out check: how it is computed and what governs (common practice)
INSERT_PULLOUT_METHOD = ("F_po = pi D_o L tau_host, tau_host = 0.6 R_m (common practice: shear of the host "
                         "over the insert's outer cylinder; the insert maker's pull-out data govern)")


def insert_pullout_check(spec: JointSpec, bolt_force: float) -> Check:
    """The `insert pull-out` check of a joint whose thread is an insert: the load that shears the
    host over the insert (:func:`insert_pullout_force`) against the largest bolt force in service,
    N / N, required 1.0 (or ``spec.required["insert_pullout"]``).

    >>> from types import SimpleNamespace
    >>> from geomjoint.mechanics.joint import InsertSpec
    >>> ins = InsertSpec("insert", "boss", "PLA", 50.0, 4.0, 5.7)
    >>> c = insert_pullout_check(SimpleNamespace(insert=ins, required={}), bolt_force=1000.0)
    >>> round(c.value, 2), c.ok       # 2149 N / 1000 N
    (2.15, True)
    """
    ins = spec.insert
    required = spec.required.get("insert_pullout", 1.0)
    if ins.host_tensile is None:
        return Check("insert pull-out", None, required, True,
                     f"not checked: no tensile strength for the host material {ins.host_material!r}")
    force = insert_pullout_force(ins.outer_diameter, ins.length, shear_strength(ins.host_tensile))
    note = (f"{ins.part} ({ins.outer_diameter:.2f} x {ins.length:.2f} mm) in {ins.host} ({ins.host_material}): "
            f"pull-out {force:.0f} N against the largest bolt force {bolt_force:.0f} N; {INSERT_PULLOUT_METHOD}")
    if bolt_force <= 0:
        return Check("insert pull-out", None, required, True, note)
    value = force / bolt_force
    return Check("insert pull-out", value, required, value >= required, note)
