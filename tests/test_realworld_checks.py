"""What real CAD exports did to a whole check run, reproduced with the corpus builders
(tests/corpus/make_corpus.py) and tested end to end: a bearing face over a wider hole no
longer stops the check (exit 2 in two corpus models), the reader's remarks on the file reach
results.json and the reports, and the corpus runner's test for false claims measures what it
says.  The models are our own invented scenarios (a fan mount, a bracket)."""
from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

from conftest import validate_result
from geomjoint.cli import main

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE / "corpus"))
sys.path.insert(0, str(HERE / "realworld"))
import make_corpus as mc  # noqa: E402
import run_corpus as rc  # noqa: E402


def _starter_check(model: Path, capsys) -> tuple[int, Path]:
    """``geomjoint init`` then ``check`` with steel for every part and one load on every joint
    (what the corpus runner does): the exit code and the output folder."""
    assert main(["init", str(model)]) == 0
    job = model.with_suffix(".toml")
    job.write_text(rc.starter_with_load(job.read_text(), True))
    out = model.parent / "out"
    code = main(["check", str(job), "--out", str(out), "--workers", "1"])
    capsys.readouterr()
    return code, out


# ----------------------------------------------------------------------------- a bearing face over a wider hole

def test_a_head_over_a_wider_hole_fails_its_joint_and_the_check_goes_on(tmp_path, capsys):
    model = tmp_path / "fan_mount.step"
    mc.quirk_wide_hole_over_small(model)
    code, out = _starter_check(model, capsys)
    # the check ran to the end: exit 1 (a joint fails), not 2, and every output is written
    assert code == 1
    assert {"results.json", "report.txt", "report.html", "fan_mount-checked.step",
            "fan_mount-checked.glb"} <= {p.name for p in out.iterdir()}
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    [joint] = doc["joints"]
    assert joint["fastener"]["designation"] == "M5"     # inferred from the 5.5 mm bracket hole (ISO 273 medium)
    [over] = [f for f in joint["findings"] if f["code"] == "bearing-over-hole"]
    # ISO 4017 M5 d_w = 6.88 mm (from memory) or ISO 4032 nut d_w 6.9 against the 9 mm hole
    assert over["severity"] == "fail" and "9.00 mm hole of fan_housing" in over["message"]
    assert not joint["ok"]
    assert "does not cover the 9.00 mm hole" in (out / "report.txt").read_text()


def test_bearing_faces_are_judged_against_the_part_they_press_on():
    from types import SimpleNamespace as NS

    from geomjoint.resolve import bearing_cover_findings

    def layers(*rows):
        return [NS(part=p, role=r, hole_diameter=h) for p, r, h in rows]

    spec = NS(fastener=NS(head="hex", designation="M10"), bearing_diameter=16.0, far_bearing_diameter=16.0,
              tapped=False)
    # ISO 273 medium M10 clearance 11 mm under both faces: nothing to say
    assert bearing_cover_findings(layers(("a", "member", 11.0), ("b", "member", 11.0)), spec) == []
    # a 17 mm hole under the nut face
    [f] = bearing_cover_findings(layers(("a", "member", 11.0), ("b", "member", 17.0)), spec)
    assert "nut" in f["message"] and "17.00 mm hole of b" in f["message"]
    # a washer (its outside diameter is the face) on a 17 mm hole: the washer presses on it
    washer = NS(fastener=NS(head="hex", designation="M10"), bearing_diameter=20.0, far_bearing_diameter=16.0,
                tapped=False)
    assert bearing_cover_findings(layers(("w", "washer", 10.5), ("a", "member", 17.0), ("b", "member", 11.0)),
                                  washer) == []
    # a countersunk head bears on its cone; a tapped joint has no nut face
    sunk = NS(fastener=NS(head="countersunk", designation="M10"), bearing_diameter=8.0, far_bearing_diameter=None,
              tapped=True)
    assert bearing_cover_findings(layers(("a", "member", 11.0), ("b", "tapped", 8.5)), sunk) == []


# ----------------------------------------------------------------------------- a hole line to line with its bolt

def test_a_hole_line_to_line_with_its_bolt_is_analysed(tmp_path, capsys):
    model = tmp_path / "gear_flange.step"
    mc.quirk_line_to_line(model)
    assert mc.LINE_TO_LINE_RADIUS in model.read_text()        # the export's float noise is in the file
    code, out = _starter_check(model, capsys)
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    assert code in (0, 1) and not doc.get("not_analysed")
    [joint] = doc["joints"]
    assert joint["fastener"]["designation"] == "M5" and joint["hole"]["diameter"] == pytest.approx(5.0, abs=1e-9)
    # a hole of the bolt's own size is no ISO 273 clearance (M5: fine 5.3, medium 5.5, coarse 5.8)
    assert any(f["code"] == "hole-not-standard" for f in joint["findings"])


def test_a_hole_narrower_than_the_bolt_is_still_refused():
    from geomjoint import catalog
    from geomjoint.errors import InputError
    from geomjoint.resolve import hole_diameter_of

    m5 = catalog.thread("M5")
    hole, source = hole_diameter_of({"hole_fit": "medium"}, {"hole_diameter": 5.0 - 1.6e-14}, m5, False, "j.toml: joint J01")
    assert hole == pytest.approx(5.0) and source == "model"
    with pytest.raises(InputError, match="smaller than the bolt"):
        hole_diameter_of({"hole_fit": "medium"}, {"hole_diameter": 4.9}, m5, False, "j.toml: joint J01")


# ----------------------------------------------------------------------------- a screw in a notch at a part's edge

def test_a_screw_through_a_notch_clamps_the_notched_blade(tmp_path, capsys):
    model = tmp_path / "cutter_stack.step"
    mc.quirk_notched_clamp(model)
    code, out = _starter_check(model, capsys)
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    assert code in (0, 1) and not doc.get("not_analysed")
    [joint] = doc["joints"]
    # the blade (3 mm) is the clamped layer over the tapped block; no false gap under the head
    assert [l["part"] for l in joint["layers"]][0] == "cutter_blade" and joint["grip"] == pytest.approx(3.0)
    assert not any(f["code"] == "gap" for f in joint["findings"])
    assert any(f["code"] == "open-hole" for f in joint["findings"])


# ----------------------------------------------------------------------------- a screw into a part drawn without its hole

def test_a_screw_into_a_part_drawn_without_its_hole_never_stops_the_check(tmp_path, capsys):
    model = tmp_path / "motor_cap.step"
    mc.quirk_screw_into_undrilled_part(model)
    code, out = _starter_check(model, capsys)
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    # every output is written and the one joint is reported: checked, or set aside with its
    # reason (which part holds the thread when none is drawn is the joint rules' to say)
    assert code in (0, 1)
    assert {"results.json", "report.txt", "report.html"} <= {p.name for p in out.iterdir()}
    reported = doc["joints"] + doc.get("not_analysed", [])
    assert len(reported) == 1 and all(u["reason"] for u in doc.get("not_analysed", []))


# ----------------------------------------------------------------------------- the reader's remarks reach the outputs

def test_reader_remarks_reach_results_json_and_both_reports(tmp_path, capsys):
    model = tmp_path / "dollar_names.step"
    mc.quirk_dollar_names(model)
    code, out = _starter_check(model, capsys)
    assert code in (0, 1)
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    [remark] = doc["findings"]
    assert (remark["severity"], remark["code"]) == ("info", "reader-remark") and "dollar_names.step" in remark["message"]
    assert "reader-remark" in (out / "report.txt").read_text().splitlines()[0]
    assert 'id="model-findings"' in (out / "report.html").read_text()


def test_a_clean_model_has_no_model_findings(tmp_path, capsys):
    model = tmp_path / "pair.step"
    mc.write_step(mc.bolted_pair_assembly(), model)
    code, out = _starter_check(model, capsys)
    doc = json.loads((out / "results.json").read_text())
    assert doc["findings"] == [] and 'id="model-findings"' not in (out / "report.html").read_text()


# ----------------------------------------------------------------------------- the runner's false-claim tests

def _box(x0, x1, z0, z1):
    import cadquery as cq

    return cq.Workplane("XY").box(x1 - x0, 20, z1 - z0, centered=False).translate((x0, -10, z0)).val().wrapped


def test_touching_across_the_gap_near_the_axis_is_what_contradicts_it():
    import cadquery as cq
    from types import SimpleNamespace as NS

    lower = NS(part="lower", start=0.0, end=10.0)
    upper = NS(part="upper", start=11.0, end=20.0)
    joint = NS(point=(0.0, 0.0, 0.0), direction=(0.0, 0.0, 1.0), hole_diameter=5.0, layers=[lower, upper],
               bolt=None, nut=None)
    span = rc.gap_span(joint, "lower", "upper", 1.0)
    assert span == (10.0, 11.0)
    low = _box(-30, 30, 0, 10)
    # a real 1 mm gap at the axis, the parts touching 25 mm away (beyond the bearing zone of
    # one hole diameter): the whole solids touch, across the gap near the axis they do not
    stepped = (cq.Workplane("XY").box(60, 20, 9, centered=False).translate((-30, -10, 11))
               .union(cq.Workplane("XY").box(5, 20, 1, centered=False).translate((25, -10, 10)))).val().wrapped
    assert rc._distance_near_axis(low, stepped, joint, span) > 0.5
    # the same parts touching at the axis (the upper one sits on the lower): the gap is false
    assert rc._distance_near_axis(low, _box(-30, 30, 10, 20), joint, span) < rc.TOUCH_TOL
    # a head reported 7.5 mm above the washer it sits on (a hex head read as countersunk, issue 15
    # item 8): the head's solid reaches down into the span and touches the washer
    bolt = NS(part="bolt", d=12.0)
    washer = NS(part="washer", start=7.5, end=10.0)
    head_joint = NS(point=(0.0, 0.0, 0.0), direction=(0.0, 0.0, 1.0), hole_diameter=13.5, layers=[washer],
                    bolt=bolt, nut=None)
    span = rc.gap_span(head_joint, "bolt", "washer", 7.5)
    assert span == (0.0, 7.5)
    head = _box(-9, 9, 0, 7.5)          # the head, drawn from the false bearing face to the washer
    assert rc._distance_near_axis(head, _box(-12, 12, 7.5, 10), head_joint, span) < rc.TOUCH_TOL


def test_a_screw_end_inside_a_part_is_found():
    import numpy as np
    from types import SimpleNamespace as NS

    bolt = NS(part="screw", bearing_point=np.array([0.0, 0.0, 20.0]), direction=np.array([0.0, 0.0, -1.0]),
              length=15.0)
    block = _box(-30, 30, 0, 10)                     # the screw ends 5 mm deep in it
    scan = NS(bolts=[bolt], nuts=[], washers=[])
    assert rc._bolt_end_inside(bolt, scan, {"screw": None, "block": block}) == "block"
    short = NS(**{**bolt.__dict__, "length": 8.0})   # ends 2 mm above the block
    assert rc._bolt_end_inside(short, scan, {"block": block}) is None


# ----------------------------------------------------------------------------- the runner on a model whose answer is known

def test_the_runner_counts_a_known_model(tmp_path):
    # ISO 4017 M12x40 on a DIN 125 washer through two plates into an ISO 4032 nut (make_corpus)
    model = tmp_path / "frame_joint.step"
    mc.hardware_model(model, "hex")
    row = rc._one(model)
    assert row["read"] in ("exit 0", "exit 1") and row["joints"] == 1
    # three parts named as fasteners (screw, washer, nut), each recognised as its kind
    assert (row["fasteners"], row["recognised"], row["missed"]) == (3, 3, [])
    # the screw's name states M12 x 40 and the scan reads it so
    assert (row["stated"], row["stated_ok"], row["wrong"]) == (1, 1, [])
    assert row["false_claims"] == [] and row["shape_only"] == 0
    assert row["check_exit"] in (0, 1) and row["checked"] == 1 and row["not_analysed"] == []


def test_the_runner_finds_a_gap_the_model_contradicts(tmp_path):
    from geomjoint.geometry.scan import scan_model
    from geomjoint.geometry.stacks import Gap

    model = tmp_path / "frame_joint.step"
    mc.hardware_model(model, "hex")
    scan = scan_model(model)
    [joint] = scan.joints
    row = {"false_claims": []}
    rc._false_claims(scan, row)
    assert row["false_claims"] == []
    # the head sits on its washer; a 7.5 mm gap reported there (issue 15 item 8) is false
    washer = joint.layers[0].part
    joint.gaps.append(Gap((joint.bolt.part, washer), 7.5))
    rc._false_claims(scan, row)
    [claim] = row["false_claims"]
    assert "gap of 7.500 mm" in claim["what"] and washer in claim["where"]


def test_a_head_drawn_into_the_gap_is_told_from_a_recess_under_it():
    import cadquery as cq
    from types import SimpleNamespace as NS

    joint = NS(point=(0.0, 0.0, 0.0), direction=(0.0, 0.0, 1.0), hole_diameter=13.5, bolt=NS(d=12.0))
    span = (0.0, 7.5)
    # the hex head lies in the span (its bearing face read at its top, issue 15 item 8): the recogniser's
    head_in_gap = cq.Workplane("XY").polygon(6, 20.8).extrude(7.5).union(
        cq.Workplane("XY").circle(6.0).extrude(40.0)).val().wrapped
    assert rc._volume_around_shank(head_in_gap, joint, span) > 100.0
    # only the shank crosses the span (the head above it, on a part's recess): the stack's
    shank_only = cq.Workplane("XY").circle(6.0).extrude(40.0).union(
        cq.Workplane("XY").polygon(6, 20.8).extrude(-7.5)).val().wrapped
    assert rc._volume_around_shank(shank_only, joint, span) < rc.HEAD_IN_GAP_VOLUME


def test_a_shank_in_its_thread_does_not_touch_across_a_gap():
    import cadquery as cq
    from types import SimpleNamespace as NS

    # an M5 socket screw 3 mm above a block tapped 4.2 mm (ISO 261 M5 d - P), its shank
    # modelled at 5 mm: the shank meets the thread wall at the gap's far end, the head does
    # not reach the block: the 3 mm gap is real
    screw = cq.Workplane("XY").circle(4.25).extrude(-5.0).union(
        cq.Workplane("XY").circle(2.5).extrude(13.0)).val().wrapped
    block = cq.Workplane("XY").box(20, 20, 10, centered=(True, True, False)).faces(">Z").workplane() \
        .hole(4.2).translate((0, 0, 3.0)).val().wrapped
    joint = NS(point=(0.0, 0.0, 0.0), direction=(0.0, 0.0, 1.0), hole_diameter=4.2, bolt=NS(d=5.0))
    assert rc._distance_near_axis(screw, block, joint, (0.0, 3.0)) == pytest.approx(3.0, abs=1e-6)


# ----------------------------------------------------------------------------- faces written as B-splines

def test_holes_and_faces_written_as_b_splines_are_read_as_drawn(tmp_path):
    from geomjoint.geometry.scan import scan_model

    model = tmp_path / "bspline_pair.step"
    mc.quirk_bspline_faces(model)
    text = model.read_text()
    assert "B_SPLINE_SURFACE" in text
    joints = scan_model(model).joints
    # the two M10x30 joints of the pair through the two 10 mm plates (ISO 273 medium 11 mm)
    assert len(joints) == 2
    for j in joints:
        assert j.nominal == "M10" and j.grip == pytest.approx(20.0) and j.hole_diameter == pytest.approx(11.0)


def test_analytic_faces_keeps_the_solid_and_its_holes():
    import cadquery as cq
    from OCP.BRepBuilderAPI import BRepBuilderAPI_NurbsConvert
    from OCP.BRepCheck import BRepCheck_Analyzer
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    from geomjoint.geometry.holes import analyse_faces, find_holes
    from geomjoint.geometry.model import analytic_faces

    plate = cq.Workplane("XY").box(40, 30, 10).faces(">Z").workplane().pushPoints([(-10, 0), (10, 0)]).hole(11.0).val()
    nurbs = BRepBuilderAPI_NurbsConvert(plate.wrapped, True).Shape()
    assert find_holes(nurbs, "plate", analyse_faces(nurbs)) == []          # no cylinder to find a hole on
    read = analytic_faces(nurbs)
    assert BRepCheck_Analyzer(read).IsValid()

    def volume(shape):
        props = GProp_GProps()
        BRepGProp.VolumeProperties_s(shape, props)
        return props.Mass()

    # 40 x 30 x 10 less two 11 mm holes: the same solid (to the accuracy of the volume
    # integration over the edges, still B-spline curves)
    assert volume(read) == pytest.approx(40 * 30 * 10 - 2 * 3.141592653589793 * 5.5 ** 2 * 10, rel=1e-3)
    holes = find_holes(read, "plate", analyse_faces(read))
    assert sorted(round(h.diameter, 6) for h in holes) == [11.0, 11.0] and all(h.through for h in holes)
    assert analytic_faces(plate.wrapped) is plate.wrapped                   # nothing to do: the same shape


def test_a_nut_heading_a_stud_counts_as_a_recognised_nut():
    from types import SimpleNamespace as NS

    # a threaded rod (no fastener name) with a nut at each end: the scan makes the rod a stud
    # headed by one nut, and keeps the other as the nut of the joint
    parts = [NS(name="rod", product="rod"), NS(name="nut", product="nut"), NS(name="nut#2", product="nut")]
    stud = NS(part="rod", nut_head="nut", d=10.0, length=170.0, head_kind="hex")
    scan = NS(model=NS(parts=parts), bolts=[stud], nuts=[NS(part="nut#2")], washers=[], joints=[])
    row = {"fasteners": 0, "recognised": 0, "stated": 0, "stated_ok": 0, "shape_only": 0,
           "missed": [], "wrong": [], "false_claims": [], "shape_only_parts": []}
    rc._count_hardware(scan, row)
    assert (row["fasteners"], row["recognised"], row["missed"]) == (2, 2, [])
    assert row["shape_only_parts"] == [{"part": "rod", "kind": "bolt"}]      # listed for review
