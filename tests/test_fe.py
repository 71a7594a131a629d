"""Axisymmetric FE of the members: exact elasticity solutions, convergence, identities, the Wileman fit."""
import math

import numpy as np
import pytest
from skfem import ElementQuad0, MeshQuad, asm

from geomjoint.errors import InputError
from geomjoint.mechanics import fe, vdi
from geomjoint.mechanics.fe import FeLayer, fe_member_stiffness, solve_axisymmetric
from geomjoint.mechanics.members import WILEMAN_CONSTANTS, wileman_stiffness

EPS = 1e-9

#: E (MPa) and Poisson's ratio per material, Budynas & Nisbett (Shigley 10th ed.) Table 8-8 (from memory)
TABLE_8_8 = {
    "steel": (206_800.0, 0.291),
    "aluminium": (71_000.0, 0.334),
    "copper": (118_600.0, 0.326),
    "gray cast iron": (100_000.0, 0.211),
}


def _on(mesh, test):
    return mesh.facets_satisfying(test, boundaries_only=True)


# ----------------------------------------------------------------- exact elasticity solutions

def test_uniaxial_compression_of_a_solid_cylinder():
    # elasticity solution of a bar in simple compression: u_z = -p z / E, u_r = nu p r / E
    # (Timoshenko & Goodier, Theory of Elasticity, simple tension; from memory)
    E, nu, R, L, p = 200_000.0, 0.3, 5.0, 20.0, 10.0
    mesh = MeshQuad.init_tensor(np.linspace(0, R, 4), np.linspace(0, L, 5))
    model, u, _ = solve_axisymmetric(
        mesh, E, nu,
        tractions=[(_on(mesh, lambda x: abs(x[1] - L) < EPS), 0.0, -p)],
        fixed_r=[_on(mesh, lambda x: abs(x[0]) < EPS)],        # the axis
        fixed_z=[_on(mesh, lambda x: abs(x[1]) < EPS)])        # frictionless base
    r, z = model.doflocs
    c = model.component
    np.testing.assert_allclose(u[c == 1], -p * z[c == 1] / E, atol=1e-12)
    np.testing.assert_allclose(u[c == 0], nu * p * r[c == 0] / E, atol=1e-12)


def test_hollow_cylinder_member_stiffness_is_EA_over_L():
    # a tube loaded over its whole end faces by a rigid frictionless face: k = E A / L
    # (elasticity solution of simple compression, lateral expansion free; from memory),
    # split into two layers of one material (all interface pairs stay in compression)
    E, nu, d_h, D, L = 70_000.0, 0.33, 10.0, 24.0, 30.0
    exact = E * math.pi / 4 * (D ** 2 - d_h ** 2) / L
    for bearing in ("rigid", "pressure"):
        res = fe_member_stiffness([FeLayer(L / 2, E, nu)] * 2, d_h, D, outer_diameter=D,
                                  bearing=bearing, refine_check=False)
        assert res.stiffness == pytest.approx(exact, rel=1e-9)
        assert res.contact_diameters == [pytest.approx(D)]


def test_lame_thick_cylinder_under_internal_pressure():
    # Lamé: sigma_r = A - B/r^2, sigma_t = A + B/r^2, A = p a^2/(b^2 - a^2), B = A b^2; free ends
    # (sigma_z = 0) give u_r = r [(1 - nu) A + (1 + nu) B / r^2] / E
    # (Timoshenko & Goodier, Theory of Elasticity, thick-walled cylinder; from memory)
    E, nu, a, b, p, L = 200_000.0, 0.3, 5.0, 15.0, 10.0, 4.0
    mesh = MeshQuad.init_tensor(fe.graded_interval(a, b, 8), np.linspace(0, L, 3))
    model, u, _ = solve_axisymmetric(
        mesh, E, nu,
        tractions=[(_on(mesh, lambda x: abs(x[0] - a) < EPS), p, 0.0)],
        fixed_z=[_on(mesh, lambda x: abs(x[1]) < EPS)])
    r = model.doflocs[0][model.component == 0]
    A = p * a ** 2 / (b ** 2 - a ** 2)
    B = A * b ** 2
    exact = r * ((1 - nu) * A + (1 + nu) * B / r ** 2) / E
    np.testing.assert_allclose(u[model.component == 0], exact, rtol=5e-4)


def test_vectorised_assembly_equals_the_weak_form():
    # the fast assembler must reproduce scikit-fem's assembly of the same bilinear form
    # (identity up to round-off), here on a two-material graded mesh
    mesh = MeshQuad.init_tensor(fe.graded_interval(6.0, 20.0, 5), fe.graded_interval(0.0, 8.0, 3))
    mesh = mesh.with_subdomains({"upper": lambda x: x[1] > 4.0})
    E = np.where(np.isin(np.arange(mesh.t.shape[1]), mesh.subdomains["upper"]), 71_000.0, 207_000.0)
    model = fe.AxisymmetricModel(mesh, E, 0.3)
    b0 = model.basis.with_element(ElementQuad0())
    reference = asm(fe.axisymmetric_elasticity, model.basis, lam=b0.interpolate(model.lam),
                    mu=b0.interpolate(model.mu))
    assert abs(reference - model.K).max() <= 1e-12 * abs(reference).max()


def test_traction_load_vector_sums_to_the_applied_force():
    # resultant of a uniform traction t on a cylindrical wall r = a, height h: 2 pi a h t (geometry)
    a, h, t = 6.0, 9.0, 2.5
    mesh = MeshQuad.init_tensor(np.linspace(a, 12.0, 3), np.linspace(0, h, 4))
    model = fe.AxisymmetricModel(mesh, 100_000.0, 0.3)
    f = model.traction(_on(mesh, lambda x: abs(x[0] - a) < EPS), 0.0, t)
    assert f[model.component == 1].sum() == pytest.approx(2 * math.pi * a * h * t, rel=1e-12)
    assert abs(f[model.component == 0].sum()) < 1e-9


# ----------------------------------------------------------------- convergence

def test_mesh_convergence_under_uniform_refinement():
    # nested refinement of a displacement model lowers the stiffness monotonically
    # (energy bound of conforming FE, mathematics) and the reported change is < 1 %
    g = fe.make_geometry([FeLayer(12.0, 207_000.0, 0.291)] * 2, 12.0, 18.0, bearing="pressure",
                         interfaces="bonded")
    k = [fe.solve_member_stack(g, 30.0, level).stiffness for level in (0, 1, 2)]
    assert k[0] >= k[1] >= k[2]
    assert (k[1] - k[2]) < (k[0] - k[1])
    assert abs(k[0] - k[2]) / k[2] < 0.01
    res = fe_member_stiffness([FeLayer(4.0, 207_000.0, 0.291)] * 2, 12.0, 18.0)
    assert res.mesh_change < fe.MESH_TOLERANCE


def test_radius_convergence():
    # doubling the automatic plate radius again changes k_m by < 0.5 %; a narrow plate is
    # softer (removing material lowers the stiffness, energy argument)
    layers = [FeLayer(10.0, 207_000.0, 0.291)] * 2
    auto = fe_member_stiffness(layers, 12.0, 18.0, refine_check=False)
    wider = fe_member_stiffness(layers, 12.0, 18.0, outer_diameter=2 * auto.outer_diameter,
                                refine_check=False)
    assert abs(wider.stiffness - auto.stiffness) / wider.stiffness < fe.RADIUS_TOLERANCE
    narrow = fe_member_stiffness(layers, 12.0, 18.0, outer_diameter=24.0, refine_check=False)
    assert narrow.stiffness < auto.stiffness


# ----------------------------------------------------------------- identities and physics

@pytest.mark.parametrize("interfaces", ["contact", "bonded"])
def test_symmetric_stack_gives_symmetric_displacements(interfaces):
    # two equal plates, equal bearings: u_r(r, z) = u_r(r, H - z), u_z(r, z) + u_z(r, H - z)
    # is one constant (a rigid translation) -- symmetry, mathematics
    g = fe.make_geometry([FeLayer(8.0, 207_000.0, 0.291)] * 2, 12.0, 18.0, interfaces=interfaces)
    s = fe.solve_member_stack(g, 60.0, 0)
    H = s.mesh.z_faces[-1]
    layer = np.empty(s.model.N, dtype=int)
    el_dofs = s.model.basis.element_dofs
    for i in range(2):
        layer[np.unique(el_dofs[:, s.mesh.layer_of_element == i])] = i
    r, z = s.model.doflocs
    key = {(int(layer[j]), int(s.model.component[j]), round(r[j], 7), round(z[j], 7)): j
           for j in range(s.model.N)}
    mirror = np.array([key[(1 - int(layer[j]), int(s.model.component[j]), round(r[j], 7),
                            round(H - z[j], 7))] for j in range(s.model.N)])
    cr = s.model.component == 0
    scale = np.abs(s.u).max()
    np.testing.assert_allclose(s.u[cr], s.u[mirror][cr], atol=1e-8 * scale)
    total = (s.u + s.u[mirror])[~cr]
    np.testing.assert_allclose(total, total[0], atol=1e-8 * scale)


def test_two_bonded_layers_equal_one_layer_of_double_thickness():
    # identity: a bonded interface inside one material is no interface (same nodes: exact)
    E, nu, t = 207_000.0, 0.291, 9.0
    two = fe.make_geometry([FeLayer(t, E, nu)] * 2, 12.0, 18.0, interfaces="bonded")
    one = fe.make_geometry([FeLayer(2 * t, E, nu)], 12.0, 18.0)
    z = fe.graded_interval(0.0, t, 6)
    k2 = fe.solve_member_stack(two, 50.0, 0, z_grids=[z, z]).stiffness
    k1 = fe.solve_member_stack(one, 50.0, 0, z_grids=[np.unique(np.concatenate([z, z + t]))]).stiffness
    assert k2 == pytest.approx(k1, rel=1e-9)
    # and through the public function, each with its own automatic mesh: within the mesh error
    a = fe_member_stiffness([FeLayer(t, E, nu)] * 2, 12.0, 18.0, interfaces="bonded")
    b = fe_member_stiffness([FeLayer(2 * t, E, nu)], 12.0, 18.0)
    assert a.stiffness == pytest.approx(b.stiffness, rel=0.01)


def test_contact_zone_is_finite_and_contact_is_softer_than_bonded():
    # wide plates separate away from the bolt (the pressure zone of a bolted joint is bounded;
    # common practice), and releasing constraints can only lower the stiffness (energy argument)
    layers = [FeLayer(10.0, 207_000.0, 0.291)] * 2
    contact = fe_member_stiffness(layers, 12.0, 18.0, outer_diameter=120.0)
    bonded = fe_member_stiffness(layers, 12.0, 18.0, outer_diameter=120.0, interfaces="bonded")
    (dc,) = contact.contact_diameters
    assert 18.0 < dc < 0.9 * contact.outer_diameter
    assert bonded.contact_diameters == [pytest.approx(120.0)]
    assert contact.stiffness <= bonded.stiffness * (1 + 1e-9)


def test_pressure_bearing_is_softer_than_rigid_bearing():
    # a flexible (uniform-pressure) load is softer than a rigid punch of the same area
    # (the rigid face is a constraint on the pressure case's field; energy argument)
    layers = [FeLayer(12.0, 207_000.0, 0.291)] * 2
    rigid = fe_member_stiffness(layers, 12.0, 18.0, outer_diameter=100.0)
    pressure = fe_member_stiffness(layers, 12.0, 18.0, outer_diameter=100.0, bearing="pressure")
    assert pressure.stiffness < rigid.stiffness


def test_tapped_joint_member_near_the_vdi_tapped_joint_body():
    # cap screw in a tapped part of thickness t2 = d.  The member is the clamped layer alone
    # (docs/tapped_stiffness.md), as in VDI 2230-1:2015 Sec. 5.1.2.2 for a tapped thread joint
    # (one cone, w = 2, tan phi_E; from memory); a model, not an identity: within 12 %
    d, h, d_h, d_w, E = 12.0, 16.0, 13.5, 18.0, 207_000.0
    res = fe_member_stiffness([FeLayer(h, E, 0.291), FeLayer(d, E, 0.291)], d_h, d_w, tapped=True,
                              thread_diameter=d)
    tan_phi, _, _ = vdi._cone_geometry(d_w, h, None, True)
    body = 1 / vdi.member_resilience_cone(d_w, d_h, h, E, tan_phi, 2.0)
    assert res.stiffness == pytest.approx(body, rel=0.12)
    assert len(res.contact_diameters) == 1 and res.contact_diameters[0] > d_w
    assert res.thread_region_compliance > 0


@pytest.mark.parametrize("thread_diameter", [None, 10.0])
def test_tapped_load_acts_on_the_engaged_thread_only(thread_diameter):
    # statics: the head pushes P down on the bearing annulus, the engaged thread pulls P up,
    # and only on the hole wall of the tapped layer within the engaged length
    g = fe.make_geometry([FeLayer(10.0, 2e5, 0.3), FeLayer(20.0, 2e5, 0.3)], 12.0, 18.0,
                         bearing="pressure", tapped=True, thread_diameter=thread_diameter,
                         engaged_length=8.0)
    s = fe.solve_member_stack(g, 40.0, 0)
    r, z = s.model.doflocs
    fz = np.where(s.model.component == 1, s.load, 0.0)
    r_t = (thread_diameter or 12.0) / 2
    wall = (np.abs(r - r_t) < EPS) & (z > 12.0 - EPS) & (z < 20.0 + EPS)
    head = np.abs(z - 30.0) < EPS
    assert fz[wall].sum() == pytest.approx(1.0, rel=1e-12)
    assert fz[head].sum() == pytest.approx(-1.0, rel=1e-12)
    assert np.abs(fz[~wall & ~head]).max() < 1e-12


# ----------------------------------------------------------------- Wileman et al. (1991)

@pytest.mark.parametrize("material, d_over_l", [("steel", 0.25), ("steel", 1.0),
                                                ("aluminium", 0.5), ("copper", 0.75),
                                                ("gray cast iron", 1.25)])
def test_against_the_wileman_fit(material, d_over_l):
    # Wileman, Choudhury & Green, J. Mech. Design 113 (1991): k_m = E d A exp(B d/l), two equal
    # plates, hole d, bearing 1.5 d; constants Shigley 10th ed. Table 8-8 (from memory).  Their
    # boundary conditions are not part of the fit: agreement expected within ~15 %, not better.
    E, nu = TABLE_8_8[material]
    d = 10.0
    l = d / d_over_l
    res = fe_member_stiffness([FeLayer(l / 2, E, nu)] * 2, d, 1.5 * d)
    fit = wileman_stiffness(E, d, l, *WILEMAN_CONSTANTS[material])
    assert res.stiffness == pytest.approx(fit, rel=0.15)


# ----------------------------------------------------------------- each layer its own outline

#: two 15 mm steel layers, M12 with a 13 mm hole and an 18 mm bearing face on both sides (a strap
#: of 30 mm equivalent diameter against a wide plate)
PAIR = [FeLayer(15.0, 207_000.0, 0.29)] * 2
NARROW = 30.0


def test_one_bound_for_every_layer_is_the_plate_outer_diameter():
    # identity: every layer bounded at D is the stack of outer diameter D, to round-off
    whole = fe_member_stiffness(PAIR, 13.0, 18.0, outer_diameter=NARROW)
    per_layer = fe_member_stiffness(PAIR, 13.0, 18.0, layer_outer_diameters=[NARROW, NARROW])
    assert per_layer.stiffness == pytest.approx(whole.stiffness, rel=1e-12)
    assert per_layer.layer_outer_diameters == [NARROW, NARROW] and per_layer.outer_diameter == NARROW


def test_the_narrow_layer_governs_its_own_layer():
    # hand reasoning: a symmetric through joint's mid-plane stays (nearly) plane, so each layer is
    # half of the symmetric stack of its own outline; with one narrow and one wide layer
    # 1/k = (1/k_narrow + 1/k_wide) / 2 -- whichever of the two layers is the narrow one
    narrow = fe_member_stiffness(PAIR, 13.0, 18.0, outer_diameter=NARROW).stiffness
    wide = fe_member_stiffness(PAIR, 13.0, 18.0).stiffness
    head = fe_member_stiffness(PAIR, 13.0, 18.0, layer_outer_diameters=[NARROW, None])
    nut = fe_member_stiffness(PAIR, 13.0, 18.0, layer_outer_diameters=[None, NARROW])
    assert narrow < head.stiffness < wide
    assert head.stiffness == pytest.approx(2.0 / (1.0 / narrow + 1.0 / wide), rel=0.01)
    assert nut.stiffness == pytest.approx(head.stiffness, rel=1e-6)      # mirror image
    assert head.layer_outer_diameters[0] == NARROW and head.layer_outer_diameters[1] > 4 * NARROW
    assert head.outer_diameter == head.layer_outer_diameters[1]
    assert head.mesh_change < fe.MESH_TOLERANCE
    # the interface is in contact out to the narrow layer's rim at most
    assert head.contact_diameters[0] <= NARROW * (1 + EPS)


def test_a_narrow_cap_on_a_tapped_block():
    # the cap (member) narrow, the tapped block wide: the member is softer than on a wide cap
    layers = [FeLayer(15.0, 207_000.0, 0.29), FeLayer(30.0, 207_000.0, 0.29)]
    kw = dict(tapped=True, thread_diameter=12.0, engaged_length=18.0)
    wide = fe_member_stiffness(layers, 13.5, 17.23, **kw)
    narrow = fe_member_stiffness(layers, 13.5, 17.23, layer_outer_diameters=[26.0, None], **kw)
    assert narrow.stiffness < 0.97 * wide.stiffness
    assert narrow.layer_outer_diameters[0] == 26.0 and narrow.layer_outer_diameters[1] > 26.0


@pytest.mark.parametrize("bounds", [[NARROW], [NARROW, 15.0], [NARROW, -1.0], [NARROW, "wide"]])
def test_bad_layer_outlines_name_the_layer(bounds):
    with pytest.raises(InputError, match="layer"):
        fe_member_stiffness(PAIR, 13.0, 18.0, layer_outer_diameters=bounds)


# ----------------------------------------------------------------- bad input

@pytest.mark.parametrize("kwargs", [dict(bearing="soft"), dict(interfaces="glued"), dict(thread_load="even"),
                                    dict(bearing_diameter=10.0), dict(outer_diameter=15.0),
                                    dict(layers=[]), dict(layers=[FeLayer(-1.0, 2e5, 0.3)]),
                                    dict(layers=[FeLayer(5.0, 2e5, 0.5)]),
                                    dict(tapped=True)])
def test_bad_input_names_the_key(kwargs):
    args = dict(layers=[FeLayer(5.0, 2e5, 0.3)], hole_diameter=12.0, bearing_diameter=18.0)
    args.update(kwargs)
    with pytest.raises(InputError):
        fe_member_stiffness(**args)
