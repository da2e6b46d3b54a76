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

__all__ = ["SystemFactors", "system_factors", "StoreyDesign", "asce7_distribution", "eurocode_distribution",
           "fixed_base_design", "isolated_design", "DriftCheck", "code_drift_check", "allowable_drift"]

_ASCE = "ASCE/SEI 7-16"
_EC8 = "EN 1998-1:2004"

# ASCE/SEI 7-16 Table 12.2-1 (from memory): lateral system -> rows (R, Omega_0, C_d, description).
_ASCE_ROWS = {
    "steel_moment_frame": ((8.0, 3.0, 5.5, "special steel moment frame"),
                           (4.5, 3.0, 4.0, "intermediate steel moment frame"),
                           (3.5, 3.0, 3.0, "ordinary steel moment frame")),
    "concrete_moment_frame": ((8.0, 3.0, 5.5, "special reinforced concrete moment frame"),
                              (5.0, 3.0, 4.5, "intermediate reinforced concrete moment frame"),
                              (3.0, 3.0, 2.5, "ordinary reinforced concrete moment frame")),
    "braced_frame": ((8.0, 2.0, 4.0, "steel eccentrically braced frame"),
                     (6.0, 2.0, 5.0, "special steel concentrically braced frame"),
                     (3.25, 2.0, 3.25, "ordinary steel concentrically braced frame")),
    "steel_eccentrically_braced_frame": ((8.0, 2.0, 4.0, "steel eccentrically braced frame"),),
    "steel_buckling_restrained_braced_frame": ((8.0, 2.5, 5.0, "steel buckling-restrained braced frame"),),
    "concentrically_braced_frame": ((6.0, 2.0, 5.0, "special steel concentrically braced frame"),
                                    (3.25, 2.0, 3.25, "ordinary steel concentrically braced frame")),
    "shear_wall": ((6.0, 2.5, 5.0, "special reinforced concrete shear walls, building frame system"),
                   (5.0, 2.5, 5.0, "special reinforced concrete shear walls, bearing wall system"),
                   (4.0, 2.5, 4.0, "ordinary reinforced concrete shear walls, bearing wall system")),
    "other": ((6.0, 2.5, 5.0, "special reinforced concrete shear walls, building frame system"),
              (5.0, 2.5, 5.0, "special reinforced concrete shear walls, bearing wall system"),
              (4.0, 2.5, 4.0, "ordinary reinforced concrete shear walls, bearing wall system")),
}

# EN 1998-1 alpha_u/alpha_1 (from memory): §5.2.2.2(5) concrete, §6.3.2(3) steel; multi-storey, multi-bay.
_EC8_OVERSTRENGTH = {
    "steel_moment_frame": (1.3, "§6.3.2(3): multi-storey, multi-bay moment frame"),
    "concrete_moment_frame": (1.3, "§5.2.2.2(5): multi-storey, multi-bay frame"),
    "braced_frame": (1.2, "§6.3.2(3): eccentrically braced frame"),
    "steel_eccentrically_braced_frame": (1.2, "§6.3.2(3): eccentrically braced frame"),
    "steel_buckling_restrained_braced_frame": (1.0, "no EN 1998-1 row; taken as 1.0 (common practice)"),
    "concentrically_braced_frame": (1.0, "§6.3.2(3): concentrically braced frames take no alpha_u/alpha_1 "
                                         "multiplier (from memory)"),
    "shear_wall": (1.1, "§5.2.2.2(5): uncoupled wall system"),
    "other": (1.1, "§5.2.2.2(5): uncoupled wall system"),
}


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


def system_factors(lateral_system: str, response_modification: float, basis: str = "asce7", *,
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
    validate.one_of("lateral_system", lateral_system, tuple(_ASCE_ROWS))
    validate.one_of("basis", basis, ("asce7", "eurocode"))
    r = validate.in_range("response_modification", response_modification, 1.0, 10.0, "-")
    if basis == "asce7":
        row = min(_ASCE_ROWS[lateral_system], key=lambda row: abs(row[0] - r))
        omega, cd = row[1], row[2]
        source = (f"{_ASCE} Table 12.2-1, {row[3]} (R = {row[0]:g}, Omega_0 = {row[1]:g}, "
                  f"C_d = {row[2]:g}; from memory)")
    else:
        omega, where = _EC8_OVERSTRENGTH[lateral_system]
        cd = r
        source = (f"{_EC8} {where}: alpha_u/alpha_1 = {omega:g} (from memory; a lower estimate of the "
                  "real overstrength); q_d = q (§4.3.4)")
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
                      *, basis: str = "asce7", period: float, importance: float = 1.0, frame: str = "other",
                      s1: float = 0.0) -> StoreyDesign:
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
    validate.one_of("basis", basis, ("asce7", "eurocode"))
    w = validate.positive_array("floor_weights", floor_weights, "kN")
    h = validate.positive_array("storey_heights", storey_heights, "m")
    if w.shape != h.shape:
        raise ValueError(f"storey_heights has {h.size} entries and floor_weights {w.size}: must be equal")
    elevations = np.cumsum(h)
    total = float(w.sum())
    if basis == "asce7":
        from isolation.codes.asce7_fixed_base import fixed_base_shear

        design = fixed_base_shear(spectrum, total, response_modification, period=period,
                                  height=float(elevations[-1]), frame=frame, importance=importance, s1=s1)
        shares = asce7_distribution(w, elevations, design.period)
        base, t = design.base_shear, design.period
        source = (f"{_ASCE} §12.8.1 V = C_s W, C_s = {design.response_coefficient:.4g} ({design.governs}), "
                  f"T = {t:.3g} s ({design.period_source}); §12.8.3 C_vx with k = "
                  f"{float(np.interp(t, [0.5, 2.5], [1.0, 2.0])):.3g}")
    else:
        t = validate.positive("period", period, "s")
        q = validate.in_range("response_modification", response_modification, 1.0, 10.0, "-")
        lam = 0.85 if (len(w) > 2 and t <= 2.0 * _corner_period(spectrum)) else 1.0
        from isolation.site.spectra import EurocodeSpectrum

        if isinstance(spectrum, EurocodeSpectrum) and t <= 4.0:
            from isolation.codes.eurocode import eurocode_design_spectrum

            sd = eurocode_design_spectrum(spectrum, t, q)
            how = "§3.2.2.5 design spectrum S_d(T)"
        else:
            sd = float(spectrum.sa(t)) / q
            how = "elastic Sa(T)/q (common practice for a tabulated spectrum)"
        base = sd * total * lam
        shares = eurocode_distribution(w, elevations)
        source = (f"{_EC8} §4.3.3.2.2 F_b = S_d(T_1) m lambda, {how}, q = {q:g}, lambda = {lam:g}, "
                  f"T_1 = {t:.3g} s; §4.3.3.2.3 F_i = F_b z_i m_i / sum z_j m_j")
    forces = shares * base
    shears = _storey_shears(forces)
    return StoreyDesign(float(base), tuple(forces.tolist()), tuple(shears.tolist()), factors.overstrength,
                        tuple((factors.overstrength * shears).tolist()), float(base / total), float(t),
                        f"{source}; yield shear = {factors.overstrength:g} x design storey shear ({factors.source})")


def _corner_period(spectrum) -> float:
    parameters = getattr(spectrum, "parameters", None)
    return float(parameters[2]) if parameters is not None else 0.5


def isolated_design(report, floor_weights, factors: SystemFactors, *, basis: str = "asce7",
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
    validate.one_of("basis", basis, ("asce7", "eurocode"))
    w = validate.positive_array("floor_weights", floor_weights, "kN")
    v_s = float(report.value("V_s"))
    if basis == "asce7":
        forces = np.array([s.force for s in report.storey_forces], dtype=float)
        source = f"{_ASCE} §17.5.4.2 V_s with R_I, §17.5.5 F_x = C_vx V_s (from memory)"
    else:
        total = float(w.sum()) if total_weight is None else validate.positive("total_weight", total_weight, "kN")
        forces = v_s * w / total
        source = (f"{_EC8} §10.10(5) V_s with q <= 1.5 (from memory), spread in proportion to the floor "
                  "weights (near-rigid superstructure)")
    shears = _storey_shears(forces)
    return StoreyDesign(v_s, tuple(forces.tolist()), tuple(shears.tolist()), factors.overstrength,
                        tuple((factors.overstrength * shears).tolist()), float(v_s / w.sum()), float("nan"),
                        f"{source}; yield shear = {factors.overstrength:g} x design storey shear ({factors.source})")


_ASCE_DRIFT = {1.0: (0.020, "risk category I or II"), 1.25: (0.015, "risk category III"),
               1.5: (0.010, "risk category IV")}


def allowable_drift(basis: str = "asce7", importance: float = 1.0) -> tuple[float, float, str]:
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
    validate.one_of("basis", basis, ("asce7", "eurocode"))
    ie = validate.positive("importance", importance, "-")
    if basis == "asce7":
        key = min(_ASCE_DRIFT, key=lambda k: (abs(k - ie), -k))
        limit, category = _ASCE_DRIFT[key]
        return limit, 1.0, f"{_ASCE} §12.12.1, Table 12.12-1, all other structures, {category} (from memory)"
    nu = 0.4 if ie >= 1.2 else 0.5
    return 0.005, nu, (f"{_EC8} §4.4.3.2(1)a, brittle non-structural elements, nu = {nu:g} "
                       "(importance class " + ("III-IV" if nu == 0.4 else "I-II") + "; from memory)")


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


def code_drift_check(building, design: StoreyDesign, factors: SystemFactors, *, basis: str = "asce7",
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
    validate.one_of("basis", basis, ("asce7", "eurocode"))
    k = np.asarray(building.stiffnesses, dtype=float)
    h = np.asarray(building.heights, dtype=float)
    shears = np.asarray(design.storey_shears, dtype=float)
    if k.shape != shears.shape:
        raise ValueError(f"design has {shears.size} storeys and building {k.size}: must be equal")
    elastic = shears / k
    limit, nu, source = allowable_drift(basis, importance)
    gravity = np.cumsum((np.asarray(building.masses) * GRAVITY)[::-1])[::-1]
    cd = factors.deflection_amplification
    if basis == "asce7":
        ie = validate.positive("importance", importance, "-")
        ratios = cd * elastic / ie / h
        theta = gravity * (cd * elastic / ie) * ie / (shears * h * cd)
        theta_max = min(0.5 / cd, 0.25)
        source += f"; Delta = C_d delta_xe/I_e with C_d = {cd:g} (§12.8.6); theta Eq. 12.8-16"
    else:
        ratios = nu * cd * elastic / h
        theta = gravity * cd * elastic / (shears * h)
        theta_max = 0.1
        source += f"; d_r = q_d d_e with q_d = {cd:g} (§4.3.4); theta Eq. 4.28, P-delta ignorable below 0.1"
    return DriftCheck(tuple(elastic.tolist()), tuple(ratios.tolist()), float(limit), tuple(theta.tolist()),
                      float(theta_max), bool(np.all(ratios <= limit)), source)
