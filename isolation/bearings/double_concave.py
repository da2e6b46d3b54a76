"""Double concave friction pendulum: two dishes, one slider between them.

With unequal friction the bearing slides on one surface, then on both
(Fenz & Constantinou 2006, regimes I and II); see :class:`DoubleConcave`.
The single concave bearing is in :mod:`isolation.bearings.friction`, the
helpers all sliders share in :mod:`isolation.bearings.slider`.

References
----------
Fenz, D. M. & Constantinou, M. C. (2006). Behaviour of the double concave
friction pendulum bearing. Earthquake Eng. Struct. Dyn. 35(11).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from isolation import GRAVITY, validate
from isolation.bearings import checks as _checks
from isolation.bearings.backbone import Bilinear, MultiLinear
from isolation.bearings.registry import BearingType, register
from isolation.bearings.slider import DEFAULT_SLIDER_YIELD_DISPLACEMENT
from isolation.bearings.slider import friction_value as _friction
from isolation.bearings.slider import optional_positive as _optional_positive
from isolation.bearings.slider import slider_bilinear as _slider_bilinear
from isolation.bearings.slider import weight_value as _weight
from isolation.schema import Key, Ordering

__all__ = ["DoubleConcave", "DOUBLE_CONCAVE"]


@dataclass(frozen=True)
class DoubleConcave:
    """Double concave friction pendulum: two dishes, one slider between them.

    With equal friction both surfaces slide together and the bearing acts as a
    single pendulum of radius R_eff1 + R_eff2. With unequal friction the
    surface of lower friction (call it a) slides alone, with stiffness
    W/R_eff,a, until the force reaches mu_b W at the total displacement
    u* = (mu_b - mu_a) R_eff,a; from then on both slide with stiffness
    W/(R_eff1 + R_eff2) (Fenz & Constantinou 2006, regimes I and II). This
    model holds until a slider meets its restrainer.

    Parameters
    ----------
    radius_1, radius_2 : float
        Radii of curvature of the two dishes, > 0. [m]
    friction_1, friction_2 : float
        Coefficients of friction of the two sliding surfaces, in (0, 1). [-]
    slider_height_1, slider_height_2 : float, optional
        Distance from each sliding surface to the slider's pivot, in
        [0, radius). Default 0. [m]
    displacement_capacity_1, displacement_capacity_2 : float or None, optional
        Displacement each dish allows, > 0, or None when not chosen. [m]
    yield_displacement : float, optional
        Numerical yield displacement of the first sliding regime, > 0
        (default 0.5 mm, common practice). [m]

    References
    ----------
    Fenz, D. M. & Constantinou, M. C. (2006). Behaviour of the double concave friction pendulum bearing.
    Earthquake Eng. Struct. Dyn. 35(11), 1403-1424. doi:10.1002/eqe.589
    """

    radius_1: float
    friction_1: float
    radius_2: float
    friction_2: float
    slider_height_1: float = 0.0
    slider_height_2: float = 0.0
    displacement_capacity_1: float | None = None
    displacement_capacity_2: float | None = None
    yield_displacement: float = DEFAULT_SLIDER_YIELD_DISPLACEMENT

    def __post_init__(self) -> None:
        values = {}
        for i in (1, 2):
            radius = validate.positive(f"radius_{i}", getattr(self, f"radius_{i}"), "m")
            values[f"radius_{i}"] = radius
            values[f"friction_{i}"] = _friction(f"friction_{i}", getattr(self, f"friction_{i}"))
            height = validate.non_negative(f"slider_height_{i}", getattr(self, f"slider_height_{i}"), "m")
            if height >= radius:
                raise ValueError(
                    f"slider_height_{i} = {height!r} is not allowed: must be >= 0 and "
                    f"< radius_{i} = {radius!r} [m]"
                )
            values[f"slider_height_{i}"] = height
            values[f"displacement_capacity_{i}"] = _optional_positive(
                f"displacement_capacity_{i}", getattr(self, f"displacement_capacity_{i}"), "m")
        values["yield_displacement"] = validate.positive("yield_displacement", self.yield_displacement, "m")
        for name, value in values.items():
            object.__setattr__(self, name, value)

    @property
    def effective_radius_1(self) -> float:
        """R_eff1 = R_1 - h_1. [m]"""
        return self.radius_1 - self.slider_height_1

    @property
    def effective_radius_2(self) -> float:
        """R_eff2 = R_2 - h_2. [m]"""
        return self.radius_2 - self.slider_height_2

    @property
    def effective_radius(self) -> float:
        """R_eff1 + R_eff2, the radius of the final sliding regime. [m]"""
        return self.effective_radius_1 + self.effective_radius_2

    @property
    def period(self) -> float:
        """Period of the final sliding regime, 2 pi sqrt((R_eff1 + R_eff2)/g). [s]"""
        return 2.0 * math.pi * math.sqrt(self.effective_radius / GRAVITY)

    @property
    def equal_friction(self) -> bool:
        """True when both surfaces have the same coefficient of friction."""
        return math.isclose(self.friction_1, self.friction_2, rel_tol=1e-12, abs_tol=0.0)

    def _surfaces(self):
        """(R_eff, mu, capacity) of the lower-friction surface a, then of surface b."""
        one = (self.effective_radius_1, self.friction_1, self.displacement_capacity_1)
        two = (self.effective_radius_2, self.friction_2, self.displacement_capacity_2)
        return (one, two) if self.friction_1 <= self.friction_2 else (two, one)

    @property
    def transition_displacement(self) -> float:
        """u* = (mu_b - mu_a) R_eff,a: total displacement where both surfaces slide (0 if equal friction). [m]"""
        (ra, mua, _), (_, mub, _) = self._surfaces()
        return (mub - mua) * ra

    @property
    def displacement_capacity(self) -> float | None:
        """Sum of the two dish capacities, or None when either is not given. [m]"""
        if self.displacement_capacity_1 is None or self.displacement_capacity_2 is None:
            return None
        return self.displacement_capacity_1 + self.displacement_capacity_2

    @property
    def first_contact_displacement(self) -> float | None:
        """Total displacement at which the first slider meets its restrainer, or None. [m]

        Beyond it the stiffening regimes of Fenz & Constantinou (2006) begin,
        which :meth:`backbone` does not model. In the two sliding regimes
        surface i moves u_i = R_eff,i (F/W - mu_i) once it slides.
        """
        if self.displacement_capacity is None:
            return None
        (ra, mua, ca), (rb, mub, cb) = self._surfaces()
        ustar = (mub - mua) * ra
        if ca <= ustar:  # surface a reaches its stop in regime I
            return ca
        # regime II: force level at which each surface reaches its stop
        ratio_a = ca / ra + mua
        ratio_b = cb / rb + mub
        ratio = min(ratio_a, ratio_b)
        return ra * (ratio - mua) + rb * (ratio - mub)

    def force(self, weight, displacement):
        """Backbone force from the rigid-plastic regime equations (Fenz & Constantinou 2006).

        Regime I (0 < u <= u*): F = W u/R_eff,a + mu_a W;
        regime II (u > u*): F = W u/(R_eff1 + R_eff2) + W (mu_a R_eff,a + mu_b R_eff,b)/(R_eff1 + R_eff2).

        Parameters
        ----------
        weight : float
            Vertical load, > 0. [kN]
        displacement : float or array
            Displacement, either sign. [m]

        Returns
        -------
        float or array
            Force. [kN]
        """
        w = _weight(weight)
        u = np.asarray(displacement, dtype=float)
        (ra, mua, _), (rb, mub, _) = self._surfaces()
        a = np.abs(u)
        regime_1 = w * a / ra + mua * w
        regime_2 = w * a / (ra + rb) + w * (mua * ra + mub * rb) / (ra + rb)
        out = np.sign(u) * np.where(a <= (mub - mua) * ra, regime_1, regime_2)
        return float(out) if out.ndim == 0 else out

    def bilinear(self, weight) -> Bilinear:
        """Bilinear behaviour for equal friction (one pendulum of radius R_eff1 + R_eff2).

        Parameters
        ----------
        weight : float
            Vertical load, > 0. [kN]

        Raises
        ------
        ValueError
            When the friction values differ: use :meth:`backbone`.
        """
        if not self.equal_friction:
            raise ValueError(
                f"friction_2 = {self.friction_2!r} differs from friction_1 = {self.friction_1!r}: "
                "bilinear() needs equal friction; use backbone() for the multi-regime behaviour"
            )
        return _slider_bilinear(_weight(weight), self.effective_radius, self.friction_1,
                                self.yield_displacement)

    def backbone(self, weight):
        """Force-displacement model under a vertical load.

        Equal friction: a :class:`Bilinear`. Unequal friction: a
        :class:`MultiLinear` with a linear spring W/(R_eff1 + R_eff2) and two
        elastic-plastic elements,

        * element 1: strength mu_a W, stiffness mu_a W/D_y (the sliding of surface a);
        * element 2: stiffness W R_eff,b/(R_eff,a (R_eff1 + R_eff2)) and strength
          W R_eff,b (mu_b - mu_a)/(R_eff1 + R_eff2), which yields exactly at u*.

        Its backbone is regime I then regime II, and its Masing loops follow
        the unloading regimes (surface a reverses after a force change of
        2 mu_a W, surface b after 2 mu_b W).

        Parameters
        ----------
        weight : float
            Vertical load, > 0. [kN]
        """
        if self.equal_friction:
            return self.bilinear(weight)
        w = _weight(weight)
        (ra, mua, _), (rb, mub, _) = self._surfaces()
        total = ra + rb
        k1 = mua * w / self.yield_displacement
        k2 = w * rb / (ra * total)
        f2 = w * rb * (mub - mua) / total
        return MultiLinear(w / total, (k1, k2), (mua * w, f2))

    def with_friction_factor(self, factor) -> "DoubleConcave":
        """Copy with both friction values multiplied by a property modification factor.

        Parameters
        ----------
        factor : float
            Multiplier on both coefficients of friction, > 0. [-]
        """
        f = validate.positive("friction factor", factor)
        return DoubleConcave(self.radius_1, self.friction_1 * f, self.radius_2, self.friction_2 * f,
                             slider_height_1=self.slider_height_1, slider_height_2=self.slider_height_2,
                             displacement_capacity_1=self.displacement_capacity_1,
                             displacement_capacity_2=self.displacement_capacity_2,
                             yield_displacement=self.yield_displacement)

    def checks(self, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
               rotation=0.0, weight_share=None):
        """Checks at a design displacement; parameters as :meth:`FrictionPendulum.checks`.

        Parameters
        ----------
        axial_load : float
            Gravity load on the bearing, > 0. [kN]
        displacement : float
            Design displacement of the bearing, > 0. [m]
        axial_load_max, axial_load_min : float, optional
            Extreme axial loads during the earthquake (tension negative). [kN]
        rotation : float, optional
            Ignored for a slider. [rad]
        weight_share : float, optional
            Weight this bearing restores (default axial_load). [kN]
        """
        return _checks.slider_checks(self, axial_load, displacement, axial_load_max=axial_load_max,
                                     axial_load_min=axial_load_min, weight_share=weight_share)

    def to_dict(self) -> dict:
        return {
            "kind": "double_concave",
            "radius_1": self.radius_1, "friction_1": self.friction_1,
            "radius_2": self.radius_2, "friction_2": self.friction_2,
            "slider_height_1": self.slider_height_1, "slider_height_2": self.slider_height_2,
            "displacement_capacity_1": self.displacement_capacity_1,
            "displacement_capacity_2": self.displacement_capacity_2,
            "yield_displacement": self.yield_displacement,
            "effective_radius": self.effective_radius,
            "transition_displacement": self.transition_displacement,
        }


DOUBLE_CONCAVE = register(BearingType(
    kind="double_concave",
    model=DoubleConcave,
    keys={
        "radius_1": Key("length", low=0.3, high=20.0),
        "friction_1": Key("number", low=0.0, high=0.3, low_inclusive=False, ratio=True),
        "radius_2": Key("length", low=0.3, high=20.0),
        "friction_2": Key("number", low=0.0, high=0.3, low_inclusive=False, ratio=True),
        "slider_height_1": Key("length", required=False, low=0.0, high=2.0),
        "slider_height_2": Key("length", required=False, low=0.0, high=2.0),
        "displacement_capacity_1": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
        "displacement_capacity_2": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
    },
    cross_checks=(Ordering("slider_height_1", "radius_1", "m"), Ordering("slider_height_2", "radius_2", "m")),
    sliding=True,
))
"""The double concave bearing in the bearing registry (study ``type = "double_concave"``); its
history law is that of its backbone (regimes I and II as a MultiLinear)."""
