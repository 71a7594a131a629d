"""Resolving a joint for the engine: the job's settings + the layers (+ what the model measured)
→ :class:`~geomjoint.mechanics.joint.JointSpec`, the same steps for typed-in and model joints.

The steps, each a function of its own: the fastener (designation, grade, head → catalogue
numbers), the bearing and hole diameters (job, else model, else catalogue), the bolt length
(the job's or the model's, else the shortest standard length that reaches), the preload,
fatigue and VDI 2230-1 specs.  A model joint also gets its fastener chosen
(:func:`choose_fastener`), its layers' materials and its loads; one that cannot be resolved is
set aside as an :class:`UnanalysedJoint` (:func:`resolve_model_joints`).  The job file's own
reading (keys, values with their units, rule patterns) stays in :mod:`geomjoint.job`.
"""
from __future__ import annotations

import fnmatch
from dataclasses import dataclass, field, replace
from typing import Any

from geomjoint import catalog
from geomjoint.errors import InputError, did_you_mean
from geomjoint.job import (  # the job file's value readers (one home for how a value is read)
    ABSOLUTE_ZERO_C,
    BEARING_FACE_KEYS,
    CONE_ANGLE_RANGE_DEG,
    ENDURANCE_MODES,
    FE_BEARINGS,
    FRICTION_KEYS,
    HEAD_KINDS,
    MAX_PRELOAD_FRACTION,
    METHODS,
    NO_SERVICE_LOAD_NOTE,
    NUT_FACTOR_RANGE,
    REQUIRED_KEYS,
    SOURCE_CATALOGUE,
    SOURCE_JOB,
    SOURCE_MODEL,
    SURFACES,
    TEMPERATURE_KEYS,
    THREAD_KINDS,
    Job,
    _bool,
    _check_keys,
    _choice,
    _force,
    _friction,
    _length,
    _number,
    _typed_layers,
    entry_for_part,
    is_excluded,
    joint_load,
    load_rules_cover,
    material_for_part,
    material_layer_fields,
    settings_for,
)
from geomjoint.mechanics.bolt import required_length
from geomjoint.catalog.types import Deviation
from geomjoint.mechanics.joint import (
    CRITERIA,
    STACKUP_METHODS,
    STIFFNESS_METHODS,
    FastenerSpec,
    FatigueSpec,
    InsertSpec,
    JointSpec,
    LayerSpec,
    ROOM_TEMPERATURE,
    PreloadSpec,
    StackupSpec,
    VdiSpec,
)
from geomjoint.mechanics.stackup import stackup, stackup_check
from geomjoint.mechanics.vdi import ROUGHNESS_BANDS, ROUGHNESS_CLASSES, roughness_class
from geomjoint.units import parse_percent, parse_quantity


# ----------------------------------------------------------------------------- preload, fatigue, VDI specs

def _preload_spec(s: dict[str, Any], where: str, friction: dict[str, float]) -> PreloadSpec:
    scatter = _number(s.get("scatter", 1.0), f"{where}.scatter", 1.0, None)
    nut_factor = None
    if "nut_factor" in s:
        nut_factor = _number(s["nut_factor"], f"{where}.nut_factor", *NUT_FACTOR_RANGE)
    common = dict(nut_factor=nut_factor, friction_thread=friction.get("thread"),
                  friction_head=friction.get("head"), scatter=scatter)
    if "torque" in s:
        torque = parse_quantity(s["torque"], "torque", where=f"{where}.torque")
        if torque <= 0:
            raise InputError("must be greater than zero", where=f"{where}.torque")
        if nut_factor is None and ("thread" not in friction or "head" not in friction):
            raise InputError("a torque needs 'nut_factor' or friction = { thread, head }", where=f"{where}.torque")
        return PreloadSpec("torque", torque, **common)
    value = s["preload"]
    key = f"{where}.preload"
    if isinstance(value, str) and value.strip().lower() in ("none", "0", "0%"):
        return PreloadSpec("none", 0.0, **common)
    if isinstance(value, str) and value.strip().endswith("%"):
        fraction = parse_percent(value, where=key)
        if not 0 <= fraction <= MAX_PRELOAD_FRACTION:
            raise InputError(f"{value!r} is outside 0-{MAX_PRELOAD_FRACTION * 100:g} % of the proof load", where=key)
        return PreloadSpec("proof_fraction" if fraction > 0 else "none", fraction, **common)
    force = _force(value, key)
    if force < 0:
        raise InputError("must not be negative", where=key)
    return PreloadSpec("force" if force > 0 else "none", force, **common)


def _friction_table(s: dict[str, Any], where: str) -> dict[str, float]:
    if "friction" not in s:
        return {}
    table = _check_keys(s["friction"], FRICTION_KEYS, f"{where}.friction")
    return {k: _friction(v, f"{where}.friction.{k}") for k, v in table.items()}


def _temperature(value: Any, where: str) -> float:
    t = parse_quantity(value, "temperature", where=where)
    if t <= ABSOLUTE_ZERO_C:
        raise InputError(f"{value!r} is at or below absolute zero", where=where)
    return t


def _temperatures(s: dict[str, Any], where: str) -> tuple[float, float]:
    """(assembly, service) in degC; a single value is the service temperature."""
    value = s.get("temperature")
    if value is None:
        return ROOM_TEMPERATURE, ROOM_TEMPERATURE
    if isinstance(value, dict):
        table = _check_keys(value, TEMPERATURE_KEYS, f"{where}.temperature")
        assembly = (_temperature(table["assembly"], f"{where}.temperature.assembly")
                    if "assembly" in table else ROOM_TEMPERATURE)
        service = (_temperature(table["service"], f"{where}.temperature.service")
                   if "service" in table else ROOM_TEMPERATURE)
        return assembly, service
    return ROOM_TEMPERATURE, _temperature(value, f"{where}.temperature")


def _required(s: dict[str, Any], where: str) -> dict[str, float]:
    """The required factors the job sets; a check the job does not name keeps its engine's
    default (1.0 for the textbook checks, VDI 2230-1's recommended margins for the VDI ones)."""
    required: dict[str, float] = {}
    if "required" in s:
        table = _check_keys(s["required"], REQUIRED_KEYS, f"{where}.required")
        for k, v in table.items():
            required[k] = _number(v, f"{where}.required.{k}", 0.0, None)
    return required



# ----------------------------------------------------------------------------- the joint spec

@dataclass(frozen=True)
class ResolvedFastener:
    spec: FastenerSpec
    thread: Any
    head: Any


def fastener_for(s: dict[str, Any], where: str) -> ResolvedFastener:
    """Resolve fastener designation and grade to a FastenerSpec (length left to the caller)."""
    if "fastener" not in s:
        raise InputError("no fastener given (set it in [defaults] or on the joint)", where=f"{where}.fastener")
    try:
        thread = catalog.thread(s["fastener"])
    except InputError as exc:
        raise InputError(str(exc), where=f"{where}.fastener") from None
    try:
        grade = catalog.grade(s["grade"], thread.d)
    except InputError as exc:
        raise InputError(str(exc), where=f"{where}.grade") from None
    head_kind = _choice(s["head"], HEAD_KINDS, f"{where}.head")
    head = catalog.head(thread, head_kind)
    spec = FastenerSpec(
        designation=thread.designation, system=thread.system, d=thread.d, pitch=thread.pitch,
        d2=thread.d2, d3=thread.d3, D1=thread.D1, stress_area=thread.stress_area,
        grade=grade.name, proof=grade.proof, yield_strength=grade.yield_strength, tensile=grade.tensile,
        fully_threaded=_bool(s["fully_threaded"], f"{where}.fully_threaded"),
        threads=_choice(s["threads"], THREAD_KINDS, f"{where}.threads"), head=head_kind,
        rolled_after_heat_treatment=_bool(s.get("rolled_after_heat_treatment", False),
                                          f"{where}.rolled_after_heat_treatment"),
    )
    if "thread_length" in s:
        spec = replace(spec, thread_length=_length(s["thread_length"], f"{where}.thread_length"))
    return ResolvedFastener(spec, thread, head)


def _bearing_faces(value: Any, where: str, tapped: bool) -> tuple[float | None, float | None]:
    """``bearing_diameter`` → (head face, nut face), mm; None where the job leaves a face alone.

    One value is every bearing face of the joint (head and nut of a through joint, the head of
    a tapped one); ``{ head = "...", nut = "..." }`` sets each face on its own.
    """
    if isinstance(value, dict):
        table = _check_keys(value, BEARING_FACE_KEYS, where)
        if not table:
            raise InputError("give head and/or nut, e.g. { head = \"18 mm\", nut = \"16.6 mm\" }", where=where)
        if tapped and "nut" in table:
            raise InputError("a tapped joint has no nut face; give only head", where=f"{where}.nut")
        head = _length(table["head"], f"{where}.head") if "head" in table else None
        nut = _length(table["nut"], f"{where}.nut") if "nut" in table else None
        return head, nut
    both = _length(value, where)
    return both, None if tapped else both


def _bearing_diameters(s: dict[str, Any], geometry: dict[str, float], layers: list[LayerSpec],
                       fastener: ResolvedFastener, tapped: bool, where: str
                       ) -> tuple[float, str, float | None, str | None]:
    """(head d_w, its source, nut d_w, its source): the job's ``bearing_diameter``, else the
    modelled hardware, else the catalogue (washer outside diameter when a washer is clamped,
    else the head's / nut's bearing diameter). The nut face is None for a tapped joint."""
    thread = fastener.thread
    head, head_source = geometry.get("bearing_diameter"), SOURCE_MODEL
    if head is None:
        # the catalogue washer only where a washer is clamped: a size without washer data still resolves
        head = catalog.washer(thread).outer if layers[0].role == "washer" else fastener.head.bearing_diameter
        head_source = SOURCE_CATALOGUE
    far: float | None = None
    far_source: str | None = None
    if not tapped:
        far, far_source = geometry.get("far_bearing_diameter"), SOURCE_MODEL
        if far is None:
            far = catalog.washer(thread).outer if layers[-1].role == "washer" else catalog.nut(thread).bearing_diameter
            far_source = SOURCE_CATALOGUE
    if "bearing_diameter" in s:
        job_head, job_nut = _bearing_faces(s["bearing_diameter"], f"{where}.bearing_diameter", tapped)
        if job_head is not None:
            head, head_source = job_head, SOURCE_JOB
        if job_nut is not None:
            far, far_source = job_nut, SOURCE_JOB
    return head, head_source, far, far_source


def _roughness(value: Any, where: str) -> str:
    """``roughness`` → the VDI 2230-1 roughness class of the embedding table.

    A mean roughness depth R_z with its unit ("16 um"), a band name ("Rz<10", "Rz10-40",
    "Rz40-160"), or the older class names fine | medium | coarse, which are the same bands.
    """
    if isinstance(value, str):
        text = value.strip()
        if text in ROUGHNESS_CLASSES:
            return text
        band = ROUGHNESS_BANDS.get(text.replace(" ", "").replace("um", "").replace("µm", ""))
        if band:
            return band
        if text[:2] in ("Rz", "RZ", "rz"):
            text = text[2:].strip()
        if any(ch.isdigit() for ch in text):
            rz_um = parse_quantity(text, "length", where=where) * 1000.0
            try:
                return roughness_class(rz_um)
            except InputError as exc:
                raise InputError(str(exc), where=where) from None
    choices = (*ROUGHNESS_BANDS, *ROUGHNESS_CLASSES)
    raise InputError(f"{value!r} is not a mean roughness depth R_z such as \"16 um\" nor one of "
                     f"{', '.join(choices)}{did_you_mean(str(value), choices)}", where=where)


#: member stiffness when the job names none: the frustum for through joints; for tapped joints
#: the VDI 2230-1 tapped-joint body, the closed form nearest the FE on the cases of
#: docs/tapped_stiffness.md (within 12 % on all five; the Table 8-7 frustum is 17 % off on one)
DEFAULT_STIFFNESS = JointSpec.member_stiffness
TAPPED_DEFAULT_STIFFNESS = "vdi"


def stiffness_method(s: dict[str, Any], tapped: bool, where: str, notes: list[str]) -> tuple[str, str]:
    """(method, member stiffness method): the job's, else the default for the joint's kind; the
    VDI 2230-1 chain always uses its own body."""
    method = _choice(s["method"], METHODS, f"{where}.method")
    default_stiffness = TAPPED_DEFAULT_STIFFNESS if tapped else DEFAULT_STIFFNESS
    stiffness = _choice(s.get("member_stiffness", default_stiffness), STIFFNESS_METHODS, f"{where}.member_stiffness")
    if method == "vdi" and stiffness != "vdi" and "member_stiffness" in s:
        # the VDI 2230-1 chain is built on its own substitute deformation body
        notes.append(f"method vdi: member stiffness by the VDI substitute deformation body, not {stiffness}")
    return method, "vdi" if method == "vdi" else stiffness


def cone_angle_of(s: dict[str, Any], where: str) -> float:
    """The pressure-cone half angle, deg, within CONE_ANGLE_RANGE_DEG."""
    cone_angle = parse_quantity(s["cone_angle"], "angle", where=f"{where}.cone_angle")
    lo_angle, hi_angle = CONE_ANGLE_RANGE_DEG
    if not lo_angle <= cone_angle <= hi_angle:
        raise InputError(f"{s['cone_angle']!r} is outside {lo_angle:g}-{hi_angle:g} deg", where=f"{where}.cone_angle")
    return cone_angle


#: a hole is narrower than its bolt only by more than this, mm: a hole modelled line to line
#: with the bolt (5.0 mm for M5) reads back from a STEP file as 4.999999999999984 mm
HOLE_FIT_TOL = 1e-3


def hole_diameter_of(s: dict[str, Any], geometry: dict[str, float], thread, tapped: bool,
                     where: str) -> tuple[float, str]:
    """(hole diameter, its source): the job's, else the model's, else the catalogue clearance hole."""
    fit = _choice(s["hole_fit"], ("fine", "medium", "coarse"), f"{where}.hole_fit")
    hole, hole_source = geometry.get("hole_diameter"), SOURCE_MODEL
    if not hole:
        hole, hole_source = catalog.clearance_hole(thread, fit), SOURCE_CATALOGUE
    if "hole_diameter" in s:
        hole, hole_source = _length(s["hole_diameter"], f"{where}.hole_diameter"), SOURCE_JOB
    if hole < thread.d - HOLE_FIT_TOL and not tapped:
        raise InputError(f"hole diameter {hole:g} mm is smaller than the bolt ({thread.d:g} mm)",
                         where=f"{where}.hole_diameter")
    return hole, hole_source


def outside_diameter_of(s: dict[str, Any], bearing: float, where: str) -> float | None:
    """The job's ``outside_diameter`` (None: unbounded), larger than the bearing diameter."""
    if "outside_diameter" not in s:
        return None
    outside = _length(s["outside_diameter"], f"{where}.outside_diameter")
    if outside <= bearing:
        raise InputError("must be larger than the bearing diameter", where=f"{where}.outside_diameter")
    return outside


def bolt_length(s: dict[str, Any], geometry: dict[str, float], layers: list[LayerSpec], fastener: ResolvedFastener,
                tapped: bool, nut_height: float | None, where: str, notes: list[str]) -> float:
    """The job's length, else the model's, else the shortest standard length that reaches, mm.

    The length needed is the one rule of mechanics.bolt.required_length (through joint: grip,
    gaps, nut and protrusion; tapped joint: the clamped layers and the minimum engagement by
    the tapped part's material).
    """
    thread = fastener.thread
    length = geometry.get("length")
    if "length" in s:
        length = _length(s["length"], f"{where}.length")
    if length is not None:
        return length
    grip = sum(layer.thickness for layer in layers)
    needed = required_length(grip - layers[-1].thickness if tapped else grip, d=thread.d, pitch=thread.pitch,
                             tapped=tapped, gaps=geometry.get("gaps", 0.0), nut_height=nut_height,
                             tapped_depth=layers[-1].thickness, tapped_material=layers[-1].material)
    try:
        length = catalog.shortest_length(thread, needed, fastener.spec.head)
    except InputError as exc:
        raise InputError(str(exc), where=f"{where}.length") from None
    notes.append(f"bolt length {length:g} mm chosen: shortest standard length >= {needed:.1f} mm")
    return length


def fatigue_spec(s: dict[str, Any], service_temperature: float, where: str) -> FatigueSpec:
    """The fatigue settings: criterion, reliability, surface, endurance mode, an explicit S_e."""
    fatigue = FatigueSpec(
        criterion=_choice(s["criterion"], CRITERIA, f"{where}.criterion"),
        reliability=_number(s["reliability"], f"{where}.reliability", 0.0, 1.0, open_interval=True),
        surface=_choice(s["surface"], SURFACES, f"{where}.surface"),
        temperature=service_temperature,
        endurance=_choice(s["endurance"], ENDURANCE_MODES, f"{where}.endurance"),
        Se=parse_quantity(s["Se"], "stress", where=f"{where}.Se") if "Se" in s else None,
    )
    if fatigue.Se is not None and fatigue.Se <= 0:
        raise InputError("must be greater than zero", where=f"{where}.Se")
    return fatigue


def vdi_spec(s: dict[str, Any], friction: dict[str, float], preload: PreloadSpec,
             temperatures: tuple[float, float], where: str) -> VdiSpec:
    """The VDI 2230-1 inputs (friction, scatter, clamp load, roughness, load introduction, temperatures)."""
    assembly_t, service_t = temperatures
    return VdiSpec(
        friction_thread=friction.get("thread", VdiSpec.friction_thread),
        friction_head=friction.get("head", VdiSpec.friction_head),
        friction_interface=friction.get("interface", VdiSpec.friction_interface),
        scatter=preload.scatter if "scatter" in s else VdiSpec.scatter,
        clamp_required=_force(s["clamp_required"], f"{where}.clamp_required") if "clamp_required" in s else 0.0,
        roughness=_roughness(s.get("roughness", VdiSpec.roughness), f"{where}.roughness"),
        load_introduction=_number(s.get("load_introduction", VdiSpec.load_introduction),
                                  f"{where}.load_introduction", 0.0, 1.0),
        temperature_assembly=assembly_t, temperature_service=service_t,
    )


def build_spec(
    job: Job,
    joint_id: str,
    settings: dict[str, Any],
    layers: list[LayerSpec],
    *,
    tapped: bool,
    load: tuple[float, float, float],
    where: str,
    with_nut: bool = True,
    engagement: float | None = None,
    geometry: dict[str, float] | None = None,
    notes: tuple[str, ...] = (),
    own_load: bool = False,
    aliases: dict[str, tuple[str, ...]] | None = None,
) -> JointSpec:
    """Everything but the layers and load → JointSpec. Shared by typed-in and model joints.

    ``geometry`` may carry numbers the model measured (bearing_diameter, far_bearing_diameter,
    hole_diameter, length, nut_height); job keys still override them.  ``own_load``: the joint
    gives its own ``load`` (a typed-in joint), so it has a service load even without a rule.
    """
    s = settings
    geometry = geometry or {}
    fastener = fastener_for(s, where)
    thread = fastener.thread
    notes = list(notes)
    method, stiffness = stiffness_method(s, tapped, where, notes)
    temperatures = _temperatures(s, where)
    fatigue = fatigue_spec(s, temperatures[1], where)
    cone_angle = cone_angle_of(s, where)
    bearing, bearing_source, far, far_source = _bearing_diameters(s, geometry, layers, fastener, tapped, where)
    hole, hole_source = hole_diameter_of(s, geometry, thread, tapped, where)
    for face, diameter in (("head", bearing), ("nut", far)):
        if diameter is not None and diameter <= hole:
            raise InputError(f"{face} bearing diameter {diameter:g} mm is not larger than the hole ({hole:g} mm)",
                             where=f"{where}.bearing_diameter")
    outside = outside_diameter_of(s, bearing, where)
    nut_height = None if tapped else geometry.get("nut_height", catalog.nut(thread).height)
    length = bolt_length(s, geometry, layers, fastener, tapped, nut_height, where, notes)
    friction = _friction_table(s, where)
    preload = _preload_spec(s, where, friction)
    vdi = vdi_spec(s, friction, preload, temperatures, where)
    lo, hi, shear = load
    loaded = own_load or load_rules_cover(job, joint_id) or any(v > 0 for v in load)
    if not loaded:
        notes.append(NO_SERVICE_LOAD_NOTE)
    chosen = "length" not in s and geometry.get("length") is None
    spec = JointSpec(
        id=joint_id, fastener=replace(fastener.spec, length=length), layers=tuple(layers),
        bearing_diameter=bearing, hole_diameter=hole, far_bearing_diameter=far, tapped=tapped,
        bearing_source=bearing_source, far_bearing_source=far_source, hole_source=hole_source,
        outside_diameter=outside, method=method, member_stiffness=stiffness,
        fe_bearing=_choice(s.get("fe_bearing", "rigid"), FE_BEARINGS, f"{where}.fe_bearing"),
        compare_stiffness=_bool(s.get("compare_stiffness", False), f"{where}.compare_stiffness"), cone_angle=cone_angle,
        preload=preload, load_min=lo, load_max=hi, shear=shear, fatigue=fatigue, vdi=vdi,
        engagement=engagement, nut_height=nut_height, gaps=geometry.get("gaps", 0.0),
        required=_required(s, where), notes=tuple(notes), loaded=loaded, require_load=job.require_loads,
        stackup=stackup_spec(job, s, layers, fastener, length, nut_height, geometry, aliases or {}, where),
    )
    return length_for_limits(spec) if chosen and length is not None else spec


# ----------------------------------------------------------------------------- tolerances

#: the default general tolerance class of part thicknesses (issue 14 contract: ISO 2768-1 m)
DEFAULT_THICKNESS_TOLERANCE = "m"
#: signs that open a symmetric tolerance ("±0.2 mm", "+/-0.2 mm", "+-0.2 mm")
PLUS_MINUS = ("±", "+/-", "+-")
#: the word that asks for a projected tolerance zone in a position tolerance ("0.2 mm projected")
PROJECTED = "projected"
#: a modelled washer or nut within this of its standard's limits is taken as that standard's, mm
HARDWARE_MATCH_TOL = 0.05
#: how many standard lengths past the nominal choice the sizing tries for one that passes at the limits
LIMIT_SIZING_STEPS = 6


@dataclass(frozen=True)
class ThicknessRule:
    """A thickness tolerance as the job writes it: an ISO 2768-1 class, a plate class, or deviations."""

    kind: str                        # "class" | "plate" | "value"
    label: str                       # "ISO 2768-1 m", "EN 10029 A", "+0.2/-0.1 mm"
    tolerance_class: str = ""        # the ISO 2768-1 letter, or the plate class letter
    lower: float = 0.0
    upper: float = 0.0


def _unit_of(text: str) -> str:
    """The unit word at the end of ``text`` ("mm" of "-0.1 mm"), "" when it has none."""
    tail = text.rstrip()
    i = len(tail)
    while i > 0 and (tail[i - 1].isalpha() or tail[i - 1] in "µ\""):
        i -= 1
    return tail[i:]


def thickness_rule(value: Any, where: str) -> ThicknessRule:
    """``thickness_tolerance`` / a [tolerances] value → :class:`ThicknessRule`.

    An ISO 2768-1 class letter ("f", "m", "c", "v"), a plate standard and class ("EN 10029 A",
    "EN 10029 class B"), a symmetric value ("±0.2 mm", "+/-0.2 mm") or two deviations
    ("+0.2/-0.1 mm"; the unit may follow each).
    """
    if not isinstance(value, str) or not value.strip():
        raise InputError(f"expected an ISO 2768-1 class (f, m, c, v), a plate class such as \"EN 10029 A\", "
                         f"or a tolerance such as \"±0.2 mm\" or \"+0.2/-0.1 mm\", got {value!r}", where=where)
    text = value.strip()
    if text.lower() in catalog.GENERAL_CLASSES:
        return ThicknessRule("class", f"ISO 2768-1 {text.lower()}", text.lower())
    words = text.replace("class", " ").split()
    for standard, plate_class in catalog.PLATE_CLASSES:
        if " ".join(words[:-1]).upper() == standard.upper() and words[-1].upper() == plate_class:
            return ThicknessRule("plate", f"{standard} {plate_class}", plate_class)
    for pm in PLUS_MINUS:
        if text.startswith(pm):
            half = parse_quantity(text[len(pm):].strip(), "length", where=where)
            if half < 0:
                raise InputError(f"a ± tolerance is a magnitude, got {value!r}", where=where)
            return ThicknessRule("value", f"±{half:g} mm", lower=-half, upper=half)
    if "/" in text:
        first, second = (part.strip() for part in text.split("/", 1))
        unit = _unit_of(second)
        if not _unit_of(first) and unit:
            first = f"{first} {unit}"
        a = parse_quantity(first, "length", where=where)
        b = parse_quantity(second, "length", where=where)
        lower, upper = min(a, b), max(a, b)
        return ThicknessRule("value", f"{upper:+g}/{lower:+g} mm", lower=lower, upper=upper)
    choices = ", ".join(catalog.GENERAL_CLASSES)
    raise InputError(f"{value!r} is not an ISO 2768-1 class ({choices}), a plate class "
                     f"({', '.join(f'{s} {c}' for s, c in catalog.PLATE_CLASSES)}) nor a tolerance such as "
                     f"\"±0.2 mm\" or \"+0.2/-0.1 mm\"{did_you_mean(text, catalog.GENERAL_CLASSES)}", where=where)


def thickness_deviation(rule: ThicknessRule, thickness: float, where: str) -> Deviation:
    """The deviation a rule gives a layer of ``thickness`` mm (a table lookup for the classes)."""
    try:
        if rule.kind == "class":
            return catalog.general_tolerance(rule.tolerance_class, thickness)
        if rule.kind == "plate":
            standard = rule.label.rsplit(" ", 1)[0]
            return catalog.plate_tolerance(standard, rule.tolerance_class, thickness)
    except InputError as exc:
        raise InputError(str(exc), where=where) from None
    return Deviation(rule.lower, rule.upper, f"job: {rule.label}")


def position_value(value: Any, where: str) -> tuple[float, bool]:
    """``position_tolerance`` / a [positions] value → (diameter of the zone mm, projected zone asked)."""
    if not isinstance(value, str):
        raise InputError(f"expected the diameter of the position tolerance zone, e.g. \"0.2 mm\" "
                         f"(\"0.2 mm {PROJECTED}\" for a projected zone), got {value!r}", where=where)
    text = value.strip()
    projected = text.lower().endswith(PROJECTED)
    if projected:
        text = text[: -len(PROJECTED)].strip()
    diameter = parse_quantity(text, "length", where=where)
    if diameter < 0:
        raise InputError(f"a position tolerance is the diameter of its zone and must not be negative, got {value!r}",
                         where=where)
    return diameter, projected


def check_tolerance_tables(job: Job) -> None:
    """Every value of [tolerances] and [positions] reads (bad input stops the run before any work)."""
    for pattern, value in job.tolerances.items():
        thickness_rule(value, f"{job.path.name}: [tolerances] ({pattern!r})")
    for pattern, value in job.positions.items():
        position_value(value, f"{job.path.name}: [positions] ({pattern!r})")


def _layer_tolerance(job: Job, s: dict[str, Any], layer: LayerSpec, thread, aliases: tuple[str, ...],
                     where: str) -> tuple[Deviation, str]:
    """(deviation, rule label) of one layer: the job's [tolerances] glob for its part, else a
    washer's standard (ISO 7089 / ASME B18.21.1) where its thickness is the standard's, else
    the joint's ``thickness_tolerance`` (ISO 2768-1 m unless set)."""
    entry = entry_for_part(job.tolerances, layer.part, aliases)
    if entry is not None:
        rule = thickness_rule(entry[1], f"{job.path.name}: [tolerances] ({entry[0]!r})")
        return thickness_deviation(rule, layer.thickness, f"{job.path.name}: [tolerances] ({entry[0]!r})"), rule.label
    if layer.role == "washer":
        limits = catalog.washer_thickness_limits(thread)
        if limits is not None and limits[1] - HARDWARE_MATCH_TOL <= layer.thickness <= limits[2] + HARDWARE_MATCH_TOL:
            _, h_min, h_max, source = limits
            return Deviation(h_min - layer.thickness, h_max - layer.thickness, source), "washer standard"
    key = f"{where}.thickness_tolerance"
    rule = thickness_rule(s.get("thickness_tolerance", DEFAULT_THICKNESS_TOLERANCE), key)
    return thickness_deviation(rule, layer.thickness, key), rule.label


def _nut_tolerance(thread, nut_height: float | None) -> Deviation | None:
    """The nut height's deviation: the standard's m_min..m_max where the nut is the standard's."""
    if nut_height is None:
        return None
    limits = catalog.nut_height_limits(thread)
    if limits is None or not limits[0] - HARDWARE_MATCH_TOL <= nut_height <= limits[1] + HARDWARE_MATCH_TOL:
        return Deviation(0.0, 0.0, "no height limits for this nut in the catalogue: taken at nominal")
    m_min, m_max, source = limits
    return Deviation(m_min - nut_height, m_max - nut_height, source)


def length_tolerance(thread, length: float, head: str) -> Deviation:
    """The bolt length's deviation by its standard (ISO 4759-1 / ASME B18.2.1), else none (nominal)."""
    found = catalog.bolt_length_tolerance(thread, length, head)
    return found or Deviation(0.0, 0.0, "no length tolerance for this size in the catalogue: taken at nominal")


def stackup_spec(job: Job, s: dict[str, Any], layers: list[LayerSpec], fastener: ResolvedFastener,
                 length: float | None, nut_height: float | None, geometry: dict[str, Any],
                 aliases: dict[str, tuple[str, ...]], where: str) -> StackupSpec:
    """The stack's tolerances: every layer's thickness, the bolt length, the nut height, the
    holes' position tolerances ([positions] glob, else ``position_tolerance``, else none)."""
    thread = fastener.thread
    thickness, rules = [], []
    for layer in layers:
        dev, label = _layer_tolerance(job, s, layer, thread, aliases.get(layer.part or "", ()), where)
        thickness.append(dev)
        rules.append(label)
    method = _choice(s.get("stackup_method", STACKUP_METHODS[0]), STACKUP_METHODS, f"{where}.stackup_method")
    default_position = (position_value(s["position_tolerance"], f"{where}.position_tolerance")
                        if "position_tolerance" in s else None)
    positions, projected = [], False
    for layer in layers:
        entry = entry_for_part(job.positions, layer.part, aliases.get(layer.part or "", ()))
        value = position_value(entry[1], f"{job.path.name}: [positions] ({entry[0]!r})") if entry else default_position
        if layer.role == "washer" or value is None:
            positions.append(None)   # a washer floats on the bolt: no hole pattern of its own
            continue
        positions.append(value[0])
        projected = projected or value[1]
    return StackupSpec(
        thickness=tuple(thickness), thickness_rule=tuple(rules),
        length=length_tolerance(thread, length, fastener.spec.head) if length else Deviation(0.0, 0.0, "no length"),
        nut_height=_nut_tolerance(thread, nut_height), method=method, positions=tuple(positions),
        projected=projected, holes=tuple(geometry.get("layer_holes", ())),
        offsets=tuple(geometry.get("layer_offsets", ())))


def with_length(spec: JointSpec, length: float) -> JointSpec:
    """The spec with another bolt length (and that length's tolerance)."""
    thread = catalog.thread(spec.fastener.designation)
    st = spec.stackup
    if st is not None:
        st = replace(st, length=length_tolerance(thread, length, spec.fastener.head))
    return replace(spec, fastener=replace(spec.fastener, length=length), stackup=st, engagement=None)


def refit_stackup(old: JointSpec, new: JointSpec) -> JointSpec:
    """``new`` (a remedy's change of ``old``: a washer added, another size or length) with its
    stack's tolerances brought along: a layer kept keeps its tolerance, an added washer takes its
    standard's (else none), the bolt length and the nut height take their standards' again.
    ``new.stackup`` is ``old``'s as the remedy changed it (one entry per layer of ``old``), or one
    refit already (one entry per layer of ``new``: then only the hardware's tolerances are redone)."""
    st = new.stackup
    if st is None:
        return new
    thread = catalog.thread(new.fastener.designation)
    kept = {id(layer): i for i, layer in enumerate(old.layers)}
    thickness, rules, positions = [], [], []
    aligned = len(st.thickness) == len(new.layers)   # the same layers, or refit already
    for layer in () if aligned else new.layers:
        i = kept.get(id(layer))
        if i is not None:
            thickness.append(st.thickness[i])
            rules.append(st.thickness_rule[i])
            positions.append(st.positions[i] if st.positions else None)
            continue
        limits = catalog.washer_thickness_limits(thread) if layer.role == "washer" else None
        if limits is not None:
            thickness.append(Deviation(limits[1] - layer.thickness, limits[2] - layer.thickness, limits[3]))
        else:
            thickness.append(Deviation(0.0, 0.0, "added by a remedy: taken at nominal"))
        rules.append("washer standard")
        positions.append(None)
    if aligned:
        thickness, rules, positions = list(st.thickness), list(st.thickness_rule), list(st.positions)
    refit = replace(st, thickness=tuple(thickness), thickness_rule=tuple(rules), positions=tuple(positions),
                    length=length_tolerance(thread, new.fastener.length, new.fastener.head) if new.fastener.length
                    else st.length, nut_height=_nut_tolerance(thread, new.nut_height),
                    holes=st.holes if len(st.holes) == len(new.layers) else (),
                    offsets=st.offsets if len(st.offsets) == len(new.layers) else ())
    return replace(new, stackup=refit)


def passes_at_limits(spec: JointSpec) -> bool:
    """The stack-up check passes (the length sizing's test; no preload range needed)."""
    result = stackup(spec, with_preload=False)
    return result is None or stackup_check(result).ok


def length_for_limits(spec: JointSpec) -> JointSpec:
    """A chosen bolt length that passes at nominal but not at the tolerance limits is stepped up
    (a tapped joint: only while it does not bottom at nominal) to the first standard length that
    passes at the limits; the spec as it is when none of the next few does."""
    if passes_at_limits(spec):
        return spec
    f = spec.fastener
    thread = catalog.thread(f.designation)
    for length in [x for x in catalog.standard_lengths(thread, f.head) if x > f.length][:LIMIT_SIZING_STEPS]:
        if spec.tapped and length - spec.clamped_thickness - spec.gaps > spec.layers[-1].thickness:
            break
        trial = with_length(spec, length)
        if passes_at_limits(trial):
            notes = tuple(n for n in spec.notes if not n.startswith("bolt length "))
            return replace(trial, notes=notes + (f"bolt length {length:g} mm chosen: shortest standard length that "
                                                 f"passes at the tolerance limits ({f.length:g} mm passes at nominal only)",))
    return spec


# ----------------------------------------------------------------------------- typed-in joints

def joint_spec(job: Job, joint: dict[str, Any], extra_load: tuple[float, float, float] | None = None) -> JointSpec:
    """A typed-in [[joint]] table → JointSpec (``extra_load``: a [[group]] share to add)."""
    jid = joint["id"]
    index = job.joints.index(joint) if joint in job.joints else 0
    where = f"{job.path.name}: joint[{index}] ({jid})"
    tapped = _bool(joint.get("tapped", False), f"{where}.tapped")
    layers = _typed_layers(joint, where, tapped)
    engagement = _length(joint["engagement"], f"{where}.engagement") if "engagement" in joint else None
    settings = settings_for(job, jid, joint)
    lo, hi, shear = joint_load(job, jid, joint.get("load"), where)
    if extra_load:
        lo, hi, shear = lo + extra_load[0], hi + extra_load[1], shear + extra_load[2]
    return build_spec(job, jid, settings, layers, tapped=tapped, load=(lo, hi, shear), where=where,
                      engagement=engagement, own_load="load" in joint)


def typed_joint_specs(job: Job) -> list[JointSpec]:
    """Every typed-in joint, with the shares of [[group]] loads that name typed-in joints."""
    from geomjoint.grouping import group_loads

    typed_groups = [g for g in job.groups if "positions" in g]
    shares = group_loads(job, {}, typed_groups) if typed_groups else {}
    return [joint_spec(job, joint, shares.get(joint["id"])) for joint in job.joints
            if not is_excluded(job, joint["id"])]



# ----------------------------------------------------------------------------- model joints

#: material of recognised washers when no [materials] glob names them (DESIGN.md: steel)
WASHER_MATERIAL = "steel"

@dataclass
class ModelJoint:
    """A joint found in the model, resolved for the engine.

    ``cone_joint`` (geometry.cones.ConeJoint) and ``neighbours`` (ids of the joints whose cones
    can reach its material) are set by the analysis when a method needs the geometry; the
    marked-up model draws the same cones against the same neighbours.
    """

    scan: Any                        # geometry.stacks.Joint
    spec: JointSpec
    findings: list[dict] = field(default_factory=list)
    cone_joint: Any = None
    neighbours: tuple[str, ...] = ()


@dataclass
class UnanalysedJoint:
    """A model joint that could not be resolved for the engine: it fails, with the reason."""

    id: str
    reason: str                      # the one-line error that stopped it
    findings: list[dict] = field(default_factory=list)

    @property
    def message(self) -> str:
        return f"not analysed: {self.reason}"


def _finding(severity: str, code: str, message: str) -> dict:
    return {"severity": severity, "code": code, "message": message}


def _same_size(a: str, b: str) -> bool:
    return catalog.thread(a).designation == catalog.thread(b).designation


def choose_fastener(job: Job, joint, settings: dict, findings: list[dict]) -> str:
    """Designation: a [[fasteners]] rule > the modelled bolt > the size inferred from the hole > [defaults]."""
    ruled = any(fnmatch.fnmatchcase(joint.id, r["joints"]) and "fastener" in r for r in job.fastener_rules)
    modelled = joint.nominal if joint.bolt is not None else None
    if ruled:
        chosen = settings["fastener"]
        if modelled and not _same_size(chosen, modelled):
            findings.append(_finding("warn", "job-model-mismatch",
                                     f"job sets {chosen} but the modelled bolt {joint.bolt.part} is {modelled}; "
                                     f"the job's {chosen} is used"))
        return chosen
    if modelled:
        default = settings.get("fastener")
        if default and not _same_size(default, modelled):
            findings.append(_finding("info", "job-model-mismatch",
                                     f"[defaults] fastener {default} differs from the modelled bolt {modelled}; "
                                     f"the modelled bolt is used"))
        return modelled
    if joint.nominal:
        return joint.nominal
    if "fastener" in settings:
        return settings["fastener"]
    raise InputError(f"joint {joint.id}: no bolt modelled and no size could be inferred from its hole; "
                     f"set fastener in [defaults] or [[fasteners]]", where=job.where("fastener"))


def _layer_material(job: Job, part: str, role: str, aliases: tuple[str, ...] = (), default: str | None = None) -> Any:
    """The job's material for a layer's part; a washer's is steel and an insert's `default` (brass,
    or stainless steel for a wire insert) when no [materials] glob names it."""
    try:
        return material_for_part(job, part, aliases)
    except InputError:
        if role == "washer":
            return WASHER_MATERIAL
        if default is not None:
            return default
        raise


def _model_layers(job: Job, joint, aliases: dict[str, tuple[str, ...]] | None = None) -> list[LayerSpec]:
    """The scanned layers with the materials the job gives their parts (a [materials] glob
    matches a part's readable name or the file's instance / product name, ``aliases``)."""
    layers = []
    insert = getattr(joint, "insert", None)
    for layer in joint.layers:
        default = _insert_material(insert) if insert is not None and layer.part == insert.insert else None
        fields = material_layer_fields(_layer_material(job, layer.part, layer.role, (aliases or {}).get(layer.part, ()),
                                                       default),
                                       f"{job.path.name}: [materials] (part {layer.part!r})")
        layers.append(LayerSpec(thickness=layer.thickness, role=layer.role, part=layer.part, **fields))
    return layers


def _insert_material(insert) -> str:
    """An insert's material when the job names none: what its name says, else brass (a wire insert
    stainless steel), catalog.hole_parts.INSERT_MATERIALS."""
    from geomjoint.catalog.hole_parts import INSERT_MATERIALS

    hint = insert.insert_hint
    return hint if hint else INSERT_MATERIALS.get(insert.kind, INSERT_MATERIALS["insert"])


def insert_spec(job: Job, joint, aliases: dict[str, tuple[str, ...]] | None = None) -> InsertSpec | None:
    """The insert of a model joint and its host, with the host's material from the job."""
    insert = getattr(joint, "insert", None)
    if insert is None:
        return None
    host = insert.part
    fields = material_layer_fields(material_for_part(job, host, (aliases or {}).get(host, ())),
                                   f"{job.path.name}: [materials] (part {host!r})")
    return InsertSpec(part=insert.insert, host=host, host_material=fields["material"],
                      host_tensile=fields.get("tensile_strength"), outer_diameter=insert.outer_diameter,
                      length=insert.length, kind=insert.kind)


def _model_geometry(joint) -> dict[str, float]:
    """What the model fixes of the joint (bearing and hole diameters, bolt length, nut, gaps)."""
    geometry = {
        "bearing_diameter": joint.head_bearing_diameter,
        "far_bearing_diameter": joint.nut_bearing_diameter,
        "hole_diameter": joint.hole_diameter if not joint.tapped or len(joint.layers) > 1 else None,
        "length": joint.bolt_length,
        "nut_height": joint.nut_height,
        "gaps": sum(g.size for g in joint.gaps),
        # each layer's own hole and the offset of its axis (the position check's clearance)
        "layer_holes": tuple(layer.hole_diameter for layer in joint.layers),
        "layer_offsets": tuple(layer.offset for layer in joint.layers),
    }
    return {k: v for k, v in geometry.items() if v is not None}


def _model_load(job: Job, joint_id: str, group_loads: dict[str, tuple[float, float, float]],
                where: str) -> tuple[float, float, float]:
    """(min, max, shear) per bolt: the job's [[load]] rules plus the joint's share of its [[group]]."""
    lo, hi, shear = joint_load(job, joint_id, None, where)
    if joint_id in group_loads:
        g_lo, g_hi, g_shear = group_loads[joint_id]
        lo, hi, shear = lo + g_lo, hi + g_hi, shear + g_shear
    return lo, hi, shear


def model_joint(job: Job, joint, group_loads: dict[str, tuple[float, float, float]],
                aliases: dict[str, tuple[str, ...]] | None = None) -> ModelJoint:
    """A scanned joint + the job → JointSpec (layers with materials, hardware, loads).

    Raises InputError when the joint cannot be resolved (see :func:`resolve_model_joints`).
    """
    findings = [_finding(f.severity, f.code, f.message) for f in joint.findings]
    settings = settings_for(job, joint.id)
    settings["fastener"] = choose_fastener(job, joint, settings, findings)
    if joint.head_kind and not any(fnmatch.fnmatchcase(joint.id, r["joints"]) and "head" in r
                                   for r in job.fastener_rules):
        settings["head"] = joint.head_kind
    where = f"{job.path.name}: joint {joint.id}"
    if joint.nut is None and joint.bolt is not None and not joint.tapped:
        findings.append(_finding("info", "nut-not-modelled", "no nut modelled: catalogue hex nut assumed"))
    notes = tuple(f["message"] for f in findings if f["code"] == "no-hardware")
    spec = build_spec(job, joint.id, settings, _model_layers(job, joint, aliases), tapped=joint.tapped,
                      load=_model_load(job, joint.id, group_loads, where), where=where,
                      geometry=_model_geometry(joint), notes=notes, aliases=aliases)
    if joint.tapped:
        spec = replace(spec, thread_method=getattr(joint, "thread_method", None) or "tapped",
                       insert=insert_spec(job, joint, aliases))
    findings += bearing_cover_findings(joint.layers, spec)
    return ModelJoint(joint, spec, findings)


#: a bearing face covers a hole only when wider than it by more than this, mm (the
#: geometry tolerance of the scan: faces equal to within it are taken as equal)
BEARING_COVER_TOL = 1e-3


def bearing_cover_findings(layers, spec) -> list[dict]:
    """A ``bearing-over-hole`` fail for each bearing face (head, nut, or the washer under
    either) that is no wider than the hole of the part it presses on: such a head or nut
    pulls into the hole, nothing is clamped, and no pressure cone can start there.

    ``layers``: the scanned stack from the head side (role, part, hole_diameter); ``spec``:
    the resolved joint (its bearing diameters and head kind).  A countersunk head bears on
    its cone, not on a face, and is left alone.
    """
    faces = []
    if spec.fastener.head != "countersunk":
        faces.append(("head", spec.bearing_diameter, 0, 1))
    if not spec.tapped and spec.far_bearing_diameter is not None:
        faces.append(("nut", spec.far_bearing_diameter, len(layers) - 1, -1))
    out = []
    for side, d_w, index, step in faces:
        what = side
        if layers and layers[index].role == "washer" and 0 <= index + step < len(layers):
            what, index = f"washer under the {side}", index + step   # the washer presses on the next part
        if not layers or layers[index].role == "washer":
            continue
        hole = layers[index].hole_diameter
        if d_w <= hole + BEARING_COVER_TOL:
            out.append(_finding("fail", "bearing-over-hole",
                                f"the {what} ({d_w:.2f} mm bearing face, {spec.fastener.designation}) does not cover "
                                f"the {hole:.2f} mm hole of {layers[index].part}: it would pull into the hole"))
    return out


#: job keys whose failure is the joint's own (its size, length, hardware or hole), not a bad value
#: written in the job file: such a joint is not analysed, the run goes on
JOINT_SIZING_KEYS = ("fastener", "grade", "head", "length", "hole_diameter", "bearing_diameter")


def joint_own_trouble(exc: InputError, where: str) -> bool:
    """Whether an error resolving one model joint is that joint's own (True) or the job file's (False).

    The joint's own: no size inferred, no standard length reaches, no hardware data for its size,
    a hole or seat the bolt does not fit (errors about JOINT_SIZING_KEYS or with no key).  The job
    file's: a value that does not parse, a choice that does not exist, a part without a material
    ([materials] is the job's) -- those stay exit 2 for the whole run.
    """
    text = str(exc)
    if not text.startswith(where):
        return True                  # a catalogue lookup that names no key of the job
    key = text[len(where):].split(":", 1)[0].lstrip(".")
    return key == "" or key in JOINT_SIZING_KEYS


def resolve_model_joints(job: Job, scanned: list, group_loads: dict[str, tuple[float, float, float]],
                         aliases: dict[str, tuple[str, ...]] | None = None
                         ) -> tuple[list[ModelJoint], list[UnanalysedJoint]]:
    """Every scanned joint resolved for the engine; one that cannot be is set aside with its reason.

    A joint's own trouble (:func:`joint_own_trouble`) never stops the run: the joint fails as not
    analysed and the others are checked.  A bad job file still raises (exit 2).
    """
    resolved: list[ModelJoint] = []
    unresolved: list[UnanalysedJoint] = []
    for joint in scanned:
        try:
            resolved.append(model_joint(job, joint, group_loads, aliases))
        except InputError as exc:
            if "[materials]" in str(exc) or not joint_own_trouble(exc, f"{job.path.name}: joint {joint.id}"):
                raise
            unresolved.append(not_analysed(joint.id, str(exc),
                                           [_finding(f.severity, f.code, f.message) for f in joint.findings]))
    return resolved, unresolved


def not_analysed(joint_id: str, reason: str, findings: list[dict]) -> UnanalysedJoint:
    """The joint set aside, with its findings and the one that says why it was not analysed."""
    return UnanalysedJoint(joint_id, reason, list(findings) + [
        _finding("fail", "not-analysed", f"not analysed: {reason}")])


