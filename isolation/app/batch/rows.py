"""Summary rows from study results (a record's ``results.json`` or a direct sweep).

One row per isolation alternative, with the columns of
:mod:`isolation.app.batch.summary`. The base-shear ratio of a bound compares
like with like, both elastic and under the same site spectrum:

    ratio = V_b / (W Sa(T_fb, 5 %))

with V_b = k_M D_M the isolation-level base shear of that bound [kN] from
the equivalent-linear procedure (ASCE/SEI 7-16 §17.5.3), W the seismic
weight above the isolators [kN], and W Sa(T_fb) the elastic base shear of the
same building on a fixed base at its fixed-base period T_fb [s] (single-
mode, whole mass; common practice for a screening comparison). The study's
own design comparison (code shears V_s / V_fb, governing bound) is kept in
``design_shear_ratio``.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any, Mapping

__all__ = ["rows_from_results", "rows_from_record", "fixed_base_elastic_shear"]


def _float(value: Any) -> float | None:
    if isinstance(value, bool) or value is None:
        return None
    try:
        number = float(value)
    except (TypeError, ValueError):
        return None
    return number if math.isfinite(number) else None


def fixed_base_elastic_shear(spectrum, period: float, weight: float) -> float:
    """Elastic base shear W Sa(T_fb, 5 %) of the building on a fixed base.

    Parameters
    ----------
    spectrum : spectrum object
        Site spectrum with ``sa(period, damping)``. [g]
    period : float
        Fixed-base period T_fb. [s]
    weight : float
        Seismic weight W. [kN]

    Returns
    -------
    float
        Base shear. [kN]
    """
    return float(weight) * float(spectrum.sa(period, 0.05))


def rows_from_results(results: Mapping[str, Any], fixed_shear: float, *, verdict_basis: str) -> list[dict]:
    """Summary rows of one study run.

    Parameters
    ----------
    results : mapping
        ``StudyResults.to_dict()`` (or the same layout from a direct sweep):
        ``alternatives`` with ``name``, ``bounds`` (lower / upper:
        ``displacement`` [m], ``period`` [s], ``damping`` [-], ``base_shear``
        [kN]), ``quantities`` (``total_displacement`` [m], ``shear_ratio`` [-],
        ``displacement_capacity`` [m], ``moat`` [m]), ``figures``
        (``floor_acceleration_ratio`` [-]), ``verdict`` (``outcome``) and, when
        the loss study ran, ``loss`` (expected annual loss, loss at MCE_R,
        economics) with ``fixed_base.loss`` and the study-level ``loss.currency``;
        the loss columns stay empty otherwise.
    fixed_shear : float
        Elastic fixed-base base shear W Sa(T_fb, 5 %). [kN]
    verdict_basis : str
        ``"response histories"`` or ``"equivalent linear"``: what the verdict rests on.

    Returns
    -------
    list of dict
    """
    rows = []
    for alternative in results.get("alternatives", []):
        bounds = alternative.get("bounds", {})
        quantities = alternative.get("quantities", {})
        figures = alternative.get("figures", {}) or {}
        row: dict[str, Any] = {
            "alternative": alternative.get("name"),
            "verdict": (alternative.get("verdict") or {}).get("outcome"),
            "verdict_basis": verdict_basis,
            "D_TM_m": _float(quantities.get("total_displacement")),
            "design_shear_ratio": _float(quantities.get("shear_ratio")),
            "floor_acceleration_ratio": _float(figures.get("floor_acceleration_ratio")),
            "displacement_capacity_m": _float(quantities.get("displacement_capacity")),
            "moat_m": _float(quantities.get("moat")),
        }
        row.update(_loss_columns(alternative.get("loss") or {}, results))
        for bound in ("lower", "upper"):
            result = bounds.get(bound, {})
            base_shear = _float(result.get("base_shear"))
            row[f"D_M_{bound}_m"] = _float(result.get("displacement"))
            row[f"T_M_{bound}_s"] = _float(result.get("period"))
            row[f"beta_M_{bound}"] = _float(result.get("damping"))
            row[f"base_shear_ratio_{bound}"] = (
                base_shear / fixed_shear if base_shear is not None and fixed_shear > 0 else None
            )
        rows.append(row)
    return rows


def _loss_columns(loss: Mapping[str, Any], results: Mapping[str, Any]) -> dict:
    """Loss-study columns of one alternative (all None when the study has no loss results)."""
    if not loss:
        return {}
    fixed = (results.get("fixed_base") or {}).get("loss") or {}
    economics = loss.get("economics") or {}
    return {
        "currency": (results.get("loss") or {}).get("currency"),
        "expected_annual_loss": _float(loss.get("expected_annual_loss")),
        "expected_annual_loss_fixed": _float(fixed.get("expected_annual_loss")),
        "expected_loss_mce": _float(loss.get("expected_loss_mce")),
        "expected_loss_mce_fixed": _float(fixed.get("expected_loss_mce")),
        "expected_annual_downtime_days": _float(loss.get("expected_annual_downtime")),
        "net_premium": _float(economics.get("net_premium")),
        "payback_years": _float(economics.get("payback_years")),
        "net_present_value": _float(economics.get("net_present_value")),
    }


def rows_from_record(record_dir: str | Path) -> list[dict]:
    """Summary rows of a completed record (its ``results.json`` and study as run)."""
    from isolation.study import load_study
    from isolation.study.runner import fixed_base_period, site_spectrum

    record = Path(record_dir)
    results = json.loads((record / "results.json").read_text(encoding="utf-8"))
    used = record / "study_used.toml"
    study = load_study(used if used.is_file() else record / "study.toml")
    period = _float(results.get("fixed_base", {}).get("period")) or fixed_base_period(study)[0]
    shear = fixed_base_elastic_shear(site_spectrum(study), period, study.building.total_weight)
    return rows_from_results(results, shear, verdict_basis="response histories")
