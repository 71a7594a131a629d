"""The textbook joint engine: one :class:`JointSpec` in, one :class:`JointResult` out.

Composes bolt and member stiffness, preload, the static factors and the fatigue factor
of Budynas & Nisbett, *Shigley's Mechanical Engineering Design*, 10th ed., ch. 8
(equation numbers from memory), with these conventions of ours where the book leaves a choice:

- no preload: C is reported but unused, the bolt carries the whole load, the separation
  factor is 0 (its check fails) and yield/load factors use C = 1;
- a factor that is unbounded (no external load) is None;
- tapped joints: the frusta of Table 8-7 over the effective grip l' (the far cone starts
  at l' with the head-side bearing diameter, the hole diameter applies to every layer),
  split by body (docs/tapped_stiffness.md): the part above the interface is the member,
  the part inside the tapped part is in series with the bolt (like VDI 2230-1 delta_M),
  and the bolt runs over l' (its last l' - h stand for the engaged screw thread);
- static factors use P = P_max.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace

from geomjoint.mechanics import bolt as B
from geomjoint.mechanics import fatigue as FT
from geomjoint.mechanics import members as M
from geomjoint.mechanics import preload as PL
from geomjoint.mechanics.joint import TAPPED_MEMBER_DEFINITION, UNRATED, Check, JointResult, JointSpec, StiffnessSplit
from geomjoint.mechanics.vdi import clamp_load_for_slip

#: a joint whose smallest factor/required ratio lies below this is "marginal" rather than
#: "pass" (our own choice: 10 % over the requirement)
MARGINAL_BAND = 1.10

#: nut factor used to report a torque when the job gives neither K nor a friction pair:
#: K = 0.2 for plain steel threads (Shigley 10th ed., Sec. 8-8; common practice)
DEFAULT_NUT_FACTOR = 0.2

#: checks whose margin the tightening sets by design (VDI 2230-1 tightens to ν = 0.9 of the
#: yield, so S_F ≈ 1.1 on every well-tightened joint): they pass or fail, but never make a
#: joint "marginal" (our own rule)
DESIGN_UTILISATION_CHECKS = ("working_stress", "assembly_preload")

#: checks of the stack's geometry at its tolerance limits (mechanics.stackup): a margin in mm,
#: already taken at the worst corner, so they pass or fail but never make a joint "marginal",
#: and govern only when they fail (our own rule)
GEOMETRY_LIMIT_CHECKS = ("stack-up limits", "position")

#: the checks whose values are factors against a required value
FACTOR_CHECKS = ("yield", "load", "separation", "fatigue")


# ---------------------------------------------------------------- static factors

def yield_factor(proof: float, stress_area: float, C: float, load: float, preload: float) -> float | None:
    """Yield (proof) factor n_p = S_p A_t / (C P + F_i) (Shigley 10th ed., eq. 8-28).

    None when the bolt force is not positive.

    >>> round(yield_factor(830.0, 84.3, 0.25, 10000.0, 52477.0), 4)
    1.2727
    """
    force = C * load + preload
    return None if force <= 0 else proof * stress_area / force


def load_factor(proof: float, stress_area: float, C: float, load: float, preload: float) -> float | None:
    """Load factor n_L = (S_p A_t - F_i) / (C P) (Shigley 10th ed., eq. 8-29); None for P <= 0.

    >>> round(load_factor(830.0, 84.3, 0.25, 10000.0, 52477.0), 4)
    6.9968
    """
    return None if load <= 0 or C <= 0 else (proof * stress_area - preload) / (C * load)


def separation_factor(C: float, load: float, preload: float) -> float | None:
    """Joint-separation factor n_0 = F_i / ((1 - C) P) (Shigley 10th ed., eq. 8-30); None for P <= 0.

    No preload gives 0, even without load (our convention: an unpreloaded joint is open).

    >>> round(separation_factor(0.25, 10000.0, 52477.0), 4)
    6.9969
    """
    if preload <= 0:
        return 0.0
    return None if load <= 0 else preload / ((1.0 - C) * load)


def joint_constant(k_b: float, k_m: float) -> float:
    """Joint constant C = k_b / (k_b + k_m) (Shigley 10th ed., eq. 8-24 text).

    >>> joint_constant(1.0, 3.0)
    0.25
    """
    return k_b / (k_b + k_m)


# ---------------------------------------------------------------- stiffness

@dataclass(frozen=True)
class BoltSide:
    stiffness: float        # k_b, N/mm
    thread_length: float | None  # L_T, mm (None: length unknown)
    shank: float            # L - L_T (>= 0), mm, before cutting at the grip
    l_d: float              # unthreaded length in the grip, mm
    l_t: float              # threaded length in the grip, mm
    notes: tuple[str, ...] = ()
    screw_thread: float = 0.0   # tapped: the screw over l' - h (its engaged thread) inside k_b, mm/N
    tapped_part: float = 0.0    # tapped: Table 8-7 frusta inside the tapped part, in series, mm/N


def effective_grip_of(spec: JointSpec) -> float:
    """Grip the stiffness models use: l for through joints, l' of Shigley Table 8-7 when tapped."""
    if spec.tapped:
        return B.effective_grip(spec.clamped_thickness, spec.layers[-1].thickness, spec.fastener.d)
    return spec.grip


def bolt_side(spec: JointSpec, grip: float) -> BoltSide:
    """Bolt stiffness over the (effective) grip, with its thread and shank lengths."""
    f = spec.fastener
    notes = []
    if f.length is None:
        L_T, shank = None, 0.0
        notes.append("bolt length unknown: taken as threaded over the grip")
    else:
        L_T = B.bolt_thread_length(f)
        shank = B.unthreaded_length(f.length, L_T, f.fully_threaded)
    l_d, l_t = B.grip_lengths(grip, shank)
    k_b = B.bolt_stiffness(B.shank_area(f.d), f.stress_area, f.E, l_d, l_t)
    if not spec.tapped:
        return BoltSide(k_b, L_T, shank, l_d, l_t, tuple(notes))
    # the definition of docs/tapped_stiffness.md: the engaged-thread region is the bolt's
    h = spec.clamped_thickness
    screw_thread = (max(0.0, l_d - h) / B.shank_area(f.d) + (grip - max(h, l_d)) / f.stress_area) / f.E
    tapped_part = tapped_frusta(spec, grip)[1]
    return BoltSide(1.0 / (1.0 / k_b + tapped_part), L_T, shank, l_d, l_t, tuple(notes),
                    screw_thread, tapped_part)


def tapped_frusta(spec: JointSpec, grip: float) -> tuple[float, float]:
    """(clamped layers, tapped part) compliances of the Table 8-7 frusta of a tapped joint, mm/N."""
    return M.tapped_frustum_compliances(spec.layers[:-1], spec.layers[-1], spec.bearing_diameter,
                                        spec.hole_diameter, grip, spec.cone_angle, spec.outside_diameter)


def stiffness_split(spec: JointSpec, bolt: BoltSide) -> StiffnessSplit | None:
    """What the textbook engine's k_m and k_b of a tapped joint span (None for a through joint)."""
    if not spec.tapped:
        return None
    return StiffnessSplit(TAPPED_MEMBER_DEFINITION, "bolt", bolt.screw_thread, bolt.tapped_part,
                          "screw over the effective grip l' (Shigley Table 8-7); tapped part: the "
                          "Table 8-7 frusta below the interface, in series with the bolt")


def layers_over(spec: JointSpec, grip: float):
    """The layers cut at the grip (a tapped part counts up to l' - h)."""
    out, x = [], 0.0
    for layer in spec.layers:
        t = min(layer.thickness, grip - x)
        if t <= 0:
            break
        out.append(layer if t == layer.thickness else replace(layer, thickness=t))
        x += t
    return out


def member_side(spec: JointSpec, grip: float) -> tuple[float, str, list[str]]:
    """Member stiffness k_m (N/mm), the method name, notes."""
    method = spec.member_stiffness
    if spec.members_value is not None:
        if spec.members_value <= 0:
            raise ValueError(f"members_value must be positive, got {spec.members_value}")
        return float(spec.members_value), method, []
    layers = layers_over(spec, grip)
    notes = []
    if spec.outside_diameter is not None and method == "exponential":
        notes.append("outside diameter not used by the exponential member model (a fit for wide plates)")
    if method in ("frustum", "cone") and spec.tapped:
        # the clamped layers' share of the Table 8-7 frusta (docs/tapped_stiffness.md)
        k_m = 1.0 / tapped_frusta(spec, grip)[0]
    elif method in ("frustum", "cone"):
        # a typed-in joint has no part geometry: its "cone" is the frustum clipped by a round
        # part of the outside diameter, which is exact for that shape
        k_m = M.frustum_stiffness(layers, spec.bearing_diameter, spec.far_bearing_diameter, spec.hole_diameter,
                                  spec.cone_angle, grip, spec.outside_diameter)
    elif method == "exponential" and spec.tapped:
        clamped = list(spec.layers[:-1])
        if len({(layer.E, layer.wileman) for layer in clamped}) > 1:
            notes.append("exponential (Wileman) member stiffness is a one-material fit; the layers differ "
                         "in material, so each layer is weighted by its thickness (approximation)")
        k_m = M.wileman_tapped_stiffness(clamped, spec.fastener.d)
    elif method == "exponential":
        if len({(layer.E, layer.wileman) for layer in layers}) > 1:
            notes.append("exponential (Wileman) member stiffness is a one-material fit; the layers differ "
                         "in material, so each layer is weighted by its thickness (approximation)")
        if any(layer.wileman is None for layer in layers):
            notes.append("Wileman constants missing for a layer material: the general constants used")
        k_m = M.wileman_layered_stiffness(layers, spec.fastener.d, grip)
    else:
        raise ValueError(f"member stiffness {method!r} needs members_value computed outside the textbook engine")
    return k_m, method, notes


# ---------------------------------------------------------------- preload

def _turned_bearing(spec: JointSpec) -> float:
    """Bearing diameter under the turned part: the nut of a through bolt (common practice), else the head."""
    if not spec.tapped and spec.far_bearing_diameter is not None:
        return spec.far_bearing_diameter
    return spec.bearing_diameter


def service_preload(spec: JointSpec) -> tuple[float, dict[str, float] | None, list[str]]:
    """Preload F_i (N), the tightening numbers (torque N*mm, preload_min/max N), notes.

    Torque <-> preload: the nut factor when ``nut_factor`` is given (T = K F d, eq. 8-27);
    else the thread/head friction formula when both coefficients are given; else
    K = :data:`DEFAULT_NUT_FACTOR`.  The preload is the mean of the scatter band
    (:func:`geomjoint.mechanics.preload.preload_scatter`).
    """
    p, f = spec.preload, spec.fastener
    notes: list[str] = []
    friction = p.friction_thread is not None and p.friction_head is not None
    d_w = _turned_bearing(spec)

    def torque_for(force: float) -> float:
        if p.nut_factor is None and friction:
            return PL.torque_friction(force, f.d2, f.pitch, d_w, spec.hole_diameter, p.friction_thread, p.friction_head)
        return PL.torque_nut_factor(force, f.d, p.nut_factor or DEFAULT_NUT_FACTOR)

    if p.mode == "none":
        return 0.0, None, notes
    if p.mode == "proof_fraction":
        F_i = PL.preload_from_proof(p.value, f.stress_area, f.proof)
    elif p.mode == "force":
        F_i = float(p.value)
    elif p.mode == "torque":
        if p.nut_factor is None and friction:
            F_i = PL.preload_for_torque_friction(p.value, f.d2, f.pitch, d_w, spec.hole_diameter,
                                                 p.friction_thread, p.friction_head)
        else:
            F_i = PL.preload_for_torque_nut_factor(p.value, f.d, p.nut_factor or DEFAULT_NUT_FACTOR)
    else:
        raise ValueError(f"unknown preload mode {p.mode!r}")
    if p.nut_factor is None and not friction:
        notes.append(f"tightening torque by the nut factor K = {DEFAULT_NUT_FACTOR} (assumed)")
    torque = float(p.value) if p.mode == "torque" else torque_for(F_i)
    lo, hi = PL.preload_scatter(F_i, p.scatter)
    tightening = {"torque": torque, "preload": F_i, "preload_min": lo, "preload_max": hi,
                  "nut_factor": torque / (F_i * f.d) if F_i > 0 else float(p.nut_factor or DEFAULT_NUT_FACTOR)}
    if F_i > f.proof * f.stress_area:
        notes.append("preload exceeds the proof load")
    return F_i, tightening, notes


# ---------------------------------------------------------------- checks and verdict

def length_check(spec: JointSpec, side: BoltSide) -> Check:
    """Can the bolt clamp?  Fails when the unthreaded shank is longer than the grip (the nut or
    the tapped thread would meet the shank) or the bolt does not reach through the stack."""
    f = spec.fastener
    if f.length is None:
        return Check("length", None, None, True, "bolt length unknown: not checked")
    clamped = spec.clamped_thickness
    if side.shank > clamped + 1e-9:
        return Check("length", None, None, False,
                     f"unthreaded shank {side.shank:.1f} mm is longer than the grip {clamped:.1f} mm: cannot clamp")
    if f.length <= clamped + 1e-9:
        return Check("length", None, None, False,
                     f"bolt length {f.length:.1f} mm does not reach through the grip {clamped:.1f} mm")
    if spec.tapped and f.length - clamped > spec.layers[-1].thickness + 1e-9:
        return Check("length", None, None, False,
                     f"screw reaches {f.length - clamped:.1f} mm into a tapped hole {spec.layers[-1].thickness:.1f} mm "
                     f"deep: it bottoms before it clamps")
    if not spec.tapped and spec.nut_height:
        needed = B.required_length(clamped, d=f.d, pitch=f.pitch, tapped=False, gaps=spec.gaps,
                                   nut_height=spec.nut_height, protrusion_pitches=B.MIN_PROTRUSION_PITCHES)
        if f.length < needed - 1e-9:
            return Check("length", None, None, False,
                         f"bolt length {f.length:.1f} mm is shorter than grip + gaps + nut height + one pitch "
                         f"{needed:.1f} mm: the nut is not fully engaged")
    return Check("length", None, None, True, "")


def factor_check(name: str, value: float | None, required: float, note: str = "") -> Check:
    """A factor against its required value; an unbounded factor (None) passes."""
    if value is None:
        return Check(name, None, required, True, note or "unbounded (no external load)")
    return Check(name, float(value), required, bool(value >= required), note)


def rate(checks: list[Check]) -> tuple[str, str]:
    """Verdict ("pass" | "marginal" | "fail") and the governing check (least value/required).

    A failed check without a value (length) governs before any ratio.
    """
    def key(c: Check) -> float:
        if c.name in GEOMETRY_LIMIT_CHECKS and c.ok:
            return math.inf
        if c.value is None or not c.required:
            return -math.inf if not c.ok else math.inf
        return c.value / c.required

    governing = min(checks, key=key)
    banded = [c for c in checks if c.name not in DESIGN_UTILISATION_CHECKS + GEOMETRY_LIMIT_CHECKS]
    smallest = min((key(c) for c in banded), default=math.inf)
    if any(not c.ok for c in checks):
        verdict = "fail"
    elif smallest < MARGINAL_BAND:
        verdict = "marginal"
    else:
        verdict = "pass"
    return verdict, governing.name


def assess(spec: JointSpec) -> JointResult:
    """The textbook engine's numbers and checks of one joint (Shigley ch. 8), not yet rated.

    The caller adds any further checks and rates the result once (:func:`rate_result`).
    """
    f, fat = spec.fastener, spec.fatigue
    notes = list(spec.notes)
    grip = effective_grip_of(spec)
    bolt = bolt_side(spec, grip)
    k_m, method, member_notes = member_side(spec, grip)
    C = joint_constant(bolt.stiffness, k_m)
    F_i, tightening, preload_notes = service_preload(spec)
    notes += list(bolt.notes) + member_notes + preload_notes

    P = spec.load_max
    share = C if F_i > 0 else 1.0          # no preload: the bolt takes the whole load
    if F_i <= 0:
        notes.append("no preload: the bolt carries the whole external load (C not used)")
    factors = {
        "yield": yield_factor(f.proof, f.stress_area, share, P, F_i),
        "load": load_factor(f.proof, f.stress_area, share, P, F_i),
        "separation": separation_factor(C, P, F_i),
    }
    endurance = FT.bolt_endurance(f.grade, f.d, f.tensile, f.threads, endurance=fat.endurance,
                                  surface=fat.surface, temperature=fat.temperature,
                                  reliability=fat.reliability, Se=fat.Se)
    notes += list(endurance.notes)
    sigma_i, sigma_a, sigma_m = FT.bolt_stresses(F_i, C, spec.load_min, spec.load_max, f.stress_area)
    n_f = FT.fatigue_factor(fat.criterion, endurance.Se, sigma_i, sigma_a, sigma_m,
                            f.tensile, f.proof, f.yield_strength)
    factors["fatigue"] = n_f

    req = {name: float(spec.required.get(name, 1.0)) for name in FACTOR_CHECKS}
    checks = [factor_check(name, factors[name], req[name]) for name in FACTOR_CHECKS]
    if F_i <= 0:
        checks[2] = Check("separation", 0.0, req["separation"], False, "no preload: the joint is not clamped")
    checks.append(length_check(spec, bolt))
    return JointResult(
        id=spec.id, ok=False, verdict=UNRATED, governing="", spec=spec,
        grip=spec.clamped_thickness if spec.tapped else spec.grip, effective_grip=grip,
        bolt_stiffness=bolt.stiffness, member_stiffness=k_m, joint_constant=C, stiffness_method=method,
        preload=F_i, Se=endurance.Se, sigma_a=sigma_a, sigma_m=sigma_m, sigma_i=sigma_i, n_f=n_f,
        factors=factors, checks=checks, tightening=tightening, notes=notes,
        thread_length=bolt.thread_length, l_d=bolt.l_d, l_t=bolt.l_t, shank=bolt.shank,
        bolt_force=share * P + F_i, member_force=(1.0 - share) * P - F_i,
        load_line_slope=(sigma_m - sigma_i) / sigma_a if sigma_a > 0 else None,
        endurance_method=endurance.method, endurance_factors=dict(endurance.factors),
        stiffness_split=stiffness_split(spec, bolt),
    )


def rate_result(result: JointResult) -> JointResult:
    """Set the verdict, the governing check and ``ok`` from the result's checks, once.

    Every check must be in: a result is rated exactly once, at the end of its analysis.
    """
    if result.verdict != UNRATED:
        raise ValueError(f"joint {result.id}: the result is already rated ({result.verdict})")
    result.verdict, result.governing = rate(result.checks)
    result.ok = result.verdict != "fail"
    return result


def evaluate(spec: JointSpec) -> JointResult:
    """Check one joint by the textbook engine alone (Shigley ch. 8) and rate it."""
    return rate_result(assess(spec))


def slip_check(spec: JointSpec, preload: float, joint_constant: float) -> Check:
    """Friction grip of a joint that carries shear (textbook mode).

    Residual clamp load F_K = F_i − (1 − C)·P_max must carry the shear by friction:
    factor = F_K / F_KQ with F_KQ = F_Q / (q_F·μ_T) (VDI 2230-1 eq. R12 form).
    ``preload`` F_i in N, ``joint_constant`` C; friction and interfaces from ``spec.vdi``.

    Example (the joint needs only its shear, load, friction and requirements here):

    >>> from types import SimpleNamespace
    >>> from geomjoint.mechanics.joint import VdiSpec
    >>> spec = SimpleNamespace(shear=1500.0, load_max=4000.0, required={}, vdi=VdiSpec(friction_interface=0.15))
    >>> c = slip_check(spec, preload=20000.0, joint_constant=0.25)
    >>> round(c.value, 3)      # (20000 - 0.75*4000) / (1500 / 0.15) = 1.7
    1.7
    """
    v = spec.vdi
    mu, interfaces = v.friction_interface, v.interfaces_shear
    needed = clamp_load_for_slip(spec.shear, interfaces, mu)
    residual = preload - (1.0 - joint_constant) * spec.load_max
    value = max(residual, 0.0) / needed
    required = spec.required.get("slip", 1.0)
    return Check("slip", value, required, value >= required,
                 f"residual clamp load {residual:.0f} N against {needed:.0f} N for {spec.shear:.0f} N shear "
                 f"(mu_T = {mu:g}, {interfaces} interface(s))")
