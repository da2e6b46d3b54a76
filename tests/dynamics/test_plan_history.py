"""Plan model: bidirectional histories with bearings at plan positions.

Sources
-------
* Park, Wen & Ang (1986), Earthquake Eng. Struct. Dyn. 14(4): biaxial Bouc-Wen law; with motion
  along one axis it is the uniaxial law of Wen (1976) that the planar engine integrates.
* Mokha, Constantinou & Reinhorn (1993), J. Struct. Eng. 119(1): under biaxial motion a sliding
  bearing's friction force has magnitude mu N along the velocity; uncoupled uniaxial laws overstate
  it by up to sqrt(2) on a diagonal path (the interaction reduces the yield-surface radius).
* Steady circular sliding at constant speed: friction force mu N along the velocity (derived).
* Newmark average acceleration conserves the energy balance exactly with trapezoidal quadrature
  (Chopra, Dynamics of Structures, 4th ed., §5.4 and the energy balance of §7.9; from memory).
* Rigid-base distribution of the overturning moment over bearings, dN_i = M x_i / sum x^2
  (derived, statics of a rigid plate on equal springs).
"""

from __future__ import annotations

import numpy as np
import pytest

from isolation.bearings import FrictionPendulum, LeadRubber
from isolation.dynamics.history import run
from isolation.dynamics.plan_bearings import radial_return, smooth_update
from isolation.dynamics.plan_history import run_plan, run_plan_cases
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding, bearing_grid
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding

MASSES, STIFFNESSES, HEIGHTS = [600.0] * 3, [9.0e5] * 3, [3.5] * 3
PLAN = (24.0, 16.0)
DT = 0.005


def _motion(steps=3000, seed=0, records=2):
    rng = np.random.default_rng(seed)
    t = np.arange(steps) * DT
    envelope = np.sin(np.pi * t / t[-1]) ** 2
    raw = rng.normal(0.0, 0.25, (records, steps))
    kernel = np.ones(8) / 8  # smooth the white noise a little (band-limit)
    smooth = np.array([np.convolve(r, kernel, mode="same") for r in raw])
    return smooth * envelope * 2.0


def _plan_building(bearing, counts=(4, 3), offset=(0.0, 0.0), **kwargs):
    superstructure = PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN, **kwargs)
    return PlanIsolatedBuilding(superstructure, 700.0, bearing, bearing_grid(PLAN, counts), mass_offset=offset)


PENDULUM = FrictionPendulum(2.2, 0.06, friction_slow=0.04)
RUBBER = LeadRubber(0.8, 0.18, 0.01, 18, 400.0)


@pytest.mark.parametrize("bearing", [PENDULUM, RUBBER], ids=["friction_pendulum", "lead_rubber"])
def test_unidirectional_input_reproduces_the_planar_engine(bearing):
    # Source: Park, Wen & Ang (1986) reduce to Wen (1976) along one axis; radial return reduces to the
    # uniaxial return map; the planar engine integrates the same Newmark equations.
    motion = _motion()
    building = _plan_building(bearing)
    plan = run_plan(building, np.stack([motion, 0 * motion], axis=1), DT)
    isolator = bearing if isinstance(bearing, FrictionPendulum) else bearing.bilinear().times(building.count)
    planar = run(IsolatedBuilding(ShearBuilding(MASSES, STIFFNESSES, HEIGHTS), 700.0, isolator), motion, DT)
    scale = np.abs(planar.isolator_displacement).max()
    # Both solve the same step equations; each stops its iteration at its own tolerance (the planar
    # engine accepts a first-order corrected Newton step), so they agree to about 1e-6 of the peak.
    np.testing.assert_allclose(plan.isolator_displacement[:, 0], planar.isolator_displacement, atol=1e-5 * scale)
    assert np.abs(plan.isolator_displacement[:, 1]).max() < 1e-12
    assert np.abs(plan.base_rotation).max() < 1e-14


def test_symmetric_plan_gives_no_rotation_under_two_components():
    # Source: symmetry (derived): centre of rigidity, bearings and mass symmetric about both axes, and
    # bearing forces independent of the axial load (rubber). Sliders are not: overturning under two
    # components loads one corner more than the others and its friction twists the plane.
    motion = _motion(records=1)
    second = _motion(records=1, seed=5)
    result = run_plan(_plan_building(RUBBER), np.stack([motion, second], axis=1), DT)
    assert np.abs(result.base_rotation).max() < 1e-12
    assert np.abs(result.floor_displacement[:, :, 2]).max() < 1e-12
    assert np.abs(result.isolator_displacement[:, 1]).max() > 1e-3  # the y component does act


def test_mass_offset_twists_the_plan_both_signs_alike():
    # Source: symmetry (derived): +e and -e give mirror-image rotations and the same peak corner demand;
    # a twisting plane moves its corner bearings further than its centre of mass.
    motion = np.stack([_motion(records=1), 0 * _motion(records=1)], axis=1)
    plus = run_plan(_plan_building(RUBBER, offset=(0.0, 0.05 * PLAN[1])), motion, DT)
    minus = run_plan(_plan_building(RUBBER, offset=(0.0, -0.05 * PLAN[1])), motion, DT)
    np.testing.assert_allclose(plus.base_rotation, -minus.base_rotation, atol=1e-12)
    assert plus.total_displacement[0] == pytest.approx(minus.total_displacement[0], rel=1e-9)
    assert plus.torsional_amplification[0] > 1.01


def test_energy_balance_closes():
    # Source: Newmark average acceleration energy balance (Chopra 4th ed.; from memory); < 1 % asked.
    motion = _motion(records=1)
    result = run_plan(_plan_building(PENDULUM, offset=(1.2, 0.8)), np.stack([motion, 0.7 * motion[:, ::-1]], axis=1),
                      DT)
    assert result.energy_error.max() < 1e-8


def test_overturning_loads_are_antisymmetric_about_the_centre():
    # Source: statics (derived): on a symmetric layout under x motion, bearing i at +x gains what its
    # mirror at -x loses, so max(N_+) - N_g = N_g - min(N_-).
    motion = _motion(records=1)
    building = _plan_building(RUBBER, counts=(2, 1))
    result = run_plan(building, np.stack([motion, 0 * motion], axis=1), DT)
    gravity = building.weight / 2
    axial = result.bearing_axial_force[0]
    right = int(np.argmax(building.positions[:, 0]))
    left = 1 - right
    assert axial[right, 1] - gravity == pytest.approx(gravity - axial[left, 0], rel=1e-9)
    assert axial[right, 1] > gravity * 1.001


def test_lifted_sliders_carry_nothing():
    # Source: no-tension slider (derived): with a downward vertical ground acceleration of 2 g every
    # slider's axial load is negative, so the bearings carry no shear and the plane moves with no force.
    motion = _motion(records=1, steps=800)
    building = _plan_building(PENDULUM)
    result = run_plan(building, np.stack([motion, motion], axis=1), DT, vertical=np.full(800, -2.0))
    assert np.all(result.uplift_steps == 799)
    assert np.abs(result.base_shear).max() == 0.0


def test_fixed_base_plan_equals_planar_fixed_base():
    # Source: a symmetric plan under one component is the planar shear building (derived).
    motion = _motion(records=1)
    plan = run_plan(PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN),
                    np.stack([motion, 0 * motion], axis=1), DT)
    planar = run(ShearBuilding(MASSES, STIFFNESSES, HEIGHTS), motion, DT)
    ours = plan.floor_displacement[0, :, 0]
    theirs = np.asarray(planar.floor_displacement)[0]
    theirs = theirs if theirs.shape == ours.shape else theirs.T
    np.testing.assert_allclose(ours, theirs, atol=1e-9 * np.abs(theirs).max())


def test_steady_circular_sliding_friction_is_mu_n_along_the_velocity():
    # Source: steady circular sliding (derived) and Mokha, Constantinou & Reinhorn (1993): |F_mu| = mu N,
    # directed along the velocity, once the slider has travelled many yield displacements.
    radius, yield_displacement = 0.2, 0.0005
    angle = np.linspace(0.0, 4 * np.pi, 4001)
    orbit = radius * np.stack([np.cos(angle), np.sin(angle)], axis=-1)
    z = np.zeros(2)
    for i in range(1, angle.size):
        z = smooth_update(z, orbit[i] - orbit[i - 1], np.array(1.0 / yield_displacement))
    velocity = np.array([-np.sin(angle[-1]), np.cos(angle[-1])])
    assert np.linalg.norm(z) == pytest.approx(1.0, abs=1e-6)
    assert float(z @ velocity) == pytest.approx(1.0, abs=1e-4)


def test_biaxial_interaction_caps_the_resultant_at_the_uniaxial_strength():
    # Source: Mokha, Constantinou & Reinhorn (1993): coupled law gives |z| <= 1 on a diagonal path,
    # uncoupled uniaxial laws give sqrt(2); the same for the circular yield surface of the return map.
    step = np.array([0.001, 0.001])
    z = np.zeros(2)
    p = np.zeros((1, 2))
    zx = zy = np.zeros(2)
    for _ in range(200):
        z = smooth_update(z, step, np.array(1 / 0.0005))
        p = radial_return(p, step, np.array([1 / 0.0005]))
        zx = smooth_update(zx, np.array([step[0], 0.0]), np.array(1 / 0.0005))
        zy = smooth_update(zy, np.array([0.0, step[1]]), np.array(1 / 0.0005))
    assert np.linalg.norm(z) == pytest.approx(1.0, abs=1e-9)
    assert np.linalg.norm(p) == pytest.approx(1.0, abs=1e-12)
    assert np.hypot(zx[0], zy[1]) == pytest.approx(np.sqrt(2.0), abs=1e-6)


def test_cases_run_together_equal_cases_run_alone():
    # Source: columns are independent (derived).
    motion = _motion(records=1)
    pair = np.stack([motion, 0.5 * motion], axis=1)
    weak = _plan_building(FrictionPendulum(2.2, 0.04), offset=(0.5, 0.0))
    strong = _plan_building(FrictionPendulum(2.2, 0.08), offset=(0.5, 0.0))
    together = run_plan_cases([weak, strong], pair, DT)
    alone = run_plan(strong, pair, DT)
    np.testing.assert_allclose(together[1].isolator_displacement, alone.isolator_displacement, atol=1e-12)


@pytest.mark.parametrize(
    "kwargs, field",
    [({"plan": (0.0, 10.0)}, "plan"), ({"rigidity_offset": (1.0,)}, "rigidity_offset"), ({"damping": 1.5}, "damping")],
)
def test_bad_plan_input_names_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field):
        PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, **kwargs)


def test_bad_positions_and_acceleration_are_refused():
    superstructure = PlanShearBuilding(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN)
    with pytest.raises(ValueError, match="positions"):
        PlanIsolatedBuilding(superstructure, 700.0, PENDULUM, np.zeros((3, 3)))
    with pytest.raises(ValueError, match="acceleration"):
        run_plan(_plan_building(PENDULUM), np.zeros((2, 3, 10)), DT)


def test_public_names_of_the_plan_model():
    # The names that outside checks call (issue: bidirectional isolation): history.run takes a plan building
    # with (records, 2, steps) input and returns per-bearing peaks and axial extremes.
    from isolation.dynamics.structure import PlanIsolatedBuilding as Isolated
    from isolation.dynamics.structure import PlanShearBuilding as Shear

    building = Isolated(Shear(MASSES, STIFFNESSES, STIFFNESSES, HEIGHTS, plan=PLAN), 700.0, PENDULUM,
                        bearing_grid(PLAN, (3, 2)))
    result = run(building, np.zeros((2, 2, 50)), DT)
    assert result.bearing_displacement_peak.shape == (2, 6)
    assert result.bearing_axial_force.shape == (2, 6, 2)
    assert result.isolator_displacement.shape == (2, 2, 50)
    # at rest every bearing carries its gravity share (weight / 6), compression positive
    np.testing.assert_allclose(result.bearing_axial_force, building.weight / 6, rtol=1e-12)


def test_compiled_and_array_loops_agree():
    # Source: the same equations (derived); each column converges on its own in the compiled loop, so the
    # histories agree to the iteration tolerance (1e-9 of the yield displacement), not bit for bit.
    from isolation.dynamics import plan_history, plan_kernel

    if not plan_kernel.available:
        pytest.skip("numba is not installed: only the array loop exists")
    motion = _motion(records=2, steps=1500)
    building = _plan_building(PENDULUM, offset=(0.8, -0.5))
    m, k, c = building.matrices()
    pair = np.stack([motion, motion[::-1]], axis=1) * 9.80665
    fast = plan_history._integrate([building], building.superstructure, m, k, c, pair, DT, None, compiled=True)
    slow = plan_history._integrate([building], building.superstructure, m, k, c, pair, DT, None, compiled=False)
    np.testing.assert_allclose(fast["u"], slow["u"], atol=1e-9)
    np.testing.assert_allclose(fast["axial_max"], slow["axial_max"], rtol=1e-9)
