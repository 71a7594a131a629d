"""Job file (TOML) → :class:`Job`: every key checked, every value read with its unit.

Resolving a joint's settings into a :class:`~geomjoint.mechanics.joint.JointSpec` (fastener,
bearing and hole diameters, bolt length, preload / fatigue / VDI specs) is
:mod:`geomjoint.resolve`, for typed-in and model joints alike.

The keys are the contract of DESIGN.md ("Job file") plus the optional keys of the
engine and VDI issues.  Every key is checked against the tables below, so an unknown
key is an error with the nearest valid one, and every quantity needs its unit.
"""
from __future__ import annotations

import fnmatch
import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

try:  # Python 3.11+
    import tomllib
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as tomllib

from geomjoint import catalog
from geomjoint.errors import InputError, did_you_mean
from geomjoint.mechanics.joint import FatigueSpec, JointSpec, LayerSpec
from geomjoint.mechanics.vdi import FRICTION_RANGE
from geomjoint.units import parse_quantity

# Keys that may appear in [defaults] and, as overrides, in each [[joint]] / [[fasteners]].
JOINT_SETTING_KEYS = {
    "fastener", "grade", "threads", "preload", "torque", "nut_factor", "friction", "scatter",
    "reliability", "criterion", "member_stiffness", "cone_angle", "surface", "temperature",
    "endurance", "Se", "fully_threaded", "required", "bearing_diameter", "hole_diameter",
    "outside_diameter", "head", "clamp_required", "roughness", "load_introduction", "method",
    "rolled_after_heat_treatment", "length", "thread_length", "hole_fit", "fe_bearing",
    "compare_stiffness", "thickness_tolerance", "position_tolerance", "stackup_method",
}
TOP_KEYS = {"model", "defaults", "materials", "default_material", "joint", "load", "group",
            "fasteners", "units", "title", "exclude", "require_loads", "tolerances", "positions"}
JOINT_KEYS = JOINT_SETTING_KEYS | {"id", "layers", "tapped", "load", "engagement", "nut"}
LAYER_KEYS = {"material", "thickness", "part", "role"}
LOAD_KEYS = {"joints", "axial", "shear"}
JOINT_LOAD_KEYS = {"min", "max", "shear"}
MINMAX_KEYS = {"min", "max"}
FRICTION_KEYS = {"thread", "head", "interface"}
TEMPERATURE_KEYS = {"assembly", "service"}
BEARING_FACE_KEYS = {"head", "nut"}       # bearing_diameter = { head = "...", nut = "..." }
REQUIRED_KEYS = {"yield", "load", "separation", "fatigue", "assembly_preload",
                 "working_stress", "bearing_pressure", "slip", "stripping", "insert_pullout"}
INLINE_MATERIAL_KEYS = {"E", "poisson", "yield", "tensile", "limiting_pressure",
                        "thermal_expansion", "name"}
FASTENER_RULE_KEYS = JOINT_SETTING_KEYS | {"joints"}

THREAD_KINDS = ("rolled", "cut")
HEAD_KINDS = catalog.HEAD_KINDS        # every head kind the catalogue dimensions (and the scan reports)
ENDURANCE_MODES = ("auto", "table", "marin")
METHODS = ("textbook", "vdi")
SURFACES = ("ground", "machined", "cold-drawn", "hot-rolled", "as-forged")
LAYER_ROLES = ("member", "washer", "tapped")
REPORT_UNITS = ("SI", "inch")
FE_BEARINGS = ("rigid", "pressure")


#: where a bearing or hole diameter came from (results.json ``bearing`` / ``hole``)
SOURCE_JOB, SOURCE_MODEL, SOURCE_CATALOGUE = "job", "model", "catalogue"

#: accepted nut factor K: Shigley 10th ed. Table 8-15 gives K = 0.09-0.30 for steel bolts
#: (from memory); the wider bounds only catch a slip (a percentage or a friction coefficient
#: typed where K belongs)
NUT_FACTOR_RANGE = (0.05, 0.5)

#: highest preload as a fraction of the proof load: 1.2 S_p lies above S_y for every ISO 898-1
#: class (8.8: 640/580 = 1.10, 10.9: 940/830 = 1.13, 12.9: 1100/970 = 1.13; ISO 898-1:2013
#: Tables 3 and 5), so a larger figure can only be a typing slip
MAX_PRELOAD_FRACTION = 1.2

#: accepted pressure-cone half-angle, deg: published cone models lie near 25-45 deg (Shigley
#: 10th ed. Sec. 8-5: 30 deg; tan phi of VDI 2230-1 about 0.35-0.65); below 1 deg the frustum
#: formula divides by tan(alpha) -> 0, above 60 deg the cone is flatter than any published one
CONE_ANGLE_RANGE_DEG = (1.0, 60.0)

#: the note on a joint that no load of the job reaches
NO_SERVICE_LOAD_NOTE = ("no service load: no [[load]], [[group]] or own load reaches this joint; preload, "
                        "assembly, stack-up and stripping are checked, separation and fatigue are not")

#: absolute zero, degC (SI definition of the kelvin: 0 K = -273.15 degC)
ABSOLUTE_ZERO_C = -273.15


#: preload when the job gives neither preload nor torque: 75 % of the proof load, the usual
#: figure for reusable joints (Shigley 10th ed., eq. 8-31; common practice)
DEFAULT_PRELOAD = "75%"

DEFAULT_SETTINGS: dict[str, Any] = {
    "grade": "8.8",
    "threads": "rolled",
    # the engine's own defaults (mechanics.joint), stated once
    "reliability": FatigueSpec.reliability,
    "criterion": FatigueSpec.criterion,
    "cone_angle": f"{JointSpec.cone_angle:g} deg",
    "surface": FatigueSpec.surface,
    "endurance": FatigueSpec.endurance,
    "fully_threaded": False,
    "head": "hex",
    "method": JointSpec.method,
    "hole_fit": "medium",
}


@dataclass
class LoadRule:
    joints: str
    axial_min: float | None
    axial_max: float | None
    shear: float | None
    where: str


@dataclass
class Job:
    path: Path
    model: Path | None
    defaults: dict[str, Any]
    materials: dict[str, Any]
    default_material: Any
    joints: list[dict[str, Any]]          # raw [[joint]] tables (checked keys)
    loads: list[LoadRule]
    groups: list[dict[str, Any]]
    fastener_rules: list[dict[str, Any]]
    units: str = "SI"
    title: str = ""
    raw: dict[str, Any] = field(default_factory=dict)
    exclude: tuple[str, ...] = ()        # joint ids / globs not to analyse
    require_loads: bool = False          # a joint that no load reaches fails (CI: no silent fatigue pass)
    tolerances: dict[str, Any] = field(default_factory=dict)   # [tolerances]: part glob -> thickness tolerance
    positions: dict[str, Any] = field(default_factory=dict)    # [positions]: part glob -> position tolerance

    def where(self, key: str) -> str:
        return f"{self.path.name}: {key}"


# ----------------------------------------------------------------------------- reading

def _check_keys(table: Any, allowed: set[str], where: str) -> dict[str, Any]:
    if not isinstance(table, dict):
        raise InputError(f"expected a table, got {type(table).__name__}", where=where)
    for key in table:
        if key not in allowed:
            raise InputError(f"unknown key {key!r}{did_you_mean(key, sorted(allowed))}", where=where)
    return table


def _inside(folder: Path, relative: str) -> bool:
    """True when ``relative`` (a path from the job file) stays inside ``folder``, by its text (symlinks allowed)."""
    import os

    base = os.path.normpath(os.path.abspath(folder))
    target = os.path.normpath(os.path.join(base, relative))
    return os.path.commonpath([base, target]) == base


def load_job(path: str | Path) -> Job:
    """Read and check a job file; raises :class:`InputError` naming the file and key."""
    path = Path(path)
    if not path.exists():
        raise InputError("job file does not exist", where=str(path))
    if path.is_dir():
        raise InputError("is a folder, not a job file", where=str(path))
    try:
        text = path.read_bytes().decode("utf-8")
    except UnicodeDecodeError:
        raise InputError("is not a UTF-8 text file", where=str(path)) from None
    return parse_job(text, path)


def parse_job(source: str | dict[str, Any], path: str | Path = "job.toml") -> Job:
    """A job from TOML text or an already-parsed table (a notebook or script needs no file).

    ``path`` names the job in messages; a relative ``model`` is taken from its folder.
    """
    path = Path(path)
    if isinstance(source, str):
        try:
            raw = tomllib.loads(source)
        except tomllib.TOMLDecodeError as exc:
            raise InputError(f"TOML syntax error: {exc}", where=str(path)) from None
    elif isinstance(source, dict):
        raw = source
    else:
        raise InputError("a job is TOML text or a table (dict)", where=str(path))
    name = path.name
    _check_keys(raw, TOP_KEYS, name)

    model = None
    if "model" in raw:
        if not isinstance(raw["model"], str) or not raw["model"].strip():
            raise InputError("expected a file path string", where=f"{name}: model")
        model = (path.parent / raw["model"]).resolve()
        if not Path(raw["model"]).is_absolute() and not _inside(path.parent, raw["model"]):
            # a job file from elsewhere must not reach up the tree; an absolute path is deliberate
            raise InputError(f"model path {raw['model']!r} leads outside the job's folder; put the model "
                             f"beside the job file (or below it), or give an absolute path", where=f"{name}: model")
        if not model.exists():
            raise InputError(f"model file {raw['model']!r} does not exist", where=f"{name}: model")
        if model.is_dir():
            raise InputError(f"model {raw['model']!r} is a folder, not a STEP file", where=f"{name}: model")

    defaults = _check_keys(raw.get("defaults", {}), JOINT_SETTING_KEYS, f"{name}: [defaults]")
    materials = raw.get("materials", {})
    if not isinstance(materials, dict):
        raise InputError("expected a table of part-name globs", where=f"{name}: [materials]")

    joints = raw.get("joint", [])
    if not isinstance(joints, list):
        raise InputError("use [[joint]] (an array of tables)", where=f"{name}: joint")
    seen: set[str] = set()
    for i, joint in enumerate(joints):
        where = f"{name}: joint[{i}]"
        _check_keys(joint, JOINT_KEYS, where)
        jid = joint.get("id")
        if not isinstance(jid, str) or not jid.strip():
            raise InputError("every [[joint]] needs an 'id' string", where=where)
        if jid in seen:
            raise InputError(f"joint id {jid!r} is used twice", where=where)
        seen.add(jid)

    for key in ("load", "group", "fasteners"):
        if not isinstance(raw.get(key, []), list):
            raise InputError(f"use [[{key}]] (an array of tables)", where=f"{name}: {key}")
    loads = [_read_load_rule(rule, f"{name}: load[{i}]") for i, rule in enumerate(raw.get("load", []))]
    groups = raw.get("group", [])
    for i, group in enumerate(groups):
        if not isinstance(group, dict):
            raise InputError(f"expected a table, got {type(group).__name__}", where=f"{name}: group[{i}]")
    fastener_rules = raw.get("fasteners", [])
    for i, rule in enumerate(fastener_rules):
        _check_keys(rule, FASTENER_RULE_KEYS, f"{name}: fasteners[{i}]")
        if not isinstance(rule.get("joints"), str):
            raise InputError("needs 'joints' (an id or glob)", where=f"{name}: fasteners[{i}]")
    units = raw.get("units", "SI")
    if units not in REPORT_UNITS:
        raise InputError(f"must be one of {', '.join(REPORT_UNITS)}", where=f"{name}: units")
    if not isinstance(raw.get("title", ""), str):
        raise InputError("expected a string", where=f"{name}: title")
    if "default_material" in raw and not isinstance(raw["default_material"], (str, dict)):
        raise InputError("expected a material name or an inline table", where=f"{name}: default_material")
    for table in ("tolerances", "positions"):
        if not isinstance(raw.get(table, {}), dict):
            raise InputError("expected a table of part-name globs", where=f"{name}: [{table}]")
    job = Job(path=path, model=model, defaults=defaults, materials=materials,
              default_material=raw.get("default_material"), joints=joints, loads=loads,
              groups=groups, fastener_rules=fastener_rules, units=units,
              title=str(raw.get("title", "")), raw=raw, exclude=_exclude(raw.get("exclude", []), f"{name}: exclude"),
              require_loads=_bool(raw.get("require_loads", False), f"{name}: require_loads"),
              tolerances=dict(raw.get("tolerances", {})), positions=dict(raw.get("positions", {})))
    # Resolve every typed-in joint now, so all bad input is reported before any work starts
    # (resolve reads the job with this module's readers: imported here, not at the top)
    from geomjoint.resolve import check_tolerance_tables, typed_joint_specs

    check_tolerance_tables(job)
    typed_joint_specs(job)
    return job


def _exclude(value: Any, where: str) -> tuple[str, ...]:
    """``exclude = "J07"`` or ``["J07", "J1*"]``: joint ids or globs not to analyse."""
    items = [value] if isinstance(value, str) else value
    if not isinstance(items, list) or not all(isinstance(x, str) and x.strip() for x in items):
        raise InputError("expected a joint id or glob, or a list of them, e.g. [\"J07\", \"J1*\"]", where=where)
    return tuple(items)


def _read_load_rule(rule: Any, where: str) -> LoadRule:
    _check_keys(rule, LOAD_KEYS, where)
    joints = rule.get("joints")
    if not isinstance(joints, str):
        raise InputError("needs 'joints' (an id or glob such as \"*\")", where=where)
    lo = hi = shear = None
    if "axial" in rule:
        lo, hi = _min_max(rule["axial"], f"{where}.axial")
    if "shear" in rule:
        shear = _force(rule["shear"], f"{where}.shear")
    return LoadRule(joints, lo, hi, shear, where)


# ----------------------------------------------------------------------------- values

def _force(value: Any, where: str) -> float:
    return parse_quantity(value, "force", where=where)


def _length(value: Any, where: str, positive: bool = True) -> float:
    result = parse_quantity(value, "length", where=where)
    if positive and result <= 0:
        raise InputError(f"must be greater than zero, got {value!r}", where=where)
    return result


def _min_max(value: Any, where: str) -> tuple[float, float]:
    table = _check_keys(value, MINMAX_KEYS, where)
    if "max" not in table:
        raise InputError("needs 'max' (and optionally 'min')", where=where)
    hi = _force(table["max"], f"{where}.max")
    lo = _force(table.get("min", "0 N"), f"{where}.min")
    if hi < lo:
        raise InputError(f"max ({table['max']}) is less than min ({table.get('min')})", where=where)
    return lo, hi


def _number(value: Any, where: str, lo: float | None = None, hi: float | None = None,
            open_interval: bool = False) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"expected a number, got {value!r}", where=where)
    x = float(value)
    if not math.isfinite(x):
        raise InputError("must be a finite number", where=where)
    if open_interval:
        if (lo is not None and x <= lo) or (hi is not None and x >= hi):
            raise InputError(f"must lie strictly between {lo:g} and {hi:g}, got {value!r}", where=where)
    elif (lo is not None and x < lo) or (hi is not None and x > hi):
        bounds = f"between {lo:g} and {hi:g}" if hi is not None else f"at least {lo:g}"
        raise InputError(f"must be {bounds}, got {value!r}", where=where)
    return x


def _choice(value: Any, choices: tuple[str, ...], where: str) -> str:
    if not isinstance(value, str) or value not in choices:
        raise InputError(f"{value!r} is not one of {', '.join(choices)}{did_you_mean(str(value), choices)}",
                         where=where)
    return value


def _bool(value: Any, where: str) -> bool:
    if not isinstance(value, bool):
        raise InputError(f"expected true or false, got {value!r}", where=where)
    return value


def _friction(value: Any, where: str) -> float:
    return _number(value, where, *FRICTION_RANGE)


# ----------------------------------------------------------------------------- materials

def material_layer_fields(value: Any, where: str) -> dict[str, Any]:
    """A catalog material name or an inline ``{ E = "71 GPa", poisson = 0.33 }`` → LayerSpec fields."""
    if isinstance(value, str):
        try:
            m = catalog.material(value)
        except InputError as exc:
            raise InputError(str(exc), where=where) from None
        return dict(E=m.E, poisson=m.poisson, material=m.name, yield_strength=m.yield_strength,
                    tensile_strength=m.tensile_strength, limiting_pressure=m.limiting_pressure,
                    thermal_expansion=m.thermal_expansion,
                    wileman=(m.wileman_A, m.wileman_B) if m.wileman_A is not None else None)
    table = _check_keys(value, INLINE_MATERIAL_KEYS, where)
    if "E" not in table:
        raise InputError("an inline material needs E, e.g. { E = \"71 GPa\" }", where=where)
    E = parse_quantity(table["E"], "stress", where=f"{where}.E")
    if E <= 0:
        raise InputError("E must be greater than zero", where=f"{where}.E")
    fields = dict(E=E, poisson=_number(table.get("poisson", 0.3), f"{where}.poisson", -0.99, 0.5),
                  material=str(table.get("name", f"E={E / 1000:g} GPa")))
    for key, target in (("yield", "yield_strength"), ("tensile", "tensile_strength"),
                        ("limiting_pressure", "limiting_pressure")):
        if key in table:
            fields[target] = parse_quantity(table[key], "stress", where=f"{where}.{key}")
    if "thermal_expansion" in table:
        fields["thermal_expansion"] = _number(table["thermal_expansion"], f"{where}.thermal_expansion", 0, 1e-3)
    return fields


def part_matches(part: str, pattern: str) -> bool:
    """A [materials] glob against a part name: case-sensitive, or both lower-cased."""
    return fnmatch.fnmatchcase(part, pattern) or fnmatch.fnmatchcase(part.lower(), pattern.lower())


def entry_for_part(table: dict[str, Any], part: str | None, aliases: tuple[str, ...] = ()) -> tuple[str, Any] | None:
    """(glob, value) of the last entry of a part-glob table ([materials], [tolerances], [positions])
    that matches ``part`` or one of its ``aliases``; None when none does (or the part has no name)."""
    if not part:
        return None
    found = None
    names = (part, *aliases)
    for pattern, value in table.items():
        if any(part_matches(n, pattern) for n in names):
            found = (pattern, value)
    return found


def material_for_part(job: Job, part: str, aliases: tuple[str, ...] = ()) -> Any:
    """The material entry whose glob matches ``part`` or one of its ``aliases`` (the file's
    instance and product names); the last matching glob wins."""
    found = None
    names = (part, *aliases)
    for pattern, value in job.materials.items():
        if any(part_matches(n, pattern) for n in names):
            found = value
    if found is None:
        found = job.default_material
    if found is None:
        raise InputError(f"part {part!r} matches no entry of [materials] (add one, or set default_material)",
                         where=job.where("[materials]"))
    return found


# ----------------------------------------------------------------------------- rules and what they match

def _matches(joint_id: str, pattern: str) -> bool:
    """A joint-id pattern of the job ([[load]], [[fasteners]], [[group]], exclude): a case-sensitive glob."""
    return fnmatch.fnmatchcase(joint_id, pattern)


def is_excluded(job: Job, joint_id: str) -> bool:
    """True when the job's ``exclude`` names the joint (by id or glob)."""
    return any(_matches(joint_id, pattern) for pattern in job.exclude)


#: the first letter of the ids of coaxial holes the scan set aside (geometry.stacks.SET_ASIDE_PREFIX)
SET_ASIDE_PREFIX = "H"


def rule_bringing_in(job: Job, hole_id: str) -> tuple[int, dict[str, Any]] | None:
    """(index, rule) of the [[fasteners]] rule that brings a set-aside stack back as a joint, or None.

    A rule brings one in when it names a size (``fastener``) and its ``joints`` pattern is
    written for set-aside ids: it starts with their letter ("H03", "H*") and matches the id.
    ``joints = "*"`` is a rule for every joint, never a reason to bolt a shaft bore.
    """
    for i, rule in enumerate(job.fastener_rules):
        pattern = rule["joints"]
        if "fastener" in rule and pattern.startswith(SET_ASIDE_PREFIX) and _matches(hole_id, pattern):
            return i, rule
    return None


#: how many names a "matches nothing" line lists when none is near the pattern
LISTED_NAMES = 8


def _matches_nothing(pattern: str, names: list[str], kind: str, where: str) -> InputError:
    near = did_you_mean(pattern.replace("*", "").replace("?", "") or pattern, names)
    if not near and names:
        listed = ", ".join(names[:LISTED_NAMES]) + (", ..." if len(names) > LISTED_NAMES else "")
        near = f" (the {kind}s are: {listed})"
    elif not names:
        near = f" (there is no {kind} to match)"
    return InputError(f"{pattern!r} matches no {kind}{near}", where=where)


def check_rules_match(job: Job, joint_ids: list[str], parts: list[tuple[str | None, ...]]) -> None:
    """Every pattern of the job must match something (a rule that matches nothing is a typo).

    ``joint_ids``: every joint of the job and its model (excluded ones too); ``parts``: the names
    of every part of the model (its readable name, then the file's instance and product names).  Raises InputError naming the file, the table
    and the pattern, with the nearest ids or names.
    """
    ids = sorted(set(joint_ids))
    name = job.path.name
    for rule in job.loads:
        if not any(_matches(i, rule.joints) for i in ids):
            raise _matches_nothing(rule.joints, ids, "joint", f"{rule.where} ([[load]]).joints")
    for i, rule in enumerate(job.fastener_rules):
        if not any(_matches(j, rule["joints"]) for j in ids):
            raise _matches_nothing(rule["joints"], ids, "joint", f"{name}: fasteners[{i}] ([[fasteners]]).joints")
    for i, group in enumerate(job.groups):
        selector = group.get("joints")
        patterns = [selector] if isinstance(selector, str) else selector if isinstance(selector, list) else []
        for pattern in patterns:
            if isinstance(pattern, str) and not any(_matches(j, pattern) for j in ids):
                raise _matches_nothing(pattern, ids, "joint", f"{name}: group[{i}] ([[group]]).joints")
    for pattern in job.exclude:
        if not any(_matches(j, pattern) for j in ids):
            raise _matches_nothing(pattern, ids, "joint", f"{name}: exclude")
    names = sorted({n for part in parts for n in part if n})
    for table, patterns in (("materials", job.materials), ("tolerances", job.tolerances),
                            ("positions", job.positions)):
        for pattern in patterns:
            if not any(part_matches(n, pattern) for n in names):
                raise _matches_nothing(pattern, names, "part", f"{name}: [{table}]")


# ----------------------------------------------------------------------------- settings

def settings_for(job: Job, joint_id: str, joint: dict[str, Any] | None = None) -> dict[str, Any]:
    """Built-in defaults ← [defaults] ← matching [[fasteners]] rules ← the joint's own keys."""
    settings = dict(DEFAULT_SETTINGS)
    levels = [("[defaults]", job.defaults)]
    levels += [(f"fasteners[{i}]", {k: v for k, v in rule.items() if k != "joints"})
               for i, rule in enumerate(job.fastener_rules) if _matches(joint_id, rule["joints"])]
    if joint:
        levels.append((f"joint {joint_id}", {k: v for k, v in joint.items() if k in JOINT_SETTING_KEYS}))
    for level, table in levels:
        if "preload" in table and "torque" in table:
            raise InputError("give either 'preload' or 'torque', not both", where=job.where(level))
        # a preload set at a narrower level replaces a torque set above it, and vice versa
        for key, other in (("preload", "torque"), ("torque", "preload")):
            if key in table:
                settings.pop(other, None)
        settings.update(table)
    if "torque" not in settings:
        settings.setdefault("preload", DEFAULT_PRELOAD)
    return settings


def _typed_layers(joint: dict[str, Any], where: str, tapped: bool) -> list[LayerSpec]:
    layers_raw = joint.get("layers")
    if not isinstance(layers_raw, list) or not layers_raw:
        raise InputError("needs 'layers', a list of { material, thickness }", where=f"{where}.layers")
    layers = []
    for i, layer in enumerate(layers_raw):
        lw = f"{where}.layers[{i}]"
        _check_keys(layer, LAYER_KEYS, lw)
        if "thickness" not in layer:
            raise InputError("needs 'thickness'", where=lw)
        if "material" not in layer:
            raise InputError("needs 'material'", where=lw)
        role = _choice(layer.get("role", "member"), LAYER_ROLES, f"{lw}.role")
        if tapped and i == len(layers_raw) - 1:
            role = "tapped"
        elif role == "tapped":
            raise InputError("only the last layer of a tapped joint can be 'tapped'", where=f"{lw}.role")
        layers.append(LayerSpec(thickness=_length(layer["thickness"], f"{lw}.thickness"), role=role,
                                part=layer.get("part"),
                                **material_layer_fields(layer["material"], f"{lw}.material")))
    if tapped and len(layers) < 2:
        raise InputError("a tapped joint needs at least one clamped layer above the tapped part", where=f"{where}.layers")
    return layers


def load_rules_cover(job: Job, joint_id: str) -> bool:
    """True when a [[load]] or [[group]] rule of the job names the joint (by id or glob)."""
    if any(_matches(joint_id, rule.joints) for rule in job.loads):
        return True
    for group in job.groups:
        selector = group.get("joints")
        patterns = [selector] if isinstance(selector, str) else selector if isinstance(selector, list) else []
        if any(isinstance(p, str) and _matches(joint_id, p) for p in patterns):
            return True
    return False


def joint_load(job: Job, joint_id: str, own: Any, where: str) -> tuple[float, float, float]:
    """(min, max, shear) for a joint: [[load]] rules in order, then the joint's own `load`."""
    lo = hi = shear = 0.0
    for rule in job.loads:
        if _matches(joint_id, rule.joints):
            if rule.axial_max is not None:
                lo, hi = rule.axial_min, rule.axial_max
            if rule.shear is not None:
                shear = rule.shear
    if own is not None:
        table = _check_keys(own, JOINT_LOAD_KEYS, f"{where}.load")
        if "max" in table:
            lo, hi = _min_max({k: v for k, v in table.items() if k in MINMAX_KEYS}, f"{where}.load")
        if "shear" in table:
            shear = _force(table["shear"], f"{where}.load.shear")
    if lo < 0 or hi < 0:
        raise InputError("compressive external loads are not supported; give tension as positive",
                         where=f"{where}.load")
    if shear < 0:
        raise InputError("shear is a magnitude and must not be negative", where=f"{where}.load.shear")
    return lo, hi, shear


