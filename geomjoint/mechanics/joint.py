"""The plain data that flows into and out of the joint engine.

A :class:`JointSpec` is pure numbers (N, mm, MPa, N*mm, degC): the job reader or the
geometry pipeline resolves designations, materials and defaults before the engine
sees a joint, so the engine never looks anything up by name except standard
fatigue data.  A :class:`JointResult` mirrors the JSON result document of
DESIGN.md field for field.
"""
from __future__ import annotations

from dataclasses import dataclass, field, fields
from typing import TYPE_CHECKING

from geomjoint.catalog.types import Deviation

if TYPE_CHECKING:  # only for the annotation: vdi.py and stackup.py import this module
    from geomjoint.mechanics.stackup import StackupResult
    from geomjoint.mechanics.vdi import VdiResult

#: Young's modulus of bolt steel, MPa (Shigley, 10th ed., Table 8-8: 207 GPa)
BOLT_STEEL_E = 207_000.0

#: the fatigue criteria the engine knows (DESIGN.md job file, result schema)
CRITERIA = ("goodman", "gerber", "asme-elliptic", "soderberg")

#: member-stiffness methods (DESIGN.md job file)
STIFFNESS_METHODS = ("frustum", "exponential", "vdi", "cone", "fe")


@dataclass(frozen=True)
class LayerSpec:
    """One clamped layer, in order from the head side."""

    thickness: float                # mm, > 0
    E: float                        # MPa
    poisson: float = 0.3
    material: str = "steel"
    part: str | None = None         # part name in the model, None when typed in
    role: str = "member"            # "member" | "washer" | "tapped"
    yield_strength: float | None = None    # MPa
    tensile_strength: float | None = None  # MPa (internal-thread stripping in a tapped part)
    limiting_pressure: float | None = None  # p_G, MPa
    thermal_expansion: float | None = None  # 1/K
    wileman: tuple[float, float] | None = None  # (A, B) of Wileman et al. (1991)


@dataclass(frozen=True)
class InsertSpec:
    """A threaded or heat-set insert that holds the screw's thread (the tapped layer is the
    insert), and the part it sits in, mm and MPa."""

    part: str                       # the insert
    host: str                       # the part it sits in
    host_material: str
    host_tensile: float | None      # R_m of the host, MPa (None: not known, pull-out not checked)
    outer_diameter: float           # D_o of the insert, mm
    length: float                   # L of the insert in its host, mm
    kind: str = "insert"            # "insert" | "wire insert"


@dataclass(frozen=True)
class FastenerSpec:
    """The bolt or cap screw, resolved to numbers."""

    designation: str                # "M12", "1/2-13 UNC"
    system: str                     # "metric" | "inch"
    d: float                        # nominal diameter, mm
    pitch: float                    # mm
    d2: float                       # basic pitch diameter, mm
    d3: float                       # minor diameter of the external thread, mm
    D1: float                       # minor diameter of the internal thread, mm
    stress_area: float              # A_s (A_t), mm^2
    grade: str                      # "10.9", "SAE 5"
    proof: float                    # S_p, MPa
    yield_strength: float           # S_y, MPa
    tensile: float                  # S_ut, MPa
    length: float | None = None     # L, mm (None: a stud or unknown)
    thread_length: float | None = None  # L_T, mm (None: the standard rule)
    fully_threaded: bool = False
    threads: str = "rolled"         # "rolled" | "cut"
    head: str = "hex"               # a head kind of catalog.HEAD_KINDS ("hex", "socket", "button" ...)
    E: float = BOLT_STEEL_E
    thermal_expansion: float = 11.5e-6  # 1/K, carbon steel (from memory)
    rolled_after_heat_treatment: bool = False


@dataclass(frozen=True)
class PreloadSpec:
    """How the preload is set."""

    mode: str                       # "proof_fraction" | "force" | "torque" | "none"
    value: float                    # fraction of proof load, N, or N*mm
    nut_factor: float | None = None  # K in T = K*F*d; None: use the friction pair
    friction_thread: float | None = None  # mu_G
    friction_head: float | None = None    # mu_K
    scatter: float = 1.0            # tightening factor alpha_A = F_max / F_min >= 1


#: reference temperature of the material data and the default assembly and service
#: temperature, degC (ISO 1:2016 standard reference temperature)
ROOM_TEMPERATURE = 20.0


@dataclass(frozen=True)
class FatigueSpec:
    criterion: str = "goodman"
    reliability: float = 0.99
    surface: str = "machined"       # Shigley Table 6-2 finish
    temperature: float = ROOM_TEMPERATURE  # service temperature, degC (Marin k_d)
    endurance: str = "auto"         # "auto" (Table 8-17 where it applies) | "table" | "marin"
    Se: float | None = None         # explicit endurance limit, MPa


@dataclass(frozen=True)
class VdiSpec:
    """Inputs the VDI 2230-1 chain needs beyond the textbook engine."""

    friction_thread: float = 0.12   # mu_G
    friction_head: float = 0.12     # mu_K
    friction_interface: float = 0.15  # mu_T (slip)
    scatter: float = 1.6            # alpha_A
    clamp_required: float = 0.0     # F_K,req, N
    roughness: str = "medium"       # class of mechanics.vdi.RZ_BANDS_UM: "fine" | "medium" | "coarse"
    load_introduction: float = 0.5  # n
    utilisation: float = 0.9        # nu
    interfaces_shear: int = 1       # q_F
    temperature_assembly: float = ROOM_TEMPERATURE  # degC
    temperature_service: float = ROOM_TEMPERATURE   # degC


#: how the stack-up limits decide a joint (job key ``stackup_method``)
STACKUP_METHODS = ("worst-case", "statistical")


@dataclass(frozen=True)
class StackupSpec:
    """The tolerances of a joint's stack, resolved to numbers (mm), for mechanics.stackup.

    ``thickness`` and ``thickness_rule`` run over ``JointSpec.layers`` (a tapped layer's is the
    depth of its tapped hole); ``positions`` gives each layer's hole position tolerance (the
    diameter of its zone, None: not toleranced); ``holes`` and ``offsets`` the diameter of each
    layer's hole and its axis offset from the joint axis where the model measured them (empty:
    the joint's one hole diameter, no offset).
    """

    thickness: tuple[Deviation, ...]
    thickness_rule: tuple[str, ...]         # per layer: "ISO 2768-1 m", "job", "EN 10029 A", "ISO 7089" ...
    length: Deviation                       # of the bolt length
    nut_height: Deviation | None = None     # of the nut height (through joints)
    method: str = "worst-case"              # which limits decide: STACKUP_METHODS
    positions: tuple[float | None, ...] = ()
    projected: bool = False                 # the fixed fastener's tolerance zone is projected
    holes: tuple[float, ...] = ()
    offsets: tuple[float, ...] = ()


@dataclass(frozen=True)
class JointSpec:
    """One bolted joint as pure numbers."""

    id: str
    fastener: FastenerSpec
    layers: tuple[LayerSpec, ...]
    bearing_diameter: float         # d_w on the head side (head or washer), mm
    hole_diameter: float            # clearance hole d_h, mm
    far_bearing_diameter: float | None = None  # nut side; None: same as head side
    tapped: bool = False            # True: the last layer is the threaded one
    outside_diameter: float | None = None  # D_A' bounding the members, mm
    method: str = "textbook"        # "textbook" (Shigley ch. 8) | "vdi" (VDI 2230-1 chain)
    member_stiffness: str = "frustum"
    cone_angle: float = 30.0        # deg
    members_value: float | None = None  # k_m computed outside (cone / FE), N/mm
    fe_bearing: str = "rigid"       # FE bearing model: "rigid" | "pressure"
    compare_stiffness: bool = False  # report every member-stiffness method side by side
    preload: PreloadSpec = field(default_factory=lambda: PreloadSpec("proof_fraction", 0.75))
    load_min: float = 0.0           # external axial load per bolt, N
    load_max: float = 0.0
    shear: float = 0.0              # transverse load per bolt, N
    fatigue: FatigueSpec = field(default_factory=FatigueSpec)
    vdi: VdiSpec | None = None
    engagement: float | None = None  # engaged thread length (nut height or tapped depth), mm
    nut_height: float | None = None  # m of the nut, mm (through joints)
    gaps: float = 0.0                # open gaps between layers in the model, mm (they lengthen the bolt's path)
    required: dict[str, float] = field(default_factory=dict)  # check name -> required factor
    notes: tuple[str, ...] = ()
    # where the bearing and hole diameters came from: "job" | "model" | "catalogue"
    bearing_source: str = "catalogue"
    far_bearing_source: str | None = None   # None: a tapped joint (no nut face)
    hole_source: str = "catalogue"
    loaded: bool = True              # False: no load of the job reaches the joint (no service load)
    require_load: bool = False       # the job's require_loads: an unloaded joint fails
    thread_method: str = "tapped"    # a tapped joint's internal thread: "tapped" | "insert" | "thread-forming"
    insert: InsertSpec | None = None  # the insert that is the tapped layer, and its host
    stackup: StackupSpec | None = None  # the stack's tolerances (None: the stack-up is not checked)

    @property
    def grip(self) -> float:
        """Sum of the layer thicknesses, mm (for a tapped joint the last layer is the tapped depth)."""
        return float(sum(layer.thickness for layer in self.layers))

    @property
    def clamped_thickness(self) -> float:
        """Thickness clamped above the tapped part (all layers for a through joint), mm."""
        layers = self.layers[:-1] if self.tapped else self.layers
        return float(sum(layer.thickness for layer in layers))


@dataclass(frozen=True)
class Check:
    name: str
    value: float | None
    required: float | None
    ok: bool
    note: str = ""


#: what the member stiffness of a tapped joint spans, everywhere (docs/tapped_stiffness.md)
TAPPED_MEMBER_DEFINITION = ("clamped layers only: head (washer) bearing face to the interface "
                            "with the tapped part")


@dataclass(frozen=True)
class StiffnessSplit:
    """Where a tapped joint's stiffness definition put the engaged-thread region (docs/tapped_stiffness.md).

    The member is the clamped layers (``member``); the engaged screw thread and the tapped
    part from the interface to its thread flanks are in series with the bolt, so they are
    part of ``JointResult.bolt_stiffness``.
    """

    member: str                 # what k_m spans, in words
    thread_region: str          # the side that carries the engaged-thread compliance: "bolt"
    screw_thread: float         # compliance of the engaged screw thread inside k_b, mm/N
    tapped_part: float          # compliance of the tapped part (interface to thread flanks) inside k_b, mm/N
    model: str                  # how those two compliances were computed


@dataclass(frozen=True)
class FitBias:
    """A member-stiffness method known to read high on this kind of joint, named in the reports.

    Today one case: the exponential (Wileman) fit on a tapped joint (docs/tapped_stiffness.md,
    "Agreement"): a fit of through joints with d_w = 1.5 d that knows neither the bearing nor
    the hole diameter.
    """

    method: str                 # the biased method ("exponential")
    role: str                   # "chosen" (the joint's k_m) | "compared" (in the side-by-side table only)
    reference: str              # the method this joint's deviation is measured against ("vdi")
    deviation: float            # k_m(method) / k_m(reference) - 1 on this joint
    documented_low: float       # k_m(method) / k_m(FE) - 1, least over the documented tapped cases
    documented_high: float      # the same, largest
    message: str                # the sentence the reports show


@dataclass(frozen=True)
class MethodDeviation:
    """One member-stiffness method of a tapped joint against the joint's reference value."""

    method: str                 # frustum | vdi | cone | fe
    stiffness: float            # k_m by this method, N/mm
    deviation: float            # stiffness / reference stiffness - 1
    outside: bool               # |deviation| > the limit
    reason: str                 # why this method departs (docs/tapped_stiffness.md); "" when inside


@dataclass(frozen=True)
class MethodSpread:
    """How far a tapped joint's own member-stiffness methods lie from its reference value.

    The reference is the FE where it ran for this joint (the comparison of
    docs/tapped_stiffness.md measures the closed forms against it), else the joint's chosen
    method (the VDI 2230-1 body when the chosen is the exponential fit, whose bias has its own
    record, :class:`FitBias`).  The exponential fit is never listed here.
    """

    reference: str              # the method at the centre: "fe" | the chosen method | "vdi"
    reference_stiffness: float  # its k_m, N/mm
    chosen: str                 # the joint's member-stiffness method
    limit: float                # the agreement band, fraction (members.METHOD_SPREAD_LIMIT)
    methods: tuple[MethodDeviation, ...]  # every other method computed for the joint
    outside: tuple[str, ...]    # the methods beyond the band (may include the chosen one)
    published_against_fe: float           # largest published |model / FE - 1|, fraction
    published_against_experiments: float  # largest published |model / test - 1|, fraction
    published_source: str
    message: str                # the sentence the reports show ("" when nothing lies outside)


@dataclass(frozen=True)
class Remedy:
    """One suggested change to a failing or marginal joint, re-checked before it is offered."""

    change: str                     # what to change ("bolt length 35 -> 25 mm")
    verdict: str                    # verdict after the change: "pass" | "marginal"; "geometry" for a part fix
    result: str                     # what the re-check says ("pass (least margin: fatigue 1.41)")


@dataclass(frozen=True)
class ConeStiffness:
    """The clipped pressure cone's member stiffness, as plain numbers.

    The geometry layer computes it (geometry.cones.ConeResult); the joint result keeps
    this record so that mechanics and the reports never import the CAD layer.
    """

    stiffness: float                # k_m of the clipped cones, N/mm
    ideal_stiffness: float          # k_m of the unclipped cones, N/mm
    area_fraction_mid_grip: float   # clipped / ideal area at mid-grip
    area_mid_grip: float            # clipped area at mid-grip, mm^2
    lost_to_edges: float            # fraction of the ideal mid-grip area
    lost_to_neighbours: float       # fraction of the ideal mid-grip area
    neighbours: tuple[str, ...] = ()  # joints whose cones were clipped against this one's
    #: per layer (head side first, a tapped part too), where its cone is widest: the clipped and the
    #: ideal cone area, mm^2 (the FE's per-layer outline comes from these)
    layer_areas: tuple[float, ...] = ()
    layer_ideal_areas: tuple[float, ...] = ()


@dataclass(frozen=True)
class FeRun:
    """One axisymmetric FE run of the member stack (mechanics.fe) and the outline it used."""

    stiffness: float                # k_m, N/mm
    outer_diameter: float           # plate diameter used, mm
    mesh_change: float              # |k(refined) - k(coarse)| / k(refined)
    contact_diameters: tuple[float, ...]  # per interface, from the head side, mm
    layer_outer_diameters: tuple[float, ...]  # outside diameter of each modelled layer, mm
    outline: str                    # see OUTLINES: "clipped-cone" if any layer's is, else the layers' one
    #: tapped joint: compliance of the tapped part from the interface to its thread flanks, on the
    #: bolt side (like VDI delta_M), mm/N; 0.0 for a through joint
    thread_region_compliance: float = 0.0
    layer_outlines: tuple[str, ...] = ()  # where each layer's outer diameter comes from (see OUTLINES)


#: where an FE run's outer diameter comes from, per layer
OUTLINES = {
    "clipped-cone": "an annulus of the area of the layer's own part inside the cone, where the cone is widest "
                    "in that layer (the part's outline)",
    "job": "outside_diameter of the job",
    "converged": "widened until k_m stops changing (unbounded plates)",
}


@dataclass(frozen=True)
class StiffnessComparison:
    """Member stiffness by every method that applies to the joint, N/mm (``compare_stiffness``)."""

    frustum: float | None = None
    exponential: float | None = None
    vdi: float | None = None
    cone: float | None = None
    fe: float | None = None

    def values(self) -> dict[str, float]:
        """Method -> k_m of the methods that were run."""
        return {f.name: getattr(self, f.name) for f in fields(self) if getattr(self, f.name) is not None}


@dataclass
class JointResult:
    """What the engine says of one joint; mirrors the result JSON of DESIGN.md.

    ``verdict``, ``governing`` and ``ok`` are set once, when every check of the joint is in
    (``mechanics.checks.rate_result``); before that the verdict is :data:`UNRATED`.
    """

    id: str
    ok: bool
    verdict: str                    # "pass" | "marginal" | "fail" (UNRATED until rated)
    governing: str                  # name of the check with the least margin
    spec: JointSpec
    grip: float                     # mm (as the scan defines it)
    effective_grip: float           # mm (Shigley Table 8-7 for tapped joints)
    bolt_stiffness: float           # N/mm
    member_stiffness: float         # N/mm
    joint_constant: float           # C
    stiffness_method: str
    preload: float                  # F_i used in service, N
    Se: float                       # MPa
    sigma_a: float
    sigma_m: float
    sigma_i: float
    n_f: float | None
    factors: dict[str, float | None]
    checks: list[Check]
    tightening: dict[str, float] | None = None
    notes: list[str] = field(default_factory=list)
    findings: list[dict] = field(default_factory=list)
    # the bolt as the engine modelled it (Shigley 10th ed., Table 8-7)
    thread_length: float | None = None  # L_T used, mm
    l_d: float | None = None        # unthreaded length in the grip, mm
    l_t: float | None = None        # threaded length in the grip, mm
    shank: float | None = None      # L - L_T before cutting at the grip, mm
    bolt_force: float | None = None  # F_b = C P + F_i at P_max, N
    member_force: float | None = None  # F_m = (1 - C) P - F_i at P_max, N
    load_line_slope: float | None = None  # (sigma_m - sigma_i) / sigma_a
    endurance_method: str | None = None  # "table" | "marin" | "given" (textbook engine)
    endurance_factors: dict[str, float] = field(default_factory=dict)  # Marin factor -> value
    fatigue_criterion: str | None = None  # what the engine used; None: the spec's criterion
    vdi: VdiResult | None = None    # the VDI 2230-1 chain, when method = "vdi"
    cone: ConeStiffness | None = None  # the clipped cone, when the geometry computed one
    fe: FeRun | None = None         # the FE run, when the chosen method or the comparison ran one
    comparison: StiffnessComparison | None = None
    remedies: list[Remedy] = field(default_factory=list)
    stiffness_split: StiffnessSplit | None = None  # tapped joints: the member/bolt definition used
    fit_bias: FitBias | None = None  # a method of this joint's stiffness known to read high (reports name it)
    method_spread: MethodSpread | None = None  # tapped joints: the methods beyond ±10 % of the reference
    stackup: StackupResult | None = None  # the stack at its tolerance limits (mechanics.stackup)

    @property
    def criterion(self) -> str:
        """The fatigue criterion the engine used (as results.json reports it)."""
        return self.fatigue_criterion or self.spec.fatigue.criterion


#: the verdict of a result whose checks are not all in yet
UNRATED = "unrated"
