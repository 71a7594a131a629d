"""The Python API and the cadquery plugin: an in-memory model gives what its STEP file gives."""
import importlib.util
import subprocess
import sys
from pathlib import Path

import pytest

import geomjoint
from geomjoint.report.json_doc import result_document

SAMPLES = Path(__file__).resolve().parents[1] / "samples"


def _example():
    spec = importlib.util.spec_from_file_location("cadquery_script_check", SAMPLES / "cadquery_script_check.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_in_memory_assembly_equals_step_file(tmp_path):
    example = _example()
    assembly = example.build()
    in_memory = assembly.check_bolted_joints(example.JOB)
    step = tmp_path / "foot.step"
    assembly.export(str(step))   # cadquery own STEP writer
    job = geomjoint.parse_job(example.JOB, tmp_path / "foot.toml")
    from_file = geomjoint.analyze(job, step)
    assert len(in_memory) == 2
    a = result_document(in_memory, "t")["joints"]
    b = result_document(from_file, "t")["joints"]
    for x, y in zip(a, b):
        assert x["id"] == y["id"] and x["verdict"] == y["verdict"]
        assert x["grip"] == pytest.approx(y["grip"], abs=1e-6)
        assert x["stiffness"]["C"] == pytest.approx(y["stiffness"]["C"], rel=1e-9)
    # grip = washer + foot + rail + washer as the script built them (ISO 7089 M12 washer h = 2.5 mm)
    assert a[0]["grip"] == pytest.approx(2.5 + 15.0 + 20.0 + 2.5, abs=1e-6)


def test_example_script_runs():
    run = subprocess.run([sys.executable, str(SAMPLES / "cadquery_script_check.py")], capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    assert "2 joints found" in run.stdout and "J01" in run.stdout


def test_api_import_is_light():
    code = "import sys, geomjoint; print('OCP' in sys.modules, 'cadquery' in sys.modules)"
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True)
    assert run.stdout.split() == ["False", "False"]
