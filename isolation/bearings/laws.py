"""Force laws the response-history engine integrates, as plain values (one column each).

* :class:`ElasticPlasticLaw` - a linear spring in parallel with
  elastic-perfectly-plastic elements (any ``Bilinear`` or ``MultiLinear``
  backbone, :func:`backbone_law`);
* :class:`SmoothLaw` - F = k u + Q(v) z with a Bouc-Wen variable z of exponent
  2 (Wen 1976 naming of beta and gamma), Q(v) = N mu(v) for a friction pendulum
  with velocity-dependent friction (Constantinou, Mokha & Reinhorn 1990);
* :class:`SharpFrictionLaw` - friction as an elastic-plastic element whose
  strength follows the velocity;
* :class:`BoucWen` - the smooth version of a bilinear isolator.

A bearing type's module turns its bearing into one of these (its registered
``history_law``, :mod:`isolation.bearings.registry`); the engine
(:mod:`isolation.dynamics.isolators`, :mod:`isolation.dynamics.newmark`,
:mod:`isolation.dynamics.plan_bearings`) integrates them. The update rules and
their conventions are described in :mod:`isolation.dynamics.isolators`.

References
----------
Wen, Y.-K. (1976). Method for random vibration of hysteretic systems. J. Eng.
Mech. Div. ASCE 102(2).
Constantinou, M. C., Mokha, A. & Reinhorn, A. M. (1990). Teflon bearings in
base isolation II: Modeling. J. Struct. Eng. 116(2).
"""

from __future__ import annotations

from dataclasses import dataclass

from isolation import validate
from isolation.bearings.backbone import Bilinear, MultiLinear

__all__ = ["BoucWen", "ElasticPlasticLaw", "SmoothLaw", "SharpFrictionLaw", "FRICTION_LAWS", "backbone_law"]

FRICTION_LAWS = ("smooth", "sharp")
"""How a friction pendulum runs in response history: the smooth Bouc-Wen law or the sharp one."""


@dataclass(frozen=True)
class BoucWen:
    """Smooth (Bouc-Wen, exponent 2) version of a bilinear isolator.

    F = K_d u + Q_d z, with z from the Bouc-Wen equation (Wen 1976 naming;
    see the module notes) and yield displacement D_y = Q_d/(K_u - K_d).

    Parameters
    ----------
    bilinear : Bilinear
        The bilinear loop the smooth law follows (K_u, K_d, Q_d > 0). [kN/m, kN/m, kN]
    exponent : float, optional
        Bouc-Wen exponent n; only 2 is available (closed-form update). [-]
    beta : float, optional
        Coefficient of |du/dt| |z|^(n-1) z, in (0, 1]; gamma = 1 - beta.
        Default 0.5 (unloading starts at the elastic stiffness K_u). [-]

    References
    ----------
    Wen, Y.-K. (1976). Method for random vibration of hysteretic systems. J. Eng. Mech. Div. ASCE 102(2),
    249-263. DOI not verified.
    """

    bilinear: Bilinear
    exponent: float = 2.0
    beta: float = 0.5

    def __post_init__(self) -> None:
        if not isinstance(self.bilinear, Bilinear):
            raise ValueError(f"bilinear = {self.bilinear!r} is not allowed: must be a Bilinear")
        if self.bilinear.characteristic_strength <= 0.0:
            raise ValueError(
                f"bilinear.characteristic_strength = {self.bilinear.characteristic_strength!r} "
                "is not allowed: must be > 0 [kN] for a hysteretic law"
            )
        validate.one_of("exponent", float(self.exponent), (2.0,))
        beta = validate.in_range("beta", self.beta, 0.0, 1.0, "-", low_inclusive=False)
        object.__setattr__(self, "exponent", 2.0)
        object.__setattr__(self, "beta", beta)

    @property
    def gamma(self) -> float:
        """gamma = 1 - beta (coefficient of du/dt |z|^n). [-]"""
        return 1.0 - self.beta

    @property
    def yield_displacement(self) -> float:
        """D_y = Q_d/(K_u - K_d). [m]"""
        return self.bilinear.yield_displacement

    def to_dict(self) -> dict:
        return {"kind": "bouc_wen", "bilinear": self.bilinear.to_dict(),
                "exponent": self.exponent, "beta": self.beta, "gamma": self.gamma}


@dataclass(frozen=True)
class ElasticPlasticLaw:
    """Linear spring plus parallel elastic-perfectly-plastic elements (one column).

    Parameters
    ----------
    linear_stiffness : float
        Spring that never yields. [kN/m]
    stiffnesses : tuple of float
        Element elastic stiffnesses. [kN/m]
    strengths : tuple of float
        Element yield forces. [kN]
    """

    linear_stiffness: float
    stiffnesses: tuple
    strengths: tuple

    family = "elastic_plastic"

    @property
    def final_stiffness(self) -> float:
        """Stiffness after all elements yield. [kN/m]"""
        return self.linear_stiffness


@dataclass(frozen=True)
class SmoothLaw:
    """F = k u + Q(v) z with Bouc-Wen z (n = 2) and Q(v) = Q_fast - (Q_fast - Q_slow) exp(-a|v|).

    Parameters
    ----------
    linear_stiffness : float
        k (K_d, or W/R_eff for a friction pendulum). [kN/m]
    strength_fast : float
        Q at high velocity (Q_d, or mu_fast W). [kN]
    strength_slow : float
        Q at zero velocity. [kN]
    rate_parameter : float
        a in exp(-a |v|). [s/m]
    yield_displacement : float
        D_y. [m]
    beta : float
        Bouc-Wen beta (Wen 1976 naming), gamma = 1 - beta. [-]

    References
    ----------
    Wen, Y.-K. (1976). Method for random vibration of hysteretic systems. J. Eng. Mech. Div. ASCE 102(2),
    249-263. DOI not verified.
    Constantinou, M. C., Mokha, A. & Reinhorn, A. M. (1990). Teflon bearings in base isolation II: Modeling. J.
    Struct. Eng. 116(2), 455-474. DOI not verified.
    """

    linear_stiffness: float
    strength_fast: float
    strength_slow: float
    rate_parameter: float
    yield_displacement: float
    beta: float = 0.5

    family = "smooth"

    @property
    def final_stiffness(self) -> float:
        """Stiffness at large displacement. [kN/m]"""
        return self.linear_stiffness


@dataclass(frozen=True)
class SharpFrictionLaw:
    """Sharp friction: F = k u + q, q from an elastic-perfectly-plastic element (one column).

    The element's elastic stiffness is Q_fast/D_y (the smooth law's initial
    stiffness) and its strength Q(v) = Q_fast - (Q_fast - Q_slow)
    exp(-a |v|), v the velocity at the end of the step: the bilinear
    (rigid-plastic in the limit D_y -> 0) friction loop without the smooth
    law's rounding.

    Parameters
    ----------
    linear_stiffness : float
        W/R_eff. [kN/m]
    strength_fast, strength_slow : float
        mu_fast W and mu_slow W. [kN]
    rate_parameter : float
        a in exp(-a |v|). [s/m]
    yield_displacement : float
        D_y. [m]
    """

    linear_stiffness: float
    strength_fast: float
    strength_slow: float
    rate_parameter: float
    yield_displacement: float

    family = "sharp"

    @property
    def final_stiffness(self) -> float:
        """Stiffness while sliding. [kN/m]"""
        return self.linear_stiffness


def backbone_law(curve: Bilinear | MultiLinear) -> ElasticPlasticLaw:
    """The elastic-plastic law of a piecewise-linear backbone (its spring and elements as they are).

    Parameters
    ----------
    curve : Bilinear or MultiLinear
        Backbone of the whole plane (or of one bearing in the plan model). [kN/m, kN]
    """
    k0, ks, fs = curve.elements()
    return ElasticPlasticLaw(float(k0), tuple(map(float, ks)), tuple(map(float, fs)))
