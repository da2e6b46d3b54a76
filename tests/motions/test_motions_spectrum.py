"""Response spectra (isolation.motions.spectrum) against outside sources.

Sources named beside each check:
* scipy.signal.lsim (interp=True: first-order hold, the same exact
  piecewise-linear solution) -> machine precision;
* eqsig.sdof.pseudo_response_spectra (Nigam & Jennings 1969 recurrence,
  PyPI reference library; it replaces PSA by PGA for T < 6 dt, so only
  longer periods are compared);
* pyrotd.calc_spec_accels (frequency-domain PSA, PyPI reference library; we
  pad with zeros ~10x the longest period; it assumes band-limited input, so a
  few % difference at short periods is expected);
* closed forms: harmonic steady state (Chopra, Dynamics of Structures,
  ch. 3) and step response of a damped SDOF (Chopra ch. 4); chapter
  numbers from memory.
"""

import eqsig.sdof
import numpy as np
import pyrotd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.signal import lsim

from isolation import GRAVITY
from isolation.motions import response_spectra, response_spectrum


def _record(steps=1500, dt=0.01, seed=11):
    """Invented test record: enveloped noise with a non-zero first sample [g]."""
    rng = np.random.default_rng(seed)
    time = np.arange(steps) * dt
    return 0.2 * rng.standard_normal(steps) * np.exp(-(((time - 5.0) / 3.0) ** 2)) + 0.05, dt


def _lsim_peaks(record, dt, period, damping):
    """Peak |u| and peak |u'' + a_g| by scipy.signal.lsim (first-order hold)."""
    omega = 2 * np.pi / period
    a = [[0.0, 1.0], [-(omega**2), -2 * damping * omega]]
    b = [[0.0], [-1.0]]
    c = [[1.0, 0.0], [-(omega**2), -2 * damping * omega]]
    d = [[0.0], [0.0]]
    time = np.arange(record.size) * dt
    _, outputs, _ = lsim((a, b, c, d), record, time, interp=True)
    return np.abs(outputs[:, 0]).max(), np.abs(outputs[:, 1]).max()


@pytest.mark.parametrize("damping", [0.0, 0.05, 0.3])
def test_matches_scipy_lsim_to_machine_precision(damping):
    # Source: scipy.signal.lsim with interp=True (exact for piecewise-linear input).
    record, dt = _record()
    periods = np.array([0.02, 0.1, 0.5, 1.0, 3.0, 8.0])
    result = response_spectra(record, dt, periods, damping, units="m/s2")
    for j, period in enumerate(periods):
        peak_u, peak_abs = _lsim_peaks(record, dt, period, damping)
        omega = 2 * np.pi / period
        assert result.displacement[j] == pytest.approx(peak_u, rel=1e-9)
        assert result.pseudo_acceleration[j] * GRAVITY == pytest.approx(omega**2 * peak_u, rel=1e-9)
        assert result.absolute_acceleration[j] * GRAVITY == pytest.approx(peak_abs, rel=1e-9)
    psa = response_spectrum(record, dt, periods, damping)
    np.testing.assert_allclose(psa, result.pseudo_acceleration * GRAVITY, rtol=1e-12)


def test_agrees_with_eqsig_nigam_jennings():
    # Source: eqsig.sdof.pseudo_response_spectra (input m/s2; PSA replaced by PGA for T < 6 dt).
    record, dt = _record(steps=3000, dt=0.005)
    periods = np.geomspace(6 * dt, 6.0, 40)
    _, _, psa = eqsig.sdof.pseudo_response_spectra(record * GRAVITY, dt, periods, 0.05)
    ours = response_spectrum(record, dt, periods, 0.05)
    np.testing.assert_allclose(ours * GRAVITY, psa, rtol=1e-6)


def test_agrees_with_pyrotd_frequency_domain():
    # Source: pyrotd.calc_spec_accels(..., osc_type='psa'), zero padded by 10 x T_max.
    record, dt = _record(steps=2000, dt=0.01, seed=3)
    record = record - record[0]  # start from zero: pyrotd's FFT sees a periodic signal
    record[-200:] = 0.0
    periods = np.geomspace(0.1, 4.0, 25)
    padded = np.concatenate([record, np.zeros(int(10 * periods.max() / dt))])
    reference = pyrotd.calc_spec_accels(dt, padded, 1.0 / periods, 0.05, osc_type="psa")["spec_accel"]
    ours = response_spectrum(record, dt, periods, 0.05)
    ratio = ours / reference
    long = periods >= 20 * dt
    np.testing.assert_allclose(ratio[long], 1.0, atol=0.02)  # a few % (common practice)
    np.testing.assert_allclose(ratio[~long], 1.0, atol=0.06)


@pytest.mark.parametrize("frequency_ratio", [0.5, 1.0, 2.0])
def test_harmonic_steady_state_amplitude(frequency_ratio):
    # Source: closed form (Chopra, Dynamics of Structures, ch. 3, harmonic excitation; from memory):
    # u0 = (a0 / w^2) / sqrt((1 - r^2)^2 + (2 zeta r)^2).
    # Slow cosine ramp over 30 s avoids a start transient above the steady state.
    period, damping, a0, dt = 1.0, 0.05, 0.3, 0.002
    omega = 2 * np.pi / period
    forcing = frequency_ratio * omega
    time = np.arange(int(120.0 / dt)) * dt
    ramp = np.where(time < 30.0, 0.5 - 0.5 * np.cos(np.pi * time / 30.0), 1.0)
    record = a0 * ramp * np.sin(forcing * time)
    amplitude = (a0 / omega**2) / np.sqrt((1 - frequency_ratio**2) ** 2 + (2 * damping * frequency_ratio) ** 2)
    psa = response_spectrum(record, dt, [period], damping)[0]
    assert psa / omega**2 == pytest.approx(amplitude, rel=5e-3)


@pytest.mark.parametrize("damping", [0.0, 0.05, 0.2])
def test_step_response_peak(damping):
    # Source: closed form, damped SDOF under a suddenly applied constant load (Chopra ch. 4, from memory):
    # u_max = (a0 / w^2) (1 + exp(-pi zeta / sqrt(1 - zeta^2))).
    period, a0, dt = 2.0, 0.4, 0.001
    record = np.full(int(6.0 / dt), a0)
    omega = 2 * np.pi / period
    expected = (a0 / omega**2) * (1 + np.exp(-np.pi * damping / np.sqrt(1 - damping**2)))
    psa = response_spectrum(record, dt, [period], damping)[0]
    assert psa / omega**2 == pytest.approx(expected, rel=1e-4)


def test_undamped_absolute_equals_pseudo_acceleration():
    # Source: definition of PSA and equation of motion: with zero damping u'' + a_g = -w^2 u, so SA = PSA.
    record, dt = _record()
    result = response_spectra(record, dt, [0.2, 1.0, 4.0], 0.0)
    np.testing.assert_allclose(result.absolute_acceleration, result.pseudo_acceleration, rtol=1e-9)


def test_absolute_exceeds_pseudo_at_long_period_with_high_damping():
    # Source: Chopra, Dynamics of Structures, ch. 6 (from memory): SA and PSA
    # differ at long periods with high damping, SA above PSA.
    record, dt = _record()
    result = response_spectra(record, dt, [5.0], 0.3)
    assert result.absolute_acceleration[0] > 1.05 * result.pseudo_acceleration[0]


def test_shapes_and_stack_rows_match_single_records():
    # Source: the contract in issue 3 (1-D in -> 1-D out; stack -> (records, periods)).
    first, dt = _record(seed=1)
    second, _ = _record(seed=2)
    periods = [0.1, 0.7, 2.0]
    stack = response_spectrum(np.stack([first, second]), dt, periods)
    assert stack.shape == (2, 3)
    assert response_spectrum(first, dt, periods).shape == (3,)
    np.testing.assert_allclose(stack[1], response_spectrum(second, dt, periods), rtol=1e-12)
    assert np.ndim(response_spectrum(first, dt, 0.7)) == 0


@settings(max_examples=30, deadline=None)
@given(factor=st.floats(min_value=-50, max_value=50).filter(lambda v: abs(v) > 1e-3))
def test_linear_in_amplitude(factor):
    # Source: linearity of the SDOF equation: PSA(c a) = |c| PSA(a).
    record, dt = _record(steps=400)
    periods = [0.15, 1.3]
    np.testing.assert_allclose(
        response_spectrum(factor * record, dt, periods), abs(factor) * response_spectrum(record, dt, periods), rtol=1e-9
    )


@pytest.mark.parametrize(
    "arguments, field",
    [
        (dict(periods=[0.5, -1.0]), "periods"),
        (dict(periods=[0.5, np.nan]), "periods"),
        (dict(damping=1.5), "damping"),
        (dict(dt=0.0), "dt"),
        (dict(acceleration=[0.1, np.inf, 0.2]), "acceleration"),
        (dict(acceleration=np.zeros((2, 2, 5))), "acceleration"),
    ],
)
def test_bad_input_names_the_field(arguments, field):
    # Source: project rule (ValueError naming field, value and what is allowed).
    call = dict(acceleration=np.ones(50), dt=0.01, periods=[0.5], damping=0.05)
    call.update(arguments)
    with pytest.raises(ValueError, match=field):
        response_spectrum(**call)
    with pytest.raises(ValueError, match="units"):
        response_spectra(np.ones(50), 0.01, [0.5], units="ft/s2")


@settings(max_examples=20, deadline=None)
@given(seed=st.integers(0, 10_000), damping=st.sampled_from([0.0, 0.02, 0.05, 0.3]),
       dt=st.sampled_from([0.002, 0.01, 0.02]))
def test_compiled_peaks_equal_scipy_lfilter_bit_for_bit(seed, damping, dt):
    # Source: scipy.signal.lfilter (PyPI reference library), the same transposed direct form II
    # arithmetic: the compiled peak loop must give its peaks exactly, for both outputs (u and
    # u'' + a_g) and a record whose first sample is not zero.
    from isolation.motions import peaks
    from isolation.motions.spectrum import _filters, _transition

    rng = np.random.default_rng(seed)
    records = rng.standard_normal((3, 700)) * 0.3
    records[:, 0] = rng.uniform(-0.2, 0.2, 3)
    periods = np.geomspace(0.03, 6.0, 25)
    omega, phi, b0, b1 = _transition(periods, dt, damping)
    for row in (np.tile([1.0, 0.0], (periods.size, 1)), np.stack([-(omega**2), -2 * damping * omega], axis=1)):
        numerator, denominator, state = _filters(phi, b0, b1, row)
        compiled = peaks.peak_abs(numerator, denominator, state, records)
        assert peaks.available
        np.testing.assert_array_equal(compiled, peaks.peak_abs_filtered(numerator, denominator, state, records))
