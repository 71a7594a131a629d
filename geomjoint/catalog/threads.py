"""Screw threads: ISO metric (ISO 261/262/724, stress area ISO 898-1) and Unified inch (ASME B1.1).

The data files hold only the nominal diameter and pitch (threads per inch) of each size;
every other dimension is computed here from the basic profile, so the numbers can be
checked against the published tables.
"""
from __future__ import annotations

import functools
import math
import re

from geomjoint.catalog.tables import MM_PER_INCH, load_table
from geomjoint.catalog.types import Thread
from geomjoint.errors import InputError, did_you_mean

# --- ISO 724:1993 basic dimensions (H = 0.866025 P, the fundamental triangle height) ---
#: d2 = d - 0.649519 P  (d - 3/4 H), ISO 724
ISO_PITCH_DIAMETER_COEFF = 0.649519
#: d3 = d - 1.226869 P  (d - 17/12 H), minor diameter of the external thread, ISO 724
ISO_EXTERNAL_MINOR_COEFF = 1.226869
#: D1 = d - 1.082532 P  (d - 5/4 H), basic minor diameter of the internal thread, ISO 724
ISO_INTERNAL_MINOR_COEFF = 1.082532

# --- ASME B1.1 Unified threads (same basic profile, pitch p = 1/n inch) ---
#: A_t = 0.7854 (D - 0.9743/n)^2, ASME B1.1-2019 eq. for tensile stress area (inch units)
UNIFIED_STRESS_AREA_COEFF = 0.9743
#: 0.7854 = pi/4 rounded as printed in ASME B1.1
UNIFIED_QUARTER_PI = 0.7854
#: size number -> basic major diameter: D = 0.060 + 0.013 N inch, ASME B1.1 (numbered sizes)
UNIFIED_NUMBER_BASE_IN = 0.060
UNIFIED_NUMBER_STEP_IN = 0.013

#: tap drill = D - 0.01299 * percent / n (inch); 0.01299 = 1.299/100, twice the 0.6495 p thread depth (common practice)
INCH_TAP_DRILL_PER_PERCENT = 0.01299
#: thread depth percentage aimed at by the usual inch tap drills (common practice)
INCH_TAP_DRILL_PERCENT = 75.0


def iso_pitch_diameter(d: float, pitch: float) -> float:
    """Basic pitch diameter of an ISO metric thread.

    d2 = d - 0.649519 P

    Parameters: d nominal diameter [mm], pitch P [mm].  Source: ISO 724:1993.

    >>> round(iso_pitch_diameter(10.0, 1.5), 3)
    9.026
    """
    return d - ISO_PITCH_DIAMETER_COEFF * pitch


def iso_external_minor_diameter(d: float, pitch: float) -> float:
    """Minor diameter of the basic external ISO metric thread.

    d3 = d - 1.226869 P

    Parameters: d [mm], pitch P [mm].  Source: ISO 724:1993.

    >>> round(iso_external_minor_diameter(10.0, 1.5), 3)
    8.16
    """
    return d - ISO_EXTERNAL_MINOR_COEFF * pitch


def iso_internal_minor_diameter(d: float, pitch: float) -> float:
    """Basic minor diameter of the internal ISO metric thread (nut).

    D1 = d - 1.082532 P

    Parameters: d [mm], pitch P [mm].  Source: ISO 724:1993.

    >>> round(iso_internal_minor_diameter(10.0, 1.5), 3)
    8.376
    """
    return d - ISO_INTERNAL_MINOR_COEFF * pitch


def iso_stress_area(d: float, pitch: float) -> float:
    """Nominal tensile stress area of an ISO metric thread.

    A_s = pi/4 * ((d2 + d3)/2)^2

    Parameters: d [mm], pitch P [mm].  Returns mm^2.  Source: ISO 898-1:2013, 9.1.6.1.

    >>> round(iso_stress_area(12.0, 1.75), 1)
    84.3
    """
    d2 = iso_pitch_diameter(d, pitch)
    d3 = iso_external_minor_diameter(d, pitch)
    return math.pi / 4.0 * ((d2 + d3) / 2.0) ** 2


def unified_stress_area(D: float, tpi: float) -> float:
    """Tensile stress area of a Unified inch thread, in square inches.

    A_t = 0.7854 (D - 0.9743/n)^2

    Parameters: D basic major diameter [in], tpi n [threads/in].  Returns in^2.
    Source: ASME B1.1-2019 (tensile stress area formula).

    >>> round(unified_stress_area(0.5, 13), 4)
    0.1419
    """
    return UNIFIED_QUARTER_PI * (D - UNIFIED_STRESS_AREA_COEFF / tpi) ** 2


def unified_number_diameter(number: int) -> float:
    """Basic major diameter of a numbered Unified size, in inches.

    D = 0.060 + 0.013 N

    Source: ASME B1.1 (numbered sizes).

    >>> round(unified_number_diameter(10), 3)
    0.19
    """
    return UNIFIED_NUMBER_BASE_IN + UNIFIED_NUMBER_STEP_IN * number


def _fmt(x: float) -> str:
    """1.25 -> '1.25', 2.0 -> '2' (the way pitches and sizes are written)."""
    return f"{x:g}"


def _metric_thread(d: float, pitch: float, series: str, source: str) -> Thread:
    name = f"M{_fmt(d)}" if series == "coarse" else f"M{_fmt(d)}x{_fmt(pitch)}"
    return Thread(
        designation=name, system="metric", series=series, d=d, pitch=pitch,
        d2=iso_pitch_diameter(d, pitch),
        d3=iso_external_minor_diameter(d, pitch),
        D1=iso_internal_minor_diameter(d, pitch),
        stress_area=iso_stress_area(d, pitch),
        source=f"{source}; d2, d3, D1 per ISO 724:1993; A_s per ISO 898-1:2013",
    )


def _inch_thread(size: str, D_in: float, tpi: float, series: str, source: str) -> Thread:
    # d3 uses the ISO 724 basic-profile form D - 1.226869/n; the UNR 2A minor diameter of
    # ASME B1.1 is a toleranced value, this is the basic-profile estimate of it.
    D = D_in * MM_PER_INCH
    p = MM_PER_INCH / tpi
    return Thread(
        designation=f"{size}-{_fmt(tpi)} {series}", system="inch", series=series, d=D, pitch=p,
        d2=iso_pitch_diameter(D, p),
        d3=iso_external_minor_diameter(D, p),
        D1=iso_internal_minor_diameter(D, p),
        stress_area=unified_stress_area(D_in, tpi) * MM_PER_INCH**2,
        source=f"{source}; d2, D1 basic, d3 basic-profile form D - 1.226869/n; A_t per ASME B1.1",
    )


@functools.lru_cache(maxsize=1)
def _all_threads() -> tuple[Thread, ...]:
    out = [
        _metric_thread(float(r["d"]), float(r["pitch"]), r["series"], r["source"])
        for r in load_table("threads_metric")
    ]
    out += [
        _inch_thread(r["size"], float(r["D_in"]), float(r["tpi"]), r["series"], r["source"])
        for r in load_table("threads_inch")
    ]
    return tuple(out)


def size_label(t: Thread) -> str:
    """The size part of a designation, used to key hardware tables: "M12", "1/2", "#10", "1 1/8"."""
    if t.system == "metric":
        return f"M{_fmt(t.d)}"
    return t.designation.split("-")[0]


def _normalize_system(system: str | None) -> str | None:
    if system is None:
        return None
    s = system.strip().lower()
    if s in ("metric", "iso", "m"):
        return "metric"
    if s in ("inch", "unified", "un", "imperial", "in"):
        return "inch"
    raise InputError(f"unknown thread system {system!r} (use 'metric' or 'inch')")


def thread_sizes(system: str | None = None) -> list[Thread]:
    """Every known thread size (metric coarse + fine, then UNC + UNF), optionally of one system.

    >>> thread_sizes("metric")[0].designation
    'M1.6'
    """
    sys_ = _normalize_system(system)
    return [t for t in _all_threads() if sys_ is None or t.system == sys_]


_METRIC_RE = re.compile(
    r"^M\s*(?P<d>\d+(?:\.\d+)?)\s*(?:[X×*]\s*(?P<p>\d*\.?\d+))?\s*(?:-?\s*\d[A-H](?:\s*\d[A-H])?)?$"
)
_INCH_RE = re.compile(
    r"^(?P<size>#\s*\d+|NO\.?\s*\d+|\d+(?:\s+|\s*-\s*)\d+/\d+|\d+/\d+|\d*\.\d+|\d+)"
    r"\s*(?:-\s*(?P<tpi>\d+(?:\.\d+)?))?"
    r"\s*(?:(?P<series>UNC|UNF)(?:\s*-?\s*[123][AB])?)?$"
)


def _nearest_by_size(d: float, pitch: float | None, system: str, text: str) -> str:
    """' (did you mean ...?)' with the sizes closest in diameter (and pitch)."""
    cands = [t for t in _all_threads() if t.system == system]
    cands.sort(key=lambda t: (abs(t.d - d), abs(t.pitch - pitch) if pitch else t.series not in ("coarse", "UNC")))
    near = [t.designation for t in cands[:3]]
    return " (did you mean " + ", ".join(repr(n) for n in near) + "?)" if near else ""


def _parse_inch_size(text: str) -> float:
    """Inch size token -> basic major diameter [in]."""
    t = text.replace(" ", "")
    if t.startswith("#") or t.startswith("NO"):
        return unified_number_diameter(int(re.sub(r"\D", "", t)))
    if "/" in t:
        m = re.fullmatch(r"(?:(\d+)[-\s]+)?(\d+)/(\d+)", text.strip())
        whole = float(m.group(1)) if m.group(1) else 0.0
        return whole + float(m.group(2)) / float(m.group(3))
    return float(t)


def thread(designation: str) -> Thread:
    """The thread of a designation such as "M12", "M12x1.25", "1/2-13 UNC", "#10-24", "1/2 UNC".

    Case and spaces do not matter; a tolerance class ("-6g", "-2A") is accepted and ignored.
    "M12" means the coarse pitch; an inch size without TPI or series means UNC.
    Unknown -> InputError naming it, with the nearest valid designations.

    >>> thread("m12 x 1.25").designation
    'M12x1.25'
    >>> thread("1/2-13").series
    'UNC'
    """
    if not isinstance(designation, str) or not designation.strip():
        raise InputError(f"empty thread designation {designation!r}")
    # a decimal comma ("M12x1,25") is common in European drawings
    text = " ".join(designation.strip().upper().replace(",", ".").split())
    threads = _all_threads()
    m = _METRIC_RE.match(text)
    if m:
        d = float(m.group("d"))
        p = float(m.group("p")) if m.group("p") else None
        for t in threads:
            if t.system != "metric" or abs(t.d - d) > 1e-9:
                continue
            if (p is None and t.series == "coarse") or (p is not None and abs(t.pitch - p) < 1e-9):
                return t
        raise InputError(f"unknown thread {designation!r}" + _nearest_by_size(d, p, "metric", text))
    m = _INCH_RE.match(text)
    if m:
        D_in = _parse_inch_size(m.group("size"))
        D = D_in * MM_PER_INCH
        tpi = float(m.group("tpi")) if m.group("tpi") else None
        series = m.group("series")
        same = [t for t in threads if t.system == "inch" and abs(t.d - D) < 1e-3]
        # no series named: UNC, or the only series the size has (#0 is UNF only, ASME B1.1)
        only = len({t.series for t in same}) == 1
        for t in same:
            if tpi is not None and abs(t.threads_per_inch - tpi) > 1e-6:
                continue
            if series is not None and t.series != series:
                continue
            if tpi is None and series is None and t.series != "UNC" and not only:
                continue
            return t
        pitch = MM_PER_INCH / tpi if tpi else None
        raise InputError(f"unknown thread {designation!r}" + _nearest_by_size(D, pitch, "inch", text))
    raise InputError(
        f"cannot read thread designation {designation!r}"
        + did_you_mean(designation, [t.designation for t in threads])
    )


def tap_drill(t: Thread) -> float:
    """Common tap-drill diameter for a thread, mm.

    Metric: D_drill = d - P (the ISO 2306 drills follow this rule to within the 0.05 mm
    of the drill series, e.g. M8 6.8, M12 10.2; common practice);
    inch: the handbook's tap drill for about 75 % thread (``data/tap_drills_inch.csv``, e.g.
    #10-32 the #21 drill, 0.159 in), and for a size without a row the rule it follows,
    D - 0.01299 * 75 / n in (common practice).  Both lie a little above the basic minor
    diameter D1.

    >>> tap_drill(thread("M10"))
    8.5
    >>> round(tap_drill(thread("#10-32")), 4)      # the #21 drill, 0.1590 in
    4.0386
    """
    if t.system == "metric":
        return t.d - t.pitch
    row = _inch_tap_drills().get((size_label(t), t.series))
    if row is not None:
        return row
    return t.d - INCH_TAP_DRILL_PER_PERCENT * INCH_TAP_DRILL_PERCENT * t.pitch


@functools.lru_cache(maxsize=1)
def _inch_tap_drills() -> dict[tuple[str, str], float]:
    """(size label, series) -> the handbook tap drill, mm."""
    return {(r["size"], r["series"]): float(r["diameter"]) * (MM_PER_INCH if r["unit"] == "in" else 1.0)
            for r in load_table("tap_drills_inch")}
