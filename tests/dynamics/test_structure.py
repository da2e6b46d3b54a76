"""Shear-building models against closed forms.

Sources
-------
- Uniform fixed-base shear building, N storeys of mass m and stiffness k:
  w_j = 2 sqrt(k/m) sin((2j - 1) pi / (2 (2N + 1)))  [closed form of the
  fixed-free spring-mass chain's tridiagonal eigenproblem, derived; Chopra,
  Dynamics of Structures, shear-beam chain].
- Two-degree-of-freedom isolated building (Kelly 1997, Earthquake-Resistant
  Design with Rubber, ch. 3; Naeim & Kelly 1999): gamma = m/(m + m_b),
  eps = (w_b/w_s)^2, w_b^2 = k_b/(m + m_b), w_s^2 = k_s/m; exact frequencies
  from (1 - gamma) w^4 - (w_b^2 + w_s^2) w^2 + w_b^2 w_s^2 = 0; participation
  L1 = 1 - gamma eps, L2 = gamma eps to first order in eps.
- Effective modal masses sum to the total mass (Chopra, modal analysis).
- Rayleigh damping zeta_j = a0/(2 w_j) + a1 w_j/2 (Chopra, Rayleigh damping).
- Damping of the superstructure acts on storey deformation only, so a
  rigid-body motion of the isolated building draws no damping force
  (Ryan & Polanco 2008, J. Struct. Eng. 134(11)).
"""

import math

import numpy as np
import pytest

from isolation.bearings import Bilinear, FrictionPendulum
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding


def uniform(n=5, m=400.0, k=3.0e5, **kw):
    return ShearBuilding([m] * n, [k] * n, [3.2] * n, **kw)


@pytest.mark.parametrize("n", [1, 3, 5, 8])
def test_uniform_shear_building_frequencies_match_closed_form(n):
    # Closed form for the uniform chain (source in the module docstring).
    m, k = 400.0, 3.0e5
    b = uniform(n, m, k)
    j = np.arange(1, n + 1)
    expected = 2.0 * math.sqrt(k / m) * np.sin((2 * j - 1) * math.pi / (2 * (2 * n + 1)))
    np.testing.assert_allclose(b.modal().frequencies, expected, rtol=1e-10)


def test_effective_masses_sum_to_total_mass_and_shapes_have_unit_roof():
    # Chopra: sum of effective modal masses equals the total mass.
    b = ShearBuilding([500.0, 450.0, 400.0, 300.0], [4e5, 3.5e5, 3e5, 2e5], [4.0, 3.2, 3.2, 3.2])
    modes = b.modal()
    assert modes.effective_masses.sum() == pytest.approx(b.total_mass, rel=1e-10)
    np.testing.assert_allclose(modes.mode_shapes[-1], 1.0)
    # Gamma_j phi_j summed over all modes reproduces the influence vector (Chopra, modal expansion).
    np.testing.assert_allclose(modes.mode_shapes @ modes.participation_factors, 1.0, atol=1e-10)


def test_from_period_reaches_target_and_keeps_profile():
    b = ShearBuilding.from_period(0.8, [500.0] * 4, [3.5] * 4, profile="linear")
    assert b.modal().periods[0] == pytest.approx(0.8, rel=1e-10)
    # profile "linear" as documented in from_period: N at the first storey falling to 1 at the
    # top (hand arithmetic for N = 4: 4, 3, 2, 1).
    ratios = np.asarray(b.stiffnesses) / b.stiffnesses[-1]
    np.testing.assert_allclose(ratios, [4.0, 3.0, 2.0, 1.0])


def test_modal_damping_gives_each_mode_the_ratio():
    # Classical damping: phi_j' C phi_j = 2 zeta w_j phi_j' M phi_j (Chopra).
    b = uniform(4, damping=0.04)
    modes = b.modal()
    phi, c, m = modes.mode_shapes, b.damping_matrix(), b.mass_matrix()
    modal_c = phi.T @ c @ phi
    generalised = np.diag(phi.T @ m @ phi)
    np.testing.assert_allclose(np.diag(modal_c) / (2 * modes.frequencies * generalised), 0.04, rtol=1e-9)
    off = modal_c - np.diag(np.diag(modal_c))
    assert np.abs(off).max() < 1e-8 * np.abs(modal_c).max()


def test_rayleigh_damping_matches_at_first_and_last_mode():
    # Rayleigh: zeta_j = a0/(2 w_j) + a1 w_j / 2, equal to the target at the two anchor modes.
    b = uniform(5, damping=0.05, damping_model="rayleigh")
    ratios = b.modal_damping_ratios()
    assert ratios[0] == pytest.approx(0.05, rel=1e-10)
    assert ratios[-1] == pytest.approx(0.05, rel=1e-10)
    assert np.all(ratios[1:-1] < 0.05)
    a0, a1 = b.rayleigh_coefficients()
    np.testing.assert_allclose(b.damping_matrix(), a0 * b.mass_matrix() + a1 * b.stiffness_matrix())


@pytest.mark.parametrize("model", ["modal", "rayleigh"])
def test_isolated_building_damping_leaves_rigid_body_motion_undamped(model):
    # Ryan & Polanco 2008: the superstructure's damping acts on storey deformation only.
    b = uniform(5, damping_model=model)
    iso = IsolatedBuilding(b, 500.0, Bilinear(2e5, 2e4, 1000.0))
    _, k, c = iso.matrices()
    ones = np.ones(c.shape[0])
    assert np.abs(c @ ones).max() < 1e-9 * np.abs(c).max()
    assert np.abs(k @ ones).max() < 1e-9 * np.abs(k).max()


def test_two_degree_of_freedom_isolated_building_matches_kelly():
    # Kelly (1997): exact quadratic for frequencies, first-order participation factors.
    m, mb, ks, kb = 1000.0, 800.0, 4.0e5, 4.0e3
    superstructure = ShearBuilding([m], [ks], [3.0])
    iso = IsolatedBuilding(superstructure, mb, Bilinear(kb, 0.5 * kb, 0.0))
    modes = iso.modal()
    gamma = m / (m + mb)
    wb2, ws2 = kb / (m + mb), ks / m
    eps = wb2 / ws2
    roots = np.roots([1.0 - gamma, -(wb2 + ws2), wb2 * ws2])
    np.testing.assert_allclose(np.sort(modes.frequencies**2), np.sort(roots), rtol=1e-10)
    # approximate forms, error O(eps^2)
    assert modes.frequencies[0] ** 2 == pytest.approx(wb2 * (1 - gamma * eps), rel=3 * eps**2)
    assert modes.frequencies[1] ** 2 == pytest.approx(ws2 * (1 + gamma * eps) / (1 - gamma), rel=3 * eps**2)
    assert modes.participation_factors[0] == pytest.approx(1 - gamma * eps, abs=3 * eps**2)
    assert modes.participation_factors[1] == pytest.approx(gamma * eps, abs=3 * eps**2)
    # Kelly's first mode shape (base 1, structure relative to base eps): u_s = 1 + eps.
    assert modes.mode_shapes[1, 0] == pytest.approx(1 + eps, rel=3 * eps**2)


def test_rigid_block_on_friction_pendulum_has_pendulum_period():
    # Friction pendulum: T = 2 pi sqrt(R/g), independent of the mass (Zayas, Low & Mahin 1990).
    iso = IsolatedBuilding(ShearBuilding.rigid_block(900.0), 100.0, FrictionPendulum(2.0, 0.05))
    assert iso.matrices()[0].shape == (1, 1)
    assert iso.modal().periods[0] == pytest.approx(2 * math.pi * math.sqrt(2.0 / 9.80665), rel=1e-10)


@pytest.mark.parametrize(
    "kwargs, field",
    [
        (dict(masses=[400.0, -1.0], stiffnesses=[1e5, 1e5], heights=[3.0, 3.0]), "masses[1]"),
        (dict(masses=[400.0, 0.0], stiffnesses=[1e5, 1e5], heights=[3.0, 3.0]), "masses[1]"),
        (dict(masses=[400.0], stiffnesses=[float("nan")], heights=[3.0]), "stiffnesses[0]"),
        (dict(masses=[400.0], stiffnesses=[1e5], heights=[-3.0]), "heights[0]"),
        (dict(masses=[400.0, 400.0], stiffnesses=[1e5], heights=[3.0, 3.0]), "stiffnesses"),
        (dict(masses=[400.0], stiffnesses=[1e5], heights=[3.0], damping=1.2), "damping"),
        (dict(masses=[400.0], stiffnesses=[1e5], heights=[3.0], damping_model="wilson"), "damping_model"),
    ],
)
def test_bad_building_input_names_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field.replace("[", r"\[").replace("]", r"\]")):
        ShearBuilding(**kwargs)


def test_bad_isolated_building_input_names_the_field():
    b = uniform(2)
    with pytest.raises(ValueError, match="base_mass = -5.0 is not allowed"):
        IsolatedBuilding(b, -5.0, Bilinear(1e4, 1e3, 10.0))
    with pytest.raises(ValueError, match="isolator = 'rubber' is not allowed"):
        IsolatedBuilding(b, 100.0, "rubber")
    with pytest.raises(ValueError, match="supplemental_damping"):
        IsolatedBuilding(b, 100.0, Bilinear(1e4, 1e3, 10.0), supplemental_damping=float("nan"))


def test_to_dict_is_plain_json():
    import json

    iso = IsolatedBuilding(uniform(3), 300.0, FrictionPendulum(2.5, 0.06))
    text = json.dumps(iso.to_dict())
    assert "friction_pendulum" in text
    assert json.loads(json.dumps(uniform(3).to_dict()))["periods"][0] > 0
