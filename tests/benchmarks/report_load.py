"""The HTML report at 100 and 400 joints: write time, size, and load time in headless chromium (prints numbers).

    python tests/benchmarks/report_load.py [N ...] [--repeat 3]      # default: 100 400 joints

The joints are the three hand-built sample joints of tests/test_report_html.py repeated under
their own ids (drawings, numbers and checks differ only by id, which is what a page costs).
For each N prints: html_report seconds, the page size (and per joint), and the medians over
``--repeat`` runs of chromium (headless, networking off, Debian's /usr/bin/chromium) of:
  DOMContentLoaded   ms from navigation start until the document is parsed
  load               ms until the load event (the page as it first shows: sections closed)
  open all           ms to open every joint's section and lay out every drawing
                     (the drawings are written by the page's script as sections open)

Measured 2026-12-02 (shared 2-core machine, load average 4.2-5.0; medians of 3 at 400):

    joints  size MB  kB/joint  DOMContentLoaded ms  load ms  open all ms
      100     1.05     10.5          229              229        1024
      400     4.19     10.5          480              542        3033
    before (drawings inline in every closed section, load 4.2, one run):
      100     1.53     15.3          275              289         544
      400     6.10     15.3          844              948        1870

The machine bed of check_large.py (clipped-cone tables and the stack-up chart per joint)
makes 15.7 kB a joint: 9.1 kB of tables and text, 5.2 kB of drawing data (four drawings).
"""
from __future__ import annotations

import argparse
import html
import json
import re
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from test_report_browser import FLAGS, TIMEOUT, _chromium, many_results  # noqa: E402

from geomjoint.report.html import html_report  # noqa: E402

_PROBE = """<script>
window.addEventListener("load", function () {
  var nav = performance.getEntriesByType("navigation")[0], t0 = performance.now();
  document.querySelector('[data-open-all="yes"]').click();
  var h = document.body.offsetHeight;                 // forces the layout of every opened section
  document.querySelectorAll("svg").forEach(function (s) { h += s.getBoundingClientRect().width; });
  document.body.setAttribute("data-timing", JSON.stringify({dcl: nav.domContentLoadedEventEnd,
    load: nav.loadEventStart, open: performance.now() - t0, h: h}));
});
</script></body>"""


def load_times(page: Path, tmp: Path, k: int) -> dict:
    probe = tmp / f"probe-{k}.html"
    probe.write_text(page.read_text(encoding="utf-8").replace("</body>", _PROBE), encoding="utf-8")
    profile = tmp / f"profile-{k}"
    profile.mkdir()
    run = subprocess.run([_chromium(), *FLAGS, f"--user-data-dir={profile}", "--dump-dom", probe.as_uri()],
                         capture_output=True, text=True, timeout=TIMEOUT)
    m = re.search(r'data-timing="([^"]*)"', run.stdout)
    if run.returncode != 0 or not m:
        raise SystemExit(f"chromium failed: {run.stderr[-800:]}")
    return json.loads(html.unescape(m.group(1)))


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("counts", nargs="*", type=int, default=[100, 400])
    ap.add_argument("--repeat", type=int, default=3)
    args = ap.parse_args()
    print(f"{'joints':>6} {'write s':>8} {'size MB':>8} {'kB/joint':>9} {'DOMContentLoaded ms':>20} "
          f"{'load ms':>8} {'open all ms':>12}")
    with tempfile.TemporaryDirectory() as tmp:
        for n in args.counts:
            results = many_results(n)
            start = time.perf_counter()
            text = html_report(results, title="Machine bed")
            t_write = time.perf_counter() - start
            page = Path(tmp) / f"report-{n}.html"
            page.write_text(text, encoding="utf-8")
            runs = [load_times(page, Path(tmp), n * 100 + k) for k in range(args.repeat)]
            med = {key: statistics.median(r[key] for r in runs) for key in ("dcl", "load", "open")}
            size = page.stat().st_size
            print(f"{n:>6} {t_write:>8.2f} {size / 1e6:>8.2f} {size / n / 1e3:>9.1f} {med['dcl']:>20.0f} "
                  f"{med['load']:>8.0f} {med['open']:>12.0f}")


if __name__ == "__main__":
    main()
