"""Tests of the array kernel of the single-mode procedure (isolation.design.array_kernel).

The kernel must give the scalar procedure's results (isolation.design.equivalent_linear,
itself tested against ASCE/SEI 7-16 in test_design.py) to 1e-9 for every bearing type it
runs as arrays; one closed form checks it directly.
"""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from isolation.bearings import (
    BearingGroup,
    Bilinear,
    DoubleConcave,
    FrictionPendulum,
    HighDampingRubber,
    IsolationSystem,
    LeadRubber,
    PropertyFactors,
)
from isolation.design import design_bounds, equivalent_linear
from isolation.design.array_kernel import design_bounds_many, equivalent_linear_many, supports
from isolation.errors import RunError
from isolation.site.spectra import CodeSpectrum, EurocodeSpectrum

G = 9.80665
WEIGHT = 52000.0  # [kN] a four-storey building (invented)


def plane(bearing, lower=0.85, upper=1.25, count=30):
    bound = (lower, upper)
    return IsolationSystem((BearingGroup(bearing, count, WEIGHT / count),),
                           PropertyFactors(stiffness=bound, strength=bound, friction=bound))


def assert_same(arrays, systems, weight, spectrum, rule):
    for i, system in enumerate(systems):
        ref = equivalent_linear(system, weight, spectrum, rule)
        got = arrays.result(i)
        for name in ("displacement", "period", "damping", "damping_coefficient", "stiffness", "base_shear",
                     "spectral_acceleration"):
            assert getattr(got, name) == pytest.approx(getattr(ref, name), rel=1e-9, abs=1e-12), name
        assert got.iterations == ref.iterations
        assert got.method == ref.method


def test_linear_system_matches_asce7_closed_form():
    # ASCE/SEI 7-16 Eq. 17.5-1: D_M = g S_M1 T_M/(4 pi^2 B_M), T_M = 2 pi sqrt(W/(k g)) (Eq. 17.5-2),
    # B_M = 0.8 for beta <= 2 % (Table 17.5-1). A bilinear without strength is linear, beta = 0.
    spectrum = CodeSpectrum(1.5, 0.8, 8.0)
    stiffness = np.array([20000.0, 30000.0, 45000.0])
    systems = [Bilinear(k, 0.5 * k, 0.0) for k in stiffness]
    arrays = equivalent_linear_many(systems, WEIGHT, spectrum)
    period = 2 * math.pi * np.sqrt(WEIGHT / (stiffness * G))
    assert np.all(period > spectrum.ts) and np.all(period < 8.0)  # on the S_M1/T branch
    expected = G * 0.8 * period / (4 * math.pi**2 * 0.8)
    np.testing.assert_allclose(arrays.displacement, expected, rtol=1e-6)
    np.testing.assert_allclose(arrays.damping, 0.0, atol=1e-15)


bearings = st.one_of(
    st.builds(FrictionPendulum, st.floats(1.0, 8.0), st.floats(0.02, 0.14)),
    st.builds(lambda r1, m1, r2, m2: DoubleConcave(r1, m1, r2, m2),
              st.floats(1.0, 5.0), st.floats(0.02, 0.1), st.floats(1.0, 5.0), st.floats(0.02, 0.1)),
    st.builds(lambda d, ratio, t, n, g: LeadRubber(d, ratio * d, t, n, g),
              st.floats(0.5, 1.2), st.floats(0.08, 0.3), st.floats(0.006, 0.012), st.integers(15, 40),
              st.floats(350.0, 900.0)),
    st.builds(lambda d, t, n: HighDampingRubber(d, t, n),
              st.floats(0.6, 1.2), st.floats(0.006, 0.012), st.integers(15, 40)),
)


@settings(max_examples=50, deadline=None)
@given(st.lists(bearings, min_size=1, max_size=6), st.floats(0.5, 1.0), st.floats(1.0, 1.8),
       st.sampled_from(["asce7", "eurocode"]))
def test_kernel_equals_scalar_path(chosen, lower, upper, rule):
    spectrum = CodeSpectrum(1.5, 0.8, 8.0) if rule == "asce7" else EurocodeSpectrum(0.4, ground="C",
                                                                                      max_period=10.0)
    systems = [s for b in chosen for s in plane(b, lower, upper).property_sets(WEIGHT).values()]
    assert all(supports(s) for s in systems)
    try:
        references = [equivalent_linear(s, WEIGHT, spectrum, rule) for s in systems]
    except (RunError, ValueError):
        references = None
    if references is None:  # some system has no result: the kernel must say so for the same one
        arrays = equivalent_linear_many(systems, WEIGHT, spectrum, rule)
        for i, s in enumerate(systems):
            try:
                equivalent_linear(s, WEIGHT, spectrum, rule)
            except RunError:
                with pytest.raises(RunError):
                    arrays.result(i)
        return
    arrays = equivalent_linear_many(systems, WEIGHT, spectrum, rule)
    assert_same(arrays, systems, WEIGHT, spectrum, rule)


def test_bounds_many_equal_design_bounds_and_unsupported_systems_use_the_scalar_path():
    spectrum = CodeSpectrum(1.5, 0.8, 8.0)
    rubber = IsolationSystem((BearingGroup(HighDampingRubber(0.8, 0.008, 25), 20, WEIGHT / 40),
                              BearingGroup(FrictionPendulum(3.0, 0.05), 20, WEIGHT / 40)),
                             PropertyFactors(stiffness=(0.85, 1.2), strength=(0.85, 1.2), friction=(0.85, 1.2)))
    sets = [plane(FrictionPendulum(3.0, 0.05)).property_sets(WEIGHT), rubber.property_sets(WEIGHT)]
    assert not supports(sets[1]["lower"])  # rubber with sliders: combined backbone
    many = design_bounds_many(sets, WEIGHT, spectrum)
    for got, s in zip(many, sets, strict=True):
        ref = design_bounds(s, WEIGHT, spectrum)
        assert got.displacement_governs == ref.displacement_governs
        assert got.force_governs == ref.force_governs
        for name in s:
            assert got.results[name].displacement == pytest.approx(ref.results[name].displacement, rel=1e-9)


def test_history_kept_like_the_scalar_result():
    spectrum = CodeSpectrum(1.5, 0.8, 8.0)
    system = plane(FrictionPendulum(3.0, 0.05)).property_sets(WEIGHT)["lower"]
    arrays = equivalent_linear_many([system], WEIGHT, spectrum, history=True)
    ref = equivalent_linear(system, WEIGHT, spectrum)
    np.testing.assert_allclose(np.array(arrays.result(0).history), np.array(ref.history), rtol=1e-12)


def test_no_result_keeps_the_scalar_error():
    # A system so soft that its period leaves the spectrum: the scalar path raises RunError.
    spectrum = CodeSpectrum(1.5, 0.8, 8.0, max_period=4.0)
    soft, stiff = Bilinear(100.0, 50.0, 0.0), Bilinear(40000.0, 20000.0, 0.0)
    with pytest.raises(RunError):
        equivalent_linear(soft, WEIGHT, spectrum)
    arrays = equivalent_linear_many([soft, stiff], WEIGHT, spectrum)
    with pytest.raises(RunError, match="period"):
        arrays.result(0)
    assert arrays.result(1).displacement == pytest.approx(equivalent_linear(stiff, WEIGHT, spectrum).displacement,
                                                          rel=1e-9)


def test_bad_weight_names_the_field():
    with pytest.raises(ValueError, match="weight"):
        equivalent_linear_many([Bilinear(100.0, 50.0, 1.0)], -1.0, CodeSpectrum(1.5, 0.8, 8.0))
