"""Fastener designations read from product names (catalog.designation), against the
designations the product standards print and the names fastener libraries give."""
from __future__ import annotations

import pytest

from geomjoint import catalog
from geomjoint.catalog.designation import parse_designation, product_standard
from geomjoint.errors import InputError


@pytest.mark.parametrize("name, family, kind, standard, thread, length", [
    # ISO 4017:2014 clause 9 designation "Hexagon head screw ISO 4017 - M12 x 80 - 8.8" (from memory)
    ("ISO 4017 M12x40", "bolt", "hex", "ISO 4017", "M12", 40.0),
    ("screw ISO 4017 M12x40", "bolt", "hex", "ISO 4017", "M12", 40.0),
    # DIN 933 / DIN 931 are the German counterparts of ISO 4017 / ISO 4014 (from memory)
    ("DIN 933 M24x90", "bolt", "hex", "ISO 4017", "M24", 90.0),
    ("DIN 931 M16x50", "bolt", "hex", "ISO 4014", "M16", 50.0),
    # ISO 4762:2004 designation "Hexagon socket head cap screw ISO 4762 - M5 x 20 - 12.9" (from memory)
    ("DIN 912 M8x25", "bolt", "socket", "ISO 4762", "M8", 25.0),
    ("screw ISO 4762 M5x16", "bolt", "socket", "ISO 4762", "M5", 16.0),
    ("ISO 4762 - M5 x 20 - 12.9", "bolt", "socket", "ISO 4762", "M5", 20.0),
    ("01_01_09-cylinder_screw_M5x25-DIN912", "bolt", "socket", "ISO 4762", "M5", 25.0),
    ("DIN EN ISO 4762 M6x20", "bolt", "socket", "ISO 4762", "M6", 20.0),
    # DIN 7984 low socket heads have the d_k and k of ISO 1207 cheese heads (from memory)
    ("DIN 7984 M8x20", "bolt", "cheese", "DIN 7984", "M8", 20.0),
    # ISO 7380-1:2011, ISO 10642:2004 / DIN 7991, ISO 7045 / ISO 1580 / ISO 1207, ISO 4162 / EN 1665
    ("ISO 7380-1 M5x10", "bolt", "button", "ISO 7380", "M5", 10.0),
    ("DIN 7991 M6x16", "bolt", "countersunk", "ISO 10642", "M6", 16.0),
    ("ISO 7045 M3x8", "bolt", "pan", "ISO 7045", "M3", 8.0),
    ("ISO 1580 M4x10", "bolt", "pan slotted", "ISO 1580", "M4", 10.0),
    ("ISO 1207 M4x10", "bolt", "cheese", "ISO 1207", "M4", 10.0),
    ("EN 1665 M8x20", "bolt", "flange", "ISO 4162", "M8", 20.0),
    # the trade's abbreviations (common practice): BHCS button, SHCS socket, FHCS flat (countersunk)
    ("M3x10 BHCS", "bolt", "button", None, "M3", 10.0),
    ("#10-32 x 1/2 BHCS", "bolt", "button", None, "#10-32 UNF", 12.7),
    ("1/4-20 x 3/4 SHCS", "bolt", "socket", None, "1/4-20 UNC", 19.05),
    ("1/4-20 x 1 1/4 FHCS", "bolt", "countersunk", None, "1/4-20 UNC", 31.75),
    ("HX-SHCS 0.25-20x0.75x0.75-N", "bolt", "socket", None, "1/4-20 UNC", 19.05),
    ("HDW-207_91290A012_M2x5mm_SHCS_91290A012", "bolt", "socket", None, "M2", 5.0),
    # ASME B18.3.1M metric socket head cap screws as one CAD library names them (from memory)
    ("B18.3.1M - 5 x 0.8 x 16 Hex SHCS -- 16NHX", "bolt", "socket", None, "M5", 16.0),
    ("HNUT 0.2500-20-D-N", "nut", "hex", None, "1/4-20 UNC", None),
    ("M6 button head socket cap screw", "bolt", "button", None, "M6", None),
    ("M10x1.25x40 hex head bolt", "bolt", "hex", None, "M10x1.25", 40.0),
    # tapping screws: ISO 7049 (DIN 7981) "ST3.5 x 13" (ISO 1478 sizes, no machine thread; from memory)
    ("ISO 7049 ST3.5x13", "bolt", "pan", "ISO 7049", None, 13.0),
    ("DIN 7982 ST4.2x16", "bolt", "countersunk", "ISO 7050", None, 16.0),
    # ISO 4026:2003 / ISO 4029:2003 set screws, designation "ISO 4029 - M6 x 12 - 45H" (from memory)
    ("ISO 4026 M4x6", "set screw", "flat", "ISO 4026", "M4", 6.0),
    ("ISO 4029 - M6 x 12 - 45H", "set screw", "cup", "ISO 4029", "M6", 12.0),
    ("M3x3 grub screw", "set screw", None, None, "M3", 3.0),
    ("threaded rod M8x100", "stud", None, None, "M8", 100.0),
    ("DIN 976 M12x200", "stud", "rod", "DIN 976", "M12", 200.0),
    # nuts: ISO 4032:2012 "Hexagon nut ISO 4032 - M12 - 8" (from memory); DIN 934; lock, flange, square
    ("ISO 4032 M12", "nut", "hex", "ISO 4032", "M12", None),
    ("DIN 934 - M 12", "nut", "hex", "ISO 4032", "M12", None),
    ("ISO 8673 M12x1.5", "nut", "hex", "ISO 8673", "M12x1.5", None),
    ("DIN 985 M8", "nut", "lock", "ISO 10511", "M8", None),
    ("M3 nyloc nut", "nut", "lock", None, "M3", None),
    ("DIN 6923 M8", "nut", "flange", "ISO 4161", "M8", None),
    ("DIN 557 M6", "nut", "square", "DIN 557", "M6", None),
    # washers: ISO 7089:2000 "Plain washer ISO 7089 - 12 - 200 HV" is by the nominal size; DIN 125-1
    # "Scheibe DIN 125 - A 13" by the hole diameter d1 = 13 mm, the M12 washer (from memory)
    ("ISO 7089 12", "washer", "plain", "ISO 7089", "M12", None),
    ("ISO 7089 - 12 - 200 HV", "washer", "plain", "ISO 7089", "M12", None),
    ("DIN 125 A 13", "washer", "plain", "DIN 125", "M12", None),
    ("DIN 125-1 A 6.4", "washer", "plain", "DIN 125", "M6", None),
    ("DIN 127 M8", "washer", "spring", "DIN 127", "M8", None),
    # pins and rings by their standards are no fasteners (ISO 2341 clevis pins, ISO 2338 parallel pins)
    ("ISO 2341 B 8x30", "other", "pin", "ISO 2341", None, None),
    ("washer M6", "washer", "plain", None, "M6", None),
])
def test_designations_as_the_standards_and_libraries_write_them(name, family, kind, standard, thread, length):
    d = parse_designation(name)
    assert (d.family, d.kind, d.standard, d.thread) == (family, kind, standard, thread)
    assert d.length == (pytest.approx(length) if length is not None else None)


def test_the_standard_decides_over_words_and_is_named_as_written():
    d = parse_designation("screw DIN 933 M24x90")
    assert d.standard == "ISO 4017" and d.named_standard == "DIN 933" and d.kind == "hex"


@pytest.mark.parametrize("name", ["frame_flange", "Hotend mount", "NEMA17 motor", "625pillow",
                                  "plate 3-20", "Part1", "01_00_00-shredder_unit"])
def test_names_that_say_nothing_of_a_fastener(name):
    assert parse_designation(name) is None


def test_sizes_the_catalogue_does_not_know_are_not_read():
    # M7 exists (ISO 261 second choice); M13 does not: no thread, no size
    assert parse_designation("bolt M13x40").thread is None
    # 3-20 is no Unified size (ASME B1.1): not read as a thread
    assert parse_designation("screw 3-20").thread is None


def test_metric_pitch_or_length():
    # ISO 261: 1.25 is a pitch of M10 (fine), 1.5 the coarse pitch of M10; 3 is none
    assert (parse_designation("M10x1.25 screw").thread, parse_designation("M10x1.25 screw").length) == ("M10x1.25", None)
    assert parse_designation("M10x1.5x30 bolt").length == 30.0
    assert parse_designation("M3x3 set screw").length == 3.0


def test_every_head_kind_of_the_standards_is_a_catalogue_head_kind():
    from geomjoint.catalog.tables import load_table

    for r in load_table("product_standards"):
        if r["family"] == "bolt":
            assert catalog.head_kind(r["kind"]) in catalog.HEAD_KINDS + ("pan slotted",), r["standard"]
    with pytest.raises(InputError, match="ISO 898"):
        product_standard("ISO 898")


@pytest.mark.parametrize("name", ["bearing 608ZZ", "deep groove ball bearing _13", "lead screw T8x8",
                                  "heat set insert M3x5.7", "02_01_01-extruder screw", "spacer M5"])
def test_names_that_say_the_part_is_no_fastener(name):
    # ring- and bolt-shaped parts that are no fasteners (common practice): the recogniser leaves them
    assert parse_designation(name).family == "other"
