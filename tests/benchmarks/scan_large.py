"""Scan time for a plate pair with N matching holes (no timed test; this prints numbers).

    python tests/benchmarks/scan_large.py [N ...]      # default: 100 300 1000

Builds two 10 mm plates with an N-hole grid (11 mm holes at 25 mm pitch), scans the
in-memory assembly and prints the time per hole for the whole scan and for the
stack matching alone (the k-d tree step).
"""
from __future__ import annotations

import math
import sys
import time

import cadquery as cq


def plate_pair(n: int) -> cq.Assembly:
    side = math.ceil(math.sqrt(n))
    pitch = 25.0
    pts = [((i % side) * pitch, (i // side) * pitch) for i in range(n)]
    size = side * pitch + 20
    c = (side - 1) * pitch / 2

    def plate(t, z0):
        w = cq.Workplane("XY").box(size, size, t, centered=(True, True, False)).translate((c, c, z0))
        return w.faces(">Z").workplane(centerOption="ProjectedOrigin", origin=(0, 0, 0)).pushPoints(pts).hole(11.0)

    a = cq.Assembly(name="plates")
    a.add(plate(10, 0.0), name="lower_plate")
    a.add(plate(10, 10.0), name="upper_plate")
    return a


def main(counts: list[int]) -> None:
    from geomjoint.geometry import stacks
    from geomjoint.geometry.scan import scan_model

    print(f"{'holes':>6} {'build s':>8} {'scan s':>8} {'ms/hole':>8} {'match ms/hole':>14} joints")
    for n in counts:
        t0 = time.perf_counter()
        assy = plate_pair(n)
        t1 = time.perf_counter()
        timing = {}
        original = stacks.find_joints

        def timed(*args, **kw):
            s = time.perf_counter()
            out = original(*args, **kw)
            timing["match"] = time.perf_counter() - s
            return out

        import geomjoint.geometry.scan as scan_mod
        scan_mod.find_joints = timed
        try:
            res = scan_model(assy)
        finally:
            scan_mod.find_joints = original
        t2 = time.perf_counter()
        holes = 2 * n
        print(f"{holes:>6} {t1 - t0:>8.2f} {t2 - t1:>8.2f} {1000 * (t2 - t1) / holes:>8.3f} "
              f"{1000 * timing['match'] / holes:>14.4f} {len(res.joints)}")
        assert len(res.joints) == n, "every hole pair should be one joint"


if __name__ == "__main__":
    main([int(a) for a in sys.argv[1:]] or [100, 300, 1000])
