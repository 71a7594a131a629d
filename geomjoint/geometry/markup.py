"""The marked-up model: the input parts plus, per joint, our own annotated components, as STEP.

What the file holds (an XCAF document written by OCCT's STEP writer, AP214, mm):

    geomjoint <model>                        top-level assembly
      parts                                  every part of the model that is not the
        <part name> ...                      hardware of a joint, with its name, placement
                                             and colour; the faces of each joint's holes
                                             carry the joint's verdict colour
      joints
        J07 M10x40 10.9 marginal fatigue 1.12   one assembly per model joint:
          cone <part> head|far ...           the clipped pressure-cone solids (cones.py)
          axis                               a thin solid cylinder on the bolt axis
          bolt_M10x40_7, nut_..., washer_... the modelled hardware, or
          bolt M10x40 (catalog), nut M10 (catalog)   generated from the catalog dimensions

The scene tells the verdict three ways (colour, name, XCAF layer; see :mod:`geomjoint.scene`);
every solid of a joint's assembly and the assembly itself are put on the joint's layer.

Node names are sanitised with :func:`geomjoint.outputs.safe_name` and made unique among
siblings (a cadquery assembly demands that); a name ending in "_part" gets a trailing "_",
because cadquery's importer reads such a leaf as its parent's own shape.  Each placed part gets its own prototype
(a part definition used by several instances is copied), so that hole faces of one
instance can carry a colour without colouring the other instances.

The scene (which solids, their names, colours and layers) is assembled above this layer,
by :func:`geomjoint.scene.markup_scene`, as the plain records of this module; here are the
solids it is built from (hole faces, the axis marker, catalogue hardware) and the writer:
:func:`write_marked_step` writes it through XCAF and :func:`geomjoint.geometry.glb.write_glb`
through trimesh.  The geometry layer knows no job, analysis, report or palette.
"""
from __future__ import annotations

import math
import os
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np
from OCP.BRepAdaptor import BRepAdaptor_Surface
from OCP.BRepAlgoAPI import BRepAlgoAPI_Cut, BRepAlgoAPI_Fuse
from OCP.BRepBuilderAPI import BRepBuilderAPI_Copy, BRepBuilderAPI_MakeFace, BRepBuilderAPI_MakePolygon
from OCP.BRepGProp import BRepGProp
from OCP.BRepPrimAPI import BRepPrimAPI_MakeCylinder, BRepPrimAPI_MakePrism
from OCP.GeomAbs import GeomAbs_Cone, GeomAbs_Cylinder
from OCP.GProp import GProp_GProps
from OCP.gp import gp_Ax2, gp_Dir, gp_Pnt, gp_Vec
from OCP.IFSelect import IFSelect_RetDone
from OCP.Interface import Interface_Static
from OCP.Quantity import Quantity_Color, Quantity_ColorRGBA, Quantity_TOC_RGB, Quantity_TOC_sRGB
from OCP.STEPCAFControl import STEPCAFControl_Writer
from OCP.STEPControl import STEPControl_AsIs
from OCP.TCollection import TCollection_ExtendedString
from OCP.TDataStd import TDataStd_Name
from OCP.TDF import TDF_Label
from OCP.TDocStd import TDocStd_Document
from OCP.TopAbs import TopAbs_SOLID
from OCP.TopExp import TopExp_Explorer
from OCP.TopLoc import TopLoc_Location
from OCP.TopoDS import TopoDS_Shape
from OCP.UnitsMethods import UnitsMethods_LengthUnit_Millimeter
from OCP.XCAFDoc import XCAFDoc_ColorSurf, XCAFDoc_DocumentTool

from geomjoint.errors import InputError
from geomjoint.geometry import topology
from geomjoint.geometry.holes import axis_frame
from geomjoint.geometry.model import quiet_stdout
from geomjoint.outputs import MAX_NAME_LENGTH, safe_name, write_atomic

#: diameter of the axis marker as a fraction of the bolt diameter (thin, still visible)
AXIS_DIAMETER_RATIO = 0.15
#: the axis marker runs this far (× bolt diameter) past the hardware at both ends
AXIS_OVERHANG_RATIO = 0.5
#: a hole face lies on the joint's hole when its axis is this close (mm) and this parallel (|sin|)
FACE_AXIS_TOL = 1e-2
FACE_PARALLEL_TOL = 1e-4
#: faces count as inside a hole's axial extent within this margin, mm
FACE_EXTENT_TOL = 1e-2
#: OCCT's STEP writer parameter for 2-D curves on surfaces (0: none written)
SURFACE_CURVE_PARAMETER = "write.surfacecurve.mode"
#: the bore cut through a generated nut overshoots both faces by this, mm (a cut flush with a
#: face can leave a skin of zero thickness)
NUT_BORE_PAD = 1.0

RGB = tuple[float, float, float]


@dataclass
class MarkupItem:
    """One solid (or compound) of the scene, in model coordinates (mm)."""

    name: str                          # node name, unique among its siblings
    kind: str                          # "part" | "cone" | "axis" | "bolt" | "nut" | "washer"
    shape: TopoDS_Shape = field(repr=False)  # located
    rgb: tuple[float, float, float]    # sRGB 0..1
    alpha: float = 1.0
    source: str = "model"              # "model" (a part of the input) | "generated"
    part: str | None = None            # the model part name it comes from
    hole_faces: dict[int, RGB] = field(default_factory=dict)  # face index -> sRGB of its joint (parts only)


@dataclass
class JointMarkup:
    """A joint's own components and the key results that name it."""

    id: str
    name: str                          # "J07 M10x40 10.9 marginal fatigue 1.12"
    verdict: str
    governing: str
    rgb: RGB                           # sRGB 0..1 of the joint assembly
    layer: str                         # XCAF layer of the joint's solids ("geomjoint pass")
    factor: float | None               # of the governing check, when numeric
    fastener: dict[str, Any]
    factors: dict[str, float | None]
    items: list[MarkupItem] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)

    @property
    def extras(self) -> dict[str, Any]:
        """The joint's key results as plain JSON values (GLB node extras)."""
        return {"id": self.id, "verdict": self.verdict, "governing": self.governing,
                "governing_factor": self.factor, "factors": dict(self.factors),
                "fastener": dict(self.fastener), "name": self.name}


@dataclass
class MarkupScene:
    title: str                         # top-level node name
    parts: list[MarkupItem]            # model parts that are no joint's hardware
    joints: list[JointMarkup]
    diagonal: float                    # bounding-box diagonal of the model, mm
    source: str | None = None          # path of the input model (never overwritten), None in memory


@dataclass
class MarkupSummary:
    """What :func:`write_marked_step` wrote."""

    path: Path
    top: str                           # name of the top-level assembly
    parts: list[str]                   # node names under "parts"
    joints: dict[str, str]             # joint id -> node name
    verdicts: dict[str, str]           # joint id -> verdict
    layers: dict[str, list[str]]       # layer name -> node names of the joint assemblies on it
    cones: dict[str, float]            # "<joint node>/<cone node>" -> volume, mm^3
    generated: list[str]               # "<joint id>/<node>" of hardware made from the catalog
    notes: list[str] = field(default_factory=list)


# ----------------------------------------------------------------------------- small helpers

#: cadquery's STEP importer takes a leaf named "*_part" for its parent's own shape: avoid that ending
_IMPORTER_RESERVED_SUFFIX = "_part"


def node_name(name: str) -> str:
    """A node name made from a model's name: :func:`safe_name`, and never ending in "_part"."""
    base = safe_name(name)
    if base.endswith(_IMPORTER_RESERVED_SUFFIX):
        base = base[: MAX_NAME_LENGTH - 1] + "_"
    return base


def unique_node_name(name: str, taken: set[str]) -> str:
    """:func:`node_name`, made unique among ``taken`` (which it joins)."""
    base = node_name(name)
    out, k = base, 2
    while out in taken:
        suffix = f" #{k}"
        out = base[: max(1, MAX_NAME_LENGTH - len(suffix))] + suffix
        k += 1
    taken.add(out)
    return out


def _faces(shape: TopoDS_Shape) -> list[TopoDS_Shape]:
    return list(topology.faces(shape))


def has_solid(shape: TopoDS_Shape) -> bool:
    return shape is not None and not shape.IsNull() and TopExp_Explorer(shape, TopAbs_SOLID).More()


def volume(shape: TopoDS_Shape) -> float:
    """Volume of a solid or compound of solids, mm^3 (OCCT's Gauss integration)."""
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape, props)
    return float(props.Mass())


def bounding_diagonal(shapes: list[TopoDS_Shape]) -> float:
    """Diagonal of the common bounding box of shapes, mm."""
    from OCP.Bnd import Bnd_Box
    from OCP.BRepBndLib import BRepBndLib

    box = Bnd_Box()
    for s in shapes:
        BRepBndLib.Add_s(s, box)
    if box.IsVoid():
        return 0.0
    x0, y0, z0, x1, y1, z1 = box.Get()
    return math.dist((x0, y0, z0), (x1, y1, z1))


def _cylinder(point: np.ndarray, direction: np.ndarray, radius: float, length: float) -> TopoDS_Shape:
    return BRepPrimAPI_MakeCylinder(gp_Ax2(gp_Pnt(*map(float, point)), gp_Dir(*map(float, direction))),
                                    float(radius), float(length)).Shape()


def _hex_prism(point: np.ndarray, direction: np.ndarray, across_flats: float, height: float) -> TopoDS_Shape:
    """A regular hexagonal prism on the axis, from ``point`` along ``direction``."""
    u, v = axis_frame(direction)
    r = across_flats / math.sqrt(3.0)          # corner radius of a hexagon: s / √3
    poly = BRepBuilderAPI_MakePolygon()
    for k in range(6):
        a = k * math.pi / 3.0
        p = point + r * (math.cos(a) * u + math.sin(a) * v)
        poly.Add(gp_Pnt(*map(float, p)))
    poly.Close()
    face = BRepBuilderAPI_MakeFace(poly.Wire()).Face()
    vec = gp_Vec(*map(float, direction * height))
    return BRepPrimAPI_MakePrism(face, vec).Shape()


def model_colour_srgb(colour) -> tuple[float, float, float]:
    """sRGB 0..1 of a part colour as :mod:`geomjoint.geometry.model` reports it.

    model.py takes ``Quantity_Color.Red()/Green()/Blue()``, which OCCT (7.5 and later)
    returns in *linear* RGB; the value written to a file (and shown by viewers) is sRGB.
    """
    r, g, b = (float(c) for c in colour)
    return tuple(Quantity_Color(r, g, b, Quantity_TOC_RGB).Values(Quantity_TOC_sRGB))  # type: ignore[return-value]


def srgb_to_linear(rgb) -> tuple[float, float, float]:
    """Linear RGB of an sRGB 0..1 triple (IEC 61966-2-1 transfer curve, through OCCT)."""
    return tuple(Quantity_Color.Convert_sRGB_To_LinearRGB_s(float(c)) for c in rgb)  # type: ignore[return-value]


# ----------------------------------------------------------------------------- hole faces

@dataclass
class HoleFaceTable:
    """The cylinder and cone faces of a solid as arrays (one row a face), read once per part.

    index: the face's position in explorer order; loc, axis: a point of the surface's axis and
    its direction; radius: cylinder radius (0 for a cone, judged by axis and extent); centre:
    the centre of the face's bounding box.  Selecting a joint's hole faces is then a few array
    operations, whatever the number of holes in the part.
    """

    index: np.ndarray
    loc: np.ndarray
    axis: np.ndarray
    radius: np.ndarray
    centre: np.ndarray


def hole_face_table(solid: TopoDS_Shape) -> HoleFaceTable:
    """The :class:`HoleFaceTable` of a solid."""
    from OCP.Bnd import Bnd_Box
    from OCP.BRepBndLib import BRepBndLib

    rows = []
    for i, face in enumerate(_faces(solid)):
        surf = BRepAdaptor_Surface(face)
        kind = surf.GetType()
        if kind == GeomAbs_Cylinder:
            geom = surf.Cylinder()
            radius = geom.Radius()
        elif kind == GeomAbs_Cone:
            geom = surf.Cone()
            radius = 0.0                       # a countersink: judged by its axis and extent
        else:
            continue
        ax = geom.Axis()
        box = Bnd_Box()
        BRepBndLib.Add_s(face, box)
        x0, y0, z0, x1, y1, z1 = box.Get()
        rows.append((i, ax.Location().X(), ax.Location().Y(), ax.Location().Z(),
                     ax.Direction().X(), ax.Direction().Y(), ax.Direction().Z(), radius,
                     (x0 + x1) / 2, (y0 + y1) / 2, (z0 + z1) / 2))
    a = np.asarray(rows, dtype=float).reshape(-1, 11)
    return HoleFaceTable(a[:, 0].astype(int), a[:, 1:4], a[:, 4:7], a[:, 7], a[:, 8:11])


def hole_face_indices(solid: TopoDS_Shape, ref, direction, t0: float, t1: float,
                      max_radius: float, table: HoleFaceTable | None = None) -> list[int]:
    """Indices (explorer order) of the cylinder/cone faces of ``solid`` that form a hole.

    A face belongs to the hole when its axis is the hole's axis (within FACE_AXIS_TOL mm,
    parallel within FACE_PARALLEL_TOL), its radius is at most ``max_radius`` (+ tolerance)
    and the centre of its bounding box lies within [t0, t1] along ``direction`` from ``ref``.
    ``table``: the solid's :func:`hole_face_table`, when already read.
    """
    table = table if table is not None else hole_face_table(solid)
    ref = np.asarray(ref, float)
    d = np.asarray(direction, float)
    d = d / np.linalg.norm(d)
    parallel = np.linalg.norm(np.cross(table.axis, d), axis=1) <= FACE_PARALLEL_TOL
    off = table.loc - ref
    on_axis = np.linalg.norm(off - np.outer(off @ d, d), axis=1) <= FACE_AXIS_TOL
    t = (table.centre - ref) @ d
    keep = (parallel & on_axis & (table.radius <= max_radius + FACE_AXIS_TOL)
            & (t >= t0 - FACE_EXTENT_TOL) & (t <= t1 + FACE_EXTENT_TOL))
    return [int(i) for i in table.index[keep]]


def layer_hole_faces(layer, joint, tables: dict | None = None) -> list[int]:
    """The hole faces of a joint's layer; ``tables`` keeps each part's :class:`HoleFaceTable`."""
    if layer.solid is None:
        return []
    tables = tables if tables is not None else {}
    table = tables.get(id(layer.solid))
    if table is None:
        table = tables[id(layer.solid)] = hole_face_table(layer.solid)
    hole = layer.hole
    if hole is not None:
        rmax = max([max(s.r0, s.r1) for s in hole.sections] + [0.5 * hole.diameter])
        for extra in (hole.counterbore, hole.countersink):
            if extra:
                rmax = max(rmax, 0.5 * extra[0])
        return hole_face_indices(layer.solid, hole.ref, hole.direction, hole.t0, hole.t1, rmax, table)
    # no hole record: the joint axis over the layer's range
    p = np.asarray(joint.point, float)
    d = np.asarray(joint.direction, float)
    return hole_face_indices(layer.solid, p, d, layer.start, layer.end, 0.5 * layer.hole_diameter, table)


# ----------------------------------------------------------------------------- generated solids

@dataclass
class GeneratedSolid:
    """A solid made for the scene from the catalogue (hardware the model does not have)."""

    kind: str                          # "bolt" | "nut"
    shape: TopoDS_Shape = field(repr=False)
    length: float | None = None        # bolt length, mm


def generated_hardware(joint, fastener, notes: list[str]) -> list[GeneratedSolid]:
    """Bolt (hex prism or round head + shank) and nut from the catalog, where none is modelled.

    ``joint``: geometry.stacks.Joint; ``fastener``: the resolved fastener (designation, d,
    length, head); what cannot be made is said in ``notes``.
    """
    from geomjoint import catalog

    out: list[GeneratedSolid] = []
    p = np.asarray(joint.point, float)
    d = np.asarray(joint.direction, float)
    d = d / np.linalg.norm(d)
    f = fastener
    try:
        t = catalog.thread(f.designation)
    except InputError as exc:
        notes.append(f"{joint.id}: no catalog thread for generated hardware ({exc})")
        return out
    grip_end = max(layer.end for layer in joint.layers) if joint.layers else joint.grip
    nut_dims = None
    if joint.nut is None and not joint.tapped:
        try:
            nut_dims = catalog.nut(t)
        except InputError as exc:
            notes.append(f"{joint.id}: no catalog nut ({exc})")
    if joint.bolt is None:
        try:
            head = catalog.head(t, f.head or "hex")
        except InputError as exc:
            notes.append(f"{joint.id}: no catalog head ({exc})")
            head = None
        if head is not None:
            length = f.length or (grip_end + (nut_dims.height if nut_dims else 0.0))
            head_start = p - head.height * d
            if head.kind == "socket":
                head_solid = _cylinder(head_start, d, 0.5 * head.width, head.height)
            else:
                head_solid = _hex_prism(head_start, d, head.width, head.height)
            shank = _cylinder(p, d, 0.5 * f.d, length)
            out.append(GeneratedSolid("bolt", BRepAlgoAPI_Fuse(head_solid, shank).Shape(), length))
    if nut_dims is not None:
        start = p + grip_end * d
        prism = _hex_prism(start, d, nut_dims.width, nut_dims.height)
        bore = _cylinder(start - NUT_BORE_PAD * d, d, 0.5 * f.d, nut_dims.height + 2.0 * NUT_BORE_PAD)
        out.append(GeneratedSolid("nut", BRepAlgoAPI_Cut(prism, bore).Shape()))
    return out


#: digits (mm) of an axis marker's radius and length in the key of its shared definition
_AXIS_KEY_DIGITS = 9


def axis_marker(joint, fastener, shared: dict | None = None) -> TopoDS_Shape:
    """A thin cylinder on the bolt axis, past the hardware at both ends.

    The cylinder is made once per radius and length, on the z axis, and placed on the joint's
    axis; ``shared`` (one dict per scene) keeps those definitions, so the STEP and GLB writers
    hold one marker per size (instances) instead of one per joint.
    """
    from OCP.gp import gp_Ax3, gp_Trsf

    p = np.asarray(joint.point, float)
    d = np.asarray(joint.direction, float)
    d = d / np.linalg.norm(d)
    dia = fastener.d
    over = AXIS_OVERHANG_RATIO * dia
    head = joint.bolt.head_height if joint.bolt is not None else dia
    end = max([layer.end for layer in joint.layers] + [joint.grip, fastener.length or 0.0])
    if joint.nut is not None:
        end = max(end, joint.layers[-1].end + joint.nut.height)
    start = p - (head + over) * d
    radius, length = 0.5 * AXIS_DIAMETER_RATIO * dia, head + over + end + over
    shared = {} if shared is None else shared
    key = (round(radius, _AXIS_KEY_DIGITS), round(length, _AXIS_KEY_DIGITS))
    if key not in shared:
        shared[key] = _cylinder(np.zeros(3), np.array([0.0, 0.0, 1.0]), radius, length)
    trsf = gp_Trsf()
    trsf.SetDisplacement(gp_Ax3(), gp_Ax3(gp_Pnt(*map(float, start)), gp_Dir(*map(float, d))))
    return shared[key].Located(TopLoc_Location(trsf))


# ----------------------------------------------------------------------------- STEP through XCAF

def _colour(rgb, alpha: float = 1.0) -> Quantity_ColorRGBA:
    return Quantity_ColorRGBA(Quantity_Color(float(rgb[0]), float(rgb[1]), float(rgb[2]), Quantity_TOC_sRGB),
                              float(alpha))


def _set_name(label: TDF_Label, name: str) -> None:
    TDataStd_Name.Set_s(label, TCollection_ExtendedString(name))


class _Definitions:
    """Shape definitions (TShapes) met so far, each numbered once: placed instances of one part
    definition, and identical cone pieces, share a number."""

    def __init__(self) -> None:
        self.buckets: dict[int, list[tuple[TopoDS_Shape, int]]] = {}
        self.count = 0

    def number(self, shape: TopoDS_Shape) -> int:
        bare = shape.Located(TopLoc_Location())
        bucket = self.buckets.setdefault(hash(bare), [])
        for other, k in bucket:
            if other.IsPartner(bare):
                return k
        self.count += 1
        bucket.append((bare, self.count))
        return self.count


class _XcafBuilder:
    """The XCAF document of the marked-up model.

    An item without coloured hole faces is an instance: items of one shape definition in one
    colour on one layer share one prototype (the model's bolts, nuts and washers, identical
    cone pieces), each placed by its own component with its own name, so the file holds each
    definition once.  A part with coloured hole faces keeps a prototype of its own (a face
    colour belongs to the prototype, and would colour every instance).
    """

    def __init__(self) -> None:
        self.doc = TDocStd_Document(TCollection_ExtendedString("XmlOcaf"))
        XCAFDoc_DocumentTool.SetLengthUnit_s(self.doc, 1.0, UnitsMethods_LengthUnit_Millimeter)
        self.shapes = XCAFDoc_DocumentTool.ShapeTool_s(self.doc.Main())
        self.colours = XCAFDoc_DocumentTool.ColorTool_s(self.doc.Main())
        self.layers = XCAFDoc_DocumentTool.LayerTool_s(self.doc.Main())
        self.definitions = _Definitions()
        self.prototypes: dict[tuple, TDF_Label] = {}

    def assembly(self, name: str) -> TDF_Label:
        label = self.shapes.NewShape()
        _set_name(label, name)
        return label

    def place(self, parent: TDF_Label, child: TDF_Label, name: str,
              loc: TopLoc_Location | None = None) -> TDF_Label:
        comp = self.shapes.AddComponent(parent, child, loc or TopLoc_Location())
        _set_name(comp, name)
        return comp

    def item(self, parent: TDF_Label, item: MarkupItem, layer: str | None = None) -> TDF_Label:
        """The item placed under ``parent``: an instance of a shared prototype, or (with coloured
        hole faces) a prototype of its own, copied if its shape is already in the document."""
        loc = item.shape.Location()
        if not item.hole_faces:
            key = (self.definitions.number(item.shape), tuple(round(float(c), 6) for c in item.rgb),
                   round(float(item.alpha), 6), layer)
            proto = self.prototypes.get(key)
            if proto is None:
                proto = self.prototypes[key] = self._prototype(self._new_base(item.shape), item, layer)
            return self.place(parent, proto, item.name, loc)
        base = self._new_base(item.shape)
        proto = self._prototype(base, item, layer)
        faces = _faces(base)
        for idx, rgb in sorted(item.hole_faces.items()):
            sub = self.shapes.AddSubShape(proto, faces[idx])
            if not sub.IsNull():
                self.colours.SetColor(sub, _colour(rgb), XCAFDoc_ColorSurf)
        return self.place(parent, proto, item.name, loc)

    def _new_base(self, shape: TopoDS_Shape) -> TopoDS_Shape:
        """The shape's definition, copied when the document already holds it (a second colour or
        layer of one definition needs a prototype of its own; XCAF would return the first)."""
        base = shape.Located(TopLoc_Location())
        if self.shapes.FindShape(base, TDF_Label(), False):
            base = BRepBuilderAPI_Copy(base).Shape()
        return base

    def _prototype(self, base: TopoDS_Shape, item: MarkupItem, layer: str | None) -> TDF_Label:
        proto = self.shapes.AddShape(base, False, False)
        _set_name(proto, item.name)
        self.colours.SetColor(proto, _colour(item.rgb, item.alpha), XCAFDoc_ColorSurf)
        if layer:
            self.layers.SetLayer(proto, TCollection_ExtendedString(layer), False)
        return proto

    def write(self, path: Path, shown: Path | None = None) -> None:
        """Write the document to ``path`` (``shown``: the path named in an error)."""
        shown = shown or path
        self.shapes.UpdateAssemblies()
        writer = STEPCAFControl_Writer()
        writer.SetNameMode(True)
        writer.SetColorMode(True)
        writer.SetLayerMode(True)
        # no 2-D curves on the surfaces (p-curves): readers rebuild them, and they were most of
        # the file; OCCT's writer takes the setting from a process-wide parameter, restored after
        previous = Interface_Static.IVal_s(SURFACE_CURVE_PARAMETER)
        Interface_Static.SetIVal_s(SURFACE_CURVE_PARAMETER, 0)
        try:
            with quiet_stdout():
                done = writer.Transfer(self.doc, STEPControl_AsIs)
                status = writer.Write(str(path)) if done else None
        finally:
            Interface_Static.SetIVal_s(SURFACE_CURVE_PARAMETER, previous)
        if not done:
            raise InputError("the marked-up model could not be transferred to STEP", where=str(shown))
        if status != IFSelect_RetDone:
            raise InputError("the marked-up STEP file could not be written", where=str(shown))


def input_paths(scene: MarkupScene) -> list[Path]:
    """The input model behind the scene, which no output may replace."""
    source = scene.source
    return [Path(source)] if source and source != "<memory>" and os.path.exists(source) else []


def write_marked_step(scene: MarkupScene, path: Path) -> MarkupSummary:
    """Write the marked-up ``scene`` (geomjoint.scene.markup_scene) to ``path`` as STEP.

    Written through :func:`geomjoint.outputs.write_atomic` (no half file under ``path``);
    ``path`` must not be the input model.
    """
    path = Path(path)
    protect = input_paths(scene)
    if any(path.exists() and os.path.samefile(p, path) for p in protect):
        raise InputError("refusing to overwrite the input model", where=str(path))
    b = _XcafBuilder()
    top = b.assembly(scene.title)
    parts_asm = b.assembly("parts")
    part_names = []
    for item in scene.parts:
        b.item(parts_asm, item)
        part_names.append(item.name)
    b.place(top, parts_asm, "parts")
    summary = MarkupSummary(path=path, top=scene.title, parts=part_names, joints={}, verdicts={},
                            layers={}, cones={}, generated=[])
    if scene.joints:
        joints_asm = b.assembly("joints")
        volumes: dict[int, float] = {}      # one volume per cone definition
        for jm in scene.joints:
            asm = b.assembly(jm.name)
            for item in jm.items:
                b.item(asm, item, jm.layer)
                if item.kind == "cone":
                    k = b.definitions.number(item.shape)
                    if k not in volumes:
                        volumes[k] = volume(item.shape)
                    summary.cones[f"{jm.name}/{item.name}"] = volumes[k]
                if item.source == "generated" and item.kind in ("bolt", "nut", "washer"):
                    summary.generated.append(f"{jm.id}/{item.name}")
            b.layers.SetLayer(asm, TCollection_ExtendedString(jm.layer), False)
            b.colours.SetColor(asm, _colour(jm.rgb), XCAFDoc_ColorSurf)
            b.place(joints_asm, asm, jm.name)
            summary.joints[jm.id] = jm.name
            summary.verdicts[jm.id] = jm.verdict
            summary.layers.setdefault(jm.layer, []).append(jm.name)
            summary.notes += jm.notes
        b.place(top, joints_asm, "joints")
    # OCCT writes to a path of its own: a private temporary folder, then one atomic write
    with tempfile.TemporaryDirectory(prefix="geomjoint-step-") as tmp:
        written = Path(tmp) / "model.step"
        b.write(written, shown=path)
        write_atomic(path, written.read_bytes(), protect=protect)
    return summary
