"""Figures: each function returns a Figure that carries the data it was given.

Outside checks: the energy of a bilinear loop EDC = 4 Q_d (D - D_y)
(Naeim & Kelly 1999, Design of Seismic Isolated Structures, Ch. 4); the
plateau of the ASCE/SEI 7-16 §11.4.6 spectrum equals S_MS; the PNG file
signature (PNG specification, ISO/IEC 15948, §5.2); means by numpy.
"""

from __future__ import annotations

import numpy as np
import pytest
from matplotlib.figure import Figure

from isolation.bearings import Bilinear
from isolation.output import plots
from isolation.site.spectra import CodeSpectrum

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"  # ISO/IEC 15948 §5.2


def _shoelace(x, y) -> float:
    return 0.5 * abs(float(np.dot(x, np.roll(y, -1)) - np.dot(y, np.roll(x, -1))))


def _line(ax, label):
    return next(line for line in ax.get_lines() if line.get_label() == label)


def test_masing_loop_of_a_bilinear_encloses_4_qd_d_minus_dy():
    backbone = Bilinear(elastic_stiffness=50_000.0, post_yield_stiffness=2_000.0,
                        characteristic_strength=400.0)
    amplitude = 0.30
    x, f = plots.masing_loop(backbone, amplitude, points=2001)
    yield_displacement = 400.0 / (50_000.0 - 2_000.0)
    expected = 4 * 400.0 * (amplitude - yield_displacement)  # Naeim & Kelly 1999
    assert _shoelace(x, f) == pytest.approx(expected, rel=2e-3)
    # Peak force on the backbone: Q_d + K_d D.
    assert f.max() == pytest.approx(400.0 + 2_000.0 * amplitude)
    assert x.max() == pytest.approx(amplitude) and x.min() == pytest.approx(-amplitude)


@pytest.mark.parametrize("amplitude", [0.0, -0.1, float("nan")])
def test_masing_loop_refuses_bad_amplitude(amplitude):
    with pytest.raises(ValueError, match="amplitude = .* > 0"):
        plots.masing_loop(Bilinear(1e4, 1e3, 100.0), amplitude)


def test_site_spectrum_marks_periods_and_plateau():
    spectrum = CodeSpectrum(sms=1.2, sm1=0.6)
    fig = plots.site_spectrum(spectrum, fixed_base_period=0.45,
                              isolated_periods={"lower": 3.0, "upper": 2.5}, isolated_damping=0.2)
    assert isinstance(fig, Figure)
    ax = fig.axes[0]
    five = _line(ax, "5 % damping")
    assert max(five.get_ydata()) == pytest.approx(1.2)  # plateau S_MS, ASCE 7-16 §11.4.6
    assert _line(ax, "fixed base T = 0.45 s").get_xdata()[0] == pytest.approx(0.45)
    assert _line(ax, "isolated, lower T = 3.00 s").get_xdata()[0] == pytest.approx(3.0)
    # Period shift 3.0 / 0.45 = 6.7, written on the figure.
    assert any("x6.7" in t.get_text() for t in ax.texts)
    assert ax.get_xlabel() == "Period T [s]"


def test_force_displacement_draws_loop_and_backbone():
    lower = Bilinear(60_000.0, 3_000.0, 500.0)
    upper = lower.scaled(stiffness=1.1, strength=1.3)
    fig = plots.force_displacement({"lower": lower, "upper": upper}, amplitudes={"lower": 0.3})
    ax = fig.axes[0]
    loop = _line(ax, "lower: loop at D = 300 mm")
    assert max(loop.get_xdata()) == pytest.approx(300.0)
    assert max(loop.get_ydata()) == pytest.approx(500.0 + 3_000.0 * 0.3)
    assert any(line.get_label() == "upper: backbone" for line in ax.get_lines())


def test_equivalent_linear_bounds_points_sit_on_the_demand_curves():
    spectrum = CodeSpectrum(sms=1.5, sm1=0.9)
    results = {"lower": {"displacement": 0.40, "period": 3.2, "damping": 0.18},
               "upper": {"displacement": 0.30, "period": 2.6, "damping": 0.25}}
    fig = plots.equivalent_linear_bounds(spectrum, results)
    point = _line(fig.axes[0], "lower: D = 400 mm, T = 3.20 s")
    assert point.get_xdata()[0] == pytest.approx(400.0)
    # Sa = S_M1 / (T B) on the velocity branch (T_S < T < T_L); B(18 %) interpolated linearly in
    # ASCE 7-16 Table 17.5-1 between 1.2 (10 %) and 1.5 (20 %): 1.44 (from memory).
    assert point.get_ydata()[0] == pytest.approx(0.9 / (3.2 * 1.44), rel=1e-3)


def test_suite_match_mean_and_band():
    periods = np.geomspace(0.1, 5.0, 30)
    target = 1.0 / periods
    rng = np.random.default_rng(3)
    records = target * np.exp(rng.normal(0.0, 0.2, (7, periods.size)))
    fig = plots.suite_match(periods, target, records, period_range=(0.5, 4.0))
    ax = fig.axes[0]
    np.testing.assert_allclose(_line(ax, "mean of 7 records").get_ydata(), records.mean(axis=0))
    np.testing.assert_allclose(_line(ax, "target").get_ydata(), target)
    assert sum(1 for line in ax.get_lines() if line.get_color() == "0.65") == 7
    assert ax.get_xscale() == "log"


def test_storey_profiles_place_each_drift_over_its_storey():
    heights = [0.0, 4.0, 7.5, 11.0]
    fig = plots.storey_profiles(heights, {"fixed base": [0.010, 0.008, 0.005]},
                                {"fixed base": [0.5, 0.7, 0.9, 1.2]})
    drift_line = _line(fig.axes[0], "fixed base")
    x, y = drift_line.get_xdata(), drift_line.get_ydata()
    # Storey 2 (4.0 m to 7.5 m) is drawn at 0.8 %.
    assert list(x[2:4]) == pytest.approx([0.8, 0.8]) and list(y[2:4]) == pytest.approx([4.0, 7.5])
    accel = _line(fig.axes[1], "fixed base")
    assert list(accel.get_ydata()) == pytest.approx(heights)


def test_history_figures_carry_their_data():
    time = np.linspace(0.0, 10.0, 501)
    disp = np.vstack([0.2 * np.sin(time), 0.1 * np.sin(2 * time)])
    fig = plots.displacement_histories(time, disp, design_displacement=0.25, capacity=0.4)
    ax = fig.axes[0]
    assert max(_line(ax, "record 1").get_ydata()) == pytest.approx(1000 * disp[0].max())
    assert _line(ax, "capacity").get_ydata()[0] == pytest.approx(400.0)

    fig = plots.hysteresis_loops({"upper": disp[0]}, {"upper": 2000 * disp[0]})
    assert max(_line(fig.axes[0], "upper").get_xdata()) == pytest.approx(1000 * disp[0].max())

    fig = plots.energy_stack(time, {"kinetic": np.ones_like(time), "hysteretic": time},
                             input_energy=time + 1.0)
    top = fig.axes[0].collections[-1].get_paths()[0].vertices[:, 1].max()
    assert top == pytest.approx(11.0)  # stacked: 1 + 10 at t = 10 s

    fig = plots.floor_spectra(time[1:], {"roof, fixed base": 1 / time[1:]})
    assert fig.axes[0].get_xscale() == "log"


def test_base_shear_comparison_percentages():
    fig = plots.base_shear_comparison({"fixed base": 8000.0, "isolated lower": 2000.0,
                                       "isolated upper": 3000.0}, reference="fixed base")
    texts = [t.get_text() for t in fig.axes[0].texts]
    assert texts == ["100 %", "25 %", "38 %"]  # 3000/8000 = 37.5 %, shown to 0 decimals


def test_captioned_gives_png_and_caption():
    fig = Figure(figsize=(2, 1))
    fig.add_subplot().plot([0, 1], [1, 0])
    data, meta = plots.captioned(fig, "A caption [m]", dpi=40)._repr_png_()
    assert data.startswith(PNG_SIGNATURE)
    assert meta == {"caption": "A caption [m]", "caption_latex": "A caption [m]"}
    # The report prints caption_latex: LaTeX specials escaped (Lamport §2.2.1), D_M as a subscript.
    _, meta = plots.captioned(fig, "Loops at D_M & 5 %", dpi=40)._repr_png_()
    assert meta["caption"] == "Loops at D_M & 5 %"
    assert meta["caption_latex"] == r"Loops at \(D_{\mathrm{M}}\) \& 5 \%"
    with pytest.raises(ValueError, match="figure = .* matplotlib Figure"):
        plots.captioned("not a figure", "x")


# --- adapters over HistoryResult objects built by hand (2 records, 4 steps, 2 storeys) ------
def _history(case: str, isolated: bool, scale: float):
    from isolation.dynamics.response import HistoryResult

    records, steps, storeys = 2, 4, 2
    ground = np.array([[0.0, 0.3, -0.2, 0.0], [0.0, -0.5, 0.1, 0.0]])
    floors = scale * np.arange(records * steps * storeys, dtype=float).reshape(records, steps, storeys) / 10
    drift = scale * np.ones((records, steps, storeys)) * np.array([0.04, 0.02])
    energy = {k: np.tile(np.linspace(0.0, v, steps), (records, 1))
              for k, v in (("input", 10.0), ("kinetic", 1.0), ("viscous", 2.0), ("elastic_strain", 3.0),
                           ("hysteretic", 4.0))}
    extra = {}
    if isolated:
        extra = dict(isolator_displacement=np.array([[0.0, 0.1, -0.2, 0.05], [0.0, 0.3, 0.1, 0.0]]),
                     isolator_force=np.array([[0.0, 100.0, -150.0, 20.0], [0.0, 200.0, 90.0, 0.0]]),
                     base_acceleration=np.array([[0.0, 0.2, -0.1, 0.0], [0.0, 0.1, 0.4, 0.0]]))
    return HistoryResult(case=case, dt=0.01, ground_acceleration=ground, floor_acceleration=floors,
                         floor_displacement=floors, drift=drift, storey_shear=floors,
                         base_shear=scale * np.array([[0.0, 100.0, -300.0, 0.0], [0.0, 500.0, 0.0, 0.0]]),
                         energy=energy, balance_error=np.zeros(records), heights=np.array([4.0, 4.0]), **extra)


def test_history_adapters_use_suite_means_of_peaks():
    cases = {"fixed": _history("fixed", False, 1.0), "lower": _history("lower", True, 0.5)}
    fig = plots.history_profiles(cases)
    drift = _line(fig.axes[0], "fixed base")
    # Peak drift 0.04 m and 0.02 m over 4 m storeys: 1.0 % and 0.5 %.
    assert list(drift.get_xdata()) == pytest.approx([1.0, 1.0, 0.5, 0.5])
    accel = _line(fig.axes[1], "isolated, lower")
    # Base level: mean of the peak |base acceleration| (0.2 g, 0.4 g) = 0.3 g; floor 1: peaks at the
    # last step, 0.5 x (6, 14)/10 -> mean 0.5 g; floor 2: 0.5 x (7, 15)/10 -> 0.55 g.
    assert list(accel.get_xdata()) == pytest.approx([0.3, 0.5, 0.55])
    assert list(accel.get_ydata()) == pytest.approx([0.0, 4.0, 8.0])

    fig = plots.history_base_shear(cases)
    # Fixed: mean(300, 500) = 400 kN; isolated 0.5 x that = 200 kN -> 50 %.
    assert [t.get_text() for t in fig.axes[0].texts] == ["100 %", "50 %"]

    fig = plots.history_loops(cases)
    loop = _line(fig.axes[0], "isolated, lower")
    assert list(loop.get_xdata()) == pytest.approx([0.0, 100.0, -200.0, 50.0])  # record 1 in mm

    fig = plots.history_energy(cases["lower"])
    top = fig.axes[0].collections[-1].get_paths()[0].vertices[:, 1].max()
    assert top == pytest.approx(1.0 + 3.0 + 2.0 + 4.0)  # stacked components at the end
    assert max(_line(fig.axes[0], "input").get_ydata()) == pytest.approx(10.0)

    fig = plots.history_displacements(cases["lower"], design_displacement=0.25)
    assert max(_line(fig.axes[0], "record 2").get_ydata()) == pytest.approx(300.0)


# --- display units: US customary figures are the SI figures converted at display ------------
# NIST SP 811 (2008), Appendix B.8/B.9: 1 in = 0.0254 m and 1 ft = 0.3048 m exactly;
# 1 kip = 1000 lbf = 4.4482216152605 kN.
INCH = 0.0254  # m, exact (NIST SP 811 B.8)
FOOT = 0.3048  # m, exact (NIST SP 811 B.8)
KIP = 4.4482216152605  # kN (NIST SP 811 B.8, 1 lbf = 4.4482216152605 N)
PER_M_IN_US, PER_MM_IN_US = 1.0 / INCH, 1.0 / (1000.0 * INCH)


def _pair(draw):
    """The same figure drawn in SI (default) and in US units."""
    return draw(), draw(units="US")


def _assert_line_scaled(si_line, us_line, x_factor, y_factor):
    np.testing.assert_allclose(us_line.get_xdata(), np.asarray(si_line.get_xdata()) * x_factor, rtol=1e-12)
    np.testing.assert_allclose(us_line.get_ydata(), np.asarray(si_line.get_ydata()) * y_factor, rtol=1e-12)


def test_force_displacement_in_us_units_is_the_si_figure_in_inches_and_kips():
    lower = Bilinear(60_000.0, 3_000.0, 500.0)
    upper = lower.scaled(stiffness=1.1, strength=1.3)
    si, us = _pair(lambda **kw: plots.force_displacement({"lower": lower, "upper": upper},
                                                         amplitudes={"lower": 0.3}, **kw))
    assert (si.axes[0].get_xlabel(), si.axes[0].get_ylabel()) == ("Displacement [mm]",
                                                                  "Force, isolation plane [kN]")
    assert (us.axes[0].get_xlabel(), us.axes[0].get_ylabel()) == ("Displacement [in]",
                                                                  "Force, isolation plane [kip]")
    # 0.3 m / 0.0254 m/in = 11.81 in, written to 0.1 in.
    loop_us = _line(us.axes[0], "lower: loop at D = 11.8 in")
    _assert_line_scaled(_line(si.axes[0], "lower: loop at D = 300 mm"), loop_us, PER_MM_IN_US, 1.0 / KIP)
    assert max(loop_us.get_xdata()) == pytest.approx(0.3 / INCH)
    assert max(loop_us.get_ydata()) == pytest.approx((500.0 + 3_000.0 * 0.3) / KIP)  # Q_d + K_d D
    data_lines = 0
    for si_line, us_line in zip(si.axes[0].get_lines(), us.axes[0].get_lines(), strict=True):  # backbones too
        if len(si_line.get_xdata()) and si_line.get_transform() == si.axes[0].transData:  # not the axis lines
            _assert_line_scaled(si_line, us_line, PER_MM_IN_US, 1.0 / KIP)
            data_lines += 1
    assert data_lines == 3  # two backbones and one loop


def test_equivalent_linear_bounds_in_us_units_shows_spectral_displacement_in_inches():
    spectrum = CodeSpectrum(sms=1.5, sm1=0.9)
    results = {"lower": {"displacement": 0.40, "period": 3.2, "damping": 0.18}}
    si, us = _pair(lambda **kw: plots.equivalent_linear_bounds(spectrum, results, **kw))
    assert us.axes[0].get_xlabel() == "Spectral displacement [in]"
    assert us.axes[0].get_ylabel() == "Spectral acceleration [g]"  # accelerations stay in g
    point = _line(us.axes[0], "lower: D = 15.7 in, T = 3.20 s")  # 0.40 / 0.0254 = 15.75
    assert point.get_xdata()[0] == pytest.approx(0.40 / INCH)
    _assert_line_scaled(_line(si.axes[0], "lower: D = 400 mm, T = 3.20 s"), point, PER_MM_IN_US, 1.0)
    _assert_line_scaled(_line(si.axes[0], "lower: demand at 18 % damping"),
                        _line(us.axes[0], "lower: demand at 18 % damping"), PER_MM_IN_US, 1.0)


def test_history_figures_in_us_units():
    time = np.linspace(0.0, 10.0, 501)
    disp = np.vstack([0.2 * np.sin(time), 0.1 * np.sin(2 * time)])
    si, us = _pair(lambda **kw: plots.displacement_histories(time, disp, design_displacement=0.25,
                                                             capacity=0.4, **kw))
    assert us.axes[0].get_ylabel() == "Isolator displacement [in]"
    _assert_line_scaled(_line(si.axes[0], "record 1"), _line(us.axes[0], "record 1"), 1.0, PER_MM_IN_US)
    assert _line(us.axes[0], "capacity").get_ydata()[0] == pytest.approx(0.4 / INCH)

    force = 2000 * disp[0]
    si, us = _pair(lambda **kw: plots.hysteresis_loops({"upper": disp[0]}, {"upper": force}, **kw))
    assert (us.axes[0].get_xlabel(), us.axes[0].get_ylabel()) == ("Isolator displacement [in]",
                                                                  "Isolator force [kip]")
    loop = _line(us.axes[0], "upper")
    np.testing.assert_allclose(loop.get_xdata(), disp[0] / INCH, rtol=1e-12)
    np.testing.assert_allclose(loop.get_ydata(), force / KIP, rtol=1e-12)
    _assert_line_scaled(_line(si.axes[0], "upper"), loop, PER_MM_IN_US, 1.0 / KIP)

    # Energy: 1 kip in = 4.4482216152605 kN x 0.0254 m (NIST SP 811 B.8 factors multiplied).
    si, us = _pair(lambda **kw: plots.energy_stack(time, {"kinetic": np.ones_like(time), "hysteretic": time},
                                                   input_energy=time + 1.0, **kw))
    assert us.axes[0].get_ylabel() == "Energy [kip in]" and si.axes[0].get_ylabel() == "Energy [kN m]"
    np.testing.assert_allclose(_line(us.axes[0], "input").get_ydata(), (time + 1.0) / (KIP * INCH), rtol=1e-12)
    top = us.axes[0].collections[-1].get_paths()[0].vertices[:, 1].max()
    assert top == pytest.approx(11.0 / (KIP * INCH))


def test_base_shear_and_profiles_in_us_units():
    values = {"fixed base": 8000.0, "isolated lower": 2000.0, "isolated upper": 3000.0}
    si, us = _pair(lambda **kw: plots.base_shear_comparison(values, reference="fixed base", **kw))
    assert us.axes[0].get_ylabel() == "Base shear [kip]" and si.axes[0].get_ylabel() == "Base shear [kN]"
    heights = [patch.get_height() for patch in us.axes[0].patches]
    assert heights == pytest.approx([v / KIP for v in values.values()], rel=1e-12)
    assert [t.get_text() for t in us.axes[0].texts] == ["100 %", "25 %", "38 %"]  # ratios unchanged

    levels = [0.0, 4.0, 7.5, 11.0]
    si, us = _pair(lambda **kw: plots.storey_profiles(levels, {"fixed base": [0.010, 0.008, 0.005]},
                                                      {"fixed base": [0.5, 0.7, 0.9, 1.2]}, **kw))
    assert us.axes[0].get_ylabel() == "Height [ft]" and si.axes[0].get_ylabel() == "Height [m]"
    assert us.axes[0].get_xlabel() == "Peak storey drift ratio [%]"  # a ratio in both systems
    _assert_line_scaled(_line(si.axes[0], "fixed base"), _line(us.axes[0], "fixed base"), 1.0, 1.0 / FOOT)
    accel = _line(us.axes[1], "fixed base")
    assert list(accel.get_xdata()) == pytest.approx([0.5, 0.7, 0.9, 1.2])  # g in both systems
    assert list(accel.get_ydata()) == pytest.approx([h / FOOT for h in levels])


def test_history_adapters_pass_the_unit_system_on():
    cases = {"fixed": _history("fixed", False, 1.0), "lower": _history("lower", True, 0.5)}
    loop = _line(plots.history_loops(cases, units="US").axes[0], "isolated, lower")
    np.testing.assert_allclose(loop.get_xdata(), np.array([0.0, 0.1, -0.2, 0.05]) / INCH, rtol=1e-12)
    np.testing.assert_allclose(loop.get_ydata(), np.array([0.0, 100.0, -150.0, 20.0]) / KIP, rtol=1e-12)
    record = _line(plots.history_displacements(cases["lower"], units="US").axes[0], "record 2")
    assert max(record.get_ydata()) == pytest.approx(0.3 / INCH)
    fig = plots.history_base_shear(cases, units="US")
    # Fixed: mean of peaks (300, 500) = 400 kN; isolated half of that.
    assert [p.get_height() for p in fig.axes[0].patches] == pytest.approx([400.0 / KIP, 200.0 / KIP])
    drift = _line(plots.history_profiles(cases, units="US").axes[0], "fixed base")
    assert list(drift.get_xdata()) == pytest.approx([1.0, 1.0, 0.5, 0.5])  # % in both systems
    assert list(drift.get_ydata()) == pytest.approx([0.0, 4.0 / FOOT, 4.0 / FOOT, 8.0 / FOOT])
    energy = _line(plots.history_energy(cases["lower"], units="US").axes[0], "input")
    assert max(energy.get_ydata()) == pytest.approx(10.0 / (KIP * INCH))


@pytest.mark.parametrize("units", ["metric", "us", "", None])
def test_unknown_unit_system_is_refused(units):
    with pytest.raises(ValueError, match=r"units = .* is not allowed: must be one of 'SI', 'US'"):
        plots.force_displacement({"lower": Bilinear(1e4, 1e3, 100.0)}, units=units)
    with pytest.raises(ValueError, match=r"units = .* is not allowed"):
        plots.hysteresis_loops({"a": [0.0, 0.1]}, {"a": [0.0, 1.0]}, units=units)


def test_figure_png_of_a_size_agg_truncates_matches_savefig():
    # 4.6 in x 200 dpi is 919.99... in floating point: Agg's buffer is 919 pixels wide (the plan figures'
    # width). Reference: matplotlib's own Figure.savefig at the same resolution, decoded with Pillow.
    import io

    from PIL import Image

    fig = Figure(figsize=(4.6, 4.2))
    fig.add_subplot().plot([0, 1], [0, 1])
    buffer = io.BytesIO()
    fig.savefig(buffer, format="png", dpi=200)
    ours = Image.open(io.BytesIO(plots.figure_png(fig, 200)))
    theirs = Image.open(io.BytesIO(buffer.getvalue()))
    assert ours.size == theirs.size
    np.testing.assert_array_equal(np.asarray(ours), np.asarray(theirs.convert("RGB")))


def test_figure_png_has_the_pixels_of_matplotlib_savefig():
    # Reference: matplotlib's own Figure.savefig (Agg) at the same resolution, decoded with Pillow;
    # PNG signature per ISO/IEC 15948 §5.2. A transparent figure keeps its alpha channel.
    import io

    from PIL import Image

    fig = plots.displacement_histories(np.linspace(0.0, 10.0, 2001), [np.sin(np.linspace(0, 30, 2001)) * 0.2],
                                       design_displacement=0.15, capacity=0.25)
    fig.axes[0].set_xscale("log")  # math-text tick labels too
    canvas = fig.canvas
    data = plots.figure_png(fig, 60)
    assert data.startswith(PNG_SIGNATURE)
    assert fig.canvas is canvas  # the figure keeps its own canvas
    assert plots.figure_png(fig, 60) == data  # drawn again on the shared renderer: the same file
    buffer = io.BytesIO()
    fig.savefig(buffer, format="png", dpi=60)
    ours, theirs = Image.open(io.BytesIO(data)), Image.open(io.BytesIO(buffer.getvalue()))
    assert ours.mode == "RGB" and ours.size == theirs.size == (round(6.4 * 60), round(3.0 * 60))
    np.testing.assert_array_equal(np.asarray(ours), np.asarray(theirs.convert("RGB")))
    assert fig.dpi == 100  # the figure's own resolution is restored
    clear = Figure(figsize=(1, 1), facecolor="none")
    clear.add_subplot().plot([0, 1], [1, 0])
    assert Image.open(io.BytesIO(plots.figure_png(clear, 30))).mode == "RGBA"
