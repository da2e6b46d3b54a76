"""Isolator force-law dispatch (isolation.dynamics.isolators) against closed forms.

Sources (each check names its own; all cited from memory, not re-read in this session):
- Elastic-perfectly-plastic return map: force = k (u - u_p) with |force| <= F_y (Simo & Hughes,
  Computational Inelasticity, 1998, section 1.2, from memory).
- Bouc-Wen law, Wen (1976) J. Eng. Mech. Div. ASCE 102(2), with n = 2, A = 1, gamma = 1 - beta:
  D_y dz/du = 1 - beta sgn(du) |z| z - gamma z^2.
  Loading (z du > 0): D_y dz/du = 1 - z^2, so from z = 0, z(u) = tanh(u / D_y).
  Unloading (z du < 0, z > 0, du < 0), x = |du| / D_y measured from the reversal:
  dz/dx = -(1 - (gamma - beta) z^2) = -(1 - c z^2), c = gamma - beta = 1 - 2 beta.
  For c = -r^2 < 0 (beta > 1/2): dz/dx = -(1 + r^2 z^2), so r z = tan(atan(r z0) - r x).
  For c = 0 (beta = 1/2): z = z0 - x until z crosses 0, then the loading branch in the
  negative direction, z = -tanh(x - z0).
- Friction pendulum force F = W u / R + mu W z (Zayas, Low & Mahin 1990, EERI Spectra 6(2);
  z the Bouc-Wen variable of Constantinou, Mokha & Reinhorn 1990, J. Struct. Eng. 116(2)),
  with velocity-dependent friction mu(v) = mu_fast - (mu_fast - mu_slow) exp(-a |v|)
  (Mokha, Constantinou & Reinhorn 1990, J. Struct. Eng. 116(2)).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from isolation.bearings import Bilinear, DoubleConcave, FrictionPendulum
from isolation.bearings.laws import SharpFrictionLaw, SmoothLaw
from isolation.dynamics.history import BoucWen
from isolation.dynamics.isolators import (
    SmoothColumns,
    describe,
    friction_regularisation,
    imposed_force,
    isolator_law,
)

# --- elastic-plastic (return map) ------------------------------------------------------

def test_bilinear_return_map_closed_form_over_a_cycle():
    # Bilinear = spring K_d in parallel with an elastic-perfectly-plastic element of stiffness
    # K_u - K_d and strength Q_d (Naeim & Kelly 1999, Design of Seismic Isolated Structures,
    # section 3.2, from memory). Element: q = (K_u - K_d)(u - u_p), |q| <= Q_d (Simo & Hughes 1998).
    ku, kd, qd = 10000.0, 500.0, 50.0
    ke = ku - kd
    uy = qd / ke
    u = np.array([0.5 * uy, 3 * uy, 10 * uy, 8 * uy, 10 * uy - 2 * uy - 2.5 * uy, -10 * uy, 0.0])
    # hand-integrated plastic displacement u_p and element force q at each point
    up = 0.0
    expected = []
    for ui in u:
        q = ke * (ui - up)
        if abs(q) > qd:
            up = ui - math.copysign(qd, q) / ke
            q = math.copysign(qd, q)
        expected.append(kd * ui + q)
    force = imposed_force(Bilinear(ku, kd, qd), u)
    np.testing.assert_allclose(force, expected, rtol=1e-12, atol=1e-9)
    # the element never exceeds its strength: |F - K_d u| <= Q_d
    assert np.all(np.abs(force - kd * u) <= qd * (1 + 1e-12))


# --- Bouc-Wen (smooth) law ------------------------------------------------------------

def test_bouc_wen_loading_branch_is_tanh():
    # Wen (1976), n = 2, loading from z = 0: z = tanh(u / D_y); large steps stay exact.
    plane = Bilinear(20000.0, 1000.0, 100.0)
    dy = plane.yield_displacement
    u = np.array([0.3, 0.9, 2.0, 5.0]) * dy
    force = imposed_force(BoucWen(plane), u)
    expected = plane.post_yield_stiffness * u + plane.characteristic_strength * np.tanh(u / dy)
    np.testing.assert_allclose(force, expected, rtol=1e-12)


def test_bouc_wen_unloading_with_beta_above_half_is_tan_form():
    # Wen (1976) with beta = 0.625: c = gamma - beta = -1/4, r = 1/2; from saturation z0 = 1
    # (tanh(40) = 1 in double precision) the unloading branch is r z = tan(atan(r) - r x).
    plane = Bilinear(20000.0, 1000.0, 100.0)
    dy = plane.yield_displacement
    beta = 0.625
    r = math.sqrt(2 * beta - 1)
    x = np.linspace(0.01, 1.5, 150)  # small first steps: the branch just after reversal
    u = np.concatenate([[40 * dy], 40 * dy - x * dy])
    force = imposed_force(BoucWen(plane, beta=beta), u)
    # z reaches 0 at x_c = atan(r)/r (about 0.93); beyond it the loading branch z = -tanh(x - x_c)
    x_c = math.atan(r) / r
    z = np.where(x < x_c, np.tan(math.atan(r) - r * x) / r, -np.tanh(x - x_c))
    expected = plane.post_yield_stiffness * u[1:] + plane.characteristic_strength * z
    np.testing.assert_allclose(force[1:], expected, rtol=1e-10, atol=1e-9)


def test_smooth_columns_slope_is_derivative_of_shape():
    # shape returns w = g(xi) and dw/dx; Wen (1976): dw/dx = 1 - w^2 ahead (loading),
    # 1 - c w^2 behind (unloading), c = 1 - 2 beta. Checked against a central difference.
    for beta in (0.3, 0.5, 0.8):
        law = SmoothLaw(100.0, 10.0, 10.0, 0.0, 0.001, beta)
        cols = SmoothColumns([law])
        xi = np.array([-0.6, -0.2, 0.2, 0.7, 1.5])
        h = 1e-6
        w, slope = cols.shape(xi)
        numeric = (cols.shape(xi + h)[0] - cols.shape(xi - h)[0]) / (2 * h)
        np.testing.assert_allclose(slope, numeric, rtol=1e-6)
        # theta inverts shape on both branches
        np.testing.assert_allclose(cols.shape(cols.theta(w))[0], w, rtol=1e-12)


def test_smooth_columns_rate_dependence_flag():
    # velocity dependence only when mu_slow < mu_fast and a > 0 (Mokha et al. 1990)
    assert SmoothColumns([SmoothLaw(1.0, 10.0, 5.0, 25.0, 0.001)]).rate_dependent
    assert not SmoothColumns([SmoothLaw(1.0, 10.0, 10.0, 25.0, 0.001)]).rate_dependent
    assert not SmoothColumns([SmoothLaw(1.0, 10.0, 5.0, 0.0, 0.001)]).rate_dependent
    assert SmoothColumns([SmoothLaw(1.0, 10.0, 9.5, 0.5, 0.001)]).rate_dependent
    with pytest.raises(ValueError, match="^cases integrated together must share one Bouc-Wen beta$"):
        SmoothColumns([SmoothLaw(1.0, 10.0, 10.0, 0.0, 0.001, 0.5), SmoothLaw(1.0, 10.0, 10.0, 0.0, 0.001, 0.3)])


# --- friction pendulum ---------------------------------------------------------------

def test_friction_pendulum_force_is_zayas_with_tanh_rounding():
    # Zayas, Low & Mahin (1990): F = W u / R + mu W sgn(v); smooth law: sgn -> z = tanh(u/D_y)
    # on monotonic loading from rest (Constantinou et al. 1990, beta = gamma = 1/2).
    bearing = FrictionPendulum(radius=2.5, friction=0.06, yield_displacement=0.001)
    weight = 8000.0
    u = np.linspace(0.0, 0.2, 201)[1:]
    force = imposed_force(bearing, u, weight=weight)
    expected = weight * u / 2.5 + 0.06 * weight * np.tanh(u / 0.001)
    np.testing.assert_allclose(force, expected, rtol=1e-10)


def test_friction_pendulum_reversal_with_beta_half_is_linear_then_tanh():
    # beta = gamma = 1/2: c = 0, z = z0 - x after reversal, then z = -tanh(x - z0) (Wen 1976).
    bearing = FrictionPendulum(radius=2.0, friction=0.05, yield_displacement=0.001)
    weight, dy = 1000.0, 0.001
    x = np.arange(1, 41) * 0.1
    u = np.concatenate([[40 * dy], 40 * dy - x * dy])
    force = imposed_force(bearing, u, weight=weight)
    z = np.where(x <= 1.0, 1.0 - x, -np.tanh(x - 1.0))
    expected = weight * u[1:] / 2.0 + 0.05 * weight * z
    np.testing.assert_allclose(force[1:], expected, rtol=1e-9, atol=1e-9)


def test_friction_pendulum_velocity_dependent_friction():
    # mu(v) = mu_fast - (mu_fast - mu_slow) exp(-a v) (Mokha, Constantinou & Reinhorn 1990),
    # v = |du| / dt at constant velocity; loading from rest: F = W u / R + mu(v) W tanh(u/D_y).
    bearing = FrictionPendulum(radius=3.0, friction=0.08, friction_slow=0.04, rate_parameter=25.0,
                               yield_displacement=0.0005)
    weight, dt, v = 5000.0, 0.01, 0.02
    u = v * dt * np.arange(1, 101)
    force = imposed_force(bearing, u, weight=weight, dt=dt)
    mu = 0.08 - (0.08 - 0.04) * math.exp(-25.0 * v)
    expected = weight * u / 3.0 + mu * weight * np.tanh(u / 0.0005)
    np.testing.assert_allclose(force, expected, rtol=1e-10)
    with pytest.raises(ValueError, match=r"^dt = None .*> 0 \[s\]"):
        imposed_force(bearing, u, weight=weight)


def test_sharp_friction_law_of_friction_pendulum():
    # sharp law: F = W u / R_eff + q, element strength mu W, initial stiffness mu W / D_y
    # (Zayas, Low & Mahin 1990; the sharp element as isolation.bearings.laws documents it).
    bearing = FrictionPendulum(radius=2.0, friction=0.05, slider_height=0.2, yield_displacement=0.001)
    law = isolator_law(bearing, 1000.0, "sharp")
    assert isinstance(law, SharpFrictionLaw)
    assert law.linear_stiffness == pytest.approx(1000.0 / (2.0 - 0.2))
    assert law.strength_fast == pytest.approx(0.05 * 1000.0)
    assert isinstance(isolator_law(bearing, 1000.0), SmoothLaw)


# --- dispatch, duck objects, description ----------------------------------------------

class _WithBilinear:
    def __init__(self, plane):
        self.plane = plane

    def bilinear(self):
        return self.plane


class _WithBackbone:
    """Backbone scales with the weight: Q_d = 0.05 W (a friction-like plane, common practice)."""

    def backbone(self, weight):
        return Bilinear(100.0 * weight, weight / 2.0, 0.05 * weight)


class _BilinearNeedsArgument(_WithBackbone):
    def bilinear(self, required):  # called without it: TypeError, so the backbone is used
        return Bilinear(1.0, 0.5, 0.1)


def test_duck_objects_run_their_curve():
    plane = Bilinear(10000.0, 500.0, 50.0)
    u = np.array([0.002, 0.01, -0.01])
    np.testing.assert_allclose(imposed_force(_WithBilinear(plane), u, weight=1.0), imposed_force(plane, u))
    # backbone(weight): F = K_d u + Q_d at large displacement, K_d = W/2, Q_d = 0.05 W
    for duck in (_WithBackbone(), _BilinearNeedsArgument()):
        law = isolator_law(duck, 2000.0)
        assert law.linear_stiffness == pytest.approx(1000.0)
        assert law.strengths == pytest.approx((100.0,))
    with pytest.raises(ValueError, match=r"^isolator = .* is not allowed: must be a Bilinear.*"
                       r"a registered bearing \(isolation.bearings.registry\) or an object with .bilinear\(\)$"):
        isolator_law(object(), 1.0)


def test_isolator_law_rejects_bad_fields():
    plane = Bilinear(10000.0, 500.0, 50.0)
    with pytest.raises(ValueError, match=r"^friction_law = 'wobbly' is not allowed"):
        isolator_law(plane, 1.0, "wobbly")
    with pytest.raises(ValueError, match=r"^weight = -1.0 is not allowed: .*> 0 \[kN\]"):
        isolator_law(plane, -1.0)
    message = r"^weight = None is not allowed for this isolator: must be a number > 0 \[kN\]$"
    with pytest.raises(ValueError, match=message):
        imposed_force(FrictionPendulum(radius=2.0, friction=0.05), [0.01])
    with pytest.raises(ValueError, match=r"^displacement\[1\] = nan is not allowed: .*\[m\]"):
        imposed_force(plane, [0.0, float("nan")])
    with pytest.raises(ValueError, match=r"^displacement has shape \(2, 1\): must be 1-D"):
        imposed_force(plane, [[0.0], [0.1]])


def test_friction_regularisation_sentences():
    fp = FrictionPendulum(radius=2.0, friction=0.05, yield_displacement=0.001)
    smooth = friction_regularisation(fp)
    assert smooth.startswith("friction regularised by a Bouc-Wen law of exponent 2")
    assert "D_y = 1 mm (Constantinou, Mokha & Reinhorn 1990): the loop corners are rounded over a few D_y" in smooth
    sharp = friction_regularisation(fp, "sharp")
    assert sharp.startswith("sharp friction: elastic-perfectly-plastic element")
    assert "D_y = 1 mm" in sharp
    none = "no friction regularisation (elastic-plastic elements integrated by exact return mapping)"
    plane = Bilinear(10000.0, 500.0, 50.0)
    # not sliding bearings, and a slider whose backbone runs as elastic-plastic elements
    assert friction_regularisation(plane) == none
    assert friction_regularisation(BoucWen(plane)) == none
    assert friction_regularisation(DoubleConcave(radius_1=2.0, friction_1=0.03, radius_2=2.0,
                                                 friction_2=0.06)) == none
    with pytest.raises(ValueError, match=r"^friction_law = 'wobbly' is not allowed"):
        friction_regularisation(fp, "wobbly")


def test_describe():
    plane = Bilinear(10000.0, 500.0, 50.0)
    assert describe(plane) == plane.to_dict()

    class Plain:
        pass

    assert describe(Plain()) == {"kind": "Plain"}


def test_columns_pad_laws_to_equal_element_counts():
    # ElasticPlasticColumns: one column per law, elements padded with zero stiffness and zero
    # strength (a zero element carries no force, so padding leaves each column's law unchanged).
    from isolation.bearings.laws import ElasticPlasticLaw
    from isolation.dynamics.isolators import ElasticPlasticColumns

    laws = [ElasticPlasticLaw(10.0, (100.0,), (1.0,)), ElasticPlasticLaw(20.0, (300.0, 200.0), (3.0, 2.0))]
    cols = ElasticPlasticColumns(laws)
    assert cols.count == 2
    np.testing.assert_array_equal(cols.k0, [10.0, 20.0])
    np.testing.assert_array_equal(cols.k, [[100.0, 300.0], [0.0, 200.0]])
    np.testing.assert_array_equal(cols.f, [[1.0, 3.0], [0.0, 2.0]])
    np.testing.assert_array_equal(cols.final_stiffness, [10.0, 20.0])
    # SmoothColumns: Q_fast, Q_fast - Q_slow, a, D_y per column; -a kept for exp(-a |v|)
    smooth = SmoothColumns([SmoothLaw(5.0, 10.0, 6.0, 25.0, 0.002), SmoothLaw(7.0, 8.0, 8.0, 20.0, 0.001)])
    np.testing.assert_array_equal(smooth.k0, [5.0, 7.0])
    np.testing.assert_array_equal(smooth.final_stiffness, [5.0, 7.0])
    np.testing.assert_array_equal(smooth.q_fast, [10.0, 8.0])
    np.testing.assert_array_equal(smooth.q_drop, [4.0, 0.0])
    np.testing.assert_array_equal(smooth.minus_rate, [-25.0, -20.0])
    np.testing.assert_array_equal(smooth.inv_dy, [500.0, 1000.0])
    np.testing.assert_array_equal(smooth.q_drop_rate_c2, [0.0, 0.0])
    assert smooth.dy_min == 0.001
    assert smooth.unload == 0.0  # c = gamma - beta with beta = gamma = 1/2 (Wen 1976)


def test_amplitude_dependent_bearing_message_says_what_to_run():
    from isolation.bearings import HighDampingRubber

    message = (r"^isolator = .* is not allowed: a high damping rubber bearing's backbone is not piecewise "
               r"linear and its type registers no history law; run the bilinear with its effective stiffness "
               r"and damping at the design displacement \(isolation.study.assembly.history_isolator\)$")
    with pytest.raises(ValueError, match=message):
        isolator_law(HighDampingRubber(0.8, 0.008, 32), 1000.0)
