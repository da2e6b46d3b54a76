"""Pairs of horizontal components: RotD100 / SRSS spectra, matched pairs, recorded pairs.

Sources
-------
* Boore, D. M. (2010), Bull. Seismol. Soc. Am. 100(4) 1830-1835: RotDnn is the nn-th
  percentile over rotation angles of the peak oscillator response to the rotated pair;
  RotD100 is the maximum.
* pyrotd (PyPI reference library, version 0.6): calc_rotated_spec_accels with percentile 100.
* ASCE/SEI 7-16 §16.2.3.3 (spectral matching: suite average of maximum-direction spectra
  >= 110 % of the target) with §17.3.3 (period range 0.75 T_M upper to 1.25 T_M lower);
  from memory.
* EN 1998-2:2005 §3.2.3(4): average SRSS spectrum of the pairs >= 1.3 x the elastic spectrum
  over 0.2 T to 1.5 T; from memory.
"""

from __future__ import annotations

import numpy as np
import pyrotd
import pytest

from isolation.motions import (
    matched_pairs,
    read_pair,
    response_spectrum,
    rotd100_spectrum,
    rotd_spectrum,
    srss_spectrum,
)
from isolation.site.spectra import CodeSpectrum


def _noise(steps=3000, dt=0.01, seed=1):
    rng = np.random.default_rng(seed)
    time = np.arange(steps) * dt
    envelope = np.sin(np.pi * time / time[-1]) ** 2
    return rng.normal(0.0, 0.1, (2, steps)) * envelope, dt


PERIODS = np.array([0.2, 0.5, 1.0, 2.0, 3.0])


def test_rotd100_equals_brute_force_rotation():
    # Source: Boore (2010) definition, evaluated by explicit rotation over 1,440 angles
    # (angular error of at most 0.0625 degrees: relative error <= 1 - cos(0.0625 deg) = 6e-7).
    pair, dt = _noise()
    exact = rotd100_spectrum(pair, dt, PERIODS)
    brute = rotd_spectrum(pair, dt, PERIODS, percentile=100.0, angles=1440)
    np.testing.assert_allclose(exact, brute, rtol=2e-6)
    assert np.all(exact >= brute * (1 - 1e-12))  # a maximum is never below a sampled maximum


def test_rotd100_against_pyrotd():
    # Source: pyrotd.calc_rotated_spec_accels(percentiles=[100]) (frequency-domain oscillators,
    # zero padded); agreement within a few per cent (common practice for FFT vs exact oscillators).
    pair, dt = _noise(steps=2000, dt=0.01, seed=4)
    pair = pair - pair[:, :1]
    padded = np.concatenate([pair, np.zeros((2, int(10 * PERIODS.max() / dt)))], axis=1)
    reference = pyrotd.calc_rotated_spec_accels(dt, padded[0], padded[1], 1.0 / PERIODS, 0.05, percentiles=[100])
    ours = rotd100_spectrum(pair, dt, PERIODS)
    np.testing.assert_allclose(ours / reference["spec_accel"], 1.0, atol=0.04)


def test_single_component_and_diagonal_pairs():
    # Source: derived from the definition: a pair (a, 0) has RotD100 = Sa(a); a pair (a, a) moves
    # along the diagonal, so RotD100 = sqrt(2) Sa(a) and SRSS = sqrt(2) Sa(a).
    pair, dt = _noise(seed=7)
    record = pair[0]
    single = response_spectrum(record, dt, PERIODS)
    np.testing.assert_allclose(rotd100_spectrum(np.stack([record, 0 * record]), dt, PERIODS), single, rtol=1e-12)
    diagonal = np.stack([record, record])
    np.testing.assert_allclose(rotd100_spectrum(diagonal, dt, PERIODS), np.sqrt(2) * single, rtol=1e-12)
    np.testing.assert_allclose(srss_spectrum(diagonal, dt, PERIODS), np.sqrt(2) * single, rtol=1e-12)


def test_rotd50_between_components_geometric_bounds():
    # Source: Boore (2010): RotD00 <= RotD50 <= RotD100 (percentiles of one set of angles).
    pair, dt = _noise(seed=9)
    d00 = rotd_spectrum(pair, dt, PERIODS, percentile=0.0, angles=180)
    d50 = rotd_spectrum(pair, dt, PERIODS, percentile=50.0, angles=180)
    d100 = rotd100_spectrum(pair, dt, PERIODS)
    assert np.all(d00 <= d50) and np.all(d50 <= d100 * (1 + 1e-9))


SPECTRUM = CodeSpectrum(1.5, 0.6, 8.0)  # invented demo site values [g, g, s]


@pytest.fixture(scope="module")
def asce_pairs():
    return matched_pairs(SPECTRUM, count=7, seed=11, isolated_period=(2.4, 3.1))


def test_matched_pairs_meet_the_asce7_rule(asce_pairs):
    # Source: ASCE/SEI 7-16 §16.2.3.3 + §17.3.3 (from memory): the suite average of RotD100 >= 1.10 x
    # MCE_R over 0.75 T_M,upper to 1.25 T_M,lower; RotD100 recomputed here by brute-force rotation.
    pairs = asce_pairs
    assert pairs.acceleration.shape == (7, 2, 8000)
    assert pairs.dt == 0.005
    assert pairs.check_range == pytest.approx((0.75 * 2.4, 1.25 * 3.1))
    inside = (pairs.periods >= pairs.check_range[0]) & (pairs.periods <= pairs.check_range[1])
    chosen = pairs.periods[inside][:: max(1, inside.sum() // 4)]
    brute = rotd_spectrum(pairs.acceleration, pairs.dt, chosen, percentile=100.0, angles=720)
    target = np.asarray(SPECTRUM.sa(chosen, 0.05))
    assert np.all(brute.mean(axis=0) / target >= 1.10 * (1 - 1e-5))
    check = pairs.check()
    assert check.passed and check.mean_ok and check.spectrum == "RotD100"


def test_matched_pairs_are_weakly_correlated_and_baseline_corrected(asce_pairs):
    # Source: common practice: independently generated components with |rho| below about 0.3
    # count as statistically independent; final velocity and displacement near zero.
    check = asce_pairs.check()
    assert np.all(np.abs(asce_pairs.correlation) < 0.3)
    assert all(check.baseline_ok)
    velocity = np.cumsum(asce_pairs.acceleration, axis=-1)[..., -1] * asce_pairs.dt * 9.80665
    assert np.all(np.abs(velocity) < 0.05)  # trapezoid vs rectangle sum differ by a few mm/s at most


def test_matched_pairs_reproducible_and_seeded(asce_pairs):
    again = matched_pairs(SPECTRUM, count=2, seed=11, isolated_period=(2.4, 3.1))
    other = matched_pairs(SPECTRUM, count=2, seed=12, isolated_period=(2.4, 3.1))
    assert again.seeds == asce_pairs.seeds[:2]
    assert not np.allclose(again.acceleration, other.acceleration)
    repeat = matched_pairs(SPECTRUM, count=2, seed=11, isolated_period=(2.4, 3.1))
    np.testing.assert_array_equal(repeat.acceleration, again.acceleration)


def test_matched_pairs_meet_the_eurocode_srss_rule():
    # Source: EN 1998-2:2005 §3.2.3(4) (from memory): mean SRSS >= 1.3 x target over 0.2 T to 1.5 T.
    pairs = matched_pairs(SPECTRUM, count=7, seed=5, isolated_period=(2.4, 3.1), rule="eurocode")
    assert pairs.check_range == pytest.approx((0.2 * 2.4, 1.5 * 3.1))
    inside = (pairs.periods >= pairs.check_range[0]) & (pairs.periods <= pairs.check_range[1])
    srss = srss_spectrum(pairs.acceleration, pairs.dt, pairs.periods[inside])
    assert np.all(srss.mean(axis=0) / np.asarray(SPECTRUM.sa(pairs.periods[inside], 0.05)) >= 1.3 * (1 - 1e-6))
    assert pairs.check().passed


@pytest.mark.parametrize(
    "field, kwargs",
    [("count", {"count": 0}), ("rule", {"rule": "other"}), ("dt", {"dt": 0.5}), ("damping", {"damping": 0.9})],
)
def test_matched_pairs_bad_input_names_the_field(field, kwargs):
    with pytest.raises(ValueError, match=field):
        matched_pairs(SPECTRUM, **kwargs)


def test_rotd_bad_shape_is_refused():
    with pytest.raises(ValueError, match="pairs, 2, steps"):
        rotd100_spectrum(np.zeros((3, 100)), 0.01, PERIODS)


def test_read_pair_two_files_and_two_columns(tmp_path):
    # Source: derived: values written are read back exactly; the shorter component is zero padded.
    dt = 0.01
    x = np.round(np.sin(np.arange(50) * 0.3) * 0.1, 6)
    y = np.round(np.cos(np.arange(40) * 0.2) * 0.05, 6)
    (tmp_path / "x.csv").write_text("time,a\n" + "".join(f"{i * dt:.2f},{v}\n" for i, v in enumerate(x)))
    (tmp_path / "y.csv").write_text("time,a\n" + "".join(f"{i * dt:.2f},{v}\n" for i, v in enumerate(y)))
    pair = read_pair(tmp_path / "x.csv", "g", second=tmp_path / "y.csv")
    assert pair.dt == pytest.approx(dt)
    np.testing.assert_allclose(pair.acceleration[0], x)
    np.testing.assert_allclose(pair.acceleration[1, :40], y)
    assert np.all(pair.acceleration[1, 40:] == 0.0)
    both = tmp_path / "both.csv"
    both.write_text("time,ax,ay\n" + "".join(f"{i * dt:.2f},{x[i]},{x[i] * 2}\n" for i in range(50)))
    pair = read_pair(both, "g")
    np.testing.assert_allclose(pair.acceleration[1], 2 * x)
    assert pair.correlation == pytest.approx(1.0)


def test_read_pair_refuses_different_steps(tmp_path):
    (tmp_path / "x.csv").write_text("time,a\n0.0,0.0\n0.01,0.1\n0.02,0.0\n")
    (tmp_path / "y.csv").write_text("time,a\n0.0,0.0\n0.02,0.1\n0.04,0.0\n")
    with pytest.raises(ValueError, match="dt"):
        read_pair(tmp_path / "x.csv", "g", second=tmp_path / "y.csv")
