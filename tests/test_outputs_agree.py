"""results.json, the marked-up STEP, the GLB and the HTML report agree on every joint's verdict,
and a model's part names cannot make an output escape its folder."""
import hashlib
import json
import re
from pathlib import Path

import cadquery as cq
import pytest
import trimesh

from geomjoint.cli import main

SAMPLES = Path(__file__).resolve().parents[1] / "samples"
VERDICTS = ("pass", "marginal", "fail")


@pytest.fixture(scope="module")
def demo_outputs(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo")
    model = SAMPLES / "conveyor_bracket.step"
    before = hashlib.sha256(model.read_bytes()).hexdigest()
    code = main(["check", str(SAMPLES / "conveyor_drive.toml"), "--out", str(out), "--workers", "1"])
    assert code == 1                      # the sample has failing joints on purpose
    assert hashlib.sha256(model.read_bytes()).hexdigest() == before
    return out


def _names(assembly):
    yield assembly.name
    for child in assembly.children:
        yield from _names(child)


def test_every_output_agrees_on_verdicts(demo_outputs):
    doc = json.loads((demo_outputs / "results.json").read_text())
    verdicts = {j["id"]: j["verdict"] for j in doc["joints"]}
    model_ids = {j for j in verdicts if re.fullmatch(r"J\d+", j)}
    assert model_ids == {"J01", "J02", "J03", "J04"}

    # marked-up STEP, read by cadquery's own assembly importer: "J07 M10x40 10.9 marginal fatigue 1.12"
    step = cq.Assembly.importStep(str(demo_outputs / "conveyor_bracket-checked.step"))
    named = {}
    for name in _names(step):
        m = re.match(r"(J\d+) \S+ \S+ (pass|marginal|fail)\b", name)
        if m:
            named[m.group(1)] = m.group(2)
    assert named == {j: verdicts[j] for j in model_ids}

    # GLB: one node per joint, its results in the node's extras
    scene = trimesh.load(demo_outputs / "conveyor_bracket-checked.glb", force="scene")
    data = (demo_outputs / "conveyor_bracket-checked.glb").read_bytes()
    json_length = int.from_bytes(data[12:16], "little")   # glTF 2.0 §4.4: first chunk is JSON
    gltf = json.loads(data[20:20 + json_length])
    extras = {n["name"]: n["extras"]["verdict"] for n in gltf["nodes"] if n.get("name") in model_ids}
    assert extras == {j: verdicts[j] for j in model_ids}
    assert model_ids <= set(scene.graph.nodes)

    # HTML: the joints table row of each joint carries its verdict as text
    html = (demo_outputs / "report.html").read_text()
    for jid, verdict in verdicts.items():
        row = re.search(rf'<tr data-joint="{re.escape(jid)}">(.*?)</tr>', html, re.S)
        assert row and f">{verdict.upper()}<" in row.group(1), jid


def test_part_names_cannot_escape_the_output_folder(tmp_path):
    """Part names with '/', '..', NUL or 300 characters become safe node names; nothing is
    written outside the output folder."""
    hole = 11.0
    plate = cq.Workplane("XY").box(60, 40, 10, centered=(True, True, False)).faces(">Z").workplane().hole(hole)
    nasty = ["../../escape_steel", "a/b\\c_steel", "nul\x00byte_steel", "x" * 300 + "_steel"]
    asm = cq.Assembly(name="hostile")
    for i, name in enumerate(nasty):
        asm.add(plate.translate((0, 0, 10 * i)), name=name)
    model = tmp_path / "models" / "hostile.step"
    model.parent.mkdir()
    asm.export(str(model))
    job = tmp_path / "models" / "hostile.toml"
    job.write_text('model = "hostile.step"\n[defaults]\nfastener = "M10"\n[materials]\n"*" = "steel"\n'
                   '[[load]]\njoints = "*"\naxial = { max = "2 kN" }\n')
    out = tmp_path / "models" / "out"
    before = set(tmp_path.rglob("*"))
    code = main(["check", str(job), "--out", str(out), "--workers", "1"])
    assert code in (0, 1)
    created = set(tmp_path.rglob("*")) - before
    assert created and all(out in p.parents or p == out for p in created)
    doc = json.loads((out / "results.json").read_text())
    assert len(doc["joints"]) == 1 and len(doc["joints"][0]["layers"]) == 4   # one joint through the 4 plates
    assert (out / "hostile-checked.step").exists() and (out / "hostile-checked.glb").exists()


def test_overview_shows_every_model_joint(demo_outputs):
    from geomjoint.geometry.overview import model_overview
    from geomjoint.geometry.scan import scan_model

    scan = scan_model(SAMPLES / "conveyor_bracket.step")
    view = model_overview(scan)
    # the sample's bolts point along z: the overview is the plan, x right and y up (identity)
    assert view.view == pytest.approx((0.0, 0.0, 1.0))
    for (jid, u, v), joint in zip(view.joints, scan.joints):
        assert jid == joint.id and (u, v) == pytest.approx(joint.point[:2])
    html = (demo_outputs / "report.html").read_text()
    section = html[html.index("Model overview"):]
    for jid in ("J01", "J02", "J03", "J04"):
        assert f"{jid} " in section
