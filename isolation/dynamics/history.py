"""Response-history analysis of fixed-base and isolated shear buildings over motion suites.

:func:`run` analyses one building; :func:`run_cases` analyses one
superstructure on several isolation-plane property sets (lower, nominal,
upper, ...) plus its fixed-base version, for every motion of a suite
(columns = records x cases).

Integration: Newmark average acceleration (:mod:`isolation.dynamics.newmark`, kernel
:mod:`isolation.dynamics.kernel`, compiled with numba when installed). Isolators:
exact return mapping for elastic-plastic elements, closed-form Bouc-Wen
update for smooth laws (:mod:`isolation.dynamics.isolators`). Storeys: elastic, or
yielding (bilinear with kinematic hardening, or the degrading law of Clough
& Johnston 1966) with optional P-delta (:class:`isolation.dynamics.structure.ShearBuilding`).
Energy balance: :mod:`isolation.dynamics.energy` (components computed in the kernel).
Results: :class:`isolation.dynamics.response.HistoryResult`.

Time step: when dt exceeds T_min/10, T_min being the shortest natural period
of the linear model integrated (fixed base: the superstructure's elastic
fixed-base modes; isolated: base plus superstructure with the isolator at its
final, post-yield stiffness), each sample interval is split into
n = ceil(10 dt/T_min) sub-steps with the ground acceleration interpolated
linearly inside the interval; outputs stay at the record's samples. For
converged floor accelerations T_min/20 or finer is better (in the tests,
halving dt changed peak floor accelerations by up to 1.3 % at T_min/15 and
by less than 0.6 % at T_min/30; displacements, drifts and shears by less than
1 % at T_min/15). Halve dt and compare to check convergence.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, overload

import numpy as np

from isolation import GRAVITY, validate
from isolation.dynamics.energy import COMPONENTS, balance_error
from isolation.dynamics.isolators import (
    FRICTION_LAWS,
    BoucWen,
    ElasticPlasticLaw,
    SharpFrictionLaw,
    SmoothLaw,
    describe,
    friction_regularisation,
    isolator_law,
)
from isolation.dynamics.newmark import simulate, substeps
from isolation.dynamics.response import HistoryResult, suite_statistics
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding, linear_isolated_matrices

if TYPE_CHECKING:
    from isolation.dynamics.plan_history import PlanHistoryResult
    from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding

__all__ = ["run", "run_cases", "suite_statistics", "BoucWen", "HistoryResult", "DT_FRACTION"]

DT_FRACTION = 10.0
"""Sub-steps are used when dt exceeds T_min/DT_FRACTION (see the module notes). [-]"""

_KINDS = {"elastic_plastic": 1, "smooth": 2, "sharp": 3}
_STOREY_KINDS = {"bilinear": 1, "clough": 2}


def _motions(acceleration) -> np.ndarray:
    acc = validate.finite_array("acceleration", acceleration, "g")
    if acc.ndim == 1:
        acc = acc[None, :]
    if acc.ndim != 2 or acc.shape[1] < 2:
        raise ValueError(
            f"acceleration has shape {acc.shape}: must be (steps,) or (records, steps) with steps >= 2 [g]"
        )
    return acc


def _shortest(periods: np.ndarray) -> float:
    finite = periods[np.isfinite(periods) & (periods > 0.0)]
    return float(finite.min()) if finite.size else math.inf


def _isolated_periods(superstructure: ShearBuilding, base_mass: float, stiffness: float) -> np.ndarray:
    m, k, _ = linear_isolated_matrices(superstructure, base_mass)
    k = k.copy()
    k[0, 0] += stiffness
    w2 = np.linalg.eigvals(np.linalg.solve(m, k)).real
    with np.errstate(divide="ignore"):
        return np.where(w2 > 0.0, 2.0 * math.pi / np.sqrt(np.maximum(w2, 1e-300)), np.inf)


@overload
def run(building: PlanShearBuilding | PlanIsolatedBuilding, acceleration, dt, *,
        friction_law: str = ...) -> PlanHistoryResult: ...
@overload
def run(building: ShearBuilding | IsolatedBuilding, acceleration, dt, *, friction_law: str = ...) -> HistoryResult: ...
def run(building, acceleration, dt, *, friction_law="smooth") -> HistoryResult | PlanHistoryResult:
    """Response history of one building to one motion or a suite.

    Conventions
    -----------
    * Displacements and velocities are relative to the ground; floor
      accelerations are absolute (``floor_acceleration[..., -1]`` is the
      absolute roof acceleration, also :attr:`HistoryResult.roof_acceleration`).
    * ``storey_shear`` is the force in each storey's lateral spring (its
      elastic or hysteretic force, without damping and without the P-delta
      term); ``base_shear`` is that of the first storey, i.e. of the storey
      above the isolators in an isolated building (for a rigid
      superstructure, the inertia force of its floors). ``reaction`` is the
      total horizontal force on the foundation, damping forces included
      (-sum of mass x absolute acceleration over every mass; for an isolated
      building, isolator plus damper force).
    * Damping: the superstructure's damping matrix comes from its elastic
      fixed-base modes (classical modal damping of ``damping`` in every mode,
      or Rayleigh) and acts on storey motion relative to the base only, so
      the isolation mode gets no viscous damping from the superstructure
      (Ryan & Polanco 2008); it stays constant when storeys yield. The
      isolation layer damps through its hysteresis and the optional linear
      ``supplemental_damping``; a fixed base has only the superstructure's.

    Parameters
    ----------
    building : ShearBuilding, IsolatedBuilding, PlanShearBuilding or PlanIsolatedBuilding
        A ShearBuilding is analysed on a fixed base. Plan buildings
        (:mod:`isolation.dynamics.plan_structure`) run bidirectionally in
        :func:`isolation.dynamics.plan_history.run_plan`. [-]
    acceleration : array (steps,) or (records, steps); (2, steps) or (records, 2, steps) for plan buildings
        Ground acceleration, sampled every ``dt``. [g]
    dt : float
        Time step of the motion; sub-stepped when above T_min/10 (module notes). [s]
    friction_law : {"smooth", "sharp"}, optional
        Law of a friction pendulum (see :func:`isolation.dynamics.isolators.isolator_law`). [-]

    Returns
    -------
    HistoryResult or PlanHistoryResult
        Case "fixed" for a ShearBuilding, "isolated" for an IsolatedBuilding;
        a :class:`isolation.dynamics.plan_history.PlanHistoryResult` for a plan building.
    """
    from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding

    if isinstance(building, (PlanShearBuilding, PlanIsolatedBuilding)):
        from isolation.dynamics.plan_history import run_plan

        return run_plan(building, acceleration, dt)
    if isinstance(building, ShearBuilding):
        return run_cases(building, 1.0, {}, acceleration, dt, include_fixed=True)["fixed"]
    if isinstance(building, IsolatedBuilding):
        return run_cases(building.superstructure, building.base_mass, {"isolated": building.isolator},
                         acceleration, dt, include_fixed=False,
                         supplemental_damping=building.supplemental_damping,
                         friction_law=friction_law)["isolated"]
    raise ValueError(f"building = {building!r} is not allowed: must be a ShearBuilding or an IsolatedBuilding")


def run_cases(superstructure, base_mass, isolators, acceleration, dt, *, include_fixed=True,
              supplemental_damping=0.0, friction_law="smooth", compiled=None) -> dict:
    """Suite of motions x isolator property cases (plus fixed base); see :func:`run` for conventions.

    Parameters
    ----------
    superstructure : ShearBuilding
        Building above the isolation layer (and the fixed-base comparison),
        elastic or yielding. [-]
    base_mass : float
        Base slab mass above the isolators, > 0. [t]
    isolators : dict of str -> isolator
        Case name -> whole-plane isolator (Bilinear, MultiLinear, BoucWen,
        FrictionPendulum, DoubleConcave, LeadRubber). The name "fixed" is
        reserved. [-]
    acceleration : array (steps,) or (records, steps)
        Ground accelerations, sampled every ``dt``. [g]
    dt : float
        Time step, > 0; sub-stepped when above T_min/10 of a model (module notes). [s]
    include_fixed : bool, optional
        Add the fixed-base case "fixed" (the superstructure on a fixed base). [-]
    supplemental_damping : float or dict of str -> float, optional
        Linear viscous damper across the isolation layer, one value for all
        cases or one per case, >= 0. [kN s/m]
    friction_law : {"smooth", "sharp"}, optional
        Law of friction pendulums (default the smooth Bouc-Wen one). [-]
    compiled : bool or None, optional
        Kernel choice (see :func:`isolation.dynamics.newmark.kernel_module`); None
        uses numba when installed. [-]

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
    validate.one_of("friction_law", friction_law, FRICTION_LAWS)
    acc = _motions(acceleration)
    dt = validate.positive("dt", dt, "s")
    weight = (base_mass + superstructure.total_mass) * GRAVITY
    laws = {name: isolator_law(iso, weight, friction_law) for name, iso in isolators.items()}
    dampers = {}
    for name in isolators:
        value = supplemental_damping.get(name, 0.0) if isinstance(supplemental_damping, dict) \
            else supplemental_damping
        dampers[name] = validate.non_negative(f"supplemental_damping[{name!r}]", value, "kN s/m")
    results = {}
    if include_fixed:
        results["fixed"] = _run_fixed(superstructure, acc, dt, compiled)
    groups: dict = {}
    for name, law in laws.items():
        groups.setdefault(law.family, []).append(name)
    for names in groups.values():
        results.update(_run_isolated(superstructure, base_mass, names, [laws[n] for n in names],
                                     [dampers[n] for n in names], {n: isolators[n] for n in names}, acc, dt,
                                     friction_law, compiled))
    order = (["fixed"] if include_fixed else []) + list(isolators)
    return {name: results[name] for name in order}


def _storey_spec(building: ShearBuilding, offset: int) -> dict:
    n = building.storeys
    upper = np.arange(n) + offset
    lower = upper - 1
    if offset == 0:
        lower[0] = -1
    yielding = building.yielding
    return {"lower": lower, "upper": upper, "kind": _STOREY_KINDS[building.hysteresis] if yielding else 0,
            "k": np.asarray(building.stiffnesses, dtype=float), "k_geo": building.geometric_stiffnesses,
            "fy": np.asarray(building.yield_shears if yielding else np.full(n, np.inf), dtype=float),
            "alpha": building.hardening}


def _dynamic_notes(building: ShearBuilding, drift: np.ndarray) -> tuple:
    """Static P-delta notes plus storeys whose drift passed the zero of their backbone with P-delta."""
    notes = list(building.p_delta_notes())
    if building.yielding and building.p_delta:
        k = np.asarray(building.stiffnesses)
        fy = np.asarray(building.yield_shears)
        alpha = building.hardening
        kg = -building.geometric_stiffnesses  # P/h > 0
        peak = np.max(np.abs(drift), axis=(0, 1))
        for i in range(building.storeys):
            if kg[i] > alpha * k[i]:
                zero = fy[i] * (1.0 - alpha) / (kg[i] - alpha * k[i])
                if peak[i] >= zero:
                    notes.append(f"storey {i + 1}: peak drift {peak[i]:.4g} m passed {zero:.4g} m, where its "
                                 "resistance with P-delta falls to zero (dynamic instability)")
    return tuple(notes)


def _finish(case, dt, acc, building, u_floor, v_floor, a_abs_floor, drift, storey_force, reaction, energy_cols,
            model, **extra) -> HistoryResult:
    energy = {name: energy_cols[i] for i, name in enumerate(COMPONENTS)}
    heights = np.asarray(building.heights)
    strength = np.asarray(building.yield_shears) if building.yielding else None
    return HistoryResult(case, dt, acc, a_abs_floor / GRAVITY, u_floor, drift, storey_force,
                         np.ascontiguousarray(storey_force[..., 0]), energy, balance_error(energy), heights,
                         model=model, floor_velocity=v_floor, reaction=reaction, yield_shears=strength,
                         yield_drifts=building.yield_drifts if building.yielding else None,
                         notes=_dynamic_notes(building, drift), **extra)


def _run_fixed(building: ShearBuilding, acc: np.ndarray, dt: float, compiled=None) -> HistoryResult:
    records, steps = acc.shape
    heights = np.asarray(building.heights)
    masses = np.asarray(building.masses)
    model = {"kind": "fixed_base", "superstructure": building.to_dict(), "substeps": 1}
    if building.rigid:
        zeros = np.zeros((records, steps, building.storeys))
        floor_acc = np.repeat(acc[:, :, None], building.storeys, axis=2)
        shear = -np.cumsum((floor_acc * GRAVITY * masses)[..., ::-1], axis=-1)[..., ::-1]
        energy = {name: np.zeros((records, steps)) for name in COMPONENTS}
        return HistoryResult("fixed", dt, acc, floor_acc, zeros, zeros.copy(), shear, shear[..., 0].copy(),
                             energy, np.zeros(records), heights, model=model, floor_velocity=zeros.copy(),
                             reaction=shear[..., 0].copy())
    nsub = substeps(dt, _shortest(building.modal().periods), DT_FRACTION)
    model["substeps"] = nsub
    k_lin = building.stiffness_matrix() + building.geometric_stiffness_matrix()
    ground = acc * GRAVITY
    out = simulate(masses, k_lin, building.damping_matrix(), _storey_spec(building, 0), None, ground, dt, nsub,
                   [("fixed", r) for r in range(records)], compiled=compiled)
    return _finish("fixed", dt, acc, building, out["u"], out["v"], out["a"], out["drift"], out["storey_force"],
                   out["reaction"], out["energy"], model)


def _isolator_spec(laws, dampers, records) -> dict:
    cols = len(laws) * records
    family = laws[0].family
    elements = max((len(law.stiffnesses) for law in laws), default=1) if family == "elastic_plastic" else 1
    p = np.zeros((cols, 6))
    k = np.zeros((cols, max(elements, 1)))
    f = np.zeros((cols, max(elements, 1)))
    for index, law in enumerate(laws):
        rows = slice(index * records, (index + 1) * records)
        if isinstance(law, ElasticPlasticLaw):
            p[rows, 0] = law.linear_stiffness
            k[rows, :len(law.stiffnesses)] = law.stiffnesses
            f[rows, :len(law.strengths)] = law.strengths
        elif isinstance(law, SmoothLaw):
            p[rows] = (law.linear_stiffness, law.strength_fast, law.strength_fast - law.strength_slow,
                       law.rate_parameter, law.yield_displacement, 1.0 - 2.0 * law.beta)
        elif isinstance(law, SharpFrictionLaw):
            p[rows] = (law.linear_stiffness, law.strength_fast, law.strength_fast - law.strength_slow,
                       law.rate_parameter, law.yield_displacement, 0.0)
    return {"kind": _KINDS[family], "p": p, "k": k, "f": f,
            "damper": np.repeat(np.asarray(dampers, dtype=float), records)}


def _run_isolated(superstructure, base_mass, names, laws, dampers, isolators, acc, dt, friction_law,
                  compiled=None) -> dict:
    records, steps = acc.shape
    cases = len(names)
    m, k, c = linear_isolated_matrices(superstructure, base_mass)
    masses = np.diag(m).copy()
    rigid = superstructure.rigid
    if rigid:
        storeys = {"lower": np.zeros(0, dtype=np.int64), "upper": np.zeros(0, dtype=np.int64), "kind": 0,
                   "k": np.zeros(0), "k_geo": np.zeros(0), "fy": np.zeros(0), "alpha": 0.0}
        k_lin = k
    else:
        storeys = _storey_spec(superstructure, 1)
        n = superstructure.storeys
        t = np.hstack([-np.ones((n, 1)), np.eye(n)])
        k_lin = k + t.T @ superstructure.geometric_stiffness_matrix() @ t
    shortest = min(_shortest(_isolated_periods(superstructure, base_mass, law.final_stiffness)) for law in laws)
    nsub = substeps(dt, shortest, DT_FRACTION)
    ground = np.tile(acc * GRAVITY, (cases, 1))
    labels = [(name, r) for name in names for r in range(records)]
    out = simulate(masses, k_lin, c, storeys, _isolator_spec(laws, dampers, records), ground, dt, nsub, labels,
                   compiled=compiled)
    u_all, v_all, a_abs_all, reaction_all = out["u"], out["v"], out["a"], out["reaction"]
    storeys_count = superstructure.storeys
    floor_masses = np.asarray(superstructure.masses)
    results = {}
    for index, name in enumerate(names):
        sl = slice(index * records, (index + 1) * records)
        u, v, a_abs = u_all[sl], v_all[sl], a_abs_all[sl]
        ub = np.ascontiguousarray(u[:, :, 0])
        if rigid:
            floor_abs = np.repeat(a_abs[:, :, :1], storeys_count, axis=2)
            floor_disp = np.repeat(u[:, :, :1], storeys_count, axis=2)
            floor_vel = np.repeat(v[:, :, :1], storeys_count, axis=2)
            drift = np.zeros_like(floor_disp)
            force = -np.cumsum((floor_abs * floor_masses)[..., ::-1], axis=-1)[..., ::-1]
        else:
            floor_abs = a_abs[:, :, 1:]
            floor_disp = u[:, :, 1:]
            floor_vel = v[:, :, 1:]
            drift = out["drift"][sl]
            force = out["storey_force"][sl]
        iso_force = np.ascontiguousarray(out["isolator_force"][sl])
        damper_force = dampers[index] * v[:, :, 0]
        model = {"kind": "isolated", "superstructure": superstructure.to_dict(), "base_mass": base_mass,
                 "isolator": describe(isolators[name]), "supplemental_damping": float(dampers[index]),
                 "isolator_law": laws[index].family, "substeps": nsub,
                 "regularisation": friction_regularisation(isolators[name], friction_law)}
        results[name] = _finish(
            name, dt, acc, superstructure, floor_disp, floor_vel, floor_abs, drift, force, reaction_all[sl],
            out["energy"][:, sl], model, isolator_displacement=ub, isolator_force=iso_force,
            damper_force=damper_force, base_acceleration=a_abs[:, :, 0] / GRAVITY,
            isolator_velocity=np.ascontiguousarray(v[:, :, 0]))
    return results
