"""Bolt side: thread length rule, effective grip, lengths in the grip, bolt stiffness."""
import doctest
import math

import pytest

from geomjoint.errors import InputError
from geomjoint.mechanics import bolt
from geomjoint.mechanics.bolt import (
    INCH, bolt_stiffness, effective_grip, grip_lengths, shank_area, thread_length_rule, unthreaded_length,
)


def test_docstring_examples():
    assert doctest.testmod(bolt).failed == 0


@pytest.mark.parametrize("d,L,expected", [
    # ISO 4014, b (ref) column (from memory): M12 30 / 36 / 49, M16 38 / 44 / 57, M20 46 / 52 / 65
    (12.0, 50.0, 30.0), (12.0, 150.0, 36.0), (12.0, 220.0, 49.0),
    (16.0, 80.0, 38.0), (16.0, 180.0, 44.0), (16.0, 240.0, 57.0),
    (20.0, 125.0, 46.0), (20.0, 200.0, 52.0), (20.0, 200.5, 65.0),
])
def test_metric_thread_length(d, L, expected):
    assert thread_length_rule(d, L, "metric") == pytest.approx(expected, abs=1e-12)


@pytest.mark.parametrize("d_in,L_in,expected_in", [
    # Shigley 10th ed., Table 8-7 footnote / ASME B18.2.1 (from memory): 2d + 1/4 in up to 6 in, 2d + 1/2 in above
    (0.5, 2.0, 1.25), (0.625, 6.0, 1.5), (0.625, 6.5, 1.75), (1.0, 8.0, 2.5),
])
def test_inch_thread_length(d_in, L_in, expected_in):
    assert thread_length_rule(d_in * INCH, L_in * INCH, "inch") == pytest.approx(expected_in * INCH, rel=1e-12)


def test_thread_length_bad_input():
    with pytest.raises(InputError):
        thread_length_rule(12.0, 50.0, "whitworth")
    with pytest.raises(InputError):
        thread_length_rule(-1.0, 50.0, "metric")


def test_effective_grip_table_8_7():
    # Shigley 10th ed., Table 8-7: l' = h + t2/2 for t2 < d, h + d/2 for t2 >= d
    assert effective_grip(15.0, 10.0, 12.0) == pytest.approx(15.0 + 5.0)
    assert effective_grip(15.0, 12.0, 12.0) == pytest.approx(15.0 + 6.0)
    assert effective_grip(15.0, 40.0, 12.0) == pytest.approx(15.0 + 6.0)
    assert effective_grip(32.0, None, 12.0) == 32.0


def test_unthreaded_and_grip_lengths():
    # Shigley 10th ed., Table 8-7: l_d = L - L_T, l_t = l - l_d
    assert unthreaded_length(60.0, 30.0) == 30.0
    assert unthreaded_length(25.0, 30.0) == 0.0            # threaded to the head
    assert unthreaded_length(60.0, 30.0, fully_threaded=True) == 0.0
    assert grip_lengths(40.0, 30.0) == (30.0, 10.0)
    assert grip_lengths(20.0, 30.0) == (20.0, 0.0)          # shank longer than grip: cut (length check fails)


def test_bolt_stiffness_is_two_springs_in_series():
    # mathematics: 1/k_b = l_d/(A_d E) + l_t/(A_t E) is eq. 8-17 rearranged
    A_d, A_t, E, l_d, l_t = shank_area(16.0), 157.0, 207000.0, 22.0, 9.0
    k = bolt_stiffness(A_d, A_t, E, l_d, l_t)
    assert 1.0 / k == pytest.approx(l_d / (A_d * E) + l_t / (A_t * E), rel=1e-13)
    # the limits: all shank, all thread
    assert bolt_stiffness(A_d, A_t, E, 31.0, 0.0) == pytest.approx(A_d * E / 31.0, rel=1e-13)
    assert bolt_stiffness(A_d, A_t, E, 0.0, 31.0) == pytest.approx(A_t * E / 31.0, rel=1e-13)
    assert shank_area(16.0) == pytest.approx(math.pi * 64.0)
    with pytest.raises(InputError):
        bolt_stiffness(A_d, A_t, E, 0.0, 0.0)


def test_cap_screw_lengths_inch():
    # Setup after Shigley 10th ed., Ex. 8-5 (from memory): 5/8-11 UNC cap screw, 1/16 in washer,
    # 5/8 in steel cover into a cast-iron base of 5/8 in; L = 1.75 in (our choice).
    # Hand arithmetic: h = 0.6875 in, t2 = d -> l' = h + d/2 = 1.0 in; L_T = 2d + 1/4 = 1.5 in;
    # l_d = 0.25 in, l_t = 0.75 in; A_d = 0.3068 in^2, A_t = 0.226 in^2 (ASME B1.1);
    # k_b = 0.3068 * 0.226 * 30e6 / (0.3068 * 0.75 + 0.226 * 0.25) = 7.258e6 lbf/in
    d = 0.625 * INCH
    l_eff = effective_grip(0.6875 * INCH, 0.625 * INCH, d)
    assert l_eff / INCH == pytest.approx(1.0)
    L_T = thread_length_rule(d, 1.75 * INCH, "inch")
    assert L_T / INCH == pytest.approx(1.5)
    l_d, l_t = grip_lengths(l_eff, unthreaded_length(1.75 * INCH, L_T))
    assert (l_d / INCH, l_t / INCH) == pytest.approx((0.25, 0.75))
    lbf_per_in = 4.4482216152605 / 25.4      # N/mm per lbf/in
    k_b = bolt_stiffness(shank_area(d), 0.226 * INCH ** 2, 30e6 * 0.0068947572932, l_d, l_t)
    by_hand = 0.3068 * 0.226 * 30e6 / (0.3068 * 0.75 + 0.226 * 0.25)
    assert k_b / lbf_per_in == pytest.approx(by_hand, rel=2e-4)
    assert by_hand == pytest.approx(7.258e6, rel=1e-3)
