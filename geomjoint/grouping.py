"""[[group]] loads: a force and moment resultant shared over a bolt pattern (rigid plate).

Job-file form (quantities with units; vectors in model coordinates):

    [[group]]
    joints = "J0*"                       # glob, or a list of joint ids
    point = ["0 mm", "0 mm", "120 mm"]   # where the resultant acts
    force = { min = ["0 kN", "0 kN", "0 kN"], max = ["0 kN", "1.5 kN", "6 kN"] }
    moment = { max = ["0 N*m", "150 N*m", "0 N*m"] }      # optional, about `point`
    normal = [0, 0, 1]                   # optional: out of the supporting part
    heel = { point = ["0 mm", "-60 mm", "0 mm"], direction = [1, 0, 0] }   # optional tipping edge
    positions = [["0 mm", "0 mm"], ["80 mm", "0 mm"]]    # typed-in joints only, in `joints` order

The share itself is `mechanics.pattern.BoltPattern` (Shigley 10th ed. §8-12; elastic
method).  A bolt whose share is compressive gets no added tension (the plate presses the
members; the preloaded joint carries it).
"""
from __future__ import annotations

import fnmatch
from typing import Any

import numpy as np

from geomjoint.errors import InputError, did_you_mean
from geomjoint.mechanics.pattern import BoltPattern
from geomjoint.units import parse_quantity

GROUP_KEYS = {"joints", "point", "force", "moment", "normal", "heel", "positions", "name"}
CASE_KEYS = {"min", "max"}
HEEL_KEYS = {"point", "direction"}


def _keys(table: Any, allowed: set[str], where: str) -> dict:
    if not isinstance(table, dict):
        raise InputError("expected a table", where=where)
    for key in table:
        if key not in allowed:
            raise InputError(f"unknown key {key!r}{did_you_mean(key, sorted(allowed))}", where=where)
    return table


def _vector(value: Any, kind: str, where: str) -> np.ndarray:
    if not isinstance(value, list) or len(value) not in (2, 3):
        raise InputError(f"expected a list of 2 or 3 {kind} values with units", where=where)
    v = [parse_quantity(x, kind, where=f"{where}[{i}]") for i, x in enumerate(value)]
    return np.array(v + [0.0] * (3 - len(v)))


def _direction(value: Any, where: str) -> np.ndarray:
    if not isinstance(value, list) or len(value) != 3 or not all(
            isinstance(x, (int, float)) and not isinstance(x, bool) for x in value):
        raise InputError("expected a direction of 3 numbers, e.g. [0, 0, 1]", where=where)
    v = np.array(value, dtype=float)
    n = np.linalg.norm(v)
    if not np.isfinite(n) or n == 0:
        raise InputError("direction must not be zero", where=where)
    return v / n


def _cases(table: Any, kind: str, where: str) -> tuple[np.ndarray, np.ndarray]:
    if table is None:
        return np.zeros(3), np.zeros(3)
    _keys(table, CASE_KEYS, where)
    if "max" not in table:
        raise InputError("needs 'max' (and optionally 'min')", where=where)
    hi = _vector(table["max"], kind, f"{where}.max")
    lo = _vector(table["min"], kind, f"{where}.min") if "min" in table else np.zeros(3)
    return lo, hi


def _members(group: dict, known: list[str], where: str) -> list[str]:
    sel = group.get("joints")
    if isinstance(sel, str):
        ids = [i for i in known if fnmatch.fnmatchcase(i, sel)]
    elif isinstance(sel, list) and all(isinstance(x, str) for x in sel):
        missing = [x for x in sel if x not in known]
        if missing:
            raise InputError(f"unknown joint {missing[0]!r}{did_you_mean(missing[0], known)}", where=f"{where}.joints")
        ids = list(sel)
    else:
        raise InputError("needs 'joints': a glob or a list of joint ids", where=f"{where}.joints")
    if len(ids) < 2:
        raise InputError(f"a bolt group needs at least 2 joints; {sel!r} matches {len(ids)}", where=f"{where}.joints")
    return ids


def group_loads(job, axes: dict[str, tuple[Any, Any]], groups: list[dict] | None = None
                ) -> dict[str, tuple[float, float, float]]:
    """Per joint id: (axial min, axial max, shear) added by [[group]] tables (all of the job's,
    or ``groups``, a selection of them).

    ``axes`` maps model joint ids to (axis point, axis direction); typed-in joints take
    their positions from the group's ``positions`` list.
    """
    out: dict[str, list[float]] = {}
    typed_ids = [j["id"] for j in job.joints]
    for group in (job.groups if groups is None else groups):
        gi = job.groups.index(group)
        where = f"{job.path.name}: group[{gi}]"
        _keys(group, GROUP_KEYS, where)
        ids = _members(group, list(axes) + typed_ids, where)
        if "positions" in group:
            pos = group["positions"]
            if not isinstance(pos, list) or len(pos) != len(ids):
                raise InputError(f"needs one position per joint ({len(ids)})", where=f"{where}.positions")
            points = np.array([_vector(p, "length", f"{where}.positions[{i}]") for i, p in enumerate(pos)])
            default_normal = np.array([0.0, 0.0, 1.0])
        else:
            missing = [i for i in ids if i not in axes]
            if missing:
                raise InputError(f"joint {missing[0]!r} has no position: give 'positions'", where=f"{where}.positions")
            points = np.array([np.asarray(axes[i][0], dtype=float) for i in ids])
            # the head side is taken as the attached part: out of the support is head-ward
            default_normal = -np.asarray(axes[ids[0]][1], dtype=float)
        normal = _direction(group["normal"], f"{where}.normal") if "normal" in group else default_normal
        f_lo, f_hi = _cases(group.get("force"), "force", f"{where}.force")
        m_lo, m_hi = _cases(group.get("moment"), "torque", f"{where}.moment")
        has_moment = "moment" in group
        if "point" not in group and has_moment:
            raise InputError("a moment needs the 'point' it acts about", where=f"{where}.point")
        point = _vector(group["point"], "length", f"{where}.point") if "point" in group else None
        heel = None
        if "heel" in group:
            h = _keys(group["heel"], HEEL_KEYS, f"{where}.heel")
            if "point" not in h or "direction" not in h:
                raise InputError("needs 'point' and 'direction'", where=f"{where}.heel")
            heel = (_vector(h["point"], "length", f"{where}.heel.point"), _direction(h["direction"], f"{where}.heel.direction"))
        try:
            pattern = BoltPattern(points, normal)
        except InputError as exc:
            raise InputError(str(exc), where=where) from None
        lo = pattern.share(force=f_lo, moment=m_lo if has_moment else None, point=point, heel=heel)
        hi = pattern.share(force=f_hi, moment=m_hi if has_moment else None, point=point, heel=heel)
        for k, jid in enumerate(ids):
            a, b = max(float(lo.axial[k]), 0.0), max(float(hi.axial[k]), 0.0)
            acc = out.setdefault(jid, [0.0, 0.0, 0.0])
            acc[0] += min(a, b)
            acc[1] += max(a, b)
            acc[2] += max(float(lo.shear[k]), float(hi.shear[k]))
    return {k: (v[0], v[1], v[2]) for k, v in out.items()}
