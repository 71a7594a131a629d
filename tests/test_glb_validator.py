"""The GLB we write passes the Khronos glTF validator (npm package gltf-validator).

`.ci/run` installs the validator into tests/gltf; on a machine without it this test
installs it there itself (the npm registry), and fails with a clear message when node or
npm is missing.
"""
import json
import shutil
import subprocess
from pathlib import Path

import pytest

from geomjoint.analysis import analyze_job
from geomjoint.geometry.glb import write_glb
from geomjoint.scene import markup_scene
from geomjoint.job import load_job

HERE = Path(__file__).resolve().parent / "gltf"
SAMPLES = Path(__file__).resolve().parents[1] / "samples"


@pytest.fixture(scope="module")
def validator():
    node, npm = shutil.which("node"), shutil.which("npm")
    if not node or not npm:
        pytest.fail("node and npm are needed for the glTF validator (Debian: apt-get install nodejs npm)")
    if not (HERE / "node_modules" / "gltf-validator").exists():
        subprocess.run([npm, "install", "--silent", "--no-audit", "--no-fund"], cwd=HERE, check=True,
                       capture_output=True, timeout=300)
    return node


def test_marked_up_glb_is_valid_gltf(validator, tmp_path):
    analysis = analyze_job(load_job(SAMPLES / "conveyor_drive.toml"))
    glb = tmp_path / "bracket.glb"
    write_glb(markup_scene(analysis), glb)
    run = subprocess.run([validator, str(HERE / "validate.js"), str(glb)], capture_output=True, text=True,
                         timeout=120)
    assert run.returncode == 0, run.stderr
    report = json.loads(run.stdout)
    # glTF 2.0 specification, checked by the Khronos reference validator
    assert report["errors"] == 0, report["first"]
