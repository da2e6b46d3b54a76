"""Small models and the trapezoidal-rule reference for the Newmark engine tests
(tests/dynamics/test_newmark_closed_forms.py, tests/dynamics/test_newmark_kernel.py).

Reference: Newmark (1959) with gamma = 1/2, beta = 1/4 is the trapezoidal rule on the
first-order system, i.e. the bilinear (Tustin) discretisation, computed by the
general-purpose scipy.signal.cont2discrete(method="bilinear") and scipy.signal.dlsim.
"""

from __future__ import annotations

import numpy as np
import scipy.signal

from isolation.bearings.laws import ElasticPlasticLaw, SmoothLaw
from isolation.dynamics import newmark
from isolation.dynamics.isolators import ElasticPlasticColumns, SmoothColumns

ENGINES = ("integrate", "simulate")


def chain(masses, stiffnesses, base=False):
    """Mass and stiffness of a shear chain; with ``base`` the first mass has no spring to the ground."""
    n = len(masses)
    k = np.zeros((n, n))
    for i, ki in enumerate(stiffnesses):
        lo, up = (i, i + 1) if base else (i - 1, i)
        k[up, up] += ki
        if lo >= 0:
            k[lo, lo] += ki
            k[lo, up] -= ki
            k[up, lo] -= ki
    return np.asarray(masses, dtype=float), k


def trapezoid(m, k, c, ground, dt):
    """Reference: Tustin discretisation of M u'' + C u' + K u = -M 1 a_g (scipy.signal).

    Returns u, v, a (relative), each (steps, dofs); ground (steps,) with ground[0] = 0 (rest).
    """
    n = m.size
    minv = np.diag(1.0 / m)
    eye, zero = np.eye(n), np.zeros((n, n))
    a = np.block([[zero, eye], [-minv @ k, -minv @ c]])
    b = np.concatenate([np.zeros(n), -np.ones(n)])[:, None]
    out = np.block([[eye, zero], [zero, eye], [-minv @ k, -minv @ c]])
    d = np.concatenate([np.zeros(2 * n), -np.ones(n)])[:, None]
    ad, bd, cd, dd, _ = scipy.signal.cont2discrete((a, b, out, d), dt, method="bilinear")
    _, y, _ = scipy.signal.dlsim((ad, bd, cd, dd, dt), np.asarray(ground, dtype=float))
    return y[:, :n], y[:, n:2 * n], y[:, 2 * n:]


def respond(engine, m, k, c, ground, dt, law=None, damper=0.0, nsub=1, storeys=None):
    """Run one engine; ground (cols, steps). Returns u, v, a_rel (cols, steps, dofs) and force (cols, steps).

    law: None (fixed base), ("ep", k0, (k, ...), (f, ...)), ("smooth", k0, q_fast, q_slow, rate, dy, beta)
    or ("sharp", k0, q_fast, q_slow, rate, dy), the same for every column."""
    ground = np.atleast_2d(np.asarray(ground, dtype=float))
    cols = ground.shape[0]
    labels = [("case", r) for r in range(cols)]
    if engine == "integrate":
        columns = None
        if law is not None and law[0] == "ep":
            columns = ElasticPlasticColumns([ElasticPlasticLaw(law[1], tuple(law[2]), tuple(law[3]))] * cols)
        elif law is not None:
            columns = SmoothColumns([SmoothLaw(*law[1:])] * cols)
        out = newmark.integrate(m if m.ndim == 2 else np.diag(m), k, c, columns, np.full(cols, damper),
                                ground.T.copy(), dt, labels)
        dofs = k.shape[0]
        state = np.moveaxis(out["state"], 2, 0)
        force = None if out["force"] is None else out["force"].T
        return state[:, :, :dofs], state[:, :, dofs:2 * dofs], state[:, :, 2 * dofs:], force
    mass = m if m.ndim == 1 else np.diag(m)
    offset = 0 if law is None else 1
    if storeys is None:
        count = mass.size - offset
        upper = np.arange(count) + offset
        storeys = {"lower": upper - 1, "upper": upper, "kind": 0, "k": np.ones(count),
                   "k_geo": np.zeros(count), "fy": np.full(count, np.inf), "alpha": 0.0}
    isolator = None
    if law is not None:
        p = np.zeros((cols, 6))
        if law[0] == "ep":
            kind, p[:, 0] = 1, law[1]
            ke = np.tile(np.asarray(law[2], dtype=float), (cols, 1))
            fe = np.tile(np.asarray(law[3], dtype=float), (cols, 1))
        else:
            kind = 2 if law[0] == "smooth" else 3
            p[:] = (law[1], law[2], law[2] - law[3], law[4], law[5], 1.0 - 2.0 * law[6] if kind == 2 else 0.0)
            ke = fe = np.zeros((cols, 1))
        isolator = {"kind": kind, "p": p, "k": ke, "f": fe, "damper": np.full(cols, damper)}
    out = newmark.simulate(mass, k, c, storeys, isolator, ground, dt, nsub, labels, compiled=False)
    return out["u"], out["v"], out["a"] - ground[:, :, None], out["isolator_force"]


def ground_record(steps, dt, seed=3):
    t = np.arange(steps) * dt
    rng = np.random.default_rng(seed)
    g = sum(rng.uniform(0.5, 2.0) * np.sin(rng.uniform(2.0, 20.0) * t + rng.uniform(0, 6)) for _ in range(4))
    g[0] = 0.0
    return g


def limit_iterations(monkeypatch, count):
    """Set the engines' Newton iteration limit (``MAX_ITERATIONS``) for one test, in :mod:`newmark` and in
    the module that defines the numpy engine ``integrate`` (the same module or a sibling it re-exports)."""
    import sys

    monkeypatch.setattr(newmark, "MAX_ITERATIONS", count)
    home = sys.modules[newmark.integrate.__module__]
    if hasattr(home, "MAX_ITERATIONS"):
        monkeypatch.setattr(home, "MAX_ITERATIONS", count)
