"""cadquery plugin: check the bolted joints of a model while a script builds it.

Importing this module adds two methods to ``cadquery.Assembly`` and ``cadquery.Workplane``
(cadquery's usual way of extending its classes by assignment)::

    import geomjoint.cadquery_plugin  # registers the methods
    scan = assembly.find_bolted_joints()                  # geometry.scan.ScanResult
    results = assembly.check_bolted_joints(job_toml_text)  # [JointResult]

``job`` may be a path to a job file, TOML text, or a dict; its ``model`` key, if any, is
ignored in favour of the object the method is called on.  No file round trip is needed.
"""
from __future__ import annotations

from pathlib import Path

import cadquery as cq

from geomjoint.analysis import analyze_job, warn_not_analysed
from geomjoint.geometry.scan import scan_model
from geomjoint.job import load_job, parse_job


def _job(job):
    if isinstance(job, Path) or (isinstance(job, str) and job.endswith(".toml") and "\n" not in job):
        return load_job(job)
    return parse_job(job, "cadquery-job.toml")


def find_bolted_joints(self):
    """Every bolted joint of this cadquery object, with its stack-up and findings."""
    return scan_model(self)


def check_bolted_joints(self, job, workers: int = 1):
    """Check every joint of this cadquery object with the settings of ``job``; a list of JointResult.

    A joint that cannot be analysed (no size, no standard length) is left out of the list with a
    ``geomjoint.analysis.NotAnalysedWarning`` naming it and its reason.
    """
    job = _job(job)
    job.model = None
    return warn_not_analysed(analyze_job(job, workers=workers, model=self))


def register() -> None:
    """Attach the methods (idempotent)."""
    for cls in (cq.Assembly, cq.Workplane):
        cls.find_bolted_joints = find_bolted_joints
        cls.check_bolted_joints = check_bolted_joints


register()
