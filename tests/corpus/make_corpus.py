"""Write the broken-input corpus under tests/corpus/ (run from anywhere; output is committed).

    .venv/bin/python tests/corpus/make_corpus.py

Every case is a file plus one row of ``manifest.json``:

    {"name": ..., "command": "scan" | "check", "file": path relative to tests/corpus,
     "exit": 2 (or 0 / 1 for inputs that are valid but tricky),
     "names": [strings the one stderr line must contain: the file and the key/part/entity;
               "a|b" means either],
     "subprocess": true when the case crashes the CAD kernel (the test runs it in a child process),
     "joints": number of joints the scan must find (valid tricky models only),
     "finding": a finding code the scan must (or, with "no_finding", must not) report,
     "needs": "" or the change in cli/analysis/geometry the case waits for (the test is xfail)}

STEP files that need a real writer (a face, a shell, plates with holes) are made with
cadquery / OCP; the rest are text edits of those. The header time stamp is fixed so the
script gives the same bytes on every run. All scenarios are invented (a small plate pair).
"""
from __future__ import annotations

import json
import math
import random
import re
from pathlib import Path

HERE = Path(__file__).resolve().parent
STEP_DIR = HERE / "step"
JOB_DIR = HERE / "jobs"

#: the M10 clearance hole of the plate pairs, mm (ISO 273 medium series for M10)
HOLE_M10_MEDIUM = 11.0
#: nominal diameter of M10, mm (ISO 261)
D_M10 = 10.0
#: part names of hostile_names.step as written in the file, and as a reader must return them
HOSTILE_NAMES_STEP = ("../../evil_pl\\X2\\00FC\\X0\\te_steel", "o''brien_" + "x" * 2000 + "_steel")
HOSTILE_NAMES = ("../../evil_pl\u00fcte_steel", "o'brien_" + "x" * 2000 + "_steel")

#: radial clearance of each plate: the bolt passes an offset of twice this (scan rule, DESIGN.md)
RADIAL_CLEARANCE = (HOLE_M10_MEDIUM - D_M10) / 2
PLATE = (40.0, 40.0, 10.0)   # invented demo plate, mm


# ---------------------------------------------------------------- writing STEP
def write_step(shapes, path: Path, unit: str = "MM") -> None:
    """Write named cadquery shapes / workplanes (or a ready cadquery Assembly) as AP214, in mm
    (or the STEP writer's `unit`: "M" writes the file in metres, as some CAD systems do)."""
    import cadquery as cq
    from cadquery.occ_impl.assembly import toCAF
    from OCP.Interface import Interface_Static
    from OCP.STEPCAFControl import STEPCAFControl_Writer
    from OCP.STEPControl import STEPControl_AsIs

    if isinstance(shapes, cq.Assembly):
        assy = shapes
    else:
        assy = cq.Assembly(name="corpus")
        for name, shape in shapes:
            assy.add(shape, name=name)
    _, doc = toCAF(assy)
    writer = STEPCAFControl_Writer()
    writer.SetNameMode(True)
    Interface_Static.SetCVal_s("write.step.unit", unit)
    Interface_Static.SetIVal_s("write.surfacecurve.mode", 0)   # no 2-D curves: smaller files
    writer.Transfer(doc, STEPControl_AsIs)
    writer.Write(str(path))
    Interface_Static.SetCVal_s("write.step.unit", "MM")
    _fix_timestamp(path)


def write_shape(shape, path: Path) -> None:
    """Write one bare OCP shape (face, shell, solid) with the plain STEP writer."""
    from OCP.Interface import Interface_Static
    from OCP.STEPControl import STEPControl_AsIs, STEPControl_Writer

    Interface_Static.SetIVal_s("write.surfacecurve.mode", 0)
    writer = STEPControl_Writer()
    writer.Transfer(shape, STEPControl_AsIs)
    writer.Write(str(path))
    _fix_timestamp(path)


def _fix_timestamp(path: Path) -> None:
    text = path.read_text()
    text = re.sub(r"FILE_NAME\('([^']*)','[^']*'", r"FILE_NAME('\1','2026-01-01T00:00:00'", text, count=1)
    text = text.replace(str(path), path.name)
    path.write_text(text)


def plate(holes: list[tuple[float, float]], z0: float, dia: float = HOLE_M10_MEDIUM, size=PLATE):
    import cadquery as cq

    lx, ly, t = size
    w = cq.Workplane("XY").box(lx, ly, t, centered=(True, True, False))
    if holes:
        w = w.faces(">Z").workplane().pushPoints(holes).hole(dia)
    return w.translate((0, 0, z0))


def plate_pair(offset: float) -> list[tuple[str, object]]:
    """Two 10 mm steel plates, one M10 clearance hole each, the upper hole offset in x."""
    return [("upper_plate_steel", plate([(offset, 0.0)], PLATE[2])),
            ("lower_plate_steel", plate([(0.0, 0.0)], 0.0))]


# ---------------------------------------------------------------- STEP cases
def step_cases() -> list[dict]:
    import cadquery as cq

    STEP_DIR.mkdir(parents=True, exist_ok=True)
    cases: list[dict] = []

    def case(name, file, exit=2, names=(), needs="", **extra):
        cases.append({"name": name, "command": "scan", "file": f"step/{file}", "exit": exit,
                      "names": [file, *names], "needs": needs, **extra})

    good = STEP_DIR / "plate_pair.step"
    write_step(plate_pair(0.0), good)
    case("good plate pair (reference for the text edits)", "plate_pair.step", exit=0, names=(), joints=1,
         no_finding="misaligned")
    text = good.read_text()

    (STEP_DIR / "empty.step").write_bytes(b"")
    case("STEP empty", "empty.step", names=("empty",))

    data_at = text.index("DATA;")
    cut = text.index("\n", data_at + (len(text) - data_at) // 2)
    (STEP_DIR / "truncated.step").write_text(text[:cut + 20])    # ends inside an entity
    case("STEP truncated mid-entity", "truncated.step", names=("truncated",))

    rng = random.Random(8)
    (STEP_DIR / "junk.step").write_bytes(bytes(rng.randrange(256) for _ in range(4096)))
    case("binary junk", "junk.step", names=("not a STEP file",))

    junk = bytes(rng.randrange(256) for _ in range(2048))
    (STEP_DIR / "junk_in_header.step").write_bytes(b"ISO-10303-21;\nHEADER;\n" + junk + b"\nEND-ISO-10303-21;\n")
    case("binary junk behind a STEP header", "junk_in_header.step", names=("binary",))

    # One letter lost or one character changed, as a damaged download or a hand edit leaves it: the
    # kernel's transfer dies with a segmentation fault (the whole process, no message, exit -11).
    # Run in a subprocess by the test. ReadFile's check list flags every one of them beforehand.
    for file, old, new in (("misspelt_entity.step", "#4 = PRODUCT_DEFINITION_SHAPE(", "#4 = PRODUCT_EFINITION_SHAPE("),
                           ("misspelt_point.step", "#20 = CARTESIAN_POINT(", "#20 = CARTESIN_POINT("),
                           ("lost_semicolon.step", "#66 = VECTOR('',#67,1.);\n#67 = ", "#66 = VECTOR('',#67,) = ")):
        assert old in text, file
        (STEP_DIR / file).write_text(text.replace(old, new, 1))
        case(f"damaged entity ({new.strip()}): the kernel crashes in transfer", file, names=("#|line",), subprocess=True)

    # A point with two coordinates in a 3-D model: the check list is silent and the transfer
    # still dies with a segmentation fault; the command's supervisor (cli.entry) contains that.
    pts = re.findall(r"CARTESIAN_POINT\('',\(([^)]*)\)\)", text)
    p3 = f"CARTESIAN_POINT('',({pts[5]}))"
    (STEP_DIR / "point_2d.step").write_text(text.replace(p3, f"CARTESIAN_POINT('',({','.join(pts[5].split(',')[:2])}))", 1))
    case("a point with two coordinates: the kernel crashes in transfer", "point_2d.step", names=("damaged|crash",),
         subprocess=True)

    # text garbage inside DATA: the kernel's reader skips the bad entity, prints to stdout
    # ("**** ERR StepFile ...", which spoils --json) and carries on as if the file were whole
    body = text.index("\n", data_at) + 1
    (STEP_DIR / "syntax_in_data.step").write_text(text[:body] + "#1 = CARTESIAN_POINT('',(0.,0.,0.)\n"
                                                  "#2 = @@@ this is not STEP;\n" + text[body:])
    case("syntax error inside the DATA section (text, not binary)", "syntax_in_data.step", names=("syntax",))

    header = text[:data_at]
    (STEP_DIR / "no_solids.step").write_text(header + "DATA;\nENDSEC;\nEND-ISO-10303-21;\n")
    case("valid header, empty DATA, no solids", "no_solids.step", names=("no solids",))

    face = cq.Workplane("XY").rect(30, 20).val()
    face = cq.Face.makeFromWires(face) if not isinstance(face, cq.Face) else face
    write_shape(face.wrapped, STEP_DIR / "face_only.step")
    case("only a surface (face), no solid", "face_only.step", names=("no solids",))

    box = cq.Workplane("XY").box(30, 20, 10).val()
    shell = cq.Shell.makeShell(box.Faces()[:5])              # an open box: five faces, no lid
    write_shape(shell.wrapped, STEP_DIR / "open_shell.step")
    case("only an open shell, no solid", "open_shell.step", names=("no solids",))

    # A solid whose closed shell lacks a face: declared MANIFOLD_SOLID_BREP, not closed.
    solid = cq.Workplane("XY").box(30, 20, 10).val()
    write_shape(solid.wrapped, STEP_DIR / "box.step")
    btext = (STEP_DIR / "box.step").read_text()
    (STEP_DIR / "box.step").unlink()
    m = re.search(r"(#\d+)\s*=\s*CLOSED_SHELL\('',\(([^)]*)\)\)", btext)
    faces = [f.strip() for f in m.group(2).split(",")]
    broken = btext.replace(m.group(0), f"{m.group(1)} = CLOSED_SHELL('',({','.join(faces[:-1])}))")
    (STEP_DIR / "solid_missing_face.step").write_text(broken)
    case("solid whose closed shell has a face missing", "solid_missing_face.step", names=("solid",))

    # The same slip in one part of an assembly: the reader drops that solid without a word, so the
    # joint it belongs to vanishes. An engineer expects to hear which part was lost.
    m = re.search(r"(#\d+)\s*=\s*CLOSED_SHELL\('',\(([^)]*)\)\)", text)
    faces = [f.strip() for f in m.group(2).split(",")]
    lost = text.replace(m.group(0), f"{m.group(1)} = CLOSED_SHELL('',({','.join(faces[:-1])}))")
    (STEP_DIR / "assembly_part_lost.step").write_text(lost)
    case("assembly with one solid broken (face missing): part silently lost", "assembly_part_lost.step",
         names=("solid",))

    # One point of the upper plate moved to 1e300 mm, or to 1e400 (beyond a double), or one face
    # reference left dangling: the reader drops that plate without an error and the joint vanishes.
    points = re.findall(r"CARTESIAN_POINT\('',\(([^)]*)\)\)", text)
    far = f"CARTESIAN_POINT('',({points[5]}))"
    for file, value, what in (("far_point.step", "1.E+300", "a point 1e300 mm away"),
                              ("overflow_point.step", "1.E+400", "a coordinate beyond a double (1e400)")):
        (STEP_DIR / file).write_text(text.replace(far, f"CARTESIAN_POINT('',({value},0.,0.))", 1))
        case(f"{what}: the plate is dropped", file, names=("solid",))
    dangling = text.replace(m.group(0), f"{m.group(1)} = CLOSED_SHELL('',({','.join(faces[:-1] + ['#999999'])}))")
    (STEP_DIR / "dangling_reference.step").write_text(dangling)
    case("a reference to an entity that is not there (#999999)", "dangling_reference.step", names=("#999999",))

    # Two cubes sharing one edge sewn into one shell and made one solid: the shared edge
    # bounds four faces (non-manifold); OCCT's BRepCheck calls the solid invalid.
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeSolid, BRepBuilderAPI_Sewing
    from OCP.TopoDS import TopoDS

    a = cq.Workplane("XY").box(10, 10, 10, centered=False).val()
    b = a.translate(cq.Vector(10, 10, 0))
    sewing = BRepBuilderAPI_Sewing(1e-6, True, True, True, True)   # last flag: non-manifold mode
    for f in a.Faces() + b.Faces():
        sewing.Add(f.wrapped)
    sewing.Perform()
    shell = TopoDS.Shell_s(sewing.SewedShape())
    write_shape(BRepBuilderAPI_MakeSolid(shell).Solid(), STEP_DIR / "non_manifold.step")
    case("non-manifold solid: two cubes sharing an edge in one solid", "non_manifold.step",
         names=("non-manifold",))

    unit = text.replace(".MILLI.,.METRE.", ".MILLI.,.FURLONG.", 1)
    assert unit != text
    (STEP_DIR / "unknown_unit.step").write_text(unit)
    case("unit the reader does not know (.FURLONG.)", "unknown_unit.step", names=("unit", "FURLONG", "#"))

    (STEP_DIR / "huge_part.step").unlink(missing_ok=True)
    write_step([("rail_steel", plate([], 0.0, size=(1.0e6, 40.0, 10.0)))], STEP_DIR / "huge_part.step")
    case("a part a million mm long", "huge_part.step", names=("rail_steel", "long"))

    # holes that almost line up: the bolt passes an offset of 2 x radial clearance (1.0 mm for M10 in 11 mm)
    inside = 2 * RADIAL_CLEARANCE - 0.05
    outside = 2 * RADIAL_CLEARANCE + 0.05
    write_step(plate_pair(inside), STEP_DIR / "offset_inside.step")
    case(f"holes offset {inside:g} mm, inside the clearance", "offset_inside.step", exit=0, joints=1,
         no_finding="misaligned")
    write_step(plate_pair(outside), STEP_DIR / "offset_outside.step")
    case(f"holes offset {outside:g} mm, just outside the clearance", "offset_outside.step", exit=1, joints=1,
         finding="misaligned")
    apart = HOLE_M10_MEDIUM + 1.0            # the circles no longer overlap: two separate holes
    write_step(plate_pair(apart), STEP_DIR / "offset_apart.step")
    case(f"holes {apart:g} mm apart, no overlap: two lone holes, no joint", "offset_apart.step", exit=0, joints=0)

    # hostile part names (valid STEP): a path that climbs, an escaped quote, non-ASCII in the
    # ISO 10303-21 \\X2\\ encoding, 2000 characters; they must come through as names, never as paths
    hostile = (text.replace("upper_plate_steel", HOSTILE_NAMES_STEP[0])
               .replace("lower_plate_steel", HOSTILE_NAMES_STEP[1]))
    (STEP_DIR / "hostile_names.step").write_text(hostile)
    case("hostile part names: ../, quote, non-ASCII, 2000 characters", "hostile_names.step", exit=0, joints=1,
         no_finding="misaligned")

    # the same plate twice in the same place (a copy-paste slip): an engineer expects to be told,
    # and the grip must not silently count the plate twice
    write_step(plate_pair(0.0) + [("upper_plate_steel_copy", plate([(0.0, 0.0)], PLATE[2]))],
               STEP_DIR / "duplicate_instance.step")
    case("duplicate instance on top of itself", "duplicate_instance.step", exit=1, joints=1,
         finding="duplicate")
    # the same part definition placed twice at the same location (two instances, "P" and "P#2")
    upper = cq.Assembly(name="upper")
    upper.add(plate([(0.0, 0.0)], PLATE[2]), name="upper_plate_steel")
    assy = cq.Assembly(name="corpus")
    assy.add(upper, name="upper_a")
    assy.add(upper, name="upper_b")
    assy.add(plate([(0.0, 0.0)], 0.0), name="lower_plate_steel")
    write_step(assy, STEP_DIR / "duplicate_placement.step")
    case("one part placed twice at the same location", "duplicate_placement.step", exit=1, joints=1,
         finding="duplicate")
    return cases


# ---------------------------------------------------------------- job cases
BASE = """\
[defaults]
fastener = "M12"
grade = "8.8"

[[joint]]
id = "A1"
layers = [ { material = "steel", thickness = "16 mm" },
           { material = "steel", thickness = "16 mm" } ]
load = { min = "0 kN", max = "10 kN" }
"""

GROUP = """
[[joint]]
id = "A2"
layers = [ { material = "steel", thickness = "16 mm" },
           { material = "steel", thickness = "16 mm" } ]

[[group]]
joints = ["A1", "A2"]
positions = [["0 mm", "0 mm"], ["80 mm", "0 mm"]]
point = ["40 mm", "0 mm", "50 mm"]
force = { max = ["0 kN", "0 kN", "6 kN"] }
moment = { max = ["0 N*m", "100 N*m", "0 N*m"] }
"""

#: (file stem, edit of BASE: (old, new) or a whole text, strings the error line must name)
JOB_EDITS: list[tuple[str, object, tuple[str, ...]]] = [
    ("syntax_error", BASE + "\n[[joint]\n", ("TOML syntax",)),
    ("unknown_top_key", "modle = \"x.step\"\n" + BASE, ("modle", "model")),
    ("unknown_joint_key", ('id = "A1"', 'id = "A1"\ncolour = "red"'), ("colour",)),
    ("unknown_layer_key", ('material = "steel", thickness', 'materiel = "steel", thickness'), ("materiel",)),
    ("wrong_type_thickness", ('thickness = "16 mm" },\n', 'thickness = true },\n'), ("thickness",)),
    ("wrong_type_layers", ('layers = [ { material = "steel", thickness = "16 mm" },\n'
                           '           { material = "steel", thickness = "16 mm" } ]', 'layers = "steel"'), ("layers",)),
    ("wrong_type_tapped", ('id = "A1"', 'id = "A1"\ntapped = "yes"'), ("tapped",)),
    ("wrong_type_defaults", BASE.replace('[defaults]\nfastener = "M12"\ngrade = "8.8"\n', 'defaults = "M12 8.8"\n'),
     ("[defaults]", "table")),
    ("missing_unit_thickness", ('thickness = "16 mm" },\n', 'thickness = 16 },\n'), ("thickness", "no unit")),
    ("missing_unit_load", ('max = "10 kN"', 'max = 10'), ("max", "no unit")),
    ("wrong_dimension", ('thickness = "16 mm" },\n', 'thickness = "16 kg" },\n'), ("thickness",)),
    ("zero_thickness", ('thickness = "16 mm" },\n', 'thickness = "0 mm" },\n'), ("thickness",)),
    ("negative_thickness", ('thickness = "16 mm" },\n', 'thickness = "-16 mm" },\n'), ("thickness",)),
    ("nan_thickness", ('thickness = "16 mm" },\n', 'thickness = "nan mm" },\n'), ("thickness",)),
    ("negative_load", ('max = "10 kN"', 'max = "-10 kN"'), ("load",)),
    ("zero_torque", ('grade = "8.8"', 'grade = "8.8"\ntorque = "0 N*m"\nnut_factor = 0.2'), ("torque",)),
    ("zero_length", ('id = "A1"', 'id = "A1"\nlength = "0 mm"'), ("length",)),
    ("max_below_min", ('min = "0 kN"', 'min = "12 kN"'), ("load", "less than min")),
    ("reliability_above_1", ('grade = "8.8"', 'grade = "8.8"\nreliability = 1.2'), ("reliability",)),
    ("reliability_1", ('grade = "8.8"', 'grade = "8.8"\nreliability = 1.0'), ("reliability",)),
    ("reliability_0", ('grade = "8.8"', 'grade = "8.8"\nreliability = 0'), ("reliability",)),
    ("unknown_material", ('material = "steel"', 'material = "unobtainium"'), ("material", "unobtainium")),
    ("unknown_grade", ('grade = "8.8"', 'grade = "8.9"'), ("grade",)),
    ("unknown_fastener", ('fastener = "M12"', 'fastener = "M13"'), ("fastener",)),
    ("unknown_criterion", ('grade = "8.8"', 'grade = "8.8"\ncriterion = "goodmann"'), ("criterion",)),
    ("preload_over_120", ('grade = "8.8"', 'grade = "8.8"\npreload = "150%"'), ("preload",)),
    ("cone_angle_90", ('grade = "8.8"', 'grade = "8.8"\ncone_angle = "90 deg"'), ("cone_angle",)),
    ("friction_low", ('grade = "8.8"', 'grade = "8.8"\nfriction = { thread = 0.01, head = 0.12 }'), ("friction.thread",)),
    ("friction_high", ('grade = "8.8"', 'grade = "8.8"\nfriction = { thread = 0.12, head = 0.9 }'), ("friction.head",)),
    ("scatter_below_1", ('grade = "8.8"', 'grade = "8.8"\nscatter = 0.8'), ("scatter",)),
    ("unknown_roughness", ('grade = "8.8"', 'grade = "8.8"\nmethod = "vdi"\nroughness = "mirror"'), ("roughness",)),
    ("joint_without_id", ('id = "A1"\n', ''), ("joint[0]", "id")),
    ("duplicate_id", BASE + BASE.split("\n", 3)[3], ("joint[1]", "A1")),
    ("empty_layers", ('layers = [ { material = "steel", thickness = "16 mm" },\n'
                      '           { material = "steel", thickness = "16 mm" } ]', 'layers = []'), ("layers",)),
    ("group_one_bolt", BASE + GROUP.replace('joints = ["A1", "A2"]', 'joints = ["A1"]').replace(
        'positions = [["0 mm", "0 mm"], ["80 mm", "0 mm"]]', 'positions = [["0 mm", "0 mm"]]'), ("group[0]", "2")),
    ("group_coincident", BASE + GROUP.replace('["80 mm", "0 mm"]]', '["0 mm", "0 mm"]]'), ("group[0]", "coincide")),
    ("group_moment_without_point", BASE + GROUP.replace('point = ["40 mm", "0 mm", "50 mm"]\n', ''),
     ("group[0]", "point")),
    ("load_not_array", "load = 5\n" + BASE, ("load", "[[load]]")),
    ("fasteners_not_array", "fasteners = 5\n" + BASE, ("fasteners", "[[fasteners]]")),
    ("group_entry_not_table", "group = [5]\n" + BASE, ("group[0]", "table")),
    ("title_not_string", "title = { a = 1 }\n" + BASE, ("title",)),
    ("default_material_number", "default_material = 5\n" + BASE, ("default_material",)),
    ("below_absolute_zero", ('grade = "8.8"', 'grade = "8.8"\ntemperature = "-500 degC"'),
     ("temperature", "absolute zero")),
    ("grip_beyond_catalog", ('"16 mm" },\n', '"160 mm" },\n'), ("length", "no standard")),
    ("load_matches_nothing", BASE + '\n[[load]]\njoints = "A9"\naxial = { max = "1 kN" }\n',
     ("[[load]]", "'A9'", "matches no joint", "'A1'")),
    ("fasteners_match_nothing", BASE + '\n[[fasteners]]\njoints = "B*"\ngrade = "10.9"\n',
     ("[[fasteners]]", "'B*'", "matches no joint")),
    ("materials_match_nothing", BASE + '\n[materials]\n"plate*" = "steel"\n', ("[materials]", "'plate*'", "no part")),
    ("exclude_matches_nothing", 'exclude = ["A2"]\n' + BASE, ("exclude", "'A2'", "'A1'")),
    ("bearing_nut_on_tapped", ('id = "A1"', 'id = "A1"\ntapped = true\nbearing_diameter = { head = "18 mm", nut = "17 mm" }'),
     ("bearing_diameter.nut", "no nut face")),
    ("bearing_face_key_unknown", ('grade = "8.8"', 'grade = "8.8"\nbearing_diameter = { head = "18 mm", far = "17 mm" }'),
     ("bearing_diameter", "far")),
    ("roughness_beyond_table", ('grade = "8.8"', 'grade = "8.8"\nroughness = "200 um"'), ("roughness", "200")),
    ("thickness_tolerance_unknown", ('grade = "8.8"', 'grade = "8.8"\nthickness_tolerance = "h7"'),
     ("thickness_tolerance", "ISO 2768-1")),
    ("tolerances_match_nothing", BASE.replace('thickness = "16 mm" }', 'thickness = "16 mm", part = "plate" }', 1)
     + '\n[tolerances]\n"frame*" = "f"\n', ("[tolerances]", "'frame*'", "no part")),
    ("position_without_unit", ('grade = "8.8"', 'grade = "8.8"\nposition_tolerance = "0.2"'),
     ("position_tolerance",)),
    ("model_missing", 'model = "nowhere.step"\n' + BASE, ("model", "nowhere.step")),
    ("model_is_folder", 'model = "sub"\n' + BASE, ("model", "folder")),
    ("model_outside_folder", 'model = "../step/plate_pair.step"\n' + BASE, ("model", "outside")),
    ("model_broken", 'model = "sub/empty_model.step"\n' + BASE, ("empty_model.step", "empty")),
]


def job_cases() -> list[dict]:
    JOB_DIR.mkdir(parents=True, exist_ok=True)
    (JOB_DIR / "sub").mkdir(exist_ok=True)
    (JOB_DIR / "sub" / "empty_model.step").write_bytes(b"")
    cases = []
    for stem, edit, names in JOB_EDITS:
        if isinstance(edit, tuple):
            old, new = edit
            assert old in BASE, stem
            text = BASE.replace(old, new, 1)
        else:
            text = edit
        assert text != BASE, stem
        (JOB_DIR / f"{stem}.toml").write_text(text)
        cases.append({"name": stem.replace("_", " "), "command": "check", "file": f"jobs/{stem}.toml",
                      "exit": 2, "names": [f"{stem}.toml" if stem != "model_broken" else "", *names],
                      "needs": ""})
    (JOB_DIR / "long_bolt_fails.toml").write_text(BASE.replace('id = "A1"', 'id = "A1"\nlength = "140 mm"').replace(
        '"16 mm" },\n', '"60 mm" },\n').replace('"16 mm" } ]', '"50 mm" } ]').replace('"10 kN"', '"45 kN"'))
    cases.append({"name": "explicit bolt length beyond the catalogue, joint fails: exit 1 with remedies",
                  "command": "check", "file": "jobs/long_bolt_fails.toml", "exit": 1, "names": [], "joints": 1, "needs": ""})
    (JOB_DIR / "not_utf8.toml").write_bytes(BASE.encode() + b"# \xff\xfe latin-1 slip\n")
    cases.append({"name": "job not UTF-8", "command": "check", "file": "jobs/not_utf8.toml", "exit": 2,
                  "names": ["not_utf8.toml", "UTF-8"], "needs": ""})
    cases.append({"name": "job path does not exist", "command": "check", "file": "jobs/no_such_job.toml", "exit": 2,
                  "names": ["no_such_job.toml", "does not exist"], "needs": ""})
    cases.append({"name": "job path is a folder", "command": "check", "file": "jobs/sub", "exit": 2,
                  "names": ["sub", "folder"], "needs": ""})
    for c in cases:
        c["names"] = [n for n in c["names"] if n]
    return cases



# ---------------------------------------------------------------- real-export quirks (reading and names)
# Reproductions of what real CAD exports carry, for the reading tests (tests/test_realworld_reading.py).
# Each builder writes one STEP file at `path` (a test's tmp folder) and returns what the test needs;
# none of these files is part of the corpus manifest. The scenario is an invented plate pair held
# by modelled bolts.

#: M10 hex bolt of the quirk models: ISO 4017 s = 16, k = 6.4 (from memory); nut ISO 4032 m = 8.4
M10_HEAD = (16.0, 6.4)
M10_NUT_HEIGHT = 8.4


def _hex_bolt(d: float, length: float, s: float, k: float):
    """Hex head (across flats s, height k) on z >= 0, shank of diameter d to z = -length."""
    import math

    import cadquery as cq

    head = cq.Workplane("XY").polygon(6, s / math.cos(math.radians(30))).extrude(k)
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def _socket_screw(d: float, length: float, dk: float, k: float):
    import cadquery as cq

    head = cq.Workplane("XY").circle(dk / 2).extrude(k)
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def bolted_pair_assembly(bolt_name: str = "bolt", repeat_product: bool = True):
    """Two 10 mm steel plates with two M10 clearance holes, two M10x30 hex bolts and nuts.

    With ``repeat_product`` the two bolts (and the two nuts) are one product placed twice,
    as CAD systems write a part used twice.
    """
    import math

    import cadquery as cq

    holes = [(-12.0, 0.0), (12.0, 0.0)]
    a = cq.Assembly(name="bracket_assembly")
    a.add(plate(holes, PLATE[2], size=(50.0, 30.0, 10.0)), name="upper_plate")
    a.add(plate(holes, 0.0, size=(50.0, 30.0, 10.0)), name="lower_plate")
    bolt = _hex_bolt(D_M10, 30.0, *M10_HEAD)
    nut = (cq.Workplane("XY").polygon(6, M10_HEAD[0] / math.cos(math.radians(30))).extrude(M10_NUT_HEIGHT)
           .faces(">Z").workplane().hole(D_M10))
    for i, (x, y) in enumerate(holes, 1):
        b = bolt if repeat_product else _hex_bolt(D_M10, 30.0, *M10_HEAD)
        n = nut if repeat_product else nut.translate((0, 0, 0))
        a.add(b, name=f"{bolt_name}_{i}", loc=cq.Location(cq.Vector(x, y, 2 * PLATE[2])))
        a.add(n, name=f"nut_{i}", loc=cq.Location(cq.Vector(x, y, 0.0), cq.Vector(1, 0, 0), 180))
    return a


def quirk_dollar_names(path: Path, renumber: bool = True) -> dict:
    """A cadquery STEP post-edited as some writers write it: ``$`` for the name of every
    PRODUCT_DEFINITION_SHAPE and ITEM_DEFINED_TRANSFORMATION.  With ``renumber`` every
    entity id is moved to 10 n + 7, so the file's #ids differ from the reader's ordinals.

    Returns the #ids of the edited entities.
    """
    write_step(bolted_pair_assembly(), path)
    text = path.read_text()
    if renumber:
        text = re.sub(r"#(\d+)", lambda m: f"#{10 * int(m.group(1)) + 7}", text)
    edited = []

    def blank(m):
        edited.append(int(m.group(1)))
        return f"#{m.group(1)} = {m.group(2)}($,"

    text = re.sub(r"#(\d+) = (PRODUCT_DEFINITION_SHAPE|ITEM_DEFINED_TRANSFORMATION)\('[^']*',", blank, text)
    path.write_text(text)
    return {"ids": sorted(edited)}


def quirk_damaged_entity(path: Path) -> int:
    """The renumbered file of :func:`quirk_dollar_names` with one DIRECTION given a third
    parameter (real damage): returns that entity's #id."""
    quirk_dollar_names(path)
    text = path.read_text()
    m = re.search(r"#(\d+) = DIRECTION\('([^']*)',(\([^)]*\))\);", text)
    text = text[:m.start()] + f"#{m.group(1)} = DIRECTION('{m.group(2)}',{m.group(3)},5.);" + text[m.end():]
    path.write_text(text)
    return int(m.group(1))


def quirk_degree_unit(path: Path) -> float:
    """A plate with a 90 degree countersink, written with its plane-angle unit as a
    conversion-based DEGREE with ``NAMED_UNIT(*)`` (as one CAD system writes it) and the
    cone's semi-angle in degrees.  Returns the volume of the plate as cadquery made it, mm^3."""
    import cadquery as cq

    solid = cq.Workplane("XY").box(30, 30, 10).faces(">Z").workplane().cskHole(5.5, 11.0, 90).val()
    write_shape(solid.wrapped, path)
    text = path.read_text()
    text, n = re.subn(r"(CONICAL_SURFACE\('[^']*',#\d+,[^,]+,)([0-9.Ee+-]+)\)",
                      lambda m: f"{m.group(1)}{math.degrees(float(m.group(2))):.9f})", text)
    assert n >= 1, "no cone written"
    unit = re.search(r"#(\d+) = \( NAMED_UNIT\(\*\) PLANE_ANGLE_UNIT\(\) SI_UNIT\(\$,\.RADIAN\.\) \);", text)
    i = unit.group(1)
    text = text.replace(unit.group(0),
                        f"#{i} = ( CONVERSION_BASED_UNIT('DEGREE',#{i}01) NAMED_UNIT(*) PLANE_ANGLE_UNIT() );\n"
                        f"#{i}01 = PLANE_ANGLE_MEASURE_WITH_UNIT(PLANE_ANGLE_MEASURE(0.0174532925199433),#{i}02);\n"
                        f"#{i}02 = ( NAMED_UNIT(*) PLANE_ANGLE_UNIT() SI_UNIT($,.RADIAN.) );")
    path.write_text(text)
    return solid.Volume()


def quirk_cad_naming(path: Path, style: str) -> dict:
    """The bolted pair written with the product / instance names of a CAD system.

    style: "numbered" (instances named by occurrence id, NAUO1, NAUO2 ...; products by part
    name, as one widely used commercial system writes them), "versioned" (products
    "bolt v1", instances "bolt v1:1", "bolt v1:2", as a cloud CAD system writes them),
    "own" (a script's own instance names, as cadquery writes them), "unnamed" (no product
    or instance names at all).  Returns the expected part names in file order.
    """
    write_step(bolted_pair_assembly(bolt_name="bolt" if style != "own" else "bolt_left"), path)
    text = path.read_text()
    nauo = re.compile(r"NEXT_ASSEMBLY_USAGE_OCCURRENCE\('([^']*)','([^']*)','([^']*)',")
    product = re.compile(r"PRODUCT\('([^']*)','([^']*)',")
    count = [0]
    if style == "numbered":
        def inst(m):
            count[0] += 1
            return f"NEXT_ASSEMBLY_USAGE_OCCURRENCE('NAUO{count[0]}',' ',' ',"
        text = nauo.sub(inst, text)
        text = product.sub(lambda m: f"PRODUCT('{_sw_name(m.group(1))}','{_sw_name(m.group(1))}',", text)
        names = ["plate_upper-S235", "plate_lower-S235", "hex_bolt_M10x30-ISO4017",
                 "hex_nut_M10-ISO4032", "hex_bolt_M10x30-ISO4017#2", "hex_nut_M10-ISO4032#2"]
    elif style == "versioned":
        seen: dict[str, int] = {}

        def inst(m):
            base = _versioned(m.group(2))
            seen[base] = seen.get(base, 0) + 1
            return f"NEXT_ASSEMBLY_USAGE_OCCURRENCE('{base}:{seen[base]}','{base}:{seen[base]}','',"
        text = nauo.sub(inst, text)
        text = product.sub(lambda m: f"PRODUCT('{_versioned(m.group(1))}','{_versioned(m.group(1))}',", text)
        names = ["upper_plate v1", "lower_plate v1", "bolt v1", "nut v1", "bolt v1#2", "nut v1#2"]
    elif style == "own":
        names = ["upper_plate", "lower_plate", "bolt_left_1", "nut_1", "bolt_left_2", "nut_2"]
    elif style == "unnamed":
        text = nauo.sub("NEXT_ASSEMBLY_USAGE_OCCURRENCE('','','',", text)
        text = product.sub("PRODUCT('','',", text)
        names = ["part", "part#2", "part#3", "part#4", "part#5", "part#6"]
    else:
        raise ValueError(style)
    path.write_text(text)
    return {"names": names}


def _sw_name(name: str) -> str:
    """Part names as a fastener library of a commercial system gives them (invented models)."""
    return {"upper_plate": "plate_upper-S235", "lower_plate": "plate_lower-S235",
            "bolt_1": "hex_bolt_M10x30-ISO4017", "nut_1": "hex_nut_M10-ISO4032"}.get(name, name)


def _versioned(name: str) -> str:
    return re.sub(r"_\d+$", "", name) + " v1"


def quirk_small_metric(path: Path, clearance: float = 2.9, tapped: float | None = None,
                       screw: tuple[float, float, float, float] | None = None) -> None:
    """A 3 mm cover on a 6 mm base in a millimetre model with small holes (no hardware, or a
    modelled socket screw ``(d, length, dk, k)``): the cover has a ``clearance`` hole, the base
    the same hole or, with ``tapped``, a blind tapped (tap-drill) hole of that diameter."""
    import cadquery as cq

    a = cq.Assembly(name="sensor_mount")
    cover = cq.Workplane("XY").box(20, 20, 3, centered=(True, True, False)).faces(">Z").workplane().hole(clearance)
    a.add(cover.translate((0, 0, 6)), name="cover")
    base = cq.Workplane("XY").box(20, 20, 6, centered=(True, True, False))
    if tapped is None:
        base = base.faces(">Z").workplane().hole(clearance)
    else:
        base = base.faces(">Z").workplane().hole(tapped, 5.0)
    a.add(base, name="base")
    if screw is not None:
        d, length, dk, k = screw
        a.add(_socket_screw(d, length, dk, k), name=f"socket_screw_M{d:g}x{length:g}",
              loc=cq.Location(cq.Vector(0, 0, 9)))
    write_step(a, path)


#: a fan housing's mounting hole and the thin bracket under it (the Ultimaker 2 head's fan:
#: 3.2 mm holes in the housing over 1.8 mm holes in a 0.5 mm sheet), here for M5, mm
WIDE_HOLE = 9.0          # wider than an M5 hex head's bearing face (ISO 4017 d_w 6.88, from memory)
BRACKET_HOLE = 5.5       # M5 medium clearance (ISO 273)


def quirk_wide_hole_over_small(path: Path) -> None:
    """A 10 mm fan housing with a 9 mm hole on a 1 mm bracket with a 5.5 mm hole, no hardware:
    the size is inferred from the bracket (M5), whose head or nut bears on the housing's hole,
    which is wider than its bearing face (met in a real export: the bearing face pulls into
    the hole; the marked-up model once stopped the check on it)."""
    import cadquery as cq

    a = cq.Assembly(name="fan_mount")
    housing = cq.Workplane("XY").box(30, 30, 10, centered=(True, True, False)).faces(">Z").workplane().hole(WIDE_HOLE)
    a.add(housing.translate((0, 0, 1)), name="fan_housing")
    bracket = cq.Workplane("XY").box(30, 30, 1, centered=(True, True, False)).faces(">Z").workplane().hole(BRACKET_HOLE)
    a.add(bracket, name="bracket_sheet")
    write_step(a, path)


#: an M5 hole modelled line to line with the screw, as one writer reads it back: 5 mm less
#: 1.6e-14 (the float noise of its export, seen in a real file)
LINE_TO_LINE_RADIUS = "2.499999999999992"


def quirk_line_to_line(path: Path) -> None:
    """A DIN 912 M5x20 screw through two 6 mm plates with 5.0 mm holes (the screw's own
    diameter, no clearance) into a hex nut, every radius of 2.5 mm written as 2.499999999999992
    (met in a real export: the check then refused the joint, "hole diameter 5 mm is smaller
    than the bolt (5 mm)")."""
    import math
    import re

    import cadquery as cq

    a = cq.Assembly(name="gear_flange")
    top = _plates(a, 5.0, (6.0, 6.0), (30.0, 30.0), ("gear_plate", "adapter_plate"))
    a.add(_socket_screw(5.0, 20.0, 8.5, 5.0), name="cylinder_screw_M5x20-DIN912",
          loc=cq.Location(cq.Vector(0, 0, top)))
    nut = (cq.Workplane("XY").polygon(6, 8.0 / math.cos(math.radians(30))).extrude(4.7)
           .faces(">Z").workplane().hole(5.0))
    a.add(nut, name="nut_M5-DIN934", loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
    write_step(a, path)
    text = path.read_text()
    text = re.sub(r"((?:CYLINDRICAL_SURFACE|CIRCLE)\('[^']*',#\d+,)2\.5\)", rf"\g<1>{LINE_TO_LINE_RADIUS})", text)
    path.write_text(text)


def quirk_notched_clamp(path: Path) -> None:
    """A 3 mm blade held on a block by a DIN 912 M5x10 screw that passes a U-notch at the
    blade's edge (a half-round of 5.5 mm, ISO 273 medium for M5) into a tapped hole (4.2 mm,
    ISO 261 d - P): the blade has no closed hole around the screw (met in a real export, a
    shredder's cutter held by screws in notches: the screw's only layer is the tapped block)."""
    import cadquery as cq

    a = cq.Assembly(name="cutter_stack")
    block = cq.Workplane("XY").box(40, 40, 12, centered=(True, True, False)).faces(">Z").workplane().hole(4.2, 10.0)
    a.add(block, name="block")
    # the blade's edge runs through the screw's axis: the notch is the half of a 5.5 mm hole
    blade = cq.Workplane("XY").box(30, 40, 3, centered=(False, True, False)).translate((0, 0, 12)).cut(
        cq.Workplane("XY").circle(2.75).extrude(20).translate((0, 0, 5)))
    a.add(blade, name="cutter_blade")
    a.add(_socket_screw(5.0, 10.0, 8.5, 5.0), name="cylinder_screw_M5x10-DIN912",
          loc=cq.Location(cq.Vector(0, 0, 15)))
    write_step(a, path)


def quirk_screw_into_undrilled_part(path: Path) -> None:
    """A 5 mm end cap on a motor body held by a DIN 912 M4x10 screw: the cap's hole is drawn
    line to line (4.0 mm), the motor, a bought part drawn as a plain solid, has no hole at all:
    the screw's last 5 mm overlap its material (met in a real export: the cap was taken as the
    tapped part and the joint set aside, "a tapped joint needs a clamped layer")."""
    import cadquery as cq

    a = cq.Assembly(name="motor_cap")
    a.add(cq.Workplane("XY").circle(20.0).extrude(30.0), name="motor_body")
    cap = cq.Workplane("XY").circle(20.0).extrude(5.0).faces(">Z").workplane().pushPoints([(12.0, 0.0)]).hole(4.0)
    a.add(cap.translate((0, 0, 30.0)), name="end_cap")
    a.add(_socket_screw(4.0, 10.0, 7.0, 4.0), name="cylinder_screw_M4x10-DIN912",
          loc=cq.Location(cq.Vector(12.0, 0, 35.0)))
    write_step(a, path)


def quirk_bspline_faces(path: Path) -> None:
    """The bolted plate pair (``bolted_pair_assembly``) with every face of the two plates
    written as a B-spline surface, holes and flat faces alike (met in real exports: Open
    CASCADE 6.1's AP214 writes the holes of its sample assembly so, Rhino its planes)."""
    from OCP.BRepBuilderAPI import BRepBuilderAPI_NurbsConvert

    import cadquery as cq

    a = bolted_pair_assembly()
    for name in ("upper_plate", "lower_plate"):
        child = a.objects[name]
        shape = child.obj.val() if hasattr(child.obj, "val") else child.obj
        child.obj = cq.Workplane("XY").add(cq.Shape.cast(BRepBuilderAPI_NurbsConvert(shape.wrapped, True).Shape()))
    write_step(a, path)


def quirk_unit_spelling(path: Path, style: str) -> None:
    """The bolted pair with its millimetre unit spelled as other writers spell it.

    style: "conversion" (a conversion-based 'MILLIMETRE', as one translation library writes
    it), "multiline" (each unit entity over several lines, after an unused METRE unit, as a
    cloud CAD system writes it).
    """
    write_step(bolted_pair_assembly(), path)
    text = path.read_text()
    si = re.compile(r"#(\d+) = \( LENGTH_UNIT\(\) NAMED_UNIT\(\*\) SI_UNIT\(\.MILLI\.,\.METRE\.\) \);")
    if style == "conversion":
        text = si.sub(lambda m: f"#{m.group(1)} = (CONVERSION_BASED_UNIT('MILLIMETRE',#{m.group(1)}01)"
                                f"LENGTH_UNIT()NAMED_UNIT(#{m.group(1)}02));\n"
                                f"#{m.group(1)}01 = LENGTH_MEASURE_WITH_UNIT(LENGTH_MEASURE(1.0),#{m.group(1)}03);\n"
                                f"#{m.group(1)}02 = DIMENSIONAL_EXPONENTS(1.,0.,0.,0.,0.,0.,0.);\n"
                                f"#{m.group(1)}03 = ( LENGTH_UNIT() NAMED_UNIT(*) SI_UNIT(.MILLI.,.METRE.) );", text)
    elif style == "multiline":
        text = si.sub(lambda m: f"#{m.group(1)}09=(\nLENGTH_UNIT()\nNAMED_UNIT(*)\nSI_UNIT($,.METRE.)\n);\n"
                                f"#{m.group(1)}=(\nLENGTH_UNIT()\nNAMED_UNIT(*)\nSI_UNIT(.MILLI.,.METRE.)\n);", text)
    else:
        raise ValueError(style)
    path.write_text(text)


def quirk_remark_entities(path: Path, style: str) -> None:
    """The bolted pair with entities the reader complains about but that carry no geometry.

    style: "solid_angle" (the steradian unit with its dimensions given by reference, parsed
    as a wrong parameter count, as a translation library writes it), "presentation" (a saved
    view whose items include an entity of the wrong type, as one commercial system writes
    its annotation views).
    """
    write_step(bolted_pair_assembly(), path)
    text = path.read_text()
    if style == "solid_angle":
        text, n = re.subn(r"#(\d+) = \( NAMED_UNIT\(\*\) SI_UNIT\(\$,\.STERADIAN\.\) SOLID_ANGLE_UNIT\(\) \);",
                          lambda m: f"#{m.group(1)} = (NAMED_UNIT(#{m.group(1)}01)SOLID_ANGLE_UNIT()SI_UNIT($,.STERADIAN.));\n"
                                    f"#{m.group(1)}01 = DIMENSIONAL_EXPONENTS(0.,0.,0.,0.,0.,0.,0.);", text)
    elif style == "presentation":
        product = re.search(r"#(\d+) = PRODUCT\(", text).group(1)
        context = re.search(r"#(\d+) = \( GEOMETRIC_REPRESENTATION_CONTEXT", text).group(1)
        text, n = text.replace("ENDSEC;\nEND-ISO-10303-21;",
                               f"#999001 = DRAUGHTING_MODEL('Default',(#{product}),#{context});\n"
                               "ENDSEC;\nEND-ISO-10303-21;"), 1
    else:
        raise ValueError(style)
    assert n >= 1, style
    path.write_text(text)


# ---------------------------------------------------------------- hardware as fastener libraries model it
# Reproductions of how real fastener libraries draw their parts, for tests/test_hardware_shapes.py.
# Dimensions are the catalogue's (ISO tables, from memory, as in geomjoint/catalog/data); the
# scenarios (plates, blocks, a hub) are invented.

def _revolved(profile: list[tuple[float, float]]):
    """A solid of revolution about z from a closed (r, z) polygon."""
    import cadquery as cq

    return cq.Workplane("XZ").polyline(profile).close().revolve(360.0, (0, 0, 0), (0, 1, 0))


def _hex_socket(key: float, depth: float, top: float):
    """The cutting tool of a hexagon socket of size `key` (across flats) and `depth` from z = top."""
    import cadquery as cq

    return (cq.Workplane("XY").polygon(6, key / math.cos(math.radians(30))).extrude(depth)
            .translate((0, 0, top - depth)))


def hex_bolt_as_library(d: float, length: float, s: float, k: float, dw: float, c: float = 0.5,
                        chamfer_deg: float = 30.0):
    """A hex bolt as fastener libraries draw it (ISO 4014 / ISO 4017): the hexagon chamfered at
    the top (a cone at ``chamfer_deg`` to the top face, cutting the corners down to about s), a
    washer face of diameter ``dw`` and height ``c`` under it, the bearing face at z = 0 and the
    shank to z = -length."""
    import cadquery as cq

    e = s / math.cos(math.radians(30))
    r_top = 0.95 * s / 2
    slope = math.tan(math.radians(chamfer_deg))
    chamfer = _revolved([(0, c), (e, c), (e, k - (e - r_top) * slope), (r_top, k), (0, k)])
    prism = cq.Workplane("XY").polygon(6, e).extrude(k - c).translate((0, 0, c))
    head = prism.intersect(chamfer)
    face = cq.Workplane("XY").circle(dw / 2).extrude(c)
    shank = cq.Workplane("XY").circle(d / 2).extrude(-length)
    return head.union(face).union(shank)


def socket_screw_as_library(d: float, length: float, dk: float, k: float, key: float, chamfer: float = 0.5):
    """An ISO 4762 socket head cap screw as one commercial CAD library writes it: the head's top
    edge chamfered (a cone narrowing to the top), a hexagon socket, the bearing face at z = 0."""
    import cadquery as cq

    head = _revolved([(0, 0), (dk / 2, 0), (dk / 2, k - chamfer), (dk / 2 - chamfer, k), (0, k)])
    head = head.cut(_hex_socket(key, 0.6 * k, k))
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def threaded_socket_screw(d: float, pitch: float, length: float, dk: float, k: float, key: float):
    """An ISO 4762 socket screw with its thread drawn, as detailed library models are: a helical
    thread (a swept profile, crest at d) over a core at the minor diameter, which the helix cuts
    into strips; the thread runs to the tip (z = -length)."""
    import cadquery as cq

    r_core = d / 2 - 0.54 * pitch            # about the external minor radius (ISO 724: d3 = d - 1.227 P)
    helix = cq.Wire.makeHelix(pitch, length, r_core)
    profile = (cq.Workplane("XZ").polyline([(r_core - 0.01, -0.4 * pitch), (d / 2, -0.06 * pitch),
                                            (d / 2, 0.06 * pitch), (r_core - 0.01, 0.4 * pitch)])
               .close().wires().val())
    thread = cq.Solid.sweep(profile, [], helix, isFrenet=True)
    shank = (cq.Workplane("XY").circle(r_core).extrude(length + pitch).union(cq.Workplane("XY").add(thread))
             .translate((0, 0, -length - 0.5 * pitch)))
    shank = shank.intersect(cq.Workplane("XY").circle(d).extrude(-length))     # the tip cut square
    head = _revolved([(0, 0), (dk / 2, 0), (dk / 2, k - 0.5), (dk / 2 - 0.5, k), (0, k)]).cut(_hex_socket(key, 0.6 * k, k))
    return head.union(shank)


def knurled_socket_screw(d: float, length: float, dk: float, k: float, key: float, ridges: int = 36):
    """An ISO 4762 socket screw with a knurled head, as one catalogue's models are: the head's side
    a ring of V ridges (planes, no cylinder), a flat top with a hexagon socket."""
    import cadquery as cq

    pts = []
    for i in range(2 * ridges):
        r = dk / 2 if i % 2 == 0 else dk / 2 - 0.15
        a = math.pi * i / ridges
        pts.append((r * math.cos(a), r * math.sin(a)))
    head = cq.Workplane("XY").polyline(pts).close().extrude(k).cut(_hex_socket(key, 0.6 * k, k))
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def button_screw(d: float, length: float, dk: float, k: float, key: float):
    """An ISO 7380-1 button head screw: a low dome over a short rim, a hexagon socket."""
    import cadquery as cq

    rim = 0.15 * k
    head = (cq.Workplane("XZ").moveTo(0, 0).lineTo(dk / 2, 0).lineTo(dk / 2, rim)
            .threePointArc((0.3 * dk, 0.85 * k), (0, k)).close().revolve(360.0, (0, 0, 0), (0, 1, 0)))
    head = head.cut(_hex_socket(key, 0.6 * k, k + 0.01))
    screw = head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))
    # a socket wider than the dome's flat cuts a sliver off its crown: keep the screw
    return cq.Workplane("XY").add(max(screw.solids().vals(), key=lambda v: v.Volume()))


def pan_screw(d: float, length: float, dk: float, k: float):
    """An ISO 7045 pan head screw: a short side, a rounded crown, a cross recess (four slots)."""
    import cadquery as cq

    side = 0.45 * k
    head = (cq.Workplane("XZ").moveTo(0, 0).lineTo(dk / 2, 0).lineTo(dk / 2, side)
            .threePointArc((0.32 * dk, 0.9 * k), (0, k)).close().revolve(360.0, (0, 0, 0), (0, 1, 0)))
    for w, l in ((0.12 * dk, 0.5 * dk), (0.5 * dk, 0.12 * dk)):
        head = head.cut(cq.Workplane("XY").rect(w, l).extrude(0.5 * k).translate((0, 0, 0.55 * k)))
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def cheese_screw(d: float, length: float, dk: float, k: float):
    """An ISO 1207 slotted cheese head screw: a cylindrical head with a flat top and a slot."""
    import cadquery as cq

    head = _revolved([(0, 0), (dk / 2, 0), (dk / 2, k - 0.2), (dk / 2 - 0.2, k), (0, k)])
    head = head.cut(cq.Workplane("XY").rect(0.2 * dk, dk + 1).extrude(0.4 * k).translate((0, 0, 0.6 * k + 0.01)))
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def flange_bolt(d: float, length: float, s: float, k: float, dc: float, flange: float = 1.2):
    """An ISO 4162 hexagon flange bolt: a round flange of diameter ``dc`` under the hexagon."""
    import cadquery as cq

    e = s / math.cos(math.radians(30))
    head = cq.Workplane("XY").polygon(6, e).extrude(k - flange).translate((0, 0, flange))
    head = head.union(_revolved([(0, 0), (dc / 2, 0), (dc / 2, 0.4 * flange), (e / 2, flange), (0, flange)]))
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-length))


def countersunk_screw(d: float, length: float, dk: float, key: float, angle: float = 90.0):
    """An ISO 10642 countersunk screw: the seat cone from d to dk (included ``angle``), its top at
    z = 0, the length overall (head included) to z = -length."""
    import cadquery as cq

    h = (dk - d) / 2 / math.tan(math.radians(angle / 2))
    head = _revolved([(0, -h), (d / 2, -h), (dk / 2, 0), (0, 0)])
    head = head.cut(_hex_socket(key, 0.6 * h, 0.01))
    return head.union(cq.Workplane("XY").circle(d / 2).extrude(-(length - h)).translate((0, 0, -h)))


def square_nut(bore: float, s: float, m: float):
    """A DIN 557 square nut: a square prism with the bore."""
    import cadquery as cq

    return cq.Workplane("XY").rect(s, s).extrude(m).faces(">Z").workplane().hole(bore)


def chamfered_hex_nut(bore: float, s: float, m: float):
    """An ISO 4032 hex nut with both ends chamfered at 30 degrees (the corners turned off)."""
    import cadquery as cq

    e = s / math.cos(math.radians(30))
    cut = 0.95 * s / 2
    t = (e / 2 - cut) * math.tan(math.radians(30))
    body = _revolved([(0, 0), (cut, 0), (e / 2 + 0.01, t), (e / 2 + 0.01, m - t), (cut, m), (0, m)])
    return (cq.Workplane("XY").polygon(6, e).extrude(m).intersect(body)
            .faces(">Z").workplane().hole(bore))


def flange_nut(bore: float, s: float, m: float, dc: float, flange: float = 1.0):
    """An ISO 4161 hexagon nut with flange: a round flange of diameter ``dc`` under the hexagon."""
    import cadquery as cq

    e = s / math.cos(math.radians(30))
    body = cq.Workplane("XY").polygon(6, e).extrude(m - flange).translate((0, 0, flange))
    body = body.union(_revolved([(0, 0), (dc / 2, 0), (dc / 2, 0.4 * flange), (e / 2, flange), (0, flange)]))
    return body.faces(">Z").workplane().hole(bore)


def nylon_insert_nut(bore: float, s: float, h: float, collar: float = 0.25):
    """An ISO 7040 nut as libraries draw it in one body: the chamfered hexagon, and on top the
    round collar (0.9 s across) that holds the nylon ring, ``collar`` of the height ``h``."""
    import cadquery as cq

    hexagon = chamfered_hex_nut(bore, s, (1 - collar) * h)
    ring = cq.Workplane("XY").circle(0.45 * s).extrude(collar * h).translate((0, 0, (1 - collar) * h))
    return hexagon.union(ring.faces(">Z").workplane().hole(bore))


def set_screw(d: float, length: float, key: float, socket: bool = True):
    """An ISO 4026 flat-point set screw: a plain cylinder (thread not drawn), a hexagon socket
    at z = length, chamfered ends."""
    import cadquery as cq

    body = _revolved([(0, 0), (d / 2 - 0.3, 0), (d / 2, 0.3), (d / 2, length - 0.3), (d / 2 - 0.3, length), (0, length)])
    return body.cut(_hex_socket(key, 0.5 * length, length + 0.01)) if socket else body


def stud(d: float, length: float):
    """A stud (DIN 938 / DIN 976 threaded rod): a plain cylinder, both ends chamfered."""
    return _revolved([(0, 0), (d / 2 - 0.5, 0), (d / 2, 0.5), (d / 2, length - 0.5), (d / 2 - 0.5, length), (0, length)])


def _plates(a, hole: float, thickness=(10.0, 10.0), size=(40.0, 40.0), names=("upper_plate", "lower_plate"),
            csk: float | None = None):
    """Two plates stacked from z = 0 up, each with one hole at the origin (the upper one
    countersunk to ``csk`` at 90 degrees when given). Returns the top face z."""
    import cadquery as cq

    z = sum(thickness)
    top = z
    for name, t in zip(names, thickness):
        z -= t
        w = cq.Workplane("XY").box(size[0], size[1], t, centered=(True, True, False))
        if csk is not None and name == names[0]:
            w = w.faces(">Z").workplane().cskHole(hole, csk, 90.0)
        else:
            w = w.faces(">Z").workplane().hole(hole)
        a.add(w.translate((0, 0, z)), name=name)
    return top


def hardware_model(path: Path, kind: str) -> dict:
    """One fastener of `kind` in an invented plate stack, written as a STEP file at `path`;
    returns what the scan should read (head kind, size, length, ...).

    kind: "hex" (ISO 4017 M12x40 with a chamfered head and a washer face on a DIN 125 washer,
    ISO 4032 nut), "socket" (ISO 4762 M8x25 with a chamfered head and socket, tapped),
    "button" (ISO 7380 M5x12), "pan" (ISO 7045 M4x10), "cheese" (ISO 1207 M5x12),
    "flange" (ISO 4162 M8x25, nut), "countersunk" (ISO 10642 M6x20 in a countersink, tapped),
    "square nut" (ISO 4762 M6x20 with a DIN 557 nut), "flange nut" (ISO 4017 M8x30 with an ISO 4161 flange nut), "lock nut" (ISO 4017 M8x30 with an ISO 7040
    nut), "set screw" (ISO 4026 M4x6 in the tapped hole of a hub on a shaft), "set screw unnamed",
    "stud" (DIN 938 M8 into a tapped block, a plate, an ISO 4032 nut; "stud unnamed": the rod unnamed), "shell" (a socket screw
    exported as a surface body, closed), "open shell" (the same with its top face missing),
    "helical thread" (an unnamed ISO 4762 M6x12 with its thread drawn, into a tapped block).
    """
    import cadquery as cq

    a = cq.Assembly(name=f"{kind.replace(' ', '_')}_fixture")
    expect: dict = {"kind": kind}
    if kind == "hex":
        # ISO 4017 M12: s 18, k 7.5, d_w min 16.63; DIN 125 A 13: 13 / 24 / 2.5; ISO 4032 M12 m 10.8
        top = _plates(a, 13.5, (12.0, 12.0), (60.0, 60.0), ("frame_upper", "frame_lower"))
        a.add(cq.Workplane("XY").circle(12.0).circle(6.5).extrude(2.5), name="DIN 125 A 13",
              loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(hex_bolt_as_library(12.0, 40.0, 18.0, 7.5, 16.8, 0.5), name="screw ISO 4017 M12x40",
              loc=cq.Location(cq.Vector(0, 0, top + 2.5)))
        a.add(chamfered_hex_nut(12.0, 18.0, 10.8), name="ISO 4032 M12",
              loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head="hex", nominal="M12", length=40.0, washer="DIN 125 A 13", grip=26.5, bearing=24.0)
    elif kind == "socket":
        # ISO 4762 M8: dk 13, k 8, socket 6; tapped M8 (tap drill 6.8)
        a.add(cq.Workplane("XY").box(40, 40, 10, centered=(True, True, False)).faces(">Z").workplane().hole(9.0)
              .translate((0, 0, 20)), name="cover")
        a.add(cq.Workplane("XY").box(40, 40, 20, centered=(True, True, False)).faces(">Z").workplane().hole(6.8, 18.0),
              name="housing")
        a.add(socket_screw_as_library(8.0, 25.0, 13.0, 8.0, 6.0), name="DIN 912 M8x25",
              loc=cq.Location(cq.Vector(0, 0, 30)))
        expect.update(head="socket", nominal="M8", length=25.0, joint_kind="tapped")
    elif kind in ("button", "pan", "cheese"):
        d, length, hole = {"button": (5.0, 12.0, 5.5), "pan": (4.0, 10.0, 4.5), "cheese": (5.0, 12.0, 5.5)}[kind]
        top = _plates(a, hole, (3.0, 3.0), (30.0, 30.0))
        screw = {"button": lambda: button_screw(5.0, 12.0, 9.5, 2.75, 3.0),   # ISO 7380-1 M5: dk 9.5, k 2.75, s 3
                 "pan": lambda: pan_screw(4.0, 10.0, 8.0, 3.1),               # ISO 7045 M4: dk 8, k 3.1
                 "cheese": lambda: cheese_screw(5.0, 12.0, 8.5, 3.3)}[kind]() # ISO 1207 M5: dk 8.5, k 3.3
        name = {"button": "M5x12 BHCS", "pan": "ISO 7045 M4x10", "cheese": "ISO 1207 M5x12"}[kind]
        a.add(screw, name=name, loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(chamfered_hex_nut(d, {5.0: 8.0, 4.0: 7.0}[d], {5.0: 4.7, 4.0: 3.2}[d]), name=f"hex nut M{d:g}",
              loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head=kind, nominal=f"M{d:g}", length=length)
    elif kind == "flange":
        # ISO 4162 M8: s 13, k 8.1, d_c 18 (the catalogue's row)
        top = _plates(a, 9.0, (8.0, 8.0))
        a.add(flange_bolt(8.0, 25.0, 13.0, 8.1, 18.0), name="EN 1665 M8x25", loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(chamfered_hex_nut(8.0, 13.0, 6.8), name="ISO 4032 M8",
              loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head="flange", nominal="M8", length=25.0, bearing=18.0)
    elif kind == "countersunk":
        # ISO 10642 M6: dk 13.44, 90 deg; the cover countersunk to 13.44, the base tapped (tap drill 5.0)
        a.add(cq.Workplane("XY").box(40, 40, 8, centered=(True, True, False)).faces(">Z").workplane()
              .cskHole(6.6, 13.44, 90.0).translate((0, 0, 15)), name="cover")
        a.add(cq.Workplane("XY").box(40, 40, 15, centered=(True, True, False)).faces(">Z").workplane().hole(5.0, 14.0),
              name="base")
        a.add(countersunk_screw(6.0, 20.0, 13.44, 4.0), name="DIN 7991 M6x20", loc=cq.Location(cq.Vector(0, 0, 23)))
        expect.update(head="countersunk", nominal="M6", length=20.0, joint_kind="tapped", grip=8.0)
    elif kind == "square nut":
        # ISO 4762 M6: dk 10, k 6, socket 5; DIN 557 M6 square nut: s 10, m 5 (from memory), bore at the tap drill
        top = _plates(a, 6.6, (6.0, 6.0))
        a.add(socket_screw_as_library(6.0, 20.0, 10.0, 6.0, 5.0), name="ISO 4762 M6x20", loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(square_nut(5.0, 10.0, 5.0), name="square nut M6", loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head="socket", nominal="M6", length=20.0, nut_kind="square")
    elif kind == "flange nut":
        # ISO 4161 M8: s 13, m 8, d_c 17.9 (from memory), under an ISO 4017 M8x30
        top = _plates(a, 9.0, (8.0, 8.0))
        a.add(hex_bolt_as_library(8.0, 30.0, 13.0, 5.3, 11.8, 0.4), name="ISO 4017 M8x30", loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(flange_nut(8.0, 13.0, 8.0, 17.9), name="DIN 6923 M8", loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head="hex", nominal="M8", length=30.0, nut_kind="flange", nut_bearing=17.9)
    elif kind == "lock nut":
        # ISO 7040 M8: s 13, h 9.5 (from memory): a nylon-insert nut modelled as one body
        top = _plates(a, 9.0, (8.0, 8.0))
        a.add(hex_bolt_as_library(8.0, 30.0, 13.0, 5.3, 11.8, 0.4), name="ISO 4017 M8x30", loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(chamfered_hex_nut(8.0, 13.0, 9.5), name="ISO 7040 M8", loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head="hex", nominal="M8", length=30.0, nut_kind="lock")
    elif kind in ("set screw", "set screw unnamed"):
        # a hub on a shaft, held by an ISO 4026 M4x6 set screw (socket 2) in a radial tapped hole (tap drill 3.3)
        hub = cq.Workplane("XY").circle(12.0).circle(5.0).extrude(16.0).cut(
            cq.Workplane("XZ").circle(1.65).extrude(-13.0).translate((0, 0, 8.0)))
        a.add(hub, name="hub")
        a.add(cq.Workplane("XY").circle(5.0).extrude(40.0).translate((0, 0, -12.0)), name="shaft")
        name = "ISO 4026 M4x6" if kind == "set screw" else "part_17"
        a.add(set_screw(4.0, 6.0, 2.0), name=name,
              loc=cq.Location(cq.Vector(0, 5.0, 8.0), cq.Vector(1, 0, 0), -90))
        expect.update(part=name, joints=0, nominal="M4", length=6.0)
    elif kind in ("stud", "stud unnamed"):
        # DIN 938 M8x32 into a block tapped 15 deep (tap drill 6.8), a 10 mm plate, an ISO 4032 M8 nut (m 6.8)
        a.add(cq.Workplane("XY").box(40, 40, 20, centered=(True, True, False)).faces(">Z").workplane().hole(6.8, 15.0),
              name="block")
        a.add(cq.Workplane("XY").box(40, 40, 10, centered=(True, True, False)).faces(">Z").workplane().hole(9.0)
              .translate((0, 0, 20)), name="clamp_plate")
        a.add(stud(8.0, 32.0), name="stud DIN 938 M8x32" if kind == "stud" else "Part3", loc=cq.Location(cq.Vector(0, 0, 8.0)))
        a.add(chamfered_hex_nut(8.0, 13.0, 6.8), name="ISO 4032 M8", loc=cq.Location(cq.Vector(0, 0, 30.0)))
        # the nut bears at z = 30; the stud ends at z = 8, 22 mm below it
        expect.update(nominal="M8", length=22.0, joint_kind="tapped", nut="ISO 4032 M8", grip=10.0)
    elif kind == "helical thread":
        # ISO 4762 M6x12 (dk 10, k 6, socket 5; P 1) with its thread drawn, into a tapped block (tap drill 5.0)
        a.add(cq.Workplane("XY").box(30, 30, 5, centered=(True, True, False)).faces(">Z").workplane().hole(6.6)
              .translate((0, 0, 12)), name="sensor bracket")
        a.add(cq.Workplane("XY").box(30, 30, 12, centered=(True, True, False)).faces(">Z").workplane().hole(5.0, 11.0),
              name="frame block")
        a.add(threaded_socket_screw(6.0, 1.0, 12.0, 10.0, 6.0, 5.0), name="Part7", loc=cq.Location(cq.Vector(0, 0, 17)))
        expect.update(head="socket", nominal="M6", length=12.0, joint_kind="tapped")
    elif kind in ("shell", "open shell"):
        top = _plates(a, 5.5, (3.0, 3.0))
        solid = socket_screw_as_library(5.0, 12.0, 8.5, 5.0, 4.0).val()
        faces = solid.Faces()
        if kind == "open shell":
            faces = [f for f in faces if f.Center().z < 4.9]       # the top face left out
        a.add(cq.Shell.makeShell(faces), name="ISO 4762 M5x12", loc=cq.Location(cq.Vector(0, 0, top)))
        a.add(chamfered_hex_nut(5.0, 8.0, 4.7), name="ISO 4032 M5",
              loc=cq.Location(cq.Vector(0, 0, 0), cq.Vector(1, 0, 0), 180))
        expect.update(head="socket", nominal="M5", length=12.0, part="ISO 4762 M5x12")
    else:
        raise ValueError(kind)
    write_step(a, path)
    return expect


# ---------------------------------------------------------------- real-export quirks (holes and threads)
#: #10-32 UNF: basic major diameter 0.190 in (ASME B1.1, from memory); its tap drill the #21 drill,
#: 0.159 in (Machinery's Handbook tap drill table, from memory); ASME B18.2.8 normal clearance
#: 0.201 in (from memory); ASME B18.3 button head A 0.361 in, H 0.101 in (from memory)
IN = 25.4
NO10_D, NO10_TAP_DRILL, NO10_CLEARANCE = 0.190 * IN, 0.159 * IN, 0.201 * IN
NO10_BUTTON = (0.361 * IN, 0.101 * IN)


def quirk_inch_tapped_in_metres(path: Path, named: bool = True) -> dict:
    """An intake roller's 1/2 in hex shaft, 1 1/2 in long, with a #21-drill (4.04 mm) bore end to
    end, held between two 1/4 in aluminium side plates by a #10-32 x 1/2 button-head screw at each
    end, modelled at the nominal 0.190 in; written in metres with inch names, as one CAD system
    writes such a model.  ``named=False`` gives the screws names that say no size."""
    import cadquery as cq

    t_plate, length = 0.25 * IN, 1.5 * IN
    a = cq.Assembly(name="intake roller")
    shaft = (cq.Workplane("XY").polygon(6, 0.5 * IN / math.cos(math.radians(30))).extrude(length)
             .faces(">Z").workplane().hole(NO10_TAP_DRILL))
    a.add(shaft, name="hex shaft 1/2 in")
    for name, z0 in (("roller plate left", length), ("roller plate right", -t_plate)):
        a.add(plate([(0.0, 0.0)], z0, dia=NO10_CLEARANCE, size=(1.5 * IN, 1.5 * IN, t_plate)), name=name)
    screw = _socket_screw(NO10_D, 0.5 * IN, *NO10_BUTTON)
    names = ("#10-32 x 1/2 BHCS", "#10-32 x 1/2 BHCS#2") if named else ("button screw A", "button screw B")
    a.add(screw, name=names[0], loc=cq.Location(cq.Vector(0, 0, length + t_plate)))
    a.add(screw, name=names[1], loc=cq.Location(cq.Vector(0, 0, -t_plate), cq.Vector(1, 0, 0), 180))
    write_step(a, path, unit="M")
    return {"screws": names, "engagement": 0.5 * IN - t_plate}


#: a ground shaft in a 20 mm bore, a 5 mm dowel in 5 mm holes (5.0 mm is also the M6 tap drill:
#: the pin, not the diameter, decides), a PTFE tube of 4 mm outside in a 4 mm bore and a 47 mm
#: bearing seat (a 6204 bearing's outside diameter, ISO 15, from memory) beside two M6 socket
#: screws in 6.6 mm holes (ISO 273 medium, from memory) into 5.0 mm tapped holes
SHAFT_D, DOWEL_D, TUBE_D, SEAT_D = 20.0, 5.0, 4.0, 47.0
M6_SOCKET = (10.0, 6.0)          # ISO 4762 M6: dk 10, k 6 (from memory)


def quirk_bores_beside_bolts(path: Path) -> dict:
    """A pump bearing housing (invented): a 10 mm steel cover on a 20 mm housing, two M6x20 socket
    screws, a drive shaft through both, a locating dowel (a plain cylinder named by no word), a
    PTFE tube and a bearing seat with nothing in it."""
    import cadquery as cq

    a = cq.Assembly(name="bearing housing")
    screws = [(-30.0, 0.0), (30.0, 0.0)]
    cover = (cq.Workplane("XY").box(90, 60, 10, centered=(True, True, False)).translate((0, 0, 20))
             .faces(">Z").workplane().pushPoints(screws).hole(6.6)
             .faces(">Z").workplane().pushPoints([(0.0, 0.0)]).hole(SHAFT_D)
             .faces(">Z").workplane().pushPoints([(0.0, 20.0)]).hole(DOWEL_D)
             .faces(">Z").workplane().pushPoints([(15.0, -20.0)]).hole(TUBE_D))
    housing = (cq.Workplane("XY").box(90, 60, 20, centered=(True, True, False))
               .faces(">Z").workplane().pushPoints(screws).hole(5.0, 15.0)
               .faces(">Z").workplane().pushPoints([(0.0, 0.0)]).hole(SHAFT_D)
               .faces(">Z").workplane().pushPoints([(0.0, 20.0)]).hole(DOWEL_D, 12.0)
               .faces(">Z").workplane().pushPoints([(15.0, -20.0)]).hole(TUBE_D))
    a.add(cover, name="cover_steel")
    a.add(housing, name="housing_steel")
    seat_cover = (cq.Workplane("XY").box(60, 60, 8, centered=(True, True, False)).translate((0, 0, -8))
                  .faces(">Z").workplane().hole(SEAT_D))
    seat_ring = cq.Workplane("XY").box(60, 60, 8, centered=(True, True, False)).translate((0, 0, -16)) \
        .faces(">Z").workplane().hole(SEAT_D)
    a.add(seat_cover.translate((150, 0, 0)), name="seat_flange_steel")
    a.add(seat_ring.translate((150, 0, 0)), name="seat_ring_steel")
    a.add(cq.Workplane("XY").circle(SHAFT_D / 2).extrude(60).translate((0, 0, -15)), name="drive shaft")
    a.add(cq.Workplane("XY").circle(DOWEL_D / 2).extrude(16).translate((0, 20, 14)), name="locator")
    a.add(cq.Workplane("XY").circle(TUBE_D / 2).circle(1.0).extrude(50).translate((15, -20, -10)),
          name="PTFE tube 4x2")
    for i, (x, y) in enumerate(screws, 1):
        a.add(_socket_screw(6.0, 20.0, *M6_SOCKET), name=f"cap screw {i}", loc=cq.Location(cq.Vector(x, y, 30)))
    write_step(a, path)
    return {"screws": 2, "held": {"drive shaft", "locator", "PTFE tube 4x2"}, "seat": SEAT_D}


#: an M3 heat-set insert for plastics: 4.0 mm outside, 5.7 mm long (a common maker's short M3
#: insert, from memory); ISO 273 medium clearance of M3 3.4 mm; ISO 4762 M3 dk 5.5, k 3 (from memory)
INSERT_M3 = (4.0, 5.7)
M3_SOCKET = (5.5, 3.0)


def quirk_heat_set_insert(path: Path, insert_name: str = "M3 heat set insert", bore: float = 2.5,
                          screw_length: float = 8.0, host: str = "boss_PLA") -> dict:
    """A 3 mm aluminium cover on a 3-D printed PLA boss that holds an M3 heat-set insert (a
    brass sleeve, ``bore`` inside) flush with its face, an M3 socket screw through the cover
    into the insert (invented demo)."""
    import cadquery as cq

    od, length = INSERT_M3
    a = cq.Assembly(name="sensor bracket")
    a.add(cq.Workplane("XY").box(20, 20, 3, centered=(True, True, False)).translate((0, 0, 10))
          .faces(">Z").workplane().hole(3.4), name="cover_alu")
    a.add(cq.Workplane("XY").box(20, 20, 10, centered=(True, True, False)).faces(">Z").workplane().hole(od, 7.0),
          name=host)
    a.add(cq.Workplane("XY").circle(od / 2).circle(bore / 2).extrude(length).translate((0, 0, 10 - length)),
          name=insert_name)
    if screw_length:
        a.add(_socket_screw(3.0, screw_length, *M3_SOCKET), name="socket screw M3x8" if screw_length == 8 else
              f"socket screw M3x{screw_length:g}", loc=cq.Location(cq.Vector(0, 0, 13)))
    write_step(a, path)
    return {"insert": insert_name, "host": host, "engagement": screw_length - 3.0}


def quirk_thread_forming_screw(path: Path, name: str = "thread-forming screw 3x10", pilot: float = 2.4) -> dict:
    """A 2 mm steel lid screwed into a PA6 housing's boss by a screw for plastics modelled at its
    3 mm nominal, in a pilot hole of ``pilot`` (0.8 d, as design guides for such screws advise,
    from memory), blind 12 mm deep (invented demo)."""
    import cadquery as cq

    a = cq.Assembly(name="junction box")
    a.add(cq.Workplane("XY").box(20, 20, 2, centered=(True, True, False)).translate((0, 0, 15))
          .faces(">Z").workplane().hole(3.4), name="lid_steel")
    a.add(cq.Workplane("XY").box(20, 20, 15, centered=(True, True, False)).faces(">Z").workplane().hole(pilot, 12.0),
          name="housing_PA6")
    a.add(_socket_screw(3.0, 10.0, *M3_SOCKET), name=name, loc=cq.Location(cq.Vector(0, 0, 17)))
    write_step(a, path)
    return {"engagement": 8.0}


def inch_robot_model(path: Path) -> dict:
    """A robot intake's roller plate screwed to a hex shaft block by a #10-32 x 1/2 button head
    screw modelled at the nominal diameter in the block's 4.04 mm tap-drill hole (the #10-32 tap
    drill, 0.159 in), and a bracket of two 1/8 in plates held by the same screw and a #10-32 square
    nut; written in metres, with the inch designations as product names.  Returns what the scan
    should read (ASME B18.3 #10 button head A 0.361 in, H 0.101 in, socket 1/8 in; ASME B18.6.3 #10
    square machine screw nut F 3/8 in, H 1/8 in; from memory)."""
    import cadquery as cq

    inch = 25.4
    d = 0.190 * inch                         # #10 basic major diameter (ASME B1.1)
    clear = 0.201 * inch                     # #10 close-fit clearance (ASME B18.2.8, from memory)
    t = 0.125 * inch
    a = cq.Assembly(name="intake_roller")
    a.add(cq.Workplane("XY").box(25, 20, t, centered=(True, True, False)).faces(">Z").workplane().hole(clear)
          .translate((0, 0, 0.5 * inch)), name="roller plate")
    a.add(cq.Workplane("XY").box(25, 20, 0.5 * inch, centered=(True, True, False)).faces(">Z").workplane()
          .hole(0.159 * inch), name="hex shaft block")
    screw = button_screw(d, 0.5 * inch, 0.361 * inch, 0.101 * inch, 0.125 * inch)
    a.add(screw, name="#10-32 x 1/2 BHCS", loc=cq.Location(cq.Vector(0, 0, 0.5 * inch + t)))
    y = 40.0
    for name, z in (("bracket upper", t), ("bracket lower", 0.0)):
        a.add(cq.Workplane("XY").box(25, 20, t, centered=(True, True, False)).faces(">Z").workplane().hole(clear)
              .translate((0, y, z)), name=name)
    a.add(screw, name="#10-32 x 1/2 BHCS bracket", loc=cq.Location(cq.Vector(0, y, 2 * t)))
    a.add(square_nut(d, 0.375 * inch, 0.125 * inch), name="#10-32 square nut",
          loc=cq.Location(cq.Vector(0, y, 0.0), cq.Vector(1, 0, 0), 180))
    write_step(a, path, unit="M")
    return {"nominal": "#10-32 UNF", "length": 0.5 * inch, "head": "button", "nut": "#10-32 square nut"}


def quirk_slotted_clamp(path: Path) -> dict:
    """A 3 mm clamp plate with a 5.5 mm wide adjusting slot (no whole hole around the screw) held
    on a 12 mm base by an M5x10 socket screw into the base's 4.2 mm tap drill (d - P), as fixtures
    are built (invented demo; ISO 4762 M5 dk 8.5, k 5, from memory)."""
    import cadquery as cq

    a = cq.Assembly(name="fixture")
    clamp = (cq.Workplane("XY").box(40, 20, 3, centered=(True, True, False)).translate((0, 0, 12))
             .faces(">Z").workplane().slot2D(16.0, 5.5).cutThruAll())
    a.add(clamp, name="clamp_plate_steel")
    a.add(cq.Workplane("XY").box(40, 20, 12, centered=(True, True, False)).faces(">Z").workplane().hole(4.2, 10.0),
          name="base_steel")
    a.add(_socket_screw(5.0, 10.0, 8.5, 5.0), name="socket screw M5x10", loc=cq.Location(cq.Vector(0, 0, 15)))
    write_step(a, path)
    return {"clamped": "clamp_plate_steel", "thickness": 3.0}


def main() -> None:
    cases = step_cases() + job_cases()
    (HERE / "manifest.json").write_text(json.dumps(cases, indent=1) + "\n")
    print(f"{len(cases)} cases written to {HERE}")


if __name__ == "__main__":
    main()
