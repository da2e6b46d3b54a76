"""Bearing forces and their tangent for the compiled plan loop (:mod:`isolation.dynamics.plan_kernel`).

Scalar loops that numba compiles, the same laws as :mod:`isolation.dynamics.plan_bearings`
(closed-form isotropic Park-Wen-Ang update of the smooth variable ``z``, radial return of
elastic-plastic elements, sliders' forces times the axial load, none while lifted), each with the
derivative of the bearing force with respect to the step ``s`` of the bearing's displacement:
the consistent tangent of the closed-form update, so that Newton's method on the base motion
converges quadratically.

Tangent of the smooth update (derived; notation of :mod:`isolation.dynamics.plan_bearings`): with
``L = |s|``, ``e = s / L``, ``e_p`` the unit vector normal to ``e``, ``a0 = z0 . e``, ``b = z0 . e_p``,

* unloading over the whole step (``L / Y <= -a0``): ``z = z0 + s / Y``, ``dz/ds = I / Y``;
* otherwise ``a = tanh(atanh(a1) + t)`` with ``a1 = max(a0, 0)``: along the step
  ``dz/dL = ((1 - a^2) e - a h b e_p) / Y`` (``h`` the shrink factor of the normal part),
  across it (a rotation ``dphi = ds_p / L`` of ``e``)
  ``dz/dphi = (a' b - h b) e + (a + h' b^2 - h a0) e_p``, ``a'`` and ``h'`` the derivatives of
  ``a`` and ``h`` with respect to ``a0``.

Rate-dependent friction adds ``z (dQ/ds)^T`` with ``dQ/ds = (Q_fast - Q_slow) r exp(-r |v|) (2/dt) v/|v|``;
an elastic-plastic element on its yield circle adds ``(f_e / y_e) (I - p p^T) / |p_trial|``.

Compiled dispatchers are cached on disk; :func:`compile_kernel` keys their cache on the source of every
plan-kernel module, so that a change in one of them recompiles the loop that inlines it.
"""

from __future__ import annotations

import hashlib
import math
from pathlib import Path

try:  # numba is optional: the array version is the fallback
    from numba import njit
except ImportError:  # pragma: no cover - exercised where numba is missing
    njit = None  # type: ignore[assignment]  # the optional import's stand-in

__all__ = ["available", "compile_kernel", "smooth_python", "bearing_trial_python", "bearing_commit_python",
           "smooth", "bearing_trial", "bearing_commit"]

available = njit is not None

_EDGE = 1.0 - 1e-15
_SOURCES = ("plan_kernel.py", "plan_kernel_bearings.py", "plan_kernel_steps.py")

# columns of the per-bearing law parameters and of the bearing state
SLIDER, K0, Q_FAST, Q_DROP, RATE, INV_Y = range(6)
DX, DY, VX, VY, ZX, ZY = range(6)


def _source_stamp() -> bytes:
    here = Path(__file__).parent
    digest = hashlib.sha256()
    for name in _SOURCES:
        digest.update((here / name).read_bytes())
    return digest.digest()


def compile_kernel(function, inline: bool = True):
    """``function`` compiled by numba, cached on disk under the source of all plan-kernel modules.

    With ``inline`` (the steps and the bearing laws) numba inlines the function where it is called,
    so that no call passes arrays (reference counts) inside the time loop."""
    assert njit is not None, "numba is not installed"
    try:
        dispatcher = njit(cache=True, inline="always" if inline else "never")(function)
        cache = getattr(dispatcher, "_cache", None)
        index = getattr(cache, "_cache_file", None)
        if index is not None and hasattr(index, "_source_stamp"):
            index._source_stamp = _source_stamp()
    except RuntimeError:  # no writable cache location: compile in every process instead
        dispatcher = njit(inline="always" if inline else "never")(function)
    return dispatcher


def smooth_python(zx, zy, sx, sy, inv_y):
    """Smooth variable after step ``s`` and its derivative: (z_x, z_y, Z_xx, Z_xy, Z_yx, Z_yy).

    The closed form of :func:`isolation.dynamics.plan_bearings.smooth_update` for one bearing (z [-],
    step [m], ``inv_y`` = 1/Y [1/m]); the derivative as in the module notes (derived).

    References
    ----------
    Park, Y. J., Wen, Y. K. & Ang, A. H.-S. (1986). Random vibration of hysteretic systems under bi-directional
    ground motions. Earthquake Eng. Struct. Dyn. 14(4), 543-557. doi:10.1002/eqe.4290140405 (DOI not verified)
    """
    length = math.sqrt(sx * sx + sy * sy)
    if length == 0.0:
        return zx, zy, inv_y, 0.0, 0.0, inv_y
    ex = sx / length
    ey = sy / length
    a0 = zx * ex + zy * ey
    b = -zx * ey + zy * ex  # z0 . e_p with e_p = (-e_y, e_x)
    x = length * inv_y
    if x <= -a0:  # unloading over the whole step: elastic
        return zx + sx * inv_y, zy + sy * inv_y, inv_y, 0.0, 0.0, inv_y
    if a0 < 0.0:  # elastic to a = 0, then loading
        t = math.tanh(x + a0)
        a = t
        shrink = math.sqrt(1.0 - t * t)
        da = 1.0 - t * t
        dshrink = -t * shrink
    else:
        a1 = min(a0, _EDGE)
        t = math.tanh(x)
        den = 1.0 + a1 * t
        root = math.sqrt(1.0 - t * t)
        a = (a1 + t) / den
        shrink = root / den
        da = (1.0 - t * t) / (den * den) if a0 < _EDGE else 0.0
        dshrink = -root * t / (den * den) if a0 < _EDGE else 0.0
    # along the step (u) and across it (w, per unit normal step), in the (e, e_p) frame
    ue = (1.0 - a * a) * inv_y
    up = -a * shrink * b * inv_y
    we = (da - shrink) * b / length
    wp = (a + dshrink * b * b - shrink * a0) / length
    ux = ue * ex - up * ey
    uy = ue * ey + up * ex
    wx = we * ex - wp * ey
    wy = we * ey + wp * ex
    return (a * ex - shrink * b * ey, a * ey + shrink * b * ex,
            ux * ex - wx * ey, ux * ey + wx * ex, uy * ex - wy * ey, uy * ey + wy * ex)


def _elements(col, b, sx, sy, p, strength, inv_ey, p_t):
    """Force (x, y) of the elastic-plastic elements of bearing ``b`` after step ``s`` and its tangent."""
    fx = fy = kxx = kxy = kyy = 0.0
    for e in range(strength.shape[2]):
        ie = inv_ey[col, b, e]
        if ie > 0.0:
            px = p[b, e, 0] + sx * ie
            py = p[b, e, 1] + sy * ie
            size = math.sqrt(px * px + py * py)
            f = strength[col, b, e]
            if size > 1.0:
                px /= size
                py /= size
                w = f * ie / size
                kxx += w * (1.0 - px * px)
                kxy -= w * px * py
                kyy += w * (1.0 - py * py)
            else:
                kxx += f * ie
                kyy += f * ie
            fx += f * px
            fy += f * py
            p_t[b, e, 0] = px
            p_t[b, e, 1] = py
    return fx, fy, kxx, kxy, kyy


def _one_bearing(col, b, dx, dy, state, p, axial, law, strength, inv_ey, c2, trial, p_t):
    """Force of bearing ``b`` at displacement ``d`` and its tangent (f_x, f_y, K_xx, K_xy, K_yx, K_yy)."""
    sx = dx - state[b, DX]
    sy = dy - state[b, DY]
    vx = c2 * sx - state[b, VX]
    vy = c2 * sy - state[b, VY]
    k0 = law[col, b, K0]
    fx, fy, kxx, kxy, kyy = _elements(col, b, sx, sy, p, strength, inv_ey, p_t)
    fx += k0 * dx
    fy += k0 * dy
    kxx += k0
    kyy += k0
    kyx = kxy
    zx = state[b, ZX]
    zy = state[b, ZY]
    q = law[col, b, Q_FAST]
    if q > 0.0:
        zx, zy, z00, z01, z10, z11 = smooth(zx, zy, sx, sy, law[col, b, INV_Y])
        drop = law[col, b, Q_DROP]
        rate = law[col, b, RATE]
        speed = math.sqrt(vx * vx + vy * vy)
        if drop > 0.0 and rate > 0.0:
            slow = drop * math.exp(-rate * speed)
            q -= slow
            if speed > 0.0:
                gx = slow * rate * c2 * vx / speed
                gy = slow * rate * c2 * vy / speed
                kxx += zx * gx
                kxy += zx * gy
                kyx += zy * gx
                kyy += zy * gy
        fx += q * zx
        fy += q * zy
        kxx += q * z00
        kxy += q * z01
        kyx += q * z10
        kyy += q * z11
    trial[b, DX] = dx
    trial[b, DY] = dy
    trial[b, VX] = vx
    trial[b, VY] = vy
    trial[b, ZX] = zx
    trial[b, ZY] = zy
    if law[col, b, SLIDER] > 0.0:
        scale = axial[b] if axial[b] > 0.0 else 0.0
        return scale * fx, scale * fy, scale * kxx, scale * kxy, scale * kyx, scale * kyy
    return fx, fy, kxx, kxy, kyx, kyy


def bearing_trial_python(col, ub, pos, state, p, axial, law, strength, inv_ey, c2, trial, p_t, jac):
    """Resultant bearing force (x, y, moment) at base motion ``ub`` (x, y, theta), the bearings' trial
    states in ``trial`` and ``p_t`` and the derivative of the resultant with respect to ``ub`` in ``jac``."""
    for i in range(3):
        for j in range(3):
            jac[i, j] = 0.0
    f0 = f1 = f2 = 0.0
    for b in range(pos.shape[0]):
        x = pos[b, 0]
        y = pos[b, 1]
        fx, fy, kxx, kxy, kyx, kyy = _one_bearing(col, b, ub[0] - y * ub[2], ub[1] + x * ub[2], state, p, axial,
                                                  law, strength, inv_ey, c2, trial, p_t)
        f0 += fx
        f1 += fy
        f2 += x * fy - y * fx
        # d = T ub with T = [[1, 0, -y], [0, 1, x]]: jac += T' K T
        r0 = -y * kxx + x * kxy
        r1 = -y * kyx + x * kyy
        jac[0, 0] += kxx
        jac[0, 1] += kxy
        jac[0, 2] += r0
        jac[1, 0] += kyx
        jac[1, 1] += kyy
        jac[1, 2] += r1
        jac[2, 0] += -y * kxx + x * kyx
        jac[2, 1] += -y * kxy + x * kyy
        jac[2, 2] += -y * r0 + x * r1
    return f0, f1, f2


def bearing_commit_python(col, law, state, p, trial, p_t, axial, uplift, axial_min, axial_max):
    """Make the trial states the bearings' states; count uplift and keep the axial load extremes."""
    for b in range(state.shape[0]):
        for i in range(6):
            state[b, i] = trial[b, i]
        for e in range(p.shape[1]):
            p[b, e, 0] = p_t[b, e, 0]
            p[b, e, 1] = p_t[b, e, 1]
        if law[col, b, SLIDER] > 0.0 and axial[b] <= 0.0:
            uplift[col, b] += 1
        axial_min[col, b] = min(axial_min[col, b], axial[b])
        axial_max[col, b] = max(axial_max[col, b], axial[b])


if available:
    smooth = compile_kernel(smooth_python)
    _elements = compile_kernel(_elements)
    _one_bearing = compile_kernel(_one_bearing)
    bearing_trial = compile_kernel(bearing_trial_python)
    bearing_commit = compile_kernel(bearing_commit_python)
else:  # pragma: no cover
    smooth = smooth_python
    bearing_trial = bearing_trial_python
    bearing_commit = bearing_commit_python
