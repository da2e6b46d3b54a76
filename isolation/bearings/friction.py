"""Sliding isolators on concave surfaces: the single concave friction pendulum and slider helpers.

A slider on a spherical dish of radius R carrying a vertical load W resists a
lateral displacement u with a restoring (pendulum) force and a friction force:

    F = (W/R_eff) u + mu W sgn(v)

so the bearing is bilinear with post-yield stiffness K_d = W/R_eff and
characteristic strength Q_d = mu W, and its isolated period
T = 2 pi sqrt(R_eff/g) does not depend on the weight carried.

Notes
-----
* An articulated slider of height h moves on a circle of radius R - h, so the
  effective radius is R_eff = R - h (Zayas, Low & Mahin 1990; Constantinou et
  al.).
* Rigid-plastic sliding has no elastic branch. For the bilinear value object
  and the response-history engine a small *yield displacement* D_y (default
  0.5 mm, common practice for numerical models of sliders) gives the elastic
  stiffness K_u = Q_d/D_y + K_d, so that D_y = Q_d/(K_u - K_d) exactly. Its
  effect on effective stiffness is nil and on effective damping is of order
  D_y/D (the loop loses 4 Q_d D_y of its area).
* Friction of PTFE-type composites rises with sliding velocity (Constantinou,
  Mokha & Reinhorn 1990): mu(v) = mu_fast - (mu_fast - mu_slow) exp(-a |v|).
  The single-mode design uses ``friction`` (the fast value); the
  response-history engine may call :meth:`FrictionPendulum.friction_at`.
* The double concave bearing is in :mod:`isolation.bearings.double_concave`.

References
----------
Zayas, V. A., Low, S. S. & Mahin, S. A. (1990). A simple pendulum technique for
achieving seismic isolation. Earthquake Spectra 6(2).
Constantinou, M. C., Mokha, A. & Reinhorn, A. M. (1990). Teflon bearings in base
isolation II: Modeling. J. Struct. Eng. 116(2).
Fenz, D. M. & Constantinou, M. C. (2006). Behaviour of the double concave
friction pendulum bearing. Earthquake Eng. Struct. Dyn. 35(11).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from isolation import GRAVITY, validate
from isolation.bearings import checks as _checks
from isolation.bearings.backbone import Bilinear
from isolation.bearings.laws import FRICTION_LAWS, SharpFrictionLaw, SmoothLaw
from isolation.bearings.registry import BearingType, register
from isolation.bearings.slider import (
    DEFAULT_SLIDER_YIELD_DISPLACEMENT,
    friction_value,
    optional_positive,
    slider_bilinear,
    weight_value,
)
from isolation.schema import Key, Ordering

__all__ = ["FrictionPendulum", "DEFAULT_SLIDER_YIELD_DISPLACEMENT", "FRICTION_PENDULUM"]

# the shared slider helpers under their earlier private names
_friction, _optional_positive = friction_value, optional_positive
_weight, _slider_bilinear = weight_value, slider_bilinear


@dataclass(frozen=True)
class FrictionPendulum:
    """Single concave friction pendulum bearing.

    Parameters
    ----------
    radius : float
        Radius of curvature of the concave dish, > 0. [m]
    friction : float
        Coefficient of friction at high sliding velocity (the design value),
        in (0, 1). [-]
    slider_height : float, optional
        Height of the articulated slider, h in [0, radius); the slider moves
        on radius R - h. Default 0. [m]
    displacement_capacity : float or None, optional
        Displacement the dish allows before the slider meets its restrainer,
        > 0; None when not yet chosen (the capacity check is then left out). [m]
    friction_slow : float or None, optional
        Coefficient of friction at very low sliding velocity, in
        (0, friction]. None (default) sets it equal to ``friction``: no
        velocity dependence unless given. [-]
    rate_parameter : float, optional
        Rate parameter a of the velocity dependence, >= 0. Default 25 s/m
        (values of 20-30 s/m are typical, from memory of Constantinou et al.
        1990). [s/m]
    yield_displacement : float, optional
        Numerical yield displacement D_y of the slider, > 0 (default 0.5 mm,
        common practice). It sets K_u = Q_d/D_y + K_d. [m]

    References
    ----------
    Zayas, V. A., Low, S. S. & Mahin, S. A. (1990). A simple pendulum technique for achieving seismic isolation.
    Earthquake Spectra 6(2), 317-333. DOI not verified.
    Constantinou, M. C., Mokha, A. & Reinhorn, A. M. (1990). Teflon bearings in base isolation II: Modeling. J.
    Struct. Eng. 116(2), 455-474. DOI not verified.
    """

    radius: float
    friction: float
    slider_height: float = 0.0
    displacement_capacity: float | None = None
    friction_slow: float | None = None
    rate_parameter: float = 25.0
    yield_displacement: float = DEFAULT_SLIDER_YIELD_DISPLACEMENT

    def __post_init__(self) -> None:
        radius = validate.positive("radius", self.radius, "m")
        friction = _friction("friction", self.friction)
        height = validate.non_negative("slider_height", self.slider_height, "m")
        if height >= radius:
            raise ValueError(
                f"slider_height = {self.slider_height!r} is not allowed: must be >= 0 and "
                f"< radius = {radius!r} [m]"
            )
        capacity = _optional_positive("displacement_capacity", self.displacement_capacity, "m")
        slow = friction if self.friction_slow is None else _friction("friction_slow", self.friction_slow)
        if slow > friction:
            raise ValueError(
                f"friction_slow = {self.friction_slow!r} is not allowed: must be in (0, friction] "
                f"with friction = {friction!r} [-]"
            )
        rate = validate.non_negative("rate_parameter", self.rate_parameter, "s/m")
        dy = validate.positive("yield_displacement", self.yield_displacement, "m")
        for name, value in (("radius", radius), ("friction", friction), ("slider_height", height),
                            ("displacement_capacity", capacity), ("friction_slow", slow),
                            ("rate_parameter", rate), ("yield_displacement", dy)):
            object.__setattr__(self, name, value)

    @property
    def effective_radius(self) -> float:
        """R_eff = R - h, the radius the slider's pivot travels on. [m]"""
        return self.radius - self.slider_height

    @property
    def period(self) -> float:
        """Pendulum (post-yield) period 2 pi sqrt(R_eff/g), independent of weight. [s]"""
        return 2.0 * math.pi * math.sqrt(self.effective_radius / GRAVITY)

    def friction_at(self, velocity):
        """Coefficient of friction at a sliding velocity.

        mu(v) = mu_fast - (mu_fast - mu_slow) exp(-a |v|)
        (Constantinou, Mokha & Reinhorn 1990).

        Parameters
        ----------
        velocity : float or array
            Sliding velocity, either sign. [m/s]

        Returns
        -------
        float or array
            Coefficient of friction. [-]
        """
        v = np.abs(np.asarray(velocity, dtype=float))
        assert self.friction_slow is not None  # None is replaced by friction in __post_init__
        out = self.friction - (self.friction - self.friction_slow) * np.exp(-self.rate_parameter * v)
        return float(out) if out.ndim == 0 else out

    def bilinear(self, weight) -> Bilinear:
        """Bilinear idealisation under a vertical load.

        Parameters
        ----------
        weight : float
            Vertical load on the bearing, > 0. [kN]

        Returns
        -------
        Bilinear
            K_d = W/R_eff, Q_d = mu W, K_u = Q_d/D_y + K_d.
        """
        return _slider_bilinear(_weight(weight), self.effective_radius, self.friction,
                                self.yield_displacement)

    def backbone(self, weight) -> Bilinear:
        """Same as :meth:`bilinear` (the single concave bearing has one sliding regime).

        Parameters
        ----------
        weight : float
            Vertical load on the bearing, > 0. [kN]
        """
        return self.bilinear(weight)

    def with_friction_factor(self, factor) -> "FrictionPendulum":
        """Copy with both friction values multiplied by a property modification factor.

        Parameters
        ----------
        factor : float
            Multiplier on ``friction`` and ``friction_slow``, > 0; the
            results must stay below 1. [-]
        """
        f = validate.positive("friction factor", factor)
        assert self.friction_slow is not None  # None is replaced by friction in __post_init__
        return FrictionPendulum(self.radius, self.friction * f, slider_height=self.slider_height,
                                displacement_capacity=self.displacement_capacity,
                                friction_slow=self.friction_slow * f,
                                rate_parameter=self.rate_parameter,
                                yield_displacement=self.yield_displacement)

    def checks(self, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
               rotation=0.0, weight_share=None):
        """Checks of this bearing at a design displacement (see :mod:`isolation.bearings.checks`).

        Parameters
        ----------
        axial_load : float
            Gravity load on the bearing, > 0. [kN]
        displacement : float
            Design displacement of the bearing, > 0. [m]
        axial_load_max : float, optional
            Largest compression during the earthquake (default axial_load). [kN]
        axial_load_min : float, optional
            Smallest axial load during the earthquake, negative in tension
            (default axial_load). [kN]
        rotation : float, optional
            Ignored for a slider (the articulated slider takes rotation). [rad]
        weight_share : float, optional
            Weight this bearing restores, for the restoring-force check
            (default axial_load). [kN]

        Returns
        -------
        list of Check
        """
        return _checks.slider_checks(self, axial_load, displacement, axial_load_max=axial_load_max,
                                     axial_load_min=axial_load_min, weight_share=weight_share)

    def to_dict(self) -> dict:
        return {
            "kind": "friction_pendulum",
            "radius": self.radius,
            "friction": self.friction,
            "slider_height": self.slider_height,
            "displacement_capacity": self.displacement_capacity,
            "friction_slow": self.friction_slow,
            "rate_parameter": self.rate_parameter,
            "yield_displacement": self.yield_displacement,
            "effective_radius": self.effective_radius,
            "period": self.period,
        }

    def history_law(self, weight, friction_law: str = "smooth"):
        """The law the engine integrates when this bearing stands for all sliders of a plane.

        F = (W/R_eff) u + mu(v) W z with the Bouc-Wen z of exponent 2 and beta = gamma = 1/2
        (Constantinou, Mokha & Reinhorn 1990) for ``"smooth"``, or the elastic-plastic
        friction element of initial stiffness mu W/D_y for ``"sharp"``.

        Parameters
        ----------
        weight : float
            Weight the sliders carry, > 0. [kN]
        friction_law : {"smooth", "sharp"}, optional
            Which friction law. [-]

        Returns
        -------
        SmoothLaw or SharpFrictionLaw
        """
        w = weight_value(weight)
        validate.one_of("friction_law", friction_law, FRICTION_LAWS)
        slow = self.friction if self.friction_slow is None else self.friction_slow  # set in __post_init__
        if friction_law == "sharp":
            return SharpFrictionLaw(w / self.effective_radius, self.friction * w, slow * w,
                                    self.rate_parameter, self.yield_displacement)
        return SmoothLaw(w / self.effective_radius, self.friction * w, slow * w,
                         self.rate_parameter, self.yield_displacement, 0.5)


FRICTION_PENDULUM = register(BearingType(
    kind="friction_pendulum",
    model=FrictionPendulum,
    keys={
        "radius": Key("length", low=0.3, high=20.0),
        "friction": Key("number", low=0.0, high=0.3, low_inclusive=False, ratio=True),
        "slider_height": Key("length", required=False, low=0.0, high=2.0),
        "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
        "friction_slow": Key("number", required=False, low=0.0, high=0.3, low_inclusive=False, ratio=True),
        "rate_parameter": Key("number", required=False, low=0.0, high=500.0, unit="s/m"),
    },
    cross_checks=(Ordering("slider_height", "radius", "m"), Ordering("friction_slow", "friction", "-", strict=False)),
    sliding=True,
    history_law=FrictionPendulum.history_law,
    own_history_law=lambda bearing: bearing.friction_slow != bearing.friction,
    slow_friction_ratio=lambda bearing: bearing.friction_slow / bearing.friction,
))
"""The friction pendulum in the bearing registry (study ``type = "friction_pendulum"``)."""


def __getattr__(name):
    """DoubleConcave moved to :mod:`isolation.bearings.double_concave`; still importable from here
    (looked up on use: that module does not import this one, so there is no import circle)."""
    if name == "DoubleConcave":
        from isolation.bearings.double_concave import DoubleConcave
        return DoubleConcave
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
