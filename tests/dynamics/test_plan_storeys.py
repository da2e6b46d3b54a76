"""Yielding storeys of the plan model (x and y springs at the centre of rigidity, bilinear, kinematic hardening).

Sources
-------
* Biggs, J. M. (1964). Introduction to Structural Dynamics. McGraw-Hill, §2.6 (elasto-plastic
  single-degree system under a constant force of infinite duration applied suddenly): the peak
  displacement over the yield displacement is mu = 1 / (2 (1 - F0/R_m)) for F0/R_m >= 1/2 (from
  memory; the same follows from work and energy at the peak, F0 x_m = R_m (x_m - x_y / 2), derived).
  Chopra, Dynamics of Structures, 4th ed., ch. 7 treats the same elastoplastic system.
* Loop area of bilinear kinematic hardening cycled between +-D: the elastic-plastic element's
  parallelogram, 4 (1 - alpha) V_y (D - D_y); the hardening spring encloses no area (derived; the
  hysteretic energy of Chopra, 4th ed., §7.9; from memory).
* The planar yielding engine (isolation.history with ShearBuilding(yield_shears=...)) integrates the
  same equations; a symmetric plan under one component must reproduce it (derived).
* Newmark average acceleration with trapezoidal work sums closes the energy balance to round-off
  (Chopra, 4th ed., §5.4 and §7.9; from memory); < 1 % asked.
"""

from __future__ import annotations

import numpy as np
import pytest

from isolation import GRAVITY
from isolation.bearings import FrictionPendulum, LeadRubber
from isolation.dynamics.history import run
from isolation.dynamics.plan_history import _integrate, run_plan
from isolation.dynamics.plan_storeys import storey_loop
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding, bearing_grid
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding

MASSES, STIFFNESSES, HEIGHTS = [600.0] * 3, [9.0e5] * 3, [3.5] * 3
YIELD = [2500.0, 2000.0, 1200.0]
PLAN = (24.0, 16.0)
DT = 0.005
RUBBER = LeadRubber(0.8, 0.18, 0.01, 18, 400.0)


def _motion(steps=3000, seed=0, scale=2.0):
    rng = np.random.default_rng(seed)
    t = np.arange(steps) * DT
    raw = np.convolve(rng.normal(0.0, 0.25, steps), np.ones(8) / 8, mode="same")
    return raw * np.sin(np.pi * t / t[-1]) ** 2 * scale


def _yielding(p_delta=False, offset=(0.0, 0.0)):
    return PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN, rigidity_offset=offset,
                             yield_shears_x=YIELD, yield_shears_y=YIELD, hardening=0.05, p_delta=p_delta)


@pytest.mark.parametrize("p_delta", [False, True], ids=["no_p_delta", "p_delta"])
def test_unidirectional_input_equals_the_planar_yielding_engine(p_delta):
    motion = _motion()
    planar_storeys = ShearBuilding(MASSES, STIFFNESSES, HEIGHTS, yield_shears=YIELD, hardening=0.05, p_delta=p_delta)
    # fixed base
    plan = run_plan(_yielding(p_delta), np.stack([3 * motion, 0 * motion])[None], DT)
    planar = run(planar_storeys, 3 * motion, DT)
    assert np.nanmin(planar.ductility) > 2.0  # the storeys do yield
    np.testing.assert_allclose(plan.ductility[:, :, 0], planar.ductility, rtol=1e-8)
    np.testing.assert_allclose(plan.residual_drift[:, :, 0], planar.residual_drift, rtol=1e-6, atol=1e-12)
    ours = plan.floor_displacement[0, :, 0]
    theirs = np.asarray(planar.floor_displacement)[0]
    theirs = theirs if theirs.shape == ours.shape else theirs.T
    np.testing.assert_allclose(ours, theirs, atol=1e-8 * np.abs(theirs).max())
    # isolated
    building = PlanIsolatedBuilding(_yielding(p_delta), 700.0, RUBBER, bearing_grid(PLAN, (4, 3)))
    plan = run_plan(building, np.stack([motion, 0 * motion])[None], DT)
    planar = run(IsolatedBuilding(planar_storeys, 700.0, RUBBER.bilinear().times(building.count)), motion, DT)
    assert np.nanmin(planar.ductility) > 1.0
    np.testing.assert_allclose(plan.ductility[:, :, 0], planar.ductility, rtol=1e-7)
    scale = np.abs(planar.isolator_displacement).max()
    np.testing.assert_allclose(plan.isolator_displacement[:, 0], planar.isolator_displacement, atol=1e-8 * scale)
    assert np.abs(plan.base_rotation).max() < 1e-15
    assert np.all(plan.ductility[:, :, 1] == 0.0)  # y springs have strengths and no drift


@pytest.mark.parametrize("direction", [0, 1], ids=["x", "y"])
def test_elastoplastic_step_load_against_the_closed_form(direction):
    # Biggs (1964) §2.6: mu = 1 / (2 (1 - F0/R_m)); F0/R_m = 0.75 gives mu = 2, and the work done by
    # yielding at the peak is R_m (x_m - x_y) = R_m x_y (mu - 1); after the peak the system oscillates
    # elastically (its lowest force 2 F0 - R_m > -R_m), so nothing more is dissipated.
    mass, period, strength = 100.0, 0.5, 100.0
    k = mass * (2 * np.pi / period) ** 2
    building = PlanShearBuilding([mass], [k], [k], [3.0], plan=(10.0, 10.0), damping=0.0,
                                 yield_shears_x=[strength], yield_shears_y=[strength])
    dt, steps = 0.0002, 6001
    ground = np.zeros((1, 2, steps))
    ground[0, direction] = -0.75 * strength / mass / GRAVITY  # constant from t = 0: a suddenly applied force
    result = run_plan(building, ground, dt)
    assert result.ductility[0, 0, direction] == pytest.approx(2.0, rel=2e-4)
    x_y = strength / k
    assert result.hysteretic_energy[0] == pytest.approx(strength * x_y * (2.0 - 1.0), rel=2e-3)
    assert result.storey_drift_peak[0, 0, 1 - direction] == 0.0
    assert np.abs(result.floor_displacement[:, :, 2]).max() == 0.0
    assert result.energy_error.max() < 1e-8


@pytest.mark.parametrize("direction", [0, 1], ids=["x", "y"])
def test_hysteretic_loop_area_of_a_cyclic_push(direction):
    # Loop area 4 (1 - alpha) V_y (D - D_y) for a cycle between +D and -D (derived, module sources).
    building = _yielding()
    k, strength, alpha = STIFFNESSES[1], YIELD[1], 0.05
    amplitude = 3.0 * strength / k
    leg = np.linspace(0.0, 1.0, 4001)
    path = np.concatenate([amplitude * leg, amplitude * (1 - 2 * leg[1:]), amplitude * (-1 + 2 * leg[1:])])
    force = storey_loop(building, path, storey=1, direction=direction)
    cycle = slice(4000, None)  # from +D round to +D
    area = np.sum(0.5 * (force[cycle][1:] + force[cycle][:-1]) * np.diff(path[cycle]))
    # trapezoidal sums are exact on the straight pieces; the legs crossing a yield point err by O(step^2)
    assert area == pytest.approx(4 * (1 - alpha) * strength * (amplitude - strength / k), rel=1e-5)
    assert force.max() == pytest.approx(strength + alpha * k * (amplitude - strength / k), rel=1e-12)


def test_symmetric_yielding_plan_gives_no_rotation():
    # Symmetry (derived): centre of rigidity at the centre of mass, symmetric grid, rubber bearings.
    building = PlanIsolatedBuilding(_yielding(), 700.0, RUBBER, bearing_grid(PLAN, (4, 3)))
    result = run_plan(building, np.stack([_motion(), _motion(seed=3)])[None], DT)
    assert result.ductility[0, 0].min() > 2.0  # first storey yields in x and in y
    # round-off only (rotation of 1e-15 rad moves a corner by 1e-14 m)
    assert np.abs(result.base_rotation).max() < 1e-15
    assert np.abs(result.floor_displacement[:, :, 2]).max() < 1e-15


@pytest.mark.parametrize("bearing", [RUBBER, FrictionPendulum(2.2, 0.06, friction_slow=0.04)],
                         ids=["lead_rubber", "friction_pendulum"])
def test_energy_balance_closes_with_yielding_storeys_and_torsion(bearing):
    motion = _motion()
    building = PlanIsolatedBuilding(_yielding(p_delta=True, offset=(1.0, -0.6)), 700.0, bearing,
                                    bearing_grid(PLAN, (4, 3)), mass_offset=(0.8, 0.5))
    result = run_plan(building, np.stack([motion, 0.8 * motion[::-1]])[None], DT)
    assert np.nanmax(result.ductility) > 1.0
    assert result.hysteretic_energy[0] > 0.0
    assert result.energy_error.max() < 0.01
    fixed = run_plan(_yielding(p_delta=True, offset=(1.0, -0.6)), np.stack([3 * motion, 2 * motion[::-1]])[None], DT)
    assert np.nanmax(fixed.ductility) > 1.0
    assert fixed.energy_error.max() < 0.01


def test_compiled_and_array_loops_agree_with_yielding_storeys():
    # Same equations (derived); each column converges on its own in the compiled loop.
    from isolation.dynamics import plan_kernel

    if not plan_kernel.available:
        pytest.skip("numba is not installed: only the array loop exists")
    motion = _motion(steps=1500)
    pair = np.stack([np.stack([motion, motion[::-1]]), np.stack([0.5 * motion, motion])]) * GRAVITY
    building = PlanIsolatedBuilding(_yielding(p_delta=True, offset=(0.7, 0.0)), 700.0,
                                    FrictionPendulum(2.2, 0.06), bearing_grid(PLAN, (4, 3)), mass_offset=(0.0, 0.8))
    m, k, c = building.matrices()
    fast = _integrate([building], building.superstructure, m, k, c, pair, DT, None, compiled=True)
    slow = _integrate([building], building.superstructure, m, k, c, pair, DT, None, compiled=False)
    np.testing.assert_allclose(fast["u"], slow["u"], atol=1e-9)
    np.testing.assert_allclose(fast["storey_q"], slow["storey_q"], atol=1e-6)
    structure = _yielding(offset=(0.7, 0.3))
    fixed = [_integrate(None, structure, structure.mass_matrix(),
                        structure.stiffness_matrix(), structure.damping_matrix(), 3 * pair, DT, None, compiled=flag)
             for flag in (True, False)]
    assert np.abs(fixed[0]["storey_q"]).max() >= 0.95 * 0.95 * min(YIELD)  # some storey reaches its strength
    np.testing.assert_allclose(fixed[0]["u"], fixed[1]["u"], atol=1e-9)


@pytest.mark.parametrize("kwargs, field", [
    ({"yield_shears_x": [100.0, -1.0, 100.0]}, "yield_shears_x"),
    ({"yield_shears_y": [100.0]}, "yield_shears_y"),
    ({"hardening": 1.0}, "hardening"),
    ({"p_delta": "yes"}, "p_delta"),
])
def test_bad_storey_strengths_name_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field):
        PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN, **kwargs)


def test_elastic_directions_report_no_ductility():
    building = PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN, yield_shears_x=YIELD)
    result = run_plan(building, np.stack([_motion(), _motion(seed=2)])[None], DT)
    assert np.all(np.isfinite(result.ductility[:, :, 0]))
    assert np.all(np.isnan(result.ductility[:, :, 1]))
    elastic = run_plan(building.with_strengths(None), np.stack([_motion(), _motion(seed=2)])[None], DT)
    assert np.all(np.isnan(elastic.ductility)) and np.all(elastic.hysteretic_energy == 0.0)
