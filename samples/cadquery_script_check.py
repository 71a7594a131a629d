"""Check the joints of a cadquery model while the script builds it (no STEP file written).

An invented pump-skid foot: a steel foot plate bolted to a steel base rail with two M12
hex bolts, washers and nuts. Run:  python samples/cadquery_script_check.py
"""
import cadquery as cq

import geomjoint.cadquery_plugin  # noqa: F401  (adds find_bolted_joints / check_bolted_joints)
from geomjoint import catalog

M12 = catalog.thread("M12")
HEAD, NUT, WASHER = catalog.head(M12, "hex"), catalog.nut(M12), catalog.washer(M12)
HOLE = catalog.clearance_hole(M12, "medium")
FOOT_T, RAIL_T, BOLT_L = 15.0, 20.0, 60.0
PITCH = 80.0  # bolt spacing, mm


def hex_prism(across_flats: float, height: float) -> cq.Workplane:
    return cq.Workplane("XY").polygon(6, across_flats / 0.8660254037844386).extrude(height)


def build() -> cq.Assembly:
    xs = [(-PITCH / 2, 0.0), (PITCH / 2, 0.0)]
    rail = cq.Workplane("XY").box(160, 60, RAIL_T, centered=(True, True, False)).faces(">Z").workplane() \
        .pushPoints(xs).hole(HOLE)
    foot = cq.Workplane("XY").workplane(offset=RAIL_T).box(140, 50, FOOT_T, centered=(True, True, False)) \
        .faces(">Z").workplane().pushPoints(xs).hole(HOLE)
    asm = cq.Assembly(name="pump_skid_foot")
    asm.add(rail, name="base_rail_steel")
    asm.add(foot, name="foot_plate_steel")
    top = RAIL_T + FOOT_T
    for i, (x, y) in enumerate(xs, start=1):
        washer = cq.Workplane("XY").circle(WASHER.outer / 2).circle(WASHER.inner / 2).extrude(WASHER.thickness)
        asm.add(washer, name=f"washer_M12_{i}", loc=cq.Location((x, y, top)))
        asm.add(washer, name=f"washer_M12_{i}b", loc=cq.Location((x, y, -WASHER.thickness)))
        head_z = top + WASHER.thickness
        bolt = hex_prism(HEAD.width, HEAD.height).translate((0, 0, 0)).union(
            cq.Workplane("XY").circle(M12.d / 2).extrude(-BOLT_L))
        asm.add(bolt, name=f"bolt_M12x60_{i}", loc=cq.Location((x, y, head_z)))
        nut = hex_prism(NUT.width, NUT.height).faces(">Z").workplane().hole(M12.d)
        asm.add(nut, name=f"nut_M12_{i}", loc=cq.Location((x, y, -WASHER.thickness - NUT.height)))
    return asm


JOB = """
[defaults]
grade = "8.8"
preload = "75%"

[materials]
"*_steel" = "steel"

[[load]]
joints = "*"
axial = { min = "1 kN", max = "9 kN" }
"""

if __name__ == "__main__":
    assembly = build()
    scan = assembly.find_bolted_joints()
    print(f"{len(scan.joints)} joints found")
    for result in assembly.check_bolted_joints(JOB):
        print(f"{result.id}: {result.spec.fastener.designation} grip {result.grip:.1f} mm, "
              f"C = {result.joint_constant:.3f}, {result.verdict} ({result.governing})")
