"""Whole-model `check`, every output written, against the bare import + tessellation (prints numbers; not a test).

    python tests/benchmarks/check_large.py [N ...] [--repeat 3] [--workers 1]   # default: 100 200 400 joints

Builds a machine bed of two 12 mm steel plates joined by N M10 hex bolts with washers and nuts
(all hardware modelled, one bolt/nut/washer shape placed N times), writes it to STEP in a
temporary folder, and for each N runs, alternating, ``--repeat`` times:

  import   the reference: cadquery's importStep + tessellate of the whole model (the
           triangles of every placed part, as a viewer needs them) at 0.1 mm / 0.5 rad, the
           deflections this benchmark always used
  xcaf     geomjoint's own reader (XCAF: names, colours, placements) + BRepMesh of every part
           (each definition meshed once), the same deflections
  check    ``checkrun.run_check`` with member_stiffness = "cone": analysis and every output
           rendered to bytes (results.json, report.txt, report.html, marked-up STEP and GLB),
           then written to a new folder

and prints the medians: the scan alone, the analysis (which scans the file itself), each
output's time and size, the whole check, the check/import ratio, the cost per joint and its
growth from the previous N (1.00 = linear), and the peak resident memory of the process.
The ratio is measured in one run, alternating, so a busy machine slows both sides alike; the
load average before and after each N is printed beside the figures.

Measured 2026-12-02 on the shared 2-core machine, load average 4.6-5.3 throughout (other
engineers' test runs: every figure is slower than on an idle machine, the reference import
most of all), medians of 3, ``--workers 1`` (seconds; sizes in MB):

    joints                        100      200      400
    import (cadquery + mesh)     3.83    11.91    25.73
    xcaf import + mesh           2.08     9.67    20.56
    scan                         1.01     2.73     5.18
    analysis (with the scan)     2.29     5.75     9.64
    results.json             0.07/0.91 0.15/1.83 0.26/3.67
    report.txt               0.01/0.01 0.01/0.02 0.01/0.05
    report.html              1.00/1.52 1.86/3.02 4.21/6.04   (overview meshing included)
    scene (cone solids)          0.37     0.89     1.40
    step                     0.38/1.19 0.97/2.33 2.03/4.61   (input 1.36 / 2.64 / 5.20)
    glb                      0.38/0.84 1.13/1.61 1.59/3.16
    whole check, written         4.67    11.21    19.88
    check / import               1.22     0.94     0.77
    ms per joint (growth)        46.7  56.0 (1.20)  49.7 (0.89)

On the quiet machine at the end of the day (load 1.4, 200 joints, medians of 3, workers 1):
import 4.11 s, xcaf 2.44, scan 1.00, analysis 2.20, report.html 0.75, scene 0.31, step 0.35,
glb 0.41, whole check 4.00 s: check / import 0.97, 20.0 ms a joint.

Measured again 2026-12-02 16:05-16:12 UTC on the same machine idle (load average 0.1-1.5),
medians of 3, ``--workers 1``, with the stack-up and hardware work of that day on main:

    joints                        100      200      400
    import (cadquery + mesh)     1.63     4.34    11.24
    xcaf import + mesh           0.84     2.32     6.24
    scan                         0.45     1.02     2.61
    analysis (with the scan)     1.02     2.11     4.80
    report.html              0.35/1.52 0.62/3.02 1.74/6.04
    step                     0.17/1.19 0.37/2.33 0.93/4.61
    glb                      0.16/0.84 0.28/1.61 0.69/3.16
    whole check, written         1.98     3.90     8.97
    check / import               1.21     0.90     0.80
    ms per joint (growth)        19.8  19.5 (0.99)  22.4 (1.15)

Before issue 13's last round (same machine, load 2.8, 200 joints, one run): import 4.87 s,
check 18.53 s, ratio 3.80 (report.html 7.3 s, most of it Watson meshing of the plates for
the overview; analysis 7.7 s).  The reference import grows faster than linearly (OCCT's
default Watson triangulation of a plate face with N holes), the check about linearly.
"""
from __future__ import annotations

import argparse
import math
import os
import resource
import statistics
import tempfile
import time
from pathlib import Path

import cadquery as cq

from geomjoint import catalog

PITCH = 40.0      # bolt spacing, mm
PLATE = 12.0      # plate thickness, mm


def frame(n: int) -> cq.Assembly:
    t = catalog.thread("M10")
    head, nut, washer = catalog.head(t, "hex"), catalog.nut(t), catalog.washer(t)
    hole = catalog.clearance_hole(t, "medium")
    side = math.ceil(math.sqrt(n))
    pts = [((i % side) * PITCH, (i // side) * PITCH) for i in range(n)]
    size = side * PITCH
    centre = (side - 1) * PITCH / 2

    def plate(z0: float) -> cq.Workplane:
        body = cq.Workplane("XY").box(size, size, PLATE, centered=(True, True, False)).translate((centre, centre, z0))
        return body.faces(">Z").workplane(centerOption="ProjectedOrigin", origin=(0, 0, 0)).pushPoints(pts).hole(hole)

    def hex_prism(width: float, height: float) -> cq.Workplane:
        return cq.Workplane("XY").polygon(6, width / math.cos(math.pi / 6)).extrude(height)

    grip = 2 * PLATE + 2 * washer.thickness
    length = catalog.shortest_length(t, grip + nut.height + 2 * t.pitch)
    bolt = hex_prism(head.width, head.height).union(cq.Workplane("XY").circle(t.d / 2).extrude(-length))
    nut_shape = hex_prism(nut.width, nut.height).faces(">Z").workplane().hole(t.d)
    ring = cq.Workplane("XY").circle(washer.outer / 2).circle(washer.inner / 2).extrude(washer.thickness)
    asm = cq.Assembly(name="frame")
    asm.add(plate(0.0), name="lower_plate_steel")
    asm.add(plate(PLATE), name="upper_plate_steel")
    top = 2 * PLATE
    for i, (x, y) in enumerate(pts, start=1):
        asm.add(ring, name=f"washer_M10_{i}", loc=cq.Location((x, y, top)))
        asm.add(ring, name=f"washer_M10_{i}b", loc=cq.Location((x, y, -washer.thickness)))
        asm.add(bolt, name=f"bolt_M10x{length:g}_{i}", loc=cq.Location((x, y, top + washer.thickness)))
        asm.add(nut_shape, name=f"nut_M10_{i}", loc=cq.Location((x, y, -washer.thickness - nut.height)))
    return asm


JOB = """
model = "{model}"
[defaults]
grade = "8.8"
member_stiffness = "cone"
[materials]
"*_steel" = "steel"
[[load]]
joints = "*"
axial = {{ min = "0 kN", max = "4 kN" }}
"""


#: deflections of the reference tessellation: linear mm, angular rad
DEFLECTION, ANGLE = 0.1, 0.5


def bare_import(path: Path) -> float:
    """cadquery's importStep and the triangles of the whole model."""
    start = time.perf_counter()
    shape = cq.importers.importStep(str(path)).val()
    shape.tessellate(DEFLECTION, ANGLE)
    return time.perf_counter() - start


def xcaf_import(path: Path) -> float:
    from OCP.BRepMesh import BRepMesh_IncrementalMesh

    from geomjoint.geometry.model import load_model

    start = time.perf_counter()
    model = load_model(path)
    for part in model.parts:
        BRepMesh_IncrementalMesh(part.solid, DEFLECTION, False, ANGLE, True)
    return time.perf_counter() - start


def one_check(job: Path, out: Path, workers: int) -> tuple[float, dict[str, float], dict[str, int]]:
    from geomjoint.checkrun import run_check
    from geomjoint.outputs import new_output_folder, write_atomic

    start = time.perf_counter()
    run = run_check(job, workers=workers)
    folder = new_output_folder(out, "bench")
    for name, data in run.files.items():
        write_atomic(folder / name, data)
    total = time.perf_counter() - start
    sizes = {name: len(data) for name, data in run.files.items()}
    return total, dict(getattr(run, "timings", {}) or {}), sizes


def _kind(name: str) -> str:
    return "step" if name.endswith(".step") else "glb" if name.endswith(".glb") else name


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("counts", nargs="*", type=int, default=[100, 200, 400])
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--workers", type=int, default=1)
    args = ap.parse_args()
    from geomjoint.geometry.scan import scan_model

    rows = []
    for n in args.counts:
        load_before = os.getloadavg()[0]
        with tempfile.TemporaryDirectory() as tmp:
            path = Path(tmp) / f"frame{n}.step"
            frame(n).export(str(path))
            job = Path(tmp) / "frame.toml"
            job.write_text(JOB.format(model=path.as_posix()), encoding="utf-8")
            t_imp, t_xcaf, t_scan, t_check, stages, sizes = [], [], [], [], {}, {}
            for _ in range(args.repeat):
                t_imp.append(bare_import(path))
                t_xcaf.append(xcaf_import(path))
                start = time.perf_counter()
                scan = scan_model(path)
                t_scan.append(time.perf_counter() - start)
                assert len(scan.joints) == n, (len(scan.joints), n)
                total, timings, sizes = one_check(job, Path(tmp), args.workers)
                t_check.append(total)
                for key, value in timings.items():
                    stages.setdefault(key, []).append(value)
            med = statistics.median
            rows.append((n, med(t_imp), med(t_xcaf), med(t_scan), med(t_check),
                         {k: med(v) for k, v in stages.items()}, sizes, path.stat().st_size))
        peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
        n, imp, xcaf, scan_s, check, st, sz, input_size = rows[-1]
        print(f"\n== {n} joints (median of {args.repeat}, workers {args.workers}; input STEP {input_size / 1e6:.2f} MB; "
              f"load average {load_before:.1f} before, {os.getloadavg()[0]:.1f} after, {os.cpu_count()} cores)")
        print(f"  import (cadquery + tessellate) {imp:8.2f} s")
        print(f"  xcaf import + mesh             {xcaf:8.2f} s")
        print(f"  scan                           {scan_s:8.2f} s")
        for key, value in st.items():
            size = sum(v for name, v in sz.items() if _kind(name) == key)
            shown = f"{size / 1e6:8.2f} MB" if size else ""
            print(f"  {key:<30} {value:8.2f} s {shown}")
        for name, v in sz.items():
            if _kind(name) not in st:
                print(f"  {name:<30} {'':>8}   {v / 1e6:8.2f} MB")
        print(f"  whole check (written)          {check:8.2f} s")
        print(f"  check/import                   {check / imp:8.2f}")
        print(f"  check per joint                {1000 * check / n:8.1f} ms")
        print(f"  peak memory                    {peak:8.0f} MB")
    print("\n joints  import s  check s  check/imp  ms/joint  growth")
    previous = None
    for n, imp, _x, _s, check, *_ in rows:
        growth = f"{(check / n) / (previous[1] / previous[0]):.2f}" if previous else "-"
        print(f"{n:>7} {imp:>9.2f} {check:>8.2f} {check / imp:>10.2f} {1000 * check / n:>9.1f} {growth:>7}")
        previous = (n, check)
    print("growth: cost per joint against the previous N (1.00 = flat)")


if __name__ == "__main__":
    main()
