"""Job (+ model) → [JointResult]: the pipeline behind `geomjoint check`.

Per joint: JointSpec → (member stiffness from the method the job asks for) → the textbook
engine (`mechanics.checks.evaluate`) → with ``method = "vdi"`` the VDI 2230-1 chain, whose
preload window, fatigue and pressure checks then replace the textbook ones → thread
stripping → slip when the joint carries shear → verdict.
"""
from __future__ import annotations

import fnmatch
import math
import multiprocessing
import os
import time
from dataclasses import dataclass, field, replace
from typing import Any, Callable

import numpy as np

from geomjoint import catalog
from geomjoint.errors import InputError
from geomjoint.job import (
    Job,
    build_spec,
    check_rules_match,
    is_excluded,
    joint_load,
    material_for_part,
    material_layer_fields,
    settings_for,
    typed_joint_specs,
)
from geomjoint.mechanics import checks as engine
from geomjoint.mechanics.joint import Check, JointResult, JointSpec, LayerSpec
from geomjoint.mechanics.stripping import engagement_of, stripping_check
from geomjoint.progress import Progress
from geomjoint.mechanics.vdi import (clamp_load_for_slip, vdi_chain, vdi_checks, vdi_member_stiffness,
                                     vdi_stiffness_split)

#: textbook checks that the VDI chain replaces when ``method = "vdi"``
VDI_REPLACES = ("fatigue",)


def slip_check(spec: JointSpec, result: JointResult) -> Check:
    """Friction grip of a joint that carries shear (textbook mode).

    Residual clamp load F_K = F_i − (1 − C)·P_max must carry the shear by friction:
    factor = F_K / F_KQ with F_KQ = F_Q / (q_F·μ_T) (VDI 2230-1 eq. R12 form).
    """
    v = spec.vdi
    mu, interfaces = v.friction_interface, v.interfaces_shear
    needed = clamp_load_for_slip(spec.shear, interfaces, mu)
    residual = result.preload - (1.0 - result.joint_constant) * spec.load_max
    value = max(residual, 0.0) / needed
    required = spec.required.get("slip", 1.0)
    return Check("slip", value, required, value >= required,
                 f"residual clamp load {residual:.0f} N against {needed:.0f} N for {spec.shear:.0f} N shear "
                 f"(mu_T = {mu:g}, {interfaces} interface(s))")


def _vdi_result(spec: JointSpec) -> JointResult:
    chain = vdi_chain(spec)
    service = replace(spec, members_value=chain.member_stiffness,
                      preload=replace(spec.preload, mode="force", value=chain.preload))
    result = engine.evaluate(service)
    result.spec = spec
    result.stiffness_method = "vdi" if spec.members_value is None else spec.member_stiffness
    result.bolt_stiffness = chain.bolt_stiffness
    result.joint_constant = engine.joint_constant(chain.bolt_stiffness, chain.member_stiffness)
    result.tightening = chain.tightening()
    result.stiffness_split = vdi_stiffness_split(spec, chain)
    vdi = vdi_checks(spec, chain)
    result.checks = [c for c in result.checks if c.name not in VDI_REPLACES] + vdi
    fatigue = next(c for c in vdi if c.name == "fatigue")
    result.details["fatigue_criterion"] = "vdi"
    result.Se = chain.sigma_AS
    result.sigma_a = chain.sigma_a
    result.n_f = fatigue.value
    result.factors["fatigue"] = fatigue.value
    result.details["vdi"] = {k: v for k, v in vars(chain).items() if isinstance(v, (int, float, str)) or v is None}
    result.notes += list(chain.notes)
    return result


def fe_stiffness(spec: JointSpec, outer_diameter: float | None = None):
    """k_m of the joint's stack by the axisymmetric FE model (mechanics.fe)."""
    from geomjoint.mechanics.fe import FeLayer, fe_member_stiffness

    # a tapped part is modelled whole, loaded by its engaged thread (docs/tapped_stiffness.md)
    layers = [FeLayer(layer.thickness, layer.E, layer.poisson) for layer in spec.layers]
    return fe_member_stiffness(layers, spec.hole_diameter, spec.bearing_diameter,
                               None if spec.tapped else spec.far_bearing_diameter,
                               outer_diameter=outer_diameter or spec.outside_diameter, bearing=spec.fe_bearing,
                               tapped=spec.tapped, thread_diameter=spec.fastener.d if spec.tapped else None,
                               engaged_length=_fe_engagement(spec))


def _fe_engagement(spec: JointSpec) -> float | None:
    """Engaged thread of a tapped joint for the FE, mm; None: the whole tapped depth (or a through joint)."""
    L_e = engagement_of(spec)[0] if spec.tapped else None
    return L_e if L_e is not None and L_e > 0 else None   # a screw too short fails its length check


def stiffness_comparison(spec: JointSpec, chosen: float) -> dict[str, float]:
    """Member stiffness by every method that applies, N/mm (``compare_stiffness = true``)."""
    grip = engine.effective_grip_of(spec)
    methods = {
        "frustum": lambda: engine.member_side(replace(spec, member_stiffness="frustum", members_value=None), grip)[0],
        "exponential": lambda: engine.member_side(replace(spec, member_stiffness="exponential", members_value=None),
                                                  grip)[0],
        "vdi": lambda: vdi_member_stiffness(spec),
        "fe": lambda: fe_stiffness(spec).stiffness,
    }
    # the chosen method is already computed: not run twice (an FE run costs about a second)
    out = {name: compute() for name, compute in methods.items() if name != spec.member_stiffness}
    out[spec.member_stiffness] = chosen
    return out


def service_load_check(spec: JointSpec) -> Check:
    """The job's ``require_loads``: a joint that no load reaches fails (it cannot pass fatigue unseen)."""
    return Check("service load", None, None, spec.loaded,
                 "" if spec.loaded else "no [[load]], [[group]] or own load reaches this joint (require_loads = true)")


def evaluate_joint(spec: JointSpec) -> JointResult:
    """Run every check the joint's settings call for."""
    fe_details = None
    if spec.member_stiffness == "vdi" and spec.members_value is None and spec.method != "vdi":
        spec = replace(spec, members_value=vdi_member_stiffness(spec))
    if spec.member_stiffness == "fe" and spec.members_value is None:
        fe = fe_stiffness(spec)
        fe_details = {"stiffness": fe.stiffness, "outer_diameter": fe.outer_diameter,
                      "mesh_change": fe.mesh_change, "contact_diameters": fe.contact_diameters}
        spec = replace(spec, members_value=fe.stiffness)
    result = _vdi_result(spec) if spec.method == "vdi" else engine.evaluate(spec)
    if fe_details:
        result.details["fe"] = fe_details
    if spec.compare_stiffness:
        result.details["stiffness_comparison"] = stiffness_comparison(spec, result.member_stiffness)
    result.checks.append(stripping_check(spec))
    if spec.shear > 0 and spec.method != "vdi":
        result.checks.append(slip_check(spec, result))
    if spec.require_load and not spec.loaded:
        result.checks.append(service_load_check(spec))
    result.verdict, result.governing = engine.rate(result.checks)
    result.ok = result.verdict != "fail"
    return result




# ----------------------------------------------------------------------------- model joints

#: material of recognised washers when no [materials] glob names them (DESIGN.md: steel)
WASHER_MATERIAL = "steel"


@dataclass
class ModelJoint:
    """A joint found in the model, resolved for the engine."""

    scan: Any                        # geometry.stacks.Joint
    spec: JointSpec
    findings: list[dict] = field(default_factory=list)


def _finding(severity: str, code: str, message: str) -> dict:
    return {"severity": severity, "code": code, "message": message}


def _choose_fastener(job: Job, joint, settings: dict, findings: list[dict]) -> str:
    """Designation: a [[fasteners]] rule > the modelled bolt > the size inferred from the hole > [defaults]."""
    ruled = any(fnmatch.fnmatchcase(joint.id, r["joints"]) and "fastener" in r for r in job.fastener_rules)
    modelled = joint.nominal if joint.bolt is not None else None
    if ruled:
        chosen = settings["fastener"]
        if modelled and catalog.thread(chosen).designation != catalog.thread(modelled).designation:
            findings.append(_finding("warn", "job-model-mismatch",
                                     f"job sets {chosen} but the modelled bolt {joint.bolt.part} is {modelled}; "
                                     f"the job's {chosen} is used"))
        return chosen
    if modelled:
        default = settings.get("fastener")
        if default and catalog.thread(default).designation != catalog.thread(modelled).designation:
            findings.append(_finding("info", "job-model-mismatch",
                                     f"[defaults] fastener {default} differs from the modelled bolt {modelled}; "
                                     f"the modelled bolt is used"))
        return modelled
    if joint.nominal:
        return joint.nominal
    if "fastener" in settings:
        return settings["fastener"]
    raise InputError(f"joint {joint.id}: no bolt modelled and no size could be inferred from its hole; "
                     f"set fastener in [defaults] or [[fasteners]]", where=job.where("fastener"))


def _layer_material(job: Job, part: str, role: str) -> Any:
    try:
        return material_for_part(job, part)
    except InputError:
        if role == "washer":
            return WASHER_MATERIAL
        raise


def model_joint(job: Job, joint, group_loads: dict[str, tuple[float, float, float]]) -> ModelJoint:
    """A scanned joint + the job → JointSpec (layers with materials, hardware, loads)."""
    findings = [_finding(f.severity, f.code, f.message) for f in joint.findings]
    settings = settings_for(job, joint.id)
    settings["fastener"] = _choose_fastener(job, joint, settings, findings)
    if joint.head_kind and not any(fnmatch.fnmatchcase(joint.id, r["joints"]) and "head" in r
                                   for r in job.fastener_rules):
        settings["head"] = joint.head_kind
    where = f"{job.path.name}: joint {joint.id}"
    layers = []
    for layer in joint.layers:
        fields = material_layer_fields(_layer_material(job, layer.part, layer.role),
                                       f"{job.path.name}: [materials] (part {layer.part!r})")
        layers.append(LayerSpec(thickness=layer.thickness, role=layer.role, part=layer.part, **fields))
    geometry = {
        "bearing_diameter": joint.head_bearing_diameter,
        "far_bearing_diameter": joint.nut_bearing_diameter,
        "hole_diameter": joint.hole_diameter if not joint.tapped or len(joint.layers) > 1 else None,
        "length": joint.bolt_length,
        "nut_height": joint.nut_height,
        "gaps": sum(g.size for g in joint.gaps),
    }
    geometry = {k: v for k, v in geometry.items() if v is not None}
    if joint.nut is None and joint.bolt is not None and not joint.tapped:
        findings.append(_finding("info", "nut-not-modelled", "no nut modelled: catalogue hex nut assumed"))
    lo, hi, shear = joint_load(job, joint.id, None, where)
    if joint.id in group_loads:
        g_lo, g_hi, g_shear = group_loads[joint.id]
        lo, hi, shear = lo + g_lo, hi + g_hi, shear + g_shear
    notes = tuple(f["message"] for f in findings if f["code"] == "no-hardware")
    spec = build_spec(job, joint.id, settings, layers, tapped=joint.tapped, load=(lo, hi, shear),
                      where=where, geometry=geometry, notes=notes)
    return ModelJoint(joint, spec, findings)


def stackup_check(findings: list[dict]) -> Check:
    """The scan's stack-up findings as a check: any `fail` finding fails the joint."""
    failing = [f for f in findings if f["severity"] == "fail"]
    return Check("stack-up", None, None, not failing,
                 "; ".join(f["message"] for f in failing) if failing else "")


@dataclass
class _ModelState:
    """What the worker processes inherit (by fork) to compute cone / FE stiffness."""

    joints: list[ModelJoint]
    cone_joints: dict[str, Any]
    neighbours: dict[str, list[str]] = field(default_factory=dict)
    cone_cache: Any = None           # geometry.cones.ConeCache shared by the joints of the model


def _cone_joint(mj: ModelJoint):
    from geomjoint.geometry.cones import ConeJoint, ConeLayer
    from geomjoint.mechanics.checks import effective_grip_of

    j, spec = mj.scan, mj.spec
    layers = [ConeLayer(solid=l.solid, z_start=l.start, z_end=l.end, E=s.E, part=l.part,
                        hole_diameter=l.hole_diameter) for l, s in zip(j.layers, spec.layers)]
    return ConeJoint(id=j.id, axis_point=tuple(j.point), axis_direction=tuple(j.direction), layers=layers,
                     bearing_diameter=spec.bearing_diameter, far_bearing_diameter=spec.far_bearing_diameter,
                     tapped=spec.tapped, effective_grip=effective_grip_of(spec) if spec.tapped else None,
                     cone_angle_deg=spec.cone_angle)


def cone_reach(spec: JointSpec) -> float:
    """Largest radius either pressure cone of the joint reaches, mm (at mid-grip)."""
    from geomjoint.mechanics.checks import effective_grip_of

    tan_a = math.tan(math.radians(spec.cone_angle))
    widest = max(spec.bearing_diameter, spec.far_bearing_diameter or 0.0)
    return 0.5 * widest + 0.5 * effective_grip_of(spec) * tan_a


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


def _members_from_geometry(state: _ModelState, index: int) -> tuple[JointSpec, dict]:
    """k_m by the clipped cone or the FE model; the spec carries it to the engine."""
    from geomjoint.geometry.cones import clipped_cone_stiffness

    mj = state.joints[index]
    spec = mj.spec
    details: dict = {}
    if spec.member_stiffness not in ("cone", "fe"):
        return spec, details
    cone_joint = state.cone_joints[spec.id]
    neighbours = [state.cone_joints[key] for key in state.neighbours.get(spec.id, ())]
    cone = clipped_cone_stiffness(cone_joint, neighbours, cache=state.cone_cache)
    details["cone"] = {"stiffness": cone.stiffness, "ideal_stiffness": cone.ideal_stiffness,
                       "area_fraction_mid_grip": cone.area_fraction_mid_grip,
                       "lost_to_edges": cone.lost_to_edges, "lost_to_neighbours": cone.lost_to_neighbours}
    if spec.member_stiffness == "cone":
        return replace(spec, members_value=cone.stiffness), details
    outer = None
    if cone.area_fraction_mid_grip < 1.0 - 1e-6:
        # the plate the cone really finds: the annulus of the clipped mid-grip area
        outer = (4.0 * cone.area_mid_grip / math.pi + spec.hole_diameter ** 2) ** 0.5
    fe = fe_stiffness(spec, outer)
    details["fe"] = {"stiffness": fe.stiffness, "outer_diameter": fe.outer_diameter,
                     "mesh_change": fe.mesh_change, "contact_diameters": fe.contact_diameters}
    return replace(spec, members_value=fe.stiffness), details


_STATE: _ModelState | None = None   # set in each worker process by _init_worker only


def _init_worker(state: _ModelState) -> None:
    global _STATE
    _STATE = state


def _analyse_model_joint(index: int) -> JointResult:
    return _analyse_one(_STATE, index)


def timed_out(spec: JointSpec, seconds: float) -> JointResult:
    """A joint whose analysis ran past its time limit: the closed-form numbers, and a failing
    check that says it was not analysed (a joint that was not analysed cannot pass)."""
    from geomjoint.limits import TIMEOUT_NOTE

    fallback = replace(spec, member_stiffness="frustum" if spec.method != "vdi" else "vdi", members_value=None,
                       compare_stiffness=False)
    result = _vdi_result(fallback) if fallback.method == "vdi" else engine.evaluate(fallback)
    result.spec = spec
    result.checks.append(Check("analysis", None, None, False,
                               f"{TIMEOUT_NOTE}: {spec.member_stiffness} stiffness took over {seconds:g} s; "
                               f"the numbers shown are the closed-form ones"))
    result.notes.append(TIMEOUT_NOTE)
    result.verdict, result.governing = engine.rate(result.checks)
    result.ok = False
    return result


def within_time_limit(spec: JointSpec, work: Callable[[], JointResult]) -> JointResult:
    """Run one joint's analysis under the per-joint wall-clock limit (geomjoint.limits)."""
    from geomjoint.limits import JointTimeout, current_limits, run_with_timeout

    seconds = current_limits().joint_seconds
    try:
        return run_with_timeout(work, seconds)
    except JointTimeout:
        return timed_out(spec, seconds)


def _analyse_one(state: _ModelState, index: int) -> JointResult:
    mj = state.joints[index]

    def work() -> JointResult:
        spec, details = _members_from_geometry(state, index)
        result = evaluate_joint(spec)
        result.details.update(details)
        if "cone" in details and "stiffness_comparison" in result.details:
            result.details["stiffness_comparison"]["cone"] = details["cone"]["stiffness"]
        return result

    result = within_time_limit(mj.spec, work)
    spec = result.spec
    result.findings = list(mj.findings)
    result.checks.append(stackup_check(mj.findings))
    result.verdict, result.governing = engine.rate(result.checks)
    result.ok = result.verdict != "fail"
    with_remedies(spec, result, hole_limit=spec.hole_diameter)
    return result


def with_remedies(spec: JointSpec, result: JointResult, hole_limit: float | None = None) -> JointResult:
    """Attach computed remedies to a failing or marginal result."""
    from geomjoint.remedies import find_remedies, stackup_remedies

    if result.verdict == "pass" or any(c.name == "analysis" and not c.ok for c in result.checks):
        return result  # nothing to mend, or nothing known to mend (not analysed)
    remedies = stackup_remedies(result.findings)
    bolt_failing = [c for c in result.checks if not c.ok and c.name != "stack-up"]
    if bolt_failing or (result.verdict == "marginal" and not remedies):
        remedies += find_remedies(spec, result, evaluate_joint, hole_limit=hole_limit)
    result.details["remedies"] = remedies
    return result


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
    results = [with_remedies(spec, within_time_limit(spec, lambda spec=spec: evaluate_joint(spec)))
               for spec in typed_joint_specs(job)]
    if job.model is None and scan is None:
        if job.groups:
            raise InputError("[[group]] loads need a model (joint positions)", where=job.where("group"))
        return Analysis(results, excluded=[i for i in typed_ids if is_excluded(job, i)])
    if scan is None:
        from geomjoint.geometry.scan import scan_model

        scan = scan_model(job.model)
    check_rules_match(job, [j.id for j in scan.joints] + typed_ids,
                      typed_parts + [(p.name, p.product) for p in scan.model.parts])
    excluded = [i for i in typed_ids + [j.id for j in scan.joints] if is_excluded(job, i)]
    analysed = [j for j in scan.joints if not is_excluded(job, j.id)]
    model_groups = [g for g in job.groups if "positions" not in g]
    shares = group_shares(job, analysed, model_groups) if model_groups else {}
    model_joints = [model_joint(job, j, shares) for j in analysed]
    state = _ModelState(model_joints, {})
    if any(mj.spec.member_stiffness in ("cone", "fe") for mj in model_joints):
        from geomjoint.geometry.cones import ConeCache

        state.cone_joints = {mj.spec.id: _cone_joint(mj) for mj in model_joints}
        state.neighbours = cone_neighbours(model_joints)
        state.cone_cache = ConeCache()
    total = len(model_joints)
    progress = Progress("analysed", total, quiet=quiet, started=started)
    workers = workers or os.cpu_count() or 1
    model_results: list[JointResult] = []
    if workers > 1 and total > 1 and "fork" in multiprocessing.get_all_start_methods():
        from concurrent.futures import ProcessPoolExecutor

        # fork: the workers inherit the model's shapes instead of re-reading the file
        ctx = multiprocessing.get_context("fork")
        with ProcessPoolExecutor(max_workers=min(workers, total), mp_context=ctx,
                                 initializer=_init_worker, initargs=(state,)) as pool:
            for result in pool.map(_analyse_model_joint, range(total), chunksize=max(1, total // (4 * workers))):
                model_results.append(result)
                progress.update(len(model_results))
    else:
        for i in range(total):
            model_results.append(_analyse_one(state, i))
            progress.update(i + 1)
    return Analysis(results + model_results, scan, model_joints, excluded)


def analyze(job: Job, model=None, *, workers: int = 1, quiet: bool = True) -> list[JointResult]:
    """Analyse every joint of the job (typed-in joints; model joints when the job or ``model`` gives one)."""
    return analyze_job(job, workers=workers, quiet=quiet, model=model).results
