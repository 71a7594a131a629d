"""Several job files on a Dask cluster (`geomjoint check A.toml B.toml --scheduler tcp://...`).

Each job file is one task: the worker reads the job (and its model) from the shared
file system, analyses it and renders the outputs to bytes (`checkrun.run_check`); the
client writes them.  The extra `geomjoint[cluster]` installs dask.distributed.
"""
from __future__ import annotations

from pathlib import Path

from geomjoint.errors import InputError


def run_checks_on_cluster(jobs: list[Path], scheduler: str, version: str):
    """Yield one CheckRun per job file, in the order given."""
    try:
        from distributed import Client
    except ModuleNotFoundError:
        raise InputError("--scheduler needs dask.distributed: pip install 'geomjoint[cluster]'",
                         where="--scheduler") from None
    try:
        client = Client(scheduler, timeout="5s")
    except OSError as exc:
        raise InputError(f"cannot reach the Dask scheduler ({exc})", where=f"--scheduler {scheduler}") from None
    with client:
        futures = [client.submit(_remote_check, Path(job).resolve(), version, pure=False) for job in jobs]
        for future in futures:
            yield future.result()


def _remote_check(job: Path, version: str):
    """The task: one job file, analysed in one process of the worker (no nested pools)."""
    from geomjoint.checkrun import run_check

    return run_check(job, workers=1, quiet=True, version=version)
