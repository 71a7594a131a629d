"""Drawings for the HTML report, as inline SVG written straight from the numbers.

One function per drawing: :func:`section_svg` (the stack to scale, with bolt, washers,
nut or tapped thread and the two pressure cones), :func:`joint_diagram_svg` (the
force-elongation lines of bolt and members) and :func:`fatigue_diagram_svg` (the
criterion curve with the load line and the operating point), and :func:`overview_svg`
(the model seen along the bolt axes).

The drawings have a fixed layout (one size, fixed margins, the legend in a fixed corner),
so no layout engine is needed: :class:`Drawing` maps data coordinates to the picture and
writes SVG elements as text, a few kB per drawing and well under a millisecond each, which
keeps a report of hundreds of joints fast to write and to open.  Each SVG is a fragment fit
for inline HTML (no XML prologue, no DOCTYPE); its element ids get a per-drawing prefix so
several drawings on one page never clash (the report passes its own, so the same results
always give the same page; a drawing made alone numbers itself).
"""
from __future__ import annotations

import functools
import html
import itertools
import math
from dataclasses import dataclass, field

from geomjoint.mechanics.joint import JointResult
from geomjoint.report.palette import VERDICT_COLOURS, VERDICT_TEXT  # noqa: F401 (re-exported for html.py)
from geomjoint.units import MM_PER_INCH, convert

#: size of every joint drawing, px (the page scales it to its column)
WIDTH, HEIGHT = 500, 350
#: plot-area margins of the joint drawings, px: left, right, top, bottom (room for ticks and labels)
MARGINS = (62, 14, 30, 44)
#: font sizes, px: annotations, tick labels, axis labels, title
FONT_NOTE, FONT_TICK, FONT_LABEL, FONT_TITLE = 10, 10, 11, 12
#: one typographic point in px at the 100 px/in of the drawings (1 pt = 1/72 in)
PT = 100.0 / 72.0
#: the drawings' typeface (sans-serif, as on a printed drawing)
FONT_FAMILY = "DejaVu Sans, Arial, sans-serif"
#: about how many ticks an axis gets
TICKS = 6

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
_SHANK_FILL = "#7d8694"

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


# ----------------------------------------------------------------------------- the SVG writer

_drawing_counter = itertools.count(1)


def nice_ticks(lo: float, hi: float, count: int = TICKS) -> list[float]:
    """Round tick values covering [lo, hi]: steps of 1, 2, 2.5 or 5 times a power of ten.

    >>> nice_ticks(0.0, 9.3)
    [0.0, 2.0, 4.0, 6.0, 8.0]
    >>> nice_ticks(-12.0, 30.0)
    [-10.0, 0.0, 10.0, 20.0, 30.0]
    """
    span = hi - lo
    if not (span > 0 and math.isfinite(span)):
        return [lo]
    raw = span / max(count - 1, 1)
    power = 10.0 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1.0, 2.0, 2.5, 5.0, 10.0) if m * power >= raw * (1 - 1e-9))
    first = math.ceil(lo / step - 1e-9)
    last = math.floor(hi / step + 1e-9)
    return [round(k * step, 12) + 0.0 for k in range(first, last + 1)]


def _tick_label(value: float) -> str:
    text = f"{value:.6g}"
    return text.replace("-", "\u2212")    # a true minus sign, as printed axes have


def _num(x: float) -> str:
    """A pixel coordinate, rounded to 0.1 px (plenty for a drawing, short in the file)."""
    text = f"{x:.1f}"
    return text[:-2] if text.endswith(".0") else text


@dataclass
class _Entry:
    label: str
    colour: str
    width: float = 1.5
    dash: str | None = None
    marker: str | None = None      # "o" | "s" | None
    fill: str | None = None        # an area (span) instead of a line
    alpha: float = 1.0


@dataclass
class Drawing:
    """One fixed-layout drawing: data limits mapped to a plot area, SVG elements as text.

    y grows upward in data coordinates (as on paper); ``equal`` keeps one data unit the same
    length on both axes (the plot area shrinks and centres to fit), for drawings to scale.
    """

    xlim: tuple[float, float]
    ylim: tuple[float, float]
    width: int = WIDTH
    height: int = HEIGHT
    margins: tuple[float, float, float, float] = MARGINS
    equal: bool = False
    prefix: str = ""
    body: list[str] = field(default_factory=list)
    defs: list[str] = field(default_factory=list)
    legend: list[_Entry] = field(default_factory=list)
    texts: list[str] = field(default_factory=list)    # drawn over the plot area, never clipped
    labels: dict = field(default_factory=dict)        # text elements grouped by their style (one <g> each)

    def __post_init__(self) -> None:
        self.prefix = self.prefix or f"g{next(_drawing_counter)}-"
        left, right, top, bottom = self.margins
        self.px0, self.py0 = left, top
        self.pw, self.ph = self.width - left - right, self.height - top - bottom
        x0, x1 = self.xlim
        y0, y1 = self.ylim
        if not x1 > x0:
            x1 = x0 + 1.0
        if not y1 > y0:
            y1 = y0 + 1.0
        self.xlim, self.ylim = (x0, x1), (y0, y1)
        self.sx = self.pw / (x1 - x0)
        self.sy = self.ph / (y1 - y0)
        if self.equal:
            # one scale for both axes: the plot area shrinks along the longer one and is centred
            s = min(self.sx, self.sy)
            self.px0 += 0.5 * (self.pw - s * (x1 - x0))
            self.py0 += 0.5 * (self.ph - s * (y1 - y0))
            self.pw, self.ph = s * (x1 - x0), s * (y1 - y0)
            self.sx = self.sy = s

    # -- coordinates ---------------------------------------------------------------------
    def X(self, x: float) -> float:
        return self.px0 + (x - self.xlim[0]) * self.sx

    def Y(self, y: float) -> float:
        return self.py0 + (self.ylim[1] - y) * self.sy

    def _points(self, pts) -> str:
        return " ".join(f"{_num(self.X(x))},{_num(self.Y(y))}" for x, y in pts)

    @staticmethod
    def _stroke(colour: str | None, width: float, dash: str | None) -> str:
        if colour is None:
            return ' stroke="none"'
        out = f' stroke="{colour}" stroke-width="{width:g}"'
        return out + (f' stroke-dasharray="{dash}"' if dash else "")

    # -- shapes (data coordinates, clipped to the plot area) --------------------------------
    def line(self, xs, ys, colour: str, width: float = 1.5, dash: str | None = None,
             label: str | None = None) -> None:
        self.body.append(f'<polyline points="{self._points(zip(xs, ys))}" fill="none"'
                         f'{self._stroke(colour, width, dash)}/>')
        if label:
            self.legend.append(_Entry(label, colour, width, dash))

    def polygon(self, pts, fill: str, stroke: str | None = "#000", width: float = 0.6,
                dash: str | None = None, opacity: float = 1.0, stroke_opacity: float = 1.0) -> None:
        extra = f' fill-opacity="{opacity:g}"' if opacity < 1 else ""
        extra += f' stroke-opacity="{stroke_opacity:g}"' if stroke_opacity < 1 else ""
        self.body.append(f'<polygon points="{self._points(pts)}" fill="{fill}"{extra}'
                         f'{self._stroke(stroke, width, dash)}/>')

    def rect(self, x0: float, y0: float, x1: float, y1: float, fill: str, stroke: str | None = "#000",
             width: float = 0.6, hatch: str | None = None, opacity: float = 1.0) -> None:
        """A rectangle between two data corners; ``hatch`` "/" (diagonal) or "x" (crossed) on top."""
        px, py = self.X(min(x0, x1)), self.Y(max(y0, y1))
        w, h = abs(x1 - x0) * self.sx, abs(y1 - y0) * self.sy
        extra = f' fill-opacity="{opacity:g}"' if opacity < 1 else ""
        self.body.append(f'<rect x="{_num(px)}" y="{_num(py)}" width="{_num(w)}" height="{_num(h)}" '
                         f'fill="{fill}"{extra}{self._stroke(stroke, width, None)}/>')
        if hatch:
            self.body.append(f'<rect x="{_num(px)}" y="{_num(py)}" width="{_num(w)}" height="{_num(h)}" '
                             f'fill="url(#{self._hatch(hatch)})" stroke="none"/>')

    def _hatch(self, kind: str) -> str:
        pid = f"{self.prefix}hatch-{'x' if kind == 'x' else 'd'}"
        if not any(f'id="{pid}"' in d for d in self.defs):
            path = "M0,6L6,0M-1,1L1,-1M5,7L7,5" + ("M0,0L6,6M-1,5L1,7M5,-1L7,1" if kind == "x" else "")
            self.defs.append(f'<pattern id="{pid}" patternUnits="userSpaceOnUse" width="6" height="6">'
                             f'<path d="{path}" stroke="#000" stroke-width="0.5"/></pattern>')
        return pid

    def span(self, y0: float, y1: float, colour: str, opacity: float, label: str | None = None) -> None:
        """A band across the whole plot area between two y values."""
        self.rect(self.xlim[0], y0, self.xlim[1], y1, fill=colour, stroke=None, opacity=opacity)
        if label:
            self.legend.append(_Entry(label, colour, fill=colour, alpha=opacity))

    def marker(self, x: float, y: float, shape: str, size: float, colour: str, label: str | None = None) -> None:
        """A marker of ``size`` points across ("o" circle, "s" square) at a data point."""
        self.body.append(self._marker_at(self.X(x), self.Y(y), shape, size, colour))
        if label:
            self.legend.append(_Entry(label, colour, marker=shape, width=0.0))

    @staticmethod
    def _marker_at(px: float, py: float, shape: str, size: float, colour: str) -> str:
        r = 0.5 * size * PT
        if shape == "s":
            return (f'<rect x="{_num(px - r)}" y="{_num(py - r)}" width="{_num(2 * r)}" height="{_num(2 * r)}" '
                    f'fill="{colour}"/>')
        return f'<circle cx="{_num(px)}" cy="{_num(py)}" r="{_num(r)}" fill="{colour}"/>'

    # -- text (never clipped) ----------------------------------------------------------------
    def note(self, x: float, y: float, text: str, dx: float = 0.0, dy: float = 0.0, anchor: str = "start",
             middle: bool = False, colour: str | None = None, size: float = FONT_NOTE) -> None:
        """Text at a data point, offset by (dx, dy) points (dy upward), like a printed callout."""
        self.text_px(self.X(x) + dx * PT, self.Y(y) - dy * PT, text, anchor=anchor, middle=middle,
                     colour=colour, size=size, clipped=False)

    def text_px(self, px: float, py: float, text: str, anchor: str = "start", middle: bool = False,
                colour: str | None = None, size: float = FONT_NOTE, rotate: bool = False,
                clipped: bool = False, bold: bool = False) -> None:
        # the style goes on a group shared by every text of that style (a smaller file)
        style = f' font-size="{size:g}"'
        if anchor != "start":
            style += f' text-anchor="{anchor}"'
        if middle:
            style += ' dominant-baseline="central"'
        if colour:
            style += f' fill="{colour}"'
        if bold:
            style += ' font-weight="bold"'
        own = f' transform="rotate(-90 {_num(px)} {_num(py)})"' if rotate else ""
        element = f'<text x="{_num(px)}" y="{_num(py)}"{own}>{html.escape(text, quote=False)}</text>'
        if clipped:
            self.body.append(f"<g{style}>{element}</g>")
        else:
            self.labels.setdefault(style, []).append(element)

    # -- frame, ticks, labels, legend -------------------------------------------------------
    def axes(self, xlabel: str, ylabel: str, title: str, yticks: bool = True) -> None:
        x0, y0, x1, y1 = self.px0, self.py0, self.px0 + self.pw, self.py0 + self.ph
        ticks = []
        for t in nice_ticks(*self.xlim):
            px = self.X(t)
            ticks.append(f"M{_num(px)},{_num(y1)}v4")
            self.text_px(px, y1 + 6 + FONT_TICK, _tick_label(t), anchor="middle", size=FONT_TICK)
        for t in nice_ticks(*self.ylim) if yticks else ():
            py = self.Y(t)
            ticks.append(f"M{_num(x0)},{_num(py)}h-4")
            self.text_px(x0 - 6, py, _tick_label(t), anchor="end", middle=True, size=FONT_TICK)
        self.texts.append(f'<path d="{"".join(ticks)}" stroke="#000" stroke-width="0.8"/>')
        self.texts.append(f'<rect x="{_num(x0)}" y="{_num(y0)}" width="{_num(self.pw)}" height="{_num(self.ph)}" '
                          f'fill="none" stroke="#000" stroke-width="0.8"/>')
        self.text_px(0.5 * (x0 + x1), self.height - 8, xlabel, anchor="middle", size=FONT_LABEL)
        self.text_px(14, 0.5 * (y0 + y1), ylabel, anchor="middle", size=FONT_LABEL, rotate=True)
        self.text_px(0.5 * self.width, 18, title, anchor="middle", size=FONT_TITLE)

    def draw_legend(self, corner: str) -> None:
        """The legend entries in a fixed corner of the plot area ("upper left" | "upper right")."""
        if not self.legend:
            return
        right = corner.endswith("right")
        step = 13.0
        for k, e in enumerate(self.legend):
            py = self.py0 + 10 + k * step
            hx = self.px0 + self.pw - 26 if right else self.px0 + 8     # the 18 px handle
            if e.fill:
                self.texts.append(f'<rect x="{_num(hx)}" y="{_num(py - 4)}" width="18" height="8" fill="{e.fill}" '
                                  f'fill-opacity="{e.alpha:g}"/>')
            elif e.marker:
                self.texts.append(self._marker_at(hx + 9, py, e.marker, 5, e.colour))
            else:
                self.texts.append(f'<path d="M{_num(hx)},{_num(py)}h18" fill="none"'
                                  f'{self._stroke(e.colour, e.width, e.dash)}/>')
            tx = hx - 5 if right else hx + 23
            self.text_px(tx, py, e.label, anchor="end" if right else "start", middle=True, size=9)

    def svg(self) -> str:
        clip = f"{self.prefix}area"
        defs = (f'<defs><clipPath id="{clip}"><rect x="{_num(self.px0)}" y="{_num(self.py0)}" '
                f'width="{_num(self.pw)}" height="{_num(self.ph)}"/></clipPath>{"".join(self.defs)}</defs>')
        labels = "".join(f'<g{style}>{"".join(items)}</g>' for style, items in self.labels.items())
        return (f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {self.width} {self.height}" '
                f'width="{self.width}" height="{self.height}" font-family="{FONT_FAMILY}">'
                f'{defs}<rect width="{self.width}" height="{self.height}" fill="#fff"/>'
                f'<g clip-path="url(#{clip})" stroke-linejoin="round">{"".join(self.body)}</g>'
                f'{"".join(self.texts)}{labels}</svg>')


def _material_fill(material: str) -> str:
    name = material.lower()
    for key, colour in _MATERIAL_FILLS:
        if key in name:
            return colour
    return _OTHER_FILL


# ----------------------------------------------------------------------------- what the drawings read
# (the few result fields the drawings take beyond the typed ones, each read in one place)

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


def cone_area_kept(result: JointResult) -> float | None:
    """The fraction of the ideal mid-grip cone area the parts offer (clipped cones), else None."""
    cone = result.cone
    return float(cone.area_fraction_mid_grip) if cone is not None else None


def criterion_of(result: JointResult) -> str:
    """The fatigue criterion the engine used (as results.json reports it)."""
    return result.criterion


def fastener_label(result: JointResult) -> str:
    """"M12x45 10.9" or "1/2-13 UNC x 2.5 in SAE 5" (inch fasteners keep inch lengths)."""
    f = result.spec.fastener
    if f.length is None:
        return f"{f.designation} {f.grade}"
    if f.system == "inch":
        return f"{f.designation} x {f.length / MM_PER_INCH:.4g} in {f.grade}"
    return f"{f.designation}x{f.length:g} {f.grade}"


# ----------------------------------------------------------------------------- the section

def section_svg(result: JointResult, units: str = "SI", prefix: str = "") -> str:
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
    s = u.len  # model length -> shown length

    # the extent first (fixed layout): head on top, the longer of bolt and stack below
    head_h = (SOCKET_HEAD_HEIGHT if f.head == "socket" else HEX_HEAD_HEIGHT) * d
    head_w = max((SOCKET_HEAD_WIDTH if f.head == "socket" else HEX_HEAD_WIDTH) * d, d_w)
    stack_end = sum(layer.thickness for layer in spec.layers)
    if f.length is not None:
        length = f.length
    elif spec.tapped:
        length = clamped + (spec.engagement or d)   # a stud or unknown length: show the engagement
    else:
        length = stack_end + (spec.nut_height or NUT_HEIGHT * d) + f.pitch * 2.0
    m = spec.nut_height or NUT_HEIGHT * d
    top = head_h * 1.3
    bottom = max(length, stack_end + (0 if spec.tapped else m)) * 1.05
    # room on the right for the labels
    dr = Drawing((-s(half_width) * 1.05, s(half_width) * 2.4), (-s(bottom), s(top)), equal=True, prefix=prefix)

    def rect(x0, z0, x1, z1, **kw):
        # z grows downward from the head bearing face; the picture has y = -z
        dr.rect(s(x0), -s(z1), s(x1), -s(z0), **kw)

    # layers
    z = 0.0
    for i, layer in enumerate(spec.layers):
        z1 = z + layer.thickness
        tapped_layer = spec.tapped and i == len(spec.layers) - 1
        if layer.role == "washer":
            outer = max(d_w, d_h) / 2.0 * 1.05
            rect(-outer, z, -d_h / 2.0, z1, fill=_WASHER_FILL)
            rect(d_h / 2.0, z, outer, z1, fill=_WASHER_FILL)
            label = f"washer {s(layer.thickness):.3g} {u.length}"
        else:
            inner = d / 2.0 if tapped_layer else d_h / 2.0
            fill = _material_fill(layer.material)
            rect(-half_width, z, -inner, z1, fill=fill)
            rect(inner, z, half_width, z1, fill=fill)
            label = f"{layer.material}, {s(layer.thickness):.3g} {u.length}"
            if layer.part:
                label = f"{layer.part}: {label}"
            if tapped_layer:
                label += " (tapped)"
        dr.note(s(half_width), -s((z + z1) / 2.0), label, dx=4, middle=True)
        z = z1

    # bolt: head above the bearing face, shank and thread below
    rect(-head_w / 2.0, -head_h, head_w / 2.0, 0.0, fill=_HARDWARE_FILL)
    rect(-d / 2.0, 0.0, d / 2.0, length, fill=_SHANK_FILL)
    l_t = _thread_length(result)
    if l_t is not None and l_t > 0:
        rect(-d / 2.0, max(length - l_t, 0.0), d / 2.0, length, fill="none", width=0.4, hatch="/")

    # nut (through joint) or the engaged thread in the tapped part
    if spec.tapped:
        engaged_end = min(length, stack_end)
        rect(-d / 2.0 - f.pitch * 0.6, clamped, -d / 2.0, engaged_end, fill="none", width=0.4, hatch="x")
        rect(d / 2.0, clamped, d / 2.0 + f.pitch * 0.6, engaged_end, fill="none", width=0.4, hatch="x")
    else:
        nut_w = max(NUT_WIDTH * d, d_wf)
        rect(-nut_w / 2.0, stack_end, -d / 2.0, stack_end + m, fill=_HARDWARE_FILL)
        rect(d / 2.0, stack_end, nut_w / 2.0, stack_end + m, fill=_HARDWARE_FILL)
        dr.note(s(nut_w / 2.0), -s(stack_end + m / 2.0), "nut", dx=4, middle=True)

    # the two pressure cones (outline and a translucent fill between hole and cone)
    mid = eff / 2.0
    r_mid_near = d_w / 2.0 + mid * math.tan(alpha)
    r_mid_far = d_wf / 2.0 + mid * math.tan(alpha)
    for sign in (-1.0, 1.0):
        near = [(sign * d_h / 2.0, 0.0), (sign * d_w / 2.0, 0.0), (sign * r_mid_near, mid), (sign * d_h / 2.0, mid)]
        far = [(sign * d_h / 2.0, mid), (sign * r_mid_far, mid), (sign * d_wf / 2.0, eff), (sign * d_h / 2.0, eff)]
        for poly in (near, far):
            dr.polygon([(s(x), -s(zz)) for x, zz in poly], fill=CONE_COLOUR, opacity=0.18, stroke=CONE_COLOUR,
                       width=1.0, dash="4 2")
    dr.line([0, 0], [s(head_h * 1.3), -s(max(length, stack_end) * 1.05)], colour="#000", width=0.5,
            dash="6 2 1 2")
    kept = cone_area_kept(result)
    if kept is not None:
        # the geometry clipped the cones: say how much of the mid-grip area the parts really offer
        dr.note(s(half_width), -s(mid), f"cone area kept at mid-grip: {100.0 * kept:.0f} %", dx=4, dy=-12,
                colour=CONE_COLOUR)
    dr.axes(f"radius [{u.length}]", f"from head bearing face [{u.length}]",
            f"{result.id}: {fastener_label(result)}, cones {spec.cone_angle:g}\N{DEGREE SIGN}")
    return dr.svg()


# ----------------------------------------------------------------------------- the joint diagram

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


def joint_diagram_svg(result: JointResult, units: str = "SI", prefix: str = "") -> str:
    """Force-elongation diagram of bolt and members with the preload window and P_max."""
    u = report_units(units)
    p = joint_diagram_points(result)
    F_i = result.preload
    L = u.len
    F = u.fp
    top = max(p["bolt_force"], F_i)
    window = result.tightening or {}
    has_window = "preload_min" in window and "preload_max" in window and window["preload_max"] > window["preload_min"]
    if has_window:
        top = max(top, window["preload_max"])
    end_bolt = max(p["delta_load"], p["delta_b"]) * 1.15
    dr = Drawing((0.0, L(max(end_bolt, p["delta_b"] + p["delta_m"]) * 1.3)), (0.0, F(top) * 1.25), prefix=prefix)
    if has_window:
        dr.span(F(window["preload_min"]), F(window["preload_max"]), WINDOW_COLOUR, 0.35,
                label="preload window (scatter)")
    dr.line([0, L(end_bolt)], [0, F(result.bolt_stiffness * end_bolt)], colour=BOLT_COLOUR, width=1.8,
            label=f"bolt, k_b = {u.k(result.bolt_stiffness):.4g} {u.stiffness}")
    dr.line([L(p["delta_b"]), L(p["delta_b"] + p["delta_m"])], [F(F_i), 0], colour=MEMBER_COLOUR, width=1.8,
            dash="6 3", label=f"members, k_m = {u.k(result.member_stiffness):.4g} {u.stiffness}")
    dr.marker(L(p["delta_b"]), F(F_i), "o", 4, LOAD_COLOUR)
    dr.note(L(p["delta_b"]), F(F_i), f"F_i = {F(F_i):.4g} {u.force_plot}", dx=-6, dy=6, anchor="end")
    P = result.spec.load_max
    if P > 0:
        x = L(p["delta_load"])
        dr.line([x, x], [F(p["member_force"]), F(p["bolt_force"])], colour=LOAD_COLOUR, width=2.2,
                label=f"P_max = {F(P):.4g} {u.force_plot}")
        dr.note(x, F(p["bolt_force"]), f"bolt {F(p['bolt_force']):.4g}", dx=6, dy=2)
        dr.note(x, F(p["member_force"]), f"members {F(p['member_force']):.4g}", dx=6, dy=-8)
        if p["separating"]:
            dr.note(x, 0, "joint separates", dx=6, dy=4, colour=MEMBER_COLOUR)
    dr.axes(f"elongation (bolt) / compression (members) [{u.length}]", f"force [{u.force_plot}]",
            f"{result.id}: joint diagram, C = {result.joint_constant:.3f}")
    dr.draw_legend("upper left")
    return dr.svg()


# ----------------------------------------------------------------------------- the fatigue diagram

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


#: points of a curved criterion in the drawing (straight ones need two)
CURVE_POINTS = 61


def _criterion_end(criterion: str, f) -> float:
    return {"goodman": f.tensile, "gerber": f.tensile, "asme-elliptic": f.proof, "soderberg": f.yield_strength,
            "vdi": f.proof}[criterion]


_CURVE_NAMES = {"goodman": "Goodman line", "gerber": "Gerber parabola", "asme-elliptic": "ASME ellipse",
                "soderberg": "Soderberg line", "vdi": "VDI 2230 endurance limit σ_AS"}
_CURVE_ENDS = {"goodman": "S_ut", "gerber": "S_ut", "asme-elliptic": "S_p", "soderberg": "S_y", "vdi": "S_p"}


def fatigue_diagram_svg(result: JointResult, units: str = "SI", prefix: str = "") -> str:
    """Fatigue diagram: the criterion curve, the proof line, the load line from sigma_i, the operating point."""
    u = report_units(units)
    f = result.spec.fastener
    crit = criterion_of(result)
    if crit not in _CURVE_NAMES:
        crit = "goodman"   # an unknown name must not break the report; the table names the real one
    S = u.s
    sa, sm, si = result.sigma_a, result.sigma_m, result.sigma_i
    right = max(f.tensile, f.proof, sm) * 1.05
    dr = Drawing((0.0, S(right)), (0.0, S(max(result.Se, sa) * 1.6)), prefix=prefix)
    straight = crit in ("goodman", "soderberg", "vdi")
    xs, ys = criterion_curve(crit, result.Se, f.tensile, f.proof, f.yield_strength,
                             n=2 if straight else CURVE_POINTS)
    dr.line([S(x) for x in xs], [S(y) for y in ys], colour=MEMBER_COLOUR, width=1.8,
            label=f"{_CURVE_NAMES[crit]} (S_e = {S(result.Se):.4g}, {_CURVE_ENDS[crit]} = "
                  f"{S(_criterion_end(crit, f)):.4g})")
    # proof line S_a + S_m = S_p: the first-cycle limit (Shigley 10th ed., Sec. 8-11)
    dr.line([0, S(f.proof)], [S(f.proof), 0], colour="#777777", width=0.9, dash="1 2",
            label="proof line S_a + S_m = S_p")
    if sa > 0 and result.n_f is not None and math.isfinite(result.n_f):
        # VDI: strength straight above the operating point; textbook: along the load line from sigma_i
        r = 0.0 if crit == "vdi" else (sm - si) / sa
        Sa = result.n_f * sa
        Sm = sm if crit == "vdi" else si + r * Sa
        if crit == "vdi":
            dr.line([S(sm), S(sm)], [S(sa), S(Sa)], colour=BOLT_COLOUR, width=1.2, dash="5 3",
                    label="margin to σ_AS")
        else:
            dr.line([S(si), S(Sm)], [0, S(Sa)], colour=BOLT_COLOUR, width=1.2, dash="5 3",
                    label="load line from σ_i")
        dr.marker(S(Sm), S(Sa), "s", 4, BOLT_COLOUR)
        dr.note(S(Sm), S(Sa), f"strength S_a = {S(Sa):.3g}", dx=6, dy=4)
    dr.marker(S(sm), S(sa), "o", 5, LOAD_COLOUR, label="operating point (σ_m, σ_a)")
    dr.note(S(sm), S(sa), f"n_f = {result.n_f:.3g}" if result.n_f is not None else "n_f unbounded",
            dx=-6, dy=-10, anchor="end")
    dr.axes(f"mean stress σ_m [{u.stress}]", f"alternating stress σ_a [{u.stress}]",
            f"{result.id}: fatigue ({crit})")
    dr.draw_legend("upper right")
    return dr.svg()


# ----------------------------------------------------------------------------- the overview

#: size of the overview picture, px, and its margins (left, right, top, bottom)
OVERVIEW_SIZE = (700, 500)
OVERVIEW_MARGINS = (56, 14, 30, 40)
_JOINT_MARKERS = {"pass": "o", "marginal": "s", "fail": "x"}


def overview_svg(overview, verdicts: dict[str, str], prefix: str = "ov-") -> str:
    """The model seen along the bolt axes: part outlines, each joint numbered and coloured by verdict.

    ``overview`` is a :class:`geomjoint.geometry.overview.Overview` (plain arrays); ``verdicts``
    maps joint id to "pass" | "marginal" | "fail".  The verdict is also written beside the id
    (never colour alone), and the marker differs by verdict (circle, square, cross).
    """
    xs = [float(x) for _, poly in overview.outlines for x in poly[:, 0]] + [u for _, u, _ in overview.joints]
    ys = [float(y) for _, poly in overview.outlines for y in poly[:, 1]] + [v for _, _, v in overview.joints]
    if not xs:
        xs, ys = [0.0, 1.0], [0.0, 1.0]
    pad = 0.05 * max(max(xs) - min(xs), max(ys) - min(ys), 1.0)
    dr = Drawing((min(xs) - pad, max(xs) + pad), (min(ys) - pad, max(ys) + pad), width=OVERVIEW_SIZE[0],
                 height=OVERVIEW_SIZE[1], margins=OVERVIEW_MARGINS, equal=True, prefix=prefix)
    for _name, poly in overview.outlines:
        dr.polygon([(float(x), float(y)) for x, y in poly], fill="#eef0f3", stroke="#5b6470", opacity=0.6)
    for jid, x, y in overview.joints:
        verdict = verdicts.get(jid, "fail")
        colour = VERDICT_COLOURS.get(verdict, "#000000")
        px, py, r = dr.X(x), dr.Y(y), 4.5
        shape = _JOINT_MARKERS.get(verdict, "o")
        if shape == "x":
            dr.body.append(f'<path d="M{_num(px - r)},{_num(py - r)}l{_num(2 * r)},{_num(2 * r)}'
                           f'M{_num(px - r)},{_num(py + r)}l{_num(2 * r)},{_num(-2 * r)}" stroke="{colour}" '
                           f'stroke-width="3"/>')
        elif shape == "s":
            dr.body.append(f'<rect x="{_num(px - r)}" y="{_num(py - r)}" width="{_num(2 * r)}" '
                           f'height="{_num(2 * r)}" fill="{colour}" stroke="#000" stroke-width="0.6"/>')
        else:
            dr.body.append(f'<circle cx="{_num(px)}" cy="{_num(py)}" r="{_num(r)}" fill="{colour}" '
                           f'stroke="#000" stroke-width="0.6"/>')
        dr.note(x, y, f"{jid} {verdict.upper()}", dx=7, dy=5, size=9)
    dr.axes("mm", "mm", "model seen along the bolt axes")
    return dr.svg()


# ----------------------------------------------------------------------------- the stack-up chart

#: fills of the stack-up chart: an element's nominal, its tolerance band, the sum's worst-case and RSS bands
STACK_FILL = _OTHER_FILL
STACK_BAND = WINDOW_COLOUR
STACK_WORST = MEMBER_COLOUR
STACK_RSS = BOLT_COLOUR
#: height of a bar in the chart, in rows (a row is one unit of the y axis)
STACK_BAR = 0.5
#: room the legend of the stack-up chart takes above the bolt, px (three entries of 13 px and a margin)
STACK_LEGEND_PX = 52


def stackup_svg(result: JointResult, units: str = "SI", prefix: str = "") -> str:
    """The stack at its tolerance limits: along the bolt axis from the head's bearing face, the bolt
    (its length and band) on top, then every element of the stack at its place with its own
    tolerance band at its end, and at the bottom their sum with its worst-case and RSS bands, and
    the limit the governing quantity needs.  Empty when the joint has no stack-up."""
    su = result.stackup
    if su is None or not su.elements:
        return ""
    u = report_units(units)
    L = u.len
    bolt, stack = su.elements[0], su.elements[1:]
    rows = len(stack) + 2
    worst = (sum(d.nominal + d.lower for d in stack), sum(d.nominal + d.upper for d in stack))
    half = math.sqrt(sum((0.5 * (d.upper - d.lower)) ** 2 for d in stack))
    mean = sum(d.middle for d in stack)
    right = max(bolt.nominal + bolt.upper, worst[1]) * 1.12
    margins = (14, 14, 30, 44)
    plot_height = HEIGHT - margins[2] - margins[3]
    headroom = STACK_LEGEND_PX * (rows + 0.5) / (plot_height - STACK_LEGEND_PX)   # rows kept free for the legend
    dr = Drawing((0.0, L(right)), (0.0, rows + 0.5 + headroom), prefix=prefix, margins=margins)

    def bar(y: float, x0: float, x1: float, fill: str, opacity: float = 1.0, height: float = STACK_BAR) -> None:
        dr.rect(L(x0), y - height / 2, L(x1), y + height / 2, fill=fill, stroke=None if opacity < 1 else "#000",
                opacity=opacity)

    y = rows
    bar(y, 0.0, bolt.nominal, _HARDWARE_FILL)
    bar(y, bolt.nominal + bolt.lower, bolt.nominal + bolt.upper, STACK_BAND, 0.8, STACK_BAR * 1.4)
    dr.note(0.0, y + STACK_BAR / 2, f"{bolt.name}  {bolt.lower:+.2f}/{bolt.upper:+.2f}", dx=2, dy=2, size=9)
    z = 0.0
    for d in stack:
        y -= 1
        bar(y, z, z + d.nominal, _WASHER_FILL if "washer" in d.name or d.name == "nut" else STACK_FILL)
        if d.upper > d.lower:
            bar(y, z + d.nominal + d.lower, z + d.nominal + d.upper, STACK_BAND, 0.8, STACK_BAR * 1.4)
        dr.note(L(z), y + STACK_BAR / 2, f"{d.name}  {d.lower:+.2f}/{d.upper:+.2f}", dx=2, dy=2, size=9)
        z += d.nominal
    y -= 1
    bar(y, 0.0, z, STACK_FILL)
    bar(y, worst[0], worst[1], STACK_WORST, 0.45, STACK_BAR * 1.6)
    bar(y, mean - half, mean + half, STACK_RSS, 0.6, STACK_BAR * 1.2)
    dr.note(0.0, y + STACK_BAR / 2, "sum of the stack", dx=2, dy=3, size=9)
    g = su.governing()
    ends = []
    if su.protrusion is not None and su.protrusion.required is not None:
        # the bolt must reach past the stack's worst end by the required protrusion
        ends.append((worst[1] + su.protrusion.required, "needed reach"))
    if su.engagement is not None and su.engagement.required is not None:
        clamped = sum(d.nominal + d.upper for d in stack[:-1])
        ends.append((clamped + su.engagement.required, "needed reach"))
        ends.append((worst[0], "hole bottom, nearest"))
    for x, label in ends:
        dr.line([L(x)] * 2, [0.3, rows + 0.4], colour=LOAD_COLOUR, width=1.2, dash="4 3")
        reach = label == "needed reach"
        dr.note(L(x), 0.3, f"{label} {L(x):.4g}", dx=3 if reach else -3, dy=2 if reach else 12,
                anchor="start" if reach else "end", size=9)
    dr.line([L(bolt.nominal + bolt.lower)] * 2, [0.3, rows + 0.4], colour=STACK_WORST, width=1.0, dash="2 2")
    dr.legend += [_Entry("element tolerance band", STACK_BAND, fill=STACK_BAND, alpha=0.8),
                  _Entry("sum, worst case", STACK_WORST, fill=STACK_WORST, alpha=0.45),
                  _Entry("sum, RSS (3 sigma)", STACK_RSS, fill=STACK_RSS, alpha=0.6)]
    margin = su.least_margin
    title = f"{result.id}: stack-up at the limits"
    if margin is not None and g is not None:
        title += f", {g.name.replace('_', ' ')} margin {L(margin):+.3g} {u.length} ({su.method})"
    dr.axes(f"along the bolt from the head's bearing face [{u.length}]", "", title, yticks=False)
    dr.draw_legend("upper right")
    return dr.svg()
