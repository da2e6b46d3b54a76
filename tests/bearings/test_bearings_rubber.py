"""Elastomeric bearings and their checks against published formulas and hand arithmetic.

Sources
-------
- Naeim & Kelly (1999); Kelly & Konstantinidis (2011): K_d = G A_r/T_r (rubber area
  without the lead), Q_d = sigma_yL A_lead; shape factor = loaded/free area;
  E_c = 6 G S^2 (incompressible circular pad), 1/E_c = 1/(6 G S^2) + 4/(3 K);
  K_v = E_c A/T_r; compression shear strain gamma = 6 S eps_c; P_cr = sqrt(P_S P_E),
  for a solid circular pad P_cr = (pi/sqrt(8)) G S A D/T_r (from memory of Naeim & Kelly).
- Circle-circle intersection (lens) area, e.g. Weisstein, MathWorld "Circle-Circle
  Intersection": A = 2 r^2 arccos(d/2r) - (d/2) sqrt(4 r^2 - d^2).
- AASHTO Guide Specifications for Seismic Isolation Design (from memory): gamma_r with
  D_r = 0.375 for circular pads; limits 2.5 (compression, shear) and 5.5 (combined).
- ASCE/SEI 7-16 §17.2.4.4 restoring force; Gent (cavitation at about 3 G tension, from memory).
- Values written as "hand arithmetic" are derived from these formulas, not validation.
"""

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.bearings import TYPICAL_COMPOUND, HighDampingRubber, LeadRubber, RubberCompound
from isolation.bearings.checks import (
    buckling_load,
    compression_modulus,
    overlap_area,
    overlap_ratio,
    rotation_strain,
    shape_factor,
)
from isolation.bearings.damping_rubber import equivalent_bilinear

# Invented demo bearing: 800 mm bonded diameter, 200 mm lead, 20 layers of 10 mm, G = 0.4 MPa.
LRB = dict(outer_diameter=0.8, lead_diameter=0.2, layer_thickness=0.01, layers=20, shear_modulus=400.0)
# The same bearing with the lead core taken as keeping the inner face from bulging.
LRB_FILLED = dict(LRB, lead_core="filled")


def test_lead_rubber_bilinear_from_geometry():
    # Hand arithmetic: A_r = pi/4 (0.8^2 - 0.2^2) = 0.4712389 m2, T_r = 0.2 m,
    # K_d = 400 * 0.4712389/0.2 = 942.4778 kN/m, Q_d = 10 000 kPa * pi/4 * 0.2^2 = 314.1593 kN,
    # K_u = 10 K_d (defaults: 10 MPa from memory, ratio 10 common practice).
    b = LeadRubber(**LRB).bilinear()
    assert b.post_yield_stiffness == pytest.approx(942.4778, rel=1e-6)
    assert b.characteristic_strength == pytest.approx(314.1593, rel=1e-6)
    assert b.elastic_stiffness == pytest.approx(9424.778, rel=1e-6)
    assert LeadRubber(**LRB).bilinear(2500.0) == b  # the load does not change a rubber bearing
    assert LeadRubber(**LRB).backbone() == b


def test_lead_rubber_options_change_strength_and_ratio():
    b = LeadRubber(**LRB, lead_yield_stress=8000.0, stiffness_ratio=15.0).bilinear()
    assert b.characteristic_strength == pytest.approx(8000.0 * math.pi * 0.01)
    assert b.elastic_stiffness / b.post_yield_stiffness == pytest.approx(15.0)


def test_shape_factor_circular_annular_and_hollow():
    # Solid D/(4t); lead-filled annulus (Do^2 - Di^2)/(4 Do t); empty hole (Do - Di)/(4 t).
    assert shape_factor(0.8, 0.01) == pytest.approx(20.0)
    assert LeadRubber(**LRB_FILLED).shape_factor == pytest.approx(0.60 / 0.032)  # 18.75, hand arithmetic
    # Default: the lead core counts as a hole, S = (Do - Di)/(4 t) = 15 (Kumar, Whittaker &
    # Constantinou 2014, Earthquake Eng. Struct. Dyn. 43(13), from memory).
    assert LeadRubber(**LRB).shape_factor == pytest.approx(15.0)
    assert shape_factor(0.8, 0.01, 0.2, inner_face_free=True) == pytest.approx(15.0)
    assert HighDampingRubber(0.8, 0.01, 20, inner_diameter=0.2).shape_factor == pytest.approx(15.0)


def test_compression_modulus_incompressible_and_with_bulk_modulus():
    # E_c = 6 G S^2 for incompressible rubber (Kelly & Konstantinidis 2011).
    assert compression_modulus(400.0, 18.75) == pytest.approx(6 * 400 * 18.75**2)
    # With K = 2000 MPa: 1/E_c = 1/843 750 + 4/(3 * 2e6) -> E_c = 540 000 kPa (hand arithmetic).
    assert LeadRubber(**LRB_FILLED).compression_modulus == pytest.approx(540000.0, rel=1e-9)
    # Very large shape factors approach the bulk limit 3K/4 (limit of the same formula).
    assert compression_modulus(400.0, 1e4, 2.0e6) == pytest.approx(1.5e6, rel=1e-3)


def test_vertical_stiffness_and_heights():
    # K_v = E_c A_r/T_r = 540 000 * 0.4712389/0.2 = 1 272 345 kN/m (hand arithmetic).
    lrb = LeadRubber(**LRB_FILLED, end_plate_thickness=0.03)
    assert lrb.vertical_stiffness == pytest.approx(1272345.0, rel=1e-6)
    # Hand arithmetic: rubber 0.2 m + 19 internal shims of the documented default 3 mm (common practice).
    assert lrb.height == pytest.approx(0.2 + 19 * 0.003)
    assert lrb.total_height == pytest.approx(0.257 + 0.06)


def test_buckling_load_matches_closed_form_for_solid_pad():
    # P_cr = (pi/sqrt(8)) G S A D/T_r for a solid incompressible circular pad (Naeim & Kelly 1999,
    # from memory); the height h cancels between P_S and P_E.
    g, d, t, n = 550.0, 0.9, 0.008, 25
    s, area, tr = d / (4 * t), math.pi * d**2 / 4, n * t
    inertia = math.pi * d**4 / 64
    expected = math.pi / math.sqrt(8) * g * s * area * d / tr
    for h in (tr, tr + 24 * 0.003):
        got = buckling_load(g, area, inertia, compression_modulus(g, s), tr, h)
        assert got == pytest.approx(expected, rel=1e-12)


def test_overlap_area_closed_form_limits_and_lens_formula():
    d = 0.8
    assert overlap_area(d, 0.0) == pytest.approx(math.pi * d**2 / 4)  # no offset: full area
    assert overlap_area(d, d) == pytest.approx(0.0, abs=1e-15)  # offset D: no overlap
    assert overlap_ratio(d, 1.5 * d) == 0.0
    # Half-diameter offset: delta = 2 arccos(1/2) = 2 pi/3 -> A_r = D^2/4 (2 pi/3 - sqrt(3)/2).
    assert overlap_area(d, d / 2) == pytest.approx(d**2 / 4 * (2 * math.pi / 3 - math.sqrt(3) / 2))


@settings(max_examples=50, deadline=None)
@given(st.floats(0.2, 2.0), st.floats(0.0, 1.0))
def test_overlap_area_equals_circle_circle_lens_area(d, fraction):
    # Lens area of two circles of radius r at distance x (MathWorld, circle-circle intersection).
    r, x = d / 2, fraction * d
    lens = 2 * r**2 * math.acos(x / (2 * r)) - (x / 2) * math.sqrt(max(4 * r**2 - x**2, 0.0))
    # near tangency the lens formula loses digits to cancellation (two terms of order r^2)
    assert overlap_area(d, x) == pytest.approx(lens, rel=1e-9, abs=1e-8 * d**2)


def test_buckling_at_displacement_scales_with_overlap():
    lrb = LeadRubber(**LRB)
    assert lrb.buckling_load(0.3) == pytest.approx(lrb.buckling_load(0.0) * overlap_ratio(0.8, 0.3))
    assert lrb.buckling_load(0.8) == pytest.approx(0.0, abs=1e-9)


def test_strain_checks_by_hand():
    lrb = LeadRubber(**LRB_FILLED)
    p, pmax, d, theta = 2000.0, 3000.0, 0.3, 0.005
    checks = {c.name: c for c in lrb.checks(p, d, axial_load_max=pmax, axial_load_min=-200.0,
                                            rotation=theta)}
    area, g, s = 0.4712389, 400.0, 18.75
    # gamma_c = 6 S eps_c with eps_c = P/(A E_c), E_c = 6 G S^2 (Kelly & Konstantinidis 2011)
    eps_c = p / (area * 6 * g * s**2)
    assert checks["compression strain"].value == pytest.approx(6 * s * eps_c, rel=1e-6)
    assert checks["shear strain"].value == pytest.approx(1.5)  # 0.3/0.2
    # gamma_r = 0.375 D^2 theta/(t T_r) = 0.375 * 0.64 * 0.005/(0.01 * 0.2) = 0.6 (AASHTO form, from memory)
    assert checks["rotation strain"].value == pytest.approx(0.6)
    reduced = area * overlap_ratio(0.8, d)
    combined = pmax / (reduced * g * s) + 1.5 + 0.5 * 0.6
    assert checks["combined strain (max load on overlap area)"].value == pytest.approx(combined, rel=1e-6)
    assert checks["combined strain (max load on overlap area)"].limit == 5.5
    assert checks["tension stress (cavitation)"].value == pytest.approx(200.0 / reduced, rel=1e-6)
    assert checks["tension stress (cavitation)"].limit == pytest.approx(3 * 400.0)


def test_rotation_strain_matches_thin_layer_solution():
    # Derived: incompressible thin circular layer rotated by alpha has max shear strain
    # 1.5 R^2 alpha/t^2 (pressure p = 3 G alpha/(2 t^3) x (R^2 - r^2)); alpha = theta t/T_r.
    d, t, tr, theta = 0.9, 0.008, 0.2, 0.01
    alpha = theta * t / tr
    assert rotation_strain(d, t, tr, theta) == pytest.approx(1.5 * (d / 2) ** 2 * alpha / t**2)


def test_checks_fail_when_limits_are_exceeded():
    # Thin, heavily loaded bearing at a large displacement: several limits must fail.
    slim = LeadRubber(0.5, 0.1, 0.012, 10, 400.0)
    checks = {c.name: c for c in slim.checks(4000.0, 0.35, axial_load_min=-600.0)}
    assert not checks["shear strain"].passed  # 0.35/0.12 = 2.92 > 2.5
    assert not checks["compression strain"].passed
    assert not checks["buckling load at zero displacement / axial load"].passed
    assert not checks["tension stress (cavitation)"].passed
    assert checks["shape factor"].value == pytest.approx(0.4 / 0.048)  # (Do - Di)/(4 t), lead core as a hole


def test_restoring_force_of_lead_rubber():
    # (F(D) - F(D/2))/W = K_d D/2 / W when D/2 > D_y (ASCE 7-16 §17.2.4.4, bilinear backbone).
    lrb = LeadRubber(**LRB)
    c = next(c for c in lrb.checks(2000.0, 0.3) if c.name == "restoring force")
    assert c.value == pytest.approx(942.4778 * 0.15 / 2000.0, rel=1e-6)


def test_check_to_dict_is_plain_json():
    import json
    checks = LeadRubber(**LRB).checks(2000.0, 0.3)
    assert checks
    for c in checks:
        back = json.loads(json.dumps(c.to_dict(), allow_nan=False))
        # Every field survives the round trip with its value (the dict is the check, not a summary).
        assert back["name"] == c.name and back["passed"] == c.passed
        assert back["value"] == pytest.approx(c.value) and back["limit"] == pytest.approx(c.limit)


# --- high-damping rubber -----------------------------------------------------------------
def test_high_damping_rubber_reads_the_compound_table():
    compound = RubberCompound((0.5, 1.0, 2.0), (700.0, 500.0, 400.0), (0.18, 0.15, 0.12))
    hdr = HighDampingRubber(0.9, 0.01, 15, compound=compound)
    area, tr = math.pi * 0.81 / 4, 0.15
    # at a table strain (1.0 -> D = 0.15 m) and halfway between 1.0 and 2.0 (D = 0.225 m)
    assert hdr.effective_stiffness(0.15) == pytest.approx(500.0 * area / tr)
    assert hdr.effective_damping(0.15) == pytest.approx(0.15)
    assert hdr.effective_stiffness(0.225) == pytest.approx(450.0 * area / tr)
    assert hdr.effective_damping(0.225) == pytest.approx(0.135)
    assert hdr.shear_modulus == pytest.approx(500.0)  # reference strain 1.0


def test_equivalent_bilinear_reproduces_stiffness_and_damping():
    # Bilinear closed forms (Naeim & Kelly 1999) evaluated here from K_u, K_d, Q_d.
    hdr = HighDampingRubber(0.8, 0.01, 20)
    for d in (0.05, 0.2, 0.45):
        b = hdr.bilinear(None, d)
        ku, kd, qd = b.elastic_stiffness, b.post_yield_stiffness, b.characteristic_strength
        dy = qd / (ku - kd)
        k_eff = kd + qd / d
        beta = 4 * qd * (d - dy) / (2 * math.pi * k_eff * d**2)
        assert dy < d
        assert ku / kd == pytest.approx(10.0)
        assert k_eff == pytest.approx(hdr.effective_stiffness(d), rel=1e-9)
        assert beta == pytest.approx(hdr.effective_damping(d), rel=1e-9)


def test_amplitude_backbone_scaling_and_count():
    hdr = HighDampingRubber(0.8, 0.01, 20)
    base = hdr.backbone()
    four = base.times(4)
    assert four.effective_stiffness(0.2) == pytest.approx(4 * hdr.effective_stiffness(0.2))
    assert four.effective_damping(0.2) == pytest.approx(hdr.effective_damping(0.2))
    stiffer = base.scaled(stiffness=1.3, strength=1.0)
    # only K_d and K_u grow: the secant stiffness grows, the damping falls
    assert base.effective_stiffness(0.2) < stiffer.effective_stiffness(0.2) < 1.3 * base.effective_stiffness(0.2)
    assert stiffer.effective_damping(0.2) < base.effective_damping(0.2)
    assert base.force(-0.2) == pytest.approx(-hdr.effective_stiffness(0.2) * 0.2)


def test_equivalent_bilinear_refuses_damping_beyond_a_bilinear_loop():
    # For K_u/K_d = n the largest beta is (2/pi)(sqrt(n) - 1)/(sqrt(n) + 1) (derived): 0.3307 for n = 10.
    assert equivalent_bilinear(1000.0, 0.330, 0.2, 10.0).characteristic_strength > 0
    with pytest.raises(ValueError, match=r"^damping = 0.335 is not allowed"):
        equivalent_bilinear(1000.0, 0.335, 0.2, 10.0)


def test_typical_compound_is_marked_common_practice():
    assert "common practice" in TYPICAL_COMPOUND.source
    # G 0.4-1.4 MPa and damping 10-20 % (high-damping rubber compounds, common practice)
    assert all(400.0 <= g <= 1400.0 for g in TYPICAL_COMPOUND.shear_moduli)
    assert all(0.10 <= b <= 0.20 for b in TYPICAL_COMPOUND.dampings)


def test_hdr_checks_flag_strain_beyond_the_table():
    hdr = HighDampingRubber(0.8, 0.01, 10)  # T_r 0.1 m; table ends at strain 3.0
    c = {c.name: c for c in hdr.checks(1500.0, 0.35)}["shear strain within compound table"]
    assert c.value == pytest.approx(3.5) and not c.passed


# --- properties and invalid input -----------------------------------------------------------
@settings(max_examples=50, deadline=None)
@given(st.floats(0.4, 1.5), st.floats(0.1, 0.3), st.floats(0.005, 0.02), st.integers(5, 40),
       st.floats(300.0, 1200.0), st.floats(0.01, 0.6))
def test_lead_rubber_results_are_finite_and_monotonic(do, lead_fraction, t, n, g, d):
    lrb = LeadRubber(do, lead_fraction * do, t, n, g)
    b = lrb.bilinear()
    beta = b.effective_damping(d)
    assert math.isfinite(beta) and 0.0 <= beta < 2 / math.pi  # a bilinear loop stays below 2/pi
    assert (beta > 0.0) == (d > b.yield_displacement)  # no hysteresis inside the elastic range
    bigger = LeadRubber(do * 1.1, lead_fraction * do, t, n, g).bilinear()
    assert bigger.post_yield_stiffness > b.post_yield_stiffness
    for c in lrb.checks(0.02 * g * do**2, d):
        assert c.value is not None and not math.isnan(c.value)


@settings(max_examples=50, deadline=None)
@given(st.floats(0.4, 1.5), st.floats(0.0, 0.99))
def test_overlap_ratio_decreases_from_one_to_zero(d, fraction):
    r = overlap_ratio(d, fraction * d)
    assert 0.0 <= r <= 1.0
    assert overlap_ratio(d, min(fraction + 0.01, 1.0) * d) < r


@pytest.mark.parametrize("kwargs, field", [
    ({"outer_diameter": -0.8}, "outer_diameter"), ({"outer_diameter": float("nan")}, "outer_diameter"),
    ({"lead_diameter": 0.8}, "lead_diameter"), ({"lead_diameter": 0.9}, "lead_diameter"),
    ({"lead_diameter": 0.0}, "lead_diameter"), ({"layer_thickness": 0.0}, "layer_thickness"),
    ({"layers": 0}, "layers"), ({"layers": 2.5}, "layers"), ({"layers": True}, "layers"),
    ({"shear_modulus": -400.0}, "shear_modulus"), ({"shear_modulus": float("inf")}, "shear_modulus"),
    ({"lead_yield_stress": 0.0}, "lead_yield_stress"), ({"stiffness_ratio": 1.0}, "stiffness_ratio"),
    ({"bulk_modulus": -1.0}, "bulk_modulus"), ({"shim_thickness": -0.001}, "shim_thickness"),
    ({"end_plate_thickness": float("nan")}, "end_plate_thickness"),
])
def test_invalid_lead_rubber_input_names_the_field(kwargs, field):
    args = dict(LRB)
    args.update(kwargs)
    with pytest.raises(ValueError, match=rf"^{field} = .* is not allowed"):
        LeadRubber(**args)


@pytest.mark.parametrize("kwargs, field", [
    ({"strains": (0.5, 0.4, 1.0)}, "strains"), ({"strains": (0.0, 0.5, 1.0)}, "strains"),
    ({"shear_moduli": (500.0, -1.0, 400.0)}, "shear_moduli"), ({"dampings": (0.1, 0.6, 0.1)}, "dampings"),
    ({"dampings": (0.1, 0.1)}, "shear_moduli and dampings"),
])
def test_invalid_compound_names_the_field(kwargs, field):
    args = {"strains": (0.5, 1.0, 2.0), "shear_moduli": (700.0, 500.0, 400.0), "dampings": (0.18, 0.15, 0.12)}
    args.update(kwargs)
    with pytest.raises(ValueError, match=rf"^{field}"):
        RubberCompound(**args)


@pytest.mark.parametrize("kwargs, field", [
    ({"inner_diameter": 0.8}, "inner_diameter"), ({"reference_strain": 0.0}, "reference_strain"),
    ({"compound": {"strains": [1.0]}}, "compound"), ({"layers": -3}, "layers"),
])
def test_invalid_high_damping_input_names_the_field(kwargs, field):
    args = {"outer_diameter": 0.8, "layer_thickness": 0.01, "layers": 20}
    args.update(kwargs)
    with pytest.raises(ValueError, match=rf"^{field} = "):
        HighDampingRubber(**args)


@pytest.mark.parametrize("call, field", [
    (lambda h: h.effective_stiffness(-0.1), "displacement"),
    (lambda h: h.bilinear(None, None), "displacement"),
    (lambda h: h.bilinear(-5.0, 0.2), "weight"),
    (lambda h: h.checks(1000.0, 0.2, rotation=-0.01), "rotation"),
    (lambda h: h.checks(1000.0, 0.2, axial_load_max=500.0), "axial_load_max"),
    (lambda h: h.checks(1000.0, 0.2, axial_load_min=2000.0), "axial_load_min"),
])
def test_invalid_call_input_names_the_field(call, field):
    with pytest.raises(ValueError, match=rf"^{field} = "):
        call(HighDampingRubber(0.8, 0.01, 20))


def test_rated_displacement_capacity_is_checked_when_given():
    lrb = LeadRubber(**LRB, displacement_capacity=0.4)
    names = {c.name: c for c in lrb.checks(2000.0, 0.45)}
    assert not names["displacement capacity"].passed and names["displacement capacity"].limit == 0.4
    assert "displacement capacity" not in {c.name for c in LeadRubber(**LRB).checks(2000.0, 0.3)}
    assert HighDampingRubber(0.8, 0.01, 20, displacement_capacity=0.5).displacement_capacity == 0.5
    with pytest.raises(ValueError, match=r"^displacement_capacity = "):
        LeadRubber(**LRB, displacement_capacity=-0.1)


def test_compound_damping_beyond_a_bilinear_loop_is_refused_at_construction():
    # (2/pi)(sqrt(10) - 1)/(sqrt(10) + 1) = 0.3307 for K_u/K_d = 10 (derived from the bilinear loop).
    compound = RubberCompound((0.5, 1.0), (700.0, 500.0), (0.34, 0.30))
    with pytest.raises(ValueError, match=r"^compound.dampings = "):
        HighDampingRubber(0.8, 0.01, 20, compound=compound)
    assert HighDampingRubber(0.8, 0.01, 20, compound=compound, stiffness_ratio=20.0).effective_damping(0.1) == 0.34


# --- bearings with a central hole: Constantinou, Kartoum & Kelly (1992), Eng. Struct. 14(2) 103-111 ---
def _paper_hole_factor(do, di):
    # F = (r^2 + 1)/(r - 1)^2 + (1 + r)/((1 - r) ln r), r = Do/Di (the 1992 paper's closed form,
    # typed here from the paper's equation, independently of the package).
    r = do / di
    return (r * r + 1) / (r - 1) ** 2 + (1 + r) / ((1 - r) * math.log(r))


def test_hole_factor_closed_form_and_limits():
    from isolation.bearings.checks import hole_factor
    for do, di in ((0.9, 0.2), (0.8, 0.2), (1.0, 0.5), (0.6, 0.05)):
        assert hole_factor(do, di) == pytest.approx(_paper_hole_factor(do, di), rel=1e-12)
    # Hand arithmetic of the formula at r = 4: 17/9 - 5/(3 ln 4) = 0.686644.
    assert hole_factor(0.8, 0.2) == pytest.approx(17 / 9 - 5 / (3 * math.log(4)), rel=1e-12)
    # No hole: F = 1 (solid pad, E_c = 6 G S^2); a vanishing hole tends to 1 (limit r -> inf, derived).
    assert hole_factor(0.8, 0.0) == 1.0
    assert hole_factor(0.8, 1e-7) == pytest.approx(1.0, abs=0.08)
    assert 0.0 < hole_factor(0.8, 0.6) < hole_factor(0.8, 0.2) < 1.0
    with pytest.raises(ValueError, match="inner_diameter"):
        hole_factor(0.8, 0.8)


def test_hollow_high_damping_bearing_uses_the_hole_factor():
    # Do/Di = 4.5 (the case where F matters): S = (Do - Di)/(4 t), E_c = 6 G S^2 F with K
    # in series (Constantinou, Kartoum & Kelly 1992; Kelly & Konstantinidis 2011 for K).
    do, di, t = 0.9, 0.2, 0.01
    hdr = HighDampingRubber(do, t, 20, inner_diameter=di)
    g, k = hdr.shear_modulus, hdr.bulk_modulus
    s = (do - di) / (4 * t)
    f = _paper_hole_factor(do, di)
    expected = 1 / (1 / (6 * g * s**2 * f) + 4 / (3 * k))
    assert hdr.shape_factor == pytest.approx(s)
    assert hdr.compression_modulus == pytest.approx(expected, rel=1e-12)
    # Buckling P_cr = sqrt(P_S P_E) with E_c/3 in bending of the annulus (Kelly & Konstantinidis 2011),
    # E_c from the hole factor.
    area, inertia = math.pi * (do**2 - di**2) / 4, math.pi * (do**4 - di**4) / 64
    tr, h = 0.2, 0.2 + 19 * 0.003
    p_s, p_e = g * area * h / tr, math.pi**2 * expected / 3 * inertia * (h / tr) / h**2
    assert hdr.buckling_load(0.0) == pytest.approx(math.sqrt(p_s * p_e), rel=1e-9)


def test_lead_core_conventions_hole_is_default_and_lower():
    hole, filled = LeadRubber(**LRB), LeadRubber(**LRB_FILLED)
    assert hole.lead_core == "hole"
    f = _paper_hole_factor(0.8, 0.2)
    expected = 1 / (1 / (6 * 400.0 * 15.0**2 * f) + 4 / (3 * 2.0e6))
    assert hole.hole_factor == pytest.approx(f)
    assert hole.compression_modulus == pytest.approx(expected, rel=1e-12)
    assert filled.hole_factor == 1.0
    # The filled convention gives the larger S, E_c and buckling load.
    assert filled.shape_factor > hole.shape_factor
    assert filled.compression_modulus > hole.compression_modulus
    assert filled.buckling_load() > hole.buckling_load()
    assert hole.bilinear() == filled.bilinear()  # horizontal behaviour does not depend on it
    with pytest.raises(ValueError, match="lead_core"):
        LeadRubber(**LRB, lead_core="plugged")


@settings(max_examples=50, deadline=None)
@given(st.floats(0.3, 2.0), st.floats(0.02, 0.9), st.floats(0.02, 0.9))
def test_hole_factor_lies_in_unit_interval_and_falls_as_the_hole_grows(do, a, b):
    # Constantinou, Kartoum & Kelly (1992): 0 < F <= 1, smaller for larger holes (their figure of F against
    # D_o/D_i, from memory); checked here on the closed form.
    from isolation.bearings.checks import hole_factor
    small, large = sorted((a, b))
    f_small, f_large = hole_factor(do, small * do), hole_factor(do, large * do)
    assert 0.0 < f_large <= f_small <= 1.0
