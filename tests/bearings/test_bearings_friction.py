"""Friction pendulum bearings against published formulas and closed-form regime equations.

Sources
-------
- Zayas, Low & Mahin (1990); Naeim & Kelly (1999): F = (W/R) u + mu W sgn(v),
  K_eff = W/R + mu W/D, beta_eff = (2/pi) mu/(mu + D/R), T = 2 pi sqrt(R/g),
  articulated slider R_eff = R - h.
- Derived arithmetic from those formulas: W = 1000 kN, R = 2.235 m, mu = 0.06,
  D = 0.40 m -> T = 3.000 s, K_eff = 597.4 kN/m, T_eff = 2.596 s, beta_eff = 0.1598
  (rigid-plastic).
- Constantinou, Mokha & Reinhorn (1990): mu(v) = mu_fast - (mu_fast - mu_slow) exp(-a |v|).
- Fenz & Constantinou (2006): double concave regimes I and II, u* = (mu2 - mu1) R_eff1,
  unloading: surface of lower friction reverses after a force change 2 mu1 W,
  the other after 2 mu2 W.
- ASCE/SEI 7-16 §17.2.4.4: F(D) - F(D/2) >= 0.025 W, which for a pendulum reads D >= 0.05 R.
"""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation import GRAVITY
from isolation.bearings import Bilinear, DoubleConcave, FrictionPendulum, MultiLinear

TINY = 1e-7  # yield displacement small enough to stand for rigid-plastic sliding [m]


# --- single concave ------------------------------------------------------------------
def test_reference_derived_check_values():
    # [derived] from the formulas of Zayas, Low & Mahin (1990): T 3.000 s, K_eff 597.4, T_eff 2.596, beta 0.1598.
    fp = FrictionPendulum(2.235, 0.06)
    w, d = 1000.0, 0.40
    b = fp.bilinear(w)
    assert fp.period == pytest.approx(3.000, abs=5e-4)
    assert b.effective_stiffness(d) == pytest.approx(597.4, abs=0.05)
    t_eff = 2 * math.pi * math.sqrt(w / GRAVITY / b.effective_stiffness(d))
    assert t_eff == pytest.approx(2.596, abs=1e-3)
    # The default 0.5 mm yield displacement removes 4 Q_d D_y from the loop,
    # i.e. a relative change D_y/D = 0.00125 in beta: allow exactly that much.
    assert b.effective_damping(d) == pytest.approx(0.1598, abs=0.1598 * 0.0005 / 0.40 + 1e-4)
    assert b.effective_damping(d) < 0.1598  # the yield displacement can only reduce damping


def test_bilinear_parameters_are_weight_over_radius_and_mu_weight():
    # K_d = W/R, Q_d = mu W (Zayas et al. 1990); K_u = Q_d/D_y + K_d so D_y is as given.
    fp = FrictionPendulum(3.0, 0.05, yield_displacement=0.001)
    b = fp.bilinear(1200.0)
    assert isinstance(b, Bilinear)
    assert b.post_yield_stiffness == pytest.approx(400.0)  # 1200/3.0, hand arithmetic
    assert b.characteristic_strength == pytest.approx(60.0)  # 0.05*1200
    assert b.elastic_stiffness == pytest.approx(60.0 / 0.001 + 400.0)
    assert b.yield_displacement == pytest.approx(0.001)
    assert fp.backbone(1200.0) == b


def test_articulated_slider_uses_effective_radius():
    # R_eff = R - h (Constantinou et al.); R 2.5 m, h 0.265 m -> R_eff 2.235 m -> T = 3.000 s.
    fp = FrictionPendulum(2.5, 0.06, slider_height=0.265)
    assert fp.effective_radius == pytest.approx(2.235)
    assert fp.period == pytest.approx(3.000, abs=5e-4)
    assert fp.bilinear(1000.0).post_yield_stiffness == pytest.approx(1000.0 / 2.235)


@pytest.mark.parametrize("mu, radius, d", [(0.03, 1.5, 0.1), (0.06, 2.235, 0.4), (0.10, 4.0, 0.6)])
def test_effective_stiffness_and_damping_match_pendulum_closed_forms(mu, radius, d):
    # K_eff = W/R + mu W/D and beta = (2/pi) mu/(mu + D/R) (Naeim & Kelly 1999, rigid-plastic).
    w = 2500.0
    b = FrictionPendulum(radius, mu, yield_displacement=TINY).bilinear(w)
    assert b.effective_stiffness(d) == pytest.approx(w / radius + mu * w / d, rel=1e-9)
    assert b.effective_damping(d) == pytest.approx((2 / math.pi) * mu / (mu + d / radius), rel=1e-5)


def test_friction_velocity_dependence_follows_constantinou_formula():
    # mu(v) = mu_fast - (mu_fast - mu_slow) exp(-a|v|) (Constantinou, Mokha & Reinhorn 1990).
    fp = FrictionPendulum(2.0, 0.06, friction_slow=0.03, rate_parameter=25.0)
    assert fp.friction_at(0.0) == pytest.approx(0.03)
    assert fp.friction_at(0.04) == pytest.approx(0.06 - 0.03 * math.exp(-1.0))  # = 0.048963
    assert fp.friction_at(-0.04) == pytest.approx(0.048963, abs=1e-6)
    assert fp.friction_at(10.0) == pytest.approx(0.06, abs=1e-12)
    v = np.array([0.0, 0.01, 0.1, 1.0])
    assert np.all(np.diff(fp.friction_at(v)) > 0)


def test_friction_slow_defaults_to_no_rate_dependence():
    fp = FrictionPendulum(2.0, 0.05)
    assert fp.friction_slow == 0.05
    assert fp.friction_at(0.0) == pytest.approx(0.05)
    assert fp.friction_at(0.3) == pytest.approx(0.05)


def test_restoring_force_check_reduces_to_d_at_least_five_percent_of_r():
    # ASCE/SEI 7-16 §17.2.4.4 with F = (W/R)u + mu W: (F(D) - F(D/2))/W = D/(2R) >= 0.025 -> D >= 0.05 R.
    fp = FrictionPendulum(2.235, 0.06)  # boundary D = 0.11175 m
    for d, expected in ((0.10, False), (0.115, True), (0.40, True)):
        check = next(c for c in fp.checks(1000.0, d) if c.name == "restoring force")
        assert check.passed is expected
        assert check.value == pytest.approx(d / (2 * 2.235), rel=1e-9)
        assert check.limit == 0.025
        assert "17.2.4.4" in check.source


def test_displacement_capacity_and_uplift_checks():
    fp = FrictionPendulum(2.235, 0.06, displacement_capacity=0.45)
    names = {c.name: c for c in fp.checks(1000.0, 0.40, axial_load_min=-50.0)}
    assert names["displacement capacity"].passed and names["displacement capacity"].limit == 0.45
    assert not names["net tension (uplift)"].passed
    names = {c.name: c for c in fp.checks(1000.0, 0.50)}
    assert not names["displacement capacity"].passed
    assert names["net tension (uplift)"].passed
    assert "displacement capacity" not in {c.name for c in FrictionPendulum(2.0, 0.05).checks(900.0, 0.3)}


def test_with_friction_factor_scales_both_frictions_and_keeps_yield_displacement():
    fp = FrictionPendulum(2.0, 0.05, friction_slow=0.03).with_friction_factor(1.2)
    assert fp.friction == pytest.approx(0.06) and fp.friction_slow == pytest.approx(0.036)
    assert fp.bilinear(1000.0).yield_displacement == pytest.approx(0.0005)


# --- double concave --------------------------------------------------------------------
def test_double_concave_equal_friction_is_one_pendulum_of_summed_radius():
    # Fenz & Constantinou 2006: equal friction -> R = R_eff1 + R_eff2.
    dc = DoubleConcave(2.0, 0.05, 2.5, 0.05, slider_height_1=0.1, slider_height_2=0.1)
    b = dc.backbone(1000.0)
    assert isinstance(b, Bilinear)
    assert b.post_yield_stiffness == pytest.approx(1000.0 / 4.3)
    assert b.characteristic_strength == pytest.approx(50.0)
    assert dc.period == pytest.approx(2 * math.pi * math.sqrt(4.3 / 9.80665))
    assert dc.transition_displacement == 0.0


def _fenz_backbone(u, w, r1, mu1, r2, mu2):
    """Regimes I and II of Fenz & Constantinou (2006), rigid-plastic, surface 1 of lower friction."""
    ustar = (mu2 - mu1) * r1
    if u <= ustar:
        return w * u / r1 + mu1 * w
    return w * u / (r1 + r2) + w * (mu1 * r1 + mu2 * r2) / (r1 + r2)


@pytest.mark.parametrize("swap", [False, True])
def test_double_concave_unequal_friction_backbone_follows_regimes(swap):
    w, r1, mu1, r2, mu2 = 1500.0, 2.0, 0.03, 3.0, 0.07
    dc = DoubleConcave(r2, mu2, r1, mu1) if swap else DoubleConcave(r1, mu1, r2, mu2)
    b = dc.backbone(w)
    assert isinstance(b, MultiLinear)
    assert dc.transition_displacement == pytest.approx(0.08)  # (0.07 - 0.03) * 2.0, hand arithmetic
    assert b.final_stiffness == pytest.approx(w / 5.0)
    for u in (0.001, 0.02, 0.0799, 0.0801, 0.2, 0.6):  # all beyond D_y = 0.5 mm
        assert b.force(u) == pytest.approx(_fenz_backbone(u, w, r1, mu1, r2, mu2), rel=1e-12)
        assert b.force(-u) == pytest.approx(-_fenz_backbone(u, w, r1, mu1, r2, mu2), rel=1e-12)


def _trace_elements(model, path):
    """Force along a displacement path of parallel elastic-perfectly-plastic elements (test's own stepping)."""
    k0, ks, fs = model.elements()
    plastic = np.zeros(len(ks))
    forces = []
    for u in path:
        total = k0 * u
        for i, (k, f) in enumerate(zip(ks, fs, strict=True)):
            trial = k * (u - plastic[i])
            if abs(trial) > f:
                plastic[i] = u - math.copysign(f, trial) / k
                trial = math.copysign(f, trial)
            total += trial
        forces.append(total)
    return np.array(forces)


def test_double_concave_loop_matches_fenz_unloading_regimes():
    # Closed-form loop (Fenz & Constantinou 2006, rigid-plastic): from (D, F_max) the force
    # drops 2 mu1 W at constant u, then follows slope W/R1 for 2 u*, then W/(R1 + R2) to (-D, -F_max).
    w, r1, mu1, r2, mu2, d = 1000.0, 2.0, 0.02, 2.5, 0.06, 0.35
    dc = DoubleConcave(r1, mu1, r2, mu2, yield_displacement=TINY)
    model = dc.backbone(w)
    ustar = (mu2 - mu1) * r1
    fmax = _fenz_backbone(d, w, r1, mu1, r2, mu2)
    # pointwise on the unloading branch
    path = np.concatenate([np.linspace(0, d, 2001), np.linspace(d, -d, 4001)[1:]])
    forces = _trace_elements(model, path)
    down = path[2001:]
    f_down = forces[2001:]
    for u in (d - 0.5 * ustar, d - 2 * ustar + 1e-4, 0.0, -0.2):
        i = int(np.argmin(np.abs(down - u)))
        du = d - down[i]
        if du <= 2 * ustar:
            expected = fmax - 2 * mu1 * w - w * du / r1
        else:
            expected = fmax - 2 * mu2 * w - w * (du - 2 * ustar) / (r1 + r2)
        assert f_down[i] == pytest.approx(expected, abs=1e-3 * w * 0.01)
    # loop area from the closed-form polygon (shoelace) against the model's loop energy
    pts = [(d, fmax), (d, fmax - 2 * mu1 * w), (d - 2 * ustar, fmax - 2 * mu2 * w), (-d, -fmax),
           (-d, -fmax + 2 * mu1 * w), (-d + 2 * ustar, -fmax + 2 * mu2 * w)]
    x, y = np.array(pts).T
    area = 0.5 * abs(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1)))
    assert model.loop_energy(d) == pytest.approx(area, rel=1e-5)


def test_double_concave_capacity_and_first_restrainer_contact():
    # Capacity = sum of the dishes; first contact from u_i = R_i (F/W - mu_i) (derived from Fenz regimes):
    # R_a 2, mu_a 0.03, c_a 0.3; R_b 3, mu_b 0.06, c_b 0.3 -> F/W = min(0.18, 0.16) = 0.16
    # -> total 2 (0.16 - 0.03) + 3 (0.16 - 0.06) = 0.56 m.
    dc = DoubleConcave(2.0, 0.03, 3.0, 0.06, displacement_capacity_1=0.3, displacement_capacity_2=0.3)
    assert dc.displacement_capacity == pytest.approx(0.6)
    assert dc.first_contact_displacement == pytest.approx(0.56)
    checks = {c.name: c for c in dc.checks(1000.0, 0.58)}
    assert checks["displacement capacity"].passed
    assert not checks["first restrainer contact"].passed


def test_double_concave_bilinear_refuses_unequal_friction():
    with pytest.raises(ValueError, match="friction_2"):
        DoubleConcave(2.0, 0.03, 3.0, 0.06).bilinear(1000.0)


# --- properties over the input space --------------------------------------------------
radii = st.floats(0.5, 10.0)
frictions = st.floats(0.01, 0.2)
amplitudes = st.floats(0.01, 1.5)
weights = st.floats(10.0, 1e5)


@settings(max_examples=50, deadline=None)
@given(radii, frictions, amplitudes, weights)
def test_damping_lies_between_zero_and_two_over_pi(radius, mu, d, w):
    # (2/pi) mu/(mu + D/R) < 2/pi for any D > 0 (closed form above).
    beta = FrictionPendulum(radius, mu).bilinear(w).effective_damping(d)
    assert 0.0 < beta < 2 / math.pi
    assert not math.isnan(beta)


@settings(max_examples=50, deadline=None)
@given(radii, st.floats(1.05, 3.0), frictions, amplitudes, weights)
def test_larger_radius_gives_lower_stiffness_and_longer_period(radius, factor, mu, d, w):
    small, large = FrictionPendulum(radius, mu), FrictionPendulum(radius * factor, mu)
    assert large.bilinear(w).effective_stiffness(d) < small.bilinear(w).effective_stiffness(d)
    assert large.period > small.period


@settings(max_examples=50, deadline=None)
@given(radii, frictions, radii, frictions, amplitudes, weights)
def test_double_concave_has_no_nan_and_lies_between_its_regimes(r1, mu1, r2, mu2, d, w):
    model = DoubleConcave(r1, mu1, r2, mu2).backbone(w)
    k, beta = model.effective_stiffness(d), model.effective_damping(d)
    assert math.isfinite(k) and math.isfinite(beta) and 0.0 < beta < 2 / math.pi
    # the force never exceeds a single pendulum on the stiffer dish with the larger friction
    assert model.force(d) <= w * d / min(r1, r2) + max(mu1, mu2) * w + 1e-9


# --- invalid input names the field ------------------------------------------------------
@pytest.mark.parametrize("kwargs, field", [
    ({"radius": -2.0}, "radius"), ({"radius": 0.0}, "radius"), ({"radius": float("nan")}, "radius"),
    ({"friction": 0.0}, "friction"), ({"friction": 1.2}, "friction"), ({"friction": float("nan")}, "friction"),
    ({"slider_height": -0.1}, "slider_height"), ({"slider_height": 2.0}, "slider_height"),
    ({"displacement_capacity": -0.3}, "displacement_capacity"),
    ({"displacement_capacity": float("inf")}, "displacement_capacity"),
    ({"friction_slow": 0.08}, "friction_slow"), ({"friction_slow": -0.01}, "friction_slow"),
    ({"rate_parameter": -1.0}, "rate_parameter"), ({"yield_displacement": 0.0}, "yield_displacement"),
    ({"radius": "two"}, "radius"),
])
def test_invalid_single_concave_input_names_the_field(kwargs, field):
    args = {"radius": 2.0, "friction": 0.05}
    args.update(kwargs)
    with pytest.raises(ValueError, match=rf"^{field} = .* is not allowed: must be"):
        FrictionPendulum(**args)


@pytest.mark.parametrize("weight", [-1.0, 0.0, float("nan"), None])
def test_invalid_weight_names_the_field(weight):
    with pytest.raises(ValueError, match=r"^weight = "):
        FrictionPendulum(2.0, 0.05).bilinear(weight)


@pytest.mark.parametrize("kwargs, field", [
    ({"radius_1": -1.0}, "radius_1"), ({"friction_2": 1.0}, "friction_2"),
    ({"slider_height_2": 3.0}, "slider_height_2"), ({"displacement_capacity_1": 0.0}, "displacement_capacity_1"),
    ({"yield_displacement": float("nan")}, "yield_displacement"),
])
def test_invalid_double_concave_input_names_the_field(kwargs, field):
    args = {"radius_1": 2.0, "friction_1": 0.03, "radius_2": 2.0, "friction_2": 0.05}
    args.update(kwargs)
    with pytest.raises(ValueError, match=rf"^{field} = "):
        DoubleConcave(**args)


@pytest.mark.parametrize("load, d, field", [(-10.0, 0.3, "axial_load"), (1000.0, 0.0, "displacement"),
                                            (1000.0, float("nan"), "displacement")])
def test_invalid_check_input_names_the_field(load, d, field):
    with pytest.raises(ValueError, match=rf"^{field} = "):
        FrictionPendulum(2.0, 0.05).checks(load, d)


def test_double_concave_force_method_follows_regimes():
    dc = DoubleConcave(3.0, 0.08, 2.0, 0.03)  # surface 2 has the lower friction
    for u in (0.05, 0.1, 0.3):
        assert dc.force(1000.0, u) == pytest.approx(_fenz_backbone(u, 1000.0, 2.0, 0.03, 3.0, 0.08))
    assert dc.force(1000.0, -0.3) == pytest.approx(-_fenz_backbone(0.3, 1000.0, 2.0, 0.03, 3.0, 0.08))


def test_friction_pendulum_inputs_copies_and_pass_through():
    import dataclasses

    from isolation.bearings import friction
    # Integers and numpy scalars are stored as plain floats.
    fp = FrictionPendulum(3, np.float64(0.06), slider_height=np.float64(0.2), displacement_capacity=1,
                          friction_slow=np.float64(0.04), rate_parameter=20, yield_displacement=np.float64(0.001))
    for f in dataclasses.fields(fp):
        assert type(getattr(fp, f.name)) is float, f.name
    # A property modification factor changes both frictions and nothing else.
    assert fp.with_friction_factor(1.2) == dataclasses.replace(fp, friction=0.06 * 1.2, friction_slow=0.04 * 1.2)
    with pytest.raises(ValueError, match=r"^friction factor = nan is not allowed"):
        fp.with_friction_factor(math.nan)
    with pytest.raises(ValueError, match=r"^weight = 0\.0 is not allowed: must be a finite number > 0 \[kN\]$"):
        fp.bilinear(0.0)
    assert type(fp.friction_at(0.1)) is float and fp.friction_at(np.array([0.0, 0.1])).shape == (2,)
    # checks(): the extreme loads and the restored weight reach the checks. F(D) - F(D/2) = W D/(2 R_eff) for a
    # pendulum (Zayas et al. 1990: K_d = W/R_eff, R_eff = R - h = 2.8 m) -> over a weight share of 2 W it
    # halves: D/(4 R_eff) [derived].
    with pytest.raises(ValueError, match=r"^axial_load_max = 500\.0 is not allowed: must be >= axial_load"):
        fp.checks(1000.0, 0.3, axial_load_max=500.0)
    own = next(c for c in fp.checks(1000.0, 0.3) if c.name == "restoring force")
    shared = next(c for c in fp.checks(1000.0, 0.3, weight_share=2000.0) if c.name == "restoring force")
    assert own.value == pytest.approx(0.3 / (2 * 2.8)) and shared.value == pytest.approx(0.3 / (4 * 2.8))
    # The double concave bearing moved to its own module and stays importable from here.
    from isolation.bearings.double_concave import DoubleConcave
    assert friction.DoubleConcave is DoubleConcave
    with pytest.raises(AttributeError, match=r"^module 'isolation.bearings.friction' has no attribute 'Nothing'$"):
        _ = friction.Nothing


def test_double_concave_regimes_inputs_and_pass_through():
    import dataclasses
    # Fenz & Constantinou (2006), sliding regimes I and II of a double concave bearing, surface a the one of
    # lower friction: regime I (u <= u* = (mu_b - mu_a) R_a): F = W u/R_a + mu_a W; regime II beyond:
    # F = W u/(R_a + R_b) + W (mu_a R_a + mu_b R_b)/(R_a + R_b). R 2 and 3 m, mu 0.03 and 0.06: u* = 0.06 m.
    dc = DoubleConcave(2.0, 0.03, 3.0, 0.06)
    w = 1000.0
    assert dc.force(w, 0.05) == pytest.approx(w * 0.05 / 2.0 + 0.03 * w)                       # regime I
    assert dc.force(w, 0.10) == pytest.approx(w * 0.10 / 5.0 + w * (0.03 * 2.0 + 0.06 * 3.0) / 5.0)  # regime II
    assert dc.force(w, -0.10) == -dc.force(w, 0.10)
    assert type(dc.force(w, 0.1)) is float and dc.force(w, np.array([0.05, 0.1])).shape == (2,)
    # A slider as high as its dish radius leaves no radius to slide on.
    with pytest.raises(ValueError, match=r"^slider_height_1 = 2\.0 is not allowed"):
        DoubleConcave(2.0, 0.03, 3.0, 0.06, slider_height_1=2.0)
    full = DoubleConcave(2, np.float64(0.03), 3, np.float64(0.06), slider_height_1=0.1, slider_height_2=0.2,
                         displacement_capacity_1=0.3, displacement_capacity_2=0.4, yield_displacement=np.float64(0.001))
    for f in dataclasses.fields(full):
        assert type(getattr(full, f.name)) is float, f.name
    # A property modification factor multiplies both frictions and keeps everything else.
    assert full.with_friction_factor(1.2) == dataclasses.replace(full, friction_1=0.03 * 1.2, friction_2=0.06 * 1.2)
    # checks(): extreme loads and the restored weight reach the checks.
    with pytest.raises(ValueError, match=r"^axial_load_max = 500\.0 is not allowed"):
        full.checks(1000.0, 0.2, axial_load_max=500.0)
    tension = {c.name: c for c in full.checks(1000.0, 0.2, axial_load_min=-10.0)}["net tension (uplift)"]
    assert tension.value == -10.0 and not tension.passed
    own = next(c for c in full.checks(1000.0, 0.2) if c.name == "restoring force")
    shared = next(c for c in full.checks(1000.0, 0.2, weight_share=2000.0) if c.name == "restoring force")
    assert shared.value == pytest.approx(own.value / 2.0)


def test_double_concave_messages():
    dc = DoubleConcave(2.0, 0.03, 3.0, 0.06)
    with pytest.raises(ValueError) as caught:
        dc.bilinear(1000.0)
    assert str(caught.value).endswith("bilinear() needs equal friction; use backbone() for the multi-regime behaviour")
    with pytest.raises(ValueError, match=r"^friction factor = nan is not allowed"):
        dc.with_friction_factor(math.nan)
