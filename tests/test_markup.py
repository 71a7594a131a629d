"""The marked-up model: STEP through XCAF and GLB through trimesh, read back independently.

One analysis of the sample job (samples/conveyor_drive.toml) is shared by the module.  The
STEP file is read back through OCCT's own XCAF reader (names, colours, layers, face
colours) and through cadquery's assembly importer; the GLB through trimesh and by reading
its bytes against the GLB container layout of the glTF 2.0 specification.
"""
import hashlib
import json
import math
import struct
import sys
from pathlib import Path

import numpy as np
import pytest

from geomjoint.analysis import analyze_job, cone_joint_of
from geomjoint.errors import InputError
from geomjoint.geometry.cones import cone_solids
from geomjoint.geometry.glb import TESSELLATION_FRACTION, tessellate, tessellation_tolerance, write_glb
from geomjoint.geometry.markup import has_solid, hole_face_indices, volume, write_marked_step
from geomjoint.job import load_job
from geomjoint.outputs import safe_name
from geomjoint.report.palette import CONE_ALPHA, VERDICT_COLOURS, VERDICT_RGB, hex_to_rgb
from geomjoint.scene import fails_only_at_limit, joint_node_name, layer_name, markup_scene

SAMPLES = Path(__file__).resolve().parents[1] / "samples"
VERDICTS = ("pass", "marginal", "fail")
#: a colour survives the file to 8 bits per channel (STEP stores reals; 1/255 is generous)
COLOUR_TOL = 1.0 / 255.0


def digest(path: Path) -> str:
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


# ----------------------------------------------------------------------------- readers of our own

def _name(label):
    from OCP.TDataStd import TDataStd_Name

    if label.IsNull() or not label.IsAttribute(TDataStd_Name.GetID_s()):
        return None
    attr = TDataStd_Name()
    label.FindAttribute(TDataStd_Name.GetID_s(), attr)
    return attr.Get().ToExtString()


def read_step_tree(path: Path) -> dict:
    """The XCAF tree of a STEP file as nested dicts (OCCT's reader, names/colours/layers on)."""
    from OCP.Quantity import Quantity_Color, Quantity_TOC_sRGB
    from OCP.STEPCAFControl import STEPCAFControl_Reader
    from OCP.TCollection import TCollection_ExtendedString
    from OCP.TDF import TDF_Label, TDF_LabelSequence
    from OCP.TDocStd import TDocStd_Document
    from OCP.TopAbs import TopAbs_FACE
    from OCP.TopExp import TopExp_Explorer
    from OCP.XCAFDoc import XCAFDoc_ColorGen, XCAFDoc_ColorSurf, XCAFDoc_ColorTool, XCAFDoc_DocumentTool, XCAFDoc_ShapeTool

    reader = STEPCAFControl_Reader()
    reader.SetNameMode(True)
    reader.SetColorMode(True)
    reader.SetLayerMode(True)
    assert reader.ReadFile(str(path)) == 1   # IFSelect_RetDone
    doc = TDocStd_Document(TCollection_ExtendedString("XmlOcaf"))
    assert reader.Transfer(doc)
    shapes = XCAFDoc_DocumentTool.ShapeTool_s(doc.Main())
    colours = XCAFDoc_DocumentTool.ColorTool_s(doc.Main())
    layers = XCAFDoc_DocumentTool.LayerTool_s(doc.Main())

    def srgb(label):
        for kind in (XCAFDoc_ColorSurf, XCAFDoc_ColorGen):
            col = Quantity_Color()
            if XCAFDoc_ColorTool.GetColor_s(label, kind, col):
                return col.Values(Quantity_TOC_sRGB)
        return None

    def node(comp, ref):
        out = {"name": _name(comp) or _name(ref), "assembly": XCAFDoc_ShapeTool.IsAssembly_s(ref),
               "children": [], "layers": [], "colour": srgb(ref) or srgb(comp),
               "shape": XCAFDoc_ShapeTool.GetShape_s(comp)}
        for lab in (ref, comp):
            got = layers.GetLayers(lab)
            for i in range(1, got.Length() + 1):
                out["layers"].append(got.Value(i).ToExtString())
        if out["assembly"]:
            kids = TDF_LabelSequence()
            XCAFDoc_ShapeTool.GetComponents_s(ref, kids)
            for i in range(1, kids.Length() + 1):
                c = kids.Value(i)
                r = TDF_Label()
                XCAFDoc_ShapeTool.GetReferredShape_s(c, r)
                out["children"].append(node(c, r))
        else:
            faces = []
            exp = TopExp_Explorer(XCAFDoc_ShapeTool.GetShape_s(ref), TopAbs_FACE)
            while exp.More():
                col = Quantity_Color()
                faces.append(col.Values(Quantity_TOC_sRGB)
                             if colours.GetColor(exp.Current(), XCAFDoc_ColorSurf, col) else None)
                exp.Next()
            out["face_colours"] = faces
        return out

    free = TDF_LabelSequence()
    shapes.GetFreeShapes(free)
    tops = []
    for i in range(1, free.Length() + 1):
        lab = free.Value(i)
        tops.append(node(lab, lab))
    return {"tops": tops, "doc": doc}


def child(node: dict, name: str) -> dict:
    hits = [c for c in node["children"] if c["name"] == name]
    assert len(hits) == 1, (name, [c["name"] for c in node["children"]])
    return hits[0]


def glb_json(path: Path) -> tuple[dict, bytes]:
    """The JSON and BIN chunks of a GLB, checked against the container layout.

    glTF 2.0 specification §4.4 (GLB file format): 12-byte header magic 0x46546C67
    ("glTF"), version 2, total length; chunks of (length, type, data) with type
    0x4E4F534A (JSON) first, then 0x004E4942 (BIN); chunk lengths multiples of 4.
    """
    data = Path(path).read_bytes()
    magic, version, length = struct.unpack_from("<III", data, 0)
    assert magic == 0x46546C67 and version == 2 and length == len(data)
    json_len, json_type = struct.unpack_from("<II", data, 12)
    assert json_type == 0x4E4F534A and json_len % 4 == 0
    # strict JSON (RFC 8259): no NaN / Infinity, which Python's parser would accept
    tree = json.loads(data[20:20 + json_len], parse_constant=lambda c: pytest.fail(f"non-JSON constant {c}"))
    off = 20 + json_len
    bin_len, bin_type = struct.unpack_from("<II", data, off)
    assert bin_type == 0x004E4942 and bin_len % 4 == 0 and off + 8 + bin_len == len(data)
    return tree, data[off + 8: off + 8 + bin_len]


# ----------------------------------------------------------------------------- fixtures

@pytest.fixture(scope="module")
def sample(tmp_path_factory):
    model = SAMPLES / "conveyor_bracket.step"
    job_file = SAMPLES / "conveyor_drive.toml"
    before = {p: digest(p) for p in (model, job_file)}
    analysis = analyze_job(load_job(str(job_file)))
    out = tmp_path_factory.mktemp("markup")
    scene = markup_scene(analysis)
    summary = write_marked_step(scene, out / "marked.step")
    write_glb(scene, out / "marked.glb")
    after = {p: digest(p) for p in (model, job_file)}
    return {"analysis": analysis, "summary": summary, "out": out, "before": before, "after": after,
            "step": out / "marked.step", "glb": out / "marked.glb", "model": model}


@pytest.fixture(scope="module")
def step_tree(sample):
    return read_step_tree(sample["step"])


@pytest.fixture(scope="module")
def results(sample):
    return {r.id: r for r in sample["analysis"].results}


@pytest.fixture(scope="module")
def expected_cones(sample):
    """Cone volumes computed afresh by the cone module, by joint id and (part, side)."""
    a = sample["analysis"]
    # every other joint as a neighbour: the scene's k-d-tree neighbour list must give the same solids
    cj = {mj.scan.id: cone_joint_of(mj) for mj in a.model_joints}
    out = {}
    for jid, joint in cj.items():
        out[jid] = {}
        for name, shape in cone_solids(joint, [c for k, c in cj.items() if k != jid]):
            if has_solid(shape):
                _, part, side = name.rsplit(":", 2)
                out[jid][(part, side)] = volume(shape)
    return out


# ----------------------------------------------------------------------------- palette

def _cie_lightness(rgb) -> float:
    """CIE 1976 L* of an sRGB colour (D65).

    Linearise by the sRGB transfer curve (IEC 61966-2-1:1999), Y = 0.2126 R + 0.7152 G
    + 0.0722 B (ITU-R BT.709 primaries), L* = 116 f(Y) − 16 with f(t) = t^(1/3) above
    (6/29)^3, else t/(3 (6/29)^2) + 4/29 (CIE 15:2004).
    """
    lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4 for c in rgb]
    y = 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    d = 6 / 29
    f = y ** (1 / 3) if y > d ** 3 else y / (3 * d * d) + 4 / 29
    return 116 * f - 16


def test_palette_differs_in_lightness_and_is_one_place():
    # CIE 15:2004 L*: white is 100, black 0 (identities of the formula)
    assert _cie_lightness((1, 1, 1)) == pytest.approx(100.0)
    assert _cie_lightness((0, 0, 0)) == pytest.approx(0.0)
    light = {v: _cie_lightness(VERDICT_RGB[v]) for v in VERDICTS}
    # readable without hue: pairwise lightness apart by well over a just-noticeable step
    # (ΔL* ≈ 1 is one JND, common practice); we ask for 15
    for a in VERDICTS:
        for b in VERDICTS:
            if a < b:
                assert abs(light[a] - light[b]) > 15, (a, b, light)
    assert set(VERDICT_COLOURS) == set(VERDICTS)
    assert hex_to_rgb("#ff0000") == (1.0, 0.0, 0.0)
    # the HTML report's colours are the same values (one palette)
    from geomjoint.report import plots

    assert {k: v.lower() for k, v in plots.VERDICT_COLOURS.items()} == VERDICT_COLOURS


# ----------------------------------------------------------------------------- STEP, OCCT reader

def test_input_model_untouched(sample):
    assert sample["before"] == sample["after"]
    # no stray temporary files beside the outputs
    assert sorted(p.name for p in sample["out"].iterdir()) == ["marked.glb", "marked.step"]


def test_step_top_is_one_assembly_with_parts_and_joints(sample, step_tree):
    tops = step_tree["tops"]
    assert len(tops) == 1 and tops[0]["assembly"]
    top = tops[0]
    assert top["name"] == sample["summary"].top
    assert [c["name"] for c in top["children"]] == ["parts", "joints"]


def _walk(node):
    yield node
    for c in node["children"]:
        yield from _walk(c)


def test_step_sibling_names_unique_and_safe(step_tree):
    for node in _walk(step_tree["tops"][0]):
        names = [c["name"] for c in node["children"]]
        assert len(names) == len(set(names)), names
        assert all(n == safe_name(n) for n in names)


def test_step_joint_names_agree_with_results(sample, step_tree, results):
    joints = child(step_tree["tops"][0], "joints")
    model_ids = [mj.scan.id for mj in sample["analysis"].model_joints]
    assert len(joints["children"]) == len(model_ids)
    for jid in model_ids:
        r = results[jid]
        node = child(joints, joint_node_name(r))
        words = node["name"].split(" ")
        assert words[0] == jid
        assert words[1] == f"{r.spec.fastener.designation}x{r.spec.fastener.length:g}"
        assert words[2] == r.spec.fastener.grade
        assert words[3] == r.verdict
        if fails_only_at_limit(r):
            # a joint that fails only at a tolerance limit names the quantity and its margin there
            assert words[4:6] == ["at", "limit"] and words[6] == r.stackup.governing().name
            assert float(words[7]) == pytest.approx(r.stackup.least_margin, abs=0.005)
            continue
        governing = r.governing.split(" ")
        assert words[4:4 + len(governing)] == governing
        rest = words[4 + len(governing):]
        value = r.factors.get(r.governing)
        check = next(c for c in r.checks if c.name == r.governing)
        if isinstance(check.value, (int, float)):
            assert float(rest[0]) == pytest.approx(check.value, abs=0.005)
        else:
            assert not rest, (words, value)


def test_step_colours_and_layers_by_verdict(sample, step_tree, results):
    joints = child(step_tree["tops"][0], "joints")
    seen_layers = set()
    for node in joints["children"]:
        verdict = results[node["name"].split(" ")[0]].verdict
        expected = VERDICT_RGB[verdict]
        kinds = {c["name"].split(" ")[0].split("_")[0] for c in node["children"]}
        assert {"cone", "axis", "bolt", "nut"} <= kinds, kinds
        for c in node["children"]:
            assert c["colour"] is not None, c["name"]
            assert max(abs(a - b) for a, b in zip(c["colour"], expected)) < COLOUR_TOL, (c["name"], c["colour"])
            # on its verdict's layer, and on no other verdict's
            assert layer_name(verdict) in c["layers"], (c["name"], c["layers"])
            assert not any(layer_name(v) in c["layers"] for v in VERDICTS if v != verdict)
            seen_layers.update(c["layers"])
    assert {layer_name(r.verdict) for r in results.values()
            if r.id in sample["summary"].joints} <= seen_layers


def test_step_parts_keep_names_colours_and_placements(sample, step_tree):
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps

    model = sample["analysis"].scan.model
    parts = child(step_tree["tops"][0], "parts")
    hardware = {hw.part for mj in sample["analysis"].model_joints
                for hw in [mj.scan.bolt, mj.scan.nut, *mj.scan.washers] if hw is not None}
    expected = [p for p in model.parts if p.name not in hardware]
    assert [c["name"] for c in parts["children"]] == [safe_name(p.name) for p in expected]
    for p, c in zip(expected, parts["children"]):
        # model.py reports OCCT's linear RGB: compare in sRGB
        from OCP.Quantity import Quantity_Color, Quantity_TOC_RGB, Quantity_TOC_sRGB

        want = Quantity_Color(*p.colour, Quantity_TOC_RGB).Values(Quantity_TOC_sRGB)
        assert max(abs(a - b) for a, b in zip(c["colour"], want)) < COLOUR_TOL
        # placement: the centre of mass of the written part is the model's (same kernel)
        g1, g2 = GProp_GProps(), GProp_GProps()
        BRepGProp.VolumeProperties_s(p.solid, g1)
        BRepGProp.VolumeProperties_s(c["shape"], g2)
        assert g2.Mass() == pytest.approx(g1.Mass(), rel=1e-9)
        assert g2.CentreOfMass().Distance(g1.CentreOfMass()) < 1e-6


def test_step_hole_faces_carry_their_joint_verdict(sample, step_tree, results):
    """Every verdict-coloured face of a part is a hole wall on the axis of a joint of that verdict."""
    from OCP.BRepAdaptor import BRepAdaptor_Surface
    from OCP.GeomAbs import GeomAbs_Cylinder
    from OCP.TopAbs import TopAbs_FACE
    from OCP.TopExp import TopExp_Explorer
    from OCP.TopoDS import TopoDS

    joints = {mj.scan.id: mj.scan for mj in sample["analysis"].model_joints}
    parts = child(step_tree["tops"][0], "parts")
    coloured = 0
    for c in parts["children"]:
        exp = TopExp_Explorer(c["shape"], TopAbs_FACE)
        faces = []
        while exp.More():
            faces.append(TopoDS.Face_s(exp.Current()))
            exp.Next()
        assert len(faces) == len(c["face_colours"])
        for face, col in zip(faces, c["face_colours"]):
            if col is None:
                continue
            verdict = next((v for v in VERDICTS if max(abs(a - b) for a, b in zip(col, VERDICT_RGB[v])) < COLOUR_TOL),
                           None)
            if verdict is None:
                continue
            surf = BRepAdaptor_Surface(face)
            assert surf.GetType() == GeomAbs_Cylinder
            loc = surf.Cylinder().Axis().Location()
            # which joint's axis is this? (axes along z in the sample: compare x, y)
            owners = [jid for jid, j in joints.items()
                      if math.hypot(loc.X() - j.point[0], loc.Y() - j.point[1]) < 2.0]
            assert owners and all(results[o].verdict == verdict for o in owners), (c["name"], owners, verdict)
            coloured += 1
    # each part layer of each joint has at least its bore coloured
    member_layers = sum(1 for j in joints.values() for l in j.layers if l.role != "washer")
    assert coloured >= member_layers


# ----------------------------------------------------------------------------- STEP, cadquery importer

def test_step_cadquery_import_names_and_cone_volumes(sample, results, expected_cones):
    import cadquery as cq

    assy = cq.Assembly.importStep(str(sample["step"]))   # cadquery 2.8: raises on duplicate sibling names
    assert assy.name == sample["summary"].top
    assert [c.name for c in assy.children] == ["parts", "joints"]
    joints = next(c for c in assy.children if c.name == "joints")
    found = 0
    for node in joints.children:
        jid = node.name.split(" ")[0]
        assert node.name.split(" ")[3] == results[jid].verdict
        cones = {c.name: c for c in node.children if c.name.startswith("cone ")}
        want = expected_cones[jid]
        assert len(cones) == len(want)
        for (part, side), vol in want.items():
            got = cones[safe_name(f"cone {part} {side}")]
            shape = got.obj.moved(got.loc) if got.obj is not None else None
            assert shape is not None
            assert shape.Volume() == pytest.approx(vol, rel=1e-6)
            # translucent in the file too (STEP surface transparency, read by cadquery as alpha)
            assert got.color is not None and got.color.toTuple()[3] == pytest.approx(CONE_ALPHA, abs=1e-3)
            found += 1
    assert found > 0
    # the summary's volumes are those of the file too
    assert len(sample["summary"].cones) == found


# ----------------------------------------------------------------------------- GLB

def test_glb_container_and_node_extras(sample, results):
    tree, binary = glb_json(sample["glb"])
    # every accessor's bytes lie inside its buffer view, every view inside the buffer (glTF 2.0 §3.6)
    assert tree["buffers"][0]["byteLength"] <= len(binary)
    for view in tree["bufferViews"]:
        assert view.get("byteOffset", 0) + view["byteLength"] <= tree["buffers"][0]["byteLength"]
    sizes = {"SCALAR": 1, "VEC3": 3, "VEC4": 4}
    comp = {5123: 2, 5125: 4, 5126: 4}
    for acc in tree["accessors"]:
        view = tree["bufferViews"][acc["bufferView"]]
        need = acc.get("byteOffset", 0) + acc["count"] * sizes[acc["type"]] * comp[acc["componentType"]]
        assert need <= view["byteLength"]
    ids = [mj.scan.id for mj in sample["analysis"].model_joints]
    with_extras = {n["name"]: n["extras"] for n in tree["nodes"] if "extras" in n and n["name"] in ids}
    assert sorted(with_extras) == sorted(ids)
    for jid, ex in with_extras.items():
        r = results[jid]
        assert ex["verdict"] == r.verdict and ex["governing"] == r.governing
        assert ex["fastener"]["designation"] == r.spec.fastener.designation
        assert ex["fastener"]["grade"] == r.spec.fastener.grade
        assert set(ex["factors"]) == set(r.factors)


def test_glb_loads_with_trimesh_and_colours_agree(sample, results):
    import trimesh

    scene = trimesh.load(str(sample["glb"]))
    graph = scene.graph
    ids = [mj.scan.id for mj in sample["analysis"].model_joints]
    edge = graph.transforms.edge_data
    joint_nodes = {b: d.get("metadata") for (a, b), d in edge.items()
                   if a == graph.base_frame and b != "parts"}
    assert sorted(joint_nodes) == sorted(ids)
    for jid, meta in joint_nodes.items():
        assert meta["verdict"] == results[jid].verdict
        kids = [b for (a, b) in edge if a == jid]
        assert kids and all(k.startswith(f"{jid} ") for k in kids)
        for k in kids:
            mesh = scene.geometry[graph.transforms.node_data[k]["geometry"]]
            rgba = np.asarray(mesh.visual.material.baseColorFactor, float) / 255.0
            lin = [c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4
                   for c in VERDICT_RGB[results[jid].verdict]]   # IEC 61966-2-1: glTF base colour is linear
            assert np.allclose(rgba[:3], lin, atol=1.5 / 255), (k, rgba, lin)
            if " cone " in k:
                assert rgba[3] == pytest.approx(CONE_ALPHA, abs=1 / 255) and rgba[3] < 1.0
            else:
                assert rgba[3] == pytest.approx(1.0)


def test_tessellation_tolerance_from_model_size_and_closed_meshes(sample):
    import trimesh

    scene = markup_scene(sample["analysis"])
    tol = tessellation_tolerance(scene.diagonal)
    assert tol == pytest.approx(TESSELLATION_FRACTION * scene.diagonal)
    # the sample is 120 x 80 mm in plan, at least 30 mm tall: its diagonal exceeds 144 mm
    assert scene.diagonal > math.hypot(120, 80)
    # a tessellated part is a closed surface whose volume approaches the B-rep volume
    part = scene.parts[0]
    v, f = tessellate(part.shape, tol)
    mesh = trimesh.Trimesh(v, f, process=True)
    assert mesh.is_watertight
    assert mesh.volume == pytest.approx(volume(part.shape), rel=1e-3)


# ----------------------------------------------------------------------------- generated hardware

GENERATED_JOB = """
title = "Pump skid cover plate (demo)"
model = "{model}"

[materials]
"*" = "steel"

[defaults]
fastener = "M10"
grade = "8.8"
preload = "75%"

[[load]]
joints = "*"
axial = {{ min = "0 kN", max = "4 kN" }}
"""


@pytest.fixture(scope="module")
def plain_model(tmp_path_factory):
    """Two steel plates with two 11 mm holes, no hardware; a part name that needs cleaning."""
    import cadquery as cq

    sys.path.insert(0, str(SAMPLES))
    import make_samples as ms

    folder = tmp_path_factory.mktemp("plain")
    pts = [(-30, 0), (30, 0)]
    a = cq.Assembly(name="cover")
    a.add(ms.plate(100, 40, 10, pts, 11.0), name="base plate (steel) ..v2", color=ms.STEEL)
    a.add(ms.plate(100, 40, 8, pts, 11.0, z0=10.0), name="cover_plate:steel_part", color=ms.ALU)
    model = folder / "plain.step"
    ms.write_step(a, str(model))
    job = folder / "plain.toml"
    job.write_text(GENERATED_JOB.format(model=model.name))
    analysis = analyze_job(load_job(str(job)))
    summary = write_marked_step(markup_scene(analysis), folder / "out.step")
    return {"analysis": analysis, "summary": summary, "path": folder / "out.step", "model": model}


def test_generated_hardware_from_catalog(plain_model):
    from geomjoint import catalog

    a, summary = plain_model["analysis"], plain_model["summary"]
    ids = [mj.scan.id for mj in a.model_joints]
    assert len(ids) == 2
    tree = read_step_tree(plain_model["path"])
    top = tree["tops"][0]
    parts = child(top, "parts")
    assert sorted(c["name"] for c in parts["children"]) == sorted(
        [safe_name("base plate (steel) ..v2"), "cover_plate_steel_part_"])
    # cadquery's importer keeps both parts as leaves of "parts" (no "_part" ending swallowed)
    import cadquery as cq

    assy = cq.Assembly.importStep(str(plain_model["path"]))
    cq_parts = next(c for c in assy.children if c.name == "parts")
    assert sorted(c.name for c in cq_parts.children) == sorted(c["name"] for c in parts["children"])
    joints = child(top, "joints")
    t = catalog.thread("M10")
    head, nut = catalog.head(t, "hex"), catalog.nut(t)
    results = {r.id: r for r in a.results}
    for node in joints["children"]:
        jid = node["name"].split(" ")[0]
        spec = results[jid].spec
        L = spec.fastener.length
        bolt = child(node, safe_name(f"bolt M10x{L:g} (catalog)"))
        nut_node = child(node, safe_name("nut M10 (catalog)"))
        # hexagon of across-flats s has area (√3/2) s² (geometry identity); cylinder π d² / 4 · L
        hex_area = math.sqrt(3) / 2
        want_bolt = hex_area * head.width ** 2 * head.height + math.pi / 4 * spec.fastener.d ** 2 * L
        want_nut = (hex_area * nut.width ** 2 - math.pi / 4 * spec.fastener.d ** 2) * nut.height
        assert volume(bolt["shape"]) == pytest.approx(want_bolt, rel=1e-9)
        assert volume(nut_node["shape"]) == pytest.approx(want_nut, rel=1e-9)
        assert f"{jid}/{bolt['name']}" in summary.generated
    assert len(summary.generated) == 2 * len(ids)


def test_every_verdict_gets_its_colour_layer_and_name(plain_model, tmp_path):
    """Force one joint marginal and one fail: each lands on its own layer with its own colour."""
    from dataclasses import replace as dc_replace

    from geomjoint.analysis import Analysis

    a = plain_model["analysis"]
    ids = [mj.scan.id for mj in a.model_joints]
    forced = {ids[0]: "marginal", ids[1]: "fail"}
    results = [dc_replace(r, verdict=forced[r.id]) if r.id in forced else r for r in a.results]
    summary = write_marked_step(markup_scene(Analysis(results, a.scan, a.model_joints)), tmp_path / "v.step")
    joints = child(read_step_tree(tmp_path / "v.step")["tops"][0], "joints")
    for node in joints["children"]:
        verdict = forced[node["name"].split(" ")[0]]
        assert node["name"].split(" ")[3] == verdict
        for c in node["children"]:
            assert layer_name(verdict) in c["layers"]
            assert max(abs(x - y) for x, y in zip(c["colour"], VERDICT_RGB[verdict])) < COLOUR_TOL
    assert sorted(summary.layers) == sorted(layer_name(v) for v in forced.values())


def test_refuses_to_overwrite_the_input_model(plain_model):
    model = plain_model["model"]
    before = digest(model)
    with pytest.raises(InputError):
        write_marked_step(markup_scene(plain_model["analysis"]), model)
    with pytest.raises(InputError):
        write_glb(markup_scene(plain_model["analysis"]), model)
    assert digest(model) == before


def test_node_names():
    from geomjoint.geometry.markup import node_name

    assert node_name("a/../b\x00c") == safe_name("a/../b\x00c")
    assert "/" not in node_name("../../etc/passwd") and ".." not in node_name("../../etc/passwd")
    assert node_name("bracket_part") == "bracket_part_"
    long = node_name("x" * 300 + "_part")
    assert len(long) <= 80 and not long.endswith("_part")


def test_step_writer_keeps_stdout_clean(plain_model, tmp_path, capfd):
    """`check --json` promises JSON alone on stdout: the kernel's transfer statistics must not leak."""
    capfd.readouterr()
    write_marked_step(markup_scene(plain_model["analysis"]), tmp_path / "quiet.step")
    out, _ = capfd.readouterr()
    assert out == ""
    assert (tmp_path / "quiet.step").read_bytes().startswith(b"ISO-10303-21")


def test_shared_scene_gives_the_same_files(plain_model, tmp_path):
    scene = markup_scene(plain_model["analysis"])
    s1 = write_marked_step(scene, tmp_path / "a.step")
    write_glb(scene, tmp_path / "a.glb")
    assert s1.joints == plain_model["summary"].joints and s1.cones == pytest.approx(plain_model["summary"].cones)
    tree, _ = glb_json(tmp_path / "a.glb")
    assert sorted(n["name"] for n in tree["nodes"] if "extras" in n and n["name"] != "parts") == sorted(s1.joints)


def test_crash_mid_write_leaves_no_file(plain_model, tmp_path, monkeypatch):
    import geomjoint.outputs as outputs

    def boom(src, dst):
        raise OSError("disk full (simulated)")

    monkeypatch.setattr(outputs.os, "replace", boom)
    target = tmp_path / "marked.step"
    with pytest.raises(OSError):
        write_marked_step(markup_scene(plain_model["analysis"]), target)
    assert list(tmp_path.iterdir()) == []


def test_hole_face_finder_on_a_plate():
    """A 10 mm plate with one Ø11 hole: exactly one cylinder face is the hole wall."""
    import cadquery as cq

    plate = cq.Workplane("XY").box(40, 40, 10, centered=(True, True, False)).faces(">Z").workplane().hole(11.0)
    solid = plate.val().wrapped
    got = hole_face_indices(solid, (0, 0, 0), (0, 0, 1), 0.0, 10.0, 5.5)
    assert len(got) == 1
    # off the axis or too small a radius bound: nothing
    assert hole_face_indices(solid, (1.0, 0, 0), (0, 0, 1), 0.0, 10.0, 5.5) == []
    assert hole_face_indices(solid, (0, 0, 0), (0, 0, 1), 0.0, 10.0, 4.0) == []
