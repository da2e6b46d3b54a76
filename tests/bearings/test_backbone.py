"""Bilinear and multi-linear backbones against handbook formulas.

Sources
-------
- Naeim, F. & Kelly, J. M. (1999), Design of Seismic Isolated Structures, ch. 2:
  K_eff = K_d + Q_d/D, EDC = 4 Q_d (D - D_y), beta_eff = EDC/(2 pi K_eff D^2).
- Friction pendulum, derived arithmetic from Zayas, Low & Mahin (1990) and Naeim &
  Kelly (1999): W = 1000 kN, R = 2.235 m, mu = 0.06, D = 0.40 m -> K_eff = W/R +
  mu W/D = 447.4 + 150.0 = 597.4 kN/m, beta_eff = (2/pi) mu/(mu + D/R) = 0.1598
  (rigid-plastic idealisation).
"""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.bearings import Bilinear, MultiLinear


def test_lead_rubber_like_bilinear_matches_handbook_formulas():
    # Hand arithmetic from the Naeim & Kelly formulas (derived arithmetic).
    b = Bilinear(elastic_stiffness=10000.0, post_yield_stiffness=1000.0, characteristic_strength=90.0)
    assert b.yield_displacement == pytest.approx(90.0 / 9000.0)
    d = 0.25
    assert b.effective_stiffness(d) == pytest.approx(1000.0 + 90.0 / 0.25)
    assert b.loop_energy(d) == pytest.approx(4 * 90.0 * (0.25 - 0.01))
    k_eff = 1000.0 + 360.0
    assert b.effective_damping(d) == pytest.approx(4 * 90 * 0.24 / (2 * math.pi * k_eff * d**2))


def test_friction_pendulum_reference_check_values():
    # Reference check (derived arithmetic, rigid-plastic): K_eff 597.4 kN/m, beta 0.1598.
    w, r, mu, d = 1000.0, 2.235, 0.06, 0.40
    tiny_yield = 1e-6
    b = Bilinear(mu * w / tiny_yield + w / r, w / r, mu * w)
    assert b.effective_stiffness(d) == pytest.approx(597.4, abs=0.05)
    assert b.effective_damping(d) == pytest.approx(0.1598, abs=5e-4)
    k_eff = b.effective_stiffness(d)
    assert 2 * math.pi * math.sqrt(w / 9.80665 / k_eff) == pytest.approx(2.596, abs=1e-3)


def test_backbone_force_is_elastic_then_post_yield():
    b = Bilinear(5000.0, 500.0, 45.0)
    dy = b.yield_displacement
    assert b.force(dy / 2) == pytest.approx(5000.0 * dy / 2)
    assert b.force(-0.3) == pytest.approx(-(45.0 + 500.0 * 0.3))


def test_parallel_groups_with_different_yield_add_forces_and_energy():
    a = Bilinear(8000.0, 800.0, 60.0)
    b = Bilinear(2000.0, 300.0, 20.0)
    both = a.parallel(b)
    assert isinstance(both, MultiLinear)
    for d in (0.001, 0.05, 0.3):
        assert both.force(d) == pytest.approx(a.force(d) + b.force(d))
    for d in (0.05, 0.3):
        assert both.loop_energy(d) == pytest.approx(a.loop_energy(d) + b.loop_energy(d))


def test_scaled_applies_property_factors():
    b = Bilinear(10000.0, 1000.0, 100.0).scaled(stiffness=1.2, strength=0.8)
    assert (b.elastic_stiffness, b.post_yield_stiffness, b.characteristic_strength) == pytest.approx(
        (12000.0, 1200.0, 80.0))


@pytest.mark.parametrize(
    "kwargs, field",
    [
        (dict(elastic_stiffness=-1.0, post_yield_stiffness=0.0, characteristic_strength=1.0), "elastic_stiffness"),
        (dict(elastic_stiffness=10.0, post_yield_stiffness=float("nan"), characteristic_strength=1.0),
         "post_yield_stiffness"),
        (dict(elastic_stiffness=10.0, post_yield_stiffness=1.0, characteristic_strength=-5.0),
         "characteristic_strength"),
        (dict(elastic_stiffness=10.0, post_yield_stiffness=20.0, characteristic_strength=1.0), "post_yield_stiffness"),
    ],
)
def test_invalid_bilinear_names_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field):
        Bilinear(**kwargs)


def test_amplitude_must_be_positive():
    with pytest.raises(ValueError, match="displacement"):
        Bilinear(10.0, 1.0, 1.0).effective_stiffness(0.0)


@settings(max_examples=50, deadline=None)
@given(
    kd=st.floats(1.0, 1e4),
    ratio=st.floats(2.0, 100.0),
    qd=st.floats(1.0, 1e3),
    d_factor=st.floats(1.01, 200.0),
)
def test_damping_bounded_by_rigid_plastic_limit(kd, ratio, qd, d_factor):
    # A bilinear loop cannot dissipate more than a rigid-plastic one of the
    # same peak force: beta_eff < 2/pi (Naeim & Kelly 1999, ch. 2).
    b = Bilinear(kd * ratio, kd, qd)
    d = b.yield_displacement * d_factor
    beta = b.effective_damping(d)
    assert 0.0 < beta < 2.0 / math.pi
    assert np.isfinite(b.effective_stiffness(d))
