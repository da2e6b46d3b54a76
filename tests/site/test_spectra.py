"""Tests of isolation.site.spectra against the standards' formulas and tables.

Sources named beside each check. "[derived]" marks arithmetic worked by hand
from the published formula named beside it.
"""

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.site.spectra import (
    CodeSpectrum,
    EurocodeSpectrum,
    TabulatedSpectrum,
    damping_coefficient,
    eurocode_eta,
    spectrum_from_dict,
)

G = 9.80665


# --- ASCE/SEI 7-16 §11.4.6 two-period spectrum -------------------------------

def test_code_spectrum_design_values_derived():
    # ASCE/SEI 7-16 §11.4.6, [derived]: S_MS 1.5, S_M1 0.9 -> S_DS 1.0, S_D1 0.6,
    # T0 = 0.12 s, TS = 0.6 s; Sa(0.06) = 1.0 (0.4 + 0.6 * 0.5) = 0.70,
    # Sa(3.0) = 0.6/3 = 0.20, Sa(10, T_L 8) = 0.6 * 8/100 = 0.048.
    design = CodeSpectrum(1.5, 0.9, long_period=8.0).design()
    assert design.sds == pytest.approx(1.0)
    assert design.sd1 == pytest.approx(0.6)
    assert design.t0 == pytest.approx(0.12)
    assert design.ts == pytest.approx(0.6)
    assert design.sa(0.06) == pytest.approx(0.70, rel=1e-12)
    assert design.sa(3.0) == pytest.approx(0.20, rel=1e-12)
    assert design.sa(10.0) == pytest.approx(0.048, rel=1e-12)


def test_code_spectrum_branches_mce_level():
    # ASCE/SEI 7-16 §11.4.6 [derived]: at MCE_R, Sa(0) = 0.4 S_MS, plateau S_MS,
    # S_M1/T on the velocity branch, S_M1 T_L / T^2 beyond T_L.
    mce = CodeSpectrum(1.5, 0.9, long_period=4.0)
    values = mce.sa(np.array([0.0, 0.12, 0.3, 0.6, 2.0, 4.0, 6.0]))
    expected = [0.6, 1.5, 1.5, 1.5, 0.45, 0.225, 0.9 * 4.0 / 36.0]
    np.testing.assert_allclose(values, expected, rtol=1e-12)


def test_code_spectrum_from_design_values_round_trip():
    # ASCE/SEI 7-16 §11.4.5: S_DS = 2/3 S_MS, so S_MS = 1.5 S_DS.
    spectrum = CodeSpectrum.from_design_values(1.0, 0.6)
    assert spectrum.sms == pytest.approx(1.5)
    assert spectrum.sm1 == pytest.approx(0.9)


def test_sd_gives_reference_displacement():
    # [derived] ASCE/SEI 7-16 Eq. 17.5-1 with Table 17.5-1: S_M1 0.9, T 3 s, beta 20 % (B_M 1.5)
    # -> D = g 0.9/3/1.5 * 9/(4 pi^2) = 0.4471 m.
    spectrum = CodeSpectrum(1.5, 0.9)
    assert spectrum.sa(3.0, 0.20) == pytest.approx(0.200, rel=1e-12)
    assert spectrum.sd(3.0, 0.20) == pytest.approx(0.4471, abs=5e-5)


# --- damping coefficient ------------------------------------------------------

@pytest.mark.parametrize(
    "beta, expected",
    # ASCE/SEI 7-16 Table 17.5-1 rows, and its clamping beyond the table ends.
    [(0.0, 0.8), (0.02, 0.8), (0.05, 1.0), (0.10, 1.2), (0.20, 1.5), (0.30, 1.7),
     (0.40, 1.9), (0.50, 2.0), (0.80, 2.0)],
)
def test_asce7_table_rows(beta, expected):
    assert damping_coefficient(beta, "asce7") == pytest.approx(expected, rel=1e-12)


def test_asce7_linear_interpolation_derived():
    # [derived] from ASCE/SEI 7-16 Table 17.5-1 with linear interpolation.
    np.testing.assert_allclose(damping_coefficient([0.08, 0.15, 0.25]), [1.12, 1.35, 1.60], rtol=1e-12)


def test_eurocode_eta():
    # EN 1998-1 §3.2.2.2 eta = sqrt(10/(5 + xi)) >= 0.55 [derived arithmetic]:
    # xi 5 % -> 1; 10 % -> sqrt(2/3); 30 % -> sqrt(10/35) = 0.5345 -> floor 0.55.
    assert eurocode_eta(0.05) == pytest.approx(1.0)
    assert eurocode_eta(0.10) == pytest.approx(math.sqrt(2.0 / 3.0))
    assert eurocode_eta(0.30) == pytest.approx(0.55)
    assert damping_coefficient(0.10, "eurocode") == pytest.approx(1.0 / math.sqrt(2.0 / 3.0))


def test_aashto_rule():
    # AASHTO Guide Spec. for Seismic Isolation Design: B_L = (beta/0.05)^0.3 <= 1.7
    # [derived]: 20 % -> 4^0.3 = 1.5157; 40 % -> 8^0.3 = 1.866 -> capped 1.7.
    assert damping_coefficient(0.20, "aashto") == pytest.approx(4.0**0.3)
    assert damping_coefficient(0.40, "aashto") == pytest.approx(1.7)
    assert damping_coefficient(0.05, "aashto") == pytest.approx(1.0)
    # Below 2 % the formula is held at (0.02/0.05)^0.3 = 0.7597 (common practice floor).
    assert damping_coefficient(0.0, "aashto") == pytest.approx(0.4**0.3)


@settings(max_examples=50, deadline=None)
@given(low=st.floats(0.001, 0.99), high=st.floats(0.001, 0.99), rule=st.sampled_from(["asce7", "eurocode", "aashto"]))
def test_damping_coefficient_monotonic(low, high, rule):
    # Property [common practice]: more damping never raises the spectral ordinate.
    low, high = sorted((low, high))
    assert damping_coefficient(low, rule) <= damping_coefficient(high, rule) + 1e-12


# --- EN 1998-1 elastic spectrum ----------------------------------------------

@pytest.mark.parametrize(
    "spectrum_type, ground, parameters",
    # EN 1998-1:2004 Table 3.2 (Type 1) and Table 3.3 (Type 2), recommended values.
    [(1, "A", (1.0, 0.15, 0.4, 2.0)), (1, "B", (1.2, 0.15, 0.5, 2.0)), (1, "C", (1.15, 0.20, 0.6, 2.0)),
     (1, "D", (1.35, 0.20, 0.8, 2.0)), (1, "E", (1.4, 0.15, 0.5, 2.0)),
     (2, "A", (1.0, 0.05, 0.25, 1.2)), (2, "B", (1.35, 0.05, 0.25, 1.2)), (2, "C", (1.5, 0.10, 0.25, 1.2)),
     (2, "D", (1.8, 0.10, 0.30, 1.2)), (2, "E", (1.6, 0.05, 0.25, 1.2))],
)
def test_eurocode_table_values_and_plateau(spectrum_type, ground, parameters):
    spectrum = EurocodeSpectrum(0.2, ground=ground, spectrum_type=spectrum_type)
    assert spectrum.parameters == pytest.approx(parameters)
    soil, tb, tc, td = parameters
    # EN 1998-1 §3.2.2.2 (3.2)-(3.5) at 5 %: Se(0) = a_g S, plateau 2.5 a_g S,
    # 2.5 a_g S T_C/T, 2.5 a_g S T_C T_D/T^2.
    assert spectrum.sa(0.0) == pytest.approx(0.2 * soil)
    assert spectrum.sa((tb + tc) / 2) == pytest.approx(2.5 * 0.2 * soil)
    assert spectrum.sa((tc + td) / 2) == pytest.approx(2.5 * 0.2 * soil * tc / ((tc + td) / 2))
    assert spectrum.sa(3.5) == pytest.approx(2.5 * 0.2 * soil * tc * td / 3.5**2)


def test_eurocode_worked_values_derived():
    # [derived] EN 1998-1 §3.2.2.2, a_gR 0.25 g, gamma_I 1.2 -> a_g 0.30 g, ground C type 1:
    # plateau 2.5*0.30*1.15 = 0.8625 g; T = 3 s: 0.8625*0.6*2/9 = 0.115 g;
    # at 20 % damping eta = sqrt(10/25) = 0.6325 -> 0.115*0.6325 = 0.07273 g;
    # at T = 0.1 s, 20 %: 0.345 (1 + 0.5 (2.5*0.6325 - 1)) = 0.4504 g.
    spectrum = EurocodeSpectrum(0.25, "C", 1, importance=1.2)
    assert spectrum.sa(0.4) == pytest.approx(0.8625)
    assert spectrum.sa(3.0) == pytest.approx(0.115)
    assert spectrum.sa(3.0, 0.20) == pytest.approx(0.115 * math.sqrt(0.4))
    assert spectrum.sa(0.1, 0.20) == pytest.approx(0.345 * (1 + 0.5 * (2.5 * math.sqrt(0.4) - 1)))


def test_eurocode_refuses_beyond_four_seconds():
    # EN 1998-1 §3.2.2.2 defines the elastic spectrum to 4 s (Annex A beyond): by default the
    # spectrum refuses 4.5 s, naming the period, the allowed range and how to extend it.
    spectrum = EurocodeSpectrum(0.2)
    assert spectrum.period_range == (0.0, 4.0)
    with pytest.raises(ValueError, match=r"period = 4\.5 is not allowed: must lie in \[0, 4\].*max_period"):
        spectrum.sa(4.5)
    with pytest.raises(ValueError, match=r"period = 4\.5 is not allowed: must lie in \[0, 4\]"):
        spectrum.sd([1.0, 4.5])


@pytest.mark.parametrize("ground, kind", [("A", 1), ("C", 1), ("D", 1), ("B", 2), ("E", 2)])
def test_eurocode_extended_branch_is_inverse_square(ground, kind):
    # EN 1998-1 §3.2.2.2 Eq. (3.5), Se = 2.5 a_g S eta T_C T_D/T^2, continued past 4 s:
    # closed form of the 1/T^2 law, Se(T) = Se(4 s) (4/T)^2, at 5 % and at 20 % damping.
    spectrum = EurocodeSpectrum(0.25, ground, kind, max_period=8.0)
    soil, _, tc, td = spectrum.parameters
    periods = np.array([4.5, 5.0, 6.0, 7.3, 8.0])
    for damping in (0.05, 0.20):
        at_four = spectrum.sa(4.0, damping)
        np.testing.assert_allclose(spectrum.sa(periods, damping), at_four * (4.0 / periods) ** 2, rtol=1e-12)
    eta = math.sqrt(10.0 / 25.0)  # EN 1998-1 Eq. (3.6) at xi = 20 % [derived]
    np.testing.assert_allclose(spectrum.sa(periods, 0.20), 2.5 * 0.25 * soil * eta * tc * td / periods**2, rtol=1e-12)
    # Below 4 s nothing changes against the default spectrum (same formula, same range start).
    short = np.array([0.1, 0.5, 1.5, 3.0, 4.0])
    np.testing.assert_allclose(spectrum.sa(short), EurocodeSpectrum(0.25, ground, kind).sa(short), rtol=0)


def test_eurocode_extended_branch_constant_displacement_derived():
    # [derived] Sd = g Se T^2/(4 pi^2) with Se = 2.5 a_g S eta T_C T_D/T^2 (EN 1998-1 Eq. 3.5)
    # -> Sd = 2.5 g a_g S eta T_C T_D/(4 pi^2), the same from T_D to max_period.
    # a_g 0.30 g, ground C type 1 (S 1.15, T_C 0.6, T_D 2.0): 2.5*0.30*1.15*0.6*2.0 = 1.035;
    # 1.035 * 9.80665/39.4784 = 0.25710 m at 5 %; at 20 % times eta = sqrt(0.4) = 0.63246 -> 0.16260 m.
    spectrum = EurocodeSpectrum(0.30, "C", 1, max_period=10.0)
    periods = np.array([2.0, 3.0, 4.0, 4.1, 6.0, 8.5, 10.0])
    np.testing.assert_allclose(spectrum.sd(periods), 0.25710, atol=5e-5)
    np.testing.assert_allclose(spectrum.sd(periods, 0.20), 0.16260, atol=5e-5)
    assert np.ptp(spectrum.sd(periods)) < 1e-12


def test_eurocode_extended_refuses_beyond_max_period():
    # The extension stops at the chosen max_period, with the range in the message.
    with pytest.raises(ValueError, match=r"period = 6\.5 is not allowed: must lie in \[0, 6\]"):
        EurocodeSpectrum(0.2, max_period=6.0).sa(6.5)
    assert EurocodeSpectrum(0.2, max_period=6.0).period_range == (0.0, 6.0)


def test_eurocode_max_period_is_keyword_only():
    # Keyword-only so that a sixth positional value cannot be read as a period by mistake.
    with pytest.raises(TypeError, match="positional argument"):
        EurocodeSpectrum(0.2, "C", 1, 1.0, "eurocode", 6.0)


def test_eurocode_old_dict_without_max_period_loads_at_four_seconds():
    # A stored to_dict() from before max_period existed rebuilds the EN 1998-1 range [0, 4] s.
    spectrum = spectrum_from_dict({"kind": "eurocode", "ag": 0.2, "ground": "B", "spectrum_type": 1,
                                   "importance": 1.0, "rule": "eurocode"})
    assert spectrum.max_period == 4.0 and spectrum.period_range == (0.0, 4.0)


# --- tabulated spectrum -------------------------------------------------------

def test_tabulated_log_log_reproduces_power_law():
    # Closed form: a power law Sa = a T^-n is a straight line in log-log, so
    # interpolation between two table points returns it exactly.
    table = TabulatedSpectrum([1.0, 4.0], [0.6, 0.6 / 16.0])
    for period in (1.5, 2.0, 3.3):
        assert table.sa(period) == pytest.approx(0.6 / period**2, rel=1e-12)


def test_tabulated_matches_code_spectrum_on_power_branches():
    # ASCE/SEI 7-16 §11.4.6: the 1/T and 1/T^2 branches are power laws, so a table
    # sampled at the branch ends reproduces the code spectrum in between (closed form).
    code = CodeSpectrum(1.5, 0.9, long_period=4.0)
    periods = [0.6, 4.0, 8.0]
    table = TabulatedSpectrum(periods, code.sa(periods))
    probe = np.array([0.7, 1.3, 2.9, 5.0, 7.1])
    np.testing.assert_allclose(table.sa(probe), code.sa(probe), rtol=1e-12)
    # Other damping through the same rule: Table 17.5-1, 20 % -> B 1.5.
    np.testing.assert_allclose(table.sa(probe, 0.20), code.sa(probe) / 1.5, rtol=1e-12)


def test_tabulated_at_other_table_damping():
    # ASCE/SEI 7-16 Table 17.5-1: a table given at 10 % (B 1.2) read at 20 % (B 1.5)
    # scales by 1.2/1.5 = 0.8 [derived].
    table = TabulatedSpectrum([0.5, 3.0], [1.0, 0.3], damping=0.10)
    assert table.sa(3.0, 0.20) == pytest.approx(0.3 * 0.8)
    assert table.sa(3.0, 0.10) == pytest.approx(0.3)


def test_tabulated_zero_period_segment_is_linear():
    # Common practice: a table may start at T = 0 (PGA); that first segment is linear.
    table = TabulatedSpectrum([0.0, 0.2, 1.0], [0.4, 1.0, 0.5])
    assert table.sa(0.1) == pytest.approx(0.7)


@pytest.mark.parametrize("period", [0.05, 4.5])
def test_tabulated_refuses_outside_range(period):
    table = TabulatedSpectrum([0.1, 4.0], [1.0, 0.1])
    with pytest.raises(ValueError, match=r"period = .* must lie in \[0.1, 4\]"):
        table.sa(period)


# --- interface, serialisation -------------------------------------------------

@pytest.mark.parametrize(
    "spectrum",
    [CodeSpectrum(1.2, 0.6), CodeSpectrum(1.2, 0.6).design(), EurocodeSpectrum(0.3, "B", 2, 1.4),
     EurocodeSpectrum(0.3, "D", 1, 1.2, max_period=7.5),
     TabulatedSpectrum([0.1, 1.0, 5.0], [1.0, 0.8, 0.1], damping=0.05, rule="aashto")],
)
def test_to_dict_json_round_trip(spectrum):
    data = json.loads(json.dumps(spectrum.to_dict()))
    rebuilt = spectrum_from_dict(data)
    assert rebuilt == spectrum
    assert rebuilt.period_range == spectrum.period_range
    assert rebuilt.sa(0.5, 0.15) == pytest.approx(spectrum.sa(0.5, 0.15))


def test_sd_is_pseudo_displacement_of_sa():
    # Definition Sd = Sa g T^2/(4 pi^2) (Chopra, Dynamics of Structures, pseudo-spectra).
    spectrum = EurocodeSpectrum(0.3, "D")
    t = np.array([0.5, 1.0, 2.5])
    np.testing.assert_allclose(spectrum.sd(t, 0.1), spectrum.sa(t, 0.1) * G * t**2 / (4 * math.pi**2))


@settings(max_examples=50, deadline=None)
@given(
    sms=st.floats(0.05, 3.0), ratio=st.floats(0.05, 1.5), long_period=st.floats(4.0, 16.0),
    period=st.floats(0.0, 10.0), damping=st.floats(0.0, 0.6),
)
def test_code_spectrum_finite_and_positive(sms, ratio, long_period, period, damping):
    # Property [common practice]: valid input gives a finite, positive ordinate no
    # larger than the plateau S_MS / B.
    spectrum = CodeSpectrum(sms, sms * ratio, long_period)
    value = spectrum.sa(period, damping)
    assert np.isfinite(value) and value > 0.0
    assert value <= sms / damping_coefficient(damping) * (1 + 1e-12)


@settings(max_examples=50, deadline=None)
@given(t1=st.floats(0.6, 10.0), t2=st.floats(0.6, 10.0), ground=st.sampled_from(list("ABCDE")),
       kind=st.sampled_from([1, 2]))
def test_eurocode_falls_beyond_plateau(t1, t2, ground, kind):
    # Property of EN 1998-1 §3.2.2.2: beyond T_C the ordinate never increases (also across
    # 4 s into the extended 1/T^2 branch).
    spectrum = EurocodeSpectrum(0.2, ground, kind, max_period=10.0)
    t1, t2 = sorted((t1, t2))
    if t1 >= spectrum.parameters[2]:
        assert spectrum.sa(t2) <= spectrum.sa(t1) + 1e-12


# --- bad input: ValueError naming the field -----------------------------------

@pytest.mark.parametrize(
    "build, field",
    [
        (lambda: CodeSpectrum(-1.0, 0.5), "sms"),
        (lambda: CodeSpectrum(1.0, float("nan")), "sm1"),
        (lambda: CodeSpectrum(1.0, 0.5, long_period=0.2), "long_period"),
        (lambda: CodeSpectrum(1.0, 0.5, level="service"), "level"),
        (lambda: CodeSpectrum(1.0, 0.5).sa(-0.1), "period"),
        (lambda: CodeSpectrum(1.0, 0.5).sa(12.0), "period"),
        (lambda: CodeSpectrum(1.0, 0.5).sa(1.0, damping=1.5), "damping"),
        (lambda: CodeSpectrum(1.0, 0.5).sa([1.0, float("nan")]), "period"),
        (lambda: EurocodeSpectrum(0.0), "ag"),
        (lambda: EurocodeSpectrum(0.2, ground="F"), "ground"),
        (lambda: EurocodeSpectrum(0.2, spectrum_type=3), "spectrum_type"),
        (lambda: EurocodeSpectrum(0.2, importance=-1.0), "importance"),
        (lambda: EurocodeSpectrum(0.2, max_period=3.9), r"max_period = 3\.9 is not allowed: .*\[4, 10\]"),
        (lambda: EurocodeSpectrum(0.2, max_period=10.5), r"max_period = 10\.5 is not allowed: .*\[4, 10\]"),
        (lambda: EurocodeSpectrum(0.2, max_period=float("nan")), r"max_period = nan is not allowed"),
        (lambda: EurocodeSpectrum(0.2, max_period="6 s"), r"max_period = '6 s' is not allowed"),
        (lambda: spectrum_from_dict({"kind": "eurocode", "ag": 0.2, "max_period": 12.0}), r"max_period = 12\.0"),
        (lambda: TabulatedSpectrum([1.0, 0.5], [1.0, 0.5]), "periods"),
        (lambda: TabulatedSpectrum([0.5, 1.0], [1.0, -0.5]), "values"),
        (lambda: TabulatedSpectrum([0.5, 1.0], [1.0]), "values"),
        (lambda: TabulatedSpectrum([0.5, 1.0], [1.0, 0.5], damping=0.0), "damping"),
        (lambda: TabulatedSpectrum([0.5, 1.0], [1.0, 0.5], rule="other"), "rule"),
        (lambda: damping_coefficient(-0.01), "damping"),
        (lambda: damping_coefficient(0.05, "nonsense"), "rule"),
        (lambda: spectrum_from_dict({"kind": "code", "sms": 1.0, "sm1": 0.5, "extra": 1}), "extra"),
        (lambda: spectrum_from_dict({"kind": "wavy"}), "kind"),
    ],
)
def test_bad_input_names_field(build, field):
    with pytest.raises(ValueError, match=field):
        build()
