"""What the scan reads of a shape definition, moved to each of its placements.

A model places a few part definitions many times (a machine bed: one bolt, one nut and one
washer, hundreds of times each; XCAF gives every placement as the same ``TShape`` with its
own location).  The scan reads the faces, holes and hardware of each distinct definition
once, in the definition's own coordinates, and moves the result to every placement by the
placement's rigid motion X = R·X_def + t.  The reading is invariant under such a motion
(it depends on distances, angles and the side of material only), so the moved result is
what reading the placed solid gives, to rounding (tests/test_scan_instances.py).

Axis records (:class:`~geomjoint.geometry.holes.Hole`, nuts, washers, headless parts) keep
positions as parameters ``t`` along a canonical direction from the axis point nearest the
origin; a motion can turn the canonical direction over, so those parameters are mapped
``t -> sign·t + offset`` (ends and "start"/"end" swapped where the sign is negative).
A bolt's direction runs from head to tip and is simply rotated.
"""
from __future__ import annotations

import dataclasses

import numpy as np
from OCP.TopLoc import TopLoc_Location
from OCP.TopoDS import TopoDS_Shape

from geomjoint.geometry.hardware import Bolt, Headless, Nut, Washer
from geomjoint.geometry.holes import Hole, HoleSection, axis_reference, canonical_direction
from geomjoint.geometry.stacks import Plug

#: a placement is a rigid motion when R·Rᵀ = I and det R = 1 to this tolerance (others, such
#: as a mirror or a scaled instance, are read on the placed solid itself)
RIGID_TOL = 1e-9

#: the array fields of each moved record, by what they are (a record with another array field
#: is not moved but read again on its placed solid: a new field must be added here)
_POINT_FIELDS = {"ref", "bearing_point"}
_DIRECTION_FIELDS = {"direction"}


@dataclasses.dataclass(frozen=True)
class Placement:
    """A rigid motion X = R·X_def + t (mm) from a definition's coordinates to the model's."""

    R: np.ndarray
    t: np.ndarray

    @classmethod
    def of(cls, shape: TopoDS_Shape) -> "Placement | None":
        """The placement of a located shape, or None when its location is not a rigid motion."""
        trsf = shape.Location().Transformation()
        R = np.array([[trsf.Value(i, j) for j in (1, 2, 3)] for i in (1, 2, 3)])
        t = np.array([trsf.Value(i, 4) for i in (1, 2, 3)])
        if (not np.allclose(R @ R.T, np.eye(3), atol=RIGID_TOL)
                or abs(float(np.linalg.det(R)) - 1.0) > RIGID_TOL):
            return None
        return cls(R, t)

    def point(self, p) -> np.ndarray:
        return self.R @ np.asarray(p, dtype=float) + self.t

    def vector(self, v) -> np.ndarray:
        return self.R @ np.asarray(v, dtype=float)

    def axis(self, ref, direction) -> tuple[np.ndarray, np.ndarray, float, float]:
        """A canonical axis (ref, direction) moved: (ref', direction', sign, offset) with
        ref + s·direction placed at ref' + (sign·s + offset)·direction'."""
        p = self.point(ref)
        d = self.vector(direction)
        dc = canonical_direction(d)
        sign = 1.0 if float(dc @ d) > 0 else -1.0
        new_ref = axis_reference(p, dc)
        return new_ref, dc, sign, float((p - new_ref) @ dc)


def definition(shape: TopoDS_Shape) -> TopoDS_Shape:
    """The shape's definition: the same TShape without its location (model = placement of it)."""
    return shape.Located(TopLoc_Location())


def _ends(sign: float, offset: float, t0: float, t1: float) -> tuple[float, float]:
    a, b = sign * t0 + offset, sign * t1 + offset
    return (a, b) if a <= b else (b, a)


def _end(sign: float, end: str | None) -> str | None:
    if end is None or sign > 0:
        return end
    return {"start": "end", "end": "start"}[end]


def moved_hole(hole: Hole, placement: Placement, part: str, solid: TopoDS_Shape) -> Hole:
    """A hole of a definition at the placement (``part``: the placed part's name and solid)."""
    ref, d, sign, offset = placement.axis(hole.ref, hole.direction)
    t0, t1 = _ends(sign, offset, hole.t0, hole.t1)
    sections = []
    for s in hole.sections:
        a, b = _ends(sign, offset, s.t0, s.t1)
        r0, r1 = (s.r0, s.r1) if sign > 0 else (s.r1, s.r0)
        sections.append(HoleSection(s.kind, a, b, r0, r1))
    sections.sort(key=lambda s: (s.t0, s.t1))

    def seat(extra):
        if extra is None:
            return None
        diameter, at, end = extra
        return (diameter, sign * at + offset, _end(sign, end))

    return dataclasses.replace(hole, part=part, ref=ref, direction=d, t0=t0, t1=t1, sections=sections,
                               closed=_end(sign, hole.closed), counterbore=seat(hole.counterbore),
                               countersink=seat(hole.countersink), solid=solid)


def moved_holes(holes: list[Hole], placement: Placement, part: str, solid: TopoDS_Shape) -> list[Hole]:
    """The holes of a definition at the placement, in the order reading the placed solid gives:
    the axes in the definition's order, the features along one axis by increasing t."""
    out: list[Hole] = []
    for hole in holes:
        moved = moved_hole(hole, placement, part, solid)
        run = len(out)
        while run > 0 and _same_line(out[run - 1], moved):
            run -= 1
        out.insert(run + sum(1 for h in out[run:] if h.t0 <= moved.t0), moved)
    return out


def _same_line(a: Hole, b: Hole) -> bool:
    return bool(np.array_equal(a.ref, b.ref) and np.array_equal(a.direction, b.direction))


def movable(record) -> bool:
    """True when every array field of a hardware record is one :func:`moved_hardware` moves."""
    arrays = {f.name for f in dataclasses.fields(record) if isinstance(getattr(record, f.name), np.ndarray)}
    return arrays <= _POINT_FIELDS | _DIRECTION_FIELDS


def moved_hardware(record, placement: Placement, **own):
    """A bolt, nut, washer, headless part or plug (an outer cylinder that may fill a hole) of a
    definition at the placement; ``own`` sets the placed part's own fields (part, solid, hint,
    designation; a plug's kind and material hint)."""
    if isinstance(record, Bolt):
        # ref: the axis point nearest the origin, as recognition gives it; direction head -> tip
        d = placement.vector(record.direction)
        ref = axis_reference(placement.point(record.ref), canonical_direction(d))
        return dataclasses.replace(record, ref=ref, direction=d,
                                   bearing_point=placement.point(record.bearing_point), **own)
    if isinstance(record, (Nut, Washer, Headless, Plug)):
        ref, d, sign, offset = placement.axis(record.ref, record.direction)
        t0, t1 = _ends(sign, offset, record.t0, record.t1)
        return dataclasses.replace(record, ref=ref, direction=d, t0=t0, t1=t1, **own)
    raise TypeError(f"no placement rule for {type(record).__name__}")
