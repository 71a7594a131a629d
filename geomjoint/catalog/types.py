"""Plain records of standard data, as the catalog hands them to the rest of the program.

All lengths mm, stresses MPa.  Each record carries the `source` of its numbers.
"""
from __future__ import annotations

from dataclasses import dataclass

from geomjoint.units import MM_PER_INCH


@dataclass(frozen=True)
class Thread:
    """A screw thread size: ISO metric (ISO 261/262/724) or Unified inch (ASME B1.1)."""

    designation: str      # canonical: "M12", "M12x1.25", "1/2-13 UNC", "#10-24 UNC"
    system: str           # "metric" | "inch"
    series: str           # "coarse" | "fine" | "UNC" | "UNF"
    d: float              # nominal (major) diameter, mm
    pitch: float          # mm (inch: MM_PER_INCH / threads per inch)
    d2: float             # basic pitch diameter, mm
    d3: float             # minor diameter of the external thread, mm (inch: basic minor of 2A)
    D1: float             # basic minor diameter of the internal thread, mm
    stress_area: float    # tensile stress area A_s, mm^2
    source: str

    @property
    def threads_per_inch(self) -> float:
        return MM_PER_INCH / self.pitch


@dataclass(frozen=True)
class Grade:
    """Strength of a bolt property class / grade for one size range."""

    name: str             # "8.8", "10.9", "SAE 5", "A4-80"
    system: str           # "iso898" | "sae" | "iso3506"
    proof: float          # proof strength S_p, MPa
    yield_strength: float  # R_eL / R_p0.2 / S_y (minimum), MPa
    tensile: float        # R_m / S_ut (minimum), MPa
    d_min: float          # size range in mm (inclusive)
    d_max: float
    source: str


@dataclass(frozen=True)
class Material:
    """A member (clamped part) material."""

    name: str
    E: float                        # Young's modulus, MPa
    poisson: float
    yield_strength: float | None    # MPa
    tensile_strength: float | None  # MPa
    limiting_pressure: float | None  # p_G, limiting surface pressure under head/nut, MPa
    thermal_expansion: float | None  # 1/K
    wileman_A: float | None = None  # Wileman, Choudhury & Green (1991) constants
    wileman_B: float | None = None
    source: str = ""
    family: str = "metal"           # "metal" | "polymer" (a preloaded polymer part creeps)


@dataclass(frozen=True)
class HeadDims:
    """Head of a bolt or screw."""

    kind: str             # "hex" | "heavy hex" | "socket" | "button" | "pan" | "cheese" | "countersunk" | "flange"
    width: float          # hex, flange: across flats s; the round heads: head diameter d_k, mm
    height: float         # k, mm
    bearing_diameter: float  # d_w (min), mm; flange: d_c; countersunk: d_k of the cone
    source: str
    angle: float | None = None   # countersunk: included angle of the head cone, degrees


@dataclass(frozen=True)
class SetScrewDims:
    """A headless hexagon-socket set screw."""

    point: str            # "flat" | "cup"
    key: float            # hexagon socket size s, mm
    length_min: float     # commercial length range, mm
    length_max: float
    source: str


@dataclass(frozen=True)
class NutDims:
    width: float          # across flats s, mm
    height: float         # m, mm
    bearing_diameter: float  # d_w, mm
    source: str


@dataclass(frozen=True)
class WasherDims:
    inner: float          # d1, mm
    outer: float          # d2, mm
    thickness: float      # h, mm
    source: str


@dataclass(frozen=True)
class Deviation:
    """Lower and upper deviation of a size from its nominal, mm (lower <= upper), with its source."""

    lower: float
    upper: float
    source: str
