"""Bolts, screws, nuts, washers, set screws and studs recognised by their shape.

Fastener libraries model the same part in many ways: split cylinder halves, threads as
helical or B-spline faces or as a cylinder at the minor diameter, heads with chamfers,
washer faces, fillets under the head and sockets made of B-spline faces.  Recognition
therefore reads the part's shape as a body of revolution around one axis, from its faces
and points sampled on its edges:

- a *bolt* (or screw) is a shank (the longest outer cylinder, threads not needed) with a
  wider head at one end.  The head kind is read from the head: six outward planes parallel
  to the axis are a hex head (a round part wider than its corners makes it a flange head,
  ISO 4162 / EN 1665); a cone under the head that starts at the shank and opens at 90 deg
  (ISO 10642, ISO 7046, ISO 2009; 82 deg for the inch flat heads of ASME B18.3 / B18.6.3) is
  a countersunk head, and only that; any other round head is the kind of the catalogue's
  tables (socket, button, pan, cheese) whose head diameter and height it is nearest, with
  the top's shape (flat or domed) and the height of its cylindrical side as tie-breakers.
  The bearing face is the underside plane nearest the tip (a washer face's, where the head
  has one); the nominal length runs from it to the tip (countersunk: over the head).
- a *nut* is a short hex (or square) prism around one through hole; a round part wider
  than its corners makes it a flange nut, a height over LOCK_NUT_MIN_HEIGHT_RATIO of the
  bore a prevailing-torque (lock) nut.  A *washer* is a thin ring.
- a part without a head whose name calls it a set screw (or with a hexagon socket in one
  end) is a *set screw*; one whose name calls it a stud or threaded rod is a *stud*.

The product name is read with :func:`geomjoint.catalog.designation.parse_designation`
(``Bolt.designation``); the scan cross-checks it against the shape.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from OCP.BRep import BRep_Tool
from OCP.BRepAdaptor import BRepAdaptor_Curve, BRepAdaptor_Surface
from OCP.BRepGProp import BRepGProp
from OCP.GeomAbs import GeomAbs_Cone, GeomAbs_Cylinder, GeomAbs_Plane
from OCP.GProp import GProp_GProps
from OCP.TopAbs import TopAbs_REVERSED
from OCP.TopoDS import TopoDS_Shape

from geomjoint.geometry import topology
from geomjoint.geometry.holes import (
    ANGLE_TOL,
    axis_frame,
    LINEAR_TOL,
    MIN_WRAP,
    Hole,
    SolidFaces,
    SurfacePatch,
    axis_reference,
    canonical_direction,
    group_by_axis,
)

#: proportions that separate hardware from plates (common practice: ISO 4032 nuts have
#: m/d ~ 0.8-0.9, ISO 7089 washers h/d1 ~ 0.15-0.2, heads are wider than 1.3 d)
NUT_MAX_HEIGHT_RATIO = 1.5        # nut height / bore diameter
WASHER_MAX_THICKNESS_RATIO = 0.5  # washer thickness / inner diameter
MIN_HEAD_WIDTH_RATIO = 1.3        # head (or nut / washer) width / shank (bore) diameter
#: a ring without a washer's name is a washer only with a washer's proportions: ISO 7089 h/d1
#: is 0.14-0.25 (DIN 127 spring washers about 0.26), ISO 7089 / ISO 7092 d2/d1 is 1.7-2.2
#: (from memory); thicker or narrower rings are spacers, bearing rings, seals
UNNAMED_WASHER_MAX_THICKNESS_RATIO = 0.3
UNNAMED_WASHER_MIN_OD_RATIO = 1.5
#: upper bounds that keep round covers, flanges and collars out (common practice: ISO 7093
#: large washers have d2 ~ 3 d, hex heads and nuts s ~ 1.5-1.8 d, flange heads ~ 2.2 d)
WASHER_MAX_OD_RATIO = 4.0         # washer outer / inner diameter
MAX_HEAD_WIDTH_RATIO = 3.0        # head or nut width / shank (bore) diameter
#: cylinders up to this ratio of the narrowest shank cylinder are shank or thread, not head
SHANK_STEP_RATIO = 1.25
#: a thread's crest over its core is at most this ratio (d / d3 is 1.37 at M1.6, 1.2-1.3 from M3
#: up, ISO 724 / ASME B1.1): an outline within it over the shank is the thread, not a collar
THREAD_CREST_RATIO = 1.4
#: a shank cylinder is at least this long in diameters (shorter ones are grooves, reliefs)
SHANK_MIN_LENGTH_RATIO = 0.5
#: relative tolerance for "same size" when matching a diameter to a thread size
SIZE_TOL = 0.03
#: a head is at least this high in shank diameters (ISO 7380 button heads are 0.55 d, the
#: lowest of the catalogue's heads; wafer heads go down to about 0.3 d; thinner collars are no heads;
#: common practice)
MIN_HEAD_HEIGHT_RATIO = 0.25
#: hexagon and flange heads are at most this high in shank diameters (ISO 4014 k ~ 0.6-0.7 d,
#: ISO 4162 flange heads up to 1.08 d at M5; from memory): a taller hexagon on a shank is a
#: standoff or a spacer, no head
HEX_MAX_HEIGHT_RATIO = 1.2
#: included angles of countersunk heads, deg: 90 (ISO 10642, ISO 7046-1, ISO 2009) and 82
#: (ASME B18.3 flat socket and ASME B18.6.3 flat machine screws), each within CSK_ANGLE_TOL
COUNTERSUNK_ANGLES = (90.0, 82.0)
CSK_ANGLE_TOL = 2.0
#: the seat cone of a countersunk head starts at the shank: its small radius is at most this
#: ratio of the shank radius (an under-head fillet or a reduced shank allowed; common practice)
CSK_SMALL_END_RATIO = 1.25
#: ... and it opens to the head diameter: its large radius is at least this share of the head's
CSK_LARGE_END_SHARE = 0.8
#: a flange head or nut: a round part wider than the hexagon's corners by this factor
#: (ISO 4162 d_c ~ 1.4 s against corners e ~ 1.13 s; ISO 4161 likewise; from memory)
FLANGE_OVER_CORNERS = 1.05
#: nuts higher than this share of their nominal diameter are prevailing-torque (lock) nuts:
#: ISO 4032 style 1 m/d is 0.8-0.9 and ISO 4033 style 2 about 1.0, ISO 7040 (non-metallic
#: insert) about 1.2-1.3 and ISO 7042 (all-metal) about 1.1-1.2 (from memory)
LOCK_NUT_MIN_HEIGHT_RATIO = 1.05
#: square nuts are at most SQUARE_NUT_MAX_WIDTH_RATIO d + SQUARE_NUT_WIDTH_ALLOWANCE wide: DIN 557
#: / DIN 562 s = 1.5-1.8 d, ASME B18.2.2 square nuts 1.5 D, the numbered machine screw square nuts of
#: ASME B18.6.3 up to 2.3 D at #6 (from memory); a wider square plate with a tapped hole is a plate
SQUARE_NUT_MAX_WIDTH_RATIO = 1.5
SQUARE_NUT_WIDTH_ALLOWANCE = 3.0
#: the flats of a nut's prism run over at least this share of its height (chamfers cut the rest)
PRISM_MIN_HEIGHT_SHARE = 0.5
#: a square nut's outline reaches no further than its corners (times this, for rounding)
PRISM_CORNER_TOL = 1.02
#: a round head whose cylindrical side covers this share of its height and whose top is flat
#: is a socket or cheese head (ISO 4762, ISO 1207); a lower side or a domed top is a button
#: or pan head (ISO 7380, ISO 7045, ISO 1580) (common practice of how the heads are drawn)
FLAT_HEAD_SIDE_SHARE = 0.5
#: a head's side "stands" where its outline reaches this share of the head radius; the outline
#: is read in SIDE_BINS slices of the head height
SIDE_RADIUS_SHARE = 0.97
SIDE_BINS = 20
#: a flat top covers at least this share of the head radius (a socket's rim; a dome's flat is smaller)
FLAT_TOP_SHARE = 0.5
#: two round-head kinds whose catalogue misfit differs by less than this are a tie, which the
#: product name's kind breaks (misfit: |ln(d_k/d_k,table)| + |ln(k/k_table)|)
ROUND_KIND_TIE = 0.15
#: a round head further than this misfit from every catalogue kind is still named by its
#: proportions alone (SOCKET_MIN_HEIGHT_RATIO), not refused
ROUND_KIND_MAX_MISFIT = 0.6
#: without a catalogue size: heads at least this high in shank diameters are socket heads
#: (ISO 4762 k = d; ISO 7045 pan k ~ 0.75 d, the highest of the others; from memory)
SOCKET_MIN_HEIGHT_RATIO = 0.85
#: round head kinds the catalogue dimensions, compared by their tables
ROUND_KINDS = ("socket", "button", "pan", "pan slotted", "cheese")
#: parts with more faces than this are not examined as hardware (a fastener has tens to a few
#: hundred faces; a machined housing thousands): keeps the scan linear in model size
MAX_HARDWARE_FACES = 1500
#: an underside plane is a bearing face when it reaches this far out, in shank radii (the
#: step of a reduced shank or a thread run-out is no bearing face; common practice)
BEARING_MIN_RADIUS_RATIO = 1.1
#: corners of a hexagon over its flats (a head's outline reaches the corners)
HEX_CORNER_FACTOR = 1 / math.cos(math.radians(30))
#: points sampled along each edge when reading a part's outline (edges of planes parallel to
#: the axis and cylinder seams give the outline along the axis)
EDGE_SAMPLES = 9
#: bins along the axis when the shank is read from the outline alone
OUTLINE_BINS = 40
#: a headless part is a set screw when its length is at most this many diameters, else a stud
#: (ISO 4026-4029 lengths reach about 3 d at most common sizes; from memory)
SET_SCREW_MAX_LENGTH_RATIO = 4.0


@dataclass
class SizeHint:
    """A size read from a part name."""

    designation: str          # "M10", "M10x1.25", "1/2-13 UNC"
    d: float                  # nominal diameter, mm
    length: float | None      # mm, when the name gives one


@dataclass
class Bolt:
    """A modelled bolt or cap screw (mm, model coordinates)."""

    part: str
    ref: np.ndarray           # a point on the axis
    direction: np.ndarray     # unit, from the head to the tip
    d: float                  # shank diameter as modelled (threads not modelled: the nominal)
    length: float             # nominal length: bearing face to the tip (countersunk: overall)
    head_kind: str            # a head kind of catalog.HEAD_KINDS
    head_height: float
    head_width: float         # across flats (hex, flange) or head diameter (round heads)
    bearing_diameter: float   # outer diameter of the bearing face (washer face, underside, flange)
    bearing_point: np.ndarray  # centre of the bearing face (under the head; countersunk: the head's top)
    hint: SizeHint | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)
    designation: object = None   # catalog.Designation read from the product name, or None
    nut_head: str | None = None  # a stud: the nut that is its head (the part name)

    @property
    def tip_point(self) -> np.ndarray:
        return self.bearing_point + self.length * self.direction


@dataclass
class Nut:
    part: str
    ref: np.ndarray
    direction: np.ndarray     # canonical axis direction
    d: float                  # bore diameter as modelled
    width: float              # across flats
    height: float
    t0: float                 # axial extent along direction from ref
    t1: float
    bearing_diameter: float   # across flats, the washer face or the flange
    hint: SizeHint | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)
    kind: str = "hex"         # "hex" | "square" | "flange" | "lock"
    designation: object = None


@dataclass
class Washer:
    part: str
    ref: np.ndarray
    direction: np.ndarray
    inner: float
    outer: float
    thickness: float
    t0: float
    t1: float
    hint: SizeHint | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)
    designation: object = None


@dataclass
class Headless:
    """A threaded part without a head: a set screw, or a stud / threaded rod (mm)."""

    part: str
    kind: str                 # "set screw" | "stud"
    ref: np.ndarray
    direction: np.ndarray     # canonical axis direction
    d: float                  # diameter as modelled
    t0: float                 # axial extent along direction from ref
    t1: float
    hint: SizeHint | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)
    designation: object = None

    @property
    def length(self) -> float:
        return self.t1 - self.t0


def size_hint(name: str) -> SizeHint | None:
    """A thread size (and length) written in a part name: "bolt_M10x40_1", "cap_1/2-13x2".

    >>> size_hint("bolt_M10x40_1").designation, size_hint("bolt_M10x40_1").length
    ('M10', 40.0)
    """
    return _hint_of(_designation(name))


def _designation(name: str | None):
    from geomjoint.catalog.designation import parse_designation

    try:
        return parse_designation(name)
    except Exception:  # noqa: BLE001 - the catalog is optional for recognition itself
        return None


def _named_hole_part(name: str) -> bool:
    """True when the name calls the part a pin, shaft, bushing, tube or insert (the one word table
    of what sits in holes, catalog.hole_parts): no fastener of its own."""
    from geomjoint.catalog.hole_parts import INSERT_KINDS, NON_FASTENER_KINDS, hole_part_kind

    return hole_part_kind(name) in (*NON_FASTENER_KINDS, *INSERT_KINDS)


def _hint_of(desig) -> SizeHint | None:
    if desig is None or desig.thread is None:
        return None
    return SizeHint(desig.thread, desig.d, desig.length)


def thread_for_diameter(d: float, system: str | None = None):
    """The coarse (UNC) thread whose nominal diameter matches `d` within SIZE_TOL, or None."""
    from geomjoint import catalog

    best = None
    for t in catalog.thread_sizes(system):
        if t.series not in ("coarse", "UNC"):
            continue
        err = abs(t.d - d) / t.d
        if err <= SIZE_TOL and (best is None or err < best[0]):
            best = (err, t)
    return best[1] if best else None


def thread_fits_diameter(t, d: float) -> bool:
    """True when a part modelled at diameter `d` can be of thread `t`: at the nominal, the
    pitch diameter or either minor diameter (fastener libraries model threads at any of them),
    within SIZE_TOL."""
    return any(abs(x - d) <= SIZE_TOL * t.d for x in (t.d, t.d2, t.d3, t.D1))


# ----------------------------------------------------------------------------- the part's outline

@dataclass
class _Face:
    """One face of a hardware candidate: its kind and points sampled on its edges."""

    kind: str                  # "plane" | "cylinder" | "cone" | "other"
    points: np.ndarray         # (n, 3)
    normal: np.ndarray | None = None      # plane: outward unit normal
    axis: tuple | None = None             # cylinder / cone: (point, unit direction)
    semi_angle: float | None = None       # cone, rad
    outward: bool = True                  # cylinder / cone: material inside the surface


def _vec(p) -> np.ndarray:
    return np.array([p.X(), p.Y(), p.Z()])


def _edge_points(face) -> np.ndarray:
    pts = []
    for edge in topology.edges(face):
        if BRep_Tool.Degenerated_s(edge):
            continue
        c = BRepAdaptor_Curve(edge)
        u0, u1 = c.FirstParameter(), c.LastParameter()
        if not (math.isfinite(u0) and math.isfinite(u1)):
            continue
        for u in np.linspace(u0, u1, EDGE_SAMPLES):
            pts.append(_vec(c.Value(float(u))))
    for v in topology.vertices(face):
        pts.append(_vec(BRep_Tool.Pnt_s(v)))
    return np.array(pts) if pts else np.zeros((0, 3))


def _faces_of(solid: TopoDS_Shape) -> list[_Face]:
    from OCP.BRepTools import BRepTools
    from OCP.gp import gp_Pnt, gp_Vec

    out = []
    for face in topology.faces(solid):
        ad = BRepAdaptor_Surface(face)
        kind = ad.GetType()
        pts = _edge_points(face)
        if kind not in (GeomAbs_Plane, GeomAbs_Cylinder, GeomAbs_Cone):
            out.append(_Face("other", pts))
            continue
        umin, umax, vmin, vmax = BRepTools.UVBounds_s(face)
        p, du, dv = gp_Pnt(), gp_Vec(), gp_Vec()
        ad.D1(0.5 * (umin + umax), 0.5 * (vmin + vmax), p, du, dv)
        nrm = du.Crossed(dv)
        if nrm.Magnitude() < 1e-12:
            out.append(_Face("other", pts))
            continue
        nv = _vec(nrm) / nrm.Magnitude()
        if face.Orientation() == TopAbs_REVERSED:
            nv = -nv
        if kind == GeomAbs_Plane:
            out.append(_Face("plane", pts, normal=nv))
            continue
        ax = ad.Cylinder().Axis() if kind == GeomAbs_Cylinder else ad.Cone().Axis()
        o, d = _vec(ax.Location()), _vec(ax.Direction())
        pm = _vec(p)
        radial = (pm - o) - np.dot(pm - o, d) * d
        out.append(_Face("cylinder" if kind == GeomAbs_Cylinder else "cone", pts, axis=(o, d),
                         semi_angle=ad.Cone().SemiAngle() if kind == GeomAbs_Cone else None,
                         outward=float(np.dot(nv, radial)) > 0.0))
    return out


@dataclass
class _Outline:
    """A part seen along one axis: every sampled point's (t, r) and its faces."""

    ref: np.ndarray
    d: np.ndarray
    faces: list[_Face]
    t: np.ndarray
    r: np.ndarray

    @classmethod
    def of(cls, faces: list[_Face], ref: np.ndarray, d: np.ndarray) -> "_Outline":
        pts = np.vstack([f.points for f in faces if len(f.points)]) if faces else np.zeros((0, 3))
        t, r = _tr(pts, ref, d)
        return cls(ref, d, faces, t, r)

    def tr(self, f: _Face) -> tuple[np.ndarray, np.ndarray]:
        return _tr(f.points, self.ref, self.d)

    def coaxial(self, f: _Face) -> bool:
        if f.axis is None:
            return False
        o, fd = f.axis
        if abs(abs(float(np.dot(fd, self.d))) - 1) > ANGLE_TOL * 10:
            return False
        off = (o - self.ref) - np.dot(o - self.ref, self.d) * self.d
        return float(np.linalg.norm(off)) < 10 * LINEAR_TOL


def _tr(pts: np.ndarray, ref: np.ndarray, d: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    if len(pts) == 0:
        return np.zeros(0), np.zeros(0)
    rel = pts - ref
    t = rel @ d
    r = np.linalg.norm(rel - np.outer(t, d), axis=1)
    return t, r


def _merged_outer(patches: list[SurfacePatch]) -> list[SurfacePatch]:
    """Outer cylinders of a part with the split halves (and thirds) of one surface joined:
    fastener libraries write a cylinder as two half faces; each alone wraps only pi."""
    out: list[SurfacePatch] = []
    for group in group_by_axis([p for p in patches if not p.is_hole and p.kind == "cylinder"]):
        merged: list[SurfacePatch] = []
        for p in sorted(group, key=lambda q: (round(q.r0, 3), q.t0)):
            for m in merged:
                if (abs(m.r0 - p.r0) < LINEAR_TOL and abs(m.t0 - p.t0) < LINEAR_TOL
                        and abs(m.t1 - p.t1) < LINEAR_TOL):
                    m.wrap += p.wrap
                    break
            else:
                merged.append(SurfacePatch(p.kind, p.ref, p.direction, p.t0, p.t1, p.r0, p.r1, p.wrap, False))
        out += [m for m in merged if m.wrap >= MIN_WRAP]
    return out


def _principal_axis(solid: TopoDS_Shape) -> tuple[np.ndarray, np.ndarray] | None:
    """The axis of a body of revolution without cylinders (a thread modelled as a helix): the
    principal axis of inertia whose moment differs from the other two."""
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(solid, props)
    if props.Mass() <= 0:
        return None
    pp = props.PrincipalProperties()
    moments = pp.Moments()
    i1, i2, i3 = moments
    axes = [pp.FirstAxisOfInertia(), pp.SecondAxisOfInertia(), pp.ThirdAxisOfInertia()]
    pairs = [(abs(i2 - i3), 0), (abs(i1 - i3), 1), (abs(i1 - i2), 2)]
    _, k = min(pairs)
    d = canonical_direction(_vec(axes[k]))
    return axis_reference(_vec(props.CentreOfMass()), d), d


# ----------------------------------------------------------------------------- recognition

def recognise(part: str, faces: SolidFaces, holes: list[Hole], solid=None,
              label: str | None = None) -> Bolt | Nut | Washer | Headless | None:
    """Classify one part as a bolt, nut, washer, set screw or stud, or None (a member).

    ``label`` is the name its designation is read from (default: ``part``; the scan passes
    the product name and the part name together).
    """
    n_faces = len(faces.patches) + len(faces.planes)
    if solid is not None and sum(1 for _ in topology.faces(solid)) > MAX_HARDWARE_FACES:
        return None
    desig = _designation(label or part)
    if desig is not None and desig.family == "other":
        return None                       # a bearing ring, a spacer, a lead screw: named as no fastener
    if (desig is None or desig.family is None) and _named_hole_part(label or part):
        return None                       # a pin, shaft, bushing, tube or insert by its name (catalog.hole_parts)
    hint = _hint_of(desig)
    through = [h for h in holes if h.through]
    if len(through) == 1 and all(_same_axis(h, through[0]) for h in holes):
        return _nut_or_washer(part, faces, through[0], solid, desig, hint)
    if not holes and solid is not None and desig is not None and desig.family == "nut":
        bore = _drawn_bore(solid, faces)             # a bore drawn as B-spline faces
        if bore is not None:
            return _nut_or_washer(part, faces, bore, solid, desig, hint)
    if through or solid is None or n_faces == 0:
        return None
    outer = _merged_outer(faces.patches)
    family = desig.family if desig is not None else None
    named = family in ("bolt", "set screw", "stud")
    if outer:
        best = None
        for group in group_by_axis(outer):
            total = sum(p.t1 - p.t0 for p in group)
            if best is None or total > best[0]:
                best = (total, group)
        group = best[1]
        long_enough = [r for r, length in _runs(group) if length >= SHANK_MIN_LENGTH_RATIO * 2 * r]
        r_small = min(long_enough) if long_enough else min(p.r0 for p in group)
        shank_secs = [p for p in group if p.r0 <= SHANK_STEP_RATIO * r_small]
        outline = _Outline.of(_faces_of(solid), group[0].ref, group[0].direction)
        found = _headless_or_bolt(part, outline, shank_secs, solid, desig, hint)
        if found is not None or not named:
            return found
        # a named fastener whose only full cylinders are not its shank (a thread drawn as rings)
        return _headless_or_bolt(part, outline, None, solid, desig, hint)
    if not named:
        return None
    axis = _partial_cylinder_axis(faces.patches) or _principal_axis(solid)
    if axis is None:
        return None
    return _headless_or_bolt(part, _Outline.of(_faces_of(solid), *axis), None, solid, desig, hint)


def _runs(group: list[SurfacePatch]) -> list[tuple[float, float]]:
    """(radius, length) of each run of coaxial cylinders of one radius that touch end to end:
    a core cylinder cut into strips by a helical thread is one run."""
    out = []
    by_r: dict[float, list[SurfacePatch]] = {}
    for p in group:
        by_r.setdefault(round(p.r0, 3), []).append(p)
    for r, ps in by_r.items():
        ps = sorted(ps, key=lambda q: q.t0)
        start, end = ps[0].t0, ps[0].t1
        for q in ps[1:]:
            if q.t0 <= end + 10 * LINEAR_TOL:
                end = max(end, q.t1)
            else:
                out.append((ps[0].r0, end - start))
                start, end = q.t0, q.t1
        out.append((ps[0].r0, end - start))
    return out


def _partial_cylinder_axis(patches: list[SurfacePatch]) -> tuple[np.ndarray, np.ndarray] | None:
    """The axis carrying the most outer cylinder surface (wrap x length), partial faces
    included: the axis of a thread drawn as rings of half cylinders."""
    best = None
    for group in group_by_axis([p for p in patches if not p.is_hole and p.kind == "cylinder"]):
        weight = sum(p.wrap * (p.t1 - p.t0) for p in group)
        if best is None or weight > best[0]:
            best = (weight, group[0].ref, group[0].direction)
    return (best[1], best[2]) if best else None


def _drawn_bore(solid, faces: SolidFaces) -> Hole | None:
    """The through bore of a named nut whose bore is not a cylinder (B-spline faces): on the
    principal axis of largest moment (the axis of a flat part), the non-planar faces all at one
    radius over the whole height."""
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(solid, props)
    if props.Mass() <= 0:
        return None
    pp = props.PrincipalProperties()
    axes = [pp.FirstAxisOfInertia(), pp.SecondAxisOfInertia(), pp.ThirdAxisOfInertia()]
    k = int(np.argmax(pp.Moments()))
    d = canonical_direction(_vec(axes[k]))
    ref = axis_reference(_vec(props.CentreOfMass()), d)
    o = _Outline.of(_faces_of(solid), ref, d)
    inner = [f for f in o.faces if f.kind == "other" and len(f.points)]
    if not inner:
        return None
    t, r = _tr(np.vstack([f.points for f in inner]), ref, d)
    a0, a1 = float(o.t.min()), float(o.t.max())
    if np.ptp(r) > 0.02 * r.mean() or t.min() > a0 + 10 * LINEAR_TOL or t.max() < a1 - 10 * LINEAR_TOL:
        return None
    return Hole(part="", ref=ref, direction=d, t0=a0, t1=a1, diameter=2 * float(r.mean()), sections=[])


def _same_axis(a: Hole, b: Hole) -> bool:
    return (abs(abs(float(np.dot(a.direction, b.direction))) - 1) < ANGLE_TOL
            and np.linalg.norm(a.ref - b.ref) < 10 * LINEAR_TOL)


def _headless_or_bolt(part, o: _Outline, shank_secs, solid, desig, hint):
    if len(o.t) == 0:
        return None
    a0, a1 = float(o.t.min()), float(o.t.max())
    if shank_secs:
        s0 = min(p.t0 for p in shank_secs)
        s1 = max(p.t1 for p in shank_secs)
        r_nom = max(p.r0 for p in shank_secs)
        # a thread drawn over a core at the minor diameter: its crest is the nominal
        margin = 0.05 * (s1 - s0)
        inside = (o.t > s0 + margin) & (o.t < s1 - margin)
        if np.any(inside):
            crest = float(o.r[inside].max())
            if r_nom < crest <= THREAD_CREST_RATIO * r_nom:
                r_nom = crest
    else:
        # no cylinder: the narrow end of the outline is the shank
        s0, s1, r_nom = _shank_from_outline(o, a0, a1)
        if r_nom is None:
            return None
    tol = LINEAR_TOL * 10
    wide = SHANK_STEP_RATIO * r_nom
    r_below = float(o.r[o.t < s0 - tol].max()) if np.any(o.t < s0 - tol) else 0.0
    r_above = float(o.r[o.t > s1 + tol].max()) if np.any(o.t > s1 + tol) else 0.0
    head_below, head_above = r_below > wide, r_above > wide
    if head_below and head_above:
        return None                       # collars at both ends: a shaft, a spacer
    if not (head_below or head_above):
        return _headless(part, o, a0, a1, r_nom, solid, desig, hint)
    head_at_start = head_below
    direction = o.d if head_at_start else -o.d
    # u: distance from the shank end towards the head's top
    shank_end = s0 if head_at_start else s1
    top = a0 if head_at_start else a1
    k_total = abs(shank_end - top)
    if k_total < MIN_HEAD_HEIGHT_RATIO * 2 * r_nom:
        return None
    in_head = (o.t <= s0 + tol) if head_at_start else (o.t >= s1 - tol)
    R = float(o.r[in_head].max())
    if not MIN_HEAD_WIDTH_RATIO * 2 * r_nom <= 2 * R <= MAX_HEAD_WIDTH_RATIO * HEX_CORNER_FACTOR * 2 * r_nom:
        return None
    tip = a1 if head_at_start else a0
    sign = 1.0 if head_at_start else -1.0       # +: t grows from the head to the tip

    def towards_tip(t):                          # distance below the top, >= 0 inside the head
        return sign * (t - top)

    head_faces = []
    for f in o.faces:
        ft, fr = o.tr(f)
        if len(ft) and np.all(towards_tip(ft) <= towards_tip(shank_end) + 10 * tol):
            head_faces.append((f, ft, fr))
    bearing = _bearing_plane(o, head_faces, direction, r_nom, towards_tip)
    csk = _countersunk_cone(o, head_faces, r_nom, R, towards_tip, shank_end)
    t = _thread_of(2 * r_nom, desig)
    if csk is not None and bearing is None:
        width = 2 * csk
        return Bolt(part, o.ref, direction, 2 * r_nom, abs(tip - top), "countersunk", k_total, width, width,
                    o.ref + top * o.d, hint, solid, desig)
    t_bear = bearing[0] if bearing is not None else shank_end
    k = abs(t_bear - top)
    length = abs(tip - t_bear)
    af = _prism_width(o, [hf for hf in head_faces], 6)
    if af is not None and MIN_HEAD_WIDTH_RATIO * 2 * r_nom <= af <= MAX_HEAD_WIDTH_RATIO * 2 * r_nom:
        if k > HEX_MAX_HEIGHT_RATIO * 2 * r_nom:
            return None                  # a male-female hex standoff, a hex spacer on a pin
        corners = af * HEX_CORNER_FACTOR
        if R > FLANGE_OVER_CORNERS * corners / 2:
            kind, bd = "flange", 2 * (bearing[1] if bearing is not None else R)
        else:
            kind, bd = _hex_kind(af, t), min(2 * bearing[1], af) if bearing is not None else af
        return Bolt(part, o.ref, direction, 2 * r_nom, length, kind, k, af, bd,
                    o.ref + t_bear * o.d, hint, solid, desig)
    kind = _round_kind(o, head_faces, R, k, r_nom, t, desig, towards_tip, top)
    if kind is None:
        return None
    bd = 2 * bearing[1] if bearing is not None else 2 * R
    return Bolt(part, o.ref, direction, 2 * r_nom, length, kind, k, 2 * R, min(bd, 2 * R),
                o.ref + t_bear * o.d, hint, solid, desig)


def _shank_from_outline(o: _Outline, a0: float, a1: float):
    """(s0, s1, r) of the shank of an outline without shank cylinders (a helical thread, a
    thread drawn as rings): the narrower end is the shank's; it runs from there while the
    outline stays within SHANK_STEP_RATIO of that end's radius."""
    span = a1 - a0
    if span <= 0:
        return a0, a1, None
    nb = OUTLINE_BINS
    idx = np.clip(((o.t - a0) / span * nb).astype(int), 0, nb - 1)
    rmax = np.full(nb, np.nan)
    np.fmax.at(rmax, idx, o.r)
    quarter = max(1, nb // 4)
    r_start, r_end = np.nanmax(rmax[:quarter]), np.nanmax(rmax[-quarter:])
    if not (np.isfinite(r_start) and np.isfinite(r_end)):
        return a0, a1, None
    from_start = r_start <= r_end
    r = float(min(r_start, r_end))
    if r <= 0:
        return a0, a1, None
    order = range(nb) if from_start else range(nb - 1, -1, -1)
    last = None
    for j in order:
        if np.isfinite(rmax[j]) and rmax[j] > SHANK_STEP_RATIO * r:
            break
        last = j
    width = span / nb
    if from_start:
        return a0, a0 + (last + 1) * width, r
    return a0 + last * width, a1, r


def _bearing_plane(o: _Outline, head_faces, direction, r_nom, towards_tip):
    """(t, outer radius) of the underside plane nearest the tip: an annulus facing the tip
    whose outer edge is wider than the shank (a washer face's underside, where there is one)."""
    best = None
    for f, ft, fr in head_faces:
        if f.kind != "plane" or float(np.dot(f.normal, direction)) < 1 - 1e-6:
            continue
        if np.ptp(ft) > 10 * LINEAR_TOL or fr.max() < BEARING_MIN_RADIUS_RATIO * r_nom:
            continue
        t0 = float(ft.mean())
        if best is None or towards_tip(t0) > towards_tip(best[0]):
            best = (t0, float(fr.max()))
    return best


def _countersunk_cone(o: _Outline, head_faces, r_nom, R, towards_tip, shank_end):
    """Large radius of the seat cone of a countersunk head, or None: a cone under the head that
    starts at the shank, widens towards the top to the head diameter and opens at one of
    COUNTERSUNK_ANGLES."""
    for f, ft, fr in head_faces:
        if f.kind != "cone" or not f.outward or not o.coaxial(f):
            continue
        included = 2 * math.degrees(abs(f.semi_angle))
        if not any(abs(included - a) <= CSK_ANGLE_TOL for a in COUNTERSUNK_ANGLES):
            continue
        depth = towards_tip(ft)          # larger: nearer the tip
        i_low, i_high = int(np.argmax(depth)), int(np.argmin(depth))
        r_low, r_high = float(fr[i_low]), float(fr[i_high])
        if r_high <= r_low:               # narrows towards the top: a chamfer, not a seat
            continue
        if r_low > CSK_SMALL_END_RATIO * r_nom or r_high < CSK_LARGE_END_SHARE * R:
            continue
        return r_high
    return None


def _prism_width(o: _Outline, head_faces, n_sides: int, height: float | None = None) -> float | None:
    """Width across flats of an outward prism of `n_sides` planes parallel to the axis, or None.

    With ``height``, each flat must run over PRISM_MIN_HEIGHT_SHARE of it (knurls, lettering and
    small flats of an insert are no prism)."""
    flats = []
    for f, ft, fr in head_faces:
        if f.kind != "plane" or abs(float(np.dot(f.normal, o.d))) > ANGLE_TOL * 10:
            continue
        if height is not None and np.ptp(ft) < PRISM_MIN_HEIGHT_SHARE * height:
            continue
        p = f.points.mean(axis=0)
        rel = (p - o.ref) - np.dot(p - o.ref, o.d) * o.d
        dist = float(np.dot(rel, f.normal))
        if dist <= 0:                     # faces the axis: a socket's flat, not the head's
            continue
        flats.append((dist, f.normal))
    if len(flats) < n_sides:
        return None
    flats.sort(key=lambda x: x[0])
    u, v = axis_frame(o.d)
    for i in range(len(flats) - n_sides + 1):
        d0 = flats[i][0]
        same = [n for dist, n in flats if abs(dist - d0) < 10 * LINEAR_TOL * max(1.0, d0 / 10)]
        if len(same) < n_sides:
            continue
        # the flats' directions: exactly n_sides of them, evenly spaced (a knurl has many more)
        angles = sorted({round(math.degrees(math.atan2(float(n @ v), float(n @ u))) % 360.0, 1) % 360.0 for n in same})
        step = 360.0 / n_sides
        if len(angles) == n_sides and all(abs((b - a) - step) < 0.5 for a, b in zip(angles, angles[1:])):
            return 2 * d0
        return None
    return None


def _hex_kind(af: float, t) -> str:
    """"heavy hex" when the width across flats is nearer the catalogue's heavy hex head of the
    size than its regular one (ASME B18.2.1 heavy hex F = 1.5 D + 1/8 in against 1.5 D), else "hex"."""
    from geomjoint import catalog
    from geomjoint.errors import InputError

    if t is None:
        return "hex"
    try:
        regular, heavy = catalog.head(t, "hex").width, catalog.head(t, "heavy hex").width
    except InputError:
        return "hex"
    return "heavy hex" if abs(af - heavy) < abs(af - regular) else "hex"


def _thread_of(d_model: float, desig):
    """The thread of a part modelled at diameter `d_model`: the designation's when the model
    fits it (at the nominal or a minor diameter), else the coarse thread of that diameter."""
    from geomjoint import catalog
    from geomjoint.errors import InputError

    if desig is not None and desig.thread:
        try:
            t = catalog.thread(desig.thread)
        except InputError:
            t = None
        if t is not None and thread_fits_diameter(t, d_model):
            return t
    return thread_for_diameter(d_model)


def _round_kind(o, head_faces, R, k, r_nom, t, desig, towards_tip, top) -> str | None:
    """The kind of a round head: the catalogue kind of the size whose d_k and k it is nearest,
    among those its shape allows (a flat top with a high cylindrical side: socket or cheese;
    else button or pan); the product name's kind breaks a tie."""
    from geomjoint import catalog
    from geomjoint.errors import InputError

    side = 0.0
    for f, ft, fr in head_faces:
        if f.kind == "cylinder" and f.outward and o.coaxial(f) and abs(float(fr.max()) - R) < 0.02 * R:
            side = max(side, float(np.ptp(ft)))
    side = max(side, _side_from_outline(o, top, k, R, towards_tip))
    flat_top = False
    for f, ft, fr in head_faces:
        if (f.kind == "plane" and abs(abs(float(np.dot(f.normal, o.d))) - 1) < 1e-6
                and np.ptp(ft) < 10 * LINEAR_TOL and abs(float(ft.mean()) - top) < 0.05 * k
                and float(fr.max()) >= FLAT_TOP_SHARE * R):
            flat_top = True
    flat = flat_top and side >= FLAT_HEAD_SIDE_SHARE * k
    allowed = ("socket", "cheese") if flat else ("button", "pan", "pan slotted")
    scores = {}
    if t is not None:
        for kind in ROUND_KINDS:
            try:
                h = catalog.head(t, kind)
            except InputError:
                continue
            scores[kind] = abs(math.log(2 * R / h.width)) + abs(math.log(k / h.height))
    named = None
    if desig is not None and desig.family == "bolt" and desig.kind in ROUND_KINDS:
        named = desig.kind
    shaped = {kd: s for kd, s in scores.items() if kd in allowed}
    if shaped:
        best = min(shaped, key=shaped.get)
        if named in scores and scores[named] <= shaped[best] + ROUND_KIND_TIE:
            return named
        if shaped[best] <= ROUND_KIND_MAX_MISFIT:
            return best
    if named is not None:
        return named
    if desig is None or desig.family != "bolt":
        return None          # a round-headed part like no catalogue head, not named a screw: a shaft, a tool
    if k >= SOCKET_MIN_HEIGHT_RATIO * 2 * r_nom:
        return "socket"
    return "cheese" if flat else "button"


def _side_from_outline(o: _Outline, top: float, k: float, R: float, towards_tip) -> float:
    """Height over which a head's outline stays at its full radius (within SIDE_RADIUS_SHARE),
    from the outline's points: a knurled side is no cylinder but stands as high as one."""
    if k <= 0:
        return 0.0
    depth = towards_tip(o.t)
    sel = (depth >= 0) & (depth <= k)
    if not np.any(sel):
        return 0.0
    idx = np.clip((depth[sel] / k * SIDE_BINS).astype(int), 0, SIDE_BINS - 1)
    rmax = np.full(SIDE_BINS, np.nan)
    np.fmax.at(rmax, idx, o.r[sel])
    seen = np.isfinite(rmax)
    if seen.sum() < SIDE_BINS // 2:
        return 0.0                        # too few points to tell (a smooth side of few edges)
    return float(k * np.sum(rmax[seen] >= SIDE_RADIUS_SHARE * R) / seen.sum())


def _headless(part, o: _Outline, a0, a1, r_nom, solid, desig, hint):
    """A set screw or a stud (see the module docstring), else None (a pin, a rod, a shaft)."""
    family = desig.family if desig is not None else None
    length = a1 - a0
    if family == "stud":
        kind = "stud"
    elif family == "set screw":
        kind = "set screw"
    elif _has_socket(o, a0, a1, r_nom) and length <= SET_SCREW_MAX_LENGTH_RATIO * 2 * r_nom \
            and thread_for_diameter(2 * r_nom) is not None:
        kind = "set screw"
    else:
        return None
    return Headless(part, kind, o.ref, o.d, 2 * r_nom, a0, a1, hint, solid, desig)


def _has_socket(o: _Outline, a0, a1, r_nom) -> bool:
    """Six planes parallel to the axis facing it, near one end: a hexagon socket."""
    dists = []
    for f in o.faces:
        if f.kind != "plane" or abs(float(np.dot(f.normal, o.d))) > ANGLE_TOL * 10:
            continue
        p = f.points.mean(axis=0)
        rel = (p - o.ref) - np.dot(p - o.ref, o.d) * o.d
        dist = float(np.dot(rel, f.normal))
        if dist < 0 and -dist < r_nom:
            dists.append(-dist)
    if len(dists) < 6:
        return False
    dists.sort()
    return any(dists[i + 5] - dists[i] < 10 * LINEAR_TOL for i in range(len(dists) - 5))


def _nut_or_washer(part, faces: SolidFaces, h: Hole, solid, desig, hint) -> Nut | Washer | None:
    a0, a1 = _extent(faces.vertices, h.ref, h.direction)
    height = a1 - a0
    outer = _merged_outer(faces.patches)
    ring = [p for p in outer if np.linalg.norm(p.ref - h.ref) < 10 * LINEAR_TOL
            and abs(abs(float(np.dot(p.direction, h.direction))) - 1) < ANGLE_TOL]
    o = _Outline.of(_faces_of(solid), h.ref, h.direction) if solid is not None else None
    R = end_r = 0.0
    if o is not None:
        hf = [(f, *o.tr(f)) for f in o.faces if len(f.points)]
        R = float(o.r.max()) if len(o.r) else 0.0
        end_r = _end_face_radius(o, hf, a0, a1)
        af = _prism_width(o, hf, 6, height)
        kind = "hex"
        if af is None:
            af = _prism_width(o, hf, 4, height)
            kind = "square"
            # a square plate with one hole is no nut: a square nut has a thread's bore and
            # the proportions of DIN 557 / DIN 562
            t_sq = _thread_by_bore(h.diameter) if af is not None else None
            if (t_sq is None or af > SQUARE_NUT_MAX_WIDTH_RATIO * t_sq.d + SQUARE_NUT_WIDTH_ALLOWANCE
                    or R > PRISM_CORNER_TOL * af / math.sqrt(2)):
                af = None
        if af is None and desig is not None and desig.family == "nut":
            af = _rectangle_width(o, hf, height)     # a named nut drawn as a rectangular block
            kind = "square"
    else:
        af = _hex_width(faces, h.ref, h.direction)
        kind = "hex"
    # a bore drawn at the thread's minor diameter: the nut's proportions are to the nominal (the
    # name's thread, else the largest thread the bore can be: 2.46 mm is M2.5 or M3's D1)
    t_bore = _nut_thread(h.diameter, desig) if af else None
    d_ref = max(h.diameter, t_bore.d) if t_bore is not None else h.diameter
    if (af and MIN_HEAD_WIDTH_RATIO * h.diameter <= af <= MAX_HEAD_WIDTH_RATIO * h.diameter
            and height <= NUT_MAX_HEIGHT_RATIO * d_ref):
        corners = af * HEX_CORNER_FACTOR
        # the bearing face: the wider end face as far as it reaches (a chamfered nut's circle),
        # at most the flats
        bearing = min(af, 2 * end_r) if end_r > h.diameter / 2 else af
        if kind == "hex" and R > FLANGE_OVER_CORNERS * corners / 2:
            kind, bearing = "flange", 2 * R
        elif kind == "hex":
            named_lock = desig is not None and desig.family == "nut" and desig.kind == "lock"
            if named_lock or (t_bore is not None and height > LOCK_NUT_MIN_HEIGHT_RATIO * t_bore.d):
                kind = "lock"
        return Nut(part, h.ref, h.direction, h.diameter, af, height, a0, a1, bearing, hint, solid, kind, desig)
    named_washer = desig is not None and desig.family == "washer"
    max_t = WASHER_MAX_THICKNESS_RATIO if named_washer else UNNAMED_WASHER_MAX_THICKNESS_RATIO
    min_od = MIN_HEAD_WIDTH_RATIO if named_washer else UNNAMED_WASHER_MIN_OD_RATIO
    if ring and height <= max_t * h.diameter:
        od = 2 * max(p.r0 for p in ring)
        if min_od * h.diameter <= od <= WASHER_MAX_OD_RATIO * h.diameter:
            return Washer(part, h.ref, h.direction, h.diameter, od, height, a0, a1, hint, solid, desig)
    return None


def _rectangle_width(o: _Outline, hf, height: float) -> float | None:
    """The smaller width of a rectangular prism around the axis (two pairs of opposite outward
    planes parallel to it, at right angles), or None."""
    flats = []
    for f, ft, fr in hf:
        if f.kind != "plane" or abs(float(np.dot(f.normal, o.d))) > ANGLE_TOL * 10:
            continue
        if np.ptp(ft) < PRISM_MIN_HEIGHT_SHARE * height:
            continue
        p = f.points.mean(axis=0)
        rel = (p - o.ref) - np.dot(p - o.ref, o.d) * o.d
        dist = float(np.dot(rel, f.normal))
        if dist > 0:
            flats.append((f.normal, dist))
    widths = []
    for i, (n1, d1) in enumerate(flats):
        for n2, d2 in flats[i + 1:]:
            if float(np.dot(n1, n2)) < -1 + 1e-6:
                widths.append((n1, d1 + d2))
    for i, (n1, w1) in enumerate(widths):
        for n2, w2 in widths[i + 1:]:
            if abs(float(np.dot(n1, n2))) < 1e-6:
                return min(w1, w2)
    return None


def _end_face_radius(o: _Outline, hf, a0: float, a1: float) -> float:
    """How far out the wider of a nut's two end faces reaches (planes normal to the axis at
    either end), mm; 0 when an end has no such face.  The wider end bears: a nylon-insert nut's
    collar never does."""
    reach = {}
    for f, ft, fr in hf:
        if f.kind != "plane" or abs(abs(float(np.dot(f.normal, o.d))) - 1) > 1e-6 or np.ptp(ft) > 10 * LINEAR_TOL:
            continue
        for end in (a0, a1):
            if abs(float(ft.mean()) - end) < 10 * LINEAR_TOL:
                reach[end] = max(reach.get(end, 0.0), float(fr.max()))
    return max(reach.values()) if len(reach) == 2 else 0.0


def _nut_thread(bore: float, desig):
    """The thread a nut's bore is: the name's where the bore fits it, else the largest coarse
    thread whose nominal, minor diameter or tap drill the bore is."""
    from geomjoint import catalog
    from geomjoint.errors import InputError

    if desig is not None and desig.thread:
        try:
            t = catalog.thread(desig.thread)
        except InputError:
            t = None
        if t is not None and (thread_fits_diameter(t, bore) or abs(catalog.tap_drill(t) - bore) <= SIZE_TOL * t.d):
            return t
    fits = [t for t, how in catalog.nominal_from_hole(bore)
            if how in ("nominal", "tap drill") and t.series in ("coarse", "UNC")]
    return max(fits, key=lambda t: t.d) if fits else None


def _thread_by_bore(bore: float):
    """The coarse thread whose nominal or minor diameter (or tap drill) a nut's bore is."""
    from geomjoint import catalog

    for t, how in catalog.nominal_from_hole(bore):
        if how in ("nominal", "tap drill") and t.series in ("coarse", "UNC"):
            return t
    return None


def _extent(vertices: np.ndarray, ref: np.ndarray, d: np.ndarray) -> tuple[float, float]:
    t = (vertices - ref) @ d
    return float(t.min()), float(t.max())


def _hex_width(faces: SolidFaces, ref, d) -> float | None:
    """Across-flats width of a hex prism on the axis (six planes parallel to it), or None."""
    dists = []
    for pl in faces.planes:
        if abs(float(np.dot(pl.normal, d))) > ANGLE_TOL * 10:
            continue
        dists.append(abs(float(np.dot(pl.point - ref, pl.normal))))
    if len(dists) < 6:
        return None
    dists.sort()
    for i in range(len(dists) - 5):
        if dists[i + 5] - dists[i] < 10 * LINEAR_TOL:
            return 2 * dists[i]
    return None


def stud_bolts(headless: list[Headless], nuts: list[Nut]) -> tuple[list[Bolt], set[str]]:
    """Studs with a nut on them, as bolts whose head is a nut; and the names of those nuts.

    A nut on a stud (coaxial, its bore fits the stud's thread, inside the stud's length) is
    the head; with two nuts the head is the one nearer the stud's end it sits at, and the
    stud's far end runs into the tapped part or through the other nut.  The bearing face is
    the head nut's face towards the far end; the length runs from it to the stud's far end.
    """
    bolts: list[Bolt] = []
    used: set[str] = set()
    for s in headless:
        if s.kind != "stud":
            continue
        on = []
        for n in nuts:
            if n.part in used:
                continue
            if abs(abs(float(np.dot(n.direction, s.direction))) - 1) > ANGLE_TOL * 10:
                continue
            off = (n.ref - s.ref) - np.dot(n.ref - s.ref, s.direction) * s.direction
            if float(np.linalg.norm(off)) > 10 * LINEAR_TOL or n.d > s.d + LINEAR_TOL * 10:
                continue
            sign = float(np.dot(n.direction, s.direction))
            n0, n1 = sorted((float(np.dot(n.ref - s.ref, s.direction)) + sign * n.t0,
                             float(np.dot(n.ref - s.ref, s.direction)) + sign * n.t1))
            if n0 >= s.t0 - 10 * LINEAR_TOL and n1 <= s.t1 + 10 * LINEAR_TOL:
                on.append((n, n0, n1))
        if not on:
            continue
        # the head nut: the one nearest either end of the stud
        n, n0, n1 = min(on, key=lambda x: min(x[1] - s.t0, s.t1 - x[2]))
        at_start = (n0 - s.t0) <= (s.t1 - n1)
        direction = s.direction if at_start else -s.direction
        face = n1 if at_start else n0
        far = s.t1 if at_start else s.t0
        bolts.append(Bolt(s.part, s.ref, direction, s.d, abs(far - face), "hex", n.height, n.width,
                          n.bearing_diameter, s.ref + face * s.direction, s.hint, s.solid, s.designation,
                          nut_head=n.part))
        used.add(n.part)
    return bolts, used


def rod_of_plug(plug, plugs: list) -> Headless | None:
    """A part that is one plain cylinder of a thread's nominal diameter (its only plug, no name
    that calls it a pin or shaft, its outline within SHANK_STEP_RATIO of the cylinder) as a stud
    candidate: :func:`stud_bolts` makes it a stud where a nut sits on it."""
    if plug.kind is not None or plug.solid is None:
        return None
    if sum(1 for p in plugs if p.part == plug.part) != 1:
        return None
    t = thread_for_diameter(plug.diameter)
    if t is None:
        return None
    o = _Outline.of(_faces_of(plug.solid), plug.ref, plug.direction)
    if len(o.r) == 0 or float(o.r.max()) > SHANK_STEP_RATIO * plug.diameter / 2:
        return None
    return Headless(plug.part, "stud", plug.ref, plug.direction, plug.diameter, float(o.t.min()), float(o.t.max()),
                    SizeHint(t.designation, t.d, None), plug.solid, None)
