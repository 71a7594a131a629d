"""Build and write the sample models (scenarios of our own) into samples/.

    python samples/make_samples.py

- conveyor_bracket.step: a steel frame flange, an aluminium adapter plate and a steel
  motor foot, held by four M10 hex bolts with washers and nuts.  Deliberate faults:
  one hole of the adapter plate is offset, the motor foot stands off the adapter plate
  by a gap at one corner (a shim left out), and one bolt is too short.
- gearbox_cover.step: a cover held by four M8 socket head cap screws in counterbores,
  into blind tapped holes of a cast iron housing.
- pump_skid_inch.step: a pump foot on a skid rail with 1/2-13 UNC hex bolts and nuts,
  written in inches.

Hardware is simple solids: hex heads and nuts are hex prisms, threads are not modelled.
The builders here are also used by the tests.
"""
from __future__ import annotations

import math
import os
import sys

import cadquery as cq

HERE = os.path.dirname(os.path.abspath(__file__))
IN = 25.4


# ---------------------------------------------------------------- hardware builders
# Each builder puts the bearing face at z = 0; a bolt's shank runs towards -z.

def hex_prism(width: float, height: float) -> cq.Workplane:
    """Hex prism, across flats `width`, from z = 0 to z = height."""
    return cq.Workplane("XY").polygon(6, width / math.cos(math.radians(30))).extrude(height)


def hex_bolt(d: float, length: float, head_width: float, head_height: float) -> cq.Workplane:
    head = hex_prism(head_width, head_height)
    shank = cq.Workplane("XY").circle(d / 2).extrude(-length)
    return head.union(shank)


def socket_screw(d: float, length: float, head_d: float, head_height: float) -> cq.Workplane:
    head = cq.Workplane("XY").circle(head_d / 2).extrude(head_height)
    shank = cq.Workplane("XY").circle(d / 2).extrude(-length)
    return head.union(shank)


def hex_nut(d: float, width: float, height: float) -> cq.Workplane:
    return hex_prism(width, height).faces(">Z").workplane().hole(d)


def plain_washer(inner: float, outer: float, thickness: float) -> cq.Workplane:
    return cq.Workplane("XY").circle(outer / 2).circle(inner / 2).extrude(thickness)


def plate(lx: float, ly: float, t: float, holes, dia: float, z0: float = 0.0) -> cq.Workplane:
    """A plate from z0 to z0 + t with through holes of `dia` at the (x, y) points."""
    w = cq.Workplane("XY").box(lx, ly, t, centered=(True, True, False))
    w = w.faces(">Z").workplane().pushPoints(list(holes)).hole(dia)
    return w.translate((0, 0, z0))


def down(z: float, x: float = 0.0, y: float = 0.0) -> cq.Location:
    """Placement for a bolt whose head sits on a face at height z, shank pointing down (-z)."""
    return cq.Location(cq.Vector(x, y, z))


def up_from(z: float, x: float = 0.0, y: float = 0.0) -> cq.Location:
    """Placement for a nut / washer hanging below a face at height z (bearing face up)."""
    return cq.Location(cq.Vector(x, y, z), cq.Vector(1, 0, 0), 180)


# ---------------------------------------------------------------- writing
def write_step(assy: cq.Assembly, path: str, unit: str = "MM") -> None:
    """Write an assembly as AP214 STEP with names and colours, in `unit` ("MM" or "INCH")."""
    from cadquery.occ_impl.assembly import toCAF
    from OCP.Interface import Interface_Static
    from OCP.STEPCAFControl import STEPCAFControl_Writer
    from OCP.STEPControl import STEPControl_AsIs

    _, doc = toCAF(assy, coloredSTEP=True)
    writer = STEPCAFControl_Writer()
    writer.SetNameMode(True)
    writer.SetColorMode(True)
    Interface_Static.SetCVal_s("write.step.unit", unit)
    pcurves = Interface_Static.IVal_s("write.surfacecurve.mode")
    Interface_Static.SetIVal_s("write.surfacecurve.mode", 0)   # no 2-D curves: half the file size
    try:
        writer.Transfer(doc, STEPControl_AsIs)
        writer.Write(path)
    finally:
        Interface_Static.SetCVal_s("write.step.unit", "MM")
        Interface_Static.SetIVal_s("write.surfacecurve.mode", pcurves)


STEEL = cq.Color(0.45, 0.47, 0.5)
ALU = cq.Color(0.8, 0.82, 0.85)
ZINC = cq.Color(0.75, 0.75, 0.7)


# ---------------------------------------------------------------- scenarios
def conveyor_bracket() -> cq.Assembly:
    """Frame flange (steel, 12 mm) / adapter plate (aluminium, 10) / motor foot (steel, 8).

    Stack from the head: washer 2, foot 8, adapter 10, flange 12, washer 2, then the nut
    (8.4): grip 34 mm; M10x45 leaves 2.6 mm past the nut.  The motor foot is two pads;
    deliberate faults: the pad at +y stands 0.5 mm off the adapter plate (gap, grip
    34.5 mm), one adapter-plate hole is 1.2 mm off (clearance 11 - 10 = 1 mm in total:
    misaligned), and bolt 3 is M10x35 and ends inside its nut (short).
    At the tolerance limits (ISO 4759-1 45 +/-0.5, ISO 2768-1 m plates, ISO 7089 washers
    1.8..2.2, ISO 4032 nut 8.04..8.4) the 2.6 mm past the nut of the sound joints becomes
    1.1 mm in the worst case, under one pitch: they pass at nominal and fail at a limit
    (the job samples/conveyor_drive.toml shows it on J01, and judges J03 statistically).
    """
    pts = [(-40, -25), (40, -25), (40, 25), (-40, 25)]
    a = cq.Assembly(name="conveyor_bracket")
    a.add(plate(120, 80, 12, pts, 11.0, z0=0.0), name="frame_flange_steel", color=STEEL)
    adapter_pts = pts[:3] + [(pts[3][0] + 1.2, pts[3][1])]
    a.add(plate(120, 80, 10, adapter_pts, 11.0, z0=12.0), name="adapter_plate_alu", color=ALU)
    # the motor foot in two pads: pad A sits on the adapter, pad B is 0.5 mm proud (gap)
    a.add(plate(120, 30, 8, [(-40, 0), (40, 0)], 11.0, z0=22.0).translate((0, -25, 0)),
          name="motor_foot_steel", color=STEEL)
    a.add(plate(120, 30, 8, [(-40, 0), (40, 0)], 11.0, z0=22.5).translate((0, 25, 0)),
          name="motor_foot_pad_steel", color=STEEL)
    lengths = [45, 45, 35, 45]
    for i, ((x, y), L) in enumerate(zip(pts, lengths), 1):
        top = 30.0 if y < 0 else 30.5
        a.add(plain_washer(10.5, 20, 2), name=f"washer_M10_{i}", loc=down(top, x, y), color=ZINC)
        a.add(hex_bolt(10, L, 16, 6.4), name=f"bolt_M10x{L}_{i}", loc=down(top + 2, x, y), color=ZINC)
        a.add(plain_washer(10.5, 20, 2), name=f"washer_M10_{i}b", loc=up_from(0.0, x, y), color=ZINC)
        a.add(hex_nut(10, 16, 8.4), name=f"nut_M10_{i}", loc=up_from(-2.0, x, y), color=ZINC)
    return a


def gearbox_cover() -> cq.Assembly:
    """Cover 10 mm with counterbores for M8 socket head cap screws, into a cast iron housing.

    Counterbore 15 x 8.6 deep leaves a 1.4 mm... no: the cover is 18 thick, cbore 14 dia
    (ISO 4762 M8 head 13 mm) 8.5 deep -> seat at 9.5 mm from the bottom, clamped 9.5 mm.
    Tapped holes: 6.8 tap drill, 20 deep blind.  Screws M8x25: engagement 15.5 mm
    (1.25 d = 10 for cast iron), tip 4.5 mm above the hole bottom.
    Fault: screw 2 is M8x35: engagement 25.5 > hole depth 20 -> bottoms.
    """
    pts = [(-35, -35), (35, -35), (35, 35), (-35, 35)]
    a = cq.Assembly(name="gearbox_cover")
    housing = (cq.Workplane("XY").box(100, 100, 40, centered=(True, True, False)).translate((0, 0, -40))
               .faces(">Z").workplane().pushPoints(pts).hole(6.8, 20)
               .faces(">Z").workplane().hole(50, 30))
    a.add(housing, name="housing_cast_iron", color=cq.Color(0.3, 0.3, 0.32))
    cover = (cq.Workplane("XY").box(100, 100, 18, centered=(True, True, False))
             .faces(">Z").workplane().pushPoints(pts).cboreHole(9.0, 14.0, 8.5))
    a.add(cover, name="cover_aluminium", color=ALU)
    for i, (x, y) in enumerate(pts, 1):
        L = 35 if i == 2 else 25
        a.add(socket_screw(8, L, 13, 8), name=f"screw_M8x{L}_{i}", loc=down(9.5, x, y), color=STEEL)
    return a


def pump_skid_inch() -> cq.Assembly:
    """Pump foot (5/8 in) on a skid rail flange (1/2 in), 1/2-13 UNC x 2 in hex bolts, hex nuts.

    Clearance 17/32 in (13.49 mm, ASME B18.2.8 normal fit for 1/2 in).  Grip 1.125 in.
    Nut 7/16 in (ASME B18.2.2); 2 in bolt protrudes 0.4375 in = 5.7 pitches: fine.
    """
    pts = [(-3 * IN, 0), (3 * IN, 0)]
    a = cq.Assembly(name="pump_skid")
    hole = 17 / 32 * IN
    a.add(plate(8 * IN, 3 * IN, 0.5 * IN, pts, hole), name="skid_rail_steel", color=STEEL)
    a.add(plate(8 * IN, 3 * IN, 0.625 * IN, pts, hole, z0=0.5 * IN), name="pump_foot_cast_iron",
          color=cq.Color(0.2, 0.3, 0.6))
    top = 1.125 * IN
    for i, (x, y) in enumerate(pts, 1):
        a.add(hex_bolt(0.5 * IN, 2 * IN, 0.75 * IN, 0.3125 * IN), name=f"bolt_1/2-13x2_{i}",
              loc=down(top, x, y), color=ZINC)
        a.add(hex_nut(0.5 * IN, 0.75 * IN, 0.4375 * IN), name=f"nut_1/2-13_{i}", loc=up_from(0.0, x, y),
              color=ZINC)
    return a


def main(out: str = HERE) -> None:
    write_step(conveyor_bracket(), os.path.join(out, "conveyor_bracket.step"))
    write_step(gearbox_cover(), os.path.join(out, "gearbox_cover.step"))
    write_step(pump_skid_inch(), os.path.join(out, "pump_skid_inch.step"), unit="INCH")


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else HERE)
