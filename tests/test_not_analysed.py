"""One joint never stops the run: a model joint that cannot be sized is not analysed, the rest are.

The model is our own: a steel cover on a steel base, 40 mm each, held by two M10 bolts in 11 mm
holes (ISO 273 medium clearance for M10, from memory), with a 47 mm bearing-seat bore between them
(the outside diameter of a 6204 ball bearing, ISO 15, from memory) that is no bolt hole.
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

    joints = scan_model(folder / "cover.step").joints
    bore = [j.id for j in joints if abs(j.hole_diameter - BORE) < 0.01]
    bolts = [j.id for j in joints if abs(j.hole_diameter - BOLT_HOLE) < 0.01]
    assert len(bore) == 1 and len(bolts) == 2
    return {"bore": bore[0], "bolts": bolts}


def run(folder: Path, name: str, defaults: str = "", rules: str = "") -> tuple[int, Path]:
    job = folder / f"{name}.toml"
    job.write_text(JOB.format(defaults=defaults, rules=rules))
    out = folder / f"{name}-out"
    return main(["check", str(job), "--out", str(out)]), out


def test_a_bore_with_no_size_is_not_analysed_and_the_bolts_are(folder, ids, capsys):
    code, out = run(folder, "bore")
    assert code == 1
    for name in ("results.json", "report.txt", "report.html", "cover-checked.step", "cover-checked.glb"):
        assert (out / name).stat().st_size > 0, name
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    assert sorted(j["id"] for j in doc["joints"]) == sorted(ids["bolts"])
    assert all(j["verdict"] != "fail" for j in doc["joints"])
    [skipped] = doc["not_analysed"]
    assert skipped["id"] == ids["bore"] and skipped["verdict"] == "fail"
    assert "no size could be inferred" in skipped["reason"] and skipped["message"].startswith("not analysed: ")
    # its own findings come with it: the scan's, and the one that says it was not analysed
    codes = [f["code"] for f in skipped["findings"]]
    assert "no-hardware" in codes and "not-analysed" in codes
    assert doc["summary"]["joints"] == 3 and doc["summary"]["failed"] == 1 and doc["summary"]["not_analysed"] == 1
    assert f"{ids['bore']}: FAIL not analysed" in (out / "report.txt").read_text()
    page = (out / "report.html").read_text()
    assert "Joints not analysed" in page and f'data-joint="{ids["bore"]}"' in page


def test_a_forced_size_with_no_standard_length_is_not_analysed(folder, ids):
    bolt = ids["bolts"][0]
    rules = f'[[fasteners]]\njoints = "{bolt}"\nfastener = "M3"\nbearing_diameter = "18 mm"\n'
    code, out = run(folder, "short", rules=rules)
    assert code == 1
    doc = json.loads((out / "results.json").read_text())
    validate_result(doc)
    reasons = {j["id"]: j["reason"] for j in doc["not_analysed"]}
    assert set(reasons) == {bolt, ids["bore"]}
    assert "M3" in reasons[bolt] and "length" in reasons[bolt]
    assert [j["id"] for j in doc["joints"]] == [ids["bolts"][1]]


def test_a_bad_job_value_still_stops_the_run(folder, capsys):
    # a value the job file writes wrongly is the job's fault, not one joint's: exit 2, one line
    code, out = run(folder, "badvalue", defaults='fastener = "M10"\ncriterion = "goodmann"')
    err = capsys.readouterr().err.strip()
    assert code == 2 and len(err.splitlines()) == 1 and "criterion" in err
    assert not (out / "results.json").exists()
