"""The tapped-joint geometries of the stiffness comparison (docs/tapped_stiffness.md).

Typed-in cap screws (ISO 4762 socket heads, medium clearance holes from the catalog) into
tapped parts; each case is a job of its own so the engine resolves it exactly as a user's
job.  Used by tests/test_tapped_stiffness.py and tests/benchmarks/tapped_stiffness.py.
"""
from __future__ import annotations

from dataclasses import dataclass, replace

from geomjoint.analysis import MemberMethods
from geomjoint.job import parse_job
from geomjoint.resolve import typed_joint_specs
from geomjoint.mechanics import checks as engine
from geomjoint.mechanics import vdi
from geomjoint.mechanics.joint import JointSpec


@dataclass(frozen=True)
class Case:
    label: str
    fastener: str
    grade: str
    length: str
    cap: tuple[str, float]       # material, thickness mm
    base: tuple[str, float]      # tapped material, depth mm


#: the first three are the cases of issue 16 (M12 8.8 into 30 mm of tapped steel); the others
#: change size, engagement and the tapped material
CASES = (
    Case("M12, steel 20 on steel", "M12", "8.8", "40 mm", ("steel", 20.0), ("steel", 30.0)),
    Case("M12, steel 10 on steel", "M12", "8.8", "25 mm", ("steel", 10.0), ("steel", 30.0)),
    Case("M12, alu 15 on steel", "M12", "8.8", "35 mm", ("aluminium", 15.0), ("steel", 30.0)),
    Case("M16, steel 22 on cast iron", "M16", "10.9", "50 mm", ("steel", 22.0), ("gray cast iron", 40.0)),
    Case("M8, steel 8 on alu", "M8", "8.8", "20 mm", ("steel", 8.0), ("aluminium", 20.0)),
)


def case_spec(case: Case, **settings) -> JointSpec:
    """The JointSpec the job reader makes of the case."""
    extra = "".join(f'{k} = "{v}"\n' if isinstance(v, str) else f"{k} = {str(v).lower()}\n"
                    for k, v in settings.items())
    job = parse_job(f'''
title = "tapped stiffness case"
[[joint]]
id = "case"
fastener = "{case.fastener}"
grade = "{case.grade}"
head = "socket"
length = "{case.length}"
tapped = true
{extra}layers = [ {{ material = "{case.cap[0]}", thickness = "{case.cap[1]} mm" }},
           {{ material = "{case.base[0]}", thickness = "{case.base[1]} mm" }} ]
''')
    return typed_joint_specs(job)[0]


@dataclass(frozen=True)
class MethodValues:
    frustum: float           # k_m, N/mm
    exponential: float
    vdi: float
    tapped_frustum: float    # tapped part in series with the bolt, mm/N (Table 8-7 share)
    tapped_vdi: float        # VDI delta_M, mm/N


def method_values(case: Case) -> MethodValues:
    """k_m of the closed-form methods as the engine computes them, and the tapped-part compliances."""
    spec = case_spec(case)
    grip = engine.effective_grip_of(spec)

    def k_m(method: str) -> float:
        return engine.member_side(replace(spec, member_stiffness=method, members_value=None), grip)[0]

    return MethodValues(k_m("frustum"), k_m("exponential"), vdi.vdi_member_stiffness(spec),
                        engine.bolt_side(spec, grip).tapped_part,
                        vdi.nut_resilience(spec.fastener.d, spec.layers[-1].E, tapped=True))


def fe_result(case: Case, thread_load: str = "decaying"):
    """The FE of the joint (mechanics.fe through the pipeline's own call)."""
    spec = case_spec(case)
    if thread_load == "decaying":
        methods = MemberMethods(spec)
        methods.value("fe")
        return methods.fe
    # the same model with the uniform wall traction, for the sensitivity to the thread load
    from geomjoint.mechanics.fe import FeLayer, fe_member_stiffness
    from geomjoint.mechanics.stripping import engagement_of
    layers = [FeLayer(layer.thickness, layer.E, layer.poisson) for layer in spec.layers]
    return fe_member_stiffness(layers, spec.hole_diameter, spec.bearing_diameter, tapped=True,
                               thread_diameter=spec.fastener.d, engaged_length=engagement_of(spec)[0],
                               thread_load="uniform")
