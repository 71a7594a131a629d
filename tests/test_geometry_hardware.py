"""Hole features and hardware recognition on solids built here with known dimensions
(the expected numbers are the construction numbers: an identity to 1e-6 mm)."""
from __future__ import annotations

import math
import os
import sys

import cadquery as cq
import numpy as np
import pytest

from geomjoint.geometry.hardware import Bolt, Nut, Washer, recognise
from geomjoint.geometry.holes import analyse_faces, find_holes

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "samples"))
import make_samples as ms  # noqa: E402

TOL = 1e-6


def _holes(w):
    return find_holes(w.val().wrapped, "block")


def _recognise(w, name="part"):
    solid = w.val().wrapped
    faces = analyse_faces(solid)
    return recognise(name, faces, find_holes(solid, name, faces), solid)


def test_hole_features_in_any_orientation():
    b = (cq.Workplane().box(40, 40, 20)
         .faces(">Z").workplane().pushPoints([(10, -10)]).cboreHole(11, 18, 6)
         .faces("<Z").workplane().pushPoints([(0, 0)]).hole(8.5, 12)
         .faces(">Z").workplane().pushPoints([(-10, -10)]).cskHole(6.6, 13, 90)
         .faces(">Z").workplane().pushPoints([(-10, 10)]).hole(5.0))
    axis = np.array([1.0, 1.0, 0.3]) / np.linalg.norm([1.0, 1.0, 0.3])
    moved = b.rotate((0, 0, 0), tuple(axis), 37).translate((5, 6, 7))
    holes = sorted(_holes(moved), key=lambda h: h.diameter)
    assert [round(h.diameter, 6) for h in holes] == [5.0, 6.6, 8.5, 11.0]
    plain, csk, blind, cbore = holes
    for h in holes:
        # every axis is parallel to the rotated z axis
        rz = cq.Location(cq.Vector(), cq.Vector(*axis), 37).wrapped.Transformation()
        from OCP.gp import gp_Dir
        dz = gp_Dir(0, 0, 1).Transformed(rz)
        assert abs(np.dot(h.direction, (dz.X(), dz.Y(), dz.Z()))) == pytest.approx(1.0, abs=1e-9)
    assert plain.through and plain.depth == pytest.approx(20.0, abs=TOL)
    assert cbore.through and cbore.counterbore[0] == pytest.approx(18.0, abs=TOL)
    # the counterbore seat is 6 mm below the top face: the bore under it is 14 mm long
    b0, b1 = cbore.bore_extent()
    assert b1 - b0 == pytest.approx(14.0, abs=TOL)
    assert csk.through and csk.countersink[0] == pytest.approx(13.0, abs=1e-6)
    assert not blind.through and blind.depth == pytest.approx(12.0, abs=TOL)


def test_partial_cylinders_are_not_holes():
    # a slot's round ends are half cylinders and an inside fillet a quarter: neither is a hole
    w = cq.Workplane().box(60, 30, 10).faces(">Z").workplane().slot2D(30, 10).cutThruAll()
    assert _holes(w) == []
    pocket = (cq.Workplane().box(60, 60, 20).faces(">Z").workplane().rect(30, 30).cutBlind(-10)
              .edges("|Z").fillet(2.0))
    assert _holes(pocket) == []


def test_hex_bolt_socket_screw_nut_and_washer():
    bolt = _recognise(ms.hex_bolt(10, 40, 16, 6.4), "bolt_M10x40")
    assert isinstance(bolt, Bolt)
    assert (bolt.head_kind, bolt.d, bolt.length, bolt.head_width, bolt.head_height) == (
        "hex", pytest.approx(10.0), pytest.approx(40.0), pytest.approx(16.0), pytest.approx(6.4))
    assert bolt.direction == pytest.approx((0, 0, -1), abs=1e-12)
    assert bolt.hint.designation == "M10" and bolt.hint.length == 40.0
    # a socket head with a hex recess (ISO 4762 M8: dk 13, k 8, s 6 - from memory)
    recess = cq.Workplane("XY").polygon(6, 6 / math.cos(math.radians(30))).extrude(4).translate((0, 0, 4))
    screw = ms.socket_screw(8, 30, 13, 8).cut(recess)
    s = _recognise(screw, "screw")
    assert isinstance(s, Bolt) and s.head_kind == "socket"
    assert s.head_width == pytest.approx(13.0) and s.d == pytest.approx(8.0) and s.length == pytest.approx(30.0)
    # a thread modelled as a smaller cylinder does not change the nominal
    reduced = (ms.hex_bolt(10, 16, 16, 6.4)
               .union(cq.Workplane("XY").circle(8.16 / 2).extrude(-40)))
    r = _recognise(reduced, "bolt")
    assert isinstance(r, Bolt) and r.d == pytest.approx(10.0) and r.length == pytest.approx(40.0)
    nut = _recognise(ms.hex_nut(10, 16, 8.4).edges("not |Z").chamfer(0.5), "nut")
    assert isinstance(nut, Nut)
    assert (nut.d, nut.width, nut.height) == (pytest.approx(10.0), pytest.approx(16.0), pytest.approx(8.4))
    washer = _recognise(ms.plain_washer(10.5, 20, 2), "washer")
    assert isinstance(washer, Washer)
    assert (washer.inner, washer.outer, washer.thickness) == (
        pytest.approx(10.5), pytest.approx(20.0), pytest.approx(2.0))


def test_plates_spacers_and_pins_are_members():
    assert _recognise(ms.plate(40, 40, 10, [(0, 0)], 11.0)) is None
    # a 20 mm long round spacer is a clamped member, not a washer
    assert _recognise(ms.plain_washer(10.5, 20, 20)) is None
    # a headless pin is no bolt
    assert _recognise(cq.Workplane().circle(5).extrude(40)) is None


def test_round_cover_and_collared_shaft_are_not_hardware():
    # a thin round cover with one central hole: outer / inner = 100 / 11, far beyond a washer
    cover = cq.Workplane().circle(50).circle(5.5).extrude(5)
    assert _recognise(cover, "round_cover") is None
    # a shaft with a wide collar (5 d) is not a bolt head
    shaft = cq.Workplane().circle(5).extrude(-60).union(cq.Workplane().circle(25).extrude(6))
    assert _recognise(shaft, "shaft") is None
