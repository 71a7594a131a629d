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

For each model the script runs, in a child process (a kernel crash costs one row):

1. ``scan``: is the file read (exit code of the reader), how many joints, how many of
   the modelled fasteners (parts whose product name says screw / bolt / a size such as
   "M5x25" or "#10-32 x 1/2") are recognised as bolts, and how many of those whose name
   states size and length are read with that size and length (±0.6 mm).
2. ``init``: the starter job, written into a scratch copy of the model's folder.
3. ``check``: the starter job with ``default_material = "steel"`` for the parts the
   starter left as TODO and one axial load on every joint (0 .. 1 kN; none when the scan
   found no joint); the row counts the joints whose checks completed (the JSON
   document's ``checks`` list not empty) and gives the exit code.

Usage::

    python tests/realworld/run_corpus.py [--models DIR] [--only SUBSTRING] [--json]
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
from pathlib import Path

HERE = Path(__file__).resolve().parent
MANIFEST = HERE / "manifest.json"
DEFAULT_MODELS = Path(os.environ.get("GEOMJOINT_REALMODELS", "/work/realmodels"))
#: seconds one model may take (scan + init + check) before its row says "timeout"
MODEL_SECONDS = 900
#: a modelled length matches the name's length within this, mm (half a millimetre of
#: rounding in the exporting system plus tolerance)
LENGTH_TOL = 0.6

#: words in a product name that say the part is a threaded fastener (common practice in
#: fastener libraries and catalogue part numbers)
FASTENER_WORDS = re.compile(
    r"screw|bolt|(?<![A-Za-z])(SHCS|BHCS|FHCS|SHSS)(?![A-Za-z])|DIN\s?-?(912|931|933|7991|7380|7984|6912|965|963)(?!\d)|"
    r"ISO\s?-?(4762|4014|4017|7380|10642|7045|1580|4026|4029|14579|14580|14583)(?!\d)",
    re.I)
#: size and length in a name: "M5x25", "M3 x 10", "#10-32 x 1/2", "1/4-20 x 3/4"
METRIC_SIZE = re.compile(r"(?<![A-Za-z])M(\d+(?:[.,]\d+)?)\s*(?:[xX×*]\s*\d+(?:[.,]\d+)?\s*)?[xX×*]\s*(\d+(?:[.,]\d+)?)")
INCH_SIZE = re.compile(r"(#\d{1,2}|\d+/\d+|\d+(?:\.\d+)?)\s*-\s*(\d{2,3})\s*[xX×]\s*(\d+[ -]\d+/\d+|\d+/\d+|\d+(?:\.\d+)?)")


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


def is_fastener_name(name: str) -> bool:
    return bool(FASTENER_WORDS.search(name)) and not re.search(r"bearing|washer|nut\b", name, re.I)


def _designation_matches(stated: str, nominal: str | None) -> bool:
    if not nominal:
        return False
    base = nominal.split()[0]
    return base == stated or base.split("x")[0] == stated


# ----------------------------------------------------------------------------- child side

def _one(path: Path) -> dict:
    """Everything measured for one model (runs in the child process)."""
    from geomjoint import cli
    from geomjoint.errors import InputError
    from geomjoint.geometry.hardware import thread_for_diameter
    from geomjoint.geometry.scan import scan_model

    row: dict = {"file": path.name, "read": "?", "joints": None, "fasteners": 0, "recognised": 0,
                 "stated": 0, "stated_ok": 0, "checked": None, "check_exit": None, "note": ""}
    t0 = time.perf_counter()
    try:
        scan = scan_model(path)
    except InputError as exc:
        row["read"] = "exit 2"
        row["note"] = str(exc)[:160]
        row["seconds"] = round(time.perf_counter() - t0, 1)
        return row
    row["read"] = "ok"
    row["joints"] = len(scan.joints)
    bolts = {b.part: b for b in scan.bolts}
    nominal = {j.bolt.part: j.nominal for j in scan.joints if j.bolt}
    missed, wrong = [], []
    for part in scan.model.parts:
        label = " ".join(n for n in (part.product, part.name) if n)
        if not is_fastener_name(label):
            continue
        row["fasteners"] += 1
        b = bolts.get(part.name)
        if b is not None:
            row["recognised"] += 1
        else:
            missed.append(part.name)
        stated = stated_size(label)
        if stated is None:
            continue
        row["stated"] += 1
        if b is None:
            continue
        t = nominal.get(part.name)
        if t is None:
            th = thread_for_diameter(b.d)
            t = th.designation if th else None
        if _designation_matches(stated[0], t) and abs(b.length - stated[1]) <= LENGTH_TOL:
            row["stated_ok"] += 1
        else:
            wrong.append(f"{part.name}: {t}x{b.length:.1f} (name {stated[0]}x{stated[1]:g})")
    row["missed"] = missed[:8]
    row["wrong"] = wrong[:8]
    row["codes"] = sorted({f.code for j in scan.joints for f in j.findings})
    # init + check in a scratch folder (the model is copied, never touched)
    with tempfile.TemporaryDirectory(prefix="gj-corpus-") as tmp:
        model = Path(tmp) / path.name
        shutil.copyfile(path, model)
        code, said = _quiet(cli.main, ["init", str(model)])
        job = model.with_suffix(".toml")
        if code != 0 or not job.exists():
            row["note"] = f"init exit {code}: {said}"
            row["seconds"] = round(time.perf_counter() - t0, 1)
            return row
        text = job.read_text()
        text = text.replace("[defaults]", 'default_material = "steel"\n\n[defaults]', 1)
        if scan.joints:   # a load rule that matches nothing is an error of the job
            text += '\n[[load]]\njoints = "*"\naxial = { min = "0 kN", max = "1 kN" }\n'
        job.write_text(text)
        out = Path(tmp) / "out"
        code, said = _quiet(cli.main, ["check", str(job), "--out", str(out), "--workers", "1"])
        row["check_exit"] = code
        if code not in (0, 1):
            row["note"] = f"check: {said.replace(str(tmp), '')}"[:200]
        results = out / "results.json"
        if results.exists():
            doc = json.loads(results.read_text())
            row["checked"] = sum(1 for j in doc.get("joints", []) if j.get("checks"))
        else:
            row["checked"] = 0
    row["seconds"] = round(time.perf_counter() - t0, 1)
    return row


def _quiet(fn, argv) -> tuple[int, str]:
    """Run a command with its terminal output kept aside (the table is the output): exit
    code and the last line it printed on stderr."""
    import contextlib
    import io

    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = fn(argv)
        except SystemExit as exc:
            code = int(exc.code or 0)
    lines = [l for l in err.getvalue().splitlines() if l.strip()]
    return code, (lines[-1] if lines else "")


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
        return {"file": path.name, "read": "timeout"}
    lines = [l for l in proc.stdout.splitlines() if l.startswith("{")]
    if not lines:
        tail = (proc.stderr.strip().splitlines() or ["no output"])[-1]
        return {"file": path.name, "read": f"crash ({proc.returncode})", "note": tail[:160]}
    return json.loads(lines[-1])


def _fmt(v) -> str:
    return "-" if v is None else str(v)


def table(rows: list[dict]) -> str:
    head = (f"{'file':<48} {'read':<8} {'joints':>6} {'fast.':>5} {'recog':>5} {'named':>5} "
            f"{'as named':>8} {'checked':>7} {'exit':>4} {'s':>6}")
    out = [head, "-" * len(head)]
    tot = {"fasteners": 0, "recognised": 0, "stated": 0, "stated_ok": 0}
    for r in rows:
        for k in tot:
            tot[k] += r.get(k) or 0
        out.append(f"{r['file'][:48]:<48} {r.get('read', '?'):<8} {_fmt(r.get('joints')):>6} "
                   f"{_fmt(r.get('fasteners')):>5} {_fmt(r.get('recognised')):>5} {_fmt(r.get('stated')):>5} "
                   f"{_fmt(r.get('stated_ok')):>8} {_fmt(r.get('checked')):>7} {_fmt(r.get('check_exit')):>4} "
                   f"{_fmt(r.get('seconds')):>6}")
    read = sum(1 for r in rows if r.get("read") == "ok")
    out.append("-" * len(head))
    pct = (lambda a, b: f"{100 * a / b:.0f} %" if b else "-")
    out.append(f"read {read}/{len(rows)}; fasteners recognised {tot['recognised']}/{tot['fasteners']} "
               f"({pct(tot['recognised'], tot['fasteners'])}); read as named {tot['stated_ok']}/{tot['stated']} "
               f"({pct(tot['stated_ok'], tot['stated'])}); checks completed on "
               f"{sum(1 for r in rows if r.get('check_exit') in (0, 1))}/{len(rows)} models")
    notes = [f"  {r['file']}: {r['note']}" for r in rows if r.get("note")]
    if notes:
        out += ["notes:"] + notes
    return "\n".join(out)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--models", type=Path, default=DEFAULT_MODELS, help="folder holding the corpus files")
    ap.add_argument("--only", help="run only files whose name contains this")
    ap.add_argument("--json", action="store_true", help="print the rows as JSON after the table")
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
    print(table(rows))
    if args.json:
        print(json.dumps(rows, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
