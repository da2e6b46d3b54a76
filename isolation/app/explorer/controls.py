"""Every control of the explorer in one table, and the SI/US factors for showing them.

A :class:`Control` names an :class:`isolation.app.explorer.answers.ExplorerSettings`
field, its label, the kind of quantity (so that US customary display converts
it through :mod:`isolation.units`), its slider range in SI and the bearing
types or code basis it belongs to. Ranges lie inside the study file's allowed
ranges (:data:`isolation.study.BEARING_KEYS`, :mod:`isolation.study.sections`),
so that every setting the sliders reach can be exported as a valid study.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from isolation import units as _units
from isolation.codes import registry as _codes

__all__ = ["BEARING_TYPES", "BASES", "TRADE_OFF_PARAMETERS", "Control", "CONTROLS", "CHOICES", "GROUPS", "STUDY_TYPES",
           "unit_factor", "unit_name", "to_display", "from_display", "visible"]

BEARING_TYPES = ("friction pendulum", "lead rubber", "double concave", "high-damping rubber")
"""Bearing types the explorer offers (the first two as before, then the others)."""

STUDY_TYPES = {"friction pendulum": "friction_pendulum", "lead rubber": "lead_rubber",
               "double concave": "double_concave", "high-damping rubber": "high_damping_rubber"}
"""Explorer bearing type -> ``type`` of a study file's ``[[alternative.bearings]]``."""



def _owner(key: str) -> str:
    """Name of the first registered code basis that reads the site key ``key`` (its site inputs)."""
    return next(name for name in _codes.names() if key in _codes.get(name).site_inputs)


_SLIDERS = ("friction pendulum", "double concave")
_ELASTOMERS = ("lead rubber", "high-damping rubber")


@dataclass(frozen=True)
class Control:
    """One numeric control.

    Attributes
    ----------
    field : str
        Field of :class:`isolation.app.explorer.answers.ExplorerSettings`.
    label : str
        Label without unit; the unit of the chosen system is added.
    kind : str
        Quantity kind of :mod:`isolation.units` ("length", "weight", "stress",
        "time"), or a unit shown as is ("-", "g") for numbers that do not convert.
    low, high, step : float
        Slider range and step in SI (m, kN, kPa, s). [SI]
    group : str
        Heading the control sits under.
    types : tuple of str
        Bearing types it belongs to; empty: every type.
    basis : str
        Code basis it belongs to; empty: both.
    integer : bool
        Whole numbers only.
    """

    field: str
    label: str
    kind: str
    low: float
    high: float
    step: float
    group: str
    types: tuple = ()
    basis: str = ""
    integer: bool = False


GROUPS = ("Isolation plane", "Bearing", "Site", "Building", "Property bounds")
"""Headings of the control column, in order."""

CONTROLS: tuple[Control, ...] = (
    Control("weight", "Seismic weight W", "weight", 5_000.0, 200_000.0, 500.0, "Isolation plane"),
    Control("bearing_count", "Number of bearings n", "-", 4, 200, 1, "Isolation plane", integer=True),
    Control("grid_along", "Bearings along the length (0: square bays)", "-", 0, 50, 1, "Isolation plane",
            integer=True),
    Control("radius", "Radius of curvature R", "length", 1.0, 8.0, 0.05, "Bearing", types=("friction pendulum",)),
    Control("friction", "Friction coefficient μ", "-", 0.02, 0.15, 0.005, "Bearing", types=("friction pendulum",)),
    Control("radius_1", "Radius, lower dish R1", "length", 1.0, 6.0, 0.05, "Bearing", types=("double concave",)),
    Control("friction_1", "Friction, lower dish μ1", "-", 0.02, 0.15, 0.005, "Bearing", types=("double concave",)),
    Control("radius_2", "Radius, upper dish R2", "length", 1.0, 6.0, 0.05, "Bearing", types=("double concave",)),
    Control("friction_2", "Friction, upper dish μ2", "-", 0.02, 0.15, 0.005, "Bearing", types=("double concave",)),
    Control("outer_diameter", "Rubber diameter D_o", "length", 0.3, 1.5, 0.01, "Bearing", types=_ELASTOMERS),
    Control("lead_diameter", "Lead core diameter D_L", "length", 0.03, 0.5, 0.005, "Bearing", types=("lead rubber",)),
    Control("layer_thickness", "Rubber layer t", "length", 0.004, 0.03, 0.0005, "Bearing", types=_ELASTOMERS),
    Control("layers", "Rubber layers N", "-", 4, 80, 1, "Bearing", types=_ELASTOMERS, integer=True),
    Control("shear_modulus", "Shear modulus G", "stress", 300.0, 1_000.0, 10.0, "Bearing", types=("lead rubber",)),
    Control("displacement_capacity", "Displacement capacity", "length", 0.1, 1.5, 0.01, "Bearing"),
    Control("sms", "S_MS", "g", 0.2, 3.0, 0.01, "Site", basis=_owner("sms")),
    Control("sm1", "S_M1", "g", 0.1, 2.0, 0.01, "Site", basis=_owner("sm1")),
    Control("s1", "Mapped S_1 (ELF limits)", "g", 0.05, 1.5, 0.01, "Site", basis=_owner("s1")),
    Control("long_period", "Long-period transition T_L", "time", 2.0, 16.0, 0.5, "Site", basis=_owner("long_period")),
    Control("ag", "Ground acceleration a_g", "g", 0.05, 0.6, 0.01, "Site", basis=_owner("ag")),
    Control("fixed_base_period", "Fixed-base period T_fb", "time", 0.1, 2.5, 0.01, "Building"),
    Control("storeys", "Storeys above isolators", "-", 1, 20, 1, "Building", integer=True),
    Control("storey_height", "Storey height", "length", 2.5, 6.0, 0.1, "Building"),
    Control("plan_length", "Plan length (longer)", "length", 10.0, 120.0, 1.0, "Building"),
    Control("plan_width", "Plan width", "length", 10.0, 120.0, 1.0, "Building"),
    Control("eccentricity", "Eccentricity e", "length", 0.0, 5.0, 0.1, "Building"),
    Control("response_modification", "R (fixed base)", "-", 1.0, 8.0, 0.5, "Building"),
    Control("lower_factor", "Lower-bound factor", "-", 0.5, 1.0, 0.01, "Property bounds"),
    Control("upper_factor", "Upper-bound factor", "-", 1.0, 2.0, 0.01, "Property bounds"),
)
"""The numeric controls, in the order shown."""

CHOICES = {
    "site_class": (_codes.get(_owner("site_class")).site_classes, "Site class", _owner("site_class")),
    "ground_type": (_codes.get(_owner("ground_type")).site_classes, "Ground type", _owner("ground_type")),
}
"""Drop-down controls of the site: field -> (options, label, basis)."""

BASES = tuple(dict.fromkeys(c.basis for c in CONTROLS if c.basis))
"""Code bases the explorer offers: those whose site controls it has (ASCE/SEI 7-16 Ch. 17,
EN 1998-1 §10)."""


def visible(control: Control, bearing_type: str, basis: str) -> bool:
    """Whether a control applies to this bearing type and code basis."""
    return (not control.types or bearing_type in control.types) and (not control.basis or control.basis == basis)


@lru_cache(maxsize=None)
def unit_factor(kind: str, system: str) -> float:
    """Display value per SI value for a kind in a unit system (1 when it does not convert). [-]"""
    if kind not in _units.KINDS or system == "SI":
        return 1.0
    return _units.convert(1.0, _units.KINDS[kind][0], _units.BARE_UNITS[system][kind])


def unit_name(kind: str, system: str) -> str:
    """Unit shown beside a control of this kind."""
    if kind in _units.KINDS:
        return _units.BARE_UNITS[system][kind]
    return kind


def to_display(value: float, kind: str, system: str) -> float:
    """SI value -> value shown in ``system``. [shown unit]"""
    return value * unit_factor(kind, system)


def from_display(value: float, kind: str, system: str) -> float:
    """Value shown in ``system`` -> SI value. [SI]"""
    return value / unit_factor(kind, system)


TRADE_OFF_PARAMETERS = {
    "friction pendulum": ("friction", "radius"),
    "double concave": ("friction", "radius"),
    "lead rubber": ("lead_diameter", "layers"),
    "high-damping rubber": ("layers", "outer_diameter"),
}
"""Parameters the trade-off curve may sweep, per bearing type (double concave: both dishes alike)."""

_CONTROL = {c.field: c for c in CONTROLS}
