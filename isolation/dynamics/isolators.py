"""Isolator force laws for response-history analysis.

The response-history engine (:mod:`isolation.dynamics.newmark`) knows two families of
isolation-plane laws, each evaluated for many columns (records x property
cases) at once:

* :class:`ElasticPlasticLaw` - a linear spring in parallel with
  elastic-perfectly-plastic elements, integrated by exact return mapping
  (Bilinear, MultiLinear and registered bearings through their backbones).
* :class:`SmoothLaw` - F = k u + Q(v) z with a Bouc-Wen hysteretic variable z
  of exponent n = 2 (Wen 1976), integrated in closed form over each step;
  Q(v) = N mu(v) gives the friction pendulum of Mokha, Constantinou & Reinhorn
  (1990) with velocity-dependent friction, and a constant Q gives the smooth
  version of a bilinear isolator (:class:`BoucWen`).

The law objects live in :mod:`isolation.bearings.laws` (re-exported here); each
bearing type's module says which law its bearing runs
(:mod:`isolation.bearings.registry`), and :func:`isolator_law` asks it.

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

import numpy as np

from isolation import validate
from isolation.bearings.backbone import Bilinear, MultiLinear
from isolation.bearings.laws import FRICTION_LAWS, BoucWen, ElasticPlasticLaw, SharpFrictionLaw, SmoothLaw, backbone_law
from isolation.bearings.registry import type_of

__all__ = ["BoucWen", "ElasticPlasticLaw", "SmoothLaw", "SharpFrictionLaw", "isolator_law", "describe",
           "FRICTION_LAWS", "friction_regularisation"]

def friction_regularisation(isolator, friction_law: str = "smooth") -> str:
    """One sentence stating how a sliding isolator's friction is regularised in response history.

    Parameters
    ----------
    isolator : object
        The isolator (only a sliding bearing whose law is a friction law, smooth or sharp, is
        regularised). [-]
    friction_law : {"smooth", "sharp"}, optional
        The law run. [-]
    """
    validate.one_of("friction_law", friction_law, FRICTION_LAWS)
    entry = type_of(isolator)
    law = isolator_law(isolator, 1.0, friction_law) if entry is not None and entry.sliding else None
    if law is None or law.family == "elastic_plastic":
        return "no friction regularisation (elastic-plastic elements integrated by exact return mapping)"
    dy = 1000.0 * law.yield_displacement
    if friction_law == "smooth":
        return (f"friction regularised by a Bouc-Wen law of exponent 2 with yield displacement D_y = {dy:.2g} mm "
                "(Constantinou, Mokha & Reinhorn 1990): the loop corners are rounded over a few D_y")
    return (f"sharp friction: elastic-perfectly-plastic element with initial stiffness mu W/D_y, "
            f"D_y = {dy:.2g} mm (no rounding of the loop corners)")


def isolator_law(isolator, weight: float, friction_law: str = "smooth"):
    """Turn an isolator object into the law the engine integrates.

    Parameters
    ----------
    isolator : Bilinear, MultiLinear, BoucWen or a registered bearing
        Whole-plane isolator. A registered bearing (:mod:`isolation.bearings.registry`) runs
        its type's history law: a sliding bearing stands for all sliders of the plane,
        carrying the whole weight (its forces scale with ``weight``); other bearings run the
        law of their backbone, taken as the whole plane as it is (pass
        ``bearing.backbone(weight).times(count)`` for several). Unregistered objects with
        ``.bilinear()`` or a piecewise-linear ``.backbone(weight)`` run that curve. [-]
    weight : float
        Weight on the isolation plane (total mass x g), > 0. [kN]
    friction_law : {"smooth", "sharp"}, optional
        A friction pendulum runs the smooth Bouc-Wen law (default) or the
        sharp elastic-plastic one (:class:`SharpFrictionLaw`). [-]

    Returns
    -------
    ElasticPlasticLaw, SmoothLaw or SharpFrictionLaw
    """
    weight = validate.positive("weight", weight, "kN")
    validate.one_of("friction_law", friction_law, FRICTION_LAWS)
    if isinstance(isolator, (Bilinear, MultiLinear)):
        return backbone_law(isolator)
    if isinstance(isolator, BoucWen):
        b = isolator.bilinear
        q = b.characteristic_strength
        return SmoothLaw(b.post_yield_stiffness, q, q, 0.0, b.yield_displacement, isolator.beta)
    entry = type_of(isolator)
    if entry is not None:
        if entry.history_law is not None:
            return entry.history_law(isolator, weight, friction_law)
        curve = isolator.backbone(weight)
        if isinstance(curve, (Bilinear, MultiLinear)):
            return backbone_law(curve)
        raise ValueError(
            f"isolator = {isolator!r} is not allowed: a {entry.label} bearing's backbone is not piecewise "
            "linear and its type registers no history law; run the bilinear with its effective stiffness "
            "and damping at the design displacement (isolation.study.assembly.history_isolator)"
        )
    return _duck_law(isolator, weight)


def _duck_law(isolator, weight: float):
    """Law of an unregistered object with ``.bilinear()`` or a piecewise-linear ``.backbone(weight)``."""
    bilinear = getattr(isolator, "bilinear", None)
    if callable(bilinear):
        try:
            return isolator_law(bilinear(), weight)
        except TypeError:
            pass
    backbone = getattr(isolator, "backbone", None)
    if callable(backbone):
        curve = backbone(weight)
        if isinstance(curve, (Bilinear, MultiLinear)):
            return backbone_law(curve)
    raise ValueError(
        f"isolator = {isolator!r} is not allowed: must be a Bilinear, MultiLinear, BoucWen, "
        "a registered bearing (isolation.bearings.registry) or an object with .bilinear()"
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
            for i, (k, f) in enumerate(zip(law.stiffnesses, law.strengths, strict=True)):
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
    isolator : Bilinear, MultiLinear, BoucWen or a registered bearing
        Whole-plane isolator (see :func:`isolator_law`). [-]
    displacement : array (steps,)
        Imposed displacement, starting from 0 with the isolator unloaded. [m]
    weight : float, optional
        Axial load on a registered bearing (required for them), > 0. [kN]
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
