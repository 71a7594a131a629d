"""Plane sections of a part solid as shapely polygons, and a catalogue of its faces.

The pressure-cone code (:mod:`geomjoint.geometry.cones`) needs, at a height z along a bolt
axis, the material of a part in the plane perpendicular to the axis.  This module cuts the
solid with a bounded planar face (``BRepAlgoAPI_Common`` of the solid and the face), walks
the wires of the resulting faces in order and turns them into shapely polygons with holes.

Coordinates in a section are 2-D *plane coordinates* of a :class:`PlaneFrame`: a point X of
the model has plane coordinates ``(X·u, X·v)`` and the plane itself is ``X·n = offset``.
The frame depends on the normal only, so every joint with the same axis direction shares it
and a section of a plate can be reused by all the joints that pass through it.

Straight section edges stay exact (two end points); curved ones are sampled with a chord
deflection (``deflection`` mm), which bounds the area error of a curved boundary of
length s by about (2/3)·deflection·s.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import shapely
from shapely.geometry import MultiPolygon, Polygon

from OCP.BRepAdaptor import BRepAdaptor_Curve, BRepAdaptor_Surface
from OCP.BRepAlgoAPI import BRepAlgoAPI_Common
from OCP.BRepBndLib import BRepBndLib
from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeFace
from OCP.BRepTools import BRepTools_WireExplorer
from OCP.Bnd import Bnd_Box
from OCP.GCPnts import GCPnts_QuasiUniformDeflection
from OCP.GeomAbs import (
    GeomAbs_Circle,
    GeomAbs_Cylinder,
    GeomAbs_Line,
    GeomAbs_Plane,
    GeomAbs_SurfaceOfExtrusion,
)
from OCP.TopAbs import TopAbs_FACE, TopAbs_REVERSED, TopAbs_WIRE
from OCP.TopExp import TopExp_Explorer
from OCP.TopoDS import TopoDS, TopoDS_Shape
from OCP.gp import gp_Ax3, gp_Dir, gp_Pln, gp_Pnt

from geomjoint.errors import InputError
from geomjoint.geometry import topology

#: default chord deflection for curved section edges, mm (our choice: area error of a
#: 13.5 mm hole about 1e-4 relative)
DEFAULT_DEFLECTION = 5e-4

#: parts with at most this many faces are searched face by face (a tree of their faces costs more)
_FACES_WITHOUT_INDEX = 64

#: face kinds in a :class:`FaceCatalog`
KIND_PLANE, KIND_CYLINDER, KIND_EXTRUSION, KIND_OTHER = 0, 1, 2, 3


def as_occ_shape(solid) -> TopoDS_Shape:
    """The OCP ``TopoDS_Shape`` of `solid` (accepts a cadquery Shape/Workplane too)."""
    if isinstance(solid, TopoDS_Shape):
        return solid
    if hasattr(solid, "val") and callable(solid.val):  # cadquery Workplane
        solid = solid.val()
    wrapped = getattr(solid, "wrapped", None)
    if isinstance(wrapped, TopoDS_Shape):
        return wrapped
    raise InputError(f"not a CAD solid: {type(solid).__name__}")


@dataclass(frozen=True)
class PlaneFrame:
    """Right-handed frame (u, v, n) for sections perpendicular to the unit vector n."""

    n: tuple[float, float, float]
    u: tuple[float, float, float]
    v: tuple[float, float, float]

    @staticmethod
    def for_direction(direction) -> "PlaneFrame":
        """The canonical frame for an axis direction (depends on the direction only).

        Example: ``PlaneFrame.for_direction((0, 0, 1))`` gives u = (0, 1, 0), v = (-1, 0, 0);
        the same direction always gives the same frame.
        """
        n = np.asarray(direction, dtype=float)
        norm = np.linalg.norm(n)
        if not np.isfinite(norm) or norm < 1e-12:
            raise InputError(f"axis direction is not a vector: {direction!r}")
        n = n / norm
        # the global axis least aligned with n gives a well-conditioned perpendicular
        e = np.zeros(3)
        e[int(np.argmin(np.abs(n)))] = 1.0
        u = np.cross(n, e)
        u /= np.linalg.norm(u)
        v = np.cross(n, u)
        return PlaneFrame(tuple(map(float, n)), tuple(map(float, u)), tuple(map(float, v)))

    def key(self) -> tuple:
        return tuple(round(c, 9) for c in self.n)

    def to_plane(self, point) -> tuple[float, float]:
        """Plane coordinates (X·u, X·v) of a 3-D point."""
        p = np.asarray(point, dtype=float)
        return float(p @ np.asarray(self.u)), float(p @ np.asarray(self.v))

    def offset_of(self, point) -> float:
        """Height X·n of a 3-D point along the normal."""
        return float(np.asarray(point, dtype=float) @ np.asarray(self.n))


def _plane(frame: PlaneFrame, offset: float) -> gp_Pln:
    n = np.asarray(frame.n)
    origin = n * offset
    # gp_Ax3 with x-direction u: the plane's (U, V) parameters are then our plane coordinates
    ax3 = gp_Ax3(gp_Pnt(*origin), gp_Dir(*frame.n), gp_Dir(*frame.u))
    return gp_Pln(ax3)


def solid_box(solid) -> np.ndarray:
    """Axis-aligned bounding box of `solid` as [[xmin, ymin, zmin], [xmax, ymax, zmax]]."""
    box = Bnd_Box()
    BRepBndLib.Add_s(as_occ_shape(solid), box)
    if box.IsVoid():
        raise InputError("part has no geometry (empty bounding box)")
    x0, y0, z0, x1, y1, z1 = box.Get()
    return np.array([[x0, y0, z0], [x1, y1, z1]])


def _box_corners(lo, hi) -> np.ndarray:
    return np.array([[x, y, z] for x in (lo[0], hi[0]) for y in (lo[1], hi[1]) for z in (lo[2], hi[2])])


def _edge_points(edge, deflection: float) -> list[tuple[float, float, float]]:
    """Points along an edge in the edge's own orientation."""
    curve = BRepAdaptor_Curve(edge)
    t0, t1 = curve.FirstParameter(), curve.LastParameter()
    kind = curve.GetType()
    if kind == GeomAbs_Line:
        pts = [curve.Value(t0), curve.Value(t1)]
    elif kind == GeomAbs_Circle:
        # analytic sampling: chord sagitta R(1 − cos(Δt/2)) ≤ deflection
        circ = curve.Circle()
        radius = circ.Radius()
        c, xd, yd = circ.Location(), circ.XAxis().Direction(), circ.YAxis().Direction()
        step = 2.0 * math.acos(max(-1.0, 1.0 - deflection / radius)) if radius > deflection else math.pi / 2
        count = max(2, int(math.ceil(abs(t1 - t0) / step)) + 1)
        t = np.linspace(t0, t1, count)
        ct, st = radius * np.cos(t), radius * np.sin(t)
        xyz = np.column_stack((c.X() + ct * xd.X() + st * yd.X(),
                               c.Y() + ct * xd.Y() + st * yd.Y(),
                               c.Z() + ct * xd.Z() + st * yd.Z()))
        if edge.Orientation() == TopAbs_REVERSED:
            xyz = xyz[::-1]
        return [tuple(p) for p in xyz.tolist()]
    else:
        sampler = GCPnts_QuasiUniformDeflection(curve, deflection, t0, t1)
        if not sampler.IsDone() or sampler.NbPoints() < 2:
            pts = [curve.Value(t0 + (t1 - t0) * k / 64.0) for k in range(65)]
        else:
            pts = [sampler.Value(i) for i in range(1, sampler.NbPoints() + 1)]
    xyz = [(p.X(), p.Y(), p.Z()) for p in pts]
    if edge.Orientation() == TopAbs_REVERSED:
        xyz.reverse()
    return xyz


def _wire_ring(wire, face, frame: PlaneFrame, deflection: float) -> np.ndarray | None:
    """The closed ring of a wire in plane coordinates (N×2, first point not repeated)."""
    u = np.asarray(frame.u)
    v = np.asarray(frame.v)
    pts: list[tuple[float, float, float]] = []
    explorer = BRepTools_WireExplorer(TopoDS.Wire_s(wire), face)
    while explorer.More():
        edge_pts = _edge_points(explorer.Current(), deflection)
        pts.extend(edge_pts if not pts else edge_pts[1:])
        explorer.Next()
    if len(pts) < 3:
        return None
    xyz = np.asarray(pts)
    ring = np.column_stack((xyz @ u, xyz @ v))
    if np.allclose(ring[0], ring[-1], atol=1e-9):
        ring = ring[:-1]
    return ring if len(ring) >= 3 else None


def section_polygons(
    solid,
    frame: PlaneFrame,
    offset: float,
    window: tuple[float, float, float, float] | None = None,
    deflection: float = DEFAULT_DEFLECTION,
) -> MultiPolygon:
    """The material of `solid` in the plane ``X·n = offset`` as shapely polygons.

    Parameters: `solid` a located part solid (OCP or cadquery); `frame` the section frame;
    `offset` mm along n; `window` (umin, vmin, umax, vmax) in plane coordinates, mm, to cut
    only a bounded patch of the plane (None: the whole part); `deflection` mm for curved
    edges.  Returns a MultiPolygon in plane coordinates (possibly empty).

    Method: ``BRepAlgoAPI_Common`` of the solid with a bounded planar face, then each
    result face → outer and inner wires → rings (``BRepTools_WireExplorer`` keeps the
    edges in order).

    Example: a 100×60×10 box centred at the origin, cut at z = 0 with n = (0, 0, 1),
    gives one rectangle of area 6000 mm².
    """
    shape = as_occ_shape(solid)
    if window is None:
        box = solid_box(shape)
        corners = _box_corners(box[0], box[1])
        cu = corners @ np.asarray(frame.u)
        cv = corners @ np.asarray(frame.v)
        pad = 1.0 + 1e-3 * float(np.ptp(cu) + np.ptp(cv))
        window = (cu.min() - pad, cv.min() - pad, cu.max() + pad, cv.max() + pad)
    umin, vmin, umax, vmax = window
    face = BRepBuilderAPI_MakeFace(_plane(frame, offset), umin, umax, vmin, vmax).Face()
    common = BRepAlgoAPI_Common(shape, face)
    if not common.IsDone():
        raise InputError("plane section of a part failed (OCC boolean)")
    result = common.Shape()
    polygons: list[Polygon] = []
    faces = TopExp_Explorer(result, TopAbs_FACE)
    while faces.More():
        f = TopoDS.Face_s(faces.Current())
        rings = []
        wires = TopExp_Explorer(f, TopAbs_WIRE)
        while wires.More():
            ring = _wire_ring(wires.Current(), f, frame, deflection)
            if ring is not None:
                rings.append(ring)
            wires.Next()
        faces.Next()
        if not rings:
            continue
        # the outer ring is the one of largest enclosed area (robust to wire order)
        areas = [abs(Polygon(r).area) for r in rings]
        k = int(np.argmax(areas))
        outer = rings.pop(k)
        poly = Polygon(outer, rings)
        if not poly.is_valid:
            poly = shapely.make_valid(poly)
        polygons.extend(_polygons_of(poly))
    if not polygons:
        return MultiPolygon()
    merged = shapely.union_all(polygons) if len(polygons) > 1 else polygons[0]
    return MultiPolygon(_polygons_of(merged))


def _polygons_of(geom) -> list[Polygon]:
    if geom.is_empty:
        return []
    if isinstance(geom, Polygon):
        return [geom]
    if isinstance(geom, MultiPolygon):
        return list(geom.geoms)
    return [g for part in getattr(geom, "geoms", []) for g in _polygons_of(part)]


@dataclass
class FaceCatalog:
    """Every face of a solid, reduced to what the prismatic test needs (arrays, one row a face).

    kind: KIND_PLANE / KIND_CYLINDER / KIND_EXTRUSION / KIND_OTHER; direction: plane normal,
    cylinder axis or extrusion direction (zeros for other); point: a point of a plane;
    corners: the 8 corners of the face's bounding box (F×8×3).
    """

    kind: np.ndarray
    direction: np.ndarray
    point: np.ndarray
    corners: np.ndarray


def face_catalog(solid) -> FaceCatalog:
    """Classify the faces of `solid` by surface type (see :class:`FaceCatalog`)."""
    shape = as_occ_shape(solid)
    kinds, dirs, points, corners = [], [], [], []
    for face in topology.faces(shape):
        surf = BRepAdaptor_Surface(face)
        kind = surf.GetType()
        d = (0.0, 0.0, 0.0)
        p = (0.0, 0.0, 0.0)
        if kind == GeomAbs_Plane:
            pln = surf.Plane()
            a = pln.Axis().Direction()
            o = pln.Location()
            k, d, p = KIND_PLANE, (a.X(), a.Y(), a.Z()), (o.X(), o.Y(), o.Z())
        elif kind == GeomAbs_Cylinder:
            a = surf.Cylinder().Axis().Direction()
            k, d = KIND_CYLINDER, (a.X(), a.Y(), a.Z())
        elif kind == GeomAbs_SurfaceOfExtrusion:
            a = surf.Direction()
            k, d = KIND_EXTRUSION, (a.X(), a.Y(), a.Z())
        else:
            k = KIND_OTHER
        box = Bnd_Box()
        BRepBndLib.Add_s(face, box)
        if box.IsVoid():
            continue
        x0, y0, z0, x1, y1, z1 = box.Get()
        kinds.append(k)
        dirs.append(d)
        points.append(p)
        corners.append(_box_corners((x0, y0, z0), (x1, y1, z1)))
    return FaceCatalog(
        np.asarray(kinds, dtype=int),
        np.asarray(dirs, dtype=float).reshape(-1, 3),
        np.asarray(points, dtype=float).reshape(-1, 3),
        np.asarray(corners, dtype=float).reshape(-1, 8, 3),
    )


def local_block(solid, frame: PlaneFrame, centre: tuple[float, float], size: float,
                offset_range: tuple[float, float]) -> TopoDS_Shape:
    """The part cut down to a box around an axis: |u − cu|, |v − cv| ≤ size, offsets in range.

    Plane sections of this block inside the box equal those of the whole part, and cost
    far less when the part has many faces (one boolean here instead of one per section).
    """
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeBox
    from OCP.gp import gp_Ax2

    shape = as_occ_shape(solid)
    n, u, v = (np.asarray(x) for x in (frame.n, frame.u, frame.v))
    s0, s1 = offset_range
    corner = u * (centre[0] - size) + v * (centre[1] - size) + n * s0
    box = BRepPrimAPI_MakeBox(gp_Ax2(gp_Pnt(*corner), gp_Dir(*frame.n), gp_Dir(*frame.u)),
                              2 * size, 2 * size, s1 - s0).Shape()
    common = BRepAlgoAPI_Common(shape, box)
    if not common.IsDone():
        raise InputError("cutting a part down around a joint failed (OCC boolean)")
    return common.Shape()


class IndexedSection:
    """A whole-part section with a spatial index of its holes, for fast windows.

    Clipping a plate section with hundreds of holes to a small window costs time in
    proportion to all its vertices; here each polygon's outline is clipped and only the
    holes whose bounding boxes meet the window are subtracted (shapely STRtree).
    """

    def __init__(self, geom: MultiPolygon):
        self.geom = geom
        self.outlines = [Polygon(p.exterior) for p in geom.geoms]
        holes, owners = [], []
        for k, poly in enumerate(geom.geoms):
            for ring in poly.interiors:
                holes.append(Polygon(ring))
                owners.append(k)
        self.holes = holes
        self.owners = np.asarray(owners, dtype=int)
        self.outline_tree = shapely.STRtree(self.outlines) if self.outlines else None
        self.hole_tree = shapely.STRtree(holes) if holes else None

    def window(self, umin: float, vmin: float, umax: float, vmax: float) -> MultiPolygon:
        """The section clipped to the rectangle [umin, umax] × [vmin, vmax] (plane coordinates)."""
        if self.outline_tree is None:
            return MultiPolygon()
        rect = shapely.box(umin, vmin, umax, vmax)
        near_holes = self.hole_tree.query(rect) if self.hole_tree is not None else np.zeros(0, int)
        parts = []
        for k in self.outline_tree.query(rect):
            piece = shapely.clip_by_rect(self.outlines[k], umin, vmin, umax, vmax)
            if piece.is_empty:
                continue
            own = [self.holes[i] for i in near_holes if self.owners[i] == k]
            if own:
                piece = shapely.difference(piece, shapely.union_all(own))
            parts.extend(_polygons_of(piece))
        return MultiPolygon(parts)


@dataclass
class SectionCache:
    """Whole-part sections and face catalogues, reused across the joints of one model.

    Keys use ``id()`` of the OCP shape object; the cache keeps a reference to each shape
    so an id is never reused while the cache lives.  Placed instances of one part definition
    (washers, nuts, brackets used many times) share one section of the definition, moved
    into place, instead of one kernel section each.
    """

    deflection: float = DEFAULT_DEFLECTION
    _faces: dict = field(default_factory=dict)
    _sections: dict = field(default_factory=dict)
    _keep: dict = field(default_factory=dict)
    _definitions: dict = field(default_factory=dict)
    _face_trees: dict = field(default_factory=dict)

    def faces(self, solid) -> FaceCatalog:
        shape = as_occ_shape(solid)
        key = id(shape)
        if key not in self._faces:
            self._keep[key] = shape
            self._faces[key] = face_catalog(shape)
        return self._faces[key]

    def faces_near(self, solid, frame: PlaneFrame, centre: tuple[float, float], reach: float) -> np.ndarray:
        """Indices of the faces of `solid` (rows of :meth:`faces`) whose bounding sphere may come
        within `reach` mm of the axis through `centre` (plane coordinates of `frame`).

        A superset of the faces whose bounding-box centre lies within reach + half its diagonal
        of the axis (what the cone code keeps), found through a tree of the faces' boxes in the
        plane, so that a joint in a plate with hundreds of holes looks at its own few faces.
        """
        catalog = self.faces(solid)
        count = len(catalog.kind)
        if count <= _FACES_WITHOUT_INDEX:
            return np.arange(count)
        key = (id(as_occ_shape(solid)), frame.key())
        tree = self._face_trees.get(key)
        if tree is None:
            mid = catalog.corners.mean(axis=1)
            half = 0.5 * np.linalg.norm(catalog.corners[:, 7] - catalog.corners[:, 0], axis=1)
            cu, cv = mid @ np.asarray(frame.u), mid @ np.asarray(frame.v)
            tree = self._face_trees[key] = shapely.STRtree(shapely.box(cu - half, cv - half, cu + half, cv + half))
        x, y = centre
        return np.sort(tree.query(shapely.box(x - reach, y - reach, x + reach, y + reach)))

    def section(self, solid, frame: PlaneFrame, offset: float) -> IndexedSection:
        """The whole-part section at `offset` (cached by shape, direction and offset to 1e-7 mm)."""
        shape = as_occ_shape(solid)
        key = (id(shape), frame.key(), round(offset, 7))
        if key not in self._sections:
            self._keep[id(shape)] = shape
            self._sections[key] = IndexedSection(self._placed_section(shape, frame, offset))
        return self._sections[key]

    def _placed_section(self, shape: TopoDS_Shape, frame: PlaneFrame, offset: float) -> MultiPolygon:
        """The section of a placed shape from the section of its definition (rigid placements).

        With X = R·X_def + t, the plane X·n = offset is X_def·(Rᵀn) = offset − t·n in the
        definition's coordinates, and plane coordinates differ by (t·u, t·v) only.
        """
        from OCP.TopLoc import TopLoc_Location
        from shapely import affinity

        trsf = shape.Location().Transformation()
        R = np.array([[trsf.Value(i, j) for j in (1, 2, 3)] for i in (1, 2, 3)])
        t = np.array([trsf.Value(i, 4) for i in (1, 2, 3)])
        if shape.Location().IsIdentity() or abs(np.linalg.det(R) - 1.0) > 1e-9:
            return section_polygons(shape, frame, offset, deflection=self.deflection)  # none, or not rigid
        n, u, v = (np.asarray(x) for x in (frame.n, frame.u, frame.v))
        local = PlaneFrame(*(tuple(map(float, R.T @ x)) for x in (n, u, v)))
        local_offset = offset - float(t @ n)
        bare = shape.Located(TopLoc_Location())
        key = (hash(bare), *(round(c, 9) for x in (local.n, local.u) for c in x), round(local_offset, 7))
        for other, geom in self._definitions.get(key, ()):
            if other.IsPartner(bare):
                break
        else:
            geom = section_polygons(bare, local, local_offset, deflection=self.deflection)
            self._definitions.setdefault(key, []).append((bare, geom))
        return affinity.translate(geom, float(t @ u), float(t @ v)) if not geom.is_empty else geom
