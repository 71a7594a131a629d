"""The standard-data catalog against the published tables it comes from.

Every expected number names its source.  "from memory" marks a value recalled without
the document at hand; "common practice" a fact of the trade without one source.
"""
from __future__ import annotations

import csv
import doctest
import math

import pytest

import geomjoint.catalog as cat
from geomjoint.catalog import grades, hardware, materials, tables, threads
from geomjoint.errors import InputError

IN = 25.4        # mm per inch, exact by definition
IN2 = IN * IN    # mm^2 per in^2
KPSI = 6.894757  # MPa per kpsi (definition of lbf and inch)


# ----------------------------------------------------------------------------- threads

# ISO 898-1:2013 Table 4 (coarse) and Table 6 (fine), nominal stress area A_s in mm^2 (from memory)
ISO_898_STRESS_AREAS = {
    "M3": 5.03, "M4": 8.78, "M5": 14.2, "M6": 20.1, "M8": 36.6, "M10": 58.0,
    "M12": 84.3, "M16": 157, "M20": 245, "M24": 353, "M30": 561, "M36": 817,
    "M8x1": 39.2, "M10x1.25": 61.2, "M12x1.5": 88.1,
}


@pytest.mark.parametrize("name, area", sorted(ISO_898_STRESS_AREAS.items()))
def test_iso_stress_areas_match_iso_898_1(name, area):
    # ISO 898-1:2013 Tables 4/6 (from memory); tables print 3 significant figures
    assert cat.thread(name).stress_area == pytest.approx(area, rel=0.005)


# ASME B1.1 tensile stress areas, in^2 (ASME B1.1-2019 Tables 2A; from memory)
ASME_STRESS_AREAS = {
    "1/4-20 UNC": 0.0318, "1/4-28 UNF": 0.0364, "3/8-16 UNC": 0.0775,
    "1/2-13 UNC": 0.1419, "1/2-20 UNF": 0.1599, "5/8-11 UNC": 0.226,
    "3/4-10 UNC": 0.334, "1-8 UNC": 0.606, "#10-24 UNC": 0.0175,
}


@pytest.mark.parametrize("name, area_in2", sorted(ASME_STRESS_AREAS.items()))
def test_unified_stress_areas_match_asme_b1_1(name, area_in2):
    # ASME B1.1-2019 tensile stress areas (from memory)
    assert cat.thread(name).stress_area == pytest.approx(area_in2 * IN2, rel=0.005)


@pytest.mark.parametrize("size, pitch", [
    ("M3", 0.5), ("M4", 0.7), ("M5", 0.8), ("M6", 1.0), ("M8", 1.25), ("M10", 1.5),
    ("M12", 1.75), ("M14", 2.0), ("M16", 2.0), ("M20", 2.5), ("M24", 3.0),
    ("M30", 3.5), ("M36", 4.0), ("M42", 4.5), ("M48", 5.0),
])
def test_iso_261_coarse_pitches(size, pitch):
    # ISO 261:1998 Table 1, coarse pitch (from memory)
    t = cat.thread(size)
    assert t.pitch == pytest.approx(pitch)
    assert t.series == "coarse"


@pytest.mark.parametrize("size, d2, d3, D1", [
    ("M10", 9.026, 8.160, 8.376),    # ISO 724:1993 Table 1 (from memory)
    ("M16", 14.701, 13.546, 13.835),  # ISO 724:1993 Table 1 (from memory)
])
def test_iso_724_basic_dimensions(size, d2, d3, D1):
    t = cat.thread(size)
    # ISO 724 prints three decimals
    assert t.d2 == pytest.approx(d2, abs=6e-4)
    assert t.d3 == pytest.approx(d3, abs=6e-4)
    assert t.D1 == pytest.approx(D1, abs=6e-4)


def test_iso_724_coefficients_follow_from_the_fundamental_triangle():
    # ISO 68-1: H = sqrt(3)/2 P; d2 = d - 3/4 H, d3 = d - 17/12 H, D1 = d - 5/4 H (mathematics of the profile)
    H = math.sqrt(3) / 2
    assert threads.ISO_PITCH_DIAMETER_COEFF == pytest.approx(0.75 * H, abs=1e-6)
    assert threads.ISO_EXTERNAL_MINOR_COEFF == pytest.approx(17 / 12 * H, abs=1e-6)
    assert threads.ISO_INTERNAL_MINOR_COEFF == pytest.approx(1.25 * H, abs=1e-6)


def test_unified_basic_pitch_and_minor_diameter():
    t = cat.thread("1/2-13 UNC")
    # ASME B1.1-2019 Table 2A: basic pitch diameter 0.4500 in, basic minor (internal) 0.4167 in (from memory)
    assert t.d2 / IN == pytest.approx(0.4500, abs=1e-4)
    assert t.D1 / IN == pytest.approx(0.4167, abs=1e-4)
    assert t.threads_per_inch == pytest.approx(13)


def test_numbered_size_diameter():
    # ASME B1.1: D = 0.060 + 0.013 N; #10 = 0.190 in
    assert cat.thread("#10-24").d == pytest.approx(0.190 * IN)
    assert cat.thread("#4-40 UNC").d == pytest.approx(0.112 * IN)


def test_stress_area_grows_with_size_in_each_series():
    # mathematics: with the series' pitch growing slower than d, A_s grows monotonically
    for series in ("coarse", "UNC", "UNF"):
        areas = [t.stress_area for t in cat.thread_sizes() if t.series == series]
        assert areas == sorted(areas), series


def test_thread_catalog_coverage():
    names = {t.designation for t in cat.thread_sizes()}
    # the scope: metric M3-M48, inch #4 - 1 1/2 in, UNC and UNF
    for n in ("M3", "M48", "M48x3", "#4-40 UNC", "#4-48 UNF", "1 1/2-6 UNC", "1 1/2-12 UNF"):
        assert n in names
    assert {t.system for t in cat.thread_sizes("metric")} == {"metric"}
    assert {t.series for t in cat.thread_sizes("inch")} == {"UNC", "UNF"}
    with pytest.raises(InputError):
        cat.thread_sizes("martian")


def test_every_thread_parses_back_from_its_own_designation():
    for t in cat.thread_sizes():
        assert cat.thread(t.designation) is t


# ----------------------------------------------------------------------------- parsing

@pytest.mark.parametrize("text, canonical", [
    ("M12", "M12"), ("m12", "M12"), (" M 12 ", "M12"), ("M12x1.75", "M12"),
    ("M12x1.25", "M12x1.25"), ("m12 x 1.25", "M12x1.25"), ("M12X1.5", "M12x1.5"),
    ("M10x1.25-6g", "M10x1.25"), ("M12x1,5", "M12x1.5"),
    ("1/2-13 UNC", "1/2-13 UNC"), ("1/2-13", "1/2-13 UNC"), ("1/2-20", "1/2-20 UNF"),
    ("1/2 UNC", "1/2-13 UNC"), ("1/2 unf", "1/2-20 UNF"), ("5/8-18 UNF", "5/8-18 UNF"),
    ("#10-24 UNC", "#10-24 UNC"), ("#10-32", "#10-32 UNF"), ("no. 10-24", "#10-24 UNC"),
    ("1-8 UNC", "1-8 UNC"), ("1-1/2-6 UNC", "1 1/2-6 UNC"), ("1 1/2-12", "1 1/2-12 UNF"),
    ("1/4-20 UNC-2A", "1/4-20 UNC"), ("0.500-13 UNC", "1/2-13 UNC"),
])
def test_designations_parse(text, canonical):
    assert cat.thread(text).designation == canonical


def test_unknown_metric_size_names_the_nearest():
    with pytest.raises(InputError) as err:
        cat.thread("M13")
    msg = str(err.value)
    assert "M13" in msg
    assert "M12" in msg or "M14" in msg


@pytest.mark.parametrize("bad", ["M12x2", "1/2-16", "3/4-20 UNC", "M100", "bolt", "", "1/2-20 UNC"])
def test_unknown_designations_raise_input_error(bad):
    with pytest.raises(InputError) as err:
        cat.thread(bad)
    assert repr(bad) in str(err.value)


def test_unknown_inch_thread_suggests_same_diameter():
    with pytest.raises(InputError) as err:
        cat.thread("1/2-16")
    assert "1/2-13 UNC" in str(err.value) and "1/2-20 UNF" in str(err.value)


# ----------------------------------------------------------------------------- grades

@pytest.mark.parametrize("size, cls, load", [
    ("M12", "8.8", 48_900),    # ISO 898-1:2013 Table 5 (from memory)
    ("M10", "8.8", 33_700),    # ISO 898-1:2013 Table 5 (from memory)
    ("M16", "8.8", 91_000),    # ISO 898-1:2013 Table 5 (from memory)
    ("M20", "8.8", 147_000),   # ISO 898-1:2013 Table 5 (from memory); d > 16 mm row
    ("M24", "10.9", 293_000),  # ISO 898-1:2013 Table 5 (from memory)
    ("M8", "12.9", 35_500),    # ISO 898-1:2013 Table 5 (from memory)
    ("M12x1.5", "8.8", 51_100),  # ISO 898-1:2013 Table 7 fine thread (from memory)
])
def test_proof_loads_match_iso_898_1(size, cls, load):
    t = cat.thread(size)
    assert t.stress_area * cat.grade(cls, t.d).proof == pytest.approx(load, rel=0.005)


def test_class_8_8_splits_at_16_mm():
    # ISO 898-1:2013 Table 3: 8.8 d <= 16 mm 580/640/800, d > 16 mm 600/660/830 (from memory)
    small, large = cat.grade("8.8", 16.0), cat.grade("8.8", 20.0)
    assert (small.proof, small.yield_strength, small.tensile) == (580, 640, 800)
    assert (large.proof, large.yield_strength, large.tensile) == (600, 660, 830)
    assert cat.grade("8.8", 12).d_max == 16


@pytest.mark.parametrize("cls, proof, yld, rm", [
    ("4.6", 225, 240, 400), ("5.8", 380, 420, 520),   # ISO 898-1:2013 Table 3 (from memory)
    ("10.9", 830, 940, 1040), ("12.9", 970, 1100, 1220),  # ISO 898-1:2013 Table 3 (from memory)
])
def test_iso_898_1_classes(cls, proof, yld, rm):
    g = cat.grade(cls, 12)
    assert (g.proof, g.yield_strength, g.tensile) == (proof, yld, rm)
    assert g.system == "iso898"


def test_class_9_8_only_up_to_16_mm():
    # ISO 898-1:2013 Table 3: 9.8 applies to d <= 16 mm (from memory)
    assert cat.grade("9.8", 16).proof == 650
    with pytest.raises(InputError) as err:
        cat.grade("9.8", 20)
    assert "9.8" in str(err.value)


def test_sae_5_splits_at_one_inch():
    # SAE J429 Table 1: grade 5 1/4-1 in 85/92/120 kpsi, over 1-1 1/2 in 74/81/105 kpsi (from memory)
    g = cat.grade("SAE 5", 1.0 * IN)
    assert g.proof == pytest.approx(85 * KPSI, rel=1e-6)
    assert g.yield_strength == pytest.approx(92 * KPSI, rel=1e-6)
    assert g.tensile == pytest.approx(120 * KPSI, rel=1e-6)
    g = cat.grade("SAE 5", 1.125 * IN)
    assert g.proof == pytest.approx(74 * KPSI, rel=1e-6)
    assert g.tensile == pytest.approx(105 * KPSI, rel=1e-6)


def test_sae_2_and_8():
    # SAE J429 Table 1: grade 2 1/4-3/4 in Sp 55 kpsi, over 3/4 in Sp 33; grade 8 120/130/150 (from memory)
    assert cat.grade("SAE 2", 0.5 * IN).proof == pytest.approx(55 * KPSI, rel=1e-6)
    assert cat.grade("SAE 2", 1.0 * IN).proof == pytest.approx(33 * KPSI, rel=1e-6)
    g8 = cat.grade("SAE grade 8", 0.75 * IN)
    assert (g8.proof, g8.yield_strength, g8.tensile) == pytest.approx((120 * KPSI, 130 * KPSI, 150 * KPSI), rel=1e-6)
    with pytest.raises(InputError):
        cat.grade("SAE 8", 2.0 * IN)  # SAE J429 stops at 1 1/2 in


def test_kpsi_conversion_is_exact():
    # definition: 1 lbf = 4.4482216152605 N, 1 in = 25.4 mm
    assert tables.MPA_PER_KPSI == pytest.approx(1000 * 4.4482216152605 / 25.4**2, rel=1e-12)


def test_stainless_classes_take_rp02_as_proof():
    # ISO 3506-1:2020 Table 6: A2-70/A4-70 Rm 700, Rp0.2 450; A4-80 800/600 (from memory);
    # ISO 3506-1 defines no proof stress, so the catalog uses Rp0.2 (stated convention)
    for name in ("A2-70", "A4-70"):
        g = cat.grade(name, 12)
        assert (g.tensile, g.yield_strength, g.proof) == (700, 450, 450)
    g = cat.grade("a4 80", 12)
    assert (g.name, g.tensile, g.proof) == ("A4-80", 800, 600)


@pytest.mark.parametrize("text, canonical", [
    ("8.8", "8.8"), ("class 8.8", "8.8"), ("Property class 10.9", "10.9"), (" 12.9 ", "12.9"),
    ("SAE 5", "SAE 5"), ("sae5", "SAE 5"), ("SAE grade 8", "SAE 8"), ("grade 5", "SAE 5"),
    ("SAE J429 grade 5", "SAE 5"), ("A2-70", "A2-70"), ("A4-80", "A4-80"), ("a4_70", "A4-70"),
])
def test_grade_names_parse(text, canonical):
    assert cat.grade(text, 12.7).name == canonical


@pytest.mark.parametrize("bad", ["13.9", "SAE 6", "A2-90", "unobtainium", "8.9"])
def test_unknown_grade_error_names_it(bad):
    with pytest.raises(InputError) as err:
        cat.grade(bad, 12)
    assert repr(bad) in str(err.value)


def test_grade_names_cover_the_standards():
    names = cat.grade_names()
    for n in ("4.6", "4.8", "5.6", "5.8", "6.8", "8.8", "9.8", "10.9", "12.9",
              "SAE 1", "SAE 2", "SAE 5", "SAE 5.2", "SAE 7", "SAE 8", "A2-70", "A4-70", "A4-80"):
        assert n in names
    for n in names:  # every name is accepted back
        assert cat.grade(n, 12.7 if n != "9.8" else 10).name == n


def test_yield_below_tensile_for_every_row():
    # definition: a yield (or proof) strength cannot exceed the tensile strength
    for g in grades._rows():
        assert g.proof <= g.yield_strength <= g.tensile, g


# ----------------------------------------------------------------------------- hardware

def test_m12_hardware():
    t = cat.thread("M12")
    h = cat.head(t)
    assert (h.width, h.height) == (18, 7.5)           # ISO 4017:2014 s = 18, k = 7.5 (from memory)
    assert h.bearing_diameter == pytest.approx(16.63)  # ISO 4017:2014 dw min grade A (from memory)
    assert cat.nut(t).height == 10.8                   # ISO 4032:2012 m max (from memory)
    assert cat.nut(t).width == 18                      # ISO 4032:2012 s (from memory)
    w = cat.washer(t)
    assert (w.inner, w.outer, w.thickness) == (13, 24, 2.5)  # ISO 7089:2000 (from memory)
    assert cat.clearance_hole(t) == 13.5               # ISO 273 medium (from memory)
    assert cat.clearance_hole(t, "fine") == 13.0       # ISO 273 fine (from memory)
    assert cat.clearance_hole(t, "coarse") == 14.5     # ISO 273 coarse (from memory)
    s = cat.head(t, "socket")
    assert (s.width, s.height) == (18, 12)             # ISO 4762:2004 dk max 18, k max 12 (from memory)


@pytest.mark.parametrize("size, s, k, m", [
    ("M8", 13, 5.3, 6.8),      # ISO 4017 / ISO 4032 (from memory)
    ("M10", 16, 6.4, 8.4),     # ISO 4017 / ISO 4032 (from memory); s 16, not the older 17
    ("M16", 24, 10, 14.8),     # ISO 4017 / ISO 4032 (from memory)
    ("M20", 30, 12.5, 18.0),   # ISO 4017 / ISO 4032 (from memory)
    ("M24", 36, 15, 21.5),     # ISO 4017 / ISO 4032 (from memory)
    ("M36", 55, 22.5, 31.0),   # ISO 4017 / ISO 4032 (from memory)
])
def test_iso_hex_heads_and_nuts(size, s, k, m):
    t = cat.thread(size)
    assert (cat.head(t).width, cat.head(t).height) == (s, k)
    assert cat.nut(t).height == m


def test_fine_thread_uses_hardware_of_its_nominal_size():
    assert cat.head(cat.thread("M12x1.5")) == cat.head(cat.thread("M12"))
    assert cat.clearance_hole(cat.thread("M12x1.25")) == 13.5


def test_inch_hardware():
    t = cat.thread("1/2-13 UNC")
    assert cat.head(t).width == pytest.approx(0.75 * IN)            # ASME B18.2.1 hex bolt F = 3/4 in (from memory)
    assert cat.head(t, "heavy hex").width == pytest.approx(0.875 * IN)  # ASME B18.2.1 heavy hex F = 7/8 in (from memory)
    assert cat.nut(t).height == pytest.approx(0.4375 * IN)          # ASME B18.2.2 hex nut H = 7/16 in (from memory)
    assert cat.washer(t, "sae").outer == pytest.approx(1.062 * IN)  # ASME B18.21.1 type A narrow (from memory)
    assert cat.washer(t, "uss").outer == pytest.approx(1.375 * IN)  # ASME B18.21.1 type A wide (from memory)
    assert cat.head(t, "socket").width == pytest.approx(0.75 * IN)  # ASME B18.3 head diameter 3/4 in (from memory)
    # ASME B18.2.8 close/normal/loose 33/64, 17/32, 9/16 in (from memory)
    assert cat.clearance_hole(t, "close") == pytest.approx(0.5156 * IN)
    assert cat.clearance_hole(t, "normal") == pytest.approx(0.5312 * IN)
    assert cat.clearance_hole(t, "loose") == pytest.approx(0.5625 * IN)


def test_numbered_inch_sizes_have_hex_heads_washers_and_nuts():
    # ASME B18.6.3 hex head machine screws, plain and slotted, regular head: A max, H max (as reprinted
    # by adfastcomponents.com and fastenerplanet.com)
    for size, A, H in (("#1-64", 0.125, 0.044), ("#4-40", 0.188, 0.060), ("#6-32", 0.250, 0.093),
                       ("#10-24", 0.312, 0.120), ("#10-32", 0.312, 0.120), ("#12-24", 0.312, 0.155)):
        h = cat.head(cat.thread(size))
        assert (h.width, h.height) == (pytest.approx(A * IN), pytest.approx(H * IN)), size
        assert h.bearing_diameter == pytest.approx(A * IN) and "B18.6.3" in h.source
    # ASME B18.21.1-2009 plain washers type B (formerly B18.22.1-1965 Table 2), ID / OD / thickness basic
    # (as reprinted by adfastcomponents.com): #0 narrow 0.068 / 0.125 / 0.025, #3 wide 0.109 / 0.405 / 0.040,
    # #5 narrow 0.141 / 0.281 / 0.032; type A (from #6) is unchanged: #6 narrow 0.156 / 0.375 / 0.049
    for size, kind, dims in (("#0-80", "standard", (0.068, 0.125, 0.025)), ("#3-48", "uss", (0.109, 0.405, 0.040)),
                             ("#5-40", "sae", (0.141, 0.281, 0.032)), ("#6-32", "sae", (0.156, 0.375, 0.049))):
        w = cat.washer(cat.thread(size), kind)
        assert (w.inner, w.outer, w.thickness) == pytest.approx(tuple(x * IN for x in dims)), size
    # ASME B18.6.3-2003 hex machine screw nuts (ASME B18.2.2-2010): F basic, H max (as reprinted by
    # torqbolt.com): #0 5/32 / 0.050, #10 3/8 / 0.130, #12 7/16 / 0.161
    for size, F, H in (("#0-80", 5 / 32, 0.050), ("#10-24", 3 / 8, 0.130), ("#12-24", 7 / 16, 0.161)):
        n = cat.nut(cat.thread(size))
        assert (n.width, n.height) == (pytest.approx(F * IN), pytest.approx(H * IN)), size
    # each of them can now be finished with a hex head and a nut (stock lengths, common practice)
    for size in ("#1-64", "#4-40", "#10-24", "#12-24"):
        assert cat.hardware_gaps(cat.thread(size), "hex") == [], size
    assert cat.standard_lengths(cat.thread("#10-24"), "hex")[0] == pytest.approx(0.25 * IN)
    assert cat.hardware_gaps(cat.thread("#0-80"), "hex") == ["hex head", "hex lengths"]


def test_metric_heavy_hex_and_bad_kinds_are_input_errors():
    t = cat.thread("M12")
    for call in (lambda: cat.head(t, "heavy hex"), lambda: cat.head(t, "carriage"),
                 lambda: cat.washer(t, "uss"), lambda: cat.clearance_hole(t, "snug"),
                 lambda: cat.head(cat.thread("#0-80"))):     # ASME B18.6.3 hex heads start at #1
        with pytest.raises(InputError):
            call()


def test_hardware_tables_are_physically_consistent():
    # common practice: a clearance hole and a washer bore pass the bolt; fits grow fine < medium < coarse;
    # the head bears on a ring inside its own width
    for t in cat.thread_sizes():
        try:
            holes = [cat.clearance_hole(t, f) for f in ("fine", "medium", "coarse")]
        except InputError:
            continue
        assert t.d < holes[0] < holes[1] < holes[2], t.designation
        for kind in ("hex", "socket"):
            try:
                h = cat.head(t, kind)
            except InputError:
                continue
            assert holes[0] < h.bearing_diameter <= h.width + 1e-9, (t.designation, kind)
        try:
            w = cat.washer(t)
        except InputError:
            continue
        assert t.d < w.inner < w.outer, t.designation


def test_iso_7089_bore_is_iso_273_fine_hole_up_to_m36():
    # ISO 7089 d1 follows the ISO 273 fine series for the common sizes (common practice)
    for size in ("M3", "M4", "M5", "M6", "M8", "M10", "M12", "M16", "M20", "M24", "M30", "M36"):
        t = cat.thread(size)
        assert cat.washer(t).inner == cat.clearance_hole(t, "fine"), size


def test_thread_length_rule():
    t = cat.thread("M12")
    # ISO 4014 b ref / Budynas & Nisbett eq. (8-14): 2d+6 (L<=125), 2d+12 (L<=200), 2d+25 (L>200)
    assert cat.thread_length(t, 50) == 30
    assert cat.thread_length(t, 125) == 30
    assert cat.thread_length(t, 150) == 36
    assert cat.thread_length(t, 200) == 36
    assert cat.thread_length(t, 220) == 49
    # a screw shorter than the rule's thread length is threaded to the head
    assert cat.thread_length(t, 25) == 25
    u = cat.thread("1/2-13")
    # ASME B18.2.1 / Budynas & Nisbett eq. (8-13): 2D + 1/4 in (L <= 6 in), 2D + 1/2 in above
    assert cat.thread_length(u, 4 * IN) == pytest.approx(1.25 * IN)
    assert cat.thread_length(u, 8 * IN) == pytest.approx(1.5 * IN)
    with pytest.raises(InputError):
        cat.thread_length(t, -5)
    # socket head cap screws: ISO 4762:2004 b ref M8 28, M12 36, M16 44 mm (from memory)
    for size, b in (("M8", 28.0), ("M12", 36.0), ("M16", 44.0)):
        assert cat.thread_length(cat.thread(size), 100.0, "socket") == pytest.approx(b)
    # every rule row of the data file names its source
    assert all(r["source"] for r in tables.load_table("thread_length_rules"))


def test_standard_lengths():
    t = cat.thread("M12")
    hex_l = cat.standard_lengths(t)
    # ISO 4017/4014 preferred lengths in 5 mm steps to 70, 10 mm to 160, 20 mm above (from memory)
    assert {40, 45, 50, 55, 60, 70, 80}.issubset(hex_l)
    assert 52 not in hex_l and 75 not in hex_l
    assert hex_l == sorted(hex_l)
    assert cat.shortest_length(t, 41) == 45
    assert cat.shortest_length(t, 45) == 45
    assert cat.shortest_length(t, 85, "socket") == 90
    with pytest.raises(InputError):
        cat.shortest_length(t, 10_000)
    u = cat.thread("1/2-13 UNC")
    inch_l = [x / IN for x in cat.standard_lengths(u)]
    # inch lengths by 1/4 in up to 6 in, 1/2 in above (common practice)
    assert 1.75 in [round(x, 6) for x in inch_l] and 6.25 not in [round(x, 6) for x in inch_l]
    assert 6.5 in [round(x, 6) for x in inch_l]
    assert cat.shortest_length(u, 2.1 * IN) == pytest.approx(2.25 * IN)


def test_tap_drill():
    # ISO 2306 tap drills (from memory): the rule d - P meets them to within the 0.05 mm of the drill series
    for size, drill in [("M5", 4.2), ("M6", 5.0), ("M8", 6.8), ("M10", 8.5), ("M12", 10.2),
                        ("M16", 14.0), ("M20", 17.5), ("M24", 21.0), ("M30", 26.5)]:
        assert cat.tap_drill(cat.thread(size)) == pytest.approx(drill, abs=0.05 + 1e-9), size
    # 75 % thread rule: 1/4-20 -> 0.201 in (#7 drill), 1/2-13 -> 0.425 in (27/64 = 0.4219 in) (common practice)
    assert cat.tap_drill(cat.thread("1/4-20")) / IN == pytest.approx(0.201, abs=0.001)
    assert cat.tap_drill(cat.thread("1/2-13")) / IN == pytest.approx(0.4219, abs=0.004)
    for t in cat.thread_sizes():  # a tap drill lies between the nut's minor diameter and the major diameter
        assert t.D1 < cat.tap_drill(t) < t.d


def test_nominal_from_hole():
    found = cat.nominal_from_hole(13.5)
    assert (found[0][0].designation, found[0][1]) == ("M12", "medium")  # ISO 273 medium M12 = 13.5
    assert any(t.designation == "M14" and lab == "tap drill" for t, lab in cat.nominal_from_hole(12.0))
    inch = cat.nominal_from_hole(0.5312 * IN, system="inch")
    assert (inch[0][0].designation, inch[0][1]) == ("1/2-13 UNC", "medium")
    assert all(t.system == "inch" for t, _ in inch)
    assert cat.nominal_from_hole(1000.0) == []
    nominal = cat.nominal_from_hole(20.0)
    assert ("M20", "nominal") in [(t.designation, lab) for t, lab in nominal]


# ----------------------------------------------------------------------------- materials

def test_materials_and_aliases():
    assert cat.material("aluminum") == cat.material("aluminium")
    assert cat.material("Steel") == cat.material("carbon steel")
    assert cat.material("grey cast iron").name == "gray cast iron"
    assert cat.material("EN-GJS-400").name == "ductile iron"
    assert cat.material("bronze").name == "copper alloy"
    assert cat.material("Ti-6Al-4V").name == "titanium"
    for n in ("steel", "alloy steel", "stainless steel", "gray cast iron", "ductile iron",
              "aluminium", "cast aluminium", "titanium", "copper alloy"):
        assert n in cat.material_names()


def test_shigley_table_8_8_moduli_and_wileman_constants():
    # Budynas & Nisbett Table 8-8 (Wileman, Choudhury & Green 1991): E [GPa], A, B (from memory)
    expected = {
        "steel": (207, 0.78715, 0.62873),
        "aluminium": (71, 0.79670, 0.63816),
        "copper alloy": (119, 0.79568, 0.63553),
        "gray cast iron": (100, 0.77871, 0.61616),
    }
    for name, (E, A, B) in expected.items():
        m = cat.material(name)
        assert m.E == pytest.approx(E * 1000)
        assert (m.wileman_A, m.wileman_B) == (A, B)
    assert cat.WILEMAN_GENERAL == (0.78952, 0.62914)  # Budynas & Nisbett Table 8-8 general expression
    assert cat.material("titanium").wileman_A is None  # the paper gives no titanium constants


def test_limiting_pressures_vdi_2230():
    # VDI 2230-1:2015 Table A9 (from memory): S355J0 760, GJL-250 850, GJS-400 600, AlMgSi1 F31 360 MPa
    assert cat.material("steel").limiting_pressure == 760
    assert cat.material("gray cast iron").limiting_pressure == 850
    assert cat.material("ductile iron").limiting_pressure == 600
    assert cat.material("aluminium").limiting_pressure == 360


def test_material_properties_are_physical():
    for name in cat.material_names():
        m = cat.material(name)
        assert 0 < m.poisson < 0.5, name  # thermodynamic bound for isotropic solids
        assert m.E > 0 and m.source
        if m.yield_strength is not None:
            assert m.yield_strength < m.tensile_strength, name
        if m.family == "metal":
            # common practice: metals expand 5e-6 .. 30e-6 per K near room temperature
            assert 5e-6 < m.thermal_expansion < 30e-6, name
        else:
            # common practice: unfilled engineering plastics expand 50e-6 .. 150e-6 per K
            # and have moduli of 1 .. 4 GPa at room temperature
            assert m.family == "polymer", name
            assert 50e-6 < m.thermal_expansion < 150e-6, name
            assert 1000 <= m.E <= 4000, name


def test_unknown_material_names_nearest():
    with pytest.raises(InputError) as err:
        cat.material("alumnium")
    assert "'alumnium'" in str(err.value) and "aluminium" in str(err.value)


# ----------------------------------------------------------------------------- data files

MY_TABLES = ("threads_metric", "threads_inch", "grades", "hex_heads", "socket_heads", "nuts",
             "washers", "clearance_holes", "lengths", "length_series", "materials")


@pytest.mark.parametrize("name", MY_TABLES)
def test_every_row_has_a_source(name):
    with (tables.DATA_DIR / f"{name}.csv").open(newline="") as fh:
        rows = list(csv.DictReader(fh))
    assert rows
    for r in rows:
        assert r["source"].strip(), (name, r)
        assert None not in r and None not in r.values(), (name, r)  # no stray commas


def test_tables_are_read_once_and_read_only():
    a = tables.load_table("grades")
    assert tables.load_table("grades") is a
    with pytest.raises(TypeError):
        a[0]["proof"] = "1"  # type: ignore[index]
    with pytest.raises(InputError):
        tables.load_table("no_such_table")


@pytest.mark.parametrize("module", [threads, grades, hardware, materials, tables, cat])
def test_docstring_examples(module):
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS)
    assert result.failed == 0
