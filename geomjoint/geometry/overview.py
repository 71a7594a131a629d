"""Plain data for the report's overview picture: part outlines and joint positions in 2-D.

The model is viewed along the direction most bolts point (their axes project to points,
so each joint is a dot); part outlines are the convex hulls of their tessellated
vertices projected on that view plane.  The drawing itself is `report.plots.overview_svg`.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import shapely

from geomjoint.geometry.glb import tessellate, tessellation_tolerance


@dataclass
class Overview:
    outlines: list[tuple[str, np.ndarray]]   # (part name, (n, 2) hull polygon, mm)
    joints: list[tuple[str, float, float]]   # (joint id, u, v), mm
    view: tuple[float, float, float]         # viewing direction (model coordinates)


def _view_direction(scan) -> np.ndarray:
    """The axis direction most joints share (sign-folded), else +z."""
    dirs = [np.abs(np.asarray(j.direction, dtype=float)) for j in scan.joints]
    if not dirs:
        return np.array([0.0, 0.0, 1.0])
    rounded = [tuple(np.round(d, 3)) for d in dirs]
    best = max(set(rounded), key=rounded.count)
    v = np.asarray(best, dtype=float)
    return v / np.linalg.norm(v)


def _view_axes(view: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Screen axes for looking along ``view``: u is the global x (or y) projected on the plane,
    so a view along z is the usual plan (x right, y up)."""
    for e in (np.array([1.0, 0.0, 0.0]), np.array([0.0, 1.0, 0.0])):
        u = e - (e @ view) * view
        if np.linalg.norm(u) > 1e-6:
            u /= np.linalg.norm(u)
            return u, np.cross(view, u)
    raise AssertionError("a unit vector is parallel to neither x nor y")


def model_overview(scan, hardware_parts: set[str] = frozenset()) -> Overview:
    """Outlines of the non-hardware parts and the joint positions, seen along the bolt axes."""
    view = _view_direction(scan)
    u, v = _view_axes(view)
    # the GLB's tolerance: OCCT keeps the triangulation on the shape, so the meshes made here
    # serve the marked-up GLB too (each part is meshed once per check)
    from geomjoint.geometry.markup import bounding_diagonal

    deflection = tessellation_tolerance(bounding_diagonal([p.solid for p in scan.model.parts]))
    meshes = [(p.name, tessellate(p.solid, deflection)[0])
              for p in scan.model.parts if p.name not in hardware_parts]
    outlines = []
    for name, verts in meshes:
        if len(verts) < 3:
            continue
        uv = np.column_stack([verts @ u, verts @ v])
        hull = shapely.multipoints(uv).convex_hull
        if hull.geom_type == "Polygon":
            outlines.append((name, np.asarray(hull.exterior.coords)))
    joints = []
    for j in scan.joints:
        p = np.asarray(j.point, dtype=float)
        joints.append((j.id, float(p @ u), float(p @ v)))
    return Overview(outlines, joints, tuple(float(x) for x in view))
