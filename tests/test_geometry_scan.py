"""The committed sample models give the expected joints and findings; the scan JSON
validates against the shared schema; names with sizes are read as hints.

Expected values are the dimensions the samples were built with (samples/make_samples.py).
"""
from __future__ import annotations

import json
import os

import jsonschema
import pytest

from geomjoint.geometry.hardware import size_hint
from geomjoint.geometry.scan import scan_model, scan_table, scan_to_json

ROOT = os.path.join(os.path.dirname(__file__), "..")
SAMPLES = os.path.join(ROOT, "samples")
SCHEMA_PATH = os.path.join(ROOT, "..", "shared", "schemas", "scan.schema.json")


@pytest.fixture(scope="module")
def schema():
    if not os.path.exists(SCHEMA_PATH):
        pytest.fail(f"scan schema missing at {SCHEMA_PATH}")
    with open(SCHEMA_PATH) as fh:
        return json.load(fh)


@pytest.fixture(scope="module")
def scans():
    return {name: scan_model(os.path.join(SAMPLES, name))
            for name in ("conveyor_bracket.step", "gearbox_cover.step", "pump_skid_inch.step")}


def _codes(j):
    return {f.code for f in j.findings}


def test_samples_validate_against_the_schema(scans, schema):
    for name, res in scans.items():
        doc = scan_to_json(res)
        jsonschema.validate(doc, schema)
        json.dumps(doc, allow_nan=False)           # finite numbers only
        assert len(doc["joints"]) == len(res.joints) > 0


def test_conveyor_bracket_findings(scans):
    res = scans["conveyor_bracket.step"]
    assert len(res.joints) == 4
    by_bolt = {j.bolt.part: j for j in res.joints}
    assert set(by_bolt) == {"bolt_M10x45_1", "bolt_M10x45_2", "bolt_M10x35_3", "bolt_M10x45_4"}
    for j in res.joints:
        assert j.kind == "through" and j.nominal == "M10"
        assert [l.role for l in j.layers] == ["washer", "member", "member", "member", "washer"]
        assert j.nut is not None and j.nut.height == pytest.approx(8.4, abs=1e-6)
    # pads at -y sit on the adapter plate: grip 2 + 8 + 10 + 12 + 2 = 34 mm
    assert by_bolt["bolt_M10x45_1"].grip == pytest.approx(34.0, abs=1e-6)
    assert _codes(by_bolt["bolt_M10x45_1"]) == {"grip"}
    # the +y pad stands 0.5 mm proud: gap, grip 34.5
    for b in ("bolt_M10x35_3", "bolt_M10x45_4"):
        j = by_bolt[b]
        assert j.grip == pytest.approx(34.5, abs=1e-6)
        assert "gap" in _codes(j) and j.gaps[0].size == pytest.approx(0.5, abs=1e-6)
    # hole 4 of the adapter plate is 1.2 mm off: more than 0.5 + 0.5 mm clearance
    assert "misaligned" in _codes(by_bolt["bolt_M10x45_4"])
    # M10x35 over a 34.5 mm grip ends inside its 8.4 mm nut
    assert "bolt-short" in _codes(by_bolt["bolt_M10x35_3"])
    assert res.failed


def test_gearbox_cover_findings(scans):
    res = scans["gearbox_cover.step"]
    assert len(res.joints) == 4
    for j in res.joints:
        assert j.kind == "tapped" and j.bolt.head_kind == "socket" and j.nominal == "M8"
        assert j.grip == pytest.approx(9.5, abs=1e-6)
        assert j.layers[-1].part == "housing_cast_iron" and j.layers[-1].role == "tapped"
        assert j.tapped_depth == pytest.approx(20.0, abs=1e-6)
    failing = {j.bolt.part for j in res.joints if "bolt-long" in _codes(j)}
    assert failing == {"screw_M8x35_2"}


def test_pump_skid_inch_reads_in_mm(scans):
    res = scans["pump_skid_inch.step"]
    assert len(res.joints) == 2
    for j in res.joints:
        # 1/2 in + 5/8 in = 1.125 in = 28.575 mm (1 in = 25.4 mm exactly)
        assert j.grip == pytest.approx(28.575, abs=1e-6)
        assert j.nominal == "1/2-13 UNC"
        assert j.bolt.length == pytest.approx(50.8, abs=1e-6)
        assert j.hole_diameter == pytest.approx(17 / 32 * 25.4, abs=1e-6)
        assert not [f for f in j.findings if f.severity == "fail"]
    assert not res.failed


def test_ids_are_stable_and_the_table_lists_every_joint(scans):
    again = scan_model(os.path.join(SAMPLES, "conveyor_bracket.step"))
    first = scans["conveyor_bracket.step"]
    assert [(j.id, j.bolt.part) for j in again.joints] == [(j.id, j.bolt.part) for j in first.joints]
    table = scan_table(first)
    for j in first.joints:
        assert j.id in table
    assert "misaligned" in table and "bolt-short" in table


def test_size_hints_from_part_names():
    h = size_hint("bolt_M10x40_1")
    assert (h.designation, h.d, h.length) == ("M10", 10.0, 40.0)
    h = size_hint("screw M12x1.25x50")
    assert (h.designation, h.length) == ("M12x1.25", 50.0)
    h = size_hint("bolt_1/2-13x2_1")
    # 2 in = 50.8 mm; ASME B1.1: 1/2 in = 12.7 mm, 13 threads per inch is UNC
    assert h.designation == "1/2-13 UNC" and h.d == pytest.approx(12.7) and h.length == pytest.approx(50.8)
    assert size_hint("frame_flange") is None


def test_name_hint_is_cross_checked_with_the_geometry():
    import sys

    import cadquery as cq
    sys.path.insert(0, SAMPLES)
    import make_samples as ms

    a = cq.Assembly(name="mislabelled")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 13.5), name="lower")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 13.5, z0=10.0), name="upper")
    a.add(ms.hex_bolt(12, 40, 18, 7.5), name="bolt_M10x40", loc=ms.down(20.0))
    (j,) = scan_model(a).joints
    assert j.bolt.d == pytest.approx(12.0)
    assert j.nominal == "M12"                      # the geometry wins
    assert "name-mismatch" in _codes(j)


def test_unknown_hole_size_gives_null_nominal_and_valid_json(schema):
    import sys

    import cadquery as cq
    sys.path.insert(0, SAMPLES)
    import make_samples as ms

    a = cq.Assembly(name="odd")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 17.3), name="lower")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 17.3, z0=10.0), name="upper")
    res = scan_model(a)
    # 17.3 mm is no ISO 273 clearance (M16: 17 / 17.5 / 18.5, from memory) and no tap drill:
    # with no fastener modelled the stack is no joint; it is set aside, saying so once
    assert res.joints == []
    (aside,) = res.set_aside
    j = aside.joint
    assert aside.code == "not-a-bolt-hole" and j.nominal is None and j.bolt is None
    assert j.grip == pytest.approx(20.0, abs=1e-6)
    doc = scan_to_json(res)
    jsonschema.validate(doc, schema)
    assert doc["joints"] == [] and doc["set_aside"][0]["hole_diameter"] == pytest.approx(17.3)
    assert [f["code"] for f in doc["findings"]] == ["not-a-bolt-hole"]


def test_every_finding_code_is_documented(scans):
    from geomjoint.geometry.scan import FINDING_CODES

    seen = {f.code for res in scans.values() for j in res.joints for f in j.findings}
    assert seen <= set(FINDING_CODES)
    assert {"misaligned", "gap", "bolt-short", "bolt-long", "grip"} <= seen


def test_inch_model_without_hardware_infers_an_inch_size(tmp_path):
    import sys

    import cadquery as cq
    sys.path.insert(0, SAMPLES)
    import make_samples as ms
    from geomjoint.geometry.model import load_model

    hole = 17 / 32 * 25.4   # 13.49 mm: ASME B18.2.8 normal fit of 1/2 in; also ISO 273 medium of M12 (13.5)
    a = cq.Assembly(name="inch_plates")
    a.add(ms.plate(60, 60, 12.7, [(0, 0)], hole), name="lower")
    a.add(ms.plate(60, 60, 12.7, [(0, 0)], hole, z0=12.7), name="upper")
    path = tmp_path / "plates_inch.step"
    ms.write_step(a, str(path), unit="INCH")
    assert load_model(str(path)).file_unit == "inch"
    (j,) = scan_model(str(path)).joints
    assert j.nominal == "1/2-13 UNC" and j.nominal_source == "clearance hole"
    assert j.grip == pytest.approx(25.4, abs=1e-6)
    mm = tmp_path / "plates_mm.step"
    ms.write_step(a, str(mm))
    assert load_model(str(mm)).file_unit == "mm"
    (k,) = scan_model(str(mm)).joints
    assert k.nominal == "M12"
