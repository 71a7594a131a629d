"""One `check` of one job file: analyse, then render every output in memory.

Rendering to bytes (not straight to disk) lets the same function run in a worker of a
Dask cluster and hand its files back; the caller writes them atomically into the output
folder.
"""
from __future__ import annotations

import tempfile
import time
from dataclasses import dataclass, field
from pathlib import Path

from geomjoint.analysis import Analysis, UnanalysedJoint, analyze_job
from geomjoint.job import Job, load_job
from geomjoint.mechanics.joint import JointResult
from geomjoint.outputs import safe_name

RESULTS_JSON = "results.json"
REPORT_TEXT = "report.txt"
REPORT_HTML = "report.html"

#: the outputs a check can write (``--outputs``): results.json, report.txt, report.html, the
#: marked-up STEP and the GLB; a model job writes all of them unless asked for fewer
OUTPUT_KINDS = ("json", "text", "html", "step", "glb")


def parse_outputs(text: str | None) -> frozenset[str]:
    """The output kinds of a comma-separated list ("json,html"); None or "all" is every kind.

    >>> sorted(parse_outputs("json, html"))
    ['html', 'json']
    """
    if text is None or text.strip().lower() == "all":
        return frozenset(OUTPUT_KINDS)
    kinds = {k.strip().lower() for k in text.split(",") if k.strip()}
    unknown = sorted(kinds - set(OUTPUT_KINDS))
    if unknown or not kinds:
        from geomjoint.errors import InputError

        raise InputError(f"unknown output {', '.join(unknown) or '(none)'}; choose from {', '.join(OUTPUT_KINDS)} "
                         f"or all", where="--outputs")
    return frozenset(kinds)


@dataclass
class CheckRun:
    job_path: Path
    inputs: list[Path]               # files that must never be overwritten
    results: list[JointResult]
    document: dict
    table: str
    files: dict[str, bytes] = field(default_factory=dict)
    not_analysed: list[UnanalysedJoint] = field(default_factory=list)
    timings: dict[str, float] = field(default_factory=dict)   # seconds per stage, for benchmarks

    @property
    def failed(self) -> bool:
        """A joint fails, or a model joint could not be analysed (exit 1)."""
        return bool(self.not_analysed) or any(not r.ok for r in self.results)


class _Clock:
    """Seconds per stage of a check (what the benchmark prints)."""

    def __init__(self, timings: dict[str, float]):
        self.timings = timings
        self.last = time.perf_counter()

    def lap(self, stage: str) -> None:
        now = time.perf_counter()
        self.timings[stage] = self.timings.get(stage, 0.0) + now - self.last
        self.last = now


def _model_outputs(job: Job, analysis: Analysis, kinds: frozenset[str], clock: _Clock,
                   parallel: bool = False) -> dict[str, bytes]:
    """The marked-up STEP and GLB of a model job (written by the kernel to a temp folder).

    ``parallel``: the STEP file is written by a forked copy of this process while this one
    writes the GLB (both read the same scene, neither changes it).
    """
    from geomjoint.geometry.glb import write_glb
    from geomjoint.scene import markup_scene

    stem = safe_name(job.model.stem) + "-checked"
    files = {}
    scene = markup_scene(analysis)   # cone solids built once for both files
    clock.lap("scene")
    step_name = f"{stem}.step"
    pending = None
    if "step" in kinds and parallel and "glb" in kinds:
        pending = _ForkedRender(_step_bytes, scene, step_name)
    elif "step" in kinds:
        files[step_name] = _step_bytes(scene, step_name)
        clock.lap("step")
    try:
        if "glb" in kinds:
            with tempfile.TemporaryDirectory(prefix="geomjoint-") as tmp:
                glb = Path(tmp) / f"{stem}.glb"
                write_glb(scene, glb)
                files[glb.name] = glb.read_bytes()
            clock.lap("glb")
    finally:
        if pending is not None:
            files[step_name] = pending.result()
            clock.lap("step (forked, waited for)")
    return dict(sorted(files.items(), key=lambda kv: not kv[0].endswith(".step")))


def _step_bytes(scene, name: str) -> bytes:
    from geomjoint.geometry.markup import write_marked_step

    with tempfile.TemporaryDirectory(prefix="geomjoint-") as tmp:
        step = Path(tmp) / name
        write_marked_step(scene, step)
        return step.read_bytes()


def _html_bytes(results: list[JointResult], arguments: dict) -> bytes:
    from geomjoint.report.html import html_report

    return html_report(results, **arguments).encode("utf-8")


def _parallel(workers: int) -> bool:
    """More than one process allowed (0: every core), and fork available (the model is inherited)."""
    import multiprocessing
    import os

    return (workers or os.cpu_count() or 1) > 1 and "fork" in multiprocessing.get_all_start_methods()


class _ForkedRender:
    """One output rendered by a forked copy of this process (it inherits the results, nothing is
    pickled) into a temporary file; :meth:`result` waits for it.  If the child fails, the
    output is rendered here instead, so a parallel run never loses an output."""

    def __init__(self, render, *args):
        import os

        self.render, self.args = render, args
        fd, name = tempfile.mkstemp(prefix="geomjoint-render-")
        os.close(fd)
        self.path = Path(name)
        self.pid = os.fork()
        if self.pid == 0:  # the child: render, write, leave without running the parent's exit handlers
            code = 1
            try:
                self.path.write_bytes(render(*args))
                code = 0
            finally:
                os._exit(code)

    def result(self) -> bytes:
        import os

        try:
            _, status = os.waitpid(self.pid, 0)
            if os.WIFEXITED(status) and os.WEXITSTATUS(status) == 0:
                return self.path.read_bytes()
            return self.render(*self.args)
        finally:
            self.path.unlink(missing_ok=True)


def run_check(job_path: Path, *, workers: int = 1, quiet: bool = True, version: str = "",
              outputs: frozenset[str] | None = None) -> CheckRun:
    """Analyse one job file and render results.json, report.txt, report.html (+ marked-up model).

    ``outputs``: the kinds of :data:`OUTPUT_KINDS` to render (default all); the result
    document and the table are always made (they are what the command prints).  With more
    than one worker the report page is rendered in a forked process while this one builds
    the marked-up model (the two are independent).
    """
    from geomjoint.report.json_doc import dumps, result_document
    from geomjoint.report.text import result_table

    kinds = frozenset(OUTPUT_KINDS) if outputs is None else frozenset(outputs)
    timings: dict[str, float] = {}
    clock = _Clock(timings)
    job = load_job(job_path)
    analysis = analyze_job(job, workers=workers, quiet=quiet)
    clock.lap("analysis")
    results = analysis.results
    # the reader's remarks on the model file reach every output, not only the scan
    model_findings = [] if analysis.scan is None else [
        {"severity": f.severity, "code": f.code, "message": f.message} for f in analysis.scan.findings]
    document = result_document(results, version, analysis.excluded, analysis.not_analysed, model_findings)
    files: dict[str, bytes] = {}
    if "json" in kinds:
        files[RESULTS_JSON] = dumps(document).encode("utf-8")
    clock.lap("results.json")
    table = result_table(results, job.units, analysis.excluded, analysis.not_analysed, model_findings)
    if "text" in kinds:
        files[REPORT_TEXT] = table.encode("utf-8")
    clock.lap("report.txt")
    model_outputs = analysis.scan is not None and bool(analysis.model_joints) and bool(kinds & {"step", "glb"})
    pending: _ForkedRender | None = None
    if "html" in kinds:
        overview = None
        if analysis.scan is not None and analysis.model_joints:
            from geomjoint.geometry.overview import model_overview
            from geomjoint.report.plots import overview_svg

            scan = analysis.scan
            hardware = {h.part for h in (*scan.bolts, *scan.nuts, *scan.washers)}
            verdicts = {**{u.id: "fail" for u in analysis.not_analysed}, **{r.id: r.verdict for r in results}}
            # meshes the parts at the GLB's tolerance, here in this process, so the GLB reuses them
            overview = overview_svg(model_overview(scan, hardware), verdicts)
        arguments = dict(title=job.title or job.path.stem, units=job.units, overview_svg=overview,
                         not_analysed=analysis.not_analysed, findings=model_findings)
        if model_outputs and _parallel(workers):
            # the page (pure Python) in a forked process while this one builds the marked-up model
            pending = _ForkedRender(_html_bytes, results, arguments)
        else:
            files[REPORT_HTML] = _html_bytes(results, arguments)
        clock.lap("report.html")
    try:
        if model_outputs:
            files.update(_model_outputs(job, analysis, kinds, clock, parallel=_parallel(workers)))
    finally:
        if pending is not None:
            files[REPORT_HTML] = pending.result()
            clock.lap("report.html (forked, waited for)")
    inputs = [job.path] + ([job.model] if job.model else [])
    return CheckRun(job.path, inputs, results, document, table, files, analysis.not_analysed, timings)
