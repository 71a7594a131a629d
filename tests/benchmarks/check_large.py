"""Whole-model check time against the bare STEP import (prints numbers; not a test).

    python tests/benchmarks/check_large.py [N ...]        # default: 100 200 400 joints

Builds a frame of two 12 mm steel plates joined by N M10 hex bolts with washers and nuts
(all hardware modelled, one bolt/nut/washer shape placed N times), writes it to STEP in a
temporary folder and prints:
  import s   bare STEP import through OCP (XCAF) + tessellation of every part
  scan s     `geomjoint scan` (holes, stacks, hardware, findings)
  check s    `geomjoint check` with member_stiffness = "cone" (clipped cones), 1 worker
  ratios     scan/import and check/import, and the growth of check time from the previous N
  peak MB    peak resident memory of this process so far
"""
from __future__ import annotations

import math
import resource
import sys
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


def bare_import(path: Path) -> float:
    from OCP.BRepMesh import BRepMesh_IncrementalMesh

    from geomjoint.geometry.model import load_model

    start = time.perf_counter()
    model = load_model(path)
    for part in model.parts:
        BRepMesh_IncrementalMesh(part.solid, 0.1, False, 0.5, True)
    return time.perf_counter() - start


def main(counts: list[int]) -> None:
    from geomjoint.analysis import analyze_job
    from geomjoint.geometry.scan import scan_model
    from geomjoint.job import parse_job

    print(f"{'joints':>6} {'import s':>9} {'scan s':>8} {'check s':>8} {'scan/imp':>9} {'check/imp':>10} "
          f"{'growth':>7} {'peak MB':>8}")
    previous = None
    for n in counts:
        with tempfile.TemporaryDirectory() as tmp:
            path = Path(tmp) / f"frame{n}.step"
            frame(n).export(str(path))
            t_import = bare_import(path)
            start = time.perf_counter()
            scan = scan_model(path)
            t_scan = time.perf_counter() - start
            job = parse_job(JOB.format(model=path.as_posix()), Path(tmp) / "frame.toml")
            start = time.perf_counter()
            results = analyze_job(job, workers=1).results   # the whole check: it scans the file itself
            t_check = time.perf_counter() - start
            assert len(results) == n == len(scan.joints), (len(results), n, len(scan.joints))
        growth = f"{t_check / previous[1] / (n / previous[0]):.2f}" if previous else "-"
        peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
        print(f"{n:>6} {t_import:>9.2f} {t_scan:>8.2f} {t_check:>8.2f} {t_scan / t_import:>9.2f} "
              f"{t_check / t_import:>10.2f} {growth:>7} {peak:>8.0f}")
        previous = (n, t_check)
    print("growth: check time ratio divided by the joint-count ratio (1.00 = linear)")


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [100, 200, 400])
