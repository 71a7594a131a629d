"""Property-based tests (hypothesis) of the job reader and the engine.

Random valid typed-in joints go the way a user's job does (TOML text → parse_job → JointSpec →
analysis.evaluate_joint). The properties are identities of the textbook model, not numbers:

* stiffnesses are finite and positive, and the joint constant C = k_b/(k_b + k_m) lies in (0, 1)
  (Shigley 10th ed. eq. 8-24: a ratio of positive stiffnesses);
* with F_b = F_i + C·P and F_m = F_i − (1 − C)·P (Shigley eqs. 8-24, 8-25) the yield factor
  S_p·A_t/F_b and the separation factor F_i/((1 − C)·P) fall as P rises, and the separation
  factor rises with the preload F_i;
* every fatigue criterion (Goodman, Gerber, ASME-elliptic, Soderberg) is a curve that falls in
  the (σ_m, σ_a) plane, so at a fixed mean load the fatigue factor falls as the amplitude rises;
* random invalid values are refused by the command line with exit 2 and one line.
"""
from __future__ import annotations

import json
import math
import tempfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from geomjoint.analysis import evaluate_joint
from geomjoint.cli import main
from geomjoint.job import parse_job
from geomjoint.resolve import typed_joint_specs
from geomjoint.report.json_doc import dumps, result_document

QUICK = settings(max_examples=50, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])

FASTENERS = ["M6", "M8", "M10", "M12", "M16", "M20", "M24", "1/2-13 UNC", "3/8-16 UNC", "M12x1.5"]
METRIC_GRADES = ["4.6", "5.8", "8.8", "10.9", "12.9"]
INCH_GRADES = ["SAE 5", "SAE 8"]
MATERIALS = ["steel", "aluminium", "gray cast iron", "cast aluminium", "stainless steel"]
STIFFNESS = ["frustum", "exponential", "vdi", "cone"]      # "fe" meshes: too slow for 50 examples
CRITERIA = ["goodman", "gerber", "asme-elliptic", "soderberg"]


@st.composite
def joints(draw, method: str | None = None):
    """TOML text of one valid typed-in joint, and the values drawn for it."""
    fastener = draw(st.sampled_from(FASTENERS))
    grade = draw(st.sampled_from(INCH_GRADES if "UNC" in fastener else METRIC_GRADES))
    tapped = draw(st.booleans())
    n = draw(st.integers(2 if tapped else 1, 4))
    thick = draw(st.lists(st.floats(2.0, 40.0), min_size=n, max_size=n))
    mats = draw(st.lists(st.sampled_from(MATERIALS), min_size=n, max_size=n))
    layers = ", ".join(f'{{ material = "{m}", thickness = "{t:.3f} mm" }}' for m, t in zip(mats, thick))
    # an explicit length long enough for any drawn stack: the catalogue's longest is no concern here
    length = sum(thick) + 60.0
    preload = draw(st.floats(0.3, 0.9))
    lo = draw(st.floats(0.0, 20.0))
    hi = lo + draw(st.floats(0.1, 30.0))
    text = f"""
[[joint]]
id = "P"
fastener = "{fastener}"
grade = "{grade}"
tapped = {"true" if tapped else "false"}
length = "{length:.3f} mm"
preload = "{100 * preload:.3f}%"
criterion = "{draw(st.sampled_from(CRITERIA))}"
member_stiffness = "{draw(st.sampled_from(STIFFNESS))}"
reliability = {draw(st.sampled_from([0.5, 0.9, 0.99, 0.999]))}
method = "{method or draw(st.sampled_from(["textbook", "vdi"]))}"
layers = [ {layers} ]
load = {{ min = "{lo:.4f} kN", max = "{hi:.4f} kN" }}
"""
    return text, {"preload": preload, "lo": lo, "hi": hi}


def evaluate(text: str):
    (spec,) = typed_joint_specs(parse_job(text))
    return evaluate_joint(spec)


def with_load(text: str, lo: float, hi: float) -> str:
    head, _, _ = text.rpartition("load = {")
    return head + f'load = {{ min = "{lo:.6f} kN", max = "{hi:.6f} kN" }}\n'


def with_preload(text: str, fraction: float) -> str:
    lines = [f'preload = "{100 * fraction:.6f}%"' if ln.startswith("preload =") else ln for ln in text.splitlines()]
    return "\n".join(lines) + "\n"


@QUICK
@given(joints())
def test_valid_joints_give_finite_positive_stiffness_and_C_in_0_1(drawn):
    text, _ = drawn
    r = evaluate(text)
    assert math.isfinite(r.bolt_stiffness) and r.bolt_stiffness > 0
    assert math.isfinite(r.member_stiffness) and r.member_stiffness > 0
    assert 0.0 < r.joint_constant < 1.0
    assert math.isfinite(r.preload) and r.preload > 0
    for name, value in r.factors.items():
        assert value is None or (math.isfinite(value) and value > 0), (name, value)
    for check in r.checks:
        assert check.value is None or not math.isnan(check.value), check.name
    # the JSON document holds no NaN or infinity (JSON has none: unbounded factors are null)
    json.loads(dumps(result_document([r], "test")), parse_constant=lambda c: pytest.fail(f"JSON has {c}"))


@QUICK
@given(joints(method="textbook"), st.floats(1.05, 3.0))
def test_yield_and_separation_factors_fall_as_the_load_rises(drawn, scale):
    text, v = drawn
    low = evaluate(with_load(text, 0.0, v["hi"]))
    high = evaluate(with_load(text, 0.0, v["hi"] * scale))
    assert high.factors["yield"] < low.factors["yield"]
    assert high.factors["separation"] < low.factors["separation"]
    assert high.factors["load"] < low.factors["load"] or low.factors["load"] < 0


@QUICK
@given(joints(method="textbook"), st.floats(0.02, 0.3))
def test_separation_factor_rises_with_preload(drawn, step):
    text, v = drawn
    assume(v["preload"] + step <= 1.0)
    low = evaluate(with_preload(text, v["preload"]))
    high = evaluate(with_preload(text, v["preload"] + step))
    assert high.preload > low.preload
    assert high.factors["separation"] > low.factors["separation"]
    assert high.factors["yield"] < low.factors["yield"]          # more preload: more bolt force


@QUICK
@given(joints(method="textbook"), st.floats(1.05, 3.0))
def test_fatigue_factor_falls_as_the_amplitude_rises(drawn, scale):
    text, v = drawn
    mean = v["lo"] + (v["hi"] - v["lo"]) / 2 + 5.0
    a1 = (v["hi"] - v["lo"]) / 2
    a2 = min(a1 * scale, mean)           # keep min >= 0: compressive loads are refused by design
    assume(a2 > a1 * 1.01)
    small = evaluate(with_load(text, mean - a1, mean + a1))
    large = evaluate(with_load(text, mean - a2, mean + a2))
    assert large.sigma_a > small.sigma_a
    assert large.factors["fatigue"] < small.factors["fatigue"]


# ----------------------------------------------------------------------------- invalid values

BASE = """[defaults]
fastener = "M12"
grade = "8.8"

[[joint]]
id = "A1"
layers = [ { material = "steel", thickness = "16 mm" },
           { material = "steel", thickness = "16 mm" } ]
load = { min = "0 kN", max = "10 kN" }
"""

numbers = st.floats(allow_nan=False, allow_infinity=False, min_value=-1e6, max_value=1e6)
invalid = st.one_of(
    st.floats(1e-6, 1e4).map(lambda t: (('"16 mm" },\n', f'"-{t:g} mm" }},\n'), "thickness")),
    st.just((('"16 mm" },\n', '"0 mm" },\n'), "thickness")),
    numbers.filter(lambda r: not 0 < r < 1).map(
        lambda r: (('grade = "8.8"', f'grade = "8.8"\nreliability = {r!r}'), "reliability")),
    numbers.map(lambda t: (('"16 mm" },\n', f'{t!r} }},\n'), "thickness")),          # missing unit
    numbers.map(lambda t: (('max = "10 kN"', f'max = "{t!r}"'), "max")),               # unit missing in a string
    st.floats(0.0, 0.0199).map(lambda f: (('grade = "8.8"', f'grade = "8.8"\nfriction = {{ thread = {f!r}, head = 0.1 }}'),
                                          "friction.thread")),
    st.floats(0.0, 0.999).map(lambda s: (('grade = "8.8"', f'grade = "8.8"\nscatter = {s!r}'), "scatter")),
)


@QUICK
@given(invalid)
def test_invalid_values_exit_2_naming_the_key(capsys, change):
    (old, new), key = change
    text = BASE.replace(old, new, 1)
    assert text != BASE
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "random.toml"
        path.write_text(text)
        code = main(["check", str(path), "--out", str(Path(folder) / "out")])
        out, err = capsys.readouterr()
        assert not (Path(folder) / "out").exists()          # refused before any output is written
    assert code == 2, err
    lines = err.splitlines()
    assert len(lines) == 1 and "random.toml" in lines[0] and key in lines[0], err
    assert "Traceback" not in out + err


# ----------------------------------------------------------------------------- units and fuzz

#: exact unit factors to mm / N (NIST SP 811:2008 Appendix B: 1 in = 25.4 mm, 1 lbf = 4.448 221 615 260 5 N)
LENGTH_UNITS = {"mm": 1.0, "cm": 10.0, "m": 1000.0, "in": 25.4}
FORCE_UNITS = {"N": 1.0, "kN": 1000.0, "lbf": 4.4482216152605}


@QUICK
@given(st.floats(1.0, 50.0), st.sampled_from(sorted(LENGTH_UNITS)), st.floats(0.5, 40.0),
       st.sampled_from(sorted(FORCE_UNITS)))
def test_quantities_in_any_unit_reach_the_engine_in_mm_and_N(t_mm, length_unit, p_kN, force_unit):
    t = t_mm / LENGTH_UNITS[length_unit]
    p = p_kN * 1000.0 / FORCE_UNITS[force_unit]
    text = BASE.replace('"16 mm" },\n', f'"{t!r} {length_unit}" }},\n', 1).replace('"10 kN"', f'"{p!r} {force_unit}"')
    (spec,) = typed_joint_specs(parse_job(text))
    assert spec.layers[0].thickness == pytest.approx(t_mm, rel=1e-12)
    assert spec.load_max == pytest.approx(p_kN * 1000.0, rel=1e-12)


def _exit_of(text: bytes, capsys) -> tuple[int, str]:
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "fuzz.toml"
        path.write_bytes(text)
        code = main(["check", str(path), "--out", str(Path(folder) / "out")])
    return code, capsys.readouterr().err


@QUICK
@given(st.binary(max_size=400) | st.text(max_size=400).map(str.encode))
def test_any_bytes_as_a_job_file_are_bad_input_never_a_crash(capsys, data):
    code, err = _exit_of(data, capsys)
    assert code == 2, err            # random bytes are never a valid job (nothing to check)
    assert len(err.splitlines()) == 1 and "fuzz.toml" in err and "Traceback" not in err


@QUICK
@given(st.integers(0, len(BASE) - 1), st.integers(1, 12), st.text(max_size=6))
def test_a_mangled_job_file_is_checked_or_refused_never_a_crash(capsys, at, cut, insert):
    text = BASE[:at] + insert + BASE[at + cut:]
    code, err = _exit_of(text.encode(), capsys)
    assert code in (0, 1, 2), err    # 3 would be a crash passing for a verdict
    if code == 2:
        assert len(err.splitlines()) == 1 and "fuzz.toml" in err
    assert "Traceback" not in err
