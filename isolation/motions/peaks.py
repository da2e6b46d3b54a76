"""Peak |y| of second-order recurrences over a stack of records, compiled with numba.

The response spectra of :mod:`isolation.motions.spectrum` run one second-order
difference equation per period over every record and keep only the peak of
``|y|``. :func:`peak_abs` does that in one compiled loop without storing the
histories, with the arithmetic of :func:`scipy.signal.lfilter` (transposed
direct form II, ``a[0] = 1``) in the same order, so its peaks are those of
``np.abs(lfilter(b, a, x, zi=...)).max()`` bit for bit where both run in IEEE
double precision without fused multiply-adds. Without numba the same function
runs through lfilter (:func:`peak_abs_filtered`).
"""

from __future__ import annotations

from importlib.util import find_spec

import numpy as np

__all__ = ["peak_abs", "peak_abs_filtered", "available"]

available = find_spec("numba") is not None
"""True when the compiled loop runs."""


def _peak_abs_python(numerator, denominator, state, records, first, out):  # pragma: no cover - compiled
    for r in range(records.shape[0]):
        for p in range(numerator.shape[0]):
            b0, b1, b2 = numerator[p, 0], numerator[p, 1], numerator[p, 2]
            a1, a2 = denominator[p, 1], denominator[p, 2]
            z0 = first[r] * state[p, 0]
            z1 = first[r] * state[p, 1]
            peak = 0.0
            for n in range(records.shape[1]):
                x = records[r, n]
                y = z0 + b0 * x
                z0 = z1 + x * b1 - y * a1
                z1 = x * b2 - y * a2
                size = abs(y)
                if size > peak:
                    peak = size
            out[r, p] = peak


_compiled = None
"""The compiled loop, made on first use: importing numba costs about 0.3 s, which processes that only
validate a study (the command line's parent process) should not pay."""


def _compiled_loop():
    global _compiled
    if _compiled is None and available:
        from numba import njit

        _compiled = njit(cache=True, nogil=True)(_peak_abs_python)
    return _compiled


def peak_abs_filtered(numerator, denominator, state, records) -> np.ndarray:
    """The reference: one :func:`scipy.signal.lfilter` per row of coefficients.

    Parameters
    ----------
    numerator, denominator : numpy.ndarray
        (P, 3) coefficients, ``denominator[:, 0] = 1``. [-]
    state : numpy.ndarray
        (P, 2) lfilter state per unit first sample. [-]
    records : numpy.ndarray
        (R, N) input samples. [any unit]

    Returns
    -------
    numpy.ndarray
        (R, P) peak ``|y|``. [unit of y]
    """
    from scipy.signal import lfilter  # here: importing scipy.signal takes about a second

    first = records[:, :1]
    out = np.empty((records.shape[0], numerator.shape[0]))
    for j in range(numerator.shape[0]):
        response, _ = lfilter(numerator[j], denominator[j], records, axis=-1, zi=first * state[j])
        out[:, j] = np.abs(response).max(axis=-1)
    return out


def peak_abs(numerator, denominator, state, records) -> np.ndarray:
    """Peak ``|y|`` of ``y = lfilter(numerator[p], denominator[p], records[r], zi=records[r, 0] state[p])``.

    Parameters and result as :func:`peak_abs_filtered`; compiled when numba is there.
    """
    loop = _compiled_loop()
    if loop is None:
        return peak_abs_filtered(numerator, denominator, state, records)
    records = np.ascontiguousarray(records, dtype=float)
    out = np.empty((records.shape[0], numerator.shape[0]))
    loop(np.ascontiguousarray(numerator, dtype=float), np.ascontiguousarray(denominator, dtype=float),
              np.ascontiguousarray(state, dtype=float), records, np.ascontiguousarray(records[:, 0]), out)
    return out
