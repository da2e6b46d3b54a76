"""Seismic hazard for loss analysis: annual rate of exceeding an intensity.

Intensity here is any positive scalar; the study's loss analysis uses the
scale factor on the MCE_R spectrum (1.0 = MCE_R, 2/3 = design level), because
its response comes from the run's matched suite scaled uniformly.

Two hazard models, with one interface (``rate(x)``):

* :class:`PowerLawHazard`: lambda(x) = k0 x^-k (Cornell et al. 2002, Eq. 5).
* :class:`HazardCurve`: points (x_i, lambda_i), interpolated linearly in
  log-log space and extended past both ends by the end segments' power laws.

:func:`annual_rate` gives the annual rate of reaching a damage state with a
lognormal fragility under any of them, by numerical integration; for a power
law it has the closed form k0 x_m^-k exp(k^2 beta^2 / 2) (Cornell, Jalayer,
Hamburger & Foutch 2002, J. Struct. Eng. 128(4), Eq. 11 form).

References
----------
Cornell, C. A., Jalayer, F., Hamburger, R. O. & Foutch, D. A. (2002).
Probabilistic basis for 2000 SAC Federal Emergency Management Agency steel
moment frame guidelines. J. Struct. Eng. 128(4), 526-533.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

__all__ = ["PowerLawHazard", "HazardCurve", "annual_rate", "rate_from_probability",
           "MCE_PROBABILITY", "DESIGN_PROBABILITY", "DESIGN_FRACTION", "DEFAULT_SLOPE", "default_hazard"]

MCE_PROBABILITY = (0.02, 50.0)
"""Default exceedance of the MCE_R: 2 % in 50 years (the probabilistic MCE_R of
ASCE/SEI 7-05 and earlier, uniform-hazard basis; ASCE/SEI 7-10 and later use a
risk-targeted MCE_R close to it, from memory)."""

DESIGN_FRACTION = 2.0 / 3.0
"""Design level as a fraction of the MCE_R intensity (the 2/3 rule, ASCE/SEI 7-16
§11.4.5: S_DS = 2/3 S_MS)."""

DESIGN_PROBABILITY = (0.10, 50.0)
"""Exceedance of the design level (2/3 MCE_R) in coastal California, where the 2/3
factor comes from: 2 %-in-50-year motions there are about 1.5 times the
10 %-in-50-year motions (NEHRP Recommended Provisions 1997, FEMA 303 commentary;
from memory). That local slope (k = 4.1) holds near the MCE_R; it overstates the
rate of frequent, weaker shaking, which drives the expected annual loss, so it
is not the default (give ``design_rate`` to use it)."""

DEFAULT_SLOPE = 3.0
"""Default slope k of the power-law hazard through the MCE_R: "of the order of 3"
(EN 1998-1:2004 §2.1(4) note, for scaling motions between return periods). Give
the site's hazard curve (or ``design_rate``) when known."""


def rate_from_probability(probability, years) -> float:
    """Annual rate of a Poisson process with ``probability`` of at least one event in ``years``.

    Parameters
    ----------
    probability : float
        Probability of exceedance in the period, in (0, 1). [-]
    years : float
        Length of the period, > 0. [year]

    Returns
    -------
    float
        lambda = -ln(1 - p)/t. [1/year]
    """
    p, t = float(probability), float(years)
    if not (0.0 < p < 1.0) or not math.isfinite(p):
        raise ValueError(f"probability = {probability!r} is not allowed: must be in (0, 1) [-]")
    if not (t > 0.0) or not math.isfinite(t):
        raise ValueError(f"years = {years!r} is not allowed: must be > 0 [year]")
    return -math.log1p(-p) / t


@dataclass(frozen=True)
class PowerLawHazard:
    """Annual rate of exceeding intensity x: lambda(x) = k0 x^-k.

    Parameters
    ----------
    k0 : float
        Rate of exceeding intensity 1, > 0. [1/year]
    k : float
        Slope of the hazard curve in log-log space, > 0. [-]
    """

    k0: float
    k: float

    def __post_init__(self):
        for name in ("k0", "k"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) \
                    or value <= 0.0:
                unit = "1/year" if name == "k0" else "-"
                raise ValueError(f"{name} = {value!r} is not allowed: must be a finite number > 0 [{unit}]")
        object.__setattr__(self, "k0", float(self.k0))
        object.__setattr__(self, "k", float(self.k))

    @classmethod
    def through(cls, x1, rate1, x2, rate2) -> "PowerLawHazard":
        """The power law through two points (x1, rate1), (x2, rate2).

        Parameters
        ----------
        x1, x2 : float
            Intensities, > 0 and different. [intensity]
        rate1, rate2 : float
            Their annual rates of exceedance, > 0, falling with intensity. [1/year]
        """
        x1, x2, r1, r2 = (float(v) for v in (x1, x2, rate1, rate2))
        if min(x1, x2, r1, r2) <= 0.0 or x1 == x2:
            raise ValueError(f"points ({x1!r}, {r1!r}) and ({x2!r}, {r2!r}) are not allowed: intensities and "
                             "rates must be > 0 and the intensities different")
        k = -math.log(r2 / r1) / math.log(x2 / x1)
        if not k > 0.0:
            raise ValueError(f"points ({x1!r}, {r1!r}) and ({x2!r}, {r2!r}) are not allowed: the rate must "
                             "fall as the intensity rises")
        return cls(r1 * x1**k, k)

    def rate(self, x):
        """Annual rate of exceeding ``x`` [intensity]. [1/year]"""
        x = np.asarray(x, dtype=float)
        with np.errstate(divide="ignore"):
            return self.k0 * x**(-self.k)

    def intensity(self, rate):
        """Intensity exceeded at annual ``rate`` [1/year]. [intensity]"""
        return (self.k0 / np.asarray(rate, dtype=float))**(1.0 / self.k)

    def to_dict(self) -> dict:
        return {"kind": "power_law", "k0": self.k0, "k": self.k}


@dataclass(frozen=True)
class HazardCurve:
    """Hazard curve given as points, interpolated linearly in log-log space.

    Past the first and the last point the end segments' power laws continue
    the curve (an assumption; give points that span the intensities of
    interest).

    Parameters
    ----------
    intensities : sequence of float
        At least 2 intensities, > 0, strictly increasing. [intensity]
    rates : sequence of float
        Annual rates of exceedance at each, > 0, strictly decreasing. [1/year]
    """

    intensities: tuple
    rates: tuple

    def __post_init__(self):
        x = np.asarray(self.intensities, dtype=float).ravel()
        r = np.asarray(self.rates, dtype=float).ravel()
        if x.size < 2 or x.size != r.size:
            shown = list(zip(x.tolist(), r.tolist(), strict=False))  # the pairs there are, even when counts differ
            raise ValueError(f"hazard points = {shown!r} are not allowed: must be at "
                             "least 2 pairs (intensity, annual rate)")
        if not (np.all(np.isfinite(x)) and np.all(np.isfinite(r)) and np.all(x > 0) and np.all(r > 0)):
            raise ValueError(f"hazard intensities = {x.tolist()!r}, rates = {r.tolist()!r} are not allowed: "
                             "must be finite and > 0 [intensity, 1/year]")
        if np.any(np.diff(x) <= 0) or np.any(np.diff(r) >= 0):
            raise ValueError(f"hazard intensities = {x.tolist()!r}, rates = {r.tolist()!r} are not allowed: "
                             "intensities must increase strictly and rates decrease strictly")
        object.__setattr__(self, "intensities", tuple(x.tolist()))
        object.__setattr__(self, "rates", tuple(r.tolist()))

    def rate(self, x):
        """Annual rate of exceeding ``x`` [intensity]. [1/year]"""
        lx = np.log(np.asarray(self.intensities))
        lr = np.log(np.asarray(self.rates))
        x = np.asarray(x, dtype=float)
        with np.errstate(divide="ignore"):
            t = np.log(x)
        slopes = np.diff(lr) / np.diff(lx)
        inside = np.interp(t, lx, lr)
        low = lr[0] + slopes[0] * (t - lx[0])
        high = lr[-1] + slopes[-1] * (t - lx[-1])
        out = np.where(t < lx[0], low, np.where(t > lx[-1], high, inside))
        return np.exp(out)

    def power_law(self) -> PowerLawHazard:
        """Least-squares power law through the points in log-log space."""
        slope, intercept = np.polyfit(np.log(self.intensities), np.log(self.rates), 1)
        return PowerLawHazard(math.exp(intercept), -slope)

    def to_dict(self) -> dict:
        return {"kind": "points", "intensities": list(self.intensities), "rates": list(self.rates)}


def default_hazard(mce_rate: float | None = None, design_rate: float | None = None) -> PowerLawHazard:
    """Power-law hazard in MCE_R fractions through the MCE_R.

    Parameters
    ----------
    mce_rate : float, optional
        Annual rate of exceeding the MCE_R; default 2 % in 50 years
        (:data:`MCE_PROBABILITY`). [1/year]
    design_rate : float, optional
        Annual rate of exceeding the design level, 2/3 MCE_R; when given the
        power law passes through both points, otherwise its slope is
        :data:`DEFAULT_SLOPE`. [1/year]
    """
    mce = rate_from_probability(*MCE_PROBABILITY) if mce_rate is None else float(mce_rate)
    if design_rate is None:
        return PowerLawHazard(mce, DEFAULT_SLOPE)
    design = float(design_rate)
    if not (0.0 < mce < design):
        raise ValueError(f"hazard rates: MCE_R {mce!r} and design level {design!r} per year are not allowed: "
                         "both must be > 0 and the design level (2/3 MCE_R) must be exceeded more often")
    return PowerLawHazard.through(DESIGN_FRACTION, design, 1.0, mce)


_NODES = 801
_SPAN = 8.0


def annual_rate(median, dispersion, hazard) -> float:
    """Annual rate of reaching a damage state with a lognormal fragility, by numerical integration.

    lambda_DS = integral P(DS | x) |d lambda(x)| = integral lambda(x) f(x) dx, f the
    lognormal density of the capacity (integration by parts), evaluated as
    E[lambda(X)] over X = median exp(dispersion u), u standard normal, with the
    trapezoid rule on u in [-8, 8] (801 nodes).

    Parameters
    ----------
    median : float
        Median intensity of the fragility, > 0. [intensity]
    dispersion : float
        Logarithmic standard deviation of the fragility, >= 0. [-]
    hazard : object with ``rate(x)``
        E.g. :class:`PowerLawHazard` or :class:`HazardCurve`. [1/year]

    Returns
    -------
    float
        Annual rate of reaching the damage state. [1/year]

    Notes
    -----
    For lambda(x) = k0 x^-k the closed form is k0 median^-k exp(k^2 dispersion^2/2)
    (Cornell et al. 2002).

    References
    ----------
    Cornell, C. A., Jalayer, F., Hamburger, R. O. & Foutch, D. A. (2002). Probabilistic basis for 2000 SAC
    Federal Emergency Management Agency steel moment frame guidelines. J. Struct. Eng. 128(4), 526-533. DOI not
    verified.
    """
    m, b = float(median), float(dispersion)
    if not (m > 0.0 and math.isfinite(m)):
        raise ValueError(f"median = {median!r} is not allowed: must be a finite number > 0 [intensity]")
    if not (b >= 0.0 and math.isfinite(b)):
        raise ValueError(f"dispersion = {dispersion!r} is not allowed: must be a finite number >= 0 [-]")
    if not hasattr(hazard, "rate"):
        raise ValueError(f"hazard = {hazard!r} is not allowed: must have a rate(x) method [1/year]")
    if b == 0.0:
        return float(hazard.rate(m))
    u = np.linspace(-_SPAN, _SPAN, _NODES)
    density = np.exp(-0.5 * u**2) / math.sqrt(2.0 * math.pi)
    values = np.asarray(hazard.rate(m * np.exp(b * u)), dtype=float) * density
    return float(np.trapezoid(values, u))
