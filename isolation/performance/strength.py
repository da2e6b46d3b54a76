"""Storey strengths of the code-designed building and the code drift check of its design.

A fixed-base building designed by the equivalent lateral force method is
proportioned for the design storey shears, then yields at about its
system overstrength times them. This module turns a code design into storey
yield shears for :class:`isolation.dynamics.structure.ShearBuilding`:

* fixed base, ASCE/SEI 7-16: V = C_s W (§12.8.1, with R, I_e and the bounds of
  Eqs. 12.8-2 to 12.8-6), F_x = C_vx V with C_vx = w_x h_x^k / sum w_i h_i^k
  (§12.8.3), storey shear V_x = sum of F_i above; yield shear Omega_0 V_x;
* fixed base, EN 1998-1: F_b = S_d(T_1) m lambda (§4.3.3.2.2 with the §3.2.2.5
  design spectrum and q), F_i = F_b z_i m_i / sum z_j m_j (§4.3.3.2.3);
  yield shear (alpha_u/alpha_1) V_x;
* isolated superstructure: the code's V_s (with R_I, or q <= 1.5) over the
  storeys by the code's distribution, times the same overstrength.

The code drift check of the fixed-base design uses the elastic storey drifts
of the shear building under the design forces: ASCE/SEI 7-16 §12.8.6,
Delta = C_d delta_xe / I_e against Table 12.12-1; EN 1998-1 §4.4.3.2,
nu d_r <= alpha h with d_r = q d_e (§4.3.4).

Factor tables are from memory of ASCE/SEI 7-16 Table 12.2-1 and EN 1998-1
§5.2.2.2 / §6.3.2; every value carries its source. Scope: feasibility, not
construction design.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

import numpy as np

from isolation import GRAVITY, validate
from isolation.codes import registry as _codes

__all__ = ["SystemFactors", "system_factors", "StoreyDesign", "asce7_distribution", "eurocode_distribution",
           "fixed_base_design", "isolated_design", "DriftCheck", "code_drift_check", "allowable_drift"]


_LATERAL = ("steel_moment_frame", "concrete_moment_frame", "braced_frame", "steel_eccentrically_braced_frame",
            "steel_buckling_restrained_braced_frame", "concentrically_braced_frame", "shear_wall", "other")


@dataclass(frozen=True)
class SystemFactors:
    """Overstrength and deflection amplification of the fixed-base lateral system.

    Attributes: ``overstrength`` [-] (Omega_0 or alpha_u/alpha_1),
    ``deflection_amplification`` [-] (C_d, or q_d = q for EN 1998-1),
    ``source`` (table row or "given in the study").
    """

    overstrength: float
    deflection_amplification: float
    source: str

    def to_dict(self) -> dict:
        return asdict(self)


def system_factors(lateral_system: str, response_modification: float, basis: str = _codes.DEFAULT_BASIS, *,
                   overstrength: float | None = None,
                   deflection_amplification: float | None = None) -> SystemFactors:
    """Overstrength and deflection amplification by lateral system, or as given.

    Parameters
    ----------
    lateral_system : str
        A study choice of ``building.lateral_system`` (``"steel_moment_frame"``,
        ``"concrete_moment_frame"``, ``"steel_eccentrically_braced_frame"``,
        ``"steel_buckling_restrained_braced_frame"``, ``"concentrically_braced_frame"``,
        ``"shear_wall"``; ``"other"`` is taken as concrete shear walls; ``"braced_frame"``
        of older studies as the braced-frame rows). [-]
    response_modification : float
        R (ASCE 7) or q (EN 1998-1) of the fixed-base design, >= 1; for ASCE 7 it
        picks the Table 12.2-1 row of the system with the nearest R. [-]
    basis : str
        ``"asce7"`` or ``"eurocode"``. [-]
    overstrength, deflection_amplification : float, optional
        Given values (>= 1) that replace the table's. [-]

    Returns
    -------
    SystemFactors
    """
    validate.one_of("lateral_system", lateral_system, _LATERAL)
    code = _codes.get(basis, "basis")
    r = validate.in_range("response_modification", response_modification, 1.0, 10.0, "-")
    omega, cd, source = code.system_factors(lateral_system, r)
    given = []
    if overstrength is not None:
        omega = validate.in_range("overstrength", overstrength, 1.0, 5.0, "-")
        given.append("overstrength")
    if deflection_amplification is not None:
        cd = validate.in_range("deflection_amplification", deflection_amplification, 1.0, 10.0, "-")
        given.append("deflection amplification")
    if given:
        source = " and ".join(given) + " given in the study; otherwise " + source
    return SystemFactors(float(omega), float(cd), source)


@dataclass(frozen=True)
class StoreyDesign:
    """Design storey forces and the storey yield shears they imply.

    Attributes
    ----------
    base_shear : float
        Design base shear (V, F_b or V_s). [kN]
    forces : tuple of float
        Lateral design force at each floor, first floor up. [kN]
    storey_shears : tuple of float
        Design shear of each storey, first storey up. [kN]
    overstrength : float
        Factor from design shear to yield shear. [-]
    yield_shears : tuple of float
        Storey yield shears, overstrength x design shear unless given. [kN]
    coefficient : float
        Base shear over the weight of the floors above the base. [-]
    period : float
        Period used for the design. [s]
    source : str
        Clauses of the design and of the overstrength.
    given : bool
        True when the yield shears were given in the study.
    """

    base_shear: float
    forces: tuple
    storey_shears: tuple
    overstrength: float
    yield_shears: tuple
    coefficient: float
    period: float
    source: str
    given: bool = False

    def to_dict(self) -> dict:
        return asdict(self)

    def with_yield_shears(self, yield_shears) -> "StoreyDesign":
        """The same design with storey yield shears given by the user. [kN]"""
        values = validate.positive_array("storey_strengths", yield_shears, "kN")
        if values.shape != (len(self.storey_shears),):
            raise ValueError(f"storey_strengths has {values.size} entries: must have one per storey "
                             f"({len(self.storey_shears)}) [kN]")
        return StoreyDesign(self.base_shear, self.forces, self.storey_shears, self.overstrength,
                            tuple(values.tolist()), self.coefficient, self.period,
                            self.source + "; storey strengths given in the study", True)


def asce7_distribution(weights, elevations, period: float) -> np.ndarray:
    """Vertical distribution factors C_vx = w_x h_x^k / sum w_i h_i^k (ASCE/SEI 7-16 §12.8.3).

    Parameters
    ----------
    weights : sequence of float
        Floor weights w_x, first floor up, > 0. [kN]
    elevations : sequence of float
        Floor elevations h_x above the base, > 0. [m]
    period : float
        Fundamental period T: k = 1 for T <= 0.5 s, 2 for T >= 2.5 s, linear between. [s]

    Returns
    -------
    ndarray
        C_vx, summing to 1. [-]
    """
    w = validate.positive_array("weights", weights, "kN")
    h = validate.positive_array("elevations", elevations, "m")
    t = validate.positive("period", period, "s")
    k = float(np.interp(t, [0.5, 2.5], [1.0, 2.0]))
    share = w * h**k
    return share / share.sum()


def eurocode_distribution(masses, elevations) -> np.ndarray:
    """Distribution factors z_i m_i / sum z_j m_j (EN 1998-1 §4.3.3.2.3(3), Eq. 4.11).

    Parameters
    ----------
    masses : sequence of float
        Floor masses (or weights), first floor up, > 0. [t]
    elevations : sequence of float
        Floor heights z_i above the base, > 0. [m]
    """
    m = validate.positive_array("masses", masses, "t")
    z = validate.positive_array("elevations", elevations, "m")
    share = m * z
    return share / share.sum()


def _storey_shears(forces: np.ndarray) -> np.ndarray:
    return np.cumsum(forces[::-1])[::-1]


def fixed_base_design(spectrum, floor_weights, storey_heights, response_modification: float, factors: SystemFactors,
                      *, basis: str = _codes.DEFAULT_BASIS, period: float, importance: float = 1.0,
                      frame: str = "other", s1: float = 0.0) -> StoreyDesign:
    """Equivalent-lateral-force design of the building on a fixed base and its storey yield shears.

    Parameters
    ----------
    spectrum : spectrum object
        Site spectrum: MCE_R for ASCE 7 (design level is 2/3 of it, see
        :func:`isolation.codes.asce7_fixed_base.design_values`); the elastic spectrum for
        EN 1998-1 (a :class:`~isolation.site.spectra.EurocodeSpectrum` gives the
        §3.2.2.5 design spectrum; any other is divided by q). [g]
    floor_weights : sequence of float
        Weights of the floors above the base, first floor up, > 0. [kN]
    storey_heights : sequence of float
        Storey heights, first storey up, > 0. [m]
    response_modification : float
        R (ASCE 7) or q (EN 1998-1), >= 1. [-]
    factors : SystemFactors
        Overstrength (design shear -> yield shear). [-]
    basis : str
        ``"asce7"`` or ``"eurocode"``. [-]
    period : float
        Fixed-base period; for ASCE 7 capped at C_u T_a (§12.8.2). [s]
    importance : float
        I_e (ASCE 7; gamma_I is already in a Eurocode spectrum). [-]
    frame : str
        Frame type of the approximate period (``"steel_moment"``, ...). [-]
    s1 : float
        Mapped S_1 for ASCE/SEI 7-16 Eq. 12.8-6. [g]
    """
    code = _codes.get(basis, "basis")
    w = validate.positive_array("floor_weights", floor_weights, "kN")
    h = validate.positive_array("storey_heights", storey_heights, "m")
    if w.shape != h.shape:
        raise ValueError(f"storey_heights has {h.size} entries and floor_weights {w.size}: must be equal")
    elevations = np.cumsum(h)
    total = float(w.sum())
    base, shares, t, source = code.fixed_base_forces(spectrum, w, elevations, response_modification, period=period,
                                                     importance=importance, frame=frame, s1=s1)
    forces = shares * base
    shears = _storey_shears(forces)
    return StoreyDesign(float(base), tuple(forces.tolist()), tuple(shears.tolist()), factors.overstrength,
                        tuple((factors.overstrength * shears).tolist()), float(base / total), float(t),
                        f"{source}; yield shear = {factors.overstrength:g} x design storey shear ({factors.source})")


def isolated_design(report, floor_weights, factors: SystemFactors, *, basis: str = _codes.DEFAULT_BASIS,
                    total_weight: float | None = None) -> StoreyDesign:
    """Storey yield shears of the isolated superstructure from the code's V_s.

    Parameters
    ----------
    report : ElfReport or EurocodeReport
        The code report of the alternative (V_s and, for ASCE 7, F_x). [-]
    floor_weights : sequence of float
        Weights of the floors above the base level, first floor up, > 0. [kN]
    factors : SystemFactors
        The same overstrength as the fixed-base design. [-]
    basis : str
        ``"asce7"``: storey shears from the §17.5.5 forces F_x = C_vx V_s of
        the report; ``"eurocode"``: V_s spread in proportion to the weights
        (the superstructure moves almost rigidly on the isolators, EN 1998-1
        §10.9.2, from memory), the base slab's share W_base/W taken by the
        isolation level. [-]
    total_weight : float, optional
        W including the base slab, for the Eurocode share (default the sum of
        ``floor_weights``). [kN]
    """
    code = _codes.get(basis, "basis")
    w = validate.positive_array("floor_weights", floor_weights, "kN")
    v_s = float(report.value("V_s"))
    forces, source = code.isolated_forces(report, w, total_weight)
    shears = _storey_shears(forces)
    return StoreyDesign(v_s, tuple(forces.tolist()), tuple(shears.tolist()), factors.overstrength,
                        tuple((factors.overstrength * shears).tolist()), float(v_s / w.sum()), float("nan"),
                        f"{source}; yield shear = {factors.overstrength:g} x design storey shear ({factors.source})")


def allowable_drift(basis: str = _codes.DEFAULT_BASIS, importance: float = 1.0) -> tuple[float, float, str]:
    """Allowable storey drift ratio of the fixed-base design, its factor nu, and the source.

    ASCE/SEI 7-16 Table 12.12-1, "all other structures": 0.020 h_sx (risk
    category I/II, I_e = 1.0), 0.015 (III, 1.25), 0.010 (IV, 1.5), from
    memory; nu = 1. EN 1998-1 §4.4.3.2(1)a: nu d_r <= 0.005 h for buildings
    with brittle non-structural elements attached (the strictest row, taken
    as default), nu = 0.5 for importance classes I-II and 0.4 for III-IV
    (gamma_I >= 1.2), from memory.

    Parameters
    ----------
    basis : str
        ``"asce7"`` or ``"eurocode"``. [-]
    importance : float
        I_e (ASCE 7) or gamma_I (EN 1998-1). [-]

    Returns
    -------
    (float, float, str)
        Limit on the drift ratio [-], the factor nu [-] applied to the drift, and the source.
    """
    return _codes.get(basis, "basis").allowable_drift(importance)


@dataclass(frozen=True)
class DriftCheck:
    """Code drift check of the fixed-base design, storey by storey.

    Attributes
    ----------
    elastic_drifts : tuple of float
        Elastic storey drift under the design forces, delta_xe or d_e. [m]
    design_drift_ratios : tuple of float
        Checked drift ratio per storey: C_d delta_xe/(I_e h) or nu q d_e/h. [-]
    limit : float
        Allowable drift ratio. [-]
    stability : tuple of float
        Stability coefficient theta per storey (ASCE/SEI 7-16 Eq. 12.8-16 or
        EN 1998-1 Eq. 4.28). [-]
    stability_limit : float
        theta_max = 0.5/(beta C_d) <= 0.25 with beta = 1 (ASCE 7), or 0.1
        beyond which P-delta must be included (EN 1998-1 §4.4.2.2(2)). [-]
    passed : bool
        Every storey within the drift limit.
    source : str
    """

    elastic_drifts: tuple
    design_drift_ratios: tuple
    limit: float
    stability: tuple
    stability_limit: float
    passed: bool
    source: str

    @property
    def largest(self) -> float:
        """Largest checked drift ratio. [-]"""
        return max(self.design_drift_ratios)

    def to_dict(self) -> dict:
        out = asdict(self)
        out["largest"] = self.largest
        return out


def code_drift_check(building, design: StoreyDesign, factors: SystemFactors, *, basis: str = _codes.DEFAULT_BASIS,
                     importance: float = 1.0) -> DriftCheck:
    """Drift check of the fixed-base design on the shear building's storey stiffnesses.

    The elastic storey drift under the design storey shear V_x is V_x/k_x
    (shear building). ASCE/SEI 7-16 §12.8.6: Delta_x = C_d delta_xe/I_e
    against Table 12.12-1 (forces of the period used for strength, which is
    conservative where §12.8.6.2 would allow the uncapped period); stability
    theta = P_x Delta I_e/(V_x h_sx C_d) (Eq. 12.8-16). EN 1998-1 §4.4.3.2:
    nu d_r with d_r = q d_e (§4.3.4, q_d = q); theta = P_tot d_r/(V_tot h)
    (Eq. 4.28). All clauses from memory.

    Parameters
    ----------
    building : ShearBuilding
        Fixed-base model (masses [t], stiffnesses [kN/m], heights [m]). [-]
    design : StoreyDesign
        Design storey shears (of :func:`fixed_base_design`). [kN]
    factors : SystemFactors
        Deflection amplification C_d (or q_d). [-]
    basis : str
        ``"asce7"`` or ``"eurocode"``. [-]
    importance : float
        I_e (ASCE 7) or gamma_I (EN 1998-1). [-]
    """
    code = _codes.get(basis, "basis")
    k = np.asarray(building.stiffnesses, dtype=float)
    h = np.asarray(building.heights, dtype=float)
    shears = np.asarray(design.storey_shears, dtype=float)
    if k.shape != shears.shape:
        raise ValueError(f"design has {shears.size} storeys and building {k.size}: must be equal")
    elastic = shears / k
    limit, nu, source = allowable_drift(basis, importance)
    gravity = np.cumsum((np.asarray(building.masses) * GRAVITY)[::-1])[::-1]
    cd = factors.deflection_amplification
    ratios, theta, theta_max, note = code.drift_ratios(elastic, shears, h, gravity, cd, importance, nu)
    source += note
    return DriftCheck(tuple(elastic.tolist()), tuple(ratios.tolist()), float(limit), tuple(theta.tolist()),
                      float(theta_max), bool(np.all(ratios <= limit)), source)
