"""Edge cases of the equivalent-linear iteration (isolation.design.single_mode).

Checks against closed forms of a linear system: T = 2 pi sqrt(W/(g k)) (ASCE/SEI 7-16
Eq. 17.5-2) and D = g S_a(T) T^2/(4 pi^2 B) (Eq. 17.5-1 in its general form), the
ASCE/SEI 7-16 §11.4.6 spectrum (S_a = S_M1/T between T_S and T_L) and B from Table
17.5-1 (1.0 at 5 %, 1.5 at 20 %, 2.0 at 50 % and above) -- clause numbers and table rows
"from memory". "[derived]" marks hand arithmetic from the formula named beside it.
"""

import math

import pytest

from isolation.codes.registry import DEFAULT_BASIS
from isolation.design import design_bounds, equivalent_linear
from isolation.design.single_mode import EquivalentLinearResult, Item, _force
from isolation.errors import RunError
from isolation.site.spectra import CodeSpectrum, TabulatedSpectrum
from tools import LinearSystem

G = 9.80665  # standard gravity [m/s^2] (CGPM 1901, exact by definition)
SPECTRUM = CodeSpectrum(1.5, 0.9)  # S_MS 1.5 g, S_M1 0.9 g: T_S = 0.6 s, T_L = 8 s


def stiffness_for_period(weight, period):
    # ASCE/SEI 7-16 Eq. 17.5-2, T = 2 pi sqrt(W/(k g)), solved for k (from memory).
    return 4 * math.pi**2 * weight / (G * period**2)


def period_of(weight, stiffness):
    # ASCE/SEI 7-16 Eq. 17.5-2 (from memory).
    return 2.0 * math.pi * math.sqrt(weight / (stiffness * G))


class NoForce:
    """Test double: effective stiffness [kN/m] and damping [-] only, no force()."""

    def __init__(self, stiffness, damping):
        self.stiffness, self.damping = stiffness, damping

    def effective_stiffness(self, d):
        return self.stiffness

    def effective_damping(self, d):
        return self.damping


class PeriodOf(NoForce):
    """Test double: stiffness chosen so that the effective period is period(D) [s]."""

    def __init__(self, weight, period, damping=0.05):
        self.weight, self.period, self.damping = weight, period, damping

    def effective_stiffness(self, d):
        return stiffness_for_period(self.weight, self.period(d))


# --- to_dict and the force helper ----------------------------------------------------

def test_to_dict_keeps_nan_and_infinity_as_floats():
    # The design layer keeps non-finite values as floats (plain(..., keep_nonfinite=True));
    # IEEE 754: NaN is the only value unequal to itself.
    item = Item("clearance", "c", math.nan, "m", "common practice").to_dict()
    assert isinstance(item["value"], float) and math.isnan(item["value"])
    assert item["name"] == "clearance" and item["unit"] == "m"
    assert Item("ratio", "r", math.inf, "-", "common practice").to_dict()["value"] == math.inf


def test_result_to_dict_carries_every_field():
    w = 1000.0
    result = equivalent_linear(LinearSystem(stiffness_for_period(w, 3.0), 0.20), w, SPECTRUM)
    out = result.to_dict()
    # [derived] Eq. 17.5-1 with B = 1.5 at 20 % (Table 17.5-1): D = g 0.9 * 3/(4 pi^2 1.5).
    assert out["displacement"] == pytest.approx(G * 0.9 * 3.0 / (4 * math.pi**2 * 1.5), rel=1e-9)
    assert out["rule"] == "asce7" and out["converged"] is True
    assert isinstance(out["history"], list) and len(out["history"]) == result.iterations


def test_force_falls_back_to_secant_stiffness_times_displacement():
    # Without force(), F(d) = K_eff(d) d (definition of the secant stiffness).
    assert _force(NoForce(250.0, 0.1), 0.4) == pytest.approx(100.0, rel=1e-15)
    assert _force(NoForce(250.0, 0.1), 0.2) == pytest.approx(50.0, rel=1e-15)

    class Sliding(NoForce):
        # K_eff(d) = K_d + Q_d/d (bilinear with zero yield displacement, Naeim & Kelly 1999 ch. 4,
        # from memory): F = K_d d + Q_d = 100 kN/m * 0.5 m + 10 kN = 60 kN.
        def effective_stiffness(self, d):
            return 100.0 + 10.0 / d

    assert _force(Sliding(0.0, 0.1), 0.5) == pytest.approx(60.0, rel=1e-14)


def test_force_uses_the_system_force_when_there_is_one():
    class Backbone(NoForce):
        # A force() that is not K_eff d (e.g. a system reporting its backbone force):
        # the helper must take the system's own answer.
        def force(self, d):
            return 7.0 + 100.0 * d

    assert _force(Backbone(250.0, 0.1), 0.5) == pytest.approx(57.0, rel=1e-15)


# --- RunError on a system that answers nonsense ---------------------------------------

@pytest.mark.parametrize("stiffness", [math.nan, math.inf, -1.0, 0.0])
def test_nonfinite_or_nonpositive_stiffness_is_a_run_error(stiffness):
    with pytest.raises(RunError, match=r"effective_stiffness\(.*must be finite and > 0"):
        equivalent_linear(NoForce(stiffness, 0.05), 1000.0, SPECTRUM)


@pytest.mark.parametrize("damping", [math.nan, math.inf, -0.01, 1.01, 1.5])
def test_damping_outside_zero_one_is_a_run_error(damping):
    w = 1000.0
    with pytest.raises(RunError, match=r"effective_damping\(.*must lie in \[0, 1\]"):
        equivalent_linear(NoForce(stiffness_for_period(w, 3.0), damping), w, SPECTRUM)


def test_damping_of_one_and_small_stiffness_are_accepted():
    # beta = 1.0 is the closed end of [0, 1]; Table 17.5-1 gives B = 2.0 from 50 % up.
    # A stiffness below 1 kN/m is still a stiffness: W 1 kN, k 0.5 kN/m -> T = 2.837 s [derived].
    w, k = 1.0, 0.5
    result = equivalent_linear(NoForce(k, 1.0), w, SPECTRUM)
    t = period_of(w, k)
    assert result.period == pytest.approx(t, rel=1e-12)
    assert result.damping_coefficient == pytest.approx(2.0)
    assert result.displacement == pytest.approx(G * 0.9 * t / (4 * math.pi**2 * 2.0), rel=1e-9)


# --- bad input: ValueError naming the field --------------------------------------------

@pytest.mark.parametrize(
    "options, field",
    [
        ({"tolerance": 0.0}, "tolerance"),
        ({"tolerance": -1e-6}, "tolerance"),
        ({"tolerance": 0.0101}, "tolerance"),
        ({"max_iterations": True}, "max_iterations"),
        ({"max_iterations": 2.5}, "max_iterations"),
        ({"max_iterations": 0}, "max_iterations"),
        ({"initial_period": 0.0}, "initial_period"),
        ({"initial_period": math.nan}, "initial_period"),
    ],
)
def test_bad_option_names_the_field(options, field):
    with pytest.raises(ValueError, match=rf"^{field} = "):
        equivalent_linear(LinearSystem(1000.0, 0.1), 1000.0, SPECTRUM, **options)


def test_unknown_rule_names_the_field():
    with pytest.raises(ValueError, match=r"^rule = 'nzs'"):
        equivalent_linear(LinearSystem(1000.0, 0.1), 1000.0, SPECTRUM, "nzs")


def test_system_needs_both_stiffness_and_damping():
    class StiffnessOnly:
        def effective_stiffness(self, d):
            return 1000.0

    with pytest.raises(ValueError, match=r"^system = .*effective_damping"):
        equivalent_linear(StiffnessOnly(), 1000.0, SPECTRUM)


def test_largest_tolerance_is_allowed():
    # 0.01 is the closed upper end of (0, 0.01]; a linear system converges in one step.
    w = 1000.0
    result = equivalent_linear(LinearSystem(stiffness_for_period(w, 3.0), 0.05), w, SPECTRUM, tolerance=0.01)
    assert result.displacement == pytest.approx(G * 0.9 * 3.0 / (4 * math.pi**2), rel=1e-9)


def test_rule_none_without_a_spectrum_rule_takes_the_default_basis():
    class Bare:
        """A spectrum object with no ``rule`` attribute (the spectrum protocol's minimum)."""

        period_range = (0.0, 10.0)

        def sa(self, period, damping=0.05):
            return SPECTRUM.sa(period, damping)

    w = 1000.0
    result = equivalent_linear(LinearSystem(stiffness_for_period(w, 3.0), 0.20), w, Bare(), rule=None)
    assert result.rule == DEFAULT_BASIS
    assert result.damping_coefficient == pytest.approx(1.5)  # Table 17.5-1, 20 %


# --- the starting guess and the recorded history ----------------------------------------

def test_first_trial_is_the_5_percent_displacement_at_the_initial_period():
    # D_0 = Sd(T_0) = g S_a(T_0) T_0^2/(4 pi^2) at 5 % (docstring of initial_period; default
    # T_0 = 2.5 s): on the S_M1/T branch, g 0.9 * 2.5/(4 pi^2) = 0.5589 m [derived].
    w = 1000.0
    t, beta = 3.0, 0.20
    result = equivalent_linear(LinearSystem(stiffness_for_period(w, t), beta), w, SPECTRUM)
    d0 = G * 0.9 * 2.5 / (4 * math.pi**2)
    assert d0 == pytest.approx(0.5589, abs=5e-5)
    assert result.history[0][0] == pytest.approx(d0, rel=1e-12)
    # Each history row is (D, T, beta, B, D_next): Eq. 17.5-2, the system's beta, Table 17.5-1, Eq. 17.5-1.
    d, period, damping, b, d_next = result.history[0]
    assert period == pytest.approx(t, rel=1e-12)
    assert damping == 0.20
    assert b == pytest.approx(1.5)
    assert d_next == pytest.approx(G * 0.9 * t / (4 * math.pi**2 * 1.5), rel=1e-12)
    assert result.iterations == len(result.history) >= 1
    # S_a(T) at 5 % on the S_M1/T branch (ASCE/SEI 7-16 §11.4.6).
    assert result.spectral_acceleration == pytest.approx(0.9 / t, rel=1e-12)


def test_other_initial_period_changes_only_the_start():
    w = 1000.0
    system = LinearSystem(stiffness_for_period(w, 3.0), 0.20)
    a = equivalent_linear(system, w, SPECTRUM, initial_period=4.0)
    assert a.history[0][0] == pytest.approx(G * 0.9 * 4.0 / (4 * math.pi**2), rel=1e-12)
    assert a.displacement == pytest.approx(G * 0.9 * 3.0 / (4 * math.pi**2 * 1.5), rel=1e-9)


def test_initial_period_below_the_range_starts_at_its_short_end():
    # A flat table (S_a 0.3 g from 0.5 to 5 s): D_0 = g 0.3 T_0^2/(4 pi^2), so T_0 follows from D_0.
    w = 1000.0
    table = TabulatedSpectrum([0.5, 5.0], [0.3, 0.3])
    result = equivalent_linear(LinearSystem(stiffness_for_period(w, 3.0), 0.05), w, table, initial_period=0.1)
    t0 = math.sqrt(4 * math.pi**2 * result.history[0][0] / (G * 0.3))
    assert 0.5 <= t0 <= 0.5 * 1.01
    assert result.displacement == pytest.approx(G * 0.3 * 9.0 / (4 * math.pi**2), rel=1e-9)


# --- period range edges (inclusive) ----------------------------------------------------

def test_period_at_the_long_end_of_the_range_is_accepted():
    w, k = 1000.0, stiffness_for_period(1000.0, 4.0)
    t = period_of(w, k)  # the same floating-point period the iteration computes
    result = equivalent_linear(LinearSystem(k, 0.05), w, CodeSpectrum(1.5, 0.9, max_period=t))
    assert result.period == t
    assert result.displacement == pytest.approx(G * 0.9 * t / (4 * math.pi**2), rel=1e-9)


def test_period_at_the_short_end_of_the_range_is_accepted():
    w, k = 1000.0, stiffness_for_period(1000.0, 1.0)
    t = period_of(w, k)
    result = equivalent_linear(LinearSystem(k, 0.05), w, TabulatedSpectrum([t, 5.0], [0.4, 0.4]))
    assert result.period == t
    assert result.displacement == pytest.approx(G * 0.4 * t**2 / (4 * math.pi**2), rel=1e-9)


# --- convergence: accuracy to the tolerance, stable roots, failure messages ------------

class SmallSteepDamping(LinearSystem):
    """Test double: beta = 0.2 (D/3 mm)^5 (<= 0.5) at a fixed 2.5 s period."""

    def effective_damping(self, d):
        return min(0.2 * (d / 0.003) ** 5, 0.5)


def test_small_displacement_converges_to_the_relative_tolerance():
    # [derived] T = 2.5 s, S_M1 chosen so that D = g (S_M1/2.5) 2.5^2/(4 pi^2 B) = 3 mm at B = 1.5
    # (beta 20 %, Table 17.5-1): the root is D = 3 mm. The tolerance is relative to D, so a
    # millimetre-scale answer is as accurate (relatively) as a metre-scale one.
    w = 1000.0
    sm1 = 0.003 * 4 * math.pi**2 * 1.5 / (G * 2.5)
    result = equivalent_linear(SmallSteepDamping(stiffness_for_period(w, 2.5), 0.0), w,
                               CodeSpectrum(1.0, sm1), tolerance=1e-5)
    assert result.method == "fixed point"
    assert result.displacement == pytest.approx(0.003, rel=1e-4)


def test_oscillating_case_settles_by_substitution():
    # Same steep-damping case at 3 mm: the relaxed substitution must settle without the
    # bracketing fallback, in far fewer than the default 200 steps.
    w = 1000.0
    sm1 = 0.003 * 4 * math.pi**2 * 1.5 / (G * 2.5)
    result = equivalent_linear(SmallSteepDamping(stiffness_for_period(w, 2.5), 0.0), w,
                               CodeSpectrum(1.0, sm1), tolerance=1e-9)
    assert result.method == "fixed point"
    assert result.displacement == pytest.approx(0.003, rel=1e-7)
    assert result.iterations < 100


def test_bracketing_reaches_the_closed_form_to_the_tolerance():
    # Closed form [derived] (as in test_design.py): K(D) = W/R + mu W/D, B fixed (beta 15 %,
    # B = 1.35 by Table 17.5-1 interpolation) on the S_M1/T branch:
    # D = (-mu R + sqrt((mu R)^2 + 16 pi^2 c^2 R/g))/2 with c = g S_M1/(4 pi^2 B).
    w, radius, mu, sm1 = 2000.0, 2.5, 0.07, 0.75

    class Sliding(LinearSystem):
        def effective_stiffness(self, d):
            return w / radius + mu * w / d

    c = G * sm1 / (4 * math.pi**2 * 1.35)
    expected = (-mu * radius + math.sqrt((mu * radius) ** 2 + 16 * math.pi**2 * c**2 * radius / G)) / 2
    result = equivalent_linear(Sliding(0.0, 0.15), w, CodeSpectrum(1.5, sm1), max_iterations=1)
    assert result.method == "bracketing"
    assert result.displacement == pytest.approx(expected, rel=1e-7)
    # One substitution step, then Brent's method (scipy.optimize.brentq, at most maxiter = 100
    # evaluations by its documented default): the 240-point scan is not recorded.
    assert 1 <= result.iterations <= 1 + 100 + 2
    # With the loosest tolerance (1 %) the bracketed answer is still within it of the root.
    loose = equivalent_linear(Sliding(0.0, 0.15), w, CodeSpectrum(1.5, sm1), max_iterations=1, tolerance=0.01)
    assert loose.displacement == pytest.approx(expected, rel=0.01)


def test_bracketing_returns_the_stable_root_not_the_first_crossing():
    # T(D) = 3 s * min(1, D/0.1 m), 5 % damping. Below a few mm, T is short and
    # Sd = g S_a T^2/(4 pi^2) ~ D^2 < D; above, Sd > D up to the stable root on the flat
    # part, D = g 0.9 * 3/(4 pi^2) = 0.6708 m [derived, Eq. 17.5-1]. The small root is
    # unstable (D - f(D) rising through zero); the design answer is the stable one.
    w = 1000.0
    system = PeriodOf(w, lambda d: 3.0 * min(1.0, d / 0.1))
    result = equivalent_linear(system, w, SPECTRUM, max_iterations=1)
    assert result.method == "bracketing"
    assert result.displacement == pytest.approx(G * 0.9 * 3.0 / (4 * math.pi**2), rel=1e-7)


def test_bracketing_falls_back_to_a_rising_root_when_no_stable_one_exists():
    # T(D) = 30 s/m D with T_L = max period = 40 s: f(D) = g S_a T^2/(4 pi^2) grows like D^2
    # near zero and like 6.7 D on the S_M1/T branch, so f - D rises through zero once and
    # stays positive up to the end of the range; the only root is on the T < T_0 = 0.12 s ramp,
    # S_a = S_MS (0.4 + 0.6 T/T_0) (ASCE/SEI 7-16 §11.4.6, from memory): with T = 30 D,
    # g 900 D^2 (0.6 + 225 D)/(4 pi^2) = D, i.e. a D^2 + b D - 1 = 0 [derived].
    w = 1000.0
    system = PeriodOf(w, lambda d: 30.0 * d)
    spectrum = CodeSpectrum(1.5, 0.9, long_period=40.0, max_period=40.0)
    result = equivalent_linear(system, w, spectrum, max_iterations=1)
    c = G * 900.0 / (4 * math.pi**2)
    a, b = c * 225.0, c * 0.6
    root = (-b + math.sqrt(b * b + 4 * a)) / (2 * a)
    assert 30.0 * root < 0.2 * 0.9 / 1.5  # the root is on the ramp below T_0
    assert result.method == "bracketing"
    assert result.displacement == pytest.approx(root, rel=1e-7)


def test_no_root_reports_the_last_four_trials_and_the_period_range():
    # T(D) = 1 s + 4.5 s/m D, 5 % damping, S_a = S_M1/T: f(D) = g 0.9 (1 + 4.5 D)/(4 pi^2)
    # = 0.2236 + 1.006 D > D for every D [derived], so there is no root; the trials climb until
    # T leaves the spectrum's 8 s range.
    w = 1000.0
    system = PeriodOf(w, lambda d: 1.0 + 4.5 * d)
    with pytest.raises(RunError) as info:
        equivalent_linear(system, w, CodeSpectrum(1.5, 0.9, max_period=8.0))
    message = str(info.value)
    trials, d = [], G * 0.9 * 2.5 / (4 * math.pi**2)  # D_0 = Sd(2.5 s) at 5 %
    while 1.0 + 4.5 * d <= 8.0:
        trials.append(d)
        d = G * 0.9 * (1.0 + 4.5 * d) / (4 * math.pi**2)
    assert len(trials) >= 5
    shown = ", ".join(f"{x:.4g}" for x in trials[-4:])
    assert f"(last trial displacements {shown} m)" in message
    assert f"{trials[-5]:.4g}," not in message
    assert "outside the spectrum's period range [0, 8] s" in message


def test_no_root_inside_the_range_says_so_without_a_period_note():
    # Same rising f(D) but with T_L and the range past every trial (T <= 1 + 4.5 * 50 = 226 s):
    # the iteration stops at max_iterations, every trial stays in range, no root is bracketed.
    w = 1000.0
    system = PeriodOf(w, lambda d: 1.0 + 4.5 * d)
    spectrum = CodeSpectrum(1.5, 0.9, long_period=300.0, max_period=300.0)
    with pytest.raises(RunError, match="did not converge") as info:
        equivalent_linear(system, w, spectrum, max_iterations=3)
    message = str(info.value)
    assert "last trial displacements" in message
    assert "period range" not in message


def test_no_trial_at_all_has_no_trial_list():
    # A 3 s system on a table that stops at 1 s: even the first trial is outside the range.
    w = 1000.0
    with pytest.raises(RunError) as info:
        equivalent_linear(LinearSystem(stiffness_for_period(w, 3.0), 0.1), w,
                          TabulatedSpectrum([0.1, 1.0], [1.0, 0.5]))
    message = str(info.value)
    assert "last trial" not in message
    assert "0 iterations" in message


# --- design_bounds -----------------------------------------------------------------------

def test_bounds_name_the_force_set_by_base_shear_not_by_name():
    # On the S_M1/T branch V/W = K D/W = S_M1/(T B) [derived, Eqs. 17.5-1, 17.5-2]: the stiffer
    # set ("firm", 2 s) governs forces and the softer ("soft", 3.5 s) displacement, whatever
    # the alphabetical order of the names.
    w = 1000.0
    sets = {"firm": LinearSystem(stiffness_for_period(w, 2.0), 0.05),
            "soft": LinearSystem(stiffness_for_period(w, 3.5), 0.05)}
    bounds = design_bounds(sets, w, SPECTRUM)
    assert bounds.force_governs == "firm"
    assert bounds.displacement_governs == "soft"
    assert bounds.force.base_shear / w == pytest.approx(0.9 / 2.0, rel=1e-9)
    assert bounds.displacement.displacement == pytest.approx(G * 0.9 * 3.5 / (4 * math.pi**2), rel=1e-9)
    assert isinstance(bounds.force, EquivalentLinearResult)
