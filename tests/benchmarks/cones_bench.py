"""Timing of clipped pressure cones: one joint, and a 200-joint plate model.

Scenario (a demo of our own): a conveyor drive base, a 12 mm steel top plate bolted to a
16 mm aluminium base plate by a 20 × 10 grid of M12 bolts at 30 mm pitch, so the cones
of neighbouring bolts overlap and the outer rows run into the plate edges.

Prints seconds for: the STEP import of the model (cadquery.importers.importStep), one
joint with a cold cache, every joint with a shared cache, the cone solids of one joint;
and the ratio of the cone work to the STEP import.

Run: .venv/bin/python tests/benchmarks/cones_bench.py [--rows 10 --cols 20]
"""
from __future__ import annotations

import argparse
import math
import os
import tempfile
import time

import cadquery as cq
import numpy as np

from geomjoint.geometry.cones import ConeCache, ConeJoint, ConeLayer, clipped_cone_stiffness, cone_solids

PITCH = 30.0       # mm
MARGIN = 16.0      # mm, hole centre to plate edge
HOLE = 13.0        # mm, M12 medium clearance hole (ISO 273)
DW = 18.0          # mm, bearing diameter (about 1.5·d, Shigley 10th ed. §8-5)
T_TOP, T_BASE = 12.0, 16.0
E_STEEL, E_ALU = 207_000.0, 71_000.0   # MPa, Shigley 10th ed. Table 8-8


def build(rows: int, cols: int):
    width = (cols - 1) * PITCH + 2 * MARGIN
    depth = (rows - 1) * PITCH + 2 * MARGIN
    pts = [(MARGIN + i * PITCH - width / 2, MARGIN + j * PITCH - depth / 2)
           for i in range(cols) for j in range(rows)]
    base = (cq.Workplane("XY").box(width, depth, T_BASE, centered=(True, True, False))
            .faces(">Z").workplane().pushPoints(pts).hole(HOLE))
    top = (cq.Workplane("XY").workplane(offset=T_BASE).box(width, depth, T_TOP, centered=(True, True, False))
           .faces(">Z").workplane().pushPoints(pts).hole(HOLE))
    return pts, top.val(), base.val()


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--rows", type=int, default=10)
    ap.add_argument("--cols", type=int, default=20)
    args = ap.parse_args()

    t0 = time.perf_counter()
    pts, top, base = build(args.rows, args.cols)
    t_build = time.perf_counter() - t0

    with tempfile.TemporaryDirectory() as tmp:
        path = os.path.join(tmp, "drive_base.step")
        cq.exporters.export(cq.Workplane().add(cq.Compound.makeCompound([top, base])), path)
        t0 = time.perf_counter()
        imported = cq.importers.importStep(path)
        t_import = time.perf_counter() - t0
    solids = imported.solids().vals()
    # the imported solids are what a real run would use: pick them by height
    solids.sort(key=lambda s: s.Center().z)
    base_s, top_s = solids[0].wrapped, solids[1].wrapped

    z_top = T_BASE + T_TOP
    joints = [
        ConeJoint(f"J{k + 1}", (x, y, z_top), (0.0, 0.0, -1.0),
                  [ConeLayer(top_s, 0.0, T_TOP, E_STEEL, "top plate", HOLE),
                   ConeLayer(base_s, T_TOP, T_TOP + T_BASE, E_ALU, "base plate", HOLE)],
                  DW, DW)
        for k, (x, y) in enumerate(pts)
    ]
    xy = np.asarray(pts)
    reach = 2 * (DW / 2 + 0.5 * (T_TOP + T_BASE) * math.tan(math.radians(30.0)))

    def neighbours_of(k):
        d = np.hypot(*(xy - xy[k]).T)
        return [joints[i] for i in np.nonzero((d > 0) & (d < reach))[0]]

    t0 = time.perf_counter()
    one = clipped_cone_stiffness(joints[0], neighbours_of(0), cache=ConeCache())
    t_one_cold = time.perf_counter() - t0

    cache = ConeCache()
    t0 = time.perf_counter()
    results = [clipped_cone_stiffness(j, neighbours_of(k), cache=cache) for k, j in enumerate(joints)]
    t_all = time.perf_counter() - t0

    t0 = time.perf_counter()
    shapes = cone_solids(joints[len(joints) // 2], neighbours_of(len(joints) // 2))
    t_solids = time.perf_counter() - t0

    k = np.array([r.stiffness for r in results])
    ratio = k / np.array([r.ideal_stiffness for r in results])
    print(f"model: {len(joints)} joints, plates {T_TOP:g} mm steel on {T_BASE:g} mm aluminium, pitch {PITCH:g} mm")
    print(f"build model (cadquery)            {t_build:8.3f} s")
    print(f"STEP import (importStep)          {t_import:8.3f} s")
    print(f"one joint, cold cache             {t_one_cold:8.3f} s   ({t_one_cold / t_import:.3f} x import)")
    print(f"all {len(joints)} joints, shared cache     {t_all:8.3f} s   ({t_all / t_import:.3f} x import)")
    print(f"  per joint                       {t_all / len(joints):8.4f} s")
    print(f"cone solids of one joint ({len(shapes)})      {t_solids:8.3f} s")
    print(f"k_m clipped/ideal: min {ratio.min():.4f}  median {np.median(ratio):.4f}  max {ratio.max():.4f}")
    print(f"first joint (corner): k_m = {one.stiffness:.4g} N/mm, ideal {one.ideal_stiffness:.4g} N/mm, "
          f"lost at mid-grip: edges {one.lost_to_edges:.3f}, neighbours {one.lost_to_neighbours:.3f}")


if __name__ == "__main__":
    main()
