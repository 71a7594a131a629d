"""Fasteners as fastener libraries model them (tests/corpus/make_corpus.py, "hardware as
fastener libraries model it"): every head kind by its shape, nuts, washers, set screws,
studs and surface bodies, each read back with the size, length and kind the standards give,
and every head kind the scan reports accepted back by the job and the engine."""
from __future__ import annotations

import json
import sys
from pathlib import Path

import cadquery as cq
import pytest

from geomjoint.cli import main
from geomjoint.geometry.scan import scan_model, scan_to_json

sys.path.insert(0, str(Path(__file__).resolve().parent / "corpus"))
import make_corpus as mc  # noqa: E402


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    """Every reproduction written once, scanned once."""
    out = {}
    folder = tmp_path_factory.mktemp("hardware")
    for kind in ("hex", "socket", "button", "pan", "cheese", "flange", "countersunk", "square nut",
                 "flange nut", "lock nut", "set screw", "set screw unnamed", "stud", "stud unnamed", "shell", "open shell", "helical thread"):
        path = folder / f"{kind.replace(' ', '_')}.step"
        expect = mc.hardware_model(path, kind)
        out[kind] = (path, expect, scan_model(path))
    return out


def _codes(joint):
    return [f.code for f in joint.findings]


@pytest.mark.parametrize("kind", ["hex", "socket", "button", "pan", "cheese", "flange", "countersunk",
                                  "square nut", "flange nut", "lock nut", "shell", "helical thread"])
def test_each_head_kind_is_read_with_its_size_and_length(built, kind):
    _, expect, scan = built[kind]
    [joint] = scan.joints
    assert joint.bolt is not None and joint.bolt.head_kind == expect["head"]
    assert joint.nominal == expect["nominal"]
    # the nominal length as the standards define it: bearing face to tip (ISO 4014, ISO 4762,
    # ISO 7380, ISO 7045, ISO 1207, ISO 4162); overall for countersunk heads (ISO 10642)
    assert joint.bolt.length == pytest.approx(expect["length"], abs=1e-3)
    assert joint.kind == expect.get("joint_kind", "through")
    # no finding claims what the model does not have, and the name agrees with the shape
    assert not {"gap", "overlap", "name-mismatch", "interference"} & set(_codes(joint)), joint.findings
    assert not [f for f in joint.findings if f.severity == "fail"], joint.findings


def test_hex_head_with_chamfer_and_washer_face_sits_on_its_washer(built):
    """The issue's machine frame: 'screw ISO 4017 M12x40' on a DIN 125 washer, read as
    countersunk M12x47.5 with a 7.5 mm gap before; now hex M12x40 bearing on the washer."""
    _, expect, scan = built["hex"]
    [joint] = scan.joints
    bolt = joint.bolt
    assert bolt.head_kind == "hex" and bolt.head_width == pytest.approx(18.0)   # ISO 4017 M12 s = 18
    assert bolt.head_height == pytest.approx(7.5)                               # k = 7.5 with the washer face
    assert bolt.bearing_diameter == pytest.approx(16.8)       # the washer face as modelled (d_w min 16.63)
    assert [l.role for l in joint.layers] == ["washer", "member", "member"]
    assert joint.layers[0].part == "DIN 125 A 13" and joint.layers[0].start == pytest.approx(0.0, abs=1e-6)
    assert joint.grip == pytest.approx(expect["grip"])
    assert joint.head_bearing_diameter == pytest.approx(24.0)  # DIN 125 A 13 / ISO 7089 M12: d2 = 24
    assert joint.nut.kind == "hex" and joint.nut.bearing_diameter == pytest.approx(0.95 * 18.0)


def test_chamfered_socket_head_is_not_countersunk(built):
    # the top chamfer narrows towards the top: no seat under the head
    bolt = built["socket"][2].joints[0].bolt
    assert bolt.head_kind == "socket" and bolt.head_height == pytest.approx(8.0)   # ISO 4762 M8 k = 8


def test_countersunk_head_by_its_seat_referred_to_the_plate_surface(built):
    _, expect, scan = built["countersunk"]
    [joint] = scan.joints
    # ISO 10642 M6: d_k 13.44 at 90 degrees; the grip runs from the plate surface (the head's top)
    assert joint.bolt.head_width == pytest.approx(13.44)
    assert joint.grip == pytest.approx(expect["grip"])
    assert joint.layers[0].countersink == pytest.approx(13.44)


def test_flange_head_bears_on_its_flange(built):
    bolt = built["flange"][2].joints[0].bolt
    assert bolt.head_width == pytest.approx(13.0) and bolt.bearing_diameter == pytest.approx(18.0)  # ISO 4162 M8 s, d_c


def test_button_pan_and_cheese_by_the_catalogue_tables(built):
    # ISO 7380-1 M5 d_k 9.5; ISO 7045 M4 d_k 8; ISO 1207 M5 d_k 8.5 (from memory)
    widths = {k: built[k][2].joints[0].bolt.head_width for k in ("button", "pan", "cheese")}
    assert widths == pytest.approx({"button": 9.5, "pan": 8.0, "cheese": 8.5})


@pytest.mark.parametrize("kind, nut_kind", [("square nut", "square"), ("lock nut", "lock"), ("hex", "hex"),
                                            ("flange nut", "flange")])
def test_nut_kinds(built, kind, nut_kind):
    nut = built[kind][2].joints[0].nut
    assert nut is not None and nut.kind == nut_kind
    if kind == "square nut":
        assert nut.width == pytest.approx(10.0)        # DIN 557 M6 s = 10 (from memory)
    if kind == "flange nut":
        # ISO 4161 M8: the flange d_c 17.9 bears (from memory); the joint's nut face is the flange
        assert nut.bearing_diameter == pytest.approx(17.9)
        assert built[kind][2].joints[0].nut_bearing_diameter == pytest.approx(17.9)


@pytest.mark.parametrize("kind", ["set screw", "set screw unnamed"])
def test_a_set_screw_is_hardware_not_a_joint(built, kind):
    _, expect, scan = built[kind]
    assert scan.joints == [] and not scan.bolts
    [screw] = scan.headless
    assert (screw.part, screw.kind) == (expect["part"], "set screw")
    assert screw.d == pytest.approx(4.0) and screw.length == pytest.approx(expect["length"])
    doc = scan_to_json(scan)
    assert doc["hardware"] == [{"part": expect["part"], "kind": "set screw", "d": 4.0, "length": 6.0,
                                "nominal": "M4" if kind == "set screw" else None}]


@pytest.mark.parametrize("kind", ["stud", "stud unnamed"])
def test_a_stud_with_a_nut_is_a_tapped_joint_headed_by_the_nut(built, kind):
    _, expect, scan = built[kind]
    [joint] = scan.joints
    assert joint.kind == "tapped" and joint.nominal == "M8"
    assert joint.bolt.nut_head == expect["nut"] and joint.nut is None
    assert joint.bolt.length == pytest.approx(expect["length"]) and joint.grip == pytest.approx(expect["grip"])
    assert "stud" in _codes(joint) and "gap" not in _codes(joint)
    assert joint.layers[-1].part == "block" and joint.layers[-1].role == "tapped"


def test_a_closed_surface_body_is_read_as_a_solid(built):
    _, expect, scan = built["shell"]
    assert [f.code for f in scan.findings] == ["surface-body"] and scan.findings[0].severity == "info"
    assert expect["part"] in scan.findings[0].message
    assert scan.model.part(expect["part"]).surface_body


def test_an_open_surface_body_is_one_warning_naming_it(built):
    _, expect, scan = built["open shell"]
    [finding] = scan.findings
    assert (finding.severity, finding.code) == ("warn", "surface-body") and expect["part"] in finding.message
    assert not scan.bolts and expect["part"] not in [p.name for p in scan.model.parts]


def test_scan_json_states_the_head_kind(built):
    doc = scan_to_json(built["button"][2])
    assert doc["joints"][0]["hardware"]["bolt"]["head"] == "button"


@pytest.mark.parametrize("kind", ["button", "pan", "cheese", "flange", "countersunk", "stud"])
def test_check_accepts_every_head_kind_its_scan_reports(built, kind, tmp_path):
    """`check` refused its own scan before ("'countersunk' is not one of hex, socket")."""
    path = tmp_path / built[kind][0].name
    path.write_bytes(built[kind][0].read_bytes())
    assert main(["init", str(path)]) == 0
    job = path.with_suffix(".toml")
    text = job.read_text().replace("[defaults]", 'default_material = "steel"\n\n[defaults]', 1)
    job.write_text(text + '\n[[load]]\njoints = "*"\naxial = { max = "500 N" }\n')
    out = tmp_path / "out"
    assert main(["check", str(job), "--out", str(out), "--workers", "1", "--outputs", "json"]) in (0, 1)
    doc = json.loads((out / "results.json").read_text())
    assert not doc.get("not_analysed"), doc.get("not_analysed")
    [joint] = doc["joints"]
    assert joint["checks"]
    assert joint["fastener"]["head"] == ("hex" if kind == "stud" else kind)
    assert joint["fastener"]["length"] == pytest.approx(built[kind][1]["length"])


def test_the_name_disagreeing_with_the_shape_is_a_warning_stating_both(tmp_path):
    """A hex bolt M12x40 named as a socket screw M12x45: the shape decides, the finding says both."""
    path = tmp_path / "misnamed.step"
    a = cq.Assembly(name="misnamed")
    top = mc._plates(a, 13.5, (12.0, 12.0), (60.0, 60.0))
    a.add(mc.hex_bolt_as_library(12.0, 40.0, 18.0, 7.5, 16.8), name="DIN 912 M12x45", loc=cq.Location(cq.Vector(0, 0, top)))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.bolt.head_kind == "hex" and joint.nominal == "M12" and joint.bolt.length == pytest.approx(40.0)
    said = [f.message for f in joint.findings if f.code == "name-mismatch"]
    assert any("M12x45" in m and "40.00 mm" in m for m in said), said
    assert any("socket head" in m and "hex head" in m for m in said), said
    assert all(f.severity == "warn" for f in joint.findings if f.code == "name-mismatch")


def test_a_shank_modelled_at_the_minor_diameter_takes_its_size_from_the_name(tmp_path):
    """Libraries that draw the thread at its minor diameter: M12 d3 = 9.853 mm (ISO 724), which
    alone reads as M10; the name's M12 decides, with an info finding."""
    from geomjoint import catalog

    d3 = catalog.thread("M12").d3
    path = tmp_path / "minor.step"
    a = cq.Assembly(name="minor")
    top = mc._plates(a, 13.5, (12.0, 12.0), (60.0, 60.0))
    a.add(mc.hex_bolt_as_library(d3, 40.0, 18.0, 7.5, 16.8), name="ISO 4017 M12x40", loc=cq.Location(cq.Vector(0, 0, top)))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.nominal == "M12" and "modelled-diameter" in _codes(joint)
    assert "name-mismatch" not in _codes(joint)


def _single_part(tmp_path, shape, name):
    path = tmp_path / "one.step"
    a = cq.Assembly(name="one")
    a.add(shape, name=name)
    mc.write_step(a, path)
    return scan_model(path)


@pytest.mark.parametrize("name, washer", [("ring_17", False), ("washer_17", True), ("ball bearing ring", False)])
def test_a_thick_ring_is_a_washer_only_when_named_so(tmp_path, name, washer):
    # 6.4 / 12 / 2.5: h/d1 = 0.39, above ISO 7089's 0.14-0.25 (from memory): a spacer unless named a washer
    scan = _single_part(tmp_path, cq.Workplane("XY").circle(6.0).circle(3.2).extrude(2.5), name)
    assert bool(scan.washers) == washer


@pytest.mark.parametrize("name, bolt", [("Part23", False), ("shaft screw", True)])
def test_a_stepped_shaft_like_no_catalogue_head_is_a_bolt_only_when_named_so(tmp_path, name, bolt):
    # a 25 mm shank under a 55 x 40 mm collar: no ISO 4762 / ASME B18.3 head of 1 in is near it
    shaft = cq.Workplane("XY").circle(27.5).extrude(40.0).union(cq.Workplane("XY").circle(12.5).extrude(-60.0))
    scan = _single_part(tmp_path, shaft, name)
    assert bool(scan.bolts) == bolt


def test_inch_button_heads_and_a_square_nut_in_a_model_written_in_metres(tmp_path):
    """The issue's intake rollers: #10-32 x 1/2 BHCS at the nominal diameter, one in a 4.04 mm
    tap-drill hole, one with a square nut; the file in metres, the names in inches."""
    path = tmp_path / "intake.step"
    expect = mc.inch_robot_model(path)
    scan = scan_model(path)
    assert scan.model.file_unit == "m"
    assert len(scan.joints) == 2
    for joint in scan.joints:
        assert joint.bolt.head_kind == expect["head"] and joint.nominal == expect["nominal"]
        assert joint.bolt.length == pytest.approx(expect["length"], abs=1e-3)   # 1/2 in
        assert "name-mismatch" not in _codes(joint) and "interference" not in _codes(joint)
    tapped, through = sorted(scan.joints, key=lambda j: j.kind == "through")
    assert tapped.kind == "tapped"
    assert through.nut.part == expect["nut"] and through.nut.kind == "square"
    assert through.nut.width == pytest.approx(0.375 * 25.4)     # ASME B18.6.3 #10 square nut F = 3/8 in


def test_a_nut_named_for_another_size_is_a_warning(tmp_path):
    path = tmp_path / "nut_named_m10.step"
    a = cq.Assembly(name="nut_named")
    top = mc._plates(a, 13.5, (12.0, 12.0), (60.0, 60.0))
    a.add(mc.hex_bolt_as_library(12.0, 40.0, 18.0, 7.5, 16.8), name="ISO 4017 M12x40", loc=cq.Location(cq.Vector(0, 0, top)))
    a.add(mc.chamfered_hex_nut(12.0, 18.0, 10.8), name="ISO 4032 M10",
          loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    said = [f.message for f in joint.findings if f.code == "name-mismatch"]
    assert said == ["ISO 4032 M10: name says a M10 nut but the joint is M12"]


def test_a_named_head_kind_the_catalogue_lacks_at_that_size_is_a_catalogue_gap(tmp_path):
    """M2 button head screws exist (as catalogue parts) but ISO 7380-1 starts at M3: the dome is
    read as the nearest kind the catalogue has, and the finding says why, not that the name is wrong."""
    path = tmp_path / "m2_button.step"
    a = cq.Assembly(name="m2")
    top = mc._plates(a, 2.4, (2.0, 2.0), (20.0, 20.0))
    a.add(mc.button_screw(2.0, 6.0, 3.8, 1.1, 1.3), name="M2x6 BHCS", loc=cq.Location(cq.Vector(0, 0, top)))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.bolt.head_kind in ("pan", "pan slotted", "cheese")
    assert "name-mismatch" not in _codes(joint)
    [gap] = [f for f in joint.findings if f.code == "catalog-gap" and "button" in f.message]
    assert "BHCS" in gap.message and "M2" in gap.message


def test_a_low_socket_head_is_read_as_the_cheese_head_it_matches(tmp_path):
    """DIN 7984 M8: d_k 13, k 5 (from memory), the ISO 1207 cheese head's d_k and k; no mismatch."""
    path = tmp_path / "low_head.step"
    a = cq.Assembly(name="low_head")
    top = mc._plates(a, 9.0, (8.0, 8.0))
    a.add(mc.socket_screw_as_library(8.0, 25.0, 13.0, 5.0, 6.0), name="DIN 7984 M8x25",
          loc=cq.Location(cq.Vector(0, 0, top)))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.bolt.head_kind == "cheese" and joint.bolt.head_height == pytest.approx(5.0)
    assert "name-mismatch" not in _codes(joint)


@pytest.mark.parametrize("name", ["Part12", "M3x10 standoff"])
def test_a_male_female_hex_standoff_is_no_bolt(tmp_path, name):
    """A hex body 10 mm high (3.3 d) on an M3 stud: ISO 4014 hex heads are 0.6-0.7 d high (from
    memory); the standoff is a part with a tapped hole, not a hex bolt."""
    body = cq.Workplane("XY").polygon(6, 5.5 / 0.8660254).extrude(10.0).faces(">Z").workplane().hole(2.5, 6.0)
    standoff = body.union(cq.Workplane("XY").circle(1.5).extrude(-6.0))
    scan = _single_part(tmp_path, standoff, name)
    assert not scan.bolts and not scan.nuts


@pytest.mark.parametrize("af_in, kind", [(0.75, "hex"), (0.875, "heavy hex")])
def test_inch_hex_and_heavy_hex_heads_by_their_width(tmp_path, af_in, kind):
    # ASME B18.2.1 1/2 in: hex bolt F = 3/4 in, heavy hex F = 7/8 in, H = 11/32 in (from memory)
    path = tmp_path / "inch_hex.step"
    a = cq.Assembly(name="inch_hex")
    top = mc._plates(a, 14.0, (12.7, 12.7), (60.0, 60.0))
    a.add(mc.hex_bolt_as_library(12.7, 50.8, af_in * 25.4, 0.344 * 25.4, 0.95 * af_in * 25.4, 0.4),
          name="1/2-13 x 2 hex bolt", loc=cq.Location(cq.Vector(0, 0, top)))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.bolt.head_kind == kind and joint.nominal == "1/2-13 UNC"
    assert joint.bolt.length == pytest.approx(50.8)
    assert "name-mismatch" not in _codes(joint)


@pytest.mark.parametrize("name, bolt", [("clevis pin 8x30", False), ("ISO 2341 B 8x30", False), ("Part31", True),
                                        ("M8x30 button head screw", True)])
def test_a_headed_pin_named_so_is_no_screw(tmp_path, name, bolt):
    """An ISO 2341 clevis pin d 8 (head 14 x 3, from memory) is shaped like an ISO 7380 M8 button
    head (14 x 4.4): only its name tells; a pin by name (catalog.hole_parts) is no fastener."""
    pin = mc.button_screw(8.0, 30.0, 14.0, 3.0, 0.0001)
    scan = _single_part(tmp_path, pin, name)
    assert bool(scan.bolts) == bolt


def test_a_stud_with_a_nut_at_each_end_is_a_through_joint(tmp_path):
    """DIN 976 M10 threaded rod through two 12 mm plates, an ISO 4032 M10 nut (m 8.4) on each side."""
    path = tmp_path / "rod.step"
    a = cq.Assembly(name="rod")
    top = mc._plates(a, 11.0, (12.0, 12.0))
    a.add(mc.stud(10.0, 44.0), name="threaded rod DIN 976 M10", loc=cq.Location(cq.Vector(0, 0, -10.0)))
    a.add(mc.chamfered_hex_nut(10.0, 16.0, 8.4), name="ISO 4032 M10 upper", loc=cq.Location(cq.Vector(0, 0, top)))
    a.add(mc.chamfered_hex_nut(10.0, 16.0, 8.4), name="ISO 4032 M10 lower",
          loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.kind == "through" and joint.nominal == "M10"
    assert {joint.bolt.nut_head, joint.nut.part} == {"ISO 4032 M10 upper", "ISO 4032 M10 lower"}
    assert joint.grip == pytest.approx(24.0)
    assert not {"gap", "bolt-short"} & set(_codes(joint)), joint.findings


def test_a_knurled_socket_head_is_a_socket_head(tmp_path):
    """ISO 4762 M5 (d_k 8.5, k 5, socket 4; from memory) with a knurled side: no cylinder on the
    head, the outline stands at full radius over the whole height, the top is flat."""
    path = tmp_path / "knurled.step"
    a = cq.Assembly(name="knurled")
    top = mc._plates(a, 5.5, (5.0, 5.0), (30.0, 30.0))
    a.add(mc.knurled_socket_screw(5.0, 16.0, 8.5, 5.0, 4.0), name="Part4", loc=cq.Location(cq.Vector(0, 0, top)))
    a.add(mc.chamfered_hex_nut(5.0, 8.0, 4.7), name="Part5", loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.bolt.head_kind == "socket" and joint.nominal == "M5" and joint.bolt.length == pytest.approx(16.0)


def test_a_nylon_insert_nut_with_its_collar_is_a_lock_nut_bearing_on_its_hexagon(tmp_path):
    """ISO 7040 M8: s 13, h 9.5 (from memory), drawn with the insert's collar on top; unnamed."""
    path = tmp_path / "nyloc.step"
    a = cq.Assembly(name="nyloc")
    top = mc._plates(a, 9.0, (8.0, 8.0))
    a.add(mc.hex_bolt_as_library(8.0, 30.0, 13.0, 5.3, 11.8, 0.4), name="Part1", loc=cq.Location(cq.Vector(0, 0, top)))
    a.add(mc.nylon_insert_nut(8.0, 13.0, 9.5), name="Part2", loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.nut.kind == "lock" and joint.nut.height == pytest.approx(9.5)
    assert joint.nut.bearing_diameter == pytest.approx(0.95 * 13.0)   # the chamfered hexagon's face
    assert not {"gap", "overlap"} & set(_codes(joint))


def test_a_small_lock_nut_with_its_bore_at_the_minor_diameter(tmp_path):
    """ISO 7040 M3: s 5.5, h 4 (from memory), the bore drawn at D1 = 2.459 mm (ISO 724): 1.6 bores
    high but 1.33 d, a lock nut."""
    from geomjoint import catalog

    path = tmp_path / "m3_nyloc.step"
    a = cq.Assembly(name="m3")
    top = mc._plates(a, 3.4, (3.0, 3.0), (20.0, 20.0))
    a.add(mc.socket_screw_as_library(3.0, 12.0, 5.5, 3.0, 2.5), name="DIN 912 M3x12", loc=cq.Location(cq.Vector(0, 0, top)))
    a.add(mc.chamfered_hex_nut(catalog.thread("M3").D1, 5.5, 4.0), name="Part9",
          loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.nut is not None and joint.nut.kind == "lock" and joint.nominal == "M3"
