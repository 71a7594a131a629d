"""Scan a model: every bolted joint, its stack-up, the modelled hardware and findings.

``scan_model(source)`` runs model -> holes -> hardware -> stacks and adds the
stack-up findings; ``scan_to_json`` gives the scan document of DESIGN.md and
``scan_table`` a readable table.  The finding codes are stable (FINDING_CODES; with the codes
the analysis adds, the complete list is geomjoint.findings.FINDING_CODES).
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from typing import Any

from geomjoint import catalog
from geomjoint.errors import InputError
from geomjoint.geometry.hardware import (
    HEX_CORNER_FACTOR,
    SIZE_TOL,
    Bolt,
    Headless,
    Nut,
    Washer,
    _designation,   # the one parse of a product name recognition uses
    _hint_of,
    recognise,
    rod_of_plug,
    stud_bolts,
    thread_fits_diameter,
    thread_for_diameter,
)
from geomjoint.geometry.holes import LINEAR_TOL, analyse_faces, find_holes
from geomjoint.geometry.model import Model, load_model
from geomjoint.catalog.hole_parts import hole_part_kind
from geomjoint.geometry.stacks import (
    THREAD_MATCH_TOL,
    Finding,
    Joint,
    Plug,
    SetAside,
    find_plugs,
    add_open_layer,
    add_undrilled_layer,
    find_stacks,
    number,
    open_hole_layer,
    undrilled_thread_layer,
)
from geomjoint.geometry.placed import Placement, definition, movable, moved_hardware, moved_holes
from geomjoint.mechanics.bolt import MIN_PROTRUSION_PITCHES, SIZING_PROTRUSION_PITCHES, minimum_engagement, required_length

#: every finding code a scan can give, with what it means
FINDING_CODES = {
    "misaligned": "fail: hole axes offset more than the sum of the radial clearances",
    "gap": "warn: the layers (or head / nut and a layer) do not touch",
    "overlap": "warn: two solids of the stack overlap along the axis",
    "duplicate": "fail: two parts fill the same axial range (a part placed twice on itself)",
    "interference": "fail: the modelled bolt is wider than a clearance hole",
    "bolt-short": "fail: under one pitch past the nut, or too little thread engagement",
    "bolt-long": "fail: bottoms in a blind tapped hole; warn: protrudes more than 1 d past the nut",
    "shank-in-nut": "fail: the unthreaded shank of a bolt or screw is longer than the grip (through)",
    "shank-in-thread": "fail: the unthreaded shank reaches the tapped hole",
    "hole-not-standard": "warn: a clearance hole is none of the ISO 273 / ASME B18.2.8 sizes",
    "seat-too-small": "fail: head or washer wider than the counterbore it sits in",
    "no-hardware": "info: no bolt modelled, size inferred; warn: and no size matches",
    "name-mismatch": "warn: the designation in a fastener's name (size, length, head kind) disagrees with its shape",
    "modelled-diameter": "info: the shank is modelled at a minor or pitch diameter; the size is the one its name states",
    "stud": "info: a stud (threaded rod) with a nut as its head",
    "grip": "info: the grip and the shortest standard bolt length that fits",
    "catalog-gap": "warn: the catalog has no data for part of this size's hardware; the checks that need it are skipped",
    "surface-body": "info (model): surface bodies made solids from their closed shells; warn: ones that do not close, not read",
    "reader-remark": "info (model): the STEP reader's remarks that leave the geometry as it is, by the file's #ids",
    "thread-in-hole": "info: where the thread of a tapped joint is: a screw in a hole of its tap-drill, minor or "
                      "nominal size, a thread-forming screw in plastic, or an insert (no nut is assumed); warn: the "
                      "screw cannot pass a last hole of no thread size, taken as tapped, or nothing is clamped above "
                      "the part holding the thread",
    "open-hole": "info: a part clamped under a head has no whole hole around the bolt (a slot or notch); "
                 "its hole is taken as the bolt's diameter",
    "not-a-bolt-hole": "info (model): coaxial holes with no fastener modelled whose bores match no clearance hole "
                       "and no tap drill of any catalogue size (a shaft bore, bearing seat, nozzle or vent): not a joint",
    "holds-a-part": "info (model): coaxial holes with no fastener modelled holding a part that is no fastener "
                    "(a pin, shaft, bushing or tube): not a joint",
}

#: protrusion past the nut beyond which the bolt is reported long, in bolt diameters
#: (a stated limit of ours; common practice keeps it to a few threads)
MAX_PROTRUSION_DIAMETERS = 1.0
#: a hole matches a standard clearance when within this tolerance, mm (ISO 273 holes are H13;
#: 0.05 mm keeps the fine / medium / coarse series apart)
CLEARANCE_MATCH_TOL = 0.05


@dataclass
class ScanResult:
    """The outcome of a scan (mm, model coordinates)."""

    source: str
    model: Model = field(repr=False)
    joints: list[Joint]
    bolts: list[Bolt] = field(default_factory=list)
    nuts: list[Nut] = field(default_factory=list)
    washers: list[Washer] = field(default_factory=list)
    hole_count: int = 0
    unmatched_hardware: list[str] = field(default_factory=list)   # bolts/nuts/washers in no joint
    headless: list[Headless] = field(default_factory=list)        # set screws and studs in no joint
    findings: list[Finding] = field(default_factory=list)          # on the model as a whole (reader remarks, set-aside stacks)
    set_aside: list[SetAside] = field(default_factory=list)        # coaxial stacks that are no joint (H01 ...)
    system: str | None = None          # the fastener system the file's unit suggests ("inch" / "metric")

    @property
    def failed(self) -> bool:
        return any(f.severity == "fail" for j in self.joints for f in j.findings)


def scan_model(source: Any) -> ScanResult:
    """Find every bolted joint of a STEP file or an in-memory cadquery model."""
    model = source if isinstance(source, Model) else load_model(source)
    try:
        return _scan(model)
    except InputError as exc:
        if model.source in str(exc):
            raise
        raise InputError(str(exc), where=model.source) from None   # every error names the file


def _label(part) -> str:
    """The names a part's designation is read from: its product name and its readable name."""
    return " ".join(n for n in dict.fromkeys((part.product, part.name)) if n)


def _designation_key(desig) -> tuple | None:
    """What recognition reads of a designation: all of it but the text it was read from (two
    placements "bolt_M10x40_1" and "bolt_M10x40_2" of one definition are recognised alike)."""
    if desig is None:
        return None
    return dataclasses.astuple(dataclasses.replace(desig, text=""))


class _Readings:
    """Holes and hardware of each distinct shape definition, read once and moved to each of its
    placements (:mod:`geomjoint.geometry.placed`); a placement that is no rigid motion, or a
    record with a field the move does not know, is read on the placed solid itself."""

    def __init__(self) -> None:
        self.definitions: dict[int, list[tuple[object, int]]] = {}
        self.readings: dict[tuple, tuple[list, object]] = {}

    def _number(self, bare) -> int:
        bucket = self.definitions.setdefault(hash(bare), [])
        for other, k in bucket:
            if other.IsPartner(bare):
                return k
        k = sum(len(b) for b in self.definitions.values())
        bucket.append((bare, k))
        return k

    def of(self, part) -> tuple[list, object, list]:
        """(holes, hardware record or None, plugs) of a placed part (no holes or plugs for a
        piece of hardware: the scan drops them)."""
        label = _label(part)
        placement = Placement.of(part.solid)
        if placement is None:
            return _read(part.solid, part, label)
        desig = _designation(label)
        bare = definition(part.solid)
        # what recognition reads of the name: its designation and the hole-part kind it says
        key = (self._number(bare), _designation_key(desig), hole_part_kind(label))
        if key not in self.readings:
            self.readings[key] = _read(bare, part, label, of_definition=True)
        holes, hw, plugs = self.readings[key]
        if not all(movable(r) for r in ([hw] if hw is not None else plugs)):
            return _read(part.solid, part, label)
        if hw is not None:
            return [], moved_hardware(hw, placement, part=part.name, solid=part.solid, hint=_hint_of(desig),
                                      designation=desig), []
        kind = _hole_part_kind(part)
        return (moved_holes(holes, placement, part.name, part.solid), None,
                [moved_hardware(p, placement, part=part.name, kind=kind, material_hint=part.material_hint,
                                solid=part.solid) for p in plugs])


def _hole_part_kind(part) -> str | None:
    return hole_part_kind(part.name, getattr(part, "product", None), getattr(part, "instance", None))


def _read(solid, part, label: str, of_definition: bool = False) -> tuple[list, object, list]:
    """Holes, hardware and plugs of a solid read directly (see :meth:`_Readings.of`);
    ``of_definition``: the solid is the part's definition, its plugs get their kind when placed."""
    faces = analyse_faces(solid)
    part_holes = find_holes(solid, part.name, faces)
    hw = recognise(part.name, faces, part_holes, solid, label=label)
    if hw is not None:
        return [], hw, []
    kind, hint = (None, None) if of_definition else (_hole_part_kind(part), part.material_hint)
    return part_holes, None, find_plugs(part.name, faces, kind, hint, solid)


def _scan(model: Model) -> ScanResult:
    holes, bolts, nuts, washers, headless = [], [], [], [], []
    plugs: list[Plug] = []
    hints = {}
    readings = _Readings()
    for part in model.parts:
        part_holes, hw, part_plugs = readings.of(part)
        hints[part.name] = part.material_hint
        if isinstance(hw, Bolt):
            bolts.append(hw)
        elif isinstance(hw, Nut):
            nuts.append(hw)
        elif isinstance(hw, Washer):
            washers.append(hw)
        elif isinstance(hw, Headless):
            headless.append(hw)          # a set screw in its threaded hole is no clamping joint
        else:
            holes.extend(part_holes)
            plugs.extend(part_plugs)
    # a stud with a nut on it is a bolt whose head is the nut; an unnamed plain rod of a thread's
    # size with a nut on it is a stud too (without the nut it may be a pin: it stays a plug)
    holed = {h.part for h in holes}
    rods = [r for r in (rod_of_plug(p, plugs) for p in plugs if p.part not in holed) if r is not None]
    studs, head_nuts = stud_bolts(headless + rods, nuts)
    bolts += studs
    nuts = [n for n in nuts if n.part not in head_nuts]
    stud_rods = {b.part for b in studs}
    plugs = [p for p in plugs if p.part not in stud_rods]
    joints, aside = find_stacks(holes, bolts, nuts, washers, hints, plugs)
    # a part clamped under a head with a slot or notch instead of a whole hole
    hardware_parts = {h.part for h in (*bolts, *nuts, *washers, *headless)}
    members = [(p.name, p.solid, p.material_hint) for p in model.parts if p.name not in hardware_parts]
    classifiers: dict = {}
    for j in joints:
        layer = open_hole_layer(j, members, classifiers)
        if layer is not None:
            add_open_layer(j, layer)
        undrilled = undrilled_thread_layer(j, members, classifiers)
        if undrilled is not None:
            add_undrilled_layer(j, undrilled)
        elif j.tapped and j.bolt is not None and len(j.layers) == 1:
            j.findings.append(Finding("warn", "thread-in-hole",
                                      f"nothing is clamped between the head of {j.bolt.part} and {j.layers[0].part}, "
                                      f"which holds its thread: the part the screw holds is not in the model, or has "
                                      f"no hole the scan can see"))
    # the file's unit suggests the fastener system when a size is inferred from holes
    system = {"inch": "inch", "foot": "inch", "mm": "metric", "cm": "metric", "m": "metric"}.get(
        model.file_unit or "")
    for j in joints:
        add_findings(j, system)
    # holes that match a size but no fastener of it can be finished (no standard length reaches,
    # no hardware data) hold none: set aside too, so the check does not stop on them
    for j in [j for j in joints if j.nominal is None and j.bolt is None and j.nut is None and not j.washers]:
        joints.remove(j)
        aside.append(SetAside("", "not-a-bolt-hole", _unfinished_reason(j), j))
    number(joints, aside)
    used = {j.bolt.part for j in joints if j.bolt} | {j.nut.part for j in joints if j.nut} | \
        {w.part for j in joints for w in j.washers}
    loose = [h.part for h in (*bolts, *nuts, *washers) if h.part not in used]
    stud_parts = {b.part for b in studs}
    findings = list(model.findings) + [Finding("info", a.code, f"{a.id}: {a.reason}") for a in aside]
    return ScanResult(source=model.source, model=model, joints=joints, bolts=bolts, nuts=nuts,
                      washers=washers, hole_count=len(holes), unmatched_hardware=loose,
                      headless=[h for h in headless if h.part not in stud_parts],
                      findings=findings, set_aside=aside, system=system)


def _clearance_for_alignment(layer, t, d: float) -> float:
    """The hole a layer gives the bolt to pass an offset, mm: as modelled, but a clamped hole drawn
    line to line with the bolt (at its nominal, or open) stands for a real clearance hole, taken
    as the ISO 273 / ASME B18.2.8 medium one of the size."""
    line_to_line = layer.open or abs(layer.hole_diameter - d) <= THREAD_MATCH_TOL
    if t is None or not line_to_line:
        return layer.hole_diameter
    try:
        return max(layer.hole_diameter, catalog.clearance_hole(t, "medium"))
    except InputError:
        return layer.hole_diameter


def _unfinished_reason(j: Joint) -> str:
    parts = ", ".join(dict.fromkeys(l.part for l in j.layers))
    return (f"coaxial holes of {parts} ({j.hole_diameter:.2f} mm, grip {j.grip:.1f} mm) with no fastener modelled "
            f"match only sizes no catalogue fastener can finish (no head, nut or standard length for the stack): "
            f"a pin, vent or feature hole, not a joint")


def _system_hint(j: Joint, default: str | None = None) -> str | None:
    for name in [l.part for l in j.layers] + ([j.bolt.part] if j.bolt else []):
        low = name.lower()
        if "unc" in low or "unf" in low or "inch" in low:
            return "inch"
    return default


def _resolve_nominal(j: Joint, default_system: str | None = None):
    """The thread of the joint: modelled bolt (name hint cross-checked), nut, or holes."""
    if j.bolt is not None:
        b = j.bolt
        j.nominal_source = "bolt"
        named = _named_thread(b)
        if named is not None and thread_fits_diameter(named, b.d):
            if abs(named.d - b.d) > 0.03 * named.d:
                j.findings.append(Finding("info", "modelled-diameter",
                                          f"{b.part}: the shank is modelled at {b.d:.2f} mm, not the nominal "
                                          f"{named.d:g} mm; size {named.designation} from its name"))
            return named
        hint = b.hint
        by_bore = _thread_by_bore(j, default_system) if named is None else None
        if by_bore is not None:
            return by_bore
        t = thread_for_diameter(b.d, "inch" if (hint and "-" in hint.designation) else _system_hint(j, default_system))
        if t is None:
            t = thread_for_diameter(b.d)
        if named is not None:
            j.findings.append(Finding("warn", "name-mismatch",
                                      f"{b.part}: name says {named.designation} but the shank is "
                                      f"{b.d:.2f} mm ({t.designation if t else 'no standard size'})"))
        return t
    preferred = _system_hint(j, default_system)
    tapped = [l for l in j.layers if l.role == "tapped"]
    clear = [l for l in j.layers if l.role != "tapped"]
    clearance_fits = ("fine", "medium", "coarse", "close", "normal", "loose")
    probes = []
    if j.nut is not None:
        named = _named_thread(j.nut)
        if named is not None and (thread_fits_diameter(named, j.nut.d)
                                  or abs(catalog.tap_drill(named) - j.nut.d) <= SIZE_MATCH_TOL):
            j.nominal_source = "nut"       # the nut's name decides where its bore fits two sizes
            return named
        probes.append((j.nut.d, ("nominal", "tap drill"), "nut"))
    if clear:
        probes.append((j.hole_diameter, clearance_fits, "clearance hole"))
    if tapped:
        probes.append((tapped[0].hole_diameter, ("nominal", "tap drill"), "tapped hole"))
    # the preferred system first (a model written in inches), then any; never a size the
    # catalog cannot finish (no nut for a through joint, no head of the kind, no standard
    # length long enough: an M1.6 clearance hole through a 380 mm stack is no bolt hole)
    # each probe in the preferred system first, then in any: a clearance hole that is standard in
    # the other system outweighs a tapped bore that happens to be a nominal size in this one
    for diameter, kinds, what in probes:
        for system in dict.fromkeys((preferred, None)):
            for t, how in catalog.nominal_from_hole(diameter, system):
                if how in kinds and t.series in ("coarse", "UNC") and _can_finish(j, t, inferred_head(j, t)):
                    j.nominal_source = what
                    return _pitch_by_tapped_bore(j, t, inferred_head(j, t))
    return None


#: a bore matches a thread's tap drill within this, mm (as stacks.THREAD_MATCH_TOL)
SIZE_MATCH_TOL = 0.05


def _named_thread(b):
    """The thread a bolt's (or nut's) name states, or None."""
    if b.hint is None:
        return None
    try:
        return catalog.thread(b.hint.designation)
    except InputError:
        return None


#: a modelled length agrees with the name's within this, mm (rounding of the exporting system;
#: the corpus runner counts a bolt "as named" with the same tolerance)
NAME_LENGTH_TOL = 0.6
#: head kinds a name may give for the same shape (ISO 1580 and ISO 7045 pan heads; a heavy hex
#: head is a hex head)
_SAME_HEAD = {"pan slotted": "pan", "heavy hex": "hex"}


def _hardware_size_findings(j: Joint, t) -> None:
    """A nut's or washer's name stating another size than the joint's: one warn finding each."""
    for part, hint in [(j.nut.part, j.nut.hint)] if j.nut is not None else []:
        _size_disagrees(j, part, hint, t, "nut")
    for w in j.washers:
        _size_disagrees(j, w.part, w.hint, t, "washer")


def _size_disagrees(j: Joint, part: str, hint, t, what: str) -> None:
    if hint is None:
        return
    try:
        said = catalog.thread(hint.designation)
    except InputError:
        return
    if catalog.size_label(said) != catalog.size_label(t):
        j.findings.append(Finding("warn", "name-mismatch",
                                  f"{part}: name says a {hint.designation} {what} but the joint is {t.designation}"))


def _designation_findings(j: Joint, t) -> None:
    """The bolt's name against its shape: length and head kind (the size in _resolve_nominal);
    each disagreement one warn finding stating both."""
    b = j.bolt
    desig = b.designation
    if desig is None or b.nut_head:
        return
    said = desig.size or desig.named_standard or desig.text
    if desig.length is not None and abs(desig.length - b.length) > NAME_LENGTH_TOL:
        what = "overall" if b.head_kind == "countersunk" else "from the bearing face to the tip"
        j.findings.append(Finding("warn", "name-mismatch",
                                  f"{b.part}: name says {said} but the modelled length is {b.length:.2f} mm ({what})"))
    if desig.family == "bolt" and desig.kind and \
            _SAME_HEAD.get(desig.kind, desig.kind) != _SAME_HEAD.get(b.head_kind, b.head_kind):
        try:
            if t is not None:
                catalog.head(t, desig.kind)
            gap = None
        except InputError as exc:
            gap = str(exc)
        if gap:
            # the name's kind may well be right: the catalogue cannot dimension it at this size
            j.findings.append(Finding("warn", "catalog-gap",
                                      f"{b.part}: name says a {desig.kind} head ({desig.said}), but {gap}; "
                                      f"read as the nearest kind it has, {b.head_kind}"))
        else:
            j.findings.append(Finding("warn", "name-mismatch",
                                      f"{b.part}: name says a {desig.kind} head ({desig.said}) "
                                      f"but the shape is a {b.head_kind} head"))
    elif desig.family in ("nut", "washer", "set screw", "stud"):
        j.findings.append(Finding("warn", "name-mismatch",
                                  f"{b.part}: name says a {desig.family} but the shape is a {b.head_kind}-head bolt"))


def inferred_head(j: Joint, t) -> str:
    """The head kind of a screw that is not modelled: socket in a counterbore, else hex where the
    catalogue has a hex head of the size, else socket (the numbered inch sizes have no ASME
    B18.2.1 hex bolt: their hex-free screws are socket or button heads)."""
    if any(l.counterbore for l in j.layers[:1]):
        return "socket"
    return "hex" if not catalog.hardware_gaps(t, "hex", with_nut=False) else "socket"


def _thread_by_bore(j: Joint, system: str | None):
    """The thread of a modelled screw threaded into a bore: of the threads the shank's diameter
    fits, the one whose tap drill or minor diameter the bore is (e.g. #10-32, not #10-24, in the
    #21 drill's 4.04 mm hole), the file's system first; None when the bore says nothing."""
    tapped = [l for l in j.layers if l.role == "tapped"]
    if not tapped or j.insert is not None and j.threaded_bore == "name":
        return None
    bore = tapped[0].hole_diameter
    best = None
    for t in catalog.thread_sizes():
        if abs(t.d - j.bolt.d) > SIZE_TOL * t.d:
            continue
        err = min(abs(catalog.tap_drill(t) - bore), abs(t.D1 - bore))
        if err <= THREAD_MATCH_TOL:
            rank = (round(err, 6), t.system != system, t.series not in ("coarse", "UNC"))
            if best is None or rank < best[0]:
                best = (rank, t)
    return best[1] if best else None


def _pitch_by_tapped_bore(j: Joint, t, head: str):
    """The thread of size `t` whose tap drill (or minor diameter) the joint's tapped bore is: the
    holes give the size, a tapped bore the pitch (a 4.04 mm bore under a #10 clearance is the
    #21 drill of #10-32, not #10-24); `t` itself when the bore says nothing else."""
    tapped = [l for l in j.layers if l.role == "tapped"]
    if not tapped:
        return t
    for other, how in catalog.nominal_from_hole(tapped[0].hole_diameter, t.system, THREAD_MATCH_TOL):
        if how == "tap drill" and catalog.size_label(other) == catalog.size_label(t) and _can_finish(j, other, head):
            return other
    return t


def _can_finish(j: Joint, t, head: str) -> bool:
    """True when the catalog can finish a joint of thread `t`: head, nut (through, none
    modelled) and a standard length that reaches what the stack needs (`required_length`)."""
    if catalog.hardware_gaps(t, head, with_nut=j.kind == "through" and j.nut is None):
        return False
    if j.kind == "through":
        nut_h = j.nut.height if j.nut else catalog.nut(t).height
        needed = required_length(j.grip, d=t.d, pitch=t.pitch, tapped=False, nut_height=nut_h)
    else:
        tl = j.layers[-1]
        needed = required_length(j.grip, d=t.d, pitch=t.pitch, tapped=True, tapped_depth=tl.end - tl.start,
                                 tapped_material=tl.material_hint)
    try:
        catalog.shortest_length(t, needed, head)
    except InputError:
        return False
    return True


def add_findings(j: Joint, system: str | None = None, thread=None) -> None:
    """Stack-up findings of one joint (appended to j.findings), nominal and bolt length.

    `system` ("inch" / "metric" / None) is preferred when a size is inferred from holes
    (a model written in inches suggests inch fasteners).  `thread` (a catalogue thread) is a
    size the job names for a stack the scan set aside: it is used as it is.
    """
    if thread is not None:
        j.nominal_source = "job"
    t = thread if thread is not None else _resolve_nominal(j, system)
    j.nominal = t.designation if t else None
    if t is not None:
        _hardware_size_findings(j, t)
    if j.bolt is not None:
        _designation_findings(j, t)
        if j.bolt.nut_head:
            j.findings.append(Finding("info", "stud", f"{j.bolt.part} is a stud; the nut {j.bolt.nut_head} is its head"))
    d = t.d if t else (j.bolt.d if j.bolt else None)
    add = j.findings.append
    if j.bolt is None:
        if j.nominal_source == "job":
            add(Finding("info", "no-hardware", f"no bolt modelled; size {t.designation} named by the job "
                                               f"for holes the scan set aside"))
        elif t is not None:
            add(Finding("info", "no-hardware",
                        f"no bolt modelled; size {t.designation} inferred from the {j.nominal_source} "
                        f"({_hole_for(j):.2f} mm)"))
        else:
            add(Finding("warn", "no-hardware",
                        f"no bolt modelled and hole {j.hole_diameter:.2f} mm matches no standard size"))
    # misalignment: pairwise offset beyond the sum of the radial clearances
    if d is not None:
        failing = []

        def radial(layer) -> float:
            if layer.role == "tapped":
                return 0.0
            return max(0.0, (_clearance_for_alignment(layer, t, d) - d) / 2)

        # a washer centres itself on the bolt: only the parts' holes must line up
        fixed = [l for l in j.layers if l.role != "washer"]
        for i, a in enumerate(fixed):
            for b in fixed[i + 1:]:
                ca, cb = radial(a), radial(b)
                off = math.dist(a.position, b.position)
                if off > ca + cb + LINEAR_TOL:
                    # name a pair of clamped parts rather than a washer when both fail
                    members = a.role != "washer" and b.role != "washer"
                    failing.append(((members, off - ca - cb), a, b, off, ca + cb))
        if failing:
            _, a, b, off, allowed = max(failing, key=lambda f: f[0])
            add(Finding("fail", "misaligned",
                        f"holes of {a.part} and {b.part} are {off:.3f} mm off axis; "
                        f"the bolt passes {allowed:.3f} mm"))
    if t is None:
        return
    pitch = t.pitch
    kind = j.bolt.head_kind if j.bolt else inferred_head(j, t)
    # a size the catalogue half-knows: say what is missing (the nut of a through joint below)
    gaps = [g for g in catalog.hardware_gaps(t, kind, with_nut=False)
            if j.bolt is None or not g.endswith("lengths")]    # a modelled bolt has its own length
    if gaps:
        add(Finding("warn", "catalog-gap", f"no {' and no '.join(gaps)} data for {t.designation} in the catalog: "
                                           f"the checks that need it are skipped"))
    # interference: bolt wider than a clearance hole
    if j.bolt is not None:
        for l in j.layers:
            if l.role != "tapped" and j.bolt.d > l.hole_diameter + LINEAR_TOL:
                add(Finding("fail", "interference",
                            f"{j.bolt.part} ({j.bolt.d:.2f} mm) does not pass the {l.hole_diameter:.2f} mm hole of {l.part}"))
    # non-standard clearance holes
    std = {}
    for fit in ("fine", "medium", "coarse"):
        try:
            std[fit] = catalog.clearance_hole(t, fit)
        except InputError:
            pass
    for l in j.layers:
        if l.role == "member" and std and not l.open and \
                not any(abs(l.hole_diameter - v) <= CLEARANCE_MATCH_TOL for v in std.values()):
            series = ", ".join(f"{k} {v:g}" for k, v in std.items())
            add(Finding("warn", "hole-not-standard",
                        f"{l.part}: hole {l.hole_diameter:.2f} mm is not a standard clearance for {t.designation} ({series})"))
    # counterbore / spot face seat too small for the head (or washer) under it
    first = j.layers[0]
    seat_layer = next((l for l in j.layers if l.counterbore), None)
    if seat_layer is not None:
        if first.role == "washer" and j.washers:
            need, what = j.washers[0].outer, f"washer {j.washers[0].part}"
        elif j.bolt is not None:
            w = j.bolt.head_width
            need = w * HEX_CORNER_FACTOR if j.bolt.head_kind == "hex" else w
            what = f"head of {j.bolt.part}"
        else:
            try:
                hd = catalog.head(t, kind)
                need = hd.width * HEX_CORNER_FACTOR if kind == "hex" else hd.width
                what = f"{kind} head of {t.designation} ({hd.source.split(';')[0]})"
            except InputError as exc:
                add(Finding("warn", "catalog-gap", f"{exc}: the seat of {seat_layer.part} is not checked"))
                need, what = 0.0, ""
        if need > seat_layer.counterbore + LINEAR_TOL:
            add(Finding("fail", "seat-too-small",
                        f"{what} needs {need:.2f} mm but the counterbore of {seat_layer.part} is "
                        f"{seat_layer.counterbore:.2f} mm"))
    # bolt length: protrusion, engagement, shank reaching the nut, bottoming
    try:
        nut_h = j.nut.height if j.nut else catalog.nut(t).height
    except InputError as exc:
        if j.kind == "through":
            add(Finding("warn", "catalog-gap", f"{exc}: the bolt length past the nut is not checked"))
            return
        nut_h = 0.0    # a tapped or blind joint has no nut
    if j.kind == "tapped":
        tl = j.layers[-1]
        need_eng = minimum_engagement(t.d, tl.material_hint)
        if j.insert is not None:
            # the screw must engage the insert's thread by the rule of its material, or all of it
            need_eng = min(need_eng, j.insert.length)
        # j.grip of a tapped joint is measured to the tapped part (gaps included)
        needed = required_length(j.grip, d=t.d, pitch=pitch, tapped=True, tapped_depth=tl.end - tl.start,
                                 tapped_material=tl.material_hint)
        if j.bolt is not None:
            eng = j.bolt.length - tl.start
            if eng < need_eng - LINEAR_TOL:
                add(Finding("fail", "bolt-short",
                            f"{j.bolt.part}: thread engagement {eng:.2f} mm in {tl.part}, "
                            f"needs {need_eng:.2f} mm ({need_eng / t.d:g} d, {tl.material_hint or 'steel'})"))
            if not tl.through and j.bolt.length > tl.end + LINEAR_TOL:
                add(Finding("fail", "bolt-long",
                            f"{j.bolt.part} bottoms in the blind hole of {tl.part}: "
                            f"{j.bolt.length - tl.end:.2f} mm too long"))
    else:
        needed = required_length(j.grip, d=t.d, pitch=pitch, tapped=False, nut_height=nut_h)
        if j.bolt is not None:
            nut_end = (j.layers[-1].end + nut_h) if j.nut is None else _nut_end(j)
            assumed = "" if j.nut else f" (no nut modelled: {nut_h:.2f} mm {t.designation} nut assumed)"
            protr = j.bolt.length - nut_end
            if protr < MIN_PROTRUSION_PITCHES * pitch - LINEAR_TOL:
                where = (f"protrudes only {protr:.2f} mm past the nut" if protr >= 0
                         else f"ends {-protr:.2f} mm inside the nut")
                add(Finding("fail", "bolt-short",
                            f"{j.bolt.part}: {where}; needs at least "
                            f"{MIN_PROTRUSION_PITCHES * pitch:.2f} mm (one pitch) past it{assumed}"))
            elif protr > MAX_PROTRUSION_DIAMETERS * t.d + LINEAR_TOL:
                add(Finding("warn", "bolt-long",
                            f"{j.bolt.part}: protrudes {protr:.2f} mm past the nut (limit {MAX_PROTRUSION_DIAMETERS:g} d = "
                            f"{MAX_PROTRUSION_DIAMETERS * t.d:.2f} mm)"))
    # thread lengths by the standard rule of the head kind (ISO 4014 / ISO 4762; ASME B18.2.1 / B18.3)
    if j.bolt is not None and j.bolt.head_kind in ("hex", "socket"):
        b = catalog.thread_length(t, j.bolt.length, j.bolt.head_kind)
        shank = j.bolt.length - b
        if shank > j.grip + LINEAR_TOL and j.kind != "blind":
            where = "the nut" if j.kind == "through" else f"the tapped hole of {j.layers[-1].part}"
            add(Finding("fail", "shank-in-nut" if j.kind == "through" else "shank-in-thread",
                        f"{j.bolt.part}: unthreaded shank {shank:.2f} mm (thread {b:.2f} mm by the standard rule) "
                        f"is longer than the grip {j.grip:.2f} mm and reaches {where}"))
    if kind == "countersunk":
        add(Finding("info", "grip", f"grip {j.grip:.3f} mm from the plate surface; a {t.designation} "
                                    f"countersunk screw needs {needed:.2f} mm overall (no countersunk "
                                    "length series in the catalog)"))
        return
    try:
        j.shortest_length = catalog.shortest_length(t, needed, kind)
        what = (f"shortest standard {t.designation} {kind} length {j.shortest_length:g} mm "
                f"(needs {needed:.2f} mm: grip" + (f" + nut {nut_h:.2f} + {SIZING_PROTRUSION_PITCHES:g} pitches)"
                                                    if j.kind != "tapped" else " + engagement)"))
    except InputError as exc:
        what = f"no standard {t.designation} length fits {needed:.2f} mm ({exc})"
    add(Finding("info", "grip", f"grip {j.grip:.3f} mm; {what}"))


def _hole_for(j: Joint) -> float:
    if j.nominal_source == "tapped hole":
        return next(l.hole_diameter for l in j.layers if l.role == "tapped")
    if j.nominal_source == "nut" and j.nut:
        return j.nut.d
    return j.hole_diameter


def _nut_end(j: Joint) -> float:
    """End of the nut (away from the bearing face) along the joint axis, from the head bearing face."""
    import numpy as np

    e = np.array(j.direction)
    p0 = np.array(j.point)
    a = float(np.dot(j.nut.ref + j.nut.t0 * j.nut.direction - p0, e))
    b = float(np.dot(j.nut.ref + j.nut.t1 * j.nut.direction - p0, e))
    return max(a, b)


def _r(x: float, nd: int = 6) -> float:
    v = round(float(x), nd)
    return 0.0 if v == 0 else v


def scan_to_json(result: ScanResult) -> dict:
    """The scan document of DESIGN.md (validates against schemas/scan.schema.json)."""
    joints = []
    for j in result.joints:
        joints.append({
            "id": j.id,
            "kind": j.kind,
            "axis": {"point": [_r(c) for c in j.point], "direction": [_r(c, 9) for c in j.direction]},
            "hole_diameter": _r(j.hole_diameter),
            "nominal": j.nominal,
            "grip": _r(max(j.grip, 0.0)),
            "layers": [{"part": l.part, "role": l.role, "thickness": _r(l.thickness),
                        "start": _r(l.start), "end": _r(l.end)} for l in j.layers if l.thickness > 0],
            "gaps": [{"between": list(g.between), "size": _r(g.size)} for g in j.gaps],
            "hardware": {
                "bolt": ({"part": j.bolt.part, "d": _r(j.bolt.d), "length": _r(j.bolt.length),
                          "head": j.bolt.head_kind, **({"stud_nut": j.bolt.nut_head} if j.bolt.nut_head else {})}
                         if j.bolt else None),
                "nut": j.nut.part if j.nut else None,
                "washers": [w.part for w in j.washers],
            },
            "findings": [{"severity": f.severity, "code": f.code, "message": f.message} for f in j.findings],
        })
    hardware = [{"part": h.part, "kind": h.kind, "d": _r(h.d), "length": _r(h.length),
                 "nominal": h.hint.designation if h.hint else None} for h in result.headless]
    aside = [{"id": a.id, "code": a.code, "reason": a.reason,
              "axis": {"point": [_r(c) for c in a.joint.point], "direction": [_r(c, 9) for c in a.joint.direction]},
              "hole_diameter": _r(a.joint.hole_diameter), "parts": a.parts} for a in result.set_aside]
    return {"joints": joints, "hardware": hardware,
            "findings": [{"severity": f.severity, "code": f.code, "message": f.message} for f in result.findings],
            "set_aside": aside}


def scan_table(result: ScanResult) -> str:
    """A readable table: one block per joint (id, kind, size, grip, layers, findings)."""
    lines = [f"{result.source}: {len(result.model.parts)} parts, {len(result.joints)} joints"]
    lines += [f"{f.severity:<5} {f.code:<18} {f.message}" for f in result.findings]
    head = f"{'id':<4} {'kind':<8} {'size':<16} {'head':<11} {'hole':>7} {'grip':>8}  layers"
    lines += [head, "-" * len(head)]
    for j in result.joints:
        layers = " | ".join(f"{l.part} {l.thickness:.2f}" + ("" if l.role == "member" else f" ({l.role})")
                            for l in j.layers)
        size = j.nominal or "?"
        if j.bolt:
            size += f"x{j.bolt.length:g}"
        kind = ("stud" if j.bolt.nut_head else j.bolt.head_kind) if j.bolt else "-"
        lines.append(f"{j.id:<4} {j.kind:<8} {size:<16} {kind:<11} {j.hole_diameter:>7.2f} {j.grip:>8.3f}  {layers}")
        for f in j.findings:
            lines.append(f"{'':<4} {f.severity:<5} {f.code:<18} {f.message}")
    if result.set_aside:
        lines.append(f"set aside (no joint; a [[fasteners]] rule naming the id and a size brings one in): "
                     + ", ".join(f"{a.id} ({a.code})" for a in result.set_aside))
    if result.unmatched_hardware:
        lines.append("hardware in no joint: " + ", ".join(result.unmatched_hardware))
    for h in result.headless:
        size = h.hint.designation if h.hint else f"{h.d:.2f} mm"
        lines.append(f"{h.kind}: {h.part} ({size} x {h.length:.2f} mm; not a clamping joint)")
    fails = sum(f.severity == "fail" for j in result.joints for f in j.findings)
    lines.append(f"{fails} failing finding(s)")
    return "\n".join(lines) + "\n"
