"""Intensity measures (isolation.motions.measures) against closed forms.

Sources named beside each check.  For a = A sin(w t) over whole cycles on
[0, T] (A in m/s2): I_a = pi A^2 T / (4 g), CAV = 2 A T / pi, PGV = 2 A / w
(direct integration; Arias 1970 for the definition of I_a), and
PGD = A T / w since d = (A / w)(t - sin(w t) / w) increases monotonically.
"""

import numpy as np
import pytest
from scipy.integrate import cumulative_trapezoid

from isolation import GRAVITY
from isolation.motions import (
    arias_intensity,
    cumulative_absolute_velocity,
    displacement,
    husid,
    intensity_measures,
    peak_ground_acceleration,
    peak_ground_displacement,
    peak_ground_velocity,
    significant_duration,
    velocity,
)

AMPLITUDE_G = 0.25
CYCLE = 0.8  # forcing period [s]
LENGTH = 20 * CYCLE  # whole cycles [s]
DT = 0.0005


def _sine():
    time = np.arange(int(round(LENGTH / DT)) + 1) * DT
    return AMPLITUDE_G * np.sin(2 * np.pi * time / CYCLE), time


def test_arias_intensity_of_sine():
    # Source: closed form I_a = pi A^2 T / (4 g) (from I_a = pi / (2 g) int a^2 dt, Arias 1970).
    record, _ = _sine()
    amplitude = AMPLITUDE_G * GRAVITY
    assert arias_intensity(record, DT) == pytest.approx(np.pi * amplitude**2 * LENGTH / (4 * GRAVITY), rel=1e-6)


def test_cav_of_sine():
    # Source: closed form CAV = 2 A T / pi (int |sin| over whole cycles).
    record, _ = _sine()
    assert cumulative_absolute_velocity(record, DT) == pytest.approx(2 * AMPLITUDE_G * GRAVITY * LENGTH / np.pi,
                                                                     rel=1e-5)


def test_pgv_pgd_pga_of_sine():
    # Source: closed forms PGV = 2 A / w, PGD = A T / w (integration from rest), PGA = A.
    record, _ = _sine()
    amplitude = AMPLITUDE_G * GRAVITY
    omega = 2 * np.pi / CYCLE
    assert peak_ground_velocity(record, DT) == pytest.approx(2 * amplitude / omega, rel=1e-5)  # O((w dt)^2) sampling
    assert peak_ground_displacement(record, DT) == pytest.approx(amplitude * LENGTH / omega, rel=1e-5)
    assert peak_ground_acceleration(record) == pytest.approx(AMPLITUDE_G, rel=1e-6)


def test_significant_duration_of_sine():
    # Source: closed form: the Husid curve of a steady sine rises as t/T - sin(2 w t)/(2 w T),
    # so D5-95 = 0.9 T within a quarter cycle (Trifunac & Brady 1975 definition).
    record, _ = _sine()
    assert significant_duration(record, DT) == pytest.approx(0.9 * LENGTH, abs=CYCLE / 4)
    curve = husid(record, DT)
    assert curve[0] == 0.0 and curve[-1] == pytest.approx(1.0)
    assert np.all(np.diff(curve) >= 0)


def test_exact_integration_of_a_ramp():
    # Source: closed form for a = c t: v = c t^2 / 2, d = c t^3 / 6 (exact for piecewise-linear input).
    dt, slope = 0.01, 0.3
    time = np.arange(501) * dt
    record = slope * time
    np.testing.assert_allclose(velocity(record, dt), GRAVITY * slope * time**2 / 2, rtol=1e-12, atol=1e-14)
    np.testing.assert_allclose(displacement(record, dt), GRAVITY * slope * time**3 / 6, rtol=1e-10, atol=1e-14)


def test_velocity_against_scipy_trapezoid():
    # Source: scipy.integrate.cumulative_trapezoid (general-purpose reference).
    rng = np.random.default_rng(4)
    record = rng.standard_normal(700) * 0.1
    reference = cumulative_trapezoid(record * GRAVITY, dx=0.01, initial=0.0)
    np.testing.assert_allclose(velocity(record, 0.01), reference, rtol=1e-12, atol=1e-14)


def test_stack_and_record_object():
    # Source: contract of the module (stack -> one value per record, units in to_dict keys).
    record, _ = _sine()
    stack = np.stack([record, 2 * record])
    pga = peak_ground_acceleration(stack)
    np.testing.assert_allclose(pga, [AMPLITUDE_G, 2 * AMPLITUDE_G], rtol=1e-6)
    # Arias intensity scales with the square of the amplitude (definition).
    np.testing.assert_allclose(arias_intensity(stack, DT)[1] / arias_intensity(stack, DT)[0], 4.0, rtol=1e-12)
    measures = intensity_measures(stack, DT)
    assert len(measures) == 2
    assert measures[1].cav == pytest.approx(2 * measures[0].cav, rel=1e-12)
    assert set(measures[0].to_dict()) == {
        "pga_g",
        "pgv_m_per_s",
        "pgd_m",
        "arias_m_per_s",
        "significant_duration_5_95_s",
        "cav_m_per_s",
    }
    assert significant_duration(np.zeros(10), 0.01) == 0.0


@pytest.mark.parametrize(
    "call, field",
    [
        (lambda: arias_intensity([0.1, np.nan, 0.1], 0.01), "acceleration"),
        (lambda: peak_ground_velocity([0.1, 0.2], -0.01), "dt"),
        (lambda: significant_duration([0.1, 0.2, 0.1], 0.01, low=0.9, high=0.5), "high"),
        (lambda: cumulative_absolute_velocity([0.1], 0.01), "acceleration"),
    ],
)
def test_bad_input_names_the_field(call, field):
    # Source: project rule (ValueError naming field, value and what is allowed).
    with pytest.raises(ValueError, match=field):
        call()
