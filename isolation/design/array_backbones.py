"""Backbones as arrays for the single-mode array kernel (:mod:`isolation.design.array_kernel`).

``_Elements``: N piecewise-linear backbones (a linear spring plus padded
elastic-perfectly-plastic elements, Masing loops); ``_Rubber``: N
high-damping rubber backbones sharing one compound table (the equivalent
bilinear at each amplitude, property factors on it).  ``effective(rows, d)``
gives K_eff [kN/m] and beta_eff [-] at amplitudes d [m], NaN where the
scalar model would refuse the amplitude.  :func:`supports` tells which
backbones run here.
"""

from __future__ import annotations

import functools
import math
from typing import Sequence

import numpy as np

__all__ = ["supports"]


# --- backbones as arrays ---------------------------------------------------------------


class _Elements:
    """N piecewise-linear backbones: linear spring k0 [kN/m] plus padded EPP elements."""

    def __init__(self, systems: Sequence) -> None:
        parts = [s.elements() for s in systems]
        width = max((len(ks) for _, ks, _ in parts), default=0)
        self.linear = np.array([float(k0) for k0, _, _ in parts])
        self.stiffness = np.ones((len(parts), width))  # padding: k = 1, f = 0 adds exactly 0
        self.strength = np.zeros((len(parts), width))
        for i, (_, ks, fs) in enumerate(parts):
            self.stiffness[i, :len(ks)] = ks
            self.strength[i, :len(fs)] = fs

    def effective(self, rows: np.ndarray, d: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(K_eff [kN/m], beta_eff [-]) of backbones ``rows`` at amplitudes d [m] (> 0)."""
        ks, fs = self.stiffness[rows], self.strength[rows]
        total = self.linear[rows] * d
        energy = np.zeros_like(d)
        for j in range(ks.shape[1]):  # element order as the scalar backbone sums them
            k, f = ks[:, j], fs[:, j]
            total = total + np.minimum(k * d, f)
            dy = f / k
            energy = energy + np.where(d > dy, 4.0 * f * (d - dy), 0.0)
        k_eff = total / d
        return k_eff, energy / (2.0 * math.pi * k_eff * d**2)


class _Rubber:
    """N high-damping rubber backbones (AmplitudeBackbone) sharing one compound table."""

    def __init__(self, systems: Sequence) -> None:
        bearings = [s.bearing for s in systems]
        compound = bearings[0].compound
        self.strains = np.asarray(compound.strains, dtype=float)
        self.moduli = np.asarray(compound.shear_moduli, dtype=float)
        self.dampings = np.asarray(compound.dampings, dtype=float)
        self.thickness = np.array([b.rubber_thickness for b in bearings])
        self.area = np.array([b.rubber_area for b in bearings])
        self.ratio = np.array([float(b.stiffness_ratio) for b in bearings])
        self.stiffness_factor = np.array([float(s.stiffness) for s in systems])
        self.strength_factor = np.array([float(s.strength) for s in systems])

    def effective(self, rows: np.ndarray, d: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        strain = d / self.thickness[rows]
        k = np.interp(strain, self.strains, self.moduli) * self.area[rows] / self.thickness[rows]
        beta = np.interp(strain, self.strains, self.dampings)
        n = self.ratio[rows]
        # equivalent bilinear at this amplitude (damping_rubber.equivalent_bilinear), then scaled
        c = math.pi * beta / 2.0
        disc = ((n - 1.0) * (1.0 + c)) ** 2 - 4.0 * n * c * (n - 1.0)
        bad = (n <= 1.0) | (disc < 0.0) | ~(k > 0.0) | ~(beta > 0.0)
        q = ((n - 1.0) * (1.0 + c) - np.sqrt(np.where(bad, 0.0, disc))) / (2.0 * n)
        kd = k * (1.0 - q)
        s, t = self.stiffness_factor[rows], self.strength_factor[rows]
        ku_s, kd_s, qd_s = n * kd * s, kd * s, q * k * d * t
        element = ku_s - kd_s
        total = kd_s * d + np.where(qd_s == 0.0, 0.0, np.minimum(element * d, qd_s))
        k_eff = np.where(qd_s == 0.0, ku_s * d, total) / d
        dy = qd_s / element
        energy = np.where((qd_s != 0.0) & (d > dy), 4.0 * qd_s * (d - dy), 0.0)
        beta_eff = energy / (2.0 * math.pi * k_eff * d**2)
        # an amplitude the equivalent bilinear refuses: the scalar path raises its message
        return np.where(bad, np.nan, k_eff), np.where(bad, np.nan, beta_eff)


@functools.lru_cache(maxsize=1)
def _classes() -> tuple:
    from isolation.bearings import Bilinear, MultiLinear
    from isolation.bearings.damping_rubber import AmplitudeBackbone

    return (Bilinear, MultiLinear), AmplitudeBackbone


def _kind(system) -> str | None:
    elements, rubber = _classes()
    if isinstance(system, elements):
        return "elements"
    if isinstance(system, rubber):
        return "rubber"
    return None


def supports(system) -> bool:
    """True when ``system`` runs in the array kernel (else the scalar path runs it).

    Parameters
    ----------
    system : backbone
        Whole-plane backbone of one property set.
    """
    return _kind(system) is not None
