"""Checks of single bearings: the result object and the formulas behind each check.

Every check returns a :class:`Check` with the value, the limit, pass/fail, the
unit and the source of the limit. Limits marked "from memory" were recalled
from the standard named and not re-read; verify the clause before quoting it in
a report. This is a feasibility-stage screen, not construction design.

Elastomer layer mechanics (Kelly & Konstantinidis 2011; Naeim & Kelly 1999):

* shape factor S = loaded area / free (bulging) area;
* compression modulus 1/E_c = 1/(6 G S^2) + 4/(3 K) (circular pad, bulk modulus K);
* buckling P_cr = sqrt(P_S P_E), P_S = G A h/T_r,
  P_E = pi^2 (E_c/3) I (h/T_r)/h^2; reduced at a lateral offset Delta by the
  overlap of top and bottom plates, A_r/A = (delta - sin delta)/pi with
  delta = 2 arccos(Delta/D);
* compression strain gamma_c = P/(A G S) (equal to 6 S eps_c with E_c = 6 G S^2);
* shear strain gamma_s = Delta/T_r;
* rotation strain gamma_r = 0.375 D^2 theta/(t T_r): the AASHTO form
  D_r B^2 theta/(t_i T_r) with D_r = 0.375 for a circular pad (from memory);
  the same coefficient follows from the incompressible thin-layer solution
  gamma_max = 1.5 R^2 alpha/t^2 with per-layer rotation alpha = theta t/T_r
  (derived).

References
----------
Kelly, J. M. & Konstantinidis, D. A. (2011). Mechanics of Rubber Bearings for Seismic and Vibration Isolation. Wiley.
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
AASHTO (2014). Guide Specifications for Seismic Isolation Design, 4th ed.
ASCE/SEI 7-16, Chapter 17 (restoring force, §17.2.4.4).
Gent, A. N. (1990). Cavitation in rubber: a cautionary tale. Rubber Chem. Technol. 63.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from isolation import GRAVITY, validate

__all__ = ["Check", "shape_factor", "hole_factor", "compression_modulus", "overlap_area", "overlap_ratio",
           "buckling_load", "rotation_strain", "restoring_force_check", "slider_checks", "elastomer_checks", "LIMITS"]

LIMITS = {
    "restoring_force": (0.025, "ASCE/SEI 7-16 §17.2.4.4: F(D) - F(D/2) >= 0.025 W"),
    "compression_strain": (2.5, "AASHTO Guide Spec. Seismic Isolation Design: gamma_c <= 2.5 (from memory)"),
    "shear_strain": (2.5, "AASHTO Guide Spec. Seismic Isolation Design: gamma_s,eq <= 2.5 (from memory)"),
    "combined_strain": (5.5, "AASHTO Guide Spec. Seismic Isolation Design: "
                             "gamma_c + gamma_s + 0.5 gamma_r <= 5.5 (from memory)"),
    "buckling_zero": (3.0, "AASHTO Guide Spec. Seismic Isolation Design: P_cr/P >= 3 at zero "
                           "displacement (from memory)"),
    "buckling_displaced": (1.1, "AASHTO Guide Spec. Seismic Isolation Design: P_cr(Delta)/P_max >= 1.1 "
                                "(from memory)"),
    "tension": (3.0, "Gent: cavitation of rubber at a hydrostatic tension of about 3 G (from memory)"),
    "shape_factor": (10.0, "common practice: isolator layers have S >= 10"),
    "vertical_period": (0.1, "common practice: vertical period <= 0.1 s (frequency >= 10 Hz)"),
}


@dataclass(frozen=True)
class Check:
    """One check of a bearing or a system.

    Parameters
    ----------
    name : str
        What is checked, read aloud ("shear strain").
    value : float
        The computed value. [unit]
    limit : float or None
        The limit, or None for a value reported without a limit. [unit]
    passed : bool
        True when the value satisfies the limit.
    unit : str
        Unit of value and limit ("m", "kN", "-").
    source : str
        Clause or source of the limit, with "from memory"/"common practice" marks.
    """

    name: str
    value: float
    limit: float | None
    passed: bool
    unit: str
    source: str

    def to_dict(self) -> dict:
        def plain(x):
            return None if x is None or not math.isfinite(x) else float(x)
        return {"name": self.name, "value": plain(self.value), "limit": plain(self.limit),
                "passed": bool(self.passed), "unit": self.unit, "source": self.source}


def _at_most(name, value, key, unit):
    limit, source = LIMITS[key]
    return Check(name, float(value), limit, bool(value <= limit), unit, source)


def _at_least(name, value, key, unit):
    limit, source = LIMITS[key]
    return Check(name, float(value), limit, bool(value >= limit), unit, source)


# --- elastomer formulas -----------------------------------------------------------
def shape_factor(outer_diameter, layer_thickness, inner_diameter=0.0, *, inner_face_free=False) -> float:
    """Shape factor of one circular or annular rubber layer.

    S = pi (Do^2 - Di^2)/4 / (pi Do t) = (Do^2 - Di^2)/(4 Do t) when only the
    outer face bulges (solid pad, or a hole filled by a lead core); with a free
    inner face the free area is pi (Do + Di) t, so S = (Do - Di)/(4 t).

    Parameters
    ----------
    outer_diameter : float
        Bonded diameter of the layer, > 0. [m]
    layer_thickness : float
        Thickness of one rubber layer, > 0. [m]
    inner_diameter : float, optional
        Diameter of the central hole, in [0, outer_diameter). [m]
    inner_face_free : bool, optional
        True when the hole is empty (its face bulges too).
    """
    do = validate.positive("outer_diameter", outer_diameter, "m")
    t = validate.positive("layer_thickness", layer_thickness, "m")
    di = validate.non_negative("inner_diameter", inner_diameter, "m")
    if di >= do:
        raise ValueError(f"inner_diameter = {inner_diameter!r} is not allowed: must be < outer_diameter = {do!r} [m]")
    if inner_face_free:
        return (do - di) / (4.0 * t)
    return (do**2 - di**2) / (4.0 * do * t)


def hole_factor(outer_diameter, inner_diameter) -> float:
    """Factor F on the compression modulus of a layer with an empty central hole.

    F = (r^2 + 1)/(r - 1)^2 + (1 + r)/((1 - r) ln r) with r = D_o/D_i, used with
    S = (D_o - D_i)/(4 t) in E_c = 6 G S^2 F (Constantinou, Kartoum & Kelly 1992,
    Analysis of compression of hollow circular elastomeric bearings, Eng. Struct.
    14(2) 103-111). F tends to 1 as the hole closes (D_i -> 0): no hole gives 1.

    Parameters
    ----------
    outer_diameter : float
        Bonded outer diameter D_o, > 0. [m]
    inner_diameter : float
        Hole diameter D_i, in [0, outer_diameter). [m]

    Returns
    -------
    float
        F, in (0, 1]. [-]

    References
    ----------
    Constantinou, M. C., Kartoum, A. & Kelly, J. M. (1992). Analysis of compression of hollow circular
    elastomeric bearings. Engineering Structures 14(2), 103-111. DOI not verified.
    """
    do = validate.positive("outer_diameter", outer_diameter, "m")
    di = validate.non_negative("inner_diameter", inner_diameter, "m")
    if di >= do:
        raise ValueError(f"inner_diameter = {inner_diameter!r} is not allowed: must be < outer_diameter = {do!r} [m]")
    if di == 0.0:
        return 1.0
    r = do / di
    return (r**2 + 1.0) / (r - 1.0) ** 2 + (1.0 + r) / ((1.0 - r) * math.log(r))


def compression_modulus(shear_modulus, shape, bulk_modulus=None, hole=1.0) -> float:
    """Compression modulus of a bonded circular layer, 1/E_c = 1/(6 G S^2 F) + 4/(3 K).

    Parameters
    ----------
    shear_modulus : float
        Shear modulus G, > 0. [kPa]
    shape : float
        Shape factor S, > 0. [-]
    bulk_modulus : float or None, optional
        Bulk modulus K, > 0; None for incompressible rubber (E_c = 6 G S^2 F). [kPa]
    hole : float, optional
        Hole factor F of :func:`hole_factor` for a layer with an empty central
        hole, in (0, 1]; 1 for a solid layer (default). [-]

    Returns
    -------
    float
        E_c. [kPa]

    References
    ----------
    Kelly, J. M. & Konstantinidis, D. A. (2011). Mechanics of Rubber Bearings for Seismic and Vibration
    Isolation. Wiley, Chichester. DOI not verified.
    Constantinou, M. C., Kartoum, A. & Kelly, J. M. (1992). Analysis of compression of hollow circular
    elastomeric bearings. Engineering Structures 14(2), 103-111. DOI not verified.
    """
    g = validate.positive("shear_modulus", shear_modulus, "kPa")
    s = validate.positive("shape_factor", shape, "-")
    f = validate.in_range("hole", hole, 0.0, 1.0, "-", low_inclusive=False)
    incompressible = 6.0 * g * s**2 * f
    if bulk_modulus is None:
        return incompressible
    k = validate.positive("bulk_modulus", bulk_modulus, "kPa")
    return 1.0 / (1.0 / incompressible + 4.0 / (3.0 * k))


def overlap_ratio(diameter, displacement):
    """A_r/A for two circles of diameter D offset by Delta: (delta - sin delta)/pi, delta = 2 arccos(Delta/D).

    Parameters
    ----------
    diameter : float
        Bonded diameter, > 0. [m]
    displacement : float or array
        Lateral offset Delta >= 0; 0 beyond Delta = D. [m]
    """
    d = validate.positive("diameter", diameter, "m")
    delta_in = np.asarray(displacement, dtype=float)
    if not np.all(np.isfinite(delta_in)) or np.any(delta_in < 0.0):
        raise ValueError(f"displacement = {displacement!r} is not allowed: must be finite and >= 0 [m]")
    delta = 2.0 * np.arccos(np.clip(delta_in / d, 0.0, 1.0))
    out = (delta - np.sin(delta)) / math.pi
    return float(out) if out.ndim == 0 else out


def overlap_area(diameter, displacement):
    """Overlap area A_r = (D^2/4)(delta - sin delta) of top and bottom plates. [m2]

    Parameters
    ----------
    diameter : float
        Bonded diameter, > 0. [m]
    displacement : float or array
        Lateral offset, >= 0. [m]
    """
    ratio = np.asarray(overlap_ratio(diameter, displacement))
    out = math.pi * float(diameter) ** 2 / 4.0 * ratio
    return float(out) if out.ndim == 0 else out


def buckling_load(shear_modulus, area, inertia, compression, rubber_thickness, height) -> float:
    """Critical load at zero displacement, P_cr = sqrt(P_S P_E) (Kelly & Konstantinidis 2011).

    Parameters
    ----------
    shear_modulus : float
        G, > 0. [kPa]
    area : float
        Bonded area A, > 0. [m2]
    inertia : float
        Second moment of the bonded area I, > 0. [m4]
    compression : float
        Compression modulus E_c, > 0 (bending uses E_c/3, circular pad). [kPa]
    rubber_thickness : float
        Total rubber thickness T_r, > 0. [m]
    height : float
        Height of rubber plus internal shims h, >= T_r. [m]

    Returns
    -------
    float
        P_cr. [kN]

    References
    ----------
    Kelly, J. M. & Konstantinidis, D. A. (2011). Mechanics of Rubber Bearings for Seismic and Vibration
    Isolation. Wiley, Chichester. DOI not verified.
    """
    g = validate.positive("shear_modulus", shear_modulus, "kPa")
    a = validate.positive("area", area, "m2")
    i = validate.positive("inertia", inertia, "m4")
    ec = validate.positive("compression_modulus", compression, "kPa")
    tr = validate.positive("rubber_thickness", rubber_thickness, "m")
    h = validate.positive("height", height, "m")
    shear_load = g * a * h / tr
    euler_load = math.pi**2 * (ec / 3.0) * i * (h / tr) / h**2
    return math.sqrt(shear_load * euler_load)


def rotation_strain(diameter, layer_thickness, rubber_thickness, rotation) -> float:
    """Shear strain from rotation, gamma_r = 0.375 D^2 theta/(t T_r) (circular pad).

    Parameters
    ----------
    diameter : float
        Bonded diameter D, > 0. [m]
    layer_thickness : float
        One layer t, > 0. [m]
    rubber_thickness : float
        Total rubber T_r, > 0. [m]
    rotation : float
        Rotation of the bearing theta, >= 0. [rad]
    """
    d = validate.positive("diameter", diameter, "m")
    t = validate.positive("layer_thickness", layer_thickness, "m")
    tr = validate.positive("rubber_thickness", rubber_thickness, "m")
    theta = validate.non_negative("rotation", rotation, "rad")
    return 0.375 * d**2 * theta / (t * tr)


# --- check builders ---------------------------------------------------------------
def _loads(axial_load, displacement, axial_load_max, axial_load_min, weight_share):
    p = validate.positive("axial_load", axial_load, "kN")
    d = validate.positive("displacement", displacement, "m")
    pmax = p if axial_load_max is None else validate.positive("axial_load_max", axial_load_max, "kN")
    pmin = p if axial_load_min is None else validate.finite("axial_load_min", axial_load_min, "kN")
    if pmax < p:
        raise ValueError(f"axial_load_max = {axial_load_max!r} is not allowed: must be >= axial_load = {p!r} [kN]")
    if pmin > p:
        raise ValueError(f"axial_load_min = {axial_load_min!r} is not allowed: must be <= axial_load = {p!r} [kN]")
    w = p if weight_share is None else validate.positive("weight_share", weight_share, "kN")
    return p, d, pmax, pmin, w


def restoring_force_check(backbone, displacement, weight, name="restoring force") -> Check:
    """(F(D) - F(D/2))/W against 0.025 (ASCE/SEI 7-16 §17.2.4.4).

    Parameters
    ----------
    backbone : object with force(d)
        Force-displacement backbone of the bearing or plane. [kN]
    displacement : float
        Design displacement D, > 0. [m]
    weight : float
        Weight restored W, > 0. [kN]
    """
    d = validate.positive("displacement", displacement, "m")
    w = validate.positive("weight", weight, "kN")
    ratio = (backbone.force(d) - backbone.force(0.5 * d)) / w
    return _at_least(name, ratio, "restoring_force", "-")


def slider_checks(bearing, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
                  weight_share=None) -> list[Check]:
    """Checks of a friction pendulum (single or double concave); see its ``checks`` method."""
    p, d, _, pmin, w = _loads(axial_load, displacement, axial_load_max, axial_load_min, weight_share)
    out = []
    capacity = bearing.displacement_capacity
    if capacity is not None:
        out.append(Check("displacement capacity", d, capacity, bool(d <= capacity), "m",
                         "dish displacement capacity of the bearing as given"))
    contact = getattr(bearing, "first_contact_displacement", None)
    if contact is not None:
        out.append(Check("first restrainer contact", d, contact, bool(d <= contact), "m",
                         "Fenz & Constantinou 2006: sliding regimes I-II end when a slider meets "
                         "its restrainer; stiffening beyond is not modelled"))
    out.append(restoring_force_check(bearing.backbone(p), d, w))
    out.append(Check("net tension (uplift)", pmin, 0.0, bool(pmin >= 0.0), "kN",
                     "common practice: a slider carries no tension; uplift needs special detailing"))
    return out


def elastomer_checks(bearing, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
                     rotation=0.0, weight_share=None) -> list[Check]:
    """Checks of an elastomeric bearing (lead-rubber or high-damping rubber).

    ``bearing`` provides outer_diameter, layer_thickness, rubber_thickness,
    rubber_area, shear_modulus (G for the vertical checks), shape_factor,
    compression_modulus, vertical_stiffness, buckling_load(displacement) and
    backbone(weight).
    """
    p, d, pmax, pmin, w = _loads(axial_load, displacement, axial_load_max, axial_load_min, weight_share)
    theta = validate.non_negative("rotation", rotation, "rad")
    g, s, area = bearing.shear_modulus, bearing.shape_factor, bearing.rubber_area
    tr = bearing.rubber_thickness
    reduced = area * overlap_ratio(bearing.outer_diameter, d)
    out = []
    capacity = bearing.displacement_capacity
    if capacity is not None:
        out.append(Check("displacement capacity", d, capacity, bool(d <= capacity), "m",
                         "rated displacement of the bearing as given"))
    out += [
        _at_least("shape factor", s, "shape_factor", "-"),
        Check("compression modulus", bearing.compression_modulus, None, True, "kPa",
              "Kelly & Konstantinidis 2011: 1/E_c = 1/(6 G S^2 F) + 4/(3 K), hole factor F of "
              "Constantinou, Kartoum & Kelly 1992 (1 without a hole); reported, no limit"),
    ]
    vertical_period = 2.0 * math.pi * math.sqrt(p / (GRAVITY * bearing.vertical_stiffness))
    out.append(_at_most("vertical period", vertical_period, "vertical_period", "s"))
    out.append(_at_least("buckling load at zero displacement / axial load",
                         bearing.buckling_load(0.0) / p, "buckling_zero", "-"))
    out.append(_at_least("buckling load at design displacement / max axial load",
                         bearing.buckling_load(d) / pmax, "buckling_displaced", "-"))
    gamma_c = p / (area * g * s)
    gamma_s = d / tr
    gamma_r = rotation_strain(bearing.outer_diameter, bearing.layer_thickness, tr, theta)
    gamma_c_eq = pmax / (reduced * g * s) if reduced > 0.0 else math.inf
    out.append(_at_most("compression strain", gamma_c, "compression_strain", "-"))
    out.append(_at_most("shear strain", gamma_s, "shear_strain", "-"))
    out.append(Check("rotation strain", gamma_r, None, True, "-",
                     "AASHTO Guide Spec.: gamma_r = D_r B^2 theta/(t T_r), D_r = 0.375 circular "
                     "(from memory); enters the combined strain"))
    out.append(_at_most("combined strain (max load on overlap area)", gamma_c_eq + gamma_s + 0.5 * gamma_r,
                        "combined_strain", "-"))
    tension = max(0.0, -pmin) / reduced if reduced > 0.0 else (math.inf if pmin < 0.0 else 0.0)
    limit, source = LIMITS["tension"]
    out.append(Check("tension stress (cavitation)", tension, limit * g, bool(tension <= limit * g), "kPa",
                     source))
    out.append(restoring_force_check(bearing.backbone(p), d, w))
    return out
