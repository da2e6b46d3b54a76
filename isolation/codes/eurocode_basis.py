"""EN 1998-1:2004 as a code basis (registry name ``"eurocode"``).

A thin adapter: it chooses among the formulas of :mod:`isolation.site.damping`
(eta), :mod:`isolation.site.spectra` (the elastic spectrum), :mod:`isolation.codes.eurocode`
(§10.9 simplified analysis, §4.3.3.2 lateral force method) and
:mod:`isolation.design.overturning`, and cites the clause. Clauses marked
"from memory" were not re-read; National Annexes may change the values.

References
----------
EN 1998-1:2004, Eurocode 8, Part 1; the clause of each rule is named beside it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Mapping

import numpy as np

from isolation import validate
from isolation.codes.basis import CodeBasis, SuiteRules
from isolation.codes.damping_rule_names import EUROCODE_RULE
from isolation.codes.lateral_systems import FRAMES, LATERAL_SYSTEM_ROWS
from isolation.site.damping import _eta

__all__ = ["EurocodeBasis", "EUROCODE", "OVERSTRENGTH", "NONSTRUCTURAL", "eurocode_reduction_factor",
           "EUROCODE_MAX_PERIOD", "EUROCODE_SPECTRUM_NOTE"]

_EC8 = "EN 1998-1:2004"
_PRACTICE = "common practice"

EUROCODE_MAX_PERIOD = 10.0
"""Longest period of a study's Eurocode site spectrum [s]: EN 1998-1 §3.2.2.2 ends at 4 s,
but the suite-mean check (up to 2 T_M) and the matched band (up to max(6 s, 1.5 T_M)) of
isolated buildings reach beyond it, so the T_C T_D/T^2 branch is continued to 10 s."""

EUROCODE_SPECTRUM_NOTE = ("EN 1998-1 elastic spectrum with a_g = gamma_I a_gR, gamma_I = building.importance "
                          "(§2.1(3), §4.2.5, from memory): beyond 4 s its T_C T_D/T^2 branch is extended to "
                          f"{EUROCODE_MAX_PERIOD:g} s (constant spectral displacement); the displacement "
                          "spectrum of EN 1998-1 Annex A is not implemented")
"""Assumption stated in the results of a study on a Eurocode (not tabulated) spectrum."""

OVERSTRENGTH = {
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
"""EN 1998-1 alpha_u/alpha_1 (from memory): §5.2.2.2(5) concrete, §6.3.2(3) steel; multi-storey, multi-bay."""

_SOURCES = {
    "period shift": f"{_EC8} §10.9.2 (from memory): T_eff >= 3 T_f for the simplified analysis",
    # EN 1998-1 §10.9.2 stops the simplified analysis at T_eff = 3 s (reported under
    # "analysis procedure"); the 5 s band end is a rule of thumb.
    "isolated period limit": _PRACTICE,
    "displacement capacity": (f"{_EC8} §10.3(2) increased reliability, gamma_x on isolator displacements, and "
                              "§10.4 compliance criteria (from memory): isolators accommodate d_d"),
    "moat": f"{_EC8} §10.4 compliance criteria (from memory): clearance for the isolator design displacement d_d",
    "design shear": (f"{_EC8} §10.10(5) (q <= 1.5 for the isolated superstructure) and §4.3.3.2 "
                     "fixed-base lateral force method (from memory)"),
    "uplift": ("outermost bearing of a regular grid, rigid-body overturning from the superstructure's "
               f"share of V at its mass centre (derived), tributary gravity of the lightest group "
               f"({_PRACTICE}); G with 0.3 of the vertical action where a_vg > 0.25 g "
               f"(EN 1990 Eq. 6.12b, {_EC8} §4.3.3.5.2, from memory)"),
    "soft soil class F": _PRACTICE,
    "near fault": (f"{_PRACTICE}; {_EC8} §10.9.2 (from memory) allows the simplified analysis only "
                   "beyond 15 km from an active fault of Ms >= 6.5"),
    "wind": f"{_PRACTICE}: wind without yielding the isolation system",
    "analysis procedure": (f"{_EC8} §10.9 simplified analysis and its applicability limits, §10.10 modal "
                           "simplified analysis (from memory)"),
    "effective damping": f"{_EC8} §10.9.1 (from memory): xi_eff <= 30 % for the simplified analysis",
}

_DRIFT_SOURCE = (f"{_EC8} §4.4.3.2 damage limitation (from memory): d_r nu <= 0.010 h with "
                 "nu = 0.5 (recommended for importance classes I-II; 0.4 for III-IV allows 2.5 %), i.e. "
                 "2 % under the design seismic action; 0.005 h or 0.0075 h when brittle or "
                 "ductile non-structural elements interfere")

NONSTRUCTURAL = {"brittle": 0.005, "ductile": 0.0075, "none": 0.010}
"""EN 1998-1:2004 §4.4.3.2(1) (from memory): d_r nu <= alpha h with alpha 0.005 (brittle
non-structural elements attached to the structure), 0.0075 (ductile ones), 0.010 (none, or
fixed so as not to interfere with structural deformations)."""


def eurocode_reduction_factor(importance: float = 1.0) -> float:
    """nu of EN 1998-1 §4.4.3.2(2) (recommended 0.5 for importance classes I-II, 0.4 for III-IV;
    from memory), from gamma_I (0.8/1.0 classes I-II, 1.2/1.4 classes III-IV). [-]

    Parameters
    ----------
    importance : float
        gamma_I, > 0. [-]
    """
    gamma = validate.positive("importance", importance, "-")
    return 0.5 if gamma <= 1.1 else 0.4


_RESIDUAL = ("residual drift ratio 0.5 % at which the structure needs realignment, FEMA P-58-1 (2012) "
             "residual drift damage states (from memory)")


@dataclass(frozen=True)
class EurocodeBasis(CodeBasis):
    """EN 1998-1: elastic site spectrum (the design action), eta, the §10.9 simplified analysis."""

    name: str = "eurocode"
    title: str = "EN 1998-1"
    damping_rule: str = EUROCODE_RULE
    site_keys: tuple = ("ag", "spectrum_type")
    site_class_key: str = "ground_type"
    site_class_word: str = "ground type"
    site_classes: tuple = ("A", "B", "C", "D", "E")
    importance_range: tuple = (0.8, 1.4)
    importance_meaning: str = "gamma_I of EN 1998-1 §4.2.5, 0.8/1.0/1.2/1.4 for classes I-IV"
    suite: SuiteRules = SuiteRules(
        mean_ratio=0.90, goal=1.08, period_range=(0.2, 2.0), pair_spectrum="SRSS", pair_ratio=1.30,
        pair_goal=1.40, pair_period_range=(0.2, 1.5), pair_start=1.0 / math.sqrt(2.0), history_lower_limit=0.0,
        source="EN 1998-1:2004 §3.2.3.1.2 (from memory)")
    symbols: Mapping[str, str] = field(default_factory=lambda: {
        "displacement": "d_dc", "total_displacement": "d_d", "period": "T_eff", "isolation_shear": "V",
        "superstructure_shear": "V_s", "fixed_base_shear": "F_b", "shear_ratio": "V_s/F_b"})
    procedure: str = "the simplified analysis"
    procedure_full: str = "the simplified linear analysis"
    site_level: str = "design action"
    reference_levels: tuple = (1.0, 1.5)
    level_marks: tuple = ("design action", "1.5 x design")
    level_names: tuple = ("design action", "1.5 x design action")
    near_fault_distance: float = 15.0
    drift_formula: str = "nu q d_e/h"
    sources: Mapping[str, str] = field(default_factory=lambda: dict(_SOURCES))
    yielding_source: str = ("common practice: q <= 1.5 (EN 1998-1 §10.10(5)) keeps the isolated superstructure "
                            "essentially elastic, ductility demand above 2 taken as more than that (from memory); "
                            + _RESIDUAL)
    extends_spectrum: bool = True
    long_period_bars_procedure: bool = False
    report_title: str = "simplified analysis (EN 1998-1 §10.9)"
    answer_source: str = "EN 1998-1 §10.9, design action"
    site_inputs: tuple = ("ag", "spectrum_type", "ground_type")
    quantity_labels: Mapping[str, str] = field(default_factory=lambda: {
        "displacement": "d_dc, design displacement (lower bound)",
        "total_displacement": "d_d, isolator design displacement",
        "moat": "Gap needed (d_d + 50 mm, common practice)",
        "isolation_shear": "V, elastic base shear (upper bound)",
        "superstructure_shear": "V_s, superstructure design shear",
        "shear_ratio": "V_s / F_b, isolated over fixed-base"})

    # --- site ---------------------------------------------------------------------------------
    def damping_coefficient(self, beta):
        return 1.0 / _eta(np.asarray(beta, dtype=float))

    def read_site(self, reader, values: dict, tabulated: bool) -> None:
        t = reader
        if not tabulated:
            values["ag"] = t.number("ag", low=0.0, high=1.5, low_inclusive=False, unit="g")
            values["spectrum_type"] = t.choice("spectrum_type", (1, 2), required=False, default=1)
        values["ground_type"] = t.choice("ground_type", self.site_classes)

    def site_spectrum(self, site, importance: float = 1.0):
        from isolation.site.spectra import EurocodeSpectrum

        return EurocodeSpectrum(site.ag, ground=site.ground_type, spectrum_type=site.spectrum_type,
                                importance=importance, max_period=EUROCODE_MAX_PERIOD)

    def spectrum_note(self, site) -> str:
        return "" if site.spectrum_periods else EUROCODE_SPECTRUM_NOTE

    def site_suitability(self, site_class: str) -> tuple[str, str]:
        if site_class in ("D", "E"):
            return "condition", f"{self.site_class_word} {site_class} is soft"
        return super().site_suitability(site_class)

    # --- fixed base ------------------------------------------------------------------------------
    def fixed_base_period(self, height: float, lateral_system: str) -> tuple[float, str]:
        from isolation.codes.eurocode import eurocode_approximate_period

        return (eurocode_approximate_period(height, FRAMES[lateral_system]),
                f"EN 1998-1:2004 Eq. 4.6 estimate T_1 = C_t H^(3/4), {LATERAL_SYSTEM_ROWS[lateral_system][2]}")

    def period_note(self, spectrum, t_fb: float, t_m: float) -> str:
        return "T_fb = C_t H^(3/4), EN 1998-1 Eq. 4.6"

    # --- single-mode report --------------------------------------------------------------------------
    def design_report(self, study, sets, system, spectrum, t_fb: float, bounds=None):
        from isolation.codes.eurocode import EurocodeBuilding, eurocode_simplified

        b = study.building
        ec = EurocodeBuilding(weight=b.total_weight, superstructure_weight=sum(b.floor_weights),
                              superstructure_period=t_fb, plan_length=b.plan_length,
                              plan_width=b.plan_width, eccentricity=b.eccentricity, storeys=b.storeys,
                              behaviour_factor=b.response_modification)
        return eurocode_simplified(sets, ec, spectrum, bounds=bounds, rule=self.damping_rule)

    def uplift_action(self, study, report, spectrum, plateau) -> tuple:
        from isolation.design.overturning import eurocode_vertical_fraction

        b = study.building
        heights = np.cumsum(b.storey_heights)
        weights = np.asarray(b.floor_weights, dtype=float)
        shear = report.value("V") * weights.sum() / b.total_weight
        height = float(np.dot(weights, heights) / weights.sum())
        if study.site.ag is not None:
            ag, kind = study.site.ag * b.importance, study.site.spectrum_type or 1
        else:
            ag, kind = plateau(spectrum) / 2.5, 1
        factor, vertical, source = eurocode_vertical_fraction(ag, kind)
        return shear, height, factor, vertical, source

    def torsion_action(self, report) -> tuple[float, float]:
        # delta acts on gamma_x d_dc with e_tot = actual + 5 % accidental (the report's e_tot)
        return report.value("gamma_x") * report.value("d_dc"), report.value("e_tot")

    # --- drift and strength ------------------------------------------------------------------------
    def history_drift_limit(self, nonstructural: str | None = None, importance: float = 1.0) -> tuple[float, str]:
        if nonstructural is None:
            return 0.020, _DRIFT_SOURCE
        validate.one_of("nonstructural", nonstructural, tuple(NONSTRUCTURAL))
        alpha, nu = NONSTRUCTURAL[nonstructural], eurocode_reduction_factor(importance)
        return alpha / nu, (f"{_EC8} §4.4.3.2 damage limitation (from memory): d_r nu <= {alpha:g} h for "
                            f"non-structural elements '{nonstructural}', nu = {nu:g} (gamma_I = {importance:g}), "
                            f"so {alpha / nu:.2%} under the design seismic action")

    def report_drift_limit(self) -> tuple[float, str]:
        return self.history_drift_limit()

    def allowable_drift(self, importance: float = 1.0) -> tuple[float, float, str]:
        ie = validate.positive("importance", importance, "-")
        nu = 0.4 if ie >= 1.2 else 0.5
        return 0.005, nu, (f"{_EC8} §4.4.3.2(1)a, brittle non-structural elements, nu = {nu:g} "
                           "(importance class " + ("III-IV" if nu == 0.4 else "I-II") + "; from memory)")

    def system_factors(self, lateral_system: str, response_modification: float) -> tuple[float, float, str]:
        omega, where = OVERSTRENGTH[lateral_system]
        return omega, float(response_modification), (
            f"{_EC8} {where}: alpha_u/alpha_1 = {omega:g} (from memory; a lower estimate of the "
            "real overstrength); q_d = q (§4.3.4)")

    def fixed_base_forces(self, spectrum, weights, elevations, response_modification: float, *, period: float,
                          importance: float, frame: str, s1: float) -> tuple:
        from isolation.codes.eurocode import eurocode_design_spectrum
        from isolation.performance.strength import eurocode_distribution
        from isolation.site.spectra import EurocodeSpectrum

        t = validate.positive("period", period, "s")
        q = validate.in_range("response_modification", response_modification, 1.0, 10.0, "-")
        parameters = getattr(spectrum, "parameters", None)
        corner = float(parameters[2]) if parameters is not None else 0.5
        lam = 0.85 if (len(weights) > 2 and t <= 2.0 * corner) else 1.0
        if isinstance(spectrum, EurocodeSpectrum) and t <= 4.0:
            sd = eurocode_design_spectrum(spectrum, t, q)
            how = "§3.2.2.5 design spectrum S_d(T)"
        else:
            sd = float(spectrum.sa(t)) / q
            how = "elastic Sa(T)/q (common practice for a tabulated spectrum)"
        base = sd * float(np.sum(weights)) * lam
        shares = eurocode_distribution(weights, elevations)
        source = (f"{_EC8} §4.3.3.2.2 F_b = S_d(T_1) m lambda, {how}, q = {q:g}, lambda = {lam:g}, "
                  f"T_1 = {t:.3g} s; §4.3.3.2.3 F_i = F_b z_i m_i / sum z_j m_j")
        return base, shares, t, source

    def isolated_forces(self, report, weights, total_weight: float | None) -> tuple:
        w = np.asarray(weights, dtype=float)
        total = float(w.sum()) if total_weight is None else validate.positive("total_weight", total_weight, "kN")
        forces = float(report.value("V_s")) * w / total
        return forces, (f"{_EC8} §10.10(5) V_s with q <= 1.5 (from memory), spread in proportion to the floor "
                        "weights (near-rigid superstructure)")

    def drift_ratios(self, elastic, shears, heights, gravity, amplification: float, importance: float,
                     nu: float) -> tuple:
        cd = amplification
        ratios = nu * cd * elastic / heights
        theta = gravity * cd * elastic / (shears * heights)
        return (ratios, theta, 0.1,
                f"; d_r = q_d d_e with q_d = {cd:g} (§4.3.4); theta Eq. 4.28, P-delta ignorable below 0.1")

    # --- loss ----------------------------------------------------------------------------------------
    def risk_category(self, importance: float) -> str:
        i = float(importance)
        return "II" if i <= 1.0 + 1e-9 else ("III" if i <= 1.2 + 1e-9 else "IV")

    def default_hazard(self, hazard_inputs: Any):
        from isolation.loss.hazard import PowerLawHazard, rate_from_probability

        h = hazard_inputs
        rate = h.mce_rate if h.mce_rate is not None else rate_from_probability(0.10, 50.0)
        if h.design_rate is not None:
            raise ValueError(f"hazard.design_rate is not allowed for code.basis = {self.name!r}: the site spectrum is "
                             "the design level; give hazard.mce_rate (its rate) or hazard points")
        hazard = PowerLawHazard(rate, 3.0)
        basis = (f"power law through the design action at {rate:.3g}/year (default 10 % in 50 years, EN 1998-1 "
                 "§2.1 recommended) with exponent k = 3 (EN 1998-1 §2.1(4) note: k of the order of 3)")
        return hazard, basis


EUROCODE = EurocodeBasis()
"""The EN 1998-1:2004 code basis."""
