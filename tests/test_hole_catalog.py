"""Tap drills, and what a part's name says it is when it sits in a hole (no CAD kernel)."""
from __future__ import annotations

import pytest

from geomjoint import catalog
from geomjoint.catalog.hole_parts import hole_part_kind

IN = 25.4


@pytest.mark.parametrize("size, drill_in", [
    # Machinery's Handbook tap drill table, about 75 % thread (from memory)
    ("#4-40", 0.0890), ("#6-32", 0.1065), ("#8-32", 0.1360), ("#10-24", 0.1495), ("#10-32", 0.1590),
    ("1/4-20", 0.2010), ("1/4-28", 0.2130), ("5/16-18", 0.2570), ("3/8-16", 0.3125), ("1/2-13", 27 / 64),
    ("#0-80", 3 / 64), ("3/4-10", 21 / 32),
])
def test_inch_tap_drills_are_the_handbooks(size, drill_in):
    # the table prints four decimals of an inch (0.0025 mm)
    assert catalog.tap_drill(catalog.thread(size)) == pytest.approx(drill_in * IN, abs=0.003)


def test_every_inch_size_has_a_tap_drill_between_minor_and_major():
    # a tap drill lies between the basic minor diameter D1 and the major d (ASME B1.1 profile)
    for t in catalog.thread_sizes("inch"):
        assert t.D1 - 0.01 < catalog.tap_drill(t) < t.d, t.designation


@pytest.mark.parametrize("size, drill", [("M3", 2.5), ("M4", 3.3), ("M5", 4.2), ("M6", 5.0), ("M10", 8.5),
                                         ("M10x1.25", 8.75)])
def test_metric_tap_drills_d_minus_p(size, drill):
    # ISO 2306 drills for tapping follow d - P (common practice): M3 2.5, M4 3.3, M5 4.2, M6 5.0, M10 8.5
    assert catalog.tap_drill(catalog.thread(size)) == pytest.approx(drill)


def test_a_4_04_mm_bore_is_the_tap_drill_of_no10_32_not_no10_24():
    # the #21 drill (0.159 in = 4.04 mm) of #10-32; #10-24 takes the #25 (0.1495 in = 3.80 mm)
    found = [(t.designation, how) for t, how in catalog.nominal_from_hole(4.0386, "inch")]
    assert ("#10-32 UNF", "tap drill") in found and ("#10-24 UNC", "tap drill") not in found


@pytest.mark.parametrize("name, kind", [
    ("M3 heat set insert", "insert"), ("Heat-Set Insert M4x8.1", "insert"), ("threaded insert M5", "insert"),
    ("Gewindeeinsatz M6", "insert"), ("HELICOIL M8x1.5D", "wire insert"), ("insert_M3_short", "insert"),
    ("ISO 7049 ST3.5x13", "thread-forming"), ("self-tapping screw 3x10", "thread-forming"),
    ("Delta PT 30x10", "thread-forming"), ("Dowel pin 5m6x16", "pin"), ("ISO 8734 6x20", "pin"),
    ("drive shaft", "shaft"), ("Spindle", "shaft"), ("PTFE tube 4x2", "tube"), ("bronze bushing 8x12", "bushing"),
    ("M4 nyloc nut (nylon insert)", None), ("Hotend mount", None), ("pinion gear", None), ("DIN 912 M8x25", None),
])
def test_names_that_say_what_sits_in_a_hole(name, kind):
    # the trade's names (common practice); standards as named in data/hole_part_words.csv
    assert hole_part_kind(name) == kind
