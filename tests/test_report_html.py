"""The HTML report: self-contained, the same numbers as results.json, units as asked.

The JointResult objects are built here by hand from textbook closed forms (not by the
engine), so these tests do not depend on the engine's modules:

- bolt stiffness k_b = A_d A_t E / (A_d l_t + A_t l_d)   (Shigley 10th ed., eq. 8-17)
- member stiffness of equal plates (Shigley 10th ed., eq. 8-22)
      k_m = 0.5774 pi E d / (2 ln(5 (0.5774 l + 0.5 d) / (0.5774 l + 2.5 d)))
- C = k_b / (k_b + k_m), F_i = 0.75 A_t S_p                (Shigley 10th ed., Sec. 8-7, 8-9)
- sigma_i = F_i/A_t, sigma_a = C (P_max - P_min)/(2 A_t), sigma_m = sigma_i + C (P_max + P_min)/(2 A_t)
- factors: yield S_p A_t/(F_i + C P), load (S_p A_t - F_i)/(C P), separation F_i/((1 - C) P)
  (Shigley 10th ed., eqs. 8-28 to 8-30), fatigue along the load line (Sec. 8-11).
"""
from __future__ import annotations

import dataclasses
import html
import itertools
import math
import re
import xml.etree.ElementTree as ET
from html.parser import HTMLParser

import pytest

from geomjoint.errors import InputError
from geomjoint.report import lazy
from geomjoint.report.html import html_report
from geomjoint.report.json_doc import result_document
from geomjoint.report.plots import (
    VERDICT_COLOURS,
    VERDICT_TEXT,
    criterion_curve,
    fatigue_diagram_svg,
    joint_diagram_points,
    section_svg,
)
from geomjoint.report.text import CAUTION

from geomjoint.mechanics.joint import (
    Check,
    ConeStiffness,
    FastenerSpec,
    FatigueSpec,
    JointResult,
    JointSpec,
    LayerSpec,
    PreloadSpec,
    Remedy,
    VdiSpec,
)
from geomjoint.mechanics.vdi import vdi_chain

E_STEEL = 207_000.0      # MPa, Shigley 10th ed., Table 8-8 (from memory)
E_CAST_IRON = 100_000.0  # MPa, gray cast iron, Shigley 10th ed., Table 8-8 (from memory)
E_ALUMINIUM = 71_000.0   # MPa, Shigley 10th ed., Table 8-8 (from memory)


def k_bolt(d: float, A_t: float, l_d: float, l_t: float, E: float = E_STEEL) -> float:
    A_d = math.pi * d * d / 4.0
    return A_d * A_t * E / (A_d * l_t + A_t * l_d)


def k_members_eq_8_22(E: float, d: float, l: float) -> float:
    return 0.5774 * math.pi * E * d / (2.0 * math.log(5.0 * (0.5774 * l + 0.5 * d) / (0.5774 * l + 2.5 * d)))


def strength_on_load_line(criterion: str, Se: float, s_i: float, r: float, S: float) -> float:
    """S_a where S_m = s_i + r S_a meets the criterion curve; solved by bisection (independent of the engine)."""
    def g(sa: float) -> float:
        sm = s_i + r * sa
        if criterion in ("goodman", "soderberg"):
            return sa / Se + sm / S - 1.0
        if criterion == "gerber":
            return sa / Se + (sm / S) ** 2 - 1.0
        return (sa / Se) ** 2 + (sm / S) ** 2 - 1.0
    lo, hi = 0.0, Se
    for _ in range(200):
        mid = (lo + hi) / 2.0
        lo, hi = (mid, hi) if g(mid) < 0 else (lo, mid)
    return (lo + hi) / 2.0


def make_result(jid: str, fastener: FastenerSpec, layers: tuple[LayerSpec, ...], *, tapped: bool,
                d_w: float, d_h: float, l_d: float, eff_grip: float, E_members: float, p_min: float,
                p_max: float, Se: float, criterion: str, required_fatigue: float = 1.5,
                scatter: float = 1.0, remedies: list | None = None, findings: list | None = None,
                nut_height: float | None = None) -> JointResult:
    f = fastener
    grip = float(sum(x.thickness for x in layers))
    k_b = k_bolt(f.d, f.stress_area, l_d, max(eff_grip - l_d, 0.0), f.E)
    k_m = k_members_eq_8_22(E_members, f.d, eff_grip)
    C = k_b / (k_b + k_m)
    F_i = 0.75 * f.stress_area * f.proof
    A = f.stress_area
    s_i = F_i / A
    s_a = C * (p_max - p_min) / (2 * A)
    s_m = s_i + C * (p_max + p_min) / (2 * A)
    S = {"goodman": f.tensile, "gerber": f.tensile, "asme-elliptic": f.proof, "soderberg": f.yield_strength}[criterion]
    n_f = strength_on_load_line(criterion, Se, s_i, (s_m - s_i) / s_a, S) / s_a
    proof_load = f.proof * A
    factors = {"yield": proof_load / (F_i + C * p_max), "load": (proof_load - F_i) / (C * p_max),
               "separation": F_i / ((1 - C) * p_max), "fatigue": n_f}
    required = {"yield": 1.0, "load": 1.0, "separation": 1.0, "fatigue": required_fatigue}
    checks = [Check(k, v, required[k], v >= required[k], f"{k} factor") for k, v in factors.items()]
    margins = {c.name: c.value / c.required for c in checks}
    governing = min(margins, key=margins.get)
    least = margins[governing]
    verdict = "fail" if least < 1.0 else ("marginal" if least < 1.2 else "pass")
    spec = JointSpec(id=jid, fastener=f, layers=layers, bearing_diameter=d_w, hole_diameter=d_h, tapped=tapped,
                     preload=PreloadSpec("proof_fraction", 0.75, scatter=scatter), load_min=p_min, load_max=p_max,
                     fatigue=FatigueSpec(criterion=criterion, Se=Se), nut_height=nut_height,
                     engagement=layers[-1].thickness if tapped else nut_height)
    tightening = None
    if scatter > 1.0:
        # mean-of-band convention: F_min = 2 F_i/(1 + a), F_max = 2 a F_i/(1 + a)
        tightening = {"preload_min": 2 * F_i / (1 + scatter), "preload_max": 2 * scatter * F_i / (1 + scatter)}
    return JointResult(id=jid, ok=verdict != "fail", verdict=verdict, governing=governing, spec=spec, grip=grip,
                       effective_grip=eff_grip, bolt_stiffness=k_b, member_stiffness=k_m, joint_constant=C,
                       stiffness_method="frustum", preload=F_i, Se=Se, sigma_a=s_a, sigma_m=s_m, sigma_i=s_i,
                       n_f=n_f, factors=factors, checks=checks, tightening=tightening,
                       findings=findings or [], fatigue_criterion=criterion, remedies=list(remedies or []), notes=["built by hand for the report tests"])


# ISO M12x1.75: A_s = 84.3 mm^2 (ISO 898-1:2013), d2, d3, D1 by ISO 724 (from memory);
# class 10.9: S_p 830, R_p0.2 940, R_m 1040 MPa (ISO 898-1:2013 Table 3, from memory);
# S_e = 162 MPa (Shigley 10th ed., Table 8-17, from memory).
M12_109 = FastenerSpec(designation="M12", system="metric", d=12.0, pitch=1.75, d2=10.863, d3=9.853, D1=10.106,
                       stress_area=84.3, grade="10.9", proof=830.0, yield_strength=940.0, tensile=1040.0,
                       length=45.0)
# ISO M16x2: A_s = 157 mm^2; class 8.8 (M16-M36): S_p 600, S_y 660, S_ut 830 MPa, S_e 129 MPa
# (Shigley 10th ed., Tables 8-11 and 8-17, from memory).
M16_88 = FastenerSpec(designation="M16", system="metric", d=16.0, pitch=2.0, d2=14.701, d3=13.546, D1=13.835,
                      stress_area=157.0, grade="8.8", proof=600.0, yield_strength=660.0, tensile=830.0,
                      length=40.0, head="socket")
# 1/2-13 UNC: A_t = 0.1419 in^2 = 91.55 mm^2 (ASME B1.1); SAE grade 5 (1/4-1 in): S_p 85, S_y 92,
# S_ut 120 kpsi (SAE J429), S_e 18.6 kpsi (Shigley 10th ed., Table 8-17) - from memory.
KPSI = 6.894757  # MPa per kpsi (NIST SP 811: 1 psi = 6894.757 Pa)
UNC_12_SAE5 = FastenerSpec(designation="1/2-13 UNC", system="inch", d=12.7, pitch=25.4 / 13, d2=11.43,
                           d3=10.16, D1=10.60, stress_area=0.1419 * 25.4 ** 2, grade="SAE 5", proof=85 * KPSI,
                           yield_strength=92 * KPSI, tensile=120 * KPSI, length=2.5 * 25.4)


def sample_results() -> list[JointResult]:
    """Three joints of a conveyor drive bracket: through (pass), tapped (fail), inch through (marginal)."""
    # through joint: two 16 mm steel plates; L_T = 2d + 6 = 30 mm (Shigley 10th ed., Table 8-7), l_d = 15
    a = make_result("A1", M12_109,
                    (LayerSpec(16.0, E_STEEL, material="steel", part="bracket"),
                     LayerSpec(16.0, E_STEEL, material="steel", part="frame rail")),
                    tapped=False, d_w=18.0, d_h=13.0, l_d=15.0, eff_grip=32.0, E_members=E_STEEL,
                    p_min=0.0, p_max=10_000.0, Se=162.0, criterion="goodman", nut_height=10.8)
    # cap screw into cast iron: h = 20, t2 = 30 >= d, l' = h + d/2 = 28 (Shigley 10th ed., Table 8-7)
    b = make_result("B2/left <gearbox & cover>", M16_88,
                    (LayerSpec(20.0, E_ALUMINIUM, material="aluminium", part="cover"),
                     LayerSpec(30.0, E_CAST_IRON, material="cast iron", part="gearbox", role="tapped")),
                    tapped=True, d_w=24.0, d_h=17.5, l_d=0.0, eff_grip=28.0, E_members=E_ALUMINIUM,
                    p_min=5_000.0, p_max=60_000.0, Se=129.0, criterion="gerber", required_fatigue=3.0,
                    scatter=1.6,
                    remedies=[Remedy("M20 8.8", "pass", "fatigue 3.4")],
                    findings=[{"severity": "warn", "code": "soft-layer", "message": "aluminium cover under the head"}])
    # inch through joint with a washer: 1/8 in washer + two 3/4 in plates
    c = make_result("C3", UNC_12_SAE5,
                    (LayerSpec(3.175, E_STEEL, material="steel", role="washer"),
                     LayerSpec(19.05, E_STEEL, material="steel", part="skid beam"),
                     LayerSpec(19.05, E_STEEL, material="steel", part="pump foot")),
                    tapped=False, d_w=19.05, d_h=14.0, l_d=25.4, eff_grip=41.275, E_members=E_STEEL,
                    p_min=0.0, p_max=40_000.0, Se=18.6 * KPSI, criterion="asme-elliptic", required_fatigue=1.0)
    return [a, b, c]


# ----------------------------------------------------------------------------- helpers

class _Cells(HTMLParser):
    """Rows of one table (by id): each row a list of (attrs, text) cells."""

    def __init__(self, table_id: str):
        super().__init__()
        self.table_id, self.depth, self.rows, self._cell = table_id, 0, [], None

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag == "table":
            if self.depth or a.get("id") == self.table_id:
                self.depth += 1
        elif self.depth and tag == "tr":
            self.rows.append([])
        elif self.depth and tag in ("td", "th"):
            self._cell = [a, ""]

    def handle_endtag(self, tag):
        if tag == "table" and self.depth:
            self.depth -= 1
        elif self.depth and tag in ("td", "th") and self._cell is not None:
            self.rows[-1].append((self._cell[0], self._cell[1].strip()))
            self._cell = None

    def handle_data(self, data):
        if self._cell is not None:
            self._cell[1] += data


def table_rows(doc: str, table_id: str) -> list[list[tuple[dict, str]]]:
    p = _Cells(table_id)
    p.feed(doc)
    return [row for row in p.rows if row and "data-value" in " ".join(" ".join(c[0]) for c in row)]


def number(text: str) -> float:
    return float(text.replace("\u202f", "").replace(",", ""))


def joint_section(doc: str, index: int) -> str:
    """The per-joint section number ``index`` of the page."""
    return doc.split('<section class="joint"')[1 + index].split("</section>")[0]


def svgs(doc: str) -> list[str]:
    """The drawings of a page, put back in place (report/lazy.py) as the page's script does."""
    return re.findall(r"<svg\b.*?</svg>", lazy.expand(doc), flags=re.S)


@pytest.fixture(scope="module")
def results():
    return sample_results()


@pytest.fixture(scope="module")
def doc_si(results):
    return html_report(results, title="Conveyor drive bracket", overview_svg=OVERVIEW)


@pytest.fixture(scope="module")
def doc_inch(results):
    return html_report(results, title="Conveyor drive bracket", units="inch")


# A picture as a caller might pass it: with an XML prologue, which the page must not keep.
OVERVIEW = ('<?xml version="1.0" encoding="utf-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="100" '
            'height="40"><circle cx="20" cy="20" r="8" fill="#163e7a"/><text x="32" y="24">A1</text></svg>')


# ----------------------------------------------------------------------------- the document

def test_every_joint_id_is_shown_escaped(doc_si, results):
    for r in results:
        assert html.escape(r.id) in doc_si
    # the id with markup characters is escaped, never injected as a tag
    assert "<gearbox" not in doc_si
    # one section per joint, in order
    ids = re.findall(r'<section class="joint" id="[^"]+" data-joint="([^"]+)"', doc_si)
    assert [html.unescape(x) for x in ids] == [r.id for r in results]


def test_caution_at_top_and_bottom(doc_si):
    assert doc_si.count(html.escape(CAUTION)) == 2
    first, last = doc_si.find(html.escape(CAUTION)), doc_si.rfind(html.escape(CAUTION))
    assert first < doc_si.find('id="summary"')
    assert last > doc_si.rfind('<section class="joint"')


def test_self_contained_no_outside_resources(doc_si, doc_inch):
    for doc in (doc_si, doc_inch):
        # every URL left is an XML namespace name (never fetched by a browser)
        for m in re.finditer(r"https?://", doc):
            before = doc[max(0, m.start() - 20):m.start()]
            # (in the drawings' templates the quote is JSON-escaped)
            assert re.search(r'xmlns(:\w+)?=\\?"$', before), doc[m.start() - 40:m.start() + 60]
        assert not re.search(r"<link\b|<img\b|<iframe\b|@import|<script\b[^>]*\bsrc=", doc)
        assert "<!DOCTYPE svg" not in doc and "<?xml" not in doc
        assert doc.count("<script>") == 1 and doc.count("<style>") == 1


def test_each_svg_is_well_formed_and_ids_are_unique(doc_si, results):
    pictures = svgs(doc_si)
    assert len(pictures) == 3 * len(results) + 1     # three drawings per joint and the overview
    for svg in pictures:
        root = ET.fromstring(svg)
        assert root.tag == "{http://www.w3.org/2000/svg}svg"
    page = lazy.expand(doc_si)                       # the page with every section opened
    ids = re.findall(r'\bid="([^"]+)"', page)
    assert len(ids) == len(set(ids))
    # every internal reference points at an id of the page
    for ref in re.findall(r"url\(#([^)]+)\)", page) + re.findall(r'href="#([^"]+)"', page):
        assert ref in ids, ref


def test_closed_page_holds_no_drawing_and_opens_to_the_sections_as_written(doc_si, results):
    """The page sends each joint's drawings as templates and numbers (report/lazy.py): the
    sections hold empty slots, and putting the drawings back gives the sections exactly as
    written with the drawings inline."""
    from geomjoint.report.html import _joint_section
    from geomjoint.report.plots import report_units

    sections = doc_si[doc_si.find('<section class="joint"'):doc_si.rfind("</section>")]
    assert "<svg" not in sections
    assert len(re.findall(r'<span class="drawing" data-drawing="\d+"></span>', sections)) == 3 * len(results)
    inline = "".join(_joint_section(i, r, report_units("SI")) for i, r in enumerate(results))
    assert inline in lazy.expand(doc_si)
    assert '<script type="application/json"' not in lazy.expand(doc_si)


def test_drawing_values_come_back_as_written():
    """Numbers go into the page as JSON numbers only where String(number) writes them back
    unchanged; others ("-0", "30.0", "1e-05", long ones) stay text."""
    values = ["0", "-0", "30", "30.0", "-4", "174.5", "0.001", "0.0001", "1e-05", "12.25",
              "1234567890123456", "007", "0.5 1.5", "M1,2h-4"]
    svg = ('<svg viewBox="0 0 5 5">' + "".join(f'<rect x="{v}" y="1" width="2" height="3" fill="#000"/>'
                                                for v in values)
           + '<text x="1" y="2">a &amp; b</text><g id="k-1"><path d="M0,6L6,0"/></g></svg>')
    drawings = lazy.Drawings()
    k = drawings.add(svg)
    assert lazy.drawing(drawings.templates, drawings.drawings[k]) == svg
    # one template for all the rectangles: only their values differ
    assert sum("<rect" in t for t in drawings.templates) == 1
    page = lazy.compact(f"<p>{svg}</p>", drawings) + lazy.payload(drawings)
    assert "<svg" not in page.split("<script")[0]
    assert lazy.expand(page) == f"<p>{svg}</p>"


def test_table_numbers_match_the_result_and_results_json(doc_si, results):
    rows = table_rows(doc_si, "joints-table")
    assert len(rows) == len(results)
    jdoc = result_document(results, "test")["joints"]
    for row, r, j in zip(rows, results, jdoc):
        (_, jid), _, grip, C, preload = row[:5]
        assert jid == r.id
        # full-precision value in the data attribute equals the result and the JSON document
        assert float(preload[0]["data-value"]) == r.preload == j["preload"]
        assert float(C[0]["data-value"]) == r.joint_constant == j["stiffness"]["C"]
        assert float(grip[0]["data-value"]) == r.grip == j["grip"]
        # shown values round the same numbers: kN to 2 decimals, C to 3
        assert number(preload[1]) == pytest.approx(r.preload / 1000.0, abs=0.005)
        assert C[1] == f"{r.joint_constant:.3f}"
        for cell, key in zip(row[5:9], ("yield", "load", "separation", "fatigue")):
            assert float(cell[0]["data-value"]) == j["factors"][key]
            assert number(cell[1]) == pytest.approx(j["factors"][key], abs=0.005)
        verdict_cell = row[9][1]
        assert verdict_cell == r.verdict.upper() == j["verdict"].upper()   # verdict as text, never colour alone


def test_numbers_section_values_and_sources(doc_si, results):
    a = results[0]
    section = joint_section(doc_si, 0)
    # preload in N, C to 4 decimals, with their sources
    assert f"{a.preload:,.0f}".replace(",", "\u202f") in section
    assert f"{a.joint_constant:.4f}" in section
    assert "frustum, Shigley 10th ed., eq. 8-20" in section
    assert "Goodman line" in section and "eq. 8-38" in section
    b_section = joint_section(doc_si, 1)
    assert "Gerber parabola" in b_section
    # tightening window (mean-of-band convention): F_min = 2 F_i/(1 + a), F_max = 2 a F_i/(1 + a)
    b = results[1]
    lo = 2 * b.preload / (1 + 1.6)
    assert f"{lo:,.0f}".replace(",", "\u202f") in b_section
    assert "M20 8.8" in b_section and "fatigue 3.4" in b_section       # remedy
    assert "soft-layer" in b_section and "WARN" in b_section            # finding
    assert "FAILS" in b_section                                         # a failed check, in words


def test_inch_units_convert(doc_inch, results):
    rows = table_rows(doc_inch, "joints-table")
    for row, r in zip(rows, results):
        grip, preload = row[2], row[4]
        # 1 in = 25.4 mm exactly; 1 lbf = 4.4482216152605 N (NIST SP 811, Appendix B)
        assert number(grip[1]) == pytest.approx(r.grip / 25.4, rel=5e-3)
        assert number(preload[1]) == pytest.approx(r.preload / 4448.2216152605, abs=0.005)   # kip
        assert float(preload[0]["data-value"]) == r.preload   # sorting keeps internal N
    assert "grip [in]" in doc_inch and "preload [kip]" in doc_inch
    # the proof strength of SAE grade 5 shows as 85 kpsi (1 psi = 6894.757 Pa, NIST SP 811)
    c_section = joint_section(doc_inch, 2)
    m = re.search(r'proof strength S_p</th><td class="num">([0-9.]+)</td><td>kpsi', c_section)
    assert m and float(m.group(1)) == pytest.approx(85.0, abs=0.005)
    # plot axes in inch units too
    assert "[kpsi]" in doc_inch and "[MPa]" not in doc_inch
    assert "[in]" in doc_inch and "[mm]" not in doc_inch
    assert "1/2-13 UNC x 2.5 in SAE 5" in doc_inch


def test_summary_counts_and_governing(doc_si, results):
    for v in ("pass", "marginal", "fail"):
        n = sum(1 for r in results if r.verdict == v)
        assert f'<b id="count-{v}">{n}</b>' in doc_si
    assert f'<b id="count-joints">{len(results)}</b>' in doc_si
    start = doc_si.find('<ul class="governing">')
    governing = doc_si[start:doc_si.find("</ul>", start)]
    for r in results:
        assert f"governing: {r.governing} (" in governing


def test_overview_is_inlined_without_prologue(doc_si):
    start = doc_si.find('id="overview"')
    assert start > 0 and "<circle" in doc_si[start:]


def test_unknown_units_are_an_input_error(results):
    with pytest.raises(InputError):
        html_report(results, title="x", units="furlongs")


# ----------------------------------------------------------------------------- palette

def _luminance(hex_colour: str) -> float:
    # relative luminance, WCAG 2.1 (sRGB linearisation)
    c = [int(hex_colour[i:i + 2], 16) / 255 for i in (1, 3, 5)]
    c = [x / 12.92 if x <= 0.04045 else ((x + 0.055) / 1.055) ** 2.4 for x in c]
    return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2]


def _contrast(a: float, b: float) -> float:
    return (max(a, b) + 0.05) / (min(a, b) + 0.05)   # WCAG 2.1 contrast ratio


def test_verdict_palette_differs_in_lightness_and_text_is_readable():
    L = {k: _luminance(v) for k, v in VERDICT_COLOURS.items()}
    # distinguishable without hue (greyscale, colour-blind readers): pairwise contrast >= 1.5 (our bar)
    for a, b in itertools.combinations(L, 2):
        assert _contrast(L[a], L[b]) >= 1.5, (a, b)
    # badge text meets WCAG 2.1 SC 1.4.3 (4.5:1) on every verdict colour
    for k in L:
        assert _contrast(L[k], _luminance(VERDICT_TEXT[k])) >= 4.5, k


# ----------------------------------------------------------------------------- drawings

def test_joint_diagram_splits_the_load(results):
    for r in results:
        p = joint_diagram_points(r)
        P, C = r.spec.load_max, r.joint_constant
        # bolt rises by C P, members relax by (1 - C) P: the two differ by P (Shigley 10th ed., Sec. 8-7)
        assert p["bolt_force"] == pytest.approx(r.preload + C * P)
        assert p["bolt_force"] - p["member_force"] == pytest.approx(P)
        assert p["delta_b"] == pytest.approx(r.preload / r.bolt_stiffness)
    # past separation (P (1 - C) > F_i) the bolt carries all of P
    r = results[0]
    heavy = dataclasses.replace(r, spec=dataclasses.replace(r.spec, load_max=3 * r.preload))
    p = joint_diagram_points(heavy)
    assert p["separating"] and p["bolt_force"] == pytest.approx(3 * r.preload) and p["member_force"] == 0.0


def test_criterion_curves():
    Se, Sut, Sp, Sy = 162.0, 1040.0, 830.0, 940.0   # ISO 898-1 class 10.9, Shigley Table 8-17 (from memory)
    for crit, S in (("goodman", Sut), ("gerber", Sut), ("asme-elliptic", Sp), ("soderberg", Sy)):
        xs, ys = criterion_curve(crit, Se, Sut, Sp, Sy, n=11)
        assert (xs[0], ys[0]) == (0.0, pytest.approx(Se)) and xs[-1] == pytest.approx(S)
        assert ys[-1] == pytest.approx(0.0, abs=1e-9)
    # at the same mean stress, Soderberg <= Goodman <= Gerber (mathematics, S_y < S_ut)
    sm = 400.0
    def at(crit):
        xs, ys = criterion_curve(crit, Se, Sut, Sp, Sy, n=20001)
        return ys[min(range(len(xs)), key=lambda i: abs(xs[i] - sm))]
    assert at("soderberg") <= at("goodman") <= at("gerber")
    # ASME ellipse at S_m = S_p/2: S_a = S_e sqrt(3)/2 (mathematics)
    xs, ys = criterion_curve("asme-elliptic", Se, Sut, Sp, Sy, n=3)
    assert ys[1] == pytest.approx(Se * math.sqrt(3) / 2)


@pytest.mark.parametrize("criterion", ["goodman", "gerber", "asme-elliptic", "soderberg"])
def test_fatigue_diagram_for_each_criterion(results, criterion):
    r = results[0]
    r = dataclasses.replace(r, fatigue_criterion=criterion)
    svg = fatigue_diagram_svg(r)
    root = ET.fromstring(svg)
    text = " ".join(t.text or "" for t in root.iter("{http://www.w3.org/2000/svg}text"))
    name = {"goodman": "Goodman line", "gerber": "Gerber parabola", "asme-elliptic": "ASME ellipse",
            "soderberg": "Soderberg line"}[criterion]
    assert name in text and "operating point" in text


def test_section_drawing_names_layers_and_hardware(results):
    for r, expect in zip(results, (["bracket: steel", "frame rail: steel", "nut"],
                                   ["cover: aluminium", "gearbox: cast iron", "(tapped)"],
                                   ["washer", "skid beam: steel", "pump foot: steel", "nut"])):
        root = ET.fromstring(section_svg(r))
        text = " ".join(t.text or "" for t in root.iter("{http://www.w3.org/2000/svg}text"))
        for word in expect:
            assert word in text, (r.id, word)
        if r.spec.tapped:
            assert "nut" not in text.split()   # a cap screw in a tapped part has no nut


def test_unloaded_joint_renders(results):
    # no external load: factors unbounded (None), sigma_a = 0, n_f None
    r = results[0]
    quiet = dataclasses.replace(r, spec=dataclasses.replace(r.spec, load_max=0.0), sigma_a=0.0,
                                sigma_m=r.sigma_i, n_f=None,
                                factors={"yield": 1.333, "load": None, "separation": None, "fatigue": None})
    doc = html_report([quiet], title="quiet")
    assert "unbounded" in doc
    for svg in svgs(doc):
        ET.fromstring(svg)


def test_engine_result_renders():
    # a joint through the textbook engine, when it is present in the tree
    from geomjoint.mechanics.checks import evaluate

    spec = sample_results()[0].spec
    r = evaluate(dataclasses.replace(spec, fatigue=FatigueSpec(criterion="goodman")))
    doc = html_report([r], title="engine")
    row = table_rows(doc, "joints-table")[0]
    assert float(row[4][0]["data-value"]) == r.preload
    assert row[3][1] == f"{r.joint_constant:.3f}"
    # the engine's preload is 75 % of the proof load here: 0.75 * 84.3 * 830 N (ISO 898-1 class 10.9)
    assert r.preload == pytest.approx(0.75 * 84.3 * 830.0)
    for svg in svgs(doc):
        ET.fromstring(svg)


def test_vdi_and_clipped_cone_details_render(results):
    # what the pipeline leaves for a VDI joint with a geometry-clipped cone
    r = results[0]
    k = r.member_stiffness
    chain = vdi_chain(dataclasses.replace(r.spec, method="vdi", vdi=VdiSpec()))
    vdi = dataclasses.replace(r, fatigue_criterion="vdi", vdi=chain,
                              cone=ConeStiffness(stiffness=k, ideal_stiffness=1.25 * k, area_fraction_mid_grip=0.8,
                                                 area_mid_grip=100.0, lost_to_edges=0.2, lost_to_neighbours=0.0),
                              Se=52.0, n_f=52.0 / r.sigma_a)
    doc = html_report([vdi], title="vdi")
    for svg in svgs(doc):
        ET.fromstring(svg)
    assert "VDI 2230 endurance limit" in doc and "R9" in doc
    assert "cone area kept at mid-grip: 80 %" in doc
    assert "Pressure cone clipped by the parts" in doc
    # what the HTML shows, results.json has too (one record read by both)
    joint = result_document([vdi], "t")["joints"][0]
    assert joint["vdi"]["sigma_AS"] == chain.sigma_AS and joint["vdi"]["F_M_zul"] == chain.F_M_zul
    from geomjoint.report.html import VDI_LABELS

    assert f'<th scope="row">{html.escape(VDI_LABELS.get("F_M_zul", "F_M_zul"), quote=False)}</th>' in doc
    assert joint["stiffness"]["cone"]["area_fraction_mid_grip"] == 0.8
    # the flat VDI line: sigma_a = sigma_AS for every mean stress up to S_p (VDI 2230-1:2015 R9, from memory)
    xs, ys = criterion_curve("vdi", 52.0, 1040.0, 830.0, 940.0, n=5)
    assert ys == [52.0] * 5 and xs[-1] == 830.0


def test_check_without_a_number_is_not_called_unbounded(results):
    # a geometry check (stack-up) has no value and no requirement; failing, it governs
    r = results[0]
    bad = dataclasses.replace(r, verdict="fail", ok=False, governing="stack-up",
                              checks=r.checks + [Check("stack-up", None, None, False, "holes 1.2 mm off axis")])
    doc = html_report([bad], title="stack-up")
    assert "stack-up (fails: holes 1.2 mm off axis)" in doc
    assert "unbounded against" not in doc
    row = re.search(r'<th scope="row">stack-up</th><td class="num">([^<]*)</td><td class="num">([^<]*)</td>'
                    r'<td class="bad">FAILS</td>', doc)
    assert row and row.group(1) == "–" and row.group(2) == "–"


def test_empty_report_still_has_caution_and_counts():
    doc = html_report([], title="no joints found")
    assert doc.count(html.escape(CAUTION)) == 2
    assert '<b id="count-joints">0</b>' in doc and svgs(doc) == []
