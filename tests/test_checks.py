"""The textbook engine end to end: evaluate() against independent hand arithmetic."""
import doctest
import math

import pytest
from scipy.optimize import brentq

from conftest import validate_result
from geomjoint.mechanics import checks
from geomjoint.mechanics.checks import MARGINAL_BAND, evaluate
from geomjoint.mechanics.joint import Check, FastenerSpec, FatigueSpec, JointSpec, LayerSpec, PreloadSpec
from geomjoint.mechanics.members import WILEMAN_CONSTANTS, frustum_stiffness, wileman_stiffness

TAN30 = math.tan(math.pi / 6)
LBF, INCH, KPSI = 4.4482216152605, 25.4, 6.894757
LBF_PER_IN = LBF / INCH          # N/mm per lbf/in


def test_docstring_examples():
    assert doctest.testmod(checks).failed == 0


def m12(**kw):
    # M12 coarse, ISO 724 d2 = 10.863, d3 = 9.853, D1 = 10.106; A_s = 84.3 mm^2 (ISO 898-1 Table 4);
    # class 10.9: S_p 830, R_eL 940, R_m 1040 MPa (ISO 898-1 Table 3)
    base = dict(designation="M12", system="metric", d=12.0, pitch=1.75, d2=10.863, d3=9.853, D1=10.106,
                stress_area=84.3, grade="10.9", proof=830.0, yield_strength=940.0, tensile=1040.0, length=55.0)
    base.update(kw)
    return FastenerSpec(**base)


def steel(t):
    return LayerSpec(t, 207000.0, wileman=WILEMAN_CONSTANTS["steel"])


def metric_joint(**kw):
    base = dict(id="conveyor-bracket-1", fastener=m12(), layers=(steel(15.0), steel(15.0)),
                bearing_diameter=18.0, hole_diameter=12.0, load_min=0.0, load_max=12000.0)
    base.update(kw)
    return JointSpec(**base)


def eq_8_19(E, d, D, t):
    """Shigley 10th ed., eq. 8-19 at 30 deg, typed again for the hand computation."""
    return math.pi * E * d * TAN30 / math.log((2 * t * TAN30 + D - d) * (D + d) / ((2 * t * TAN30 + D + d) * (D - d)))


def test_metric_through_joint_by_hand():
    # Hand computation (Shigley 10th ed., ch. 8 procedure): M12x55 10.9, two 15 mm steel plates,
    # D = 1.5 d, hole = d so that eq. 8-22 applies; F_i = 0.75 F_p; P = 0..12 kN; Goodman; Table 8-17 S_e = 162
    r = evaluate(metric_joint())
    E, d, A_t, l = 207000.0, 12.0, 84.3, 30.0
    A_d = math.pi * d ** 2 / 4
    L_T = 2 * d + 6                      # 30 mm
    l_d = 55.0 - L_T                     # 25 mm
    l_t = l - l_d                        # 5 mm
    k_b = A_d * A_t * E / (A_d * l_t + A_t * l_d)
    k_m = TAN30 * math.pi * E * d / (2 * math.log(5 * (TAN30 * l + 0.5 * d) / (TAN30 * l + 2.5 * d)))  # eq. 8-22
    C = k_b / (k_b + k_m)
    F_i = 0.75 * A_t * 830.0
    P = 12000.0
    assert r.bolt_stiffness == pytest.approx(k_b, rel=1e-12)
    assert r.member_stiffness == pytest.approx(k_m, rel=1e-9)
    assert r.joint_constant == pytest.approx(C, rel=1e-9)
    assert r.preload == pytest.approx(F_i)
    assert r.factors["yield"] == pytest.approx(830.0 * A_t / (C * P + F_i), rel=1e-9)
    assert r.factors["load"] == pytest.approx((830.0 * A_t - F_i) / (C * P), rel=1e-9)
    assert r.factors["separation"] == pytest.approx(F_i / ((1 - C) * P), rel=1e-9)
    s_i, s_a = F_i / A_t, C * P / (2 * A_t)
    assert (r.sigma_i, r.sigma_a, r.sigma_m) == pytest.approx((s_i, s_a, s_i + s_a), rel=1e-9)
    assert r.Se == 162.0
    assert r.n_f == pytest.approx(162.0 * (1040.0 - s_i) / (s_a * (1040.0 + 162.0)), rel=1e-9)  # eq. 8-38
    assert [c.name for c in r.checks] == ["yield", "load", "separation", "fatigue", "length"]
    assert all(c.ok for c in r.checks)
    ratios = {c.name: c.value for c in r.checks if c.value is not None}
    assert r.governing == min(ratios, key=ratios.get) == "yield"
    assert r.verdict == ("pass" if min(ratios.values()) >= MARGINAL_BAND else "marginal")
    assert r.l_d == pytest.approx(l_d) and r.l_t == pytest.approx(l_t)
    assert r.tightening["torque"] == pytest.approx(0.2 * F_i * d)   # T = K F_i d, K = 0.2 (eq. 8-27)


def test_inch_joint_by_hand_in_inch_units():
    # Own scenario (pump skid foot): 1/2-13 UNC x 2.25 in SAE 5, steel 0.5 in over gray iron 0.75 in,
    # D = 0.75 in, hole = d; torque 1000 lbf*in with K = 0.2; P = 1..4 kip; Gerber; S_e = 18.6 kpsi (Table 8-17).
    # A_t = 0.1419 in^2 (ASME B1.1); SAE J429 grade 5: S_p 85, S_y 92, S_ut 120 kpsi; E steel 30, iron 14.5 Mpsi.
    d_in = 0.5
    fast = FastenerSpec("1/2-13 UNC", "inch", d_in * INCH, INCH / 13, 0.4500 * INCH, 0.4001 * INCH,
                        0.4056 * INCH, 0.1419 * INCH ** 2, "SAE 5", 85 * KPSI, 92 * KPSI, 120 * KPSI,
                        length=2.25 * INCH, E=30e3 * KPSI)
    spec = JointSpec(
        id="pump-skid-foot", fastener=fast,
        layers=(LayerSpec(0.5 * INCH, 30e3 * KPSI), LayerSpec(0.75 * INCH, 14.5e3 * KPSI, material="gray cast iron")),
        bearing_diameter=0.75 * INCH, hole_diameter=0.5 * INCH,
        preload=PreloadSpec("torque", 1000 * LBF * INCH, nut_factor=0.2),
        load_min=1000 * LBF, load_max=4000 * LBF, fatigue=FatigueSpec(criterion="gerber"),
    )
    r = evaluate(spec)
    # hand, in lbf, in, psi
    A_d, A_t, E = math.pi * 0.25 / 4, 0.1419, 30e6
    L_T = 2 * 0.5 + 0.25                          # 1.25 in (L <= 6 in)
    l_d, l_t = 2.25 - L_T, 1.25 - (2.25 - L_T)    # 1.0, 0.25 in
    k_b = A_d * A_t * E / (A_d * l_t + A_t * l_d)
    k1 = eq_8_19(30e6, 0.5, 0.75, 0.5)                         # steel, head cone
    k2 = eq_8_19(14.5e6, 0.5, 0.75 + 2 * 0.5 * TAN30, 0.125)   # iron, head cone to mid-grip
    k3 = eq_8_19(14.5e6, 0.5, 0.75, 0.625)                     # iron, nut cone
    k_m = 1 / (1 / k1 + 1 / k2 + 1 / k3)
    C = k_b / (k_b + k_m)
    F_i = 1000 / (0.2 * 0.5)                      # 10 000 lbf
    assert r.bolt_stiffness / LBF_PER_IN == pytest.approx(k_b, rel=1e-6)
    assert r.member_stiffness / LBF_PER_IN == pytest.approx(k_m, rel=1e-6)
    assert r.joint_constant == pytest.approx(C, rel=1e-6)
    assert r.preload / LBF == pytest.approx(F_i, rel=1e-9)
    P = 4000.0
    assert r.factors["yield"] == pytest.approx(85000 * A_t / (C * P + F_i), rel=1e-6)
    assert r.factors["load"] == pytest.approx((85000 * A_t - F_i) / (C * P), rel=1e-6)
    assert r.factors["separation"] == pytest.approx(F_i / ((1 - C) * P), rel=1e-6)
    s_i = F_i / A_t
    s_a = C * (4000 - 1000) / (2 * A_t)
    s_m = s_i + C * (4000 + 1000) / (2 * A_t)
    assert r.sigma_a / KPSI * 1000 == pytest.approx(s_a, rel=1e-6)
    # Gerber on the line S_m = s_i + (5/3) S_a, solved here numerically
    Se, Sut = 18600.0, 120000.0
    S_a = brentq(lambda x: x / Se + ((s_i + (5 / 3) * x) / Sut) ** 2 - 1, 0.0, Se, xtol=1e-10)
    assert r.n_f == pytest.approx(S_a / s_a, rel=1e-6)
    assert r.sigma_m / KPSI * 1000 == pytest.approx(s_m, rel=1e-6)
    # yield factor 12 062 / (C*4000 + 10 000) is just above 1: all pass, and within 10 % -> marginal
    assert 1.0 < r.factors["yield"] < MARGINAL_BAND
    assert r.verdict == "marginal" and r.governing == "yield" and r.ok


def test_tapped_joint_effective_grip_and_far_cone():
    # Own scenario (gearbox cover): M10x30 8.8 socket cap screw, 12 mm aluminium cover into a steel
    # housing tapped 25 mm deep. Shigley Table 8-7: t2 >= d -> l' = h + d/2 = 17 mm; the housing counts 5 mm.
    # ISO 898-1: A_s 58.0 mm^2, 8.8 (d <= 16): 580/640/800 MPa.
    fast = FastenerSpec("M10", "metric", 10.0, 1.5, 9.026, 8.160, 8.376, 58.0, "8.8", 580.0, 640.0, 800.0,
                        length=30.0, head="socket")
    spec = JointSpec("gearbox-cover-3", fast, (LayerSpec(12.0, 71000.0, material="aluminium"),
                                              LayerSpec(25.0, 207000.0, role="tapped")),
                     bearing_diameter=16.0, hole_diameter=11.0, tapped=True, load_max=5000.0)
    r = evaluate(spec)
    assert r.grip == 12.0 and r.effective_grip == pytest.approx(17.0)
    # frusta by hand, eq. 8-19: head cone 8.5 mm of aluminium; far cone from l' with the same D:
    # 5 mm steel, then 3.5 mm aluminium starting at D + 2*5*tan30
    def frustum(E, D, t):
        return math.pi * E * 11.0 * TAN30 / math.log(
            (2 * t * TAN30 + D - 11.0) * (D + 11.0) / ((2 * t * TAN30 + D + 11.0) * (D - 11.0)))
    cover = 1 / frustum(71000.0, 16.0, 8.5) + 1 / frustum(71000.0, 16.0 + 10 * TAN30, 3.5)
    housing = 1 / frustum(207000.0, 16.0, 5.0)
    # split by body (docs/tapped_stiffness.md): the members are the cover alone ...
    assert r.member_stiffness == pytest.approx(1 / cover, rel=1e-9)
    # ... and the bolt is the screw over l' in series with the housing's frustum.  A socket cap
    # screw has b = 2d + 12 = 32 mm (ISO 4762, from memory) >= L = 30: threaded to the head, so
    # l_d = 0 and l_t = l' = 17 mm
    screw = 17.0 / (58.0 * 207000.0)
    assert r.bolt_stiffness == pytest.approx(1 / (screw + housing), rel=1e-12)
    # the split moves compliance, it adds none: Shigley's member + bolt springs in series are kept
    assert 1 / r.bolt_stiffness + 1 / r.member_stiffness == pytest.approx(
        screw + 1 / frustum_stiffness([(12.0, 71000.0), (5.0, 207000.0)], 16.0, None, 11.0), rel=1e-12)
    split = r.stiffness_split
    assert split.thread_region == "bolt" and split.tapped_part == pytest.approx(housing, rel=1e-12)
    assert split.screw_thread == pytest.approx(5.0 / (58.0 * 207000.0), rel=1e-12)   # the screw's l' - h
    assert next(c for c in r.checks if c.name == "length").ok


def test_without_preload_bolt_takes_whole_load():
    # the engine's conventions (checks module docstring): no preload -> C reported but unused, n_0 = 0 and the separation check fails
    spec = metric_joint(preload=PreloadSpec("none", 0.0), load_min=0.0, load_max=20000.0)
    r = evaluate(spec)
    assert 0 < r.joint_constant < 1
    assert r.factors["separation"] == 0.0
    sep = next(c for c in r.checks if c.name == "separation")
    assert not sep.ok and r.verdict == "fail" and not r.ok
    assert r.factors["yield"] == pytest.approx(830.0 * 84.3 / 20000.0)     # bolt force = P
    assert r.factors["load"] == pytest.approx(830.0 * 84.3 / 20000.0)
    assert r.bolt_force == pytest.approx(20000.0)
    assert (r.sigma_i, r.sigma_a, r.sigma_m) == pytest.approx((0.0, 20000.0 / (2 * 84.3), 20000.0 / (2 * 84.3)))


def test_no_external_load_gives_unbounded_factors():
    r = evaluate(metric_joint(load_max=0.0))
    assert r.factors["load"] is None and r.factors["separation"] is None and r.factors["fatigue"] is None
    assert r.factors["yield"] == pytest.approx(1 / 0.75)                    # proof / preload
    assert all(c.ok for c in r.checks) and r.governing == "yield"


def test_length_check():
    # a shank longer than the grip cannot clamp: M12x80 has L_T = 30, shank 50 > grip 30
    r = evaluate(metric_joint(fastener=m12(length=80.0)))
    length = next(c for c in r.checks if c.name == "length")
    assert not length.ok and "cannot clamp" in length.note
    assert r.verdict == "fail" and r.governing == "length"
    # unknown length: skipped with a note
    r = evaluate(metric_joint(fastener=m12(length=None)))
    length = next(c for c in r.checks if c.name == "length")
    assert length.ok and "not checked" in length.note
    # fully threaded: no shank at all
    r = evaluate(metric_joint(fastener=m12(length=80.0, fully_threaded=True)))
    assert next(c for c in r.checks if c.name == "length").ok
    assert r.bolt_stiffness == pytest.approx(84.3 * 207000.0 / 30.0)


def test_member_methods():
    # exponential: Wileman fit of one material equals its formula; a mixed stack warns
    r = evaluate(metric_joint(member_stiffness="exponential"))
    assert r.member_stiffness == pytest.approx(wileman_stiffness(207000.0, 12.0, 30.0, 0.78715, 0.62873))
    mixed = metric_joint(member_stiffness="exponential",
                         layers=(steel(15.0), LayerSpec(15.0, 71000.0, material="aluminium",
                                                        wileman=WILEMAN_CONSTANTS["aluminium"])))
    assert any("one-material" in n for n in evaluate(mixed).notes)
    # a value computed elsewhere comes in with its method name
    r = evaluate(metric_joint(member_stiffness="fe", members_value=1.5e6))
    assert (r.member_stiffness, r.stiffness_method) == (1.5e6, "fe")
    with pytest.raises(ValueError):
        evaluate(metric_joint(member_stiffness="vdi"))
    # frustum with a nut-side bearing diameter of its own
    r = evaluate(metric_joint(far_bearing_diameter=20.0))
    assert r.member_stiffness == pytest.approx(frustum_stiffness([(15.0, 207000.0)] * 2, 18.0, 20.0, 12.0))


def test_torque_with_friction_and_scatter():
    # preload from a torque by thread and head friction, nut turned (nut bearing 19 mm);
    # independent wedge form: T = F (d2/2 tan(lambda + rho') + mu_K D_Km/2)
    T, mu = 90000.0, 0.12
    spec = metric_joint(far_bearing_diameter=19.0,
                        preload=PreloadSpec("torque", T, friction_thread=mu, friction_head=mu, scatter=1.6))
    r = evaluate(spec)
    lam = math.atan(1.75 / (math.pi * 10.863))
    rho = math.atan(mu / math.cos(math.pi / 6))
    F = T / (10.863 / 2 * math.tan(lam + rho) + mu * (19.0 + 12.0) / 4)
    assert r.preload == pytest.approx(F, rel=1e-12)
    assert r.tightening["torque"] == T
    # VDI 2230-1 alpha_A = F_max/F_min with the nominal as the mean (our convention)
    assert r.tightening["preload_max"] / r.tightening["preload_min"] == pytest.approx(1.6)
    assert (r.tightening["preload_max"] + r.tightening["preload_min"]) / 2 == pytest.approx(F)


def test_required_factors_and_verdicts():
    base = evaluate(metric_joint())
    n_f = base.n_f
    marginal = evaluate(metric_joint(required={"fatigue": n_f / 1.05}))
    assert marginal.verdict == "marginal" and marginal.governing == "fatigue" and marginal.ok
    failing = evaluate(metric_joint(required={"fatigue": n_f * 1.01}))
    assert failing.verdict == "fail" and failing.governing == "fatigue" and not failing.ok
    assert next(c for c in failing.checks if c.name == "fatigue").required == pytest.approx(n_f * 1.01)


def test_cut_threads_go_the_marin_way():
    # cut threads: Marin with K_f = 3.8 (Table 8-16, high grade) and the machined surface (common practice)
    r = evaluate(metric_joint(fastener=m12(threads="cut")))
    assert r.Se == pytest.approx(4.51 * 1040.0 ** -0.265 * 0.85 * 0.814 * 520.0 / 3.8, rel=1e-12)
    assert r.endurance_method == "marin"


@pytest.mark.parametrize("criterion", ["goodman", "gerber", "asme-elliptic", "soderberg"])
def test_result_document_matches_schema(criterion):
    from geomjoint.report.json_doc import result_document

    results = [evaluate(metric_joint(fatigue=FatigueSpec(criterion=criterion))),
               evaluate(metric_joint(preload=PreloadSpec("none", 0.0))),
               evaluate(metric_joint(load_max=0.0))]
    validate_result(result_document(results, "test"))


def test_design_utilisation_checks_do_not_make_a_joint_marginal():
    # our rule: VDI tightening to nu = 0.9 puts S_F near 1.1 by design; load-driven checks set "marginal"
    from geomjoint.mechanics.checks import MARGINAL_BAND, rate

    near = MARGINAL_BAND - 0.05
    assert rate([Check("working_stress", near, 1.0, True), Check("fatigue", 2.0, 1.0, True)]) == ("pass", "working_stress")
    assert rate([Check("working_stress", 2.0, 1.0, True), Check("fatigue", near, 1.0, True)])[0] == "marginal"
    assert rate([Check("assembly_preload", 0.9, 1.0, False), Check("fatigue", 2.0, 1.0, True)])[0] == "fail"
