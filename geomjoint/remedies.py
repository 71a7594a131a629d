"""Remedies for a failing or marginal joint: the smallest standard change that passes.

Each candidate is a real change to the joint (a standard bolt length, the next property
class, more preload within the permissible window, a washer, the next size) and is
re-checked by the engine before it is suggested; nothing here is a rule of thumb.
Candidates are tried in order of how little they disturb the design, and the first few
that pass are returned.
"""
from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Callable, Iterator

from geomjoint import catalog
from geomjoint.errors import InputError
from geomjoint.mechanics.bolt import required_length
from geomjoint.mechanics.joint import JointResult, JointSpec, LayerSpec, Remedy
from geomjoint.mechanics.stackup import POSITION_CHECK, STACKUP_CHECK
from geomjoint.resolve import length_for_limits, refit_stackup

#: the property-class ladders a remedy climbs (ISO 898-1; SAE J429)
GRADE_LADDERS = (("4.6", "5.6", "8.8", "10.9", "12.9"), ("SAE 2", "SAE 5", "SAE 8"))

#: preloads tried, as fractions of the proof load: 75 % is the textbook figure for reusable
#: joints, 90 % for permanent ones (Shigley 10th ed., eq. 8-31)
PRELOAD_STEPS = (0.75, 0.8, 0.85, 0.9)

#: tightening factors α_A of better-controlled methods (VDI 2230-1 Table A8, from memory:
#: torque wrench 1.4-1.6, precision torque / angle-controlled 1.2-1.4, yield- or angle-controlled ~1.0-1.2)
SCATTER_STEPS = (1.4, 1.2)

#: how many passing remedies to report
MAX_REMEDIES = 3

#: how many larger sizes to try
MAX_SIZE_STEPS = 3

#: the rule label of a layer that takes an ISO 2768-1 general class (resolve.ThicknessRule.label)
GENERAL_PREFIX = "ISO 2768-1 "

#: a position tolerance a remedy offers is rounded down to 1/POSITION_STEPS mm (0.01 mm, as drawings give it)
POSITION_STEPS = 100

#: checks that a remedy cannot fix by changing the bolt (the stack-up itself is wrong)
GEOMETRY_CHECKS = ("stack-up",)


@dataclass(frozen=True)
class Candidate:
    kind: str        # "length" | "class" | "position" | "preload" | "grade" | "washer" | "size": one of each kind at most
    change: str
    spec: JointSpec


def _grade_candidates(spec: JointSpec) -> Iterator[Candidate]:
    f = spec.fastener
    for ladder in GRADE_LADDERS:
        if f.grade in ladder:
            for name in ladder[ladder.index(f.grade) + 1:]:
                try:
                    g = catalog.grade(name, f.d)
                except InputError:
                    continue
                yield Candidate("grade", f"property class {f.grade} -> {g.name}",
                                replace(spec, fastener=replace(f, grade=g.name, proof=g.proof,
                                                               yield_strength=g.yield_strength, tensile=g.tensile)))


def _preload_candidates(spec: JointSpec) -> Iterator[Candidate]:
    p = spec.preload
    if spec.method == "vdi":
        current = spec.vdi.scatter
        for alpha in SCATTER_STEPS:
            if alpha < current:
                yield Candidate("preload", f"tighter tightening method: scatter alpha_A {current:g} -> {alpha:g}",
                                replace(spec, vdi=replace(spec.vdi, scatter=alpha)))
        return
    f = spec.fastener
    proof_load = f.proof * f.stress_area
    if p.mode == "proof_fraction":
        current = p.value
    elif p.mode == "force":
        current = p.value / proof_load
    elif p.mode == "none":
        current = 0.0
    else:
        return  # a torque is the designer's tightening procedure; suggested as a preload instead below
    for fraction in PRELOAD_STEPS:
        if fraction > current + 1e-9:
            yield Candidate("preload", f"preload {current:.0%} -> {fraction:.0%} of the proof load "
                            f"({fraction * proof_load / 1000:.1f} kN)",
                            replace(spec, preload=replace(p, mode="proof_fraction", value=fraction)))


def _length_candidates(spec: JointSpec, result: JointResult) -> Iterator[Candidate]:
    f = spec.fastener
    if f.length is None:
        return
    thread = catalog.thread(f.designation)
    failing = {c.name for c in result.checks if not c.ok}
    if "length" in failing and not f.fully_threaded:
        yield Candidate("length", "fully threaded screw of the same length", replace(spec, fastener=replace(f, fully_threaded=True)))
    if not failing & {"length", "stripping", STACKUP_CHECK}:
        return
    governing = result.stackup.governing() if result.stackup is not None else None
    bottoming = governing is not None and governing.name in ("bottom_clearance", "thread_in_grip") \
        and STACKUP_CHECK in failing and not failing & {"length", "stripping"}
    if bottoming or (spec.tapped and f.length - spec.clamped_thickness > spec.layers[-1].thickness):
        # bottoming in the blind hole: the longest standard length that fits is the least change
        for length in sorted(catalog.standard_lengths(thread, f.head), reverse=True):
            if length < f.length and length - spec.clamped_thickness <= spec.layers[-1].thickness:
                yield Candidate("length", f"bolt length {f.length:g} -> {length:g} mm",
                                replace(spec, fastener=replace(f, length=length), engagement=None))
        return
    for length in catalog.standard_lengths(thread, f.head):
        if length > f.length:
            if spec.tapped and length - spec.clamped_thickness > spec.layers[-1].thickness:
                break  # would bottom in the tapped hole
            yield Candidate("length", f"bolt length {f.length:g} -> {length:g} mm",
                            replace(spec, fastener=replace(f, length=length), engagement=None))


def _tolerance_candidates(spec: JointSpec, result: JointResult) -> Iterator[Candidate]:
    """A finer ISO 2768-1 class for the parts that take the general class, and, when the hole
    pattern fails, the position tolerance the holes afford (both changes to the drawing)."""
    st = spec.stackup
    failing = {c.name for c in result.checks if not c.ok}
    if st is None:
        return
    if STACKUP_CHECK in failing:
        general = [i for i, rule in enumerate(st.thickness_rule) if rule.startswith(GENERAL_PREFIX)]
        current = {st.thickness_rule[i][len(GENERAL_PREFIX):] for i in general}
        if len(current) == 1:
            now = current.pop()
            for finer in catalog.GENERAL_CLASSES[:catalog.GENERAL_CLASSES.index(now)][::-1]:
                thickness = list(st.thickness)
                rules = list(st.thickness_rule)
                for i in general:
                    thickness[i] = catalog.general_tolerance(finer, spec.layers[i].thickness)
                    rules[i] = GENERAL_PREFIX + finer
                yield Candidate("class", f"thickness tolerance ISO 2768-1 {now} -> {finer} for "
                                f"{', '.join(spec.layers[i].part or f'layer {i + 1}' for i in general)}",
                                replace(spec, stackup=replace(st, thickness=tuple(thickness), thickness_rule=tuple(rules))))
    position = result.stackup.position if result.stackup is not None else None
    if POSITION_CHECK in failing and position is not None and position.affordable > 0:
        # the zone the holes afford, rounded down to the 0.01 mm a drawing gives
        afford = math.floor(position.affordable * POSITION_STEPS) / POSITION_STEPS
        given = [p for p in st.positions if p is not None]
        positions = tuple(None if p is None else min(p, afford) for p in st.positions)
        yield Candidate("position", f"position tolerance {max(given):g} -> {afford:g} mm",
                        replace(spec, stackup=replace(st, positions=positions)))


def _washer_candidates(spec: JointSpec) -> Iterator[Candidate]:
    if spec.layers[0].role == "washer":
        return
    thread = catalog.thread(spec.fastener.designation)
    w = catalog.washer(thread)
    steel = catalog.material("steel")
    washer = LayerSpec(thickness=w.thickness, E=steel.E, poisson=steel.poisson, material=steel.name,
                       role="washer", yield_strength=steel.yield_strength, tensile_strength=steel.tensile_strength,
                       limiting_pressure=steel.limiting_pressure, thermal_expansion=steel.thermal_expansion)
    layers = (washer,) + spec.layers
    far = spec.far_bearing_diameter
    label = "hardened plain washer under the head"
    if not spec.tapped and spec.layers[-1].role != "washer":
        layers = layers + (washer,)
        far = w.outer
        label = "hardened plain washers under head and nut"
    length = spec.fastener.length
    notes = spec.notes
    if length is not None:
        needed = length + (len(layers) - len(spec.layers)) * w.thickness
        length = catalog.shortest_length(thread, needed, spec.fastener.head)
    washered = length_for_limits(refit_stackup(spec, replace(
        spec, layers=layers, bearing_diameter=w.outer, far_bearing_diameter=far,
        fastener=replace(spec.fastener, length=length), members_value=None,
        member_stiffness=_closed_form(spec), notes=notes)))
    longer = (f", bolt length {spec.fastener.length:g} -> {washered.fastener.length:g} mm"
              if length is not None and washered.fastener.length != spec.fastener.length else "")
    yield Candidate("washer", f"{label} ({w.inner:g}/{w.outer:g} x {w.thickness:g} mm){longer}", washered)


def _closed_form(spec: JointSpec) -> str:
    """Geometry-based stiffness cannot be re-run on a changed stack: use the closed form instead."""
    return spec.member_stiffness if spec.member_stiffness in ("frustum", "exponential", "vdi") else "frustum"


def _size_candidates(spec: JointSpec, hole_limit: float | None) -> Iterator[Candidate]:
    f = spec.fastener
    same_series = [t for t in catalog.thread_sizes(f.system)
                   if t.series == catalog.thread(f.designation).series and t.d > f.d]
    for thread in sorted(same_series, key=lambda t: t.d)[:MAX_SIZE_STEPS]:
        if hole_limit is not None and thread.d >= hole_limit:
            break
        try:
            g = catalog.grade(f.grade, thread.d)
            head = catalog.head(thread, f.head)
            hole = catalog.clearance_hole(thread, "medium") if hole_limit is None else spec.hole_diameter
            nut = catalog.nut(thread)
            needed = required_length(spec.clamped_thickness if spec.tapped else spec.grip, d=thread.d,
                                     pitch=thread.pitch, tapped=spec.tapped, gaps=spec.gaps, nut_height=nut.height,
                                     tapped_depth=spec.layers[-1].thickness, tapped_material=spec.layers[-1].material)
            length = catalog.shortest_length(thread, needed, f.head)
        except InputError:
            continue
        fastener = replace(f, designation=thread.designation, d=thread.d, pitch=thread.pitch, d2=thread.d2,
                           d3=thread.d3, D1=thread.D1, stress_area=thread.stress_area, proof=g.proof,
                           yield_strength=g.yield_strength, tensile=g.tensile, length=length)
        bearing = max(head.bearing_diameter, spec.bearing_diameter) if spec.layers[0].role == "washer" else head.bearing_diameter
        where = "" if hole_limit is not None else f", hole {hole:g} mm"
        # the new size's length passes at the tolerance limits, as a length the check chooses does
        bigger = length_for_limits(refit_stackup(spec, replace(
            spec, fastener=fastener, hole_diameter=hole, bearing_diameter=bearing,
            far_bearing_diameter=None if spec.tapped else nut.bearing_diameter,
            nut_height=None if spec.tapped else nut.height, members_value=None,
            member_stiffness=_closed_form(spec), engagement=None)))
        yield Candidate("size", f"next size {f.designation} -> {thread.designation}x{bigger.fastener.length:g}{where}",
                        bigger)


def candidates(spec: JointSpec, result: JointResult, hole_limit: float | None = None) -> Iterator[Candidate]:
    """Every candidate change, least disruptive first.

    A family that cannot be built for this joint (no standard length, no washer in the
    catalogue for the size) simply offers nothing: a remedy search never stops a run.
    """
    families = (lambda: _length_candidates(spec, result), lambda: _tolerance_candidates(spec, result),
                lambda: _preload_candidates(spec),
                lambda: _grade_candidates(spec), lambda: _washer_candidates(spec),
                lambda: _size_candidates(spec, hole_limit))
    for family in families:
        try:
            yield from family()
        except InputError:
            continue


def find_remedies(spec: JointSpec, result: JointResult, evaluate: Callable[[JointSpec], JointResult],
                  hole_limit: float | None = None, limit: int = MAX_REMEDIES) -> list[Remedy]:
    """The first ``limit`` candidates that make the joint pass (a failing joint: at least not fail).

    ``hole_limit``: for a joint in a model the bolt must still pass the existing hole, so
    only sizes below it are tried.
    """
    target = ("pass",) if result.verdict == "marginal" else ("pass", "marginal")
    found: list[Remedy] = []
    kinds_found: set[str] = set()
    for candidate in candidates(spec, result, hole_limit):
        if candidate.kind in kinds_found:
            continue  # the least change of each kind is the one worth suggesting
        try:
            trial = evaluate(refit_stackup(spec, candidate.spec))
        except (InputError, ValueError):
            continue
        if trial.verdict in target:
            governing = next((c for c in trial.checks if c.name == trial.governing), None)
            value = f" {governing.value:.2f}" if governing is not None and governing.value is not None else ""
            kinds_found.add(candidate.kind)
            found.append(Remedy(candidate.change, trial.verdict,
                                f"{trial.verdict} (least margin: {trial.governing}{value})"))
            if len(found) >= limit:
                break
    return found


def stackup_remedies(findings: list[dict]) -> list[Remedy]:
    """What the stack-up findings ask for: changes to the parts, not to the bolt."""
    fixes = {
        "misaligned": "align the holes (or open the clearance) so the bolt passes",
        "gap": "close the gap (shim or re-machine) so the layers bear on each other",
        "bolt-short": "use a longer bolt (see the shortest standard length in the findings)",
        "bolt-long": "use a shorter bolt",
        "shank-in-nut": "use a bolt with a longer thread or a fully threaded screw",
        "seat-too-small": "enlarge the counterbore / spot face seat",
    }
    out = []
    for f in findings:
        if f["severity"] == "fail" and f["code"] in fixes:
            out.append(Remedy(fixes[f["code"]], "geometry", f["message"]))
    return out
