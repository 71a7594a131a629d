"""Hole features of one solid: through / blind holes, counterbores, countersinks.

A hole is a set of coaxial cylindrical (and conical) faces whose material lies
*outside* the surface: the solid's outward normal points towards the axis.  The
faces on one axis line that touch end to end form one feature; its axial extent
(and so the part's local thickness at the hole) comes from the faces themselves,
not from the bounding box.  Axes of any orientation are handled: every position is
a parameter ``t`` along the feature's unit direction from a reference point on the
axis (the foot of the perpendicular from the model origin).

Canonical direction: a direction and its opposite describe the same axis; we use
the sign that makes z positive (else y, else x), so that coaxial faces of different
parts share one parameter.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from OCP.Bnd import Bnd_Box
from OCP.BRepAdaptor import BRepAdaptor_Surface
from OCP.BRepBndLib import BRepBndLib
from OCP.BRepClass3d import BRepClass3d_SolidClassifier
from OCP.BRepTools import BRepTools
from OCP.GeomAbs import GeomAbs_Cone, GeomAbs_Cylinder, GeomAbs_Plane
from OCP.gp import gp_Pnt, gp_Vec
from OCP.TopAbs import TopAbs_IN, TopAbs_REVERSED, TopAbs_VERTEX
from OCP.TopExp import TopExp_Explorer
from OCP.TopoDS import TopoDS, TopoDS_Shape
from OCP.BRep import BRep_Tool

from geomjoint.geometry import topology

#: geometric tolerance for "same axis", "same radius", "touching", mm (well above the
#: 1e-7 mm kernel tolerance, well below any real feature size)
LINEAR_TOL = 1e-3
#: angular tolerance for "parallel" axes, radians
ANGLE_TOL = 1e-4
#: a cylinder counts as a hole wall only when it wraps at least this much of the circle
#: (fillets and slot ends are partial cylinders)
MIN_WRAP = 1.6 * math.pi
#: probe distance beyond a hole's end when deciding through vs. blind, mm
END_PROBE = 0.05


def canonical_direction(d) -> np.ndarray:
    """Unit vector with the sign that makes z > 0 (else y > 0, else x > 0)."""
    v = np.asarray(d, dtype=float)
    v = v / np.linalg.norm(v)
    for k in (2, 1, 0):
        if abs(v[k]) > 1e-9:
            return v if v[k] > 0 else -v
    return v


#: |x| of a unit axis below which the global x axis is used to build its frame (else y): any
#: value well below 1 keeps the cross product well-conditioned
_FRAME_X_LIMIT = 0.9


def axis_frame(direction) -> tuple[np.ndarray, np.ndarray]:
    """Two unit vectors (u, v) that make (u, v, direction) a right-handed orthonormal frame.

    The one helper for hex prisms, bolt circles and polar angles around a bolt axis; it
    depends on the direction only.

    >>> u, v = axis_frame(np.array([0.0, 0.0, 1.0]))
    >>> u.round(12).tolist(), v.round(12).tolist()
    ([0.0, 1.0, 0.0], [-1.0, 0.0, 0.0])
    """
    d = np.asarray(direction, dtype=float)
    a = np.array([1.0, 0.0, 0.0]) if abs(d[0]) < _FRAME_X_LIMIT else np.array([0.0, 1.0, 0.0])
    u = np.cross(d, a)
    u /= np.linalg.norm(u)
    return u, np.cross(d, u)


def axis_reference(point, direction) -> np.ndarray:
    """The point of the line (point, direction) nearest the origin."""
    p = np.asarray(point, dtype=float)
    d = np.asarray(direction, dtype=float)
    return p - np.dot(p, d) * d


@dataclass
class SurfacePatch:
    """One cylindrical or conical face on an axis (mm, model coordinates)."""

    kind: str                 # "cylinder" | "cone"
    ref: np.ndarray           # axis reference point (nearest the origin)
    direction: np.ndarray     # canonical unit direction
    t0: float                 # axial extent along direction from ref
    t1: float
    r0: float                 # radius at t0 and t1 (equal for a cylinder)
    r1: float
    wrap: float               # angular extent, rad
    is_hole: bool             # material outside the surface


@dataclass
class PlanePatch:
    normal: np.ndarray        # outward unit normal
    point: np.ndarray         # a point of the face


@dataclass
class SolidFaces:
    """The analysable faces of a solid."""

    patches: list[SurfacePatch]
    planes: list[PlanePatch]
    vertices: np.ndarray      # (n, 3) vertex coordinates


@dataclass
class HoleSection:
    kind: str                 # "cylinder" | "cone"
    t0: float
    t1: float
    r0: float
    r1: float


@dataclass
class Hole:
    """A hole feature of one part.

    ``t0 < t1`` along ``direction`` from ``ref``.  ``closed`` says which end is
    closed by material ("start" = t0 end, "end" = t1 end) for a blind hole.
    ``counterbore`` / ``countersink`` are (diameter, seat t, "start"|"end"): the
    seat t is where a head bearing face sits.
    """

    part: str
    ref: np.ndarray
    direction: np.ndarray
    t0: float
    t1: float
    diameter: float                      # the bore: smallest cylinder diameter
    sections: list[HoleSection]
    closed: str | None = None            # None: through; "start"/"end": blind at that end
    counterbore: tuple[float, float, str] | None = None
    countersink: tuple[float, float, str] | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)

    @property
    def through(self) -> bool:
        return self.closed is None

    @property
    def depth(self) -> float:
        return self.t1 - self.t0

    def point_at(self, t: float) -> np.ndarray:
        return self.ref + t * self.direction

    def bore_extent(self) -> tuple[float, float]:
        """Axial extent of the bore (smallest) cylinder sections."""
        r = self.diameter / 2
        ts = [(s.t0, s.t1) for s in self.sections
              if s.kind == "cylinder" and abs(s.r0 - r) <= LINEAR_TOL]
        return min(a for a, _ in ts), max(b for _, b in ts)


def _vec(p) -> np.ndarray:
    return np.array([p.X(), p.Y(), p.Z()])


def analyse_faces(solid: TopoDS_Shape) -> SolidFaces:
    """Cylinders, cones and planes of a (located) solid, with their side of material."""
    patches: list[SurfacePatch] = []
    planes: list[PlanePatch] = []
    for face in topology.faces(solid):
        ad = BRepAdaptor_Surface(face)
        kind = ad.GetType()
        if kind not in (GeomAbs_Cylinder, GeomAbs_Cone, GeomAbs_Plane):
            continue
        umin, umax, vmin, vmax = BRepTools.UVBounds_s(face)
        um, vm = 0.5 * (umin + umax), 0.5 * (vmin + vmax)
        p, du, dv = gp_Pnt(), gp_Vec(), gp_Vec()
        ad.D1(um, vm, p, du, dv)
        n = du.Crossed(dv)
        if n.Magnitude() < 1e-12:
            continue
        normal = _vec(n) / n.Magnitude()
        if face.Orientation() == TopAbs_REVERSED:
            normal = -normal
        if kind == GeomAbs_Plane:
            planes.append(PlanePatch(normal=normal, point=_vec(p)))
            continue
        ax = ad.Cylinder().Axis() if kind == GeomAbs_Cylinder else ad.Cone().Axis()
        o = _vec(ax.Location())
        d = canonical_direction(_vec(ax.Direction()))
        ref = axis_reference(o, d)
        pm = _vec(p)
        radial = (pm - ref) - np.dot(pm - ref, d) * d
        is_hole = float(np.dot(normal, radial)) < 0.0
        ends = []
        for v in (vmin, vmax):
            q = _vec(ad.Value(um, v))
            t = float(np.dot(q - ref, d))
            r = float(np.linalg.norm((q - ref) - t * d))
            ends.append((t, r))
        ends.sort()
        (t0, r0), (t1, r1) = ends
        if kind == GeomAbs_Cylinder:
            r0 = r1 = ad.Cylinder().Radius()
        patches.append(SurfacePatch(kind="cylinder" if kind == GeomAbs_Cylinder else "cone",
                                    ref=ref, direction=d, t0=t0, t1=t1, r0=r0, r1=r1,
                                    wrap=umax - umin, is_hole=is_hole))
    verts = []
    vexp = TopExp_Explorer(solid, TopAbs_VERTEX)
    while vexp.More():
        verts.append(_vec(BRep_Tool.Pnt_s(TopoDS.Vertex_s(vexp.Current()))))
        vexp.Next()
    return SolidFaces(patches=patches, planes=planes,
                      vertices=np.array(verts) if verts else np.zeros((0, 3)))


def group_by_axis(patches: list[SurfacePatch]) -> list[list[SurfacePatch]]:
    """Patches sharing one axis line (parallel and coincident within tolerance)."""
    groups: list[list[SurfacePatch]] = []
    keys: dict[tuple, list[int]] = {}
    for p in patches:
        # hash on the rounded reference point; check the neighbours for robustness
        key = tuple(np.round(p.ref / (10 * LINEAR_TOL)).astype(int))
        found = None
        for dk in _neighbour_keys(key):
            for gi in keys.get(dk, []):
                g = groups[gi][0]
                if (abs(abs(float(np.dot(g.direction, p.direction))) - 1) < ANGLE_TOL
                        and np.linalg.norm(g.ref - p.ref) < 10 * LINEAR_TOL):
                    found = gi
                    break
            if found is not None:
                break
        if found is None:
            groups.append([p])
            keys.setdefault(key, []).append(len(groups) - 1)
        else:
            groups[found].append(p)
    return groups


def _neighbour_keys(key):
    x, y, z = key
    for i in (-1, 0, 1):
        for j in (-1, 0, 1):
            for k in (-1, 0, 1):
                yield (x + i, y + j, z + k)


def _merge_sections(patches: list[SurfacePatch]) -> list[tuple[HoleSection, float]]:
    """Merge split faces of one surface (same kind, radii, touching extents)."""
    items = sorted(patches, key=lambda p: (p.kind, round(p.r0, 3), round(p.r1, 3), p.t0))
    merged: list[list] = []
    for p in items:
        if merged:
            m = merged[-1]
            s: HoleSection = m[0]
            if (s.kind == p.kind and abs(s.r0 - p.r0) < LINEAR_TOL and abs(s.r1 - p.r1) < LINEAR_TOL
                    and abs(s.t0 - p.t0) < LINEAR_TOL and abs(s.t1 - p.t1) < LINEAR_TOL):
                m[1] += p.wrap       # the other half of a split cylinder
                continue
        merged.append([HoleSection(p.kind, p.t0, p.t1, p.r0, p.r1), p.wrap])
    return [(m[0], m[1]) for m in merged]


class _Inside:
    """Point-in-solid test with a bounding-box shortcut."""

    def __init__(self, solid: TopoDS_Shape):
        self.box = Bnd_Box()
        BRepBndLib.Add_s(solid, self.box)
        self.cls = BRepClass3d_SolidClassifier(solid)

    def __call__(self, q: np.ndarray) -> bool:
        pnt = gp_Pnt(*map(float, q))
        if self.box.IsOut(pnt):
            return False
        self.cls.Perform(pnt, 1e-6)
        return self.cls.State() == TopAbs_IN


def find_holes(solid: TopoDS_Shape, part: str = "", faces: SolidFaces | None = None) -> list[Hole]:
    """Hole features of a located solid."""
    faces = faces or analyse_faces(solid)
    hole_patches = [p for p in faces.patches if p.is_hole]
    inside: _Inside | None = None
    holes: list[Hole] = []
    for group in group_by_axis(hole_patches):
        secs = [s for s, wrap in _merge_sections(group)
                if s.kind == "cone" or wrap >= MIN_WRAP]
        if not any(s.kind == "cylinder" for s in secs):
            continue
        secs.sort(key=lambda s: (s.t0, s.t1))
        # chains of sections touching end to end are one feature
        chains: list[list[HoleSection]] = []
        for s in secs:
            if chains and s.t0 <= max(c.t1 for c in chains[-1]) + LINEAR_TOL:
                chains[-1].append(s)
            else:
                chains.append([s])
        ref, d = group[0].ref, group[0].direction
        for chain in chains:
            cyl = [s for s in chain if s.kind == "cylinder"]
            if not cyl:
                continue
            if inside is None:
                inside = _Inside(solid)
            hole = _feature(part, ref, d, chain, inside)
            hole.solid = solid
            holes.append(hole)
    return holes


def _feature(part, ref, d, chain: list[HoleSection], inside: _Inside) -> Hole:
    t0 = min(s.t0 for s in chain)
    t1 = max(s.t1 for s in chain)
    rmin = min(s.r0 for s in chain if s.kind == "cylinder")
    closed = None
    at_start = inside(ref + (t0 - END_PROBE) * d)
    at_end = inside(ref + (t1 + END_PROBE) * d)
    if at_start and not at_end:
        closed = "start"
    elif at_end and not at_start:
        closed = "end"
    hole = Hole(part=part, ref=ref, direction=d, t0=t0, t1=t1, diameter=2 * rmin,
                sections=chain, closed=closed)
    # counterbore / countersink: a larger section at an open end
    for end in ("start", "end"):
        if closed == end:
            continue
        edge_t = t0 if end == "start" else t1
        at_edge = [s for s in chain if abs((s.t0 if end == "start" else s.t1) - edge_t) < LINEAR_TOL]
        for s in at_edge:
            if s.kind == "cylinder" and s.r0 > rmin + LINEAR_TOL:
                seat = s.t1 if end == "start" else s.t0
                hole.counterbore = (2 * s.r0, seat, end)
            elif s.kind == "cone":
                r_out = s.r0 if end == "start" else s.r1
                r_in = s.r1 if end == "start" else s.r0
                if r_out > r_in + LINEAR_TOL:
                    seat = s.t1 if end == "start" else s.t0
                    hole.countersink = (2 * r_out, seat, end)
    return hole
