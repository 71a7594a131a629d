"""geomjoint: find the bolted joints of a CAD assembly and check each one.

Public API (each returns plain dataclasses; CAD libraries load only when a model is used)::

    from geomjoint import load_model, find_joints, load_job, analyze
    model = load_model("bracket.step")          # or a cadquery Assembly / Workplane / Shape, a build123d object
    scan = find_joints(model)                   # joints, stack-ups, hardware, findings
    job = load_job("bracket.toml")              # or parse_job(toml_text)
    results = analyze(job, model)               # one JointResult per joint

Results are engineering estimates for review by a qualified engineer.
"""
from __future__ import annotations

__all__ = ["load_model", "find_joints", "load_job", "parse_job", "analyze"]


def load_model(source):
    """Read a STEP file (path) or take an in-memory model: a cadquery Assembly / Workplane /
    Shape, a build123d Part / Compound, or any object with an OCP shape in ``.wrapped``."""
    from geomjoint.geometry.model import load_model as _load

    return _load(source)


def find_joints(source):
    """Every bolted joint of a model (a path, a cadquery object or a loaded model): a ScanResult."""
    from geomjoint.geometry.scan import scan_model

    return scan_model(source)


def load_job(path):
    """Read and check a job file (TOML)."""
    from geomjoint.job import load_job as _load

    return _load(path)


def parse_job(source, path="job.toml"):
    """A job from TOML text or a dict."""
    from geomjoint.job import parse_job as _parse

    return _parse(source, path)


def analyze(job, model=None, *, workers: int = 1):
    """Check every joint of ``job`` (and of ``model`` when given): a list of JointResult."""
    from geomjoint.analysis import analyze as _analyze

    return _analyze(job, model, workers=workers)
