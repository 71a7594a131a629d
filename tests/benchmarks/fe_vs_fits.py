"""Axisymmetric FE member stiffness against the Wileman fit and the 30 deg frustum, with timings.

Two equal plates of one material, hole d, bearing diameter 1.5 d on both sides (the set-up
of Wileman, Choudhury & Green, J. Mech. Design 113 (1991) 432-437), d/l from 0.1 to 1.5.
Columns: k_m / (E d) by FE with a rigid bearing face and with a uniform bearing pressure
(contact interfaces), by the Wileman fit k_m = E d A exp(B d / l) (constants Shigley 10th ed.
Table 8-8) and by two 30 deg frusta (Shigley eq. 8-20); deviations in % from the fit; the
contact-zone diameter over d; the wall and CPU time per FE joint (2 cores shared, so the wall
time depends on the load of the machine).

Run:  .venv/bin/python tests/benchmarks/fe_vs_fits.py
"""
from __future__ import annotations

import time

from geomjoint.mechanics.fe import FeLayer, fe_member_stiffness
from geomjoint.mechanics.members import WILEMAN_CONSTANTS, frustum_stiffness, wileman_stiffness

#: E (MPa) and Poisson's ratio, Shigley 10th ed. Table 8-8 (from memory)
MATERIALS = {
    "steel": (206_800.0, 0.291),
    "aluminium": (71_000.0, 0.334),
    "copper": (118_600.0, 0.326),
    "gray cast iron": (100_000.0, 0.211),
}
D_OVER_L = (0.1, 0.25, 0.5, 0.75, 1.0, 1.25, 1.5)
D = 12.0            # bolt diameter, mm (the comparison is dimensionless in k_m / (E d))


def _timed(**kwargs):
    wall, cpu = time.perf_counter(), time.process_time()
    res = fe_member_stiffness(**kwargs)
    return res, time.perf_counter() - wall, time.process_time() - cpu


def main() -> None:
    walls, cpus, worst_change = [], [], 0.0
    head = (f"{'material':<15}{'d/l':>5}{'FE rigid':>10}{'FE press':>10}{'Wileman':>9}{'frustum':>9}"
            f"{'dev rig%':>9}{'dev prs%':>9}{'dev fru%':>9}{'d_c/d':>7}{'mesh%':>7}{'wall s':>8}{'cpu s':>7}")
    print(head)
    print("-" * len(head))
    for material, (E, nu) in MATERIALS.items():
        A, B = WILEMAN_CONSTANTS[material]
        for dl in D_OVER_L:
            l = D / dl
            layers = [FeLayer(l / 2, E, nu)] * 2
            rigid, w1, c1 = _timed(layers=layers, hole_diameter=D, bearing_diameter=1.5 * D)
            press, w2, c2 = _timed(layers=layers, hole_diameter=D, bearing_diameter=1.5 * D,
                                   bearing="pressure")
            walls += [w1, w2]
            cpus += [c1, c2]
            worst_change = max(worst_change, rigid.mesh_change, press.mesh_change)
            fit = wileman_stiffness(E, D, l, A, B)
            fru = frustum_stiffness([(l / 2, E), (l / 2, E)], 1.5 * D, None, D, alpha=30.0)
            n = E * D
            print(f"{material:<15}{dl:>5.2f}{rigid.stiffness / n:>10.4f}{press.stiffness / n:>10.4f}"
                  f"{fit / n:>9.4f}{fru / n:>9.4f}"
                  f"{100 * (rigid.stiffness / fit - 1):>9.1f}{100 * (press.stiffness / fit - 1):>9.1f}"
                  f"{100 * (fru / fit - 1):>9.1f}{rigid.contact_diameters[0] / D:>7.2f}"
                  f"{100 * rigid.mesh_change:>7.2f}{(w1 + w2) / 2:>8.2f}{(c1 + c2) / 2:>7.2f}")
    print()
    print(f"FE joints: {len(walls)}; mean time per joint: wall {sum(walls) / len(walls):.2f} s, "
          f"CPU {sum(cpus) / len(cpus):.2f} s; max {max(walls):.2f} s wall")
    print(f"largest change of k_m under one uniform mesh refinement: {100 * worst_change:.2f} %")


if __name__ == "__main__":
    main()
