"""Every member-stiffness method reachable from a typed-in job, and the side-by-side comparison."""
import pytest

from geomjoint.analysis import analyze_job
from geomjoint.job import parse_job
from geomjoint.mechanics.fe import FeLayer, fe_member_stiffness
from geomjoint.mechanics.members import frustum_stiffness

JOB = """
[defaults]
fastener = "M12"
grade = "10.9"
member_stiffness = "{method}"
{extra}

[[joint]]
id = "T1"
hole_diameter = "13 mm"
layers = [ {{ material = "steel", thickness = "15 mm" }}, {{ material = "steel", thickness = "15 mm" }} ]
load = {{ min = "0 kN", max = "8 kN" }}
"""


def run(method, extra=""):
    (result,) = analyze_job(parse_job(JOB.format(method=method, extra=extra))).results
    return result


def test_typed_cone_is_the_frustum_bounded_by_outside_diameter():
    # identity: a typed-in joint has no part geometry, so its cone is clipped by a round part only
    wide = run("cone")
    frustum = run("frustum")
    assert wide.member_stiffness == pytest.approx(frustum.member_stiffness, rel=1e-12)
    narrow = run("cone", 'outside_diameter = "26 mm"')
    expected = frustum_stiffness([(15.0, narrow.spec.layers[0].E)] * 2, narrow.spec.bearing_diameter,
                                 narrow.spec.far_bearing_diameter, 13.0,
                                 30.0, outside_diameter=26.0)
    assert narrow.member_stiffness == pytest.approx(expected, rel=1e-12)
    assert narrow.member_stiffness < wide.member_stiffness


def test_typed_fe_uses_the_fe_model():
    result = run("fe", 'outside_diameter = "60 mm"')
    assert result.stiffness_method == "fe"
    spec = result.spec
    direct = fe_member_stiffness([FeLayer(l.thickness, l.E, l.poisson) for l in spec.layers], 13.0,
                                 spec.bearing_diameter, spec.far_bearing_diameter, outer_diameter=60.0)
    assert result.member_stiffness == pytest.approx(direct.stiffness, rel=1e-9)
    assert result.fe.mesh_change < 0.01     # the FE model's own refinement criterion


def test_compare_stiffness_lists_every_method():
    result = run("frustum", "compare_stiffness = true")
    table = result.comparison.values()
    assert set(table) == {"frustum", "exponential", "vdi", "fe"}
    assert table["frustum"] == pytest.approx(result.member_stiffness)
    assert all(v > 0 for v in table.values())


def test_comparison_reaches_json_and_html():
    from geomjoint.report.html import html_report
    from geomjoint.report.json_doc import result_document

    result = run("frustum", "compare_stiffness = true")
    doc = result_document([result], "t")["joints"][0]
    assert doc["stiffness"]["comparison"] == result.comparison.values()
    page = html_report([result], title="t")
    assert "Member stiffness by every method" in page and "axisymmetric finite elements" in page


def test_timed_out_joint_fails_with_valid_document(monkeypatch):
    import jsonschema
    from conftest import load_schema
    from geomjoint.limits import TIMEOUT_NOTE
    from geomjoint.report.json_doc import result_document

    monkeypatch.setenv("GEOMJOINT_JOINT_SECONDS", "0.001")   # the FE model cannot finish in 1 ms
    result = run("fe")
    assert not result.ok and result.verdict == "fail" and result.governing == "analysis"
    assert TIMEOUT_NOTE in next(c.note for c in result.checks if c.name == "analysis")
    doc = result_document([result], "t")
    jsonschema.validate(doc, load_schema("result.schema.json"))
    assert doc["summary"]["failed"] == 1
