"""Reading models: STEP units, instances, names, colours, bad input.

Known answers come from the construction of the models (the numbers put in are the
numbers that must come out) and from the definition of the inch (25.4 mm exactly,
NIST SP 811 / ISO 80000-3).
"""
from __future__ import annotations

import os
import sys

import cadquery as cq
import pytest

from geomjoint.errors import InputError
from geomjoint.geometry.model import load_model, material_hint

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "samples"))
import make_samples as ms  # noqa: E402


def _bbox(part):
    return cq.Shape(part.solid).BoundingBox()


def test_step_written_in_inches_reads_in_mm(tmp_path):
    a = cq.Assembly(name="inch")
    a.add(cq.Workplane().box(25.4, 50.8, 12.7, centered=False), name="block", loc=cq.Location((254.0, 0, 0)))
    path = tmp_path / "inch.step"
    ms.write_step(a, str(path), unit="INCH")
    text = path.read_text()
    assert "'INCH'" in text                      # the file really is in inches
    assert "(10.,0.,0.)" in text                  # 254 mm written as 10 in
    part = load_model(str(path)).parts[0]
    bb = _bbox(part)
    # 1 in = 25.4 mm exactly (NIST SP 811)
    assert bb.xmin == pytest.approx(254.0, abs=1e-6)
    assert bb.xlen == pytest.approx(25.4, abs=1e-6)
    assert bb.ylen == pytest.approx(50.8, abs=1e-6)
    assert bb.zlen == pytest.approx(12.7, abs=1e-6)


def test_instances_of_one_part_are_separate_parts(tmp_path):
    sub = cq.Assembly(name="clip")
    sub.add(cq.Workplane().box(10, 10, 2), name="clip_plate")
    top = cq.Assembly(name="top")
    top.add(sub, name="clip_a", loc=cq.Location((0, 0, 0)))
    top.add(sub, name="clip_b", loc=cq.Location((50, 0, 0)))
    path = tmp_path / "twice.step"
    ms.write_step(top, str(path))
    for model in (load_model(top), load_model(str(path))):
        names = [p.name for p in model.parts]
        assert names == ["clip_plate", "clip_plate#2"]
        xs = sorted(round(_bbox(p).center.x, 6) for p in model.parts)
        assert xs == [0.0, 50.0]


def test_names_colours_and_material_hints(tmp_path):
    a = cq.Assembly(name="kit")
    a.add(cq.Workplane().box(10, 10, 10), name="adapter_plate_alu", color=cq.Color(1, 0, 0))
    a.add(cq.Workplane().box(5, 5, 5), name="frame_flange", loc=cq.Location((20, 0, 0)))
    path = tmp_path / "kit.step"
    ms.write_step(a, str(path))
    parts = {p.name: p for p in load_model(str(path)).parts}
    assert set(parts) == {"adapter_plate_alu", "frame_flange"}
    assert parts["adapter_plate_alu"].material_hint == "aluminium"
    assert parts["adapter_plate_alu"].colour == pytest.approx((1.0, 0.0, 0.0), abs=1e-3)
    assert parts["frame_flange"].material_hint is None
    assert material_hint("housing_cast_iron") == "gray cast iron"
    assert material_hint("cover", "STAINLESS") == "stainless steel"


def test_single_solid_and_multi_solid_compound(tmp_path):
    one = cq.Workplane().box(10, 10, 10)
    path = tmp_path / "one.step"
    cq.exporters.export(one, str(path))
    assert len(load_model(str(path)).parts) == 1
    two = cq.Workplane().box(10, 10, 10).union(cq.Workplane().box(10, 10, 10).translate((30, 0, 0)))
    path2 = tmp_path / "two.step"
    cq.exporters.export(two, str(path2))
    parts = load_model(str(path2)).parts
    assert len(parts) == 2
    assert len({p.name for p in parts}) == 2


def test_bad_input_names_the_file(tmp_path):
    good = tmp_path / "good.step"
    ms.write_step(ms.pump_skid_inch(), str(good))
    data = good.read_bytes()
    cases = {
        "empty.step": (b"", "empty"),
        "notstep.step": (b"solid cube\nfacet normal 0 0 1\n", "not a STEP"),
        "truncated.step": (data[: len(data) // 2], "truncated"),
    }
    for name, (content, what) in cases.items():
        p = tmp_path / name
        p.write_bytes(content)
        with pytest.raises(InputError) as err:
            load_model(str(p))
        assert str(p) in str(err.value) and what in str(err.value)
        assert "\n" not in str(err.value)
    with pytest.raises(InputError, match="not found"):
        load_model(str(tmp_path / "missing.step"))


def test_step_without_solids(tmp_path):
    path = tmp_path / "wire.step"
    cq.exporters.export(cq.Workplane().polyline([(0, 0), (10, 0), (10, 5)]), str(path))
    assert "ISO-10303-21" in path.read_text()[:50]
    with pytest.raises(InputError) as err:
        load_model(str(path))
    assert str(path) in str(err.value) and "no solids" in str(err.value)


@pytest.mark.parametrize("schema", ["AP203", "AP214IS", "AP242DIS"])
def test_step_schemas_read_alike(tmp_path, schema):
    from OCP.Interface import Interface_Static

    a = cq.Assembly(name="pair")
    a.add(ms.plate(40, 40, 12, [(0, 0)], 11.0), name="lower")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0, z0=12.0), name="upper")
    path = tmp_path / f"{schema}.step"
    old = Interface_Static.CVal_s("write.step.schema")
    Interface_Static.SetCVal_s("write.step.schema", schema)
    try:
        ms.write_step(a, str(path))
    finally:
        Interface_Static.SetCVal_s("write.step.schema", old)
    head = path.read_text()[:600].upper()
    key = {"AP203": "CONFIG_CONTROL_DESIGN", "AP214IS": "AUTOMOTIVE_DESIGN", "AP242DIS": "AP242"}[schema]
    assert key in head
    model = load_model(str(path))
    assert sorted(p.name for p in model.parts) == ["lower", "upper"]
    zs = sorted(round(_bbox(p).zlen, 6) for p in model.parts)
    assert zs == [10.0, 12.0]


def test_workplane_with_several_solids():
    lower = ms.plate(40, 40, 10, [(0, 0)], 11.0)
    upper = ms.plate(40, 40, 8, [(0, 0)], 11.0, z0=10.0)
    wp = cq.Workplane().add([lower.val(), upper.val()])
    model = load_model(wp)
    assert [p.name for p in model.parts] == ["solid", "solid#2"]
    assert load_model(lower.val()).parts[0].name == "solid"
