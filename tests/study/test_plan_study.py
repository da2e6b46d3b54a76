"""Bidirectional analysis of a study: layout, study keys, results and verdict.

Sources
-------
* ASCE/SEI 7-16 §17.6.3.4 (from memory): response-history total displacement not taken below 80 % of the
  single-mode D_TM; §12.8.4.2 / EN 1998-1:2004 §4.3.2(1): accidental eccentricity 5 % of the plan
  dimension (from memory).
* Grid layout: derived arithmetic (spacings along and across the plan).
"""

from __future__ import annotations

import dataclasses
import json
import tomllib

import pytest

from isolation.study import StudyError, load_study, parse_study
from isolation.study.plan import ACCIDENTAL_ECCENTRICITY, HISTORY_LOWER_LIMIT, default_grid

DEMO = "examples/demo_study.toml"


@pytest.mark.parametrize("count, length, width, grid", [
    (12, 30.0, 20.0, (4, 3)),   # spacing 10 m both ways
    (30, 42.0, 28.0, (6, 5)),   # 8.4 m x 7.0 m is the squarest of 30's factor pairs
    (7, 30.0, 20.0, (7, 1)),    # a prime count can only be one line
])
def test_default_grid_is_the_squarest_spacing(count, length, width, grid):
    assert default_grid(count, length, width) == grid


def test_tables_are_absent_without_a_bidirectional_run():
    from isolation.output import tables

    class Alternative:
        history = {"bidirectional": None}
        name = "x"

    class Results:
        suite = {}

    assert tables.bidirectional_table(Alternative()) is None
    assert tables.plan_storey_table(Alternative()) is None
    assert tables.pairs_table(Results()) is None


def test_code_limits_as_read():
    # ASCE/SEI 7-16 §17.6.3.4 (from memory): 80 %; EN 1998-1 §10.9: no such limit; 5 % eccentricity.
    assert HISTORY_LOWER_LIMIT == {"asce7": 0.8, "eurocode": 0.0}
    assert ACCIDENTAL_ECCENTRICITY == 0.05


def _text(extra_analysis="", grid=None):
    text = open(DEMO).read()
    if extra_analysis:
        text = text.replace("[analysis]", "[analysis]\n" + extra_analysis, 1)
    if grid is not None:
        text = text.replace('moat = "0.75 m"            # clear gap around the isolated building',
                            f'moat = "0.75 m"\ngrid = {grid}', 1)
    return text


def test_study_keys_bidirectional_and_grid(tmp_path):
    assert "[analysis]" in open(DEMO).read()
    study = parse_study(tomllib.loads(_text("bidirectional = true", "[6, 5]")), base_dir=tmp_path)
    assert study.analysis.bidirectional is True
    assert study.alternatives[0].grid == (6, 5)
    assert load_study(DEMO).analysis.bidirectional is False  # today's files keep their meaning


@pytest.mark.parametrize("grid, words", [("[4, 5]", "must equal the number of bearings"), ("[0, 30]", "grid"),
                                         ('"6x5"', "grid")])
def test_bad_grid_names_the_key(tmp_path, grid, words):
    with pytest.raises(StudyError, match=words):
        parse_study(tomllib.loads(_text(grid=grid)), base_dir=tmp_path)


@pytest.mark.slow
def test_bidirectional_study_end_to_end(tmp_path):
    from isolation.study.runner import load_results, run_study

    study = load_study(DEMO)
    study = dataclasses.replace(study, analysis=dataclasses.replace(study.analysis, bidirectional=True))
    results = run_study(study, quick=True)
    for alternative in results.alternatives:
        b = alternative.history["bidirectional"]
        assert b["grid"][0] * b["grid"][1] == sum(g["count"] for g in alternative.system["groups"])
        assert b["total_displacement_governing"] == pytest.approx(
            max(b["total_displacement_history"], 0.8 * b["total_displacement_code"]))
        assert b["total_displacement_history"] >= b["centre_displacement_history"]  # corners move more
        assert alternative.figures["total_displacement"] == pytest.approx(b["total_displacement_governing"])
        # uplift under the code combination 0.9 D - 0.2 S_MS D (ASCE/SEI 7-16 §17.2.4.6, from memory), S_MS = 1.50
        # in the demo study: the drop of each bearing's axial load in the histories over 0.6 of its gravity load
        drop = max((g - lo) / (0.6 * g) for g, lo in zip(b["gravity_load_kN"], b["bearing_axial_min_kN"],
                                                                         strict=True))
        assert alternative.figures["uplift_ratio"] == pytest.approx(drop)
        assert drop == pytest.approx(b["uplift_ratio"] / 0.6)
        # the storey findings come from the plan model (isolated: worst of bounds and eccentricities)
        storeys = b["storeys"]
        assert alternative.figures["ductility_isolated"] == pytest.approx(storeys["ductility_max"])
        assert alternative.figures["drift_ratio"] == pytest.approx(storeys["drift_ratio_max"])
        assert alternative.figures["ductility_fixed"] == pytest.approx(fixed_ductility(b))
        # storey shear against strength: a bilinear storey's peak shear over its yield shear is mu where it stays
        # elastic and alpha mu + 1 - alpha where it yields, never more than mu (derived from the law), so
        # suite means cannot exceed the storey ductility
        strength = alternative.plan_storey_strength
        assert strength.storeys == len(storeys["drift_ratio"])
        for ratio, mu in ((strength.ratio_x, storeys["ductility_x"]), (strength.ratio_y, storeys["ductility_y"])):
            assert all(0.0 < r <= m * (1 + 1e-9) for r, m in zip(ratio, mu, strict=True))
        # storeys carry the code-designed strengths of the planar comparison in x and in y: the fixed base,
        # designed with R and yielding (issue: fixed-base comparison), yields in both directions
        fixed = b["fixed_base"]
        assert fixed["yielding"] and b["storeys"]["yielding"]
        assert min(max(fixed["ductility_x"]), max(fixed["ductility_y"])) > 1.0
        assert fixed["drift_ratio_max"] > b["storeys"]["drift_ratio_max"]
        assert fixed["residual_drift_max"] > 0.0
        # axial loads straddle the gravity share of every bearing
        assert all(lo <= g <= hi for lo, g, hi in zip(b["bearing_axial_min_kN"], b["gravity_load_kN"],
                                                       b["bearing_axial_max_kN"], strict=True))
    assert results.suite["pairs"]["pair_spectrum"] == "RotD100"
    # the report's table and figures are made from these results
    from isolation.output import plots, tables

    table = tables.bidirectional_table(results.alternatives[0])
    governing = results.alternatives[0].history["bidirectional"]["total_displacement_governing"]
    assert table.rows[3][0].startswith("D_TM used by the verdict") and table.rows[3][1] == pytest.approx(governing)
    assert tables.pairs_table(results).rows[0][0] == 1
    labels = [row[0] for row in table.rows]
    shear_table = tables.plan_storey_table(results.alternatives[0])
    first = results.alternatives[0].plan_storey_strength
    assert len(shear_table.rows) == first.storeys and shear_table.rows[0][1] == pytest.approx(first.shear_x[0])
    assert shear_table.rows[0][3] == pytest.approx(first.ratio_x[0])
    assert any(label.startswith("Storey ductility demand, fixed base") for label in labels)
    b = results.alternatives[0].history["bidirectional"]
    assert plots.bearing_orbits(b).axes and plots.plan_demand(b, (42.0, 28.0)).axes
    assert plots.pairs_figure(results.live["pairs"]).axes
    path = results.save(tmp_path / "results.json")
    again = load_results(path)
    assert (again.alternatives[0].history["bidirectional"]["grid"]
            == results.alternatives[0].history["bidirectional"]["grid"])
    json.loads(path.read_text())


def fixed_ductility(b):
    return b["fixed_base"]["ductility_max"]


def test_batch_overrides_vary_the_layout(tmp_path):
    # Batch variants are dotted-key overrides of the study: bearing count, grid, eccentricity and the
    # bidirectional switch are ordinary keys, so a batch grid can vary the layout.
    from isolation.study import apply_overrides

    mapping = tomllib.loads(open(DEMO).read())
    changed = apply_overrides(mapping, {"alternative.0.bearings.0.count": 24, "alternative.0.grid": [6, 4],
                                        "building.eccentricity": "1.5 m", "analysis.bidirectional": True})
    study = parse_study(changed, base_dir=tmp_path)
    assert study.alternatives[0].grid == (6, 4) and study.alternatives[0].count == 24
    assert study.building.eccentricity == pytest.approx(1.5) and study.analysis.bidirectional
    wrong = apply_overrides(mapping, {"alternative.0.bearings.0.count": 24, "alternative.0.grid": [6, 5]})
    with pytest.raises(StudyError, match=r"alternative\[?.?0\]?.grid"):
        parse_study(wrong, base_dir=tmp_path)


def test_plan_superstructure_carries_the_planar_strengths_in_both_directions():
    # The plan model's storeys take the planar comparison building's yield shears, hardening and P-delta
    # in x and in y alike (one lateral system given by the study: an assumption stated in the table).
    from isolation.dynamics.structure import ShearBuilding
    from isolation.study.plan import plan_superstructure

    study = load_study(DEMO)
    planar = ShearBuilding([500.0] * 3, [4.0e5] * 3, [3.5] * 3, yield_shears=[3000.0, 2400.0, 1400.0],
                           hardening=0.03, p_delta=True)
    plan = plan_superstructure(planar, study.building)
    assert plan.yield_shears_x == plan.yield_shears_y == planar.yield_shears
    assert (plan.hardening, plan.p_delta) == (0.03, True)
    assert not plan_superstructure(planar.with_strengths(None, p_delta=False), study.building).yielding


def test_fixed_base_summary_reports_ductility_only_when_storeys_yield():
    # The plan fixed base under a pair: yielding storeys give ductility in x and y, elastic ones none.
    import types

    import numpy as np

    from isolation.dynamics.structure import ShearBuilding
    from isolation.study.plan import fixed_base_summary

    study = load_study(DEMO)
    rng = np.random.default_rng(1)
    steps = 1200
    envelope = np.sin(np.pi * np.arange(steps) / steps) ** 2
    pairs = types.SimpleNamespace(acceleration=rng.normal(0.0, 0.3, (1, 2, steps)) * envelope, dt=0.005)
    planar = ShearBuilding([800.0] * 3, [6.0e5] * 3, [3.5] * 3)
    elastic = fixed_base_summary(study, planar, pairs)
    assert not elastic["yielding"] and elastic["ductility_x"] is None and elastic["storey_law"] == "elastic"
    weak = fixed_base_summary(study, planar.with_strengths([400.0, 300.0, 200.0], hardening=0.05), pairs)
    assert weak["yielding"] and min(weak["ductility_x"]) > 1.0 and min(weak["ductility_y"]) > 1.0
    assert weak["residual_drift_max"] > elastic["residual_drift_max"]
