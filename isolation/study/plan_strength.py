"""Storey indicators of the plan model for a study: drift, ductility, residual drift and storey shear
against storey strength, per storey and per direction.

:class:`StoreyStrength` is the typed form of the storey shear demand against the storey yield shear
(``history["bidirectional"]["storeys"]["storey_strength"]`` of a study's results, and the same under
``fixed_base``); :func:`storey_indicators` reduces plan results to the suite means the results and the
verdict carry, the worst over the runs given (property sets and eccentricities).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from types import SimpleNamespace
from typing import Any, Mapping

import numpy as np

__all__ = ["StoreyStrength", "storey_indicators", "reduced"]


def _floats(values) -> tuple:
    return tuple(float(v) for v in values)


@dataclass(frozen=True)
class StoreyStrength:
    """Peak storey shear of the plan model against the storey yield shear, per storey and direction.

    Attributes
    ----------
    shear_x, shear_y : tuple of float
        Peak storey shear in x and in y from the first storey up: the force of the storey's spring at its
        centre of rigidity, suite mean of the peaks, the largest over the runs. [kN]
    strength_x, strength_y : tuple of float or None
        Storey yield shear in x and in y; None where the storeys are elastic. [kN]
    """

    shear_x: tuple
    shear_y: tuple
    strength_x: tuple | None = None
    strength_y: tuple | None = None

    def __post_init__(self) -> None:
        for name in ("shear_x", "shear_y", "strength_x", "strength_y"):
            value = getattr(self, name)
            if value is not None:
                object.__setattr__(self, name, _floats(value))
        n = len(self.shear_x)
        for name in ("shear_y", "strength_x", "strength_y"):
            value = getattr(self, name)
            if value is not None and len(value) != n:
                raise ValueError(f"{name} has {len(value)} entries and shear_x {n}: must be one per storey [kN]")

    @property
    def storeys(self) -> int:
        """Number of storeys. [-]"""
        return len(self.shear_x)

    @staticmethod
    def _ratio(shear, strength) -> tuple | None:
        if strength is None:
            return None
        return tuple(s / r if math.isfinite(r) and r > 0 else math.nan for s, r in zip(shear, strength, strict=True))

    @property
    def ratio_x(self) -> tuple | None:
        """Demand over capacity in x per storey (NaN where a storey is elastic); None without strengths. [-]"""
        return self._ratio(self.shear_x, self.strength_x)

    @property
    def ratio_y(self) -> tuple | None:
        """Demand over capacity in y per storey (NaN where a storey is elastic); None without strengths. [-]"""
        return self._ratio(self.shear_y, self.strength_y)

    @property
    def largest_ratio(self) -> float | None:
        """Largest demand over capacity over storeys and directions; None without strengths. [-]"""
        values = [v for r in (self.ratio_x, self.ratio_y) if r is not None for v in r if math.isfinite(v)]
        return max(values) if values else None

    def to_dict(self) -> dict:
        def plain(values):
            return None if values is None else [None if not math.isfinite(v) else v for v in values]

        return {"shear_x": list(self.shear_x), "shear_y": list(self.shear_y),
                "strength_x": plain(self.strength_x), "strength_y": plain(self.strength_y),
                "ratio_x": plain(self.ratio_x), "ratio_y": plain(self.ratio_y), "largest_ratio": self.largest_ratio}

    @classmethod
    def from_dict(cls, mapping: Mapping[str, Any]) -> "StoreyStrength":
        def back(values):
            return None if values is None else tuple(math.inf if v is None else float(v) for v in values)

        return cls(shear_x=tuple(mapping["shear_x"]), shear_y=tuple(mapping["shear_y"]),
                   strength_x=back(mapping.get("strength_x")), strength_y=back(mapping.get("strength_y")))


def reduced(result) -> SimpleNamespace:
    """The storey arrays of one plan result (:class:`isolation.dynamics.plan_history.PlanHistoryResult`),
    without its histories."""
    return SimpleNamespace(ductility=result.ductility, residual_drift=result.residual_drift,
                           peak_drift_ratio=result.peak_drift_ratio, hysteretic_energy=result.hysteretic_energy,
                           storey_shear_peak=result.storey_shear_peak, yield_strengths=result.yield_strengths)


def _strength(results) -> StoreyStrength:
    shear = np.max([r.storey_shear_peak.mean(axis=0) for r in results], axis=0)  # (storeys, 2)
    strengths = np.asarray(results[0].yield_strengths, dtype=float)
    given = [None if not np.isfinite(strengths[:, j]).any() else tuple(strengths[:, j]) for j in range(2)]
    return StoreyStrength(tuple(shear[:, 0]), tuple(shear[:, 1]), given[0], given[1])


def storey_indicators(results) -> dict:
    """Storey indicators of plan results (:func:`reduced` or full): suite means per storey, the worst over
    the results given.

    Returns
    -------
    dict
        ``yielding``; ``ductility_x``/``_y`` per storey and ``ductility_max`` (None when elastic);
        ``residual_drift_x``/``_y`` and ``residual_drift_max``; ``drift_ratio`` per storey (resultant at the
        plan corners) and ``drift_ratio_max``; ``hysteretic_energy_kNm``; ``storey_strength``
        (:meth:`StoreyStrength.to_dict`). [-, kN, kN m]
    """
    ductility = np.array([r.ductility.mean(axis=0) for r in results])  # (runs, storeys, 2); NaN where elastic
    residual = np.array([r.residual_drift.mean(axis=0) for r in results])
    drift = np.array([r.peak_drift_ratio.mean(axis=0) for r in results])
    yielding = bool(np.isfinite(ductility).any())
    worst_ductility = np.max(ductility, axis=0) if yielding else None
    return {
        "yielding": yielding,
        "ductility_x": None if worst_ductility is None else worst_ductility[:, 0].tolist(),
        "ductility_y": None if worst_ductility is None else worst_ductility[:, 1].tolist(),
        "ductility_max": None if worst_ductility is None else float(worst_ductility.max()),
        "residual_drift_x": np.max(residual, axis=0)[:, 0].tolist(),
        "residual_drift_y": np.max(residual, axis=0)[:, 1].tolist(),
        "residual_drift_max": float(residual.max()),
        "drift_ratio": np.max(drift, axis=0).tolist(),
        "drift_ratio_max": float(drift.max()),
        "hysteretic_energy_kNm": float(max(r.hysteretic_energy.mean() for r in results)),
        "storey_strength": _strength(results).to_dict(),
    }
