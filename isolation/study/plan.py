"""Bidirectional response histories of a study's alternatives on the plan model.

What a study asks for with ``[analysis] bidirectional = true``:

* the plan superstructure: the planar shear building's floor masses, storey
  stiffnesses and heights in both directions (the study gives one lateral
  system, taken alike along the length and the width: an assumption stated in
  the report), plan ``plan_length x plan_width`` with the centre of rigidity
  ``eccentricity`` from the centre of mass along the length;
* bearings on a grid over the plan (``grid`` of the alternative, or the grid
  of the bearing count closest to the plan proportions), groups in the order
  given, gravity loads in proportion to each group's axial load;
* the accidental eccentricity as a mass offset of 5 % of the plan dimension
  in each direction, four sign combinations run (ASCE/SEI 7-16 §12.8.4.2 and
  §17.5.3.3 / EN 1998-1 §4.3.2(1); from memory);
* lower and upper property sets, every pair of the matched suite of pairs;
* storey strengths: the same code-designed storey yield shears as the planar
  comparison (:mod:`isolation.performance.comparison`: the isolated superstructure's from
  V_s, the fixed base's from its equivalent-lateral-force design, times the
  overstrength), in x and in y alike, with the study's hardening and P-delta;
  each storey's x and y springs are bilinear with kinematic hardening and
  uncoupled (:mod:`isolation.dynamics.plan_structure`; a Clough storey law of the
  planar model is run as bilinear here, stated in the results); the
  code-designed fixed base runs under the same pairs and offsets.

The total displacement from the histories is the suite mean of the largest
bearing's peak resultant displacement, the largest over property sets and
eccentricities.  The code's lower limit on response-history results applies:
on an ASCE/SEI 7 basis the total displacement is not taken below 80 % of the
single-mode D_TM (ASCE/SEI 7-16 §17.6.3.4 with Table 17.6-1 in 7-10 terms;
from memory); EN 1998-1 §10.9 sets no such limit.
"""

from __future__ import annotations

import math

import numpy as np

from isolation import GRAVITY
from isolation.codes import registry as _codes
from isolation.dynamics.plan_history import run_plan_cases
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding, bearing_grid
from isolation.study.plan_strength import reduced, storey_indicators

__all__ = ["default_grid", "plan_superstructure", "plan_bearings", "bidirectional_summary", "HISTORY_LOWER_LIMIT",
           "ACCIDENTAL_ECCENTRICITY", "with_bidirectional", "fixed_base_summary", "history_uplift_ratio",
           "PLAN_STOREY_MODEL", "uplift_combination"]

#: Lower limit on the history total displacement as a fraction of the single-mode D_TM, per code
#: basis (:attr:`isolation.codes.basis.SuiteRules.history_lower_limit`).
HISTORY_LOWER_LIMIT = _codes.PerBasis(lambda basis: basis.suite.history_lower_limit)


#: Accidental eccentricity as a fraction of the plan dimension (both codes; from memory).
ACCIDENTAL_ECCENTRICITY = 0.05


def default_grid(count: int, length: float, width: float) -> tuple:
    """Bearings along the length and the width whose product is ``count`` and spacing closest to square.

    Parameters
    ----------
    count : int
        Number of bearings, >= 1. [-]
    length, width : float
        Plan dimensions. [m]

    Returns
    -------
    tuple of int
    """
    best, score = (count, 1), math.inf
    for along in range(1, count + 1):
        if count % along:
            continue
        across = count // along
        spacing_l = length / max(along - 1, 1)
        spacing_w = width / max(across - 1, 1)
        value = abs(math.log(spacing_l / spacing_w))
        if value < score - 1e-12:
            best, score = (along, across), value
    return best


def plan_superstructure(planar, building) -> PlanShearBuilding:
    """The planar superstructure on the study's plan (same storeys and strengths in both directions).

    Parameters
    ----------
    planar : isolation.dynamics.structure.ShearBuilding
        The study's planar superstructure; its storey yield shears (if any), hardening and P-delta
        are given to the x and the y springs alike. [-]
    building : isolation.study.inputs.Building
        The study's building (plan_length, plan_width, eccentricity [m]). [-]
    """
    shears = getattr(planar, "yield_shears", None)
    return PlanShearBuilding(planar.masses, planar.stiffnesses, planar.stiffnesses, planar.heights,
                             plan=(building.plan_length, building.plan_width),
                             rigidity_offset=(building.eccentricity, 0.0), damping=planar.damping,
                             yield_shears_x=shears, yield_shears_y=shears,
                             hardening=getattr(planar, "hardening", 0.0), p_delta=getattr(planar, "p_delta", False))


def fixed_base_summary(study, planar, pairs) -> dict:
    """The code-designed fixed-base building on the plan model under the pairs, the four eccentricities.

    Parameters
    ----------
    study : isolation.study_inputs.Study
        The study (building plan and eccentricity). [-]
    planar : isolation.structure.ShearBuilding
        The fixed-base comparison building (yielding unless the study asks for elastic). [-]
    pairs : isolation.motions.MatchedPairs
        Matched component pairs. [g]

    Returns
    -------
    dict
        Storey indicators (suite means, worst over the eccentricities): ``ductility_x``,
        ``ductility_y`` (None when elastic), ``residual_drift_x``/``_y``, ``drift_ratio`` (resultant
        at the plan corners) per storey and their largest values. [-]
    """
    from isolation.dynamics.plan_history import run_plan

    superstructure = plan_superstructure(planar, study.building)
    results = [reduced(run_plan(superstructure.shifted(offset), pairs.acceleration, pairs.dt))
               for offset in _offsets(study.building)]
    out = storey_indicators(results)
    out["storey_law"] = _law(planar)
    return out


def _law(planar) -> str:
    if getattr(planar, "yield_shears", None) is None:
        return "elastic"
    hysteresis = getattr(planar, "hysteresis", "bilinear")
    note = "" if hysteresis == "bilinear" else f" (the planar model's {hysteresis} law run as bilinear)"
    return f"bilinear, kinematic hardening {planar.hardening:g}, x and y uncoupled{note}"


def plan_bearings(system, case: str, displacement: float) -> tuple:
    """One law object per bearing of an isolation system for a property case, with its gravity load.

    Sliders keep their own law (friction scaled by the case's factor; forces follow the axial load);
    other bearings use one bearing's backbone under the case's stiffness and strength factors, or,
    for amplitude-dependent rubber, the equivalent bilinear at ``displacement`` [m].

    Returns
    -------
    tuple of (list of bearing laws, list of axial loads [kN])
    """
    from isolation.bearings import Bilinear, MultiLinear
    from isolation.bearings.damping_rubber import equivalent_bilinear

    laws, loads = [], []
    for group in system.groups:
        factors = group.factors or system.factors
        if group.is_sliding:
            law = group.bearing.with_friction_factor(factors.friction.factor(case))
        else:
            whole = group.backbone(case, system.factors)
            if isinstance(whole, (Bilinear, MultiLinear)):
                law = whole.times(1.0 / group.count)
            else:
                law = equivalent_bilinear(whole.effective_stiffness(displacement) / group.count,
                                          whole.effective_damping(displacement), displacement, 10.0)
        laws += [law] * group.count
        loads += [group.axial_load] * group.count
    return laws, loads


def _offsets(building) -> list:
    ex = ACCIDENTAL_ECCENTRICITY * building.plan_length
    ey = ACCIDENTAL_ECCENTRICITY * building.plan_width
    return [(sx * ex, sy * ey) for sx in (1.0, -1.0) for sy in (1.0, -1.0)]


def bidirectional_summary(study, alternative, system, structure, base_mass: float, pairs, design_total: float,
                          design_displacement: float, fixed_base: dict | None = None) -> dict:
    """Run one alternative's plan model under the pairs and summarise it for the results and the verdict.

    Parameters
    ----------
    study : isolation.study.inputs.Study
        The study (building plan, basis). [-]
    alternative : isolation.study.inputs.Alternative
        Bearing groups and optional grid. [-]
    system : isolation.bearings.IsolationSystem
        The alternative's isolation system. [-]
    structure : isolation.dynamics.structure.ShearBuilding
        Planar superstructure above the isolators, with its storey strengths when yielding
        (:func:`isolation.performance.comparison.isolated_superstructure`). [-]
    base_mass : float
        Mass of the isolation-plane floor. [t]
    pairs : isolation.motions.MatchedPairs
        Matched component pairs. [g]
    design_total : float
        Single-mode total displacement D_TM. [m]
    design_displacement : float
        Single-mode displacement D_M (for equivalent bilinear rubber). [m]
    fixed_base : dict, optional
        :func:`fixed_base_summary` of the study, copied into the result as ``fixed_base``. [-]

    Returns
    -------
    dict
        Plain numbers: history and code D_TM, the limit applied, the governing value, torsional
        amplification, axial load extremes and uplift, per-bearing demand, one orbit, the storeys'
        indicators (``storeys``, :func:`isolation.study.plan_strength.storey_indicators`, with the storey
        shear against storey strength).
    """
    layout = _layout(study, alternative, system, structure, base_mass)
    cases = {case: plan_bearings(system, case, design_displacement) for case in ("lower", "upper")}
    runs = _Runs()
    for offset in _offsets(study.building):
        buildings = [PlanIsolatedBuilding(layout.superstructure, base_mass, cases[case][0], layout.positions,
                                          gravity_loads=layout.shares(cases[case][1]), mass_offset=offset)
                     for case in ("lower", "upper")]
        for result in run_plan_cases(buildings, pairs.acceleration, pairs.dt):
            runs.add(result)
    return _summary(study, system, layout, runs, pairs, design_total, cases["lower"][1], structure, fixed_base)


class _Layout:
    """The plan superstructure, bearing grid and positions and the weight on the isolation plane."""

    def __init__(self, superstructure, grid, positions, weight) -> None:
        self.superstructure, self.grid, self.positions, self.weight = superstructure, grid, positions, weight

    def shares(self, loads) -> tuple:
        """Gravity loads of the bearings in proportion to their groups' axial loads, summing to the weight. [kN]"""
        return tuple(np.asarray(loads) * self.weight / float(np.sum(loads)))


def _layout(study, alternative, system, structure, base_mass) -> _Layout:
    building = study.building
    superstructure = plan_superstructure(structure, building)
    count = sum(g.count for g in system.groups)
    grid = alternative.grid or default_grid(count, building.plan_length, building.plan_width)
    positions = bearing_grid((building.plan_length, building.plan_width), grid)
    return _Layout(superstructure, grid, positions, (base_mass + superstructure.total_mass) * GRAVITY)


class _Runs:
    """What the summary keeps of every plan run (property set x eccentricity)."""

    def __init__(self) -> None:
        self.storeys: list = []
        self.peaks: list = []
        self.axial_min: list = []
        self.axial_max: list = []
        self.centre: list = []
        self.amplification: list = []
        self.uplift = 0
        self.worst: tuple[float, dict | None] = (-1.0, None)

    def add(self, result) -> None:
        self.storeys.append(reduced(result))
        self.peaks.append(result.bearing_displacement_peak.mean(axis=0))
        self.axial_min.append(result.bearing_axial_force[..., 0].min(axis=0))
        self.axial_max.append(result.bearing_axial_force[..., 1].max(axis=0))
        self.centre.append(float(np.sqrt((result.isolator_displacement**2).sum(axis=1)).max(axis=-1).mean()))
        self.amplification.append(float(result.torsional_amplification.mean()))
        self.uplift = max(self.uplift, int((result.uplift_steps > 0).any(axis=0).sum()))
        corner = int(np.argmax(result.bearing_displacement_peak.max(axis=0)))
        record = int(np.argmax(result.bearing_displacement_peak[:, corner]))
        if result.bearing_displacement_peak[record, corner] > self.worst[0]:
            step = max(1, result.isolator_displacement.shape[-1] // 2000)
            self.worst = (float(result.bearing_displacement_peak[record, corner]), {
                "bearing": corner, "record": record,
                "centre": result.isolator_displacement[record, :, ::step].tolist(),
                "corner": result.bearing_orbit(corner)[record, :, ::step].tolist()})


def _summary(study, system, layout, runs, pairs, design_total, loads, structure, fixed_base) -> dict:
    peaks = np.max(runs.peaks, axis=0)
    history_total = float(peaks.max())
    limit = _codes.get(study.basis).suite.history_lower_limit
    gravity = np.asarray(layout.shares(loads))
    lowest = np.min(runs.axial_min, axis=0)
    return {
        "grid": list(layout.grid),
        "positions_m": layout.positions.tolist(),
        "pair_check": pairs.check().to_dict(),
        "total_displacement_history": history_total,
        "total_displacement_code": float(design_total),
        "lower_limit_factor": limit,
        "total_displacement_governing": max(history_total, limit * float(design_total)),
        "limit_governs": limit * float(design_total) > history_total,
        "centre_displacement_history": max(runs.centre),
        "torsional_amplification": max(runs.amplification),
        "bearing_peak_displacement_m": peaks.tolist(),
        "bearing_axial_min_kN": lowest.tolist(),
        "bearing_axial_max_kN": np.max(runs.axial_max, axis=0).tolist(),
        "gravity_load_kN": gravity.tolist(),
        "uplift_ratio": float(np.max((gravity - lowest) / gravity)),
        "uplifted_bearings": runs.uplift,
        "displacement_capacity": getattr(system, "displacement_capacity", None),
        "orbit": runs.worst[1],
        "eccentricities_m": [list(o) for o in _offsets(study.building)],
        "storeys": dict(storey_indicators(runs.storeys), storey_law=_law(structure)),
        "fixed_base": fixed_base,
    }


def history_uplift_ratio(summary: dict, gravity_factor: float = 1.0, vertical_fraction: float = 0.0) -> float:
    """Largest drop of a bearing's axial load in the histories over its net gravity load.

    The histories carry gravity at 1.0 and no vertical component, so the drop below the gravity share
    ``N_g - N_min`` is the overturning part; the net gravity load of the code's combination is
    ``(gravity_factor - vertical_fraction) N_g`` (as :func:`isolation.design.overturning.bearing_uplift`);
    a ratio >= 1 means net tension. [-]

    Parameters
    ----------
    summary : dict
        :func:`bidirectional_summary` (``gravity_load_kN``, ``bearing_axial_min_kN``). [kN]
    gravity_factor : float
        Factor on gravity of the uplift combination (0.9 ASCE 7, 1.0 Eurocode). [-]
    vertical_fraction : float
        Vertical earthquake as a fraction of gravity. [-]
    """
    gravity = np.asarray(summary["gravity_load_kN"], dtype=float)
    lowest = np.asarray(summary["bearing_axial_min_kN"], dtype=float)
    net = (float(gravity_factor) - float(vertical_fraction)) * gravity
    if np.any(net <= 0.0):
        return math.inf
    return float(np.max((gravity - lowest) / net))


def uplift_combination(study, spectrum, report) -> tuple:
    """(gravity factor, vertical fraction) of the code basis' uplift combination for a study [-]
    (:func:`isolation.study.assembly.overturning_inputs`)."""
    from isolation.study.assembly import overturning_inputs

    return tuple(overturning_inputs(study, spectrum, report)[2:4])


#: What the verdict's storey findings come from when the plan model ran.
PLAN_STOREY_MODEL = "plan model under the component pairs, accidental eccentricity both signs"


def with_bidirectional(figures, summary: dict, combination: tuple = (1.0, 0.0)):
    """Verdict figures with the bidirectional results in place of the single-component ones.

    The total displacement is the governing D_TM (history D_TM, not below the code's lower limit), the
    history displacement the history D_TM, the uplift ratio :func:`history_uplift_ratio`, and the
    superstructure's storey drift ratio (resultant at the plan corners), storey ductility and residual
    drift those of the plan model (isolated: worst of the property sets and eccentricities; fixed base:
    ``summary["fixed_base"]`` when given), each a suite mean.

    Parameters
    ----------
    figures : isolation.verdict.Figures
        Figures of the single-mode procedure and the planar histories. [-]
    summary : dict
        :func:`bidirectional_summary`. [-]
    combination : tuple of float
        (gravity factor, vertical fraction) of the code's uplift combination
        (:func:`isolation.design.overturning.asce7_vertical_fraction` or its Eurocode twin). [-]
    """
    from dataclasses import replace

    changes = {"total_displacement": summary["total_displacement_governing"],
               "history_displacement": summary["total_displacement_history"],
               "uplift_ratio": history_uplift_ratio(summary, *combination)}
    storeys = summary.get("storeys")
    if storeys:
        changes.update(drift_ratio=storeys["drift_ratio_max"], ductility_isolated=storeys["ductility_max"],
                       residual_drift_isolated=storeys["residual_drift_max"], storey_model=PLAN_STOREY_MODEL)
    fixed = summary.get("fixed_base")
    if fixed:
        changes.update(ductility_fixed=fixed["ductility_max"], residual_drift_fixed=fixed["residual_drift_max"])
    return replace(figures, **changes)
