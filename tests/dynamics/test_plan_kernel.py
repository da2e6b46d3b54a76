"""Compiled plan loop: the bearings' consistent tangent and the storey shear peaks.

Sources
-------
* Consistent tangent: the derivative of the closed-form bearing update with respect to the step,
  checked against central finite differences of the same update (derived; a Newton step with a
  wrong tangent would still converge, only slower, so the tangent is checked on its own).
* Bilinear spring with kinematic hardening (stiffness k, yield shear V_y, hardening alpha): its force
  stays between the bounding lines alpha k d +- (1 - alpha) V_y, and at the largest drift, once beyond
  the yield drift V_y / k, it is on the bounding line, so the peak |force| is
  alpha k d_max + (1 - alpha) V_y (derived from the law; Chopra, Dynamics of Structures, 4th ed.,
  §7.1 for the bilinear force-deformation relation; from memory). An elastic spring's peak force is
  k d_max.
"""

from __future__ import annotations

import numpy as np
import pytest

from isolation.bearings import FrictionPendulum, LeadRubber
from isolation.dynamics import plan_kernel_bearings as kb
from isolation.dynamics.plan_bearings import radial_return, smooth_update
from isolation.dynamics.plan_history import _integrate, run_plan
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding, bearing_grid

MASSES, STIFFNESSES, HEIGHTS = [600.0] * 3, [9.0e5] * 3, [3.5] * 3
YIELD = [2500.0, 2000.0, 1200.0]
YIELD_Y = [2500.0, 2000.0, 1.0e5]  # the top storey stays elastic in y
PLAN = (24.0, 16.0)
DT = 0.005

# z0 inside the unit circle; steps loading, unloading part of the way and unloading all the way
CASES = [((0.3, -0.2), (2e-4, 1e-4)), ((0.9, 0.1), (-3e-4, 2e-4)), ((-0.7, 0.5), (1e-3, -4e-4)),
         ((0.0, 0.0), (5e-5, 5e-5)), ((0.6, 0.6), (-1e-5, -2e-6)), ((0.95, -0.3), (4e-3, 0.0))]


@pytest.mark.parametrize("z0, step", CASES)
def test_smooth_update_matches_the_array_law(z0, step):
    # Source: the same closed form as isolation.dynamics.plan_bearings.smooth_update (derived).
    inv_y = 1.0 / 5e-4
    ours = kb.smooth_python(z0[0], z0[1], step[0], step[1], inv_y)[:2]
    theirs = smooth_update(np.array(z0), np.array(step), np.array(inv_y))
    np.testing.assert_allclose(ours, theirs, atol=1e-14)


@pytest.mark.parametrize("z0, step", CASES)
def test_smooth_tangent_is_the_derivative_of_the_update(z0, step):
    # Source: central finite differences of the update (derived).
    inv_y = 1.0 / 5e-4
    tangent = np.array(kb.smooth_python(z0[0], z0[1], step[0], step[1], inv_y)[2:]).reshape(2, 2)
    h = 1e-9
    numeric = np.empty((2, 2))
    for j in range(2):
        plus, minus = np.array(step, dtype=float), np.array(step, dtype=float)
        plus[j] += h
        minus[j] -= h
        numeric[:, j] = (np.array(kb.smooth_python(*z0, *plus, inv_y)[:2])
                         - np.array(kb.smooth_python(*z0, *minus, inv_y)[:2])) / (2 * h)
    np.testing.assert_allclose(tangent, numeric, rtol=1e-5, atol=1e-5 * inv_y)


def _bearing_arrays(kind):
    """One column of three bearings: a slider with rate-dependent friction, or rubber with two elements."""
    pos = np.array([[4.0, -2.0], [-3.0, 1.0], [0.5, 3.0]])
    state = np.zeros((3, 6))
    state[:, :2] = [[0.01, -0.004], [0.012, -0.002], [0.009, -0.003]]
    state[:, 2:4] = [[0.2, -0.1], [0.25, -0.05], [0.15, -0.08]]
    state[:, 4:] = [[0.5, -0.3], [0.2, 0.1], [-0.4, 0.4]]
    law = np.zeros((1, 3, 6))
    strength = np.zeros((1, 3, 2))
    inv_ey = np.zeros((1, 3, 2))
    p = np.zeros((3, 2, 2))
    if kind == "slider":
        law[0, :] = [1.0, 1 / 2.5, 0.06, 0.02, 30.0, 1 / 5e-4]
    else:
        law[0, :, 1] = 800.0
        strength[0, :] = [60.0, 25.0]
        inv_ey[0, :] = [1 / 0.01, 1 / 0.002]
        p[:] = [[0.9, 0.3], [0.2, -0.5]]
    return pos, state, p, np.array([900.0, 1100.0, 1000.0]), law, strength, inv_ey


@pytest.mark.parametrize("kind", ["slider", "rubber"])
def test_base_jacobian_is_the_derivative_of_the_resultant(kind):
    # Source: central finite differences of the resultant force and moment (derived).
    pos, state, p, axial, law, strength, inv_ey = _bearing_arrays(kind)
    work = (np.zeros((3, 6)), np.zeros((3, 2, 2)), np.zeros((3, 3)))

    def resultant(ub):
        return np.array(kb.bearing_trial_python(0, ub, pos, state, p, axial, law, strength, inv_ey, 400.0, *work))

    ub = np.array([0.0112, -0.0031, 2e-4])
    resultant(ub)
    jac = work[2].copy()
    numeric = np.empty((3, 3))
    for j, h in enumerate((1e-9, 1e-9, 1e-10)):
        plus, minus = ub.copy(), ub.copy()
        plus[j] += h
        minus[j] -= h
        numeric[:, j] = (resultant(plus) - resultant(minus)) / (2 * h)
    np.testing.assert_allclose(jac, numeric, rtol=1e-5, atol=1e-6 * np.abs(numeric).max())


def test_element_forces_match_the_radial_return():
    # Source: the same return map as isolation.dynamics.plan_bearings.radial_return (derived).
    pos, state, p, axial, law, strength, inv_ey = _bearing_arrays("rubber")
    trial, p_t, jac = np.zeros((3, 6)), np.zeros((3, 2, 2)), np.zeros((3, 3))
    ub = np.array([0.03, -0.01, 1e-3])
    kb.bearing_trial_python(0, ub, pos, state, p, axial, law, strength, inv_ey, 400.0, trial, p_t, jac)
    d = np.stack([ub[0] - pos[:, 1] * ub[2], ub[1] + pos[:, 0] * ub[2]], axis=1)
    expected = radial_return(p[None], (d - state[:, :2])[None], inv_ey)[0]
    np.testing.assert_allclose(p_t, expected, atol=1e-14)


def _motion(steps=3000, seed=0, scale=2.0):
    rng = np.random.default_rng(seed)
    t = np.arange(steps) * DT
    raw = np.convolve(rng.normal(0.0, 0.25, steps), np.ones(8) / 8, mode="same")
    return raw * np.sin(np.pi * t / t[-1]) ** 2 * scale


def _pair(scale=2.0):
    return np.stack([_motion(scale=scale), 0.8 * _motion(seed=3, scale=scale)])[None]


@pytest.mark.parametrize("hardening", [0.0, 0.05])
@pytest.mark.parametrize("compiled", [True, False], ids=["compiled", "arrays"])
def test_storey_shear_peak_follows_the_bilinear_bounds(hardening, compiled):
    # Source: bilinear law with kinematic hardening (module notes): peak |V| = alpha k d_max + (1 - alpha) V_y
    # where the storey yielded, k d_max where it stayed elastic.
    from isolation.dynamics import plan_kernel

    if compiled and not plan_kernel.available:
        pytest.skip("numba is not installed")
    superstructure = PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN, rigidity_offset=(1.0, 0.5),
                                       yield_shears_x=YIELD, yield_shears_y=YIELD_Y, hardening=hardening)
    building = PlanIsolatedBuilding(superstructure, 700.0, RUBBER_WEAK, bearing_grid(PLAN, (3, 3)))
    m, k, c = building.matrices()
    from isolation.dynamics.plan_history import _result

    state = _integrate([building], building.superstructure, m, k, c, _pair(4.0) * 9.80665, DT, None,
                       compiled=compiled)
    result = _result(state, 0, 1, True, building.superstructure, building, DT)
    stiffness = np.column_stack([STIFFNESSES, STIFFNESSES])
    strength = np.column_stack([YIELD, YIELD_Y])
    drift = result.storey_drift_peak[0]
    yielded = drift > strength / stiffness
    assert yielded.any() and (~yielded).any()  # both branches are checked
    expected = np.where(yielded, hardening * stiffness * drift + (1 - hardening) * strength, stiffness * drift)
    np.testing.assert_allclose(result.storey_shear_peak[0], expected, rtol=1e-7)
    ratio = result.shear_strength_ratio[0]
    assert np.all(ratio[yielded] >= 1.0 - 1e-9) and np.all(ratio[~yielded] < 1.0)


RUBBER_WEAK = LeadRubber(0.8, 0.18, 0.01, 18, 1200.0)


def test_elastic_storey_shear_is_k_times_drift_and_ratio_is_undefined():
    # Source: elastic spring (derived): V = k d; no strength, no ratio.
    superstructure = PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN)
    building = PlanIsolatedBuilding(superstructure, 700.0, FrictionPendulum(2.2, 0.06), bearing_grid(PLAN, (3, 2)))
    result = run_plan(building, _pair()[0], DT)
    np.testing.assert_allclose(result.storey_shear_peak, 9.0e5 * result.storey_drift_peak, rtol=1e-12)
    assert np.isnan(result.shear_strength_ratio).all()
