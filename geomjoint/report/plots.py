"""Drawings for the HTML report, as inline SVG strings made with matplotlib.

One function per drawing: :func:`section_svg` (the stack to scale, with bolt, washers,
nut or tapped thread and the two pressure cones), :func:`joint_diagram_svg` (the
force-elongation lines of bolt and members) and :func:`fatigue_diagram_svg` (the
criterion curve with the load line and the operating point).

matplotlib's object API is used (``Figure`` without pyplot), so no global backend
state is touched and nothing is ever shown on screen.  Every SVG is stripped of its
XML prologue, DOCTYPE and metadata so that it can be pasted into an HTML page, and
its element ids get a per-figure prefix so several figures on one page never clash.
"""
from __future__ import annotations

import functools
import io
import itertools
import math
import re
from dataclasses import dataclass

import matplotlib

matplotlib.use("Agg")  # never a window: reports are written on servers and in CI

from matplotlib.figure import Figure  # noqa: E402
from matplotlib.patches import Polygon, Rectangle  # noqa: E402

from geomjoint.mechanics.joint import JointResult  # noqa: E402
from geomjoint.report.palette import VERDICT_COLOURS, VERDICT_TEXT  # noqa: E402,F401 (re-exported for html.py)
from geomjoint.units import MM_PER_INCH, convert  # noqa: E402

#: figure size of every drawing, inches (small enough for a page with many joints)
FIGSIZE = (5.0, 3.5)

# Verdict colours: one palette for every output (geomjoint.report.palette), chosen to differ
# in lightness as well as hue; the verdict is always written out as text too.

# Line colours of the diagrams (same colour-blind-safe family as the verdict palette).
BOLT_COLOUR = VERDICT_COLOURS["pass"]
MEMBER_COLOUR = VERDICT_COLOURS["fail"]
LOAD_COLOUR = "#2b2b2b"
WINDOW_COLOUR = VERDICT_COLOURS["marginal"]
CONE_COLOUR = VERDICT_COLOURS["pass"]

# Fill colours of the layers in the section drawing, by material family; light tones of
# different lightness so adjacent layers of different materials stand apart.
_MATERIAL_FILLS = (
    ("steel", "#c9ced6"),
    ("stainless", "#dfe3e8"),
    ("cast", "#a9b0ba"),
    ("iron", "#a9b0ba"),
    ("alumin", "#e8dcc0"),
    ("titan", "#d5c9e0"),
    ("copper", "#e6c2a8"),
    ("brass", "#eedc9a"),
    ("bronze", "#e0c48c"),
)
_OTHER_FILL = "#e9e9e9"
_WASHER_FILL = "#8e96a3"
_HARDWARE_FILL = "#5c6470"

# Drawing proportions of hardware the JointSpec does not dimension (head height and
# width, nut height and width).  They only shape the picture, never a result:
# hex head k ~ 0.65 d and s ~ 1.5 d, socket head k ~ d, nut m ~ 0.85 d (common practice
# approximations of ISO 4014/4762/4032 proportions).
HEX_HEAD_HEIGHT = 0.65
HEX_HEAD_WIDTH = 1.5
SOCKET_HEAD_HEIGHT = 1.0
SOCKET_HEAD_WIDTH = 1.5
NUT_HEIGHT = 0.85
NUT_WIDTH = 1.5


@dataclass(frozen=True)
class ReportUnits:
    """The units a report shows: internal values are converted with :func:`geomjoint.units.convert`."""

    system: str         # "SI" | "inch"
    length: str         # mm | in
    force: str          # N | lbf (tables)
    force_plot: str     # kN | kip (diagram axes)
    stress: str         # MPa | kpsi
    stiffness: str      # N/mm | lbf/in
    torque: str         # N*m | lbf*ft

    def factor(self, kind: str) -> float:
        """Multiplier from the internal unit of ``kind`` to this report's unit (all are linear)."""
        return _factor(kind, getattr(self, _UNIT_FIELD[kind]))

    def len(self, x: float) -> float:
        return x * self.factor("length")

    def f(self, x: float) -> float:
        return x * self.factor("force")

    def fp(self, x: float) -> float:
        return x * _factor("force", self.force_plot)

    def s(self, x: float) -> float:
        return x * self.factor("stress")

    def k(self, x: float) -> float:
        return x * self.factor("stiffness")

    def t(self, x: float) -> float:
        return x * self.factor("torque")


_UNIT_FIELD = {"length": "length", "force": "force", "stress": "stress", "stiffness": "stiffness",
               "torque": "torque"}


@functools.lru_cache(maxsize=None)
def _factor(kind: str, unit: str) -> float:
    # one pint conversion per unit pair; every report value is then a multiplication
    return convert(1.0, kind, unit)


SI = ReportUnits("SI", "mm", "N", "kN", "MPa", "N/mm", "N*m")
INCH = ReportUnits("inch", "in", "lbf", "kip", "kpsi", "lbf/in", "lbf*ft")


def report_units(units: str) -> ReportUnits:
    """The :class:`ReportUnits` of a job's ``units`` ("SI" or "inch")."""
    key = units.strip().lower()
    if key in ("si", "metric", "mm"):
        return SI
    if key in ("inch", "in", "imperial", "us"):
        return INCH
    from geomjoint.errors import InputError

    raise InputError(f"unknown report units {units!r} (SI or inch)", where="units")


_figure_counter = itertools.count(1)


def _figure() -> Figure:
    # fixed margins instead of a layout engine: one draw per figure, half the time
    fig = Figure(figsize=FIGSIZE)
    fig.subplots_adjust(left=0.14, right=0.97, bottom=0.14, top=0.9)
    return fig


def _svg(fig: Figure) -> str:
    """The figure as an SVG fragment fit for inline HTML."""
    buf = io.StringIO()
    with matplotlib.rc_context({"svg.fonttype": "none", "svg.hashsalt": "geomjoint"}):
        fig.savefig(buf, format="svg")
    text = buf.getvalue()
    # drop the XML declaration, the DOCTYPE (it names an external DTD) and the metadata block
    text = re.sub(r"<\?xml[^>]*\?>\s*", "", text)
    text = re.sub(r"<!DOCTYPE[^>]*>\s*", "", text)
    text = re.sub(r"<metadata>.*?</metadata>\s*", "", text, flags=re.S)
    # ids must be unique on the page: prefix them per figure
    prefix = f"g{next(_figure_counter)}-"
    text = re.sub(r'\bid="([^"]+)"', lambda m: f'id="{prefix}{m.group(1)}"', text)
    text = re.sub(r"url\(#([^)]+)\)", lambda m: f"url(#{prefix}{m.group(1)})", text)
    text = re.sub(r'href="#([^"]+)"', lambda m: f'href="#{prefix}{m.group(1)}"', text)
    return text.strip()


def _material_fill(material: str) -> str:
    name = material.lower()
    for key, colour in _MATERIAL_FILLS:
        if key in name:
            return colour
    return _OTHER_FILL


def _thread_length(result: JointResult) -> float | None:
    f = result.spec.fastener
    if f.length is None:
        return None
    if f.fully_threaded:
        return f.length
    if result.thread_length:
        return float(result.thread_length)   # what the engine used
    from geomjoint.mechanics.bolt import bolt_thread_length

    try:
        return bolt_thread_length(f)
    except Exception:  # a drawing must not fail on a rule's edge case
        return None


def fastener_label(result: JointResult) -> str:
    """"M12x45 10.9" or "1/2-13 UNC x 2.5 in SAE 5" (inch fasteners keep inch lengths)."""
    f = result.spec.fastener
    if f.length is None:
        return f"{f.designation} {f.grade}"
    if f.system == "inch":
        return f"{f.designation} x {f.length / MM_PER_INCH:.4g} in {f.grade}"
    return f"{f.designation}x{f.length:g} {f.grade}"


def section_svg(result: JointResult, units: str = "SI") -> str:
    """Section through the joint axis, to scale: layers, washers, bolt, nut or tapped thread, cones.

    The bolt axis is vertical with the head on top; lengths are in the report's unit.
    The two pressure cones of half-angle ``spec.cone_angle`` start at the bearing
    diameters and meet at mid effective grip, as the frustum model assumes
    (Shigley 10th ed., Sec. 8-5).
    """
    u = report_units(units)
    spec = result.spec
    f = spec.fastener
    d = f.d
    d_w = spec.bearing_diameter
    d_wf = spec.far_bearing_diameter or d_w
    d_h = spec.hole_diameter
    alpha = math.radians(spec.cone_angle)
    eff = result.effective_grip if result.effective_grip > 0 else spec.grip
    clamped = spec.clamped_thickness
    cone_reach = d_w / 2.0 + eff / 2.0 * math.tan(alpha)
    half_width = max(spec.outside_diameter / 2.0 if spec.outside_diameter else 0.0,
                     cone_reach + 0.4 * d, 1.6 * d)

    fig = _figure()
    ax = fig.add_subplot(1, 1, 1)
    s = u.len  # model length -> shown length

    def rect(x0, z0, x1, z1, **kw):
        # z grows downward from the head bearing face; the picture has y = -z
        ax.add_patch(Rectangle((s(x0), -s(z1)), s(x1 - x0), s(z1 - z0), **kw))

    # layers
    z = 0.0
    for i, layer in enumerate(spec.layers):
        z1 = z + layer.thickness
        tapped_layer = spec.tapped and i == len(spec.layers) - 1
        if layer.role == "washer":
            outer = max(d_w, d_h) / 2.0 * 1.05
            rect(-outer, z, -d_h / 2.0, z1, facecolor=_WASHER_FILL, edgecolor="black", lw=0.6)
            rect(d_h / 2.0, z, outer, z1, facecolor=_WASHER_FILL, edgecolor="black", lw=0.6)
            label = f"washer {s(layer.thickness):.3g} {u.length}"
        else:
            inner = d / 2.0 if tapped_layer else d_h / 2.0
            fill = _material_fill(layer.material)
            rect(-half_width, z, -inner, z1, facecolor=fill, edgecolor="black", lw=0.6)
            rect(inner, z, half_width, z1, facecolor=fill, edgecolor="black", lw=0.6)
            label = f"{layer.material}, {s(layer.thickness):.3g} {u.length}"
            if layer.part:
                label = f"{layer.part}: {label}"
            if tapped_layer:
                label += " (tapped)"
        ax.annotate(label, (s(half_width), -s((z + z1) / 2.0)), xytext=(4, 0), textcoords="offset points",
                    va="center", ha="left", fontsize=7)
        z = z1
    stack_end = z

    # bolt: head above the bearing face, shank and thread below
    head_h = (SOCKET_HEAD_HEIGHT if f.head == "socket" else HEX_HEAD_HEIGHT) * d
    head_w = max((SOCKET_HEAD_WIDTH if f.head == "socket" else HEX_HEAD_WIDTH) * d, d_w)
    rect(-head_w / 2.0, -head_h, head_w / 2.0, 0.0, facecolor=_HARDWARE_FILL, edgecolor="black", lw=0.6)
    if f.length is not None:
        length = f.length
    elif spec.tapped:
        length = clamped + (spec.engagement or d)   # a stud or unknown length: show the engagement
    else:
        length = stack_end + (spec.nut_height or NUT_HEIGHT * d) + f.pitch * 2.0
    rect(-d / 2.0, 0.0, d / 2.0, length, facecolor="#7d8694", edgecolor="black", lw=0.6)
    l_t = _thread_length(result)
    if l_t is not None and l_t > 0:
        rect(-d / 2.0, max(length - l_t, 0.0), d / 2.0, length, facecolor="none", edgecolor="black",
             lw=0.4, hatch="////")

    # nut (through joint) or the engaged thread in the tapped part
    if spec.tapped:
        engaged_end = min(length, stack_end)
        rect(-d / 2.0 - f.pitch * 0.6, clamped, -d / 2.0, engaged_end, facecolor="none", edgecolor="black",
             lw=0.4, hatch="xxx")
        rect(d / 2.0, clamped, d / 2.0 + f.pitch * 0.6, engaged_end, facecolor="none", edgecolor="black",
             lw=0.4, hatch="xxx")
    else:
        m = spec.nut_height or NUT_HEIGHT * d
        nut_w = max(NUT_WIDTH * d, d_wf)
        rect(-nut_w / 2.0, stack_end, -d / 2.0, stack_end + m, facecolor=_HARDWARE_FILL, edgecolor="black", lw=0.6)
        rect(d / 2.0, stack_end, nut_w / 2.0, stack_end + m, facecolor=_HARDWARE_FILL, edgecolor="black", lw=0.6)
        ax.annotate("nut", (s(nut_w / 2.0), -s(stack_end + m / 2.0)), xytext=(4, 0), textcoords="offset points",
                    va="center", fontsize=7)

    # the two pressure cones (outline and a translucent fill between hole and cone)
    mid = eff / 2.0
    r_mid_near = d_w / 2.0 + mid * math.tan(alpha)
    r_mid_far = d_wf / 2.0 + mid * math.tan(alpha)
    for sign in (-1.0, 1.0):
        near = [(sign * d_h / 2.0, 0.0), (sign * d_w / 2.0, 0.0), (sign * r_mid_near, mid), (sign * d_h / 2.0, mid)]
        far = [(sign * d_h / 2.0, mid), (sign * r_mid_far, mid), (sign * d_wf / 2.0, eff), (sign * d_h / 2.0, eff)]
        for poly in (near, far):
            ax.add_patch(Polygon([(s(x), -s(zz)) for x, zz in poly], closed=True, facecolor=CONE_COLOUR,
                                 alpha=0.18, edgecolor=CONE_COLOUR, lw=1.0, ls="--"))
    ax.plot([0, 0], [s(head_h * 1.3), -s(max(length, stack_end) * 1.05)], color="black", lw=0.5, ls="-.")
    cone = result.cone
    if cone is not None:
        # the geometry clipped the cones: say how much of the mid-grip area the parts really offer
        ax.annotate(f"cone area kept at mid-grip: {100.0 * cone.area_fraction_mid_grip:.0f} %",
                    (s(half_width), -s(mid)), xytext=(4, -12), textcoords="offset points", fontsize=7,
                    color=CONE_COLOUR)

    top = head_h * 1.3
    bottom = max(length, stack_end + (0 if spec.tapped else (spec.nut_height or NUT_HEIGHT * d))) * 1.05
    ax.set_xlim(-s(half_width) * 1.05, s(half_width) * 2.4)   # room on the right for the labels
    ax.set_ylim(-s(bottom), s(top))
    ax.set_aspect("equal")
    ax.set_xlabel(f"radius [{u.length}]", fontsize=8)
    ax.set_ylabel(f"from head bearing face [{u.length}]", fontsize=8)
    ax.tick_params(labelsize=7)
    ax.set_title(f"{result.id}: {fastener_label(result)}, cones {spec.cone_angle:g}\N{DEGREE SIGN}", fontsize=9)
    return _svg(fig)


def joint_diagram_points(result: JointResult) -> dict[str, float]:
    """Corner points of the joint diagram, internal units (N, mm).

    Bolt line F = k_b delta from the origin to the preload F_i at delta_b = F_i / k_b;
    member line from (delta_b, F_i) down to (delta_b + F_i / k_m, 0).  Under the external
    load P_max the bolt force rises by C P and the member force falls by (1 - C) P,
    at the elongation delta_b + C P / k_b (Shigley 10th ed., Sec. 8-7).  Past separation,
    P > F_i / (1 - C), the members carry nothing and the bolt takes all of P.
    """
    k_b, k_m, C, F_i = result.bolt_stiffness, result.member_stiffness, result.joint_constant, result.preload
    P = result.spec.load_max
    delta_b = F_i / k_b
    separating = P * (1.0 - C) > F_i
    if separating:
        bolt_force = P
        member_force = 0.0
    else:
        bolt_force = F_i + C * P
        member_force = F_i - (1.0 - C) * P
    return {
        "delta_b": delta_b,
        "delta_m": F_i / k_m,
        "delta_load": bolt_force / k_b,
        "bolt_force": bolt_force,
        "member_force": member_force,
        "separating": float(separating),
    }


def joint_diagram_svg(result: JointResult, units: str = "SI") -> str:
    """Force-elongation diagram of bolt and members with the preload window and P_max."""
    u = report_units(units)
    p = joint_diagram_points(result)
    F_i = result.preload
    L = u.len
    F = u.fp
    fig = _figure()
    ax = fig.add_subplot(1, 1, 1)
    top = max(p["bolt_force"], F_i)
    window = result.tightening or {}
    if "preload_min" in window and "preload_max" in window and window["preload_max"] > window["preload_min"]:
        top = max(top, window["preload_max"])
        ax.axhspan(F(window["preload_min"]), F(window["preload_max"]), color=WINDOW_COLOUR, alpha=0.35,
                   label="preload window (scatter)")
    end_bolt = max(p["delta_load"], p["delta_b"]) * 1.15
    ax.plot([0, L(end_bolt)], [0, F(result.bolt_stiffness * end_bolt)], color=BOLT_COLOUR, lw=1.8,
            label=f"bolt, k_b = {u.k(result.bolt_stiffness):.4g} {u.stiffness}")
    ax.plot([L(p["delta_b"]), L(p["delta_b"] + p["delta_m"])], [F(F_i), 0], color=MEMBER_COLOUR, lw=1.8,
            ls="--", label=f"members, k_m = {u.k(result.member_stiffness):.4g} {u.stiffness}")
    ax.plot([L(p["delta_b"])], [F(F_i)], "o", color=LOAD_COLOUR, ms=4)
    ax.annotate(f"F_i = {F(F_i):.4g} {u.force_plot}", (L(p["delta_b"]), F(F_i)), xytext=(-6, 6),
                textcoords="offset points", ha="right", fontsize=7)
    P = result.spec.load_max
    if P > 0:
        x = L(p["delta_load"])
        ax.plot([x, x], [F(p["member_force"]), F(p["bolt_force"])], color=LOAD_COLOUR, lw=2.2,
                label=f"P_max = {F(P):.4g} {u.force_plot}")
        ax.annotate(f"bolt {F(p['bolt_force']):.4g}", (x, F(p["bolt_force"])), xytext=(6, 2),
                    textcoords="offset points", fontsize=7)
        ax.annotate(f"members {F(p['member_force']):.4g}", (x, F(p["member_force"])),
                    xytext=(6, -8), textcoords="offset points", fontsize=7)
        if p["separating"]:
            ax.annotate("joint separates", (x, 0), xytext=(6, 4), textcoords="offset points", fontsize=7,
                        color=MEMBER_COLOUR)
    ax.set_xlim(0, L(max(end_bolt, p["delta_b"] + p["delta_m"]) * 1.3))   # room for the labels
    ax.set_ylim(0, F(top) * 1.25)
    ax.set_xlabel(f"elongation (bolt) / compression (members) [{u.length}]", fontsize=8)
    ax.set_ylabel(f"force [{u.force_plot}]", fontsize=8)
    ax.tick_params(labelsize=7)
    ax.legend(fontsize=6.5, loc="upper left", frameon=False)
    ax.set_title(f"{result.id}: joint diagram, C = {result.joint_constant:.3f}", fontsize=9)
    return _svg(fig)


def criterion_of(result: JointResult) -> str:
    """The fatigue criterion the engine used (as results.json reports it)."""
    return result.criterion


def criterion_curve(criterion: str, Se: float, S_ut: float, S_p: float, S_y: float,
                    n: int = 101) -> tuple[list[float], list[float]]:
    """Points (sigma_m, sigma_a) of a fatigue criterion's failure curve, MPa.

    Goodman line S_a/S_e + S_m/S_ut = 1, Gerber parabola S_a/S_e + (S_m/S_ut)^2 = 1,
    ASME ellipse (S_a/S_e)^2 + (S_m/S_p)^2 = 1, Soderberg line S_a/S_e + S_m/S_y = 1
    (Shigley 10th ed., Sec. 6-12 and Sec. 8-11); "vdi": the bolt's endurance limit
    sigma_a = sigma_AS, the same for every mean stress up to S_p (VDI 2230-1:2015 R9).

    >>> criterion_curve("goodman", 100.0, 1000.0, 900.0, 800.0, n=3)
    ([0.0, 500.0, 1000.0], [100.0, 50.0, 0.0])
    """
    S = {"goodman": S_ut, "gerber": S_ut, "asme-elliptic": S_p, "soderberg": S_y, "vdi": S_p}[criterion]
    xs = [S * i / (n - 1) for i in range(n)]
    if criterion == "vdi":
        ys = [Se for _ in xs]       # sigma_AS does not depend on the mean stress up to the proof strength
    elif criterion in ("goodman", "soderberg"):
        ys = [Se * (1.0 - x / S) for x in xs]
    elif criterion == "gerber":
        ys = [Se * (1.0 - (x / S) ** 2) for x in xs]
    else:
        ys = [Se * math.sqrt(max(0.0, 1.0 - (x / S) ** 2)) for x in xs]
    return xs, ys


def _criterion_end(criterion: str, f) -> float:
    return {"goodman": f.tensile, "gerber": f.tensile, "asme-elliptic": f.proof, "soderberg": f.yield_strength,
            "vdi": f.proof}[criterion]


_CURVE_NAMES = {"goodman": "Goodman line", "gerber": "Gerber parabola", "asme-elliptic": "ASME ellipse",
                "soderberg": "Soderberg line", "vdi": "VDI 2230 endurance limit σ_AS"}
_CURVE_ENDS = {"goodman": "S_ut", "gerber": "S_ut", "asme-elliptic": "S_p", "soderberg": "S_y", "vdi": "S_p"}


def fatigue_diagram_svg(result: JointResult, units: str = "SI") -> str:
    """Fatigue diagram: the criterion curve, the proof line, the load line from sigma_i, the operating point."""
    u = report_units(units)
    f = result.spec.fastener
    crit = criterion_of(result)
    if crit not in _CURVE_NAMES:
        crit = "goodman"   # an unknown name must not break the report; the table names the real one
    S = u.s
    fig = _figure()
    ax = fig.add_subplot(1, 1, 1)
    xs, ys = criterion_curve(crit, result.Se, f.tensile, f.proof, f.yield_strength)
    ax.plot([S(x) for x in xs], [S(y) for y in ys], color=MEMBER_COLOUR, lw=1.8,
            label=f"{_CURVE_NAMES[crit]} (S_e = {S(result.Se):.4g}, {_CURVE_ENDS[crit]} = "
                  f"{S(_criterion_end(crit, f)):.4g})")
    # proof line S_a + S_m = S_p: the first-cycle limit (Shigley 10th ed., Sec. 8-11)
    ax.plot([0, S(f.proof)], [S(f.proof), 0], color="#777777", lw=0.9, ls=":", label="proof line S_a + S_m = S_p")
    sa, sm, si = result.sigma_a, result.sigma_m, result.sigma_i
    if sa > 0 and result.n_f is not None and math.isfinite(result.n_f):
        # VDI: strength straight above the operating point; textbook: along the load line from sigma_i
        r = 0.0 if crit == "vdi" else (sm - si) / sa
        Sa = result.n_f * sa
        Sm = sm if crit == "vdi" else si + r * Sa
        if crit == "vdi":
            ax.plot([S(sm), S(sm)], [S(sa), S(Sa)], color=BOLT_COLOUR, lw=1.2, ls="--", label="margin to σ_AS")
        else:
            ax.plot([S(si), S(Sm)], [0, S(Sa)], color=BOLT_COLOUR, lw=1.2, ls="--", label="load line from σ_i")
        ax.plot([S(Sm)], [S(Sa)], "s", color=BOLT_COLOUR, ms=4)
        ax.annotate(f"strength S_a = {S(Sa):.3g}", (S(Sm), S(Sa)), xytext=(6, 4), textcoords="offset points",
                    fontsize=7)
    ax.plot([S(sm)], [S(sa)], "o", color=LOAD_COLOUR, ms=5, label="operating point (σ_m, σ_a)")
    ax.annotate(f"n_f = {result.n_f:.3g}" if result.n_f is not None else "n_f unbounded", (S(sm), S(sa)),
                xytext=(-6, -10), textcoords="offset points", ha="right", fontsize=7)
    right = max(f.tensile, f.proof, sm) * 1.05
    ax.set_xlim(0, S(right))
    ax.set_ylim(0, S(max(result.Se, sa) * 1.6))
    ax.set_xlabel(f"mean stress σ_m [{u.stress}]", fontsize=8)
    ax.set_ylabel(f"alternating stress σ_a [{u.stress}]", fontsize=8)
    ax.tick_params(labelsize=7)
    ax.legend(fontsize=6.5, loc="upper right", frameon=False)
    ax.set_title(f"{result.id}: fatigue ({crit})", fontsize=9)
    return _svg(fig)


def overview_svg(overview, verdicts: dict[str, str]) -> str:
    """The model seen along the bolt axes: part outlines, each joint numbered and coloured by verdict.

    ``overview`` is a :class:`geomjoint.geometry.overview.Overview` (plain arrays); ``verdicts``
    maps joint id to "pass" | "marginal" | "fail".  The verdict is also written beside the id
    (never colour alone).
    """
    fig = Figure(figsize=(7.0, 5.0))
    fig.subplots_adjust(left=0.08, right=0.98, bottom=0.08, top=0.92)
    ax = fig.add_subplot(1, 1, 1)
    for name, poly in overview.outlines:
        ax.fill(poly[:, 0], poly[:, 1], facecolor="#eef0f3", edgecolor="#5b6470", linewidth=0.6, alpha=0.6)
    marker = {"pass": "o", "marginal": "s", "fail": "X"}
    for jid, u, v in overview.joints:
        verdict = verdicts.get(jid, "fail")
        ax.plot([u], [v], marker=marker.get(verdict, "o"), markersize=9, linestyle="none",
                color=VERDICT_COLOURS.get(verdict, "#000000"), markeredgecolor="#000000", markeredgewidth=0.6)
        ax.annotate(f"{jid} {verdict.upper()}", (u, v), textcoords="offset points",
                    xytext=(7, 5), fontsize=7)
    ax.set_aspect("equal", adjustable="datalim")
    ax.set_xlabel("mm")
    ax.set_title("model seen along the bolt axes", fontsize=9)
    return _svg(fig)
