"""Energy balance of a response history (relative form, Uang & Bertero 1990).

    E_I = E_K + E_D + E_S + E_H

* input E_I = -integral (M 1 a_g) . du (relative input energy),
* kinetic E_K = 1/2 v' M v (relative velocities),
* viscous E_D = integral (C v) . du plus the supplemental damper's work,
* elastic strain E_S = 1/2 u' K u plus the energy stored elastically in the
  isolator (its linear spring and the elastic part of its hysteretic
  elements),
* hysteretic E_H = work of the isolator force minus its stored part.

Integrals use the trapezoid rule on each step. With Newmark's
average-acceleration rule, du = dt (v_n + v_{n+1})/2 and
dv = dt (a_n + a_{n+1})/2 exactly, so the accumulated identity closes to
the tolerance of the equilibrium iteration; the remaining difference is
reported as the balance error.

References
----------
Uang, C.-M. & Bertero, V. V. (1990). Evaluation of seismic energy in
structures. Earthquake Eng. Struct. Dyn. 19(1).
"""

from __future__ import annotations

import numpy as np

__all__ = ["energy_components", "balance_error", "COMPONENTS"]

COMPONENTS = ("input", "kinetic", "viscous", "elastic_strain", "hysteretic")


def _cumulative(increments: np.ndarray) -> np.ndarray:
    """Running sum over the first axis with a leading zero (steps - 1 -> steps)."""
    out = np.zeros((increments.shape[0] + 1,) + increments.shape[1:])
    np.cumsum(increments, axis=0, out=out[1:])
    return out


def energy_components(u, v, masses, stiffness, damping, ground, *, isolator_force=None,
                      isolator_stored=None, damper=None) -> dict:
    """Energy components, each (steps, cols). [kN m]

    Parameters
    ----------
    u, v : arrays (steps, dofs, cols)
        Displacement [m] and velocity [m/s] relative to the ground.
    masses : array (dofs,)
        Lumped masses. [t]
    stiffness, damping : arrays (dofs, dofs)
        Linear stiffness [kN/m] and damping [kN s/m].
    ground : array (steps, cols)
        Ground acceleration. [m/s2]
    isolator_force : array (steps, cols), optional
        Isolator force on degree of freedom 0. [kN]
    isolator_stored : array (steps, cols), optional
        Energy stored elastically in the isolator. [kN m]
    damper : array (cols,), optional
        Linear damper on degree of freedom 0. [kN s/m]
    """
    du = np.diff(u, axis=0)
    v_mid = 0.5 * (v[1:] + v[:-1])
    g_mid = 0.5 * (ground[1:] + ground[:-1])
    out = {}
    out["input"] = _cumulative(-np.einsum("sic,i->sc", du, masses) * g_mid)
    out["kinetic"] = 0.5 * np.einsum("sic,i,sic->sc", v, masses, v)
    viscous = np.einsum("sic,ij,sjc->sc", du, damping, v_mid)
    if damper is not None:
        viscous = viscous + du[:, 0] * damper * v_mid[:, 0]
    out["viscous"] = _cumulative(viscous)
    strain = 0.5 * np.einsum("sic,ij,sjc->sc", u, stiffness, u)
    if isolator_force is not None:
        work = _cumulative(du[:, 0] * 0.5 * (isolator_force[1:] + isolator_force[:-1]))
        out["elastic_strain"] = strain + isolator_stored
        out["hysteretic"] = work - isolator_stored
    else:
        out["elastic_strain"] = strain
        out["hysteretic"] = np.zeros_like(strain)
    return out


def balance_error(energy: dict, axis: int = -1) -> np.ndarray:
    """Largest |E_I - (E_K + E_D + E_S + E_H)| over time divided by the largest |E_I|. [-]

    Parameters
    ----------
    energy : mapping of component name -> array (..., steps)
        The five components. [kN m]
    axis : int, optional
        Time axis.
    """
    residual = energy["input"] - (energy["kinetic"] + energy["viscous"]
                                  + energy["elastic_strain"] + energy["hysteretic"])
    scale = np.max(np.abs(energy["input"]), axis=axis)
    worst = np.max(np.abs(residual), axis=axis)
    return np.divide(worst, scale, out=np.zeros_like(worst), where=scale > 0.0)
