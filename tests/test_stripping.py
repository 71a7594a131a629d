"""Thread stripping: ISO 965 / ASME B1.1 limits, shear-area identities, engagement rules of practice."""
from __future__ import annotations

import math

import pytest

from geomjoint.errors import InputError
from geomjoint.mechanics import stripping as st
from geomjoint.mechanics.joint import FastenerSpec, JointSpec, LayerSpec

# ISO 965-2 limits of size, 6g external / 6H internal, mm (from memory):
# d: (P, d_max, d_min, d2_max, d2_min, D1_min, D1_max, D2_min, D2_max)
ISO965_TABLE = {
    8: (1.25, 7.972, 7.760, 7.160, 7.042, 6.647, 6.912, 7.188, 7.348),
    10: (1.5, 9.968, 9.732, 8.994, 8.862, 8.376, 8.676, 9.026, 9.206),
    12: (1.75, 11.966, 11.701, 10.829, 10.679, 10.106, 10.441, 10.863, 11.063),
    16: (2.0, 15.962, 15.682, 14.663, 14.503, 13.835, 14.210, 14.701, 14.913),
    20: (2.5, 19.958, 19.623, 18.334, 18.164, 17.294, 17.744, 18.376, 18.600),
}


@pytest.mark.parametrize("d", sorted(ISO965_TABLE))
def test_iso965_limits_against_table(d):
    P, *table = ISO965_TABLE[d]
    lim = st.iso965_limits(float(d), P)
    got = [lim.d_max, lim.d_min, lim.d2_max, lim.d2_min, lim.D1_min, lim.D1_max, lim.D2_min, lim.D2_max]
    # ISO 965-2 (from memory); the formulas are evaluated without the standard's rounding,
    # which moves a limit by up to ~15 um (< 1 % of any shear area)
    assert got == pytest.approx(table, abs=0.015)


@pytest.mark.parametrize("D_in,tpi,table", [
    # ASME B1.1 Table 2 (from memory): 2A major max/min, pitch max/min; 2B minor min/max, pitch min/max, in
    (0.5, 13, (0.4985, 0.4876, 0.4485, 0.4435, 0.417, 0.434, 0.4500, 0.4565)),
    (0.25, 20, (0.2489, 0.2408, 0.2164, 0.2127, 0.196, 0.207, 0.2175, 0.2224)),
])
def test_unified_limits_against_table(D_in, tpi, table):
    lim = st.unified_limits(D_in * 25.4, 25.4 / tpi)
    got = [x / 25.4 for x in (lim.d_max, lim.d_min, lim.d2_max, lim.d2_min,
                              lim.D1_min, lim.D1_max, lim.D2_min, lim.D2_max)]
    assert got == pytest.approx(table, abs=0.0006)


@pytest.mark.parametrize("D,d2,P", [(8.376, 9.026, 1.5), (10.106, 10.863, 1.75), (9.0, 9.026, 1.5)])
def test_shear_areas_fill_the_cylinder_at_basic_size(D, d2, P):
    # identity of the 60 deg profile: at one diameter the bolt's and the nut's teeth, both at
    # basic pitch diameter, share the cylinder pi D L_e without gap or overlap
    L = 12.0
    ext = st.external_shear_area(L, P, D, d2)
    inner = st.internal_shear_area(L, P, D, d2)
    assert ext + inner == pytest.approx(math.pi * D * L, rel=1e-12)


def test_external_area_hand_value():
    # FED-STD-H28/2B formula (from memory), hand arithmetic for M10 6g/6H table limits, 8 mm:
    # pi * 8 * 8.676 * (0.5 + (8.862 - 8.676) / (1.5 * sqrt 3)) = 218.06 * 0.57159 = 124.6
    assert st.external_shear_area(8.0, 1.5, 8.676, 8.862) == pytest.approx(124.6, abs=0.1)


@pytest.mark.parametrize("d,P,A_s,R_m,m_min", [
    # ISO 4032 style-1 nut heights m_min (from memory), ISO 898-1 A_s, R_m of 8.8 / 10.9
    (8.0, 1.25, 36.6, 800.0, 6.44),
    (10.0, 1.5, 58.0, 800.0, 8.04),
    (12.0, 1.75, 84.3, 800.0, 10.37),
    (16.0, 2.0, 157.0, 1040.0, 14.1),
    (20.0, 2.5, 245.0, 1040.0, 16.9),
])
def test_matching_iso4032_nut_does_not_strip_before_bolt_breaks(d, P, A_s, R_m, m_min):
    # ISO 898-2 design intent: a nut of the matching class and ISO 4032 height lets the bolt break
    r = st.thread_stripping(d, P, "metric", A_s, R_m, R_m, m_min)
    assert r.margin > 1.0
    assert r.minimum_engagement < m_min
    # and a nut of half height (a thin nut, ISO 4035) would not (ISO 898-2 class 04/05 rationale)
    half = st.thread_stripping(d, P, "metric", A_s, R_m, R_m, 0.5 * m_min)
    assert half.margin < 1.0


@pytest.mark.parametrize("d,P,A_s", [(6.0, 1.0, 20.1), (10.0, 1.5, 58.0), (16.0, 2.0, 157.0), (20.0, 2.5, 245.0)])
@pytest.mark.parametrize("R_m_bolt", [800.0, 1040.0])
def test_engagement_rules_of_practice(d, P, A_s, R_m_bolt):
    # common practice: a steel screw needs about 2 d in aluminium (R_m ~ 250 MPa) and about
    # 1 d in structural steel (R_m ~ 450 MPa)
    in_al = st.thread_stripping(d, P, "metric", A_s, R_m_bolt, 250.0, d).minimum_engagement / d
    in_steel = st.thread_stripping(d, P, "metric", A_s, R_m_bolt, 450.0, d).minimum_engagement / d
    assert 1.2 < in_al < 2.5
    assert 0.6 < in_steel < 1.3
    assert in_al > 1.5 * in_steel


def _spec(**over) -> JointSpec:
    fastener = FastenerSpec(designation="M10", system="metric", d=10.0, pitch=1.5, d2=9.026, d3=8.160,
                            D1=8.376, stress_area=58.0, grade="8.8", proof=580.0, yield_strength=640.0,
                            tensile=800.0, length=40.0)
    base = dict(id="S1", fastener=fastener,
                layers=(LayerSpec(thickness=12.0, E=205_000.0),
                        LayerSpec(thickness=30.0, E=70_000.0, material="aluminium", role="tapped",
                                  tensile_strength=250.0)),
                bearing_diameter=14.63, hole_diameter=11.0, tapped=True)
    base.update(over)
    return JointSpec(**base)


def test_stripping_check_tapped_aluminium():
    # 40 mm screw under 12 mm clamped: 28 mm engaged (> ~14 mm needed) -> passes
    c = st.stripping_check(_spec())
    assert c.name == "stripping" and c.ok and c.value > 1.0
    assert "28.0 mm" in c.note
    short = st.stripping_check(_spec(engagement=8.0))
    assert not short.ok and short.value == pytest.approx(
        st.thread_stripping(10.0, 1.5, "metric", 58.0, 800.0, 250.0, 8.0).margin)


def test_stripping_check_through_nut_and_unknowns():
    layers = (LayerSpec(thickness=12.0, E=205_000.0), LayerSpec(thickness=12.0, E=205_000.0))
    assert st.stripping_check(_spec(layers=layers, tapped=False, nut_height=8.4)).ok
    unknown = st.stripping_check(_spec(layers=layers, tapped=False))
    assert unknown.value is None and "not checked" in unknown.note


def test_inch_stripping_runs_and_scales_with_engagement():
    # 1/2-13 UNC SAE 5 (A_t = 0.1419 in^2, S_ut = 120 ksi; ASME B1.1 / SAE J429, from memory)
    A_t = 0.1419 * 25.4**2
    r1 = st.thread_stripping(12.7, 25.4 / 13, "inch", A_t, 827.4, 827.4, 10.0)
    r2 = st.thread_stripping(12.7, 25.4 / 13, "inch", A_t, 827.4, 827.4, 20.0)
    assert r2.external_strip == pytest.approx(2 * r1.external_strip)
    assert r1.limits.tolerance == "2A/2B"
    # a hex nut of height 7/16 in (ASME B18.2.2, from memory) of matching strength holds the bolt
    assert st.thread_stripping(12.7, 25.4 / 13, "inch", A_t, 827.4, 827.4, 7 / 16 * 25.4).margin > 1.0


def test_bad_inputs():
    with pytest.raises(InputError):
        st.thread_limits(10.0, 1.5, "whitworth")
    with pytest.raises(InputError):
        st.iso965_limits(500.0, 6.0)
    with pytest.raises(InputError):
        st.shear_strength(0.0)
