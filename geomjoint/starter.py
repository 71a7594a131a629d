"""`geomjoint init MODEL.step`: a starter job file written beside the model.

Every part is listed under [materials] by its readable name (the product name of the file,
one glob for all its instances) with a guess from its name or colour (or a TODO),
every joint found is listed with the fastener inferred for it, and load examples are
commented in, so a first `geomjoint check` is minutes away.
"""
from __future__ import annotations

import re
from datetime import date
from pathlib import Path

from geomjoint.errors import InputError
from geomjoint.outputs import write_atomic

GLOB_SPECIALS = str.maketrans({"*": "[*]", "?": "[?]", "[": "[[]"})
#: the instance number the model reader adds to a product placed several times ("bracket#2")
INSTANCE_NUMBER = re.compile(r"#\d+$")


def _toml_string(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def starter_text(model_path: Path, scan) -> str:
    """The starter job for a scanned model (as text)."""
    hardware = {h.part for h in (*scan.bolts, *scan.nuts, *scan.washers)}
    lines = [
        f"# Starter job for {model_path.name}, written by geomjoint init on {date.today().isoformat()}.",
        "# Check every guess, fill in every TODO, then run:",
        f"#   geomjoint check {model_path.stem}.toml",
        "# CAUTION: results are engineering estimates for qualified review.",
        "",
        f"model = {_toml_string(model_path.name)}",
        "",
        "[defaults]",
        'grade = "8.8"                 # ISO 898-1 property class, or "SAE 5", "A4-80", ...',
        'preload = "75%"               # of the proof load; or a force "20 kN"; or torque = "50 N*m"',
        'criterion = "goodman"         # goodman | gerber | asme-elliptic | soderberg',
        'member_stiffness = "frustum"  # frustum | exponential | vdi | cone (clipped by the real parts) | fe',
        "reliability = 0.99",
        'thickness_tolerance = "m"     # ISO 2768-1 f | m | c | v, or "±0.2 mm"; per part in [tolerances]',
        '# position_tolerance = "0.2 mm"   # hole position tolerance zone (checked when given); per part in [positions]',
        '# stackup_method = "statistical"  # default: the worst case decides the stack-up limits',
        "",
        "[materials]                   # part name (or glob) -> material; bolts, nuts and washers need none",
    ]
    placed: dict[str, list] = {}          # readable name without its instance number -> instances
    for part in scan.model.parts:
        placed.setdefault(INSTANCE_NUMBER.sub("", part.name), []).append(part)
    for name, instances in placed.items():
        if any(p.name in hardware for p in instances):
            continue
        escaped = name.translate(GLOB_SPECIALS)
        # one glob for every instance ("bracket", "bracket#2"); "bracket*" only when it
        # cannot catch another part ("bracket long")
        if len(instances) == 1:
            keys = [escaped]
        elif any(other != name and other.startswith(name) for other in placed):
            keys = [escaped, escaped + "#*"]
        else:
            keys = [escaped + "*"]
        hint = instances[0].material_hint
        for key in map(_toml_string, keys):
            if hint:
                lines.append(f"{key} = {_toml_string(hint)}   # guessed from the name/colour")
            else:
                lines.append(f"# {key} = \"\"   # TODO: material of this part (steel, aluminium, PA6, ...)")
    lines += ["", "# Joints found:"]
    for j in scan.joints:
        source = f" ({j.nominal_source})" if getattr(j, "nominal_source", None) else ""
        fails = [f.code for f in j.findings if f.severity == "fail"]
        note = f"; findings: {', '.join(fails)}" if fails else ""
        lines.append(f"#   {j.id}: {j.kind}, {j.nominal or 'size unknown'}{source}, grip {j.grip:.1f} mm{note}")
    aside = getattr(scan, "set_aside", [])
    if aside:
        lines += ["", "# Holes set aside as no joints (a [[fasteners]] rule naming the id and a fastener brings one in):"]
        lines += [f"#   {a.id}: {a.code}: {a.reason}" for a in aside]
    lines += [
        "",
        "# Fastener overrides by joint id or glob (a modelled bolt is used when there is one):",
        "# [[fasteners]]",
        f'# joints = "{scan.joints[0].id if scan.joints else "J01"}"',
        '# fastener = "M10"',
        '# grade = "10.9"',
        '# length = "40 mm"',
        "",
        "# Loads per bolt, by joint id or glob:",
        "# [[load]]",
        '# joints = "*"',
        '# axial = { min = "0 kN", max = "5 kN" }',
        '# shear = "1 kN"',
        "",
        "# Or a resultant shared over a bolt pattern (model coordinates):",
        "# [[group]]",
        '# joints = "J0*"',
        '# point = ["0 mm", "0 mm", "100 mm"]',
        '# force = { max = ["0 kN", "1 kN", "3 kN"] }',
        '# moment = { max = ["50 N*m", "0 N*m", "0 N*m"] }',
        "",
    ]
    return "\n".join(lines)


def write_starter_job(model: Path) -> Path:
    """Scan ``model`` and write ``<model stem>.toml`` beside it; never over an existing file."""
    from geomjoint.geometry.scan import scan_model

    model = Path(model)
    if not model.exists():
        raise InputError("model file does not exist", where=str(model))
    target = model.with_suffix(".toml")
    if target.exists():
        raise InputError("a job file of that name exists already; move it away or edit it", where=str(target))
    scan = scan_model(model)
    write_atomic(target, starter_text(model, scan), protect=[model])
    return target
