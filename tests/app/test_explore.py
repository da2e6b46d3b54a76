"""Explorer callbacks, checked against hand formulas solved here independently.

Outside sources:
* friction pendulum: K_eff = W/R + mu W/D, beta_eff = 2 mu / (pi (mu + D/R))
  (Naeim & Kelly 1999, Design of Seismic Isolated Structures, Ch. 4, rigid-
  plastic slider);
* lead rubber: K_d = G A_r/T_r, Q_d = sigma_y A_lead (Naeim & Kelly 1999);
* D_M = g S_M1 T_M / (4 pi^2 B_M) on the velocity branch (ASCE/SEI 7-16
  Eq. 17.5-1 with Sa = S_M1/T), B_M from Table 17.5-1 (2 % 0.8, 5 % 1.0,
  10 % 1.2, 20 % 1.5, 30 % 1.7, 40 % 1.9, 50 % 2.0; linear between; from memory).
The fixed point is solved with scipy's brentq, not with the package.
"""

from __future__ import annotations

import math
import re

import numpy as np
import pytest
from matplotlib.figure import Figure
from scipy.optimize import brentq

from isolation.app.explorer import answers as explore

G = 9.80665
B_TABLE = ([0.02, 0.05, 0.10, 0.20, 0.30, 0.40, 0.50], [0.8, 1.0, 1.2, 1.5, 1.7, 1.9, 2.0])


def _b(beta: float) -> float:
    return float(np.interp(beta, *B_TABLE))


def _friction_pendulum_answer(weight, radius, mu, sm1):
    def residual(d):
        k_eff = weight / radius + mu * weight / d
        period = 2 * math.pi * math.sqrt(weight / (k_eff * G))
        beta = 2 * mu / (math.pi * (mu + d / radius))
        return d - G * sm1 * period / (4 * math.pi**2 * _b(beta))

    d = brentq(residual, 1e-3, 5.0)
    k_eff = weight / radius + mu * weight / d
    return d, 2 * math.pi * math.sqrt(weight / (k_eff * G)), 2 * mu / (math.pi * (mu + d / radius))


@pytest.mark.parametrize("case, factor", [("lower", 0.85), ("nominal", 1.0), ("upper", 1.3)])
def test_friction_pendulum_bounds_match_hand_solution(case, factor):
    answer = explore.explore(bearing_type="friction pendulum", weight=40_000.0, radius=3.0,
                             friction=0.06, sms=1.5, sm1=0.75, lower_factor=0.85, upper_factor=1.3)
    d, period, beta = _friction_pendulum_answer(40_000.0, 3.0, 0.06 * factor, 0.75)
    result = answer.results[case]
    # The package's slider has a 0.5 mm numerical yield displacement; the hand model is rigid-plastic.
    assert result.displacement == pytest.approx(d, rel=0.01)
    assert result.period == pytest.approx(period, rel=0.01)
    assert result.damping == pytest.approx(beta, rel=0.01)
    # Velocity branch applies: T_S = S_M1/S_MS = 0.5 s < T < T_L = 8 s.
    assert 0.5 < result.period < 8.0


def test_lead_rubber_backbone_matches_hand_values():
    answer = explore.explore(bearing_type="lead rubber", bearing_count=10, outer_diameter=0.8,
                             lead_diameter=0.16, layer_thickness=0.01, layers=20, shear_modulus=400.0,
                             lower_factor=1.0, upper_factor=1.0)
    rubber_area = math.pi / 4 * (0.8**2 - 0.16**2)
    k_d = 400.0 * rubber_area / (20 * 0.01)          # G A_r / T_r [kN/m]
    q_d = 10_000.0 * math.pi / 4 * 0.16**2           # sigma_y A_lead, 10 MPa lead (from memory)
    nominal = answer.backbones["nominal"]
    assert nominal.post_yield_stiffness == pytest.approx(10 * k_d, rel=1e-9)
    assert nominal.characteristic_strength == pytest.approx(10 * q_d, rel=1e-9)
    # With all factors 1 the three sets coincide.
    assert answer.results["lower"].displacement == pytest.approx(answer.results["upper"].displacement)


def test_bounds_order_lower_moves_most_upper_is_stiffest():
    answer = explore.explore()
    lower, nominal, upper = (answer.results[c] for c in ("lower", "nominal", "upper"))
    assert lower.displacement > nominal.displacement > upper.displacement
    assert lower.period > upper.period


def test_period_shift_and_shear_ratio():
    answer = explore.explore(fixed_base_period=0.4, sms=1.5, sm1=0.75)
    assert answer.period_shift == pytest.approx(answer.results["nominal"].period / 0.4)
    # Fixed base at 0.4 s sits on the plateau, Sa = S_MS = 1.5 g (ASCE 7-16 §11.4.6).
    upper = answer.results["upper"]
    assert answer.shear_reduction == pytest.approx(upper.base_shear / 40_000.0 / 1.5)
    data = answer.to_dict()
    assert data["settings"]["fixed_base_period"] == 0.4
    assert set(data["results"]) == {"lower", "nominal", "upper"}


def _cells(text: str) -> dict:
    """data-key -> data-value of an explorer HTML table."""
    return {k: float(v) for k, v in re.findall(r'data-key="([^"]+)" data-value="([^"]+)"', text)}


def test_update_returns_html_and_figure():
    answer, text, figure = explore.update({"bearing_type": "friction pendulum", "friction": 0.05})
    assert isinstance(figure, Figure) and len(figure.axes) == 2
    lower = answer.results["lower"].displacement
    assert f'data-key="lower-D" data-value="{lower!r}">{1000 * lower:.0f}</td>' in text
    assert "not design" in text
    loop = next(line for line in figure.axes[1].get_lines() if line.get_label().startswith("upper"))
    assert max(loop.get_xdata()) == pytest.approx(1000 * answer.results["upper"].displacement)
    assert _cells(text)["upper-D"] == answer.results["upper"].displacement


@pytest.mark.parametrize(
    "values, message",
    [
        ({"bearing_type": "roller"}, "bearing_type = 'roller'.*'friction pendulum', 'lead rubber'"),
        ({"basis": "nz"}, "basis = 'nz'.*'asce7', 'eurocode'"),
        ({"units": "imperial"}, "units = 'imperial'.*'SI', 'US'"),
        ({"layers": 2.5}, "layers = 2.5.*whole number"),
        ({"sms": 1.0, "sm1": 1.5, "long_period": 1.2}, "long_period = 1.2 s.*T_S"),
        ({"plan_width": 50.0, "plan_length": 40.0}, "plan_width = 50 m.*plan_length"),
        ({"weight": -1.0}, "weight = -1.0.*> 0"),
        ({"friction": 1.5}, "friction = 1.5"),
        ({"bearing_count": 0}, "bearing_count = 0.*>= 1"),
        ({"lower_factor": 1.2}, r"lower_factor = 1.2.*\(0, 1\]"),
        ({"colour": "red"}, "setting = 'colour'.*bearing_type"),
        ({"bearing_type": "lead rubber", "lead_diameter": 0.9}, "lead_diameter = 0.9"),
    ],
)
def test_bad_settings_name_the_field(values, message):
    with pytest.raises(ValueError, match=message):
        explore.update(values)
