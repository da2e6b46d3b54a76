"""Storey strengths of the code design, code drift checks and damage-state medians.

Sources
-------
- ASCE/SEI 7-16 §11.4.5 (S_DS = 2/3 S_MS, S_D1 = 2/3 S_M1), §12.8.1.1 Eqs. 12.8-2 to 12.8-5 (C_s),
  §12.8.3 (C_vx = w_x h_x^k / sum w_i h_i^k, k = 1 up to 0.5 s, 2 from 2.5 s, linear between),
  §12.8.6 (Delta = C_d delta_xe / I_e), Eq. 12.8-16 (theta = P_x Delta I_e/(V_x h_sx C_d)),
  Table 12.12-1 (allowable storey drift, "all other structures": 0.020/0.015/0.010 h_sx for risk
  categories I-II/III/IV), Table 12.2-1 (special steel moment frame R = 8, Omega_0 = 3, C_d = 5.5):
  from memory.
- EN 1998-1:2004 §3.2.2.5 Eq. 3.15 (S_d = a_g S 2.5/q T_C/T for T_C <= T <= T_D, >= 0.2 a_g),
  Table 3.2 (type 1, ground B: S = 1.2, T_B = 0.15 s, T_C = 0.5 s, T_D = 2.0 s), §4.3.3.2.2 Eq. 4.5
  (F_b = S_d(T_1) m lambda, lambda = 0.85 when T_1 <= 2 T_C and more than two storeys),
  §4.3.3.2.3 Eq. 4.11 (F_i = F_b z_i m_i / sum z_j m_j), §4.4.3.2 (nu d_r <= 0.005 h, nu = 0.5),
  §4.3.4 (d_s = q_d d_e), Eq. 4.28 (theta = P_tot d_r/(V_tot h)): from memory.
- FEMA multi-hazard loss estimation methodology, earthquake model technical manual (MR5), Ch. 5:
  drift at damage-state thresholds (C1M high code 0.0033/0.0067/0.020/0.0533), non-structural drift
  0.004/0.008/0.025/0.050, floor acceleration 0.30/0.60/1.20/2.40 g (high code): from memory.
- Values marked "hand arithmetic" are derived from these formulas, not validation.
"""

import math

import numpy as np
import pytest

from isolation.dynamics.structure import ShearBuilding
from isolation.performance.damage import STATES, building_type, damage_state, damage_thresholds
from isolation.performance.strength import (
    allowable_drift,
    asce7_distribution,
    code_drift_check,
    eurocode_distribution,
    fixed_base_design,
    isolated_design,
    system_factors,
)
from isolation.site.spectra import CodeSpectrum, EurocodeSpectrum

G = 9.80665


def test_asce7_distribution_exponent_and_shares():
    w, h = [1000.0, 1000.0, 800.0], [4.0, 8.0, 12.0]
    # k = 1 at T <= 0.5 s: C_vx = w_x h_x / sum (ASCE/SEI 7-16 §12.8.3)
    expected = np.array([4000.0, 8000.0, 9600.0]) / 21600.0
    assert asce7_distribution(w, h, 0.4) == pytest.approx(expected)
    # k = 2 at T >= 2.5 s; k = 1.5 at T = 1.5 s (linear between)
    sq = np.array([1000 * 16, 1000 * 64, 800 * 144.0])
    assert asce7_distribution(w, h, 3.0) == pytest.approx(sq / sq.sum())
    k15 = np.array(w) * np.array(h) ** 1.5
    assert asce7_distribution(w, h, 1.5) == pytest.approx(k15 / k15.sum())


def test_eurocode_distribution_is_mass_times_height():
    # EN 1998-1 Eq. 4.11 with linear mode shape: F_i proportional to z_i m_i
    assert eurocode_distribution([2.0, 1.0], [3.0, 6.0]) == pytest.approx([0.5, 0.5])


def test_system_factors_from_the_tables_and_given_values():
    steel = system_factors("steel_moment_frame", 8.0, "asce7")
    assert (steel.overstrength, steel.deflection_amplification) == (3.0, 5.5)  # Table 12.2-1, special SMF
    assert "Table 12.2-1" in steel.source
    braced = system_factors("braced_frame", 8.0, "asce7")
    assert (braced.overstrength, braced.deflection_amplification) == (2.0, 4.0)  # steel EBF
    ec = system_factors("concrete_moment_frame", 3.9, "eurocode")
    assert ec.overstrength == 1.3  # EN 1998-1 §5.2.2.2(5) alpha_u/alpha_1, multi-storey multi-bay frame
    assert ec.deflection_amplification == 3.9  # q_d = q (§4.3.4)
    given = system_factors("other", 5.0, "asce7", overstrength=2.0, deflection_amplification=4.5)
    assert (given.overstrength, given.deflection_amplification) == (2.0, 4.5)
    assert "given in the study" in given.source
    with pytest.raises(ValueError, match="overstrength"):
        system_factors("other", 5.0, overstrength=0.5)
    with pytest.raises(ValueError, match="lateral_system"):
        system_factors("timber", 5.0)


def _five_storeys():
    masses = [500.0] * 4 + [400.0]
    heights = [4.0] * 5
    return masses, heights, ShearBuilding.from_period(1.0, masses, heights, profile="linear")


def test_fixed_base_design_asce7_by_hand():
    masses, heights, _ = _five_storeys()
    weights = [m * G for m in masses]
    spectrum = CodeSpectrum(1.5, 0.9)  # S_DS = 1.0 g, S_D1 = 0.6 g (2/3 of MCE_R)
    factors = system_factors("steel_moment_frame", 8.0)
    design = fixed_base_design(spectrum, weights, heights, 8.0, factors, period=1.0, importance=1.0,
                               frame="steel_moment")
    # T = 1.0 s is below C_u T_a = 1.4 x 0.0724 x 20^0.8 = 1.114 s (Table 12.8-1/12.8-2), so it stands.
    # C_s = min(S_DS/R, S_D1/(T R)) = min(0.125, 0.075) = 0.075 >= 0.044 S_DS (hand arithmetic).
    w = sum(weights)
    assert design.period == pytest.approx(1.0)
    assert design.coefficient == pytest.approx(0.075)
    assert design.base_shear == pytest.approx(0.075 * w)
    share = np.array(weights) * np.cumsum(heights) ** 1.25  # k = 1 + (1.0 - 0.5)/2 = 1.25
    forces = 0.075 * w * share / share.sum()
    assert design.forces == pytest.approx(forces)
    assert design.storey_shears[0] == pytest.approx(0.075 * w)
    assert design.storey_shears[-1] == pytest.approx(forces[-1])
    assert design.yield_shears == pytest.approx(3.0 * np.cumsum(forces[::-1])[::-1])  # Omega_0 = 3


def test_fixed_base_design_eurocode_by_hand():
    masses, heights, _ = _five_storeys()
    weights = [m * G for m in masses]
    spectrum = EurocodeSpectrum(0.3, ground="B", spectrum_type=1)
    factors = system_factors("concrete_moment_frame", 3.9, "eurocode")
    design = fixed_base_design(spectrum, weights, heights, 3.9, factors, basis="eurocode", period=1.0)
    sd = 0.3 * 1.2 * 2.5 / 3.9 * 0.5 / 1.0  # Eq. 3.15, ground B type 1
    base = sd * sum(weights) * 0.85  # lambda = 0.85: T_1 = 1.0 <= 2 T_C and 5 storeys
    assert design.base_shear == pytest.approx(base)
    z = np.cumsum(heights)
    assert design.forces == pytest.approx(base * np.array(masses) * z / np.dot(masses, z))
    assert design.yield_shears[0] == pytest.approx(1.3 * base)


def test_isolated_design_spreads_v_s_and_applies_overstrength():
    class Report:  # the two fields isolated_design reads from a code report
        storey_forces = tuple(type("F", (), {"force": f})() for f in (100.0, 200.0, 300.0))

        @staticmethod
        def value(symbol):
            assert symbol == "V_s"
            return 600.0

    factors = system_factors("steel_moment_frame", 8.0)
    asce = isolated_design(Report, [1000.0, 1000.0, 1000.0], factors)
    assert asce.storey_shears == pytest.approx([600.0, 500.0, 300.0])
    assert asce.yield_shears == pytest.approx([1800.0, 1500.0, 900.0])
    # Eurocode: V_s over all the weight W (base slab 1000 kN included), floors' share above each storey.
    ec = isolated_design(Report, [1000.0, 1000.0, 1000.0], factors, basis="eurocode", total_weight=4000.0)
    assert ec.storey_shears == pytest.approx([450.0, 300.0, 150.0])


def test_given_storey_strengths_replace_the_design():
    masses, heights, _ = _five_storeys()
    design = fixed_base_design(CodeSpectrum(1.5, 0.9), [m * G for m in masses], heights, 8.0,
                               system_factors("steel_moment_frame", 8.0), period=1.0)
    given = design.with_yield_shears([5000.0, 4000.0, 3000.0, 2000.0, 1000.0])
    assert given.yield_shears == (5000.0, 4000.0, 3000.0, 2000.0, 1000.0) and given.given
    with pytest.raises(ValueError, match="storey_strengths"):
        design.with_yield_shears([1000.0, 1000.0])
    with pytest.raises(ValueError, match="storey_strengths"):
        design.with_yield_shears([1000.0, -1.0, 1.0, 1.0, 1.0])


def test_allowable_drift_by_risk_category_and_eurocode_nu():
    assert allowable_drift("asce7", 1.0)[:2] == (0.020, 1.0)  # Table 12.12-1, risk category I/II
    assert allowable_drift("asce7", 1.25)[0] == 0.015  # III
    assert allowable_drift("asce7", 1.5)[0] == 0.010  # IV
    assert allowable_drift("eurocode", 1.0)[:2] == (0.005, 0.5)  # §4.4.3.2(1)a, nu = 0.5
    assert allowable_drift("eurocode", 1.2)[1] == 0.4  # importance class III


def test_code_drift_check_asce7_and_eurocode_by_hand():
    building = ShearBuilding([100.0, 80.0], [50000.0, 40000.0], [4.0, 3.5])

    class Design:
        storey_shears = (600.0, 300.0)

    asce = code_drift_check(building, Design, system_factors("steel_moment_frame", 8.0), importance=1.25)
    delta = np.array([600.0 / 50000.0, 300.0 / 40000.0])  # delta_xe = V_x/k_x (shear building)
    assert asce.elastic_drifts == pytest.approx(delta)
    assert asce.design_drift_ratios == pytest.approx(5.5 * delta / 1.25 / np.array([4.0, 3.5]))
    assert asce.limit == 0.015
    # theta = P_x Delta I_e / (V_x h_sx C_d) with Delta = C_d delta_xe / I_e (Eq. 12.8-16)
    p = np.array([180.0, 80.0]) * G
    assert asce.stability == pytest.approx(p * delta / (np.array([600.0, 300.0]) * np.array([4.0, 3.5])))
    assert asce.stability_limit == pytest.approx(min(0.5 / 5.5, 0.25))
    assert asce.passed == bool(np.all(5.5 * delta / 1.25 / np.array([4.0, 3.5]) <= 0.015))
    ec = code_drift_check(building, Design, system_factors("steel_moment_frame", 4.0, "eurocode"),
                          basis="eurocode")
    assert ec.design_drift_ratios == pytest.approx(0.5 * 4.0 * delta / np.array([4.0, 3.5]))  # nu q d_e / h
    assert ec.limit == 0.005 and ec.stability_limit == 0.1


def test_damage_thresholds_and_states():
    assert building_type("concrete_moment_frame", 5) == "C1M"
    assert building_type("steel_moment_frame", 2) == "S1L"
    assert building_type("other", 12) == "C2H"
    t = damage_thresholds("concrete_moment_frame", 5)
    assert t.structural_drift == pytest.approx((0.0033, 0.0067, 0.020, 0.0533))
    assert t.nonstructural_drift == (0.004, 0.008, 0.025, 0.050)
    assert t.floor_acceleration == (0.30, 0.60, 1.20, 2.40)
    assert damage_thresholds("other", 2, "moderate").floor_acceleration == (0.25, 0.50, 1.00, 2.00)
    assert damage_state(0.001, t.structural_drift) == "none"
    assert damage_state(0.0033, t.structural_drift) == "slight"  # at the median: reached
    assert damage_state(0.01, t.structural_drift) == "moderate"
    assert damage_state(0.5, t.floor_acceleration) == "slight"
    assert damage_state(3.0, t.floor_acceleration) == STATES[-1]
    with pytest.raises(ValueError, match="design_level"):
        damage_thresholds("other", 3, "low")
    with pytest.raises(ValueError, match="storeys"):
        building_type("other", 0)
    with pytest.raises(ValueError, match="medians"):
        damage_state(0.1, (0.3, 0.2, 0.4, 0.5))
    assert math.isfinite(t.structural_drift[-1])
