"""Job (+ model) → [JointResult]: the pipeline behind `geomjoint check`."""
from __future__ import annotations

from geomjoint.job import Job, typed_joint_specs
from geomjoint.mechanics.joint import JointResult, JointSpec


def evaluate_joint(spec: JointSpec) -> JointResult:
    """Run every check the joint's settings call for."""
    from geomjoint.mechanics.checks import evaluate

    return evaluate(spec)


def analyze(job: Job) -> list[JointResult]:
    """Analyse every joint of the job (typed-in joints; model joints when the job names a model)."""
    specs = typed_joint_specs(job)
    return [evaluate_joint(spec) for spec in specs]
