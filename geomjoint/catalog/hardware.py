"""Hardware dimensions: bolt heads, nuts, washers, clearance holes, lengths, thread lengths.

Metric: ISO 4014/4017 hex heads, ISO 4762 socket heads, ISO 7380-1 button heads, ISO 7045 /
ISO 1580 pan heads, ISO 1207 cheese heads, ISO 10642 / ISO 2009 countersunk heads, ISO 4162
flange bolts, ISO 4026 / ISO 4029 set screws, ISO 4032 nuts, ISO 7089 washers, ISO 273
clearance holes.  Inch: ASME B18.2.1 hex and heavy hex bolts (1/4 in and up), ASME B18.6.3
hex head machine screws (#1-#12), ASME B18.3 socket, button and flat countersunk head cap
screws, ASME B18.2.2 / B18.6.3 nuts, ASME B18.21.1 plain washers (type A from #6: SAE =
narrow, USS = wide; type B narrow / wide below #6), ASME B18.2.8 clearance holes.  A size the
standards do not cover in some table (no ISO 7380 button head below M3, no hex head for #0)
raises InputError naming the size and the sizes there are; callers turn that into a
finding on the one joint.  The tables are keyed by the size of the thread
("M12", "1/2", "#10"), so a fine-pitch thread gets the hardware of its nominal size.
"""
from __future__ import annotations

import functools
import math
from typing import Mapping

from geomjoint.catalog.tables import MM_PER_INCH, load_table, number, to_mm
from geomjoint.catalog.threads import size_label, tap_drill, thread_sizes
from geomjoint.catalog.types import HeadDims, NutDims, SetScrewDims, Thread, WasherDims
from geomjoint.errors import InputError

# --- inch length series (common practice, as stocked) ---
#: 1/4 in steps up to 6 in
INCH_LENGTH_STEP_SHORT = 0.25 * MM_PER_INCH
#: 1/2 in steps above 6 in
INCH_LENGTH_STEP_LONG = 0.5 * MM_PER_INCH
INCH_LENGTH_STEP_CHANGE = 6.0 * MM_PER_INCH

#: names of clearance-hole fits; inch (ASME B18.2.8) close/normal/loose map onto ISO 273 fine/medium/coarse
_FITS = {
    "fine": "fine", "close": "fine",
    "medium": "medium", "normal": "medium",
    "coarse": "coarse", "loose": "coarse",
}

_TOL = 1e-9


@functools.lru_cache(maxsize=None)
def _by_size(table: str) -> Mapping[tuple[str, str], Mapping[str, str]]:
    """Rows of a hardware table keyed by (size, style or kind) ('' if the table has neither)."""
    out: dict[tuple[str, str], Mapping[str, str]] = {}
    for r in load_table(table):
        out[(r["size"], r.get("style", r.get("kind", r.get("point", ""))))] = r
    return out


def _row(table: str, t: Thread, style: str, what: str) -> Mapping[str, str]:
    row = _by_size(table).get((size_label(t), style))
    if row is None:
        have = {k[0] for k in _by_size(table) if k[1] == style}
        sizes = list(dict.fromkeys(size_label(x) for x in thread_sizes(t.system) if size_label(x) in have))
        raise InputError(f"no {what} dimensions for {t.designation} in the catalog (sizes: {', '.join(sizes)})")
    return row


#: head kinds the catalog has dimensions for (the names a job file may use)
HEAD_KINDS = ("hex", "heavy hex", "socket", "button", "pan", "pan slotted", "cheese", "countersunk", "flange")

#: other names of each head kind → the kind
_HEAD_ALIASES = {
    "hex": "hex", "hex head": "hex", "hexagon": "hex", "regular": "hex",
    "heavy hex": "heavy hex", "heavy": "heavy hex",
    "socket": "socket", "socket head": "socket", "cap screw": "socket", "shcs": "socket",
    "button": "button", "button head": "button", "bhcs": "button",
    "pan": "pan", "pan head": "pan", "pan cross": "pan", "pan slotted": "pan slotted",
    "cheese": "cheese", "cheese head": "cheese", "fillister": "cheese",
    "countersunk": "countersunk", "flat": "countersunk", "flat head": "countersunk", "csk": "countersunk",
    "fhcs": "countersunk",
    "flange": "flange", "hex flange": "flange", "flange head": "flange",
}


def head_kind(kind: str) -> str:
    """The catalog's name of a head kind ("BHCS" → "button", "flat head" → "countersunk").

    >>> head_kind("Button head"), head_kind("fhcs")
    ('button', 'countersunk')
    """
    k = " ".join(kind.strip().lower().replace("-", " ").replace("_", " ").split())
    found = _HEAD_ALIASES.get(k)
    if found is None:
        raise InputError(f"unknown head kind {kind!r} (use one of {', '.join(HEAD_KINDS)})")
    return found


def head(t: Thread, kind: str = "hex") -> HeadDims:
    """Head dimensions of a bolt or screw with thread `t`.

    kind: "hex" (ISO 4014/4017; ASME B18.2.1 hex bolt; ASME B18.6.3 hex head machine screw for
    the numbered sizes), "heavy hex" (ASME B18.2.1, inch only),
    "socket" (ISO 4762; ASME B18.3), "button" (ISO 7380-1; ASME B18.3), "pan" (ISO 7045
    cross recessed; "pan slotted": ISO 1580), "cheese" (ISO 1207), "countersunk" (ISO 10642,
    below M3 ISO 2009; ASME B18.3 flat head) or "flange" (ISO 4162).  width is s (hex,
    flange) or d_k (the round heads), height k, bearing diameter d_w (min; flange d_c; the
    round heads d_k, common practice).  For inch hex heads d_w is taken equal to F (common
    practice).  A countersunk head carries its cone's included angle.

    >>> from geomjoint.catalog.threads import thread
    >>> head(thread("M12")).width
    18.0
    >>> head(thread("M2.5"), "button")
    Traceback (most recent call last):
    ...
    geomjoint.errors.InputError: no button head dimensions for M2.5 in the catalog (sizes: M3, M4, M5, M6, M8, M10, M12, M16)
    """
    k = head_kind(kind)
    if k in ("hex", "heavy hex"):
        style = "regular" if k == "hex" else "heavy"
        r = _row("hex_heads", t, style, f"{k} head")
        return HeadDims(k, to_mm(number(r, "s"), r["unit"]), to_mm(number(r, "k"), r["unit"]),
                        to_mm(number(r, "dw"), r["unit"]), r["source"])
    if k == "socket":
        r = _row("socket_heads", t, "", "socket head")
        return HeadDims("socket", to_mm(number(r, "dk"), r["unit"]), to_mm(number(r, "k"), r["unit"]),
                        to_mm(number(r, "dw"), r["unit"]), r["source"])
    if k == "button":
        r = _row("button_heads", t, "", "button head")
        dk = to_mm(number(r, "dk"), r["unit"])
        return HeadDims("button", dk, to_mm(number(r, "k"), r["unit"]), dk, r["source"])
    if k in ("pan", "pan slotted", "cheese"):
        style = {"pan": "cross", "pan slotted": "slotted", "cheese": "cheese"}[k]
        r = _row("pan_heads", t, style, f"{k} head")
        dk = to_mm(number(r, "dk"), r["unit"])
        return HeadDims("cheese" if k == "cheese" else "pan", dk, to_mm(number(r, "k"), r["unit"]), dk, r["source"])
    if k == "countersunk":
        r = _row("countersunk_heads", t, "", "countersunk head")
        dk = to_mm(number(r, "dk"), r["unit"])
        return HeadDims("countersunk", dk, to_mm(number(r, "k"), r["unit"]), dk, r["source"], angle=number(r, "angle"))
    r = _row("flange_heads", t, "", "flange head")
    return HeadDims("flange", to_mm(number(r, "s"), r["unit"]), to_mm(number(r, "k"), r["unit"]),
                    to_mm(number(r, "dc"), r["unit"]), r["source"])


def set_screw(t: Thread, point: str = "cup") -> SetScrewDims:
    """Hexagon socket set screw of thread `t`: ISO 4026 (flat point) or ISO 4029 (cup point).

    >>> from geomjoint.catalog.threads import thread
    >>> set_screw(thread("M6")).key
    3.0
    """
    p = point.strip().lower()
    if p not in ("flat", "cup"):
        raise InputError(f"unknown set screw point {point!r} (use 'flat' or 'cup')")
    r = _row("set_screws", t, p, f"{p}-point set screw")
    u = r["unit"]
    return SetScrewDims(p, to_mm(number(r, "s"), u), to_mm(number(r, "l_min"), u), to_mm(number(r, "l_max"), u),
                        r["source"])


def nut(t: Thread) -> NutDims:
    """Hex nut for thread `t`: ISO 4032 (s, m max, d_w min) or ASME B18.2.2 (F, H; d_w = F).

    >>> from geomjoint.catalog.threads import thread
    >>> nut(thread("M12")).height
    10.8
    """
    r = _row("nuts", t, "", "nut")
    u = r["unit"]
    return NutDims(to_mm(number(r, "s"), u), to_mm(number(r, "m"), u), to_mm(number(r, "dw"), u), r["source"])


def washer(t: Thread, kind: str = "standard") -> WasherDims:
    """Plain washer for thread `t`: ISO 7089 (metric) or ASME B18.21.1 plain washer (inch).

    kind: "standard" (ISO 7089; inch: SAE = narrow), "sae"/"narrow", "uss"/"wide" (inch only).
    Inch sizes from #6 are type A; #0-#5, where type A has none, type B of the same series.

    >>> from geomjoint.catalog.threads import thread
    >>> washer(thread("M12")).outer
    24.0
    """
    k = kind.strip().lower()
    if t.system == "metric":
        if k not in ("standard", "iso 7089", "normal"):
            raise InputError(f"unknown washer kind {kind!r} for {t.designation} (metric: 'standard')")
        style = "standard"
    else:
        styles = {"standard": "narrow", "sae": "narrow", "narrow": "narrow", "n": "narrow",
                  "uss": "wide", "wide": "wide", "w": "wide"}
        if k not in styles:
            raise InputError(f"unknown washer kind {kind!r} (use 'sae'/'narrow' or 'uss'/'wide')")
        style = styles[k]
    r = _row("washers", t, style, f"{style} washer")
    u = r["unit"]
    return WasherDims(to_mm(number(r, "d1"), u), to_mm(number(r, "d2"), u), to_mm(number(r, "h"), u), r["source"])


def clearance_hole(t: Thread, fit: str = "medium") -> float:
    """Clearance hole diameter for thread `t`, mm.

    fit: ISO 273 "fine" | "medium" | "coarse"; the inch names of ASME B18.2.8
    "close" | "normal" | "loose" are the same three columns.

    >>> from geomjoint.catalog.threads import thread
    >>> clearance_hole(thread("M12"))
    13.5
    """
    col = _FITS.get(fit.strip().lower())
    if col is None:
        raise InputError(f"unknown clearance fit {fit!r} (use fine/medium/coarse or close/normal/loose)")
    r = _row("clearance_holes", t, "", "clearance hole")
    return to_mm(number(r, col), r["unit"])


#: order of preference when two matches fit a hole equally well
_LABEL_RANK = {"medium": 0, "fine": 1, "coarse": 2, "tap drill": 3, "nominal": 4}


def nominal_from_hole(diameter: float, system: str | None = None, tol: float = 0.05) -> list[tuple[Thread, str]]:
    """Threads whose clearance hole, tap drill or nominal diameter is within `tol` [mm] of `diameter`.

    Each match is (thread, label) with label "fine" | "medium" | "coarse" (clearance-hole
    fits; inch close/normal/loose are reported under these names), "tap drill" (the tap
    drill of `tap_drill` or the basic minor diameter D1) or "nominal" (the major diameter).
    Best match first: smallest difference, then medium before fine before coarse before
    tap drill before nominal, then coarse/UNC before fine/UNF.

    >>> t, label = nominal_from_hole(13.5)[0]
    >>> t.designation, label
    ('M12', 'medium')
    """
    found: list[tuple[float, int, int, int, Thread, str]] = []
    for i, t in enumerate(thread_sizes(system)):
        cands: list[tuple[float, str]] = []
        r = _by_size("clearance_holes").get((size_label(t), ""))
        if r is not None:  # without clearance data for a size, tap drill and nominal still apply
            for col in ("fine", "medium", "coarse"):
                cands.append((to_mm(number(r, col), r["unit"]), col))
        cands += [(tap_drill(t), "tap drill"), (t.D1, "tap drill"), (t.d, "nominal")]
        best: dict[str, float] = {}
        for value, label in cands:
            err = abs(value - diameter)
            if err <= tol + _TOL and err < best.get(label, math.inf):
                best[label] = err
        fine_series = 1 if t.series in ("fine", "UNF") else 0
        for label, err in best.items():
            found.append((round(err, 9), _LABEL_RANK[label], fine_series, i, t, label))
    found.sort(key=lambda x: x[:4])
    return [(t, label) for *_, t, label in found]


@functools.lru_cache(maxsize=None)
def _thread_length_rows(system: str, head: str) -> tuple[tuple[float, float], ...]:
    """(upper limit of L, extra c) in mm of the rule L_T = 2d + c, ascending; the last has no limit."""
    rows = []
    for r in load_table("thread_length_rules"):
        if r["system"] == system and r["head"] == head:
            limit = number(r, "l_max")
            rows.append((math.inf if limit is None else to_mm(limit, r["unit"]), to_mm(number(r, "extra"), r["unit"])))
    rows.sort()
    if not rows or rows[-1][0] != math.inf:
        raise InputError(f"catalog data thread_length_rules.csv: no open-ended {system} {head} row")
    return tuple(rows)


def thread_length_rule(d: float, length: float, system: str, head: str = "hex") -> float:
    """Standard thread length L_T = 2d + c of a bolt of diameter ``d`` and length ``length``, mm.

    Hex bolts: metric (ISO 4014 b ref) c = 6 mm (L <= 125), 12 mm (125 < L <= 200),
    25 mm (L > 200); inch (ASME B18.2.1) c = 1/4 in (L <= 6 in), 1/2 in (L > 6 in).
    Socket head cap screws: c = 12 mm (ISO 4762 b ref), 1/2 in (ASME B18.3).  The rows and
    their sources are in ``data/thread_length_rules.csv`` (Budynas & Nisbett, *Shigley's
    MED* 10th ed., eqs. 8-13 and 8-14, give the hex rules).  The result can exceed L for
    short bolts: such a bolt is threaded to the head (see `thread_length`).

    Parameters
    ----------
    d : float
        Nominal diameter, mm.
    length : float
        Bolt length under the head, mm.
    system : str
        "metric" or "inch".
    head : str
        A head kind of HEAD_KINDS (or an alias); each follows the hex or the socket rule
        (`_THREAD_RULE_KINDS`).

    >>> thread_length_rule(12.0, 50.0, "metric")
    30.0
    >>> round(thread_length_rule(12.7, 50.8, "inch") / MM_PER_INCH, 4)   # 1/2 in x 2 in
    1.25
    >>> thread_length_rule(8.0, 35.0, "metric", "socket")
    28.0
    """
    if d <= 0 or length <= 0:
        raise InputError(f"diameter and length must be positive, got d={d}, L={length}")
    if system not in ("metric", "inch"):
        raise InputError(f"unknown thread system {system!r} (metric or inch)")
    for limit, extra in _thread_length_rows(system, _thread_rule_kind(head)):
        if length <= limit:
            return 2.0 * d + extra
    raise AssertionError("unreachable: the last rule row has no limit")


def thread_length(t: Thread, length: float, kind: str = "hex") -> float:
    """Thread length L_T of a bolt of thread `t` and nominal length `length` [mm], mm.

    The standard rule (`thread_length_rule`), cut at the length: a bolt shorter than the
    rule's L_T is threaded to the head, L_T = min(rule, L).

    >>> from geomjoint.catalog.threads import thread
    >>> thread_length(thread("M12"), 50.0)
    30.0
    """
    if length <= 0:
        raise InputError(f"bolt length must be positive, got {length:g} mm")
    return min(thread_length_rule(t.d, length, t.system, kind), length)


#: head kind → (its row kind in lengths.csv, the preferred length series it follows)
#: (ISO 7380, ISO 7045, ISO 10642 and ISO 2009 use the ISO 888 series of ISO 4762;
#: ISO 4162 that of ISO 4014/4017 — from memory)
_LENGTH_KINDS = {
    "hex": ("hex", "hex"), "heavy hex": ("hex", "hex"), "socket": ("socket", "socket"),
    "button": ("button", "socket"), "pan": ("pan", "socket"), "pan slotted": ("pan", "socket"),
    "cheese": ("pan", "socket"), "countersunk": ("countersunk", "socket"), "flange": ("flange", "hex"),
}


def _kind_key(kind: str) -> str:
    return _LENGTH_KINDS[head_kind(kind)][0]


#: head kind -> the thread-length rule it follows (rows of thread_length_rules.csv): ISO 4162
#: flange bolts have the b of ISO 4014; ISO 7380, ISO 7045 / ISO 1580 / ISO 1207 and ISO 10642
#: screws are threaded to the head when short and have about 2d + 12 when long, as ISO 4762
#: (from memory); the rule is cut at the length (thread_length)
_THREAD_RULE_KINDS = {
    "hex": "hex", "heavy hex": "hex", "flange": "hex", "socket": "socket", "button": "socket",
    "pan": "socket", "pan slotted": "socket", "cheese": "socket", "countersunk": "socket",
}


def _thread_rule_kind(kind: str) -> str:
    return _THREAD_RULE_KINDS[head_kind(kind)]


def standard_lengths(t: Thread, kind: str = "hex") -> list[float]:
    """Standard nominal lengths [mm] of bolts/screws with thread `t`, ascending.

    Metric: the ISO 4014/4017 (hex) or ISO 4762 (socket) preferred lengths within the
    commercial range of the size.  Inch: 1/4 in steps up to 6 in, 1/2 in above, within
    the stock range of the size (common practice).

    >>> from geomjoint.catalog.threads import thread
    >>> standard_lengths(thread("M12"))[:4]
    [25.0, 30.0, 35.0, 40.0]
    """
    key, series_kind = _LENGTH_KINDS[head_kind(kind)]
    r = _by_size("lengths").get((size_label(t), key))
    if r is None:
        raise InputError(f"no standard {key} lengths for {t.designation} in the catalog")
    lo, hi = to_mm(number(r, "l_min"), r["unit"]), to_mm(number(r, "l_max"), r["unit"])
    if t.system == "metric":
        series = sorted(float(s["length"]) for s in load_table("length_series") if s["kind"] == series_kind)
        return [x for x in series if lo - _TOL <= x <= hi + _TOL]
    out: list[float] = []
    x = lo
    while x <= hi + 1e-6:
        out.append(round(x, 6))
        x += INCH_LENGTH_STEP_SHORT if x < INCH_LENGTH_STEP_CHANGE - 1e-6 else INCH_LENGTH_STEP_LONG
    return out


def shortest_length(t: Thread, needed: float, kind: str = "hex") -> float:
    """Smallest standard length [mm] >= `needed` [mm]; InputError if the size has none that long.

    >>> from geomjoint.catalog.threads import thread
    >>> shortest_length(thread("M12"), 41.0)
    45.0
    """
    lengths = standard_lengths(t, kind)
    for x in lengths:
        if x >= needed - 1e-6:
            return x
    raise InputError(
        f"no standard {_kind_key(kind)} length of {t.designation} reaches {needed:g} mm "
        f"(longest {lengths[-1]:g} mm)" if lengths else f"no standard lengths for {t.designation}"
    )


def hardware_gaps(t: Thread, kind: str = "hex", with_nut: bool = True) -> list[str]:
    """What the catalog lacks to finish a joint of thread `t` with a `kind` head: [] when nothing.

    A joint is finished with the head (bearing diameter, height), the standard lengths of
    that head kind and, for a through joint (``with_nut``), the nut.  Size inference uses
    this to never land on a size it cannot finish; a modelled size with gaps gets a finding.

    >>> from geomjoint.catalog.threads import thread
    >>> hardware_gaps(thread("M12"))
    []
    >>> hardware_gaps(thread("#0-80 UNF"), "hex")
    ['hex head', 'hex lengths']
    """
    gaps = []
    k = head_kind(kind)
    for what, probe in ((f"{k} head", lambda: head(t, k)), (f"{k} lengths", lambda: standard_lengths(t, k)),
                        ("nut", lambda: nut(t) if with_nut else None)):
        try:
            probe()
        except InputError:
            gaps.append(what)
    return gaps
