"""The time-stepping kernel of the response-history engine on small models: yielding storeys,
output and energy bookkeeping, the storey laws, the Newton iterations of the isolator
solvers and the failures they report (fast; mutation map of :mod:`isolation.dynamics.kernel`
and :mod:`isolation.dynamics.newmark`, with test_newmark_closed_forms.py).

Sources
-------
- Elastic-perfectly-plastic SDOF under a suddenly applied force P with F_y/2 < P < F_y:
  work P u_m equals the area under the backbone, so u_m = F_y u_y / (2 (F_y - P))
  (Chopra, elastoplastic systems, energy balance, from memory; derived).
- Energy balance E_in = E_k + E_visc + E_strain + E_hyst (Uang & Bertero 1990, Earthquake
  Spectra 6(3), from memory): with the trapezoidal rule it closes to round-off for any force
  law (derived: du . M (v_{n+1} - v_n)/dt + du . C du/dt + du . (f_n + f_{n+1})/2 = -du . M 1 a_avg).
- Recoverable strain energy of an elastic-perfectly-plastic element q^2/(2 k), of Clough's
  storey s^2/(2 k) (unloading at k) and of the Bouc-Wen law Q D_y z^2/2 (common practice).
- Storey laws: bilinear with kinematic hardening and Clough & Johnston (1966) (rules as in
  the kernel's notes, from memory), at points derived by hand in each test.
- Newton's method: exact in one step for a linear residual; for a piecewise-linear one, one
  more pass per segment change; quadratic near a smooth root (common practice).
"""

from __future__ import annotations

import re

import numpy as np
import pytest
from newmark_models import ENGINES, chain, ground_record, limit_iterations, respond

from isolation.dynamics import newmark
from isolation.errors import RunError

# --- yielding storeys (simulate) -------------------------------------------------------------------

@pytest.mark.parametrize("kind", [1, 2])
@pytest.mark.parametrize("ratio", [0.6, 0.8])
def test_elastoplastic_storey_under_a_sudden_force_reaches_the_energy_balance_peak(kind, ratio):
    # SDOF (kind 1 bilinear, 2 Clough: same first excursion), plus a stiff elastic storey above
    # carrying a small mass, so that the storey coupling of the kernel is used.
    m1, m2, k1, k2, fy = 1.0, 0.01, 100.0, 1e4, 10.0
    m, k = chain([m1, m2], [k1, k2])
    dt, steps = 0.002, 1001
    p = ratio * fy
    ground = np.vstack([np.full(steps, p / (m1 + m2)), np.full(steps, -p / (m1 + m2))])  # both directions
    storeys = {"lower": np.array([-1, 0]), "upper": np.array([0, 1]), "kind": kind, "k": np.array([k1, k2]),
               "k_geo": np.zeros(2), "fy": np.array([fy, 1e6]), "alpha": 0.0}
    out = newmark.simulate(m, k, np.zeros((2, 2)), storeys, None, ground, dt, 1, [("frame", 0), ("frame", 1)],
                           compiled=False)
    uy = fy / k1
    expected = fy * uy / (2 * (fy - p))
    for col, sign in enumerate((-1.0, 1.0)):
        drift = out["drift"][col, :, 0]
        assert (sign * drift).max() == pytest.approx(expected, rel=5e-3)
        np.testing.assert_allclose(out["drift"][col, :, 1], out["u"][col, :, 1] - out["u"][col, :, 0], atol=1e-15)
        assert (sign * out["storey_force"][col, :, 0]).max() == pytest.approx(fy, rel=1e-9)
        # energies of the fixed base: strain s^2/(2 k) of each storey (alpha = 0: the whole force is
        # the elastic-plastic element's, or Clough's unloading at k), balance to round-off, no isolator
        e_in, kinetic, viscous, strain, hysteretic = out["energy"][:, col]
        s = out["storey_force"][col]
        np.testing.assert_allclose(strain, 0.5 * (s * s) @ (1.0 / np.array([k1, k2])), rtol=1e-9, atol=1e-12)
        # (the storey iteration stops at 1e-10 of the largest yield shear, here the stiff storey's 1e6 kN)
        np.testing.assert_allclose(kinetic + viscous + strain + hysteretic, e_in, rtol=0, atol=1e-6 * e_in.max())
        assert hysteretic[-1] > 0.1 * e_in[-1]
        assert not np.any(out["isolator_force"][col])


def test_storey_non_convergence_names_the_storeys_and_the_column(monkeypatch):
    limit_iterations(monkeypatch, 1)
    m, k = chain([1.0, 1.0], [100.0, 100.0])
    storeys = {"lower": np.array([-1, 0]), "upper": np.array([0, 1]), "kind": 1, "k": np.array([100.0, 100.0]),
               "k_geo": np.zeros(2), "fy": np.array([1.0, 1.0]), "alpha": 0.0}
    ground = np.vstack([np.zeros(200), np.full(200, 5.0)])
    with pytest.raises(RunError, match=r"^yielding storeys: no convergence at t = 0\.\d{4} s in case 'frame', "
                                       r"record 1 \(residual [0-9.e+-]+ kN after 1 iterations\); try a smaller dt"):
        newmark.simulate(m, k, np.zeros((2, 2)), storeys, None, ground, 0.01, 1, [("frame", 0), ("frame", 1)],
                         compiled=False)


@pytest.mark.parametrize("engine", ENGINES)
def test_isolator_non_convergence_names_time_case_and_record(engine, monkeypatch):
    limit_iterations(monkeypatch, 1)
    # two elements under white noise: some steps cross two segments, which needs two Newton steps
    law = ("ep", 1e4, (9e4, 2e4), (90.0, 200.0))
    ground = np.vstack([np.zeros(400), 30 * np.random.default_rng(1).standard_normal(400)])
    with pytest.raises(RunError) as info:
        respond(engine, np.array([1.0]), np.zeros((1, 1)), np.zeros((1, 1)), ground, 0.01, law=law)
    text = str(info.value)
    assert re.match(r"^(elastic-plastic |smooth )?isolator: no convergence at t = \d\.\d{4} s in case 'case', "
                    r"record 1 \(residual [0-9.e+-]+ m after 1 iterations\); try a smaller dt", text), text


# --- outputs and energies of the kernel (Uang & Bertero 1990 balance) ------------------------------------

def _isolated_model(storey_kind, iso_kind, cols=2):
    """Base + two floors, damped, P-delta, yielding storeys of kind 0/1/2 and one isolator law."""
    base, floors, ks, fy, alpha = 6.0, [4.0, 3.0], [6000.0, 4000.0], [15.0, 10.0], 0.1
    m, k = chain([base] + floors, ks, base=True)
    kgeo = np.array([-60.0, -30.0])  # -P/h per storey
    t = np.array([[-1.0, 1.0, 0.0], [0.0, -1.0, 1.0]])
    k_lin = k + t.T @ np.diag(kgeo) @ t
    c = 0.002 * k + 0.3 * np.diag(m)
    storeys = {"lower": np.array([0, 1]), "upper": np.array([1, 2]), "kind": storey_kind, "k": np.array(ks),
               "k_geo": kgeo, "fy": np.array(fy) if storey_kind else np.full(2, np.inf), "alpha": alpha}
    p = np.zeros((cols, 6))
    ke = fe = np.zeros((cols, 1))
    if iso_kind == 1:  # K_d = 60, two elements (multi-element path; the second column's second element
        # is padding of zero stiffness and strength) or one (exact single-element path)
        p[:, 0] = 60.0
        ke = np.array([[2000.0, 800.0], [2800.0, 0.0]]) if cols > 1 else np.array([[2800.0]])
        fe = np.array([[12.0, 6.0], [18.0, 0.0]]) if cols > 1 else np.array([[18.0]])
    elif iso_kind == 2:  # Bouc-Wen, D_y = 6.4 mm, beta 0.5 (Q = 18) and 0.25 (Q from 12 to 18 with speed)
        p[:] = (60.0, 18.0, 0.0, 0.0, 0.0064, 0.0)
        p[1:] = (60.0, 18.0, 6.0, 25.0, 0.0064, 0.5)
    elif iso_kind == 3:  # sharp friction with velocity-dependent strength
        p[:] = (60.0, 18.0, 9.0, 25.0, 0.0005, 0.0)
    damper = np.linspace(20.0, 40.0, cols)
    isolator = {"kind": iso_kind, "p": p, "k": ke, "f": fe, "damper": damper}
    return m, k_lin, c, storeys, isolator, kgeo, alpha


@pytest.mark.parametrize("storey_kind", [0, 1, 2])
@pytest.mark.parametrize("iso_kind, cols, nsub", [(1, 2, 1), (1, 1, 1), (2, 2, 1), (3, 2, 1), (2, 2, 3)])
def test_kernel_outputs_and_energy_terms_follow_their_definitions(storey_kind, iso_kind, cols, nsub):
    m, k_lin, c, storeys, isolator, kgeo, alpha = _isolated_model(storey_kind, iso_kind, cols)
    dt = 0.01
    g = 8.0 * ground_record(300, dt, seed=13) / 4
    ground = np.vstack([g, -0.7 * g][:cols])
    out = newmark.simulate(m, k_lin, c, storeys, isolator, ground, dt, nsub, [("case", r) for r in range(cols)],
                           compiled=False)
    u, v, a_abs, drift = out["u"], out["v"], out["a"], out["drift"]
    s, force = out["storey_force"], out["isolator_force"]
    e_in, kinetic, viscous, strain, hysteretic = out["energy"]
    assert np.abs(u[:, :, 0]).max() > 0.02  # the isolator yields
    if storey_kind:
        assert np.abs(drift / (storeys["fy"] / storeys["k"])).max() > 1.5  # a storey yields
    for name in ("u", "v", "a", "drift", "storey_force", "isolator_force", "reaction"):
        assert not np.any(out[name][:, 0]), name
    assert not np.any(out["energy"][:, :, 0])
    # equilibrium of the whole: reaction = -sum m a_abs (Chopra, base shear from inertia forces)
    np.testing.assert_allclose(out["reaction"], -(a_abs @ m), rtol=1e-12, atol=1e-12)
    np.testing.assert_allclose(drift, u[:, :, 1:] - u[:, :, :-1], rtol=0, atol=1e-15)
    # Newmark (1959): u_{n+1} - u_n = dt/2 (v_n + v_{n+1}) (between samples when there are no sub-steps)
    if nsub == 1:
        np.testing.assert_allclose(np.diff(u, axis=1), dt / 2 * (v[:, 1:] + v[:, :-1]), rtol=0, atol=1e-12)
    np.testing.assert_allclose(kinetic, 0.5 * (v * v) @ m, rtol=1e-12, atol=1e-15)
    # viscous work: (v_n + v_{n+1})/2 = du/dt, so each step adds du' C du / dt (damper included)
    for col in range(cols if nsub == 1 else 0):
        cc = c.copy()
        cc[0, 0] += isolator["damper"][col]
        du = np.diff(u[col], axis=0)
        np.testing.assert_allclose(viscous[col, 1:], np.cumsum(np.einsum("si,ij,sj->s", du, cc, du)) / dt,
                                   rtol=1e-9, atol=1e-12)
    # recoverable strain energy of each element (common practice: q^2/(2 k) for an elastic-plastic
    # element, alpha k d^2/2 for the hardening spring, s^2/(2 k) for Clough's unloading at k)
    k_el = storeys["k"]
    stored = 0.5 * np.einsum("csi,i->cs", drift * drift, kgeo)
    if storey_kind == 0:
        stored += 0.5 * np.einsum("csi,i->cs", drift * drift, k_el)
        np.testing.assert_allclose(s, drift * k_el, rtol=1e-12, atol=1e-12)
    elif storey_kind == 1:
        q = s - alpha * k_el * drift
        stored += 0.5 * np.einsum("csi,i->cs", alpha * drift * drift, k_el)
        stored += 0.5 * np.sum(q * q / ((1 - alpha) * k_el), axis=2)
        assert np.all(np.abs(q) <= (1 - alpha) * storeys["fy"] * (1 + 1e-9))
    else:
        stored += 0.5 * np.sum(s * s / k_el, axis=2)
    ub = u[:, :, 0]
    p = isolator["p"]
    stored += 0.5 * p[:, :1] * ub * ub
    element = force - p[:, :1] * ub
    if iso_kind == 1:
        if cols == 1:
            stored += 0.5 * element**2 / isolator["k"][0, 0]
            assert np.abs(element).max() == pytest.approx(isolator["f"][0, 0], rel=1e-12)
    elif iso_kind == 2:
        strength = p[:, 1:2] - p[:, 2:3] * np.exp(-p[:, 3:4] * np.abs(v[:, :, 0]))
        stored += 0.5 * p[:, 4:5] * element**2 / strength  # Q D_y z^2 / 2 with z = element / Q
    else:
        strength = p[:, 1:2] - p[:, 2:3] * np.exp(-p[:, 3:4] * np.abs(v[:, :, 0]))
        assert np.all(np.abs(element) <= strength * (1 + 1e-9))
        stored += 0.5 * element**2 * p[:, 4:5] / p[:, 1:2]
    if not (iso_kind == 1 and cols > 1):
        # (smooth law: z read back from the force, which carries the kernel's first-order last correction)
        np.testing.assert_allclose(strain, stored, rtol=1e-7 if iso_kind != 2 else 1e-3, atol=1e-9 * strain.max())
    # storey forces follow the storey law under the computed drifts (ShearBuilding.storey_loop, checked
    # at hand-derived points below), from the unloaded state of each column (sampled path: no sub-steps)
    if storey_kind and nsub == 1:
        from isolation.dynamics.structure import ShearBuilding

        for i in range(2):
            law = ShearBuilding([1.0], [k_el[i]], [3.0], yield_shears=[storeys["fy"][i]], hardening=alpha,
                                hysteresis="bilinear" if storey_kind == 1 else "clough")
            for col in range(cols):
                np.testing.assert_allclose(s[col, :, i], law.storey_loop(drift[col, :, i]), rtol=0,
                                           atol=1e-9 * storeys["fy"][i])
    # balance (Uang & Bertero 1990): with the trapezoidal rule it closes to round-off for any law
    total = kinetic + viscous + strain + hysteretic
    np.testing.assert_allclose(total, e_in, rtol=0, atol=1e-7 * np.abs(e_in).max())
    assert np.all(hysteretic[:, -1] > 0.01 * e_in[:, -1])
    # the isolator force follows the law under the computed base displacement (imposed_force is
    # checked against the closed forms in test_isolator_laws.py)
    if iso_kind in (1, 2) and nsub == 1:
        from isolation.bearings import Bilinear
        from isolation.dynamics.isolators import BoucWen, imposed_force
        for col in range(cols if iso_kind == 1 else 1):  # (the second smooth column is rate-dependent)
            if iso_kind == 1:
                kk, ff = isolator["k"][col], isolator["f"][col]
                bearing = Bilinear(60.0 + kk[0], 60.0, ff[0])
                if kk.size > 1 and kk[1] > 0.0:
                    bearing = bearing.parallel(Bilinear(kk[1], 0.0, ff[1]))
            else:
                beta = 0.5 * (1.0 - p[col, 5])
                bearing = BoucWen(Bilinear(60.0 + 18.0 / 0.0064, 60.0, 18.0), beta=beta)
            # smooth law: the kernel ends its Newton iteration with a first-order correction once the
            # step is below SMOOTH_ACCEPT D_y (error ~ SMOOTH_ACCEPT^2 in z, Taylor remainder), but
            # evaluates in full a correction across a reversal, where the one-sided slope would be
            # the other side's (before: 7e-4 Q at one reversal)
            tolerance = 1e-9 * np.abs(force[col]).max() if iso_kind == 1 else 1e-5 * 18.0
            np.testing.assert_allclose(force[col], imposed_force(bearing, ub[col]), rtol=0, atol=tolerance)


# --- storey laws under imposed drift (the kernel's storey_force through ShearBuilding.storey_loop) ------

def _path(*points, per_mm=10):
    """Piecewise-linear drift path through the given drifts [mm], in steps of 0.1 mm; returns m."""
    out = [points[0]]
    for a, b in zip(points[:-1], points[1:], strict=False):
        n = max(1, int(round(abs(b - a) * per_mm)))
        out.extend(np.linspace(a, b, n + 1)[1:])
    return np.asarray(out) * 1e-3


def _force_at(path, force, target_mm, occurrence):
    hits = np.nonzero(np.isclose(path, target_mm * 1e-3, atol=1e-12))[0]
    return force[hits[occurrence]]


@pytest.mark.parametrize("hysteresis", ["bilinear", "clough"])
def test_storey_laws_with_hardening_at_hand_derived_points(hysteresis):
    # k = 1e4 kN/m, F_y = 50 kN (d_y = 5 mm), alpha = 0.1: backbone F_y + alpha k (d - d_y) beyond d_y.
    # Bilinear (kinematic hardening): elastic range 2 (1 - alpha) F_y = 90 kN after each reversal.
    # Clough & Johnston (1966), rules of the kernel's notes, derived by hand:
    #   0 -> -10 mm: -55 kN; unload at k to zero force at -4.5 mm; back to -7 mm: -25 kN (elastic);
    #   reload from -4.5 mm towards the positive yield point (5 mm, 50): 0 mm -> 50 x 4.5/9.5;
    #   8 mm on the backbone: 53; unload to zero at 2.7 mm, reload towards (-10 mm, -55):
    #   -3.65 mm (half way) -> -27.5; -12 mm on the backbone: -57.
    from isolation.dynamics.structure import ShearBuilding

    b = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0], hardening=0.1, hysteresis=hysteresis)
    path = _path(0.0, -10.0, -7.0, -10.0, 0.0, 8.0, -2.0, -3.65, -12.0)
    force = b.storey_loop(path)
    assert _force_at(path, force, -10.0, 0) == pytest.approx(-55.0, rel=1e-12)
    assert _force_at(path, force, -7.0, 1) == pytest.approx(-25.0, rel=1e-9)
    assert _force_at(path, force, -10.0, 1) == pytest.approx(-55.0, rel=1e-9)
    assert _force_at(path, force, 8.0, 0) == pytest.approx(53.0, rel=1e-9)
    assert _force_at(path, force, -12.0, 0) == pytest.approx(-57.0, rel=1e-9)
    if hysteresis == "clough":
        assert _force_at(path, force, 0.0, 1) == pytest.approx(50.0 * 4.5 / 9.5, rel=1e-9)
        assert _force_at(path, force, -3.65, 0) == pytest.approx(-27.5, rel=1e-9)
        assert _force_at(path, force, -4.5, 1) == pytest.approx(0.0, abs=1e-9)
    else:
        # s = alpha k d + q, |q| <= (1 - alpha) F_y = 45 with q changing at (1 - alpha) k: from -55 at
        # -10 mm elastic (at k) for 10 mm, to 45 at 0 mm, then 45 + 1 kN/mm d: 2 mm -> 47, 8 mm -> 53;
        # from 53 elastic to -47 at -2 mm, then -45 + 1 kN/mm d: -3.65 mm -> -48.65
        assert _force_at(path, force, 0.0, 1) == pytest.approx(45.0, rel=1e-9)
        assert _force_at(path, force, 2.0, 0) == pytest.approx(47.0, rel=1e-9)
        assert _force_at(path, force, -2.0, 2) == pytest.approx(-47.0, rel=1e-9)
        assert _force_at(path, force, -3.65, 0) == pytest.approx(-48.65, rel=1e-9)
    # the reloading line of Clough never lies above the backbone; both laws stay inside it
    backbone = np.where(np.abs(path) > 0.005, np.sign(path) * (50.0 + 1000.0 * (np.abs(path) - 0.005)),
                        1e4 * path)
    assert np.all(np.abs(force) <= np.abs(backbone) + 50.0 * (1 + 1e-12))


def test_clough_reloads_towards_the_first_yield_point_when_that_side_never_yielded():
    # No hardening, push only one way: reloading in the other direction aims at (-d_y, -F_y);
    # after a further push beyond 10 mm, the line aims at the new peak (hand-derived).
    from isolation.dynamics.structure import ShearBuilding

    b = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0], hysteresis="clough")
    path = _path(0.0, 10.0, 0.0, -5.0, 14.0, 0.0, 7.0)
    force = b.storey_loop(path)
    assert _force_at(path, force, 0.0, 1) == pytest.approx(-25.0, rel=1e-9)   # line (5, 0) -> (-5, -50)
    assert _force_at(path, force, -5.0, 0) == pytest.approx(-50.0, rel=1e-9)
    assert _force_at(path, force, 5.0, 1) == pytest.approx(0.0, abs=1e-9)     # unloading from (10, 50)
    assert _force_at(path, force, 5.0, 2) == pytest.approx(25.0, rel=1e-9)    # line (0, 0) -> (10, 50)
    assert _force_at(path, force, 14.0, 0) == pytest.approx(50.0, rel=1e-9)
    # from (14, 50): zero force at 9 mm; reloading towards (-5, -50); then back up: elastic from the
    # reversal at 0 mm (force -50 x 9/14 = -32.14) to zero at 3.214 mm, then the line towards (14, 50)
    f0 = -50.0 * 9.0 / 14.0
    assert _force_at(path, force, 0.0, 3) == pytest.approx(f0, rel=1e-9)
    zero = -f0 / 1e4 * 1e3  # mm
    assert _force_at(path, force, 7.0, -1) == pytest.approx(50.0 * (7.0 - zero) / (14.0 - zero), rel=1e-9)


# --- Newton iterations of the isolator solvers -------------------------------------------------------

CONVERGENCE_LAWS = {
    # linear (elements never yield): the first Newton step from the elastic tangent is exact
    "linear": (("ep", 10.0, (900.0, 300.0), (1e9, 1e9)), 1),
    "no elements": (("ep", 10.0, (), ()), 1),
    # one elastic-plastic element: one elastic trial and one plastic correction, both exact
    "one element": (("ep", 10.0, (900.0,), (3.0,)), 1),
    # piecewise-linear Newton with the tangent of the segment it lands on: at most one more pass
    # per element that changes state within the step (two elements: 3)
    "two elements": (("ep", 10.0, (900.0, 300.0), (3.0, 2.0)), 3),
    # smooth law: Newton from the one-sided tangent on a concave residual, quadratic convergence
    # from about D_y to the stopping tolerance (1e-4 D_y) in a few corrections (common practice: 4)
    "smooth": (("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, 0.5), 4),
    "smooth beta 0.8": (("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, 0.8), 4),
    "smooth beta 0.3": (("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, 0.3), 4),
    "smooth rate": (("smooth", 10.0, 3.0, 1.5, 20.0, 0.003, 0.5), 4),
    "sharp rate": (("sharp", 10.0, 3.0, 1.5, 20.0, 0.003), 4),
}


@pytest.mark.parametrize("engine, name", [(e, n) for n in CONVERGENCE_LAWS for e in ENGINES
                                          if not (e == "integrate" and CONVERGENCE_LAWS[n][0][0] == "sharp")])
def test_isolator_newton_converges_within_the_iterations_its_method_needs(engine, name, monkeypatch):
    # (the numpy engine has no sharp friction law)
    law, iterations = CONVERGENCE_LAWS[name]
    dt = 0.01
    g = 6.0 * ground_record(400, dt, seed=2)
    ground = np.vstack([g, -0.6 * g])
    model = (np.array([2.0, 1.0]), chain([2.0, 1.0], [800.0], base=True)[1], np.diag([0.0, 0.5]))
    reference = respond(engine, *model, ground, dt, law=law, damper=4.0)
    limit_iterations(monkeypatch, iterations)
    fast = respond(engine, *model, ground, dt, law=law, damper=4.0)
    assert np.abs(reference[0][:, :, 0]).max() > 0.05
    for a, b in zip(reference, fast, strict=True):
        np.testing.assert_allclose(b, a, rtol=0, atol=1e-9 * np.abs(a).max())
    if iterations > 1:
        limit_iterations(monkeypatch, 1)
        with pytest.raises(RunError):
            respond(engine, *model, ground, dt, law=law, damper=4.0)


@pytest.mark.parametrize("engine, law", [
    ("integrate", ("ep", 10.0, (3e4, 1e4), (0.3, 0.1))),
    ("integrate", ("smooth", 10.0, 0.4, 0.4, 0.0, 1e-4, 0.5)),
    ("integrate", ("smooth", 10.0, 0.4, 0.2, 10.0, 1e-4, 0.7)),
    ("simulate", ("ep", 10.0, (3e4, 1e4), (0.3, 0.1))),
    ("simulate", ("smooth", 10.0, 0.4, 0.2, 10.0, 1e-4, 0.5)),
])
def test_failure_in_the_first_step_reports_its_end_time_and_the_column(engine, law, monkeypatch):
    # A jump of the ground acceleration at the first step makes the isolator yield at once: one
    # iteration cannot settle it, so the first step (ending at t = dt) fails, in the second column.
    limit_iterations(monkeypatch, 1)
    ground = np.vstack([np.zeros(20), np.r_[0.0, np.full(19, 20.0)]])
    with pytest.raises(RunError) as info:
        respond(engine, np.array([1.0]), np.zeros((1, 1)), np.zeros((1, 1)), ground, 0.01, law=law)
    what = "isolator" if engine == "simulate" else ("elastic-plastic isolator" if law[0] == "ep" else "smooth isolator")
    pattern = (rf"^{what}: no convergence at t = 0\.0100 s in case 'case', record 1 \(residual "
               r"[0-9.e+-]+ m after 1 iterations\); try a smaller dt or check the "
               + ("model" if engine == "simulate" else "isolator") + r" parameters$")
    assert re.match(pattern, str(info.value)), str(info.value)
    residual = float(re.search(r"residual ([0-9.e+-]+) m", str(info.value)).group(1))
    assert 0.0 < residual < 1.0


def test_yielding_storey_failure_in_the_first_step_reports_its_end_time(monkeypatch):
    limit_iterations(monkeypatch, 1)
    m, k = chain([1.0, 1.0], [100.0, 100.0])
    storeys = {"lower": np.array([-1, 0]), "upper": np.array([0, 1]), "kind": 2, "k": np.array([100.0, 100.0]),
               "k_geo": np.zeros(2), "fy": np.array([1.0, 1.0]), "alpha": 0.0}
    ground = np.vstack([np.zeros(20), np.r_[0.0, np.full(19, 500.0)], np.zeros(20)])
    with pytest.raises(RunError, match=r"^yielding storeys: no convergence at t = 0\.0200 s in case 'f', record 1 "
                                       r"\(residual [0-9.]+(e[+-]\d+)? kN after 1 iterations\)") as info:
        newmark.simulate(m, k, np.zeros((2, 2)), storeys, None, ground, 0.02, 1, [("f", 0), ("f", 1), ("f", 2)],
                         compiled=False)
    # the residual is the change of the storey forces' departure in the last pass: the first pass
    # starts from zero and the storeys yield, so it is a good part of F_y
    residual = float(re.search(r"residual ([0-9.e+-]+) kN", str(info.value)).group(1))
    assert 0.01 < residual


