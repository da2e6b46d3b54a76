"""Eurocode 8 simplified linear analysis of an isolated building (EN 1998-1 §10.9).

The alternative rule set to the ASCE/SEI 7 report in :mod:`isolation.codes.asce7`:
effective damping enters through eta (rule ``"eurocode"``), the design
displacement of the stiffness centre is d_dc = M Se(T_eff, xi_eff)/K_eff,min,
torsion amplifies it at the corner isolator, and each isolator is designed
for gamma_x times its displacement. The applicability limits of the simplified
procedure are reported as checks; each failure says that a fuller analysis is
required. A fixed-base comparison uses the EN 1998-1 design spectrum with the
behaviour factor q (§3.2.2.5) and the lateral force method (§4.3.3.2).

The importance factor gamma_I (EN 1998-1 §4.2.5, recommended 0.8/1.0/1.2/1.4
for importance classes I-IV, from memory) enters through the spectrum
(a_g = gamma_I a_gR, :class:`isolation.site.spectra.EurocodeSpectrum`); a study
takes it from ``building.importance``.

Scope: concept-stage feasibility, not construction design. Clauses marked
"from memory" were not re-read; National Annexes may change the values.

References
----------
EN 1998-1:2004 §3.2.2.5, §4.3.2, §4.3.3.2.2, §10.3, §10.9, §10.10.
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Any, ClassVar, Mapping

from isolation import validate
from isolation.bearings.checks import Check
from isolation.codes.report import SingleModeReport
from isolation.design.single_mode import BoundsResult, Item, _force, _unit, design_bounds
from isolation.plain import plain
from isolation.site.spectra import EurocodeSpectrum, eurocode_eta

__all__ = [
    "EurocodeBuilding",
    "EurocodeReport",
    "eurocode_simplified",
    "eurocode_approximate_period",
    "eurocode_design_spectrum",
    "eurocode_fixed_base_shear",
]

EC8 = "EN 1998-1:2004"
_FULLER = "simplified analysis not applicable: use multimodal or response-history analysis (EN 1998-1 §10.9.3/§10.9.4)"
_LINEAR = "§10.9.1(5)"
_NO_LINEAR = ("equivalent-linear model not permitted (EN 1998-1 §10.9.1(5), from memory): the simplified and "
              "modal analyses are both excluded, response-history analysis is required")

# EN 1998-1:2004 §4.3.3.2.2(3), Eq. 4.6 (from memory): C_t for T_1 = C_t H^(3/4), H in m.
# 0.085 moment resistant space steel frames; 0.075 moment resistant space concrete frames and
# eccentrically braced steel frames; 0.050 all other structures ("braced": eccentrically braced,
# its earlier name; buckling-restrained braced frames are not listed, so "all other structures").
_EC8_CT = {"steel_moment": 0.085, "concrete_moment": 0.075, "braced": 0.075, "eccentric_braced": 0.075,
           "buckling_restrained_braced": 0.050, "other": 0.050}


def _to_dict(obj) -> dict:
    return {f.name: plain(getattr(obj, f.name), keep_nonfinite=True) for f in fields(obj)}


def eurocode_approximate_period(height: float, frame: str = "other") -> float:
    """T_1 = C_t H^(3/4) (EN 1998-1 §4.3.3.2.2(3), from memory).

    Parameters
    ----------
    height : float
        Height of the building above the foundation or rigid basement, > 0. [m]
    frame : str
        "steel_moment" (C_t 0.085), "concrete_moment", "eccentric_braced" or "braced"
        (eccentrically braced steel, 0.075), "buckling_restrained_braced" or "other"
        (all other structures, 0.050). [-]

    Returns
    -------
    float
        T_1. [s]
    """
    h = validate.positive("height", height, "m")
    validate.one_of("frame", frame, tuple(_EC8_CT))
    return _EC8_CT[frame] * h**0.75


def eurocode_design_spectrum(spectrum: EurocodeSpectrum, period: float, behaviour_factor: float,
                             lower_bound: float = 0.2) -> float:
    """Design spectrum S_d(T) for elastic analysis (EN 1998-1 §3.2.2.5, Eqs. 3.13-3.16).

    Parameters
    ----------
    spectrum : EurocodeSpectrum
        Site spectrum (a_g, ground and type). [g]
    period : float
        Period T, 0 <= T <= 4 s. [s]
    behaviour_factor : float
        q, >= 1. [-]
    lower_bound : float
        beta, lower-bound factor on a_g (recommended 0.2), >= 0. [-]

    Returns
    -------
    float
        S_d(T). [g]
    """
    if not isinstance(spectrum, EurocodeSpectrum):
        raise ValueError(f"spectrum = {type(spectrum).__name__} is not allowed: must be a EurocodeSpectrum")
    t = validate.in_range("period", period, 0.0, 4.0, "s")
    q = validate.in_range("behaviour_factor", behaviour_factor, 1.0, 10.0, "-")
    beta = validate.non_negative("lower_bound", lower_bound, "-")
    soil, tb, tc, td = spectrum.parameters
    ag = spectrum.design_ag
    if t <= tb:
        return ag * soil * (2.0 / 3.0 + t / tb * (2.5 / q - 2.0 / 3.0))
    if t <= tc:
        return ag * soil * 2.5 / q
    if t <= td:
        return max(ag * soil * 2.5 / q * tc / t, beta * ag)
    return max(ag * soil * 2.5 / q * tc * td / t**2, beta * ag)


def eurocode_fixed_base_shear(spectrum: EurocodeSpectrum, weight: float, behaviour_factor: float, period: float,
                              storeys: int) -> tuple[float, float, str]:
    """Fixed-base base shear F_b = S_d(T_1) m lambda (EN 1998-1 §4.3.3.2.2, Eq. 4.5).

    Parameters
    ----------
    spectrum : EurocodeSpectrum
        Site spectrum. [g]
    weight : float
        Seismic weight W = m g, > 0. [kN]
    behaviour_factor : float
        q of the fixed-base structure, >= 1. [-]
    period : float
        T_1, 0 < T_1 <= 4 s. [s]
    storeys : int
        Storeys above the base (lambda = 0.85 when T_1 <= 2 T_C and more than 2 storeys). [-]

    Returns
    -------
    (float, float, str)
        F_b [kN], lambda [-] and the source.
    """
    w = validate.positive("weight", weight, "kN")
    t = validate.in_range("period", period, 0.0, 4.0, "s", low_inclusive=False)
    n = validate.positive("storeys", storeys, "-")
    tc = spectrum.parameters[2]
    lam = 0.85 if (t <= 2.0 * tc and n > 2) else 1.0
    sd = eurocode_design_spectrum(spectrum, t, behaviour_factor)
    return sd * w * lam, lam, f"{EC8} Eq. 4.5 with §3.2.2.5 design spectrum"


@dataclass(frozen=True)
class EurocodeBuilding:
    """Building data for the EN 1998-1 §10.9 simplified analysis.

    Parameters
    ----------
    weight : float
        Seismic weight carried by the isolators (base level included), W = M g, > 0. [kN]
    superstructure_period : float
        Fixed-base period T_f of the superstructure, > 0. [s]
    plan_length, plan_width : float
        Plan dimensions L (larger) and B, > 0. [m]
    eccentricity : float
        Actual eccentricity of mass to stiffness centre, >= 0; 5 % of L
        accidental eccentricity is added (§4.3.2). [m]
    corner_distance : float, optional
        Distance y of the outermost isolator from the stiffness centre;
        default L/2 + eccentricity. [m]
    storeys : int
        Storeys above the isolation interface, >= 1. [-]
    behaviour_factor : float
        q of the superstructure on a fixed base (for the comparison), >= 1. [-]
    isolated_behaviour_factor : float
        q of the isolated superstructure, 1 <= q <= 1.5 (§10.10(5), from memory). [-]
    displacement_amplification : float
        gamma_x on isolator displacements (recommended 1.2, §10.3(2), from memory), >= 1. [-]
    fault_distance : float, optional
        Distance to the nearest potentially active fault (Ms >= 6.5). [km]
    vertical_stiffness_ratio : float, optional
        K_v/K_eff of the isolation system. [-]
    regular : bool
        True when the superstructure is regular and symmetric about two axes. [-]
    superstructure_weight : float, optional
        Weight above the isolation plane (the levels over the base level), 0 < W_s <= W;
        the isolated superstructure's shear V_s and the fixed-base F_b use it. Default
        ``weight``. [kN]
    """

    weight: float
    superstructure_period: float
    plan_length: float
    plan_width: float
    eccentricity: float = 0.0
    corner_distance: float | None = None
    storeys: int = 1
    behaviour_factor: float = 1.5
    isolated_behaviour_factor: float = 1.0
    displacement_amplification: float = 1.2
    fault_distance: float | None = None
    vertical_stiffness_ratio: float | None = None
    regular: bool = True
    superstructure_weight: float | None = None

    def __post_init__(self) -> None:
        set_ = lambda name, value: object.__setattr__(self, name, value)  # noqa: E731
        for name, unit in (("weight", "kN"), ("superstructure_period", "s"), ("plan_length", "m"), ("plan_width", "m")):
            set_(name, validate.positive(name, getattr(self, name), unit))
        set_("eccentricity", validate.non_negative("eccentricity", self.eccentricity, "m"))
        for name, unit in (("corner_distance", "m"), ("fault_distance", "km"), ("vertical_stiffness_ratio", "-")):
            if getattr(self, name) is not None:
                set_(name, validate.non_negative(name, getattr(self, name), unit))
        if isinstance(self.storeys, bool) or not isinstance(self.storeys, int) or self.storeys < 1:
            raise ValueError(f"storeys = {self.storeys!r} is not allowed: must be an integer >= 1")
        set_("behaviour_factor", validate.in_range("behaviour_factor", self.behaviour_factor, 1.0, 10.0, "-"))
        set_("isolated_behaviour_factor",
             validate.in_range("isolated_behaviour_factor", self.isolated_behaviour_factor, 1.0, 1.5, "-"))
        set_("displacement_amplification",
             validate.in_range("displacement_amplification", self.displacement_amplification, 1.0, 3.0, "-"))
        validate.one_of("regular", self.regular, (True, False))
        if self.superstructure_weight is not None:
            set_("superstructure_weight", validate.in_range("superstructure_weight", self.superstructure_weight,
                                                            0.0, self.weight, "kN", low_inclusive=False))

    @property
    def weight_above(self) -> float:
        """W_s, weight above the isolation plane. [kN]"""
        return self.weight if self.superstructure_weight is None else self.superstructure_weight

    def to_dict(self) -> dict:
        return _to_dict(self)


@dataclass(frozen=True)
class EurocodeReport(SingleModeReport):
    """Result of :func:`eurocode_simplified`: the :class:`~isolation.codes.basis.SingleModeReport` of
    EN 1998-1; ``simplified_permitted`` is ``permitted``."""

    scope: str = ("Concept-stage feasibility, not construction design; verify against EN 1998-1 with its "
                  "National Annex and a licensed structural engineer.")

    SYMBOLS: ClassVar[Mapping[str, str]] = {
        "displacement": "d_dc", "total_displacement": "d_d", "period": "T_eff", "isolation_shear": "V",
        "superstructure_shear": "V_s", "fixed_base_shear": "F_b", "shear_ratio": "V_s/F_b"}

    DICT_FIELDS: ClassVar[tuple] = ("bounds", "building", "quantities", "applicability", "warnings",
                                    "simplified_permitted", "scope")

    @property
    def simplified_permitted(self) -> bool:
        """True when EN 1998-1 §10.9 permits the simplified analysis (same as ``permitted``)."""
        return self.permitted


def eurocode_simplified(property_sets: Mapping[str, Any], building: EurocodeBuilding, spectrum, *,
                        bounds: BoundsResult | None = None, rule: str = "eurocode", **options) -> EurocodeReport:
    """EN 1998-1 §10.9 simplified linear analysis for all property sets.

    Parameters
    ----------
    property_sets : mapping
        Name -> whole-plane system (lower, nominal, upper).
    building : EurocodeBuilding
        Weight, periods, plan and factors. [kN, s, m]
    spectrum : spectrum object
        Elastic site spectrum, usually a :class:`~isolation.site.spectra.EurocodeSpectrum`. [g]
    bounds : BoundsResult, optional
        The equivalent-linear results of ``property_sets`` already computed
        (damping rule ``rule``); default: computed here.
    rule : str
        Damping rule of the displacement (the EN 1998-1 eta by default). [-]
    **options
        Passed to :func:`isolation.design.equivalent_linear`.

    Returns
    -------
    EurocodeReport

    Notes
    -----
    d_dc = M Se(T_eff, xi_eff)/K_eff,min (§10.9.2, from memory) equals
    g Se T_eff^2/(4 pi^2) at the lower-bound stiffness; torsion
    delta = 1 + e_tot y/r^2 with r^2 = (L^2 + B^2)/12 for isolators spread
    evenly over the plan (from memory); isolator design displacement
    gamma_x delta d_dc.
    """
    if not isinstance(building, EurocodeBuilding):
        raise ValueError(f"building = {type(building).__name__} is not allowed: must be a EurocodeBuilding")
    if bounds is None:
        bounds = design_bounds(property_sets, building.weight, spectrum, rule, **options)
    low, up = bounds.displacement, bounds.force
    length, width = building.plan_length, building.plan_width
    e_tot = building.eccentricity + 0.05 * length
    y = building.corner_distance if building.corner_distance is not None else length / 2.0 + building.eccentricity
    delta = 1.0 + e_tot * y / ((length**2 + width**2) / 12.0)
    d_dc = low.displacement
    d_design = building.displacement_amplification * delta * d_dc
    shear = up.base_shear
    # The isolated superstructure moves almost as a rigid body on the isolators: its share of the
    # base shear is V W_s/W (the base level's inertia goes straight into the isolators); the
    # fixed-base comparison carries the same W_s (EN 1998-1 §10.10(5) and §4.3.3.2.2, from memory).
    w_s = building.weight_above
    v_s = shear * w_s / building.weight / building.isolated_behaviour_factor
    items = [
        Item("design displacement of the stiffness centre", "d_dc", d_dc, "m",
             f"{EC8} §10.9.2: M Se(T_eff, xi_eff)/K_eff,min (from memory)",
             f"property set '{bounds.displacement_governs}'"),
        Item("effective period", "T_eff", low.period, "s", f"{EC8} §10.9.2: 2 pi sqrt(M/K_eff)"),
        Item("effective damping", "xi_eff", low.damping, "-", f"{EC8} §10.5: sum E_D/(2 pi K_eff d_dc^2)"),
        Item("damping correction factor", "eta", float(eurocode_eta(low.damping)), "-",
             f"{EC8} §3.2.2.2 Eq. 3.6, >= 0.55"),
        Item("effective stiffness (minimum)", "K_eff,min", low.stiffness, "kN/m", f"{EC8} §10.9.2"),
        Item("total eccentricity incl. 5 % accidental", "e_tot", e_tot, "m", f"{EC8} §4.3.2 (0.05 L)"),
        Item("torsional amplification at the corner isolator", "delta", delta, "-",
             f"{EC8} §10.9.3: 1 + e_tot y/r^2, r^2 = (L^2 + B^2)/12 (from memory)", f"y = {y:.3g} m"),
        Item("displacement amplification", "gamma_x", building.displacement_amplification, "-",
             f"{EC8} §10.3(2), recommended 1.2 (from memory)"),
        Item("isolator design displacement", "d_d", d_design, "m", "gamma_x delta d_dc"),
        Item("elastic base shear (maximum)", "V", shear, "kN", f"{EC8} §10.9.2: K_eff,max d_dc",
             f"property set '{bounds.force_governs}'"),
        Item("isolated superstructure design shear", "V_s", v_s, "kN",
             f"{EC8} §10.10(5): V (W_s/W)/q, q <= 1.5 (from memory)",
             f"W_s = {w_s:.6g} kN above the isolation plane, q = {building.isolated_behaviour_factor:g}"),
    ]
    if building.superstructure_period <= 4.0 and isinstance(spectrum, EurocodeSpectrum):
        f_b, lam, src = eurocode_fixed_base_shear(spectrum, w_s, building.behaviour_factor,
                                                  building.superstructure_period, building.storeys)
        items += [Item("fixed-base design shear", "F_b", f_b, "kN", src,
                       f"lambda = {lam:g}, q = {building.behaviour_factor:g}, W_s = {w_s:.6g} kN"),
                  Item("ratio isolated/fixed-base design shear", "V_s/F_b", v_s / f_b, "-", "V_s over F_b")]
    checks = _applicability(bounds, property_sets, building)
    warnings = tuple(f"{c.name}: {c.value:.4g} against limit {c.limit:.4g}{_unit(c)} ({c.source}) - "
                     f"{_NO_LINEAR if _LINEAR in c.name else _FULLER}" for c in checks if not c.passed)
    return EurocodeReport(bounds=bounds, building=building, quantities=tuple(items), applicability=tuple(checks),
                          warnings=warnings, permitted=not warnings)


def _applicability(bounds, property_sets, building) -> list[Check]:
    src = f"{EC8} §10.9.2 (from memory)"
    periods = [r.period for r in bounds.results.values()]
    t_f = building.superstructure_period
    beta_max = max(r.damping for r in bounds.results.values())
    checks = [
        Check("shortest T_eff over the superstructure period T_f", min(periods) / t_f, 3.0, min(periods) >= 3.0 * t_f,
              "-", src),
        Check("longest effective period T_eff", max(periods), 3.0, max(periods) <= 3.0, "s", src),
        Check(f"largest effective damping xi_eff ({_LINEAR})", beta_max, 0.30, beta_max <= 0.30, "-",
              f"{EC8} §10.9.1(5) (from memory)"),
        Check("largest plan dimension", building.plan_length, 50.0, building.plan_length <= 50.0, "m", src),
        Check("superstructure regular and symmetric (0 = no)", float(building.regular), 1.0, building.regular, "-",
              src),
    ]
    if building.fault_distance is not None:
        checks.append(Check("distance to an active fault (Ms >= 6.5)", building.fault_distance, 15.0,
                            building.fault_distance > 15.0, "km", src))
    if building.vertical_stiffness_ratio is not None:
        checks.append(Check("vertical over effective horizontal stiffness", building.vertical_stiffness_ratio, 150.0,
                            building.vertical_stiffness_ratio >= 150.0, "-", src))
    for name, r in bounds.results.items():
        system, d = property_sets[name], r.displacement
        ratio = float(system.effective_stiffness(d)) / float(system.effective_stiffness(0.2 * d))
        checks.append(Check(f"K_eff(d_dc)/K_eff(0.2 d_dc), {name} ({_LINEAR})", ratio, 0.5, ratio >= 0.5, "-",
                            f"{EC8} §10.9.1(5) (from memory)"))
        restoring = (_force(system, d) - _force(system, 0.5 * d)) / r.weight
        checks.append(Check(f"restoring force increase from d_dc/2 to d_dc over W, {name} ({_LINEAR})",
                            restoring, 0.025, restoring >= 0.025, "-", f"{EC8} §10.9.1(5) (from memory)"))
    return checks
