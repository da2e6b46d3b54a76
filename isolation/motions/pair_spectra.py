"""Spectra of pairs of orthogonal horizontal components: RotD100, RotD-nn and SRSS.

For a pair of components ``a_x(t), a_y(t)`` and an oscillator of period T,
the response to the ground motion along the direction at angle theta is
``u_theta(t) = u_x(t) cos(theta) + u_y(t) sin(theta)`` (linear oscillator,
same period in every direction).  Its peak over all angles is the peak of
the resultant ``|u(t)| = sqrt(u_x^2 + u_y^2)``, since the projection of a
vector on a unit direction never exceeds its length and equals it along the
vector itself.  So the maximum-direction spectrum is

    RotD100(T) = (2 pi / T)^2 max_t sqrt(u_x(t)^2 + u_y(t)^2),

without any search over angles (Boore 2010 defines RotDnn as the nn-th
percentile over angles of the peak of ``u_theta``; nn = 100 is the maximum).
:func:`rotd_spectrum` gives any percentile by brute-force rotation, which the
tests use as the independent check of :func:`rotd100_spectrum`.

SRSS spectrum: ``sqrt(Sa_x^2 + Sa_y^2)`` of the two components' 5 %-damped
pseudo-acceleration spectra (the pair rule of EN 1998-2:2005 §3.2.3(4),
from memory).

References
----------
Boore, D. M. (2010). Orientation-independent, nongeometric-mean measures of
seismic intensity from two horizontal components of motion. Bull. Seismol.
Soc. Am. 100(4), 1830-1835. doi:10.1785/0120090400
"""

from __future__ import annotations

from typing import Any

import numpy as np

from isolation.motions.spectrum import _check_inputs, _filters, _transition, response_spectrum

__all__ = ["rotd100_spectrum", "rotd_spectrum", "srss_spectrum", "component_correlation"]


def _pairs(acceleration: Any) -> np.ndarray:
    pair = np.asarray(acceleration, dtype=float)
    if pair.ndim == 2:
        pair = pair[None]
    if pair.ndim != 3 or pair.shape[1] != 2:
        raise ValueError(
            f"acceleration has shape {np.shape(acceleration)}: must be (2, steps) or (pairs, 2, steps) [g]"
        )
    return pair


def _displacements(pair: np.ndarray, dt: float, periods: np.ndarray, zeta: float):
    """Relative displacement histories (pairs, 2, periods, steps) per unit of the input's unit x s^2."""
    from scipy.signal import lfilter  # here: importing scipy.signal takes about a second

    _, phi, b0, b1 = _transition(periods, dt, zeta)
    numerator, denominator, state = _filters(phi, b0, b1, np.tile([1.0, 0.0], (periods.size, 1)))
    first = pair[..., :1]
    out = np.empty(pair.shape[:2] + (periods.size, pair.shape[-1]))
    for j in range(periods.size):
        out[:, :, j], _ = lfilter(numerator[j], denominator[j], pair, axis=-1, zi=first * state[j])
    return out


def rotd100_spectrum(acceleration: Any, dt: float, periods: Any, damping: float = 0.05) -> np.ndarray:
    """Maximum-direction (RotD100) pseudo-spectral acceleration of component pairs.

    Parameters
    ----------
    acceleration : array_like
        Pairs of orthogonal horizontal components, shape (2, steps) or
        (pairs, 2, steps). [g]
    dt : float
        Time step. [s]
    periods : array_like
        Oscillator periods, 1-D, all > 0. [s]
    damping : float
        Damping ratio, 0 <= damping < 1. [-]

    Returns
    -------
    numpy.ndarray
        RotD100, shape (periods,) for one pair or (pairs, periods). [g]

    References
    ----------
    Boore, D. M. (2010). Orientation-independent, nongeometric-mean measures of seismic intensity from two
    horizontal components of motion. Bull. Seismol. Soc. Am. 100(4), 1830-1835. doi:10.1785/0120090400
    """
    pair = _pairs(acceleration)
    _, step, period_array, zeta = _check_inputs(pair[:, 0], dt, periods, damping)
    flat = np.atleast_1d(period_array)
    omega = 2.0 * np.pi / flat
    peak = np.empty((pair.shape[0], flat.size))
    for j in range(flat.size):
        u = _displacements(pair, step, flat[j : j + 1], zeta)[:, :, 0]
        peak[:, j] = np.sqrt((u**2).sum(axis=1)).max(axis=-1)
    result = omega**2 * peak
    return result[0] if np.ndim(acceleration) == 2 else result


def rotd_spectrum(
    acceleration: Any, dt: float, periods: Any, damping: float = 0.05, percentile: float = 50.0, angles: int = 180
) -> np.ndarray:
    """RotDnn pseudo-spectral acceleration by explicit rotation over ``angles`` directions in [0, 180) degrees.

    Parameters
    ----------
    acceleration : array_like
        Pairs, shape (2, steps) or (pairs, 2, steps). [g]
    dt : float
        Time step. [s]
    periods : array_like
        Oscillator periods, 1-D. [s]
    damping : float
        Damping ratio. [-]
    percentile : float
        Percentile over angles, 0 to 100 (50: RotD50, 100: RotD100). [-]
    angles : int
        Number of equally spaced directions. [-]

    Returns
    -------
    numpy.ndarray
        (periods,) for one pair or (pairs, periods). [g]

    References
    ----------
    Boore, D. M. (2010). Orientation-independent, nongeometric-mean measures of seismic intensity from two
    horizontal components of motion. Bull. Seismol. Soc. Am. 100(4), 1830-1835. doi:10.1785/0120090400
    """
    pair = _pairs(acceleration)
    if not 0.0 <= float(percentile) <= 100.0:
        raise ValueError(f"percentile = {percentile!r} is not allowed: must lie in [0, 100] [-]")
    if int(angles) < 2:
        raise ValueError(f"angles = {angles!r} is not allowed: must be a whole number >= 2 [-]")
    _, step, period_array, zeta = _check_inputs(pair[:, 0], dt, periods, damping)
    flat = np.atleast_1d(period_array)
    theta = np.arange(int(angles)) * np.pi / int(angles)
    direction = np.stack([np.cos(theta), np.sin(theta)])  # (2, angles)
    result = np.empty((pair.shape[0], flat.size))
    for j in range(flat.size):
        u = _displacements(pair, step, flat[j : j + 1], zeta)[:, :, 0]  # (pairs, 2, steps)
        peaks = np.abs(np.einsum("pcs,ca->pas", u, direction)).max(axis=-1)  # (pairs, angles)
        result[:, j] = np.percentile(peaks, percentile, axis=-1) * (2.0 * np.pi / flat[j]) ** 2
    return result[0] if np.ndim(acceleration) == 2 else result


def srss_spectrum(acceleration: Any, dt: float, periods: Any, damping: float = 0.05) -> np.ndarray:
    """Square root of the sum of the squares of the two components' PSA spectra.

    Parameters
    ----------
    acceleration : array_like
        Pairs, shape (2, steps) or (pairs, 2, steps). [g]
    dt : float
        Time step. [s]
    periods : array_like
        Oscillator periods, 1-D. [s]
    damping : float
        Damping ratio. [-]

    Returns
    -------
    numpy.ndarray
        (periods,) for one pair or (pairs, periods). [g]
    """
    pair = _pairs(acceleration)
    flat = np.atleast_1d(np.asarray(periods, dtype=float))
    components = response_spectrum(pair.reshape(-1, pair.shape[-1]), dt, flat, damping).reshape(
        pair.shape[0], 2, flat.size
    )
    result = np.sqrt((components**2).sum(axis=1))
    return result[0] if np.ndim(acceleration) == 2 else result


def component_correlation(acceleration: Any) -> np.ndarray:
    """Pearson correlation coefficient of the two components of each pair.

    Parameters
    ----------
    acceleration : array_like
        Pairs, shape (2, steps) or (pairs, 2, steps). [g]

    Returns
    -------
    numpy.ndarray
        One coefficient per pair, in [-1, 1] (a scalar array for one pair). [-]
    """
    pair = _pairs(acceleration)
    x = pair[:, 0] - pair[:, 0].mean(axis=-1, keepdims=True)
    y = pair[:, 1] - pair[:, 1].mean(axis=-1, keepdims=True)
    result = (x * y).sum(axis=-1) / np.sqrt((x * x).sum(axis=-1) * (y * y).sum(axis=-1))
    return result[0] if np.ndim(acceleration) == 2 else result
