"""The systematic calculation of VDI 2230 Part 1 (2015) for a single concentric bolted joint.

One function per formula of the guideline; :func:`vdi_chain` runs them in the order of the
calculation steps R0-R13 and returns every intermediate number in a :class:`VdiResult`;
:func:`vdi_checks` turns the result into the named checks of the engine.

Units: N, mm, MPa, N*mm, degC, 1/K.  Resilience (compliance) delta in mm/N.

Sources: VDI 2230 Part 1:2015-11, "Systematic calculation of highly stressed bolted
joints - Joints with one cylindrical bolt", Sections 5.1 (resilience model, substitute
deformation body), 5.3 (load factor), 5.4 (embedding, temperature), 5.5 (steps R0-R13).
Equation and table numbers are quoted from memory; where only the section is given the
number was not remembered with confidence.

Simplifications (stated so nobody is surprised):
- concentric clamping and loading (s_sym = a = 0), one load-introduction factor n for the
  whole joint, Phi_n = n * Phi_K;
- moduli do not change with temperature (E_T = E_20);
- the bolt is a plain standard bolt: shank of nominal diameter d, no waisted shank, A_0 = A_S.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

from geomjoint.errors import InputError
from geomjoint.mechanics.joint import TAPPED_MEMBER_DEFINITION, Check, JointSpec, StiffnessSplit, VdiSpec
from geomjoint.mechanics.members import hollow_frustum_compliance

# --------------------------------------------------------------------------------------
# constants of the guideline
# --------------------------------------------------------------------------------------

#: substitute length of the head for the head's resilience, l_SK = factor * d
#: (VDI 2230-1:2015 Section 5.1.1.1, Table 2, from memory): hexagon head 0.5 d,
#: hexagon socket head 0.4 d.  The guideline gives these two; a flange head is taken as the
#: hexagon head it is, the other heads with an internal drive (button, pan, cheese,
#: countersunk) as the socket head (common practice)
HEAD_LENGTH_FACTOR = {"hex": 0.5, "heavy hex": 0.5, "flange": 0.5, "socket": 0.4, "button": 0.4,
                      "pan": 0.4, "pan slotted": 0.4, "cheese": 0.4, "countersunk": 0.4}

#: substitute length of the engaged thread, l_G = 0.5 d (VDI 2230-1:2015 Section 5.1.1.1, from memory)
ENGAGED_THREAD_FACTOR = 0.5

#: substitute length of the nut / tapped-thread region, l_M = factor * d
#: (VDI 2230-1:2015 Section 5.1.1.1, from memory): nut 0.4 d (through bolt joint, DSV),
#: tapped thread 0.33 d (tapped thread joint, ESV), the latter with the modulus of the tapped part
NUT_LENGTH_FACTOR = 0.4
TAPPED_LENGTH_FACTOR = 0.33

#: coefficients of tan(phi) of the substitute deformation cone (VDI 2230-1:2015 Section 5.1.2.2,
#: from memory):  DSV  tan phi_D = 0.362 + 0.032 ln(beta_L / 2) + 0.153 ln y
#:                ESV  tan phi_E = 0.348 + 0.013 ln(beta_L)     + 0.193 ln y
CONE_TAN_THROUGH = (0.362, 0.032, 0.153)
CONE_TAN_TAPPED = (0.348, 0.013, 0.193)

#: w of D_A,Gr = d_W + w l_K tan phi: 1 for a through-bolt joint (two cones), 2 for a
#: tapped thread joint (one cone) (VDI 2230-1:2015 Section 5.1.2.2, from memory)
CONE_W_THROUGH = 1.0
CONE_W_TAPPED = 2.0

#: guide values of the amount of embedding f_Z, micrometres, per thread, per head or nut
#: bearing face and per inner interface, by mean roughness class R_z and kind of load
#: (VDI 2230-1:2015 Section 5.4.2.1, Table 5, from memory).
#: roughness: "fine" R_z < 10 um, "medium" 10 <= R_z < 40 um, "coarse" 40 <= R_z < 160 um
EMBEDDING_UM = {
    # roughness: {load kind: (thread, per head/nut bearing face, per inner interface)}
    "fine": {"tension": (3.0, 2.5, 1.5), "shear": (3.0, 3.0, 2.0)},
    "medium": {"tension": (3.0, 3.0, 2.0), "shear": (3.0, 4.5, 2.5)},
    "coarse": {"tension": (3.0, 4.0, 3.0), "shear": (3.0, 6.5, 3.5)},
}
ROUGHNESS_CLASSES = tuple(EMBEDDING_UM)
#: the mean roughness depth R_z of each class, um: [lower, upper) (the bands of Table 5, as above)
RZ_BANDS_UM = {"fine": (0.0, 10.0), "medium": (10.0, 40.0), "coarse": (40.0, 160.0)}
#: the names a job file gives the bands (they say what they are) -> roughness class
ROUGHNESS_BANDS = {"Rz<10": "fine", "Rz10-40": "medium", "Rz40-160": "coarse"}


def roughness_class(rz_um: float) -> str:
    """The embedding-table class of a mean roughness depth R_z, um (the bands of RZ_BANDS_UM).

    >>> roughness_class(6.3), roughness_class(16), roughness_class(63)
    ('fine', 'medium', 'coarse')
    """
    for name, (lo, hi) in RZ_BANDS_UM.items():
        if lo <= rz_um < hi:
            return name
    top = max(hi for _, hi in RZ_BANDS_UM.values())
    raise InputError(f"R_z {rz_um:g} um is outside the embedding table of VDI 2230-1 (0 to {top:g} um)")

#: factor of the head-friction term 1.155 mu_G: the thread's flank friction for a 60 deg
#: thread, mu_G' = mu_G / cos 30deg (VDI 2230-1:2015 Section 5.4.3, from memory)
FLANK_FRICTION_FACTOR = 1.155

#: coefficients of the tightening-torque formula M_A = F_M (0.16 P + 0.58 d2 mu_G + D_Km/2 mu_K)
#: (VDI 2230-1:2015 Section 5.4.3, eq. (R13) / (196) family, from memory); 0.16 = 1/(2 pi),
#: 0.58 = 1.155/2 for ISO metric 60 deg threads
TORQUE_PITCH_COEFF = 0.16
TORQUE_THREAD_COEFF = 0.58

#: torsion reduction factor of the working stress, k_t = 0.5 (VDI 2230-1:2015 R8, from memory)
TORSION_REDUCTION = 0.5

#: utilisation of the minimum yield point at assembly, nu = 0.9 (VDI 2230-1:2015 R7, from memory)
DEFAULT_UTILISATION = 0.9

#: fatigue strength of threads rolled before heat treatment,
#: sigma_ASV = 0.85 (150/d + 45) MPa with d in mm (VDI 2230-1:2015 R9, from memory)
ASV_FACTOR = 0.85
ASV_SIZE_TERM = 150.0
ASV_CONSTANT = 45.0

#: recommended minimum safety margins (VDI 2230-1:2015 R8-R12, from memory):
#: S_F >= 1.0 yield, S_D >= 1.2 fatigue, S_P >= 1.0 surface pressure, S_G >= 1.2 slip (static
#: transverse load; 1.8 for alternating transverse load)
REQUIRED_MARGIN = {
    "assembly_preload": 1.0,
    "working_stress": 1.0,
    "fatigue": 1.2,
    "bearing_pressure": 1.0,
    "slip": 1.2,
}

#: friction coefficients accepted on input: VDI 2230-1 Table A5 spans about 0.04-0.5 (from
#: memory); a value outside 0.02-0.6 is a typo, not a surface (our bound)
FRICTION_RANGE = (0.02, 0.6)


# --------------------------------------------------------------------------------------
# input checks
# --------------------------------------------------------------------------------------

def check_friction(mu: float, key: str = "friction") -> float:
    """A friction coefficient inside 0.02-0.6, else InputError naming ``key``.

    >>> check_friction(0.12)
    0.12
    """
    lo, hi = FRICTION_RANGE
    if not (isinstance(mu, (int, float)) and math.isfinite(mu) and lo <= mu <= hi):
        raise InputError(f"friction coefficient {mu!r} outside {lo}-{hi}", where=key)
    return float(mu)


def check_scatter(alpha_A: float, key: str = "scatter") -> float:
    """A tightening factor alpha_A >= 1, else InputError naming ``key``.

    >>> check_scatter(1.6)
    1.6
    """
    if not (isinstance(alpha_A, (int, float)) and math.isfinite(alpha_A) and alpha_A >= 1.0):
        raise InputError(f"tightening factor (scatter) must be >= 1, got {alpha_A!r}", where=key)
    return float(alpha_A)


def check_roughness(roughness: str, key: str = "roughness") -> str:
    """A roughness class "fine" | "medium" | "coarse", else InputError naming ``key``.

    >>> check_roughness("Medium")
    'medium'
    """
    name = str(roughness).strip().lower()
    if name not in EMBEDDING_UM:
        raise InputError(f"unknown roughness class {roughness!r} (fine, medium or coarse)", where=key)
    return name


def _positive(value: float, what: str) -> float:
    if not (math.isfinite(value) and value > 0):
        raise InputError(f"{what} must be positive, got {value!r}")
    return float(value)


# --------------------------------------------------------------------------------------
# R0/5.1.1: bolt resilience
# --------------------------------------------------------------------------------------

def cylinder_resilience(length: float, diameter: float, E: float) -> float:
    """Elastic resilience of a solid cylindrical section, delta = l / (E A), mm/N.

    delta_i = l_i / (E_S A_i), A_i = pi d_i^2 / 4 (VDI 2230-1:2015 Section 5.1.1.1, from memory).

    Parameters
    ----------
    length : float
        Section length l_i, mm (>= 0).
    diameter : float
        Section diameter d_i, mm.
    E : float
        Young's modulus, MPa.

    Examples
    --------
    >>> round(cylinder_resilience(10.0, 10.0, 205000.0) * 1e6, 4)   # 10 mm of an M10 shank
    0.6211
    """
    if length < 0:
        raise InputError(f"section length must be >= 0, got {length!r}")
    _positive(diameter, "section diameter")
    _positive(E, "modulus")
    return 4.0 * length / (E * math.pi * diameter**2)


def head_resilience(d: float, E: float, head: str = "hex") -> float:
    """Resilience of the bolt head, delta_SK = l_SK / (E_S A_N), mm/N.

    l_SK = 0.5 d for a hexagon head, 0.4 d for a hexagon socket head; A_N = pi d^2 / 4
    (VDI 2230-1:2015 Section 5.1.1.1, from memory).

    Examples
    --------
    >>> round(head_resilience(10.0, 205000.0) * 1e6, 4)
    0.3105
    """
    try:
        factor = HEAD_LENGTH_FACTOR[head]
    except KeyError:
        raise InputError(f"unknown head kind {head!r} (one of {', '.join(HEAD_LENGTH_FACTOR)})", where="head") from None
    return cylinder_resilience(factor * d, d, E)


def engaged_thread_resilience(d: float, d3: float, E: float) -> float:
    """Resilience of the engaged thread, delta_G = l_G / (E_S A_d3), l_G = 0.5 d, mm/N.

    (VDI 2230-1:2015 Section 5.1.1.1, from memory.)

    Examples
    --------
    >>> round(engaged_thread_resilience(10.0, 8.160, 205000.0) * 1e6, 4)
    0.4664
    """
    return cylinder_resilience(ENGAGED_THREAD_FACTOR * d, d3, E)


def nut_resilience(d: float, E_nut: float, tapped: bool = False) -> float:
    """Resilience of the nut or of the tapped-thread region, delta_M = l_M / (E_M A_N), mm/N.

    l_M = 0.4 d for a nut (E_M = modulus of the nut), l_M = 0.33 d for a tapped thread
    joint (E_M = E_BI, modulus of the part with the internal thread)
    (VDI 2230-1:2015 Section 5.1.1.1, from memory).

    Examples
    --------
    >>> round(nut_resilience(10.0, 205000.0) * 1e6, 4)
    0.2484
    >>> round(nut_resilience(10.0, 70000.0, tapped=True) * 1e6, 4)   # into aluminium
    0.6002
    """
    factor = TAPPED_LENGTH_FACTOR if tapped else NUT_LENGTH_FACTOR
    return cylinder_resilience(factor * d, d, E_nut)


@dataclass(frozen=True)
class BoltResilience:
    """The series springs of the bolt, mm/N (VDI 2230-1:2015 Section 5.1.1.1)."""

    head: float          # delta_SK
    shank: float         # delta_1 (unthreaded shank inside the clamp length)
    free_thread: float   # delta_Gew (loaded thread inside the clamp length, on A_d3)
    engaged: float       # delta_G
    nut: float           # delta_M

    @property
    def total(self) -> float:
        """delta_S = delta_SK + sum delta_i + delta_Gew + delta_G + delta_M."""
        return self.head + self.shank + self.free_thread + self.engaged + self.nut


def bolt_resilience(d: float, d3: float, E: float, shank_length: float, free_thread_length: float,
                    head: str = "hex", E_nut: float | None = None, tapped: bool = False) -> BoltResilience:
    """Bolt resilience delta_S as the sum of its sections, mm/N.

        delta_S = delta_SK + delta_1 + delta_Gew + delta_G + delta_M
                = l_SK/(E_S A_N) + l_1/(E_S A_N) + l_Gew/(E_S A_d3) + l_G/(E_S A_d3) + l_M/(E_M A_N)

    (VDI 2230-1:2015 Section 5.1.1.1, eqs. (8)-(16) family, from memory.)

    Parameters
    ----------
    d, d3 : float
        Nominal and minor diameter of the bolt thread, mm.
    E : float
        Young's modulus of the bolt, MPa.
    shank_length : float
        Unthreaded shank inside the clamp length l_K, mm.
    free_thread_length : float
        Loaded, not engaged thread inside l_K, mm (l_K = shank + free thread).
    head : str
        "hex" or "socket".
    E_nut : float, optional
        Modulus of the nut (through joint) or of the tapped part; default the bolt's.
    tapped : bool
        Tapped thread joint (l_M = 0.33 d).

    Examples
    --------
    >>> r = bolt_resilience(10.0, 8.160, 205000.0, 20.0, 10.0)   # M10, l_K = 30 mm
    >>> round(r.total * 1e6, 3)
    3.2
    """
    E_M = E if E_nut is None else E_nut
    return BoltResilience(
        head=head_resilience(d, E, head),
        shank=cylinder_resilience(shank_length, d, E),
        free_thread=cylinder_resilience(free_thread_length, d3, E),
        engaged=engaged_thread_resilience(d, d3, E),
        nut=nut_resilience(d, E_M, tapped),
    )


# --------------------------------------------------------------------------------------
# 5.1.2: member resilience by the substitute deformation body
# --------------------------------------------------------------------------------------

def cone_tangent_through(beta_L: float, y: float) -> float:
    """tan phi_D of the deformation cone of a through-bolt joint (DSV).

        tan phi_D = 0.362 + 0.032 ln(beta_L / 2) + 0.153 ln y,  beta_L = l_K / d_W,  y = D_A' / d_W

    (VDI 2230-1:2015 Section 5.1.2.2, eq. (27) family, from memory.)

    Examples
    --------
    >>> round(cone_tangent_through(2.0, 3.0), 4)
    0.5301
    """
    _positive(beta_L, "beta_L")
    _positive(y, "y")
    a, b, c = CONE_TAN_THROUGH
    return a + b * math.log(beta_L / 2.0) + c * math.log(y)


def cone_tangent_tapped(beta_L: float, y: float) -> float:
    """tan phi_E of the deformation cone of a tapped thread joint (ESV).

        tan phi_E = 0.348 + 0.013 ln(beta_L) + 0.193 ln y

    (VDI 2230-1:2015 Section 5.1.2.2, eq. (28) family, from memory.)

    Examples
    --------
    >>> round(cone_tangent_tapped(2.0, 3.0), 4)
    0.569
    """
    _positive(beta_L, "beta_L")
    _positive(y, "y")
    a, b, c = CONE_TAN_TAPPED
    return a + b * math.log(beta_L) + c * math.log(y)


def limiting_diameter(d_W: float, l_K: float, tan_phi: float, w: float) -> float:
    """Limiting outside diameter of the deformation cone, D_A,Gr = d_W + w l_K tan phi, mm.

    w = 1 through-bolt joint, w = 2 tapped thread joint (VDI 2230-1:2015 Section 5.1.2.2,
    from memory).  A part at least this wide holds the whole cone.

    >>> limiting_diameter(16.0, 30.0, 0.5, 1.0)
    31.0
    """
    return d_W + w * l_K * tan_phi


def member_resilience_cone(d_W: float, d_h: float, l_K: float, E: float, tan_phi: float,
                           w: float) -> float:
    """Member resilience when the parts hold the whole deformation cone(s), D_A >= D_A,Gr, mm/N.

        delta_P = 2 ln[ (d_W + d_h)(d_W + w l_K tan phi - d_h) / ((d_W - d_h)(d_W + w l_K tan phi + d_h)) ]
                  / (w E_P pi d_h tan phi)

    (VDI 2230-1:2015 Section 5.1.2.2, eq. (35) family, from memory.)  For w = 1 this is two
    cones of height l_K/2 meeting at mid-grip, for w = 2 one cone of height l_K.

    Examples
    --------
    >>> round(member_resilience_cone(16.0, 11.0, 30.0, 205000.0, 0.55, 1.0) * 1e6, 4)
    0.5039
    """
    _positive(tan_phi, "tan phi")
    if not d_W > d_h > 0:
        raise InputError(f"bearing diameter {d_W} must exceed hole diameter {d_h}")
    D = d_W + w * l_K * tan_phi
    log = math.log((d_W + d_h) * (D - d_h) / ((d_W - d_h) * (D + d_h)))
    return 2.0 * log / (w * E * math.pi * d_h * tan_phi)


def member_resilience_cone_sleeve(d_W: float, d_h: float, D_A: float, l_K: float, E: float,
                                  tan_phi: float, w: float) -> float:
    """Member resilience of cone(s) plus sleeve, d_W < D_A < D_A,Gr, mm/N.

        delta_P = [ 2/(w d_h tan phi) ln((d_W + d_h)(D_A - d_h) / ((d_W - d_h)(D_A + d_h)))
                    + 4/(D_A^2 - d_h^2) (l_K - (D_A - d_W)/(w tan phi)) ] / (E_P pi)

    (VDI 2230-1:2015 Section 5.1.2.2, eq. (36) family, from memory.)

    Examples
    --------
    >>> round(member_resilience_cone_sleeve(16.0, 11.0, 24.0, 30.0, 205000.0, 0.55, 1.0) * 1e6, 4)
    0.5682
    """
    _positive(tan_phi, "tan phi")
    if not D_A > d_W > d_h > 0:
        raise InputError(f"need D_A {D_A} > d_W {d_W} > d_h {d_h}")
    cone = 2.0 / (w * d_h * tan_phi) * math.log((d_W + d_h) * (D_A - d_h) / ((d_W - d_h) * (D_A + d_h)))
    sleeve = 4.0 / (D_A**2 - d_h**2) * (l_K - (D_A - d_W) / (w * tan_phi))
    return (cone + sleeve) / (E * math.pi)


def member_resilience_sleeve(d_h: float, D_A: float, l_K: float, E: float) -> float:
    """Member resilience of a plain sleeve, D_A <= d_W: delta_P = 4 l_K / (E pi (D_A^2 - d_h^2)), mm/N.

    (VDI 2230-1:2015 Section 5.1.2.2, from memory.)

    >>> round(member_resilience_sleeve(11.0, 16.0, 30.0, 205000.0) * 1e6, 4)
    1.3802
    """
    if not D_A > d_h > 0:
        raise InputError(f"outside diameter {D_A} must exceed hole diameter {d_h}")
    return 4.0 * l_K / (E * math.pi * (D_A**2 - d_h**2))


def member_resilience(d_W: float, d_h: float, l_K: float, E: float, tan_phi: float, w: float,
                      D_A: float | None = None) -> tuple[float, str]:
    """Member resilience of one uniform material by the case of VDI 2230-1:2015 Section 5.1.2.2.

    Returns (delta_P in mm/N, case) with case "cone" (D_A >= D_A,Gr or D_A unknown),
    "cone+sleeve" (d_W < D_A < D_A,Gr) or "sleeve" (D_A <= d_W).

    >>> round(member_resilience(16.0, 11.0, 30.0, 205000.0, 0.55, 1.0, 40.0)[0] * 1e6, 4)
    0.5039
    """
    if D_A is not None and D_A <= d_W:
        return member_resilience_sleeve(d_h, D_A, l_K, E), "sleeve"
    if D_A is None or D_A >= limiting_diameter(d_W, l_K, tan_phi, w):
        return member_resilience_cone(d_W, d_h, l_K, E, tan_phi, w), "cone"
    return member_resilience_cone_sleeve(d_W, d_h, D_A, l_K, E, tan_phi, w), "cone+sleeve"


def _segment_resilience(z0: float, z1: float, D0: float, slope: float, d_h: float, E: float) -> float:
    """Exact integral of 4 dz / (E pi (D(z)^2 - d_h^2)) with D = D0 + slope (z - z0), mm/N."""
    if z1 <= z0:
        return 0.0
    # in radii: r = D0/2 + (slope/2)(z - z0), and 4 / (pi (D^2 - d_h^2)) = 1 / (pi (r^2 - r_h^2))
    return hollow_frustum_compliance(E, D0 / 2.0, slope / 2.0, d_h / 2.0, 0.0, z1 - z0)


def member_resilience_layers(layers: list[tuple[float, float]], d_W: float, d_h: float,
                             tan_phi: float, tapped: bool, D_A: float | None = None,
                             d_W_far: float | None = None) -> float:
    """Member resilience of a stack of layers (thickness, E) in the substitute body, mm/N.

    The outer diameter of the substitute body at depth z below the head is
    D(z) = min(d_W + 2 z tan phi, d_W,far + 2 (l_K - z) tan phi, D_A) for a through-bolt
    joint, and min(d_W + 2 z tan phi, D_A) for a tapped thread joint (the single cone
    of w = 2); each layer adds the exact integral of dz / (E_i A(z)) over its depth.  For one
    material this equals the closed forms of :func:`member_resilience` (VDI 2230-1:2015
    Section 5.1.2.2; the layer-by-layer sum follows its rule for parts of different moduli).

    Parameters
    ----------
    layers : list of (thickness, E)
        Clamped layers from the head side, mm and MPa (the tapped part excluded).
    d_W, d_W_far : float
        Bearing diameter under the head and under the nut (default d_W), mm.
    d_h : float
        Hole diameter, mm.
    tan_phi : float
        tan of the cone angle.
    tapped : bool
        Tapped thread joint (one cone from the head).
    D_A : float, optional
        Outside diameter bounding the parts, mm; None for unbounded.

    Examples
    --------
    >>> round(member_resilience_layers([(15.0, 205000.0), (15.0, 205000.0)], 16.0, 11.0, 0.55,
    ...                                False, 40.0) * 1e6, 4)
    0.5039
    """
    _positive(tan_phi, "tan phi")
    if not d_W > d_h:
        raise InputError(f"bearing diameter {d_W} must exceed hole diameter {d_h}")
    far = d_W if d_W_far is None else d_W_far
    l_K = sum(t for t, _ in layers)
    cap = math.inf if D_A is None else D_A
    if cap <= d_h:
        raise InputError(f"outside diameter {D_A} must exceed hole diameter {d_h}")
    s = 2.0 * tan_phi
    # breakpoints where the body's outline changes slope
    points = {0.0, l_K}
    if tapped:
        z_peak = math.inf
    else:
        z_peak = 0.5 * (l_K + (far - d_W) / s)   # where the two cones meet
        if 0.0 < z_peak < l_K:
            points.add(z_peak)
    if math.isfinite(cap):
        for z in ((cap - d_W) / s, l_K - (cap - far) / s):
            if 0.0 < z < l_K:
                points.add(z)
    z_edges = [0.0]
    for t, _ in layers:
        z_edges.append(z_edges[-1] + t)
        points.add(z_edges[-1])
    points = sorted(points)

    def outline(z: float) -> tuple[float, float]:
        """Diameter and slope of the body outline at z (slope from the right)."""
        head_side = d_W + s * z
        nut_side = math.inf if tapped else far + s * (l_K - z)
        if cap <= min(head_side, nut_side):
            return cap, 0.0
        if head_side <= nut_side:
            return head_side, s
        return nut_side, -s

    total = 0.0
    for z0, z1 in zip(points[:-1], points[1:]):
        mid = 0.5 * (z0 + z1)
        layer = next(i for i in range(len(layers)) if z_edges[i] <= mid <= z_edges[i + 1])
        D_mid, slope = outline(mid)
        D0 = D_mid - slope * (mid - z0)
        total += _segment_resilience(z0, z1, D0, slope, d_h, layers[layer][1])
    return total


def member_stiffness_from_resilience(delta_P: float) -> float:
    """Member stiffness k_P = 1 / delta_P, N/mm.

    >>> member_stiffness_from_resilience(2e-6)
    500000.0
    """
    return 1.0 / _positive(delta_P, "member resilience")


# --------------------------------------------------------------------------------------
# 5.3: load factor
# --------------------------------------------------------------------------------------

def load_factor(delta_S: float, delta_P: float, n: float = 1.0) -> float:
    """Load factor Phi_n = n Phi_K = n delta_P / (delta_S + delta_P) (concentric case).

    (VDI 2230-1:2015 Section 5.3.1, eqs. (44)/(45) family, from memory.)  n = 1 means the
    load is introduced under the head and the nut; n = 0.5 is a common default.

    >>> round(load_factor(3e-6, 1e-6, 0.5), 4)
    0.125
    """
    _positive(delta_S, "bolt resilience")
    _positive(delta_P, "member resilience")
    if not 0.0 < n <= 1.0:
        raise InputError(f"load introduction factor n must be in (0, 1], got {n!r}",
                         where="load_introduction")
    return n * delta_P / (delta_S + delta_P)


# --------------------------------------------------------------------------------------
# 5.4: embedding and temperature
# --------------------------------------------------------------------------------------

def embedding_amount(roughness: str, load_kind: str, threads: int, bearing_faces: int,
                     inner_interfaces: int) -> float:
    """Amount of embedding f_Z of the whole joint, mm, from the guide values of Table 5.

        f_Z = threads * f_thread + bearing_faces * f_bearing + inner_interfaces * f_inner

    (VDI 2230-1:2015 Section 5.4.2.1, Table 5, from memory; values per interface in um.)

    Parameters
    ----------
    roughness : str
        "fine" (R_z < 10 um), "medium" (10-40 um), "coarse" (40-160 um).
    load_kind : str
        "tension" (axial tension/compression) or "shear" (transverse load).
    threads, bearing_faces, inner_interfaces : int
        Numbers of thread pairs, head/nut bearing faces and interfaces between clamped parts.

    Examples
    --------
    >>> round(embedding_amount("medium", "tension", 1, 2, 1), 4)   # 3 + 2*3 + 2 um
    0.011
    """
    rough = check_roughness(roughness)
    if load_kind not in EMBEDDING_UM[rough]:
        raise InputError(f"unknown load kind {load_kind!r} (tension or shear)")
    if min(threads, bearing_faces, inner_interfaces) < 0:
        raise InputError("numbers of interfaces must be >= 0")
    f_thread, f_bearing, f_inner = EMBEDDING_UM[rough][load_kind]
    return (threads * f_thread + bearing_faces * f_bearing + inner_interfaces * f_inner) * 1e-3


def embedding_loss(f_Z: float, delta_S: float, delta_P: float) -> float:
    """Loss of preload by embedding, F_Z = f_Z / (delta_S + delta_P), N.

    (VDI 2230-1:2015 Section 5.4.2.1, eq. (105) family, from memory.)

    >>> embedding_loss(0.011, 3e-6, 1e-6)
    2750.0
    """
    return f_Z / (delta_S + delta_P)


def thermal_preload_change(expansion_bolt: float, expansion_members: float, delta_S: float,
                           delta_P: float) -> float:
    """Change of preload from differential thermal expansion, Delta F_Vth, N (positive = loss).

        Delta F_Vth = (alpha_S dT l_K - sum alpha_Pi dT l_i) / (delta_S + delta_P)

    with the moduli taken equal at both temperatures (VDI 2230-1:2015 Section 5.4.2.3,
    eq. (120) family with E_T = E_20, from memory).  A bolt that grows more than the parts
    (aluminium parts cooled, steel parts with a steel bolt never) loses preload.

    Parameters
    ----------
    expansion_bolt : float
        Free thermal elongation of the bolt over the clamp length, alpha_S dT l_K, mm.
    expansion_members : float
        Free thermal elongation of the clamped parts, sum alpha_Pi dT l_i, mm.
    delta_S, delta_P : float
        Resiliences, mm/N.

    Examples
    --------
    >>> dT = 80.0; l_K = 30.0   # steel bolt in aluminium, heated 80 K
    >>> round(thermal_preload_change(11.5e-6 * dT * l_K, 23e-6 * dT * l_K, 3e-6, 1e-6))
    -6900
    """
    return (expansion_bolt - expansion_members) / (delta_S + delta_P)


# --------------------------------------------------------------------------------------
# R2-R4: clamp load, required assembly preload
# --------------------------------------------------------------------------------------

def clamp_load_for_slip(shear: float, interfaces: int, mu_T: float) -> float:
    """Clamp load needed to carry a transverse load by friction, F_KQ = F_Q / (q_F mu_T), N.

    (VDI 2230-1:2015 R2, eq. (R2/1) family, from memory; no torsion about the bolt axis.)

    >>> clamp_load_for_slip(3000.0, 1, 0.15)
    20000.0
    """
    if interfaces < 1:
        raise InputError(f"number of force-transmitting interfaces must be >= 1, got {interfaces!r}",
                         where="interfaces_shear")
    check_friction(mu_T, "friction.interface")
    return abs(shear) / (interfaces * mu_T)


def required_preload_min(F_K_req: float, Phi_n: float, F_A_max: float, F_Z: float,
                         dF_Vth: float) -> float:
    """Minimum assembly preload, F_M,min = F_K,req + (1 - Phi_n) F_A,max + F_Z + Delta F_Vth, N.

    Delta F_Vth enters only as a loss (a gain in preload does not relieve the requirement).
    (VDI 2230-1:2015 R4, eq. (R4/1), from memory.)

    >>> required_preload_min(10000.0, 0.1, 5000.0, 2000.0, 0.0)
    16500.0
    """
    return F_K_req + (1.0 - Phi_n) * max(F_A_max, 0.0) + F_Z + max(dF_Vth, 0.0)


def required_preload_max(F_M_min: float, alpha_A: float) -> float:
    """Maximum assembly preload F_M,max = alpha_A F_M,min, N (VDI 2230-1:2015 R5, from memory).

    >>> required_preload_max(16500.0, 1.6)
    26400.0
    """
    return check_scatter(alpha_A) * F_M_min


# --------------------------------------------------------------------------------------
# R7: permissible assembly preload and tightening torque
# --------------------------------------------------------------------------------------

def stress_diameter(d2: float, d3: float) -> float:
    """Diameter of the stress cross section, d_S = (d2 + d3)/2, mm (ISO 898-1; VDI 2230-1 R7).

    >>> stress_diameter(9.026, 8.160)
    8.593
    """
    return 0.5 * (d2 + d3)


def permissible_assembly_preload(A0: float, R_p02: float, d2: float, d0: float, P: float,
                                 mu_G: float, nu: float = DEFAULT_UTILISATION) -> float:
    """Permissible assembly preload at utilisation nu of the minimum yield point, F_M,zul, N.

        F_M,zul = A_0 nu R_p0.2min / sqrt(1 + 3 [3/2 d2/d0 (P/(pi d2) + 1.155 mu_G,min)]^2)

    the von Mises stress of tension plus thread torsion during tightening set equal to
    nu R_p0.2min (VDI 2230-1:2015 R7, eq. (R7/2) and Section 5.5.1, from memory; the source
    of Table A1).  For a standard bolt A_0 = A_S and d_0 = d_S = (d2 + d3)/2.

    Parameters
    ----------
    A0 : float
        Cross section, mm^2 (A_S).
    R_p02 : float
        Minimum yield point R_p0.2min (R_eL), MPa.
    d2, d0 : float
        Pitch diameter and diameter of A_0, mm.
    P : float
        Pitch, mm.
    mu_G : float
        Minimum thread friction coefficient.
    nu : float
        Utilisation of the yield point, default 0.9.

    Examples
    --------
    >>> round(permissible_assembly_preload(58.0, 640.0, 9.026, 8.593, 1.5, 0.12))   # M10 8.8
    29609
    """
    check_friction(mu_G, "friction.thread")
    if not 0.0 < nu <= 1.0:
        raise InputError(f"utilisation nu must be in (0, 1], got {nu!r}", where="utilisation")
    term = 1.5 * d2 / d0 * (P / (math.pi * d2) + FLANK_FRICTION_FACTOR * mu_G)
    return A0 * nu * R_p02 / math.sqrt(1.0 + 3.0 * term**2)


def thread_torque(F: float, d2: float, P: float, mu_G: float) -> float:
    """Thread torque M_G = F d2/2 (P/(pi d2) + 1.155 mu_G), N*mm (VDI 2230-1:2015 R8, from memory).

    >>> round(thread_torque(29609.0, 9.026, 1.5, 0.12))
    25589
    """
    return F * d2 / 2.0 * (P / (math.pi * d2) + FLANK_FRICTION_FACTOR * mu_G)


def bearing_friction_diameter(d_W: float, d_h: float) -> float:
    """Effective diameter of the head friction, D_Km = (d_W + d_h)/2, mm (VDI 2230-1:2015 R13).

    >>> round(bearing_friction_diameter(14.63, 11.0), 3)
    12.815
    """
    return 0.5 * (d_W + d_h)


def tightening_torque(F_M: float, P: float, d2: float, mu_G: float, D_Km: float, mu_K: float) -> float:
    """Tightening torque M_A = F_M (0.16 P + 0.58 d2 mu_G + D_Km/2 mu_K), N*mm.

    (VDI 2230-1:2015 R13, eq. (R13/1), from memory.)

    Examples
    --------
    >>> round(tightening_torque(29609.0, 1.5, 9.026, 0.12, 12.815, 0.12) / 1000, 1)   # M10 8.8
    48.5
    """
    check_friction(mu_G, "friction.thread")
    check_friction(mu_K, "friction.head")
    return F_M * (TORQUE_PITCH_COEFF * P + TORQUE_THREAD_COEFF * d2 * mu_G + D_Km / 2.0 * mu_K)


# --------------------------------------------------------------------------------------
# R8: working stress
# --------------------------------------------------------------------------------------

def working_stress(F_S_max: float, A0: float, M_G: float, d0: float, k_t: float = TORSION_REDUCTION) -> float:
    """Reduced (von Mises) stress in service, sigma_red,B = sqrt(sigma_z^2 + 3 (k_t tau)^2), MPa.

    sigma_z = F_S,max / A_0, tau = M_G / W_p, W_p = pi d_0^3 / 16 (VDI 2230-1:2015 R8,
    eqs. (R8/1)-(R8/4), from memory).

    >>> round(working_stress(35000.0, 58.0, 25589.0, 8.593), 1)
    629.1
    """
    sigma_z = F_S_max / A0
    tau = M_G / (math.pi * d0**3 / 16.0)
    return math.sqrt(sigma_z**2 + 3.0 * (k_t * tau) ** 2)


# --------------------------------------------------------------------------------------
# R9: fatigue
# --------------------------------------------------------------------------------------

def alternating_stress(Phi_n: float, F_A_max: float, F_A_min: float, A_S: float) -> float:
    """Stress amplitude of the bolt, sigma_a = Phi_n (F_A,max - F_A,min) / (2 A_S), MPa.

    (VDI 2230-1:2015 R9, concentric case, from memory.)

    >>> alternating_stress(0.1, 10000.0, 0.0, 58.0) > 8.6
    True
    """
    return Phi_n * abs(F_A_max - F_A_min) / (2.0 * A_S)


def fatigue_strength_rolled_before(d: float) -> float:
    """Endurance limit (amplitude) of threads rolled before heat treatment, MPa.

        sigma_ASV = 0.85 (150/d + 45)      (d in mm)

    (VDI 2230-1:2015 R9, eq. (R9/2), from memory; for 2e6 cycles and 99 % survival.)

    >>> round(fatigue_strength_rolled_before(10.0), 2)
    51.0
    """
    _positive(d, "nominal diameter")
    return ASV_FACTOR * (ASV_SIZE_TERM / d + ASV_CONSTANT)


def fatigue_strength_rolled_after(d: float, F_Sm: float, F_02min: float) -> float:
    """Endurance limit of threads rolled after heat treatment, sigma_ASG = (2 - F_Sm/F_0.2min) sigma_ASV, MPa.

    (VDI 2230-1:2015 R9, eq. (R9/3), from memory; F_Sm the mean bolt load, F_0.2min = A_S R_p0.2min.)

    >>> round(fatigue_strength_rolled_after(10.0, 0.7 * 37120.0, 37120.0), 2)
    66.3
    """
    _positive(F_02min, "F_0.2min")
    return (2.0 - F_Sm / F_02min) * fatigue_strength_rolled_before(d)


# --------------------------------------------------------------------------------------
# R10: surface pressure
# --------------------------------------------------------------------------------------

def bearing_area(d_W: float, d_h: float) -> float:
    """Bearing area under head or nut, A_p = pi/4 (d_W^2 - d_h^2), mm^2 (VDI 2230-1:2015 R10).

    >>> round(bearing_area(14.63, 11.0), 2)
    73.07
    """
    if not d_W > d_h > 0:
        raise InputError(f"bearing diameter {d_W} must exceed hole diameter {d_h}")
    return math.pi / 4.0 * (d_W**2 - d_h**2)


def surface_pressure(F: float, d_W: float, d_h: float) -> float:
    """Surface pressure p = F / A_p, MPa (VDI 2230-1:2015 R10, eqs. (R10/1)-(R10/3), from memory).

    >>> round(surface_pressure(29609.0, 14.63, 11.0))
    405
    """
    return F / bearing_area(d_W, d_h)


# --------------------------------------------------------------------------------------
# R12: residual clamp load and slip
# --------------------------------------------------------------------------------------

def residual_clamp_load(F_M_zul: float, alpha_A: float, Phi_n: float, F_A_max: float, F_Z: float,
                        dF_Vth: float) -> float:
    """Minimum residual clamp load F_KR,min = F_M,zul/alpha_A - (1 - Phi_n) F_A,max - F_Z - Delta F_Vth, N.

    (VDI 2230-1:2015 R12, eq. (R12/1), from memory; Delta F_Vth counted as a loss only.)

    >>> residual_clamp_load(30000.0, 1.6, 0.1, 5000.0, 2000.0, 0.0)
    12250.0
    """
    return F_M_zul / check_scatter(alpha_A) - (1.0 - Phi_n) * max(F_A_max, 0.0) - F_Z - max(dF_Vth, 0.0)


def slip_margin(F_KR_min: float, interfaces: int, mu_T: float, shear: float) -> float:
    """Safety against slipping, S_G = F_KR,min q_F mu_T,min / F_Q,max (VDI 2230-1:2015 R12, from memory).

    >>> slip_margin(20000.0, 1, 0.15, 2500.0)
    1.2
    """
    return F_KR_min * interfaces * mu_T / abs(shear)


# --------------------------------------------------------------------------------------
# the chain
# --------------------------------------------------------------------------------------

@dataclass
class VdiResult:
    """Every intermediate number of the VDI 2230-1 chain for one joint."""

    # geometry and resilience (R0, 5.1)
    l_K: float                  # clamp length, mm
    d_W: float                  # bearing diameter used for the cone, mm
    d_h: float
    shank_in_clamp: float       # mm
    free_thread: float          # l_Gew, mm
    bolt: BoltResilience        # sections of delta_S
    delta_S: float              # mm/N
    beta_L: float
    y: float
    tan_phi: float
    D_A: float | None           # outside diameter used (None: unbounded)
    D_A_Gr: float               # limiting diameter, mm
    body: str                   # "cone" | "cone+sleeve" | "sleeve"
    delta_P: float              # mm/N
    bolt_stiffness: float       # N/mm
    member_stiffness: float     # N/mm
    # load factor, losses (5.3, 5.4)
    Phi_K: float
    Phi_n: float
    f_Z: float                  # mm
    F_Z: float                  # N
    dF_Vth: float               # N, positive = loss
    # preload window (R2-R7, R13)
    F_KQ: float                 # clamp load for slip, N
    F_K_req: float              # N
    F_M_min: float              # required minimum assembly preload, N
    F_M_max: float              # alpha_A F_M,min, N
    F_M_zul: float              # permissible assembly preload, N
    alpha_A: float
    D_Km: float                 # mm
    M_A: float                  # tightening torque producing F_M,zul at mu_G,min, N*mm
    preload_min: float          # F_M,zul / alpha_A, N
    preload_max: float          # F_M,zul, N
    preload: float              # in service: preload_min - F_Z, N
    # working stress (R8)
    F_S_max: float
    M_G: float
    sigma_red_B: float
    S_F: float
    # fatigue (R9)
    sigma_a: float
    sigma_AS: float
    fatigue_formula: str        # "ASV" | "ASG"
    S_D: float | None
    # surface pressure (R10)
    p_head_assembly: float
    p_head_service: float
    p_nut_assembly: float | None
    p_nut_service: float | None
    p_G_head: float | None
    p_G_nut: float | None
    S_P: float | None
    # residual clamp load (R12)
    F_KR_min: float
    S_G: float | None
    notes: list[str] = field(default_factory=list)

    def tightening(self) -> dict[str, float]:
        """The `tightening` block of the result document (N*mm, N): torque M_A, the preload window
        F_M,zul / alpha_A .. F_M,zul and F_M,zul itself (meanings as in `vdi_chain`)."""
        return {
            "torque": self.M_A,
            "preload_min": self.preload_min,
            "preload_max": self.preload_max,
            "preload_permissible": self.F_M_zul,
        }


def _vdi_inputs(spec: JointSpec) -> VdiSpec:
    v = spec.vdi if spec.vdi is not None else VdiSpec()
    check_friction(v.friction_thread, "friction.thread")
    check_friction(v.friction_head, "friction.head")
    check_friction(v.friction_interface, "friction.interface")
    check_scatter(v.scatter)
    check_roughness(v.roughness)
    if not 0.0 < v.load_introduction <= 1.0:
        raise InputError(f"must be in (0, 1], got {v.load_introduction!r}", where="load_introduction")
    if not 0.0 < v.utilisation <= 1.0:
        raise InputError(f"must be in (0, 1], got {v.utilisation!r}", where="utilisation")
    if v.clamp_required < 0:
        raise InputError(f"must be >= 0, got {v.clamp_required!r}", where="clamp_required")
    return v


def _clamped_layers(spec: JointSpec):
    layers = list(spec.layers[:-1] if spec.tapped else spec.layers)
    if not layers:
        raise InputError(f"joint {spec.id}: no clamped layer", where="layers")
    for layer in spec.layers:
        if layer.thickness <= 0 or layer.E <= 0:
            raise InputError(f"joint {spec.id}: layer thickness and modulus must be positive", where="layers")
    return layers


@dataclass(frozen=True)
class _Clamp:
    """The clamped part of a joint as the substitute body sees it (mm, MPa)."""

    layers: list            # the clamped LayerSpecs (the tapped part excluded)
    l_K: float              # clamp length
    d_h: float              # hole diameter
    d_W_head: float         # head-side bearing diameter
    d_W_far: float          # nut-side bearing diameter (= head side for tapped joints)
    d_W: float              # their mean, for beta_L and y
    tan_phi: float          # cone tangent (VDI 2230-1 eq. (23)/(24))
    y: float                # D_A / d_W (or the limiting y when D_A is unknown)
    D_A_Gr: float           # limiting diameter of the full cone
    delta_P: float          # member resilience, mm/N


def _clamp(spec: JointSpec) -> _Clamp:
    """Layers, clamp length, bearing diameters and the substitute body's resilience of a joint:
    the one set-up shared by the chain (`vdi_chain`) and the engine's stiffness (`vdi_member_stiffness`)."""
    layers = _clamped_layers(spec)
    l_K = float(sum(layer.thickness for layer in layers))
    d_h = float(spec.hole_diameter)
    d_W_head = float(spec.bearing_diameter)
    d_W_far = d_W_head if (spec.tapped or spec.far_bearing_diameter is None) else float(spec.far_bearing_diameter)
    if not d_W_head > d_h:
        raise InputError(f"joint {spec.id}: bearing diameter {d_W_head} must exceed hole {d_h}",
                         where="bearing_diameter")
    d_W = 0.5 * (d_W_head + d_W_far)   # for beta_L and y when head and nut bear on different diameters
    tan_phi, y, D_A_Gr = _cone_geometry(d_W, l_K, spec.outside_diameter, spec.tapped)
    delta_P = member_resilience_layers([(layer.thickness, layer.E) for layer in layers], d_W_head, d_h,
                                       tan_phi, spec.tapped, spec.outside_diameter, d_W_far)
    return _Clamp(layers, l_K, d_h, d_W_head, d_W_far, d_W, tan_phi, y, D_A_Gr, delta_P)


def _bolt_lengths(spec: JointSpec, l_K: float, notes: list[str]) -> tuple[float, float]:
    """(shank inside l_K, free loaded thread inside l_K), mm."""
    from geomjoint.mechanics.bolt import bolt_thread_length, grip_lengths, unthreaded_length

    f = spec.fastener
    if f.fully_threaded:
        return 0.0, l_K
    if f.length is None:
        notes.append("bolt length unknown: the clamp length taken as unthreaded shank "
                     "(stiffest bolt, the larger load factor)")
        return l_K, 0.0
    L_T = bolt_thread_length(f)
    return grip_lengths(l_K, unthreaded_length(f.length, L_T))


def _cone_geometry(d_W: float, l_K: float, D_A: float | None, tapped: bool) -> tuple[float, float, float]:
    """(tan phi, y, D_A,Gr).  With D_A unknown the parts are taken just wide enough to hold the
    cone: y = D_A,Gr / d_W solved by fixed-point iteration (tan phi depends on y)."""
    beta_L = l_K / d_W
    tan_fn = cone_tangent_tapped if tapped else cone_tangent_through
    w = CONE_W_TAPPED if tapped else CONE_W_THROUGH
    if D_A is not None:
        y = D_A / d_W
        if y <= 1.0:   # sleeve only: the cone angle does not matter, keep the formula's domain
            y = 1.0
        t = tan_fn(beta_L, y)
        return t, y, limiting_diameter(d_W, l_K, t, w)
    y = 1.0 + w * l_K * 0.5 / d_W
    for _ in range(100):
        t = tan_fn(beta_L, y)
        y_new = limiting_diameter(d_W, l_K, t, w) / d_W
        if abs(y_new - y) < 1e-12:
            break
        y = y_new
    return t, y, y * d_W


def vdi_chain(spec: JointSpec) -> VdiResult:
    """Run the VDI 2230-1:2015 calculation (R0-R13) for one joint.

    Uses ``spec.vdi`` (defaults of :class:`VdiSpec` when None), the fastener's numbers,
    the clamped layers and ``outside_diameter``.  The preload window (our fixed
    reading of the chain, so the JSON's tightening block means one thing): M_A produces F_M,zul at the minimum thread friction given;
    preload_max = F_M,zul, preload_min = F_M,zul/alpha_A, service preload = preload_min - F_Z.
    """
    v = _vdi_inputs(spec)
    f = spec.fastener
    notes: list[str] = []
    clamp = _clamp(spec)
    layers, l_K, d_h = clamp.layers, clamp.l_K, clamp.d_h
    d_W_head, d_W_far, d_W = clamp.d_W_head, clamp.d_W_far, clamp.d_W
    if d_W_far != d_W_head:
        notes.append("head and nut bearing diameters differ: their mean enters beta_L and y")

    # R0 / 5.1.1 bolt
    shank, free = _bolt_lengths(spec, l_K, notes)
    E_nut = spec.layers[-1].E if spec.tapped else f.E
    bolt = bolt_resilience(f.d, f.d3, f.E, shank, free, f.head, E_nut, spec.tapped)
    delta_S = bolt.total

    # 5.1.2 members
    D_A = spec.outside_diameter
    tan_phi, y, D_A_Gr = clamp.tan_phi, clamp.y, clamp.D_A_Gr
    if D_A is None:
        notes.append("outside diameter unknown: parts taken just wide enough for the full cone")
        body = "cone"
    elif D_A <= d_W:
        body = "sleeve"
    elif D_A < D_A_Gr:
        body = "cone+sleeve"
    else:
        body = "cone"
    delta_P = clamp.delta_P

    # 5.3 load factor
    Phi_K = load_factor(delta_S, delta_P, 1.0)
    Phi_n = v.load_introduction * Phi_K

    # 5.4.2.1 embedding: one thread pair, head (+ nut) bearing face, the inner interfaces
    load_kind = "shear" if abs(spec.shear) > 0 else "tension"
    bearing_faces = 1 if spec.tapped else 2
    inner = len(spec.layers) - 1
    f_Z = embedding_amount(v.roughness, load_kind, 1, bearing_faces, inner)
    F_Z = embedding_loss(f_Z, delta_S, delta_P)

    # 5.4.2.3 temperature
    dT = v.temperature_service - v.temperature_assembly
    missing = [layer.material for layer in layers if layer.thermal_expansion is None]
    if missing and dT != 0.0:
        notes.append("no thermal expansion for " + ", ".join(sorted(set(missing)))
                     + ": taken equal to the bolt's")
    grow_bolt = f.thermal_expansion * dT * l_K
    grow_parts = sum((layer.thermal_expansion if layer.thermal_expansion is not None else f.thermal_expansion)
                     * dT * layer.thickness for layer in layers)
    dF_Vth = thermal_preload_change(grow_bolt, grow_parts, delta_S, delta_P)

    # R2-R5 required preload
    F_A_max = max(spec.load_max, spec.load_min)
    F_A_min = min(spec.load_max, spec.load_min)
    F_KQ = clamp_load_for_slip(spec.shear, v.interfaces_shear, v.friction_interface) if spec.shear else 0.0
    F_K_req = max(v.clamp_required, F_KQ)
    F_M_min = required_preload_min(F_K_req, Phi_n, F_A_max, F_Z, dF_Vth)
    F_M_max = required_preload_max(F_M_min, v.scatter)

    # R7 permissible preload, R13 torque
    d0 = stress_diameter(f.d2, f.d3)
    A0 = f.stress_area
    F_M_zul = permissible_assembly_preload(A0, f.yield_strength, f.d2, d0, f.pitch, v.friction_thread,
                                           v.utilisation)
    D_Km = bearing_friction_diameter(d_W_head, d_h)
    M_A = tightening_torque(F_M_zul, f.pitch, f.d2, v.friction_thread, D_Km, v.friction_head)
    preload_max = F_M_zul
    preload_min = F_M_zul / v.scatter
    preload = preload_min - F_Z

    # R8 working stress: the highest bolt load, a thermal gain of preload adds to it
    F_S_max = F_M_zul + Phi_n * max(F_A_max, 0.0) + max(-dF_Vth, 0.0)
    M_G = thread_torque(F_M_zul, f.d2, f.pitch, v.friction_thread)
    sigma_red_B = working_stress(F_S_max, A0, M_G, d0)
    S_F = f.yield_strength / sigma_red_B

    # R9 fatigue; mean bolt load from the upper preload (the conservative choice for ASG)
    sigma_a = alternating_stress(Phi_n, F_A_max, F_A_min, f.stress_area)
    if f.rolled_after_heat_treatment and f.threads == "rolled":
        F_Sm = F_M_zul + Phi_n * 0.5 * (F_A_max + F_A_min)
        sigma_AS = fatigue_strength_rolled_after(f.d, F_Sm, f.stress_area * f.yield_strength)
        formula = "ASG"
    else:
        sigma_AS = fatigue_strength_rolled_before(f.d)
        formula = "ASV"
        if f.threads == "cut":
            notes.append("cut thread: sigma_ASV of threads rolled before heat treatment used")
    S_D = sigma_AS / sigma_a if sigma_a > 0 else None

    # R10 surface pressure: assembly F_M,zul, service F_V,max + Phi_n F_A,max (+ thermal gain)
    F_V_max = F_M_zul - F_Z
    F_service = F_V_max + Phi_n * max(F_A_max, 0.0) + max(-dF_Vth, 0.0)
    p_head_assembly = surface_pressure(F_M_zul, d_W_head, d_h)
    p_head_service = surface_pressure(F_service, d_W_head, d_h)
    if spec.tapped:
        p_nut_assembly = p_nut_service = None
    else:
        p_nut_assembly = surface_pressure(F_M_zul, d_W_far, d_h)
        p_nut_service = surface_pressure(F_service, d_W_far, d_h)

    def first_member(seq):
        for layer in seq:
            if layer.role != "washer":
                return layer
        return seq[0]

    p_G_head = first_member(layers).limiting_pressure
    p_G_nut = None if spec.tapped else first_member(list(reversed(layers))).limiting_pressure
    margins = []
    if p_G_head is not None:
        margins.append(p_G_head / max(p_head_assembly, p_head_service))
    if p_G_nut is not None and p_nut_assembly is not None:
        margins.append(p_G_nut / max(p_nut_assembly, p_nut_service))
    S_P = min(margins) if margins else None

    # R12 residual clamp load, slip
    F_KR_min = residual_clamp_load(F_M_zul, v.scatter, Phi_n, F_A_max, F_Z, dF_Vth)
    S_G = (slip_margin(F_KR_min, v.interfaces_shear, v.friction_interface, spec.shear)
           if spec.shear else None)

    return VdiResult(
        l_K=l_K, d_W=d_W, d_h=d_h, shank_in_clamp=shank, free_thread=free, bolt=bolt, delta_S=delta_S,
        beta_L=l_K / d_W, y=y, tan_phi=tan_phi, D_A=D_A, D_A_Gr=D_A_Gr, body=body, delta_P=delta_P,
        bolt_stiffness=1.0 / delta_S, member_stiffness=1.0 / delta_P,
        Phi_K=Phi_K, Phi_n=Phi_n, f_Z=f_Z, F_Z=F_Z, dF_Vth=dF_Vth,
        F_KQ=F_KQ, F_K_req=F_K_req, F_M_min=F_M_min, F_M_max=F_M_max, F_M_zul=F_M_zul,
        alpha_A=v.scatter, D_Km=D_Km, M_A=M_A, preload_min=preload_min, preload_max=preload_max,
        preload=preload, F_S_max=F_S_max, M_G=M_G, sigma_red_B=sigma_red_B, S_F=S_F,
        sigma_a=sigma_a, sigma_AS=sigma_AS, fatigue_formula=formula, S_D=S_D,
        p_head_assembly=p_head_assembly, p_head_service=p_head_service,
        p_nut_assembly=p_nut_assembly, p_nut_service=p_nut_service,
        p_G_head=p_G_head, p_G_nut=p_G_nut, S_P=S_P, F_KR_min=F_KR_min, S_G=S_G, notes=notes,
    )


def vdi_stiffness_split(spec: JointSpec, result: VdiResult) -> StiffnessSplit | None:
    """What delta_P and delta_S of a tapped thread joint span (None for a through-bolt joint).

    VDI 2230-1:2015 Sec. 5.1 (from memory): delta_P of a tapped thread joint (ESV) covers the
    clamped parts over l_K only; the engaged screw thread (delta_G, l_G = 0.5 d) and the
    tapped-thread region (delta_M, l_M = 0.33 d with the tapped part's modulus) are in the
    bolt's delta_S.  This is the definition of docs/tapped_stiffness.md as it stands.
    """
    if not spec.tapped:
        return None
    return StiffnessSplit(TAPPED_MEMBER_DEFINITION, "bolt", result.bolt.engaged, result.bolt.nut,
                          "VDI 2230-1 delta_G (l_G = 0.5 d on A_d3) and delta_M (l_M = 0.33 d on A_N, "
                          "modulus of the tapped part)")


def vdi_member_stiffness(spec: JointSpec) -> float:
    """Member stiffness 1/delta_P of the VDI 2230-1 substitute deformation body, N/mm.

    For ``member_stiffness = "vdi"`` in the engine.  For a tapped thread joint it spans the
    clamped parts only (the definition of docs/tapped_stiffness.md; VDI's ESV body).
    """
    _vdi_inputs(spec)   # validates the VDI inputs; the cone itself does not depend on them
    return member_stiffness_from_resilience(_clamp(spec).delta_P)


def _check(name: str, value: float | None, spec: JointSpec, note: str) -> Check:
    required = spec.required.get(name, REQUIRED_MARGIN[name])
    ok = value is None or value >= required
    return Check(name=name, value=value, required=required, ok=ok, note=note)


def vdi_checks(spec: JointSpec, result: VdiResult) -> list[Check]:
    """The VDI 2230-1 checks as margins (value = safety factor, required = its minimum).

    ``assembly_preload`` F_M,zul / F_M,max (R5/R7), ``working_stress`` S_F (R8),
    ``fatigue`` S_D (R9; None when the load does not fluctuate), ``bearing_pressure`` S_P (R10;
    None and a note when no limiting pressure is known), ``slip`` S_G (R12; only with shear).
    """
    r = result
    checks = [
        _check("assembly_preload", r.F_M_zul / r.F_M_max if r.F_M_max > 0 else None, spec,
               f"F_M,max = alpha_A F_M,min = {r.F_M_max:.0f} N against F_M,zul = {r.F_M_zul:.0f} N "
               f"(VDI 2230-1 R5/R7)"),
        _check("working_stress", r.S_F, spec,
               f"sigma_red,B = {r.sigma_red_B:.0f} MPa against R_p0.2min (VDI 2230-1 R8, k_t = 0.5)"),
        _check("fatigue", r.S_D, spec,
               f"sigma_a = {r.sigma_a:.1f} MPa against sigma_{r.fatigue_formula} = {r.sigma_AS:.1f} MPa "
               f"(VDI 2230-1 R9)" if r.S_D is not None else "no fluctuating axial load (VDI 2230-1 R9)"),
    ]
    if r.S_P is None:
        note = "not checked: no limiting surface pressure p_G for the bearing member (VDI 2230-1 R10)"
    else:
        p = max(r.p_head_assembly, r.p_head_service,
                r.p_nut_assembly or 0.0, r.p_nut_service or 0.0)
        note = f"p_max = {p:.0f} MPa against p_G (VDI 2230-1 R10)"
    checks.append(_check("bearing_pressure", r.S_P, spec, note))
    if spec.shear:
        checks.append(_check("slip", r.S_G, spec,
                             f"F_KR,min = {r.F_KR_min:.0f} N against F_KQ = {r.F_KQ:.0f} N "
                             f"(VDI 2230-1 R12)"))
    return checks
