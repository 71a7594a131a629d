"""Bolt-group load share: hand-worked examples, equilibrium and symmetry identities."""
from __future__ import annotations

import numpy as np
import pytest
from scipy.spatial.transform import Rotation

from geomjoint.errors import InputError
from geomjoint.mechanics.pattern import BoltPattern

SQUARE = [(-50.0, -50.0), (50.0, -50.0), (50.0, 50.0), (-50.0, 50.0)]


def test_centred_force_gives_equal_shares():
    # symmetry: a force through the centroid loads every bolt alike
    p = BoltPattern(SQUARE)
    s = p.share(force=(1200.0, -800.0, 6000.0))
    assert s.axial == pytest.approx([1500.0] * 4)
    assert s.shear == pytest.approx([np.hypot(300.0, 200.0)] * 4)


def test_eccentric_shear_hand_example():
    # own example, hand arithmetic (elastic method, Shigley 10th ed. Section 8-12):
    # 4 bolts on a 100 mm square, 10 kN downward (-y) acting 200 mm right of the centroid.
    # direct 2500 N each; T = -2e6 N*mm, J = 4 * (50^2 + 50^2) = 20000 mm^2,
    # torsion |T| r / J = 100 * 70.71 = 7071 N; right-hand bolts: (5000, -7500) -> 9013.9 N,
    # left-hand bolts: (5000, 2500) and (-5000, 2500) -> 5590.2 N
    p = BoltPattern(SQUARE)
    s = p.share(force=(0.0, -10000.0, 0.0), point=(200.0, 0.0, 0.0))
    assert s.shear == pytest.approx([5590.17, 9013.88, 9013.88, 5590.17], abs=0.01)
    assert s.shear_vectors[2][:2] == pytest.approx([5000.0, -7500.0])
    assert s.axial == pytest.approx([0.0] * 4, abs=1e-9)


def test_bracket_on_wall_centroid_and_heel():
    # own example, hand arithmetic: a bracket on a wall (normal +x out of the wall), bolts at
    # heights 50 and 150 mm (two per row, z = +-40), 10 kN down acting 200 mm out from the wall
    bolts = [(0.0, 50.0, -40.0), (0.0, 50.0, 40.0), (0.0, 150.0, -40.0), (0.0, 150.0, 40.0)]
    p = BoltPattern(bolts, normal=(1.0, 0.0, 0.0))
    load = dict(force=(0.0, -10000.0, 0.0), point=(200.0, 100.0, 0.0))
    # about the centroid: M = 2e6 N*mm, I = 4 * 50^2 = 10000 mm^2 -> +-10000 N
    s = p.share(**load)
    assert s.axial == pytest.approx([-10000.0, -10000.0, 10000.0, 10000.0])
    assert s.shear == pytest.approx([2500.0] * 4)
    # tipping about the lower edge (y = 0, along z): F_i = M d_i / sum d^2 = 2e6 d / 50000
    heel = p.share(**load, heel=((0.0, 0.0, 0.0), (0.0, 0.0, 1.0)))
    assert heel.axial == pytest.approx([2000.0, 2000.0, 6000.0, 6000.0])
    # the heel's direction sense does not matter
    flipped = p.share(**load, heel=((0.0, 0.0, 0.0), (0.0, 0.0, -1.0)))
    assert flipped.axial == pytest.approx(heel.axial)


def _random_case(seed):
    rng = np.random.default_rng(seed)
    pts = rng.uniform(-120, 120, size=(7, 2))
    force = rng.uniform(-5000, 5000, size=3)
    moment = rng.uniform(-4e5, 4e5, size=3)
    point = rng.uniform(-200, 200, size=3)
    return pts, force, moment, point


@pytest.mark.parametrize("seed", [1, 2, 3])
def test_shares_are_in_equilibrium_for_a_general_pattern(seed):
    # identity (statics): the shares add up to the applied force and, about the centroid,
    # to the applied moment; an unsymmetric pattern has I_xy != 0 and is handled in general
    pts, F, M, P = _random_case(seed)
    pat = BoltPattern(pts)
    assert abs(pat.second_moments()[2]) > 1.0
    s = pat.share(force=F, moment=M, point=P)
    n = pat.normal
    r = pat.points - pat.centroid
    total_force = s.axial.sum() * n + s.shear_vectors.sum(axis=0)
    assert total_force == pytest.approx(F, abs=1e-6)
    total_moment = np.sum(np.cross(r, s.axial[:, None] * n + s.shear_vectors), axis=0)
    applied = M + np.cross(P - pat.centroid, F)
    assert total_moment == pytest.approx(applied, rel=1e-9, abs=1e-3)


def test_centred_force_has_no_net_moment():
    # identity: shares of a force at the centroid carry zero moment about it
    pts, F, _, _ = _random_case(4)
    pat = BoltPattern(pts)
    s = pat.share(force=F)
    r = pat.points - pat.centroid
    m = np.sum(np.cross(r, s.axial[:, None] * pat.normal + s.shear_vectors), axis=0)
    assert m == pytest.approx([0.0, 0.0, 0.0], abs=1e-6)


def test_rotating_everything_changes_nothing():
    # identity: the shares do not depend on the model's orientation
    pts, F, M, P = _random_case(5)
    base = BoltPattern(pts).share(force=F, moment=M, point=P)
    R = Rotation.from_euler("xyz", [30, -50, 110], degrees=True).as_matrix()
    pts3 = np.column_stack([pts, np.zeros(len(pts))]) @ R.T
    turned = BoltPattern(pts3, normal=R @ np.array([0.0, 0.0, 1.0])).share(force=R @ F, moment=R @ M, point=R @ P)
    assert turned.axial == pytest.approx(base.axial, rel=1e-9, abs=1e-6)
    assert turned.shear == pytest.approx(base.shear, rel=1e-9, abs=1e-6)


def test_principal_axes_of_a_rectangle():
    # a 2 x 3 grid of pitch 100 x 60, hand arithmetic about the centroid (50, 60)
    pts = [(x, y) for x in (0.0, 100.0) for y in (0.0, 60.0, 120.0)]
    values, axes = BoltPattern(pts).principal_axes()
    # sum y^2 = 2 * (2 * 60^2) = 14400, sum x^2 = 6 * 50^2 = 15000
    assert values == pytest.approx([14400.0, 15000.0])
    assert abs(axes[1] @ np.array([1.0, 0.0, 0.0])) == pytest.approx(1.0)


def test_two_bolts_in_line_carry_no_moment_about_their_line():
    p = BoltPattern([(0.0, 0.0), (100.0, 0.0)])
    # a moment about y (tips along x) is carried: f = M x / sum x^2 = 5000 * 50 / 5000 = 50 N
    s = p.share(moment=(0.0, -5000.0, 0.0), point=(50.0, 0.0, 0.0))
    assert s.axial == pytest.approx([-50.0, 50.0])
    with pytest.raises(InputError, match="one line"):
        p.share(moment=(5000.0, 0.0, 0.0), point=(50.0, 0.0, 0.0))


@pytest.mark.parametrize("positions", [[(0.0, 0.0)], [(0.0, 0.0), (0.0, 0.0), (10.0, 0.0)], []])
def test_bad_groups(positions):
    with pytest.raises(InputError, match="group.positions"):
        BoltPattern(positions)


def test_moment_without_point_is_an_error():
    with pytest.raises(InputError, match="load.point"):
        BoltPattern(SQUARE).share(force=(0, 0, 100.0), moment=(10.0, 0.0, 0.0))


def test_share_range_orders_min_and_max_per_bolt():
    # own example: a moment that reverses sign between the two cases swaps the bolts' roles
    p = BoltPattern([(0.0, 0.0), (100.0, 0.0)])
    rows = p.share_range(force_min=(0, 0, 0.0), force_max=(0, 0, 2000.0),
                         moment_min=(0.0, 5000.0, 0.0), moment_max=(0.0, -5000.0, 0.0), point=(50.0, 0.0, 0.0))
    # case min: axial = (+50, -50); case max: 1000 + (-50, +50)
    assert rows[0][:2] == pytest.approx((50.0, 950.0))
    assert rows[1][:2] == pytest.approx((-50.0, 1050.0))
