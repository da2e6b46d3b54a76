"""Loss analysis of a study: response at several intensities, Monte Carlo losses, annual figures, economics.

Steps (:func:`run_loss`):

1. Intensity levels as fractions of the site spectrum's MCE_R (ASCE 7 basis;
   for a Eurocode basis the site spectrum is the design action and levels are
   fractions of it); the run's matched suite is scaled uniformly to each.
2. One vectorised response-history run over all levels x records for the
   fixed base (:func:`fixed_base_building`) and every alternative with its
   nominal isolator properties (:func:`isolation.dynamics.history.run_cases`).
3. Per case and level, Monte Carlo losses (:mod:`isolation.loss.simulation`).
4. Expected annual loss and downtime by integrating the loss-intensity curve
   over the hazard (:func:`expected_annual`), and the owner's economics.

Scope: an order-of-magnitude screening of expected losses for a feasibility
study; not an insurance estimate and not a cost plan.
"""

from __future__ import annotations

import numpy as np

from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS
from isolation.loss.consequences import occupancy as _occupancy
from isolation.loss.economics import _premium, economics
from isolation.loss.fragility import IRREPARABLE, collapse_fragility, collapse_probability_at_mce, component_fragilities
from isolation.loss.hazard import HazardCurve, default_hazard
from isolation.loss.inputs import LossInputs
from isolation.loss.simulation import PERCENTILES, Demands, LossModel, simulate, summarise

__all__ = ["expected_annual", "study_hazard", "reference_levels", "fixed_base_building", "demands_by_level",
           "loss_model", "case_loss", "economics", "run_loss", "CAUTIONS", "LOW_END"]

LOW_END = 0.5
"""Below the lowest level the loss falls linearly to zero at LOW_END x the lowest level
(losses at smaller intensities are neglected; FEMA P-58-1 (2012) §7 likewise starts
its hazard intervals at an intensity with negligible loss, from memory)."""

CAUTIONS = (
    "Order-of-magnitude screening from storey-based damage functions (FEMA earthquake loss estimation manual) and a "
    "short "
    "matched suite, not a component-by-component loss assessment.",
    "Costs are to be confirmed by a cost consultant; defaults are invented demo values.",
    "Not an insurance estimate; expected annual values depend strongly on the assumed hazard curve.",
)


def expected_annual(intensities, values, hazard, *, low_end: float = LOW_END, points: int = 600) -> float:
    """Expected annual value of a quantity known at intensity levels: integral v(x) |d lambda(x)|.

    v(x) is linear between the levels, constant beyond the highest, and falls
    linearly to zero between ``low_end`` x the lowest level and the lowest level.

    Parameters
    ----------
    intensities : sequence of float
        Increasing levels, > 0. [intensity]
    values : sequence of float
        Value at each level (loss [currency], days [day], ...). [unit]
    hazard : object with ``rate(x)``
        Annual rate of exceeding x. [1/year]
    low_end : float, optional
        Fraction of the lowest level where the value reaches zero, in (0, 1). [-]
    points : int, optional
        Integration points between the low end and the highest level. [-]

    Returns
    -------
    float
        Expected annual value. [unit/year]
    """
    x = np.asarray(intensities, dtype=float)
    v = np.asarray(values, dtype=float)
    if x.ndim != 1 or x.size < 1 or x.size != v.size or np.any(x <= 0) or np.any(np.diff(x) <= 0):
        raise ValueError(f"intensities = {x.tolist()!r} are not allowed: must be increasing numbers > 0, one per "
                         "value")
    if not np.all(np.isfinite(v)):
        raise ValueError(f"values = {v.tolist()!r} are not allowed: must be finite")
    if not 0.0 < low_end < 1.0:
        raise ValueError(f"low_end = {low_end!r} is not allowed: must be in (0, 1) [-]")
    xs = np.concatenate([[low_end * x[0]], x])
    vs = np.concatenate([[0.0], v])
    grid = np.unique(np.concatenate([np.geomspace(xs[0], xs[-1], points), xs]))
    curve = np.interp(grid, xs, vs)
    rates = np.asarray(hazard.rate(grid), dtype=float)
    return float(np.sum(0.5 * (curve[1:] + curve[:-1]) * (rates[:-1] - rates[1:])) + curve[-1] * rates[-1])


def reference_levels(basis: str) -> tuple:
    """(design level, maximum level) as fractions of the site spectrum.

    ASCE 7: the site spectrum is the MCE_R; design = 2/3 (ASCE/SEI 7-16 §11.4.5).
    Eurocode: the site spectrum is the design action (475 years, EN 1998-1 §2.1);
    the maximum level is taken as 1.5 x design by analogy with the 2/3 rule (an assumption).
    """
    return _codes.get(basis, "basis").reference_levels


def study_hazard(study, spectrum, hazard_inputs) -> tuple:
    """Hazard in site-spectrum fractions and a plain description of its basis.

    Returns
    -------
    (hazard, dict)
        An object with ``rate(x)`` and its description.
    """
    h = hazard_inputs
    if h.points:
        reference = float(np.asarray(spectrum.sa(h.period)).ravel()[0])
        x = [sa / reference for sa, _ in h.points]
        rates = [rate for _, rate in h.points]
        curve = HazardCurve(tuple(x), tuple(rates))
        hazard = curve.power_law() if h.fit == "power_law" else curve
        basis = (f"site hazard curve, Sa({h.period:g} s) points divided by the site spectrum's "
                 f"{reference:.3g} g; " + ("least-squares power law" if h.fit == "power_law"
                                           else "log-log interpolation, end slopes extended"))
        return hazard, {"basis": basis, "model": hazard.to_dict()}
    own = _codes.get(study.basis).default_hazard(h)
    if own is not None:  # a code whose site spectrum is not the MCE_R gives its own default hazard
        hazard, basis = own
        return hazard, {"basis": basis, "model": hazard.to_dict()}
    hazard = default_hazard(h.mce_rate, h.design_rate)
    mce = "given" if h.mce_rate is not None else "default 2 % in 50 years"
    if h.design_rate is not None:
        basis = f"power law through MCE_R ({mce}) and the design level 2/3 MCE_R (given); k = {hazard.k:.2f}"
    else:
        basis = (f"power law through MCE_R ({mce}) with the default slope k = {hazard.k:g} (EN 1998-1 §2.1(4) "
                 "note: of the order of 3); give the site's hazard curve for a site-specific answer")
    return hazard, {"basis": basis, "model": hazard.to_dict()}


def fixed_base_building(study, spectrum, superstructure, period: float):
    """The fixed-base building whose losses isolation is compared with.

    The code-designed yielding building of :func:`isolation.performance.comparison.fixed_base_comparison`
    (storey strengths from the code's lateral force design times overstrength) unless the
    study asks for ``building.fixed_base_model = "elastic"``, then the elastic superstructure
    itself. The one place to change the comparison building of the loss study.

    Parameters
    ----------
    study : Study
    spectrum : site spectrum
        The study's site spectrum (:func:`isolation.study.assembly.site_spectrum`). [g]
    superstructure : ShearBuilding
        The elastic fixed-base model (:func:`isolation.study.assembly.superstructure`). [t, kN/m, m]
    period : float
        Fixed-base period T_fb (:func:`isolation.study.assembly.fixed_base_period`). [s]
    """
    if getattr(study.building, "fixed_base_model", "elastic") != "yielding":
        return superstructure
    from isolation.performance.comparison import fixed_base_comparison

    return fixed_base_comparison(study, spectrum, superstructure, period).building


def isolated_building(study, report, superstructure):
    """Superstructure above the isolators of one alternative for the loss study: yielding at the
    strengths of its code design V_s (:func:`isolation.performance.comparison.isolated_superstructure`) unless the
    study asks for an elastic comparison. ``report`` is the alternative's code report, ``superstructure``
    the elastic model (:func:`isolation.study.assembly.superstructure`)."""
    if report is None or getattr(study.building, "fixed_base_model", "elastic") != "yielding":
        return superstructure
    from isolation.performance.comparison import isolated_superstructure

    return isolated_superstructure(study, report, superstructure)[0]


def _residual_drift_ratio(result, window: float | None = None) -> np.ndarray:
    """Residual storey drift ratio (records, storeys).

    With ``window`` [s]: |mean drift| over the last ``window`` seconds of each record (at
    most its second half) over the storey height, so that the free vibration left at the
    end averages out about the permanent offset (common practice; a window of two periods of
    the governing mode). Without: |drift| at the last sample.
    """
    steps = result.drift.shape[1]
    if window is None:
        return np.abs(result.drift[:, -1, :]) / np.asarray(result.heights)
    count = int(min(max(round(window / result.dt), 1), steps // 2 or 1))
    return np.abs(result.drift[:, -count:, :].mean(axis=1)) / np.asarray(result.heights)


def demands_by_level(result, levels: int, residual_window: float | None = None) -> list:
    """Split a history result over ``levels`` x records (level-major) into one :class:`Demands` per level.

    ``residual_window`` [s]: averaging window of the residual drift (see :func:`_residual_drift_ratio`).
    """
    # Only the peaks the loss model needs (HistoryResult.peaks() computes many more).
    drift = np.max(np.abs(result.drift), axis=1) / np.asarray(result.heights)
    records = drift.shape[0] // levels
    ground = result.base_acceleration if result.isolated else result.ground_acceleration
    acc = np.column_stack([np.max(np.abs(ground), axis=1), np.max(np.abs(result.floor_acceleration), axis=1)])
    iso = np.max(np.abs(result.isolator_displacement), axis=1) if result.isolated else None
    residual = _residual_drift_ratio(result, residual_window)
    out = []
    for i in range(levels):
        sl = slice(i * records, (i + 1) * records)
        out.append(Demands(drift[sl], acc[sl], residual[sl], None if iso is None else iso[sl]))
    return out


def loss_model(study, inputs: LossInputs, *, displacement_limit=None) -> LossModel:
    """Loss model of the study's building (fixed base, or isolated with ``displacement_limit`` [m])."""
    b = study.building
    cost = inputs.cost
    areas = np.asarray(cost.areas(b.storeys, b.plan_length * b.plan_width))
    replacement = cost.replacement_cost(areas.sum())
    p_mce = collapse_probability_at_mce(b.importance, study.basis)
    _, top = reference_levels(study.basis)
    collapse = collapse_fragility(p_mce)
    collapse = type(collapse)(collapse.median * top, collapse.dispersion, collapse.source)
    groups = component_fragilities(b.lateral_system, b.storeys, getattr(b, "design_level", "high"))
    return LossModel(**groups,
                     occupancy=_occupancy(inputs.options.occupancy), replacement_cost=replacement,
                     contents_value=cost.contents(replacement), storey_shares=tuple(areas / areas.sum()),
                     collapse=collapse, irreparable=IRREPARABLE, displacement_limit=displacement_limit)


def case_loss(model: LossModel, demands: list, levels, hazard, *, samples: int, modelling_dispersion: float,
              seed, basis: str = DEFAULT_BASIS) -> dict:
    """Loss results of one case (fixed base or an alternative) over the intensity levels.

    Parameters
    ----------
    model : LossModel
    demands : list of Demands
        One per level.
    levels : sequence of float
        Site-spectrum fractions, increasing. [-]
    hazard : object with ``rate(x)``
    samples : int
        Monte Carlo realisations per level. [-]
    modelling_dispersion : float [-]
    seed : int or numpy.random.SeedSequence
        Seed of this case (each level gets its own child stream). [-]
    basis : str
        Code basis ("asce7" or "eurocode"), for the reference levels.

    Returns
    -------
    dict
        ``levels`` (per level: intensity, loss, repair_days, downtime_days
        with mean and p10/p50/p90, collapse and irreparable probability, mean
        loss per group, and ``demands``: per storey median and dispersion of
        drift, floor acceleration, residual drift and isolator displacement
        over the records), ``expected_loss_design``, ``expected_loss_mce``,
        ``repair_days_design``, ``repair_days_mce`` (each with bands),
        ``expected_annual_loss`` [currency/year], ``expected_annual_downtime``
        [day/year] and their bands.
    """
    levels = [float(v) for v in levels]
    sequence = seed if isinstance(seed, np.random.SeedSequence) else np.random.SeedSequence(seed)
    children = sequence.spawn(len(levels))
    rows = []
    for level, demand, child in zip(levels, demands, children, strict=True):
        top = reference_levels(basis)[1]
        realisations = simulate(model, demand, level / top, samples=samples,
                                modelling_dispersion=modelling_dispersion, rng=np.random.default_rng(child))
        row = summarise(realisations)
        row["intensity"] = level
        row["demands"] = demand.statistics()
        rows.append(row)
    design, top = reference_levels(basis)

    def at(level, name, stat):
        return float(np.interp(level, levels, [r[name][stat] for r in rows]))

    def bands(level, name):
        return {stat: at(level, name, stat) for stat in ("mean", "p10", "p50", "p90")}

    out = {"levels": rows, "design_level": design, "mce_level": top,
           "loss_design": bands(design, "loss"), "loss_mce": bands(top, "loss"),
           "repair_days_design": bands(design, "repair_days"), "repair_days_mce": bands(top, "repair_days"),
           "downtime_days_design": bands(design, "downtime_days"), "downtime_days_mce": bands(top, "downtime_days")}
    out["expected_loss_design"] = out["loss_design"]["mean"]
    out["expected_loss_mce"] = out["loss_mce"]["mean"]
    for name, key in (("loss", "expected_annual_loss"), ("downtime_days", "expected_annual_downtime")):
        out[key] = expected_annual(levels, [r[name]["mean"] for r in rows], hazard)
        out[key + "_bands"] = {stat: expected_annual(levels, [r[name][stat] for r in rows], hazard)
                               for stat in ("p10", "p50", "p90")}
    out["replacement_cost"] = model.replacement_cost
    out["contents_value"] = model.contents_value
    return out


def run_loss(study, spectrum, suite, base_mass: float, alternatives: list, inputs: LossInputs | None = None, *,
             superstructure, fixed_building=None, fixed_base_period: float | None = None) -> dict:
    """Loss analysis of the fixed base and every alternative of a study.

    Parameters
    ----------
    study : isolation.study.Study
    spectrum : site spectrum (with ``sa(T)``) [g]
    suite : MatchedSuite
        The run's matched suite (``acceleration`` [g], ``dt`` [s]).
    base_mass : float
        Mass of the base slab above the isolators. [t]
    alternatives : list of (Alternative, IsolationSystem, isolator, quantities[, report])
        Each alternative with its nominal isolator for the histories, its
        code quantities (``shear_ratio`` [-], ``displacement_capacity`` [m],
        ``moat`` [m]) and optionally its code report (for the strengths of a
        yielding superstructure, :func:`isolated_building`).
    inputs : LossInputs, optional
        Default: ``study.loss`` or all defaults.
    superstructure : ShearBuilding
        The elastic fixed-base model (:func:`isolation.study.assembly.superstructure`). [t, kN/m, m]
    fixed_building : ShearBuilding, optional
        The fixed-base comparison building the run already built; default
        :func:`fixed_base_building` at ``fixed_base_period``.
    fixed_base_period : float, optional
        T_fb [s]; needed only without ``fixed_building``.

    Returns
    -------
    dict
        ``fixed`` (:func:`case_loss`), ``alternatives`` (name -> case loss plus
        ``economics``), ``levels``, ``hazard``, ``settings``, ``cautions``.
    """
    inputs = inputs or getattr(study, "loss", None) or LossInputs()
    options = inputs.options
    hazard, hazard_info = study_hazard(study, spectrum, inputs.hazard)
    levels = tuple(options.levels)
    acc = np.asarray(suite.acceleration, dtype=float)
    if fixed_building is None:
        if fixed_base_period is None:
            raise ValueError("fixed_base_period = None is not allowed without fixed_building: give T_fb [s] > 0")
        fixed_building = fixed_base_building(study, spectrum, superstructure, fixed_base_period)
    supers = [isolated_building(study, item[4] if len(item) > 4 else None, superstructure) for item in alternatives]
    fixed_window = 2.0 * float(fixed_building.modal().periods[0])
    windows = {"fixed": fixed_window}
    for i, (_, _, _, quantities, *_) in enumerate(alternatives):
        periods = [quantities.get(k) for k in ("period_lower", "period_upper") if quantities.get(k)]
        windows[f"alternative {i}"] = 2.0 * float(np.mean(periods)) if periods else fixed_window
    demands: dict = {}
    for level in levels:
        # One level at a time, its histories dropped once their peaks are read: the records run
        # independently, so the numbers are those of one run over all levels, in a fifth of the memory.
        for name, result in _level_histories(fixed_building, supers, alternatives, base_mass, level * acc,
                                             suite.dt).items():
            demands.setdefault(name, []).extend(demands_by_level(result, 1, windows[name]))
    seed = options.seed if options.seed is not None else study.analysis.seed
    streams = np.random.SeedSequence(seed).spawn(1 + len(alternatives))
    common = dict(samples=options.samples, modelling_dispersion=options.modelling_dispersion, basis=study.basis)
    fixed_model = loss_model(study, inputs)
    fixed = case_loss(fixed_model, demands["fixed"], levels, hazard, seed=streams[0], **common)
    out_alternatives = {}
    for i, (alternative, system, _, quantities, *_) in enumerate(alternatives):
        # The histories give the isolator displacement at the centre of mass; the corner bearings
        # move D_TM/D_M times more (torsion), so the limit is divided by that factor.
        limits = [v for v in (quantities.get("displacement_capacity"), quantities.get("moat")) if v]
        torsion = 1.0
        if quantities.get("total_displacement") and quantities.get("displacement"):
            torsion = max(float(quantities["total_displacement"]) / float(quantities["displacement"]), 1.0)
        model = loss_model(study, inputs, displacement_limit=min(limits) / torsion if limits else None)
        case = case_loss(model, demands[f"alternative {i}"], levels, hazard, seed=streams[1 + i], **common)
        premium = _premium(study, alternative, system, quantities, inputs, model)
        case["economics"] = economics(fixed, case, premium, inputs.cost)
        out_alternatives[alternative.name] = case
    return {"fixed": fixed, "alternatives": out_alternatives, "levels": list(levels), "hazard": hazard_info,
            "currency": inputs.cost.currency, "inputs": inputs.to_dict(), "cautions": list(CAUTIONS),
            "settings": {"samples": options.samples, "seed": seed, "modelling_dispersion":
                         options.modelling_dispersion, "records": int(acc.shape[0]), "percentiles": list(PERCENTILES),
                         "isolator_properties": "nominal", "fixed_base": _describe(fixed_building),
                         "occupancy": options.occupancy}}


def _level_histories(fixed_building, supers: list, alternatives: list, base_mass: float, acc: np.ndarray,
                     dt: float) -> dict:
    """Histories of the fixed base ("fixed") and of every alternative ("alternative i") under ``acc`` [g]."""
    from isolation.dynamics.history import run_cases

    results = run_cases(fixed_building, base_mass, {}, acc, dt, include_fixed=True)
    if all(b == supers[0] for b in supers):  # one vectorised run for all alternatives
        if supers:
            isolators = {f"alternative {i}": item[2] for i, item in enumerate(alternatives)}
            results.update(run_cases(supers[0], base_mass, isolators, acc, dt, include_fixed=False))
    else:
        for i, (item, building) in enumerate(zip(alternatives, supers, strict=True)):
            results.update(run_cases(building, base_mass, {f"alternative {i}": item[2]}, acc, dt,
                                     include_fixed=False))
    return results


def _describe(building) -> str:
    if getattr(building, "yield_shears", None) is None:
        return "elastic superstructure"
    return (f"code-designed yielding building (storey strengths from the code design, post-yield ratio "
            f"{building.hardening:g}{', P-delta' if building.p_delta else ''})")
