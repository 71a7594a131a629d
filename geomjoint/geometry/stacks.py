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

Where the thread is: a modelled screw that cannot pass a hole whose bore is a thread size of
the screw (its tap drill, basic minor or nominal diameter; in a plastic part, or for a screw
named thread-forming, a bore from THREAD_FORMING_MIN_RATIO d up) is threaded into that part,
which ends the joint as its tapped layer (:func:`thread_bore`).  A sleeve whose outer
cylinder fills another part's hole and whose bore holds the thread is an *insert*: the
tapped layer is the insert, its host is recorded (`InsertHost`) for the pull-out check.

Stacks that are no joint (:func:`set_aside_reason`): with no fastener modelled, a stack
holding a part that is no fastener (a pin, shaft, bushing or tube: a cylinder filling the
hole, or so named) or whose bores match no clearance hole and no tap drill of any catalogue
size.  They are returned apart (`SetAside`, ids H01, H02 ...) so a job can still bring one in.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from scipy.spatial import cKDTree
from OCP.gp import gp_Pnt
from OCP.TopoDS import TopoDS_Shape

from geomjoint.catalog.hole_parts import FORMING_KIND, hole_part_kind
from geomjoint.geometry.hardware import SIZE_TOL, Bolt, Nut, Washer
from geomjoint.geometry.holes import (
    LINEAR_TOL,
    MIN_WRAP,
    Hole,
    SolidFaces,
    _merge_sections,
    axis_frame,
    canonical_direction,
    group_by_axis,
)

#: axes within this angle count as parallel for grouping, rad (0.5 deg)
STACK_ANGLE_TOL = math.radians(0.5)
#: layers closer than this along the axis are in contact, mm (exports round coordinates and
#: tessellate fits to micrometres: a 2 um "gap" under a head is noise; no designer draws one
#: below 0.01 mm)
GAP_TOL = 0.01
#: a bore matches a tap drill or nominal diameter within this, mm (the catalog's default)
THREAD_MATCH_TOL = 0.05
#: holes larger than this are bores, not fastener holes, mm (ISO 273 coarse for M64 is 70 mm)
MAX_FASTENER_HOLE = 80.0
#: a thread-forming screw's pilot hole in a plastic part is about 0.8 d; a bore from this share
#: of the screw's diameter up is taken as formed by the screw (common practice: design guides
#: for screws into thermoplastics give 0.7-0.9 d, from memory)
THREAD_FORMING_MIN_RATIO = 0.7
#: a cylinder "fills" a hole when the diameters differ by less than this plus FILL_GAP_RATIO d:
#: a located or press fit (H7/g6 .. H7/p6 differ by hundredths), well inside the smallest
#: clearance fit of a bolt (ISO 273 fine is 0.1 mm over d at M1.6, 6 % over d at M3), mm
FILL_GAP = 0.05
FILL_GAP_RATIO = 0.005
#: a part named as no fastener (pin, shaft, tube ...) fills a hole when its cylinder is at least
#: this share of the hole's diameter (a loose tube in a bore)
NAMED_FILL_MIN_RATIO = 0.5
#: an insert sits in its host's hole: it may stand proud of the host's face by this much at most
#: (heat-set inserts are set flush or a little below, common practice), mm
INSERT_PROUD_MAX = 0.5
#: materials (catalogue names) of a light alloy host, in which a screw often sits in an insert
LIGHT_ALLOYS = ("aluminium", "cast aluminium")
#: a clamped hole wider than this many nominal diameters is no clearance hole of that size (ISO 273
#: coarse holes are at most 1.25 d, at M1.6; a counterbore is a feature of its own)
CLEARANCE_MAX_RATIO = 1.5
#: probes for a part clamped under a head without a whole hole (a slot or notch): this far
#: outside the shank, at these shares of the head gap and this many angles around the axis
OPEN_PROBE_OUTSIDE = 0.3            # mm
OPEN_PROBE_SHARES = (0.1, 0.5, 0.9)
OPEN_PROBE_ANGLES = 12
#: a part is clamped in the gap when its material is at least at this many probe angles at every
#: share (the two sides of a slot, or a notch's three)
OPEN_PROBE_MIN_HITS = 2
#: a screw running on past its stack into a part with no hole drawn there is threaded into it
#: when it overlaps the part's material by at least this share of its diameter (less is a
#: modelling slip, not a thread); probed at this many points along the overlap
UNDRILLED_MIN_DEPTH_RATIO = 0.5
UNDRILLED_PROBES = 20
#: prefix of the ids of stacks set aside (not joints)
SET_ASIDE_PREFIX = "H"


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
    open: bool = False         # no whole hole around the bolt (a slot or notch): hole_diameter is the bolt's

    @property
    def thickness(self) -> float:
        return self.end - self.start


@dataclass
class Gap:
    between: tuple[str, str]
    size: float                # mm


@dataclass
class Plug:
    """The outer cylinder of a part that is no recognised fastener: what may fill a hole (a pin,
    a shaft, a tube, the outside of an insert), mm, model coordinates."""

    part: str
    ref: np.ndarray
    direction: np.ndarray      # canonical
    diameter: float
    t0: float
    t1: float
    kind: str | None = None    # what the part's name says (catalog.hole_parts): "insert", "pin" ...
    material_hint: str | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)


@dataclass
class InsertHost:
    """The part an insert sits in (the insert itself is the joint's tapped layer), mm."""

    part: str                  # the host part
    insert: str                # the insert part
    outer_diameter: float      # the insert's outer cylinder (the host's bore), mm
    length: float              # the insert's length along the axis, mm
    kind: str                  # "insert" | "wire insert": from the name, or "insert" from the shape
    how: str                   # "name" | "shape": how it was recognised
    host_hint: str | None = None
    insert_hint: str | None = None


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
    thread_method: str | None = None   # tapped joints: "tapped" | "insert" | "thread-forming"
    insert: InsertHost | None = None   # the host of the insert that is the tapped layer
    threaded_bore: str | None = None   # how the tapped bore matched: "tap drill" | "minor" | "nominal" | ...

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
class SetAside:
    """A coaxial hole stack that is not a joint, with why (mm). ``joint`` is the stack built as a
    joint, so a job that names its size can still bring it in."""

    id: str
    code: str                  # the finding code: "not-a-bolt-hole" | "holds-a-part"
    reason: str                # one line: why it is no joint
    joint: Joint

    @property
    def parts(self) -> list[str]:
        return [l.part for l in self.joint.layers]


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


def find_plugs(part: str, faces: SolidFaces, kind: str | None = None, material_hint: str | None = None,
               solid: TopoDS_Shape | None = None) -> list[Plug]:
    """The whole outer cylinders of a part (split faces merged), each a `Plug` that may fill a hole."""
    outer = [p for p in faces.patches if not p.is_hole and p.kind == "cylinder"]
    plugs = []
    for group in group_by_axis(outer):
        for sec, wrap in _merge_sections(group):
            if sec.kind == "cylinder" and wrap >= MIN_WRAP and 2 * sec.r0 <= MAX_FASTENER_HOLE:
                plugs.append(Plug(part, group[0].ref, group[0].direction, 2 * sec.r0, sec.t0, sec.t1,
                                  kind, material_hint, solid))
    return plugs


def fill_tolerance(diameter: float) -> float:
    """How far a cylinder's diameter may differ from a hole's and still fill it, mm."""
    return FILL_GAP + FILL_GAP_RATIO * diameter


def _fills(plug: Plug, hole: Hole, offset: float) -> bool:
    """True when the plug sits in a cylinder section of the hole and fills it (or, named as no
    fastener, sits loosely in it)."""
    tol = fill_tolerance(plug.diameter)
    if offset > tol:
        return False
    sign = 1.0 if float(np.dot(plug.direction, hole.direction)) > 0 else -1.0
    shift = float(np.dot(plug.ref - hole.ref, hole.direction))
    p0, p1 = sorted((shift + sign * plug.t0, shift + sign * plug.t1))
    from geomjoint.catalog.hole_parts import NON_FASTENER_KINDS

    for sec in hole.sections:
        if sec.kind != "cylinder" or min(p1, sec.t1) - max(p0, sec.t0) <= GAP_TOL:
            continue
        d = 2 * sec.r0
        if abs(plug.diameter - d) <= tol:
            return True
        if plug.kind in NON_FASTENER_KINDS and NAMED_FILL_MIN_RATIO * d <= plug.diameter < d:
            return True
    return False


def _items(holes: list[Hole], hints: dict[str, str | None], bolts, nuts, washers,
           plugs: list[Plug] = ()) -> list[_Item]:
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
    for p in plugs:
        out.append(_Item("plug", p.part, p.ref, p.direction, p.diameter / 2, p.t0, p.t1, p,
                         p.material_hint, p.solid))
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
            if "plug" in (a.kind, b.kind):
                # a plug joins only the hole of another part it sits in and fills
                plug, other = (a, b) if a.kind == "plug" else (b, a)
                if (other.kind == "hole" and other.part != plug.part
                        and _fills(plug.obj, other.obj, float(np.linalg.norm(xy[i] - xy[j])))):
                    uf.union(i, j)
                continue
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
    plugs = [it for it in comp if it.kind == "plug"]
    comp = [it for it in comp if it.kind != "plug"]
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
    # --- where the thread is: an insert, a part the screw is threaded into, else the last layer
    kind = "through"
    tapped = False
    thread_method = threaded_bore = None
    insert: InsertHost | None = None
    found_insert = _insert_in(layer_items, plugs, bolt)
    threaded_at = None
    if found_insert is not None and not nuts:
        sleeve, host, insert = found_insert
        # the clamped parts bear on the host's face (or on the insert where it stands proud)
        eff[id(sleeve)] = (min(eff[id(sleeve)][0], eff[id(host)][0]), eff[id(sleeve)][1])
        layer_items = [it for it in layer_items if it is not host]
        threaded_at = layer_items.index(sleeve)
        thread_method, threaded_bore = "insert", insert.how
    elif bolt is not None and not nuts:
        forming = hole_part_kind(bolt.part) == FORMING_KIND
        found = []
        for k, it in enumerate(layer_items):
            if it.kind != "hole" or bolt.d < it.obj.diameter - LINEAR_TOL:
                continue                       # a washer, or a hole the bolt passes
            how = thread_bore(it.obj.diameter, bolt.d, it.material_hint, forming)
            if how is not None:
                found.append((k, how))
        # a tap-drill, minor or formed bore is the thread; a bore at the nominal diameter may be a
        # clearance modelled line to line, so of those the last the screw reaches is the thread
        drilled = [f for f in found if f[1] != "nominal"]
        if found:
            threaded_at, threaded_bore = drilled[0] if drilled else found[-1]
            thread_method = "thread-forming" if threaded_bore == "thread-forming" else "tapped"
    beyond: list[str] = []
    odd_bore = False
    if threaded_at is not None:
        # the part the screw is threaded into ends the joint: what lies beyond is not clamped
        beyond = list(dict.fromkeys(it.part for it in layer_items[threaded_at + 1:]))
        layer_items = layer_items[:threaded_at + 1]
        tapped, kind = True, "tapped"
        if bolt is None and len({it.part for it in layer_items}) < 2:
            return None                        # a threaded hole with nothing clamped on it
    last = layer_items[-1]
    if threaded_at is None and last.kind == "hole":
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
            thread_method = "tapped"
            odd_bore = engaged
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
        hint = insert.insert_hint if (insert is not None and it is last) else it.material_hint
        cb = h.counterbore[0] if h.counterbore and abs(eff[id(it)][0] - ranges[id(it)][0]) > LINEAR_TOL else None
        cs = None
        if h.countersink is not None:
            open_s = float(np.dot(h.point_at(h.t0 if h.countersink[2] == "start" else h.t1) - origin, e))
            if abs(open_s - ranges[id(it)][0]) < LINEAR_TOL:     # opens towards the head
                cs = h.countersink[0]
        layers.append(Layer(it.part, role, s0 - s_b, s1 - s_b, h.diameter, h.through,
                            counterbore=cb, countersink=cs, material_hint=hint,
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
    if threaded_at is not None:
        findings.append(_thread_finding(layers[-1], bolt, thread_method, threaded_bore, insert, beyond))
    if threaded_at is None and odd_bore:
        findings.append(Finding("warn", "thread-in-hole",
                                f"{bolt.part} ({bolt.d:.2f} mm) cannot pass the {layers[-1].hole_diameter:.2f} mm hole of "
                                f"{layers[-1].part}, which is no tap-drill, minor or nominal diameter of its thread: "
                                f"taken as tapped there; check the model"))
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
              washers=washers, tapped_depth=tapped_depth, findings=findings,
              thread_method=thread_method if tapped else None, insert=insert, threaded_bore=threaded_bore)
    j.misalignment = max((math.dist(a.position, b.position) for a in layers for b in layers), default=0.0)
    if bolt is not None:
        first_w = bool(washers) and layers[0].role == "washer"
        j.head_bearing_diameter = washers[0].outer if first_w else bolt.bearing_diameter
    if nut is not None:
        last_w = bool(washers) and layers[-1].role == "washer"
        j.nut_bearing_diameter = washers[-1].outer if (last_w and washers) else nut.bearing_diameter
    return j


def thread_bore(hole: float, bolt_d: float, material_hint: str | None = None, forming: bool = False) -> str | None:
    """How a bore of diameter `hole` holds the thread of a screw modelled at `bolt_d` (mm), or None.

    "thread-forming": a screw named so, or any screw in a plastic part (`material_hint`), in a
    bore from THREAD_FORMING_MIN_RATIO d up to d (the screw forms its own thread);
    else "tap drill" | "minor" | "nominal": the bore is the tap drill, the basic minor diameter
    D1 or the nominal diameter of a catalogue thread of that diameter, within THREAD_MATCH_TOL.

    >>> thread_bore(4.04, 4.826), thread_bore(8.5, 10.0), thread_bore(6.0, 10.0)
    ('tap drill', 'tap drill', None)
    >>> thread_bore(2.5, 3.0, "PLA"), thread_bore(2.4, 3.0, forming=True)
    ('thread-forming', 'thread-forming')
    """
    from geomjoint import catalog

    if (forming or catalog.creeps_under_preload(material_hint)) and \
            THREAD_FORMING_MIN_RATIO * bolt_d - LINEAR_TOL <= hole < bolt_d - LINEAR_TOL:
        return "thread-forming"
    for t in catalog.thread_sizes():
        if abs(t.d - bolt_d) > SIZE_TOL * t.d:
            continue
        for value, how in ((catalog.tap_drill(t), "tap drill"), (t.D1, "minor"), (t.d, "nominal")):
            if abs(hole - value) <= THREAD_MATCH_TOL:
                return how
    return None


def _bore_is_tap_drill(hole: float) -> bool:
    """True when `hole` is the tap drill or basic minor diameter of some catalogue thread."""
    from geomjoint import catalog

    return any(how == "tap drill" for _, how in catalog.nominal_from_hole(hole, None, THREAD_MATCH_TOL))


def _insert_in(layer_items: list[_Item], plugs: list[_Item], bolt: Bolt | None
               ) -> tuple[_Item, _Item, InsertHost] | None:
    """(the insert's hole item, the host's hole item, the host record) when a sleeve of the stack is
    an insert: its outer cylinder fills another part's hole, its bore holds the thread.

    An insert by its name ("heat set insert", "Helicoil" ...), or by its shape: with a screw
    modelled, a sleeve the screw cannot pass whose bore is a thread size of the screw (its tap
    drill, minor or nominal diameter); with none, a sleeve whose bore is a tap drill or minor
    diameter of some catalogue size.  A sleeve the screw passes is a spacer, not an insert.
    """
    from geomjoint.catalog.hole_parts import INSERT_KINDS, INSERT_MATERIALS, NON_FASTENER_KINDS

    holes = [it for it in layer_items if it.kind == "hole"]
    for p in plugs:
        sleeve = next((it for it in holes if it.part == p.part), None)
        if sleeve is None:
            continue
        host = next((it for it in holes if it.part != p.part and _fills(p.obj, it.obj, _axis_offset(p, it))), None)
        if host is None:
            continue
        bore = sleeve.obj.diameter
        named = p.obj.kind in INSERT_KINDS
        if p.obj.kind in NON_FASTENER_KINDS or not _inside(p, host):
            continue                           # a tube, pin or bushing; or a sleeve running on beyond its host
        if bolt is not None:
            if bolt.d < bore - LINEAR_TOL:
                continue                       # the screw passes: a spacer sleeve or a bushing
            shaped = thread_bore(bore, bolt.d) is not None
        else:
            shaped = _bore_is_tap_drill(bore)
        if not (named or shaped):
            continue
        s0, s1 = sorted((p.t0, p.t1))
        return sleeve, host, InsertHost(part=host.part, insert=p.part, outer_diameter=p.obj.diameter,
                                        length=s1 - s0, kind=p.obj.kind if named else "insert",
                                        how="name" if named else "shape", host_hint=host.material_hint,
                                        insert_hint=sleeve.material_hint or INSERT_MATERIALS[p.obj.kind if named else "insert"])
    return None


def _inside(plug: _Item, host: _Item) -> bool:
    """True when the plug lies along the axis within the host's hole (proud by INSERT_PROUD_MAX at most)."""
    d = host.direction
    shift = float(np.dot(plug.ref - host.ref, d))
    sign = 1.0 if float(np.dot(plug.direction, d)) > 0 else -1.0
    p0, p1 = sorted((shift + sign * plug.t0, shift + sign * plug.t1))
    return p0 >= host.t0 - INSERT_PROUD_MAX and p1 <= host.t1 + INSERT_PROUD_MAX


def _axis_offset(a: _Item, b: _Item) -> float:
    """Distance between the (parallel) axes of two items, mm."""
    q = a.ref - b.ref
    q = q - float(np.dot(q, b.direction)) * b.direction
    return float(np.linalg.norm(q))


def _thread_finding(layer: Layer, bolt: Bolt | None, method: str, bore: str | None,
                    insert: InsertHost | None, beyond: list[str]) -> Finding:
    """The info finding that says where the thread of a tapped joint is, and why."""
    if method == "insert":
        what = (f"{layer.part} is an insert ({'by its name' if insert.how == 'name' else 'by its shape'}: a sleeve "
                f"{insert.outer_diameter:.2f} mm in {insert.part}, bore {layer.hole_diameter:.2f} mm): "
                f"the internal thread of the joint, no nut")
    elif method == "thread-forming":
        screw = f"{bolt.part} ({bolt.d:.2f} mm)" if bolt else "the screw"
        what = (f"{screw} forms its thread in the {layer.hole_diameter:.2f} mm hole of {layer.part} "
                f"(thread-forming into {layer.material_hint or 'the part'})")
    else:
        screw = f"{bolt.part} ({bolt.d:.2f} mm)" if bolt else "the screw"
        what = (f"{screw} is threaded into the {layer.hole_diameter:.2f} mm hole of {layer.part} "
                f"(the {bore} diameter of its thread): a tapped joint, not interference")
    if beyond:
        what += f"; {', '.join(beyond)} beyond it is not clamped by this screw"
    return Finding("info", "thread-in-hole", what)


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
                hints: dict[str, str | None] | None = None, plugs: list[Plug] = ()) -> list[Joint]:
    """Group holes and hardware into joints, ordered and numbered by position."""
    return find_stacks(holes, bolts, nuts, washers, hints, plugs)[0]


def find_stacks(holes: list[Hole], bolts: list[Bolt], nuts: list[Nut], washers: list[Washer],
                hints: dict[str, str | None] | None = None, plugs: list[Plug] = ()
                ) -> tuple[list[Joint], list[SetAside]]:
    """The joints (J01, J02 ...) and the coaxial stacks that are no joint (H01, H02 ...), each
    ordered and numbered by position."""
    items = _items(holes, hints or {}, bolts, nuts, washers, plugs)
    if not items:
        return [], []
    joints: list[Joint] = []
    aside: list[SetAside] = []
    for d, group in group_items(items):
        for comp in _per_bolt(group):
            j = build_joint(d, comp)
            if j is None:
                continue
            why = set_aside_reason(j, [it.obj for it in comp if it.kind == "plug"])
            if why is None:
                joints.append(j)
            else:
                aside.append(SetAside("", why[0], why[1], j))
    number(joints, aside)
    return joints, aside


def number(joints: list[Joint], aside: list[SetAside]) -> None:
    """Order joints and set-aside stacks by position and give them their ids (J01 ..., H01 ...)."""
    key = lambda j: tuple(round(c, 3) + 0.0 for c in j.point)   # noqa: E731
    joints.sort(key=key)
    for k, j in enumerate(joints, 1):
        j.id = f"J{k:02d}"
    aside.sort(key=lambda a: key(a.joint))
    for k, a in enumerate(aside, 1):
        a.id = a.joint.id = f"{SET_ASIDE_PREFIX}{k:02d}"


def _parts_outside_stack(j: Joint, parts, cache: dict | None):
    """(name, located solid, material hint, point classifier) of each part of ``parts`` that is
    neither a layer of the joint nor its bolt; a part's classifier is built once and kept in
    ``cache`` between joints (building it is the costly step)."""
    from geomjoint.geometry.holes import _Inside

    in_stack = {l.part for l in j.layers} | {j.bolt.part}
    cache = {} if cache is None else cache
    for name, solid, hint in parts:
        if name in in_stack:
            continue
        inside = cache.get(name)
        if inside is None:
            inside = cache[name] = _Inside(solid)
        yield name, solid, hint, inside


def open_hole_layer(j: Joint, parts, cache: dict | None = None) -> Layer | None:
    """A part clamped between a modelled head and the first layer of its stack whose hole around
    the bolt is not whole (a slot, a notch, a hole cut by the part's edge): the material beside
    the shank fills the gap under the head.  ``parts``: (name, located solid, material hint) of
    the parts that are no hardware; ``cache`` keeps each part's point classifier between joints.
    Returns the layer (its hole taken as the bolt's diameter), or None."""
    if j.bolt is None or not j.layers or j.layers[0].start <= GAP_TOL:
        return None
    g = j.layers[0].start
    e = np.asarray(j.direction, dtype=float)
    p0 = np.asarray(j.point, dtype=float)
    u, v = axis_frame(e)
    r = j.bolt.d / 2 + OPEN_PROBE_OUTSIDE
    angles = [2 * math.pi * k / OPEN_PROBE_ANGLES for k in range(OPEN_PROBE_ANGLES)]
    rings = [[p0 + f * g * e + r * (math.cos(a) * u + math.sin(a) * v) for a in angles] for f in OPEN_PROBE_SHARES]
    for name, solid, hint, inside in _parts_outside_stack(j, parts, cache):
        if inside.box.IsOut(gp_Pnt(*map(float, rings[1][0]))) and inside.box.IsOut(gp_Pnt(*map(float, rings[1][6]))):
            continue                           # far from this joint
        if all(sum(inside(q) for q in ring) >= OPEN_PROBE_MIN_HITS for ring in rings):
            return Layer(name, "member", 0.0, g, j.bolt.d, True, material_hint=hint, solid=solid, open=True)
    return None


def undrilled_thread_layer(j: Joint, parts, cache: dict | None = None) -> Layer | None:
    """The part a modelled screw runs into past the end of its stack where that part has no hole
    drawn (a bought part drawn as a plain solid): the screw's thread is in it.  Only where the
    stack has no thread of its own (no nut, no tapped layer, or one taken as tapped only for a
    bore at the screw's nominal diameter, which may be a clearance drawn line to line).
    ``parts``: (name, located solid, material hint) of the parts that are no hardware.  Returns
    the tapped layer (no hole: ``open``, its bore the screw's diameter), or None."""
    b = j.bolt
    if b is None or j.nut is not None or not j.layers:
        return None
    last = j.layers[-1]
    if last.role == "tapped" and not (j.threaded_bore == "nominal" and len(j.layers) >= 1):
        return None
    if last.role == "washer":
        return None
    s0, tip = last.end, b.length
    if tip - s0 < UNDRILLED_MIN_DEPTH_RATIO * b.d:
        return None
    e = np.asarray(j.direction, dtype=float)
    p0 = np.asarray(j.point, dtype=float)
    steps = [s0 + (tip - s0) * (k + 0.5) / UNDRILLED_PROBES for k in range(UNDRILLED_PROBES)]
    for name, solid, hint, inside in _parts_outside_stack(j, parts, cache):
        hits = [s for s in steps if inside(p0 + s * e)]
        if not hits or hits[0] > steps[1] + LINEAR_TOL:
            continue                           # not where the stack ends
        start = s0
        end = min(max(hits) + (tip - s0) / (2 * UNDRILLED_PROBES), tip)
        if end - start < UNDRILLED_MIN_DEPTH_RATIO * b.d:
            continue
        return Layer(name, "tapped", start, end, b.d, False, material_hint=hint, solid=solid, open=True)
    return None


def add_undrilled_layer(j: Joint, layer: Layer) -> None:
    """Make the part with no hole drawn the joint's tapped layer (a nominal bore before it is clamped)."""
    last = j.layers[-1]
    if last.role == "tapped":
        last.role = "member"                   # a clearance drawn line to line, now clamped
    j.findings = [f for f in j.findings if f.code != "thread-in-hole"]
    j.layers.append(layer)
    j.kind, j.thread_method, j.threaded_bore = "tapped", "tapped", "not drawn"
    j.grip, j.tapped_depth = layer.start, layer.thickness
    j.hole_diameter = min(l.hole_diameter for l in j.layers if l.role == "member") if any(
        l.role == "member" for l in j.layers) else layer.hole_diameter
    j.findings.append(Finding("warn", "thread-in-hole",
                              f"{j.bolt.part} runs {layer.thickness:.2f} mm into {layer.part}, which has no hole "
                              f"drawn there: taken as tapped into it (a bought part drawn without its tapped "
                              f"hole?); check the model"))


def add_open_layer(j: Joint, layer: Layer) -> None:
    """Put the open-hole layer under the head: the gap it fills and its finding go."""
    j.layers.insert(0, layer)
    first = j.layers[1].part
    j.gaps = [gp for gp in j.gaps if gp.between != (j.bolt.part, first)]
    j.findings = [f for f in j.findings if not (f.code == "gap" and j.bolt.part in f.message and first in f.message)]
    j.findings.append(Finding("info", "open-hole", f"{layer.part} is clamped under the head of {j.bolt.part} "
                                                   f"({layer.thickness:.2f} mm) but has no whole hole around it "
                                                   f"(a slot or notch): its hole is taken as the bolt's "
                                                   f"{j.bolt.d:.2f} mm"))
    j.hole_diameter = min(l.hole_diameter for l in j.layers if l.role == "member")


def _per_bolt(group: list[_Item]) -> list[list[_Item]]:
    """One group per modelled bolt: screws from both ends of one bore (a shaft tapped at each
    end) are two joints, and a pattern of screws whose holes a wide bore links is one joint per
    screw.  Each keeps the holes, washers and nuts its shank passes (their circles overlap its
    own in projection; build_joint bounds them along the axis) and the nuts on its own length."""
    bolts = [it for it in group if it.kind == "bolt"]
    if not bolts:
        return [group]
    out = []
    for b in bolts:
        bolt: Bolt = b.obj
        e = np.asarray(bolt.direction, dtype=float)
        s_bear = float(np.dot(bolt.bearing_point, e))
        keep = [b]
        for it in group:
            if it.kind == "bolt":
                continue
            if it.kind != "plug" and _axis_offset(it, b) >= it.radius + b.radius - LINEAR_TOL:
                continue                       # a hole beside this shank, linked by a wider one
            if it.kind == "nut":
                a, c = sorted(float(np.dot(it.ref + t * it.direction, e)) for t in (it.t0, it.t1))
                if c <= s_bear + GAP_TOL or a >= s_bear + bolt.length - GAP_TOL:
                    continue                   # on another bolt's shank
            keep.append(it)
        out.append(keep)
    return out


def fastener_bores(j: Joint) -> bool:
    """True when the stack's bores could hold a fastener of some catalogue size: its clearance
    bore (the smallest clamped one) is a clearance hole (ISO 273 fine to coarse, ASME B18.2.8
    close to loose) or a tap drill of a size, or its tapped bore is the tap drill (or minor
    diameter) of a size that its clearance bore lets pass by no more than CLEARANCE_MAX_RATIO d."""
    from geomjoint import catalog

    clear = [l.hole_diameter for l in j.layers if l.role != "tapped"]
    tapped = [l.hole_diameter for l in j.layers if l.role == "tapped"]
    fits = ("fine", "medium", "coarse", "tap drill")
    if clear and any(how in fits for _, how in catalog.nominal_from_hole(min(clear), None, THREAD_MATCH_TOL)):
        return True
    for bore in tapped:
        for t, how in catalog.nominal_from_hole(bore, None, THREAD_MATCH_TOL):
            if how == "tap drill" and (not clear or t.d - LINEAR_TOL <= min(clear) <= CLEARANCE_MAX_RATIO * t.d):
                return True
    return False


def set_aside_reason(j: Joint, plugs: list[Plug]) -> tuple[str, str] | None:
    """(finding code, why) when a stack with no fastener modelled is no joint, else None.

    "holds-a-part": a part that is no fastener fills a hole of the stack (a pin, shaft,
    bushing or tube: a cylinder filling the hole, or a part so named); "not-a-bolt-hole": no bore
    of the stack is a clearance hole (ISO 273 fine to coarse, ASME B18.2.8 close to loose) or a
    tap drill (or minor diameter) of any catalogue size within THREAD_MATCH_TOL.
    """
    from geomjoint import catalog

    if j.bolt is not None or j.nut is not None or j.washers:
        return None
    inserts = {j.insert.insert} if j.insert else set()
    held = [p for p in plugs if p.part not in inserts]
    if held:
        p = max(held, key=lambda p: p.diameter)
        what = p.kind if p.kind else "a cylinder with no head"
        hosts = ", ".join(dict.fromkeys(l.part for l in j.layers if l.part != p.part))
        return "holds-a-part", (f"{p.part} ({what}, {p.diameter:.2f} mm) fills the hole of {hosts}: "
                                "a pin, shaft, bushing or tube, not a fastener; not a joint")
    if fastener_bores(j):
        return None
    bores = sorted({round(l.hole_diameter, 4) for l in j.layers})
    sizes = ", ".join(f"{b:.2f}" for b in bores)
    return "not-a-bolt-hole", (f"coaxial holes of {', '.join(dict.fromkeys(l.part for l in j.layers))} "
                               f"({sizes} mm) with no fastener modelled match no clearance hole (ISO 273 / "
                               f"ASME B18.2.8) and no tap drill of any catalogue size: a bore, seat or vent, "
                               f"not a joint")
