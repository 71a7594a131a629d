"""One `check` of one job file: analyse, then render every output in memory.

Rendering to bytes (not straight to disk) lets the same function run in a worker of a
Dask cluster and hand its files back; the caller writes them atomically into the output
folder.
"""
from __future__ import annotations

import tempfile
from dataclasses import dataclass, field
from pathlib import Path

from geomjoint.analysis import Analysis, UnanalysedJoint, analyze_job
from geomjoint.job import Job, load_job
from geomjoint.mechanics.joint import JointResult
from geomjoint.outputs import safe_name

RESULTS_JSON = "results.json"
REPORT_TEXT = "report.txt"
REPORT_HTML = "report.html"


@dataclass
class CheckRun:
    job_path: Path
    inputs: list[Path]               # files that must never be overwritten
    results: list[JointResult]
    document: dict
    table: str
    files: dict[str, bytes] = field(default_factory=dict)
    not_analysed: list[UnanalysedJoint] = field(default_factory=list)

    @property
    def failed(self) -> bool:
        """A joint fails, or a model joint could not be analysed (exit 1)."""
        return bool(self.not_analysed) or any(not r.ok for r in self.results)


def _model_outputs(job: Job, analysis: Analysis) -> dict[str, bytes]:
    """The marked-up STEP and GLB of a model job (written by the kernel to a temp folder)."""
    from geomjoint.scene import write_marked_model

    stem = safe_name(job.model.stem) + "-checked"
    files = {}
    with tempfile.TemporaryDirectory(prefix="geomjoint-") as tmp:
        step, glb = Path(tmp) / f"{stem}.step", Path(tmp) / f"{stem}.glb"
        write_marked_model(analysis, step=step, glb=glb)   # cone solids built once for both files
        for path in (step, glb):
            files[path.name] = path.read_bytes()
    return files


def run_check(job_path: Path, *, workers: int = 1, quiet: bool = True, version: str = "") -> CheckRun:
    """Analyse one job file and render results.json, report.txt, report.html (+ marked-up model)."""
    from geomjoint.report.html import html_report
    from geomjoint.report.json_doc import dumps, result_document
    from geomjoint.report.text import result_table

    job = load_job(job_path)
    analysis = analyze_job(job, workers=workers, quiet=quiet)
    results = analysis.results
    document = result_document(results, version, analysis.excluded, analysis.not_analysed)
    table = result_table(results, job.units, analysis.excluded, analysis.not_analysed)
    overview = None
    if analysis.scan is not None and analysis.model_joints:
        from geomjoint.geometry.overview import model_overview
        from geomjoint.report.plots import overview_svg

        scan = analysis.scan
        hardware = {h.part for h in (*scan.bolts, *scan.nuts, *scan.washers)}
        overview = overview_svg(model_overview(scan, hardware), {**{u.id: "fail" for u in analysis.not_analysed}, **{r.id: r.verdict for r in results}})
    files = {
        RESULTS_JSON: dumps(document).encode("utf-8"),
        REPORT_TEXT: table.encode("utf-8"),
        REPORT_HTML: html_report(results, title=job.title or job.path.stem, units=job.units,
                                 overview_svg=overview, not_analysed=analysis.not_analysed).encode("utf-8"),
    }
    if analysis.scan is not None and analysis.model_joints:
        files.update(_model_outputs(job, analysis))
    inputs = [job.path] + ([job.model] if job.model else [])
    return CheckRun(job.path, inputs, results, document, table, files, analysis.not_analysed)
