"""ASCE/SEI 7-16 Ch. 17 equivalent lateral force (ELF) report of an isolated building.

:func:`asce7_elf` runs :func:`isolation.design.design_bounds` for every
property set and reports D_M, D_TM with torsion, moat width, V_b, V_st, V_s
with its limits, storey forces, a drift estimate, the restoring-force check
and the ELF applicability checks (each failure says that response-history
analysis is required). :class:`isolation.design.Item` is re-exported here.

Scope: concept-stage feasibility, not construction design. Clause numbers
marked "from memory" were not re-read; a licensed engineer checks every value
against the governing code.

References
----------
ASCE/SEI 7-16 §17.2.4.4, §17.4.1, §17.5 (Eqs. 17.5-1 to 17.5-3 and §17.5.4-17.5.5), Table 17.5-1.
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, ClassVar, Mapping

import numpy as np

from isolation import GRAVITY
from isolation.bearings.checks import Check
from isolation.codes.asce7_building import ElfBuilding, StoreyForce
from isolation.codes.asce7_fixed_base import approximate_period, fixed_base_shear
from isolation.codes.report import SingleModeReport
from isolation.design.single_mode import BoundsResult, Item, _force, _unit, design_bounds

__all__ = [
    "Item",
    "ElfBuilding",
    "StoreyForce",
    "ElfReport",
    "asce7_elf",
    "activation_force",
    "ISOLATED_IMPORTANCE",
]

ASCE = "ASCE/SEI 7-16"
_RHA = "ELF not permitted: response-history analysis is required"


# --- the ASCE 7 equivalent lateral force report ---------------------------------------


@dataclass(frozen=True)
class ElfReport(SingleModeReport):
    """ASCE/SEI 7-16 Ch. 17 equivalent lateral force summary (see :func:`asce7_elf`): the
    :class:`~isolation.codes.basis.SingleModeReport` of ASCE 7; ``elf_permitted`` is ``permitted``."""

    SYMBOLS: ClassVar[Mapping[str, str]] = {
        "displacement": "D_M", "total_displacement": "D_TM", "period": "T_M", "isolation_shear": "V_b",
        "unreduced_shear": "V_st", "superstructure_shear": "V_s", "fixed_base_shear": "V_fb",
        "shear_ratio": "V_s/V_fb"}

    DICT_FIELDS: ClassVar[tuple] = ("bounds", "building", "quantities", "applicability", "checks", "storey_forces",
                                    "fixed_base", "warnings", "elf_permitted", "scope")

    @property
    def elf_permitted(self) -> bool:
        """True when ASCE/SEI 7-16 §17.4.1 permits the ELF procedure (same as ``permitted``)."""
        return self.permitted


ISOLATED_IMPORTANCE = 1.0
"""I_e of a seismically isolated structure: ASCE/SEI 7-16 §17.2.1 (same in 7-22; from memory,
the clause text was not found through this session's search) takes I_e = 1.0 whatever the risk
category; the building's own I_e applies only to the fixed-base comparison."""


def _damping_source(rule: str | None) -> str:
    return f"{ASCE} Table 17.5-1" if rule == "asce7" else str(rule)


def _activation_force(system) -> float | None:
    """Force that fully activates one property set: its yield (or breakaway friction) force. [kN]"""
    if hasattr(system, "yield_force"):
        return float(system.yield_force)
    if callable(getattr(system, "elements", None)):
        _, ks, fs = system.elements()
        if ks:
            return _force(system, max(f / k for k, f in zip(ks, fs, strict=True)))
    return None


def activation_force(property_sets: Mapping[str, Any]) -> tuple[float | None, str]:
    """Activation force of ASCE/SEI 7-16 §17.5.4.3 item 3: the greater of the upper-bound
    yield force and 1.5 x the nominal yield force. [kN]

    Parameters
    ----------
    property_sets : mapping
        Name -> whole-plane system; "upper" and "nominal" are used when present,
        otherwise the largest yield force of all sets.

    Returns
    -------
    (float or None, str)
        The force [kN] (None when no set has a yield force) and which one governs.
    """
    upper = _activation_force(property_sets["upper"]) if "upper" in property_sets else None
    nominal = _activation_force(property_sets["nominal"]) if "nominal" in property_sets else None
    if upper is None and nominal is None:
        forces = [f for f in (_activation_force(s) for s in property_sets.values()) if f is not None]
        return (max(forces), "largest yield force of the property sets") if forces else (None, "")
    if nominal is not None and (upper is None or 1.5 * nominal >= upper):
        return 1.5 * nominal, "1.5 x nominal yield force"
    return upper, "upper-bound yield force"


def asce7_elf(property_sets: Mapping[str, Any], building: ElfBuilding, spectrum, *, rule: str | None = "asce7",
              bounds: BoundsResult | None = None, **options) -> ElfReport:
    """Equivalent lateral force report of ASCE/SEI 7-16 Ch. 17 for all property sets.

    Parameters
    ----------
    property_sets : mapping
        Name -> whole-plane system (lower, nominal, upper).
    building : ElfBuilding
        Weights, geometry and superstructure data; W = ``building.total_weight``. [kN, m]
    spectrum : spectrum object
        MCE_R site spectrum. [g]
    rule : str or None
        Damping rule for the displacement. [-]
    bounds : BoundsResult, optional
        The equivalent-linear results of ``property_sets`` already computed
        (e.g. by :func:`isolation.design.array_kernel.design_bounds_many`); default:
        computed here.
    **options
        Passed to :func:`equivalent_linear`.

    Returns
    -------
    ElfReport
    """
    if not isinstance(building, ElfBuilding):
        raise ValueError(f"building = {type(building).__name__} is not allowed: must be an ElfBuilding")
    if bounds is None:
        bounds = design_bounds(property_sets, building.total_weight, spectrum, rule, **options)
    items = _displacements(bounds, building)
    shear_items, shears = _shears(bounds, building, spectrum, property_sets)
    items += shear_items
    t_fb = building.fixed_base_period or approximate_period(building.structural_height, building.frame)
    force_items, storeys = _storey_forces(bounds, building, shears, t_fb)
    items += force_items
    applicability = _elf_applicability(bounds, property_sets, building, t_fb)
    checks = _drift_checks(storeys)
    warnings = [f"{c.name}: {c.value:.4g} against limit {c.limit:.4g}{_unit(c)} ({c.source}) - {_RHA}"
                for c in applicability if not c.passed]
    warnings += [f"{c.name}: {c.value:.4g} against limit {c.limit:.4g}{_unit(c)} ({c.source}) - stiffen the "
                 "superstructure or find the drift by analysis" for c in checks if not c.passed]
    permitted = all(c.passed for c in applicability)
    # No given period: fixed_base_shear finds T_a itself (the same t_fb) and notes it as Eq. 12.8-7.
    comparison = fixed_base_shear(spectrum, building.weight_above, building.response_modification,
                                  period=building.fixed_base_period or None,
                                  height=building.structural_height, frame=building.frame,
                                  importance=building.importance, s1=building.s1)
    items += [
        Item("fixed-base design shear", "V_fb", comparison.base_shear, "kN", comparison.governs,
             comparison.period_source),
        Item("ratio isolated/fixed-base design shear", "V_s/V_fb", shears["V_s"] / comparison.base_shear, "-",
             "V_s over §12.8 V"),
    ]
    return ElfReport(bounds=bounds, building=building, quantities=tuple(items), applicability=tuple(applicability),
                     checks=tuple(checks), storey_forces=storeys, fixed_base=comparison, warnings=tuple(warnings),
                     permitted=permitted)


def _displacements(bounds, building: ElfBuilding) -> list:
    """D_M, T_M, beta_M, B_M, k_M of the displacement-governing set; D_TM with torsion; moat (§17.5.3)."""
    low = bounds.displacement
    b, dwidth = building.plan_length, building.plan_width
    d_m = low.displacement
    items: list[Item] = [
        Item("maximum displacement", "D_M", d_m, "m", f"{ASCE} Eq. 17.5-1 (general form g Sa T^2/(4 pi^2 B_M))",
             f"property set '{bounds.displacement_governs}'"),
        Item("effective period at D_M", "T_M", low.period, "s", f"{ASCE} Eq. 17.5-2"),
        Item("effective damping at D_M", "beta_M", low.damping, "-", "Naeim & Kelly (1999): EDC/(2 pi K_eff D^2)"),
        Item("damping coefficient", "B_M", low.damping_coefficient, "-", _damping_source(low.rule)),
        Item("effective stiffness at D_M", "k_M", low.stiffness, "kN/m", f"{ASCE} §17.5.3"),
    ]
    # Torsion (Eqs. 17.5-3/-4); P_T taken <= 1.0 (from memory, verify).
    e = building.eccentricity + 0.05 * b
    y = building.corner_distance if building.corner_distance is not None else b / 2.0 + building.eccentricity
    p_t = min(building.torsion_period_ratio, 1.0)
    raw = d_m * (1.0 + y / p_t**2 * 12.0 * e / (b**2 + dwidth**2))
    d_tm = max(raw, 1.15 * d_m)
    return items + [
        Item("eccentricity incl. 5 % accidental", "e", e, "m",
             f"{ASCE} §17.5.3.3 (accidental 5 % of the longest plan dimension)"),
        Item("total maximum displacement", "D_TM", d_tm, "m", f"{ASCE} Eq. 17.5-3, >= 1.15 D_M",
             "1.15 D_M floor governs" if d_tm > raw
             else f"y = {y:.3g} m, P_T = {p_t:.3g} (taken <= 1.0, from memory)"),
        Item("moat width", "moat", d_tm + building.moat_clearance, "m",
             f"{ASCE} §17.2 (separation from fixed obstructions >= D_TM; clause from memory)",
             f"D_TM plus {building.moat_clearance:g} m clearance (common practice)"),
    ]


def _shears(bounds, building: ElfBuilding, spectrum, property_sets) -> tuple[list, dict]:
    """V_b, V_st, R_I and V_s with its lower limits (§17.5.4) from the force-governing set.

    Returns the items and {"V_b", "V_st", "V_s", "R_I", "beta"} [kN, -]."""
    up = bounds.force
    w, w_s = building.total_weight, building.weight_above
    v_b = up.base_shear
    factor = 3.5 if building.isolator_kind == "sliding" else 2.5
    exponent = 1.0 - factor * up.damping
    v_st = v_b * (w_s / w) ** exponent
    r_i = min(max(3.0 / 8.0 * building.response_modification, 1.0), 2.0)
    items = [
        Item("isolation-system shear", "V_b", v_b, "kN", f"{ASCE} §17.5.4.1 (k_M D_M)",
             f"property set '{bounds.force_governs}'"),
        Item("unreduced superstructure shear", "V_st", v_st, "kN",
             f"{ASCE} §17.5.4.2, V_b (W_s/W)^(1 - {factor} beta_M), exponent {exponent:.3f}"
             + (" (1 - 3.5 beta_M replaces 1 - 2.5 beta_M for a system with an abruptly initiated "
                "transition from pre-sliding to sliding, e.g. a friction pendulum: ASCE/SEI 7-16 "
                "§17.5.4.2, Eq. 17.5-7, from memory, not re-read)" if factor == 3.5 else "")),
        Item("reduction factor", "R_I", r_i, "-", f"{ASCE} §17.5.4.2: 3/8 R within [1.0, 2.0]"),
    ]
    at_tm = fixed_base_shear(spectrum, w_s, r_i, period=up.period, importance=ISOLATED_IMPORTANCE, s1=building.s1)
    activation: float | None
    if building.activation_force is not None:
        activation, activation_note = building.activation_force, "given"
    else:
        activation, activation_note = activation_force(property_sets)
    candidates = [
        ("V_st/R_I", "V_st/R_I", v_st / r_i, f"{ASCE} §17.5.4.2"),
        ("fixed-base shear at T_M", "V_s,min,fixed", at_tm.base_shear,
         f"{ASCE} §17.5.4.3 item 1 (§12.8 with R_I and I_e = 1.0 of §17.2.1, from memory); {at_tm.governs}"),
        ("factored wind shear", "V_s,min,wind", building.wind_base_shear, f"{ASCE} §17.5.4.3 item 2"),
    ]
    if activation is not None:
        v_act = activation * (w_s / w) ** exponent
        candidates.append(("activation force", "V_s,min,activation", v_act,
                           f"{ASCE} §17.5.4.3 item 3: V_st form of §17.5.4.2 with V_b = the activation force "
                           f"{activation:.4g} kN ({activation_note}: greater of upper bound and 1.5 x nominal), "
                           "not divided by R_I (from memory; ASCE/SEI 7-22 same, from memory)"))
    name, _, v_s, source = max(candidates, key=lambda c: c[2])
    items += [Item(f"lower limit on V_s: {n}", sym, v, "kN", s) for n, sym, v, s in candidates[1:]]
    items.append(Item("superstructure design shear", "V_s", v_s, "kN", source, f"governed by {name}"))
    return items, {"V_b": v_b, "V_st": v_st, "V_s": v_s, "R_I": r_i, "beta": up.damping}


def _storey_forces(bounds, building: ElfBuilding, shears: dict, t_fb: float) -> tuple[list, tuple]:
    """F_x = C_vx V_s (§17.5.5, from memory) and a linear-mode drift estimate per level."""
    v_b, v_st, v_s, r_i = shears["V_b"], shears["V_st"], shears["V_s"], shears["R_I"]
    # Vertical distribution: C_vx = w_x h_x^k / sum w_i h_i^k.
    k_exp = 14.0 * shears["beta"] * t_fb
    f_1 = (v_b - v_st) / r_i
    wx, hx = np.array(building.floor_weights), np.array(building.floor_elevations)
    share = wx * hx**k_exp / np.sum(wx * hx**k_exp)
    forces = share * v_s
    items = [
        Item("fixed-base period", "T_fb", t_fb, "s",
             "given" if building.fixed_base_period else f"{ASCE} Eq. 12.8-7 (T_a)"),
        Item("distribution exponent", "k", k_exp, "-", f"{ASCE} §17.5.5 (14 beta_M T_fb, from memory)"),
        Item("force at base level", "F_1", f_1, "kN", f"{ASCE} §17.5.5 ((V_b - V_st)/R_I, from memory)"),
    ]
    # Drift estimate: linear shape, generalised stiffness from T_fb; C_d = R_I and I_e = 1.0
    # (ASCE/SEI 7-16 §17.5.6 and §17.2.1, from memory): delta = C_d delta_e / I_e.
    shape = hx / hx[-1]
    k_star = (2.0 * math.pi / t_fb) ** 2 * np.sum(wx / GRAVITY * shape**2)
    u_top = float(np.sum(forces * shape) / k_star)
    heights = np.diff(np.concatenate(([0.0], hx)))
    drifts = np.diff(np.concatenate(([0.0], shape))) * u_top * r_i / ISOLATED_IMPORTANCE
    storey_shears = np.cumsum(forces[::-1])[::-1]
    storeys = tuple(StoreyForce(i + 2, float(hx[i]), float(wx[i]), float(forces[i]), float(storey_shears[i]),
                                float(drifts[i]), float(drifts[i] / heights[i])) for i in range(len(wx)))
    return items, storeys


def _drift_checks(storeys) -> list:
    """The largest storey drift ratio estimate against 0.015 (§17.5.6, from memory)."""
    worst = max(storeys, key=lambda s: s.drift_ratio)
    return [Check(f"storey drift ratio estimate (level {worst.level})", worst.drift_ratio, 0.015,
                  worst.drift_ratio <= 0.015, "-",
                  f"{ASCE} §17.5.6: 0.015 h_sx with C_d = R_I (from memory); linear-mode-shape estimate")]


def _elf_applicability(bounds, property_sets, building, t_fb) -> list[Check]:
    """Conditions under which ASCE/SEI 7-16 §17.4.1 permits the ELF procedure (from memory).

    The "S_1 < 0.6 g" condition of ASCE/SEI 7-10 §17.4.1 is not in the 7-16 (nor 7-22) list as
    remembered (the clause text was not found through this session's search): it is not
    checked; near-fault sites are judged from the study's fault distance in the verdict.
    """
    results = bounds.results
    t_long = max(r.period for r in results.values())
    t_short = min(r.period for r in results.values())
    beta_max = max(r.damping for r in results.values())
    src = f"{ASCE} §17.4.1 (from memory)"
    site = "ABCDEF".index(building.site_class)
    storeys, height = len(building.floor_weights), building.structural_height
    checks = [
        Check(f"site class {building.site_class} within A-D (A=0 ... F=5)", float(site), 3.0, site <= 3, "-", src),
        Check("storeys above the isolation interface", float(storeys), 4.0, storeys <= 4, "-", src),
        Check("height above the isolation interface", height, 19.8, height <= 19.8, "m", src),
        Check("longest effective period T_M", t_long, 5.0, t_long <= 5.0, "s", src),
        Check("shortest T_M over 3 T_fb", t_short / t_fb, 3.0, t_short > 3.0 * t_fb, "-", src),
        Check("largest effective damping beta_M", beta_max, 0.30, beta_max <= 0.30, "-", src),
        Check("barred structural irregularity (1 = present)", float(building.irregular), 0.0, not building.irregular,
              "-", src),
    ]
    for name, r in results.items():
        system, d = property_sets[name], r.displacement
        ratio = float(system.effective_stiffness(d)) / float(system.effective_stiffness(0.2 * d))
        checks.append(Check(f"k_eff(D_M)/k_eff(0.2 D_M), {name}", ratio, 1.0 / 3.0, ratio > 1.0 / 3.0, "-", src))
        restoring = (_force(system, d) - _force(system, 0.5 * d)) / r.weight
        checks.append(Check(f"restoring force (F(D_M) - F(D_M/2))/W, {name}", restoring, 0.025, restoring >= 0.025,
                            "-", f"{ASCE} §17.2.4.4"))
    return checks
