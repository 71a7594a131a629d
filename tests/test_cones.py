"""Clipped pressure cones against closed forms and independent numerical integration.

Parts are built with cadquery in the tests.  The head bearing face of every joint lies
on the top face of the upper plate, the axis points down (−z), so height z along the
axis is (z_top − global z).
"""
from __future__ import annotations

import math

import cadquery as cq
import pytest
from scipy import integrate
from shapely.geometry import Point, box as shapely_box
from shapely.ops import unary_union

from OCP.BRepGProp import BRepGProp
from OCP.GProp import GProp_GProps

from geomjoint.geometry.cones import (
    ConeJoint,
    ConeLayer,
    clipped_cone_stiffness,
    cone_area,
    cone_solids,
    disc_polygon_area,
)

ALPHA = math.radians(30.0)   # Shigley 10th ed. §8-5, recommended cone half-angle
TAN = math.tan(ALPHA)
E_STEEL = 207_000.0          # MPa, Shigley 10th ed. Table 8-8 (steel 207 GPa)
E_ALU = 71_000.0             # MPa, Shigley 10th ed. Table 8-8 (aluminium 71 GPa)
E_IRON = 100_000.0           # MPa, Shigley 10th ed. Table 8-8 (gray cast iron 100 GPa)
HOLE = 13.0                  # mm, hole = "d" of eq. (8-20) generalised
DW = 18.0                    # mm, bearing diameter (1.5·d for d = 12, Shigley §8-5)


def slab(x0, x1, y0, y1, z0, z1, holes=(), hole=HOLE):
    """A box with vertical through holes at (x, y)."""
    solid = cq.Solid.makeBox(x1 - x0, y1 - y0, z1 - z0, pnt=cq.Vector(x0, y0, z0))
    for x, y in holes:
        cyl = cq.Solid.makeCylinder(hole / 2, z1 - z0 + 2, pnt=cq.Vector(x, y, z0 - 1))
        solid = solid.cut(cyl)
    return solid


def volume(shape) -> float:
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape, props)
    return props.Mass()


def joint_on(plates, at=(0.0, 0.0), z_top=None, dw=DW, dfar=DW, jid="J", tapped=False, lprime=None):
    """A joint through `plates` = [(solid, thickness, E, name)], top to bottom."""
    z_top = z_top if z_top is not None else sum(p[1] for p in plates)
    layers, z = [], 0.0
    for solid, t, E, name in plates:
        layers.append(ConeLayer(solid.wrapped, z, z + t, E, name, HOLE))
        z += t
    return ConeJoint(jid, (at[0], at[1], z_top), (0.0, 0.0, -1.0), layers, dw, dfar,
                     tapped=tapped, effective_grip=lprime)


# ---------------------------------------------------------------- independent closed form

def eq_8_20_k(E, d, D, t):
    """Shigley 10th ed. eq. (8-20): frustum of thickness t, small-end diameter D, hole d."""
    return math.pi * E * d * TAN / math.log(
        (2 * t * TAN + D - d) * (D + d) / ((2 * t * TAN + D + d) * (D - d)))


def closed_form_compliance(layers, dw, dfar, L, d=HOLE):
    """Σ over the frustum pieces of each layer (split at L/2) of 1/k from eq. (8-20).

    layers: (z0, z1, E) or (z0, z1, E, hole diameter of that layer)."""
    delta = 0.0
    hole = d
    for z0, z1, E, *own in layers:
        d = own[0] if own else hole
        z0, z1 = max(z0, 0.0), min(z1, L)
        # head cone on [0, L/2]: diameter dw + 2 z tanα
        a, b = z0, min(z1, L / 2)
        if b > a:
            delta += 1.0 / eq_8_20_k(E, d, dw + 2 * a * TAN, b - a)
        # far cone on [L/2, L]: diameter dfar + 2 (L − z) tanα, small end at the larger z
        a, b = max(z0, L / 2), z1
        if b > a:
            delta += 1.0 / eq_8_20_k(E, d, dfar + 2 * (L - b) * TAN, b - a)
    return delta


def test_disc_polygon_area_identities():
    import numpy as np
    sq = [(-1, -1), (1, -1), (1, 1), (-1, 1), (-1, -1)]
    a = np.array(sq[:-1], float)
    b = np.array(sq[1:], float)
    # circle inscribed in the square: π r² (mathematics)
    assert disc_polygon_area(a, b, 1.0)[0] == pytest.approx(math.pi, rel=1e-14)
    # circumscribed circle covers the square: area 4 (mathematics)
    assert disc_polygon_area(a, b, math.sqrt(2.0))[0] == pytest.approx(4.0, rel=1e-14)
    # in between: compare with a fine shapely disc (polygon error ~1e-8 at 2**14 segments)
    r = 1.2
    ref = Point(0, 0).buffer(r, quad_segs=2 ** 14).intersection(shapely_box(-1, -1, 1, 1)).area
    assert disc_polygon_area(a, b, r)[0] == pytest.approx(ref, rel=1e-7)


def test_unclipped_cone_equals_closed_form_frustum_three_layers():
    # plates far wider than the cone (cone radius ≤ 9 + 20·tan30° ≈ 20.5 mm)
    t = (10.0, 8.0, 22.0)
    plates = []
    z = sum(t)
    for ti, E, name in zip(t, (E_STEEL, E_ALU, E_IRON), ("cover", "spacer", "housing")):
        plates.append((slab(-150, 150, -150, 150, z - ti, z, holes=[(0, 0)]), ti, E, name))
        z -= ti
    joint = joint_on(plates, dw=DW, dfar=20.0)
    res = clipped_cone_stiffness(joint)
    L = sum(t)
    layers = [(0, 10, E_STEEL), (10, 18, E_ALU), (18, 40, E_IRON)]
    expected = 1.0 / closed_form_compliance(layers, DW, 20.0, L)
    # Shigley 10th ed. eq. (8-20), generalised to pieces: exact integral of dx/(E π (r² − r_h²))
    assert res.stiffness == pytest.approx(expected, rel=1e-6)
    assert res.ideal_stiffness == pytest.approx(expected, rel=1e-9)
    assert res.area_fraction_mid_grip == pytest.approx(1.0, abs=1e-9)
    assert res.lost_to_edges == pytest.approx(0.0, abs=1e-9)
    # splitting into layers: per-layer compliances sum to the total (identity)
    assert sum(c for _, c in res.per_layer) == pytest.approx(1.0 / res.stiffness, rel=1e-12)
    assert all(prismatic for *_, prismatic in res.prismatic)


def test_unclipped_tapped_joint_uses_effective_grip():
    # cover 10 mm over a tapped housing; l' = h + d/2 for t2 ≥ d (Shigley 10th ed. Table 8-7)
    h, d = 10.0, 12.0
    lprime = h + d / 2
    cover = slab(-100, 100, -100, 100, 30.0, 40.0, holes=[(0, 0)])
    housing = slab(-100, 100, -100, 100, 0.0, 30.0, holes=[(0, 0)])
    joint = joint_on([(cover, 10.0, E_STEEL, "cover"), (housing, 30.0, E_IRON, "housing")],
                     tapped=True, lprime=lprime)
    res = clipped_cone_stiffness(joint)
    # Shigley 10th ed. eq. (8-20) with the cones meeting at l'/2; the member is the cover's share
    # of them, the housing's share is in series with the bolt (docs/tapped_stiffness.md)
    expected = 1.0 / closed_form_compliance([(0, 10, E_STEEL)], DW, DW, lprime)
    assert res.stiffness == pytest.approx(expected, rel=1e-6)
    whole = closed_form_compliance([(0, 10, E_STEEL), (10, 40, E_IRON)], DW, DW, lprime)
    assert 1.0 / res.stiffness < whole      # the housing's share left the member
    assert res.z_mid == pytest.approx(lprime / 2)


def test_model_clearance_hole_is_subtracted_at_its_own_size():
    # the model has 14 mm holes, the caller passes 13 mm: the larger, modelled hole counts
    d_model = 14.0
    top = slab(-150, 150, -150, 150, 10.0, 20.0, holes=[(0, 0)], hole=d_model)
    bot = slab(-150, 150, -150, 150, 0.0, 10.0, holes=[(0, 0)], hole=d_model)
    res = clipped_cone_stiffness(joint_on([(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_ALU, "bottom")]))
    expected = 1.0 / closed_form_compliance([(0, 10, E_STEEL), (10, 20, E_ALU)], DW, DW, 20.0, d=d_model)
    # Shigley 10th ed. eq. (8-20) with d = the modelled hole
    assert res.stiffness == pytest.approx(expected, rel=1e-6)
    assert res.stiffness < res.ideal_stiffness  # ideal uses the 13 mm hole_diameter


def test_tapped_housing_bore_does_not_enter_the_member():
    # housing modelled with a 10.2 mm tap-drill bore (M12, common practice), the caller gives
    # d = 12: the member of a tapped joint is the clamped cover alone (docs/tapped_stiffness.md),
    # so neither bore changes it
    cover = slab(-100, 100, -100, 100, 30.0, 40.0, holes=[(0, 0)])
    housing = slab(-100, 100, -100, 100, 0.0, 30.0, holes=[(0, 0)], hole=10.2)
    layers = [ConeLayer(cover.wrapped, 0.0, 10.0, E_STEEL, "cover", HOLE),
              ConeLayer(housing.wrapped, 10.0, 40.0, E_IRON, "housing", 12.0)]
    lprime = 10.0 + 12.0 / 2  # Shigley 10th ed. Table 8-7, t2 ≥ d
    joint = ConeJoint("T", (0.0, 0.0, 40.0), (0.0, 0.0, -1.0), layers, DW, DW,
                      tapped=True, effective_grip=lprime)
    res = clipped_cone_stiffness(joint)
    expected = 1.0 / closed_form_compliance([(0, 10, E_STEEL, HOLE)], DW, DW, lprime)
    # Shigley 10th ed. eq. (8-20): the cover's pieces of the cones meeting at l'/2
    assert res.stiffness == pytest.approx(expected, rel=1e-6)
    # the marked-up cones are the member's: none in the housing
    assert [name for name, _ in cone_solids(joint)] == ["T:cover:head", "T:cover:far"]


def test_section_of_a_drilled_plate_and_its_face_catalogue():
    from geomjoint.geometry.sections import KIND_CYLINDER, KIND_PLANE, PlaneFrame, face_catalog, section_polygons
    plate = slab(-50, 50, -30, 30, 0.0, 10.0, holes=[(0, 0), (30, 10)], hole=13.5)
    frame = PlaneFrame.for_direction((0, 0, 1))
    sec = section_polygons(plate.wrapped, frame, 4.0)
    # two circular holes sampled at 5e-4 mm chord deflection: area error below 1e-4 of a hole
    assert sec.area == pytest.approx(6000 - 2 * math.pi * 6.75 ** 2, abs=2 * 1e-4 * math.pi * 6.75 ** 2)
    assert sum(len(p.interiors) for p in sec.geoms) == 2
    win = section_polygons(plate.wrapped, frame, 4.0, window=(-10, -10, 10, 10))
    assert win.area == pytest.approx(400 - math.pi * 6.75 ** 2, rel=1e-4)
    cat = face_catalog(plate.wrapped)
    assert sorted(cat.kind.tolist()).count(KIND_PLANE) == 6      # a box has six planar faces
    assert KIND_CYLINDER in cat.kind.tolist()


def test_bad_input_names_the_joint():
    from geomjoint.errors import InputError
    plate = slab(-50, 50, -50, 50, 0.0, 10.0, holes=[(0, 0)])
    layers = [ConeLayer(plate.wrapped, 0.0, 10.0, E_STEEL, "plate", HOLE)]
    with pytest.raises(InputError, match="J9"):
        clipped_cone_stiffness(ConeJoint("J9", (0, 0, 10), (0, 0, -1), layers, 12.0, 12.0))  # d_w < hole
    with pytest.raises(InputError, match="J9"):
        clipped_cone_stiffness(ConeJoint("J9", (0, 0, 10), (0, 0, -1), layers, DW, DW, cone_angle_deg=95.0))


# ---------------------------------------------------------------- clipped by plate edges

def segment_area(r, e):
    """Area of the circular segment of a circle of radius r beyond a chord at distance e."""
    if e >= r:
        return 0.0
    return r * r * math.acos(e / r) - e * math.sqrt(r * r - e * e)


def test_narrow_plate_matches_independent_integration_of_strip_area():
    # both plates span x ∈ [−14, 11]: edges 14 and 11 mm from the axis, cone radius up to 14.8
    e1, e2, t = 11.0, 14.0, 10.0
    top = slab(-e2, e1, -120, 120, t, 2 * t, holes=[(0, 0)])
    bot = slab(-e2, e1, -120, 120, 0.0, t, holes=[(0, 0)])
    joint = joint_on([(top, t, E_STEEL, "top"), (bot, t, E_STEEL, "bottom")])
    res = clipped_cone_stiffness(joint)

    L, rh = 2 * t, HOLE / 2

    def r_of(z):
        return DW / 2 + min(z, L - z) * TAN

    def area(z):  # exact: disc minus two segments minus the hole (mathematics)
        r = r_of(z)
        return math.pi * r * r - segment_area(r, e1) - segment_area(r, e2) - math.pi * rh * rh

    z_hits = sorted({(e - DW / 2) / TAN for e in (e1, e2)} | {L - (e - DW / 2) / TAN for e in (e1, e2)})
    delta, _ = integrate.quad(lambda z: 1.0 / (E_STEEL * area(z)), 0.0, L,
                              points=z_hits + [L / 2], epsabs=0.0, epsrel=1e-12, limit=200)
    # independent numerical integration (scipy quad) of the exact circle–strip area
    assert res.stiffness == pytest.approx(1.0 / delta, rel=1e-7)
    assert res.stiffness < res.ideal_stiffness
    # mid-grip: what the edges take, from the same exact area formula
    r = r_of(L / 2)
    ideal = math.pi * (r * r - rh * rh)
    assert res.lost_to_edges == pytest.approx((segment_area(r, e1) + segment_area(r, e2)) / ideal, rel=1e-9)
    assert res.lost_to_neighbours == pytest.approx(0.0, abs=1e-12)


def test_result_does_not_depend_on_the_placement_of_the_model():
    # a rigid motion of parts and axis together changes nothing (mathematics)
    e1, e2, t = 11.0, 14.0, 10.0
    top = slab(-e2, e1, -120, 120, t, 2 * t, holes=[(0, 0)])
    bot = slab(-e2, e1, -120, 120, 0.0, t, holes=[(0, 0)])
    plain = clipped_cone_stiffness(joint_on([(top, t, E_STEEL, "top"), (bot, t, E_ALU, "bottom")]))

    axis, angle, shift = cq.Vector(1.0, 2.0, 0.5), 37.0, cq.Vector(250.0, -40.0, 75.0)

    def place(solid):
        return solid.rotate(cq.Vector(0, 0, 0), axis, angle).translate(shift)

    def place_point(p):
        vert = cq.Vertex.makeVertex(*p).rotate(cq.Vector(0, 0, 0), axis, angle).translate(shift)
        return vert.toTuple()

    head = place_point((0.0, 0.0, 2 * t))
    below = place_point((0.0, 0.0, 2 * t - 1.0))
    direction = tuple(b - h for b, h in zip(below, head))
    layers = [ConeLayer(place(top).wrapped, 0.0, t, E_STEEL, "top", HOLE),
              ConeLayer(place(bot).wrapped, t, 2 * t, E_ALU, "bottom", HOLE)]
    moved = clipped_cone_stiffness(ConeJoint("J", head, direction, layers, DW, DW))
    assert moved.stiffness == pytest.approx(plain.stiffness, rel=1e-7)
    assert moved.lost_to_edges == pytest.approx(plain.lost_to_edges, rel=1e-6)


# ---------------------------------------------------------------- neighbouring bolts

def _two_bolt_model(s):
    holes = [(0.0, 0.0), (s, 0.0)]
    top = slab(-120, 120 + s, -120, 120, 10.0, 20.0, holes=holes)
    bot = slab(-120, 120 + s, -120, 120, 0.0, 10.0, holes=holes)
    plates = [(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")]
    return joint_on(plates, at=holes[0], jid="A"), joint_on(plates, at=holes[1], jid="B")


def test_two_close_bolts_each_lose_stiffness_and_shares_stay_physical():
    s = 24.0  # pitch below the mid-grip cone diameter 2·(9 + 10·tan30°) ≈ 29.5 mm
    a, b = _two_bolt_model(s)
    alone = clipped_cone_stiffness(a)
    ra = clipped_cone_stiffness(a, neighbours=[a, b])
    rb = clipped_cone_stiffness(b, neighbours=[a, b])
    assert ra.stiffness < alone.stiffness
    assert rb.stiffness < alone.stiffness
    assert ra.stiffness == pytest.approx(rb.stiffness, rel=1e-9)  # mirror symmetry
    assert ra.lost_to_neighbours > 0.0

    # the two shares at mid-grip never exceed the union of the two discs in the plate;
    # with equal radii the bisector splits the union exactly (mathematics)
    r = DW / 2 + 10.0 * TAN
    discs = unary_union([Point(0, 0).buffer(r, quad_segs=2 ** 13), Point(s, 0).buffer(r, quad_segs=2 ** 13)])
    union = discs.area - 2 * math.pi * (HOLE / 2) ** 2
    assert ra.area_mid_grip + rb.area_mid_grip <= union * (1 + 1e-7)
    assert ra.area_mid_grip + rb.area_mid_grip == pytest.approx(union, rel=1e-6)

    # independent integration: disc cut by the bisector x = s/2 (exact segment formula)
    rh = HOLE / 2

    def area(z):
        rz = DW / 2 + min(z, 20.0 - z) * TAN
        return math.pi * rz * rz - segment_area(rz, s / 2) - math.pi * rh * rh

    zh = (s / 2 - DW / 2) / TAN
    delta, _ = integrate.quad(lambda z: 1.0 / (E_STEEL * area(z)), 0, 20.0,
                              points=[zh, 10.0, 20.0 - zh], epsabs=0.0, epsrel=1e-12, limit=200)
    assert ra.stiffness == pytest.approx(1.0 / delta, rel=1e-7)


def test_tilted_neighbour_bisector_moves_with_height():
    # B's axis leans 3° towards +x: the bisecting plane is no longer parallel to A's axis
    s, tilt = 24.0, math.radians(3.0)
    a, b = _two_bolt_model(s)
    b.axis_direction = (math.sin(tilt), 0.0, -math.cos(tilt))
    res = clipped_cone_stiffness(a, [b])

    # the plane, built independently: through the midpoint of A's mid-grip point c and the
    # nearest point q of B's axis, normal q − c (mathematics)
    c = (0.0, 0.0, 10.0)
    p0, dirb = (s, 0.0, 20.0), b.axis_direction
    t = sum((ci - pi) * di for ci, pi, di in zip(c, p0, dirb))
    q = tuple(pi + t * di for pi, di in zip(p0, dirb))
    w = tuple(qi - ci for qi, ci in zip(q, c))
    m = tuple(0.5 * (qi + ci) for qi, ci in zip(q, c))
    rh = HOLE / 2

    def dist(z):  # distance from A's axis to the plane's trace at height 20 − z
        zz = 20.0 - z
        return abs(-m[0] * w[0] - m[1] * w[1] + (zz - m[2]) * w[2]) / math.hypot(w[0], w[1])

    def radius(z):
        return DW / 2 + min(z, 20.0 - z) * TAN

    def area(z):
        r = radius(z)
        return math.pi * (r * r - rh * rh) - segment_area(r, dist(z))

    from scipy.optimize import brentq
    kinks = [brentq(lambda z: radius(z) - dist(z), lo, hi) for lo, hi in ((0.0, 10.0), (10.0, 20.0))]
    delta, _ = integrate.quad(lambda z: 1.0 / (E_STEEL * area(z)), 0, 20.0,
                              points=kinks + [10.0], epsabs=0.0, epsrel=1e-12, limit=200)
    # independent integration of the exact disc-minus-segment area
    assert res.stiffness == pytest.approx(1.0 / delta, rel=1e-8)
    (name, head), _ = cone_solids(a, [b])
    v_exact, _ = integrate.quad(area, 0.0, 10.0, points=kinks[:1], epsrel=1e-12, limit=200)
    assert volume(head) == pytest.approx(v_exact, rel=1e-5)  # B-rep vs ∫ A dz


def test_distant_neighbour_changes_nothing():
    a, b = _two_bolt_model(60.0)  # pitch beyond twice the largest cone radius
    assert clipped_cone_stiffness(a, [b]).stiffness == pytest.approx(
        clipped_cone_stiffness(a).stiffness, rel=1e-12)


# ---------------------------------------------------------------- pockets, chamfers

def test_pocket_under_the_head_lowers_stiffness_by_the_pocket_area():
    # a 4 mm deep pocket x ∈ [11, 30], |y| ≤ 10 milled into the top face beside the head
    depth = 4.0
    plain = slab(-100, 100, -100, 100, 10.0, 20.0, holes=[(0, 0)])
    pocket = cq.Solid.makeBox(19.0, 20.0, depth + 1, pnt=cq.Vector(11.0, -10.0, 20.0 - depth))
    pocketed = plain.cut(pocket)
    bot = slab(-100, 100, -100, 100, 0.0, 10.0, holes=[(0, 0)])
    j_plain = joint_on([(plain, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")])
    j_pocket = joint_on([(pocketed, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")])
    k_plain = clipped_cone_stiffness(j_plain).stiffness
    res = clipped_cone_stiffness(j_pocket)
    assert res.stiffness < k_plain
    # the layer was split at the pocket floor, both pieces sectioned once (prismatic)
    cuts = [(a, b) for part, a, b, _ in res.prismatic if part == "top"]
    assert any(abs(b - depth) < 1e-6 for a, b in cuts)

    # independent: the pocket removes disc ∩ rectangle on z ∈ [0, depth]
    rect = shapely_box(11.0, -10.0, 30.0, 10.0)
    rh = HOLE / 2

    def area(z):
        r = DW / 2 + min(z, 20.0 - z) * TAN
        lost = Point(0, 0).buffer(r, quad_segs=2 ** 12).intersection(rect).area if z < depth else 0.0
        return math.pi * (r * r - rh * rh) - lost

    zh = (11.0 - DW / 2) / TAN
    delta, _ = integrate.quad(lambda z: 1.0 / (E_STEEL * area(z)), 0, 20.0,
                              points=[zh, depth, 10.0], epsabs=0.0, epsrel=1e-10, limit=200)
    assert res.stiffness == pytest.approx(1.0 / delta, rel=1e-6)


def _chamfered_plate(e, c):
    """Top plate (z 10..20) with its edge at x = e and a 45° chamfer of size c on the
    bottom edge (the interface side, where the head cone is widest)."""
    top = slab(-100, e, -100, 100, 10.0, 20.0, holes=[(0, 0)])
    wp = cq.Workplane(obj=top).edges(cq.selectors.NearestToPointSelector((e, 0, 10.0))).chamfer(c)
    return wp.val()


def test_chamfer_is_sectioned_per_point_and_matches_exact_area():
    e, c = 14.0, 4.0
    top = _chamfered_plate(e, c)
    square = slab(-100, e, -100, 100, 10.0, 20.0, holes=[(0, 0)])
    bot = slab(-100, 100, -100, 100, 0.0, 10.0, holes=[(0, 0)])
    joint = joint_on([(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")])
    res = clipped_cone_stiffness(joint)
    # the chamfer band z ∈ [6, 10] is not prismatic, the rest of the layer is
    flags = [(a, b, prismatic) for part, a, b, prismatic in res.prismatic if part == "top"]
    assert any(not p and a == pytest.approx(10.0 - c, abs=1e-5) for a, b, p in flags)
    assert any(p for a, b, p in flags)

    rh = HOLE / 2

    def area(z):  # edge at x = e − (z − (10 − c)) in the chamfer band (mathematics)
        r = DW / 2 + min(z, 20.0 - z) * TAN
        if z >= 10.0:
            return math.pi * (r * r - rh * rh)
        edge = e - (z - (10.0 - c)) if z > 10.0 - c else e
        return math.pi * (r * r - rh * rh) - segment_area(r, edge)

    z_edge = (e - DW / 2) / TAN           # disc reaches the vertical edge
    # disc meets the chamfer: 9 + z·tanα = e + 10 − c − z
    z_ch = (e + 10.0 - c - DW / 2) / (1 + TAN)
    delta, _ = integrate.quad(lambda z: 1.0 / (E_STEEL * area(z)), 0, 20.0,
                              points=sorted([z_edge, z_ch, 10.0 - c, 10.0]),
                              epsabs=0.0, epsrel=1e-11, limit=200)
    # per-point sections with fixed Gauss rules: agreement to about 1e-5 expected
    assert res.stiffness == pytest.approx(1.0 / delta, rel=1e-5)
    k_square = clipped_cone_stiffness(
        joint_on([(square, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")])).stiffness
    assert res.stiffness < k_square * (1 - 1e-3)


# ---------------------------------------------------------------- B-rep cone volumes

def test_cone_solid_volumes_equal_integral_of_area():
    s = 24.0
    holes = [(0.0, 0.0), (s, 0.0)]
    top = slab(-14, 100, -100, 100, 10.0, 20.0, holes=holes)
    top = top.cut(cq.Solid.makeBox(10.0, 30.0, 4.0, pnt=cq.Vector(-5.0, 10.0, 16.0)))  # a pocket
    bot = slab(-14, 100, -100, 100, 0.0, 10.0, holes=holes)
    plates = [(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_ALU, "bottom")]
    a = joint_on(plates, at=holes[0], jid="A")
    b = joint_on(plates, at=holes[1], jid="B")
    solids = cone_solids(a, [b])
    assert [name for name, _ in solids] == ["A:top:head", "A:bottom:far"]
    # heights where A(z) has a kink: disc meets the pocket (r = 10), its corners
    # (r = √(5² + 10²)), the pocket floor, the bisector x = 12, the plate edge x = −14
    kinks = sorted({(10.0 - DW / 2) / TAN, (math.hypot(5.0, 10.0) - DW / 2) / TAN, 4.0,
                    (s / 2 - DW / 2) / TAN, (14.0 - DW / 2) / TAN,
                    20.0 - (s / 2 - DW / 2) / TAN, 20.0 - (14.0 - DW / 2) / TAN})
    for (name, shape), (z0, z1) in zip(solids, [(0.0, 10.0), (10.0, 20.0)]):
        edges = [z0, *[k for k in kinks if z0 < k < z1], z1]
        v_int = sum(integrate.fixed_quad(lambda zs: [cone_area(a, z, [b]) for z in zs], lo, hi, n=6)[0]
                    for lo, hi in zip(edges[:-1], edges[1:]))
        # B-rep volume (OCC mass properties) vs ∫ A(z) dz of true plane sections (Gauss)
        assert volume(shape) == pytest.approx(v_int, rel=1e-3), name
    # and the stiffness samples use the same areas: cone_area at a sample height agrees
    res = clipped_cone_stiffness(a, [b])
    z, A, E = res.samples[len(res.samples) // 3]
    assert cone_area(a, z, [b]) == pytest.approx(A, rel=1e-4)


def test_many_faced_part_is_cut_to_a_block_without_changing_the_result(monkeypatch):
    import geomjoint.geometry.cones as cones_mod
    # the chamfered plate again, with 45 small holes far from the joint (> 40 faces)
    e, c = 14.0, 4.0
    far_holes = [(-90.0 + 5.0 * i, 40.0 + 5.0 * j) for i in range(9) for j in range(5)]
    top = slab(-100, e, -100, 100, 10.0, 20.0, holes=[(0, 0)])
    top = top.cut(*[cq.Solid.makeCylinder(1.0, 12.0, pnt=cq.Vector(x, y, 9.0)) for x, y in far_holes])
    top = cq.Workplane(obj=top).edges(cq.selectors.NearestToPointSelector((e, 0, 10.0))).chamfer(c).val()
    bot = slab(-100, 100, -100, 100, 0.0, 10.0, holes=[(0, 0)])
    joint = joint_on([(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")])
    blocked = clipped_cone_stiffness(joint)
    assert any(not p for *_, p in blocked.prismatic)
    monkeypatch.setattr(cones_mod, "_FEW_FACES", 10 ** 9)
    whole = clipped_cone_stiffness(joint)
    # the same sections from the whole part and from the block around the axis (identity)
    assert blocked.stiffness == pytest.approx(whole.stiffness, rel=1e-10)


# ---------------------------------------------------------------- cone solids: whole, clipped, shared

def reference_cone_solids(joint, neighbours=()):
    """The cone pieces by the plain construction: cone − hole cylinder, ∩ the whole part, ∩ the
    own-side half-space of each neighbour (two booleans per piece, whatever the part)."""
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common, BRepAlgoAPI_Cut
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeFace
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeCone, BRepPrimAPI_MakeCylinder, BRepPrimAPI_MakeHalfSpace
    from OCP.gp import gp_Ax2, gp_Dir, gp_Pln, gp_Pnt
    import numpy as np

    n = np.asarray(joint.axis_direction, float)
    p0 = np.asarray(joint.axis_point, float)
    tan = math.tan(math.radians(joint.cone_angle_deg))
    L = max(l.z_end for l in joint.layers)
    out = []
    for layer in joint.layers:
        for side, lo, hi in (("head", 0.0, L / 2), ("far", L / 2, L)):
            za, zb = max(layer.z_start, lo), min(layer.z_end, hi)
            if zb - za <= 1e-9:
                continue
            r = (lambda z: joint.bearing_diameter / 2 + z * tan) if side == "head" else \
                (lambda z: joint.far_bearing_diameter / 2 + (L - z) * tan)
            base = p0 + za * n
            cone = BRepPrimAPI_MakeCone(gp_Ax2(gp_Pnt(*base), gp_Dir(*n)), r(za), r(zb), zb - za).Shape()
            hole = BRepPrimAPI_MakeCylinder(gp_Ax2(gp_Pnt(*(base - n)), gp_Dir(*n)), layer.hole_diameter / 2,
                                            zb - za + 2).Shape()
            shape = BRepAlgoAPI_Common(BRepAlgoAPI_Cut(cone, hole).Shape(), layer.solid).Shape()
            for other in neighbours:
                q = np.asarray(other.axis_point, float)
                w = (q - p0) - ((q - p0) @ n) * n
                w /= np.linalg.norm(w)
                m = 0.5 * (p0 + q) + L / 2 * n
                face = BRepBuilderAPI_MakeFace(gp_Pln(gp_Pnt(*m), gp_Dir(*w))).Face()
                half = BRepPrimAPI_MakeHalfSpace(face, gp_Pnt(*(m - w))).Solid()
                shape = BRepAlgoAPI_Common(shape, half).Shape()
            out.append((f"{joint.id}:{layer.part}:{side}", shape))
    return out


def _centre(shape):
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(shape, props)
    c = props.CentreOfMass()
    return c.X(), c.Y(), c.Z()


def test_whole_cones_are_one_solid_per_piece_placed_at_each_joint():
    from geomjoint.geometry.cones import ConeCache

    pts = [(40.0 * i, 40.0 * j) for i in range(3) for j in range(2)]
    top = slab(-40, 120, -40, 80, 10.0, 20.0, holes=pts)
    bot = slab(-40, 120, -40, 80, 0.0, 10.0, holes=pts)
    plates = [(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_STEEL, "bottom")]
    joints = [joint_on(plates, at=p, jid=f"J{k}") for k, p in enumerate(pts)]
    cache = ConeCache()
    solids = [cone_solids(j, [o for o in joints if o is not j], cache=cache) for j in joints]
    # the cones never leave the plates: each piece is the plain hollow frustum (mathematics)
    r0, r1 = DW / 2, DW / 2 + 10.0 * TAN
    frustum = math.pi * 10.0 / 3 * (r0 * r0 + r0 * r1 + r1 * r1) - math.pi * (HOLE / 2) ** 2 * 10.0
    for (x, y), pieces in zip(pts, solids):
        assert [n.split(":", 1)[1] for n, _ in pieces] == ["top:head", "bottom:far"]
        for (name, shape), (zlo, zhi) in zip(pieces, [(10.0, 20.0), (0.0, 10.0)]):
            assert volume(shape) == pytest.approx(frustum, rel=1e-9), name
            cx, cy, cz = _centre(shape)
            assert (cx, cy) == (pytest.approx(x, abs=1e-9), pytest.approx(y, abs=1e-9))
            assert zlo < cz < zhi
    # and the same as the plain construction, piece by piece
    for (_, fast), (_, ref) in zip(solids[0], reference_cone_solids(joints[0])):
        assert volume(fast) == pytest.approx(volume(ref), rel=1e-9)
    # one definition per distinct piece: every joint's head piece is an instance of the first
    heads = [pieces[0][1] for pieces in solids]
    assert all(h.IsPartner(heads[0]) for h in heads) and not heads[0].IsSame(heads[1])
    assert not solids[0][0][1].IsPartner(solids[0][1][1])   # head and far pieces differ in place


def test_clipped_cones_equal_the_plain_construction_and_instances_share_them():
    from geomjoint.geometry.cones import ConeCache

    # a bolt 11 mm from the plate edge (its cone, up to 14.8 mm wide, runs out), a neighbour 24 mm away
    holes = [(0.0, 0.0), (24.0, 0.0)]
    top = slab(-11, 100, -60, 60, 10.0, 20.0, holes=holes)
    bot = slab(-11, 100, -60, 60, 0.0, 10.0, holes=holes)
    plates = [(top, 10.0, E_STEEL, "top"), (bot, 10.0, E_ALU, "bottom")]
    a = joint_on(plates, at=holes[0], jid="A")
    b = joint_on(plates, at=holes[1], jid="B")
    for fast, ref in zip(cone_solids(a, [b]), reference_cone_solids(a, [b])):
        assert fast[0] == ref[0]
        assert volume(fast[1]) == pytest.approx(volume(ref[1]), rel=1e-7), fast[0]
    # two placed instances of one small bracket definition, each with a bolt near its edge
    bracket = slab(-11, 30, -20, 20, 0.0, 10.0, holes=[(0.0, 0.0)])
    base = slab(-200, 200, -200, 200, -10.0, 0.0, holes=[(0.0, 0.0), (100.0, 50.0)])
    cache = ConeCache()
    pieces = []
    for k, at in enumerate([(0.0, 0.0), (100.0, 50.0)]):
        placed = bracket.moved(cq.Location(cq.Vector(at[0], at[1], 0.0)))
        assert placed.wrapped.IsPartner(bracket.wrapped)
        layers = [ConeLayer(placed.wrapped, 0.0, 10.0, E_STEEL, f"bracket{k}", HOLE),
                  ConeLayer(base.wrapped, 10.0, 20.0, E_STEEL, "base", HOLE)]
        joint = ConeJoint(f"K{k}", (at[0], at[1], 10.0), (0.0, 0.0, -1.0), layers, DW, DW)
        got = cone_solids(joint, cache=cache)
        for (name, shape), (_, ref) in zip(got, reference_cone_solids(joint)):
            assert volume(shape) == pytest.approx(volume(ref), rel=1e-7), name
        pieces.append(got)
    # the clipped bracket piece is built once and placed twice; so is the whole base piece
    assert pieces[0][0][1].IsPartner(pieces[1][0][1])
    assert pieces[0][1][1].IsPartner(pieces[1][1][1])
    assert volume(pieces[0][0][1]) < volume(pieces[0][1][1]) * (1 - 1e-3)   # the bracket piece is clipped


def test_placed_instances_share_the_section_of_their_definition():
    from geomjoint.geometry.sections import PlaneFrame, SectionCache, section_polygons

    # a washer-like ring with a flat, placed three times (moved, moved, turned): each placed
    # section equals the kernel's own section of that placed shape
    ring = (cq.Workplane("XY").circle(10.0).circle(5.5).extrude(2.0)
            .cut(cq.Workplane("XY").box(30, 30, 10).translate((0, 24.0, 0)))).val()
    cache = SectionCache()
    frame = PlaneFrame.for_direction((0.0, 0.0, -1.0))
    for at, turn in (((40.0, 5.0, 10.0), 0.0), ((-7.0, 90.0, 10.0), 0.0), ((3.0, 4.0, 10.0), 30.0)):
        placed = ring.moved(cq.Location(cq.Vector(*at), cq.Vector(0, 0, 1), turn))
        offset = frame.offset_of((0.0, 0.0, at[2] + 1.0))
        shared = cache.section(placed.wrapped, frame, offset).geom
        direct = section_polygons(placed.wrapped, frame, offset)
        assert direct.area > 0
        assert shared.area == pytest.approx(direct.area, rel=1e-9)
        assert shared.symmetric_difference(direct).area < 1e-9 * direct.area
    # the two moved copies share one kernel section; the turned one has its own
    assert sum(len(v) for v in cache._definitions.values()) == 2
