"""The explorer's bearing layout: grid, plan size and eccentricity change the per-bearing answers,
and the explorer's numbers are the core's.

Sources
-------
* ASCE/SEI 7-16 Eq. 17.5-3 (from memory): D_TM = D_M [1 + y 12 e / (b^2 + d^2)] with P_T = 1, y the
  distance of the element from the centre of rigidity; the corner bearing has y = b/2 + e_actual.
* EN 1998-1:2004 §10.9.3 (from memory): delta_i = 1 + e_tot y_i / r^2, r^2 = (L^2 + B^2)/12.
* Rigid-base statics (derived): a moment M over bearings at x_i changes their axial loads by
  M x_i / sum x_j^2; two bearings a distance L apart take +-M/L.
"""

from __future__ import annotations

import numpy as np
import pytest

from isolation.app.explorer import answers as explore
from isolation.design.overturning import grid_axial_loads
from isolation.study.layout import layout_demands, torsion_factors

CHANGED = {"grid_along": 10, "plan_length": 60.0, "plan_width": 24.0, "eccentricity": 2.0, "bearing_count": 20}


def test_two_bearings_take_the_moment_as_a_couple():
    low, high = grid_axial_loads(1200.0, [[-3.0, 0.0], [3.0, 0.0]], [500.0, 500.0], gravity_factor=0.9,
                                 vertical_fraction=0.1)
    np.testing.assert_allclose(low, 0.8 * 500.0 - 1200.0 / 6.0)
    np.testing.assert_allclose(high, 1.1 * 500.0 + 1200.0 / 6.0)


def test_corner_bearing_gets_the_code_torsion_formula():
    # ASCE/SEI 7-16 Eq. 17.5-3 at y = b/2 + e for b = 60 m, d = 24 m, e = 2 + 0.05 x 60 = 5 m.
    positions = np.array([[30.0, 12.0], [0.0, 0.0], [-10.0, 3.0]])
    factors = torsion_factors(positions, (60.0, 24.0), 2.0, 5.0)
    np.testing.assert_allclose(factors, 1.0 + np.array([32.0, 2.0, 12.0]) * 12.0 * 5.0 / (60.0**2 + 24.0**2))


@pytest.mark.parametrize("basis", ["asce7", "eurocode"])
def test_explorer_layout_equals_the_core_for_a_changed_layout(tmp_path, basis):
    from isolation.app.explorer.study_file import write_study
    from isolation.study import load_study
    from isolation.study.assembly import design_alternative, isolation_system, overturning_inputs, site_spectrum

    settings = explore.ExplorerSettings(basis=basis, **CHANGED)
    answer = explore.explore(settings)
    # the core, from the exported study file
    study = load_study(write_study(settings, tmp_path / "layout.toml"))
    assert study.alternatives[0].grid == (10, 2)
    spectrum = site_spectrum(study)
    plane = isolation_system(study.alternatives[0])
    report, q, _, _ = design_alternative(study, plane.property_sets(study.building.total_weight), plane, spectrum,
                                         study.building.fixed_base_period)
    core = layout_demands(study, study.alternatives[0], report, spectrum)
    assert answer.quantities["bearing_displacement_max"] == pytest.approx(core.displacement.max(), rel=1e-9)
    assert answer.quantities["bearing_axial_min"] == pytest.approx(core.axial_min.min(), rel=1e-9)
    assert answer.quantities["bearing_axial_max"] == pytest.approx(core.axial_max.max(), rel=1e-9)
    # hand check of the outermost bearing: 10 lines along 60 m (x = +-30, ..., 6.67 m apart), 2 across
    x = np.linspace(-30.0, 30.0, 10)
    shear, height, factor, vertical, _ = overturning_inputs(study, spectrum, report)
    gravity = study.building.total_weight / 20
    moment_share = shear * height * 30.0 / (2 * float((x**2).sum()))
    across = shear * height * 12.0 / (20 * 12.0**2)  # two lines at +-12 m, 10 bearings each
    assert core.axial_min.min() == pytest.approx((factor - vertical) * gravity - max(moment_share, across), rel=1e-9)
    # the corner bearing's displacement is the code's corner value (before any floor on D_TM)
    if basis == "asce7":
        d_m, e = report.value("D_M"), report.value("e")
        expected = d_m * (1.0 + (30.0 + 2.0) * 12.0 * e / (60.0**2 + 24.0**2))
        assert q["total_displacement"] == pytest.approx(max(expected, 1.15 * d_m), rel=1e-9)
    else:
        expected = report.value("gamma_x") * report.value("d_dc") * report.value("delta")
        assert q["total_displacement"] == pytest.approx(expected, rel=1e-9)
    assert answer.quantities["bearing_displacement_max"] == pytest.approx(expected, rel=1e-9)


def test_layout_controls_change_the_per_bearing_answers():
    square = explore.explore(bearing_count=20)  # default: 5 x 4 on 40 m x 30 m
    line = explore.explore(bearing_count=20, grid_along=20)  # one line of 20 along the length
    assert square.layout.grid == (5, 4) and line.layout.grid == (20, 1)
    # a single line has no lever arm across the width: the same moment loads its end bearings more
    assert line.quantities["bearing_axial_min"] < square.quantities["bearing_axial_min"]
    eccentric = explore.explore(bearing_count=20, eccentricity=3.0)
    assert eccentric.quantities["bearing_displacement_max"] > square.quantities["bearing_displacement_max"]
    wider = explore.explore(bearing_count=20, plan_length=60.0, plan_width=45.0)  # same 5 x 4 grid, bays x 1.5
    assert wider.layout.grid == (5, 4) and wider.layout.spacing[0] == pytest.approx(15.0)
    assert wider.quantities["bearing_axial_min"] > square.quantities["bearing_axial_min"]
    slender = explore.explore(bearing_count=20, grid_along=20, plan_width=10.0, storeys=12, weight=20_000.0)
    assert slender.quantities["bearings_in_tension"] > 0
    assert any("go into tension" in w for w in slender.warnings)
    assert not any("go into tension" in w for w in square.warnings)
    html = explore.layout_html(line)
    assert 'data-key="grid_along" data-value="20.0"' in html and "20 x 1" in html


@pytest.mark.parametrize("value", [3, -1, 2.5])
def test_grid_that_does_not_divide_the_count_names_the_field(value):
    with pytest.raises(ValueError, match=r"grid_along = .* must be 0 .* divisor of the number of bearings 20"):
        explore.explore(bearing_count=20, grid_along=value)


def test_exported_grid_passes_the_study_check(tmp_path):
    import subprocess
    import sys

    from isolation.app.explorer.study_file import write_study

    path = write_study(explore.ExplorerSettings(**CHANGED), tmp_path / "grid.toml")
    assert "grid = [\n    10,\n    2,\n]" in path.read_text() or "grid = [10, 2]" in path.read_text()
    done = subprocess.run([sys.executable, "-m", "isolation", "check", str(path)], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr


def test_live_explorer_layout_table_follows_the_grid_control():
    import re

    box = explore.build_explorer()
    def cells(text):
        return {k: float(v) for k, v in re.findall(r'data-key="([^"]+)" data-value="([^"]+)"', text)}

    assert cells(box.bearing_layout.value)["grid_along"] == 5.0
    box.controls["grid_along"].value = 20
    expected = explore.explore(grid_along=20)
    shown = cells(box.bearing_layout.value)
    assert shown["grid_along"] == 20.0
    assert shown["bearing_axial_min"] == expected.quantities["bearing_axial_min"]
    box.controls["grid_along"].value = 3  # not a divisor of 20: said, the last answer stays
    assert "grid_along" in box.message.value
