"""Coaxial holes across parts -> joints with ordered layers, gaps and misalignment.

Holes (and recognised bolts, nuts, washers) are first clustered by axis direction
(parallel within STACK_ANGLE_TOL); inside a cluster the axis positions are projected
onto the plane normal to the direction and indexed in a k-d tree, so matching costs
O(n log n), not O(n^2).  Two items belong to one joint when their circles overlap in
projection and their axial extents are less than one hole diameter apart.

Orientation of a joint (``direction``, from the head side to the nut / tapped side):
a modelled bolt decides (head -> tip); else a blind or tapped hole is last; else a
modelled nut is last; else a counterbore or countersink marks the head side; else
the canonical direction (z > 0, else y > 0, else x > 0) is used.

Positions (``start``/``end``) run along that direction from the head bearing face:
the underside of a modelled head, else the counterbore seat or the top face of the
first layer.  A counterbore seat starts (or, on the nut side, ends) its layer; a
countersunk head is referred to the plate surface, as ISO 10642 lengths are.  A
modelled bolt (head to tip) and nut bound the stack: coaxial holes beyond them are
not part of the joint.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from scipy.spatial import cKDTree
from OCP.TopoDS import TopoDS_Shape

from geomjoint.geometry.hardware import Bolt, Nut, Washer
from geomjoint.geometry.holes import LINEAR_TOL, Hole, axis_frame, canonical_direction

#: axes within this angle count as parallel for grouping, rad (0.5 deg)
STACK_ANGLE_TOL = math.radians(0.5)
#: layers closer than this along the axis are in contact, mm
GAP_TOL = 1e-3
#: a bore matches a tap drill or nominal diameter within this, mm (the catalog's default)
THREAD_MATCH_TOL = 0.05
#: holes larger than this are bores, not fastener holes, mm (ISO 273 coarse for M64 is 70 mm)
MAX_FASTENER_HOLE = 80.0


@dataclass
class Finding:
    severity: str              # "fail" | "warn" | "info"
    code: str                  # stable code of ours
    message: str


@dataclass
class Layer:
    """One solid in the stack, positions along the joint direction from the head bearing face."""

    part: str
    role: str                  # "member" | "washer" | "tapped"
    start: float               # mm
    end: float                 # mm
    hole_diameter: float       # bore diameter of this part's hole, mm
    through: bool = True
    counterbore: float | None = None   # diameter of a counterbore/spot face on the head side
    countersink: float | None = None
    material_hint: str | None = None
    offset: float = 0.0        # radial offset of this hole's axis from the joint axis, mm
    position: tuple[float, float] = (0.0, 0.0)  # hole axis in a plane normal to the joint axis, mm
    hole: Hole | None = field(default=None, repr=False, compare=False)
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)

    @property
    def thickness(self) -> float:
        return self.end - self.start


@dataclass
class Gap:
    between: tuple[str, str]
    size: float                # mm


@dataclass
class Joint:
    """A bolted joint found in the model (mm, model coordinates)."""

    id: str
    kind: str                          # "through" | "tapped" | "blind"
    point: tuple[float, float, float]  # axis point at the head bearing face
    direction: tuple[float, float, float]  # unit, head side -> nut / tapped side
    hole_diameter: float               # clearance hole diameter (smallest non-tapped bore)
    grip: float                        # DESIGN.md: bearing face to bearing face / clamped thickness above the tapped part
    layers: list[Layer]
    gaps: list[Gap] = field(default_factory=list)
    bolt: Bolt | None = None
    nut: Nut | None = None
    washers: list[Washer] = field(default_factory=list)
    nominal: str | None = None         # thread designation, e.g. "M10", "1/2-13 UNC"
    nominal_source: str | None = None  # "bolt" | "nut" | "clearance hole" | "tapped hole"
    misalignment: float = 0.0          # largest pairwise axis offset, mm
    head_bearing_diameter: float | None = None  # modelled head (or washer under it), mm
    nut_bearing_diameter: float | None = None   # modelled nut (or washer under it), mm
    tapped_depth: float | None = None  # depth of the tapped hole, mm
    shortest_length: float | None = None  # shortest standard bolt length that fits, mm
    findings: list[Finding] = field(default_factory=list)

    @property
    def bolt_length(self) -> float | None:
        return self.bolt.length if self.bolt else None

    @property
    def head_kind(self) -> str | None:
        return self.bolt.head_kind if self.bolt else None

    @property
    def nut_height(self) -> float | None:
        return self.nut.height if self.nut else None

    @property
    def tapped(self) -> bool:
        return self.kind == "tapped"


@dataclass
class _Item:
    kind: str                  # "hole" | "washer" | "nut" | "bolt"
    part: str
    ref: np.ndarray
    direction: np.ndarray      # canonical
    radius: float
    t0: float
    t1: float
    obj: object
    material_hint: str | None = None
    solid: TopoDS_Shape | None = None


def _items(holes: list[Hole], hints: dict[str, str | None], bolts, nuts, washers) -> list[_Item]:
    out = []
    for h in holes:
        if h.diameter <= MAX_FASTENER_HOLE:
            out.append(_Item("hole", h.part, h.ref, h.direction, h.diameter / 2, h.t0, h.t1, h,
                             hints.get(h.part), h.solid))
    for w in washers:
        out.append(_Item("washer", w.part, w.ref, w.direction, w.inner / 2, w.t0, w.t1, w,
                         hints.get(w.part), w.solid))
    for n in nuts:
        out.append(_Item("nut", n.part, n.ref, n.direction, n.d / 2, n.t0, n.t1, n, None, n.solid))
    for b in bolts:
        d = canonical_direction(b.direction)
        t_a = float(np.dot(b.bearing_point - b.ref, d))
        t_b = float(np.dot(b.tip_point - b.ref, d))
        out.append(_Item("bolt", b.part, b.ref, d, b.d / 2, min(t_a, t_b), max(t_a, t_b), b,
                         None, b.solid))
    return out


def _direction_clusters(items: list[_Item]) -> list[tuple[np.ndarray, list[int]]]:
    """Greedy clusters of parallel directions (few distinct directions in a model)."""
    clusters: list[tuple[np.ndarray, list[int]]] = []
    cos_tol = math.cos(STACK_ANGLE_TOL)
    for i, it in enumerate(items):
        for d, members in clusters:
            if abs(float(np.dot(d, it.direction))) >= cos_tol:
                members.append(i)
                break
        else:
            clusters.append((it.direction, [i]))
    return clusters


class _UnionFind:
    def __init__(self, n):
        self.p = list(range(n))

    def find(self, i):
        while self.p[i] != i:
            self.p[i] = self.p[self.p[i]]
            i = self.p[i]
        return i

    def union(self, i, j):
        a, b = self.find(i), self.find(j)
        if a != b:
            self.p[max(a, b)] = min(a, b)


def group_items(items: list[_Item]) -> list[tuple[np.ndarray, list[_Item]]]:
    """Connected groups of overlapping coaxial items, each with its cluster direction."""
    groups = []
    for d, idx in _direction_clusters(items):
        u, v = axis_frame(d)
        sub = [items[i] for i in idx]
        mids = np.array([it.ref + 0.5 * (it.t0 + it.t1) * it.direction for it in sub])
        xy = np.column_stack([mids @ u, mids @ v])
        ax = np.array([(it.t0, it.t1) if np.dot(it.direction, d) > 0 else (-it.t1, -it.t0) for it in sub])
        # shift to the cluster direction's parameter: t along d of the item's reference point
        shift = np.array([float(np.dot(it.ref, d)) for it in sub])
        ax = ax + shift[:, None]
        rmax = max(it.radius for it in sub)
        tree = cKDTree(xy)
        uf = _UnionFind(len(sub))
        for i, j in tree.query_pairs(2 * rmax):
            a, b = sub[i], sub[j]
            if np.linalg.norm(xy[i] - xy[j]) >= a.radius + b.radius - LINEAR_TOL:
                continue                       # circles do not overlap
            axial_gap = max(ax[i, 0], ax[j, 0]) - min(ax[i, 1], ax[j, 1])
            reach = 2 * max(a.radius, b.radius)
            if a.kind == "bolt" or b.kind == "bolt":
                reach = 0.0                    # a bolt must reach into the hole
            if axial_gap > reach + GAP_TOL:
                continue
            uf.union(i, j)
        comps: dict[int, list[_Item]] = {}
        for i in range(len(sub)):
            comps.setdefault(uf.find(i), []).append(sub[i])
        for comp in comps.values():
            groups.append((d, comp))
    return groups


def _s_range(it: _Item, origin: np.ndarray, e: np.ndarray) -> tuple[float, float]:
    """Extent of an item along the signed joint direction e, from origin."""
    a = float(np.dot(it.ref + it.t0 * it.direction - origin, e))
    b = float(np.dot(it.ref + it.t1 * it.direction - origin, e))
    return min(a, b), max(a, b)


def build_joint(d: np.ndarray, comp: list[_Item]) -> Joint | None:
    """Order a group of items into a joint, or None when it is not a joint (a lone hole)."""
    bolts = [it for it in comp if it.kind == "bolt"]
    nuts = [it for it in comp if it.kind == "nut"]
    layer_items = [it for it in comp if it.kind in ("hole", "washer")]
    parts = {it.part for it in layer_items}
    if not layer_items or (len(parts) < 2 and not bolts):
        return None
    origin = layer_items[0].ref
    # --- orientation
    bolt = bolts[0].obj if bolts else None
    if bolt is not None:
        e = np.asarray(bolt.direction, dtype=float)
    else:
        e = _orientation(d, origin, layer_items, nuts)
    e = e / np.linalg.norm(e)
    ranges = {id(it): _s_range(it, origin, e) for it in comp}
    # effective extent: a counterbore seat is where a head, nut or washer bears; a countersunk
    # head is referred to the plate surface (its top, as ISO 10642 lengths are), so a
    # countersink does not move the layer's start
    eff = {}
    for it in layer_items:
        r0, r1 = ranges[id(it)]
        s0, s1 = r0, r1
        if it.kind == "hole":
            h: Hole = it.obj
            for feat in (h.counterbore,):
                if feat is None:
                    continue
                seat_s = float(np.dot(h.point_at(feat[1]) - origin, e))
                end_s = float(np.dot(h.point_at(h.t0 if feat[2] == "start" else h.t1) - origin, e))
                if abs(end_s - r0) < LINEAR_TOL:     # opens towards the head
                    s0 = max(s0, seat_s)
                elif abs(end_s - r1) < LINEAR_TOL:   # opens towards the nut
                    s1 = min(s1, seat_s)
            if not h.through:
                # a drill point (cone) at the bottom of a blind hole holds no thread
                cyl = [sec for sec in h.sections if sec.kind == "cylinder"]
                t_bottom = max(c.t1 for c in cyl) if h.closed == "end" else min(c.t0 for c in cyl)
                b_s = float(np.dot(h.point_at(t_bottom) - origin, e))
                if abs(b_s - r1) < abs(b_s - r0):
                    s1 = min(s1, b_s)
                else:
                    s0 = max(s0, b_s)
        eff[id(it)] = (s0, s1)
    # a bolt or nut bounds the stack: coaxial holes beyond them belong to something else
    lo, hi = -math.inf, math.inf
    if bolt is not None:
        sb_ = float(np.dot(bolt.bearing_point - origin, e))
        lo, hi = sb_ - GAP_TOL, sb_ + bolt.length + GAP_TOL
    if nuts:
        hi = min(hi, ranges[id(nuts[0])][1] - GAP_TOL)
    layer_items = [it for it in layer_items if eff[id(it)][1] > lo and eff[id(it)][0] < hi]
    if not layer_items:
        return None
    layer_items.sort(key=lambda it: (eff[id(it)][0], eff[id(it)][1]))
    # --- head bearing face
    if bolt is not None:
        s_b = float(np.dot(bolt.bearing_point - origin, e))
    else:
        s_b = eff[id(layer_items[0])][0]
    # --- tapped / blind last layer
    last = layer_items[-1]
    kind = "through"
    tapped = False
    if last.kind == "hole" and len(layer_items) >= 1:
        h = last.obj
        s0, s1 = ranges[id(last)]
        closed_far = (not h.through) and _closed_end_s(h, origin, e) > 0.5 * (s0 + s1)
        others = [it.obj.diameter if it.kind == "hole" else it.obj.inner
                  for it in layer_items[:-1]]
        # a smaller bore at the far end is tapped when blind, or when it is a tap-drill or
        # nominal size (a 10.5 mm hole under 11 mm ones is a fine clearance, not a thread)
        smaller = (bool(others) and h.diameter < min(others) - LINEAR_TOL
                   and (not h.through or _threaded_size(h.diameter, min(others))))
        engaged = bolt is not None and bolt.d >= h.diameter - LINEAR_TOL
        if not nuts and (smaller or engaged):
            tapped = True
            kind = "tapped"
        elif closed_far:
            kind = "blind"
    layers: list[Layer] = []
    for it in layer_items:
        s0, s1 = eff[id(it)]
        if it.kind == "washer":
            w: Washer = it.obj
            layers.append(Layer(it.part, "washer", s0 - s_b, s1 - s_b, w.inner, True,
                                material_hint=it.material_hint, solid=it.solid))
            continue
        h = it.obj
        role = "tapped" if (tapped and it is last) else "member"
        cb = h.counterbore[0] if h.counterbore and abs(eff[id(it)][0] - ranges[id(it)][0]) > LINEAR_TOL else None
        cs = None
        if h.countersink is not None:
            open_s = float(np.dot(h.point_at(h.t0 if h.countersink[2] == "start" else h.t1) - origin, e))
            if abs(open_s - ranges[id(it)][0]) < LINEAR_TOL:     # opens towards the head
                cs = h.countersink[0]
        layers.append(Layer(it.part, role, s0 - s_b, s1 - s_b, h.diameter, h.through,
                            counterbore=cb, countersink=cs, material_hint=it.material_hint,
                            hole=h, solid=it.solid))
    # --- gaps between consecutive solids (head, layers, nut)
    gaps: list[Gap] = []
    chain: list[tuple[str, float, float]] = []
    if bolt is not None:
        chain.append((bolt.part, -math.inf, 0.0))
    chain += [(l.part, l.start, l.end) for l in layers]
    nut = nuts[0].obj if nuts else None
    if nut is not None:
        n0, n1 = ranges[id(nuts[0])]
        chain.append((nut.part, n0 - s_b, n1 - s_b))
    findings: list[Finding] = []
    for (pa, _, ea), (pb, sb, _) in zip(chain, chain[1:]):
        g = sb - ea
        if g > GAP_TOL:
            gaps.append(Gap((pa, pb), g))
            findings.append(Finding("warn", "gap", f"gap of {g:.3f} mm between {pa} and {pb}"))
        elif g < -GAP_TOL:
            findings.append(Finding("warn", "overlap",
                                    f"{pa} and {pb} overlap by {-g:.3f} mm along the axis"))
    # two parts filling the same axial range: a part placed twice on top of itself (a copy
    # left behind in the CAD model); the stack cannot be real
    for la, lb in zip(layers, layers[1:]):
        if abs(la.start - lb.start) <= GAP_TOL and abs(la.end - lb.end) <= GAP_TOL:
            findings.append(Finding("fail", "duplicate",
                                    f"{la.part} and {lb.part} occupy the same space along the axis "
                                    f"({la.start:.3f} to {la.end:.3f} mm): a duplicated part?"))
    # --- axis: of the head-side hole (or the bolt)
    head_item = bolts[0] if bolts else layer_items[0]
    p0 = head_item.ref + float(np.dot(origin + s_b * e - head_item.ref, head_item.direction)) * head_item.direction
    u, v = axis_frame(e)
    for l, it in zip(layers, layer_items):
        q = it.ref - p0
        q = q - np.dot(q, it.direction) * it.direction
        l.position = (float(np.dot(q, u)), float(np.dot(q, v)))
        l.offset = float(np.hypot(*l.position))
    clearance_d = [l.hole_diameter for l in layers if l.role == "member"] or \
        [l.hole_diameter for l in layers if l.role == "washer"]
    hole_d = min(clearance_d) if clearance_d else layers[-1].hole_diameter
    if tapped:
        grip = layers[-1].start
        tapped_depth = layers[-1].thickness
    else:
        grip = layers[-1].end
        tapped_depth = None
    washers = [it.obj for it in layer_items if it.kind == "washer"]
    j = Joint(id="", kind=kind, point=tuple(float(x) for x in p0), direction=tuple(float(x) for x in e),
              hole_diameter=hole_d, grip=grip, layers=layers, gaps=gaps, bolt=bolt, nut=nut,
              washers=washers, tapped_depth=tapped_depth, findings=findings)
    j.misalignment = max((math.dist(a.position, b.position) for a in layers for b in layers), default=0.0)
    if bolt is not None:
        first_w = bool(washers) and layers[0].role == "washer"
        j.head_bearing_diameter = washers[0].outer if first_w else bolt.bearing_diameter
    if nut is not None:
        last_w = bool(washers) and layers[-1].role == "washer"
        j.nut_bearing_diameter = washers[-1].outer if (last_w and washers) else nut.bearing_diameter
    return j


def _threaded_size(diameter: float, clearance: float) -> bool:
    """True when `diameter` is the tap drill or nominal of a thread that `clearance` clears.

    Without a thread for the clearance, the catalog's best match for the bore decides.
    """
    from geomjoint import catalog

    tol = THREAD_MATCH_TOL
    cleared = [t for t, how in catalog.nominal_from_hole(clearance) if how not in ("tap drill", "nominal")]
    if cleared:
        return any(abs(diameter - t.d) <= tol or abs(diameter - catalog.tap_drill(t)) <= tol for t in cleared)
    found = catalog.nominal_from_hole(diameter)
    return bool(found) and found[0][1] in ("tap drill", "nominal")


def _closed_end_s(h: Hole, origin, e) -> float:
    t = h.t0 if h.closed == "start" else h.t1
    return float(np.dot(h.point_at(t) - origin, e))


def _orientation(d, origin, layer_items, nuts) -> np.ndarray:
    d = np.asarray(d, dtype=float)

    def s_mid(it):
        return float(np.dot(it.ref + 0.5 * (it.t0 + it.t1) * it.direction - origin, d))

    holes = [it for it in layer_items if it.kind == "hole"]
    ordered = sorted(layer_items, key=s_mid)
    # a blind hole, or a smaller (tapped) bore at one end of the stack, is the far end
    for it in (ordered[0], ordered[-1]):
        if it.kind == "hole" and not it.obj.through:
            return d if it is ordered[-1] else -d
    if nuts:
        n = nuts[0]
        return d if s_mid(n) > s_mid(ordered[0]) else -d
    if len(holes) >= 2:
        first, lastd = ordered[0], ordered[-1]
        if first.kind == "hole" and lastd.kind == "hole":
            df, dl = first.obj.diameter, lastd.obj.diameter
            if dl < df - LINEAR_TOL and all(o.obj.diameter >= df - LINEAR_TOL for o in ordered[:-1] if o.kind == "hole"):
                return d
            if df < dl - LINEAR_TOL and all(o.obj.diameter >= dl - LINEAR_TOL for o in ordered[1:] if o.kind == "hole"):
                return -d
    # a counterbore / countersink opening outwards at one end marks the head side
    for it, low_end, result in ((ordered[0], "start", d), (ordered[-1], "end", -d)):
        if it.kind != "hole":
            continue
        h = it.obj
        for feat in (h.counterbore, h.countersink):
            if feat is not None and (feat[2] == low_end) == (float(np.dot(h.direction, d)) > 0):
                return result
    return d


def find_joints(holes: list[Hole], bolts: list[Bolt], nuts: list[Nut], washers: list[Washer],
                hints: dict[str, str | None] | None = None) -> list[Joint]:
    """Group holes and hardware into joints, ordered and numbered by position."""
    items = _items(holes, hints or {}, bolts, nuts, washers)
    if not items:
        return []
    joints = []
    for d, comp in group_items(items):
        j = build_joint(d, comp)
        if j is not None:
            joints.append(j)
    joints.sort(key=lambda j: tuple(round(c, 3) + 0.0 for c in j.point))
    for k, j in enumerate(joints, 1):
        j.id = f"J{k:02d}"
    return joints
