"""Response spectra of accelerograms, exact for piecewise-linear input.

A linear single-degree-of-freedom oscillator of circular frequency
``w = 2 pi / T`` and damping ratio ``zeta`` under ground acceleration
``a_g(t)`` obeys ``u'' + 2 zeta w u' + w^2 u = -a_g`` (relative
displacement ``u``).  When ``a_g`` varies linearly between samples, the state
``x = (u, u')`` at the sample times follows exactly

    x[n+1] = Phi x[n] + B0 a[n] + B1 a[n+1]

(Nigam & Jennings 1969).  ``Phi``, ``B0`` and ``B1`` are the closed-form
first-order-hold matrices (the matrix exponential of the augmented system
that scipy.signal.lsim uses), so the recurrence is exact for any time step.  Any output ``y = c . x`` then satisfies a
second-order linear difference equation, which runs as one
:func:`scipy.signal.lfilter` call per period over a whole stack of records.
The oscillator starts at rest (``u = u' = 0`` at the first sample), the same
convention as :func:`scipy.signal.lsim`.

Outputs:

* ``SD = max |u|`` (spectral displacement),
* ``PSA = w^2 SD`` (pseudo-spectral acceleration, the quantity of design
  spectra),
* ``PSV = w SD`` (pseudo-spectral velocity),
* ``SA = max |u'' + a_g| = max |2 zeta w u' + w^2 u|`` (absolute spectral
  acceleration; ``SA >= PSA``, and they differ noticeably at long periods
  with high damping).

References
----------
Nigam, N. C. & Jennings, P. C. (1969). Calculation of response spectra from
strong-motion earthquake records. Bull. Seismol. Soc. Am. 59(2), 909-922.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation import GRAVITY
from isolation.motions.peaks import peak_abs
from isolation.validate import finite_array, in_range, one_of, positive, positive_array

__all__ = [
    "response_spectrum",
    "response_spectra",
    "ResponseSpectra",
    "log_periods",
    "ACCELERATION_UNITS",
]

#: Accepted acceleration units and their factor to m/s2.
ACCELERATION_UNITS = {"g": GRAVITY, "m/s2": 1.0, "cm/s2": 0.01}


def log_periods(shortest: float, longest: float, count: int = 80) -> np.ndarray:
    """Periods evenly spaced on a log scale.

    Parameters
    ----------
    shortest : float
        First period. [s]
    longest : float
        Last period. [s]
    count : int
        Number of periods (>= 2). [-]

    Returns
    -------
    numpy.ndarray
        ``count`` periods from ``shortest`` to ``longest``. [s]
    """
    low = positive("shortest", shortest, "s")
    high = positive("longest", longest, "s")
    if high <= low:
        raise ValueError(f"longest = {longest!r} is not allowed: must be > shortest = {low:g} [s]")
    number = int(in_range("count", count, 2, 100000))
    return np.geomspace(low, high, number)


def _check_inputs(acceleration: Any, dt: Any, periods: Any, damping: Any):
    record = finite_array("acceleration", acceleration)
    if record.ndim not in (1, 2):
        raise ValueError(
            f"acceleration with shape {record.shape} is not allowed: "
            "must be 1-D (steps,) or 2-D (records, steps)"
        )
    if record.shape[-1] < 2:
        raise ValueError(
            f"acceleration with {record.shape[-1]} steps is not allowed: must have at least 2 steps"
        )
    step = positive("dt", dt, "s")
    period_array = positive_array("periods", periods, "s")
    if period_array.ndim > 1:
        raise ValueError(
            f"periods with shape {period_array.shape} is not allowed: must be a number or 1-D array [s]"
        )
    zeta = in_range("damping", damping, 0.0, 1.0, high_inclusive=False)
    return record, step, period_array, zeta


def _phi_functions(lam: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """phi1 = (e^x - 1)/x and phi2 = (e^x - 1 - x)/x^2 of complex x, accurate for small |x|."""
    small = np.abs(lam) < 0.5
    safe = np.where(small, 1.0, lam)
    phi1 = np.expm1(safe) / safe
    phi2 = (np.expm1(safe) - safe) / safe**2
    series1 = np.zeros_like(lam)
    series2 = np.zeros_like(lam)
    term = np.ones_like(lam)
    for k in range(24):  # |x| < 0.5: 24 terms reach machine precision
        series1 += term / math.factorial(k + 1)
        series2 += term / math.factorial(k + 2)
        term = term * lam
    return np.where(small, series1, phi1), np.where(small, series2, phi2)


def _transition(periods: np.ndarray, dt: float, zeta: float):
    """Exact first-order-hold matrices ``Phi`` (P,2,2), ``B0`` and ``B1`` (P,2).

    With ``Z = A dt`` (``A`` the oscillator's state matrix, input ``-a_g``
    entering through ``b = (0, -1)``): ``Phi = exp(Z)``,
    ``G1 = dt phi1(Z) b`` (input held over the step) and
    ``G2 = dt phi2(Z) b`` (input ramping over the step), ``B0 = G1 - G2``,
    ``B1 = G2``; the same matrices as the exponential of the augmented
    first-order-hold system that scipy.signal.lsim uses.  A function of the
    2x2 matrix ``Z`` with eigenvalues ``x = alpha +/- i beta`` is
    ``f(Z) = Re f(x) I + (Im f(x) / beta) (Z - alpha I)`` (damping < 1).
    """
    omega = 2.0 * np.pi / periods
    alpha = -zeta * omega * dt
    beta = omega * np.sqrt(1.0 - zeta**2) * dt
    lam = alpha + 1j * beta
    state = np.zeros((periods.size, 2, 2))
    state[:, 0, 1] = 1.0
    state[:, 1, 0] = -(omega**2)
    state[:, 1, 1] = -2.0 * zeta * omega
    shifted = state * dt - alpha[:, None, None] * np.eye(2)

    def matrix(values: np.ndarray) -> np.ndarray:
        return values.real[:, None, None] * np.eye(2) + (values.imag / beta)[:, None, None] * shifted

    phi1, phi2 = _phi_functions(lam)
    load = np.array([0.0, -1.0])
    return omega, matrix(np.exp(lam)), dt * (matrix(phi1) - matrix(phi2)) @ load, dt * matrix(phi2) @ load


def _filters(phi: np.ndarray, b0: np.ndarray, b1: np.ndarray, output: np.ndarray):
    """Difference-equation coefficients of ``y = c . x`` and the start-at-rest state.

    ``output`` is (P, 2): the row vector ``c`` for every period.  Returns the
    numerator (P, 3), the denominator (P, 3) and the lfilter state (P, 2) per
    unit first sample that makes ``x[0] = 0``.
    """
    trace = phi[:, 0, 0] + phi[:, 1, 1]
    determinant = phi[:, 0, 0] * phi[:, 1, 1] - phi[:, 0, 1] * phi[:, 1, 0]
    shifted = phi - trace[:, None, None] * np.eye(2)  # Phi - tr(Phi) I
    lead = np.einsum("pi,pi->p", output, b1)
    q = np.einsum("pi,pij->pj", output, shifted)
    numerator = np.stack(
        [lead, np.einsum("pi,pi->p", output, b0) + np.einsum("pi,pi->p", q, b1), np.einsum("pi,pi->p", q, b0)],
        axis=1,
    )
    denominator = np.stack([np.ones_like(trace), -trace, determinant], axis=1)
    # Fictitious past outputs (past inputs zero) that give y[0] = 0 and the exact y[1].
    past_1 = np.einsum("pi,pi->p", q, b1) / determinant
    past_2 = (lead - denominator[:, 1] * past_1) / determinant
    state = np.stack(
        [-denominator[:, 1] * past_1 - determinant * past_2, -determinant * past_1], axis=1
    )
    return numerator, denominator, state


def _peaks(record: np.ndarray, dt: float, periods: np.ndarray, zeta: float, absolute: bool):
    """Peak |u| and (optionally) peak |u'' + a_g| for every record and period."""
    omega, phi, b0, b1 = _transition(periods, dt, zeta)
    displacement_row = np.tile([1.0, 0.0], (periods.size, 1))
    filters = [_filters(phi, b0, b1, displacement_row)]
    if absolute:
        acceleration_row = np.stack([-(omega**2), -2.0 * zeta * omega], axis=1)
        filters.append(_filters(phi, b0, b1, acceleration_row))
    stack = record.reshape(-1, record.shape[-1])
    result = [peak_abs(numerator, denominator, state, stack).reshape(record.shape[:-1] + (periods.size,))
              for numerator, denominator, state in filters]
    return omega, result


def peak_displacement_times(records: np.ndarray, dt: float, periods: np.ndarray, damping: float):
    """Signed peak relative displacement and its sample index (internal, no input checks).

    Parameters
    ----------
    records : numpy.ndarray
        Ground acceleration, (records, steps). [any unit]
    dt : float
        Time step. [s]
    periods : numpy.ndarray
        Oscillator periods, 1-D. [s]
    damping : float
        Damping ratio. [-]

    Returns
    -------
    tuple of numpy.ndarray
        Signed ``u`` at the peak of ``|u|`` (records, periods) [unit x s^2]
        and the sample index of that peak (records, periods).
    """
    from scipy.signal import lfilter  # here: importing scipy.signal takes about a second

    _, phi, b0, b1 = _transition(periods, dt, damping)
    numerator, denominator, state = _filters(phi, b0, b1, np.tile([1.0, 0.0], (periods.size, 1)))
    first = records[:, :1]
    values = np.empty((records.shape[0], periods.size))
    where = np.empty((records.shape[0], periods.size), dtype=int)
    rows = np.arange(records.shape[0])
    for j in range(periods.size):
        response, _ = lfilter(numerator[j], denominator[j], records, axis=-1, zi=first * state[j])
        index = np.abs(response).argmax(axis=-1)
        where[:, j] = index
        values[:, j] = response[rows, index]
    return values, where


def response_spectrum(acceleration: Any, dt: float, periods: Any, damping: float = 0.05) -> np.ndarray:
    """Pseudo-spectral acceleration of one record or a stack of records.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration sampled every ``dt``, shape (steps,) or
        (records, steps). Any unit; the result has the same unit. [g]
    dt : float
        Time step. [s]
    periods : array_like
        Oscillator periods, a number or 1-D array, all > 0. [s]
    damping : float
        Damping ratio of the oscillators, 0 <= damping < 1. [-]

    Returns
    -------
    numpy.ndarray
        ``PSA = (2 pi / T)^2 max|u|``, shape (periods,) for one record or
        (records, periods) for a stack; a scalar period drops that axis.
        [same unit as ``acceleration``]

    Notes
    -----
    Exact for acceleration varying linearly between samples (Nigam & Jennings
    1969), oscillator at rest at the first sample.

    References
    ----------
    Nigam, N. C. & Jennings, P. C. (1969). Calculation of response spectra from strong-motion earthquake
    records. Bull. Seismol. Soc. Am. 59(2), 909-922. DOI not verified.
    """
    record, step, period_array, zeta = _check_inputs(acceleration, dt, periods, damping)
    flat = np.atleast_1d(period_array)
    omega, (peak_displacement,) = _peaks(record, step, flat, zeta, absolute=False)
    psa = omega**2 * peak_displacement
    return psa[..., 0] if period_array.ndim == 0 else psa


@dataclass(frozen=True)
class ResponseSpectra:
    """Displacement, pseudo-velocity, pseudo-acceleration and absolute acceleration spectra.

    Attributes
    ----------
    periods : numpy.ndarray
        Oscillator periods. [s]
    damping : float
        Damping ratio. [-]
    displacement : numpy.ndarray
        Spectral displacement SD, shape (periods,) or (records, periods). [m]
    pseudo_velocity : numpy.ndarray
        PSV = w SD. [m/s]
    pseudo_acceleration : numpy.ndarray
        PSA = w^2 SD. [g]
    absolute_acceleration : numpy.ndarray
        SA = peak absolute acceleration of the oscillator mass. [g]
    """

    periods: np.ndarray
    damping: float
    displacement: np.ndarray
    pseudo_velocity: np.ndarray
    pseudo_acceleration: np.ndarray
    absolute_acceleration: np.ndarray

    def to_dict(self) -> dict:
        """Plain JSON types; units: periods [s], displacement [m], velocity [m/s], accelerations [g]."""
        return {
            "periods_s": self.periods.tolist(),
            "damping": float(self.damping),
            "displacement_m": self.displacement.tolist(),
            "pseudo_velocity_m_per_s": self.pseudo_velocity.tolist(),
            "pseudo_acceleration_g": self.pseudo_acceleration.tolist(),
            "absolute_acceleration_g": self.absolute_acceleration.tolist(),
        }


def response_spectra(
    acceleration: Any, dt: float, periods: Any, damping: float = 0.05, *, units: str = "g"
) -> ResponseSpectra:
    """All response spectra of one record or a stack of records.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration, shape (steps,) or (records, steps). [``units``]
    dt : float
        Time step. [s]
    periods : array_like
        Oscillator periods, 1-D, all > 0. [s]
    damping : float
        Damping ratio, 0 <= damping < 1. [-]
    units : str
        Unit of ``acceleration``: "g", "m/s2" or "cm/s2".

    Returns
    -------
    ResponseSpectra
        SD [m], PSV [m/s], PSA [g] and SA [g].
    """
    one_of("units", units, ACCELERATION_UNITS)
    record, step, period_array, zeta = _check_inputs(acceleration, dt, periods, damping)
    flat = np.atleast_1d(period_array)
    omega, (peak_displacement, peak_absolute) = _peaks(record, step, flat, zeta, absolute=True)
    to_metres = ACCELERATION_UNITS[units]
    displacement = peak_displacement * to_metres
    frozen = []
    for values in (
        displacement,
        omega * displacement,
        omega**2 * displacement / GRAVITY,
        peak_absolute * to_metres / GRAVITY,
    ):
        values.setflags(write=False)
        frozen.append(values)
    flat = flat.copy()
    flat.setflags(write=False)
    return ResponseSpectra(flat, zeta, *frozen)
