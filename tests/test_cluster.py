"""Several job files on a local Dask cluster (loopback only) give what a serial run gives."""
import json

import pytest

from geomjoint.cli import main

JOB = """
[defaults]
fastener = "{size}"
grade = "10.9"

[[joint]]
id = "{jid}"
layers = [ {{ material = "steel", thickness = "18 mm" }}, {{ material = "aluminium", thickness = "14 mm" }} ]
load = {{ min = "1 kN", max = "{load}" }}
"""


@pytest.fixture(scope="module")
def cluster():
    distributed = pytest.importorskip("distributed")  # a test dependency: installed by the README command
    with distributed.LocalCluster(n_workers=1, threads_per_worker=1, processes=True, host="127.0.0.1",
                                  dashboard_address=None) as local:
        yield local.scheduler_address


def test_jobs_on_cluster_equal_serial(tmp_path, cluster, capsys):
    jobs = []
    for i, (size, load) in enumerate([("M10", "6 kN"), ("M12", "40 kN")]):
        path = tmp_path / f"job{i}.toml"
        path.write_text(JOB.format(size=size, jid=f"J{i}", load=load))
        jobs.append(path)
    assert cluster.startswith("tcp://127.0.0.1:")
    code = main(["check", *map(str, jobs), "--scheduler", cluster, "--out", str(tmp_path / "remote")])
    serial_codes = [main(["check", str(job), "--out", str(tmp_path / "serial" / job.stem)]) for job in jobs]
    capsys.readouterr()
    assert code == max(serial_codes) == 1          # the M12 joint at 40 kN fails
    for job in jobs:
        remote = json.loads((tmp_path / "remote" / job.stem / "results.json").read_text())
        serial = json.loads((tmp_path / "serial" / job.stem / "results.json").read_text())
        assert remote == serial


def test_unreachable_scheduler_is_bad_input(tmp_path, capsys):
    job = tmp_path / "j.toml"
    job.write_text(JOB.format(size="M10", jid="A", load="5 kN"))
    code = main(["check", str(job), "--scheduler", "tcp://127.0.0.1:9"])
    err = capsys.readouterr().err
    assert code == 2 and "--scheduler" in err
