"""Job-file reading: contracts of DESIGN.md, and bad input rejected with one line naming the key."""
import textwrap

import pytest

from geomjoint.errors import InputError
from geomjoint.job import load_job
from geomjoint.resolve import typed_joint_specs

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


# ----------------------------------------------------------------------------- bearing faces

SHIGLEY_PAIR = """
[defaults]
fastener = "M12"
grade = "8.8"
member_stiffness = "frustum"
{extra}

[[joint]]
id = "B1"
layers = [ {{ material = "steel", thickness = "15 mm" }},
           {{ material = "steel", thickness = "15 mm" }} ]
load = {{ min = "0 kN", max = "5 kN" }}
"""


def frustum_by_hand(E, t, D, d):
    """One frustum of a 30 deg cone, Shigley 10th ed. eq. 8-20 written out (D bearing, d hole)."""
    import math

    return 0.5774 * math.pi * E * d / math.log((1.155 * t + D - d) * (D + d) / ((1.155 * t + D + d) * (D - d)))


def analysed(tmp_path, text):
    from geomjoint.analysis import analyze

    (result,) = analyze(load_job(write(tmp_path, text)))
    return result


def test_one_bearing_diameter_sets_both_faces_shigley(tmp_path):
    # Shigley 10th ed. eq. 8-20: two 15 mm steel frusta in series, D = 18 mm on both faces,
    # d = 13.5 mm hole (ISO 273 medium, M12), E = 207 GPa (Shigley Table 8-8)
    r = analysed(tmp_path, SHIGLEY_PAIR.format(extra='bearing_diameter = "18 mm"'))
    by_hand = 1.0 / (2.0 / frustum_by_hand(207_000.0, 15.0, 18.0, 13.5))
    assert by_hand == pytest.approx(2.222e6, rel=5e-4)               # the figure worked by hand in the issue
    assert r.member_stiffness == pytest.approx(by_hand, rel=1e-3)
    s = r.spec
    assert (s.bearing_diameter, s.far_bearing_diameter) == (18.0, 18.0)
    assert (s.bearing_source, s.far_bearing_source, s.hole_source) == ("job", "job", "catalogue")


def test_bearing_diameter_each_face(tmp_path):
    text = SHIGLEY_PAIR.format(extra='bearing_diameter = { head = "18 mm", nut = "16.6 mm" }')
    r = analysed(tmp_path, text)
    # the two frusta in series, each from its own face to mid-grip (Shigley 10th ed. eq. 8-20 per frustum)
    by_hand = 1.0 / (1.0 / frustum_by_hand(207_000.0, 15.0, 18.0, 13.5) + 1.0 / frustum_by_hand(207_000.0, 15.0, 16.6, 13.5))
    assert r.member_stiffness == pytest.approx(by_hand, rel=1e-3)
    assert (r.spec.bearing_diameter, r.spec.far_bearing_diameter) == (18.0, 16.6)
    # only the head face: the nut face keeps the catalogue nut's bearing face
    r = analysed(tmp_path, SHIGLEY_PAIR.format(extra='bearing_diameter = { head = "18 mm" }'))
    from geomjoint import catalog

    assert r.spec.far_bearing_diameter == pytest.approx(catalog.nut(catalog.thread("M12")).bearing_diameter)
    assert (r.spec.bearing_source, r.spec.far_bearing_source) == ("job", "catalogue")


def test_without_bearing_diameter_the_catalogue_faces(tmp_path):
    from geomjoint import catalog

    thread = catalog.thread("M12")
    r = analysed(tmp_path, SHIGLEY_PAIR.format(extra=""))
    assert r.spec.bearing_diameter == pytest.approx(catalog.head(thread, "hex").bearing_diameter)
    assert r.spec.far_bearing_diameter == pytest.approx(catalog.nut(thread).bearing_diameter)
    assert (r.spec.bearing_source, r.spec.far_bearing_source) == ("catalogue", "catalogue")


def test_bearing_diameter_of_a_tapped_joint_is_the_head_face(tmp_path):
    text = SHIGLEY_PAIR.format(extra='bearing_diameter = "18 mm"').replace('id = "B1"', 'id = "B1"\ntapped = true')
    (spec,) = typed_joint_specs(load_job(write(tmp_path, text)))
    assert spec.bearing_diameter == 18.0 and spec.far_bearing_diameter is None and spec.far_bearing_source is None
    bad = SHIGLEY_PAIR.format(extra='bearing_diameter = { head = "18 mm", nut = "17 mm" }').replace(
        'id = "B1"', 'id = "B1"\ntapped = true')
    with pytest.raises(InputError, match=r"bearing_diameter\.nut: a tapped joint has no nut face"):
        load_job(write(tmp_path, bad))


@pytest.mark.parametrize("value, says", [
    ('{ head = "18 mm", washer = "20 mm" }', "unknown key 'washer'"),
    ('"12 mm"', "not larger than the hole"),
    ('{ nut = "13 mm" }', "nut bearing diameter 13 mm is not larger than the hole"),
    ('{}', "give head and/or nut"),
])
def test_bad_bearing_diameter(tmp_path, value, says):
    with pytest.raises(InputError, match=says) as err:
        load_job(write(tmp_path, SHIGLEY_PAIR.format(extra=f"bearing_diameter = {value}")))
    assert "job.toml" in str(err.value) and "bearing_diameter" in str(err.value)


def test_results_json_reports_diameters_and_sources(tmp_path):
    from conftest import validate_result
    from geomjoint.report.json_doc import result_document

    r = analysed(tmp_path, SHIGLEY_PAIR.format(extra='bearing_diameter = { head = "18 mm", nut = "16.6 mm" }'))
    doc = result_document([r], "t")
    validate_result(doc)
    joint = doc["joints"][0]
    assert joint["bearing"] == {"head": {"diameter": 18.0, "source": "job"},
                                "nut": {"diameter": 16.6, "source": "job"}}
    assert joint["hole"] == {"diameter": 13.5, "source": "catalogue"}      # ISO 273 medium, M12
    from geomjoint.report.html import html_report

    page = html_report([r], title="t")
    assert "bearing diameter, nut face" in page and "16.6" in page


SAMPLES = __import__("pathlib").Path(__file__).resolve().parents[1] / "samples"

BRACKET_JOB = """
model = "{model}"
{extra}
[defaults]
member_stiffness = "frustum"
[materials]
"frame_flange*" = "steel"
"motor_foot*" = "steel"
"adapter_plate*" = "aluminium"
[[load]]
joints = "*"
axial = {{ max = "2 kN" }}
"""


def model_job(tmp_path, extra="", defaults=""):
    text = BRACKET_JOB.format(model=SAMPLES / "conveyor_bracket.step", extra=extra)
    if defaults:
        text = text.replace("[defaults]\n", "[defaults]\n" + defaults + "\n")
    return load_job(write(tmp_path, text))


@pytest.mark.cad   # reads the sample STEP model
def test_model_joint_bearing_key_overrides_modelled_washers(tmp_path):
    # the conveyor bracket sample: M10 bolts with an ISO 7089 washer under head and nut (d2 = 20 mm)
    from geomjoint.analysis import analyze_job

    plain = analyze_job(model_job(tmp_path)).results
    assert plain and all(r.spec.layers[0].role == "washer" and r.spec.layers[-1].role == "washer" for r in plain)
    assert all((r.spec.bearing_source, r.spec.far_bearing_source) == ("model", "model") for r in plain)
    assert all(r.spec.bearing_diameter == pytest.approx(20.0, abs=0.05) for r in plain)
    keyed = analyze_job(model_job(tmp_path, defaults='bearing_diameter = "17 mm"')).results
    for r in keyed:
        assert (r.spec.bearing_diameter, r.spec.far_bearing_diameter) == (17.0, 17.0)
        assert (r.spec.bearing_source, r.spec.far_bearing_source) == ("job", "job")
    # a narrower face is a softer cone: every joint's k_m drops
    assert all(k.member_stiffness < p.member_stiffness for k, p in zip(keyed, plain))


# ----------------------------------------------------------------------------- rules that match nothing

@pytest.mark.cad   # reads the sample STEP model
@pytest.mark.parametrize("extra, table, pattern, near", [
    ('[[load]]\njoints = "J1"\naxial = { max = "1 kN" }', "[[load]]", "'J1'", "'J01'"),
    ('[[fasteners]]\njoints = "J5*"\ngrade = "10.9"', "[[fasteners]]", "'J5*'", "J0"),
    ('[[group]]\njoints = "K0*"\nforce = { max = ["0 N", "0 N", "1 kN"] }', "[[group]]", "'K0*'", "J0"),
    ('exclude = ["J05"]', "exclude", "'J05'", "'J04'"),
])
def test_model_rule_matching_no_joint_is_exit_2(tmp_path, extra, table, pattern, near):
    from geomjoint.analysis import analyze_job

    job = model_job(tmp_path, extra=extra if extra.startswith("exclude") else "")
    if not extra.startswith("exclude"):
        job = load_job(write(tmp_path, BRACKET_JOB.format(model=SAMPLES / "conveyor_bracket.step", extra="")
                             + "\n" + extra + "\n"))
    with pytest.raises(InputError) as err:
        analyze_job(job)
    message = str(err.value)
    assert message.startswith("job.toml: ") and table in message and pattern in message
    assert "matches no joint" in message and near in message and "\n" not in message


@pytest.mark.cad   # reads the sample STEP model
def test_materials_pattern_matching_no_part_is_exit_2(tmp_path):
    from geomjoint.analysis import analyze_job

    job = load_job(write(tmp_path, BRACKET_JOB.format(model=SAMPLES / "conveyor_bracket.step", extra="")
                         .replace('"adapter_plate*" = "aluminium"', '"adaptor_plate*" = "aluminium"\n'
                                                                   'default_material = "aluminium"')))
    with pytest.raises(InputError, match=r"job\.toml: \[materials\]: 'adaptor_plate\*' matches no part "
                                         r"\(did you mean 'adapter_plate"):
        analyze_job(job)


def test_typed_job_rules_matching_nothing(tmp_path):
    from geomjoint.analysis import analyze_job

    for extra, table in (('[[load]]\njoints = "A9"\naxial = { max = "1 kN" }', "load[0] ([[load]])"),
                         ('[[fasteners]]\njoints = "B*"\ngrade = "10.9"', "fasteners[0] ([[fasteners]])"),
                         ('[materials]\n"plate" = "steel"', "[materials]")):
        with pytest.raises(InputError, match="matches no") as err:
            analyze_job(load_job(write(tmp_path, BASE + "\n" + extra + "\n")))
        assert table in str(err.value), str(err.value)
    with pytest.raises(InputError, match=r"'A9' matches no joint \(did you mean 'A1'\?\)"):
        analyze_job(load_job(write(tmp_path, 'exclude = "A9"\n' + BASE)))


@pytest.mark.cad   # reads the sample STEP model
def test_exclude_joints_by_id_and_glob(tmp_path):
    from geomjoint.analysis import analyze_job
    from geomjoint.report.json_doc import result_document
    from geomjoint.report.text import result_table

    analysis = analyze_job(model_job(tmp_path, extra='exclude = ["J02", "J0[34]"]'))
    assert [r.id for r in analysis.results] == ["J01"]
    assert analysis.excluded == ["J02", "J03", "J04"]
    doc = result_document(analysis.results, "t", analysis.excluded)
    assert doc["excluded"] == ["J02", "J03", "J04"] and doc["summary"]["excluded"] == 3
    assert "3 excluded by the job: J02, J03, J04" in result_table(analysis.results, excluded=analysis.excluded)
    # typed-in joints too; a bad exclude value is one line naming the key
    text = 'exclude = "A*"\n' + BASE + BASE.split("\n", 3)[3].replace('"A1"', '"B1"')
    assert [s.id for s in typed_joint_specs(load_job(write(tmp_path, text)))] == ["B1"]
    with pytest.raises(InputError, match="job.toml: exclude: expected a joint id or glob"):
        load_job(write(tmp_path, "exclude = [5]\n" + BASE))


# ----------------------------------------------------------------------------- unloaded joints

@pytest.mark.cad   # reads the sample STEP model
def test_unloaded_model_joints_are_checked_and_reported(tmp_path):
    from conftest import validate_result
    from geomjoint.analysis import analyze_job
    from geomjoint.job import NO_SERVICE_LOAD_NOTE
    from geomjoint.report.json_doc import result_document
    from geomjoint.report.text import result_table

    text = BRACKET_JOB.format(model=SAMPLES / "conveyor_bracket.step", extra="").replace('joints = "*"', 'joints = "J01"')
    results = analyze_job(load_job(write(tmp_path, text))).results
    unloaded = [r for r in results if not r.spec.loaded]
    assert [r.id for r in unloaded] == ["J02", "J03", "J04"]
    for r in unloaded:
        assert NO_SERVICE_LOAD_NOTE in r.notes
        assert {c.name for c in r.checks} >= {"stack-up", "stripping"}     # still checked
    doc = result_document(results, "t")
    validate_result(doc)
    assert doc["summary"]["unloaded"] == 3
    assert [j["service_load"] for j in doc["joints"]] == [True, False, False, False]
    table = result_table(results)
    row = next(line for line in table.splitlines() if line.startswith("J03"))
    assert row.count("no load") == 3 and " - " not in row
    assert "3 with no service load" in table.splitlines()[-2]
    from geomjoint.report.html import html_report

    page = html_report(results, title="t")
    assert page.count(">no load</td>") == 9                          # three factor cells of three joints


def test_require_loads_fails_unloaded_joints(tmp_path):
    from geomjoint.analysis import analyze

    text = BASE.replace('load = { min = "0 kN", max = "10 kN" }\n', "")
    (free,) = analyze(load_job(write(tmp_path, text)))
    assert not free.spec.loaded and free.ok                 # reported, not failed, by default
    (strict,) = analyze(load_job(write(tmp_path, "require_loads = true\n" + text)))
    check = next(c for c in strict.checks if c.name == "service load")
    assert not check.ok and not strict.ok and "require_loads" in check.note
    (loaded,) = analyze(load_job(write(tmp_path, "require_loads = true\n" + BASE)))
    assert loaded.spec.loaded and all(c.ok for c in loaded.checks if c.name == "service load")
    with pytest.raises(InputError, match="require_loads: expected true or false"):
        load_job(write(tmp_path, 'require_loads = "yes"\n' + BASE))


# ----------------------------------------------------------------------------- roughness

@pytest.mark.parametrize("value, cls", [
    ('"Rz<10"', "fine"), ('"Rz10-40"', "medium"), ('"Rz40-160"', "coarse"),
    # VDI 2230-1:2015 Table 5 bands (from memory): R_z < 10, 10-40, 40-160 um
    ('"6.3 um"', "fine"), ('"Rz 16 um"', "medium"), ('"0.063 mm"', "coarse"), ('"10 um"', "medium"),
    ('"fine"', "fine"), ('"coarse"', "coarse"),     # the older names, the same bands
])
def test_roughness_values(tmp_path, value, cls):
    text = BASE.replace('grade = "8.8"', f'grade = "8.8"\nmethod = "vdi"\nroughness = {value}')
    (spec,) = typed_joint_specs(load_job(write(tmp_path, text)))
    assert spec.vdi.roughness == cls


@pytest.mark.parametrize("value, says", [('"mirror"', "not a mean roughness depth"),
                                         ('"200 um"', "outside the embedding table"),
                                         ('"16 kg"', "roughness")])
def test_bad_roughness(tmp_path, value, says):
    text = BASE.replace('grade = "8.8"', f'grade = "8.8"\nroughness = {value}')
    with pytest.raises(InputError, match=says) as err:
        load_job(write(tmp_path, text))
    assert "job.toml" in str(err.value) and "roughness" in str(err.value)


# ----------------------------------------------------------------------------- progress

class _Stream:
    def __init__(self, tty):
        self.tty, self.text = tty, ""

    def isatty(self):
        return self.tty

    def write(self, s):
        self.text += s

    def flush(self):
        pass


def test_progress_whole_lines_in_a_log_in_place_on_a_terminal():
    from geomjoint.progress import LINE_INTERVAL_SECONDS, PROGRESS_AFTER_SECONDS, Progress

    now = [0.0]
    log = _Stream(tty=False)
    p = Progress("analysed", 10, stream=log, clock=lambda: now[0])
    p.update(1)                                    # a short run shows nothing
    assert log.text == ""
    for done in range(2, 11):
        now[0] = PROGRESS_AFTER_SECONDS + done      # one second per joint
        p.update(done)
    lines = log.text.splitlines()
    assert "\r" not in log.text and log.text.endswith("\n")
    assert lines[0] == "analysed: 2/10 joints" and lines[-1] == "analysed: 10/10 joints"
    assert len(lines) <= 2 + 9 / LINE_INTERVAL_SECONDS
    tty = _Stream(tty=True)
    now[0] = 0.0
    p = Progress("analysed", 3, stream=tty, clock=lambda: now[0])
    for done in (1, 2, 3):
        now[0] = PROGRESS_AFTER_SECONDS + done
        p.update(done)
    assert tty.text == "\ranalysed: 1/3 joints\ranalysed: 2/3 joints\ranalysed: 3/3 joints\n"
    quiet = _Stream(tty=False)
    p = Progress("analysed", 3, stream=quiet, quiet=True, clock=lambda: 100.0)
    p.update(3)
    assert quiet.text == ""


# ----------------------------------------------------------------------------- finding codes, report labels

@pytest.mark.cad   # geomjoint.findings reads the scan's codes from geometry.scan (the kernel)
def test_one_complete_list_of_finding_codes_documented():
    import re
    from pathlib import Path

    from geomjoint.findings import FINDING_CODES

    package = Path(__file__).resolve().parents[1] / "geomjoint"
    emitted = set()
    for path in package.rglob("*.py"):
        emitted |= set(re.findall(r'(?:Finding|_finding)\(\s*"(?:fail|warn|info)",\s*"([a-z-]+)"', path.read_text()))
    assert {"job-model-mismatch", "nut-not-modelled", "gap", "misaligned"} <= emitted
    assert emitted <= set(FINDING_CODES), emitted - set(FINDING_CODES)
    readme = (package.parent / "README.md").read_text()
    missing = [code for code in FINDING_CODES if f"`{code}`" not in readme]
    assert not missing, missing


def test_vdi_table_labels_every_number_for_a_reader():
    from dataclasses import fields

    from geomjoint.mechanics.vdi import VdiResult
    from geomjoint.report.html import VDI_LABELS

    shown = [f.name for f in fields(VdiResult) if f.name not in ("bolt", "notes")]
    assert [name for name in shown if name not in VDI_LABELS] == []
    for internal in ("shank_in_clamp", "free_thread", "fatigue_formula"):
        assert VDI_LABELS[internal] != internal and " " in VDI_LABELS[internal]


@pytest.mark.parametrize("head, width, bearing", [
    ("button", 10.5, 10.5),     # ISO 7380-1:2011 M6 dk 10.5 (from memory); d_w taken = dk (common practice)
    ("pan", 12.0, 12.0),        # ISO 7045:2011 M6 dk 12 (from memory)
    ("pan slotted", 12.0, 12.0),  # ISO 1580:2011 M6 dk 12 (from memory)
    ("cheese", 10.0, 10.0),     # ISO 1207:2011 M6 dk 10 (from memory)
    ("countersunk", 13.44, 13.44),  # ISO 10642:2004 M6 dk 13.44 theoretical (from memory)
    ("flange", 10.0, 14.2),     # ISO 4162:2012 M6 s 10, dc 14.2 (from memory)
    ("socket", 10.0, 9.38),     # ISO 4762:2004 M6 dk 10, dw 9.38 (from memory)
])
def test_every_head_kind_the_scan_reports_is_a_job_head(tmp_path, head, width, bearing):
    text = BASE.replace('fastener = "M12"', f'fastener = "M6"\nhead = "{head}"').replace('"16 mm"', '"5 mm"')
    (spec,) = typed_joint_specs(load_job(write(tmp_path, text)))
    from geomjoint import catalog

    assert spec.fastener.head == head
    assert catalog.head(catalog.thread("M6"), head).width == pytest.approx(width)
    assert spec.bearing_diameter == pytest.approx(bearing)
    # the thread-length rule of its kind exists (ISO 4014 for flange bolts, ISO 4762 for the rest)
    assert catalog.thread_length(catalog.thread("M6"), 60.0, head) == pytest.approx(18.0 if head == "flange" else 24.0)


def test_vdi_head_length_of_every_head_kind():
    from geomjoint import catalog
    from geomjoint.mechanics.vdi import HEAD_LENGTH_FACTOR, head_resilience

    assert set(catalog.HEAD_KINDS) <= set(HEAD_LENGTH_FACTOR)
    # VDI 2230-1:2015 5.1.1.1 (from memory): hexagon head l_SK = 0.5 d, socket head 0.4 d
    assert head_resilience(10.0, 205000.0, "flange") == pytest.approx(head_resilience(10.0, 205000.0, "hex"))
    assert head_resilience(10.0, 205000.0, "button") == pytest.approx(head_resilience(10.0, 205000.0, "socket"))
