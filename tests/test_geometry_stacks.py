"""Joints and stack-ups of models built here with known dimensions.

The expected grips, layer positions and thicknesses are the numbers used to build the
models (an identity: what goes in must come out, to 1e-6 mm); hardware sizes are
checked against the standard tables named beside each assertion.
"""
from __future__ import annotations

import math
import os
import sys

import cadquery as cq
import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from geomjoint.geometry.scan import scan_model

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "samples"))
import make_samples as ms  # noqa: E402

TOL = 1e-6


def codes(joint):
    return sorted(f.code for f in joint.findings)


def bolted_stack(gap: float = 0.0, offset: float = 0.0, length: float = 45.0,
                 pts=((0.0, 0.0),), hole: float = 11.0) -> cq.Assembly:
    """Washer 2 / plate 8 / plate 10 / plate 12 / washer 2 / nut 8.4, M10 hex bolts from the top."""
    a = cq.Assembly(name="stack")
    cx = sum(x for x, _ in pts) / len(pts)
    cy = sum(y for _, y in pts) / len(pts)
    ly = 40 + max(y for _, y in pts) - min(y for _, y in pts)

    def plate(t, z0, dx=0.0):
        return ms.plate(60, ly, t, [(x - cx + dx, y - cy) for x, y in pts], hole, z0=z0).translate((cx, cy, 0))

    a.add(plate(12, 0.0), name="flange")
    a.add(plate(10, 12.0, offset), name="adapter")
    a.add(plate(8, 22.0 + gap), name="foot")
    top = 30.0 + gap
    for i, (x, y) in enumerate(pts, 1):
        a.add(ms.plain_washer(10.5, 20, 2), name=f"washer_top_{i}", loc=ms.down(top, x, y))
        a.add(ms.hex_bolt(10, length, 16, 6.4), name=f"bolt_M10x{length:g}_{i}", loc=ms.down(top + 2, x, y))
        a.add(ms.plain_washer(10.5, 20, 2), name=f"washer_bottom_{i}", loc=ms.up_from(0.0, x, y))
        a.add(ms.hex_nut(10, 16, 8.4), name=f"nut_M10_{i}", loc=ms.up_from(-2.0, x, y))
    return a


def test_two_plates_without_hardware():
    pts = [(-20, -15), (20, -15), (20, 15), (-20, 15)]
    a = cq.Assembly(name="pair")
    a.add(ms.plate(60, 50, 12, pts, 11.0), name="frame")
    a.add(ms.plate(60, 50, 10, pts, 11.0, z0=12.0), name="cover")
    res = scan_model(a)
    assert len(res.joints) == 4
    assert [j.id for j in res.joints] == ["J01", "J02", "J03", "J04"]
    for j in res.joints:
        assert j.kind == "through"
        assert j.grip == pytest.approx(22.0, abs=TOL)
        # no bolt, nut, counterbore or blind hole: the canonical +z rule orders the layers
        assert j.direction == pytest.approx((0, 0, 1), abs=1e-12)
        assert [(l.part, l.start, l.end) for l in j.layers] == [
            ("frame", pytest.approx(0.0, abs=TOL), pytest.approx(12.0, abs=TOL)),
            ("cover", pytest.approx(12.0, abs=TOL), pytest.approx(22.0, abs=TOL))]
        assert j.hole_diameter == pytest.approx(11.0, abs=TOL)
        # ISO 273 medium series: 11 mm is the clearance hole of M10 (from memory)
        assert j.nominal == "M10"
        assert "no-hardware" in codes(j)
        assert not [f for f in j.findings if f.severity == "fail"]
        # grip 22 + ISO 4032 M10 nut m = 8.4 + 2 pitches 3.0 = 33.4 -> 35 in the ISO 4017 series
        assert j.shortest_length == pytest.approx(35.0)
    # ids follow position: sorted by x, y, z of the axis point
    xs = [(round(j.point[0]), round(j.point[1])) for j in res.joints]
    assert xs == sorted(xs)


def test_local_thickness_from_the_hole_not_the_bounding_box():
    base = ms.plate(80, 40, 10, [(-20, 0)], 9.0)
    rib = cq.Workplane("XY").box(10, 40, 30, centered=(True, True, False)).translate((25, 0, 0))
    a = cq.Assembly(name="ribbed")
    a.add(base.union(rib), name="ribbed_bracket")
    a.add(ms.plate(30, 30, 6, [(0, 0)], 9.0, z0=10.0).translate((-20, 0, 0)), name="strap")
    (j,) = scan_model(a).joints
    thick = {l.part: l.thickness for l in j.layers}
    assert thick["ribbed_bracket"] == pytest.approx(10.0, abs=TOL)   # the bounding box says 30
    assert thick["strap"] == pytest.approx(6.0, abs=TOL)
    assert j.grip == pytest.approx(16.0, abs=TOL)


def test_bolted_stack_with_washers_and_nut():
    (j,) = scan_model(bolted_stack()).joints
    assert j.kind == "through"
    assert j.grip == pytest.approx(34.0, abs=TOL)
    expect = [("washer_top_1", "washer", 0, 2), ("foot", "member", 2, 10), ("adapter", "member", 10, 20),
              ("flange", "member", 20, 32), ("washer_bottom_1", "washer", 32, 34)]
    got = [(l.part, l.role, l.start, l.end) for l in j.layers]
    assert len(got) == len(expect)
    for (p, r, s, e), (gp, gr, gs, ge) in zip(expect, got):
        assert (p, r) == (gp, gr)
        assert gs == pytest.approx(s, abs=TOL) and ge == pytest.approx(e, abs=TOL)
    # the bolt decides the direction: head on top, so the axis points down
    assert j.direction == pytest.approx((0, 0, -1), abs=1e-9)
    assert j.point == pytest.approx((0, 0, 32.0), abs=TOL)
    assert j.bolt.part == "bolt_M10x45_1" and j.bolt.d == pytest.approx(10.0, abs=TOL)
    assert j.bolt.length == pytest.approx(45.0, abs=TOL) and j.bolt.head_kind == "hex"
    assert j.bolt.head_width == pytest.approx(16.0, abs=TOL)
    assert j.nut.part == "nut_M10_1" and j.nut.height == pytest.approx(8.4, abs=TOL)
    assert [w.part for w in j.washers] == ["washer_top_1", "washer_bottom_1"]
    assert j.head_bearing_diameter == pytest.approx(20.0, abs=TOL)   # the washer under the head
    assert j.nominal == "M10" and j.nominal_source == "bolt"
    assert not j.gaps
    # 45 - 34 - 8.4 = 2.6 mm past the nut, more than one pitch (ISO 261: M10 coarse P = 1.5)
    assert not [f for f in j.findings if f.severity != "info"]
    # layers keep the solids for the cone builder
    assert all(l.solid is not None for l in j.layers)


def test_gap_between_layers():
    (j,) = scan_model(bolted_stack(gap=0.5, length=50)).joints
    assert j.grip == pytest.approx(34.5, abs=TOL)
    assert len(j.gaps) == 1
    assert j.gaps[0].between == ("foot", "adapter")
    assert j.gaps[0].size == pytest.approx(0.5, abs=TOL)
    assert "gap" in codes(j)


def test_short_bolt_and_long_bolt_through():
    (short,) = scan_model(bolted_stack(length=40)).joints
    # 40 - 34 = 6 mm of thread for an 8.4 mm nut: ends inside the nut
    assert "bolt-short" in codes(short)
    (long_,) = scan_model(bolted_stack(length=100)).joints
    # protrusion 100 - 34 - 8.4 = 57.6 mm > 1 d; ISO 4014 b = 2d + 6 = 26 mm for L <= 125 (from memory):
    # unthreaded shank 74 mm > grip 34 mm reaches the nut
    assert "bolt-long" in codes(long_) and "shank-in-nut" in codes(long_)
    assert "bolt-short" not in codes(long_)


def test_misaligned_hole_is_one_joint_with_a_fail():
    (j,) = scan_model(bolted_stack(offset=0.4)).joints
    # radial clearances 0.5 + 0.5 mm (11 mm holes, 10 mm bolt) cover an offset of 0.4 mm
    assert "misaligned" not in codes(j)
    res = scan_model(bolted_stack(offset=1.2, pts=((0, 0), (0, 60))))
    assert len(res.joints) == 2
    for j in res.joints:
        assert "misaligned" in codes(j)
        assert j.misalignment == pytest.approx(1.2, abs=1e-6)


def _motion(assy: cq.Assembly, axis, angle, shift) -> cq.Assembly:
    top = cq.Assembly(name="moved")
    top.add(assy, name="inner", loc=cq.Location(cq.Vector(*shift), cq.Vector(*axis), angle))
    return top


@settings(max_examples=3, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(ax=st.tuples(*[st.floats(-1, 1)] * 3).filter(lambda v: np.linalg.norm(v) > 0.2),
       angle=st.floats(5, 355), shift=st.tuples(*[st.floats(-500, 500)] * 3))
def test_rigid_motion_keeps_joints_grips_and_findings(ax, angle, shift):
    base = scan_model(bolted_stack(gap=0.5, length=40, pts=((0, 0), (0, 60))))
    moved = scan_model(_motion(bolted_stack(gap=0.5, length=40, pts=((0, 0), (0, 60))), ax, angle, shift))
    assert len(moved.joints) == len(base.joints) == 2

    def signature(res):
        return sorted((round(j.grip, 6), tuple(round(l.thickness, 6) for l in j.layers),
                       tuple(codes(j))) for j in res.joints)

    assert signature(moved) == signature(base)
    # the axis turns with the model
    rot = cq.Location(cq.Vector(0, 0, 0), cq.Vector(*ax), angle).wrapped.Transformation()
    from OCP.gp import gp_Dir
    dz = gp_Dir(0, 0, -1).Transformed(rot)
    for j in moved.joints:
        assert abs(np.dot(j.direction, (dz.X(), dz.Y(), dz.Z()))) == pytest.approx(1.0, abs=1e-9)


def test_rotated_bolt_circle_not_along_an_axis():
    pcd, n = 80.0, 6
    pts = [(pcd / 2 * math.cos(2 * math.pi * k / n), pcd / 2 * math.sin(2 * math.pi * k / n)) for k in range(n)]
    a = cq.Assembly(name="flanges")
    a.add(ms.plate(110, 110, 14, pts, 13.5), name="pipe_flange")
    a.add(ms.plate(110, 110, 9, pts, 13.5, z0=14.0), name="blind_flange")
    res = scan_model(_motion(a, (1, 2, 3), 40.0, (10, -20, 30)))
    assert len(res.joints) == n
    rot = cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 2, 3), 40.0).wrapped.Transformation()
    from OCP.gp import gp_Dir
    dz = gp_Dir(0, 0, 1).Transformed(rot)
    for j in res.joints:
        assert j.grip == pytest.approx(23.0, abs=TOL)
        assert abs(np.dot(j.direction, (dz.X(), dz.Y(), dz.Z()))) == pytest.approx(1.0, abs=1e-9)
        # ISO 273 medium: 13.5 mm is the M12 clearance hole (from memory)
        assert j.nominal == "M12"
    # the axis points lie on the bolt circle: distances from the pattern centre are pcd / 2
    c = np.array([10, -20, 30.0])
    for j in res.joints:
        p = np.array(j.point) - c
        radial = p - np.dot(p, j.direction) * np.array(j.direction)
        assert np.linalg.norm(radial) == pytest.approx(pcd / 2, abs=1e-6)


def test_part_placed_twice_gives_two_joints():
    sub = cq.Assembly(name="clamp")
    sub.add(ms.plate(30, 30, 6, [(0, 0)], 9.0), name="clamp_lower")
    sub.add(ms.plate(30, 30, 5, [(0, 0)], 9.0, z0=6.0), name="clamp_upper")
    top = cq.Assembly(name="two_clamps")
    top.add(sub, name="clamp_a")
    top.add(sub, name="clamp_b", loc=cq.Location(cq.Vector(100, 0, 0)))
    res = scan_model(top)
    assert len(res.joints) == 2
    assert {tuple(l.part for l in j.layers) for j in res.joints} == {
        ("clamp_lower", "clamp_upper"), ("clamp_lower#2", "clamp_upper#2")}
    assert all(j.grip == pytest.approx(11.0, abs=TOL) for j in res.joints)


def gearbox(screw_length: float | None = 25.0, cbore: float = 14.0) -> cq.Assembly:
    a = cq.Assembly(name="gearbox")
    housing = (cq.Workplane("XY").box(60, 60, 40, centered=(True, True, False)).translate((0, 0, -40))
               .faces(">Z").workplane().hole(6.8, 20))
    a.add(housing, name="housing_cast_iron")
    cover = (cq.Workplane("XY").box(60, 60, 18, centered=(True, True, False))
             .faces(">Z").workplane().cboreHole(9.0, cbore, 8.5))
    a.add(cover, name="cover")
    if screw_length:
        a.add(ms.socket_screw(8, screw_length, 13, 8), name=f"screw_M8x{screw_length:g}", loc=ms.down(9.5))
    return a


def test_counterbored_socket_screw_in_blind_tapped_hole():
    (j,) = scan_model(gearbox(25.0)).joints
    assert j.kind == "tapped"
    assert j.bolt.head_kind == "socket" and j.bolt.d == pytest.approx(8.0, abs=TOL)
    assert j.bolt.head_width == pytest.approx(13.0, abs=TOL)
    assert j.bolt.length == pytest.approx(25.0, abs=TOL)
    # the head bears on the counterbore seat 9.5 mm above the housing
    assert j.grip == pytest.approx(9.5, abs=TOL)
    cover, housing = j.layers
    assert (cover.part, cover.role, cover.counterbore) == ("cover", "member", pytest.approx(14.0))
    assert cover.start == pytest.approx(0.0, abs=TOL) and cover.end == pytest.approx(9.5, abs=TOL)
    assert housing.role == "tapped" and not housing.through
    assert housing.start == pytest.approx(9.5, abs=TOL) and housing.thickness == pytest.approx(20.0, abs=TOL)
    assert j.tapped_depth == pytest.approx(20.0, abs=TOL)
    assert housing.hole_diameter == pytest.approx(6.8, abs=TOL)
    # 25 - 9.5 = 15.5 mm engaged >= 1.25 d = 10 mm in cast iron (common practice); tip 4.5 mm off the bottom
    assert not [f for f in j.findings if f.severity != "info"]
    assert j.nominal == "M8"


def test_screw_bottoming_and_too_little_engagement():
    (long_,) = scan_model(gearbox(35.0)).joints
    assert "bolt-long" in codes(long_)          # 35 - 9.5 = 25.5 mm into a 20 mm deep hole
    (short,) = scan_model(gearbox(16.0)).joints
    assert "bolt-short" in codes(short)         # 6.5 mm engaged < 1.25 d = 10 mm (cast iron)
    assert "bolt-long" not in codes(short)


def test_no_screw_nominal_from_holes_and_seat_too_small():
    (j,) = scan_model(gearbox(None, cbore=12.0)).joints
    assert j.kind == "tapped" and j.bolt is None
    # the blind hole is last: the counterbored cover is on the head side
    assert [l.part for l in j.layers] == ["cover", "housing_cast_iron"]
    assert j.grip == pytest.approx(9.5, abs=TOL)
    # ISO 273 medium: 9 mm clears M8 (from memory)
    assert j.nominal == "M8" and j.nominal_source == "clearance hole"
    # ISO 4762 M8 head diameter 13 mm does not fit a 12 mm counterbore
    assert "seat-too-small" in codes(j) and "no-hardware" in codes(j)
    (ok,) = scan_model(gearbox(None, cbore=14.0)).joints
    assert "seat-too-small" not in codes(ok)


def test_through_tapped_plate_and_nonstandard_hole():
    a = cq.Assembly(name="tapped_through")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0, z0=20.0), name="bracket")
    a.add(ms.plate(40, 40, 20, [(0, 0)], 8.5, z0=0.0), name="base_block")
    (j,) = scan_model(a).joints
    # the smaller bore (ISO 2306 tap drill 8.5 for M10, from memory) is the tapped end
    assert j.kind == "tapped" and j.layers[-1].part == "base_block"
    assert j.direction == pytest.approx((0, 0, -1), abs=1e-12)
    assert j.grip == pytest.approx(10.0, abs=TOL)
    assert j.tapped_depth == pytest.approx(20.0, abs=TOL)
    assert j.nominal == "M10"
    b = bolted_stack(hole=11.6, length=45)
    (k,) = scan_model(b).joints
    # ISO 273 for M10: 10.5 / 11 / 12 mm; 11.6 is none of them
    assert "hole-not-standard" in codes(k)


def test_counterbore_marks_the_head_side_without_hardware():
    a = cq.Assembly(name="cb_pair")
    a.add(ms.plate(40, 40, 12, [(0, 0)], 9.0), name="base")
    cover = (cq.Workplane("XY").box(40, 40, 14, centered=(True, True, False)).translate((0, 0, 12))
             .faces(">Z").workplane().cboreHole(9.0, 15.0, 6.0))
    a.add(cover, name="cover")
    (j,) = scan_model(a).joints
    # without the counterbore rule the canonical direction would be +z
    assert j.direction == pytest.approx((0, 0, -1), abs=1e-12)
    assert [l.part for l in j.layers] == ["cover", "base"]
    # the head bears on the seat 6 mm below the top: 8 mm of cover + 12 mm of base
    assert j.layers[0].thickness == pytest.approx(8.0, abs=TOL)
    assert j.grip == pytest.approx(20.0, abs=TOL)
    assert j.point == pytest.approx((0, 0, 20.0), abs=TOL)


def test_tapped_hole_modelled_at_nominal_diameter_is_engagement():
    a = cq.Assembly(name="cosmetic")
    block = (cq.Workplane("XY").box(40, 40, 30, centered=(True, True, False)).translate((0, 0, -30))
             .faces(">Z").workplane().hole(8.0, 18))
    a.add(block, name="block_steel")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 9.0), name="strap")
    a.add(ms.socket_screw(8, 20, 13, 8), name="screw", loc=ms.down(10.0))
    (j,) = scan_model(a).joints
    assert j.kind == "tapped" and j.layers[-1].part == "block_steel"
    assert j.grip == pytest.approx(10.0, abs=TOL) and j.tapped_depth == pytest.approx(18.0, abs=TOL)
    # the 8 mm screw fills the 8 mm bore: thread engagement, not interference;
    # 20 - 10 = 10 mm engaged >= 1.0 d in steel (common practice)
    assert not [f for f in j.findings if f.severity != "info"]


def test_bolt_wider_than_a_hole_is_interference():
    a = cq.Assembly(name="tight")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0), name="lower")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0, z0=10.0), name="upper")
    a.add(ms.hex_bolt(12, 40, 18, 7.5), name="bolt", loc=ms.down(20.0))
    a.add(ms.hex_nut(12, 18, 10.8), name="nut", loc=ms.up_from(0.0))
    (j,) = scan_model(a).joints
    assert "interference" in codes(j)


def test_stack_ends_at_the_nut_and_nut_side_counterbore():
    a = cq.Assembly(name="recessed_nut")
    lower = (cq.Workplane("XY").box(40, 40, 20, centered=(True, True, False))
             .faces("<Z").workplane().cboreHole(11.0, 20.0, 10.0))
    a.add(lower, name="lower")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0, z0=20.0), name="upper")
    a.add(ms.hex_bolt(10, 45, 16, 6.4), name="bolt_M10x45", loc=ms.down(30.0))
    a.add(ms.hex_nut(10, 16, 8.4), name="nut", loc=ms.up_from(10.0))
    # a plate 3 mm under the nut on the same axis is not part of this joint
    a.add(ms.plate(40, 40, 5, [(0, 0)], 11.0, z0=-1.4 - 5.0), name="guard")
    (j,) = scan_model(a).joints
    assert [l.part for l in j.layers] == ["upper", "lower"]
    # the nut bears on the counterbore seat 10 mm up: grip = 10 + 10 mm
    assert j.layers[1].thickness == pytest.approx(10.0, abs=TOL)
    assert j.grip == pytest.approx(20.0, abs=TOL)
    assert not j.gaps


def test_drill_point_of_a_blind_hole_is_not_thread_depth():
    # 6.8 mm tap drill 20 mm deep with a 118 deg drill point (common practice)
    h_cone = 3.4 / math.tan(math.radians(59))
    block = cq.Workplane("XY").box(40, 40, 40, centered=(True, True, False)).translate((0, 0, -40))
    drill = cq.Solid.makeCylinder(3.4, 20, cq.Vector(0, 0, -20), cq.Vector(0, 0, 1)).fuse(
        cq.Solid.makeCone(0, 3.4, h_cone, cq.Vector(0, 0, -20 - h_cone), cq.Vector(0, 0, 1)))
    block = block.cut(cq.Workplane().add(drill))
    a = cq.Assembly(name="drilled")
    a.add(block, name="housing")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 9.0), name="lid")
    (j,) = scan_model(a).joints
    assert j.kind == "tapped"
    assert j.tapped_depth == pytest.approx(20.0, abs=TOL)
    assert j.layers[-1].hole.depth == pytest.approx(20.0 + h_cone, abs=TOL)


def test_countersunk_screw_in_a_countersunk_cover():
    # ISO 10642 M8 (from memory): head diameter about 16 mm, 90 deg head; modelled 16 mm, 4 mm high
    head = cq.Solid.makeCone(4.0, 8.0, 4.0, cq.Vector(0, 0, -4), cq.Vector(0, 0, 1))
    shank = cq.Solid.makeCylinder(4.0, 26.0, cq.Vector(0, 0, -30), cq.Vector(0, 0, 1))
    screw = cq.Workplane().add(head.fuse(shank))
    cover = (cq.Workplane("XY").box(40, 40, 12, centered=(True, True, False))
             .faces(">Z").workplane().cskHole(9.0, 16.0, 90))
    housing = (cq.Workplane("XY").box(40, 40, 30, centered=(True, True, False)).translate((0, 0, -30))
               .faces(">Z").workplane().hole(6.8, 25))
    a = cq.Assembly(name="csk")
    a.add(housing, name="housing_steel")
    a.add(cover, name="cover")
    a.add(screw, name="screw_M8x30", loc=cq.Location(cq.Vector(0, 0, 12)))
    (j,) = scan_model(a).joints
    assert j.bolt.head_kind == "countersunk"
    assert j.bolt.head_width == pytest.approx(16.0, abs=TOL)
    assert j.bolt.length == pytest.approx(30.0, abs=TOL)     # overall, as ISO 10642 counts it
    assert j.kind == "tapped"
    # referred to the cover's top face (flush with the head)
    assert j.grip == pytest.approx(12.0, abs=TOL)
    assert j.layers[0].countersink == pytest.approx(16.0, abs=1e-6)
    # 30 - 12 = 18 mm engaged in steel >= 1.0 d; 25 mm deep hole: no bottoming
    assert not [f for f in j.findings if f.severity != "info"]


def test_fine_clearance_at_the_far_end_is_not_a_thread():
    a = cq.Assembly(name="mixed_clearance")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0, z0=10.0), name="upper")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 10.5), name="lower")
    (j,) = scan_model(a).joints
    # ISO 273: 10.5 mm is the fine clearance of M10, not a tap drill (8.5, ISO 2306, from memory)
    assert j.kind == "through"
    assert [l.role for l in j.layers] == ["member", "member"]
    assert j.grip == pytest.approx(20.0, abs=TOL)
