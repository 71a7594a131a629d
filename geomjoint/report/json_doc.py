"""The JSON result document of DESIGN.md (check --json and results.json)."""
from __future__ import annotations

import json
import math
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


def joint_document(r: JointResult) -> dict[str, Any]:
    f = r.spec.fastener
    doc: dict[str, Any] = {
        "id": r.id,
        "ok": r.ok,
        "verdict": r.verdict,
        "governing": r.governing,
        "fastener": {"designation": f.designation, "grade": f.grade, "d": f.d, "pitch": f.pitch,
                     "stress_area": f.stress_area, "length": f.length},
        "grip": r.grip,
        "effective_grip": r.effective_grip,
        **bearing_document(r.spec),
        "service_load": r.spec.loaded,
        "layers": [{"part": layer.part, "material": layer.material, "thickness": layer.thickness,
                    "role": layer.role} for layer in r.spec.layers],
        "stiffness": {"bolt": r.bolt_stiffness, "members": r.member_stiffness, "C": r.joint_constant,
                      "method": r.stiffness_method,
                      **({"comparison": r.details["stiffness_comparison"]}
                         if r.details.get("stiffness_comparison") else {}),
                      **({"definition": stiffness_definition(r.stiffness_split)} if r.stiffness_split else {})},
        "preload": r.preload,
        "load": {"min": r.spec.load_min, "max": r.spec.load_max, "shear": r.spec.shear},
        "fatigue": {"criterion": r.spec.fatigue.criterion if r.details.get("fatigue_criterion") is None
                    else r.details["fatigue_criterion"],
                    "Se": r.Se, "sigma_a": r.sigma_a, "sigma_m": r.sigma_m, "sigma_i": r.sigma_i,
                    "n_f": _num(r.n_f)},
        "factors": {k: _num(v) for k, v in r.factors.items()},
        "checks": [{"name": c.name, "value": _num(c.value), "required": _num(c.required), "ok": c.ok,
                    "note": c.note} for c in r.checks],
        "notes": list(r.notes),
        "findings": list(r.findings),
    }
    if r.tightening:
        doc["tightening"] = {k: float(v) for k, v in r.tightening.items()}
    if r.details.get("remedies"):
        doc["remedies"] = r.details["remedies"]
    return doc


def stiffness_definition(split) -> dict[str, Any]:
    """A tapped joint's member/bolt split (mechanics.joint.StiffnessSplit), compliances in mm/N."""
    return {"member": split.member, "thread_region": split.thread_region,
            "screw_thread_compliance": split.screw_thread, "tapped_part_compliance": split.tapped_part,
            "model": split.model}


def result_document(results: list[JointResult], version: str, excluded: list[str] | None = None) -> dict[str, Any]:
    """``excluded``: the joint ids the job's ``exclude`` names (not analysed)."""
    excluded = list(excluded or [])
    return {
        "version": version,
        "units": {"force": "N", "length": "mm", "stress": "MPa"},
        "joints": [joint_document(r) for r in results],
        "excluded": excluded,
        "summary": {
            "joints": len(results),
            "failed": sum(1 for r in results if not r.ok),
            "marginal": sum(1 for r in results if r.verdict == "marginal"),
            "passed": sum(1 for r in results if r.verdict == "pass"),
            "unloaded": sum(1 for r in results if not r.spec.loaded),
            "excluded": len(excluded),
        },
    }


def dumps(doc: dict[str, Any]) -> str:
    return json.dumps(doc, indent=2, allow_nan=False) + "\n"
