"""Triple friction pendulum: four concave surfaces, an inner slider between two outer sliders.

Standard configuration (Fenz & Constantinou 2008a): outer surfaces 1 and 4
with equal radii R_1 = R_4, inner surfaces 2 and 3 with equal radii
R_2 = R_3 < R_1, equal inner friction mu_2 = mu_3, and outer friction
mu_2 < mu_1 <= mu_4.  With effective radii R_eff,i = R_i - h_i (h_i the
height from surface i to the pivot) the bearing passes through five sliding
regimes under monotonic loading:

I    sliding on 2 and 3: stiffness W/(R_eff2 + R_eff3), from F = mu_2 W;
II   sliding on 1 and 3 (from F = mu_1 W): stiffness W/(R_eff1 + R_eff3);
III  sliding on 1 and 4 (from F = mu_4 W): stiffness W/(R_eff1 + R_eff4);
IV   surface 1 meets its restrainer (F/W = mu_1 + d_1/R_1): sliding on 2 and 4, stiffening;
V    surface 4 meets its restrainer too: sliding on 2 and 3 again, stiffer still.

Series model (Fenz & Constantinou 2008c): three rigid-plastic pendulum
elements in series, with radii and friction
``(2 R_eff2, mu_2)``, ``(R_eff1 - R_eff2, mu_1)``, ``(R_eff4 - R_eff3, mu_4)``,
so that ``u = sum_i Rbar_i max(0, F/W - mubar_i)``, reproduces regimes I to
III, loading and unloading.  Here it is written as its equivalent parallel
model (a linear spring W/(R_eff1 + R_eff4) and three elastic-plastic
elements, :meth:`TripleFrictionPendulum.backbone`): same backbone, and its
Masing loops reverse the inner sliders first after a force change of
2 mu_2 W, as the series elements do.  **Regimes IV and V (stiffening at the
restrainers) are not represented**: the checks report the displacement at
which regime IV begins and fail when the design displacement passes it.
In the plan model every element acts on the bearing's displacement vector
with a circular yield surface (coupled biaxial plasticity), forces
proportional to the bearing's axial load.

References
----------
Fenz, D. M. & Constantinou, M. C. (2008a). Spherical sliding isolation
bearings with adaptive behavior: Theory. Earthquake Eng. Struct. Dyn. 37(2),
163-183. doi:10.1002/eqe.751
Fenz, D. M. & Constantinou, M. C. (2008c). Modeling triple friction pendulum
bearings for response-history analysis. Earthquake Spectra 24(4), 1011-1028.
doi:10.1193/1.2982531
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from isolation import GRAVITY, validate
from isolation.bearings import checks as _checks
from isolation.bearings.backbone import MultiLinear
from isolation.bearings.registry import BearingType, register
from isolation.bearings.slider import DEFAULT_SLIDER_YIELD_DISPLACEMENT
from isolation.bearings.slider import friction_value as _friction
from isolation.bearings.slider import optional_positive as _optional_positive
from isolation.bearings.slider import weight_value as _weight
from isolation.schema import Key, Ordering

__all__ = ["TripleFrictionPendulum", "TRIPLE_PENDULUM"]


@dataclass(frozen=True)
class TripleFrictionPendulum:
    """Triple friction pendulum in its standard configuration (see the module notes).

    Parameters
    ----------
    radius_outer : float
        Radius of curvature of outer surfaces 1 and 4, > radius_inner. [m]
    radius_inner : float
        Radius of curvature of inner surfaces 2 and 3, > 0. [m]
    friction_inner : float
        Coefficient of friction of surfaces 2 and 3, in (0, 1). [-]
    friction_1 : float
        Coefficient of friction of outer surface 1, > friction_inner. [-]
    friction_4 : float
        Coefficient of friction of outer surface 4, >= friction_1, < 1. [-]
    slider_height_outer, slider_height_inner : float, optional
        Height from the outer / inner surfaces to the pivot, >= 0 and below
        the radius. Default 0. [m]
    displacement_capacity_outer, displacement_capacity_inner : float or None, optional
        Nominal displacement capacity of each outer / inner surface (d_1 = d_4,
        d_2 = d_3), > 0, or None when not chosen. [m]
    yield_displacement : float, optional
        Numerical yield displacement of the first sliding regime, > 0. [m]

    References
    ----------
    Fenz, D. M. & Constantinou, M. C. (2008a). Spherical sliding isolation bearings with adaptive behavior:
    Theory. Earthquake Eng. Struct. Dyn. 37(2), 163-183. doi:10.1002/eqe.751
    Fenz, D. M. & Constantinou, M. C. (2008b). Spherical sliding isolation bearings with adaptive behavior:
    Experimental verification. Earthquake Eng. Struct. Dyn. 37(2), 185-205. doi:10.1002/eqe.750
    Fenz, D. M. & Constantinou, M. C. (2008c). Modeling triple friction pendulum bearings for response-history
    analysis. Earthquake Spectra 24(4), 1011-1028. doi:10.1193/1.2982531 (DOI not verified)
    """

    radius_outer: float
    radius_inner: float
    friction_inner: float
    friction_1: float
    friction_4: float
    slider_height_outer: float = 0.0
    slider_height_inner: float = 0.0
    displacement_capacity_outer: float | None = None
    displacement_capacity_inner: float | None = None
    yield_displacement: float = DEFAULT_SLIDER_YIELD_DISPLACEMENT

    def __post_init__(self) -> None:
        outer = validate.positive("radius_outer", self.radius_outer, "m")
        inner = validate.positive("radius_inner", self.radius_inner, "m")
        h_out = validate.non_negative("slider_height_outer", self.slider_height_outer, "m")
        h_in = validate.non_negative("slider_height_inner", self.slider_height_inner, "m")
        if h_out >= outer:
            raise ValueError(f"slider_height_outer = {h_out!r} is not allowed: must be < radius_outer = {outer!r} [m]")
        if h_in >= inner:
            raise ValueError(f"slider_height_inner = {h_in!r} is not allowed: must be < radius_inner = {inner!r} [m]")
        if outer - h_out <= inner - h_in:
            raise ValueError(
                f"radius_outer = {outer!r} is not allowed: the outer effective radius must exceed the inner one "
                f"({inner - h_in:.4g} m) [m]"
            )
        mu_in = _friction("friction_inner", self.friction_inner)
        mu_1 = _friction("friction_1", self.friction_1)
        mu_4 = _friction("friction_4", self.friction_4)
        if mu_1 <= mu_in:
            raise ValueError(f"friction_1 = {mu_1!r} is not allowed: must exceed friction_inner = {mu_in!r} [-]")
        if mu_4 < mu_1:
            raise ValueError(f"friction_4 = {mu_4!r} is not allowed: must be >= friction_1 = {mu_1!r} [-]")
        values = {
            "radius_outer": outer, "radius_inner": inner, "friction_inner": mu_in, "friction_1": mu_1,
            "friction_4": mu_4, "slider_height_outer": h_out, "slider_height_inner": h_in,
            "displacement_capacity_outer": _optional_positive(
                "displacement_capacity_outer", self.displacement_capacity_outer, "m"),
            "displacement_capacity_inner": _optional_positive(
                "displacement_capacity_inner", self.displacement_capacity_inner, "m"),
            "yield_displacement": validate.positive("yield_displacement", self.yield_displacement, "m"),
        }
        for name, value in values.items():
            object.__setattr__(self, name, value)

    @property
    def effective_radius_outer(self) -> float:
        """R_eff1 = R_eff4 = R_1 - h_1. [m]"""
        return self.radius_outer - self.slider_height_outer

    @property
    def effective_radius_inner(self) -> float:
        """R_eff2 = R_eff3 = R_2 - h_2. [m]"""
        return self.radius_inner - self.slider_height_inner

    @property
    def effective_radius(self) -> float:
        """R_eff1 + R_eff4, the radius of regime III. [m]"""
        return 2.0 * self.effective_radius_outer

    @property
    def period(self) -> float:
        """Period of regime III, 2 pi sqrt((R_eff1 + R_eff4)/g). [s]"""
        return 2.0 * math.pi * math.sqrt(self.effective_radius / GRAVITY)

    @property
    def friction(self) -> float:
        """Friction of the first sliding regime (inner surfaces), as for single pendulums. [-]"""
        return self.friction_inner

    def series_elements(self) -> tuple:
        """(Rbar [m], mubar [-]) of the three series elements (Fenz & Constantinou 2008c)."""
        r_in, r_out = self.effective_radius_inner, self.effective_radius_outer
        return ((2.0 * r_in, self.friction_inner), (r_out - r_in, self.friction_1), (r_out - r_in, self.friction_4))

    def displacement_at(self, force_ratio) -> np.ndarray:
        """Total displacement reached on the loading backbone at F/W = ``force_ratio`` (regimes I-III). [m]

        Parameters
        ----------
        force_ratio : float or array
            F/W, >= 0. [-]
        """
        ratio = np.asarray(force_ratio, dtype=float)
        return sum(r * np.maximum(ratio - mu, 0.0) for r, mu in self.series_elements())

    @property
    def regime_limits(self) -> tuple:
        """Total displacements u*_1 (start of II) and u*_2 (start of III). [m]"""
        return (float(self.displacement_at(self.friction_1)), float(self.displacement_at(self.friction_4)))

    @property
    def first_contact_displacement(self) -> float | None:
        """Total displacement at which regime IV begins (an outer slider meets its restrainer), or None. [m]

        Surface i slides ``R_eff,i (F/W - mu_i)`` and stops at ``d_i R_eff,i / R_i``, i.e. at
        F/W = mu_i + d_i/R_i (Fenz & Constantinou 2008a).
        """
        if self.displacement_capacity_outer is None:
            return None
        d = self.displacement_capacity_outer
        ratio = min(self.friction_1, self.friction_4) + d / self.radius_outer
        return float(self.displacement_at(max(ratio, self.friction_4)))

    @property
    def inner_travel(self) -> float:
        """Largest travel of an inner surface in regimes I-III, R_eff2 (mu_4 - mu_2) (surface 3). [m]"""
        return self.effective_radius_inner * (self.friction_4 - self.friction_inner)

    @property
    def displacement_capacity(self) -> float | None:
        """Total capacity d*_1 + d*_2 + d*_3 + d*_4 with d*_i = d_i R_eff,i/R_i, or None. [m]"""
        if self.displacement_capacity_outer is None or self.displacement_capacity_inner is None:
            return None
        outer = self.displacement_capacity_outer * self.effective_radius_outer / self.radius_outer
        inner = self.displacement_capacity_inner * self.effective_radius_inner / self.radius_inner
        return 2.0 * (outer + inner)

    def force(self, weight, displacement):
        """Loading-backbone force (regimes I-III) from the series model, for either sign of displacement.

        Parameters
        ----------
        weight : float
            Vertical load, > 0. [kN]
        displacement : float or array
            Displacement. [m]

        Returns
        -------
        float or array
            Force. [kN]
        """
        w = _weight(weight)
        u = np.asarray(displacement, dtype=float)
        a = np.abs(u)
        (r1, m1), (r2, m2), (r3, m3) = self.series_elements()
        u1, u2 = self.regime_limits
        ratio = np.where(a <= u1, m1 + a / r1,
                         np.where(a <= u2, m2 + (a - u1) / (r1 + r2), m3 + (a - u2) / (r1 + r2 + r3)))
        out = np.sign(u) * w * ratio
        return float(out) if out.ndim == 0 else out

    def backbone(self, weight) -> MultiLinear:
        """Parallel model of the series elements under a vertical load (module notes).

        Linear spring W/(2 R_eff1); element 0 strength mu_2 W, stiffness mu_2 W/D_y;
        element 1 stiffness K_I - K_II yielding at u*_1; element 2 stiffness K_II - K_III
        yielding at u*_2, with K_I = W/(2 R_eff2), K_II = W/(R_eff1 + R_eff2), K_III = W/(2 R_eff1).

        Parameters
        ----------
        weight : float
            Vertical load, > 0. [kN]
        """
        w = _weight(weight)
        r_in, r_out = self.effective_radius_inner, self.effective_radius_outer
        k_1, k_2, k_3 = w / (2.0 * r_in), w / (r_out + r_in), w / (2.0 * r_out)
        u1, u2 = self.regime_limits
        stiffnesses = [self.friction_inner * w / self.yield_displacement, k_1 - k_2]
        strengths = [self.friction_inner * w, (k_1 - k_2) * u1]
        if u2 > u1:
            stiffnesses.append(k_2 - k_3)
            strengths.append((k_2 - k_3) * u2)
        else:  # mu_1 = mu_4: regime II has no length
            stiffnesses[1] = k_1 - k_3
            strengths[1] = (k_1 - k_3) * u1
        return MultiLinear(k_3, tuple(stiffnesses), tuple(strengths))

    def with_friction_factor(self, factor) -> "TripleFrictionPendulum":
        """Copy with every coefficient of friction multiplied by a property modification factor.

        Parameters
        ----------
        factor : float
            Multiplier, > 0. [-]
        """
        f = validate.positive("friction factor", factor)
        return replace(self, friction_inner=self.friction_inner * f, friction_1=self.friction_1 * f,
                       friction_4=self.friction_4 * f)

    def checks(self, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
               rotation=0.0, weight_share=None):
        """Checks at a design displacement: capacities per surface, regime IV onset, restoring force, tension.

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
        out = _checks.slider_checks(self, axial_load, displacement, axial_load_max=axial_load_max,
                                    axial_load_min=axial_load_min, weight_share=weight_share)
        if self.displacement_capacity_inner is not None:
            capacity = self.displacement_capacity_inner * self.effective_radius_inner / self.radius_inner
            travel = self.inner_travel
            out.append(_checks.Check(
                "inner surface travel in regimes I-III", travel, capacity, bool(travel <= capacity), "m",
                "Fenz & Constantinou 2008a: surface 3 slides R_eff3 (mu_4 - mu_3) before regime III; "
                "its capacity is d_3 R_eff3/R_3"))
        return out

    def to_dict(self) -> dict:
        u1, u2 = self.regime_limits
        return {
            "kind": "triple_pendulum",
            "radius_outer": self.radius_outer, "radius_inner": self.radius_inner,
            "friction_inner": self.friction_inner, "friction_1": self.friction_1, "friction_4": self.friction_4,
            "slider_height_outer": self.slider_height_outer, "slider_height_inner": self.slider_height_inner,
            "displacement_capacity_outer": self.displacement_capacity_outer,
            "displacement_capacity_inner": self.displacement_capacity_inner,
            "yield_displacement": self.yield_displacement,
            "effective_radius": self.effective_radius,
            "regime_limits": [u1, u2],
            "first_contact_displacement": self.first_contact_displacement,
        }


TRIPLE_PENDULUM = register(BearingType(
    kind="triple_pendulum",
    model=TripleFrictionPendulum,
    keys={
        "radius_outer": Key("length", low=0.3, high=20.0),
        "radius_inner": Key("length", low=0.1, high=10.0),
        "friction_inner": Key("number", low=0.0, high=0.3, low_inclusive=False),
        "friction_1": Key("number", low=0.0, high=0.3, low_inclusive=False),
        "friction_4": Key("number", low=0.0, high=0.3, low_inclusive=False),
        "slider_height_outer": Key("length", required=False, low=0.0, high=2.0),
        "slider_height_inner": Key("length", required=False, low=0.0, high=1.0),
        "displacement_capacity_outer": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
        "displacement_capacity_inner": Key("length", required=False, low=0.0, high=1.0, low_inclusive=False),
    },
    cross_checks=(Ordering("slider_height_outer", "radius_outer", "m"),
                  Ordering("slider_height_inner", "radius_inner", "m"),
                  Ordering("radius_inner", "radius_outer", "m"),
                  Ordering("friction_inner", "friction_1", "-"),
                  Ordering("friction_1", "friction_4", "-", strict=False)),
    sliding=True,
))
"""The triple friction pendulum in the bearing registry (study ``type = "triple_pendulum"``); its
history law is that of its backbone (regimes I-III as a MultiLinear)."""
