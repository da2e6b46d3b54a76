"""The live explorer: D_TM and moat, checks, plausibility warnings, trade-off, comparison,
study export and the widgets (without a browser; see test_explorer_browser.py for the page).

Outside sources named beside each check:
* ASCE/SEI 7-16 Eq. 17.5-3 (D_TM with torsion, >= 1.15 D_M), §17.5.3.3 (5 % accidental
  eccentricity), from memory;
* EN 1998-1:2004 §10.9 (d_d = gamma_x delta d_dc, gamma_x = 1.2, delta = 1 + e_tot y/r^2),
  from memory; Table 3.2 / Eq. 3.3 (type 1 spectrum, ground B: S = 1.2, plateau 2.5 S a_g);
* Naeim & Kelly 1999, Design of Seismic Isolated Structures, Ch. 4 (shear strain D/T_r,
  friction pendulum V/W = D/R + mu);
* NIST SP 811 (2008) Appendix B.8: 1 in = 25.4 mm exactly.
"""

from __future__ import annotations

import re
import subprocess
import sys

import numpy as np
import pytest

from isolation.app.explorer import answers as explore


def _cells(text: str) -> dict:
    """data-key -> data-value of an explorer HTML table."""
    return {k: float(v) for k, v in re.findall(r'data-key="([^"]+)" data-value="([^"]+)"', text)}


# --- D_TM, moat, checks --------------------------------------------------------------------------


def test_total_displacement_and_moat_follow_asce7_torsion_formula():
    # ASCE/SEI 7-16 Eq. 17.5-3 with P_T taken 1: D_TM = D_M [1 + y 12 e/(b^2 + d^2)] >= 1.15 D_M,
    # e = actual + 0.05 b (§17.5.3.3), y = b/2 + actual eccentricity (from memory).
    answer = explore.explore(plan_length=40.0, plan_width=30.0, eccentricity=2.0)
    d_m = answer.quantities["displacement"]
    assert d_m == answer.results["lower"].displacement  # the lower bound gives D_M
    e, y = 2.0 + 0.05 * 40.0, 40.0 / 2 + 2.0
    expected = max(d_m * (1 + y * 12 * e / (40.0**2 + 30.0**2)), 1.15 * d_m)
    assert answer.quantities["total_displacement"] == pytest.approx(expected, rel=1e-9)
    # Moat: D_TM plus a 50 mm clearance (common practice).
    assert answer.quantities["moat"] == pytest.approx(expected + 0.05, rel=1e-9)


def test_checks_cover_capacity_and_flag_failure():
    answer = explore.explore(displacement_capacity=0.2)
    capacity = next(c for c in answer.checks if c.name.endswith("displacement capacity"))
    assert capacity.value == pytest.approx(answer.quantities["total_displacement"])
    assert capacity.limit == 0.2 and not capacity.passed
    assert any(name.endswith("displacement capacity") for name in answer.failed)
    text = explore.checks_html(answer)
    assert "FAIL" in text and "PASS" in text


@pytest.mark.parametrize("kind", explore.BEARING_TYPES)
def test_every_bearing_type_answers_with_bounds_in_order(kind):
    answer = explore.explore(bearing_type=kind)
    lower, nominal, upper = (answer.results[c] for c in explore.CASES)
    # Lower-bound properties give the softest system: longest period, largest D (ASCE/SEI 7-16 §17.2.8.4).
    assert lower.displacement >= nominal.displacement >= upper.displacement
    assert lower.period >= upper.period
    assert answer.checks and answer.applicability
    assert np.isfinite(lower.displacement) and np.isfinite(upper.base_shear)


def test_lead_rubber_strain_check_uses_total_rubber():
    # Shear strain gamma_s = D/T_r with T_r = N t (Naeim & Kelly 1999, Ch. 4).
    answer = explore.explore(bearing_type="lead rubber", layers=25, layer_thickness=0.008)
    strain = next(c for c in answer.checks if c.name.endswith("shear strain"))
    assert strain.value == pytest.approx(answer.quantities["total_displacement"] / (25 * 0.008), rel=1e-6)


def test_eurocode_basis_uses_en1998_spectrum_and_amplified_displacement():
    # EN 1998-1 §10.9: d_d = gamma_x delta d_dc, gamma_x = 1.2, delta = 1 + e_tot y/r^2,
    # r^2 = (L^2 + B^2)/12, e_tot = 0.05 L here (from memory).
    answer = explore.explore(basis="eurocode", ag=0.3, ground_type="B", plan_length=40.0, plan_width=30.0)
    d_dc = answer.quantities["displacement"]
    delta = 1 + (0.05 * 40.0) * 20.0 / ((40.0**2 + 30.0**2) / 12.0)
    assert answer.quantities["total_displacement"] == pytest.approx(1.2 * delta * d_dc, rel=1e-9)
    # Ground B, type 1: S = 1.2, plateau Se = 2.5 S a_g (EN 1998-1 Table 3.2, Eq. 3.3).
    assert float(answer.spectrum.sa(0.3, 0.05)) == pytest.approx(2.5 * 1.2 * 0.3, rel=1e-6)
    assert "d_d, isolator design displacement" in explore.quantities_html(answer)


# --- plausibility ----------------------------------------------------------------------------------


def test_lead_core_nearly_as_wide_as_bearing_is_flagged():
    answer = explore.explore(bearing_type="lead rubber", outer_diameter=0.40, lead_diameter=0.35)
    assert any("Lead core" in w and "D_o/3" in w for w in answer.warnings)
    assert "Check the input" in explore.warnings_html(answer)


def test_displacement_far_beyond_bearing_is_flagged():
    answer = explore.explore(bearing_type="lead rubber", bearing_count=100, outer_diameter=0.4,
                             lead_diameter=0.07, layers=30, layer_thickness=0.01, shear_modulus=400.0, sms=2.5,
                             sm1=2.0, displacement_capacity=0.3)
    assert answer.quantities["total_displacement"] > 0.6
    assert any("no longer overlap" in w for w in answer.warnings)
    assert any("twice the bearing's displacement capacity" in w for w in answer.warnings)


def test_sm1_above_sms_is_flagged():
    answer = explore.explore(sms=0.8, sm1=1.0)
    assert any("S_M1 = 1 g exceeds S_MS = 0.8 g" in w for w in answer.warnings)


def test_defaults_raise_no_warning():
    assert explore.explore().warnings == ()
    assert explore.warnings_html(explore.explore()) == ""


# --- trade-off, comparison, plotted series --------------------------------------------------------


def test_trade_off_more_friction_less_displacement():
    # Friction pendulum: more friction, more strength and damping, less displacement (Naeim &
    # Kelly 1999, Ch. 4; the trend of V/W = D/R + mu at fixed R).
    curve = explore.trade_off(explore.ExplorerSettings(), "friction", count=5)
    assert curve.values[0] == pytest.approx(0.02) and curve.values[-1] == pytest.approx(0.15)
    assert 0.06 in curve.values  # the current value is on the curve
    assert np.all(np.diff(curve.total_displacement) < 0)
    middle = explore.explore(friction=float(curve.values[2]))
    assert curve.total_displacement[2] == pytest.approx(middle.quantities["total_displacement"], rel=1e-9)
    assert curve.base_shear_coefficient[2] == pytest.approx(middle.results["upper"].base_shear / 40_000.0,
                                                            rel=1e-9)
    with pytest.raises(ValueError, match="parameter = 'lead_diameter'.*'friction', 'radius'"):
        explore.trade_off(explore.ExplorerSettings(), "lead_diameter")


def test_trade_off_sweeps_both_dishes_of_a_double_concave():
    curve = explore.trade_off(explore.ExplorerSettings(bearing_type="double concave"), "radius", count=3)
    both = explore.explore(bearing_type="double concave", radius_1=float(curve.values[1]),
                           radius_2=float(curve.values[1]))
    assert curve.total_displacement[1] == pytest.approx(both.quantities["total_displacement"], rel=1e-9)


@pytest.mark.parametrize("basis", ["asce7", "eurocode"])
@pytest.mark.parametrize("bearing_type", sorted(explore.TRADE_OFF_PARAMETERS))
def test_trade_off_array_points_equal_the_scalar_answer(bearing_type, basis):
    # The curve runs every point through the array kernel (design.array_kernel.design_bounds_many); each
    # point must equal explore() at that value, the scalar iteration (ASCE/SEI 7-16 Eq. 17.5-1 or
    # EN 1998-1 §10.9 through isolation.design.equivalent_linear), to 1e-9; a point explore() refuses
    # is NaN on the curve.
    settings = explore.ExplorerSettings(bearing_type=bearing_type, basis=basis)
    for parameter in explore.TRADE_OFF_PARAMETERS[bearing_type]:
        curve = explore.trade_off(settings, parameter, count=6)
        assert np.isfinite(curve.total_displacement).sum() >= 3
        for value, d_tm, shear in zip(curve.values, curve.total_displacement, curve.base_shear_coefficient,
                                      strict=True):
            swept = explore._swept(settings, parameter, float(value))
            try:
                answer = explore.explore(settings, **swept)
            except ValueError:
                assert np.isnan(d_tm) and np.isnan(shear)
                continue
            assert d_tm == pytest.approx(answer.quantities["total_displacement"], rel=1e-9, abs=0.0)
            assert shear == pytest.approx(answer.results["upper"].base_shear / settings.weight, rel=1e-9, abs=0.0)


def test_comparison_shows_pinned_and_current():
    pinned = explore.explore(friction=0.05)
    current = explore.explore(friction=0.08)
    rows = {row[0]: row for row in explore.comparison_table(pinned, current).rows}
    before, after = pinned.quantities["total_displacement"], current.quantities["total_displacement"]
    assert rows["D_TM [mm]"][1] == pytest.approx(1000 * before)
    assert rows["D_TM [mm]"][2] == pytest.approx(1000 * after)
    assert rows["D_TM [mm]"][3] == f"{100 * (after / before - 1):+.0f} %"
    assert "Nothing pinned" in explore.comparison_html(None, current)


def test_plot_series_points_sit_on_their_damped_spectrum():
    answer = explore.explore()
    series = explore.plot_series(answer)
    for case, r in answer.results.items():
        t, sa = series["point"][case]
        assert t == r.period
        # Each isolated point lies on the spectrum drawn for its own damping (Sa(T)/B(beta)).
        assert sa == pytest.approx(float(np.interp(t, series["periods"], series["damped"][case])), rel=0.01)
    us = explore.plot_series(explore.explore(units="US"))
    assert us["length"] == "in"
    # 1 in = 25.4 mm exactly (NIST SP 811, B.8).
    assert us["total_displacement"] == pytest.approx(series["total_displacement"] / 25.4)


# --- export -----------------------------------------------------------------------------------------


@pytest.mark.parametrize("system", ["SI", "US"])
@pytest.mark.parametrize("kind", explore.BEARING_TYPES)
def test_exported_study_checks_and_gives_the_same_numbers(tmp_path, kind, system):
    from isolation.app.explorer.study_file import write_study
    from isolation.study import load_study
    from isolation.study.assembly import design_alternative, isolation_system, site_spectrum

    basis = "eurocode" if kind == "lead rubber" else "asce7"
    settings = explore.ExplorerSettings(bearing_type=kind, units=system, basis=basis)
    path = write_study(settings, tmp_path / "alt.toml")
    done = subprocess.run([sys.executable, "-m", "isolation", "check", str(path)], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    study = load_study(path)
    assert study.units == system and study.basis == basis
    plane = isolation_system(study.alternatives[0])
    sets = plane.property_sets(study.building.total_weight)
    _, q, _, _ = design_alternative(study, sets, plane, site_spectrum(study), study.building.fixed_base_period)
    answer = explore.explore(settings)
    # US files carry 10 significant digits, hence the tolerance.
    assert q["total_displacement"] == pytest.approx(answer.quantities["total_displacement"], rel=1e-6)
    assert "not construction design" in path.read_text()


# --- widgets (no browser) ---------------------------------------------------------------------------


def test_build_explorer_recomputes_on_change():
    box = explore.build_explorer()
    before = _cells(box.quantities.value)
    box.controls["friction"].value = 0.045  # the entry holds the exact value used
    after = _cells(box.quantities.value)
    expected = explore.explore(friction=0.045)
    assert after["total_displacement"] == expected.quantities["total_displacement"]
    assert after["total_displacement"] != before["total_displacement"]
    assert box.sliders["friction"].value == pytest.approx(0.045)
    box.sliders["radius"].value = 4.0  # the slider moves the entry and the answer
    assert box.controls["radius"].value == 4.0
    moved = explore.explore(friction=0.045, radius=4.0)
    assert _cells(box.summary.value)["lower-D"] == moved.results["lower"].displacement
    # Plots are updated in place: the marks hold the new answer.
    assert float(box.spectrum_marks["points"].x[2]) == moved.results["upper"].period  # lower, nominal, upper, fixed
    assert box.message.value == ""


def test_build_explorer_shows_only_the_chosen_types_controls():
    from isolation.app.explorer.controls import CONTROLS, visible

    box = explore.build_explorer()
    rows = box.explorer.rows

    def shown(field):  # the page's CSS shows a typed row only under the root class of its type/basis
        classes, root = rows[field]._dom_classes, box._dom_classes
        typed = [c[len("iso-for-"):] for c in classes if c.startswith("iso-for-")]
        based = [c[len("iso-on-"):] for c in classes if c.startswith("iso-on-")]
        return ((not typed or any(f"iso-bearing-{t}" in root for t in typed))
                and (not based or any(f"iso-basis-{b}" in root for b in based)))

    for kind, basis in (("friction pendulum", "asce7"), ("lead rubber", "asce7"), ("lead rubber", "eurocode"),
                        ("double concave", "eurocode"), ("high-damping rubber", "asce7")):
        box.bearing.value, box.basis.value = kind, basis
        for control in CONTROLS:
            assert shown(control.field) == visible(control, kind, basis), (control.field, kind, basis)
    assert shown("site_class") and not shown("ground_type")  # ASCE 7 last
    assert "d_d, isolator design displacement" not in box.quantities.value  # ASCE 7 again
    box.basis.value = "eurocode"
    assert "d_d, isolator design displacement" in box.quantities.value


def test_build_explorer_units_pin_export_and_bad_input():
    box = explore.build_explorer()
    box.units.value = "US"
    # 1 in = 25.4 mm (NIST SP 811); entries show 6 significant digits after a switch, and use them.
    assert box.controls["radius"].value == pytest.approx(3.0 / 0.0254, rel=1e-5)
    assert box.explorer.settings.radius == pytest.approx(box.controls["radius"].value * 0.0254, rel=1e-12)
    assert box.controls["plan_length"].value == pytest.approx(40.0 / 0.0254, rel=1e-5)
    assert "D [in]" in box.summary.value
    box.pin.click()
    box.controls["friction"].value = 0.09
    assert "Pinned" in box.comparison.value and "D_TM [in]" in box.comparison.value
    box.export.click()
    assert 'download="explorer-friction-pendulum.toml"' in box.export_link.value
    last = box.quantities.value
    box.controls["friction"].value = 0.5  # outside (0, 0.3]
    assert "Not computed" in box.message.value and "friction = 0.5" in box.message.value
    assert box.quantities.value == last  # the last good answer stays


def test_explore_command_refuses_a_bad_port():
    done = subprocess.run([sys.executable, "-m", "isolation", "explore", "--port", "80"], capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 2
    assert len(done.stderr.strip().splitlines()) == 1 and "port = 80" in done.stderr
