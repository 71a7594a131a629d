"""Member stiffness: frustum integral, layered cones, the Wileman fit."""
import doctest
import math

import pytest
from hypothesis import given, settings, strategies as st
from scipy.integrate import quad

from geomjoint.errors import InputError
from geomjoint.mechanics import members
from geomjoint.mechanics.members import (
    WILEMAN_CONSTANTS, frustum_layer_compliance, frustum_stiffness, shigley_frustum_stiffness,
    shigley_two_frusta_stiffness, wileman_layered_stiffness, wileman_stiffness,
)
from geomjoint.mechanics.joint import LayerSpec


def test_docstring_examples():
    assert doctest.testmod(members).failed == 0


@pytest.mark.parametrize("E,t,D,d,alpha", [
    (207000.0, 16.0, 18.0, 13.0, 30.0), (71000.0, 5.0, 24.0, 17.5, 30.0),
    (100000.0, 40.0, 30.0, 21.0, 25.0), (207000.0, 0.5, 9.0, 6.4, 45.0),
])
def test_one_uniform_layer_equals_shigley_eq_8_20(E, t, D, d, alpha):
    # identity: the exact integral over one frustum is Shigley 10th ed., eq. 8-19 (8-20 at 30 deg)
    k_integral = 1.0 / frustum_layer_compliance(E, t, D, d, alpha)
    assert k_integral == pytest.approx(shigley_frustum_stiffness(E, d, D, t, alpha), rel=1e-9)


def test_eq_8_20_printed_constants():
    # Shigley 10th ed., eq. 8-20 as printed: 0.5774 pi E d / ln[(1.155t + D - d)(D + d)/((1.155t + D + d)(D - d))]
    E, d, D, t = 207000.0, 12.0, 18.0, 20.0
    printed = 0.5774 * math.pi * E * d / math.log((1.155 * t + D - d) * (D + d) / ((1.155 * t + D + d) * (D - d)))
    assert shigley_frustum_stiffness(E, d, D, t) == pytest.approx(printed, rel=2e-4)


def test_integral_against_quadrature():
    # independent numerical integration of d(delta) = dx / (E pi (r(x)^2 - (d_h/2)^2))
    E, t, D, dh, alpha = 120000.0, 12.0, 20.0, 13.5, 35.0
    tan_a = math.tan(math.radians(alpha))
    value, _ = quad(lambda x: 1.0 / (E * math.pi * ((D / 2 + x * tan_a) ** 2 - (dh / 2) ** 2)), 0.0, t,
                    epsabs=0.0, epsrel=1e-13)
    assert frustum_layer_compliance(E, t, D, dh, alpha) == pytest.approx(value, rel=1e-10)


def test_general_frustum_against_quadrature_growing_and_shrinking():
    # the one hollow-frustum integral (cones, VDI body and the closed forms call it): independent
    # numerical integration of dz / (E pi (r(z)^2 - r_h^2)), r = r0 + z tan a, any z-range and sign
    E, r_h = 71000.0, 5.5
    for r0, tan_a, z0, z1 in ((9.0, 0.577, 2.0, 14.0), (20.0, -0.4, 3.0, 30.0), (8.0, 1e-7, 0.0, 5.0)):
        value, _ = quad(lambda z: 1.0 / (E * math.pi * ((r0 + z * tan_a) ** 2 - r_h ** 2)), z0, z1,
                        epsabs=0.0, epsrel=1e-13)
        assert members.hollow_frustum_compliance(E, r0, tan_a, r_h, z0, z1) == pytest.approx(value, rel=1e-10)
    with pytest.raises(InputError):
        members.hollow_frustum_compliance(E, 9.0, -0.5, r_h, 0.0, 10.0)   # the cone closes on the hole


def test_limits_cylinder_and_solid_cone():
    # alpha -> 0 is a hollow cylinder; d_h -> 0 is a solid cone (mathematics)
    E, t, D, dh = 207000.0, 10.0, 20.0, 11.0
    assert frustum_layer_compliance(E, t, D, dh, 0.0) == pytest.approx(t / (E * math.pi * (D ** 2 - dh ** 2) / 4))
    assert frustum_layer_compliance(E, t, D, dh, 1e-6) == pytest.approx(
        frustum_layer_compliance(E, t, D, dh, 0.0), rel=1e-6)
    solid = frustum_layer_compliance(E, t, D, 0.0, 30.0)
    tan_a = math.tan(math.radians(30.0))
    value, _ = quad(lambda x: 1.0 / (E * math.pi * (D / 2 + x * tan_a) ** 2), 0.0, t, epsrel=1e-13)
    assert solid == pytest.approx(value, rel=1e-10)


def test_two_equal_layers_equal_shigley_eq_8_22():
    # Shigley 10th ed., eq. 8-22: two equal 30 deg frusta with D = 1.5 d and hole = d
    E, d = 207000.0, 16.0
    for l in (10.0, 32.0, 80.0):
        layers = [(l / 2, E), (l / 2, E)]
        assert frustum_stiffness(layers, 1.5 * d, None, d, 30.0) == pytest.approx(
            shigley_two_frusta_stiffness(E, d, l), rel=1e-9)


def test_splitting_layers_changes_nothing():
    # identity: a stack cut into thinner slices of the same material gives the same k_m
    stack = [(12.0, 207000.0), (7.0, 71000.0), (20.0, 100000.0)]
    sliced = []
    for t, E in stack:
        n = 7
        sliced += [(t / n, E)] * n
    for far in (None, 24.0):
        a = frustum_stiffness(stack, 19.0, far, 13.5, 30.0)
        b = frustum_stiffness(sliced, 19.0, far, 13.5, 30.0)
        assert a == pytest.approx(b, rel=1e-11)


def test_layered_stack_against_quadrature():
    # independent: integrate the compliance along the axis, cone from each face to mid-grip
    stack = [(3.0, 207000.0), (14.0, 71000.0), (9.0, 100000.0)]   # washer, aluminium cover, iron base
    d_w, d_far, dh, alpha = 24.0, 20.0, 13.5, 30.0
    grip = sum(t for t, _ in stack)
    tan_a = math.tan(math.radians(alpha))

    def modulus(x):
        edge = 0.0
        for t, E in stack:
            edge += t
            if x <= edge:
                return E
        return stack[-1][1]

    def integrand(x):
        r = d_w / 2 + x * tan_a if x <= grip / 2 else d_far / 2 + (grip - x) * tan_a
        return 1.0 / (modulus(x) * math.pi * (r * r - dh * dh / 4))

    breaks = [3.0, grip / 2, 17.0]
    value, _ = quad(integrand, 0.0, grip, points=breaks, epsabs=0.0, epsrel=1e-12, limit=200)
    assert frustum_stiffness(stack, d_w, d_far, dh, alpha) == pytest.approx(1.0 / value, rel=1e-9)


def test_layer_objects_and_cut_grip():
    # LayerSpec objects work like pairs; a grip shorter than the stack cuts the last layer there
    objs = [LayerSpec(10.0, 207000.0), LayerSpec(30.0, 100000.0)]
    pairs = [(10.0, 207000.0), (8.0, 100000.0)]
    assert frustum_stiffness(objs, 18.0, 18.0, 12.0, 30.0, grip=18.0) == pytest.approx(
        frustum_stiffness(pairs, 18.0, 18.0, 12.0, 30.0), rel=1e-13)
    with pytest.raises(InputError):
        frustum_stiffness(pairs, 18.0, None, 12.0, 30.0, grip=30.0)
    with pytest.raises(InputError):
        frustum_stiffness(pairs, 12.0, None, 12.0, 30.0)          # bearing face no larger than the hole
    with pytest.raises(InputError):
        frustum_stiffness([(-1.0, 207000.0)], 18.0, None, 12.0)


def test_wileman_fit_values():
    # Wileman, Choudhury & Green (1991) as in Shigley 10th ed., eq. 8-23 / Table 8-8 (from memory):
    # steel A = 0.78715, B = 0.62873; k_m/(E d) = A exp(B d/l)
    A, B = WILEMAN_CONSTANTS["steel"]
    assert (A, B) == (0.78715, 0.62873)
    E, d = 207000.0, 12.0
    # d/l = 1: 0.78715 * e^0.62873 = 1.47609 (hand arithmetic: e^0.62873 = 1.87522)
    assert wileman_stiffness(E, d, d, A, B) / (E * d) == pytest.approx(1.47609, rel=2e-5)
    # d/l = 0.5: 0.78715 * e^0.314365 = 1.07791
    assert wileman_stiffness(E, d, 2 * d, A, B) / (E * d) == pytest.approx(1.07791, rel=2e-5)
    # aluminium (Table 8-8, from memory): A = 0.79670, B = 0.63816
    assert WILEMAN_CONSTANTS["aluminium"] == (0.79670, 0.63816)


def test_wileman_layered_uniform_and_mixed():
    steel = LayerSpec(10.0, 207000.0, wileman=WILEMAN_CONSTANTS["steel"])
    al = LayerSpec(10.0, 71000.0, material="aluminium", wileman=WILEMAN_CONSTANTS["aluminium"])
    d = 10.0
    # a uniform stack is the plain fit
    assert wileman_layered_stiffness([steel, steel], d) == pytest.approx(
        wileman_stiffness(207000.0, d, 20.0, *WILEMAN_CONSTANTS["steel"]), rel=1e-13)
    # a mixed stack lies between the two uniform stacks (series of thickness-weighted shares)
    mixed = wileman_layered_stiffness([steel, al], d)
    assert wileman_stiffness(71000.0, d, 20.0, *WILEMAN_CONSTANTS["aluminium"]) < mixed
    assert mixed < wileman_stiffness(207000.0, d, 20.0, *WILEMAN_CONSTANTS["steel"])



@settings(max_examples=40, deadline=None)
@given(st.lists(st.tuples(st.floats(0.5, 40.0), st.sampled_from([71000.0, 100000.0, 207000.0])),
                min_size=1, max_size=4),
       st.integers(2, 5), st.floats(0.0, 8.0))
def test_slicing_invariance_property(stack, n, extra_far):
    # identity for any stack: slicing every layer into n equal parts leaves k_m unchanged
    sliced = [(t / n, E) for t, E in stack for _ in range(n)]
    a = frustum_stiffness(stack, 18.0, 18.0 + extra_far, 13.0, 30.0)
    b = frustum_stiffness(sliced, 18.0, 18.0 + extra_far, 13.0, 30.0)
    assert a == pytest.approx(b, rel=1e-10)


# ---------------------------------------------------------------- cones bounded by an outside diameter

def test_bounded_frustum_equals_vdi_cone_plus_sleeve():
    """Two cones that meet the outside diameter D_A and go on as a sleeve: the VDI 2230-1
    cone + sleeve closed form (VDI 2230-1:2015 §5.1.2.2, from memory) is the same geometry."""
    from geomjoint.mechanics.members import frustum_stiffness
    from geomjoint.mechanics.vdi import member_resilience_cone_sleeve

    d_W, d_h, D_A, l_K, E, tan_phi = 16.0, 11.0, 24.0, 30.0, 205_000.0, 0.55
    alpha = math.degrees(math.atan(tan_phi))
    ours = 1.0 / frustum_stiffness([(l_K, E)], d_W, None, d_h, alpha, outside_diameter=D_A)
    assert ours == pytest.approx(member_resilience_cone_sleeve(d_W, d_h, D_A, l_K, E, tan_phi, 1.0), rel=1e-12)


def test_bounded_frustum_limits():
    """A very wide part changes nothing; a part no wider than the bearing face is a sleeve
    (identities of the geometry)."""
    from geomjoint.mechanics.members import frustum_stiffness

    layers = [(12.0, 207_000.0), (10.0, 71_000.0)]
    free = frustum_stiffness(layers, 17.0, None, 11.0, 30.0)
    assert frustum_stiffness(layers, 17.0, None, 11.0, 30.0, outside_diameter=1e6) == pytest.approx(free, rel=1e-12)
    narrow = frustum_stiffness(layers, 17.0, None, 11.0, 30.0, outside_diameter=17.0 + 1e-9)
    area = math.pi / 4 * (17.0**2 - 11.0**2)
    sleeve = 1.0 / (12.0 / (207_000.0 * area) + 10.0 / (71_000.0 * area))
    assert narrow == pytest.approx(sleeve, rel=1e-6)
    assert narrow < frustum_stiffness(layers, 17.0, None, 11.0, 30.0, outside_diameter=25.0) < free
