"""Biaxial bearing laws for the plan model, evaluated for many columns and bearings at once.

Every bearing's horizontal force is

    f = s (k0 d + sum_e f_e p_e + Q(v) z),

with ``d`` the bearing's displacement vector, ``s`` the axial load for a
slider (its parameters are then per kN of axial load; zero while the bearing
is lifted) and 1 otherwise.

* Elastic-perfectly-plastic elements (``p_e``, a normalised element force):
  exact radial return onto the unit circle, ``p <- p + dd / y_e``, then
  ``p <- p / max(1, |p|)``, with ``y_e = f_e / k_e`` the element's yield
  displacement: the associated flow rule of a circular yield surface.  With
  motion along one axis it is the uniaxial return map of
  :mod:`isolation.dynamics.isolators` exactly.  Used for bilinear and multi-linear
  backbones (lead-rubber, high-damping rubber at its equivalent bilinear,
  double concave sliders).
* Smooth hysteresis ``z`` (friction pendulum, smooth bilinear): the biaxial
  Bouc-Wen law of Park, Wen & Ang (1986) with A = 1, beta = gamma = 1/2 and
  exponent 2, in its isotropic form ``Y dz = dd - z (beta |z . dd| + gamma
  z . dd)`` (the sum ``|dd_x z_x| + |dd_y z_y|`` of the original replaced by
  ``|z . dd|`` so that the law does not depend on the choice of axes; with
  motion along one axis both are the uniaxial law of Wen 1976).  Along a
  straight step ``dd = |dd| e`` the law integrates in closed form (derived):
  with ``a = z . e`` and ``b = z - a e``, unloading (``a < 0``) is elastic,
  ``a <- a + x`` with ``x = |dd| / Y``, until ``a = 0``; loading gives
  ``a = tanh(c + x)``, ``b = b0 cosh(c) / cosh(c + x)`` with ``c = atanh(a0)``,
  evaluated as ``a = (a0 + t)/(1 + a0 t)``, ``b = b0 sqrt(1 - t^2)/(1 + a0 t)``
  with ``t = tanh x`` (addition theorems).
  So ``|z| <= 1`` and, in steady sliding, ``z`` points along the velocity:
  the friction force has magnitude ``mu N`` along the sliding direction
  (Mokha, Constantinou & Reinhorn 1993, J. Struct. Eng. 119(1)).
  Friction rate dependence ``Q(v) = Q_fast - (Q_fast - Q_slow) exp(-a |v|)``
  uses the magnitude of the bearing velocity vector.

References
----------
Park, Y. J., Wen, Y. K. & Ang, A. H.-S. (1986). Random vibration of
hysteretic systems under bi-directional ground motions. Earthquake Eng.
Struct. Dyn. 14(4), 543-557. doi:10.1002/eqe.4290140405
Mokha, A. S., Constantinou, M. C. & Reinhorn, A. M. (1993). Verification of
friction model of Teflon bearings under triaxial load. J. Struct. Eng.
119(1), 240-261. doi:10.1061/(ASCE)0733-9445(1993)119:1(240)
"""

from __future__ import annotations

import numpy as np

from isolation.bearings.registry import is_sliding
from isolation.dynamics.isolators import ElasticPlasticLaw, SmoothLaw, isolator_law

__all__ = ["BiaxialLaws", "smooth_update", "radial_return"]

_EDGE = 1.0 - 1e-15


def smooth_update(z0: np.ndarray, step: np.ndarray, inv_yield: np.ndarray) -> np.ndarray:
    """Closed-form biaxial Bouc-Wen update (beta = gamma = 1/2, n = 2) along a straight step.

    Parameters
    ----------
    z0 : ndarray (..., 2)
        Hysteretic variable at the start of the step, |z0| <= 1. [-]
    step : ndarray (..., 2)
        Displacement increment. [m]
    inv_yield : ndarray (...)
        1 / Y, Y the yield displacement. [1/m]

    Returns
    -------
    ndarray (..., 2)
        z at the end of the step. [-]

    References
    ----------
    Park, Y. J., Wen, Y. K. & Ang, A. H.-S. (1986). Random vibration of hysteretic systems under bi-directional
    ground motions. Earthquake Eng. Struct. Dyn. 14(4), 543-557. doi:10.1002/eqe.4290140405 (DOI not verified)
    """
    length = np.sqrt((step * step).sum(axis=-1))
    moving = length > 0.0
    e = step / np.where(moving, length, 1.0)[..., None]
    a0 = (z0 * e).sum(axis=-1)
    b0 = z0 - a0[..., None] * e
    x = length * inv_yield
    elastic = np.minimum(x, np.maximum(-a0, 0.0))
    a1 = np.minimum(a0 + elastic, _EDGE)
    t = np.tanh(x - elastic)
    # tanh(atanh(a1) + r) = (a1 + t)/(1 + a1 t) and cosh(c)/cosh(c + r) = sqrt(1 - t^2)/(1 + a1 t), t = tanh r
    denominator = 1.0 + a1 * t
    a = (a1 + t) / denominator
    shrink = np.sqrt(1.0 - t * t) / denominator
    z = a[..., None] * e + shrink[..., None] * b0
    return np.where(moving[..., None], z, z0)


def radial_return(p0: np.ndarray, step: np.ndarray, inv_yield: np.ndarray) -> np.ndarray:
    """Elastic-perfectly-plastic normalised element forces after a step (circular yield surface).

    Parameters
    ----------
    p0 : ndarray (..., E, 2)
        Normalised element forces (force / strength), |p0| <= 1. [-]
    step : ndarray (..., 2)
        Displacement increment. [m]
    inv_yield : ndarray (..., E)
        1 / y_e per element (0 for padding elements). [1/m]

    Returns
    -------
    ndarray (..., E, 2)
    """
    trial = p0 + step[..., None, :] * inv_yield[..., None]
    size = np.sqrt((trial * trial).sum(axis=-1))
    return trial / np.maximum(size, 1.0)[..., None]


class BiaxialLaws:
    """Parameters of every bearing's biaxial law for columns (cases) x bearings.

    Parameters
    ----------
    cases : list of (bearings, gravity_loads)
        Per property case, the bearing objects and their gravity axial loads [kN].
    columns_per_case : int
        Records per case; columns are case-major (case 0 records, case 1 records, ...). [-]
    """

    def __init__(self, cases: list, columns_per_case: int) -> None:
        rows = []
        for bearings, loads in cases:
            row = []
            for bearing, load in zip(bearings, loads, strict=True):
                slider = is_sliding(bearing)  # the registry: a sliding type's forces scale with N
                law = isolator_law(bearing, 1.0 if slider else load)
                if isinstance(law, SmoothLaw) and law.beta != 0.5:
                    raise ValueError(
                        f"beta = {law.beta!r} is not allowed in the plan model: the biaxial law needs beta = 0.5 [-]"
                    )
                row.append((slider, law))
            rows.append(row)
        bearings = len(rows[0])
        elements = max((len(law.stiffnesses) for row in rows for _, law in row if isinstance(law, ElasticPlasticLaw)),
                       default=0)
        shape = (len(rows), bearings)
        self.slider = np.zeros(shape, dtype=bool)
        self.k0 = np.zeros(shape)
        self.q_fast = np.zeros(shape)
        self.q_drop = np.zeros(shape)
        self.rate = np.zeros(shape)
        self.inv_y = np.zeros(shape)
        self.strength = np.zeros(shape + (elements,))
        self.inv_element_yield = np.zeros(shape + (elements,))
        for i, row in enumerate(rows):
            for j, (slider, law) in enumerate(row):
                self.slider[i, j] = slider
                self.k0[i, j] = law.linear_stiffness
                if isinstance(law, SmoothLaw):
                    self.q_fast[i, j] = law.strength_fast
                    self.q_drop[i, j] = law.strength_fast - law.strength_slow
                    self.rate[i, j] = law.rate_parameter
                    self.inv_y[i, j] = 1.0 / law.yield_displacement
                else:
                    for e, (k, f) in enumerate(zip(law.stiffnesses, law.strengths, strict=True)):
                        self.strength[i, j, e] = f
                        self.inv_element_yield[i, j, e] = k / f if f > 0 else 0.0
        repeat = lambda a: np.repeat(a, columns_per_case, axis=0)  # noqa: E731
        for name in ("slider", "k0", "q_fast", "q_drop", "rate", "inv_y", "strength", "inv_element_yield"):
            setattr(self, name, repeat(getattr(self, name)))
        self.smooth = bool(np.any(self.q_fast > 0.0))
        self.rate_dependent = bool(np.any((self.q_drop > 0.0) & (self.rate > 0.0)))
        self.elements = elements
        yields = [1.0 / self.inv_y[self.inv_y > 0]] if np.any(self.inv_y > 0) else []
        if np.any(self.inv_element_yield > 0):
            yields.append(1.0 / self.inv_element_yield[self.inv_element_yield > 0])
        self.smallest_yield = float(min(v.min() for v in yields)) if yields else 1e-3

    def forces(self, d, step, speed, axial, z0, p0):
        """Bearing forces and trial states for displacement ``d`` reached by ``step``.

        Parameters
        ----------
        d, step : ndarray (cols, bearings, 2)
            Displacement at the end of the step and its increment. [m]
        speed : ndarray (cols, bearings)
            Magnitude of the bearing velocity at the end of the step. [m/s]
        axial : ndarray (cols, bearings)
            Axial load, compression positive. [kN]
        z0 : ndarray (cols, bearings, 2)
            Smooth hysteretic variable at the start of the step. [-]
        p0 : ndarray (cols, bearings, elements, 2)
            Normalised element forces at the start of the step. [-]

        Returns
        -------
        force (cols, bearings, 2) [kN], z (cols, bearings, 2), p (cols, bearings, elements, 2)
        """
        scale = np.where(self.slider, np.maximum(axial, 0.0), 1.0)
        total = self.k0[..., None] * d
        z = z0
        p = p0
        if self.smooth:
            z = smooth_update(z0, step, self.inv_y)
            q = self.q_fast
            if self.rate_dependent:
                q = q - self.q_drop * np.exp(-self.rate * speed)
            total = total + q[..., None] * z
        if self.elements:
            p = radial_return(p0, step, self.inv_element_yield)
            total = total + (self.strength[..., None] * p).sum(axis=-2)
        return scale[..., None] * total, z, p
