"""Run scan, init and check over the real-model corpus found locally; print one table.

The corpus is a set of public STEP assemblies (listed with repository, commit, path,
sha256, licence, CAD system and unit in ``manifest.json`` beside this script).  The
files themselves are third-party work and are never committed: they live outside the
repository, by default in ``/work/realmodels/`` (or ``$GEOMJOINT_REALMODELS``, or the
folder given with ``--models``).  A file that is absent is listed as "absent"; a file
whose sha256 differs from the manifest is listed as "changed" and still run.

Repopulating the folder (what ``--fetch-instructions`` prints):

  for each entry of manifest.json: bring a snapshot of github.com/<repo> (any git clone
  at <commit> does), then
      git --git-dir=<clone>/.git show <commit>:<path> > <models>/<local>
  and check ``sha256sum <models>/<local>`` against the manifest.  Files of 4 MiB and more
  are not in the snapshots this corpus was built from; none of the entries needs one.

For each model the script runs, in a child process (a kernel crash costs one row), what a
new user would run, and measures what issue #15 asks (README.md beside this script says
how each number is counted):

1. ``geomjoint scan MODEL --json``: read = its exit code (0/1 read, 2 refused, 3 crash);
   joints; the modelled fasteners (parts whose product name says bolt / screw / nut /
   washer, see ``fastener_kind``) and how many the scan recognised as that kind of
   hardware; the bolts whose name states size and length and how many are read with that
   size and length (±0.6 mm); parts recognised as hardware that the names do not call
   fasteners ("shape only"); false claims (a finding the model contradicts, see
   ``false_claims``).
2. ``geomjoint init MODEL``: the starter job, written into a scratch copy of the model's folder.
3. ``geomjoint check``: the starter job with ``default_material = "steel"`` for the parts
   the starter left as TODO and one axial load on every joint (0 .. 1 kN; none when the
   scan found no joint); the exit code, the joints whose checks completed, the joints not
   analysed (with their reasons), and whether the reader's remarks on the file reached
   results.json.

Usage::

    python tests/realworld/run_corpus.py [--models DIR] [--only SUBSTRING] [--json FILE] [--markdown FILE]
    python tests/realworld/run_corpus.py --fetch-instructions
"""
from __future__ import annotations

import argparse
import hashlib
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import time
from dataclasses import dataclass
from pathlib import Path

HERE = Path(__file__).resolve().parent
MANIFEST = HERE / "manifest.json"
DEFAULT_MODELS = Path(os.environ.get("GEOMJOINT_REALMODELS", "/work/realmodels"))
#: seconds one model may take (scan + init + check) before its row says "timeout"
MODEL_SECONDS = 900
#: a modelled length matches the name's length within this, mm (half a millimetre of
#: rounding in the exporting system plus tolerance)
LENGTH_TOL = 0.6
#: two solids closer than this touch, mm (a gap reported between touching solids is a
#: false claim; CAD exports place mated faces to 1e-6 .. 1e-3 mm)
TOUCH_TOL = 0.01

# ----------------------------------------------------------------------------- names
# The words of the trade that name fastener parts (common practice in fastener libraries
# and catalogue part numbers).  A name is split into lower-case words at anything that is
# not a letter (underscores, dashes, digits: "cylinder_screw_M5x25", "HDW-207_..._SHCS_").

#: words naming a bolt or screw (set screws and studs included)
BOLT_WORDS = frozenset({
    "screw", "screws", "bolt", "bolts", "capscrew", "setscrew", "grubscrew", "stud", "studs",
    "shcs", "bhcs", "fhcs", "shss", "bhscs", "fhscs", "lhcs", "sbhcs", "pan", "hexbolt"})
#: words naming a nut (square, lock, flange, slot / T nuts included)
NUT_WORDS = frozenset({"nut", "nuts", "locknut", "jamnut", "hexnut", "wingnut", "nyloc", "tnut"})
#: words naming a washer
WASHER_WORDS = frozenset({"washer", "washers", "lockwasher"})
#: standards of fasteners by number ("DIN 912", "ISO4762", "DIN-933") -> kind
STANDARDS = {
    **{f"DIN{n}": "bolt" for n in (84, 85, 186, 188, 417, 444, 603, 912, 913, 914, 915, 916, 931, 933,
                                    960, 961, 963, 964, 965, 966, 6912, 7380, 7984, 7985, 7991)},
    **{f"ISO{n}": "bolt" for n in (1207, 1580, 2009, 2010, 4014, 4015, 4016, 4017, 4018, 4026, 4027,
                                    4028, 4029, 4762, 7045, 7046, 7047, 7380, 8676, 8765, 10642, 14579,
                                    14580, 14583, 14584, 15071)},
    **{f"DIN{n}": "nut" for n in (439, 557, 562, 917, 934, 935, 936, 980, 982, 985, 986, 6923, 6926)},
    **{f"ISO{n}": "nut" for n in (4032, 4033, 4034, 4035, 4161, 7040, 7042, 7719, 8673, 10511, 10512)},
    **{f"DIN{n}": "washer" for n in (125, 126, 127, 433, 434, 436, 440, 6798, 6916, 7349, 7989, 9021)},
    **{f"ISO{n}": "washer" for n in (7089, 7090, 7091, 7092, 7093, 7094, 7416)},
}
#: words that make a name something else: motion screws and their nuts, bearings, and
#: parts around a screw that are not the fastener (common practice; a name with one of
#: these is not counted, and hardware recognised in such a part is a false claim)
NOT_FASTENER_WORDS = frozenset({
    "lead", "leadscrew", "ball", "ballscrew", "trapezoidal", "acme", "feed", "auger", "conveyor",
    "worm", "jack", "bearing", "bearings", "screwdriver", "driver", "terminal", "standoff", "spacer",
    "bushing", "insert", "inserts", "rivet", "shaft", "pin", "dowel", "magnet", "pulley", "gear",
    "spindle", "knob", "bit"})
#: size and length in a name: "M5x25", "M3 x 10", "M12x1.5x40", "#10-32 x 1/2", "1/4-20 x 3/4"
METRIC_SIZE = re.compile(r"(?<![A-Za-z])M(\d+(?:[.,]\d+)?)\s*(?:[xX×*]\s*\d+(?:[.,]\d+)?\s*)?[xX×*]\s*(\d+(?:[.,]\d+)?)")
INCH_SIZE = re.compile(r"(#\d{1,2}|\d+/\d+|\d+(?:\.\d+)?)\s*-\s*(\d{2,3})\s*[xX×]\s*(\d+[ -]\d+/\d+|\d+/\d+|\d+(?:\.\d+)?)")


def _words(name: str) -> list[str]:
    return [w for w in re.split(r"[^a-z]+", name.lower()) if w]


def fastener_kind(name: str) -> str | None:
    """The kind of fastener a part's name says it is: "bolt" (bolts, screws, set screws,
    studs), "nut", "washer", or None.

    A word of the trade (BOLT_WORDS, NUT_WORDS, WASHER_WORDS, as a whole word) or a fastener
    standard by number (STANDARDS) names the kind; a word of NOT_FASTENER_WORDS (lead screw,
    bearing, standoff, insert, ...) makes the name no fastener.  A nut or washer word wins
    over a bolt word ("nut_M5-DIN934", "bolt with washer" is taken as the washer only when
    no bolt word is there).

    >>> fastener_kind("01_01_09-cylinder_screw_M5x25-DIN912"), fastener_kind("01_01_11-nut_M5-DIN934")
    ('bolt', 'nut')
    >>> fastener_kind("washer M6"), fastener_kind("lead screw T8"), fastener_kind("608 bearing")
    ('washer', None, None)
    >>> fastener_kind("ISO 4017 M12x40"), fastener_kind("Cover plate")
    ('bolt', None)
    """
    words = _words(name)
    if any(w in NOT_FASTENER_WORDS for w in words):
        return None
    kinds = set()
    for w in words:
        if w in BOLT_WORDS and not (w == "pan" and "head" not in words):
            kinds.add("bolt")
        elif w in NUT_WORDS:
            kinds.add("nut")
        elif w in WASHER_WORDS:
            kinds.add("washer")
    for body, number in re.findall(r"(DIN|ISO)[\s_\-]*(\d{2,5})(?!\d)", name.upper()):
        if f"{body}{number}" in STANDARDS:
            kinds.add(STANDARDS[f"{body}{number}"])
    if "bolt" in kinds:
        return "bolt"
    if "nut" in kinds:
        return "nut"
    return "washer" if "washer" in kinds else None


def is_fastener_name(name: str) -> bool:
    """True when the name says bolt or screw (``fastener_kind`` is "bolt")."""
    return fastener_kind(name) == "bolt"


def names_other_part(name: str) -> bool:
    """True when the name says the part is something a fastener recogniser must not take
    (a bearing, shaft, pin, standoff, insert, lead screw ...: NOT_FASTENER_WORDS)."""
    return any(w in NOT_FASTENER_WORDS for w in _words(name))


# The runner reads names with a small parser of its own, not geomjoint's catalog.designation:
# the instrument must not share the code it measures.
def _inch(text: str) -> float:
    text = text.strip().replace("-", " ")
    total = 0.0
    for piece in text.split():
        if "/" in piece:
            a, b = piece.split("/")
            total += float(a) / float(b)
        else:
            total += float(piece)
    return total


def stated_size(name: str) -> tuple[str, float] | None:
    """The (thread designation, length mm) a product name states, or None.

    >>> stated_size("01_01_09-cylinder_screw_M5x25-DIN912")
    ('M5', 25.0)
    >>> stated_size("#10-32 x 1/2 BHCS")
    ('#10-32', 12.7)
    """
    m = METRIC_SIZE.search(name)
    if m:
        d = m.group(1).replace(",", ".")
        return f"M{float(d):g}", float(m.group(2).replace(",", "."))
    m = INCH_SIZE.search(name)
    if m:
        return f"{m.group(1)}-{m.group(2)}", round(_inch(m.group(3)) * 25.4, 3)
    return None


def designation_matches(stated: str, nominal: str | None) -> bool:
    """The size a name states ("M12", "#10-32", "1/4-20") is the designation read
    ("M12", "M12x1.5", "#10-32 UNF", "1/4-20 UNC")."""
    if not nominal:
        return False
    base = nominal.split()[0]
    return base == stated or base.split("x")[0] == stated


def label_of(product: str | None, name: str) -> str:
    """The text the counting reads for a part: its product name and its instance name."""
    return " ".join(n for n in (product, name) if n)


# ----------------------------------------------------------------------------- kinds of failure

#: who fixes what (the status file groups the failures so)
KIND_SHAPE = "a"     # hardware shape recognition / designation reading
KIND_HOLES = "b"     # hole and joint formation: tapped by tap drill, inserts, non-bolt holes, assumed nuts
KIND_OTHER = "c"     # everything else: reading, errors that stop a command, outputs
KIND_TITLES = {
    KIND_SHAPE: "(a) hardware shape recognition / designation reading",
    KIND_HOLES: "(b) hole / joint formation (tap drills, inserts, non-bolt holes, assumed nuts)",
    KIND_OTHER: "(c) everything else (reading, commands that stop, outputs)",
}


@dataclass(frozen=True)
class Failure:
    """One thing the corpus run found wrong: the model, the part or joint, what."""

    kind: str        # KIND_SHAPE | KIND_HOLES | KIND_OTHER
    model: str
    where: str       # part or joint ("-" for the model as a whole)
    what: str


def failures_of(row: dict) -> list[Failure]:
    """Every failure a row records, with the kind of work that fixes it."""
    f, out = row["file"], []
    if row.get("read") not in ("exit 0", "exit 1"):
        out.append(Failure(KIND_OTHER, f, "-", f"scan {row.get('read')}: {row.get('note', '')}"))
    for m in row.get("missed", []):
        out.append(Failure(KIND_SHAPE, f, m["part"], f"{m['kind']} not recognised" +
                           (f" (taken for a {m['taken_as']})" if m.get("taken_as") else "")))
    for w in row.get("wrong", []):
        out.append(Failure(KIND_SHAPE, f, w["part"], f"read {w['read']}, name says {w['stated']}"))
    for c in row.get("false_claims", []):
        out.append(Failure(c["kind"], f, c["where"], c["what"]))
    for u in row.get("not_analysed", []):
        out.append(Failure(_kind_of_reason(u["reason"]), f, u["id"], f"not analysed: {u['reason']}"))
    if row.get("check_exit") not in (None, 0, 1):
        out.append(Failure(KIND_OTHER, f, "-", f"check exit {row['check_exit']}: {row.get('check_note', '')}"))
    if row.get("init_exit") not in (None, 0):
        out.append(Failure(KIND_OTHER, f, "-", f"init exit {row['init_exit']}: {row.get('init_note', '')}"))
    if row.get("remarks_in_results") is False:
        out.append(Failure(KIND_OTHER, f, "-", "the reader's remarks on the file are not in results.json"))
    return out


def _kind_of_reason(reason: str) -> str:
    low = reason.lower()
    if any(w in low for w in ("no size", "inferred", "no standard", "length", "hole", "nut", "tapped")):
        return KIND_HOLES
    return KIND_OTHER


# ----------------------------------------------------------------------------- child side

def _one(path: Path) -> dict:
    """Everything measured for one model (runs in the child process)."""
    row: dict = {"file": path.name, "read": "?", "joints": None, "fasteners": 0, "recognised": 0,
                 "stated": 0, "stated_ok": 0, "shape_only": 0, "false": 0, "checked": None,
                 "not_analysed_count": None, "check_exit": None, "note": "",
                 "missed": [], "wrong": [], "false_claims": [], "shape_only_parts": [], "not_analysed": []}
    t0 = time.perf_counter()
    captured = {}
    code, out, said = _scan_cli(path, captured)
    row["scan_seconds"] = round(time.perf_counter() - t0, 1)
    row["read"] = f"exit {code}"
    if code not in (0, 1) or "scan" not in captured:
        row["note"] = said[:200]
        row["seconds"] = row["scan_seconds"]
        return row
    scan = captured["scan"]
    try:
        doc = json.loads(out)
    except ValueError:
        doc = {"joints": []}
    row["joints"] = len(doc.get("joints", []))
    try:
        _count_hardware(scan, row, manifest_entry(path.name).get("not_fasteners"))
        _false_claims(scan, row)
    except Exception as exc:     # the runner's own trouble must not lose the row
        row["note"] = f"runner: {type(exc).__name__}: {exc}"[:200]
    row["false"] = len(row["false_claims"])
    t1 = time.perf_counter()
    _init_and_check(path, scan, row)
    row["check_seconds"] = round(time.perf_counter() - t1, 1)
    row["seconds"] = round(time.perf_counter() - t0, 1)
    return row


def _scan_cli(path: Path, captured: dict) -> tuple[int, str, str]:
    """``geomjoint scan PATH --json`` as the command runs it; the ScanResult it made is kept
    in ``captured["scan"]`` (the command's own scan, not a second one)."""
    from geomjoint import cli
    from geomjoint.geometry import scan as scan_module

    real = scan_module.scan_model

    def keeping(source):
        captured["scan"] = result = real(source)
        return result

    scan_module.scan_model = keeping
    try:
        return _quiet(cli.main, ["scan", str(path), "--json"])
    finally:
        scan_module.scan_model = real


def manifest_entry(local: str) -> dict:
    """The manifest entry of a corpus file (by its local name), or {}."""
    return next((e for e in json.loads(MANIFEST.read_text()) if e["local"] == local), {})


def _count_hardware(scan, row: dict, not_fasteners: dict[str, str] | None = None) -> None:
    """Fasteners by name (``fastener_kind``), each recognised or missed; bolts read as named.

    ``not_fasteners``: product names the manifest says are no fasteners although their name
    reads like one (an extruder's feed screw named "screw"), with the reason."""
    from geomjoint.geometry.hardware import thread_for_diameter

    found = {**{b.part: ("bolt", b) for b in scan.bolts}, **{n.part: ("nut", n) for n in scan.nuts},
             **{w.part: ("washer", w) for w in scan.washers}}
    # a nut that heads a stud is recognised as the nut it is (the scan keeps it on the stud)
    found.update({b.nut_head: ("nut", b) for b in scan.bolts if getattr(b, "nut_head", None)})
    nominal = {j.bolt.part: j.nominal for j in scan.joints if j.bolt}
    for part in scan.model.parts:
        label = label_of(part.product, part.name)
        kind = None if (part.product or part.name) in (not_fasteners or {}) else fastener_kind(label)
        got = found.get(part.name)
        if kind is None:
            if got is not None:
                if names_other_part(label):
                    row["false_claims"].append({"kind": KIND_SHAPE, "where": part.name,
                                                "what": f"recognised as a {got[0]}, but the name says otherwise"})
                else:
                    row["shape_only"] += 1
                    row["shape_only_parts"].append({"part": part.name, "kind": got[0]})
            continue
        row["fasteners"] += 1
        if got is not None and got[0] == kind:
            row["recognised"] += 1
        else:
            row["missed"].append({"part": part.name, "kind": kind, "taken_as": got[0] if got else None})
        if kind != "bolt":
            continue
        stated = stated_size(label)
        if stated is None:
            continue
        row["stated"] += 1
        if got is None or got[0] != "bolt":
            continue
        b = got[1]
        read = nominal.get(part.name)
        if read is None:   # a bolt in no joint: the size its shank diameter is
            system = "inch" if "-" in stated[0] else "metric"
            t = thread_for_diameter(b.d, system) or thread_for_diameter(b.d)
            read = t.designation if t else None
        if designation_matches(stated[0], read) and abs(b.length - stated[1]) <= LENGTH_TOL:
            row["stated_ok"] += 1
        else:
            row["wrong"].append({"part": part.name, "read": f"{read}x{b.length:.1f} ({b.head_kind})",
                                 "stated": f"{stated[0]}x{stated[1]:g}"})


def _false_claims(scan, row: dict) -> None:
    """Findings the model itself contradicts:

    - a ``gap`` between two solids that touch (e.g. under a head that sits on its washer);
    - ``interference`` of a screw in a hole of its own tap-drill size (a tapped hole);
    - a nut assumed on a screw whose end is inside a part (there is no room for a nut).
    """
    from geomjoint import catalog
    from geomjoint.geometry.hardware import thread_for_diameter

    solids = {p.name: p.solid for p in scan.model.parts}
    claims = row["false_claims"]
    for j in scan.joints:
        for g in j.gaps:
            a, b = g.between
            if a == b or a not in solids or b not in solids:
                continue         # two faces of one part (a U-bracket's legs) may well stand apart
            span = gap_span(j, a, b, g.size)
            if span is not None and gap_contradicted(g.size, _distance_near_axis(solids[a], solids[b], j, span)):
                # a head drawn into the gap (its bearing face read too high) is the recogniser's;
                # a head on a part whose recess the stack took for a gap is the stack's
                misread = j.bolt is not None and a == j.bolt.part and \
                    _volume_around_shank(solids[a], j, span) > HEAD_IN_GAP_VOLUME
                claims.append({"kind": KIND_SHAPE if misread else KIND_HOLES, "where": f"{j.id} ({a} / {b})",
                               "what": f"gap of {g.size:.3f} mm reported between solids that touch"})
        codes = {f.code for f in j.findings}
        if j.bolt is not None and "interference" in codes:
            t = thread_for_diameter(j.bolt.d)
            for layer in j.layers:
                if layer.role == "tapped" or j.bolt.d <= layer.hole_diameter + 1e-3 or t is None:
                    continue
                drills = [th for th, how in catalog.nominal_from_hole(layer.hole_diameter) if how == "tap drill"]
                if any(th.d == t.d for th in drills):
                    claims.append({"kind": KIND_HOLES, "where": f"{j.id} ({layer.part})",
                                   "what": f"interference claimed for {j.bolt.part} in a "
                                           f"{layer.hole_diameter:.2f} mm hole, the tap drill of {t.designation}"})
        if j.bolt is not None and j.nut is None and j.kind == "through" and j.bolt.head_kind != "countersunk":
            end = _bolt_end_inside(j.bolt, scan, solids)
            if end is not None:
                claims.append({"kind": KIND_HOLES, "where": f"{j.id} ({j.bolt.part})",
                               "what": f"a nut is assumed, but the screw ends inside {end}"})


#: the neighbourhood of a joint's axis in which two solids touching contradicts a gap
#: reported between them: within this many hole diameters of the axis (radius), where the
#: bearing faces of heads, nuts and washers are (an ISO 7089 washer's outside radius is
#: about 0.9 clearance-hole diameters; common practice), and over the gap's own axial span
BEARING_ZONE_HOLES = 1.0
#: the axial span is widened by this at each end, mm (faces that touch meet at its ends)
SPAN_MARGIN = 0.05


def gap_span(joint, a: str, b: str, size: float) -> tuple[float, float] | None:
    """Where along the joint's axis (from the head's bearing face, mm) the scan places the gap
    between consecutive solids ``a`` and ``b`` of the stack (bolt head, layers, nut), or None."""
    layers = list(joint.layers)
    if joint.bolt is not None and a == joint.bolt.part and layers and layers[0].part == b:
        return 0.0, size
    for la, lb in zip(layers, layers[1:]):
        if la.part == a and lb.part == b:
            return la.end, la.end + size
    if joint.nut is not None and b == joint.nut.part and layers and layers[-1].part == a:
        return layers[-1].end, layers[-1].end + size
    return None


def gap_contradicted(reported: float, measured: float) -> bool:
    """A gap the scan reports is false when the two solids touch across it (within TOUCH_TOL)
    and the gap is more than twice what they are apart: a 2.5 um gap reported between faces
    2.5 um apart is true, if idle; 7.5 mm reported between a head and the washer it sits on
    is false.

    >>> gap_contradicted(7.5, 0.0), gap_contradicted(0.0025, 0.0025), gap_contradicted(0.5, 0.4)
    (True, False, False)
    """
    return measured <= TOUCH_TOL and measured < reported / 2


def _distance_near_axis(a, b, joint, span: tuple[float, float]) -> float:
    """Distance between solids ``a`` and ``b`` in the bearing annulus around the joint's axis
    (outside the shank or hole, within BEARING_ZONE_HOLES hole diameters) over the axial
    ``span`` of the gap, mm (parts that touch far from the joint, beyond the gap, or where a
    shank meets a thread, do not contradict it)."""
    import numpy as np
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common
    from OCP.BRepExtrema import BRepExtrema_DistShapeShape
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeCylinder
    from OCP.gp import gp_Ax2, gp_Dir, gp_Pnt

    from OCP.BRepAlgoAPI import BRepAlgoAPI_Cut

    e = np.asarray(joint.direction, dtype=float)
    z0, z1 = span[0] - SPAN_MARGIN, span[1] + SPAN_MARGIN
    axis = gp_Ax2(gp_Pnt(*(np.asarray(joint.point, dtype=float) + e * z0)), gp_Dir(*e))
    outer = BRepPrimAPI_MakeCylinder(axis, BEARING_ZONE_HOLES * joint.hole_diameter, z1 - z0).Shape()
    # the bearing annulus only: a shank modelled at its nominal diameter overlaps a tapped
    # hole's wall at the gap's far end, which says nothing about the faces around it
    bolt = getattr(joint, "bolt", None)
    core = (bolt.d if bolt is not None else joint.hole_diameter) / 2 + SPAN_MARGIN
    tube = BRepAlgoAPI_Cut(outer, BRepPrimAPI_MakeCylinder(axis, core, z1 - z0).Shape()).Shape()
    pieces = []
    for solid in (a, b):
        common = BRepAlgoAPI_Common(solid, tube)
        if not common.IsDone():
            return float("inf")
        pieces.append(common.Shape())
    dist = BRepExtrema_DistShapeShape(*pieces)
    return dist.Value() if dist.IsDone() else float("inf")


#: a bolt with more than this much material around its shank inside a gap has its head
#: drawn there, mm^3 (a head is hundreds of mm^3; a chamfer's sliver or a rounding, less)
HEAD_IN_GAP_VOLUME = 0.5


def _volume_around_shank(bolt_solid, joint, span: tuple[float, float]) -> float:
    """Volume of the bolt's material in the gap's span, outside its shank and within the
    bearing zone, mm^3 (the head, when its bearing face was read too high)."""
    import numpy as np
    from OCP.BRepAlgoAPI import BRepAlgoAPI_Common, BRepAlgoAPI_Cut
    from OCP.BRepGProp import BRepGProp
    from OCP.BRepPrimAPI import BRepPrimAPI_MakeCylinder
    from OCP.GProp import GProp_GProps
    from OCP.gp import gp_Ax2, gp_Dir, gp_Pnt

    e = np.asarray(joint.direction, dtype=float)
    z0, z1 = span[0] + SPAN_MARGIN, span[1] - SPAN_MARGIN
    if z1 <= z0:
        return 0.0
    axis = gp_Ax2(gp_Pnt(*(np.asarray(joint.point, dtype=float) + e * z0)), gp_Dir(*e))
    outer = BRepPrimAPI_MakeCylinder(axis, BEARING_ZONE_HOLES * joint.hole_diameter, z1 - z0).Shape()
    shank = BRepPrimAPI_MakeCylinder(axis, joint.bolt.d / 2 + SPAN_MARGIN, z1 - z0).Shape()
    ring = BRepAlgoAPI_Cut(outer, shank).Shape()
    props = GProp_GProps()
    BRepGProp.VolumeProperties_s(BRepAlgoAPI_Common(bolt_solid, ring).Shape(), props)
    return props.Mass()


def _bolt_end_inside(bolt, scan, solids) -> str | None:
    """The part (not hardware) whose material holds the end of the bolt, or None."""
    import numpy as np
    from OCP.BRepClass3d import BRepClass3d_SolidClassifier
    from OCP.gp import gp_Pnt
    from OCP.TopAbs import TopAbs_IN

    back = min(1.0, 0.1 * bolt.length)   # a point just short of the tip, on the axis
    p = np.asarray(bolt.bearing_point) + np.asarray(bolt.direction) * (bolt.length - back)
    hardware = {h.part for h in (*scan.bolts, *scan.nuts, *scan.washers)}
    for name, solid in solids.items():
        if name in hardware:
            continue
        cls = BRepClass3d_SolidClassifier(solid, gp_Pnt(*map(float, p)), 1e-6)
        if cls.State() == TopAbs_IN:
            return name
    return None


def _init_and_check(path: Path, scan, row: dict) -> None:
    from geomjoint import cli

    with tempfile.TemporaryDirectory(prefix="gj-corpus-") as tmp:
        model = Path(tmp) / path.name
        shutil.copyfile(path, model)
        code, _, said = _quiet(cli.main, ["init", str(model)])
        row["init_exit"] = code
        job = model.with_suffix(".toml")
        if code != 0 or not job.exists():
            row["init_note"] = said.replace(str(tmp), "")[:200]
            return
        job.write_text(starter_with_load(job.read_text(), bool(scan.joints)))
        out = Path(tmp) / "out"
        code, _, said = _quiet(cli.main, ["check", str(job), "--out", str(out), "--workers", "1"])
        row["check_exit"] = code
        if code not in (0, 1):
            row["check_note"] = said.replace(str(tmp), "")[:200]
        results = out / "results.json"
        if not results.exists():
            row["checked"] = 0
            return
        doc = json.loads(results.read_text())
        row["checked"] = sum(1 for j in doc.get("joints", []) if j.get("checks"))
        row["not_analysed"] = [{"id": u["id"], "reason": u.get("reason", "")[:160]}
                               for u in doc.get("not_analysed", [])]
        row["not_analysed_count"] = len(row["not_analysed"])
        if scan.findings:
            text = results.read_text()
            row["remarks_in_results"] = all(f.code in text for f in scan.findings)


def starter_with_load(text: str, has_joints: bool) -> str:
    """The starter job a user finishes first: steel for the parts left as TODO, and one
    axial load on every joint (a load rule that matches nothing would be an error)."""
    text = text.replace("[defaults]", 'default_material = "steel"\n\n[defaults]', 1)
    if has_joints:
        text += '\n[[load]]\njoints = "*"\naxial = { min = "0 kN", max = "1 kN" }\n'
    return text


def _quiet(fn, argv) -> tuple[int, str, str]:
    """Run a command with its terminal output kept aside (the table is the output): exit
    code, what it printed on stdout, and the last line it printed on stderr."""
    import contextlib
    import io

    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = fn(argv)
        except SystemExit as exc:
            code = int(exc.code or 0)
    lines = [l for l in err.getvalue().splitlines() if l.strip() and not l.startswith(("analysed:", "scanned"))]
    return code, out.getvalue(), (lines[-1] if lines else "")


# ----------------------------------------------------------------------------- parent side

def _sha256(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


def _run_child(path: Path) -> dict:
    env = dict(os.environ)
    try:
        proc = subprocess.run([sys.executable, __file__, "--one", str(path)], capture_output=True, text=True,
                              timeout=MODEL_SECONDS, env=env)
    except subprocess.TimeoutExpired:
        return {"file": path.name, "read": "timeout", "note": f"over {MODEL_SECONDS} s"}
    lines = [l for l in proc.stdout.splitlines() if l.startswith("{")]
    if not lines:
        tail = (proc.stderr.strip().splitlines() or ["no output"])[-1]
        return {"file": path.name, "read": f"crash ({proc.returncode})", "note": tail[:160]}
    return json.loads(lines[-1])


def _fmt(v) -> str:
    return "-" if v is None else str(v)


def _pct(a: int, b: int) -> str:
    return f"{100 * a / b:.0f} %" if b else "-"


def totals(rows: list[dict], entries: list[dict] | None = None) -> dict:
    """The corpus totals the issue's "done when" is judged by."""
    keys = ("fasteners", "recognised", "stated", "stated_ok", "shape_only", "false")
    tot = {k: sum(r.get(k) or 0 for r in rows) for k in keys}
    tot["models"] = len(rows)
    tot["read"] = sum(1 for r in rows if r.get("read") in ("exit 0", "exit 1"))
    tot["checked_models"] = sum(1 for r in rows if r.get("check_exit") in (0, 1))
    tot["joints"] = sum(r.get("joints") or 0 for r in rows)
    tot["checked_joints"] = sum(r.get("checked") or 0 for r in rows)
    tot["not_analysed"] = sum(r.get("not_analysed_count") or 0 for r in rows)
    tot["seconds"] = round(sum(r.get("seconds") or 0 for r in rows), 1)
    present = {r["file"] for r in rows if r.get("read") != "absent"}
    machines = [e for e in (entries or []) if e.get("machine_scale") and e["local"] in present]
    tot["machine_scale"] = len(machines)
    tot["machine_systems"] = len({e["cad_system"].split()[0] for e in machines})
    return tot


def table(rows: list[dict], entries: list[dict] | None = None) -> str:
    head = (f"{'file':<44} {'read':<7} {'joints':>6} {'fast.':>5} {'recog':>5} {'named':>5} "
            f"{'as nmd':>6} {'shape':>5} {'false':>5} {'checked':>7} {'n/a':>4} {'exit':>4} {'s':>6}")
    out = [head, "-" * len(head)]
    for r in rows:
        out.append(f"{r['file'][:44]:<44} {r.get('read', '?'):<7} {_fmt(r.get('joints')):>6} "
                   f"{_fmt(r.get('fasteners')):>5} {_fmt(r.get('recognised')):>5} {_fmt(r.get('stated')):>5} "
                   f"{_fmt(r.get('stated_ok')):>6} {_fmt(r.get('shape_only')):>5} {_fmt(r.get('false')):>5} "
                   f"{_fmt(r.get('checked')):>7} {_fmt(r.get('not_analysed_count')):>4} "
                   f"{_fmt(r.get('check_exit')):>4} {_fmt(r.get('seconds')):>6}")
    t = totals(rows, entries)
    out.append("-" * len(head))
    out.append(f"read {t['read']}/{t['models']}; fasteners recognised {t['recognised']}/{t['fasteners']} "
               f"({_pct(t['recognised'], t['fasteners'])}); bolts read as named {t['stated_ok']}/{t['stated']} "
               f"({_pct(t['stated_ok'], t['stated'])}); check exit 0/1 on {t['checked_models']}/{t['models']} models; "
               f"joints checked {t['checked_joints']}/{t['joints']} ({t['not_analysed']} not analysed); "
               f"false claims {t['false']}; shape-only hardware {t['shape_only']}; "
               f"machine-scale models {t['machine_scale']} from {t['machine_systems']} CAD systems; "
               f"{t['seconds']:g} s in all")
    notes = [f"  {r['file']}: {r['note']}" for r in rows if r.get("note")]
    if notes:
        out += ["notes:"] + notes
    return "\n".join(out)


def markdown(rows: list[dict], entries: list[dict], when: str, commit: str) -> str:
    """The status page: the table, then one line per failure grouped by who fixes it."""
    lines = [f"# Corpus status — run {when} on main {commit}", "",
             "Columns: read = exit code of `geomjoint scan`; fast. = parts named as bolts/screws/nuts/washers; "
             "recog = of those, recognised as that kind; named = bolts whose name states size and length; "
             "as nmd = of those, read with that size and length; shape = hardware recognised in parts "
             "not named as fasteners; false = findings the model contradicts; checked = joints whose checks "
             "completed with the starter job plus a load; n/a = joints not analysed; exit = of `geomjoint check`.",
             "", "```", table(rows, entries), "```", ""]
    fails = [f for r in rows for f in failures_of(r)]
    for kind, title in KIND_TITLES.items():
        mine = [f for f in fails if f.kind == kind]
        lines.append(f"## {title}: {len(mine)}")
        lines.append("")
        for (model, where, what), count in grouped(mine).items():
            times = f" (×{count})" if count > 1 else ""
            lines.append(f"- {model}: {where}{times}: {what}")
        lines.append("")
    return "\n".join(lines)


def grouped(failures: list[Failure]) -> dict[tuple[str, str, str], int]:
    """Failures of the placements of one product ("screw#2", "screw#3") as one line with a count."""
    out: dict[tuple[str, str, str], int] = {}
    for f in failures:
        key = (f.model, re.sub(r"#\d+$", "", f.where), f.what)
        out[key] = out.get(key, 0) + 1
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--models", type=Path, default=DEFAULT_MODELS, help="folder holding the corpus files")
    ap.add_argument("--only", help="run only files whose name contains this")
    ap.add_argument("--json", type=Path, metavar="FILE", help="write the rows as JSON to FILE")
    ap.add_argument("--markdown", type=Path, metavar="FILE",
                    help="write the table and the failures grouped by kind to FILE")
    ap.add_argument("--fetch-instructions", action="store_true", help="say how to repopulate the folder")
    ap.add_argument("--one", type=Path, help=argparse.SUPPRESS)
    args = ap.parse_args(argv)
    if args.one:
        print(json.dumps(_one(args.one)))
        return 0
    entries = json.loads(MANIFEST.read_text())
    if args.fetch_instructions:
        print(__doc__.split("Repopulating the folder (what ``--fetch-instructions`` prints):")[1]
              .split("For each model")[0].strip())
        for e in entries:
            print(f"  {e['repo']}@{e['commit'][:12]}:{e['path']} -> {args.models / e['local']}")
        return 0
    rows = []
    started = time.strftime("%Y-%m-%d %H:%M UTC", time.gmtime())
    for e in entries:
        if args.only and args.only not in e["local"]:
            continue
        path = args.models / e["local"]
        if not path.exists():
            rows.append({"file": e["local"], "read": "absent"})
            continue
        row = _run_child(path)
        if _sha256(path) != e["sha256"]:
            row["note"] = ("sha256 differs from the manifest; " + row.get("note", "")).strip()
        rows.append(row)
        print(f"  {e['local']}: {row.get('read')} ({row.get('seconds', '-')} s)", file=sys.stderr, flush=True)
    print(table(rows, entries))
    if args.json:
        args.json.write_text(json.dumps(rows, indent=1))
    if args.markdown:
        commit = subprocess.run(["git", "-C", str(HERE), "log", "-1", "--format=%h %s"], capture_output=True,
                                text=True).stdout.strip()
        args.markdown.write_text(markdown(rows, entries, started, commit))
    return 0


if __name__ == "__main__":
    sys.exit(main())
