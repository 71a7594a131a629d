"""Job-file reading: contracts of DESIGN.md, and bad input rejected with one line naming the key."""
import textwrap

import pytest

from geomjoint.errors import InputError
from geomjoint.job import load_job, typed_joint_specs

BASE = """
[defaults]
fastener = "M12"
grade = "8.8"

[[joint]]
id = "A1"
layers = [ { material = "steel", thickness = "16 mm" },
           { material = "steel", thickness = "16 mm" } ]
load = { min = "0 kN", max = "10 kN" }
"""


def write(tmp_path, text, name="job.toml"):
    path = tmp_path / name
    path.write_text(textwrap.dedent(text))
    return path


def test_typed_joint_resolves(tmp_path):
    job = load_job(write(tmp_path, BASE))
    (spec,) = typed_joint_specs(job)
    assert spec.id == "A1"
    assert spec.grip == pytest.approx(32.0)
    assert spec.load_max == pytest.approx(10_000.0)
    assert spec.fastener.stress_area == pytest.approx(84.3, rel=5e-3)   # ISO 898-1:2013 Table 4 (from memory)
    assert spec.fastener.proof == pytest.approx(580.0)                 # ISO 898-1:2013 Table 3, 8.8 d <= 16 mm
    assert spec.preload.mode == "proof_fraction" and spec.preload.value == pytest.approx(0.75)
    # bolt length chosen: grip 32 + nut m 10.8 (ISO 4032 M12, from memory) + 2 pitches -> 50 mm preferred length
    assert spec.fastener.length == pytest.approx(50.0)
    assert spec.hole_diameter == pytest.approx(13.5)                   # ISO 273 medium, M12


def test_inline_material(tmp_path):
    job = load_job(write(tmp_path, BASE.replace('{ material = "steel", thickness = "16 mm" } ]',
                                                '{ material = { E = "71 GPa", poisson = 0.33 }, thickness = "16 mm" } ]')))
    (spec,) = typed_joint_specs(job)
    assert spec.layers[1].E == pytest.approx(71_000.0)
    assert spec.layers[1].poisson == pytest.approx(0.33)


@pytest.mark.parametrize("change, key", [
    (('grade = "8.8"', 'grade = "8.9"'), "grade"),
    (('"16 mm" },\n', '"-16 mm" },\n'), "thickness"),
    (('max = "10 kN"', 'max = 10'), "max"),
    (('max = "10 kN"', 'max = "-1 kN"'), "load"),
    (('min = "0 kN"', 'min = "12 kN"'), "load"),
    (('fastener = "M12"', 'fastener = "M13"'), "fastener"),
    (('fastener = "M12"', 'fastner = "M12"'), "fastner"),
    (('grade = "8.8"', 'grade = "8.8"\nreliability = 1.2'), "reliability"),
    (('grade = "8.8"', 'grade = "8.8"\npreload = "75%"\ntorque = "60 N*m"'), "torque"),
    (('grade = "8.8"', 'grade = "8.8"\ncriterion = "goodmann"'), "criterion"),
    (('material = "steel"', 'material = "unobtainium"'), "material"),
    (('id = "A1"', 'id = "A1"\ncolour = "red"'), "colour"),
])
def test_bad_input_names_key(tmp_path, change, key):
    old, new = change
    text = BASE.replace(old, new, 1)
    assert text != BASE
    with pytest.raises(InputError) as err:
        load_job(write(tmp_path, text))
    message = str(err.value)
    assert "job.toml" in message and key in message
    assert "\n" not in message


def test_unknown_key_suggests(tmp_path):
    with pytest.raises(InputError, match="did you mean 'fastener'"):
        load_job(write(tmp_path, BASE.replace("fastener =", "fastenr =")))


def test_toml_syntax_error(tmp_path):
    with pytest.raises(InputError, match="TOML syntax"):
        load_job(write(tmp_path, BASE + "\n[[joint]\n"))


def test_missing_and_folder_paths(tmp_path):
    with pytest.raises(InputError, match="does not exist"):
        load_job(tmp_path / "nope.toml")
    with pytest.raises(InputError, match="folder"):
        load_job(tmp_path)
    with pytest.raises(InputError, match="model"):
        load_job(write(tmp_path, 'model = "missing.step"\n' + BASE))


def test_joint_torque_overrides_default_preload(tmp_path):
    text = BASE.replace('grade = "8.8"', 'grade = "8.8"\npreload = "70%"').replace(
        'id = "A1"', 'id = "A1"\ntorque = "80 N*m"\nnut_factor = 0.2')
    (spec,) = typed_joint_specs(load_job(write(tmp_path, text)))
    assert spec.preload.mode == "torque"
    assert spec.preload.value == pytest.approx(80_000.0)


def test_sample_job_loads():
    from pathlib import Path

    job = load_job(Path(__file__).parents[1] / "samples" / "conveyor_drive.toml")
    specs = typed_joint_specs(job)
    assert [s.id for s in specs] == ["motor-foot", "bearing-block", "take-up-bracket", "guard-hinge", "gearbox-flange"]
    assert specs[4].method == "vdi" and specs[4].member_stiffness == "vdi"
    inch = specs[2]
    assert inch.fastener.system == "inch"
    assert inch.layers[0].thickness == pytest.approx(9.525)   # 0.375 in


def test_typed_group_shares_a_resultant(tmp_path):
    """A [[group]] over typed-in joints with their positions: a force through the centroid is
    shared equally, and a moment adds +/- M*x/sum(x^2) (rigid plate; Shigley 10th ed. §8-12)."""
    text = BASE.replace('load = { min = "0 kN", max = "10 kN" }', '') + """
[[joint]]
id = "A2"
layers = [ { material = "steel", thickness = "16 mm" }, { material = "steel", thickness = "16 mm" } ]

[[group]]
joints = ["A1", "A2"]
positions = [["-50 mm", "0 mm"], ["50 mm", "0 mm"]]
point = ["0 mm", "0 mm", "0 mm"]
force = { max = ["0 kN", "0 kN", "8 kN"] }
moment = { max = ["0 N*m", "-100 N*m", "0 N*m"] }
"""
    specs = {s.id: s for s in typed_joint_specs(load_job(write(tmp_path, text)))}
    # M_y = -100 N*m about the centroid: the bolt at +x pulls 100e3 * 50 / (2 * 50^2) = 1 kN more
    assert specs["A1"].load_max + specs["A2"].load_max == pytest.approx(8000.0)
    assert abs(specs["A1"].load_max - specs["A2"].load_max) == pytest.approx(2000.0)
