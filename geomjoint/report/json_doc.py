"""The JSON result document of DESIGN.md (check --json and results.json)."""
from __future__ import annotations

import json
import math
from dataclasses import asdict, fields
from typing import Any

from geomjoint.mechanics.joint import JointResult


def _num(x: float | None) -> float | None:
    """JSON has no infinity: an unbounded factor is null."""
    if x is None:
        return None
    x = float(x)
    return x if math.isfinite(x) else None


def bearing_document(spec) -> dict[str, Any]:
    """The bearing diameters used at each face and the hole diameter, each with its source
    ("job", "model" or "catalogue"); the nut face is null for a tapped joint."""
    nut = None
    if not spec.tapped:
        nut = {"diameter": spec.far_bearing_diameter or spec.bearing_diameter,
               "source": spec.far_bearing_source or spec.bearing_source}
    return {"bearing": {"head": {"diameter": spec.bearing_diameter, "source": spec.bearing_source}, "nut": nut},
            "hole": {"diameter": spec.hole_diameter, "source": spec.hole_source}}


def _plain(value: Any) -> Any:
    """A record's value as JSON: tuples as lists, non-finite numbers as null."""
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, float):
        return _num(value)
    return value


def vdi_numbers(chain) -> dict[str, Any]:
    """The scalar numbers of a VDI 2230-1 chain (mechanics.vdi.VdiResult), as the reports show them."""
    out = {}
    for f in fields(chain):
        v = getattr(chain, f.name)
        if v is None or isinstance(v, (int, float, str)):
            out[f.name] = _plain(v)
    return out


def _stiffness(r: JointResult) -> dict[str, Any]:
    doc: dict[str, Any] = {"bolt": r.bolt_stiffness, "members": r.member_stiffness, "C": r.joint_constant,
                           "method": r.stiffness_method}
    if r.comparison is not None and r.comparison.values():
        doc["comparison"] = r.comparison.values()
    if r.cone is not None:
        doc["cone"] = _plain(asdict(r.cone))
    if r.fe is not None:
        doc["fe"] = _plain(asdict(r.fe))
    if r.stiffness_split is not None:
        doc["definition"] = stiffness_definition(r.stiffness_split)
    if r.fit_bias is not None:
        doc["fit_bias"] = _plain(asdict(r.fit_bias))
    if r.method_spread is not None:
        doc["method_spread"] = _plain(asdict(r.method_spread))
    return doc


def _fatigue(r: JointResult) -> dict[str, Any]:
    doc: dict[str, Any] = {"criterion": r.criterion, "Se": r.Se, "sigma_a": r.sigma_a, "sigma_m": r.sigma_m,
                           "sigma_i": r.sigma_i, "n_f": _num(r.n_f)}
    if r.endurance_method is not None and r.vdi is None:
        doc["endurance_method"] = r.endurance_method
        doc["endurance_factors"] = _plain(dict(r.endurance_factors))
    return doc


def joint_document(r: JointResult) -> dict[str, Any]:
    f = r.spec.fastener
    doc: dict[str, Any] = {
        "id": r.id,
        "ok": r.ok,
        "verdict": r.verdict,
        "governing": r.governing,
        "fastener": {"designation": f.designation, "grade": f.grade, "d": f.d, "pitch": f.pitch,
                     "stress_area": f.stress_area, "length": f.length, "head": f.head,
                     **({"thread_length": r.thread_length} if r.thread_length is not None else {})},
        "grip": r.grip,
        "effective_grip": r.effective_grip,
        **bearing_document(r.spec),
        "service_load": r.spec.loaded,
        "layers": [{"part": layer.part, "material": layer.material, "thickness": layer.thickness,
                    "role": layer.role} for layer in r.spec.layers],
        "stiffness": _stiffness(r),
        "preload": r.preload,
        "load": {"min": r.spec.load_min, "max": r.spec.load_max, "shear": r.spec.shear},
        "fatigue": _fatigue(r),
        "factors": {k: _num(v) for k, v in r.factors.items()},
        "checks": [{"name": c.name, "value": _num(c.value), "required": _num(c.required), "ok": c.ok,
                    "note": c.note} for c in r.checks],
        "notes": list(r.notes),
        "findings": list(r.findings),
    }
    if r.tightening:
        doc["tightening"] = {k: float(v) for k, v in r.tightening.items()}
    if r.vdi is not None:
        doc["vdi"] = vdi_numbers(r.vdi)
    if r.remedies:
        doc["remedies"] = [asdict(m) for m in r.remedies]
    if r.stackup is not None:
        doc["stackup"] = stackup_document(r.stackup)
    return doc


def _band(b) -> dict[str, Any]:
    """One quantity of the stack (mechanics.stackup.Band), mm: the contract's five limits, and
    its requirement and share out of limits where it is judged."""
    doc = {"nominal": b.nominal, "worst_min": b.worst_min, "worst_max": b.worst_max,
           "stat_min": b.stat_min, "stat_max": b.stat_max}
    if b.required is not None:
        doc["required"] = b.required
        doc["share_out"] = _num(b.share_out)
    return {k: _plain(v) for k, v in doc.items()}


def stackup_document(su) -> dict[str, Any]:
    """The stack at its tolerance limits (mechanics.stackup.StackupResult), mm and N."""
    doc: dict[str, Any] = {"method": su.method, "grip": _band(su.grip), "clamp_length": _band(su.clamp_length)}
    for name in ("protrusion", "engagement", "bottom_clearance", "thread_in_grip"):
        if getattr(su, name) is not None:
            doc[name] = _band(getattr(su, name))
    doc["shear_planes"] = [{"between": list(p.between), **_band(p.band)} for p in su.shear_planes]
    governing = su.governing()
    doc["governing"] = governing.name if governing is not None else None
    doc["least_margin"] = _num(su.least_margin)
    doc["fails_at_limit_only"] = su.fails_at_limit_only
    if su.preload is not None:
        keys = ("nominal", "thinnest_clamp", "thickest_clamp")
        doc["preload"] = {"f_Z": su.preload.f_Z, "embedding_loss": dict(zip(keys, su.preload.loss)),
                          "preload": dict(zip(keys, su.preload.preload))}
    if su.position is not None:
        doc["position"] = _plain(asdict(su.position))
    doc["elements"] = [{"name": e.name, "nominal": e.nominal, "lower": e.lower, "upper": e.upper,
                        "sign": e.sign, "source": e.source} for e in su.elements]
    return doc


def stiffness_definition(split) -> dict[str, Any]:
    """A tapped joint's member/bolt split (mechanics.joint.StiffnessSplit), compliances in mm/N."""
    return {"member": split.member, "thread_region": split.thread_region,
            "screw_thread_compliance": split.screw_thread, "tapped_part_compliance": split.tapped_part,
            "model": split.model}


def result_document(results: list[JointResult], version: str, excluded: list[str] | None = None,
                    not_analysed: list = (), findings: list[dict] = ()) -> dict[str, Any]:
    """The whole document. ``excluded``: the joint ids the job's ``exclude`` names (not analysed);
    ``not_analysed``: model joints that could not be resolved (analysis.UnanalysedJoint), listed
    with their reason and counted as failed; ``findings``: the findings on the model as a whole
    (the reader's remarks on the file), as the scan document gives them."""
    excluded = list(excluded or [])
    doc = {
        "version": version,
        "units": {"force": "N", "length": "mm", "stress": "MPa"},
        "findings": [dict(f) for f in findings],
        "joints": [joint_document(r) for r in results],
        "excluded": excluded,
        "summary": {
            "joints": len(results) + len(not_analysed),
            "failed": sum(1 for r in results if not r.ok) + len(not_analysed),
            "marginal": sum(1 for r in results if r.verdict == "marginal"),
            "passed": sum(1 for r in results if r.verdict == "pass"),
            "unloaded": sum(1 for r in results if not r.spec.loaded),
            "excluded": len(excluded),
        },
    }
    if not_analysed:
        doc["summary"]["not_analysed"] = len(not_analysed)
        doc["not_analysed"] = [{"id": u.id, "ok": False, "verdict": "fail", "reason": u.reason,
                                "message": u.message, "findings": list(u.findings)} for u in not_analysed]
    return doc


def dumps(doc: dict[str, Any]) -> str:
    return json.dumps(doc, indent=2, allow_nan=False) + "\n"
