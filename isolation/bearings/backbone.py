"""Force-displacement idealisations of an isolator or a whole isolation plane.

Two value objects share one interface:

* :class:`Bilinear` - elastic stiffness K_u, post-yield stiffness K_d and
  characteristic strength Q_d (the force intercept of the post-yield branch).
* :class:`MultiLinear` - a linear spring in parallel with any number of
  elastic-perfectly-plastic elements (an Iwan / Masing model). It holds
  multi-regime behaviour such as a double concave friction pendulum with
  unequal friction, and the sum of bearing groups whose yield displacements
  differ.

Both answer, at a displacement amplitude D: backbone force, effective
(secant) stiffness, energy dissipated per cycle and effective damping, and
both list their parallel elements for the response-history engine.
:class:`CombinedBackbone` adds any backbones side by side (e.g. an
amplitude-dependent rubber group beside a bilinear one); :func:`combine` sums
the groups of an isolation plane.

References
----------
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
(K_eff = K_d + Q_d/D, EDC = 4 Q_d (D - D_y), beta_eff = EDC/(2 pi K_eff D^2).)
Iwan, W. D. (1966). A distributed-element model for hysteresis. J. Appl. Mech. 33.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from isolation import validate

__all__ = ["Bilinear", "MultiLinear", "CombinedBackbone", "combine"]


class _Backbone:
    """Shared behaviour of :class:`Bilinear` and :class:`MultiLinear`."""

    def elements(self) -> tuple[float, tuple[float, ...], tuple[float, ...]]:
        """Return (linear stiffness [kN/m], element stiffnesses [kN/m], element strengths [kN])."""
        raise NotImplementedError

    # --- quantities derived from the parallel elements -------------------
    def force(self, displacement):
        """Backbone (first-loading) force at a displacement.

        Parameters
        ----------
        displacement : float or array
            Displacement, either sign. [m]

        Returns
        -------
        float or array
            Force, same sign as the displacement. [kN]
        """
        d = np.asarray(displacement, dtype=float)
        k0, ks, fs = self.elements()
        a = np.abs(d)
        total = k0 * a
        for k, f in zip(ks, fs, strict=True):
            total = total + np.minimum(k * a, f)
        out = np.sign(d) * total
        return float(out) if out.ndim == 0 else out

    def effective_stiffness(self, displacement):
        """Secant stiffness F(D)/D at a displacement amplitude.

        Parameters
        ----------
        displacement : float or array
            Displacement amplitude D > 0. [m]

        Returns
        -------
        float or array
            Effective stiffness. [kN/m]
        """
        d = self._amplitude(displacement)
        out = np.asarray(self.force(d)) / d
        return float(out) if out.ndim == 0 else out

    def loop_energy(self, displacement):
        """Energy dissipated in one full cycle of amplitude D (Masing rule).

        Parameters
        ----------
        displacement : float or array
            Displacement amplitude D > 0. [m]

        Returns
        -------
        float or array
            Energy per cycle. [kN m]
        """
        d = self._amplitude(displacement)
        _, ks, fs = self.elements()
        total = np.zeros_like(d)
        for k, f in zip(ks, fs, strict=True):
            dy = f / k
            total = total + np.where(d > dy, 4.0 * f * (d - dy), 0.0)
        return float(total) if total.ndim == 0 else total

    def effective_damping(self, displacement):
        """Equivalent viscous damping ratio EDC/(2 pi K_eff D^2).

        Parameters
        ----------
        displacement : float or array
            Displacement amplitude D > 0. [m]

        Returns
        -------
        float or array
            Damping ratio. [-]
        """
        d = self._amplitude(displacement)
        k_eff = np.asarray(self.effective_stiffness(d))
        out = np.asarray(self.loop_energy(d)) / (2.0 * math.pi * k_eff * d**2)
        return float(out) if out.ndim == 0 else out

    @staticmethod
    def _amplitude(displacement) -> np.ndarray:
        d = np.asarray(displacement, dtype=float)
        if not np.all(np.isfinite(d)) or np.any(d <= 0.0):
            raise ValueError(
                f"displacement = {displacement!r} is not allowed: must be a finite amplitude > 0 [m]"
            )
        return d

    # --- summary properties ----------------------------------------------
    @property
    def total_elastic_stiffness(self) -> float:
        """Stiffness before any element yields. [kN/m]"""
        k0, ks, _ = self.elements()
        return k0 + sum(ks)

    @property
    def final_stiffness(self) -> float:
        """Stiffness after every element has yielded. [kN/m]"""
        return self.elements()[0]

    @property
    def total_strength(self) -> float:
        """Sum of element strengths: the zero-displacement intercept of the last branch. [kN]"""
        return float(sum(self.elements()[2]))

    def parallel(self, *others: "_Backbone") -> "MultiLinear":
        """Combine with other backbones acting side by side (forces add)."""
        k0, own_ks, own_fs = self.elements()
        ks, fs = list(own_ks), list(own_fs)
        for other in others:
            o0, oks, ofs = other.elements()
            k0 += o0
            ks += list(oks)
            fs += list(ofs)
        return MultiLinear(k0, tuple(ks), tuple(fs))

    def times(self, count: float) -> "_Backbone":
        """Return ``count`` identical units in parallel (stiffness and strength times count)."""
        return self.scaled(stiffness=count, strength=count)

    def scaled(self, *, stiffness: float = 1.0, strength: float = 1.0) -> "_Backbone":
        """Return a copy with stiffnesses multiplied by ``stiffness`` and strengths by ``strength``.

        Used for property modification factors (lambda) on K_d and Q_d.
        """
        raise NotImplementedError


@dataclass(frozen=True)
class Bilinear(_Backbone):
    """Bilinear hysteresis of an isolator or an isolation plane.

    Parameters
    ----------
    elastic_stiffness : float
        Initial (elastic) stiffness K_u, > post_yield_stiffness. [kN/m]
    post_yield_stiffness : float
        Post-yield stiffness K_d, >= 0. [kN/m]
    characteristic_strength : float
        Characteristic strength Q_d (force at zero displacement on the
        post-yield branch), >= 0. [kN]
    """

    elastic_stiffness: float
    post_yield_stiffness: float
    characteristic_strength: float

    def __post_init__(self) -> None:
        ku = validate.positive("elastic_stiffness", self.elastic_stiffness, "kN/m")
        kd = validate.non_negative("post_yield_stiffness", self.post_yield_stiffness, "kN/m")
        qd = validate.non_negative("characteristic_strength", self.characteristic_strength, "kN")
        if kd >= ku:
            raise ValueError(
                f"post_yield_stiffness = {kd!r} is not allowed: must be < elastic_stiffness = {ku!r} [kN/m]"
            )
        object.__setattr__(self, "elastic_stiffness", ku)
        object.__setattr__(self, "post_yield_stiffness", kd)
        object.__setattr__(self, "characteristic_strength", qd)

    @property
    def yield_displacement(self) -> float:
        """D_y = Q_d/(K_u - K_d). [m]"""
        return self.characteristic_strength / (self.elastic_stiffness - self.post_yield_stiffness)

    @property
    def yield_force(self) -> float:
        """F_y = K_u D_y. [kN]"""
        return self.elastic_stiffness * self.yield_displacement

    def elements(self):
        ku, kd, qd = self.elastic_stiffness, self.post_yield_stiffness, self.characteristic_strength
        if qd == 0.0:
            return (ku, (), ())
        return (kd, (ku - kd,), (qd,))

    def scaled(self, *, stiffness: float = 1.0, strength: float = 1.0) -> "Bilinear":
        s = validate.positive("stiffness factor", stiffness)
        q = validate.non_negative("strength factor", strength)
        return Bilinear(self.elastic_stiffness * s, self.post_yield_stiffness * s,
                        self.characteristic_strength * q)

    def to_dict(self) -> dict:
        return {
            "kind": "bilinear",
            "elastic_stiffness": self.elastic_stiffness,
            "post_yield_stiffness": self.post_yield_stiffness,
            "characteristic_strength": self.characteristic_strength,
        }


@dataclass(frozen=True)
class MultiLinear(_Backbone):
    """A linear spring in parallel with elastic-perfectly-plastic elements.

    Parameters
    ----------
    linear_stiffness : float
        Stiffness of the spring that never yields (final slope), >= 0. [kN/m]
    stiffnesses : tuple of float
        Elastic stiffness of each elastic-plastic element, > 0. [kN/m]
    strengths : tuple of float
        Yield force of each elastic-plastic element, > 0. [kN]
    """

    linear_stiffness: float
    stiffnesses: tuple = field(default=())
    strengths: tuple = field(default=())

    def __post_init__(self) -> None:
        k0 = validate.non_negative("linear_stiffness", self.linear_stiffness, "kN/m")
        ks = tuple(validate.positive(f"stiffnesses[{i}]", k, "kN/m") for i, k in enumerate(self.stiffnesses))
        fs = tuple(validate.positive(f"strengths[{i}]", f, "kN") for i, f in enumerate(self.strengths))
        if len(ks) != len(fs):
            raise ValueError(
                f"strengths has {len(fs)} entries but stiffnesses has {len(ks)}: must match"
            )
        if k0 == 0.0 and not ks:
            raise ValueError("linear_stiffness = 0.0 with no elements is not allowed: the backbone needs stiffness")
        object.__setattr__(self, "linear_stiffness", k0)
        object.__setattr__(self, "stiffnesses", ks)
        object.__setattr__(self, "strengths", fs)

    def elements(self):
        return (self.linear_stiffness, self.stiffnesses, self.strengths)

    @property
    def elastic_stiffness(self) -> float:
        """Initial stiffness (all elements elastic). [kN/m]"""
        return self.total_elastic_stiffness

    @property
    def post_yield_stiffness(self) -> float:
        """Final stiffness (all elements yielded). [kN/m]"""
        return self.linear_stiffness

    @property
    def characteristic_strength(self) -> float:
        """Intercept of the final branch at zero displacement. [kN]"""
        return self.total_strength

    @property
    def yield_displacement(self) -> float:
        """Displacement at which the first element yields (inf when none). [m]"""
        if not self.stiffnesses:
            return math.inf
        return min(f / k for k, f in zip(self.stiffnesses, self.strengths, strict=True))

    def scaled(self, *, stiffness: float = 1.0, strength: float = 1.0) -> "MultiLinear":
        s = validate.positive("stiffness factor", stiffness)
        q = validate.positive("strength factor", strength)
        return MultiLinear(self.linear_stiffness * s,
                           tuple(k * s for k in self.stiffnesses),
                           tuple(f * q for f in self.strengths))

    def to_dict(self) -> dict:
        return {
            "kind": "multilinear",
            "linear_stiffness": self.linear_stiffness,
            "stiffnesses": list(self.stiffnesses),
            "strengths": list(self.strengths),
        }


@dataclass(frozen=True)
class CombinedBackbone:
    """Backbones side by side whose forces and loop energies add (any with force and loop_energy).

    Parameters
    ----------
    parts : tuple
        Backbones (Bilinear, MultiLinear, amplitude-dependent rubber, ...).
    """

    parts: tuple

    def force(self, displacement):
        """Sum of the parts' forces at a displacement [m]. [kN]"""
        out = sum(np.asarray(p.force(displacement), dtype=float) for p in self.parts)
        return float(out) if np.ndim(out) == 0 else out

    def effective_stiffness(self, displacement):
        """Sum of secant stiffnesses at amplitude D > 0 [m]. [kN/m]"""
        out = sum(np.asarray(p.effective_stiffness(displacement), dtype=float) for p in self.parts)
        return float(out) if np.ndim(out) == 0 else out

    def loop_energy(self, displacement):
        """Sum of energies per cycle at amplitude D > 0 [m]. [kN m]"""
        out = sum(np.asarray(p.loop_energy(displacement), dtype=float) for p in self.parts)
        return float(out) if np.ndim(out) == 0 else out

    def effective_damping(self, displacement):
        """EDC/(2 pi K_eff D^2) of the combination at amplitude D > 0 [m]. [-]"""
        d = np.asarray(displacement, dtype=float)
        out = np.asarray(self.loop_energy(d)) / (2.0 * math.pi * np.asarray(self.effective_stiffness(d)) * d**2)
        return float(out) if out.ndim == 0 else out

    def times(self, count) -> "CombinedBackbone":
        """``count`` copies in parallel; count > 0. [-]"""
        return CombinedBackbone(tuple(p.times(count) for p in self.parts))

    def scaled(self, *, stiffness=1.0, strength=1.0) -> "CombinedBackbone":
        """Factors on every part's stiffness and strength, each > 0. [-]"""
        return CombinedBackbone(tuple(p.scaled(stiffness=stiffness, strength=strength) for p in self.parts))

    def parallel(self, *others) -> "CombinedBackbone":
        """Add further backbones side by side."""
        return CombinedBackbone(self.parts + tuple(others))

    def to_dict(self) -> dict:
        return {"kind": "combined", "parts": [p.to_dict() for p in self.parts]}


def combine(backbones):
    """Sum backbones: a Bilinear when all are bilinear with one yield displacement, else a
    MultiLinear when all have parallel elements, else a :class:`CombinedBackbone`."""
    backbones = list(backbones)
    if len(backbones) == 1:
        return backbones[0]
    if all(isinstance(b, Bilinear) for b in backbones):
        dy = [b.yield_displacement for b in backbones]
        if all(math.isclose(x, dy[0], rel_tol=1e-9) for x in dy):
            return Bilinear(sum(b.elastic_stiffness for b in backbones),
                            sum(b.post_yield_stiffness for b in backbones),
                            sum(b.characteristic_strength for b in backbones))
    if all(isinstance(b, (Bilinear, MultiLinear)) for b in backbones):
        return backbones[0].parallel(*backbones[1:])
    return CombinedBackbone(tuple(backbones))
