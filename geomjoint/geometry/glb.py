"""The marked-up model as a binary glTF (GLB) for web and game-engine viewers, via trimesh.

The scene is the one of :func:`geomjoint.scene.markup_scene` (plain records of
:mod:`geomjoint.geometry.markup`):

    world
      parts                      one mesh node per model part (its own colour)
      J01                        one node per model joint, named by its id; its glTF
        J01 cone <part> head     ``extras`` hold the key results (verdict, governing
        J01 axis                 check and factor, all factors, fastener); children are
        J01 bolt_M10x45_1 ...    the cones (translucent), the axis and the hardware,
                                 coloured by verdict

glTF node names are unique in the file, so a joint's children carry the joint id in
front.  Shapes are tessellated by OCCT (BRepMesh_IncrementalMesh) with a linear
deflection of TESSELLATION_FRACTION of the model's bounding-box diagonal, so a big
frame and a small bracket get the same look.  Colours are written as glTF PBR base
colours, which glTF defines in linear RGB (the palette is sRGB and is converted).
"""
from __future__ import annotations

from pathlib import Path

import numpy as np
from OCP.BRep import BRep_Tool
from OCP.BRepMesh import BRepMesh_IncrementalMesh
from OCP.TopAbs import TopAbs_REVERSED
from OCP.TopLoc import TopLoc_Location
from OCP.TopoDS import TopoDS_Shape

from geomjoint.geometry import topology
from geomjoint.geometry.markup import MarkupItem, MarkupScene, input_paths, srgb_to_linear

#: linear deflection of the tessellation as a fraction of the model's bounding-box diagonal
TESSELLATION_FRACTION = 1e-3
#: angular deflection of the tessellation, rad (about 17°: round holes look round)
TESSELLATION_ANGLE = 0.3
#: smallest linear deflection, mm (a tiny model must not explode the triangle count)
MIN_DEFLECTION = 1e-3
#: PBR look of every surface (dull metal-ish plastic: readable colours, no mirror effects)
METALLIC = 0.1
ROUGHNESS = 0.7


def tessellation_tolerance(diagonal: float) -> float:
    """Linear deflection for a model of bounding-box diagonal ``diagonal`` mm, in mm."""
    return max(TESSELLATION_FRACTION * diagonal, MIN_DEFLECTION)


def tessellate(shape: TopoDS_Shape, deflection: float,
               angle: float = TESSELLATION_ANGLE) -> tuple[np.ndarray, np.ndarray]:
    """Triangles of a located shape: (vertices (n, 3) mm in model coordinates, faces (m, 3)).

    Faces with reversed orientation have their triangles flipped, so normals point out.
    """
    BRepMesh_IncrementalMesh(shape, float(deflection), False, float(angle), True)
    verts: list[np.ndarray] = []
    tris: list[np.ndarray] = []
    offset = 0
    for face in topology.faces(shape):
        loc = TopLoc_Location()
        poly = BRep_Tool.Triangulation_s(face, loc)
        if poly is None:
            continue
        trsf = loc.Transformation()
        n = poly.NbNodes()
        pts = np.empty((n, 3))
        for i in range(1, n + 1):
            p = poly.Node(i).Transformed(trsf)
            pts[i - 1] = (p.X(), p.Y(), p.Z())
        m = poly.NbTriangles()
        idx = np.empty((m, 3), dtype=np.int64)
        for i in range(1, m + 1):
            idx[i - 1] = poly.Triangle(i).Get()
        idx -= 1
        if face.Orientation() == TopAbs_REVERSED:
            idx = idx[:, ::-1]
        verts.append(pts)
        tris.append(idx + offset)
        offset += n
    if not verts:
        return np.zeros((0, 3)), np.zeros((0, 3), dtype=np.int64)
    return np.vstack(verts), np.vstack(tris)


def _mesh(item: MarkupItem, deflection: float):
    import trimesh
    from trimesh.visual.material import PBRMaterial

    vertices, faces = tessellate(item.shape, deflection)
    if len(faces) == 0:
        return None
    linear = srgb_to_linear(item.rgb)
    material = PBRMaterial(name=item.name, baseColorFactor=[*linear, float(item.alpha)],
                           metallicFactor=METALLIC, roughnessFactor=ROUGHNESS,
                           alphaMode="BLEND" if item.alpha < 1.0 else "OPAQUE", doubleSided=item.alpha < 1.0)
    mesh = trimesh.Trimesh(vertices=vertices, faces=faces, process=False)
    mesh.visual = trimesh.visual.TextureVisuals(material=material)
    mesh.metadata["kind"] = item.kind
    return mesh


def build_scene(scene_data: MarkupScene):
    """The trimesh Scene of the marked-up model (joint nodes carry their results as metadata)."""
    import trimesh

    deflection = tessellation_tolerance(scene_data.diagonal)
    scene = trimesh.Scene()
    base = scene.graph.base_frame
    eye = np.eye(4)
    scene.graph.update(frame_from=base, frame_to="parts", matrix=eye, metadata={"kind": "parts"})
    for item in scene_data.parts:
        mesh = _mesh(item, deflection)
        if mesh is not None:
            scene.add_geometry(mesh, node_name=item.name, geom_name=item.name, parent_node_name="parts")
    for jm in scene_data.joints:
        # edge metadata is what trimesh writes as the node's glTF extras
        scene.graph.update(frame_from=base, frame_to=jm.id, matrix=eye, metadata=jm.extras)
        for item in jm.items:
            mesh = _mesh(item, deflection)
            if mesh is None:
                continue
            name = f"{jm.id} {item.name}"
            scene.add_geometry(mesh, node_name=name, geom_name=name, parent_node_name=jm.id)
    scene.metadata["geomjoint"] = {"title": scene_data.title, "tessellation_mm": deflection,
                                   "joints": [jm.id for jm in scene_data.joints]}
    return scene


def write_glb(scene: MarkupScene, path: Path) -> None:
    """Write the marked-up ``scene`` (geomjoint.scene.markup_scene) as GLB at ``path``.

    Written to a temporary name in the same folder and renamed (no half file under
    ``path``); refuses to replace the input model.
    """
    from trimesh.exchange.gltf import export_glb

    from geomjoint.outputs import write_atomic

    write_atomic(Path(path), export_glb(build_scene(scene)), protect=input_paths(scene))
