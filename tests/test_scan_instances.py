"""The scan reads each shape definition once and moves the reading to every placement
(geometry/placed.py): the moved holes and hardware equal what reading each placed solid gives,
for placements that turn the canonical axis direction over, lay it sideways or tilt it
(identities of rigid motions, to 1e-7 mm), and the faces of a definition are analysed once."""
from __future__ import annotations

import dataclasses
import math
import os
import sys

import cadquery as cq
import numpy as np
import pytest

from geomjoint.catalog.hole_parts import hole_part_kind
from geomjoint.geometry import scan as scan_module
from geomjoint.geometry.model import load_model
from geomjoint.geometry.scan import _read, _Readings, scan_model, scan_to_json

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "samples"))
import make_samples as ms  # noqa: E402

TOL = 1e-7

#: placements: identity, a shift, upside down (the canonical direction turns over), lying
#: along x, and tilted about an oblique axis
POSES = [
    cq.Location((0, 0, 0)),
    cq.Location((150, 0, 0)),
    cq.Location(cq.Vector(0, 150, 0), cq.Vector(1, 0, 0), 180),
    cq.Location(cq.Vector(0, 0, 150), cq.Vector(0, 1, 0), 90),
    cq.Location(cq.Vector(-120, 40, 30), cq.Vector(1, 1, 1), 40),
]


def _plate() -> cq.Workplane:
    """A 12 mm block (z = 0 .. 12) with a counterbored through hole, a plain through hole and a
    blind hole."""
    body = cq.Workplane("XY").box(80, 50, 12, centered=(True, True, False))
    body = body.faces(">Z").workplane().pushPoints([(-22, 0)]).cboreHole(11, 18, 6)
    body = body.faces(">Z").workplane().pushPoints([(22, 0)]).hole(8.5, 8)
    return body.faces(">Z").workplane().pushPoints([(0, 15)]).hole(11)


#: one definition of each part, placed in every unit
PLATE, SCREW, BOLT = _plate(), ms.socket_screw(10, 30, 16, 10), ms.hex_bolt(10, 40, 16, 6.4)
NUT, WASHER = ms.hex_nut(10, 16, 8.4), ms.plain_washer(10.5, 20, 2)
#: a dowel in the blind hole: a member whose outer cylinder fills a hole (a plug)
DOWEL = cq.Workplane("XY").circle(4.25).extrude(8)
DEFINITIONS = 6
PARTS_PER_UNIT = 9


def _unit(k: int) -> cq.Assembly:
    """Two joints in the block: a socket screw in the counterbore, a hex bolt with washers in the
    plain hole, each with a washer and a nut below (bearing faces as make_samples places them)."""
    unit = cq.Assembly(name=f"unit_{k}")
    unit.add(PLATE, name=f"plate_steel_{k}")
    unit.add(DOWEL, name=f"dowel_pin_{k}", loc=cq.Location((22, 0, 4)))
    unit.add(SCREW, name=f"screw_M10x30_{k}", loc=ms.down(6.0, -22, 0))
    unit.add(WASHER, name=f"washer_M10_{k}", loc=ms.down(12.0, 0, 15))
    unit.add(BOLT, name=f"bolt_M10x40_{k}", loc=ms.down(14.0, 0, 15))
    for x, y, tag in ((-22, 0, "a"), (0, 15, "b")):
        unit.add(WASHER, name=f"washer_M10_{k}{tag}", loc=ms.up_from(0.0, x, y))
        unit.add(NUT, name=f"nut_M10_{k}{tag}", loc=ms.up_from(-2.0, x, y))
    return unit


@pytest.fixture(scope="module")
def model(tmp_path_factory):
    asm = cq.Assembly(name="instances")
    for k, pose in enumerate(POSES, start=1):
        asm.add(_unit(k), name=f"unit_{k}", loc=pose)
    path = tmp_path_factory.mktemp("instances") / "instances.step"
    asm.export(str(path))
    return load_model(str(path))


def _same(a, b, where: str) -> None:
    if dataclasses.is_dataclass(a) and not isinstance(a, type):
        assert type(a) is type(b), where
        for f in dataclasses.fields(a):
            if f.name != "solid":
                _same(getattr(a, f.name), getattr(b, f.name), f"{where}.{f.name}")
    elif isinstance(a, np.ndarray):
        assert np.allclose(a, b, atol=TOL), (where, a, b)
    elif isinstance(a, float):
        assert b == pytest.approx(a, abs=TOL), where
    elif isinstance(a, (list, tuple)):
        assert len(a) == len(b), where
        for i, (x, y) in enumerate(zip(a, b)):
            _same(x, y, f"{where}[{i}]")
    else:
        assert a == b, where


def test_every_placement_reads_as_its_placed_solid(model):
    readings = _Readings()
    assert len(model.parts) == PARTS_PER_UNIT * len(POSES)
    kinds = set()
    for part in model.parts:
        holes, hw, plugs = readings.of(part)
        direct = _direct(part)
        if hw is not None:
            assert hw.solid is part.solid and hw.part == part.name
        kinds.add(type(hw).__name__)
        _same(direct, (holes, hw, plugs), part.name)
        assert all(h.solid is part.solid and h.part == part.name for h in holes + plugs)
    assert kinds == {"Bolt", "Nut", "Washer", "NoneType"}
    # the plate's three features keep their kinds at every placement (construction numbers)
    for part in model.parts:
        if part.name.startswith("plate"):
            holes, _, plugs = readings.of(part)
            assert sorted(round(h.diameter, 6) for h in holes) == [8.5, 11.0, 11.0]
            assert sum(h.counterbore is not None for h in holes) == 1
            assert sum(not h.through for h in holes) == 1
            cbore = next(h for h in holes if h.counterbore)
            assert cbore.counterbore[0] == pytest.approx(18.0, abs=TOL)
            # the seat lies 6 mm below the plate's top face, along the placed axis
            top = cbore.t0 if cbore.counterbore[2] == "start" else cbore.t1
            assert abs(cbore.counterbore[1] - top) == pytest.approx(6.0, abs=TOL)
        if part.name.startswith("dowel"):
            _, hw, plugs = readings.of(part)
            assert hw is None and len(plugs) == 1
            assert plugs[0].diameter == pytest.approx(8.5, abs=TOL) and plugs[0].t1 - plugs[0].t0 == pytest.approx(8.0)
            assert plugs[0].kind == hole_part_kind(part.name, part.product, part.instance)


def test_faces_of_each_definition_are_analysed_once(model, monkeypatch):
    calls = []
    real = scan_module.analyse_faces

    def counting(solid):
        calls.append(solid)
        return real(solid)

    monkeypatch.setattr(scan_module, "analyse_faces", counting)
    result = scan_model(model)
    assert len(calls) == DEFINITIONS
    assert len(result.bolts) == 2 * len(POSES) and len(result.nuts) == 2 * len(POSES)
    assert len(result.washers) == 3 * len(POSES)
    # every unit's two joints are found, at every placement
    assert sum(j.bolt is not None and j.nut is not None for j in result.joints) == 2 * len(POSES)


def test_scan_document_equals_reading_every_placed_solid(model, monkeypatch):
    cached = scan_to_json(scan_model(model))
    assert len(cached["joints"]) >= 2 * len(POSES)
    monkeypatch.setattr(_Readings, "of", lambda self, part: _direct(part))
    direct = scan_to_json(scan_model(model))
    assert cached == direct


def _direct(part):
    """What reading the placed solid itself gives (the scan before per-definition readings)."""
    return _read(part.solid, part, scan_module._label(part))


def test_a_mirrored_placement_is_read_on_its_own_solid():
    from OCP.gp import gp_Ax2, gp_Dir, gp_Pnt, gp_Trsf
    from OCP.TopLoc import TopLoc_Location

    from geomjoint.geometry.placed import Placement

    solid = ms.hex_nut(10, 16, 8.4).val().wrapped
    mirror = gp_Trsf()
    mirror.SetMirror(gp_Ax2(gp_Pnt(0, 0, 0), gp_Dir(1, 0, 0)))
    assert Placement.of(solid.Moved(TopLoc_Location(mirror))) is None
    turn = gp_Trsf()
    turn.SetRotation(gp_Ax2(gp_Pnt(0, 0, 0), gp_Dir(0, 0, 1)).Axis(), math.pi / 3)
    assert Placement.of(solid.Moved(TopLoc_Location(turn))) is not None


def test_placements_named_otherwise_are_recognised_by_their_own_names(model):
    """Placements of one definition under names that say otherwise (a plain name, and one that
    calls it a pin): recognition reads the name too, so they are read apart (the pin is no fastener)."""
    bolt = next(p for p in model.parts if p.name.startswith("bolt"))
    other = next(p for p in model.parts if p.name.startswith("bolt") and p is not bolt)
    as_bolt = dataclasses.replace(bolt, name="block_x", product="block_x", instance=None)
    as_pin = dataclasses.replace(other, name="locating pin_y", product="locating pin_y", instance=None)
    readings = _Readings()
    assert type(readings.of(as_bolt)[1]).__name__ == "Bolt"
    assert readings.of(as_pin)[1] is None
    for part in (as_bolt, as_pin):   # (neither name has a designation: only the word "pin" differs)
        _same(_direct(part), readings.of(part), part.name)
