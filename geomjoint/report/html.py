"""The self-contained HTML report: one file, no network at view time.

Everything the page needs is inside it: the CSS, the drawings as inline SVG (see
:mod:`geomjoint.report.plots`) and a few lines of JavaScript that sort the joints
table and open the per-joint sections.  The page opens with the summary and the joints
table; each joint's section (drawings, numbers, checks) is a closed ``<details>`` that a
click, a link to it or printing opens, so a report of hundreds of joints stays quick to
open and grows by a few kB per joint.  The numbers are the ones of results.json (:mod:`geomjoint.report.json_doc`),
converted to the units the job asked for with :func:`geomjoint.units.convert`; every
number cell of the joints table also carries the internal value (N, mm, MPa) in a
``data-value`` attribute, which is what the table sorts on.
"""
from __future__ import annotations

import html
import math
import re
from dataclasses import asdict

from geomjoint.mechanics.joint import JointResult
from geomjoint.report import lazy, plots
from geomjoint.report.plots import VERDICT_COLOURS, VERDICT_TEXT, ReportUnits, report_units
from geomjoint.report.json_doc import vdi_numbers
from geomjoint.report.text import CAUTION, plastic_caution

#: where each member-stiffness method comes from, for the numbers table
STIFFNESS_SOURCES = {
    "frustum": "frustum, Shigley 10th ed., eq. 8-20 (layered: cones meeting at mid-grip)",
    "exponential": "Wileman, Choudhury & Green (1991), Shigley 10th ed., eq. 8-23",
    "vdi": "VDI 2230-1 (2015), substitute deformation body",
    "cone": "pressure cone clipped by the part geometry (numerical)",
    "fe": "axisymmetric finite elements",
}

#: the fatigue equation of each criterion along the load line from the preload stress
FATIGUE_SOURCES = {
    "goodman": "Goodman line, Shigley 10th ed., eq. 8-38 (load line from σ_i)",
    "gerber": "Gerber parabola, Shigley 10th ed., eq. 8-39 (load line from σ_i)",
    "asme-elliptic": "ASME ellipse, Shigley 10th ed., eq. 8-40 (load line from σ_i)",
    "soderberg": "Soderberg line, Shigley 10th ed., Sec. 8-11 (load line from σ_i)",
    "vdi": "σ_AS/σ_a, VDI 2230-1 (2015) R9",
}

#: where a bearing or hole diameter of the numbers table came from (JointSpec.*_source)
DIAMETER_SOURCES = {
    "job": "set in the job (bearing_diameter / hole_diameter)",
    "model": "measured on the model (modelled head, nut or washer; the hole)",
    "catalogue": "catalogue: washer outside diameter where a washer is clamped, else the head's or nut's "
                 "bearing face (ISO 4032 / ISO 4762 / ASME B18.2); clearance hole ISO 273 / ASME B18.2.8",
}

#: what each number of the VDI 2230-1 chain is, for a reader (symbols as VDI 2230-1:2015 writes them)
VDI_LABELS = {
    "l_K": "l_K, clamp length", "d_W": "d_W, bearing diameter of the cone", "d_h": "d_h, hole diameter",
    "shank_in_clamp": "unthreaded shank inside the clamp length", "free_thread": "l_Gew, free loaded thread length",
    "delta_S": "δ_S, bolt resilience", "beta_L": "β_L, length ratio of the deformation cone", "y": "y, diameter ratio",
    "tan_phi": "tan φ, cone angle of the substitute body", "D_A": "D_A, outside diameter of the clamped parts",
    "D_A_Gr": "D_A,Gr, limiting outside diameter", "body": "substitute deformation body",
    "delta_P": "δ_P, resilience of the clamped parts", "bolt_stiffness": "bolt stiffness",
    "member_stiffness": "stiffness of the clamped parts", "Phi_K": "Φ_K, load factor (load at the head)",
    "Phi_n": "Φ_n, load factor (load introduced inside)", "f_Z": "f_Z, amount of embedding",
    "F_Z": "F_Z, preload lost to embedding", "dF_Vth": "ΔF_Vth, preload change with temperature",
    "F_KQ": "F_KQ, clamp load to carry the shear by friction", "F_K_req": "F_K,req, clamp load required",
    "F_M_min": "F_M,min, least assembly preload required", "F_M_max": "F_M,max, greatest assembly preload",
    "F_M_zul": "F_M,zul, permissible assembly preload", "alpha_A": "α_A, tightening factor",
    "D_Km": "D_Km, friction diameter of the head", "M_A": "M_A, tightening torque",
    "preload_min": "least preload after tightening", "preload_max": "greatest preload after tightening",
    "preload": "preload in service", "F_S_max": "F_S,max, greatest bolt force",
    "M_G": "M_G, thread torque", "sigma_red_B": "σ_red,B, working stress (von Mises)",
    "S_F": "S_F, safety margin against yield", "sigma_a": "σ_a, alternating stress",
    "sigma_AS": "σ_AS, endurance limit of the thread",
    "fatigue_formula": "endurance formula (ASV: rolled before heat treatment, ASG: after)",
    "S_D": "S_D, safety margin against fatigue", "p_head_assembly": "p, pressure under the head at assembly",
    "p_head_service": "p, pressure under the head in service", "p_nut_assembly": "p, pressure under the nut at assembly",
    "p_nut_service": "p, pressure under the nut in service", "p_G_head": "p_G, limiting pressure under the head",
    "p_G_nut": "p_G, limiting pressure under the nut", "S_P": "S_P, safety margin against surface pressure",
    "F_KR_min": "F_KR,min, least residual clamp load", "S_G": "S_G, safety margin against slip",
}

_VERDICTS = ("pass", "marginal", "fail")


def _e(x) -> str:
    return html.escape(str(x), quote=True)


def _fmt(x: float | None, spec: str | None = None) -> str:
    """A number for people: None is unbounded, a few significant digits otherwise."""
    if x is None:
        return "unbounded"
    x = float(x)
    if math.isinf(x):
        return "unbounded"
    if math.isnan(x):
        return "n/a"
    if spec is not None:
        return format(x, spec)
    a = abs(x)
    if a >= 1000:
        return f"{x:,.0f}".replace(",", "\u202f")   # narrow no-break space groups thousands
    if a >= 100:
        return f"{x:.1f}"
    if a >= 1:
        return f"{x:.3g}" if a < 10 else f"{x:.2f}"
    if a == 0:
        return "0"
    return f"{x:.3g}"


def _raw(x: float | None) -> str:
    """The full-precision value for a data attribute (JSON-like: null when unbounded)."""
    if x is None or not math.isfinite(float(x)):
        return ""
    return repr(float(x))


def _anchor(index: int, joint_id: str) -> str:
    return f"joint-{index}-" + re.sub(r"[^A-Za-z0-9_-]+", "_", joint_id)[:60]


def _badge(verdict: str) -> str:
    v = verdict if verdict in _VERDICTS else "fail"
    return f'<span class="verdict v-{v}">{_e(verdict.upper())}</span>'


def _size_shown(r: JointResult, u: ReportUnits) -> str:
    return plots.fastener_label(r)


def _check_value(c) -> str:
    """A check's value: None is an unbounded factor when there is a requirement, else no number."""
    if c.value is None:
        return "unbounded" if c.required is not None and c.ok else "–"
    return _fmt(c.value)


def _governing(r: JointResult) -> str:
    for c in r.checks:
        if c.name == r.governing:
            if c.value is None or c.required is None:
                return f"{r.governing} ({'ok' if c.ok else 'fails'}{': ' + c.note if c.note else ''})"
            return f"{r.governing} ({_fmt(c.value)} against {_fmt(c.required)} required)"
    return r.governing


_CSS = f"""
:root {{ --pass: {VERDICT_COLOURS['pass']}; --marginal: {VERDICT_COLOURS['marginal']};
        --fail: {VERDICT_COLOURS['fail']}; --ink: #1a1a1a; --muted: #555; --rule: #c8c8c8; }}
* {{ box-sizing: border-box; }}
body {{ font-family: system-ui, -apple-system, "Segoe UI", Roboto, "DejaVu Sans", sans-serif; color: var(--ink);
       margin: 0 auto; max-width: 1150px; padding: 1rem 1.5rem 3rem; line-height: 1.4; background: #fff; }}
h1 {{ font-size: 1.6rem; margin: .5rem 0; }}
h2 {{ font-size: 1.25rem; margin-top: 2.2rem; border-bottom: 2px solid var(--rule); padding-bottom: .2rem; }}
h3 {{ font-size: 1rem; margin: 1.2rem 0 .4rem; }}
.caution {{ border: 2px solid var(--ink); background: #fff7e0; padding: .6rem .9rem; font-weight: 600; }}
.counts {{ display: flex; gap: .8rem; flex-wrap: wrap; margin: .6rem 0; }}
.count {{ border: 1px solid var(--rule); padding: .4rem .8rem; min-width: 7rem; }}
.count b {{ font-size: 1.4rem; display: block; }}
.verdict {{ display: inline-block; padding: .05rem .45rem; border-radius: 3px; font-weight: 700;
           font-size: .85em; letter-spacing: .03em; border: 1px solid #000; }}
.v-pass {{ background: var(--pass); color: {VERDICT_TEXT['pass']}; }}
.v-marginal {{ background: var(--marginal); color: {VERDICT_TEXT['marginal']}; }}
.v-fail {{ background: var(--fail); color: {VERDICT_TEXT['fail']}; }}
table {{ border-collapse: collapse; margin: .4rem 0 1rem; font-size: .9rem; }}
th, td {{ border-bottom: 1px solid var(--rule); padding: .25rem .6rem; text-align: left; vertical-align: top; }}
td.num {{ text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }}
th button {{ font: inherit; font-weight: 700; background: none; border: 0; padding: 0; cursor: pointer;
             color: inherit; }}
th button::after {{ content: " \\2195"; color: var(--muted); }}
th[aria-sort="ascending"] button::after {{ content: " \\2191"; }}
th[aria-sort="descending"] button::after {{ content: " \\2193"; }}
.figs {{ display: flex; flex-wrap: wrap; gap: .8rem; }}
.figs figure {{ margin: 0; flex: 1 1 460px; max-width: 560px; }}
.figs svg, .overview svg {{ width: 100%; height: auto; }}
figcaption {{ font-size: .8rem; color: var(--muted); }}
.src {{ color: var(--muted); font-size: .82rem; }}
.bad {{ font-weight: 700; }}
ul.findings li {{ margin: .15rem 0; }}
footer {{ margin-top: 3rem; }}
section.joint > details > summary {{ cursor: pointer; list-style-position: outside; margin-left: 1.1rem; }}
section.joint > details > summary h2 {{ display: inline; border: 0; }}
section.joint {{ border-bottom: 2px solid var(--rule); padding: .5rem 0; }}
.toolbar button {{ font: inherit; margin-right: .5rem; }}
@media print {{ section.joint {{ break-before: page; }} th button::after {{ content: none; }} .toolbar {{ display: none; }} }}
"""

# Sorting the joints table: a click on a column header sorts by that column, numbers by
# their data-value (internal units) and text otherwise; a second click reverses.
# Per-joint sections are closed <details> (a report of hundreds of joints opens fast): a link
# to a joint opens its section, the toolbar opens or closes them all, printing opens them all;
# a section's drawings are put in place as it opens (report/lazy.py).
_JS = lazy.SCRIPT + """
function openJoint(hash) {
  var target = hash && document.getElementById(decodeURIComponent(hash.slice(1)));
  if (target && target.classList.contains("joint")) { draw(target); target.querySelector("details").open = true; }
}
function openAll(state) {
  document.querySelectorAll("section.joint > details").forEach(function (d) {
    if (state) { draw(d); }
    d.open = state;
  });
}
// a section opened by its summary (mouse or keyboard) is drawn before it shows
document.addEventListener("click", function (e) {
  var summary = e.target.closest && e.target.closest("section.joint > details > summary");
  if (summary) { draw(summary.parentNode); }
}, true);
document.addEventListener("toggle", function (e) {
  var d = e.target;
  if (d.open && d.parentNode && d.parentNode.classList && d.parentNode.classList.contains("joint")) { draw(d); }
}, true);
window.addEventListener("hashchange", function () { openJoint(location.hash); });
window.addEventListener("beforeprint", function () { openAll(true); });
openJoint(location.hash);
document.querySelectorAll("[data-open-all]").forEach(function (b) {
  b.addEventListener("click", function () { openAll(b.getAttribute("data-open-all") === "yes"); });
});
document.querySelectorAll("table.sortable").forEach(function (table) {
  table.querySelectorAll("th button").forEach(function (button, col) {
    button.addEventListener("click", function () {
      var th = button.parentNode, asc = th.getAttribute("aria-sort") !== "ascending";
      table.querySelectorAll("th").forEach(function (h) { h.removeAttribute("aria-sort"); });
      th.setAttribute("aria-sort", asc ? "ascending" : "descending");
      var body = table.tBodies[0], rows = Array.prototype.slice.call(body.rows);
      function key(row) {
        var cell = row.cells[col], v = cell.getAttribute("data-value");
        if (v !== null) { return v === "" ? Infinity : parseFloat(v); }
        return cell.textContent.trim().toLowerCase();
      }
      rows.sort(function (a, b) {
        var x = key(a), y = key(b), c = (typeof x === "number" && typeof y === "number") ? x - y
          : String(x).localeCompare(String(y));
        return asc ? c : -c;
      });
      rows.forEach(function (row) { body.appendChild(row); });
    });
  });
});
"""


def _summary(results: list[JointResult]) -> str:
    counts = {v: sum(1 for r in results if r.verdict == v) for v in _VERDICTS}
    parts = [f'<div class="count"><b id="count-joints">{len(results)}</b>joints</div>']
    for v in _VERDICTS:
        parts.append(f'<div class="count"><b id="count-{v}">{counts[v]}</b>{_badge(v)}</div>')
    items = "".join(
        f'<li><a href="#{_anchor(i, r.id)}">{_e(r.id)}</a> {_badge(r.verdict)} governing: {_e(_governing(r))}</li>'
        for i, r in enumerate(results))
    return (f'<section id="summary"><h2>Summary</h2><div class="counts">{"".join(parts)}</div>'
            f'<details><summary>Governing check of each joint</summary><ul class="governing">{items}</ul>'
            f'</details></section>')


def _joints_table(results: list[JointResult], u: ReportUnits) -> str:
    heads = ["joint", "fastener", f"grip [{u.length}]", "C", f"preload [{u.force_plot}]", "n yield", "n load",
             "n separation", "n fatigue", "verdict", "governing"]
    head_html = "".join(f'<th scope="col"><button type="button">{_e(h)}</button></th>' for h in heads)
    rows = []
    for i, r in enumerate(results):
        def num(internal: float | None, shown: float | None, spec: str | None = None) -> str:
            return f'<td class="num" data-value="{_raw(internal)}">{_e(_fmt(shown, spec))}</td>'

        cells = [
            f'<td><a href="#{_anchor(i, r.id)}">{_e(r.id)}</a></td>',
            f"<td>{_e(_size_shown(r, u))}</td>",
            num(r.grip, u.len(r.grip), ".3g" if u.system == "inch" else ".1f"),
            num(r.joint_constant, r.joint_constant, ".3f"),
            num(r.preload, u.fp(r.preload), ".2f"),
        ]
        for key in ("yield", "load", "separation", "fatigue"):
            v = r.factors.get(key)
            if key != "yield" and not r.spec.loaded:   # no service load: say so, not "unbounded"
                cells.append('<td class="num" data-value="">no load</td>')
                continue
            cells.append(num(v, v, ".2f" if v is not None and math.isfinite(v) else None))
        order = _VERDICTS.index(r.verdict) if r.verdict in _VERDICTS else len(_VERDICTS)
        cells.append(f'<td data-value="{order}">{_badge(r.verdict)}</td>')
        cells.append(f"<td>{_e(r.governing)}</td>")
        rows.append(f'<tr data-joint="{_e(r.id)}">{"".join(cells)}</tr>')
    return (f'<section id="joints"><h2>Joints</h2><p class="src">Click a column heading to sort.</p>'
            f'<table class="sortable" id="joints-table"><thead><tr>{head_html}</tr></thead>'
            f'<tbody>{"".join(rows)}</tbody></table></section>')


def _preload_source(r: JointResult, u: ReportUnits) -> str:
    if r.vdi is not None:
        return "service preload of the VDI 2230-1 (2015) chain (table below)"
    p = r.spec.preload
    if p.mode == "proof_fraction":
        return f"{p.value * 100:g}% of the proof load A_t·S_p (Shigley 10th ed., Sec. 8-9)"
    if p.mode == "force":
        return "given in the job"
    if p.mode == "torque":
        if p.nut_factor is not None:
            return (f"from the torque {_fmt(u.t(p.value))} {u.torque} with nut factor K = {p.nut_factor:g}, "
                    f"T = K·F_i·d (Shigley 10th ed., Sec. 8-8)")
        return (f"from the torque {_fmt(u.t(p.value))} {u.torque} with thread and head friction "
                f"(VDI 2230-1 (2015), tightening torque)")
    return "no preload"


_ENDURANCE_SOURCES = {
    "table": "fully corrected, Shigley 10th ed., Table 8-17",
    "marin": "Marin factors, Shigley 10th ed., ch. 6, with K_f of Table 8-16",
    "given": "given in the job",
}


def _endurance_source(r: JointResult) -> str:
    if plots.criterion_of(r) == "vdi":
        return "endurance limit σ_AS of the bolt thread, VDI 2230-1 (2015) R9"
    method = r.endurance_method
    if method in _ENDURANCE_SOURCES:
        return _ENDURANCE_SOURCES[method]
    return "Shigley 10th ed., Table 8-17, or Marin factors (ch. 6)"


def _split_rows(r: JointResult, u: ReportUnits) -> list[tuple[str, str, str, str]]:
    """A tapped joint: what k_m spans and the engaged-thread region the bolt stiffness holds."""
    split = r.stiffness_split
    if split is None:
        return []
    region = split.screw_thread + split.tapped_part
    return [("k_m spans", split.member, "–", "one definition for every method (docs/tapped_stiffness.md)"),
            (f"engaged-thread region, in k_b ({split.thread_region})", _fmt(u.k(1.0 / region)) if region > 0 else "–",
             u.stiffness, split.model)]


def _numbers(r: JointResult, u: ReportUnits) -> str:
    spec, f = r.spec, r.spec.fastener
    crit = plots.criterion_of(r)
    area_unit = f"{u.length}²"
    area = convert_area(f.stress_area, u)
    rows: list[tuple[str, str, str, str]] = [
        ("grip", _fmt(u.len(r.grip), ".4g"), u.length, "sum of the clamped layers (as the scan defines it)"),
        ("effective grip l′", _fmt(u.len(r.effective_grip), ".4g"), u.length, "Shigley 10th ed., Table 8-7"),
        *_diameter_rows(spec, u),
        ("stress area A_t", _fmt(area, ".4g"), area_unit,
         "ISO 898-1 stress area A_s" if f.system != "inch" else "ASME B1.1 tensile stress area"),
        ("proof strength S_p", _fmt(u.s(f.proof)), u.stress, f"grade {f.grade} (ISO 898-1 / SAE J429)"),
        ("yield strength S_y", _fmt(u.s(f.yield_strength)), u.stress, f"grade {f.grade}"),
        ("tensile strength S_ut", _fmt(u.s(f.tensile)), u.stress, f"grade {f.grade}"),
        ("bolt stiffness k_b", _fmt(u.k(r.bolt_stiffness)), u.stiffness,
         "shank and thread in series, Shigley 10th ed., eq. 8-17"
         + (", with the engaged-thread region" if r.stiffness_split else "")),
        ("member stiffness k_m", _fmt(u.k(r.member_stiffness)), u.stiffness,
         STIFFNESS_SOURCES.get(r.stiffness_method, r.stiffness_method)
         + (f"; reads high on tapped joints ({100 * r.fit_bias.deviation:+.0f} % against VDI 2230-1 here, "
            "see findings)"
            if r.fit_bias is not None and r.fit_bias.role == "chosen" else "")
         + (f"; {100 * _own_deviation(r):+.0f} % from the FE, beyond ±{100 * r.method_spread.limit:.0f} % "
            "(see findings)" if _own_deviation(r) is not None else "")),
        *_split_rows(r, u),
        ("joint constant C", _fmt(r.joint_constant, ".4f"), "–", "C = k_b/(k_b + k_m), Shigley 10th ed., Sec. 8-7"),
        ("preload F_i", _fmt(u.f(r.preload)), u.force, _preload_source(r, u)),
        ("external load P_min", _fmt(u.f(spec.load_min)), u.force, "job (per bolt)"),
        ("external load P_max", _fmt(u.f(spec.load_max)), u.force, "job (per bolt)"),
    ]
    if spec.shear:
        rows.append(("transverse load", _fmt(u.f(spec.shear)), u.force, "job (per bolt)"))
    t = r.tightening or {}
    if "torque" in t:
        rows.append(("tightening torque", _fmt(u.t(t["torque"])), u.torque, "for the nominal preload"))
    if "preload_min" in t:
        rows.append(("preload, least", _fmt(u.f(t["preload_min"])), u.force,
                     f"tightening scatter α_A = {spec.preload.scatter:g} (VDI 2230-1 definition)"))
    if "preload_max" in t:
        rows.append(("preload, greatest", _fmt(u.f(t["preload_max"])), u.force,
                     f"tightening scatter α_A = {spec.preload.scatter:g} (VDI 2230-1 definition)"))
    if "preload_permissible" in t:
        rows.append(("permissible assembly preload", _fmt(u.f(t["preload_permissible"])), u.force,
                     "VDI 2230-1 (2015)"))
    rows += [
        ("endurance strength S_e", _fmt(u.s(r.Se)), u.stress,
         _endurance_source(r)),
        ("preload stress σ_i", _fmt(u.s(r.sigma_i)), u.stress, "F_i/A_t"),
        ("alternating stress σ_a", _fmt(u.s(r.sigma_a)), u.stress,
         "C(P_max − P_min)/(2A_t), Shigley 10th ed., eq. 8-35"),
        ("mean stress σ_m", _fmt(u.s(r.sigma_m)), u.stress,
         "σ_i + C(P_max + P_min)/(2A_t), Shigley 10th ed., eq. 8-36"),
        ("yield factor", _fmt(r.factors.get("yield"), ".3f" if r.factors.get("yield") else None), "–",
         "proof load / bolt force, Shigley 10th ed., eq. 8-28 form"),
        ("load factor", _fmt(r.factors.get("load"), ".3f" if r.factors.get("load") else None), "–",
         "(S_p·A_t − F_i)/(C·P), Shigley 10th ed., eq. 8-29"),
        ("separation factor", _fmt(r.factors.get("separation"), ".3f" if r.factors.get("separation") else None), "–",
         "F_i/((1 − C)·P), Shigley 10th ed., eq. 8-30"),
        ("fatigue factor n_f", _fmt(r.n_f, ".3f" if r.n_f is not None and math.isfinite(r.n_f) else None), "–",
         FATIGUE_SOURCES.get(crit, crit)),
    ]
    body = "".join(f'<tr><th scope="row">{_e(q)}</th><td class="num">{_e(v)}</td><td>{_e(un)}</td>'
                   f'<td class="src">{_e(src)}</td></tr>'
                   for q, v, un, src in rows)
    return ('<table class="numbers"><thead><tr><th>quantity</th><th>value</th><th>unit</th><th>source</th></tr>'
            f"</thead><tbody>{body}</tbody></table>")


def _diameter_rows(spec, u: ReportUnits) -> list[tuple[str, str, str, str]]:
    """The bearing diameter at each face and the hole diameter, with where each came from."""
    rows = [("bearing diameter, head face", _fmt(u.len(spec.bearing_diameter), ".4g"), u.length,
             DIAMETER_SOURCES.get(spec.bearing_source, spec.bearing_source))]
    if not spec.tapped:
        far = spec.far_bearing_diameter or spec.bearing_diameter
        source = spec.far_bearing_source or spec.bearing_source
        rows.append(("bearing diameter, nut face", _fmt(u.len(far), ".4g"), u.length,
                     DIAMETER_SOURCES.get(source, source)))
    rows.append(("hole diameter", _fmt(u.len(spec.hole_diameter), ".4g"), u.length,
                 DIAMETER_SOURCES.get(spec.hole_source, spec.hole_source)))
    return rows


def convert_area(area_mm2: float, u: ReportUnits) -> float:
    """An area, mm² to the report's length unit squared."""
    return area_mm2 * u.len(1.0) ** 2


def _checks(r: JointResult) -> str:
    body = []
    for c in r.checks:
        state = "ok" if c.ok else "FAILS"
        body.append(f'<tr><th scope="row">{_e(c.name)}</th><td class="num">{_e(_check_value(c))}</td>'
                    f'<td class="num">{_e("–" if c.required is None else _fmt(c.required))}</td>'
                    f'<td class="{"" if c.ok else "bad"}">{state}</td>'
                    f'<td class="src">{_e(c.note)}</td></tr>')
    return ('<table class="checks"><thead><tr><th>check</th><th>value</th><th>required</th><th>state</th>'
            f'<th>note</th></tr></thead><tbody>{"".join(body)}</tbody></table>')


def _vdi(r: JointResult, u: ReportUnits) -> str:
    if r.vdi is None:
        return ""
    vdi = vdi_numbers(r.vdi)   # the same numbers as results.json
    rows = []
    for key, value in vdi.items():
        if value is None:
            shown = "–"
        elif isinstance(value, (int, float)) and not isinstance(value, bool):
            shown = _fmt(value)
        else:
            shown = str(value)
        rows.append(f'<tr><th scope="row">{_e(VDI_LABELS.get(key, key))}</th><td class="num">{_e(shown)}</td></tr>')
    return ('<details class="vdi"><summary><b>VDI 2230-1 (2015) chain</b> (internal units: N, mm, MPa, N·mm)'
            f'</summary><table class="vdi"><tbody>{"".join(rows)}</tbody></table></details>')


#: the geometry-based member stiffness numbers of the result (as results.json has them)
_GEOMETRY_ROWS = {
    "cone": ("Pressure cone clipped by the parts", (
        ("stiffness", "stiffness of the clipped cone", "k"),
        ("ideal_stiffness", "stiffness of the unclipped cone", "k"),
        ("area_fraction_mid_grip", "area kept at mid-grip (fraction of the ideal)", "1"),
        ("lost_to_edges", "area lost to part edges (fraction)", "1"),
        ("lost_to_neighbours", "area shared with neighbouring joints (fraction)", "1"),
    )),
    "fe": ("Finite-element member model", (
        ("stiffness", "member stiffness", "k"),
        ("outer_diameter", "outer diameter of the modelled members", "len"),
        ("mesh_change", "change on mesh refinement (fraction)", "1"),
    )),
    "stiffness_comparison": ("Member stiffness by every method (compare_stiffness)", (
        ("frustum", "frustum (Shigley eq. 8-20)", "k"),
        ("exponential", "exponential fit (Wileman et al. 1991)", "k"),
        ("vdi", "VDI 2230-1 substitute deformation body", "k"),
        ("cone", "pressure cone clipped by the parts", "k"),
        ("fe", "axisymmetric finite elements", "k"),
    )),
}


#: how each FE layer's outline reads in the report (mechanics.joint.OUTLINES)
OUTLINE_WORDS = {"clipped-cone": "its part's outline inside the cone", "job": "outside_diameter of the job",
                 "converged": "wide plate, widened until k_m stops changing"}


def _geometry(r: JointResult, u: ReportUnits) -> str:
    out = []
    for key, (heading, rows) in _GEOMETRY_ROWS.items():
        record = getattr(r, "comparison" if key == "stiffness_comparison" else key)
        if record is None:
            continue
        data = record.values() if key == "stiffness_comparison" else asdict(record)
        body = []
        for name, label, kind in rows:
            v = data.get(name)
            if not isinstance(v, (int, float)) or isinstance(v, bool):
                continue
            if kind == "k":
                shown, unit = _fmt(u.k(v)), u.stiffness
            elif kind == "len":
                shown, unit = _fmt(u.len(v)), u.length
            else:
                shown, unit = _fmt(v, ".3f"), "–"
            body.append(f'<tr><th scope="row">{_e(label)}</th><td class="num">{_e(shown)}</td><td>{_e(unit)}</td></tr>')
        if key == "fe":
            names = [layer.part or f"layer {i + 1}" for i, layer in enumerate(r.spec.layers)]
            outlines = record.layer_outlines or (record.outline,) * len(record.layer_outer_diameters)
            for name, diameter, outline in zip(names, record.layer_outer_diameters, outlines):
                body.append(f'<tr><th scope="row">outer diameter of {_e(name)} ({_e(OUTLINE_WORDS[outline])})</th>'
                            f'<td class="num">{_e(_fmt(u.len(diameter)))}</td><td>{_e(u.length)}</td></tr>')
        if key == "stiffness_comparison" and r.fit_bias is not None:
            b = r.fit_bias
            body.append(f'<tr class="caution"><th scope="row">{_e(b.method)} fit against {_e(b.reference)} '
                        f'(known bias on tapped joints)</th><td class="num">{100 * b.deviation:+.0f}</td>'
                        f'<td>% (documented {100 * b.documented_low:+.0f} % to {100 * b.documented_high:+.0f} % '
                        f'against the FE)</td></tr>')
        if body:
            out.append(f'<h3>{_e(heading)}</h3><table class="{key}"><tbody>{"".join(body)}</tbody></table>')
    return "".join(out)


def _own_deviation(r: JointResult) -> float | None:
    """The joint's own k_m against the FE, when the method spread names it (else None)."""
    spread = r.method_spread
    if spread is None or spread.chosen not in spread.outside:
        return None
    return next(row.deviation for row in spread.methods if row.method == spread.chosen)


def _method_spread(r: JointResult) -> str:
    """The tapped joint's methods beyond ±10 % of its reference: one row each, with the reason."""
    spread = r.method_spread
    if spread is None or not spread.outside:
        return ""
    centre = "the FE" if spread.reference == "fe" else f"{spread.reference} (the reference here)"
    rows = "".join(f'<tr class="caution"><th scope="row">{_e(row.method)}'
                   f'{" (this joint’s k_m)" if row.method == spread.chosen else ""}</th>'
                   f'<td class="num">{100 * row.deviation:+.1f}</td><td>%</td><td>{_e(row.reason)}</td></tr>'
                   for row in spread.methods if row.outside)
    rows += (f'<tr><th scope="row">published spread of member-stiffness models</th>'
             f'<td class="num">{100 * spread.published_against_fe:.1f} / {100 * spread.published_against_experiments:.1f}</td>'
             f'<td>%</td><td>against FE / against experiments; {_e(spread.published_source)}; none published for '
             'tapped joints</td></tr>')
    return (f'<h3>Member-stiffness methods beyond ±{100 * spread.limit:.0f} % of {_e(centre)} (tapped joint)</h3>'
            f'<table class="method_spread"><tbody>{rows}</tbody></table>')


def _findings(r: JointResult) -> str:
    parts = []
    if r.findings:
        items = "".join(f'<li><b>{_e(str(x.get("severity", "info")).upper())}</b> '
                        f'{_e(x.get("code", ""))}: {_e(x.get("message", ""))}</li>' for x in r.findings)
        parts.append(f'<h3>Findings</h3><ul class="findings">{items}</ul>')
    if r.remedies:
        items = "".join(f'<li>{_e(x.change)} → {_e(x.result)}</li>' for x in r.remedies)
        parts.append(f'<h3>Remedies</h3><ul class="remedies">{items}</ul>')
    if r.notes:
        items = "".join(f"<li>{_e(n)}</li>" for n in r.notes)
        parts.append(f'<h3>Notes</h3><ul class="notes">{items}</ul>')
    return "".join(parts)


def _not_analysed(joints: list) -> str:
    """The model joints that could not be analysed: each fails, with its reason and findings."""
    if not joints:
        return ""
    items = []
    for j in joints:
        found = "".join(f'<li><b>{_e(str(x.get("severity", "info")).upper())}</b> {_e(x.get("code", ""))}: '
                        f'{_e(x.get("message", ""))}</li>' for x in j.findings)
        items.append(f'<li data-joint="{_e(j.id)}">{_badge("fail")} <b>{_e(j.id)}</b>: {_e(j.message)}'
                     f'<ul class="findings">{found}</ul></li>')
    return f'<section id="not-analysed"><h2>Joints not analysed</h2><ul>{"".join(items)}</ul></section>'


def _labelled(svg: str, label: str) -> str:
    """The SVG with an accessible name (screen readers announce it as one picture)."""
    return svg.replace("<svg ", f'<svg role="img" aria-label="{_e(label)}" ', 1)


#: what each drawing shows: its short accessible name and its caption
_FIGURES = (
    ("section drawing", "Section through the axis, to scale: layers, bolt, washers, nut or tapped thread, "
                        "and the two pressure cones (dashed)."),
    ("joint diagram", "Joint diagram: bolt (solid) and members (dashed); the bar is P_max split into the bolt "
                      "rise C·P and the member relief."),
    ("fatigue diagram", "Fatigue diagram of the joint's criterion with the load line from the preload stress "
                        "and the operating point."),
)


#: a share out of limits below this percentage is shown as "< 0.0001" (one in a million joints)
SHARE_SHOWN = 1e-4

#: the stack-up table's rows: quantity of mechanics.stackup.StackupResult -> what the row says
_STACKUP_ROWS = (("grip", "grip"), ("clamp_length", "clamp length"), ("protrusion", "protrusion past the nut"),
                 ("engagement", "thread engagement"), ("bottom_clearance", "clearance to the hole bottom"),
                 ("thread_in_grip", "thread in the grip (grip - shank)"))


def _stackup(i: int, r: JointResult, u: ReportUnits) -> str:
    """The stack at its tolerance limits: the chart, the bands (nominal, worst case, RSS), the
    preload range and the hole pattern's position tolerance."""
    su = r.stackup
    if su is None:
        return ""
    L = u.len
    bands = [(label, getattr(su, key)) for key, label in _STACKUP_ROWS if getattr(su, key) is not None]
    bands += [(f"shank past the shear plane {a} / {b}", p.band) for p in su.shear_planes for a, b in [p.between]]
    rows = []
    for label, b in bands:
        cells = "".join(f'<td class="num">{_e(_fmt(L(v)))}</td>' for v in
                        (b.nominal, b.worst_min, b.worst_max, b.stat_min, b.stat_max))
        need = "–" if b.required is None else _fmt(L(b.required))
        share = ("–" if b.share_out is None else f"< {SHARE_SHOWN:g}" if 100 * b.share_out < SHARE_SHOWN
                 else f"{100 * b.share_out:.3g}")
        rows.append(f'<tr><th scope="row">{_e(label)}</th>{cells}<td class="num">{_e(need)}</td>'
                    f'<td class="num">{_e(share)}</td></tr>')
    table = ('<table class="stackup"><thead><tr><th>quantity</th><th>nominal</th><th>worst min</th>'
             '<th>worst max</th><th>RSS min</th><th>RSS max</th><th>least allowed</th><th>% below</th></tr>'
             f'</thead><tbody>{"".join(rows)}</tbody></table>')
    extra = []
    if su.preload is not None:
        p = su.preload
        extra.append(f"preload after embedding (f_Z = {L(p.f_Z):.3g} {u.length}): {_fmt(u.f(p.low))} to "
                     f"{_fmt(u.f(p.high))} {u.force} over the clamp length's limits (nominal {_fmt(u.f(p.preload[0]))})")
    if su.position is not None:
        p = su.position
        extra.append(f"position ({p.case} fastener{', projected zone' if p.projected else ''}): the holes afford "
                     f"{_fmt(L(p.affordable))} {u.length}" + ("" if p.needed is None else
                                                            f", the job's tolerances take {_fmt(L(p.needed))}"))
    svg = plots.stackup_svg(r, u.system, prefix=f"j{i}t-")
    figure = (f'<figure>{_labelled(svg, f"stack-up chart of {r.id}")}<figcaption>Each element of the stack at its '
              f'place with its own tolerance band; their sum with its worst-case and RSS bands against the bolt; '
              f'lengths in {_e(u.length)}. Decided by the {_e(su.method)} limits.</figcaption></figure>') if svg else ""
    notes = "".join(f"<p class=\"src\">{_e(x)}</p>" for x in extra)
    return f'<h3>Stack-up at the tolerance limits</h3><div class="figs">{figure}</div>{table}{notes}'


def _joint_section(i: int, r: JointResult, u: ReportUnits) -> str:
    svgs = (plots.section_svg(r, u.system, prefix=f"j{i}s-"), plots.joint_diagram_svg(r, u.system, prefix=f"j{i}d-"),
            plots.fatigue_diagram_svg(r, u.system, prefix=f"j{i}f-"))
    fig_html = "".join(f'<figure>{_labelled(svg, f"{name} of {r.id}")}<figcaption>{_e(cap)}</figcaption></figure>'
                       for svg, (name, cap) in zip(svgs, _FIGURES))
    return (f'<section class="joint" id="{_anchor(i, r.id)}" data-joint="{_e(r.id)}"><details>'
            f'<summary><h2>{_e(r.id)} — {_e(_size_shown(r, u))} {_badge(r.verdict)}</h2></summary>'
            f'<p>Verdict: <b>{_e(r.verdict)}</b>; governing check: {_e(_governing(r))}.</p>'
            f'<div class="figs">{fig_html}</div>'
            f"<h3>Numbers</h3>{_numbers(r, u)}<h3>Checks</h3>{_checks(r)}{_stackup(i, r, u)}"
            f"{_geometry(r, u)}{_method_spread(r)}{_vdi(r, u)}{_findings(r)}</details></section>")


def _model_findings(findings: list[dict]) -> str:
    """The findings on the model as a whole (the reader's remarks on the file)."""
    if not findings:
        return ""
    items = "".join(f'<li><b>{_e(str(f.get("severity", "info")).upper())}</b> {_e(f.get("code", ""))}: '
                    f'{_e(f.get("message", ""))}</li>' for f in findings)
    return f'<section id="model-findings"><h2>On the model file</h2><ul class="findings">{items}</ul></section>'


def html_report(results: list[JointResult], *, title: str, units: str = "SI",
                overview_svg: str | None = None, not_analysed: list = (), findings: list[dict] = ()) -> str:
    """The whole report as one self-contained HTML document.

    Parameters
    ----------
    results : list of JointResult
        The engine's results, in report order.
    title : str
        Page title and heading.
    units : str
        "SI" (N, mm, MPa; kN in the table) or "inch" (lbf, in, kpsi).
    overview_svg : str or None
        An SVG picture of the model with the joints numbered (inserted as given;
        it must not reference outside resources).
    not_analysed : list of analysis.UnanalysedJoint
        Model joints that could not be resolved: listed as failing, with their reason.
    findings : list of dict
        Findings on the model as a whole (severity, code, message: the reader's remarks on the
        file), listed before the joints.

    Returns
    -------
    str
        The HTML text (UTF-8 when written).
    """
    u = report_units(units)
    caution = f'<p class="caution" role="note"><strong>Caution.</strong> {_e(CAUTION)}</p>'
    plastic = plastic_caution(results)
    if plastic:
        caution += (f'<p class="caution plastic" role="note"><strong>Caution, plastic parts.</strong> '
                    f'{_e(plastic)}</p>')
    overview = ""
    if overview_svg:
        svg = re.sub(r"<\?xml[^>]*\?>\s*", "", overview_svg)
        svg = re.sub(r"<!DOCTYPE[^>]*>\s*", "", svg)
        overview = (f'<section id="overview" class="overview"><h2>Model overview</h2><figure>{svg}'
                    f'<figcaption>Joints numbered and coloured by verdict.</figcaption></figure></section>')
    unit_note = (f'<p class="src">Units: forces {u.force}, lengths {u.length}, stresses {u.stress}, '
                 f'stiffness {u.stiffness}.</p>')
    # the drawings leave the sections: sent once as templates and numbers, drawn on opening
    drawings = lazy.Drawings()
    sections = lazy.compact("".join(_joint_section(i, r, u) for i, r in enumerate(results)), drawings)
    toolbar = ('<h2 id="details">Each joint</h2><p class="toolbar">Open a joint for its drawings, numbers and '
               'checks: <button type="button" data-open-all="yes">open all</button>'
               '<button type="button" data-open-all="no">close all</button></p>'
               '<noscript><p class="src">The drawings are drawn by the page\'s script: with scripts off the '
               'sections show their numbers and checks only (results.json has every number).</p></noscript>'
               ) if results else ""
    return ("<!DOCTYPE html>\n"
            f'<html lang="en"><head><meta charset="utf-8">'
            f'<meta name="viewport" content="width=device-width, initial-scale=1">'
            f"<title>{_e(title)}</title><style>{_CSS}</style></head>\n<body>"
            f"<header><h1>{_e(title)}</h1>{caution}{unit_note}</header>\n<main>"
            f"{_model_findings(list(findings))}{_summary(results)}{_joints_table(results, u)}{overview}"
            f"{_not_analysed(not_analysed)}{toolbar}{sections}"
            "</main>\n"
            f"<footer>{caution}</footer>\n{lazy.payload(drawings)}\n<script>{_JS}</script>\n</body></html>\n")
