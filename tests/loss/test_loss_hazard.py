"""Hazard models and the annual rate of a lognormal damage state (isolation.loss.hazard).

Outside checks:
* Power-law hazard and lognormal fragility: lambda_DS = k0 x_m^-k exp(k^2 beta^2 / 2)
  (Cornell, Jalayer, Hamburger & Foutch 2002, J. Struct. Eng. 128(4), 526-533; the
  closed form behind their Eq. 11).
* Poisson conversion: lambda = -ln(1 - p)/t; 2 % in 50 years -> 4.04e-4 per year,
  10 % in 50 years -> 2.107e-3 per year (1/2475 and 1/475: derived arithmetic).
* EN 1998-1 §2.1(4) note: exponent k of the order of 3 for the return-period scaling.
"""

import math

import numpy as np
import pytest
from scipy import integrate, stats

from isolation.loss import HazardCurve, PowerLawHazard, annual_rate, default_hazard, rate_from_probability
from isolation.loss.analysis import expected_annual


@pytest.mark.parametrize("k0, k, median, beta", [
    (1e-4, 2.5, 0.8, 0.5), (4.04e-4, 4.07, 1.6, 0.6), (2e-3, 1.5, 0.3, 0.3), (1e-3, 3.0, 2.0, 0.8)])
def test_annual_rate_matches_the_closed_form(k0, k, median, beta):
    closed = k0 * median**(-k) * math.exp(k**2 * beta**2 / 2.0)  # Cornell et al. 2002
    assert annual_rate(median, beta, PowerLawHazard(k0, k)) == pytest.approx(closed, rel=1e-6)


def test_annual_rate_equals_the_integral_of_the_fragility_over_the_hazard():
    # Direct form: integral P(DS | x) |d lambda / dx| dx, evaluated with scipy.integrate.quad.
    hazard, median, beta = PowerLawHazard(2e-4, 2.8), 1.1, 0.45

    def integrand(lx):
        x = math.exp(lx)
        return stats.lognorm.cdf(x, beta, scale=median) * hazard.k * hazard.k0 * x**(-hazard.k)

    reference, _ = integrate.quad(integrand, math.log(median) - 10 * beta, math.log(median) + 10 * beta, limit=200)
    reference += 0.0  # below the lower bound the fragility is < 1e-23
    upper = math.log(median) + 10 * beta
    reference += hazard.rate(math.exp(upper))  # beyond the upper bound P = 1
    assert annual_rate(median, beta, hazard) == pytest.approx(reference, rel=1e-5)


def test_zero_dispersion_is_the_hazard_at_the_median():
    hazard = PowerLawHazard(1e-3, 3.0)
    assert annual_rate(0.5, 0.0, hazard) == pytest.approx(1e-3 * 0.5**-3.0)


def test_poisson_rates_of_the_code_levels():
    assert rate_from_probability(0.02, 50) == pytest.approx(4.04e-4, rel=2e-3)
    assert rate_from_probability(0.10, 50) == pytest.approx(2.107e-3, rel=2e-3)


def test_default_hazard_passes_through_mce_with_slope_3():
    # 2 % in 50 years at MCE_R; k = 3 (EN 1998-1 §2.1(4) note: "of the order of 3").
    hazard = default_hazard()
    assert float(hazard.rate(1.0)) == pytest.approx(-math.log(0.98) / 50)
    assert hazard.k == 3.0
    assert float(hazard.rate(0.5)) == pytest.approx(-math.log(0.98) / 50 * 8.0)


def test_default_hazard_through_given_mce_and_design_rates():
    # 10 % in 50 years at 2/3 MCE_R (the coastal-California basis of the 2/3 rule, from memory):
    # slope from the two points, ln(rate ratio)/ln(1.5), derived arithmetic.
    mce, design = -math.log(0.98) / 50, -math.log(0.90) / 50
    hazard = default_hazard(mce, design)
    assert float(hazard.rate(2.0 / 3.0)) == pytest.approx(design)
    assert hazard.k == pytest.approx(math.log(design / mce) / math.log(1.5))
    with pytest.raises(ValueError, match="design level"):
        default_hazard(1e-3, 5e-4)


def test_curve_of_power_law_points_is_that_power_law_everywhere():
    law = PowerLawHazard(3e-4, 2.2)
    x = np.array([0.2, 0.5, 1.0, 2.0])
    curve = HazardCurve(x, law.rate(x))
    probe = np.array([0.05, 0.3, 0.77, 1.9, 4.0])  # inside and beyond both ends
    assert np.allclose(curve.rate(probe), law.rate(probe), rtol=1e-10)
    fitted = curve.power_law()
    assert fitted.k == pytest.approx(2.2) and fitted.k0 == pytest.approx(3e-4)
    assert annual_rate(0.9, 0.5, curve) == pytest.approx(3e-4 * 0.9**-2.2 * math.exp(2.2**2 * 0.25 / 2), rel=1e-6)


def test_expected_annual_of_a_constant_loss_against_quad():
    # Loss C at and above x1, ramp from 0 at x1/2 (the documented low end), power-law hazard;
    # reference by scipy.integrate.quad of C(x) k k0 x^(-k-1).
    hazard, c, levels = PowerLawHazard(1e-3, 2.0), 5.0e5, [0.25, 0.5, 1.0, 1.5]

    def loss(x):
        return c * min(max((x - 0.125) / 0.125, 0.0), 1.0)

    body, _ = integrate.quad(lambda x: loss(x) * hazard.k * hazard.k0 * x**(-hazard.k - 1), 0.125, 1.5,
                             points=[0.25], limit=200)
    reference = body + c * float(hazard.rate(1.5))
    assert expected_annual(levels, [c] * 4, hazard, points=4000) == pytest.approx(reference, rel=1e-4)


def test_expected_annual_of_a_linear_loss_is_exact_between_levels():
    hazard, levels = PowerLawHazard(2e-3, 3.0), [0.4, 0.8, 1.2]

    def loss(x):
        return 1e6 * x if x >= 0.4 else 1e6 * 0.4 * (x - 0.2) / 0.2

    body, _ = integrate.quad(lambda x: loss(x) * 3.0 * 2e-3 * x**-4.0, 0.2, 1.2, points=[0.4], limit=200)
    reference = body + loss(1.2) * float(hazard.rate(1.2))
    assert expected_annual(levels, [loss(x) for x in levels], hazard, points=4000) == pytest.approx(reference,
                                                                                                     rel=1e-4)


@pytest.mark.parametrize("args, word", [((-1e-3, 2.0), "k0"), ((1e-3, 0.0), "k"), ((float("nan"), 2.0), "k0")])
def test_bad_power_law_names_the_field(args, word):
    with pytest.raises(ValueError, match=rf"^{word} = .* is not allowed"):
        PowerLawHazard(*args)


@pytest.mark.parametrize("x, rates", [([0.1, 0.2], [1e-3, 2e-3]), ([0.2, 0.1], [1e-2, 1e-3]),
                                      ([0.1], [1e-3]), ([0.1, 0.0], [1e-2, 1e-3]), ([0.1, 0.2], [1e-2, -1.0])])
def test_bad_hazard_points_are_refused(x, rates):
    with pytest.raises(ValueError, match="hazard .* not allowed"):
        HazardCurve(x, rates)


def test_bad_fragility_arguments_of_annual_rate():
    with pytest.raises(ValueError, match="median"):
        annual_rate(0.0, 0.5, PowerLawHazard(1e-3, 2))
    with pytest.raises(ValueError, match="dispersion"):
        annual_rate(1.0, -0.1, PowerLawHazard(1e-3, 2))
    with pytest.raises(ValueError, match="hazard"):
        annual_rate(1.0, 0.1, object())
