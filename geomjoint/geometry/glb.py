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
front.  Each distinct shape definition is tessellated once per colour and its mesh shared by
every node that places it (the node's matrix is the placement), so a model of hundreds of
identical bolts holds one bolt mesh per verdict.  Shapes are tessellated by OCCT (BRepMesh_IncrementalMesh) with a linear
deflection of TESSELLATION_FRACTION of the model's bounding-box diagonal, so a big
frame and a small bracket get the same look.  Faces are triangulated by OCCT's Delabella
algorithm (the same boundary points and triangle count as the default Watson algorithm,
but a plate face with hundreds of holes takes a tenth of the time: the default one's cost
grows faster than the number of holes); a face Delabella leaves without triangles is
meshed again by Watson.  Colours are written as glTF PBR base
colours, which glTF defines in linear RGB (the palette is sRGB and is converted).
"""
from __future__ import annotations

from pathlib import Path

import numpy as np
from OCP.BRep import BRep_Tool
from OCP.BRepMesh import BRepMesh_IncrementalMesh
from OCP.IMeshTools import IMeshTools_MeshAlgoType, IMeshTools_Parameters
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


def _mesh_parameters(deflection: float, angle: float, algorithm) -> IMeshTools_Parameters:
    """BRepMesh's parameters as BRepMesh_IncrementalMesh(shape, deflection, False, angle, True)
    sets them, with the face triangulation ``algorithm``."""
    params = IMeshTools_Parameters()
    params.Deflection, params.Angle = float(deflection), float(angle)
    params.Relative, params.InParallel = False, True
    params.MeshAlgo = algorithm
    return params


def mesh_shape(shape: TopoDS_Shape, deflection: float, angle: float = TESSELLATION_ANGLE) -> None:
    """Triangulate every face of ``shape`` (kept on the shape, so later calls reuse it).

    Delabella first; any face it leaves without triangles is meshed by Watson (OCCT's default).
    """
    BRepMesh_IncrementalMesh(shape, _mesh_parameters(deflection, angle,
                                                     IMeshTools_MeshAlgoType.IMeshTools_MeshAlgoType_Delabella))
    for face in topology.faces(shape):
        if BRep_Tool.Triangulation_s(face, TopLoc_Location()) is None:
            BRepMesh_IncrementalMesh(face, _mesh_parameters(deflection, angle,
                                                            IMeshTools_MeshAlgoType.IMeshTools_MeshAlgoType_Watson))


def tessellate(shape: TopoDS_Shape, deflection: float,
               angle: float = TESSELLATION_ANGLE) -> tuple[np.ndarray, np.ndarray]:
    """Triangles of a located shape: (vertices (n, 3) mm in model coordinates, faces (m, 3)).

    Faces with reversed orientation have their triangles flipped, so normals point out.
    """
    mesh_shape(shape, deflection, angle)
    verts: list[np.ndarray] = []
    tris: list[np.ndarray] = []
    offset = 0
    for face in topology.faces(shape):
        loc = TopLoc_Location()
        poly = BRep_Tool.Triangulation_s(face, loc)
        if poly is None:
            continue
        n = poly.NbNodes()
        nodes = [poly.Node(i) for i in range(1, n + 1)]
        if not loc.IsIdentity():
            trsf = loc.Transformation()
            nodes = [p.Transformed(trsf) for p in nodes]
        pts = np.array([(p.X(), p.Y(), p.Z()) for p in nodes], dtype=float).reshape(-1, 3)
        m = poly.NbTriangles()
        idx = np.array([poly.Triangle(i).Get() for i in range(1, m + 1)], dtype=np.int64).reshape(-1, 3) - 1
        if face.Orientation() == TopAbs_REVERSED:
            idx = idx[:, ::-1]
        verts.append(pts)
        tris.append(idx + offset)
        offset += n
    if not verts:
        return np.zeros((0, 3)), np.zeros((0, 3), dtype=np.int64)
    return np.vstack(verts), np.vstack(tris)


def _placement(shape: TopoDS_Shape) -> np.ndarray:
    """The 4 x 4 matrix of a shape's location (model coordinates of its definition's points)."""
    trsf = shape.Location().Transformation()
    m = np.eye(4)
    for i in range(3):
        for j in range(4):
            m[i, j] = trsf.Value(i + 1, j + 1)
    return m


class _MeshLibrary:
    """One glTF mesh per distinct (shape definition, colour, opacity, kind), shared by the nodes.

    The model's hardware is placed instances of a few definitions, and identical cone pieces
    share one solid (:func:`geomjoint.geometry.cones.cone_solids`): each definition is
    tessellated once, in its own coordinates, and every node that shows it carries the
    placement as its matrix (glTF 2.0 §3.5: a mesh may be referenced by many nodes).
    """

    def __init__(self, deflection: float):
        self.deflection = deflection
        self.meshes: dict[tuple, str | None] = {}
        self.bare: dict[int, list[tuple[TopoDS_Shape, int]]] = {}
        self.geometry: dict[str, object] = {}

    def _definition(self, shape: TopoDS_Shape) -> tuple[TopoDS_Shape, int]:
        bare = shape.Located(TopLoc_Location())
        bucket = self.bare.setdefault(hash(bare), [])
        for other, k in bucket:
            if other.IsPartner(bare):
                return other, k
        k = sum(len(b) for b in self.bare.values())
        bucket.append((bare, k))
        return bare, k

    def mesh_for(self, item: MarkupItem) -> str | None:
        """The geometry name of the item's mesh (None when the shape has no triangles)."""
        bare, k = self._definition(item.shape)
        key = (k, tuple(round(float(c), 6) for c in item.rgb), round(float(item.alpha), 6), item.kind)
        if key not in self.meshes:
            self.meshes[key] = self._build(bare, item, f"{item.kind} {len(self.meshes) + 1}")
        return self.meshes[key]

    def _build(self, bare: TopoDS_Shape, item: MarkupItem, name: str) -> str | None:
        import trimesh
        from trimesh.visual.material import PBRMaterial

        vertices, faces = tessellate(bare, self.deflection)
        if len(faces) == 0:
            return None
        linear = srgb_to_linear(item.rgb)
        material = PBRMaterial(name=name, baseColorFactor=[*linear, float(item.alpha)],
                               metallicFactor=METALLIC, roughnessFactor=ROUGHNESS,
                               alphaMode="BLEND" if item.alpha < 1.0 else "OPAQUE", doubleSided=item.alpha < 1.0)
        mesh = trimesh.Trimesh(vertices=vertices, faces=faces, process=False)
        mesh.visual = trimesh.visual.TextureVisuals(material=material)
        mesh.metadata["kind"] = item.kind
        self.geometry[name] = mesh
        return name


def build_scene(scene_data: MarkupScene):
    """The trimesh Scene of the marked-up model (joint nodes carry their results as metadata).

    Each node of a part, cone, axis or piece of hardware has its placement as its matrix and
    refers to the mesh of its shape's definition, shared with every other node that shows the
    same definition in the same colour.
    """
    import trimesh

    deflection = tessellation_tolerance(scene_data.diagonal)
    library = _MeshLibrary(deflection)
    scene = trimesh.Scene()
    base = scene.graph.base_frame
    eye = np.eye(4)

    def place(item: MarkupItem, node: str, parent: str) -> None:
        geom = library.mesh_for(item)
        if geom is None:
            return
        if geom not in scene.geometry:
            scene.add_geometry(library.geometry[geom], node_name=node, geom_name=geom, parent_node_name=parent,
                               transform=_placement(item.shape))
        else:
            scene.graph.update(frame_from=parent, frame_to=node, matrix=_placement(item.shape), geometry=geom)

    scene.graph.update(frame_from=base, frame_to="parts", matrix=eye, metadata={"kind": "parts"})
    for item in scene_data.parts:
        place(item, item.name, "parts")
    for jm in scene_data.joints:
        # edge metadata is what trimesh writes as the node's glTF extras
        scene.graph.update(frame_from=base, frame_to=jm.id, matrix=eye, metadata=jm.extras)
        for item in jm.items:
            place(item, f"{jm.id} {item.name}", jm.id)
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
