"""Isolator laws of the response-history engine.

Sources
-------
- Bouc-Wen hysteretic variable, Wen (1976) naming:
  D_y z' = u' - beta |u'| |z| z - gamma u' z^2 (n = 2, beta + gamma = 1);
  reference: scipy.integrate.solve_ivp on that equation under an imposed
  displacement history.
- Parallel elastic-perfectly-plastic elements (Iwan 1966; Masing rule): each
  element of stiffness k and strength f dissipates 4 f (D - f/k) per cycle of
  amplitude D (Naeim & Kelly 1999, EDC of a bilinear loop, per element).
- Double concave sliders with unequal friction: two sliding regimes
  (Fenz & Constantinou 2006); the engine integrates the backbone the bearing
  object gives, so the check is the Iwan loop area above.
"""

import math

import numpy as np
import pytest
import scipy.integrate
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation import GRAVITY
from isolation.bearings import Bilinear, DoubleConcave, FrictionPendulum, LeadRubber, MultiLinear
from isolation.dynamics.history import BoucWen, run, run_cases
from isolation.dynamics.isolators import imposed_force
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding


@pytest.mark.parametrize("beta", [0.5, 0.3, 0.8, 1.0])
def test_bouc_wen_closed_form_update_matches_ode(beta):
    # Reference: solve_ivp on Wen's equation with the displacement imposed.
    plane = Bilinear(20000.0, 1000.0, 100.0)
    dy = plane.yield_displacement
    law = BoucWen(plane, beta=beta)
    t = np.linspace(0.0, 2.0, 4001)
    u = 0.03 * np.sin(2 * math.pi * t) + 0.01 * np.sin(7 * math.pi * t)
    du_dt = 0.06 * math.pi * np.cos(2 * math.pi * t) + 0.07 * math.pi * np.cos(7 * math.pi * t)
    gamma = 1.0 - beta

    def rhs(time, z):
        v = np.interp(time, t, du_dt)
        return [(v - beta * abs(v) * abs(z[0]) * z[0] - gamma * v * z[0] ** 2) / dy]

    ref = scipy.integrate.solve_ivp(rhs, (0, 2.0), [0.0], t_eval=t, rtol=1e-10, atol=1e-12, method="LSODA")
    expected = plane.post_yield_stiffness * u + plane.characteristic_strength * ref.y[0]
    force = imposed_force(law, u)
    # the engine assumes u linear within each step; the ODE follows the exact velocity
    np.testing.assert_allclose(force, expected, atol=2e-3 * plane.characteristic_strength)


def test_multilinear_loop_area_is_sum_of_element_areas():
    # Iwan (1966) / Naeim & Kelly: sum over elements of 4 f (D - f/k).
    plane = MultiLinear(500.0, (40000.0, 5000.0), (60.0, 150.0))
    d = 0.2
    t = np.linspace(0.0, 3.0, 30001)
    u = d * np.sin(2 * math.pi * t)
    f = imposed_force(plane, u)
    second = (t >= 1.0) & (t <= 2.0)
    expected = sum(4 * s * (d - s / k) for k, s in [(40000.0, 60.0), (5000.0, 150.0)])
    assert np.trapezoid(f[second], u[second]) == pytest.approx(expected, rel=1e-3)


def test_double_concave_with_unequal_friction_loop_area():
    # Fenz & Constantinou (2006) regimes through the bearing's backbone; Iwan loop area.
    bearing = DoubleConcave(radius_1=2.0, friction_1=0.03, radius_2=2.0, friction_2=0.06)
    weight = 2000.0
    backbone = bearing.backbone(weight)
    _, ks, fs = backbone.elements()
    assert len(ks) == 2
    d = 0.3
    t = np.linspace(0.0, 3.0, 30001)
    u = d * np.sin(2 * math.pi * t)
    f = imposed_force(bearing, u, weight=weight)
    second = (t >= 1.0) & (t <= 2.0)
    expected = sum(4 * s * (d - s / k) for k, s in zip(ks, fs, strict=True))
    assert np.trapezoid(f[second], u[second]) == pytest.approx(expected, rel=1e-3)


def building():
    return ShearBuilding.from_period(0.4, [300.0] * 3, [3.2] * 3)


def motion(dt=0.005, seconds=8.0):
    t = np.arange(0.0, seconds, dt)
    return np.vstack([0.4 * np.sin(2 * math.pi * t / 1.3) * np.exp(-0.3 * t),
                      0.3 * np.sin(2 * math.pi * t / 0.7) * np.exp(-0.2 * t)])


def test_split_bilinear_takes_the_multi_element_path_and_agrees():
    # Internal consistency: two identical halves in parallel are the same bilinear
    # (exercises the general return map against the one-element closed form).
    plane = Bilinear(60000.0, 4000.0, 250.0)
    half = MultiLinear(4000.0, (28000.0, 28000.0), (125.0, 125.0))
    acc = motion()
    out = run_cases(building(), 400.0, {"one": plane, "two": half}, acc, 0.005, include_fixed=False)
    np.testing.assert_allclose(out["two"].isolator_displacement, out["one"].isolator_displacement,
                               atol=1e-9)


def test_mixed_isolator_families_in_one_call_match_separate_calls():
    # Internal consistency: columns grouped by law family give the same answers.
    acc = motion()
    slider = FrictionPendulum(2.0, 0.05)
    rubber = Bilinear(60000.0, 4000.0, 250.0)
    together = run_cases(building(), 400.0, {"slider": slider, "rubber": rubber}, acc, 0.005)
    assert list(together) == ["fixed", "slider", "rubber"]
    alone = run(IsolatedBuilding(building(), 400.0, slider), acc, 0.005)
    np.testing.assert_allclose(together["slider"].isolator_displacement, alone.isolator_displacement, atol=1e-8)


def test_lead_rubber_bearing_object_is_accepted():
    bearing = LeadRubber(outer_diameter=0.7, lead_diameter=0.14, layer_thickness=0.01, layers=18,
                         shear_modulus=450.0)
    acc = motion()
    a = run(IsolatedBuilding(building(), 400.0, bearing), acc, 0.005)
    b = run(IsolatedBuilding(building(), 400.0, bearing.bilinear()), acc, 0.005)
    np.testing.assert_array_equal(a.isolator_displacement, b.isolator_displacement)


def test_supplemental_damper_dissipates_and_reduces_displacement():
    # Physics check (Chopra, viscous damping): a linear damper adds c v^2 dissipation.
    acc = motion()
    slider = FrictionPendulum(2.0, 0.04)
    plain = run(IsolatedBuilding(building(), 400.0, slider), acc, 0.005)
    damped = run(IsolatedBuilding(building(), 400.0, slider, supplemental_damping=800.0), acc, 0.005)
    assert np.all(damped.peaks()["isolator_displacement"] < plain.peaks()["isolator_displacement"])
    v = np.gradient(damped.isolator_displacement, 0.005, axis=1)
    np.testing.assert_allclose(damped.damper_force, 800.0 * v, atol=0.05 * np.abs(damped.damper_force).max())
    assert np.all(damped.balance_error < 0.01)  # closes within 1 % (issue 4; Uang & Bertero 1990)


def test_rigid_fixed_base_building_moves_with_the_ground():
    acc = motion()
    out = run(ShearBuilding.rigid_block(500.0), acc, 0.005)
    np.testing.assert_array_equal(out.floor_acceleration[..., 0], acc)
    assert np.all(out.drift == 0.0)
    np.testing.assert_allclose(out.base_shear, -500.0 * acc * GRAVITY)


def test_bouc_wen_refuses_bad_parameters():
    with pytest.raises(ValueError, match="exponent = 3.0 is not allowed"):
        BoucWen(Bilinear(1e4, 1e3, 10.0), exponent=3)
    with pytest.raises(ValueError, match="beta = 0.0 is not allowed"):
        BoucWen(Bilinear(1e4, 1e3, 10.0), beta=0.0)
    with pytest.raises(ValueError, match="characteristic_strength"):
        BoucWen(Bilinear(1e4, 1e3, 0.0))


@settings(max_examples=15, deadline=None)
@given(strength=st.floats(0.02, 0.15), period=st.floats(1.5, 4.0), pga=st.floats(0.05, 0.6),
       smooth=st.booleans())
def test_energy_balance_closes_for_any_bilinear(strength, period, pga, smooth):
    # Uang & Bertero (1990) balance; with Newmark's average acceleration the trapezoid
    # accumulation closes to the equilibrium tolerance (Chopra, Dynamics of Structures, from memory).
    superstructure = ShearBuilding.from_period(0.3, [200.0, 200.0], [3.0, 3.0])
    total = superstructure.total_mass + 200.0
    kd = total * (2 * math.pi / period) ** 2
    plane = Bilinear(10 * kd, kd, strength * total * GRAVITY)
    isolator = BoucWen(plane) if smooth else plane
    t = np.arange(0.0, 6.0, 0.005)
    acc = pga * np.sin(2 * math.pi * t / 0.9) * np.sin(math.pi * t / 6.0) ** 2
    result = run(IsolatedBuilding(superstructure, 200.0, isolator), acc, 0.005)
    assert result.balance_error[0] < 1e-6
    assert result.energy["hysteretic"][0, -1] >= -1e-9 * result.energy["input"][0].max()
