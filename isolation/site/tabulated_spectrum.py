"""A site spectrum from a table of periods and pseudo-accelerations (site-specific or multi-period data).

Re-exported by :mod:`isolation.site.spectra` with the code spectra.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from isolation import validate
from isolation.codes.registry import DEFAULT_BASIS
from isolation.site.damping import damping_coefficient, rules
from isolation.site.spectrum_base import _Spectrum

__all__ = ["TabulatedSpectrum"]


@dataclass(frozen=True)
class TabulatedSpectrum(_Spectrum):
    """A spectrum from a table of periods and pseudo-accelerations.

    Parameters
    ----------
    periods : sequence of float
        Periods, strictly increasing, >= 0 (only the first may be 0); at
        least two. [s]
    values : sequence of float
        Pseudo-accelerations at ``damping``, > 0. [g]
    damping : float
        Damping ratio the table belongs to. [-]
    rule : str
        Damping rule used to move to other damping ratios. [-]

    Notes
    -----
    Interpolation is linear in log(T)-log(Sa); a segment starting at T = 0
    is interpolated linearly. Other damping: Sa(beta) = Sa_table B(damping)/B(beta).
    Periods outside the table raise ValueError (no extrapolation).
    """

    periods: tuple
    values: tuple
    damping: float = 0.05
    rule: str = DEFAULT_BASIS

    def __post_init__(self) -> None:
        t = validate.finite_array("periods", self.periods, "s")
        v = validate.positive_array("values", self.values, "g")
        if t.ndim != 1 or t.size < 2:
            raise ValueError(f"periods = {self.periods!r} is not allowed: must be a list of at least 2 periods [s]")
        if v.shape != t.shape:
            raise ValueError(
                f"values has {v.size} entries but periods has {t.size}: must be the same length"
            )
        if t[0] < 0.0 or np.any(t[1:] <= 0.0):
            raise ValueError(f"periods = {t.tolist()!r} is not allowed: must be >= 0 (only the first may be 0) [s]")
        if np.any(np.diff(t) <= 0.0):
            i = int(np.argmax(np.diff(t) <= 0.0)) + 1
            raise ValueError(
                f"periods[{i}] = {float(t[i])!r} is not allowed: must be strictly increasing "
                f"(previous {float(t[i - 1])!r}) [s]"
            )
        beta = validate.in_range("damping", self.damping, 0.0, 1.0, "-", low_inclusive=False)
        validate.one_of("rule", self.rule, rules())
        object.__setattr__(self, "periods", tuple(float(x) for x in t))
        object.__setattr__(self, "values", tuple(float(x) for x in v))
        object.__setattr__(self, "damping", beta)

    @property
    def period_range(self) -> tuple[float, float]:
        return (self.periods[0], self.periods[-1])

    def _sa5(self, period: np.ndarray) -> np.ndarray:
        t_tab = np.asarray(self.periods)
        v_tab = np.asarray(self.values)
        t = np.asarray(period, dtype=float)
        out = np.empty_like(t)
        positive = t_tab > 0.0
        log_t, log_v = np.log(t_tab[positive]), np.log(v_tab[positive])
        first = t_tab[positive][0]
        upper = t >= first
        out[upper] = np.exp(np.interp(np.log(t[upper]), log_t, log_v))
        if (~upper).any():  # only when the table starts at T = 0
            out[~upper] = np.interp(t[~upper], t_tab[:2], v_tab[:2])
        table_b = damping_coefficient(self.damping, self.rule)
        # Convert the table to its 5 % equivalent; sa() divides by B(beta) again.
        return out * table_b

    def to_dict(self) -> dict:
        return {
            "kind": "tabulated",
            "periods": list(self.periods),
            "values": list(self.values),
            "damping": self.damping,
            "rule": self.rule,
        }
