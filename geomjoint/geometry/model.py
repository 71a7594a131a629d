"""Reading a CAD model into plain parts: name, located solid, colour, material hint.

A STEP file (AP203 / AP214 / AP242) is read through OCP's XCAF reader, so part
names, instance placements and colours survive.  Each part is named by its product name
(the part definition, e.g. "M3x10 BHCS" or "Hotend mount"), with an instance number where
one product is placed several times ("foot", "foot#2"); where the file gives the product
no usable name, the instance name is used, then the nearest named assembly.  Reader checks
that leave the geometry as it is (a ``$`` where a name string belongs) become one info
finding naming the file's own ``#id``; a file the kernel cannot transfer, or that loses
solids, is refused (exit 2) naming the file.  The document's length unit is set to millimetres
before the transfer, so a file written in inches or metres comes back in mm.
An in-memory cadquery Assembly, Workplane or Shape goes through the same path
(an Assembly is converted to an XCAF document first); a build123d object (or anything
holding an OCP shape in ``.wrapped``) is read from that shape, its children by their
``label``.
"""
from __future__ import annotations

import contextlib
import math
import os
import re
import sys
from dataclasses import dataclass, field
from typing import Any

from OCP.IFSelect import IFSelect_RetDone
from OCP.Quantity import Quantity_Color
from OCP.STEPCAFControl import STEPCAFControl_Reader
from OCP.TCollection import TCollection_ExtendedString
from OCP.TDataStd import TDataStd_Name
from OCP.TDF import TDF_Label, TDF_LabelSequence
from OCP.TDocStd import TDocStd_Document
from OCP.TopLoc import TopLoc_Location
from OCP.TopoDS import TopoDS_Shape
from OCP.UnitsMethods import UnitsMethods_LengthUnit_Millimeter
from OCP.XCAFDoc import (
    XCAFDoc_ColorGen,
    XCAFDoc_ColorSurf,
    XCAFDoc_ColorTool,
    XCAFDoc_DocumentTool,
    XCAFDoc_ShapeTool,
)

from geomjoint import limits, supervision
from geomjoint.geometry import topology
from geomjoint.geometry.stacks import Finding
from geomjoint.errors import InputError

#: names that say nothing about a part: OCCT's placeholder for an unnamed label
#: ("=>[0:1:1:8]"), the writer's occurrence ids ("NAUO12", "NAUO-3"), a bare number, and the
#: shape-type words some writers (and the kernel) put where a part name belongs
_PLACEHOLDER_NAME = re.compile(r"^(=>\[[0-9:]+\]|NAUO[-_]?\d*|\d+|SOLID|SHELL|COMPOUND|COMPSOLID|"
                               r"Open CASCADE STEP translator.*|Shape|UNKNOWN|none)$", re.I)

#: reader checks that leave the geometry unchanged: a name, description or id given as ``$``
#: (unset) where the schema wants a string (written so by several STEP writers)
#: entity ids named in the one finding on such remarks (the rest are counted)
MAX_IDS_NAMED = 8
_BENIGN_CHECK = re.compile(r"^Parameter n\d+\.\d+ \((?:\w+\.)?(?:name|description|id)\) not a quoted String$")
#: a conversion-based unit (DEGREE, INCH) written with NAMED_UNIT(*): the schema derives no
#: dimensions there, so the reader complains, but it takes the conversion factor all the same
#: (a countersink cone in degrees reads to the same volume as in radians: tests)
_BENIGN_UNIT_CHECK = re.compile(r"^Parameter n\d+\.\d+ \(dimensions\) not an Entity$")
#: presentation entities (saved views, annotation, styles: OCCT's StepVisual classes) carry
#: no solid; one with an item of a type the reader does not know loses a view or a colour
_PRESENTATION_CLASS = "StepVisual_"
#: what each kind of remark says in the one finding
_REMARKS = {"name": "'$' where a name string belongs",
            "unit": "a conversion-based unit written with NAMED_UNIT(*)",
            "presentation": "a presentation item (saved view, annotation) of a type the reader does not know",
            "solid angle": "a solid-angle unit the reader cannot parse (no geometry uses it)"}
#: the solid-angle unit (steradian) is part of every unit context, but no shape entity has
#: a solid-angle parameter: one the reader cannot parse changes nothing
_SOLID_ANGLE_CLASS = "SolidAngleUnit"

#: words in a part or colour name that hint at a material (common practice in part naming);
#: order matters: the first match wins, so "cast iron" is tested before "iron"
MATERIAL_WORDS: tuple[tuple[str, str], ...] = (
    ("stainless", "stainless steel"),
    ("inox", "stainless steel"),
    ("cast_alu", "cast aluminium"),
    ("castalu", "cast aluminium"),
    ("alum", "aluminium"),
    ("alu", "aluminium"),
    ("cast_iron", "gray cast iron"),
    ("castiron", "gray cast iron"),
    ("ductile", "ductile iron"),
    ("housing_cast", "gray cast iron"),
    ("titanium", "titanium"),
    ("bronze", "bronze"),
    ("brass", "copper alloy"),
    ("copper", "copper alloy"),
    ("steel", "steel"),
)
#: plastics named in a part name as whole words (short words such as "PLA" are part of
#: other words: "plate"); the catalog's names
PLASTIC_WORDS = re.compile(r"(?<![a-z0-9])(pla|petg|abs|pa6|pa66|nylon|pom|acetal|polycarbonate|pmma|acrylic)(?![a-z])")
_PLASTIC_NAMES = {"pla": "PLA", "petg": "PETG", "abs": "ABS", "pa6": "PA6", "pa66": "PA66", "nylon": "PA6",
                  "pom": "POM", "acetal": "POM", "polycarbonate": "PC", "pmma": "PMMA", "acrylic": "PMMA"}


@dataclass
class Part:
    """One placed solid of the model (an instance; mm, model coordinates)."""

    name: str                           # unique per instance: "foot", "foot#2"
    solid: TopoDS_Shape = field(repr=False, compare=False)  # located solid
    colour: tuple[float, float, float] | None = None          # linear RGB 0..1 as OCCT stores it (Quantity_Color)
    colour_name: str | None = None      # OCCT's nearest named colour, e.g. "GRAY"
    material_hint: str | None = None    # from the name or the colour name
    product: str | None = None          # name of the part definition (shared by instances)
    instance: str | None = None         # the file's own name of this placement ("NAUO12", "bolt:3")
    surface_body: bool = False          # made a solid from a closed surface body (shells, no solid)

    @property
    def aliases(self) -> tuple[str, ...]:
        """Other names the part is known by in the file (instance and product), for globs."""
        return tuple(n for n in dict.fromkeys((self.instance, self.product)) if n and n != self.name)


@dataclass
class Model:
    """The parts of a model, in file order."""

    source: str                          # file path or "<memory>"
    parts: list[Part]
    file_unit: str | None = None         # length unit the file was written in: "mm", "inch", "m", ...
    findings: list[Finding] = field(default_factory=list)   # the reader's remarks on the file as a whole

    def part(self, name: str) -> Part:
        for p in self.parts:
            if p.name == name:
                return p
        for p in self.parts:
            if name in p.aliases:
                return p
        raise InputError(f"no part named {name!r} in the model", where=self.source)


def material_hint(*names: str | None) -> str | None:
    """A material name hinted at by a part or colour name ("adapter_plate_alu" -> "aluminium").

    >>> material_hint("adapter_plate_alu"), material_hint("Hotend mount PETG"), material_hint("base plate")
    ('aluminium', 'PETG', None)
    """
    for n in names:
        if not n:
            continue
        # OCCT colour names such as "LIGHTSTEELBLUE" say nothing about steel
        low = re.sub(r"[\s\-]+", "_", n.lower()).replace("steelblue", "")
        for word, mat in MATERIAL_WORDS:
            if word in low:
                return mat
        m = PLASTIC_WORDS.search(low.replace("_", " "))
        if m:
            return _PLASTIC_NAMES[m.group(1)]
    return None


def _label_name(label: TDF_Label) -> str | None:
    # check first: FindAttribute on a label without the attribute crashes the binding
    if label.IsNull() or not label.IsAttribute(TDataStd_Name.GetID_s()):
        return None
    attr = TDataStd_Name()
    if label.FindAttribute(TDataStd_Name.GetID_s(), attr):
        text = attr.Get().ToExtString().strip()
        return text or None
    return None


def readable(name: str | None) -> str | None:
    """``name`` if it names a part, None for a placeholder ("=>[0:1:1:8]", "NAUO3", "SOLID").

    >>> readable("M3x10 BHCS"), readable("NAUO12"), readable("=>[0:1:1:8]"), readable(" ")
    ('M3x10 BHCS', None, None, None)
    """
    if name is None:
        return None
    name = name.strip()
    if not name or _PLACEHOLDER_NAME.match(name):
        return None
    return name


def _label_colour(*labels: TDF_Label) -> Quantity_Color | None:
    for lab in labels:
        for kind in (XCAFDoc_ColorSurf, XCAFDoc_ColorGen):
            col = Quantity_Color()
            if XCAFDoc_ColorTool.GetColor_s(lab, kind, col):
                return col
    return None


def _shape_colour(tool: XCAFDoc_ColorTool, shape: TopoDS_Shape) -> Quantity_Color | None:
    for kind in (XCAFDoc_ColorSurf, XCAFDoc_ColorGen):
        col = Quantity_Color()
        if tool.GetColor(shape, kind, col):
            return col
    return None


def _solids(shape: TopoDS_Shape) -> list[TopoDS_Shape]:
    return list(topology.solids(shape))


@dataclass
class _Raw:
    """One located solid as the walk found it, before names are made unique."""

    name: str
    solid: TopoDS_Shape
    colour: Quantity_Color | None
    product: str | None
    instance: str | None
    surface_body: bool = False


class _Collector:
    """Walks an XCAF document and collects located solids with names and colours."""

    def __init__(self, doc: TDocStd_Document):
        self.doc = doc
        self.colours = XCAFDoc_DocumentTool.ColorTool_s(doc.Main())
        self.raw: list[_Raw] = []
        self.open_bodies: list[str] = []      # surface bodies that do not close (not read)
        self.closed_bodies: list[str] = []    # surface bodies made solids
        self._surface_cache: dict[int, tuple[list[TopoDS_Shape], bool]] = {}

    def run(self) -> None:
        shapes = XCAFDoc_DocumentTool.ShapeTool_s(self.doc.Main())
        free = TDF_LabelSequence()
        shapes.GetFreeShapes(free)
        for i in range(1, free.Length() + 1):
            lab = free.Value(i)
            self._walk(lab, TopLoc_Location(), readable(_label_name(lab)) or "part", None, None, None)

    def _walk(self, label: TDF_Label, loc: TopLoc_Location, name: str,
              colour: Quantity_Color | None, instance: str | None, product: str | None) -> None:
        if XCAFDoc_ShapeTool.IsAssembly_s(label):
            comps = TDF_LabelSequence()
            XCAFDoc_ShapeTool.GetComponents_s(label, comps)
            for i in range(1, comps.Length() + 1):
                comp = comps.Value(i)
                ref = TDF_Label()
                if not XCAFDoc_ShapeTool.GetReferredShape_s(comp, ref):
                    ref = comp
                inst, prod = _label_name(comp), _label_name(ref)
                # the product name reads best ("M5x25 DIN912"); the instance name where the
                # product has none; the enclosing assembly's where neither says anything
                # (a part written as an assembly of one "SOLID")
                cname = readable(prod) or readable(inst) or name
                ccol = _label_colour(comp, ref) or colour
                cinst = readable(inst) and inst or instance
                cprod = readable(prod) and prod or product
                self._walk(ref, loc.Multiplied(XCAFDoc_ShapeTool.GetLocation_s(comp)), cname, ccol, cinst, cprod)
            return
        shape = XCAFDoc_ShapeTool.GetShape_s(label)
        own = _label_name(label)
        product = readable(own) and own or product
        col = _label_colour(label) or colour
        solids = _solids(shape)
        from_surface = False
        if not solids and not shape.IsNull():
            key = hash(shape.Located(TopLoc_Location()))
            if key not in self._surface_cache:
                self._surface_cache[key] = solids_of_surface_body(shape)
            solids, left_open = self._surface_cache[key]
            from_surface = bool(solids)
            if solids and name not in self.closed_bodies:
                self.closed_bodies.append(name)
            if left_open and name not in self.open_bodies:
                self.open_bodies.append(name)
        for solid in solids:
            scol = _shape_colour(self.colours, solid) or col
            located = solid.Moved(loc) if not loc.IsIdentity() else solid
            self.raw.append(_Raw(name, located, scol, product, instance, from_surface))


#: the faces of a surface body are sewn with this tolerance, mm: above the gaps CAD writers
#: leave between the faces of one body (1e-6 to 1e-3 mm), far below any feature of a part
SEWING_TOL = 1e-2
#: surface bodies with more faces than this are not sewn (sewing grows faster than the face
#: count; a fastener or a bracket has tens to hundreds): they are reported as not read
MAX_SURFACE_BODY_FACES = 5000


def solids_of_surface_body(shape: TopoDS_Shape) -> tuple[list[TopoDS_Shape], bool]:
    """A shape with faces but no solid (a surface body: shells, as some fastener libraries
    export screws): its faces sewn, each closed shell made a solid (outward oriented).
    Returns the solids and whether some surface stayed open (then it is no part)."""
    from OCP.BRep import BRep_Tool
    from OCP.BRepBuilderAPI import BRepBuilderAPI_Sewing
    from OCP.BRepGProp import BRepGProp
    from OCP.GProp import GProp_GProps
    from OCP.ShapeFix import ShapeFix_Solid

    faces = list(topology.faces(shape))
    if not faces:
        return [], False
    if len(faces) > MAX_SURFACE_BODY_FACES:
        return [], True
    sewing = BRepBuilderAPI_Sewing(SEWING_TOL)
    for f in faces:
        sewing.Add(f)
    sewing.Perform()
    sewn = sewing.SewedShape()
    shells = list(topology.shells(sewn))
    solids: list[TopoDS_Shape] = []
    left_open = not shells
    for shell in shells:
        if not BRep_Tool.IsClosed_s(shell):
            left_open = True
            continue
        solid = ShapeFix_Solid().SolidFromShell(shell)
        props = GProp_GProps()
        BRepGProp.VolumeProperties_s(solid, props)
        if props.Mass() <= 0:
            left_open = True
            continue
        solids.append(solid)
    return solids, left_open


def _instance_names_win(raw: list[_Raw]) -> None:
    """Name by instance where one product is placed several times under names of the user's own.

    A product placed several times is named by the product plus an instance number
    ("bracket", "bracket#2"), unless every placement has a readable instance name of its
    own, different from the others and not the product name with a suffix ("bolt v1:2",
    "Part1.2"): names a user gave each placement (a script's "screw_left", "screw_right")
    say more than a number.
    """
    placements: dict[str, list[_Raw]] = {}
    for r in raw:
        if r.product and r.name == r.product:
            placements.setdefault(r.product, []).append(r)
    for product, rs in placements.items():
        names = [r.instance for r in rs]
        if len(rs) < 2 or not all(names) or len(set(names)) < len(names):
            continue
        if any(n != product and n.lower().startswith(product.lower()) for n in names):
            continue
        for r in rs:
            r.name = r.instance


#: a B-spline face is taken for the plane, cylinder or cone it fits within this, mm
ANALYTIC_FIT_TOL = 1e-5


def analytic_faces(solid: TopoDS_Shape) -> TopoDS_Shape:
    """The solid with each B-spline face that is a plane, cylinder or cone (within
    ANALYTIC_FIT_TOL) rebuilt on that surface; the solid itself when none is.

    Some writers export every curved face as a B-spline (Open CASCADE 6.1's AP214 writes
    the bolt holes of its sample assembly so; Rhino writes planes so): holes, heads and
    bearing faces are read from cylinders, cones and planes, so such a face is read as the
    surface it is.  Faces that fit none (threads, fillets, free forms) are left as drawn.
    """
    from OCP.BRep import BRep_Tool
    from OCP.BRepAdaptor import BRepAdaptor_Surface
    from OCP.BRepBuilderAPI import BRepBuilderAPI_MakeFace
    from OCP.BRepTools import BRepTools, BRepTools_ReShape
    from OCP.GeomAbs import GeomAbs_BSplineSurface, GeomAbs_BezierSurface, GeomAbs_Cone, GeomAbs_Cylinder, GeomAbs_Plane
    from OCP.GeomAdaptor import GeomAdaptor_Surface
    from OCP.GeomConvert import GeomConvert_SurfToAnaSurf
    from OCP.ShapeFix import ShapeFix_Face, ShapeFix_Shape

    reshape = BRepTools_ReShape()
    changed = False
    for face in topology.faces(solid):
        if BRepAdaptor_Surface(face, False).GetType() not in (GeomAbs_BSplineSurface, GeomAbs_BezierSurface):
            continue
        surface = GeomConvert_SurfToAnaSurf(BRep_Tool.Surface_s(face)).ConvertToAnalytical(ANALYTIC_FIT_TOL)
        if surface is None or GeomAdaptor_Surface(surface).GetType() not in (GeomAbs_Plane, GeomAbs_Cylinder, GeomAbs_Cone):
            continue
        outer = BRepTools.OuterWire_s(face)
        made = BRepBuilderAPI_MakeFace(surface, outer, True)
        if not made.IsDone():
            continue
        for wire in topology.wires(face):    # the holes of a planar face stay holes
            if not wire.IsSame(outer):
                made.Add(wire)
        fix = ShapeFix_Face(made.Face())
        fix.Perform()                        # the wire's curves on the new surface
        reshape.Replace(face, fix.Face())
        changed = True
    if not changed:
        return solid
    fixed = ShapeFix_Shape(reshape.Apply(solid))
    fixed.Perform()                          # faces oriented with the solid's material
    return fixed.Shape()


def _analytic(raw: list[_Raw]) -> None:
    """Each part's B-spline planes, cylinders and cones read as such (analytic_faces), once
    per shape: the placements of one definition share the result."""
    done: list[tuple[TopoDS_Shape, TopoDS_Shape]] = []
    for r in raw:
        base = r.solid.Located(TopLoc_Location())
        twin = next((new for old, new in done if old.IsPartner(base)), None)
        if twin is None:
            twin = analytic_faces(base)
            done.append((base, twin))
        if twin is not base:
            r.solid = twin.Located(r.solid.Location())


def _unique_parts(raw: list[_Raw]) -> list[Part]:
    _instance_names_win(raw)
    _analytic(raw)
    seen: dict[str, int] = {}
    parts = []
    for r in raw:
        name, col = r.name, r.colour
        seen[name] = seen.get(name, 0) + 1
        uname = name if seen[name] == 1 else f"{name}#{seen[name]}"
        rgb = cname = None
        if col is not None:
            rgb = (round(col.Red(), 4), round(col.Green(), 4), round(col.Blue(), 4))
            cname = Quantity_Color.StringName_s(col.Name())
        parts.append(Part(name=uname, solid=r.solid, colour=rgb, colour_name=cname,
                          material_hint=material_hint(name, r.product, r.instance, cname), product=r.product,
                          instance=r.instance, surface_body=r.surface_body))
    # a later duplicate may collide with an earlier literal "x#2": make names unique anyway
    names: set[str] = set()
    for p in parts:
        base, k = p.name, 2
        while p.name in names:
            p.name = f"{base}~{k}"
            k += 1
        names.add(p.name)
    return parts


@contextlib.contextmanager
def quiet_stdout():
    """Silence C++ writes to file descriptor 1 (OCCT prints transfer statistics there).

    ``geomjoint check --json`` promises JSON alone on stdout, so the kernel's chatter
    must not reach it.
    """
    sys.stdout.flush()
    saved = os.dup(1)
    try:
        with open(os.devnull, "wb") as sink:
            os.dup2(sink.fileno(), 1)
            try:
                yield
            finally:
                os.dup2(saved, 1)
    finally:
        os.close(saved)


def _new_doc() -> TDocStd_Document:
    doc = TDocStd_Document(TCollection_ExtendedString("XmlOcaf"))
    # the reader scales the file's length unit to the document's unit: ask for mm
    XCAFDoc_DocumentTool.SetLengthUnit_s(doc, 1.0, UnitsMethods_LengthUnit_Millimeter)
    return doc


#: bytes read from each end of a file for its unit context (writers put the units at the
#: start or at the end of the DATA section)
UNIT_SNIFF_BYTES = 2_000_000
#: names of conversion-based and SI length units -> the short name used here
_UNIT_NAMES = {b"INCH": "inch", b"FOOT": "foot", b"FEET": "foot", b"MILLIMETRE": "mm", b"MILLIMETER": "mm",
               b"CENTIMETRE": "cm", b"CENTIMETER": "cm", b"METRE": "m", b"METER": "m"}
_SI_PREFIX_UNITS = {b".MILLI.": "mm", b".CENTI.": "cm", b"$": "m", b".MICRO.": "um", b".KILO.": "km"}


def _unit_of_statement(stmt: bytes) -> str | None:
    """The length unit one unit entity names, or None when it is no length unit."""
    if b"LENGTH_UNIT" not in stmt:
        return None
    m = re.search(rb"CONVERSION_BASED_UNIT\s*\(\s*'([A-Z ]+)'", stmt)
    if m:
        name = m.group(1).strip()
        return _UNIT_NAMES.get(name, name.decode().lower())
    m = re.search(rb"SI_UNIT\s*\(\s*(?:\*\s*,\s*)?(\.[A-Z]+\.|\$)\s*,\s*\.METRE\.", stmt)
    if m:
        return _SI_PREFIX_UNITS.get(m.group(1), m.group(1).decode().strip(".").lower())
    return None


def step_length_unit(path: str) -> str | None:
    """The length unit of a STEP file's unit context ("mm", "inch", "m", "cm", "foot").

    The unit the GLOBAL_UNIT_ASSIGNED_CONTEXT refers to, else the first length unit: the
    statement that holds LENGTH_UNIT (a DEGREE conversion next to it is the plane-angle
    unit; a complex entity may span lines).
    """
    size = os.path.getsize(path)
    with open(path, "rb") as fh:
        text = fh.read(UNIT_SNIFF_BYTES)
        if size > UNIT_SNIFF_BYTES:
            fh.seek(max(UNIT_SNIFF_BYTES, size - UNIT_SNIFF_BYTES))
            text += b";" + fh.read()
    text = text.upper()
    statements = {m.group(1): m.group(2) for m in re.finditer(rb"#(\d+)\s*=\s*([^;]*);", text)}
    for m in re.finditer(rb"GLOBAL_UNIT_ASSIGNED_CONTEXT\s*\(\s*\(([^)]*)\)", text):
        for ref in re.findall(rb"#(\d+)", m.group(1)):
            unit = _unit_of_statement(statements.get(ref, b""))
            if unit:
                return unit
    for stmt in statements.values():
        unit = _unit_of_statement(stmt)
        if unit:
            return unit
    return None


def _read_step(path: str) -> tuple[list[Part], list[Finding]]:
    limits.check_step_file(path)      # empty, binary, truncated, too big: before the kernel sees it
    reader = STEPCAFControl_Reader()
    reader.SetNameMode(True)
    reader.SetColorMode(True)
    reader.SetLayerMode(False)
    supervision.announce_reading(path)   # a kernel crash from here on names this file
    with quiet_stdout():              # the reader prints its messages on stdout
        if reader.ReadFile(path) != IFSelect_RetDone:
            raise InputError("unreadable STEP file (the reader rejected it)", where=path)
        notes = _check_entities(reader, path)
        doc = _new_doc()
        if not reader.Transfer(doc):
            raise InputError("STEP file could not be transferred to shapes", where=path)
    col = _Collector(doc)
    col.run()
    parts = _unique_parts(col.raw)
    supervision.announce_read()
    _check_transfer(path, parts)
    return parts, notes + surface_body_findings(os.path.basename(path), col.closed_bodies, col.open_bodies)


def surface_body_findings(file: str, closed: list[str], left_open: list[str]) -> list[Finding]:
    """What became of the surface bodies (shells without a solid) of a model: one info finding
    naming those made solids, one warn finding naming those that do not close."""
    out = []
    if closed:
        out.append(Finding("info", "surface-body", f"{file}: read as solids from their closed surfaces: "
                                                   f"{', '.join(closed)}"))
    if left_open:
        out.append(Finding("warn", "surface-body", f"{file}: surface bodies that do not close, not read as parts "
                                                   f"(no joint sees them): {', '.join(left_open)}"))
    return out


def _check_entities(reader: STEPCAFControl_Reader, path: str) -> list[Finding]:
    """Sort the reader's failed checks into remarks and damage.

    A check whose every failure leaves the geometry as it is (``$`` where the schema wants
    a name, description or id; a conversion-based unit written with ``NAMED_UNIT(*)``; a
    presentation entity with an item the reader does not know; a solid-angle unit it
    cannot parse) is a remark: all of them
    together become one info finding naming the file's own ``#id`` of each entity.  The
    transfer is still checked for lost solids afterwards.  Any other failure (a syntax
    error, an entity of the wrong type, an unresolved reference) is a damaged file: the
    first one is named, by its ``#id``, and the file is refused (the reader would otherwise
    skip the entity and quietly lose geometry).
    """
    from OCP.Interface import Interface_CheckStatus

    checks = reader.Reader().WS().ModelCheckList()
    if not checks.Complies(Interface_CheckStatus.Interface_CheckFail):
        return []
    ids: list[int] | None = None

    def file_id(ordinal: int) -> str:
        nonlocal ids
        if ids is None:
            ids = limits.step_entity_ids(path)
        return f"#{ids[ordinal - 1]}" if 0 < ordinal <= len(ids) else f"entity {ordinal} (in file order)"

    benign: dict[str, list[str]] = {}
    checks.Start()
    while checks.More():
        check = checks.Value()
        if check.HasFailed():
            number = checks.Number()
            messages = [str(check.CFail(i)).strip() for i in range(1, check.NbFails() + 1)]
            kind = _remark_kind(check, messages) if number else None
            if kind:
                benign.setdefault(kind, []).append(file_id(number))
            else:
                where = f"entity {file_id(number)}: " if number else ""
                raise InputError(f"damaged STEP file: {where}{messages[0]}", where=path)
        checks.Next()
    if not benign:
        raise InputError("damaged STEP file (the reader found failing entities)", where=path)
    parts = []
    for kind, ids_ in benign.items():
        listed = sorted(set(ids_), key=lambda t: int(t[1:]) if t[1:].isdigit() else 0)
        shown = ", ".join(listed[:MAX_IDS_NAMED]) + (f" and {len(listed) - MAX_IDS_NAMED} more"
                                                      if len(listed) > MAX_IDS_NAMED else "")
        parts.append(f"{len(listed)} entit{'y' if len(listed) == 1 else 'ies'} with {_REMARKS[kind]} ({shown})")
    return [Finding("info", "reader-remark", f"{os.path.basename(path)}: {'; '.join(parts)}; "
                                             f"the geometry is not affected and the model is read")]


def _remark_kind(check, messages: list[str]) -> str | None:
    """The kind of a failed check that leaves the geometry as it is ("name", "unit"), else None."""
    if all(_BENIGN_CHECK.match(m) for m in messages):
        return "name"
    entity = check.Entity()
    kind = entity.DynamicType().Name() if entity is not None else ""
    if "ConversionBasedUnit" in kind and all(_BENIGN_UNIT_CHECK.match(m) for m in messages):
        return "unit"
    if kind.startswith(_PRESENTATION_CLASS):
        return "presentation"
    if _SOLID_ANGLE_CLASS in kind:
        return "solid angle"
    return None


def _check_transfer(path: str, parts: list[Part]) -> None:
    """Every solid entity of the file must arrive as one solid: the reader silently drops a
    solid whose shell is not closed and splits a non-manifold one."""
    expected = limits.count_step_solids(path)
    if expected == 0:
        return  # no solid entities: the caller reports "no solids"
    # instances of one part share one solid: count distinct shapes, placement removed
    distinct = len({hash(p.solid.Located(TopLoc_Location())) for p in parts if not p.surface_body})
    if distinct != expected:
        raise InputError(f"the file has {expected} solid entities but the reader made {distinct} solids of them: "
                         f"a solid whose shell is not closed, or a non-manifold one", where=path)


def _check_size(parts: list[Part], where: str) -> None:
    """Size limits (solids, faces, extent of each part) before any scan work starts."""
    from OCP.Bnd import Bnd_Box
    from OCP.BRepBndLib import BRepBndLib

    faces = sum(1 for part in parts for _ in topology.faces(part.solid))
    limits.check_model_size(len(parts), faces, where)
    for part in parts:
        box = Bnd_Box()
        BRepBndLib.Add_s(part.solid, box)
        if box.IsVoid():
            continue
        x0, y0, z0, x1, y1, z1 = box.Get()
        limits.check_part_extent(part.name, math.dist((x0, y0, z0), (x1, y1, z1)), where)


def _from_memory(obj: Any) -> list[Part]:
    import cadquery as cq
    from cadquery.occ_impl.assembly import toCAF

    if isinstance(obj, cq.Assembly):
        _, doc = toCAF(obj)
        col = _Collector(doc)
        col.run()
        return _unique_parts(col.raw)
    if isinstance(obj, cq.Workplane):
        shapes = [v.wrapped for v in obj.vals() if isinstance(v, cq.Shape)]
    elif isinstance(obj, cq.Shape):
        shapes = [obj.wrapped]
    elif isinstance(obj, TopoDS_Shape):
        shapes = [obj]
    elif _wraps_shape(obj) or (isinstance(obj, (list, tuple)) and obj and all(map(_wraps_shape, obj))):
        # build123d (Part, Compound with children, Solid ...) and any object that exposes
        # its OCP shape as `.wrapped`: labels name the parts, children are placed by their
        # parents' locations
        raw: list[_Raw] = []
        for item in (obj if isinstance(obj, (list, tuple)) else [obj]):
            _walk_wrapped(item, TopLoc_Location(), "solid", raw)
        return _unique_parts(raw)
    else:
        raise InputError(f"cannot read a model from a {type(obj).__name__} (give a STEP file, a cadquery "
                         f"Assembly / Workplane / Shape, or an object with an OCP shape in .wrapped, "
                         f"such as a build123d Part or Compound)", where="<memory>")
    raw = []
    for s in shapes:
        for solid in _solids(s):
            raw.append(_Raw("solid", solid, None, None, None))
    return _unique_parts(raw)


def _wraps_shape(obj: Any) -> bool:
    """True for an object that holds an OCP shape in ``.wrapped`` (build123d, cadquery)."""
    return isinstance(getattr(obj, "wrapped", None), TopoDS_Shape)


def _walk_wrapped(obj: Any, loc: TopLoc_Location, name: str, raw: list[_Raw]) -> None:
    """Collect the solids of a ``.wrapped`` object; a build123d Compound's children in turn."""
    label = readable(getattr(obj, "label", None)) or name
    shape: TopoDS_Shape = obj.wrapped
    children = [c for c in (getattr(obj, "children", None) or ()) if _wraps_shape(c)]
    if children:
        # a child's shape is placed relative to its parent: compose the parent's location
        here = loc.Multiplied(shape.Location())
        for child in children:
            _walk_wrapped(child, here, label, raw)
        return
    located = shape.Moved(loc) if not loc.IsIdentity() else shape
    for solid in _solids(located):
        raw.append(_Raw(label, solid, None, readable(getattr(obj, "label", None)), None))


def load_model(source: Any) -> Model:
    """Read a STEP file (path) or an in-memory model: a cadquery Assembly / Workplane /
    Shape, a build123d Part / Compound (children placed by their parents, labels as part
    names), or any object with an OCP shape in ``.wrapped``.

    Lengths come back in mm whatever the file's unit.  Raises InputError naming the
    file when it is missing, empty, not STEP, truncated, or has no solids.
    """
    unit = None
    notes: list[Finding] = []
    if isinstance(source, (str, os.PathLike)):
        where = os.fspath(source)
        parts, notes = _read_step(where)
        unit = step_length_unit(where)
    else:
        where = "<memory>"
        parts = _from_memory(source)
    if not parts:
        raise InputError("the model has no solids", where=where)
    _check_size(parts, where)
    return Model(source=where, parts=parts, file_unit=unit, findings=notes)

