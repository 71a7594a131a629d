"""The tolerance tables of the catalogue against the standards' printed values."""
from __future__ import annotations

import pytest

from geomjoint import catalog
from geomjoint.catalog.tables import load_table
from geomjoint.errors import InputError

IN = 25.4


@pytest.mark.parametrize("cls, size, dev", [
    ("f", 2.0, 0.05),    # ISO 2768-1:1989 Table 1, f, over 0.5 up to 3 (from memory)
    ("f", 50.0, 0.15),   # ISO 2768-1:1989 Table 1, f, over 30 up to 120 (from memory)
    ("m", 3.0, 0.1),     # ISO 2768-1:1989 Table 1, m, 3 is in "over 0.5 up to 3" (from memory)
    ("m", 3.5, 0.1),     # ISO 2768-1:1989 Table 1, m, over 3 up to 6 (from memory)
    ("m", 12.0, 0.2),    # ISO 2768-1:1989 Table 1, m, over 6 up to 30 (from memory)
    ("m", 30.0, 0.2),    # ISO 2768-1:1989 Table 1, m, 30 is "up to 30" (from memory)
    ("m", 30.1, 0.3),    # ISO 2768-1:1989 Table 1, m, over 30 up to 120 (from memory)
    ("m", 200.0, 0.5),   # ISO 2768-1:1989 Table 1, m, over 120 up to 400 (from memory)
    ("c", 20.0, 0.5),    # ISO 2768-1:1989 Table 1, c, over 6 up to 30 (from memory)
    ("c", 500.0, 2.0),   # ISO 2768-1:1989 Table 1, c, over 400 up to 1000 (from memory)
    ("v", 10.0, 1.0),    # ISO 2768-1:1989 Table 1, v, over 6 up to 30 (from memory)
    ("v", 3000.0, 8.0),  # ISO 2768-1:1989 Table 1, v, over 2000 up to 4000 (from memory)
])
def test_iso_2768_1_table_1(cls, size, dev):
    d = catalog.general_tolerance(cls, size)
    assert (d.lower, d.upper) == pytest.approx((-dev, dev))
    assert "ISO 2768-1" in d.source


def test_iso_2768_1_has_no_fine_row_past_2000_nor_very_coarse_below_3():
    # ISO 2768-1:1989 Table 1: class f stops at 2000 mm, class v starts over 3 mm (from memory)
    with pytest.raises(InputError):
        catalog.general_tolerance("f", 2500.0)
    assert catalog.general_tolerance("v", 1.0).upper == pytest.approx(0.5)   # below its first range: the first
    with pytest.raises(InputError, match="tolerance class"):
        catalog.general_tolerance("x", 10.0)


@pytest.mark.parametrize("size, length, grade, lo, hi", [
    ("M12", 50.0, "A", -0.5, 0.5),     # ISO 4014:2011 Table 1 l = 50, grade A 49.5 / 50.5 (js15) (from memory)
    ("M12", 100.0, "A", -0.7, 0.7),    # ISO 4014:2011 l = 100, grade A 99.3 / 100.7 (js15) (from memory)
    ("M12", 130.0, "B", -2.0, 2.0),    # l > 10 d: grade B, js17 over 120 up to 180: IT17 = 4.0 (ISO 286-1 Table 1)
    ("M30", 50.0, "B", -1.25, 1.25),   # ISO 4014:2011 d > 24: grade B; l = 50: 48.75 / 51.25 (js17) (from memory)
    ("M8", 20.0, "A", -0.42, 0.42),    # ISO 4017:2014 l = 20, grade A 19.58 / 20.42 (js15) (from memory)
])
def test_iso_4759_1_length_tolerances(size, length, grade, lo, hi):
    t = catalog.thread(size)
    assert catalog.product_grade(t, length, "hex") == grade
    d = catalog.bolt_length_tolerance(t, length, "hex")
    assert (d.lower, d.upper) == pytest.approx((lo, hi))
    assert "ISO 4759-1" in d.source


def test_socket_head_cap_screws_are_grade_a_at_any_size():
    # ISO 4762:2004 clause 1: product grade A (from memory)
    t = catalog.thread("M30")
    assert catalog.product_grade(t, 200.0, "socket") == "A"
    d = catalog.bolt_length_tolerance(t, 200.0, "socket")      # js15 over 180 up to 250: IT15 = 1.85
    assert d.upper == pytest.approx(0.925)


def test_asme_b18_2_1_hex_cap_screw_length_tolerance():
    # ASME B18.2.1-2012 hex cap screws, tolerance on length (from memory): 1/2 in, 2 in long: -0.06 / 0
    d = catalog.bolt_length_tolerance(catalog.thread("1/2-13 UNC"), 2.0 * IN, "hex")
    assert (d.lower, d.upper) == pytest.approx((-0.06 * IN, 0.0))
    # 1/4 in, 3/4 in long: -0.03 / 0 (from memory)
    d = catalog.bolt_length_tolerance(catalog.thread("1/4-20 UNC"), 0.75 * IN, "hex")
    assert d.lower == pytest.approx(-0.03 * IN)
    # numbered machine screws have no row: the caller takes the nominal length
    assert catalog.bolt_length_tolerance(catalog.thread("#10-24 UNC"), 1.0 * IN, "hex") is None


@pytest.mark.parametrize("size, m_min, m_max", [
    ("M6", 4.9, 5.2),       # ISO 4032:2012 Table 1 (BS EN ISO 4032:2001 Table 1 reprint)
    ("M10", 8.04, 8.4),     # ISO 4032:2012 Table 1
    ("M12", 10.37, 10.8),   # ISO 4032:2012 Table 1
    ("M16", 14.1, 14.8),    # ISO 4032:2012 Table 1
    ("M24", 20.2, 21.5),    # ISO 4032:2012 Table 1
    ("M14", 12.1, 12.8),    # ISO 4032:2012 Table 2, non-preferred (from memory)
])
def test_iso_4032_nut_heights(size, m_min, m_max):
    lo, hi, source = catalog.nut_height_limits(catalog.thread(size))
    assert (lo, hi) == pytest.approx((m_min, m_max))
    assert "ISO 4032" in source


def test_nut_height_limits_agree_with_the_nut_table():
    # one m max everywhere: nuts.csv (the nut the engine uses) and nut_heights.csv
    for row in load_table("nut_heights"):
        t = catalog.thread(row["size"] if row["unit"] == "mm" else f"{row['size']}-{ {'1/4': 20, '5/16': 18, '3/8': 16, '7/16': 14, '1/2': 13, '9/16': 12, '5/8': 11, '3/4': 10, '7/8': 9, '1': 8}[row['size']]} UNC")
        lo, hi, _ = catalog.nut_height_limits(t)
        assert lo < hi
        if t.system == "metric":
            assert hi == pytest.approx(catalog.nut(t).height)


def test_asme_b18_2_2_hex_nut_thickness():
    # ASME B18.2.2-2015 hex nuts, 1/2 in: H 7/16 basic, max 0.448, min 0.427 (from memory)
    lo, hi, _ = catalog.nut_height_limits(catalog.thread("1/2-13 UNC"))
    assert (lo, hi) == pytest.approx((0.427 * IN, 0.448 * IN))


@pytest.mark.parametrize("size, h, h_min, h_max", [
    ("M5", 1.0, 0.9, 1.1),      # ISO 7089:2000 Table 1 (from memory)
    ("M8", 1.6, 1.4, 1.8),      # ISO 7089:2000 Table 1 (from memory)
    ("M12", 2.5, 2.3, 2.7),     # ISO 7089:2000 Table 1 (from memory)
    ("M16", 3.0, 2.7, 3.3),     # ISO 7089:2000 Table 1 (from memory)
    ("M24", 4.0, 3.7, 4.3),     # ISO 7089:2000 Table 1 (from memory)
    ("M36", 5.0, 4.4, 5.6),     # ISO 7089:2000 Table 1 (from memory)
])
def test_iso_7089_washer_thickness(size, h, h_min, h_max):
    t = catalog.thread(size)
    nominal, lo, hi, source = catalog.washer_thickness_limits(t)
    assert (nominal, lo, hi) == pytest.approx((h, h_min, h_max))
    assert nominal == pytest.approx(catalog.washer(t).thickness)   # the same h as the washer table
    assert "ISO 7089" in source


def test_asme_b18_21_1_type_a_washer_thickness():
    # ASME B18.21.1-2009 type A, 1/2 in narrow (SAE): 0.095 basic, 0.074 min, 0.121 max (from memory)
    nominal, lo, hi, _ = catalog.washer_thickness_limits(catalog.thread("1/2-13 UNC"), "narrow")
    assert (nominal, lo, hi) == pytest.approx((0.095 * IN, 0.074 * IN, 0.121 * IN))


@pytest.mark.parametrize("cls, t, lo, hi", [
    ("A", 4.0, -0.4, 0.8),     # EN 10029:2010 Table 1, class A, 3 <= t < 5 (from memory)
    ("A", 10.0, -0.5, 1.2),    # EN 10029:2010 Table 1, class A, 8 <= t < 15 (from memory)
    ("A", 15.0, -0.6, 1.3),    # EN 10029:2010 Table 1, class A, 15 <= t < 25 (from memory)
    ("B", 10.0, -0.3, 1.4),    # EN 10029:2010 Table 1, class B, 8 <= t < 15 (from memory)
    ("B", 30.0, -0.3, 1.8),    # EN 10029:2010 Table 1, class B, 25 <= t < 40 (from memory)
])
def test_en_10029_plate_thickness(cls, t, lo, hi):
    d = catalog.plate_tolerance("EN 10029", cls, t)
    assert (d.lower, d.upper) == pytest.approx((lo, hi))


def test_en_10029_classes_share_their_span():
    # EN 10029:2010: class B keeps class A's tolerance span with a fixed -0.3 mm lower deviation (from memory)
    for t in (4.0, 6.0, 10.0, 20.0, 30.0, 50.0, 100.0, 200.0):
        a = catalog.plate_tolerance("EN 10029", "A", t)
        b = catalog.plate_tolerance("EN 10029", "B", t)
        assert a.upper - a.lower == pytest.approx(b.upper - b.lower)
    with pytest.raises(InputError, match="outside EN 10029"):
        catalog.plate_tolerance("EN 10029", "A", 2.0)    # the standard starts at 3 mm
