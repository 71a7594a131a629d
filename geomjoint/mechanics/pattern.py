"""Load share of a bolt group under a rigid plate.

The plate is rigid and the bolts are equal linear springs, so the bolt forces vary
linearly over the pattern: the axial force of a bolt is the direct share F_n/N plus
a bending part proportional to its distance from the neutral axis through the centroid
(general pattern: the full second-moment matrix, not only symmetric patterns), or, for a
bracket that tips about an edge, proportional to its distance from that heel line.  The
shear of a bolt is the direct share F_t/N plus the torsion part T r_i / sum r_j^2
perpendicular to its radius from the centroid.  (Shigley 10th ed., Section 8-12 "Bolted
and riveted joints loaded in shear"; Machinery's Handbook, "Eccentrically loaded bolt
groups"; Bickford, ch. "Joints loaded in shear" - the elastic method, from memory.)

Sign convention: ``normal`` points out of the supporting structure towards the attached
part; a force along +normal pulls the bolts (positive axial force = tension).  Forces N,
moments N*mm, lengths mm.  For a fluctuating load call :meth:`BoltPattern.share` once
for the minimum and once for the maximum load.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from geomjoint.errors import InputError

#: bolts closer than this (mm) are coincident; a rank test below this relative size is singular
_COINCIDENT = 1e-6
_SINGULAR = 1e-12


def _vector3(value, key: str) -> np.ndarray:
    v = np.asarray(value, dtype=float).reshape(-1)
    if v.shape == (2,):
        v = np.array([v[0], v[1], 0.0])
    if v.shape != (3,) or not np.all(np.isfinite(v)):
        raise InputError(f"expected a vector of 2 or 3 finite numbers, got {value!r}", where=key)
    return v


@dataclass(frozen=True)
class BoltShares:
    """Per-bolt share of one load case, in the pattern's order."""

    axial: np.ndarray          # (N,) axial force, N (positive = tension)
    shear: np.ndarray          # (N,) magnitude of the in-plane shear force, N
    shear_vectors: np.ndarray  # (N, 3) in-plane shear forces in model coordinates, N


class BoltPattern:
    """A group of parallel bolts whose axes are along ``normal``.

    Parameters
    ----------
    positions : array (N, 3) or (N, 2)
        Bolt axis positions.  3-D points are projected onto the plane through their centroid
        normal to ``normal``; 2-D points are coordinates in the plane with the normal +z.
    normal : 3-vector
        Direction of the bolt axes, out of the supporting structure (default +z).

    Examples
    --------
    >>> p = BoltPattern([(0, 0), (100, 0), (100, 60), (0, 60)])
    >>> p.share(force=(0, 0, 4000.0)).axial.tolist()
    [1000.0, 1000.0, 1000.0, 1000.0]
    """

    def __init__(self, positions, normal=(0.0, 0.0, 1.0)):
        pts = np.asarray(positions, dtype=float)
        if pts.ndim != 2 or pts.shape[1] not in (2, 3) or not np.all(np.isfinite(pts)):
            raise InputError("bolt positions must be a list of 2 or 3 finite coordinates each",
                             where="group.positions")
        if pts.shape[0] < 2:
            raise InputError(f"a bolt group needs at least 2 bolts, got {pts.shape[0]}", where="group.positions")
        n = _vector3(normal, "group.normal")
        length = np.linalg.norm(n)
        if length == 0.0:
            raise InputError("normal must not be zero", where="group.normal")
        self.normal = n / length
        # in-plane basis u, v with u x v = n (u = x, v = y for the default normal +z)
        helper = np.array([1.0, 0.0, 0.0]) if abs(self.normal[0]) < 0.9 else np.array([0.0, 1.0, 0.0])
        u = helper - helper.dot(self.normal) * self.normal
        self.u = u / np.linalg.norm(u)
        self.v = np.cross(self.normal, self.u)
        if pts.shape[1] == 2:   # coordinates in the plane: x along u, y along v
            pts = np.outer(pts[:, 0], self.u) + np.outer(pts[:, 1], self.v)
        centre = pts.mean(axis=0)
        rel = pts - centre
        # project onto the plane through the centroid
        self.points = pts - np.outer(rel @ self.normal, self.normal)
        self.centroid = self.points.mean(axis=0)
        self.local = np.column_stack([(self.points - self.centroid) @ self.u, (self.points - self.centroid) @ self.v])
        for i in range(len(self.local)):
            gaps = np.linalg.norm(self.local[i + 1:] - self.local[i], axis=1)
            if gaps.size and gaps.min() < _COINCIDENT:
                j = i + 1 + int(gaps.argmin())
                raise InputError(f"bolts {i + 1} and {j + 1} coincide", where="group.positions")

    @property
    def count(self) -> int:
        return len(self.local)

    def second_moments(self) -> tuple[float, float, float]:
        """(I_uu, I_vv, I_uv) = (sum x^2, sum y^2, sum x y) about the centroid, mm^2 (unit bolt areas)."""
        x, y = self.local[:, 0], self.local[:, 1]
        return float(x @ x), float(y @ y), float(x @ y)

    def principal_axes(self) -> tuple[np.ndarray, np.ndarray]:
        """Principal second moments (ascending, mm^2) and their in-plane axes as 3-vectors (rows)."""
        Ixx, Iyy, Ixy = self.second_moments()
        values, vectors = np.linalg.eigh(np.array([[Ixx, Ixy], [Ixy, Iyy]]))
        axes = np.array([vec[0] * self.u + vec[1] * self.v for vec in vectors.T])
        return values, axes

    def polar_moment(self) -> float:
        """sum r_i^2 about the centroid, mm^2."""
        return float(np.sum(self.local**2))

    def share(self, force=(0.0, 0.0, 0.0), moment=None, point=None, heel=None) -> BoltShares:
        """Forces on each bolt from a force and a moment applied at ``point``.

        Parameters
        ----------
        force : 3-vector
            Applied force, N (model coordinates).
        moment : 3-vector, optional
            Applied moment at ``point``, N*mm.
        point : 3-vector, optional
            Where the force acts (and the moment is given); the centroid when omitted, but
            a moment needs its point.
        heel : (point, direction), optional
            Tip about this in-plane edge line instead of the centroid: axial forces are
            proportional to the distance from the line on the bolts' side (the bracket
            method); the compressive reaction at the heel takes the rest.

        Returns
        -------
        BoltShares
            Axial force per bolt, shear magnitude and shear vector per bolt.
        """
        F = _vector3(force, "load.force")
        M = np.zeros(3) if moment is None else _vector3(moment, "load.moment")
        if point is None:
            if moment is not None and np.any(M != 0.0):
                raise InputError("a moment needs the point where it acts", where="load.point")
            p = self.centroid
        else:
            p = _vector3(point, "load.point")
        n = self.normal
        N = self.count
        # the load moved to the centroid
        M_c = M + np.cross(p - self.centroid, F)
        F_n = float(F @ n)
        F_t = F - F_n * n
        T = float(M_c @ n)
        x, y = self.local[:, 0], self.local[:, 1]

        if heel is None:
            # bolt forces f_i = F_n/N + a x_i + b y_i must carry the in-plane moment:
            # sum f_i (y_i u - x_i v) = M_u u + M_v v  ->  sum f y = M_u, sum f x = -M_v
            M_u, M_v = float(M_c @ self.u), float(M_c @ self.v)
            Ixx, Iyy, Ixy = self.second_moments()
            K = np.array([[Ixx, Ixy], [Ixy, Iyy]])
            rhs = np.array([-M_v, M_u])
            scale = max(Ixx + Iyy, 1.0)
            if abs(np.linalg.det(K)) > _SINGULAR * scale**2:
                a, b = np.linalg.solve(K, rhs)
            else:
                # collinear bolts: they carry no moment about their own line
                values, vectors = np.linalg.eigh(K)
                weak = vectors[:, 0]
                if abs(weak @ rhs) > 1e-9 * max(np.linalg.norm(rhs), 1.0):
                    raise InputError("the bolts lie on one line and cannot carry a moment about it",
                                     where="group.positions")
                strong = vectors[:, 1]
                a, b = strong * (strong @ rhs) / values[1]
            axial = F_n / N + a * x + b * y
        else:
            axial = self._heel_axial(F, M, p, heel)

        J = self.polar_moment()
        r3 = self.points - self.centroid
        torsion = (T / J) * np.cross(n, r3)
        shear_vectors = F_t / N + torsion
        return BoltShares(axial=axial, shear=np.linalg.norm(shear_vectors, axis=1),
                          shear_vectors=shear_vectors)

    def share_range(self, force_min=(0.0, 0.0, 0.0), force_max=(0.0, 0.0, 0.0), moment_min=None,
                    moment_max=None, point=None, heel=None) -> list[tuple[float, float, float]]:
        """Per-bolt (axial_min, axial_max, shear_max) of a load fluctuating between two cases, N.

        The share is linear in the load, so each case is one call of :meth:`share`; a bolt's
        min/max axial force are the smaller/larger of its two values (a bolt of a bending
        pattern can see its minimum under the "maximum" case), the shear the larger magnitude.

        >>> p = BoltPattern([(0, 0), (100, 0)])
        >>> p.share_range(force_min=(0, 0, 1000.0), force_max=(0, 0, 3000.0))
        [(500.0, 1500.0, 0.0), (500.0, 1500.0, 0.0)]
        """
        lo = self.share(force_min, moment_min, point, heel)
        hi = self.share(force_max, moment_max, point, heel)
        return [(float(min(a, b)), float(max(a, b)), float(max(c, d)))
                for a, b, c, d in zip(lo.axial, hi.axial, lo.shear, hi.shear)]

    def _heel_axial(self, F, M, p, heel) -> np.ndarray:
        try:
            h_point, h_dir = heel
        except (TypeError, ValueError):
            raise InputError("heel must be (point, direction)", where="group.heel") from None
        h = _vector3(h_point, "group.heel.point")
        t = _vector3(h_dir, "group.heel.direction")
        n = self.normal
        t = t - (t @ n) * n
        if np.linalg.norm(t) == 0.0:
            raise InputError("heel direction must lie in the bolt plane", where="group.heel.direction")
        t = t / np.linalg.norm(t)
        w = np.cross(n, t)                    # in-plane, perpendicular to the heel line
        if (self.centroid - h) @ w < 0:       # make w point from the heel towards the bolts
            t, w = -t, -w
        dist = (self.points - h) @ w
        S = float(dist @ dist)
        if S <= 0.0:
            raise InputError("all bolts lie on the heel line", where="group.heel")
        # moment of the applied load about the heel line; a force +n at w-distance e gives
        # (e w) x (F n) = e F (w x n) = e F t, so positive about t lifts the bolts' side
        M_heel = float((M + np.cross(p - h, F)) @ t)
        return M_heel * dist / S
