"""Job (+ model) → [JointResult]: the pipeline behind `geomjoint check`.

Per joint: JointSpec → (member stiffness from the method the job asks for) → the textbook
engine (`mechanics.checks.evaluate`) → with ``method = "vdi"`` the VDI 2230-1 chain, whose
preload window, fatigue and pressure checks then replace the textbook ones → thread
stripping → slip when the joint carries shear → verdict.
"""
from __future__ import annotations

from dataclasses import replace

from geomjoint.job import Job, typed_joint_specs
from geomjoint.mechanics import checks as engine
from geomjoint.mechanics.joint import Check, JointResult, JointSpec, PreloadSpec
from geomjoint.mechanics.stripping import stripping_check
from geomjoint.mechanics.vdi import clamp_load_for_slip, vdi_chain, vdi_checks, vdi_member_stiffness

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


def evaluate_joint(spec: JointSpec) -> JointResult:
    """Run every check the joint's settings call for."""
    if spec.member_stiffness == "vdi" and spec.members_value is None and spec.method != "vdi":
        spec = replace(spec, members_value=vdi_member_stiffness(spec))
    result = _vdi_result(spec) if spec.method == "vdi" else engine.evaluate(spec)
    result.checks.append(stripping_check(spec))
    if spec.shear > 0 and spec.method != "vdi":
        result.checks.append(slip_check(spec, result))
    result.verdict, result.governing = engine.rate(result.checks)
    result.ok = result.verdict != "fail"
    return result


def analyze(job: Job) -> list[JointResult]:
    """Analyse every joint of the job (typed-in joints; model joints when the job names a model)."""
    specs = typed_joint_specs(job)
    return [evaluate_joint(spec) for spec in specs]
