"""Verdict rules on hand-built cases (isolation.verdict).

Limits and where they come from (the same sources the module cites):
* T_M > 3 T_fb and T_M <= 5 s, beta_M <= 30 %: ASCE/SEI 7-16 §17.4.1 (from memory).
* Isolated period 2-4(5) s, T_M >= 3 T_fb, height/width <= 3, soft sites a
  poor fit: common practice (rules of thumb of isolation design, no single source).
* Moat >= D_TM: ASCE/SEI 7-16 §17.2.6 (from memory).
* Drift 0.015 h_sx with the ELF procedure: ASCE/SEI 7-16 §17.5.6 (from memory).
* Wind must not yield the isolation plane: ASCE/SEI 7-16 §17.2.4.3 (from memory).
Reduction thresholds (base shear < 0.7, floor acceleration < 0.6,
spectral ratio < 0.5/0.8) are common practice.
On a Eurocode basis the same limits cite EN 1998-1:2004 (from memory): §10.9
simplified analysis (T_eff >= 3 T_f, xi_eff <= 30 %), §10.3 gamma_x and §10.4
for the isolators, §10.10(5) q <= 1.5, §4.4.3.2 damage limitation for drift.
"""

import json

import pytest

from isolation import verdict as v


def good_figures(**changes) -> v.Figures:
    """A hand-built well-suited case: T_fb 0.6 s, T_M 3.0 s, D_TM 0.45 m in 0.65 m bearings."""
    values = dict(
        alternative="A", fixed_base_period=0.6, isolated_period=3.0, total_displacement=0.45,
        displacement_capacity=0.65, moat=0.75, history_displacement=0.40, base_shear_ratio=0.25,
        design_shear_ratio=0.6,
        floor_acceleration_ratio=0.35, drift_ratio=0.004, uplift_ratio=0.3, slenderness=0.6,
        site_class="C", basis="asce7", near_fault=False, spectral_ratio=0.2, wind_base_shear=650.0,
        characteristic_strength=2200.0, elf_permitted=True, failed_checks=(), effective_damping=0.18,
    )
    values.update(changes)
    return v.Figures(**values)


def test_well_suited_case_is_feasible():
    result = v.assess(good_figures())
    assert result.outcome == v.FEASIBLE
    levels = {r.topic: r.level for r in result.reasons}
    # The period ratio is an applicability note of the single-mode procedure, never a verdict level.
    assert levels.pop("period shift") == "note"
    assert set(levels.values()) == {"ok"}
    assert result.headline == "A: feasible"


@pytest.mark.parametrize("isolated, fixed, met", [
    (3.0, 1.0, True),     # ratio 3.0: meets T_M >= 3 T (ASCE/SEI 7-16 §17.4.1 item 5, from memory)
    (2.99, 1.0, False),   # just below 3
    (1.5, 1.0, False),    # far below: still only a note, the benefit is judged by the spectral ratio
])
def test_period_shift_is_an_elf_note(isolated, fixed, met):
    reason = v.period_shift(isolated, fixed, period_source="T_a of Eq. 12.8-7")
    assert reason.level == "note"
    assert reason.value == pytest.approx(isolated / fixed) and reason.limit == 3.0
    assert f"{isolated:.2f} s" in reason.message and f"{isolated / fixed:.2f} times" in reason.message
    assert "T_a of Eq. 12.8-7" in reason.message
    assert ("met" in reason.message) is met and ("not permitted" in reason.message) is (not met)
    assert v.combine([reason]) == v.FEASIBLE


@pytest.mark.parametrize("period, level", [(1.8, "condition"), (1.99, "condition"), (2.0, "ok"), (5.0, "ok"),
                                           (5.01, "note"), (5.5, "note")])
def test_isolated_period_band(period, level):
    # 2-5 s band: common practice (rule of thumb of isolation design, no single source).
    reason = v.isolated_period(period, bound="nominal")
    assert reason.level == level and "nominal properties" in reason.message


def test_isolated_period_band_uses_the_nominal_period_when_given():
    # Upper-bound T_M 1.9 s would be a condition; the nominal 2.3 s that practice quotes is not.
    result = v.assess(good_figures(isolated_period=1.9, fixed_base_period=0.5, nominal_period=2.3))
    reason = [r for r in result.reasons if r.topic == "isolated period"][0]
    assert reason.level == "ok" and reason.value == 2.3 and "nominal" in reason.message
    upper = [r for r in v.assess(good_figures(isolated_period=1.9, fixed_base_period=0.5)).reasons
             if r.topic == "isolated period"][0]
    assert upper.level == "condition" and "upper" in upper.message


def test_displacement_beyond_capacity_is_against():
    r = v.displacement_capacity(0.70, 0.65)
    assert r.level == "against" and r.value == 0.70 and r.limit == 0.65
    assert "0.700 m" in r.message and "0.650 m" in r.message
    assert v.assess(good_figures(total_displacement=0.70, moat=0.8)).outcome == v.NOT_RECOMMENDED


def test_history_peak_beyond_capacity_is_against_even_when_dtm_fits():
    r = v.displacement_capacity(0.50, 0.65, history_displacement=0.68)
    assert r.level == "against" and r.value == 0.68
    assert "response-history" in r.message


def test_unknown_capacity_and_moat_are_conditions():
    assert v.displacement_capacity(0.5, None).level == "condition"
    assert v.moat_clearance(0.5, None).level == "condition"
    result = v.assess(good_figures(displacement_capacity=None, moat=None))
    assert result.outcome == v.CONDITIONAL


@pytest.mark.parametrize("d_tm, level",
                         [(0.6, "ok"), (0.8, "ok"), (0.81, "condition"), (1.2, "condition"), (1.25, "against")])
def test_displacement_size(d_tm, level):
    # Practical limits of moats and utility joints: common practice.
    assert v.displacement_size(d_tm).level == level


def test_narrow_moat_is_a_condition():
    r = v.moat_clearance(0.55, 0.50)
    assert r.level == "condition" and "widen" in r.message
    assert v.moat_clearance(0.50, 0.50).level == "ok"   # equal to D_TM meets ">= D_TM"


@pytest.mark.parametrize("ratio, level",
                         [(0.69, "ok"), (0.7, "condition"), (0.99, "condition"), (1.0, "against"), (1.3, "against")])
def test_base_shear_reduction(ratio, level):
    r = v.base_shear_reduction(ratio)
    assert r.level == level and f"{ratio:.0%}" in r.message


@pytest.mark.parametrize("ratio, level", [(0.6, "ok"), (1.0, "ok"), (1.01, "condition"), (1.4, "condition")])
def test_design_shear_above_fixed_base_is_a_condition_not_a_refusal(ratio, level):
    # R_I <= 2 (ASCE/SEI 7-16 §17.5.4.2) against R up to 8: a higher design shear costs but is allowed.
    assert v.design_shear(ratio).level == level
    assert v.assess(good_figures(design_shear_ratio=1.2)).outcome == v.CONDITIONAL


@pytest.mark.parametrize("ratio, level", [(0.3, "ok"), (0.6, "condition"), (1.0, "against")])
def test_floor_acceleration_reduction(ratio, level):
    assert v.floor_acceleration_reduction(ratio).level == level


def test_drift_limit():
    # 0.015 h_sx (ASCE/SEI 7-16 §17.5.6, from memory).
    assert v.storey_drift(0.016).level == "condition"
    assert v.storey_drift(0.015).level == "ok"
    assert v.storey_drift(0.018, limit=0.020).level == "ok"


@pytest.mark.parametrize("ratio, level", [(0.99, "ok"), (1.0, "ok"), (1.01, "condition"), (1.2, "condition")])
def test_uplift_is_a_condition_only_in_tension(ratio, level):
    # Net axial load P (1 - ratio): tension only when the overturning change exceeds the net
    # gravity load (statics); exactly 1 is zero load, not tension.
    assert v.uplift(ratio).level == level


@pytest.mark.parametrize("ratio, level", [(2.0, "ok"), (3.0, "ok"), (3.01, "condition"), (3.5, "condition")])
def test_slenderness_boundary(ratio, level):
    # H/B above 3: a poor fit for isolation (common practice, rule of thumb with no single source).
    assert v.slenderness(ratio).level == level


@pytest.mark.parametrize("damping, level", [(0.18, "ok"), (0.30, "ok"), (0.31, "note"), (0.5, "note")])
def test_effective_damping_boundary(damping, level):
    # beta_M <= 30 % for the ELF procedure (ASCE/SEI 7-16 §17.4.1 item 4, from memory).
    reason = v.effective_damping(damping)
    assert reason.level == level
    assert v.effective_damping(None) is None


@pytest.mark.parametrize("site, basis, level", [
    ("C", "asce7", "ok"), ("D", "asce7", "ok"), ("E", "asce7", "condition"), ("F", "asce7", "against"),
    ("C", "eurocode", "ok"), ("D", "eurocode", "condition"), ("E", "eurocode", "condition"),
])
def test_soft_sites(site, basis, level):
    assert v.site_suitability(site, basis).level == level


@pytest.mark.parametrize("ratio, level", [(0.3, "ok"), (0.5, "condition"), (0.79, "condition"), (0.8, "against")])
def test_spectral_benefit(ratio, level):
    assert v.spectral_benefit(ratio).level == level


def test_wind_against_characteristic_strength():
    r = v.wind(2500.0, 2200.0)
    assert r.level == "condition" and "2500 kN" in r.message and "2200 kN" in r.message
    assert v.wind(650.0, 2200.0).level == "ok"
    assert v.wind(None, 2200.0).level == "note"
    # Boundary: wind equal to the resistance moves the plane (ASCE/SEI 7-16 §17.2.4.3, from memory:
    # the isolation system resists wind without yielding).
    assert v.wind(2200.0, 2200.0).level == "condition"
    assert v.wind(2199.0, 2200.0).level == "ok"


def test_wind_margin_for_sliders():
    # 1000 kN x 1.5 = 1500 kN against 1400 kN of slow friction: a restraint is needed although the
    # bare wind shear is below the resistance (margin: common practice).
    r = v.wind(1000.0, 1400.0, margin=1.5, strength_note="slow friction")
    assert r.level == "condition" and r.value == 1500.0 and "1.5 margin" in r.message
    assert "slow friction" in r.message
    assert v.wind(900.0, 1400.0, margin=1.5).level == "ok"   # 1350 < 1400


def test_us_units_in_messages():
    # 0.6096 m = 24.0 in and 0.635 m = 25.0 in exactly; 444.82216 kN = 100 kip (NIST SP 811).
    r = v.displacement_capacity(0.6096, 0.635, system="US")
    assert "24.0 in" in r.message and "25.0 in" in r.message and r.unit == "m" and r.value == 0.6096
    assert "100 kip" in v.wind(444.82216152605, 1000.0, system="US").message
    result = v.assess(good_figures(units="US"))
    moat = [x for x in result.reasons if x.topic == "moat"][0]
    assert moat.message == "moat 29.5 in covers D_TM = 17.7 in"   # 0.75 m and 0.45 m


def test_elf_not_permitted_is_a_note_with_its_reasons():
    r = v.elf_applicability(False, ("height above the isolation interface", "storeys above isolation <= 4"))
    assert r.level == "note" and "height above the isolation interface" in r.message
    result = v.assess(good_figures(elf_permitted=False, elf_reasons=("height",)))
    assert result.outcome == v.FEASIBLE


def test_eurocode_equivalent_linear_exclusion_says_response_history():
    # EN 1998-1 §10.9.1(5) (from memory): when the equivalent-linear conditions fail, the simplified
    # and modal analyses are both excluded; the other §10.9.2 limits leave the modal analysis open.
    excluded = v.elf_applicability(False, ("largest effective damping xi_eff (§10.9.1(5))",), basis="eurocode")
    assert "excluded altogether" in excluded.message and "response-history analysis is required" in excluded.message
    assert "EN 1998-1" in excluded.source and excluded.level == "note"
    other = v.elf_applicability(False, ("largest plan dimension",), basis="eurocode")
    assert "excluded" not in other.message


def test_failed_bearing_checks_call_for_resizing():
    result = v.assess(good_figures(failed_checks=("group 1: shear strain",)))
    assert result.outcome == v.CONDITIONAL
    assert result.headline == "A: feasible with conditions (bearing checks)"
    reason = [r for r in result.reasons if r.topic == "bearing checks"][0]
    assert "group 1: shear strain" in reason.message


def test_near_fault_flag():
    assert v.near_fault(False) is None
    assert v.assess(good_figures(near_fault=True)).outcome == v.CONDITIONAL


@pytest.mark.parametrize("distance, level", [(5.0, "condition"), (15.0, "condition"), (15.1, "ok"), (40.0, "ok")])
def test_near_fault_from_the_fault_distance(distance, level):
    # ASCE/SEI 7-16 §11.2 'near-fault site': within 15 km of a fault of M_w >= 7 (from memory);
    # EN 1998-1 §10.9.2: 15 km from a fault of Ms >= 6.5 (from memory). The distance decides over the flag.
    for basis in ("asce7", "eurocode"):
        reason = v.near_fault(False, basis=basis, distance=distance)
        assert reason.level == level and reason.value == distance and reason.limit == 15.0
    assert v.near_fault(True, distance=40.0).level == "ok"


def test_soft_long_period_site_case_is_not_recommended():
    # Hand-built soft-site case: T_fb 1.0 s, T_M 2.6 s (ratio 2.6), class E,
    # spectral ratio 0.85, D_TM 0.80 m in 0.55 m bearings.
    figures = good_figures(fixed_base_period=1.0, isolated_period=2.6, total_displacement=0.80,
                           displacement_capacity=0.55, moat=0.6, site_class="E", spectral_ratio=0.85)
    result = v.assess(figures)
    assert result.outcome == v.NOT_RECOMMENDED
    against = {r.topic for r in result.by_level("against")}
    assert against == {"displacement capacity", "long-period site"}
    conditions = {r.topic for r in result.by_level("condition")}
    assert conditions == {"moat", "soft soil"}
    assert [r.topic for r in result.by_level("note")] == ["period shift"]


# Topics whose limit has a code clause on each basis (Eurocode: EN 1998-1:2004 §10.3 gamma_x,
# §10.4 compliance criteria, §10.9 simplified analysis, §10.10, §4.4.3.2 damage limitation; all
# from memory), and those that are common practice whatever the basis.
CODE_TOPICS = ("period shift", "displacement capacity", "moat", "design shear", "drift",
               "analysis procedure", "effective damping")
PRACTICE_TOPICS = ("displacement size", "base shear", "floor acceleration", "slenderness", "soft soil")


def reasons_by_topic(basis, **changes):
    # near_fault and a long isolated period bring in the near-fault and 5 s notes as well.
    figures = good_figures(basis=basis, near_fault=True, isolated_period=5.5, **changes)
    return {r.topic: r for r in v.assess(figures).reasons}


def test_eurocode_basis_cites_en_1998_and_no_asce():
    reasons = reasons_by_topic("eurocode")
    for topic in CODE_TOPICS:
        assert "EN 1998-1" in reasons[topic].source, (topic, reasons[topic].source)
    for topic in PRACTICE_TOPICS:
        assert reasons[topic].source == "common practice", (topic, reasons[topic].source)
    for reason in reasons.values():
        assert "ASCE" not in reason.source, (reason.topic, reason.source)
        assert "ELF" not in reason.message and "equivalent lateral force" not in reason.message
    assert "§10.9" in reasons["analysis procedure"].source
    assert "§10.3" in reasons["displacement capacity"].source
    assert "from memory" in reasons["period shift"].source
    assert "common practice" in reasons["wind"].source and "common practice" in reasons["near fault"].source
    assert "common practice" in reasons["isolated period"].source   # the 5 s end of the band
    # EN 1998-1 §4.4.3.2: d_r nu <= 0.010 h with nu = 0.5 gives 2 % under the design action (from memory).
    assert reasons["drift"].limit == 0.020 and "§4.4.3.2" in reasons["drift"].source


def test_asce7_basis_keeps_its_sources():
    reasons = reasons_by_topic("asce7")
    for topic in CODE_TOPICS:
        assert "ASCE/SEI 7-16" in reasons[topic].source, (topic, reasons[topic].source)
        assert "EN 1998" not in reasons[topic].source
    for topic in PRACTICE_TOPICS:
        assert reasons[topic].source == "common practice", (topic, reasons[topic].source)
    # The clauses cited before the basis reached the rules (ASCE/SEI 7-16, from memory).
    assert reasons["moat"].source == "ASCE/SEI 7-16 §17.2.6 (from memory): separation not less than D_TM"
    assert reasons["wind"].source.startswith("ASCE/SEI 7-16 §17.2.4.3")
    assert reasons["near fault"].source.startswith("ASCE/SEI 7-16 §11.2 'near-fault site'")
    assert reasons["isolated period"].source == "ASCE/SEI 7-16 §17.4.1 (from memory)"
    assert reasons["drift"].source == "ASCE/SEI 7-16 §17.5.6 (from memory)" and reasons["drift"].limit == 0.015
    assert reasons["analysis procedure"].message == "the equivalent lateral force procedure is permitted"
    assert "§11.4.8" in v.site_suitability("F", "asce7").source


def test_unknown_basis_is_bad_input():
    with pytest.raises(ValueError, match=r"basis = 'nzs' is not allowed: must be one of 'asce7', 'eurocode'"):
        v.moat_clearance(0.4, 0.5, basis="nzs")


def test_combine_rules():
    ok = v.Reason("a", "ok", "x")
    note = v.Reason("b", "note", "x")
    cond = v.Reason("c", "condition", "x")
    against = v.Reason("d", "against", "x")
    assert v.combine([ok, note]) == v.FEASIBLE
    assert v.combine([ok, cond, note]) == v.CONDITIONAL
    assert v.combine([cond, against]) == v.NOT_RECOMMENDED


def test_every_reason_carries_its_number_and_source():
    result = v.assess(good_figures())
    for reason in result.reasons:
        assert reason.level in v.LEVELS
        assert reason.source
        if reason.value is not None:
            assert isinstance(reason.value, float)


def test_verdict_round_trips_through_json():
    result = v.assess(good_figures(moat=None))
    data = json.loads(json.dumps(result.to_dict()))
    assert v.Verdict.from_dict(data) == result
    assert json.loads(json.dumps(good_figures().to_dict()))["alternative"] == "A"


# --- every rule at every level: the finding quotes its number, limit, unit and source -------------
# Limits from the sources named in the module text above: 2-5 s band, displacement size 0.8/1.2 m,
# base shear 0.7, floor acceleration 0.6 (common practice); D_TM against the capacity (ASCE/SEI 7-16
# §17.2.4.5, from memory), moat >= D_TM (§17.2.6, from memory), V_s/V_fb 1.0, drift 0.015 (§17.5.6,
# from memory), net tension at 1.0 (statics), beta_M 0.30 (§17.4.1, from memory).
ASCE = "ASCE/SEI 7-16"
EC8 = "EN 1998-1"
RULE_TABLE = [
    # call, topic, level, value, limit, unit, source contains, message contains
    (lambda: v.isolated_period(1.8, bound="upper"), "isolated period", "condition", 1.8, 2.0, "s", "common practice",
     "softer"),
    (lambda: v.isolated_period(5.5), "isolated period", "note", 5.5, 5.0, "s", ASCE, "ELF procedure is not permitted"),
    (lambda: v.isolated_period(5.5, basis="eurocode"), "isolated period", "note", 5.5, 5.0, "s", "common practice",
     "exceeds 5 s: wind"),
    (lambda: v.isolated_period(3.0), "isolated period", "ok", 3.0, 5.0, "s", "common practice", "2-5 s band"),
    (lambda: v.period_shift(2.4, 1.2), "period shift", "note", 2.0, 3.0, "-", ASCE, "ELF procedure"),
    (lambda: v.period_shift(2.4, 1.2, basis="eurocode"), "period shift", "note", 2.0, 3.0, "-", EC8,
     "simplified analysis"),
    (lambda: v.displacement_capacity(0.5, None), "displacement capacity", "condition", 0.5, None, "m", ASCE,
     "no bearing displacement capacity given"),
    (lambda: v.displacement_capacity(0.5, 0.4), "displacement capacity", "against", 0.5, 0.4, "m", ASCE, "(D_TM)"),
    (lambda: v.displacement_capacity(0.4, 0.4), "displacement capacity", "ok", 0.4, 0.4, "m", ASCE, "100% used"),
    (lambda: v.displacement_capacity(0.3, 0.4, 0.35, basis="eurocode"), "displacement capacity", "ok", 0.35, 0.4,
     "m", EC8, "response-history mean peak"),
    (lambda: v.moat_clearance(0.5, None), "moat", "condition", 0.5, None, "m", ASCE, "no moat given"),
    (lambda: v.moat_clearance(0.5, 0.4), "moat", "condition", 0.4, 0.5, "m", ASCE, "widen"),
    (lambda: v.moat_clearance(0.5, 0.6, basis="eurocode"), "moat", "ok", 0.6, 0.5, "m", EC8, "covers"),
    (lambda: v.displacement_size(1.3), "displacement size", "against", 1.3, 1.2, "m", "common practice", "beyond"),
    (lambda: v.displacement_size(1.0), "displacement size", "condition", 1.0, 0.8, "m", "common practice", "special"),
    (lambda: v.displacement_size(0.5), "displacement size", "ok", 0.5, 0.8, "m", "common practice", "D_TM"),
    (lambda: v.base_shear_reduction(1.1), "base shear", "against", 1.1, 1.0, "-", "common practice", "no reduction"),
    (lambda: v.base_shear_reduction(0.8), "base shear", "condition", 0.8, 0.7, "-", "common practice", "modest"),
    (lambda: v.base_shear_reduction(0.5), "base shear", "ok", 0.5, 0.7, "-", "common practice", "50%"),
    (lambda: v.design_shear(1.2), "design shear", "condition", 1.2, 1.0, "-", ASCE, "more force"),
    (lambda: v.design_shear(0.8, basis="eurocode"), "design shear", "ok", 0.8, 1.0, "-", EC8, "80%"),
    (lambda: v.floor_acceleration_reduction(1.1), "floor acceleration", "against", 1.1, 1.0, "-", "common practice",
     "no protection"),
    (lambda: v.floor_acceleration_reduction(0.7), "floor acceleration", "condition", 0.7, 0.6, "-",
     "common practice", "limited"),
    (lambda: v.floor_acceleration_reduction(0.4), "floor acceleration", "ok", 0.4, 0.6, "-", "common practice", "40%"),
    (lambda: v.storey_drift(0.02), "drift", "condition", 0.02, 0.015, "-", "§17.5.6", "stiffen"),
    (lambda: v.storey_drift(0.01), "drift", "ok", 0.01, 0.015, "-", "§17.5.6", "1.00%"),
    (lambda: v.storey_drift(0.012, basis="eurocode"), "drift", "ok", 0.012, 0.020, "-", "§4.4.3.2", "2.00%"),
    (lambda: v.storey_drift(0.012, 0.010, "given limit"), "drift", "condition", 0.012, 0.010, "-", "given limit",
     "1.00%"),
    (lambda: v.uplift(1.5), "uplift", "condition", 1.5, 1.0, "-", ASCE, "net tension"),
    (lambda: v.uplift(0.5, basis="eurocode"), "uplift", "ok", 0.5, 1.0, "-", EC8, "no net tension"),
    (lambda: v.effective_damping(0.4), "effective damping", "note", 0.4, 0.30, "-", ASCE, "response histories"),
    (lambda: v.effective_damping(0.2, basis="eurocode"), "effective damping", "ok", 0.2, 0.30, "-", EC8, "20%"),
    (lambda: v.bearing_checks(("a", "b")), "bearing checks", "condition", 2.0, 0.0, "-", "bearing checks table",
     "a, b; resize"),
    (lambda: v.bearing_checks(()), "bearing checks", "ok", 0.0, 0.0, "-", "bearing checks table", "all"),
    (lambda: v.elf_applicability(True), "analysis procedure", "ok", None, None, "-", ASCE,
     "equivalent lateral force procedure is permitted"),
    (lambda: v.elf_applicability(True, basis="eurocode"), "analysis procedure", "ok", None, None, "-", EC8,
     "simplified linear analysis is permitted"),
    (lambda: v.elf_applicability(False), "analysis procedure", "note", None, None, "-", ASCE, "limits exceeded"),
]


@pytest.mark.parametrize("call, topic, level, value, limit, unit, source, words", RULE_TABLE)
def test_every_rule_quotes_number_limit_unit_and_source(call, topic, level, value, limit, unit, source, words):
    reason = call()
    assert (reason.topic, reason.level, reason.unit) == (topic, level, unit)
    assert reason.value == (pytest.approx(value) if value is not None else None)
    assert reason.limit == (pytest.approx(limit) if limit is not None else None)
    assert source in reason.source
    assert words in reason.message
    if basis_of(reason.source) == "eurocode":
        assert "ASCE" not in reason.source


def basis_of(text):
    return "eurocode" if "EN 1998" in text else "asce7"


def test_missing_inputs_give_no_finding():
    assert v.elf_applicability(None) is None and v.effective_damping(None) is None


def test_lengths_and_forces_in_messages_follow_the_unit_system():
    # 1 in = 0.0254 m and 1 kip = 4.4482216 kN (NIST SP 811): 0.5 m = 19.7 in, 0.500 m in SI.
    assert "19.7 in" in v.moat_clearance(0.5, None, system="US").message
    assert "0.500 m" in v.moat_clearance(0.5, None).message
    assert "2200 kN" in v.wind(650.0, 2200.0).message
    assert "495 kip" in v.wind(650.0, 2200.0, system="US").message   # 2200/4.4482 = 494.6
