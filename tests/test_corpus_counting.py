"""The corpus runner's counting rules (tests/realworld/run_corpus.py), on synthetic names and
rows: what counts as a modelled fastener, what a name states, how the failures are sorted
for the engineers who fix them, and the totals the issue's "done when" is judged by.

The names follow the conventions of fastener libraries and catalogue part numbers
(common practice): "<standard> M<d>x<l>", "M<d>x<l> <abbreviation>", "#<n>-<tpi> x <l>".
"""
from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent / "realworld"))
import run_corpus as rc  # noqa: E402


@pytest.mark.parametrize("name, kind", [
    ("screw ISO 4017 M12x40", "bolt"),
    ("DIN 933 M24x90", "bolt"),
    ("DIN931-M16x50", "bolt"),
    ("01_01_09-cylinder_screw_M5x25-DIN912", "bolt"),
    ("HDW-207_91290A012_M2x5mm_SHCS_91290A012", "bolt"),
    ("#10-32 x 1/2 BHCS", "bolt"),
    ("ISO 4026 M4x6", "bolt"),                 # set screw, by its standard
    ("Hexagon socket set screw M6", "bolt"),
    ("stud M10", "bolt"),
    ("bolt", "bolt"),                         # the bare word: AS1's products are named so
    ("01_01_11-nut_M5-DIN934", "nut"),
    ("ISO 4032 M12", "nut"),
    ("hex nut M8", "nut"),
    ("M5 locknut", "nut"),
    ("square_nut_10-32", "nut"),
    ("T-nut M5 for 2020", "nut"),             # a slot nut is the nut of its joint
    ("DIN 125 A 13", "washer"),
    ("washer_M5-ISO7089", "washer"),
    ("ISO 7089 - 12", "washer"),
    ("spring lockwasher M6", "washer"),
])
def test_names_that_say_fastener(name, kind):
    assert rc.fastener_kind(name) == kind


@pytest.mark.parametrize("name", [
    "lead screw T8x8",            # motion screws and their nuts
    "ballscrew SFU1204",
    "ball nut 1605",
    "T8 lead nut",
    "extruder feed screw",
    "608ZZ bearing",
    "M3 heat-set insert",          # an insert is the internal thread of a joint, not a nut
    "M3x10 standoff",
    "screw terminal 2 pole",
    "donut", "walnut block",       # "nut" inside another word
    "Cover plate", "student desk",
    "screwdriver 3 mm",
])
def test_names_that_do_not(name):
    assert rc.fastener_kind(name) is None


def test_is_fastener_name_is_bolt_or_screw_only():
    assert rc.is_fastener_name("screw ISO 4017 M12x40")
    assert not rc.is_fastener_name("washer M6") and not rc.is_fastener_name("hex nut M6")


def test_names_of_other_parts_are_told_apart():
    # hardware recognised in these is a false claim
    assert rc.names_other_part("608ZZ bearing") and rc.names_other_part("dowel pin 6x20")
    assert not rc.names_other_part("bracket") and not rc.names_other_part("DIN 912 M5x20")


@pytest.mark.parametrize("name, stated", [
    ("screw ISO 4017 M12x40", ("M12", 40.0)),
    ("DIN 933 M24 x 90", ("M24", 90.0)),
    ("M12x1.5x40 DIN 961", ("M12", 40.0)),          # fine pitch: size and length, pitch aside
    ("M2,5x6 ISO 7380", ("M2.5", 6.0)),              # decimal comma
    ("#10-32 x 1/2 BHCS", ("#10-32", 12.7)),         # 1/2 in = 12.7 mm
    ("1/4-20 x 1 1/4 SHCS", ("1/4-20", 31.75)),      # 1.25 in = 31.75 mm
    ("1/4-20 x 1-1/4 SHCS", ("1/4-20", 31.75)),
    ("hex nut M8", None),                            # a size without a length
    ("bolt", None),
])
def test_what_a_name_states(name, stated):
    assert rc.stated_size(name) == stated


def test_designations_match_the_stated_size_only():
    assert rc.designation_matches("M12", "M12") and rc.designation_matches("M12", "M12x1.5")
    assert rc.designation_matches("#10-32", "#10-32 UNF") and rc.designation_matches("1/4-20", "1/4-20 UNC")
    assert not rc.designation_matches("#10-32", "#10-24 UNC")       # issue #15 item 10
    assert not rc.designation_matches("M12", "M1.6") and not rc.designation_matches("M12", None)


def test_starter_job_gets_a_default_material_and_a_load_only_with_joints():
    starter = "model = \"m.step\"\n\n[defaults]\ngrade = \"8.8\"\n"
    with_load = rc.starter_with_load(starter, True)
    assert with_load.index('default_material = "steel"') < with_load.index("[defaults]")
    assert with_load.count("[[load]]") == 1 and 'joints = "*"' in with_load
    assert "[[load]]" not in rc.starter_with_load(starter, False)


def _row(**kw):
    base = {"file": "m.step", "read": "exit 0", "joints": 2, "fasteners": 4, "recognised": 3, "stated": 2,
            "stated_ok": 1, "shape_only": 0, "false": 0, "checked": 2, "not_analysed_count": 0,
            "check_exit": 1, "missed": [], "wrong": [], "false_claims": [], "not_analysed": []}
    base.update(kw)
    return base


def test_failures_are_sorted_by_who_fixes_them():
    row = _row(missed=[{"part": "screw M5x20", "kind": "bolt", "taken_as": None}],
               wrong=[{"part": "DIN 933 M12x40", "read": "M12x47.5 (countersunk)", "stated": "M12x40"}],
               false_claims=[{"kind": rc.KIND_SHAPE, "where": "J01 (bolt / washer)",
                              "what": "gap of 7.50 mm reported between solids that touch"},
                             {"kind": rc.KIND_HOLES, "where": "J02 (screw)", "what": "a nut is assumed, but ..."}],
               not_analysed=[{"id": "J03", "reason": "no bolt modelled and no size could be inferred from its hole"},
                             {"id": "J04", "reason": "the FE mesher failed"}],
               check_exit=2, check_note="geomjoint: error: ...", remarks_in_results=False)
    kinds = [(f.kind, f.where) for f in rc.failures_of(row)]
    assert (rc.KIND_SHAPE, "screw M5x20") in kinds and (rc.KIND_SHAPE, "DIN 933 M12x40") in kinds
    assert (rc.KIND_SHAPE, "J01 (bolt / washer)") in kinds and (rc.KIND_HOLES, "J02 (screw)") in kinds
    assert (rc.KIND_HOLES, "J03") in kinds and (rc.KIND_OTHER, "J04") in kinds
    assert sum(1 for k, w in kinds if k == rc.KIND_OTHER and w == "-") == 2   # check exit 2, remarks lost
    assert rc.failures_of(_row()) == []                                        # a clean row has none


def test_a_refused_file_is_one_failure_of_reading():
    [f] = rc.failures_of({"file": "x.step", "read": "exit 2", "note": "x.step: damaged"})
    assert f.kind == rc.KIND_OTHER and "exit 2" in f.what


def test_totals_and_machine_scale_models():
    rows = [_row(file="a.step", seconds=12.5), _row(file="b.step", read="exit 2", joints=None, fasteners=0, recognised=0,
                                      stated=0, stated_ok=0, checked=None, check_exit=None),
            {"file": "c.step", "read": "absent"}]
    entries = [{"local": "a.step", "machine_scale": True, "cad_system": "SolidWorks 2016"},
               {"local": "b.step", "machine_scale": True, "cad_system": "Autodesk Inventor"},
               {"local": "c.step", "machine_scale": True, "cad_system": "CATIA V5"}]
    t = rc.totals(rows, entries)
    assert (t["read"], t["models"], t["checked_models"]) == (1, 3, 1)
    assert (t["fasteners"], t["recognised"], t["stated"], t["stated_ok"]) == (4, 3, 2, 1)
    assert (t["machine_scale"], t["machine_systems"]) == (2, 2)   # the absent file does not count
    assert t["seconds"] == 12.5    # the time of the whole run (rows without a time add none)
    text = rc.table(rows, entries)
    assert "fasteners recognised 3/4 (75 %)" in text and "read as named 1/2 (50 %)" in text


def test_status_page_groups_the_failures(tmp_path):
    row = _row(missed=[{"part": "screw M5x20", "kind": "bolt", "taken_as": "nut"},
                       {"part": "washer M5", "kind": "washer", "taken_as": None},
                       {"part": "washer M5#2", "kind": "washer", "taken_as": None},
                       {"part": "washer M5#3", "kind": "washer", "taken_as": None}])
    page = rc.markdown([row], [], "2026-12-02 15:00 UTC", "abc123 subject")
    assert page.startswith("# Corpus status — run 2026-12-02 15:00 UTC on main abc123")
    section = page.split("## (a)")[1].split("## (b)")[0]
    assert section.splitlines()[0].endswith(": 4")
    assert "screw M5x20: bolt not recognised (taken for a nut)" in section
    assert "washer M5 (×3): washer not recognised" in section       # placements of one product, one line


def test_manifest_entries_are_complete():
    entries = json.loads(rc.MANIFEST.read_text())
    for e in entries:
        assert {"repo", "commit", "path", "local", "sha256", "licence", "cad_system", "units"} <= set(e)
        for name, reason in e.get("not_fasteners", {}).items():
            assert name and len(reason) > 10            # every exception says why


def test_a_gap_is_false_only_where_the_faces_touch_and_the_gap_is_more_than_noise():
    assert rc.gap_contradicted(7.5, 0.0)          # a head read over its own height (issue 15 item 8)
    assert rc.gap_contradicted(3.0, 0.004)        # faces a few um apart, a 3 mm gap reported
    assert not rc.gap_contradicted(0.0025, 0.0025)   # what the model has, if idle
    assert not rc.gap_contradicted(1.0, 0.8)      # faces that do stand apart


def test_the_corpus_has_two_machine_scale_models_from_different_cad_systems():
    # issue 15: at least two machine-scale models (steel or aluminium, M8 and larger) from
    # different CAD systems
    machines = [e for e in json.loads(rc.MANIFEST.read_text()) if e.get("machine_scale")]
    assert len(machines) >= 2 and len({e["cad_system"].split()[0] for e in machines}) >= 2
