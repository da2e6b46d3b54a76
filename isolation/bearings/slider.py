"""What the sliding bearings share: argument checks, the numerical yield displacement, the pendulum bilinear.

Used by :mod:`isolation.bearings.friction`, :mod:`isolation.bearings.double_concave`
and :mod:`isolation.bearings.triple_pendulum`; imports none of them.

A slider on a dish of effective radius R_eff under a vertical load W is
bilinear with K_d = W/R_eff and Q_d = mu W; rigid-plastic sliding gets a small
numerical yield displacement D_y, so K_u = Q_d/D_y + K_d (see
:mod:`isolation.bearings.friction`).
"""

from __future__ import annotations

from isolation import validate
from isolation.bearings.backbone import Bilinear

__all__ = ["DEFAULT_SLIDER_YIELD_DISPLACEMENT", "friction_value", "optional_positive", "weight_value",
           "slider_bilinear"]

DEFAULT_SLIDER_YIELD_DISPLACEMENT = 0.0005
"""Numerical yield displacement of a slider, 0.5 mm (common practice). [m]"""


def friction_value(field: str, value) -> float:
    """A coefficient of friction checked to lie in (0, 1). [-]"""
    return validate.in_range(field, value, 0.0, 1.0, "-", low_inclusive=False, high_inclusive=False)


def optional_positive(field: str, value, unit: str):
    """None, or a number checked to be > 0 in ``unit``."""
    return None if value is None else validate.positive(field, value, unit)


def weight_value(weight) -> float:
    """A vertical load checked to be > 0. [kN]"""
    return validate.positive("weight", weight, "kN")


def slider_bilinear(weight: float, radius: float, friction: float, yield_displacement: float) -> Bilinear:
    """K_d = W/R [kN/m], Q_d = mu W [kN], K_u = Q_d/D_y + K_d for a load W [kN], radius R [m],
    friction mu [-] and yield displacement D_y [m]."""
    post_yield = weight / radius
    strength = friction * weight
    return Bilinear(strength / yield_displacement + post_yield, post_yield, strength)
