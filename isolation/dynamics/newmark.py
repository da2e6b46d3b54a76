"""Newmark average-acceleration integration of shear buildings, fixed or isolated.

:func:`simulate` is the engine :mod:`isolation.dynamics.history` uses: it builds the
step operators (A^-1 of the sub-step, inverted once per analysis) and runs
:mod:`isolation.dynamics.kernel` with the force laws of
:mod:`isolation.dynamics.kernel_laws` (compiled with numba when installed, else
interpreted; identical results), which also handles yielding storeys,
P-delta and sub-steps. :func:`integrate`, the earlier column-vectorised numpy
engine for elastic storeys, lives in :mod:`isolation.dynamics.newmark_columns`
and stays importable from here.

References
----------
Newmark, N. M. (1959). A method of computation for structural dynamics. J. Eng.
Mech. Div. ASCE 85(3).
"""

from __future__ import annotations

import numpy as np

from isolation.dynamics.newmark_columns import (  # noqa: F401 - kept importable from this module
    CONVERGENCE_DISPLACEMENT,
    MAX_ITERATIONS,
    NEWTON_STEP,
    _fail,
    _SmoothSolver,
    _solve_bilinear,
    _solve_elastic_plastic,
    _step_operators,
    integrate,
)
from isolation.errors import RunError

__all__ = ["integrate", "simulate", "kernel_module", "compiled_available", "substeps"]

# --- the compiled engine (issue 14): one column at a time ---------------------------------------

ENGINE_VARIABLE = "ISOLATION_ENGINE"
"""Environment variable: "python" forces the interpreted kernel (same results, far slower)."""

_COMPILED_MODULE = None


def compiled_available() -> bool:
    """True when numba imports (the kernel then runs compiled)."""
    try:
        import numba  # noqa: F401
    except ImportError:
        return False
    return True


def kernel_module(compiled: bool | None = None):
    """The kernel module: a numba-compiled copy of :mod:`isolation.dynamics.kernel`, or the module itself.

    The compiled copy calls compiled copies of the force laws
    (:mod:`isolation.dynamics.kernel_laws`); both are cached on disk by numba.

    Parameters
    ----------
    compiled : bool or None, optional
        True: compiled (numba required); False: interpreted; None (default):
        compiled when numba is installed and ``ISOLATION_ENGINE`` is not
        "python". [-]
    """
    import os

    from isolation.dynamics import kernel

    if compiled is None:
        compiled = compiled_available() and os.environ.get(ENGINE_VARIABLE, "").lower() != "python"
    if not compiled:
        return kernel
    global _COMPILED_MODULE
    if _COMPILED_MODULE is None:
        from isolation.dynamics import kernel_laws

        laws = _module_copy(kernel_laws, "isolation._kernel_laws_compiled")
        _compile(laws, laws.JIT_FUNCTIONS, inline=laws.JIT_FUNCTIONS)
        module = _module_copy(kernel, "isolation._kernel_compiled")
        for name in laws.JIT_FUNCTIONS:  # the loop calls the compiled laws
            if hasattr(module, name):
                setattr(module, name, getattr(laws, name))
        module.kernel_laws = laws
        loop = _compile(module, module.LOOP_FUNCTIONS)
        _forget_stale(loop, kernel_laws.__file__)
        _COMPILED_MODULE = module
    return _COMPILED_MODULE


def _module_copy(module, name: str):
    """A second, separate copy of ``module`` loaded from its file under ``name``."""
    import importlib.util
    import sys

    spec = importlib.util.spec_from_file_location(name, module.__file__)
    if spec is None or spec.loader is None:
        raise ImportError(f"cannot load the compiled kernel from {module.__file__}")
    copy = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = copy  # numba's cache finds the module by name when it loads
    spec.loader.exec_module(copy)
    return copy


def _compile(module, names, inline=()) -> list:
    """Replace the functions ``names`` of ``module`` by numba-compiled ones (cached on disk when it can);
    those in ``inline`` are marked for LLVM to inline wherever they are called."""
    import numba

    found = []
    for name in names:
        function = getattr(module, name)
        force = name in inline
        try:
            compiled_function = numba.njit(cache=True, nogil=True, error_model="numpy", forceinline=force)(function)
        except RuntimeError:  # no writable cache location: compile in every process instead
            compiled_function = numba.njit(nogil=True, error_model="numpy", forceinline=force)(function)
        setattr(module, name, compiled_function)
        found.append(compiled_function)
    return found


def _forget_stale(loop: list, laws_file: str) -> None:
    """Drop the cached loop when the force laws changed since it was compiled.

    numba's cache checks only the file of each cached function, and the loop
    has the laws compiled into it: a stamp of the laws' source beside the
    cache tells whether the cached loop is theirs.
    """
    import hashlib
    from pathlib import Path

    try:
        stamp = hashlib.sha256(Path(laws_file).read_bytes()).hexdigest()
        marker = Path(loop[0]._cache._cache_path) / "kernel_laws.sha256"
        if marker.is_file() and marker.read_text(encoding="ascii").strip() == stamp:
            return
        for function in loop:
            function._cache.flush()
        marker.write_text(stamp + "\n", encoding="ascii")
    except (AttributeError, OSError):  # no cache (or another numba): nothing stale to drop
        return


def substeps(dt: float, shortest_period: float, fraction: float = 10.0) -> int:
    """Sub-steps per record step so that dt/n <= T_min/fraction (1 when already fine enough). [-]"""
    if not np.isfinite(shortest_period) or shortest_period <= 0.0:
        return 1
    return max(1, int(np.ceil(dt * fraction / shortest_period * (1.0 - 1e-12))))


def simulate(mass, k_lin, c, storeys, isolator, ground, dt, nsub, labels, *, compiled=None):
    """Integrate every column with the kernel.

    Parameters
    ----------
    mass : array (dofs,)
        Lumped masses; degree of freedom 0 is the base when ``isolator`` is given. [t]
    k_lin, c : arrays (dofs, dofs)
        Linear stiffness (elastic storeys plus P-delta) [kN/m] and damping [kN s/m].
    storeys : dict
        "lower", "upper" (storeys,) int degrees of freedom (-1 = ground), "kind" (0 elastic,
        1 bilinear, 2 Clough), "k", "k_geo", "fy" (storeys,) [kN/m, kN/m, kN], "alpha" [-].
    isolator : dict or None
        "kind" (1 elastic-plastic, 2 smooth, 3 sharp friction), "p" (cols, 6), "k", "f"
        (cols, elements) [kN/m, kN], "damper" (cols,) [kN s/m]; None for a fixed base.
    ground : array (cols, steps)
        Ground acceleration per column. [m/s2]
    dt : float
        Sample interval. [s]
    nsub : int
        Sub-steps per sample (ground linearly interpolated). [-]
    labels : list of (case, record)
        Names of the columns for error messages.
    compiled : bool or None, optional
        See :func:`kernel_module`. [-]

    Returns
    -------
    dict of arrays: "u", "v" (cols, steps, dofs) relative [m, m/s], "a" absolute [m/s2]; "drift",
    "storey_force" (cols, steps, storeys) [m, kN]; "isolator_force", "reaction" (cols, steps) [kN];
    "energy" (5, cols, steps) [kN m] in the order of :data:`isolation.dynamics.energy.COMPONENTS`.

    References
    ----------
    Newmark, N. M. (1959). A method of computation for structural dynamics. J. Eng. Mech. Div. ASCE 85(EM3),
    67-94. DOI not verified.
    """
    module = kernel_module(compiled)
    ground = np.ascontiguousarray(ground, dtype=float)
    cols, steps = ground.shape
    nd = mass.size
    ns = len(storeys["k"])
    h = dt / nsub
    a_hat = k_lin + (4.0 / h**2) * np.diag(mass) + (2.0 / h) * c
    ainv = np.ascontiguousarray(np.linalg.inv(a_hat))
    lower = np.asarray(storeys["lower"], dtype=np.int64)
    upper = np.asarray(storeys["upper"], dtype=np.int64)
    gmat = np.zeros((nd, ns))
    for i in range(ns):
        gmat[:, i] = ainv[:, upper[i]] - (ainv[:, lower[i]] if lower[i] >= 0 else 0.0)
    kel = np.asarray(storeys["k"], dtype=float)
    fy = np.asarray(storeys["fy"], dtype=float)
    kind = int(storeys["kind"])
    if isolator is None:
        iso_kind, iso_p = 0, np.zeros((cols, 6))
        iso_k = iso_f = np.zeros((cols, 1))
        damper = np.zeros(cols)
    else:
        iso_kind = int(isolator["kind"])
        iso_p = np.ascontiguousarray(isolator["p"], dtype=float)
        iso_k = np.ascontiguousarray(isolator["k"], dtype=float)
        iso_f = np.ascontiguousarray(isolator["f"], dtype=float)
        damper = np.ascontiguousarray(isolator["damper"], dtype=float)
    out = {name: np.empty((cols, steps, nd)) for name in ("u", "v", "a")}
    out["drift"] = np.empty((cols, steps, ns))
    out["storey_force"] = np.empty((cols, steps, ns))
    out["isolator_force"] = np.zeros((cols, steps))
    out["reaction"] = np.empty((cols, steps))
    out["energy"] = np.empty((5, cols, steps))
    status = np.zeros(4)
    tol_storey = 1e-10 * float(fy.max()) if kind != 0 and ns else 0.0
    module.run_columns(ground, float(dt), int(nsub), np.asarray(mass, dtype=float), np.ascontiguousarray(c),
                       ainv, gmat, lower, upper, kind, kel, np.asarray(storeys["k_geo"], dtype=float), fy,
                       float(storeys["alpha"]), iso_kind, iso_p, iso_k, iso_f, damper, int(MAX_ITERATIONS),
                       float(CONVERGENCE_DISPLACEMENT) * 1e-1, tol_storey,
                       out["u"], out["v"], out["a"], out["drift"], out["storey_force"], out["isolator_force"],
                       out["reaction"], out["energy"], status)
    if status[0] >= 0:
        column = int(status[0])
        case, record = labels[column]
        what, unit = ("yielding storeys", "kN") if status[3] == 2.0 else ("isolator", "m")
        raise RunError(
            f"{what}: no convergence at t = {status[1] * dt:.4f} s in case {case!r}, record {record} "
            f"(residual {abs(status[2]):.3g} {unit} after {MAX_ITERATIONS} iterations); "
            "try a smaller dt or check the model parameters")
    return out
