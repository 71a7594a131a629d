"""Standard data for bolted joints: threads, bolt grades, hardware dimensions, materials.

The numbers live in CSV files under `geomjoint/catalog/data/`, each row with its `source`.
All lengths are mm and all stresses MPa; records are the frozen dataclasses of
`geomjoint.catalog.types`.

>>> t = thread("M12")
>>> round(t.stress_area, 1), grade("8.8", t.d).proof
(84.3, 580.0)
"""
from __future__ import annotations

from geomjoint.catalog.designation import Designation, parse_designation, product_standard
from geomjoint.catalog.grades import grade, grade_names
from geomjoint.catalog.hardware import (
    HEAD_KINDS,
    clearance_hole,
    hardware_gaps,
    head,
    head_kind,
    nominal_from_hole,
    nut,
    set_screw,
    shortest_length,
    standard_lengths,
    thread_length,
    washer,
)
from geomjoint.catalog.materials import WILEMAN_GENERAL, creeps_under_preload, material, material_names
from geomjoint.catalog.tables import MM_PER_INCH, MPA_PER_KPSI
from geomjoint.catalog.threads import size_label, tap_drill, thread, thread_sizes
from geomjoint.catalog.tolerances import (
    GENERAL_CLASSES,
    PLATE_CLASSES,
    bolt_length_tolerance,
    general_tolerance,
    nut_height_limits,
    plate_tolerance,
    product_grade,
    washer_thickness_limits,
)
from geomjoint.catalog.types import Deviation, Grade, HeadDims, Material, NutDims, SetScrewDims, Thread, WasherDims

__all__ = [
    "Deviation", "Designation", "GENERAL_CLASSES", "PLATE_CLASSES", "Grade", "HeadDims", "Material", "NutDims", "Thread", "WasherDims",
    "MM_PER_INCH", "MPA_PER_KPSI", "WILEMAN_GENERAL",
    "bolt_length_tolerance", "clearance_hole", "general_tolerance", "nut_height_limits", "plate_tolerance",
    "product_grade", "washer_thickness_limits", "grade", "grade_names", "head", "material", "material_names",
    "nominal_from_hole", "nut", "parse_designation", "product_standard", "shortest_length", "size_label", "standard_lengths",
    "tap_drill", "thread", "thread_length", "thread_sizes", "washer",
]
