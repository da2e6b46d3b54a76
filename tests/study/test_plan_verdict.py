"""The verdict on a bidirectional run uses the plan model's results.

Sources
-------
* ASCE/SEI 7-16 §17.2.4.6 (from memory): uplift checked under 0.9 D - E_v with E_v = 0.2 S_MS D; a bearing
  whose axial load drop under overturning exceeds its net gravity load is in net tension (ratio >= 1).
* Storey ductility limit 2 (common practice for an essentially elastic isolated superstructure designed
  with R_I <= 2, ASCE/SEI 7-16 §17.5.4.2, from memory) and residual drift ratio 0.5 % (FEMA P-58-1, 2012,
  residual drift needing realignment, from memory): the thresholds of ``superstructure_yielding``.
* ASCE/SEI 7-16 §17.6.4.4 (from memory): storey drift ratio 0.020 under MCE_R response histories.
* ASCE/SEI 7-16 §17.6.3.4 (from memory): history D_TM not below 80 % of the single-mode D_TM.
"""

from __future__ import annotations

import math

import pytest

from isolation.study.plan import PLAN_STOREY_MODEL, history_uplift_ratio, with_bidirectional
from isolation.study.plan_strength import StoreyStrength
from isolation.verdict import Figures, assess

BASE = dict(alternative="a", fixed_base_period=0.6, isolated_period=3.0, total_displacement=0.40,
            displacement_capacity=0.60, drift_limit=0.020, ductility_isolated=1.1, residual_drift_isolated=0.0001,
            drift_ratio=0.004, uplift_ratio=0.2)


def _summary(ductility=1.5, residual=0.001, drift=0.006, axial_min=(700.0, 650.0), history=0.45, code=0.50):
    limit = 0.8
    return {
        "total_displacement_history": history, "total_displacement_code": code,
        "total_displacement_governing": max(history, limit * code),
        "gravity_load_kN": [1000.0, 1000.0], "bearing_axial_min_kN": list(axial_min),
        "storeys": {"yielding": ductility is not None, "ductility_max": ductility, "residual_drift_max": residual,
                    "drift_ratio_max": drift},
        "fixed_base": {"ductility_max": 4.2, "residual_drift_max": 0.007},
    }


def _reason(figures, topic):
    return next(r for r in assess(figures).reasons if r.topic == topic)


def test_history_uplift_ratio_against_the_factored_gravity_load():
    # 0.9 D - 0.2 S_MS D with S_MS = 1.5: net 0.6 D. A drop of 600 kN on 1000 kN is exactly net zero.
    summary = _summary(axial_min=(400.0, 800.0))
    assert history_uplift_ratio(summary, 0.9, 0.3) == pytest.approx(1.0)
    assert history_uplift_ratio(summary) == pytest.approx(0.6)  # unfactored: drop over gravity
    assert history_uplift_ratio(summary, 0.3, 0.3) == math.inf


@pytest.mark.parametrize("lowest, level", [(401.0, "ok"), (399.0, "condition")])
def test_uplift_finding_turns_at_net_tension_under_the_code_combination(lowest, level):
    figures = with_bidirectional(Figures(**BASE), _summary(axial_min=(lowest, 900.0)), (0.9, 0.3))
    assert _reason(figures, "uplift").level == level


@pytest.mark.parametrize("ductility, residual, level", [
    (2.0, 0.001, "ok"), (2.01, 0.001, "condition"), (1.2, 0.00499, "ok"), (1.2, 0.005, "condition")])
def test_superstructure_finding_uses_the_plan_storeys(ductility, residual, level):
    # the planar figures say ductility 1.1: only the plan model's numbers can move the finding
    figures = with_bidirectional(Figures(**BASE), _summary(ductility=ductility, residual=residual))
    assert (figures.ductility_isolated, figures.residual_drift_isolated) == (ductility, residual)
    assert (figures.ductility_fixed, figures.residual_drift_fixed) == (4.2, 0.007)
    reason = _reason(figures, "superstructure yielding")
    assert reason.level == level and PLAN_STOREY_MODEL in reason.message and "4.20" in reason.message


@pytest.mark.parametrize("drift, level", [(0.020, "ok"), (0.0201, "condition")])
def test_drift_finding_uses_the_plan_corners(drift, level):
    figures = with_bidirectional(Figures(**BASE), _summary(drift=drift))
    reason = _reason(figures, "drift")
    assert figures.drift_ratio == drift and reason.level == level and PLAN_STOREY_MODEL in reason.message


def test_elastic_plan_storeys_leave_no_yielding_finding():
    figures = with_bidirectional(Figures(**BASE), _summary(ductility=None))
    assert not [r for r in assess(figures).reasons if r.topic == "superstructure yielding"]


@pytest.mark.parametrize("history, code, governing", [(0.45, 0.50, 0.45), (0.35, 0.50, 0.40)])
def test_displacement_finding_uses_the_governing_history_dtm(history, code, governing):
    figures = with_bidirectional(Figures(**BASE), _summary(history=history, code=code))
    assert figures.total_displacement == pytest.approx(governing) and figures.history_displacement == history


def test_storey_strength_ratios_and_round_trip():
    # demand / capacity per storey and direction; an elastic direction has no capacity and no ratio
    strength = StoreyStrength((1200.0, 900.0), (1100.0, 1000.0), (1000.0, 1000.0), None)
    assert strength.ratio_x == pytest.approx((1.2, 0.9)) and strength.ratio_y is None
    assert strength.largest_ratio == pytest.approx(1.2)
    assert StoreyStrength.from_dict(strength.to_dict()) == strength
    partly = StoreyStrength((500.0, 400.0), (500.0, 400.0), (1000.0, math.inf), (1000.0, math.inf))
    again = StoreyStrength.from_dict(partly.to_dict())
    assert math.isnan(again.ratio_x[1]) and again.largest_ratio == pytest.approx(0.5)
    with pytest.raises(ValueError, match="shear_y"):
        StoreyStrength((1.0, 2.0), (1.0,))
