"""Command line: `geomjoint scan | check | init | demo`.

Exit status (DESIGN.md): 0 every joint passes; 1 a check fails; 2 bad input (one line);
3 an internal error (one line; the traceback only with --debug).
"""
from __future__ import annotations

import argparse
import os
import sys
import traceback
from pathlib import Path

from geomjoint import supervision
from geomjoint.errors import InputError

EXIT_OK, EXIT_FAIL, EXIT_INPUT, EXIT_INTERNAL = 0, 1, 2, 3

EXAMPLES = {
    "scan": "example: geomjoint scan samples/conveyor_bracket.step --json",
    "check": "example: geomjoint check samples/conveyor_drive.toml --out results/",
    "init": "example: geomjoint init samples/conveyor_bracket.step",
    "demo": "example: geomjoint demo --out demo-results/",
}


def version() -> str:
    from importlib.metadata import PackageNotFoundError, version as dist_version

    try:
        return dist_version("geomjoint")
    except PackageNotFoundError:  # running from a source tree
        return "0.0.0+source"


def _parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="geomjoint",
        description="Find the bolted joints of a STEP assembly and check preload, static strength and fatigue.",
        epilog="Results are engineering estimates for qualified review.",
    )
    parser.add_argument("--version", action="version", version=f"geomjoint {version()}")
    parser.add_argument("--debug", action="store_true", help="show the traceback of an internal error")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")

    def add(name: str, help_text: str) -> argparse.ArgumentParser:
        p = sub.add_parser(name, help=help_text, description=help_text, epilog=EXAMPLES[name],
                           formatter_class=argparse.RawDescriptionHelpFormatter)
        p.add_argument("--debug", action="store_true", help="show the traceback of an internal error")
        return p

    p = add("scan", "find the joints and stack-ups of a STEP model (no loads needed)")
    p.add_argument("model", type=Path, help="STEP file")
    p.add_argument("--json", action="store_true", help="print the scan JSON document on stdout")

    p = add("check", "analyse every joint of one or more job files")
    p.add_argument("jobs", type=Path, nargs="+", metavar="JOB.toml", help="job file(s)")
    p.add_argument("--out", type=Path, help="output folder (default: a new folder beside the job)")
    p.add_argument("--json", action="store_true", help="print the result JSON document on stdout")
    p.add_argument("--workers", type=int, default=0, help="processes for model joints (default: all cores)")
    p.add_argument("--outputs", metavar="KINDS",
                   help="outputs to write, comma-separated from json,text,html,step,glb (default: all)")
    p.add_argument("--scheduler", metavar="ADDRESS",
                   help="run the job files on a Dask cluster (tcp://host:port; needs geomjoint[cluster])")

    p = add("init", "write a starter job file for a model")
    p.add_argument("model", type=Path, help="STEP file")

    p = add("demo", "run check on the bundled sample job")
    p.add_argument("--out", type=Path, help="output folder (default: a new folder in the current directory)")
    p.add_argument("--json", action="store_true", help="print the result JSON document on stdout")
    return parser


def _write_run(run, out: Path | None, beside: Path | None) -> Path:
    from geomjoint.outputs import new_output_folder, prepare_output_folder, write_atomic

    folder = new_output_folder(beside or run.job_path.parent, run.job_path.stem) if out is None \
        else prepare_output_folder(out, run.inputs)
    for name, data in run.files.items():
        write_atomic(folder / name, data, protect=run.inputs)
    return folder


def _report(run, folder: Path, as_json: bool) -> None:
    if as_json:
        from geomjoint.report.json_doc import dumps

        sys.stdout.write(dumps(run.document))
    else:
        sys.stdout.write(run.table)
        sys.stdout.write(f"outputs: {folder}\n")


def _run_check(job_path: Path, out: Path | None, as_json: bool, workers: int, beside: Path | None = None,
               outputs: str | None = None) -> int:
    from geomjoint.checkrun import parse_outputs, run_check

    run = run_check(job_path, workers=workers, quiet=as_json, version=version(), outputs=parse_outputs(outputs))
    _report(run, _write_run(run, out, beside), as_json)
    return EXIT_FAIL if run.failed else EXIT_OK


def _check_on_cluster(jobs: list[Path], out: Path | None, as_json: bool, scheduler: str) -> int:
    from geomjoint.cluster import run_checks_on_cluster

    worst = EXIT_OK
    for run in run_checks_on_cluster(jobs, scheduler, version()):
        target = out / run.job_path.stem if (out and len(jobs) > 1) else out
        _report(run, _write_run(run, target, None), as_json)
        worst = max(worst, EXIT_FAIL if run.failed else EXIT_OK)
    return worst


def _scan(model: Path, as_json: bool) -> int:
    from geomjoint.geometry.scan import scan_model, scan_table, scan_to_json
    from geomjoint.report.json_doc import dumps

    result = scan_model(model)
    doc = scan_to_json(result)
    if as_json:
        sys.stdout.write(dumps(doc))
    else:
        sys.stdout.write(scan_table(result))
    failing = any(f["severity"] == "fail" for j in doc["joints"] for f in j["findings"])
    return EXIT_FAIL if failing else EXIT_OK


def sample_job() -> Path:
    """The bundled demo job: samples/ of the source tree (the README installs it editable)."""
    path = Path(__file__).resolve().parent.parent / "samples" / "conveyor_drive.toml"
    if not path.exists():
        raise InputError("the sample job is not there; install geomjoint from its source tree "
                         "(pip install -e .) to run the demo", where=str(path))
    return path


def _dispatch(args: argparse.Namespace) -> int:
    if args.command == "scan":
        return _scan(args.model, args.json)
    if args.command == "check":
        if args.scheduler:
            if args.outputs:
                raise InputError("--outputs is for a local check; a cluster run writes every output",
                                 where="--outputs")
            return _check_on_cluster(args.jobs, args.out, args.json, args.scheduler)
        worst = EXIT_OK
        for job in args.jobs:
            out = args.out / job.stem if (args.out and len(args.jobs) > 1) else args.out
            worst = max(worst, _run_check(job, out, args.json, args.workers, outputs=args.outputs))
        return worst
    if args.command == "demo":
        # The demo shows failing and marginal joints on purpose; it exits 0 when it ran.
        _run_check(sample_job(), args.out, args.json, 0, beside=Path.cwd())
        return EXIT_OK
    if args.command == "init":
        from geomjoint.starter import write_starter_job

        path = write_starter_job(args.model)
        print(f"wrote {path}")
        return EXIT_OK
    raise AssertionError(args.command)


def main(argv: list[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return EXIT_INPUT
    try:
        return _dispatch(args)
    except InputError as exc:
        print(f"geomjoint: error: {exc}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("geomjoint: interrupted", file=sys.stderr)
        return EXIT_INTERNAL
    except Exception as exc:  # a crash must never look like a failed joint
        if args.debug:
            traceback.print_exc()
        print(f"geomjoint: internal error ({type(exc).__name__}: {exc}); run with --debug for the traceback",
              file=sys.stderr)
        return EXIT_INTERNAL


def entry(argv: list[str] | None = None) -> int:
    """The command as installed (console script, ``python -m geomjoint``): ``main`` in a forked
    worker, watched by this process.

    Some damaged STEP files make the CAD kernel die with a segmentation fault, which no Python
    handler can catch.  The supervisor turns such a death into the promised one line: exit 2
    naming the file when the kernel died reading it, exit 3 otherwise.  Where ``fork`` is
    missing the command runs directly.
    """
    import signal

    if not hasattr(os, "fork"):
        return main(argv)
    read_end, write_end = os.pipe()
    sys.stdout.flush()
    sys.stderr.flush()
    pid = os.fork()
    if pid == 0:  # the worker
        import faulthandler

        faulthandler.disable()  # the supervisor reports a crash in one line, not a dump
        os.close(read_end)
        os.environ[supervision.READING_FD_VARIABLE] = str(write_end)
        code = EXIT_INTERNAL
        try:
            code = main(argv)
        except SystemExit as done:  # argparse: --help, --version, a usage error
            code = done.code if isinstance(done.code, int) else (EXIT_OK if done.code is None else EXIT_INPUT)
        finally:
            sys.stdout.flush()
            sys.stderr.flush()
            os._exit(code)
    os.close(write_end)
    previous = signal.signal(signal.SIGINT, signal.SIG_IGN)  # Ctrl-C reaches the worker, which reports it
    try:
        chunks = []
        while True:
            chunk = os.read(read_end, 4096)
            if not chunk:
                break
            chunks.append(chunk)
        _, status = os.waitpid(pid, 0)
    finally:
        signal.signal(signal.SIGINT, previous)
        os.close(read_end)
    if os.WIFEXITED(status):
        return os.WEXITSTATUS(status)
    name = signal.Signals(os.WTERMSIG(status)).name
    path = supervision.file_being_read(b"".join(chunks))
    if path is not None:
        print(f"geomjoint: error: {path}: the CAD kernel crashed reading this file ({name}): it is damaged",
              file=sys.stderr)
        return EXIT_INPUT
    print(f"geomjoint: internal error (the process died with {name}); run with --debug for details",
          file=sys.stderr)
    return EXIT_INTERNAL


if __name__ == "__main__":
    raise SystemExit(entry())
