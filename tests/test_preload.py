"""Preload and tightening torque."""
import doctest
import math

import pytest

from geomjoint.errors import InputError
from geomjoint.mechanics import preload
from geomjoint.mechanics.preload import (
    equivalent_nut_factor, head_torque, preload_for_torque_friction, preload_for_torque_nut_factor,
    preload_from_proof, preload_scatter, proof_load, thread_torque, torque_friction, torque_nut_factor,
)

# ISO 724 basic pitch diameters d2 = d - 0.6495 P (M12: 10.863, M8: 7.188, M20: 18.376)
M12 = dict(d=12.0, d2=10.863, P=1.75)


def test_docstring_examples():
    assert doctest.testmod(preload).failed == 0


def test_proof_load_iso_898_1():
    # ISO 898-1:2013 Table 5 (from memory): M12 class 10.9 proof load 70 000 N, M10 class 8.8 33 700 N;
    # stress areas 84.3 and 58.0 mm^2 (ISO 898-1 Table 4)
    assert proof_load(84.3, 830.0) == pytest.approx(70000.0, rel=2e-3)
    assert proof_load(58.0, 580.0) == pytest.approx(33700.0, rel=2e-3)
    # Shigley 10th ed., eq. 8-31: F_i = 0.75 F_p for reused joints
    assert preload_from_proof(0.75, 84.3, 830.0) == pytest.approx(0.75 * 84.3 * 830.0)
    with pytest.raises(InputError):
        preload_from_proof(1.2, 84.3, 830.0)


def test_nut_factor_torque():
    # Shigley 10th ed., eq. 8-27: T = K F_i d; K = 0.2
    assert torque_nut_factor(40000.0, 12.0, 0.2) == pytest.approx(0.2 * 40000.0 * 12.0)
    assert preload_for_torque_nut_factor(torque_nut_factor(40000.0, 12.0, 0.2), 12.0, 0.2) == pytest.approx(40000.0)


def test_frictionless_thread_is_pure_lifting_work():
    # energy: without friction one turn lifts the load by one lead, T 2 pi = F P
    F = 30000.0
    assert thread_torque(F, M12["d2"], M12["P"], 0.0) * 2 * math.pi == pytest.approx(F * M12["P"], rel=1e-13)


def test_thread_torque_equals_wedge_form():
    # independent: the inclined-plane form T_G = F d2/2 tan(lambda + rho'), tan rho' = mu / cos 30 deg
    # (VDI 2230-1:2015, eq. R13 / Sec. 5.4.3, from memory) is the same relation written with angles
    F, mu = 30000.0, 0.14
    lam = math.atan(M12["P"] / (math.pi * M12["d2"]))
    rho = math.atan(mu / math.cos(math.radians(30.0)))
    expected = F * M12["d2"] / 2 * math.tan(lam + rho)
    assert thread_torque(F, M12["d2"], M12["P"], mu) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize("d,d2,P,dw,dh,mu_g,mu_k", [
    (12.0, 10.863, 1.75, 16.6, 13.5, 0.12, 0.12),
    (8.0, 7.188, 1.25, 11.6, 9.0, 0.10, 0.14),
    (20.0, 18.376, 2.5, 28.2, 22.0, 0.16, 0.12),
])
def test_torque_against_vdi_approximation(d, d2, P, dw, dh, mu_g, mu_k):
    # VDI 2230-1:2015, eq. (R13) rounded form (from memory): M_A = F (0.16 P + 0.58 d2 mu_G + D_Km/2 mu_K);
    # it drops the small second-order term, so the two agree to about 1 %
    F = 25000.0
    approx = F * (0.16 * P + 0.58 * d2 * mu_g + (dw + dh) / 4 * mu_k)
    assert torque_friction(F, d2, P, dw, dh, mu_g, mu_k) == pytest.approx(approx, rel=0.015)
    # and the head term alone is exact
    assert head_torque(F, dw, dh, mu_k) == pytest.approx(F * mu_k * (dw + dh) / 4)


@pytest.mark.parametrize("d,d2,P,dw,dh", [
    (8.0, 7.188, 1.25, 11.6, 9.0), (12.0, 10.863, 1.75, 16.6, 13.5), (20.0, 18.376, 2.5, 28.2, 22.0),
    (12.7, 11.23, 25.4 / 13, 19.05, 13.5),      # 1/2-13 UNC, ASME B1.1 basic pitch diameter 0.4500 in
])
def test_friction_015_gives_nut_factor_about_02(d, d2, P, dw, dh):
    # Shigley 10th ed., Sec. 8-8 (from memory): with f = f_c = 0.15, K is about 0.20 whatever the size
    assert equivalent_nut_factor(d, d2, P, dw, dh, 0.15, 0.15) == pytest.approx(0.20, abs=0.01)


def test_friction_inverse_round_trip():
    F = 41234.0
    T = torque_friction(F, M12["d2"], M12["P"], 18.0, 13.0, 0.12, 0.16)
    assert preload_for_torque_friction(T, M12["d2"], M12["P"], 18.0, 13.0, 0.12, 0.16) == pytest.approx(F, rel=1e-13)


def test_scatter_band():
    # VDI 2230-1 definition alpha_A = F_max / F_min; our convention: the nominal preload is the mean
    lo, hi = preload_scatter(30000.0, 1.6)
    assert hi / lo == pytest.approx(1.6)
    assert (lo + hi) / 2 == pytest.approx(30000.0)
    assert preload_scatter(30000.0, 1.0) == (30000.0, 30000.0)
    with pytest.raises(InputError):
        preload_scatter(30000.0, 0.9)
