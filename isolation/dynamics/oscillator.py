"""Exact response of damped linear oscillators to piecewise-linear base acceleration.

u'' + 2 zeta w u' + w^2 u = -a(t), with a(t) linear between samples and the
oscillator at rest at t = 0. The state [u, u'] advances by the exact
first-order-hold recurrence x_{n+1} = Phi x_n + E0 a_n + E1 a_{n+1}
(Nigam & Jennings 1969), from the closed-form first-order-hold matrices of
:mod:`isolation.motions.spectrum` (the matrix exponential of the augmented
system, written out for a 2x2 state), and runs as a second-order IIR filter
(scipy.signal.lfilter), so it is exact at any time step.

Used for the fixed-base (linear, classically damped) building by modal
superposition and for floor response spectra.

References
----------
Nigam, N. C. & Jennings, P. C. (1969). Calculation of response spectra from
strong-motion earthquake records. Bull. Seismol. Soc. Am. 59(2).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["oscillator_response", "response_spectrum"]


def _recurrence(omega: float, zeta: float, dt: float):
    """Phi (2x2), E0 (2,), E1 (2,) of the exact first-order-hold recurrence.

    The exponential of the augmented system [[A, b, 0], [0, 0, 1], [0, 0, 0]] dt
    (forcing -a(t), a(t) = a_n + s t over the step) in closed form: the same
    matrices as scipy.linalg.expm of it, to round-off, at a fraction of the cost.
    """
    from isolation.motions.spectrum import _transition

    _, phi, e0, e1 = _transition(np.array([2.0 * math.pi / omega]), dt, zeta)
    return phi[0], e0[0], e1[0]


def oscillator_response(acceleration, dt: float, omega: float, zeta: float):
    """Relative displacement and velocity of a linear oscillator.

    Parameters
    ----------
    acceleration : array (..., steps)
        Base acceleration samples (any consistent unit, e.g. [m/s2]).
    dt : float
        Time step. [s]
    omega : float
        Circular frequency, > 0. [rad/s]
    zeta : float
        Damping ratio, in [0, 1). [-]

    Returns
    -------
    displacement, velocity : arrays (..., steps)
        In the units of acceleration times s^2 and s (e.g. [m], [m/s]).

    References
    ----------
    Nigam, N. C. & Jennings, P. C. (1969). Calculation of response spectra from strong-motion earthquake
    records. Bull. Seismol. Soc. Am. 59(2), 909-922. DOI not verified.
    """
    import scipy.signal  # here: importing scipy.signal takes about a second

    acc = np.asarray(acceleration, dtype=float)
    phi, e0, e1 = _recurrence(omega, zeta, dt)
    trace = phi[0, 0] + phi[1, 1]
    det = phi[0, 0] * phi[1, 1] - phi[0, 1] * phi[1, 0]
    den = np.array([1.0, -trace, det])
    num_u = np.array([e1[0], e0[0] - phi[1, 1] * e1[0] + phi[0, 1] * e1[1],
                      -phi[1, 1] * e0[0] + phi[0, 1] * e0[1]])
    num_v = np.array([e1[1], phi[1, 0] * e1[0] + e0[1] - phi[0, 0] * e1[1],
                      phi[1, 0] * e0[0] - phi[0, 0] * e0[1]])
    u = scipy.signal.lfilter(num_u, den, acc, axis=-1)
    v = scipy.signal.lfilter(num_v, den, acc, axis=-1)
    # The filter starts from x_0 = E1 a_0; the oscillator starts at rest, so
    # remove the free vibration Phi^n E1 a_0 (exact superposition).
    first = acc[..., :1]
    if np.any(first != 0.0):
        impulse = np.zeros(acc.shape[-1])
        impulse[0] = 1.0
        free_u = scipy.signal.lfilter([e1[0], phi[0, 1] * e1[1] - phi[1, 1] * e1[0]], den, impulse)
        free_v = scipy.signal.lfilter([e1[1], phi[1, 0] * e1[0] - phi[0, 0] * e1[1]], den, impulse)
        u = u - first * free_u
        v = v - first * free_v
    return u, v


def response_spectrum(acceleration, dt: float, periods, damping: float = 0.05):
    """Absolute-acceleration response spectrum (peak |u'' + a|).

    Parameters
    ----------
    acceleration : array (..., steps)
        Base (or floor) acceleration. [g] (any unit; the result is in the same unit)
    dt : float
        Time step. [s]
    periods : array (periods,)
        Oscillator periods, > 0. [s]
    damping : float, optional
        Damping ratio. [-]

    Returns
    -------
    array (..., periods)
        Peak absolute acceleration of each oscillator, same unit as the input.
    """
    from isolation.motions.peaks import peak_abs
    from isolation.motions.spectrum import _filters, _transition

    periods = np.atleast_1d(np.asarray(periods, dtype=float))
    acc = np.asarray(acceleration, dtype=float)
    # u'' + a = -(2 zeta w u' + w^2 u): one output row of the same exact recurrence, its peak
    # taken by the compiled loop of isolation.motions.peaks (no history stored).
    omega, phi, e0, e1 = _transition(periods, dt, damping)
    numerator, denominator, state = _filters(phi, e0, e1, np.stack([-(omega**2), -2.0 * damping * omega], axis=1))
    peaks = peak_abs(numerator, denominator, state, acc.reshape(-1, acc.shape[-1]))
    return peaks.reshape(acc.shape[:-1] + (periods.size,))
