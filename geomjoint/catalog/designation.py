"""Fastener designations in product names: standard, kind, thread size and length.

CAD fastener libraries and catalogue part numbers name their parts by the product
standard and the size ("ISO 4017 M12x40", "DIN 912 M8x25", "01_01_09-cylinder_screw_M5x25-DIN912"),
by the trade's abbreviations ("M3x10 BHCS", "#10-32 x 1/2 BHCS", "1/4-20 x 3/4 SHCS") or by
words ("hex nut M6", "washer"). :func:`parse_designation` reads one name into a
:class:`Designation`; the product standards and their kinds are the rows of
``data/product_standards.csv``, the words and abbreviations those of ``data/fastener_words.csv``.

A standard decides the family (bolt, nut, washer, set screw, stud) and the kind (head kind,
nut kind, set-screw point); words are read where no standard is named.  Sizes:

- metric ``M d [x P] [x L]``: the second number is a pitch when the catalogue has that pitch
  for d ("M10x1.25", "M6x1"), else a length ("M3x3");
- inch ``size-TPI [x L]`` ("#10-32 x 1/2", "1/4-20 x 1 1/4", "0.25-20x0.75x0.75" as one CAD
  library writes it: diameter, TPI, length, thread length), lengths in inches;
- washers and nuts by the bare nominal size after their standard ("ISO 7089 12", the M12
  washer); DIN 125 / 126 / 433 / 9021 washers by their hole diameter d1 ("DIN 125 A 13", the
  M12 washer: d1 = 13 mm).

A size the catalogue does not know is not read (None), so part numbers that merely look
like sizes do not become fasteners.
"""
from __future__ import annotations

import functools
import re
from dataclasses import dataclass

from geomjoint.catalog.tables import MM_PER_INCH, load_table, number, to_mm
from geomjoint.catalog.threads import size_label, thread, thread_sizes
from geomjoint.errors import InputError

#: decimals an inch length keeps in mm (3/4 in is 19.05 mm, not 19.049999999999997)
LENGTH_DIGITS = 6
#: families of fasteners a designation can name ("other": the name says the part is no fastener)
FAMILIES = ("bolt", "nut", "washer", "set screw", "stud", "other")


@dataclass(frozen=True)
class ProductStandard:
    """A fastener product standard (one row of product_standards.csv)."""

    name: str            # "ISO 4017"
    family: str          # one of FAMILIES
    kind: str | None     # bolts: head kind; nuts: hex | lock | flange | square | thin; washers; set-screw point
    size_by: str         # "thread" (ISO 7089 12 = M12) or "d1" (DIN 125 A 13 = M12)
    title: str
    source: str


@dataclass(frozen=True)
class Designation:
    """What a product name says of a fastener (mm)."""

    text: str                          # the name it was read from
    family: str | None = None          # one of FAMILIES, when the name says
    kind: str | None = None            # head kind (bolts), nut kind, washer kind, set-screw point
    standard: str | None = None        # "ISO 4017" (the standard's own name, aliases resolved)
    named_standard: str | None = None  # as written: "DIN 933"
    thread: str | None = None          # catalogue designation: "M12", "#10-32 UNF"
    d: float | None = None             # nominal diameter, mm
    length: float | None = None        # nominal length, mm
    said: str | None = None            # the words the family and kind were read from ("DIN 912", "BHCS")

    @property
    def size(self) -> str:
        """'M12x40', 'M12', '#10-32 UNF x 12.7' or '' (for messages)."""
        if not self.thread:
            return ""
        if self.length is None:
            return self.thread
        sep = "x" if self.thread.startswith("M") else " x "
        return f"{self.thread}{sep}{self.length:g}"


def _canon(text: str) -> str:
    """'din_912' / 'DIN912' / 'din-912' -> 'DIN 912' (standards compared in this form)."""
    m = re.fullmatch(r"\s*((?:DIN\s*)?(?:EN\s*)?(?:ISO)?|DIN|EN)\s*[-_ ]?\s*(\d{2,5}(?:-\d)?)\s*", text.upper())
    if not m:
        return " ".join(text.upper().split())
    org = " ".join(re.findall(r"DIN|EN|ISO", m.group(1)))
    return f"{org} {m.group(2)}"


@functools.lru_cache(maxsize=None)
def _standards() -> dict[str, ProductStandard]:
    out: dict[str, ProductStandard] = {}
    for r in load_table("product_standards"):
        std = ProductStandard(r["standard"], r["family"], r["kind"] or None, r["size_by"], r["title"], r["source"])
        for name in [r["standard"], *[a for a in r["aliases"].split(";") if a]]:
            out[_canon(name)] = std
    return out


def product_standard(name: str) -> ProductStandard:
    """The product standard named ``name`` ("DIN 933", "ISO4762", "EN 1665").

    >>> product_standard("DIN 933").name, product_standard("din912").kind
    ('ISO 4017', 'socket')
    >>> product_standard("ISO 898")
    Traceback (most recent call last):
    ...
    geomjoint.errors.InputError: no fastener product standard 'ISO 898' in the catalog
    """
    canon = _canon(name)
    std = _standards().get(canon)
    if std is None and " " in canon:
        # "EN ISO 4762", "DIN ISO 7380": the ISO number, else the DIN / EN one
        orgs, num = canon.rsplit(" ", 1)
        for org in ("ISO", "DIN", "EN"):
            if org in orgs.split() and std is None:
                std = _standards().get(f"{org} {num}")
    if std is None:
        raise InputError(f"no fastener product standard {name!r} in the catalog")
    return std


@functools.lru_cache(maxsize=None)
def _words() -> tuple[tuple[re.Pattern, str, str | None], ...]:
    """(pattern, family, kind) of each row of fastener_words.csv, in file order."""
    rows = []
    for r in load_table("fastener_words"):
        alts = sorted((w.strip() for w in r["words"].split(";") if w.strip()), key=len, reverse=True)
        body = "|".join(re.escape(w).replace(r"\ ", r"[\s_-]*") for w in alts)
        rows.append((re.compile(rf"(?<![a-z0-9])(?:{body})s?(?![a-z])", re.I), r["family"], r["kind"] or None))
    return tuple(rows)


#: a standard's number in a name: ISO 4017, DIN912, DIN EN ISO 4762, EN 1665, ISO 7380-1
_STANDARD = re.compile(r"(?<![A-Za-z])((?:DIN\s*)?(?:EN\s*)?ISO|DIN(?:\s*EN)?|EN)\s*[-_ ]?\s*(\d{2,5}(?:-\d(?!\d))?)(?!\d)",
                       re.I)
_NUM = r"\d+(?:[.,]\d+)?"
_METRIC = re.compile(rf"(?<![A-Za-z0-9])M\s?({_NUM})(?:\s*[xX×*]\s*({_NUM}))?(?:\s*[xX×*]\s*({_NUM}))?(?![\d.,])")
#: the ASME metric fastener standards' form one CAD library names its parts by:
#: "B18.3.1M - 5 x 0.8 x 16" (ASME B18.3.1M socket head, M5 x 0.8, 16 mm long)
_ASME_METRIC = re.compile(rf"B18\.[\d.]+M\s*-\s*({_NUM})\s*[xX×]\s*({_NUM})(?:\s*[xX×]\s*({_NUM}))?")
#: a tapping screw's size (ISO 1478 ST sizes: "ST3.5x13"): no machine thread, a length
_TAPPING = re.compile(rf"(?<![A-Za-z0-9])ST\s?({_NUM})\s*[xX×*]\s*({_NUM})(?![\d.,])")
_INCH_LEN = r"\d+[ -]\d+/\d+|\d+/\d+|\d*\.\d+|\d+"
_INCH = re.compile(rf"(?<![\w.])(#\s?\d{{1,2}}|\d+/\d+|\d*\.\d+|\d)\s*(?:\"|in)?\s*-\s*(\d{{2,3}})(?![\d/])"
                   rf"(?:\s*(?:UNC|UNF))?(?:\s*[xX×]\s*({_INCH_LEN})\s*(?:\"|in(?:ch)?)?)?")


def _inch_value(text: str) -> float:
    """'1 1/4' / '1-1/4' / '3/4' / '0.75' -> inches."""
    total = 0.0
    for piece in text.replace("-", " ").split():
        if "/" in piece:
            a, b = piece.split("/")
            total += float(a) / float(b)
        else:
            total += float(piece)
    return total


def _is_pitch(d: float, value: float) -> bool:
    return any(t.system == "metric" and abs(t.d - d) < 1e-9 and abs(t.pitch - value) < 1e-9
               for t in thread_sizes("metric"))


def _metric(name: str) -> tuple[str, float, float | None] | None:
    for m in _ASME_METRIC.finditer(name):
        d, pitch = float(m.group(1).replace(",", ".")), float(m.group(2).replace(",", "."))
        try:
            t = thread(f"M{d:g}x{pitch:g}")
        except InputError:
            continue
        return t.designation, t.d, float(m.group(3).replace(",", ".")) if m.group(3) else None
    for m in _METRIC.finditer(name):
        nums = [float(g.replace(",", ".")) for g in m.groups() if g]
        d, pitch, length = nums[0], None, None
        if len(nums) == 3:
            pitch, length = nums[1], nums[2]
        elif len(nums) == 2:
            if _is_pitch(d, nums[1]):
                pitch = nums[1]
            else:
                length = nums[1]
        try:
            t = thread(f"M{d:g}" + (f"x{pitch:g}" if pitch else ""))
        except InputError:
            continue
        return t.designation, t.d, length
    return None


def _inch(name: str) -> tuple[str, float, float | None] | None:
    for m in _INCH.finditer(name):
        size, tpi, length = m.groups()
        try:
            t = thread(f"{size.replace(' ', '')}-{tpi}")
        except InputError:
            continue
        return t.designation, t.d, round(MM_PER_INCH * _inch_value(length), LENGTH_DIGITS) if length else None
    return None


def _bare_size(name: str, after: int, std: ProductStandard) -> tuple[str, float] | None:
    """A nut's or washer's size written as a bare number after its standard ("ISO 7089 12",
    "DIN 125 A 13"): the nominal size, or (DIN 125 style) the hole diameter d1."""
    m = re.match(rf"[\s_-]*(?:A|B|form\s*[AB])?[\s_-]*({_NUM})(?![\d.,])", name[after:], re.I)
    if not m:
        return None
    value = float(m.group(1).replace(",", "."))
    if std.size_by == "d1":
        return _size_by_washer_hole(value)
    try:
        t = thread(f"M{value:g}")
    except InputError:
        return None
    return t.designation, t.d


#: a DIN 125 designation's d1 matches the catalogue's ISO 7089 d1 within this, mm (both are
#: the same nominal hole diameters, DIN 125-1 and ISO 7089 tables; common practice)
WASHER_HOLE_TOL = 0.05


def _size_by_washer_hole(d1: float) -> tuple[str, float] | None:
    for r in load_table("washers"):
        if r["style"] != "standard":
            continue
        if abs(to_mm(number(r, "d1"), r["unit"]) - d1) <= WASHER_HOLE_TOL:
            t = thread(r["size"])
            return t.designation, t.d
    return None


def _family_by_words(text: str) -> tuple[str | None, str | None, str | None]:
    """(family, kind) by the words of a name: the longest phrase matched wins ("button head
    cap screw" is a button head, "hex cap screw" a hex head); a bare "screw" or "bolt" only
    when nothing more telling is there."""
    best = None
    for order, (pattern, fam, knd) in enumerate(_words()):
        for m in pattern.finditer(text):
            generic = fam == "bolt" and knd is None
            key = (generic, -len(m.group(0)), order)
            if best is None or key < best[0]:
                best = (key, fam, knd, m.group(0).strip())
    return (best[1], best[2], best[3]) if best else (None, None, None)


def parse_designation(name: str | None) -> Designation | None:
    """What the product name ``name`` says of a fastener, or None when it says nothing.

    >>> d = parse_designation("screw ISO 4017 M12x40")
    >>> d.family, d.kind, d.standard, d.thread, d.length
    ('bolt', 'hex', 'ISO 4017', 'M12', 40.0)
    >>> d = parse_designation("#10-32 x 1/2 BHCS")
    >>> d.kind, d.thread, d.length
    ('button', '#10-32 UNF', 12.7)
    >>> parse_designation("DIN 125 A 13").thread
    'M12'
    >>> parse_designation("frame_flange") is None
    True
    """
    if not name:
        return None
    text = name.replace("_", " ")
    std: ProductStandard | None = None
    named = None
    std_end = None
    for m in _STANDARD.finditer(text):
        try:
            std = product_standard(f"{m.group(1)} {m.group(2)}")
        except InputError:
            continue
        named, std_end = _canon(f"{m.group(1)} {m.group(2)}"), m.end()
        break
    family = kind = said = None
    if std is not None:
        family, kind, said = std.family, std.kind, named
    else:
        family, kind, said = _family_by_words(text)
    # a standard's own number must not read as a size ("ISO 7089 12"): sizes after it
    sized = _metric(text) or _inch(text)
    tdes = d = length = None
    if sized:
        tdes, d, length = sized
    elif std is not None and std.family in ("nut", "washer"):
        bare = _bare_size(text, std_end, std)
        if bare:
            tdes, d = bare
    if tdes is None and family == "bolt":
        tapping = _TAPPING.search(text)
        if tapping:                # a tapping screw: its length, no catalogue thread
            length = float(tapping.group(2).replace(",", "."))
    if family in ("nut", "washer"):
        length = None             # a nut's "M12x1.5" or a washer's size has no length
    if std is None and family is None and tdes is None:
        return None
    return Designation(text=name, family=family, kind=kind, standard=std.name if std else None,
                       named_standard=named, thread=tdes, d=d, length=length, said=said)


def size_of(t_designation: str) -> str:
    """The hardware size label of a thread designation ('M12x1.5' -> 'M12')."""
    return size_label(thread(t_designation))
