"""Broken and hostile inputs (tests/corpus, made by tests/corpus/make_corpus.py) and the input limits.

Every bad input must give exit 2 and exactly one line on stderr that names the file and the
key, part or entity, with no traceback, and leave the input byte-identical. Tricky but valid
models (holes that almost line up) must give the scan's joint count and findings instead.
A case whose fix lies outside the job reader carries "needs" in the manifest: its test is a
strict xfail that names the change, so it fails loudly once the change is wired.
"""
from __future__ import annotations

import hashlib
import json
import signal
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from geomjoint import limits
from geomjoint.cli import main
from geomjoint.errors import InputError

CORPUS = Path(__file__).resolve().parent / "corpus"
CASES = json.loads((CORPUS / "manifest.json").read_text())
SAMPLES = Path(__file__).resolve().parents[1] / "samples"


def _param(case):
    marks = [pytest.mark.xfail(strict=True, reason=f"needs: {case['needs']}")] if case["needs"] else []
    return pytest.param(case, id=case["file"], marks=marks)


BAD = [_param(c) for c in CASES if c["exit"] == 2]
VALID = [_param(c) for c in CASES if c["exit"] != 2]


def _digest(path: Path) -> str | None:
    return hashlib.sha256(path.read_bytes()).hexdigest() if path.is_file() else None


def _run(case, tmp_path, capfd):
    """Run one case; returns (exit code, stdout, stderr). Inputs are hashed around the run.

    In-process through cli.main, but in a subprocess for a case that crashes the CAD kernel
    (a segmentation fault would end the test run itself).
    """
    target = CORPUS / case["file"]
    inputs = [target] + ([target.parent / "sub" / "empty_model.step"] if case["command"] == "check" else [])
    before = [_digest(p) for p in inputs]
    argv = [case["command"], str(target), "--json"]
    if case["command"] == "check":
        argv += ["--out", str(tmp_path / "out")]
    if case.get("subprocess"):
        done = subprocess.run([sys.executable, "-m", "geomjoint", *argv], capture_output=True, text=True,
                              timeout=300, cwd=tmp_path)
        code, out, err = done.returncode, done.stdout, done.stderr
    else:
        code = main(argv)
        out, err = capfd.readouterr()
    assert [_digest(p) for p in inputs] == before, "an input file changed"
    return code, out, err


def test_corpus_is_big_enough_and_complete():
    bad = [c for c in CASES if c["exit"] == 2]
    assert len(bad) >= 30                                    # the corpus covers at least 30 bad-input cases
    for c in CASES:
        path = CORPUS / c["file"]
        assert path.exists() or "does not exist" in c["names"], c["file"]
        assert c["names"] or c["exit"] != 2


@pytest.mark.parametrize("case", BAD)
def test_bad_input_exit_2_one_line(case, tmp_path, capfd):
    code, out, err = _run(case, tmp_path, capfd)
    assert code == 2, (code, err)
    assert "Traceback" not in out + err
    lines = err.splitlines()
    assert len(lines) == 1, err
    line = lines[0]
    # the file first; the other names must be in the message apart from the file's own name
    file_name = case["names"][0]
    assert file_name.lower() in line.lower(), line
    rest = line.lower().replace(file_name.lower(), "")
    for name in case["names"][1:]:          # "a|b": either will do
        assert any(alt.lower() in rest for alt in name.split("|")), (name, line)
    assert out == "", "bad input must print nothing on stdout (--json)"


@pytest.mark.parametrize("case", VALID)
def test_tricky_valid_input_runs(case, tmp_path, capfd):
    code, out, err = _run(case, tmp_path, capfd)
    assert "Traceback" not in out + err
    assert code == case["exit"], err
    doc = json.loads(out)
    assert len(doc["joints"]) == case["joints"]
    codes = {f["code"] for j in doc["joints"] for f in j["findings"]}
    if "finding" in case:
        assert case["finding"] in codes
    if "no_finding" in case:
        assert case["no_finding"] not in codes


def test_holes_almost_in_line_finding_names_both_plates(tmp_path, capfd):
    # offset 1.05 mm against 2 x 0.5 mm radial clearance (M10 in an 11 mm ISO 273 medium hole)
    code, out, _ = _run({"command": "scan", "file": "step/offset_outside.step"}, tmp_path, capfd)
    (joint,) = json.loads(out)["joints"]
    (mis,) = [f for f in joint["findings"] if f["code"] == "misaligned"]
    assert mis["severity"] == "fail"
    assert "upper_plate_steel" in mis["message"] and "lower_plate_steel" in mis["message"]
    assert "1.050 mm off axis" in mis["message"] and "passes 1.000 mm" in mis["message"]


def test_duplicate_instance_is_reported_and_not_counted_twice(tmp_path, capfd):
    # Decision: a copy of a plate on top of itself is a modelling slip: the scan must fail it
    # ('duplicate', exit 1: the manifest case) and name the copy; the grip stays the distance
    # between the bearing faces (two 10 mm plates: 20 mm).
    code, out, _ = _run({"command": "scan", "file": "step/duplicate_instance.step"}, tmp_path, capfd)
    (joint,) = json.loads(out)["joints"]
    assert joint["grip"] == pytest.approx(20.0)
    dup = [f for f in joint["findings"] if f["code"] == "duplicate"]
    assert dup and dup[0]["severity"] == "fail" and "upper_plate_steel_copy" in dup[0]["message"]


# ----------------------------------------------------------------------------- limits: the sniff

@pytest.mark.parametrize("file, words", [
    ("empty.step", "empty"),
    ("truncated.step", "truncated"),
    ("junk.step", "not a STEP file"),
    ("junk_in_header.step", "binary"),
    ("no_solids.step", "no solids"),
    ("unknown_unit.step", "FURLONG"),
])
def test_sniff_refuses_broken_step(file, words):
    path = CORPUS / "step" / file
    with pytest.raises(InputError) as err:
        limits.check_step_file(path)
    message = str(err.value)
    assert file in message and words in message and "\n" not in message


def test_sniff_names_the_unit_entity():
    with pytest.raises(InputError, match=r"entity #\d+: unit name \.FURLONG\."):
        limits.check_step_units(CORPUS / "step" / "unknown_unit.step")


def test_sniff_unknown_prefix(tmp_path):
    text = (CORPUS / "step" / "plate_pair.step").read_text()
    path = tmp_path / "prefix.step"
    path.write_text(text.replace(".MILLI.,.METRE.", ".MULTI.,.METRE.", 1))
    with pytest.raises(InputError, match=r"prefix\.step: entity #\d+: unit prefix \.MULTI\."):
        limits.check_step_file(path)


@pytest.mark.parametrize("path", sorted(SAMPLES.glob("*.step")) + [
    CORPUS / "step" / f for f in ("plate_pair.step", "offset_inside.step", "face_only.step", "huge_part.step")])
def test_sniff_passes_good_files(path):
    limits.check_step_file(path)       # no false alarm on files the kernel reads


def test_sniff_size_limit(tmp_path):
    path = CORPUS / "step" / "plate_pair.step"
    small = limits.current_limits(max_file_bytes=1000)
    with pytest.raises(InputError, match=r"plate_pair\.step: file is .* over the limit"):
        limits.check_step_file(path, small)
    limits.check_step_file(path, limits.current_limits(max_file_bytes=path.stat().st_size))   # at the limit: fine


def test_sniff_missing_and_folder(tmp_path):
    with pytest.raises(InputError, match="not found"):
        limits.check_step_file(tmp_path / "none.step")
    with pytest.raises(InputError, match="folder"):
        limits.check_step_file(tmp_path)


def test_limits_from_environment(monkeypatch):
    monkeypatch.setenv("GEOMJOINT_MAX_SOLIDS", "7")
    monkeypatch.setenv("GEOMJOINT_MAX_EXTENT_MM", "2.5e4")
    got = limits.current_limits()
    assert got.max_solids == 7 and isinstance(got.max_solids, int)
    assert got.max_extent_mm == 25_000.0
    assert got.max_faces == limits.Limits().max_faces
    assert limits.current_limits(max_solids=3).max_solids == 3         # explicit overrides win
    monkeypatch.setenv("GEOMJOINT_MAX_FACES", "lots")
    with pytest.raises(InputError, match="GEOMJOINT_MAX_FACES"):
        limits.current_limits()


def test_model_size_limits():
    lim = limits.current_limits(max_solids=10, max_faces=100)
    limits.check_model_size(10, 100, "m.step", lim)
    with pytest.raises(InputError, match=r"m\.step: model has 11 solids, over the limit of 10"):
        limits.check_model_size(11, 5, "m.step", lim)
    with pytest.raises(InputError, match=r"m\.step: model has 101 faces"):
        limits.check_model_size(1, 101, "m.step", lim)


def test_part_extent_limit():
    limits.check_part_extent("frame", 2.0e4, "m.step")                 # a 20 m frame is a machine
    with pytest.raises(InputError, match=r"m\.step: part 'rail_steel' is 1000 m long"):
        limits.check_part_extent("rail_steel", 1.0e6, "m.step")
    with pytest.raises(InputError, match="no finite size"):
        limits.check_part_extent("p", float("nan"), "m.step")


# ----------------------------------------------------------------------------- limits: time

def test_run_with_timeout_returns_and_restores_handler():
    before = signal.getsignal(signal.SIGALRM)
    assert limits.run_with_timeout(lambda a, b=0: a + b, 5.0, 2, b=3) == 5
    assert signal.getsignal(signal.SIGALRM) is before
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0.0             # no timer left running


def test_run_with_timeout_stops_a_slow_joint():
    before = signal.getsignal(signal.SIGALRM)
    with pytest.raises(limits.JointTimeout):
        limits.run_with_timeout(time.sleep, 0.05, 30.0)
    assert signal.getsignal(signal.SIGALRM) is before
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0.0


def test_run_with_timeout_no_limit_cases():
    assert limits.run_with_timeout(lambda: "done", None) == "done"
    assert limits.run_with_timeout(lambda: "done", 0) == "done"
    box = []
    t = threading.Thread(target=lambda: box.append(limits.run_with_timeout(lambda: 4, 0.01)))
    t.start()
    t.join()
    assert box == [4]                  # outside the main thread: runs, unlimited


# ----------------------------------------------------------------------------- limits: wired into the CLI

def test_cli_file_size_limit(monkeypatch, capfd):
    monkeypatch.setenv("GEOMJOINT_MAX_FILE_BYTES", "1000")
    assert main(["scan", str(CORPUS / "step" / "plate_pair.step")]) == 2
    err = capfd.readouterr().err
    assert "plate_pair.step" in err and "limit" in err and len(err.splitlines()) == 1


def test_cli_solid_limit(monkeypatch, capfd):
    monkeypatch.setenv("GEOMJOINT_MAX_SOLIDS", "1")
    assert main(["scan", str(CORPUS / "step" / "plate_pair.step")]) == 2
    err = capfd.readouterr().err
    assert "plate_pair.step" in err and "2 solids" in err and len(err.splitlines()) == 1


def test_cli_joint_timeout(monkeypatch, tmp_path, capfd):
    job = CORPUS / "jobs" / "reliability_0.toml"
    text = job.read_text().replace("reliability = 0\n", "member_stiffness = \"fe\"\n")
    path = tmp_path / "slow.toml"
    path.write_text(text)
    monkeypatch.setenv("GEOMJOINT_JOINT_SECONDS", "0.001")
    code = main(["check", str(path), "--out", str(tmp_path / "out")])
    out = capfd.readouterr().out
    assert code == 1                   # a joint not analysed cannot pass
    assert limits.TIMEOUT_NOTE in out


def _distinct_solids(model) -> int:
    reps = []
    for part in model.parts:
        if not any(part.solid.IsPartner(r) for r in reps):    # instances share one solid
            reps.append(part.solid)
    return len(reps)


def _kernel_solids(path: Path) -> int:
    """Distinct solids the kernel's plain STEP reader makes of a file (instances share one)."""
    from OCP.STEPControl import STEPControl_Reader
    from OCP.TopAbs import TopAbs_SOLID
    from OCP.TopExp import TopExp_Explorer

    reader = STEPControl_Reader()
    reader.ReadFile(str(path))
    reader.TransferRoots()
    reps = []
    exp = TopExp_Explorer(reader.OneShape(), TopAbs_SOLID)
    while exp.More():
        if not any(exp.Current().IsPartner(r) for r in reps):
            reps.append(exp.Current())
        exp.Next()
    return len(reps)


@pytest.mark.parametrize("file, in_file, after_reading", [
    ("plate_pair.step", 2, 2),
    ("assembly_part_lost.step", 2, 1),     # the kernel's reader drops the solid with a face missing
    ("non_manifold.step", 1, 2),           # the kernel's reader splits the non-manifold solid in two
])
def test_count_step_solids_shows_what_the_reader_lost(file, in_file, after_reading):
    path = CORPUS / "step" / file
    assert limits.count_step_solids(path) == in_file
    assert _kernel_solids(path) == after_reading


def test_count_step_solids_instances_share_one_entity(tmp_path):
    import cadquery as cq

    from geomjoint.geometry.model import load_model

    sub = cq.Assembly(name="clip")
    sub.add(cq.Workplane().box(10, 10, 2), name="clip_plate")
    top = cq.Assembly(name="top")
    top.add(sub, name="clip_a", loc=cq.Location((0, 0, 0)))
    top.add(sub, name="clip_b", loc=cq.Location((50, 0, 0)))
    path = tmp_path / "twice.step"
    top.export(str(path))
    model = load_model(str(path))
    assert len(model.parts) == 2
    assert limits.count_step_solids(path) == 1 == _distinct_solids(model)


def test_hostile_part_names_stay_names(tmp_path, capfd):
    # a "../" in a part name must never become a path: every output lands in the output folder,
    # and results.json carries the names as the file gives them (ISO 10303-21 \X2\ decoded)
    import shutil
    import sys

    sys.path.insert(0, str(CORPUS))
    from make_corpus import HOSTILE_NAMES

    folder = tmp_path / "deep" / "job"
    folder.mkdir(parents=True)
    model = folder / "hostile_names.step"
    shutil.copyfile(CORPUS / "step" / "hostile_names.step", model)
    job = folder / "job.toml"
    job.write_text('model = "hostile_names.step"\ndefault_material = "steel"\n'
                   '[[load]]\njoints = "*"\naxial = { max = "3 kN" }\n')
    before = {p: _digest(p) for p in (model, job)}
    code = main(["check", str(job), "--out", str(folder / "out"), "--json"])
    out, err = capfd.readouterr()
    assert code in (0, 1) and "Traceback" not in err
    assert {p: _digest(p) for p in (model, job)} == before
    created = {p for p in tmp_path.rglob("*") if p.is_file()} - set(before)
    assert created and all((folder / "out") in p.parents for p in created), created
    assert all(".." not in p.name for p in created)
    (joint,) = json.loads(out)["joints"]
    assert {layer["part"] for layer in joint["layers"]} == set(HOSTILE_NAMES)


@pytest.mark.parametrize("file", ["empty.step", "truncated.step", "junk.step", "face_only.step"])
def test_init_on_broken_step_writes_nothing(file, tmp_path, capfd):
    import shutil

    model = tmp_path / file
    shutil.copyfile(CORPUS / "step" / file, model)
    assert main(["init", str(model)]) == 2
    err = capfd.readouterr().err
    assert len(err.splitlines()) == 1 and file in err and "Traceback" not in err
    assert sorted(p.name for p in tmp_path.iterdir()) == [file]       # no starter job left behind


def test_check_of_duplicate_placement_does_not_pass(tmp_path, capfd):
    # the check once counted the copy as a third 10 mm layer (grip 30 mm against the scan's 20 mm)
    # and passed the joint: a silent wrong answer; a duplicate must fail the joint's stack-up check
    import shutil

    shutil.copyfile(CORPUS / "step" / "duplicate_placement.step", tmp_path / "dup.step")
    job = tmp_path / "job.toml"
    job.write_text('model = "dup.step"\ndefault_material = "steel"\n[[load]]\njoints = "*"\naxial = { max = "3 kN" }\n')
    code = main(["check", str(job), "--out", str(tmp_path / "out"), "--json"])
    (joint,) = json.loads(capfd.readouterr().out)["joints"]
    assert code == 1 and not joint["ok"]
    assert not next(c for c in joint["checks"] if c["name"] == "stack-up")["ok"]


def test_sniff_allows_ctrl_z_after_the_trailer_only(tmp_path):
    text = (CORPUS / "step" / "plate_pair.step").read_bytes()
    dos = tmp_path / "dos.step"
    dos.write_bytes(text.replace(b"\n", b"\r\n") + b"\x1a")        # DOS line ends and end-of-file mark
    limits.check_step_file(dos)
    inside = tmp_path / "inside.step"
    cut = text.index(b"DATA;")
    inside.write_bytes(text[:cut] + b"\x1a" + text[cut:])
    with pytest.raises(InputError, match=r"inside\.step: binary bytes \(0x1a\)"):
        limits.check_step_file(inside)


def test_run_with_timeout_nested_keeps_the_outer_limit():
    def inner():
        with pytest.raises(limits.JointTimeout):
            limits.run_with_timeout(time.sleep, 0.05, 30.0)
        return signal.getitimer(signal.ITIMER_REAL)[0]

    left = limits.run_with_timeout(inner, 5.0)
    assert 0.0 < left < 5.0                                          # the outer timer runs on
    assert signal.getitimer(signal.ITIMER_REAL)[0] == 0.0


# ----------------------------------------------------------------------------- limits: a child process

def _read_and_transfer(path: str) -> bool:
    from OCP.STEPCAFControl import STEPCAFControl_Reader

    from geomjoint.geometry.model import _new_doc

    reader = STEPCAFControl_Reader()
    reader.ReadFile(path)
    return bool(reader.Transfer(_new_doc()))


def test_run_in_child_contains_a_kernel_crash():
    # the kernel's STEP transfer dies with SIGSEGV on this damaged file (tests/corpus/make_corpus.py)
    with pytest.raises(limits.ChildCrashed) as err:
        limits.run_in_child(_read_and_transfer, str(CORPUS / "step" / "point_2d.step"))
    assert err.value.signal_number == signal.SIGSEGV
    assert limits.run_in_child(_read_and_transfer, str(CORPUS / "step" / "plate_pair.step")) is True


def test_run_in_child_results_errors_and_time_limit():
    import ctypes

    assert limits.run_in_child(divmod, 17, 5) == (3, 2)
    with pytest.raises(limits.ChildCrashed, match="SIGSEGV"):
        limits.run_in_child(ctypes.string_at, 0)                       # a null read: native crash
    with pytest.raises(InputError, match=r"^f\.step: bad$"):
        limits.run_in_child(_raise_input_error)
    with pytest.raises(limits.JointTimeout):
        limits.run_in_child(time.sleep, 30.0, seconds=0.2)            # the child is killed, not waited for


def _raise_input_error():
    raise InputError("bad", where="f.step")
