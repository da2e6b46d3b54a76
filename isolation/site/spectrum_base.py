"""What every site spectrum shares: damping, spectral displacement and the period-range check.

Subclasses (:mod:`isolation.site.spectra`) give ``period_range`` [s],
``_sa5(period)`` (pseudo-acceleration at 5 % damping [g]) and ``rule`` (their
default damping rule, :func:`isolation.site.damping.damping_coefficient`).
"""

from __future__ import annotations

import math

import numpy as np

from isolation import GRAVITY, validate
from isolation.site.damping import _checked_array, _unwrap, damping_coefficient, rules

__all__: list[str] = []


class _Spectrum:
    """Shared behaviour: damping, displacement, period checks."""

    rule: str

    @property
    def period_range(self) -> tuple[float, float]:
        """(shortest, longest) period at which the spectrum is defined. [s]"""
        raise NotImplementedError

    def _sa5(self, period: np.ndarray) -> np.ndarray:
        """Pseudo-acceleration at 5 % damping. [g]"""
        raise NotImplementedError

    def _periods(self, period) -> np.ndarray:
        array = _checked_array("period", period, "s")
        low, high = self.period_range
        bad = (array < low) | (array > high)
        if bad.any():
            value = float(array[tuple(np.argwhere(bad)[0])]) if array.ndim else float(array)
            raise ValueError(
                f"period = {value!r} is not allowed: must lie in [{low:g}, {high:g}] "
                f"for this {type(self).__name__} [s]{self._range_hint()}"
            )
        return array

    def _range_hint(self) -> str:
        """Extra advice appended to the out-of-range period message."""
        return ""

    def sa(self, period, damping=0.05, *, rule: str | None = None):
        """Spectral pseudo-acceleration.

        Parameters
        ----------
        period : float or array
            Natural period, inside :attr:`period_range`. [s]
        damping : float or array
            Damping ratio, 0 <= damping <= 1. [-]
        rule : str, optional
            Damping rule (see :func:`damping_coefficient`); default :attr:`rule`.

        Returns
        -------
        float or array
            Pseudo-acceleration. [g]
        """
        t = self._periods(period)
        chosen = self.rule if rule is None else validate.one_of("rule", rule, rules())
        out = self._sa5(t) / np.asarray(damping_coefficient(damping, chosen))
        return _unwrap(np.asarray(out, dtype=float))

    def sd(self, period, damping=0.05, *, rule: str | None = None):
        """Spectral displacement g Sa T^2/(4 pi^2).

        Parameters
        ----------
        period : float or array
            Natural period, inside :attr:`period_range`. [s]
        damping : float or array
            Damping ratio, 0 <= damping <= 1. [-]
        rule : str, optional
            Damping rule; default :attr:`rule`.

        Returns
        -------
        float or array
            Spectral displacement. [m]
        """
        t = self._periods(period)
        sa = np.asarray(self.sa(t, damping, rule=rule))
        return _unwrap(GRAVITY * sa * t**2 / (4.0 * math.pi**2))
