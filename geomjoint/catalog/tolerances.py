"""Tolerances of the parts of a stack: general tolerances, plate thickness, hardware limits.

ISO 2768-1 general tolerances of linear dimensions (classes f, m, c, v), EN 10029 hot-rolled
plate thickness (classes A, B), ISO 4759-1 bolt and screw length (product grades A: js15,
B: js17; which grade a product has by ISO 4014 / ISO 4017 / ISO 4762 ...), ASME B18.2.1 hex
cap screw length (inch), ISO 4032 / ASME B18.2.2 nut height limits and ISO 7089 / ASME
B18.21.1 washer thickness limits.  Every figure is a row of a CSV under ``data/`` with its
source; each function returns a :class:`~geomjoint.catalog.types.Deviation` (lower and upper
deviation from the nominal, mm) or limits, so the stack-up never restates a number.
"""
from __future__ import annotations

from typing import Mapping

from geomjoint.catalog.tables import load_table, number, to_mm
from geomjoint.catalog.threads import size_label
from geomjoint.catalog.types import Deviation, Thread
from geomjoint.errors import InputError

#: the ISO 2768-1 classes, finest first (a remedy steps along it)
GENERAL_CLASSES = ("f", "m", "c", "v")
#: the plate standards and classes of plate_thickness.csv
PLATE_CLASSES = (("EN 10029", "A"), ("EN 10029", "B"))

_TOL = 1e-9


def _in_range(row: Mapping[str, str], size: float, unit: str, first: bool) -> bool:
    """``size`` (mm) lies in the row's "over .. up to" range; the first range includes its lower end."""
    lo, hi = to_mm(number(row, "over"), unit), to_mm(number(row, "up_to"), unit)
    return (lo - _TOL <= size if first else lo + _TOL < size) and size <= hi + _TOL


def general_tolerance(tolerance_class: str, size: float) -> Deviation:
    """Permissible deviation of a linear size (mm) by ISO 2768-1 Table 1, class f | m | c | v.

    A size below the table's first range (0.5 mm) takes the first range (our choice: the
    standard asks for the deviation beside such a size; a thin shim rarely decides a stack).

    >>> general_tolerance("m", 20.0)
    Deviation(lower=-0.2, upper=0.2, source='ISO 2768-1:1989 Table 1, linear dimensions, tolerance class m (medium): +/-0.2 mm over 6 up to 30 mm (from memory)')
    """
    cls = tolerance_class.strip().lower()
    if cls not in GENERAL_CLASSES:
        raise InputError(f"unknown ISO 2768-1 tolerance class {tolerance_class!r} (f, m, c or v)")
    rows = [r for r in load_table("general_tolerances") if r["class"] == cls]
    first = min(rows, key=lambda r: float(r["over"]))
    size = max(size, to_mm(number(first, "over"), first["unit"]))
    for r in rows:
        if _in_range(r, size, r["unit"], r is first):
            dev = to_mm(number(r, "deviation"), r["unit"])
            return Deviation(-dev, dev, r["source"])
    top = max(float(r["up_to"]) for r in rows)
    raise InputError(f"{size:g} mm is outside ISO 2768-1 class {cls} (up to {top:g} mm)")


def plate_tolerance(standard: str, plate_class: str, thickness: float) -> Deviation:
    """Thickness deviation of a hot-rolled steel plate (EN 10029 class A or B), mm.

    >>> d = plate_tolerance("EN 10029", "B", 10.0)
    >>> d.lower, d.upper
    (-0.3, 1.4)
    """
    rows = [r for r in load_table("plate_thickness") if r["standard"] == standard and r["class"] == plate_class]
    if not rows:
        have = ", ".join(f"{s} class {c}" for s, c in PLATE_CLASSES)
        raise InputError(f"no plate thickness table for {standard} class {plate_class} (the catalogue has {have})")
    top = max(to_mm(number(r, "up_to"), r["unit"]) for r in rows)
    for r in rows:
        # EN 10029 ranges run "from .. below ..": the lower end belongs to the range (the last also its upper)
        lo, hi = to_mm(number(r, "over"), r["unit"]), to_mm(number(r, "up_to"), r["unit"])
        if lo - _TOL <= thickness < hi - _TOL or (hi == top and abs(thickness - hi) <= _TOL):
            return Deviation(to_mm(number(r, "lower"), r["unit"]), to_mm(number(r, "upper"), r["unit"]), r["source"])
    lo = min(float(r["over"]) for r in rows)
    hi = max(float(r["up_to"]) for r in rows)
    raise InputError(f"a {thickness:g} mm plate is outside {standard} class {plate_class} ({lo:g} to {hi:g} mm)")


def product_grade(t: Thread, length: float, kind: str = "hex") -> str:
    """ISO product grade ("A" or "B") of a metric bolt or screw by its head kind, size and length.

    Hex bolts (ISO 4014 / ISO 4017): A for d <= 24 mm and l <= 10 d or 150 mm, whichever is
    shorter; B above.  Socket, button, pan, cheese, countersunk and flange heads: A.

    >>> from geomjoint.catalog.threads import thread
    >>> product_grade(thread("M12"), 100.0), product_grade(thread("M12"), 130.0), product_grade(thread("M30"), 60.0)
    ('A', 'B', 'B')
    """
    rows = {r["kind"]: r for r in load_table("product_grades")}
    row = rows.get(kind, rows["hex"])
    d_max = number(row, "a_d_max")
    if d_max is None:
        return "A"
    limit = min(number(row, "a_l_per_d") * t.d, number(row, "a_l_max"))
    return "A" if t.d <= d_max + _TOL and length <= limit + _TOL else "B"


def bolt_length_tolerance(t: Thread, length: float, kind: str = "hex") -> Deviation | None:
    """Deviation of a bolt or screw length, mm: ISO 4759-1 (js15 grade A, js17 grade B) for
    metric sizes, ASME B18.2.1 (minus only) for inch hex cap screws from 1/4 in; None where
    the catalogue has no row (numbered inch sizes): the caller takes the length at nominal.

    >>> from geomjoint.catalog.threads import thread
    >>> d = bolt_length_tolerance(thread("M12"), 50.0)       # grade A, js15: IT15 = 1.0 mm
    >>> d.lower, d.upper
    (-0.5, 0.5)
    """
    rows = load_table("length_tolerances")
    if t.system == "metric":
        grade = product_grade(t, length, kind)
        chosen = [r for r in rows if r["standard"] == "ISO 4759-1" and r["grade"] == grade]
    else:
        chosen = [r for r in rows if r["standard"] == "ASME B18.2.1"
                  and to_mm(number(r, "d_from"), r["unit"]) - 1e-6 <= t.d <= to_mm(number(r, "d_to"), r["unit"]) + 1e-6]
    chosen.sort(key=lambda r: float(r["over"]))
    for i, r in enumerate(chosen):
        if _in_range(r, length, r["unit"], i == 0):
            return Deviation(to_mm(number(r, "lower"), r["unit"]), to_mm(number(r, "upper"), r["unit"]), r["source"])
    return None


def nut_height_limits(t: Thread) -> tuple[float, float, str] | None:
    """(m_min, m_max, source) of the hex nut for thread ``t``, mm; None where the catalogue has none.

    >>> from geomjoint.catalog.threads import thread
    >>> nut_height_limits(thread("M12"))[:2]
    (10.37, 10.8)
    """
    for r in load_table("nut_heights"):
        if r["size"] == size_label(t):
            return to_mm(number(r, "m_min"), r["unit"]), to_mm(number(r, "m_max"), r["unit"]), r["source"]
    return None


def washer_thickness_limits(t: Thread, style: str = "standard") -> tuple[float, float, float, str] | None:
    """(h nominal, h_min, h_max, source) of the plain washer for thread ``t``, mm; None where the
    catalogue has none.  ``style``: "standard" (ISO 7089), "narrow" / "wide" (ASME B18.21.1 type A).

    >>> from geomjoint.catalog.threads import thread
    >>> washer_thickness_limits(thread("M12"))[:3]
    (2.5, 2.3, 2.7)
    """
    style = "standard" if t.system == "metric" else ("narrow" if style == "standard" else style)
    for r in load_table("washer_thickness"):
        if r["size"] == size_label(t) and r["style"] == style:
            u = r["unit"]
            return to_mm(number(r, "h"), u), to_mm(number(r, "h_min"), u), to_mm(number(r, "h_max"), u), r["source"]
    return None
