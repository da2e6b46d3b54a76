"""Triple friction pendulum against the published regime equations.

Sources
-------
- Fenz, D. M. & Constantinou, M. C. (2008a), Earthquake Eng. Struct. Dyn. 37(2) 163-183, regimes I-V of
  the standard configuration (R_1 = R_4, R_2 = R_3, mu_2 = mu_3 < mu_1 <= mu_4), as summarised in their
  Table of force-displacement relations (from memory):
  regime I:   F = W u/(R_eff2 + R_eff3) + mu_2 W, up to u*_1 = 2 R_eff2 (mu_1 - mu_2);
  regime II:  F = W (u - u*_1)/(R_eff1 + R_eff3) + mu_1 W, up to u*_2 = u*_1 + (R_eff1 + R_eff3)(mu_4 - mu_1);
  regime III: F = W (u - u*_2)/(R_eff1 + R_eff4) + mu_4 W, up to F_dr1 = W (mu_1 + d_1/R_1);
  total capacity d*_1 + d*_2 + d*_3 + d*_4 with d*_i = d_i R_eff,i/R_i.
- Fenz & Constantinou (2008c), Earthquake Spectra 24(4): the series model with elements
  (2 R_eff2, mu_2), (R_eff1 - R_eff2, mu_1), (R_eff4 - R_eff3, mu_4); on reversal the inner surfaces
  reverse first after a force change of 2 mu_2 W (rigid-plastic elements in series).
- ASCE/SEI 7-16 §17.2.4.4 restoring force: F(D) - F(D/2) >= 0.025 W (from memory).
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.bearings import MultiLinear, TripleFrictionPendulum
from isolation.dynamics.isolators import imposed_force

W = 1000.0  # [kN]
# Invented example: R_1 = R_4 = 2.5 m, R_2 = R_3 = 0.5 m, h_1 = 0.2 m, h_2 = 0.1 m,
# mu_2 = 0.02, mu_1 = 0.06, mu_4 = 0.10, d_1 = 0.35 m, d_2 = 0.08 m.
BEARING = TripleFrictionPendulum(2.5, 0.5, 0.02, 0.06, 0.10, slider_height_outer=0.2, slider_height_inner=0.1,
                                 displacement_capacity_outer=0.35, displacement_capacity_inner=0.08,
                                 yield_displacement=1e-7)


def test_regime_limits_from_the_published_equations():
    # Fenz & Constantinou (2008a): u*_1 = 2 R_eff2 (mu_1 - mu_2) = 2 x 0.4 x 0.04 = 0.032 m;
    # u*_2 = u*_1 + (R_eff1 + R_eff3)(mu_4 - mu_1) = 0.032 + 2.7 x 0.04 = 0.140 m (derived arithmetic).
    u1, u2 = BEARING.regime_limits
    assert u1 == pytest.approx(0.032, rel=1e-12)
    assert u2 == pytest.approx(0.140, rel=1e-12)


def test_regime_iv_begins_at_the_outer_restrainer():
    # Fenz & Constantinou (2008a): F_dr1/W = mu_1 + d_1/R_1 = 0.06 + 0.35/2.5 = 0.20;
    # u_dr1 = u*_2 + (R_eff1 + R_eff4)(0.20 - mu_4) = 0.14 + 4.6 x 0.10 = 0.60 m (derived arithmetic).
    assert BEARING.first_contact_displacement == pytest.approx(0.60, rel=1e-12)
    # total capacity 2 (0.35 x 2.3/2.5 + 0.08 x 0.4/0.5) = 0.772 m (derived arithmetic)
    assert BEARING.displacement_capacity == pytest.approx(0.772, rel=1e-12)


@pytest.mark.parametrize("u, ratio", [
    (0.016, 0.02 + 0.016 / 0.8),             # regime I: mu_2 + u/(R_eff2 + R_eff3)
    (0.086, 0.06 + (0.086 - 0.032) / 2.7),   # regime II: mu_1 + (u - u*_1)/(R_eff1 + R_eff3)
    (0.400, 0.10 + (0.400 - 0.140) / 4.6),   # regime III: mu_4 + (u - u*_2)/(R_eff1 + R_eff4)
])
def test_backbone_force_in_each_regime(u, ratio):
    # Fenz & Constantinou (2008a) regime equations (module docstring); both the series formula and the
    # parallel MultiLinear backbone used in analysis.
    assert BEARING.force(W, u) == pytest.approx(W * ratio, rel=1e-9)
    backbone = BEARING.backbone(W)
    assert isinstance(backbone, MultiLinear)
    assert backbone.force(u) == pytest.approx(W * ratio, rel=1e-6)


def test_reversal_moves_the_inner_sliders_first():
    # Fenz & Constantinou (2008c): after reversal from regime III the force falls by 2 mu_2 W before
    # any sliding (inner surfaces), then follows regime I backwards with stiffness W/(2 R_eff2).
    path = np.concatenate([np.linspace(0.0, 0.3, 3001), np.linspace(0.3, 0.29, 101)[1:]])
    force = imposed_force(BEARING, path, weight=W)
    peak = force[3000]
    # after backing up 0.01 m (< 2 u*_1 = 0.064 m) the bearing is sliding back on the inner surfaces:
    expected = peak - 2 * 0.02 * W - 0.01 * W / 0.8
    assert force[-1] == pytest.approx(expected, rel=1e-4)


def test_restoring_force_and_regime_checks():
    # ASCE/SEI 7-16 §17.2.4.4 (from memory): F(D) - F(D/2) >= 0.025 W; regime IV onset at 0.60 m.
    checks = {c.name: c for c in BEARING.checks(W, 0.45)}
    assert checks["first restrainer contact"].passed
    assert not {c.name: c for c in BEARING.checks(W, 0.65)}["first restrainer contact"].passed
    # F(D) - F(D/2) = 0.45 W/4.6 - ... both points in regime III: (0.45 - 0.225)/4.6 = 0.0489 W (derived arithmetic)
    assert checks["restoring force"].value == pytest.approx(0.225 / 4.6, rel=1e-6)
    assert checks["restoring force"].passed
    inner = checks["inner surface travel in regimes I-III"]
    # surface 3 travels R_eff3 (mu_4 - mu_3) = 0.4 x 0.08 = 0.032 m against 0.08 x 0.4/0.5 = 0.064 m
    assert inner.value == pytest.approx(0.032) and inner.limit == pytest.approx(0.064) and inner.passed


@settings(max_examples=40, deadline=None)
@given(st.floats(0.0, 0.6), st.floats(0.0, 0.6))
def test_backbone_is_monotonic_and_finite(a, b):
    low, high = sorted((a, b))
    f_low, f_high = BEARING.force(W, low), BEARING.force(W, high)
    assert np.isfinite(f_low) and np.isfinite(f_high) and f_high >= f_low


def test_friction_factor_scales_every_surface():
    upper = BEARING.with_friction_factor(1.2)
    assert (upper.friction_inner, upper.friction_1, upper.friction_4) == pytest.approx((0.024, 0.072, 0.12))


@pytest.mark.parametrize("field, kwargs", [
    ("radius_outer", {"radius_outer": 0.4}),
    ("friction_1", {"friction_1": 0.01}),
    ("friction_4", {"friction_4": 0.05}),
    ("friction_inner", {"friction_inner": 1.5}),
    ("slider_height_inner", {"slider_height_inner": 0.6}),
    ("displacement_capacity_outer", {"displacement_capacity_outer": -1.0}),
])
def test_bad_values_name_the_field(field, kwargs):
    values = dict(radius_outer=2.5, radius_inner=0.5, friction_inner=0.02, friction_1=0.06, friction_4=0.10)
    values.update(kwargs)
    with pytest.raises(ValueError, match=field):
        TripleFrictionPendulum(**values)


def test_study_file_with_a_triple_pendulum_runs(tmp_path):
    # The bearing type is reachable from a study file and runs through design and histories.
    from isolation.study import load_study
    from isolation.study.runner import run_study

    text = open("examples/demo_study.toml").read()
    start = text.index('type = "friction_pendulum"')
    end = text.index("# axial_load", start)
    text = text[:start] + (
        'type = "triple_pendulum"\ncount = 30\nradius_outer = "3.0 m"\nradius_inner = "0.6 m"\n'
        'friction_inner = 0.02\nfriction_1 = 0.05\nfriction_4 = 0.08\nslider_height_outer = "0.15 m"\n'
        'slider_height_inner = "0.08 m"\ndisplacement_capacity_outer = "0.40 m"\n'
        'displacement_capacity_inner = "0.08 m"\n') + text[end:]
    path = tmp_path / "triple.toml"
    path.write_text(text)
    results = run_study(load_study(path), quick=True)
    first = results.alternatives[0]
    assert first.to_dict()["name"] == "Friction pendulum"
    assert first.to_dict()["system"]["groups"][0]["bearing"]["kind"] == "triple_pendulum"
