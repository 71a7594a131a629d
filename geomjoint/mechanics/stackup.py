"""A joint's stack at its tolerance limits: will it assemble and engage, not just at nominal?

From a :class:`~geomjoint.mechanics.joint.JointSpec` with its
:class:`~geomjoint.mechanics.joint.StackupSpec` (every layer's thickness tolerance, the
bolt's length tolerance, the nut's height limits, the holes' position tolerances) this
module computes, by worst case and by root-sum-square (:mod:`geomjoint.mechanics.tolerances`):

- the grip range and the clamp length the stiffness and embedding use;
- through joints: the protrusion past the nut (at least :data:`bolt.MIN_PROTRUSION_PITCHES`);
- tapped joints: the engagement in the tapped part (at least the minimum engagement of its
  material, :func:`bolt.minimum_engagement`) and the clearance to the bottom of the hole (>= 0);
- the shank/thread transition: the shank must end inside the grip (the nut or the tapped
  thread must not meet it); where the joint carries shear and the shank covers a shear plane
  at nominal, it must cover it at the limits too;
- the preload range that follows from the clamp length at its limits (the VDI 2230-1
  embedding f_Z over the resilience at each limit);
- the position tolerance the holes can afford by the ASME Y14.5 fastener formulas.

The worst case decides by default; ``stackup_method = "statistical"`` lets the RSS limits
decide; both are always reported.  The checks are :data:`STACKUP_CHECK` and :data:`POSITION_CHECK`.
"""
from __future__ import annotations

from dataclasses import dataclass, replace

from geomjoint.errors import InputError
from geomjoint.mechanics import bolt as B
from geomjoint.mechanics import tolerances as T
from geomjoint.mechanics.joint import Check, JointSpec
from geomjoint.mechanics.tolerances import Dimension

#: the check that judges the stack at its limits, and the one of the hole-pattern formulas
STACKUP_CHECK = "stack-up limits"
POSITION_CHECK = "position"

#: a share out of limits below this (one in a million) is not worth a word in the note
REPORTED_SHARE = 1e-6

#: which corner of the stack each quantity's lower limit is found at (the check's note says it)
LOW_CORNER = {
    "protrusion": "thickest stack, shortest bolt, highest nut",
    "engagement": "thickest clamped parts, shortest screw",
    "bottom_clearance": "longest screw, thinnest clamped parts, shallowest tapped hole",
    "thread_in_grip": "longest bolt (longest shank), thinnest stack",
    "shear_plane": "shortest bolt (shortest shank), thickest parts above the plane",
}
#: what each quantity is, in the notes
WHAT = {
    "protrusion": "protrusion past the nut",
    "engagement": "thread engagement in the tapped part",
    "bottom_clearance": "clearance to the bottom of the tapped hole",
    "thread_in_grip": "thread reaching into the grip (grip - shank)",
    "shear_plane": "shank past the shear plane",
}


@dataclass(frozen=True)
class Band:
    """One quantity of the stack: nominal, worst-case and statistical (RSS) limits, mm, and its requirement."""

    name: str
    nominal: float
    worst_min: float
    worst_max: float
    stat_min: float
    stat_max: float
    required: float | None = None      # least value allowed (None: reported, not judged)
    share_out: float | None = None     # normal share below ``required`` (each tolerance = +/- 3 sigma)

    def low(self, method: str) -> float:
        """The lower limit that decides by ``method`` ("worst-case" | "statistical")."""
        return self.stat_min if method == "statistical" else self.worst_min

    def margin(self, method: str) -> float | None:
        """Deciding lower limit minus the requirement, mm (None: not judged)."""
        return None if self.required is None else self.low(method) - self.required


@dataclass(frozen=True)
class ShearPlane:
    """An interface between two clamped parts and the shank's margin past it."""

    between: tuple[str, str]
    band: Band                 # (L - b) - z: positive while the shank covers the plane


@dataclass(frozen=True)
class PreloadRange:
    """Preload in service after embedding at the clamp length's nominal and limits, N (VDI 2230-1 5.4.2.1)."""

    f_Z: float                 # amount of embedding, mm (Table 5 guide values: the same at every clamp length)
    loss: tuple[float, float, float]      # F_Z at nominal, thinnest and thickest clamp, N
    preload: tuple[float, float, float]   # the service preload at nominal, thinnest and thickest clamp, N

    @property
    def low(self) -> float:
        return min(self.preload)

    @property
    def high(self) -> float:
        return max(self.preload)


@dataclass(frozen=True)
class PositionResult:
    """The hole pattern by the ASME Y14.5 fastener formulas (diameters of tolerance zones, mm)."""

    case: str                  # "floating" (bolt and nut) | "fixed" (a tapped part holds the screw)
    projected: bool            # fixed fastener: zone projected above the tapped part
    affordable: float          # the tolerance every hole of the joint can have (equal split for fixed)
    available: float           # H - F of the governing clearance hole (its measured offset taken off)
    needed: float | None       # what the job's tolerances take of it (None: none given)
    part: str | None           # the governing clearance hole's part
    ok: bool


@dataclass(frozen=True)
class StackupResult:
    """What the stack does at its limits (all lengths mm)."""

    method: str                        # the deciding method
    elements: tuple[Dimension, ...]    # bolt, then every element of the stack against it (the chart)
    grip: Band
    clamp_length: Band
    protrusion: Band | None = None
    engagement: Band | None = None
    bottom_clearance: Band | None = None
    thread_in_grip: Band | None = None
    shear_planes: tuple[ShearPlane, ...] = ()
    preload: PreloadRange | None = None
    position: PositionResult | None = None
    notes: tuple[str, ...] = ()

    def judged(self) -> list[Band]:
        """Every band with a requirement (the shear planes' included)."""
        bands = [self.protrusion, self.engagement, self.bottom_clearance, self.thread_in_grip]
        bands += [p.band for p in self.shear_planes]
        return [b for b in bands if b is not None and b.required is not None]

    def governing(self) -> Band | None:
        """The judged band with the least margin by the deciding method."""
        judged = self.judged()
        return min(judged, key=lambda b: b.margin(self.method)) if judged else None

    @property
    def least_margin(self) -> float | None:
        """The least margin at the deciding limits, mm (negative: fails there)."""
        g = self.governing()
        return None if g is None else g.margin(self.method)

    @property
    def fails_at_limit_only(self) -> bool:
        """True when every judged quantity passes at nominal but one fails at its deciding limit."""
        judged = self.judged()
        return (any(b.margin(self.method) < 0 for b in judged)
                and all(b.nominal >= b.required for b in judged))


def band(name: str, dims: list[Dimension], required: float | None = None) -> Band:
    """The worst-case and RSS limits of ``dims`` as a :class:`Band` with its share below ``required``.

    >>> b = band("x", [Dimension("a", 10.0, -0.3, 0.3), Dimension("b", 5.0, -0.4, 0.4, sign=-1.0)], required=4.0)
    >>> (b.nominal, b.worst_min, b.worst_max, b.stat_min, b.stat_max)
    (5.0, 4.3, 5.7, 4.5, 5.5)
    """
    lo, hi = T.worst_case_limits(dims)
    s_lo, s_hi = T.rss_limits(dims)
    share = None
    if required is not None:
        share = T.share_below(required, T.statistical_mean(dims), T.stack_sigma(dims))
    return Band(name, round(T.nominal_sum(dims), 12), lo, hi, s_lo, s_hi, required, share)


def _layer_dims(spec: JointSpec, layers, sign: float) -> list[Dimension]:
    tol = spec.stackup.thickness
    out = []
    for i, layer in layers:
        name = layer.part or f"layer {i + 1}"
        if layer.role == "washer":
            name = f"{name} (washer)"
        out.append(Dimension(name, layer.thickness, tol[i].lower, tol[i].upper, sign, tol[i].source))
    return out


def _gap_dims(spec: JointSpec, sign: float) -> list[Dimension]:
    return [Dimension("gaps", spec.gaps, 0.0, 0.0, sign, "model")] if spec.gaps > 0 else []


def _bolt_dim(spec: JointSpec, sign: float = 1.0) -> Dimension:
    t = spec.stackup.length
    return Dimension(f"bolt {spec.fastener.designation}x{spec.fastener.length:g}", spec.fastener.length,
                     t.lower, t.upper, sign, t.source)


def _nut_dim(spec: JointSpec) -> Dimension | None:
    if spec.tapped or not spec.nut_height:
        return None
    t = spec.stackup.nut_height
    lower, upper, source = (t.lower, t.upper, t.source) if t is not None else (0.0, 0.0, "taken at nominal")
    return Dimension("nut", spec.nut_height, lower, upper, -1.0, source)


def _shear_planes(spec: JointSpec, shank_end: list[Dimension], clamped) -> tuple[ShearPlane, ...]:
    """The interfaces between clamped parts (washers are no shear plane) and the shank past each."""
    members = [(i, layer) for i, layer in clamped if layer.role != "washer"]
    if spec.tapped:
        members.append((len(spec.layers) - 1, spec.layers[-1]))
    planes = []
    for (i, upper), (_, lower) in zip(members, members[1:]):
        above = _layer_dims(spec, [(k, spec.layers[k]) for k in range(i + 1)], -1.0)
        dims = shank_end + above
        nominal = T.nominal_sum(dims)
        # judged only where the joint carries shear and the design puts the shank in the plane
        required = 0.0 if spec.shear > 0 and nominal > 0 else None
        planes.append(ShearPlane((upper.part or f"layer {i + 1}", lower.part or f"layer {i + 2}"),
                                 band("shear_plane", dims, required)))
    return tuple(planes)


def preload_range(spec: JointSpec, clamp: Band) -> PreloadRange | None:
    """The service preload after embedding at the clamp length's nominal and worst-case limits, N.

    Each limit scales the clamped layers to that clamp length and runs the VDI 2230-1 chain
    (embedding f_Z of Table 5, loss F_Z = f_Z / (delta_S + delta_P) over the resilience of that
    clamp length); the textbook engine's preload loses F_Z, the VDI chain's is its own.  None
    when the chain cannot be run on the joint.
    """
    from geomjoint.mechanics.checks import service_preload
    from geomjoint.mechanics.vdi import vdi_chain

    n_clamped = len(spec.layers) - (1 if spec.tapped else 0)
    losses, preloads = [], []
    F_i = service_preload(spec)[0]
    f_Z = 0.0
    for target in (clamp.nominal, clamp.worst_min, clamp.worst_max):
        scale = target / clamp.nominal if clamp.nominal > 0 else 1.0
        layers = tuple(replace(layer, thickness=layer.thickness * scale) if i < n_clamped else layer
                       for i, layer in enumerate(spec.layers))
        try:
            chain = vdi_chain(replace(spec, layers=layers, members_value=None))
        except (InputError, ValueError, ZeroDivisionError):
            return None
        f_Z = chain.f_Z
        losses.append(chain.F_Z)
        preloads.append(chain.preload if spec.method == "vdi" else max(F_i - chain.F_Z, 0.0))
    return PreloadRange(f_Z, tuple(losses), tuple(preloads))


def position_result(spec: JointSpec) -> PositionResult | None:
    """The hole pattern's position tolerance by the ASME Y14.5 fastener formulas.

    F is the bolt's nominal major diameter (its maximum material size); H each clearance hole's
    diameter as the model or job gives it (taken at its maximum material size), less twice the
    offset of its axis from the joint axis that the model measured.  A through joint is the
    floating-fastener case (every part: T <= H - F); a tapped joint the fixed-fastener case
    (T_clear + T_tapped (1 + 2P/D) <= H - F, the bracket 1 with a projected zone).
    """
    st = spec.stackup
    F = spec.fastener.d
    clear = [i for i, layer in enumerate(spec.layers) if layer.role == "member"]
    if not clear:
        return None
    holes = st.holes or tuple(spec.hole_diameter for _ in spec.layers)
    offsets = st.offsets or tuple(0.0 for _ in spec.layers)
    positions = st.positions or tuple(None for _ in spec.layers)
    given = any(p is not None for p in positions)
    if spec.tapped:
        P = spec.clamped_thickness
        D = max(min(spec.fastener.length - P - spec.gaps, spec.layers[-1].thickness), 0.0) \
            if spec.fastener.length else spec.layers[-1].thickness
        projected = st.projected or D <= 0
        t_fixed = positions[-1] or 0.0
    rows = []
    for i in clear:
        available = holes[i] - 2.0 * offsets[i] - F
        t = positions[i]
        if spec.tapped:
            afford = (T.fixed_fastener_tolerance(available + F, F) if projected else
                      T.fixed_fastener_tolerance_unprojected(available + F, F, P, D))
            needed = None
            if t is not None or positions[-1] is not None:   # the clearance both tolerances take, H - F
                needed = T.fixed_fastener_clearance_needed(F, t or 0.0, t_fixed, None if projected else P,
                                                           None if projected else D) - F
        else:
            afford = T.floating_fastener_tolerance(available + F, F)
            needed = t
        rows.append((available - (needed or 0.0), afford, available, needed, spec.layers[i].part or f"layer {i + 1}"))
    slack, afford, available, needed, part = min(rows, key=lambda r: (r[0], r[1]))
    affordable = min(r[1] for r in rows)
    ok = (not given) or all(r[3] is None or r[3] <= r[2] + 1e-9 for r in rows)
    return PositionResult("fixed" if spec.tapped else "floating", bool(st.projected), max(affordable, 0.0),
                          available, needed, part, ok)


def stackup(spec: JointSpec, with_preload: bool = True) -> StackupResult | None:
    """The joint's stack at its tolerance limits; None without tolerances or a bolt length.

    ``with_preload``: also the preload range (three runs of the VDI chain; the length sizing
    needs only the geometry).
    """
    st = spec.stackup
    f = spec.fastener
    if st is None or f.length is None:
        return None
    indexed = list(enumerate(spec.layers))
    clamped = indexed[:-1] if spec.tapped else indexed
    bolt = _bolt_dim(spec)
    grip_dims = _layer_dims(spec, clamped, 1.0) + _gap_dims(spec, 1.0)
    grip = band("grip", grip_dims)
    clamp_length = band("clamp_length", _layer_dims(spec, clamped, 1.0))
    notes: list[str] = []
    out: dict = {}
    elements = [bolt] + _layer_dims(spec, clamped, -1.0) + _gap_dims(spec, -1.0)
    if spec.tapped:
        depth_dim = Dimension(f"tapped depth ({spec.layers[-1].part or 'tapped part'})", spec.layers[-1].thickness,
                              st.thickness[-1].lower, st.thickness[-1].upper, 1.0, st.thickness[-1].source)
        reach = [bolt] + _layer_dims(spec, clamped, -1.0) + _gap_dims(spec, -1.0)
        needed = min(B.minimum_engagement(f.d, spec.layers[-1].material), spec.layers[-1].thickness)
        out["engagement"] = band("engagement", reach, needed)
        out["bottom_clearance"] = band("bottom_clearance", [depth_dim] + [replace(d, sign=-d.sign) for d in reach], 0.0)
        elements.append(replace(depth_dim, sign=-1.0))
    else:
        nut = _nut_dim(spec)
        if nut is not None:
            elements.append(nut)
            out["protrusion"] = band("protrusion", elements, B.MIN_PROTRUSION_PITCHES * f.pitch)
        else:
            notes.append("no nut height: the protrusion past the nut is not computed")
    L_T = B.bolt_thread_length(f)
    if L_T is not None and not f.fully_threaded and f.length > L_T:
        shank_end = [bolt, Dimension("thread length b", L_T, 0.0, 0.0, -1.0, "standard rule")]
        out["thread_in_grip"] = band("thread_in_grip", grip_dims + [replace(d, sign=-d.sign) for d in shank_end], 0.0)
        out["shear_planes"] = _shear_planes(spec, shank_end, clamped)
    result = StackupResult(method=st.method, elements=tuple(elements), grip=grip, clamp_length=clamp_length,
                           notes=tuple(notes), **out)
    return replace(result, preload=preload_range(spec, clamp_length) if with_preload else None,
                   position=position_result(spec))


def _mm(x: float) -> str:
    return f"{x:.2f} mm"


def stackup_check(result: StackupResult) -> Check:
    """``stack-up limits``: the least margin at the deciding limits (value and required of the
    governing quantity), with the limit that governs in the note."""
    g = result.governing()
    if g is None:
        return Check(STACKUP_CHECK, None, None, True, "nothing to judge at the limits (no bolt length past the stack)")
    method = result.method
    other = "statistical" if method == "worst-case" else "worst-case"
    low = g.low(method)
    where = "statistical (RSS, each tolerance = +/- 3 sigma)" if method == "statistical" else "worst-case"
    share = (f", {100 * g.share_out:.3g} % of joints below it (normal, each tolerance = +/- 3 sigma)"
             if g.share_out and g.share_out >= REPORTED_SHARE else "")
    note = (f"{WHAT[g.name]} {_mm(low)} at the {where} limit ({LOW_CORNER[g.name]}), needs {_mm(g.required)}; "
            f"nominal {_mm(g.nominal)}, {other} {_mm(g.low(other))}{share}")
    ok = low >= g.required - 1e-9
    if not ok:
        note = f"{_mm(g.required - low)} short: " + note
    return Check(STACKUP_CHECK, low, g.required, ok, note)


def position_check(result: StackupResult) -> Check | None:
    """``position``: the job's position tolerances against what the clearance holes afford
    (None when the job gives none)."""
    p = result.position
    if p is None or p.needed is None:
        return None
    formula = "T = H - F" if p.case == "floating" else ("T = (H - F)/2" if p.projected else
                                                        "H = F + T1 + T2 (1 + 2P/D), zone not projected")
    note = (f"{p.case} fastener ({formula}): the hole of {p.part} leaves {_mm(p.available)} of clearance, the "
            f"position tolerances take {_mm(p.needed)}; every hole can afford {_mm(p.affordable)}")
    return Check(POSITION_CHECK, p.available, p.needed, p.ok, note)
