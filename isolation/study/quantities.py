"""Plain-number stages of a study run: :class:`DesignQuantities` and :class:`HistorySummary`.

Frozen dataclasses of floats (SI: m, s, kN; g for accelerations) with ``to_dict()`` /
``from_dict()``; ``results.json`` carries them as each alternative's ``quantities`` and
``history.summary``. Re-exported from :mod:`isolation.study.stages`.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Any, Mapping

import numpy as np

__all__ = ["DesignQuantities", "HistorySummary", "NO_HISTORY"]


def _number(value: Any) -> float | None:
    return None if value is None else float(value)


def _plain_scalar(value: Any) -> Any:
    """:func:`isolation.plain.plain` of a number or None, without its general dispatch (sweeps call
    this for every alternative)."""
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def _plain_fields(obj: Any, names: tuple[str, ...]) -> dict:
    return {name: _plain_scalar(getattr(obj, name)) for name in names}


@dataclass(frozen=True)
class DesignQuantities:
    """Key numbers of one alternative's code design, SI units.

    The code's symbols differ by basis: ASCE/SEI 7-16 Ch. 17 (D_M, D_TM, V_b,
    V_s, V_fb) or EN 1998-1 §10.9 (d_dc, d_d, V, V_s, F_b). A value the code
    report does not give is None.

    Attributes
    ----------
    displacement : D_M or d_dc, at the centre of rigidity, governing bound. [m]
    total_displacement : D_TM or d_d, with torsion. [m]
    isolation_shear : V_b or V, at the isolation level. [kN]
    superstructure_shear : V_s, design shear above the isolators. [kN]
    fixed_base_shear : V_fb or F_b, design shear of the building on a fixed base. [kN]
    shear_ratio : V_s / V_fb (or V_s / F_b). [-]
    period_lower, period_upper : effective period T_M of the lower and upper bound. [s]
    damping_lower, damping_upper : effective damping beta_M of the lower and upper bound. [-]
    characteristic_strength : Q_d of the isolation plane, lower bound. [kN]
    displacement_capacity : smallest displacement capacity of the bearings. [m]
    moat : clear width of the moat around the building. [m]
    fixed_base_period : T_fb of the building on a fixed base. [s]
    """

    displacement: float | None
    total_displacement: float | None
    isolation_shear: float | None
    superstructure_shear: float | None
    fixed_base_shear: float | None
    shear_ratio: float | None
    period_lower: float | None = None
    period_upper: float | None = None
    damping_lower: float | None = None
    damping_upper: float | None = None
    characteristic_strength: float | None = None
    displacement_capacity: float | None = None
    moat: float | None = None
    fixed_base_period: float | None = None

    @property
    def torsion_factor(self) -> float:
        """D_TM / D_M (or d_d / d_dc): the corner bearing's displacement over the centre's. [-]"""
        return float(self.total_displacement) / float(self.displacement)  # type: ignore[arg-type]

    def to_dict(self) -> dict:
        """Plain mapping, the ``quantities`` of ``results.json``."""
        return _plain_fields(self, _QUANTITY_FIELDS)

    @classmethod
    def from_dict(cls, mapping: Mapping[str, Any]) -> "DesignQuantities":
        """Read :meth:`to_dict` back (keys missing from ``mapping`` are None)."""
        return cls(**{f.name: _number(mapping.get(f.name)) for f in dataclasses.fields(cls)})


@dataclass(frozen=True)
class HistorySummary:
    """Response-history numbers of one alternative: suite means of peaks (ASCE/SEI 7-16 §17.6.3.4
    allows the mean of 7 or more records, from memory) against the fixed base.

    Built by :meth:`from_statistics` from :func:`isolation.study.assembly.history_summary` and,
    with the yielding comparison, :func:`isolation.performance.comparison.comparison_summary`.
    A number that was not computed (a sweep without histories, no comparison) is None.

    Attributes
    ----------
    isolator_displacement_lower, isolator_displacement_upper : largest suite-mean isolator
        displacement of the bound. [m]
    isolator_displacement_max_record : largest isolator displacement of any record, lower bound. [m]
    torsion_factor : D_TM / D_M of the code report, applied to the lower-bound displacement. [-]
    floor_acceleration_fixed, floor_acceleration_lower, floor_acceleration_upper : largest
        suite-mean peak floor acceleration. [g]
    superstructure_shear_fixed : largest suite-mean storey shear of the fixed base. [kN]
    superstructure_shear_upper : suite-mean first-storey shear, upper bound. [kN]
    isolation_shear_upper : suite-mean isolator plus damper force, upper bound. [kN]
    drift_ratio_fixed, drift_ratio_isolated : largest suite-mean storey drift ratio. [-]
    residual_displacement_lower : suite-mean residual isolator displacement, lower bound. [m]
    floor_acceleration_ratio : isolated (worse bound) / fixed base. [-]
    superstructure_shear_ratio : upper bound / fixed base. [-]
    isolator_displacement_with_torsion : lower bound times the torsion factor. [m]
    ductility_fixed, ductility_isolated : largest storey ductility demand. [-]
    residual_drift_fixed, residual_drift_isolated : largest residual storey drift ratio. [-]
    shear_over_strength_fixed, shear_over_strength_isolated : largest peak storey shear over
        yield shear. [-]
    design_shear_fixed, design_shear_isolated : design base shear of the storey designs. [kN]
    strength_fixed, strength_isolated : first-storey yield shear. [kN]
    floor_acceleration_fixed_elastic : peak floor acceleration of the elastic fixed base. [g]
    drift_ratio_fixed_elastic : peak drift ratio of the elastic fixed base. [-]
    superstructure_shear_fixed_elastic : first-storey shear of the elastic fixed base. [kN]
    floor_acceleration_ratio_elastic, superstructure_shear_ratio_elastic : isolated over the
        elastic fixed base. [-]
    """

    isolator_displacement_lower: float | None = None
    isolator_displacement_upper: float | None = None
    isolator_displacement_max_record: float | None = None
    torsion_factor: float | None = None
    floor_acceleration_fixed: float | None = None
    floor_acceleration_lower: float | None = None
    floor_acceleration_upper: float | None = None
    superstructure_shear_fixed: float | None = None
    superstructure_shear_upper: float | None = None
    isolation_shear_upper: float | None = None
    drift_ratio_fixed: float | None = None
    drift_ratio_isolated: float | None = None
    residual_displacement_lower: float | None = None
    floor_acceleration_ratio: float | None = None
    superstructure_shear_ratio: float | None = None
    isolator_displacement_with_torsion: float | None = None
    ductility_fixed: float | None = None
    ductility_isolated: float | None = None
    residual_drift_fixed: float | None = None
    residual_drift_isolated: float | None = None
    shear_over_strength_fixed: float | None = None
    shear_over_strength_isolated: float | None = None
    design_shear_fixed: float | None = None
    design_shear_isolated: float | None = None
    strength_fixed: float | None = None
    strength_isolated: float | None = None
    floor_acceleration_fixed_elastic: float | None = None
    drift_ratio_fixed_elastic: float | None = None
    superstructure_shear_fixed_elastic: float | None = None
    floor_acceleration_ratio_elastic: float | None = None
    superstructure_shear_ratio_elastic: float | None = None

    @classmethod
    def from_statistics(cls, stats: Mapping, fixed: Mapping, torsion: float,
                        comparison: Mapping | None = None) -> "HistorySummary":
        """The summary of suite statistics (see :func:`isolation.study.assembly.history_summary`).

        Parameters
        ----------
        stats : mapping
            ``{"lower": HistoryResult.statistics(), "upper": ...}`` of the isolated building.
        fixed : mapping
            ``HistoryResult.statistics()`` of the superstructure on a fixed base.
        torsion : float
            D_TM / D_M of the code report. [-]
        comparison : mapping, optional
            :func:`isolation.performance.comparison.comparison_summary` of the same run.
        """
        from isolation.study.assembly import history_summary

        values = history_summary(dict(stats), dict(fixed), torsion)
        values.update(comparison or {})
        return cls.from_dict(values)

    def to_dict(self, *, computed_only: bool = False) -> dict:
        """Plain mapping, the ``history.summary`` of ``results.json``; ``computed_only`` leaves
        out the numbers that were not computed (None)."""
        values = _plain_fields(self, _SUMMARY_FIELDS)
        if computed_only:
            values = {k: v for k, v in values.items() if v is not None}
        return values

    @classmethod
    def from_dict(cls, mapping: Mapping[str, Any], *, strict: bool = True) -> "HistorySummary":
        """Read :meth:`to_dict` back; unknown keys are refused (ValueError naming them), or with
        ``strict=False`` left out (readers of results written by other versions)."""
        names = {f.name for f in dataclasses.fields(cls)}
        unknown = sorted(set(mapping) - names)
        if unknown and strict:
            raise ValueError(f"history summary = {unknown!r} is not allowed: keys must be among {sorted(names)}")
        return cls(**{k: _number(v) for k, v in mapping.items() if k in names})


_QUANTITY_FIELDS = tuple(f.name for f in dataclasses.fields(DesignQuantities))
_SUMMARY_FIELDS = tuple(f.name for f in dataclasses.fields(HistorySummary))

NO_HISTORY = HistorySummary()
"""The summary of an alternative without response histories (equivalent-linear sweeps)."""
