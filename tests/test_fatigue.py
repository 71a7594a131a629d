"""Fatigue: standard tables, Marin endurance, bolt stresses, fatigue factor on the load line."""
import doctest
import math

import pytest
from scipy.optimize import brentq

from geomjoint.catalog import fatigue as cat
from geomjoint.errors import InputError
from geomjoint.mechanics import fatigue
from geomjoint.mechanics.fatigue import (
    bolt_endurance, bolt_stresses, fatigue_factor, load_line_strength, marin_endurance, rotating_beam_endurance,
    surface_factor,
)

KPSI = 6.894757


def test_docstring_examples():
    assert doctest.testmod(fatigue).failed == 0
    assert doctest.testmod(cat).failed == 0


# ---------------------------------------------------------------- tables

def test_reliability_table_6_5():
    # Shigley 10th ed., Table 6-5 (from memory)
    published = {0.5: 1.000, 0.9: 0.897, 0.95: 0.868, 0.99: 0.814, 0.999: 0.753,
                 0.9999: 0.702, 0.99999: 0.659, 0.999999: 0.620}
    assert cat.reliability_table() == published
    for r, k in published.items():
        assert cat.reliability_factor(r) == k
        # Shigley eq. 6-29, k_e = 1 - 0.08 z_a, reproduces the table to its last digit
        assert cat.reliability_factor_formula(r) == pytest.approx(k, abs=6e-4)
    # between table rows the formula is used: z(0.98) = 2.054 -> 0.836
    assert cat.reliability_factor(0.98) == pytest.approx(1 - 0.08 * 2.0537, abs=1e-4)
    with pytest.raises(InputError):
        cat.reliability_factor(1.0)


def test_surface_factor_table_6_2():
    # Shigley 10th ed., Table 6-2 (from memory), S_ut in MPa
    assert cat.surface_constants("machined") == (4.51, -0.265)
    assert cat.surface_constants("cold-drawn") == (4.51, -0.265)
    assert cat.surface_constants("ground") == (1.58, -0.085)
    assert cat.surface_constants("hot-rolled") == (57.7, -0.718)
    assert cat.surface_constants("as-forged") == (272.0, -0.995)
    # the kpsi and MPa columns must give the same k_a: a_MPa = a_kpsi * 6.894757^(-b) (unit conversion)
    for finish in ("ground", "machined", "hot-rolled", "as-forged"):
        a_mpa, b = cat.surface_constants(finish, "MPa")
        a_kpsi, _ = cat.surface_constants(finish, "kpsi")
        assert a_mpa == pytest.approx(a_kpsi * KPSI ** (-b), rel=5e-3)
    # Shigley 10th ed., Ex. 6-3 (from memory): S_ut = 520 MPa, machined -> k_a = 0.860
    assert surface_factor(520.0, "machined") == pytest.approx(0.860, abs=5e-4)
    with pytest.raises(InputError):
        cat.surface_constants("polished-ish")


def test_temperature_factor_eq_6_27_against_table_6_4():
    # Shigley 10th ed., Table 6-4 S_T/S_RT (from memory) vs the eq. 6-27 polynomial fit of it
    table_f = {70: 1.000, 100: 1.008, 200: 1.020, 300: 1.024, 400: 1.018, 500: 0.995,
               600: 0.963, 700: 0.927, 800: 0.872, 900: 0.797, 1000: 0.698}
    for t_f, k in table_f.items():
        assert cat.temperature_factor((t_f - 32) / 1.8) == pytest.approx(k, abs=6e-3)
    assert cat.temperature_factor(-20.0) == 1.0        # below 70 degF: 1.0 by our rule
    with pytest.raises(InputError):
        cat.temperature_factor(600.0)                  # above 1000 degF


def test_thread_kf_table_8_16():
    # Shigley 10th ed., Table 8-16 (from memory)
    assert cat.thread_kf("10.9", "cut")[0] == 3.8      # common practice: cut thread on a high-grade bolt ~3.8
    assert cat.thread_kf("8.8", "rolled")[0] == 3.0
    assert cat.thread_kf("SAE 5", "fillet")[0] == 2.3
    assert cat.thread_kf("SAE 2", "cut")[0] == 2.8
    assert cat.thread_kf("4.6", "rolled")[0] == 2.2
    assert cat.thread_kf("5.8", "fillet")[0] == 2.1
    assert cat.thread_kf("12.9", "cut") == (3.8, "high")   # our convention: above 10.9 -> high-grade row
    assert cat.thread_kf("A4-80", "rolled", 800.0) == (3.0, "high")   # by tensile strength (our rule)
    assert cat.thread_kf("A2-50", "rolled", 500.0) == (2.2, "low")
    with pytest.raises(InputError):
        cat.thread_kf("10.9", "milled")


def test_table_8_17_endurance():
    # Shigley 10th ed., Table 8-17 (from memory)
    assert cat.table_endurance("8.8", 20.0).Se == 129.0
    assert cat.table_endurance("9.8", 10.0).Se == 140.0
    assert cat.table_endurance("class 10.9", 12.0).Se == 162.0
    assert cat.table_endurance("12.9", 30.0).Se == 190.0
    assert cat.table_endurance("SAE 5", 0.5 * 25.4).Se == pytest.approx(18.6 * KPSI)
    assert cat.table_endurance("SAE grade 5", 1.25 * 25.4).Se == pytest.approx(16.3 * KPSI)
    assert cat.table_endurance("SAE 7", 25.4).Se == pytest.approx(20.6 * KPSI)
    assert cat.table_endurance("SAE 8", 25.4).Se == pytest.approx(23.2 * KPSI)
    # nearest row outside the range (our convention, bolt_endurance docstring)
    row = cat.table_endurance("8.8", 12.0)
    assert (row.Se, row.in_range) == (129.0, False)
    assert cat.table_endurance("10.9", 4.0).in_range is False
    assert cat.table_endurance("6.8", 12.0) is None


# ---------------------------------------------------------------- endurance

def test_marin_endurance():
    # Shigley 10th ed., eq. 6-8: S_e' = 0.5 S_ut up to 1400 MPa, 700 MPa above
    assert rotating_beam_endurance(1000.0) == 500.0
    assert rotating_beam_endurance(1500.0) == 700.0
    # eq. 6-18 with axial k_c = 0.85 (eq. 6-26) and K_f on the strength; hand arithmetic
    S_ut = 830.0
    k_a = 4.51 * S_ut ** -0.265
    expected = k_a * 1.0 * 0.85 * 1.0 * 0.814 * 415.0 / 3.0
    assert marin_endurance(S_ut, k_a, 1.0, 0.814, 3.0) == pytest.approx(expected, rel=1e-13)


def test_bolt_endurance_paths():
    table = bolt_endurance("10.9", 12.0, 1040.0, "rolled")
    assert (table.Se, table.method) == (162.0, "table")
    cut = bolt_endurance("10.9", 12.0, 1040.0, "cut")
    assert cut.method == "marin"
    assert cut.factors["K_f"] == 3.8                   # Table 8-16, cut, high grade
    # machined surface factor applies to cut threads (common practice)
    assert cut.Se == pytest.approx(4.51 * 1040.0 ** -0.265 * 0.85 * 0.814 * 520.0 / 3.8, rel=1e-12)
    unlisted = bolt_endurance("6.8", 12.0, 600.0, "rolled")
    assert unlisted.method == "marin"
    assert unlisted.factors["K_f"] == 3.0              # 6.8 lies in Table 8-16's 6.6-10.9 row
    assert any("Table 8-17" in n for n in unlisted.notes)
    nearest = bolt_endurance("8.8", 10.0, 800.0, "rolled")
    assert nearest.Se == 129.0 and any("nearest row" in n for n in nearest.notes)
    assert bolt_endurance("8.8", 20.0, 830.0, endurance="marin").method == "marin"
    assert bolt_endurance("8.8", 20.0, 830.0, Se=100.0).Se == 100.0
    hot = bolt_endurance("8.8", 20.0, 830.0, endurance="marin", temperature=(800 - 32) / 1.8, reliability=0.9)
    cold = bolt_endurance("8.8", 20.0, 830.0, endurance="marin", reliability=0.9)
    assert hot.Se / cold.Se == pytest.approx(cat.temperature_factor((800 - 32) / 1.8), rel=1e-12)
    with pytest.raises(InputError):
        bolt_endurance("6.8", 12.0, 600.0, endurance="table")


# ---------------------------------------------------------------- stresses and criteria

def test_stresses_with_and_without_preload():
    A_t, C = 84.3, 0.3
    s_i, s_a, s_m = bolt_stresses(40000.0, C, 2000.0, 12000.0, A_t)
    assert s_i == pytest.approx(40000.0 / A_t)
    assert s_a == pytest.approx(C * 10000.0 / (2 * A_t))
    assert s_m == pytest.approx(40000.0 / A_t + C * 14000.0 / (2 * A_t))
    # no preload: the bolt takes the whole external load, C is not used
    s_i, s_a, s_m = bolt_stresses(0.0, C, 2000.0, 12000.0, A_t)
    assert (s_i, s_a, s_m) == pytest.approx((0.0, 10000.0 / (2 * A_t), 14000.0 / (2 * A_t)))
    with pytest.raises(InputError):
        bolt_stresses(0.0, C, 5.0, 1.0, A_t)


SE, SUT, SP, SY = 162.0, 1040.0, 830.0, 940.0


@pytest.mark.parametrize("sigma_i", [0.0, 300.0, 622.5, 780.0])
def test_pmin_zero_reduces_to_shigley_eqs_8_38_to_8_40(sigma_i):
    # Shigley 10th ed., eqs. 8-38 (Goodman), 8-39 (Gerber), 8-40 (ASME-elliptic), from memory
    goodman = SE * (SUT - sigma_i) / (SUT + SE)
    gerber = (SUT * math.sqrt(SUT ** 2 + 4 * SE * (SE + sigma_i)) - SUT ** 2 - 2 * sigma_i * SE) / (2 * SE)
    elliptic = SE / (SP ** 2 + SE ** 2) * (SP * math.sqrt(SP ** 2 + SE ** 2 - sigma_i ** 2) - sigma_i * SE)
    assert load_line_strength("goodman", SE, sigma_i, 1.0, SUT) == pytest.approx(goodman, rel=1e-12)
    assert load_line_strength("gerber", SE, sigma_i, 1.0, SUT) == pytest.approx(gerber, rel=1e-10)
    assert load_line_strength("asme-elliptic", SE, sigma_i, 1.0, SUT, SP) == pytest.approx(elliptic, rel=1e-10)
    # Soderberg is Goodman with S_y
    assert load_line_strength("soderberg", SE, sigma_i, 1.0, SUT, SP, SY) == pytest.approx(
        SE * (SY - sigma_i) / (SY + SE), rel=1e-12)


CURVES = {
    "goodman": lambda sa, sm: sa / SE + sm / SUT - 1,
    "soderberg": lambda sa, sm: sa / SE + sm / SY - 1,
    "gerber": lambda sa, sm: sa / SE + (sm / SUT) ** 2 - 1,
    "asme-elliptic": lambda sa, sm: (sa / SE) ** 2 + (sm / SP) ** 2 - 1,
}


@pytest.mark.parametrize("criterion", list(CURVES))
@pytest.mark.parametrize("p_min,p_max", [(0.0, 10000.0), (4000.0, 10000.0), (-3000.0, 10000.0), (9000.0, 10000.0)])
def test_general_load_line_against_brentq(criterion, p_min, p_max):
    # independent: find S_a on S_m = sigma_i + r S_a numerically and compare with the closed form
    F_i, C, A_t = 45000.0, 0.25, 84.3
    s_i, s_a, s_m = bolt_stresses(F_i, C, p_min, p_max, A_t)
    r = (s_m - s_i) / s_a
    assert r == pytest.approx((p_max + p_min) / (p_max - p_min))
    curve = CURVES[criterion]
    root = brentq(lambda x: curve(x, s_i + r * x), 0.0, SE, xtol=1e-12)
    n_f = fatigue_factor(criterion, SE, s_i, s_a, s_m, SUT, SP, SY)
    assert n_f == pytest.approx(root / s_a, rel=1e-9)


def test_no_preload_line_through_origin():
    # without preload the load line runs through the origin with slope sigma_m / sigma_a
    s_i, s_a, s_m = bolt_stresses(0.0, 0.3, 0.0, 20000.0, 84.3)
    n = fatigue_factor("goodman", SE, s_i, s_a, s_m, SUT)
    # hand: S_a/S_e + S_a/S_ut = 1 for sigma_m = sigma_a
    assert n * s_a == pytest.approx(1 / (1 / SE + 1 / SUT), rel=1e-12)


def test_criteria_order():
    # mathematics (REFERENCES.md): Soderberg <= Goodman <= Gerber at the same operating point
    for F_i in (0.0, 20000.0, 50000.0, 65000.0):
        for p_min, p_max in ((0.0, 8000.0), (3000.0, 8000.0), (0.0, 30000.0)):
            s = bolt_stresses(F_i, 0.22, p_min, p_max, 84.3)
            n = {c: fatigue_factor(c, SE, *s, SUT, SP, SY) for c in CURVES}
            assert n["soderberg"] <= n["goodman"] + 1e-12
            assert n["goodman"] <= n["gerber"] + 1e-12


def test_edges():
    assert fatigue_factor("goodman", SE, 600.0, 0.0, 600.0, SUT) is None     # no fluctuation
    assert load_line_strength("goodman", SE, 1100.0, 1.0, SUT) == 0.0         # preload beyond S_ut
    with pytest.raises(InputError):
        load_line_strength("wöhler", SE, 100.0, 1.0, SUT)
    with pytest.raises(InputError):
        load_line_strength("asme-elliptic", SE, 100.0, 1.0, SUT)              # needs S_p


def test_worked_example_inch_goodman():
    # Shigley 10th ed., Sec. 8-11 method (eq. 8-38) with our own numbers: 5/8-11 UNC SAE 5 rolled,
    # A_t = 0.226 in^2 (ASME B1.1), S_p = 85, S_ut = 120 kpsi (SAE J429), S_e = 18.6 kpsi (Table 8-17),
    # F_i = 0.75 F_p, C = 0.2, P = 0..5 kip.  Hand: F_i = 14.408 kip, sigma_i = 63.75 kpsi,
    # sigma_a = 0.2*5/(2*0.226) = 2.2124 kpsi, n_f = 18.6 (120 - 63.75)/(2.2124 (120 + 18.6)) = 1046.25/306.64 = 3.4120
    lbf, in2 = 4.4482216152605, 25.4 ** 2
    A_t = 0.226 * in2
    s_i, s_a, s_m = bolt_stresses(0.75 * 0.226 * 85000 * lbf, 0.2, 0.0, 5000 * lbf, A_t)
    assert s_i / KPSI == pytest.approx(63.75, rel=1e-6)
    assert s_a / KPSI == pytest.approx(2.2124, rel=1e-4)
    n = fatigue_factor("goodman", 18.6 * KPSI, s_i, s_a, s_m, 120 * KPSI)
    assert n == pytest.approx(3.4120, rel=2e-4)
