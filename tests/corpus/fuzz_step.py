"""Mutate a STEP file at random and count how `geomjoint scan` ends (a tool, not a test).

    .venv/bin/python tests/corpus/fuzz_step.py [N] [MODEL.step] [SEED]

Each mutant (a few characters of the DATA section deleted or replaced by STEP tokens) is
scanned in a forked child (geomjoint.limits.run_in_child), so a crash of the CAD kernel is
counted instead of ending the run. Prints the count per outcome: exit codes 0/1/2, "crash"
(the child died by a signal), "hang" (over 60 s), and the first few mutants that ended in
exit 3, a traceback or more than one error line. After the reader is hardened, "crash"
should be 0 and nothing should be listed.
"""
from __future__ import annotations

import contextlib
import io
import random
import sys
import tempfile
from pathlib import Path

from geomjoint import limits
from geomjoint.cli import main

HERE = Path(__file__).resolve().parent
TOKENS = list("#(),.'$*=;0123456789E-") + ["#9999", "1.E+300", "$", "()", "''", ".T.", ".F."]


def scan_text(text: str) -> tuple[int, str]:
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "mutant.step"
        path.write_text(text)
        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            code = main(["scan", str(path), "--json"])
    return code, err.getvalue()


def fuzz(n: int, model: Path, seed: int) -> dict:
    base = model.read_text()
    data_at = base.index("DATA;")
    rng = random.Random(seed)
    counts: dict = {}
    odd = []
    for _ in range(n):
        at = rng.randrange(data_at, len(base) - 30)
        cut = rng.randrange(0, 8)
        insert = "".join(rng.choice(TOKENS) for _ in range(rng.randrange(0, 3)))
        text = base[:at] + insert + base[at + cut:]
        try:
            code, err = limits.run_in_child(scan_text, text, seconds=60)
        except limits.ChildCrashed:
            code, err = "crash", ""
        except limits.JointTimeout:
            code, err = "hang", ""
        counts[code] = counts.get(code, 0) + 1
        if code == 3 or "Traceback" in err or (code == 2 and len(err.strip().splitlines()) != 1):
            odd.append((code, err.strip()[-200:], at, cut, insert))
    return {"counts": counts, "odd": odd[:5]}


if __name__ == "__main__":
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 100
    model = Path(sys.argv[2]) if len(sys.argv) > 2 else HERE / "step" / "plate_pair.step"
    seed = int(sys.argv[3]) if len(sys.argv) > 3 else 1
    result = fuzz(n, model, seed)
    print(f"{n} mutants of {model.name} (seed {seed}): {result['counts']}")
    for code, err, at, cut, insert in result["odd"]:
        print(f"  exit {code} at {at} (cut {cut}, insert {insert!r}): {err}")
