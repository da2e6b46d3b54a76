"""The owner's economics of an alternative against the fixed base: premium, benefit, payback, NPV.

:func:`economics` from two :func:`isolation.loss.analysis.case_loss` results and the
isolation premium; re-exported from :mod:`isolation.loss.analysis`.
"""

from __future__ import annotations

import math

from isolation.loss import costs as _costs
from isolation.loss.inputs import LossInputs
from isolation.loss.simulation import LossModel

__all__ = ["economics"]


def economics(fixed: dict, isolated: dict, premium: dict, cost) -> dict:
    """Owner's economics of one alternative against the fixed base.

    Parameters
    ----------
    fixed, isolated : dict
        :func:`case_loss` results.
    premium : dict
        ``isolation_cost`` [currency], ``superstructure_saving`` [currency].
    cost : CostInputs

    Returns
    -------
    dict
        ``net_premium`` [currency], ``annual_benefit`` [currency/year],
        ``payback_years`` [year] (None when never), ``net_present_value``
        [currency], and ``bands`` (p10/p50/p90 pairing the same percentile of
        the fixed and isolated loss curves: an indication, not a confidence
        interval).
    """
    net = premium["isolation_cost"] - premium["superstructure_saving"]

    def figures(fixed_loss, iso_loss, fixed_days, iso_days):
        benefit = (fixed_loss - iso_loss) + (fixed_days - iso_days) * cost.lost_use_per_day
        payback = _costs.payback_years(benefit, net)
        return {"annual_benefit": benefit,
                "payback_years": None if math.isinf(payback) else payback,
                "net_present_value": _costs.net_present_value(benefit, net, cost.discount_rate, cost.design_life)}

    out = {"net_premium": net, **premium}
    out.update(figures(fixed["expected_annual_loss"], isolated["expected_annual_loss"],
                       fixed["expected_annual_downtime"], isolated["expected_annual_downtime"]))
    out["bands"] = {}
    for stat in ("p10", "p50", "p90"):
        out["bands"][stat] = figures(fixed["expected_annual_loss_bands"][stat],
                                     isolated["expected_annual_loss_bands"][stat],
                                     fixed["expected_annual_downtime_bands"][stat],
                                     isolated["expected_annual_downtime_bands"][stat])
    return out


def _premium(study, alternative, system, quantities, inputs: LossInputs, model: LossModel) -> dict:
    b = study.building
    groups = []
    for spec in alternative.bearings:
        props = spec.properties
        capacity = props.get("displacement_capacity")
        if capacity is None and "displacement_capacity_1" in props and "displacement_capacity_2" in props:
            capacity = props["displacement_capacity_1"] + props["displacement_capacity_2"]
        groups.append((spec.type, spec.count, capacity))
    plan = b.plan_length * b.plan_width
    perimeter = 2.0 * (b.plan_length + b.plan_width)
    items = _costs.isolation_cost(groups, inputs.cost, plan, perimeter)
    structural_cost = model.occupancy.structural_share * model.replacement_cost
    ratio = float(quantities["shear_ratio"])
    saving = _costs.superstructure_saving(inputs.cost, structural_cost, ratio)
    return {"isolation_cost": items["total"], "isolation_cost_items": items, "superstructure_saving": saving,
            "structural_cost": structural_cost, "design_shear_ratio": ratio}
