"""Response-history analysis of fixed-base and isolated shear buildings over motion suites.

:func:`run` analyses one building; :func:`run_cases` analyses one
superstructure on several isolation-plane property sets (lower, nominal,
upper, ...) plus its fixed-base version, for every motion of a suite, in one
vectorised time loop per model (columns = records x cases).

Integration: Newmark average acceleration with Newton iteration on the
isolator (:mod:`isolation.newmark`); exact return mapping for elastic-plastic
elements, closed-form Bouc-Wen update for smooth laws (:mod:`isolation.isolators`),
so no sub-stepping is needed at isolator transitions. Energy balance:
:mod:`isolation.energy`. Results: :class:`isolation.response.HistoryResult`.

Time-step rule: dt must not exceed T_min/10, T_min being the shortest natural
period of the linear model integrated (fixed base: the superstructure's
fixed-base modes; isolated: base plus superstructure with the isolator at its
final, post-yield stiffness). That is a hard limit; for converged floor
accelerations use dt <= T_min/20 or finer (in the tests, halving dt changed
peak floor accelerations by up to 1.3 % at T_min/15 and by less than 0.6 % at
T_min/30; displacements, drifts and shears by less than 1 % at T_min/15).
Halve dt and compare to check convergence.
"""

from __future__ import annotations

import math

import numpy as np

from isolation import GRAVITY, validate
from isolation.energy import balance_error, energy_components
from isolation.isolators import (BoucWen, ElasticPlasticColumns, SmoothColumns,
                                 describe, isolator_law)
from isolation.newmark import integrate
from isolation.response import HistoryResult, suite_statistics
from isolation.structure import IsolatedBuilding, ShearBuilding, linear_isolated_matrices

__all__ = ["run", "run_cases", "suite_statistics", "BoucWen", "HistoryResult", "DT_FRACTION"]

DT_FRACTION = 10.0
"""dt may be at most T_min/DT_FRACTION (see the module notes). [-]"""


def _motions(acceleration) -> np.ndarray:
    acc = validate.finite_array("acceleration", acceleration, "g")
    if acc.ndim == 1:
        acc = acc[None, :]
    if acc.ndim != 2 or acc.shape[1] < 2:
        raise ValueError(
            f"acceleration has shape {acc.shape}: must be (steps,) or (records, steps) with steps >= 2 [g]"
        )
    return acc


def _check_dt(dt, periods: np.ndarray, what: str) -> float:
    dt = validate.positive("dt", dt, "s")
    finite = periods[np.isfinite(periods) & (periods > 0.0)]
    if finite.size and dt > finite.min() / DT_FRACTION:
        raise ValueError(
            f"dt = {dt!r} is not allowed: must be <= T_min/{DT_FRACTION:g} = "
            f"{finite.min() / DT_FRACTION:.5g} [s] (T_min = {finite.min():.5g} s, shortest period of the "
            f"{what}); resample the motion to a finer step"
        )
    return dt


def _isolated_periods(superstructure: ShearBuilding, base_mass: float, stiffness: float) -> np.ndarray:
    m, k, _ = linear_isolated_matrices(superstructure, base_mass)
    k = k.copy()
    k[0, 0] += stiffness
    w2 = np.linalg.eigvals(np.linalg.solve(m, k)).real
    with np.errstate(divide="ignore"):
        return np.where(w2 > 0.0, 2.0 * math.pi / np.sqrt(np.maximum(w2, 1e-300)), np.inf)


def run(building, acceleration, dt) -> HistoryResult:
    """Response history of one building to one motion or a suite.

    Parameters
    ----------
    building : ShearBuilding, IsolatedBuilding, PlanShearBuilding or PlanIsolatedBuilding
        A ShearBuilding is analysed on a fixed base. Plan buildings
        (:mod:`isolation.plan_structure`) run bidirectionally in
        :func:`isolation.plan_history.run_plan`. [-]
    acceleration : array (steps,) or (records, steps); (2, steps) or (records, 2, steps) for plan buildings
        Ground acceleration, sampled every ``dt``. [g]
    dt : float
        Time step of the motion, <= T_min/10 (module notes). [s]

    Returns
    -------
    HistoryResult or PlanHistoryResult
        Case "fixed" for a ShearBuilding, "isolated" for an IsolatedBuilding;
        a :class:`isolation.plan_history.PlanHistoryResult` for a plan building.
    """
    from isolation.plan_structure import PlanIsolatedBuilding, PlanShearBuilding

    if isinstance(building, (PlanShearBuilding, PlanIsolatedBuilding)):
        from isolation.plan_history import run_plan

        return run_plan(building, acceleration, dt)
    if isinstance(building, ShearBuilding):
        return run_cases(building, 1.0, {}, acceleration, dt, include_fixed=True)["fixed"]
    if isinstance(building, IsolatedBuilding):
        return run_cases(building.superstructure, building.base_mass, {"isolated": building.isolator},
                         acceleration, dt, include_fixed=False,
                         supplemental_damping=building.supplemental_damping)["isolated"]
    raise ValueError(f"building = {building!r} is not allowed: must be a ShearBuilding or an IsolatedBuilding")


def run_cases(superstructure, base_mass, isolators, acceleration, dt, *, include_fixed=True,
              supplemental_damping=0.0) -> dict:
    """Suite of motions x isolator property cases (plus fixed base) in vectorised time loops.

    Parameters
    ----------
    superstructure : ShearBuilding
        Building above the isolation layer (and the fixed-base comparison). [-]
    base_mass : float
        Base slab mass above the isolators, > 0. [t]
    isolators : dict of str -> isolator
        Case name -> whole-plane isolator (Bilinear, MultiLinear, BoucWen,
        FrictionPendulum, DoubleConcave, LeadRubber). The name "fixed" is
        reserved. [-]
    acceleration : array (steps,) or (records, steps)
        Ground accelerations, sampled every ``dt``. [g]
    dt : float
        Time step, <= T_min/10 of every model (module notes). [s]
    include_fixed : bool, optional
        Add the fixed-base case "fixed" (linear, the superstructure's damping). [-]
    supplemental_damping : float or dict of str -> float, optional
        Linear viscous damper across the isolation layer, one value for all
        cases or one per case, >= 0. [kN s/m]

    Returns
    -------
    dict of str -> HistoryResult
        "fixed" first (when included), then the isolator cases in the given order.
    """
    if not isinstance(superstructure, ShearBuilding):
        raise ValueError(f"superstructure = {superstructure!r} is not allowed: must be a ShearBuilding")
    base_mass = validate.positive("base_mass", base_mass, "t")
    if not isinstance(isolators, dict):
        raise ValueError(f"isolators = {isolators!r} is not allowed: must be a dict of case name -> isolator")
    if "fixed" in isolators:
        raise ValueError("isolators key 'fixed' is not allowed: the name is reserved for the fixed-base case")
    if not isolators and not include_fixed:
        raise ValueError("isolators = {} is not allowed with include_fixed=False: nothing to analyse")
    acc = _motions(acceleration)
    weight = (base_mass + superstructure.total_mass) * GRAVITY
    laws = {name: isolator_law(iso, weight) for name, iso in isolators.items()}
    dampers = {}
    for name in isolators:
        value = supplemental_damping.get(name, 0.0) if isinstance(supplemental_damping, dict) \
            else supplemental_damping
        dampers[name] = validate.non_negative(f"supplemental_damping[{name!r}]", value, "kN s/m")
    if include_fixed and not superstructure.rigid:
        _check_dt(dt, superstructure.modal().periods, "fixed-base superstructure")
    for name, law in laws.items():
        _check_dt(dt, _isolated_periods(superstructure, base_mass, law.final_stiffness),
                  f"isolated model of case {name!r}")
    dt = validate.positive("dt", dt, "s")
    results = {}
    if include_fixed:
        results["fixed"] = _run_fixed(superstructure, acc, dt)
    groups: dict = {}
    for name, law in laws.items():
        key = (law.family, getattr(law, "beta", None))
        groups.setdefault(key, []).append(name)
    for names in groups.values():
        results.update(_run_isolated(superstructure, base_mass, names,
                                     [laws[n] for n in names], [dampers[n] for n in names],
                                     {n: isolators[n] for n in names}, acc, dt))
    order = (["fixed"] if include_fixed else []) + list(isolators)
    return {name: results[name] for name in order}


def _run_fixed(building: ShearBuilding, acc: np.ndarray, dt: float) -> HistoryResult:
    records, steps = acc.shape
    heights = np.asarray(building.heights)
    masses = np.asarray(building.masses)
    model = {"kind": "fixed_base", "superstructure": building.to_dict()}
    if building.rigid:
        zeros = np.zeros((records, steps, building.storeys))
        floor_acc = np.repeat(acc[:, :, None], building.storeys, axis=2)
        shear = -np.cumsum((floor_acc * GRAVITY * masses)[..., ::-1], axis=-1)[..., ::-1]
        energy = {name: np.zeros((records, steps)) for name in ("input", "kinetic", "viscous",
                                                                  "elastic_strain", "hysteretic")}
        return HistoryResult("fixed", dt, acc, floor_acc, zeros, zeros.copy(), shear, shear[..., 0].copy(),
                             energy, np.zeros(records), heights, model=model)
    m = building.mass_matrix()
    k = building.stiffness_matrix()
    c = building.damping_matrix()
    ground = np.ascontiguousarray((acc * GRAVITY).T)
    out = integrate(m, k, c, None, None, ground, dt, [("fixed", r) for r in range(records)])
    n = building.storeys
    state = out["state"]
    u, v, a = state[:, :n], state[:, n:2 * n], state[:, 2 * n:]
    energy = energy_components(u, v, masses, k, c, ground)
    u_r = np.transpose(u, (2, 0, 1))
    a_abs = np.transpose(a, (2, 0, 1)) + ground.T[:, :, None]
    drift = np.diff(u_r, axis=-1, prepend=0.0)
    shear = -np.cumsum((a_abs * masses)[..., ::-1], axis=-1)[..., ::-1]
    energy = {name: np.ascontiguousarray(value.T) for name, value in energy.items()}
    return HistoryResult("fixed", dt, acc, a_abs / GRAVITY, u_r, drift, shear, shear[..., 0].copy(),
                         energy, balance_error(energy), heights, model=model)


def _run_isolated(superstructure, base_mass, names, laws, dampers, isolators, acc, dt) -> dict:
    records, steps = acc.shape
    cases = len(names)
    cols = cases * records
    m, k, c = linear_isolated_matrices(superstructure, base_mass)
    dofs = m.shape[0]
    masses = np.diag(m)
    per_column = [law for law in laws for _ in range(records)]
    if laws[0].family == "smooth":
        columns = SmoothColumns(per_column)
    else:
        columns = ElasticPlasticColumns(per_column)
    damper = np.repeat(np.asarray(dampers, dtype=float), records)
    ground = np.ascontiguousarray(np.tile(acc * GRAVITY, (cases, 1)).T)
    labels = [(name, r) for name in names for r in range(records)]
    out = integrate(m, k, c, columns, damper, ground, dt, labels)
    state, force, hyst = out["state"], out["force"], out["hysteretic_state"]
    u, v, a = state[:, :dofs], state[:, dofs:2 * dofs], state[:, 2 * dofs:]
    ub, vb = u[:, 0], v[:, 0]
    if isinstance(columns, SmoothColumns):
        strength = columns.q_fast - columns.q_drop * np.exp(-columns.rate * np.abs(vb))
        stored = 0.5 * columns.k0 * ub**2 + 0.5 * strength * columns.dy * hyst**2
    else:
        inv_k = np.divide(1.0, columns.k, out=np.zeros_like(columns.k), where=columns.k > 0.0)
        stored = 0.5 * columns.k0 * ub**2 + 0.5 * np.einsum("sec,ec->sc", hyst**2, inv_k)
    energy = energy_components(u, v, masses, k, c, ground, isolator_force=force,
                               isolator_stored=stored, damper=damper)
    damper_force = damper * vb
    a_abs = a + ground[:, None, :]
    storeys = superstructure.storeys
    heights = np.asarray(superstructure.heights)
    results = {}
    for index, name in enumerate(names):
        sl = slice(index * records, (index + 1) * records)

        def cols_first(x):
            return np.ascontiguousarray(np.moveaxis(x[..., sl], -1, 0))

        base_abs = cols_first(a_abs[:, 0])
        if superstructure.rigid:
            floor_abs = np.repeat(base_abs[:, :, None], storeys, axis=2)
            floor_disp = np.repeat(cols_first(ub)[:, :, None], storeys, axis=2)
            drift = np.zeros_like(floor_disp)
        else:
            floor_abs = np.transpose(a_abs[:, 1:, sl], (2, 0, 1))
            floor_disp = np.transpose(u[:, 1:, sl], (2, 0, 1))
            drift = np.diff(np.transpose(u[:, :, sl], (2, 0, 1)), axis=-1)
        floor_masses = np.asarray(superstructure.masses)
        shear = -np.cumsum((floor_abs * floor_masses)[..., ::-1], axis=-1)[..., ::-1]
        iso_force = cols_first(force)
        d_force = cols_first(damper_force)
        case_energy = {key: cols_first(value) for key, value in energy.items()}
        model = {"kind": "isolated", "superstructure": superstructure.to_dict(), "base_mass": base_mass,
                 "isolator": describe(isolators[name]), "supplemental_damping": float(dampers[index])}
        results[name] = HistoryResult(
            name, dt, acc, floor_abs / GRAVITY, floor_disp, drift, shear, iso_force + d_force,
            case_energy, balance_error(case_energy), heights,
            isolator_displacement=cols_first(ub), isolator_force=iso_force, damper_force=d_force,
            base_acceleration=base_abs / GRAVITY, model=model)
    return results
