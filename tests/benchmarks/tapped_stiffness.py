"""Member stiffness of tapped joints by every method, under one definition; table and plot.

Run: PYTHONPATH=. python tests/benchmarks/tapped_stiffness.py [--plot docs/tapped_stiffness.png]

Prints a Markdown table (the one in docs/tapped_stiffness.md) of k_m by the frustum (the
clamped layers' share of the Shigley Table 8-7 frusta), the exponential fit (Wileman, by
symmetry), the VDI 2230-1 tapped-joint body (ESV) and the axisymmetric FE (thread load
decaying along the engagement, and uniform), all with the member = the clamped layers
(docs/tapped_stiffness.md), and the compliance each puts in series with the bolt for the
tapped part.  Geometries: the cases of tests/test_tapped_stiffness.py.
"""
from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from tapped_cases import CASES, fe_result, method_values  # noqa: E402


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--plot", help="write the comparison plot (PNG) here")
    args = parser.parse_args()
    rows = []
    print("| case | frustum (T8-7 share) | exponential | VDI ESV | FE decaying | FE uniform | "
          "frustum/FE | exp./FE | VDI/FE | tapped part T8-7 / VDI δ_M / FE (1e-9 mm/N) | s |")
    print("|---|---|---|---|---|---|---|---|---|---|---|")
    for case in CASES:
        t0 = time.perf_counter()
        m = method_values(case)
        fe = fe_result(case, "decaying")
        uni = fe_result(case, "uniform")
        seconds = time.perf_counter() - t0
        k = fe.stiffness
        rows.append((case, m, fe.stiffness, uni.stiffness))
        print(f"| {case.label} | {m.frustum / 1e6:.3f} | {m.exponential / 1e6:.3f} | {m.vdi / 1e6:.3f} | "
              f"{k / 1e6:.3f} | {uni.stiffness / 1e6:.3f} | {m.frustum / k - 1:+.1%} | {m.exponential / k - 1:+.1%} | "
              f"{m.vdi / k - 1:+.1%} | {m.tapped_frustum * 1e9:.0f} / {m.tapped_vdi * 1e9:.0f} / "
              f"{fe.thread_region_compliance * 1e9:.0f} | {seconds:.1f} |", flush=True)
    if args.plot:
        import matplotlib
        matplotlib.use("Agg")
        import matplotlib.pyplot as plt

        fig, ax = plt.subplots(figsize=(9.0, 4.6))
        names = [r[0].label for r in rows]
        x = range(len(rows))
        series = [("frustum (Table 8-7 share)", lambda r: r[1].frustum, "o"),
                  ("exponential (Wileman, by symmetry)", lambda r: r[1].exponential, "s"),
                  ("VDI 2230-1 ESV", lambda r: r[1].vdi, "^"),
                  ("FE, uniform thread load", lambda r: r[3], "x")]
        for label, value, marker in series:
            ax.plot(list(x), [value(r) / r[2] for r in rows], marker, label=label, ms=7)
        ax.axhline(1.0, color="k", lw=0.8)
        ax.axhspan(0.9, 1.1, color="0.9", zorder=0, label="FE (decaying thread load) ± 10 %")
        ax.set_xticks(list(x))
        ax.set_xticklabels(names, rotation=20, ha="right", fontsize=8)
        ax.set_ylabel("k_m / k_m(FE)")
        ax.set_title("Tapped joints: member stiffness (clamped layers) by method")
        ax.set_ylim(0.8, 1.6)
        ax.legend(fontsize=7, loc="upper left", bbox_to_anchor=(1.01, 1.0))
        fig.tight_layout()
        fig.savefig(args.plot, dpi=120)
        print(f"plot: {args.plot}")


if __name__ == "__main__":
    main()
