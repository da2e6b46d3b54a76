"""Intensity envelopes of synthetic ground motions.

The envelope (after Jennings, Housner & Tsai 1968) rises quadratically,
stays flat through the strong-motion phase and decays exponentially.  Its
plateau is sized so that the envelope's own significant duration D5-95
(Trifunac & Brady 1975, on ``e(t)^2``) equals the requested one, which comes
from the magnitude when not given (:func:`typical_significant_duration`).

References
----------
Jennings, P. C., Housner, G. W. & Tsai, N. C. (1968). Simulated earthquake
motions. EERL, Caltech.
Kempton, J. J. & Stewart, J. P. (2006). Prediction equations for significant
duration of earthquake ground motions. Earthquake Spectra 22(4), 985-1013.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from isolation.motions.measures import husid
from isolation.validate import finite_array, in_range, positive

__all__ = ["typical_significant_duration", "intensity_envelope"]


def typical_significant_duration(magnitude: float) -> float:
    """Typical D5-95 on rock for a magnitude, centre of published ranges.

    ``D = 13 exp(0.63 (M - 7))``: about 9.5 s at Mw 6.5, 13 s at Mw 7.0 and
    18 s at Mw 7.5 (from memory, after Kempton & Stewart 2006).

    Parameters
    ----------
    magnitude : float
        Moment magnitude, 5 to 8.5. [-]

    Returns
    -------
    float
        Significant duration D5-95. [s]
    """
    value = in_range("magnitude", magnitude, 5.0, 8.5)
    return 13.0 * math.exp(0.63 * (value - 7.0))


def _envelope_shape(time: np.ndarray, start: float, rise: float, plateau: float, decay: float) -> np.ndarray:
    shifted = time - start
    shape = np.zeros_like(time)
    rising = (shifted > 0) & (shifted < rise)
    shape[rising] = (shifted[rising] / rise) ** 2
    flat = (shifted >= rise) & (shifted <= rise + plateau)
    shape[flat] = 1.0
    after = shifted > rise + plateau
    shape[after] = np.exp(-decay * (shifted[after] - rise - plateau))
    return shape


def intensity_envelope(time: Any, significant_duration: float) -> np.ndarray:
    """Amplitude envelope whose own D5-95 equals ``significant_duration``.

    Quadratic rise over ``0.15 D`` after 0.5 s of quiet, plateau, then
    exponential decay to 5 % amplitude over ``0.5 D``; the plateau length is
    found by bisection so that D5-95 of ``e(t)^2`` equals ``D``.

    Parameters
    ----------
    time : array_like
        Sample times, uniform, from 0. [s]
    significant_duration : float
        Intended D5-95. [s]

    Returns
    -------
    numpy.ndarray
        Envelope values between 0 and 1 at ``time``. [-]

    References
    ----------
    Jennings, P. C., Housner, G. W. & Tsai, N. C. (1968). Simulated earthquake motions. Earthquake Engineering
    Research Laboratory, California Institute of Technology (a report, no DOI).
    """
    grid = finite_array("time", time, "s")
    target = positive("significant_duration", significant_duration, "s")
    start, rise = 0.5, max(0.5, 0.15 * target)
    decay = math.log(20.0) / (0.5 * target)
    needed = start + rise + 1.5 * 0.5 * target
    if needed + target > grid[-1]:
        raise ValueError(
            f"significant_duration = {significant_duration!r} is not allowed with duration "
            f"{grid[-1]:.4g} s: must be <= {(grid[-1] - start) / 1.9:.3g} [s] (or use a longer duration)"
        )
    step = grid[1] - grid[0]

    def d595(plateau: float) -> float:
        curve = husid(_envelope_shape(grid, start, rise, plateau, decay), step)
        return float(np.interp(0.95, curve, grid) - np.interp(0.05, curve, grid))

    low, high = 0.0, grid[-1] - needed
    if d595(high) < target:
        raise ValueError(
            f"significant_duration = {significant_duration!r} is not allowed with duration "
            f"{grid[-1]:.4g} s: too long for the record [s] (use a longer duration)"
        )
    for _ in range(40):
        middle = 0.5 * (low + high)
        low, high = (middle, high) if d595(middle) < target else (low, middle)
    return _envelope_shape(grid, start, rise, 0.5 * (low + high), decay)
