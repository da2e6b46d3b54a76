"""Frequency-domain shaping of synthetic records for spectrum matching.

The time envelope, taper, baseline correction and Fourier amplitude correction
that :func:`isolation.motions.matching.matched_suite` (and the matched pairs of
:mod:`isolation.motions.pairs`) iterate with: :func:`_shaping` builds them once
per suite, :func:`_starting_records` draws the seeded starting records.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.fft import irfft, next_fast_len, rfft, rfftfreq

from isolation.motions.envelope import intensity_envelope
from isolation.motions.measures import displacement, velocity

__all__: list[str] = []


_KAPPA = 1.0  # exponent of the amplitude correction


_TAIL_FLOOR = 0.1  # after the plateau, amplitudes are capped at envelope / 0.1


def _baseline(records: np.ndarray, shapes: np.ndarray, solver: np.ndarray, dt: float) -> np.ndarray:
    """Remove c0 e + c1 e t/T so that final velocity and displacement are zero."""
    ends = np.stack([velocity(records, dt)[..., -1], displacement(records, dt)[..., -1]], axis=-1)
    coefficients = ends @ solver.T
    return records - coefficients @ shapes


@dataclass(frozen=True)
class _Shaping:
    """Time and frequency grids shared by every iteration of a matching run.

    ``envelope`` and ``taper`` shape records in time; ``spread`` maps values
    at the control periods onto the FFT frequencies (linear in log
    frequency); ``correct`` applies one frequency-domain amplitude correction
    followed by the taper and the baseline correction.
    """

    steps: int
    step: float
    envelope: np.ndarray
    taper: np.ndarray
    shapes: np.ndarray
    solver: np.ndarray
    size: int
    frequency: np.ndarray
    positive_frequency: np.ndarray
    high_pass: np.ndarray
    index: np.ndarray
    weight: np.ndarray

    def spread(self, values: np.ndarray) -> np.ndarray:
        """Values at the control periods (ascending periods) -> values at the FFT frequencies."""
        reversed_values = values[..., ::-1]
        return reversed_values[..., self.index] * (1 - self.weight) + reversed_values[..., self.index + 1] * self.weight

    def baseline(self, records: np.ndarray) -> np.ndarray:
        """Remove c0 e + c1 e t/T so that final velocity and displacement are zero (last axis = time)."""
        flat = records.reshape(-1, records.shape[-1])
        return _baseline(flat, self.shapes, self.solver, self.step).reshape(records.shape)

    def correct(self, records: np.ndarray, ratio: np.ndarray) -> np.ndarray:
        """Scale Fourier amplitudes by ``ratio ** -kappa`` (ratio per control period, broadcast over records)."""
        fourier = rfft(records, self.size, axis=-1)
        fourier *= self.spread(ratio ** -_KAPPA) * self.high_pass
        corrected = irfft(fourier, self.size, axis=-1)[..., : self.steps] * self.taper
        return self.baseline(corrected)


def _starting_records(shaping: _Shaping, aim: np.ndarray, seeds) -> np.ndarray:
    """Random-phase records with amplitudes following ``aim``, enveloped, tapered and baseline-corrected."""
    start_amplitude = shaping.spread(aim) / np.sqrt(shaping.positive_frequency) * shaping.high_pass
    phases = np.stack(
        [np.random.default_rng(s).uniform(0.0, 2.0 * np.pi, shaping.frequency.size) for s in seeds]
    )
    records = irfft(start_amplitude * np.exp(1j * phases), shaping.size, axis=-1)[:, : shaping.steps]
    return shaping.baseline(records * shaping.envelope * shaping.taper)


def _shaping(length: float, step: float, strong: float, periods: np.ndarray, high: float, magnitude) -> _Shaping:
    """Envelope, tapers, baseline shapes and frequency grids of one matching run."""
    steps = int(round(length / step))
    time = np.arange(steps) * step
    try:
        envelope = intensity_envelope(time, strong)
    except ValueError as error:
        if magnitude is None:
            raise
        raise ValueError(
            f"magnitude = {magnitude!r} is not allowed with duration = {length:g} s: its typical D5-95 of "
            f"{strong:.3g} s does not fit ({error}); give a longer duration or significant_duration [s]"
        ) from None
    taper = np.ones(steps)
    ramp = min(int(round(0.25 / step)), steps // 10)
    taper[:ramp] = 0.5 - 0.5 * np.cos(np.pi * np.arange(ramp) / ramp)
    taper[steps - ramp:] = taper[:ramp][::-1]
    peak = int(np.argmax(envelope >= 1.0))
    taper[peak:] *= np.minimum(1.0, envelope[peak:] / _TAIL_FLOOR)
    shapes = np.stack([envelope, envelope * time / length])
    ends = np.stack(
        [velocity(shapes, step)[:, -1], displacement(shapes, step)[:, -1]], axis=0
    )  # rows: final velocity, final displacement; columns: shapes
    solver = np.linalg.inv(ends)

    size = next_fast_len(steps + steps // 2)
    frequency = rfftfreq(size, step)
    cut = 1.0 / (2.0 * high)
    positive_f = np.maximum(frequency, frequency[1] * 1e-3)
    high_pass = 1.0 / np.sqrt(1.0 + (cut / positive_f) ** 8)
    high_pass[0] = 0.0
    points = periods.size
    log_control = np.log(1.0 / periods[::-1])
    where = np.clip(np.log(positive_f), log_control[0], log_control[-1])
    index = np.clip(np.searchsorted(log_control, where) - 1, 0, points - 2)
    weight = (where - log_control[index]) / (log_control[index + 1] - log_control[index])
    return _Shaping(steps, step, envelope, taper, shapes, solver, size, frequency, positive_f, high_pass, index, weight)
