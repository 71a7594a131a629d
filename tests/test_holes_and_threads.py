"""Where the thread of a joint is, and holes that are no bolt holes, reproduced with the corpus
builders (tests/corpus/make_corpus.py, "real-export quirks (holes and threads)"): a screw at its
nominal diameter in a tap-drill hole, a model in metres with inch names, a bore, a shaft, a dowel
and a tube beside real screws, a size the catalogue half-knows."""
from __future__ import annotations

import json
import sys
from pathlib import Path

import cadquery as cq
import pytest

from conftest import validate_result
from geomjoint.cli import main
from geomjoint.geometry.scan import scan_model, scan_to_json

sys.path.insert(0, str(Path(__file__).resolve().parent / "corpus"))
import make_corpus as mc  # noqa: E402


def codes(joint) -> list[str]:
    return [f.code for f in joint.findings]


def check(tmp_path: Path, model: Path, materials: str, extra: str = "", load: str = "1 kN") -> tuple[int, dict]:
    job = tmp_path / f"{model.stem}.toml"
    job.write_text(f'model = "{model.name}"\n{extra}\n[materials]\n{materials}\n\n'
                   f'[[load]]\njoints = "*"\naxial = {{ max = "{load}" }}\n')
    out = tmp_path / f"{model.stem}-out"
    code = main(["check", str(job), "--out", str(out), "--workers", "1"])
    doc = json.loads((out / "results.json").read_text()) if (out / "results.json").exists() else {}
    return code, doc


# ----------------------------------------------------------------------------- tap drills

@pytest.fixture(scope="module")
def roller(tmp_path_factory):
    path = tmp_path_factory.mktemp("roller") / "roller.step"
    facts = mc.quirk_inch_tapped_in_metres(path)
    return path, facts


def test_no10_32_at_nominal_in_its_tap_drill_hole_is_a_tapped_joint(roller):
    path, facts = roller
    scan = scan_model(path)
    assert scan.model.file_unit == "m"                      # written in metres
    assert len(scan.joints) == 2                            # one screw at each end of the shaft
    for j in scan.joints:
        assert j.kind == "tapped" and j.nominal == "#10-32 UNF", j.id
        assert [l.role for l in j.layers] == ["member", "tapped"] and j.layers[-1].part == "hex shaft 1/2 in"
        # the #21 tap drill of #10-32, 0.159 in (Machinery's Handbook, from memory)
        assert j.layers[-1].hole_diameter == pytest.approx(mc.NO10_TAP_DRILL, abs=1e-6)
        assert "interference" not in codes(j) and "thread-in-hole" in codes(j)
        assert not [f for f in j.findings if f.severity == "fail"]
        assert j.thread_method == "tapped" and j.threaded_bore == "tap drill"
    assert {j.bolt.part for j in scan.joints} == set(facts["screws"])


def test_no10_32_check_does_not_stop_on_the_tap_drill_hole(roller, tmp_path):
    path, _ = roller
    model = tmp_path / path.name
    model.write_bytes(path.read_bytes())
    code, doc = check(tmp_path, model, '"roller plate*" = "aluminium"\n"hex shaft*" = "steel"',
                      extra='[defaults]\ngrade = "10.9"\npreload = "50%"', load="0.5 kN")
    assert code in (0, 1) and doc, "check must write its results"
    validate_result(doc)
    assert not doc.get("not_analysed")                       # no "hole diameter ... smaller than the bolt"
    assert len(doc["joints"]) == 2
    for j in doc["joints"]:
        assert j["fastener"]["designation"] == "#10-32 UNF"
        names = [c["name"] for c in j["checks"]]
        assert "stripping" in names
        strip = next(c for c in j["checks"] if c["name"] == "stripping")
        assert "tapped steel" in strip["note"] and "nut" not in strip["note"]


def test_screw_without_a_size_in_its_name_takes_the_pitch_of_its_bore(tmp_path):
    path = tmp_path / "roller_unnamed.step"
    mc.quirk_inch_tapped_in_metres(path, named=False)
    # 4.04 mm is the tap drill of #10-32 (#21 drill), not of #10-24 (#25, 3.80 mm): from memory
    assert {j.nominal for j in scan_model(path).joints} == {"#10-32 UNF"}


def test_a_tap_drill_hole_with_no_screw_is_a_tapped_hole_of_that_size(tmp_path):
    path = tmp_path / "no10.step"
    # ASME B18.2.8 #10 normal clearance 0.201 in over the #21 drill's 4.04 mm blind hole (from memory)
    mc.quirk_small_metric(path, clearance=mc.NO10_CLEARANCE, tapped=mc.NO10_TAP_DRILL)
    [j] = scan_model(path).joints
    assert (j.kind, j.nominal, j.bolt) == ("tapped", "#10-32 UNF", None)
    m3 = tmp_path / "m3.step"
    mc.quirk_small_metric(m3, clearance=3.4, tapped=2.5)     # ISO 273 medium M3, tap drill d - P = 2.5
    [j] = scan_model(m3).joints
    assert (j.kind, j.nominal) == ("tapped", "M3")


def test_a_line_to_line_clearance_over_a_tap_drill_hole_is_clamped_not_threaded(tmp_path):
    path = tmp_path / "m5.step"
    # an M5 screw (ISO 4762 dk 8.5, k 5, from memory) through a 5.0 mm hole (its nominal: modelled
    # line to line) into the 4.2 mm M5 tap drill (d - P): the thread is in the base, the cover is clamped
    mc.quirk_small_metric(path, clearance=5.0, tapped=4.2, screw=(5.0, 7.0, 8.5, 5.0))
    [j] = scan_model(path).joints
    assert [(l.part, l.role) for l in j.layers] == [("cover", "member"), ("base", "tapped")]
    assert j.threaded_bore == "tap drill" and j.grip == pytest.approx(3.0)


def test_a_screw_that_cannot_pass_a_last_hole_of_no_thread_size_is_a_warning(tmp_path):
    path = tmp_path / "tight.step"
    # an M6 screw through a 6.6 mm hole (ISO 273 medium) and then a 4.5 mm one: neither the M6 tap
    # drill 5.0 (d - P) nor D1 4.917 (ISO 724) nor d: taken as tapped (as the scan always has), with a warning
    a = cq.Assembly(name="tight")
    a.add(mc.plate([(0.0, 0.0)], 6.0, dia=6.6, size=(20.0, 20.0, 6.0)), name="cover")
    a.add(mc.plate([(0.0, 0.0)], 0.0, dia=4.5, size=(20.0, 20.0, 6.0)), name="base")
    a.add(mc._socket_screw(6.0, 16.0, *mc.M6_SOCKET), name="socket screw M6x16", loc=cq.Location(cq.Vector(0, 0, 12)))
    mc.write_step(a, path)
    [j] = scan_model(path).joints
    [warning] = [f for f in j.findings if f.code == "thread-in-hole"]
    assert warning.severity == "warn" and "4.50 mm" in warning.message and "no tap-drill" in warning.message
    assert j.kind == "tapped" and j.threaded_bore is None


def test_a_size_the_catalogue_half_knows_in_a_tapped_joint_is_a_finding(tmp_path):
    """A modelled M7 socket screw (ISO 261 second choice: no ISO 4762 row in the catalog) into
    its 6.0 mm tap drill (d - P), beside an M6 screw: the M7 joint says what is missing and is
    not analysed; the M6 one is checked."""
    path = tmp_path / "m7.step"
    a = cq.Assembly(name="m7 tapped")
    a.add(cq.Workplane("XY").box(60, 30, 8, centered=(True, True, False)).translate((0, 0, 20))
          .faces(">Z").workplane().pushPoints([(-15.0, 0.0)]).hole(7.6)
          .faces(">Z").workplane().pushPoints([(15.0, 0.0)]).hole(6.6), name="cover")
    a.add(cq.Workplane("XY").box(60, 30, 20, centered=(True, True, False))
          .faces(">Z").workplane().pushPoints([(-15.0, 0.0)]).hole(6.0, 16.0)
          .faces(">Z").workplane().pushPoints([(15.0, 0.0)]).hole(5.0, 16.0), name="base")
    a.add(mc._socket_screw(7.0, 20.0, 11.0, 7.0), name="socket screw M7x20", loc=cq.Location(cq.Vector(-15, 0, 28)))
    a.add(mc._socket_screw(6.0, 20.0, *mc.M6_SOCKET), name="socket screw M6x20", loc=cq.Location(cq.Vector(15, 0, 28)))
    mc.write_step(a, path)
    m7, m6 = sorted(scan_model(path).joints, key=lambda j: j.nominal != "M7")
    assert (m7.nominal, m7.kind, m6.nominal, m6.kind) == ("M7", "tapped", "M6", "tapped")
    gap = [f for f in m7.findings if f.code == "catalog-gap"]
    assert gap and "no socket head data for M7" in gap[0].message and gap[0].severity == "warn"
    assert not any("nut" in f.message for f in gap)          # a tapped joint needs no nut
    code, doc = check(tmp_path, path, '"*" = "steel"')
    assert code == 1
    validate_result(doc)
    [skipped] = doc["not_analysed"]
    assert skipped["id"] == m7.id and "M7" in skipped["reason"]
    assert [j["id"] for j in doc["joints"]] == [m6.id]


# ----------------------------------------------------------------------------- holes that are no bolt holes

@pytest.fixture(scope="module")
def housing(tmp_path_factory):
    path = tmp_path_factory.mktemp("housing") / "housing.step"
    return path, mc.quirk_bores_beside_bolts(path)


def test_bores_pins_shafts_and_tubes_are_set_aside_once_each(housing, capsys):
    path, facts = housing
    scan = scan_model(path)
    assert len(scan.joints) == facts["screws"] and all(j.bolt is not None for j in scan.joints)
    by_code: dict[str, list] = {}
    for a in scan.set_aside:
        by_code.setdefault(a.code, []).append(a)
    held = {a.reason.split(" (")[0] for a in by_code["holds-a-part"]}
    assert held == facts["held"]                          # the shaft, the dowel (by shape) and the tube
    [seat] = by_code["not-a-bolt-hole"]
    assert seat.joint.hole_diameter == pytest.approx(facts["seat"])
    # each reported once, as an info finding naming its id
    ids = [a.id for a in scan.set_aside]
    assert sorted(ids) == ["H01", "H02", "H03", "H04"]
    for a in scan.set_aside:
        mine = [f for f in scan.findings if f.message.startswith(f"{a.id}:")]
        assert [(f.severity, f.code) for f in mine] == [("info", a.code)]
    doc = scan_to_json(scan)
    assert [s["id"] for s in doc["set_aside"]] == ids
    assert main(["scan", str(path)]) == 0
    assert "holds-a-part" in capsys.readouterr().out


def test_the_dowel_decides_not_its_diameter(housing):
    # 5.0 mm is the M6 tap drill (d - P, ISO 2306): without the pin it would be a joint
    path, _ = housing
    [dowel] = [a for a in scan_model(path).set_aside if a.reason.startswith("locator")]
    assert dowel.code == "holds-a-part" and "cylinder with no head" in dowel.reason


def test_check_runs_the_screws_and_brings_in_a_named_hole(housing, tmp_path):
    path, _ = housing
    model = tmp_path / path.name
    model.write_bytes(path.read_bytes())
    code, doc = check(tmp_path, model, '"*steel" = "steel"')
    assert code == 0 and len(doc["joints"]) == 2 and not doc.get("not_analysed")
    # [[fasteners]] naming a set-aside id and a size brings that stack in as a joint
    [seat] = [a for a in scan_model(model).set_aside if a.code == "not-a-bolt-hole"]
    code, doc = check(tmp_path, model, '"*steel" = "steel"',
                      extra=f'[[fasteners]]\njoints = "{seat.id}"\nfastener = "M42"\ngrade = "8.8"\n')
    ids = [j["id"] for j in doc["joints"]] + [j["id"] for j in doc.get("not_analysed", [])]
    assert seat.id in ids and len(ids) == 3
    validate_result(doc)


def test_an_exclusion_of_a_set_aside_hole_counts_and_one_of_nothing_is_exit_2(housing, tmp_path, capsys):
    path, _ = housing
    model = tmp_path / path.name
    model.write_bytes(path.read_bytes())
    code, doc = check(tmp_path, model, '"*steel" = "steel"', extra='exclude = ["H0*", "J01"]')
    assert code == 0 and [j["id"] for j in doc["joints"]] == ["J02"]
    capsys.readouterr()
    code, _ = check(tmp_path, model, '"*steel" = "steel"', extra='exclude = ["K7"]')
    err = capsys.readouterr().err.strip()
    assert code == 2 and len(err.splitlines()) == 1 and "'K7'" in err and "exclude" in err


# ----------------------------------------------------------------------------- inserts and thread-forming screws

INSERT_JOB = '"cover_alu" = "aluminium"\n"boss_PLA" = "PLA"'


def test_a_screw_into_a_heat_set_insert_is_tapped_in_the_insert_with_no_nut(tmp_path):
    path = tmp_path / "bracket.step"
    facts = mc.quirk_heat_set_insert(path)
    [j] = scan_model(path).joints
    assert j.kind == "tapped" and j.nut is None and j.nominal == "M3"
    assert [l.part for l in j.layers] == ["cover_alu", facts["insert"]] and j.layers[-1].role == "tapped"
    assert j.thread_method == "insert" and j.insert.part == facts["host"]
    # a common M3 heat-set insert 4.0 x 5.7 mm (from memory), as built
    assert (j.insert.outer_diameter, j.insert.length) == pytest.approx(mc.INSERT_M3)
    assert not any("nut assumed" in f.message or "inside the nut" in f.message for f in j.findings)
    assert not [f for f in j.findings if f.severity == "fail"]


def test_insert_check_strips_in_the_insert_and_pulls_out_of_the_plastic(tmp_path):
    path = tmp_path / "bracket.step"
    mc.quirk_heat_set_insert(path)
    code, doc = check(tmp_path, path, INSERT_JOB, extra='[defaults]\ngrade = "8.8"\npreload = "500 N"', load="0.3 kN")
    validate_result(doc)
    [j] = doc["joints"]
    checks = {c["name"]: c for c in j["checks"]}
    strip = checks["stripping"]
    assert "insert" in strip["note"] and "copper alloy" in strip["note"] and "nut" not in strip["note"]
    pull = checks["insert pull-out"]
    # pi * 4.0 * 5.7 * 0.6 R_m(PLA) over the largest bolt force (common practice formula); PLA R_m in the catalogue
    from geomjoint import catalog
    expected = 3.141592653589793 * 4.0 * 5.7 * 0.6 * catalog.material("PLA").tensile_strength
    bolt_force = float(pull["note"].split("largest bolt force ")[1].split(" N")[0])
    assert pull["value"] == pytest.approx(expected / bolt_force, rel=2e-3)
    assert "common practice" in pull["note"] and pull["required"] == 1.0
    text = json.dumps(doc)
    assert "nut assumed" not in text and "inside the nut" not in text and "head and nut" not in text
    # a preload the screw holds (12.9: proof 970 MPa x 5.03 mm^2 = 4.9 kN, ISO 898-1) but that rips the
    # insert out fails the pull-out alone, and no remedy offers a nut's washer
    code, doc = check(tmp_path, path, INSERT_JOB, extra='[defaults]\ngrade = "12.9"\npreload = "2.9 kN"', load="0.3 kN")
    [j] = doc["joints"]
    failing = [c["name"] for c in j["checks"] if not c["ok"]]
    assert code == 1 and failing == ["insert pull-out"]
    assert "head and nut" not in json.dumps(j.get("remedies", []))


def test_an_insert_by_its_shape_and_an_insert_with_no_screw(tmp_path):
    sleeve = tmp_path / "sleeve.step"
    mc.quirk_heat_set_insert(sleeve, insert_name="sleeve", bore=3.0)    # bore at the M3 nominal
    [j] = scan_model(sleeve).joints
    assert (j.thread_method, j.insert.how, j.layers[-1].part) == ("insert", "shape", "sleeve")
    bare = tmp_path / "bare.step"
    mc.quirk_heat_set_insert(bare, screw_length=0)
    [j] = scan_model(bare).joints
    # no screw modelled: the insert's 2.5 mm bore (M3 tap drill, d - P) is the tapped hole, M3 from the 3.4 clearance
    assert (j.kind, j.nominal, j.thread_method, j.bolt) == ("tapped", "M3", "insert", None)


def test_a_thread_forming_screw_in_a_plastic_boss(tmp_path):
    path = tmp_path / "box.step"
    facts = mc.quirk_thread_forming_screw(path)
    [j] = scan_model(path).joints
    assert (j.kind, j.thread_method, j.layers[-1].part, j.nominal) == ("tapped", "thread-forming", "housing_PA6", "M3")
    assert "interference" not in codes(j)
    code, doc = check(tmp_path, path, '"lid_steel" = "steel"\n"housing_PA6" = "PA6"',
                      extra='[defaults]\ngrade = "8.8"\npreload = "300 N"', load="0.2 kN")
    validate_result(doc)
    [r] = doc["joints"]
    strip = next(c for c in r["checks"] if c["name"] == "stripping")
    assert "thread formed by the screw in PA6" in strip["note"] and f"L_e = {facts['engagement']:.1f} mm" in strip["note"]
    # the same screw by its name, in a part whose material the name does not say
    named = tmp_path / "named.step"
    mc.quirk_thread_forming_screw(named, name="ISO 7049 tapping screw 3x10")
    text = named.read_text().replace("housing_PA6", "housing")
    named.write_text(text)
    [j] = scan_model(named).joints
    assert (j.kind, j.thread_method) == ("tapped", "thread-forming")


def test_the_starter_job_lists_the_holes_set_aside(housing, tmp_path):
    path, _ = housing
    model = tmp_path / path.name
    model.write_bytes(path.read_bytes())
    assert main(["init", str(model)]) == 0
    text = model.with_suffix(".toml").read_text()
    assert "# Holes set aside" in text
    assert "#   H01: holds-a-part:" in text and "not-a-bolt-hole" in text


def test_a_plate_with_a_slot_under_the_head_is_clamped(tmp_path):
    path = tmp_path / "fixture.step"
    facts = mc.quirk_slotted_clamp(path)
    [j] = scan_model(path).joints
    assert [(l.part, l.role) for l in j.layers] == [(facts["clamped"], "member"), ("base_steel", "tapped")]
    assert j.layers[0].open and j.layers[0].thickness == pytest.approx(facts["thickness"])
    assert j.grip == pytest.approx(facts["thickness"]) and not j.gaps
    assert "open-hole" in codes(j) and "gap" not in codes(j) and "hole-not-standard" not in codes(j)
    code, doc = check(tmp_path, path, '"*_steel" = "steel"', extra='[defaults]\ngrade = "8.8"')
    assert code in (0, 1) and not doc.get("not_analysed") and len(doc["joints"]) == 1


def test_a_line_to_line_hole_stands_for_a_medium_clearance_when_judging_alignment(tmp_path):
    """An M5 screw through a cover hole drawn at 5.0 mm (its nominal), 0.2 mm off the 4.2 mm
    tapped hole: the drawn hole stands for a real clearance, taken as the ISO 273 medium 5.5 mm
    (from memory), which passes 0.25 mm; 0.4 mm off it does not."""
    for offset, fails in ((0.2, False), (0.4, True)):
        path = tmp_path / f"off{offset:g}.step"
        a = cq.Assembly(name="offset")
        a.add(mc.plate([(offset, 0.0)], 6.0, dia=5.0, size=(20.0, 20.0, 3.0)), name="cover")
        a.add(cq.Workplane("XY").box(20, 20, 6, centered=(True, True, False)).faces(">Z").workplane().hole(4.2, 5.0),
              name="base")
        a.add(mc._socket_screw(5.0, 7.0, 8.5, 5.0), name="socket screw M5x7", loc=cq.Location(cq.Vector(0, 0, 9)))
        mc.write_step(a, path)
        [j] = scan_model(path).joints
        assert j.kind == "tapped" and ("misaligned" in codes(j)) == fails, offset


def test_a_screw_with_nothing_clamped_under_its_head_says_so(tmp_path):
    path = tmp_path / "bare.step"
    # an M4 socket screw (ISO 4762 dk 7, k 4, from memory) in the M4 tap drill 3.3 (d - P) of a block, its head on it
    a = cq.Assembly(name="bare")
    a.add(cq.Workplane("XY").box(20, 20, 10, centered=(True, True, False)).faces(">Z").workplane().hole(3.3, 8.0),
          name="end cap")
    a.add(mc._socket_screw(4.0, 6.0, 7.0, 4.0), name="socket screw M4x6", loc=cq.Location(cq.Vector(0, 0, 10)))
    mc.write_step(a, path)
    [j] = scan_model(path).joints
    [warning] = [f for f in j.findings if f.code == "thread-in-hole" and f.severity == "warn"]
    assert "nothing is clamped" in warning.message and "end cap" in warning.message


def test_a_washer_off_the_axis_does_not_make_the_holes_misaligned(tmp_path):
    """An ISO 7089 M6 washer (6.4 / 12 x 1.6, from memory) drawn 0.3 mm off the screw, which is
    more than its 0.2 mm radial clearance: a washer centres itself on the screw; the cover's
    6.6 mm hole (ISO 273 medium) and the 5.0 mm tap drill line up."""
    path = tmp_path / "washer.step"
    a = cq.Assembly(name="washer off axis")
    a.add(mc.plate([(0.0, 0.0)], 10.0, dia=6.6, size=(30.0, 30.0, 6.0)), name="cover")
    a.add(cq.Workplane("XY").box(30, 30, 10, centered=(True, True, False)).faces(">Z").workplane().hole(5.0, 9.0),
          name="base")
    a.add(cq.Workplane("XY").circle(6.0).circle(3.2).extrude(1.6).translate((0.3, 0, 16)), name="washer M6")
    a.add(mc._socket_screw(6.0, 16.0, *mc.M6_SOCKET), name="socket screw M6x16", loc=cq.Location(cq.Vector(0, 0, 17.6)))
    mc.write_step(a, path)
    [j] = scan_model(path).joints
    assert [l.role for l in j.layers] == ["washer", "member", "tapped"]
    assert "misaligned" not in codes(j)


def test_a_screw_into_a_part_drawn_without_its_hole_is_tapped_into_that_part(tmp_path):
    # the end cap's 4.0 mm hole is the M4 nominal drawn line to line; the motor body has no hole
    path = tmp_path / "motor_cap.step"
    mc.quirk_screw_into_undrilled_part(path)
    [j] = scan_model(path).joints
    assert [(l.part, l.role) for l in j.layers] == [("end_cap", "member"), ("motor_body", "tapped")]
    assert j.layers[-1].thickness == pytest.approx(5.0, abs=0.3) and j.grip == pytest.approx(5.0)
    [warning] = [f for f in j.findings if f.code == "thread-in-hole"]
    assert warning.severity == "warn" and "no hole drawn" in warning.message
    code, doc = check(tmp_path, path, '"*" = "steel"', extra='[defaults]\ngrade = "8.8"\npreload = "50%"')
    assert code in (0, 1) and not doc.get("not_analysed") and len(doc["joints"]) == 1


def test_a_wide_bore_near_a_screw_pattern_leaves_one_joint_per_screw(tmp_path):
    """Four M3 socket screws on a 20 mm pitch circle through a 3 mm cover (3.4 mm holes, ISO 273
    medium) into 2.5 mm tap drills (d - P) of a 6 mm flange; a hub 4 mm below has a 40 mm bore
    whose circle takes in all four in projection (invented demo)."""
    import math

    path = tmp_path / "pattern.step"
    pts = [(10.0 * math.cos(k * math.pi / 2), 10.0 * math.sin(k * math.pi / 2)) for k in range(4)]
    a = cq.Assembly(name="pattern")
    a.add(cq.Workplane("XY").box(40, 40, 3, centered=(True, True, False)).translate((0, 0, 6))
          .faces(">Z").workplane().pushPoints(pts).hole(3.4), name="cover")
    a.add(cq.Workplane("XY").box(40, 40, 6, centered=(True, True, False))
          .faces(">Z").workplane().pushPoints(pts).hole(2.5, 5.0), name="flange")
    a.add(cq.Workplane("XY").box(60, 60, 5, centered=(True, True, False)).translate((0, 0, -9))
          .faces(">Z").workplane().hole(40.0), name="hub")
    for i, (x, y) in enumerate(pts, 1):
        a.add(mc._socket_screw(3.0, 6.0, *mc.M3_SOCKET), name=f"socket screw M3x6 {i}", loc=cq.Location(cq.Vector(x, y, 9)))
    mc.write_step(a, path)
    joints = scan_model(path).joints
    assert len(joints) == 4
    for j in joints:
        assert [(l.part, l.role) for l in j.layers] == [("cover", "member"), ("flange", "tapped")], j.id
        assert not [f for f in j.findings if f.severity == "fail"]
