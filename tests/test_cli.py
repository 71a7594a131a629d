"""The command-line contract of DESIGN.md: exit codes, --json on stdout only, outputs in a new folder."""
import hashlib
import json
import subprocess
import sys
from pathlib import Path


from conftest import validate_result
from geomjoint.cli import main

SAMPLES = Path(__file__).resolve().parents[1] / "samples"

PASSING = """
[defaults]
fastener = "M12"
grade = "10.9"
preload = "75%"

[[joint]]
id = "P1"
layers = [ { material = "steel", thickness = "20 mm" }, { material = "steel", thickness = "20 mm" } ]
load = { min = "0 kN", max = "5 kN" }
"""


def digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def test_check_passing_job_exit_0(tmp_path, capsys):
    job = tmp_path / "pass.toml"
    job.write_text(PASSING)
    before = digest(job)
    code = main(["check", str(job), "--json", "--out", str(tmp_path / "out")])
    out = capsys.readouterr().out
    doc = json.loads(out)                      # stdout holds the JSON document and nothing else
    validate_result(doc)
    assert code == 0, doc
    assert doc["summary"] == {**doc["summary"], "joints": 1, "failed": 0}
    assert json.loads((tmp_path / "out" / "results.json").read_text()) == doc
    assert digest(job) == before               # the input is never modified


def test_check_failing_joint_exit_1(tmp_path, capsys):
    job = tmp_path / "fail.toml"
    job.write_text(PASSING.replace('max = "5 kN"', 'max = "80 kN"'))
    code = main(["check", str(job), "--out", str(tmp_path / "o")])
    assert code == 1
    assert "fail" in capsys.readouterr().out.lower()


def test_default_output_folder_is_new_and_beside_job(tmp_path, capsys):
    job = tmp_path / "pass.toml"
    job.write_text(PASSING)
    assert main(["check", str(job)]) == 0
    assert main(["check", str(job)]) == 0
    folders = sorted(p for p in tmp_path.iterdir() if p.is_dir())
    assert len(folders) == 2 and all((f / "results.json").exists() for f in folders)


def test_bad_input_exit_2_one_line(tmp_path, capsys):
    job = tmp_path / "bad.toml"
    job.write_text(PASSING.replace('grade = "10.9"', 'grade = "11.9"'))
    assert main(["check", str(job)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "bad.toml" in err and "grade" in err
    assert "Traceback" not in err


def test_internal_error_exit_3(tmp_path, capsys, monkeypatch):
    import geomjoint.checkrun as checkrun

    def boom(job, **kwargs):
        raise ZeroDivisionError("simulated")

    monkeypatch.setattr(checkrun, "analyze_job", boom)
    job = tmp_path / "pass.toml"
    job.write_text(PASSING)
    assert main(["check", str(job)]) == 3
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "internal error" in err


def test_sample_job_every_criterion_and_system(tmp_path, capsys):
    code = main(["check", str(SAMPLES / "conveyor_drive.toml"), "--json", "--out", str(tmp_path)])
    doc = json.loads(capsys.readouterr().out)
    validate_result(doc)
    assert code in (0, 1)
    typed = {"motor-foot", "bearing-block", "take-up-bracket", "guard-hinge", "gearbox-flange"}
    assert {j["id"] for j in doc["joints"]} == typed | {"J01", "J02", "J03", "J04"}   # 4 joints in the model
    vdi = next(j for j in doc["joints"] if j["id"] == "gearbox-flange")
    assert vdi["fatigue"]["criterion"] == "vdi" and set(vdi["tightening"]) >= {"torque", "preload_min", "preload_max"}
    assert {c["name"] for c in vdi["checks"]} >= {"assembly_preload", "working_stress", "fatigue", "bearing_pressure", "slip", "stripping"}


def test_module_entry_point_version():
    run = subprocess.run([sys.executable, "-m", "geomjoint", "--version"], capture_output=True, text=True)
    assert run.returncode == 0 and run.stdout.startswith("geomjoint ")


def test_console_script_help_has_example():
    run = subprocess.run([sys.executable, "-m", "geomjoint", "check", "--help"], capture_output=True, text=True)
    assert run.returncode == 0 and "example:" in run.stdout


def test_json_stdout_holds_only_the_document_for_a_model_job(tmp_path):
    # a real process, so that anything the CAD kernel prints on file descriptor 1 would show
    run = subprocess.run([sys.executable, "-m", "geomjoint", "check", str(SAMPLES / "conveyor_drive.toml"),
                          "--json", "--out", str(tmp_path), "--workers", "1"], capture_output=True, text=True)
    assert run.returncode == 1, run.stderr        # the sample fails joints on purpose
    doc = json.loads(run.stdout)
    validate_result(doc)
    assert doc["summary"]["joints"] == 9


def test_supervisor_reports_a_native_crash(monkeypatch, capfd):
    """A segmentation fault in native code outside any file read: exit 3 and one line, never 1."""
    import ctypes

    import geomjoint.cli as cli

    monkeypatch.setattr(cli, "main", lambda argv=None: ctypes.string_at(0))   # a null read: SIGSEGV
    assert cli.entry(["check", "x.toml"]) == 3
    err = capfd.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "internal error" in err and "SIGSEGV" in err


def test_supervisor_passes_the_exit_code_through(tmp_path, capfd):
    import geomjoint.cli as cli

    job = tmp_path / "pass.toml"
    job.write_text(PASSING)
    assert cli.entry(["check", str(job), "--out", str(tmp_path / "o")]) == 0
    assert cli.entry(["check", str(tmp_path / "missing.toml")]) == 2


def test_outputs_option_writes_only_the_kinds_asked_for(tmp_path, capsys):
    job = SAMPLES / "conveyor_drive.toml"
    assert main(["check", str(job), "--out", str(tmp_path / "all"), "--workers", "1"]) == 1
    assert main(["check", str(job), "--out", str(tmp_path / "json"), "--workers", "1", "--outputs", "json"]) == 1
    assert main(["check", str(job), "--out", str(tmp_path / "two"), "--workers", "1",
                 "--outputs", "html, glb"]) == 1
    everything = sorted(p.name for p in (tmp_path / "all").iterdir())
    assert everything == sorted(["results.json", "report.txt", "report.html", "conveyor_bracket-checked.step",
                                 "conveyor_bracket-checked.glb"])
    assert sorted(p.name for p in (tmp_path / "json").iterdir()) == ["results.json"]
    assert sorted(p.name for p in (tmp_path / "two").iterdir()) == ["conveyor_bracket-checked.glb", "report.html"]
    # the verdicts are the same whichever outputs are written
    assert (tmp_path / "json" / "results.json").read_text() == (tmp_path / "all" / "results.json").read_text()
    capsys.readouterr()
    assert main(["check", str(job), "--out", str(tmp_path / "bad"), "--outputs", "json,pdf"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "--outputs" in err[0] and "pdf" in err[0]
