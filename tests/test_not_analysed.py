"""One joint never stops the run: a model joint that cannot be sized is not analysed, the rest are.

The model is our own: a steel cover on a steel base, 40 mm each, held by two M10 bolts in 11 mm
holes (ISO 273 medium clearance for M10, from memory), with a 47 mm bearing-seat bore between them
(the outside diameter of a 6204 ball bearing, ISO 15, from memory) that is no bolt hole: the scan
sets it aside, and a job that names a size for it brings it back in.
"""
from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

from conftest import validate_result
from geomjoint.cli import main

SAMPLES = Path(__file__).resolve().parents[1] / "samples"

#: plate thickness, mm: a grip of 80 mm that no standard M3 screw length reaches (ISO 4017 M3 ends at 30 mm, from memory)
PLATE_T = 40.0
BOLT_HOLE, BORE = 11.0, 47.0
BOLTS = [(-40.0, 0.0), (40.0, 0.0)]

JOB = """
title = "Bearing cover with a shaft bore (demo)"
model = "cover.step"

[materials]
"*" = "steel"

[defaults]
grade = "8.8"
{defaults}
[[load]]
joints = "*"
axial = {{ min = "0 kN", max = "4 kN" }}
{rules}
"""


@pytest.fixture(scope="module")
def folder(tmp_path_factory):
    import cadquery as cq

    sys.path.insert(0, str(SAMPLES))
    import make_samples as ms

    out = tmp_path_factory.mktemp("bore")
    a = cq.Assembly(name="bearing cover")
    for name, z0 in (("cover", 0.0), ("base", PLATE_T)):
        part = ms.plate(140.0, 60.0, PLATE_T, BOLTS, BOLT_HOLE, z0=z0)
        part = part.faces(">Z").workplane().pushPoints([(0.0, 0.0)]).hole(BORE)
        a.add(part, name=name, color=ms.STEEL)
    ms.write_step(a, str(out / "cover.step"))
    return out


@pytest.fixture(scope="module")
def ids(folder):
    from geomjoint.geometry.scan import scan_model

    scan = scan_model(folder / "cover.step")
    bore = [a.id for a in scan.set_aside if abs(a.joint.hole_diameter - BORE) < 0.01]
    bolts = [j.id for j in scan.joints if abs(j.hole_diameter - BOLT_HOLE) < 0.01]
    assert len(bore) == 1 and len(bolts) == 2 and len(scan.joints) == 2
    return {"bore": bore[0], "bolts": bolts}


def run(folder: Path, name: str, defaults: str = "", rules: str = "") -> tuple[int, Path]:
    job = folder / f"{name}.toml"
    job.write_text(JOB.format(defaults=defaults, rules=rules))
    out = folder / f"{name}-out"
    return main(["check", str(job), "--out", str(out)]), out


def test_a_bore_matching_no_fastener_size_is_set_aside_and_the_bolts_are_checked(folder, ids, capsys):
    code, out = run(folder, "bore")
    assert code == 0
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    assert sorted(j["id"] for j in doc["joints"]) == sorted(ids["bolts"])
    assert not doc.get("not_analysed") and ids["bore"].startswith("H")
    # the scan says once why the bore is no joint
    capsys.readouterr()
    assert main(["scan", str(folder / "cover.step"), "--json"]) == 0
    scan = json.loads(capsys.readouterr().out)
    [finding] = [f for f in scan["findings"] if f["code"] == "not-a-bolt-hole"]
    assert finding["severity"] == "info" and ids["bore"] in finding["message"] and "47.00" in finding["message"]
    [aside] = scan["set_aside"]
    assert (aside["id"], aside["code"], aside["hole_diameter"]) == (ids["bore"], "not-a-bolt-hole", BORE)


def test_a_set_aside_bore_brought_in_by_a_size_that_cannot_bear_is_not_analysed(folder, ids):
    # naming the bore's id and a size brings it in; "*" would not. No ISO 4017 M3 reaches 80 mm
    # (the lengths end at 30 mm, from memory), so it is not analysed and the bolts still are
    rules = f'[[fasteners]]\njoints = "{ids["bore"]}"\nfastener = "M3"\n'
    code, out = run(folder, "brought", rules=rules)
    assert code == 1
    for name in ("results.json", "report.txt", "report.html", "cover-checked.step", "cover-checked.glb"):
        assert (out / name).stat().st_size > 0, name
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    assert sorted(j["id"] for j in doc["joints"]) == sorted(ids["bolts"])
    [skipped] = doc["not_analysed"]
    assert skipped["id"] == ids["bore"] and skipped["verdict"] == "fail"
    assert "bearing diameter" in skipped["reason"] and "47 mm" in skipped["reason"]
    assert skipped["message"].startswith("not analysed: ")
    codes = [f["code"] for f in skipped["findings"]]
    assert "not-a-bolt-hole" in codes and "not-analysed" in codes
    assert doc["summary"]["joints"] == 3 and doc["summary"]["failed"] == 1 and doc["summary"]["not_analysed"] == 1
    assert f"{ids['bore']}: FAIL not analysed" in (out / "report.txt").read_text()
    page = (out / "report.html").read_text()
    assert "Joints not analysed" in page and f'data-joint="{ids["bore"]}"' in page


def test_a_star_rule_does_not_bring_in_set_aside_holes(folder, ids):
    code, out = run(folder, "star", rules='[[fasteners]]\njoints = "*"\nfastener = "M10"\n')
    assert code == 0
    doc = json.loads((out / "results.json").read_text())
    assert sorted(j["id"] for j in doc["joints"]) == sorted(ids["bolts"]) and not doc.get("not_analysed")


def test_exclusions_match_joints_and_set_aside_holes_and_must_match_something(folder, ids, capsys):
    job = folder / "exclude.toml"
    job.write_text(f'exclude = ["{ids["bore"]}", "{ids["bolts"][0]}"]\n' + JOB.format(defaults="", rules=""))
    assert main(["check", str(job), "--out", str(folder / "exclude-out")]) == 0
    doc = json.loads((folder / "exclude-out" / "results.json").read_text())
    assert [j["id"] for j in doc["joints"]] == [ids["bolts"][1]]
    capsys.readouterr()
    # an exclusion that matches nothing is bad input: exit 2, one line naming the file and the pattern
    job.write_text('exclude = ["J99"]\n' + JOB.format(defaults="", rules=""))
    assert main(["check", str(job), "--out", str(folder / "exclude-bad")]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "exclude.toml" in err and "'J99'" in err and "matches no joint" in err


def test_a_forced_size_with_no_standard_length_is_not_analysed(folder, ids):
    bolt = ids["bolts"][0]
    rules = f'[[fasteners]]\njoints = "{bolt}"\nfastener = "M3"\nbearing_diameter = "18 mm"\n'
    code, out = run(folder, "short", rules=rules)
    assert code == 1
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    reasons = {j["id"]: j["reason"] for j in doc["not_analysed"]}
    assert set(reasons) == {bolt}          # the bore is set aside, not a joint
    assert "M3" in reasons[bolt] and "length" in reasons[bolt]
    assert [j["id"] for j in doc["joints"]] == [ids["bolts"][1]]


def test_a_bad_job_value_still_stops_the_run(folder, capsys):
    # a value the job file writes wrongly is the job's fault, not one joint's: exit 2, one line
    code, out = run(folder, "badvalue", defaults='fastener = "M10"\ncriterion = "goodmann"')
    err = capsys.readouterr().err.strip()
    assert code == 2 and len(err.splitlines()) == 1 and "criterion" in err
    assert not (out / "results.json").exists()
