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
        "layers": [{"part": layer.part, "material": layer.material, "thickness": layer.thickness,
                    "role": layer.role} for layer in r.spec.layers],
        "stiffness": {"bolt": r.bolt_stiffness, "members": r.member_stiffness, "C": r.joint_constant,
                      "method": r.stiffness_method,
                      **({"comparison": r.details["stiffness_comparison"]}
                         if r.details.get("stiffness_comparison") else {})},
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


def result_document(results: list[JointResult], version: str) -> dict[str, Any]:
    return {
        "version": version,
        "units": {"force": "N", "length": "mm", "stress": "MPa"},
        "joints": [joint_document(r) for r in results],
        "summary": {
            "joints": len(results),
            "failed": sum(1 for r in results if not r.ok),
            "marginal": sum(1 for r in results if r.verdict == "marginal"),
            "passed": sum(1 for r in results if r.verdict == "pass"),
        },
    }


def dumps(doc: dict[str, Any]) -> str:
    return json.dumps(doc, indent=2, allow_nan=False) + "\n"
