"""Fragilities, consequences, Monte Carlo losses and owner economics (isolation.loss).

Outside sources (values typed here from the tables, not from the package):
* FEMA Multi-hazard Loss Estimation Methodology, Earthquake Model, Technical Manual (MR5, 2010),
  Table 5.9a (High-Code structural drift at
  damage-state thresholds), Table 5.11 (non-structural drift), Table 5.13 (non-structural
  acceleration, High-Code), Tables 15.2-15.4 (repair cost ratios, % of replacement cost),
  Table 15.5 (contents damage ratios), Chapter 15 repair/recovery time tables. From memory.
* ASCE/SEI 7-16 Commentary Table C.1.3.1b: target P(collapse | MCE_R) 10 % (risk
  category II), 5 % (III), 2.5 % (IV). From memory.
* FEMA P-58-1 (2012) §7.6: irreparability median residual drift 1 %, dispersion 0.3.
  From memory.
* Present value of an annuity: (1 - (1 + r)^-n)/r (any engineering-economics textbook).
"""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from isolation.loss import (
    OCCUPANCIES,
    CostInputs,
    Demands,
    Fragility,
    LossModel,
    annuity_factor,
    net_present_value,
    payback_years,
    simulate,
)
from isolation.loss.consequences import CONTENTS_RATIOS, occupancy
from isolation.loss.costs import bearing_size_class, isolation_cost, superstructure_saving
from isolation.loss.fragility import IRREPARABLE, collapse_fragility, collapse_probability_at_mce, component_fragilities
from isolation.loss.simulation import summarise


# --- published values --------------------------------------------------------------------------
@pytest.mark.parametrize("system, storeys, medians", [
    ("braced_frame", 4, (0.0033, 0.0067, 0.0200, 0.0533)),        # S2M, Table 5.9a
    ("steel_moment_frame", 2, (0.006, 0.012, 0.030, 0.080)),      # S1L, Table 5.9a
    ("concrete_moment_frame", 10, (0.0025, 0.005, 0.015, 0.040)),  # C1H, Table 5.9a
])
def test_structural_medians_are_the_manuals_high_code(system, storeys, medians):
    groups = component_fragilities(system, storeys, "high")
    assert [f.median for f in groups["structural"]] == pytest.approx(medians)
    assert [f.median for f in groups["drift_nonstructural"]] == pytest.approx([0.004, 0.008, 0.025, 0.050])
    assert [f.median for f in groups["acceleration_nonstructural"]] == pytest.approx([0.30, 0.60, 1.20, 2.40])
    assert all("Table" in f.source or "Tables" in f.source for g in groups.values() for f in g)


def test_office_and_residential_repair_ratios_are_the_manuals_tables():
    office = occupancy("office")  # COM4
    assert office.structural == (0.4, 1.9, 9.6, 19.2)               # Table 15.2
    assert office.acceleration_sensitive == (0.9, 4.8, 14.4, 47.9)  # Table 15.3
    assert office.drift_sensitive == (0.7, 3.3, 16.4, 32.9)         # Table 15.4
    assert office.repair_days == (5, 30, 120, 240)
    residential = occupancy("residential")  # RES3
    assert residential.structural == (0.3, 1.4, 6.9, 13.8)
    assert CONTENTS_RATIOS == (1.0, 5.0, 25.0, 50.0)                # Table 15.5


@pytest.mark.parametrize("name", sorted(OCCUPANCIES))
def test_complete_damage_of_all_groups_is_the_replacement_cost(name):
    # The manual's three tables split the replacement cost: complete-state ratios add to 100 %.
    occ = OCCUPANCIES[name]
    assert occ.structural[-1] + occ.acceleration_sensitive[-1] + occ.drift_sensitive[-1] == pytest.approx(100.0)
    for ratios in (occ.structural, occ.acceleration_sensitive, occ.drift_sensitive, occ.repair_days,
                   occ.recovery_days):
        assert all(b > a for a, b in zip(ratios, ratios[1:], strict=False))


@pytest.mark.parametrize("importance, target", [(1.0, 0.10), (1.25, 0.05), (1.5, 0.025)])
def test_collapse_fragility_meets_the_code_target_at_mce(importance, target):
    p = collapse_probability_at_mce(importance)
    assert p == target
    fragility = collapse_fragility(p)
    assert float(fragility.probability(1.0)) == pytest.approx(target)
    assert float(fragility.probability(1.0)) == pytest.approx(
        stats.lognorm.cdf(1.0, 0.6, scale=fragility.median))


def test_irreparability_is_fema_p58():
    assert (IRREPARABLE.median, IRREPARABLE.dispersion) == (0.01, 0.3)
    assert float(IRREPARABLE.probability(0.01)) == pytest.approx(0.5)


def test_fragility_probability_is_the_lognormal_cdf():
    f = Fragility(0.02, 0.5)
    d = np.array([0.0, 0.005, 0.02, 0.06])
    assert np.allclose(f.probability(d), stats.lognorm.cdf(d, 0.5, scale=0.02))


# --- Monte Carlo -------------------------------------------------------------------------------
def _model(storeys=1, *, collapse=None, irreparable=None, dispersion=0.5, medians=(0.005, 0.01, 0.02, 0.04)):
    states = tuple(Fragility(m, dispersion) for m in medians)
    acc = tuple(Fragility(m, dispersion) for m in (0.3, 0.6, 1.2, 2.4))
    return LossModel(structural=states, drift_nonstructural=states, acceleration_nonstructural=acc,
                     occupancy=OCCUPANCIES["office"], replacement_cost=1.0e7, contents_value=4.0e6,
                     storey_shares=(1.0 / storeys,) * storeys, collapse=collapse, irreparable=irreparable)


def _demands(drift, acc, residual=1e-6):
    drift = np.atleast_2d(drift)
    return Demands(drift, np.atleast_2d(acc), np.full_like(drift, residual))


def test_hand_built_two_storeys_with_known_damage_states():
    # Dispersion 0.01: the damage state is certain. Storey 1 drift 0.015 (moderate), storey 2 drift
    # 0.03 (extensive); floor accelerations ground 0.1 g (none), floor 1 0.45 g (slight), roof 0.9 g
    # (moderate). Costs by hand from the COM4 ratios: storey i carries half of 1e7 and of 4e6.
    model = _model(2, dispersion=0.01)
    acc_states = tuple(Fragility(m, 0.01) for m in (0.3, 0.6, 1.2, 2.4))
    model = LossModel(**{**model.__dict__, "acceleration_nonstructural": acc_states})
    out = simulate(model, _demands([0.015, 0.03], [0.1, 0.45, 0.9]), 0.5, samples=200, modelling_dispersion=0.0,
                   rng=1)
    half, contents_half = 5.0e6, 2.0e6
    structural = half * (1.9 + 9.6) / 100
    drift_ns = half * (3.3 + 16.4) / 100
    acc_ns = half * (0.9 + 4.8) / 100               # storey 1: floor 1 slight; storey 2: roof moderate
    contents = contents_half * (0.0 + 1.0) / 100    # storey 1 on the ground (none), storey 2 on floor 1 (slight)
    assert np.allclose(out["loss"], structural + drift_ns + acc_ns + contents)
    assert np.allclose(out["structural"], structural)
    assert np.all(out["repair_days"] == 120) and np.all(out["downtime_days"] == 360)  # extensive, COM4


def test_no_demand_no_loss_and_huge_demand_total_loss():
    model = _model()
    quiet = simulate(model, _demands([1e-6], [1e-4, 1e-4]), 0.1, samples=100, modelling_dispersion=0.0, rng=0)
    assert np.all(quiet["loss"] == 0.0) and np.all(quiet["repair_days"] == 0.0)
    wrecked = simulate(model, _demands([5.0], [100.0, 100.0]), 0.1, samples=100, modelling_dispersion=0.0, rng=0)
    # complete state of every group: 100 % of the building (the manual's split) + 50 % of the contents (Table 15.5)
    assert np.allclose(wrecked["loss"], 1.0e7 + 0.5 * 4.0e6)


def test_collapse_and_irreparability_cost_the_replacement():
    model = _model(collapse=Fragility(1e-3, 0.1), irreparable=None)
    out = simulate(model, _demands([1e-6], [1e-4, 1e-4]), 1.0, samples=50, modelling_dispersion=0.0, rng=0)
    assert np.all(out["collapse"]) and np.allclose(out["loss"], 1.0e7 + 4.0e6)
    model = _model(irreparable=IRREPARABLE)
    out = simulate(model, _demands([1e-6], [1e-4, 1e-4], residual=0.5), 1.0, samples=50,
                   modelling_dispersion=0.0, rng=0)
    assert np.all(out["irreparable"]) and np.allclose(out["loss"], 1.0e7)
    assert np.all(out["downtime_days"] == OCCUPANCIES["office"].recovery_days[-1])


def test_monte_carlo_mean_converges_to_the_expected_loss():
    # One record, no modelling dispersion: E[loss] = R sum_groups sum_ds P(DS = ds | d) ratio_ds,
    # with P from scipy's lognormal CDF.
    drift, acc = 0.012, 0.7
    model = _model(dispersion=0.5)
    occ = OCCUPANCIES["office"]

    def expected(demand, medians, ratios, value):
        exceed = [stats.lognorm.cdf(demand, 0.5, scale=m) for m in medians] + [0.0]
        return value * sum((exceed[i] - exceed[i + 1]) * ratios[i] / 100 for i in range(4))

    drift_medians, acc_medians = (0.005, 0.01, 0.02, 0.04), (0.3, 0.6, 1.2, 2.4)
    reference = (expected(drift, drift_medians, occ.structural, 1e7)
                 + expected(drift, drift_medians, occ.drift_sensitive, 1e7)
                 + expected(acc, acc_medians, occ.acceleration_sensitive, 1e7)
                 + expected(acc, acc_medians, CONTENTS_RATIOS, 4e6))
    out = simulate(model, _demands([drift], [acc, acc]), 0.5, samples=40000, modelling_dispersion=0.0, rng=7)
    error = out["loss"].std() / math.sqrt(out["loss"].size)
    assert abs(out["loss"].mean() - reference) < 4 * error
    small = simulate(model, _demands([drift], [acc, acc]), 0.5, samples=4000, modelling_dispersion=0.0, rng=7)
    assert abs(small["loss"].mean() - reference) < 4 * small["loss"].std() / math.sqrt(4000)


def test_seeded_runs_repeat_and_other_seeds_differ():
    model = _model()
    demands = Demands(np.array([[0.01], [0.02], [0.006]]), np.array([[0.3, 0.5], [0.5, 0.9], [0.2, 0.4]]),
                      np.full((3, 1), 1e-4))
    a = simulate(model, demands, 0.5, samples=500, rng=11)
    b = simulate(model, demands, 0.5, samples=500, rng=11)
    c = simulate(model, demands, 0.5, samples=500, rng=12)
    assert np.array_equal(a["loss"], b["loss"]) and not np.array_equal(a["loss"], c["loss"])


def test_record_to_record_sampling_keeps_the_suite_log_mean_and_spread():
    drift = np.array([[0.004], [0.01], [0.02], [0.008]])
    acc = np.column_stack([drift[:, 0] * 10, drift[:, 0] * 30])
    rng = np.random.default_rng(3)
    from isolation.loss.simulation import _sample_log_demands

    draws = _sample_log_demands(np.hstack([drift, acc]), 40000, 0.0, rng)
    logs = np.log(np.hstack([drift, acc]))
    assert np.allclose(np.log(draws).mean(axis=0), logs.mean(axis=0), atol=0.02)
    assert np.allclose(np.log(draws).std(axis=0), logs.std(axis=0, ddof=1), rtol=0.03)


def test_summary_bands_are_percentiles():
    values = {"loss": np.arange(101.0), "repair_days": np.zeros(101), "downtime_days": np.zeros(101),
              "structural": np.zeros(101), "drift_nonstructural": np.zeros(101),
              "acceleration_nonstructural": np.zeros(101), "contents": np.zeros(101),
              "collapse": np.zeros(101, bool), "irreparable": np.zeros(101, bool)}
    s = summarise(values)
    assert (s["loss"]["p10"], s["loss"]["p50"], s["loss"]["p90"], s["loss"]["mean"]) == (10, 50, 90, 50)


def test_bad_demands_and_samples_are_refused():
    with pytest.raises(ValueError, match="shapes"):
        Demands(np.ones((2, 3)), np.ones((2, 3)), np.ones((2, 3)))
    with pytest.raises(ValueError, match="drift_ratio"):
        Demands(np.array([[-0.1]]), np.ones((1, 2)), np.zeros((1, 1)))
    with pytest.raises(ValueError, match="samples"):
        simulate(_model(), _demands([0.01], [0.1, 0.1]), 0.5, samples=5)


# --- costs and economics -----------------------------------------------------------------------
def test_annuity_and_npv_against_the_explicit_sum():
    rate, years, benefit, premium = 0.03, 50, 1.0e5, 1.5e6
    explicit = sum(benefit / (1 + rate)**t for t in range(1, years + 1)) - premium
    assert net_present_value(benefit, premium, rate, years) == pytest.approx(explicit)
    assert annuity_factor(0.0, 30) == 30
    assert annuity_factor(0.05, 20) == pytest.approx((1 - 1.05**-20) / 0.05)
    assert payback_years(1e5, 1.5e6) == pytest.approx(15.0)
    assert payback_years(-1.0, 1e6) == math.inf and payback_years(1.0, -5.0) == 0.0


def test_isolation_cost_items_by_hand():
    costs = CostInputs(bearing_cost={"friction_pendulum": (10.0, 20.0, 30.0)}, isolation_plane_per_area=2.0,
                       moat_per_length=3.0, utilities=100.0, design_and_testing=1000.0)
    items = isolation_cost([("friction_pendulum", 4, 0.3), ("friction_pendulum", 2, 0.9),
                            ("friction_pendulum", 1, None)], costs, plan_area=50.0, perimeter=30.0)
    assert items["bearings"] == 4 * 10 + 2 * 30 + 1 * 20
    assert items["total"] == 120 + 100 + 90 + 100 + 1000
    assert [bearing_size_class(d) for d in (0.4, 0.41, 0.7, 0.71)] == [0, 1, 1, 2]
    assert superstructure_saving(CostInputs(superstructure_saving=0.2), 1.0e6, 0.4) == pytest.approx(0.2 * 1e6 * 0.6)
    assert superstructure_saving(CostInputs(), 1.0e6, 1.3) == 0.0
    with pytest.raises(ValueError, match="bearing_cost has no entry for bearing type 'lead_rubber'"):
        isolation_cost([("lead_rubber", 1, 0.3)], costs, 1.0, 1.0)
    # a type without its own entry takes the "other" entry
    other = CostInputs(bearing_cost={"other": (1.0, 2.0, 3.0)})
    assert isolation_cost([("some_new_type", 2, 0.9)], other, 0.0, 0.0)["bearings"] == 6.0


@pytest.mark.parametrize("field, value", [("discount_rate", 0.5), ("design_life", 0.0), ("utilities", -1.0),
                                          ("superstructure_saving", 1.5), ("replacement_cost_per_area", float("nan")),
                                          ("bearing_cost", {"lead_rubber": (1.0, 2.0)})])
def test_bad_costs_name_the_field(field, value):
    with pytest.raises(ValueError, match=rf"{field}.* is not allowed"):
        CostInputs(**{field: value})


@settings(max_examples=30, deadline=None)
@given(drift=st.floats(1e-4, 0.08), acc=st.floats(0.01, 3.0), factor=st.floats(1.0, 3.0),
       seed=st.integers(0, 2**31 - 1))
def test_more_demand_never_costs_less_with_common_random_numbers(drift, acc, factor, seed):
    # Same seed: the same normal and uniform draws, so each realisation's damage states can only rise
    # with the demand (fragilities are increasing functions): loss and times are monotone, no NaN.
    model = _model(2)
    low = Demands(np.array([[drift, 0.5 * drift], [0.7 * drift, drift]]),
                  np.array([[0.5 * acc, acc, acc], [0.4 * acc, 0.8 * acc, acc]]), np.full((2, 2), 1e-5))
    high = Demands(low.drift_ratio * factor, low.floor_acceleration * factor, low.residual_drift_ratio)
    a = simulate(model, low, 0.5, samples=200, rng=seed)
    b = simulate(model, high, 0.5, samples=200, rng=seed)
    assert np.all(b["loss"] >= a["loss"] - 1e-6) and np.all(b["repair_days"] >= a["repair_days"])
    assert np.all(np.isfinite(a["loss"])) and np.all(a["loss"] <= 1.0e7 + 4.0e6)


def test_demand_statistics_are_geometric_mean_and_log_standard_deviation():
    drift = np.array([[0.01], [0.04]])
    demands = Demands(drift, np.array([[0.2, 0.4], [0.2, 0.1]]), np.full((2, 1), 1e-3))
    stats_ = demands.statistics()
    assert stats_["drift_ratio"]["median"] == pytest.approx([0.02])  # sqrt(0.01 x 0.04)
    assert stats_["drift_ratio"]["dispersion"] == pytest.approx([np.std(np.log([0.01, 0.04]), ddof=1)])
    assert stats_["floor_acceleration"]["dispersion"][0] == pytest.approx(0.0)
    assert "isolator_displacement" not in stats_
