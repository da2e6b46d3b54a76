"""Code-procedure details an engineer checks by hand (issue: numbers an engineer can check).

Each check names its source beside it. "from memory" marks clauses that were not
re-read (the clause text was not found through the search tool this session);
"[derived]" means hand arithmetic from the published formula; "common practice"
has no single source.
"""

import math
from pathlib import Path

import numpy as np
import pytest

from isolation.bearings import Bilinear
from isolation.codes.asce7 import ElfBuilding, activation_force, asce7_elf
from isolation.codes.asce7_fixed_base import approximate_period
from isolation.codes.eurocode import EurocodeBuilding, eurocode_approximate_period, eurocode_simplified
from isolation.design.overturning import asce7_vertical_fraction, bearing_uplift, eurocode_vertical_fraction, grid_rows
from isolation.site.spectra import CodeSpectrum, EurocodeSpectrum
from isolation.study import StudyError, apply_overrides, parse_study, read_study_mapping
from isolation.study.assembly import fixed_base_period
from isolation.verdict.sources import drift_limit, eurocode_reduction_factor
from tools import LinearSystem

G = 9.80665
DEMO = Path(__file__).resolve().parents[2] / "examples" / "demo_study.toml"


def stiffness_for_period(weight, period):
    # T = 2 pi sqrt(W/(k g)) (ASCE/SEI 7-16 Eq. 17.5-2) solved for k.
    return 4 * math.pi**2 * weight / (G * period**2)


def building(**changes):
    # W_s = 8000 kN above a 2000 kN base level: W = 10000 kN.
    data = dict(base_weight=2000.0, floor_weights=(3000.0, 3000.0, 2000.0), floor_elevations=(4.0, 8.0, 12.0),
                plan_length=40.0, plan_width=20.0, response_modification=8.0, fixed_base_period=0.5,
                wind_base_shear=500.0, s1=0.5, site_class="D")
    data.update(changes)
    return ElfBuilding(**data)


def sets(lower=(3.0, 0.20), upper=(3.0, 0.20), weight=10000.0):
    return {"lower": LinearSystem(stiffness_for_period(weight, lower[0]), lower[1]),
            "upper": LinearSystem(stiffness_for_period(weight, upper[0]), upper[1])}


SPECTRUM = CodeSpectrum(1.5, 0.9)   # S_DS 1.0, S_D1 0.6, T_S 0.6 s, T_L 8 s (ASCE/SEI 7-16 §11.4.5)


# --- importance factor of an isolated structure ----------------------------------------------------

def test_isolated_design_takes_importance_one():
    # ASCE/SEI 7-16 §17.2.1 (from memory): I_e = 1.0 for the isolated structure. V_s lower limit of
    # §17.5.4.3 item 1 [derived]: §12.8 with R_I = 2 at T_M = 3 s: C_s = S_D1/(T R_I/I_e) = 0.6/(3*2)
    # = 0.1 -> 0.1 W_s = 800 kN, whatever the building's own I_e (1.5 would give 1200 kN and govern).
    essential = asce7_elf(sets(), building(importance=1.5), SPECTRUM)
    assert essential.value("V_s,min,fixed") == pytest.approx(800.0, rel=1e-9)
    # V_s = V_st/R_I = 2000 (0.8)^0.5/2 = 894.43 kN governs (ASCE/SEI 7-16 §17.5.4.2).
    assert essential.value("V_s") == pytest.approx(1000.0 * 0.8**0.5, rel=1e-9)
    # The fixed-base comparison keeps the building's I_e (§12.8.1.1 Eq. 12.8-2) [derived]:
    # C_s = S_DS/(R/I_e) = 1.0/(8/1.5) = 0.1875 (Eq. 12.8-3 cap 0.6/(0.5*8/1.5) = 0.225 not reached).
    assert essential.value("V_fb") == pytest.approx(0.1875 * 8000.0, rel=1e-9)


def test_drift_estimate_does_not_divide_by_the_building_importance():
    # ASCE/SEI 7-16 §17.5.6 with C_d = R_I and I_e = 1.0 (§17.2.1), from memory; generalised SDOF
    # (Chopra, Dynamics of Structures, generalised single-degree-of-freedom systems) [derived]:
    # one level, phi = 1: u = V_s/(omega^2 W_s/g), drift = R_I u = 2 u.
    one = building(floor_weights=(8000.0,), floor_elevations=(4.0,), importance=1.5)
    report = asce7_elf(sets(), one, SPECTRUM)
    u = report.value("V_s") / ((2 * math.pi / 0.5) ** 2 * 8000.0 / G)
    assert report.storey_forces[0].drift == pytest.approx(2.0 * u, rel=1e-9)


# --- activation force, ASCE/SEI 7-16 §17.5.4.3 item 3 ---------------------------------------------

def bilinear_set(qd, kd=2000.0, ratio=50.0):
    return Bilinear(ratio * kd, kd, qd)


@pytest.mark.parametrize("q_nominal, q_upper, expected", [
    # Bilinear yield force F_y = K_u Q_d/(K_u - K_d) (Naeim & Kelly 1999, bilinear model) = Q_d 50/49 here.
    (400.0, 520.0, 1.5 * 400.0 * 50 / 49),   # 1.5 x nominal (600) > upper (520)
    (400.0, 700.0, 700.0 * 50 / 49),         # upper (700) > 1.5 x nominal (600)
])
def test_activation_force_is_the_greater_of_upper_and_one_and_a_half_nominal(q_nominal, q_upper, expected):
    # ASCE/SEI 7-16 §17.5.4.3 item 3 (from memory; 7-22 same, from memory): V_b set to the force that
    # fully activates the system with the greater of the upper-bound and 1.5 x nominal properties.
    property_sets = {"lower": bilinear_set(0.8 * q_nominal), "nominal": bilinear_set(q_nominal),
                     "upper": bilinear_set(q_upper)}
    force, note = activation_force(property_sets)
    assert force == pytest.approx(expected, rel=1e-12)
    assert ("1.5 x nominal" in note) is (1.5 * q_nominal >= q_upper)


def test_activation_limit_passes_through_the_vst_form():
    # §17.5.4.3 item 3 [derived]: V_s,min = F_act (W_s/W)^(1 - 2.5 beta_M) with beta_M of the
    # force-governing set, not divided by R_I and not multiplied by a further 1.5.
    property_sets = {"lower": bilinear_set(300.0), "nominal": bilinear_set(400.0), "upper": bilinear_set(480.0)}
    report = asce7_elf(property_sets, building(wind_base_shear=0.0), SPECTRUM)
    beta = report.bounds.force.damping
    f_act = 600.0 * 50 / 49
    assert report.value("V_s,min,activation") == pytest.approx(f_act * 0.8 ** (1 - 2.5 * beta), rel=1e-9)
    assert report.value("V_s,min,activation") < 1.5 * 480.0 * 50 / 49   # the earlier reading, well above


# --- lower and upper bound kept apart -------------------------------------------------------------

def test_displacement_from_lower_and_forces_from_upper_bound():
    # Two different sets [derived], ASCE/SEI 7-16 §17.2.8.5 (bounds, from memory): lower T 3.0 s,
    # beta 20 % (B_M 1.5), upper T 2.5 s, beta 15 % (B_M 1.35, Table 17.5-1 by interpolation).
    # D_M = g S_M1 T/(4 pi^2 B_M) from the lower set = 0.4471 m; V_b = W S_M1/(T B_M) from the upper
    # set = 10000*0.36/1.35 = 2666.67 kN; V_st with the upper beta: 2666.67 (0.8)^(1 - 2.5*0.15).
    report = asce7_elf(sets(lower=(3.0, 0.20), upper=(2.5, 0.15)), building(), SPECTRUM)
    assert report.value("D_M") == pytest.approx(G * 0.9 * 3.0 / (4 * math.pi**2 * 1.5), rel=1e-6)
    assert report.value("T_M") == pytest.approx(3.0, rel=1e-9)
    assert report.value("V_b") == pytest.approx(10000.0 * 0.36 / 1.35, rel=1e-6)
    assert report.value("V_st") == pytest.approx(10000.0 * 0.36 / 1.35 * 0.8 ** (1 - 2.5 * 0.15), rel=1e-6)
    assert report.bounds.displacement_governs == "lower" and report.bounds.force_governs == "upper"


def test_sliding_exponent_uses_three_and_a_half_beta():
    # ASCE/SEI 7-16 §17.5.4.2 (from memory): 1 - 3.5 beta_M for an abruptly initiated transition to
    # sliding [derived]: 2000 (0.8)^(1 - 0.7) and the source says so.
    report = asce7_elf(sets(), building(isolator_kind="sliding"), SPECTRUM)
    assert report.value("V_st") == pytest.approx(2000.0 * 0.8**0.3, rel=1e-9)
    source = [i.source for i in report.quantities if i.symbol == "V_st"][0]
    assert "1 - 3.5 beta_M" in source and "abruptly" in source


def test_s1_no_longer_bars_the_elf_procedure():
    # ASCE/SEI 7-16 §17.4.1 (from memory): the S_1 >= 0.6 g limit of 7-10 is not in the 7-16 list.
    report = asce7_elf(sets(), building(s1=0.75), SPECTRUM)
    assert report.elf_permitted and not any("S_1" in c.name for c in report.applicability)


# --- Eurocode shears on the weight above the isolation plane ---------------------------------------

def test_eurocode_shears_use_the_weight_above_the_isolation_plane():
    # EN 1998-1 §3.2.2.2 [derived], ground C type 1 (S 1.15, T_C 0.6 s, T_D 2.0 s), a_g 0.3 g, T_eff 2.0 s,
    # xi 20 % (eta = sqrt(10/25)): Se = 2.5*0.3*1.15*sqrt(0.4)*0.6/2.0 = 0.163654 g.
    # V = K_eff d_dc = W Se = 1636.54 kN for W = 10000 kN (§10.9.2, from memory).
    se = 2.5 * 0.3 * 1.15 * math.sqrt(0.4) * 0.6 / 2.0
    ec = EurocodeBuilding(10000.0, 0.4, 30.0, 20.0, storeys=3, behaviour_factor=3.9, superstructure_weight=7000.0)
    report = eurocode_simplified(sets(lower=(2.0, 0.2), upper=(2.0, 0.2)), ec, EurocodeSpectrum(0.3, "C"))
    assert report.value("V") == pytest.approx(10000.0 * se, rel=1e-5)
    # V_s = V W_s/W / q = 1636.54*0.7/1.0 (§10.10(5), from memory; the base level's inertia goes to the bearings).
    assert report.value("V_s") == pytest.approx(7000.0 * se, rel=1e-5)
    # F_b = S_d(T_1) W_s lambda = 0.3*1.15*2.5/3.9 * 7000 * 0.85 (Eq. 4.5, §3.2.2.5; T_1 0.4 s <= 2 T_C, 3 storeys).
    assert report.value("F_b") == pytest.approx(0.3 * 1.15 * 2.5 / 3.9 * 7000.0 * 0.85, rel=1e-9)
    assert report.value("V_s/F_b") == pytest.approx(7000.0 * se / (0.3 * 1.15 * 2.5 / 3.9 * 7000.0 * 0.85), rel=1e-5)


def test_eurocode_superstructure_weight_range():
    with pytest.raises(ValueError, match="superstructure_weight"):
        EurocodeBuilding(10000.0, 0.4, 30.0, 20.0, superstructure_weight=12000.0)


def test_eurocode_equivalent_linear_failures_say_response_history():
    # EN 1998-1 §10.9.1(5) (from memory): xi_eff > 30 % excludes the equivalent-linear model altogether.
    ec = EurocodeBuilding(10000.0, 0.4, 30.0, 20.0)
    report = eurocode_simplified(sets(lower=(2.0, 0.35), upper=(2.0, 0.35)), ec, EurocodeSpectrum(0.3, "C"))
    damping = [w for w in report.warnings if "xi_eff" in w]
    assert len(damping) == 1 and "response-history analysis is required" in damping[0]
    assert "multimodal" not in damping[0]


# --- per-bearing uplift ---------------------------------------------------------------------------

def test_grid_rows():
    # Nearly square bays: round(sqrt(n a/b)) within [2, n] (common practice layout).
    assert grid_rows(16, 20.0, 20.0) == 4
    assert grid_rows(18, 20.0, 40.0) == 3
    assert grid_rows(2, 20.0, 40.0) == 2
    assert grid_rows(4, 1.0, 100.0) == 2     # a long thin plan still has two rows across
    assert grid_rows(3, 100.0, 1.0) == 3     # never more rows than bearings
    with pytest.raises(ValueError, match="count"):
        grid_rows(1, 20.0, 20.0)


def test_bearing_uplift_by_hand():
    # Rigid-body statics [derived]: 16 bearings on a 4 x 4 grid over 20 m x 20 m, rows at -10, -10/3,
    # 10/3, 10 m: sum x^2 = 4 (2*100 + 2*100/9) = 888.9 m^2; M = 1000 kN x 10 m; dP = M 10/888.9 = 112.5 kN.
    # Lightest group 600 kN; ASCE 7: (0.9 - 0.2 S_MS) D with S_MS 1.5 -> 0.6*600 = 360 kN (from memory).
    factor, vertical, _ = asce7_vertical_fraction(1.5)
    assert (factor, vertical) == (0.9, pytest.approx(0.3))
    result = bearing_uplift(1000.0, 10.0, [(12, 1000.0), (4, 600.0)], 20.0, 20.0,
                            gravity_factor=factor, vertical_fraction=vertical)
    assert result.overturning_load == pytest.approx(112.5, rel=1e-12)
    assert result.net_gravity == pytest.approx(360.0, rel=1e-12)
    assert result.ratio == pytest.approx(112.5 / 360.0, rel=1e-12)
    assert not result.in_tension and result.minimum_axial_load == pytest.approx(247.5)


def test_bearing_uplift_takes_the_worse_direction_and_finds_tension():
    # 18 bearings on 40 m x 20 m [derived]: across the width 3 rows of 6 at -10, 0, 10 m: sum x^2 = 1200,
    # dP = M 10/1200 = M/120; along the length 6 rows of 3 at +-4, +-12, +-20 m: sum = 3360, dP = M 20/3360
    # = M/168. The width governs: M = 36000 kN m -> 300 kN against 250 kN of gravity -> tension.
    result = bearing_uplift(3600.0, 10.0, [(18, 250.0)], 40.0, 20.0)
    assert result.overturning_load == pytest.approx(300.0, rel=1e-12)
    assert result.rows == 3 and result.edge_distance == 10.0
    assert result.in_tension and result.ratio == pytest.approx(1.2)


def test_eurocode_vertical_component_only_above_a_quarter_g():
    # EN 1998-1 Table 3.4 (a_vg/a_g 0.90 type 1, 0.45 type 2) and §4.3.3.5.2 (a_vg > 0.25 g; 0.3 of the
    # vertical plateau 3.0 a_vg), from memory [derived]: a_g 0.25 g type 1 -> a_vg 0.225 g: none;
    # a_g 0.4 g type 1 -> a_vg 0.36 g: 0.3*3.0*0.36 = 0.324.
    assert eurocode_vertical_fraction(0.25, 1)[:2] == (1.0, 0.0)
    assert eurocode_vertical_fraction(0.4, 1)[1] == pytest.approx(0.324)
    assert eurocode_vertical_fraction(0.4, 2)[1] == 0.0   # a_vg = 0.18 g
    assert eurocode_vertical_fraction(0.4)[1] == pytest.approx(0.324)   # Type 1 unless told
    # a_g 0.625 g, type 2: a_vg = 0.45*0.625 = 0.28125 g > 0.25 g -> 0.3*3.0*0.28125 = 0.253125.
    factor, vertical, _ = eurocode_vertical_fraction(0.625, 2)
    assert factor == 1.0 and vertical == pytest.approx(0.253125, rel=1e-12)


# --- fixed-base period coefficients by the tables' rows -------------------------------------------

@pytest.mark.parametrize("system, asce_ct, asce_x, ec8_ct", [
    # ASCE/SEI 7-16 Table 12.8-2 in SI (C_t in ft units 0.028, 0.016, 0.03, 0.03, 0.02; from memory) and
    # EN 1998-1:2004 §4.3.3.2.2(3) Eq. 4.6 (from memory).
    ("steel_moment_frame", 0.0724, 0.8, 0.085),
    ("concrete_moment_frame", 0.0466, 0.9, 0.075),
    ("steel_eccentrically_braced_frame", 0.0731, 0.75, 0.075),
    ("steel_buckling_restrained_braced_frame", 0.0731, 0.75, 0.050),   # EN 1998-1: "all other structures"
    ("concentrically_braced_frame", 0.0488, 0.75, 0.050),              # both: all other systems
    ("shear_wall", 0.0488, 0.75, 0.050),
    ("other", 0.0488, 0.75, 0.050),
])
def test_fixed_base_period_follows_the_table_row(system, asce_ct, asce_x, ec8_ct):
    mapping = apply_overrides(read_study_mapping(DEMO), {"building.lateral_system": system})
    study = parse_study(mapping, source=str(DEMO))
    height = 16.5   # demo storeys 4.5 + 3 x 4.0 m
    period, source = fixed_base_period(study)
    assert period == pytest.approx(asce_ct * height**asce_x, rel=1e-12)
    assert "Table 12.8-2" in source
    ec = apply_overrides(mapping, {"code.basis": "eurocode", "building.importance": 1.0})
    site = ec["site"]
    for key in ("sms", "sm1", "long_period", "s1", "site_class"):
        del site[key]
    site.update(ag=0.3, ground_type="B", spectrum_type=1)
    period, source = fixed_base_period(parse_study(ec, source=str(DEMO)))
    assert period == pytest.approx(ec8_ct * height**0.75, rel=1e-12)
    assert "§4.3.3.2.2(3)" in source


def test_retired_braced_frame_choice_is_a_clear_error():
    mapping = apply_overrides(read_study_mapping(DEMO), {"building.lateral_system": "braced_frame"})
    with pytest.raises(StudyError, match=r"building\.lateral_system = 'braced_frame' is no longer accepted: "
                                         r".*concentrically_braced_frame"):
        parse_study(mapping, source=str(DEMO))


def test_frame_type_keys_keep_their_meaning():
    # Public names keep their meaning: "braced" stays the eccentric/buckling-restrained row.
    assert approximate_period(20.0, "braced") == pytest.approx(0.0731 * 20.0**0.75)
    assert approximate_period(20.0, "eccentric_braced") == approximate_period(20.0, "braced")
    assert eurocode_approximate_period(20.0, "braced") == pytest.approx(0.075 * 20.0**0.75)
    assert eurocode_approximate_period(20.0, "buckling_restrained_braced") == pytest.approx(0.050 * 20.0**0.75)


# --- Eurocode drift limit by non-structural type and nu -------------------------------------------

@pytest.mark.parametrize("kind, importance, expected", [
    # EN 1998-1 §4.4.3.2 (from memory): d_r nu <= alpha h, alpha 0.005/0.0075/0.010; nu 0.5 (classes I-II),
    # 0.4 (III-IV) -> limit alpha/nu.
    ("brittle", 1.0, 0.010), ("ductile", 1.0, 0.015), ("none", 1.0, 0.020),
    ("brittle", 1.4, 0.0125), ("none", 1.2, 0.025), ("ductile", 0.8, 0.015),
])
def test_eurocode_drift_limit(kind, importance, expected):
    limit, source = drift_limit("eurocode", kind, importance)
    assert limit == pytest.approx(expected, rel=1e-12)
    assert "§4.4.3.2" in source and kind in source


def test_drift_limit_defaults_and_errors():
    assert drift_limit("asce7", "brittle", 1.4)[0] == 0.020   # ASCE 7: §17.6.4.4 whatever the kind
    assert drift_limit("eurocode")[0] == 0.020                # earlier default kept without a kind
    assert eurocode_reduction_factor(1.0) == 0.5 and eurocode_reduction_factor(1.2) == 0.4
    with pytest.raises(ValueError, match="nonstructural"):
        drift_limit("eurocode", "glass", 1.0)


def test_study_nonstructural_key():
    mapping = apply_overrides(read_study_mapping(DEMO), {"building.nonstructural": "ductile"})
    assert parse_study(mapping, source=str(DEMO)).building.nonstructural == "ductile"
    assert parse_study(read_study_mapping(DEMO), source=str(DEMO)).building.nonstructural == "brittle"
    bad = apply_overrides(read_study_mapping(DEMO), {"building.nonstructural": "glass"})
    with pytest.raises(StudyError, match=r"building\.nonstructural = 'glass' is not allowed"):
        parse_study(bad, source=str(DEMO))


def test_study_fault_distance_key():
    mapping = apply_overrides(read_study_mapping(DEMO), {"site.fault_distance": 8.0})
    assert parse_study(mapping, source=str(DEMO)).site.fault_distance == 8.0
    bad = apply_overrides(read_study_mapping(DEMO), {"site.fault_distance": -1.0})
    with pytest.raises(StudyError, match=r"site\.fault_distance = -1\.0 is not allowed"):
        parse_study(bad, source=str(DEMO))


def test_bearing_uplift_edges():
    # Statics [derived]: net gravity exactly equal to the overturning change is zero load, not tension.
    exact = bearing_uplift(1000.0, 10.0, [(16, 112.5)], 20.0, 20.0)
    assert exact.ratio == pytest.approx(1.0) and not exact.in_tension
    assert exact.moment == 10000.0 and exact.tributary_load == 112.5 and exact.rows == 4
    # Half a kN of compression left is still compression.
    near = bearing_uplift(1000.0, 10.0, [(16, 113.0)], 20.0, 20.0)
    assert near.minimum_axial_load == pytest.approx(0.5) and not near.in_tension
    # Vertical earthquake taking all the gravity: no net gravity, any overturning is tension.
    none_left = bearing_uplift(1000.0, 10.0, [(16, 500.0)], 20.0, 20.0, gravity_factor=0.9, vertical_fraction=0.9)
    assert none_left.ratio == math.inf and none_left.in_tension
    small = bearing_uplift(1000.0, 10.0, [(16, 500.0)], 20.0, 20.0, gravity_factor=1.0, vertical_fraction=0.999)
    assert small.ratio == pytest.approx(112.5 / 0.5, rel=1e-9)
    # Two bearings are the least that can carry a moment; the default source is the derivation.
    two = bearing_uplift(100.0, 5.0, [(2, 400.0)], 10.0, 10.0)
    assert two.rows == 2 and two.overturning_load == pytest.approx(500.0 * 5.0 / (2 * 25.0))
    assert "derived" in two.source
    assert bearing_uplift(100.0, 5.0, [(2, 400.0)], 10.0, 10.0, source="given").source == "given"
    data = two.to_dict()
    assert data["overturning_load"] == two.overturning_load and data["in_tension"] is False
    with pytest.raises(ValueError, match=r"bearings = .* must hold at least 2 bearings"):
        bearing_uplift(100.0, 5.0, [(1, 400.0)], 10.0, 10.0)
    with pytest.raises(ValueError, match=r"bearings = \[\] is not allowed"):
        bearing_uplift(100.0, 5.0, [], 10.0, 10.0)


def test_vertical_fraction_sources():
    factor, vertical, source = eurocode_vertical_fraction(0.4, 1)
    assert factor == 1.0 and "§4.3.3.5.2" in source and "0.36 g" in source
    assert "§4.3.3.5.2(1)" in eurocode_vertical_fraction(0.1, 1)[2]
    assert "§17.2.4.6" in asce7_vertical_fraction(1.0)[2] and "0.2 S_MS" in asce7_vertical_fraction(1.0)[2]


@pytest.mark.parametrize("call, words", [
    # Brief rule: bad input names the field, the value and what is allowed, with its unit.
    (lambda: bearing_uplift(-1.0, 5.0, [(4, 1.0)], 10.0, 10.0), r"shear = -1\.0 is not allowed: .* \[kN\]"),
    (lambda: bearing_uplift(1.0, -5.0, [(4, 1.0)], 10.0, 10.0), r"height = -5\.0 is not allowed: .* \[m\]"),
    (lambda: bearing_uplift(1.0, 5.0, [(4, 0.0)], 10.0, 10.0), r"axial_load = 0\.0 is not allowed: .* \[kN\]"),
    (lambda: bearing_uplift(1.0, 5.0, [(4, 1.0)], 0.0, 10.0), r"plan_length = 0\.0 is not allowed: .* \[m\]"),
    (lambda: bearing_uplift(1.0, 5.0, [(4, 1.0)], 10.0, -1.0), r"plan_width = -1\.0 is not allowed: .* \[m\]"),
    (lambda: bearing_uplift(1.0, 5.0, [(4, 1.0)], 10.0, 10.0, gravity_factor=0.0),
     r"gravity_factor = 0\.0 is not allowed: .* \[-\]"),
    (lambda: bearing_uplift(1.0, 5.0, [(4, 1.0)], 10.0, 10.0, vertical_fraction=-0.1),
     r"vertical_fraction = -0\.1 is not allowed: .* \[-\]"),
    (lambda: grid_rows(4, 0.0, 10.0), r"across = 0\.0 is not allowed: .* \[m\]"),
    (lambda: grid_rows(4, 10.0, -2.0), r"along = -2\.0 is not allowed: .* \[m\]"),
    (lambda: asce7_vertical_fraction(-0.5), r"sms = -0\.5 is not allowed: .* \[g\]"),
    (lambda: eurocode_vertical_fraction(-0.5), r"ag = -0\.5 is not allowed: .* \[g\]"),
    (lambda: eurocode_vertical_fraction(0.3, 3), r"spectrum_type = 3 is not allowed"),
])
def test_overturning_bad_input_names_field_value_and_unit(call, words):
    with pytest.raises(ValueError, match=words):
        call()


# --- the demo's verdicts follow from their own numbers ----------------------------------------------

# Level a finding must have given its value and limit, from the cited sources (not the code's
# constants): D_TM within the bearing capacity (ASCE/SEI 7-16 §17.2.4.5, from memory); moat >= D_TM
# (§17.2.6, from memory); drift within 2 % at MCE_R (§17.6.4.4, from memory); tension in a bearing is
# a condition (statics); beta_M above 30 % a note (§17.4.1, from memory); V_s above V_fb a condition,
# base shear and floor acceleration reductions 0.7 / 0.6 (common practice).
EXPECTED_LEVEL = {
    "displacement capacity": lambda r: "against" if r.value > r.limit else "ok",
    "moat": lambda r: "condition" if r.value < r.limit else "ok",
    "drift": lambda r: "condition" if r.value > 0.020 else "ok",
    "uplift": lambda r: "condition" if r.value > 1.0 else "ok",
    "effective damping": lambda r: "note" if r.value > 0.30 else "ok",
    "design shear": lambda r: "condition" if r.value > 1.0 else "ok",
    "base shear": lambda r: "against" if r.value >= 1.0 else "condition" if r.value >= 0.7 else "ok",
    "floor acceleration": lambda r: "against" if r.value >= 1.0 else "condition" if r.value >= 0.6 else "ok",
    "period shift": lambda r: "note",
}


@pytest.fixture(scope="module")
def demo_results():
    from isolation.study import load_study
    from isolation.study.runner import run_study

    return run_study(load_study(DEMO), quick=True)


def test_demo_verdicts_follow_from_their_numbers(demo_results):
    from isolation.verdict import CONDITIONAL, FEASIBLE, NOT_RECOMMENDED, Reason

    for result in demo_results.alternatives:
        reasons = [Reason(**r) for r in result.verdict["reasons"]]
        topics = {r.topic for r in reasons}
        assert set(EXPECTED_LEVEL) - {"moat"} <= topics, result.name
        for reason in reasons:
            if reason.topic in EXPECTED_LEVEL:
                assert reason.level == EXPECTED_LEVEL[reason.topic](reason), (result.name, reason)
        levels = {r.level for r in reasons}
        expected = (NOT_RECOMMENDED if "against" in levels else CONDITIONAL if "condition" in levels else FEASIBLE)
        assert result.outcome == expected
        # The isolated-period finding states its bound; the period ratio states where T_fb comes from.
        period = [r for r in reasons if r.topic == "isolated period"][0]
        assert "nominal properties" in period.message
        ratio = [r for r in reasons if r.topic == "period shift"][0]
        assert "Eq. 12.8-7" in ratio.message and "C_u T_a" in ratio.message


def test_demo_uplift_is_checked_per_bearing(demo_results):
    # The figure behind the uplift finding is the outermost bearing's ratio (overturning change over
    # tributary net gravity), from V_st of the force-governing set (ASCE/SEI 7-16 §17.5.4.2).
    for result in demo_results.alternatives:
        figures = result.figures
        assert 0.0 < figures["uplift_ratio"] < 10.0
        uplift = [r for r in result.verdict["reasons"] if r["topic"] == "uplift"][0]
        assert uplift["value"] == figures["uplift_ratio"] and "outermost bearing" in uplift["message"]


# --- ASCE 7 ELF details: torsion with P_T, applicability boundaries -------------------------------

@pytest.mark.parametrize("p_t, factor", [
    # ASCE/SEI 7-16 Eq. 17.5-3 [derived]: e = 2.0 m, y = 20 m, b = 40, d = 20 m:
    # 1 + (y/P_T^2) 12 e/(b^2 + d^2) = 1 + 20*24/(2000 P_T^2); P_T taken <= 1.0 (from memory).
    (0.8, 1 + 20 * 24 / (2000 * 0.64)), (1.0, 1.24), (1.3, 1.24),
])
def test_total_displacement_with_the_torsion_period_ratio(p_t, factor):
    report = asce7_elf(sets(), building(torsion_period_ratio=p_t), SPECTRUM)
    assert report.value("D_TM") == pytest.approx(factor * report.value("D_M"), rel=1e-12)


def test_total_displacement_with_given_eccentricity_and_corner():
    # e = 1.0 + 0.05*40 = 3.0 m, y = 15 m [derived]: 1 + 15*12*3/2000 = 1.27 (Eq. 17.5-3).
    report = asce7_elf(sets(), building(eccentricity=1.0, corner_distance=15.0), SPECTRUM)
    assert report.value("e") == pytest.approx(3.0)
    assert report.value("D_TM") == pytest.approx(1.27 * report.value("D_M"), rel=1e-12)
    # Default corner: y = b/2 + e_actual = 21 m -> 1 + 21*12*3/2000 = 1.378.
    default = asce7_elf(sets(), building(eccentricity=1.0), SPECTRUM)
    assert default.value("D_TM") == pytest.approx(1.378 * default.value("D_M"), rel=1e-12)
    assert default.value("moat") == pytest.approx(1.378 * default.value("D_M") + 0.05, rel=1e-12)


def test_response_modification_bounds_of_r_i():
    # ASCE/SEI 7-16 §17.5.4.2: R_I = 3/8 R within [1.0, 2.0] [derived]: R 4 -> 1.5.
    assert asce7_elf(sets(), building(response_modification=4.0), SPECTRUM).value("R_I") == pytest.approx(1.5)


@pytest.mark.parametrize("changes, name, passed", [
    # ASCE/SEI 7-16 §17.4.1 (from memory): at most 4 storeys and 19.8 m (65 ft); T_M <= 5 s;
    # beta_M <= 30 %; T_M > 3 T.
    (dict(floor_weights=(2000.0,) * 4, floor_elevations=(4.0, 8.0, 12.0, 16.0)), "storeys", True),
    (dict(height=19.8), "height", True),
    (dict(height=19.9), "height", False),
    (dict(fixed_base_period=1.0), "3 T_fb", False),      # T_M 3.0 s is not more than 3 x 1.0 s
    (dict(fixed_base_period=0.99), "3 T_fb", True),
])
def test_elf_applicability_boundaries(changes, name, passed):
    report = asce7_elf(sets(), building(**changes), SPECTRUM)
    check = [c for c in report.applicability if name in c.name][0]
    assert check.passed is passed
    assert report.elf_permitted is passed


@pytest.mark.parametrize("damping, period, passed", [(0.30, 3.0, True), (0.31, 3.0, False),
                                                     (0.2, 5.0, True), (0.2, 5.05, False)])
def test_elf_damping_and_period_boundaries(damping, period, passed):
    # ASCE/SEI 7-16 §17.4.1 (from memory): beta_M <= 30 %, T_M <= 5.0 s.
    spectrum = CodeSpectrum(1.5, 0.9, max_period=10.0)
    report = asce7_elf(sets(lower=(period, damping), upper=(period, damping)), building(), spectrum)
    assert report.elf_permitted is passed
    failed = [c.name for c in report.applicability if not c.passed]
    assert (failed == []) is passed


def test_stiffness_ratio_and_drift_limits():
    # ASCE/SEI 7-16 §17.4.1 item 7a (from memory): k_eff(D_M) > k_eff(0.2 D_M)/3; a linear system
    # has ratio 1. §17.5.6 (from memory): drift 0.015 h_sx: a flexible superstructure (T_fb 3 s on
    # one 4 m storey) exceeds it and the report warns.
    report = asce7_elf(sets(), building(), SPECTRUM)
    ratio = [c for c in report.applicability if "0.2 D_M" in c.name]
    assert ratio and all(c.value == pytest.approx(1.0) and c.limit == pytest.approx(1 / 3) for c in ratio)
    soft = asce7_elf(sets(), building(floor_weights=(8000.0,), floor_elevations=(4.0,), fixed_base_period=0.9),
                     SPECTRUM)
    drift = soft.checks[0]
    # [derived] generalised SDOF: u = V_s/(omega^2 W_s/g), drift = R_I u, ratio = drift/4 m.
    u = soft.value("V_s") / ((2 * math.pi / 0.9) ** 2 * 8000.0 / G)
    assert drift.value == pytest.approx(2.0 * u / 4.0, rel=1e-9) and drift.limit == 0.015
    assert drift.passed is (2.0 * u / 4.0 <= 0.015)
    assert any("drift" in w for w in soft.warnings) is (not drift.passed)


# --- EN 1998-1 details: design spectrum branches, lambda, applicability limits ---------------------

@pytest.mark.parametrize("period, expected", [
    # EN 1998-1:2004 §3.2.2.5 Eqs. 3.13-3.16 [derived], ground C type 1 (S 1.15, T_B 0.2, T_C 0.6,
    # T_D 2.0 s, Table 3.2), a_g 0.3 g, q 3.0, beta 0.2.
    (0.0, 0.3 * 1.15 * 2 / 3),
    (0.1, 0.3 * 1.15 * (2 / 3 + 0.1 / 0.2 * (2.5 / 3.0 - 2 / 3))),
    (0.2, 0.3 * 1.15 * 2.5 / 3.0),
    (1.0, 0.3 * 1.15 * 2.5 / 3.0 * 0.6 / 1.0),
    (4.0, 0.2 * 0.3),                              # lower bound beta a_g governs
])
def test_eurocode_design_spectrum_branches(period, expected):
    from isolation.codes.eurocode import eurocode_design_spectrum
    assert eurocode_design_spectrum(EurocodeSpectrum(0.3, "C"), period, 3.0) == pytest.approx(expected, rel=1e-12)


def test_eurocode_design_spectrum_beyond_t_d():
    # Eq. 3.16 [derived] with q 1.5 so that the 1/T^2 branch stays above beta a_g = 0.06 g:
    # 0.3*1.15*2.5/1.5 * 0.6*2.0/3^2 = 0.076667 g.
    from isolation.codes.eurocode import eurocode_design_spectrum
    value = eurocode_design_spectrum(EurocodeSpectrum(0.3, "C"), 3.0, 1.5)
    assert value == pytest.approx(0.3 * 1.15 * 2.5 / 1.5 * 0.6 * 2.0 / 9.0, rel=1e-12)


def test_eurocode_lambda_cases():
    # EN 1998-1 §4.3.3.2.2(1) Eq. 4.5 (from memory): lambda 0.85 only when T_1 <= 2 T_C and more than
    # two storeys, else 1.0 [derived]: ground C, T_C 0.6 s.
    from isolation.codes.eurocode import eurocode_fixed_base_shear
    spectrum = EurocodeSpectrum(0.3, "C")
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 3.0, 1.2, 3)[1] == 0.85
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 3.0, 1.21, 3)[1] == 1.0
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 3.0, 0.5, 2)[1] == 1.0
    f_b = eurocode_fixed_base_shear(spectrum, 1000.0, 3.0, 1.5, 5)[0]
    assert f_b == pytest.approx(1000.0 * 0.3 * 1.15 * 2.5 / 3.0 * 0.6 / 1.5, rel=1e-12)


def ec_report(period=2.0, damping=0.2, **changes):
    data = dict(weight=10000.0, superstructure_period=0.4, plan_length=30.0, plan_width=20.0, storeys=3)
    data.update(changes)
    return eurocode_simplified(sets(lower=(period, damping), upper=(period, damping)), EurocodeBuilding(**data),
                               EurocodeSpectrum(0.3, "C", max_period=10.0))


@pytest.mark.parametrize("changes, period, words, passed", [
    # EN 1998-1 §10.9.2 (from memory): T_eff <= 3 s, >= 3 T_f; plan <= 50 m; regular; > 15 km from an
    # active fault; K_v/K_eff >= 150.
    (dict(), 3.0, "longest effective period", True),
    (dict(), 3.05, "longest effective period", False),
    (dict(superstructure_period=2.0 / 3.0), 2.0, "T_f", True),
    (dict(superstructure_period=0.67), 2.0, "T_f", False),
    (dict(plan_length=50.0), 2.0, "plan dimension", True),
    (dict(plan_length=50.5), 2.0, "plan dimension", False),
    (dict(regular=False), 2.0, "regular", False),
    (dict(fault_distance=15.0), 2.0, "fault", False),
    (dict(fault_distance=15.5), 2.0, "fault", True),
    (dict(vertical_stiffness_ratio=150.0), 2.0, "vertical", True),
    (dict(vertical_stiffness_ratio=149.0), 2.0, "vertical", False),
])
def test_eurocode_applicability_boundaries(changes, period, words, passed):
    report = ec_report(period, **changes)
    check = [c for c in report.applicability if words in c.name][0]
    assert check.passed is passed
    assert report.simplified_permitted is passed
    if not passed:
        assert any(words in w and "multimodal or response-history" in w for w in report.warnings)


def test_eurocode_corner_distance_and_amplification():
    # EN 1998-1 §10.9.3 (from memory) [derived]: e_tot = 0.5 + 0.05*30 = 2.0 m, y = 12 m,
    # r^2 = (900 + 400)/12 = 108.33 m^2, delta = 1 + 2*12/108.33 = 1.22154; gamma_x 1.3 given.
    report = ec_report(eccentricity=0.5, corner_distance=12.0, displacement_amplification=1.3)
    delta = 1 + 2.0 * 12.0 / (1300.0 / 12.0)
    assert report.value("e_tot") == pytest.approx(2.0)
    assert report.value("delta") == pytest.approx(delta, rel=1e-12)
    assert report.value("d_d") == pytest.approx(1.3 * delta * report.value("d_dc"), rel=1e-12)
    # Default y = L/2 + e = 15.5 m.
    default = ec_report(eccentricity=0.5)
    assert default.value("delta") == pytest.approx(1 + 2.0 * 15.5 / (1300.0 / 12.0), rel=1e-12)


def test_eurocode_isolated_behaviour_factor_divides_the_shear():
    # EN 1998-1 §10.10(5) (from memory): V_s = V (W_s/W)/q with q <= 1.5 [derived].
    base = ec_report()
    reduced = ec_report(isolated_behaviour_factor=1.5)
    assert reduced.value("V_s") == pytest.approx(base.value("V_s") / 1.5, rel=1e-12)
    # No fixed-base comparison when T_f exceeds the 4 s of the design spectrum.
    assert all(i.symbol != "F_b" for i in ec_report(superstructure_period=4.5, period=3.0).quantities)


# --- ASCE 7 §12.8 fixed-base details ---------------------------------------------------------------

@pytest.mark.parametrize("sd1, cu", [
    # ASCE/SEI 7-16 Table 12.8-1 (from memory): S_D1 >= 0.4 -> 1.4, 0.3 -> 1.4, 0.2 -> 1.5, 0.15 -> 1.6,
    # <= 0.1 -> 1.7; linear interpolation between rows.
    (0.05, 1.7), (0.1, 1.7), (0.125, 1.65), (0.15, 1.6), (0.2, 1.5), (0.25, 1.45), (0.3, 1.4), (0.6, 1.4),
])
def test_period_upper_limit_factor_table(sd1, cu):
    from isolation.codes.asce7_fixed_base import period_upper_limit_factor
    assert period_upper_limit_factor(sd1) == pytest.approx(cu, rel=1e-12)


def test_design_values_from_a_tabulated_spectrum():
    # ASCE/SEI 7-16 §21.4 (from memory): S_DS = 0.9 max Sa over 0.2-5 s and S_D1 = max T Sa over
    # 1-5 s, at 2/3 of MCE_R. A table of the two-period spectrum S_MS 1.5, S_M1 0.9 (T_S 0.6 s) gives
    # S_DS = 0.9*2/3*1.5 = 0.9 g and S_D1 = 2/3*0.9 = 0.6 g (T Sa constant on the 1/T branch) [derived].
    from isolation.codes.asce7_fixed_base import design_values
    from isolation.site.spectra import TabulatedSpectrum
    periods = (0.01, 0.12, 0.6, 1.0, 2.0, 5.0, 6.0)
    values = (0.6, 1.5, 1.5, 0.9, 0.45, 0.18, 0.15)
    sds, sd1, tl, note = design_values(TabulatedSpectrum(periods, values))
    assert sds == pytest.approx(0.9, rel=1e-9) and sd1 == pytest.approx(0.6, rel=1e-9)
    assert tl == 6.0 and "§21.4" in note
    code = design_values(SPECTRUM)
    assert code[:3] == (pytest.approx(1.0), pytest.approx(0.6), 8.0) and "§11.4.5" in code[3]


def test_response_coefficient_importance_and_floors():
    from isolation.codes.asce7_fixed_base import response_coefficient
    # ASCE/SEI 7-16 Eqs. 12.8-2, -5, -6 [derived] with S_DS 1.0, S_D1 0.6, I_e 1.5:
    # T 0.5 s, R 8: C_s = 1.0/(8/1.5) = 0.1875 (Eq. 12.8-3 cap 0.6/(0.5*8/1.5) = 0.225).
    assert response_coefficient(1.0, 0.6, 0.5, 8.0, 1.5)[0] == pytest.approx(0.1875)
    # Floor 0.044 S_DS I_e = 0.066 at T 4 s, R 8 (12.8-3 gives 0.6/(4*8/1.5) = 0.028125).
    cs, governs = response_coefficient(1.0, 0.6, 4.0, 8.0, 1.5)
    assert cs == pytest.approx(0.066) and "12.8-5" in governs
    # Absolute floor 0.01 when 0.044 S_DS I_e is smaller: S_DS 0.2 -> 0.0088 < 0.01.
    assert response_coefficient(0.2, 0.1, 4.0, 8.0, 1.0)[0] == pytest.approx(0.01)
    # Eq. 12.8-6 only from S_1 = 0.6 g: 0.5*0.6/(8/1.5) = 0.05625 < 0.066 floor here; with R 4:
    # 0.5*0.6/(4/1.5) = 0.1125 over 12.8-3 0.6/(4*4/1.5) = 0.05625 and the floor 0.066.
    cs, governs = response_coefficient(1.0, 0.6, 4.0, 4.0, 1.5, s1=0.6)
    assert cs == pytest.approx(0.1125) and "12.8-6" in governs
    assert response_coefficient(1.0, 0.6, 4.0, 4.0, 1.5, s1=0.59)[0] == pytest.approx(0.066)
    # Beyond T_L (Eq. 12.8-4): T 10 s, T_L 8 s, R 1, I_e 1: 0.6*8/100 = 0.048.
    cs, governs = response_coefficient(1.0, 0.6, 10.0, 1.0, 1.0, 8.0)
    assert cs == pytest.approx(0.048) and "12.8-4" in governs


def test_fixed_base_shear_period_sources():
    from isolation.codes.asce7_fixed_base import fixed_base_shear
    given = fixed_base_shear(SPECTRUM, 1000.0, 8.0, period=0.3, height=12.0, frame="concrete_moment")
    assert given.period == 0.3 and given.period_source == "given"
    assert given.approximate_period == pytest.approx(0.0466 * 12.0**0.9)   # Table 12.8-2
    estimate = fixed_base_shear(SPECTRUM, 1000.0, 8.0, height=12.0, frame="steel_moment")
    assert estimate.period == pytest.approx(0.0724 * 12.0**0.8) and "Eq. 12.8-7" in estimate.period_source
    bare = fixed_base_shear(SPECTRUM, 1000.0, 8.0, period=0.3)
    assert bare.approximate_period is None and bare.period == 0.3
    # V = C_s W with C_s = S_DS/(R/I_e) = 1/8 at 0.3 s (plateau).
    assert bare.base_shear == pytest.approx(125.0) and bare.weight == 1000.0
    assert (bare.sds, bare.sd1) == (pytest.approx(1.0), pytest.approx(0.6))


def test_every_elf_item_by_hand():
    # The linear test case [derived]: W 10000 kN, T 3 s, beta 20 % (B_M 1.5, ASCE/SEI 7-16 Table
    # 17.5-1), S_M1 0.9: k_M = 4 pi^2 W/(g T^2); D_M = g 0.9*3/(4 pi^2 1.5); torsion factor 1.24.
    report = asce7_elf(sets(), building(), SPECTRUM)
    k = stiffness_for_period(10000.0, 3.0)
    d_m = G * 0.9 * 3.0 / (4 * math.pi**2 * 1.5)
    expected = {
        "D_M": d_m, "T_M": 3.0, "beta_M": 0.2, "B_M": 1.5, "k_M": k, "e": 2.0, "D_TM": 1.24 * d_m,
        "moat": 1.24 * d_m + 0.05, "V_b": 2000.0, "V_st": 2000.0 * 0.8**0.5, "R_I": 2.0,
        "V_s,min,fixed": 800.0, "V_s,min,wind": 500.0, "V_s": 1000.0 * 0.8**0.5, "T_fb": 0.5, "k": 1.4,
        "F_1": (2000.0 - 2000.0 * 0.8**0.5) / 2.0,
        # §12.8 fixed base [derived]: C_s = S_DS/(R/I_e) = 1/8 at T 0.5 s (12.8-3: 0.6/(0.5*8) = 0.15).
        "V_fb": 8000.0 / 8.0, "V_s/V_fb": 1000.0 * 0.8**0.5 / 1000.0,
    }
    for symbol, value in expected.items():
        assert report.value(symbol) == pytest.approx(value, rel=1e-6), symbol
    units = {i.symbol: i.unit for i in report.quantities}
    assert units["D_M"] == "m" and units["V_s"] == "kN" and units["k_M"] == "kN/m" and units["T_M"] == "s"
    sources = {i.symbol: i.source for i in report.quantities}
    assert "Table 17.5-1" in sources["B_M"] and "Eq. 17.5-1" in sources["D_M"]
    assert "§17.5.4.3" in sources["V_s,min,wind"]
    assert sources["T_fb"] == "given"
    names = {i.symbol: i.name for i in report.quantities}
    assert names["B_M"] == "damping coefficient" and names["V_s"] == "superstructure design shear"
    with pytest.raises(KeyError, match="'nothing' is not in the report"):
        report.value("nothing")


def test_activation_force_of_a_multilinear_plane():
    # A linear spring plus an elastic-plastic element (k 20000 kN/m, strength 300 kN): the plane is fully
    # activated at the element's yield displacement 300/20000 = 0.015 m, where F = (2000 + 20000) 0.015
    # = 330 kN [derived, parallel springs]. Nominal only: 1.5 x 330 = 495 kN (§17.5.4.3 item 3).
    from isolation.bearings import MultiLinear
    plane = MultiLinear(2000.0, (20000.0,), (300.0,))
    assert activation_force({"nominal": plane})[0] == pytest.approx(1.5 * 330.0, rel=1e-9)
    # Upper only (no nominal set): the upper-bound force.
    assert activation_force({"upper": plane})[0] == pytest.approx(330.0, rel=1e-9)
    # Neither named: the largest over the sets; none with a yield force: None.
    force, note = activation_force({"a": plane, "b": MultiLinear(2000.0, (20000.0,), (600.0,))})
    assert force == pytest.approx((2000.0 + 20000.0) * 0.03, rel=1e-9) and "largest" in note
    assert activation_force({"a": LinearSystem(1000.0, 0.1)}) == (None, "")
    # Equal forces: 1.5 x nominal counts (the greater-or-equal of the clause).
    assert "1.5 x nominal" in activation_force({"nominal": bilinear_set(400.0), "upper": bilinear_set(600.0)})[1]


@pytest.mark.parametrize("changes, words", [
    # Brief rule: bad input names the field, the value and what is allowed, with its unit.
    (dict(floor_elevations=(4.0, 4.0, 12.0)),
     r"floor_elevations = \[4\.0, 4\.0, 12\.0\] is not allowed: must increase"),
    (dict(plan_length=-1.0), r"plan_length = -1\.0 is not allowed: .* \[m\]"),
    (dict(plan_width=0.0), r"plan_width = 0\.0 is not allowed: .* \[m\]"),
    (dict(response_modification=0.0), r"response_modification = 0\.0 is not allowed: .* \[-\]"),
    (dict(torsion_period_ratio=0.0), r"torsion_period_ratio = 0\.0 is not allowed: .* \[-\]"),
    (dict(importance=0.0), r"importance = 0\.0 is not allowed: .* \[-\]"),
    (dict(eccentricity=-1.0), r"eccentricity = -1\.0 is not allowed: .* \[m\]"),
    (dict(wind_base_shear=-1.0), r"wind_base_shear = -1\.0 is not allowed: .* \[kN\]"),
    (dict(s1=-0.1), r"s1 = -0\.1 is not allowed: .* \[g\]"),
    (dict(corner_distance=-1.0), r"corner_distance = -1\.0 is not allowed: .* \[m\]"),
    (dict(activation_force=0.0), r"activation_force = 0\.0 is not allowed: .* \[kN\]"),
    (dict(height=0.0), r"height = 0\.0 is not allowed: .* \[m\]"),
    (dict(fixed_base_period=0.0), r"fixed_base_period = 0\.0 is not allowed: .* \[s\]"),
    (dict(frame="timber"), r"frame = 'timber' is not allowed"),
    (dict(irregular="yes"), r"irregular = 'yes' is not allowed"),
])
def test_elf_building_bad_input(changes, words):
    with pytest.raises(ValueError, match=words):
        building(**changes)


def test_elf_building_keeps_its_values():
    b = building(floor_weights=(3000, 3000, 2000), floor_elevations=(4, 8, 12), plan_length=40)
    assert b.floor_weights == (3000.0, 3000.0, 2000.0) and b.floor_elevations == (4.0, 8.0, 12.0)
    assert b.plan_length == 40.0 and b.weight_above == 8000.0 and b.total_weight == 10000.0
    assert b.structural_height == 12.0 and building(height=14.0).structural_height == 14.0


def test_three_storey_drift_and_storey_shears_by_hand():
    # Linear mode shape phi = h/h_top and the generalised SDOF of Chopra (Dynamics of Structures,
    # generalised single-degree-of-freedom systems) [derived]: k* = omega^2 sum m phi^2,
    # u_top = sum F phi / k*, storey drift (phi_i - phi_i-1) u_top C_d with C_d = R_I = 2, I_e = 1.0
    # (ASCE/SEI 7-16 §17.5.6 and §17.2.1, from memory). Forces F_x = C_vx V_s (§17.5.5, from memory).
    report = asce7_elf(sets(), building(importance=1.25), SPECTRUM)
    w = [3000.0, 3000.0, 2000.0]
    h = [4.0, 8.0, 12.0]
    k_exp = 14 * 0.2 * 0.5
    v_s = 1000.0 * 0.8**0.5
    share = [wi * hi**k_exp for wi, hi in zip(w, h, strict=True)]
    forces = [v_s * s / sum(share) for s in share]
    phi = [hi / 12.0 for hi in h]
    k_star = (2 * math.pi / 0.5) ** 2 * sum(wi / G * p**2 for wi, p in zip(w, phi, strict=True))
    u_top = sum(f * p for f, p in zip(forces, phi, strict=True)) / k_star
    drifts = [(phi[0] - 0.0) * u_top * 2.0, (phi[1] - phi[0]) * u_top * 2.0, (phi[2] - phi[1]) * u_top * 2.0]
    shears = [sum(forces), forces[1] + forces[2], forces[2]]
    for i, storey in enumerate(report.storey_forces):
        assert storey.level == i + 2 and storey.elevation == h[i] and storey.weight == w[i]
        assert storey.force == pytest.approx(forces[i], rel=1e-9)
        assert storey.storey_shear == pytest.approx(shears[i], rel=1e-9)
        assert storey.drift == pytest.approx(drifts[i], rel=1e-9)
        assert storey.drift_ratio == pytest.approx(drifts[i] / 4.0, rel=1e-9)
    worst = max(drifts) / 4.0
    assert report.checks[0].value == pytest.approx(worst, rel=1e-9) and report.checks[0].passed


def test_approximate_fixed_base_period_and_comparison():
    # T_fb = T_a = C_t h^x for steel moment frames, 0.0724 x 12^0.8 (ASCE/SEI 7-16 Table 12.8-2, SI).
    report = asce7_elf(sets(), building(fixed_base_period=None, frame="steel_moment"), SPECTRUM)
    t_a = 0.0724 * 12.0**0.8
    assert report.value("T_fb") == pytest.approx(t_a, rel=1e-12)
    assert "Eq. 12.8-7" in [i.source for i in report.quantities if i.symbol == "T_fb"][0]
    assert report.fixed_base.period == pytest.approx(t_a, rel=1e-12)
    # A given T_fb above C_u T_a is capped for the comparison (§12.8.2; C_u 1.4 at S_D1 0.6, from memory).
    capped = asce7_elf(sets(), building(fixed_base_period=1.0, frame="steel_moment"), SPECTRUM)
    assert capped.fixed_base.period == pytest.approx(1.4 * t_a, rel=1e-12)
    assert capped.value("T_fb") == 1.0   # the report's own T_fb stays the given one


def test_damping_rule_reaches_the_design():
    # rule="eurocode": eta = sqrt(10/(5 + 20)) (EN 1998-1 Eq. 3.6) in place of B_M 1.5: D_M scales by
    # 1.5 * sqrt(0.4) = 0.9487 [derived].
    asce = asce7_elf(sets(), building(), SPECTRUM)
    ec = asce7_elf(sets(), building(), SPECTRUM, rule="eurocode")
    assert ec.value("D_M") == pytest.approx(asce.value("D_M") * 1.5 * math.sqrt(0.4), rel=1e-6)
    assert "Table 17.5-1" in [i.source for i in asce.quantities if i.symbol == "B_M"][0]
    assert [i.source for i in ec.quantities if i.symbol == "B_M"][0] == "eurocode"


def test_applicability_checks_quote_value_limit_and_source():
    # ASCE/SEI 7-16 §17.4.1 (from memory) limits: site class A-D, 4 storeys, 19.8 m, T_M 5 s,
    # T_M > 3 T, beta_M 30 %, no barred irregularity; §17.2.4.4 restoring force 0.025 W.
    report = asce7_elf(sets(), building(), SPECTRUM)
    by_name = {c.name.split(",")[0].split(" (")[0]: c for c in report.applicability}
    site = [c for c in report.applicability if c.name.startswith("site class")][0]
    assert (site.value, site.limit, site.passed) == (3.0, 3.0, True)   # D is the fourth class
    expected = {"storeys above the isolation interface": (3.0, 4.0),
                "height above the isolation interface": (12.0, 19.8),
                "longest effective period T_M": (3.0, 5.0), "shortest T_M over 3 T_fb": (6.0, 3.0),
                "largest effective damping beta_M": (0.2, 0.30)}
    for name, (value, limit) in expected.items():
        check = by_name[name]
        assert check.value == pytest.approx(value) and check.limit == pytest.approx(limit), name
        assert "§17.4.1" in check.source
    irregular = asce7_elf(sets(), building(irregular=True), SPECTRUM)
    barred = [c for c in irregular.applicability if "irregularity" in c.name][0]
    assert (barred.value, barred.limit, barred.passed) == (1.0, 0.0, False)


def test_stiffness_ratio_and_restoring_force_of_a_bilinear_plane():
    # Bilinear plane [derived]: k_eff(D) = K_d + Q_d/D beyond yield; the ratio k_eff(D)/k_eff(0.2 D) and
    # the restoring force (F(D) - F(D/2))/W = K_d (D/2)/W (ASCE/SEI 7-16 §17.4.1 item 7, §17.2.4.4,
    # from memory). K_d = W/(g T_d^2/(4 pi^2)) for T_d 4 s, Q_d = 0.05 W, K_u = 50 K_d.
    w = 10000.0
    kd = stiffness_for_period(w, 4.0)
    plane = Bilinear(50 * kd, kd, 0.05 * w)
    report = asce7_elf({"lower": plane, "upper": plane}, building(), CodeSpectrum(1.5, 0.9, max_period=10.0))
    d = report.value("D_M")
    ratio = [c for c in report.applicability if c.name.startswith("k_eff(D_M)/k_eff(0.2 D_M), lower")][0]
    assert ratio.value == pytest.approx((kd + 0.05 * w / d) / (kd + 0.05 * w / (0.2 * d)), rel=1e-9)
    assert ratio.limit == pytest.approx(1 / 3) and ratio.passed is (ratio.value > 1 / 3)
    restoring = [c for c in report.applicability if c.name.startswith("restoring force") and "lower" in c.name][0]
    assert restoring.value == pytest.approx(kd * d / 2 / w, rel=1e-9)
    assert restoring.limit == 0.025 and "§17.2.4.4" in restoring.source
    assert restoring.passed is (kd * d / 2 / w >= 0.025)


def test_response_coefficient_defaults_and_long_period_branch():
    from isolation.codes.asce7_fixed_base import response_coefficient
    # Defaults I_e = 1.0 and T_L = 8 s (ASCE/SEI 7-16 §12.8.1.1) [derived]: T 10 s, R 1:
    # Eq. 12.8-4 0.6*8/10^2 = 0.048 (floor 0.044).
    assert response_coefficient(1.0, 0.6, 10.0, 1.0)[0] == pytest.approx(0.048)
    # Eq. 12.8-4 with R/I_e = 2: 0.6*8/(100*2) = 0.024 above the 0.01 floor (S_DS 0.2 -> 0.0088).
    assert response_coefficient(0.2, 0.6, 10.0, 2.0)[0] == pytest.approx(0.024)
    # At T = T_L Eq. 12.8-3 still applies (12.8-4 from T > T_L): 0.6/(8*1) = 0.075.
    cs, governs = response_coefficient(1.0, 0.6, 8.0, 1.0)
    assert cs == pytest.approx(0.075) and "12.8-3" in governs


def test_fixed_base_shear_passes_s1_and_reports_its_coefficient():
    from isolation.codes.asce7_fixed_base import fixed_base_shear
    # S_1 0.7 g, R 4, I_e 1, T 3 s [derived]: 12.8-3 0.6/(3*4) = 0.05; 12.8-6 0.5*0.7/4 = 0.0875 governs.
    shear = fixed_base_shear(SPECTRUM, 1000.0, 4.0, period=3.0, s1=0.7)
    assert shear.response_coefficient == pytest.approx(0.0875) and "12.8-6" in shear.governs
    assert shear.base_shear == pytest.approx(87.5) and "§11.4.5" in shear.source
    # Without S_1 the default 0 keeps Eq. 12.8-6 out.
    assert fixed_base_shear(SPECTRUM, 1000.0, 4.0, period=3.0).response_coefficient == pytest.approx(0.05)


class ShortSpectrum:
    """Test double: Sa = 1.2 g flat up to 0.8 s, with a long_period attribute but no S_DS/S_D1."""

    long_period = 8.0
    period_range = (0.0, 0.8)

    def sa(self, periods, damping=0.05):
        import numpy as np
        return np.full_like(np.asarray(periods, dtype=float), 1.2)


class RisingSpectrum(ShortSpectrum):
    """Test double: Sa = 0.1 T g up to 6 s (T Sa = 0.1 T^2 grows to the end of the range)."""

    period_range = (0.0, 6.0)

    def sa(self, periods, damping=0.05):
        import numpy as np
        return 0.1 * np.asarray(periods, dtype=float)


def test_design_values_ranges():
    from isolation.codes.asce7_fixed_base import design_values
    # ASCE/SEI 7-16 §21.4 style (from memory): windows 0.2-5 s for S_DS and 1-5 s for S_D1, within the
    # spectrum's range [derived]. Rising Sa = 0.1 T: max Sa over 0.2-5 s is 0.5 g -> S_DS = 0.9*2/3*0.5
    # = 0.3 g; max T Sa over 1-5 s is 2.5 -> S_D1 = 2/3*2.5 = 1.6667 g; T_L = end of range 6 s.
    sds, sd1, tl, _ = design_values(RisingSpectrum())
    assert sds == pytest.approx(0.3, rel=1e-9) and sd1 == pytest.approx(2.5 * 2 / 3, rel=1e-9) and tl == 6.0
    # A range ending at 0.8 s: the 1 s window collapses to 0.8 s: S_D1 = 2/3*0.8*1.2 = 0.64 g; S_DS =
    # 0.9*2/3*1.2 = 0.72 g (an object with long_period alone is not a code spectrum).
    sds, sd1, tl, _ = design_values(ShortSpectrum())
    assert sds == pytest.approx(0.72, rel=1e-9) and sd1 == pytest.approx(0.64, rel=1e-9) and tl == 0.8


def test_every_eurocode_item_by_hand():
    # EN 1998-1 §10.9 (from memory) on the linear case [derived]: W 10000 kN, W_s 7000 kN, T_eff 2.0 s,
    # xi 20 %, ground C type 1, a_g 0.3 g: Se = 0.163654 g, d_dc = g Se T^2/(4 pi^2), K = 4 pi^2 W/(g T^2).
    se = 2.5 * 0.3 * 1.15 * math.sqrt(0.4) * 0.6 / 2.0
    report = ec_report(superstructure_weight=7000.0, behaviour_factor=3.9)
    d_dc = G * se * 4.0 / (4 * math.pi**2)
    delta = 1 + 1.5 * 15.0 / (1300.0 / 12.0)
    expected = {"d_dc": d_dc, "T_eff": 2.0, "xi_eff": 0.2, "eta": math.sqrt(0.4),
                "K_eff,min": stiffness_for_period(10000.0, 2.0), "e_tot": 1.5, "delta": delta, "gamma_x": 1.2,
                "d_d": 1.2 * delta * d_dc, "V": 10000.0 * se, "V_s": 7000.0 * se,
                "F_b": 0.3 * 1.15 * 2.5 / 3.9 * 7000.0 * 0.85}
    for symbol, value in expected.items():
        assert report.value(symbol) == pytest.approx(value, rel=1e-5), symbol
    units = {i.symbol: i.unit for i in report.quantities}
    assert (units["d_dc"], units["V"], units["K_eff,min"], units["T_eff"]) == ("m", "kN", "kN/m", "s")
    sources = {i.symbol: i.source for i in report.quantities}
    assert "§10.9.2" in sources["d_dc"] and "Eq. 3.6" in sources["eta"] and "§10.10(5)" in sources["V_s"]
    assert "Eq. 4.5" in sources["F_b"] and "§4.3.2" in sources["e_tot"]
    with pytest.raises(KeyError, match="'nothing' is not in the report"):
        report.value("nothing")
    data = report.to_dict()
    assert data["building"]["superstructure_weight"] == 7000.0 and data["simplified_permitted"] is True


@pytest.mark.parametrize("changes, words", [
    (dict(weight=0.0), r"weight = 0\.0 is not allowed: .* \[kN\]"),
    (dict(superstructure_period=0.0), r"superstructure_period = 0\.0 is not allowed: .* \[s\]"),
    (dict(plan_length=-1.0), r"plan_length = -1\.0 is not allowed: .* \[m\]"),
    (dict(plan_width=0.0), r"plan_width = 0\.0 is not allowed: .* \[m\]"),
    (dict(eccentricity=-1.0), r"eccentricity = -1\.0 is not allowed: .* \[m\]"),
    (dict(corner_distance=-1.0), r"corner_distance = -1\.0 is not allowed: .* \[m\]"),
    (dict(fault_distance=-1.0), r"fault_distance = -1\.0 is not allowed: .* \[km\]"),
    (dict(vertical_stiffness_ratio=-1.0), r"vertical_stiffness_ratio = -1\.0 is not allowed: .* \[-\]"),
    (dict(behaviour_factor=0.5), r"behaviour_factor = 0\.5 is not allowed: .* \[-\]"),
    (dict(displacement_amplification=0.9), r"displacement_amplification = 0\.9 is not allowed: .* \[-\]"),
    (dict(storeys=True), r"storeys = True is not allowed: must be an integer >= 1"),
    (dict(regular="yes"), r"regular = 'yes' is not allowed"),
    (dict(superstructure_weight=0.0), r"superstructure_weight = 0\.0 is not allowed: .* \[kN\]"),
])
def test_eurocode_building_bad_input(changes, words):
    data = dict(weight=10000.0, superstructure_period=0.4, plan_length=30.0, plan_width=20.0)
    data.update(changes)
    with pytest.raises(ValueError, match=words):
        EurocodeBuilding(**data)


def test_eurocode_building_keeps_its_values():
    b = EurocodeBuilding(10000, 0.4, 30, 20, eccentricity=1, corner_distance=12, fault_distance=20,
                         vertical_stiffness_ratio=300, superstructure_weight=8000)
    assert (b.weight, b.superstructure_period, b.plan_length, b.plan_width) == (10000.0, 0.4, 30.0, 20.0)
    assert (b.eccentricity, b.corner_distance, b.fault_distance, b.vertical_stiffness_ratio) == (1.0, 12.0, 20.0, 300.0)
    assert b.weight_above == 8000.0 and EurocodeBuilding(10000, 0.4, 30, 20).weight_above == 10000.0
    with pytest.raises(ValueError, match="must be a EurocodeBuilding"):
        eurocode_simplified(sets(), "building", EurocodeSpectrum(0.3, "C"))


def test_eurocode_design_spectrum_ranges():
    # EN 1998-1 §3.2.2.5 covers 0-4 s (the elastic spectrum's range, §3.2.2.2); q >= 1 here up to 10.
    from isolation.codes.eurocode import (
        eurocode_approximate_period,
        eurocode_design_spectrum,
        eurocode_fixed_base_shear,
    )
    spectrum = EurocodeSpectrum(0.3, "C")
    assert eurocode_design_spectrum(spectrum, 4.0, 10.0) == pytest.approx(0.06)
    with pytest.raises(ValueError, match=r"period = 4\.5 is not allowed: .* \[s\]"):
        eurocode_design_spectrum(spectrum, 4.5, 3.0)
    with pytest.raises(ValueError, match=r"behaviour_factor = 10\.5 is not allowed: .* \[-\]"):
        eurocode_design_spectrum(spectrum, 1.0, 10.5)
    with pytest.raises(ValueError, match=r"spectrum = CodeSpectrum is not allowed"):
        eurocode_design_spectrum(SPECTRUM, 1.0, 3.0)
    with pytest.raises(ValueError, match=r"period = 0\.0 is not allowed: .* \[s\]"):
        eurocode_fixed_base_shear(spectrum, 1000.0, 3.0, 0.0, 3)
    with pytest.raises(ValueError, match=r"period = 4\.5 is not allowed"):
        eurocode_fixed_base_shear(spectrum, 1000.0, 3.0, 4.5, 3)
    with pytest.raises(ValueError, match=r"frame = 'timber' is not allowed"):
        eurocode_approximate_period(10.0, "timber")
    # T_f = 4.0 s still gets the fixed-base comparison (the design spectrum reaches 4 s).
    assert any(i.symbol == "F_b" for i in ec_report(superstructure_period=4.0, period=3.0).quantities)


# --- site spectra: damping rule, design level, construction ------------------------------------------

def test_spectrum_damping_rule_per_call():
    # ASCE/SEI 7-16 Table 17.5-1: B 1.5 at 20 %; EN 1998-1 Eq. 3.6: eta = sqrt(10/(5 + 20)) [derived].
    # S_M1 0.9 at 3 s: Sa(5 %) = 0.3 g.
    spectrum = CodeSpectrum(1.5, 0.9)
    assert spectrum.sa(3.0, 0.2) == pytest.approx(0.2, rel=1e-12)
    assert spectrum.sa(3.0, 0.2, rule="eurocode") == pytest.approx(0.3 * math.sqrt(0.4), rel=1e-12)
    assert CodeSpectrum(1.5, 0.9, rule="eurocode").sa(3.0, 0.2) == pytest.approx(0.3 * math.sqrt(0.4), rel=1e-12)
    # S_d = g Sa T^2/(4 pi^2) with the same rule.
    assert spectrum.sd(3.0, 0.2, rule="eurocode") == pytest.approx(G * 0.3 * math.sqrt(0.4) * 9 / (4 * math.pi**2),
                                                                rel=1e-12)
    with pytest.raises(ValueError, match=r"rule = 'nzs' is not allowed"):
        spectrum.sa(3.0, 0.2, rule="nzs")
    assert isinstance(spectrum.sa([1, 2]), np.ndarray) and spectrum.sa([1, 2]).dtype == float


def test_spectrum_from_design_values_and_design_level():
    # ASCE/SEI 7-16 §11.4.5: S_DS = 2/3 S_MS, S_D1 = 2/3 S_M1, so S_MS = 1.5 S_DS [derived].
    spectrum = CodeSpectrum.from_design_values(1.0, 0.6)
    assert (spectrum.sms, spectrum.sm1, spectrum.long_period) == (pytest.approx(1.5), pytest.approx(0.9), 8.0)
    other = CodeSpectrum.from_design_values(0.8, 0.4, 6.0, rule="eurocode")
    assert (other.sms, other.long_period, other.rule) == (pytest.approx(1.2), 6.0, "eurocode")
    design = CodeSpectrum(1.5, 0.9, rule="eurocode").design()
    assert design.rule == "eurocode" and design.sa(3.0) == pytest.approx(0.2, rel=1e-12)   # 2/3 of 0.3 g
    # T_L must exceed T_S = S_M1/S_MS (the two-period spectrum needs a 1/T branch).
    with pytest.raises(ValueError, match="long_period"):
        CodeSpectrum(1.0, 0.6, long_period=0.6)
    with pytest.raises(ValueError, match=r"level = 'service' is not allowed"):
        CodeSpectrum(1.0, 0.6, level="service")
    with pytest.raises(ValueError, match=r"rule = 'nzs' is not allowed"):
        CodeSpectrum(1.0, 0.6, rule="nzs")


def test_elf_item_notes_say_what_governs():
    # D_TM note: the 1.15 D_M floor (ASCE/SEI 7-16 §17.5.3.3) or the corner distance and P_T used.
    floor = asce7_elf(sets(), building(plan_length=10.0, plan_width=10.0, corner_distance=1.0), SPECTRUM)
    notes = {i.symbol: i.note for i in floor.quantities}
    sources = {i.symbol: i.source for i in floor.quantities}
    assert notes["D_TM"] == "1.15 D_M floor governs"
    assert "§17.2" in sources["moat"] and "0.05 m clearance" in notes["moat"]
    torsion = asce7_elf(sets(), building(), SPECTRUM)
    assert "y = 20 m, P_T = 1" in {i.symbol: i.note for i in torsion.quantities}["D_TM"]
    # The V_st exponent note appears only for sliding systems.
    other = {i.symbol: i.source for i in torsion.quantities}["V_st"]
    assert "1 - 2.5 beta_M" in other and "3.5" not in other
    governs = {i.symbol: i.note for i in torsion.quantities}["V_s"]
    assert governs == "governed by V_st/R_I"


@pytest.mark.parametrize("period, expected", [
    # ASCE/SEI 7-16 Eq. 12.8-6 applies only where it exceeds the other C_s [derived], S_DS 1.0, S_D1 0.6,
    # S_1 0.6 g, R 4, I_e 1.5 (R/I_e = 2.667): 0.5 S_1/(R/I_e) = 0.1125.
    (0.5, 1.0 / (4.0 / 1.5)),             # plateau 0.375 stays
    (1.5, 0.6 / (1.5 * 4.0 / 1.5)),       # Eq. 12.8-3 0.15 stays
    (4.0, 0.5 * 0.6 / (4.0 / 1.5)),       # 12.8-3 0.05625 and floor 0.066 are raised to 0.1125
])
def test_eq_12_8_6_only_raises(period, expected):
    from isolation.codes.asce7_fixed_base import response_coefficient
    assert response_coefficient(1.0, 0.6, period, 4.0, 1.5, s1=0.6)[0] == pytest.approx(expected, rel=1e-12)


class HalfCodeSpectrum(ShortSpectrum):
    """Test double: has S_D1 and T_L but no S_DS, so it is read from its curve; Sa = 1/T^2 g."""

    sd1 = 0.5
    period_range = (0.0, 6.0)

    def sa(self, periods, damping=0.05):
        import numpy as np
        return 1.0 / np.asarray(periods, dtype=float) ** 2


def test_design_values_of_a_partial_spectrum():
    # Only an object with S_DS, S_D1 and T_L is taken as a code spectrum. Sa = 1/T^2: T Sa = 1/T peaks at
    # the start of the 1-5 s window: S_D1 = 2/3*1 = 0.6667 g; S_DS = 0.9*2/3*Sa(0.2) = 0.6*25 = 15 g [derived].
    from isolation.codes.asce7_fixed_base import design_values
    sds, sd1, tl, _ = design_values(HalfCodeSpectrum())
    assert sd1 == pytest.approx(2 / 3, rel=1e-9) and sds == pytest.approx(15.0, rel=1e-9) and tl == 6.0


def test_eurocode_checks_quote_value_limit_and_source():
    # EN 1998-1 §10.9.2 / §10.9.1(5) limits (from memory): T_eff >= 3 T_f, T_eff <= 3 s, xi <= 30 %,
    # L <= 50 m, regular, > 15 km from a fault, K_v/K_eff >= 150, K ratio >= 0.5, restoring 0.025 W.
    report = ec_report(fault_distance=20.0, vertical_stiffness_ratio=200.0)
    checks = {c.name.split(" (")[0].split(",")[0]: c for c in report.applicability}
    expected = {"shortest T_eff over the superstructure period T_f": (5.0, 3.0, "§10.9.2"),
                "longest effective period T_eff": (2.0, 3.0, "§10.9.2"),
                "largest effective damping xi_eff": (0.2, 0.30, "§10.9.1(5)"),
                "largest plan dimension": (30.0, 50.0, "§10.9.2"),
                "superstructure regular and symmetric": (1.0, 1.0, "§10.9.2"),
                "distance to an active fault": (20.0, 15.0, "§10.9.2"),
                "vertical over effective horizontal stiffness": (200.0, 150.0, "§10.9.2")}
    for name, (value, limit, clause) in expected.items():
        check = checks[name]
        assert check.value == pytest.approx(value) and check.limit == pytest.approx(limit), name
        assert clause in check.source and check.passed, name
    # Bilinear plane [derived]: K ratio (K_d + Q_d/d)/(K_d + Q_d/(0.2 d)); restoring K_d (d/2)/W.
    w = 10000.0
    kd = stiffness_for_period(w, 4.0)
    plane = Bilinear(50 * kd, kd, 0.05 * w)
    bilinear = eurocode_simplified({"lower": plane, "upper": plane}, EurocodeBuilding(w, 0.4, 30.0, 20.0),
                                   EurocodeSpectrum(0.3, "C", max_period=10.0))
    d = bilinear.value("d_dc")
    ratio = [c for c in bilinear.applicability if c.name.startswith("K_eff(d_dc)/K_eff(0.2 d_dc), lower")][0]
    assert ratio.value == pytest.approx((kd + 0.05 * w / d) / (kd + 0.05 * w / (0.2 * d)), rel=1e-9)
    assert ratio.limit == 0.5 and ratio.passed is (ratio.value >= 0.5) and "§10.9.1(5)" in ratio.source
    restoring = [c for c in bilinear.applicability if c.name.startswith("restoring") and "lower" in c.name][0]
    assert restoring.value == pytest.approx(kd * d / 2 / w, rel=1e-9) and restoring.limit == 0.025
    assert restoring.passed is (restoring.value >= 0.025)
    assert bilinear.bounds is not None and bilinear.building.weight == w


def test_eurocode_spectrum_with_another_damping_rule():
    # EN 1998-1 §3.2.2.2 Type 1 ground C at 1.0 s (T_C 0.6 <= T <= T_D 2.0): Sa(5 %) = 2.5 a_g S T_C/T
    # = 2.5*0.3*1.15*0.6 = 0.5175 g; with the ASCE 7 rule at 20 % divided by B 1.5 (Table 17.5-1),
    # with its own rule multiplied by eta = sqrt(10/25) (Eq. 3.6) [derived].
    spectrum = EurocodeSpectrum(0.3, "C")
    assert spectrum.sa(1.0, 0.2, rule="asce7") == pytest.approx(0.5175 / 1.5, rel=1e-12)
    assert spectrum.sa(1.0, 0.2) == pytest.approx(0.5175 * math.sqrt(0.4), rel=1e-12)
    assert EurocodeSpectrum(0.3, "C", rule="asce7").sa(1.0, 0.2) == pytest.approx(0.5175 / 1.5, rel=1e-12)
    with pytest.raises(ValueError, match=r"rule = 'nzs' is not allowed"):
        spectrum.sa(1.0, 0.2, rule="nzs")
    for kwargs, field in ((dict(ground="F"), "ground = 'F'"), (dict(spectrum_type=3), "spectrum_type = 3"),
                          (dict(rule="nzs"), "rule = 'nzs'")):
        with pytest.raises(ValueError, match=field):
            EurocodeSpectrum(0.3, **kwargs)


def test_drift_estimate_beyond_the_limit_warns():
    # A flexible superstructure [derived]: one 4 m storey with T_fb 3.0 s: u = V_s/(omega^2 W_s/g),
    # drift ratio 2 u/4 m far above 0.015 (ASCE/SEI 7-16 §17.5.6, from memory).
    soft = asce7_elf(sets(), building(floor_weights=(8000.0,), floor_elevations=(4.0,), fixed_base_period=3.0),
                     SPECTRUM)
    u = soft.value("V_s") / ((2 * math.pi / 3.0) ** 2 * 8000.0 / G)
    assert 2 * u / 4.0 > 0.015
    assert not soft.checks[0].passed
    assert any("drift" in w and "stiffen the superstructure" in w and "0.015" in w for w in soft.warnings)
    # The sources of the applicability checks name their clause.
    report = asce7_elf(sets(), building(irregular=True), SPECTRUM)
    for check in report.applicability:
        assert "ASCE/SEI 7-16" in check.source and ("§17.4.1" in check.source or "§17.2.4.4" in check.source)


@pytest.mark.parametrize("periods, words", [
    # A spectrum table needs increasing periods from T >= 0 (only the first may be 0), two or more rows.
    ((1.0,), r"periods = \(1\.0,\) is not allowed: must be a list of at least 2 periods"),
    ((-0.1, 1.0), r"periods = \[-0\.1, 1\.0\] is not allowed: must be >= 0"),
    ((0.0, 0.0, 1.0), r"periods = \[0\.0, 0\.0, 1\.0\] is not allowed: must be >= 0 \(only the first may be 0\)"),
    ((0.5, 0.5, 1.0), r"periods\[1\] = 0\.5 is not allowed: must be strictly increasing \(previous 0\.5\)"),
    ((0.5, 1.0, 0.9), r"periods\[2\] = 0\.9 is not allowed: must be strictly increasing \(previous 1\.0\)"),
])
def test_tabulated_spectrum_table_checks(periods, words):
    from isolation.site.spectra import TabulatedSpectrum
    with pytest.raises(ValueError, match=words):
        TabulatedSpectrum(periods, tuple(1.0 for _ in periods))


def test_tabulated_spectrum_damping_and_interpolation():
    from isolation.site.spectra import TabulatedSpectrum
    # A table from T = 0: linear between the first two rows below the first positive period, log-log
    # above (the module's documented interpolation) [derived]: Sa(0.05) = 0.4 + (1.0 - 0.4)*0.05/0.1 = 0.7;
    # at a table row the value itself.
    table = TabulatedSpectrum((0.0, 0.1, 1.0), (0.4, 1.0, 0.5))
    assert table.sa(0.05) == pytest.approx(0.7, rel=1e-12) and table.sa(0.1) == pytest.approx(1.0, rel=1e-12)
    # A table given at 10 % damping (B 1.2, ASCE/SEI 7-16 Table 17.5-1) is brought to 5 % first:
    # Sa(5 %) = 1.2 * 0.5 = 0.6 g at 1 s; at 20 % (B 1.5): 0.6/1.5 = 0.4 g.
    damped = TabulatedSpectrum((0.1, 1.0), (1.0, 0.5), damping=0.10)
    assert damped.sa(1.0) == pytest.approx(0.6, rel=1e-12) and damped.sa(1.0, 0.2) == pytest.approx(0.4, rel=1e-12)
    with pytest.raises(ValueError, match=r"damping = 0\.0 is not allowed"):
        TabulatedSpectrum((0.1, 1.0), (1.0, 0.5), damping=0.0)
    with pytest.raises(ValueError, match=r"damping = 1\.5 is not allowed"):
        TabulatedSpectrum((0.1, 1.0), (1.0, 0.5), damping=1.5)
    assert TabulatedSpectrum((0.1, 1.0), (1.0, 0.5), damping=1.0).damping == 1.0


def test_spectrum_construction_edges():
    from isolation.site.spectra import TabulatedSpectrum
    # T_L must exceed T_S = S_M1/S_MS = 0.5 s (S_MS 2.0, S_M1 1.0): 1.0 s is allowed.
    assert CodeSpectrum(2.0, 1.0, long_period=1.0).long_period == 1.0
    # The first period that fails to increase is named (index 3 here, after a repeated 1.0 s).
    with pytest.raises(ValueError, match=r"periods\[2\] = 1\.0 is not allowed"):
        TabulatedSpectrum((0.5, 1.0, 1.0, 0.9), (1.0, 1.0, 1.0, 1.0))
    # A table at 10 % damping with the Eurocode rule is brought to 5 % with eta = sqrt(10/15)
    # (EN 1998-1 Eq. 3.6) [derived]: 0.5/sqrt(2/3) = 0.61237 g at 1 s.
    table = TabulatedSpectrum((0.1, 1.0), (1.0, 0.5), damping=0.10, rule="eurocode")
    assert table.sa(1.0) == pytest.approx(0.5 / math.sqrt(10 / 15), rel=1e-12)


def _cites(text, clause):
    """``text`` starts with the standard's designation and the clause (a citation a reader can look up)."""
    return text.startswith(f"ASCE/SEI 7-16 {clause}")


def test_response_coefficient_names_the_governing_equation():
    from isolation.codes.asce7_fixed_base import response_coefficient
    # ASCE/SEI 7-16 §12.8.1.1 (from memory) with the standard's symbols S_DS, S_D1, T_L, R, I_e:
    # Eq. 12.8-2 C_s = S_DS/(R/I_e); need not exceed 12.8-3 S_D1/(T R/I_e) for T <= T_L,
    # 12.8-4 S_D1 T_L/(T^2 R/I_e) beyond; not less than 12.8-5 0.044 S_DS I_e >= 0.01;
    # 12.8-6 0.5 S_1/(R/I_e) where S_1 >= 0.6 g. [derived] values below.
    cs, governs = response_coefficient(1.0, 0.6, 0.3, 8.0)             # plateau: 1/8
    assert cs == pytest.approx(0.125) and _cites(governs, "Eq. 12.8-2 (") and "S_DS" in governs and "I_e" in governs
    cs, governs = response_coefficient(1.0, 0.6, 1.0, 8.0)             # 0.6/8 = 0.075 > 0.044 floor
    assert cs == pytest.approx(0.075) and _cites(governs, "Eq. 12.8-3 (")
    assert "S_D1" in governs and "I_e" in governs and "T_L" not in governs
    cs, governs = response_coefficient(1.0, 0.6, 10.0, 1.0, 1.0, 8.0)  # 0.6*8/100 = 0.048
    assert cs == pytest.approx(0.048) and _cites(governs, "Eq. 12.8-4 (")
    assert "S_D1" in governs and "T_L" in governs and "I_e" in governs
    cs, governs = response_coefficient(1.0, 0.6, 4.0, 8.0, 1.5)        # 0.044*1.0*1.5 = 0.066
    assert cs == pytest.approx(0.066) and _cites(governs, "Eq. 12.8-5 (") and "S_DS" in governs and "I_e" in governs
    cs, governs = response_coefficient(1.0, 0.6, 3.0, 4.0, s1=0.7)     # 0.5*0.7/4 = 0.0875
    assert cs == pytest.approx(0.0875) and _cites(governs, "Eq. 12.8-6 (") and "S_1" in governs and "I_e" in governs


def test_response_coefficient_limits_bind_only_when_crossed():
    from isolation.codes.asce7_fixed_base import response_coefficient
    # ASCE/SEI 7-16 §12.8.1.1 (from memory): 12.8-3 applies where C_s "need not exceed" it, the
    # floors where C_s "shall not be less than" them, so at exact equality the earlier equation
    # stands. [derived] S_DS 1.0, S_D1 0.5, T 0.5 s (= T_S), R 2: 12.8-2 1/2 = 12.8-3 0.5/(0.5*2).
    cs, governs = response_coefficient(1.0, 0.5, 0.5, 2.0)
    assert cs == 0.5 and _cites(governs, "Eq. 12.8-2 (")
    # 12.8-3 0.08/(1*8) = 0.01 equals the 0.01 floor of Eq. 12.8-5 (S_DS 0.1: 0.044*0.1 < 0.01).
    cs, governs = response_coefficient(0.1, 0.08, 1.0, 8.0)
    assert cs == 0.01 and _cites(governs, "Eq. 12.8-3 (")
    # 12.8-6 0.5*0.8/4 = 0.1 equals 12.8-3 0.4/(1*4) = 0.1 with S_1 0.8 g.
    cs, governs = response_coefficient(1.0, 0.4, 1.0, 4.0, s1=0.8)
    assert cs == pytest.approx(0.1) and _cites(governs, "Eq. 12.8-3 (")


def test_fixed_base_defaults_and_notes():
    from isolation.codes.asce7_fixed_base import fixed_base_shear
    # ASCE/SEI 7-16 Table 12.8-2 (SI, from memory): "all other structural systems" C_t 0.0488,
    # x 0.75, the documented default row.
    assert approximate_period(20.0) == pytest.approx(0.0488 * 20.0**0.75)
    shear = fixed_base_shear(SPECTRUM, 1000.0, 8.0, height=20.0)
    assert shear.period == pytest.approx(0.0488 * 20.0**0.75) and shear.approximate_period == shear.period
    assert shear.period_source.startswith("approximate T_a") and "Eq. 12.8-7" in shear.period_source
    # A code spectrum carries its design values (2/3 of S_MS, S_M1: ASCE/SEI 7-16 §11.4.5).
    assert _cites(shear.source, "§11.4.5 (") and "2/3" in shear.source
    # A given period above C_u T_a is capped (§12.8.2): C_u 1.4 at S_D1 0.6 g (Table 12.8-1).
    capped = fixed_base_shear(SPECTRUM, 1000.0, 8.0, period=5.0, height=20.0)
    assert capped.period == pytest.approx(1.4 * 0.0488 * 20.0**0.75)
    assert capped.period_source.startswith("given, capped at C_u T_a (ASCE/SEI 7-16 §12.8.2")
    # Any other spectrum: the §21.4-style reading (90 % of the peak over 0.2-5 s, 2/3 of MCE_R).
    from isolation.site.spectra import TabulatedSpectrum
    flat = TabulatedSpectrum(periods=(0.01, 0.5, 1.0, 6.0), values=(0.6, 0.6, 0.6, 0.1))
    other = fixed_base_shear(flat, 1000.0, 8.0, period=0.3)
    assert _cites(other.source, "§21.4 style") and other.sds == pytest.approx(0.9 * 2.0 / 3.0 * 0.6)


# --- what the printed reports say: units, citations, the standards' terms -----------------------

# Units of each reported quantity from its dimensions in the package's units (kN, m, s; "-" for a
# ratio) [derived]: displacements m, periods s, forces kN, stiffness kN/m.
_ELF_UNITS = {"D_M": "m", "T_M": "s", "beta_M": "-", "B_M": "-", "k_M": "kN/m", "e": "m", "D_TM": "m", "moat": "m",
              "V_b": "kN", "V_st": "kN", "R_I": "-", "V_s,min,fixed": "kN", "V_s,min,wind": "kN",
              "V_s,min,activation": "kN", "V_s": "kN", "T_fb": "s", "k": "-", "F_1": "kN", "V_fb": "kN",
              "V_s/V_fb": "-"}
# Clause of ASCE/SEI 7-16 for each (Ch. 17 as listed in the module docstring, from memory).
_ELF_CLAUSES = {"D_M": "Eq. 17.5-1", "T_M": "Eq. 17.5-2", "B_M": "Table 17.5-1", "k_M": "§17.5.3",
                "e": "§17.5.3.3", "D_TM": "Eq. 17.5-3", "moat": "§17.2", "V_b": "§17.5.4.1", "V_st": "§17.5.4.2",
                "R_I": "§17.5.4.2", "V_s,min,fixed": "§17.5.4.3 item 1", "V_s,min,wind": "§17.5.4.3 item 2",
                "V_s,min,activation": "§17.5.4.3 item 3", "T_fb": "Eq. 12.8-7", "k": "§17.5.5", "F_1": "§17.5.5",
                "V_fb": "Eq. 12.8-"}
# Terms of ASCE/SEI 7-16 §11.3 notation (from memory) that start each quantity's name.
_ELF_TERMS = {"D_M": "maximum displacement", "D_TM": "total maximum displacement", "T_M": "effective period",
              "beta_M": "effective damping", "k_M": "effective stiffness", "B_M": "damping coefficient",
              "V_s": "superstructure design shear", "R_I": "reduction factor", "T_fb": "fixed-base period",
              # and plain words for the rest: V_b on the isolation system, V_st unreduced, F_1 at the base level
              "e": "eccentricity incl. 5 % accidental", "moat": "moat width", "V_b": "isolation-system shear",
              "V_st": "unreduced superstructure shear", "k": "distribution exponent", "F_1": "force at base level",
              "V_fb": "fixed-base design shear", "V_s/V_fb": "ratio isolated/fixed-base design shear"}


def test_elf_report_units_citations_and_terms():
    # Lower bound T 3.2 s (displacement), upper bound T 3.0 s (forces).
    report = asce7_elf(sets(lower=(3.2, 0.2)), building(isolator_kind="sliding", activation_force=900.0,
                                                       fixed_base_period=None), SPECTRUM)
    items = {i.symbol: i for i in report.quantities}
    assert items["D_M"].note == "property set 'lower'" and items["V_b"].note == "property set 'upper'"
    assert {s: i.unit for s, i in items.items()} == _ELF_UNITS
    for symbol, clause in _ELF_CLAUSES.items():
        assert items[symbol].source.startswith(f"ASCE/SEI 7-16 {clause}"), (symbol, items[symbol].source)
    for symbol, term in _ELF_TERMS.items():
        assert items[symbol].name.startswith(term), (symbol, items[symbol].name)
    # Effective damping by the energy dissipated per cycle: Naeim & Kelly (1999), Eq. beta = EDC/(2 pi k D^2).
    assert items["beta_M"].source.startswith("Naeim & Kelly (1999): EDC/(2 pi K_eff D^2)")
    # Each V_s lower limit is named after what it is, and V_s cites the one that governs.
    for symbol, what in (("V_s,min,fixed", "fixed-base shear at T_M"), ("V_s,min,wind", "factored wind shear"),
                         ("V_s,min,activation", "activation force")):
        assert items[symbol].name == f"lower limit on V_s: {what}"
    governing = max(("V_st", "V_s,min,fixed", "V_s,min,wind", "V_s,min,activation"),
                    key=lambda s: items[s].value / (items["R_I"].value if s == "V_st" else 1.0))
    assert items["V_s"].source == (items[governing].source if governing != "V_st" else "ASCE/SEI 7-16 §17.5.4.2")
    # Sliding system: the exponent's 3.5 beta_M and the reason are stated (issue: friction conventions).
    assert "1 - 3.5 beta_M replaces 1 - 2.5 beta_M" in items["V_st"].source
    assert "activation force 900 kN (given" in items["V_s,min,activation"].source
    # The ELF applicability checks cite §17.4.1, the restoring force §17.2.4.4, the drift §17.5.6.
    for check in report.applicability:
        clause = "§17.2.4.4" if check.name.startswith("restoring force") else "§17.4.1"
        assert check.source.startswith(f"ASCE/SEI 7-16 {clause}"), check.source
    units = {c.name.split(",")[0]: c.unit for c in report.applicability}
    assert units == {"site class D within A-D (A=0 ... F=5)": "-", "storeys above the isolation interface": "-",
                     "height above the isolation interface": "m", "longest effective period T_M": "s",
                     "shortest T_M over 3 T_fb": "-", "largest effective damping beta_M": "-",
                     "barred structural irregularity (1 = present)": "-", "k_eff(D_M)/k_eff(0.2 D_M)": "-",
                     "restoring force (F(D_M) - F(D_M/2))/W": "-"}
    # Quantities at D_M say so (ASCE/SEI 7-16 notation: T_M, beta_M, k_M at the maximum displacement).
    for symbol in ("T_M", "beta_M", "k_M"):
        assert items[symbol].name.endswith(" at D_M"), items[symbol].name
    assert items["V_s/V_fb"].source == "V_s over §12.8 V"
    assert items["V_s,min,activation"].source.endswith("not divided by R_I (from memory; ASCE/SEI 7-22 same, from "
                                                       "memory)")
    (drift,) = report.checks
    assert drift.source.startswith("ASCE/SEI 7-16 §17.5.6") and drift.unit == "-"
    assert drift.name.startswith("storey drift ratio estimate (level ")


def test_elf_warnings_say_what_failed_and_what_follows():
    # 20 storeys of 4 m: 80 m over the 19.8 m of §17.4.1 (from memory) -> ELF not permitted.
    tall = asce7_elf(sets(), building(floor_weights=(400.0,) * 20,
                                      floor_elevations=tuple(4.0 * (i + 1) for i in range(20))),
                     SPECTRUM)
    assert not tall.elf_permitted
    failed = [c for c in tall.applicability if not c.passed]
    assert len(failed) == len(tall.warnings) - sum(not c.passed for c in tall.checks)
    for check, warning in zip(failed, tall.warnings, strict=True):
        unit = "" if check.unit == "-" else f" {check.unit}"
        assert warning == (f"{check.name}: {check.value:.4g} against limit {check.limit:.4g}{unit} ({check.source})"
                           " - ELF not permitted: response-history analysis is required")
    assert any(w.startswith("height above the isolation interface: 80 against limit 19.8 m (") for w in tall.warnings)


# EN 1998-1:2004 clauses of each quantity of the simplified analysis (from memory, as in the
# module docstring) and units by dimensions [derived].
_EC_UNITS = {"d_dc": "m", "T_eff": "s", "xi_eff": "-", "eta": "-", "K_eff,min": "kN/m", "e_tot": "m", "delta": "-",
             "gamma_x": "-", "d_d": "m", "V": "kN", "V_s": "kN", "F_b": "kN", "V_s/F_b": "-"}
_EC_CLAUSES = {"d_dc": "§10.9.2", "T_eff": "§10.9.2", "xi_eff": "§10.5", "eta": "§3.2.2.2 Eq. 3.6",
               "K_eff,min": "§10.9.2", "e_tot": "§4.3.2", "delta": "§10.9.3", "gamma_x": "§10.3(2)", "V": "§10.9.2",
               "V_s": "§10.10(5)", "F_b": "Eq. 4.5"}
_EC_TERMS = {"d_dc": "design displacement of the stiffness centre", "T_eff": "effective period",
             "xi_eff": "effective damping", "eta": "damping correction factor", "K_eff,min": "effective stiffness",
             "gamma_x": "displacement amplification", "d_d": "isolator design displacement",
             "F_b": "fixed-base design shear", "e_tot": "total eccentricity", "delta": "torsional amplification",
             "V": "elastic base shear", "V_s": "isolated superstructure design shear",
             "V_s/F_b": "ratio isolated/fixed-base design shear"}


def test_eurocode_report_units_citations_and_terms():
    ec = EurocodeBuilding(10000.0, 0.4, 30.0, 20.0, storeys=3, behaviour_factor=3.9, superstructure_weight=7000.0,
                          fault_distance=20.0, vertical_stiffness_ratio=800.0)
    # Lower bound T 2.2 s (displacement), upper bound T 2.0 s (forces).
    report = eurocode_simplified(sets(lower=(2.2, 0.2), upper=(2.0, 0.2)), ec, EurocodeSpectrum(0.3, "C"))
    items = {i.symbol: i for i in report.quantities}
    assert {s: i.unit for s, i in items.items()} == _EC_UNITS
    for symbol, clause in _EC_CLAUSES.items():
        assert items[symbol].source.startswith(f"EN 1998-1:2004 {clause}"), (symbol, items[symbol].source)
    for symbol, term in _EC_TERMS.items():
        assert items[symbol].name.startswith(term), (symbol, items[symbol].name)
    # Derived quantities say how they follow from the others; the governing property sets are named.
    assert items["d_d"].source == "gamma_x delta d_dc" and items["V_s/F_b"].source == "V_s over F_b"
    assert items["d_dc"].note == "property set 'lower'" and items["V"].note == "property set 'upper'"
    assert items["delta"].note.startswith("y = ") and items["delta"].note.endswith(" m")
    # F_b: lambda 0.85 (T_1 0.4 s <= 2 T_C, 3 storeys: EN 1998-1 §4.3.3.2.2(1)), q and W_s stated.
    assert items["F_b"].note == "lambda = 0.85, q = 3.9, W_s = 7000 kN"
    assert items["V_s"].note.startswith("W_s = 7000 kN above the isolation plane, q = 1")
    # Applicability: §10.9.2 limits, §10.9.1(5) for the equivalent-linear model; units of the limits.
    for check in report.applicability:
        clause = "§10.9.1(5)" if "§10.9.1(5)" in check.name else "§10.9.2"
        assert check.source.startswith(f"EN 1998-1:2004 {clause}"), check.source
    units = {c.name.split(",")[0]: c.unit for c in report.applicability}
    assert units == {"shortest T_eff over the superstructure period T_f": "-", "longest effective period T_eff": "s",
                     "largest effective damping xi_eff (§10.9.1(5))": "-", "largest plan dimension": "m",
                     "superstructure regular and symmetric (0 = no)": "-",
                     "distance to an active fault (Ms >= 6.5)": "km",
                     "vertical over effective horizontal stiffness": "-", "K_eff(d_dc)/K_eff(0.2 d_dc)": "-",
                     "restoring force increase from d_dc/2 to d_dc over W": "-"}


def test_eurocode_warnings_say_what_failed_and_what_follows():
    # Plan 60 m over the 50 m of §10.9.2 (from memory): multimodal or response-history analysis.
    ec = EurocodeBuilding(10000.0, 0.4, 60.0, 20.0, fault_distance=10.0, vertical_stiffness_ratio=100.0, regular=False)
    report = eurocode_simplified(sets(lower=(2.0, 0.2), upper=(2.0, 0.2)), ec, EurocodeSpectrum(0.3, "C"))
    assert not report.simplified_permitted
    failed = [c for c in report.applicability if not c.passed]
    assert [c.name.split(" (")[0] for c in failed] == ["largest plan dimension", "superstructure regular and symmetric",
                                                       "distance to an active fault",
                                                       "vertical over effective horizontal stiffness"]
    for check, warning in zip(failed, report.warnings, strict=True):
        unit = "" if check.unit == "-" else f" {check.unit}"
        assert warning.startswith(f"{check.name}: {check.value:.4g} against limit {check.limit:.4g}{unit} "
                                  f"({check.source}) - ")
        assert warning.endswith("simplified analysis not applicable: use multimodal or response-history analysis "
                                "(EN 1998-1 §10.9.3/§10.9.4)")


# --- verdict sources: each limit cites its clause for the study's basis ---------------------------

# Topic -> (ASCE/SEI 7-16 clause, EN 1998-1:2004 clause or "common practice"), from memory, as the
# issue asks (each limit quoted with the clause a reader can look up).
_VERDICT_CLAUSES = {
    "period shift": ("§17.4.1 item 5", "§10.9.2"),
    "isolated period limit": ("§17.4.1", None),
    "displacement capacity": ("§17.2.4.5", "§10.3(2)"),
    "moat": ("§17.2.6", "§10.4"),
    "design shear": ("§17.5.4.2", "§10.10(5)"),
    "soft soil class F": ("§11.4.8", None),
    "near fault": ("§11.2", None),
    "wind": ("§17.2.4.3", None),
    "analysis procedure": ("§17.4.1", "§10.9"),
    "effective damping": ("§17.4.1", "§10.9.1"),
}


@pytest.mark.parametrize("topic", sorted(_VERDICT_CLAUSES))
def test_verdict_sources_cite_the_clause(topic):
    from isolation.verdict.sources import PRACTICE, source
    asce, ec = _VERDICT_CLAUSES[topic]
    text = source(topic, "asce7")
    assert text.startswith(f"ASCE/SEI 7-16 {asce}") and "(from memory)" in text, text
    assert source(topic) == text                    # ASCE 7 is the default basis
    text = source(topic, "eurocode")
    if ec is None:
        assert text.startswith(PRACTICE), text
    else:
        assert text.startswith(f"EN 1998-1:2004 {ec}") and "(from memory)" in text, text


def test_verdict_sources_uplift_and_drift_wording():
    from isolation.verdict.sources import PRACTICE, source
    assert PRACTICE == "common practice"
    # Uplift: the method is derived statics, the tributary load common practice, the vertical term cited.
    asce = source("uplift", "asce7")
    assert asce.startswith("outermost bearing of a regular "
                           "grid") and "(derived)" in asce and "(common practice)" in asce
    assert "E_v = 0.2 S_MS D (ASCE/SEI 7-16 §17.2.4.6, §12.4.2.2, from memory)" in asce    # Eq. 12.4-4a
    ec = source("uplift", "eurocode")
    assert ec.startswith("outermost bearing of a regular grid") and "(common practice)" in ec
    assert "(EN 1990 Eq. 6.12b, EN 1998-1:2004 §4.3.3.5.2, from memory)" in ec
    # Drift: ASCE 7 §17.6.4.4 (MCE_R histories) and EN 1998-1 §4.4.3.2 (damage limitation).
    assert drift_limit("asce7")[1].startswith("ASCE/SEI 7-16 §17.6.4.4, MCE_R response-history analysis (from memory)")
    assert drift_limit("eurocode")[1].startswith("EN 1998-1:2004 §4.4.3.2 damage limitation (from memory): ")
    limit, text = drift_limit("eurocode", "brittle", 1.2)
    # alpha 0.005, nu 0.4 (gamma_I 1.2, classes III-IV) -> 0.005/0.4 = 1.25 % [derived].
    assert text == ("EN 1998-1:2004 §4.4.3.2 damage limitation (from memory): d_r nu <= 0.005 h for non-structural "
                    "elements 'brittle', nu = 0.4 (gamma_I = 1.2), so 1.25% under the design seismic action")
    # nu changes between the classes: gamma_I 1.0 (class II) -> 0.5; 1.2 (class III) -> 0.4; the split at 1.1.
    assert eurocode_reduction_factor() == 0.5 and eurocode_reduction_factor(1.1) == 0.5
    assert eurocode_reduction_factor(1.1000001) == 0.4


# --- ELF report: remaining branches probed with hand arithmetic -----------------------------------

def test_elf_building_stores_plain_floats_in_tuples():
    # Sequences given as lists of integers are kept as tuples of floats (a frozen, hashable record).
    b = ElfBuilding(base_weight=2000, floor_weights=[3000, 3000], floor_elevations=[4, 8], plan_length=40,
                    plan_width=20, response_modification=8)
    assert b.floor_weights == (3000.0, 3000.0) and type(b.floor_weights) is tuple
    assert b.floor_elevations == (4.0, 8.0) and type(b.floor_elevations) is tuple
    assert all(type(x) is float for x in (b.base_weight, *b.floor_weights, *b.floor_elevations, b.plan_length))
    hash(b)
    b = building(plan_width=20, response_modification=8, torsion_period_ratio=1, importance=1, eccentricity=1,
                 wind_base_shear=500, s1=1, moat_clearance=0, corner_distance=20, fixed_base_period=1,
                 activation_force=900, height=13)
    for name in ("plan_width", "response_modification", "torsion_period_ratio", "importance", "eccentricity",
                 "wind_base_shear", "s1", "moat_clearance", "corner_distance", "fixed_base_period", "activation_force",
                 "height"):
        assert type(getattr(b, name)) is float, name
    # A mezzanine 0.5 m above a floor is a valid level (levels only have to rise).
    assert ElfBuilding(base_weight=0.0, floor_weights=(10.0, 10.0), floor_elevations=(4.0, 4.5), plan_length=10.0,
                       plan_width=10.0, response_modification=8.0).structural_height == 4.5
    with pytest.raises(ValueError, match=r"^site_class = 'X' is not allowed: must be one of 'A', 'B', 'C', 'D', 'E', "
                                         r"'F'$"):
        building(site_class="X")


class YieldOnly:
    """Test double: a property set that exposes only its yield force [kN]."""

    def __init__(self, yield_force):
        self.yield_force = yield_force


def test_activation_force_at_exact_equality_and_from_yield_force():
    # ASCE/SEI 7-16 §17.5.4.3 item 3 (from memory): the greater of the upper-bound yield force and
    # 1.5 x nominal. 1.5 x 400 = 600 = the upper bound: either is the answer; the note names the
    # 1.5 x nominal reading (the clause's "greater of", ties to its second term, as documented).
    force, note = activation_force({"nominal": YieldOnly(400.0), "upper": YieldOnly(600.0)})
    assert force == 600.0 and note == "1.5 x nominal yield force"
    force, note = activation_force({"nominal": YieldOnly(400.0), "upper": YieldOnly(601.0)})
    assert force == 601.0 and note == "upper-bound yield force"
    assert activation_force({"upper": YieldOnly(700.0)}) == (700.0, "upper-bound yield force")


class SteppedSystem(LinearSystem):
    """Test double: effective stiffness k [kN/m] above ``step`` [m], k/``ratio`` below (a plane
    that is stiffer at small amplitude, like a yielding system)."""

    def __init__(self, stiffness, damping, step, ratio):
        super().__init__(stiffness, damping)
        self.step, self.ratio = step, ratio

    def effective_stiffness(self, d):
        return self.stiffness if d > self.step else self.stiffness / self.ratio

    def force(self, d):
        return self.effective_stiffness(d) * d


@pytest.mark.parametrize("ratio, passed", [(0.30, False), (1.0 / 3.0, False), (0.40, True)])
def test_elf_stiffness_ratio_limit_one_third(ratio, passed):
    # ASCE/SEI 7-16 §17.4.1 (from memory): k_eff at D_M "greater than" 1/3 of k_eff at 0.2 D_M (1/3 itself fails).
    # T 3 s, beta 20 %: D_M = g 0.9 3/(4 pi^2 1.5) = 0.447 m [derived]; the stiffness steps at 0.15 m,
    # so at 0.2 D_M = 0.089 m it is k/ratio: the check sees exactly ``ratio``.
    k = stiffness_for_period(10000.0, 3.0)
    system = SteppedSystem(k, 0.2, 0.15, ratio)
    report = asce7_elf({"lower": system, "upper": system}, building(), SPECTRUM)
    check = [c for c in report.applicability if c.name.startswith("k_eff(D_M)/k_eff(0.2 D_M)")][0]
    assert check.value == pytest.approx(ratio) and check.limit == pytest.approx(1.0 / 3.0)
    assert check.passed is passed
    if not passed:
        assert not report.elf_permitted and any(w.startswith("k_eff(D_M)/k_eff(0.2 D_M)") for w in report.warnings)


def test_elf_eq_12_8_6_at_t_m_and_for_the_fixed_base_comparison():
    # S_1 0.75 g >= 0.6 g: Eq. 12.8-6 0.5 S_1/(R/I_e) applies in §12.8 (ASCE/SEI 7-16 §12.8.1.1, from memory),
    # also in the V_s lower limit of §17.5.4.3 item 1 (§12.8 with R_I at T_M). [derived]
    # At T_M 3 s, R_I 2: 12.8-3 0.6/(3*2) = 0.1 < 12.8-6 0.5*0.75/2 = 0.1875 -> 0.1875 * 8000 = 1500 kN.
    # Fixed base: steel moment frame, h 60 m: T_a = 0.0724 60^0.8 = 1.91 s (Table 12.8-2), T 2.0 s
    # given (< C_u T_a); R 8: 12.8-3 0.6/(2*8) = 0.0375, 12.8-5 0.044, 12.8-6 0.5*0.75/8 = 0.046875
    # -> V_fb = 0.046875 * 8000 = 375 kN.
    report = asce7_elf(sets(), building(s1=0.75, frame="steel_moment", height=60.0, fixed_base_period=2.0), SPECTRUM)
    items = {i.symbol: i for i in report.quantities}
    assert items["V_s,min,fixed"].value == pytest.approx(1500.0) and "Eq. 12.8-6" in items["V_s,min,fixed"].source
    assert items["V_fb"].value == pytest.approx(375.0) and items["V_fb"].source.startswith("ASCE/SEI 7-16 Eq. 12.8-6 (")
    assert items["V_fb"].note == "given" and items["T_fb"].source == "given"
    # A given period above C_u T_a is capped, and the note says so: 3 s > 1.4 x 1.91 s (Table 12.8-1).
    capped = asce7_elf(sets(), building(s1=0.75, frame="steel_moment", height=60.0, fixed_base_period=3.0), SPECTRUM)
    assert {i.symbol: i.note for i in capped.quantities}["V_fb"].startswith("given, capped at C_u T_a")
    # Without a given period, the comparison runs at T_a (Eq. 12.8-7) and the note says so, not "given".
    approximate = asce7_elf(sets(), building(s1=0.75, frame="steel_moment", height=60.0, fixed_base_period=None),
                            SPECTRUM)
    assert "Eq. 12.8-7" in {i.symbol: i.note for i in approximate.quantities}["V_fb"]
    assert capped.building.height == 60.0 and capped.fixed_base.period == pytest.approx(1.4 * 0.0724 * 60.0**0.8)


def test_elf_passes_options_to_the_iteration_and_keeps_its_inputs():
    b = building()
    report = asce7_elf(sets(), b, SPECTRUM)
    assert report.building is b
    # tolerance of isolation.design.equivalent_linear is limited to (0, 0.01]: passed through, it is checked.
    with pytest.raises(ValueError, match=r"^tolerance = 0\.5 is not allowed"):
        asce7_elf(sets(), b, SPECTRUM, tolerance=0.5)


def test_elf_v_st_source_states_the_exponent():
    # ASCE/SEI 7-16 Eq. 17.5-7 (from memory): V_st = V_b (W_s/W)^(1 - 2.5 beta_M); beta_M 0.2 -> 0.5.
    other = {i.symbol: i.source for i in asce7_elf(sets(), building(), SPECTRUM).quantities}["V_st"]
    assert other.endswith("V_b (W_s/W)^(1 - 2.5 beta_M), exponent 0.500")
    # Sliding: 1 - 3.5 beta_M = 0.3, and the source says where the 3.5 comes from.
    sliding = {i.symbol: i.source for i in asce7_elf(sets(), building(isolator_kind="sliding"), SPECTRUM).quantities}
    assert "V_b (W_s/W)^(1 - 3.5 beta_M), exponent 0.300 (" in sliding["V_st"]
    assert sliding["V_st"].endswith("ASCE/SEI 7-16 §17.5.4.2, Eq. 17.5-7, from memory, not re-read)")


def test_drift_limit_defaults():
    # Default basis ASCE 7 (§17.6.4.4, 0.020, from memory); default gamma_I 1.0 (class II) -> nu 0.5, so
    # brittle partitions give 0.005/0.5 = 1 % (EN 1998-1 §4.4.3.2, from memory).
    limit, text = drift_limit()
    assert limit == 0.020 and text.startswith("ASCE/SEI 7-16 §17.6.4.4")
    assert drift_limit("eurocode", "brittle")[0] == pytest.approx(0.010)


# --- EN 1998-1 simplified analysis: range ends and limits at equality --------------------------

def test_eurocode_building_range_ends():
    base = dict(weight=10000.0, superstructure_period=0.4, plan_length=30.0, plan_width=20.0)
    # Documented ranges (EN 1998-1 §10.10(5) q <= 1.5 for the isolated superstructure, §10.3(2)
    # gamma_x, from memory; q of the fixed base up to 10; 0 < W_s <= W): both ends inclusive except W_s > 0.
    ok = EurocodeBuilding(**base, behaviour_factor=10.0, isolated_behaviour_factor=1.5, displacement_amplification=3.0,
                          superstructure_weight=10000.0)
    assert (ok.behaviour_factor, ok.isolated_behaviour_factor, ok.displacement_amplification) == (10.0, 1.5, 3.0)
    assert ok.weight_above == 10000.0
    low = EurocodeBuilding(**base, behaviour_factor=1.0, isolated_behaviour_factor=1.0, displacement_amplification=1.0)
    assert low.weight_above == 10000.0                      # default W_s = W
    for field, value in (("behaviour_factor", 10.01), ("isolated_behaviour_factor", 1.51),
                         ("displacement_amplification", 3.01), ("superstructure_weight", 0.0),
                         ("superstructure_weight", 10000.01), ("behaviour_factor", 0.99)):
        with pytest.raises(ValueError, match=rf"^{field} = "):
            EurocodeBuilding(**base, **{field: value})
    for value in (0, 1.5, True):
        with pytest.raises(ValueError, match=r"^storeys = .* must be an integer >= 1$"):
            EurocodeBuilding(**base, storeys=value)


def test_eurocode_fixed_base_shear_lambda_and_period_ends():
    from isolation.codes.eurocode import eurocode_design_spectrum, eurocode_fixed_base_shear
    spectrum = EurocodeSpectrum(0.3, "C")     # type 1, ground C: S 1.15, T_B 0.2, T_C 0.6, T_D 2.0 s (Table 3.2)
    # lambda = 0.85 when T_1 <= 2 T_C and more than two storeys, else 1.0 (EN 1998-1 §4.3.3.2.2(1), from memory).
    plateau = 0.3 * 1.15 * 2.5 / 4.0         # S_d on the plateau, q 4 (Eq. 3.14)
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 4.0, 0.5, 3)[:2] == (pytest.approx(1000.0 * plateau * 0.85),
                                                                            0.85)
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 4.0, 0.5, 2)[1] == 1.0
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 4.0, 1.2, 3)[1] == 0.85        # T_1 = 2 T_C exactly
    assert eurocode_fixed_base_shear(spectrum, 1000.0, 4.0, 1.21, 3)[1] == 1.0
    # The 4 s end of the design spectrum (§3.2.2.5, Eq. 3.16): max(a_g S 2.5/q T_C T_D/T^2, beta a_g).
    shear, lam, source = eurocode_fixed_base_shear(spectrum, 1000.0, 1.5, 4.0, 3)
    assert shear == pytest.approx(1000.0 * max(0.3 * 1.15 * 2.5 / 1.5 * 0.6 * 2.0 / 16.0, 0.2 * 0.3))
    assert lam == 1.0 and source.startswith("EN 1998-1:2004 Eq. 4.5")
    with pytest.raises(ValueError, match=r"^period = 0\.0 is not allowed: must be a finite number in \(0, 4\] \[s\]$"):
        eurocode_fixed_base_shear(spectrum, 1000.0, 1.5, 0.0, 3)
    # Eq. 3.13 at T = 0: a_g S 2/3; q = 1 and q = 10 are both allowed.
    assert eurocode_design_spectrum(spectrum, 0.0, 1.0) == pytest.approx(0.3 * 1.15 * 2.0 / 3.0)
    assert eurocode_design_spectrum(spectrum, 0.4, 10.0) == pytest.approx(0.3 * 1.15 * 2.5 / 10.0)
    assert eurocode_design_spectrum(spectrum, 4.0, 1.0) == pytest.approx(0.3 * 1.15 * 2.5 * 0.6 * 2.0 / 16.0)


@pytest.mark.parametrize("ratio, passed", [(0.5, True), (0.45, False)])
def test_eurocode_stiffness_ratio_limit_one_half(ratio, passed):
    # EN 1998-1 §10.9.1(5) (from memory): K_eff at d_dc at least 50 % of K_eff at 0.2 d_dc. T 2 s, 20 %:
    # d_dc = g Se T^2/(4 pi^2) ~ 0.2 m [derived]; the stiffness steps at 0.08 m, below which it is k/ratio.
    k = stiffness_for_period(10000.0, 2.0)
    system = SteppedSystem(k, 0.2, 0.08, ratio)
    report = eurocode_simplified({"lower": system, "upper": system}, EurocodeBuilding(10000.0, 0.4, 30.0, 20.0),
                                 EurocodeSpectrum(0.3, "C"))
    check = [c for c in report.applicability if c.name.startswith("K_eff(d_dc)/K_eff(0.2 d_dc)")][0]
    assert check.value == pytest.approx(ratio) and check.limit == 0.5 and check.passed is passed
    assert report.simplified_permitted is passed
    if not passed:
        assert "equivalent-linear model not permitted" in report.warnings[0]


def test_eurocode_limits_at_equality():
    # EN 1998-1 §10.9.2 (from memory): T_eff >= 3 T_f, T_eff <= 3 s, K_v/K_eff >= 150, more than 15 km
    # from an active fault; at the limit the first three pass and the fault distance does not.
    ec = EurocodeBuilding(10000.0, 1.0, 30.0, 20.0, fault_distance=15.0, vertical_stiffness_ratio=150.0)
    report = eurocode_simplified(sets(lower=(3.0, 0.2), upper=(3.0, 0.2)), ec, EurocodeSpectrum(0.3, "C"))
    checks = {c.name: c for c in report.applicability}
    assert checks["shortest T_eff over the superstructure period T_f"].passed
    assert checks["longest effective period T_eff"].passed
    assert checks["vertical over effective horizontal stiffness"].passed
    assert not checks["distance to an active fault (Ms >= 6.5)"].passed
    assert checks["largest plan dimension"].passed and checks["largest plan dimension"].limit == 50.0


def test_fixed_base_period_at_the_cap_is_kept():
    from isolation.codes.asce7_fixed_base import fixed_base_shear, period_upper_limit_factor
    # ASCE/SEI 7-16 §12.8.2 (from memory): T "shall not exceed" C_u T_a; a period equal to it stands as given.
    cap = period_upper_limit_factor(0.6) * approximate_period(20.0)
    shear = fixed_base_shear(SPECTRUM, 1000.0, 8.0, period=cap, height=20.0)
    assert shear.period == cap and shear.period_source == "given"


def test_eurocode_building_plain_floats_small_superstructure_and_options():
    b = EurocodeBuilding(10000, 1, 30, 20, superstructure_weight=0.5)     # 0 < W_s <= W: any positive W_s
    assert all(type(x) is float for x in (b.weight, b.superstructure_period, b.plan_length, b.plan_width,
                                          b.superstructure_weight))
    assert b.weight_above == 0.5
    with pytest.raises(ValueError, match=r"^tolerance = 0\.5 is not allowed"):
        eurocode_simplified(sets(), EurocodeBuilding(10000.0, 0.4, 30.0, 20.0), EurocodeSpectrum(0.3, "C"),
                            tolerance=0.5)


def test_eurocode_damping_limit_at_thirty_per_cent():
    # EN 1998-1 §10.9.1(5) (from memory): xi_eff <= 30 %; exactly 30 % keeps the equivalent-linear model.
    report = eurocode_simplified(sets(lower=(2.0, 0.30), upper=(2.0, 0.30)), EurocodeBuilding(10000.0, 0.4, 30.0, 20.0),
                                 EurocodeSpectrum(0.3, "C"))
    check = [c for c in report.applicability if c.name.startswith("largest effective damping xi_eff")][0]
    assert check.value == 0.30 and check.passed


def test_eurocode_inputs_kept_as_floats_and_its_damping_rule():
    b = EurocodeBuilding(10000, 1, 30, 20, eccentricity=1, behaviour_factor=4, isolated_behaviour_factor=1,
                         displacement_amplification=2, superstructure_weight=7000)
    assert all(type(getattr(b, name)) is float for name in ("eccentricity", "behaviour_factor",
                                                            "isolated_behaviour_factor",
                                                            "displacement_amplification", "superstructure_weight"))
    # EN 1998-1 Eq. 4.6 (from memory): C_t 0.050 for "all other structures", the documented default.
    assert eurocode_approximate_period(16.0) == pytest.approx(0.050 * 16.0**0.75)
    # The simplified analysis always takes eta of §3.2.2.2 (rule "eurocode"), whatever the spectrum's own rule.
    report = eurocode_simplified(sets(lower=(2.0, 0.2), upper=(2.0, 0.2)), EurocodeBuilding(10000.0, 0.4, 30.0, 20.0),
                                 EurocodeSpectrum(0.3, "C", rule="asce7"))
    assert report.bounds.displacement.rule == "eurocode"
    assert report.value("eta") == pytest.approx(math.sqrt(10.0 / 25.0))
    with pytest.raises(ValueError, match=r"^building = str is not allowed: must be a EurocodeBuilding$"):
        eurocode_simplified(sets(), "tall", EurocodeSpectrum(0.3, "C"))
