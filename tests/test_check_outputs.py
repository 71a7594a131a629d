"""Every output of a whole check of a small machine bed (modelled bolts, nuts and washers placed
as instances of one definition each): the outputs lose nothing against rendering each piece on
its own, and a parallel run (--workers 2) writes the same files as a serial one."""
from __future__ import annotations

import json
import re
import struct
import sys
from pathlib import Path

import numpy as np
import pytest

sys.path.insert(0, str(Path(__file__).resolve().parent / "benchmarks"))

from check_large import JOB, frame  # noqa: E402  (the benchmark's bed: one builder for both)

from geomjoint.checkrun import run_check  # noqa: E402


@pytest.fixture(scope="module")
def bed(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("bed")
    model = tmp / "bed.step"
    frame(6).export(str(model))
    job = tmp / "bed.toml"
    job.write_text(JOB.format(model=model.as_posix()), encoding="utf-8")
    return job


def glb_tree(data: bytes) -> dict:
    # glTF 2.0 §4.4: 12-byte header, then the JSON chunk (length, type 0x4E4F534A, data)
    json_len, json_type = struct.unpack_from("<II", data, 12)
    assert json_type == 0x4E4F534A
    return json.loads(data[20:20 + json_len])


def test_parallel_run_writes_the_same_outputs(bed):
    serial = run_check(bed, workers=1)
    parallel = run_check(bed, workers=2)
    assert sorted(serial.files) == sorted(parallel.files)
    assert sorted(serial.files) == sorted(["results.json", "report.txt", "report.html", "bed-checked.step",
                                           "bed-checked.glb"])
    for name in ("results.json", "report.txt", "report.html"):
        assert serial.files[name] == parallel.files[name], name
    # the STEP file written by the forked process holds what the serial one holds: the same
    # entities of each type (ISO 10303-21 instances "#n = TYPE(...)") and the same names; the
    # writer's own numbering and the FILE_NAME time stamp may differ between processes
    def content(data: bytes) -> tuple[list, list]:
        text = re.sub(r"\n\s*", "", data.decode("utf-8", "replace"))   # the writer's line breaks
        types = sorted(re.findall(r"#\d+\s*=\s*([A-Z_0-9]+)\(", text))
        names = sorted(re.findall(r"(?:PRODUCT|NEXT_ASSEMBLY_USAGE_OCCURRENCE)\('[^']*','([^']*)'", text))
        return types, names

    assert content(serial.files["bed-checked.step"]) == content(parallel.files["bed-checked.step"])
    a, b = glb_tree(serial.files["bed-checked.glb"]), glb_tree(parallel.files["bed-checked.glb"])
    assert a["nodes"] == b["nodes"] and len(a["meshes"]) == len(b["meshes"])
    # the same results render the same page (drawing ids come from the joint's place, not a counter)
    assert run_check(bed, workers=1, outputs=frozenset({"html"})).files["report.html"] == serial.files["report.html"]


def test_glb_instances_show_each_piece_as_tessellated_alone(bed):
    import trimesh

    from geomjoint.analysis import analyze_job
    from geomjoint.geometry.glb import build_scene, tessellate, tessellation_tolerance
    from geomjoint.geometry.markup import srgb_to_linear
    from geomjoint.scene import markup_scene
    from geomjoint.job import load_job

    analysis = analyze_job(load_job(bed), workers=1)
    data = markup_scene(analysis)
    scene = build_scene(data)
    tol = tessellation_tolerance(data.diagonal)
    graph = scene.graph
    items = [(item.name, item, None) for item in data.parts]
    items += [(f"{jm.id} {item.name}", item, jm) for jm in data.joints for item in jm.items]
    for node, item, jm in items:
        matrix, geom = graph.get(node)
        mesh = scene.geometry[geom]
        world = trimesh.transformations.transform_points(mesh.vertices, matrix)
        # the piece tessellated alone, in model coordinates (what each node held before sharing)
        v, f = tessellate(item.shape, tol)
        assert len(mesh.faces) == len(f), node
        assert np.allclose(world.min(axis=0), v.min(axis=0), atol=1e-6), node
        assert np.allclose(world.max(axis=0), v.max(axis=0), atol=1e-6), node
        alone = trimesh.Trimesh(v, f, process=False)
        placed = trimesh.Trimesh(world, mesh.faces, process=False)
        assert placed.volume == pytest.approx(alone.volume, rel=1e-9, abs=1e-9), node
        rgba = np.asarray(mesh.visual.material.baseColorFactor, float) / 255.0
        assert np.allclose(rgba, [*srgb_to_linear(item.rgb), item.alpha], atol=1.5 / 255), node
        assert mesh.metadata["kind"] == item.kind
    # every joint keeps its results as extras, and the hardware is shared: one mesh per
    # definition and verdict instead of one per node
    exported = glb_tree(trimesh.exchange.gltf.export_glb(scene))
    extras = {n["name"]: n.get("extras") for n in exported["nodes"]}
    for jm in data.joints:
        assert extras[jm.id] == json.loads(json.dumps(jm.extras))
    verdicts = {jm.verdict for jm in data.joints}
    kinds = {}
    for jm in data.joints:
        for item in jm.items:
            kinds.setdefault(item.kind, set()).add(graph.get(f"{jm.id} {item.name}")[1])
    for kind in ("bolt", "nut", "washer", "axis"):
        assert 1 <= len(kinds[kind]) <= len(verdicts), kind
    # the axis markers: one definition placed on each joint's axis, 0.15 d across, past the
    # head and the nut (markup.AXIS_DIAMETER_RATIO, AXIS_OVERHANG_RATIO)
    from OCP.Bnd import Bnd_Box
    from OCP.BRepBndLib import BRepBndLib
    from OCP.TopLoc import TopLoc_Location

    axes = [(jm, item) for jm in data.joints for item in jm.items if item.kind == "axis"]
    assert len(axes) == len(data.joints)
    assert len({hash(item.shape.Located(TopLoc_Location())) for _, item in axes}) == 1
    points = {j.id: j.point for j in analysis.scan.joints}
    for jm, item in axes:
        box = Bnd_Box()
        BRepBndLib.AddOptimal_s(item.shape, box, False, False)      # tight, without tolerances
        x0, y0, z0, x1, y1, z1 = box.Get()
        px, py, _ = points[jm.id]
        assert ((x0 + x1) / 2, (y0 + y1) / 2) == pytest.approx((px, py), abs=1e-6), jm.id
        assert x1 - x0 == pytest.approx(0.15 * jm.fastener["d"], rel=1e-3), jm.id
    assert len(exported["meshes"]) < len([n for n in exported["nodes"] if "mesh" in n])


def test_delabella_mesh_of_a_plate_with_holes_matches_the_default_algorithm(bed):
    """The GLB's meshes (Delabella) hold what OCCT's default algorithm (Watson) gives: the same
    boundary points, a closed surface, the B-rep volume."""
    import trimesh
    from OCP.BRepBuilderAPI import BRepBuilderAPI_Copy
    from OCP.BRep import BRep_Tool
    from OCP.BRepMesh import BRepMesh_IncrementalMesh
    from OCP.TopLoc import TopLoc_Location

    from geomjoint.geometry import topology

    from geomjoint.geometry.glb import TESSELLATION_ANGLE, tessellate
    from geomjoint.geometry.markup import volume
    from geomjoint.geometry.model import load_model

    model = load_model(str(bed.with_name("bed.step")))
    plate = model.part("lower_plate_steel").solid
    tol = 0.05
    v, f = tessellate(plate, tol)
    other = BRepBuilderAPI_Copy(plate).Shape()
    BRepMesh_IncrementalMesh(other, tol, False, TESSELLATION_ANGLE, True)   # Watson
    nodes, triangles = [], 0
    for face in topology.faces(other):
        poly = BRep_Tool.Triangulation_s(face, TopLoc_Location())
        nodes += [(p.X(), p.Y(), p.Z()) for p in (poly.Node(i) for i in range(1, poly.NbNodes() + 1))]
        triangles += poly.NbTriangles()
    assert (len(v), len(f)) == (len(nodes), triangles)
    assert np.allclose(np.unique(np.round(v, 6), axis=0), np.unique(np.round(nodes, 6), axis=0))
    mesh = trimesh.Trimesh(v, f, process=True)
    assert mesh.is_watertight
    assert mesh.volume == pytest.approx(volume(plate), rel=1e-3)


def test_cone_regions_from_the_face_tree_equal_the_face_by_face_search(bed, monkeypatch):
    """The tree of face boxes (sections.SectionCache.faces_near) only narrows the search: every
    joint's cone gets the same regions and the same stiffness to the last bit."""
    from geomjoint.analysis import analyze_job
    from geomjoint.geometry import sections
    from geomjoint.job import load_job

    def cones(limit: int) -> dict:
        monkeypatch.setattr(sections, "_FACES_WITHOUT_INDEX", limit)
        return {r.id: (r.cone, r.member_stiffness) for r in analyze_job(load_job(bed), workers=1).results}

    with_tree, face_by_face = cones(0), cones(10 ** 9)
    assert with_tree == face_by_face
    assert len(with_tree) == 6 and all(cone.stiffness > 0 for cone, _ in with_tree.values())


@pytest.fixture(scope="module")
def bed16(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("bed16")
    model = tmp / "bed16.step"
    frame(16).export(str(model))
    job = tmp / "bed16.toml"
    job.write_text(JOB.format(model=model.as_posix()), encoding="utf-8")
    return job


def test_alike_joints_share_one_cone_integration_and_get_what_their_own_gives(bed16, monkeypatch):
    """Joints alike in their own frames (same layers, neighbours and local sections: the four
    inner bolts of a 4 x 4 bed) are integrated once (cones._likeness); each gets what
    integrating it on its own gives."""
    from geomjoint.analysis import analyze_job
    from geomjoint.geometry import cones
    from geomjoint.job import load_job

    shared = analyze_job(load_job(bed16), workers=1)
    assert len(shared.results) == 16
    # corners, edges and the inner four: at most 9 classes of alike joints in a 4 x 4 grid
    assert 1 <= len(shared.cone_cache.results) <= 9
    monkeypatch.setattr(cones, "_likeness", lambda *args: None)
    alone = analyze_job(load_job(bed16), workers=1)
    assert not alone.cone_cache.results
    by_id = {r.id: r for r in alone.results}
    for r in shared.results:
        a, b = r.cone, by_id[r.id].cone
        for name in ("stiffness", "ideal_stiffness", "area_fraction_mid_grip", "lost_to_edges",
                     "lost_to_neighbours"):
            assert getattr(a, name) == pytest.approx(getattr(b, name), rel=1e-9, abs=1e-12), (r.id, name)
        assert a.neighbours == b.neighbours
        assert a.layer_areas == pytest.approx(b.layer_areas, rel=1e-9)
        assert a.layer_ideal_areas == pytest.approx(b.layer_ideal_areas, rel=1e-9)
        assert r.member_stiffness == pytest.approx(by_id[r.id].member_stiffness, rel=1e-9)
