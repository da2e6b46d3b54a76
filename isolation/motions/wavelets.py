"""Time-domain refinement of matched records with adjustment wavelets.

After the frequency-domain iteration, the remaining misfit at the worst
control periods is removed by adding small wavelets at the times of the
oscillator peaks (Lilhanand & Tseng 1988; Abrahamson 1992; Hancock et al.
2006), using the wavelet of Al Atik & Abrahamson (2010):

    f_j(t) = cos(w'_j s) exp(-(s / gamma_j)^2),   s = t - t_j + dt_j,
    w'_j = w_j sqrt(1 - zeta^2),  gamma_j = 1.178 f_j^-0.93 [s],
    dt_j = arctan(sqrt(1 - zeta^2) / zeta) / w'_j,

with ``t_j`` the time of the peak response at period ``T_j`` and ``f_j`` its
frequency in Hz.  The wavelet amplitudes ``b`` solve ``C b = dR``, where
``C_ij`` is the pseudo-acceleration of oscillator ``i`` at ``t_i`` due to
wavelet ``j`` (convolution with the damped impulse response, Riemann sum)
and ``dR_i`` the misfit with the sign of the current peak.  Only the worst
control periods of each record enter one step; the caller re-applies its
taper and baseline correction and keeps the best iterate, so the final
spectra are always recomputed exactly.

References
----------
Al Atik, L. & Abrahamson, N. (2010). An improved method for nonstationary
spectral matching. Earthquake Spectra 26(3), 601-617.
Hancock, J. et al. (2006). An improved method of matching response spectra
of recorded earthquake ground motion using wavelets. J. Earthq. Eng. 10, 67-89.
"""

from __future__ import annotations

import numpy as np

from isolation.motions.spectrum import peak_displacement_times

__all__ = ["adjustment_wavelets", "wavelet_step"]


def adjustment_wavelets(time: np.ndarray, periods: np.ndarray, peak_times: np.ndarray, damping: float) -> np.ndarray:
    """Al Atik & Abrahamson (2010) wavelets, one row per period.

    Parameters
    ----------
    time : numpy.ndarray
        Sample times. [s]
    periods : numpy.ndarray
        Periods the wavelets act on. [s]
    peak_times : numpy.ndarray
        Times at which each oscillator should peak. [s]
    damping : float
        Damping ratio, 0 < damping < 1. [-]

    Returns
    -------
    numpy.ndarray
        Wavelets of unit amplitude, (periods, steps). [-]

    References
    ----------
    Al Atik, L. & Abrahamson, N. (2010). An improved method for nonstationary spectral matching. Earthquake
    Spectra 26(3), 601-617. doi:10.1193/1.3459159
    Hancock, J. et al. (2006). An improved method of matching response spectra of recorded earthquake ground
    motion using wavelets. J. Earthq. Eng. 10, 67-89. DOI not verified.
    """
    omega = 2.0 * np.pi / periods
    damped = omega * np.sqrt(1.0 - damping**2)
    width = 1.178 * (1.0 / periods) ** -0.93
    shift = np.arctan(np.sqrt(1.0 - damping**2) / damping) / damped
    s = time[None, :] - peak_times[:, None] + shift[:, None]
    return np.cos(damped[:, None] * s) * np.exp(-((s / width[:, None]) ** 2))


def _impulse_rows(time: np.ndarray, periods: np.ndarray, peak_times: np.ndarray, damping: float) -> np.ndarray:
    """h_i(t_i - tau) of u'' + 2 zeta w u' + w^2 u = p, zero after t_i, (periods, steps)."""
    omega = 2.0 * np.pi / periods
    damped = omega * np.sqrt(1.0 - damping**2)
    lag = peak_times[:, None] - time[None, :]
    causal = np.maximum(lag, 0.0)
    rows = np.exp(-damping * omega[:, None] * causal) * np.sin(damped[:, None] * causal) / damped[:, None]
    rows[lag < 0.0] = 0.0
    return rows


def wavelet_step(
    records: np.ndarray,
    dt: float,
    periods: np.ndarray,
    damping: float,
    aim: np.ndarray,
    *,
    worst: int = 20,
    relaxation: float = 0.8,
    rcond: float = 1e-2,
) -> tuple[np.ndarray, np.ndarray]:
    """One wavelet adjustment of every record; returns (new records, misfit before).

    Parameters
    ----------
    records : numpy.ndarray
        Ground acceleration, (records, steps). [g]
    dt : float
        Time step. [s]
    periods : numpy.ndarray
        Control periods. [s]
    damping : float
        Damping ratio. [-]
    aim : numpy.ndarray
        Pseudo-spectral acceleration to reach at ``periods``. [g]
    worst : int
        Number of worst control periods adjusted per record and step. [-]
    relaxation : float
        Fraction of the computed correction applied. [-]

    Returns
    -------
    tuple of numpy.ndarray
        Adjusted records (records, steps) [g] and the largest |log(PSA / aim)|
        of each record before the step [-].

    References
    ----------
    Al Atik, L. & Abrahamson, N. (2010). An improved method for nonstationary spectral matching. Earthquake
    Spectra 26(3), 601-617. doi:10.1193/1.3459159
    Hancock, J. et al. (2006). An improved method of matching response spectra of recorded earthquake ground
    motion using wavelets. J. Earthq. Eng. 10, 67-89. DOI not verified.
    """
    omega = 2.0 * np.pi / periods
    peak, index = peak_displacement_times(records, dt, periods, damping)
    pseudo = omega**2 * peak
    misfit = np.abs(np.log(np.abs(pseudo) / aim))
    time = np.arange(records.shape[1]) * dt
    adjusted = records.copy()
    for row in range(records.shape[0]):
        chosen = np.argsort(misfit[row])[::-1][:worst]
        chosen = chosen[misfit[row, chosen] > 0.01]
        if chosen.size == 0:
            continue
        chosen_periods = periods[chosen]
        wavelets = adjustment_wavelets(time, chosen_periods, index[row, chosen] * dt, damping)
        impulses = _impulse_rows(time, periods, index[row] * dt, damping)
        influence = -(omega**2)[:, None] * dt * (impulses @ wavelets.T)
        wanted = np.sign(pseudo[row]) * aim - pseudo[row]
        amplitudes, *_ = np.linalg.lstsq(influence, wanted, rcond=rcond)
        adjusted[row] += relaxation * amplitudes @ wavelets
    return adjusted, misfit.max(axis=1)
