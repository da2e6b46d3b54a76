"""The isolation plane's scalar equation in one step (isolation.dynamics.kernel_laws.solve_base).

R(du) = u_n + du + h_b F(du) + h_cd (c2 du - v_n) - w_b = 0 with F an elastic-plastic law
(Newmark average acceleration reduced to the base; module notes of isolation.dynamics.kernel).
The roots are written out by hand for piecewise-linear laws (common practice: a linear equation
per branch); Newton's method on a linear branch is exact in one step (Newton 1669 / any numerical
analysis text, e.g. Burden & Faires, Numerical Analysis, 9th ed., §2.3, from memory).
"""

import numpy as np
import pytest

from isolation.dynamics import kernel_laws as laws

K0, K1, K2, F1, F2 = 100.0, 2000.0, 1000.0, 50.0, 80.0  # kN/m, kN/m, kN/m, kN, kN
HB, HCD, C2 = 1e-4, 0.0, 400.0


def _solve(wb, qs=(0.0, 0.0), guess=0.0, max_iter=50, un=0.0, vn=0.0):
    p = np.array([K0, 0.0, 0.0, 0.0, 0.0, 0.0])
    qt = np.zeros(2)
    out = laws.solve_base(1, p, np.array([K1, K2]), np.array([F1, F2]), np.array(qs, dtype=float), qt,
                          un, vn, wb, HB, HCD, C2, guess, max_iter, 1e-14)
    return out, qt


def test_exact_start_returns_at_once():
    (du, force, count, residual), _ = _solve(0.0)
    assert (du, force, count, residual) == (0.0, 0.0, 0, 0.0)


def test_elastic_branch_is_solved_in_one_newton_step():
    wb = 1e-3  # m; elastic: du (1 + HB (K0 + K1 + K2)) = wb
    (du, force, count, _), qt = _solve(wb)
    expected = wb / (1.0 + HB * (K0 + K1 + K2))
    assert count == 1
    assert du == pytest.approx(expected, rel=1e-12)
    assert force == pytest.approx((K0 + K1 + K2) * expected, rel=1e-12)
    np.testing.assert_allclose(qt, [K1 * expected, K2 * expected], rtol=1e-12)


def test_unloading_from_yield_uses_the_backward_slope_at_du_0():
    # both elements at +yield; w_b below the equilibrium pulls du negative: unloading is elastic,
    # so with the backward (elastic) slope at du = 0 one Newton step is exact.
    qs = (F1, F2)
    wb = HB * (F1 + F2) - 1e-4  # R(0) = HB (F1 + F2) - wb = 1e-4 > 0
    (du, _, count, _), qt = _solve(wb, qs=qs)
    expected = -1e-4 / (1.0 + HB * (K0 + K1 + K2))
    assert count == 1
    assert du == pytest.approx(expected, rel=1e-12)
    np.testing.assert_allclose(qt, [F1 + K1 * expected, F2 + K2 * expected], rtol=1e-12)


def test_yielding_needs_more_steps_and_reports_failure_when_they_run_out():
    wb = 0.2  # m: both elements yield; the root on the last branch: du (1 + HB K0) + HB (F1 + F2) = wb
    (du, force, count, _), qt = _solve(wb)
    expected = (wb - HB * (F1 + F2)) / (1.0 + HB * K0)
    assert du == pytest.approx(expected, rel=1e-12)
    assert force == pytest.approx(K0 * expected + F1 + F2, rel=1e-12)
    np.testing.assert_allclose(qt, [F1, F2])
    assert 2 <= count <= 4  # one Newton step per branch crossed (elastic, one yielded, both yielded)
    (_, _, failed, residual), _ = _solve(wb, max_iter=1)
    assert failed == -1 and residual != 0.0


def test_far_guess_converges_to_the_same_root():
    # Newton from far on the wrong side overshoots on the soft branches; the bracket keeps it.
    wb = 0.05  # m: element 1 yields, element 2 stays elastic (K2 du < F2)
    expected = (wb - HB * F1) / (1.0 + HB * (K0 + K2))
    assert K1 * expected > F1 and K2 * expected < F2
    for guess in (-5.0, 5.0, -0.3, 0.7):
        (du, _, count, _), _ = _solve(wb, guess=guess)
        assert du == pytest.approx(expected, rel=1e-10), guess
        assert 1 <= count <= 8, guess


def test_one_element_law_is_solved_in_closed_form():
    # one elastic-plastic element: one elastic trial and one plastic correction, exact (by hand:
    # du (1 + HB (K0 + K1)) = wb elastic; du (1 + HB K0) + HB F1 = wb yielded)
    p = np.array([K0, 0.0, 0.0, 0.0, 0.0, 0.0])
    for wb, yielded in ((1e-3, False), (0.1, True)):
        qt = np.zeros(1)
        du, force, count, residual = laws.solve_base(1, p, np.array([K1]), np.array([F1]), np.zeros(1), qt,
                                                     0.0, 0.0, wb, HB, HCD, C2, 0.0, 50, 1e-14)
        expected = (wb - HB * F1) / (1.0 + HB * K0) if yielded else wb / (1.0 + HB * (K0 + K1))
        assert (count, residual) == (1, 0.0)
        assert du == pytest.approx(expected, rel=1e-12)
        assert qt[0] == pytest.approx(F1 if yielded else K1 * expected, rel=1e-12)
        assert force == pytest.approx(K0 * expected + qt[0], rel=1e-12)
