"""ASCE/SEI 7-16 as a code basis (registry name ``"asce7"``).

A thin adapter: it chooses among the formulas of :mod:`isolation.site.damping`,
:mod:`isolation.site.spectra`, :mod:`isolation.codes.asce7` (Ch. 17 ELF report),
:mod:`isolation.codes.asce7_fixed_base` (§12.8) and :mod:`isolation.design.overturning`
and cites the clause. Clause numbers marked "from memory" were not re-read.

References
----------
ASCE/SEI 7-16, Minimum Design Loads and Associated Criteria for Buildings and Other
Structures; the clause of each rule is named beside it.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Mapping

import numpy as np

from isolation import validate
from isolation.codes.basis import CodeBasis, SuiteRules
from isolation.codes.damping_rule_names import ASCE7_RULE
from isolation.codes.lateral_systems import FRAMES, LATERAL_SYSTEM_ROWS
from isolation.site.damping import _b_m

__all__ = ["Asce7Basis", "ASCE7", "SYSTEM_ROWS", "DRIFT_LIMITS"]

_ASCE = "ASCE/SEI 7-16"
_PRACTICE = "common practice"

SYSTEM_ROWS = {
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
"""ASCE/SEI 7-16 Table 12.2-1 (from memory): lateral system -> rows (R, Omega_0, C_d, description)."""

DRIFT_LIMITS = {1.0: (0.020, "risk category I or II"), 1.25: (0.015, "risk category III"),
                1.5: (0.010, "risk category IV")}
"""ASCE/SEI 7-16 Table 12.12-1, all other structures (from memory): I_e -> (Delta_a/h_sx, category)."""

_SOURCES = {
    "period shift": f"{_ASCE} §17.4.1 item 5 (from memory): ELF needs T_M > 3 T, T from Eq. 12.8-7 or 12.8-8",
    "isolated period limit": f"{_ASCE} §17.4.1 (from memory)",
    "displacement capacity": f"{_ASCE} §17.2.4.5 and §17.6.3.4 (from memory): bearings stable at D_TM",
    "moat": f"{_ASCE} §17.2.6 (from memory): separation not less than D_TM",
    "design shear": f"{_ASCE} §17.5.4.2 (R_I = 3/8 R within 1-2) and §12.8.1 (from memory)",
    "uplift": ("outermost bearing of a regular grid, rigid-body overturning from V_st at its height "
               f"(derived), tributary gravity of the lightest bearing group ({_PRACTICE}); "
               f"0.9 D - E_v, E_v = 0.2 S_MS D ({_ASCE} §17.2.4.6, §12.4.2.2, from memory)"),
    "soft soil class F": f"{_ASCE} §11.4.8 (re-read: Table 11.4-2 sends site class F to it), §17.4.1 (from memory)",
    "near fault": (f"{_ASCE} §11.2 'near-fault site' (within 15 km of a fault of M_w >= 7, 10 km of M_w >= 6) "
                   "and §17.3.2 (from memory)"),
    "wind": f"{_ASCE} §17.2.4.3 (from memory): wind without yielding the isolation system",
    "analysis procedure": f"{_ASCE} §17.4.1 (from memory)",
    "effective damping": f"{_ASCE} §17.4.1 (from memory)",
}

_RESIDUAL = ("residual drift ratio 0.5 % at which the structure needs realignment, FEMA P-58-1 (2012) "
             "residual drift damage states (from memory)")


@dataclass(frozen=True)
class Asce7Basis(CodeBasis):
    """ASCE/SEI 7-16 Ch. 17: MCE_R site spectrum, B_M of Table 17.5-1, the ELF report."""

    name: str = "asce7"
    title: str = _ASCE
    damping_rule: str = ASCE7_RULE
    site_keys: tuple = ("sms", "sm1", "long_period")
    site_class_key: str = "site_class"
    site_class_word: str = "site class"
    site_classes: tuple = ("A", "B", "C", "D", "E", "F")
    importance_range: tuple = (1.0, 1.5)
    importance_meaning: str = "I_e of ASCE/SEI 7-16 Table 1.5-2"
    suite: SuiteRules = SuiteRules(
        mean_ratio=1.10, goal=1.15, period_range=(0.75, 1.25), pair_spectrum="RotD100", pair_ratio=1.10,
        pair_goal=1.15, pair_period_range=(0.75, 1.25), pair_start=1.0 / 1.25, history_lower_limit=0.8,
        source="ASCE/SEI 7-22 Ch. 16 matched-suite rule (from memory)")
    symbols: Mapping[str, str] = field(default_factory=lambda: {
        "displacement": "D_M", "total_displacement": "D_TM", "period": "T_M", "isolation_shear": "V_b",
        "unreduced_shear": "V_st", "superstructure_shear": "V_s", "fixed_base_shear": "V_fb",
        "shear_ratio": "V_s/V_fb"})
    procedure: str = "the ELF procedure"
    procedure_full: str = "the equivalent lateral force procedure"
    site_level: str = "MCE_R"
    reference_levels: tuple = (2.0 / 3.0, 1.0)
    level_marks: tuple = ("design level", "MCE_R")
    level_names: tuple = ("design level", "MCE_R")
    near_fault_distance: float = 15.0
    drift_formula: str = "C_d delta_xe/(I_e h_sx)"
    sources: Mapping[str, str] = field(default_factory=lambda: dict(_SOURCES))
    yielding_source: str = ("common practice: R_I <= 2 (ASCE/SEI 7-16 §17.5.4.2) aims at an essentially elastic "
                            "isolated superstructure, ductility demand above 2 taken as more than that (from "
                            "memory); " + _RESIDUAL)
    extends_spectrum: bool = False
    long_period_bars_procedure: bool = True
    report_title: str = "ELF procedure (ASCE/SEI 7-16 §17.4.1)"
    answer_source: str = "ASCE/SEI 7-16 §17.5, MCE_R"
    site_inputs: tuple = ("sms", "sm1", "long_period", "s1", "site_class")
    quantity_labels: Mapping[str, str] = field(default_factory=lambda: {
        "displacement": "D_M, maximum displacement (lower bound)",
        "total_displacement": "D_TM, total maximum displacement with torsion",
        "moat": "Moat width needed (D_TM + 50 mm)",
        "isolation_shear": "V_b, isolation-system shear (upper bound)",
        "superstructure_shear": "V_s, superstructure design shear",
        "shear_ratio": "V_s / V_fb, isolated over fixed-base design shear"})

    # --- site ---------------------------------------------------------------------------------
    def damping_coefficient(self, beta):
        return _b_m(np.asarray(beta, dtype=float))

    def read_site(self, reader, values: dict, tabulated: bool) -> None:
        t = reader
        if not tabulated:
            values["sms"] = t.number("sms", low=0.0, high=5.0, low_inclusive=False, unit="g")
            values["sm1"] = t.number("sm1", low=0.0, high=5.0, low_inclusive=False, unit="g")
            values["long_period"] = t.quantity("long_period", "time", low=1.0, high=20.0,
                                               required=False, default=8.0)
        values["s1"] = t.number("s1", low=0.0, high=5.0, unit="g", required=False)
        values["site_class"] = t.choice("site_class", self.site_classes)
        if not tabulated and isinstance(values.get("sms"), float) and isinstance(values.get("sm1"), float):
            tl = values.get("long_period")
            if isinstance(tl, float) and tl <= values["sm1"] / values["sms"]:
                t.problems.add(f"site.long_period = {tl:g} s is not allowed: must exceed "
                               f"T_S = sm1/sms = {values['sm1'] / values['sms']:.3g} s")

    def site_spectrum(self, site, importance: float = 1.0):
        from isolation.site.spectra import CodeSpectrum

        return CodeSpectrum(site.sms, site.sm1, long_period=site.long_period, rule=self.damping_rule)

    def site_advice(self, site) -> list:
        out = []
        if site.sm1 > site.sms:
            out.append(f"S_M1 = {site.sm1:g} g exceeds S_MS = {site.sms:g} g, so T_S = S_M1/S_MS = "
                       f"{site.sm1 / site.sms:.2f} s: code site spectra have S_M1 well below S_MS (ASCE/SEI 7-16 "
                       "§11.4.4: S_MS = F_a S_S, S_M1 = F_v S_1, re-read; S_1 < S_S on the maps, from memory). "
                       "Check the site values.")
        if site.long_period < 4.0:
            out.append(f"T_L = {site.long_period:g} s: the long-period transition of the ASCE 7 maps is 4 s or more "
                       "(ASCE/SEI 7-16 Fig. 22-14 to 22-17, from memory).")
        return out

    def site_suitability(self, site_class: str) -> tuple[str, str]:
        if site_class == "F":
            return "against", (f"{self.site_class_word} F needs a site-specific response analysis; "
                               "soft or liquefiable soil amplifies long periods")
        if site_class == "E":
            return "condition", f"{self.site_class_word} {site_class} is soft"
        return super().site_suitability(site_class)

    # --- fixed base ------------------------------------------------------------------------------
    def fixed_base_period(self, height: float, lateral_system: str) -> tuple[float, str]:
        from isolation.codes.asce7_fixed_base import approximate_period

        return (approximate_period(height, FRAMES[lateral_system]),
                f"ASCE/SEI 7-16 Eq. 12.8-7 (T_a = C_t h^x), {LATERAL_SYSTEM_ROWS[lateral_system][1]}")

    def period_note(self, spectrum, t_fb: float, t_m: float) -> str:
        from isolation.codes.asce7_fixed_base import design_values, period_upper_limit_factor

        cu = period_upper_limit_factor(design_values(spectrum)[1])
        return (f"T_fb = T_a = C_t h^x, ASCE/SEI 7-16 Eq. 12.8-7; with the upper limit C_u T_a = {cu * t_fb:.2f} s "
                f"(C_u = {cu:.2f}, Table 12.8-1) the ratio is {t_m / (cu * t_fb):.2f}")

    # --- single-mode report --------------------------------------------------------------------------
    def design_report(self, study, sets, system, spectrum, t_fb: float, bounds=None):
        from isolation.codes.asce7 import ElfBuilding, asce7_elf

        b = study.building
        elevations = tuple(np.cumsum(b.storey_heights).tolist())
        # Without a mapped S_1, S_M1 stands in (conservative for the ELF limit S_1 < 0.6 g where
        # F_v >= 1); for a tabulated spectrum, its S_M1 equivalent max(T Sa) over 1-5 s.
        s1 = study.site.s1
        if s1 is None:
            from isolation.codes.asce7_fixed_base import design_values
            s1 = study.site.sm1 if study.site.sm1 is not None else 1.5 * design_values(spectrum)[1]
        elf = ElfBuilding(base_weight=b.base_weight, floor_weights=b.floor_weights, floor_elevations=elevations,
                          plan_length=b.plan_length, plan_width=b.plan_width,
                          response_modification=b.response_modification, eccentricity=b.eccentricity,
                          isolator_kind="sliding" if system.is_sliding else "other", fixed_base_period=t_fb,
                          frame=FRAMES[b.lateral_system], importance=b.importance,
                          wind_base_shear=study.wind_base_shear or 0.0, s1=s1, site_class=study.site.site_class)
        return asce7_elf(sets, elf, spectrum, rule=self.damping_rule, bounds=bounds)

    def uplift_action(self, study, report, spectrum, plateau) -> tuple:
        from isolation.design.overturning import asce7_vertical_fraction

        b = study.building
        heights = np.cumsum(b.storey_heights)
        forces = np.array([s.force for s in report.storey_forces])
        shear = report.value("V_st")
        height = float(np.dot(forces, heights) / forces.sum()) if forces.sum() > 0 else 2.0 / 3.0 * b.height
        sms = study.site.sms if study.site.sms is not None else plateau(spectrum)
        factor, vertical, source = asce7_vertical_fraction(sms)
        return shear, height, factor, vertical, source

    def torsion_action(self, report) -> tuple[float, float]:
        # the torsion formula acts on D_M with e = actual + 5 % accidental (the report's e)
        return report.value("D_M"), report.value("e")

    # --- drift and strength ------------------------------------------------------------------------
    def history_drift_limit(self, nonstructural: str | None = None, importance: float = 1.0) -> tuple[float, str]:
        return 0.020, f"{_ASCE} §17.6.4.4, MCE_R response-history analysis (from memory)"

    def report_drift_limit(self) -> tuple[float, str]:
        return 0.015, f"{_ASCE} §17.5.6 (from memory)"

    def allowable_drift(self, importance: float = 1.0) -> tuple[float, float, str]:
        ie = validate.positive("importance", importance, "-")
        key = min(DRIFT_LIMITS, key=lambda k: (abs(k - ie), -k))
        limit, category = DRIFT_LIMITS[key]
        return limit, 1.0, f"{_ASCE} §12.12.1, Table 12.12-1, all other structures, {category} (from memory)"

    def system_factors(self, lateral_system: str, response_modification: float) -> tuple[float, float, str]:
        r = float(response_modification)
        row = min(SYSTEM_ROWS[lateral_system], key=lambda row: abs(row[0] - r))
        return row[1], row[2], (f"{_ASCE} Table 12.2-1, {row[3]} (R = {row[0]:g}, Omega_0 = {row[1]:g}, "
                                f"C_d = {row[2]:g}; from memory)")

    def fixed_base_forces(self, spectrum, weights, elevations, response_modification: float, *, period: float,
                          importance: float, frame: str, s1: float) -> tuple:
        from isolation.codes.asce7_fixed_base import fixed_base_shear
        from isolation.performance.strength import asce7_distribution

        design = fixed_base_shear(spectrum, float(np.sum(weights)), response_modification, period=period,
                                  height=float(elevations[-1]), frame=frame, importance=importance, s1=s1)
        shares = asce7_distribution(weights, elevations, design.period)
        t = design.period
        source = (f"{_ASCE} §12.8.1 V = C_s W, C_s = {design.response_coefficient:.4g} ({design.governs}), "
                  f"T = {t:.3g} s ({design.period_source}); §12.8.3 C_vx with k = "
                  f"{float(np.interp(t, [0.5, 2.5], [1.0, 2.0])):.3g}")
        return design.base_shear, shares, t, source

    def isolated_forces(self, report, weights, total_weight: float | None) -> tuple:
        forces = np.array([s.force for s in report.storey_forces], dtype=float)
        return forces, f"{_ASCE} §17.5.4.2 V_s with R_I, §17.5.5 F_x = C_vx V_s (from memory)"

    def drift_ratios(self, elastic, shears, heights, gravity, amplification: float, importance: float,
                     nu: float) -> tuple:
        ie = validate.positive("importance", importance, "-")
        cd = amplification
        ratios = cd * elastic / ie / heights
        theta = gravity * (cd * elastic / ie) * ie / (shears * heights * cd)
        return (ratios, theta, min(0.5 / cd, 0.25),
                f"; Delta = C_d delta_xe/I_e with C_d = {cd:g} (§12.8.6); theta Eq. 12.8-16")

    # --- loss ----------------------------------------------------------------------------------------
    def risk_category(self, importance: float) -> str:
        i = float(importance)
        return "II" if i <= 1.0 + 1e-9 else ("III" if i <= 1.25 + 1e-9 else "IV")

    def default_hazard(self, hazard_inputs: Any):
        return None


ASCE7 = Asce7Basis()
"""The ASCE/SEI 7-16 code basis."""
