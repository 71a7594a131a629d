"""The terminal table: one line per joint and a summary line."""
from __future__ import annotations

from geomjoint.catalog import creeps_under_preload
from geomjoint.mechanics.joint import JointResult
from geomjoint.units import MM_PER_INCH

CAUTION = ("Results are engineering estimates for review by a qualified engineer. Follow local codes, "
           "the fastener maker's data and licensed practice; test critical joints.")
#: said once per report when a preloaded joint clamps a plastic part
PLASTIC_CAUTION = ("clamp plastic parts ({materials}): a preloaded plastic part creeps, so the preload "
                   "relaxes over time and with temperature, which these closed forms do not model; "
                   "defer to the plastic maker's data (creep modulus, limiting surface pressure) and "
                   "test the joint, or use metal inserts or compression limiters.")


def plastic_caution(results: list[JointResult]) -> str | None:
    """The caution for the joints that clamp a plastic part, or None when there is none."""
    joints, materials = [], []
    for r in results:
        plastic = [l.material for l in r.spec.layers if creeps_under_preload(l.material, l.E)]
        if plastic:
            joints.append(r.id)
            materials += plastic
    if not joints:
        return None
    names = ", ".join(dict.fromkeys(materials))
    return f"{', '.join(joints)} " + PLASTIC_CAUTION.format(materials=names)


def _fmt(x: float | None, spec: str = ".2f") -> str:
    if x is None:
        return "-"
    if x == float("inf"):
        return "inf"
    return format(x, spec)


def _length_label(length_mm: float, system: str) -> str:
    """"x40" for metric, " x 1.5 in" for inch bolts (lengths as the trade writes them)."""
    if system == "inch":
        return f" x {length_mm / MM_PER_INCH:g} in"
    return f"x{length_mm:g}"


#: units of the table's two dimensional columns: (grip label, factor from mm, preload label, factor from N)
TABLE_UNITS = {"SI": ("grip mm", 1.0, "preload kN", 1e-3),
               "inch": ("grip in", 1 / MM_PER_INCH, "preload kip", 1 / 4448.2216152605)}  # 1 kip = 1000 lbf


#: what the factor columns of a joint with no service load say instead of bare dashes
NO_LOAD = "no load"


def _factor_cells(r: JointResult) -> list[str]:
    """n yield, n load, n sep, n fat; the last three say "no load" when no load reaches the joint."""
    if not r.spec.loaded:
        return [_fmt(r.factors.get("yield")), NO_LOAD, NO_LOAD, NO_LOAD]
    return [_fmt(r.factors.get(k)) for k in ("yield", "load", "separation", "fatigue")]


def _limit_margin(r: JointResult, per_mm: float, units: str) -> str:
    """The least margin of the stack at its deciding tolerance limits ("+0.45", "-0.30"; "-" without one)."""
    margin = r.stackup.least_margin if r.stackup is not None else None
    if margin is None:
        return "-"
    return format(margin * per_mm, "+.3f" if units == "inch" else "+.2f")


def result_table(results: list[JointResult], units: str = "SI", excluded: list[str] | None = None,
                 not_analysed: list = (), findings: list[dict] = ()) -> str:
    """The table; ``excluded``: joint ids the job excludes; ``not_analysed``: model joints that could
    not be resolved (analysis.UnanalysedJoint); ``findings``: those on the model as a whole (the
    reader's remarks), printed above the table."""
    grip_label, per_mm, preload_label, per_newton = TABLE_UNITS[units]
    head = ["joint", "fastener", grip_label, "C", preload_label, "n yield", "n load", "n sep", "n fat",
            f"lim margin {grip_label.split()[1]}", "verdict", "governing"]
    rows = []
    for r in results:
        f = r.spec.fastener
        size = f.designation + (_length_label(f.length, f.system) if f.length else "")
        rows.append([
            r.id, f"{size} {f.grade}", _fmt(r.grip * per_mm, ".3f" if units == "inch" else ".1f"),
            _fmt(r.joint_constant, ".3f"), _fmt(r.preload * per_newton, ".2f" if units == "inch" else ".1f"),
            *_factor_cells(r), _limit_margin(r, per_mm, units), r.verdict.upper(), r.governing,
        ])
    widths = [max(len(str(x)) for x in col) for col in zip(head, *rows)]
    lines = [f"model: {f['severity']} {f['code']}: {f['message']}" for f in findings]
    lines += ["  ".join(str(x).ljust(w) for x, w in zip(head, widths)),
              "  ".join("-" * w for w in widths)]
    lines += ["  ".join(str(x).ljust(w) for x, w in zip(row, widths)) for row in rows]
    for r in results:
        failed = [c for c in r.checks if not c.ok]
        for c in failed:
            numbers = f" {_fmt(c.value)} < {_fmt(c.required)}" if c.value is not None else ""
            lines.append(f"  {r.id}: {c.name} fails:{numbers}  {c.note}".rstrip())
        for remedy in r.remedies:
            lines.append(f"  {r.id}: remedy: {remedy.change} -> {remedy.result}")
        if r.fit_bias is not None:
            lines.append(f"  {r.id}: caution: {r.fit_bias.message}")
        if r.method_spread is not None and r.method_spread.outside:
            lines.append(f"  {r.id}: caution: {r.method_spread.message}")
    for u in not_analysed:
        lines.append(f"  {u.id}: FAIL {u.message}")
    n_fail = sum(1 for r in results if not r.ok) + len(not_analysed)
    n_marg = sum(1 for r in results if r.verdict == "marginal")
    lines.append("")
    total = len(results) + len(not_analysed)
    summary = f"{total} joints: {total - n_fail - n_marg} pass, {n_marg} marginal, {n_fail} fail"
    if not_analysed:
        summary += f" ({len(not_analysed)} not analysed)"
    n_unloaded = sum(1 for r in results if not r.spec.loaded)
    if n_unloaded:
        summary += f"; {n_unloaded} with no service load (separation and fatigue not checked)"
    if excluded:
        summary += f"; {len(excluded)} excluded by the job: {', '.join(excluded)}"
    lines.append(summary)
    plastic = plastic_caution(results)
    if plastic:
        lines.append("CAUTION (plastic parts): " + plastic)
    lines.append("CAUTION: " + CAUTION)
    return "\n".join(lines) + "\n"
