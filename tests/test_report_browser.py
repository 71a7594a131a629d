"""The HTML report in a real headless browser (Debian's chromium), networking off.

What is checked, and how:

- the page loads from disk (file://) with networking off: every host name resolves to
  nothing (``--host-resolver-rules``) and any request would go to a proxy on a closed
  local port, so a page that needed the network would show its gaps;
- a screenshot (1200 x 2000) is not blank: many distinct colours, and the three verdict
  colours of the summary badges are really painted (the inline CSS was applied);
- the DOM after scripts ran (``--dump-dom``) holds every joint id and every drawing;
- the sorting script works: a copy of the page clicks the preload heading and the rows
  come out in ascending preload order;
- no console messages from the page: chromium, run with ``--enable-logging=stderr --v=0``,
  writes each console message and each uncaught exception of a page as an
  ``INFO:CONSOLE`` line naming its source; a control page that logs an error and throws
  proves that this detection works on the installed chromium.

Chromium missing is a failure, not a skip: CI installs it (``apt-get install -y chromium``).
"""
from __future__ import annotations

import html
import re
import shutil
import subprocess
from pathlib import Path

import pytest
from PIL import Image

from geomjoint.report.html import html_report
from geomjoint.report.plots import VERDICT_COLOURS
from test_report_html import sample_results

CHROMIUM = "/usr/bin/chromium"

#: flags of every run: headless, no sandbox (CI containers run as root), nothing phoned home
FLAGS = [
    "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
    "--disable-background-networking", "--disable-component-update", "--disable-sync",
    # networking off: no name resolves, and any connection would go to a closed local port
    "--host-resolver-rules=MAP * ~NOTFOUND", "--proxy-server=127.0.0.1:9",
    "--enable-logging=stderr", "--v=0",
]

TIMEOUT = 180  # s; the machine may be busy


def _chromium() -> str:
    exe = CHROMIUM if Path(CHROMIUM).exists() else shutil.which("chromium")
    if not exe:
        pytest.fail("chromium is not installed: the browser test needs Debian's chromium "
                    "(apt-get update && apt-get install -y chromium)")
    return exe


def run_chromium(page: Path, tmp: Path, *extra: str) -> subprocess.CompletedProcess:
    profile = tmp / f"profile-{len(list(tmp.glob('profile-*')))}"
    profile.mkdir()
    cmd = [_chromium(), *FLAGS, f"--user-data-dir={profile}", *extra, page.resolve().as_uri()]
    return subprocess.run(cmd, capture_output=True, text=True, timeout=TIMEOUT)


def console_lines(stderr: str, page: Path) -> list[str]:
    """The console messages (and uncaught exceptions) chromium logged while showing ``page``."""
    # only one page is loaded per run, so every console line is the page's
    return [line for line in stderr.splitlines() if ":CONSOLE" in line]


@pytest.fixture(scope="module")
def report(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("browser")
    results = sample_results()
    page = tmp / "report.html"
    page.write_text(html_report(results, title="Pump skid and conveyor drive"), encoding="utf-8")
    return tmp, page, results


def test_console_detection_works_on_this_chromium(tmp_path):
    probe = tmp_path / "probe.html"
    probe.write_text('<!DOCTYPE html><html><body><p>probe</p><script>console.error("probe-error");'
                     'throw new Error("probe-uncaught");</script></body></html>', encoding="utf-8")
    run = run_chromium(probe, tmp_path, "--dump-dom")
    assert run.returncode == 0, run.stderr[-2000:]
    lines = console_lines(run.stderr, probe)
    assert any("probe-error" in x for x in lines), run.stderr[-2000:]
    assert any("Uncaught" in x and "probe-uncaught" in x for x in lines), run.stderr[-2000:]


def test_page_text_has_every_joint_and_no_console_messages(report):
    tmp, page, results = report
    run = run_chromium(page, tmp, "--dump-dom")
    assert run.returncode == 0, run.stderr[-2000:]
    dom = run.stdout
    for r in results:
        assert html.escape(r.id, quote=False) in dom, r.id
    assert len(re.findall(r"<svg\b", dom)) == 3 * len(results)
    assert "Results are engineering estimates for review by a qualified engineer" in dom
    assert console_lines(run.stderr, page) == []


def test_screenshot_is_not_blank(report):
    tmp, page, _ = report
    shot = tmp / "shot.png"
    run = run_chromium(page, tmp, f"--screenshot={shot}", "--window-size=1200,2000")
    assert run.returncode == 0 and shot.exists(), run.stderr[-2000:]
    img = Image.open(shot).convert("RGB")
    assert img.size == (1200, 2000)
    colours = img.getcolors(maxcolors=1 << 20)
    assert colours is not None and len(colours) > 50          # not one colour: text, tables, drawings
    counts = dict((rgb, n) for n, rgb in colours)
    # the summary badges are painted in the verdict colours (antialiasing aside: within 6 per channel)
    for verdict, hex_colour in VERDICT_COLOURS.items():
        target = tuple(int(hex_colour[i:i + 2], 16) for i in (1, 3, 5))
        near = sum(n for rgb, n in counts.items() if max(abs(a - b) for a, b in zip(rgb, target)) <= 6)
        assert near > 100, verdict
    assert console_lines(run.stderr, page) == []


def test_sorting_script_sorts_by_preload(report):
    tmp, page, results = report
    # a copy of the page that clicks the preload heading once the page's own script has run
    clicker = ('<script>document.querySelectorAll("#joints-table th button")[4].click();'
               'document.body.setAttribute("data-sorted", "yes");</script></body>')
    copy = tmp / "report-sorted.html"
    copy.write_text(page.read_text(encoding="utf-8").replace("</body>", clicker), encoding="utf-8")
    run = run_chromium(copy, tmp, "--dump-dom")
    assert run.returncode == 0, run.stderr[-2000:]
    dom = run.stdout
    assert 'data-sorted="yes"' in dom
    table = dom[dom.find('id="joints-table"'):dom.find("</table>", dom.find('id="joints-table"'))]
    shown = [html.unescape(x) for x in re.findall(r'<tr data-joint="([^"]+)"', table)]
    expected = [r.id for r in sorted(results, key=lambda r: r.preload)]
    assert shown == expected
    assert expected != [r.id for r in results]       # the sort really changed the order
    assert 'aria-sort="ascending"' in table
    assert console_lines(run.stderr, copy) == []
