"""Bolts, cap screws, hex nuts and plain washers recognised by their geometry.

A part is a *bolt* when its longest outer cylinder (the shank, threads not modelled)
ends at one side in a wider head: a hex prism (six planes parallel to the axis) or a
round head (a larger coaxial outer cylinder: socket head cap screw).  A *nut* is a
short hex prism around one through hole, a *washer* a thin ring (outer cylinder
around one through hole).  A size in the part name ("M10x40", "1/2-13x2") is read
as a hint only and cross-checked against the geometry.
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field

import numpy as np
from OCP.TopoDS import TopoDS_Shape

from geomjoint.geometry.holes import (
    ANGLE_TOL,
    LINEAR_TOL,
    MIN_WRAP,
    Hole,
    SolidFaces,
    group_by_axis,
)
from geomjoint.units import MM_PER_INCH

#: proportions that separate hardware from plates (common practice: ISO 4032 nuts have
#: m/d ~ 0.8-0.9, ISO 7089 washers h/d1 ~ 0.15-0.2, heads are wider than 1.3 d)
NUT_MAX_HEIGHT_RATIO = 1.5        # nut height / bore diameter
WASHER_MAX_THICKNESS_RATIO = 0.5  # washer thickness / inner diameter
MIN_HEAD_WIDTH_RATIO = 1.3        # head (or nut / washer) width / shank (bore) diameter
#: upper bounds that keep round covers, flanges and collars out (common practice: ISO 7093
#: large washers have d2 ~ 3 d, hex heads and nuts s ~ 1.5-1.8 d, flange heads ~ 2.2 d)
WASHER_MAX_OD_RATIO = 4.0         # washer outer / inner diameter
MAX_HEAD_WIDTH_RATIO = 3.0        # head or nut width / shank (bore) diameter
#: cylinders up to this ratio of the longest one are shank or thread, not head
SHANK_STEP_RATIO = 1.25
#: relative tolerance for "same size" when matching a diameter to a thread size
SIZE_TOL = 0.03


@dataclass
class SizeHint:
    """A size read from a part name."""

    designation: str          # "M10", "M10x1.25", "1/2-13"
    d: float                  # nominal diameter, mm
    length: float | None      # mm, when the name gives one


@dataclass
class Bolt:
    """A modelled bolt or cap screw (mm, model coordinates)."""

    part: str
    ref: np.ndarray           # a point on the axis
    direction: np.ndarray     # unit, from the head to the tip
    d: float                  # shank diameter (threads not modelled: the nominal)
    length: float             # nominal length: under the head to the tip (countersunk: overall)
    head_kind: str            # "hex" | "socket" | "countersunk"
    head_height: float
    head_width: float         # across flats (hex) or head diameter (socket)
    bearing_diameter: float   # outer diameter of the bearing face (hex: across flats)
    bearing_point: np.ndarray  # centre of the bearing face (under the head; countersunk: the head's top)
    hint: SizeHint | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)

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
    bearing_diameter: float   # across flats
    hint: SizeHint | None = None
    solid: TopoDS_Shape | None = field(default=None, repr=False, compare=False)


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


_METRIC = re.compile(r"(?<![a-z0-9])m(\d+(?:[.,]\d+)?)(?:\s*x\s*(\d+(?:[.,]\d+)?))?(?:\s*x\s*(\d+(?:[.,]\d+)?))?",
                     re.IGNORECASE)
_INCH = re.compile(r"(#\d+|\d+/\d+|\d+(?:\.\d+)?)\s*-\s*(\d+)(?:\s*x\s*(\d+(?:/\d+)?(?:\.\d+)?|\d+\s+\d+/\d+))?",
                   re.IGNORECASE)


def _inch_value(text: str) -> float:
    total = 0.0
    for piece in text.split():
        if "/" in piece:
            a, b = piece.split("/")
            total += float(a) / float(b)
        else:
            total += float(piece)
    return total


def size_hint(name: str) -> SizeHint | None:
    """A thread size (and length) written in a part name: "bolt_M10x40_1", "cap_1/2-13x2".

    >>> size_hint("bolt_M10x40_1").designation, size_hint("bolt_M10x40_1").length
    ('M10', 40.0)
    """
    from geomjoint import catalog
    from geomjoint.errors import InputError

    m = _METRIC.search(name)
    if m:
        nums = [float(g.replace(",", ".")) for g in m.groups() if g]
        d = nums[0]
        pitch = length = None
        if len(nums) == 3:
            pitch, length = nums[1], nums[2]
        elif len(nums) == 2:
            if nums[1] < 4:           # "M10x1.25": a pitch, not a length
                pitch = nums[1]
            else:
                length = nums[1]
        desig = f"M{d:g}" + (f"x{pitch:g}" if pitch else "")
        try:
            t = catalog.thread(desig)
        except InputError:
            return None
        return SizeHint(t.designation, t.d, length)
    m = _INCH.search(name.replace("_", " "))
    if m:
        size, tpi, length = m.groups()
        try:
            t = catalog.thread(f"{size}-{tpi}")
        except InputError:
            return None
        return SizeHint(t.designation, t.d, MM_PER_INCH * _inch_value(length) if length else None)
    return None


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


def _extent(vertices: np.ndarray, ref: np.ndarray, d: np.ndarray) -> tuple[float, float]:
    t = (vertices - ref) @ d
    return float(t.min()), float(t.max())


def _hex_width(faces: SolidFaces, ref, d, t_range=None, vertices_t=None) -> float | None:
    """Across-flats width of a hex prism on the axis (six planes parallel to it), or None."""
    dists = []
    for pl in faces.planes:
        if abs(float(np.dot(pl.normal, d))) > ANGLE_TOL * 10:
            continue
        if t_range is not None:
            tp = float(np.dot(pl.point - ref, d))
            if not (t_range[0] - LINEAR_TOL <= tp <= t_range[1] + LINEAR_TOL):
                continue
        dists.append(abs(float(np.dot(pl.point - ref, pl.normal))))
    if len(dists) < 6:
        return None
    dists.sort()
    # six planes at the same distance from the axis
    for i in range(len(dists) - 5):
        if dists[i + 5] - dists[i] < 10 * LINEAR_TOL:
            return 2 * dists[i]
    return None


def recognise(part: str, faces: SolidFaces, holes: list[Hole], solid=None) -> Bolt | Nut | Washer | None:
    """Classify one part as a bolt, nut or washer, or None (a member)."""
    through = [h for h in holes if h.through]
    outer = [p for p in faces.patches if not p.is_hole and p.kind == "cylinder" and p.wrap >= MIN_WRAP]
    if len(holes) == 1 and len(through) == 1:
        h = through[0]
        a0, a1 = _extent(faces.vertices, h.ref, h.direction)
        height = a1 - a0
        ring = [p for p in outer if np.linalg.norm(p.ref - h.ref) < 10 * LINEAR_TOL
                and abs(abs(float(np.dot(p.direction, h.direction))) - 1) < ANGLE_TOL]
        af = _hex_width(faces, h.ref, h.direction)
        if (af and MIN_HEAD_WIDTH_RATIO * h.diameter <= af <= MAX_HEAD_WIDTH_RATIO * h.diameter
                and height <= NUT_MAX_HEIGHT_RATIO * h.diameter):
            return Nut(part, h.ref, h.direction, h.diameter, af, height, a0, a1, af,
                       _hint(part), solid)
        if ring and height <= WASHER_MAX_THICKNESS_RATIO * h.diameter:
            od = 2 * max(p.r0 for p in ring)
            if MIN_HEAD_WIDTH_RATIO * h.diameter <= od <= WASHER_MAX_OD_RATIO * h.diameter:
                return Washer(part, h.ref, h.direction, h.diameter, od, height, a0, a1,
                              _hint(part), solid)
        return None
    if through or not outer:
        return None
    best = None
    for group in group_by_axis(outer):
        longest = max(group, key=lambda p: p.t1 - p.t0)
        if best is None or longest.t1 - longest.t0 > best[1].t1 - best[1].t0:
            best = (group, longest)
    group, shank = best
    r_long = shank.r0
    ref, d = shank.ref, shank.direction
    # shank and a thread modelled slightly smaller both count; a head is much wider
    shank_secs = [p for p in group if p.r0 <= SHANK_STEP_RATIO * r_long]
    s0 = min(p.t0 for p in shank_secs)
    s1 = max(p.t1 for p in shank_secs)
    a0, a1 = _extent(faces.vertices, ref, d)
    below, above = s0 - a0, a1 - s1
    if max(below, above) < 0.3 * 2 * r_long:
        return None                      # a pin or a rod, no head
    head_at_start = below > above
    head_range = (a0, s0) if head_at_start else (s1, a1)
    head_h = head_range[1] - head_range[0]
    # the nominal is the widest shank cylinder (a thread may be modelled smaller)
    r = max(p.r0 for p in shank_secs)
    head_cyl = [p for p in group if p.r0 > SHANK_STEP_RATIO * r_long
                and p.t0 >= head_range[0] - LINEAR_TOL and p.t1 <= head_range[1] + LINEAR_TOL]
    head_cone = [p for p in faces.patches if p.kind == "cone" and not p.is_hole
                 and np.linalg.norm(p.ref - ref) < 10 * LINEAR_TOL
                 and abs(abs(float(np.dot(p.direction, d))) - 1) < ANGLE_TOL
                 and p.t0 >= head_range[0] - LINEAR_TOL and p.t1 <= head_range[1] + LINEAR_TOL]
    af = _hex_width(faces, ref, d, head_range)
    if head_cone and not _head_cyl_wider(head_cone, group, head_range, r):
        width = 2 * max(max(p.r0, p.r1) for p in head_cone)
        if MIN_HEAD_WIDTH_RATIO * 2 * r <= width <= MAX_HEAD_WIDTH_RATIO * 2 * r:
            # countersunk (ISO 10642): the length is overall, the reference is the head's top
            direction = d if head_at_start else -d
            top = a0 if head_at_start else a1
            return Bolt(part, ref, direction, 2 * r, a1 - a0, "countersunk", head_h, width, width,
                        ref + top * d, _hint(part), solid)
    if af and MIN_HEAD_WIDTH_RATIO * 2 * r <= af <= MAX_HEAD_WIDTH_RATIO * 2 * r:
        kind, width = "hex", af
    elif head_cyl and MIN_HEAD_WIDTH_RATIO * 2 * r <= 2 * max(p.r0 for p in head_cyl) <= MAX_HEAD_WIDTH_RATIO * 2 * r:
        kind, width = "socket", 2 * max(p.r0 for p in head_cyl)
    else:
        return None
    direction = d if head_at_start else -d
    under = s0 if head_at_start else s1
    length = (a1 - s0) if head_at_start else (s1 - a0)
    return Bolt(part, ref, direction, 2 * r, length, kind, head_h, width, width,
                ref + under * d, _hint(part), solid)


def _head_cyl_wider(cones, group, head_range, r) -> bool:
    """True when a head cylinder is wider than the head cone (a chamfered round head)."""
    rc = max(max(p.r0, p.r1) for p in cones)
    return any(p.r0 > rc + LINEAR_TOL and p.t0 >= head_range[0] - LINEAR_TOL
               and p.t1 <= head_range[1] + LINEAR_TOL for p in group)


def _hint(name: str) -> SizeHint | None:
    try:
        return size_hint(name)
    except Exception:  # the catalog is optional for recognition itself
        return None
