"""Isolator force laws for response-history analysis.

The response-history engine (:mod:`isolation.dynamics.newmark`) knows two families of
isolation-plane laws, each evaluated for many columns (records x property
cases) at once:

* :class:`ElasticPlasticLaw` - a linear spring in parallel with
  elastic-perfectly-plastic elements, integrated by exact return mapping
  (Bilinear, MultiLinear, DoubleConcave and LeadRubber through their
  backbones).
* :class:`SmoothLaw` - F = k u + Q(v) z with a Bouc-Wen hysteretic variable z
  of exponent n = 2 (Wen 1976), integrated in closed form over each step;
  Q(v) = N mu(v) gives the friction pendulum of Mokha, Constantinou & Reinhorn
  (1990) with velocity-dependent friction, and a constant Q gives the smooth
  version of a bilinear isolator (:class:`BoucWen`).

Bouc-Wen convention used here (that of Wen 1976; part of the isolation
literature swaps the names of beta and gamma):

    D_y dz/dt = A du/dt - beta |du/dt| |z|^(n-1) z - gamma du/dt |z|^n,

with A = 1 and beta + gamma = 1, so that |z| <= 1 and F = K_d u + Q_d z tends
to the bilinear loop of strength Q_d. Friction pendulums use beta = gamma = 1/2
(Constantinou et al. 1990) with the bearing's yield displacement (0.5 mm by
default); the axial load N is the weight on the isolation plane (total mass x
g, constant, so never tension; vertical excitation is not modelled). With n = 2 and du/dt of constant sign
over a step the equation integrates exactly: on loading (z du > 0)
z = tanh(x + atanh z0) with x = |du|/D_y; on unloading dz/dx = 1 - (gamma -
beta) z^2 until z changes sign. The update is therefore exact for any step
and needs no sub-stepping.

References
----------
Wen, Y.-K. (1976). Method for random vibration of hysteretic systems. J. Eng.
Mech. Div. ASCE 102(2).
Mokha, A., Constantinou, M. C. & Reinhorn, A. M. (1990). Teflon bearings in
base isolation I: Testing. J. Struct. Eng. 116(2).
Constantinou, M. C., Mokha, A. & Reinhorn, A. M. (1990). Teflon bearings in
base isolation II: Modeling. J. Struct. Eng. 116(2).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from isolation import validate
from isolation.bearings.backbone import Bilinear, MultiLinear

__all__ = ["BoucWen", "ElasticPlasticLaw", "SmoothLaw", "SharpFrictionLaw", "isolator_law", "describe",
           "FRICTION_LAWS", "friction_regularisation"]

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


def friction_regularisation(isolator, friction_law: str = "smooth") -> str:
    """One sentence stating how a sliding isolator's friction is regularised in response history.

    Parameters
    ----------
    isolator : object
        The isolator (only friction pendulums are regularised). [-]
    friction_law : {"smooth", "sharp"}, optional
        The law run. [-]
    """
    from isolation.bearings import FrictionPendulum

    validate.one_of("friction_law", friction_law, FRICTION_LAWS)
    if not isinstance(isolator, FrictionPendulum):
        return "no friction regularisation (elastic-plastic elements integrated by exact return mapping)"
    dy = 1000.0 * isolator.yield_displacement
    if friction_law == "smooth":
        return (f"friction regularised by a Bouc-Wen law of exponent 2 with yield displacement D_y = {dy:.2g} mm "
                "(Constantinou, Mokha & Reinhorn 1990): the loop corners are rounded over a few D_y")
    return (f"sharp friction: elastic-perfectly-plastic element with initial stiffness mu W/D_y, "
            f"D_y = {dy:.2g} mm (no rounding of the loop corners)")


def isolator_law(isolator, weight: float, friction_law: str = "smooth"):
    """Turn an isolator object into the law the engine integrates.

    Parameters
    ----------
    isolator : Bilinear, MultiLinear, BoucWen, FrictionPendulum, DoubleConcave or LeadRubber
        Whole-plane isolator. A FrictionPendulum or DoubleConcave stands for
        all sliders of the plane, carrying the whole weight (its forces scale
        with ``weight``); an object with ``.bilinear()`` such as one
        LeadRubber is taken as the whole plane as it is (pass
        ``bearing.bilinear().times(count)`` for several). [-]
    weight : float
        Weight on the isolation plane (total mass x g), > 0. [kN]
    friction_law : {"smooth", "sharp"}, optional
        A FrictionPendulum runs the smooth Bouc-Wen law (default) or the
        sharp elastic-plastic one (:class:`SharpFrictionLaw`). [-]

    Returns
    -------
    ElasticPlasticLaw, SmoothLaw or SharpFrictionLaw
    """
    from isolation.bearings import DoubleConcave, FrictionPendulum

    weight = validate.positive("weight", weight, "kN")
    validate.one_of("friction_law", friction_law, FRICTION_LAWS)
    if isinstance(isolator, (Bilinear, MultiLinear)):
        k0, ks, fs = isolator.elements()
        return ElasticPlasticLaw(float(k0), tuple(map(float, ks)), tuple(map(float, fs)))
    if isinstance(isolator, BoucWen):
        b = isolator.bilinear
        q = b.characteristic_strength
        return SmoothLaw(b.post_yield_stiffness, q, q, 0.0, b.yield_displacement, isolator.beta)
    if isinstance(isolator, FrictionPendulum):
        slow = isolator.friction_slow
        assert slow is not None  # FrictionPendulum sets it to friction when not given
        if friction_law == "sharp":
            return SharpFrictionLaw(weight / isolator.effective_radius, isolator.friction * weight,
                                    slow * weight, isolator.rate_parameter, isolator.yield_displacement)
        return SmoothLaw(weight / isolator.effective_radius, isolator.friction * weight,
                         slow * weight, isolator.rate_parameter, isolator.yield_displacement, 0.5)
    if isinstance(isolator, DoubleConcave):
        return isolator_law(isolator.backbone(weight), weight)
    bilinear = getattr(isolator, "bilinear", None)
    if callable(bilinear):
        try:
            return isolator_law(bilinear(), weight)
        except TypeError:
            pass
    backbone = getattr(isolator, "backbone", None)
    if callable(backbone):  # e.g. a triple friction pendulum: piecewise-linear backbone under the weight
        curve = backbone(weight)
        if isinstance(curve, (Bilinear, MultiLinear)):
            return isolator_law(curve, weight)
    raise ValueError(
        f"isolator = {isolator!r} is not allowed: must be a Bilinear, MultiLinear, BoucWen, "
        "FrictionPendulum, DoubleConcave or an object with .bilinear() (e.g. LeadRubber)"
    )


def describe(isolator) -> dict:
    """Plain-JSON description of an isolator (its own ``to_dict`` when it has one)."""
    to_dict = getattr(isolator, "to_dict", None)
    if callable(to_dict):
        return to_dict()
    return {"kind": type(isolator).__name__}


# --- vectorised law evaluations used by the engine ---------------------------

class ElasticPlasticColumns:
    """Parameters of :class:`ElasticPlasticLaw` for many columns, padded to equal element counts."""

    def __init__(self, laws: list[ElasticPlasticLaw]):
        count = max(len(law.stiffnesses) for law in laws)
        cols = len(laws)
        self.k0 = np.array([law.linear_stiffness for law in laws])
        self.k = np.zeros((count, cols))
        self.f = np.zeros((count, cols))
        for j, law in enumerate(laws):
            for i, (k, f) in enumerate(zip(law.stiffnesses, law.strengths)):
                self.k[i, j] = k
                self.f[i, j] = f
        self.count = count
        self.final_stiffness = self.k0.copy()


class SmoothColumns:
    """Parameters of :class:`SmoothLaw` for many columns."""

    def __init__(self, laws: list[SmoothLaw]):
        self.k0 = np.array([law.linear_stiffness for law in laws])
        self.q_fast = np.array([law.strength_fast for law in laws])
        self.q_drop = np.array([law.strength_fast - law.strength_slow for law in laws])
        self.rate = np.array([law.rate_parameter for law in laws])
        self.dy = np.array([law.yield_displacement for law in laws])
        self.inv_dy = 1.0 / self.dy
        self.dy_min = float(self.dy.min())
        betas = {law.beta for law in laws}
        if len(betas) != 1:
            raise ValueError("cases integrated together must share one Bouc-Wen beta")
        self.beta = betas.pop()
        self.unload = (1.0 - self.beta) - self.beta  # c = gamma - beta
        self.minus_rate = -self.rate
        self.q_drop_rate_c2 = np.zeros_like(self.rate)  # set by the engine once dt is known
        self.rate_dependent = bool(np.any((self.q_drop > 0.0) & (self.rate > 0.0)))
        self.final_stiffness = self.k0.copy()

    # phase coordinates: w = g(xi), xi = x + theta(w0), x = |du|/D_y >= 0
    def theta(self, w0: np.ndarray) -> np.ndarray:
        """Phase coordinate of w0 (w0 = z0 times the sign of the displacement increment)."""
        w0 = np.clip(w0, -1.0 + 1e-15, 1.0 - 1e-15)
        c = self.unload
        if c > 0.0:
            rc = math.sqrt(c)
            back = np.arctanh(rc * w0) / rc
        elif c < 0.0:
            rc = math.sqrt(-c)
            back = np.arctan(rc * w0) / rc
        else:
            back = w0
        return np.where(w0 < 0.0, back, np.arctanh(w0))

    def shape(self, xi: np.ndarray):
        """Return w = g(xi) and dw/dx for phase coordinates xi."""
        c = self.unload
        ahead = np.tanh(xi)
        if c > 0.0:
            rc = math.sqrt(c)
            back = np.tanh(rc * xi) / rc
        elif c < 0.0:
            rc = math.sqrt(-c)
            back = np.tan(rc * np.maximum(xi, -0.5 * math.pi / rc + 1e-12)) / rc
        else:
            back = xi
        behind = xi < 0.0
        w = np.where(behind, back, ahead)
        slope = np.where(behind, 1.0 - c * w * w, 1.0 - w * w)
        return w, slope


def imposed_force(isolator, displacement, *, weight=None, dt=None):
    """Isolator force under an imposed displacement history (for loops and checks).

    Parameters
    ----------
    isolator : Bilinear, MultiLinear, BoucWen, FrictionPendulum, DoubleConcave or LeadRubber
        Whole-plane isolator. [-]
    displacement : array (steps,)
        Imposed displacement, starting from 0 with the isolator unloaded. [m]
    weight : float, optional
        Axial load on a friction pendulum or double concave bearing (required
        for them), > 0. [kN]
    dt : float, optional
        Time step, > 0; needed only for velocity-dependent friction. [s]

    Returns
    -------
    ndarray (steps,)
        Isolator force. [kN]
    """
    u = validate.finite_array("displacement", displacement, "m")
    if u.ndim != 1:
        raise ValueError(f"displacement has shape {u.shape}: must be 1-D (steps,) [m]")
    law = isolator_law(isolator, 1.0 if weight is None else weight)
    needs_weight = not isinstance(isolator, (Bilinear, MultiLinear, BoucWen))
    if needs_weight and weight is None:
        raise ValueError("weight = None is not allowed for this isolator: must be a number > 0 [kN]")
    du = np.diff(u, prepend=0.0)
    force = np.zeros_like(u)
    if law.family == "elastic_plastic":
        k = np.asarray(law.stiffnesses, dtype=float)
        f = np.asarray(law.strengths, dtype=float)
        q = np.zeros_like(k)
        for i, step in enumerate(du):
            q = np.clip(q + k * step, -f, f)
            force[i] = law.linear_stiffness * u[i] + q.sum()
        return force
    columns = SmoothColumns([law])
    rate = columns.rate_dependent
    if rate:
        dt = validate.positive("dt", dt, "s")
    z = np.zeros(1)
    for i, step in enumerate(du):
        sign = -1.0 if step < 0.0 else 1.0
        xi = abs(step) * columns.inv_dy + columns.theta(sign * z)
        w, _ = columns.shape(xi)
        z = sign * w
        strength = columns.q_fast
        if rate:
            strength = columns.q_fast - columns.q_drop * np.exp(-columns.rate * abs(step) / dt)
        force[i] = (law.linear_stiffness * u[i] + strength * z)[0]
    return force
