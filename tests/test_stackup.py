"""Stack-ups at the tolerance limits of typed-in joints (issue 14): job keys, the bands, the
checks `stack-up limits` and `position`, the preload range and the remedies."""
from __future__ import annotations

import math

import pytest

from geomjoint.analysis import analyze_job
from geomjoint.errors import InputError
from geomjoint.job import parse_job
from geomjoint.mechanics.checks import service_preload
from geomjoint.mechanics.stackup import POSITION_CHECK, STACKUP_CHECK, stackup
from geomjoint.mechanics.vdi import vdi_chain
from geomjoint.resolve import typed_joint_specs

THROUGH = """
[defaults]
fastener = "M12"
grade = "8.8"
{defaults}
{tables}
[[joint]]
id = "A"
length = "{length}"
layers = [ {{ material = "steel", thickness = "16 mm", part = "bracket" }},
           {{ material = "steel", thickness = "16 mm", part = "frame" }} ]
load = {{ max = "10 kN" }}
"""


def _job(length="45 mm", defaults="", tables=""):
    return parse_job(THROUGH.format(length=length, defaults=defaults, tables=tables))


def _result(job, joint_id="A"):
    return next(r for r in analyze_job(job).results if r.id == joint_id)


def _check(result, name):
    return next(c for c in result.checks if c.name == name)


def test_through_joint_passes_at_nominal_fails_at_the_limits():
    r = _result(_job())
    su = r.stackup
    # hand computation, M12x45 hex (ISO 4014 grade A, 45 in 30-50: js15 +/-0.5), two 16 mm plates
    # (ISO 2768-1 m, over 6 up to 30: +/-0.2), ISO 4032 nut m 10.37..10.8 (nominal the 10.8 of the catalogue):
    # nominal 45 - 32 - 10.8 = 2.2; worst min 44.5 - 32.4 - 10.8 = 1.3; worst max 45.5 - 31.6 - 10.37 = 3.53
    assert su.protrusion.nominal == pytest.approx(2.2)
    assert su.protrusion.worst_min == pytest.approx(1.3)
    assert su.protrusion.worst_max == pytest.approx(3.53)
    # RSS: mean 2.2 + 0.215 (the nut centred at 10.585), half band sqrt(0.5^2 + 2*0.2^2 + 0.215^2)
    half = math.sqrt(0.25 + 0.08 + 0.215 ** 2)
    assert su.protrusion.stat_min == pytest.approx(2.415 - half)
    assert su.grip.worst_min == pytest.approx(31.6) and su.grip.worst_max == pytest.approx(32.4)
    check = _check(r, STACKUP_CHECK)
    # one pitch (1.75 mm) must stand past the nut (common practice)
    assert not check.ok and check.value == pytest.approx(1.3) and check.required == pytest.approx(1.75)
    assert "protrusion past the nut" in check.note and "0.45 mm short" in check.note
    assert su.fails_at_limit_only and r.verdict == "fail" and r.governing == STACKUP_CHECK
    # every other check passes: the joint fails only at a limit
    assert all(c.ok for c in r.checks if c.name != STACKUP_CHECK)
    # the remedy: the next standard length, re-checked at the limits
    assert r.remedies[0].change == "bolt length 45 -> 50 mm" and r.remedies[0].verdict == "pass"


def test_statistical_method_lets_the_rss_limits_decide():
    r = _result(_job(defaults='stackup_method = "statistical"'))
    check = _check(r, STACKUP_CHECK)
    # RSS lower limit 2.415 - 0.613 = 1.80 >= 1.75: passes; the worst case (1.3) is still reported
    assert check.ok and check.value == pytest.approx(r.stackup.protrusion.stat_min)
    assert "worst-case 1.30 mm" in check.note
    assert r.stackup.method == "statistical" and r.verdict != "fail"


def test_a_chosen_length_passes_at_the_limits():
    job = parse_job(THROUGH.replace('length = "{length}"\n', "").format(defaults="", tables=""))
    spec = typed_joint_specs(job)[0]
    # nominal rule: 32 + 10.8 + 2 * 1.75 = 46.3 -> 50 (ISO 4014 series); 50 passes at the limits as well
    assert spec.fastener.length == 50.0
    assert _check(_result(job), STACKUP_CHECK).ok


def test_thickness_tolerance_keys():
    # a finer class: ISO 2768-1 f over 6 up to 30 is +/-0.1
    spec = typed_joint_specs(_job(defaults='thickness_tolerance = "f"'))[0]
    assert spec.stackup.thickness[0].upper == pytest.approx(0.1) and spec.stackup.thickness_rule[0] == "ISO 2768-1 f"
    # a per-part value and a plate class
    tables = '[tolerances]\n"bracket" = "+0.2/-0.1 mm"\n"fra*" = "EN 10029 B"'
    spec = typed_joint_specs(_job(tables=tables))[0]
    assert (spec.stackup.thickness[0].lower, spec.stackup.thickness[0].upper) == pytest.approx((-0.1, 0.2))
    # EN 10029:2010 Table 1 class B, 15 <= t < 25: -0.3 / +1.6 (from memory)
    assert (spec.stackup.thickness[1].lower, spec.stackup.thickness[1].upper) == pytest.approx((-0.3, 1.6))
    spec = typed_joint_specs(_job(defaults='thickness_tolerance = "±0.05 mm"'))[0]
    assert spec.stackup.thickness[1].upper == pytest.approx(0.05)


@pytest.mark.parametrize("defaults, tables, key", [
    ('thickness_tolerance = "q"', "", "thickness_tolerance"),
    ('thickness_tolerance = "0.2"', "", "thickness_tolerance"),
    ('stackup_method = "rss"', "", "stackup_method"),
    ('position_tolerance = "-0.1 mm"', "", "position_tolerance"),
    ("", '[tolerances]\n"bracket" = "EN 10029 Z"', "[tolerances]"),
    ("", '[tolerances]\n"nothing*" = "f"', "[tolerances]"),
    ("", '[positions]\n"frame" = 0.2', "[positions]"),
    ("", '[positions]\n"nothing*" = "0.2 mm"', "[positions]"),
])
def test_bad_tolerance_input_names_the_key(defaults, tables, key):
    with pytest.raises(InputError) as exc:
        job = _job(defaults=defaults, tables=tables)
        analyze_job(job)
    message = str(exc.value)
    assert key in message and "\n" not in message


def test_position_floating_fastener():
    # M12 in the ISO 273 medium 13.5 hole: T = H - F = 1.5 (ASME Y14.5 floating fastener)
    r = _result(_job(length="50 mm", defaults='position_tolerance = "1.2 mm"'))
    check = _check(r, POSITION_CHECK)
    assert check.ok and check.value == pytest.approx(1.5) and check.required == pytest.approx(1.2)
    assert r.stackup.position.affordable == pytest.approx(1.5)
    r = _result(_job(length="50 mm", tables='[positions]\n"frame" = "2 mm"'))
    check = _check(r, POSITION_CHECK)
    assert not check.ok and "afford 1.50 mm" in check.note and "frame" in check.note
    assert any(m.change == "position tolerance 2 -> 1.5 mm" and m.verdict == "pass" for m in r.remedies)


TAPPED = """
[defaults]
fastener = "M10"
grade = "8.8"
head = "socket"
{defaults}
[tolerances]
"block" = "{depth_tol}"
[[joint]]
id = "T"
tapped = true
length = "{length}"
layers = [ {{ material = "steel", thickness = "18 mm", part = "cover" }},
           {{ material = "steel", thickness = "18 mm", part = "block" }} ]
load = {{ max = "5 kN" }}
"""


def test_blind_hole_bottoms_at_the_limits():
    r = _result(parse_job(TAPPED.format(length="35 mm", depth_tol="±1 mm", defaults="")), "T")
    su = r.stackup
    # hand computation: M10x35 socket (ISO 4762 grade A, js15 30-50: +/-0.5), cover 18 +/-0.2 (ISO 2768-1 m),
    # tapped depth 18 +/-1 (the job): clearance nominal 18 - (35 - 18) = 1; worst 17 - 35.5 + 17.8 = -0.7
    assert su.bottom_clearance.nominal == pytest.approx(1.0)
    assert su.bottom_clearance.worst_min == pytest.approx(-0.7)
    # engagement: nominal 17; worst 34.5 - 18.2 = 16.3 >= 10 (1.0 d in steel, common practice)
    assert su.engagement.worst_min == pytest.approx(16.3) and su.engagement.required == pytest.approx(10.0)
    check = _check(r, STACKUP_CHECK)
    assert not check.ok and "bottom of the tapped hole" in check.note
    # the shorter standard length passes at the limits: 30 (js15 18-30: +/-0.42): engagement 29.58 - 18.2 = 11.38
    assert r.remedies and r.remedies[0].change == "bolt length 35 -> 30 mm"
    assert r.stackup.position.case == "fixed"


def test_fixed_fastener_with_and_without_projected_zone():
    # M10 in the ISO 273 medium 11 hole: H - F = 1.0; projected: T = 0.5 each (ASME Y14.5 fixed fastener)
    job = parse_job(TAPPED.format(length="30 mm", depth_tol="±0.2 mm", defaults='position_tolerance = "0.5 mm projected"'))
    r = _result(job, "T")
    assert _check(r, POSITION_CHECK).ok and r.stackup.position.affordable == pytest.approx(0.5)
    # not projected: P = 18 clamped, D = 30 - 18 = 12 engaged: T = 1.0 / (2 + 2*18/12) = 0.2
    job = parse_job(TAPPED.format(length="30 mm", depth_tol="±0.2 mm", defaults='position_tolerance = "0.5 mm"'))
    r = _result(job, "T")
    check = _check(r, POSITION_CHECK)
    assert r.stackup.position.affordable == pytest.approx(0.2)
    assert not check.ok and check.required == pytest.approx(0.5 + 0.5 * 4.0)


def test_preload_range_from_the_clamp_length_at_its_limits():
    r = _result(_job(length="50 mm"))
    pre = r.stackup.preload
    spec = r.spec
    chain = vdi_chain(spec)
    # VDI 2230-1 embedding: f_Z of Table 5 (one thread, two bearing faces, one interface: 3 + 2*3 + 2 um, medium
    # roughness, from memory); the loss at nominal is the chain's own F_Z = f_Z / (delta_S + delta_P)
    assert pre.f_Z == pytest.approx(0.011)
    assert pre.loss[0] == pytest.approx(chain.F_Z)
    assert pre.preload[0] == pytest.approx(service_preload(spec)[0] - chain.F_Z)
    # a thicker clamp is more resilient: it loses less to the same f_Z
    assert pre.loss[1] > pre.loss[0] > pre.loss[2]
    assert pre.low == pre.preload[1] and pre.high == pre.preload[2]


def test_shank_in_the_shear_plane_at_nominal_only():
    text = THROUGH.format(length="60 mm", defaults="", tables="").replace(
        'thickness = "16 mm", part = "bracket"', 'thickness = "29.8 mm", part = "bracket"').replace(
        'thickness = "16 mm", part = "frame"', 'thickness = "12 mm", part = "frame"').replace(
        'load = { max = "10 kN" }', 'load = { max = "10 kN", shear = "2 kN" }')
    r = _result(parse_job(text))
    # M12x60 hex: thread b = 2d + 6 = 30 (ISO 4014), shank 30; the plane at 29.8: 0.2 mm of shank past it at
    # nominal; shortest bolt 59.4 (js15 50-80 +/-0.6) and thickest bracket 30.0: 29.4 - 30.0 = -0.6
    plane = r.stackup.shear_planes[0]
    assert plane.between == ("bracket", "frame")
    assert plane.band.nominal == pytest.approx(0.2) and plane.band.worst_min == pytest.approx(-0.6)
    check = _check(r, STACKUP_CHECK)
    assert not check.ok and "shear plane" in check.note


def test_without_shear_the_plane_is_reported_not_judged():
    text = THROUGH.format(length="60 mm", defaults="", tables="").replace(
        'thickness = "16 mm", part = "bracket"', 'thickness = "29.8 mm", part = "bracket"').replace(
        'thickness = "16 mm", part = "frame"', 'thickness = "12 mm", part = "frame"')
    su = stackup(typed_joint_specs(parse_job(text))[0])
    assert su.shear_planes[0].band.required is None
    assert all(b.name != "shear_plane" for b in su.judged())


def test_results_json_carries_the_stackup():
    from conftest import validate_result
    from geomjoint.report.json_doc import result_document

    results = analyze_job(_job()).results + analyze_job(
        parse_job(TAPPED.format(length="35 mm", depth_tol="±1 mm", defaults='position_tolerance = "0.3 mm"'))).results
    doc = result_document(results, "test")
    validate_result(doc)
    through, tapped = doc["joints"]
    su = through["stackup"]
    assert set(su["grip"]) >= {"nominal", "worst_min", "worst_max", "stat_min", "stat_max"}
    assert su["protrusion"]["worst_min"] == pytest.approx(1.3) and "engagement" not in su
    assert su["governing"] == "protrusion" and su["least_margin"] == pytest.approx(1.3 - 1.75)
    assert su["fails_at_limit_only"] is True
    assert su["elements"][0]["name"].startswith("bolt M12x45")
    assert "engagement" in tapped["stackup"] and "bottom_clearance" in tapped["stackup"]
    assert "protrusion" not in tapped["stackup"]
    assert tapped["stackup"]["position"]["case"] == "fixed"
    names = [c["name"] for c in tapped["checks"]]
    assert "stack-up limits" in names and "position" in names


def test_reports_show_the_stackup():
    from geomjoint.report.html import html_report
    from geomjoint.report.plots import stackup_svg
    from geomjoint.report.text import result_table

    results = analyze_job(_job()).results
    table = result_table(results)
    assert "lim margin mm" in table.splitlines()[0]
    assert "-0.45" in table.splitlines()[2]          # 1.30 - 1.75 at the worst-case limit
    svg = stackup_svg(results[0], prefix="t-")
    assert svg.startswith("<svg") and "bolt M12x45" in svg and "sum of the stack" in svg
    assert "needed reach 44.95" in svg                # thickest stack 32.4 + nut 10.8 + one pitch 1.75
    from geomjoint.report.lazy import expand

    page = expand(html_report(results, title="t"))     # the drawings put back in place, as opened
    assert "Stack-up at the tolerance limits" in page and 'aria-label="stack-up chart of A"' in page
    assert "protrusion past the nut" in page


def test_remedy_offers_a_finer_general_class():
    # four 7.825 mm plates under M12x45: 45 - 31.3 - 10.8 = 2.9 mm past the nut at nominal.
    # ISO 2768-1 m (+/-0.2 each, over 6 up to 30) and the bolt's js15 (+/-0.5): 2.9 - 0.5 - 0.8 = 1.6 < 1.75;
    # class f (+/-0.1 each): 2.9 - 0.5 - 0.4 = 2.0 >= 1.75 (ISO 2768-1:1989 Table 1, from memory)
    plates = ",\n".join(f'{{ material = "steel", thickness = "7.825 mm", part = "plate{i}" }}' for i in range(4))
    text = f"""
[defaults]
fastener = "M12"
grade = "8.8"
[[joint]]
id = "P"
length = "45 mm"
layers = [ {plates} ]
load = {{ max = "5 kN" }}
"""
    r = _result(parse_job(text), "P")
    assert r.stackup.protrusion.worst_min == pytest.approx(1.6)
    changes = [m.change for m in r.remedies]
    assert changes[0] == "bolt length 45 -> 50 mm"
    assert "thickness tolerance ISO 2768-1 m -> f for plate0, plate1, plate2, plate3" in changes
    # per joint: the statistical method on this joint only
    r = _result(parse_job(text.replace('length = "45 mm"', 'length = "45 mm"\nstackup_method = "statistical"')), "P")
    assert r.stackup.method == "statistical" and next(c for c in r.checks if c.name == STACKUP_CHECK).ok
