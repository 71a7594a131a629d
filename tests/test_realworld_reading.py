"""What real CAD exports carry, reproduced with the corpus builders (tests/corpus/make_corpus.py):
reader remarks that are not damage, readable part names, small metric and numbered inch
sizes, plastics, and in-memory models other than cadquery's."""
from __future__ import annotations

import json
import re
import sys
from pathlib import Path

import cadquery as cq
import pytest

from geomjoint import catalog
from geomjoint.cli import main
from geomjoint.errors import InputError
from geomjoint.geometry.model import load_model, step_length_unit
from geomjoint.geometry.scan import scan_model, scan_to_json

sys.path.insert(0, str(Path(__file__).resolve().parent / "corpus"))
import make_corpus as mc  # noqa: E402


def _entity_type(text: str, entity_id: int) -> str:
    return re.search(rf"#{entity_id} = \(?\s*([A-Z_]+)", text).group(1)


# ----------------------------------------------------------------------------- reading

def test_dollar_names_are_one_info_finding_with_the_files_own_ids(tmp_path, capsys):
    path = tmp_path / "dollar_names.step"
    edited = mc.quirk_dollar_names(path)["ids"]
    text = path.read_text()
    model = load_model(path)
    # the model is read whole: 2 plates, 2 bolts, 2 nuts
    assert len(model.parts) == 6
    [finding] = model.findings
    assert (finding.severity, finding.code) == ("info", "reader-remark")
    named = [int(i) for i in re.findall(r"#(\d+)", finding.message)]
    assert named and set(named) <= set(edited)
    # every id named is an entity of the file (ids were renumbered to 10 n + 7, so the
    # reader's ordinals 1, 2, 3 ... are none of them) of one of the edited kinds
    assert all(i % 10 == 7 for i in named)
    assert {_entity_type(text, i) for i in named} <= {"PRODUCT_DEFINITION_SHAPE", "ITEM_DEFINED_TRANSFORMATION"}
    assert f"{len(edited)} entities" in finding.message and "dollar_names.step" in finding.message
    # the scan finds the joints as without the edit, says the remark once, and exits 0
    scan = scan_model(path)
    assert len(scan.joints) == 2 and [f.code for f in scan.findings] == ["reader-remark"]
    assert scan_to_json(scan)["findings"][0]["code"] == "reader-remark"
    assert main(["scan", str(path)]) in (0, 1)
    assert "reader-remark" in capsys.readouterr().out


def test_real_damage_still_refused_naming_the_file_and_its_own_id(tmp_path):
    path = tmp_path / "damaged.step"
    bad = mc.quirk_damaged_entity(path)
    with pytest.raises(InputError) as err:
        load_model(path)
    message = str(err.value)
    assert "damaged.step" in message and f"entity #{bad}:" in message
    assert bad % 10 == 7                      # the file's id, not the reader's ordinal


def test_degree_unit_with_named_unit_star_reads_to_the_same_geometry(tmp_path):
    path = tmp_path / "degree_unit.step"
    volume = mc.quirk_degree_unit(path)
    model = load_model(path)
    [finding] = model.findings
    assert finding.code == "reader-remark" and "conversion-based unit" in finding.message
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(model.parts[0].solid, props)
    # the countersink cone in degrees gives the volume cadquery made in radians (identity)
    assert props.Mass() == pytest.approx(volume, rel=1e-9)


@pytest.mark.parametrize("style, words", [("solid_angle", "solid-angle unit"), ("presentation", "presentation item")])
def test_entities_without_geometry_are_remarks(tmp_path, style, words):
    path = tmp_path / f"{style}.step"
    mc.quirk_remark_entities(path, style)
    scan = scan_model(path)
    [finding] = scan.findings
    assert finding.code == "reader-remark" and words in finding.message
    assert len(scan.model.parts) == 6 and len(scan.joints) == 2     # nothing lost


def test_plane_angle_unit_is_not_taken_for_the_length_unit(tmp_path):
    path = tmp_path / "degree_unit.step"
    mc.quirk_degree_unit(path)
    assert step_length_unit(path) == "mm"


@pytest.mark.parametrize("style", ["conversion", "multiline"])
def test_length_unit_as_other_writers_spell_it(tmp_path, style):
    path = tmp_path / f"unit_{style}.step"
    mc.quirk_unit_spelling(path, style)
    assert step_length_unit(path) == "mm"
    # the model reads the same: the plates are 10 mm thick (invented demo plates)
    [joint, _] = scan_model(path).joints
    assert joint.grip == pytest.approx(20.0) and joint.nominal == "M10"


# ----------------------------------------------------------------------------- names

@pytest.mark.parametrize("style", ["numbered", "versioned", "own", "unnamed"])
def test_parts_get_readable_names(tmp_path, style):
    path = tmp_path / f"{style}.step"
    expected = mc.quirk_cad_naming(path, style)["names"]
    scan = scan_model(path)
    assert [p.name for p in scan.model.parts] == expected
    assert not any(re.match(r"NAUO|=>\[", p.name) for p in scan.model.parts)
    # the joints show the readable names too
    assert {j.bolt.part for j in scan.joints} == {expected[2], expected[4]}


def test_numbered_instances_keep_the_instance_name_for_globs(tmp_path):
    path = tmp_path / "numbered.step"
    mc.quirk_cad_naming(path, "numbered")
    model = load_model(path)
    plate = model.part("plate_upper-S235")
    assert plate.instance is None          # NAUO1 says nothing: not kept as a name
    versioned = tmp_path / "versioned.step"
    mc.quirk_cad_naming(versioned, "versioned")
    m2 = load_model(versioned)
    bolt2 = m2.part("bolt v1#2")
    assert bolt2.instance == "bolt v1:2" and bolt2.product == "bolt v1"
    assert m2.part("bolt v1:2") is bolt2       # found by the file's own instance name too


def _check_job(tmp_path, model: Path, materials: str) -> Path:
    job = tmp_path / "job.toml"
    job.write_text(f'model = "{model.name}"\n\n[materials]\n{materials}\n\n'
                   '[[load]]\njoints = "*"\naxial = { max = "2 kN" }\n')
    return job


def test_materials_globs_match_instance_or_product_names(tmp_path):
    model = tmp_path / "versioned.step"
    mc.quirk_cad_naming(model, "versioned")
    # "upper_plate v1:1" is the file's instance name; "lower_plate v1" the readable name
    job = _check_job(tmp_path, model, '"upper_plate v1:1" = "aluminium"\n"lower_plate v1" = "steel"')
    out = tmp_path / "out"
    assert main(["check", str(job), "--out", str(out), "--workers", "1"]) in (0, 1)
    doc = json.loads((out / "results.json").read_text())
    mats = {l["part"]: l["material"] for j in doc["joints"] for l in j["layers"] if l.get("part")}
    assert mats["upper_plate v1"] == "aluminium" and mats["lower_plate v1"] == "steel"


def test_starter_job_uses_readable_names_with_one_glob_per_product(tmp_path):
    model = tmp_path / "numbered.step"
    mc.quirk_cad_naming(model, "numbered")
    assert main(["init", str(model)]) == 0
    text = (tmp_path / "numbered.toml").read_text()
    assert '"plate_upper-S235"' in text and '"plate_lower-S235"' in text
    assert "NAUO" not in text
    # hardware needs no material: the bolts and nuts are not listed
    assert "hex_bolt_M10x30" not in text.split("# Joints found:")[0]


def test_report_and_marked_up_model_use_the_readable_names(tmp_path):
    model = tmp_path / "numbered.step"
    mc.quirk_cad_naming(model, "numbered")
    job = _check_job(tmp_path, model, '"plate_*" = "steel"')
    out = tmp_path / "out"
    assert main(["check", str(job), "--out", str(out), "--workers", "1"]) in (0, 1)
    html = next(out.glob("*.html")).read_text()
    assert "plate_upper-S235" in html and "NAUO" not in html
    step = next(p for p in out.glob("*.step"))
    assert "plate_upper-S235" in step.read_text(errors="replace")
    glb = next(out.glob("*.glb")).read_bytes()
    assert b"plate_upper-S235" in glb and b"NAUO" not in glb


# ----------------------------------------------------------------------------- sizes

def test_small_metric_threads_against_iso_stress_areas():
    # ISO 898-1:2013 Table 4 (from memory): A_s,nom M1.6 1.27, M2 2.07, M2.5 3.39 mm^2
    for size, area in (("M1.6", 1.27), ("M2", 2.07), ("M2.5", 3.39)):
        assert catalog.thread(size).stress_area == pytest.approx(area, abs=0.005), size
    # ISO 261:1998 (from memory): fine pitches M1.6x0.2, M2x0.25, M2.5x0.35
    assert catalog.thread("M2.5x0.35").series == "fine"


def test_numbered_unified_sizes_against_asme_b1_1():
    # ASME B1.1 (from memory, as tabulated in Machinery's Handbook): tensile stress area, in^2
    for size, area_in2 in (("#0-80 UNF", 0.00180), ("#1-64 UNC", 0.00263), ("#1-72 UNF", 0.00278),
                           ("#2-56 UNC", 0.00370), ("#2-64 UNF", 0.00394), ("#3-48 UNC", 0.00487),
                           ("#3-56 UNF", 0.00523)):
        t = catalog.thread(size)
        assert t.stress_area / 25.4 ** 2 == pytest.approx(area_in2, rel=0.01), size
    assert catalog.thread("#0-80").designation == "#0-80 UNF"   # #0 has no UNC (ASME B1.1)


def test_small_hardware_rows():
    m2 = catalog.thread("M2")
    # ISO 4762:2004 Table 1 (from memory): M2 dk max 3.8, k max 2
    assert (catalog.head(m2, "socket").width, catalog.head(m2, "socket").height) == (3.8, 2.0)
    # ISO 4032:2012 (from memory): M2.5 s 5, m max 2; ISO 7089:2000: M2.5 d1 2.7, d2 6, h 0.5
    assert (catalog.nut(catalog.thread("M2.5")).width, catalog.nut(catalog.thread("M2.5")).height) == (5.0, 2.0)
    w = catalog.washer(catalog.thread("M2.5"))
    assert (w.inner, w.outer, w.thickness) == (2.7, 6.0, 0.5)
    # ISO 273:1979 (from memory): M2.5 fine / medium / coarse 2.7 / 2.9 / 3.1
    assert [catalog.clearance_hole(catalog.thread("M2.5"), f) for f in ("fine", "medium", "coarse")] == [2.7, 2.9, 3.1]
    # ISO 7380-1:2011 (from memory): M5 button dk 9.5, k 2.75; none below M3
    assert catalog.head(catalog.thread("M5"), "button").width == 9.5
    with pytest.raises(InputError, match="no button head dimensions for M2.5"):
        catalog.head(catalog.thread("M2.5"), "BHCS")
    # ISO 10642:2004 (from memory): M6 countersunk dk 13.44, 90 degree head
    csk = catalog.head(catalog.thread("M6"), "flat head")
    assert (csk.width, csk.angle) == (13.44, 90.0)
    # ISO 7045:2011 / ISO 1580:2011 (from memory): M3 pan head dk 5.6, k 2.4 (cross) / 1.8 (slotted)
    assert catalog.head(catalog.thread("M3"), "pan").height == 2.4
    assert catalog.head(catalog.thread("M3"), "pan slotted").height == 1.8
    # ISO 4029:2003 (from memory): M4 cup-point set screw, socket 2 mm
    assert catalog.set_screw(catalog.thread("M4"), "cup").key == 2.0
    # ASME B18.6.3 (from memory): #5 hex machine screw nut F 5/16 in
    assert catalog.nut(catalog.thread("#5-40")).width == pytest.approx(0.3125 * 25.4)


def test_clearance_hole_2_9_in_a_metric_model_is_m2_5(tmp_path):
    path = tmp_path / "m25.step"
    mc.quirk_small_metric(path, clearance=2.9)
    [joint] = scan_model(path).joints
    # ISO 273 medium clearance of M2.5 is 2.9 mm; the #4 close fit (0.116 in = 2.95 mm) is not chosen
    assert (joint.nominal, joint.nominal_source) == ("M2.5", "clearance hole")


def test_clearance_3_over_tap_drill_2_5_in_a_metric_model_is_m3_tapped(tmp_path):
    path = tmp_path / "m3t.step"
    mc.quirk_small_metric(path, clearance=3.0, tapped=2.5)
    [joint] = scan_model(path).joints
    # tap drill of M3 = d - P = 2.5 mm (ISO 2306, common practice); never #5-40
    assert (joint.nominal, joint.kind, joint.nominal_source) == ("M3", "tapped", "tapped hole")


def test_modelled_m2_socket_screw_is_read_and_sized(tmp_path):
    path = tmp_path / "m2.step"
    # ISO 4762 M2: dk 3.8, k 2 (from memory); ISO 273 medium 2.4; tap drill 1.6 = 2 - 0.4
    mc.quirk_small_metric(path, clearance=2.4, tapped=1.6, screw=(2.0, 8.0, 3.8, 2.0))
    [joint] = scan_model(path).joints
    assert joint.nominal == "M2" and joint.bolt is not None and joint.bolt.length == pytest.approx(8.0)
    assert not [f for f in joint.findings if f.severity == "fail"]


def test_inference_never_lands_on_a_size_it_cannot_finish():
    # #0-80 has no hex head in the catalog (ASME B18.2.1 starts at 1/4 in): not chosen for a hex joint
    assert catalog.hardware_gaps(catalog.thread("#0-80"), "hex") == ["hex head", "hex lengths"]
    assert catalog.hardware_gaps(catalog.thread("M12"), "hex") == []


def test_no_size_is_inferred_that_no_standard_length_can_finish(tmp_path):
    """Two 30 mm blocks with a 2.0 mm hole through both: the ISO 273 coarse clearance of M1.6,
    but no M1.6 bolt reaches 60 mm (ISO 4017 lengths end at 16 mm, from memory)."""
    path = tmp_path / "pin_hole.step"
    a = cq.Assembly(name="pin_hole")
    a.add(mc.plate([(0.0, 0.0)], 30.0, dia=2.0, size=(30.0, 30.0, 30.0)), name="upper_block")
    a.add(mc.plate([(0.0, 0.0)], 0.0, dia=2.0, size=(30.0, 30.0, 30.0)), name="lower_block")
    mc.write_step(a, path)
    scan = scan_model(path)
    # no joint to stop the check: the stack is set aside, saying why
    assert scan.joints == []
    [aside] = scan.set_aside
    assert aside.code == "not-a-bolt-hole" and "no catalogue fastener can finish" in aside.reason
    assert aside.joint.nominal is None


def test_size_without_nut_data_is_a_finding_not_a_crash(tmp_path):
    """A modelled M7 bolt (ISO 261 second choice; the catalog has no M7 nut) through two plates."""
    path = tmp_path / "m7.step"
    a = cq.Assembly(name="m7")
    a.add(mc.plate([(0.0, 0.0)], 8.0, dia=7.6, size=(30.0, 30.0, 8.0)), name="upper")
    a.add(mc.plate([(0.0, 0.0)], 0.0, dia=7.6, size=(30.0, 30.0, 8.0)), name="lower")
    a.add(mc._hex_bolt(7.0, 30.0, 11.0, 4.8), name="hex_bolt_M7x30", loc=cq.Location(cq.Vector(0, 0, 16)))
    mc.write_step(a, path)
    [joint] = scan_model(path).joints
    assert joint.nominal == "M7"
    gap = [f for f in joint.findings if f.code == "catalog-gap"]
    assert {f.severity for f in gap} == {"warn"}
    assert any("no nut dimensions for M7" in f.message for f in gap)
    assert any("no hex head data for M7" in f.message for f in gap)     # nor a head: said, not a crash


#: numbered inch screws of the synthetic model below: (name, thread, head kind, head width, head height in inch)
#: hex heads ASME B18.6.3 regular (A max, H max), the socket ASME B18.3 (from memory)
NUMBERED = (("hex_head_screw_10-24x3/4", "#10-24", "hex", 0.312, 0.120),
            ("hex_head_screw_12-24x3/4", "#12-24", "hex", 0.312, 0.155),
            ("hex_head_screw_2-56x3/4", "#2-56", "hex", 0.125, 0.050),
            ("socket_cap_screw_4-40x3/4", "#4-40", "socket", 0.183, 0.112))


def _numbered_model(path: Path) -> None:
    """Two 1/4 in steel plates, one ASME B18.2.8 normal clearance hole per screw of NUMBERED."""
    inch = 25.4
    t_plate = 0.25 * inch
    xs = [(-1.5 + i) * inch for i in range(len(NUMBERED))]
    a = cq.Assembly(name="instrument_rail")
    for name, z0 in (("rail_upper", t_plate), ("rail_lower", 0.0)):
        w = cq.Workplane("XY").box(5.0 * inch, 1.0 * inch, t_plate, centered=(True, True, False))
        for x, (_, size, *_) in zip(xs, NUMBERED):
            hole = catalog.clearance_hole(catalog.thread(size), "normal")
            w = w.cut(cq.Workplane("XY").circle(hole / 2).extrude(t_plate).translate((x, 0, 0)))
        a.add(w.translate((0, 0, z0)), name=name)
    for x, (name, size, kind, width, height) in zip(xs, NUMBERED):
        d = catalog.thread(size).d
        shape = (mc._hex_bolt(d, 0.75 * inch, width * inch, height * inch) if kind == "hex"
                 else mc._socket_screw(d, 0.75 * inch, width * inch, height * inch))
        a.add(shape, name=name, loc=cq.Location(cq.Vector(x, 0, 2 * t_plate)))
    mc.write_step(a, path)


NUMBERED_JOB = """title = "Instrument rail, numbered inch screws (demo)"
model = "{model}"
[materials]
"*" = "steel"
[defaults]
grade = "A2-70"
preload = "75%"
[[joint]]
id = "typed-4-40"
fastener = "#4-40"
head = "socket"
length = "1/2 in"
layers = [ {{ material = "steel", thickness = "0.032 in", role = "washer" }},
           {{ material = "steel", thickness = "1/8 in" }}, {{ material = "steel", thickness = "1/8 in" }} ]
"""


def test_numbered_inch_sizes_are_finished_from_the_catalogue(tmp_path, monkeypatch):
    """#2, #10 and #12 hex head machine screws and a #4 socket screw (washer on a typed-in twin): every
    joint is analysed, with no catalog-gap; without the numbered-size rows they were not."""
    from geomjoint.analysis import analyze_job
    from geomjoint.catalog import hardware
    from geomjoint.job import parse_job

    path = tmp_path / "rail.step"
    _numbered_model(path)
    job_path = tmp_path / "rail.toml"
    job_path.write_text(NUMBERED_JOB.format(model=path.name))
    scan = scan_model(path)
    by_size = {j.nominal: j for j in scan.joints}
    assert sorted(by_size) == sorted(catalog.thread(size).designation for _, size, *_ in NUMBERED)
    for j in scan.joints:
        assert not [f for f in j.findings if f.code == "catalog-gap"], j.nominal
    analysis = analyze_job(parse_job(job_path.read_text(), job_path), scan=scan)
    assert not analysis.not_analysed, [u.message for u in analysis.not_analysed]
    results = {r.spec.fastener.designation if r.id != "typed-4-40" else r.id: r for r in analysis.results}
    assert len(results) == len(NUMBERED) + 1
    for r in analysis.results:
        assert not [f for f in r.findings if f["code"] in ("catalog-gap", "not-analysed")], r.id
    # the typed-in #4 with a washer bears on the ASME B18.21.1 type B narrow washer, OD 0.250 in
    typed = results["typed-4-40"]
    assert typed.spec.bearing_diameter == pytest.approx(0.250 * 25.4) and typed.spec.bearing_source == "catalogue"
    # without the rows of this change (hex heads below 1/4 in, washers below #6) the same joints fail
    new_rows = {("hex_heads", size) for size in ("#1", "#2", "#3", "#4", "#5", "#6", "#8", "#10", "#12")} | {
        ("washers", size) for size in ("#0", "#1", "#2", "#3", "#4", "#5")}
    full = hardware._by_size

    def without_new_rows(table):
        return {k: v for k, v in full(table).items() if (table, k[0]) not in new_rows}
    monkeypatch.setattr(hardware, "_by_size", without_new_rows)
    with pytest.raises(InputError, match="no narrow washer dimensions for #4-40 UNC"):
        analyze_job(parse_job(job_path.read_text(), job_path), scan=scan)      # the typed-in twin: exit 2
    model_only = job_path.read_text().split("[[joint]]")[0]
    before = analyze_job(parse_job(model_only, job_path), scan=scan_model(path))
    reasons = " | ".join(u.message for u in before.not_analysed)
    for size in ("#10-24", "#12-24", "#2-56"):
        assert f"no hex head dimensions for {size} UNC" in reasons, size


def test_a_catalogue_error_during_the_scan_names_the_file(tmp_path, monkeypatch):
    path = tmp_path / "m25.step"
    mc.quirk_small_metric(path, clearance=2.9)

    def no_data(*args, **kwargs):
        raise InputError("no clearance data")
    monkeypatch.setattr(catalog, "nominal_from_hole", no_data)
    with pytest.raises(InputError, match=r"m25\.step: no clearance data"):
        scan_model(path)


# ----------------------------------------------------------------------------- plastics

def test_plastics_in_the_catalogue():
    # typical datasheet values at 23 degC (from memory): E of POM about 2.8 GPa, of PC about 2.35 GPa
    assert catalog.material("acetal").name == "POM" and catalog.material("POM").E == 2800
    assert catalog.material("polycarbonate").E == 2350
    assert catalog.material("acrylic").name == "PMMA"
    assert catalog.material("nylon 6/6").name == "PA66"
    for name in ("PLA", "PETG", "ABS", "PA6", "PA66", "POM", "PC", "PMMA"):
        m = catalog.material(name)
        assert m.family == "polymer" and m.limiting_pressure and "from memory" in m.source
        assert catalog.creeps_under_preload(name)
    assert not catalog.creeps_under_preload("steel")


def test_report_cautions_preloaded_plastic_parts(tmp_path):
    job = tmp_path / "plastic.toml"
    job.write_text('[[joint]]\nid = "P1"\nfastener = "M4"\ngrade = "8.8"\npreload = "50%"\n'
                   'layers = [{ material = "PA66", thickness = "6 mm" }, { material = "aluminium", thickness = "5 mm" }]\n'
                   'load = { max = "200 N" }\n'
                   '[[joint]]\nid = "S1"\nfastener = "M4"\n'
                   'layers = [{ material = "steel", thickness = "6 mm" }, { material = "steel", thickness = "5 mm" }]\n'
                   'load = { max = "200 N" }\n')
    out = tmp_path / "out"
    assert main(["check", str(job), "--out", str(out)]) in (0, 1)
    text = (out / "report.txt").read_text()
    line = next(l for l in text.splitlines() if l.startswith("CAUTION (plastic parts)"))
    assert "P1" in line and "S1" not in line and "PA66" in line and "creep" in line
    html = (out / "report.html").read_text()
    assert "Caution, plastic parts." in html and "maker" in html


# ----------------------------------------------------------------------------- in-memory models

class _Wrapped:
    """Any object exposing its OCP shape as ``.wrapped`` (the build123d convention)."""

    def __init__(self, shape, label=None, children=()):
        self.wrapped, self.label, self.children = shape, label, list(children)


def test_any_object_with_a_wrapped_shape_is_a_model():
    upper = _Wrapped(mc.plate([(0.0, 0.0)], 10.0).val().wrapped, "upper_plate")
    lower = _Wrapped(mc.plate([(0.0, 0.0)], 0.0).val().wrapped, "lower_plate")
    # the children's placement is relative to the parent's: move the parent up 100 mm
    parent_shape = cq.Compound.makeCompound([]).wrapped.Moved(cq.Location(cq.Vector(0, 0, 100)).wrapped)
    model = load_model(_Wrapped(parent_shape, "bracket", [upper, lower]))
    assert [p.name for p in model.parts] == ["upper_plate", "lower_plate"]
    zmin = min(cq.Shape.cast(p.solid).BoundingBox().zmin for p in model.parts)
    assert zmin == pytest.approx(100.0)
    [joint] = scan_model(model).joints
    assert joint.nominal == "M10"            # ISO 273 medium clearance 11 mm


def test_build123d_objects_are_models():
    bd = pytest.importorskip("build123d")
    plate = bd.Box(40, 40, 10) - bd.Cylinder(5.5, 10)
    upper = plate.moved(bd.Location((0, 0, 10)))
    upper.label = "upper_plate"
    lower = plate.moved(bd.Location((0, 0, 0)))
    lower.label = "lower_plate"
    assembly = bd.Compound(children=[upper, lower], label="bracket")
    scan = scan_model(assembly)
    assert sorted(p.name for p in scan.model.parts) == ["lower_plate", "upper_plate"]
    [joint] = scan.joints
    assert joint.nominal == "M10" and joint.grip == pytest.approx(20.0)


# ----------------------------------------------------------------------------- the real-model corpus

def test_corpus_manifest_and_name_reading():
    sys.path.insert(0, str(Path(__file__).resolve().parent / "realworld"))
    import run_corpus

    entries = json.loads(run_corpus.MANIFEST.read_text())
    assert 10 <= len(entries) <= 20
    for e in entries:
        assert {"repo", "commit", "path", "local", "sha256", "licence", "cad_system", "units"} <= set(e)
        assert re.fullmatch(r"[0-9a-f]{40}", e["commit"]) and re.fullmatch(r"[0-9a-f]{64}", e["sha256"])
    assert len({e["cad_system"].split()[0] for e in entries}) >= 6     # mixed writing systems
    # sizes as product names state them (a trade convention: M d x L, inch size-TPI x L)
    assert run_corpus.stated_size("01_01_09-cylinder_screw_M5x25-DIN912") == ("M5", 25.0)
    assert run_corpus.stated_size("#10-32 x 1/2 BHCS") == ("#10-32", 12.7)
    assert run_corpus.stated_size("1/4-20 x 1 1/4 SHCS") == ("1/4-20", 31.75)
    assert run_corpus.is_fastener_name("screw ISO 4017 M12x40") and not run_corpus.is_fastener_name("washer M6")
    assert run_corpus.is_fastener_name("HDW-207_91290A012_M2x5mm_SHCS_91290A012")
    assert run_corpus.stated_size("HDW-207_91290A012_M2x5mm_SHCS_91290A012") == ("M2", 5.0)
