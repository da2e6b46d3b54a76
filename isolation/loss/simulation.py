"""Seeded Monte Carlo of storey damage, repair cost and repair time at one intensity.

Demands come from response histories (one value per record); their joint
lognormal spread across records (record-to-record variability) is kept by
drawing each realisation as mu + sum_r w_r (y_r - mu)/sqrt(R - 1) with
independent standard normal w_r, which reproduces the suite's mean and
covariance of the log demands (the approach of FEMA P-58-1 (2012) Appendix G,
from memory, without its rank-deficiency correction). Modelling uncertainty
is one lognormal factor with dispersion ``modelling_dispersion`` common to all
demands of a realisation (fully correlated; FEMA P-58-1 §5.2.6 suggests
0.1-0.5 depending on model quality and definition, from memory).

Each storey carries a share of the replacement cost and of the contents
(its floor-area share). Per storey and group a damage state is drawn from the
fragilities of :mod:`isolation.loss.fragility`: structural and drift-sensitive
non-structural from the storey's drift ratio, acceleration-sensitive
non-structural from the peak acceleration of the floor above the storey,
contents from the floor below it (the ground or the isolated base for the
first storey). Repair cost = ratio of :mod:`isolation.loss.consequences` x
value. Collapse (the collapse fragility at this intensity, or an isolator
displacement beyond the limit) costs the replacement cost plus the contents;
irreparability (largest residual drift ratio) the replacement cost plus the
contents damage. Repair and recovery times follow the worst structural or
drift-sensitive damage state in any storey (the manual gives times per building
damage state; acceleration-sensitive repairs are taken to fit inside them);
collapse and irreparability take the complete-state times.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from isolation.loss.consequences import CONTENTS_RATIOS, Occupancy
from isolation.loss.fragility import Fragility

__all__ = ["Demands", "LossModel", "simulate", "summarise", "PERCENTILES"]

PERCENTILES = (10.0, 50.0, 90.0)
"""Bands reported. [%]"""

_FLOOR = 1e-7


@dataclass(frozen=True)
class Demands:
    """Peak demands per record at one intensity.

    Parameters
    ----------
    drift_ratio : array (records, storeys)
        Peak storey drift ratio. [-]
    floor_acceleration : array (records, storeys + 1)
        Peak absolute acceleration of the ground (fixed base) or the base
        slab (isolated) first, then floors 1..N. [g]
    residual_drift_ratio : array (records, storeys)
        Residual storey drift ratio at the end of the record. [-]
    isolator_displacement : array (records,) or None
        Peak isolator displacement; None for a fixed base. [m]
    """

    drift_ratio: np.ndarray
    floor_acceleration: np.ndarray
    residual_drift_ratio: np.ndarray
    isolator_displacement: np.ndarray | None = None

    def __post_init__(self):
        drift = np.atleast_2d(np.asarray(self.drift_ratio, dtype=float))
        acc = np.atleast_2d(np.asarray(self.floor_acceleration, dtype=float))
        res = np.atleast_2d(np.asarray(self.residual_drift_ratio, dtype=float))
        records, storeys = drift.shape
        if acc.shape != (records, storeys + 1) or res.shape != (records, storeys):
            raise ValueError(f"demands have shapes drift {drift.shape}, acceleration {acc.shape}, residual "
                             f"{res.shape}, which is not allowed: must be (records, storeys), "
                             "(records, storeys + 1), (records, storeys)")
        for name, value in (("drift_ratio", drift), ("floor_acceleration", acc), ("residual_drift_ratio", res)):
            if not np.all(np.isfinite(value)) or np.any(value < 0):
                raise ValueError(f"{name} is not allowed: must be finite and >= 0")
        object.__setattr__(self, "drift_ratio", drift)
        object.__setattr__(self, "floor_acceleration", acc)
        object.__setattr__(self, "residual_drift_ratio", res)
        if self.isolator_displacement is not None:
            iso = np.asarray(self.isolator_displacement, dtype=float).reshape(records)
            object.__setattr__(self, "isolator_displacement", iso)

    @property
    def storeys(self) -> int:
        return self.drift_ratio.shape[1]

    def statistics(self) -> dict:
        """Per storey (or floor) median and logarithmic standard deviation over the records.

        Returns
        -------
        dict
            name -> {"median": list, "dispersion": list} for ``drift_ratio`` [-],
            ``floor_acceleration`` [g] (ground or base first), ``residual_drift_ratio``
            [-] and, when isolated, ``isolator_displacement`` [m]; dispersion 0 for
            a single record.
        """
        out = {}
        for name in ("drift_ratio", "floor_acceleration", "residual_drift_ratio", "isolator_displacement"):
            values = getattr(self, name)
            if values is None:
                continue
            logs = np.log(np.maximum(np.asarray(values, dtype=float), _FLOOR))
            spread = logs.std(axis=0, ddof=1) if logs.shape[0] > 1 else np.zeros(logs.shape[1:])
            out[name] = {"median": np.exp(logs.mean(axis=0)).tolist(), "dispersion": np.asarray(spread).tolist()}
        return out


@dataclass(frozen=True)
class LossModel:
    """What the Monte Carlo needs besides the demands.

    Parameters
    ----------
    structural, drift_nonstructural, acceleration_nonstructural : tuple of 4 Fragility
        Per damage state slight..complete (drift ratio [-], drift ratio [-], g).
    occupancy : Occupancy
        Repair cost ratios and times.
    replacement_cost : float
        Building replacement cost. [currency]
    contents_value : float
        Value of the contents. [currency]
    storey_shares : tuple of float
        Share of cost and contents in each storey, summing to 1. [-]
    collapse : Fragility or None
        Collapse fragility in MCE_R fractions (None: no collapse). [-]
    irreparable : Fragility or None
        Irreparability on the largest residual drift ratio (None: never). [-]
    displacement_limit : float or None
        Isolator displacement counted as collapse (bearing capacity or moat). [m]
    """

    structural: tuple
    drift_nonstructural: tuple
    acceleration_nonstructural: tuple
    occupancy: Occupancy
    replacement_cost: float
    contents_value: float
    storey_shares: tuple
    collapse: Fragility | None = None
    irreparable: Fragility | None = None
    displacement_limit: float | None = None


def _sample_log_demands(values: np.ndarray, samples: int, modelling: float, rng) -> np.ndarray:
    """Realisations (samples, n) of demands given per record (records, n)."""
    logs = np.log(np.maximum(values, _FLOOR))
    mu = logs.mean(axis=0)
    records = logs.shape[0]
    draws = np.repeat(mu[None, :], samples, axis=0)
    if records > 1:
        w = rng.standard_normal((samples, records))
        draws += w @ (logs - mu) / np.sqrt(records - 1.0)
    draws += modelling * rng.standard_normal((samples, 1))
    return np.exp(draws)


def _states(fragilities, demand, rng) -> np.ndarray:
    """Damage state index 0 (none) .. 4 (complete) per entry of ``demand``."""
    u = rng.random(demand.shape)
    count = np.zeros(demand.shape, dtype=int)
    for fragility in fragilities:
        count += (u < fragility.probability(demand)).astype(int)
    return count


def simulate(model: LossModel, demands: Demands, intensity: float, *, samples: int = 2000,
             modelling_dispersion: float = 0.25, rng=None) -> dict:
    """Monte Carlo realisations of loss, repair time and downtime at one intensity.

    Parameters
    ----------
    model : LossModel
    demands : Demands
    intensity : float
        Intensity as a fraction of the MCE_R (for the collapse fragility). [-]
    samples : int, optional
        Number of realisations, >= 10. [-]
    modelling_dispersion : float, optional
        Modelling dispersion, >= 0. [-]
    rng : numpy.random.Generator or int or None
        Random generator or seed (seeded runs repeat exactly). [-]

    Returns
    -------
    dict of arrays (samples,)
        ``loss`` [currency], ``structural``, ``drift_nonstructural``,
        ``acceleration_nonstructural``, ``contents`` [currency],
        ``repair_days``, ``downtime_days`` [day], ``collapse``,
        ``irreparable`` [bool].
    """
    if int(samples) < 10:
        raise ValueError(f"samples = {samples!r} is not allowed: must be a whole number >= 10")
    if not modelling_dispersion >= 0.0:
        raise ValueError(f"modelling_dispersion = {modelling_dispersion!r} is not allowed: must be >= 0 [-]")
    rng = np.random.default_rng(rng)
    n = demands.storeys
    shares = np.asarray(model.storey_shares, dtype=float)
    if shares.shape != (n,) or abs(shares.sum() - 1.0) > 1e-9:
        raise ValueError(f"storey_shares = {model.storey_shares!r} is not allowed: must be {n} values summing to 1")
    columns = [demands.drift_ratio, demands.floor_acceleration, demands.residual_drift_ratio]
    if demands.isolator_displacement is not None:
        columns.append(demands.isolator_displacement[:, None])
    drawn = _sample_log_demands(np.hstack(columns), int(samples), float(modelling_dispersion), rng)
    drift = drawn[:, :n]
    acc = drawn[:, n:2 * n + 1]
    residual = drawn[:, 2 * n + 1:3 * n + 1]
    occ = model.occupancy
    ratio = {name: np.concatenate([[0.0], np.asarray(getattr(occ, name), dtype=float) / 100.0])
             for name in ("structural", "drift_sensitive", "acceleration_sensitive")}
    contents_ratio = np.concatenate([[0.0], np.asarray(CONTENTS_RATIOS) / 100.0])
    ds_str = _states(model.structural, drift, rng)
    ds_nsd = _states(model.drift_nonstructural, drift, rng)
    ds_nsa = _states(model.acceleration_nonstructural, acc[:, 1:], rng)
    ds_con = _states(model.acceleration_nonstructural, acc[:, :-1], rng)
    value = model.replacement_cost * shares
    out = {
        "structural": (ratio["structural"][ds_str] * value).sum(axis=1),
        "drift_nonstructural": (ratio["drift_sensitive"][ds_nsd] * value).sum(axis=1),
        "acceleration_nonstructural": (ratio["acceleration_sensitive"][ds_nsa] * value).sum(axis=1),
        "contents": (contents_ratio[ds_con] * model.contents_value * shares).sum(axis=1),
    }
    collapse = np.zeros(int(samples), dtype=bool)
    if model.collapse is not None:
        collapse |= rng.random(int(samples)) < model.collapse.probability(intensity)
    if model.displacement_limit is not None and demands.isolator_displacement is not None:
        collapse |= drawn[:, -1] > model.displacement_limit
    irreparable = np.zeros(int(samples), dtype=bool)
    if model.irreparable is not None:
        irreparable = (rng.random(int(samples)) < model.irreparable.probability(residual.max(axis=1))) & ~collapse
    building = out["structural"] + out["drift_nonstructural"] + out["acceleration_nonstructural"]
    building = np.minimum(building, model.replacement_cost)
    building = np.where(collapse | irreparable, model.replacement_cost, building)
    contents = np.where(collapse, model.contents_value, out["contents"])
    for name in ("structural", "drift_nonstructural", "acceleration_nonstructural"):
        out[name] = np.where(collapse | irreparable, np.nan, out[name])
    out["contents"] = contents
    out["loss"] = building + contents
    worst = np.maximum(ds_str.max(axis=1), ds_nsd.max(axis=1))
    worst = np.where(collapse | irreparable, 4, worst)
    repair = np.concatenate([[0.0], np.asarray(occ.repair_days, dtype=float)])
    recovery = np.concatenate([[0.0], np.asarray(occ.recovery_days, dtype=float)])
    out["repair_days"] = repair[worst]
    out["downtime_days"] = recovery[worst]
    out["collapse"] = collapse
    out["irreparable"] = irreparable
    return out


def summarise(realisations: dict) -> dict:
    """Mean and 10/50/90 % values of loss, repair days and downtime; collapse and irreparable rates."""
    out: dict[str, float | dict[str, float]] = {}
    for name in ("loss", "repair_days", "downtime_days"):
        values = realisations[name]
        bands = np.percentile(values, PERCENTILES)
        out[name] = {"mean": float(values.mean()), "p10": float(bands[0]), "p50": float(bands[1]),
                     "p90": float(bands[2])}
    for name in ("structural", "drift_nonstructural", "acceleration_nonstructural", "contents"):
        values = np.where(np.isnan(realisations[name]), 0.0, realisations[name])
        out[f"{name}_mean"] = float(values.mean())
    out["collapse_probability"] = float(np.mean(realisations["collapse"]))
    out["irreparable_probability"] = float(np.mean(realisations["irreparable"]))
    return out
