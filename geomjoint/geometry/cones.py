"""Pressure cones clipped by the real part geometry → member compliance of a bolted joint.

Textbook member stiffness assumes every clamped plate is infinitely wide and alone.  Here
the two pressure cones of a joint (half-angle α from the head-side and nut-side bearing
diameters, meeting at mid-grip; for a tapped joint the far cone starts at the effective
grip l′ of Shigley Table 8-7, supplied by the caller) are cut by the material the parts
really have at each height z along the axis:

    A(z) = area( section of the part at z  ∩  disc of radius r(z) ) − π r_h²
    r(z) = d_w/2 + z·tanα            (head side, 0 ≤ z ≤ l/2)
    r(z) = d_w'/2 + (l − z)·tanα     (far side,  l/2 ≤ z ≤ l)

where two joints share a part, the material is divided between them along the bisecting
plane of their axes, so each point of a plate belongs to the nearest bolt.  The member
compliance is δ_m = ∫₀ˡ dz / (E(z)·A(z)) and k_m = 1/δ_m.

How A(z) is computed: the disc ∩ polygon area is exact for straight polygon edges (a sum
of circle–triangle areas over the edges, no polygonal disc).  The bolt's own hole (a
coaxial circular ring in the section, or any ring inside ``hole_diameter``) is filled in
the polygon and π·max(R_model, r_h)² is subtracted exactly, so an unclipped cone gives
π(r² − r_h²) to rounding.  Curved edges of the section (other holes, pockets) are sampled
with a chord deflection (sections.py).

Speed: the faces of each part are classified once (:class:`~geomjoint.geometry.sections.
FaceCatalog`).  A layer is split at planar faces perpendicular to the axis; a piece with
only side faces parallel to the axis (planes, cylinders, extrusions) within reach of the
cone is prismatic, sectioned once (the section of the whole part is cached and shared by
all joints of a model) and clipped in 2-D.  Other pieces are sectioned at each Gauss point.
The integral is Gauss–Legendre per piece, split at mid-grip, layer boundaries and the
heights where the disc starts to meet an edge or a corner, with adaptive halving.

Source of the cone model: Budynas & Nisbett, *Shigley's Mechanical Engineering Design*,
10th ed., §8-5, eq. (8-20) (frustum member stiffness) and Table 8-7 (effective grip).
"""
from __future__ import annotations

import dataclasses
import functools
import math
from dataclasses import dataclass, field
from typing import Callable, Sequence

import numpy as np
import shapely
from shapely import affinity
from shapely.geometry import MultiPolygon, Point, Polygon
from shapely.geometry.polygon import orient

from geomjoint.errors import InputError
from geomjoint.geometry.sections import (
    KIND_CYLINDER,
    KIND_EXTRUSION,
    KIND_PLANE,
    FaceCatalog,
    PlaneFrame,
    SectionCache,
    as_occ_shape,
    local_block,
    section_polygons,
)
from geomjoint.mechanics.members import hollow_frustum_compliance

#: pressure-cone half-angle, degrees (Shigley 10th ed., §8-5: α = 30° recommended)
DEFAULT_CONE_ANGLE_DEG = 30.0

# numerical tolerances of our own choosing (geometry in mm)
_PARALLEL_TOL = 1e-6        # |cos| below which a face normal is perpendicular to the axis
_LENGTH_TOL = 1e-7          # mm, coincidence of heights
_HOLE_FILL_TOL = 1e-5       # mm, roundness of a coaxial ring that is the bolt's own hole
_ADAPT_RTOL = 1e-9          # relative agreement of Gauss on a piece vs on its two halves
_ADAPT_DEPTH = 6            # max halvings of a prismatic piece
_ADAPT_DEPTH_SECTIONED = 1  # max halvings where every point costs a true section
_MANY_VERTICES = 64         # rings with more vertices give only min/max breakpoints
_FEW_FACES = 40             # parts with more faces are cut to a box before per-point sections
_COAXIAL_TOL = 1e-9         # mm, a neighbour axis this close to ours is the same axis (no bisector)
_HOLE_FILL_RTOL = 1e-6      # relative roundness of the bolt's own hole, beside _HOLE_FILL_TOL
_KEY_DIGITS = 9             # digits of a height (mm) in the caches' keys: far below any feature
_SIZE_KEY_DIGITS = 6        # digits of a window half-size (mm) in the box cache's key
_INSIDE_FRACTION = 1e-6     # a height is sampled this fraction of its region inside, so the
                            # section is of the region itself, not of a face at its boundary
_ROOT_TOL = 1e-15           # a contact height's linear equation with a smaller slope has no root
_CUT_CLEARANCE = 1e3 * _LENGTH_TOL  # mm, a face this close to a layer end is that end (no sliver region)
_RADIUS_KEY_DIGITS = 12     # digits (mm) to which equal breakpoint radii are merged
#: Gauss-Legendre points per integration piece: with the adaptive halving, 8 meet eq. (8-20)
#: to 1e-6 on unclipped cones (tests/test_cones.py) at a few sections per piece
DEFAULT_GAUSS_POINTS = 8
_GAUSS_CACHE = 32           # distinct point counts whose nodes are kept (a handful are used)

# section window and cutting sizes (ours): each only has to be large enough
#: half-size of the square window around the axis = reach x _WINDOW_SCALE + _WINDOW_MARGIN (mm):
#: 5 % and 1 mm beyond the cone's largest radius, so the disc never meets the window's edge
_WINDOW_SCALE = 1.05
_WINDOW_MARGIN = 1.0
#: a neighbour's half-plane is drawn _HALF_PLANE_SCALE x the window + _HALF_PLANE_MARGIN (mm):
#: its far edges lie well outside the window, so only the bisecting line cuts the section
_HALF_PLANE_SCALE = 4.0
_HALF_PLANE_MARGIN = 10.0
#: the box a many-faced part is cut to: 1 % wider than the window, and 1 mm + 1 % of the
#: layer's depth past either end, so no face of the window or the layer is a cut face
_BLOCK_SCALE = 1.01
_BLOCK_PAD = 1.0
_BLOCK_PAD_FRACTION = 0.01


def _window_size(reach: float) -> float:
    """Half-size (mm) of the section window around the axis for a cone radius of `reach` mm."""
    return _WINDOW_SCALE * reach + _WINDOW_MARGIN


def _just_inside(z: float, a: float, b: float) -> float:
    """The height z moved just inside [a, b] (see _INSIDE_FRACTION)."""
    return min(max(z, a + _INSIDE_FRACTION * (b - a)), b - _INSIDE_FRACTION * (b - a))


@dataclass
class ConeLayer:
    """One clamped layer of a joint, in the joint's axial coordinate.

    solid: located OCP ``TopoDS_Shape`` (or cadquery Shape) of the part; z_start, z_end:
    mm along the axis from the head bearing face; E: MPa; part: part name; hole_diameter:
    mm, the bolt hole in this layer.
    """

    solid: object
    z_start: float
    z_end: float
    E: float
    part: str
    hole_diameter: float


@dataclass
class ConeJoint:
    """A joint as the cone code needs it (plain numbers plus the part solids).

    axis_point: xyz of the centre of the head bearing face, mm; axis_direction: unit
    vector from the head to the nut side; bearing_diameter: head (or washer) bearing
    diameter, mm; far_bearing_diameter: nut/washer side (tapped: the same as the head,
    None → bearing_diameter); effective_grip: l′ for a tapped joint (Shigley Table 8-7),
    mm; None → the end of the last layer.
    """

    id: str
    axis_point: tuple[float, float, float]
    axis_direction: tuple[float, float, float]
    layers: list[ConeLayer]
    bearing_diameter: float
    far_bearing_diameter: float | None = None
    tapped: bool = False
    effective_grip: float | None = None
    cone_angle_deg: float = DEFAULT_CONE_ANGLE_DEG


@dataclass
class ConeResult:
    """Member stiffness from the clipped cones, and what was lost against the ideal cone.

    stiffness, ideal_stiffness: N/mm; area_fraction_mid_grip = clipped/ideal area at
    mid-grip; lost_to_edges, lost_to_neighbours: fractions of the ideal mid-grip area;
    per_layer: (part, compliance mm/N) per layer; samples: (z mm, A mm², E MPa) of every
    integration point; area_mid_grip, ideal_area_mid_grip: mm²; z_mid: mm;
    prismatic: (part, z_start, z_end, True if sectioned once) per integration region;
    layer_sections: (part, clipped area mm², ideal area mm²) of every layer of the joint
    (a tapped part too), where the layer's cone is widest (:func:`layer_sections`).
    """

    stiffness: float
    ideal_stiffness: float
    area_fraction_mid_grip: float
    lost_to_edges: float
    lost_to_neighbours: float
    per_layer: list[tuple[str, float]]
    samples: list[tuple[float, float, float]]
    area_mid_grip: float = 0.0
    ideal_area_mid_grip: float = 0.0
    z_mid: float = 0.0
    prismatic: list[tuple[str, float, float, bool]] = field(default_factory=list)
    layer_sections: list[tuple[str, float, float]] = field(default_factory=list)


@dataclass
class ConeCache:
    """Caches shared by the joints of one model (face catalogues, whole-part sections, and the
    cone solids of :func:`cone_solids`, one per distinct piece, placed once per joint)."""

    sections: SectionCache = field(default_factory=SectionCache)
    solids: dict = field(default_factory=dict)
    #: a joint's layer regions and local (windowed, hole-filled) sections, by part, axis and
    #: heights: the stiffness, its mid-grip and per-layer areas and the markup's cone solids
    #: all ask for them
    regions: dict = field(default_factory=dict)
    locals: dict = field(default_factory=dict)
    #: clipped-cone results of joints alike in their own frames (:func:`_likeness`)
    results: dict = field(default_factory=dict)


# --------------------------------------------------------------------------------------
# closed forms and exact 2-D areas


@dataclass
class _EdgeSet:
    """Directed edges of oriented rings (exterior CCW, holes CW), for exact disc areas."""

    a: np.ndarray  # m×2
    b: np.ndarray  # m×2
    breakpoints: np.ndarray  # radii where the disc∩polygon area is not smooth


def _edges_of(geom: MultiPolygon) -> _EdgeSet:
    starts, ends, radii = [], [], []
    for poly in geom.geoms:
        poly = orient(poly, 1.0)
        for ring in [poly.exterior, *poly.interiors]:
            xy = np.asarray(ring.coords)[:, :2]
            a, b = xy[:-1], xy[1:]
            keep = np.einsum("ij,ij->i", b - a, b - a) > 0
            a, b = a[keep], b[keep]
            if len(a) == 0:
                continue
            starts.append(a)
            ends.append(b)
            vd = np.hypot(a[:, 0], a[:, 1])
            fd = _segment_distances(a, b)
            if len(a) <= _MANY_VERTICES:
                radii.extend(vd)
                radii.extend(fd)
            else:
                radii.extend([fd.min(), vd.max()])
    if not starts:
        empty = np.zeros((0, 2))
        return _EdgeSet(empty, empty, np.zeros(0))
    return _EdgeSet(np.vstack(starts), np.vstack(ends), np.unique(np.round(radii, _RADIUS_KEY_DIGITS)))


def _segment_distances(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Distance from the origin to each segment a→b."""
    d = b - a
    t = np.clip(-np.einsum("ij,ij->i", a, d) / np.einsum("ij,ij->i", d, d), 0.0, 1.0)
    p = a + t[:, None] * d
    return np.hypot(p[:, 0], p[:, 1])


def disc_polygon_area(a: np.ndarray, b: np.ndarray, radius) -> np.ndarray:
    """Exact area of (disc of radius `radius` at the origin) ∩ (polygon with straight edges).

    A = Σ_edges area(disc ∩ triangle(0, a_i, b_i)), signed: each directed edge is split at
    its crossings with the circle; parts inside the circle add the triangle ½(p × q), parts
    outside add the circular sector ½r²·∠(p, q).  Rings must be oriented (exterior
    counter-clockwise, holes clockwise).  Parameters: a, b m×2 edge ends, mm; radius mm
    (scalar or array).  Returns mm² (array of the shape of `radius`).

    Mathematics (Green's theorem); no external source needed.

    Example: the square [-1, 1]² and r = 1 gives π; r = √2 gives 4.
    """
    r = np.atleast_1d(np.asarray(radius, dtype=float))
    if len(a) == 0:
        return np.zeros(r.shape)
    rr = (r * r)[:, None]
    d = b - a
    dd = np.einsum("ij,ij->i", d, d)[None, :]
    ad = np.einsum("ij,ij->i", a, d)[None, :]
    aa = np.einsum("ij,ij->i", a, a)[None, :]
    disc = ad * ad - dd * (aa - rr)
    sq = np.sqrt(np.maximum(disc, 0.0))
    s1 = np.clip((-ad - sq) / dd, 0.0, 1.0)
    s2 = np.clip((-ad + sq) / dd, 0.0, 1.0)
    outside = disc <= 0.0
    s1 = np.where(outside, 0.0, s1)
    s2 = np.where(outside, 0.0, s2)
    ax, ay = a[None, :, 0], a[None, :, 1]
    dx, dy = d[None, :, 0], d[None, :, 1]
    p1x, p1y = ax + s1 * dx, ay + s1 * dy
    p2x, p2y = ax + s2 * dx, ay + s2 * dy
    bx, by = b[None, :, 0], b[None, :, 1]

    def sector(px, py, qx, qy):
        return 0.5 * rr * np.arctan2(px * qy - py * qx, px * qx + py * qy)

    tri = 0.5 * (p1x * p2y - p1y * p2x)
    total = sector(ax, ay, p1x, p1y) + tri + sector(p2x, p2y, bx, by)
    return total.sum(axis=1).reshape(r.shape)


# --------------------------------------------------------------------------------------
# joint geometry


@dataclass
class _Plane:
    """A bisecting plane (X − m)·w ≤ 0 keeps our side; applies to layers of `parts`."""

    m: np.ndarray
    w: np.ndarray
    parts: frozenset


class _Cone:
    """Axial geometry of one joint: grip, mid-grip, radius r(z) and the section frame."""

    def __init__(self, joint: ConeJoint):
        if not joint.layers:
            raise InputError(f"joint {joint.id}: no layers")
        if not (0.0 < joint.cone_angle_deg < 90.0):
            raise InputError(f"joint {joint.id}: cone_angle must be between 0 and 90 deg")
        self.joint = joint
        self.frame = PlaneFrame.for_direction(joint.axis_direction)
        self.n = np.asarray(self.frame.n)
        self.u = np.asarray(self.frame.u)
        self.v = np.asarray(self.frame.v)
        self.p0 = np.asarray(joint.axis_point, dtype=float)
        self.centre = np.array(self.frame.to_plane(self.p0))
        self.tan = math.tan(math.radians(joint.cone_angle_deg))
        last = max(layer.z_end for layer in joint.layers)
        # tapped: the far cone starts at l′ (Shigley Table 8-7), given by the caller
        self.L = float(joint.effective_grip) if joint.effective_grip is not None else float(last)
        if self.L <= 0:
            raise InputError(f"joint {joint.id}: grip must be positive")
        self.z_mid = 0.5 * self.L
        self.rw = 0.5 * joint.bearing_diameter
        far = joint.far_bearing_diameter if joint.far_bearing_diameter is not None else joint.bearing_diameter
        self.rf = 0.5 * far
        for layer in joint.layers:
            if layer.z_end <= layer.z_start:
                raise InputError(f"joint {joint.id}: layer '{layer.part}' has no thickness")
            if layer.E <= 0:
                raise InputError(f"joint {joint.id}: layer '{layer.part}' needs a positive E")
            if min(self.rw, self.rf) <= 0.5 * layer.hole_diameter:
                raise InputError(
                    f"joint {joint.id}: bearing diameter must exceed the hole in '{layer.part}'")

    def radius(self, z):
        z = np.asarray(z, dtype=float)
        return np.where(z <= self.z_mid, self.rw + z * self.tan, self.rf + (self.L - z) * self.tan)

    def side_radius(self, z, side: str):
        """r(z) of the head cone or of the far cone (differ at mid-grip when d_w ≠ d_w′)."""
        z = np.asarray(z, dtype=float)
        if side == "head":
            return self.rw + z * self.tan
        return self.rf + (self.L - z) * self.tan

    def z_of_radius(self, r: float, side: str) -> float:
        if side == "head":
            return (r - self.rw) / self.tan
        return self.L - (r - self.rf) / self.tan

    def member_layers(self) -> list[ConeLayer]:
        """The layers whose compliance is the member's: a tapped part is in series with the bolt
        instead (docs/tapped_stiffness.md)."""
        if not self.joint.tapped:
            return list(self.joint.layers)
        tapped = max(self.joint.layers, key=lambda layer: layer.z_end)
        return [layer for layer in self.joint.layers if layer is not tapped]

    def pieces(self):
        """(layer, side, z_a, z_b): each member layer split at mid-grip and cut to [0, L].

        A tapped joint's member is its clamped layers; the cones still span l′ (Table 8-7).
        """
        out = []
        for layer in self.member_layers():
            za, zb = max(layer.z_start, 0.0), min(layer.z_end, self.L)
            for side, lo, hi in (("head", 0.0, self.z_mid), ("far", self.z_mid, self.L)):
                a, b = max(za, lo), min(zb, hi)
                if b - a > _LENGTH_TOL:
                    out.append((layer, side, a, b))
        return out

    def reach(self, za: float, zb: float) -> float:
        """Largest cone radius over [za, zb]."""
        zs = [za, zb] + ([self.z_mid] if za < self.z_mid < zb else [])
        radii = []
        for z in zs:
            if z <= self.z_mid + _LENGTH_TOL:
                radii.append(float(self.side_radius(z, "head")))
            if z >= self.z_mid - _LENGTH_TOL:
                radii.append(float(self.side_radius(z, "far")))
        return max(radii)

    def point(self, z: float) -> np.ndarray:
        return self.p0 + z * self.n


def _bisector_planes(cone: _Cone, neighbours: Sequence[ConeJoint]) -> list[_Plane]:
    """Bisecting planes between this joint's axis and each neighbour's, at mid-grip."""
    planes = []
    c = cone.point(cone.z_mid)
    own = cone.joint
    for other in neighbours:
        if other is own or other.id == own.id:
            continue
        q0 = np.asarray(other.axis_point, dtype=float)
        qn = np.asarray(other.axis_direction, dtype=float)
        qn = qn / np.linalg.norm(qn)
        qc = q0 + ((c - q0) @ qn) * qn  # point of the neighbour axis nearest our mid-grip
        w = qc - c
        dist = float(np.linalg.norm(w))
        if dist < _COAXIAL_TOL:
            continue
        planes.append(_Plane(0.5 * (c + qc), w / dist, frozenset(layer.part for layer in other.layers)))
    return planes


# --------------------------------------------------------------------------------------
# local sections


def _half_plane(a: float, b: float, c: float, size: float) -> Polygon | None:
    """The 2-D half-plane a·x + b·y + c ≤ 0, as a large polygon (None: the whole plane)."""
    norm = math.hypot(a, b)
    if norm < 1e-12:
        return None if c <= 0 else Polygon()
    nx, ny, cc = a / norm, b / norm, c / norm
    fx, fy = -cc * nx, -cc * ny
    tx, ty = -ny, nx
    big = size + abs(cc)
    return Polygon([
        (fx + big * tx, fy + big * ty),
        (fx - big * tx, fy - big * ty),
        (fx - big * tx - 2 * big * nx, fy - big * ty - 2 * big * ny),
        (fx + big * tx - 2 * big * nx, fy + big * ty - 2 * big * ny),
    ])


@dataclass
class _Local:
    """A section in the joint's local 2-D coordinates (axis at the origin), hole filled.

    hole_area: mm², what to subtract from area(disc ∩ geom) for the filled bolt hole.
    """

    geom: MultiPolygon
    hole_area: float


def _to_multi(geom) -> MultiPolygon:
    if geom.is_empty:
        return MultiPolygon()
    if isinstance(geom, Polygon):
        return MultiPolygon([geom])
    if isinstance(geom, MultiPolygon):
        return geom
    polys = [g for g in getattr(geom, "geoms", []) if isinstance(g, Polygon) and not g.is_empty]
    return MultiPolygon(polys)


def _localise(windowed: MultiPolygon, cone: _Cone, hole_radius: float) -> _Local:
    """Shift a windowed plane-coordinate section to the axis and fill the bolt hole."""
    cx, cy = cone.centre
    local = affinity.translate(windowed, -cx, -cy) if not windowed.is_empty else windowed
    polys = []
    origin = Point(0.0, 0.0)
    fill_radius = hole_radius
    for poly in _to_multi(local).geoms:
        kept = []
        for ring in poly.interiors:
            xy = np.asarray(ring.coords)
            dist = np.hypot(xy[:, 0], xy[:, 1])
            far = float(dist.max())
            circular = far - float(dist.min()) <= _HOLE_FILL_TOL + _HOLE_FILL_RTOL * far
            if (circular or far <= hole_radius + _HOLE_FILL_TOL) and Polygon(ring).contains(origin):
                # the bolt's own hole: filled here and subtracted exactly (as a circle of
                # the model's radius, or of hole_diameter if that is larger)
                if circular:
                    fill_radius = max(fill_radius, far)
                continue
            kept.append(ring)
        polys.append(Polygon(poly.exterior, kept))
    geom = MultiPolygon(polys)
    # the bolt passes where the material (holes filled) covers the axis; elsewhere the
    # axis lies in a void larger than the hole and nothing is subtracted
    inside = bool(geom.contains(origin)) if polys else False
    return _Local(geom, math.pi * fill_radius ** 2 if inside else 0.0)


class _LayerSampler:
    """A(z) for one layer of one joint (possibly split into regions at perpendicular faces)."""

    def __init__(self, cone: _Cone, layer: ConeLayer, planes: list[_Plane], cache: ConeCache):
        self.cone = cone
        self.layer = layer
        self.shape = as_occ_shape(layer.solid)
        self.cache = cache
        self.rh = 0.5 * layer.hole_diameter
        # only neighbours that clamp the same part share its material
        self.planes = [p for p in planes if layer.part in p.parts]
        self._edges: dict = {}
        self._blocks: dict = {}
        # what regions and sections depend on besides their heights: the part, the axis, the hole
        self._key = (id(self.shape), cone.frame.key(), *(round(float(c), _KEY_DIGITS) for c in cone.p0),
                     round(self.rh, _KEY_DIGITS))

    # -- region decomposition from the face catalogue --------------------------------
    def regions(self, za: float, zb: float) -> list[tuple[float, float, bool]]:
        """Split [za, zb] at perpendicular planar faces; flag pieces that are prismatic."""
        cone = self.cone
        reach = cone.reach(za, zb)
        key = (*self._key, round(za, _KEY_DIGITS), round(zb, _KEY_DIGITS), round(reach, _KEY_DIGITS))
        if key not in self.cache.regions:
            self.cache.regions[key] = self._regions(za, zb, reach)
        return list(self.cache.regions[key])

    def _regions(self, za: float, zb: float, reach: float) -> list[tuple[float, float, bool]]:
        cone = self.cone
        faces = self.cache.sections.faces(self.shape)
        if len(faces.kind) == 0:
            return [(za, zb, True)]
        # only faces within reach count below: look at those a tree of the faces' boxes gives
        rows = self.cache.sections.faces_near(self.shape, cone.frame, tuple(cone.centre), reach)
        faces = FaceCatalog(faces.kind[rows], faces.direction[rows], faces.point[rows], faces.corners[rows])
        rel = faces.corners - cone.p0  # F×8×3
        zc = rel @ cone.n
        zlo, zhi = zc.min(axis=1), zc.max(axis=1)
        centre = rel.mean(axis=1)
        half = 0.5 * np.linalg.norm(faces.corners[:, 7] - faces.corners[:, 0], axis=1)
        radial = np.linalg.norm(centre - np.outer(centre @ cone.n, cone.n), axis=1) - half
        near = (radial <= reach) & (zhi >= za - _LENGTH_TOL) & (zlo <= zb + _LENGTH_TOL)
        cosines = np.abs(faces.direction @ cone.n)
        is_plane = faces.kind == KIND_PLANE
        perpendicular = is_plane & (cosines > 1.0 - _PARALLEL_TOL ** 2 / 2)
        parallel = (is_plane & (cosines < _PARALLEL_TOL)) | (
            np.isin(faces.kind, (KIND_CYLINDER, KIND_EXTRUSION)) & (cosines > 1.0 - _PARALLEL_TOL ** 2 / 2))
        cuts = []
        for i in np.nonzero(near & perpendicular)[0]:
            zp = float((faces.point[i] - cone.p0) @ cone.n)
            if za + _CUT_CLEARANCE < zp < zb - _CUT_CLEARANCE:
                cuts.append(zp)
        odd = near & ~perpendicular & ~parallel
        # the axial extent of a face that is neither also bounds a region, so the rest of
        # the layer can still be sectioned once
        for zp in np.concatenate((zlo[odd], zhi[odd])):
            if za + _CUT_CLEARANCE < zp < zb - _CUT_CLEARANCE:
                cuts.append(float(zp))
        bounds = [za, *sorted(set(np.round(cuts, _KEY_DIGITS))), zb]
        out = []
        for a, b in zip(bounds[:-1], bounds[1:]):
            hit = odd & (zlo < b - _LENGTH_TOL) & (zhi > a + _LENGTH_TOL)
            out.append((float(a), float(b), not bool(hit.any())))
        return out

    # -- sections --------------------------------------------------------------------
    def local_at(self, z: float, prismatic_mid: float | None, size: float) -> _Local:
        """Local section at height z (the cached whole-part one at `prismatic_mid` if given)."""
        cone = self.cone
        if prismatic_mid is not None:
            key = (*self._key, round(prismatic_mid, _KEY_DIGITS), round(size, _SIZE_KEY_DIGITS))
            if key not in self.cache.locals:
                offset = cone.frame.offset_of(cone.point(prismatic_mid))
                whole = self.cache.sections.section(self.shape, cone.frame, offset)
                cx, cy = cone.centre
                windowed = whole.window(cx - size, cy - size, cx + size, cy + size)
                self.cache.locals[key] = _localise(windowed, cone, self.rh)
            return self.cache.locals[key]
        offset = cone.frame.offset_of(cone.point(z))
        cx, cy = cone.centre
        window = (cx - size, cy - size, cx + size, cy + size)
        sec = section_polygons(self._block(size), cone.frame, offset, window,
                               self.cache.sections.deflection)
        return _localise(sec, cone, self.rh)

    def _block(self, size: float):
        """The part itself, or (when it has many faces) the part cut to a box around the
        axis over the layer, so that each of the many per-point sections is cheap."""
        if len(self.cache.sections.faces(self.shape).kind) <= _FEW_FACES:
            return self.shape
        key = round(size, _SIZE_KEY_DIGITS)
        if key not in self._blocks:
            cone, layer = self.cone, self.layer
            s0 = cone.frame.offset_of(cone.point(layer.z_start))
            s1 = cone.frame.offset_of(cone.point(layer.z_end))
            pad = _BLOCK_PAD + _BLOCK_PAD_FRACTION * abs(s1 - s0)
            self._blocks[key] = local_block(self.shape, cone.frame, tuple(cone.centre), _BLOCK_SCALE * size,
                                            (min(s0, s1) - pad, max(s0, s1) + pad))
        return self._blocks[key]

    def clipped(self, local: _Local, z: float, size: float) -> MultiPolygon:
        """The local section cut by the neighbours' bisecting half-planes at height z."""
        geom = local.geom
        cone = self.cone
        for plane in self.planes:
            a = float(cone.u @ plane.w)
            b = float(cone.v @ plane.w)
            c = float((cone.point(z) - plane.m) @ plane.w)
            half = _half_plane(a, b, c, _HALF_PLANE_SCALE * size + _HALF_PLANE_MARGIN)
            if half is None:
                continue
            geom = _to_multi(shapely.intersection(geom, half))
        return geom

    def fixed_edges(self, local: _Local, mid: float, size: float) -> _EdgeSet | None:
        """Edges of the clipped prismatic section when the clip is independent of z, else None."""
        if not self.planes_fixed():
            return None
        key = round(mid, _KEY_DIGITS)
        if key not in self._edges:
            self._edges[key] = _edges_of(self.clipped(local, mid, size))
        return self._edges[key]

    def plane_contacts(self, side: str) -> list[float]:
        """Heights where the cone disc of `side` first touches a bisecting line that moves
        with z: r(z) = |c(z)|/√(a² + b²) with c(z) = c₀ + c₁·z (both linear in z)."""
        cone = self.cone
        out = []
        r0, slope = (cone.rw, cone.tan) if side == "head" else (cone.rf + cone.L * cone.tan, -cone.tan)
        for plane in self.planes:
            h = math.hypot(float(cone.u @ plane.w), float(cone.v @ plane.w))
            if h < 1e-12:
                continue
            c0 = float((cone.p0 - plane.m) @ plane.w) / h
            c1 = float(cone.n @ plane.w) / h
            for sign in (1.0, -1.0):
                denom = slope - sign * c1
                if abs(denom) > _ROOT_TOL:
                    out.append((sign * c0 - r0) / denom)
        return out

    def planes_fixed(self) -> bool:
        """True when every bisecting plane is parallel to the axis (cut independent of z)."""
        return all(abs(float(self.cone.n @ p.w)) < _PARALLEL_TOL for p in self.planes)

    def area(self, edges: _EdgeSet, hole_area: float, r) -> np.ndarray:
        return disc_polygon_area(edges.a, edges.b, r) - hole_area


@functools.lru_cache(maxsize=_GAUSS_CACHE)
def _gauss(n: int) -> tuple[np.ndarray, np.ndarray]:
    """Gauss–Legendre nodes and weights on [−1, 1] (pure function of n, so cached)."""
    return np.polynomial.legendre.leggauss(n)


def _integrate_piece(f_vec: Callable[[np.ndarray], np.ndarray], a: float, b: float,
                     n: int, depth: int, kinked: bool = False
                     ) -> tuple[float, list[tuple[float, float]]]:
    """∫_a^b f dz by Gauss–Legendre with adaptive halving; returns value and (z, f) samples.

    `kinked`: an end of [a, b] is a height where the disc starts to meet an edge or a
    corner; there A(z) − A₀ ∝ (z − z₀)^{3/2}, which Gauss resolves slowly.  The piece is
    then integrated in s ∈ [0, 1] with z = a + (b − a)(3s² − 2s³) (zero slope at both
    ends), which turns the end behaviour into a smooth s³ term.
    The rule on an interval and on its two halves are evaluated in one call of `f_vec`;
    a half is refined while the two disagree by more than _ADAPT_RTOL (at most `depth`).
    """
    x, w = _gauss(n)
    span = b - a

    def z_of(sv):
        return a + span * (3 * sv * sv - 2 * sv ** 3) if kinked else a + span * sv

    def jac(sv):
        return span * 6 * sv * (1 - sv) if kinked else np.full_like(sv, span)

    def nodes(lo, hi):
        return 0.5 * (hi - lo) * x + 0.5 * (hi + lo)

    def rec(lo, hi, level):
        mid = 0.5 * (lo + hi)
        if level <= 1:
            sv = np.concatenate((nodes(lo, mid), nodes(mid, hi)))
        else:
            sv = np.concatenate((nodes(lo, hi), nodes(lo, mid), nodes(mid, hi)))
        z = z_of(sv)
        fz = f_vec(z)
        g = fz * jac(sv)
        if level <= 1:
            value = 0.5 * (mid - lo) * float(w @ g[:n]) + 0.5 * (hi - mid) * float(w @ g[n:])
            return value, list(zip(z.tolist(), fz.tolist()))
        whole = 0.5 * (hi - lo) * float(w @ g[:n])
        halves = 0.5 * (mid - lo) * float(w @ g[n:2 * n]) + 0.5 * (hi - mid) * float(w @ g[2 * n:])
        if abs(halves - whole) <= _ADAPT_RTOL * abs(halves):
            return halves, list(zip(z[n:].tolist(), fz[n:].tolist()))
        lv, ls = rec(lo, mid, level - 1)
        rv, rs = rec(mid, hi, level - 1)
        return lv + rv, ls + rs

    return rec(0.0, 1.0, max(depth, 1))


def _zero_area(joint: ConeJoint, part: str, z: float) -> InputError:
    return InputError(f"joint {joint.id}: no material under the cone in part '{part}' at z = {z:.3f} mm")


# --------------------------------------------------------------------------------------
# public API


def cone_area(joint: ConeJoint, z: float, neighbours: Sequence[ConeJoint] = (),
              cache: ConeCache | None = None) -> float:
    """Clipped cone area A(z) of a joint at height z (mm from the head bearing face), mm².

    A(z) = area(section of the layer's part ∩ disc r(z) ∩ own side of each neighbour's
    bisecting plane) − π r_h².  Uses a true plane section at z (no prismatic shortcut), so
    it is an independent check of :func:`clipped_cone_stiffness`.

    Example: a wide plate, d_w = 18, hole 13, α = 30°, z = 5 on the head side:
    A = π((9 + 5·tan30°)² − 6.5²) ≈ 311.2 mm².
    """
    cache = cache or ConeCache()
    cone = _Cone(joint)
    planes = _bisector_planes(cone, neighbours)
    for layer, side, za, zb in cone.pieces():
        if za - _LENGTH_TOL <= z <= zb + _LENGTH_TOL:
            sampler = _LayerSampler(cone, layer, planes, cache)
            r = float(cone.radius(z))
            size = _window_size(r)
            zz = _just_inside(z, za, zb)
            local = sampler.local_at(zz, None, size)
            edges = _edges_of(sampler.clipped(local, zz, size))
            return float(max(sampler.area(edges, local.hole_area, r)[0], 0.0))
    return 0.0


def clipped_cone_stiffness(joint: ConeJoint, neighbours: Sequence[ConeJoint] = (),
                           gauss_points: int = DEFAULT_GAUSS_POINTS, cache: ConeCache | None = None) -> ConeResult:
    """Member stiffness of a joint from its pressure cones clipped by the real parts.

    k_m = 1/δ_m,  δ_m = Σ_layers Σ_sides ∫ dz / (E·A(z)),  A(z) the clipped cone area
    (module docstring).  Parameters: `joint` (mm, MPa); `neighbours` the other joints of
    the model that may share parts with it (only those with a layer in the same part
    clip that layer); `gauss_points` Gauss–Legendre points per integration piece;
    `cache` shared by the joints of one model for speed.  Returns a :class:`ConeResult`
    (N/mm, fractions, per-layer compliances in mm/N).

    Source: Budynas & Nisbett, Shigley 10th ed., §8-5 and eq. (8-20) for the cone; the
    clipping and the split between neighbours are our own construction.

    Example: two 10 mm steel plates far wider than the cone, d_w = 18, hole 13, α = 30°:
    the result equals eq. (8-20) for the two frustums, k_m ≈ 2.773e6 N/mm (to 1e-6); cut
    the plates to 25 mm wide with the bolt 11 mm from one edge and it drops below that.
    """
    if gauss_points < 1:
        raise InputError("gauss_points must be at least 1")
    cache = cache or ConeCache()
    cone = _Cone(joint)
    planes = _bisector_planes(cone, neighbours)
    key = _likeness(cone, planes, cache, gauss_points)
    names = [layer.part for layer in joint.layers]
    if key is not None and key in cache.results:
        result, theirs = cache.results[key]
        own = dict(zip(theirs, names))        # the alike joint's parts, layer by layer, are ours
        return dataclasses.replace(
            result, per_layer=[(own[part], v) for part, v in result.per_layer],
            prismatic=[(own[part], a, b, flag) for part, a, b, flag in result.prismatic],
            layer_sections=[(own[part], a, ideal) for part, a, ideal in result.layer_sections])
    result = _clipped(joint, cone, planes, gauss_points, cache)
    if key is not None:
        cache.results[key] = (result, names)
    return result


def _geometry_key(local: _Local) -> tuple:
    """A local section as numbers: its rings' vertex counts and coordinates (to _KEY_DIGITS)."""
    rings = []
    for poly in local.geom.geoms:
        rings.append((len(poly.exterior.coords), *(len(r.coords) for r in poly.interiors)))
    coords = np.round(shapely.get_coordinates(local.geom), _KEY_DIGITS) + 0.0    # no -0.0
    return tuple(rings), coords.tobytes(), round(local.hole_area, _KEY_DIGITS)


def _likeness(cone: _Cone, planes: list[_Plane], cache: ConeCache, gauss_points: int) -> tuple | None:
    """What a joint's clipped-cone result depends on, in the joint's own frame, or None.

    Two joints with the same key (the same layers, cone, neighbour planes and local sections
    around their axes, to _KEY_DIGITS mm) get the same result: a bed of hundreds of alike
    bolts integrates a handful of cones.  Only joints whose every region is prismatic (one
    section holds over it) get a key; the others are integrated each on its own.
    """
    joint = cone.joint
    frame = np.array([cone.u, cone.v, cone.n])
    # parts by the first layer they make (the names themselves differ between alike joints:
    # each has its own washers)
    index: dict[str, int] = {}
    for k, layer in enumerate(joint.layers):
        index.setdefault(layer.part, k)
    key: list = [gauss_points, *(round(x, _KEY_DIGITS) for x in (cone.L, cone.rw, cone.rf, cone.tan)),
                 joint.tapped]
    for plane in planes:
        key.append((tuple(np.round(frame @ (plane.m - cone.p0), _KEY_DIGITS) + 0.0),
                    tuple(np.round(frame @ plane.w, _KEY_DIGITS) + 0.0),
                    tuple(sorted(index[p] for p in plane.parts if p in index))))
    for layer in joint.layers:
        key.append((index[layer.part], *(round(x, _KEY_DIGITS) for x in (layer.z_start, layer.z_end, layer.E,
                                                                          layer.hole_diameter))))
        za, zb = max(layer.z_start, 0.0), min(layer.z_end, cone.L)
        if zb - za <= _LENGTH_TOL:
            continue
        sampler = _LayerSampler(cone, layer, planes, cache)
        for a, b, prismatic in sampler.regions(za, zb):
            if not prismatic:
                return None
            mid = 0.5 * (a + b)
            key.append((round(a, _KEY_DIGITS), round(b, _KEY_DIGITS),
                        _geometry_key(sampler.local_at(mid, mid, _window_size(cone.reach(a, b))))))
    return tuple(key)


def _clipped(joint: ConeJoint, cone: _Cone, planes: list[_Plane], gauss_points: int,
             cache: ConeCache) -> ConeResult:
    """:func:`clipped_cone_stiffness` of one joint, integrated."""
    per_layer: dict[int, float] = {}
    samples: list[tuple[float, float, float]] = []
    regions_out: list[tuple[str, float, float, bool]] = []
    ideal = 0.0
    total = 0.0
    for layer, side, za, zb in cone.pieces():
        r0, slope = (cone.rw, cone.tan) if side == "head" else (cone.rf + cone.L * cone.tan, -cone.tan)
        ideal += hollow_frustum_compliance(layer.E, r0, slope, 0.5 * layer.hole_diameter, za, zb)
    for layer in cone.member_layers():
        za, zb = max(layer.z_start, 0.0), min(layer.z_end, cone.L)
        if zb - za <= _LENGTH_TOL:
            continue
        sampler = _LayerSampler(cone, layer, planes, cache)
        delta = 0.0
        for a, b, prismatic in sampler.regions(za, zb):
            regions_out.append((layer.part, a, b, prismatic))
            # one window and (if prismatic) one section for the whole region, both sides
            size = _window_size(cone.reach(a, b))
            for side, lo, hi in (("head", 0.0, cone.z_mid), ("far", cone.z_mid, cone.L)):
                sa, sb = max(a, lo), min(b, hi)
                if sb - sa > _LENGTH_TOL:
                    delta += _integrate_region(cone, sampler, side, sa, sb, prismatic, size,
                                               gauss_points, samples, 0.5 * (a + b))
        per_layer[id(layer)] = per_layer.get(id(layer), 0.0) + delta
        total += delta
    if not (total > 0 and math.isfinite(total)):
        raise InputError(f"joint {joint.id}: member compliance could not be integrated")

    # mid-grip areas: ideal, clipped by edges only, and by edges and neighbours
    mid_layer = _layer_at(cone, cone.z_mid)
    r_mid = float(cone.rw + cone.z_mid * cone.tan)
    ideal_mid = math.pi * (r_mid ** 2 - (0.5 * mid_layer.hole_diameter) ** 2)
    a_edges, a_final = _mid_areas(cone, mid_layer, planes, cache, cone.z_mid, r_mid)
    return ConeResult(
        stiffness=1.0 / total,
        ideal_stiffness=1.0 / ideal,
        area_fraction_mid_grip=a_final / ideal_mid,
        lost_to_edges=(ideal_mid - a_edges) / ideal_mid,
        lost_to_neighbours=(a_edges - a_final) / ideal_mid,
        per_layer=[(layer.part, per_layer.get(id(layer), 0.0)) for layer in joint.layers],
        samples=samples,
        area_mid_grip=a_final,
        ideal_area_mid_grip=ideal_mid,
        z_mid=cone.z_mid,
        prismatic=regions_out,
        layer_sections=_layer_sections(cone, planes, cache),
    )


def widest_depth(cone: _Cone, layer: ConeLayer) -> float:
    """Height (mm from the head bearing face) where the joint's cone is widest inside ``layer``:
    mid-grip, or the layer's face nearest to it (the cones grow towards mid-grip)."""
    za, zb = max(layer.z_start, 0.0), min(layer.z_end, cone.L)
    if zb < za:                     # a layer beyond the cones' span: its top face
        return za
    return min(max(cone.z_mid, za), zb)


def _layer_sections(cone: _Cone, planes, cache: ConeCache) -> list[tuple[str, float, float]]:
    """(part, clipped area, ideal area) of each layer at its :func:`widest_depth`, mm².

    The clipped area is the layer's part section inside the cone disc, less what the
    neighbours' bisecting planes give away (as at mid-grip); it is what the FE's per-layer
    outline is made of (``analysis.MemberMethods.fe_outlines``).  A layer whose section the
    disc does not reach past is reported whole (clipped = ideal).
    """
    out = []
    for layer in cone.joint.layers:
        z = widest_depth(cone, layer)
        r = float(cone.radius(z))
        ideal = math.pi * (r ** 2 - (0.5 * layer.hole_diameter) ** 2)
        if min(layer.z_end, cone.L) - max(layer.z_start, 0.0) <= _LENGTH_TOL:
            out.append((layer.part, ideal, ideal))
            continue
        _alone, shared = _mid_areas(cone, layer, planes, cache, z, r)
        out.append((layer.part, min(shared, ideal), ideal))
    return out


def _layer_at(cone: _Cone, z: float) -> ConeLayer:
    for layer, _side, za, zb in cone.pieces():
        if za - _LENGTH_TOL <= z <= zb + _LENGTH_TOL:
            return layer
    return cone.joint.layers[0]


def _mid_areas(cone: _Cone, layer: ConeLayer, planes, cache, z: float, r: float) -> tuple[float, float]:
    """Clipped cone area at height z: (edges only, edges and neighbours), mm²."""
    sampler = _LayerSampler(cone, layer, planes, cache)
    za, zb = max(layer.z_start, 0.0), min(layer.z_end, cone.L)
    for a, b, prismatic in sampler.regions(za, zb):
        if a - _LENGTH_TOL <= z <= b + _LENGTH_TOL:
            # the same window as the integration uses, so the cached section is reused
            size = _window_size(cone.reach(a, b))
            zz = _just_inside(z, a, b)
            local = sampler.local_at(zz, 0.5 * (a + b) if prismatic else None, size)
            alone = sampler.area(_edges_of(local.geom), local.hole_area, r)[0]
            shared = sampler.area(_edges_of(sampler.clipped(local, zz, size)), local.hole_area, r)[0]
            return float(max(alone, 0.0)), float(max(shared, 0.0))
    return 0.0, 0.0


def _integrate_region(cone: _Cone, sampler: _LayerSampler, side: str, a: float, b: float,
                      prismatic: bool, size: float, n: int,
                      samples: list[tuple[float, float, float]], region_mid: float) -> float:
    """∫_a^b dz/(E·A(z)) over (part of) one region of one layer on one cone side.

    A prismatic region is sectioned once, at `region_mid` (the middle of the whole region,
    so the head and far sides and every joint through the same plate share the section).
    """
    layer = sampler.layer
    E = layer.E
    if prismatic:
        local = sampler.local_at(region_mid, region_mid, size)
        edges = sampler.fixed_edges(local, region_mid, size)
        # split where the disc radius meets a vertex or touches an edge
        cuts = [a, b]
        # the part's own edges (with the neighbour cuts when those do not move with z)
        fixed_geometry = edges if edges is not None else _edges_of(local.geom)
        ra, rb = sorted((float(cone.side_radius(a, side)), float(cone.side_radius(b, side))))
        for rad in fixed_geometry.breakpoints:
            if ra < rad < rb:
                cuts.append(cone.z_of_radius(float(rad), side))
        if edges is None:
            cuts.extend(sampler.plane_contacts(side))
        cuts = sorted({c for c in cuts if a + _LENGTH_TOL < c < b - _LENGTH_TOL} | {a, b})

        def f_vec(z: np.ndarray) -> np.ndarray:
            r = cone.side_radius(z, side)
            if edges is not None:
                area = sampler.area(edges, local.hole_area, r)
            else:
                area = np.array([
                    sampler.area(_edges_of(sampler.clipped(local, float(zi), size)),
                                 local.hole_area, float(ri))[0]
                    for zi, ri in zip(z, r)])
            if np.any(area <= 0):
                raise _zero_area(cone.joint, layer.part, float(z[np.argmin(area)]))
            return 1.0 / (E * area)

        depth = _ADAPT_DEPTH
    else:
        cuts = [a, b]

        def f_vec(z: np.ndarray) -> np.ndarray:
            out = []
            for zi in z:
                local_z = sampler.local_at(float(zi), None, size)
                edges_z = _edges_of(sampler.clipped(local_z, float(zi), size))
                area = float(sampler.area(edges_z, local_z.hole_area, float(cone.side_radius(zi, side)))[0])
                if area <= 0:
                    raise _zero_area(cone.joint, layer.part, float(zi))
                out.append(1.0 / (E * area))
            return np.asarray(out)

        depth = _ADAPT_DEPTH_SECTIONED
    delta = 0.0
    kinks = set(cuts[1:-1])
    for lo, hi in zip(cuts[:-1], cuts[1:]):
        value, pts = _integrate_piece(f_vec, lo, hi, n, depth, kinked=lo in kinks or hi in kinks)
        delta += value
        samples.extend((z, 1.0 / (E * fz), E) for z, fz in pts)
    return delta


#: relative tolerance of "the cone piece lies wholly in its part": the clipped disc area at
#: the widest radius of the piece equals the full disc to this fraction (exact 2-D areas)
_WHOLE_RTOL = 1e-9
#: decimals of the key of a cone piece (mm; placements to 1e-6 mm, directions to 1e-9)
_KEY_DECIMALS = 6


def cone_solids(joint: ConeJoint, neighbours: Sequence[ConeJoint] = (),
                cache: ConeCache | None = None) -> list[tuple[str, object]]:
    """The clipped cone volumes of a joint as B-rep solids, one per layer and cone side.

    Each is (hollow frustum of the cone over the layer's z-range, minus the cylinder of the
    layer's hole) ∩ the part solid ∩ the own-side half-space of each neighbour that shares
    the part.  Names are ``"<joint id>:<part>:head"`` / ``":far"``.  Returns
    (name, ``TopoDS_Shape``) pairs for the marked-up model export.

    Where the piece lies wholly in its part (the part is prismatic over the piece and its
    section holds the full disc of the widest cone radius, no neighbour's plane reaches it),
    the hollow frustum itself is that volume exactly and is built without a boolean.  Other
    pieces are cut from the part trimmed to a box around the joint (small booleans whatever
    the part's size).  Every piece is built once in the joint's own frame and placed; joints
    with the same piece (same radii, hole and height, and the same part geometry around it)
    share one solid (same ``TShape``, another location), so writers can instance it.  Pass
    the model's ``cache`` to share sections and solids between joints.

    Example: a wide plate, 10 mm, d_w = 18, hole 13, α = 30°, one layer: two solids whose
    volumes sum to the integral of π(r² − r_h²) over the grip.
    """
    from OCP.TopLoc import TopLoc_Location

    cache = cache if cache is not None else ConeCache()
    cone = _Cone(joint)
    planes = _bisector_planes(cone, neighbours)
    out = []
    samplers: dict[int, _LayerSampler] = {}
    for layer, side, za, zb in cone.pieces():
        sampler = samplers.get(id(layer))
        if sampler is None:
            sampler = samplers[id(layer)] = _LayerSampler(cone, layer, planes, cache)
        ra, rb = float(cone.side_radius(za, side)), float(cone.side_radius(zb, side))
        rh = 0.5 * layer.hole_diameter
        place = _piece_placement(cone, za)
        cutting = _cutting_planes(cone, sampler.planes, za, zb, max(ra, rb))
        if not cutting and _wholly_in_part(cone, sampler, side, za, zb):
            key = ("whole", *(round(x, _KEY_DECIMALS) for x in (ra, rb, zb - za, rh)))
            local = cache.solids.get(key)
            if local is None:
                local = cache.solids[key] = _hollow_frustum(ra, rb, zb - za, rh)
        else:
            local = _clipped_piece(cone, sampler, place, za, zb, ra, rb, rh, cutting, cache)
        shape = local if local.IsNull() else local.Located(TopLoc_Location(place))
        out.append((f"{joint.id}:{layer.part}:{side}", shape))
    return out


def _piece_placement(cone: _Cone, z: float):
    """gp_Trsf from the piece's own frame (origin on the axis at height z, +Z along the axis,
    +X along the section frame's u) to model coordinates."""
    from OCP.gp import gp_Ax3, gp_Dir, gp_Pnt, gp_Trsf

    trsf = gp_Trsf()
    trsf.SetDisplacement(gp_Ax3(), gp_Ax3(gp_Pnt(*map(float, cone.point(z))), gp_Dir(*map(float, cone.n)),
                                          gp_Dir(*map(float, cone.u))))
    return trsf


def _cutting_planes(cone: _Cone, planes: list[_Plane], za: float, zb: float, reach: float) -> list[_Plane]:
    """The neighbours' bisecting planes that can cut the piece (the others lie beyond its reach)."""
    ends = (cone.point(za), cone.point(zb))
    reach += _LENGTH_TOL
    return [plane for plane in planes
            if not all(float(np.dot(np.asarray(p) - plane.m, plane.w)) < -reach for p in ends)]


def _wholly_in_part(cone: _Cone, sampler: _LayerSampler, side: str, za: float, zb: float) -> bool:
    """True when the hollow frustum of the piece lies in the part's material everywhere.

    The part must be prismatic over the piece (every face within reach parallel to the axis,
    none across it), so one section holds for all heights; in that section the disc of the
    widest radius, less the bolt hole, must be material: its exact clipped area equals the
    full disc, and the hole the section leaves is no wider than the layer's hole.
    """
    layer = sampler.layer
    lo, hi = max(layer.z_start, 0.0), min(layer.z_end, cone.L)
    rh = sampler.rh
    for a, b, prismatic in sampler.regions(lo, hi):
        sa, sb = max(a, za), min(b, zb)
        if sb - sa <= _LENGTH_TOL:
            continue
        if not prismatic:
            return False
        # the same window and section as the stiffness integration, so the cache serves both
        size = _window_size(cone.reach(a, b))
        mid = 0.5 * (a + b)
        local = sampler.local_at(mid, mid, size)
        if local.hole_area > math.pi * rh * rh * (1.0 + _WHOLE_RTOL) + _LENGTH_TOL:
            return False          # the part's own hole is wider than the layer's: a boolean says how
        r = max(float(cone.side_radius(sa, side)), float(cone.side_radius(sb, side)))
        edges = _edges_of(local.geom)
        full = math.pi * r * r
        if float(disc_polygon_area(edges.a, edges.b, r)[0]) < full * (1.0 - _WHOLE_RTOL):
            return False
    return True


def _hollow_frustum(ra: float, rb: float, height: float, rh: float):
    """The hollow frustum r_h ≤ r ≤ r(z), 0 ≤ z ≤ height (r from ra to rb), as one revolved solid."""
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeFace, BRepBuilderAPI_MakePolygon
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeRevol
    from OCP.gp import gp_Ax1, gp_Dir, gp_Pnt

    poly = BRepBuilderAPI_MakePolygon()
    for x, z in ((rh, 0.0), (ra, 0.0), (rb, height), (rh, height)):
        poly.Add(gp_Pnt(float(x), 0.0, float(z)))
    poly.Close()
    face = BRepBuilderAPI_MakeFace(poly.Wire(), True).Face()
    return BRepPrimAPI_MakeRevol(face, gp_Ax1(gp_Pnt(0, 0, 0), gp_Dir(0, 0, 1)), 2.0 * math.pi).Shape()


def _shape_key(shape, cache: ConeCache) -> int:
    """A number naming the part's TShape (instances of one part definition share it)."""
    from OCP.TopLoc import TopLoc_Location

    bare = shape.Located(TopLoc_Location())
    bucket = cache.solids.setdefault(("tshape", hash(bare)), [])
    for k, other in enumerate(bucket):
        if other.IsPartner(bare):
            return hash(bare) * 31 + k
    bucket.append(bare)
    return hash(bare) * 31 + len(bucket) - 1


def _clipped_piece(cone: _Cone, sampler: _LayerSampler, place, za: float, zb: float, ra: float, rb: float,
                   rh: float, cutting: list[_Plane], cache: ConeCache):
    """(hollow frustum) ∩ (the part trimmed to a box around the piece) ∩ own-side half-spaces,
    in the piece's own frame; reused for a piece of the same part definition placed alike."""
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeFace
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeBox, BRepPrimAPI_MakeHalfSpace
    from OCP.gp import gp_Dir, gp_Pln, gp_Pnt
    from OCP.TopLoc import TopLoc_Location

    joint, layer = cone.joint, sampler.layer
    part = as_occ_shape(layer.solid)
    inverse = place.Inverted()
    local_part = part.Moved(TopLoc_Location(inverse))      # the part seen from the piece's frame
    key = None
    if not cutting:
        rel = local_part.Location().Transformation()
        matrix = tuple(round(rel.Value(i, j), _KEY_DECIMALS) for i in (1, 2, 3) for j in (1, 2, 3, 4))
        key = ("clipped", _shape_key(part, cache), matrix,
               *(round(x, _KEY_DECIMALS) for x in (ra, rb, zb - za, rh)))
        if key in cache.solids:
            return cache.solids[key]
    height = zb - za
    reach = _window_size(max(ra, rb))
    pad = _BLOCK_PAD + _BLOCK_PAD_FRACTION * height
    box = BRepPrimAPI_MakeBox(gp_Pnt(-reach, -reach, -pad), 2 * reach, 2 * reach, height + 2 * pad).Shape()
    shape = _hollow_frustum(ra, rb, height, rh)     # lies inside the box
    trimmed = BRepAlgoAPI_Common(local_part, box)
    block = trimmed.Shape() if trimmed.IsDone() else local_part
    shape = _boolean(BRepAlgoAPI_Common(shape, block), joint, layer.part)
    for plane in cutting:
        m = gp_Pnt(*map(float, plane.m)).Transformed(inverse)
        keep = gp_Pnt(*map(float, plane.m - plane.w)).Transformed(inverse)   # a point on our side
        w = gp_Dir(*map(float, plane.w)).Transformed(inverse)
        face = BRepBuilderAPI_MakeFace(gp_Pln(m, w)).Face()
        half = BRepPrimAPI_MakeHalfSpace(face, keep).Solid()
        shape = _boolean(BRepAlgoAPI_Common(shape, half), joint, layer.part)
    if key is not None:
        cache.solids[key] = shape
    return shape


def _boolean(operation, joint: ConeJoint, part: str):
    """The result of an OCCT boolean; a null shape when the kernel failed (the markup notes it,
    the stiffness, computed from 2-D sections, does not depend on it)."""
    if not operation.IsDone():
        from OCP.TopoDS import TopoDS_Shape

        return TopoDS_Shape()
    return operation.Shape()
