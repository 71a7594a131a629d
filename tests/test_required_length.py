"""One rule for the bolt length a joint needs: the scan, the check and the remedies agree.

The rule is `mechanics.bolt.required_length`: through bolts grip + gaps + nut + pitches past
the nut; tapped holes clamped thickness + the minimum engagement by the tapped part's material
(catalog thread_engagement.csv, common practice), no deeper than the tapped depth.
"""
import sys
from pathlib import Path

import cadquery as cq
import pytest

from geomjoint import catalog
from geomjoint.analysis import analyze_job
from geomjoint.geometry.scan import scan_model
from geomjoint.job import parse_job
from geomjoint.mechanics.stackup import stackup
from geomjoint.resolve import typed_joint_specs, with_length
from geomjoint.mechanics import checks
from geomjoint.mechanics.bolt import minimum_engagement, required_length
from geomjoint.remedies import _size_candidates

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "samples"))
import make_samples as ms  # noqa: E402

# a 10 mm steel bracket screwed into a 30 mm aluminium block tapped through (no screw modelled):
# M10 (ISO 2306 tap drill 8.5 mm, from memory), L_e,min = 2.0 d = 20 mm in aluminium (common
# practice) -> needs 10 + 20 = 30 mm -> ISO 4017 preferred length 30 mm (from memory).  The old
# min(t, d) rule of the check gave 10 + 10 = 20 mm: half the engagement aluminium wants.
EXPECTED_LENGTH = 30.0
#: the shortest standard length that also engages 20 mm at the tolerance limits (see below)
AT_LIMITS_LENGTH = 35.0

TYPED = """
[defaults]
fastener = "{size}"
grade = "8.8"

[[joint]]
id = "T1"
tapped = true
layers = [ {{ material = "steel", thickness = "10 mm" }},
           {{ material = "aluminium", thickness = "30 mm" }} ]
load = {{ min = "0 kN", max = "5 kN" }}
"""

MODEL_JOB = """
[defaults]
grade = "8.8"

[materials]
"bracket" = "steel"
"base_block*" = "aluminium"

[[load]]
joints = "*"
axial = { min = "0 kN", max = "5 kN" }
"""


def bracket_on_block() -> cq.Assembly:
    a = cq.Assembly(name="bracket_on_block")
    a.add(ms.plate(40, 40, 10, [(0, 0)], 11.0, z0=30.0), name="bracket")
    a.add(ms.plate(40, 40, 30, [(0, 0)], 8.5, z0=0.0), name="base_block_aluminium")
    return a


def test_the_rule_itself():
    # tapped: clamped + engagement by material, capped at the tapped depth
    assert minimum_engagement(10.0, "cast aluminium") == pytest.approx(20.0)   # 2.0 d (common practice)
    assert minimum_engagement(8.0, "EN-GJL-250") == pytest.approx(10.0)        # 1.25 d grey cast iron
    assert required_length(10.0, d=10.0, pitch=1.5, tapped=True, tapped_depth=30.0,
                           tapped_material="aluminium") == pytest.approx(30.0)
    assert required_length(10.0, d=10.0, pitch=1.5, tapped=True, tapped_depth=12.0,
                           tapped_material="aluminium") == pytest.approx(22.0)
    # through: grip + gaps + ISO 4032 M10 nut m = 8.4 mm (from memory) + 2 pitches of 1.5 mm
    assert required_length(34.0, d=10.0, pitch=1.5, tapped=False, gaps=0.5, nut_height=8.4) == pytest.approx(45.9)


def test_scan_check_and_remedies_agree_on_a_tapped_joint():
    model = bracket_on_block()
    scan = scan_model(model)
    (j,) = scan.joints
    assert j.kind == "tapped" and j.nominal == "M10" and j.bolt is None
    # the scan's stack-up: the shortest standard length that the rule asks for
    assert j.shortest_length == pytest.approx(EXPECTED_LENGTH)

    # the check of the model joint sizes the unmodelled screw by the same rule, and then at the
    # tolerance limits: M10x30 (ISO 4759-1 grade A, js15 18-30: +/-0.42) under a 10 +/-0.2 bracket
    # (ISO 2768-1 m) engages 29.58 - 10.2 = 19.38 mm at the worst corner, under the 20 mm the rule
    # asks; the next standard length, 35, passes there (34.5 - 10.2 = 24.3)
    (model_result,) = analyze_job(parse_job(MODEL_JOB), scan=scan).results
    assert model_result.spec.fastener.designation == "M10"
    assert model_result.spec.fastener.length == pytest.approx(AT_LIMITS_LENGTH)
    assert model_result.stackup.engagement.worst_min == pytest.approx(24.3)

    # the check of the same joint typed in
    (typed,) = typed_joint_specs(parse_job(TYPED.format(size="M10")))
    assert typed.fastener.length == pytest.approx(AT_LIMITS_LENGTH)
    side = checks.bolt_side(typed, checks.effective_grip_of(typed))
    assert checks.length_check(typed, side).ok                # sized by the rule, the length check passes
    at_nominal = with_length(typed, EXPECTED_LENGTH)           # the nominal rule's length fails at the limits
    assert stackup(at_nominal).engagement.worst_min == pytest.approx(19.38)

    # the remedies: the next size up from M8 in the same stack gets the same length
    (small,) = typed_joint_specs(parse_job(TYPED.format(size="M8")))
    assert small.fastener.length >= catalog.shortest_length(catalog.thread("M8"), 10.0 + 16.0)  # 2.0 x 8 engaged
    first = next(_size_candidates(small, None))
    assert first.spec.fastener.designation == "M10"
    assert first.spec.fastener.length == pytest.approx(AT_LIMITS_LENGTH)
