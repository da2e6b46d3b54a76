"""Building data of the ASCE/SEI 7-16 Ch. 17 equivalent lateral force report, and its storey forces.

Re-exported by :mod:`isolation.codes.asce7` (``ElfBuilding``, ``StoreyForce``).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from isolation import validate
from isolation.codes.asce7_fixed_base import FRAME_TYPES
from isolation.design.single_mode import _ToDict

__all__ = ["ElfBuilding", "StoreyForce"]


@dataclass(frozen=True)
class ElfBuilding(_ToDict):
    """Building data for the ASCE/SEI 7-16 Ch. 17 equivalent lateral force report.

    Parameters
    ----------
    base_weight : float
        Weight of the base level (the floor just above the isolators), >= 0. [kN]
    floor_weights : sequence of float
        Weights of the levels above the base level, bottom to top, > 0. [kN]
    floor_elevations : sequence of float
        Elevations of those levels above the isolation interface, increasing, > 0. [m]
    plan_length, plan_width : float
        Plan dimensions b (longer) and d, > 0. [m]
    response_modification : float
        R of the superstructure's lateral system on a fixed base, > 0. [-]
    eccentricity : float
        Actual eccentricity between centres of mass and rigidity, >= 0; 5 % of
        ``plan_length`` accidental eccentricity is added. [m]
    corner_distance : float, optional
        Distance y from the centre of rigidity to the corner bearing;
        default plan_length/2 + eccentricity. [m]
    torsion_period_ratio : float
        P_T, translational over torsional period, > 0 (taken <= 1.0). [-]
    isolator_kind : str
        "sliding" (abrupt bilinear transition, V_st exponent 1 - 3.5 beta_M) or "other". [-]
    fixed_base_period : float, optional
        T_fb of the superstructure on a fixed base; default T_a = C_t h^x. [s]
    frame : str
        Lateral system for T_a, a key of :data:`isolation.codes.asce7_fixed_base.FRAME_TYPES`. [-]
    importance : float
        Importance factor I_e of the building's risk category, > 0; used only for
        the fixed-base comparison shear V_fb. The isolated design (V_s lower limit
        at T_M, drift estimate) takes I_e = 1.0 (ASCE/SEI 7-16 §17.2.1, from memory). [-]
    wind_base_shear : float
        Base shear from factored design wind, >= 0. [kN]
    activation_force : float, optional
        Force that fully activates the isolation system (yield level, breakaway
        friction, wind-restraint capacity); default the greater of the upper-bound
        and 1.5 x the nominal yield force of the property sets (§17.5.4.3 item 3). [kN]
    s1 : float
        Mapped MCE_R spectral acceleration at 1 s, S_1, >= 0. [g]
    site_class : str
        Site class "A"-"F". [-]
    height : float, optional
        Structural height above the isolation interface; default top elevation. [m]
    irregular : bool
        True when the superstructure has a structural irregularity barred by §17.4.1. [-]
    moat_clearance : float
        Clearance added to D_TM for the moat, >= 0 (common practice). [m]
    """

    base_weight: float
    floor_weights: tuple
    floor_elevations: tuple
    plan_length: float
    plan_width: float
    response_modification: float
    eccentricity: float = 0.0
    corner_distance: float | None = None
    torsion_period_ratio: float = 1.0
    isolator_kind: str = "other"
    fixed_base_period: float | None = None
    frame: str = "other"
    importance: float = 1.0
    wind_base_shear: float = 0.0
    activation_force: float | None = None
    s1: float = 0.0
    site_class: str = "D"
    height: float | None = None
    irregular: bool = False
    moat_clearance: float = 0.05

    def __post_init__(self) -> None:
        set_ = lambda name, value: object.__setattr__(self, name, value)  # noqa: E731
        set_("base_weight", validate.non_negative("base_weight", self.base_weight, "kN"))
        w = validate.positive_array("floor_weights", self.floor_weights, "kN")
        h = validate.positive_array("floor_elevations", self.floor_elevations, "m")
        if w.ndim != 1 or h.shape != w.shape:
            raise ValueError(f"floor_elevations has {h.size} entries but floor_weights has {w.size}: must match")
        if np.any(np.diff(h) <= 0.0):
            raise ValueError(f"floor_elevations = {h.tolist()!r} is not allowed: must increase upwards [m]")
        set_("floor_weights", tuple(float(x) for x in w))
        set_("floor_elevations", tuple(float(x) for x in h))
        for name, unit in (("plan_length", "m"), ("plan_width", "m"), ("response_modification", "-"),
                           ("torsion_period_ratio", "-"), ("importance", "-")):
            set_(name, validate.positive(name, getattr(self, name), unit))
        for name, unit in (("eccentricity", "m"), ("wind_base_shear", "kN"), ("s1", "g"), ("moat_clearance", "m")):
            set_(name, validate.non_negative(name, getattr(self, name), unit))
        for name, unit, check in (("corner_distance", "m", validate.non_negative),
                                  ("fixed_base_period", "s", validate.positive),
                                  ("activation_force", "kN", validate.positive), ("height", "m", validate.positive)):
            if getattr(self, name) is not None:
                set_(name, check(name, getattr(self, name), unit))
        validate.one_of("isolator_kind", self.isolator_kind, ("sliding", "other"))
        validate.one_of("frame", self.frame, tuple(FRAME_TYPES))
        validate.one_of("site_class", self.site_class, tuple("ABCDEF"))
        validate.one_of("irregular", self.irregular, (True, False))

    @property
    def weight_above(self) -> float:
        """W_s, weight above the base level. [kN]"""
        return float(sum(self.floor_weights))

    @property
    def total_weight(self) -> float:
        """W = W_s + base level weight. [kN]"""
        return self.base_weight + self.weight_above

    @property
    def structural_height(self) -> float:
        """Height above the isolation interface. [m]"""
        return self.height if self.height is not None else self.floor_elevations[-1]


@dataclass(frozen=True)
class StoreyForce(_ToDict):
    """Lateral force F_x [kN], storey shear [kN] and drift estimate [m] at one level."""

    level: int
    elevation: float
    weight: float
    force: float
    storey_shear: float
    drift: float
    drift_ratio: float
