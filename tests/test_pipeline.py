"""Whole-model checks: the sample model end to end, typed = model, parallel = serial, group shares."""
import json
import textwrap
from pathlib import Path

import numpy as np
import pytest

from geomjoint.analysis import analyze_job, group_shares
from geomjoint.cli import main
from geomjoint.geometry.scan import scan_model
from geomjoint.job import load_job
from geomjoint.report.json_doc import result_document

SAMPLES = Path(__file__).resolve().parents[1] / "samples"
MODEL = SAMPLES / "conveyor_bracket.step"

MODEL_JOB = """
model = "{model}"

[defaults]
grade = "8.8"
preload = "75%"

[materials]
"frame_flange*" = "steel"
"motor_foot*" = "steel"
"adapter_plate*" = "aluminium"

[[load]]
joints = "*"
axial = {{ min = "0 kN", max = "3 kN" }}
"""


@pytest.fixture(scope="module")
def scan():
    return scan_model(MODEL)


def write_job(tmp_path, text=MODEL_JOB, name="job.toml", template=True):
    path = tmp_path / name
    path.write_text(textwrap.dedent(text).format(model=MODEL.as_posix()) if template else text)
    return path


def by_id(results):
    return {r.id: r for r in results}


def test_sample_model_verdicts(tmp_path, scan):
    # the sample model is built with known faults (samples/make_samples.py): J02 has an offset hole,
    # J04 a bolt too short for its nut; J01 and J03 are sound at nominal, but fail at the
    # worst-case tolerance limits (below); judged statistically they pass
    analysis = analyze_job(load_job(write_job(tmp_path)), scan=scan)
    r = by_id(analysis.results)
    assert set(r) == {"J01", "J02", "J03", "J04"}
    for jid in ("J01", "J03"):
        assert [c.name for c in r[jid].checks if not c.ok] == ["stack-up limits"]
        assert r[jid].stackup.fails_at_limit_only
    statistical = MODEL_JOB.replace('preload = "75%"', 'preload = "75%"\nstackup_method = "statistical"')
    r_stat = by_id(analyze_job(load_job(write_job(tmp_path, statistical, "stat.toml")), scan=scan).results)
    assert r_stat["J01"].verdict != "fail" and r_stat["J03"].verdict != "fail"
    assert not next(c for c in r["J02"].checks if c.name == "stack-up").ok
    assert any(f["code"] == "misaligned" for f in r["J02"].findings)
    assert not next(c for c in r["J04"].checks if c.name == "length").ok
    # the remedy for the short bolt is a standard length that passes the re-check
    remedies = r["J04"].remedies
    assert any(m.change.startswith("bolt length 35 ->") and m.verdict in ("pass", "marginal") for m in remedies)


def test_sample_joint_fails_at_a_tolerance_limit(tmp_path, scan):
    """J01: M10x45 over washer 2 + foot 8 + adapter 10 + flange 12 + washer 2 and an 8.4 mm nut leaves
    2.6 mm past the nut at nominal (one pitch, 1.5 mm, needed).  At the limits (ISO 4759-1 grade A:
    45 +/-0.5; ISO 2768-1 m: 8 and 10 +/-0.2, 12 +/-0.2; ISO 7089 M10 washers 1.8..2.2; ISO 4032 M10
    nut 8.04..8.4) the shortest bolt in the thickest stack leaves 44.5 - 35.0 - 8.4 = 1.1 mm: 0.4 short."""
    r = by_id(analyze_job(load_job(write_job(tmp_path)), scan=scan).results)["J01"]
    su = r.stackup
    assert su.protrusion.nominal == pytest.approx(2.6, abs=1e-6)
    assert su.protrusion.worst_min == pytest.approx(1.1, abs=1e-6)
    check = next(c for c in r.checks if c.name == "stack-up limits")
    assert not check.ok and "0.40 mm short" in check.note and "protrusion past the nut" in check.note
    # the least standard change that passes at the limits: the next length
    assert r.remedies[0].change == "bolt length 45 -> 50 mm" and r.remedies[0].verdict in ("pass", "marginal")
    # the marked-up model's name says it fails only at a limit
    from geomjoint.scene import joint_node_name

    assert joint_node_name(r) == "J01 M10x45 8.8 fail at limit protrusion -0.40"


def test_position_check_takes_the_measured_offset(tmp_path, scan):
    """With 0.5 mm position tolerance on every hole: J01's 11 mm holes leave H - F = 1.0 for M10 (ASME
    Y14.5 floating fastener) and pass; J02's adapter hole is modelled 1.2 mm off the axis, which takes
    2 x 1.2 of the clearance before any tolerance: it fails, naming the part."""
    job = MODEL_JOB.replace('preload = "75%"', 'preload = "75%"\nposition_tolerance = "0.5 mm"')
    r = by_id(analyze_job(load_job(write_job(tmp_path, job, "pos.toml")), scan=scan).results)
    ok = next(c for c in r["J01"].checks if c.name == "position")
    assert ok.ok and ok.value == pytest.approx(1.0, abs=1e-6) and ok.required == pytest.approx(0.5)
    bad = next(c for c in r["J02"].checks if c.name == "position")
    assert not bad.ok and "adapter_plate_alu" in bad.note
    assert bad.value == pytest.approx(11.0 - 2 * 1.2 - 10.0, abs=1e-6)


def test_typed_joint_equals_model_joint(tmp_path, scan):
    """A job typed in by hand for J01 gives the numbers the model path gives."""
    model_result = by_id(analyze_job(load_job(write_job(tmp_path)), scan=scan).results)["J01"]
    spec = model_result.spec
    j01 = next(j for j in scan.joints if j.id == "J01")
    # layer thicknesses from the geometry equal those the sample was built with (make_samples.py)
    assert [l.thickness for l in spec.layers] == pytest.approx([2.0, 8.0, 10.0, 12.0, 2.0], abs=1e-6)
    assert j01.grip == pytest.approx(34.0, abs=1e-6)
    layers = ",\n".join(f'{{ material = "{l.material}", thickness = "{l.thickness!r} mm", role = "{l.role}" }}'
                        for l in spec.layers)
    typed = f"""
[defaults]
grade = "8.8"
preload = "75%"

[[joint]]
id = "J01-typed"
fastener = "{spec.fastener.designation}"
length = "{spec.fastener.length!r} mm"
bearing_diameter = "{spec.bearing_diameter!r} mm"
hole_diameter = "{spec.hole_diameter!r} mm"
layers = [ {layers} ]
load = {{ min = "0 kN", max = "3 kN" }}
"""
    typed_result = analyze_job(load_job(write_job(tmp_path, typed, "typed.toml", template=False))).results[0]
    # the far bearing diameter of the model is the modelled washer; typed-in takes the catalog washer
    assert typed_result.spec.far_bearing_diameter == pytest.approx(spec.far_bearing_diameter, rel=1e-9)
    for field in ("grip", "bolt_stiffness", "member_stiffness", "joint_constant", "preload", "sigma_a", "n_f"):
        assert getattr(typed_result, field) == pytest.approx(getattr(model_result, field), rel=1e-9), field


def test_parallel_equals_serial(tmp_path):
    job = load_job(write_job(tmp_path))
    serial = result_document(analyze_job(job, workers=1).results, "t")
    parallel = result_document(analyze_job(job, workers=2).results, "t")
    assert json.dumps(serial, sort_keys=True) == json.dumps(parallel, sort_keys=True)


def test_group_shares_sum_to_applied_load(tmp_path, scan):
    text = MODEL_JOB.replace('[[load]]\njoints = "*"\naxial = {{ min = "0 kN", max = "3 kN" }}\n', "") + """
[[group]]
joints = "J0*"
point = ["0 mm", "0 mm", "120 mm"]
force = {{ max = ["0 kN", "0 kN", "8 kN"] }}
moment = {{ max = ["0 N*m", "30 N*m", "0 N*m"] }}
"""
    job = load_job(write_job(tmp_path, text))
    shares = group_shares(job, scan.joints)
    axial = {k: v[1] for k, v in shares.items()}
    # statics: the bolt forces of a rigid plate balance the applied force (Shigley 10th ed. §8-12)
    assert sum(axial.values()) == pytest.approx(8000.0, rel=1e-9)
    # and the applied moment about the pattern centroid (all bolts stay in tension here)
    points = {j.id: np.array(j.point) for j in scan.joints}
    centroid = np.mean(list(points.values()), axis=0)
    normal = -np.array(scan.joints[0].direction)
    moment = sum(np.cross(points[k] - centroid, axial[k] * normal) for k in axial)
    assert moment[1] == pytest.approx(30_000.0, rel=1e-6)
    results = by_id(analyze_job(job, scan=scan).results)
    assert results["J01"].spec.load_max == pytest.approx(axial["J01"])


@pytest.mark.parametrize("edit, needle", [
    (('"adapter_plate*" = "aluminium"', ''), "adapter_plate"),                         # part with no material
    (('joints = "*"', 'joints = "K9"'), "K9"),                                         # load on an unknown joint
    (('max = "3 kN"', 'max = 3'), "max"),                                              # load without units
    (('model = "{model}"', 'model = "nowhere.step"'), "model"),                       # model path missing
])
def test_model_job_bad_input_exit_2(tmp_path, capsys, edit, needle):
    text = MODEL_JOB.replace(*edit)
    assert text != MODEL_JOB
    code = main(["check", str(write_job(tmp_path, text))])
    err = capsys.readouterr().err.strip()
    assert code == 2, err
    assert len(err.splitlines()) == 1 and needle in err and "job.toml" in err


def test_init_writes_starter_and_never_overwrites(tmp_path, capsys):
    model = tmp_path / "bracket.step"
    model.write_bytes(MODEL.read_bytes())
    assert main(["init", str(model)]) == 0
    starter = tmp_path / "bracket.toml"
    text = starter.read_text()
    assert 'model = "bracket.step"' in text and '"adapter_plate_alu" = "aluminium"' in text
    assert "J04" in text
    job = load_job(starter)              # the starter is a valid job as written
    assert job.model == model.resolve()
    assert job.defaults["thickness_tolerance"] == "m"   # the tolerance keys are shown where they are set
    before = starter.read_bytes()
    assert main(["init", str(model)]) == 2
    assert starter.read_bytes() == before
    assert model.read_bytes() == MODEL.read_bytes()


def test_model_joints_by_cone_and_fe(tmp_path, scan):
    """Every model joint can be analysed with the clipped cone and with the FE model."""
    frustum = by_id(analyze_job(load_job(write_job(tmp_path)), scan=scan).results)
    cone_job = MODEL_JOB.replace('preload = "75%"', 'preload = "75%"\nmember_stiffness = "cone"')
    cone = by_id(analyze_job(load_job(write_job(tmp_path, cone_job, "cone.toml")), scan=scan).results)
    for jid, r in cone.items():
        assert r.stiffness_method == "cone"
        ideal = r.cone.ideal_stiffness
        # clipping only removes material: never stiffer than the same cones unclipped
        assert r.member_stiffness <= ideal * (1 + 1e-9)
        assert 0 < r.cone.area_fraction_mid_grip <= 1 + 1e-9
    fe_job = MODEL_JOB.replace('preload = "75%"', 'preload = "75%"\nmember_stiffness = "fe"')
    fe = by_id(analyze_job(load_job(write_job(tmp_path, fe_job, "fe.toml")), scan=scan).results)
    assert set(fe) == set(frustum)
    for r in fe.values():
        assert r.stiffness_method == "fe" and 0 < r.joint_constant < 1
        assert r.fe.mesh_change < 0.01


def test_neighbour_search_changes_nothing(tmp_path, scan):
    """Only joints whose cones can meet are passed as neighbours; passing all gives the same k_m."""
    from geomjoint.analysis import cone_joint_of, cone_neighbours
    from geomjoint.resolve import model_joint
    from geomjoint.geometry.cones import clipped_cone_stiffness

    job = load_job(write_job(tmp_path))
    joints = [model_joint(job, j, {}) for j in scan.joints]
    cones = {mj.spec.id: cone_joint_of(mj) for mj in joints}
    near = cone_neighbours(joints)
    for jid, cone in cones.items():
        everyone = [c for k, c in cones.items() if k != jid]
        chosen = [cones[k] for k in near[jid]]
        assert clipped_cone_stiffness(cone, chosen).stiffness == pytest.approx(
            clipped_cone_stiffness(cone, everyone).stiffness, rel=1e-12)


@pytest.mark.parametrize("job, expected", [
    # gearbox cover: J03's screw is modelled 5.5 mm too long for its blind hole (make_samples.py)
    ("gearbox_cover.toml", {"J01": "pass", "J02": "pass", "J03": "fail", "J04": "pass"}),
    # pump skid, drawn in inches: two sound 1/2-13 UNC joints, clipped cones
    ("pump_skid_inch.toml", {"J01": "pass", "J02": "pass"}),
])
def test_sample_jobs_end_to_end(job, expected):
    results = analyze_job(load_job(SAMPLES / job)).results
    assert {r.id: r.verdict for r in results} == expected
    if job.startswith("gearbox"):
        j03 = by_id(results)["J03"]
        assert any(m.change == "bolt length 35 -> 25 mm" for m in j03.remedies)
        assert all(r.fatigue_criterion == "vdi" and r.tightening["torque"] > 0 for r in results)
    else:
        assert all(r.spec.fastener.designation == "1/2-13 UNC" and r.stiffness_method == "cone" for r in results)


def test_inch_job_reports_in_inch_units():
    from geomjoint.report.text import result_table

    job = load_job(SAMPLES / "pump_skid_inch.toml")
    table = result_table(analyze_job(job).results, job.units)
    header, _, first = table.splitlines()[:3]
    assert "grip in" in header and "preload kip" in header
    # grip 5/8 in foot + 1/2 in rail (make_samples.py); preload 75 % of 85 kpsi x 0.1419 in^2
    # (SAE J429 grade 5 proof strength; ASME B1.1 tensile stress area) = 9.05 kip
    assert " 1.125 " in first and " 9.05 " in first


def test_compare_stiffness_of_a_model_joint_includes_the_clipped_cone(tmp_path, scan):
    text = MODEL_JOB.replace('preload = "75%"', 'preload = "75%"\nmember_stiffness = "fe"\ncompare_stiffness = true')
    result = by_id(analyze_job(load_job(write_job(tmp_path, text, "cmp.toml")), scan=scan).results)["J01"]
    table = result.comparison.values()
    assert set(table) == {"frustum", "exponential", "vdi", "cone", "fe"}
    assert table["cone"] == pytest.approx(result.cone.stiffness)
    assert table["fe"] == pytest.approx(result.member_stiffness)
