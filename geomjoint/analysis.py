"""Job (+ model) → [JointResult]: the pipeline behind `geomjoint check`.

Per joint: JointSpec → member stiffness by the method the job asks for (:class:`MemberMethods`,
the one place each method is computed, also for the side-by-side comparison) → the textbook
engine (`mechanics.checks.assess`) → with ``method = "vdi"`` the VDI 2230-1 chain, whose
preload window, fatigue and pressure checks then replace the textbook ones → thread
stripping → slip when the joint carries shear → the stack-up of a model joint → the verdict,
rated once (`mechanics.checks.rate_result`) → remedies.

A model joint that cannot be resolved (no size, no standard length, missing hardware data)
is not analysed: it is reported with its reason and findings, and the other joints are checked.
"""
from __future__ import annotations

import math
import multiprocessing
import os
import time
from dataclasses import dataclass, field, replace
from typing import Any, Callable

import numpy as np

from geomjoint.errors import InputError
from geomjoint.job import Job, check_rules_match, is_excluded, rule_bringing_in
from geomjoint.mechanics import checks as engine
from geomjoint.mechanics.checks import slip_check
from geomjoint.mechanics.joint import (
    Check,
    ConeStiffness,
    FeRun,
    FitBias,
    JointResult,
    MethodDeviation,
    MethodSpread,
    JointSpec,
    StiffnessComparison,
)
from geomjoint.mechanics.members import (
    FRUSTUM_TAPPED_WORST,
    METHOD_SPREAD_LIMIT,
    PUBLISHED_MODEL_SPREAD,
    PUBLISHED_MODEL_SPREAD_SOURCE,
    VDI_TAPPED_WORST,
    WILEMAN_TAPPED_BIAS,
)
from geomjoint.mechanics import stackup as limits_stackup
from geomjoint.mechanics.stripping import engagement_of, insert_pullout_check, stripping_check
from geomjoint.mechanics.vdi import vdi_chain, vdi_checks, vdi_member_stiffness, vdi_stiffness_split
from geomjoint.progress import Progress
from geomjoint.resolve import ModelJoint, UnanalysedJoint, not_analysed, resolve_model_joints, typed_joint_specs

#: textbook checks that the VDI chain replaces when ``method = "vdi"``
VDI_REPLACES = ("fatigue",)

#: methods the side-by-side comparison always runs (the clipped cone joins them where there is geometry)
COMPARED_METHODS = ("frustum", "exponential", "vdi", "fe")

#: a clipped cone keeping at least this fraction of its mid-grip area counts as unclipped
#: (round-off of the section areas)
UNCLIPPED_FRACTION = 1.0 - 1e-6

#: the check that says a joint was not analysed (timeout, or it could not be resolved)
ANALYSIS_CHECK = "analysis"


# ----------------------------------------------------------------------------- member stiffness

def cone_record(cone, neighbours: tuple[str, ...] = ()) -> ConeStiffness:
    """The plain record of a geometry.cones.ConeResult."""
    return ConeStiffness(stiffness=cone.stiffness, ideal_stiffness=cone.ideal_stiffness,
                         area_fraction_mid_grip=cone.area_fraction_mid_grip, area_mid_grip=cone.area_mid_grip,
                         lost_to_edges=cone.lost_to_edges, lost_to_neighbours=cone.lost_to_neighbours,
                         neighbours=tuple(neighbours),
                         layer_areas=tuple(area for _, area, _ in cone.layer_sections),
                         layer_ideal_areas=tuple(ideal for _, _, ideal in cone.layer_sections))


def outer_diameter_of_area(area: float, hole_diameter: float) -> float:
    """Outside diameter of the annulus with ``area`` (mm²) around the hole: D = √(4A/π + d_h²), mm.

    >>> round(outer_diameter_of_area(math.pi / 4 * (30.0**2 - 13.0**2), 13.0), 6)
    30.0
    """
    return (4.0 * area / math.pi + hole_diameter ** 2) ** 0.5


def fe_engagement(spec: JointSpec) -> float | None:
    """Engaged thread of a tapped joint for the FE, mm; None: the whole tapped depth (or a through joint)."""
    L_e = engagement_of(spec)[0] if spec.tapped else None
    return L_e if L_e is not None and L_e > 0 else None   # a screw too short fails its length check


def fe_inner_diameters(spec: JointSpec) -> list[float]:
    """Inner diameter of each layer in the FE model, mm: the hole; a tapped part's thread (its nominal d)."""
    inner = [spec.hole_diameter] * len(spec.layers)
    if spec.tapped:
        inner[-1] = spec.fastener.d
    return inner


def run_outline(layer_outlines: list[str]) -> str:
    """The run's one outline word (results.json ``outline``): "clipped-cone" if any layer's outline
    is its part's, else the one the layers share ("job" or "converged")."""
    for word in ("clipped-cone", "job"):
        if word in layer_outlines:
            return word
    return "converged"


def fe_run(spec: JointSpec, layer_diameters: list[float | None], layer_outlines: list[str]) -> FeRun:
    """k_m of the joint's stack by the axisymmetric FE model (mechanics.fe), and the outline used.

    ``layer_diameters``: the outer diameter of each layer, head side first (None: a plate wide
    enough that k_m stops changing); ``layer_outlines``: where each comes from (OUTLINES).
    """
    from geomjoint.mechanics.fe import FeLayer, fe_member_stiffness

    # a tapped part is modelled whole, loaded by its engaged thread (docs/tapped_stiffness.md)
    layers = [FeLayer(layer.thickness, layer.E, layer.poisson) for layer in spec.layers]
    fe = fe_member_stiffness(layers, spec.hole_diameter, spec.bearing_diameter,
                             None if spec.tapped else spec.far_bearing_diameter,
                             bearing=spec.fe_bearing, tapped=spec.tapped,
                             thread_diameter=spec.fastener.d if spec.tapped else None,
                             engaged_length=fe_engagement(spec), layer_outer_diameters=layer_diameters)
    return FeRun(stiffness=fe.stiffness, outer_diameter=fe.outer_diameter, mesh_change=fe.mesh_change,
                 contact_diameters=tuple(fe.contact_diameters),
                 layer_outer_diameters=tuple(fe.layer_outer_diameters), outline=run_outline(layer_outlines),
                 thread_region_compliance=fe.thread_region_compliance, layer_outlines=tuple(layer_outlines))


@dataclass
class MemberMethods:
    """The member stiffness of one joint by each method, each computed once and kept.

    The value a method gives here is the value the joint gets when that method is chosen:
    the chosen stiffness and the side-by-side comparison both come from :meth:`value`.
    ``cone_source``: for a model joint, the clipped cone against the parts (geometry.cones);
    None for a typed-in joint, whose "cone" is the frustum bounded by its outside diameter.
    """

    spec: JointSpec
    cone_source: Callable[[], ConeStiffness] | None = None
    cone: ConeStiffness | None = None
    fe: FeRun | None = None
    _values: dict[str, float] = field(default_factory=dict)

    def value(self, method: str) -> float:
        """k_m by ``method`` (frustum, exponential, vdi, cone, fe), N/mm."""
        if method not in self._values:
            self._values[method] = self._compute(method)
        return self._values[method]

    def _compute(self, method: str) -> float:
        spec = self.spec
        if method == "vdi":
            return vdi_member_stiffness(spec)
        if method == "cone" and self.cone_source is not None:
            self.cone = self.cone_source()
            return self.cone.stiffness
        if method == "fe":
            self.fe = fe_run(spec, *self.fe_outlines())
            return self.fe.stiffness
        closed = replace(spec, member_stiffness=method, members_value=None)
        return engine.member_side(closed, engine.effective_grip_of(closed))[0]

    def fe_outlines(self) -> tuple[list[float | None], list[str]]:
        """The FE's outer diameter of each layer and where it comes from (see mechanics.joint.OUTLINES).

        A model joint: each layer whose part clips the cone (where the cone is widest in that
        layer) gets the annulus of that clipped area around the FE's bore (its own part's
        outline, so a narrow strap bounds its own layer only); the others the job's
        ``outside_diameter``, else a plate wide enough that k_m stops changing (None).
        """
        spec = self.spec
        fallback = (spec.outside_diameter, "job") if spec.outside_diameter is not None else (None, "converged")
        rows = [fallback] * len(spec.layers)
        if self.cone_source is not None:
            self.value("cone")
        if self.cone is not None and len(self.cone.layer_areas) == len(rows):
            areas = zip(self.cone.layer_areas, self.cone.layer_ideal_areas, fe_inner_diameters(spec))
            rows = [(outer_diameter_of_area(area, bore), "clipped-cone") if area < UNCLIPPED_FRACTION * ideal
                    else fallback for area, ideal, bore in areas]
        return [d for d, _ in rows], [word for _, word in rows]

    def methods(self) -> tuple[str, ...]:
        """The methods the comparison runs for this joint."""
        extra = ("cone",) if self.cone_source is not None or self.spec.member_stiffness == "cone" else ()
        return COMPARED_METHODS[:3] + extra + COMPARED_METHODS[3:]

    def comparison(self) -> StiffnessComparison:
        return StiffnessComparison(**{m: self.value(m) for m in self.methods()})


def with_member_value(spec: JointSpec, methods: MemberMethods) -> JointSpec:
    """The spec carrying the k_m of a method the textbook engine cannot compute itself."""
    if spec.members_value is not None:
        return spec
    if spec.member_stiffness in ("cone", "fe") or (spec.member_stiffness == "vdi" and spec.method != "vdi"):
        if spec.member_stiffness == "cone" and methods.cone_source is None:
            return spec  # typed-in joint: the engine's bounded frustum is its cone
        return replace(spec, members_value=methods.value(spec.member_stiffness))
    return spec


def tapped_fit_bias(spec: JointSpec, stiffness_method: str, methods: MemberMethods) -> FitBias | None:
    """The exponential fit's known bias, when a tapped joint uses it or compares it (else None).

    The Wileman fit (through joints, d_w = 1.5 d) reads 26-47 % above the FE on every tapped
    case of docs/tapped_stiffness.md; this joint's own deviation is measured against the VDI
    2230-1 substitute body (the default for tapped joints, a closed form, so always at hand).
    """
    if not spec.tapped:
        return None
    if stiffness_method == "exponential":
        role = "chosen"
    elif spec.compare_stiffness:
        role = "compared"
    else:
        return None
    deviation = methods.value("exponential") / methods.value("vdi") - 1.0
    low, high = WILEMAN_TAPPED_BIAS
    message = (f"exponential (Wileman) member stiffness {'used' if role == 'chosen' else 'compared'} on a tapped "
               f"joint: the fit was made for through joints with d_w = 1.5 d and knows neither the bearing nor the "
               f"hole diameter; here it reads {100 * deviation:+.0f} % against the VDI 2230-1 substitute body, and "
               f"on the documented tapped cases {100 * low:+.0f} % to {100 * high:+.0f} % against the FE (docs/tapped_stiffness.md)"
               + ("; prefer vdi (the default for tapped joints) or fe" if role == "chosen" else ""))
    return FitBias("exponential", role, "vdi", deviation, low, high, message)


def fit_bias_finding(bias: FitBias) -> dict:
    """The finding of a known method bias: warn when the joint's k_m is the biased method, info when compared."""
    return {"severity": "warn" if bias.role == "chosen" else "info", "code": "tapped-fit-bias",
            "message": bias.message}


#: why a method departs from the others on a tapped joint (docs/tapped_stiffness.md, "Agreement")
SPREAD_REASONS = {
    "frustum": ("the 30° frusta assume the bearing annulus loads the cap like a wide washer and ignore how "
                "the tapped part gives way (a narrow annulus on a soft tapped part is its worst case: "
                f"documented {100 * FRUSTUM_TAPPED_WORST:+.1f} % against the FE for M8 into aluminium)"),
    "cone": ("the clipped cone is the frustum's 30° cone cut by the parts' outline: it shares the frustum's "
             "assumptions and adds how much the parts clip it"),
    "vdi": ("the VDI 2230-1 substitute body's cone angle depends on beta_L and y only, not on the moduli of "
            "cap and tapped part, while a soft cap on a stiff base spreads its load further "
            f"(documented {100 * VDI_TAPPED_WORST:+.1f} % against the FE for an aluminium cap on steel)"),
    "fe": ("the FE models this joint's own outline and its whole tapped part, which no closed form does; it is "
           "the reference the closed forms are documented against, so the other value is the doubtful one"),
}


def method_spread(spec: JointSpec, result: JointResult, methods: MemberMethods) -> MethodSpread | None:
    """The tapped joint's member-stiffness methods against its reference, those beyond ±10 % named.

    Methods: the frustum and the VDI 2230-1 body (closed forms, always at hand), the clipped cone
    and the FE where they were computed for this joint, and the chosen method's own value. The
    reference is the FE where it ran, else the chosen value (the VDI body when the chosen is the
    exponential fit). The exponential fit is left to :func:`tapped_fit_bias` (never reported twice).
    None for a through joint.
    """
    if not spec.tapped:
        return None
    chosen = result.stiffness_method
    values = {"frustum": methods.value("frustum"), "vdi": methods.value("vdi")}
    if methods.cone is not None:
        values["cone"] = methods.cone.stiffness
    if methods.fe is not None:
        values["fe"] = methods.fe.stiffness
    values[chosen] = result.member_stiffness   # exactly the k_m the joint got
    values.pop("exponential", None)
    reference = "fe" if "fe" in values else (chosen if chosen in values else "vdi")
    k_ref = values[reference]
    rows = []
    for method, k in values.items():
        if method == reference:
            continue
        deviation = k / k_ref - 1.0
        outside = abs(deviation) > METHOD_SPREAD_LIMIT
        rows.append(MethodDeviation(method, k, deviation, outside, SPREAD_REASONS[method] if outside else ""))
    named = tuple(row.method for row in rows if row.outside)
    against_fe, against_tests = PUBLISHED_MODEL_SPREAD
    message = ""
    if named:
        centre = ("the FE" if reference == "fe" else f"this joint's k_m ({reference})" if reference == chosen
                  else "the VDI 2230-1 body (the chosen exponential fit is named by tapped-fit-bias)")
        own = " (this joint's k_m)"
        parts = "; ".join(f"{row.method}{own if row.method == chosen else ''} "
                          f"{100 * row.deviation:+.1f} %: {row.reason}" for row in rows if row.outside)
        message = (f"member-stiffness methods of this tapped joint lie more than {100 * METHOD_SPREAD_LIMIT:.0f} % "
                   f"from {centre}: {parts}. Published spread of member-stiffness models: up to "
                   f"{100 * against_fe:.1f} % against FE and {100 * against_tests:.1f} % against experiments "
                   f"({PUBLISHED_MODEL_SPREAD_SOURCE}; none published for tapped joints)"
                   + ("; prefer fe for this joint" if chosen in named else ""))
    return MethodSpread(reference, k_ref, chosen, METHOD_SPREAD_LIMIT, tuple(rows), named,
                        against_fe, against_tests, PUBLISHED_MODEL_SPREAD_SOURCE, message)


def method_spread_finding(spread: MethodSpread) -> dict:
    """The finding of methods that disagree: warn when the joint's own k_m is among them, else info."""
    return {"severity": "warn" if spread.chosen in spread.outside else "info", "code": "tapped-method-spread",
            "message": spread.message}


# ----------------------------------------------------------------------------- one joint

def _vdi_assess(spec: JointSpec) -> JointResult:
    """The textbook engine's result with the VDI 2230-1 chain's stiffness, preload and checks (unrated)."""
    chain = vdi_chain(spec)
    service = replace(spec, members_value=chain.member_stiffness,
                      preload=replace(spec.preload, mode="force", value=chain.preload))
    result = engine.assess(service)
    vdi = vdi_checks(spec, chain)
    fatigue = next(c for c in vdi if c.name == "fatigue")
    return replace(
        result, spec=spec, stiffness_method="vdi" if spec.members_value is None else spec.member_stiffness,
        bolt_stiffness=chain.bolt_stiffness,
        joint_constant=engine.joint_constant(chain.bolt_stiffness, chain.member_stiffness),
        tightening=chain.tightening(), checks=[c for c in result.checks if c.name not in VDI_REPLACES] + vdi,
        fatigue_criterion="vdi", Se=chain.sigma_AS, sigma_a=chain.sigma_a, n_f=fatigue.value,
        factors={**result.factors, "fatigue": fatigue.value}, vdi=chain, notes=result.notes + list(chain.notes),
        stiffness_split=vdi_stiffness_split(spec, chain))


def service_load_check(spec: JointSpec) -> Check:
    """The job's ``require_loads``: a joint that no load reaches fails (it cannot pass fatigue unseen)."""
    return Check("service load", None, None, spec.loaded,
                 "" if spec.loaded else "no [[load]], [[group]] or own load reaches this joint (require_loads = true)")


def assess_joint(spec: JointSpec, methods: MemberMethods | None = None) -> JointResult:
    """Every check the joint's settings call for, not yet rated (model joints add the stack-up)."""
    methods = methods if methods is not None else MemberMethods(spec)
    spec = with_member_value(spec, methods)
    result = _vdi_assess(spec) if spec.method == "vdi" else engine.assess(spec)
    if spec.compare_stiffness:
        result.comparison = methods.comparison()
    result.cone, result.fe = methods.cone, methods.fe
    result.fit_bias = tapped_fit_bias(spec, result.stiffness_method, methods)
    if result.fit_bias is not None:
        result.findings.append(fit_bias_finding(result.fit_bias))
    result.method_spread = method_spread(spec, result, methods)
    if result.method_spread is not None and result.method_spread.outside:
        result.findings.append(method_spread_finding(result.method_spread))
    result.checks.append(stripping_check(spec))
    if spec.insert is not None:
        result.checks.append(insert_pullout_check(spec, result.bolt_force))
    if spec.shear > 0 and spec.method != "vdi":
        result.checks.append(slip_check(spec, result.preload, result.joint_constant))
    if spec.require_load and not spec.loaded:
        result.checks.append(service_load_check(spec))
    result.stackup = limits_stackup.stackup(spec)
    if result.stackup is not None:
        result.checks.append(limits_stackup.stackup_check(result.stackup))
        position = limits_stackup.position_check(result.stackup)
        if position is not None:
            result.checks.append(position)
    return result


def evaluate_joint(spec: JointSpec) -> JointResult:
    """Run every check the joint's settings call for and rate it (a typed-in joint, or a remedy's trial)."""
    return engine.rate_result(assess_joint(spec))


def _trial(spec: JointSpec) -> JointResult:
    """A remedy's re-check: the joint's own checks, without the side-by-side comparison."""
    return evaluate_joint(replace(spec, compare_stiffness=False))


def timed_out(spec: JointSpec, seconds: float) -> JointResult:
    """A joint whose analysis ran past its time limit: the closed-form numbers, and a failing
    check that says it was not analysed (a joint that was not analysed cannot pass). Unrated."""
    from geomjoint.limits import TIMEOUT_NOTE

    fallback = replace(spec, member_stiffness="frustum" if spec.method != "vdi" else "vdi", members_value=None,
                       compare_stiffness=False)
    result = _vdi_assess(fallback) if fallback.method == "vdi" else engine.assess(fallback)
    result.spec = spec
    result.checks.append(Check(ANALYSIS_CHECK, None, None, False,
                               f"{TIMEOUT_NOTE}: {spec.member_stiffness} stiffness took over {seconds:g} s; "
                               f"the numbers shown are the closed-form ones"))
    result.notes.append(TIMEOUT_NOTE)
    return result


def within_time_limit(spec: JointSpec, work: Callable[[], JointResult]) -> JointResult:
    """Run one joint's (unrated) analysis under the per-joint wall-clock limit (geomjoint.limits)."""
    from geomjoint.limits import JointTimeout, current_limits, run_with_timeout

    seconds = current_limits().joint_seconds
    try:
        return run_with_timeout(work, seconds)
    except JointTimeout:
        return timed_out(spec, seconds)


def finish(result: JointResult, hole_limit: float | None = None) -> JointResult:
    """Rate the result (once, every check in) and attach the remedies a failing or marginal joint has."""
    from geomjoint.remedies import find_remedies, stackup_remedies

    engine.rate_result(result)
    if result.verdict == "pass" or any(c.name == ANALYSIS_CHECK and not c.ok for c in result.checks):
        return result  # nothing to mend, or nothing known to mend (not analysed)
    remedies = stackup_remedies(result.findings)
    bolt_failing = [c for c in result.checks if not c.ok and c.name != "stack-up"]
    if bolt_failing or (result.verdict == "marginal" and not remedies):
        remedies += find_remedies(result.spec, result, _trial, hole_limit=hole_limit)
    result.remedies = remedies
    return result


def check_typed_joint(spec: JointSpec) -> JointResult:
    """A typed-in joint: analysed under the time limit, rated, remedies attached."""
    return finish(within_time_limit(spec, lambda: assess_joint(spec)))


# ----------------------------------------------------------------------------- model joints

def stackup_check(findings: list[dict]) -> Check:
    """The scan's stack-up findings as a check: any `fail` finding fails the joint."""
    failing = [f for f in findings if f["severity"] == "fail"]
    return Check("stack-up", None, None, not failing,
                 "; ".join(f["message"] for f in failing) if failing else "")


def cone_joint_of(mj: ModelJoint):
    """The joint's layers as the pressure-cone code sees them (geometry.cones.ConeJoint)."""
    from geomjoint.geometry.cones import ConeJoint, ConeLayer

    j, spec = mj.scan, mj.spec
    layers = [ConeLayer(solid=l.solid, z_start=l.start, z_end=l.end, E=s.E, part=l.part,
                        hole_diameter=l.hole_diameter) for l, s in zip(j.layers, spec.layers)]
    return ConeJoint(id=j.id, axis_point=tuple(j.point), axis_direction=tuple(j.direction), layers=layers,
                     bearing_diameter=spec.bearing_diameter, far_bearing_diameter=spec.far_bearing_diameter,
                     tapped=spec.tapped, effective_grip=engine.effective_grip_of(spec) if spec.tapped else None,
                     cone_angle_deg=spec.cone_angle)


def cone_reach(spec: JointSpec) -> float:
    """Largest radius either pressure cone of the joint reaches, mm (at mid-grip)."""
    tan_a = math.tan(math.radians(spec.cone_angle))
    widest = max(spec.bearing_diameter, spec.far_bearing_diameter or 0.0)
    return 0.5 * widest + 0.5 * engine.effective_grip_of(spec) * tan_a


def cone_neighbours(joints: list[ModelJoint]) -> dict[str, list[str]]:
    """For each joint, the joints whose cones can reach into the same material as its own.

    Two cones can share material only if their axes come closer than the sum of their reaches
    and they clamp a common part; a k-d tree over the axis points keeps this near-linear.
    """
    from scipy.spatial import cKDTree

    if len(joints) < 2:
        return {}
    points = np.array([mj.scan.point for mj in joints], dtype=float)
    reach = np.array([cone_reach(mj.spec) for mj in joints])
    # an axis point may sit anywhere along a grip: widen the search by the longest grip
    span = max(mj.spec.grip for mj in joints)
    tree = cKDTree(points)
    parts = [{layer.part for layer in mj.spec.layers} for mj in joints]
    out: dict[str, list[str]] = {}
    for i, mj in enumerate(joints):
        near = tree.query_ball_point(points[i], r=reach[i] + reach.max() + span)
        out[mj.spec.id] = [joints[k].spec.id for k in sorted(near) if k != i and parts[i] & parts[k]]
    return out


def attach_cone_joints(joints: list[ModelJoint]) -> None:
    """Give each model joint its cone joint and its cone neighbours (one place decides which cones count)."""
    neighbours = cone_neighbours(joints)
    for mj in joints:
        mj.cone_joint = cone_joint_of(mj)
        mj.neighbours = tuple(neighbours.get(mj.spec.id, ()))


@dataclass
class _ModelState:
    """What the worker processes inherit (by fork) to compute cone / FE stiffness."""

    joints: list[ModelJoint]
    cone_cache: Any = None           # geometry.cones.ConeCache shared by the joints of the model

    def cone_source(self, mj: ModelJoint) -> Callable[[], ConeStiffness] | None:
        if mj.cone_joint is None:
            return None
        by_id = {other.spec.id: other for other in self.joints}

        def clipped() -> ConeStiffness:
            from geomjoint.geometry.cones import clipped_cone_stiffness

            neighbours = [by_id[key].cone_joint for key in mj.neighbours]
            return cone_record(clipped_cone_stiffness(mj.cone_joint, neighbours, cache=self.cone_cache),
                               mj.neighbours)
        return clipped


_STATE: _ModelState | None = None   # set in each worker process by _init_worker only


def _init_worker(state: _ModelState) -> None:
    global _STATE
    _STATE = state


def _analyse_model_joint(index: int) -> JointResult | UnanalysedJoint:
    return _analyse_one(_STATE, index)


def _analyse_one(state: _ModelState, index: int) -> JointResult | UnanalysedJoint:
    """One model joint checked; its own bad data (an InputError) sets it aside, not the run."""
    mj = state.joints[index]
    methods = MemberMethods(mj.spec, cone_source=state.cone_source(mj))
    try:
        result = within_time_limit(mj.spec, lambda: assess_joint(mj.spec, methods))
    except InputError as exc:
        return not_analysed(mj.spec.id, str(exc), mj.findings)
    result.findings = list(mj.findings) + result.findings   # the scan's, then the analysis's own
    result.checks.append(stackup_check(mj.findings))
    return finish(result, hole_limit=result.spec.hole_diameter)


def _analyse_model(state: _ModelState, workers: int, quiet: bool, started: float
                   ) -> list[JointResult | UnanalysedJoint]:
    """Every model joint of ``state`` analysed, in order (in worker processes when it pays)."""
    total = len(state.joints)
    progress = Progress("analysed", total, quiet=quiet, started=started)
    workers = workers or os.cpu_count() or 1
    results: list[JointResult | UnanalysedJoint] = []
    if workers > 1 and total > 1 and "fork" in multiprocessing.get_all_start_methods():
        from concurrent.futures import ProcessPoolExecutor

        # fork: the workers inherit the model's shapes instead of re-reading the file
        ctx = multiprocessing.get_context("fork")
        with ProcessPoolExecutor(max_workers=min(workers, total), mp_context=ctx,
                                 initializer=_init_worker, initargs=(state,)) as pool:
            for result in pool.map(_analyse_model_joint, range(total), chunksize=max(1, total // (4 * workers))):
                results.append(result)
                progress.update(len(results))
    else:
        for i in range(total):
            results.append(_analyse_one(state, i))
            progress.update(i + 1)
    return results


def group_shares(job: Job, scanned: list, groups: list[dict] | None = None) -> dict[str, tuple[float, float, float]]:
    """[[group]] resultants shared over the model joints by the rigid-plate pattern method."""
    from geomjoint.grouping import group_loads

    return group_loads(job, {j.id: (j.point, j.direction) for j in scanned}, groups)


@dataclass
class Analysis:
    results: list[JointResult]
    scan: Any = None                 # geometry.scan.ScanResult when the job has a model
    model_joints: list[ModelJoint] = field(default_factory=list)
    excluded: list[str] = field(default_factory=list)   # joint ids the job's ``exclude`` names
    not_analysed: list[UnanalysedJoint] = field(default_factory=list)
    cone_cache: Any = None           # geometry.cones.ConeCache of the cone work (the markup reuses it)

    @property
    def failed(self) -> bool:
        """A joint fails, or one could not be analysed."""
        return bool(self.not_analysed) or any(not r.ok for r in self.results)


def analyze_job(job: Job, *, workers: int = 1, quiet: bool = True, scan=None, model=None) -> Analysis:
    """Analyse every joint of the job: typed-in joints, and every joint found in its model.

    ``model`` (a STEP path or an in-memory cadquery Assembly / Workplane / Shape) replaces the
    job's own ``model``; ``scan`` a scan already made of it.
    """
    started = time.monotonic()
    if model is not None and scan is None:
        from geomjoint.geometry.scan import scan_model

        scan = scan_model(model)
    if not job.joints and job.model is None and scan is None:
        raise InputError("no [[joint]] and no model: nothing to check", where=job.path.name)
    typed_ids = [j["id"] for j in job.joints]
    typed_parts = [(layer.get("part"), None) for j in job.joints for layer in j.get("layers", [])
                   if isinstance(layer, dict)]
    if job.model is None and scan is None:
        check_rules_match(job, typed_ids, typed_parts)
    results = [check_typed_joint(spec) for spec in typed_joint_specs(job)]
    if job.model is None and scan is None:
        if job.groups:
            raise InputError("[[group]] loads need a model (joint positions)", where=job.where("group"))
        return Analysis(results, excluded=[i for i in typed_ids if is_excluded(job, i)])
    if scan is None:
        from geomjoint.geometry.scan import scan_model  # the CAD kernel only for a model

        scan = scan_model(job.model)
    set_aside = getattr(scan, "set_aside", [])
    check_rules_match(job, [j.id for j in scan.joints] + [a.id for a in set_aside] + typed_ids,
                      typed_parts + [(p.name, *p.aliases) for p in scan.model.parts])
    scanned = list(scan.joints) + brought_in(job, scan)
    excluded = [i for i in typed_ids + [j.id for j in scanned] if is_excluded(job, i)]
    analysed = [j for j in scanned if not is_excluded(job, j.id)]
    model_groups = [g for g in job.groups if "positions" not in g]
    shares = group_shares(job, analysed, model_groups) if model_groups else {}
    # [materials] globs match a part's readable name or the file's instance / product name
    aliases = {p.name: p.aliases for p in scan.model.parts}
    model_joints, not_analysed = resolve_model_joints(job, analysed, shares, aliases)
    from geomjoint.geometry.cones import ConeCache

    # the cones (and which neighbours count) are decided here once: the stiffness and the
    # marked-up model both use them
    attach_cone_joints(model_joints)
    state = _ModelState(model_joints, ConeCache())
    for outcome in _analyse_model(state, workers, quiet, started):
        (not_analysed if isinstance(outcome, UnanalysedJoint) else results).append(outcome)
    return Analysis(results, scan, model_joints, excluded, not_analysed, state.cone_cache)


def brought_in(job: Job, scan) -> list:
    """The stacks the scan set aside that a [[fasteners]] rule brings back as joints (its size is
    used as it is; job.rule_bringing_in says which rules do), with the scan's stack-up findings."""
    from geomjoint import catalog
    from geomjoint.errors import InputError
    from geomjoint.geometry.scan import add_findings
    from geomjoint.geometry.stacks import Finding

    out = []
    for aside in getattr(scan, "set_aside", []):
        found = rule_bringing_in(job, aside.id)
        if found is None:
            continue
        i, rule = found
        try:
            thread = catalog.thread(rule["fastener"])
        except InputError as exc:
            raise InputError(str(exc), where=f"{job.path.name}: fasteners[{i}].fastener") from None
        joint = aside.joint
        joint.findings = [Finding("info", aside.code, f"set aside by the scan ({aside.reason}); brought in by "
                                                      f"fasteners[{i}] as {thread.designation}")]
        add_findings(joint, getattr(scan, "system", None), thread=thread)
        out.append(joint)
    return out


def warn_not_analysed(analysis: Analysis) -> list[JointResult]:
    """The results, with a warning for each model joint that could not be analysed (a caller that
    takes only the list of results must still hear of them)."""
    import warnings

    for u in analysis.not_analysed:
        warnings.warn(f"joint {u.id}: {u.message}", NotAnalysedWarning, stacklevel=3)
    return analysis.results


class NotAnalysedWarning(UserWarning):
    """A model joint could not be analysed (its reason is the message)."""


def analyze(job: Job, model=None, *, workers: int = 1, quiet: bool = True) -> list[JointResult]:
    """Analyse every joint of the job (typed-in joints; model joints when the job or ``model`` gives one).

    A model joint that cannot be analysed is not in the list: a :class:`NotAnalysedWarning` names it
    (use :func:`analyze_job` for the joints themselves).
    """
    return warn_not_analysed(analyze_job(job, workers=workers, quiet=quiet, model=model))
