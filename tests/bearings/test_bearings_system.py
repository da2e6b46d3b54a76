"""Isolation systems: group sums, property modification factors and plane checks.

Sources
-------
- ASCE/SEI 7-16 §17.2.8.4 (from memory): lambda_max = (1 + 0.75 (lambda_ae,max - 1))
  lambda_test,max lambda_spec,max; lambda_min = (1 - 0.75 (1 - lambda_ae,min))
  lambda_test,min lambda_spec,min; default bounds for unqualified bearings 0.6 and 1.8.
- Naeim & Kelly (1999): bearings in parallel add stiffness; the plane's damping is
  sum(EDC_i)/(2 pi K_eff D^2).
- ASCE/SEI 7-16 §17.2.4.4: restoring force F(D) - F(D/2) >= 0.025 W (for pendulums D >= 0.05 R).
- Values written as "hand arithmetic" are derived from these formulas.
"""

import json
import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.bearings import (
    BearingGroup,
    Bilinear,
    CombinedBackbone,
    DoubleConcave,
    FrictionPendulum,
    HighDampingRubber,
    IsolationSystem,
    LeadRubber,
    MultiLinear,
    PropertyBound,
    PropertyFactors,
)

FP = FrictionPendulum(2.235, 0.06, displacement_capacity=0.5)
LRB = LeadRubber(0.8, 0.2, 0.01, 20, 400.0)
HDR = HighDampingRubber(0.8, 0.01, 20)
NOMINAL = PropertyFactors.nominal_only()


def test_bounds_formula_from_component_factors():
    # Hand arithmetic with the ASCE 7-16 §17.2.8.4 form (from memory):
    # upper (1 + 0.75*0.2) * 1.1 * 1.15 = 1.454750; lower (1 - 0.75*0.1) * 0.9 * 0.85 = 0.707625.
    bound = PropertyBound.from_factors(aging_max=1.2, aging_min=0.9, test_max=1.1, test_min=0.9,
                                       spec_max=1.15, spec_min=0.85)
    assert bound.upper == pytest.approx(1.454750)
    assert bound.lower == pytest.approx(0.707625)
    # essential facilities count all of the aging factor (adjustment 1.0)
    full = PropertyBound.from_factors(aging_max=1.2, aging_min=0.9, adjustment=1.0)
    assert (full.lower, full.upper) == pytest.approx((0.9, 1.2))


def test_friction_pendulum_system_is_one_bilinear_with_factored_friction():
    # K_d = sum W_i/R, Q_d = mu sum W_i (Zayas et al.); friction factored 0.6/1.8 by default
    # (unqualified bearings, from memory); K_d is geometry and is not factored.
    system = IsolationSystem([BearingGroup(FP, 8, 1000.0), BearingGroup(FP, 4, 1500.0)])
    assert system.weight == pytest.approx(14000.0)
    sets = system.property_sets()
    for case, factor in (("lower", 0.6), ("nominal", 1.0), ("upper", 1.8)):
        b = sets[case]
        assert isinstance(b, Bilinear)
        assert b.post_yield_stiffness == pytest.approx(14000.0 / 2.235)
        assert b.characteristic_strength == pytest.approx(0.06 * factor * 14000.0)
        assert b.yield_displacement == pytest.approx(0.0005)


def test_property_sets_with_weight_scale_the_slider_loads():
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0)], NOMINAL)
    b = system.property_sets(weight=12000.0)["nominal"]
    assert b.characteristic_strength == pytest.approx(0.06 * 12000.0)
    assert b.post_yield_stiffness == pytest.approx(12000.0 / 2.235)


def test_mixed_system_adds_stiffness_and_energy():
    # Parallel bearings: forces and loop energies add (Naeim & Kelly 1999).
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0), BearingGroup(LRB, 4, 1500.0)], NOMINAL)
    plane = system.property_sets()["nominal"]
    assert isinstance(plane, MultiLinear)
    d = 0.3
    fp_b, lrb_b = FP.bilinear(1000.0), LRB.bilinear()
    k = 10 * fp_b.effective_stiffness(d) + 4 * lrb_b.effective_stiffness(d)
    # hand arithmetic for the pendulum part: 10 (1000/2.235 + 60/0.3) = 6474.27 kN/m
    assert 10 * fp_b.effective_stiffness(d) == pytest.approx(6474.27, abs=0.01)
    edc = 10 * 4 * 60.0 * (d - 0.0005) + 4 * 4 * 314.1593 * (d - lrb_b.yield_displacement)
    assert plane.effective_stiffness(d) == pytest.approx(k)
    assert plane.effective_damping(d) == pytest.approx(edc / (2 * math.pi * k * d**2), rel=1e-6)
    assert system.effective_stiffness(d) == pytest.approx(k)


def test_rubber_factors_scale_stiffness_and_strength_separately():
    factors = PropertyFactors(stiffness=(0.9, 1.3), strength=(0.8, 1.5))
    plane = IsolationSystem([BearingGroup(LRB, 6, 1800.0)], factors).property_sets()
    base = LRB.bilinear()
    assert plane["upper"].post_yield_stiffness == pytest.approx(6 * 1.3 * base.post_yield_stiffness)
    assert plane["upper"].characteristic_strength == pytest.approx(6 * 1.5 * base.characteristic_strength)
    assert plane["lower"].elastic_stiffness == pytest.approx(6 * 0.9 * base.elastic_stiffness)
    assert plane["lower"].characteristic_strength == pytest.approx(6 * 0.8 * base.characteristic_strength)


def test_group_factors_override_the_system_factors():
    own = PropertyFactors(friction=(0.9, 1.1))
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0, factors=own)])  # system default: unqualified
    # hand arithmetic: mu 0.06 x group upper factor 1.1 = 0.066, times 10 x 1000 kN
    assert system.property_sets()["upper"].characteristic_strength == pytest.approx(0.066 * 10000.0)


def test_high_damping_group_gives_a_combined_backbone():
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0), BearingGroup(HDR, 4, 1500.0)], NOMINAL)
    plane = system.property_sets()["nominal"]
    assert isinstance(plane, CombinedBackbone)
    d = 0.25
    k_fp = 10 * FP.bilinear(1000.0).effective_stiffness(d)
    k_hdr = 4 * HDR.effective_stiffness(d)
    edc = (10 * FP.bilinear(1000.0).loop_energy(d)
           + 4 * 2 * math.pi * HDR.effective_damping(d) * HDR.effective_stiffness(d) * d**2)
    assert plane.effective_stiffness(d) == pytest.approx(k_fp + k_hdr)
    assert plane.effective_damping(d) == pytest.approx(edc / (2 * math.pi * (k_fp + k_hdr) * d**2))


def test_double_concave_unequal_friction_group_stays_multilinear():
    dc = DoubleConcave(2.0, 0.03, 2.0, 0.06)
    system = IsolationSystem([BearingGroup(dc, 6, 1000.0)], NOMINAL)
    plane = system.property_sets()["nominal"]
    assert isinstance(plane, MultiLinear)
    assert plane.force(0.4) == pytest.approx(6 * dc.backbone(1000.0).force(0.4))
    assert system.is_sliding


def test_plane_restoring_force_check_fails_below_five_percent_of_radius():
    # For pendulums the check reads D >= 0.05 R = 0.11175 m (ASCE 7-16 §17.2.4.4).
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0)])
    short = {c.name: c for c in system.checks(0.10)}
    long = {c.name: c for c in system.checks(0.30)}
    key = next(k for k in short if k.startswith("restoring force (isolation plane"))
    assert not short[key].passed
    key = next(k for k in long if k.startswith("restoring force (isolation plane"))
    assert long[key].passed
    assert long[key].value == pytest.approx(0.30 / (2 * 2.235), rel=1e-9)


def test_system_checks_are_labelled_per_group():
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0, name="perimeter"),
                              BearingGroup(LRB, 4, 1500.0, axial_load_min=-100.0)])
    checks = system.checks(0.55)
    names = [c.name for c in checks]
    assert "perimeter: displacement capacity" in names
    assert "group 2 (LeadRubber): shear strain" in names
    capacity = next(c for c in checks if c.name == "perimeter: displacement capacity")
    assert not capacity.passed  # 0.55 > 0.5
    json.dumps([c.to_dict() for c in checks], allow_nan=False)


def test_summary_properties_and_to_dict():
    system = IsolationSystem([BearingGroup(FP, 10, 1000.0),
                              BearingGroup(FrictionPendulum(3.0, 0.05, displacement_capacity=0.4), 2, 800.0),
                              BearingGroup(LRB, 4, 1500.0)])
    assert system.weight == pytest.approx(10000.0 + 1600.0 + 6000.0)
    assert system.displacement_capacity == pytest.approx(0.4)
    assert system.is_sliding
    assert not IsolationSystem([BearingGroup(LRB, 4, 1500.0)]).is_sliding
    assert IsolationSystem([BearingGroup(LRB, 4, 1500.0)]).displacement_capacity is None
    data = json.loads(json.dumps(system.to_dict(), allow_nan=False))
    assert data["factors"]["friction"] == {"lower": 0.6, "upper": 1.8}


@settings(max_examples=50, deadline=None)
@given(st.floats(1.0, 5.0), st.floats(0.02, 0.12), st.floats(0.5, 1.0), st.floats(1.0, 2.0),
       st.floats(0.02, 0.8))
def test_bounds_order_stiffness_and_strength(radius, mu, lower, upper, d):
    factors = PropertyFactors(stiffness=(lower, upper), strength=(lower, upper), friction=(lower, upper))
    system = IsolationSystem([BearingGroup(FrictionPendulum(radius, mu), 6, 900.0),
                              BearingGroup(LRB, 2, 1200.0)], factors)
    sets = system.property_sets()
    k = [sets[c].effective_stiffness(d) for c in ("lower", "nominal", "upper")]
    assert k[0] <= k[1] <= k[2]
    assert all(math.isfinite(x) for x in k)


@pytest.mark.parametrize("make, field", [
    (lambda: BearingGroup(FP, 0, 1000.0), "count"),
    (lambda: BearingGroup(FP, 2.5, 1000.0), "count"),
    (lambda: BearingGroup(FP, 4, -1000.0), "axial_load"),
    (lambda: BearingGroup(FP, 4, float("nan")), "axial_load"),
    (lambda: BearingGroup("slider", 4, 1000.0), "bearing"),
    (lambda: BearingGroup(FP, 4, 1000.0, rotation=-0.1), "rotation"),
    (lambda: BearingGroup(FP, 4, 1000.0, factors=1.2), "factors"),
    (lambda: IsolationSystem([]), "groups"),
    (lambda: IsolationSystem([FP]), r"groups\[0\]"),
    (lambda: IsolationSystem([BearingGroup(FP, 4, 1000.0)], factors="code"), "factors"),
    (lambda: PropertyBound(1.2, 1.5), "lower"),
    (lambda: PropertyBound(0.8, 0.9), "upper"),
    (lambda: PropertyBound(0.0, 1.5), "lower"),
    (lambda: PropertyBound.from_factors(aging_max=0.9), "aging_max"),
    (lambda: PropertyBound.from_factors(test_min=1.1), "test_min"),
    (lambda: PropertyBound.from_factors(adjustment=1.5), "adjustment"),
    (lambda: PropertyBound().factor("middle"), "case"),
    (lambda: PropertyFactors(stiffness=1.5), "stiffness"),
    (lambda: IsolationSystem([BearingGroup(FP, 4, 1000.0)]).property_sets(weight=-1.0), "weight"),
    (lambda: IsolationSystem([BearingGroup(FP, 4, 1000.0)]).checks(float("nan")), "displacement"),
])
def test_invalid_input_names_the_field(make, field):
    with pytest.raises(ValueError, match=rf"^{field} = "):
        make()
