"""The marked-up model's scene: which solids, their names, colours and layers.

Built once per check from the analysis (results, model joints with the cone joints and the
cone neighbours the stiffness used) as the plain records of :mod:`geomjoint.geometry.markup`;
the STEP writer (:func:`geomjoint.geometry.markup.write_marked_step`) and the GLB writer
(:func:`geomjoint.geometry.glb.write_glb`) take the scene and know nothing of the analysis.

The verdict is told three ways, so that it survives viewers that drop one of them: by
colour (palette in :mod:`geomjoint.report.palette`), by name
(``J07 M10x40 10.9 marginal fatigue 1.12``), and by XCAF layer (:func:`layer_name`).
"""
from __future__ import annotations

import math
from pathlib import Path
from typing import Any

from geomjoint.errors import InputError
from geomjoint.geometry.markup import (
    JointMarkup,
    MarkupItem,
    MarkupScene,
    MarkupSummary,
    axis_marker,
    bounding_diagonal,
    generated_hardware,
    has_solid,
    layer_hole_faces,
    model_colour_srgb,
    unique_node_name,
    write_marked_step,
)
from geomjoint.mechanics.stackup import STACKUP_CHECK
from geomjoint.outputs import safe_name
from geomjoint.report.palette import CONE_ALPHA, PART_COLOUR, hex_to_rgb, verdict_rgb

#: prefix of the XCAF layer of each verdict ("geomjoint pass", ...)
LAYER_PREFIX = "geomjoint"


def layer_name(verdict: str) -> str:
    """The XCAF layer of a verdict: "geomjoint pass" / "geomjoint marginal" / "geomjoint fail"."""
    return f"{LAYER_PREFIX} {verdict}"


def _finite(value) -> float | None:
    """A factor as a JSON-safe number: unbounded or missing -> None (JSON has no infinity)."""
    return float(value) if isinstance(value, (int, float)) and math.isfinite(value) else None


def governing_factor(result) -> float | None:
    """The value of the result's governing check, when it is a finite number."""
    for c in result.checks:
        if c.name == result.governing and isinstance(c.value, (int, float)) and math.isfinite(c.value):
            return float(c.value)
    return _finite(result.factors.get(result.governing))


def fails_only_at_limit(result) -> bool:
    """The joint passes every check at nominal and fails only at a tolerance limit of its stack."""
    failing = [c.name for c in result.checks if not c.ok]
    return (bool(failing) and set(failing) == {STACKUP_CHECK} and result.stackup is not None
            and result.stackup.fails_at_limit_only)


def joint_node_name(result) -> str:
    """``J07 M10x40 10.9 marginal fatigue 1.12``: id, size x length, grade, verdict, governing, factor.

    A joint that fails only at a tolerance limit says so: ``J01 M10x45 8.8 fail at limit protrusion -0.40``
    (the quantity and its margin at the limit, mm)."""
    f = result.spec.fastener
    size = f.designation + (f"x{f.length:g}" if f.length else "")
    if fails_only_at_limit(result):
        words = [result.id, size, f.grade, result.verdict, "at limit", result.stackup.governing().name,
                 f"{result.stackup.least_margin:.2f}"]
        return safe_name(" ".join(words))
    words = [result.id, size, f.grade, result.verdict, result.governing]
    factor = governing_factor(result)
    if factor is not None:
        words.append(f"{factor:.2f}")
    return safe_name(" ".join(str(w) for w in words if w))


def _fastener_record(spec) -> dict[str, Any]:
    f = spec.fastener
    return {"designation": f.designation, "length": f.length, "grade": f.grade, "d": f.d,
            "pitch": f.pitch, "head": f.head, "system": f.system}


def _cone_items(mj, by_id: dict, rgb, taken: set[str], notes: list[str], cache) -> list[MarkupItem]:
    """The joint's clipped cone solids, against the same neighbours its stiffness used
    (``cache``: the model's ConeCache, so identical pieces share one solid)."""
    from geomjoint.geometry.cones import cone_solids

    if mj.cone_joint is None:
        return []
    out = []
    neighbours = [by_id[key].cone_joint for key in mj.neighbours if key in by_id]
    try:
        pieces = cone_solids(mj.cone_joint, neighbours, cache=cache)
    except InputError as exc:
        # a joint whose cone cannot be built (a bearing face smaller than a hole it spans)
        # is drawn without it; its findings say why, and the other joints are drawn
        notes.append(f"{mj.scan.id}: no pressure cone drawn: {exc}")
        return []
    for cname, shape in pieces:
        _, part, side = cname.rsplit(":", 2) if cname.count(":") >= 2 else ("", cname, "")
        if not has_solid(shape):
            notes.append(f"{mj.scan.id}: no cone material in {part} ({side} side)")
            continue
        out.append(MarkupItem(unique_node_name(f"cone {part} {side}", taken), "cone", shape, rgb,
                              alpha=CONE_ALPHA, source="generated", part=part))
    return out


def _hardware_items(mj, model, hardware_of: dict[str, str], rgb, taken: set[str],
                    notes: list[str]) -> list[MarkupItem]:
    """The joint's modelled hardware (the parts themselves), and catalogue hardware it lacks."""
    j, f = mj.scan, mj.spec.fastener
    out = []
    for kind, hw in [("bolt", j.bolt), ("nut", j.nut), *[("washer", w) for w in j.washers]]:
        if hw is None or hardware_of.get(hw.part) != j.id:
            continue
        part = model.part(hw.part)
        out.append(MarkupItem(unique_node_name(part.name, taken), kind, part.solid, rgb, part=part.name))
    for solid in generated_hardware(j, f, notes):
        label = (f"bolt {f.designation}x{solid.length:g} (catalog)" if solid.kind == "bolt"
                 else f"nut {f.designation} (catalog)")
        out.append(MarkupItem(unique_node_name(label, taken), solid.kind, solid.shape, rgb, source="generated"))
    return out


def markup_scene(analysis) -> MarkupScene:
    """The marked-up scene of an analysed model (geomjoint.analysis.Analysis): parts, and per
    analysed model joint its cones, axis and hardware.

    Raises InputError when the analysis has no model.
    """
    if analysis.scan is None:
        raise InputError("the marked-up model needs a job with a model")
    model = analysis.scan.model
    by_result = {r.id: r for r in analysis.results}
    by_id = {mj.scan.id: mj for mj in analysis.model_joints}
    stem = Path(model.source).stem if model.source and model.source != "<memory>" else "model"

    hardware_of: dict[str, str] = {}         # part name -> joint id
    for mj in analysis.model_joints:
        j = mj.scan
        for hw in [j.bolt, j.nut, *j.washers]:
            if hw is not None and hw.part not in hardware_of:
                hardware_of[hw.part] = j.id

    from geomjoint.geometry.cones import ConeCache

    # sections (the analysis' own, when it kept them) and cone solids shared by the joints
    cone_cache = getattr(analysis, "cone_cache", None) or ConeCache()
    face_tables: dict = {}                   # hole faces of each part, read once
    axis_shapes: dict = {}                   # one axis marker per size, placed at each joint
    hole_faces: dict[str, dict[int, tuple[float, float, float]]] = {}
    joints: list[JointMarkup] = []
    joint_names: set[str] = set()
    for mj in analysis.model_joints:
        j = mj.scan
        result = by_result.get(j.id)
        if result is None:
            continue
        rgb = verdict_rgb(result.verdict)
        jm = JointMarkup(id=j.id, name=unique_node_name(joint_node_name(result), joint_names),
                         verdict=result.verdict, governing=result.governing, rgb=rgb,
                         layer=layer_name(result.verdict), factor=governing_factor(result),
                         fastener=_fastener_record(result.spec),
                         factors={k: _finite(v) for k, v in result.factors.items()})
        taken: set[str] = set()
        jm.items += _cone_items(mj, by_id, rgb, taken, jm.notes, cone_cache)
        jm.items.append(MarkupItem(unique_node_name("axis", taken), "axis",
                                   axis_marker(j, result.spec.fastener, axis_shapes),
                                   rgb, source="generated"))
        jm.items += _hardware_items(mj, model, hardware_of, rgb, taken, jm.notes)
        for layer in j.layers:
            if layer.role == "washer" or layer.part in hardware_of:
                continue
            for idx in layer_hole_faces(layer, j, face_tables):
                hole_faces.setdefault(layer.part, {})[idx] = rgb
        joints.append(jm)

    parts: list[MarkupItem] = []
    part_names: set[str] = set()
    shown = {jm.id for jm in joints}
    for p in model.parts:
        if hardware_of.get(p.name) in shown:
            continue
        rgb = model_colour_srgb(p.colour) if p.colour is not None else hex_to_rgb(PART_COLOUR)
        parts.append(MarkupItem(unique_node_name(p.name, part_names), "part", p.solid, rgb, part=p.name,
                                hole_faces=hole_faces.get(p.name, {})))
    return MarkupScene(title=safe_name(f"geomjoint {stem}"), parts=parts, joints=joints,
                       diagonal=bounding_diagonal([p.solid for p in model.parts]), source=model.source)


def write_marked_model(analysis, step: Path | None = None, glb: Path | None = None,
                       scene: MarkupScene | None = None) -> MarkupSummary | None:
    """Write the marked-up model of ``analysis`` as STEP and/or GLB (the scene built once for both)."""
    from geomjoint.geometry.glb import write_glb

    scene = scene if scene is not None else markup_scene(analysis)
    summary = write_marked_step(scene, step) if step is not None else None
    if glb is not None:
        write_glb(scene, glb)
    return summary
