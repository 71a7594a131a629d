"""Axisymmetric finite-element model of the clamped members of a bolted joint.

The members are an annular stack of layers in the (r, z) half-plane, from the hole
wall out to an outer radius, each layer with its own E and nu.  The bolt is not
modelled: its head (or washer) and its nut load the stack over the bearing annuli,
and for a tapped hole the engaged thread loads the hole wall of the last layer.
Member stiffness is the load over the approach of the loaded faces::

    k_m = P / delta,   delta = f . u / P

where f is the consistent load vector of the two loads P (equal and opposite) and u
the displacement; for a rigid bearing face this is the difference of the two face
displacements, for a uniform pressure it is the area-weighted mean axial approach
of the two annuli (the work-conjugate displacement).

Modelling choices (why, briefly):

* Linear elasticity with axisymmetric strains
  eps = (du_r/dr, du_z/dz, u_r/r, du_r/dz + du_z/dr); biquadratic quadrilaterals
  (9-node), which do not lock in bending of thin plates.
* ``bearing="rigid"``: every axial dof of the bearing annulus is condensed into one
  master dof (a flat face that moves as one), radial dofs stay free (frictionless).
  ``bearing="pressure"``: a uniform pressure P / (pi/4 (d_w^2 - d_h^2)).
* Interfaces between layers have duplicated nodes.  ``interfaces="contact"``: node
  pairs in compression are tied in r and z (sticking contact: the clamped faces are
  assumed not to slip under the small radial strains of the stack), pairs in tension
  are released, and released pairs that would overlap are tied again (active set,
  iterated until it no longer changes).  ``interfaces="bonded"`` ties every pair.
* Tapped hole: the far side's load is carried by the engaged thread, modelled as an
  axial traction on the hole wall (r = thread_diameter/2) of the tapped layer over the
  engaged length, pointing towards the head, distributed along the engagement by
  :func:`thread_load_density` (highest at the first engaged thread; Sopwith 1948) or
  uniformly.  No thread geometry: the screw's own engaged thread is not in the model.
  The tapped layer is modelled to its full thickness and width.
* Member deformation of a tapped joint (docs/tapped_stiffness.md): the approach of the
  head bearing face to the interface with the tapped part, i.e. the compliance of the
  clamped layers alone, from their strain energy (:func:`body_compliance`).  The rest of
  the approach, the tapped part from that interface to its thread flanks, goes to the
  bolt side (as VDI 2230-1 delta_M) and is reported as ``thread_region_compliance``.
  A through joint's member deformation is the approach of its two bearing faces.
* Rigid-body motion: the only one in axisymmetry is an axial translation; the loads
  are self-equilibrated, so one axial dof is fixed (it does not change f . u).
* Mesh: structured, graded towards the hole, the bearing edge (r = d_w/2) and every
  layer face; the outer region (and the middle of very thick layers) grows
  geometrically.  One uniform refinement (every interval halved) measures the
  discretisation error; it is refined again (at most MAX_REFINEMENTS times) until the
  change is under 1 %, and the finest result is returned.  Radii closer than
  RADIUS_SNAP of the annulus width are merged (no sliver elements).
* Plate radius: unless given, doubled from beyond the cone's reach until k_m changes
  by under 0.5 % (on the base mesh), then the refinement check runs at that radius.
  Each layer may have its own outer radius (``layer_outer_diameters``: a part narrower
  than the others, e.g. a strap on a plate); only the layers without one take the plate
  radius.  The free face of a wider layer beyond a narrower one's rim is unloaded (no
  node pairs there), and the radial grid is graded towards every such rim.
* Solver: the constraints (rigid faces, ties, the fixed dof) are eliminated by a 0/1
  map u = T q, and K_r = T' K T is factorised by SuperLU with a symmetric ordering.

Coordinates: r = x[0], z = x[1]; z = 0 is the far (nut) face, z = grip the head face.
"""
from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Sequence

import numpy as np
import scipy.sparse as sp
from scipy.sparse.csgraph import connected_components
from scipy.sparse.linalg import splu
from skfem import (Basis, BilinearForm, ElementQuad2, ElementVector,
                   FacetBasis, LinearForm, MeshQuad, asm)

from geomjoint.errors import InputError
from geomjoint.mechanics.vdi import ENGAGED_THREAD_FACTOR

#: relative change of k_m under one uniform mesh refinement that is accepted
MESH_TOLERANCE = 0.01
#: relative change of k_m when the plate radius doubles that ends the radius search
RADIUS_TOLERANCE = 0.005
#: quadrature order on each element (exact for the polynomial part of Quad2 products)
INTORDER = 4
#: most uniform refinements of the base mesh tried to meet MESH_TOLERANCE (each has 4x the elements)
MAX_REFINEMENTS = 2
#: most active-set passes for the interface contact before giving up
MAX_CONTACT_PASSES = 60
#: growth of the element size away from the bearing edge and from the layer faces
GROWTH = 1.4
#: the first axial step at a thick layer's faces is the annulus width over this
Z_FIRST_STEP = 2.0
#: radii (hole, thread, bearings) closer than this fraction of the bearing annulus's width are
#: merged: a sliver element would be ill-conditioned, and the change of k_m is of this order
RADIUS_SNAP = 0.02
#: half-angle (deg) of the pressure cone whose reach starts the active-set iteration
#: (the 30 deg frustum of Shigley 10th ed. Sec. 8-5; only a first guess, the iteration corrects it)
START_CONE_ANGLE = 30.0
#: elements across the bearing annulus (d_h/2 .. d_w/2) of the base mesh, other radial spans pro rata:
#: enough that one uniform refinement changes k_m by under MESH_TOLERANCE on the reference cases
BEARING_ANNULUS_ELEMENTS = 6
#: axial elements of one layer on the base mesh, LAYER_ELEMENTS_PER_WIDTH per annulus width of its
#: thickness, clipped to LAYER_ELEMENTS: 4 still bend a thin layer, and beyond 10 the steps grow
#: geometrically instead (layer_interval); the unengaged depth of a tapped part gets half
LAYER_ELEMENTS_PER_WIDTH = 2.0
LAYER_ELEMENTS = (4, 10)
#: relative tolerance for coordinates on a face or a radius (the mesh is built from these numbers)
GEOMETRY_TOLERANCE = 1e-9
#: active set: a tied pair is released under a tension above this fraction of the largest
#: interface force, and a released pair tied again when it overlaps by this fraction of the
#: largest displacement (round-off level, so the set does not chatter)
CONTACT_FORCE_TOLERANCE = 1e-10
CONTACT_GAP_TOLERANCE = 1e-12
#: most doublings of the plate radius in the radius search (4096 times the start is beyond any part)
MAX_RADIUS_DOUBLINGS = 12
#: thread load distributions along the engagement: "decaying" (shear-lag, thread_load_density) or
#: "uniform" (the same traction over the whole engaged length)
THREAD_LOADS = ("decaying", "uniform")


@dataclass
class FeLayer:
    """One clamped layer: thickness in mm, Young's modulus E in MPa, Poisson's ratio."""

    thickness: float
    E: float
    poisson: float = 0.3


@dataclass
class FeResult:
    """Outcome of :func:`fe_member_stiffness` (N, mm, s)."""

    stiffness: float                 # k_m, N/mm
    approach: float                  # delta at the load P = 1 N, mm
    contact_diameters: list[float]   # per interface, from the head side, mm
    outer_diameter: float            # diameter of the widest modelled layer, mm
    mesh_change: float               # |k(refined) - k(coarse)| / k(refined)
    elements: int                    # elements of the finest mesh solved
    seconds: float                   # wall time of the whole call
    #: tapped joint: compliance of the tapped part from the interface to its thread flanks
    #: (bolt side, like VDI delta_M), mm/N; 0.0 for a through joint
    thread_region_compliance: float = 0.0
    #: outer diameter of each layer (head side first), mm: its own bound, or the plate's
    layer_outer_diameters: list[float] = field(default_factory=list)


# --------------------------------------------------------------------------- forms

def lame_parameters(E, nu):
    """Lamé's lambda and mu (MPa) from E (MPa) and nu: lambda = E nu/((1+nu)(1-2nu)), mu = E/(2(1+nu))."""
    return E * nu / ((1.0 + nu) * (1.0 - 2.0 * nu)), E / (2.0 * (1.0 + nu))


def axisymmetric_strain(w, r):
    """(eps_rr, eps_zz, eps_tt, gamma_rz) of a displacement field w = (u_r, u_z) at radius r."""
    return (w.grad[0][0], w.grad[1][1], w[0] / r, w.grad[0][1] + w.grad[1][0])


def axisymmetric_stress(eps, lam, mu):
    """(sigma_rr, sigma_zz, sigma_tt, tau_rz) from the strains: sigma = lam tr(eps) I + 2 mu eps (Hooke)."""
    err, ezz, ett, grz = eps
    trace = err + ezz + ett
    return (lam * trace + 2.0 * mu * err, lam * trace + 2.0 * mu * ezz,
            lam * trace + 2.0 * mu * ett, mu * grz)


def stress_work(sigma, eps):
    """sigma : eps = s_rr e_rr + s_zz e_zz + s_tt e_tt + t_rz g_rz (engineering shear strain)."""
    return sum(s * e for s, e in zip(sigma, eps))


@BilinearForm
def axisymmetric_elasticity(u, v, w):
    """a(u, v) = integral of sigma(u) : eps(v) 2 pi r dr dz, isotropic with Lamé's lam and mu per element."""
    r = w.x[0]
    sigma = axisymmetric_stress(axisymmetric_strain(u, r), w.lam, w.mu)
    return 2.0 * np.pi * r * stress_work(sigma, axisymmetric_strain(v, r))


def assemble_elasticity(basis: Basis, lam: np.ndarray, mu: np.ndarray) -> sp.csr_matrix:
    """The matrix of :data:`axisymmetric_elasticity`, vectorised over the local basis functions.

    Same strains, stresses and weights as the form (a test checks the two agree); the
    strain of each local basis function is computed once instead of once per pair, which
    makes the assembly several times faster.  ``lam`` and ``mu`` are per element, MPa.
    """
    r = basis.global_coordinates()[0]                            # (elements, points)
    weight = 2.0 * np.pi * r * basis.dx
    lam_q, mu_q = lam[:, None], mu[:, None]
    eps = np.array([axisymmetric_strain(phi[0], r) for phi in basis.basis])   # (n, 4, e, q)
    sig = np.array([axisymmetric_stress(e, lam_q, mu_q) for e in eps])
    local = np.einsum("iaeq,jaeq,eq->ije", eps, sig, weight, optimize=True)  # (n, n, e)
    dofs = basis.element_dofs                                    # (n, e)
    n = dofs.shape[0]
    rows = np.broadcast_to(dofs[:, None, :], (n, n, dofs.shape[1]))
    cols = np.broadcast_to(dofs[None, :, :], (n, n, dofs.shape[1]))
    return sp.coo_matrix((local.ravel(), (rows.ravel(), cols.ravel())),
                         shape=(basis.N, basis.N)).tocsr()


@LinearForm
def surface_traction(v, w):
    """l(v) = integral of (t_r v_r + t_z v_z) 2 pi r ds over the loaded facets."""
    return 2.0 * np.pi * w.x[0] * (w.t_r * v[0] + w.t_z * v[1])


def thread_load_density(s, engaged: float, decay_length: float | None):
    """Axial load per unit engaged length at depth s below the first engaged thread, per unit load, 1/mm.

        q(s) = lambda cosh(lambda (L - s)) / sinh(lambda L),   lambda = 1 / l_decay,   integral_0^L q ds = 1

    The shear-lag solution of Sopwith (The distribution of load in screw threads, Proc.
    IMechE 159 (1948) 373-383) for an external thread engaged in a part loaded in
    compression (a nut, or a tapped part clamped at its top face): the load is largest at
    the first engaged thread and decays along the engagement with the length l_decay
    (Yamamoto's distribution has the same cosh form).  We take l_decay = l_G = 0.5 d, the
    substitute length VDI 2230-1 gives the engaged screw thread: in the shear-lag model
    the entry compliance of a long engagement is l_decay / (E A), so the two agree (our
    reading).  ``decay_length`` None gives the uniform load q = 1/L.  ``s`` in mm, array or
    number; the exponential form avoids the overflow of cosh / sinh for long engagements.

    Examples
    --------
    M12, 18 mm engaged, l_decay = 6 mm: the first pitch (1.75 mm) carries a quarter of the load.

    >>> from scipy.integrate import quad
    >>> round(quad(thread_load_density, 0.0, 1.75, args=(18.0, 6.0))[0], 3)
    0.254
    >>> round(quad(thread_load_density, 0.0, 18.0, args=(18.0, 6.0))[0], 12)
    1.0
    """
    s = np.asarray(s, dtype=float)
    if decay_length is None or not np.isfinite(decay_length):
        return np.full_like(s, 1.0 / engaged)
    lam = 1.0 / decay_length
    return lam * (np.exp(-lam * s) + np.exp(-lam * (2.0 * engaged - s))) / (1.0 - np.exp(-2.0 * lam * engaged))


# --------------------------------------------------------------------------- model

class AxisymmetricModel:
    """Assembled stiffness of an axisymmetric mesh; loads and constrained solves on it.

    ``E`` and ``nu`` are scalars or one value per element.
    """

    def __init__(self, mesh: MeshQuad, E, nu):
        self.mesh = mesh
        self.basis = Basis(mesh, ElementVector(ElementQuad2()), intorder=INTORDER)
        nel = mesh.t.shape[1]
        E_el = np.broadcast_to(np.asarray(E, float), (nel,))
        nu_el = np.broadcast_to(np.asarray(nu, float), (nel,))
        self.lam, self.mu = lame_parameters(E_el, nu_el)
        self.K = assemble_elasticity(self.basis, self.lam, self.mu)
        self.N = self.basis.N
        comp = np.zeros(self.N, dtype=int)
        for dofs in (self.basis.nodal_dofs, self.basis.facet_dofs, self.basis.interior_dofs):
            if dofs.size:
                comp[dofs[1]] = 1
        self.component = comp            # 0: u_r, 1: u_z
        self.doflocs = self.basis.doflocs

    def facets(self, test) -> np.ndarray:
        """Boundary facets whose midpoints satisfy ``test(x)`` (x = [r, z])."""
        f = self.mesh.facets_satisfying(test, boundaries_only=True)
        return np.asarray(f, dtype=int)

    def dofs(self, facets, component: int) -> np.ndarray:
        """Dofs of one component (0 = r, 1 = z) on the given facets."""
        view = self.basis.get_dofs(facets)
        return np.asarray(view.all("u^1" if component == 0 else "u^2"), dtype=int)

    def traction(self, facets, t_r: float, t_z) -> np.ndarray:
        """Consistent load vector of a traction (t_r, t_z) in MPa on ``facets``.

        ``t_z`` is a number (uniform) or a function of the point x = [r, z] (arrays over the
        quadrature points of the facets).
        """
        fb = FacetBasis(self.mesh, self.basis.elem, facets=facets, intorder=INTORDER)
        if callable(t_z):
            t_z = t_z(np.asarray(fb.global_coordinates()))
        return asm(surface_traction, fb, t_r=t_r, t_z=t_z)

    def solve(self, f: np.ndarray, fixed: Sequence[int] = (), groups: Sequence[Sequence[int]] = (),
              ties: Sequence[tuple[int, int]] = ()) -> np.ndarray:
        """Solve K u = f with u = 0 on ``fixed``, each group of dofs equal, each tied pair equal."""
        a_list, b_list = [np.zeros(0, int)], [np.zeros(0, int)]
        for grp in groups:
            grp = np.asarray(grp, dtype=int)
            a_list.append(grp[1:])
            b_list.append(np.full(grp.size - 1, grp[0]))
        if len(ties):
            t = np.asarray(ties, dtype=int).reshape(-1, 2)
            a_list.append(t[:, 0])
            b_list.append(t[:, 1])
        a, b = np.concatenate(a_list), np.concatenate(b_list)
        graph = sp.coo_matrix((np.ones(a.size), (a, b)), shape=(self.N, self.N))
        _, root = connected_components(graph, directed=False)
        dead = np.zeros(root.max() + 1, dtype=bool)
        dead[np.unique(root[np.asarray(fixed, dtype=int)])] = True
        keep = ~dead[root]
        uniq, col = np.unique(root[keep], return_inverse=True)
        rows = np.flatnonzero(keep)
        T = sp.csr_matrix((np.ones(rows.size), (rows, col)), shape=(self.N, uniq.size))
        Kr = (T.T @ self.K @ T).tocsc()
        # K is symmetric positive definite once constrained: symmetric ordering, no pivoting
        lu = splu(Kr, permc_spec="MMD_AT_PLUS_A", diag_pivot_thresh=0.0,
                  options={"SymmetricMode": True})
        q = lu.solve(T.T @ f)
        return T @ q


def solve_axisymmetric(mesh: MeshQuad, E, nu, tractions=(), fixed_r=(), fixed_z=(),
                       rigid_z=()) -> tuple[AxisymmetricModel, np.ndarray, np.ndarray]:
    """Solve one axisymmetric linear-elastic problem.

    Parameters: ``mesh`` in (r, z), mm; ``E`` (MPa) and ``nu`` scalars or per element;
    ``tractions``: sequence of (facets, t_r, t_z) in MPa; ``fixed_r`` / ``fixed_z``:
    facets where u_r / u_z = 0; ``rigid_z``: sequence of facet sets each of whose axial
    dofs move as one.  Returns (model, u, f); ``u`` in mm, dof order of ``model.basis``.
    """
    model = AxisymmetricModel(mesh, E, nu)
    f = np.zeros(model.N)
    for facets, t_r, t_z in tractions:
        f += model.traction(facets, t_r, t_z)
    fixed = [model.dofs(fa, 0) for fa in fixed_r] + [model.dofs(fa, 1) for fa in fixed_z]
    fixed = np.concatenate(fixed) if fixed else np.zeros(0, int)
    groups = [model.dofs(fa, 1) for fa in rigid_z]
    return model, model.solve(f, fixed=fixed, groups=groups), f


# --------------------------------------------------------------------------- mesh

def graded_interval(a: float, b: float, n: int) -> np.ndarray:
    """n + 1 points on [a, b] clustered towards both ends (Chebyshev-Lobatto spacing)."""
    s = np.linspace(0.0, 1.0, n + 1)
    return a + (b - a) * 0.5 * (1.0 - np.cos(np.pi * s))


def geometric_interval(a: float, b: float, h0: float, growth: float) -> np.ndarray:
    """Points from a to b with first step h0 growing by ``growth``; the last step is stretched to end at b."""
    pts = [a]
    h = h0
    while pts[-1] + h < b:
        pts.append(pts[-1] + h)
        h *= growth
    if len(pts) > 1 and b - pts[-1] < 0.5 * h / growth:
        pts[-1] = b
    else:
        pts.append(b)
    return np.array(pts)


def layer_interval(t: float, h0: float, n: int) -> np.ndarray:
    """Node heights 0..t of one layer graded towards both faces.

    Chebyshev spacing with n elements while its first step is not below h0; a thicker layer
    gets steps growing geometrically (GROWTH) from h0 at both faces towards its middle.
    """
    z = graded_interval(0.0, t, n)
    if z[1] <= h0:
        return z
    half = geometric_interval(0.0, 0.5 * t, h0, GROWTH)
    return np.unique(np.concatenate([half, t - half]))


def refine_grid(x: np.ndarray, times: int = 1) -> np.ndarray:
    """Halve every interval of a grid ``times`` times."""
    for _ in range(times):
        mid = 0.5 * (x[1:] + x[:-1])
        x = np.sort(np.concatenate([x, mid]))
    return x


@dataclass
class StackMesh:
    """A layered structured mesh with duplicated nodes at every interface."""

    mesh: MeshQuad
    layer_of_element: np.ndarray
    z_faces: np.ndarray              # z of the layer faces, from the far face 0 up to the grip
    inner_radius: list[float]        # per layer (head side first)


def stack_mesh(thicknesses: Sequence[float], inner_radius: Sequence[float], r_grid: np.ndarray,
               z_grids: Sequence[np.ndarray], outer_radius: Sequence[float] | None = None) -> StackMesh:
    """Mesh an annular stack: layer i (head side first) spans inner_radius[i] <= r <= outer_radius[i]
    of ``r_grid`` (every outer radius a node of it; None: to the end of the grid).

    ``z_grids[i]`` are the node heights of layer i relative to its own bottom face.
    """
    n = len(thicknesses)
    z_faces = np.concatenate([[0.0], np.cumsum(list(reversed(thicknesses)))])  # bottom layer first
    pts, elems, lay = [], [], []
    offset = 0
    for k in range(n):                      # k counts from the far face up
        i = n - 1 - k                       # layer index from the head side
        r = r_grid[r_grid >= inner_radius[i] - 1e-12]
        if outer_radius is not None:
            r = r[r <= outer_radius[i] * (1 + GEOMETRY_TOLERANCE)]
        z = z_faces[k] + np.asarray(z_grids[i])
        R, Z = np.meshgrid(r, z, indexing="ij")
        pts.append(np.vstack([R.ravel(), Z.ravel()]))
        nr, nz = r.size, z.size
        idx = offset + np.arange(nr * nz).reshape(nr, nz)
        t = np.vstack([idx[:-1, :-1].ravel(), idx[1:, :-1].ravel(),
                       idx[1:, 1:].ravel(), idx[:-1, 1:].ravel()])
        elems.append(t)
        lay.append(np.full(t.shape[1], i))
        offset += nr * nz
    mesh = MeshQuad(np.hstack(pts), np.hstack(elems))
    return StackMesh(mesh, np.concatenate(lay), z_faces, list(inner_radius))


# --------------------------------------------------------------------------- member stack

@dataclass
class StackSolution:
    """One solve of the member stack at a fixed outer radius and mesh level."""

    stiffness: float
    approach: float
    contact_diameters: list[float]
    model: AxisymmetricModel
    u: np.ndarray
    mesh: StackMesh
    passes: int = 0
    elements: int = 0
    load: np.ndarray | None = None   # the load vector f (N), dof order of model.basis
    thread_region: float = 0.0       # tapped: the tapped part's compliance (bolt side), mm/N


@dataclass
class StackGeometry:
    """Validated inputs of the member stack, radii in mm (from :func:`make_geometry`)."""

    layers: list[FeLayer]
    r_h: float
    r_w: float
    r_w2: float
    r_t: float
    engaged: float
    bearing: str
    interfaces: str
    tapped: bool
    thread_decay: float | None = None   # l_decay of thread_load_density, mm; None: uniform thread load
    #: fixed outer radius of each layer (head side first), mm; None: the plate radius of the solve
    bounds: tuple[float | None, ...] = ()

    def outer_radii(self, r_plate: float) -> list[float]:
        """Outer radius of each layer, mm: its own bound, else the plate radius ``r_plate``."""
        bounds = self.bounds or (None,) * len(self.layers)
        return [r_plate if b is None else b for b in bounds]

    def all_bounded(self) -> bool:
        """Every layer has its own outer radius (no plate radius to search)."""
        return bool(self.bounds) and all(b is not None for b in self.bounds)


def two_sided_interval(a: float, b: float, h0: float, growth: float) -> np.ndarray:
    """Points from a to b, steps growing by ``growth`` from h0 at both ends towards the middle.

    Built on [0, b - a] and shifted, so the two halves meet at one point (no sliver).
    """
    span = b - a
    half = geometric_interval(0.0, 0.5 * span, h0, growth)
    return a + np.unique(np.concatenate([half, span - half]))


def _grids(g: StackGeometry, r_out: float, level: int):
    """The radial grid and per-layer axial grids of the base mesh, refined ``level`` times.

    ``r_out`` is the plate radius of the layers without a bound of their own; every layer's
    outer radius is a node, and the grid is graded towards each rim inside the widest one
    (the corner of a narrower layer on a wider one).
    """
    radii = sorted({g.r_h, g.r_w, g.r_w2} | ({g.r_t} if g.tapped else set()))
    r_parts = []
    lo = radii[0]
    for hi in radii[1:]:
        n = max(2, int(np.ceil(BEARING_ANNULUS_ELEMENTS * (hi - lo) / (g.r_w - g.r_h))))
        r_parts.append(graded_interval(lo, hi, n))
        lo = hi
    h0 = (r_parts[-1][-1] - r_parts[-1][-2]) if r_parts else 0.1 * g.r_w
    rims = sorted({r for r in g.outer_radii(r_out) if r > lo * (1 + GEOMETRY_TOLERANCE)})
    for k, rim in enumerate(rims):
        last = k == len(rims) - 1
        r_parts.append(geometric_interval(lo, rim, h0, GROWTH) if last else two_sided_interval(lo, rim, h0, GROWTH))
        lo = rim
    r = np.unique(np.concatenate(r_parts))
    ref = g.r_w - g.r_h
    z_grids = []
    for i, lay in enumerate(g.layers):
        n = int(np.clip(np.ceil(LAYER_ELEMENTS_PER_WIDTH * lay.thickness / ref), *LAYER_ELEMENTS))
        z = layer_interval(lay.thickness, ref / Z_FIRST_STEP, n)
        if g.tapped and i == len(g.layers) - 1 and g.engaged < lay.thickness * (1 - GEOMETRY_TOLERANCE):
            cut = lay.thickness - g.engaged
            z = np.unique(np.concatenate([layer_interval(cut, ref / Z_FIRST_STEP, max(2, n // 2)),
                                          cut + layer_interval(g.engaged, ref / Z_FIRST_STEP, n)]))
        z_grids.append(z)
    return refine_grid(r, level), [refine_grid(z, level) for z in z_grids]


def _interface_pairs(model: AxisymmetricModel, sm: StackMesh):
    """Per interface (head side first): arrays (upper_r, upper_z, lower_r, lower_z, radius) of node pairs."""
    n = len(sm.inner_radius)
    el_dofs = model.basis.element_dofs
    locs = model.doflocs
    out = []
    for i in range(n - 1):                  # between layer i (upper) and i + 1 (lower)
        z_if = sm.z_faces[n - 1 - i]
        tol = GEOMETRY_TOLERANCE * max(1.0, sm.z_faces[-1])
        sides = []
        for lay in (i, i + 1):
            d = np.unique(el_dofs[:, sm.layer_of_element == lay])
            d = d[np.abs(locs[1, d] - z_if) < tol]
            sides.append(d)
        pair = {}
        for side, d in enumerate(sides):
            for c in (0, 1):
                dc = d[model.component[d] == c]
                for dof in dc:
                    key = round(float(locs[0, dof]), 9)
                    pair.setdefault(key, [None] * 4)[2 * side + c] = dof
        keys = sorted(k for k, v in pair.items() if None not in v)
        arr = np.array([pair[k] for k in keys], dtype=int).reshape(-1, 4)
        out.append((arr[:, 0], arr[:, 1], arr[:, 2], arr[:, 3], np.array(keys)))
    return out


@dataclass
class StackLoads:
    """The unit preload pair on the stack, as load vectors and constraints (see the module text)."""

    head: np.ndarray                 # head (or washer) bearing, P down
    far: np.ndarray                  # nut bearing, or the engaged thread of a tapped part, P up
    groups: list[np.ndarray]         # axial dofs of each rigid bearing face (move as one)
    fixed: np.ndarray                # the one axial dof that removes the rigid-body translation


def _stack_model(g: StackGeometry, r_out: float, level: int,
                 z_grids: Sequence[np.ndarray] | None) -> tuple[AxisymmetricModel, StackMesh]:
    """Mesh of the stack at one outer radius and mesh level, with each element's E and nu."""
    r_grid, auto_z = _grids(g, r_out, level)
    inner = [g.r_h] * len(g.layers)
    if g.tapped:
        inner[-1] = g.r_t
    sm = stack_mesh([l.thickness for l in g.layers], inner, r_grid, auto_z if z_grids is None else z_grids,
                    g.outer_radii(r_out))
    E_el = np.array([g.layers[i].E for i in sm.layer_of_element])
    nu_el = np.array([g.layers[i].poisson for i in sm.layer_of_element])
    return AxisymmetricModel(sm.mesh, E_el, nu_el), sm


def _bearing_load(g: StackGeometry, model: AxisymmetricModel, facets, load: float, area: float,
                  groups: list) -> np.ndarray:
    """Load vector of a bearing face: a point force on the face's master dof (rigid) or a uniform pressure."""
    if g.bearing == "rigid":
        dz = model.dofs(facets, 1)
        groups.append(dz)
        f = np.zeros(model.N)
        f[dz[0]] = load
        return f
    return model.traction(facets, 0.0, load / area)


def _stack_loads(g: StackGeometry, model: AxisymmetricModel, sm: StackMesh, P: float) -> StackLoads:
    """The preload pair: P down on the head bearing, P up on the nut bearing or the engaged thread."""
    H = sm.z_faces[-1]
    eps = GEOMETRY_TOLERANCE * max(1.0, H)
    r_out = float(model.doflocs[0].max())

    def annulus(z0, r_in, r_b):
        return model.facets(lambda x: (np.abs(x[1] - z0) < eps) & (x[0] > r_in - eps) & (x[0] < r_b + eps))

    groups: list[np.ndarray] = []
    head = _bearing_load(g, model, annulus(H, g.r_h, g.r_w), -P, np.pi * (g.r_w ** 2 - g.r_h ** 2), groups)
    if g.tapped:
        t_last = g.layers[-1].thickness     # the tapped layer spans 0 <= z <= t_last
        wall = model.facets(lambda x: (np.abs(x[0] - g.r_t) < eps) & (x[1] < t_last + eps)
                            & (x[1] > t_last - g.engaged - eps))
        far = model.traction(wall, 0.0, lambda x: P * thread_load_density(t_last - x[1], g.engaged, g.thread_decay)
                             / (2.0 * np.pi * x[0]))
        far *= P / far[model.component == 1].sum()   # statics exact, whatever the quadrature error
    else:
        far = _bearing_load(g, model, annulus(0.0, g.r_h, g.r_w2), +P, np.pi * (g.r_w2 ** 2 - g.r_h ** 2), groups)
    # rigid-body translation: fix one axial dof on the outer rim (loads are self-equilibrated)
    rim_all = model.facets(lambda x: np.abs(x[0] - r_out) < eps)
    return StackLoads(head, far, groups, model.dofs(rim_all, 1)[:1])


def _start_active_set(g: StackGeometry, pairs, contact_guess: Sequence[float] | None) -> list[np.ndarray]:
    """Node pairs in contact to start from: all (bonded, or no guess), else those inside the guessed diameters."""
    if contact_guess is None or g.interfaces == "bonded":
        return [np.ones(p[0].size, dtype=bool) for p in pairs]
    active = [p[4] <= 0.5 * dc * (1 + GEOMETRY_TOLERANCE) for p, dc in zip(pairs, contact_guess)]
    for act in active:
        act[0] = True                       # the pair at the hole always carries load
    return active


def _contact_solve(g: StackGeometry, model: AxisymmetricModel, pairs, loads: StackLoads, f: np.ndarray,
                   active: list[np.ndarray]) -> tuple[np.ndarray, list[np.ndarray], int]:
    """Active-set iteration of the interface contact: (u, pairs in contact per interface, passes).

    Tied pairs in tension are released; released pairs that would overlap are tied again,
    until the set no longer changes (or MAX_CONTACT_PASSES).
    """
    passes = 0
    while True:
        passes += 1
        ties = []
        for (ur, uz, lr, lz, _), act in zip(pairs, active):
            ties += list(zip(ur[act], lr[act])) + list(zip(uz[act], lz[act]))
        u = model.solve(f, fixed=loads.fixed, groups=loads.groups, ties=ties)
        if g.interfaces == "bonded" or not pairs:
            return u, active, passes
        reaction = model.K @ u - f
        changed = False
        for k, ((ur, uz, lr, lz, _), act) in enumerate(zip(pairs, active)):
            force = reaction[uz]                # lower layer on upper layer, +z = compression
            gap = u[uz] - u[lz]                 # > 0 open
            scale = max(np.abs(force).max(), 1e-300)
            new = act.copy()
            new[act & (force < -CONTACT_FORCE_TOLERANCE * scale)] = False
            new[~act & (gap < -CONTACT_GAP_TOLERANCE * max(np.abs(u).max(), 1e-300))] = True
            if not np.array_equal(new, act):
                changed = True
                active[k] = new
        if not changed or passes >= MAX_CONTACT_PASSES:
            return u, active, passes


def _contact_diameters(pairs, active: list[np.ndarray]) -> list[float]:
    """Diameter of each interface's contact zone, mm: between the outermost pair in contact and the next, open one."""
    diam = []
    for (_, _, _, _, radius), act in zip(pairs, active):
        last = int(np.flatnonzero(act).max()) if act.any() else -1
        if last < 0:
            diam.append(0.0)
        elif last == radius.size - 1:
            diam.append(2.0 * float(radius[last]))
        else:
            diam.append(float(radius[last] + radius[last + 1]))
    return diam


def body_compliance(K_body: sp.spmatrix, u: np.ndarray, P: float) -> float:
    """Compliance of one body of the stack from its strain energy, mm/N: delta = u' K_body u / P^2.

    Each body (the clamped layers, the tapped part) is a free body under its boundary loads:
    by Clapeyron's theorem u' K_body u = 2 U_body is the work of those loads on their
    work-conjugate displacements, i.e. P times the approach of its loaded faces (for the
    clamped layers: the head bearing face towards the interface with the tapped part).
    The bodies' compliances add up to the whole approach f . u / P^2.
    """
    return float(u @ (K_body @ u)) / (P * P)


def solve_member_stack(g: StackGeometry, r_out: float, level: int = 0,
                       contact_guess: Sequence[float] | None = None,
                       z_grids: Sequence[np.ndarray] | None = None) -> StackSolution:
    """Solve the stack for unit load at one outer radius and mesh level (see the module text).

    ``contact_guess``: contact diameters per interface from an earlier solve, used as the
    starting active set (the iteration then only corrects it); None starts bonded.
    ``z_grids``: node heights per layer (from its bottom face) replacing the automatic ones.
    """
    P = 1.0
    model, sm = _stack_model(g, r_out, level, z_grids)
    loads = _stack_loads(g, model, sm, P)
    f = loads.head + loads.far
    pairs = _interface_pairs(model, sm)
    u, active, passes = _contact_solve(g, model, pairs, loads, f, _start_active_set(g, pairs, contact_guess))
    if g.tapped:
        # by body (docs/tapped_stiffness.md): the clamped layers are the member, the tapped
        # part's compliance (interface to thread flanks) goes to the bolt side
        tapped_el = sm.layer_of_element == len(g.layers) - 1
        K_tapped = assemble_elasticity(model.basis, np.where(tapped_el, model.lam, 0.0),
                                       np.where(tapped_el, model.mu, 0.0))
        thread_region = body_compliance(K_tapped, u, P)
        delta_P = float(f @ u) / (P * P) - thread_region
    else:
        delta_P, thread_region = float(f @ u) / (P * P), 0.0
    return StackSolution(P / delta_P, delta_P, _contact_diameters(pairs, active), model, u, sm, passes,
                         sm.mesh.t.shape[1], f, thread_region)


def _cone_contact_guess(g: StackGeometry) -> list[float]:
    """Diameter of the START_CONE_ANGLE cone at each interface, from the nearer bearing face, mm."""
    tan_a = np.tan(np.radians(START_CONE_ANGLE))
    depth = np.cumsum([l.thickness for l in g.layers])[:-1]     # below the head face
    grip = sum(l.thickness for l in g.layers)
    out = []
    for z in depth:
        near = 2 * g.r_w + 2 * z * tan_a
        far = np.inf if g.tapped else 2 * g.r_w2 + 2 * (grip - z) * tan_a
        out.append(float(min(near, far)))
    return out


def plate_radius_search(g: StackGeometry, guess: Sequence[float]) -> tuple[float, StackSolution]:
    """Outer radius (mm) at which a wider plate changes k_m by under RADIUS_TOLERANCE, and its solution.

    Starts beyond the 30 deg cone's reach at mid-grip and doubles the radius (base mesh) of the
    layers without a bound of their own; with every layer bounded there is nothing to search.
    """
    if g.all_bounded():
        r_out = max(g.outer_radii(0.0))
        return r_out, solve_member_stack(g, r_out, 0, guess)
    grip = sum(l.thickness for l in g.layers)
    r_min = max(g.r_w, g.r_w2, g.r_t)
    r_out = r_min + max(grip, r_min)
    sol = solve_member_stack(g, r_out, 0, guess)
    for _ in range(MAX_RADIUS_DOUBLINGS):
        wider = solve_member_stack(g, 2 * r_out, 0, sol.contact_diameters)
        change = abs(wider.stiffness - sol.stiffness) / wider.stiffness
        r_out, sol = 2 * r_out, wider
        if change < RADIUS_TOLERANCE:
            break
    return r_out, sol


def refined_solution(g: StackGeometry, r_out: float, sol: StackSolution) -> tuple[StackSolution, float]:
    """Refine the mesh uniformly until k_m changes by under MESH_TOLERANCE (at most MAX_REFINEMENTS
    times): the finest solution and its last relative change."""
    level = 0
    while True:
        level += 1
        fine = solve_member_stack(g, r_out, level, sol.contact_diameters)
        change = abs(fine.stiffness - sol.stiffness) / fine.stiffness
        sol = fine
        if change < MESH_TOLERANCE or level >= MAX_REFINEMENTS:
            return sol, change


def _check(name: str, value, positive: bool = True) -> float:
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(f"FE member stiffness: {name} must be a number, got {value!r}") from None
    if not np.isfinite(v) or (positive and v <= 0):
        raise InputError(f"FE member stiffness: {name} must be a positive number, got {value!r}")
    return v


def make_geometry(layers, hole_diameter, bearing_diameter, far_bearing_diameter=None,
                  bearing="rigid", interfaces="contact", tapped=False, thread_diameter=None,
                  engaged_length=None, thread_load="decaying", layer_outer_diameters=None) -> StackGeometry:
    """Validate the inputs of :func:`fe_member_stiffness` and bundle them (radii in mm)."""
    if not layers:
        raise InputError("FE member stiffness: at least one layer is needed")
    for i, lay in enumerate(layers):
        _check(f"layer {i + 1} thickness", lay.thickness)
        _check(f"layer {i + 1} E", lay.E)
        nu = _check(f"layer {i + 1} poisson", lay.poisson, positive=False)
        if not -1.0 < nu < 0.5:
            raise InputError(f"FE member stiffness: layer {i + 1} poisson must lie in (-1, 0.5), got {nu}")
    if bearing not in ("rigid", "pressure"):
        raise InputError(f"FE member stiffness: bearing must be 'rigid' or 'pressure', got {bearing!r}")
    if interfaces not in ("contact", "bonded"):
        raise InputError(f"FE member stiffness: interfaces must be 'contact' or 'bonded', got {interfaces!r}")
    if thread_load not in THREAD_LOADS:
        raise InputError(f"FE member stiffness: thread_load must be one of {', '.join(THREAD_LOADS)}, "
                         f"got {thread_load!r}")
    d_h = _check("hole_diameter", hole_diameter)
    d_w = _check("bearing_diameter", bearing_diameter)
    d_w2 = d_w if far_bearing_diameter is None else _check("far_bearing_diameter", far_bearing_diameter)
    if d_w <= d_h or d_w2 <= d_h:
        raise InputError("FE member stiffness: bearing diameters must exceed hole_diameter")
    d_t = d_h if thread_diameter is None else _check("thread_diameter", thread_diameter)
    if tapped and d_t >= d_w:
        raise InputError("FE member stiffness: thread_diameter must be smaller than bearing_diameter")
    if tapped and len(layers) < 2:
        raise InputError("FE member stiffness: a tapped joint needs a clamped layer above the tapped one")
    engaged = layers[-1].thickness if engaged_length is None else _check("engaged_length", engaged_length)
    if tapped and engaged > layers[-1].thickness * (1 + GEOMETRY_TOLERANCE):
        raise InputError("FE member stiffness: engaged_length exceeds the tapped layer's thickness")
    r_h, r_w, r_w2, r_t = d_h / 2, d_w / 2, d_w2 / 2, d_t / 2
    snap = RADIUS_SNAP * (r_w - r_h)
    if abs(r_t - r_h) < snap:
        r_t = r_h
    if abs(r_w2 - r_w) < snap:
        r_w2 = r_w
    if tapped and abs(r_t - r_w2) < snap:
        r_w2 = r_t
    decay = ENGAGED_THREAD_FACTOR * d_t if thread_load == "decaying" else None
    bounds = _layer_bounds(layer_outer_diameters, len(layers), max(r_w, r_w2, r_t), snap)
    return StackGeometry(list(layers), r_h, r_w, r_w2, r_t, min(engaged, layers[-1].thickness),
                         bearing, interfaces, bool(tapped), decay, bounds)


def _layer_bounds(diameters, n: int, r_min: float, snap: float) -> tuple[float | None, ...]:
    """Validated outer radius of each layer (None: the plate's), mm; rims closer than ``snap``
    to each other or to the widest bearing or thread radius ``r_min`` are merged (no slivers)."""
    if diameters is None:
        return ()
    diameters = list(diameters)
    if len(diameters) != n:
        raise InputError(f"FE member stiffness: layer_outer_diameters needs one value per layer ({n}), "
                         f"got {len(diameters)}")
    out: list[float | None] = []
    for i, d in enumerate(diameters):
        if d is None:
            out.append(None)
            continue
        r = _check(f"layer {i + 1} outer diameter", d) / 2
        if r < r_min * (1 - GEOMETRY_TOLERANCE):
            raise InputError(f"FE member stiffness: layer {i + 1} outer diameter {2 * r:.4g} mm is smaller than "
                             f"the bearing diameters ({2 * r_min:.4g} mm): the part is narrower than its bearing face")
        out.append(r_min if r - r_min < snap else r)
    rims = sorted({r for r in out if r is not None})
    merged = {}
    for r in rims:
        base = next((m for m in merged.values() if abs(r - m) < snap), r)
        merged[r] = base
    return tuple(None if r is None else merged[r] for r in out)


def fe_member_stiffness(layers: list[FeLayer], hole_diameter: float, bearing_diameter: float,
                        far_bearing_diameter: float | None = None, outer_diameter: float | None = None,
                        bearing: str = "rigid", interfaces: str = "contact", tapped: bool = False,
                        thread_diameter: float | None = None, refine_check: bool = True,
                        engaged_length: float | None = None, thread_load: str = "decaying",
                        layer_outer_diameters: Sequence[float | None] | None = None) -> FeResult:
    """Member stiffness k_m (N/mm) of a layered annular stack by axisymmetric FE.

    k_m = P / delta_P with delta_P the mean axial approach of the two bearing faces, or for a
    tapped joint of the head bearing face to the interface with the tapped part (the
    clamped layers only; see the module docstring for the model and the definition).  Parameters, mm / MPa: ``layers`` from the head
    side; ``hole_diameter`` d_h; ``bearing_diameter`` d_w of head or washer;
    ``far_bearing_diameter`` of nut or washer (default d_w); ``outer_diameter`` of the
    plate (default: doubled from about the cone's reach until k_m changes by under
    0.5 %); ``bearing`` "rigid" | "pressure"; ``interfaces`` "contact" | "bonded";
    ``tapped``: the last layer is threaded, its hole has ``thread_diameter`` (default
    d_h) and carries the load over ``engaged_length`` (default its thickness) below its
    top face, distributed by ``thread_load`` ("decaying": :func:`thread_load_density` with
    l_decay = 0.5 thread_diameter; "uniform"); ``refine_check``: refine the mesh uniformly
    until k_m changes < 1 %.  ``thread_region_compliance`` of the result is the tapped
    part's thread region (bolt side).  ``layer_outer_diameters``: one per layer, the outer
    diameter of that layer's part (None: ``outer_diameter``, or the searched plate), so a
    narrow part bounds its own layer only.

    Source: method of Wileman, Choudhury & Green, J. Mech. Design 113 (1991) 432-437
    (axisymmetric FE of the members); formulation of our own as described above.

    ``mesh_change`` is NaN when ``refine_check`` is False.

    Examples
    --------
    Two 12 mm steel plates, hole 12 mm, bearing 18 mm: 6 % below the Wileman fit
    E d A exp(B d/l) = 2.68e6 N/mm, plates in contact out to about 32 mm.

    >>> res = fe_member_stiffness([FeLayer(12.0, 207000.0, 0.291)] * 2, 12.0, 18.0)
    >>> round(res.stiffness / 1e6, 2), round(res.contact_diameters[0])
    (2.52, 33)
    """
    t0 = time.perf_counter()
    g = make_geometry(layers, hole_diameter, bearing_diameter, far_bearing_diameter, bearing,
                      interfaces, tapped, thread_diameter, engaged_length, thread_load, layer_outer_diameters)
    guess = _cone_contact_guess(g)
    if outer_diameter is not None:
        r_out = _check("outer_diameter", outer_diameter) / 2
        if r_out < max(g.r_w, g.r_w2, g.r_t) * (1 - GEOMETRY_TOLERANCE):
            raise InputError("FE member stiffness: outer_diameter must not be smaller than the bearing diameters")
        sol = solve_member_stack(g, r_out, 0, guess)
    else:
        r_out, sol = plate_radius_search(g, guess)
    change = float("nan")
    if refine_check:
        sol, change = refined_solution(g, r_out, sol)
    radii = g.outer_radii(r_out)
    return FeResult(sol.stiffness, sol.approach, sol.contact_diameters, 2 * max(radii), change,
                    sol.elements, time.perf_counter() - t0, sol.thread_region, [2 * r for r in radii])
