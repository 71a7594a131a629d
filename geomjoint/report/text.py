"""The terminal table: one line per joint and a summary line."""
from __future__ import annotations

from geomjoint.mechanics.joint import JointResult

CAUTION = ("Results are engineering estimates for review by a qualified engineer. Follow local codes, "
           "the fastener maker's data and licensed practice; test critical joints.")


def _fmt(x: float | None, spec: str = ".2f") -> str:
    if x is None:
        return "-"
    if x == float("inf"):
        return "inf"
    return format(x, spec)


def _length_label(length_mm: float, system: str) -> str:
    """"x40" for metric, " x 1.5 in" for inch bolts (lengths as the trade writes them)."""
    if system == "inch":
        return f" x {length_mm / 25.4:g} in"
    return f"x{length_mm:g}"


def result_table(results: list[JointResult]) -> str:
    head = ["joint", "fastener", "grip mm", "C", "preload kN", "n yield", "n load", "n sep", "n fat",
            "verdict", "governing"]
    rows = []
    for r in results:
        f = r.spec.fastener
        size = f.designation + (_length_label(f.length, f.system) if f.length else "")
        rows.append([
            r.id, f"{size} {f.grade}", _fmt(r.grip, ".1f"), _fmt(r.joint_constant, ".3f"),
            _fmt(r.preload / 1000.0, ".1f"), _fmt(r.factors.get("yield")), _fmt(r.factors.get("load")),
            _fmt(r.factors.get("separation")), _fmt(r.factors.get("fatigue")), r.verdict.upper(), r.governing,
        ])
    widths = [max(len(str(x)) for x in col) for col in zip(head, *rows)]
    lines = ["  ".join(str(x).ljust(w) for x, w in zip(head, widths)),
             "  ".join("-" * w for w in widths)]
    lines += ["  ".join(str(x).ljust(w) for x, w in zip(row, widths)) for row in rows]
    for r in results:
        failed = [c for c in r.checks if not c.ok]
        for c in failed:
            numbers = f" {_fmt(c.value)} < {_fmt(c.required)}" if c.value is not None else ""
            lines.append(f"  {r.id}: {c.name} fails:{numbers}  {c.note}".rstrip())
        for remedy in r.details.get("remedies", []):
            lines.append(f"  {r.id}: remedy: {remedy['change']} -> {remedy['result']}")
    n_fail = sum(1 for r in results if not r.ok)
    n_marg = sum(1 for r in results if r.verdict == "marginal")
    lines.append("")
    lines.append(f"{len(results)} joints: {len(results) - n_fail - n_marg} pass, {n_marg} marginal, {n_fail} fail")
    lines.append("CAUTION: " + CAUTION)
    return "\n".join(lines) + "\n"
